//! The threshold study: the percolation curve of a loaded network over the
//! transmissibility (or, for site percolation, the occupation) and its
//! critical value by three methods side by side — the Newman–Ziff sweep,
//! message passing on the non-backtracking matrix and the configuration
//! model — assembled into a [`Study`]. `spreadplan threshold` and
//! `kind = "threshold"` scenarios both call [`threshold_study`]; the
//! methods themselves live in the sibling files.

use serde::{Deserialize, Serialize};
use serde_json::{json, Value};

use super::{
    critical_transmissibility, directed_configuration_threshold, directed_curve,
    large_outbreak_min, newman_ziff, DirectedConfig, PercolationError, SweepConfig,
};
use crate::network::load::Loaded;
use crate::network::Network;
use crate::outcome::{CurvePoint, Metric, Study};
use crate::progress::Progress;
use crate::stats::Estimate;

fn default_runs() -> u32 {
    100
}
fn default_seed() -> u64 {
    20_261_202
}
fn default_points() -> usize {
    21
}
fn default_tolerance() -> f64 {
    1e-6
}
fn default_cases() -> u32 {
    16
}

/// Everything [`threshold_study`] needs besides the network; whether the
/// network is directed comes from the network itself. The defaults match
/// `spreadplan threshold`.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ThresholdConfig {
    /// Site percolation: sweep the share of people susceptible, every
    /// contact transmitting (undirected networks only; default false).
    #[serde(default)]
    pub site: bool,
    /// Monte Carlo realizations (default 100).
    #[serde(default = "default_runs")]
    pub runs: u32,
    /// Master seed.
    #[serde(default = "default_seed")]
    pub seed: u64,
    /// Points of the curve, evenly spaced over `[0, 1]` (at least 2; default 21).
    #[serde(default = "default_points")]
    pub points: usize,
    /// Relative tolerance of the message-passing eigenvalue, in `(0, 1)`
    /// (default 10⁻⁶).
    #[serde(default = "default_tolerance")]
    pub tolerance: f64,
    /// Introduced cases followed per realization on directed networks
    /// (default 16; 0 counts as 1).
    #[serde(default = "default_cases")]
    pub cases: u32,
}

impl Default for ThresholdConfig {
    fn default() -> Self {
        ThresholdConfig {
            site: false,
            runs: default_runs(),
            seed: default_seed(),
            points: default_points(),
            tolerance: default_tolerance(),
            cases: default_cases(),
        }
    }
}

impl ThresholdConfig {
    /// Checks the parameters (runs ≥ 1, points ≥ 2, tolerance in `(0, 1)`).
    pub fn validate(&self) -> Result<(), PercolationError> {
        if self.runs < 1 {
            return Err(PercolationError::TooSmall { what: "runs", value: 0, min: 1 });
        }
        if self.points < 2 {
            return Err(PercolationError::TooSmall {
                what: "points",
                value: self.points as u64,
                min: 2,
            });
        }
        if !(self.tolerance > 0.0 && self.tolerance < 1.0) {
            return Err(PercolationError::Tolerance(self.tolerance));
        }
        Ok(())
    }
}

fn est(e: &Estimate) -> Value {
    json!({ "mean": e.mean, "ci_low": e.ci_low, "ci_high": e.ci_high })
}

/// The configuration-model threshold `⟨k⟩ / (⟨k²⟩ − ⟨k⟩) = 1/κ` (Molloy &
/// Reed 1995; Newman 2002) with `κ`; infinite when `κ = 0`.
fn configuration_threshold(net: &Network) -> (f64, f64) {
    let (mut k1, mut k2) = (0.0f64, 0.0f64);
    for v in 0..net.node_count() as u32 {
        let k = net.degree(v) as f64;
        k1 += k;
        k2 += k * k;
    }
    let kappa = if k1 > 0.0 { (k2 - k1) / k1 } else { 0.0 };
    (kappa, if kappa > 0.0 { 1.0 / kappa } else { f64::INFINITY })
}

