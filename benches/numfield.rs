//! Class group and units of cubic fields `x^3 + a x + b` of growing
//! discriminant. The targets are discriminants 10^10 to 10^40; the
//! present relation search completes up to about 10^11 (see README), so
//! the steps here are the sizes that complete, to show the cost curve.

use criterion::{criterion_group, criterion_main, Criterion};
use malachite::Integer;
use twofold::numfield::{ClassGroupOptions, NumberField};

fn bench(c: &mut Criterion) {
    let mut g = c.benchmark_group("numfield_class_group");
    g.sample_size(10);
    // (a, b) -> field discriminant: (1, -1) -> -31, (10, 13) -> -8563,
    // (31, -57) -> -206887, (1234, 56789) -> -94591067683 (about 10^11)
    for (a, b) in [(1i64, -1i64), (10, 13), (31, -57), (1234, 56789)] {
        let f: Vec<Integer> = [b, a, 0, 1].iter().map(|&x| Integer::from(x)).collect();
        let k = NumberField::new(&f).unwrap();
        let name = format!("disc {}", k.discriminant());
        g.bench_function(&name, |bch| bch.iter(|| k.class_group(&ClassGroupOptions::default()).unwrap()));
    }
    g.bench_function("maximal order x^3 - 10^12 + 1", |bch| {
        let f: Vec<Integer> = vec![Integer::from(-999_999_999_999i64), Integer::from(0), Integer::from(0), Integer::from(1)];
        bch.iter(|| NumberField::new(&f).unwrap())
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
