//! Reduction of binary quartics and the `GL2(Z)`-equivalence test.
//!
//! # Theory
//!
//! Let `φ_1, φ_2, φ_3` be the roots of the resolvent cubic
//! `F(φ) = φ^3 - 3Iφ + J`. For each root the quartic `4φ g - g_H` is
//! `3 q_φ^2` for a quadratic form `q_φ` (classical; the three `q_φ` are the
//! quadratic covariants of Cremona, *Reduction of binary cubic and quartic
//! forms*, LMS J. Comput. Math. 2 (1999), and of BSD 1963), with
//! `disc(q_φ) = (4/9) F'(φ)`; for `M ∈ GL2(Z)` one has
//! `q_φ(g∘M) = ± q_φ(g)∘M`. Exactly one real positive definite form `Q(g)` is
//! attached to every real quartic of non-zero discriminant:
//!
//! * four real roots: `Q = q_φ` for the middle root `φ` of `F` (the pairing
//!   of the roots that interlace);
//! * no real roots: `Q = q_φ / i` for the smallest root (positive definite `g`)
//!   or the largest root (negative definite `g`);
//! * two real roots: `Q = Re q_φ` for the complex root `φ` with `Im φ > 0`.
//!
//! We call `g` *reduced* when `Q(g)`, or equivalently its root `τ(g)` in the
//! upper half plane, is reduced in the sense of Gauss (`τ` in the standard
//! fundamental domain `|Re τ| ≤ 1/2`, `|τ| ≥ 1`). Since
//! `τ(g∘M) = M^{-1} τ(g)` (or its reflection when `det M = -1`), every
//! `GL2(Z)`-class contains reduced forms, finitely many, and two forms are
//! equivalent iff their sets of reduced forms meet.
//!
//! `τ` is computed in floating point; the set of forms whose `τ` lies in the
//! domain enlarged by `1e-6` is collected, which contains every exactly
//! reduced form as long as the floating-point error in `τ` stays below that
//! margin (the form is first moved, by exact integer transformations, to a
//! form whose `τ` is reduced, and `τ` is recomputed from its exact
//! coefficients, so the error is that of a small, well-conditioned form).
//! Two forms are declared equivalent only after an exact check: a common
//! element of both sets, with the integer transformation returned.

use super::core::{det, mat_identity, mat_inverse_unimodular, mat_mul, Matrix, Quartic, RootType};
use super::numeric::{resolvent_roots, significant_bits, to_f64_scaled, CubicRoots};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::base::num::conversion::traits::RoundingFrom;
use malachite::base::rounding_modes::RoundingMode;
use malachite::Integer;

#[derive(Clone, Copy, Debug)]
struct C {
    re: f64,
    im: f64,
}

impl C {
    fn new(re: f64, im: f64) -> C {
        C { re, im }
    }
    fn sub(self, o: C) -> C {
        C::new(self.re - o.re, self.im - o.im)
    }
    fn mul(self, o: C) -> C {
        C::new(self.re * o.re - self.im * o.im, self.re * o.im + self.im * o.re)
    }
    fn scale(self, s: f64) -> C {
        C::new(self.re * s, self.im * s)
    }
    fn div(self, o: C) -> C {
        let n = o.re * o.re + o.im * o.im;
        C::new((self.re * o.re + self.im * o.im) / n, (self.im * o.re - self.re * o.im) / n)
    }
    fn abs(self) -> f64 {
        self.re.hypot(self.im)
    }
    fn sqrt(self) -> C {
        let r = self.abs();
        if r == 0.0 {
            return C::new(0.0, 0.0);
        }
        let re = ((r + self.re) / 2.0).max(0.0).sqrt();
        let im = ((r - self.re) / 2.0).max(0.0).sqrt();
        C::new(re, if self.im < 0.0 { -im } else { im })
    }
}

