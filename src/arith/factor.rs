//! Integer factorisation: trial division, Pollard-Brent rho, the elliptic
//! curve method and the quadratic sieve, behind one small internal
//! interface ([`Splitter`]), with every answer verified before it is returned.
//!
//! References: R. P. Brent, "An improved Monte Carlo factorization
//! algorithm", BIT 20 (1980); P. L. Montgomery, "Speeding the Pollard and
//! elliptic curve methods of factorization", Math. Comp. 48 (1987);
//! H. Suyama's parametrisation as given in Crandall-Pomerance, *Prime
//! Numbers*, §7.4; R. D. Silverman, "The multiple polynomial quadratic
//! sieve", Math. Comp. 48 (1987).

use super::mont::{ModRing, Mont64, MontN, NatRing};
use super::primality::{probable_prime_until, rem_u64};
#[cfg(test)]
use super::primality::is_probable_prime;
use super::siqs::{SiqsSplitter, SIQS_MAX_BITS};
use super::word::{gcd_u64, is_prime_u64, primes_up_to};
use crate::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{CheckedRoot, Gcd, ModInverse, Pow, UnsignedAbs};
use malachite::base::num::basic::traits::One;
use malachite::base::num::conversion::traits::SaturatingFrom;
use malachite::base::num::logic::traits::SignificantBits;
use malachite::{Integer, Natural};
use std::collections::BTreeMap;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::{Arc, OnceLock};
use std::time::Instant;

/// Limits on the work [`factor`] may do: a wall-clock deadline and a
/// cancellation flag, both optional. The default has neither.
///
/// ```
/// use std::time::{Duration, Instant};
/// use twofold::arith::FactorLimits;
/// let limits = FactorLimits { deadline: Some(Instant::now() + Duration::from_secs(5)), ..Default::default() };
/// assert!(limits.cancel.is_none());
/// ```
#[derive(Clone, Debug, Default)]
pub struct FactorLimits {
    /// Stop with [`ErrorKind::FactorBudget`] once this instant has passed.
    pub deadline: Option<Instant>,
    /// Stop with [`ErrorKind::FactorBudget`] once this flag is set.
    pub cancel: Option<Arc<AtomicBool>>,
}

/// The budget as the kernels see it.
pub(crate) struct Budget<'a> {
    limits: &'a FactorLimits,
}

impl Budget<'_> {
    /// Whether the work must stop now.
    pub(crate) fn stop(&self) -> bool {
        if let Some(c) = &self.limits.cancel {
            if c.load(Ordering::Relaxed) {
                return true;
            }
        }
        self.limits.deadline.is_some_and(|d| Instant::now() >= d)
    }
}

/// What a splitting attempt produced.
#[derive(Debug)]
pub(crate) enum Split {
    /// Numbers, each `> 1`, claimed to multiply to the input (checked by the caller).
    Factors(Vec<Natural>),
    /// No factor found within the method's own effort.
    NotFound,
    /// The budget ran out.
    Stopped,
}

/// One factoring method: given an odd composite `n` with no small factors
/// that is not a perfect power, try to split it.
pub(crate) trait Splitter {
    fn split(&self, n: &Natural, budget: &Budget) -> Split;
}

/// The prime factorisation of a non-zero integer: a sign and sorted
/// `(prime, exponent)` pairs.
///
/// ```
/// use malachite::Integer;
/// use twofold::arith::{factor, FactorLimits};
/// let f = factor(&Integer::from(-360), &FactorLimits::default()).unwrap();
/// assert_eq!(f.sign(), -1);
/// let pairs: Vec<(u64, u32)> = f.factors().iter().map(|(p, e)| (u64::try_from(p).unwrap(), *e)).collect();
/// assert_eq!(pairs, vec![(2, 3), (3, 2), (5, 1)]);
/// assert_eq!(f.product(), Integer::from(-360));
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Factorization {
    sign: i8,
    factors: Vec<(Natural, u32)>,
}

impl Factorization {
    /// The sign of the factored integer, `1` or `-1`.
    ///
    /// ```
    /// use malachite::Integer;
    /// let f = twofold::arith::factor(&Integer::from(-7), &Default::default()).unwrap();
    /// assert_eq!(f.sign(), -1);
    /// ```
    pub fn sign(&self) -> i8 {
        self.sign
    }

    /// The `(prime, exponent)` pairs, primes increasing, exponents `>= 1`.
    ///
    /// ```
    /// use malachite::{Integer, Natural};
    /// let f = twofold::arith::factor(&Integer::from(12), &Default::default()).unwrap();
    /// assert_eq!(f.factors(), &[(Natural::from(2u32), 2), (Natural::from(3u32), 1)]);
    /// ```
    pub fn factors(&self) -> &[(Natural, u32)] {
        &self.factors
    }

    /// The distinct primes, increasing.
    ///
    /// ```
    /// use malachite::{Integer, Natural};
    /// let f = twofold::arith::factor(&Integer::from(100), &Default::default()).unwrap();
    /// let ps: Vec<&Natural> = f.primes().collect();
    /// assert_eq!(ps, vec![&Natural::from(2u32), &Natural::from(5u32)]);
    /// ```
    pub fn primes(&self) -> impl Iterator<Item = &Natural> {
        self.factors.iter().map(|(p, _)| p)
    }

    /// The exponent of `p` (zero if `p` does not occur).
    ///
    /// ```
    /// use malachite::{Integer, Natural};
    /// let f = twofold::arith::factor(&Integer::from(48), &Default::default()).unwrap();
    /// assert_eq!(f.exponent(&Natural::from(2u32)), 4);
    /// assert_eq!(f.exponent(&Natural::from(5u32)), 0);
    /// ```
    pub fn exponent(&self, p: &Natural) -> u32 {
        self.factors
            .binary_search_by(|(q, _)| q.cmp(p))
            .map(|i| self.factors[i].1)
            .unwrap_or(0)
    }

