//! The class-level LP allocation (`lp` rule): how large a fraction v_c of
//! each class c (degree, or degree × group) to vaccinate.
//!
//! In the configuration model the next-generation matrix between degree
//! classes is rank one (proportionate mixing: a contact reaches a degree-k
//! person with probability k p_k/⟨k⟩), so its spectral radius is exactly
//! r_eff = T Σ_c k_c(k_c − 1) P_c (1 − ε v_c)/⟨k⟩ — linear in v. Minimizing
//! it under linear supply, cost, uptake, floor and cap constraints is
//! therefore an exact LP (Becker & Starczak 1997); with only the budget
//! binding it is the fractional knapsack by k(k−1) per unit cost. General
//! group-to-group mixing makes the spectral radius non-linear (the feasible
//! set of "r_eff ≤ target" is then not convex) and is not handled here.
//!
//! Owns the class table, `--group-limits` parsing, both LPs (least r_eff
//! for a budget; least cost for a target r_eff), integer rounding, and the
//! network-mode realization of class fractions as a removal order. Solving
//! is [`crate::lp::solve`].

use std::collections::BTreeMap;

use rand_chacha::ChaCha8Rng;

use crate::degree::DegreeDistribution;
use crate::lp::{self, Cmp, Constraint, LinearProgram, LpError, Sense};
use crate::network::{Network, NodeTable};

/// Why the class LP cannot be set up or solved.
#[derive(Debug, thiserror::Error, PartialEq)]
pub enum LpAllocError {
    /// `--group-limits` is malformed.
    #[error("group limit {item:?}: {msg}")]
    Limit {
        /// The offending item.
        item: String,
        /// What is wrong.
        msg: String,
    },
    /// The solver said no (typically: floors cannot be met within the
    /// budget or uptake).
    #[error("lp allocation: {0} (check that the group floors fit within the budget and uptake)")]
    Lp(LpError),
}

impl From<LpError> for LpAllocError {
    fn from(e: LpError) -> Self {
        LpAllocError::Lp(e)
    }
}

/// Classes of people with their sizes, dose costs and uptakes.
#[derive(Clone, Debug, PartialEq)]
pub struct ClassTable {
    /// Degree of each class.
    pub degree: Vec<u32>,
    /// Group index of each class (into `group_names`).
    pub group: Vec<Option<u32>>,
    /// People in each class, n_c (may be fractional in distribution mode:
    /// population × share).
    pub count: Vec<f64>,
    /// Cost of one dose in each class.
    pub cost: Vec<f64>,
    /// Probability an offered dose is accepted; v_c ≤ uptake_c.
    pub uptake: Vec<f64>,
    /// Group labels.
    pub group_names: Vec<String>,
    /// Mean degree ⟨k⟩ of the whole population (present or not).
    pub mean_degree: f64,
    /// Population size N.
    pub population: f64,
}

impl ClassTable {
    /// Classes of a degree distribution for a population of `population`.
    pub fn from_distribution(dist: &DegreeDistribution, population: f64) -> Self {
        let cl = dist.classes();
        ClassTable {
            degree: cl.iter().map(|c| c.degree).collect(),
            group: cl.iter().map(|c| c.group).collect(),
            count: cl.iter().map(|c| c.prob * population).collect(),
            cost: cl.iter().map(|c| c.cost).collect(),
            uptake: cl.iter().map(|c| c.uptake).collect(),
            group_names: dist.group_names().to_vec(),
            mean_degree: dist.mean(),
            population,
        }
    }

