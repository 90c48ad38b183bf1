//! The README's promises: the quick start is exactly two commands, its demo case exists and
//! checks, and every command the usage table lists is one the binary knows.

use std::path::Path;
use std::process::Command;

fn readme() -> String {
    std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join("README.md")).unwrap()
}

/// The lines of the first fenced block after the heading `title`.
fn first_block_after(text: &str, title: &str) -> Vec<String> {
    let start = text
        .find(title)
        .unwrap_or_else(|| panic!("README lacks {title}"));
    let rest = &text[start..];
    let open = rest.find("```").unwrap();
    let body = &rest[open..];
    let body = &body[body.find('\n').unwrap() + 1..];
    let close = body.find("```").unwrap();
    body[..close]
        .lines()
        .filter(|l| !l.trim().is_empty())
        .map(str::to_string)
        .collect()
}

#[test]
fn quick_start_is_two_commands_on_a_shipped_case() {
    let text = readme();
    let first_paragraph = text.split("\n\n").nth(1).unwrap();
    assert!(
        first_paragraph.contains("winder"),
        "the README must open with the job"
    );
    let commands = first_block_after(&text, "## Quick start");
    assert_eq!(
        commands,
        vec![
            "cargo run --release -- diagnose cases/harbour_newsprint_telescoping.yaml".to_string(),
            "cargo test --release".to_string(),
        ]
    );
    let case =
        Path::new(env!("CARGO_MANIFEST_DIR")).join("cases/harbour_newsprint_telescoping.yaml");
    let output = Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .args(["case", "check"])
        .arg(&case)
        .output()
        .unwrap();
    assert_eq!(
        output.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&output.stderr)
    );
}

#[test]
fn every_command_in_the_usage_table_exists() {
    let help = Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .arg("--help")
        .output()
        .unwrap();
    let help = String::from_utf8_lossy(&help.stdout).into_owned();
    let text = readme();
    for command in [
        "stress",
        "diagnose",
        "report",
        "train",
        "calibrate",
        "taper",
        "rules",
        "case",
        "history",
        "tui",
        "completions",
    ] {
        assert!(
            text.contains(&format!("| `{command}")),
            "README usage lacks {command}"
        );
        assert!(
            help.lines().any(|l| l.trim_start().starts_with(command)),
            "--help lacks {command}:\n{help}"
        );
    }
    for section in [
        "## Usage",
        "### Exit codes",
        "## Case files",
        "## Units",
        "## Limits of the model",
        "## Safety",
        "## Performance",
    ] {
        assert!(text.contains(section), "README lacks {section}");
    }
    assert!(text.contains("lockout/tagout"));
}