    /// The integer this factorisation describes, `sign * prod p^e`.
    ///
    /// ```
    /// use malachite::Integer;
    /// let n = Integer::from(-1_000_001);
    /// assert_eq!(twofold::arith::factor(&n, &Default::default()).unwrap().product(), n);
    /// ```
    pub fn product(&self) -> Integer {
        let m = self.factors.iter().fold(Natural::ONE, |acc, (p, e)| acc * p.pow(u64::from(*e)));
        if self.sign < 0 {
            -Integer::from(m)
        } else {
            Integer::from(m)
        }
    }

    /// The radical `prod p`, the largest squarefree divisor of `|n|`.
    ///
    /// ```
    /// use malachite::{Integer, Natural};
    /// let f = twofold::arith::factor(&Integer::from(-72), &Default::default()).unwrap();
    /// assert_eq!(f.radical(), Natural::from(6u32));
    /// ```
    pub fn radical(&self) -> Natural {
        self.factors.iter().fold(Natural::ONE, |acc, (p, _)| acc * p)
    }

    /// The squarefree part `s` of `n`, with the sign of `n`: `n = s m^2` with
    /// `s` squarefree (see [`Factorization::square_root_of_square_part`] for `m`).
    ///
    /// ```
    /// use malachite::Integer;
    /// let f = twofold::arith::factor(&Integer::from(-72), &Default::default()).unwrap();
    /// assert_eq!(f.squarefree_part(), Integer::from(-2)); // -72 = -2 * 6^2
    /// ```
    pub fn squarefree_part(&self) -> Integer {
        let s = self
            .factors
            .iter()
            .filter(|(_, e)| e % 2 == 1)
            .fold(Natural::ONE, |acc, (p, _)| acc * p);
        if self.sign < 0 {
            -Integer::from(s)
        } else {
            Integer::from(s)
        }
    }

    /// The `m >= 1` with `n = s m^2`, `s` the squarefree part.
    ///
    /// ```
    /// use malachite::{Integer, Natural};
    /// let f = twofold::arith::factor(&Integer::from(-72), &Default::default()).unwrap();
    /// assert_eq!(f.square_root_of_square_part(), Natural::from(6u32));
    /// ```
    pub fn square_root_of_square_part(&self) -> Natural {
        self.factors.iter().fold(Natural::ONE, |acc, (p, e)| acc * p.pow(u64::from(e / 2)))
    }

    /// All positive divisors of `|n|`, increasing. Their number is
    /// `prod (e + 1)`; ask only for numbers with few divisors.
    ///
    /// ```
    /// use malachite::{Integer, Natural};
    /// let f = twofold::arith::factor(&Integer::from(12), &Default::default()).unwrap();
    /// let d: Vec<Natural> = [1u32, 2, 3, 4, 6, 12].iter().map(|&x| Natural::from(x)).collect();
    /// assert_eq!(f.divisors(), d);
    /// ```
    pub fn divisors(&self) -> Vec<Natural> {
        let mut out = vec![Natural::ONE];
        for (p, e) in &self.factors {
            let len = out.len();
            let mut pk = Natural::ONE;
            for _ in 0..*e {
                pk *= p;
                for i in 0..len {
                    let d = &out[i] * &pk;
                    out.push(d);
                }
            }
        }
        out.sort();
        out
    }
}

/// Factor a non-zero integer completely into primes.
///
/// Small factors come out by trial division; cofactors below 2^64 by
/// Pollard-Brent rho in Montgomery words; bigger ones by a short rho, the
/// elliptic curve method at rising bounds and, below 400 bits, the
/// self-initialising quadratic sieve. Every returned prime passes
/// [`is_probable_prime`] (a proof below 2^64) and the product is checked
/// against `n`.
///
/// Errors: `n = 0` gives [`ErrorKind::InvalidValue`]; a deadline passed, the
/// cancel flag set, or the search effort exhausted (only after ECM at the
/// 50-digit level) gives [`ErrorKind::FactorBudget`]. Balanced 60-digit
/// semiprimes take a few seconds on one core.
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::arith::{factor, FactorLimits};
/// // 2^64 + 1 = 274177 * 67280421310721 (Landry, 1880).
/// let n = Integer::from((Natural::from(1u32) << 64u32) + Natural::from(1u32));
/// let f = factor(&n, &FactorLimits::default()).unwrap();
/// assert_eq!(f.factors(), &[(Natural::from(274177u32), 1), (Natural::from(67280421310721u64), 1)]);
/// assert_eq!(factor(&Integer::from(0), &FactorLimits::default()).unwrap_err().kind(),
///            &twofold::ErrorKind::InvalidValue);
/// ```
pub fn factor(n: &Integer, limits: &FactorLimits) -> Result<Factorization, Error> {
    factor_with(n, limits, Plan::Full)
}

/// Which methods the driver may use (tests restrict it to cross-check methods).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) enum Plan {
    Full,
    /// Rho and ECM only, no quadratic sieve.
    NoSieve,
    /// The quadratic sieve straight after trial division.
    SieveFirst,
}

