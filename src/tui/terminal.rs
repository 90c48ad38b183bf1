//! Terminal setup and restore: raw mode, alternate screen, optional mouse capture, a panic
//! hook that puts the terminal back before the panic message is printed, and a stop-signal
//! hook (SIGTERM, SIGINT, SIGHUP, SIGQUIT, through [`crate::signals`]) that does the same
//! before the signal ends the program.

use std::io::{Stdout, stdout};

use ratatui::Terminal;
use ratatui::backend::CrosstermBackend;
use ratatui::crossterm::{
    event::{DisableMouseCapture, EnableMouseCapture},
    execute,
    terminal::{EnterAlternateScreen, LeaveAlternateScreen, disable_raw_mode, enable_raw_mode},
};

pub type UiTerminal = Terminal<CrosstermBackend<Stdout>>;

/// Enter raw mode and the alternate screen; install the panic hook first so even a failure
/// half-way through setup leaves a usable terminal.
pub fn setup(mouse: bool) -> std::io::Result<UiTerminal> {
    install_panic_hook(mouse);
    crate::signals::set_restore_hook(Some(Box::new(move || restore(mouse))));
    enable_raw_mode()?;
    let entered = if mouse {
        execute!(stdout(), EnterAlternateScreen, EnableMouseCapture)
    } else {
        execute!(stdout(), EnterAlternateScreen)
    };
    if let Err(error) = entered {
        teardown(mouse);
        return Err(error);
    }
    match Terminal::new(CrosstermBackend::new(stdout())) {
        Ok(mut terminal) => {
            let _ = terminal.hide_cursor();
            Ok(terminal)
        }
        Err(error) => {
            teardown(mouse);
            Err(error)
        }
    }
}

/// Restore the terminal at the end of a run and stop watching for stop signals on its behalf.
pub fn teardown(mouse: bool) {
    crate::signals::set_restore_hook(None);
    restore(mouse);
}

/// Leave the alternate screen and raw mode. Safe to call more than once.
pub fn restore(mouse: bool) {
    // Raw mode first: it has the widest effect on the user's shell.
    let _ = disable_raw_mode();
    if mouse {
        let _ = execute!(stdout(), DisableMouseCapture);
    }
    let _ = execute!(
        stdout(),
        LeaveAlternateScreen,
        ratatui::crossterm::cursor::Show
    );
}

fn install_panic_hook(mouse: bool) {
    let previous = std::panic::take_hook();
    std::panic::set_hook(Box::new(move |info| {
        // Solver-thread panics are caught and shown inside the UI: leave the screen alone.
        if std::thread::current().name() == Some(super::job::SOLVER_THREAD_NAME) {
            return;
        }
        restore(mouse);
        previous(info);
    }));
}
