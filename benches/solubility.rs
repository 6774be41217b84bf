//! Local solubility over a fixed batch of quartics.

use criterion::{black_box, criterion_group, criterion_main, Criterion};
use malachite::{Integer, Natural};
use twofold::solubility::{everywhere_locally_soluble, local_witness, quartic_discriminant, Place};

/// 1000 quartics with coefficients in [-1000, 1000], every fourth one with
/// coefficients scaled by small primes so that bad reduction is common.
fn batch() -> Vec<[Integer; 5]> {
    let mut state = 12345u64;
    let mut next = move || {
        state = state.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
        (state >> 33) as i64
    };
    let mut out = Vec::new();
    while out.len() < 1000 {
        let k = out.len();
        let g: [Integer; 5] = std::array::from_fn(|_| {
            let c = next() % 2001 - 1000;
            let s = if k % 4 == 3 { [1i64, 2, 3, 4, 9, 25][(next() % 6) as usize] } else { 1 };
            Integer::from(c * s)
        });
        if quartic_discriminant(&g) != 0u32 {
            out.push(g);
        }
    }
    out
}

fn bench(c: &mut Criterion) {
    let qs = batch();
    let primes: Vec<Natural> = [2u32, 3, 5, 7].map(Natural::from).to_vec();
    c.bench_function("everywhere R,2,3,5,7 x1000", |b| {
        b.iter(|| {
            let mut n = 0;
            for g in &qs {
                n += everywhere_locally_soluble(black_box(g), &primes).is_ok() as usize;
            }
            n
        })
    });
    for (name, place) in [
        ("real x1000", Place::Real),
        ("p=2 x1000", Place::Prime(Natural::from(2u32))),
        ("p=3 x1000", Place::Prime(Natural::from(3u32))),
        ("p=1000003 x1000", Place::Prime(Natural::from(1_000_003u32))),
    ] {
        c.bench_function(name, |b| {
            b.iter(|| {
                let mut n = 0;
                for g in &qs {
                    n += local_witness(black_box(g), &place).is_some() as usize;
                }
                n
            })
        });
    }
}

criterion_group!(benches, bench);
criterion_main!(benches);
