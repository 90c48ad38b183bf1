//! The `rolltriage` binary: parse the command line, call the library, map errors to exit codes.
//! Exit codes: 0 ok, 1 bad input or failed work, 2 usage error (clap).

mod cli;
mod commands;

use std::process::ExitCode;

use clap::{CommandFactory, Parser};

fn main() -> ExitCode {
    let cli = cli::Cli::parse();
    let result = match &cli.command {
        None => commands::tui::run(&commands::tui::TuiArgs::default()),
        Some(cli::Command::Stress(a)) => commands::stress::run(a),
        Some(cli::Command::Diagnose(a)) => commands::diagnose::run(a),
        Some(cli::Command::Compare(a)) => commands::measure::run(a),
        Some(cli::Command::Report(a)) => commands::report::run(a),
        Some(cli::Command::Train(a)) => commands::train::run(a),
        Some(cli::Command::Calibrate(a)) => commands::calibrate::run(a),
        Some(cli::Command::Taper(a)) => commands::taper::run(a),
        Some(cli::Command::Rules(a)) => commands::rules::run(a),
        Some(cli::Command::Case(a)) => commands::case::run(a),
        Some(cli::Command::History(a)) => commands::history::run(a),
        Some(cli::Command::Tui(a)) => commands::tui::run(a),
        Some(cli::Command::Completions { shell }) => {
            // Generated into memory: clap_complete panics when its writer fails.
            let mut script = Vec::new();
            clap_complete::generate(*shell, &mut cli::Cli::command(), "rolltriage", &mut script);
            commands::output::write_bytes(&script)
        }
    };
    match result {
        Ok(()) => ExitCode::SUCCESS,
        // The reader went away (`rolltriage case presets | head`): not a failure.
        Err(error) if is_broken_pipe(&error) => ExitCode::SUCCESS,
        Err(error) => {
            eprintln!("error: {}", commands::output::error_text(&error));
            ExitCode::from(1)
        }
    }
}

fn is_broken_pipe(error: &anyhow::Error) -> bool {
    error.chain().any(|cause| {
        cause
            .downcast_ref::<std::io::Error>()
            .is_some_and(|e| e.kind() == std::io::ErrorKind::BrokenPipe)
    })
}
