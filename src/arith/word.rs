//! Machine-word kernels: modular multiplication, powers, primality and a
//! bit sieve of Eratosthenes.

/// `a * b mod m` for `m > 0`, through a 128-bit product; a product that
/// fits in a word is reduced by a word division (the 128-bit remainder is
/// a library call, several times slower: 23% of the class groups of small
/// cubic fields, whose Euler products work modulo primes below 1e5).
#[inline]
pub fn mul_mod(a: u64, b: u64, m: u64) -> u64 {
    let x = a as u128 * b as u128;
    if x >> 64 == 0 {
        (x as u64) % m
    } else {
        (x % m as u128) as u64
    }
}

/// `b^e mod m` for `m > 0` by square and multiply.
pub fn pow_mod(mut b: u64, mut e: u64, m: u64) -> u64 {
    if m == 1 {
        return 0;
    }
    let mut r = 1u64;
    b %= m;
    while e > 0 {
        if e & 1 == 1 {
            r = mul_mod(r, b, m);
        }
        b = mul_mod(b, b, m);
        e >>= 1;
    }
    r
}

/// Greatest common divisor of two words (binary algorithm).
pub fn gcd_u64(mut a: u64, mut b: u64) -> u64 {
    if a == 0 {
        return b;
    }
    if b == 0 {
        return a;
    }
    let shift = (a | b).trailing_zeros();
    a >>= a.trailing_zeros();
    loop {
        b >>= b.trailing_zeros();
        if a > b {
            std::mem::swap(&mut a, &mut b);
        }
        b -= a;
        if b == 0 {
            return a << shift;
        }
    }
}

/// The inverse of `a` modulo `m`, if `gcd(a, m) = 1` (extended Euclid).
pub fn inv_mod(a: u64, m: u64) -> Option<u64> {
    if m == 0 {
        return None;
    }
    let (mut r0, mut r1) = (m as i128, (a % m) as i128);
    let (mut t0, mut t1) = (0i128, 1i128);
    while r1 != 0 {
        let q = r0 / r1;
        (r0, r1) = (r1, r0 - q * r1);
        (t0, t1) = (t1, t0 - q * t1);
    }
    if r0 != 1 {
        return if m == 1 { Some(0) } else { None };
    }
    Some(t0.rem_euclid(m as i128) as u64)
}

/// Deterministic primality test for every `u64`: trial division by small
/// primes, then the strong probable-prime test: below 2^32 to the bases
/// 2, 7, 61 in 64-bit arithmetic, above to the seven bases of
/// Jaeschke/Sinclair, which has no composite pseudoprime below 2^64.
///
/// ```
/// use twofold::arith::is_prime_u64;
/// assert!(is_prime_u64(2) && is_prime_u64(18446744073709551557));
/// assert!(!is_prime_u64(1) && !is_prime_u64(3215031751)); // strong pseudoprime to 2,3,5,7
/// ```
pub fn is_prime_u64(n: u64) -> bool {
    if n < 2 {
        return false;
    }
    for p in [2u64, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37] {
        if n % p == 0 {
            return n == p;
        }
    }
    if n < 41 * 41 {
        return true;
    }
    if n < 1 << 32 {
        return strong_probable_prime_u32(n as u32);
    }
    let d = (n - 1) >> (n - 1).trailing_zeros();
    let s = (n - 1).trailing_zeros();
    'witness: for a in [2u64, 325, 9375, 28178, 450775, 9780504, 1795265022] {
        let a = a % n;
        if a == 0 {
            continue;
        }
        let mut x = pow_mod(a, d, n);
        if x == 1 || x == n - 1 {
            continue;
        }
        for _ in 1..s {
            x = mul_mod(x, x, n);
            if x == n - 1 {
                continue 'witness;
            }
        }
        return false;
    }
    true
}

