//! Benchmarks for the enumeration of binary quartics with the invariants
//! `(c4, 2c6)` of a few curves from Cremona's tables.

use criterion::{criterion_group, criterion_main, Criterion};
use malachite::Integer;
use twofold::quartic::{quartics_with_invariants, SearchOptions};
use twofold::Curve;

fn bench_enumeration(c: &mut Criterion) {
    // a-invariants from Cremona's tables: 37a1, 389a1, 5077a1, 11a1, 571a1 (Sha[2] non-trivial).
    let curves: [(&str, [i64; 5]); 5] = [
        ("37a1", [0, 0, 1, -1, 0]),
        ("389a1", [0, 1, 1, -2, 0]),
        ("5077a1", [0, 0, 1, -7, 6]),
        ("11a1", [0, -1, 1, -10, -20]),
        ("571a1", [0, -1, 1, -929, -10595]),
    ];
    let opts = SearchOptions { include_negative_definite: false, ..Default::default() };
    for (name, ai) in curves {
        let e = Curve::from_coefficients(ai).unwrap();
        let i = e.c4().clone();
        let j = Integer::from(2) * e.c6();
        c.bench_function(&format!("quartics_{name}"), |b| b.iter(|| quartics_with_invariants(&i, &j, &opts).unwrap().len()));
    }
}

criterion_group! {
    name = benches;
    config = Criterion::default().sample_size(10);
    targets = bench_enumeration
}
criterion_main!(benches);
