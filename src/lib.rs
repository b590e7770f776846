//! spreadplan: rank immunization and seeding rules on contact networks.
//!
//! Data flows one way:
//!
//! ```text
//! input ─► network::Network (CSR) + NodeTable ─┐
//!   └────► degree::DegreeDistribution ─────────┴─► rules (immunize, seed)
//!        ─► allocations ─► evaluation (percolation, message passing, PGF)
//!        ─► outcome::Study ─► report (table, CSV, JSON, SVG, HTML)
//! ```
//!
//! | module | owns |
//! |---|---|
//! | [`network`] | the CSR [`network::Network`], the [`network::NodeTable`], loaders and generators |
//! | [`degree`] | degree distributions and their generating functions |
//! | [`percolation`] | union–find, bond/site realizations, Newman–Ziff sweeps, budget curves, non-backtracking spectral radius |
//! | [`immunize`] | immunization rules, the class-level LP allocation, the immunization evaluator |
//! | [`seed`] | cascade models, reverse-reachable sets, seeding rules, the seeding evaluator |
//! | [`lp`] | the only place that talks to the LP solver |
//! | [`stats`] | estimates with confidence intervals, paired differences |
//! | [`rng`] | counter-based coins and named random streams |
//! | [`outcome`] | the result types every evaluator produces and every report reads |
//! | [`report`] | terminal table, CSV, JSON, SVG charts, self-contained HTML |
//! | [`scenario`] | TOML scenario files that reproduce a study |
//!
//! The library never prints and never exits; the binary (`src/main.rs` and
//! `src/cli/`) owns the command line.
#![deny(missing_docs)]

pub mod degree;
pub mod immunize;
pub mod lp;
pub mod network;
pub mod outcome;
pub mod percolation;
pub mod progress;
pub mod report;
pub mod rng;
pub mod scenario;
pub mod seed;
pub mod stats;

/// The tool's name as written into every report.
pub const TOOL: &str = "spreadplan";
/// The tool's version as written into every report.
pub const VERSION: &str = env!("CARGO_PKG_VERSION");
