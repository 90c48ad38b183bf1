//! File helpers shared by the modules that read folders of YAML files or write user files:
//! [`save_atomic`] is the one way a user file is written.

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

/// True for a case file of the shipped demo scenario: a file under a `cases` folder that sits
/// beside the shipped rule base (`rules/causes.yaml`), as in the source tree and the release
/// archive. The terminal UI asks for a file name before saving over one of these.
pub fn is_shipped_demo_case(path: &Path) -> bool {
    let Ok(full) = std::fs::canonicalize(path) else {
        return false;
    };
    full.ancestors().skip(1).take(3).any(|folder| {
        folder.file_name().is_some_and(|n| n == "cases")
            && folder
                .parent()
                .is_some_and(|root| root.join("rules").join("causes.yaml").is_file())
    })
}

/// Largest user YAML file read: case files, rule files and material libraries (1 MiB). A
/// hand-written file is a few kilobytes; the cap keeps a stray large file from costing memory
/// and parse time.
pub const MAX_INPUT_FILE_BYTES: u64 = 1024 * 1024;

/// Failure to read a user file with [`read_text_limited`].
#[derive(Debug, thiserror::Error)]
pub enum ReadError {
    #[error("{path}: not a regular file (a pipe, device or folder); not read")]
    NotRegular { path: PathBuf },
    #[error(
        "{path}: the file is {size} bytes; a {what} may be at most {limit} bytes (1 MiB); not read"
    )]
    TooLarge {
        path: PathBuf,
        what: &'static str,
        size: u64,
        limit: u64,
    },
    #[error("{path}: not UTF-8 text; save it as UTF-8")]
    NotUtf8 { path: PathBuf },
    #[error("cannot read {path}: {error}")]
    Io {
        path: PathBuf,
        error: std::io::Error,
    },
}

impl ReadError {
    /// True when the file does not exist (some readers take that as an empty file).
    pub fn is_not_found(&self) -> bool {
        matches!(self, ReadError::Io { error, .. } if error.kind() == std::io::ErrorKind::NotFound)
    }
}

/// Read a user text file of at most `limit` bytes; `what` names the kind of file in the
/// message ("rule file"). A pipe or device is refused before it is opened (opening one could
/// wait forever), a larger file unread, and at most one byte past the limit is read in case
/// the file grows while it is read.
pub fn read_text_limited(path: &Path, what: &'static str, limit: u64) -> Result<String, ReadError> {
    use std::io::Read;
    let io = |error| ReadError::Io {
        path: path.to_path_buf(),
        error,
    };
    let too_large = |size| ReadError::TooLarge {
        path: path.to_path_buf(),
        what,
        size,
        limit,
    };
    let meta = std::fs::metadata(path).map_err(io)?;
    if !meta.is_file() {
        return Err(ReadError::NotRegular {
            path: path.to_path_buf(),
        });
    }
    if meta.len() > limit {
        return Err(too_large(meta.len()));
    }
    let mut bytes = Vec::new();
    std::fs::File::open(path)
        .map_err(io)?
        .take(limit.saturating_add(1))
        .read_to_end(&mut bytes)
        .map_err(io)?;
    if bytes.len() as u64 > limit {
        return Err(too_large(bytes.len() as u64));
    }
    String::from_utf8(bytes).map_err(|_| ReadError::NotUtf8 {
        path: path.to_path_buf(),
    })
}

/// Distinguishes temporary files of concurrent saves within one process.
static SAVE_COUNTER: AtomicU64 = AtomicU64::new(0);

/// Failure to save a file; the previous file (if any) is left untouched.
///
/// Each message names its cause once: the I/O error is part of the text and deliberately not
/// also the error's `source()`, since `anyhow`'s `{:#}` and the CLI's "caused by" list print
/// the chain and would show the cause a second time.
#[derive(Debug, thiserror::Error)]
pub enum SaveError {
    #[error("cannot write temporary file {path}: {error}")]
    WriteTemp {
        path: PathBuf,
        error: std::io::Error,
    },
    #[error("cannot replace {path} with the new version: {error}")]
    Rename {
        path: PathBuf,
        error: std::io::Error,
    },
    #[error("{path} is read-only; not replaced (make it writable or save under another name)")]
    ReadOnly { path: PathBuf },
    #[error(
        "{path} is not a regular file (a pipe, device or folder); not written (save to a file instead)"
    )]
    NotRegular { path: PathBuf },
    #[error("{path} is a symbolic link that cannot be followed: {error}")]
    BrokenLink {
        path: PathBuf,
        error: std::io::Error,
    },
}

/// Where a save really goes: the file a symbolic link points to (the link itself is kept), or
/// the path as given. An existing target must be a writable regular file.
fn save_target(path: &Path) -> Result<(PathBuf, Option<std::fs::Permissions>), SaveError> {
    let target = match std::fs::symlink_metadata(path) {
        Ok(meta) if meta.file_type().is_symlink() => {
            std::fs::canonicalize(path).map_err(|error| SaveError::BrokenLink {
                path: path.to_path_buf(),
                error,
            })?
        }
        _ => path.to_path_buf(),
    };
    match std::fs::metadata(&target) {
        Ok(meta) if !meta.is_file() => Err(SaveError::NotRegular { path: target }),
        Ok(meta) if meta.permissions().readonly() => Err(SaveError::ReadOnly { path: target }),
        Ok(meta) => Ok((target, Some(meta.permissions()))),
        Err(_) => Ok((target, None)),
    }
}

