//! Integration tests: seed. Each check names its outside source.

use spreadplan::network::load::{LoadReport, Loaded};
use spreadplan::network::{Network, NodeTable, WeightMerge};
use spreadplan::progress::Silent;
use spreadplan::rng::{hash, key, Stage};
use spreadplan::seed::*;

use crate::common::spreadplan as run_cli;

fn loaded(net: Network) -> Loaded {
    let n = net.node_count();
    Loaded { network: net, nodes: NodeTable::numbered(n), report: LoadReport::default() }
}

/// Exact expected spread σ(S) for every seed mask by enumerating all
/// live-edge subgraphs (the definition of the independent cascade, Kempe,
/// Kleinberg & Tardos 2003, Claim 2.2). `arcs` are live independently
/// except that arcs with the same `coin` share one coin (undirected bond).
fn exact_sigma(n: usize, arcs: &[(usize, usize, f64, usize)]) -> Vec<f64> {
    let coins = arcs.iter().map(|a| a.3).max().map_or(0, |m| m + 1);
    let mut p_coin = vec![0.0; coins];
    for a in arcs {
        p_coin[a.3] = a.2;
    }
    assert!(coins <= 20, "enumeration is for ≤ 20 coins");
    let mut sigma = vec![0.0; 1 << n];
    for live in 0u32..(1 << coins) {
        let prob: f64 = (0..coins)
            .map(|c| if live >> c & 1 == 1 { p_coin[c] } else { 1.0 - p_coin[c] })
            .product();
        if prob == 0.0 {
            continue;
        }
        // reach[v] = mask of nodes reachable from v over live arcs.
        let mut reach: Vec<u32> = (0..n).map(|v| 1 << v).collect();
        loop {
            let mut changed = false;
            for &(u, v, _, c) in arcs {
                if live >> c & 1 == 1 {
                    let r = reach[u] | reach[v];
                    if r != reach[u] {
                        reach[u] = r;
                        changed = true;
                    }
                }
            }
            if !changed {
                break;
            }
        }
        let mut union = vec![0u32; 1 << n];
        for mask in 1usize..(1 << n) {
            let low = mask.trailing_zeros() as usize;
            union[mask] = union[mask & (mask - 1)] | reach[low];
            sigma[mask] += prob * f64::from(union[mask].count_ones());
        }
    }
    sigma
}

fn mask(seeds: &[u32]) -> usize {
    seeds.iter().map(|&v| 1usize << v).sum()
}

fn best_of_size(sigma: &[f64], n: usize, k: u32) -> f64 {
    (0..1usize << n).filter(|m| m.count_ones() == k).map(|m| sigma[m]).fold(0.0, f64::max)
}

/// A directed 8-node graph with 14 arcs and mixed probabilities (demo data,
/// only the exact enumeration defines the expected values).
fn small_directed() -> (Network, Vec<(usize, usize, f64, usize)>) {
    let raw = [
        (0, 1, 0.5),
        (0, 2, 0.3),
        (1, 3, 0.7),
        (2, 3, 0.4),
        (3, 4, 0.6),
        (4, 5, 0.5),
        (5, 3, 0.2),
        (6, 7, 0.9),
        (7, 6, 0.1),
        (6, 0, 0.3),
        (2, 6, 0.25),
        (4, 7, 0.35),
        (1, 2, 0.45),
        (5, 0, 0.15),
    ];
    let edges: Vec<(u32, u32)> = raw.iter().map(|r| (r.0, r.1)).collect();
    let w: Vec<f32> = raw.iter().map(|r| r.2 as f32).collect();
    let (net, _) = Network::from_edges(8, true, edges, Some(w), WeightMerge::Max).unwrap();
    let arcs = raw
        .iter()
        .enumerate()
        .map(|(i, r)| (r.0 as usize, r.1 as usize, f64::from(r.2 as f32), i))
        .collect();
    (net, arcs)
}

/// An undirected 8-node graph with 11 edges.
fn small_undirected_edges() -> Vec<(u32, u32)> {
    vec![(0, 1), (0, 2), (1, 2), (2, 3), (3, 4), (4, 5), (5, 6), (6, 7), (4, 6), (1, 5), (3, 7)]
}

