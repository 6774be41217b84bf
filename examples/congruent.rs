//! `congruent`: decides for each square-free n in a range whether n is a
//! congruent number (the area of a right triangle with rational sides),
//! i.e. whether y^2 = x^3 - n^2 x has positive rank, and prints the proof.
//!
//! Usage: congruent [FROM] [TO] [--odd-sign] [--heegner-seconds S]   (default 1 to 60)
//!
//! With `--odd-sign` only the n whose curve has root number -1 and whose
//! Tunnell counts satisfy A = 2B are run (the n that the criterion calls
//! congruent, conditionally on BSD, with odd analytic rank), and a summary
//! line counts the points found, the misses and the time.
//!
//! Every n gets a wall-clock budget of 30 s (what is proven in time is
//! printed; an open gap says so), and the Heegner step a cap of 20 s of
//! CPU time. `--heegner-seconds S` sets that cap to S seconds of CPU time
//! and the wall-clock budget of each n to the larger of 30 s and 4 S (a
//! few n, like 543, 597 and 965, have generators of height near 200 whose
//! series needs more than 20 s).
//!
//! For each n it prints one of
//! - a point of infinite order, the route that found it (the point search
//!   or the Heegner point method), and the rational right triangle of area
//!   n it gives;
//! - the Selmer bound that shows rank 0;
//! - the open gap with the coverings where Sha could hide.
//! Beside each verdict it prints Tunnell's criterion (Tunnell 1983) as an
//! independent check: if the counts differ, n is not congruent (a theorem,
//! using Coates-Wiles 1977); if they agree, n is congruent provided the
//! Birch and Swinnerton-Dyer conjecture holds for the curve (conditional).

use malachite::Rational;
use std::time::Instant;
use twofold::{analyse, Curve, Point, RankOptions};

fn squarefree(n: u64) -> bool {
    let mut d = 2;
    while d * d <= n {
        if n % (d * d) == 0 {
            return false;
        }
        d += 1;
    }
    n > 0
}

/// Number of integer solutions of x^2 + a y^2 + b z^2 = m.
fn ternary_count(m: i64, a: i64, b: i64) -> u64 {
    let mut count = 0;
    let r = (m as f64).sqrt() as i64 + 1;
    for z in -r..=r {
        let rz = m - b * z * z;
        if rz < 0 {
            continue;
        }
        for y in -r..=r {
            let ry = rz - a * y * y;
            if ry < 0 {
                continue;
            }
            let x = (ry as f64).sqrt() as i64;
            for xx in [x - 1, x, x + 1] {
                if xx >= 0 && xx * xx == ry {
                    count += if xx == 0 { 1 } else { 2 };
                }
            }
        }
    }
    count
}

/// Tunnell's counts (A, B) with the criterion "congruent implies A = 2B".
fn tunnell(n: u64) -> (u64, u64) {
    let n = n as i64;
    if n % 2 == 1 {
        (ternary_count(n, 2, 8), ternary_count(n, 2, 32))
    } else {
        (ternary_count(n / 2, 4, 8), ternary_count(n / 2, 4, 32))
    }
}

fn triangle(p: &Point, n: u64) -> Option<(Rational, Rational, Rational)> {
    let Point::Affine(x, y) = p else { return None };
    if *y == 0 {
        return None;
    }
    let nn = Rational::from(n);
    let abs = |r: Rational| if r < 0 { -r } else { r };
    let a = abs((x * x - &nn * &nn) / y);
    let b = abs(Rational::from(2) * &nn * x / y);
    let c = abs((x * x + &nn * &nn) / y);
    // verify: a^2 + b^2 = c^2 and ab/2 = n
    assert!(&a * &a + &b * &b == &c * &c);
    assert!(&a * &b / Rational::from(2) == nn);
    Some((a, b, c))
}

