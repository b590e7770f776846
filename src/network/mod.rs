//! Contact networks: the CSR [`Network`], the [`NodeTable`] of external ids
//! and attributes, file loaders ([`load`]), generators ([`generate`]) and
//! structural summaries ([`inspect`]).

pub mod generate;
mod graph;
pub mod inspect;
pub mod load;
mod nodes;

pub use graph::{BuildError, BuildReport, Network, WeightMerge};
pub use nodes::{Groups, NodeTable};