    /// Classes (degree × group) of the people of a network who are not
    /// already immune, and the class of each node (`u32::MAX` for immune
    /// people). A person's degree is the *residual* degree: contacts with
    /// people who are not immune (immune people are absent from the start,
    /// as the evaluator treats them). A class's cost and uptake are its
    /// members' means; N⟨k⟩ is the residual degree sum, so
    /// [`ClassTable::r_eff`] is the configuration-model r_eff of the
    /// residual network.
    pub fn from_network(net: &Network, nodes: &NodeTable) -> (Self, Vec<u32>) {
        let n = net.node_count();
        let group_of = |v: u32| nodes.groups.as_ref().map(|g| g.of[v as usize]);
        let residual: Vec<u32> = (0..n as u32)
            .map(|v| {
                if nodes.is_immune(v) {
                    0
                } else {
                    net.neighbors(v).iter().filter(|&&u| !nodes.is_immune(u)).count() as u32
                }
            })
            .collect();
        let mut key_of: BTreeMap<(u32, Option<u32>), usize> = BTreeMap::new();
        for v in 0..n as u32 {
            if !nodes.is_immune(v) {
                let len = key_of.len();
                key_of.entry((residual[v as usize], group_of(v))).or_insert(len);
            }
        }
        // Renumber classes in key order.
        let keys: Vec<(u32, Option<u32>)> = key_of.keys().copied().collect();
        let index: BTreeMap<(u32, Option<u32>), usize> =
            keys.iter().enumerate().map(|(i, &k)| (k, i)).collect();
        let m = keys.len();
        let (mut count, mut cost, mut uptake) = (vec![0.0; m], vec![0.0; m], vec![0.0; m]);
        let mut class_of = vec![u32::MAX; n];
        let mut total_degree = 0.0;
        for v in 0..n as u32 {
            total_degree += f64::from(residual[v as usize]);
            if nodes.is_immune(v) {
                continue;
            }
            let c = index[&(residual[v as usize], group_of(v))];
            class_of[v as usize] = c as u32;
            count[c] += 1.0;
            cost[c] += nodes.cost_of(v);
            uptake[c] += nodes.uptake_of(v);
        }
        for c in 0..m {
            cost[c] /= count[c];
            uptake[c] /= count[c];
        }
        let table = ClassTable {
            degree: keys.iter().map(|k| k.0).collect(),
            group: keys.iter().map(|k| k.1).collect(),
            count,
            cost,
            uptake,
            group_names: nodes.groups.as_ref().map(|g| g.names.clone()).unwrap_or_default(),
            mean_degree: if n > 0 { total_degree / n as f64 } else { 0.0 },
            population: n as f64,
        };
        (table, class_of)
    }

    /// Number of classes.
    pub fn len(&self) -> usize {
        self.degree.len()
    }

    /// Whether there are no classes.
    pub fn is_empty(&self) -> bool {
        self.degree.is_empty()
    }

    /// Label of class `c`: "degree 7" (the group is reported separately).
    pub fn label(&self, c: usize) -> String {
        format!("degree {}", self.degree[c])
    }

    /// Group name of class `c`.
    pub fn group_name(&self, c: usize) -> Option<String> {
        self.group[c].and_then(|g| self.group_names.get(g as usize).cloned())
    }

    /// k(k−1) n_c: the weight of class c in N⟨k⟩ r_eff/T.
    pub fn weight(&self, c: usize) -> f64 {
        let k = f64::from(self.degree[c]);
        k * (k - 1.0).max(0.0) * self.count[c]
    }

    /// r_eff = T Σ_c k(k−1) n_c (1 − ε v_c) / (N ⟨k⟩) for fractions `v`.
    pub fn r_eff(&self, v: &[f64], t: f64, efficacy: f64) -> f64 {
        let denom = self.population * self.mean_degree;
        if denom <= 0.0 {
            return 0.0;
        }
        (0..self.len()).map(|c| self.weight(c) * (1.0 - efficacy * v[c])).sum::<f64>() * t / denom
    }

    /// Cost of vaccinating fractions `v`: Σ cost_c n_c v_c.
    pub fn spend(&self, v: &[f64]) -> f64 {
        (0..self.len()).map(|c| self.cost[c] * self.count[c] * v[c]).sum()
    }

    /// People vaccinated: Σ n_c v_c.
    pub fn doses(&self, v: &[f64]) -> f64 {
        (0..self.len()).map(|c| self.count[c] * v[c]).sum()
    }
}

