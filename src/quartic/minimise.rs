//! Minimisation of binary quartics at a prime (Cremona, Fisher and Stoll,
//! *Minimisation and reduction of 2-, 3- and 4-coverings of elliptic
//! curves*, Algebra & Number Theory 4 (2010), section 3 for `n = 2`).
//!
//! A 2-covering `y^2 = g(x,z)` of `E` with `(I, J) = (u^4 c4, 2 u^6 c6)`
//! may be replaced by `h = g(M (x,z)) / q^2` for `M` an integer matrix and
//! `q` an integer, as long as `h` stays integral: its invariants are
//! `det(M)^4 I / q^4` and `det(M)^6 J / q^6`. One step at `p` lowers the
//! level `v_p(u)` by one, in one of two ways:
//!
//! * `p^2` divides every coefficient: `h = g / p^2`;
//! * for a root `(r : 1)` or `(1 : 0)` of `g` modulo `p`, the substitution
//!   `x -> p x + r z` (or `z -> p z`) gives a form divisible by `p^4`:
//!   `h = g(p x + r z, z) / p^4`.
//!
//! Where neither applies, the same substitution divided only by `p^2`
//! (level unchanged) may open one of them; that intermediate move is tried
//! to a bounded depth. A step that lowers the level always keeps `h`
//! integral, so the loop ends.

use super::core::{mat_identity, mat_mul, scaling_to_curve, Matrix, Quartic};
use crate::arith::{factor, FactorLimits};
use crate::curve::Curve;
use crate::error::Error;
use malachite::base::num::arithmetic::traits::{DivisibleBy, Gcd, Pow};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural};

/// A quartic minimised at some primes: `quartic = g(matrix (x,z)) / divisor^2`
/// for the input `g`.
#[derive(Clone, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub struct MinimisedQuartic {
    /// The minimised form.
    pub quartic: Quartic,
    /// The substitution (a point `(x', z')` of the result gives the point
    /// `matrix (x', z')` of the input).
    pub matrix: Matrix,
    /// The integer `q` with `quartic = g(matrix (x, z)) / q^2`.
    pub divisor: Natural,
}

/// How many level-keeping moves may precede a level-lowering one.
const SIDE_DEPTH: u32 = 2;

fn content(g: &Quartic) -> Natural {
    g.coeff_refs().iter().fold(Natural::ZERO, |acc, c| acc.gcd(c.unsigned_abs_ref()))
}

fn divide(g: &Quartic, q: &Natural) -> Quartic {
    let q = Integer::from(q.clone());
    Quartic::new(g.coeffs().map(|c| c / &q))
}

/// The roots of `g` modulo `p` (after its content is stripped at `p`) as
/// substitution matrices: `x -> p x + r z` for `(r : 1)`, `z -> p z` for `(1 : 0)`.
fn root_moves(g: &Quartic, p: &Natural) -> Vec<Matrix> {
    let pi = Integer::from(p.clone());
    let mut h = g.coeffs();
    while h.iter().all(|c| c.divisible_by(&pi)) && h.iter().any(|c| *c != 0) {
        for c in h.iter_mut() {
            *c /= &pi;
        }
    }
    let Ok(pw) = u64::try_from(p) else { return Vec::new() };
    let red = |c: &Integer| {
        let r = c % &pi;
        u64::try_from(&if r < 0 { r + &pi } else { r }).unwrap_or(0)
    };
    // g(x, 1) low degree first: e, d, c, b, a
    let words: Vec<u64> = h.iter().rev().map(red).collect();
    let mut out: Vec<Matrix> =
        crate::numfield::fp::roots(&words, pw).into_iter().map(|r| [[pi.clone(), Integer::from(r)], [Integer::ZERO, Integer::ONE]]).collect();
    if red(&h[0]) == 0 {
        out.push([[Integer::ONE, Integer::ZERO], [Integer::ZERO, pi.clone()]]);
    }
    out
}

/// One level-lowering step at `p`, with up to `depth` level-keeping moves first.
fn lower_once(g: &Quartic, p: &Natural, depth: u32) -> Option<MinimisedQuartic> {
    let p2 = p * p;
    let c = content(g);
    if c != 0u32 && (&c).divisible_by(&p2) {
        return Some(MinimisedQuartic { quartic: divide(g, &p2), matrix: mat_identity(), divisor: p.clone() });
    }
    let p4 = &p2 * &p2;
    let moves = root_moves(g, p);
    let mut keep = Vec::new();
    for m in moves {
        let h = g.transform(&m);
        let ch = content(&h);
        if (&ch).divisible_by(&p4) {
            return Some(MinimisedQuartic { quartic: divide(&h, &p4), matrix: m, divisor: p2 });
        }
        if (&ch).divisible_by(&p2) {
            keep.push((divide(&h, &p2), m));
        }
    }
    if depth == 0 {
        return None;
    }
    for (h, m) in keep {
        if let Some(next) = lower_once(&h, p, depth - 1) {
            return Some(MinimisedQuartic { quartic: next.quartic, matrix: mat_mul(&m, &next.matrix), divisor: next.divisor * p });
        }
    }
    None
}

