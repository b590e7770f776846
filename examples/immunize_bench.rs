//! Bench example for `immunize` at real size (too slow for criterion):
//! rule orders, the full ranking next to bare reverse-add sweeps in the
//! same run, 1 vs 2 threads, a BFS locality relabeling, peak memory.
//!
//! `cargo run --release --example immunize_bench -- [N] [M] [RUNS] [--orders-only] [--only=RULE,…]
//! [--threads=1,2] [--layouts=generated,bfs] [--no-curve-baseline]`
//! (defaults 1000000 4000000 100). Prints one line per measurement; the
//! ranking also prints how long each of its phases took.
#![allow(clippy::print_stdout)]

use std::time::Instant;

use spreadplan::immunize::{rank_network, removal_order, Budget, ImmunizeConfig, Rule, RuleParams};
use spreadplan::network::load::Loaded;
use spreadplan::network::{generate, Network, NodeTable};
use spreadplan::percolation::{
    budget_curve_into, BudgetCurve, BudgetCurveConfig, Scratch, Transmissibility, UnionFind,
};
use spreadplan::rng::{self, Stage};

fn peak_mb() -> f64 {
    std::fs::read_to_string("/proc/self/status")
        .ok()
        .and_then(|s| {
            s.lines()
                .find(|l| l.starts_with("VmHWM"))
                .and_then(|l| l.split_whitespace().nth(1)?.parse::<f64>().ok())
        })
        .map_or(f64::NAN, |kb| kb / 1024.0)
}

/// BFS order from node 0 over every component: new label = visit position.
fn bfs_perm(net: &Network) -> Vec<u32> {
    let n = net.node_count();
    let mut perm = vec![u32::MAX; n];
    let mut queue = Vec::with_capacity(n);
    let mut next = 0u32;
    for s in 0..n as u32 {
        if perm[s as usize] != u32::MAX {
            continue;
        }
        perm[s as usize] = next;
        next += 1;
        queue.clear();
        queue.push(s);
        let mut i = 0;
        while i < queue.len() {
            let v = queue[i];
            i += 1;
            for &u in net.neighbors(v) {
                if perm[u as usize] == u32::MAX {
                    perm[u as usize] = next;
                    next += 1;
                    queue.push(u);
                }
            }
        }
    }
    perm
}

/// Every node once, in one fixed random order (the baselines' order).
fn shuffled(net: &Network) -> Vec<u32> {
    let mut rng = rng::stream(7, Stage::Rule, 0);
    let mut order: Vec<u32> = (0..net.node_count() as u32).collect();
    rng::shuffle(&mut rng, &mut order);
    order
}

/// The baseline of the issue: a bare reverse-add union–find sweep per
/// realization (every node added back in reverse of one random order,
/// joined to its present neighbours over open edges; nothing recorded).
fn bare_sweeps(net: &Network, runs: u64, per_run: usize) -> f64 {
    use rayon::prelude::*;
    let order = shuffled(net);
    let thr = rng::threshold(0.5);
    let t = Instant::now();
    let _: Vec<u32> = (0..runs)
        .into_par_iter()
        .map_init(
            || UnionFind::new_inactive(net.node_count()),
            |uf, r| {
                let key = rng::key(7, Stage::Edge, r);
                let mut largest = 0;
                for _ in 0..per_run {
                    uf.reset_inactive();
                    for &v in order.iter().rev() {
                        uf.activate(v);
                        for (&u, &e) in net.neighbors(v).iter().zip(net.neighbor_edges(v)) {
                            if uf.is_active(u) && rng::hit(thr, rng::hash(key, e as u64)) {
                                uf.union(v, u);
                            }
                        }
                    }
                    largest = uf.largest();
                }
                largest
            },
        )
        .collect();
    t.elapsed().as_secs_f64()
}

/// Full-order budget curves (what the ranking runs per rule and realization).
fn sweeps(net: &Network, runs: u64, per_run: usize) -> f64 {
    use rayon::prelude::*;
    let cfg = BudgetCurveConfig::new(Transmissibility::Uniform(0.5), 1.0, 7);
    let order = shuffled(net);
    let t = Instant::now();
    let _: Vec<u32> = (0..runs)
        .into_par_iter()
        .map_init(
            || (Scratch::new(net.node_count()), BudgetCurve::default()),
            |(s, c), r| {
                for _ in 0..per_run {
                    budget_curve_into(net, &cfg, r, None, &order, s, c).unwrap();
                }
                c.giant[0]
            },
        )
        .collect();
    t.elapsed().as_secs_f64()
}

