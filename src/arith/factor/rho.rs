//! Pollard-Brent rho (Brent, BIT 20 (1980)), on residue rings of every
//! width and on single words, and the word-sized factorisation built on it.

use super::*;

// ---------------------------------------------------------------------------
// Pollard-Brent rho.

/// Pollard-Brent rho with `x -> x^2 + c`, several `c`, a total iteration cap.
#[derive(Clone, Copy, Debug)]
pub(super) struct Rho {
    pub(super) iterations: u64,
}

impl Splitter for Rho {
    fn split(&self, n: &Natural, budget: &Budget) -> Split {
        with_ring(n, self, budget)
    }
}

impl RingTask for Rho {
    type Out = Split;
    fn run<R: ModRing>(&self, ring: &R, budget: &Budget) -> Split {
        let mut left = self.iterations;
        for c in 1..=8u64 {
            let per = left / (9 - c);
            match rho_brent(ring, c, per, budget) {
                Ok((Some(d), _)) => return pair(ring.modulus(), d),
                Ok((None, used)) => left = left.saturating_sub(used),
                Err(()) => return Split::Stopped,
            }
        }
        Split::NotFound
    }
}

/// One Brent cycle search; `Ok((factor, iterations used))`, `Err` when stopped.
fn rho_brent<R: ModRing>(
    ring: &R,
    c: u64,
    max_iter: u64,
    budget: &Budget,
) -> Result<(Option<Natural>, u64), ()> {
    const M: u64 = 128;
    let n = ring.modulus();
    let ce = ring.from_u64(c);
    let f = |x: &R::E| ring.add(&ring.sqr(x), &ce);
    let mut y = ring.from_u64(2);
    let mut x;
    let mut ys;
    let mut q = ring.one();
    let mut r: u64 = 1;
    let mut used: u64 = 0;
    let mut g;
    loop {
        x = y.clone();
        for _ in 0..r {
            y = f(&y);
        }
        used += r;
        let mut k = 0;
        loop {
            ys = y.clone();
            let lim = M.min(r - k);
            for _ in 0..lim {
                y = f(&y);
                q = ring.mul(&q, &ring.sub(&x, &y));
            }
            used += lim;
            g = ring.gcd_n(&q);
            k += lim;
            if g != 1u32 || k >= r {
                break;
            }
        }
        if g != 1u32 {
            break;
        }
        r *= 2;
        if used >= max_iter {
            return Ok((None, used));
        }
        if budget.stop() {
            return Err(());
        }
    }
    if g == *n {
        // backtrack from the saved point one step at a time
        for _ in 0..M {
            ys = f(&ys);
            g = ring.gcd_n(&ring.sub(&x, &ys));
            if g != 1u32 {
                break;
            }
        }
    }
    if g == *n || g == 1u32 {
        Ok((None, used))
    } else {
        Ok((Some(g), used))
    }
}

// ---------------------------------------------------------------------------
// Word-sized factorisation.

/// Factor a non-zero word into sorted `(prime, exponent)` pairs.
///
/// Trial division by primes below 64, then Pollard-Brent rho in Montgomery
/// words on what is left (Brent, BIT 20 (1980)); always terminates with a
/// proven answer (primality by [`is_prime_u64`]). `n = 0` is an error of
/// kind [`ErrorKind::InvalidValue`].
///
/// ```
/// use twofold::arith::factor_u64;
/// assert_eq!(factor_u64(5040).unwrap(), vec![(2, 4), (3, 2), (5, 1), (7, 1)]);
/// assert_eq!(factor_u64(1).unwrap(), vec![]);
/// // F5 = 2^32 + 1 = 641 * 6700417 (Euler).
/// assert_eq!(factor_u64((1 << 32) + 1).unwrap(), vec![(641, 1), (6700417, 1)]);
/// assert!(factor_u64(0).is_err());
/// ```
pub fn factor_u64(n: u64) -> Result<Vec<(u64, u32)>, Error> {
    if n == 0 {
        return Err(Error::new(ErrorKind::InvalidValue, "zero has no prime factorisation"));
    }
    Ok(factor_u64_inner(n))
}

pub(super) fn factor_u64_inner(mut n: u64) -> Vec<(u64, u32)> {
    let mut out: BTreeMap<u64, u32> = BTreeMap::new();
    for p in [2u64, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37, 41, 43, 47, 53, 59, 61] {
        while n % p == 0 {
            n /= p;
            *out.entry(p).or_insert(0) += 1;
        }
    }
    let mut stack = vec![n];
    while let Some(m) = stack.pop() {
        if m == 1 {
            continue;
        }
        if is_prime_u64(m) {
            *out.entry(m).or_insert(0) += 1;
            continue;
        }
        let d = split_u64(m);
        stack.push(d);
        stack.push(m / d);
    }
    out.into_iter().collect()
}

/// A non-trivial divisor of the odd composite `n` with no factor below 64.
fn split_u64(n: u64) -> u64 {
    let r = (n as f64).sqrt() as u64;
    for d in [r.saturating_sub(1), r, r + 1] {
        if d > 1 && d.checked_mul(d) == Some(n) {
            return d;
        }
    }
    let mont = Mont64::new(n);
    for c in 1..64u64 {
        if let Some(d) = rho_u64(&mont, c) {
            return d;
        }
    }
    // Never reached in practice; trial division is the guaranteed fallback.
    let mut d = 3;
    while d * d <= n {
        if n % d == 0 {
            return d;
        }
        d += 2;
    }
    n
}

fn rho_u64(m: &Mont64, c: u64) -> Option<u64> {
    const M: u64 = 128;
    let n = m.n;
    let ce = m.to_mont(c % n);
    let f = |x: u64| m.add(m.mul(x, x), ce);
    let mut y = m.to_mont(2 % n);
    let mut x = y;
    let mut ys = y;
    let mut q = m.one;
    let mut r: u64 = 1;
    let mut g: u64 = 1;
    // A cycle mod the smallest prime p appears after O(sqrt p) <= 2^16 steps
    // on average; cap generously.
    while g == 1 && r <= 1 << 26 {
        x = y;
        for _ in 0..r {
            y = f(y);
        }
        let mut k = 0;
        while k < r && g == 1 {
            ys = y;
            for _ in 0..M.min(r - k) {
                y = f(y);
                q = m.mul(q, m.sub(x, y));
            }
            g = gcd_u64(q, n);
            k += M;
        }
        r *= 2;
    }
    if g == n {
        loop {
            ys = f(ys);
            g = gcd_u64(m.sub(x, ys), n);
            if g != 1 {
                break;
            }
        }
    }
    (g != 1 && g != n).then_some(g)
}
