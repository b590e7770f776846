//! Bond percolation on directed networks: outbreak probability from the
//! giant in-component and outbreak size from the giant out-component of
//! each live-edge realization (Newman, Strogatz & Watts 2001; Meyers,
//! Newman & Pourbohloul 2006; Kenah & Robins 2007).
//!
//! In realization `r` edge `u → v` transmits iff its coin falls under
//! `T_e` (the same coins as the undirected engine). The live-edge graph's
//! strongly connected components come from
//! [`strongly_connected_components`] (iterative Tarjan). With `G` the
//! largest one:
//!
//! - `giant_in_fraction = |GIN| / N`, GIN = the nodes that reach `G`
//!   (including `G`): an introduced case there starts a large outbreak, so
//!   this is `outbreak_probability`;
//! - `giant_out_fraction = |GOUT| / N`, GOUT = the nodes reached from `G`:
//!   the size of a large outbreak, reported as `giant_fraction`;
//! - `mean_outbreak_fraction` — the expected reach over `N` of one
//!   introduced case, computed by following the live edges from
//!   `cases_per_run` uniformly drawn cases per realization
//!   (`rng::key(seed, Stage::Eval, r)`); an unbiased estimate, not the
//!   large-outbreak product.
//!
//! A giant SCC smaller than the large-outbreak cut
//! ([`large_outbreak_min`](super::large_outbreak_min)) counts as no giant:
//! both fractions are 0 there.

use rayon::prelude::*;

use super::realization::{check_prob, large_outbreak_min, PercolationError, Transmissibility};
use crate::network::inspect::strongly_connected_components;
use crate::network::Network;
use crate::rng::{self, Stage};
use crate::stats::{mean_ci, Estimate};

/// The giant components of one directed live-edge realization.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct DirectedComponents {
    /// Size of the largest strongly connected component.
    pub giant_scc: u32,
    /// Nodes that reach it (0 if it is below the large cut).
    pub giant_in: u32,
    /// Nodes it reaches (0 if it is below the large cut).
    pub giant_out: u32,
    /// Mean over the drawn introduced cases of the nodes each reaches.
    pub mean_reach: f64,
}

/// Parameters of a directed curve.
#[derive(Clone, Debug, PartialEq)]
pub struct DirectedConfig {
    /// Realizations.
    pub runs: u64,
    /// Master seed.
    pub seed: u64,
    /// Introduced cases followed per realization for the mean outbreak size.
    pub cases_per_run: u32,
    /// Smallest giant SCC that counts (`None` = `large_outbreak_min(N)`).
    pub large_min: Option<u32>,
}

/// Averages over realizations at one transmissibility.
#[derive(Clone, Debug, PartialEq, serde::Serialize)]
pub struct DirectedPoint {
    /// Transmissibility of every edge.
    pub transmissibility: f64,
    /// `|GOUT| / N`, the size of a large outbreak.
    pub giant_fraction: Estimate,
    /// Expected reach over `N` of one random introduced case.
    pub mean_outbreak_fraction: Estimate,
    /// `|GIN| / N`.
    pub outbreak_probability: Estimate,
    /// Largest SCC over `N`.
    pub giant_scc_fraction: Estimate,
}

/// The live-edge components of realization `r` (module doc).
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// use spreadplan::percolation::{directed_realization, DirectedConfig, Transmissibility};
/// // 0 → 1 → 2 → 0 cycle, 3 → 0 feeds it, 2 → 4 drains it.
/// let e = vec![(0, 1), (1, 2), (2, 0), (3, 0), (2, 4)];
/// let (net, _) = Network::from_edges(5, true, e, None, WeightMerge::Max).unwrap();
/// let cfg = DirectedConfig { runs: 1, seed: 1, cases_per_run: 4, large_min: Some(3) };
/// let c = directed_realization(&net, &Transmissibility::Uniform(1.0), &cfg, 0).unwrap();
/// assert_eq!((c.giant_scc, c.giant_in, c.giant_out), (3, 4, 4));
/// ```
pub fn directed_realization(
    net: &Network,
    t: &Transmissibility,
    cfg: &DirectedConfig,
    r: u64,
) -> Result<DirectedComponents, PercolationError> {
    if !net.is_directed() {
        return Err(PercolationError::Undirected("directed percolation"));
    }
    t.validate(net)?;
    Ok(one(net, t, cfg, r))
}

