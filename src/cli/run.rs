//! `spreadplan run`.

/// Arguments of `spreadplan run`.
#[derive(Debug, clap::Args)]
pub(crate) struct Args {}

pub(crate) fn run(_args: Args) -> anyhow::Result<()> {
    anyhow::bail!("`run` is not available yet")
}
