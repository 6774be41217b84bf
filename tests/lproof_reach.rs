//! How far the proven functional-equation test of `lproof::prove_root_number`
//! reaches with a caller's deadline: one timed run per size, behind
//! `#[ignore]` (minutes; run one at a time, under `nice`, so that the peak
//! resident memory printed belongs to that run alone):
//! `cargo test --release --all-features --test lproof_reach -- --ignored --nocapture reach_1e14`.
//! The curves are y^2 = x^3 + 2x + k (additive and wild at 2, so no local
//! formula decides their sign). Each run asserts its outcome: at 10^13 and
//! 10^14 a complete test that separates the signs within the 900 s
//! deadline; at 10^15 a refusal of kind `TooLarge` (the table limit). The
//! outside check on the signs themselves is Monsky's theorem (Monsky,
//! Math. Z. 221, 1996), w = (-1)^(dim Sel^2 - dim E(Q)[2]), in
//! tests/rootno_parity.rs, where the descent finishes.

use std::time::{Duration, Instant};
use twofold::arith::FactorLimits;
use twofold::lproof::prove_root_number;
use twofold::lproof::RootNumberProof;
use twofold::{Curve, CurveData, Error, ErrorKind, Work};

/// The peak resident memory of this process in kB (Linux), or 0.
fn peak_rss_kb() -> u64 {
    std::fs::read_to_string("/proc/self/status")
        .ok()
        .and_then(|s| s.lines().find(|l| l.starts_with("VmHWM:")).and_then(|l| l.split_whitespace().nth(1)?.parse().ok()))
        .unwrap_or(0)
}

/// Times the test on the first y^2 = x^3 + 2x + k, k odd from about
/// sqrt(target / 216), whose conductor lies within a factor 2 of `target`.
fn timed(target: f64) -> Result<RootNumberProof, Error> {
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
    match &r {
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
    r
}

/// The test finished and separated the signs.
fn assert_decided(r: Result<RootNumberProof, Error>) {
    let p = r.unwrap_or_else(|e| panic!("{e}"));
    assert!(p.complete && p.sign.is_some(), "{p:?}");
}

#[test]
#[ignore]
fn reach_1e13() {
    assert_decided(timed(1e13));
}

#[test]
#[ignore]
fn reach_1e14() {
    assert_decided(timed(1e14));
}

#[test]
#[ignore]
fn reach_1e15() {
    let err = timed(1e15).expect_err("refused above the table limit");
    assert_eq!(*err.kind(), ErrorKind::TooLarge, "{err}");
}