/// The threshold study of a loaded network.
///
/// Undirected networks: the Newman–Ziff sweep (Newman & Ziff 2001) gives
/// the curve and the headline critical value (peak of the mean non-giant
/// cluster size, with its interval over realizations); beside it the
/// message-passing value `1/λ` of the non-backtracking matrix (Karrer,
/// Newman & Zdeborová 2014) with Collatz–Wielandt bounds, and the
/// configuration-model value `⟨k⟩/(⟨k²⟩ − ⟨k⟩)` (Molloy & Reed 1995;
/// Newman 2002). Directed networks: the curve from giant in- and
/// out-components and the configuration-model value
/// `⟨k_in⟩/⟨k_in k_out⟩` (Newman, Strogatz & Watts 2001).
///
/// The study carries `extra["critical_transmissibility"]` (estimates by
/// method) and `extra["curve"]` (points with `transmissibility`, or
/// `occupation` for site percolation, and the metrics), and the same
/// curve as [`CurvePoint`]s for the report.
///
/// ```
/// use spreadplan::network::load::Loaded;
/// use spreadplan::network::{Network, NodeTable, WeightMerge};
/// use spreadplan::percolation::{threshold_study, ThresholdConfig};
/// // A 5-cycle: every directed edge has one non-backtracking successor, so λ = 1.
/// let edges = vec![(0, 1), (1, 2), (2, 3), (3, 4), (4, 0)];
/// let (network, _) = Network::from_edges(5, false, edges, None, WeightMerge::Max).unwrap();
/// let loaded = Loaded { network, nodes: NodeTable::numbered(5), report: Default::default() };
/// let cfg = ThresholdConfig { runs: 4, points: 3, ..Default::default() };
/// let s = threshold_study(&loaded, &cfg, &spreadplan::progress::Silent).unwrap();
/// assert_eq!(s.extra["critical_transmissibility"]["message_passing"]["estimate"], 1.0);
/// assert_eq!(s.extra["curve"].as_array().unwrap().len(), 3);
/// ```
pub fn threshold_study(
    loaded: &Loaded,
    cfg: &ThresholdConfig,
    progress: &dyn Progress,
) -> Result<Study, PercolationError> {
    cfg.validate()?;
    let net = &loaded.network;
    if cfg.site && net.is_directed() {
        return Err(PercolationError::Directed("site percolation"));
    }
    let n = net.node_count();
    if n == 0 {
        return Err(PercolationError::TooSmall { what: "nodes", value: 0, min: 1 });
    }
    let ts: Vec<f64> = (0..cfg.points).map(|j| j as f64 / (cfg.points - 1) as f64).collect();

    let mut study = Study::new("threshold");
    let rep = &loaded.report;
    study.input.insert("network".into(), json!(rep.path));
    study.input.insert("nodes".into(), json!(n));
    study.input.insert("edges".into(), json!(net.edge_count()));
    study.input.insert("directed".into(), json!(net.is_directed()));
    study.input.insert("content_hash".into(), json!(rep.content_hash));
    study.input.insert("self_loops_dropped".into(), json!(rep.self_loops_dropped));
    study.input.insert("duplicates_merged".into(), json!(rep.duplicates_merged));
    let quantity = if cfg.site { "occupation" } else { "transmissibility" };
    study.parameters.insert("percolation".into(), json!(if cfg.site { "site" } else { "bond" }));
    study.parameters.insert("runs".into(), json!(cfg.runs));
    study.parameters.insert("seed".into(), json!(cfg.seed));
    study.parameters.insert("points".into(), json!(cfg.points));
    study.parameters.insert("tolerance".into(), json!(cfg.tolerance));
    study.parameters.insert("large_outbreak_min".into(), json!(large_outbreak_min(n)));
    let rule = if net.is_directed() {
        "directed"
    } else if cfg.site {
        "site"
    } else {
        "bond"
    };

    let mut curve = Vec::new();
    let push_curve = |study: &mut Study, t: f64, metric: &str, e: &Estimate| {
        study.curves.push(CurvePoint {
            rule: rule.into(),
            budget: t,
            metric: metric.into(),
            mean: e.mean,
            ci_low: e.ci_low,
            ci_high: e.ci_high,
        });
    };
    let metrics = ["giant_fraction", "mean_outbreak_fraction", "outbreak_probability"];
    let critical: Value;
    if net.is_directed() {
        let dcfg = DirectedConfig {
            runs: cfg.runs as u64,
            seed: cfg.seed,
            cases_per_run: cfg.cases.max(1),
            large_min: None,
        };
        study.parameters.insert("cases_per_run".into(), json!(dcfg.cases_per_run));
        progress.phase("directed curve", 1);
        let pts = directed_curve(net, &dcfg, &ts)?;
        progress.advance(1);
        progress.finish();
        for p in &pts {
            curve.push(json!({
                "transmissibility": p.transmissibility,
                "giant_fraction": est(&p.giant_fraction),
                "mean_outbreak_fraction": est(&p.mean_outbreak_fraction),
                "outbreak_probability": est(&p.outbreak_probability),
                "giant_scc_fraction": est(&p.giant_scc_fraction),
            }));
            let values = [&p.giant_fraction, &p.mean_outbreak_fraction, &p.outbreak_probability];
            for (m, e) in metrics.iter().zip(values) {
                push_curve(&mut study, p.transmissibility, m, e);
            }
        }
        let cm = directed_configuration_threshold(net);
        critical = json!({
            "mean": cm,
            "headline": "configuration_model",
            "newman_ziff": null,
            "message_passing": null,
            "configuration_model": cm,
        });
        study.baseline.insert("critical_transmissibility".into(), Metric::Number(cm));
        study.notes.push(
            "directed network: outbreak_probability = share of people who reach the giant \
             strongly connected component of the transmitting contacts (giant in-component); \
             giant_fraction = share it reaches (giant out-component); mean_outbreak_fraction = \
             mean reach of randomly drawn introduced cases"
                .into(),
        );
        study.notes.push(
            "critical transmissibility on a directed network: configuration-model value \
             <k_in>/<k_in k_out> (Newman, Strogatz & Watts 2001); the Newman–Ziff and \
             message-passing estimates are computed for undirected networks only"
                .into(),
        );
    } else {
        let scfg = SweepConfig {
            site: cfg.site,
            runs: cfg.runs as u64,
            seed: cfg.seed,
            points: ts.clone(),
            large_min: None,
        };
        progress.phase("Newman–Ziff sweep", 1);
        let sweep = newman_ziff(net, &scfg)?;
        progress.advance(1);
        progress.finish();
        for p in &sweep.points {
            curve.push(json!({
                quantity: p.occupation,
                "giant_fraction": est(&p.giant_fraction),
                "mean_outbreak_fraction": est(&p.mean_outbreak_fraction),
                "outbreak_probability": est(&p.outbreak_probability),
                "mean_cluster_size": est(&p.mean_cluster_size),
                "second_largest_fraction": est(&p.second_largest_fraction),
            }));
            let values = [&p.giant_fraction, &p.mean_outbreak_fraction, &p.outbreak_probability];
            for (m, e) in metrics.iter().zip(values) {
                push_curve(&mut study, p.occupation, m, e);
            }
        }
        // Site percolation with every contact transmitting has B = φ·B(1), so
        // the critical occupation is 1/ρ(B) as well.
        let mp = critical_transmissibility(net, None, cfg.tolerance)?;
        let (kappa, cm) = configuration_threshold(net);
        critical = json!({
            "mean": sweep.critical.mean,
            "ci_low": sweep.critical.ci_low,
            "ci_high": sweep.critical.ci_high,
            "headline": "newman_ziff",
            "quantity": quantity,
            "newman_ziff": est(&sweep.critical),
            "message_passing": {
                "estimate": mp.estimate,
                "lower": mp.lower,
                "upper": mp.upper,
                "radius": mp.radius.estimate,
                "radius_lower": mp.radius.lower,
                "radius_upper": mp.radius.upper,
                "iterations": mp.radius.iterations,
                "converged": mp.radius.converged,
            },
            "configuration_model": cm,
            "kappa": kappa,
        });
        study.baseline.insert("critical_transmissibility".into(), Metric::Estimate(sweep.critical));
        study.baseline.insert(
            "critical_transmissibility_message_passing".into(),
            Metric::Number(mp.estimate),
        );
        study
            .baseline
            .insert("critical_transmissibility_configuration_model".into(), Metric::Number(cm));
        study.baseline.insert("r_eff_at_1".into(), Metric::Number(mp.radius.estimate));
        study.notes.push(format!(
            "newman_ziff: peak of the mean size of the non-giant clusters, one sweep per \
             realization (Newman & Ziff 2001), mean and 95% interval over {} realizations; \
             finite networks shift the peak (on lattices by about L^(-3/4))",
            cfg.runs
        ));
        study.notes.push(
            "message_passing: 1/λ of the non-backtracking matrix (Karrer, Newman & Zdeborová \
             2014), bounds from the Collatz–Wielandt inequality; exact on locally tree-like \
             networks, a lower bound where short loops abound"
                .into(),
        );
        study.notes.push(
            "configuration_model: <k>/(<k²> − <k>), the threshold of a random network with \
             this degree sequence (Molloy & Reed 1995; Newman 2002)"
                .into(),
        );
        if !mp.radius.converged {
            study.notes.push(format!(
                "the non-backtracking iteration stopped before reaching tolerance {}; the \
                 bounds are still valid",
                cfg.tolerance
            ));
        }
    }
    study.notes.push(format!(
        "a large outbreak reaches a component of at least {} people (max(2, ⌈√N⌉)); \
         outbreak_probability is the share of people in such components",
        large_outbreak_min(n)
    ));
    study.extra.insert("critical_transmissibility".into(), critical);
    study.extra.insert("curve".into(), Value::Array(curve));
    Ok(study)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn config_defaults_and_validation() {
        let c: ThresholdConfig = toml::from_str("").unwrap();
        assert_eq!(c, ThresholdConfig::default());
        assert!(toml::from_str::<ThresholdConfig>("pointz = 3").is_err());
        let bad = ThresholdConfig { points: 1, ..Default::default() };
        assert_eq!(bad.validate().unwrap_err().to_string(), "points must be at least 2, got 1");
        let bad = ThresholdConfig { tolerance: 1.5, ..Default::default() };
        assert!(bad.validate().unwrap_err().to_string().contains("1.5"));
        let bad = ThresholdConfig { runs: 0, ..Default::default() };
        assert!(bad.validate().is_err());
    }
}
