//! The library entry of `spreadplan seed`: a [`SeedConfig`] (scenarios
//! embed it) and [`rank_seeds`], which builds the cascade, runs each rule,
//! evaluates every seed list on common random numbers, computes the upper
//! bound and returns a ranked [`Study`].

use serde::{Deserialize, Serialize};
use serde_json::{json, Value};

use crate::network::load::Loaded;
use crate::outcome::{AllocationRow, CurvePoint, Metric, RuleOutcome, Study};
use crate::progress::Progress;
use crate::seed::{
    acquaintance_seeds, degree_discount_seeds, degree_seeds, discount_probability, imm, lp_cover,
    random_seeds, reach_samples, upper_bound, Cascade, CascadeModel, SeedError,
};
use crate::stats::{paired_difference, Estimate};

/// Seeding rule names, in the default order.
pub const SEED_RULES: &[&str] =
    &["random", "degree", "degree-discount", "acquaintance", "ris", "lp"];

fn default_rules() -> Vec<String> {
    SEED_RULES.iter().map(|s| s.to_string()).collect()
}
fn default_runs() -> u32 {
    100
}
fn default_seed() -> u64 {
    20_261_202
}
fn default_epsilon() -> f64 {
    0.1
}
fn default_ell() -> f64 {
    1.0
}
fn default_lp_sets() -> usize {
    1000
}
fn default_max_rr_sets() -> u64 {
    100_000_000
}
fn default_bound_confidence() -> f64 {
    0.95
}

/// Everything `rank_seeds` needs besides the network.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SeedConfig {
    /// Number of seeds `K`.
    pub budget: usize,
    /// The cascade model.
    pub model: CascadeModel,
    /// Rules to rank (default: all of [`SEED_RULES`]).
    #[serde(default = "default_rules")]
    pub rules: Vec<String>,
    /// Monte Carlo realizations for the evaluation (default 100).
    #[serde(default = "default_runs")]
    pub runs: u32,
    /// Master seed.
    #[serde(default = "default_seed")]
    pub seed: u64,
    /// IMM's ε in (0, 1) (default 0.1).
    #[serde(default = "default_epsilon")]
    pub epsilon: f64,
    /// IMM's ℓ > 0: guarantee with probability 1 − n^−ℓ (default 1).
    #[serde(default = "default_ell")]
    pub ell: f64,
    /// RR sets the `lp` rule's LP is solved on (default 1000).
    #[serde(default = "default_lp_sets")]
    pub lp_sets: usize,
    /// Memory guard: most RR sets IMM may draw (default 10⁸).
    #[serde(default = "default_max_rr_sets")]
    pub max_rr_sets: u64,
    /// Confidence of the upper bound (default 0.95).
    #[serde(default = "default_bound_confidence")]
    pub bound_confidence: f64,
    /// RR sets for the bound's independent sample (default: as many as
    /// IMM's final collection, at least 10⁵; capped by `max_rr_sets`).
    #[serde(default)]
    pub bound_sets: Option<u64>,
}

impl SeedConfig {
    /// A configuration with defaults for everything but budget and model.
    pub fn new(budget: usize, model: CascadeModel) -> SeedConfig {
        SeedConfig {
            budget,
            model,
            rules: default_rules(),
            runs: default_runs(),
            seed: default_seed(),
            epsilon: default_epsilon(),
            ell: default_ell(),
            lp_sets: default_lp_sets(),
            max_rr_sets: default_max_rr_sets(),
            bound_confidence: default_bound_confidence(),
            bound_sets: None,
        }
    }