/// Monte Carlo mean within its interval widened by half (≈ 2.9 standard
/// errors, so a correct estimator fails with probability ≈ 0.004; the seed
/// is fixed, so the outcome is deterministic).
fn assert_mc_matches(est: spreadplan::stats::Estimate, exact: f64, what: &str) {
    let hw = est.half_width();
    assert!((est.mean - exact).abs() <= 1.5 * hw, "{what}: Monte Carlo {est:?} vs exact {exact}");
}

#[test]
fn monte_carlo_matches_exact_enumeration_directed() {
    // Source: the live-edge definition of the model (Kempe et al. 2003).
    let (net, arcs) = small_directed();
    let sigma = exact_sigma(8, &arcs);
    let c = Cascade::new(&net, &CascadeModel::EdgeProbabilities, &[]).unwrap();
    for seeds in [vec![0u32], vec![0, 6], vec![2, 4, 7]] {
        let est = expected_reach(&c, &seeds, 20_000, 11);
        assert_mc_matches(est, sigma[mask(&seeds)], &format!("directed {seeds:?}"));
    }
}

#[test]
fn monte_carlo_matches_exact_enumeration_undirected_bond() {
    // Undirected: one shared coin per edge, live both ways (bond
    // percolation; Kempe et al. 2003 note the equivalence).
    let edges = small_undirected_edges();
    let p = 0.4;
    let (net, _) = Network::from_edges(8, false, edges.clone(), None, WeightMerge::Max).unwrap();
    let mut arcs = Vec::new();
    for (i, &(a, b)) in edges.iter().enumerate() {
        arcs.push((a as usize, b as usize, p, i));
        arcs.push((b as usize, a as usize, p, i));
    }
    let sigma = exact_sigma(8, &arcs);
    let c = Cascade::new(&net, &CascadeModel::Uniform { p }, &[]).unwrap();
    for seeds in [vec![4u32], vec![0, 7], vec![1, 3, 6]] {
        let est = expected_reach(&c, &seeds, 20_000, 5);
        assert_mc_matches(est, sigma[mask(&seeds)], &format!("undirected {seeds:?}"));
    }
}

#[test]
fn monte_carlo_matches_exact_enumeration_weighted_cascade() {
    // Weighted cascade p_uv = 1/in-degree(v) (Kempe et al. 2003), on an
    // undirected graph: the two directions are separate arcs with their own
    // coins (22 arcs would exceed the enumeration, so 9 edges = 18 arcs).
    let edges: Vec<(u32, u32)> = small_undirected_edges().into_iter().take(9).collect();
    let (net, _) = Network::from_edges(8, false, edges.clone(), None, WeightMerge::Max).unwrap();
    let mut deg = [0usize; 8];
    for &(a, b) in &edges {
        deg[a as usize] += 1;
        deg[b as usize] += 1;
    }
    let mut arcs = Vec::new();
    for (i, &(a, b)) in edges.iter().enumerate() {
        let (a, b) = (a as usize, b as usize);
        arcs.push((a, b, f64::from(1.0 / deg[b] as f32), 2 * i));
        arcs.push((b, a, f64::from(1.0 / deg[a] as f32), 2 * i + 1));
    }
    let sigma = exact_sigma(8, &arcs);
    let c = Cascade::new(&net, &CascadeModel::WeightedCascade, &[]).unwrap();
    for seeds in [vec![2u32], vec![0, 6]] {
        let est = expected_reach(&c, &seeds, 20_000, 9);
        assert_mc_matches(est, sigma[mask(&seeds)], &format!("weighted cascade {seeds:?}"));
    }
}

