//! One module per subcommand: its clap options and its `run` function. Errors are reported by
//! `main` with context.

pub mod arg_check;
pub mod calibrate;
pub mod case;
pub mod diagnose;
pub mod history;
pub mod measure;
pub mod output;
pub mod progress;
pub mod report;
pub mod rules;
pub mod stress;
pub mod taper;
pub mod train;
pub mod tui;
pub mod units_arg;
