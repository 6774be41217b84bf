//! The machine-word path of the proven `GL2(Z)` class test (module
//! [`super::proven`]): the same enclosure of the covariant point `τ(h)`,
//! computed in `f64` interval arithmetic with outward rounding
//! ([`crate::enclosure::Interval`]) for forms whose coefficients fit in 31
//! bits, and the candidate forms `h∘N` in `i64`.
//!
//! What does not depend on the form is computed once per enumeration
//! ([`ClassTest`]): the invariants `I`, `J` (every form of one enumeration
//! has the same) and an enclosure of each real root of the resolvent
//! `F(φ) = φ^3 - 3Iφ + J`, taken from the exact dyadic brackets of
//! `proven` (integer sign checks) and rounded outwards to `f64`.
//!
//! The argument of completeness is the one of `proven`: once the `f64` box
//! of `τ(h)` lies in `F_ε`, every reduced form of the class is `h∘N` with
//! `N ∈ GL2(Z)` with entries in `[-2, 2]` whose image box may meet `F`; the
//! `f64` image box encloses the exact image, so the set returned here holds
//! the set of `proven` (possibly with a few more forms, each exactly
//! equivalent to `h`). Whenever the `f64` box does not decide (a wide or
//! unbounded interval, a box outside `F_ε`, coefficients too large, an
//! overflow in `i128`) the caller falls back to the multiple-precision path.

use super::core::{Quartic, RootType};
use super::proven::{bracket_f64, may_meet_domain_f64, one_bracket, refine, sq_f64 as sq, three_brackets, EPS};
use crate::enclosure::Interval as R;
use malachite::Integer;

/// Coefficients below `2^31` in absolute value take the word path.
const SMALL: i64 = 1 << 31;

/// The part of the proven class test shared by all forms of one
/// enumeration: the invariants and `f64` enclosures of the resolvent roots.
pub(crate) struct ClassTest {
    /// `(I, J)` in `i128`, or `None` when they do not fit (word path off).
    ij: Option<(i128, i128)>,
    /// `4I^3 - J^2 > 0`.
    three_roots: bool,
    /// Enclosures of the real resolvent roots, ascending (one or three);
    /// empty when the word path is off.
    roots: Vec<R>,
}

impl ClassTest {
    /// The shared data for forms with invariants `(i, j)` (`4i^3 ≠ j^2`).
    pub(crate) fn new(i: &Integer, j: &Integer) -> ClassTest {
        let delta = Integer::from(4) * i * i * i - j * j;
        let three_roots = delta > 0u32;
        let ij = i128::try_from(i).ok().zip(i128::try_from(j).ok());
        let mut out = ClassTest { ij, three_roots, roots: Vec::new() };
        if ij.is_none() || delta == 0u32 {
            out.ij = None;
            return out;
        }
        // 64 bits of the root beyond its size: the f64 enclosure is then
        // about one unit in the last place wide
        let prec = 64;
        let brackets = if three_roots {
            match three_brackets(i, j) {
                Some(b) => b.to_vec(),
                None => {
                    out.ij = None;
                    return out;
                }
            }
        } else {
            vec![one_bracket(i, j)]
        };
        for (lo, hi, k) in brackets {
            let b = refine(lo, hi, k, i, j, prec);
            out.roots.push(bracket_f64(&b, prec));
        }
        if out.roots.iter().any(|r| !r.lo().is_finite() || !r.hi().is_finite()) {
            out.ij = None;
        }
        out
    }

    /// Every form `h∘N` (`N ∈ GL2(Z)`, entries in `[-2, 2]`) whose covariant
    /// point may lie in the closed fundamental domain, or `None` when the
    /// word path does not decide (the caller then runs the
    /// multiple-precision path). The set holds every reduced form of the
    /// class of `h` (module documentation).
    pub(crate) fn candidate_forms(&self, h: &Quartic) -> Option<Vec<Quartic>> {
        let (i, j) = self.ij?;
        let c = small_coeffs(h)?;
        let (x, y2) = self.tau_box(&c, i, j)?;
        if !inside_enlarged(x, y2) {
            return None;
        }
        let mut out: Vec<Quartic> = Vec::new();
        let mut seen: Vec<[i64; 5]> = Vec::new();
        for n in super::reduction::neighbours() {
            if !may_meet_domain_f64(n, x, y2) {
                continue;
            }
            let f = transform_small(&c, n);
            if !seen.contains(&f) {
                seen.push(f);
                out.push(Quartic::new(f.map(Integer::from)));
            }
        }
        Some(out)
    }

