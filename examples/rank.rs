//! `rank`: rank bounds for elliptic curves over Q from the command line.
//!
//! Usage:
//!   rank [--json] [--budget SECONDS] [--height H] [CURVE ...]
//!
//! Curves come from the arguments, or from standard input one per line, in
//! any form `twofold::Curve::parse` accepts (`[a1,a2,a3,a4,a6]`, `[a4,a6]`
//! or an equation). With no curve arguments and nothing on standard input
//! it runs a demo. `--json` prints exactly one JSON object per input line,
//! in input order (fields documented in README.md).

use std::io::{BufRead, IsTerminal, Write};
use std::time::Duration;
use twofold::{analyse, Curve, Point, RankOptions};

const DEMO: &[(&str, &str)] = &[
    ("A tiled courtyard: can a right triangle with rational sides have area 6?", "y^2 = x^3 - 36x"),
    ("...area 5?", "[0,0,0,-25,0]"),
    ("...area 1? (Fermat's theorem says no)", "[0,0,0,-1,0]"),
    ("A stack of cannonballs: y^2 = x^3 + 8", "y^2 = x^3 + 8"),
    ("A curve with a point of order 2 and a large Selmer group", "y^2 = x^3 - 82x"),
    ("A model that is far from minimal", "[0,0,0,-1296,0]"),
];

fn usage() -> ! {
    eprintln!("usage: rank [--json] [--budget SECONDS] [--height H] [CURVE ...]");
    std::process::exit(2)
}

fn main() {
    let mut json = false;
    let mut options = RankOptions::default();
    let mut curves: Vec<String> = Vec::new();
    let mut args = std::env::args().skip(1);
    while let Some(a) = args.next() {
        match a.as_str() {
            "--json" => json = true,
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
            "--help" | "-h" => usage(),
            _ => curves.push(a),
        }
    }
    let mut demo = false;
    if curves.is_empty() {
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
    let stdout = std::io::stdout();
    let mut out = stdout.lock();
    for (i, text) in curves.iter().enumerate() {
        if demo && !json {
            writeln!(out, "# {}", DEMO[i].0).ok();
        }
        // rational models are scaled to integral ones; points go back to the model as written
        let result = Curve::parse_scaled(text).and_then(|(c, ch)| analyse(&c, &options).map(|r| (r, ch)));
        let result = result.map(|(mut r, ch)| {
            if !ch.is_identity() {
                let back = |p: &Point| match p {
                    Point::Infinity => Point::Infinity,
                    Point::Affine(x, y) => {
                        let (x, y) = ch.unmap_point(&(x.clone(), y.clone()));
                        Point::Affine(x, y)
                    }
                };
                r.points = r.points.iter().map(back).collect();
                r.torsion_points = r.torsion_points.iter().map(back).collect();
            }
            r
        });
        if json {
            let line = match &result {
                Ok(r) => r.to_json(text),
                Err(e) => twofold::report::error_json(text, e),
            };
            writeln!(out, "{line}").ok();
        } else {
            match &result {
                Ok(r) => writeln!(out, "{r}\n").ok(),
                Err(e) => writeln!(out, "input {text:?}: {e}\n").ok(),
            };
        }
        out.flush().ok();
    }
}
