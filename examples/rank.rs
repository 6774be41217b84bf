//! `rank`: rank bounds for elliptic curves over Q from the command line.
//!
//! Usage:
//!   rank [--json] [--no-certificate] [--budget SECONDS] [--height H] [--threads N] [--file PATH] [CURVE ...]
//!
//! Curves come from the arguments, from a file (`--file`, one per line), or
//! from standard input one per line, in any form `twofold::Curve::parse`
//! accepts (`[a1,a2,a3,a4,a6]`, `[a4,a6]` or an equation). With no curves
//! and nothing on standard input it runs a demo. `--json` prints exactly one
//! JSON object per input line, in input order (fields documented in
//! README.md). Several curves run as a batch on `--threads` threads (default:
//! one per core), with a progress bar on standard error when it is a
//! terminal and a closing summary on standard error.

use std::io::{BufRead, IsTerminal, Write};
use std::sync::Mutex;
use std::time::{Duration, Instant};
use twofold::batch::{analyse_batch_with, BatchObserver, BatchOptions, BatchProgress, BatchSummary};
use twofold::RankOptions;

const DEMO: &[(&str, &str)] = &[
    ("A tiled courtyard: can a right triangle with rational sides have area 6?", "y^2 = x^3 - 36x"),
    ("...area 5?", "[0,0,0,-25,0]"),
    ("...area 1? (Fermat's theorem says no)", "[0,0,0,-1,0]"),
    ("A stack of cannonballs: y^2 = x^3 + 8", "y^2 = x^3 + 8"),
    ("A curve with a point of order 2 and a large Selmer group", "y^2 = x^3 - 82x"),
    ("A model that is far from minimal", "[0,0,0,-1296,0]"),
];

fn usage() -> ! {
    eprintln!("usage: rank [--json] [--no-certificate] [--budget SECONDS] [--height H] [--threads N] [--file PATH] [CURVE ...]");
    std::process::exit(2)
}

/// A one-line progress bar on standard error, redrawn at most ten times a second.
struct Bar {
    last: Mutex<Option<Instant>>,
}

impl Bar {
    fn draw(&self, p: &BatchProgress, force: bool) {
        let mut last = self.last.lock().unwrap();
        if !force && last.is_some_and(|t| t.elapsed() < Duration::from_millis(100)) {
            return;
        }
        *last = Some(Instant::now());
        let total = p.total.unwrap_or(p.done).max(1);
        let width = 30;
        let filled = (p.done * width / total).min(width);
        eprint!(
            "\r\x1b[K[{}{}] {}/{} curves, {} proven, {:.1} s",
            "#".repeat(filled),
            ".".repeat(width - filled),
            p.done,
            total,
            p.proven,
            p.elapsed.as_secs_f64()
        );
    }
    fn clear(&self) {
        eprint!("\r\x1b[K");
    }
}

impl BatchObserver for Bar {
    fn progress(&self, p: &BatchProgress) {
        self.draw(p, p.total == Some(p.done));
    }
    fn finished(&self, _s: &BatchSummary) {
        self.clear();
    }
}

fn main() {
    let mut json = false;
    let mut no_certificate = false;
    let mut options = RankOptions::default();
    let mut threads = 0usize;
    let mut curves: Vec<String> = Vec::new();
    let mut from_file = false;
    let mut args = std::env::args().skip(1);
    while let Some(a) = args.next() {
        match a.as_str() {
            "--json" => json = true,
            "--no-certificate" => no_certificate = true,
            "--budget" => {
                let s: f64 = args.next().and_then(|v| v.parse().ok()).unwrap_or_else(|| usage());
                if !(s >= 0.0 && s.is_finite()) {
                    usage()
                }
                options.time_limit = Some(Duration::from_secs_f64(s));
            }
            "--height" => {
                options.search_height = args.next().and_then(|v| v.parse().ok()).unwrap_or_else(|| usage());
            }
            "--threads" => {
                threads = args.next().and_then(|v| v.parse().ok()).filter(|&n| n >= 1).unwrap_or_else(|| usage());
            }
            "--file" => {
                let path = args.next().unwrap_or_else(|| usage());
                let text = std::fs::read_to_string(&path).unwrap_or_else(|e| {
                    eprintln!("rank: cannot read {path}: {e}");
                    std::process::exit(2)
                });
                curves.extend(text.lines().map(str::to_string));
                from_file = true;
            }
            "--help" | "-h" => usage(),
            _ => curves.push(a),
        }
    }
    options.certificate = json && !no_certificate;
    let mut demo = false;
    if curves.is_empty() && !from_file {
        let stdin = std::io::stdin();
        if !stdin.is_terminal() {
            for line in stdin.lock().lines() {
                let Ok(line) = line else { break };
                curves.push(line);
            }
        }
        if curves.iter().all(|c| c.trim().is_empty()) {
            demo = true;
            curves = DEMO.iter().map(|(_, c)| c.to_string()).collect();
        }
    }
    let batch = curves.len() > 1 || from_file;
    let mut opts = BatchOptions::new(options).with_threads(threads);
    let bar = batch && std::io::stderr().is_terminal();
    if bar {
        opts = opts.with_observer(Bar { last: Mutex::new(None) });
    }
    let stdout = std::io::stdout();
    // the bar shares the terminal with the reports only when both go there
    let clear_before_output = bar && stdout.is_terminal();
    let mut out = stdout.lock();
    let summary = analyse_batch_with(&curves, &opts, |item| {
        if clear_before_output {
            eprint!("\r\x1b[K");
        }
        let text = &item.label;
        if demo && !json {
            writeln!(out, "# {}", DEMO[item.index].0).ok();
        }
        if json {
            let line = match &item.result {
                Ok(r) => r.to_json(text),
                Err(e) => twofold::report::error_json(text, e),
            };
            writeln!(out, "{line}").ok();
        } else {
            match &item.result {
                Ok(r) => writeln!(out, "{r}\n").ok(),
                Err(e) => writeln!(out, "input {text:?}: {e}\n").ok(),
            };
        }
        out.flush().ok();
    });
    if batch {
        eprintln!("summary: {summary}");
    }
}