fn main() {
    let all: Vec<String> = std::env::args().skip(1).collect();
    let odd_sign = all.iter().any(|a| a == "--odd-sign");
    let cap_at = all.iter().position(|a| a == "--heegner-seconds");
    let heegner_seconds: u64 = match cap_at.map(|i| all.get(i + 1).and_then(|v| v.parse().ok())) {
        None => 20,
        Some(Some(s)) => s,
        Some(None) => {
            eprintln!("--heegner-seconds needs a whole number of seconds");
            std::process::exit(2);
        }
    };
    let args: Vec<u64> = all.iter().enumerate().filter(|(i, _)| cap_at.is_none_or(|c| *i != c + 1)).filter_map(|(_, a)| a.parse().ok()).collect();
    let (from, to) = match args.as_slice() {
        [a, b] => (*a, *b),
        [b] => (1, *b),
        _ => (1, 60),
    };
    let options = RankOptions::default()
        .with_time_limit(std::time::Duration::from_secs(30.max(4 * heegner_seconds)))
        .with_heegner_time_limit(std::time::Duration::from_secs(heegner_seconds));
    let started = Instant::now();
    let (mut run, mut by_heegner, mut by_search, mut misses) = (0usize, 0usize, 0usize, Vec::new());
    for n in from..=to {
        if !squarefree(n) {
            continue;
        }
        let n2 = (n * n) as i64;
        let curve = Curve::from_coefficients([0, 0, 0, -n2, 0]).expect("non-singular for n > 0");
        let (ta, tb) = tunnell(n);
        if odd_sign && (ta != 2 * tb || !matches!(twofold::rootno::root_number(&curve), Ok(w) if w.global == -1)) {
            continue;
        }
        run += 1;
        let t = Instant::now();
        let tunnell_says = if ta == 2 * tb {
            "Tunnell: A = 2B, congruent if BSD holds (conditional)"
        } else {
            "Tunnell: A != 2B, not congruent (theorem: Tunnell 1983 with Coates-Wiles 1977)"
        };
        let report = match analyse(&curve, &options) {
            Ok(r) => r,
            Err(e) => {
                println!("n = {n}: error {e}");
                misses.push(format!("{n} (error: {e})"));
                continue;
            }
        };
        let secs = t.elapsed().as_secs_f64();
        match report.points.first() {
            Some(_) if report.independence.contains("Heegner") => by_heegner += 1,
            Some(_) => by_search += 1,
            None => misses.push(format!("{n} ({}, {secs:.1} s)", if report.budget_exhausted { "cut short" } else { "no point" })),
        }
        let verdict = match (report.rank_lower, report.rank_upper, report.points.first()) {
            (Some(l), _, Some(p)) if l > 0 => {
                let (a, b, c) = triangle(p, n).expect("a point of infinite order has y != 0");
                let by = if report.independence.contains("Heegner") { "the Heegner point method" } else { "the point search" };
                format!("congruent (proven): point {p} (found by {by}) gives the triangle {a}, {b}, {c} of area {n}")
            }
            // the rank proven positive by another route (the analytic rank
            // 1 with Gross-Zagier and Kolyvagin), no point within the budget
            (Some(l), _, None) if l > 0 => format!("congruent (proven: rank at least {l}), no point found within the budget"),
            (_, Some(0), _) => {
                let (s, t) = report.isogeny_selmer_dims.unwrap_or((0, 0));
                format!("not congruent (proven): 2-isogeny Selmer dimensions {s} and {t} bound the rank by 0")
            }
            (l, u, _) => format!(
                "open: rank between {} and {}; Sha could hide in {} covering(s), e.g. {}",
                l.map_or("?".into(), |v| v.to_string()),
                u.map_or("?".into(), |v| v.to_string()),
                report.sha_suspects.len(),
                report
                    .sha_suspects
                    .first()
                    .map(|s| format!("y^2 = {}", twofold::quartic::Quartic::new(s.quartic.clone())))
                    .unwrap_or_default()
            ),
        };
        println!("n = {n:>4}: {verdict}\n          A = {ta}, B = {tb}; {tunnell_says}; {secs:.2} s");
    }
    if odd_sign {
        println!(
            "{run} n in {from}..={to} with A = 2B and root number -1: {} with a point ({by_heegner} by the Heegner point method, {by_search} by the search), misses: {misses:?}; {:.1} s in all",
            by_heegner + by_search,
            started.elapsed().as_secs_f64()
        );
    }
}
