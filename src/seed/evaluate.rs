//! Monte Carlo evaluation of seed sets under the independent cascade:
//! expected reach (adopters including seeds) with a 95% interval over `R`
//! live-edge realizations on common random numbers, and the reach curve
//! for `k = 1..K` in each rule's pick order.
//!
//! The live-edge view (Kempe, Kleinberg & Tardos 2003): the people who end
//! up adopting are exactly those reachable from the seeds over live arcs.
//! Undirected symmetric models: one union–find per realization gives the
//! reach of any seed set as the sum of the sizes of the distinct components
//! that hold a seed. Directed (or direction-dependent) models: a BFS from
//! the seeds over live out-arcs, coins computed on the fly from the
//! counter-based generator, visited marks stamped with a generation number
//! (no allocation per realization). Realizations run in parallel with
//! rayon and are reduced in index order.

use rayon::prelude::*;

use crate::percolation::UnionFind;
use crate::progress::Progress;
use crate::rng::{hash, hit, key, Stage};
use crate::seed::Cascade;
use crate::stats::{mean_ci, Estimate};

/// Reach per realization of each prefix of one seed list.
#[derive(Clone, Debug, PartialEq)]
pub struct ReachSamples {
    /// `per_k[k - 1][r]` = adopters in realization `r` with the first `k` seeds.
    pub per_k: Vec<Vec<f64>>,
}

impl ReachSamples {
    /// Expected reach with the first `k` seeds (mean and 95% t-interval).
    pub fn estimate(&self, k: usize) -> Estimate {
        if k == 0 {
            return Estimate::exact(0.0);
        }
        mean_ci(&self.per_k[k - 1])
    }

    /// Expected reach with all seeds.
    pub fn total(&self) -> Estimate {
        self.estimate(self.per_k.len())
    }
}

struct Scratch {
    uf: UnionFind,
    stamp: Vec<u32>,
    generation: u32,
    queue: Vec<u32>,
}

impl Scratch {
    fn new(n: usize, symmetric: bool) -> Scratch {
        Scratch {
            uf: UnionFind::new(if symmetric { n } else { 0 }),
            stamp: vec![0; n],
            generation: 0,
            queue: Vec::new(),
        }
    }

    fn next_generation(&mut self) -> u32 {
        if self.generation == u32::MAX {
            self.stamp.fill(0);
            self.generation = 0;
        }
        self.generation += 1;
        self.generation
    }
}

/// Per-edge thresholds of a symmetric cascade, by edge index.
fn edge_thresholds(c: &Cascade<'_>) -> Vec<u64> {
    let net = c.network();
    let (offsets, targets, eids) = net.out_rows();
    let thr = c.out_thresholds();
    let mut by_edge = vec![0u64; net.edge_count()];
    for v in 0..net.node_count() {
        for i in offsets[v] as usize..offsets[v + 1] as usize {
            if (v as u32) < targets[i] {
                by_edge[eids[i] as usize] = thr[i];
            }
        }
    }
    by_edge
}

/// Adopters reached from `seeds` (prefix by prefix) in one realization by
/// BFS over live out-arcs; `out[k]` = reach of the first `k + 1` seeds.
fn bfs_curve(c: &Cascade<'_>, k: u64, seeds: &[u32], sc: &mut Scratch, out: &mut Vec<u32>) {
    let net = c.network();
    let (offsets, targets, eids) = net.out_rows();
    let thr = c.out_thresholds();
    let g = sc.next_generation();
    let mut total = 0u32;
    for &s in seeds {
        if sc.stamp[s as usize] != g && !c.is_blocked(s) {
            sc.stamp[s as usize] = g;
            sc.queue.clear();
            sc.queue.push(s);
            total += 1;
            let mut head = 0;
            while head < sc.queue.len() {
                let v = sc.queue[head];
                head += 1;
                for i in offsets[v as usize] as usize..offsets[v as usize + 1] as usize {
                    let w = targets[i];
                    if sc.stamp[w as usize] == g || c.is_blocked(w) {
                        continue;
                    }
                    if hit(thr[i], hash(k, c.coin_index(eids[i], v, w))) {
                        sc.stamp[w as usize] = g;
                        sc.queue.push(w);
                        total += 1;
                    }
                }
            }
        }
        out.push(total);
    }
}