fn one(net: &Network, t: &Transmissibility, cfg: &DirectedConfig, r: u64) -> DirectedComponents {
    let n = net.node_count();
    let thr = t.thresholds(net.edge_count());
    let key = rng::key(cfg.seed, Stage::Edge, r);
    let live: Vec<[u32; 2]> = net
        .edges()
        .iter()
        .enumerate()
        .filter(|(e, _)| thr.present(key, *e as u32))
        .map(|(_, &x)| x)
        .collect();
    let g = Network::from_sorted_unique(n as u32, true, live, None);
    let comps = strongly_connected_components(&g);
    let giant_scc = comps.largest() as u32;
    let large = cfg.large_min.unwrap_or_else(|| large_outbreak_min(n)).max(1);
    let mut seen = vec![false; n];
    let mut queue: Vec<u32> = Vec::new();
    let (mut giant_in, mut giant_out) = (0u32, 0u32);
    if giant_scc >= large && giant_scc > 0 {
        let id = comps.largest_id().expect("a non-empty network has a largest component");
        let members: Vec<u32> = (0..n as u32).filter(|&v| comps.of[v as usize] == id).collect();
        giant_out = reach(&g, &members, false, &mut seen, &mut queue);
        seen.fill(false);
        giant_in = reach(&g, &members, true, &mut seen, &mut queue);
    }
    let ekey = rng::key(cfg.seed, Stage::Eval, r);
    let mut total = 0u64;
    for i in 0..cfg.cases_per_run {
        if n == 0 {
            break;
        }
        let x = (rng::hash(ekey, i as u64) % n as u64) as u32;
        seen.fill(false);
        total += reach(&g, &[x], false, &mut seen, &mut queue) as u64;
    }
    let mean_reach =
        if cfg.cases_per_run == 0 { f64::NAN } else { total as f64 / cfg.cases_per_run as f64 };
    DirectedComponents { giant_scc, giant_in, giant_out, mean_reach }
}

/// Nodes reached from `start` along out-edges (`backward`: in-edges).
fn reach(g: &Network, start: &[u32], backward: bool, seen: &mut [bool], q: &mut Vec<u32>) -> u32 {
    q.clear();
    for &s in start {
        if !seen[s as usize] {
            seen[s as usize] = true;
            q.push(s);
        }
    }
    let mut head = 0;
    while head < q.len() {
        let v = q[head];
        head += 1;
        let next = if backward { g.in_neighbors(v) } else { g.neighbors(v) };
        for &w in next {
            if !seen[w as usize] {
                seen[w as usize] = true;
                q.push(w);
            }
        }
    }
    q.len() as u32
}

