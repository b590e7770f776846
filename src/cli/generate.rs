//! `spreadplan generate`.

/// Arguments of `spreadplan generate`.
#[derive(Debug, clap::Args)]
pub(crate) struct Args {}

pub(crate) fn run(_args: Args) -> anyhow::Result<()> {
    anyhow::bail!("`generate` is not available yet")
}
