//! File helpers shared by every module that writes user files.

use std::io::Write;
use std::path::{Path, PathBuf};

/// Failure to save a file; the previous file (if any) is left untouched.
#[derive(Debug, thiserror::Error)]
pub enum SaveError {
    #[error("cannot write temporary file {path}: {source}")]
    WriteTemp {
        path: PathBuf,
        source: std::io::Error,
    },
    #[error("cannot replace {path} with the new version: {source}")]
    Rename {
        path: PathBuf,
        source: std::io::Error,
    },
}

/// Write `contents` to `path` atomically: write a temporary file in the same folder, flush it to
/// disk, then rename it over the target. A failure at any step leaves the old file intact.
pub fn save_atomic(path: &Path, contents: &[u8]) -> Result<(), SaveError> {
    let folder = match path.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => PathBuf::from("."),
    };
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| "rolltriage".to_string());
    let temp = folder.join(format!(".{name}.{}.tmp", std::process::id()));
    let write = || -> std::io::Result<()> {
        let mut file = std::fs::File::create(&temp)?;
        file.write_all(contents)?;
        file.sync_all()?;
        Ok(())
    };
    if let Err(source) = write() {
        let _ = std::fs::remove_file(&temp);
        return Err(SaveError::WriteTemp { path: temp, source });
    }
    if let Err(source) = std::fs::rename(&temp, path) {
        let _ = std::fs::remove_file(&temp);
        return Err(SaveError::Rename {
            path: path.to_path_buf(),
            source,
        });
    }
    Ok(())
}
