//! Benchmarks: percolation. See benches/README.md for logged runs.

use criterion::{criterion_group, criterion_main, Criterion};

fn placeholder(c: &mut Criterion) {
    c.bench_function("percolation_placeholder", |b| b.iter(|| std::hint::black_box(1 + 1)));
}

criterion_group!(benches, placeholder);
criterion_main!(benches);
