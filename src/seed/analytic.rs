//! Degree-distribution mode: the analytic expected reach of `random`,
//! `degree` (highest-degree) and `acquaintance` seeding in the
//! configuration model, from generating functions (Newman 2002, "Spread of
//! epidemic disease on networks", PRE 66:016128, with the live-edge mapping
//! of the independent cascade, Kempe et al. 2003).
//!
//! Notation: degree distribution `p_k`, `G0(x) = Σ p_k x^k`,
//! `G1(x) = G0'(x)/G0'(1)`, adoption probability `p` per contact.
//! `u` solves `u = G1(1 − p + p u)`; `w = 1 − p + p u` is the probability
//! that one contact of a person does *not* lead into the large cascade.
//! The large cascade holds `S = 1 − G0(w)` of the population; a seed of
//! degree `k` joins it with probability `1 − w^k`. Along one contact the
//! expected size of the finite part reached is
//! `h = p u / (1 − p G1'(w))` (derivative of `H1(x) = 1 − p + p x G1(H1(x))`
//! at 1). For `K` seeds of degrees `k_i` in a population `N → ∞`:
//!
//! ```text
//! reach = N S (1 − Π_i w^{k_i}) + Σ_i (w^{k_i} + k_i w^{k_i − 1} h)
//! ```
//!
//! (the large cascade once if any seed joins it, plus each seed's finite
//! cascade when it stays finite). Random seeds draw `k` from `p_k`,
//! acquaintances from `k p_k / ⟨k⟩` (a random contact of a random person),
//! highest-degree seeds take the `K` largest degrees expected among `N`
//! people (walking the support from the top: `round(N P(K ≥ k))` people
//! have degree at least `k`).

use crate::degree::DegreeDistribution;

/// The generating-function solution for one distribution and `p`.
#[derive(Clone, Debug, PartialEq)]
pub struct CascadeSolution {
    /// `u = G1(1 − p + p u)` (smallest root in `[0, 1]`).
    pub u: f64,
    /// `w = 1 − p + p u`.
    pub w: f64,
    /// Large-cascade fraction `S = 1 − G0(w)`.
    pub s: f64,
    /// Mean finite size reached along one contact, `p u / (1 − p G1'(w))`.
    pub h: f64,
}

fn g0(d: &DegreeDistribution, x: f64) -> f64 {
    d.support().iter().zip(d.probabilities()).map(|(&k, &q)| q * x.powi(k as i32)).sum()
}

fn g1(d: &DegreeDistribution, x: f64) -> f64 {
    let m = d.mean();
    d.support()
        .iter()
        .zip(d.probabilities())
        .filter(|(&k, _)| k > 0)
        .map(|(&k, &q)| q * k as f64 * x.powi(k as i32 - 1))
        .sum::<f64>()
        / m
}

fn g1_prime(d: &DegreeDistribution, x: f64) -> f64 {
    let m = d.mean();
    d.support()
        .iter()
        .zip(d.probabilities())
        .filter(|(&k, _)| k > 1)
        .map(|(&k, &q)| q * k as f64 * (k as f64 - 1.0) * x.powi(k as i32 - 2))
        .sum::<f64>()
        / m
}

/// Solves the fixed point by iteration from `u = 0` (which converges to the
/// smallest root, the physical one; Newman 2002).
///
/// ```
/// use spreadplan::degree::DegreeDistribution;
/// let d = DegreeDistribution::from_spec("poisson:mean=3.5").unwrap();
/// let s = spreadplan::seed::solve_cascade(&d, 0.4);
/// assert!((s.s - 0.5110).abs() < 1e-3); // S = 1 − e^{−1.4 S} (Newman 2002)
/// ```
pub fn solve_cascade(d: &DegreeDistribution, p: f64) -> CascadeSolution {
    if d.mean() <= 0.0 {
        return CascadeSolution { u: 1.0, w: 1.0, s: 0.0, h: 0.0 };
    }
    let mut u = 0.0;
    for _ in 0..100_000 {
        let next = g1(d, 1.0 - p + p * u);
        if (next - u).abs() < 1e-15 {
            u = next;
            break;
        }
        u = next;
    }
    let w = 1.0 - p + p * u;
    let s = (1.0 - g0(d, w)).max(0.0);
    let h = p * u / (1.0 - p * g1_prime(d, w));
    CascadeSolution { u, w, s, h }
}

