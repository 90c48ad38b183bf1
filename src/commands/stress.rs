//! `rolltriage stress`.

#[derive(Debug, clap::Args)]
pub struct StressArgs {}

pub fn run(_args: &StressArgs) -> anyhow::Result<()> {
    anyhow::bail!("`rolltriage stress` is not available yet")
}
