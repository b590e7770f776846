//! `spreadplan seed`: rank seeding rules by expected adoption reach.

use std::path::PathBuf;

use super::{OutputOpts, RunOpts};

/// Arguments of `spreadplan seed`.
#[derive(Debug, clap::Args)]
#[command(group(clap::ArgGroup::new("source").required(true)
    .args(["network", "degrees", "degree_model"])))]
#[command(group(clap::ArgGroup::new("cascade").required(true)
    .args(["adopt_prob", "prob_column", "weighted_cascade"])))]
pub(crate) struct Args {
    /// Influence network edge list (CSV/TSV/whitespace, optional header, .gz)
    #[arg(long)]
    pub(crate) network: Option<PathBuf>,
    /// Degree distribution table: degree,count or degree,probability
    #[arg(long)]
    pub(crate) degrees: Option<PathBuf>,
    /// Degree model, e.g. poisson:mean=6
    #[arg(long)]
    pub(crate) degree_model: Option<String>,
    /// Population size for a degree distribution
    #[arg(long)]
    pub(crate) population: Option<u64>,
    /// Also sample configuration-model networks of this size and check by Monte Carlo
    #[arg(long)]
    pub(crate) simulate: Option<u64>,
    /// Number of seeds K
    #[arg(long)]
    pub(crate) budget: u64,
    /// Probability that an adopter convinces each contact (independent cascade)
    #[arg(long)]
    pub(crate) adopt_prob: Option<f64>,
    /// Edge-list column with a per-edge adoption probability
    #[arg(long)]
    pub(crate) prob_column: Option<String>,
    /// Weighted cascade: p(u→v) = 1 / in-degree of v
    #[arg(long)]
    pub(crate) weighted_cascade: bool,
    /// Treat the edge list as directed (source influences target)
    #[arg(long)]
    pub(crate) directed: bool,
    /// People who already adopted (one id per line); never seeds, already reached
    #[arg(long)]
    pub(crate) exclude: Option<PathBuf>,
    /// Node table: id plus optional group, cost
    #[arg(long)]
    pub(crate) nodes: Option<PathBuf>,
    /// Comma-separated rules (default: all)
    #[arg(long)]
    pub(crate) rules: Option<String>,
    /// IMM approximation slack ε
    #[arg(long, default_value_t = 0.1)]
    pub(crate) epsilon: f64,
    /// IMM failure exponent ℓ: the guarantee holds with probability 1 − n^−ℓ
    #[arg(long, default_value_t = 1.0)]
    pub(crate) ell: f64,
    #[command(flatten)]
    pub(crate) run: RunOpts,
    #[command(flatten)]
    pub(crate) output: OutputOpts,
}

pub(crate) fn run(_args: Args) -> anyhow::Result<()> {
    anyhow::bail!("`seed` is not available yet")
}