    /// Checks every field; errors name the field and show its value.
    pub fn validate(&self) -> Result<(), SeedError> {
        if let CascadeModel::Uniform { p } = self.model {
            if !(0.0..=1.0).contains(&p) {
                return Err(SeedError::Probability(p));
            }
        }
        if !(self.epsilon > 0.0 && self.epsilon < 1.0) {
            return Err(SeedError::Epsilon(self.epsilon));
        }
        if !(self.ell > 0.0 && self.ell.is_finite()) {
            return Err(SeedError::Ell(self.ell));
        }
        if self.runs == 0 {
            return Err(SeedError::Runs(self.runs));
        }
        if self.rules.is_empty() {
            return Err(SeedError::NoRules);
        }
        for r in &self.rules {
            if !SEED_RULES.contains(&r.as_str()) {
                return Err(SeedError::UnknownRule {
                    name: r.clone(),
                    known: SEED_RULES.join(", "),
                });
            }
        }
        if !(self.bound_confidence > 0.0 && self.bound_confidence < 1.0) {
            return Err(SeedError::Config {
                field: "bound_confidence".into(),
                value: self.bound_confidence.to_string(),
                reason: "must be in (0, 1)".into(),
            });
        }
        if self.lp_sets == 0 || self.max_rr_sets == 0 {
            return Err(SeedError::Config {
                field: "lp_sets / max_rr_sets".into(),
                value: format!("{} / {}", self.lp_sets, self.max_rr_sets),
                reason: "must be positive".into(),
            });
        }
        Ok(())
    }
}

fn information(rule: &str) -> &'static str {
    match rule {
        "random" => "none",
        "acquaintance" => "contact nominations",
        "degree" => "contact counts",
        "degree-discount" => "contact counts and neighbours",
        _ => "whole network",
    }
}

fn estimate_json(e: &Estimate) -> Value {
    json!({"mean": e.mean, "ci_low": e.ci_low, "ci_high": e.ci_high})
}

