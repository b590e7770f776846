//! The immunization evaluator: removal orders → per-realization budget
//! curves on common random numbers → estimates with intervals, `r_eff`,
//! `doses_to_contain` and robustness.
//!
//! For realization `r` and rule order `o`: uptake refusals are decided
//! first (`hit(threshold(uptake_v), hash(key(seed, Stage::Uptake, r), v))`;
//! a refusal passes the dose to the next candidate, so the dose sequence is
//! `o` without refusers); with per-person costs the sequence is the
//! affordable prefix-with-skips (walk the sequence, give a dose when its
//! cost still fits the remaining budget, otherwise skip the person and go
//! on), followed by the skipped and unreached people in sequence order, so
//! the budget level is a prefix of one sequence. One reverse-add pass
//! ([`budget_curve_into`]) then gives every budget level of that sequence
//! with the same edge and vaccine coins for every rule.

use rayon::prelude::*;

use crate::network::{Network, NodeTable};
use crate::percolation::{
    budget_curve_into, nonbacktracking_radius_with, BudgetCurve, BudgetCurveConfig,
    PercolationError, ResidualCore, Scratch, SpectralRadius, Transmissibility,
};
use crate::rng::{self, Stage};

/// The budget as the evaluator applies it.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum DoseBudget {
    /// At most this many doses (accepted ones).
    Doses(u64),
    /// Cost units: doses are given while their per-person cost fits.
    Cost(f64),
}

/// One rule's numbers in one realization.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct RealizationOutcome {
    /// Doses given at the budget.
    pub doses: u64,
    /// Cost spent at the budget (= doses without costs).
    pub cost: f64,
    /// giant_fraction, mean_outbreak_fraction, outbreak_probability at the budget.
    pub at_budget: [f64; 3],
    /// The same three at each grid level (index = position in the grid).
    pub grid: Vec<[f64; 3]>,
    /// Schneider et al. (2011) robustness `R = (1/N) Σ_{Q=1}^{L} s(Q)` over
    /// the whole dose sequence of length L (s = giant fraction of the
    /// transmission network after Q doses).
    pub robustness: f64,
}

/// The dose sequence of one realization: `order` without uptake refusers,
/// then arranged so that the doses within `budget` come first. Returns the
/// sequence and the number of doses at the budget.
pub fn dose_sequence(
    order: &[u32],
    nodes: &NodeTable,
    budget: DoseBudget,
    seed: u64,
    realization: u64,
) -> (Vec<u32>, u64) {
    let seq: Vec<u32> = match &nodes.uptake {
        None => order.to_vec(),
        Some(up) => {
            let key = rng::key(seed, Stage::Uptake, realization);
            order
                .iter()
                .copied()
                .filter(|&v| rng::hit(rng::threshold(up[v as usize]), rng::hash(key, v as u64)))
                .collect()
        }
    };
    match budget {
        DoseBudget::Doses(b) => {
            let b = b.min(seq.len() as u64);
            (seq, b)
        }
        DoseBudget::Cost(c) => {
            let mut left = c;
            let mut given = Vec::with_capacity(seq.len());
            let mut skipped = Vec::new();
            for &v in &seq {
                let cv = nodes.cost_of(v);
                if cv <= left + 1e-9 * c.abs().max(1.0) {
                    left -= cv;
                    given.push(v);
                } else {
                    skipped.push(v);
                }
            }
            let b = given.len() as u64;
            given.extend(skipped);
            (given, b)
        }
    }
}

/// Budget levels reported in curves: at most `points` levels spread evenly
/// over `0..=max`, always including 0, `max` and the `extra` levels.
pub fn curve_grid(max: u64, points: usize, extra: &[u64]) -> Vec<u64> {
    let mut g: Vec<u64> = if (max as usize) < points.max(2) {
        (0..=max).collect()
    } else {
        let p = points.max(2) as u64 - 1;
        (0..=p).map(|i| (i as u128 * max as u128 / p as u128) as u64).collect()
    };
    g.extend(extra.iter().copied().filter(|&x| x <= max));
    g.sort_unstable();
    g.dedup();
    g
}

