//! Batch runs: many curves through [`analyse`], on several threads, with
//! results in input order, progress reports and prompt cancellation.
//!
//! Every curve gets its own budget (`RankOptions::time_limit` applies per
//! curve) and its own result: a curve that cannot be parsed, whose
//! discriminant cannot be factored, or whose computation fails an internal
//! check gives an `Err` item and the batch goes on. The results do not
//! depend on the number of threads (only `elapsed`, and `budget_exhausted`
//! under a time limit, can change from run to run).
//!
//! ```
//! use twofold::batch::{analyse_batch, BatchOptions};
//! // y^2 + y = x^3 - x^2 - 10x - 20, y^2 + y = x^3 - x and y^2 + y = x^3 + x^2 - 2x (Cremona 1997, Table 1: ranks 0, 1, 2), one bad line
//! let lines = ["[0,-1,1,-10,-20]", "y^2 + y = x^3 - x", "[0,1,1,-2,0]", "[0,0,0,0,0]"];
//! let run = analyse_batch(lines, &BatchOptions::default().with_threads(2));
//! let ranks: Vec<_> = run.items.iter().map(|i| i.result.as_ref().ok().and_then(|r| r.rank())).collect();
//! assert_eq!(ranks, vec![Some(0), Some(1), Some(2), None]);
//! assert!(run.items[3].result.is_err()); // singular: an error item, not a stopped batch
//! assert_eq!((run.summary.done, run.summary.proven, run.summary.errors), (4, 3, 1));
//! ```

use crate::budget::RankOptions;
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use crate::pipeline::analyse;
use crate::report::RankReport;
use std::collections::BTreeMap;
use std::panic::{catch_unwind, AssertUnwindSafe};
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use std::time::{Duration, Instant};

/// One input of a batch: a curve, or a line of text to parse (so that a
/// line that cannot be read becomes an error item of its own).
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum CurveInput {
    /// A curve already built (boxed: a curve is much larger than a line).
    Curve(Box<Curve>),
    /// Text in any form [`Curve::parse_scaled`] accepts: `[a1,a2,a3,a4,a6]`,
    /// `[a4,a6]` or an equation, possibly with rational coefficients.
    Text(String),
}

impl From<Curve> for CurveInput {
    fn from(c: Curve) -> Self {
        CurveInput::Curve(Box::new(c))
    }
}
impl From<&Curve> for CurveInput {
    fn from(c: &Curve) -> Self {
        CurveInput::Curve(Box::new(c.clone()))
    }
}
impl From<String> for CurveInput {
    fn from(s: String) -> Self {
        CurveInput::Text(s)
    }
}
impl From<&str> for CurveInput {
    fn from(s: &str) -> Self {
        CurveInput::Text(s.to_string())
    }
}
impl From<&String> for CurveInput {
    fn from(s: &String) -> Self {
        CurveInput::Text(s.clone())
    }
}

impl CurveInput {
    /// The text shown for this input: the line itself, or `[a1,...,a6]`.
    pub fn label(&self) -> String {
        match self {
            CurveInput::Text(t) => t.clone(),
            CurveInput::Curve(c) => {
                let a: Vec<String> = c.coefficients().iter().map(|x| x.to_string()).collect();
                format!("[{}]", a.join(","))
            }
        }
    }
}

/// Parses `text` (rational models are scaled to integral ones), analyses
/// the curve, and maps the reported points back to the model as written.
///
/// ```
/// use twofold::batch::analyse_text;
/// use twofold::RankOptions;
/// // y^2 = x^3 - x/16 is y^2 = x^3 - x scaled by u = 2: rank 0 (conductor 32, Cremona 1997, Table 1)
/// let r = analyse_text("y^2 = x^3 - 1/16*x", &RankOptions::default()).unwrap();
/// assert_eq!(r.rank(), Some(0));
/// assert!(analyse_text("y^2 = x^3", &RankOptions::default()).is_err());
/// ```
pub fn analyse_text(text: &str, options: &RankOptions) -> Result<RankReport, Error> {
    let (c, ch) = Curve::parse_scaled(text)?;
    let mut r = analyse(&c, options)?;
    if !ch.is_identity() {
        let back = |p: &Point| match p {
            Point::Infinity => Point::Infinity,
            Point::Affine(x, y) => {
                let (x, y) = ch.unmap_point(&(x.clone(), y.clone()));
                Point::Affine(x, y)
            }
        };
        r.points = r.points.iter().map(back).collect();
        r.torsion_points = r.torsion_points.iter().map(back).collect();
    }
    Ok(r)
}