/// `g` minimised at `p`: level-lowering steps while one exists (at most
/// `max_steps`).
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::quartic::{minimise_at, Quartic};
/// // y^2 = x^4 - 17 z^4 (invented for the demo) after z -> 9z: I grows by 9^4
/// let g = Quartic::from_coeffs([1, 0, 0, 0, -17]);
/// let m = [[Integer::from(1), Integer::from(0)], [Integer::from(0), Integer::from(9)]];
/// let big = g.transform(&m);
/// let small = minimise_at(&big, &Natural::from(3u32), 8);
/// assert_eq!(small.quartic.invariant_i(), g.invariant_i());
/// ```
pub fn minimise_at(g: &Quartic, p: &Natural, max_steps: u32) -> MinimisedQuartic {
    let mut out = MinimisedQuartic { quartic: g.clone(), matrix: mat_identity(), divisor: Natural::ONE };
    for _ in 0..max_steps {
        if out.quartic.coeff_refs().iter().all(|c| **c == 0) {
            break;
        }
        match lower_once(&out.quartic, p, SIDE_DEPTH) {
            Some(s) => {
                out = MinimisedQuartic { quartic: s.quartic, matrix: mat_mul(&out.matrix, &s.matrix), divisor: out.divisor * s.divisor };
            }
            None => break,
        }
    }
    out
}

/// A 2-covering `y^2 = g(x,z)` of `curve` minimised at every prime where
/// its invariants carry more than the curve's: the primes of the numerator
/// of `u` in `(I, J) = (u^4 c4, 2 u^6 c6)`, factored within `limits` (when
/// that fails, only the primes below `2^16` are used).
///
/// Errors: [`crate::ErrorKind::InvalidValue`] when the invariants of `g` are
/// not of that form (not a 2-covering of `curve`).
pub fn minimise_covering(g: &Quartic, curve: &Curve, limits: &FactorLimits) -> Result<MinimisedQuartic, Error> {
    let u = scaling_to_curve(&g.invariant_i(), &g.invariant_j(), curve)?;
    let num = Integer::from(u.to_numerator());
    let primes: Vec<Natural> = match factor(&num, limits) {
        Ok(f) => f.factors().iter().map(|(p, _)| p.clone()).collect(),
        Err(_) => crate::arith::primes_up_to(1 << 16)
            .into_iter()
            .map(Natural::from)
            .filter(|p| (&num).divisible_by(&Integer::from(p.clone())))
            .collect(),
    };
    let mut out = MinimisedQuartic { quartic: g.clone(), matrix: mat_identity(), divisor: Natural::ONE };
    for p in primes {
        let level = crate::arith::valuation(&num, &p).unwrap_or(0);
        let s = minimise_at(&out.quartic, &p, level.max(1) + 2);
        out = MinimisedQuartic { quartic: s.quartic, matrix: mat_mul(&out.matrix, &s.matrix), divisor: out.divisor * s.divisor };
    }
    // the invariants change by det^4 / q^4 and det^6 / q^6
    let d = super::core::det(&out.matrix);
    let q = Integer::from(out.divisor.clone());
    let (i0, i1) = (g.invariant_i(), out.quartic.invariant_i());
    if &i1 * (&q).pow(4) != i0 * (&d).pow(4) {
        return Err(Error::internal("quartic minimisation", "the invariant I did not change by det^4 / q^4"));
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::quartic::{quartics_with_invariants, SearchOptions};

    /// The quartics of invariants `(c4, 2 c6) = (48, -432)` of
    /// y^2 + y = x^3 - x (published table, Cremona 1997: c4 = 48, c6 = -216),
    /// scaled at 3, 5 and 7 by substitutions and square factors, come back to
    /// those invariants; on the way I and J change by det^4 / q^4 and
    /// det^6 / q^6 (Cremona, Fisher and Stoll 2010, section 3).
    #[test]
    fn scaled_quartics_come_back() {
        let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
        let gs = quartics_with_invariants(&Integer::from(48), &Integer::from(-432), &SearchOptions::default()).unwrap();
        assert!(!gs.is_empty());
        let mats: [[[i64; 2]; 2]; 4] = [[[3, 1], [0, 1]], [[1, 0], [0, 25]], [[7, 3], [0, 1]], [[9, 4], [0, 1]]];
        for g in &gs {
            for m in mats {
                let m: Matrix = m.map(|r| r.map(Integer::from));
                for square in [1i64, 9, 49] {
                    let big = Quartic::new(g.transform(&m).coeffs().map(|c| c * Integer::from(square)));
                    let out = minimise_covering(&big, &e, &FactorLimits::default()).unwrap();
                    assert_eq!(out.quartic.invariant_i(), Integer::from(48), "{g} {m:?} {square}");
                    assert_eq!(out.quartic.invariant_j(), Integer::from(-432), "{g} {m:?} {square}");
                    let d = super::super::core::det(&out.matrix);
                    let q = Integer::from(out.divisor.clone());
                    assert_eq!(out.quartic.invariant_j() * (&q).pow(6), big.invariant_j() * (&d).pow(6));
                    // the relation g(M (x, z)) = q^2 h(x, z) coefficient-wise
                    let back = big.transform(&out.matrix);
                    assert_eq!(back.coeffs(), out.quartic.coeffs().map(|c| c * &q * &q));
                }
            }
        }
    }

    /// A minimal quartic is left alone at a prime of good reduction.
    #[test]
    fn minimal_stays() {
        let g = Quartic::from_coeffs([1, 0, 0, 0, -17]);
        let out = minimise_at(&g, &Natural::from(5u32), 4);
        assert_eq!(out.quartic, g);
        assert_eq!(out.divisor, 1u32);
    }
}