pub(crate) fn factor_with(
    n: &Integer,
    limits: &FactorLimits,
    strategy: Plan,
) -> Result<Factorization, Error> {
    if *n == 0 {
        return Err(Error::new(ErrorKind::InvalidValue, "zero has no prime factorisation"));
    }
    let sign = if *n < 0 { -1 } else { 1 };
    let m = n.unsigned_abs();
    let budget = Budget { limits };
    let mut found: BTreeMap<Natural, u32> = BTreeMap::new();
    let stop = || budget.stop();
    let rest = trial_divide(&m, &mut found, &stop).ok_or_else(|| budget_error("deadline passed or cancelled"))?;
    let mut stack: Vec<(Natural, u32)> = Vec::new();
    if rest > 1u32 {
        stack.push((rest, 1));
    }
    while let Some((c, e)) = stack.pop() {
        if budget.stop() {
            return Err(budget_error("deadline passed or cancelled"));
        }
        if c.limb_count() <= 1 {
            for (p, k) in factor_u64_inner(u64::saturating_from(&c)) {
                *found.entry(Natural::from(p)).or_insert(0) += k * e;
            }
            continue;
        }
        let prime = probable_prime_until(&c, &stop).ok_or_else(|| budget_error("deadline passed or cancelled"))?;
        if prime {
            *found.entry(c).or_insert(0) += e;
            continue;
        }
        if let Some((r, k)) = perfect_power(&c, &stop).ok_or_else(|| budget_error("deadline passed or cancelled"))? {
            stack.push((r, e * k));
            continue;
        }
        let parts = split_composite(&c, &budget, strategy)?;
        for part in parts {
            stack.push((part, e));
        }
    }
    let factors: Vec<(Natural, u32)> = found.into_iter().collect();
    let f = Factorization { sign, factors };
    verify(&f, n, &stop)?;
    Ok(f)
}

fn budget_error(what: &str) -> Error {
    Error::new(ErrorKind::FactorBudget, format!("factorisation stopped: {what}"))
}

/// Check the answer: primes increasing and prime, exponents positive, product `n`.
fn verify(f: &Factorization, n: &Integer, stop: &dyn Fn() -> bool) -> Result<(), Error> {
    let mut ok_primes = f.factors.windows(2).all(|w| w[0].0 < w[1].0);
    for (p, e) in &f.factors {
        ok_primes &= *e >= 1
            && if p.limb_count() <= 1 {
                is_prime_u64(u64::saturating_from(p))
            } else {
                probable_prime_until(p, stop).ok_or_else(|| budget_error("deadline passed or cancelled"))?
            };
    }
    if ok_primes && f.product() == *n {
        Ok(())
    } else {
        Err(Error::new(ErrorKind::FactorBudget, "internal check of the factorisation failed"))
    }
}

const TRIAL_BOUND: u64 = 1 << 16;

fn trial_primes() -> &'static [u64] {
    static P: OnceLock<Vec<u64>> = OnceLock::new();
    P.get_or_init(|| primes_up_to(TRIAL_BOUND))
}

/// Remove all prime factors below 2^16 from `m`, recording them; returns the cofactor.
/// `None` when `stop` says so (looked at every 64 groups on numbers of more
/// than 64 limbs, where one group costs a pass over the limbs).
fn trial_divide(m: &Natural, found: &mut BTreeMap<Natural, u32>, stop: &dyn Fn() -> bool) -> Option<Natural> {
    let mut m = m.clone();
    let primes = trial_primes();
    let mut i = 0;
    let mut groups = 0u32;
    while i < primes.len() && m > 1u32 {
        groups += 1;
        if groups % 64 == 0 && m.limb_count() > 64 && stop() {
            return None;
        }
        // group primes so their product fits a word
        let mut prod: u64 = 1;
        let mut j = i;
        while j < primes.len() && (prod as u128 * primes[j] as u128) < (1u128 << 64) {
            prod *= primes[j];
            j += 1;
        }
        let r = rem_u64(&m, prod);
        for &p in &primes[i..j] {
            if r % p == 0 {
                let pn = Natural::from(p);
                let mut k = 0;
                while rem_u64(&m, p) == 0 {
                    m /= &pn;
                    k += 1;
                }
                found.insert(pn, k);
            }
        }
        i = j;
        // once m is small, stop early: what remains is prime or factored later
        if m.limb_count() <= 1 && u64::saturating_from(&m) < primes[i.min(primes.len() - 1)].saturating_mul(primes[i.min(primes.len() - 1)]) {
            break;
        }
    }
    Some(m)
}

/// `Some((r, k))` with `n = r^k`, `k > 1` maximal-ish (a prime `k`), for `n`
/// without prime factors below 2^16.
/// The outer `None` when `stop` said so first (looked at before each root).
fn perfect_power(n: &Natural, stop: &dyn Fn() -> bool) -> Option<Option<(Natural, u32)>> {
    let bits = n.significant_bits();
    for k in primes_up_to(bits / 16 + 1) {
        if bits > 4096 && stop() {
            return None;
        }
        if let Some(r) = n.checked_root(k) {
            return Some(Some((r, k as u32)));
        }
    }
    Some(None)
}

/// Split an odd composite without small factors that is not a perfect power
/// into at least two factors `> 1` (not necessarily prime), or report the budget.
fn split_composite(n: &Natural, budget: &Budget, strategy: Plan) -> Result<Vec<Natural>, Error> {
    let bits = n.significant_bits();
    let digits = (bits as f64 * std::f64::consts::LOG10_2) as u32 + 1;
    let sieve_ok = strategy != Plan::NoSieve && bits <= SIQS_MAX_BITS;
    let mut plan: Vec<Box<dyn Splitter>> = Vec::new();
    if strategy == Plan::SieveFirst && sieve_ok {
        plan.push(Box::new(SiqsSplitter));
    }
    plan.push(Box::new(Rho { iterations: 1 << 15 }));
    // ECM effort before the sieve: up to about a quarter of the digits.
    let pre_sieve_digits = (digits / 4).max(15);
    let mut level = 0;
    if sieve_ok {
        while level < ECM_LEVELS.len() && ECM_LEVELS[level].0 <= pre_sieve_digits {
            plan.push(Box::new(Ecm::level(level)));
            level += 1;
        }
        if strategy != Plan::SieveFirst {
            plan.push(Box::new(SiqsSplitter));
        }
    }
    while level < ECM_LEVELS.len() {
        plan.push(Box::new(Ecm::level(level)));
        level += 1;
    }
    for method in &plan {
        match method.split(n, budget) {
            Split::Factors(parts) => {
                // accept only a genuine split: parts > 1, fewer than n, product n
                let product = parts.iter().fold(Natural::ONE, |a, b| a * b);
                if parts.len() >= 2 && parts.iter().all(|p| *p > 1u32) && product == *n {
                    return Ok(parts);
                }
            }
            Split::NotFound => {}
            Split::Stopped => return Err(budget_error("deadline passed or cancelled")),
        }
        if budget.stop() {
            return Err(budget_error("deadline passed or cancelled"));
        }
    }
    Err(budget_error(&format!(
        "no factor of a {digits}-digit composite found after ECM at the {}-digit level",
        ECM_LEVELS[ECM_LEVELS.len() - 1].0
    )))
}

