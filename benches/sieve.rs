//! Candidates per second of the sieving quartic search against the naive one.
//!
//! The quartic is y^2 = 2 z^4 - 34 x^4, which has no rational point at all
//! (Lind 1940, Reichardt 1942), so every search runs through its whole range.

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion, Throughput};
use malachite::Integer;
use std::time::Duration;
use twofold::search::{search_quartic, search_quartic_naive, SearchLimits};

fn quartic_search(c: &mut Criterion) {
    let g = [-34, 0, 0, 0, 2].map(Integer::from);
    let mut group = c.benchmark_group("quartic_search");
    group.sample_size(10);
    group.warm_up_time(Duration::from_millis(500));
    group.measurement_time(Duration::from_secs(2));
    for h in [100u64, 300, 1000] {
        let limits = SearchLimits::new(h);
        let pairs = search_quartic(&g, &limits).candidates_tested;
        group.throughput(Throughput::Elements(pairs));
        group.bench_with_input(BenchmarkId::new("sieve", h), &limits, |b, l| b.iter(|| search_quartic(&g, l)));
        group.bench_with_input(BenchmarkId::new("naive", h), &limits, |b, l| b.iter(|| search_quartic_naive(&g, l)));
    }
    // Larger heights for the sieve alone.
    for h in [3000u64, 10000] {
        let limits = SearchLimits::new(h);
        let pairs = search_quartic(&g, &limits).candidates_tested;
        group.throughput(Throughput::Elements(pairs));
        group.bench_with_input(BenchmarkId::new("sieve", h), &limits, |b, l| b.iter(|| search_quartic(&g, l)));
    }
    group.finish();
}

criterion_group!(benches, quartic_search);
criterion_main!(benches);
