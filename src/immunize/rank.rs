//! [`rank_network`]: the network-mode immunization study — validate an
//! [`ImmunizeConfig`], compute each rule's removal order, evaluate all of
//! them on common random numbers, rank by the objective and fill an
//! [`outcome::Study`](crate::outcome::Study).

use std::borrow::Cow;

use indexmap::IndexMap;
use serde::{Deserialize, Serialize};
use serde_json::{json, Value};

use super::evaluate::{self, DoseBudget, RealizationOutcome};
use super::lp_allocation::{
    least_cost_to_target, parse_group_limits, GroupLimit, LpAllocError, LpAllocation, NetworkLpPlan,
};
use super::{removal_order, Rule, RuleParams, NETWORK_RULES};
use crate::network::load::Loaded;
use crate::outcome::{AllocationRow, CurvePoint, Metric, Metrics, RuleOutcome, Study};
use crate::percolation::{BudgetCurveConfig, Transmissibility};
use crate::progress::Progress;
use crate::rng::{self, Stage};
use crate::stats::{self, Estimate};

/// A dose budget: a count, a share of the population, or cost units.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(untagged)]
pub enum Budget {
    /// A number: doses, or cost units when the node table gives costs.
    Amount(f64),
    /// Text: `"500"` or `"5%"` (a share of the people; of the total dose
    /// cost of all candidates when costs are given).
    Text(String),
}

impl Budget {
    /// Parses `"500"`, `"5%"` or `"12.5"`.
    pub fn parse(s: &str) -> Result<Budget, ImmunizeError> {
        let s = s.trim();
        if s.strip_suffix('%').is_some() {
            Budget::Text(s.to_owned()).check()
        } else {
            s.parse::<f64>()
                .map(Budget::Amount)
                .map_err(|_| ImmunizeError::Budget(s.to_owned()))
                .and_then(Budget::check)
        }
    }

    fn check(self) -> Result<Budget, ImmunizeError> {
        match &self {
            Budget::Amount(x) if !(x.is_finite() && *x >= 0.0) => {
                Err(ImmunizeError::Budget(x.to_string()))
            }
            Budget::Text(t) => {
                let p = t.trim().strip_suffix('%').unwrap_or(t).trim();
                match p.parse::<f64>() {
                    Ok(x) if x.is_finite() && (0.0..=100.0).contains(&x) => Ok(self),
                    _ => Err(ImmunizeError::Budget(t.clone())),
                }
            }
            _ => Ok(self),
        }
    }

    /// (amount, is_percent)
    fn amount(&self) -> Result<(f64, bool), ImmunizeError> {
        match self {
            Budget::Amount(x) => Ok((*x, false)),
            Budget::Text(t) => {
                let tt = t.trim();
                if let Some(p) = tt.strip_suffix('%') {
                    p.trim()
                        .parse::<f64>()
                        .map(|x| (x, true))
                        .map_err(|_| ImmunizeError::Budget(t.clone()))
                } else {
                    tt.parse::<f64>()
                        .map(|x| (x, false))
                        .map_err(|_| ImmunizeError::Budget(t.clone()))
                }
            }
        }
    }
}

fn default_efficacy() -> f64 {
    1.0
}
fn default_objective() -> String {
    "mean_outbreak_fraction".to_owned()
}
fn default_runs() -> u32 {
    100
}
fn default_seed() -> u64 {
    20_261_202
}
fn default_ci_radius() -> u32 {
    2
}
fn default_curve_points() -> usize {
    200
}
fn default_dismantle() -> f64 {
    0.01
}

