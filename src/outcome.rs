//! The result types that evaluators produce and reports read.
//!
//! A [`Study`] is everything one command found: its inputs and parameters,
//! the baseline, one [`RuleOutcome`] per rule in rank order, the curves and
//! the allocation (who gets doses or seeds). Reports (`report`) render a
//! `Study` into a table, CSV, JSON, SVG and HTML without computing anything
//! new. Metric names are the stable names of the design (`giant_fraction`,
//! `r_eff`, `expected_reach`, …).

use indexmap::IndexMap;
use serde::Serialize;
use serde_json::Value;

use crate::stats::Estimate;

/// One metric value: an estimate with its interval, or an exact value.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(untagged)]
pub enum Metric {
    /// A Monte Carlo estimate `{mean, ci_low, ci_high}`.
    Estimate(Estimate),
    /// An exact or analytic number.
    Number(f64),
    /// A count.
    Count(u64),
    /// A yes/no fact (e.g. `below_threshold`).
    Flag(bool),
    /// Text, e.g. "not within 1000".
    Text(String),
    /// Not available for this rule.
    Missing,
}

impl Metric {
    /// The point value, if numeric (the mean of an estimate).
    pub fn value(&self) -> Option<f64> {
        match self {
            Metric::Estimate(e) => Some(e.mean),
            Metric::Number(x) => Some(*x),
            Metric::Count(c) => Some(*c as f64),
            Metric::Flag(b) => Some(f64::from(u8::from(*b))),
            Metric::Text(_) | Metric::Missing => None,
        }
    }
}

impl From<Estimate> for Metric {
    fn from(e: Estimate) -> Self {
        Metric::Estimate(e)
    }
}

impl From<f64> for Metric {
    fn from(x: f64) -> Self {
        Metric::Number(x)
    }
}

impl From<bool> for Metric {
    fn from(b: bool) -> Self {
        Metric::Flag(b)
    }
}

/// Metrics by stable name, in insertion order.
pub type Metrics = IndexMap<String, Metric>;

/// One rule's result.
#[derive(Clone, Debug, Default, Serialize)]
pub struct RuleOutcome {
    /// Rule name as on the command line (`corehd`, `ris`, …).
    pub rule: String,
    /// 1 = best by the study's objective.
    pub rank: u32,
    /// Doses (or seeds) the rule used at the budget.
    pub doses: f64,
    /// What the rule needs to know (e.g. "none", "contact counts", "whole network").
    pub information: String,
    /// Metrics at the budget.
    pub metrics: Metrics,
    /// Command-specific fields shown beside the metrics in JSON
    /// (`doses_to_contain`, `allocation`, `seeds`, `expected_reach`,
    /// `upper_bound`, paired differences, …).
    #[serde(flatten)]
    pub extra: IndexMap<String, Value>,
}

/// One point of a curve: a metric of a rule at a budget level.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct CurvePoint {
    /// Rule name.
    pub rule: String,
    /// Budget level (doses, seeds, or a transmissibility for `threshold`).
    pub budget: f64,
    /// Metric name.
    pub metric: String,
    /// Mean (or exact value).
    pub mean: f64,
    /// Lower end of the 95% interval (= mean when exact).
    pub ci_low: f64,
    /// Upper end of the 95% interval (= mean when exact).
    pub ci_high: f64,
}

/// One line of an allocation: who gets a dose or seed under a rule.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct AllocationRow {
    /// Rule name.
    pub rule: String,
    /// Position in the rule's order (1-based), or the class index in
    /// distribution mode.
    pub order: u64,
    /// External id of the person, or the class label (e.g. "degree 7").
    pub id: String,
    /// Group, when known.
    pub group: Option<String>,
    /// Doses given (1 for a person; a count for a class).
    pub doses: f64,
}

/// Everything one command found.
#[derive(Clone, Debug, Default, Serialize)]
pub struct Study {
    /// Always "spreadplan".
    pub tool: String,
    /// Tool version.
    pub version: String,
    /// The subcommand (`immunize`, `seed`, `threshold`, `inspect`).
    pub command: String,
    /// Inputs: paths, sizes, content hashes.
    pub input: IndexMap<String, Value>,
    /// Every parameter, including the seed.
    pub parameters: IndexMap<String, Value>,
    /// Metrics with no intervention.
    pub baseline: Metrics,
    /// Rules in rank order.
    pub rules: Vec<RuleOutcome>,
    /// Curves of every rule (written to `curves.csv`).
    #[serde(skip)]
    pub curves: Vec<CurvePoint>,
    /// Who gets doses or seeds (written to `allocation.csv`).
    #[serde(skip)]
    pub allocation: Vec<AllocationRow>,
    /// Command-specific sections (e.g. the degree distribution, the LP
    /// report, `critical_transmissibility`).
    #[serde(flatten)]
    pub extra: IndexMap<String, Value>,
    /// Assumptions and method notes for the reader.
    pub notes: Vec<String>,
    /// Cautions every immunization output carries.
    pub cautions: Vec<String>,
}

/// The caution every immunization report and terminal ranking carries.
pub const IMMUNIZATION_CAUTION: &str = "decision support under stated model assumptions \
(independent transmission per contact, stated vaccine efficacy, static network); follow \
national immunization guidance, local public-health authorities and licensed clinical \
practice before allocating doses";

impl Study {
    /// An empty study for `command`, stamped with the tool and version.
    pub fn new(command: &str) -> Self {
        Study {
            tool: crate::TOOL.to_owned(),
            version: crate::VERSION.to_owned(),
            command: command.to_owned(),
            ..Default::default()
        }
    }
}
