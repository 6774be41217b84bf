//! The functions `G_r(x)` of the rapidly convergent series for
//! `L^{(r)}(E, 1)` (Cremona, *Algorithms for Modular Elliptic Curves*,
//! 2nd ed., §2.13), with absolute error bounds, in `f64`.
//!
//! `G_0(x) = e^{-x}` and, for `r >= 1`,
//! `G_r(x) = 1/(r-1)! ∫_1^∞ e^{-xy} (log y)^{r-1} dy/y`, which is the
//! coefficient of `s^{r-1}` in `F(s) = ∫_1^∞ e^{-xy} y^{s-1} dy = x^{-s} Γ(s, x)`.
//!
//! * Small `x` (below [`CROSSOVER`]): from `Γ(s, x) = Γ(s) - γ(s, x)` and
//!   the power series of `γ(s, x)`,
//!   `G_r(x) = P_r(-log x) + Σ_{n≥1} (-1)^{n+r} x^n / (n! n^r)`, where
//!   `P_r(t) = Σ_{k=0}^{r} g_k t^{r-k}/(r-k)!` and `Σ g_k s^k` is the Taylor
//!   series of `Γ(1 + s)` (`g_0 = 1`, `g_1 = -γ`,
//!   `g_2 = (γ² + ζ(2))/2`, `g_3 = -(γ³ + 3γζ(2) + 2ζ(3))/6`, from
//!   `log Γ(1+s) = -γ s + Σ_{k≥2} (-1)^k ζ(k) s^k / k`). The series
//!   alternates; once `n > 2x` its terms decrease, so the tail is bounded by
//!   the first omitted term. Rounding: at most `(2K + 12)` units of `2^-53`
//!   of the sum of the absolute values of all parts (`K` terms).
//! * Large `x`: the continued fraction
//!   `x^{-s} Γ(s, x) = e^{-x} / (x+1-s - 1(1-s)/(x+3-s - 2(2-s)/(x+5-s - …)))`
//!   evaluated backwards from a fixed depth in truncated power series in `s`
//!   (degree 2), at two depths; the difference of the two values plus
//!   `16` units of rounding is the error bound (the depths are chosen so
//!   that the shallower one has already converged to about `10^-16`, see
//!   the unit tests, which also compare both methods where they overlap).

/// Euler's constant γ (from memory; checked against the continued fraction
/// for `E_1 = G_1` in the unit tests).
const EULER_GAMMA: f64 = 0.577_215_664_901_532_9;
/// ζ(3), Apéry's constant (from memory; checked as above through `G_3`).
const ZETA3: f64 = 1.202_056_903_159_594_3;
/// Below this the power series is used, from here on the continued fraction.
pub(crate) const CROSSOVER: f64 = 2.0;

const EPS: f64 = f64::EPSILON / 2.0;

/// Values `G_0(x) .. G_3(x)` and absolute error bounds, for `x > 0`.
#[derive(Clone, Copy, Debug, Default)]
pub(crate) struct GValues {
    pub(crate) value: [f64; 4],
    pub(crate) error: [f64; 4],
}

/// `G_0 .. G_3` at `x > 0`.
pub(crate) fn g_values(x: f64) -> GValues {
    let e = (-x).exp();
    let mut out = if x < CROSSOVER { series(x) } else { continued_fraction(x, e) };
    out.value[0] = e;
    out.error[0] = 2.0 * EPS * e;
    out
}

fn series(x: f64) -> GValues {
    let z2 = std::f64::consts::PI * std::f64::consts::PI / 6.0;
    let g = EULER_GAMMA;
    let g1 = -g;
    let g2 = (g * g + z2) / 2.0;
    let g3 = -(g * g * g + 3.0 * g * z2 + 2.0 * ZETA3) / 6.0;
    let t = -x.ln();
    let mut value = [0.0f64; 4];
    let mut abs = [0.0f64; 4];
    let p1 = [t, g1];
    let p2 = [t * t / 2.0, g1 * t, g2];
    let p3 = [t * t * t / 6.0, g1 * t * t / 2.0, g2 * t, g3];
    value[1] = p1.iter().sum();
    abs[1] = p1.iter().map(|v| v.abs()).sum();
    value[2] = p2.iter().sum();
    abs[2] = p2.iter().map(|v| v.abs()).sum();
    value[3] = p3.iter().sum();
    abs[3] = p3.iter().map(|v| v.abs()).sum();
    // log x itself: relative error EPS, i.e. EPS·|t| absolute in t, which
    // moves P_r by at most EPS·|t|·|P_r'(t)| <= EPS·|t|·abs[r-1] (+1 for r = 1).
    let dlog = [0.0, EPS * t.abs(), EPS * t.abs() * (abs[1] + 1.0), EPS * t.abs() * (abs[2] + 1.0)];
    let mut pw = 1.0f64; // x^n / n!
    let mut n = 0usize;
    let tail;
    loop {
        n += 1;
        let nf = n as f64;
        pw *= x / nf;
        let t1 = pw / nf;
        let t2 = t1 / nf;
        let t3 = t2 / nf;
        if nf > 2.0 * x + 1.0 && t1 < 1e-18 * abs[1].max(1e-300) {
            // the terms from here on alternate and decrease: tail <= this term
            tail = [0.0, t1, t2, t3];
            break;
        }
        // (-1)^{n+r}
        let s1 = if n.is_multiple_of(2) { -1.0 } else { 1.0 };
        value[1] += s1 * t1;
        value[2] -= s1 * t2;
        value[3] += s1 * t3;
        abs[1] += t1;
        abs[2] += t2;
        abs[3] += t3;
    }
    let k = n as f64;
    let mut error = [0.0f64; 4];
    for r in 1..4 {
        error[r] = tail[r] + (2.0 * k + 12.0) * EPS * abs[r] + dlog[r];
    }
    GValues { value, error }
}