/// A floor (`>=`) or cap (`<=`) on the vaccinated fraction of one group.
#[derive(Clone, Debug, PartialEq)]
pub struct GroupLimit {
    /// Group label.
    pub group: String,
    /// `Ge` for a floor, `Le` for a cap.
    pub cmp: Cmp,
    /// Fraction of the group's people, in `[0, 1]`.
    pub fraction: f64,
}

/// Parses `"care-homes>=0.9,school<=0.5"` (also `=` for both).
///
/// ```
/// use spreadplan::immunize::lp_allocation::parse_group_limits;
/// let l = parse_group_limits("care-homes>=0.9, school<=0.5").unwrap();
/// assert_eq!((l[0].group.as_str(), l[1].fraction), ("care-homes", 0.5));
/// assert!(parse_group_limits("school<=1.5").is_err());
/// ```
pub fn parse_group_limits(s: &str) -> Result<Vec<GroupLimit>, LpAllocError> {
    let mut out = Vec::new();
    for item in s.split(',').map(str::trim).filter(|x| !x.is_empty()) {
        let bad = |msg: String| LpAllocError::Limit { item: item.to_owned(), msg };
        let (group, cmp, rest) = if let Some((g, r)) = item.split_once(">=") {
            (g, Cmp::Ge, r)
        } else if let Some((g, r)) = item.split_once("<=") {
            (g, Cmp::Le, r)
        } else if let Some((g, r)) = item.split_once('=') {
            (g, Cmp::Eq, r)
        } else {
            return Err(bad("expected group>=fraction or group<=fraction".into()));
        };
        let group = group.trim();
        if group.is_empty() {
            return Err(bad("the group name is empty".into()));
        }
        let f: f64 = rest
            .trim()
            .parse()
            .map_err(|_| bad(format!("fraction must be a number, got {:?}", rest.trim())))?;
        if !(0.0..=1.0).contains(&f) {
            return Err(bad(format!("fraction must be in [0, 1], got {f}")));
        }
        out.push(GroupLimit { group: group.to_owned(), cmp, fraction: f });
    }
    Ok(out)
}

/// What the LP chose.
#[derive(Clone, Debug, PartialEq)]
pub struct LpAllocation {
    /// Vaccinated fraction v_c of each class.
    pub fractions: Vec<f64>,
    /// Integer doses per class after rounding ([`round_doses`]).
    pub doses: Vec<u64>,
    /// Σ k(k−1) n_c v_c: the reduction of N⟨k⟩ r_eff/(Tε).
    pub objective: f64,
    /// Cost Σ cost_c n_c v_c of the fractional solution.
    pub spend: f64,
    /// Names of the constraints that hold with equality.
    pub binding: Vec<String>,
    /// Classes at their uptake ceiling (labels with group).
    pub at_ceiling: Vec<String>,
}

fn group_constraints(
    table: &ClassTable,
    limits: &[GroupLimit],
) -> Result<Vec<Constraint>, LpAllocError> {
    let mut out = Vec::new();
    for l in limits {
        let gi = table.group_names.iter().position(|g| *g == l.group).ok_or_else(|| {
            LpAllocError::Limit {
                item: l.group.clone(),
                msg: format!(
                    "no such group; known groups: {}",
                    if table.group_names.is_empty() {
                        "(none: the input has no group column)".to_owned()
                    } else {
                        table.group_names.join(", ")
                    }
                ),
            }
        })? as u32;
        let members: Vec<usize> =
            (0..table.len()).filter(|&c| table.group[c] == Some(gi)).collect();
        let size: f64 = members.iter().map(|&c| table.count[c]).sum();
        if size <= 0.0 {
            continue;
        }
        let terms = members.iter().map(|&c| (c, table.count[c] / size)).collect();
        let op = match l.cmp {
            Cmp::Ge => "floor",
            Cmp::Le => "cap",
            Cmp::Eq => "exact",
        };
        let sym = match l.cmp {
            Cmp::Ge => ">=",
            Cmp::Le => "<=",
            Cmp::Eq => "=",
        };
        out.push(Constraint {
            name: format!("{op}: {}{sym}{}", l.group, l.fraction),
            terms,
            cmp: l.cmp,
            rhs: l.fraction,
        });
    }
    Ok(out)
}

