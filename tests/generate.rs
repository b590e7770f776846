//! Integration tests: generators checked against closed-form laws from the
//! literature (each source named beside its check), and the `generate` CLI.

use spreadplan::network::generate::{
    barabasi_albert, chung_lu, configuration_model, gnm, gnp, random_regular, square_lattice,
    stochastic_block_model, town, triangular_lattice, watts_strogatz, TownConfig,
};
use spreadplan::network::Network;
use spreadplan::percolation::UnionFind;
use statrs::distribution::{Binomial, ChiSquared, ContinuousCDF, Discrete};

use crate::common::{spreadplan, tempdir};

fn largest_component(net: &Network) -> u32 {
    let mut uf = UnionFind::new(net.node_count());
    for e in net.edges() {
        uf.union(e[0], e[1]);
    }
    uf.largest()
}

/// Pearson chi-square of the degree histogram against Binomial(n − 1, p),
/// merging neighbouring bins until each expects at least 5 nodes (the
/// upper tail is one bin). Returns (statistic, degrees of freedom).
fn degree_chi_square(net: &Network, p: f64) -> (f64, usize) {
    let n = net.node_count();
    let law = Binomial::new(p, n as u64 - 1).unwrap();
    let mut counts = vec![0u64; n];
    for v in 0..n as u32 {
        counts[net.degree(v)] += 1;
    }
    let (mut chi, mut bins) = (0.0, 0usize);
    let (mut seen_exp, mut seen_obs) = (0.0, 0u64);
    let (mut bin_exp, mut bin_obs) = (0.0, 0u64);
    for (k, &c) in counts.iter().enumerate() {
        bin_exp += law.pmf(k as u64) * n as f64;
        bin_obs += c;
        if bin_exp >= 5.0 && n as f64 - seen_exp - bin_exp >= 5.0 {
            chi += (bin_obs as f64 - bin_exp).powi(2) / bin_exp;
            bins += 1;
            seen_exp += bin_exp;
            seen_obs += bin_obs;
            (bin_exp, bin_obs) = (0.0, 0);
        }
        if n as f64 - seen_exp - bin_exp < 5.0 {
            break;
        }
    }
    // Upper tail: everything not yet binned.
    let (o, e) = ((n as u64 - seen_obs) as f64, n as f64 - seen_exp);
    chi += (o - e).powi(2) / e;
    bins += 1;
    (chi, bins - 1)
}

#[test]
fn gnp_edge_count_is_binomial() {
    // Source: the definition of G(n, p) (Gilbert 1959): m ~ Binomial(n(n−1)/2, p).
    // Tolerance 4 standard deviations for each fixed seed.
    let (n, p) = (2_000u32, 0.005);
    let pairs = n as f64 * (n as f64 - 1.0) / 2.0;
    let (mean, sd) = (pairs * p, (pairs * p * (1.0 - p)).sqrt());
    for seed in 0..5 {
        let m = gnp(n, p, seed).unwrap().edge_count() as f64;
        assert!((m - mean).abs() < 4.0 * sd, "seed {seed}: {m} edges, expected {mean} ± {sd}");
    }
}

#[test]
fn gnp_degree_histogram_is_binomial() {
    // Source: in G(n, p) each degree is Binomial(n − 1, p) (Erdős & Rényi
    // 1960; Bollobás, Random Graphs, 2001, ch. 3). Degrees are almost
    // independent for sparse graphs, so the Pearson statistic is compared
    // with the 0.999 quantile of chi-square (common practice, no source for
    // ignoring the weak dependence).
    let n = 100_000u32;
    let p = 6.0 / (n as f64 - 1.0);
    for seed in [1, 2] {
        let net = gnp(n, p, seed).unwrap();
        let (chi, df) = degree_chi_square(&net, p);
        let bound = ChiSquared::new(df as f64).unwrap().inverse_cdf(0.999);
        assert!(chi < bound, "seed {seed}: chi-square {chi:.1} on {df} df exceeds {bound:.1}");
    }
}

