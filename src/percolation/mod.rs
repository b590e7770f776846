//! Percolation on a [`Network`](crate::network::Network): union–find,
//! bond and site realizations from counter-based coins, reverse-add budget
//! curves, Newman–Ziff sweeps, the non-backtracking spectral radius
//! (message-passing threshold), directed-network components and the
//! threshold study that puts them side by side.
//!
//! Callers use the flat list below (`percolation::budget_curve`, …)
//! whatever the file layout.

mod budget_curve;
mod directed;
mod nonbacktracking;
mod realization;
mod study;
mod sweep;
mod union_find;

pub use budget_curve::{
    budget_curve, budget_curve_into, budget_curve_sums, budget_curves, check_probability,
    BudgetCurve, BudgetCurveConfig, CurveMetric, CurveSums, RuleOrder, Scratch,
};
pub use directed::{
    directed_configuration_threshold, directed_curve, directed_realization, DirectedComponents,
    DirectedConfig, DirectedPoint,
};
pub(crate) use nonbacktracking::ResidualCore;
pub use nonbacktracking::{
    critical_transmissibility, nonbacktracking_radius, nonbacktracking_radius_above,
    nonbacktracking_radius_with, CriticalTransmissibility, SpectralRadius, NB_MAX_ITERATIONS,
};
pub use realization::{
    bond_realization, dose_takes, large_outbreak_min, EdgeThresholds, PercolationError,
    Transmissibility,
};
pub use study::{threshold_study, ThresholdConfig};
pub use sweep::{binomial_weights, newman_ziff, Sweep, SweepConfig, SweepPoint};
pub use union_find::UnionFind;