// ---------------------------------------------------------------------------
// Dispatch of generic kernels on the width of n.

/// A kernel generic over the residue ring.
trait RingTask {
    type Out;
    fn run<R: ModRing>(&self, ring: &R, budget: &Budget) -> Self::Out;
}

fn with_ring<T: RingTask>(n: &Natural, task: &T, budget: &Budget) -> T::Out {
    macro_rules! go {
        ($l:literal) => {
            match MontN::<$l>::new(n) {
                Some(r) => task.run(&r, budget),
                None => task.run(&NatRing::new(n), budget),
            }
        };
    }
    match n.limb_count() {
        0..=1 => go!(1),
        2 => go!(2),
        3 => go!(3),
        4 => go!(4),
        5..=6 => go!(6),
        7..=8 => go!(8),
        9..=16 => go!(16),
        _ => task.run(&NatRing::new(n), budget),
    }
}

fn pair(n: &Natural, d: Natural) -> Split {
    if d > 1u32 && d < *n {
        let q = n / &d;
        Split::Factors(vec![d, q])
    } else {
        Split::NotFound
    }
}

// ---------------------------------------------------------------------------
// Pollard-Brent rho.

/// Pollard-Brent rho with `x -> x^2 + c`, several `c`, a total iteration cap.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Rho {
    pub(crate) iterations: u64,
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

fn factor_u64_inner(mut n: u64) -> Vec<(u64, u32)> {
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

// ---------------------------------------------------------------------------
// The elliptic curve method on Montgomery curves B y^2 = x^3 + A x^2 + x.

/// `(digits of the factor aimed at, B1, curves)`: the usual schedule of
/// Silverman-Wagstaff ("A practical analysis of the elliptic curve
/// factoring algorithm", Math. Comp. 61 (1993)) as commonly tabulated.
const ECM_LEVELS: [(u32, u64, u32); 8] = [
    (15, 2_000, 25),
    (20, 11_000, 90),
    (25, 50_000, 300),
    (30, 250_000, 700),
    (35, 1_000_000, 1_800),
    (40, 3_000_000, 5_100),
    (45, 11_000_000, 10_600),
    (50, 43_000_000, 19_300),
];

/// ECM with bounds `b1`, `b2` and a number of curves from Suyama's family.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Ecm {
    pub(crate) b1: u64,
    pub(crate) b2: u64,
    pub(crate) curves: u32,
    pub(crate) first_sigma: u64,
}

impl Ecm {
    fn level(i: usize) -> Self {
        let (_, b1, curves) = ECM_LEVELS[i];
        Ecm { b1, b2: (100 * b1).min(400_000_000), curves, first_sigma: 6 + 1000 * i as u64 }
    }
}

impl Splitter for Ecm {
    fn split(&self, n: &Natural, budget: &Budget) -> Split {
        with_ring(n, self, budget)
    }
}

/// A point `(X : Z)` on the Kummer line.
#[derive(Clone, Debug)]
struct Pt<E> {
    x: E,
    z: E,
}

struct Curve<'r, R: ModRing> {
    ring: &'r R,
    a24: R::E,
}

impl<R: ModRing> Curve<'_, R> {
    /// Differential addition: `P + Q` from `P`, `Q` and `P - Q`.
    fn add(&self, p: &Pt<R::E>, q: &Pt<R::E>, diff: &Pt<R::E>) -> Pt<R::E> {
        let r = self.ring;
        let u = r.mul(&r.sub(&p.x, &p.z), &r.add(&q.x, &q.z));
        let v = r.mul(&r.add(&p.x, &p.z), &r.sub(&q.x, &q.z));
        let s = r.add(&u, &v);
        let d = r.sub(&u, &v);
        Pt { x: r.mul(&diff.z, &r.sqr(&s)), z: r.mul(&diff.x, &r.sqr(&d)) }
    }
    /// Doubling with `a24 = (A + 2)/4`.
    fn dbl(&self, p: &Pt<R::E>) -> Pt<R::E> {
        let r = self.ring;
        let s = r.sqr(&r.add(&p.x, &p.z));
        let d = r.sqr(&r.sub(&p.x, &p.z));
        let t = r.sub(&s, &d);
        Pt { x: r.mul(&s, &d), z: r.mul(&t, &r.add(&d, &r.mul(&self.a24, &t))) }
    }
    /// `k P` by the Montgomery ladder, `k >= 1`.
    fn mul(&self, k: u64, p: &Pt<R::E>) -> Pt<R::E> {
        if k == 1 {
            return p.clone();
        }
        let mut r0 = p.clone();
        let mut r1 = self.dbl(p);
        let top = 63 - k.leading_zeros();
        for i in (0..top).rev() {
            if (k >> i) & 1 == 1 {
                r0 = self.add(&r1, &r0, p);
                r1 = self.dbl(&r1);
            } else {
                r1 = self.add(&r1, &r0, p);
                r0 = self.dbl(&r0);
            }
        }
        r0
    }
}

