//! `rolltriage case`.

#[derive(Debug, clap::Args)]
pub struct CaseArgs {}

pub fn run(_args: &CaseArgs) -> anyhow::Result<()> {
    anyhow::bail!("`rolltriage case` is not available yet")
}