#[test]
fn gnm_has_exact_edges_and_binomial_degrees() {
    // Source: in G(n, m) a node's degree is hypergeometric, close to
    // Binomial(n − 1, 2m/(n(n − 1))) for m ≪ n² (Bollobás 2001, ch. 2);
    // same chi-square bound as for G(n, p).
    let (n, m) = (100_000u32, 300_000u64);
    let net = gnm(n, m, 11).unwrap();
    assert_eq!(net.edge_count() as u64, m);
    assert!(net.edges().windows(2).all(|w| w[0] < w[1]));
    let p = 2.0 * m as f64 / (n as f64 * (n as f64 - 1.0));
    let (chi, df) = degree_chi_square(&net, p);
    let bound = ChiSquared::new(df as f64).unwrap().inverse_cdf(0.999);
    assert!(chi < bound, "chi-square {chi:.1} on {df} df exceeds {bound:.1}");
    // Dense case goes through the complement and must still be exact.
    let dense = gnm(300, 40_000, 2).unwrap();
    assert_eq!(dense.edge_count(), 40_000);
}

#[test]
fn gnp_giant_component_matches_erdos_renyi() {
    // Source: Erdős & Rényi (1960): the giant component of G(n, c/n) holds
    // a fraction S solving S = 1 − exp(−cS) (c > 1). For n = 2·10⁵ the
    // fluctuation of S is a few 10⁻³ (variance S(1−S)/(n(1 − c(1−S))²),
    // from memory), so the tolerance is 0.015. For c = 0.5 the largest
    // component is O(log n): about ln n / (c − 1 − ln c) ≈ 63 nodes (from
    // memory; bound 300).
    let n = 200_000u32;
    for (c, seed) in [(0.5, 5u64), (1.5, 6), (2.0, 7), (4.0, 8)] {
        let net = gnp(n, c / n as f64, seed).unwrap();
        let s = largest_component(&net) as f64 / n as f64;
        if c < 1.0 {
            assert!(s * (n as f64) < 300.0, "c = {c}: largest component {} nodes", s * n as f64);
            continue;
        }
        let mut theory = 0.5;
        for _ in 0..1_000 {
            theory = 1.0 - (-c * theory).exp();
        }
        assert!((s - theory).abs() < 0.015, "c = {c}: giant {s:.4}, theory {theory:.4}");
    }
}

#[test]
fn configuration_degrees_are_requested_minus_erased() {
    // Source: stub pairing (Bender & Canfield 1978; Molloy & Reed 1995).
    // Each erased self-loop removes two stubs of one node and each merged
    // multi-edge copy one stub at each end, so Σ (requested − realized) =
    // 2 (loops + merged), and no degree can exceed its request.
    // Expected counts over a uniform pairing of 2m stubs: self-loops exactly
    // Σ C(k_i, 2)/(2m − 1) (a pair of a node's stubs is matched with
    // probability 1/(2m − 1)); double edges ≈ ¼ (Σ k(k − 1) / 2m)² (count
    // of stub quadruples; first-moment derivation, to leading order).
    // Averages over 20 seeds, tolerance 4 standard errors (Poisson counts).
    let degrees: Vec<u32> = (0..10_000u32).map(|i| 1 + i % 10).collect();
    let two_m: f64 = degrees.iter().map(|&k| k as f64).sum();
    let pairs_same: f64 = degrees.iter().map(|&k| (k as f64) * (k as f64 - 1.0) / 2.0).sum();
    let loops_theory = pairs_same / (two_m - 1.0);
    let multi_theory = 0.25 * (2.0 * pairs_same / two_m).powi(2);
    let (mut loops, mut multi) = (0.0, 0.0);
    let runs = 20;
    for seed in 0..runs {
        let g = configuration_model(&degrees, seed).unwrap();
        let mut lost = 0u64;
        for (v, &k) in degrees.iter().enumerate() {
            let d = g.network.degree(v as u32) as u64;
            assert!(d <= k as u64, "node {v}: degree {d} exceeds request {k}");
            lost += k as u64 - d;
        }
        assert_eq!(lost, 2 * (g.report.self_loops_dropped + g.report.duplicates_merged));
        loops += g.report.self_loops_dropped as f64 / runs as f64;
        multi += g.report.duplicates_merged as f64 / runs as f64;
    }
    let se = |mean: f64| (mean / runs as f64).sqrt();
    assert!(
        (loops - loops_theory).abs() < 4.0 * se(loops_theory),
        "self-loops {loops:.2}, theory {loops_theory:.2}"
    );
    assert!(
        (multi - multi_theory).abs() < 4.0 * se(multi_theory) + 0.5,
        "multi-edges {multi:.2}, theory {multi_theory:.2}"
    );
}

