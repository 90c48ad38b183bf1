//! Command-line definitions (clap derive). Each subcommand's options live beside its code in
//! `commands/`.

use clap::{Parser, Subcommand};

use crate::commands;

const EXAMPLES: &str = "\
Examples:
  rolltriage                                   open the terminal UI on a new case
  rolltriage tui cases/harbour_newsprint_telescoping.yaml
  rolltriage stress cases/harbour_newsprint_telescoping.yaml --units us
  rolltriage diagnose cases/harbour_newsprint_telescoping.yaml --top 3
  rolltriage compare cases/harbour_newsprint_soft_measured.yaml
  rolltriage case new --web pet_film --core paper_6in -o my_case.yaml
  rolltriage case check cases/harbour_*.yaml
  rolltriage case presets --units us
  rolltriage rules check rules/
  rolltriage history add cases/harbour_newsprint_telescoping.yaml

Exit codes: 0 ok, 1 bad input or failed work, 2 usage error.";

#[derive(Debug, Parser)]
#[command(name = "rolltriage", version, about = "Why is this roll defective, and what do we change?", after_help = EXAMPLES)]
pub struct Cli {
    #[command(subcommand)]
    pub command: Option<Command>,
}

#[derive(Debug, Subcommand)]
pub enum Command {
    /// Compute the stress state inside the wound roll and print its profile.
    Stress(commands::stress::StressArgs),
    /// Rank likely causes of the observed defects and list the remedies.
    Diagnose(commands::diagnose::DiagnoseArgs),
    /// Compare what was measured on the roll with the computed stresses; estimate the
    /// wound-in tension the roll actually got.
    Compare(commands::measure::CompareArgs),
    /// Write a complaint report (Markdown, HTML with plots, JSON).
    Report(commands::report::ReportArgs),
    /// Guided training walk-throughs with scoring.
    Train(commands::train::TrainArgs),
    /// Fit material parameters from measurements.
    Calibrate(commands::calibrate::CalibrateArgs),
    /// Design a tension/taper schedule that keeps the roll out of every risk zone.
    Taper(commands::taper::TaperArgs),
    /// Work with rule bases.
    Rules(commands::rules::RulesArgs),
    /// Create and check case files.
    Case(commands::case::CaseArgs),
    /// The plant's complaint history: record, list, confirm, find similar, export, import.
    History(commands::history::HistoryArgs),
    /// Open the terminal UI, optionally on a case file.
    Tui(commands::tui::TuiArgs),
    /// Print shell completions.
    Completions {
        /// bash, zsh, fish, elvish or powershell
        shell: clap_complete::Shell,
    },
}
