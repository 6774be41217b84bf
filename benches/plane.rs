//! The lattice search for points on a plane cubic, heights grown by factors
//! of 4 so the cost curve shows (about linear in the height), against the
//! plain search over every triple (cubic in the height) where it is usable.
//!
//! The cubic is Selmer's 3 x^3 + 4 y^3 + 5 z^3, which has no rational point
//! (Selmer 1951), so every search runs through its whole range.

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion};
use malachite::Integer;
use std::time::Duration;
use twofold::search::{search_plane_cubic, search_plane_cubic_naive, SearchLimits};

fn plane_search(c: &mut Criterion) {
    let f = [3, 0, 0, 0, 0, 0, 4, 0, 0, 5].map(Integer::from);
    let mut group = c.benchmark_group("plane_cubic_search");
    group.sample_size(10);
    group.warm_up_time(Duration::from_millis(500));
    group.measurement_time(Duration::from_secs(3));
    for h in [64u64, 128] {
        let limits = SearchLimits::new(h);
        group.bench_with_input(BenchmarkId::new("lattice", h), &limits, |b, l| b.iter(|| search_plane_cubic(&f, l)));
        group.bench_with_input(BenchmarkId::new("plain", h), &limits, |b, l| b.iter(|| search_plane_cubic_naive(&f, l)));
    }
    for h in [1024u64, 4096, 16384, 65536] {
        let limits = SearchLimits::new(h);
        group.bench_with_input(BenchmarkId::new("lattice", h), &limits, |b, l| b.iter(|| search_plane_cubic(&f, l)));
    }
    group.finish();
}

criterion_group!(benches, plane_search);
criterion_main!(benches);
