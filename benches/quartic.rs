//! Benchmarks for the enumeration of binary quartics with the invariants
//! `(c4, 2c6)` of a few curves from the published tables (Cremona 1997).

use criterion::{criterion_group, criterion_main, Criterion};
use malachite::Integer;
use twofold::quartic::{quartics_with_invariants, SearchOptions};
use twofold::Curve;

fn bench_enumeration(c: &mut Criterion) {
    // a-invariants from the published tables (Cremona 1997): y^2 + y = x^3 - x, y^2 + y = x^3 + x^2 - 2x, y^2 + y = x^3 - 7x + 6, y^2 + y = x^3 - x^2 - 10x - 20, [0,-1,1,-929,-10595] (Sha[2] non-trivial).
    let curves: [(&str, [i64; 5]); 5] = [
        ("rank1_N37", [0, 0, 1, -1, 0]),
        ("rank2_N389", [0, 1, 1, -2, 0]),
        ("rank3_N5077", [0, 0, 1, -7, 6]),
        ("rank0_N11", [0, -1, 1, -10, -20]),
        ("sha4_N571", [0, -1, 1, -929, -10595]),
    ];
    let opts = SearchOptions::default().with_negative_definite(false);
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
