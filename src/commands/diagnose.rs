//! `rolltriage diagnose`.

#[derive(Debug, clap::Args)]
pub struct DiagnoseArgs {}

pub fn run(_args: &DiagnoseArgs) -> anyhow::Result<()> {
    anyhow::bail!("`rolltriage diagnose` is not available yet")
}
