//! `rolltriage tui [CASE.yaml]`: open the terminal UI (also what `rolltriage` alone does).

use std::path::PathBuf;

use anyhow::Context;

#[derive(Debug, Default, clap::Args)]
pub struct TuiArgs {
    /// Case file to open; without it the UI starts on a new case.
    pub case: Option<PathBuf>,
    /// Rule directory to use instead of the shipped rules.
    #[arg(long, value_name = "DIR")]
    pub rules: Option<PathBuf>,
    /// Units for figures on screen (Ctrl-U switches while running). Default: the units the
    /// case file is mostly typed in (US trade units for pli, mil, fpm, in; else SI).
    #[arg(long, value_enum)]
    pub units: Option<super::units_arg::UnitsArg>,
    /// Capture the mouse: wheel scrolls, a click on a tab switches screen.
    #[arg(long)]
    pub mouse: bool,
    /// The complaint history store the history screen (F8) reads: a SQLite file, a
    /// `postgres://user@host/db` URL, or `default`. Default: $ROLLTRIAGE_HISTORY or the
    /// per-user store, as for `rolltriage history`.
    #[arg(long = "history", value_name = "PATH|URL")]
    pub history: Option<String>,
}

pub fn run(args: &TuiArgs) -> anyhow::Result<()> {
    let options = rolltriage::tui::Options {
        case: args.case.clone(),
        rules: args.rules.clone(),
        units: args.units.map(super::units_arg::UnitsArg::system),
        mouse: args.mouse,
        history: args.history.clone(),
    };
    let what = match &args.case {
        Some(path) => format!("opening the terminal UI on {}", path.display()),
        None => "opening the terminal UI".to_string(),
    };
    rolltriage::tui::run(&options).with_context(|| what)
}