/// Analytic expected reach of `k` seeds of the given degrees (see the
/// module doc) in a population of `n`.
pub fn reach_of_degrees(sol: &CascadeSolution, n: f64, degrees: &[f64]) -> f64 {
    let miss: f64 = degrees.iter().map(|&k| sol.w.powf(k)).product();
    let finite: f64 = degrees
        .iter()
        .map(|&k| sol.w.powf(k) + if k > 0.0 { k * sol.w.powf(k - 1.0) * sol.h } else { 0.0 })
        .sum();
    n * sol.s * (1.0 - miss) + finite
}

/// Analytic expected reach of `budget` seeds in a population of `n` under
/// `random`, `degree` and `acquaintance` seeding, in that order.
pub fn analytic_reach(d: &DegreeDistribution, p: f64, n: f64, budget: usize) -> [(String, f64); 3] {
    let sol = solve_cascade(d, p);
    let mean = d.mean();
    let pairs: Vec<(f64, f64)> =
        d.support().iter().zip(d.probabilities()).map(|(&k, &q)| (k as f64, q)).collect();
    // E over a seed's degree of w^k and of the finite term.
    let expect = |weight: &dyn Fn(f64, f64) -> f64| -> (f64, f64) {
        let mut miss = 0.0;
        let mut fin = 0.0;
        for &(k, q) in &pairs {
            let wq = weight(k, q);
            miss += wq * sol.w.powf(k);
            fin +=
                wq * (sol.w.powf(k) + if k > 0.0 { k * sol.w.powf(k - 1.0) * sol.h } else { 0.0 });
        }
        (miss, fin)
    };
    let kk = budget as f64;
    let (m_r, f_r) = expect(&|_, q| q);
    let random = n * sol.s * (1.0 - m_r.powf(kk)) + kk * f_r;
    let (m_a, f_a) = expect(&|k, q| k * q / mean);
    let acquaintance = n * sol.s * (1.0 - m_a.powf(kk)) + kk * f_a;
    // Highest degrees: walk the support from the top; the people of degree
    // at least k are round(N·P(K ≥ k)), so the largest degree seeded is the
    // one N people realistically reach (N·P(K ≥ k) ≈ 1), not the far tail.
    let mut top = Vec::with_capacity(budget);
    let mut tail = 0.0;
    for &(k, q) in pairs.iter().rev() {
        tail += q;
        let mut people = (n * tail).round() - top.len() as f64;
        while people >= 1.0 && top.len() < budget {
            top.push(k);
            people -= 1.0;
        }
        if top.len() == budget {
            break;
        }
    }
    let degree = reach_of_degrees(&sol, n, &top);
    [("random".into(), random), ("degree".into(), degree), ("acquaintance".into(), acquaintance)]
}

/// The degree-distribution study of `spreadplan seed --degrees/--degree-model`:
/// the three rules ranked by analytic expected reach (exact numbers, no
/// intervals) in a population of `n` with adoption probability `p`.
pub fn rank_degree_seeds(
    d: &DegreeDistribution,
    p: f64,
    n: u64,
    budget: usize,
) -> Result<crate::outcome::Study, crate::seed::SeedError> {
    use crate::outcome::{Metric, RuleOutcome, Study};
    use crate::seed::SeedError;
    use serde_json::json;
    if !(0.0..=1.0).contains(&p) {
        return Err(SeedError::Probability(p));
    }
    if budget == 0 || budget as u64 > n {
        return Err(SeedError::Budget { budget, max: n as usize });
    }
    let sol = solve_cascade(d, p);
    let nf = n as f64;
    let mut rows: Vec<(String, f64)> = analytic_reach(d, p, nf, budget).into();
    rows.sort_by(|a, b| b.1.total_cmp(&a.1));
    let mut study = Study::new("seed");
    study.input.insert("degree_distribution".into(), json!(d.description()));
    study.input.insert("population".into(), json!(n));
    study.parameters.insert("budget".into(), json!(budget));
    study.parameters.insert("adopt_prob".into(), json!(p));
    study.baseline.insert("large_cascade_fraction".into(), Metric::Number(sol.s));
    study.extra.insert(
        "generating_functions".into(),
        json!({"u": sol.u, "w": sol.w, "S": sol.s, "h": sol.h}),
    );
    for (i, (rule, reach)) in rows.into_iter().enumerate() {
        let mut o = RuleOutcome {
            rule: rule.clone(),
            rank: i as u32 + 1,
            doses: budget as f64,
            information: match rule.as_str() {
                "random" => "none",
                "degree" => "contact counts",
                _ => "contact nominations",
            }
            .into(),
            ..Default::default()
        };
        o.metrics.insert("expected_reach".into(), Metric::Number(reach));
        o.metrics.insert("reach_fraction".into(), Metric::Number(reach / nf));
        o.extra.insert("expected_reach".into(), json!(reach));
        study.rules.push(o);
    }
    study.notes.push(format!(
        "configuration model, N = {n}, p = {p}: u = G1(1 - p + p u) = {:.6}, large cascade S = {:.6}; a seed of degree k joins it with probability 1 - w^k, w = {:.6} (Newman 2002 generating functions, live-edge mapping of Kempe et al. 2003)",
        sol.u, sol.s, sol.w
    ));
    study.notes.push("analytic values for N -> infinity with the finite cascades of distinct seeds not overlapping; exact numbers, no intervals".into());
    Ok(study)
}

