//! Benchmarks: seed — IMM (`ris`) beside one Monte Carlo reach evaluation
//! on the same network, so figures can be quoted as ratios. The full-size
//! run (10⁶ nodes) is `examples/seed_bench.rs`; see benches/README.md.

use criterion::{criterion_group, criterion_main, Criterion};
use spreadplan::network::generate::barabasi_albert;
use spreadplan::progress::Silent;
use spreadplan::seed::{degree_seeds, imm, reach_samples, Cascade, CascadeModel};

fn seed_benches(c: &mut Criterion) {
    let net = barabasi_albert(20_000, 4, 7).expect("valid parameters");
    let cas = Cascade::new(&net, &CascadeModel::WeightedCascade, &[]).expect("valid model");
    let seeds = degree_seeds(&cas, 50);
    // Checksum: the same seed set reaches the same people on a fixed realization.
    let check = reach_samples(&cas, std::slice::from_ref(&seeds), 1, 0, &Silent)[0].total().mean;
    assert!(check >= 50.0);
    c.bench_function("seed_mc_one_realization_20k", |b| {
        b.iter(|| reach_samples(&cas, std::slice::from_ref(&seeds), 1, 0, &Silent))
    });
    c.bench_function("seed_imm_k50_eps0.1_20k_wc", |b| {
        b.iter(|| imm(&cas, 50, 0.1, 1.0, 1, u64::MAX, &Silent).seeds)
    });
}

criterion_group!(benches, seed_benches);
criterion_main!(benches);
