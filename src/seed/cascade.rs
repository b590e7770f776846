//! The independent cascade model (Kempe, Kleinberg & Tardos 2003) as
//! per-arc live-edge coins: which arcs can carry adoption, with which
//! probability, and which coin decides them in each realization.
//!
//! Owns the model (uniform probability, per-edge probabilities, weighted
//! cascade), the treatment of people who already adopted, and the coin of
//! every arc. Evaluation is `seed::evaluate`, reverse-reachable sets are
//! `seed::rr_sets`.
//!
//! * An arc `u → v` is live in realization `r` iff
//!   `hit(threshold(p_uv), hash(key(seed, Stage::Edge, r), c))`, where `c`
//!   is the arc's coin index: the edge index when the network is directed,
//!   or undirected with symmetric probabilities (then one shared coin makes
//!   the edge live in both directions — bond percolation, as Kempe et al.
//!   note); `2e + (u > v)` for an undirected network with direction-dependent
//!   probabilities (weighted cascade), where the two directions have
//!   independent coins.
//! * People who already adopted (`exclude`) are removed from the cascade:
//!   they cannot be seeds, are not counted in the reach, and do not relay.
//!   In the independent cascade each adopter has exactly one chance to
//!   convince each contact, at the moment it adopts; for people who adopted
//!   before the campaign that chance has passed.

use serde::{Deserialize, Serialize};

use crate::network::Network;
use crate::rng::threshold;

/// Errors of the seeding module; messages show the bad value.
#[derive(Debug, thiserror::Error, PartialEq)]
pub enum SeedError {
    /// An adoption probability outside `[0, 1]`.
    #[error("adoption probability must be in [0, 1], got {0}")]
    Probability(f64),
    /// A per-edge probability outside `[0, 1]`.
    #[error("edge {edge} ({src} -> {dst}) has adoption probability {value}, outside [0, 1]")]
    EdgeProbability {
        /// Edge index.
        edge: usize,
        /// Source id.
        src: String,
        /// Target id.
        dst: String,
        /// The bad value.
        value: f64,
    },
    /// Per-edge probabilities requested but the network has no weights.
    #[error("the network has no probability column (load it with a weight column)")]
    NoProbabilities,
    /// The budget is 0 or exceeds the people who can be seeds.
    #[error("budget must be between 1 and {max} (people who can be seeds), got {budget}")]
    Budget {
        /// The requested budget.
        budget: usize,
        /// People who can be seeds.
        max: usize,
    },
    /// IMM's ε outside `(0, 1)`.
    #[error("epsilon must be in (0, 1), got {0}")]
    Epsilon(f64),
    /// IMM's ℓ not positive.
    #[error("ell must be positive, got {0}")]
    Ell(f64),
    /// No realizations.
    #[error("runs must be at least 1, got {0}")]
    Runs(u32),
    /// A rule name nobody knows.
    #[error("unknown seeding rule {name:?}; known rules: {known}")]
    UnknownRule {
        /// The bad name.
        name: String,
        /// The known names, comma separated.
        known: String,
    },
    /// No rules given.
    #[error("no seeding rules given")]
    NoRules,
    /// An excluded index outside the network.
    #[error("excluded node index {0} is outside the network")]
    Exclude(u32),
    /// Another bad setting.
    #[error("{field} = {value}: {reason}")]
    Config {
        /// Field name.
        field: String,
        /// Its value.
        value: String,
        /// Why it is bad.
        reason: String,
    },
    /// The LP solver failed.
    #[error("lp rule: {0}")]
    Lp(String),
}

/// How likely each arc is to carry adoption.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum CascadeModel {
    /// Every contact converts with the same probability `p`.
    Uniform {
        /// Adoption probability per contact, in `[0, 1]`.
        p: f64,
    },
    /// The network's edge weights are the probabilities (validated in `[0, 1]`).
    EdgeProbabilities,
    /// Weighted cascade: `p_uv = 1 / in-degree(v)` (Kempe et al. 2003).
    WeightedCascade,
}

impl CascadeModel {
    /// A short description for reports.
    pub fn describe(&self) -> String {
        match self {
            CascadeModel::Uniform { p } => format!("independent cascade, uniform p = {p}"),
            CascadeModel::EdgeProbabilities => {
                "independent cascade, per-edge probabilities from the probability column".into()
            }
            CascadeModel::WeightedCascade => {
                "weighted cascade, p(u->v) = 1 / in-degree(v) (Kempe et al. 2003)".into()
            }
        }
    }
}

/// The live-edge model of one network: thresholds aligned with the CSR rows.
#[derive(Clone, Debug)]
pub struct Cascade<'a> {
    net: &'a Network,
    /// One shared coin per undirected edge (bond percolation).
    symmetric: bool,
    /// Threshold of the arc `v → out_targets[i]`, aligned with the out-rows.
    out_thr: Vec<u64>,
    /// Threshold of the arc `in_sources[i] → v`, aligned with the in-rows
    /// (empty when equal to `out_thr`, i.e. symmetric or uniform).
    in_thr: Vec<u64>,
    /// Probability of each arc aligned with the out-rows (for degree discount).
    out_p: Vec<f32>,
    /// When every in-arc of `v` has the same probability: that probability
    /// per node (weighted cascade) or one value for all (uniform); empty
    /// otherwise. RR sampling then skips geometrically over dead arcs.
    in_row_p: Vec<f64>,
    /// Already adopted: removed from the cascade.
    blocked: Vec<bool>,
    active: usize,
}

