//! Probable-prime testing for big integers: the Baillie-PSW test.
//!
//! A strong Fermat test to base 2 followed by a strong Lucas test with
//! Selfridge's parameters (method A), as described in R. Baillie and
//! S. S. Wagstaff, "Lucas pseudoprimes", Math. Comp. 35 (1980), and in
//! Crandall-Pomerance, *Prime Numbers: A Computational Perspective*, §3.6.
//! No composite passing both is known; below 2^64 we use the deterministic
//! [`is_prime_u64`] instead.

use super::word::is_prime_u64;
use malachite::base::num::arithmetic::traits::{CheckedSqrt, JacobiSymbol, ModPow, UnsignedAbs};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::base::num::conversion::traits::SaturatingFrom;
use malachite::{Integer, Natural};

/// Small odd primes used for trial division before the expensive tests.
const SMALL_PRIMES: [u64; 24] = [
    3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37, 41, 43, 47, 53, 59, 61, 67, 71, 73, 79, 83, 89, 97,
];

/// `n mod m` for a word modulus, without allocating.
pub(crate) fn rem_u64(n: &Natural, m: u64) -> u64 {
    let mut r: u64 = 0;
    for limb in n.limbs().rev() {
        r = ((((r as u128) << 64) | limb as u128) % m as u128) as u64;
    }
    r
}

/// Whether `n` is a probable prime by the Baillie-PSW test; exact (a proof)
/// for `n < 2^64`, where it defers to [`is_prime_u64`].
///
/// Reference: Baillie-Wagstaff, Math. Comp. 35 (1980) 1391-1417; the
/// Mersenne numbers below are classical (2^67 - 1 = 193707721 *
/// 761838257287, found by Cole in 1903).
///
/// ```
/// use malachite::Natural;
/// use twofold::arith::is_probable_prime;
/// let m127 = (Natural::from(1u32) << 127u32) - Natural::from(1u32);
/// assert!(is_probable_prime(&m127));
/// let m67 = (Natural::from(1u32) << 67u32) - Natural::from(1u32);
/// assert!(!is_probable_prime(&m67));
/// assert!(is_probable_prime(&Natural::from(1_000_000_007u64)));
/// ```
pub fn is_probable_prime(n: &Natural) -> bool {
    if n.limb_count() <= 1 {
        return is_prime_u64(u64::saturating_from(n));
    }
    bpsw(n)
}

/// [`is_probable_prime`] under a deadline and a cancellation flag:
/// `Err` of kind [`crate::ErrorKind::FactorBudget`] when either stops the
/// test first. The test is the same (Baillie-PSW); for numbers of more than
/// 2048 bits the base-2 power is computed in slices of 12 exponent bits and
/// the Lucas chain checks the limits every 16 steps, so it stops within a
/// few multiplications of the deadline (a 10,000-digit number takes seconds
/// in all).
///
/// ```
/// use malachite::Natural;
/// use std::time::{Duration, Instant};
/// use twofold::arith::{is_probable_prime_within, FactorLimits};
/// let m127 = (Natural::from(1u32) << 127u32) - Natural::from(1u32);
/// assert_eq!(is_probable_prime_within(&m127, &FactorLimits::default()).unwrap(), true);
/// let past = FactorLimits::default().with_deadline(Instant::now() - Duration::from_millis(1));
/// let big = (Natural::from(1u32) << 9689u32) - Natural::from(1u32); // a Mersenne prime (Gillies, 1963)
/// assert!(is_probable_prime_within(&big, &past).is_err());
/// ```
pub fn is_probable_prime_within(n: &Natural, limits: &super::FactorLimits) -> Result<bool, crate::Error> {
    let stop = || {
        limits.cancel.as_ref().is_some_and(|c| c.load(std::sync::atomic::Ordering::Relaxed))
            || limits.deadline.is_some_and(|d| std::time::Instant::now() >= d)
    };
    probable_prime_until(n, &stop)
        .ok_or_else(|| crate::Error::new(crate::ErrorKind::FactorBudget, "probable-prime test stopped: deadline passed or cancelled"))
}

