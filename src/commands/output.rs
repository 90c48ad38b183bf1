//! Standard output for every command: one writing path, so a reader that goes away
//! (`| head`) ends the program quietly and a full disk is an error with a message, never a
//! panic. Results pass the finite-number guard before they are printed.

use std::io::Write;

use anyhow::Context;

/// Write `text` to standard output and flush it. A closed pipe is not an error: the reader
/// went away, and the command goes on with its files (`--write-case`) and exits 0. Any other
/// failure (full disk) is an error saying standard output could not be written.
pub fn write_stdout(text: &str) -> anyhow::Result<()> {
    write_bytes(text.as_bytes())
}

/// [`write_stdout`] for bytes (shell completion scripts).
pub fn write_bytes(bytes: &[u8]) -> anyhow::Result<()> {
    let mut out = std::io::stdout().lock();
    match out.write_all(bytes).and_then(|()| out.flush()) {
        Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => Ok(()),
        other => other.context("cannot write to standard output"),
    }
}
