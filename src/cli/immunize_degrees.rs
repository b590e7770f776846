//! `spreadplan immunize --degrees F | --degree-model SPEC`: the analytic
//! ranking on a degree distribution.

pub(crate) fn run(_args: super::immunize::Args) -> anyhow::Result<()> {
    anyhow::bail!("ranking on a degree distribution is not available yet")
}