/// [`is_probable_prime`] that looks at `stop` while it works on numbers of
/// more than 2048 bits: `None` when `stop` said so first.
pub(crate) fn probable_prime_until(n: &Natural, stop: &dyn Fn() -> bool) -> Option<bool> {
    if n.limb_count() <= 1 {
        return Some(is_prime_u64(u64::saturating_from(n)));
    }
    if n.significant_bits() <= SLICED_BITS {
        return Some(bpsw(n));
    }
    if stop() {
        return None;
    }
    if !small_prime_screen(n)? {
        return Some(false);
    }
    if !strong_base2_until(n, stop)? {
        return Some(false);
    }
    lucas_until(n, stop)
}

/// Above this size the probable-prime test looks at the clock while it
/// works (below it the whole test takes under about 10 ms).
const SLICED_BITS: u64 = 2048;

/// Trial division by the small primes (for `n > 97^2`): `Some(false)` when
/// one divides `n`, `Some(true)` otherwise.
fn small_prime_screen(n: &Natural) -> Option<bool> {
    if rem_u64(n, 2) == 0 {
        return Some(false);
    }
    let (lo, hi) = SMALL_PRIMES.split_at(15);
    for group in [lo, hi] {
        let prod: u64 = group.iter().product();
        let r = rem_u64(n, prod);
        if group.iter().any(|&p| r % p == 0) {
            return Some(false);
        }
    }
    Some(true)
}

/// The strong base-2 test with the power computed in slices: `x ↦ x^(2^12)`
/// by one modular power, then `x ↦ 2^c x` by a shift and one reduction.
fn strong_base2_until(n: &Natural, stop: &dyn Fn() -> bool) -> Option<bool> {
    const W: u64 = 12;
    let n1 = n - Natural::ONE;
    let s = n1.trailing_zeros().unwrap_or(0);
    let d = &n1 >> s;
    let bits = d.significant_bits();
    let slices = bits.div_ceil(W);
    let mut x = Natural::ONE;
    let step = Natural::from(1u64 << W);
    for k in (0..slices).rev() {
        if stop() {
            return None;
        }
        let mut c = 0u64;
        for b in (0..W).rev() {
            c = (c << 1) | u64::from(d.get_bit(k * W + b));
        }
        if x != Natural::ONE {
            x = x.mod_pow(&step, n);
        }
        x = (x << c) % n;
    }
    if x == Natural::ONE || x == n1 {
        return Some(true);
    }
    for t in 1..s {
        if t % 16 == 0 && stop() {
            return None;
        }
        x = (&x * &x) % n;
        if x == n1 {
            return Some(true);
        }
        if x == Natural::ONE {
            return Some(false);
        }
    }
    Some(false)
}

/// The Baillie-PSW test on any `n` (no word-size dispatch), so that it can be
/// checked against the deterministic word test.
pub(crate) fn bpsw(n: &Natural) -> bool {
    if *n < 2u32 {
        return false;
    }
    if rem_u64(n, 2) == 0 {
        return *n == 2u32;
    }
    // One remainder modulo a product of the small primes, then word divisions.
    // 3*5*...*53 < 2^64; split the table in two products.
    let (lo, hi) = SMALL_PRIMES.split_at(15);
    for group in [lo, hi] {
        let prod: u64 = group.iter().product();
        let r = rem_u64(n, prod);
        for &p in group {
            if r % p == 0 {
                return *n == p;
            }
        }
    }
    if *n < 97u32 * 97 {
        return true;
    }
    strong_probable_prime_base2(n) && strong_lucas_selfridge(n)
}

/// The strong probable-prime (Miller-Rabin) test to base 2 for odd `n > 2`.
pub(crate) fn strong_probable_prime_base2(n: &Natural) -> bool {
    let n1 = n - Natural::ONE;
    let s = n1.trailing_zeros().unwrap_or(0);
    let d = &n1 >> s;
    let mut x = Natural::from(2u32).mod_pow(&d, n);
    if x == Natural::ONE || x == n1 {
        return true;
    }
    for _ in 1..s {
        x = (&x * &x) % n;
        if x == n1 {
            return true;
        }
        if x == Natural::ONE {
            return false;
        }
    }
    false
}

/// Halve `x` modulo the odd number `n` (`x < n`).
fn half_mod(x: Natural, n: &Natural) -> Natural {
    if x.odd() {
        (x + n) >> 1u32
    } else {
        x >> 1u32
    }
}

trait Parity {
    fn odd(&self) -> bool;
}
impl Parity for Natural {
    fn odd(&self) -> bool {
        self.limbs().next().is_some_and(|l| l & 1 == 1)
    }
}

