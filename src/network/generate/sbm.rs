//! The stochastic block model: nodes in blocks, each pair an edge
//! independently with the probability of its two blocks (Holland, Laskey &
//! Leinhardt 1983).

use super::{bad, check_edges, check_prob, geometric_skip, GenerateError};
use crate::network::{Groups, Network, NodeTable};
use crate::rng::{self, Stage};

/// A stochastic-block-model network and its node table (group = block,
/// named `block0`, `block1`, …).
#[derive(Clone, Debug)]
pub struct Blocks {
    /// The network; block `b` holds the nodes `Σ_{a<b} sizes[a] ..` in order.
    pub network: Network,
    /// Numbered ids with the block of each node as its group.
    pub nodes: NodeTable,
}

/// The stochastic block model with block `sizes` and a symmetric matrix
/// `probs` (`probs[a][b]` for a node of block `a` and one of `b`).
///
/// Each block pair is walked by geometric skipping (Batagelj & Brandes
/// 2005): the triangle of pairs inside a block, the rectangle between two
/// blocks. O(n + m + B²) expected time.
///
/// ```
/// use spreadplan::network::generate::stochastic_block_model;
/// let g = stochastic_block_model(&[3, 2], &[vec![1.0, 0.0], vec![0.0, 1.0]], 1).unwrap();
/// assert_eq!(g.network.edge_count(), 3 + 1);
/// assert_eq!(g.nodes.group_of(4), Some("block1"));
/// ```
pub fn stochastic_block_model(
    sizes: &[u32],
    probs: &[Vec<f64>],
    seed: u64,
) -> Result<Blocks, GenerateError> {
    let b = sizes.len();
    if probs.len() != b || probs.iter().any(|r| r.len() != b) {
        return Err(bad(
            "probs",
            format!("{} rows", probs.len()),
            format!("must be a {b}×{b} matrix"),
        ));
    }
    for (i, row) in probs.iter().enumerate() {
        for (j, &p) in row.iter().enumerate() {
            check_prob("probs", p)?;
            if p != probs[j][i] {
                return Err(bad("probs", format!("[{i}][{j}] = {p}"), "matrix must be symmetric"));
            }
        }
    }
    let n: u64 = sizes.iter().map(|&s| s as u64).sum();
    if n > u32::MAX as u64 {
        return Err(bad("sizes", n, "total exceeds the u32 node limit"));
    }
    let mut start = vec![0u64; b + 1];
    for i in 0..b {
        start[i + 1] = start[i] + sizes[i] as u64;
    }
    let mut expected = 0.0;
    for a in 0..b {
        for c in a..b {
            let (sa, sc) = (sizes[a] as f64, sizes[c] as f64);
            let pairs = if a == c { sa * (sa - 1.0) / 2.0 } else { sa * sc };
            expected += pairs * probs[a][c];
        }
    }
    check_edges("probs", format!("{probs:?}"), expected)?;
    let mut rng = rng::stream(seed, Stage::Generate, 0);
    let mut edges: Vec<[u32; 2]> = Vec::new();
    for a in 0..b {
        for c in a..b {
            let ln_q = (-probs[a][c]).ln_1p();
            let (sa, sc) = (sizes[a] as u64, sizes[c] as u64);
            if a == c {
                // Triangle: pairs (w, v), w < v, row-major, as in `gnp`.
                let pairs = sa * sa.saturating_sub(1) / 2;
                if pairs == 0 {
                    continue;
                }
                let (mut w, mut v) = (0u64, 1u64);
                loop {
                    let skip = geometric_skip(&mut rng, ln_q);
                    if skip >= pairs as f64 {
                        break;
                    }
                    v += skip as u64;
                    while v >= sa && w + 1 < sa {
                        v = v - sa + w + 2;
                        w += 1;
                    }
                    if v >= sa || w + 1 >= sa {
                        break;
                    }
                    edges.push([(start[a] + w) as u32, (start[a] + v) as u32]);
                    v += 1;
                }
            } else {
                // Rectangle: index t over sa × sc, row-major.
                let pairs = sa * sc;
                let mut t = 0u64;
                loop {
                    let skip = geometric_skip(&mut rng, ln_q);
                    if skip >= (pairs - t) as f64 {
                        break;
                    }
                    t += skip as u64;
                    edges.push([(start[a] + t / sc) as u32, (start[c] + t % sc) as u32]);
                    t += 1;
                    if t >= pairs {
                        break;
                    }
                }
            }
        }
    }
    edges.sort_unstable();
    let network = Network::from_sorted_unique(n as u32, false, edges, None);
    let mut nodes = NodeTable::numbered(n as usize);
    let mut of = Vec::with_capacity(n as usize);
    for (i, &s) in sizes.iter().enumerate() {
        of.extend(std::iter::repeat_n(i as u32, s as usize));
    }
    nodes.groups = Some(Groups { names: (0..b).map(|i| format!("block{i}")).collect(), of });
    Ok(Blocks { network, nodes })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn complete_bipartite_between_blocks() {
        let g = stochastic_block_model(&[3, 4], &[vec![0.0, 1.0], vec![1.0, 0.0]], 2).unwrap();
        assert_eq!(g.network.edge_count(), 12);
        assert!(g.network.edges().iter().all(|e| e[0] < 3 && e[1] >= 3));
    }

    #[test]
    fn rejects_asymmetric() {
        assert!(stochastic_block_model(&[2, 2], &[vec![0.1, 0.2], vec![0.3, 0.1]], 0).is_err());
        assert!(stochastic_block_model(&[2], &[vec![0.1, 0.2]], 0).is_err());
    }

    #[test]
    fn block_densities() {
        let g = stochastic_block_model(&[1000, 1000], &[vec![0.01, 0.001], vec![0.001, 0.01]], 5)
            .unwrap();
        let (mut inside, mut across) = (0u64, 0u64);
        for e in g.network.edges() {
            if (e[0] < 1000) == (e[1] < 1000) {
                inside += 1
            } else {
                across += 1
            }
        }
        // expected 2 * 0.01 * 499_500 = 9990 (sd ≈ 99) and 0.001 * 10^6 = 1000 (sd ≈ 32)
        assert!((inside as f64 - 9990.0).abs() < 500.0, "{inside}");
        assert!((across as f64 - 1000.0).abs() < 160.0, "{across}");
    }
}
