//! `spreadplan seed`: rank seeding rules by expected adoption reach.

use std::path::PathBuf;

use anyhow::Context;

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

/// Reads a list of ids (one per line; `#` comments and blank lines skipped).
fn read_ids(path: &std::path::Path) -> anyhow::Result<Vec<String>> {
    let text = std::fs::read_to_string(path)
        .with_context(|| format!("cannot read exclude file {}", path.display()))?;
    Ok(text
        .lines()
        .map(str::trim)
        .filter(|l| !l.is_empty() && !l.starts_with('#'))
        .map(|l| l.split([',', '\t', ' ']).next().unwrap_or(l).to_owned())
        .filter(|l| l != "id")
        .collect())
}

pub(crate) fn run(args: Args) -> anyhow::Result<()> {
    use spreadplan::network::load::EdgeListOptions;
    use spreadplan::network::WeightMerge;
    use spreadplan::seed::{rank_seeds, CascadeModel, SeedConfig, SEED_RULES};

    let Some(path) = &args.network else {
        return run_degrees(&args);
    };
    super::common::init_threads(args.run.threads)?;
    let model = if let Some(p) = args.adopt_prob {
        anyhow::ensure!((0.0..=1.0).contains(&p), "--adopt-prob must be in [0, 1], got {p}");
        CascadeModel::Uniform { p }
    } else if args.prob_column.is_some() {
        CascadeModel::EdgeProbabilities
    } else {
        CascadeModel::WeightedCascade
    };
    anyhow::ensure!(args.budget >= 1, "--budget must be at least 1, got {}", args.budget);
    anyhow::ensure!(
        args.epsilon > 0.0 && args.epsilon < 1.0,
        "--epsilon must be in (0, 1), got {}",
        args.epsilon
    );
    anyhow::ensure!(args.ell > 0.0, "--ell must be positive, got {}", args.ell);
    anyhow::ensure!(args.run.runs >= 1, "--runs must be at least 1, got {}", args.run.runs);
    let rules = match &args.rules {
        Some(list) => super::common::parse_rules(list, SEED_RULES)?,
        None => SEED_RULES.iter().map(|s| s.to_string()).collect(),
    };
    let opts = EdgeListOptions {
        directed: args.directed,
        weight_column: args.prob_column.clone(),
        // Two records of one contact are two independent chances.
        merge: WeightMerge::NoisyOr,
    };
    let loaded = super::common::load_network(path, &opts)?;
    let n = loaded.network.node_count() as u64;
    anyhow::ensure!(
        args.budget <= n,
        "--budget must be at most the number of people ({n}), got {}",
        args.budget
    );
    let mut exclude = Vec::new();
    if let Some(f) = &args.exclude {
        let mut unknown = 0usize;
        for id in read_ids(f)? {
            match loaded.nodes.index(&id) {
                Some(v) => exclude.push(v),
                None => unknown += 1,
            }
        }
        exclude.sort_unstable();
        exclude.dedup();
        if unknown > 0 && !args.output.quiet {
            eprintln!(
                "note: {unknown} already-adopted ids are not in the network and were ignored"
            );
        }
    }
    let mut cfg = SeedConfig::new(args.budget as usize, model);
    cfg.rules = rules;
    cfg.runs = args.run.runs;
    cfg.seed = args.run.seed;
    cfg.epsilon = args.epsilon;
    cfg.ell = args.ell;
    let progress = super::progress::for_cli(args.output.quiet);
    let study = rank_seeds(&loaded, &exclude, &cfg, progress.as_ref())
        .context("cannot rank seeding rules")?;
    super::common::emit(&study, &args.output)
}

/// Independent seed draws pooled by `--simulate` in degree-distribution mode.
const SIM_DRAWS: u32 = 20;

/// Degree-distribution mode: analytic reach in the configuration model.
fn run_degrees(args: &Args) -> anyhow::Result<()> {
    use spreadplan::degree::DegreeDistribution;
    let d = match (&args.degrees, &args.degree_model) {
        (Some(f), _) => DegreeDistribution::from_csv_path(f)
            .with_context(|| format!("cannot read degree distribution {}", f.display()))?,
        (None, Some(spec)) => DegreeDistribution::from_spec(spec)
            .with_context(|| format!("bad --degree-model {spec:?}"))?,
        (None, None) => anyhow::bail!("give --network, --degrees or --degree-model"),
    };
    let Some(n) = args.population else {
        anyhow::bail!("degree-distribution mode needs --population N");
    };
    let Some(p) = args.adopt_prob else {
        anyhow::bail!("degree-distribution mode needs --adopt-prob P");
    };
    anyhow::ensure!((0.0..=1.0).contains(&p), "--adopt-prob must be in [0, 1], got {p}");
    anyhow::ensure!(
        args.budget >= 1 && args.budget <= n,
        "--budget must be between 1 and the population ({n}), got {}",
        args.budget
    );
    let budget = args.budget as usize;
    let mut study = spreadplan::seed::rank_degree_seeds(&d, p, n, budget)
        .context("cannot compute analytic reach")?;
    if let Some(n_sim) = args.simulate {
        super::common::init_threads(args.run.threads)?;
        anyhow::ensure!(
            (2..=u64::from(u32::MAX)).contains(&n_sim) && args.budget <= n_sim,
            "--simulate must be between 2 (and at least --budget) and {}, got {n_sim}",
            u32::MAX
        );
        anyhow::ensure!(args.run.runs >= 1, "--runs must be at least 1, got {}", args.run.runs);
        let loaded =
            spreadplan::immunize::analytic::sample_network(&d, n_sim as usize, args.run.seed)
                .context("cannot sample a configuration-model network")?;
        let progress = super::progress::for_cli(args.output.quiet);
        // K seeds stay K in the sample; random and acquaintance are averaged
        // over SIM_DRAWS independent seed draws (see simulate_degree_seeds).
        let simulated = spreadplan::seed::simulate_degree_seeds(
            &loaded,
            p,
            budget,
            SIM_DRAWS,
            args.run.runs,
            args.run.seed,
            progress.as_ref(),
        )
        .context("cannot simulate seeding on the sampled network")?;
        spreadplan::seed::merge_degree_simulation(&mut study, &simulated, &d, p, budget, n_sim);
    }
    super::common::emit(&study, &args.output)
}