/// The strong probable-prime test to the bases 2, 7 and 61, which no odd
/// composite below 4,759,123,141 passes (Jaeschke, "On strong pseudoprimes
/// to several bases", Math. Comp. 61 (1993); the bound from memory), so a
/// proof for every odd `n < 2^32` (the caller has removed small factors).
/// Residues are kept in Montgomery form with `R = 2^32`: no division in the
/// loop, several times cheaper than the seven-base test with 128-bit
/// remainders (the plain local-solubility calls prove their prime on every
/// call).
fn strong_probable_prime_u32(n: u32) -> bool {
    let n64 = n as u64;
    // n^-1 mod 2^32 by Newton's iteration (n odd: n * n = 1 mod 8)
    let mut inv = n;
    for _ in 0..4 {
        inv = inv.wrapping_mul(2u32.wrapping_sub(n.wrapping_mul(inv)));
    }
    // t R^-1 mod n for t < n^2: t - m n is divisible by 2^32 for m = t n^-1
    let redc = |t: u64| -> u64 {
        let m = (t as u32).wrapping_mul(inv);
        let r = (t >> 32) as i64 - ((m as u64 * n64) >> 32) as i64;
        if r < 0 {
            (r + n64 as i64) as u64
        } else {
            r as u64
        }
    };
    let one = (1u64 << 32) % n64;
    let minus_one = n64 - one;
    let s = (n64 - 1).trailing_zeros();
    let d = (n64 - 1) >> s;
    'witness: for a in [2u64, 7, 61] {
        let a = a % n64;
        if a == 0 {
            continue;
        }
        let (mut x, mut base, mut e) = (one, (a << 32) % n64, d);
        while e > 0 {
            if e & 1 == 1 {
                x = redc(x * base);
            }
            base = redc(base * base);
            e >>= 1;
        }
        if x == one || x == minus_one {
            continue;
        }
        for _ in 1..s {
            x = redc(x * x);
            if x == minus_one {
                continue 'witness;
            }
        }
        return false;
    }
    true
}

/// The bound of [`is_small_prime`]'s table: every `n < 2^20`.
pub(crate) const SMALL_PRIME_TABLE_BOUND: u64 = 1 << 20;

/// Whether `n < 2^20` is prime, read from a process-wide, read-only bit
/// table of the odd numbers below `2^20` (64 KiB, sieved once on first use,
/// then shared by every thread: no per-thread state). `None` for larger `n`.
/// A table lookup is several times cheaper than the three-base test, which
/// matters for the plain local-solubility calls that check their place on
/// every call.
pub(crate) fn is_small_prime(n: u64) -> Option<bool> {
    use std::sync::OnceLock;
    static ODD_PRIMES: OnceLock<Vec<u64>> = OnceLock::new();
    if n >= SMALL_PRIME_TABLE_BOUND {
        return None;
    }
    if n % 2 == 0 {
        return Some(n == 2);
    }
    let bits = ODD_PRIMES.get_or_init(|| {
        // bit i stands for 2i + 1
        let mut bits = vec![0u64; (SMALL_PRIME_TABLE_BOUND / 128) as usize];
        for p in primes_up_to(SMALL_PRIME_TABLE_BOUND - 1).into_iter().skip(1) {
            let i = (p / 2) as usize;
            bits[i / 64] |= 1 << (i % 64);
        }
        bits
    });
    let i = (n / 2) as usize;
    Some(bits[i / 64] >> (i % 64) & 1 == 1)
}

