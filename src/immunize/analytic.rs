//! Distribution mode: rank immunization rules on a degree distribution
//! analytically (configuration model, generating functions), with no
//! network and no Monte Carlo.
//!
//! Owns the per-class vaccinated fractions v_c implied by the rules
//! `random`, `degree`, `acquaintance` and `lp`, their analytic outcomes
//! (via [`crate::degree::pgf`]), `doses_to_contain`, the budget curves and
//! the ranked [`Study`]. The LP itself is [`super::lp_allocation`].
//!
//! Outcomes for fractions v_c and all-or-nothing efficacy ε, with
//! φ_c = 1 − ε v_c and the fixed point of `degree::pgf`:
//! - `giant_fraction` S = Σ_c P_c φ_c (1 − w^{k_c});
//! - `outbreak_probability` = S (symmetric model: a random introduced case
//!   starts a large outbreak iff it sits in the giant component; Newman
//!   2002);
//! - `mean_outbreak_fraction` = S² + H0'(1)/N: the large outbreak (size S,
//!   reached with probability S) plus the expected finite outbreak of
//!   H0'(1) people (Newman 2002's ⟨s⟩, from `pgf`), divided by the
//!   population N; capped at 1 (it diverges exactly at threshold);
//! - `r_eff` = T Σ k(k−1) p_k φ_k/⟨k⟩ and `below_threshold` = r_eff < 1;
//! - `critical_transmissibility` = ⟨k⟩/Σ k(k−1) p_k φ_k;
//! - `doses_to_contain`: the fewest doses at which the rule brings r_eff
//!   down to 1 (bisection on the budget — every rule's r_eff is
//!   non-increasing in the budget — and the dual LP for `lp`).

use indexmap::IndexMap;
use serde::Deserialize;
use serde_json::{json, Value};

use super::lp_allocation::{
    least_cost_to_target, minimize_r_eff, parse_group_limits, round_doses, ClassTable, GroupLimit,
    LpAllocError, LpAllocation,
};
use crate::degree::{DegreeDistribution, Occupation};
use crate::outcome::{AllocationRow, CurvePoint, Metric, Metrics, RuleOutcome, Study};

/// Rules available in distribution mode, in display order.
pub const DISTRIBUTION_RULES: &[&str] = &["random", "degree", "acquaintance", "lp"];

/// Metrics that can rank rules here (lower is better).
pub const ANALYTIC_OBJECTIVES: &[&str] =
    &["mean_outbreak_fraction", "giant_fraction", "outbreak_probability", "r_eff"];

fn one() -> f64 {
    1.0
}
fn default_objective() -> String {
    "mean_outbreak_fraction".into()
}
fn default_points() -> usize {
    21
}

/// Configuration of [`rank_distribution`].
#[derive(Clone, Debug, Deserialize, PartialEq)]
#[serde(deny_unknown_fields)]
pub struct AnalyticConfig {
    /// Population size N.
    pub population: u64,
    /// Budget: a number of budget units (`"500"`; doses when costs are 1)
    /// or a share of the population (`"5%"` = 0.05·N units).
    pub budget: String,
    /// Transmissibility T in [0, 1].
    pub transmissibility: f64,
    /// All-or-nothing efficacy ε in (0, 1] (default 1).
    #[serde(default = "one")]
    pub efficacy: f64,
    /// Rules to rank (empty: all of [`DISTRIBUTION_RULES`]).
    #[serde(default)]
    pub rules: Vec<String>,
    /// Ranking metric, one of [`ANALYTIC_OBJECTIVES`].
    #[serde(default = "default_objective")]
    pub objective: String,
    /// Group floors and caps for `lp`, e.g. `"care-homes>=0.9,school<=0.5"`.
    #[serde(default)]
    pub group_limits: Option<String>,
    /// Also solve "least cost to reach r_eff ≤ target" for `lp`.
    #[serde(default)]
    pub target_r_eff: Option<f64>,
    /// Budget levels per curve (default 21).
    #[serde(default = "default_points")]
    pub curve_points: usize,
}

