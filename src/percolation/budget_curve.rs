//! Reverse-add budget curves: for a removal order (doses given in order),
//! the transmission network's components at every budget level `b =
//! 0..=len` from one union–find pass per realization.
//!
//! Realization `r` keeps edge `e` iff `hit(threshold(T_e), hash(key(seed,
//! Stage::Edge, r), e))` and the dose given to `v` takes iff
//! `hit(threshold(efficacy), hash(key(seed, Stage::Node, r), v))`: the same
//! coins for every rule (common random numbers). Level `b` is the network
//! after the first `b` doses of the order. The pass starts from the network
//! with every node whose dose took removed, joins the present edges, records
//! level `len`, then adds the nodes back in reverse order, recording each
//! level; this is the Newman–Ziff idea (Newman & Ziff 2001) applied to
//! sites in removal order, and the reverse-add trick of dismantling studies
//! (e.g. Schneider et al. 2011).
//!
//! Metrics at level `b` (on `N` nodes, immune people included in `N`):
//!
//! - `giant_fraction = giant[b] / N`, the largest component;
//! - `mean_outbreak_fraction = sum_sq[b] / N²` — the expected final size over
//!   `N` of an outbreak from a uniformly chosen introduced case, `Σ_C |C|² /
//!   N²` (Newman 2002); an immune introduced case has a size-0 outbreak;
//! - `outbreak_probability = in_large[b] / N` — the probability that the
//!   introduced case lies in a *large* component, one of at least
//!   [`large_outbreak_min`]`(N) = max(2, ⌈√N⌉)` nodes (the cut is fixed per
//!   run, so the count is updated in O(1) per union; a different cut can be
//!   set in [`BudgetCurveConfig::large_min`]).
//!
//! Undirected networks only: directed ones give
//! [`PercolationError::Directed`] (see `percolation::directed`). The
//! parallel helpers [`budget_curves`] and [`budget_curve_sums`] run many
//! rules over the same realizations with rayon; their results do not depend
//! on the thread count (per-realization results are collected in index
//! order; sums are exact integers).

use rayon::prelude::*;

use super::realization::{check_prob, large_outbreak_min, PercolationError, Transmissibility};
use super::UnionFind;
use crate::network::Network;
use crate::rng::{self, Stage};
use crate::stats::{t_quantile, Estimate};

/// Parameters of a budget-curve evaluation.
#[derive(Clone, Debug, PartialEq)]
pub struct BudgetCurveConfig {
    /// Transmission probability of each contact.
    pub transmissibility: Transmissibility,
    /// Probability that a given dose makes its receiver immune (all or
    /// nothing), in `[0, 1]`.
    pub efficacy: f64,
    /// Master seed of the coins.
    pub seed: u64,
    /// Smallest component size counted as a large outbreak; `None` =
    /// [`large_outbreak_min`]`(N)`.
    pub large_min: Option<u32>,
}

impl BudgetCurveConfig {
    /// A config with the default large-outbreak cut.
    pub fn new(transmissibility: Transmissibility, efficacy: f64, seed: u64) -> Self {
        BudgetCurveConfig { transmissibility, efficacy, seed, large_min: None }
    }

    /// Checks the config against `net`: undirected, probabilities in `[0, 1]`.
    pub fn validate(&self, net: &Network) -> Result<(), PercolationError> {
        if net.is_directed() {
            return Err(PercolationError::Directed("a budget curve"));
        }
        self.transmissibility.validate(net)?;
        check_prob("efficacy", self.efficacy, None)
    }

    /// The large-outbreak cut used on `n` nodes.
    pub fn large_min_for(&self, n: usize) -> u32 {
        self.large_min.unwrap_or_else(|| large_outbreak_min(n)).max(1)
    }
}

/// Component statistics at every budget level `b = 0..=order.len()` of one
/// realization.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct BudgetCurve {
    /// Largest component size at level `b`.
    pub giant: Vec<u32>,
    /// `Σ s²` over components at level `b`.
    pub sum_sq: Vec<u64>,
    /// Nodes in components of at least the large-outbreak cut at level `b`.
    pub in_large: Vec<u64>,
}