    /// The `f64` box `(Re τ, (Im τ)^2)` of `τ(g)` for the coefficients `c`
    /// of a form with invariants `(i, j)` (checked here in `i128`).
    fn tau_box(&self, c: &[i64; 5], i: i128, j: i128) -> Option<(R, R)> {
        let [a, b, cc, d, e] = c.map(|v| v as i128);
        let inv_i = 12 * a * e - 3 * b * d + cc * cc;
        let inv_j = 72 * a * cc * e + 9 * b * cc * d - 27 * a * d * d - 27 * e * b * b - 2 * cc * cc * cc;
        if inv_i != i || inv_j != j {
            return None;
        }
        let hess = [
            8 * a * cc - 3 * b * b,
            24 * a * d - 4 * b * cc,
            48 * a * e + 6 * b * d - 4 * cc * cc,
            24 * b * e - 4 * cc * d,
            8 * cc * e - 3 * d * d,
        ];
        let g: [R; 3] = [a, b, cc].map(wide);
        let gh: [R; 3] = [hess[0], hess[1], hess[2]].map(wide);
        let four = R::point(4.0);
        let p: [R; 3] = if !self.three_roots {
            // one real root r; φ = -r/2 + iκ, κ^2 = 3r^2/4 - 3I
            let r = self.roots[0];
            let k2 = R::point(0.75) * sq(r) - R::point(3.0) * wide(i);
            if !(k2.lo() > 0.0) {
                return None;
            }
            let kappa = k2.sqrt();
            let two_r = R::point(2.0) * r;
            let re: [R; 3] = [0, 1, 2].map(|n| -(two_r * g[n]) - gh[n]);
            let im: [R; 3] = [0, 1, 2].map(|n| four * kappa * g[n]);
            let m0 = sq(re[0]) + sq(im[0]);
            let m1 = R::point(2.0) * (re[0] * re[1] + im[0] * im[1]);
            let m2 = R::point(2.0) * (re[0] * re[2] + im[0] * im[2]) + sq(re[1]) + sq(im[1]);
            let k0 = m0.sqrt();
            let two_k0 = R::point(2.0) * k0;
            let k1 = m1 / two_k0;
            let k2 = (m2 - sq(k1)) / two_k0;
            [k0 + re[0], k1 + re[1], k2 + re[2]]
        } else {
            // the root named by the root type (as in `proven`)
            let hh = hess[0];
            let four_real = hh <= 0 && hh.checked_mul(hh)? >= 16i128.checked_mul(a * a)?.checked_mul(i)?;
            let idx = if four_real {
                1
            } else if a > 0 {
                0
            } else {
                2
            };
            debug_assert!({
                let rt = if four_real {
                    RootType::FourReal
                } else if a > 0 {
                    RootType::PositiveDefinite
                } else {
                    RootType::NegativeDefinite
                };
                Quartic::new(c.map(Integer::from)).root_type() == Some(rt)
            });
            let f4 = four * self.roots[idx];
            [0, 1, 2].map(|n| f4 * g[n] - gh[n])
        };
        // Re τ = -P1 / (4 P0), (Im τ)^2 = (8 P0 P2 - 3 P1^2) / (16 P0^2)
        let x = -p[1] / (four * p[0]);
        let y2 = (R::point(8.0) * p[0] * p[2] - R::point(3.0) * sq(p[1])) / (R::point(16.0) * sq(p[0]));
        let ok = |v: R| v.lo().is_finite() && v.hi().is_finite();
        if !ok(x) || !ok(y2) || !(y2.lo() > 0.0) {
            return None;
        }
        Some((x, y2))
    }
}

