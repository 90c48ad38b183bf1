//! `rolltriage tui`.

#[derive(Debug, Default, clap::Args)]
pub struct TuiArgs {}

pub fn run(_args: &TuiArgs) -> anyhow::Result<()> {
    anyhow::bail!("`rolltriage tui` is not available yet")
}
