//! Snapshots of the `case` command screens: the preset listing and the starting case. A change
//! in a preset value or its source shows up here for review.

use std::process::Command;

fn stdout(args: &[&str]) -> String {
    let output = Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .args(args)
        .env("NO_COLOR", "1")
        .output()
        .unwrap();
    assert_eq!(
        output.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&output.stderr)
    );
    String::from_utf8(output.stdout).unwrap()
}

#[test]
fn preset_listing_si() {
    insta::assert_snapshot!(stdout(&["case", "presets"]));
}

#[test]
fn preset_listing_us() {
    insta::assert_snapshot!(stdout(&["case", "presets", "--units", "us"]));
}

#[test]
fn starting_case_for_newsprint() {
    insta::assert_snapshot!(stdout(&["case", "new", "--web", "newsprint"]));
}