#[test]
fn random_regular_every_degree_is_k() {
    // Source: definition of a k-regular graph; nk/2 edges with every degree k
    // means no edge was erased.
    for (n, k, seed) in [(1_000u32, 3u32, 1u64), (1_000, 4, 2), (999, 6, 3), (500, 10, 4)] {
        let net = random_regular(n, k, seed).unwrap();
        assert_eq!(net.edge_count() as u64, n as u64 * k as u64 / 2);
        assert!((0..n).all(|v| net.degree(v) == k as usize), "n = {n}, k = {k}");
    }
}

#[test]
fn random_cubic_on_six_nodes_is_uniform() {
    // Source: there are 70 labelled cubic graphs on 6 nodes (OEIS A002829,
    // from memory): 10 labellings of K_{3,3} and 60 of the prism. A uniform
    // generator gives K_{3,3} (the bipartite one) with probability 1/7.
    // 7000 draws: expected 1000, sd ≈ 29; tolerance 4 sd.
    let mut bipartite = 0u32;
    let draws = 7_000u64;
    for seed in 0..draws {
        let net = random_regular(6, 3, seed).unwrap();
        // K_{3,3} has no triangle; the prism has two.
        let triangle = net
            .edges()
            .iter()
            .any(|e| net.neighbors(e[0]).iter().any(|w| net.neighbors(e[1]).contains(w)));
        bipartite += u32::from(!triangle);
    }
    assert!((bipartite as f64 - 1000.0).abs() < 4.0 * 29.3, "K33 drawn {bipartite} times");
}

#[test]
fn lattices_have_exact_counts_and_degrees() {
    // Source: counting (common practice, no source): open L×L square lattice
    // 2L(L−1) edges, periodic 2L², triangular open 3L² − 4L + 1, periodic 3L².
    for l in [3u32, 5, 10] {
        let ll = l as usize;
        let sq = square_lattice(l, false).unwrap();
        assert_eq!(sq.edge_count(), 2 * ll * (ll - 1));
        assert_eq!(sq.degree(0), 2);
        assert_eq!(sq.degree(l + 1), 4);
        let sqp = square_lattice(l, true).unwrap();
        assert_eq!(sqp.edge_count(), 2 * ll * ll);
        assert!((0..l * l).all(|v| sqp.degree(v) == 4));
        let tr = triangular_lattice(l, false).unwrap();
        assert_eq!(tr.edge_count(), 3 * ll * ll - 4 * ll + 1);
        assert_eq!(tr.degree(l + 1), 6);
        let trp = triangular_lattice(l, true).unwrap();
        assert_eq!(trp.edge_count(), 3 * ll * ll);
        assert!((0..l * l).all(|v| trp.degree(v) == 6));
    }
}

#[test]
fn barabasi_albert_edges_and_degree_law() {
    // Edge count: m(m+1)/2 for the seed clique plus m per later node
    // (exact). Degree law: p_k = 2m(m+1)/(k(k+1)(k+2)) for k >= m
    // (Dorogovtsev, Mendes & Samukhin 2000; Krapivsky, Redner & Leyvraz
    // 2000; Bollobás et al. 2001 — from memory), i.e. P(K >= k) =
    // m(m+1)/(k(k+1)): the tail exponent 3 of Barabási & Albert (1999).
    // Tolerance 0.006 on each fraction (sampling sd ≈ 0.0016 at n = 10⁵,
    // plus finite-size doubt).
    let (n, m) = (100_000u32, 3u32);
    let net = barabasi_albert(n, m, 21).unwrap();
    let mm = m as usize;
    assert_eq!(net.edge_count(), mm * (mm + 1) / 2 + mm * (n as usize - mm - 1));
    let frac = |pred: &dyn Fn(usize) -> bool| {
        (0..n).filter(|&v| pred(net.degree(v))).count() as f64 / n as f64
    };
    let mf = m as f64;
    for k in [3usize, 4, 5, 6] {
        let kf = k as f64;
        let theory = 2.0 * mf * (mf + 1.0) / (kf * (kf + 1.0) * (kf + 2.0));
        let got = frac(&|d| d == k);
        assert!((got - theory).abs() < 0.006, "p_{k} = {got:.4}, theory {theory:.4}");
    }
    for k in [10usize, 20] {
        let kf = k as f64;
        let theory = mf * (mf + 1.0) / (kf * (kf + 1.0));
        let got = frac(&|d| d >= k);
        assert!((got - theory).abs() < 0.006, "P(K >= {k}) = {got:.4}, theory {theory:.4}");
    }
}

