//! `family`: ranks across the quadratic twists of one curve.
//!
//! Usage:
//!   family [--curve CURVE] [--threads N] [--budget SECONDS] [--out DIR] D_MIN D_MAX
//!
//! Every twist gets a wall-clock budget of `--budget` seconds (default 30,
//! at most 10^6): a twist that needs more keeps what was proven in time and
//! is marked `budget_exhausted`.
//!
//! For every square-free d with D_MIN <= d <= D_MAX (negative d allowed,
//! d = 0 skipped) it analyses the twist E_d of the base curve (default
//! y^2 = x^3 + x^2 - 2x, full rational 2-torsion, chosen for this example)
//! and writes
//!   DIR/family.csv   one row per twist: d, model, conductor, bounds, rank, ...
//!   DIR/family.svg   a histogram of the ranks, proven and open, with the
//!                    proven fraction in the title
//! and a summary on standard output (DIR defaults to target/family).
//!
//! The twist of y^2 + a1 xy + a3 y = x^3 + a2 x^2 + a4 x + a6 by d is taken
//! on the model Y^2 = X^3 + b2 X^2 + 8 b4 X + 16 b6 (X = 4x, Y = 8y + 4 a1 x
//! + 4 a3), as Y^2 = X^3 + d b2 X^2 + 8 d^2 b4 X + 16 d^3 b6.

use malachite::Integer;
use plotters::prelude::*;
use std::io::{IsTerminal, Write};
use std::time::Duration;
use twofold::batch::{analyse_batch_with, BatchOptions, BatchProgress};
use twofold::{Curve, RankOptions};

fn usage() -> ! {
    eprintln!("usage: family [--curve CURVE] [--threads N] [--budget SECONDS] [--out DIR] D_MIN D_MAX");
    std::process::exit(2)
}

fn square_free(d: i64) -> bool {
    if d == 0 {
        return false;
    }
    let n = d.unsigned_abs();
    let mut p = 2u64;
    while p * p <= n {
        if n.is_multiple_of(p * p) {
            return false;
        }
        p += 1;
    }
    true
}

/// The quadratic twist of `e` by `d` (see the module documentation).
fn twist(e: &Curve, d: i64) -> Result<Curve, twofold::Error> {
    let [b2, b4, b6, _] = e.b_invariants().clone();
    let d = Integer::from(d);
    let d2 = &d * &d;
    let d3 = &d2 * &d;
    Curve::new([Integer::from(0), &d * b2, Integer::from(0), Integer::from(8) * d2 * b4, Integer::from(16) * d3 * b6])
}

struct Row {
    d: i64,
    rank_lower: Option<usize>,
    rank_upper: Option<usize>,
}

fn main() {
    let mut base = "y^2 = x^3 + x^2 - 2x".to_string();
    let mut threads = 0usize;
    // the default budget per curve (see the module documentation)
    let mut options = RankOptions::default().with_time_limit(Duration::from_secs(30));
    let mut out_dir = std::path::PathBuf::from("target/family");
    let mut range: Vec<i64> = Vec::new();
    let mut args = std::env::args().skip(1);
    while let Some(a) = args.next() {
        match a.as_str() {
            "--curve" => base = args.next().unwrap_or_else(|| usage()),
            "--threads" => threads = args.next().and_then(|v| v.parse().ok()).filter(|&n| (1..=1024).contains(&n)).unwrap_or_else(|| usage()),
            "--budget" => {
                let s: f64 = args.next().and_then(|v| v.parse().ok()).filter(|s: &f64| s.is_finite() && (0.0..=1e6).contains(s)).unwrap_or_else(|| usage());
                options.time_limit = Some(Duration::from_secs_f64(s));
            }
            "--out" => out_dir = args.next().unwrap_or_else(|| usage()).into(),
            "--help" | "-h" => usage(),
            "--" => {}
            _ => range.push(a.parse().unwrap_or_else(|_| usage())),
        }
    }
    let (lo, hi) = match range[..] {
        [] => (1, 100),
        [a, b] if a <= b => (a, b),
        _ => usage(),
    };
    let e = Curve::parse(&base).unwrap_or_else(|err| {
        eprintln!("family: base curve {base:?}: {err}");
        std::process::exit(2)
    });
    let ds: Vec<i64> = (lo..=hi).filter(|&d| square_free(d)).collect();
    let mut curves = Vec::with_capacity(ds.len());
    for &d in &ds {
        match twist(&e, d) {
            Ok(c) => curves.push(c),
            Err(err) => {
                eprintln!("family: twist by {d}: {err}");
                std::process::exit(2)
            }
        }
    }
    std::fs::create_dir_all(&out_dir).unwrap_or_else(|err| {
        eprintln!("family: cannot create {}: {err}", out_dir.display());
        std::process::exit(2)
    });
    let csv_path = out_dir.join("family.csv");
    let mut csv = std::io::BufWriter::new(std::fs::File::create(&csv_path).unwrap_or_else(|err| {
        eprintln!("family: cannot write {}: {err}", csv_path.display());
        std::process::exit(2)
    }));
    writeln!(csv, "d,model,conductor,torsion,rank_lower,rank_upper,rank,method,two_selmer_dim,points,sha_suspects,budget_exhausted").ok();

    let mut opts = BatchOptions::new(options).with_threads(threads);
    if std::io::stderr().is_terminal() {
        opts = opts.with_observer(|p: &BatchProgress| {
            eprint!("\r\x1b[K{}/{} twists, {} proven, {:.1} s", p.done, p.total.unwrap_or(0), p.proven, p.elapsed.as_secs_f64());
        });
    }
    let mut rows = Vec::with_capacity(ds.len());
    let opt = |x: Option<usize>| x.map(|v| v.to_string()).unwrap_or_default();
    let summary = analyse_batch_with(&curves, &opts, |item| {
        let d = ds[item.index];
        match &item.result {
            Ok(r) => {
                let tors: Vec<String> = r.torsion.iter().map(|n| n.to_string()).collect();
                let pts: Vec<String> = r.points.iter().map(|p| p.to_string()).collect();
                writeln!(
                    csv,
                    "{d},\"{}\",{},\"{}\",{},{},{},{},{},\"{}\",{},{}",
                    item.label,
                    r.conductor,
                    tors.join("x"),
                    opt(r.rank_lower),
                    opt(r.rank_upper),
                    opt(r.rank()),
                    r.route.name(),
                    opt(r.two_selmer_dim),
                    pts.join(" "),
                    r.sha_suspects.len(),
                    r.budget_exhausted
                )
                .ok();
                rows.push(Row { d, rank_lower: r.rank_lower, rank_upper: r.rank_upper });
            }
            Err(err) => {
                writeln!(csv, "{d},\"{}\",,,,,,,,,,\"error: {err}\"", item.label).ok();
            }
        }
    });
    if std::io::stderr().is_terminal() {
        eprint!("\r\x1b[K");
    }
    csv.flush().ok();
    let svg_path = out_dir.join("family.svg");
    if let Err(err) = histogram(&rows, &base, lo, hi, &svg_path) {
        eprintln!("family: cannot draw {}: {err}", svg_path.display());
    }
    let proven: Vec<usize> = rows.iter().filter(|r| r.rank_lower == r.rank_upper).filter_map(|r| r.rank_lower).collect();
    let max = proven.iter().copied().max().unwrap_or(0);
    let counts: Vec<String> = (0..=max).map(|k| format!("rank {k}: {}", proven.iter().filter(|&&r| r == k).count())).collect();
    println!("twists of {base} by square-free d in [{lo}, {hi}]");
    println!("proven: {} ({})", counts.join(", "), summary.proven);
    let open: Vec<String> = rows
        .iter()
        .filter(|r| r.rank_lower != r.rank_upper || r.rank_upper.is_none())
        .map(|r| format!("d = {}: {}..{}", r.d, opt(r.rank_lower), r.rank_upper.map(|u| u.to_string()).unwrap_or("?".into())))
        .collect();
    if !open.is_empty() {
        println!("open: {}", open.join("; "));
    }
    println!("summary: {summary}");
    println!("wrote {} and {}", csv_path.display(), svg_path.display());
}

