//! Batch runs: the same results as one-curve runs, for any number of
//! threads, in input order; error items, progress, cancellation; and (with
//! the `serde` feature) JSON round trips of every report of the tables.
//!
//! Tables (tests/data, see tests/data/README.md): J. E. Cremona,
//! *Algorithms for Modular Elliptic Curves*, 2nd ed., CUP 1997, Table 1
//! (572 curves of conductor 11..162), and the same author's list of curves
//! with non-trivial Sha up to conductor 390. The batch results are checked
//! against the one-curve results (the published ranks themselves are checked
//! in tests/quartic_descent.rs and by the published-data check in CI).

mod common;

use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};
use twofold::batch::{analyse_batch, analyse_batch_with, BatchOptions, BatchProgress, CurveInput};
use twofold::{analyse, Curve, RankOptions, RankReport};

fn table_lines() -> Vec<String> {
    let mut rows = common::read_table("curves-small-conductor.tsv");
    rows.extend(common::read_table("curves-with-sha.tsv"));
    rows.iter()
        .map(|r| format!("[{}]", r.coefficients.map(|a| a.to_string()).join(",")))
        .collect()
}

/// The report without its wall-clock time (the only field that may differ
/// between runs without a time limit).
fn timeless(r: &RankReport) -> RankReport {
    let mut r = r.clone();
    r.elapsed = Duration::ZERO;
    r
}

/// The one heavy sweep (both tables through `analyse` three times, plus the
/// serde round trips): kept in one test so the tables are analysed once per
/// mode.
#[test]
fn tables_batch_equals_single_for_one_and_two_threads() {
    let lines = table_lines();
    let opts = RankOptions::default();
    let single: Vec<RankReport> = lines
        .iter()
        .map(|l| analyse(&Curve::parse(l).unwrap(), &opts).unwrap())
        .collect();
    for threads in [1, 2] {
        let run = analyse_batch(&lines, &BatchOptions::new(opts.clone()).with_threads(threads));
        assert_eq!(run.items.len(), lines.len());
        assert!(!run.summary.cancelled);
        assert_eq!(run.summary.errors, 0);
        assert_eq!(run.summary.done, lines.len());
        for (i, (item, one)) in run.items.iter().zip(&single).enumerate() {
            assert_eq!(item.index, i);
            assert_eq!(item.label, lines[i]);
            let r = item.result.as_ref().unwrap();
            // the fields a caller compares first, then the whole report
            assert_eq!((r.rank_lower, r.rank_upper), (one.rank_lower, one.rank_upper), "{}", lines[i]);
            assert_eq!(r.points, one.points, "{}", lines[i]);
            assert_eq!((r.two_selmer_dim, r.isogeny_selmer_dims), (one.two_selmer_dim, one.isogeny_selmer_dims), "{}", lines[i]);
            assert_eq!(timeless(r), timeless(one), "{} with {threads} threads", lines[i]);
        }
        let proven = single.iter().filter(|r| r.rank().is_some()).count();
        assert_eq!(run.summary.proven, proven);
    }
    #[cfg(feature = "serde")]
    for (l, r) in lines.iter().zip(&single) {
        let text = serde_json::to_string(r).unwrap();
        let back: RankReport = serde_json::from_str(&text).unwrap();
        assert_eq!(&back, r, "{l}: {text}");
        // integers and rationals are strings: no JSON number beyond the small counts
        let v: serde_json::Value = serde_json::from_str(&text).unwrap();
        assert!(v["conductor"].is_string() && v["minimal"][4].is_string(), "{l}");
    }
}

