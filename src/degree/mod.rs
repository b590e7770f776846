//! Degree distributions and their generating functions.
//!
//! [`DegreeDistribution`] comes from a survey table or a model spec
//! ([`spec`]); [`pgf`] holds the generating functions G0/G1 with a
//! class-dependent occupation and the percolation fixed point.

pub mod distribution;
pub mod pgf;
pub mod spec;

pub use distribution::{DegreeClass, DegreeDistribution, DegreeError, MAX_SUPPORT, TAIL_MASS};
pub use pgf::{FixedPoint, Occupation};
