//! Time budgets, cancellation and progress reports shared by long computations.

use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use std::time::{Duration, Instant};

/// A stage of the computation, passed to progress callbacks.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub enum Stage {
    /// Factoring the discriminant and computing local data.
    LocalData,
    /// Computing the torsion subgroup.
    Torsion,
    /// Deciding local solubility of coverings.
    Solubility,
    /// Searching for rational points.
    Search,
    /// Assembling the report.
    Report,
}

/// A progress callback: receives the stage and a short description.
pub type ProgressFn = Arc<dyn Fn(Stage, &str) + Send + Sync>;

/// Options for a rank computation: search bound, budget, cancellation and
/// progress.
///
/// ```
/// use twofold::RankOptions;
/// use std::time::Duration;
/// let opts = RankOptions::default().with_search_height(200).with_time_limit(Duration::from_secs(5));
/// assert_eq!(opts.search_height, 200);
/// ```
#[derive(Clone)]
pub struct RankOptions {
    /// Height bound for point searches on coverings: coprime pairs with
    /// both coordinates at most this in absolute value.
    pub search_height: u64,
    /// Height bound for the direct search on the curve (numerators up to
    /// this, denominators up to its square root).
    pub curve_search_height: u64,
    /// Wall-clock limit for the whole computation on one curve.
    pub time_limit: Option<Duration>,
    /// Set to `true` from another thread to stop the computation promptly.
    pub cancel: Option<Arc<AtomicBool>>,
    /// Called at the start of each stage.
    pub progress: Option<ProgressFn>,
    /// Cap on the candidate triples the quartic enumeration may examine;
    /// beyond it the full descent gives no upper bound (reported as such).
    pub max_quartic_candidates: u64,
    /// Run the full 2-descent even when the 2-isogeny route has already
    /// proven the rank, as a cross-check of the two routes (slower).
    pub cross_check_routes: bool,
    /// The primes dividing the discriminant, for curves whose discriminant
    /// is too hard to factor: when given, twofold checks that each is a
    /// (probable) prime and that they account for the whole discriminant,
    /// instead of factoring it.
    pub known_primes: Option<Vec<malachite::Natural>>,
    /// Also compute the evidence beyond the rank bounds (root number,
    /// heights and saturation, real period, L-values, the Birch and
    /// Swinnerton-Dyer quotient): [`crate::RankReport::evidence`]. Default
    /// `true`; turn off for the fastest sweeps.
    pub evidence: bool,
    /// Also build the certificate of the rank proof (see
    /// [`crate::certificate`]) and keep its text form in
    /// [`crate::RankReport::certificate`]. Default `false` (it roughly
    /// doubles the time on small curves).
    pub certificate: bool,
}

impl Default for RankOptions {
    fn default() -> Self {
        RankOptions {
            search_height: 300,
            curve_search_height: 1000,
            time_limit: None,
            cancel: None,
            progress: None,
            max_quartic_candidates: 1_000_000_000,
            cross_check_routes: false,
            evidence: true,
            certificate: false,
            known_primes: None,
        }
    }
}

impl std::fmt::Debug for RankOptions {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("RankOptions")
            .field("search_height", &self.search_height)
            .field("curve_search_height", &self.curve_search_height)
            .field("time_limit", &self.time_limit)
            .field("cancel", &self.cancel.is_some())
            .field("progress", &self.progress.is_some())
            .finish()
    }
}

impl RankOptions {
    /// Sets the covering search height.
    pub fn with_search_height(mut self, h: u64) -> Self {
        self.search_height = h;
        self
    }
    /// Sets the wall-clock limit.
    pub fn with_time_limit(mut self, d: Duration) -> Self {
        self.time_limit = Some(d);
        self
    }
    /// Sets the cancellation flag.
    pub fn with_cancel(mut self, flag: Arc<AtomicBool>) -> Self {
        self.cancel = Some(flag);
        self
    }
    /// Sets the progress callback.
    pub fn with_progress(mut self, f: ProgressFn) -> Self {
        self.progress = Some(f);
        self
    }
}

/// A running budget: the deadline and cancellation flag of one computation.
#[derive(Clone, Debug)]
pub(crate) struct Budget {
    pub(crate) start: Instant,
    pub(crate) deadline: Option<Instant>,
    pub(crate) cancel: Option<Arc<AtomicBool>>,
}

impl Budget {
    pub(crate) fn from_options(o: &RankOptions) -> Budget {
        let start = Instant::now();
        // a limit beyond the clock's range (say `Duration::MAX`) is no limit
        Budget { start, deadline: o.time_limit.and_then(|d| start.checked_add(d)), cancel: o.cancel.clone() }
    }
    /// Whether the budget is spent or the work cancelled.
    pub(crate) fn exhausted(&self) -> bool {
        if let Some(c) = &self.cancel {
            if c.load(Ordering::Relaxed) {
                return true;
            }
        }
        matches!(self.deadline, Some(d) if Instant::now() >= d)
    }
    pub(crate) fn elapsed(&self) -> Duration {
        self.start.elapsed()
    }
}
