//! `spreadplan immunize`: rank immunization rules under a dose budget, on a
//! contact network (Monte Carlo) or on a degree distribution (analytic).

use std::path::PathBuf;

use super::{OutputOpts, RunOpts};

/// Arguments of `spreadplan immunize`.
#[derive(Debug, clap::Args)]
#[command(group(clap::ArgGroup::new("source").required(true)
    .args(["network", "degrees", "degree_model"])))]
pub(crate) struct Args {
    /// Contact network edge list (CSV/TSV/whitespace, optional header, .gz)
    #[arg(long)]
    pub(crate) network: Option<PathBuf>,
    /// Degree distribution table: degree,count or degree,probability (optional group column)
    #[arg(long)]
    pub(crate) degrees: Option<PathBuf>,
    /// Degree model, e.g. poisson:mean=6, powerlaw:exponent=2.5,min=2,max=300
    #[arg(long)]
    pub(crate) degree_model: Option<String>,
    /// Population size for a degree distribution (doses are counted in people)
    #[arg(long)]
    pub(crate) population: Option<u64>,
    /// Also sample this many configuration-model people from the distribution and rank by Monte Carlo
    #[arg(long)]
    pub(crate) simulate: Option<u64>,
    /// Node table: id plus optional group, cost, uptake, immune
    #[arg(long)]
    pub(crate) nodes: Option<PathBuf>,
    /// Treat the edge list as directed
    #[arg(long)]
    pub(crate) directed: bool,
    /// Column holding a per-contact transmissibility in [0,1] (multiplies --transmissibility)
    #[arg(long)]
    pub(crate) weight_column: Option<String>,
    /// Doses: a count (500), a share of the population (5%), or cost units when costs are given
    #[arg(long)]
    pub(crate) budget: String,
    /// Probability that a contact transmits, in [0,1]
    #[arg(long)]
    pub(crate) transmissibility: f64,
    /// Probability that a dose makes its recipient immune (all-or-nothing), in (0,1]
    #[arg(long, default_value_t = 1.0)]
    pub(crate) efficacy: f64,
    /// Comma-separated rules (default: all that fit the input)
    #[arg(long)]
    pub(crate) rules: Option<String>,
    /// Metric that ranks the rules (lower is better)
    #[arg(long, default_value = "mean_outbreak_fraction")]
    pub(crate) objective: String,
    /// Ball radius of Collective Influence
    #[arg(long, default_value_t = 2)]
    pub(crate) ci_radius: u32,
    /// Per-group floors and caps for the lp rule, e.g. "care-homes>=0.9,school<=0.5"
    #[arg(long)]
    pub(crate) group_limits: Option<String>,
    /// For the lp rule: also find the fewest doses that reach this r_eff
    #[arg(long)]
    pub(crate) target_r_eff: Option<f64>,
    #[command(flatten)]
    pub(crate) run: RunOpts,
    #[command(flatten)]
    pub(crate) output: OutputOpts,
}

pub(crate) fn run(args: Args) -> anyhow::Result<()> {
    let Some(path) = args.network.clone() else {
        return super::immunize_degrees::run(args);
    };
    use anyhow::Context;
    use spreadplan::immunize::{rank_network, Budget, ImmunizeConfig, NETWORK_RULES};
    use spreadplan::network::load::{load_node_table, EdgeListOptions};
    super::common::init_threads(args.run.threads)?;
    let budget = Budget::parse(&args.budget)?;
    let mut cfg = ImmunizeConfig::new(budget, args.transmissibility);
    cfg.efficacy = args.efficacy;
    if let Some(list) = &args.rules {
        cfg.rules = super::common::parse_rules(list, NETWORK_RULES)?;
    }
    cfg.objective = args.objective.clone();
    cfg.runs = args.run.runs;
    cfg.seed = args.run.seed;
    cfg.ci_radius = args.ci_radius;
    cfg.group_limits = args.group_limits.clone();
    cfg.target_r_eff = args.target_r_eff;
    if let Some(text) = &cfg.group_limits {
        spreadplan::immunize::lp_allocation::parse_group_limits(text)?;
    }
    // Fail on bad parameters before reading a large file.
    if !(0.0..=1.0).contains(&cfg.transmissibility) {
        anyhow::bail!(spreadplan::immunize::ImmunizeError::Transmissibility(cfg.transmissibility));
    }
    if !(cfg.efficacy > 0.0 && cfg.efficacy <= 1.0) {
        anyhow::bail!(spreadplan::immunize::ImmunizeError::Efficacy(cfg.efficacy));
    }
    let opts = EdgeListOptions {
        directed: args.directed,
        weight_column: args.weight_column.clone(),
        ..Default::default()
    };
    let mut loaded = super::common::load_network(&path, &opts)?;
    if let Some(np) = &args.nodes {
        load_node_table(np, &mut loaded)
            .with_context(|| format!("cannot load node table {}", np.display()))?;
    }
    let progress = super::progress::for_cli(args.output.quiet);
    let study = rank_network(&loaded, &cfg, progress.as_ref())?;
    drop(progress);
    super::common::emit(&study, &args.output)
}
