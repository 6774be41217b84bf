//! The sign of the functional equation from the newform's q-expansion.
//!
//! With `F(y) = Σ_{n≥1} a_n exp(-2π n y / sqrt N)` the functional equation
//! `Λ(s) = w Λ(2 - s)` of `Λ(s) = ∫_0^∞ F(y) y^{s-1} dy` is equivalent to
//! `F(1/y) = w y^2 F(y)` (Cremona, *Algorithms for Modular Elliptic
//! Curves*, 2nd ed., §2.11). Both sides are summed at `y = t` and `1/t`
//! for a few `t > 1`; for each candidate sign the difference
//! `F(1/t) ∓ t^2 F(t)` is compared with a bound `E` on all errors:
//!
//! * truncation after `M` terms: `|a_n| ≤ d(n) sqrt(n) ≤ 2n` (Hasse's bound
//!   and multiplicativity; `d(n) ≤ 2 sqrt(n)`), so the tail is at most
//!   `2 Σ_{n>M} n x^n ≤ 2 (M+1) x^{M+1} / (1-x)^2` with `x = exp(-c)`;
//! * rounding: the powers `x^n` are formed by repeated multiplication
//!   (relative error at most about `n` units in the last place, plus
//!   `4 c n` ulps from the rounding of `c`) and summed naively (relative
//!   error at most `M` ulps of the sum of absolute values); the bound used
//!   doubles these first-order estimates.
//!
//! A sign is accepted when its difference is at most `E` and the other
//! candidate's is above `1000 E`. If neither fits within `E`, the input
//! (coefficients or conductor) is inconsistent and an error is returned.

use super::Setup;
use crate::curve::PointCounter;
use crate::error::{Error, ErrorKind};
use crate::local::Reduction;

/// Conductors up to this bound get the numerical test as a cross-check of
/// the local formulas in [`root_number`](super::root_number) (about
/// `5 sqrt(N)` coefficients; milliseconds at this size).
///
/// ```
/// assert!(twofold::rootno::NUMERIC_CHECK_CONDUCTOR <= twofold::rootno::NUMERIC_MAX_CONDUCTOR);
/// ```
pub const NUMERIC_CHECK_CONDUCTOR: u64 = 10_000_000;

/// The largest conductor for which the numerical test is run at all: it
/// counts points modulo every prime up to about `5 sqrt(N)` at `O(p)` cost
/// each, seconds at this size.
///
/// ```
/// assert_eq!(twofold::rootno::NUMERIC_MAX_CONDUCTOR, 1_000_000_000);
/// ```
pub const NUMERIC_MAX_CONDUCTOR: u64 = 1_000_000_000;

/// The outcome of the numerical test.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) enum Verdict {
    Sign(i8),
    Inconclusive,
}

/// Exactly representable values of `t` tried in turn.
const TS: [f64; 6] = [1.25, 1.125, 1.375, 1.5, 1.75, 2.0];
/// The target for the truncation error of each sum.
const TAIL: f64 = 1e-13;

/// Runs the test for the curve described by `setup` (conductor at most
/// [`NUMERIC_MAX_CONDUCTOR`], checked by the callers).
pub(crate) fn decide(setup: &Setup) -> Result<Verdict, Error> {
    let n = u64::try_from(&setup.conductor)
        .map_err(|_| Error::new(ErrorKind::TooLarge, "conductor too large for the numerical test"))?;
    if n > NUMERIC_MAX_CONDUCTOR {
        return Err(Error::new(ErrorKind::TooLarge, "conductor too large for the numerical test"));
    }
    let bad: Vec<(u64, i64)> = setup
        .bad
        .iter()
        .filter_map(|(p, _, d)| {
            let p = u64::try_from(p).ok()?;
            let ap = match d.reduction {
                Reduction::SplitMultiplicative => 1,
                Reduction::NonSplitMultiplicative => -1,
                _ => 0,
            };
            Some((p, ap))
        })
        .collect();
    let sqrt_n = (n as f64).sqrt();
    let tau = 2.0 * std::f64::consts::PI;
    let mut coeffs = Coefficients::new(&setup.minimal, bad);
    for t in TS {
        let c_small = tau / (t * sqrt_n); // for F(1/t)
        let c_large = tau * t / sqrt_n; // for F(t)
        let m = terms_needed(c_small);
        coeffs.extend_to(m);
        let s1 = theta(&coeffs.a, c_small);
        let s2 = theta(&coeffs.a, c_large);
        let t2 = t * t;
        let eps = f64::EPSILON;
        let err = s1.err + t2 * s2.err + 4.0 * eps * (s1.sum.abs() + t2 * s2.sum.abs()) + f64::MIN_POSITIVE;
        let d_plus = s1.sum - t2 * s2.sum;
        let d_minus = s1.sum + t2 * s2.sum;
        let fits = |d: f64| d.abs() <= err;
        let far = |d: f64| d.abs() > 1000.0 * err;
        match (fits(d_plus), fits(d_minus)) {
            (false, false) => {
                return Err(Error::new(
                    ErrorKind::InvalidValue,
                    format!(
                        "internal inconsistency: F(1/t) = {} and t^2 F(t) = {} at t = {t} fit neither sign \
                         (error bound {err:e}, conductor {n})",
                        s1.sum,
                        t2 * s2.sum
                    ),
                ))
            }
            (true, false) if far(d_minus) => return Ok(Verdict::Sign(1)),
            (false, true) if far(d_plus) => return Ok(Verdict::Sign(-1)),
            _ => {}
        }
    }
    Ok(Verdict::Inconclusive)
}