/// Rules compared by [`simulate_degree_seeds`] (those with an analytic
/// counterpart in [`analytic_reach`]).
pub const SIMULATED_RULES: &[&str] = &["random", "degree", "acquaintance"];

/// `--simulate`: the Monte Carlo counterpart of [`rank_degree_seeds`] on a
/// sampled configuration-model network (`immunize::analytic::sample_network`).
///
/// The analytic reach of `random` and `acquaintance` seeding is an average
/// over the seeds drawn, while [`rank_seeds`](crate::seed::rank_seeds) scores
/// one drawn seed set; so `rank_seeds` runs `draws` times with independent
/// seeds (fresh seed sets and fresh live-edge realizations, `runs` each),
/// and each rule's `expected_reach` is the 95% t-interval over the `draws`
/// per-draw means (independent, so the interval covers both the choice of
/// seeds and the cascades). The budget stays `budget` seeds (not rescaled:
/// the same K people in a smaller sampled population). `reach_fraction` is
/// over the sampled size. The OPIM-C upper bound of each run is not kept
/// (it is computed from only [`SIM_BOUND_SETS`] set here).
pub fn simulate_degree_seeds(
    loaded: &crate::network::load::Loaded,
    p: f64,
    budget: usize,
    draws: u32,
    runs: u32,
    seed: u64,
    progress: &dyn crate::progress::Progress,
) -> Result<crate::outcome::Study, crate::seed::SeedError> {
    use crate::outcome::{Metric, RuleOutcome, Study};
    use crate::seed::{rank_seeds, CascadeModel, SeedConfig, SeedError};
    use serde_json::json;
    if draws < 2 {
        return Err(SeedError::Config {
            field: "draws".into(),
            value: draws.to_string(),
            reason: "must be at least 2 for an interval".into(),
        });
    }
    let mut cfg = SeedConfig::new(budget, CascadeModel::Uniform { p });
    cfg.rules = SIMULATED_RULES.iter().map(|s| s.to_string()).collect();
    cfg.runs = runs;
    cfg.bound_sets = Some(SIM_BOUND_SETS);
    let draw_key = crate::rng::key(seed, crate::rng::Stage::Rule, 0);
    let mut means: Vec<Vec<f64>> = vec![Vec::with_capacity(draws as usize); SIMULATED_RULES.len()];
    let mut first: Option<Study> = None;
    for i in 0..draws {
        cfg.seed = crate::rng::hash(draw_key, u64::from(i));
        let s = rank_seeds(loaded, &[], &cfg, progress)?;
        for (j, rule) in SIMULATED_RULES.iter().enumerate() {
            let m = s
                .rules
                .iter()
                .find(|o| o.rule == *rule)
                .and_then(|o| o.metrics.get("expected_reach"))
                .and_then(Metric::value)
                .unwrap_or(f64::NAN);
            means[j].push(m);
        }
        first.get_or_insert(s);
    }
    let first = first.expect("draws >= 2");
    let n_sim = loaded.network.node_count() as f64;
    let mut pooled: Vec<(usize, crate::stats::Estimate)> =
        means.iter().map(|m| crate::stats::mean_ci(m)).enumerate().collect();
    pooled.sort_by(|a, b| b.1.mean.total_cmp(&a.1.mean).then(a.0.cmp(&b.0)));
    let mut study = Study::new("seed");
    study.input = first.input.clone();
    study.parameters.insert("budget".into(), json!(budget));
    study.parameters.insert("adopt_prob".into(), json!(p));
    study.parameters.insert("draws".into(), json!(draws));
    study.parameters.insert("runs".into(), json!(runs));
    study.parameters.insert("seed".into(), json!(seed));
    for (rank, (j, est)) in pooled.into_iter().enumerate() {
        let template = first.rules.iter().find(|o| o.rule == SIMULATED_RULES[j]);
        let mut o = RuleOutcome {
            rule: SIMULATED_RULES[j].into(),
            rank: rank as u32 + 1,
            doses: budget as f64,
            information: template.map(|t| t.information.clone()).unwrap_or_default(),
            ..Default::default()
        };
        o.metrics.insert("expected_reach".into(), Metric::Estimate(est));
        o.metrics.insert("reach_fraction".into(), Metric::Estimate(est.scaled(1.0 / n_sim)));
        study.rules.push(o);
    }
    study.notes.extend(first.notes.iter().take(2).cloned());
    study.notes.push(format!(
        "{draws} independent draws of the seed sets, {runs} live-edge realizations each; \
         expected_reach is the 95% t-interval over the per-draw means"
    ));
    Ok(study)
}