fn finish(
    table: &ClassTable,
    lp: &LinearProgram,
    sol: lp::LpSolution,
    budget: f64,
    limits: &[GroupLimit],
) -> LpAllocation {
    let fractions: Vec<f64> =
        sol.values.iter().enumerate().map(|(c, &x)| x.clamp(0.0, table.uptake[c])).collect();
    let binding = sol.binding.iter().map(|&i| lp.constraints[i].name.clone()).collect();
    let at_ceiling = (0..table.len())
        .filter(|&c| table.uptake[c] > 0.0 && fractions[c] >= table.uptake[c] - 1e-9)
        .map(|c| match table.group_name(c) {
            Some(g) => format!("{} ({g})", table.label(c)),
            None => table.label(c),
        })
        .collect();
    let objective = (0..table.len()).map(|c| table.weight(c) * fractions[c]).sum();
    let spend = table.spend(&fractions);
    let doses = round_doses(table, &fractions, budget.max(spend), limits);
    LpAllocation { fractions, doses, objective, spend, binding, at_ceiling }
}

/// Least r_eff for `budget` (cost units): maximize Σ k(k−1) n_c v_c s.t.
/// Σ cost_c n_c v_c ≤ budget, group floors/caps, 0 ≤ v_c ≤ uptake_c.
///
/// ```
/// use spreadplan::degree::DegreeDistribution;
/// use spreadplan::immunize::lp_allocation::{minimize_r_eff, ClassTable};
/// let d = DegreeDistribution::from_csv_str("degree,count\n1,50\n4,50\n", "t").unwrap();
/// let t = ClassTable::from_distribution(&d, 100.0);
/// let a = minimize_r_eff(&t, 10.0, &[]).unwrap();
/// // Fractional knapsack: all 10 doses to degree 4 (weight 12 per dose).
/// assert!((a.fractions[1] - 0.2).abs() < 1e-9 && a.doses == vec![0, 10]);
/// ```
pub fn minimize_r_eff(
    table: &ClassTable,
    budget: f64,
    limits: &[GroupLimit],
) -> Result<LpAllocation, LpAllocError> {
    let n = table.len();
    let wmax = (0..n).map(|c| table.weight(c)).fold(0.0, f64::max).max(1e-300);
    let scale = budget.max(1e-300);
    let mut constraints = vec![Constraint {
        name: "budget".into(),
        terms: (0..n).map(|c| (c, table.cost[c] * table.count[c] / scale)).collect(),
        cmp: Cmp::Le,
        rhs: budget / scale,
    }];
    constraints.extend(group_constraints(table, limits)?);
    let lp = LinearProgram {
        sense: Sense::Maximize,
        objective: (0..n).map(|c| table.weight(c) / wmax).collect(),
        lower: vec![0.0; n],
        upper: table.uptake.clone(),
        constraints,
    };
    let sol = lp::solve(&lp)?;
    Ok(finish(table, &lp, sol, budget, limits))
}

