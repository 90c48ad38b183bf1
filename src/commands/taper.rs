//! `rolltriage taper`.

#[derive(Debug, clap::Args)]
pub struct TaperArgs {}

pub fn run(_args: &TaperArgs) -> anyhow::Result<()> {
    anyhow::bail!("`rolltriage taper` is not available yet")
}
