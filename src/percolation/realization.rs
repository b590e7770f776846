//! Bond and site realizations from counter-based coins: the
//! [`Transmissibility`] of each contact, the typed [`PercolationError`] of
//! the engine, and the integer coin thresholds every hot loop compares
//! against.
//!
//! Edge `e` is present in realization `r` iff
//! `hit(threshold(T_e), hash(key(seed, Stage::Edge, r), e))`; the vaccine
//! given to node `v` takes iff
//! `hit(threshold(efficacy), hash(key(seed, Stage::Node, r), v))`
//! (see [`crate::rng`]). The coins depend on `(seed, r, index)` only, so every
//! rule sees the same coins (common random numbers) and the result does not
//! depend on the thread count. Component bookkeeping is
//! [`UnionFind`](super::UnionFind); curves over budgets are
//! [`budget_curve`](super::budget_curve).

use crate::network::Network;
use crate::rng::{self, Stage};

/// Probability that a contact transmits (bond occupation probability).
#[derive(Clone, Debug, PartialEq)]
pub enum Transmissibility {
    /// The same `T` on every edge.
    Uniform(f64),
    /// `T_e` per edge index (aligned with [`Network::edges`]).
    PerEdge(Vec<f64>),
}

impl Transmissibility {
    /// Checks every value lies in `[0, 1]` and, per edge, that there is one
    /// value per edge of `net`.
    pub fn validate(&self, net: &Network) -> Result<(), PercolationError> {
        match self {
            Transmissibility::Uniform(t) => check_prob("transmissibility", *t, None),
            Transmissibility::PerEdge(v) => {
                if v.len() != net.edge_count() {
                    return Err(PercolationError::EdgeCount {
                        given: v.len(),
                        edges: net.edge_count(),
                    });
                }
                for (e, &t) in v.iter().enumerate() {
                    check_prob("transmissibility", t, Some(e))?;
                }
                Ok(())
            }
        }
    }

    /// `T_e` of edge `e`.
    #[inline]
    pub fn of(&self, e: usize) -> f64 {
        match self {
            Transmissibility::Uniform(t) => *t,
            Transmissibility::PerEdge(v) => v[e],
        }
    }

    /// The integer coin thresholds ([`rng::threshold`]) for `m` edges.
    pub fn thresholds(&self, m: usize) -> EdgeThresholds {
        match self {
            Transmissibility::Uniform(t) => EdgeThresholds::Uniform(rng::threshold(*t)),
            Transmissibility::PerEdge(v) => {
                EdgeThresholds::PerEdge(v.iter().take(m).map(|&t| rng::threshold(t)).collect())
            }
        }
    }
}

/// Precomputed integer thresholds of the edge coins.
#[derive(Clone, Debug, PartialEq)]
pub enum EdgeThresholds {
    /// One threshold for every edge.
    Uniform(u64),
    /// One threshold per edge.
    PerEdge(Vec<u64>),
}

impl EdgeThresholds {
    /// Whether edge `e` is present under the realization key `key`
    /// (`rng::key(seed, Stage::Edge, r)`).
    #[inline]
    pub fn present(&self, key: u64, e: u32) -> bool {
        let t = match self {
            EdgeThresholds::Uniform(t) => *t,
            EdgeThresholds::PerEdge(v) => v[e as usize],
        };
        rng::hit(t, rng::hash(key, e as u64))
    }
}

