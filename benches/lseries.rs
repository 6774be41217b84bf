//! L-series: special values up to order 3 for curves of growing conductor,
//! and the shared point counter.

use criterion::{criterion_group, criterion_main, Criterion};
use std::hint::black_box;
use twofold::curve::PointCounter;
use twofold::lseries::special_values;
use twofold::rootno::minimal_conductor_sign;
use twofold::Curve;

fn bench(c: &mut Criterion) {
    let mut g = c.benchmark_group("lseries");
    g.sample_size(10);
    // y^2 + y = x^3 + x^2 - 2x, y^2 + y = x^3 - 7x + 6 (published tables, Cremona 1997) and curves of our own choosing with
    // conductors 863935 and 9018585 (from tests/lseries.rs)
    for a in [[0, 1, 1, -2, 0], [0, 0, 1, -7, 6], [0, 0, 1, -7, 100], [0, 0, 1, 3, 250]] {
        let (m, n, w) = minimal_conductor_sign(&Curve::from_coefficients(a).unwrap()).unwrap();
        g.bench_function(format!("special_values N={n}"), |b| b.iter(|| special_values(black_box(&m), &n, w, 3).unwrap()));
    }
    let e = Curve::from_coefficients([0, 1, 1, -2, 0]).unwrap();
    g.bench_function("point counts p in [10^5, 10^5 + 1000]", |b| {
        let mut counter = PointCounter::new(&e);
        let primes: Vec<u64> = twofold::arith::primes_up_to(101_000).into_iter().filter(|&p| p >= 100_000).collect();
        b.iter(|| primes.iter().map(|&p| counter.trace(p)).sum::<i64>())
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
