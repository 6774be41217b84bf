//! Canonical heights and saturation on a few curves.
use criterion::{criterion_group, criterion_main, Criterion};
use malachite::Natural;
use twofold::heights::{canonical_height, mordell_weil_basis, PeriodLattice, SaturationOptions};
use twofold::local::bad_primes_data;
use twofold::{Curve, Point};

fn setup(a: [i64; 5], primes: &[u32]) -> (Curve, Vec<twofold::local::LocalData>) {
    let e = Curve::from_coefficients(a).unwrap();
    let ps: Vec<Natural> = primes.iter().map(|&p| Natural::from(p)).collect();
    let l = bad_primes_data(&e, &ps).unwrap();
    (e, l)
}

fn bench(c: &mut Criterion) {
    let (e37, l37) = setup([0, 0, 1, -1, 0], &[37]);
    let (e389, l389) = setup([0, 1, 1, -2, 0], &[389]);
    let (e5077, l5077) = setup([0, 0, 1, -7, 6], &[5077]);
    let p = Point::from_ints(0, 0);
    let p10 = e37.multiple(&p, 10);
    for prec in [64u64, 256] {
        c.bench_function(&format!("height rank1_N37 P, {prec} bits"), |b| b.iter(|| canonical_height(&e37, &l37, &p, prec).unwrap()));
        c.bench_function(&format!("height rank1_N37 10P, {prec} bits"), |b| b.iter(|| canonical_height(&e37, &l37, &p10, prec).unwrap()));
    }
    c.bench_function("period lattice rank2_N389, 128 bits", |b| b.iter(|| PeriodLattice::compute(&e389, 128).unwrap()));
    let opts = SaturationOptions::default();
    c.bench_function("basis rank1_N37 from 2P", |b| b.iter(|| mordell_weil_basis(&e37, &[e37.multiple(&p, 2)], &l37, 64, &opts).unwrap()));
    let pts389 = [Point::from_ints(0, 0), e389.multiple(&Point::from_ints(1, 0), 3)];
    c.bench_function("basis rank2_N389 from P, 3Q", |b| b.iter(|| mordell_weil_basis(&e389, &pts389, &l389, 64, &opts).unwrap()));
    let pts5077 = [Point::from_ints(0, 2), Point::from_ints(1, 0), Point::from_ints(2, 0)];
    c.bench_function("basis rank3_N5077", |b| b.iter(|| mordell_weil_basis(&e5077, &pts5077, &l5077, 64, &opts).unwrap()));
}

criterion_group! { name = benches; config = Criterion::default().sample_size(10); targets = bench }
criterion_main!(benches);
