//! Proven L-values and root numbers (interval arithmetic) at conductors of
//! about 10^6, 10^8, 10^10 and 10^12. Curves of our own choosing
//! y^2 + y = x^3 + a4 x + a6 with prime conductor (computed by the
//! library). The largest one runs only with TWOFOLD_BENCH_LARGE=1 (about
//! half a minute per iteration).

use criterion::{criterion_group, criterion_main, Criterion};
use malachite::Natural;
use std::hint::black_box;
use twofold::arith::{factor, FactorLimits};
use twofold::lproof::{prove_l_value, prove_root_number};
use twofold::Curve;

fn minimal_and_conductor(a: [i64; 5]) -> (Curve, Natural) {
    let e = Curve::from_coefficients(a).unwrap();
    let f = factor(e.discriminant(), &FactorLimits::default()).unwrap();
    let primes: Vec<Natural> = f.primes().cloned().collect();
    let (m, _) = e.minimal_model(&primes).unwrap();
    let n = twofold::local::conductor(&m, &primes).unwrap();
    (m, Natural::try_from(n).unwrap())
}

fn bench(c: &mut Criterion) {
    let mut g = c.benchmark_group("lproof");
    g.sample_size(10);
    let mut curves = vec![[0, 0, 1, -23, 1], [0, 0, 1, -119, 1], [0, 0, 1, -29, 4026]];
    if std::env::var("TWOFOLD_BENCH_LARGE").is_ok() {
        curves.push([0, 0, 1, -28, 46112]);
    }
    let lim = FactorLimits::default();
    for a in curves {
        let (m, n) = minimal_and_conductor(a);
        let w = prove_root_number(&m, &n, &lim).unwrap().sign.unwrap();
        g.bench_function(format!("proven L^(r)(E,1), r = {}, N = {n}", (1 - w) / 2), |b| {
            b.iter(|| prove_l_value(black_box(&m), &n, w, &lim).unwrap())
        });
        if n < 100_000_000_000u64 {
            g.bench_function(format!("proven root number N = {n}"), |b| b.iter(|| prove_root_number(black_box(&m), &n, &lim).unwrap()));
        }
    }
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
