//! The `rolltriage case` subcommands and the exit-code contract, driven through the real binary.
//! Exit codes: 0 ok, 1 bad input, 2 usage.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn binary() -> Command {
    let mut command = Command::new(env!("CARGO_BIN_EXE_rolltriage"));
    command.env("NO_COLOR", "1");
    command
}

fn run(args: &[&str]) -> Output {
    binary().args(args).output().unwrap()
}

fn root() -> &'static Path {
    Path::new(env!("CARGO_MANIFEST_DIR"))
}

fn text(bytes: &[u8]) -> String {
    String::from_utf8_lossy(bytes).into_owned()
}

/// Every shipped case file (cases/*.yaml except the answer key), or the fixtures while
/// cases/ is still empty.
fn shipped_cases() -> Vec<PathBuf> {
    let mut files: Vec<PathBuf> = std::fs::read_dir(root().join("cases"))
        .map(|dir| {
            dir.filter_map(|e| e.ok().map(|e| e.path()))
                .filter(|p| p.extension().is_some_and(|x| x == "yaml"))
                .filter(|p| p.file_name().is_some_and(|n| n != "EXPECTED.yaml"))
                .collect()
        })
        .unwrap_or_default();
    files.extend(
        std::fs::read_dir(root().join("tests/fixtures"))
            .unwrap()
            .filter_map(|e| e.ok().map(|e| e.path()))
            .filter(|p| p.extension().is_some_and(|x| x == "yaml")),
    );
    files.sort();
    files
}

#[test]
fn case_check_accepts_every_shipped_case() {
    let files = shipped_cases();
    let output = binary()
        .args(["case", "check"])
        .args(&files)
        .output()
        .unwrap();
    assert_eq!(
        output.status.code(),
        Some(0),
        "stdout:\n{}\nstderr:\n{}",
        text(&output.stdout),
        text(&output.stderr)
    );
    let stdout = text(&output.stdout);
    assert_eq!(
        stdout.lines().filter(|l| l.starts_with("ok")).count(),
        files.len()
    );
}

#[test]
fn case_check_rejects_every_corpus_file_naming_it() {
    let mut files: Vec<PathBuf> = std::fs::read_dir(root().join("tests/bad_inputs"))
        .unwrap()
        .map(|e| e.unwrap().path())
        .collect();
    files.sort();
    let output = binary()
        .args(["case", "check"])
        .args(&files)
        .output()
        .unwrap();
    assert_eq!(output.status.code(), Some(1));
    let stderr = text(&output.stderr);
    for file in &files {
        let name = file.display().to_string();
        assert!(
            stderr
                .lines()
                .any(|l| l.starts_with("error: ") && l.contains(&name)),
            "no error line names {name}:\n{stderr}"
        );
    }
    assert!(!stderr.contains("panicked"), "{stderr}");
    assert!(stderr.contains(&format!(
        "{} of {} case file(s) failed",
        files.len(),
        files.len()
    )));
}

/// `case check` accepts exactly what the solver accepts: every corpus file it refuses, `stress`
/// refuses too (exit 1, the file named), so nothing fails only later in the solver. Answers
/// are checked against the rule base, which `stress` does not read.
#[test]
fn stress_refuses_every_file_case_check_refuses() {
    let mut files: Vec<PathBuf> = std::fs::read_dir(root().join("tests/bad_inputs"))
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.file_name().is_some_and(|n| n != "unknown_answer.yaml"))
        .collect();
    files.sort();
    for file in &files {
        let output = binary().arg("stress").arg(file).output().unwrap();
        let stderr = text(&output.stderr);
        assert_eq!(
            output.status.code(),
            Some(1),
            "{}: {stderr}",
            file.display()
        );
        assert!(
            stderr.contains(&file.display().to_string()),
            "{}: {stderr}",
            file.display()
        );
        assert!(!stderr.contains("outer_radius"), "{stderr}");
    }
}

#[test]
fn case_check_refuses_unknown_answers_like_diagnose() {
    let file = root().join("tests/bad_inputs/unknown_answer.yaml");
    for args in [vec!["case", "check"], vec!["diagnose"]] {
        let output = binary().args(&args).arg(&file).output().unwrap();
        let stderr = text(&output.stderr);
        assert_eq!(output.status.code(), Some(1), "{args:?}: {stderr}");
        assert!(
            stderr.contains("unknown question `splice_nearby`"),
            "{args:?}: {stderr}"
        );
    }
}

