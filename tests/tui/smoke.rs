//! Runs tests/tui_smoke.sh (the real binary driven in tmux) and tests/tui_signals.sh (the
//! terminal restored on SIGTERM, SIGINT, SIGHUP, SIGQUIT) when tmux is installed. On CI
//! (`CI=true`) a missing tmux is a failure, not a skip: .ci/run installs it.

use std::process::Command;

fn tmux_present() -> bool {
    Command::new("tmux")
        .arg("-V")
        .output()
        .is_ok_and(|o| o.status.success())
}

#[test]
fn terminal_ui_end_to_end_in_tmux() {
    run_script("tui_smoke");
}

#[test]
fn terminal_restored_on_stop_signals_in_tmux() {
    run_script("tui_signals");
}

fn run_script(name: &str) {
    if !tmux_present() {
        let on_ci = std::env::var("CI").is_ok_and(|v| v == "true" || v == "1");
        assert!(
            !on_ci,
            "tmux is required on CI for the terminal-UI smoke test (.ci/run installs it)"
        );
        eprintln!("tmux not installed: skipping the terminal-UI smoke test");
        return;
    }
    let root = env!("CARGO_MANIFEST_DIR");
    let output = Command::new("bash")
        .arg(format!("{root}/tests/{name}.sh"))
        .arg(env!("CARGO_BIN_EXE_rolltriage"))
        .current_dir(root)
        .output()
        .expect("run tests/tui_smoke.sh");
    let stdout = String::from_utf8_lossy(&output.stdout);
    let stderr = String::from_utf8_lossy(&output.stderr);
    assert!(
        output.status.success(),
        "{name} failed\nstdout:\n{stdout}\nstderr:\n{stderr}"
    );
    assert!(stdout.contains(&format!("{name}: ok")), "{stdout}");
}