/// `[v, v]` for an `i128` (rounded outwards beyond `2^53`).
fn wide(v: i128) -> R {
    let f = v as f64;
    if f.is_finite() && f as i128 == v && v.unsigned_abs() <= 1u128 << 53 {
        R::point(f)
    } else {
        R::new(f.next_down(), f.next_up())
    }
}

/// Whether the box certainly lies in `F_ε` (as `proven::inside_enlarged`).
fn inside_enlarged(x: R, y2: R) -> bool {
    let half = 0.5 + EPS;
    let r2 = sq(x) + y2;
    x.hi() <= half && x.lo() >= -half && r2.lo() >= (1.0 - EPS) * (1.0 - EPS)
}

/// The coefficients when each is below `2^31` in absolute value.
fn small_coeffs(h: &Quartic) -> Option<[i64; 5]> {
    let c = h.coeff_refs();
    let mut out = [0i64; 5];
    for (o, v) in out.iter_mut().zip(c.iter()) {
        let w = i64::try_from(*v).ok()?;
        if w.abs() >= SMALL {
            return None;
        }
        *o = w;
    }
    Some(out)
}

/// `g∘N`, `(g∘N)(x, z) = g(αx + βz, γx + δz)` for `N = [[α, β], [γ, δ]]`, in
/// words (coefficients below `2^31`, entries in `[-2, 2]`: every result is
/// below `2^31 · 5 · 6 · 2^4 < 2^41`). The same convention as
/// [`Quartic::transform`] (unit test below).
fn transform_small(g: &[i64; 5], n: &[[i64; 2]; 2]) -> [i64; 5] {
    let [[al, be], [ga, de]] = *n;
    // powers of (αx + βz) and (γx + δz), coefficients in x^k z^(n-k) order
    let mut lp = [[0i64; 5]; 5];
    let mut mp = [[0i64; 5]; 5];
    lp[0][0] = 1;
    mp[0][0] = 1;
    for k in 0..4 {
        for t in 0..=k {
            lp[k + 1][t] += lp[k][t] * al;
            lp[k + 1][t + 1] += lp[k][t] * be;
            mp[k + 1][t] += mp[k][t] * ga;
            mp[k + 1][t + 1] += mp[k][t] * de;
        }
    }
    let mut out = [0i64; 5];
    for (i, gi) in g.iter().enumerate() {
        if *gi == 0 {
            continue;
        }
        let l = &lp[4 - i];
        let m = &mp[i];
        for p in 0..=(4 - i) {
            for q in 0..=i {
                out[p + q] += gi * l[p] * m[q];
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use malachite::Integer;

    #[test]
    fn word_transform_agrees_with_the_integer_one() {
        let g = [3i64, -7, 11, 2, -5];
        let q = Quartic::new(g.map(Integer::from));
        for n in super::super::reduction::neighbours() {
            let nm = n.map(|r| r.map(Integer::from));
            assert_eq!(Quartic::new(transform_small(&g, n).map(Integer::from)), q.transform(&nm), "{n:?}");
        }
    }

    #[test]
    fn word_candidates_hold_the_multiprecision_ones() {
        // forms of several root types and both signs of 4I^3 - J^2; the word
        // path may only add forms (each exactly equivalent), never miss one
        let forms: [[i64; 5]; 6] = [[1, 0, -5, 0, 4], [1, 0, 0, 0, 1], [1, 1, 0, 0, 1], [1, 0, 3, 0, -2], [-1, 0, 1, 0, -1], [2, -3, 4, 1, 7]];
        let mut decided = 0;
        for f in forms {
            let g = Quartic::new(f.map(Integer::from));
            let Some((h, _, _)) = super::super::reduction::reduce_tau(&g) else { continue };
            let t = ClassTest::new(&h.invariant_i(), &h.invariant_j());
            let Some(word) = t.candidate_forms(&h) else { continue };
            decided += 1;
            let exact = super::super::proven::candidate_set(&h).unwrap();
            for (q, _) in exact {
                assert!(word.contains(&q), "{f:?}: {q:?} missing");
            }
        }
        assert!(decided >= 5, "the word path decided only {decided} of 6");
    }
}
