//! Search for rational points of small height: on quartics `y^2 = g(x, z)`
//! (the 2-coverings met in a descent), on Weierstrass curves, and on plane
//! cubics (the coverings of a 3-descent; [`search_plane_cubic`], by lattice
//! reduction, see its module).
//!
//! Both searches run a bit-parallel sieve: for a set of small moduli (the
//! primes 11 to 61 and the prime powers 64, 27, 25, 49) a table gives, for
//! each residue of the row variable, the 64-bit words of admissible residues
//! of `x`; a word of 64 candidates costs one load and one AND per modulus,
//! most selective modulus first. Only survivors are evaluated exactly, and
//! every point returned is checked on its equation with exact arithmetic.
//!
//! The search runs in shells of doubling height (16, 32, 64, ...), so small
//! points come first and a search stopped by a deadline or a cancellation
//! flag can say up to which height it was exhaustive
//! ([`SearchOutcome::height_reached`]).
//!
//! The plain searches [`search_quartic_naive`] and [`search_curve_naive`]
//! test every pair with no sieve; they return the same points and serve as
//! the independent check in tests and benchmarks.

mod curve;
mod plane;
mod quartic;
mod sieve;
#[cfg(test)]
mod tests;

pub use curve::{search_curve, search_curve_naive};
pub use plane::{search_plane_cubic, search_plane_cubic_naive, PlanePoint, PLANE_MAX_HEIGHT};
pub(crate) use plane::MONOMIALS;
pub use quartic::{search_quartic, search_quartic_naive};
pub(crate) use quartic::search_quartic_above;

use malachite::Integer;
use std::sync::atomic::AtomicBool;
use std::sync::Arc;
use std::time::Instant;

/// How far a point search may go.
///
/// `height` bounds the pairs searched (see [`search_quartic`] and
/// [`search_curve`] for what it means in each case; values above `2^31` are
/// clamped to `2^31` and the search is then never reported complete).
/// `first_only` stops at the first point found. The search stops early once
/// `deadline` has passed or `cancel` is set.
///
/// ```
/// use twofold::search::SearchLimits;
/// let limits = SearchLimits::new(100).with_first_only(true);
/// assert_eq!(limits.height, 100);
/// assert!(limits.deadline.is_none() && limits.cancel.is_none());
/// ```
#[derive(Clone, Debug, Default)]
#[non_exhaustive]
pub struct SearchLimits {
    /// The height bound.
    pub height: u64,
    /// Stop after the first point found.
    pub first_only: bool,
    /// Stop once this instant has passed.
    pub deadline: Option<Instant>,
    /// Stop once this flag is set (read with relaxed ordering).
    pub cancel: Option<Arc<AtomicBool>>,
}

impl SearchLimits {
    /// Stops (or not) after the first point found.
    pub fn with_first_only(mut self, v: bool) -> Self {
        self.first_only = v;
        self
    }
    crate::budget::deadline_and_cancel_setters!();
    /// Limits with the given height, all points wanted, no deadline and no
    /// cancellation flag.
    ///
    /// ```
    /// use twofold::search::SearchLimits;
    /// assert!(!SearchLimits::new(50).first_only);
    /// ```
    pub fn new(height: u64) -> SearchLimits {
        SearchLimits { height, ..SearchLimits::default() }
    }

    /// Limits with the given height, all points wanted, within the deadline
    /// and cancellation flag of `work`.
    ///
    /// ```
    /// use twofold::{search::SearchLimits, Work};
    /// assert_eq!(SearchLimits::within(&Work::unlimited(), 50).height, 50);
    /// ```
    pub fn within(work: &crate::budget::Work, height: u64) -> SearchLimits {
        SearchLimits { height, deadline: work.deadline(), cancel: work.cancel_flag().cloned(), first_only: false }
    }
}

/// A point `(x : z : y)` on `y^2 = g(x, z)` with coprime integers `x`, `z`,
/// `z >= 0` (and `x = 1` when `z = 0`) and `y >= 0`; `(x, z, -y)` is then a
/// point as well.
///
/// ```
/// use malachite::Integer;
/// use twofold::search::QuarticPoint;
/// let p = QuarticPoint { x: Integer::from(1), z: Integer::from(2), y: Integer::from(3) };
/// assert_eq!(p.y, 3);
/// ```
#[derive(Clone, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct QuarticPoint {
    /// The first coordinate.
    pub x: Integer,
    /// The second coordinate, non-negative.
    pub z: Integer,
    /// The square root of `g(x, z)`, non-negative.
    pub y: Integer,
}

/// The result of a point search.
///
/// ```
/// use malachite::Integer;
/// use twofold::search::{search_quartic, SearchLimits};
/// // y^2 = x^4 + z^4 (Fermat: only the trivial points (1:0:1), (0:1:1)).
/// let g = [1, 0, 0, 0, 1].map(Integer::from);
/// let out = search_quartic(&g, &SearchLimits::new(40));
/// assert!(out.complete);
/// assert_eq!(out.height_reached, 40);
/// assert_eq!(out.points.len(), 2);
/// assert_eq!(out.candidates_tested, 1 + 40 * 81);
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub struct SearchOutcome<P> {
    /// The points found, sorted by height and then by coordinates.
    pub points: Vec<P>,
    /// True when the whole height range was searched; false when the search
    /// stopped early (deadline, cancellation, `first_only` after a point, or
    /// a clamped height).
    pub complete: bool,
    /// Every pair of height at most this was searched.
    pub height_reached: u64,
    /// The number of pairs `(x, z)` (or `(m, k)`) covered, counting those the
    /// sieve discarded; the same for the sieve and the naive search. For
    /// plane cubics: the lattice points (or, in the plain search, the
    /// triples) tested.
    pub candidates_tested: u64,
}

/// The height actually searched and whether it was clamped.
fn clamp_height(h: u64) -> (u64, bool) {
    if h > sieve::MAX_HEIGHT {
        (sieve::MAX_HEIGHT, true)
    } else {
        (h, false)
    }
}
