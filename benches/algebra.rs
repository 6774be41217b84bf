//! Sel^2(E) by the descent over the cubic algebra Q[X]/(f)
//! (descent/algebra/) on curves of the published wider table
//! (tests/data/curves-wider.tsv, see tests/data/README.md): every 26th row of
//! conductor above 1e5 with odd torsion order (so no rational 2-torsion
//! and A = K cubic). The curve's data (factored discriminant) and torsion
//! are computed outside the timing; one benchmark per curve, named by its
//! conductor and its row among the sample.

use criterion::{criterion_group, criterion_main, Criterion, SamplingMode};
use std::time::Duration;
use twofold::descent::algebra::two_selmer_over_algebra;
use twofold::torsion::TorsionGroup;
use twofold::{Curve, CurveData, Work};

/// The sample: `(conductor, curve)`.
fn sample() -> Vec<(u64, Curve)> {
    let text = std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/tests/data/curves-wider.tsv")).unwrap();
    text.lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .filter_map(|l| {
            let f: Vec<&str> = l.split('\t').collect();
            let n: u64 = f[0].parse().ok()?;
            let t: u64 = f[8].trim().parse().ok()?;
            let a: Vec<i64> = f[2..7].iter().map(|s| s.parse().unwrap()).collect();
            (n > 100_000 && t % 2 == 1).then(|| (n, Curve::from_coefficients([a[0], a[1], a[2], a[3], a[4]]).unwrap()))
        })
        .step_by(26)
        .collect()
}

fn bench(c: &mut Criterion) {
    let work = Work::unlimited();
    let mut g = c.benchmark_group("algebra_sel2_wider");
    g.sampling_mode(SamplingMode::Flat).sample_size(10).warm_up_time(Duration::from_millis(200)).measurement_time(Duration::from_secs(2));
    for (i, (n, e)) in sample().into_iter().enumerate() {
        let data = CurveData::new(&e, &work).unwrap();
        let m = data.minimal().clone();
        let primes = data.bad_primes().to_vec();
        let t = TorsionGroup::compute(&m, &primes);
        g.bench_function(format!("n{n}_{i}"), |b| {
            b.iter(|| std::hint::black_box(two_selmer_over_algebra(&m, &t, &primes, &work).unwrap()))
        });
    }
    g.finish();
}

/// The 40-digit curve of issue 15, y^2 = x^3 + 1234567890121x +
/// 8765432109876543211 (no rational 2-torsion, discriminant about -3.3e40):
/// Sel^2(E) over its cubic field, K(S,2) included (several seconds per
/// run, so ten samples take a minute or more). Set `ALGEBRA_BENCH_LARGE=1`.
fn bench_large(c: &mut Criterion) {
    if std::env::var_os("ALGEBRA_BENCH_LARGE").is_none() {
        return;
    }
    let work = Work::unlimited();
    let e = Curve::from_coefficients([0i64, 0, 0, 1_234_567_890_121, 8_765_432_109_876_543_211]).unwrap();
    let data = CurveData::new(&e, &work).unwrap();
    let m = data.minimal().clone();
    let primes = data.bad_primes().to_vec();
    let t = TorsionGroup::compute(&m, &primes);
    let mut g = c.benchmark_group("algebra_sel2_forty_digits");
    g.sampling_mode(SamplingMode::Flat).sample_size(10).warm_up_time(Duration::from_millis(200)).measurement_time(Duration::from_secs(30));
    g.bench_function("disc_3.3e40", |b| b.iter(|| std::hint::black_box(two_selmer_over_algebra(&m, &t, &primes, &work).unwrap())));
    g.finish();
}

criterion_group!(benches, bench, bench_large);
criterion_main!(benches);
