//! `spreadplan threshold`.

/// Arguments of `spreadplan threshold`.
#[derive(Debug, clap::Args)]
pub(crate) struct Args {}

pub(crate) fn run(_args: Args) -> anyhow::Result<()> {
    anyhow::bail!("`threshold` is not available yet")
}
