//! Square roots modulo prime powers: Tonelli-Shanks modulo `p`, then Hensel
//! lifting (Newton's iteration) to `p^k`; the prime 2 and non-units handled
//! separately. See H. Cohen, *A Course in Computational Algebraic Number
//! Theory*, §1.5.1 (Tonelli-Shanks) and the lifting remarks there.

use super::primality::is_probable_prime;
use super::symbols::sqrt_mod_prime;
use malachite::base::num::arithmetic::traits::{JacobiSymbol, ModInverse, ModPow, Pow};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::base::num::conversion::traits::SaturatingFrom;
use malachite::{Integer, Natural};

/// A square root of `a` modulo `p^k` for a prime `p`: some `x` in
/// `[0, p^k)` with `x^2 = a (mod p^k)`, or `None` if there is none (or if
/// `p` is not prime). `k = 0` gives `Some(0)`.
///
/// Units are handled by Tonelli-Shanks and Hensel lifting; for `p = 2` an odd
/// `a` needs `a = 1 mod 8` (mod 4 for `k = 2`); if `a = p^v u` with `u` a
/// unit and `v < k`, a root exists exactly when `v` is even and `u` is a
/// square mod `p^(k-v)`. The answer is checked before it is returned.
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::arith::sqrt_mod_prime_power;
/// // 7^2 = 49 = 17 + 32, so 17 is a square mod 32
/// let x = sqrt_mod_prime_power(&Integer::from(17), &Natural::from(2u32), 5).unwrap();
/// assert_eq!((&x * &x - Integer::from(17)) % Integer::from(32), 0);
/// // 2 is not a square mod 3
/// assert_eq!(sqrt_mod_prime_power(&Integer::from(2), &Natural::from(3u32), 4), None);
/// // 9 * 7 = 63: 7 is a square mod 3 and 9 = 3^2
/// assert!(sqrt_mod_prime_power(&Integer::from(63), &Natural::from(3u32), 5).is_some());
/// ```
pub fn sqrt_mod_prime_power(a: &Integer, p: &Natural, k: u32) -> Option<Integer> {
    if !is_probable_prime(p) {
        return None;
    }
    if k == 0 {
        return Some(Integer::ZERO);
    }
    let pk = p.pow(u64::from(k));
    let pki = Integer::from(pk.clone());
    let mut ar = a % &pki;
    if ar < 0 {
        ar += &pki;
    }
    let ar = ar.unsigned_abs_nat();
    let x = sqrt_reduced(&ar, p, k, &pk)?;
    // Check before answering.
    if (&x * &x) % &pk != ar {
        return None;
    }
    Some(Integer::from(x))
}

trait AbsNat {
    fn unsigned_abs_nat(self) -> Natural;
}
impl AbsNat for Integer {
    fn unsigned_abs_nat(self) -> Natural {
        use malachite::base::num::arithmetic::traits::UnsignedAbs;
        self.unsigned_abs()
    }
}

/// `a` already reduced into `[0, p^k)`.
fn sqrt_reduced(a: &Natural, p: &Natural, k: u32, pk: &Natural) -> Option<Natural> {
    if *a == 0u32 {
        return Some(Natural::ZERO);
    }
    // a = p^v u with u a unit, v < k
    let mut v = 0u32;
    let mut u = a.clone();
    while (&u % p) == 0u32 {
        u /= p;
        v += 1;
    }
    if v % 2 == 1 {
        return None;
    }
    let j = k - v;
    let pj = p.pow(u64::from(j));
    let y = if *p == 2u32 { sqrt_unit_mod_2k(&(&u % &pj), j)? } else { sqrt_unit_odd(&(&u % &pj), p, j)? };
    Some((p.pow(u64::from(v / 2)) * y) % pk)
}

/// Square root of an odd `u` modulo `2^j`.
fn sqrt_unit_mod_2k(u: &Natural, j: u32) -> Option<Natural> {
    let low = u64::saturating_from(&(u % Natural::from(8u32)));
    match j {
        1 => return Some(Natural::ONE),
        2 => return (low % 4 == 1).then_some(Natural::ONE),
        _ => {}
    }
    if low != 1 {
        return None;
    }
    // y^2 = u mod 2^i with y odd; (y + 2^(i-1))^2 = y^2 + 2^i mod 2^(i+1) for i >= 3.
    let mut y = Natural::ONE;
    for i in 3..j {
        let m = Natural::ONE << (i + 1);
        if (&y * &y) % &m != u % &m {
            y += Natural::ONE << (i - 1);
        }
    }
    Some(y)
}

/// Square root of a unit `u` modulo `p^j`, `p` odd.
fn sqrt_unit_odd(u: &Natural, p: &Natural, j: u32) -> Option<Natural> {
    let mut r = sqrt_mod_big_prime(&(u % p), p)?;
    // Newton: r <- r - (r^2 - u) / (2 r), doubling the precision each time.
    let mut e = 1u32;
    while e < j {
        e = (2 * e).min(j);
        let m = p.pow(u64::from(e));
        let ui = u % &m;
        let r2 = (&r * &r) % &m;
        let diff = if r2 >= ui { r2 - &ui } else { r2 + &m - &ui };
        let inv = ((&r << 1u32) % &m).mod_inverse(&m)?;
        let step = (diff * inv) % &m;
        r = if r >= step { &r - &step } else { &r + &m - &step };
    }
    Some(r)
}

