//! File helpers shared by the modules that read folders of YAML files or write user files.

use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};

/// True for a `.yaml` or `.yml` file name.
pub fn is_yaml(path: &Path) -> bool {
    path.extension().is_some_and(|e| e == "yaml" || e == "yml")
}

/// The YAML files directly in `dir`, sorted by path (entries that cannot be read are skipped).
pub fn yaml_files(dir: &Path) -> std::io::Result<Vec<PathBuf>> {
    let mut paths: Vec<PathBuf> = std::fs::read_dir(dir)?
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| is_yaml(p))
        .collect();
    paths.sort();
    Ok(paths)
}

/// Distinguishes temporary files of concurrent saves within one process.
static SAVE_COUNTER: AtomicU64 = AtomicU64::new(0);

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
    let serial = SAVE_COUNTER.fetch_add(1, Ordering::Relaxed);
    let temp = folder.join(format!(".{name}.{}.{serial}.tmp", std::process::id()));
    let write = || -> std::io::Result<()> {
        // create_new: never follow or reuse something already at the temporary path.
        let mut file = std::fs::File::options()
            .write(true)
            .create_new(true)
            .open(&temp)?;
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
    // Make the rename itself durable where the platform allows syncing a folder; the new file
    // is complete either way, so a failure here is not an error.
    #[cfg(unix)]
    if let Ok(dir) = std::fs::File::open(&folder) {
        let _ = dir.sync_all();
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn saves_replace_and_leave_no_temporary_files() {
        let dir = tempfile::tempdir().unwrap();
        let path = dir.path().join("a.yaml");
        save_atomic(&path, b"one").unwrap();
        save_atomic(&path, b"two").unwrap();
        assert_eq!(std::fs::read(&path).unwrap(), b"two");
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
    }

    #[test]
    fn concurrent_saves_do_not_collide() {
        let dir = tempfile::tempdir().unwrap();
        let path = dir.path().join("shared.yaml");
        std::thread::scope(|scope| {
            for i in 0..8 {
                let path = path.clone();
                scope.spawn(move || save_atomic(&path, format!("writer {i}").as_bytes()).unwrap());
            }
        });
        let text = std::fs::read_to_string(&path).unwrap();
        assert!(text.starts_with("writer "), "{text}");
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
    }
}