enum CurveResult {
    Factor(Natural),
    Nothing,
    Stopped,
}

/// Odd-number primality bitmap up to a bound, for stage 2.
struct OddPrimeBits {
    bits: Vec<u64>,
    limit: u64,
}

impl OddPrimeBits {
    fn new(limit: u64) -> Self {
        let len = (limit / 2 + 1) as usize;
        let mut bits = vec![u64::MAX; len.div_ceil(64)];
        bits[0] &= !1;
        let mut i = 1usize;
        while (2 * i + 1) * (2 * i + 1) <= limit as usize {
            if bits[i / 64] >> (i % 64) & 1 == 1 {
                let p = 2 * i + 1;
                let mut j = p * p / 2;
                while j < len {
                    bits[j / 64] &= !(1u64 << (j % 64));
                    j += p;
                }
            }
            i += 1;
        }
        OddPrimeBits { bits, limit }
    }
    fn is_prime(&self, x: u64) -> bool {
        x <= self.limit && x % 2 == 1 && {
            let i = (x / 2) as usize;
            self.bits[i / 64] >> (i % 64) & 1 == 1
        }
    }
}

impl RingTask for Ecm {
    type Out = Split;
    fn run<R: ModRing>(&self, ring: &R, budget: &Budget) -> Split {
        let primes = primes_up_to(self.b1);
        let stage2 = OddPrimeBits::new(self.b2 + 2310);
        for i in 0..self.curves as u64 {
            match ecm_curve(ring, self.first_sigma + i, self.b1, self.b2, &primes, &stage2, budget) {
                CurveResult::Factor(d) => return pair(ring.modulus(), d),
                CurveResult::Nothing => {}
                CurveResult::Stopped => return Split::Stopped,
            }
        }
        Split::NotFound
    }
}

fn nontrivial(g: Natural, n: &Natural) -> Option<Natural> {
    (g > 1u32 && g < *n).then_some(g)
}