impl BudgetCurve {
    /// Number of levels (`order.len() + 1`).
    pub fn levels(&self) -> usize {
        self.giant.len()
    }

    /// `giant[b] / n`.
    pub fn giant_fraction(&self, b: usize, n: usize) -> f64 {
        self.giant[b] as f64 / n as f64
    }

    /// `sum_sq[b] / n²`.
    pub fn mean_outbreak_fraction(&self, b: usize, n: usize) -> f64 {
        self.sum_sq[b] as f64 / (n as f64 * n as f64)
    }

    /// `in_large[b] / n`.
    pub fn outbreak_probability(&self, b: usize, n: usize) -> f64 {
        self.in_large[b] as f64 / n as f64
    }
}

/// Per-thread reusable buffers: O(N + M/64) memory, no allocation per
/// realization once sized.
#[derive(Clone, Debug)]
pub struct Scratch {
    uf: UnionFind,
    present: Vec<u64>,
    removed_at: Vec<u32>,
    large_min: u32,
}

const NONE: u32 = u32::MAX;

impl Scratch {
    /// Buffers for a network of `n` nodes (the edge buffer grows on first
    /// use).
    pub fn new(n: usize) -> Self {
        Scratch {
            uf: UnionFind::new_inactive(n),
            present: Vec::new(),
            removed_at: vec![NONE; n],
            large_min: u32::MAX,
        }
    }

    fn prepare(&mut self, n: usize, m: usize, large_min: u32) {
        if self.uf.len() != n {
            *self = Scratch::new(n);
        }
        let words = m.div_ceil(64);
        if self.present.len() < words {
            self.present.resize(words, 0);
        }
        self.uf.reset_inactive();
        if self.large_min != large_min {
            self.uf.set_large_min(large_min);
            self.large_min = large_min;
        }
    }
}

/// The budget curve of one realization.
///
/// Realization `r`: edge `e` present iff `hit(threshold(T_e), hash(key(seed,
/// Stage::Edge, r), e))`; the dose given to `order[i]` takes iff
/// `hit(threshold(efficacy), hash(key(seed, Stage::Node, r), v))`.
/// `absent[v]` (prior immune) are never present. Level `b` = state after the
/// first `b` doses of `order`. A dose to a node that is absent or already
/// immune is spent without effect (its coin is the node's, so a repeat
/// takes iff the first did). One reverse-add pass (module doc).
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// use spreadplan::percolation::{budget_curve, BudgetCurveConfig, Scratch, Transmissibility};
/// // Star with hub 0 and three leaves, every contact transmits.
/// let (net, _) = Network::from_edges(4, false, vec![(0, 1), (0, 2), (0, 3)], None,
///     WeightMerge::Max).unwrap();
/// let cfg = BudgetCurveConfig::new(Transmissibility::Uniform(1.0), 1.0, 1);
/// let c = budget_curve(&net, &cfg, 0, None, &[0], &mut Scratch::new(4)).unwrap();
/// assert_eq!(c.giant, vec![4, 1]);        // one dose on the hub isolates the leaves
/// assert_eq!(c.sum_sq, vec![16, 3]);
/// assert_eq!(c.in_large, vec![4, 0]);     // large = at least 2 nodes here
/// ```
pub fn budget_curve(
    net: &Network,
    cfg: &BudgetCurveConfig,
    realization: u64,
    absent: Option<&[bool]>,
    order: &[u32],
    scratch: &mut Scratch,
) -> Result<BudgetCurve, PercolationError> {
    cfg.validate(net)?;
    check_absent(net, absent)?;
    let mut out = BudgetCurve::default();
    curve_into(net, cfg, realization, absent, order, scratch, &mut out)?;
    Ok(out)
}