#[test]
fn ris_is_near_optimal_and_bound_covers_the_optimum() {
    // Exact optimum by brute force over all K-sets (definition of the
    // problem, Kempe et al. 2003); IMM guarantees (1 − 1/e − ε)·OPT with
    // probability 1 − n^−ℓ (Tang, Shi & Xiao 2015); the upper bound holds at
    // its stated confidence (Tang, Tang, Xiao & Yuan 2018).
    let (net, arcs) = small_directed();
    let sigma = exact_sigma(8, &arcs);
    let l = loaded(net);
    for k in [1usize, 2, 3] {
        let opt = best_of_size(&sigma, 8, k as u32);
        let mut cfg = SeedConfig::new(k, CascadeModel::EdgeProbabilities);
        cfg.rules = vec!["ris".into(), "lp".into(), "degree".into()];
        cfg.runs = 200;
        cfg.lp_sets = 20_000;
        let study = rank_seeds(&l, &[], &cfg, &Silent).unwrap();
        let bound = study.extra["upper_bound"]["value"].as_f64().unwrap();
        assert!(bound >= opt, "k={k}: upper bound {bound} < exact optimum {opt}");
        // Also not uselessly loose on this tiny graph (common practice, no source).
        assert!(bound <= 1.6 * opt, "k={k}: bound {bound} vs optimum {opt}");
        for rule in ["ris", "lp"] {
            let r = study.rules.iter().find(|r| r.rule == rule).unwrap();
            let seeds: Vec<u32> = r.extra["seeds"]
                .as_array()
                .unwrap()
                .iter()
                .map(|s| s.as_str().unwrap().parse().unwrap())
                .collect();
            let got = sigma[mask(&seeds)];
            let floor = (1.0 - (-1f64).exp() - 0.1) * opt;
            assert!(got >= floor, "k={k} {rule}: σ = {got} < (1 − 1/e − ε)·OPT = {floor}");
        }
    }
}

/// G(n, m): `m` distinct uniformly random edges (demo generator; the
/// expected values come from theory).
fn gnm(n: u32, m: usize, seed: u64) -> Network {
    let k = key(seed, Stage::Generate, 0);
    let mut edges = Vec::with_capacity(m);
    let mut seen = std::collections::BTreeSet::new();
    let mut i = 0u64;
    while edges.len() < m {
        let a = (hash(k, 2 * i) % u64::from(n)) as u32;
        let b = (hash(k, 2 * i + 1) % u64::from(n)) as u32;
        i += 1;
        let e = (a.min(b), a.max(b));
        if a != b && seen.insert(e) {
            edges.push(e);
        }
    }
    Network::from_edges(n, false, edges, None, WeightMerge::Max).unwrap().0
}

#[test]
fn random_seed_reach_on_erdos_renyi_matches_newman_2002() {
    // Newman 2002 (PRE 66:016128) with the live-edge mapping: the live graph
    // of ER mean degree c under bond probability p is ER with mean λ = cp;
    // the giant fraction solves S = 1 − exp(−λS). One random seed reaches
    // n·S with probability S, otherwise its finite cluster, whose mean size
    // for a non-giant node is 1/(1 − λ(1 − S)) (the finite part is
    // subcritical ER with mean λ(1 − S), the standard duality).
    let (n, c, p) = (20_000u32, 3.5, 0.4);
    let lambda = c * p;
    let mut s = 0.5;
    for _ in 0..200 {
        s = 1.0 - f64::exp(-lambda * s);
    }
    // REFERENCES.md quotes S = 0.5110 for c = 3.5, p = 0.4.
    assert!((s - 0.5110).abs() < 5e-4, "S = {s}");
    let expected = f64::from(n) * s * s + (1.0 - s) / (1.0 - lambda * (1.0 - s));
    let net = gnm(n, (f64::from(n) * c / 2.0) as usize, 3);
    let cas = Cascade::new(&net, &CascadeModel::Uniform { p }, &[]).unwrap();
    let lists: Vec<Vec<u32>> = (0..400).map(|i| random_seeds(&cas, 1, 17, i)).collect();
    let samples = reach_samples(&cas, &lists, 100, 23, &Silent);
    let mean: f64 = samples.iter().map(|s| s.total().mean).sum::<f64>() / lists.len() as f64;
    // Tolerance 4%: sampling error of 40 000 correlated draws (≈ 1%) plus
    // finite-size effects at n = 2·10⁴ (common practice, no source).
    assert!(
        (mean / expected - 1.0).abs() < 0.04,
        "mean reach {mean} vs n·S² + finite term {expected}"
    );
}

