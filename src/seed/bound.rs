//! `upper_bound`: a valid upper confidence bound on the best expected
//! reach any `K` seeds can achieve, in the style of OPIM-C (Tang, Tang,
//! Xiao & Yuan 2018, SIGMOD).
//!
//! Draw an RR collection `R₁` of `θ₁` sets, independent of every other
//! collection (its own key range). Let `S°` be an optimal `K`-set and
//! `Λ₁(S)` the number of sets of `R₁` that `S` covers. Greedy coverage `S_K`
//! on `R₁` satisfies `Λ₁(S_K) ≥ (1 − (1 − 1/K)^K) · max_S Λ₁(S)` (Nemhauser,
//! Wolsey & Fisher 1978), so `Λ₁(S°) ≤ Λ₁(S_K) / (1 − (1 − 1/K)^K)`; the
//! tighter bound of OPIM-C, `min_i (Λ₁(S_i) + Σ_{v ∈ top-K} Λ₁(v | S_i))`
//! over the greedy prefixes `S_i` (submodularity), is also computed and
//! `Λᵘ` is the smaller of the two.
//! `Λ₁(S°)` is a sum of `θ₁` independent Bernoulli variables with mean
//! `μ = θ₁ · σ(S°) / n`; the martingale lower tail used by Tang et al.,
//! `Pr[Λ − μ ≤ −λ] ≤ exp(−λ² / (2μ))`, gives with probability `1 − δ`
//! `√μ ≤ √(Λᵘ + a/2) + √(a/2)` with `a = ln(1/δ)`. Hence
//!
//! ```text
//! OPT = σ(S°) ≤ (√(Λᵘ + a/2) + √(a/2))² · n / θ₁     (confidence 1 − δ)
//! ```
//!
//! also capped at `n` (nobody can reach more than everyone).

use crate::seed::rr_sets::{greedy_cover_tracked, RrSets};
use crate::seed::Cascade;

/// An upper confidence bound on the best reach of `K` seeds.
#[derive(Clone, Debug, PartialEq)]
pub struct UpperBound {
    /// The bound on the expected reach (people).
    pub value: f64,
    /// Its confidence `1 − δ`.
    pub confidence: f64,
    /// `θ₁`: RR sets in the independent sample.
    pub sets: usize,
    /// `Λ₁(S_K)`: greedy coverage on that sample.
    pub greedy_coverage: u64,
}

/// Key offset of the bound's RR collection, so it never shares sets with
/// IMM's collection (which uses indices from 0).
pub const BOUND_BASE: u64 = 1 << 48;

/// The OPIM-C-style upper bound from `theta1` fresh RR sets with
/// confidence `1 − delta` (see the module doc).
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// use spreadplan::seed::{upper_bound, Cascade, CascadeModel};
/// // Two isolated people, p irrelevant: one seed reaches exactly 1.
/// let (net, _) = Network::from_edges(2, false, vec![], None, WeightMerge::Max).unwrap();
/// let c = Cascade::new(&net, &CascadeModel::Uniform { p: 0.5 }, &[]).unwrap();
/// let b = upper_bound(&c, 1, 10_000, 0.05, 3);
/// assert!(b.value >= 1.0 && b.value < 1.1);
/// ```
pub fn upper_bound(c: &Cascade<'_>, k: usize, theta1: u64, delta: f64, seed: u64) -> UpperBound {
    let n = c.active_count() as f64;
    let mut r1 = RrSets::new(BOUND_BASE);
    r1.extend_to(c, theta1.max(1), seed);
    let cov = greedy_cover_tracked(&r1, c, k, &[], None, true);
    let lam = *cov.covered.last().unwrap_or(&0);
    let kf = k as f64;
    let ratio = 1.0 - (1.0 - 1.0 / kf).powf(kf);
    let lam_u = (lam as f64 / ratio).min(cov.coverage_bound.map_or(f64::INFINITY, |b| b as f64));
    let a = (1.0 / delta).ln();
    let mu = ((lam_u + a / 2.0).sqrt() + (a / 2.0).sqrt()).powi(2);
    let value = (mu * n / r1.len().max(1) as f64).min(n);
    UpperBound { value, confidence: 1.0 - delta, sets: r1.len(), greedy_coverage: lam }
}
