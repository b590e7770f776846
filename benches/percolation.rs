//! Benchmarks: percolation. See benches/README.md for logged runs.
//!
//! On a fixed-seed G(n, m) network with 10⁶ nodes and 4·10⁶ edges:
//! - `bare_union_find`: one bond realization as a bare loop over the edges
//!   (same coins, same union–find), the baseline;
//! - `budget_curve_10pct`: the same realization with the full reverse-add
//!   curve over an order of 10% of the nodes (issue 3 target: within 2×);
//! - `sums_x10/threads_1|2`: 10 realizations of `budget_curve_sums` on a
//!   1- and a 2-thread pool.
//!
//! `PERC_BENCH_100=1` also times 100 realizations once on 1 and 2 threads
//! and prints the ratio.
#![allow(clippy::print_stdout)]

use std::hint::black_box;
use std::time::{Duration, Instant};

use criterion::{criterion_group, criterion_main, Criterion};
use spreadplan::network::generate::gnm;
use spreadplan::network::Network;
use spreadplan::percolation::{
    budget_curve_into, budget_curve_sums, BudgetCurve, BudgetCurveConfig, RuleOrder, Scratch,
    Transmissibility, UnionFind,
};
use spreadplan::rng::{self, Stage};

const N: u32 = 1_000_000;
const M: u64 = 4_000_000;
const T: f64 = 0.3;
const SEED: u64 = 42;

fn network() -> Network {
    gnm(N, M, SEED).expect("valid G(n, m) parameters")
}

fn order() -> Vec<u32> {
    let mut o: Vec<u32> = (0..N).collect();
    rng::shuffle(&mut rng::stream(SEED, Stage::Rule, 0), &mut o);
    o.truncate(N as usize / 10);
    o
}

/// The baseline: draw every edge's coin and union the present ones.
fn bare(net: &Network, uf: &mut UnionFind, r: u64) -> (u32, u64) {
    uf.reset();
    let key = rng::key(SEED, Stage::Edge, r);
    let thr = rng::threshold(T);
    for (e, &[a, b]) in net.edges().iter().enumerate() {
        if rng::hit(thr, rng::hash(key, e as u64)) {
            uf.union(a, b);
        }
    }
    (uf.largest(), uf.sum_sq())
}

fn benches(c: &mut Criterion) {
    let net = network();
    let ord = order();
    let cfg = BudgetCurveConfig::new(Transmissibility::Uniform(T), 1.0, SEED);
    let mut uf = UnionFind::new(N as usize);
    let mut scratch = Scratch::new(N as usize);
    let mut curve = BudgetCurve::default();
    // Checksums: the curve at the full budget-free level equals the bare loop
    // minus nothing (level 0 = no doses).
    let base = bare(&net, &mut uf, 0);
    budget_curve_into(&net, &cfg, 0, None, &ord, &mut scratch, &mut curve).unwrap();
    assert_eq!((curve.giant[0], curve.sum_sq[0]), base);

    let mut g = c.benchmark_group("one_realization");
    g.sample_size(10).warm_up_time(Duration::from_secs(1)).measurement_time(Duration::from_secs(5));
    g.bench_function("bare_union_find", |b| b.iter(|| black_box(bare(&net, &mut uf, 0))));
    g.bench_function("budget_curve_10pct", |b| {
        b.iter(|| {
            budget_curve_into(&net, &cfg, 0, None, &ord, &mut scratch, &mut curve).unwrap();
            black_box(curve.giant[0])
        })
    });
    g.finish();

    let rules = [RuleOrder::Fixed(&ord)];
    let mut g = c.benchmark_group("sums_x10");
    g.sample_size(10).warm_up_time(Duration::from_secs(1)).measurement_time(Duration::from_secs(5));
    for threads in [1usize, 2] {
        let pool = rayon::ThreadPoolBuilder::new().num_threads(threads).build().unwrap();
        g.bench_function(format!("threads_{threads}"), |b| {
            b.iter(|| pool.install(|| black_box(budget_curve_sums(&net, &cfg, 10, None, &rules))))
        });
    }
    g.finish();

    if std::env::var_os("PERC_BENCH_100").is_some() {
        let mut times = Vec::new();
        let mut sums = Vec::new();
        for threads in [1usize, 2] {
            let pool = rayon::ThreadPoolBuilder::new().num_threads(threads).build().unwrap();
            let t0 = Instant::now();
            sums.push(pool.install(|| budget_curve_sums(&net, &cfg, 100, None, &rules)).unwrap());
            times.push(t0.elapsed().as_secs_f64());
        }
        assert_eq!(sums[0], sums[1], "identical sums at 1 and 2 threads");
        let t0 = Instant::now();
        for r in 0..100 {
            black_box(bare(&net, &mut uf, r));
        }
        let bare100 = t0.elapsed().as_secs_f64();
        println!(
            "100 realizations: bare loop {bare100:.2} s; curves 1 thread {:.2} s ({:.2}x bare), \
             2 threads {:.2} s (speed-up {:.2}x)",
            times[0],
            times[0] / bare100,
            times[1],
            times[0] / times[1]
        );
    }
}

criterion_group!(percolation, benches);
criterion_main!(percolation);
