//! Options shared by several subcommands, and helpers to honour them.
#![allow(dead_code)] // helpers are adopted by the subcommands as they land

use std::path::PathBuf;

use anyhow::Context;
use clap::{Args as ClapArgs, ValueEnum};

/// The default master seed, printed in every report.
pub(crate) const DEFAULT_SEED: u64 = 20_261_202;

/// How results go to stdout.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, ValueEnum)]
pub(crate) enum Format {
    /// A human-readable table.
    #[default]
    Table,
    /// One JSON object.
    Json,
    /// CSV rows.
    Csv,
}

/// Randomness and parallelism.
#[derive(Clone, Debug, ClapArgs)]
pub(crate) struct RunOpts {
    /// Monte Carlo realizations
    #[arg(long, default_value_t = 100)]
    pub(crate) runs: u32,
    /// Master seed; results are identical for the same seed at any thread count
    #[arg(long, default_value_t = DEFAULT_SEED)]
    pub(crate) seed: u64,
    /// Worker threads (default: all cores)
    #[arg(long)]
    pub(crate) threads: Option<usize>,
}

/// Where and how results go.
#[derive(Clone, Debug, ClapArgs)]
pub(crate) struct OutputOpts {
    /// Output format on stdout
    #[arg(long, value_enum, default_value_t = Format::Table)]
    pub(crate) format: Format,
    /// Also write ranking.csv, curves.csv, allocation.csv, summary.json and report.html here
    #[arg(long)]
    pub(crate) out: Option<PathBuf>,
    /// No progress bars or notes on stderr
    #[arg(long)]
    pub(crate) quiet: bool,
}

/// Sets up the rayon pool for `--threads`.
pub(crate) fn init_threads(threads: Option<usize>) -> anyhow::Result<()> {
    if let Some(t) = threads {
        anyhow::ensure!(t >= 1, "--threads must be at least 1, got {t}");
        // A second call (e.g. the demo running several studies) is harmless.
        let _ = rayon::ThreadPoolBuilder::new().num_threads(t).build_global();
    }
    Ok(())
}

/// Parses a comma-separated rule list against the known names.
pub(crate) fn parse_rules(list: &str, known: &[&str]) -> anyhow::Result<Vec<String>> {
    let mut out = Vec::new();
    for r in list.split(',').map(str::trim).filter(|s| !s.is_empty()) {
        if !known.contains(&r) {
            anyhow::bail!("unknown rule {r:?}; known rules: {}", known.join(", "));
        }
        if !out.iter().any(|x| x == r) {
            out.push(r.to_owned());
        }
    }
    anyhow::ensure!(!out.is_empty(), "no rules given; known rules: {}", known.join(", "));
    Ok(out)
}

/// Loads an edge list with CLI-friendly context.
pub(crate) fn load_network(
    path: &std::path::Path,
    opts: &spreadplan::network::load::EdgeListOptions,
) -> anyhow::Result<spreadplan::network::load::Loaded> {
    spreadplan::network::load::load_edge_list(path, opts)
        .with_context(|| format!("cannot load network {}", path.display()))
}

/// Prints a study in the chosen format and writes `--out` files.
pub(crate) fn emit(study: &spreadplan::outcome::Study, out: &OutputOpts) -> anyhow::Result<()> {
    use spreadplan::report;
    use std::io::Write;
    let text = match out.format {
        Format::Table => report::table::render(study),
        Format::Json => report::json::to_string(study),
        Format::Csv => report::csv::ranking(study),
    };
    let mut stdout = std::io::stdout().lock();
    stdout.write_all(text.as_bytes())?;
    stdout.flush()?;
    if let Some(dir) = &out.out {
        let written = report::write_outputs(dir, study)
            .with_context(|| format!("cannot write outputs to {}", dir.display()))?;
        if !out.quiet {
            eprintln!("wrote {} files to {}", written.len(), dir.display());
        }
    }
    Ok(())
}