#[test]
fn case_new_writes_a_case_that_checks_with_nothing_assumed() {
    let dir = tempfile::tempdir().unwrap();
    for (web, core) in [
        ("newsprint", "paper_3in"),
        ("pet_film", "paper_6in"),
        ("aluminium_foil", "steel_6in"),
    ] {
        let path = dir.path().join(format!("{web}.yaml"));
        let output = run(&[
            "case",
            "new",
            "--web",
            web,
            "--core",
            core,
            "-o",
            path.to_str().unwrap(),
        ]);
        assert_eq!(output.status.code(), Some(0), "{}", text(&output.stderr));
        let check = run(&["case", "check", "--assumed", path.to_str().unwrap()]);
        assert_eq!(check.status.code(), Some(0), "{}", text(&check.stderr));
        assert!(
            text(&check.stdout).contains("0 value(s) assumed"),
            "{}",
            text(&check.stdout)
        );
        // Nothing is left out, but every value is still its preset's: it stays marked so
        // (issue 19: provenance kept), and the wound length is computed, not given.
        assert!(
            text(&check.stdout).contains("preset value(s) unchanged, 1 computed"),
            "{}",
            text(&check.stdout)
        );
        assert!(text(&check.stdout).contains("web.thickness = "));
        let written = std::fs::read_to_string(&path).unwrap();
        assert!(written.contains(&format!("preset: {web}")));
        assert!(written.contains("(from memory)") || written.contains("common practice"));
    }
    // It refuses to overwrite without --force.
    let path = dir.path().join("newsprint.yaml");
    let again = run(&["case", "new", "-o", path.to_str().unwrap()]);
    assert_eq!(again.status.code(), Some(1));
    assert!(text(&again.stderr).contains("--force"));
    let forced = run(&["case", "new", "--force", "-o", path.to_str().unwrap()]);
    assert_eq!(forced.status.code(), Some(0));
}

#[test]
fn case_new_with_an_unknown_preset_suggests_one() {
    let output = run(&["case", "new", "--web", "petfilm"]);
    assert_eq!(output.status.code(), Some(1));
    assert!(
        text(&output.stderr).contains("did you mean `pet_film`"),
        "{}",
        text(&output.stderr)
    );
}

#[test]
fn case_presets_lists_every_preset_with_sources() {
    let output = run(&["case", "presets"]);
    assert_eq!(output.status.code(), Some(0));
    let stdout = text(&output.stdout);
    for p in rolltriage::presets::web_presets() {
        assert!(stdout.contains(p.id), "{}", p.id);
    }
    for p in rolltriage::presets::core_presets() {
        assert!(stdout.contains(p.id), "{}", p.id);
    }
    assert!(stdout.contains("(from memory)"));
    let us = text(&run(&["case", "presets", "--units", "us"]).stdout);
    assert!(us.contains("pli") && us.contains("mil"));
    let json = run(&["case", "presets", "--json"]);
    let value: serde_json::Value = serde_json::from_slice(&json.stdout).unwrap();
    assert!(value["webs"].as_array().unwrap().len() >= 8);
    assert!(value["cores"][0]["crush_pressure"]["source"].is_string());
}

#[test]
fn usage_errors_exit_2_and_help_shows_examples() {
    assert_eq!(run(&["case", "check"]).status.code(), Some(2));
    assert_eq!(run(&["no-such-command"]).status.code(), Some(2));
    assert_eq!(run(&["case", "new", "--bogus"]).status.code(), Some(2));
    let help = run(&["--help"]);
    assert_eq!(help.status.code(), Some(0));
    let help = text(&help.stdout);
    assert!(
        help.contains("Examples:") && help.contains("Exit codes"),
        "{help}"
    );
    let case_help = text(&run(&["case", "--help"]).stdout);
    assert!(case_help.contains("rolltriage case check"), "{case_help}");
}

#[test]
fn completions_are_printed() {
    let output = run(&["completions", "bash"]);
    assert_eq!(output.status.code(), Some(0));
    assert!(text(&output.stdout).contains("rolltriage"));
}

#[test]
fn report_of_a_fresh_case_new_keeps_preset_and_computed_provenance() {
    let dir = tempfile::tempdir().unwrap();
    let case = dir.path().join("pet.yaml");
    let output = run(&[
        "case",
        "new",
        "--web",
        "pet_film",
        "-o",
        case.to_str().unwrap(),
    ]);
    assert_eq!(output.status.code(), Some(0), "{}", text(&output.stderr));
    let report = dir.path().join("pet.md");
    let output = run(&[
        "report",
        case.to_str().unwrap(),
        "-o",
        report.to_str().unwrap(),
    ]);
    assert_eq!(output.status.code(), Some(0), "{}", text(&output.stderr));
    let md = std::fs::read_to_string(&report).unwrap();
    assert!(md.contains("| Web thickness | 23 µm | preset value, unchanged: preset pet_film"));
    assert!(md.contains("| Web width | 1 m | preset value, unchanged: default"));
    assert!(md.contains("| Wound length | 33068 m | computed from the diameters"));
    assert!(!md.contains("0 of 20 inputs were assumed"), "{md}");
    // Editing a value by hand makes it given.
    let yaml = std::fs::read_to_string(&case)
        .unwrap()
        .replace("thickness: \"23 µm\"", "thickness: \"25 µm\"");
    std::fs::write(&case, yaml).unwrap();
    let output = run(&[
        "report",
        case.to_str().unwrap(),
        "-o",
        report.to_str().unwrap(),
    ]);
    assert_eq!(output.status.code(), Some(0), "{}", text(&output.stderr));
    let md = std::fs::read_to_string(&report).unwrap();
    assert!(md.contains("| Web thickness | 25 µm | given |"), "{md}");
}