/// Evaluates one dose sequence in realization `r`: one reverse-add pass.
#[allow(clippy::too_many_arguments)]
pub(crate) fn evaluate_sequence(
    net: &Network,
    cfg: &BudgetCurveConfig,
    r: u64,
    absent: Option<&[bool]>,
    seq: &[u32],
    doses: u64,
    cost: f64,
    grid: &[u64],
    scratch: &mut Scratch,
    curve: &mut BudgetCurve,
) -> Result<RealizationOutcome, PercolationError> {
    budget_curve_into(net, cfg, r, absent, seq, scratch, curve)?;
    let n = net.node_count();
    let last = curve.levels() - 1;
    let at = |b: usize| {
        let b = b.min(last);
        [
            curve.giant_fraction(b, n),
            curve.mean_outbreak_fraction(b, n),
            curve.outbreak_probability(b, n),
        ]
    };
    let robustness = if n == 0 {
        0.0
    } else {
        curve.giant[1..].iter().map(|&g| g as f64).sum::<f64>() / (n as f64 * n as f64)
    };
    Ok(RealizationOutcome {
        doses,
        cost,
        at_budget: at(doses as usize),
        grid: grid.iter().map(|&b| at(b as usize)).collect(),
        robustness,
    })
}

/// The cost of the first `doses` entries of `seq`.
pub(crate) fn sequence_cost(seq: &[u32], doses: u64, nodes: &NodeTable) -> f64 {
    seq[..doses as usize].iter().map(|&v| nodes.cost_of(v)).sum()
}

/// Occupation `φ_v` after the first `k` doses of `seq`: `1 − efficacy` for
/// dosed people, 0 for absent ones, 1 otherwise (the expected residual
/// network, as in Callaway et al. 2000).
pub fn occupation(
    n: usize,
    absent: Option<&[bool]>,
    seq: &[u32],
    k: usize,
    efficacy: f64,
) -> Vec<f64> {
    let mut phi: Vec<f64> =
        (0..n).map(|v| if absent.is_some_and(|a| a[v]) { 0.0 } else { 1.0 }).collect();
    for &v in &seq[..k.min(seq.len())] {
        phi[v as usize] = phi[v as usize].min(1.0 - efficacy);
    }
    phi
}

/// Iteration limit per 2-core component for the thresholds of a study.
const RADIUS_ITERATIONS: u32 = 5_000;

/// Radius of the unit-transmissibility (or per-edge weight) non-backtracking
/// matrix after the first `k` doses; `r_eff = T · radius`
/// ([`nonbacktracking_radius_with`], Karrer, Newman & Zdeborová 2014).
pub fn radius_after(
    net: &Network,
    weights: &Transmissibility,
    absent: Option<&[bool]>,
    seq: &[u32],
    k: usize,
    efficacy: f64,
) -> Result<SpectralRadius, PercolationError> {
    let phi = occupation(net.node_count(), absent, seq, k, efficacy);
    nonbacktracking_radius_with(net, weights, Some(&phi), 1e-6, RADIUS_ITERATIONS)
}

/// The undosed residual network of a study (absent people removed), kept
/// once for the threshold searches of every rule: each rule's residual
/// networks remove more people, so their 2-cores are found within this
/// one (see [`ResidualCore::restrict`]).
pub(crate) struct Undosed<'a> {
    net: &'a Network,
    /// The study's transmissibility; r_eff = t × radius of `weights`.
    t: f64,
    absent: Option<&'a [bool]>,
    core: ResidualCore<'a>,
    /// The radius with no doses, and whether `t` times it is below 1.
    radius: SpectralRadius,
    contained: bool,
}

