//! `rolltriage calibrate`.

#[derive(Debug, clap::Args)]
pub struct CalibrateArgs {}

pub fn run(_args: &CalibrateArgs) -> anyhow::Result<()> {
    anyhow::bail!("`rolltriage calibrate` is not available yet")
}
