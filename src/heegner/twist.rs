//! The modular parametrisation of a quadratic twist from that of a curve of
//! smaller conductor.
//!
//! If `E` is the twist of `E0` (conductor `N0`) by the primitive quadratic
//! character `χ` of a fundamental discriminant `d` prime to `N0`, then the
//! newform of `E` is `f0 ⊗ χ`, of level `N = N0 d^2`, and for every `τ`
//! in the upper half plane
//!
//! `Σ χ(n) a_n / n q^n = (1 / g(χ)) Σ_{u mod |d|} χ(u) z0(τ + u / |d|)`,
//! `z0(w) = Σ a_n(E0) / n e^{2 pi i n w}`, `g(χ) = sqrt(d)`
//!
//! (the Gauss sum of `χ` times `χ(n)` is `Σ_u χ(u) e^{2 pi i n u/|d|}`;
//! G. Shimura, Introduction to the Arithmetic Theory of Automorphic
//! Functions, 1971, Prop. 3.64, and Cohen, §7.5 for the sign of `g`).
//! `z0` is invariant modulo the period lattice `Λ0` of `f0` under
//! `Γ0(N0)`, so each point `τ + u/|d|` can be moved by `Γ0(N0)` to one of
//! imaginary part at least about `sqrt(3) / (2 N0)`: the series there needs
//! about `|d|` times fewer terms in total, with the coefficients of `E0`
//! (level `N0`) instead of those of `E` (level `N0 d^2`). The price: the
//! value is known modulo `Λ0 / g(χ)` only, a lattice containing the lattice
//! of `E` with a small finite index `e`, so that `e z` is exact; the point
//! found is `e` times the trace, divided again by the saturation step.
//! This is the route of the congruent-number curves `y^2 = x^3 - n^2 x`
//! (twists of `y^2 = x^3 - x`, conductor 32).

use super::forms::QuadraticForm;
use crate::curve::Curve;
use crate::error::Error;
use crate::local::{bad_primes_data, Reduction};
use malachite::Integer;

/// The twist data: `E` is the twist of `base` by the character of `d`.
#[derive(Clone, Debug)]
pub(crate) struct Twist {
    /// The fundamental discriminant of the character.
    pub d: i64,
    /// A global minimal model of the twist of `E` by `d`.
    pub base: Curve,
    /// Its conductor `N0 = N / d^2`.
    pub base_conductor: u64,
    /// `(p, a_p)` at the primes dividing `N0`.
    pub base_bad: Vec<(u64, i64)>,
    /// The root number of the base.
    pub base_sign: i8,
}

/// The twist of `curve` by `d` (`c4 d^2`, `c6 d^3`), as a short model.
fn twist_model(curve: &Curve, d: i64) -> Result<Curve, Error> {
    let d = Integer::from(d);
    let c4 = curve.c4() * &d * &d;
    let c6 = curve.c6() * &d * &d * &d;
    Curve::new([Integer::from(0), Integer::from(0), Integer::from(0), c4 * Integer::from(-27), c6 * Integer::from(-54)])
}

/// The fundamental discriminant `d` (a product of prime discriminants
/// `p* = ±p`, `-4`, `±8`) of largest `|d|` such that the twist of `curve`
/// (conductor `n`) by `d` has conductor `n / d^2` prime to `d`; `None` if
/// there is none.
pub(crate) fn smallest_twist(curve: &Curve, n: u64) -> Result<Option<Twist>, Error> {
    let f = crate::arith::factor_u64(n)?;
    let mut odd: Vec<i64> = Vec::new();
    let mut two: Vec<i64> = vec![1];
    for &(p, e) in &f {
        if p == 2 {
            if e == 4 {
                two.push(-4);
            }
            if e == 6 {
                two.extend([8, -8]);
            }
        } else if e == 2 {
            let p = p as i64;
            odd.push(if p % 4 == 1 { p } else { -p });
        }
    }
    if odd.len() > 8 {
        odd.truncate(8);
    }
    let mut cands: Vec<i64> = Vec::new();
    for mask in 0u32..(1 << odd.len()) {
        let o: i64 = (0..odd.len()).filter(|i| mask >> i & 1 == 1).map(|i| odd[i]).product();
        for &t in &two {
            let d = o * t;
            if d != 1 {
                cands.push(d);
            }
        }
    }
    cands.sort_by_key(|d| std::cmp::Reverse(d.unsigned_abs()));
    for d in cands {
        let dd = d.unsigned_abs();
        if n % (dd * dd) != 0 {
            continue;
        }
        let n0 = n / (dd * dd);
        if crate::arith::gcd_u64(n0, dd) != 1 {
            continue;
        }
        let (base, cond, base_sign) = crate::rootno::minimal_conductor_sign(&twist_model(curve, d)?)?;
        if cond != n0 {
            continue;
        }
        let primes: Vec<malachite::Natural> = crate::arith::factor_u64(n0)?.into_iter().map(|(p, _)| p.into()).collect();
        let local = bad_primes_data(&base, &primes)?;
        let base_bad = local
            .iter()
            .map(|l| {
                let ap = match l.reduction {
                    Reduction::SplitMultiplicative => 1,
                    Reduction::NonSplitMultiplicative => -1,
                    _ => 0,
                };
                (u64::try_from(&l.prime).unwrap_or(0), ap)
            })
            .collect();
        return Ok(Some(Twist { d, base, base_conductor: n0, base_bad, base_sign }));
    }
    Ok(None)
}