/// Tonelli-Shanks modulo an odd prime `p` (any size), `a < p`.
pub(crate) fn sqrt_mod_big_prime(a: &Natural, p: &Natural) -> Option<Natural> {
    if *a == 0u32 {
        return Some(Natural::ZERO);
    }
    if p.limb_count() <= 1 {
        let (a, p) = (u64::saturating_from(a), u64::saturating_from(p));
        return sqrt_mod_prime(a, p).map(Natural::from);
    }
    if Integer::from(a.clone()).jacobi_symbol(Integer::from(p.clone())) != 1 {
        return None;
    }
    let p1 = p - Natural::ONE;
    let s = p1.trailing_zeros().unwrap_or(0);
    let q = &p1 >> s;
    if s == 1 {
        return Some(a.mod_pow(&((p + Natural::ONE) >> 2u32), p));
    }
    let mut z = Natural::from(2u32);
    while Integer::from(z.clone()).jacobi_symbol(Integer::from(p.clone())) != -1 {
        z += Natural::ONE;
    }
    let mut m = s;
    let mut c = z.mod_pow(&q, p);
    let mut t = a.mod_pow(&q, p);
    let mut r = a.mod_pow(&((&q + Natural::ONE) >> 1u32), p);
    while t != 1u32 {
        let mut i = 0;
        let mut tt = t.clone();
        while tt != 1u32 {
            tt = (&tt * &tt) % p;
            i += 1;
            if i >= m {
                return None; // only if p is not prime
            }
        }
        let mut b = c.clone();
        for _ in 0..(m - i - 1) {
            b = (&b * &b) % p;
        }
        m = i;
        c = (&b * &b) % p;
        t = (t * &c) % p;
        r = (r * b) % p;
    }
    Some(r)
}

#[cfg(test)]
mod tests {
    use super::*;
    use malachite::base::num::arithmetic::traits::ModSqrt;
    use proptest::prelude::*;

    #[test]
    fn brute_force_small_prime_powers() {
        for p in [2u64, 3, 5, 7, 11, 13] {
            let mut pk = 1u64;
            for k in 1..=5u32 {
                pk *= p;
                if pk > 4000 {
                    break;
                }
                let mut is_sq = vec![false; pk as usize];
                for x in 0..pk {
                    is_sq[(x * x % pk) as usize] = true;
                }
                for a in -(pk as i64)..(2 * pk as i64) {
                    let got = sqrt_mod_prime_power(&Integer::from(a), &Natural::from(p), k);
                    let ar = a.rem_euclid(pk as i64) as u64;
                    match got {
                        Some(x) => {
                            let x = u64::saturating_from(&x.unsigned_abs_nat());
                            assert!(x < pk);
                            assert_eq!(x * x % pk, ar, "p={p} k={k} a={a}");
                        }
                        None => assert!(!is_sq[ar as usize], "p={p} k={k} a={a} has a root"),
                    }
                }
            }
        }
    }

    #[test]
    fn big_primes_against_malachite() {
        // 2^127 - 1 (= 3 mod 4, Lucas 1876) and 2^89 - 1; plus a prime = 1 mod 2^10
        // found by search, where Tonelli-Shanks does real work.
        let m127 = (Natural::ONE << 127u32) - Natural::ONE;
        let m89 = (Natural::ONE << 89u32) - Natural::ONE;
        let mut q = (Natural::ONE << 100u32) + Natural::ONE;
        while !is_probable_prime(&q) {
            q += Natural::from(1u32 << 10);
        }
        for p in [m127, m89, q] {
            for a in [2u64, 3, 5, 10, 12345678901234567] {
                let a = Natural::from(a);
                let mine = sqrt_mod_big_prime(&(&a % &p), &p);
                let theirs = (&a % &p).mod_sqrt(&p);
                assert_eq!(mine.is_some(), theirs.is_some());
                if let Some(x) = mine {
                    assert_eq!((&x * &x) % &p, &a % &p);
                }
                // lifted to p^3 for a square
                let sq = Integer::from(&a * &a + Natural::from(7u32));
                let x = sqrt_mod_prime_power(&(&sq * &sq), &p, 3).unwrap();
                let p3 = Integer::from((&p).pow(3));
                assert_eq!((&x * &x - &sq * &sq) % &p3, 0);
            }
        }
    }

    #[test]
    fn composite_modulus_is_refused() {
        assert_eq!(sqrt_mod_prime_power(&Integer::from(4), &Natural::from(15u32), 2), None);
        assert_eq!(sqrt_mod_prime_power(&Integer::from(5), &Natural::from(7u32), 0), Some(Integer::ZERO));
    }

    proptest! {
        #[test]
        fn squares_have_roots(r in any::<i64>(), pi in 0usize..8, k in 1u32..12, shift in 0u32..6) {
            let p = [2u64, 3, 5, 7, 13, 65537, 1_000_000_007, 18446744073709551557][pi];
            let pn = Natural::from(p);
            let a = Integer::from(r) * Integer::from((&pn).pow(u64::from(shift)));
            let a = &a * &a;
            let x = sqrt_mod_prime_power(&a, &pn, k).expect("a square has a root");
            let pk = Integer::from((&pn).pow(u64::from(k)));
            prop_assert_eq!((&x * &x - &a) % &pk, 0);
        }

        #[test]
        fn roots_square_back(a in any::<i64>(), pi in 0usize..6, k in 1u32..8) {
            let p = [2u64, 3, 5, 17, 257, 1_000_000_009][pi];
            let pn = Natural::from(p);
            if let Some(x) = sqrt_mod_prime_power(&Integer::from(a), &pn, k) {
                let pk = Integer::from((&pn).pow(u64::from(k)));
                prop_assert_eq!((&x * &x - Integer::from(a)) % &pk, 0);
            } else if k == 1 && p != 2 {
                prop_assert_eq!(Integer::from(a).jacobi_symbol(Integer::from(p)), -1);
            }
        }
    }
}