impl AnalyticConfig {
    /// A config with defaults for everything but the essentials.
    pub fn new(population: u64, budget: &str, transmissibility: f64) -> Self {
        AnalyticConfig {
            population,
            budget: budget.to_owned(),
            transmissibility,
            efficacy: 1.0,
            rules: Vec::new(),
            objective: default_objective(),
            group_limits: None,
            target_r_eff: None,
            curve_points: default_points(),
        }
    }
}

/// Why the analytic ranking cannot run.
#[derive(Debug, thiserror::Error, PartialEq)]
pub enum AnalyticError {
    /// A config field is out of range.
    #[error("{field}: {msg}")]
    Config {
        /// The field (CLI flag name without dashes).
        field: &'static str,
        /// What is wrong, with the value.
        msg: String,
    },
    /// The LP rule failed (e.g. infeasible floors).
    #[error(transparent)]
    Lp(#[from] LpAllocError),
}

fn cfg_err(field: &'static str, msg: String) -> AnalyticError {
    AnalyticError::Config { field, msg }
}

/// Analytic outcome of vaccinated fractions.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Evaluation {
    /// S.
    pub giant_fraction: f64,
    /// = S.
    pub outbreak_probability: f64,
    /// min(1, S² + H0'(1)/N).
    pub mean_outbreak_fraction: f64,
    /// T Σ k(k−1) p_k φ_k/⟨k⟩.
    pub r_eff: f64,
    /// ⟨k⟩/Σ k(k−1) p_k φ_k (`None` if nobody with two contacts is left).
    pub critical_transmissibility: Option<f64>,
}

/// Evaluates per-class fractions `v` (aligned with `dist.classes()`).
///
/// ```
/// use spreadplan::degree::DegreeDistribution;
/// use spreadplan::immunize::analytic::evaluate;
/// let d = DegreeDistribution::from_spec("regular:k=3").unwrap();
/// // Half vaccinated: r_eff = T (k − 1) (1 − 0.5) = 1 × 2 × 0.5 = 1.
/// let e = evaluate(&d, &[0.5], 1.0, 1.0, 1000.0);
/// assert!((e.r_eff - 1.0).abs() < 1e-12 && e.giant_fraction == 0.0);
/// ```
pub fn evaluate(dist: &DegreeDistribution, v: &[f64], t: f64, efficacy: f64, n: f64) -> Evaluation {
    let phi: Vec<f64> = v.iter().map(|&x| 1.0 - efficacy * x).collect();
    let occ = Occupation::from_class_phi(dist, &phi);
    let fp = occ.solve(t);
    let s = fp.giant_fraction;
    Evaluation {
        giant_fraction: s,
        outbreak_probability: s,
        mean_outbreak_fraction: (s * s + fp.small_outbreak_mean / n.max(1.0)).min(1.0),
        r_eff: fp.r_eff,
        critical_transmissibility: occ.critical_transmissibility(),
    }
}

/// `random`: offer doses to people uniformly at random; class c accepts
/// with probability uptake_c, so v_c = o·uptake_c with the offer share o
/// spending the budget, o = min(1, B / Σ cost_c n_c uptake_c).
pub fn random_fractions(table: &ClassTable, budget: f64) -> Vec<f64> {
    let full: f64 =
        (0..table.len()).map(|c| table.cost[c] * table.count[c] * table.uptake[c]).sum();
    let o = if full > 0.0 { (budget / full).min(1.0) } else { 0.0 };
    table.uptake.iter().map(|u| o * u).collect()
}

