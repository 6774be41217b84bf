//! Hilbert symbols `(a, b)_v` of non-zero rationals at every place of Q.
//!
//! Formulas of J.-P. Serre, *A Course in Arithmetic*, Ch. III, §1.2,
//! Theorem 1: writing `a = p^α u`, `b = p^β v` with `u, v` p-adic units,
//! `(a, b)_p = (-1)^(α β ε(p)) (u/p)^β (v/p)^α` for odd `p`, and
//! `(a, b)_2 = (-1)^(ε(u) ε(v) + α ω(v) + β ω(u))` with
//! `ε(x) = (x - 1)/2`, `ω(x) = (x^2 - 1)/8 (mod 2)`; at the real place
//! `(a, b)_∞ = -1` exactly when `a < 0` and `b < 0`.

use super::primality::is_probable_prime;
use crate::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{DivisibleBy, JacobiSymbol};
use malachite::base::num::conversion::traits::SaturatingFrom;
use malachite::{Integer, Natural, Rational};

/// A place of Q: the real (infinite) place or a prime `p`.
///
/// ```
/// use malachite::Natural;
/// use twofold::arith::Place;
/// let places = [Place::Real, Place::Prime(Natural::from(2u32))];
/// assert_ne!(places[0], places[1]);
/// ```
#[derive(Clone, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Place {
    /// The real place, `Q ⊂ R`.
    Real,
    /// The p-adic place for a prime `p`.
    Prime(Natural),
}

/// The Hilbert symbol `(a, b)_v` in `{1, -1}` of non-zero rationals: `1`
/// exactly when `z^2 = a x^2 + b y^2` has a non-zero solution over the
/// completion `Q_v` (Serre, *A Course in Arithmetic*, III.1).
///
/// Errors ([`ErrorKind::InvalidValue`]) if `a` or `b` is zero or the place
/// is `Prime(p)` with `p` not prime.
///
/// ```
/// use malachite::{Natural, Rational};
/// use twofold::arith::{hilbert_symbol, Place};
/// let two = Place::Prime(Natural::from(2u32));
/// let m1 = Rational::from(-1);
/// assert_eq!(hilbert_symbol(&m1, &m1, &two).unwrap(), -1); // Serre III.1.2
/// assert_eq!(hilbert_symbol(&m1, &m1, &Place::Real).unwrap(), -1);
/// // (2/3, 5)_5: 2/3 is a 5-adic unit, 5 has valuation 1; (6/5) = 1.
/// let a = Rational::from_signeds(2, 3);
/// assert_eq!(hilbert_symbol(&a, &Rational::from(5), &Place::Prime(Natural::from(5u32))).unwrap(), 1);
/// ```
pub fn hilbert_symbol(a: &Rational, b: &Rational, place: &Place) -> Result<i8, Error> {
    hilbert_symbol_integers(&square_class_integer(a), &square_class_integer(b), place)
}

/// `num * den` with the sign of `q`: an integer in the square class of `q`.
fn square_class_integer(q: &Rational) -> Integer {
    let m = Integer::from(q.numerator_ref() * q.denominator_ref());
    if *q < 0u32 {
        -m
    } else {
        m
    }
}