/// RR sets for the upper bound of each simulated run: one, since that
/// bound is discarded and each RR set on a supercritical network is large.
pub const SIM_BOUND_SETS: u64 = 1;

/// Puts [`simulate_degree_seeds`] beside [`rank_degree_seeds`]: every
/// analytic rule gains `simulated_expected_reach` and
/// `simulated_reach_fraction` (Monte Carlo on `n_sim` sampled people, via
/// `immunize::analytic::merge_simulated_metrics`) and
/// `expected_reach_at_simulated_size`, the analytic reach for a population
/// of `n_sim` — the number to compare `simulated_expected_reach` with
/// (the analytic `expected_reach` is for the population N; `reach_fraction`
/// and `simulated_reach_fraction` compare directly up to the `K/N` finite
/// term).
pub fn merge_degree_simulation(
    analytic: &mut crate::outcome::Study,
    simulated: &crate::outcome::Study,
    d: &DegreeDistribution,
    p: f64,
    budget: usize,
    n_sim: u64,
) {
    use crate::outcome::Metric;
    crate::immunize::analytic::merge_simulated_metrics(
        analytic,
        simulated,
        &["expected_reach", "reach_fraction"],
        n_sim,
    );
    let at_sim = analytic_reach(d, p, n_sim as f64, budget);
    for r in &mut analytic.rules {
        if let Some((_, v)) = at_sim.iter().find(|(name, _)| *name == r.rule) {
            r.metrics.insert("expected_reach_at_simulated_size".into(), Metric::Number(*v));
        }
    }
    analytic.notes.push(format!(
        "expected_reach is analytic for the population; expected_reach_at_simulated_size is the \
         same formula for the {n_sim} sampled people, to compare with simulated_expected_reach; \
         the budget stays {budget} seeds in the sample (not rescaled)"
    ));
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Regression: highest-degree seeding took the top of the stored
    /// support (degree ≈ 25 for Poisson 3.5, cut at a 1e-12 tail) whatever
    /// N. For N = 20 000 the Poisson tail gives N·P(K ≥ 13) = 1.52 and
    /// N·P(K ≥ 12) = 5.78 (closed form Σ e^{−λ} λ^k / k!, computed by hand
    /// in a script), so the three highest degrees are 13, 13, 12.
    #[test]
    fn highest_degree_seeds_follow_the_expected_order_statistics() {
        let d = DegreeDistribution::from_spec("poisson:mean=3.5").unwrap();
        let sol = solve_cascade(&d, 0.4);
        let [_, (name, degree), _] = analytic_reach(&d, 0.4, 20_000.0, 3);
        assert_eq!(name, "degree");
        let expected = reach_of_degrees(&sol, 20_000.0, &[13.0, 13.0, 12.0]);
        assert!((degree - expected).abs() < 1e-9, "{degree} vs {expected}");
    }
}
