//! Factoring balanced semiprimes of 30, 45 and 60 digits.
//!
//! The primes are drawn deterministically (SplitMix64 with a fixed seed,
//! then the next probable prime), so every run factors the same numbers.
//! Each iteration factors the next semiprime of a fixed list of five.

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion, SamplingMode};
use malachite::base::num::arithmetic::traits::Pow;
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural};
use std::time::Duration;
use twofold::arith::{factor, is_probable_prime, FactorLimits};

struct SplitMix(u64);

impl SplitMix {
    fn next(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9e37_79b9_7f4a_7c15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xbf58_476d_1ce4_e5b9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94d0_49bb_1331_11eb);
        z ^ (z >> 31)
    }

    /// A prime with exactly `digits` digits: the next probable prime after a
    /// random starting point in `[10^(digits-1), 10^digits)`.
    fn prime(&mut self, digits: u32) -> Natural {
        let lo = Natural::from(10u32).pow(u64::from(digits - 1));
        let span = Natural::from(10u32).pow(u64::from(digits)) - &lo;
        let mut x = Natural::ZERO;
        for _ in 0..digits.div_ceil(19) + 1 {
            x = (x << 64u32) + Natural::from(self.next());
        }
        let mut p = lo + x % span;
        while !is_probable_prime(&p) {
            p += Natural::ONE;
        }
        p
    }
}

/// Five semiprimes of `digits` digits (or one more) with factors of `digits / 2` digits.
fn semiprimes(digits: u32, seed: u64) -> Vec<Integer> {
    let mut g = SplitMix(seed);
    let half = digits / 2;
    (0..5)
        .map(|_| {
            let p = g.prime(half);
            let q = g.prime(digits - half);
            Integer::from(p * q)
        })
        .collect()
}

fn bench_semiprimes(c: &mut Criterion) {
    let mut group = c.benchmark_group("factor_balanced_semiprime");
    group.sampling_mode(SamplingMode::Flat);
    group.sample_size(10);
    group.warm_up_time(Duration::from_millis(500));
    for (digits, secs) in [(30u32, 5u64), (45, 10), (60, 40)] {
        group.measurement_time(Duration::from_secs(secs));
        let inputs = semiprimes(digits, 0x7f4a_0000 + u64::from(digits));
        let limits = FactorLimits::default();
        let mut i = 0usize;
        group.bench_with_input(BenchmarkId::from_parameter(digits), &inputs, |b, inputs| {
            b.iter(|| {
                let n = &inputs[i % inputs.len()];
                i += 1;
                let f = factor(n, &limits).expect("factorisation within the default limits");
                assert_eq!(f.factors().len(), 2);
                f
            })
        });
    }
    group.finish();
}

criterion_group!(benches, bench_semiprimes);
criterion_main!(benches);