/// Everything a network-mode immunization study needs besides the network.
/// Scenarios embed it (serde); the CLI fills it from its arguments.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ImmunizeConfig {
    /// Doses (or cost units, or a share with `%`).
    pub budget: Budget,
    /// Probability that a contact transmits, in `[0, 1]`; multiplies a
    /// per-contact weight when the network has weights.
    pub transmissibility: f64,
    /// Probability that a dose makes its recipient immune, in `(0, 1]`.
    #[serde(default = "default_efficacy")]
    pub efficacy: f64,
    /// Rule names; empty = every network rule.
    #[serde(default)]
    pub rules: Vec<String>,
    /// Metric that ranks the rules (lower is better).
    #[serde(default = "default_objective")]
    pub objective: String,
    /// Monte Carlo realizations.
    #[serde(default = "default_runs")]
    pub runs: u32,
    /// Master seed.
    #[serde(default = "default_seed")]
    pub seed: u64,
    /// Ball radius ℓ of Collective Influence.
    #[serde(default = "default_ci_radius")]
    pub ci_radius: u32,
    /// At most this many budget levels per curve in the output.
    #[serde(default = "default_curve_points")]
    pub curve_points: usize,
    /// Giant size (fraction of N) that counts as dismantled for the
    /// Collective Influence reinsertion step.
    #[serde(default = "default_dismantle")]
    pub dismantle_target: f64,
    /// Group floors and caps for the `lp` rule, e.g.
    /// `"care-homes>=0.9,school<=0.5"` (fractions of each group's people;
    /// groups come from the node table).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub group_limits: Option<String>,
    /// For the `lp` rule: also report the least cost (fewest doses with
    /// unit costs) that brings the analytic configuration-model r_eff of
    /// the network's classes to this value.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub target_r_eff: Option<f64>,
}

impl ImmunizeConfig {
    /// A config with defaults for everything but the budget and T.
    pub fn new(budget: Budget, transmissibility: f64) -> Self {
        ImmunizeConfig {
            budget,
            transmissibility,
            efficacy: 1.0,
            rules: Vec::new(),
            objective: default_objective(),
            runs: default_runs(),
            seed: default_seed(),
            ci_radius: default_ci_radius(),
            curve_points: default_curve_points(),
            dismantle_target: default_dismantle(),
            group_limits: None,
            target_r_eff: None,
        }
    }
}

/// Objectives a ranking can use (all: lower is better).
pub const OBJECTIVES: &[&str] = &[
    "mean_outbreak_fraction",
    "giant_fraction",
    "outbreak_probability",
    "r_eff",
    "robustness",
    "doses_to_contain",
];

