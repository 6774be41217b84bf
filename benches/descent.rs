//! Whole rank computations over the published table (Cremona, Algorithms for
//! Modular Elliptic Curves, Table 1, in tests/data/), and Tate's algorithm
//! over every bad prime of every curve of the table, and the odd-degree
//! isogeny class of every curve.

use criterion::{criterion_group, criterion_main, Criterion, SamplingMode};
use malachite::Natural;
use std::time::Duration;
use twofold::arith::{factor, FactorLimits};
use twofold::local::local_data;
use twofold::{analyse, Curve, RankOptions};

fn table() -> Vec<(Curve, usize)> {
    let text = std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/tests/data/curves-small-conductor.tsv")).unwrap();
    text.lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .map(|l| {
            let f: Vec<&str> = l.split('\t').collect();
            let a: Vec<i64> = f[2..7].iter().map(|s| s.parse().unwrap()).collect();
            (Curve::from_coefficients([a[0], a[1], a[2], a[3], a[4]]).unwrap(), f[8].parse().unwrap())
        })
        .collect()
}

fn bench(c: &mut Criterion) {
    let curves = table();
    let even: Vec<&Curve> = curves.iter().filter(|(_, t)| t % 2 == 0).map(|(c, _)| c).collect();
    let all: Vec<&Curve> = curves.iter().map(|(c, _)| c).collect();
    let with_primes: Vec<(Curve, Vec<Natural>)> = curves
        .iter()
        .map(|(c, _)| (c.clone(), factor(c.discriminant(), &FactorLimits::default()).unwrap().primes().cloned().collect()))
        .collect();
    let mut g = c.benchmark_group("table");
    g.sampling_mode(SamplingMode::Flat).sample_size(10).measurement_time(Duration::from_secs(20));
    g.bench_function("tate_all_bad_primes_572_curves", |b| {
        b.iter(|| {
            for (c, ps) in &with_primes {
                for p in ps {
                    std::hint::black_box(local_data(c, p).unwrap());
                }
            }
        })
    });
    g.bench_function("odd_isogeny_class_572_curves", |b| {
        b.iter(|| {
            for (c, ps) in &with_primes {
                std::hint::black_box(twofold::isogeny::odd_isogeny_class(c, ps).unwrap());
            }
        })
    });
    let opts = RankOptions::default();
    g.bench_function("analyse_even_torsion_408_curves", |b| {
        b.iter(|| {
            for c in &even {
                std::hint::black_box(analyse(c, &opts).unwrap());
            }
        })
    });
    g.bench_function("analyse_all_572_curves", |b| {
        b.iter(|| {
            for c in &all {
                std::hint::black_box(analyse(c, &opts).unwrap());
            }
        })
    });
    g.finish();
    // curves of our own choosing with 36- and 37-digit discriminants and a
    // rational 2-torsion point (the 2-isogeny route; the quartic enumeration
    // is refused at once by its size estimate)
    let big: Vec<Curve> = [[0i64, 1234567, 0, 98765432101, 0], [0, -3, 0, 314159265358, 0], [0, 7, 0, 271828182845, 0]]
        .iter()
        .map(|a| Curve::from_coefficients(*a).unwrap())
        .collect();
    let mut g = c.benchmark_group("large");
    g.sample_size(10).measurement_time(Duration::from_secs(10));
    for (k, e) in big.iter().enumerate() {
        g.bench_function(format!("analyse_36_digit_discriminant_{k}"), |b| b.iter(|| std::hint::black_box(analyse(e, &opts).unwrap())));
    }
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