/// Why a percolation computation cannot run.
#[derive(Debug, thiserror::Error, PartialEq)]
pub enum PercolationError {
    /// A probability outside `[0, 1]` (or NaN).
    #[error("{what} must lie in [0, 1], got {value}{}", edge_suffix(*index))]
    Probability {
        /// Which parameter.
        what: &'static str,
        /// The bad value.
        value: f64,
        /// The edge or node index, when per edge or node.
        index: Option<usize>,
    },
    /// Per-edge values of the wrong length.
    #[error("{given} per-edge values given for {edges} edges")]
    EdgeCount {
        /// Values given.
        given: usize,
        /// Edges of the network.
        edges: usize,
    },
    /// Per-node values of the wrong length.
    #[error("{given} per-node values given for {nodes} nodes")]
    NodeCount {
        /// Values given.
        given: usize,
        /// Nodes of the network.
        nodes: usize,
    },
    /// A node index in an order is not below the node count.
    #[error("order entry {position}: node {node} is not below the node count {nodes}")]
    NodeOutOfRange {
        /// Position in the order.
        position: usize,
        /// The bad index.
        node: u32,
        /// Node count.
        nodes: usize,
    },
    /// The computation needs an undirected network.
    #[error("{0} needs an undirected network; use the directed variant")]
    Directed(&'static str),
    /// The computation needs a directed network.
    #[error("{0} needs a directed network")]
    Undirected(&'static str),
    /// A relative tolerance outside `(0, 1)` (or NaN).
    #[error("tolerance must lie in (0, 1), got {0}")]
    Tolerance(f64),
    /// A count parameter is out of range.
    #[error("{what} must be at least {min}, got {value}")]
    TooSmall {
        /// Which parameter.
        what: &'static str,
        /// The bad value.
        value: u64,
        /// The smallest allowed.
        min: u64,
    },
}

fn edge_suffix(i: Option<usize>) -> String {
    i.map(|i| format!(" at index {i}")).unwrap_or_default()
}

/// Checks a probability in `[0, 1]`.
pub(crate) fn check_prob(
    what: &'static str,
    value: f64,
    index: Option<usize>,
) -> Result<(), PercolationError> {
    if (0.0..=1.0).contains(&value) {
        Ok(())
    } else {
        Err(PercolationError::Probability { what, value, index })
    }
}

/// The present edges of bond realization `r`, as one flag per edge index.
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// use spreadplan::percolation::{bond_realization, Transmissibility};
/// let (net, _) = Network::from_edges(3, false, vec![(0, 1), (1, 2)], None, WeightMerge::Max).unwrap();
/// assert_eq!(bond_realization(&net, &Transmissibility::Uniform(1.0), 7, 0).unwrap(), vec![true, true]);
/// assert_eq!(bond_realization(&net, &Transmissibility::Uniform(0.0), 7, 0).unwrap(), vec![false, false]);
/// ```
pub fn bond_realization(
    net: &Network,
    t: &Transmissibility,
    seed: u64,
    realization: u64,
) -> Result<Vec<bool>, PercolationError> {
    t.validate(net)?;
    let thr = t.thresholds(net.edge_count());
    let key = rng::key(seed, Stage::Edge, realization);
    Ok((0..net.edge_count() as u32).map(|e| thr.present(key, e)).collect())
}

/// Whether the vaccine given to node `v` takes in realization `r`
/// (`efficacy_threshold = rng::threshold(efficacy)`).
#[inline]
pub fn dose_takes(seed: u64, realization: u64, efficacy_threshold: u64, v: u32) -> bool {
    rng::hit(efficacy_threshold, rng::hash(rng::key(seed, Stage::Node, realization), v as u64))
}

/// The size from which a component counts as a large outbreak on `n`
/// nodes: `max(2, ⌈√n⌉)`. Below the threshold, components of sparse random
/// networks are O(log n); above it the giant component is Θ(n), so any
/// cut between the two separates them as n grows (Erdős & Rényi 1960;
/// the √n cut itself is common practice, no source). It is fixed before a
/// run, so the count of nodes in large components is updated in O(1) per
/// union.
///
/// ```
/// assert_eq!(spreadplan::percolation::large_outbreak_min(1_000_000), 1000);
/// assert_eq!(spreadplan::percolation::large_outbreak_min(4), 2);
/// ```
pub fn large_outbreak_min(n: usize) -> u32 {
    let mut s = (n as f64).sqrt().ceil() as u64;
    while s * s < n as u64 {
        s += 1;
    }
    while s > 1 && (s - 1) * (s - 1) >= n as u64 {
        s -= 1;
    }
    s.clamp(2, u32::MAX as u64) as u32
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::WeightMerge;

    #[test]
    fn validation_rejects_bad_values() {
        let (net, _) =
            Network::from_edges(3, false, vec![(0, 1), (1, 2)], None, WeightMerge::Max).unwrap();
        assert!(Transmissibility::Uniform(1.2).validate(&net).is_err());
        assert!(Transmissibility::Uniform(f64::NAN).validate(&net).is_err());
        assert!(Transmissibility::PerEdge(vec![0.5]).validate(&net).is_err());
        let e = Transmissibility::PerEdge(vec![0.5, -0.1]).validate(&net).unwrap_err();
        assert_eq!(e.to_string(), "transmissibility must lie in [0, 1], got -0.1 at index 1");
        assert!(Transmissibility::PerEdge(vec![0.5, 1.0]).validate(&net).is_ok());
    }

    #[test]
    fn large_min_is_ceil_sqrt() {
        assert_eq!(large_outbreak_min(0), 2);
        assert_eq!(large_outbreak_min(10), 4);
        assert_eq!(large_outbreak_min(16), 4);
        assert_eq!(large_outbreak_min(17), 5);
    }
}
