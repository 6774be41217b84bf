//! The self-initialising quadratic sieve, through the `rusqsieve` crate.
//!
//! This file is the only place that knows about the backend: it converts
//! numbers, maps the budget onto the crate's progress callback, catches any
//! panic, and hands back a candidate list of factors. The caller
//! ([`super::factor`]) checks that the list multiplies back to the input and
//! re-tests every entry with our own primality test, so a backend bug can cost
//! time but never give a wrong answer. Swapping the backend means replacing
//! [`SiqsSplitter::split`].

use super::factor::{Budget, Split, Splitter};
use malachite::Natural;
use std::time::Duration;

/// Widest composite the backend accepts (its documented sieve limit).
pub(crate) const SIQS_MAX_BITS: u64 = 400;

type BackendNat = rusqsieve::Natural<8>;

fn to_backend(n: &Natural) -> Option<BackendNat> {
    let mut bytes = Vec::with_capacity(8 * n.limb_count() as usize);
    for limb in n.limbs() {
        bytes.extend_from_slice(&limb.to_le_bytes());
    }
    BackendNat::from_le_bytes(&bytes).ok()
}

fn from_backend(x: &BackendNat) -> Option<Natural> {
    let mut bytes = [0u8; 64];
    let len = x.write_le_bytes(&mut bytes).ok()?;
    let limbs: Vec<u64> = bytes[..len.div_ceil(8) * 8]
        .chunks(8)
        .map(|c| u64::from_le_bytes(c.try_into().unwrap_or([0; 8])))
        .collect();
    Some(Natural::from_limbs_asc(&limbs))
}

/// Quadratic-sieve splitter (single worker thread, to share the machine).
#[derive(Clone, Copy, Debug, Default)]
pub(crate) struct SiqsSplitter;

impl Splitter for SiqsSplitter {
    fn split(&self, n: &Natural, budget: &Budget) -> Split {
        use malachite::base::num::logic::traits::SignificantBits;
        if n.significant_bits() > SIQS_MAX_BITS {
            return Split::NotFound;
        }
        let Some(input) = to_backend(n) else {
            return Split::NotFound;
        };
        let config = rusqsieve::FactorConfig::default()
            .with_parallelism(rusqsieve::Parallelism::threads(1).unwrap_or(rusqsieve::Parallelism::Auto))
            .with_progress_interval(Duration::from_millis(5));
        let mut stopped = false;
        let run = std::panic::catch_unwind(std::panic::AssertUnwindSafe(|| {
            rusqsieve::factor_with_progress(input, config, |_| {
                if budget.stop() {
                    stopped = true;
                    rusqsieve::ProgressAction::Cancel
                } else {
                    rusqsieve::ProgressAction::Continue
                }
            })
        }));
        let factors = match run {
            Ok(Ok(f)) => f,
            Ok(Err(_)) | Err(_) => {
                return if stopped || budget.stop() { Split::Stopped } else { Split::NotFound };
            }
        };
        let mut out = Vec::new();
        for f in factors.expanded() {
            match from_backend(f) {
                Some(x) => out.push(x),
                None => return Split::NotFound,
            }
        }
        Split::Factors(out)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn conversions_round_trip() {
        for s in ["1", "18446744073709551616", "340282366920938463463374607431768211457"] {
            let n: Natural = s.parse().unwrap();
            let b = to_backend(&n).unwrap();
            assert_eq!(from_backend(&b).unwrap(), n);
            assert_eq!(b.to_string(), s);
        }
    }
}
