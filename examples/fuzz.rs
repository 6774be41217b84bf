//! `fuzz`: the long-run driver of the fuzz harness (the checks are shared
//! with `tests/fuzz.rs`, in `tests/fuzz_common`).
//!
//! Usage:
//!   fuzz [--seed S] [--parser N] [--lines N] [--curves N] [--quartics N] [--quartic-digits D] [--numbers N]
//!        [--quartic-min-digits D0] [--gl2z-pairs N] [--degenerate N]
//!        [--rank-runs N] [--rank PATH] [--budget SECONDS] [--evidence 0|1]
//!
//! Runs N random cases of each kind (defaults: 10^6 parser texts, 2,000
//! batches of lines, 300 curves, 20,000 quartics, 3,000 numbers, 50 runs of
//! the `rank` binary when `--rank` is given or it sits next to this
//! program), prints the figures and every failure, and exits with status 1
//! when there was a failure. Curves grow from 1 to 30 digits over the run;
//! each is analysed under the budget (default 0.3 s) and again after a
//! random change of model (`--evidence 0` leaves out the evidence stage).
//! Quartics grow from D0 (default 1) to D digits (default 160);
//! `--gl2z-pairs` random quartics of D0 to D digits are compared with their
//! moved copies by unimodular matrices of 1 to 12 digits (`same_covering`
//! and `gl2z_decide` must say equivalent, the matrix must map one onto the
//! other), and `--degenerate` zero-discriminant, zero, 200-digit-plus and
//! leading-zero quartics go to every quartic function (no panic). The `rank`
//! runs feed random bytes (with lines that are not UTF-8) on standard input
//! and check one output line per input line.

#[path = "../tests/fuzz_common/mod.rs"]
mod fuzz_common;

use fuzz_common::*;
use std::io::Write;
use std::time::{Duration, Instant};

fn arg<T: std::str::FromStr>(args: &[String], name: &str, default: T) -> T {
    match args.iter().position(|a| a == name) {
        Some(k) => match args.get(k + 1).and_then(|v| v.parse().ok()) {
            Some(v) => v,
            None => {
                eprintln!("fuzz: {name} expects a value");
                std::process::exit(2)
            }
        },
        None => default,
    }
}

struct Tally {
    name: &'static str,
    cases: u64,
    failures: Vec<String>,
    time: Duration,
}

impl Tally {
    fn new(name: &'static str) -> Tally {
        Tally { name, cases: 0, failures: Vec::new(), time: Duration::ZERO }
    }
    fn record(&mut self, r: Result<(), String>) {
        self.cases += 1;
        if let Err(e) = r {
            eprintln!("FAIL [{}]: {e}", self.name);
            if self.failures.len() < 50 {
                self.failures.push(e);
            }
        }
    }
}

