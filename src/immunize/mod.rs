//! Immunization rules (orders of whom to vaccinate), the class-level LP
//! allocation, and the immunization evaluator.
//!
//! Each network-mode rule lives in its own file and is a pure function
//! from the residual network ([`Present`]) to a removal order; [`Rule`]
//! and [`removal_order`] are the registry. The evaluator (`evaluate`) turns
//! orders into curves and metrics on common random numbers, and
//! [`rank_network`] builds the ranked [`Study`](crate::outcome::Study).

mod acquaintance;
pub mod analytic;
mod collective_influence;
mod corehd;
mod coreness;
mod degree;
mod evaluate;
pub mod lp_allocation;
mod random;
mod rank;
mod rule;

pub use acquaintance::acquaintance_order;
pub use collective_influence::collective_influence_order;
pub use corehd::corehd_order;
pub use coreness::{core_numbers_present, coreness_order};
pub use degree::{degree_adaptive_order, degree_order};
pub use evaluate::{
    curve_grid, dose_sequence, doses_to_contain, occupation, radius_after, DoseBudget,
    RealizationOutcome,
};
pub use random::random_order;
pub use rank::{rank_network, Budget, ImmunizeConfig, ImmunizeError, OBJECTIVES};
pub use rule::{removal_order, Present, Rule, RuleParams, NETWORK_RULES};