impl<'a> Cascade<'a> {
    /// Builds the model; `exclude` are node indices of people who already
    /// adopted (see the module doc for how they are treated).
    ///
    /// ```
    /// use spreadplan::network::{Network, WeightMerge};
    /// use spreadplan::seed::{Cascade, CascadeModel};
    /// let (net, _) = Network::from_edges(3, true, vec![(0, 2), (1, 2)], None,
    ///     WeightMerge::Max).unwrap();
    /// let c = Cascade::new(&net, &CascadeModel::WeightedCascade, &[]).unwrap();
    /// assert_eq!(c.arc_probability_out(0, 0), 0.5); // in-degree of node 2 is 2
    /// ```
    pub fn new(
        net: &'a Network,
        model: &CascadeModel,
        exclude: &[u32],
    ) -> Result<Cascade<'a>, SeedError> {
        let n = net.node_count();
        let mut blocked = vec![false; n];
        for &x in exclude {
            if x as usize >= n {
                return Err(SeedError::Exclude(x));
            }
            blocked[x as usize] = true;
        }
        let active = blocked.iter().filter(|&&b| !b).count();
        let (offsets, targets, eids) = net.out_rows();
        let mut out_p = vec![0f32; targets.len()];
        let mut symmetric = !net.is_directed();
        match model {
            CascadeModel::Uniform { p } => {
                if !(0.0..=1.0).contains(p) {
                    return Err(SeedError::Probability(*p));
                }
                out_p.fill(*p as f32);
            }
            CascadeModel::EdgeProbabilities => {
                let w = net.weights().ok_or(SeedError::NoProbabilities)?;
                if let Some((e, &x)) =
                    w.iter().enumerate().find(|(_, &x)| !(0.0..=1.0).contains(&x))
                {
                    let [s, d] = net.edges()[e];
                    return Err(SeedError::EdgeProbability {
                        edge: e,
                        src: s.to_string(),
                        dst: d.to_string(),
                        value: f64::from(x),
                    });
                }
                for (i, &e) in eids.iter().enumerate() {
                    out_p[i] = w[e as usize];
                }
            }
            CascadeModel::WeightedCascade => {
                symmetric = false;
                for v in 0..n {
                    for i in offsets[v] as usize..offsets[v + 1] as usize {
                        out_p[i] = 1.0 / net.in_degree(targets[i]) as f32;
                    }
                }
            }
        }
        let out_thr: Vec<u64> = out_p.iter().map(|&p| threshold(f64::from(p))).collect();
        let in_row_p = match model {
            CascadeModel::Uniform { p } => vec![*p],
            CascadeModel::WeightedCascade => {
                (0..n as u32).map(|v| 1.0 / net.in_degree(v).max(1) as f64).collect()
            }
            CascadeModel::EdgeProbabilities => Vec::new(),
        };
        let in_thr = if symmetric || matches!(model, CascadeModel::Uniform { .. }) {
            Vec::new()
        } else if net.is_directed() {
            // in-row of v holds arcs u → v; probability of edge id e.
            let (_, _, in_eids) = net.in_rows();
            let mut by_edge = vec![0u64; net.edge_count()];
            for (i, &e) in eids.iter().enumerate() {
                by_edge[e as usize] = out_thr[i];
            }
            in_eids.iter().map(|&e| by_edge[e as usize]).collect()
        } else {
            // Undirected, asymmetric (weighted cascade): the in-row of v at
            // neighbor u is the arc u → v, probability 1 / degree(v).
            let mut t = vec![0u64; targets.len()];
            for v in 0..n {
                let th = threshold(1.0 / net.degree(v as u32) as f64);
                t[offsets[v] as usize..offsets[v + 1] as usize].fill(th);
            }
            t
        };
        Ok(Cascade { net, symmetric, out_thr, in_thr, out_p, in_row_p, blocked, active })
    }

    /// The network.
    pub fn network(&self) -> &'a Network {
        self.net
    }

    /// Whether one coin per undirected edge decides both directions
    /// (the live-edge graph is bond percolation; components give reach).
    pub fn is_symmetric(&self) -> bool {
        self.symmetric
    }

    /// Whether `v` already adopted (removed from the cascade).
    #[inline]
    pub fn is_blocked(&self, v: u32) -> bool {
        self.blocked[v as usize]
    }

    /// People who can be seeds or be reached (not excluded).
    pub fn active_count(&self) -> usize {
        self.active
    }

    /// Probability of the `i`-th out-arc of `v`.
    pub fn arc_probability_out(&self, v: u32, i: usize) -> f64 {
        let (offsets, _, _) = self.net.out_rows();
        f64::from(self.out_p[offsets[v as usize] as usize + i])
    }

    /// Probabilities aligned with the out-rows.
    pub fn out_probabilities(&self) -> &[f32] {
        &self.out_p
    }

    /// Thresholds aligned with the out-rows.
    #[inline]
    pub(crate) fn out_thresholds(&self) -> &[u64] {
        &self.out_thr
    }

    /// Thresholds aligned with the in-rows.
    #[inline]
    pub(crate) fn in_thresholds(&self) -> &[u64] {
        if self.in_thr.is_empty() {
            &self.out_thr
        } else {
            &self.in_thr
        }
    }

    /// The common probability of all in-arcs of `v`, if they share one.
    #[inline]
    pub(crate) fn in_row_probability(&self, v: u32) -> Option<f64> {
        match self.in_row_p.len() {
            0 => None,
            1 => Some(self.in_row_p[0]),
            _ => Some(self.in_row_p[v as usize]),
        }
    }

    /// Coin index of the arc `from → to` carried by edge `e`.
    #[inline]
    pub(crate) fn coin_index(&self, e: u32, from: u32, to: u32) -> u64 {
        if self.symmetric || self.net.is_directed() {
            u64::from(e)
        } else {
            2 * u64::from(e) + u64::from(from > to)
        }
    }
}