/// Ranks the configured seeding rules by expected reach on `loaded`.
///
/// `exclude` are indices of people who already adopted (removed from the
/// cascade: never seeds, not counted, do not relay — see `seed::cascade`).
/// Rules are ranked by the mean of `expected_reach` (adopters including
/// seeds; higher is better; ties keep the configured order). Every rule is
/// evaluated on the same `runs` live-edge realizations. The study's
/// `upper_bound` bounds the best expected reach of any `budget` seeds at
/// the stated confidence; each rule's `reach_vs_bound` is the lower end of
/// its 95% interval divided by that bound ("these seeds reach at least X%
/// of what any K seeds could").
pub fn rank_seeds(
    loaded: &Loaded,
    exclude: &[u32],
    cfg: &SeedConfig,
    progress: &dyn Progress,
) -> Result<Study, SeedError> {
    cfg.validate()?;
    let net = &loaded.network;
    let c = Cascade::new(net, &cfg.model, exclude)?;
    let n_active = c.active_count();
    let k = cfg.budget;
    if k == 0 || k > n_active {
        return Err(SeedError::Budget { budget: k, max: n_active });
    }
    let mut notes = vec![
        format!(
            "model: {}; {} network; live-edge realizations on common random numbers (Kempe, Kleinberg & Tardos 2003)",
            cfg.model.describe(),
            if net.is_directed() { "directed" } else { "undirected" }
        ),
        "expected_reach counts adopters including the seeds, with a 95% t-interval over the realizations".into(),
    ];
    if !net.is_directed() && c.is_symmetric() {
        notes.push(
            "undirected: one shared coin per contact makes it live both ways (bond percolation)"
                .into(),
        );
    } else if !net.is_directed() {
        notes.push(
            "undirected weighted cascade: the two directions of a contact have independent coins"
                .into(),
        );
    }
    if !exclude.is_empty() {
        notes.push(format!(
            "{} people already adopted: they are never seeds, are not counted in the reach and do not relay (their one chance to convince each contact has passed)",
            exclude.len()
        ));
    }
    let needs_rr = cfg.rules.iter().any(|r| r == "ris" || r == "lp");
    let mut lists: Vec<(String, Vec<u32>, serde_json::Map<String, Value>)> = Vec::new();
    let imm_out = if needs_rr {
        Some(imm(&c, k, cfg.epsilon, cfg.ell, cfg.seed, cfg.max_rr_sets, progress))
    } else {
        None
    };
    for (idx, rule) in cfg.rules.iter().enumerate() {
        let mut extra = serde_json::Map::new();
        let seeds = match rule.as_str() {
            "random" => random_seeds(&c, k, cfg.seed, idx as u64),
            "degree" => degree_seeds(&c, k),
            "degree-discount" => {
                let p = discount_probability(&c);
                extra.insert("discount_p".into(), json!(p));
                if !matches!(cfg.model, CascadeModel::Uniform { .. }) {
                    notes.push(format!(
                        "degree-discount uses the mean arc probability p = {p:.4} (the published rule assumes one uniform p)"
                    ));
                }
                degree_discount_seeds(&c, k, p)
            }
            "acquaintance" => acquaintance_seeds(&c, k, cfg.seed, idx as u64),
            "ris" => {
                let m = imm_out.as_ref().expect("IMM runs when ris is requested");
                extra.insert(
                    "imm".into(),
                    json!({
                        "epsilon": cfg.epsilon, "ell": cfg.ell, "ell_adjusted": m.ell_adjusted,
                        "theta": m.theta, "rr_sets": m.sets.len(), "lower_bound": m.lower_bound,
                        "rr_members": m.sets.total_members(), "rr_memory_bytes": m.sets.memory_bytes(),
                        "coverage_estimate": m.coverage_estimate, "capped": m.capped,
                        "guarantee": if m.capped { "not certified: the RR-set cap bound".to_owned() } else {
                            format!("expected reach >= (1 - 1/e - {}) x optimum with probability >= 1 - n^-{}", cfg.epsilon, cfg.ell) },
                    }),
                );
                m.seeds.clone()
            }
            "lp" => {
                let m = imm_out.as_ref().expect("IMM runs when lp is requested");
                let l = lp_cover(&c, &m.sets, k, cfg.lp_sets, cfg.seed)?;
                extra.insert(
                    "lp".into(),
                    json!({
                        "rr_sets_used": l.sets_used, "distinct_sets": l.distinct_sets,
                        "candidates": l.candidates, "lp_value": l.lp_value,
                        "rounded_value": l.rounded_value,
                        "rounding": "pipage (Ageev & Sviridenko 2004): rounded coverage >= (1 - (1 - 1/K)^K) x LP optimum on the subsample",
                    }),
                );
                l.seeds
            }
            other => {
                return Err(SeedError::UnknownRule {
                    name: other.into(),
                    known: SEED_RULES.join(", "),
                })
            }
        };
        lists.push((rule.clone(), seeds, extra));
    }
    let seed_lists: Vec<Vec<u32>> = lists.iter().map(|l| l.1.clone()).collect();
    let samples = reach_samples(&c, &seed_lists, cfg.runs, cfg.seed, progress);
    let delta = 1.0 - cfg.bound_confidence;
    let theta1 = cfg
        .bound_sets
        .unwrap_or_else(|| imm_out.as_ref().map_or(100_000, |m| m.sets.len() as u64).max(100_000));
    let bound = upper_bound(&c, k, theta1.min(cfg.max_rr_sets), delta, cfg.seed);
    notes.push(format!(
        "upper_bound {:.1}: no {} seeds reach more in expectation, with confidence {} (OPIM-C style bound, Tang, Tang, Xiao & Yuan 2018, from {} independent RR sets)",
        bound.value, k, cfg.bound_confidence, bound.sets
    ));
    notes.push("reach_vs_bound = lower end of the rule's 95% interval / upper_bound: the seeds reach at least this share of what any K seeds could".into());

    let mut study = Study::new("seed");
    study.input.insert("path".into(), json!(loaded.report.path));
    study.input.insert("nodes".into(), json!(net.node_count()));
    study.input.insert("edges".into(), json!(net.edge_count()));
    study.input.insert("directed".into(), json!(net.is_directed()));
    study.input.insert("content_hash".into(), json!(loaded.report.content_hash));
    study.input.insert("already_adopted".into(), json!(exclude.len()));
    study.parameters.insert("budget".into(), json!(k));
    study
        .parameters
        .insert("model".into(), serde_json::to_value(&cfg.model).unwrap_or(Value::Null));
    study.parameters.insert("rules".into(), json!(cfg.rules));
    study.parameters.insert("runs".into(), json!(cfg.runs));
    study.parameters.insert("seed".into(), json!(cfg.seed));
    study.parameters.insert("epsilon".into(), json!(cfg.epsilon));
    study.parameters.insert("ell".into(), json!(cfg.ell));
    study.parameters.insert("lp_sets".into(), json!(cfg.lp_sets));
    study.parameters.insert("bound_confidence".into(), json!(cfg.bound_confidence));
    study.baseline.insert("population".into(), Metric::Count(n_active as u64));
    study.extra.insert(
        "upper_bound".into(),
        json!({"value": bound.value, "confidence": bound.confidence, "rr_sets": bound.sets,
               "greedy_coverage": bound.greedy_coverage}),
    );

    let best_idx = {
        let mut b = 0;
        for i in 1..samples.len() {
            if samples[i].total().mean > samples[b].total().mean {
                b = i;
            }
        }
        b
    };
    let mut outcomes: Vec<(f64, usize, RuleOutcome)> = Vec::new();
    for (i, ((rule, seeds, extra), s)) in lists.iter().zip(&samples).enumerate() {
        let est = s.total();
        let mut o = RuleOutcome {
            rule: rule.clone(),
            doses: seeds.len() as f64,
            information: information(rule).into(),
            ..Default::default()
        };
        o.metrics.insert("expected_reach".into(), Metric::Estimate(est));
        o.metrics
            .insert("reach_fraction".into(), Metric::Estimate(est.scaled(1.0 / n_active as f64)));
        o.metrics.insert(
            "reach_vs_bound".into(),
            Metric::Number((est.ci_low / bound.value).clamp(0.0, 1.0)),
        );
        let last = seeds.len();
        let diff = paired_difference(&s.per_k[last - 1], &samples[best_idx].per_k[last - 1]);
        o.extra.insert(
            "seeds".into(),
            json!(seeds.iter().map(|&v| loaded.nodes.id(v).to_owned()).collect::<Vec<_>>()),
        );
        o.extra.insert("expected_reach".into(), estimate_json(&est));
        o.extra.insert("upper_bound".into(), json!(bound.value));
        o.extra.insert("difference_vs_best".into(), estimate_json(&diff));
        for (key, v) in extra {
            o.extra.insert(key.clone(), v.clone());
        }
        for kk in 1..=last {
            let e = s.estimate(kk);
            study.curves.push(CurvePoint {
                rule: rule.clone(),
                budget: kk as f64,
                metric: "expected_reach".into(),
                mean: e.mean,
                ci_low: e.ci_low,
                ci_high: e.ci_high,
            });
        }
        for (j, &v) in seeds.iter().enumerate() {
            study.allocation.push(AllocationRow {
                rule: rule.clone(),
                order: j as u64 + 1,
                id: loaded.nodes.id(v).to_owned(),
                group: loaded.nodes.group_of(v).map(str::to_owned),
                doses: 1.0,
            });
        }
        outcomes.push((est.mean, i, o));
    }
    outcomes.sort_by(|a, b| b.0.total_cmp(&a.0).then(a.1.cmp(&b.1)));
    study.rules = outcomes
        .into_iter()
        .enumerate()
        .map(|(r, (_, _, mut o))| {
            o.rank = r as u32 + 1;
            o
        })
        .collect();
    study.notes = notes;
    Ok(study)
}