/// [`budget_curve`] writing into `out` (reusing its buffers). Checks the
/// order but assumes `cfg` and `absent` were validated
/// ([`BudgetCurveConfig::validate`]); call it in loops.
pub fn budget_curve_into(
    net: &Network,
    cfg: &BudgetCurveConfig,
    realization: u64,
    absent: Option<&[bool]>,
    order: &[u32],
    scratch: &mut Scratch,
    out: &mut BudgetCurve,
) -> Result<(), PercolationError> {
    if net.is_directed() {
        return Err(PercolationError::Directed("a budget curve"));
    }
    check_absent(net, absent)?;
    curve_into(net, cfg, realization, absent, order, scratch, out)
}

fn check_absent(net: &Network, absent: Option<&[bool]>) -> Result<(), PercolationError> {
    match absent {
        Some(a) if a.len() != net.node_count() => {
            Err(PercolationError::NodeCount { given: a.len(), nodes: net.node_count() })
        }
        _ => Ok(()),
    }
}

fn curve_into(
    net: &Network,
    cfg: &BudgetCurveConfig,
    realization: u64,
    absent: Option<&[bool]>,
    order: &[u32],
    scratch: &mut Scratch,
    out: &mut BudgetCurve,
) -> Result<(), PercolationError> {
    let n = net.node_count();
    if let Some((position, &node)) = order.iter().enumerate().find(|(_, &v)| v as usize >= n) {
        return Err(PercolationError::NodeOutOfRange { position, node, nodes: n });
    }
    let large_min = cfg.large_min_for(n);
    scratch.prepare(n, net.edge_count(), large_min);
    let nkey = rng::key(cfg.seed, Stage::Node, realization);
    let ekey = rng::key(cfg.seed, Stage::Edge, realization);
    let eff = rng::threshold(cfg.efficacy);
    let is_absent = |v: usize| absent.is_some_and(|a| a[v]);

    // Which dose (if any) made each node immune.
    let removed_at = &mut scratch.removed_at;
    removed_at.fill(NONE);
    for (i, &v) in order.iter().enumerate() {
        let vi = v as usize;
        if removed_at[vi] == NONE && !is_absent(vi) && rng::hit(eff, rng::hash(nkey, v as u64)) {
            removed_at[vi] = i as u32;
        }
    }
    let uf = &mut scratch.uf;
    for (v, &at) in removed_at.iter().enumerate() {
        if at == NONE && !is_absent(v) {
            uf.activate(v as u32);
        }
    }
    // Draw every edge once, keep the coins as bits for the reverse phase.
    let present = &mut scratch.present;
    let edges = net.edges();
    match &cfg.transmissibility {
        Transmissibility::Uniform(t) => {
            let thr = rng::threshold(*t);
            join_edges(edges, present, uf, ekey, |_| thr);
        }
        Transmissibility::PerEdge(ts) => {
            join_edges(edges, present, uf, ekey, |e| rng::threshold(ts[e]));
        }
    }
    let levels = order.len() + 1;
    out.giant.clear();
    out.giant.resize(levels, 0);
    out.sum_sq.clear();
    out.sum_sq.resize(levels, 0);
    out.in_large.clear();
    out.in_large.resize(levels, 0);
    let record = |uf: &UnionFind, out: &mut BudgetCurve, b: usize| {
        out.giant[b] = uf.largest();
        out.sum_sq[b] = uf.sum_sq();
        out.in_large[b] = uf.in_large();
    };
    record(uf, out, order.len());
    let (offsets, targets, edge_ids) = net.out_rows();
    for i in (0..order.len()).rev() {
        let v = order[i];
        if removed_at[v as usize] == i as u32 {
            uf.activate(v);
            let (a, b) = (offsets[v as usize] as usize, offsets[v as usize + 1] as usize);
            for (&w, &e) in targets[a..b].iter().zip(&edge_ids[a..b]) {
                if (present[(e >> 6) as usize] >> (e & 63)) & 1 == 1 && uf.is_active(w) {
                    uf.union(v, w);
                }
            }
        }
        record(uf, out, i);
    }
    Ok(())
}

