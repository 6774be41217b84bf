//! Heegner point route (issue 16): a generator of a rank-one curve from
//! the modular parametrisation, verified exactly, by conductor.
//!
//! Curves (J. E. Cremona, Algorithms for Modular Elliptic Curves, 2nd ed.,
//! Table 1, and the wider tables in ../shared/data/curves-wider.tsv):
//! y^2 + y = x^3 - x (conductor 37); y^2 = x^3 - 25x (conductor 800);
//! [1,0,1,-104,-3594] (conductor 7130); [1,-1,0,2781,114151] (conductor
//! 130014); the congruent-number curve for n = 157 (conductor 788768, by
//! the twist route through y^2 = x^3 - x); y^2 = x^3 + 47 (conductor
//! 954288, rank 1 proven by the library's own analytic route; the point
//! (17/4, 89/8) is checked on the curve by the route itself).
use criterion::{criterion_group, criterion_main, Criterion};
use malachite::Natural;
use std::hint::black_box;
use twofold::heegner::{point_of_rank_one, HeegnerOptions};
use twofold::Curve;

fn bench(c: &mut Criterion) {
    let mut g = c.benchmark_group("heegner");
    g.sample_size(10);
    let cases: [(&str, [i64; 5], u32); 6] = [
        ("conductor 37", [0, 0, 1, -1, 0], 37),
        ("congruent n=5, conductor 800", [0, 0, 0, -25, 0], 800),
        ("conductor 7130", [1, 0, 1, -104, -3594], 7130),
        ("conductor 130014", [1, -1, 0, 2781, 114151], 130014),
        ("congruent n=157, conductor 788768", [0, 0, 0, -24649, 0], 788768),
        ("conductor 954288", [0, 0, 0, 0, 47], 954288),
    ];
    for (name, coeffs, n) in cases {
        let e = Curve::from_coefficients(coeffs).unwrap();
        let n = Natural::from(n);
        g.bench_function(name, |b| {
            b.iter(|| point_of_rank_one(black_box(&e), &n, &HeegnerOptions::default()).unwrap().unwrap())
        });
    }
    g.finish();
}

/// The coefficients `a_n` of the Heegner series (traces by baby-step
/// giant-step, then the multiplicative fill) at 10^6 and 10^7 terms, for
/// [0,-1,0,-333332,-72965628] (conductor 131736, of curves-wider.tsv: its
/// Heegner point at D = -743 needs 9.9 million terms). `HEEGNER_BENCH_SMALL=1`
/// leaves out 10^7.
fn coefficients(c: &mut Criterion) {
    let mut g = c.benchmark_group("heegner_coefficients");
    g.sample_size(10);
    let e = Curve::from_coefficients([0, -1, 0, -333332, -72965628]).unwrap();
    let n = Natural::from(131736u32);
    let small = std::env::var_os("HEEGNER_BENCH_SMALL").is_some();
    for m in [1_000_000usize, 10_000_000] {
        if small && m > 1_000_000 {
            continue;
        }
        g.bench_function(format!("a_n to {m}, conductor 131736"), |b| {
            b.iter(|| twofold::lseries::dirichlet_coefficients(black_box(&e), &n, m).unwrap())
        });
    }
    g.finish();
}

criterion_group!(benches, bench, coefficients);
criterion_main!(benches);