/// Selfridge's method A: the first `D` in 5, -7, 9, -11, ... with Jacobi
/// symbol `(D/n) = -1`. `Err(true)` if `n` is found composite on the way
/// (a common factor, or `n` a perfect square), `Err(false)` never.
fn selfridge_d(n: &Natural) -> Result<i64, bool> {
    if n.checked_sqrt().is_some() {
        return Err(true); // squares have no D with (D/n) = -1
    }
    let ni = Integer::from(n.clone());
    let mut d: i64 = 5;
    loop {
        let j = Integer::from(d).jacobi_symbol(&ni);
        if j == -1 {
            return Ok(d);
        }
        if j == 0 && Natural::from(d.unsigned_abs()) != *n {
            return Err(true);
        }
        d = if d > 0 { -(d + 2) } else { -d + 2 };
    }
}

/// The strong Lucas probable-prime test with Selfridge parameters
/// `P = 1, Q = (1 - D)/4` for odd `n` not divisible by small primes.
pub(crate) fn strong_lucas_selfridge(n: &Natural) -> bool {
    // without a stop condition the chain always finishes
    lucas_until(n, &|| false).unwrap_or(false)
}

/// [`strong_lucas_selfridge`], looking at `stop` every 16 steps of the chain:
/// `None` when it said stop.
fn lucas_until(n: &Natural, stop: &dyn Fn() -> bool) -> Option<bool> {
    let d = match selfridge_d(n) {
        Ok(d) => d,
        Err(_) => return Some(false),
    };
    let q = (1 - d) / 4;
    let reduce = |v: i64| -> Natural {
        let r = Integer::from(v) % Integer::from(n.clone());
        let r = if r < 0 { r + Integer::from(n.clone()) } else { r };
        r.unsigned_abs()
    };
    let dm = reduce(d);
    let qm = reduce(q);
    let two_n = n << 1u32;
    // n + 1 = k * 2^s with k odd
    let np1 = n + Natural::ONE;
    let s = np1.trailing_zeros().unwrap_or(0);
    let k = &np1 >> s;
    // Left-to-right binary chain on k: (U_j, V_j, Q^j), starting at j = 1.
    let mut u = Natural::ONE;
    let mut v = Natural::ONE; // V_1 = P = 1
    let mut qk = qm.clone();
    let bits = k.significant_bits();
    for i in (0..bits.saturating_sub(1)).rev() {
        if i % 16 == 0 && stop() {
            return None;
        }
        // j -> 2j
        u = (&u * &v) % n;
        v = (&v * &v + &two_n - (&qk << 1u32)) % n;
        qk = (&qk * &qk) % n;
        if k.get_bit(i) {
            // j -> j + 1, with P = 1
            let nu = half_mod((&u + &v) % n, n);
            let nv = half_mod((&dm * &u + &v) % n, n);
            u = nu;
            v = nv;
            qk = (&qk * &qm) % n;
        }
    }
    if u == Natural::ZERO || v == Natural::ZERO {
        return Some(true);
    }
    for t in 1..s {
        if t % 16 == 0 && stop() {
            return None;
        }
        v = (&v * &v + &two_n - (&qk << 1u32)) % n;
        if v == Natural::ZERO {
            return Some(true);
        }
        qk = (&qk * &qk) % n;
    }
    Some(false)
}

