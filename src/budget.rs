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
    /// Finding the odd-degree isogeny class (to run the quartic descent
    /// where c4 is smallest).
    IsogenyClass,
    /// The analytic route: proven root number and L-value.
    Analytic,
    /// The Heegner point route for analytic rank one.
    Heegner,
    /// Root number, heights and saturation, periods, L-values.
    Evidence,
    /// Building the certificate of the rank proof.
    Certificate,
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
#[non_exhaustive]
pub struct RankOptions {
    /// Height bound for point searches on coverings: coprime pairs with
    /// both coordinates at most this in absolute value.
    pub search_height: u64,
    /// The highest height the covering searches are raised to, step by step
    /// (doubling from `search_height`), while the lower and upper bounds do
    /// not meet. The ladder stops below it when the next rung, predicted
    /// from the cost of the last one, would not fit in the ladder's share
    /// of the time left (half of it) or in `search_time_limit`. Set it to
    /// `search_height` for one fixed height. Default `2^20`.
    pub search_height_ceiling: u64,
    /// The most CPU time (of the thread running it) one ladder of raised
    /// searches may take, so that without a wall-clock limit the ladder
    /// still ends and with one the machine's load does not decide how high
    /// it goes; the floor rung always runs. Default 15 s (half of the
    /// `rank` example's default budget, so that on a quiet machine the
    /// ladder's wall-clock share and this cap end it at about the same
    /// rung).
    pub search_time_limit: Duration,
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
    /// Run the analytic route: the root number and `L(E,1)` or `L'(E,1)`
    /// proven by interval arithmetic; when the value is proven non-zero the
    /// rank is 0 or 1 by Gross-Zagier and Kolyvagin (see
    /// [`crate::lproof`]). Default `true`.
    pub analytic_route: bool,
    /// The largest conductor for which the analytic route runs (its cost
    /// grows like the square root of the conductor). Default `10^10`.
    pub analytic_max_conductor: u64,
    /// When the rank is proven to be 1 analytically and the descent's search
    /// found no point, compute one by the Heegner point method (see
    /// [`crate::heegner`]), within half of the time left. With analytic
    /// rank 1 proven, the descents first raise the search height within an
    /// eighth of `search_time_limit` only, and climb further towards
    /// `search_height_ceiling` only if the Heegner route finds nothing.
    /// Default `true`.
    pub heegner_route: bool,
    /// The most CPU time (of the thread running it) the Heegner route may
    /// take on one curve, so that the load of the machine does not decide
    /// the result; the curve's own limit, if any, still binds in wall time
    /// (the route gets at most three quarters of the time left). Default 20 s.
    pub heegner_time_limit: Duration,
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

/// The `with_deadline` / `with_cancel` builders of an option type with the
/// fields `deadline: Option<Instant>` and `cancel: Option<Arc<AtomicBool>>`
/// (`FactorLimits`, `SearchLimits`, `SaturationOptions`,
/// `ClassGroupOptions`, `quartic::SearchOptions`): one copy instead of five.
macro_rules! deadline_and_cancel_setters {
    () => {
        /// Sets the deadline.
        pub fn with_deadline(mut self, v: std::time::Instant) -> Self {
            self.deadline = Some(v);
            self
        }
        /// Sets the cancellation flag.
        pub fn with_cancel(mut self, v: std::sync::Arc<std::sync::atomic::AtomicBool>) -> Self {
            self.cancel = Some(v);
            self
        }
    };
}
pub(crate) use deadline_and_cancel_setters;

impl Default for RankOptions {
    fn default() -> Self {
        RankOptions {
            search_height: 300,
            search_height_ceiling: 1 << 20,
            search_time_limit: Duration::from_secs(15),
            curve_search_height: 1000,
            time_limit: None,
            cancel: None,
            progress: None,
            max_quartic_candidates: 1_000_000_000,
            cross_check_routes: false,
            analytic_route: true,
            analytic_max_conductor: 10_000_000_000,
            heegner_route: true,
            heegner_time_limit: Duration::from_secs(20),
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
            .field("search_height_ceiling", &self.search_height_ceiling)
            .field("search_time_limit", &self.search_time_limit)
            .field("curve_search_height", &self.curve_search_height)
            .field("time_limit", &self.time_limit)
            .field("cancel", &self.cancel.is_some())
            .field("progress", &self.progress.is_some())
            .finish()
    }
}

impl RankOptions {
    /// Sets the covering search height (the ceiling is raised to it if it
    /// was lower).
    pub fn with_search_height(mut self, h: u64) -> Self {
        self.search_height = h;
        self.search_height_ceiling = self.search_height_ceiling.max(h);
        self
    }
    /// Sets the ceiling of the adaptive covering search (see
    /// [`RankOptions::search_height_ceiling`]).
    pub fn with_search_height_ceiling(mut self, h: u64) -> Self {
        self.search_height_ceiling = h;
        self
    }
    /// Sets the most CPU time one ladder of raised searches may take (see
    /// [`RankOptions::search_time_limit`]).
    pub fn with_search_time_limit(mut self, d: Duration) -> Self {
        self.search_time_limit = d;
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
    /// Sets the height bound of the direct search on the curve.
    pub fn with_curve_search_height(mut self, v: u64) -> Self {
        self.curve_search_height = v;
        self
    }
    /// Sets the cap on the candidates of the quartic enumeration.
    pub fn with_max_quartic_candidates(mut self, v: u64) -> Self {
        self.max_quartic_candidates = v;
        self
    }
    /// Runs (or not) the full 2-descent as a cross-check of the 2-isogeny route.
    pub fn with_cross_check_routes(mut self, v: bool) -> Self {
        self.cross_check_routes = v;
        self
    }
    /// Gives the primes dividing the discriminant instead of factoring it (checked).
    pub fn with_known_primes(mut self, v: Vec<malachite::Natural>) -> Self {
        self.known_primes = Some(v);
        self
    }
    /// Runs (or not) the analytic route.
    pub fn with_analytic_route(mut self, v: bool) -> Self {
        self.analytic_route = v;
        self
    }
    /// Sets the largest conductor for the analytic route.
    pub fn with_analytic_max_conductor(mut self, v: u64) -> Self {
        self.analytic_max_conductor = v;
        self
    }
    /// Runs (or not) the Heegner point route.
    pub fn with_heegner_route(mut self, v: bool) -> Self {
        self.heegner_route = v;
        self
    }
    /// Sets the most CPU time the Heegner route may take on one curve.
    pub fn with_heegner_time_limit(mut self, v: Duration) -> Self {
        self.heegner_time_limit = v;
        self
    }
    /// Computes (or not) the evidence beyond the rank bounds.
    pub fn with_evidence(mut self, v: bool) -> Self {
        self.evidence = v;
        self
    }
    /// Builds (or not) the certificate of the rank proof.
    pub fn with_certificate(mut self, v: bool) -> Self {
        self.certificate = v;
        self
    }
}

/// The work of one analysis: when it started, when it must end, the flag
/// that cancels it and the callback that hears its progress. Built once from
/// [`RankOptions`] and passed down to every stage, which derives from it the
/// limits it needs ([`crate::arith::FactorLimits::within`],
/// [`crate::search::SearchLimits::within`],
/// [`crate::heights::SaturationOptions::within`]); a stage that finds it
/// [`exhausted`](Work::exhausted) stops and returns what it proved.
///
/// ```
/// use std::sync::{atomic::{AtomicBool, Ordering}, Arc};
/// use std::time::Duration;
/// use twofold::{RankOptions, Work};
/// let flag = Arc::new(AtomicBool::new(false));
/// let work = Work::new(&RankOptions::default().with_time_limit(Duration::from_secs(60)).with_cancel(flag.clone()));
/// assert!(!work.exhausted());
/// flag.store(true, Ordering::Relaxed);
/// assert!(work.exhausted());
/// assert!(!Work::unlimited().exhausted());
/// ```
#[derive(Clone)]
pub struct Work {
    start: Instant,
    deadline: Option<Instant>,
    cancel: Option<Arc<AtomicBool>>,
    progress: Option<ProgressFn>,
}

impl std::fmt::Debug for Work {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("Work")
            .field("elapsed", &self.start.elapsed())
            .field("remaining", &self.remaining())
            .field("cancel", &self.cancel.is_some())
            .field("progress", &self.progress.is_some())
            .finish()
    }
}

impl Work {
    /// The work described by `options`, starting now: its deadline is
    /// `options.time_limit` from now.
    pub fn new(options: &RankOptions) -> Work {
        let start = Instant::now();
        Work {
            start,
            deadline: options.time_limit.and_then(|d| start.checked_add(d)),
            cancel: options.cancel.clone(),
            progress: options.progress.clone(),
        }
    }
    /// Work without deadline, cancellation or progress.
    pub fn unlimited() -> Work {
        Work { start: Instant::now(), deadline: None, cancel: None, progress: None }
    }
    /// Work that ends at `deadline` (if any) or when `cancel` (if any) is set.
    pub fn until(deadline: Option<Instant>, cancel: Option<Arc<AtomicBool>>) -> Work {
        Work { start: Instant::now(), deadline, cancel, progress: None }
    }
    /// Whether the deadline has passed or the work was cancelled.
    pub fn exhausted(&self) -> bool {
        if let Some(c) = &self.cancel {
            if c.load(Ordering::Relaxed) {
                return true;
            }
        }
        matches!(self.deadline, Some(d) if Instant::now() >= d)
    }
    /// Time since the work started.
    pub fn elapsed(&self) -> Duration {
        self.start.elapsed()
    }
    /// Time left before the deadline (`None`: no deadline).
    pub fn remaining(&self) -> Option<Duration> {
        self.deadline.map(|d| d.saturating_duration_since(Instant::now()))
    }
    /// The deadline, if any.
    pub fn deadline(&self) -> Option<Instant> {
        self.deadline
    }
    /// The cancellation flag, if any.
    pub fn cancel_flag(&self) -> Option<&Arc<AtomicBool>> {
        self.cancel.as_ref()
    }
    /// Tells the progress callback (if any) that `stage` starts.
    pub fn report(&self, stage: Stage, message: &str) {
        if let Some(f) = &self.progress {
            f(stage, message)
        }
    }
    /// The same work ending at `end` if that comes before its own deadline.
    pub(crate) fn until_at_most(&self, end: Option<Instant>) -> Work {
        let mut w = self.clone();
        w.deadline = match (self.deadline, end) {
            (Some(d), Some(e)) => Some(d.min(e)),
            (d, e) => d.or(e),
        };
        w
    }
    /// The same work with its deadline moved earlier to `at most` the given
    /// share of the remaining time (for a stage that must leave time for
    /// the ones after it).
    pub fn share(&self, fraction: f64) -> Work {
        let mut w = self.clone();
        if let Some(left) = self.remaining() {
            let part = left.mul_f64(fraction.clamp(0.0, 1.0));
            w.deadline = Instant::now().checked_add(part).or(self.deadline);
        }
        w
    }
}

/// A reading of the CPU time of the running thread, or of the wall clock
/// where the thread clock cannot be read (through the `cpu-time` crate, a
/// safe wrapper of `clock_gettime(CLOCK_THREAD_CPUTIME_ID)`).
pub(crate) enum CpuClock {
    /// CPU time of the thread that took the reading.
    Thread(cpu_time::ThreadTime),
    /// Wall time, where the thread clock could not be read.
    Wall(Instant),
}

impl CpuClock {
    /// A reading taken now.
    pub(crate) fn now() -> CpuClock {
        match cpu_time::ThreadTime::try_now() {
            Ok(t) => CpuClock::Thread(t),
            Err(_) => CpuClock::Wall(Instant::now()),
        }
    }
    /// Time spent since the reading (a clock that fails after a first good
    /// reading counts as spent).
    pub(crate) fn spent(&self) -> Duration {
        match self {
            CpuClock::Thread(t) => t.try_elapsed().unwrap_or(Duration::MAX),
            CpuClock::Wall(t) => t.elapsed(),
        }
    }
}

/// The share of the time left when a ladder starts that its raised rungs
/// may take; the rest is for the stages after it (the other descents, the
/// Heegner step, heights and saturation).
pub(crate) const LADDER_SHARE: f64 = 0.5;

/// Growth of the cost of the quartic search per doubling of its height:
/// it covers the pairs `(x, z)` with `max(|x|, z) <= H`, about `H^2` of
/// them, each costing a few word operations in the sieve (measured on the
/// covering of y^2 = x^3 - 3901, see DEVELOPERS.md, "Issue 16 evidence").
pub(crate) const QUARTIC_GROWTH: f64 = 4.0;

/// Growth of the cost of the search on a Weierstrass curve per doubling of
/// its height: numerators up to `H`, denominators up to `sqrt H`, about
/// `H^{3/2}` pairs.
pub(crate) const CURVE_GROWTH: f64 = 2.83;

/// Why a ladder stopped climbing.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) enum LadderStop {
    /// Still climbing (or never asked).
    Open,
    /// The ceiling was reached.
    Ceiling,
    /// The next rung was predicted not to fit in the wall-clock share or
    /// the CPU cap.
    Budget,
}

/// The rungs of a point search raised by doubling its height: from a floor
/// (always searched) towards a ceiling, each next rung only when its cost,
/// predicted from the measured cost of the last rung times the growth of
/// the search per doubling, fits both in the ladder's share of the time
/// left ([`LADDER_SHARE`] of the work's remaining wall time when the ladder
/// starts) and in its CPU cap.
pub(crate) struct Ladder {
    height: u64,
    ceiling: u64,
    growth: f64,
    wall_end: Option<Instant>,
    cpu: CpuClock,
    cpu_cap: Duration,
    rung_start: Option<(Instant, Duration)>,
    last_cost: Option<(Duration, Duration)>,
    stop: LadderStop,
}

impl Ladder {
    /// A ladder from `floor` to `ceiling` (at least `floor`) whose search
    /// costs `growth` times more per doubling of the height, within `work`
    /// and a CPU cap of `cpu_cap` from now.
    pub(crate) fn new(floor: u64, ceiling: u64, growth: f64, work: &Work, cpu_cap: Duration) -> Ladder {
        let now = Instant::now();
        let wall_end = work.remaining().map(|left| now.checked_add(left.mul_f64(LADDER_SHARE)).unwrap_or(now));
        Ladder {
            height: floor,
            ceiling: ceiling.max(floor),
            growth,
            wall_end,
            cpu: CpuClock::now(),
            cpu_cap,
            rung_start: None,
            last_cost: None,
            stop: LadderStop::Open,
        }
    }
    /// The same ladder with `fraction` of its wall-clock share and of its
    /// CPU cap (for a search that a better one follows).
    pub(crate) fn scaled(mut self, fraction: f64) -> Ladder {
        let f = fraction.clamp(0.0, 1.0);
        let now = Instant::now();
        self.wall_end = self.wall_end.map(|e| now.checked_add(e.saturating_duration_since(now).mul_f64(f)).unwrap_or(now));
        self.cpu_cap = self.cpu_cap.mul_f64(f);
        self
    }
    /// The height of the current rung.
    pub(crate) fn height(&self) -> u64 {
        self.height
    }
    /// Why the ladder stopped.
    #[cfg(test)]
    pub(crate) fn stop(&self) -> LadderStop {
        self.stop
    }
    /// The work for the current rung: `work` itself for the floor, else
    /// `work` ending no later than the ladder's share (a rung the prediction
    /// let through but that runs long is stopped there).
    pub(crate) fn rung_work(&self, work: &Work) -> Work {
        if self.last_cost.is_none() {
            work.clone()
        } else {
            work.until_at_most(self.wall_end)
        }
    }
    /// Marks the start of the current rung's searches.
    pub(crate) fn start_rung(&mut self) {
        self.rung_start = Some((Instant::now(), self.cpu.spent()));
    }
    /// Marks the end of the current rung's searches (its cost is measured).
    pub(crate) fn end_rung(&mut self) {
        if let Some((wall, cpu)) = self.rung_start.take() {
            self.last_cost = Some((wall.elapsed(), self.cpu.spent().saturating_sub(cpu)));
        }
    }
    /// Moves to the next rung (twice the height, at most the ceiling) if its
    /// predicted cost fits; returns whether it did.
    pub(crate) fn climb(&mut self) -> bool {
        if self.height >= self.ceiling {
            self.stop = LadderStop::Ceiling;
            return false;
        }
        let next = self.height.saturating_mul(2).min(self.ceiling);
        let (wall, cpu) = self.last_cost.unwrap_or_default();
        // the cost of a rung from `h` to `next`: `growth` per doubling
        let factor = self.growth.powf((next as f64 / self.height.max(1) as f64).log2());
        let fits_wall = self.wall_end.is_none_or(|e| Instant::now().checked_add(wall.mul_f64(factor)).is_some_and(|t| t <= e));
        let fits_cpu = self.cpu.spent().saturating_add(cpu.mul_f64(factor)) <= self.cpu_cap;
        if !(fits_wall && fits_cpu) {
            self.stop = LadderStop::Budget;
            return false;
        }
        self.height = next;
        true
    }
}

/// The heights a search is run to, in turn: a fixed list, or a [`Ladder`].
pub(crate) enum Rungs<'a> {
    /// These heights, each in full (within the work).
    Fixed(&'a [u64]),
    /// The rungs of a ladder.
    Ladder(Ladder),
}

impl Rungs<'_> {
    /// The height of the current rung (`None`: no rung left).
    pub(crate) fn height(&self) -> Option<u64> {
        match self {
            Rungs::Fixed(hs) => hs.first().copied(),
            Rungs::Ladder(l) => Some(l.height()),
        }
    }
    /// The work for the current rung (see [`Ladder::rung_work`]).
    pub(crate) fn rung_work(&self, work: &Work) -> Work {
        match self {
            Rungs::Fixed(_) => work.clone(),
            Rungs::Ladder(l) => l.rung_work(work),
        }
    }
    /// Marks the start of the current rung.
    pub(crate) fn start_rung(&mut self) {
        if let Rungs::Ladder(l) = self {
            l.start_rung()
        }
    }
    /// Ends the current rung and moves to the next; returns whether there
    /// is one.
    pub(crate) fn advance(&mut self) -> bool {
        match self {
            Rungs::Fixed(hs) => {
                *hs = hs.get(1..).unwrap_or(&[]);
                !hs.is_empty()
            }
            Rungs::Ladder(l) => {
                l.end_rung();
                l.climb()
            }
        }
    }
}

