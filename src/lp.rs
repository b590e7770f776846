//! Linear programs, solved with good_lp's pure-Rust `microlp` backend.
//!
//! The only file that imports good_lp; its types stay here. Callers build a
//! [`LinearProgram`] of plain vectors and get a [`LpSolution`] back.

use good_lp::{
    microlp, variable, Expression, ProblemVariables, ResolutionError, Solution, SolverModel,
};

/// Whether to maximize or minimize the objective.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Sense {
    /// Maximize.
    Maximize,
    /// Minimize.
    Minimize,
}

/// The comparison of a constraint.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Cmp {
    /// `Σ a_i x_i ≤ rhs`.
    Le,
    /// `Σ a_i x_i ≥ rhs`.
    Ge,
    /// `Σ a_i x_i = rhs`.
    Eq,
}

/// One linear constraint.
#[derive(Clone, Debug, PartialEq)]
pub struct Constraint {
    /// A name shown when the constraint binds (e.g. "budget", "floor: care homes").
    pub name: String,
    /// Sparse terms `(variable, coefficient)`.
    pub terms: Vec<(usize, f64)>,
    /// The comparison.
    pub cmp: Cmp,
    /// The right-hand side.
    pub rhs: f64,
}

/// `sense Σ objective_i x_i` subject to `constraints` and `lower ≤ x ≤ upper`.
#[derive(Clone, Debug, PartialEq)]
pub struct LinearProgram {
    /// Maximize or minimize.
    pub sense: Sense,
    /// Objective coefficient per variable.
    pub objective: Vec<f64>,
    /// Lower bound per variable.
    pub lower: Vec<f64>,
    /// Upper bound per variable (`f64::INFINITY` for none).
    pub upper: Vec<f64>,
    /// The constraints.
    pub constraints: Vec<Constraint>,
}

/// An optimal solution.
#[derive(Clone, Debug, PartialEq)]
pub struct LpSolution {
    /// Value per variable.
    pub values: Vec<f64>,
    /// Objective value.
    pub objective: f64,
    /// Indices of constraints that hold with equality (slack ≤ 1e-7 relative).
    pub binding: Vec<usize>,
}

/// Why an LP has no optimal solution.
#[derive(Debug, thiserror::Error, PartialEq)]
pub enum LpError {
    /// No point satisfies every constraint.
    #[error("the constraints cannot all hold (infeasible)")]
    Infeasible,
    /// The objective can grow without limit.
    #[error("the objective is unbounded")]
    Unbounded,
    /// Malformed input (lengths, NaN).
    #[error("invalid linear program: {0}")]
    Invalid(String),
    /// The solver failed.
    #[error("the LP solver failed: {0}")]
    Solver(String),
}

/// Solves `lp` to optimality.
///
/// ```
/// use spreadplan::lp::*;
/// // max x + y  s.t.  x + 2y <= 4,  0 <= x <= 3,  0 <= y
/// let lp = LinearProgram {
///     sense: Sense::Maximize,
///     objective: vec![1.0, 1.0],
///     lower: vec![0.0, 0.0],
///     upper: vec![3.0, f64::INFINITY],
///     constraints: vec![Constraint { name: "c".into(), terms: vec![(0, 1.0), (1, 2.0)],
///         cmp: Cmp::Le, rhs: 4.0 }],
/// };
/// let s = solve(&lp).unwrap();
/// assert!((s.objective - 3.5).abs() < 1e-9);
/// assert_eq!(s.binding, vec![0]);
/// ```
pub fn solve(lp: &LinearProgram) -> Result<LpSolution, LpError> {
    let n = lp.objective.len();
    if lp.lower.len() != n || lp.upper.len() != n {
        return Err(LpError::Invalid("bounds and objective differ in length".into()));
    }
    let bad = |x: f64| x.is_nan();
    if lp.objective.iter().any(|&x| !x.is_finite())
        || lp.lower.iter().any(|&x| bad(x))
        || lp.upper.iter().any(|&x| bad(x))
    {
        return Err(LpError::Invalid("objective or bounds contain NaN or infinity".into()));
    }
    for c in &lp.constraints {
        if !c.rhs.is_finite() || c.terms.iter().any(|&(i, a)| i >= n || !a.is_finite()) {
            return Err(LpError::Invalid(format!("constraint {:?} is malformed", c.name)));
        }
    }
    let mut pv = ProblemVariables::new();
    let vars: Vec<_> = (0..n)
        .map(|i| {
            let mut d = variable();
            if lp.lower[i].is_finite() {
                d = d.min(lp.lower[i]);
            }
            if lp.upper[i].is_finite() {
                d = d.max(lp.upper[i]);
            }
            pv.add(d)
        })
        .collect();
    let mut obj = Expression::with_capacity(n);
    for (i, &c) in lp.objective.iter().enumerate() {
        if c != 0.0 {
            obj.add_mul(c, vars[i]);
        }
    }
    let problem = match lp.sense {
        Sense::Maximize => pv.maximise(obj.clone()),
        Sense::Minimize => pv.minimise(obj.clone()),
    };
    let mut model = problem.using(microlp);
    for c in &lp.constraints {
        let mut e = Expression::with_capacity(c.terms.len());
        for &(i, a) in &c.terms {
            e.add_mul(a, vars[i]);
        }
        model = match c.cmp {
            Cmp::Le => model.with(e.leq(c.rhs)),
            Cmp::Ge => model.with(e.geq(c.rhs)),
            Cmp::Eq => model.with(e.eq(c.rhs)),
        };
    }
    let sol = model.solve().map_err(|e| match e {
        ResolutionError::Infeasible => LpError::Infeasible,
        ResolutionError::Unbounded => LpError::Unbounded,
        other => LpError::Solver(other.to_string()),
    })?;
    let values: Vec<f64> = vars.iter().map(|&v| sol.value(v)).collect();
    let objective: f64 = lp.objective.iter().zip(&values).map(|(c, x)| c * x).sum();
    let binding = lp
        .constraints
        .iter()
        .enumerate()
        .filter(|(_, c)| {
            let lhs: f64 = c.terms.iter().map(|&(i, a)| a * values[i]).sum();
            let tol = 1e-7 * (1.0 + c.rhs.abs());
            match c.cmp {
                Cmp::Eq => true,
                Cmp::Le | Cmp::Ge => (lhs - c.rhs).abs() <= tol,
            }
        })
        .map(|(i, _)| i)
        .collect();
    Ok(LpSolution { values, objective, binding })
}
