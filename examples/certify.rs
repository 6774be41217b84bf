//! Writes and checks rank certificates.
//!
//!     cargo run --release --example certify -- 0 0 1 -1 0        # one curve: the certificate text and the check
//!     cargo run --release --example certify -- tests/data/curves-small-conductor.tsv   # a table: one line per curve
//!
//! A table is tab-separated with a `#` header naming the columns a1 .. a6.
//! Every curve gets a wall-clock budget of 30 s (a curve that needs more
//! gets the certificate of what was proven in time).

use std::time::Instant;
use twofold::certificate::{verify, Certificate};
use twofold::{analyse, Curve, RankOptions};

fn certify(a: [i64; 5]) -> Result<(Certificate, String), String> {
    let e = Curve::from_coefficients(a).map_err(|e| e.to_string())?;
    let opts = RankOptions::default().with_time_limit(std::time::Duration::from_secs(30));
    let r = analyse(&e, &opts).map_err(|e| e.to_string())?;
    let c = Certificate::from_report(&r).map_err(|e| e.to_string())?;
    let t = Instant::now();
    let v = verify(&c).map_err(|e| e.to_string())?;
    let upper = v.upper_bound.map(|u| u.to_string()).unwrap_or_else(|| "?".into());
    let summary = format!(
        "verified {} <= rank <= {upper}; {} local points, {} insolubility proofs; trusted: {}; {} us",
        v.lower_bound,
        v.local_points_checked,
        v.insolubility_proved,
        if v.trusted.is_empty() { "nothing".to_string() } else { v.trusted.join(" | ") },
        t.elapsed().as_micros()
    );
    Ok((c, summary))
}

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    if args.len() == 5 {
        let a: Vec<i64> = args.iter().map(|s| s.parse().expect("integer a-invariants")).collect();
        match certify([a[0], a[1], a[2], a[3], a[4]]) {
            Ok((c, s)) => println!("{}{s}", c.to_text()),
            Err(e) => println!("error: {e}"),
        }
        return;
    }
    let Some(path) = args.first() else {
        eprintln!("usage: certify a1 a2 a3 a4 a6 | certify TABLE.tsv");
        std::process::exit(2);
    };
    let text = std::fs::read_to_string(path).expect("readable table");
    let mut header: Vec<String> = vec![];
    for line in text.lines() {
        if let Some(h) = line.strip_prefix('#') {
            header = h.split('\t').map(|s| s.trim().to_string()).collect();
            continue;
        }
        if line.trim().is_empty() {
            continue;
        }
        let f: Vec<&str> = line.split('\t').collect();
        let get = |k: &str| header.iter().position(|h| h == k).and_then(|i| f.get(i)?.parse::<i64>().ok());
        let Some(a) = ["a1", "a2", "a3", "a4", "a6"].map(get).into_iter().collect::<Option<Vec<i64>>>() else { continue };
        match certify([a[0], a[1], a[2], a[3], a[4]]) {
            Ok((_, s)) => println!("{a:?} {s}"),
            Err(e) => println!("{a:?} error: {e}"),
        }
    }
}