/// Why an immunization study cannot run.
#[derive(Debug, thiserror::Error, PartialEq)]
pub enum ImmunizeError {
    /// Transmissibility outside `[0, 1]`.
    #[error("transmissibility must lie in [0, 1], got {0}")]
    Transmissibility(f64),
    /// Efficacy outside `(0, 1]`.
    #[error("efficacy must lie in (0, 1], got {0}")]
    Efficacy(f64),
    /// A budget that is not a non-negative number or a share in `[0, 100]%`.
    #[error("budget must be a non-negative number of doses or a share like 5%, got {0:?}")]
    Budget(String),
    /// More doses than people.
    #[error("budget of {budget} doses exceeds the {people} people in the network")]
    BudgetTooLarge {
        /// The budget.
        budget: f64,
        /// People in the network.
        people: usize,
    },
    /// An unknown rule name.
    #[error("unknown rule {0:?}; known rules: {known}", known = NETWORK_RULES.join(", "))]
    UnknownRule(String),
    /// An unknown objective.
    #[error("unknown objective {0:?}; known objectives: {known}", known = OBJECTIVES.join(", "))]
    UnknownObjective(String),
    /// Directed networks are not supported.
    #[error("immunization treats contacts as symmetric; load the network as undirected (without --directed)")]
    Directed,
    /// A bad parameter, named with its value.
    #[error("{name} must be {need}, got {value}")]
    Parameter {
        /// Field name.
        name: &'static str,
        /// What it must be.
        need: &'static str,
        /// The bad value.
        value: String,
    },
    /// The percolation engine refused the input.
    #[error(transparent)]
    Percolation(#[from] crate::percolation::PercolationError),
    /// The `lp` rule's group limits or class LP failed.
    #[error(transparent)]
    Lp(#[from] LpAllocError),
}

const METRICS3: [&str; 3] = ["giant_fraction", "mean_outbreak_fraction", "outbreak_probability"];

/// What the validation resolved.
struct Resolved {
    rules: Vec<Rule>,
    budget: DoseBudget,
    nominal_doses: Option<u64>,
    limits: Vec<GroupLimit>,
}

fn resolve(loaded: &Loaded, cfg: &ImmunizeConfig) -> Result<Resolved, ImmunizeError> {
    let net = &loaded.network;
    if net.is_directed() {
        return Err(ImmunizeError::Directed);
    }
    if !(0.0..=1.0).contains(&cfg.transmissibility) {
        return Err(ImmunizeError::Transmissibility(cfg.transmissibility));
    }
    if !(cfg.efficacy > 0.0 && cfg.efficacy <= 1.0) {
        return Err(ImmunizeError::Efficacy(cfg.efficacy));
    }
    if !OBJECTIVES.contains(&cfg.objective.as_str()) {
        return Err(ImmunizeError::UnknownObjective(cfg.objective.clone()));
    }
    if cfg.runs == 0 {
        return Err(ImmunizeError::Parameter {
            name: "runs",
            need: "at least 1",
            value: cfg.runs.to_string(),
        });
    }
    if !(cfg.dismantle_target > 0.0 && cfg.dismantle_target <= 1.0) {
        return Err(ImmunizeError::Parameter {
            name: "dismantle_target",
            need: "in (0, 1]",
            value: cfg.dismantle_target.to_string(),
        });
    }
    if let Some(x) = cfg.target_r_eff {
        if !(x.is_finite() && x >= 0.0) {
            return Err(ImmunizeError::Parameter {
                name: "target_r_eff",
                need: "a non-negative number",
                value: x.to_string(),
            });
        }
    }
    let limits = match &cfg.group_limits {
        Some(text) => parse_group_limits(text)?,
        None => Vec::new(),
    };
    let mut rules = Vec::new();
    if cfg.rules.is_empty() {
        rules.extend(Rule::ALL);
    }
    for name in &cfg.rules {
        let r =
            Rule::from_name(name.trim()).ok_or_else(|| ImmunizeError::UnknownRule(name.clone()))?;
        if !rules.contains(&r) {
            rules.push(r);
        }
    }
    let n = net.node_count();
    let (amount, pct) = cfg.budget.clone().check()?.amount()?;
    let nodes = &loaded.nodes;
    let (budget, nominal) = if nodes.cost.is_some() {
        let total: f64 =
            (0..n as u32).filter(|&v| !nodes.is_immune(v)).map(|v| nodes.cost_of(v)).sum();
        let c = if pct { amount / 100.0 * total } else { amount };
        (DoseBudget::Cost(c), None)
    } else {
        let d = if pct { amount / 100.0 * n as f64 } else { amount };
        if d > n as f64 {
            return Err(ImmunizeError::BudgetTooLarge { budget: d, people: n });
        }
        let d = d.round() as u64;
        (DoseBudget::Doses(d), Some(d))
    };
    Ok(Resolved { rules, budget, nominal_doses: nominal, limits })
}

fn est_json(e: &Estimate) -> Value {
    json!({"mean": e.mean, "ci_low": e.ci_low, "ci_high": e.ci_high})
}

/// Ranks immunization rules on a contact network (Monte Carlo on common
/// random numbers). See the module docs of `immunize` for the model.
///
/// ```
/// use spreadplan::immunize::{rank_network, Budget, ImmunizeConfig};
/// use spreadplan::network::{load::Loaded, Network, NodeTable, WeightMerge};
/// // A star of 6: one dose on the hub leaves only isolated people.
/// let (network, _) = Network::from_edges(6, false, (1..6).map(|i| (0, i)).collect(), None,
///     WeightMerge::Max).unwrap();
/// let loaded = Loaded { network, nodes: NodeTable::numbered(6), report: Default::default() };
/// let mut cfg = ImmunizeConfig::new(Budget::Amount(1.0), 1.0);
/// cfg.rules = vec!["degree".into()];
/// cfg.runs = 4;
/// let s = rank_network(&loaded, &cfg, &spreadplan::progress::Silent).unwrap();
/// assert_eq!(s.rules[0].metrics["giant_fraction"].value(), Some(1.0 / 6.0));
/// ```
pub fn rank_network(
    loaded: &Loaded,
    cfg: &ImmunizeConfig,
    progress: &dyn Progress,
) -> Result<Study, ImmunizeError> {
    let res = resolve(loaded, cfg)?;
    let net = &loaded.network;
    let nodes = &loaded.nodes;
    let n = net.node_count();
    let absent_vec: Option<Vec<bool>> = nodes
        .immune
        .as_ref()
        .map(|im| (0..n).map(|v| im.get(v).copied().unwrap_or(false)).collect());
    let absent = absent_vec.as_deref();
    let params = RuleParams { ci_radius: cfg.ci_radius, dismantle_target: cfg.dismantle_target };
    let transmissibility = match net.weights() {
        None => Transmissibility::Uniform(cfg.transmissibility),
        Some(w) => Transmissibility::PerEdge(
            w.iter().map(|&x| (cfg.transmissibility * x as f64).clamp(0.0, 1.0)).collect(),
        ),
    };
    let weight_of = match net.weights() {
        None => Transmissibility::Uniform(1.0),
        Some(w) => {
            Transmissibility::PerEdge(w.iter().map(|&x| (x as f64).clamp(0.0, 1.0)).collect())
        }
    };
    let bcfg = BudgetCurveConfig::new(transmissibility, cfg.efficacy, cfg.seed);
    bcfg.validate(net)?;
    let empty: Vec<bool> = Vec::new();
    let absent_slice: &[bool] = absent.unwrap_or(&empty);

    // Static orders once (in parallel, collected in rule order).
    progress.phase("rule orders", res.rules.len() as u64);
    let statics: Vec<Option<Vec<u32>>> = {
        use rayon::prelude::*;
        res.rules
            .par_iter()
            .map(|&rule| {
                let out = if rule.is_randomized() {
                    None
                } else {
                    let mut rng = rng::stream(cfg.seed, Stage::Rule, 0);
                    Some(removal_order(net, rule, &params, absent_slice, &mut rng))
                };
                progress.advance(1);
                out
            })
            .collect()
    };
    progress.finish();
    // The lp rule: the class LP at the study's budget (cost units; doses
    // with unit costs), solved once; each realization draws its own
    // within-class choice.
    let lp_plan = if res.rules.contains(&Rule::Lp) {
        let units = match res.budget {
            DoseBudget::Doses(d) => d as f64,
            DoseBudget::Cost(c) => c,
        };
        Some(NetworkLpPlan::new(net, nodes, units, &res.limits)?)
    } else {
        None
    };
    let order_of = |i: usize, r: u64| -> Cow<'_, [u32]> {
        match (&statics[i], &lp_plan) {
            (Some(o), _) => Cow::Borrowed(o.as_slice()),
            (None, Some(plan)) if res.rules[i] == Rule::Lp => {
                // Offers within a class go on until its quota accepts: the
                // evaluator's own uptake coins of realization r.
                let accepts: Option<Vec<bool>> = nodes.uptake.as_ref().map(|up| {
                    let key = rng::key(cfg.seed, Stage::Uptake, r);
                    (0..n)
                        .map(|v| rng::hit(rng::threshold(up[v]), rng::hash(key, v as u64)))
                        .collect()
                });
                let mut rng = rng::stream(cfg.seed, Stage::Rule, r);
                Cow::Owned(plan.order(accepts.as_deref(), &mut rng))
            }
            (None, _) => {
                let mut rng = rng::stream(cfg.seed, Stage::Rule, r);
                Cow::Owned(removal_order(net, res.rules[i], &params, absent_slice, &mut rng))
            }
        }
    };

    let candidates =
        (0..n).filter(|&v| !absent_slice.get(v).copied().unwrap_or(false)).count() as u64;
    let extra: Vec<u64> = res.nominal_doses.into_iter().collect();
    let grid = evaluate::curve_grid(candidates, cfg.curve_points, &extra);
    let nr = res.rules.len();
    let t = cfg.transmissibility;
    struct Det {
        seq: Vec<u32>,
        doses: u64,
        radius: crate::percolation::SpectralRadius,
        contain: Option<u64>,
    }
    // The realizations and the thresholds (message passing on realization
    // 0's dose sequence of each rule, and on the undosed network) are
    // independent: one parallel job, so neither leaves a core idle while
    // the other's last task runs. Each result is the same at any thread
    // count.
    progress.phase("realizations and thresholds", cfg.runs as u64 + nr as u64 + 1);
    let thresholds = || -> Result<(Vec<Det>, crate::percolation::SpectralRadius), ImmunizeError> {
        use rayon::prelude::*;
        // The undosed residual network once (its radius is the baseline's);
        // every rule's searches start from its 2-core.
        let undosed = evaluate::Undosed::new(net, t, &weight_of, absent)?;
        progress.advance(1);
        let dets = (0..nr)
            .into_par_iter()
            .map(|i| {
                let order = order_of(i, 0);
                let (seq, doses) = evaluate::dose_sequence(&order, nodes, res.budget, cfg.seed, 0);
                let radius = undosed.radius_after(&seq, doses as usize, cfg.efficacy)?;
                let contain = undosed.doses_to_contain(&seq, cfg.efficacy)?;
                progress.advance(1);
                Ok(Det { seq, doses, radius, contain })
            })
            .collect::<Result<Vec<_>, ImmunizeError>>()?;
        Ok((dets, undosed.radius()))
    };
    let (table, thresholds) = rayon::join(
        || {
            evaluate::run_all(
                net,
                nodes,
                &bcfg,
                cfg.runs as u64,
                absent,
                res.rules.len(),
                &order_of,
                res.budget,
                &grid,
                progress,
            )
        },
        thresholds,
    );
    let table = table?;
    let (dets, base_radius) = thresholds?;
    progress.finish();

    // Per-rule sample vectors.
    let col = |i: usize, f: &dyn Fn(&RealizationOutcome) -> f64| -> Vec<f64> {
        table.iter().map(|row| f(&row[i])).collect()
    };

    // Baseline: no doses (level 0 is the same for every rule on the same coins).
    let mut baseline = Metrics::new();
    for (m, name) in METRICS3.iter().enumerate() {
        let s: Vec<f64> = table.iter().map(|row| row[0].grid[0][m]).collect();
        baseline.insert(name.to_string(), Metric::Estimate(stats::mean_ci(&s)));
    }
    baseline.insert("r_eff".into(), Metric::Number(t * base_radius.estimate));
    baseline.insert("below_threshold".into(), Metric::Flag(t * base_radius.upper < 1.0));
    baseline.insert("critical_transmissibility".into(), crit(base_radius.estimate));

    let mut outcomes: Vec<(RuleOutcome, f64)> = Vec::with_capacity(nr);
    for (i, &rule) in res.rules.iter().enumerate() {
        let d = &dets[i];
        let mut metrics = Metrics::new();
        for (m, name) in METRICS3.iter().enumerate() {
            metrics.insert(
                name.to_string(),
                Metric::Estimate(stats::mean_ci(&col(i, &|o| o.at_budget[m]))),
            );
        }
        let r_eff = t * d.radius.estimate;
        metrics.insert("r_eff".into(), Metric::Number(r_eff));
        metrics.insert("below_threshold".into(), Metric::Flag(t * d.radius.upper < 1.0));
        metrics.insert("critical_transmissibility".into(), crit(d.radius.estimate));
        metrics.insert(
            "robustness".into(),
            Metric::Estimate(stats::mean_ci(&col(i, &|o| o.robustness))),
        );
        let contain = match d.contain {
            Some(k) => Metric::Count(k),
            None => Metric::Text(format!("not within {}", d.seq.len())),
        };
        metrics.insert("doses_to_contain".into(), contain.clone());
        let doses = stats::mean_var(&col(i, &|o| o.doses as f64)).0;
        let mut extra = IndexMap::new();
        extra.insert(
            "doses_to_contain".into(),
            serde_json::to_value(&contain).unwrap_or(Value::Null),
        );
        extra.insert(
            "allocation".into(),
            Value::from(
                d.seq[..d.doses as usize]
                    .iter()
                    .map(|&v| nodes.id(v).to_owned())
                    .collect::<Vec<_>>(),
            ),
        );
        if rule.is_randomized() || nodes.uptake.is_some() {
            extra.insert("allocation_realization".into(), Value::from(0));
        }
        if nodes.cost.is_some() {
            extra.insert("cost".into(), est_json(&stats::mean_ci(&col(i, &|o| o.cost))));
        }
        if let (Rule::Lp, Some(plan)) = (rule, &lp_plan) {
            extra.insert("lp".into(), lp_json(plan, &plan.alloc, t, cfg.efficacy));
            if let Some(target) = cfg.target_r_eff {
                extra.insert(
                    "lp_target".into(),
                    lp_target_json(plan, target, t, cfg.efficacy, &res.limits)?,
                );
            }
        }
        let objective = match cfg.objective.as_str() {
            "r_eff" => r_eff,
            "doses_to_contain" => d.contain.map_or(f64::INFINITY, |k| k as f64),
            name => metrics.get(name).and_then(Metric::value).unwrap_or(f64::INFINITY),
        };
        outcomes.push((
            RuleOutcome {
                rule: rule.name().to_owned(),
                rank: 0,
                doses,
                information: rule.information().to_owned(),
                metrics,
                extra,
            },
            objective,
        ));
    }
    // Rank: objective ascending, ties by the configured rule order.
    let mut idx: Vec<usize> = (0..nr).collect();
    idx.sort_by(|&a, &b| outcomes[a].1.total_cmp(&outcomes[b].1).then(a.cmp(&b)));
    let best = idx[0];
    let mut study = Study::new("immunize");
    for (rank, &i) in idx.iter().enumerate() {
        let mut o = outcomes[i].0.clone();
        o.rank = rank as u32 + 1;
        let mut diffs = serde_json::Map::new();
        for (m, name) in METRICS3.iter().enumerate() {
            let e = stats::paired_difference(
                &col(i, &|x| x.at_budget[m]),
                &col(best, &|x| x.at_budget[m]),
            );
            diffs.insert(name.to_string(), est_json(&e));
        }
        let e = stats::paired_difference(&col(i, &|x| x.robustness), &col(best, &|x| x.robustness));
        diffs.insert("robustness".into(), est_json(&e));
        o.extra.insert(
            "difference_vs_best".into(),
            json!({"best": res.rules[best].name(), "paired": Value::Object(diffs)}),
        );
        study.rules.push(o);
    }
    // Curves and allocation, in rank order.
    for &i in &idx {
        let name = res.rules[i].name();
        for (g, &b) in grid.iter().enumerate() {
            for (m, metric) in METRICS3.iter().enumerate() {
                let e = stats::mean_ci(&col(i, &|o| o.grid[g][m]));
                study.curves.push(CurvePoint {
                    rule: name.to_owned(),
                    budget: b as f64,
                    metric: metric.to_string(),
                    mean: e.mean,
                    ci_low: e.ci_low,
                    ci_high: e.ci_high,
                });
            }
        }
        let d = &dets[i];
        for (k, &v) in d.seq[..d.doses as usize].iter().enumerate() {
            study.allocation.push(AllocationRow {
                rule: name.to_owned(),
                order: k as u64 + 1,
                id: nodes.id(v).to_owned(),
                group: nodes.group_of(v).map(str::to_owned),
                doses: 1.0,
            });
        }
    }
    study.baseline = baseline;
    let rep = &loaded.report;
    study.input.insert("network".into(), Value::from(rep.path.clone()));
    study.input.insert("content_hash".into(), Value::from(rep.content_hash.clone()));
    study.input.insert("people".into(), Value::from(n as u64));
    study.input.insert("contacts".into(), Value::from(net.edge_count() as u64));
    study.input.insert("candidates".into(), Value::from(candidates));
    study.input.insert("prior_immune".into(), Value::from(n as u64 - candidates));
    if let Ok(Value::Object(m)) = serde_json::to_value(cfg) {
        for (k, v) in m {
            study.parameters.insert(k, v);
        }
    }
    study.parameters.insert(
        "rules".into(),
        Value::from(res.rules.iter().map(|r| r.name()).collect::<Vec<_>>()),
    );
    study.parameters.insert("large_outbreak_min".into(), Value::from(bcfg.large_min_for(n)));
    match res.budget {
        DoseBudget::Doses(d) => study.parameters.insert("budget_doses".into(), Value::from(d)),
        DoseBudget::Cost(c) => study.parameters.insert("budget_cost".into(), Value::from(c)),
    };
    study.notes = notes(cfg, nodes, bcfg.large_min_for(n));
    study.cautions = vec![crate::outcome::IMMUNIZATION_CAUTION.to_owned()];
    Ok(study)
}

/// The LP's analytic side for a rule entry: optimum, binding constraints,
/// doses per class.
fn lp_json(plan: &NetworkLpPlan, a: &LpAllocation, t: f64, e: f64) -> Value {
    let table = &plan.table;
    json!({
        "method": "class LP over residual degree × group (configuration-model r_eff, linear \
                   in the class fractions; fractional knapsack by k(k−1)/cost when only the \
                   budget binds); realized by vaccinating uniformly at random within each class",
        "r_eff_optimum_analytic": table.r_eff(&a.fractions, t, e),
        "r_eff_unvaccinated_analytic": table.r_eff(&vec![0.0; table.len()], t, e),
        "objective_reduction": a.objective,
        "spend": a.spend,
        "binding": a.binding,
        "at_uptake_ceiling": a.at_ceiling,
        "doses": a.doses.iter().sum::<u64>(),
        "doses_per_class": (0..table.len())
            .filter(|&c| a.doses[c] > 0)
            .map(|c| json!({
                "class": table.label(c),
                "group": table.group_name(c),
                "people": table.count[c],
                "fraction": a.fractions[c],
                "doses": a.doses[c],
            }))
            .collect::<Vec<_>>(),
    })
}

/// Least cost to reach `target` in the analytic configuration model of the
/// network's classes (the LP's dual question).
fn lp_target_json(
    plan: &NetworkLpPlan,
    target: f64,
    t: f64,
    e: f64,
    limits: &[GroupLimit],
) -> Result<Value, ImmunizeError> {
    let label = "analytic configuration-model estimate (degree classes of this network, not \
                 Monte Carlo)";
    Ok(match least_cost_to_target(&plan.table, target, t, e, limits) {
        Ok(a) => {
            let mut j = lp_json(plan, &a, t, e);
            j["estimate"] = json!(label);
            j["target_r_eff"] = json!(target);
            j["cost"] = json!(a.spend);
            j
        }
        Err(LpAllocError::Lp(crate::lp::LpError::Infeasible)) => json!({
            "estimate": label,
            "target_r_eff": target,
            "result": "not reachable within uptake, caps and population",
        }),
        Err(x) => return Err(x.into()),
    })
}

fn crit(radius: f64) -> Metric {
    if radius > 0.0 {
        Metric::Number(1.0 / radius)
    } else {
        Metric::Text("none (no cycles left)".into())
    }
}

fn notes(cfg: &ImmunizeConfig, nodes: &crate::network::NodeTable, large: u32) -> Vec<String> {
    let mut v = vec![
        format!(
            "transmission: each contact transmits independently with probability {} (bond \
             percolation); a dose makes its recipient immune with probability {} \
             (all-or-nothing); the network is static",
            cfg.transmissibility, cfg.efficacy
        ),
        format!(
            "{} realizations on common random numbers (the same contact and vaccine coins for \
             every rule); intervals are 95% t-intervals over realizations; differences against \
             the best rule are paired per realization",
            cfg.runs
        ),
        format!(
            "outbreak_probability: chance that one random introduced case is in a component of \
             at least {large} people (a large outbreak); mean_outbreak_fraction = Σ|C|²/N²"
        ),
        "r_eff: spectral radius of the transmissibility-weighted non-backtracking matrix of the \
         expected residual network (vaccinated people occupied with probability 1 − efficacy; \
         Karrer, Newman & Zdeborová 2014); below_threshold is certified by an upper bound < 1; \
         critical_transmissibility is the uniform T at which that radius reaches 1"
            .to_owned(),
        "doses_to_contain: fewest doses of the rule's own order with r_eff < 1 (binary search \
         over prefixes; the radius does not increase as doses are added)"
            .to_owned(),
        "robustness: R = (1/N) Σ_Q s(Q) over the rule's whole dose sequence, s(Q) the largest \
         transmission component fraction after Q doses (Schneider et al. 2011)"
            .to_owned(),
        "random, acquaintance and lp draw a fresh order in every realization; their allocation, \
         r_eff and doses_to_contain are those of realization 0"
            .to_owned(),
        "ties: degree, degree-adaptive, corehd and coreness break ties by the lower node index \
         (first appearance in the input)"
            .to_owned(),
    ];
    if cfg.rules.is_empty() || cfg.rules.iter().any(|r| r.trim() == "lp") {
        v.push(
            "lp: the class LP (residual degree × group; costs and uptake are class means) solved \
             at the budget under the group limits, exact for the configuration model (rank-one \
             next-generation matrix); each class's doses go to members drawn uniformly at \
             random, offered until the class's quota accepts; leftover budget goes down the \
             rest of the order, members of capped groups last; contact weights are not in the \
             LP"
            .into(),
        );
    }
    if nodes.immune.is_some() {
        v.push("people listed as immune are absent from the start and are never dosed".into());
    }
    if nodes.uptake.is_some() {
        v.push(
            "uptake: each offered dose is accepted with the person's uptake probability, drawn \
             per realization; a refusal passes the dose to the next person in the rule's order; \
             the allocation shown is realization 0's"
                .into(),
        );
    }
    if nodes.cost.is_some() {
        v.push(
            "costs: the budget is in cost units; a rule skips a person whose dose no longer fits \
             the remaining budget and goes on down its order"
                .into(),
        );
    }
    v
}