#[test]
fn two_equal_components_get_one_seed_each() {
    // Structural truth: seeds in the same component are wasted (Kempe et
    // al. 2003; bond percolation view), so K = 2 on two identical
    // components puts one seed in each.
    let mut edges = Vec::new();
    for base in [0u32, 10] {
        for i in 0..10 {
            for j in i + 1..10 {
                if (i * 7 + j * 3) % 3 != 0 {
                    edges.push((base + i, base + j));
                }
            }
        }
    }
    let (net, _) = Network::from_edges(20, false, edges, None, WeightMerge::Max).unwrap();
    let l = loaded(net);
    let mut cfg = SeedConfig::new(2, CascadeModel::Uniform { p: 0.6 });
    cfg.rules = vec!["ris".into(), "lp".into(), "degree-discount".into()];
    cfg.runs = 50;
    let study = rank_seeds(&l, &[], &cfg, &Silent).unwrap();
    for r in &study.rules {
        let seeds: Vec<u32> = r.extra["seeds"]
            .as_array()
            .unwrap()
            .iter()
            .map(|s| s.as_str().unwrap().parse().unwrap())
            .collect();
        let sides: Vec<bool> = seeds.iter().map(|&v| v < 10).collect();
        assert_ne!(sides[0], sides[1], "{}: seeds {seeds:?} share a component", r.rule);
    }
}

#[test]
fn star_of_stars_seeds_the_hubs() {
    // Structural truth: a star of stars (4 hubs with 30 leaves each, hubs
    // tied to a root) — the hubs are the best 4 seeds. With p = 0.2 a hub
    // alone reaches 1 + 6 + 0.2·(1 + 3·0.2·7) ≈ 8.0 and the root
    // 1 + 4·0.2·7 = 6.6, so even greedy's first pick is a hub (by hand, from
    // the live-edge definition; with few leaves the root would win first).
    let mut edges = Vec::new();
    let root = 0u32;
    let mut next = 1u32;
    let mut hubs = Vec::new();
    for _ in 0..4 {
        let h = next;
        next += 1;
        hubs.push(h);
        edges.push((root, h));
        for _ in 0..30 {
            edges.push((h, next));
            next += 1;
        }
    }
    let (net, _) = Network::from_edges(next, false, edges, None, WeightMerge::Max).unwrap();
    let l = loaded(net);
    let mut cfg = SeedConfig::new(4, CascadeModel::Uniform { p: 0.2 });
    cfg.rules = vec!["ris".into(), "degree".into(), "degree-discount".into(), "lp".into()];
    cfg.runs = 50;
    let study = rank_seeds(&l, &[], &cfg, &Silent).unwrap();
    for r in &study.rules {
        let mut seeds: Vec<u32> = r.extra["seeds"]
            .as_array()
            .unwrap()
            .iter()
            .map(|s| s.as_str().unwrap().parse().unwrap())
            .collect();
        seeds.sort_unstable();
        assert_eq!(seeds, hubs, "{}", r.rule);
    }
}

#[test]
fn degree_discount_matches_the_published_formula_by_hand() {
    // Chen, Wang & Yang 2009, DegreeDiscountIC: dd_v = d_v − 2t_v − (d_v − t_v)·t_v·p.
    // Graph: 0–1, 0–2, 0–3, 0–4, 1–2, 1–5, 5–6, 5–7, 5–8, 2–9; p = 0.1.
    // Degrees: d0 = 4, d1 = 3, d2 = 3, d5 = 4, others 1.
    // Pick 1: tie d0 = d5 = 4, smaller index → 0. Neighbours 1,2,3,4 get t = 1:
    //   dd1 = 3 − 2 − (3 − 1)·1·0.1 = 0.8; dd2 = 0.8; dd3 = dd4 = 1 − 2 − 0 = −1.
    // Pick 2: node 5 (dd = 4). Neighbours 1,6,7,8: t1 = 2 →
    //   dd1 = 3 − 4 − (3 − 2)·2·0.1 = −1.2; dd6 = dd7 = dd8 = −1.
    // Pick 3: remaining dd: 2 → 0.8, 9 → 1 (untouched), so node 9 (1 > 0.8).
    let edges =
        vec![(0, 1), (0, 2), (0, 3), (0, 4), (1, 2), (1, 5), (5, 6), (5, 7), (5, 8), (2, 9)];
    let (net, _) = Network::from_edges(10, false, edges, None, WeightMerge::Max).unwrap();
    let c = Cascade::new(&net, &CascadeModel::Uniform { p: 0.1 }, &[]).unwrap();
    assert_eq!(degree_discount_seeds(&c, 3, 0.1), vec![0, 5, 9]);
    // Plain degree would take 0, 5, then 1 (degree 3, smaller index than 2).
    assert_eq!(degree_seeds(&c, 3), vec![0, 5, 1]);
}