/// Least cost to reach r_eff ≤ `target` at transmissibility `t` and
/// efficacy `efficacy`: minimize Σ cost_c n_c v_c s.t.
/// Σ k(k−1) n_c v_c ≥ (R0 − target) N⟨k⟩/(T ε), group limits, bounds.
/// When the target is out of reach (uptake ceilings, caps) the error is
/// [`LpError::Infeasible`]. With unit costs the least cost is the fewest
/// doses.
pub fn least_cost_to_target(
    table: &ClassTable,
    target: f64,
    t: f64,
    efficacy: f64,
    limits: &[GroupLimit],
) -> Result<LpAllocation, LpAllocError> {
    let n = table.len();
    let zero = vec![0.0; n];
    let r0 = table.r_eff(&zero, t, efficacy);
    let need = if t * efficacy > 0.0 {
        ((r0 - target) * table.population * table.mean_degree / (t * efficacy)).max(0.0)
    } else {
        0.0
    };
    let wscale = need.max(1.0);
    let cmax = (0..n).map(|c| table.cost[c] * table.count[c]).fold(0.0, f64::max).max(1e-300);
    let mut constraints = vec![Constraint {
        name: format!("r_eff <= {target}"),
        terms: (0..n).map(|c| (c, table.weight(c) / wscale)).collect(),
        cmp: Cmp::Ge,
        rhs: need / wscale,
    }];
    constraints.extend(group_constraints(table, limits)?);
    let lp = LinearProgram {
        sense: Sense::Minimize,
        objective: (0..n).map(|c| table.cost[c] * table.count[c] / cmax).collect(),
        lower: vec![0.0; n],
        upper: table.uptake.clone(),
        constraints,
    };
    let sol = lp::solve(&lp)?;
    let spend = table.spend(&sol.values);
    Ok(finish(table, &lp, sol, spend, limits))
}

/// Integer doses per class from fractions `v` within `budget`.
///
/// Rounding: each class first gets ⌊n_c v_c⌋ doses (never more than
/// ⌊n_c uptake_c⌋); the budget left over is then handed out one class at a
/// time in order of objective gain per unit cost, k(k−1)/cost_c (ties:
/// lower class index), each class taking as many whole doses as fit the
/// remaining budget, its uptake ceiling and its group's cap. Floors may
/// fall short by less than one dose per class.
pub fn round_doses(table: &ClassTable, v: &[f64], budget: f64, limits: &[GroupLimit]) -> Vec<u64> {
    let n = table.len();
    let ceiling = |c: usize| (table.count[c] * table.uptake[c] + 1e-9).floor().max(0.0);
    let mut doses: Vec<f64> =
        (0..n).map(|c| (table.count[c] * v[c] + 1e-9).floor().clamp(0.0, ceiling(c))).collect();
    let mut left = budget - (0..n).map(|c| table.cost[c] * doses[c]).sum::<f64>();
    // Group caps in people.
    let cap_of = |g: Option<u32>| -> f64 {
        let Some(g) = g else { return f64::INFINITY };
        let name = &table.group_names[g as usize];
        let size: f64 = (0..n).filter(|&c| table.group[c] == Some(g)).map(|c| table.count[c]).sum();
        limits
            .iter()
            .filter(|l| l.group == *name && matches!(l.cmp, Cmp::Le | Cmp::Eq))
            .map(|l| (l.fraction * size + 1e-9).floor())
            .fold(f64::INFINITY, f64::min)
    };
    let mut order: Vec<usize> = (0..n).collect();
    let gain = |c: usize| {
        let k = f64::from(table.degree[c]);
        k * (k - 1.0).max(0.0) / table.cost[c]
    };
    order.sort_by(|&a, &b| gain(b).total_cmp(&gain(a)).then(a.cmp(&b)));
    for c in order {
        if left < table.cost[c] || gain(c) <= 0.0 {
            continue;
        }
        let used_in_group: f64 =
            (0..n).filter(|&d| table.group[d] == table.group[c]).map(|d| doses[d]).sum();
        let room_group = cap_of(table.group[c]) - used_in_group;
        let room =
            (ceiling(c) - doses[c]).min(room_group).min((left / table.cost[c] + 1e-9).floor());
        if room >= 1.0 {
            doses[c] += room;
            left -= room * table.cost[c];
        }
    }
    doses.into_iter().map(|d| d as u64).collect()
}

/// Network mode: realizes class doses as a removal order for one
/// realization. The LP's doses of each class go to members drawn
/// uniformly at random within the class (a fresh shuffle from `rng` per
/// realization); classes come in order of gain k(k−1)/cost, so any prefix
/// of the order is the LP's priority. Everybody else not immune follows
/// (same class order, shuffled), so the order lists every candidate once.
pub fn lp_removal_order(
    table: &ClassTable,
    class_of: &[u32],
    doses: &[u64],
    rng: &mut ChaCha8Rng,
) -> Vec<u32> {
    realize(table, class_of, doses, None, &vec![false; table.len()], rng)
}