impl<'a> Undosed<'a> {
    /// With the undosed radius to full precision.
    pub(crate) fn new(
        net: &'a Network,
        t: f64,
        weights: &'a Transmissibility,
        absent: Option<&'a [bool]>,
    ) -> Result<Self, PercolationError> {
        Self::build(net, t, weights, absent, true)
    }

    /// `full`: the radius to full precision; otherwise only the side of
    /// `1/t` is decided (the radius then has bounds, not an estimate).
    fn build(
        net: &'a Network,
        t: f64,
        weights: &'a Transmissibility,
        absent: Option<&'a [bool]>,
        full: bool,
    ) -> Result<Self, PercolationError> {
        let phi = occupation(net.node_count(), absent, &[], 0, 1.0);
        let core = ResidualCore::new(net, weights, Some(&phi))?;
        let (radius, above) = if full {
            (core.radius(1e-6, RADIUS_ITERATIONS)?, None)
        } else {
            let (above, r) =
                core.radius_above(1.0 / t, 1e-6, RADIUS_ITERATIONS, &mut Vec::new())?;
            (r, above)
        };
        let contained = match above {
            Some(a) => !a,
            None => t * radius.estimate < 1.0,
        };
        Ok(Undosed { net, t, absent, core, radius, contained })
    }

    /// The radius with no doses ([`radius_after`] at k = 0).
    pub(crate) fn radius(&self) -> SpectralRadius {
        self.radius
    }

    /// [`radius_after`], from this core.
    pub(crate) fn radius_after(
        &self,
        seq: &[u32],
        k: usize,
        efficacy: f64,
    ) -> Result<SpectralRadius, PercolationError> {
        if k == 0 {
            return Ok(self.radius);
        }
        let phi = occupation(self.net.node_count(), self.absent, seq, k, efficacy);
        self.core.restrict(&phi)?.radius(1e-6, RADIUS_ITERATIONS)
    }

    /// [`doses_to_contain`], from this core.
    pub(crate) fn doses_to_contain(
        &self,
        seq: &[u32],
        efficacy: f64,
    ) -> Result<Option<u64>, PercolationError> {
        if self.contained {
            return Ok(Some(0));
        }
        let (t, level) = (self.t, 1.0 / self.t);
        // Whether the first k doses contain spread; each probe starts from
        // the previous probe's vector, and from the residual core of the
        // largest dose count known not to contain spread (`base`): every
        // later probe removes more people, so its core lies within that one
        // and is found in time proportional to it rather than to the whole
        // network.
        let mut warm: Vec<f64> = Vec::new();
        let mut base: Option<ResidualCore> = None;
        let mut probe = |k: usize| -> Result<bool, PercolationError> {
            let phi = occupation(self.net.node_count(), self.absent, seq, k, efficacy);
            let core = base.as_ref().unwrap_or(&self.core).restrict(&phi)?;
            let (above, r) = core.radius_above(level, 1e-6, RADIUS_ITERATIONS, &mut warm)?;
            let contained = match above {
                Some(a) => !a,
                None => t * r.estimate < 1.0,
            };
            if !contained {
                base = Some(core);
            }
            Ok(contained)
        };
        if !probe(seq.len())? {
            return Ok(None);
        }
        // Invariant: not contained at lo, contained at hi.
        let (mut lo, mut hi) = (0usize, seq.len());
        while hi - lo > 1 {
            let mid = lo + (hi - lo) / 2;
            if probe(mid)? {
                hi = mid;
            } else {
                lo = mid;
            }
        }
        Ok(Some(hi as u64))
    }
}

