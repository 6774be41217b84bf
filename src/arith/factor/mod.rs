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
use malachite::base::num::arithmetic::traits::{CheckedRoot, DivisibleBy, Gcd, ModInverse, Pow, UnsignedAbs};
use malachite::base::num::basic::traits::One;
use malachite::base::num::conversion::traits::SaturatingFrom;
use malachite::base::num::logic::traits::SignificantBits;
use malachite::{Integer, Natural};
use std::collections::BTreeMap;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::{Arc, OnceLock};
use std::time::Instant;

/// Limits on the work [`factor`] may do: a wall-clock deadline and a
/// cancellation flag, both optional (set with `with_deadline` and
/// `with_cancel`; [`FactorLimits::within`] takes both from a `Work`). The
/// default has neither. Past the deadline or with the flag set, [`factor`]
/// stops with an error of kind [`ErrorKind::FactorBudget`].
///
/// ```
/// use std::time::{Duration, Instant};
/// use twofold::arith::{factor, FactorLimits};
/// use malachite::Integer;
/// let limits = FactorLimits::default().with_deadline(Instant::now() + Duration::from_secs(5));
/// // 91 = 7 * 13
/// assert_eq!(factor(&Integer::from(91), &limits).unwrap().factors().len(), 2);
/// ```
#[derive(Clone, Debug, Default)]
#[non_exhaustive]
pub struct FactorLimits {
    /// Stop with [`ErrorKind::FactorBudget`] once this instant has passed.
    pub(crate) deadline: Option<Instant>,
    /// Stop with [`ErrorKind::FactorBudget`] once this flag is set.
    pub(crate) cancel: Option<Arc<AtomicBool>>,
}

impl FactorLimits {
    crate::budget::deadline_and_cancel_setters!();
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
#[non_exhaustive]
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
/// [`is_probable_prime`](crate::arith::is_probable_prime) (a proof below 2^64) and the product is checked
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

/// Factor `n` using primes the caller already knows: `n` is divided by each
/// of `known` that divides it (each such one must be prime: BPSW, a proof
/// below 2^64, else [`ErrorKind::InvalidValue`]; above 2048 bits the test
/// honours `limits`), and only the cofactor left
/// over is factored, within `limits` ([`ErrorKind::FactorBudget`] when that
/// fails). Primes of `known` that do not divide `n` are ignored.
pub(crate) fn factor_with_known_primes(n: &Integer, known: &[Natural], limits: &FactorLimits) -> Result<Factorization, Error> {
    if *n == 0 {
        return Err(Error::new(ErrorKind::InvalidValue, "zero has no prime factorisation"));
    }
    let sign = if *n < 0 { -1 } else { 1 };
    let mut rest = n.unsigned_abs();
    let mut found: BTreeMap<Natural, u32> = BTreeMap::new();
    for p in known {
        if *p < 2u32 {
            return Err(Error::new(ErrorKind::InvalidValue, "a known prime below 2"));
        }
        let mut e = 0u32;
        while (&rest).divisible_by(p) {
            rest /= p;
            e += 1;
        }
        if e > 0 {
            // below 2048 bits the test is unconditional and fast; above, it
            // honours the limits (`FactorBudget`)
            let stop = || Budget { limits }.stop();
            match probable_prime_until(p, &stop) {
                Some(true) => {}
                Some(false) => return Err(Error::new(ErrorKind::InvalidValue, format!("the known factor {p} is not prime"))),
                None => return Err(budget_error("deadline passed or cancelled while testing a known prime")),
            }
            *found.entry(p.clone()).or_insert(0) += e;
        }
    }
    if rest > 1u32 {
        for (p, e) in factor(&Integer::from(rest), limits)?.factors {
            *found.entry(p).or_insert(0) += e;
        }
    }
    let f = Factorization { sign, factors: found.into_iter().collect() };
    if f.product() != *n {
        return Err(Error::internal("factor_with_known_primes", "the product of the factors is not the input"));
    }
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

mod trial;
mod rho;
mod ecm;
#[cfg(test)]
mod tests;

use ecm::{Ecm, ECM_LEVELS};
use rho::{factor_u64_inner, Rho};
pub use rho::factor_u64;
use trial::{perfect_power, trial_divide};