/// The removal order behind [`lp_removal_order`] and [`NetworkLpPlan::order`].
/// With `accepts`, class c's section offers shuffled members until
/// `doses[c]` of them accept (refusers stay listed; the evaluator skips
/// them). Classes flagged in `last` (groups with a cap) close the order.
fn realize(
    table: &ClassTable,
    class_of: &[u32],
    doses: &[u64],
    accepts: Option<&[bool]>,
    last: &[bool],
    rng: &mut ChaCha8Rng,
) -> Vec<u32> {
    let m = table.len();
    let mut members: Vec<Vec<u32>> = vec![Vec::new(); m];
    for (v, &c) in class_of.iter().enumerate() {
        if c != u32::MAX {
            members[c as usize].push(v as u32);
        }
    }
    let gain = |c: usize| {
        let k = f64::from(table.degree[c]);
        k * (k - 1.0).max(0.0) / table.cost[c]
    };
    let mut order: Vec<usize> = (0..m).collect();
    order.sort_by(|&a, &b| gain(b).total_cmp(&gain(a)).then(a.cmp(&b)));
    for &c in &order {
        crate::rng::shuffle(rng, &mut members[c]);
    }
    // Length of class c's first section: enough members for doses[c] acceptances.
    let take: Vec<usize> = (0..m)
        .map(|c| {
            let want = doses[c] as usize;
            match accepts {
                None => want.min(members[c].len()),
                Some(acc) => {
                    let mut got = 0;
                    let mut len = 0;
                    while got < want && len < members[c].len() {
                        got += usize::from(acc[members[c][len] as usize]);
                        len += 1;
                    }
                    len
                }
            }
        })
        .collect();
    let mut out = Vec::with_capacity(class_of.len());
    for &c in &order {
        out.extend_from_slice(&members[c][..take[c]]);
    }
    for pass_last in [false, true] {
        for &c in order.iter().filter(|&&c| last[c] == pass_last) {
            out.extend_from_slice(&members[c][take[c]..]);
        }
    }
    out
}

/// The network-mode `lp` rule solved once for a study: classes (residual
/// degree × group) of a network and node table, the LP optimum for a
/// budget in cost units under group limits, and the per-realization
/// removal orders that realize it by vaccinating uniformly at random within
/// each class (Callaway et al. 2000 degree-class targeting; the LP is exact
/// for the configuration model, see the module docs).
#[derive(Clone, Debug)]
pub struct NetworkLpPlan {
    /// The classes.
    pub table: ClassTable,
    /// Class of each node (`u32::MAX` for immune people).
    pub class_of: Vec<u32>,
    /// The LP's fractions and integer doses per class.
    pub alloc: LpAllocation,
    /// Classes in a capped group: their undosed members close the order.
    last: Vec<bool>,
}

impl NetworkLpPlan {
    /// Solves the class LP of `net` and `nodes` for `budget` (cost units;
    /// doses with unit costs) under `limits`.
    pub fn new(
        net: &Network,
        nodes: &NodeTable,
        budget: f64,
        limits: &[GroupLimit],
    ) -> Result<Self, LpAllocError> {
        let (table, class_of) = ClassTable::from_network(net, nodes);
        let alloc = minimize_r_eff(&table, budget, limits)?;
        let last = (0..table.len())
            .map(|c| {
                let g = table.group_name(c);
                limits.iter().any(|l| {
                    matches!(l.cmp, Cmp::Le | Cmp::Eq) && g.as_deref() == Some(l.group.as_str())
                })
            })
            .collect();
        Ok(NetworkLpPlan { table, class_of, alloc, last })
    }

