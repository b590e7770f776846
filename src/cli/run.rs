//! `spreadplan run SCENARIO.toml`: run a scenario file and write its
//! outputs. Parsing and running live in `spreadplan::scenario`.

use std::path::PathBuf;

use super::{Format, OutputOpts};

/// Arguments of `spreadplan run`.
#[derive(Debug, clap::Args)]
pub(crate) struct Args {
    /// Scenario file (TOML): kind, network or distribution, parameters, outputs
    pub(crate) scenario: PathBuf,
    /// Output folder (overrides the scenario's [outputs] dir)
    #[arg(long)]
    pub(crate) out: Option<PathBuf>,
    /// Output format on stdout
    #[arg(long, value_enum, default_value_t = Format::Table)]
    pub(crate) format: Format,
    /// No progress bars or notes on stderr
    #[arg(long)]
    pub(crate) quiet: bool,
    /// Worker threads (default: all cores); results do not depend on it
    #[arg(long)]
    pub(crate) threads: Option<usize>,
}

/// Runs one scenario file and writes its outputs to `out` (or the
/// scenario's folder); returns where they went.
pub(crate) fn run_file(
    path: &std::path::Path,
    out: Option<PathBuf>,
    format: Format,
    quiet: bool,
) -> anyhow::Result<Option<PathBuf>> {
    let sc = spreadplan::scenario::Scenario::from_file(path)?;
    let progress = super::progress::for_cli(quiet);
    let study = sc.run(progress.as_ref())?;
    drop(progress);
    let dir = out.or_else(|| sc.output_dir());
    let opts = OutputOpts { format, out: dir.clone(), quiet };
    super::emit(&study, &opts)?;
    Ok(dir)
}

pub(crate) fn run(args: Args) -> anyhow::Result<()> {
    super::init_threads(args.threads)?;
    run_file(&args.scenario, args.out, args.format, args.quiet)?;
    Ok(())
}