/// `degree`: highest degree classes first, each up to its uptake; the last
/// class reached gets the fractional remainder. Classes of equal degree
/// (different groups) share the remainder in proportion to their cost of
/// full coverage.
pub fn degree_fractions(table: &ClassTable, budget: f64) -> Vec<f64> {
    let mut v = vec![0.0; table.len()];
    let mut left = budget;
    let mut c = table.len();
    while c > 0 && left > 0.0 {
        // Classes are sorted by degree: take the block of equal degree.
        let k = table.degree[c - 1];
        let mut start = c - 1;
        while start > 0 && table.degree[start - 1] == k {
            start -= 1;
        }
        let full: f64 = (start..c).map(|i| table.cost[i] * table.count[i] * table.uptake[i]).sum();
        let f = if full > 0.0 { (left / full).min(1.0) } else { 0.0 };
        for (vi, u) in v[start..c].iter_mut().zip(&table.uptake[start..c]) {
            *vi = f * u;
        }
        left -= f * full;
        c = start;
    }
    v
}

/// `acquaintance` (Cohen, Havlin & ben-Avraham 2003): people chosen at
/// random each name a random contact, who is offered a dose.
///
/// Derivation: with pN nominations, each naming one of the N⟨k⟩ contact
/// ends uniformly, a degree-k person is never named with probability
/// (1 − k/(N⟨k⟩))^{pN} → e^{−pk/⟨k⟩} for large N. A named person accepts
/// with probability uptake_c (a refusal or a repeat nomination uses no
/// dose), so v_c = uptake_c (1 − e^{−p k_c/⟨k⟩}). The budget fixes p (the
/// nominations per person, may exceed 1) through
/// Σ_c cost_c n_c v_c(p) = B, solved by bisection (spend is increasing in
/// p). Returns the fractions and p (infinite when the budget covers every
/// nominable person).
pub fn acquaintance_fractions(table: &ClassTable, budget: f64) -> (Vec<f64>, f64) {
    let m = table.mean_degree;
    let at = |p: f64| -> Vec<f64> {
        (0..table.len())
            .map(|c| {
                let k = f64::from(table.degree[c]);
                if m > 0.0 {
                    table.uptake[c] * (1.0 - (-p * k / m).exp())
                } else {
                    0.0
                }
            })
            .collect()
    };
    let max_spend: f64 = (0..table.len())
        .filter(|&c| table.degree[c] > 0)
        .map(|c| table.cost[c] * table.count[c] * table.uptake[c])
        .sum();
    if budget <= 0.0 || max_spend <= 0.0 {
        return (vec![0.0; table.len()], 0.0);
    }
    if budget >= max_spend * (1.0 - 1e-12) {
        let v = (0..table.len())
            .map(|c| if table.degree[c] > 0 { table.uptake[c] } else { 0.0 })
            .collect();
        return (v, f64::INFINITY);
    }
    let (mut lo, mut hi) = (0.0, 1.0);
    while table.spend(&at(hi)) < budget && hi < 1e12 {
        hi *= 2.0;
    }
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if table.spend(&at(mid)) < budget {
            lo = mid;
        } else {
            hi = mid;
        }
        if hi - lo <= 1e-15 * hi {
            break;
        }
    }
    (at(lo), lo)
}

/// The fractions of `rule` at `budget`.
pub fn allocate(
    rule: &str,
    table: &ClassTable,
    budget: f64,
    limits: &[GroupLimit],
) -> Result<Vec<f64>, AnalyticError> {
    Ok(match rule {
        "random" => random_fractions(table, budget),
        "degree" => degree_fractions(table, budget),
        "acquaintance" => acquaintance_fractions(table, budget).0,
        "lp" => minimize_r_eff(table, budget, limits)?.fractions,
        other => {
            return Err(cfg_err(
                "rules",
                format!("unknown rule {other:?}; known rules: {}", DISTRIBUTION_RULES.join(", ")),
            ))
        }
    })
}

/// What a rule needs to know.
fn information(rule: &str) -> &'static str {
    match rule {
        "random" => "none",
        "acquaintance" => "a named contact",
        "degree" => "contact counts",
        _ => "contact counts, groups, costs",
    }
}