#[test]
fn watts_strogatz_preserves_edges_and_rewires_a_share_beta() {
    // Source: Watts & Strogatz (1998): each of the nk/2 ring edges is
    // rewired with probability β, so the edge count is preserved and about
    // β·nk/2 edges leave the ring (a rewired edge lands back on a ring
    // position with probability ≈ k/n, ignored). Binomial sd ≈ 31 at
    // β = 0.2; tolerance 150.
    let (n, k) = (2_000u32, 6u32);
    for beta in [0.0, 0.2, 1.0] {
        let net = watts_strogatz(n, k, beta, 3).unwrap();
        assert_eq!(net.edge_count(), (n * k / 2) as usize);
        let off_ring = net
            .edges()
            .iter()
            .filter(|e| {
                let d = e[1] - e[0];
                d.min(n - d) > k / 2
            })
            .count() as f64;
        let expected = beta * (n * k / 2) as f64 * (1.0 - k as f64 / n as f64);
        assert!((off_ring - expected).abs() < 150.0, "β = {beta}: {off_ring} off the ring");
    }
}

#[test]
fn chung_lu_edge_count_matches_its_probabilities() {
    // Source: Chung & Lu (2002): pairs are independent with probability
    // min(1, w_u w_v / S); the edge count's mean and variance are Σ p and
    // Σ p(1 − p), computed here over all pairs. Weights include saturated
    // pairs (w_u w_v > S). Tolerance 4 sd.
    let w: Vec<f64> =
        (0..2_000).map(|i| if i < 20 { 150.0 } else { 1.0 + (i % 7) as f64 }).collect();
    let s: f64 = w.iter().sum();
    let (mut mean, mut var) = (0.0, 0.0);
    for u in 0..w.len() {
        for v in u + 1..w.len() {
            let p = (w[u] * w[v] / s).min(1.0);
            mean += p;
            var += p * (1.0 - p);
        }
    }
    for seed in 0..3 {
        let m = chung_lu(&w, seed).unwrap().edge_count() as f64;
        assert!((m - mean).abs() < 4.0 * var.sqrt(), "seed {seed}: {m} edges, expected {mean:.0}");
    }
}

#[test]
fn sbm_block_pair_counts_are_binomial() {
    // Source: Holland, Laskey & Leinhardt (1983): edges between blocks a, b
    // are Binomial(pairs(a, b), P_ab). Tolerance 4 sd per block pair.
    let sizes = [300u32, 500, 200];
    let probs = vec![vec![0.05, 0.01, 0.0], vec![0.01, 0.02, 0.03], vec![0.0, 0.03, 0.1]];
    let g = stochastic_block_model(&sizes, &probs, 9).unwrap();
    let block = |v: u32| {
        if v < 300 {
            0
        } else if v < 800 {
            1
        } else {
            2
        }
    };
    let mut count = [[0u64; 3]; 3];
    for e in g.network.edges() {
        let (a, b) = (block(e[0]), block(e[1]));
        count[a.min(b)][a.max(b)] += 1;
    }
    for a in 0..3 {
        for b in a..3 {
            let (sa, sb) = (sizes[a] as f64, sizes[b] as f64);
            let pairs = if a == b { sa * (sa - 1.0) / 2.0 } else { sa * sb };
            let p = probs[a][b];
            let (mean, sd) = (pairs * p, (pairs * p * (1.0 - p)).sqrt());
            let got = count[a][b] as f64;
            assert!((got - mean).abs() <= 4.0 * sd, "blocks {a},{b}: {got} edges, expected {mean}");
        }
    }
}

