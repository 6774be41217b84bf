//! The batch over the 572 curves of the published small-conductor table
//! (Cremona, Algorithms for Modular Elliptic Curves, Table 1, in tests/data/)
//! with 1 and with 2 worker threads: the speed-up of `twofold::batch`.
//!
//!     cargo bench --bench batch

use criterion::{criterion_group, criterion_main, Criterion, SamplingMode};
use std::time::Duration;
use twofold::batch::{analyse_batch, BatchOptions};
use twofold::{Curve, RankOptions};

fn table() -> Vec<Curve> {
    let text = std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/tests/data/curves-small-conductor.tsv")).unwrap();
    text.lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .map(|l| {
            let f: Vec<&str> = l.split('\t').collect();
            let a: Vec<i64> = f[2..7].iter().map(|s| s.parse().unwrap()).collect();
            Curve::from_coefficients([a[0], a[1], a[2], a[3], a[4]]).unwrap()
        })
        .collect()
}

fn bench(c: &mut Criterion) {
    let curves = table();
    let mut g = c.benchmark_group("batch");
    g.sampling_mode(SamplingMode::Flat).sample_size(10).warm_up_time(Duration::from_secs(1)).measurement_time(Duration::from_secs(30));
    for threads in [1usize, 2] {
        let opts = BatchOptions::new(RankOptions::default()).with_threads(threads);
        g.bench_function(format!("table_572_curves_{threads}_thread"), |b| {
            b.iter(|| {
                let run = analyse_batch(&curves, &opts);
                assert_eq!(run.items.len(), curves.len());
                std::hint::black_box(run)
            })
        });
    }
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