#[inline]
fn join_edges(
    edges: &[[u32; 2]],
    present: &mut [u64],
    uf: &mut UnionFind,
    ekey: u64,
    thr: impl Fn(usize) -> u64,
) {
    for (w, chunk) in edges.chunks(64).enumerate() {
        let mut bits = 0u64;
        for (j, &[a, b]) in chunk.iter().enumerate() {
            let e = w * 64 + j;
            if rng::hit(thr(e), rng::hash(ekey, e as u64)) {
                bits |= 1 << j;
                if uf.is_active(a) && uf.is_active(b) {
                    uf.union(a, b);
                }
            }
        }
        present[w] = bits;
    }
}

/// Where a rule's removal order comes from in each realization.
#[derive(Clone, Copy)]
pub enum RuleOrder<'a> {
    /// The same order in every realization (deterministic rules).
    Fixed(&'a [u32]),
    /// A fresh order per realization `r` (randomized rules drawing from
    /// `rng::stream(seed, Stage::Rule, r)`).
    PerRealization(&'a (dyn Fn(u64) -> Vec<u32> + Sync)),
}

impl std::fmt::Debug for RuleOrder<'_> {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            RuleOrder::Fixed(o) => write!(f, "Fixed({} nodes)", o.len()),
            RuleOrder::PerRealization(_) => write!(f, "PerRealization"),
        }
    }
}

/// Budget curves of several rules on realizations `0..runs`, on common
/// random numbers, in parallel over realizations (rayon). For each
/// realization `r` and rule `i`, `visit(r, i, &curve)` extracts what the
/// caller keeps; the result is `out[r][i]`, in index order whatever the
/// thread count.
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// use spreadplan::percolation::{budget_curves, BudgetCurveConfig, RuleOrder, Transmissibility};
/// let (net, _) = Network::from_edges(3, false, vec![(0, 1), (1, 2)], None, WeightMerge::Max).unwrap();
/// let cfg = BudgetCurveConfig::new(Transmissibility::Uniform(1.0), 1.0, 1);
/// let mid = [1u32];
/// let end = [0u32];
/// let giant = budget_curves(&net, &cfg, 2, None, &[RuleOrder::Fixed(&mid), RuleOrder::Fixed(&end)],
///     &|_, _, c| c.giant[1]).unwrap();
/// assert_eq!(giant, vec![vec![1, 2], vec![1, 2]]);
/// ```
pub fn budget_curves<T: Send>(
    net: &Network,
    cfg: &BudgetCurveConfig,
    runs: u64,
    absent: Option<&[bool]>,
    rules: &[RuleOrder<'_>],
    visit: &(dyn Fn(u64, usize, &BudgetCurve) -> T + Sync),
) -> Result<Vec<Vec<T>>, PercolationError> {
    cfg.validate(net)?;
    check_absent(net, absent)?;
    let n = net.node_count();
    (0..runs)
        .into_par_iter()
        .map_init(
            || (Scratch::new(n), BudgetCurve::default()),
            |(scratch, curve), r| {
                let mut row = Vec::with_capacity(rules.len());
                for (i, rule) in rules.iter().enumerate() {
                    run_rule(net, cfg, r, absent, rule, scratch, curve)?;
                    row.push(visit(r, i, curve));
                }
                Ok(row)
            },
        )
        .collect()
}

fn run_rule(
    net: &Network,
    cfg: &BudgetCurveConfig,
    r: u64,
    absent: Option<&[bool]>,
    rule: &RuleOrder<'_>,
    scratch: &mut Scratch,
    curve: &mut BudgetCurve,
) -> Result<(), PercolationError> {
    match rule {
        RuleOrder::Fixed(o) => curve_into(net, cfg, r, absent, o, scratch, curve),
        RuleOrder::PerRealization(f) => {
            let o = f(r);
            curve_into(net, cfg, r, absent, &o, scratch, curve)
        }
    }
}

/// Exact integer sums of the curve statistics over realizations, per level:
/// the means and t-intervals follow without keeping every curve, and the
/// sums do not depend on the order in which realizations were added.
/// A curve shorter than the sums (an order that ran out) is extended with
/// its last level: no further doses, no change.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct CurveSums {
    /// Realizations added.
    pub runs: u64,
    /// `Σ_r giant[b]`.
    pub giant: Vec<u64>,
    /// `Σ_r giant[b]²`.
    pub giant_sq: Vec<u64>,
    /// `Σ_r sum_sq[b]`.
    pub sum_sq: Vec<u128>,
    /// `Σ_r sum_sq[b]²`.
    pub sum_sq_sq: Vec<u128>,
    /// `Σ_r in_large[b]`.
    pub in_large: Vec<u64>,
    /// `Σ_r in_large[b]²`.
    pub in_large_sq: Vec<u128>,
}