#[test]
fn imm_constants_match_the_published_formulas() {
    // Tang, Shi & Xiao 2015, eqs. (9) and (6), worked by hand for n = 1000,
    // k = 5, ε = 0.5, ℓ = 1: ln C(1000, 5) = ln 8 250 291 250 200 = 29.7413;
    // ε' = √2·0.5 = 0.70711, ε'² = 0.5; ln log₂ 1000 = ln 9.9658 = 2.2992;
    // λ' = (2 + 0.47140)·(29.7413 + 6.9078 + 2.2992)·1000 / 0.5
    //    = 2.47140·38.9483·2000 = 192 513;
    // α = √(6.9078 + 0.6931) = 2.75697, β = √(0.632121·37.3422) = 4.85847,
    // λ* = 2·1000·(0.632121·2.75697 + 4.85847)² / 0.25 = 8000·6.60120² = 348 608.
    let (l1, ls) = imm_lambdas(1000.0, 5, 0.5, 1.0);
    assert!((l1 / 192_513.0 - 1.0).abs() < 1e-3, "λ' = {l1}");
    assert!((ls / 348_608.0 - 1.0).abs() < 1e-3, "λ* = {ls}");
}

#[test]
fn already_adopted_are_never_seeds_nor_counted() {
    // Star with centre 0: excluding the centre leaves isolated leaves, so
    // each seed reaches exactly itself (definition of the documented rule).
    let edges: Vec<(u32, u32)> = (1..8).map(|i| (0, i)).collect();
    let (net, _) = Network::from_edges(8, false, edges, None, WeightMerge::Max).unwrap();
    let l = loaded(net);
    let cfg = SeedConfig::new(3, CascadeModel::Uniform { p: 1.0 });
    let study = rank_seeds(&l, &[0], &cfg, &Silent).unwrap();
    for r in &study.rules {
        let seeds = r.extra["seeds"].as_array().unwrap();
        assert!(seeds.iter().all(|s| s != "0"), "{}", r.rule);
        assert_eq!(r.metrics["expected_reach"].value(), Some(3.0), "{}", r.rule);
    }
}

#[test]
fn results_are_identical_at_one_and_four_threads() {
    let net = gnm(3000, 6000, 8);
    let l = loaded(net);
    let mut cfg = SeedConfig::new(10, CascadeModel::WeightedCascade);
    cfg.runs = 40;
    let run = |t: usize| {
        let pool = rayon::ThreadPoolBuilder::new().num_threads(t).build().unwrap();
        pool.install(|| {
            spreadplan::report::json::to_string(&rank_seeds(&l, &[], &cfg, &Silent).unwrap())
        })
    };
    assert_eq!(run(1), run(4));
}

#[test]
fn cli_rejects_bad_parameters_with_exit_2() {
    let dir = crate::common::tempdir("seed-cli");
    let f = dir.join("net.csv");
    std::fs::write(&f, "a,b\nb,c\nc,d\n").unwrap();
    let f = f.to_str().unwrap();
    let cases: &[(&[&str], &str)] = &[
        (&["--adopt-prob", "1.5", "--budget", "1"], "1.5"),
        (&["--adopt-prob", "0.5", "--budget", "0"], "budget"),
        (&["--adopt-prob", "0.5", "--budget", "9"], "budget"),
        (&["--adopt-prob", "0.5", "--budget", "1", "--epsilon", "1"], "epsilon"),
        (&["--adopt-prob", "0.5", "--budget", "1", "--rules", "magic"], "known rules"),
    ];
    for (extra, needle) in cases {
        let mut args = vec!["seed", "--network", f];
        args.extend_from_slice(extra);
        let out = run_cli(&args);
        let err = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(2), "{args:?}: {err}");
        assert!(err.contains(needle), "{args:?}: {err}");
    }
    let out = run_cli(&[
        "seed",
        "--network",
        f,
        "--adopt-prob",
        "0.5",
        "--budget",
        "2",
        "--format",
        "json",
    ]);
    assert_eq!(out.status.code(), Some(0), "{}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["command"], "seed");
    assert!(v["rules"][0]["seeds"].as_array().unwrap().len() == 2);
    assert!(v["rules"][0]["expected_reach"]["ci_low"].is_number());
}

