//! Immunization rules (orders of whom to vaccinate), the class-level LP
//! allocation, and the immunization evaluator.

pub mod analytic;
pub mod lp_allocation;
