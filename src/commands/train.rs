//! `rolltriage train`.

#[derive(Debug, clap::Args)]
pub struct TrainArgs {}

pub fn run(_args: &TrainArgs) -> anyhow::Result<()> {
    anyhow::bail!("`rolltriage train` is not available yet")
}