/// The temporary file name of a save of `name` by process `pid`: `.NAME.PID.SERIAL.tmp`.
fn temp_name(name: &str, pid: u32, serial: u64) -> String {
    format!(".{name}.{pid}.{serial}.tmp")
}

/// Remove temporary files that an earlier save of `name` into `folder` left behind when its
/// process was killed (SIGKILL, power loss). Only files of processes that no longer run are
/// touched; where that cannot be told (no /proc), nothing is removed and the leftovers stay
/// harmless: they never take part in a save.
fn remove_stale_temps(folder: &Path, name: &str) {
    let proc_root = Path::new("/proc");
    if !proc_root.join("self").exists() {
        return;
    }
    let Ok(entries) = std::fs::read_dir(folder) else {
        return;
    };
    let prefix = format!(".{name}.");
    for entry in entries.flatten() {
        let file_name = entry.file_name();
        let Some(rest) = file_name
            .to_str()
            .and_then(|n| n.strip_prefix(&prefix))
            .and_then(|r| r.strip_suffix(".tmp"))
        else {
            continue;
        };
        let Some((pid, serial)) = rest.split_once('.') else {
            continue;
        };
        let (Ok(pid), Ok(_)) = (pid.parse::<u32>(), serial.parse::<u64>()) else {
            continue;
        };
        let is_file = entry.file_type().is_ok_and(|t| t.is_file());
        if is_file && pid != std::process::id() && !proc_root.join(pid.to_string()).exists() {
            let _ = std::fs::remove_file(entry.path());
        }
    }
}