/// One curve of Suyama's family: stage 1 to `b1`, standard continuation to `b2`.
fn ecm_curve<R: ModRing>(
    ring: &R,
    sigma: u64,
    b1: u64,
    b2: u64,
    primes: &[u64],
    stage2: &OddPrimeBits,
    budget: &Budget,
) -> CurveResult {
    let n = ring.modulus();
    let r = ring;
    // u = sigma^2 - 5, v = 4 sigma, x0 = u^3, z0 = v^3,
    // (A + 2)/4 = (v - u)^3 (3u + v) / (16 u^3 v).
    let s = r.from_u64(sigma);
    let u = r.sub(&r.sqr(&s), &r.from_u64(5));
    let v = r.mul(&r.from_u64(4), &s);
    let u3 = r.mul(&r.sqr(&u), &u);
    let v3 = r.mul(&r.sqr(&v), &v);
    let vmu = r.sub(&v, &u);
    let num = r.mul(&r.mul(&r.sqr(&vmu), &vmu), &r.add(&r.mul(&r.from_u64(3), &u), &v));
    let den = r.mul(&r.mul(&r.from_u64(16), &u3), &v);
    let den_n = r.to_natural(&den);
    if den_n == 0u32 {
        return CurveResult::Nothing; // sigma hit a bad value modulo n itself
    }
    let inv = match (&den_n).mod_inverse(n) {
        Some(i) => i,
        None => {
            return match nontrivial(den_n.gcd(n), n) {
                Some(d) => CurveResult::Factor(d),
                None => CurveResult::Nothing,
            };
        }
    };
    let curve = Curve { ring: r, a24: r.mul(&num, &r.from_natural(&inv)) };
    let mut p = Pt { x: u3, z: v3 };
    // Stage 1: multiply by every prime power up to b1.
    for (i, &q) in primes.iter().enumerate() {
        let mut qk = q;
        while qk <= b1 / q {
            qk *= q;
        }
        p = curve.mul(qk, &p);
        if i % 512 == 511 && budget.stop() {
            return CurveResult::Stopped;
        }
    }
    let g = r.gcd_n(&p.z);
    if g != 1u32 {
        return match nontrivial(g, n) {
            Some(d) => CurveResult::Factor(d),
            None => CurveResult::Nothing,
        };
    }
    if b2 <= b1 {
        return CurveResult::Nothing;
    }
    // Stage 2 (baby-step giant-step standard continuation, Montgomery 1987):
    // a prime q = mD +- j is caught when x(mD P) = x(j P) modulo a prime.
    const D: u64 = 2310;
    let mut baby: Vec<(u64, Pt<R::E>)> = Vec::new();
    let p2 = curve.dbl(&p);
    let mut prev = p.clone(); // j = 1
    let mut cur = curve.add(&p2, &p, &p); // j = 3
    if gcd_u64(1, D) == 1 {
        baby.push((1, prev.clone()));
    }
    let mut j = 3;
    while j < D / 2 {
        if gcd_u64(j, D) == 1 {
            baby.push((j, cur.clone()));
        }
        let next = curve.add(&cur, &p2, &prev);
        prev = cur;
        cur = next;
        j += 2;
    }
    let mut acc = r.one();
    let mut m0 = b1 / D;
    if m0 == 0 {
        // m = 0: the giant point is the identity (1 : 0), so the cross
        // product reduces to Z_j, which vanishes mod p iff j P = 0 mod p.
        for (j, bp) in &baby {
            if *j > b1 && *j <= b2 && stage2.is_prime(*j) {
                acc = r.mul(&acc, &bp.z);
            }
        }
        m0 = 1;
    }
    let dp = curve.mul(D, &p);
    let mut rm = curve.mul(m0 * D, &p);
    let mut rm_prev = curve.mul((m0 - 1).max(1) * D, &p);
    let mut first = m0 == 1; // then rm_prev is not (m0 - 1) D P
    let mut m = m0;
    while m * D <= b2 + D {
        for (j, bp) in &baby {
            let lo = m * D - j;
            let hi = m * D + j;
            if (lo > b1 && lo <= b2 && stage2.is_prime(lo)) || (hi > b1 && hi <= b2 && stage2.is_prime(hi)) {
                let t = r.sub(&r.mul(&rm.x, &bp.z), &r.mul(&bp.x, &rm.z));
                acc = r.mul(&acc, &t);
            }
        }
        let next = if first {
            first = false;
            curve.dbl(&rm) // m0 = 1: 2 D P
        } else {
            curve.add(&rm, &dp, &rm_prev)
        };
        rm_prev = rm;
        rm = next;
        m += 1;
        if m % 64 == 0 && budget.stop() {
            return CurveResult::Stopped;
        }
    }
    match nontrivial(r.gcd_n(&acc), n) {
        Some(d) => CurveResult::Factor(d),
        None => CurveResult::Nothing,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use malachite::base::num::basic::traits::Zero;
    use proptest::prelude::*;

    fn nat(s: &str) -> Natural {
        s.parse().unwrap()
    }

    fn int(s: &str) -> Integer {
        s.parse().unwrap()
    }

    fn lim() -> FactorLimits {
        FactorLimits::default()
    }

    /// Deterministic generator for test primes (SplitMix64).
    struct Gen(u64);
    impl Gen {
        fn next(&mut self) -> u64 {
            self.0 = self.0.wrapping_add(0x9e37_79b9_7f4a_7c15);
            let mut z = self.0;
            z = (z ^ (z >> 30)).wrapping_mul(0xbf58_476d_1ce4_e5b9);
            z = (z ^ (z >> 27)).wrapping_mul(0x94d0_49bb_1331_11eb);
            z ^ (z >> 31)
        }
        /// A random prime with exactly `digits` decimal digits.
        fn prime(&mut self, digits: u32) -> Natural {
            let lo = Natural::from(10u32).pow(u64::from(digits - 1));
            let span = Natural::from(10u32).pow(u64::from(digits)) - &lo;
            let mut x = Natural::ZERO;
            for _ in 0..digits.div_ceil(19) + 1 {
                x = (x << 64u32) + Natural::from(self.next());
            }
            let mut p = lo + x % span;
            loop {
                if is_probable_prime(&p) {
                    return p;
                }
                p += Natural::ONE;
            }
        }
    }

    fn pairs(f: &Factorization) -> Vec<(String, u32)> {
        f.factors().iter().map(|(p, e)| (p.to_string(), *e)).collect()
    }

    #[test]
    fn known_factorisations() {
        // Classical factorisations (Fermat numbers: Euler 1732 for F5,
        // Landry 1880 for F6, Morrison-Brillhart 1970 for F7; Cole 1903 for
        // 2^67 - 1; the repunit R19 is prime; 10^20 + 1 = 73 137 1676321 5964848081
        // (from memory)).
        let cases: [(&str, &[(&str, u32)]); 6] = [
            ("4294967297", &[("641", 1), ("6700417", 1)]),
            ("18446744073709551617", &[("274177", 1), ("67280421310721", 1)]),
            (
                "340282366920938463463374607431768211457",
                &[("59649589127497217", 1), ("5704689200685129054721", 1)],
            ),
            ("147573952589676412927", &[("193707721", 1), ("761838257287", 1)]),
            ("1111111111111111111", &[("1111111111111111111", 1)]),
            ("100000000000000000001", &[("73", 1), ("137", 1), ("1676321", 1), ("5964848081", 1)]),
        ];
        for (n, want) in cases {
            let f = factor(&int(n), &lim()).unwrap();
            let want: Vec<(String, u32)> = want.iter().map(|(p, e)| (p.to_string(), *e)).collect();
            assert_eq!(pairs(&f), want, "n = {n}");
        }
    }

    #[test]
    fn signs_units_and_powers() {
        let f = factor(&int("1"), &lim()).unwrap();
        assert!(f.factors().is_empty() && f.sign() == 1);
        let f = factor(&int("-1"), &lim()).unwrap();
        assert!(f.factors().is_empty() && f.sign() == -1);
        assert_eq!(factor(&int("0"), &lim()).unwrap_err().kind(), &ErrorKind::InvalidValue);
        // (2^61 - 1)^3 * (2^31 - 1)^2 * -12: perfect-power cofactor
        let m61 = nat("2305843009213693951");
        let m31 = nat("2147483647");
        let n = -Integer::from(&m61 * &m61 * &m61 * &m31 * &m31 * Natural::from(12u32));
        let f = factor(&n, &lim()).unwrap();
        assert_eq!(f.sign(), -1);
        assert_eq!(
            pairs(&f),
            vec![("2".into(), 2), ("3".into(), 1), ("2147483647".into(), 2), ("2305843009213693951".into(), 3)]
        );
        // a square of a 30-digit prime
        let mut g = Gen(7);
        let p = g.prime(30);
        let f = factor(&Integer::from(&p * &p), &lim()).unwrap();
        assert_eq!(f.factors(), &[(p, 2)]);
    }

    #[test]
    fn squarefree_and_radical() {
        // -2^3 3^2 5 7^4 = -s m^2 with s = 2*5, m = 2*3*49
        let n = Integer::from(-8 * 9 * 5 * 2401);
        let f = factor(&n, &lim()).unwrap();
        assert_eq!(f.squarefree_part(), Integer::from(-10));
        assert_eq!(f.square_root_of_square_part(), Natural::from(2u32 * 3 * 49));
        assert_eq!(f.radical(), Natural::from(210u32));
        let s = f.squarefree_part();
        let m = Integer::from(f.square_root_of_square_part());
        assert_eq!(&s * &m * &m, n);
        assert_eq!(f.divisors().len(), 4 * 3 * 2 * 5); // tau = prod (e + 1)
    }

    #[test]
    fn factor_u64_matches_trial_division() {
        fn naive(mut n: u64) -> Vec<(u64, u32)> {
            let mut out = Vec::new();
            let mut d = 2;
            while d * d <= n {
                let mut k = 0;
                while n % d == 0 {
                    n /= d;
                    k += 1;
                }
                if k > 0 {
                    out.push((d, k));
                }
                d += 1;
            }
            if n > 1 {
                out.push((n, 1));
            }
            out
        }
        for n in 1..5000u64 {
            assert_eq!(factor_u64(n).unwrap(), naive(n), "n = {n}");
        }
        let mut g = Gen(1);
        for _ in 0..200 {
            let n = g.next() >> 24; // 40-bit
            assert_eq!(factor_u64(n).unwrap(), naive(n), "n = {n}");
        }
        // semiprimes of two 32-bit primes, and large prime squares
        for _ in 0..50 {
            let mut p = (g.next() >> 32) | 1;
            while !is_prime_u64(p) {
                p += 2;
            }
            let mut q = (g.next() >> 32) | (1 << 31) | 1;
            while !is_prime_u64(q) {
                q += 2;
            }
            let n = p.wrapping_mul(q);
            if (p as u128 * q as u128) < (1 << 64) {
                let mut want = vec![(p.min(q), 1), (p.max(q), 1)];
                if p == q {
                    want = vec![(p, 2)];
                }
                assert_eq!(factor_u64(n).unwrap(), want);
            }
            if (p as u128 * p as u128) < (1 << 64) {
                assert_eq!(factor_u64(p * p).unwrap(), vec![(p, 2)]);
            }
        }
    }

    /// Rho and ECM on each width of Montgomery ring, and on the fallback ring.
    #[test]
    fn kernels_on_every_ring() {
        let mut g = Gen(3);
        let limits = lim();
        let budget = Budget { limits: &limits };
        for &(dp, dq) in &[(8u32, 12u32), (8, 30), (9, 60), (8, 150)] {
            let p = g.prime(dp);
            let q = g.prime(dq);
            let n = &p * &q;
            let rho = Rho { iterations: 1 << 20 };
            match rho.split(&n, &budget) {
                Split::Factors(v) => assert!(v.contains(&p), "rho on {n}"),
                other => panic!("rho failed on {n}: {other:?}"),
            }
            match rho.run(&NatRing::new(&n), &budget) {
                Split::Factors(v) => assert!(v.contains(&p)),
                other => panic!("rho (NatRing) failed on {n}: {other:?}"),
            }
            let ecm = Ecm { b1: 2000, b2: 200_000, curves: 200, first_sigma: 11 };
            match ecm.split(&n, &budget) {
                Split::Factors(v) => assert!(v.contains(&p), "ecm on {n}"),
                other => panic!("ecm failed on {n}: {other:?}"),
            }
        }
        // ECM on NatRing agrees with MontN curve by curve (same sigma, same outcome)
        let p = g.prime(9);
        let q = g.prime(25);
        let n = &p * &q;
        let primes = primes_up_to(500);
        let bits = OddPrimeBits::new(20_000 + 2310);
        for sigma in 6..40 {
            let a = ecm_curve(&MontN::<2>::new(&n).unwrap(), sigma, 500, 20_000, &primes, &bits, &budget);
            let b = ecm_curve(&NatRing::new(&n), sigma, 500, 20_000, &primes, &bits, &budget);
            let (a, b) = match (a, b) {
                (CurveResult::Factor(x), CurveResult::Factor(y)) => (Some(x), Some(y)),
                (CurveResult::Nothing, CurveResult::Nothing) => (None, None),
                _ => panic!("rings disagree at sigma {sigma}"),
            };
            assert_eq!(a, b);
        }
    }

    /// The stage-2 continuation finds a prime whose curve order has one
    /// large prime factor in (B1, B2]: checked by brute force on a small
    /// prime, where the group order is counted by the Legendre symbol.
    #[test]
    fn ecm_stage2_catches_the_large_prime() {
        use crate::arith::jacobi_u64;
        let p = 10007u64;
        let mut found_stage2 = false;
        for sigma in 6..200u64 {
            // the curve mod p and its group order, counted naively
            let md = |a: i128| a.rem_euclid(p as i128) as u64;
            let u = md(sigma as i128 * sigma as i128 - 5);
            let v = md(4 * sigma as i128);
            let inv = |a: u64| super::super::word::inv_mod(a, p);
            let den = (16 * u % p) * u % p * u % p * v % p;
            let Some(dinv) = inv(den) else { continue };
            let vmu = md(v as i128 - u as i128);
            let a24 = vmu * vmu % p * vmu % p * ((3 * u + v) % p) % p * dinv % p;
            let a = md(4 * a24 as i128 - 2);
            if a == 2 || a == p - 2 {
                continue; // singular modulo p
            }
            let x0 = u * u % p * u % p * inv(v * v % p * v % p).unwrap() % p;
            // B = x0^3 + A x0^2 + x0 (y = 1); #E = p + 1 + sum chi(B (x^3 + A x^2 + x))
            let bb = (x0 * x0 % p * x0 + a * x0 % p * x0 + x0) % p;
            if bb == 0 {
                continue;
            }
            let mut order: i64 = p as i64 + 1;
            for x in 0..p {
                let rhs = (x * x % p * x + a * x % p * x + x) % p;
                order += jacobi_u64(bb * rhs % p, p) as i64;
            }
            let f = factor_u64(order as u64).unwrap();
            let big = f.last().unwrap().0;
            let smooth_rest = f.iter().all(|&(q, e)| q == big || q.pow(e) <= 100);
            if !(smooth_rest && big > 100 && big <= 5000 && f.last().unwrap().1 == 1) {
                continue;
            }
            // the point's order divides #E; with B1 = 100, B2 = 5000 stage 2 must
            // reach it unless the point order is already B1-smooth.
            // a second prime large enough that its curve is never smooth enough
            let q = Natural::from((1u64 << 61) - 1);
            let n = Natural::from(p) * &q;
            let limits = lim();
            let budget = Budget { limits: &limits };
            let primes = primes_up_to(100);
            let bits = OddPrimeBits::new(5000 + 2310);
            let ring = MontN::<2>::new(&n).unwrap();
            match ecm_curve(&ring, sigma, 100, 5000, &primes, &bits, &budget) {
                CurveResult::Factor(d) => {
                    assert_eq!(d, Natural::from(p));
                    found_stage2 = true;
                }
                _ => {
                    // acceptable only if the point's order is B1-smooth and stage 1
                    // already caught both primes, which does not happen here.
                    panic!("sigma {sigma}: order {order} = {f:?} should be caught");
                }
            }
        }
        assert!(found_stage2);
    }

    #[test]
    fn siqs_backend_agrees_with_ecm() {
        // The quadratic sieve against our own rho/ECM on independent
        // semiprimes of 20 to 34 digits; both factorisations must agree.
        let mut g = Gen(11);
        for i in 0..12u32 {
            let dp = 10 + i % 6;
            let dq = 10 + (i * 7) % 8 + 4;
            let p = g.prime(dp);
            let q = g.prime(dq);
            let n = Integer::from(&p * &q);
            let a = factor_with(&n, &lim(), Plan::SieveFirst).unwrap();
            let b = factor_with(&n, &lim(), Plan::NoSieve).unwrap();
            assert_eq!(a, b, "n = {n}");
            assert_eq!(a.product(), n);
        }
    }

    /// Slow sweep (run with `--ignored`): the sieve backend against rho/ECM
    /// on 120 semiprimes and 3-factor products of 20 to 44 digits.
    #[test]
    #[ignore]
    fn siqs_backend_sweep() {
        let mut g = Gen(0x5eed);
        for i in 0..120u32 {
            let dp = 8 + i % 15;
            let dq = 12 + (i * 5) % 11;
            let mut n = g.prime(dp) * g.prime(dq);
            if i % 4 == 0 {
                n *= g.prime(6 + i % 7);
            }
            let n = Integer::from(n);
            let a = factor_with(&n, &lim(), Plan::SieveFirst).unwrap();
            let b = factor_with(&n, &lim(), Plan::NoSieve).unwrap();
            assert_eq!(a, b, "n = {n}");
        }
    }

    #[test]
    fn balanced_semiprimes_and_mixed_products() {
        let mut g = Gen(5);
        // 40-digit balanced semiprime through the default strategy
        let p = g.prime(20);
        let q = g.prime(20);
        let n = Integer::from(&p * &q);
        let f = factor(&n, &lim()).unwrap();
        let mut want = vec![(p.clone(), 1), (q.clone(), 1)];
        want.sort();
        assert_eq!(f.factors(), want.as_slice());
        // product of primes of many sizes with repeats
        let parts = [g.prime(5), g.prime(9), g.prime(14), g.prime(18), g.prime(22)];
        let mut n = Natural::ONE;
        for (i, p) in parts.iter().enumerate() {
            n *= p.pow(1 + (i as u64 % 2));
        }
        let f = factor(&Integer::from(&n), &lim()).unwrap();
        assert_eq!(f.factors().len(), 5);
        assert_eq!(f.product(), Integer::from(n));
    }

    #[test]
    fn budget_is_honoured() {
        let mut g = Gen(9);
        let n = Integer::from(g.prime(40) * g.prime(40));
        let limits = FactorLimits { deadline: Some(Instant::now()), cancel: None };
        assert_eq!(factor(&n, &limits).unwrap_err().kind(), &ErrorKind::FactorBudget);
        let flag = Arc::new(AtomicBool::new(true));
        let limits = FactorLimits { deadline: None, cancel: Some(flag) };
        assert_eq!(factor(&n, &limits).unwrap_err().kind(), &ErrorKind::FactorBudget);
        // a deadline in the middle of the sieve stops it promptly
        let start = Instant::now();
        let limits = FactorLimits { deadline: Some(start + std::time::Duration::from_millis(200)), cancel: None };
        let r = factor(&n, &limits);
        assert!(start.elapsed() < std::time::Duration::from_secs(5));
        if let Ok(f) = r {
            assert_eq!(f.product(), n); // finished in time: still right
        }
        // small numbers need no budget at all
        let limits = FactorLimits { deadline: Some(Instant::now()), cancel: None };
        assert!(factor(&Integer::from(30), &limits).is_ok());
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(64))]
        #[test]
        fn factorisations_multiply_back(a in any::<u64>(), b in any::<u64>(), c in 1u64..1_000_000, neg in any::<bool>()) {
            let m = Natural::from(a.max(1)) * Natural::from(b.max(1)) * Natural::from(c);
            let n = if neg { -Integer::from(m) } else { Integer::from(m) };
            let f = factor(&n, &lim()).unwrap();
            prop_assert_eq!(f.product(), n);
            for (p, e) in f.factors() {
                prop_assert!(*e >= 1 && is_probable_prime(p));
            }
        }

        #[test]
        fn small_factorisations_match_factor_u64(n in 1u64..) {
            let f = factor(&Integer::from(n), &lim()).unwrap();
            let got: Vec<(u64, u32)> = f.factors().iter().map(|(p, e)| (u64::saturating_from(p), *e)).collect();
            prop_assert_eq!(got, factor_u64(n).unwrap());
        }
    }
}