/// The Heegner form `f = [A, B, C]` (its root `τ`) shifted to `τ + u / k`:
/// `[A k, B k - 2 A u, C k - B u + A u^2 / k]`, of discriminant `D k^2`
/// (integral since `k | A`).
pub(crate) fn shifted(f: &QuadraticForm, k: i128, u: i128) -> Option<QuadraticForm> {
    let a = f.a.checked_mul(k)?;
    let b = f.b.checked_mul(k)?.checked_sub(f.a.checked_mul(2 * u)?)?;
    let c = f.c.checked_mul(k)?.checked_sub(f.b.checked_mul(u)?)?.checked_add(f.a.checked_mul(u * u)? / k)?;
    Some(QuadraticForm { a, b, c })
}

fn ext_gcd(a: i128, b: i128) -> (i128, i128, i128) {
    // returns (g, x, y) with a x + b y = g >= 0
    let (mut r0, mut r1, mut s0, mut s1, mut t0, mut t1) = (a, b, 1i128, 0i128, 0i128, 1i128);
    while r1 != 0 {
        let q = r0.div_euclid(r1);
        (r0, r1) = (r1, r0 - q * r1);
        (s0, s1) = (s1, s0 - q * s1);
        (t0, t1) = (t1, t0 - q * t1);
    }
    if r0 < 0 {
        (-r0, -s0, -t0)
    } else {
        (r0, s0, t0)
    }
}

fn small_gcd(a: i128, b: i128) -> i128 {
    let (mut a, mut b) = (a.unsigned_abs() as u64, b.unsigned_abs() as u64);
    while b != 0 {
        (a, b) = (b, a % b);
    }
    a as i128
}

fn gcd(a: i128, b: i128) -> i128 {
    ext_gcd(a, b).0
}

/// The SL2(Z)-reduced form of `g` with the matrix `M` (columns: the images
/// of the new basis) such that `g(M v) = reduced(v)`.
fn reduce_tracking(mut g: QuadraticForm) -> Option<(QuadraticForm, [[i128; 2]; 2])> {
    let mut m = [[1i128, 0], [0, 1]];
    for _ in 0..10_000 {
        // x = x' + k y': b' = b + 2 a k, c' = a k^2 + b k + c
        let two_a = 2 * g.a;
        let k = (g.a - g.b).div_euclid(two_a); // b + 2ak in (-a, a]
        if k != 0 {
            let c = g.a.checked_mul(k.checked_mul(k)?)?.checked_add(g.b.checked_mul(k)?)?.checked_add(g.c)?;
            g = QuadraticForm { a: g.a, b: g.b + two_a * k, c };
            m = [[m[0][0], m[0][0] * k + m[0][1]], [m[1][0], m[1][0] * k + m[1][1]]];
        }
        if g.a > g.c {
            // x = -y', y = x'
            g = QuadraticForm { a: g.c, b: -g.b, c: g.a };
            m = [[m[0][1], -m[0][0]], [m[1][1], -m[1][0]]];
            continue;
        }
        return Some((g, m));
    }
    None
}

