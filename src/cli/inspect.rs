//! `spreadplan inspect`.

/// Arguments of `spreadplan inspect`.
#[derive(Debug, clap::Args)]
pub(crate) struct Args {}

pub(crate) fn run(_args: Args) -> anyhow::Result<()> {
    anyhow::bail!("`inspect` is not available yet")
}
