//! The `degree-discount` rule (Chen, Wang & Yang 2009, "Efficient influence
//! maximization in social networks", KDD, algorithm DegreeDiscountIC).
//!
//! Each candidate `v` starts with `dd_v = d_v` (its degree; out-degree when
//! directed) and `t_v = 0`. Repeatedly the candidate with the largest
//! `dd_v` (ties: smaller index) becomes a seed `u`; for every contact `v`
//! of `u` that is not a seed, `t_v ← t_v + 1` (one more seed neighbour)
//! and `dd_v ← d_v − 2 t_v − (d_v − t_v) · t_v · p`.
//!
//! The paper assumes one uniform probability `p`. For per-edge
//! probabilities or the weighted cascade we use for `p` the mean
//! probability over all arcs (stated in the study's notes); with uniform
//! `p` the rule is exactly the published one. Directed: `t_v` counts the
//! seeds that can influence `v` (its seeded in-neighbours), and the update
//! runs over the seed's out-neighbours.

use crate::seed::Cascade;

/// The `p` that degree discount uses: the mean arc probability.
pub fn discount_probability(c: &Cascade<'_>) -> f64 {
    let p = c.out_probabilities();
    if p.is_empty() {
        0.0
    } else {
        p.iter().map(|&x| f64::from(x)).sum::<f64>() / p.len() as f64
    }
}

/// `k` seeds by DegreeDiscountIC with probability `p` (see the module doc).
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// use spreadplan::seed::{degree_discount_seeds, Cascade, CascadeModel};
/// // Star centre 0 with leaves 1,2,3; leaf 3 also knows 4 and 5.
/// let (net, _) = Network::from_edges(6, false, vec![(0, 1), (0, 2), (0, 3), (3, 4), (3, 5)],
///     None, WeightMerge::Max).unwrap();
/// let c = Cascade::new(&net, &CascadeModel::Uniform { p: 0.5 }, &[]).unwrap();
/// // d: 0→3, 3→3. Pick 0 (tie, smaller index); then dd_3 = 3 − 2 − (3 − 1)·1·0.5 = 0,
/// // while dd_1 = dd_2 = 1 − 2 − 0 = −1 and dd_4 = dd_5 = 1: node 4 is next.
/// assert_eq!(degree_discount_seeds(&c, 2, 0.5), vec![0, 4]);
/// ```
pub fn degree_discount_seeds(c: &Cascade<'_>, k: usize, p: f64) -> Vec<u32> {
    let net = c.network();
    let n = net.node_count();
    let d: Vec<f64> = (0..n as u32).map(|v| net.degree(v) as f64).collect();
    let mut dd = d.clone();
    let mut t = vec![0f64; n];
    let mut chosen = vec![false; n];
    let mut seeds = Vec::with_capacity(k);
    for _ in 0..k {
        let mut best: Option<usize> = None;
        for v in 0..n {
            if chosen[v] || c.is_blocked(v as u32) {
                continue;
            }
            if best.is_none_or(|b| dd[v] > dd[b]) {
                best = Some(v);
            }
        }
        let Some(u) = best else { break };
        chosen[u] = true;
        seeds.push(u as u32);
        for &v in net.neighbors(u as u32) {
            let v = v as usize;
            if chosen[v] {
                continue;
            }
            t[v] += 1.0;
            dd[v] = d[v] - 2.0 * t[v] - (d[v] - t[v]) * t[v] * p;
        }
    }
    seeds
}
