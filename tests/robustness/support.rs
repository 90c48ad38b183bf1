//! Helpers of the robustness area: where the repository is, and running the binary there.

use std::path::PathBuf;
use std::process::Command;

/// The repository root (test data are found from it).
pub fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// Run `rolltriage ARGS` in the repository root: exit code and standard error.
pub fn run(args: &[&str]) -> (Option<i32>, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .args(args)
        .current_dir(root())
        .output()
        .unwrap();
    (
        out.status.code(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// Write `text` to `path` with YAML comment lines appended until it is one line past the 1 MiB
/// limit of user YAML files.
pub fn write_past_the_size_limit(path: &std::path::Path, text: &str) {
    let mut text = text.to_string();
    while (text.len() as u64) <= rolltriage::fsutil::MAX_INPUT_FILE_BYTES {
        text.push_str("# padding padding padding padding padding padding padding padding\n");
    }
    std::fs::write(path, &text).unwrap();
}