#[test]
fn generators_are_deterministic_by_seed() {
    // Common practice, no source: same seed, same network; another seed differs.
    assert_eq!(gnp(5_000, 0.001, 4).unwrap(), gnp(5_000, 0.001, 4).unwrap());
    assert_ne!(gnp(5_000, 0.001, 4).unwrap(), gnp(5_000, 0.001, 5).unwrap());
    assert_eq!(barabasi_albert(2_000, 2, 1).unwrap(), barabasi_albert(2_000, 2, 1).unwrap());
    let cfg = TownConfig { people: 3_000, ..TownConfig::default() };
    assert_eq!(town(&cfg, 8).unwrap().network, town(&cfg, 8).unwrap().network);
}

#[test]
fn town_groups_cover_everyone() {
    // Invented model; checks its stated construction only.
    let t = town(&TownConfig::default(), 2).unwrap();
    let groups = t.nodes.groups.as_ref().unwrap();
    assert_eq!(groups.of.len(), t.network.node_count());
    assert_eq!(groups.names, ["child", "adult", "elder", "care-home resident", "care worker"]);
    for (i, name) in groups.names.iter().enumerate() {
        assert!(groups.of.iter().any(|&g| g as usize == i), "no {name}");
    }
    // Classrooms make children's mean degree exceed that of elders at home.
    let mean = |gi: u32| {
        let v: Vec<u32> =
            (0..groups.of.len() as u32).filter(|&v| groups.of[v as usize] == gi).collect();
        v.iter().map(|&x| t.network.degree(x) as f64).sum::<f64>() / v.len() as f64
    };
    assert!(mean(0) > mean(2) + 3.0, "child {:.1} vs elder {:.1}", mean(0), mean(2));
}