/// Parses a budget string against the population.
pub fn parse_budget(s: &str, population: f64) -> Result<f64, AnalyticError> {
    let t = s.trim();
    let (num, pct) = match t.strip_suffix('%') {
        Some(x) => (x.trim(), true),
        None => (t, false),
    };
    let x: f64 = num
        .parse()
        .map_err(|_| cfg_err("budget", format!("expected a count or a percentage, got {s:?}")))?;
    if !x.is_finite() || x < 0.0 {
        return Err(cfg_err("budget", format!("must be >= 0, got {s:?}")));
    }
    if pct && x > 100.0 {
        return Err(cfg_err("budget", format!("a percentage must be at most 100%, got {s:?}")));
    }
    Ok(if pct { x / 100.0 * population } else { x })
}

/// The fewest doses (people) with which `rule` brings r_eff down to 1, or
/// `Text("not within N")`.
fn doses_to_contain(
    rule: &str,
    dist: &DegreeDistribution,
    table: &ClassTable,
    cfg: &AnalyticConfig,
    limits: &[GroupLimit],
    total_cost: f64,
) -> Result<Metric, AnalyticError> {
    let (t, e) = (cfg.transmissibility, cfg.efficacy);
    let not_within = Metric::Text(format!("not within {}", cfg.population));
    if rule == "lp" {
        return Ok(match least_cost_to_target(table, 1.0, t, e, limits) {
            Ok(a) => Metric::Count((table.doses(&a.fractions) - 1e-9).ceil().max(0.0) as u64),
            Err(LpAllocError::Lp(crate::lp::LpError::Infeasible)) => not_within,
            Err(err) => return Err(err.into()),
        });
    }
    let r = |b: f64| -> Result<(f64, f64), AnalyticError> {
        let v = allocate(rule, table, b, limits)?;
        Ok((evaluate(dist, &v, t, e, table.population).r_eff, table.doses(&v)))
    };
    if r(0.0)?.0 <= 1.0 {
        return Ok(Metric::Count(0));
    }
    if r(total_cost)?.0 > 1.0 {
        return Ok(not_within);
    }
    let (mut lo, mut hi) = (0.0, total_cost);
    for _ in 0..100 {
        let mid = 0.5 * (lo + hi);
        if r(mid)?.0 > 1.0 {
            lo = mid;
        } else {
            hi = mid;
        }
        if hi - lo <= 1e-9 * total_cost.max(1.0) {
            break;
        }
    }
    Ok(Metric::Count((r(hi)?.1 - 1e-6).ceil().max(0.0) as u64))
}

fn metrics_of(ev: &Evaluation) -> Metrics {
    let mut m = Metrics::new();
    m.insert("giant_fraction".into(), Metric::Number(ev.giant_fraction));
    m.insert("mean_outbreak_fraction".into(), Metric::Number(ev.mean_outbreak_fraction));
    m.insert("outbreak_probability".into(), Metric::Number(ev.outbreak_probability));
    m.insert("r_eff".into(), Metric::Number(ev.r_eff));
    m.insert("below_threshold".into(), Metric::Flag(ev.r_eff < 1.0));
    m.insert(
        "critical_transmissibility".into(),
        match ev.critical_transmissibility {
            Some(x) => Metric::Number(x),
            None => Metric::Text("none (no one with two or more contacts is left)".into()),
        },
    );
    m
}

fn objective_value(ev: &Evaluation, objective: &str) -> f64 {
    match objective {
        "giant_fraction" => ev.giant_fraction,
        "outbreak_probability" => ev.outbreak_probability,
        "r_eff" => ev.r_eff,
        _ => ev.mean_outbreak_fraction,
    }
}

