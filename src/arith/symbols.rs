//! Valuations, residue symbols and square roots modulo a prime.

use super::word::{mul_mod, pow_mod};
use malachite::base::num::arithmetic::traits::{CheckedSqrt, DivisibleBy, KroneckerSymbol, JacobiSymbol};
use malachite::base::num::basic::traits::Zero;
use malachite::{Integer, Natural};

/// The Jacobi symbol (a/n) for odd `n > 0`.
///
/// Panics if `n` is even or zero (a violated precondition).
///
/// ```
/// assert_eq!(twofold::arith::jacobi_u64(2, 7), 1);
/// assert_eq!(twofold::arith::jacobi_u64(3, 7), -1);
/// assert_eq!(twofold::arith::jacobi_u64(14, 7), 0);
/// ```
pub fn jacobi_u64(a: u64, n: u64) -> i32 {
    assert!(n % 2 == 1, "jacobi_u64 needs an odd modulus");
    let mut a = a % n;
    let mut n = n;
    let mut t = 1;
    while a != 0 {
        let z = a.trailing_zeros();
        a >>= z;
        if z % 2 == 1 && (n % 8 == 3 || n % 8 == 5) {
            t = -t;
        }
        if a % 4 == 3 && n % 4 == 3 {
            t = -t;
        }
        std::mem::swap(&mut a, &mut n);
        a %= n;
    }
    if n == 1 { t } else { 0 }
}

/// The Kronecker symbol (a/n) for any `a` and `n > 0` fitting in words.
///
/// ```
/// assert_eq!(twofold::arith::kronecker_i64(-1, 8), 1);
/// assert_eq!(twofold::arith::kronecker_i64(5, 2), -1);
/// assert_eq!(twofold::arith::kronecker_i64(-3, 5), -1);
/// ```
pub fn kronecker_i64(a: i64, n: u64) -> i32 {
    assert!(n > 0, "kronecker_i64 needs a positive modulus");
    let z = n.trailing_zeros();
    let odd = n >> z;
    let mut t = 1;
    if z > 0 {
        if a % 2 == 0 {
            return 0;
        }
        let r = a.rem_euclid(8);
        if z % 2 == 1 && (r == 3 || r == 5) {
            t = -t;
        }
    }
    let ar = a.rem_euclid(odd as i64) as u64;
    t * if odd == 1 { 1 } else { jacobi_u64(ar, odd) }
}

/// The Jacobi symbol (a/n) for odd positive `n` (big integers).
///
/// ```
/// use malachite::Integer;
/// assert_eq!(twofold::arith::jacobi(&Integer::from(-1), &Integer::from(11)), -1);
/// ```
pub fn jacobi(a: &Integer, n: &Integer) -> i8 {
    a.jacobi_symbol(n)
}

/// The Kronecker symbol (a/n) for any integers.
///
/// ```
/// use malachite::Integer;
/// assert_eq!(twofold::arith::kronecker(&Integer::from(3), &Integer::from(2)), -1);
/// ```
pub fn kronecker(a: &Integer, n: &Integer) -> i8 {
    a.kronecker_symbol(n)
}

/// The p-adic valuation of a non-zero integer `n` for a prime `p`; `None` for
/// `n = 0` (whose valuation is infinite).
///
/// ```
/// use malachite::{Integer, Natural};
/// assert_eq!(twofold::arith::valuation(&Integer::from(-48), &Natural::from(2u32)), Some(4));
/// assert_eq!(twofold::arith::valuation(&Integer::from(0), &Natural::from(3u32)), None);
/// ```
pub fn valuation(n: &Integer, p: &Natural) -> Option<u32> {
    if *n == 0 {
        return None;
    }
    let pi = Integer::from(p.clone());
    let mut m = n.clone();
    let mut v = 0;
    while (&m).divisible_by(&pi) {
        m /= &pi;
        v += 1;
    }
    Some(v)
}

/// A square root of `a` modulo the odd prime `p` (Tonelli-Shanks), or `None`
/// if `a` is not a square mod p. For `p = 2` returns `a mod 2`.
///
/// ```
/// let r = twofold::arith::sqrt_mod_prime(10, 13).unwrap();
/// assert_eq!(r * r % 13, 10);
/// assert_eq!(twofold::arith::sqrt_mod_prime(5, 13), None);
/// ```
pub fn sqrt_mod_prime(a: u64, p: u64) -> Option<u64> {
    let a = a % p;
    if p == 2 || a == 0 {
        return Some(a);
    }
    if jacobi_u64(a, p) != 1 {
        return None;
    }
    if p % 4 == 3 {
        return Some(pow_mod(a, (p + 1) / 4, p));
    }
    let s = (p - 1).trailing_zeros();
    let q = (p - 1) >> s;
    let mut z = 2;
    while jacobi_u64(z, p) != -1 {
        z += 1;
    }
    let mut m = s;
    let mut c = pow_mod(z, q, p);
    let mut t = pow_mod(a, q, p);
    let mut r = pow_mod(a, q.div_ceil(2), p);
    while t != 1 {
        let mut i = 0;
        let mut tt = t;
        while tt != 1 {
            tt = mul_mod(tt, tt, p);
            i += 1;
        }
        let b = pow_mod(c, 1u64 << (m - i - 1), p);
        m = i;
        c = mul_mod(b, b, p);
        t = mul_mod(t, c, p);
        r = mul_mod(r, b, p);
    }
    Some(r)
}

/// Whether an integer is a perfect square (negative numbers are not).
///
/// ```
/// use malachite::Integer;
/// assert!(twofold::arith::is_square(&Integer::from(144)));
/// assert!(!twofold::arith::is_square(&Integer::from(-4)));
/// ```
pub fn is_square(n: &Integer) -> bool {
    if *n < Integer::ZERO {
        return false;
    }
    use malachite::base::num::arithmetic::traits::UnsignedAbs;
    n.clone().unsigned_abs().checked_sqrt().is_some()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn jacobi_matches_euler_criterion() {
        for p in [3u64, 5, 7, 11, 13, 97, 101, 65537] {
            for a in 0..200u64 {
                let e = pow_mod(a, (p - 1) / 2, p);
                let want = if a % p == 0 { 0 } else if e == 1 { 1 } else { -1 };
                assert_eq!(jacobi_u64(a, p), want);
                assert_eq!(jacobi(&Integer::from(a), &Integer::from(p)) as i32, want);
            }
        }
    }

    #[test]
    fn sqrt_mod_prime_roots_square_back() {
        for p in [2u64, 3, 5, 13, 17, 41, 97, 257, 65537, 1_000_000_007] {
            for a in 0..300u64 {
                if let Some(r) = sqrt_mod_prime(a, p) {
                    assert_eq!(mul_mod(r, r, p), a % p);
                } else {
                    assert_eq!(jacobi_u64(a, p), -1);
                }
            }
        }
    }

    #[test]
    fn kronecker_agrees_with_malachite() {
        for a in -50i64..50 {
            for n in 1u64..60 {
                assert_eq!(
                    kronecker_i64(a, n) as i8,
                    kronecker(&Integer::from(a), &Integer::from(n)),
                    "a={a} n={n}"
                );
            }
        }
    }
}