/// A sum `Σ_{n=1}^M a_n x^n` with a bound on its error.
struct Theta {
    sum: f64,
    err: f64,
}

/// The smallest `M` with `2 (M+1) x^{M+1} / (1-x)^2 <= TAIL`, `x = exp(-c)`.
fn terms_needed(c: f64) -> usize {
    let ln_one_minus_x = (-(-c).exp_m1()).ln();
    let rhs = |m: f64| (2.0f64.ln() + (m + 1.0).ln() - 2.0 * ln_one_minus_x - TAIL.ln()) / c;
    let mut m = 1.0f64;
    for _ in 0..50 {
        let next = rhs(m).ceil().max(1.0);
        if next <= m {
            break;
        }
        m = next;
    }
    m as usize
}

/// `Σ_{n=1}^{M} a_n exp(-c n)` with `M` from [`terms_needed`] (`a` must be
/// long enough), and its error bound (tail and rounding).
fn theta(a: &[i64], c: f64) -> Theta {
    let m = terms_needed(c);
    assert!(a.len() > m, "theta: coefficients up to {m} needed");
    let x = (-c).exp();
    let one_minus_x = -(-c).exp_m1();
    let mut xn = 1.0f64;
    let (mut sum, mut abs, mut nabs) = (0.0f64, 0.0f64, 0.0f64);
    for (n, &an) in a.iter().enumerate().take(m + 1).skip(1) {
        xn *= x;
        if an != 0 {
            let term = an as f64 * xn;
            sum += term;
            abs += term.abs();
            nabs += n as f64 * term.abs();
        }
    }
    let m1 = (m + 1) as f64;
    // x^{M+1} from the loop's last power; doubled for slack.
    let tail = 2.0 * (2.0 * m1 * xn * x / (one_minus_x * one_minus_x));
    let eps = f64::EPSILON;
    let rounding = 2.0 * eps * ((3.0 + 4.0 * c) * nabs + (m1 + 8.0) * abs);
    Theta { sum, err: tail + rounding }
}

/// The Dirichlet coefficients `a_1 .. a_M` of `L(E, s)`, grown on demand.
struct Coefficients {
    /// The point counter of the global minimal model.
    counter: PointCounter,
    /// `(p, a_p)` at the bad primes.
    bad: Vec<(u64, i64)>,
    a: Vec<i64>,
}

impl Coefficients {
    fn new(minimal: &crate::curve::Curve, bad: Vec<(u64, i64)>) -> Coefficients {
        Coefficients { counter: PointCounter::new(minimal), bad, a: vec![0, 1] }
    }

    fn extend_to(&mut self, m: usize) {
        if self.a.len() > m {
            return;
        }
        // Recompute from scratch to a comfortable size.
        let m = m + m / 8 + 16;
        self.a = crate::lseries::coefficients_from(&mut self.counter, &self.bad, m);
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::curve::Curve;

    fn coeffs(a: [i64; 5], bad: Vec<(u64, i64)>, m: usize) -> Vec<i64> {
        let e = Curve::from_coefficients(a).unwrap();
        let mut c = Coefficients::new(&e, bad);
        c.extend_to(m);
        c.a[..=m].to_vec()
    }

    #[test]
    fn eleven_a_coefficients() {
        // q prod (1 - q^n)^2 (1 - q^{11n})^2 is the newform of the isogeny class of conductor 11 (Cremona,
        // Algorithms for Modular Elliptic Curves, 2.8; the product identity).
        let m = 60;
        let mut f = vec![0i64; m + 1];
        f[1] = 1;
        for n in 1..=m {
            for _ in 0..2 {
                for k in (n..=m).rev() {
                    f[k] -= f[k - n];
                }
            }
            if 11 * n <= m {
                for _ in 0..2 {
                    for k in (11 * n..=m).rev() {
                        f[k] -= f[k - 11 * n];
                    }
                }
            }
        }
        assert_eq!(coeffs([0, -1, 1, -10, -20], vec![(11, 1)], m), f);
    }

    #[test]
    fn tail_bound_holds() {
        for c in [0.001, 0.01, 0.3, 2.0] {
            let m = terms_needed(c);
            let x = (-c).exp();
            let tail: f64 = ((m + 1)..(m + 200_000)).map(|n| 2.0 * n as f64 * x.powi(n as i32)).sum();
            assert!(tail <= TAIL * 1.0001, "c = {c}: {tail}");
            // and not wastefully long: the bound still fails 2% earlier
            let h = m - m / 50 - 1;
            assert!(m < 100 || 2.0 * h as f64 * x.powi(h as i32) / (1.0 - x).powi(2) > TAIL, "c = {c}: m = {m}");
        }
    }
}
