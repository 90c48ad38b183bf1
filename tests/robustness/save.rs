//! Issue 14, item 6 ("keep it fixed"): saves interrupted at random moments. A child process
//! (this test binary re-run in saver mode) saves a large file over and over; the parent kills
//! it with SIGKILL (or stops it with SIGTERM/SIGINT) at a random moment, in a loop. After each
//! stop the file holds a complete old or new version with its permission bits kept; after a
//! SIGTERM/SIGINT no temporary file is left, and after a SIGKILL the next save clears it.

#![cfg(unix)]

use std::os::unix::fs::PermissionsExt;
use std::path::{Path, PathBuf};
use std::process::{Child, Command};
use std::time::Duration;

const SAVER_ENV: &str = "ROLLTRIAGE_TEST_SAVER_PATH";
const SIZE: usize = 4 << 20;

/// One version of the file: a header line with the version number, then filler up to SIZE.
fn version(n: u64) -> Vec<u8> {
    let mut bytes = format!("version {n}\n").into_bytes();
    let fill = b'a' + (n % 26) as u8;
    bytes.resize(SIZE - 1, fill);
    bytes.push(b'\n');
    bytes
}

fn is_complete_version(bytes: &[u8]) -> bool {
    let Some(end) = bytes.iter().position(|&b| b == b'\n') else {
        return false;
    };
    let Some(n) = std::str::from_utf8(&bytes[..end])
        .ok()
        .and_then(|l| l.strip_prefix("version "))
        .and_then(|n| n.parse::<u64>().ok())
    else {
        return false;
    };
    bytes == version(n).as_slice()
}

/// Saver mode: when the parent sets SAVER_ENV, save versions 1, 2, 3, ... forever.
#[test]
fn saver_child() {
    let Ok(path) = std::env::var(SAVER_ENV) else {
        return;
    };
    let path = PathBuf::from(path);
    for n in 1.. {
        rolltriage::fsutil::save_atomic(&path, &version(n)).unwrap();
    }
}

fn start_saver(path: &Path) -> Child {
    Command::new(std::env::current_exe().unwrap())
        .args([
            "--exact",
            "save::saver_child",
            "--nocapture",
            "--test-threads=1",
        ])
        .env(SAVER_ENV, path)
        .stdout(std::process::Stdio::null())
        .stderr(std::process::Stdio::null())
        .spawn()
        .unwrap()
}

fn temporaries(dir: &Path) -> Vec<String> {
    std::fs::read_dir(dir)
        .unwrap()
        .flatten()
        .map(|e| e.file_name().to_string_lossy().into_owned())
        .filter(|n| n.ends_with(".tmp"))
        .collect()
}

/// A small deterministic generator for the kill moments (seeded: a failure repeats).
struct Moments(u64);
impl Moments {
    fn next_ms(&mut self, max: u64) -> u64 {
        self.0 ^= self.0 << 13;
        self.0 ^= self.0 >> 7;
        self.0 ^= self.0 << 17;
        self.0 % max
    }
}

fn setup() -> (tempfile::TempDir, PathBuf) {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("big_output.json");
    std::fs::write(&path, version(0)).unwrap();
    std::fs::set_permissions(&path, std::fs::Permissions::from_mode(0o640)).unwrap();
    (dir, path)
}

fn check_file(path: &Path, round: usize) {
    let bytes = std::fs::read(path).unwrap();
    assert!(
        is_complete_version(&bytes),
        "round {round}: torn file ({} bytes)",
        bytes.len()
    );
    let mode = std::fs::metadata(path).unwrap().permissions().mode() & 0o7777;
    assert_eq!(mode, 0o640, "round {round}: permission bits changed");
}

#[test]
fn sigkill_during_saves_leaves_old_or_new_content_and_the_next_save_cleans_up() {
    let (dir, path) = setup();
    let mut moments = Moments(0x6b69_6c6c);
    let mut killed_mid_save = 0;
    for round in 0..25 {
        let mut child = start_saver(&path);
        std::thread::sleep(Duration::from_millis(20 + moments.next_ms(250)));
        child.kill().unwrap(); // SIGKILL
        child.wait().unwrap();
        check_file(&path, round);
        if !temporaries(dir.path()).is_empty() {
            killed_mid_save += 1;
        }
    }
    // Saves take most of the saver's time, so most kills land inside one.
    assert!(killed_mid_save > 0, "no kill landed during a save");
    // The next run's save removes what the killed runs left.
    rolltriage::fsutil::save_atomic(&path, &version(999)).unwrap();
    check_file(&path, 999);
    assert_eq!(temporaries(dir.path()), Vec::<String>::new());
}

#[test]
fn sigterm_or_sigint_during_saves_removes_the_temporary_file() {
    let (dir, path) = setup();
    let mut moments = Moments(0x7465_726d);
    for round in 0..20 {
        let mut child = start_saver(&path);
        std::thread::sleep(Duration::from_millis(20 + moments.next_ms(250)));
        let signal = if round % 2 == 0 { "-TERM" } else { "-INT" };
        let sent = Command::new("kill")
            .args([signal, &child.id().to_string()])
            .status()
            .unwrap();
        assert!(sent.success());
        let status = child.wait().unwrap();
        assert!(!status.success(), "round {round}: the saver cannot finish");
        check_file(&path, round);
        assert_eq!(
            temporaries(dir.path()),
            Vec::<String>::new(),
            "round {round} ({signal}): temporary file left"
        );
    }
}