/// All primes `p <= n`, by a sieve of Eratosthenes over odd numbers kept as
/// bits in `u64` words.
///
/// ```
/// assert_eq!(twofold::arith::primes_up_to(20), vec![2, 3, 5, 7, 11, 13, 17, 19]);
/// ```
pub fn primes_up_to(n: u64) -> Vec<u64> {
    let mut out = Vec::new();
    if n < 2 {
        return out;
    }
    out.push(2);
    // bit i stands for 2i+1
    let len = ((n - 1) / 2 + 1) as usize;
    let mut bits = vec![u64::MAX; len.div_ceil(64)];
    bits[0] &= !1; // 1 is not prime
    let mut i = 1usize;
    while (2 * i + 1) * (2 * i + 1) <= n as usize {
        if bits[i / 64] >> (i % 64) & 1 == 1 {
            let p = 2 * i + 1;
            let mut j = (p * p) / 2;
            while j < len {
                bits[j / 64] &= !(1u64 << (j % 64));
                j += p;
            }
        }
        i += 1;
    }
    for (w, &word) in bits.iter().enumerate() {
        let mut word = word;
        while word != 0 {
            let b = word.trailing_zeros() as usize;
            let idx = w * 64 + b;
            if idx >= len {
                break;
            }
            out.push(2 * idx as u64 + 1);
            word &= word - 1;
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn naive_prime(n: u64) -> bool {
        n >= 2 && (2..).take_while(|d| d * d <= n).all(|d| n % d != 0)
    }

    #[test]
    fn primality_agrees_with_trial_division() {
        for n in 0..20_000u64 {
            assert_eq!(is_prime_u64(n), naive_prime(n), "n = {n}");
        }
        // Known strong pseudoprimes to several small bases (from memory:
        // 3215031751 = 151*751*28351 is spsp(2,3,5,7)).
        assert!(!is_prime_u64(3215031751));
        assert!(!is_prime_u64(3825123056546413051)); // spsp to bases 2..23 (from memory)
        assert!(is_prime_u64(1_000_000_007));
    }

    #[test]
    fn word_test_below_2_32_agrees_with_the_seven_base_test() {
        // The three-base path below 2^32 against the full seven-base test
        // (Jaeschke/Sinclair bases, no pseudoprime below 2^64) on a spread
        // of odd n, and on strong pseudoprimes to base 2 (2047 = 23*89,
        // 3277, 4033, 4681, 8321: from memory) and to 2,3,5,7 (3215031751).
        let seven = |n: u64| {
            let d = (n - 1) >> (n - 1).trailing_zeros();
            let s = (n - 1).trailing_zeros();
            [2u64, 325, 9375, 28178, 450775, 9780504, 1795265022].iter().all(|&a| {
                let a = a % n;
                if a == 0 {
                    return true;
                }
                let mut x = pow_mod(a, d, n);
                if x == 1 || x == n - 1 {
                    return true;
                }
                (1..s).any(|_| {
                    x = mul_mod(x, x, n);
                    x == n - 1
                })
            })
        };
        let mut n = 1681u64; // 41^2, where the word test begins
        while n < 1 << 32 {
            if n % 2 == 1 {
                assert_eq!(strong_probable_prime_u32(n as u32), seven(n), "n = {n}");
            }
            n += 1 + n / 20_000;
        }
        for c in [2047u64, 3277, 4033, 4681, 8321, 3215031751] {
            assert!(!is_prime_u64(c), "{c}");
        }
        for p in [1_000_003u64, 4_294_967_291, 2_147_483_647] {
            assert!(is_prime_u64(p), "{p}"); // 2^32 - 5 and 2^31 - 1 are prime (from memory)
        }
    }

    #[test]
    fn word_kernels_small_cases() {
        // both sides of the word-product branch: 2^32 (2^32 - 1) fits in a
        // word, 2^32 2^32 does not; 2^64 = 1 mod 2^64 - 1 (hand-checked)
        assert_eq!(mul_mod(1 << 32, (1 << 32) - 1, 1_000_003), ((1u128 << 32) * ((1u128 << 32) - 1) % 1_000_003) as u64);
        assert_eq!(mul_mod(1 << 32, 1 << 32, u64::MAX), 1);
        assert_eq!(mul_mod(99_991, 99_989, 99_991), 0);
        // the crate-private kernels' former doc examples (hand-checked)
        assert_eq!(mul_mod(u64::MAX - 1, u64::MAX - 1, u64::MAX), 1); // (-1)^2
        assert_eq!(pow_mod(3, 4, 7), 81 % 7);
        assert_eq!(pow_mod(2, 1_000_000_006, 1_000_000_007), 1); // Fermat
        assert_eq!(gcd_u64(12, 18), 6);
        assert_eq!(gcd_u64(0, 7), 7);
        assert_eq!(inv_mod(3, 7), Some(5));
        assert_eq!(inv_mod(2, 4), None);
    }

    #[test]
    fn sieve_agrees_with_primality() {
        let ps = primes_up_to(100_000);
        let want: Vec<u64> = (0..=100_000).filter(|&n| is_prime_u64(n)).collect();
        assert_eq!(ps, want);
        assert_eq!(primes_up_to(1_000_000).len(), 78_498); // pi(10^6), a classical value
    }

    #[test]
    fn small_prime_table_agrees_with_the_word_test() {
        // every n below 2^20 against is_prime_u64, and the count
        // pi(2^20) = 82025 (a classical value, from memory)
        let mut count = 0;
        for n in 0..SMALL_PRIME_TABLE_BOUND {
            let t = is_small_prime(n);
            assert_eq!(t, Some(is_prime_u64(n)), "n = {n}");
            count += (t == Some(true)) as u32;
        }
        assert_eq!(count, 82_025);
        assert_eq!(is_small_prime(SMALL_PRIME_TABLE_BOUND), None);
        assert_eq!(is_small_prime(1_000_003), Some(true));
    }
}
