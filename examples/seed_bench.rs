//! Timing of the `ris` rule (IMM) against one Monte Carlo reach evaluation
//! measured in the same run, on Barabási–Albert networks (m = 4, so about
//! 4·n edges), for uniform p = 0.01 and the weighted cascade.
//!
//! `cargo run --release --example seed_bench -- [n ...]` (default 100000 1000000).
//! Figures are logged in benches/README.md.
#![allow(clippy::print_stdout)]

use std::time::Instant;

use spreadplan::network::generate::barabasi_albert;
use spreadplan::progress::Silent;
use spreadplan::seed::{degree_seeds, imm, reach_samples, Cascade, CascadeModel};

fn main() {
    let sizes: Vec<u32> = {
        let a: Vec<u32> = std::env::args().skip(1).filter_map(|s| s.parse().ok()).collect();
        if a.is_empty() {
            vec![100_000, 1_000_000]
        } else {
            a
        }
    };
    println!("threads: {}", rayon::current_num_threads());
    for n in sizes {
        let t = Instant::now();
        let net = barabasi_albert(n, 4, 7).expect("valid parameters");
        println!("n = {n}, edges = {}, generated in {:.2?}", net.edge_count(), t.elapsed());
        for model in [CascadeModel::Uniform { p: 0.01 }, CascadeModel::WeightedCascade] {
            let c = Cascade::new(&net, &model, &[]).expect("valid model");
            // Baseline: one realization evaluated for 50 seeds (median of 5).
            let seeds = degree_seeds(&c, 50);
            let mut base = Vec::new();
            for r in 0..5u64 {
                let t = Instant::now();
                let s = reach_samples(&c, std::slice::from_ref(&seeds), 1, r, &Silent);
                std::hint::black_box(s);
                base.push(t.elapsed().as_secs_f64());
            }
            base.sort_by(f64::total_cmp);
            let b = base[2];
            println!("  {}: one Monte Carlo reach evaluation {:.4} s", model.describe(), b);
            for k in [10usize, 50] {
                let t = Instant::now();
                let m = imm(&c, k, 0.1, 1.0, 1, u64::MAX, &Silent);
                let dt = t.elapsed().as_secs_f64();
                println!(
                    "    K = {k}: IMM {dt:.2} s = {:.0}x baseline; theta = {:.3e}, RR sets = {}, members = {}, RR memory = {:.1} MB, LB = {:.1}, n*F_R(S) = {:.1}",
                    dt / b,
                    m.theta,
                    m.sets.len(),
                    m.sets.total_members(),
                    m.sets.memory_bytes() as f64 / 1e6,
                    m.lower_bound,
                    m.coverage_estimate
                );
            }
        }
    }
}