/// Reach of every prefix of every seed list in realizations `0..runs`.
///
/// Realization `r` uses the arc coins `hash(key(seed, Stage::Edge, r), c)`
/// for every list, so differences between lists are paired. Seeds that
/// already adopted are skipped (they add nothing).
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// use spreadplan::seed::{reach_samples, Cascade, CascadeModel};
/// use spreadplan::progress::Silent;
/// // path 0 - 1 - 2 with p = 1: one seed reaches all three.
/// let (net, _) = Network::from_edges(3, false, vec![(0, 1), (1, 2)], None,
///     WeightMerge::Max).unwrap();
/// let c = Cascade::new(&net, &CascadeModel::Uniform { p: 1.0 }, &[]).unwrap();
/// let s = reach_samples(&c, &[vec![0, 2]], 10, 1, &Silent);
/// assert_eq!(s[0].estimate(1).mean, 3.0);
/// assert_eq!(s[0].estimate(2).mean, 3.0);
/// ```
pub fn reach_samples(
    c: &Cascade<'_>,
    seed_lists: &[Vec<u32>],
    runs: u32,
    seed: u64,
    progress: &dyn Progress,
) -> Vec<ReachSamples> {
    let net = c.network();
    let n = net.node_count();
    let symmetric = c.is_symmetric();
    let by_edge = if symmetric { edge_thresholds(c) } else { Vec::new() };
    progress.phase("evaluating seed sets", u64::from(runs));
    let per_run: Vec<Vec<Vec<u32>>> = (0..runs)
        .into_par_iter()
        .map_init(
            || Scratch::new(n, symmetric),
            |sc, r| {
                let k = key(seed, Stage::Edge, u64::from(r));
                let mut lists = Vec::with_capacity(seed_lists.len());
                if symmetric {
                    sc.uf.reset();
                    for (e, &[a, b]) in net.edges().iter().enumerate() {
                        if c.is_blocked(a) || c.is_blocked(b) {
                            continue;
                        }
                        if hit(by_edge[e], hash(k, e as u64)) {
                            sc.uf.union(a, b);
                        }
                    }
                    for seeds in seed_lists {
                        let g = sc.next_generation();
                        let mut total = 0u32;
                        let mut out = Vec::with_capacity(seeds.len());
                        for &s in seeds {
                            if !c.is_blocked(s) {
                                let root = sc.uf.find(s);
                                if sc.stamp[root as usize] != g {
                                    sc.stamp[root as usize] = g;
                                    total += sc.uf.component_size(root);
                                }
                            }
                            out.push(total);
                        }
                        lists.push(out);
                    }
                } else {
                    for seeds in seed_lists {
                        let mut out = Vec::with_capacity(seeds.len());
                        bfs_curve(c, k, seeds, sc, &mut out);
                        lists.push(out);
                    }
                }
                progress.advance(1);
                lists
            },
        )
        .collect();
    progress.finish();
    seed_lists
        .iter()
        .enumerate()
        .map(|(i, seeds)| ReachSamples {
            per_k: (0..seeds.len())
                .map(|j| per_run.iter().map(|run| f64::from(run[i][j])).collect())
                .collect(),
        })
        .collect()
}

/// Expected reach of one seed set with its 95% interval (see [`reach_samples`]).
pub fn expected_reach(c: &Cascade<'_>, seeds: &[u32], runs: u32, seed: u64) -> Estimate {
    reach_samples(c, &[seeds.to_vec()], runs, seed, &crate::progress::Silent)[0].total()
}