/// The directed percolation curve at uniform transmissibilities `points`,
/// realizations in parallel (results identical at any thread count).
pub fn directed_curve(
    net: &Network,
    cfg: &DirectedConfig,
    points: &[f64],
) -> Result<Vec<DirectedPoint>, PercolationError> {
    if !net.is_directed() {
        return Err(PercolationError::Undirected("directed percolation"));
    }
    if cfg.runs == 0 {
        return Err(PercolationError::TooSmall { what: "runs", value: 0, min: 1 });
    }
    for (i, &p) in points.iter().enumerate() {
        check_prob("transmissibility", p, Some(i))?;
    }
    let nf = net.node_count().max(1) as f64;
    let jobs: Vec<(usize, u64)> =
        (0..points.len()).flat_map(|j| (0..cfg.runs).map(move |r| (j, r))).collect();
    let res: Vec<DirectedComponents> = jobs
        .par_iter()
        .map(|&(j, r)| one(net, &Transmissibility::Uniform(points[j]), cfg, r))
        .collect();
    let runs = cfg.runs as usize;
    Ok(points
        .iter()
        .enumerate()
        .map(|(j, &t)| {
            let rows = &res[j * runs..(j + 1) * runs];
            let est = |f: &dyn Fn(&DirectedComponents) -> f64| {
                mean_ci(&rows.iter().map(f).collect::<Vec<_>>())
            };
            DirectedPoint {
                transmissibility: t,
                giant_fraction: est(&|c| c.giant_out as f64 / nf),
                mean_outbreak_fraction: est(&|c| c.mean_reach / nf),
                outbreak_probability: est(&|c| c.giant_in as f64 / nf),
                giant_scc_fraction: est(&|c| c.giant_scc as f64 / nf),
            }
        })
        .collect())
}

/// The configuration-model threshold of a directed network: `T_c =
/// ⟨k_in⟩ / ⟨k_in k_out⟩` (Newman, Strogatz & Watts 2001, PRE 64:026118:
/// a giant strongly connected component exists iff `T⟨jk⟩ > ⟨k⟩`, with
/// `j, k` the in- and out-degrees of a node); infinite when `⟨jk⟩ = 0`.
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// // Directed 3-cycle: every node has j = k = 1, so T_c = 1.
/// let (net, _) = Network::from_edges(3, true, vec![(0, 1), (1, 2), (2, 0)], None,
///     WeightMerge::Max).unwrap();
/// assert_eq!(spreadplan::percolation::directed_configuration_threshold(&net), 1.0);
/// ```
pub fn directed_configuration_threshold(net: &Network) -> f64 {
    let n = net.node_count() as u32;
    let (mut k, mut jk) = (0.0f64, 0.0f64);
    for v in 0..n {
        let (i, o) = (net.in_degree(v) as f64, net.degree(v) as f64);
        k += i;
        jk += i * o;
    }
    if jk > 0.0 {
        k / jk
    } else {
        f64::INFINITY
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::WeightMerge;

    #[test]
    fn bow_tie_by_hand() {
        // GSCC {0,1,2}; in-tendril 3 → 0 and 5 → 3; out-tendril 2 → 4; 6 isolated.
        let e = vec![(0, 1), (1, 2), (2, 0), (3, 0), (5, 3), (2, 4)];
        let (net, _) = Network::from_edges(7, true, e, None, WeightMerge::Max).unwrap();
        let cfg = DirectedConfig { runs: 3, seed: 2, cases_per_run: 50, large_min: Some(3) };
        let c = directed_realization(&net, &Transmissibility::Uniform(1.0), &cfg, 0).unwrap();
        assert_eq!((c.giant_scc, c.giant_in, c.giant_out), (3, 5, 4));
        // Exact mean reach at T = 1: reaches 0,1,2 → 4; 3 → 5; 4 → 1; 5 → 6; 6 → 1:
        // (4·3 + 5 + 1 + 6 + 1)/7 = 25/7; 50 draws estimate it.
        assert!((c.mean_reach - 25.0 / 7.0).abs() < 1.0, "{c:?}");
        let pts = directed_curve(&net, &cfg, &[0.0, 1.0]).unwrap();
        assert_eq!(pts[0].outbreak_probability.mean, 0.0);
        assert_eq!(pts[1].outbreak_probability.mean, 5.0 / 7.0);
        assert_eq!(pts[1].giant_fraction.mean, 4.0 / 7.0);
        assert_eq!(pts[0].mean_outbreak_fraction.mean, 1.0 / 7.0);
        let (u, _) = Network::from_edges(2, false, vec![(0, 1)], None, WeightMerge::Max).unwrap();
        assert!(directed_curve(&u, &cfg, &[0.5]).is_err());
    }
}