/// A form in the `Γ0(n0)`-orbit of `f` (with `n0 | A`) with a small first
/// coefficient: `f(e, -c)` minimised over `n0 | c`, `gcd(c, e) = 1`, the
/// point `τ` mapped by `[[a, b], [c, e]]` (`a e - b c = 1`). The root of
/// the result has imaginary part at least about `sqrt(3) / (2 n0)` when
/// the shortest vectors allow it; `None` on overflow.
pub(crate) fn raised(f: &QuadraticForm, n0: i128) -> Option<QuadraticForm> {
    let g = QuadraticForm { a: f.a, b: f.b.checked_mul(-n0)?, c: f.c.checked_mul(n0.checked_mul(n0)?)? };
    let (r, m) = reduce_tracking(g)?;
    let mut best: Option<(i128, i128, i128)> = None; // (value, e, c')
    // shells max(|s|, |t|) = R: a reduced form has r(s, t) >= (3/4) a R^2
    // (|b| <= a <= c), so the search stops once that exceeds the best value
    for radius in 1i128..=12 {
        if best.is_some_and(|b| 4 * b.0 < 3 * r.a * radius * radius) {
            break;
        }
        for s in -radius..=radius {
            for t in -radius..=radius {
                if s.abs().max(t.abs()) != radius || small_gcd(s, t) != 1 {
                    continue;
                }
                let val = r.a * s * s + r.b * s * t + r.c * t * t;
                if best.is_some_and(|b| b.0 <= val) {
                    continue;
                }
                let e = m[0][0] * s + m[0][1] * t;
                let cp = m[1][0] * s + m[1][1] * t;
                if gcd(e, n0.checked_mul(cp)?) == 1 {
                    best = Some((val, e, cp));
                }
            }
        }
    }
    let (_, e, cp) = best?;
    let c = n0 * cp;
    let (g1, x, y) = ext_gcd(e, c); // e x + c y = 1: a = x, b = -y
    debug_assert_eq!(g1, 1);
    let (a, b) = (x, -y);
    let fa = f.a.checked_mul(e * e)?.checked_sub(f.b.checked_mul(e * c)?)?.checked_add(f.c.checked_mul(c * c)?)?;
    let fb = (-2 * f.a).checked_mul(e.checked_mul(b)?)?.checked_add(f.b.checked_mul(a * e + b * c)?)?.checked_sub((2 * f.c).checked_mul(a.checked_mul(c)?)?)?;
    let fc = f.a.checked_mul(b * b)?.checked_sub(f.b.checked_mul(a * b)?)?.checked_add(f.c.checked_mul(a * a)?)?;
    let out = QuadraticForm { a: fa, b: fb, c: fc };
    (out.discriminant() == f.discriminant() && out.a > 0 && out.a % n0 == 0).then_some(out)
}

/// The image of the root `τ` of `f = [A, B, C]` (`n0 | A`) under the
/// Atkin-Lehner involution `W = [[0, -1], [n0, 0]]`, `τ -> -1/(n0 τ)`:
/// the form `[C n0, -B, A / n0]`, of the same discriminant.
pub(crate) fn atkin_lehner(f: &QuadraticForm, n0: i128) -> Option<QuadraticForm> {
    if f.a % n0 != 0 {
        return None;
    }
    Some(QuadraticForm { a: f.c.checked_mul(n0)?, b: -f.b, c: f.a / n0 })
}

/// The evaluation points of the twisted series, as forms of discriminant
/// `D d^2` at level `N0`: `z0` is summed over `plus` minus `minus`; the
/// points of `plus_w` and `minus_w` are the Atkin-Lehner images of the
/// points they stand for, so that `z0(τ) = ε (z0(W τ) - c)` there, `ε` the
/// eigenvalue of `W` on the newform of the base and `c = (1 - ε)
/// z0(i / sqrt N0)` (see [`twisted_forms`]).
#[derive(Clone, Debug, Default)]
pub(crate) struct TwistPoints {
    pub plus: Vec<QuadraticForm>,
    pub minus: Vec<QuadraticForm>,
    pub plus_w: Vec<QuadraticForm>,
    pub minus_w: Vec<QuadraticForm>,
}

impl TwistPoints {
    /// Every form, for term counts.
    pub(crate) fn all(&self) -> impl Iterator<Item = &QuadraticForm> {
        self.plus.iter().chain(&self.minus).chain(&self.plus_w).chain(&self.minus_w)
    }
}

