//! The non-backtracking spectral radius with node occupation, used for
//! `r_eff`, `critical_transmissibility` and `doses_to_contain`.
//!
//! Message passing threshold of Karrer, Newman & Zdeborová (2014, PRL
//! 113:208702) with site occupation: on directed edges, `x'_{v→w} = T_vw
//! φ_w (S_v − x_{w→v})`, `S_v = Σ_u x_{u→v}`; `r_eff` is the spectral
//! radius of this map. For the configuration model it reduces to
//! `T Σ k(k−1) p_k φ_k / ⟨k⟩` (Callaway et al. 2000).

use crate::network::Network;

/// The result of a power iteration: estimate and Collatz–Wielandt bounds.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Radius {
    /// Spectral radius estimate.
    pub estimate: f64,
    /// Certified lower bound.
    pub lower: f64,
    /// Certified upper bound.
    pub upper: f64,
    /// Whether the bounds met the tolerance.
    pub converged: bool,
}

/// Spectral radius of the occupation-weighted non-backtracking matrix,
/// edge weights `t(e)` and node occupation `phi` (absent = 0).
///
/// Shifted power iteration on `A + I` (removes periodicity on bipartite
/// structures); bounds are Collatz–Wielandt `min/max ((A+I)x)_i / x_i − 1`
/// over the support, which stay valid at every step because `x > 0` there.
pub fn nb_radius(net: &Network, t: &dyn Fn(usize) -> f64, phi: &[f64], tol: f64) -> Radius {
    let (offsets, targets, edge_ids) = net.out_rows();
    let slots = targets.len();
    // Reverse slot of each slot: the slot of w→v for v→w.
    let mut rev = vec![0usize; slots];
    let n = net.node_count();
    for v in 0..n {
        let (a, b) = (offsets[v] as usize, offsets[v + 1] as usize);
        for s in a..b {
            let w = targets[s] as usize;
            let (c, d) = (offsets[w] as usize, offsets[w + 1] as usize);
            let row = &targets[c..d];
            let k = row.binary_search(&(v as u32)).unwrap_or_else(|_| {
                row.iter().position(|&x| x as usize == v).unwrap_or(0)
            });
            rev[s] = c + k;
        }
    }
    // Only the 2-core of the occupied subgraph (φ > 0, T_e > 0) matters:
    // trees hanging off it, and forests, are nilpotent blocks of the
    // non-backtracking matrix (Karrer, Newman & Zdeborová 2014 note the same
    // pruning), and leaving them in would make power iteration converge
    // only like 1/t.
    let mut in_core: Vec<bool> = phi.iter().map(|&p| p > 0.0).collect();
    let mut cdeg = vec![0u32; n];
    for v in 0..n {
        if in_core[v] {
            let (a, b) = (offsets[v] as usize, offsets[v + 1] as usize);
            cdeg[v] = (a..b)
                .filter(|&s| in_core[targets[s] as usize] && t(edge_ids[s] as usize) > 0.0)
                .count() as u32;
        }
    }
    let mut stack: Vec<usize> = (0..n).filter(|&v| in_core[v] && cdeg[v] < 2).collect();
    for &v in &stack {
        in_core[v] = false;
    }
    while let Some(v) = stack.pop() {
        let (a, b) = (offsets[v] as usize, offsets[v + 1] as usize);
        for s in a..b {
            let w = targets[s] as usize;
            if in_core[w] && t(edge_ids[s] as usize) > 0.0 {
                cdeg[w] -= 1;
                if cdeg[w] < 2 {
                    in_core[w] = false;
                    stack.push(w);
                }
            }
        }
    }
    // Weight of slot s (v→w): T_e φ_w, both ends in the core.
    let mut wgt = vec![0.0f64; slots];
    for v in 0..n {
        if !in_core[v] {
            continue;
        }
        let (a, b) = (offsets[v] as usize, offsets[v + 1] as usize);
        for s in a..b {
            let w = targets[s] as usize;
            if in_core[w] {
                wgt[s] = t(edge_ids[s] as usize) * phi[w];
            }
        }
    }
    let support: usize = wgt.iter().filter(|&&w| w > 0.0).count();
    if support == 0 {
        return Radius { estimate: 0.0, lower: 0.0, upper: 0.0, converged: true };
    }
    let mut x: Vec<f64> = wgt.iter().map(|&w| if w > 0.0 { 1.0 } else { 0.0 }).collect();
    let mut y = vec![0.0f64; slots];
    let mut sum_in = vec![0.0f64; n];
    let mut est = 0.0f64;
    let (mut lower, mut upper) = (0.0f64, f64::INFINITY);
    let mut converged = false;
    for it in 0..5000 {
        sum_in.fill(0.0);
        for s in 0..slots {
            sum_in[targets[s] as usize] += x[s];
        }
        let (mut lo, mut hi, mut sx, mut sy) = (f64::INFINITY, 0.0f64, 0.0, 0.0);
        for v in 0..n {
            let (a, b) = (offsets[v] as usize, offsets[v + 1] as usize);
            for s in a..b {
                if wgt[s] > 0.0 {
                    let ax = wgt[s] * (sum_in[v] - x[rev[s]]).max(0.0);
                    let yi = ax + x[s];
                    let r = yi / x[s];
                    lo = lo.min(r);
                    hi = hi.max(r);
                    sx += x[s];
                    sy += yi;
                    y[s] = yi;
                }
            }
        }
        let new_est = sy / sx - 1.0;
        lower = lower.max(lo - 1.0);
        upper = upper.min(hi - 1.0);
        let scale = 1.0 / (sy / support as f64);
        for s in 0..slots {
            x[s] = y[s] * scale;
        }
        let settled = it > 20 && (new_est - est).abs() <= 1e-12 * new_est.max(1.0);
        est = new_est;
        if upper - lower <= tol * est.max(1.0) {
            converged = true;
            break;
        }
        if settled {
            break;
        }
    }
    Radius { estimate: est.clamp(lower.max(0.0), upper), lower: lower.max(0.0), upper, converged }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::WeightMerge;

    #[test]
    fn complete_graph_radius_is_k_minus_one() {
        // K5: every non-backtracking walk has k − 1 = 3 continuations.
        let mut e = Vec::new();
        for i in 0..5 {
            for j in i + 1..5 {
                e.push((i, j));
            }
        }
        let net = Network::from_edges(5, false, e, None, WeightMerge::Max).unwrap().0;
        let r = nb_radius(&net, &|_| 1.0, &[1.0; 5], 1e-9);
        assert!((r.estimate - 3.0).abs() < 1e-6 && r.converged, "{r:?}");
        let r = nb_radius(&net, &|_| 0.5, &[1.0; 5], 1e-9);
        assert!((r.estimate - 1.5).abs() < 1e-6);
    }

    #[test]
    fn tree_radius_is_zero_and_cycle_is_one() {
        let net = Network::from_edges(4, false, vec![(0, 1), (0, 2), (0, 3)], None,
            WeightMerge::Max).unwrap().0;
        assert!(nb_radius(&net, &|_| 1.0, &[1.0; 4], 1e-9).upper < 1e-6);
        let net = Network::from_edges(4, false, vec![(0, 1), (1, 2), (2, 3), (3, 0)], None,
            WeightMerge::Max).unwrap().0;
        let r = nb_radius(&net, &|_| 1.0, &[1.0; 4], 1e-9);
        assert!((r.estimate - 1.0).abs() < 1e-6, "{r:?}");
    }
}
