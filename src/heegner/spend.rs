//! The Heegner step's budget: the caller's [`Work`] (a wall-clock deadline
//! and a cancel flag) together with a cap on the **CPU time of the running
//! thread**.
//!
//! Why CPU time: the Heegner step is one thread of pure computation, and
//! its own cap (20 s by default in the pipeline) decides whether a curve
//! gets its generator. Counted in wall time, the same curve got its point
//! on a quiet machine and none under a load average of 8 (the step then
//! had 3-5 s of CPU in its 20 s). Counted in thread CPU time, the result
//! of the step no longer depends on the load; the caller's overall budget
//! still binds in wall time through the [`Work`] deadline.
//!
//! The thread clock is read through the `cpu-time` crate (a safe wrapper of
//! `clock_gettime(CLOCK_THREAD_CPUTIME_ID)` and its equivalents), so
//! twofold keeps no `unsafe` code. Where that clock cannot be read the cap
//! falls back to wall time from the start of the step.

use crate::budget::{CpuClock, Work};
use std::time::Duration;

/// What the long loops of the Heegner step ask before each block of work.
pub(crate) trait Halt {
    /// Whether to stop now.
    fn exhausted(&self) -> bool;
}

impl Halt for Work {
    fn exhausted(&self) -> bool {
        Work::exhausted(self)
    }
}

/// The wall-clock [`Work`] of the caller and the CPU-time cap of the step.
///
/// Not `Send`: the CPU clock belongs to the thread that made the budget,
/// and the Heegner step runs on that thread only.
pub(crate) struct Spend {
    work: Work,
    cap: Option<(CpuClock, Duration)>,
}

impl Spend {
    /// `work` with a cap of `cpu_limit` on the CPU time of this thread from now.
    pub(crate) fn new(work: Work, cpu_limit: Option<Duration>) -> Spend {
        Spend { work, cap: cpu_limit.map(|l| (CpuClock::now(), l)) }
    }

    /// The caller's work (for the stages outside this module, which honour
    /// its wall-clock deadline and cancel flag).
    pub(crate) fn work(&self) -> &Work {
        &self.work
    }

    /// Whether the CPU cap (not the caller's deadline) has been reached.
    pub(crate) fn cap_reached(&self) -> bool {
        self.cap.as_ref().is_some_and(|(c, l)| c.spent() >= *l)
    }
}

impl Halt for Spend {
    fn exhausted(&self) -> bool {
        self.work.exhausted() || self.cap_reached()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::time::Instant;

    #[test]
    fn sleeping_spends_no_cpu_time() {
        // a thread that sleeps uses no CPU time: the cap is not reached
        // after a 50 ms sleep with a 40 ms cap, but a wall deadline is
        let s = Spend::new(Work::unlimited(), Some(Duration::from_millis(40)));
        std::thread::sleep(Duration::from_millis(50));
        assert!(!s.exhausted());
        let w = Work::until(Some(Instant::now()), None);
        std::thread::sleep(Duration::from_millis(1));
        assert!(Spend::new(w, Some(Duration::from_secs(10))).exhausted());
    }

    #[test]
    fn computing_reaches_the_cap() {
        let s = Spend::new(Work::unlimited(), Some(Duration::from_millis(20)));
        let mut x = 1u64;
        let t = Instant::now();
        while !s.exhausted() {
            for i in 0..10_000u64 {
                x = x.wrapping_mul(6364136223846793005).wrapping_add(i);
            }
            assert!(t.elapsed() < Duration::from_secs(30), "the cap was never reached");
        }
        assert!(x != 0 || x == 0);
        assert!(s.cap_reached());
    }
}