/// The shifted and raised forms of the Heegner forms `forms` (level
/// `N0 |d|^2`) for the twist by `d`, grouped by `χ(u) = ±1`, all of
/// discriminant `D d^2`. Each point `τ + u/|d|` is moved by `Γ0(N0)` to a
/// large imaginary part ([`raised`]), or, when that leaves it nearer the
/// real line than its image under the Atkin-Lehner involution `W` of level
/// `N0` (a point near the cusp 0), the image `W τ` is raised instead: the
/// newform is an eigenform of `W` with eigenvalue `ε = -w` (`w` the root
/// number of the base; Atkin and Lehner 1970), so `f(W τ) = ε N0 τ^2
/// f(τ)` and `z0(W τ) = ε z0(τ) + c` with the constant fixed at the fixed
/// point `τ = i / sqrt N0`: `c = (1 - ε) z0(i / sqrt N0)`. `None` on
/// overflow.
pub(crate) fn twisted_forms(forms: &[QuadraticForm], d: i64, n0: u64) -> Option<TwistPoints> {
    let k = d.unsigned_abs() as i128;
    let n0 = n0 as i128;
    let mut out = TwistPoints::default();
    for f in forms {
        for u in 1..k {
            let chi = crate::arith::kronecker_i64(d, u as u64);
            if chi == 0 {
                continue;
            }
            let s = shifted(f, k, u)?;
            let r = raised(&s, n0)?;
            let rw = atkin_lehner(&s, n0).and_then(|w| raised(&w, n0));
            let (r, moved) = match rw {
                Some(w) if w.a < r.a => (w, true),
                _ => (r, false),
            };
            match (chi > 0, moved) {
                (true, false) => out.plus.push(r),
                (false, false) => out.minus.push(r),
                (true, true) => out.plus_w.push(r),
                (false, true) => out.minus_w.push(r),
            }
        }
    }
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The congruent-number curve y^2 = x^3 - 25 x (conductor 800) is the
    /// twist of y^2 = x^3 - x (conductor 32) by 5.
    #[test]
    fn congruent_curve_is_a_twist_of_conductor_32() {
        let e = Curve::from_coefficients([0, 0, 0, -25, 0]).unwrap();
        let t = smallest_twist(&e, 800).unwrap().unwrap();
        assert_eq!((t.d, t.base_conductor), (5, 32));
        let e = Curve::from_coefficients([0, 0, 0, -49, 0]).unwrap();
        let t = smallest_twist(&e, 1568).unwrap().unwrap();
        assert_eq!((t.d, t.base_conductor), (-7, 32));
    }

    #[test]
    fn raised_forms_keep_the_discriminant_and_level() {
        // Heegner forms of level 800 = 32 * 5^2 and D = -31 (2 and 5 split)
        let h = super::super::forms::heegner_data(-31, 800).unwrap().unwrap();
        for f in &h.forms {
            let s = shifted(f, 5, 2).unwrap();
            assert_eq!(s.discriminant(), -31 * 25);
            let r = raised(&s, 32).unwrap();
            assert_eq!(r.discriminant(), -31 * 25);
            assert_eq!(r.a % 32, 0);
            // Im tau = sqrt|D'| / (2A): at least sqrt(3)/(2 * 32) up to the gcd condition
            assert!(r.a <= s.a, "{r:?} {s:?}");
            assert!((31f64 * 25.0).sqrt() / (2.0 * r.a as f64) > 0.2 / 32.0);
        }
    }
}

#[cfg(test)]
mod identity {
    use super::*;
    use crate::budget::Work;
    use crate::heegner::analytic::{modular_sum, terms_needed};
    use crate::heights::real::{fi, sqrt, to_f64, Cx};
    use crate::heights::PeriodLattice;

    /// The twist identity `Σ χ(n) a_n/n q^n = g^-1 Σ_u χ(u) z0(τ + u/|d|)`
    /// (Shimura 1971, Prop. 3.64) checked numerically for y^2 = x^3 - 25x
    /// (the twist by 5 of y^2 = x^3 - x): the shifted forms without the
    /// Γ0(32) move give the direct sum to 1e-25; with the move, the
    /// difference times `sqrt 5` lies in the period lattice of the base
    /// (modular invariance of `z0`), up to a rational of denominator <= 4.
    #[test]
    fn twisted_sum_equals_the_direct_sum() {
        let e = Curve::from_coefficients([0, 0, 0, -25, 0]).unwrap();
        let t = smallest_twist(&e, 800).unwrap().unwrap();
        let h = super::super::forms::heegner_data(-31, 800).unwrap().unwrap();
        let prec = 120;
        let work = Work::unlimited();
        let bad_e = vec![(2u64, 0i64), (5, 0)];
        let m_direct = h.forms.iter().map(|f| terms_needed(f.a as f64, 31.0, prec)).max().unwrap();
        let a = super::super::traces::dirichlet_coefficients_fast(&e, &bad_e, m_direct + 10, &|| false).unwrap();
        let direct = modular_sum(&a, &h.forms, -31, prec, &work).unwrap();
        let disc = -31 * 25;
        let (mut sp, mut sm, mut rp, mut rm) = (vec![], vec![], vec![], vec![]);
        for f in &h.forms {
            for u in 1..5i128 {
                let s = shifted(f, 5, u).unwrap();
                let r = raised(&s, 32).unwrap();
                if crate::arith::kronecker_i64(5, u as u64) > 0 {
                    sp.push(s);
                    rp.push(r);
                } else {
                    sm.push(s);
                    rm.push(r);
                }
            }
        }
        let m0 = sp.iter().chain(&sm).map(|f| terms_needed(f.a as f64, 775.0, prec)).max().unwrap();
        let b = super::super::traces::dirichlet_coefficients_fast(&t.base, &t.base_bad, m0 + 10, &|| false).unwrap();
        let wp = prec + 32;
        let g = sqrt(&fi(5, wp), wp);
        let tw = |p: &[QuadraticForm], m: &[QuadraticForm]| -> Cx {
            let d = modular_sum(&b, p, disc, prec, &work).unwrap().sub(&modular_sum(&b, m, disc, prec, &work).unwrap());
            Cx::new(&d.re / &g, &d.im / &g)
        };
        let unmoved = tw(&sp, &sm);
        let diff = unmoved.sub(&direct);
        assert!(to_f64(&diff.re).abs() < 1e-25 && to_f64(&diff.im).abs() < 1e-25, "{:?}", (to_f64(&diff.re), to_f64(&diff.im)));
        let moved = tw(&rp, &rm);
        let delta = moved.sub(&unmoved);
        let delta = Cx::new(&delta.re * &g, &delta.im * &g);
        let pl = PeriodLattice::compute(&t.base, wp).unwrap();
        let lat = crate::heights::elliptic::Lattice::new(&pl, wp);
        let (x, y) = lat.coordinates(&delta);
        let (x, y) = (to_f64(&x), to_f64(&y));
        assert!([x, y].iter().all(|v| ((4.0 * v) - (4.0 * v).round()).abs() < 1e-20), "{x} {y}");
    }
}

