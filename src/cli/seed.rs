//! `spreadplan seed`.

/// Arguments of `spreadplan seed`.
#[derive(Debug, clap::Args)]
pub(crate) struct Args {}

pub(crate) fn run(_args: Args) -> anyhow::Result<()> {
    anyhow::bail!("`seed` is not available yet")
}
