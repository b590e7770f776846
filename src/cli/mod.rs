//! Command-line definitions (clap) and one handler per subcommand. The only
//! place that prints. Handlers turn arguments into a library config, call
//! the library, and hand the result to `report`.
#![allow(clippy::print_stdout, clippy::print_stderr)]

mod common;
mod demo;
mod generate;
mod immunize;
mod immunize_degrees;
mod inspect;
mod progress;
mod run;
mod seed;
mod threshold;

use clap::{Parser, Subcommand};

#[allow(unused_imports)]
pub(crate) use common::*;

/// Rank immunization and seeding rules on contact networks.
#[derive(Debug, Parser)]
#[command(name = "spreadplan", version, about, long_about = None, propagate_version = true)]
pub(crate) struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Debug, Subcommand)]
enum Command {
    /// Size, degrees, components and threshold estimates of a network
    Inspect(inspect::Args),
    /// Percolation curve over the transmissibility and the critical value
    Threshold(threshold::Args),
    /// Rank immunization rules under a dose budget
    Immunize(immunize::Args),
    /// Rank seeding rules by expected adoption reach
    Seed(seed::Args),
    /// Generate a network from a random or regular model
    Generate(generate::Args),
    /// Run a scenario file that reproduces a study
    Run(run::Args),
    /// Run the bundled demo studies and write their reports
    Demo(demo::Args),
}

pub(crate) fn dispatch(cli: Cli) -> anyhow::Result<()> {
    match cli.command {
        Command::Inspect(a) => inspect::run(a),
        Command::Threshold(a) => threshold::run(a),
        Command::Immunize(a) => immunize::run(a),
        Command::Seed(a) => seed::run(a),
        Command::Generate(a) => generate::run(a),
        Command::Run(a) => run::run(a),
        Command::Demo(a) => demo::run(a),
    }
}
