//! `spreadplan demo`.

/// Arguments of `spreadplan demo`.
#[derive(Debug, clap::Args)]
pub(crate) struct Args {}

pub(crate) fn run(_args: Args) -> anyhow::Result<()> {
    anyhow::bail!("`demo` is not available yet")
}