/// The quadratic `q` with `q^2 = p` for a quartic `p` that is a square.
fn quadratic_sqrt(p: [C; 5]) -> Option<[C; 3]> {
    let (a0, a4) = (p[0].abs(), p[4].abs());
    if a0 == 0.0 && a4 == 0.0 {
        return None;
    }
    if a0 >= a4 {
        let a = p[0].sqrt();
        let b = p[1].div(a.scale(2.0));
        let c = p[2].sub(b.mul(b)).div(a.scale(2.0));
        Some([a, b, c])
    } else {
        let c = p[4].sqrt();
        let b = p[3].div(c.scale(2.0));
        let a = p[2].sub(b.mul(b)).div(c.scale(2.0));
        Some([a, b, c])
    }
}

/// The positive definite quadratic covariant `Q(g)` (up to a positive
/// factor), as floating-point `(A, B, C)`, or `None` for zero discriminant or
/// numerical failure.
pub(crate) fn definite_covariant(g: &Quartic) -> Option<(f64, f64, f64)> {
    let rt = g.root_type()?;
    let coeffs = g.coeff_refs();
    let maxbits = coeffs.iter().map(|c| significant_bits(c)).max().unwrap_or(0);
    let shift = maxbits.saturating_sub(100);
    let gf: Vec<f64> = coeffs.iter().map(|c| to_f64_scaled(c, shift)).collect();
    let gh = g.hessian();
    let hf: Vec<f64> = gh.coeff_refs().iter().map(|c| to_f64_scaled(c, 2 * shift)).collect();
    let i = to_f64_scaled(&g.invariant_i(), 2 * shift);
    let j = to_f64_scaled(&g.invariant_j(), 3 * shift);
    let (phi, sign) = match (rt, resolvent_roots(i, j, rt != RootType::TwoReal)) {
        (RootType::FourReal, CubicRoots::Three(r)) => (C::new(r[1], 0.0), 1.0),
        (RootType::PositiveDefinite, CubicRoots::Three(r)) => (C::new(r[0], 0.0), -1.0),
        (RootType::NegativeDefinite, CubicRoots::Three(r)) => (C::new(r[2], 0.0), -1.0),
        (RootType::TwoReal, CubicRoots::One { complex, .. }) => (C::new(complex.0, complex.1), 1.0),
        _ => return None,
    };
    let mut p = [C::new(0.0, 0.0); 5];
    for k in 0..5 {
        p[k] = phi.scale(4.0 * gf[k]).sub(C::new(hf[k], 0.0)).scale(sign / 3.0);
    }
    let q = quadratic_sqrt(p)?;
    let (mut a, mut b, mut c) = (q[0].re, q[1].re, q[2].re);
    if a < 0.0 {
        a = -a;
        b = -b;
        c = -c;
    }
    let d = 4.0 * a * c - b * b;
    if !(d > 0.0) || !(a > 0.0) || !d.is_finite() {
        return None;
    }
    Some((a, b, c))
}

/// The root `τ(g)` of `Q(g)` in the upper half plane, as `(Re τ, Im τ)`.
///
/// Computed in double precision first; when that fails, or when `τ` comes
/// out within `1e-4` of the boundary of the fundamental domain (where the
/// cancellation in `4φ g - g_H` and in `4AC - B^2` matters: forms whose
/// resolvent roots nearly coincide lose many digits), it is recomputed with
/// 256-bit floats (more for large coefficients), which brings the error far
/// below the margins used by the reduction.
pub(crate) fn tau(g: &Quartic) -> Option<(f64, f64)> {
    // nearly coincident resolvent roots (4I^3 - J^2 tiny beside J^2) make the
    // double-precision covariant unreliable anywhere in the domain
    // so do coefficients beyond 2^40: the terms of 4φ g - g_H then cancel
    // far beyond double precision without τ coming near the boundary (found
    // by the fuzz harness: about 1% of random 20-digit quartics were left
    // unreduced, and `gl2z_equivalent` said "not equivalent" to a unimodular
    // transform)
    if ill_conditioned(g) || g.coeff_refs().iter().any(|c| significant_bits(c) > 40) {
        if let Some(t) = precise::tau(g) {
            return Some(t);
        }
    }
    let quick = definite_covariant(g).and_then(|(a, b, c)| {
        let d = 4.0 * a * c - b * b;
        let t = (-b / (2.0 * a), d.sqrt() / (2.0 * a));
        (t.0.is_finite() && t.1.is_finite() && t.1 > 0.0).then_some(t)
    });
    match quick {
        Some(t) if !near_boundary(t) => Some(t),
        _ => precise::tau(g).or(quick),
    }
}