#[test]
fn cli_generate_writes_deterministic_files() {
    let dir = tempdir("generate-cli");
    let a = dir.join("a.csv");
    let b = dir.join("b.csv.gz");
    for path in [&a, &b] {
        let out = spreadplan(&[
            "generate",
            "gnp",
            "--n",
            "2000",
            "--mean-degree",
            "4",
            "--seed",
            "3",
            "-o",
            path.to_str().unwrap(),
        ]);
        assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
        let err = String::from_utf8_lossy(&out.stderr);
        assert!(err.contains("2000 nodes"), "{err}");
    }
    let text = std::fs::read_to_string(&a).unwrap();
    let mut gz = String::new();
    std::io::Read::read_to_string(
        &mut flate2::read::GzDecoder::new(std::fs::File::open(&b).unwrap()),
        &mut gz,
    )
    .unwrap();
    assert_eq!(text, gz);
    assert!(text.starts_with("source,target\n"));
    let net = gnp(2000, 4.0 / 1999.0, 3).unwrap();
    assert_eq!(text.lines().count(), net.edge_count() + 1);

    let edges = dir.join("town.csv");
    let nodes = dir.join("town-nodes.csv");
    let out = spreadplan(&[
        "generate",
        "town",
        "--people",
        "1000",
        "-o",
        edges.to_str().unwrap(),
        "--nodes-out",
        nodes.to_str().unwrap(),
    ]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let table = std::fs::read_to_string(&nodes).unwrap();
    assert_eq!(table.lines().count(), 1001);
    assert!(table.starts_with("id,group\n0,care-home resident\n"));

    let degrees = dir.join("deg.csv");
    std::fs::write(&degrees, "degree,count\n3,100\n2,50\n").unwrap();
    let out = spreadplan(&[
        "generate",
        "configuration",
        "--degrees-file",
        degrees.to_str().unwrap(),
        "-o",
        dir.join("c.csv").to_str().unwrap(),
    ]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    assert!(String::from_utf8_lossy(&out.stderr).contains("150 nodes"));

    // Degree-model spec path (spec syntax of `degree::DegreeDistribution`):
    // a pairing of 100 nodes of degree 4 has 200 edges before erasure.
    let c = dir.join("spec.csv");
    let out = spreadplan(&[
        "generate",
        "configuration",
        "--degree-model",
        "regular:k=4",
        "--n",
        "100",
        "-o",
        c.to_str().unwrap(),
    ]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let err = String::from_utf8_lossy(&out.stderr).to_string();
    let num = |before: &str| -> u64 {
        let head = &err[..err.find(before).unwrap()];
        head.rsplit(|ch: char| !ch.is_ascii_digit())
            .find(|w| !w.is_empty())
            .unwrap()
            .parse()
            .unwrap()
    };
    let (edges, loops, multi) = (num(" edges"), num(" self-loops"), num(" multi-edges"));
    assert_eq!(edges + loops + multi, 200, "{err}");
}

#[test]
fn cli_generate_refuses_bad_parameters() {
    let dir = tempdir("generate-cli-bad");
    let o = dir.join("x.csv");
    let o = o.to_str().unwrap();
    for args in [
        &["generate", "regular", "--n", "5", "--k", "3", "-o", o][..],
        &["generate", "gnp", "--n", "10", "--p", "1.5", "-o", o],
        &["generate", "ws", "--n", "10", "--k", "3", "--beta", "0.1", "-o", o],
        &["generate", "ba", "--n", "10", "--m", "2"],
        &["generate", "gnp", "--n", "1000000", "--p", "0.5", "-o", o],
        &["generate", "square", "--side", "70000", "-o", o],
        &["generate", "sbm", "--sizes", "2,2", "--probs", "0.1,0.2;0.3,0.1", "-o", o],
    ] {
        let out = spreadplan(args);
        assert_eq!(out.status.code(), Some(2), "{args:?}");
        let err = String::from_utf8_lossy(&out.stderr);
        assert!(err.starts_with("error:") && !err.contains("panicked"), "{err}");
    }
}

mod no_panics {
    // Common practice, no source: generators given arbitrary parameters
    // return a network or a typed error, never panic, and what they return
    // is a valid simple graph.
    use super::*;
    use proptest::prelude::*;

    fn simple(net: &Network) -> bool {
        net.edges().windows(2).all(|w| w[0] < w[1]) && net.edges().iter().all(|e| e[0] < e[1])
    }

    proptest! {
        #![proptest_config(ProptestConfig { cases: 256, ..ProptestConfig::default() })]

        #[test]
        fn random_parameters(n in 0u32..40, k in 0u32..40, p in prop::num::f64::ANY,
                             q in 0.0f64..=1.0, m in 0u64..900, seed in any::<u64>()) {
            for r in [gnp(n, p, seed), gnp(n, q, seed), gnm(n, m, seed), random_regular(n, k, seed),
                      square_lattice(k % 12, n % 2 == 0), triangular_lattice(k % 12, n % 2 == 1),
                      barabasi_albert(n, k, seed), watts_strogatz(n, k, q, seed),
                      watts_strogatz(n, k, p, seed)].into_iter().flatten() {
                prop_assert!(simple(&r));
            }
            if let Ok(net) = random_regular(n, k, seed) {
                prop_assert!((0..n).all(|v| net.degree(v) == k as usize));
            }
        }

        #[test]
        fn random_sequences(degrees in prop::collection::vec(0u32..12, 0..40),
                            weights in prop::collection::vec(prop::num::f64::ANY, 0..40),
                            sizes in prop::collection::vec(0u32..15, 0..4),
                            p in 0.0f64..=1.0, seed in any::<u64>()) {
            if let Ok(g) = configuration_model(&degrees, seed) {
                prop_assert!(simple(&g.network));
            }
            if let Ok(net) = chung_lu(&weights, seed) {
                prop_assert!(simple(&net));
            }
            let b = sizes.len();
            let probs = vec![vec![p; b]; b];
            if let Ok(g) = stochastic_block_model(&sizes, &probs, seed) {
                prop_assert!(simple(&g.network));
            }
            let cfg = TownConfig {
                people: degrees.len() as u32 * 10,
                household_sizes: weights.iter().map(|w| w.abs().min(10.0)).collect(),
                class_contact: p,
                ..TownConfig::default()
            };
            if let Ok(t) = town(&cfg, seed) {
                prop_assert!(simple(&t.network));
            }
        }
    }
}
