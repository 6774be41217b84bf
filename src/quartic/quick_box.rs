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
        if let Some(roots) = quick_roots(i, j, three_roots) {
            out.roots = roots;
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
        // a point of F has imaginary part at least √3/2, and the image of τ
        // under N has imaginary part Im τ / D with D = (a - c Re τ)^2 +
        // c^2 (Im τ)^2 (which depends on the column (a, c) only): a column
        // with D^2 > (4/3)(Im τ)^2 for the whole box sends no point of it
        // into F, and its matrices are skipped together
        let bound = (R::point(4.0) * y2 / R::point(3.0)).hi();
        for ((a, c0), group) in neighbour_columns() {
            let (ai, ci) = (R::point(*a as f64), R::point(*c0 as f64));
            let den = sq(ai - ci * x) + sq(ci) * y2;
            if sq(den).lo() > bound {
                continue;
            }
            for n in group {
                if !may_meet_domain_f64(n, x, y2) {
                    continue;
                }
                let f = transform_small(&c, n);
                if !seen.contains(&f) {
                    seen.push(f);
                    out.push(Quartic::new(f.map(Integer::from)));
                }
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

/// The matrices of [`super::reduction::neighbours`] grouped by their first
/// column `(a, c)`.
fn neighbour_columns() -> &'static [((i64, i64), Vec<[[i64; 2]; 2]>)] {
    use std::sync::OnceLock;
    static LIST: OnceLock<Vec<((i64, i64), Vec<[[i64; 2]; 2]>)>> = OnceLock::new();
    LIST.get_or_init(|| {
        let mut v: Vec<((i64, i64), Vec<[[i64; 2]; 2]>)> = Vec::new();
        for n in super::reduction::neighbours() {
            let key = (n[0][0], n[1][0]);
            match v.iter_mut().find(|(k, _)| *k == key) {
                Some((_, g)) => g.push(*n),
                None => v.push((key, vec![*n])),
            }
        }
        v
    })
}

/// Enclosures of the real roots of `F(φ) = φ^3 - 3Iφ + J` (ascending) from
/// its floating-point roots: each root `r` is given the bracket `r ± δ`
/// (`δ` a few units in the last place), accepted only when the signs of `F`
/// at the ends, computed exactly in integers, change across every bracket
/// in the order a monic cubic needs (`-, +` for one real root; `-, +`,
/// `+, -`, `-, +` for three disjoint brackets, which then hold one root
/// each). `None` sends the caller to the bisection of `proven`.
fn quick_roots(i: &Integer, j: &Integer, three: bool) -> Option<Vec<R>> {
    use super::numeric::{resolvent_roots, to_f64, CubicRoots};
    use std::cmp::Ordering;
    let (fi, fj) = (to_f64(i), to_f64(j));
    if !fi.is_finite() || !fj.is_finite() {
        return None;
    }
    let approx: Vec<f64> = match resolvent_roots(fi, fj, three) {
        CubicRoots::Three(r) if three => r.to_vec(),
        CubicRoots::One { real, .. } if !three => vec![real],
        _ => return None,
    };
    let mut approx = approx;
    approx.sort_by(f64::total_cmp);
    let mut out: Vec<R> = Vec::new();
    for (n, r) in approx.iter().enumerate() {
        if !r.is_finite() {
            return None;
        }
        let delta = r.abs() * 1e-13 + 1e-300;
        let (lo, hi) = (r - delta, r + delta);
        // F rises through the first and third root and falls through the second
        let rising = n != 1;
        let want = if rising { (Ordering::Less, Ordering::Greater) } else { (Ordering::Greater, Ordering::Less) };
        if (exact_sign(lo, i, j)?, exact_sign(hi, i, j)?) != want {
            return None;
        }
        if let Some(prev) = out.last() {
            if prev.hi() >= lo {
                return None;
            }
        }
        out.push(R::new(lo, hi));
    }
    Some(out)
}

/// The sign of `F(x) = x^3 - 3Ix + J` at the finite `f64` number `x`,
/// exactly (`x = m / 2^k`).
fn exact_sign(x: f64, i: &Integer, j: &Integer) -> Option<std::cmp::Ordering> {
    use malachite::base::num::arithmetic::traits::PowerOf2;
    use malachite::Rational;
    let q = Rational::try_from(x).ok()?;
    let (m, den) = q.into_numerator_and_denominator();
    let k = super::numeric::significant_bits(&Integer::from(den.clone())).checked_sub(1)?;
    if den != <malachite::Natural as PowerOf2<u64>>::power_of_2(k) {
        return None;
    }
    let m = if x < 0.0 { -Integer::from(m) } else { Integer::from(m) };
    Some(super::proven::sign_at(&m, k, i, j))
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
    fn quick_roots_hold_the_roots_bisection_finds() {
        // each quick enclosure must meet the exact bisection bracket of the
        // same root (proven::refine), in the same order
        let mut quick = 0;
        for (i, j) in [(13i64, 70i64), (48, -432), (7, -3), (100003, 12345), (3, 100), (48, -1000), (123456789, 987654321), (16, -160)] {
            let (i, j) = (Integer::from(i), Integer::from(j));
            let three = Integer::from(4) * &i * &i * &i > &j * &j;
            let Some(roots) = quick_roots(&i, &j, three) else { continue };
            quick += 1;
            let brackets = if three { three_brackets(&i, &j).unwrap().to_vec() } else { vec![one_bracket(&i, &j)] };
            assert_eq!(roots.len(), brackets.len());
            for (r, (lo, hi, k)) in roots.iter().zip(brackets) {
                let b = bracket_f64(&refine(lo, hi, k, &i, &j, 80), 80);
                assert!(r.overlaps(&b), "i = {i}, j = {j}: {r:?} and {b:?}");
            }
        }
        assert!(quick >= 6, "quick roots for {quick} of 8");
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