fn lp_json(a: &LpAllocation, table: &ClassTable, t: f64, e: f64) -> Value {
    json!({
        "r_eff_optimum": table.r_eff(&a.fractions, t, e),
        "objective_reduction": a.objective,
        "spend": a.spend,
        "binding": a.binding,
        "at_uptake_ceiling": a.at_ceiling,
    })
}

/// Ranks the distribution-mode rules on `dist` (see the module docs for
/// every metric). Rules come in rank order by `cfg.objective` (lower is
/// better; ties by r_eff, then by the order of [`DISTRIBUTION_RULES`]).
/// Metrics are plain numbers (analytic, no intervals); allocation rows are
/// integer doses per class ("degree 7", group); curves cover budget levels
/// from 0 to min(total, 2 × budget).
///
/// ```
/// use spreadplan::degree::DegreeDistribution;
/// use spreadplan::immunize::analytic::{rank_distribution, AnalyticConfig};
/// let d = DegreeDistribution::from_spec("powerlaw:exponent=2.5,min=2,max=100").unwrap();
/// let s = rank_distribution(&d, &AnalyticConfig::new(10_000, "10%", 0.5)).unwrap();
/// assert_eq!(s.rules.len(), 4);
/// assert_ne!(s.rules[0].rule, "random");
/// ```
pub fn rank_distribution(
    dist: &DegreeDistribution,
    cfg: &AnalyticConfig,
) -> Result<Study, AnalyticError> {
    let (t, e) = (cfg.transmissibility, cfg.efficacy);
    if !(0.0..=1.0).contains(&t) {
        return Err(cfg_err("transmissibility", format!("must be in [0, 1], got {t}")));
    }
    if !(e > 0.0 && e <= 1.0) {
        return Err(cfg_err("efficacy", format!("must be in (0, 1], got {e}")));
    }
    if cfg.population == 0 {
        return Err(cfg_err("population", "must be at least 1, got 0".into()));
    }
    if !ANALYTIC_OBJECTIVES.contains(&cfg.objective.as_str()) {
        return Err(cfg_err(
            "objective",
            format!(
                "unknown metric {:?}; known: {}",
                cfg.objective,
                ANALYTIC_OBJECTIVES.join(", ")
            ),
        ));
    }
    if let Some(x) = cfg.target_r_eff {
        if !(x.is_finite() && x >= 0.0) {
            return Err(cfg_err("target-r-eff", format!("must be >= 0, got {x}")));
        }
    }
    let n = cfg.population as f64;
    let table = ClassTable::from_distribution(dist, n);
    let total_cost: f64 = (0..table.len()).map(|c| table.cost[c] * table.count[c]).sum();
    let budget = parse_budget(&cfg.budget, n)?;
    if budget > total_cost * (1.0 + 1e-12) {
        return Err(cfg_err(
            "budget",
            format!("{} exceeds the cost of vaccinating everyone ({total_cost})", cfg.budget),
        ));
    }
    let limits = match &cfg.group_limits {
        Some(s) => parse_group_limits(s)?,
        None => Vec::new(),
    };
    let rules: Vec<String> = if cfg.rules.is_empty() {
        DISTRIBUTION_RULES.iter().map(|s| s.to_string()).collect()
    } else {
        let mut r: Vec<String> = Vec::new();
        for x in &cfg.rules {
            if !DISTRIBUTION_RULES.contains(&x.as_str()) {
                return Err(cfg_err(
                    "rules",
                    format!("unknown rule {x:?}; known rules: {}", DISTRIBUTION_RULES.join(", ")),
                ));
            }
            if !r.contains(x) {
                r.push(x.clone());
            }
        }
        r
    };

    let mut study = Study::new("immunize");
    study.input.insert("degree_distribution".into(), Value::from(dist.description()));
    study.input.insert("population".into(), Value::from(cfg.population));
    study.input.insert("classes".into(), Value::from(table.len()));
    let p = &mut study.parameters;
    p.insert("mode".into(), Value::from("analytic"));
    p.insert("budget".into(), Value::from(cfg.budget.clone()));
    p.insert("budget_units".into(), json!(budget));
    p.insert("transmissibility".into(), json!(t));
    p.insert("efficacy".into(), json!(e));
    p.insert("rules".into(), json!(rules));
    p.insert("objective".into(), Value::from(cfg.objective.clone()));
    if let Some(g) = &cfg.group_limits {
        p.insert("group_limits".into(), Value::from(g.clone()));
    }
    if let Some(x) = cfg.target_r_eff {
        p.insert("target_r_eff".into(), json!(x));
    }

    let base = evaluate(dist, &vec![0.0; table.len()], t, e, n);
    study.baseline = metrics_of(&base);

    let mut outcomes: Vec<(f64, f64, usize, RuleOutcome, Vec<u64>)> = Vec::new();
    for (ri, rule) in rules.iter().enumerate() {
        let mut extra: IndexMap<String, Value> = IndexMap::new();
        let v = match rule.as_str() {
            "lp" => {
                let a = minimize_r_eff(&table, budget, &limits)?;
                extra.insert("lp".into(), lp_json(&a, &table, t, e));
                a.fractions
            }
            "acquaintance" => {
                let (v, p) = acquaintance_fractions(&table, budget);
                extra.insert(
                    "nominations_per_person".into(),
                    if p.is_finite() { json!(p) } else { Value::from("unbounded") },
                );
                v
            }
            r => allocate(r, &table, budget, &limits)?,
        };
        let ev = evaluate(dist, &v, t, e, n);
        let mut metrics = metrics_of(&ev);
        let contain = doses_to_contain(rule, dist, &table, cfg, &limits, total_cost)?;
        metrics.insert("doses_to_contain".into(), contain.clone());
        extra.insert(
            "doses_to_contain".into(),
            serde_json::to_value(&contain).unwrap_or(Value::Null),
        );
        extra.insert("mode".into(), Value::from("analytic"));
        let doses = round_doses(&table, &v, budget, &limits);
        extra.insert(
            "vaccinated_fraction".into(),
            Value::Array(
                (0..table.len())
                    .filter(|&c| v[c] > 0.0)
                    .map(|c| json!({"class": table.label(c), "group": table.group_name(c), "fraction": v[c]}))
                    .collect(),
            ),
        );
        let o = RuleOutcome {
            rule: rule.clone(),
            rank: 0,
            doses: doses.iter().sum::<u64>() as f64,
            information: information(rule).to_owned(),
            metrics,
            extra,
        };
        outcomes.push((objective_value(&ev, &cfg.objective), ev.r_eff, ri, o, doses));
    }
    outcomes.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.total_cmp(&b.1)).then(a.2.cmp(&b.2)));
    for (i, (_, _, _, mut o, doses)) in outcomes.into_iter().enumerate() {
        o.rank = i as u32 + 1;
        for (c, &d) in doses.iter().enumerate() {
            if d > 0 {
                study.allocation.push(AllocationRow {
                    rule: o.rule.clone(),
                    order: c as u64 + 1,
                    id: table.label(c),
                    group: table.group_name(c),
                    doses: d as f64,
                });
            }
        }
        study.rules.push(o);
    }

    // Curves over budget levels.
    let top = total_cost.min((2.0 * budget).max(total_cost.min(1.0)));
    let pts = cfg.curve_points.max(2);
    let mut levels: Vec<f64> = (0..pts).map(|i| top * i as f64 / (pts - 1) as f64).collect();
    if !levels.iter().any(|&x| (x - budget).abs() < 1e-9) {
        levels.push(budget);
        levels.sort_by(f64::total_cmp);
    }
    for rule in &rules {
        for &b in &levels {
            let v = match allocate(rule, &table, b, &limits) {
                Ok(v) => v,
                // Floors may be infeasible at small budgets: no point there.
                Err(AnalyticError::Lp(_)) => continue,
                Err(x) => return Err(x),
            };
            let ev = evaluate(dist, &v, t, e, n);
            for (name, val) in [
                ("giant_fraction", ev.giant_fraction),
                ("mean_outbreak_fraction", ev.mean_outbreak_fraction),
                ("outbreak_probability", ev.outbreak_probability),
                ("r_eff", ev.r_eff),
            ] {
                study.curves.push(CurvePoint {
                    rule: rule.clone(),
                    budget: b,
                    metric: name.into(),
                    mean: val,
                    ci_low: val,
                    ci_high: val,
                });
            }
        }
    }

    let kappa = dist.kappa();
    let mut d = serde_json::Map::new();
    d.insert("description".into(), Value::from(dist.description()));
    d.insert("mean".into(), json!(dist.mean()));
    d.insert("second_moment".into(), json!(dist.second_moment()));
    d.insert("kappa".into(), json!(kappa));
    d.insert("max_degree".into(), json!(dist.max_degree()));
    d.insert("dropped_tail".into(), json!(dist.dropped_tail()));
    study.extra.insert("degree_distribution".into(), Value::Object(d));
    study.extra.insert("mode".into(), Value::from("analytic"));
    if t * kappa > 0.0 {
        // Callaway et al. 2000: random coverage that reaches r_eff = 1.
        let vc = (1.0 - 1.0 / (t * kappa)) / e;
        study.extra.insert("random_critical_coverage".into(), json!(vc.max(0.0)));
    }
    if let (Some(target), true) = (cfg.target_r_eff, rules.iter().any(|r| r == "lp")) {
        let v = match least_cost_to_target(&table, target, t, e, &limits) {
            Ok(a) => {
                let mut j = lp_json(&a, &table, t, e);
                j["target_r_eff"] = json!(target);
                j["doses"] = json!(a.doses.iter().sum::<u64>());
                j["cost"] = json!(a.spend);
                j["doses_per_class"] = Value::Array(
                    (0..table.len())
                        .filter(|&c| a.doses[c] > 0)
                        .map(|c| json!({"class": table.label(c), "group": table.group_name(c), "doses": a.doses[c]}))
                        .collect(),
                );
                j
            }
            Err(LpAllocError::Lp(crate::lp::LpError::Infeasible)) => json!({
                "target_r_eff": target,
                "result": "not reachable within uptake, caps and population",
            }),
            Err(x) => return Err(x.into()),
        };
        study.extra.insert("lp_target".into(), v);
    }
    study.notes = vec![
        "analytic: configuration model with this degree distribution (generating functions, \
         Callaway et al. 2000; Newman 2002); metrics are exact for N → ∞, without intervals"
            .into(),
        "outbreak_probability = giant_fraction in this symmetric model; mean_outbreak_fraction = \
         S² + (mean finite outbreak size)/N"
            .into(),
        "the lp rule is exact here: the configuration model's next-generation matrix is rank one, \
         so r_eff is linear in the class fractions; with only the budget binding it is the \
         fractional knapsack by k(k-1)p_k per unit cost. General group-to-group mixing is not \
         convex and is not handled"
            .into(),
        "acquaintance: a degree-k person is named by none of pN nominations with probability \
         e^(-pk/<k>) (Cohen, Havlin & ben-Avraham 2003)"
            .into(),
        "doses per class are rounded: floor of n_c v_c, then the leftover budget by largest \
         k(k-1)/cost within uptake and caps; doses_to_contain is where r_eff reaches 1"
            .into(),
    ];
    study.cautions = vec![crate::outcome::IMMUNIZATION_CAUTION.to_owned()];
    Ok(study)
}