/// A metric of the budget curve.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum CurveMetric {
    /// `giant / N`.
    GiantFraction,
    /// `Σ s² / N²`.
    MeanOutbreakFraction,
    /// `in_large / N`.
    OutbreakProbability,
}

impl CurveMetric {
    /// The stable metric name.
    pub fn name(self) -> &'static str {
        match self {
            CurveMetric::GiantFraction => "giant_fraction",
            CurveMetric::MeanOutbreakFraction => "mean_outbreak_fraction",
            CurveMetric::OutbreakProbability => "outbreak_probability",
        }
    }
}

impl CurveSums {
    /// Zero sums over `levels` budget levels.
    pub fn new(levels: usize) -> Self {
        CurveSums {
            runs: 0,
            giant: vec![0; levels],
            giant_sq: vec![0; levels],
            sum_sq: vec![0; levels],
            sum_sq_sq: vec![0; levels],
            in_large: vec![0; levels],
            in_large_sq: vec![0; levels],
        }
    }

    /// Number of levels.
    pub fn levels(&self) -> usize {
        self.giant.len()
    }

    /// Adds one realization's curve (grown levels are extended flat).
    pub fn add(&mut self, c: &BudgetCurve) {
        if c.levels() > self.levels() {
            self.grow(c.levels());
        }
        let last = c.levels().saturating_sub(1);
        for b in 0..self.levels() {
            let k = b.min(last);
            let (g, s, l) =
                if c.levels() == 0 { (0, 0, 0) } else { (c.giant[k], c.sum_sq[k], c.in_large[k]) };
            self.giant[b] += g as u64;
            self.giant_sq[b] += g as u64 * g as u64;
            self.sum_sq[b] += s as u128;
            self.sum_sq_sq[b] += s as u128 * s as u128;
            self.in_large[b] += l;
            self.in_large_sq[b] += l as u128 * l as u128;
        }
        self.runs += 1;
    }

    fn grow(&mut self, levels: usize) {
        // Earlier, shorter curves stay flat: repeat their last level.
        let old = self.levels();
        if old == 0 {
            *self = CurveSums { runs: self.runs, ..CurveSums::new(levels) };
            return;
        }
        let ext = |v: &mut Vec<u64>| {
            let x = v[old - 1];
            v.resize(levels, x)
        };
        ext(&mut self.giant);
        ext(&mut self.giant_sq);
        ext(&mut self.in_large);
        let ext2 = |v: &mut Vec<u128>| {
            let x = v[old - 1];
            v.resize(levels, x)
        };
        ext2(&mut self.sum_sq);
        ext2(&mut self.sum_sq_sq);
        ext2(&mut self.in_large_sq);
    }

    /// Adds another set of sums (from another thread).
    pub fn merge(&mut self, other: &CurveSums) {
        if other.levels() > self.levels() {
            self.grow(other.levels());
        }
        let mut o = other.clone();
        if o.levels() < self.levels() {
            o.grow(self.levels());
        }
        for b in 0..self.levels() {
            self.giant[b] += o.giant[b];
            self.giant_sq[b] += o.giant_sq[b];
            self.sum_sq[b] += o.sum_sq[b];
            self.sum_sq_sq[b] += o.sum_sq_sq[b];
            self.in_large[b] += o.in_large[b];
            self.in_large_sq[b] += o.in_large_sq[b];
        }
        self.runs += o.runs;
    }