#[cfg(test)]
mod ladder_tests {
    use super::*;

    /// Computes for `d` of this thread's CPU time (more wall time on a
    /// loaded machine).
    fn spin(d: Duration) {
        let t = CpuClock::now();
        let mut x = 1u64;
        while t.spent() < d {
            for i in 0..1000u64 {
                x = x.wrapping_mul(6364136223846793005).wrapping_add(i);
            }
        }
        assert!(x != 0 || x == 0);
    }

    #[test]
    fn the_ceiling_ends_a_cheap_ladder() {
        let mut l = Ladder::new(300, 4800, QUARTIC_GROWTH, &Work::unlimited(), Duration::from_secs(10));
        let mut heights = vec![l.height()];
        loop {
            l.start_rung();
            l.end_rung();
            if !l.climb() {
                break;
            }
            heights.push(l.height());
        }
        assert_eq!(heights, [300, 600, 1200, 2400, 4800]);
        assert_eq!(l.stop(), LadderStop::Ceiling);
    }

    #[test]
    fn the_predicted_cost_ends_a_dear_ladder() {
        // rungs of 20 ms and growth 4: the next would be 80 ms, more than
        // the CPU cap of 50 ms allows
        let mut l = Ladder::new(300, 1 << 20, QUARTIC_GROWTH, &Work::unlimited(), Duration::from_millis(50));
        l.start_rung();
        spin(Duration::from_millis(20));
        l.end_rung();
        assert!(!l.climb());
        assert_eq!((l.height(), l.stop()), (300, LadderStop::Budget));
        // and a wall-clock share of 0.5 s left by a 1 s work
        let work = Work::until(Instant::now().checked_add(Duration::from_secs(1)), None);
        let mut l = Ladder::new(300, 1 << 20, QUARTIC_GROWTH, &work, Duration::from_secs(100));
        l.start_rung();
        spin(Duration::from_millis(150));
        l.end_rung();
        assert!(!l.climb(), "a rung of 600 ms does not fit in the 350 ms left of the share");
        assert!(l.rung_work(&work).deadline() < work.deadline());
    }
}