use malachite::base::num::logic::traits::{BitAccess, SignificantBits};

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    fn nat(x: u64) -> Natural {
        Natural::from(x)
    }

    fn mersenne(p: u32) -> Natural {
        (Natural::ONE << p) - Natural::ONE
    }

    #[test]
    fn bpsw_agrees_with_word_test_on_ranges() {
        for n in 0..30_000u64 {
            assert_eq!(bpsw(&nat(n)), is_prime_u64(n), "n = {n}");
        }
        for n in (1u64 << 40)..(1u64 << 40) + 3000 {
            assert_eq!(bpsw(&nat(n)), is_prime_u64(n), "n = {n}");
        }
        for n in u64::MAX - 3000..=u64::MAX {
            assert_eq!(bpsw(&nat(n)), is_prime_u64(n), "n = {n}");
        }
    }

    #[test]
    fn pseudoprimes_are_caught() {
        // Carmichael numbers (OEIS A002997, from memory).
        for c in [561u64, 1105, 1729, 2465, 2821, 6601, 8911, 10585, 15841, 29341, 41041, 46657,
            52633, 62745, 63973, 75361, 101101, 115921, 126217, 162401]
        {
            assert!(!bpsw(&nat(c)), "{c}");
            assert!(!is_prime_u64(c));
        }
        // Strong pseudoprimes to base 2 (OEIS A001262, from memory): the
        // base-2 test alone is fooled, BPSW is not.
        for c in [2047u64, 3277, 4033, 4681, 8321, 15841, 29341, 42799, 49141, 52633, 65281,
            74665, 80581, 85489, 88357, 90751]
        {
            assert!(strong_probable_prime_base2(&nat(c)), "{c} should be spsp(2)");
            assert!(!bpsw(&nat(c)), "{c}");
        }
        // Strong Lucas pseudoprimes with Selfridge parameters (OEIS A217255,
        // from memory): the Lucas part alone is fooled, BPSW is not.
        for c in [5459u64, 5777, 10877, 16109, 18971, 22499, 24569, 25199, 40309, 58519, 75077,
            97439]
        {
            assert!(strong_lucas_selfridge(&nat(c)), "{c} should be a strong Lucas psp");
            assert!(!bpsw(&nat(c)), "{c}");
        }
    }

    #[test]
    fn strong_lucas_pseudoprimes_below_100000_by_brute_force() {
        // Independent count: composites below 10^5 passing the strong Lucas
        // test, against trial division; every one must be in the list above.
        let listed = [5459u64, 5777, 10877, 16109, 18971, 22499, 24569, 25199, 40309, 58519,
            75077, 97439];
        for n in (9411u64..100_000).step_by(2) {
            if SMALL_PRIMES.iter().any(|p| n % p == 0) {
                continue;
            }
            if strong_lucas_selfridge(&nat(n)) && !is_prime_u64(n) {
                assert!(listed.contains(&n), "unexpected strong Lucas psp {n}");
            }
            if is_prime_u64(n) {
                assert!(strong_lucas_selfridge(&nat(n)), "prime {n} failed Lucas");
            }
        }
    }

    #[test]
    fn mersenne_numbers() {
        // Mersenne prime exponents (classical): 61, 89, 107, 127, 521, 607.
        for p in [61u32, 89, 107, 127, 521, 607] {
            assert!(is_probable_prime(&mersenne(p)), "2^{p}-1");
        }
        // 2^67-1 (Cole), 2^101-1, 2^103-1, 2^109-1 and 2^257-1 are composite (classical).
        for p in [67u32, 101, 103, 109, 257] {
            assert!(!is_probable_prime(&mersenne(p)), "2^{p}-1");
        }
        let cole = nat(193707721) * nat(761838257287);
        assert_eq!(cole, mersenne(67));
        // Fermat number F7 = 2^128 + 1 is composite (Morrison-Brillhart 1970).
        assert!(!is_probable_prime(&((Natural::ONE << 128u32) + Natural::ONE)));
        // 2^64 + 13 is the least prime above 2^64 (from memory).
        let base = Natural::ONE << 64u32;
        for k in 0..13u32 {
            assert!(!is_probable_prime(&(&base + Natural::from(k))));
        }
        assert!(is_probable_prime(&(&base + nat(13))));
    }

    #[test]
    fn products_of_large_primes_are_composite() {
        let p = mersenne(61);
        let q = mersenne(89);
        assert!(!is_probable_prime(&(&p * &q)));
        assert!(!is_probable_prime(&(&p * &p)));
        assert!(!is_probable_prime(&(&q * &q)));
    }

    fn naive_prime(n: u64) -> bool {
        n >= 2 && (2..).take_while(|d| d * d <= n).all(|d| n % d != 0)
    }

    proptest! {
        #[test]
        fn bpsw_matches_trial_division(n in 0u64..10_000_000_000) {
            prop_assert_eq!(bpsw(&nat(n)), naive_prime(n));
        }

        #[test]
        fn bpsw_matches_word_test(n in any::<u64>()) {
            prop_assert_eq!(bpsw(&nat(n)), is_prime_u64(n));
        }

        #[test]
        fn products_are_never_prime(a in 2u64.., b in 2u64..) {
            prop_assert!(!is_probable_prime(&(nat(a) * nat(b))));
        }
    }
}