#[test]
fn bad_inputs_are_items_and_the_batch_goes_on() {
    let inputs: Vec<CurveInput> = vec![
        "[0,0,0,0,0]".into(),                                  // singular
        "not a curve".into(),                                  // unreadable
        Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap().into(),   // y^2 + y = x^3 - x, rank 1 (Cremona 1997, Table 1)
        "".into(),                                             // empty line
        "y^2 = x^3 - 36x".into(),                              // area-6 triangle curve, rank 1 (from memory: 6 is congruent)
    ];
    for threads in [1, 2] {
        let run = analyse_batch(inputs.clone(), &BatchOptions::default().with_threads(threads));
        let ok: Vec<bool> = run.items.iter().map(|i| i.result.is_ok()).collect();
        assert_eq!(ok, vec![false, false, true, false, true]);
        assert_eq!(run.items[2].label, "[0,0,1,-1,0]");
        assert_eq!(run.items[4].result.as_ref().unwrap().rank(), Some(1));
        assert_eq!((run.summary.done, run.summary.proven, run.summary.errors), (5, 2, 3));
    }
}

#[test]
fn progress_counts_every_curve_and_items_stream_in_order() {
    let lines: Vec<String> = table_lines().into_iter().take(40).collect();
    let seen = Arc::new(Mutex::new(Vec::<BatchProgress>::new()));
    let s = seen.clone();
    let opts = BatchOptions::default().with_threads(2).with_observer(move |p: &BatchProgress| s.lock().unwrap().push(p.clone()));
    let mut order = Vec::new();
    let summary = analyse_batch_with(&lines, &opts, |item| order.push(item.index));
    assert_eq!(order, (0..40).collect::<Vec<_>>());
    let seen = seen.lock().unwrap();
    assert_eq!(seen.iter().map(|p| p.done).collect::<Vec<_>>(), (1..=40).collect::<Vec<_>>());
    assert!(seen.iter().all(|p| p.total == Some(40)));
    assert_eq!(seen.last().unwrap().proven, summary.proven);
    assert!(seen.windows(2).all(|w| w[0].elapsed <= w[1].elapsed));
}

#[test]
fn cancellation_stops_promptly_and_keeps_what_finished() {
    // an endless supply of curves y^2 = x^3 + k: the batch must stop on the flag
    let flag = Arc::new(AtomicBool::new(false));
    let f = flag.clone();
    let count = Arc::new(AtomicUsize::new(0));
    let c = count.clone();
    let opts = BatchOptions::default()
        .with_threads(2)
        .with_cancel(flag.clone())
        .with_observer(move |p: &BatchProgress| {
            c.store(p.done, Ordering::SeqCst);
            if p.done >= 5 {
                f.store(true, Ordering::SeqCst);
            }
        });
    let inputs = (1i64..).map(|k| Curve::from_coefficients([0, 0, 0, 0, k]).unwrap());
    let t = Instant::now();
    let run = analyse_batch(inputs, &opts);
    assert!(t.elapsed() < Duration::from_secs(60));
    assert!(run.summary.cancelled);
    // a few more may finish while the flag propagates (more on a loaded
    // machine), but the batch stops long before the 512 inputs it reads ahead
    assert!(run.items.len() >= 5 && run.items.len() < 200, "{}", run.items.len());
    assert!(run.items.windows(2).all(|w| w[0].index < w[1].index));
    assert_eq!(run.items.len(), count.load(Ordering::SeqCst));
    // the first five are complete reports
    for it in &run.items[..5] {
        assert!(it.result.is_ok());
    }
}

#[test]
fn per_curve_budget_applies_to_each_curve() {
    // a zero budget: every curve stops at once with what it had (no proven
    // rank claimed), and the batch still reports every curve
    let opts = BatchOptions::new(RankOptions::default().with_time_limit(Duration::ZERO)).with_threads(2);
    let run = analyse_batch(["[0,0,1,-7,6]", "[0,0,0,-82,0]", "[0,-1,1,-10,-20]"], &opts);
    assert_eq!(run.items.len(), 3);
    for it in &run.items {
        match &it.result {
            Ok(r) => assert!(r.budget_exhausted),
            Err(e) => assert_eq!(e.kind(), &twofold::ErrorKind::FactorBudget),
        }
    }
}
