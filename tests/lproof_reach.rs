//! How far the proven functional-equation test of `lproof::prove_root_number`
//! reaches with a caller's deadline: one timed run per size, behind
//! `#[ignore]` (minutes; run one at a time, under `nice`, so that the peak
//! resident memory printed belongs to that run alone):
//! `cargo test --release --all-features --test lproof_reach -- --ignored --nocapture reach_1e14`.
//! The curves are y^2 = x^3 + 2x + k (additive and wild at 2, so no local
//! formula decides their sign); the outside check on the sign is Monsky's
//! theorem (Monsky, Math. Z. 221, 1996): w = (-1)^(dim Sel^2 - dim E(Q)[2]),
//! with Sel^2 from this library's quartic descent, where it finishes.

use std::time::{Duration, Instant};
use twofold::arith::FactorLimits;
use twofold::lproof::prove_root_number;
use twofold::{Curve, CurveData, Work};

/// The peak resident memory of this process in kB (Linux), or 0.
fn peak_rss_kb() -> u64 {
    std::fs::read_to_string("/proc/self/status")
        .ok()
        .and_then(|s| s.lines().find(|l| l.starts_with("VmHWM:")).and_then(|l| l.split_whitespace().nth(1)?.parse().ok()))
        .unwrap_or(0)
}

/// Times the test on the first y^2 = x^3 + 2x + k, k odd from about
/// sqrt(target / 216), whose conductor lies within a factor 2 of `target`.
fn timed(target: f64) {
    let mut k = (target / 216.0).sqrt() as i64 | 1;
    let (e, data) = loop {
        let e = Curve::from_coefficients([0, 0, 0, 2, k]).unwrap();
        let data = CurveData::new(&e, &Work::unlimited()).unwrap();
        let n = data.conductor().to_string().parse::<f64>().unwrap();
        if n > target / 2.0 && n < target * 2.0 {
            break (e, data);
        }
        k += 2;
    };
    drop(e);
    let lim = FactorLimits::default().with_deadline(Instant::now() + Duration::from_secs(900));
    let start = Instant::now();
    let r = prove_root_number(data.minimal(), data.conductor(), &lim);
    let secs = start.elapsed().as_secs_f64();
    match r {
        Ok(p) => eprintln!(
            "k = {k}: conductor {}, sign {:?}, {} terms, complete {}, {secs:.1} s, peak RSS {} MB",
            data.conductor(),
            p.sign,
            p.terms,
            p.complete,
            peak_rss_kb() / 1024
        ),
        Err(err) => eprintln!("k = {k}: conductor {}: {err} after {secs:.1} s, peak RSS {} MB", data.conductor(), peak_rss_kb() / 1024),
    }
}

#[test]
#[ignore]
fn reach_1e13() {
    timed(1e13);
}

#[test]
#[ignore]
fn reach_1e14() {
    timed(1e14);
}

#[test]
#[ignore]
fn reach_1e15() {
    timed(1e15);
}