    /// Mean and 95% t-interval over realizations of `metric` at level `b`
    /// on `n` nodes (Student t, as `stats::mean_ci`; the variance comes
    /// from exact integer moments).
    pub fn estimate(&self, metric: CurveMetric, b: usize, n: usize) -> Estimate {
        let (s1, s2, scale) = match metric {
            CurveMetric::GiantFraction => {
                (self.giant[b] as u128, self.giant_sq[b] as u128, n as f64)
            }
            CurveMetric::MeanOutbreakFraction => {
                (self.sum_sq[b], self.sum_sq_sq[b], n as f64 * n as f64)
            }
            CurveMetric::OutbreakProbability => {
                (self.in_large[b] as u128, self.in_large_sq[b], n as f64)
            }
        };
        moments_estimate(self.runs, s1, s2, scale)
    }
}

/// A t-interval from exact sums `s1 = Σx`, `s2 = Σx²` of `r` samples,
/// divided by `scale`.
pub(crate) fn moments_estimate(r: u64, s1: u128, s2: u128, scale: f64) -> Estimate {
    if r == 0 {
        return Estimate { mean: f64::NAN, ci_low: f64::NAN, ci_high: f64::NAN };
    }
    let rf = r as f64;
    let mean = s1 as f64 / rf / scale;
    if r < 2 {
        return Estimate::exact(mean);
    }
    // R·Σx² − (Σx)² ≥ 0 exactly (Cauchy–Schwarz), so no cancellation error.
    let num = (r as u128).saturating_mul(s2).saturating_sub(s1.saturating_mul(s1));
    let var = num as f64 / (rf * (rf - 1.0)) / (scale * scale);
    let hw = t_quantile(r as usize - 1) * (var / rf).sqrt();
    Estimate { mean, ci_low: mean - hw, ci_high: mean + hw }
}