fn run_one(input: &CurveInput, options: &RankOptions) -> Result<RankReport, Error> {
    // analyse returns typed errors; a panic would be a bug, and is turned
    // into an error item so that the rest of the batch still runs
    let r = catch_unwind(AssertUnwindSafe(|| match input {
        CurveInput::Curve(c) => analyse(c, options),
        CurveInput::Text(t) => analyse_text(t, options),
    }));
    r.unwrap_or_else(|_| {
        Err(Error::new(ErrorKind::InvalidValue, "internal error: the computation on this curve panicked"))
    })
}

/// The result for one input of a batch.
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct BatchItem {
    /// Position in the input (0-based).
    pub index: usize,
    /// The input as text (see [`CurveInput::label`]).
    pub label: String,
    /// The report, or why there is none.
    pub result: Result<RankReport, Error>,
}

impl BatchItem {
    /// Whether the rank was proven (lower and upper bounds meet).
    pub fn proven(&self) -> bool {
        matches!(&self.result, Ok(r) if r.rank().is_some())
    }
}

/// Counts reported while a batch runs (in completion order).
#[derive(Clone, Debug, Default, PartialEq, Eq)]
#[non_exhaustive]
pub struct BatchProgress {
    /// Curves finished so far (including errors).
    pub done: usize,
    /// Curves whose rank was proven.
    pub proven: usize,
    /// Inputs that gave an error.
    pub errors: usize,
    /// The number of inputs, when known in advance (from the iterator's size hint).
    pub total: Option<usize>,
    /// Wall-clock time since the batch started.
    pub elapsed: Duration,
}

/// An observer of a running batch, called on the thread that started the
/// batch, once after every finished curve. Closures `Fn(&BatchProgress)`
/// are observers.
///
/// ```
/// use std::sync::{Arc, Mutex};
/// use twofold::batch::{analyse_batch, BatchOptions, BatchProgress};
/// let seen = Arc::new(Mutex::new(Vec::new()));
/// let s = seen.clone();
/// let opts = BatchOptions::default().with_observer(move |p: &BatchProgress| s.lock().unwrap().push(p.done));
/// analyse_batch(["[0,0,1,-1,0]", "[0,-1,1,-10,-20]"], &opts);
/// assert_eq!(*seen.lock().unwrap(), vec![1, 2]);
/// ```
pub trait BatchObserver: Send + Sync {
    /// Called after each finished curve, with the counts so far.
    fn progress(&self, progress: &BatchProgress);
    /// Called once when the batch ends (finished or cancelled).
    fn finished(&self, _summary: &BatchSummary) {}
}

impl<F: Fn(&BatchProgress) + Send + Sync> BatchObserver for F {
    fn progress(&self, progress: &BatchProgress) {
        self(progress)
    }
}

/// Options of a batch run.
///
/// ```
/// use std::time::Duration;
/// use twofold::batch::BatchOptions;
/// use twofold::RankOptions;
/// let o = BatchOptions::new(RankOptions::default().with_time_limit(Duration::from_secs(10))).with_threads(4);
/// assert_eq!(o.threads, 4);
/// ```
#[derive(Clone, Default)]
#[non_exhaustive]
pub struct BatchOptions {
    /// The options for every curve. Its `time_limit` applies to each curve
    /// separately; its `cancel` flag, when set, cancels the whole batch:
    /// running curves stop promptly (their reports keep what was proven and
    /// say `budget_exhausted`), and no further curve starts. Its per-stage
    /// `progress` callback, if any, is called from the worker threads.
    pub rank: RankOptions,
    /// Worker threads; `0` means one per available core, at most
    /// [`MAX_THREADS`]. Without the `parallel` feature the batch always runs
    /// on the calling thread. When the system refuses to start a thread the
    /// batch runs on those it has (on the calling thread if none started).
    pub threads: usize,
    /// Called after every finished curve.
    pub observer: Option<Arc<dyn BatchObserver>>,
}

impl std::fmt::Debug for BatchOptions {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("BatchOptions")
            .field("rank", &self.rank)
            .field("threads", &self.threads)
            .field("observer", &self.observer.is_some())
            .finish()
    }
}

impl BatchOptions {
    /// A batch with these per-curve options, one thread per core.
    pub fn new(rank: RankOptions) -> Self {
        BatchOptions { rank, threads: 0, observer: None }
    }
    /// Sets the number of worker threads (`0`: one per core).
    pub fn with_threads(mut self, n: usize) -> Self {
        self.threads = n;
        self
    }
    /// Sets the progress observer.
    pub fn with_observer(mut self, o: impl BatchObserver + 'static) -> Self {
        self.observer = Some(Arc::new(o));
        self
    }
    /// Sets the batch-wide cancellation flag (stored in `rank.cancel`).
    pub fn with_cancel(mut self, flag: Arc<AtomicBool>) -> Self {
        self.rank.cancel = Some(flag);
        self
    }
    /// The number of threads a run will use.
    pub fn effective_threads(&self) -> usize {
        if !cfg!(feature = "parallel") {
            return 1;
        }
        match self.threads {
            0 => std::thread::available_parallelism().map(|n| n.get()).unwrap_or(1),
            n => n.min(MAX_THREADS),
        }
    }
}