/// Progress that records how long each phase of the ranking takes.
#[derive(Default)]
struct PhaseClock {
    start: std::sync::Mutex<Option<(String, Instant)>>,
    log: std::sync::Mutex<Vec<(String, f64)>>,
}

impl spreadplan::progress::Progress for PhaseClock {
    fn phase(&self, name: &str, _total: u64) {
        *self.start.lock().unwrap() = Some((name.to_string(), Instant::now()));
    }
    fn finish(&self) {
        if let Some((name, t)) = self.start.lock().unwrap().take() {
            self.log.lock().unwrap().push((name, t.elapsed().as_secs_f64()));
        }
    }
}

fn main() {
    let orders_only = std::env::args().any(|a| a == "--orders-only");
    let only: Option<String> =
        std::env::args().find_map(|a| a.strip_prefix("--only=").map(str::to_string));
    let a: Vec<u64> = std::env::args().skip(1).filter_map(|s| s.parse().ok()).collect();
    let n = a.first().copied().unwrap_or(1_000_000) as u32;
    let m = a.get(1).copied().unwrap_or(4_000_000);
    let runs = a.get(2).copied().unwrap_or(100) as u32;
    let net = generate::gnm(n, m, 3).unwrap();
    println!("network: N={n} M={m}, runs={runs}");
    for rule in [
        Rule::Degree,
        Rule::DegreeAdaptive,
        Rule::Coreness,
        Rule::CoreHd,
        Rule::CollectiveInfluence,
    ] {
        if only.as_ref().is_some_and(|o| !o.split(',').any(|r| r == rule.name())) {
            continue;
        }
        let t = Instant::now();
        let mut rng = rng::stream(1, Stage::Rule, 0);
        let o = removal_order(&net, rule, &RuleParams::default(), &[], &mut rng);
        println!(
            "order {:<22} {:.3} s ({} nodes)",
            rule.name(),
            t.elapsed().as_secs_f64(),
            o.len()
        );
    }
    if orders_only {
        println!("peak memory {:.0} MB", peak_mb());
        return;
    }
    let rules: Vec<String> =
        ["random", "degree", "degree-adaptive", "coreness", "corehd", "collective-influence"]
            .iter()
            .map(|s| s.to_string())
            .collect();
    let mut cfg = ImmunizeConfig::new(Budget::Text("10%".into()), 0.5);
    cfg.rules = rules;
    cfg.runs = runs;
    let perm = bfs_perm(&net);
    let relabeled = net.relabeled(&perm);
    let list = |flag: &str, default: &str| -> Vec<String> {
        std::env::args()
            .find_map(|a| a.strip_prefix(flag).map(str::to_string))
            .unwrap_or_else(|| default.to_string())
            .split(',')
            .map(str::to_string)
            .collect()
    };
    let thread_counts: Vec<usize> =
        list("--threads=", "1,2").iter().filter_map(|t| t.parse().ok()).collect();
    let layouts = list("--layouts=", "generated,bfs");
    for threads in thread_counts {
        let pool = rayon::ThreadPoolBuilder::new().num_threads(threads).build().unwrap();
        pool.install(|| {
            let bare = bare_sweeps(&net, runs as u64, 6);
            let curves = if std::env::args().any(|a| a == "--no-curve-baseline") {
                f64::NAN
            } else {
                sweeps(&net, runs as u64, 6)
            };
            println!(
                "threads {threads}: {} bare reverse-add sweeps {bare:.2} s; {} full-order budget curves {curves:.2} s ({:.2}x)",
                6 * runs,
                6 * runs,
                curves / bare
            );
            for (name, g) in [("as generated", &net), ("BFS relabeled", &relabeled)] {
                let key = if std::ptr::eq(g, &net) { "generated" } else { "bfs" };
                if !layouts.iter().any(|l| l == key) {
                    continue;
                }
                let l = Loaded {
                    network: g.clone(),
                    nodes: NodeTable::numbered(n as usize),
                    report: Default::default(),
                };
                let clock = PhaseClock::default();
                let t = Instant::now();
                let s = rank_network(&l, &cfg, &clock).unwrap();
                let el = t.elapsed().as_secs_f64();
                let phases: Vec<String> = clock
                    .log
                    .lock()
                    .unwrap()
                    .iter()
                    .map(|(p, s)| format!("{p} {s:.2} s"))
                    .collect();
                println!("threads {threads}: phases ({name}): {}", phases.join(", "));
                println!(
                    "threads {threads}: ranking ({name}) {el:.2} s = {:.2}x of {} bare sweeps ({bare:.2} s, as generated); best {}",
                    el / bare,
                    6 * runs,
                    s.rules[0].rule
                );
            }
        });
    }
    println!("peak memory {:.0} MB", peak_mb());
}