/// Sums of the budget curves of several rules over realizations `0..runs`
/// (one [`CurveSums`] per rule), in parallel; memory is one `Scratch` and
/// one set of sums per thread, and the result is identical at any thread
/// count (integer sums).
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// use spreadplan::percolation::{budget_curve_sums, BudgetCurveConfig, CurveMetric, RuleOrder,
///     Transmissibility};
/// let (net, _) = Network::from_edges(3, false, vec![(0, 1), (1, 2)], None, WeightMerge::Max).unwrap();
/// let cfg = BudgetCurveConfig::new(Transmissibility::Uniform(1.0), 1.0, 1);
/// let mid = [1u32];
/// let s = budget_curve_sums(&net, &cfg, 10, None, &[RuleOrder::Fixed(&mid)]).unwrap();
/// assert_eq!(s[0].estimate(CurveMetric::GiantFraction, 1, 3).mean, 1.0 / 3.0);
/// assert_eq!(s[0].estimate(CurveMetric::MeanOutbreakFraction, 0, 3).mean, 1.0);
/// ```
pub fn budget_curve_sums(
    net: &Network,
    cfg: &BudgetCurveConfig,
    runs: u64,
    absent: Option<&[bool]>,
    rules: &[RuleOrder<'_>],
) -> Result<Vec<CurveSums>, PercolationError> {
    cfg.validate(net)?;
    check_absent(net, absent)?;
    let n = net.node_count();
    let k = rules.len();
    let empty = || vec![CurveSums::default(); k];
    (0..runs)
        .into_par_iter()
        .fold(
            || (Scratch::new(n), BudgetCurve::default(), Ok(empty())),
            |(mut scratch, mut curve, acc): (Scratch, BudgetCurve, Result<Vec<CurveSums>, _>),
             r| {
                let acc = acc.and_then(|mut sums| {
                    for (i, rule) in rules.iter().enumerate() {
                        run_rule(net, cfg, r, absent, rule, &mut scratch, &mut curve)?;
                        sums[i].add(&curve);
                    }
                    Ok(sums)
                });
                (scratch, curve, acc)
            },
        )
        .map(|(_, _, acc)| acc)
        .reduce(
            || Ok(empty()),
            |a, b| {
                let (mut a, b) = (a?, b?);
                for (x, y) in a.iter_mut().zip(&b) {
                    x.merge(y);
                }
                Ok(a)
            },
        )
}

/// Checks an efficacy or probability argument (re-exported for callers
/// building configs).
pub fn check_probability(what: &'static str, value: f64) -> Result<(), PercolationError> {
    check_prob(what, value, None)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::WeightMerge;

    fn net(n: u32, e: &[(u32, u32)]) -> Network {
        Network::from_edges(n, false, e.to_vec(), None, WeightMerge::Max).unwrap().0
    }

    fn curve(net: &Network, t: f64, order: &[u32]) -> BudgetCurve {
        let cfg = BudgetCurveConfig::new(Transmissibility::Uniform(t), 1.0, 3);
        budget_curve(net, &cfg, 0, None, order, &mut Scratch::new(net.node_count())).unwrap()
    }

    #[test]
    fn path_by_hand() {
        // Path 0-1-2-3-4, T = 1, large cut ⌈√5⌉ = 3. Doses to 2 then 0:
        // level 0: one component of 5 → Σs² = 25, all large;
        // level 1: {0,1},{3,4} → giant 2, Σs² = 8, none large;
        // level 2: {1},{3,4} → giant 2, Σs² = 1 + 4 = 5.
        let p = net(5, &[(0, 1), (1, 2), (2, 3), (3, 4)]);
        let c = curve(&p, 1.0, &[2, 0]);
        assert_eq!(c.giant, vec![5, 2, 2]);
        assert_eq!(c.sum_sq, vec![25, 8, 5]);
        assert_eq!(c.in_large, vec![5, 0, 0]);
        // T = 0: all singletons, removed ones count 0.
        let c = curve(&p, 0.0, &[2, 0]);
        assert_eq!(c.giant, vec![1, 1, 1]);
        assert_eq!(c.sum_sq, vec![5, 4, 3]);
        assert_eq!(c.in_large, vec![0, 0, 0]);
    }

    #[test]
    fn star_and_k4_by_hand() {
        // Star hub 0, leaves 1..4 (N = 5, large ≥ 3). Doses to leaf 1, then hub.
        let s = net(5, &[(0, 1), (0, 2), (0, 3), (0, 4)]);
        let c = curve(&s, 1.0, &[1, 0]);
        assert_eq!(c.giant, vec![5, 4, 1]);
        assert_eq!(c.sum_sq, vec![25, 16, 3]);
        assert_eq!(c.in_large, vec![5, 4, 0]);
        // K4 (large ≥ 2): removing nodes one by one leaves a clique of 4 − b.
        let k4 = net(4, &[(0, 1), (0, 2), (0, 3), (1, 2), (1, 3), (2, 3)]);
        let c = curve(&k4, 1.0, &[3, 2, 1, 0]);
        assert_eq!(c.giant, vec![4, 3, 2, 1, 0]);
        assert_eq!(c.sum_sq, vec![16, 9, 4, 1, 0]);
        assert_eq!(c.in_large, vec![4, 3, 2, 0, 0]);
        let c = curve(&k4, 0.0, &[3, 2, 1, 0]);
        assert_eq!(c.giant, vec![1, 1, 1, 1, 0]);
        assert_eq!(c.sum_sq, vec![4, 3, 2, 1, 0]);
    }

    #[test]
    fn absent_and_efficacy_zero() {
        let p = net(3, &[(0, 1), (1, 2)]);
        let absent = [false, true, false];
        let cfg = BudgetCurveConfig::new(Transmissibility::Uniform(1.0), 1.0, 3);
        let c = budget_curve(&p, &cfg, 0, Some(&absent), &[0, 1], &mut Scratch::new(3)).unwrap();
        // Node 1 immune before: {0},{2}; dose to 0 removes it; dose to 1 wasted.
        assert_eq!(c.sum_sq, vec![2, 1, 1]);
        let cfg0 = BudgetCurveConfig { efficacy: 0.0, ..cfg.clone() };
        let c = budget_curve(&p, &cfg0, 0, None, &[1], &mut Scratch::new(3)).unwrap();
        assert_eq!(c.giant, vec![3, 3]);
    }

    #[test]
    fn errors_are_typed() {
        let p = net(3, &[(0, 1), (1, 2)]);
        let cfg = BudgetCurveConfig::new(Transmissibility::Uniform(1.0), 1.5, 3);
        let e = budget_curve(&p, &cfg, 0, None, &[0], &mut Scratch::new(3)).unwrap_err();
        assert!(matches!(e, PercolationError::Probability { what: "efficacy", .. }));
        let cfg = BudgetCurveConfig::new(Transmissibility::Uniform(1.0), 1.0, 3);
        let e = budget_curve(&p, &cfg, 0, None, &[7], &mut Scratch::new(3)).unwrap_err();
        assert_eq!(e.to_string(), "order entry 0: node 7 is not below the node count 3");
        let (d, _) = Network::from_edges(2, true, vec![(0, 1)], None, WeightMerge::Max).unwrap();
        assert!(matches!(
            budget_curve(&d, &cfg, 0, None, &[], &mut Scratch::new(2)),
            Err(PercolationError::Directed(_))
        ));
    }

    #[test]
    fn matches_direct_recount() {
        // Against recomputing components from scratch at every level.
        let mut edges = Vec::new();
        for i in 0..60u32 {
            edges.push((i, (i * 7 + 3) % 60));
            edges.push((i, (i * 13 + 5) % 60));
        }
        let g = net(60, &edges);
        let order: Vec<u32> = (0..60).map(|i| (i * 17) % 60).collect();
        let cfg = BudgetCurveConfig::new(Transmissibility::Uniform(0.6), 0.7, 11);
        for r in 0..5 {
            let c = budget_curve(&g, &cfg, r, None, &order, &mut Scratch::new(60)).unwrap();
            let pres = super::super::bond_realization(&g, &cfg.transmissibility, 11, r).unwrap();
            let eff = rng::threshold(0.7);
            for b in 0..=order.len() {
                let mut gone = [false; 60];
                for &v in &order[..b] {
                    gone[v as usize] |= super::super::dose_takes(11, r, eff, v);
                }
                let mut uf = UnionFind::new_inactive(60);
                uf.set_large_min(cfg.large_min_for(60));
                (0..60).filter(|&v| !gone[v as usize]).for_each(|v| uf.activate(v));
                for (e, &[a, bb]) in g.edges().iter().enumerate() {
                    if pres[e] && !gone[a as usize] && !gone[bb as usize] {
                        uf.union(a, bb);
                    }
                }
                assert_eq!(
                    (c.giant[b], c.sum_sq[b], c.in_large[b]),
                    (uf.largest(), uf.sum_sq(), uf.in_large()),
                    "r={r} b={b}"
                );
            }
        }
    }

    #[test]
    fn parallel_helpers_agree_with_single_calls() {
        let p = net(6, &[(0, 1), (1, 2), (2, 3), (3, 4), (4, 5), (5, 0)]);
        let cfg = BudgetCurveConfig::new(Transmissibility::Uniform(0.7), 0.8, 5);
        let fixed = [0u32, 3];
        let rand = |r: u64| vec![(r % 6) as u32];
        let rules = [RuleOrder::Fixed(&fixed), RuleOrder::PerRealization(&rand)];
        let all = budget_curves(&p, &cfg, 20, None, &rules, &|_, _, c| c.clone()).unwrap();
        let sums = budget_curve_sums(&p, &cfg, 20, None, &rules).unwrap();
        let mut want = vec![CurveSums::default(), CurveSums::default()];
        for (r, row) in all.iter().enumerate() {
            let one = budget_curve(&p, &cfg, r as u64, None, &fixed, &mut Scratch::new(6)).unwrap();
            assert_eq!(row[0], one);
            want[0].add(&row[0]);
            want[1].add(&row[1]);
        }
        assert_eq!(sums, want);
        let e = sums[0].estimate(CurveMetric::GiantFraction, 1, 6);
        let xs: Vec<f64> = all.iter().map(|row| row[0].giant[1] as f64 / 6.0).collect();
        let m = crate::stats::mean_ci(&xs);
        assert!((e.mean - m.mean).abs() < 1e-12 && (e.ci_high - m.ci_high).abs() < 1e-12);
    }
}