#[test]
fn analytic_random_seed_reach_matches_newman_2002_on_poisson() {
    // Newman 2002: Poisson mean c with bond p: S = 1 − e^{−cpS}
    // (c = 3.5, p = 0.4: S = 0.5110) and mean finite cluster of a non-giant
    // node 1/(1 − cp(1 − S)); one random seed reaches N·S² + (1 − S)/(1 − cp(1 − S)).
    let d = spreadplan::degree::DegreeDistribution::from_spec("poisson:mean=3.5").unwrap();
    let sol = solve_cascade(&d, 0.4);
    assert!((sol.s - 0.5110).abs() < 5e-4, "S = {}", sol.s);
    let n = 1e6;
    let lambda = 1.4;
    let closed = n * sol.s * sol.s + (1.0 - sol.s) / (1.0 - lambda * (1.0 - sol.s));
    let [random, degree, acq] = analytic_reach(&d, 0.4, n, 1);
    assert!((random.1 / closed - 1.0).abs() < 1e-6, "{} vs {closed}", random.1);
    // Targeting by degree and acquaintance can only help on average
    // (higher degree, higher chance to join: 1 − w^k grows with k).
    assert!(degree.1 > random.1 && acq.1 > random.1);
}

#[test]
fn simulated_random_seed_reach_on_sampled_poisson_matches_newman_2002() {
    // Newman 2002 (PRE 66:016128): Poisson mean c under bond probability p
    // has live-graph giant fraction S = 1 − e^{−cpS} (c·p = 1.4: S = 0.5110,
    // REFERENCES.md); one random seed reaches N·S² plus the small-cluster
    // term (1 − S)/(1 − cp(1 − S)) (mean finite cluster of a non-giant node).
    let (c, p, n_sim) = (3.5, 0.4, 20_000u64);
    let lambda = c * p;
    let mut s = 0.5;
    for _ in 0..200 {
        s = 1.0 - f64::exp(-lambda * s);
    }
    assert!((s - 0.5110).abs() < 5e-4, "S = {s}");
    let closed = n_sim as f64 * s * s + (1.0 - s) / (1.0 - lambda * (1.0 - s));
    let d = spreadplan::degree::DegreeDistribution::from_spec("poisson:mean=3.5").unwrap();
    let analytic = analytic_reach(&d, p, n_sim as f64, 1)[0].1;
    assert!((analytic / closed - 1.0).abs() < 1e-6, "{analytic} vs {closed}");
    let loaded = spreadplan::immunize::analytic::sample_network(&d, n_sim as usize, 7).unwrap();
    let sim = simulate_degree_seeds(&loaded, p, 1, 300, 4, 11, &Silent).unwrap();
    let random = sim.rules.iter().find(|r| r.rule == "random").unwrap();
    let Some(spreadplan::outcome::Metric::Estimate(est)) = random.metrics.get("expected_reach")
    else {
        panic!("no estimate: {:?}", random.metrics)
    };
    // The 95% interval pools 300 independent seed draws (≈ ±6%); widened by
    // 2% of the value for finite size at 2·10⁴ (giant fraction and erased
    // self-loops/multi-edges of the sampled configuration model; common
    // practice, no source).
    let tol = est.half_width() + 0.02 * closed;
    assert!(
        (est.mean - closed).abs() <= tol,
        "simulated {est:?} vs N·S² + small-cluster term {closed} (tolerance {tol})"
    );
}

#[test]
fn cli_degree_mode_simulate_reports_both_columns() {
    let out = run_cli(&[
        "seed",
        "--degree-model",
        "poisson:mean=3.5",
        "--population",
        "100000",
        "--budget",
        "2",
        "--adopt-prob",
        "0.4",
        "--simulate",
        "2000",
        "--runs",
        "5",
        "--format",
        "json",
        "--quiet",
    ]);
    assert_eq!(out.status.code(), Some(0), "{}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let rules = v["rules"].as_array().unwrap();
    assert_eq!(rules.len(), 3);
    for r in rules {
        assert!(r["metrics"]["expected_reach"].is_number(), "{r}");
        assert!(r["metrics"]["simulated_expected_reach"]["ci_low"].is_number(), "{r}");
        assert!(r["metrics"]["simulated_reach_fraction"]["mean"].is_number(), "{r}");
        assert!(r["metrics"]["expected_reach_at_simulated_size"].is_number(), "{r}");
        assert!(r["simulated_rank"].is_number(), "{r}");
    }
    assert_eq!(v["simulation"]["people"], 2000);
}