/// `--simulate`: a configuration-model network of `n` people whose degrees
/// are drawn from `dist` ([`DegreeDistribution::sample_degrees`], stream
/// `Stage::Generate`), paired uniformly and made simple by erasing
/// self-loops and multi-edges (`network::generate::configuration_model`,
/// counted in the returned report). Groups, costs and uptake of a grouped
/// table are not carried over: the sampled people are numbered `0..n`.
pub fn sample_network(
    dist: &DegreeDistribution,
    n: usize,
    seed: u64,
) -> Result<crate::network::load::Loaded, crate::network::generate::GenerateError> {
    let degrees = dist.sample_degrees(n, seed);
    let g = crate::network::generate::configuration_model(&degrees, seed)?;
    let mut report = crate::network::load::LoadReport {
        path: format!("configuration model of {} (n = {n}, seed {seed})", dist.description()),
        ..Default::default()
    };
    report.self_loops_dropped = g.report.self_loops_dropped;
    report.duplicates_merged = g.report.duplicates_merged;
    Ok(crate::network::load::Loaded {
        network: g.network,
        nodes: crate::network::NodeTable::numbered(n),
        report,
    })
}

/// Puts a Monte Carlo study of a sampled network (`simulated`, from
/// `immunize::rank_network` on [`sample_network`]) beside the analytic one:
/// each analytic rule gains `simulated_<metric>` metrics (estimates with
/// 95% intervals) for giant_fraction, mean_outbreak_fraction,
/// outbreak_probability, r_eff, and `simulated_doses_to_contain` rescaled
/// from the sampled size `n_sim` to the population; the simulated rank is
/// kept as `simulated_rank`. The shared part is [`merge_simulated_metrics`].
pub fn merge_simulated(analytic: &mut Study, simulated: &Study, n_sim: u64, population: u64) {
    let scale = population as f64 / n_sim.max(1) as f64;
    merge_simulated_metrics(
        analytic,
        simulated,
        &["giant_fraction", "mean_outbreak_fraction", "outbreak_probability", "r_eff"],
        n_sim,
    );
    for r in &mut analytic.rules {
        let Some(s) = simulated.rules.iter().find(|x| x.rule == r.rule) else { continue };
        let dtc = match s.metrics.get("doses_to_contain") {
            Some(Metric::Count(c)) => Metric::Number((*c as f64 * scale).round()),
            Some(Metric::Number(x)) => Metric::Number((x * scale).round()),
            Some(Metric::Estimate(e)) => Metric::Number((e.mean * scale).round()),
            Some(other) => other.clone(),
            None => Metric::Missing,
        };
        r.metrics.insert("simulated_doses_to_contain".into(), dtc);
    }
    analytic
        .notes
        .push(format!("simulated_doses_to_contain rescaled to the population of {population}"));
}