/// The Hilbert symbol `(a, b)_v` of non-zero integers; see [`hilbert_symbol`].
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::arith::{hilbert_symbol_integers, Place};
/// let p3 = Place::Prime(Natural::from(3u32));
/// // (2, 3)_3 = (2/3) = -1 (Serre's formula, α = 0, β = 1)
/// assert_eq!(hilbert_symbol_integers(&Integer::from(2), &Integer::from(3), &p3).unwrap(), -1);
/// // (a, -a) = 1
/// assert_eq!(hilbert_symbol_integers(&Integer::from(6), &Integer::from(-6), &p3).unwrap(), 1);
/// ```
pub fn hilbert_symbol_integers(a: &Integer, b: &Integer, place: &Place) -> Result<i8, Error> {
    if *a == 0 || *b == 0 {
        return Err(Error::new(ErrorKind::InvalidValue, "the Hilbert symbol needs non-zero arguments"));
    }
    match place {
        Place::Real => Ok(if *a < 0 && *b < 0 { -1 } else { 1 }),
        Place::Prime(p) => {
            if !is_probable_prime(p) {
                return Err(Error::new(ErrorKind::InvalidValue, format!("{p} is not a prime")));
            }
            let pi = Integer::from(p.clone());
            let (alpha, u) = split_off(a, &pi);
            let (beta, v) = split_off(b, &pi);
            if *p == 2u32 {
                let eps = |x: &Integer| i64::from(mod8(x) % 4 == 3);
                let omega = |x: &Integer| i64::from(matches!(mod8(x), 3 | 5));
                let e = eps(&u) * eps(&v) + i64::from(alpha) * omega(&v) + i64::from(beta) * omega(&u);
                Ok(if e % 2 == 0 { 1 } else { -1 })
            } else {
                let mut s: i8 = 1;
                let p_is_3_mod_4 = mod8(&pi) % 4 == 3;
                if alpha % 2 == 1 && beta % 2 == 1 && p_is_3_mod_4 {
                    s = -s;
                }
                if beta % 2 == 1 {
                    s *= u.jacobi_symbol(&pi);
                }
                if alpha % 2 == 1 {
                    s *= v.jacobi_symbol(&pi);
                }
                Ok(s)
            }
        }
    }
}

/// `(v, u)` with `x = p^v u`, `p` not dividing `u`.
fn split_off(x: &Integer, p: &Integer) -> (u32, Integer) {
    let mut u = x.clone();
    let mut v = 0;
    while (&u).divisible_by(p) {
        u /= p;
        v += 1;
    }
    (v, u)
}