/// The most worker threads a batch starts, whatever [`BatchOptions::threads`] says.
pub const MAX_THREADS: usize = 1024;

/// What a batch did, in totals.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct BatchSummary {
    /// Curves finished (including errors).
    pub done: usize,
    /// Curves whose rank was proven.
    pub proven: usize,
    /// Curves analysed whose bounds do not meet (or are missing).
    pub open: usize,
    /// Sum over analysed curves of `upper - lower` where both bounds exist.
    pub open_gap: usize,
    /// Curves with no upper bound at all.
    pub no_upper_bound: usize,
    /// Inputs that gave an error.
    pub errors: usize,
    /// Reports with `budget_exhausted` set: the time budget ran out, or a
    /// point search or the quartic enumeration stopped at its cap (their
    /// bounds are what was proven before).
    pub budget_exhausted: usize,
    /// Whether the batch was cancelled before every input was run.
    pub cancelled: bool,
    /// Threads used.
    pub threads: usize,
    /// Wall-clock time of the whole batch.
    pub elapsed: Duration,
}

impl std::fmt::Display for BatchSummary {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(
            f,
            "{} curves: {} proven, {} open (total gap {}, {} without upper bound), {} errors, {} with a search or enumeration cut short; {:.1} s on {} thread(s){}",
            self.done,
            self.proven,
            self.open,
            self.open_gap,
            self.no_upper_bound,
            self.errors,
            self.budget_exhausted,
            self.elapsed.as_secs_f64(),
            self.threads,
            if self.cancelled { "; cancelled" } else { "" }
        )
    }
}

/// The items of a finished batch (in input order) and its summary.
#[derive(Clone, Debug, PartialEq)]
#[non_exhaustive]
pub struct BatchOutcome {
    /// One item per input that ran, in input order. After a cancellation,
    /// inputs that never started are missing (compare `index`).
    pub items: Vec<BatchItem>,
    /// Totals.
    pub summary: BatchSummary,
}

/// Runs every input through [`analyse`] and collects the items in input
/// order (see the [module documentation](self)).
pub fn analyse_batch<I>(inputs: I, options: &BatchOptions) -> BatchOutcome
where
    I: IntoIterator,
    I::Item: Into<CurveInput> + Send,
{
    let mut items = Vec::new();
    let summary = analyse_batch_with(inputs, options, |it| items.push(it));
    BatchOutcome { items, summary }
}

/// Runs every input through [`analyse`], handing each item to `sink` on the
/// calling thread as soon as it and every earlier item are finished, so
/// `sink` sees the items in input order (for streaming output). Inputs are
/// read from the iterator lazily, a few per thread ahead of the slowest
/// running curve.
///
/// ```
/// use twofold::batch::{analyse_batch_with, BatchOptions};
/// let mut order = Vec::new();
/// let s = analyse_batch_with(["[0,0,1,-1,0]", "[0,0,0,-36,0]"], &BatchOptions::default(), |item| order.push(item.index));
/// assert_eq!(order, vec![0, 1]);
/// assert_eq!(s.proven, 2);
/// ```
pub fn analyse_batch_with<I, F>(inputs: I, options: &BatchOptions, mut sink: F) -> BatchSummary
where
    I: IntoIterator,
    I::Item: Into<CurveInput> + Send,
    F: FnMut(BatchItem),
{
    let start = Instant::now();
    let threads = options.effective_threads().max(1);
    let cancel = options.rank.cancel.clone();
    let cancelled = || cancel.as_ref().is_some_and(|c| c.load(Ordering::Relaxed));
    let mut iter = inputs.into_iter();
    let total = match iter.size_hint() {
        (lo, Some(hi)) if lo == hi => Some(lo),
        _ => None,
    };
    let mut summary = BatchSummary { threads, ..Default::default() };
    let mut progress = BatchProgress { total, ..Default::default() };
    let note = |item: &BatchItem, summary: &mut BatchSummary, progress: &mut BatchProgress| {
        tally(summary, item);
        progress.done = summary.done;
        progress.proven = summary.proven;
        progress.errors = summary.errors;
        progress.elapsed = start.elapsed();
        if let Some(o) = &options.observer {
            o.progress(progress);
        }
    };
    if threads == 1 {
        for (index, x) in iter.by_ref().enumerate() {
            if cancelled() {
                summary.cancelled = true;
                break;
            }
            let input: CurveInput = x.into();
            let item = BatchItem { index, label: input.label(), result: run_one(&input, &options.rank) };
            note(&item, &mut summary, &mut progress);
            sink(item);
        }
    } else {
        let mut was_cancelled = false;
        run_parallel(
            &mut iter,
            options,
            threads,
            &cancelled,
            |item| {
                note(&item, &mut summary, &mut progress);
                item
            },
            &mut sink,
            &mut was_cancelled,
        );
        summary.cancelled = was_cancelled;
    }
    summary.elapsed = start.elapsed();
    if let Some(o) = &options.observer {
        o.finished(&summary);
    }
    summary
}