/// Bars per rank: proven ranks, and open curves at their lower bound.
fn histogram(rows: &[Row], base: &str, lo: i64, hi: i64, path: &std::path::Path) -> Result<(), Box<dyn std::error::Error>> {
    let max = rows.iter().filter_map(|r| r.rank_upper.or(r.rank_lower)).max().unwrap_or(0) as u32;
    let n = max + 1;
    let mut proven = vec![0u32; n as usize];
    let mut open = vec![0u32; n as usize];
    for r in rows {
        match (r.rank_lower, r.rank_upper) {
            (Some(l), Some(u)) if l == u => proven[l] += 1,
            (l, _) => open[l.unwrap_or(0)] += 1,
        }
    }
    let top = proven.iter().zip(&open).map(|(a, b)| a.max(b)).max().copied().unwrap_or(1).max(1);
    let done = proven.iter().sum::<u32>();
    let total = rows.len().max(1) as f64;
    let root = SVGBackend::new(path, (720, 480)).into_drawing_area();
    root.fill(&WHITE)?;
    let title = format!("{base}, twists by square-free d in [{lo}, {hi}]: {:.0}% proven ({done}/{})", 100.0 * done as f64 / total, rows.len());
    let mut chart = ChartBuilder::on(&root)
        .caption(title, ("sans-serif", 18))
        .margin(12)
        .x_label_area_size(36)
        .y_label_area_size(44)
        .build_cartesian_2d((0u32..2 * n).into_segmented(), 0u32..top + top / 10 + 1)?;
    chart
        .configure_mesh()
        .disable_x_mesh()
        .x_labels(2 * n as usize)
        .x_label_formatter(&|v| match v {
            SegmentValue::CenterOf(k) => format!("{} {}", if k % 2 == 0 { "rank" } else { "open >=" }, k / 2),
            _ => String::new(),
        })
        .y_desc("twists")
        .draw()?;
    chart
        .draw_series(Histogram::vertical(&chart).style(BLUE.filled()).margin(6).data((0..n).map(|k| (2 * k, proven[k as usize]))))?
        .label("proven rank")
        .legend(|(x, y)| Rectangle::new([(x, y - 5), (x + 10, y + 5)], BLUE.filled()));
    chart
        .draw_series(Histogram::vertical(&chart).style(RED.mix(0.6).filled()).margin(6).data((0..n).map(|k| (2 * k + 1, open[k as usize]))))?
        .label("open (at the lower bound)")
        .legend(|(x, y)| Rectangle::new([(x, y - 5), (x + 10, y + 5)], RED.mix(0.6).filled()));
    chart.configure_series_labels().background_style(WHITE.mix(0.8)).border_style(BLACK).draw()?;
    root.present()?;
    Ok(())
}