fn mod8(x: &Integer) -> u64 {
    let r = x % Integer::from(8);
    let r = if r < 0 { r + Integer::from(8) } else { r };
    u64::saturating_from(&r)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::arith::{factor, FactorLimits};
    use proptest::prelude::*;

    fn h(a: i64, b: i64, p: u64) -> i8 {
        hilbert_symbol_integers(&Integer::from(a), &Integer::from(b), &Place::Prime(Natural::from(p))).unwrap()
    }

    /// Primes dividing 2ab, by our factoriser.
    fn bad_primes(a: i64, b: i64) -> Vec<Natural> {
        let n = Integer::from(2) * Integer::from(a) * Integer::from(b);
        factor(&n, &FactorLimits::default()).unwrap().primes().cloned().collect()
    }

    fn product_over_places(a: i64, b: i64) -> i8 {
        let (ai, bi) = (Integer::from(a), Integer::from(b));
        let mut prod = hilbert_symbol_integers(&ai, &bi, &Place::Real).unwrap();
        for p in bad_primes(a, b) {
            prod *= hilbert_symbol_integers(&ai, &bi, &Place::Prime(p)).unwrap();
        }
        prod
    }

    /// Whether z^2 = a x^2 + b y^2 has a primitive solution modulo p^k; for the
    /// square-class representatives used below (valuations <= 1) and k = 3
    /// (odd p) or k = 5 (p = 2) this is equivalent to solvability in Q_p by
    /// Hensel's lemma (the gradient has valuation <= 1, resp. <= 2).
    fn solvable_mod(a: i64, b: i64, p: i64, k: u32) -> bool {
        let m = p.pow(k);
        let (a, b) = (a.rem_euclid(m), b.rem_euclid(m));
        let mut sq = vec![Vec::new(); m as usize];
        for z in 0..m {
            sq[(z * z % m) as usize].push(z);
        }
        for x in 0..m {
            for y in 0..m {
                let r = ((a * x % m * x + b * y % m * y) % m) as usize;
                for &z in &sq[r] {
                    if x % p != 0 || y % p != 0 || z % p != 0 {
                        return true;
                    }
                }
            }
        }
        false
    }

    #[test]
    fn agrees_with_brute_force_solvability() {
        // square classes of Q_p^*: for p = 3: {±1, ±3}; p = 5: {1, 2, 5, 10};
        // p = 2: {±1, ±2, ±5, ±10} (Serre II.3.3)
        let cases: [(i64, u32, &[i64]); 3] = [
            (3, 3, &[1, -1, 3, -3]),
            (5, 3, &[1, 2, 5, 10]),
            (2, 5, &[1, -1, 2, -2, 5, -5, 10, -10]),
        ];
        for (p, k, classes) in cases {
            for &a in classes {
                for &b in classes {
                    let want = if solvable_mod(a, b, p, k) { 1 } else { -1 };
                    assert_eq!(h(a, b, p as u64), want, "({a}, {b})_{p}");
                }
            }
        }
    }

    #[test]
    fn known_values() {
        // Serre III.1: (-1, -1)_2 = -1, (2, 5)_5 = (2/5) = -1, (2, -1)_2 = 1, (p, p)_p = (-1/p).
        assert_eq!(h(-1, -1, 2), -1);
        assert_eq!(h(2, 5, 5), -1);
        assert_eq!(h(2, -1, 2), 1);
        assert_eq!(h(7, 7, 7), -1);
        assert_eq!(h(13, 13, 13), 1);
        // rationals reduce to integers of the same square class
        let r = |n: i64, d: i64| Rational::from_signeds(n, d);
        let p5 = Place::Prime(Natural::from(5u32));
        assert_eq!(hilbert_symbol(&r(1, 2), &r(5, 1), &p5).unwrap(), h(2, 5, 5));
        assert_eq!(hilbert_symbol(&r(-3, 4), &r(-1, 9), &Place::Real).unwrap(), -1);
        // errors
        assert_eq!(h(1, 1, 3), 1);
        assert!(hilbert_symbol_integers(&Integer::from(0), &Integer::from(1), &Place::Real).is_err());
        assert!(hilbert_symbol_integers(&Integer::from(2), &Integer::from(3), &Place::Prime(Natural::from(9u32))).is_err());
    }

    proptest! {
        #[test]
        fn hilbert_reciprocity(a in -100_000i64..100_000, b in -100_000i64..100_000) {
            prop_assume!(a != 0 && b != 0);
            prop_assert_eq!(product_over_places(a, b), 1);
        }

        #[test]
        fn trivial_away_from_2ab(a in -10_000i64..10_000, b in -10_000i64..10_000, pi in 0usize..6) {
            prop_assume!(a != 0 && b != 0);
            let p = [3u64, 5, 7, 11, 10007, 1_000_000_007][pi];
            if a % p as i64 != 0 && b % p as i64 != 0 {
                prop_assert_eq!(h(a, b, p), 1);
            }
        }

        #[test]
        fn bilinear_and_symmetric(a1 in -3000i64..3000, a2 in -3000i64..3000, b in -3000i64..3000, pi in 0usize..5) {
            prop_assume!(a1 != 0 && a2 != 0 && b != 0);
            let p = [2u64, 3, 5, 7, 13][pi];
            prop_assert_eq!(h(a1 * a2, b, p), h(a1, b, p) * h(a2, b, p));
            prop_assert_eq!(h(a1, b, p), h(b, a1, p));
            // squares do not matter
            prop_assert_eq!(h(a1 * b * b, a2, p), h(a1, a2, p));
        }

        #[test]
        fn steinberg_relations(a in -100_000i64..100_000, pi in 0usize..5) {
            prop_assume!(a != 0 && a != 1);
            let p = [2u64, 3, 5, 7, 101][pi];
            prop_assert_eq!(h(a, -a, p), 1);
            prop_assert_eq!(h(a, 1 - a, p), 1);
            let (ai, bi) = (Integer::from(a), Integer::from(1 - a));
            prop_assert_eq!(hilbert_symbol_integers(&ai, &bi, &Place::Real).unwrap(), 1);
        }

        #[test]
        fn rational_arguments(n1 in -500i64..500, d1 in 1i64..500, n2 in -500i64..500, d2 in 1i64..500) {
            prop_assume!(n1 != 0 && n2 != 0);
            let a = Rational::from_signeds(n1, d1);
            let b = Rational::from_signeds(n2, d2);
            // the product formula holds for rationals too
            let num = Integer::from(2) * Integer::from(n1 * d1) * Integer::from(n2 * d2);
            let mut prod = hilbert_symbol(&a, &b, &Place::Real).unwrap();
            for p in factor(&num, &FactorLimits::default()).unwrap().primes() {
                prod *= hilbert_symbol(&a, &b, &Place::Prime(p.clone())).unwrap();
            }
            prop_assert_eq!(prod, 1);
        }
    }
}
