//! Budgets and cancellation reach every stage: a cancelled or timed-out
//! analysis returns promptly with what it proved (issue: one value for the
//! work). The curve [0,1,0,-106288797,-421808991201] (conductor 100068 as
//! computed here) has no rational 2-torsion and a large c4, so without a
//! budget its quartic descent runs for minutes.

use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use std::time::{Duration, Instant};
use twofold::{analyse, Curve, RankOptions};

fn slow_curve() -> Curve {
    Curve::from_coefficients([0i64, 1, 0, -106288797, -421808991201]).unwrap()
}

#[test]
fn cancel_flag_stops_the_analysis_promptly() {
    let flag = Arc::new(AtomicBool::new(false));
    let f = flag.clone();
    let setter = std::thread::spawn(move || {
        std::thread::sleep(Duration::from_millis(100));
        f.store(true, Ordering::Relaxed);
        Instant::now()
    });
    let opts = RankOptions::default().with_cancel(flag);
    let rep = analyse(&slow_curve(), &opts);
    let done = Instant::now();
    let cancelled_at = setter.join().unwrap();
    let late = done.saturating_duration_since(cancelled_at);
    assert!(late < Duration::from_millis(500), "returned {late:?} after the cancel flag was set");
    let rep = rep.expect("a cancelled analysis still reports what it proved");
    assert!(rep.budget_exhausted);
    assert!(rep.rank_lower.unwrap_or(0) <= rep.rank_upper.unwrap_or(usize::MAX));
}

#[test]
fn a_two_second_budget_is_held() {
    let t = Instant::now();
    let opts = RankOptions::default().with_time_limit(Duration::from_secs(2));
    let rep = analyse(&slow_curve(), &opts).unwrap();
    let took = t.elapsed();
    assert!(took < Duration::from_secs(3), "took {took:?} with a 2 s budget");
    assert!(rep.budget_exhausted);
    assert_eq!(rep.conductor.to_string(), "100068");
}