    /// The removal order of one realization: for each class in order of
    /// k(k−1)/cost, members shuffled by `rng` are offered until the class's
    /// LP doses are accepted (`accepts[v]`: v accepts in this realization,
    /// the evaluator's uptake coins; `None` = everybody accepts); then the
    /// other candidates, members of capped groups last.
    pub fn order(&self, accepts: Option<&[bool]>, rng: &mut ChaCha8Rng) -> Vec<u32> {
        realize(&self.table, &self.class_of, &self.alloc.doses, accepts, &self.last, rng)
    }
}

/// The `lp` rule of the network-mode registry ([`super::removal_order`]),
/// where no budget, costs or group limits reach the rule: with unit costs,
/// full uptake and only the budget binding, the LP optimum at *every*
/// budget is the fractional knapsack by k(k−1), i.e. whole residual-degree
/// classes from the highest k(k−1) down, the last class partly, its members
/// drawn uniformly at random. This order (classes by k(k−1) descending,
/// members shuffled by `rng` per realization; degrees 0 and 1, of weight 0,
/// last) realizes that optimum for each prefix. With costs, uptake or group
/// limits use [`NetworkLpPlan`] (as `rank_network` does), which solves the
/// LP at the budget.
pub fn lp_order_present(present: &super::Present<'_>, rng: &mut ChaCha8Rng) -> Vec<u32> {
    let mut classes: BTreeMap<u64, Vec<u32>> = BTreeMap::new();
    for v in present.candidates() {
        let k = u64::from(present.degree[v as usize]);
        classes.entry(k * k.saturating_sub(1)).or_default().push(v);
    }
    let mut out = Vec::with_capacity(present.alive.len());
    for (_, mut members) in classes.into_iter().rev() {
        crate::rng::shuffle(rng, &mut members);
        out.extend_from_slice(&members);
    }
    out
}

/// Network mode in one call: classes from `net` and `nodes`, the LP for
/// `budget` (cost units) under `limits`, and the removal order of one
/// realization drawn from `rng` (everybody accepting; see
/// [`NetworkLpPlan::order`] for uptake).
pub fn network_lp_order(
    net: &Network,
    nodes: &NodeTable,
    budget: f64,
    limits: &[GroupLimit],
    rng: &mut ChaCha8Rng,
) -> Result<(Vec<u32>, LpAllocation), LpAllocError> {
    let plan = NetworkLpPlan::new(net, nodes, budget, limits)?;
    Ok((plan.order(None, rng), plan.alloc))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn registry_lp_order_is_knapsack_order() {
        use crate::network::{Network, WeightMerge};
        // Star with a pendant path: hub (degree 4) first, then the degree-2 node.
        let (net, _) = Network::from_edges(
            6,
            false,
            vec![(0, 1), (0, 2), (0, 3), (0, 4), (4, 5)],
            None,
            WeightMerge::Max,
        )
        .unwrap();
        let mut rng = crate::rng::stream(1, crate::rng::Stage::Rule, 0);
        let o = super::super::removal_order(
            &net,
            super::super::Rule::Lp,
            &Default::default(),
            &[],
            &mut rng,
        );
        assert_eq!(&o[..2], &[0, 4]);
        assert_eq!(o.len(), 6);
    }

    #[test]
    fn floors_and_unknown_groups() {
        let d =
            DegreeDistribution::from_csv_str("degree,count,group\n2,50,a\n6,50,b\n", "t").unwrap();
        let t = ClassTable::from_distribution(&d, 100.0);
        let l = parse_group_limits("a>=0.2").unwrap();
        let a = minimize_r_eff(&t, 30.0, &l).unwrap();
        assert!((a.fractions[0] - 0.2).abs() < 1e-9 && (a.fractions[1] - 0.4).abs() < 1e-9);
        assert!(
            a.binding.iter().any(|b| b == "budget")
                && a.binding.iter().any(|b| b.starts_with("floor"))
        );
        assert!(minimize_r_eff(&t, 5.0, &l).is_err());
        assert!(minimize_r_eff(&t, 5.0, &parse_group_limits("zzz>=0.1").unwrap()).is_err());
    }
}
