//! The Dirichlet coefficients `a_n`, `n = 1..=M`, in segments of bounded
//! size: a segmented sieve divides out the primes up to `sqrt(M)`
//! (multiplying in `a_{p^k}`), what is left is 1 or one prime `q > sqrt(M)`
//! (multiplying in `a_q`). The `a_p` of all primes up to `M` are kept in a
//! table of `i16` (two bytes per odd number; `|a_p| <= 2 sqrt(p) < 2^15`
//! for `p < 2.6·10^8`), computed segment by segment, so that a second pass
//! (another series over the same coefficients) costs only the sieve.

use super::trace::{isqrt, TraceOracle};
use crate::arith::primes_up_to;

/// Numbers per segment.
pub(crate) const SEGMENT: usize = 1 << 15;

/// The largest `M` the table supports (`2 sqrt(M) < 2^15`).
pub(crate) const MAX_TERMS: u64 = 260_000_000;

/// What stopped a pass early.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) enum Stop {
    /// The budget ran out or the work was cancelled.
    Budget,
}

pub(crate) struct CoefficientSource {
    oracle: TraceOracle,
    /// `(p, a_p)` at the primes dividing the conductor.
    bad: Vec<(u64, i64)>,
    /// `a_p` at odd primes, indexed by `p / 2`; valid below `known`.
    ap_odd: Vec<i16>,
    a2: i64,
    /// `a_p` is known for every prime below this.
    known: u64,
    small_primes: Vec<u64>,
    small_limit: u64,
    rem: Vec<u64>,
    val: Vec<i64>,
}

impl CoefficientSource {
    /// A source for a global minimal model with `bad = [(p, a_p)]`.
    pub(crate) fn new(curve: &crate::Curve, bad: Vec<(u64, i64)>) -> CoefficientSource {
        CoefficientSource {
            oracle: TraceOracle::new(curve),
            bad,
            ap_odd: Vec::new(),
            a2: 0,
            known: 2,
            small_primes: Vec::new(),
            small_limit: 0,
            rem: vec![0; SEGMENT],
            val: vec![0; SEGMENT],
        }
    }

    fn prime_trace(&mut self, p: u64) -> i64 {
        if let Some(&(_, v)) = self.bad.iter().find(|&&(q, _)| q == p) {
            return v;
        }
        self.oracle.trace(p)
    }

    #[inline]
    fn ap(&self, p: u64) -> i64 {
        if p == 2 {
            self.a2
        } else {
            i64::from(self.ap_odd[(p / 2) as usize])
        }
    }

    fn set_ap(&mut self, p: u64, v: i64) {
        if p == 2 {
            self.a2 = v;
        } else {
            self.ap_odd[(p / 2) as usize] = v as i16;
        }
    }

    fn is_bad(&self, p: u64) -> bool {
        self.bad.iter().any(|&(q, _)| q == p)
    }

    /// `a_{p^k}` for a prime `p` whose `a_p` is known, `k >= 1`.
    fn apk(&self, p: u64, k: u32) -> i64 {
        let ap = self.ap(p);
        if k == 1 {
            return ap;
        }
        if self.is_bad(p) {
            return ap.pow(k);
        }
        let (mut prev, mut cur) = (1i64, ap);
        for _ in 1..k {
            (prev, cur) = (cur, ap * cur - p as i64 * prev);
        }
        cur
    }

    /// Prepares for coefficients up to `m` (`m <= MAX_TERMS`): the small
    /// primes up to `sqrt(m)` and their `a_p`.
    fn prepare(&mut self, m: u64, stop: &dyn Fn() -> bool) -> Result<(), Stop> {
        let half = (m / 2 + 1) as usize;
        if self.ap_odd.len() < half {
            self.ap_odd.resize(half, 0);
        }
        let lim = isqrt(m) + 1;
        if lim > self.small_limit {
            self.small_primes = primes_up_to(lim);
            self.small_limit = lim;
        }
        let primes = self.small_primes.clone();
        for p in primes {
            if p >= self.known {
                if stop() {
                    return Err(Stop::Budget);
                }
                let t = self.prime_trace(p);
                self.set_ap(p, t);
            }
        }
        self.known = self.known.max(lim + 1);
        Ok(())
    }

    /// Calls `sink(lo, a)` with `a[i] = a_{lo + i}` for consecutive
    /// segments covering `1..=m` (the first starts at `lo = 1`). Checks
    /// `stop` between segments; returns the last `n` delivered.
    pub(crate) fn run(&mut self, m: u64, stop: &dyn Fn() -> bool, sink: &mut dyn FnMut(u64, &[i64])) -> Result<u64, (Stop, u64)> {
        assert!(m <= MAX_TERMS, "coefficient table limit");
        self.prepare(m, stop).map_err(|s| (s, 0))?;
        let lim = self.small_limit;
        let mut lo = 1u64;
        while lo <= m {
            if stop() {
                return Err((Stop::Budget, lo - 1));
            }
            let hi = (lo + SEGMENT as u64).min(m + 1);
            let len = (hi - lo) as usize;
            for i in 0..len {
                self.rem[i] = lo + i as u64;
                self.val[i] = 1;
            }
            for idx in 0..self.small_primes.len() {
                let p = self.small_primes[idx];
                if p > lim {
                    break;
                }
                let first = lo.div_ceil(p) * p;
                let mut n = first;
                while n < hi {
                    let i = (n - lo) as usize;
                    let mut r = self.rem[i] / p;
                    let mut k = 1u32;
                    while r % p == 0 {
                        r /= p;
                        k += 1;
                    }
                    self.rem[i] = r;
                    self.val[i] *= self.apk(p, k);
                    n += p;
                }
            }
            for i in 0..len {
                let r = self.rem[i];
                if r > 1 {
                    // a prime q > sqrt(m) (all smaller primes are divided out)
                    let n = lo + i as u64;
                    if r == n && n >= self.known {
                        let t = self.prime_trace(n);
                        self.set_ap(n, t);
                    }
                    self.val[i] *= self.ap(r);
                }
            }
            self.known = self.known.max(hi);
            sink(lo, &self.val[..len]);
            lo = hi;
        }
        Ok(m)
    }

    /// How many primes fell back to the exact count.
    #[cfg(test)]
    pub(crate) fn fallbacks(&self) -> u64 {
        self.oracle.fallbacks
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::Curve;

    #[test]
    fn segments_match_the_direct_sieve() {
        // independent second computation: the whole-array sieve of lseries
        // with the exact point counts
        for (coeffs, bad) in [([0, -1, 1, -10, -20], vec![(11u64, 1i64)]), ([0, 0, 1, -1, 0], vec![(37, -1)])] {
            let e = Curve::from_coefficients(coeffs).unwrap();
            let m = 200_000u64;
            let direct = crate::lseries::coefficients_from(&mut crate::curve::PointCounter::new(&e), &bad, m as usize);
            let mut src = CoefficientSource::new(&e, bad.clone());
            let mut got = vec![0i64];
            src.run(m, &|| false, &mut |lo, a| {
                assert_eq!(lo as usize, got.len());
                got.extend_from_slice(a);
            })
            .unwrap();
            assert_eq!(got, direct);
            // a second pass reuses the table and gives the same
            let mut again = vec![0i64];
            src.run(m, &|| false, &mut |_, a| again.extend_from_slice(a)).unwrap();
            assert_eq!(again, direct);
            assert!(src.fallbacks() <= 2);
        }
    }
}
