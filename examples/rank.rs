//! `rank`: rank bounds for elliptic curves over Q from the command line.
//!
//! Usage:
//!   rank [--json] [--no-certificate] [--budget SECONDS|none] [--height H] [--threads N] [--file PATH] [CURVE ...]
//!
//! Every curve gets a wall-clock budget of `--budget` seconds (default
//! [`DEFAULT_BUDGET_SECS`], 30 s; `none` for no limit, at most
//! [`MAX_BUDGET_SECS`]): a curve that needs more gets a report with what was
//! proven in time and `budget_exhausted` set, so one slow curve cannot stall
//! a sweep. The search ladders may take half of it in CPU time
//! (`RankOptions::search_time_limit`).
//!
//! Curves come from the arguments, from a file (`--file`, one per line), or
//! from standard input one per line, in any form `twofold::Curve::parse`
//! accepts (`[a1,a2,a3,a4,a6]`, `[a4,a6]` or an equation). With no curves
//! and nothing on standard input it runs a demo. `--json` prints exactly one
//! JSON object per input line, in input order (fields documented in
//! README.md); a line that is not UTF-8 gets an error object of its own.
//! Several curves run as a batch on `--threads` threads (default: one per
//! core), with a progress bar on standard error when it is a terminal and a
//! closing summary on standard error (with the slowest curves and those cut
//! short).

use std::cell::RefCell;
use std::collections::BTreeMap;
use std::ffi::OsString;
use std::io::{BufRead, IsTerminal, Write};
use std::rc::Rc;
use std::sync::Mutex;
use std::time::{Duration, Instant};
use twofold::batch::{analyse_batch_with, BatchItem, BatchObserver, BatchOptions, BatchProgress, BatchSummary};
use twofold::RankOptions;

/// The default wall-clock budget per curve, in seconds.
pub const DEFAULT_BUDGET_SECS: f64 = 30.0;
/// The largest budget accepted, in seconds (about 11.6 days).
pub const MAX_BUDGET_SECS: f64 = 1e6;
/// The largest covering search height accepted.
pub const MAX_HEIGHT: u64 = 1_000_000;
/// The largest number of worker threads accepted.
pub const MAX_THREADS: usize = 1024;
/// How many of the slowest curves the batch summary lists.
const SLOWEST_SHOWN: usize = 5;
/// How many of the curves cut short the batch summary lists by name.
const CUT_SHORT_SHOWN: usize = 10;

const DEMO: &[(&str, &str)] = &[
    ("A tiled courtyard: can a right triangle with rational sides have area 6?", "y^2 = x^3 - 36x"),
    ("...area 5?", "[0,0,0,-25,0]"),
    ("...area 1? (Fermat's theorem says no)", "[0,0,0,-1,0]"),
    ("A stack of cannonballs: y^2 = x^3 + 8", "y^2 = x^3 + 8"),
    ("A curve with a point of order 2 and a large Selmer group", "y^2 = x^3 - 82x"),
    ("A model that is far from minimal", "[0,0,0,-1296,0]"),
];

fn usage() -> ! {
    eprintln!("usage: rank [--json] [--no-certificate] [--budget SECONDS|none] [--height H] [--threads N] [--file PATH] [CURVE ...]");
    eprintln!("  --budget: seconds per curve, 0 to {MAX_BUDGET_SECS:e} (default {DEFAULT_BUDGET_SECS}), or none");
    eprintln!("  --height: covering search height, 1 to {MAX_HEIGHT} (default 300)");
    eprintln!("  --threads: 1 to {MAX_THREADS} (default: one per core)");
    std::process::exit(2)
}

/// A usage error with a reason.
fn bad(msg: &str) -> ! {
    eprintln!("rank: {msg}");
    usage()
}

/// A one-line progress bar on standard error, redrawn at most ten times a second.
struct Bar {
    last: Mutex<Option<Instant>>,
}

