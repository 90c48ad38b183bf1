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

/// A locked standard output for commands that print line by line: its errors say that
/// standard output could not be written (a closed pipe keeps its `BrokenPipe` kind, which
/// `main` turns into a quiet exit 0).
pub fn stdout() -> Stdout {
    Stdout(std::io::stdout().lock())
}

/// See [`stdout`].
pub struct Stdout(std::io::StdoutLock<'static>);

fn with_context(error: std::io::Error) -> std::io::Error {
    std::io::Error::new(
        error.kind(),
        format!("cannot write to standard output: {error}"),
    )
}

impl Write for Stdout {
    fn write(&mut self, bytes: &[u8]) -> std::io::Result<usize> {
        self.0.write(bytes).map_err(with_context)
    }

    fn flush(&mut self) -> std::io::Result<()> {
        self.0.flush().map_err(with_context)
    }
}

/// An error and its causes as one line, each part once: `context: message: cause`. A cause whose
/// text the line already holds is left out, so an error type that writes its source into its
/// own message ("cannot read x.csv: No such file or directory") is not followed by the same
/// source again, as `{:#}` would print it.
pub fn error_text(error: &anyhow::Error) -> String {
    let mut text = String::new();
    for cause in error.chain() {
        let part = cause.to_string();
        if part.is_empty() || text.contains(&part) {
            continue;
        }
        if !text.is_empty() {
            text.push_str(": ");
        }
        text.push_str(&part);
    }
    text
}
