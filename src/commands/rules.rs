//! `rolltriage rules`.

#[derive(Debug, clap::Args)]
pub struct RulesArgs {}

pub fn run(_args: &RulesArgs) -> anyhow::Result<()> {
    anyhow::bail!("`rolltriage rules` is not available yet")
}