impl Bar {
    fn draw(&self, p: &BatchProgress, force: bool) {
        // a poisoned lock only means an earlier redraw panicked: draw anyway
        let mut last = self.last.lock().unwrap_or_else(|e| e.into_inner());
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

/// The options read from the command line.
struct Cli {
    json: bool,
    no_certificate: bool,
    budget: Option<Duration>,
    height: Option<u64>,
    threads: usize,
    curves: Vec<String>,
    file: Option<String>,
}

/// Reads the arguments; every malformed or absurd value is a usage error
/// (exit status 2), never a panic.
fn parse_args(args: Vec<OsString>) -> Cli {
    let mut cli = Cli {
        json: false,
        no_certificate: false,
        budget: Some(Duration::from_secs_f64(DEFAULT_BUDGET_SECS)),
        height: None,
        threads: 0,
        curves: Vec::new(),
        file: None,
    };
    let mut args = args.into_iter().enumerate();
    while let Some((k, a)) = args.next() {
        let a = a.into_string().unwrap_or_else(|_| bad(&format!("argument {} is not valid UTF-8", k + 1)));
        let mut value = |opt: &str| -> String {
            match args.next() {
                Some((k, v)) => v.into_string().unwrap_or_else(|_| bad(&format!("the value of {opt} (argument {}) is not valid UTF-8", k + 1))),
                None => bad(&format!("{opt} expects a value")),
            }
        };
        match a.as_str() {
            "--json" => cli.json = true,
            "--no-certificate" => cli.no_certificate = true,
            "--budget" => cli.budget = parse_budget(&value("--budget")),
            "--height" => {
                let v = value("--height");
                let h: u64 = v.trim().parse().unwrap_or_else(|_| bad(&format!("--height {v:?}: expected a whole number from 1 to {MAX_HEIGHT}")));
                if !(1..=MAX_HEIGHT).contains(&h) {
                    bad(&format!("--height {h}: expected a whole number from 1 to {MAX_HEIGHT}"));
                }
                cli.height = Some(h);
            }
            "--threads" => {
                let v = value("--threads");
                let n: usize = v.trim().parse().unwrap_or_else(|_| bad(&format!("--threads {v:?}: expected a whole number from 1 to {MAX_THREADS}")));
                if !(1..=MAX_THREADS).contains(&n) {
                    bad(&format!("--threads {n}: expected a whole number from 1 to {MAX_THREADS}"));
                }
                cli.threads = n;
            }
            "--file" => {
                if cli.file.is_some() {
                    bad("--file given twice");
                }
                cli.file = Some(value("--file"));
            }
            "--help" | "-h" => usage(),
            s if s.starts_with("--") => bad(&format!("unknown option {s:?}")),
            _ => cli.curves.push(a),
        }
    }
    cli
}

/// `SECONDS` (a decimal number from 0 to [`MAX_BUDGET_SECS`]) or `none`.
fn parse_budget(v: &str) -> Option<Duration> {
    if v.trim() == "none" {
        return None;
    }
    let s: f64 = v.trim().parse().unwrap_or_else(|_| bad(&format!("--budget {v:?}: expected seconds (a number) or none")));
    if !(s.is_finite() && (0.0..=MAX_BUDGET_SECS).contains(&s)) {
        bad(&format!("--budget {v}: expected seconds from 0 to {MAX_BUDGET_SECS:e}, or none"));
    }
    // finite and at most 1e6: the conversion cannot fail
    Some(Duration::try_from_secs_f64(s).unwrap_or_else(|_| bad(&format!("--budget {v}: out of range"))))
}

/// Lines of a byte stream, split at `\n` (a trailing `\r` removed); each
/// either text or, when it is not UTF-8, the line shown with replacement
/// characters. Read lazily, so a batch can start before the input ends.
struct Lines<R: BufRead> {
    reader: R,
    /// Lines read ahead (to decide whether standard input is empty).
    ahead: std::collections::VecDeque<Line>,
    /// A read error ends the input; it is reported once on standard error.
    failed: bool,
}

enum Line {
    Text(String),
    NotUtf8(String),
}

impl<R: BufRead> Lines<R> {
    fn new(reader: R) -> Self {
        Lines { reader, ahead: Default::default(), failed: false }
    }
    fn read_one(&mut self) -> Option<Line> {
        if self.failed {
            return None;
        }
        let mut buf = Vec::new();
        match self.reader.read_until(b'\n', &mut buf) {
            Ok(0) => None,
            Ok(_) => {
                if buf.last() == Some(&b'\n') {
                    buf.pop();
                    if buf.last() == Some(&b'\r') {
                        buf.pop();
                    }
                }
                Some(match String::from_utf8(buf) {
                    Ok(s) => Line::Text(s),
                    Err(e) => Line::NotUtf8(String::from_utf8_lossy(e.as_bytes()).into_owned()),
                })
            }
            Err(e) => {
                eprintln!("rank: reading the input failed: {e}");
                self.failed = true;
                None
            }
        }
    }
    /// Reads ahead until `n` lines are waiting (or the input ends); returns
    /// how many are waiting.
    fn fill(&mut self, n: usize) -> usize {
        while self.ahead.len() < n {
            match self.read_one() {
                Some(l) => self.ahead.push_back(l),
                None => break,
            }
        }
        self.ahead.len()
    }
}

impl<R: BufRead> Iterator for Lines<R> {
    type Item = Line;
    fn next(&mut self) -> Option<Line> {
        self.ahead.pop_front().or_else(|| self.read_one())
    }
}

/// A JSON string literal.
fn json_string(s: &str) -> String {
    let mut out = String::with_capacity(s.len() + 2);
    out.push('"');
    for c in s.chars() {
        match c {
            '"' => out.push_str("\\\""),
            '\\' => out.push_str("\\\\"),
            '\n' => out.push_str("\\n"),
            '\r' => out.push_str("\\r"),
            '\t' => out.push_str("\\t"),
            c if (c as u32) < 0x20 => out.push_str(&format!("\\u{:04x}", c as u32)),
            c => out.push(c),
        }
    }
    out.push('"');
    out
}

/// What the closing summary adds to the library's totals: the slowest
/// curves and the ones cut short (budget spent, or a search at its cap).
#[derive(Default)]
struct Tail {
    slowest: Vec<(Duration, usize, String)>,
    cut_short: Vec<(usize, String)>,
    cut_short_count: usize,
}

impl Tail {
    fn note(&mut self, item: &BatchItem) {
        let Ok(r) = &item.result else { return };
        let short = |s: &str| -> String {
            if s.chars().count() > 60 {
                format!("{}...", s.chars().take(57).collect::<String>())
            } else {
                s.to_string()
            }
        };
        self.slowest.push((r.elapsed, item.index, short(&item.label)));
        self.slowest.sort_by(|a, b| b.0.cmp(&a.0));
        self.slowest.truncate(SLOWEST_SHOWN);
        if r.budget_exhausted {
            self.cut_short_count += 1;
            if self.cut_short.len() < CUT_SHORT_SHOWN {
                self.cut_short.push((item.index, short(&item.label)));
            }
        }
    }
    fn print(&self) {
        if !self.slowest.is_empty() {
            let list: Vec<String> =
                self.slowest.iter().map(|(t, i, l)| format!("line {} {l} ({:.2} s)", i + 1, t.as_secs_f64())).collect();
            eprintln!("slowest: {}", list.join("; "));
        }
        if self.cut_short_count > 0 {
            let list: Vec<String> = self.cut_short.iter().map(|(i, l)| format!("line {} {l}", i + 1)).collect();
            let more = self.cut_short_count - self.cut_short.len();
            let more = if more > 0 { format!(" and {more} more") } else { String::new() };
            eprintln!("cut short ({}): {}{more}", self.cut_short_count, list.join("; "));
        }
    }
}

fn main() {
    let mut cli = parse_args(std::env::args_os().skip(1).collect());
    let mut options = RankOptions::default();
    options.time_limit = cli.budget;
    // the search ladders' CPU cap follows the budget: half of it (the
    // library's default of 15 s is half of the default budget)
    if let Some(b) = cli.budget {
        options.search_time_limit = b / 2;
    }
    if let Some(h) = cli.height {
        options.search_height = h;
    }
    let json = cli.json;
    options.certificate = json && !cli.no_certificate;
    // the input: the arguments, else the file, else standard input (the demo
    // when standard input is a terminal or holds no line at all; a line of
    // spaces is an input line like any other)
    let mut demo = false;
    let batch;
    let input: Box<dyn Iterator<Item = Line>> = if let Some(path) = &cli.file {
        let f = std::fs::File::open(path).unwrap_or_else(|e| {
            eprintln!("rank: cannot read {path}: {e}");
            std::process::exit(2)
        });
        batch = true;
        // curves given as arguments come first, then the file's lines
        let args = std::mem::take(&mut cli.curves);
        Box::new(args.into_iter().map(Line::Text).chain(Lines::new(std::io::BufReader::new(f))))
    } else if !cli.curves.is_empty() {
        batch = cli.curves.len() > 1;
        Box::new(cli.curves.into_iter().map(Line::Text))
    } else {
        let stdin = std::io::stdin();
        let mut lines = Lines::new(stdin.lock());
        if stdin.is_terminal() || lines.fill(1) == 0 {
            demo = true;
            batch = true;
            Box::new(DEMO.iter().map(|(_, c)| Line::Text(c.to_string())))
        } else {
            batch = lines.fill(2) > 1;
            Box::new(lines)
        }
    };
    // a line that is not UTF-8 goes to the batch as an empty text (an error
    // item, counted as such) and is reported below as what it is
    let not_utf8: Rc<RefCell<BTreeMap<usize, String>>> = Rc::default();
    let marks = not_utf8.clone();
    let texts = input.enumerate().map(move |(index, l)| match l {
        Line::Text(s) => s,
        Line::NotUtf8(shown) => {
            marks.borrow_mut().insert(index, shown);
            String::new()
        }
    });
    let mut opts = BatchOptions::new(options).with_threads(cli.threads);
    let bar = batch && std::io::stderr().is_terminal();
    if bar {
        opts = opts.with_observer(Bar { last: Mutex::new(None) });
    }
    let stdout = std::io::stdout();
    // the bar shares the terminal with the reports only when both go there
    let clear_before_output = bar && stdout.is_terminal();
    let mut out = stdout.lock();
    let mut tail = Tail::default();
    let summary = analyse_batch_with(texts, &opts, |item| {
        if clear_before_output {
            eprint!("\r\x1b[K");
        }
        tail.note(&item);
        if demo && !json {
            if let Some((what, _)) = DEMO.get(item.index) {
                writeln!(out, "# {what}").ok();
            }
        }
        if let Some(shown) = not_utf8.borrow_mut().remove(&item.index) {
            let msg = format!("parse error: line {} is not valid UTF-8", item.index + 1);
            if json {
                writeln!(out, "{{\"input\":{},\"error\":{}}}", json_string(&shown), json_string(&msg)).ok();
            } else {
                writeln!(out, "input {shown:?}: {msg}\n").ok();
            }
            out.flush().ok();
            return;
        }
        let text = &item.label;
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
        tail.print();
    }
}