/// Whether `|4I^3 - J^2|` is below `2^-20` times `J^2 + 4|I|^3`.
fn ill_conditioned(g: &Quartic) -> bool {
    use malachite::base::num::arithmetic::traits::Abs;
    let i = g.invariant_i();
    let j = g.invariant_j();
    let i3 = Integer::from(4) * &i * &i * &i;
    let j2 = &j * &j;
    let d = (&i3 - &j2).abs();
    let scale = i3.abs() + j2;
    significant_bits(&d) + 20 < significant_bits(&scale)
}

fn near_boundary(t: (f64, f64)) -> bool {
    const W: f64 = 1e-4;
    (t.0.abs() - 0.5).abs() < W || (t.0 * t.0 + t.1 * t.1 - 1.0).abs() < W
}

/// The covariant `Q(g)` and `τ(g)` in multiple precision (malachite `Float`).
mod precise {
    use super::super::core::{Quartic, RootType};
    use super::super::numeric::{resolvent_roots, significant_bits, to_f64_scaled, CubicRoots};
    use crate::heights::real::{fi, fz, sqrt, to_f64, Cx};
    use malachite::Float;

    /// Newton's method for `φ^3 - 3Iφ + J` from a double-precision start.
    fn polish(t0: f64, i: &Float, j: &Float, prec: u64) -> Float {
        let three = fi(3, prec);
        let mut t = fi(0, prec) + Float::from(t0);
        for _ in 0..12 {
            let t2 = &t * &t;
            let f = &(&t2 - &(&three * i)) * &t + j;
            let d = &(&three * &t2) - &(&three * i);
            if d == 0u32 {
                break;
            }
            let step = &f / &d;
            t = &t - &step;
            if step == 0u32 {
                break;
            }
        }
        t
    }

