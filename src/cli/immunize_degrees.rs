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
    if args.simulate.is_some() {
        anyhow::bail!("--simulate is not available yet in distribution mode");
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
    emit(&study, &args.output)
}