fn tally(s: &mut BatchSummary, item: &BatchItem) {
    s.done += 1;
    match &item.result {
        Err(_) => s.errors += 1,
        Ok(r) => {
            if r.budget_exhausted {
                s.budget_exhausted += 1;
            }
            if r.rank().is_some() {
                s.proven += 1;
            } else {
                s.open += 1;
                match (r.rank_lower, r.rank_upper) {
                    (Some(l), Some(u)) => s.open_gap += u.saturating_sub(l),
                    (_, None) => s.no_upper_bound += 1,
                    _ => {}
                }
            }
        }
    }
}

/// Work distribution: the calling thread reads inputs, hands them to the
/// workers over a channel (at most `window` in flight), receives the
/// results, and releases them to `sink` in input order.
fn run_parallel<It, F, G>(
    iter: &mut It,
    options: &BatchOptions,
    threads: usize,
    cancelled: &dyn Fn() -> bool,
    mut on_done: G,
    sink: &mut F,
    was_cancelled: &mut bool,
) where
    It: Iterator,
    It::Item: Into<CurveInput> + Send,
    F: FnMut(BatchItem),
    G: FnMut(BatchItem) -> BatchItem,
{
    use std::sync::mpsc;
    use std::sync::Mutex;
    let window = threads * 256;
    let (work_tx, work_rx) = mpsc::channel::<(usize, It::Item)>();
    let work_rx = Mutex::new(work_rx);
    // None: the input was skipped because the batch was cancelled first
    let (done_tx, done_rx) = mpsc::channel::<(usize, Option<BatchItem>)>();
    let rank = &options.rank;
    std::thread::scope(|scope| {
        let mut started = 0usize;
        for _ in 0..threads {
            let done_tx = done_tx.clone();
            let work_rx = &work_rx;
            let spawned = std::thread::Builder::new().spawn_scoped(scope, move || loop {
                let next = match work_rx.lock() {
                    Ok(rx) => rx.recv(),
                    Err(_) => return,
                };
                let Ok((index, x)) = next else { return };
                let skip = rank.cancel.as_ref().is_some_and(|c| c.load(Ordering::Relaxed));
                let item = if skip {
                    None
                } else {
                    let input: CurveInput = x.into();
                    Some(BatchItem { index, label: input.label(), result: run_one(&input, rank) })
                };
                if done_tx.send((index, item)).is_err() {
                    return;
                }
            });
            match spawned {
                Ok(_) => started += 1,
                // the system refuses more threads: run on those started
                Err(_) => break,
            }
        }
        drop(done_tx);
        if started == 0 {
            // no worker at all: the calling thread runs the batch in order
            for (index, x) in iter.by_ref().enumerate() {
                if cancelled() {
                    *was_cancelled = true;
                    break;
                }
                let input: CurveInput = x.into();
                let item = BatchItem { index, label: input.label(), result: run_one(&input, rank) };
                sink(on_done(item));
            }
            return;
        }
        let mut next_index = 0usize; // next input to hand out
        let mut next_out = 0usize; // next index to release
        let mut exhausted = false;
        let mut ready: BTreeMap<usize, Option<BatchItem>> = BTreeMap::new();
        loop {
            while !exhausted && next_index - next_out < window {
                if cancelled() {
                    *was_cancelled = true;
                    exhausted = true;
                    break;
                }
                match iter.next() {
                    Some(x) => {
                        if work_tx.send((next_index, x)).is_err() {
                            exhausted = true;
                            break;
                        }
                        next_index += 1;
                    }
                    None => exhausted = true,
                }
            }
            if next_out == next_index && exhausted {
                break;
            }
            let Ok((index, item)) = done_rx.recv() else { break };
            let item = item.map(&mut on_done);
            if item.is_none() {
                *was_cancelled = true;
            }
            ready.insert(index, item);
            while let Some(item) = ready.remove(&next_out) {
                next_out += 1;
                if let Some(item) = item {
                    sink(item);
                }
            }
        }
        drop(work_tx);
    });
}