/// Write `contents` to `path` atomically: write a temporary file in the same folder, flush it to
/// disk, then rename it over the target. A failure at any step leaves the old file intact.
///
/// The saved file keeps what the user gave the old one: its permission bits, and a symbolic
/// link stays a link (the file it points to is replaced). A read-only target and anything that
/// is not a regular file (a pipe, a device, a folder) are refused without being touched. The
/// temporary file is removed if the program is stopped by SIGINT, SIGTERM, SIGHUP or SIGQUIT
/// ([`crate::signals`]); leftovers of a killed run are removed by the next save of that file.
pub fn save_atomic(path: &Path, contents: &[u8]) -> Result<(), SaveError> {
    let (target, permissions) = save_target(path)?;
    let folder = match target.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => PathBuf::from("."),
    };
    let name = target
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| "rolltriage".to_string());
    remove_stale_temps(&folder, &name);
    let serial = SAVE_COUNTER.fetch_add(1, Ordering::Relaxed);
    let temp = folder.join(temp_name(&name, std::process::id(), serial));
    let write = || -> std::io::Result<()> {
        // create_new: never follow or reuse something already at the temporary path.
        let mut file = crate::signals::create_registered(&temp, || {
            std::fs::File::options()
                .write(true)
                .create_new(true)
                .open(&temp)
        })?;
        if let Some(permissions) = &permissions {
            file.set_permissions(permissions.clone())?;
        }
        file.write_all(contents)?;
        file.sync_all()?;
        Ok(())
    };
    if let Err(error) = write() {
        let _ = crate::signals::finish_registered(&temp, || std::fs::remove_file(&temp));
        return Err(SaveError::WriteTemp { path: temp, error });
    }
    let renamed = crate::signals::finish_registered(&temp, || {
        std::fs::rename(&temp, &target).inspect_err(|_| {
            let _ = std::fs::remove_file(&temp);
        })
    });
    if let Err(error) = renamed {
        return Err(SaveError::Rename {
            path: target.clone(),
            error,
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

    #[cfg(unix)]
    mod unix {
        use super::super::*;
        use std::os::unix::fs::PermissionsExt;

        fn mode(path: &Path) -> u32 {
            std::fs::metadata(path).unwrap().permissions().mode() & 0o7777
        }

        fn is_symlink(path: &Path) -> bool {
            std::fs::symlink_metadata(path)
                .unwrap()
                .file_type()
                .is_symlink()
        }

        #[test]
        fn saving_over_a_file_keeps_its_permission_bits() {
            let dir = tempfile::tempdir().unwrap();
            let path = dir.path().join("private.yaml");
            std::fs::write(&path, "old").unwrap();
            std::fs::set_permissions(&path, std::fs::Permissions::from_mode(0o600)).unwrap();
            save_atomic(&path, b"new").unwrap();
            assert_eq!(std::fs::read(&path).unwrap(), b"new");
            assert_eq!(mode(&path), 0o600);
            std::fs::set_permissions(&path, std::fs::Permissions::from_mode(0o640)).unwrap();
            save_atomic(&path, b"newer").unwrap();
            assert_eq!(mode(&path), 0o640);
        }

        #[test]
        fn a_read_only_target_is_refused_and_left_alone() {
            let dir = tempfile::tempdir().unwrap();
            let path = dir.path().join("locked.yaml");
            std::fs::write(&path, "old").unwrap();
            std::fs::set_permissions(&path, std::fs::Permissions::from_mode(0o444)).unwrap();
            let error = save_atomic(&path, b"new").unwrap_err();
            assert!(matches!(error, SaveError::ReadOnly { .. }), "{error:?}");
            assert!(error.to_string().contains("read-only"));
            assert_eq!(std::fs::read(&path).unwrap(), b"old");
            assert_eq!(mode(&path), 0o444);
            assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
        }

        #[test]
        fn a_symbolic_link_is_followed_and_kept() {
            let dir = tempfile::tempdir().unwrap();
            let real_dir = dir.path().join("real");
            std::fs::create_dir(&real_dir).unwrap();
            let real = real_dir.join("case.yaml");
            std::fs::write(&real, "old").unwrap();
            std::fs::set_permissions(&real, std::fs::Permissions::from_mode(0o600)).unwrap();
            let link = dir.path().join("link.yaml");
            std::os::unix::fs::symlink(&real, &link).unwrap();
            save_atomic(&link, b"new").unwrap();
            assert!(is_symlink(&link));
            assert_eq!(std::fs::read(&real).unwrap(), b"new");
            assert_eq!(mode(&real), 0o600);
            assert_eq!(std::fs::read_dir(&real_dir).unwrap().count(), 1);
        }

        #[test]
        fn a_dangling_link_is_refused() {
            let dir = tempfile::tempdir().unwrap();
            let link = dir.path().join("link.yaml");
            std::os::unix::fs::symlink(dir.path().join("gone.yaml"), &link).unwrap();
            let error = save_atomic(&link, b"new").unwrap_err();
            assert!(matches!(error, SaveError::BrokenLink { .. }), "{error:?}");
            assert!(is_symlink(&link));
        }

        #[test]
        fn a_save_error_names_its_cause_once() {
            // The chain `anyhow` prints with `{:#}` (and the CLI's exit message) must carry the
            // operating system's words once, not once in the message and again as the source.
            let dir = tempfile::tempdir().unwrap();
            let link = dir.path().join("link.yaml");
            std::os::unix::fs::symlink(dir.path().join("gone.yaml"), &link).unwrap();
            let cause = std::fs::canonicalize(&link).unwrap_err().to_string();
            let error = save_atomic(&link, b"new").unwrap_err();
            assert!(std::error::Error::source(&error).is_none());
            let chain = format!("{:#}", anyhow::Error::new(error));
            assert_eq!(chain.matches(cause.as_str()).count(), 1, "{chain}");

            // A folder that cannot be written: the temporary file cannot be made. Skipped
            // where the tests run as root (root writes anyway).
            let locked = dir.path().join("locked");
            std::fs::create_dir(&locked).unwrap();
            std::fs::set_permissions(&locked, std::fs::Permissions::from_mode(0o555)).unwrap();
            if let Err(error) = save_atomic(&locked.join("case.yaml"), b"new") {
                assert!(matches!(error, SaveError::WriteTemp { .. }), "{error:?}");
                let chain = format!("{:#}", anyhow::Error::new(error));
                // EACCES, the error a folder without write permission gives.
                let os_words = std::io::Error::from_raw_os_error(13).to_string();
                assert_eq!(chain.matches(os_words.as_str()).count(), 1, "{chain}");
            }
            std::fs::set_permissions(&locked, std::fs::Permissions::from_mode(0o755)).unwrap();
        }

        #[test]
        fn a_fifo_or_folder_is_refused_without_blocking() {
            let dir = tempfile::tempdir().unwrap();
            let fifo = dir.path().join("pipe.yaml");
            let made = std::process::Command::new("mkfifo").arg(&fifo).status();
            if made.is_ok_and(|s| s.success()) {
                let error = save_atomic(&fifo, b"new").unwrap_err();
                assert!(matches!(error, SaveError::NotRegular { .. }), "{error:?}");
            }
            let folder = dir.path().join("folder");
            std::fs::create_dir(&folder).unwrap();
            let error = save_atomic(&folder, b"new").unwrap_err();
            assert!(matches!(error, SaveError::NotRegular { .. }), "{error:?}");
        }

        #[test]
        fn stale_temporary_files_of_dead_processes_are_removed() {
            let dir = tempfile::tempdir().unwrap();
            let path = dir.path().join("case.yaml");
            // A pid above the kernel's maximum (4194304) never runs.
            let dead = dir.path().join(temp_name("case.yaml", 999_999_999, 3));
            let alive = dir.path().join(temp_name("case.yaml", 1, 0));
            let other = dir.path().join(temp_name("other.yaml", 999_999_999, 0));
            for f in [&dead, &alive, &other] {
                std::fs::write(f, "partial").unwrap();
            }
            save_atomic(&path, b"new").unwrap();
            assert!(!dead.exists(), "a dead run's temporary file must go");
            assert!(alive.exists(), "a running process's temporary file stays");
            assert!(
                other.exists(),
                "only temporary files of the saved file are touched"
            );
        }
    }
}