type Jet = [f64; 3];

fn jet_div(u: Jet, v: Jet) -> Jet {
    let q0 = u[0] / v[0];
    let q1 = (u[1] - q0 * v[1]) / v[0];
    let q2 = (u[2] - q0 * v[2] - q1 * v[1]) / v[0];
    [q0, q1, q2]
}

/// The continued fraction for `e^x x^{-s} Γ(s, x)` from depth `depth`, as a
/// power series in `s` to `s^2`.
fn cf_jet(x: f64, depth: usize) -> Jet {
    let mut t: Jet = [x + (2 * depth + 1) as f64, -1.0, 0.0];
    for k in (1..=depth).rev() {
        let kf = k as f64;
        let q = jet_div([kf * kf, -kf, 0.0], t);
        t = [x + 2.0 * kf - 1.0 - q[0], -1.0 - q[1], -q[2]];
    }
    jet_div([1.0, 0.0, 0.0], t)
}

/// The depth after which the continued fraction has converged to about
/// `10^-16` for `x >= CROSSOVER` (about `110/x + 8` was measured; margin added).
pub(crate) fn cf_depth(x: f64) -> usize {
    (140.0 / x).ceil() as usize + 12
}

fn continued_fraction(x: f64, e: f64) -> GValues {
    let d = cf_depth(x);
    let a = cf_jet(x, d);
    let b = cf_jet(x, 2 * d);
    let mut value = [0.0f64; 4];
    let mut error = [0.0f64; 4];
    for r in 1..4 {
        let c = b[r - 1];
        value[r] = e * c;
        error[r] = e * ((a[r - 1] - c).abs() + 16.0 * EPS * c.abs()) + 2.0 * EPS * value[r].abs();
    }
    GValues { value, error }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Simpson's rule for `1/(r-1)! ∫_0^U e^{-x e^u} u^{r-1} du` (y = e^u).
    fn quadrature(r: usize, x: f64) -> f64 {
        let upper = (60.0 / x).ln().max(0.0) + 3.0;
        let steps = 200_000;
        let h = upper / steps as f64;
        let f = |u: f64| (-x * u.exp()).exp() * u.powi(r as i32 - 1);
        let mut s = f(0.0) + f(upper);
        for i in 1..steps {
            let w = if i % 2 == 1 { 4.0 } else { 2.0 };
            s += w * f(i as f64 * h);
        }
        let fact = [1.0, 1.0, 1.0, 2.0][r];
        s * h / 3.0 / fact
    }

    #[test]
    fn series_and_fraction_agree_on_the_overlap() {
        for i in 0..=40 {
            let x = 1.5 + i as f64 * 0.05;
            let s = series(x);
            let c = continued_fraction(x, (-x).exp());
            for r in 1..4 {
                let d = (s.value[r] - c.value[r]).abs();
                assert!(d <= s.error[r] + c.error[r], "x = {x}, r = {r}: {} vs {}", s.value[r], c.value[r]);
                assert!((x > CROSSOVER || s.error[r] < 1e-13) && c.error[r] < 1e-15, "x = {x} r = {r}: {:?} {:?}", s.error, c.error);
            }
        }
    }

    #[test]
    fn against_quadrature() {
        for x in [0.05, 0.3, 1.0, 1.9, 2.1, 4.0, 9.0, 25.0] {
            let g = g_values(x);
            for r in 1..4 {
                let q = quadrature(r, x);
                assert!((g.value[r] - q).abs() <= 1e-11 * q.abs() + 1e-300, "x = {x} r = {r}: {} vs {q}", g.value[r]);
            }
        }
    }

    #[test]
    fn exponential_integral_values() {
        // E_1(1) = 0.219383934395520 (Abramowitz and Stegun, Table 5.1; from memory)
        assert!((g_values(1.0).value[1] - 0.219_383_934_395_520).abs() < 1e-14);
        // G_r(x) <= e^{-x} / x^r (from log y <= y - 1), used for the tail bound
        for x in [0.5, 2.0, 10.0, 40.0] {
            let g = g_values(x);
            for r in 1..4 {
                assert!(g.value[r] <= (-x).exp() / x.powi(r as i32), "x = {x} r = {r}");
            }
        }
    }
}
