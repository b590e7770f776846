//! `spreadplan immunize --degrees F | --degree-model SPEC`: the analytic
//! ranking on a degree distribution. Turns the arguments into an
//! [`AnalyticConfig`], calls [`rank_distribution`] and emits the study.

use anyhow::Context;
use spreadplan::degree::DegreeDistribution;
use spreadplan::immunize::analytic::{rank_distribution, AnalyticConfig};

use super::common::{emit, parse_rules};

pub(crate) fn run(args: super::immunize::Args) -> anyhow::Result<()> {
    let dist = match (&args.degrees, &args.degree_model) {
        (Some(path), None) => DegreeDistribution::from_csv_path(path)?,
        (None, Some(spec)) => DegreeDistribution::from_spec(spec)?,
        _ => anyhow::bail!("give exactly one of --degrees and --degree-model"),
    };
    let population =
        args.population.context("--population is required with --degrees or --degree-model")?;
    anyhow::ensure!(population >= 1, "--population must be at least 1, got {population}");
    if args.nodes.is_some() {
        anyhow::bail!(
            "--nodes applies to --network; give groups, costs and uptake as columns of the \
             --degrees table"
        );
    }
    let rules = match &args.rules {
        Some(list) => parse_rules(list, spreadplan::immunize::analytic::DISTRIBUTION_RULES)?,
        None => Vec::new(),
    };
    let cfg = AnalyticConfig {
        population,
        budget: args.budget.clone(),
        transmissibility: args.transmissibility,
        efficacy: args.efficacy,
        rules,
        objective: args.objective.clone(),
        group_limits: args.group_limits.clone(),
        target_r_eff: args.target_r_eff,
        curve_points: 21,
    };
    let mut study = rank_distribution(&dist, &cfg)?;
    if let Some(path) = &args.degrees {
        study.input.insert("path".into(), path.display().to_string().into());
    }
    study.parameters.insert("seed".into(), args.run.seed.into());
    if let Some(n_sim) = args.simulate {
        use spreadplan::immunize::{analytic, rank_network, Budget, ImmunizeConfig};
        super::common::init_threads(args.run.threads)?;
        anyhow::ensure!(
            (2..=u32::MAX as u64).contains(&n_sim),
            "--simulate must be between 2 and {}, got {n_sim}",
            u32::MAX
        );
        // A count budget is rescaled to the sampled size; a share stays.
        let budget = if args.budget.trim().ends_with('%') {
            Budget::parse(&args.budget)?
        } else {
            let b = analytic::parse_budget(&args.budget, population as f64)?;
            Budget::Amount((b * n_sim as f64 / population as f64).round())
        };
        let mut sim = ImmunizeConfig::new(budget, args.transmissibility);
        sim.efficacy = args.efficacy;
        sim.rules = cfg.rules.clone();
        sim.objective = args.objective.clone();
        sim.runs = args.run.runs;
        sim.seed = args.run.seed;
        sim.ci_radius = args.ci_radius;
        let loaded = analytic::sample_network(&dist, n_sim as usize, args.run.seed)?;
        let simulated = rank_network(&loaded, &sim, &spreadplan::progress::Silent)?;
        analytic::merge_simulated(&mut study, &simulated, n_sim, population);
    }
    emit(&study, &args.output)
}