/// The command-independent part of a `--simulate` merge (used by
/// immunization and seeding): for each analytic rule with a namesake in
/// `simulated`, copies each listed metric as `simulated_<metric>` (as
/// computed on the sampled network of `n_sim` people, not rescaled) and
/// the simulated rank as `simulated_rank`; records the simulation's input
/// and parameters under `extra.simulation` and appends its notes.
pub fn merge_simulated_metrics(
    analytic: &mut Study,
    simulated: &Study,
    metrics: &[&str],
    n_sim: u64,
) {
    for r in &mut analytic.rules {
        let Some(s) = simulated.rules.iter().find(|x| x.rule == r.rule) else { continue };
        for m in metrics {
            if let Some(v) = s.metrics.get(*m) {
                r.metrics.insert(format!("simulated_{m}"), v.clone());
            }
        }
        r.extra.insert("simulated_rank".into(), json!(s.rank));
    }
    analytic.extra.insert(
        "simulation".into(),
        json!({
            "people": n_sim,
            "input": simulated.input,
            "parameters": simulated.parameters,
        }),
    );
    analytic.notes.push(format!(
        "simulated_* metrics: Monte Carlo on a configuration-model network of {n_sim} people \
         sampled from the distribution (95% intervals)"
    ));
    analytic.notes.extend(simulated.notes.iter().map(|n| format!("simulation: {n}")));
}