#[cfg(test)]
mod involution {
    use super::*;
    use crate::budget::Work;
    use crate::heegner::analytic::{modular_sum, terms_needed};
    use crate::heights::real::{fi, to_f64};

    /// `z0(W τ) = ε z0(τ) + (1 - ε) z0(i / sqrt N0)` with `ε = -w`
    /// (Atkin and Lehner 1970; the sign of the functional equation is
    /// `-ε` for weight 2): checked numerically on y^2 = x^3 - x (N0 = 32,
    /// w = +1) and y^2 + y = x^3 - x (N0 = 37, w = -1) at points of
    /// moderate imaginary part on both sides.
    #[test]
    fn atkin_lehner_relation_holds() {
        for (coeffs, n0) in [([0, 0, 0, -1, 0], 32i128), ([0, 0, 1, -1, 0], 37)] {
            let e = Curve::from_coefficients(coeffs).unwrap();
            let (_, _, w) = crate::rootno::minimal_conductor_sign(&e).unwrap();
            let eps = -i64::from(w);
            let primes: Vec<malachite::Natural> = crate::arith::factor_u64(n0 as u64).unwrap().into_iter().map(|(p, _)| p.into()).collect();
            let bad: Vec<(u64, i64)> = bad_primes_data(&e, &primes)
                .unwrap()
                .iter()
                .map(|l| {
                    let ap = match l.reduction {
                        Reduction::SplitMultiplicative => 1,
                        Reduction::NonSplitMultiplicative => -1,
                        _ => 0,
                    };
                    (u64::try_from(&l.prime).unwrap(), ap)
                })
                .collect();
            // τ root of [n0, 1, n0], Im τ near 1/2, W τ near i/n0
            let f = QuadraticForm { a: n0, b: 1, c: n0 };
            let d = f.discriminant() as i64;
            let g = atkin_lehner(&f, n0).unwrap();
            assert_eq!(g.discriminant(), f.discriminant());
            let prec = 100;
            let m = [f, g].iter().map(|h| terms_needed(h.a as f64, (-d) as f64, prec)).max().unwrap().max(terms_needed(n0 as f64, 4.0 * n0 as f64, prec));
            let a = crate::heegner::traces::dirichlet_coefficients_fast(&e, &bad, m + 10, &|| false).unwrap();
            let work = Work::unlimited();
            let zf = modular_sum(&a, &[f], d, prec, &work).unwrap();
            let zg = modular_sum(&a, &[g], d, prec, &work).unwrap();
            let c = modular_sum(&a, &[QuadraticForm { a: n0, b: 0, c: 1 }], -4 * n0 as i64, prec, &work).unwrap();
            let k = fi(1 - eps, 160);
            let e_ = fi(eps, 160);
            let re = &zg.re - &e_ * &zf.re - &k * &c.re;
            let im = &zg.im - &e_ * &zf.im - &k * &c.im;
            assert!(to_f64(&re).abs() < 1e-25 && to_f64(&im).abs() < 1e-25, "{} {}", to_f64(&re), to_f64(&im));
        }
    }
}
