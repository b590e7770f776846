//! Cascade models, reverse-reachable sets, seeding rules and the seeding
//! evaluator.
//!
//! | file | owns |
//! |---|---|
//! | `cascade` | the independent cascade / weighted cascade as per-arc live-edge coins, exclusions, [`SeedError`] |
//! | `evaluate` | Monte Carlo expected reach and reach curves on common random numbers |
//! | `rr_sets` | reverse-reachable sets (flat storage) and greedy maximum coverage |
//! | `random`, `degree`, `degree_discount`, `acquaintance` | the simple rules |
//! | `imm` | the `ris` rule: IMM (Tang, Shi & Xiao 2015) |
//! | `lp_cover` | the `lp` rule: coverage LP over RR sets with pipage rounding |
//! | `bound` | the upper bound on the best reach of `K` seeds (OPIM-C style) |
//! | `analytic` | degree-distribution mode: generating-function reach of random, degree and acquaintance seeding |
//! | `rank` | [`SeedConfig`] and [`rank_seeds`], the library entry of `spreadplan seed` |

mod acquaintance;
mod analytic;
mod bound;
mod cascade;
mod degree;
mod degree_discount;
mod evaluate;
mod imm;
mod lp_cover;
mod random;
mod rank;
mod rr_sets;

pub use acquaintance::acquaintance_seeds;
pub use analytic::{
    analytic_reach, merge_degree_simulation, rank_degree_seeds, reach_of_degrees,
    simulate_degree_seeds, solve_cascade, CascadeSolution, SIMULATED_RULES, SIM_BOUND_SETS,
};
pub use bound::{upper_bound, UpperBound, BOUND_BASE};
pub use cascade::{Cascade, CascadeModel, SeedError};
pub use degree::degree_seeds;
pub use degree_discount::{degree_discount_seeds, discount_probability};
pub use evaluate::{expected_reach, reach_samples, ReachSamples};
pub use imm::{imm, imm_lambdas, ln_binomial, Imm};
pub use lp_cover::{lp_cover, LpCover, LP_BASE};
pub use random::random_seeds;
pub use rank::{rank_seeds, SeedConfig, SEED_RULES};
pub use rr_sets::{greedy_cover, greedy_cover_tracked, Coverage, RrSets};