    /// The root of `φ^3 - 3Iφ + J` in `[lo, hi]`, where the cubic is
    /// monotone and changes sign, by bisection to the working precision.
    fn bisect_root(mut lo: Float, mut hi: Float, i: &Float, j: &Float, prec: u64) -> Float {
        let three = fi(3, prec);
        let f = |t: &Float| &(&(t * t) - &(&three * i)) * t + j;
        let lo_neg = f(&lo) < 0u32;
        let half = Float::from(0.5f64);
        for _ in 0..prec + 8 {
            let mid = &(&lo + &hi) * &half;
            if mid == lo || mid == hi {
                break;
            }
            if (f(&mid) < 0u32) == lo_neg {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        lo
    }

    pub(super) fn tau(g: &Quartic) -> Option<(f64, f64)> {
        let rt = g.root_type()?;
        let coeffs = g.coeff_refs();
        let maxbits = coeffs.iter().map(|c| significant_bits(c)).max().unwrap_or(0);
        let prec = 256 + 4 * maxbits;
        let i_exact = g.invariant_i();
        let j_exact = g.invariant_j();
        let shift = maxbits.saturating_sub(100);
        let fi_ = to_f64_scaled(&i_exact, 2 * shift);
        let fj_ = to_f64_scaled(&j_exact, 3 * shift);
        let up = (shift as f64).exp2();
        let i = fz(&i_exact, prec);
        let j = fz(&j_exact, prec);
        let gh = g.hessian();
        let hc = gh.coeff_refs();
        let (two, three, four) = (fi(2, prec), fi(3, prec), fi(4, prec));
        // three real roots: each found by bisection in its own interval
        // (-2√I, -√I), (-√I, √I), (√I, 2√I) between the critical points of
        // φ^3 - 3Iφ + J, where the cubic is monotone; Newton's method from a
        // double-precision start could land on a neighbouring root when two
        // roots are close
        let isolated = |k: usize| -> Option<Cx> {
            if i <= 0u32 {
                return None;
            }
            let s = sqrt(&i, prec);
            let two_s = &two * &s;
            let (lo, hi) = match k {
                0 => (-two_s.clone(), -s.clone()),
                1 => (-s.clone(), s.clone()),
                _ => (s.clone(), two_s.clone()),
            };
            Some(Cx::real(bisect_root(lo, hi, &i, &j, prec)))
        };
        let (phi, sign) = match (rt, resolvent_roots(fi_, fj_, rt != RootType::TwoReal)) {
            (RootType::FourReal, CubicRoots::Three(_)) => (isolated(1)?, 1),
            (RootType::PositiveDefinite, CubicRoots::Three(_)) => (isolated(0)?, -1),
            (RootType::NegativeDefinite, CubicRoots::Three(_)) => (isolated(2)?, -1),
            (RootType::TwoReal, CubicRoots::One { real, .. }) => {
                let r = polish(real * up, &i, &j, prec);
                // the complex roots: -r/2 ± iκ with κ^2 = 3r^2/4 - 3I
                let k2 = &(&(&three * &(&r * &r)) / &four) - &(&three * &i);
                if k2 <= 0u32 {
                    return None;
                }
                (Cx::new(-(&r / &two), sqrt(&k2, prec)), 1)
            }
            _ => return None,
        };
        // p = ±(4φ g - g_H)/3, the square of the covariant q_φ
        let factor = Cx::real(fi(sign, prec) / &three);
        let p: Vec<Cx> = (0..5)
            .map(|k| {
                let v = phi.mul(&Cx::real(&four * fz(coeffs[k], prec))).sub(&Cx::real(fz(hc[k], prec)));
                v.mul(&factor)
            })
            .collect();
        let twice = |z: &Cx| z.mul(&Cx::real(two.clone()));
        let (qa, qb, qc) = if p[0].norm2() >= p[4].norm2() {
            if p[0].norm2() == 0u32 {
                return None;
            }
            let a = p[0].sqrt(prec);
            let b = p[1].div(&twice(&a));
            let c = p[2].sub(&b.mul(&b)).div(&twice(&a));
            (a, b, c)
        } else {
            let c = p[4].sqrt(prec);
            let b = p[3].div(&twice(&c));
            let a = p[2].sub(&b.mul(&b)).div(&twice(&c));
            (a, b, c)
        };
        let (mut a, mut b, mut c) = (qa.re, qb.re, qc.re);
        if a < 0u32 {
            a = -a;
            b = -b;
            c = -c;
        }
        let d = &(&four * &(&a * &c)) - &(&b * &b);
        if d <= 0u32 || a <= 0u32 {
            return None;
        }
        let re = -(&b / &(&two * &a));
        let im = &sqrt(&d, prec) / &(&two * &a);
        let t = (to_f64(&re), to_f64(&im));
        (t.0.is_finite() && t.1.is_finite() && t.1 > 0.0).then_some(t)
    }
}

const TOL_LOOP: f64 = 1e-8;
const TOL_SET: f64 = 1e-6;

fn in_domain(t: (f64, f64), eps: f64) -> bool {
    t.0.abs() <= 0.5 + eps && t.0 * t.0 + t.1 * t.1 >= 1.0 - eps
}

/// Move `g` by exact integer transformations until `τ` is reduced.
/// Returns the reduced form, the matrix `M` with `g∘M` = form, and `τ`.
pub(crate) fn reduce_tau(g: &Quartic) -> Option<(Quartic, Matrix, (f64, f64))> {
    let mut h = g.clone();
    let mut m = mat_identity();
    // the form two steps back: a form whose τ lies on the boundary of the
    // domain can be sent back and forth by rounding noise; such a form is
    // accepted once it lies in the domain enlarged by the set's margin
    let mut back: [Option<Quartic>; 2] = [None, None];
    for _ in 0..2000 {
        let t = tau(&h)?;
        if back[0].as_ref() == Some(&h) && in_domain(t, TOL_SET / 10.0) {
            return Some((h, m, t));
        }
        back = [back[1].take(), Some(h.clone())];
        if t.0.abs() > 0.5 + TOL_LOOP {
            let n = Integer::rounding_from(t.0, RoundingMode::Nearest).0;
            let tm: Matrix = [[Integer::ONE, n], [Integer::ZERO, Integer::ONE]];
            h = h.transform(&tm);
            m = mat_mul(&m, &tm);
            continue;
        }
        if t.0 * t.0 + t.1 * t.1 < 1.0 - TOL_LOOP {
            let s: Matrix = [[Integer::ZERO, Integer::ONE], [-Integer::ONE, Integer::ZERO]];
            h = h.transform(&s);
            m = mat_mul(&m, &s);
            continue;
        }
        return Some((h, m, t));
    }
    None
}

/// Matrices of `GL2(Z)` with entries in `[-2, 2]`: they include every `N`
/// with `N F` meeting a small neighbourhood of the fundamental domain `F`.
pub(crate) fn neighbours() -> &'static [[[i64; 2]; 2]] {
    use std::sync::OnceLock;
    static LIST: OnceLock<Vec<[[i64; 2]; 2]>> = OnceLock::new();
    LIST.get_or_init(|| {
        let mut v = Vec::new();
        for a in -2i64..=2 {
            for b in -2i64..=2 {
                for c in -2i64..=2 {
                    for d in -2i64..=2 {
                        let dt = a * d - b * c;
                        if dt == 1 || dt == -1 {
                            v.push([[a, b], [c, d]]);
                        }
                    }
                }
            }
        }
        v
    })
}

/// All forms `g∘M` (with their matrices `M`) whose `τ` may lie in the
/// closed fundamental domain: a set that provably contains every reduced
/// form of the class (the covariant point is enclosed by interval
/// arithmetic, module `proven`). `None` for zero discriminant (or the
/// precision guard of that module).
pub(crate) fn near_reduced_set(g: &Quartic) -> Option<Vec<(Quartic, Matrix)>> {
    super::proven::candidate_set(g).ok()
}

pub(crate) fn size_key(g: &Quartic) -> ([Integer; 5], [Integer; 5]) {
    use malachite::base::num::arithmetic::traits::Abs;
    let c = g.coeffs();
    (c.clone().map(|v| v.abs()), c)
}

/// A reduced form `GL2(Z)`-equivalent to `q`, with the matrix `M` such that
/// `q.transform(&M)` is that form (`det M = ±1`).
///
/// The form returned has its positive definite quadratic covariant reduced
/// (see the module documentation; Cremona, *Reduction of binary cubic and
/// quartic forms*, LMS J. Comput. Math. 2 (1999)); among the few such forms the
/// one with the smallest coefficient sizes is chosen. Forms of zero
/// discriminant are returned unchanged with the identity matrix.
///
/// ```
/// use malachite::Integer;
/// use twofold::quartic::{reduce, Quartic};
/// let g = Quartic::from_coeffs([1, 0, -5, 0, 4]);
/// let m = [[Integer::from(7), Integer::from(3)], [Integer::from(2), Integer::from(1)]];
/// let big = g.transform(&m);
/// let (r, n) = reduce(&big);
/// assert_eq!(big.transform(&n), r);
/// assert!(r.a.clone() * r.a.clone() <= 25);
/// ```
pub fn reduce(q: &Quartic) -> (Quartic, Matrix) {
    match near_reduced_set(q) {
        // the set holds at least the reduced form itself (the identity is
        // among the neighbours); an empty set is treated like a failure
        Some(set) => match set.into_iter().min_by(|x, y| size_key(&x.0).cmp(&size_key(&y.0))) {
            Some(best) => best,
            None => (q.clone(), mat_identity()),
        },
        None => (q.clone(), mat_identity()),
    }
}

/// A matrix `M ∈ GL2(Z)` with `g1.transform(&M) == g2`, if the two quartics
/// are `GL2(Z)`-equivalent (non-zero discriminant required; for zero
/// discriminant only identical forms are recognised). The answer is proven
/// at any size: see [`gl2z_decide`].
///
/// ```
/// use malachite::Integer;
/// use twofold::quartic::{gl2z_equivalence, Quartic};
/// let g = Quartic::from_coeffs([2, 1, -3, 5, 1]);
/// let m = [[Integer::from(3), Integer::from(-1)], [Integer::from(-5), Integer::from(2)]];
/// let h = g.transform(&m);
/// let n = gl2z_equivalence(&g, &h).unwrap();
/// assert_eq!(g.transform(&n), h);
/// ```
pub fn gl2z_equivalence(g1: &Quartic, g2: &Quartic) -> Option<Matrix> {
    gl2z_decide(g1, g2).ok().flatten()
}

/// The proven `GL2(Z)`-equivalence test: `Ok(Some(M))` with
/// `g1.transform(&M) == g2` (checked in integers), `Ok(None)` when the two
/// forms are provably not equivalent, an error of kind
/// [`ErrorKind::InvalidValue`](crate::ErrorKind::InvalidValue) for distinct
/// forms of zero discriminant.
///
/// The covariant point of each form is enclosed by interval arithmetic in
/// multiple precision (raised until it decides), which makes the finite set
/// of candidate reduced forms of each class provably complete; the two
/// classes are equal exactly when these sets share a form (module
/// documentation of `quartic::proven`; reduction theory: Cremona, *Reduction
/// of binary cubic and quartic forms*, LMS J. Comput. Math. 2 (1999)). No
/// floating-point guess decides either answer.
///
/// ```
/// use twofold::quartic::{gl2z_decide, Quartic};
/// let g = Quartic::from_coeffs([1, 0, 0, 0, -1]);
/// assert!(gl2z_decide(&g, &Quartic::from_coeffs([-1, 0, 0, 0, 1])).unwrap().is_some());
/// assert!(gl2z_decide(&g, &Quartic::from_coeffs([1, 0, 0, 0, 1])).unwrap().is_none());
/// ```
pub fn gl2z_decide(g1: &Quartic, g2: &Quartic) -> Result<Option<Matrix>, crate::Error> {
    if g1 == g2 {
        return Ok(Some(mat_identity()));
    }
    if g1.invariant_i() != g2.invariant_i() || g1.invariant_j() != g2.invariant_j() {
        return Ok(None);
    }
    let s1 = super::proven::candidate_set(g1)?;
    let s2 = super::proven::candidate_set(g2)?;
    for (f1, m1) in &s1 {
        for (f2, m2) in &s2 {
            if f1 == f2 {
                // g1∘m1 = g2∘m2  =>  g1∘(m1 m2^{-1}) = g2
                let m = mat_mul(m1, &mat_inverse_unimodular(m2));
                if g1.transform(&m) != *g2 || !(det(&m) == 1 || det(&m) == -1) {
                    return Err(crate::Error::internal("quartic::gl2z_decide", format!("the transformation found for {g1:?} and {g2:?} does not map one onto the other")));
                }
                return Ok(Some(m));
            }
        }
    }
    Ok(None)
}

/// Whether two quartics are `GL2(Z)`-equivalent (see [`gl2z_decide`]; a
/// proven answer).
///
/// ```
/// use twofold::quartic::{gl2z_equivalent, Quartic};
/// let g = Quartic::from_coeffs([1, 0, 0, 0, -1]);
/// assert!(gl2z_equivalent(&g, &Quartic::from_coeffs([-1, 0, 0, 0, 1])));
/// assert!(!gl2z_equivalent(&g, &Quartic::from_coeffs([1, 0, 0, 0, 1])));
/// ```
pub fn gl2z_equivalent(g1: &Quartic, g2: &Quartic) -> bool {
    gl2z_equivalence(g1, g2).is_some()
}

#[cfg(test)]
mod tests {
    use super::super::core::mat_from_i64;
    use super::*;
    use proptest::prelude::*;

