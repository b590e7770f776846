//! The Chung–Lu model: independent edges with probability
//! `min(1, w_u w_v / Σw)` for expected degrees `w` (Chung & Lu 2002).

use super::{bad, check_edges, GenerateError};
use crate::network::{Network, WeightMerge};
use crate::rng::{self, Stage};
use rand::Rng;

/// A Chung–Lu graph: pair `{u, v}` (`u ≠ v`) is an edge independently with
/// probability `min(1, w_u w_v / S)`, `S = Σ w`, so node `v` has expected
/// degree close to `w_v` (exactly `w_v − w_v²/S` for `max w² ≤ S`, the
/// missing self-pair).
///
/// Chung & Lu (2002), "Connected components in random graphs with given
/// expected degree sequences". O(n log n + m) expected time by the method of
/// Miller & Hagberg (2011), "Efficient generation of networks with given
/// expected degrees": with weights sorted decreasingly, the probability
/// along a row only falls, so the row is walked by geometric skips at the
/// current probability `p` and each landing is kept with probability `q/p`
/// (`q` the true probability there) — thinning, which gives every pair its
/// exact probability.
///
/// ```
/// use spreadplan::network::generate::chung_lu;
/// // all weights n-1 on n nodes with S = n(n-1): p = (n-1)/n for every pair
/// let net = chung_lu(&[4.0; 5], 1).unwrap();
/// assert!(net.edge_count() <= 10);
/// assert_eq!(chung_lu(&[0.0; 5], 1).unwrap().edge_count(), 0);
/// ```
pub fn chung_lu(weights: &[f64], seed: u64) -> Result<Network, GenerateError> {
    if weights.len() > u32::MAX as usize {
        return Err(bad("n", weights.len(), "exceeds the u32 node limit"));
    }
    if let Some(w) = weights.iter().find(|w| !w.is_finite() || **w < 0.0) {
        return Err(bad("expected degree", w, "must be finite and non-negative"));
    }
    let n = weights.len();
    let total: f64 = weights.iter().sum();
    check_edges("expected degrees", format!("sum {total}"), total / 2.0)?;
    let mut order: Vec<u32> = (0..n as u32).collect();
    // Decreasing weight; ties by index for determinism.
    order.sort_by(|&a, &b| weights[b as usize].total_cmp(&weights[a as usize]).then(a.cmp(&b)));
    let w: Vec<f64> = order.iter().map(|&v| weights[v as usize]).collect();
    let mut rng = rng::stream(seed, Stage::Generate, 0);
    let mut edges: Vec<(u32, u32)> = Vec::with_capacity((total / 2.0 * 1.05) as usize + 16);
    if total > 0.0 {
        for u in 0..n {
            if w[u] == 0.0 {
                break;
            }
            let mut v = u + 1;
            let mut p = (w[u] * w.get(v).copied().unwrap_or(0.0) / total).min(1.0);
            while v < n && p > 0.0 {
                if p < 1.0 {
                    let r: f64 = rng.random::<f64>();
                    let skip = ((-r).ln_1p() / (-p).ln_1p()).floor();
                    if skip >= (n - v) as f64 {
                        break;
                    }
                    v += skip as usize;
                }
                let q = (w[u] * w[v] / total).min(1.0);
                let r: f64 = rng.random::<f64>();
                if r < q / p {
                    edges.push((order[u], order[v]));
                }
                p = q;
                v += 1;
            }
        }
    }
    let (net, _) = Network::from_edges(n as u32, false, edges, None, WeightMerge::First)
        .map_err(|e| bad("weights", n, e))?;
    Ok(net)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn saturated_weights_give_complete_graph() {
        // w_u w_v / S >= 1 for every pair: the complete graph.
        let net = chung_lu(&[10.0; 6], 0).unwrap();
        assert_eq!(net.edge_count(), 15);
    }

    #[test]
    fn mean_degree_close_to_weights() {
        let w: Vec<f64> = (0..20_000).map(|i| if i % 2 == 0 { 2.0 } else { 8.0 }).collect();
        let net = chung_lu(&w, 4).unwrap();
        // expected edges ≈ S/2 = 50_000, sd ≈ sqrt(50_000) ≈ 224
        assert!((net.edge_count() as f64 - 50_000.0).abs() < 1_500.0, "{}", net.edge_count());
        let heavy: f64 = (1..20_000).step_by(2).map(|v| net.degree(v) as f64).sum::<f64>() / 1e4;
        assert!((heavy - 8.0).abs() < 0.15, "{heavy}");
    }

    #[test]
    fn rejects_negative() {
        assert!(chung_lu(&[1.0, -1.0], 0).is_err());
    }
}
