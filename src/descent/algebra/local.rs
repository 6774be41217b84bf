//! Square classes in the completions Q_v of Q (Serre, A Course in
//! Arithmetic, II.3): `Q_p*/Q_p*^2` for odd p is (valuation mod 2, quadratic
//! character of the unit part), for p = 2 it is (valuation mod 2,
//! `(u-1)/2 mod 2`, `(u^2-1)/8 mod 2`) of the unit part u, and `R*/R*^2`
//! is the sign. Classes are bit vectors so that the group law is `xor`.

use crate::arith::jacobi;
use crate::solubility::Place;
use malachite::base::num::arithmetic::traits::{DivisibleBy, Mod};
use malachite::base::num::basic::traits::Zero;
use malachite::{Integer, Natural, Rational};

/// The number of bits of a square class at `place`: 1 at the real place,
/// 2 at an odd prime, 3 at 2.
pub fn class_width(place: &Place) -> u32 {
    match place {
        Place::Real => 1,
        Place::Prime(p) if *p == 2u32 => 3,
        Place::Prime(_) => 2,
    }
}

/// Strips the factors `p` from a non-zero integer: `(v_p(n), n / p^v)`.
fn split(n: &Integer, p: &Integer) -> (u32, Integer) {
    let mut m = n.clone();
    let mut v = 0;
    while (&m).divisible_by(p) {
        m /= p;
        v += 1;
    }
    (v, m)
}

/// The class of a non-zero rational in `Q_v*/Q_v*^2` as a bit vector of
/// [`class_width`] bits; `None` for zero.
///
/// ```
/// use malachite::{Natural, Rational};
/// use twofold::descent::algebra::local::rational_class;
/// use twofold::solubility::Place;
/// let two = Place::Prime(Natural::from(2u32));
/// assert_eq!(rational_class(&Rational::from(17), &two), Some(0)); // 17 = 1 mod 8 is a 2-adic square
/// assert_eq!(rational_class(&Rational::from(-1), &Place::Real), Some(1));
/// ```
pub fn rational_class(r: &Rational, place: &Place) -> Option<u64> {
    if *r == Rational::ZERO {
        return None;
    }
    let negative = *r < Rational::ZERO;
    let (n, d) = r.to_numerator_and_denominator();
    let (n, d) = (Integer::from(n), Integer::from(d));
    match place {
        Place::Real => Some(negative as u64),
        Place::Prime(p) => {
            let pi = Integer::from(p.clone());
            let (vn, un) = split(&n, &pi);
            let (vd, ud) = split(&d, &pi);
            let parity = ((vn + vd) & 1) as u64;
            let mut u = un * ud; // same square class as un / ud
            if negative {
                u = -u;
            }
            if *p == 2u32 {
                let m = u64::try_from(&Natural::try_from((&u).mod_op(Integer::from(8))).ok()?).ok()?;
                let eps = ((m - 1) / 2) & 1;
                let omega = ((m * m - 1) / 8) & 1;
                Some(parity | eps << 1 | omega << 2)
            } else {
                let chi = jacobi(&u, &pi);
                Some(parity | ((chi == -1) as u64) << 1)
            }
        }
    }
}

/// Whether a rational is a non-zero square in `Q_v` (positive at the real place).
pub fn is_local_square(r: &Rational, place: &Place) -> bool {
    rational_class(r, place) == Some(0)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn classes_are_characters() {
        // brute force: r is a square mod p^3 (p odd) or mod 2^5 exactly when the class is 0
        for p in [2u32, 3, 5, 7] {
            let place = Place::Prime(Natural::from(p));
            let modulus = if p == 2 { 32i64 } else { (p * p * p) as i64 };
            for a in -40i64..40 {
                for b in -40i64..40 {
                    if a == 0 || b == 0 {
                        continue;
                    }
                    let (ra, rb) = (Rational::from(a), Rational::from(b));
                    let ca = rational_class(&ra, &place).unwrap();
                    let cb = rational_class(&rb, &place).unwrap();
                    assert_eq!(rational_class(&(&ra * &rb), &place).unwrap(), ca ^ cb);
                    assert_eq!(rational_class(&(&ra / &rb), &place).unwrap(), ca ^ cb);
                }
                if a != 0 && a.rem_euclid(p as i64) != 0 {
                    // a unit: a square in Z_p iff a square mod p (odd) / mod 8
                    let is_sq = (1..modulus).any(|t| (t * t - a).rem_euclid(modulus) == 0);
                    assert_eq!(rational_class(&Rational::from(a), &place) == Some(0), is_sq, "{a} at {p}");
                }
            }
        }
    }
}
