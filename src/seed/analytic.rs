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
//! people (walking the support from the top, `round(N p_k)` people of
//! degree `k`, at least one of the top degree).

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
    // Highest degrees: walk the support from the top, N·p_k people each.
    let mut top = Vec::with_capacity(budget);
    for &(k, q) in pairs.iter().rev() {
        let mut people = (n * q).round().max(if top.is_empty() { 1.0 } else { 0.0 });
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
