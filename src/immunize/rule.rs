//! The registry of network-mode immunization rules: names, what each rule
//! needs to know, and [`removal_order`], the one dispatch point. Adding a
//! rule is one [`Rule`] variant, one name and one match arm.
//!
//! A rule is pure: the network, the set of people already immune (absent
//! from the start, never candidates) and, for randomized rules, a named
//! generator in; a *removal order* out — every candidate exactly once, in
//! the order doses are offered. Budgets, costs, uptake and efficacy are
//! applied by the evaluator, never by a rule.

use rand_chacha::ChaCha8Rng;

use crate::network::Network;

/// A network-mode immunization rule.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub enum Rule {
    /// Uniformly random order.
    Random,
    /// Highest degree first, computed once.
    Degree,
    /// Highest degree first, recomputed after each removal.
    DegreeAdaptive,
    /// Cohen, Havlin & ben-Avraham (2003): a random contact of a random person.
    Acquaintance,
    /// k-shell order (Batagelj–Zaversnik core numbers), highest core first.
    Coreness,
    /// Zdeborová, Zhang & Zhou (2016): highest degree in the 2-core.
    CoreHd,
    /// Morone & Makse (2015) Collective Influence with reinsertion.
    CollectiveInfluence,
    /// The class-level LP (degree classes, fractional knapsack by k(k−1)).
    Lp,
}

/// Names of the network-mode rules, in the default display order.
pub const NETWORK_RULES: &[&str] = &[
    "random",
    "degree",
    "degree-adaptive",
    "acquaintance",
    "coreness",
    "corehd",
    "collective-influence",
    "lp",
];

/// Parameters some rules read.
#[derive(Clone, Debug, PartialEq)]
pub struct RuleParams {
    /// Ball radius ℓ of Collective Influence (Morone & Makse 2015 use 2–3).
    pub ci_radius: u32,
    /// Largest-component size (as a fraction of N) that counts as
    /// dismantled for the Collective Influence reinsertion step.
    pub dismantle_target: f64,
}

impl Default for RuleParams {
    fn default() -> Self {
        RuleParams { ci_radius: 2, dismantle_target: 0.01 }
    }
}

impl Rule {
    /// All network-mode rules, in the order of [`NETWORK_RULES`].
    pub const ALL: [Rule; 8] = [
        Rule::Random,
        Rule::Degree,
        Rule::DegreeAdaptive,
        Rule::Acquaintance,
        Rule::Coreness,
        Rule::CoreHd,
        Rule::CollectiveInfluence,
        Rule::Lp,
    ];

    /// The rule of a command-line name.
    ///
    /// ```
    /// use spreadplan::immunize::Rule;
    /// assert_eq!(Rule::from_name("corehd"), Some(Rule::CoreHd));
    /// assert_eq!(Rule::from_name("nope"), None);
    /// ```
    pub fn from_name(name: &str) -> Option<Rule> {
        NETWORK_RULES.iter().position(|&n| n == name).map(|i| Rule::ALL[i])
    }

    /// The command-line name.
    pub fn name(self) -> &'static str {
        NETWORK_RULES[Rule::ALL.iter().position(|&r| r == self).unwrap_or(0)]
    }

    /// What a planner must know to apply the rule.
    pub fn information(self) -> &'static str {
        match self {
            Rule::Random => "none",
            Rule::Acquaintance => "a named contact",
            Rule::Degree | Rule::Lp => "contact counts",
            Rule::DegreeAdaptive | Rule::Coreness | Rule::CoreHd | Rule::CollectiveInfluence => {
                "whole network"
            }
        }
    }

    /// Whether the rule draws a fresh order per realization.
    pub fn is_randomized(self) -> bool {
        matches!(self, Rule::Random | Rule::Acquaintance | Rule::Lp)
    }
}

/// The removal order of `rule`: every person not in `absent` exactly once,
/// first dose first. `absent[v]` marks people immune before the campaign
/// (an empty slice means nobody); they are removed from the network before
/// the rule looks at it. `rng` is used only by randomized rules.
///
/// ```
/// use spreadplan::immunize::{removal_order, Rule, RuleParams};
/// use spreadplan::network::{Network, WeightMerge};
/// // A star: the hub (0) goes first under every structural rule.
/// let (net, _) = Network::from_edges(4, false, vec![(0, 1), (0, 2), (0, 3)], None,
///     WeightMerge::Max).unwrap();
/// let mut rng = spreadplan::rng::stream(1, spreadplan::rng::Stage::Rule, 0);
/// let o = removal_order(&net, Rule::Degree, &RuleParams::default(), &[], &mut rng);
/// assert_eq!(o, vec![0, 1, 2, 3]);
/// ```
pub fn removal_order(
    net: &Network,
    rule: Rule,
    params: &RuleParams,
    absent: &[bool],
    rng: &mut ChaCha8Rng,
) -> Vec<u32> {
    let present = Present::new(net, absent);
    match rule {
        Rule::Random => super::random_order(&present, rng),
        Rule::Degree => super::degree_order(&present),
        Rule::DegreeAdaptive => super::degree_adaptive_order(&present),
        Rule::Acquaintance => super::acquaintance_order(&present, rng),
        Rule::Coreness => super::coreness_order(&present),
        Rule::CoreHd => super::corehd_order(&present),
        Rule::CollectiveInfluence => {
            super::collective_influence_order(&present, params.ci_radius, params.dismantle_target)
        }
        Rule::Lp => super::lp_allocation::lp_order_present(&present, rng),
    }
}

/// The residual network a rule sees: the network with absent people
/// removed, and each present person's residual degree.
#[derive(Debug)]
pub struct Present<'a> {
    /// The whole network.
    pub net: &'a Network,
    /// `alive[v]`: not absent.
    pub alive: Vec<bool>,
    /// Number of present neighbours of each node (0 for absent nodes).
    pub degree: Vec<u32>,
}

impl<'a> Present<'a> {
    /// The residual network of `net` without `absent` (empty = nobody).
    pub fn new(net: &'a Network, absent: &[bool]) -> Self {
        let n = net.node_count();
        let alive: Vec<bool> = (0..n).map(|v| !absent.get(v).copied().unwrap_or(false)).collect();
        let degree = (0..n as u32)
            .map(|v| {
                if alive[v as usize] {
                    net.neighbors(v).iter().filter(|&&u| alive[u as usize]).count() as u32
                } else {
                    0
                }
            })
            .collect();
        Present { net, alive, degree }
    }

    /// Present nodes in index order.
    pub fn candidates(&self) -> Vec<u32> {
        (0..self.alive.len() as u32).filter(|&v| self.alive[v as usize]).collect()
    }
}
