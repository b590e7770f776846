//! The Watts–Strogatz small-world model (Watts & Strogatz 1998).

use super::{bad, check_edges, check_prob, GenerateError};
use crate::network::{Network, WeightMerge};
use crate::rng::{self, Stage};
use rand::Rng;

/// A Watts–Strogatz network: a ring of `n` nodes each joined to its `k/2`
/// nearest neighbours on either side (`k` even, `k < n`), then each edge
/// `(u, u + j)` is rewired with probability `beta` to `(u, w)`, `w` uniform
/// among the nodes that are neither `u` nor already joined to `u`.
///
/// Watts & Strogatz (1998), "Collective dynamics of 'small-world'
/// networks": edges are visited lap by lap (`j = 1 … k/2`, then `u` around
/// the ring). The edge count `nk/2` is preserved.
///
/// ```
/// use spreadplan::network::generate::watts_strogatz;
/// let ring = watts_strogatz(10, 4, 0.0, 1).unwrap();
/// assert_eq!(ring.neighbors(0), &[1, 2, 8, 9]);
/// assert_eq!(watts_strogatz(100, 6, 0.3, 1).unwrap().edge_count(), 300);
/// ```
pub fn watts_strogatz(n: u32, k: u32, beta: f64, seed: u64) -> Result<Network, GenerateError> {
    check_prob("beta", beta)?;
    if k % 2 == 1 {
        return Err(bad("k", k, "must be even"));
    }
    if k > 0 && k >= n {
        return Err(bad("k", k, format!("must be below n = {n}")));
    }
    check_edges("k", k, n as f64 * k as f64 / 2.0)?;
    let half = k / 2;
    let nn = n as usize;
    let mut adj: Vec<Vec<u32>> = vec![Vec::with_capacity(k as usize + 2); nn];
    for u in 0..n {
        for j in 1..=half {
            let v = (u + j) % n;
            adj[u as usize].push(v);
            adj[v as usize].push(u);
        }
    }
    let mut rng = rng::stream(seed, Stage::Generate, 0);
    for j in 1..=half {
        for u in 0..n {
            let v = (u + j) % n;
            if !adj[u as usize].contains(&v) || rng.random::<f64>() >= beta {
                continue;
            }
            if adj[u as usize].len() + 1 >= nn {
                continue; // u is joined to everyone: nowhere to go
            }
            let w = loop {
                let w = rng::below(&mut rng, n as u64) as u32;
                if w != u && !adj[u as usize].contains(&w) {
                    break w;
                }
            };
            remove(&mut adj[u as usize], v);
            remove(&mut adj[v as usize], u);
            adj[u as usize].push(w);
            adj[w as usize].push(u);
        }
    }
    let mut edges: Vec<(u32, u32)> = Vec::with_capacity(nn * half as usize);
    for (u, row) in adj.iter().enumerate() {
        edges.extend(row.iter().filter(|&&v| (u as u32) < v).map(|&v| (u as u32, v)));
    }
    let (net, _) = Network::from_edges(n, false, edges, None, WeightMerge::First)
        .map_err(|e| bad("n", n, e))?;
    Ok(net)
}

fn remove(row: &mut Vec<u32>, x: u32) {
    if let Some(i) = row.iter().position(|&y| y == x) {
        row.swap_remove(i);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn full_rewiring_keeps_edges() {
        let net = watts_strogatz(50, 4, 1.0, 2).unwrap();
        assert_eq!(net.edge_count(), 100);
        assert!(watts_strogatz(10, 3, 0.1, 0).is_err());
        assert!(watts_strogatz(4, 4, 0.1, 0).is_err());
    }
}
