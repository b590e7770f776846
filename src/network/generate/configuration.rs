//! The configuration model: a random multigraph with a given degree
//! sequence by uniform stub pairing, made simple by erasing self-loops and
//! multi-edges ("erased configuration model"; Molloy & Reed 1995, Britton,
//! Deijfen & Martin-Löf 2006). The erasures are counted, not hidden.

use super::{bad, GenerateError};
use crate::network::{BuildReport, Network, WeightMerge};
use crate::rng::{self, Stage};

/// A configuration-model network and what erasing removed.
#[derive(Clone, Debug)]
pub struct Erased {
    /// The simple network.
    pub network: Network,
    /// Self-loops dropped and multi-edges merged (each merged copy removes
    /// one edge, i.e. one stub at each endpoint; a self-loop removes two
    /// stubs of one node).
    pub report: BuildReport,
}

/// Pairs `degrees[v]` stubs of each node `v` uniformly at random (a
/// uniformly shuffled stub list read two at a time), then erases self-loops
/// and multi-edges.
///
/// Bender & Canfield (1978), Bollobás (1980), Molloy & Reed (1995). The
/// realized degree of `v` is `degrees[v]` minus its erased stubs, so
/// `Σ (degrees[v] − degree(v)) = 2 (self_loops_dropped + duplicates_merged)`.
/// An odd degree sum is an error (no pairing exists).
///
/// ```
/// use spreadplan::network::generate::configuration_model;
/// let g = configuration_model(&[3, 3, 3, 3], 1).unwrap();
/// let lost: usize = (0..4).map(|v| 3 - g.network.degree(v)).sum();
/// assert_eq!(lost as u64, 2 * (g.report.self_loops_dropped + g.report.duplicates_merged));
/// ```
pub fn configuration_model(degrees: &[u32], seed: u64) -> Result<Erased, GenerateError> {
    if degrees.len() > u32::MAX as usize {
        return Err(bad("n", degrees.len(), "exceeds the u32 node limit"));
    }
    let total: u64 = degrees.iter().map(|&d| d as u64).sum();
    if total % 2 == 1 {
        return Err(bad("degree sum", total, "must be even to pair every stub"));
    }
    if total / 2 > u32::MAX as u64 {
        return Err(bad("degree sum", total, "half of it exceeds the u32 edge limit"));
    }
    let mut stubs: Vec<u32> = Vec::with_capacity(total as usize);
    for (v, &d) in degrees.iter().enumerate() {
        stubs.extend(std::iter::repeat_n(v as u32, d as usize));
    }
    let mut rng = rng::stream(seed, Stage::Generate, 0);
    rng::shuffle(&mut rng, &mut stubs);
    let edges: Vec<(u32, u32)> = stubs.chunks_exact(2).map(|c| (c[0], c[1])).collect();
    drop(stubs);
    let (network, report) =
        Network::from_edges(degrees.len() as u32, false, edges, None, WeightMerge::First)
            .map_err(|e| bad("degrees", degrees.len(), e))?;
    Ok(Erased { network, report })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn odd_sum_is_an_error() {
        assert!(configuration_model(&[1, 2], 0).is_err());
        let g = configuration_model(&[], 0).unwrap();
        assert_eq!(g.network.node_count(), 0);
    }

    #[test]
    fn two_stubs_one_node_is_a_loop() {
        let g = configuration_model(&[2, 0], 0).unwrap();
        assert_eq!(g.network.edge_count(), 0);
        assert_eq!(g.report.self_loops_dropped, 1);
    }
}
