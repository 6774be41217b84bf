//! The analytic record: conductor, root number with its local factors,
//! and the enclosure of `L(E,1)` or `L'(E,1)`, all recomputed.

use super::{reject, CertificateError};
use crate::certificate::{AnalyticRecord, Certificate};

/// Rechecks the analytic record: the conductor and the root number with its
/// local factors recomputed from the minimal model and the listed primes,
/// and the enclosure recomputed from the curve; the recorded enclosure must
/// meet the recomputed one and exclude zero. Returns the rank it proves.
pub(super) fn verify_analytic(c: &Certificate, a: &AnalyticRecord) -> Result<usize, CertificateError> {
    let failed = |what: &str, e: crate::error::Error| CertificateError::Rejected(format!("{what}: {e}"));
    let curve = crate::curve::Curve::new(c.minimal.clone()).map_err(|e| failed("the minimal model", e))?;
    let data = crate::local::CurveData::with_known_primes(&curve, &c.primes).map_err(|e| failed("the local data", e))?;
    if *data.conductor() != a.conductor {
        return reject(format!("the recorded conductor {} is not the conductor {}", a.conductor, data.conductor()));
    }
    let rn = crate::rootno::root_number_of(&data, &crate::arith::FactorLimits::default()).map_err(|e| failed("the root number", e))?;
    if rn.global != a.root_number {
        return reject(format!("the recorded root number {} is not the root number {}", a.root_number, rn.global));
    }
    if rn.local != a.local_root_numbers {
        return reject("the recorded local root numbers differ from the recomputed ones");
    }
    let order = if rn.global == 1 { 0u8 } else { 1 };
    if a.order != order {
        return reject(format!("the recorded order {} does not match the root number {}", a.order, rn.global));
    }
    let (low, high) = match (a.low.parse::<f64>(), a.high.parse::<f64>()) {
        (Ok(l), Ok(h)) if l <= h => (l, h),
        _ => return reject("the recorded enclosure is not an interval"),
    };
    if low <= 0.0 && high >= 0.0 {
        return reject("the recorded enclosure does not exclude zero");
    }
    let proof = crate::lproof::prove_analytic_rank_of(&data, &crate::budget::Work::unlimited())
        .map_err(|e| failed("the L-value recomputation", e))?;
    if proof.root_number.sign != Some(rn.global) {
        return reject("the functional-equation test does not reproduce the root number");
    }
    let Some(v) = proof.value else { return reject("the L-value was not recomputed") };
    if v.order != order || !v.nonzero_proven() {
        return reject("the recomputed enclosure does not exclude zero");
    }
    // both are enclosures of the same number (the recorded ends are decimal,
    // read to the nearest f64: allow one ulp)
    if low.next_down() > v.high || high.next_up() < v.low {
        return reject(format!("the recorded enclosure [{}, {}] misses the recomputed [{}, {}]", a.low, a.high, v.low, v.high));
    }
    Ok(usize::from(order))
}