/// The `rank` binary on random input: exactly one output line per input line.
fn check_rank_binary(path: &std::path::Path, rng: &mut Rng) -> Result<(), String> {
    let n = 1 + rng.below(5) as usize;
    let mut input: Vec<u8> = Vec::new();
    for _ in 0..n {
        match rng.below(4) {
            0 => input.extend_from_slice(&[0xff, 0xfe, b'x', 0xc3]),
            1 => input.extend_from_slice(random_text(rng).replace(['\n', '\r'], " ").as_bytes()),
            2 => input.extend_from_slice(b"   "),
            _ => input.extend_from_slice(mutated_text(rng).replace(['\n', '\r'], " ").as_bytes()),
        }
        input.push(b'\n');
    }
    let mut child = std::process::Command::new(path)
        .args(["--json", "--no-certificate", "--budget", "0.2", "--threads", "1"])
        .stdin(std::process::Stdio::piped())
        .stdout(std::process::Stdio::piped())
        .stderr(std::process::Stdio::null())
        .spawn()
        .map_err(|e| format!("cannot start {}: {e}", path.display()))?;
    if let Some(mut stdin) = child.stdin.take() {
        stdin.write_all(&input).ok();
    }
    let out = child.wait_with_output().map_err(|e| e.to_string())?;
    let lines = out.stdout.iter().filter(|&&b| b == b'\n').count();
    if !out.status.success() || lines != n {
        return Err(format!("rank gave {lines} lines (status {:?}) for {n} input lines {:?}", out.status.code(), String::from_utf8_lossy(&input)));
    }
    Ok(())
}

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let seed: u64 = arg(&args, "--seed", 1);
    let n_parser: u64 = arg(&args, "--parser", 1_000_000);
    let n_lines: u64 = arg(&args, "--lines", 2_000);
    let n_curves: u64 = arg(&args, "--curves", 300);
    let n_quartics: u64 = arg(&args, "--quartics", 20_000);
    let n_numbers: u64 = arg(&args, "--numbers", 3_000);
    let n_rank: u64 = arg(&args, "--rank-runs", 50);
    let quartic_digits: u64 = arg(&args, "--quartic-digits", 160);
    let quartic_min_digits: u64 = arg(&args, "--quartic-min-digits", 1);
    let n_pairs: u64 = arg(&args, "--gl2z-pairs", 0);
    let n_degenerate: u64 = arg(&args, "--degenerate", 0);
    let evidence: bool = arg(&args, "--evidence", 1u8) != 0;
    let budget = Duration::from_secs_f64(arg(&args, "--budget", 0.3f64).clamp(0.0, 60.0));
    let rank_path = match args.iter().position(|a| a == "--rank") {
        Some(k) => args.get(k + 1).map(std::path::PathBuf::from),
        None => std::env::current_exe().ok().and_then(|p| p.parent().map(|d| d.join("rank"))).filter(|p| p.exists()),
    };
    let mut rng = Rng::new(seed);
    let mut tallies = Vec::new();

    let t = Instant::now();
    let mut parser = Tally::new("parser");
    for k in 0..n_parser {
        let text = if k % 2 == 0 { random_text(&mut rng) } else { mutated_text(&mut rng) };
        parser.record(check_parser(&text));
    }
    parser.time = t.elapsed();
    tallies.push(parser);

    let t = Instant::now();
    let mut lines = Tally::new("batch lines");
    for _ in 0..n_lines {
        let n = 1 + rng.below(4) as usize;
        let ls: Vec<String> = (0..n).map(|_| if rng.below(2) == 0 { random_text(&mut rng) } else { mutated_text(&mut rng) }).collect();
        lines.record(check_lines(&ls, Duration::from_millis(100)));
    }
    lines.time = t.elapsed();
    tallies.push(lines);

    if let Some(path) = &rank_path {
        let t = Instant::now();
        let mut rank = Tally::new("rank binary");
        for _ in 0..n_rank {
            rank.record(check_rank_binary(path, &mut rng));
        }
        rank.time = t.elapsed();
        tallies.push(rank);
    }

    let t = Instant::now();
    let mut quartics = Tally::new("quartics");
    let mut gl2z_false = 0u64;
    for k in 0..n_quartics {
        let span = quartic_digits.saturating_sub(quartic_min_digits);
        let digits = (quartic_min_digits + k * span / n_quartics.max(1)).max(1) as u32;
        let g = random_quartic(&mut rng, digits);
        match check_quartic(&g, &mut rng) {
            Ok(wrong) => {
                gl2z_false += wrong as u64;
                quartics.record(Ok(()))
            }
            Err(e) => quartics.record(Err(e)),
        }
    }
    quartics.time = t.elapsed();
    tallies.push(quartics);

    // random quartics against their moved copies by unimodular matrices
    // with entries of 1 to 12 digits
    let t = Instant::now();
    let mut pairs = Tally::new("gl2z pairs");
    let mut gave_up = 0u64;
    for k in 0..n_pairs {
        let span = quartic_digits.saturating_sub(quartic_min_digits);
        let digits = (quartic_min_digits + k * span / n_pairs.max(1)).max(1) as u32;
        let g = random_quartic(&mut rng, digits);
        let md = 1 + rng.below(12) as u32;
        match check_gl2z_pair(&g, &mut rng, md) {
            Ok(g) => {
                gave_up += g as u64;
                pairs.record(Ok(()))
            }
            Err(e) => pairs.record(Err(e)),
        }
    }
    pairs.time = t.elapsed();
    tallies.push(pairs);

    let t = Instant::now();
    let mut degenerate = Tally::new("degenerate");
    for k in 0..n_degenerate {
        let digits = (quartic_min_digits + k * quartic_digits.saturating_sub(quartic_min_digits) / n_degenerate.max(1)).max(1) as u32;
        degenerate.record(check_degenerate_quartic(&mut rng, digits));
    }
    degenerate.time = t.elapsed();
    tallies.push(degenerate);

    let t = Instant::now();
    let mut numbers = Tally::new("numbers");
    for k in 0..n_numbers {
        let digits = 1 + (k * 120 / n_numbers.max(1)) as u32;
        numbers.record(check_numbers(&mut rng, digits, Duration::from_millis(50)));
    }
    numbers.time = t.elapsed();
    tallies.push(numbers);

    let t = Instant::now();
    let mut curves = Tally::new("curves");
    let mut stats = CurveStats::default();
    let mut k = 0;
    while k < n_curves {
        let digits = 1 + (k * 30 / n_curves.max(1)) as u32;
        let Some(c) = random_curve(&mut rng, digits) else { continue };
        k += 1;
        curves.record(check_curve(&c, &mut rng, budget, evidence, &mut stats));
    }
    curves.time = t.elapsed();
    tallies.push(curves);

    let mut total = 0;
    let mut failed = 0;
    println!("fuzz run, seed {seed}:");
    for t in &tallies {
        println!("  {:12} {:>9} cases, {:>3} failures, {:.1} s", t.name, t.cases, t.failures.len(), t.time.as_secs_f64());
        total += t.cases;
        failed += t.failures.len();
    }
    println!(
        "  curves: {} analyses compared after a change of model, {} proven, {} cut short, {} errors, slowest {:.3} s (budget {:.3} s, allowed {:.3} s), {} over in wall time only (a loaded machine: within the allowance in CPU time)",
        stats.compared,
        stats.proven,
        stats.cut_short,
        stats.errors,
        stats.slowest.as_secs_f64(),
        budget.as_secs_f64(),
        allowed(budget).as_secs_f64(),
        stats.load_overruns
    );
    println!("  quartics: GL2(Z) test false on a unimodular transform: {gl2z_false}");
    println!("  gl2z pairs: gl2z_decide gave up with a typed error: {gave_up}");
    println!("  total {total} cases, {failed} failures");
    if failed > 0 {
        std::process::exit(1);
    }
}
