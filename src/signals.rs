//! What happens when the program is told to stop (SIGINT, SIGTERM, SIGHUP, SIGQUIT): the
//! temporary files of saves in progress are removed and the terminal UI's restore hook runs,
//! then the signal's default action ends the program as it would have without us.
//!
//! Nothing is installed until a save starts or the terminal UI opens, so every other command
//! keeps the default signal behaviour. A SIGKILL cannot be caught: the temporary files it
//! leaves are cleared by the next save into the same folder ([`crate::fsutil`]).

use std::path::{Path, PathBuf};
use std::sync::{Mutex, MutexGuard};

type RestoreHook = Box<dyn Fn() + Send>;

#[derive(Default)]
struct State {
    /// Temporary files that exist now and are not yet renamed into place.
    temps: Vec<PathBuf>,
    /// Puts the terminal back (set while the terminal UI runs).
    restore: Option<RestoreHook>,
    /// A stop signal arrived: no new temporary file may be created.
    stopping: bool,
}

static STATE: Mutex<State> = Mutex::new(State {
    temps: Vec::new(),
    restore: None,
    stopping: false,
});

fn state() -> MutexGuard<'static, State> {
    // A panic elsewhere while holding the lock must not stop the clean-up.
    STATE
        .lock()
        .unwrap_or_else(|poisoned| poisoned.into_inner())
}

/// Start listening for stop signals (once per process; later calls do nothing).
pub fn install() {
    #[cfg(unix)]
    {
        static INSTALLED: std::sync::Once = std::sync::Once::new();
        INSTALLED.call_once(unix::listen);
    }
}

/// Set (or clear) the hook that restores the terminal on a stop signal.
pub fn set_restore_hook(hook: Option<RestoreHook>) {
    if hook.is_some() {
        install();
    }
    state().restore = hook;
}

/// Run `create` (which creates the temporary file at `temp`) with `temp` registered for
/// removal on a stop signal. Refused once a stop signal has arrived.
pub(crate) fn create_registered<R>(
    temp: &Path,
    create: impl FnOnce() -> std::io::Result<R>,
) -> std::io::Result<R> {
    install();
    // The lock is held while the file is created, so the signal thread sees either no file
    // or a registered one.
    let mut state = state();
    if state.stopping {
        return Err(std::io::Error::new(
            std::io::ErrorKind::Interrupted,
            "the program is stopping",
        ));
    }
    let result = create();
    if result.is_ok() {
        state.temps.push(temp.to_path_buf());
    }
    result
}

/// Run `finish` (rename or remove the temporary file) and forget `temp`.
pub(crate) fn finish_registered<R>(temp: &Path, finish: impl FnOnce() -> R) -> R {
    let mut state = state();
    let result = finish();
    state.temps.retain(|t| t != temp);
    result
}

/// Remove the registered temporary files and restore the terminal; the lock stays held
/// (returned) so no save can start or finish before the program ends.
fn clean_up() -> MutexGuard<'static, State> {
    let mut state = state();
    state.stopping = true;
    for temp in state.temps.drain(..) {
        let _ = std::fs::remove_file(temp);
    }
    if let Some(restore) = &state.restore {
        restore();
    }
    state
}

#[cfg(unix)]
mod unix {
    use signal_hook::consts::{SIGHUP, SIGINT, SIGQUIT, SIGTERM};

    pub(super) fn listen() {
        let Ok(mut signals) =
            signal_hook::iterator::Signals::new([SIGINT, SIGTERM, SIGHUP, SIGQUIT])
        else {
            return;
        };
        let spawned = std::thread::Builder::new()
            .name("rolltriage-signals".into())
            .spawn(move || {
                if let Some(signal) = signals.forever().next() {
                    let _held = super::clean_up();
                    // The default action ends the program (with the signal's exit status).
                    let _ = signal_hook::low_level::emulate_default_handler(signal);
                    std::process::exit(128 + signal);
                }
            });
        drop(spawned);
    }
}
