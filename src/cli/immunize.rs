//! `spreadplan immunize`.

/// Arguments of `spreadplan immunize`.
#[derive(Debug, clap::Args)]
pub(crate) struct Args {}

pub(crate) fn run(_args: Args) -> anyhow::Result<()> {
    anyhow::bail!("`immunize` is not available yet")
}