/// Fewest doses `k` of `seq` with `t · radius(k) < 1`. Monotone because
/// more doses lower the occupation entrywise and the spectral radius of a
/// nonnegative matrix does not increase when entries decrease
/// (Perron–Frobenius), so the answer is the end of a bracket search over
/// prefixes (bisection). `None` when even the whole sequence does not reach
/// it.
///
/// Each probe only has to decide the side of `1/t`
/// ([`nonbacktracking_radius_above`](crate::percolation::nonbacktracking_radius_above):
/// the Collatz–Wielandt bounds usually settle it in a few iterations; when
/// they cannot, the converged estimate decides, as a full computation
/// would), starting from the previous probe's vector. (Regula falsi was
/// tried: the early-stopped probes give too rough a radius to
/// interpolate, and it needed more probes.) No doses: the undosed radius
/// decides.
pub fn doses_to_contain(
    net: &Network,
    t: f64,
    weights: &Transmissibility,
    absent: Option<&[bool]>,
    seq: &[u32],
    efficacy: f64,
) -> Result<Option<u64>, PercolationError> {
    Undosed::build(net, t, weights, absent, false)?.doses_to_contain(seq, efficacy)
}

/// Runs every realization for every rule in parallel; the result is indexed
/// `[realization][rule]` and does not depend on the thread count.
#[allow(clippy::too_many_arguments)]
pub(crate) fn run_all<'a, F>(
    net: &Network,
    nodes: &NodeTable,
    cfg: &BudgetCurveConfig,
    runs: u64,
    absent: Option<&[bool]>,
    rules: usize,
    order_of: &F,
    budget: DoseBudget,
    grid: &[u64],
    progress: &dyn crate::progress::Progress,
) -> Result<Vec<Vec<RealizationOutcome>>, PercolationError>
where
    F: Fn(usize, u64) -> std::borrow::Cow<'a, [u32]> + Sync,
{
    let n = net.node_count();
    (0..runs)
        .into_par_iter()
        .map_init(
            || (Scratch::new(n), BudgetCurve::default()),
            |(scratch, curve), r| {
                let mut row = Vec::with_capacity(rules);
                for i in 0..rules {
                    let order = order_of(i, r);
                    let (seq, doses) = dose_sequence(&order, nodes, budget, cfg.seed, r);
                    let cost = sequence_cost(&seq, doses, nodes);
                    row.push(evaluate_sequence(
                        net, cfg, r, absent, &seq, doses, cost, grid, scratch, curve,
                    )?);
                }
                progress.advance(1);
                Ok(row)
            },
        )
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Plain bisection with fully converged radii (the textbook search).
    fn bisection_reference(net: &Network, t: f64, seq: &[u32], eff: f64) -> Option<u64> {
        let unit = Transmissibility::Uniform(1.0);
        let r = |k: usize| t * radius_after(net, &unit, None, seq, k, eff).unwrap().estimate;
        if r(0) < 1.0 {
            return Some(0);
        }
        if r(seq.len()) >= 1.0 {
            return None;
        }
        let (mut lo, mut hi) = (0, seq.len());
        while hi - lo > 1 {
            let mid = (lo + hi) / 2;
            if r(mid) < 1.0 {
                hi = mid;
            } else {
                lo = mid;
            }
        }
        Some(hi as u64)
    }

    #[test]
    fn bracket_search_matches_bisection() {
        let unit = Transmissibility::Uniform(1.0);
        for seed in 0..4 {
            let net = crate::network::generate::gnm(600, 2400, seed).unwrap();
            let mut rng = crate::rng::stream(seed, Stage::Rule, 0);
            let mut random: Vec<u32> = (0..600).collect();
            crate::rng::shuffle(&mut rng, &mut random);
            let mut by_degree: Vec<u32> = (0..600).collect();
            by_degree.sort_by_key(|&v| (std::cmp::Reverse(net.degree(v)), v));
            for seq in [&random, &by_degree] {
                for (t, eff) in [(0.3, 1.0), (0.5, 0.8), (0.9, 1.0)] {
                    assert_eq!(
                        doses_to_contain(&net, t, &unit, None, seq, eff).unwrap(),
                        bisection_reference(&net, t, seq, eff),
                        "seed {seed} t {t} efficacy {eff}"
                    );
                }
            }
        }
    }
}