    fn q(v: [i64; 5]) -> Quartic {
        Quartic::from_coeffs(v)
    }

    #[test]
    fn unimodular_image_of_a_skewed_form_is_recognised() {
        // found by the fuzz harness (random, invented data): the quick
        // double-precision covariant of h was wrong without lying near the
        // boundary, and Newton's method from a double-precision start could
        // reach the wrong resolvent root; h = g∘U for a unimodular U
        let g = Quartic::new(["-7621", "-9119563602643672", "46673113006267800310", "87036377284326", "-161378808"].map(|x| x.parse::<Integer>().unwrap()));
        let h = Quartic::new(["-161378808", "-87035731769094", "46673374114431380440", "-93337367557419294694", "46664080478881054535"].map(|x| x.parse::<Integer>().unwrap()));
        let m = gl2z_equivalence(&g, &h).expect("equivalent forms");
        assert_eq!(g.transform(&m), h);
        assert_eq!(reduce(&g).0, reduce(&h).0);
    }

    #[test]
    fn covariant_point_of_symmetric_forms() {
        // Forms invariant under x <-> z and x -> -x (or under S: (x,z) -> (z,-x)) have
        // τ fixed by those maps, hence τ = i (one of each root type).
        for g in [[1, 0, 0, 0, -1], [1, 0, 0, 0, 1], [1, 0, -5, 0, 1], [1, 0, 3, 0, 1], [-1, 0, 1, 0, -1]] {
            let g = q(g);
            let t = tau(&g).unwrap();
            assert!((t.0).abs() < 1e-12 && (t.1 - 1.0).abs() < 1e-12, "{g:?}: {t:?}");
        }
        // τ(g∘M) = M^{-1} τ(g) for det M = 1: translation by 3 moves τ by -3.
        let g = q([2, 1, -3, 5, 1]);
        let t0 = tau(&g).unwrap();
        let t1 = tau(&g.transform(&mat_from_i64([[1, 3], [0, 1]]))).unwrap();
        assert!((t1.0 - (t0.0 - 3.0)).abs() < 1e-9 && (t1.1 - t0.1).abs() < 1e-9);
    }

