//! The sign of the functional equation from the newform's q-expansion,
//! proven in interval arithmetic (see [`crate::lproof::prove_root_number`]
//! for the method and what it rests on): with
//! `F(y) = Σ_{n≥1} a_n exp(-2π n y / sqrt N)`, `F(1/t) = w t^2 F(t)`
//! (Cremona, *Algorithms for Modular Elliptic Curves*, 2nd ed., §2.11);
//! both sides are enclosed with a proven tail bound, and a sign is accepted
//! when the other one is excluded by the enclosures. The budget (deadline
//! and cancel flag) is checked between segments of coefficients.

use super::Setup;
use crate::arith::FactorLimits;
use crate::error::{Error, ErrorKind};
use crate::local::Reduction;

/// Conductors up to this bound get the numerical test as a cross-check of
/// the local formulas in [`root_number`](super::root_number)
/// (milliseconds at this size).
///
/// ```
/// assert!(twofold::rootno::NUMERIC_CHECK_CONDUCTOR <= twofold::rootno::NUMERIC_MAX_CONDUCTOR);
/// ```
pub const NUMERIC_CHECK_CONDUCTOR: u64 = 10_000_000;

/// The largest conductor for which the test of the functional equation is
/// run when the local formulas leave the sign open (about a second at
/// this size; [`crate::lproof::prove_root_number`] goes further on request).
///
/// ```
/// assert_eq!(twofold::rootno::NUMERIC_MAX_CONDUCTOR, 10_000_000_000);
/// ```
pub const NUMERIC_MAX_CONDUCTOR: u64 = 10_000_000_000;

/// The outcome of the numerical test.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) enum Verdict {
    /// The sign, proven.
    Sign(i8),
    /// The enclosures did not separate the signs for any `t` tried.
    Inconclusive,
    /// The budget ended the test after this many coefficients.
    CutShort(u64),
}

/// The largest conductor for which the test is run, when the local
/// formulas and the auxiliary twists leave the sign open, for a caller
/// whose limits carry a deadline (the test then runs until the sign is
/// proven or the deadline ends it: tens of seconds at `10^12`, about a
/// minute and a half at `10^13` and five minutes at `10^14` on a loaded
/// machine, see [`crate::lproof::PROOF_MAX_CONDUCTOR`]); callers
/// without a deadline stop at [`NUMERIC_MAX_CONDUCTOR`].
///
/// ```
/// assert_eq!(twofold::rootno::NUMERIC_REACH_CONDUCTOR, twofold::lproof::PROOF_MAX_CONDUCTOR);
/// ```
pub const NUMERIC_REACH_CONDUCTOR: u64 = crate::lproof::PROOF_MAX_CONDUCTOR;

/// The largest conductor the test is run for within `limits`.
pub(crate) fn reach(limits: &FactorLimits) -> u64 {
    if limits.deadline.is_some() {
        NUMERIC_REACH_CONDUCTOR
    } else {
        NUMERIC_MAX_CONDUCTOR
    }
}

/// Runs the test for the curve described by `setup` (conductor at most
/// [`reach`]`(limits)`, checked by the callers) within `limits`.
pub(crate) fn decide(setup: &Setup, limits: &FactorLimits) -> Result<Verdict, Error> {
    let n = u64::try_from(&setup.conductor)
        .map_err(|_| Error::new(ErrorKind::TooLarge, "conductor too large for the numerical test"))?;
    if n > reach(limits) {
        return Err(Error::new(ErrorKind::TooLarge, "conductor too large for the numerical test"));
    }
    let bad: Vec<(u64, i64)> = setup
        .bad
        .iter()
        .filter_map(|(p, _, d)| {
            let p = u64::try_from(p).ok()?;
            let ap = match d.reduction {
                Reduction::SplitMultiplicative => 1,
                Reduction::NonSplitMultiplicative => -1,
                _ => 0,
            };
            Some((p, ap))
        })
        .collect();
    let proof = crate::lproof::root_number_with_bad(&setup.minimal, n, bad, limits)?;
    Ok(match proof.sign {
        Some(s) => Verdict::Sign(s),
        None if !proof.complete => Verdict::CutShort(proof.terms),
        None => Verdict::Inconclusive,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::curve::Curve;

    #[test]
    fn budget_is_honoured() {
        // issue 12: y^2 + 108y = x^3 + 39x with a budget of 0.5 s took 9.7 s
        let e = Curve::from_coefficients([0, 0, 108, 39, 0]).unwrap();
        let limits = FactorLimits {
            deadline: Some(std::time::Instant::now() + std::time::Duration::from_millis(500)),
            ..Default::default()
        };
        let t = std::time::Instant::now();
        let r = super::super::root_number_with_limits(&e, &limits);
        assert!(t.elapsed().as_secs_f64() < 1.5, "{:?}", t.elapsed());
        if let Err(err) = r {
            assert!(err.message().contains("cut short"), "{err}");
        }
    }
}
