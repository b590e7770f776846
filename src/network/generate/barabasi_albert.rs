//! The Barabási–Albert preferential-attachment model (Barabási & Albert
//! 1999).

use super::{bad, GenerateError};
use crate::network::{Network, WeightMerge};
use crate::rng::{self, Stage};

/// A Barabási–Albert network on `n` nodes: start from the complete graph on
/// `m + 1` nodes, then each new node joins `m` distinct earlier nodes, each
/// chosen with probability proportional to its degree.
///
/// Barabási & Albert (1999), "Emergence of scaling in random networks".
/// Degree-proportional choice draws a uniform entry of the list of all edge
/// endpoints so far (each node appears once per incident edge); repeats are
/// redrawn. Edges: `m(m + 1)/2 + m(n − m − 1)`. The limiting degree law is
/// `p_k = 2m(m + 1) / (k(k + 1)(k + 2))` for `k >= m` (Dorogovtsev, Mendes &
/// Samukhin 2000; Bollobás, Riordan, Spencer & Tusnády 2001).
///
/// ```
/// let net = spreadplan::network::generate::barabasi_albert(100, 3, 1).unwrap();
/// assert_eq!(net.edge_count(), 6 + 3 * 96);
/// ```
pub fn barabasi_albert(n: u32, m: u32, seed: u64) -> Result<Network, GenerateError> {
    if m == 0 {
        return Err(bad("m", m, "must be at least 1"));
    }
    if m >= n {
        return Err(bad("m", m, format!("must be below n = {n}")));
    }
    let m0 = m + 1;
    let total = m as u64 * (m as u64 + 1) / 2 + m as u64 * (n - m0) as u64;
    if total > u32::MAX as u64 {
        return Err(bad("m", m, "the edge count exceeds the u32 edge limit"));
    }
    let mut edges: Vec<(u32, u32)> = Vec::with_capacity(total as usize);
    let mut ends: Vec<u32> = Vec::with_capacity(2 * total as usize);
    for u in 0..m0 {
        for v in u + 1..m0 {
            edges.push((u, v));
            ends.extend([u, v]);
        }
    }
    let mut rng = rng::stream(seed, Stage::Generate, 0);
    let mut targets: Vec<u32> = Vec::with_capacity(m as usize);
    for v in m0..n {
        targets.clear();
        while targets.len() < m as usize {
            let t = ends[rng::below(&mut rng, ends.len() as u64) as usize];
            if !targets.contains(&t) {
                targets.push(t);
            }
        }
        for &t in &targets {
            edges.push((t, v));
            ends.extend([t, v]);
        }
    }
    let (net, _) = Network::from_edges(n, false, edges, None, WeightMerge::First)
        .map_err(|e| bad("n", n, e))?;
    Ok(net)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn minimum_degree_is_m() {
        let net = barabasi_albert(500, 2, 3).unwrap();
        assert!((0..500).all(|v| net.degree(v) >= 2));
        assert!(barabasi_albert(3, 3, 0).is_err());
        assert_eq!(barabasi_albert(2, 1, 0).unwrap().edge_count(), 1);
    }
}
