//! `rolltriage report`.

#[derive(Debug, clap::Args)]
pub struct ReportArgs {}

pub fn run(_args: &ReportArgs) -> anyhow::Result<()> {
    anyhow::bail!("`rolltriage report` is not available yet")
}