    #[test]
    fn reduction_is_exact_and_stable() {
        let mut seed = 7u64;
        let mut rnd = |m: i64| {
            seed = seed.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
            ((seed >> 33) % (2 * m as u64 + 1)) as i64 - m
        };
        for _ in 0..300 {
            let g = q([rnd(9), rnd(9), rnd(9), rnd(9), rnd(9)]);
            if g.discriminant() == 0 {
                continue;
            }
            let (r, m) = reduce(&g);
            assert_eq!(g.transform(&m), r);
            let t = tau(&r).unwrap();
            assert!(in_domain(t, 1e-6), "{g:?} -> {r:?} tau {t:?}");
            // a random unimodular image reduces to an equivalent form
            let n = mat_from_i64([[2, 1], [rnd(4) * 2 + 1, rnd(4) + 1]]);
            let n = if det(&n) == 1 || det(&n) == -1 { n } else { mat_from_i64([[1, rnd(5)], [0, 1]]) };
            let g2 = g.transform(&n);
            let eqm = gl2z_equivalence(&g, &g2).expect("equivalent forms not recognised");
            assert_eq!(g.transform(&eqm), g2);
        }
    }

    proptest! {
        #[test]
        fn equivalence_found_for_random_images(g in prop::array::uniform5(-30i64..30), a in -4i64..4, b in -4i64..4, k in -3i64..3) {
            let g = q(g);
            prop_assume!(g.discriminant() != 0);
            // unimodular matrix [[1,a],[0,1]] [[1,0],[b,1]] [[0,1],[1,k]] (det -1)
            let m1 = mat_from_i64([[1, a], [0, 1]]);
            let m2 = mat_from_i64([[1, 0], [b, 1]]);
            let m3 = mat_from_i64([[0, 1], [1, k]]);
            let m = mat_mul(&mat_mul(&m1, &m2), &m3);
            let h = g.transform(&m);
            let e = gl2z_equivalence(&h, &g);
            prop_assert!(e.is_some());
            prop_assert_eq!(h.transform(&e.unwrap()), g);
        }
    }

    #[test]
    fn inequivalent_forms_are_separated() {
        // x^4 - z^4 and x^4 + z^4 differ in J's sign/discriminant; forms with equal invariants
        // but different classes: x^4 - 4 z^4... checked via a brute force list in the
        // enumeration tests; here two forms with different values sets: g and -g when J = 0.
        let g = q([1, 0, 0, 0, -1]);
        let h = q([1, 0, 0, 0, 1]);
        assert!(!gl2z_equivalent(&g, &h));
        // x^4 + 2 z^4 and 2 x^4 + z^4 are equivalent by swapping
        assert!(gl2z_equivalent(&q([1, 0, 0, 0, 2]), &q([2, 0, 0, 0, 1])));
        // x^4 + 3 z^4 vs -x^4 - 3z^4: invariants I equal, J opposite
        assert!(!gl2z_equivalent(&q([1, 0, 0, 0, 3]), &q([-1, 0, 0, 0, -3])));
    }
}
