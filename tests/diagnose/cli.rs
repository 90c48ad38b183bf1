//! The `diagnose` and `rules` commands as a user runs them: exit codes, "did you mean", lint of
//! a broken rule directory.

use std::process::Command;

fn rolltriage() -> Command {
    Command::new(env!("CARGO_BIN_EXE_rolltriage"))
}

fn case(name: &str) -> String {
    format!("{}/cases/{name}", env!("CARGO_MANIFEST_DIR"))
}

#[test]
fn rules_check_passes_on_shipped_rules_and_fails_on_a_broken_copy() {
    let out = rolltriage().args(["rules", "check"]).output().unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("14 symptoms, 30 causes"), "{text}");

    let dir = tempfile::tempdir().unwrap();
    let rules = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("rules");
    for entry in std::fs::read_dir(&rules).unwrap() {
        let path = entry.unwrap().path();
        let mut text = std::fs::read_to_string(&path).unwrap();
        if path.ends_with("telescoping.yaml") {
            text = text.replacen("indicator: air_film_ratio", "indicator: air_flim_ratio", 1);
        }
        std::fs::write(dir.path().join(path.file_name().unwrap()), text).unwrap();
    }
    let out = rolltriage()
        .args(["rules", "check"])
        .arg(dir.path())
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("telescoping.yaml:") && err.contains("did you mean `air_film_ratio`"),
        "{err}"
    );
}

#[test]
fn unknown_symptom_word_gets_a_suggestion_and_exit_1() {
    let out = rolltriage()
        .args([
            "diagnose",
            &case("harbour_ldpe_gauge_bands.yaml"),
            "--symptom",
            "telescopng",
        ])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("did you mean `telescoping`"), "{err}");
}

#[test]
fn malformed_answer_is_a_usage_message() {
    let out = rolltriage()
        .args([
            "diagnose",
            &case("harbour_ldpe_gauge_bands.yaml"),
            "--answer",
            "gauge_bands.same_lane",
        ])
        .output()
        .unwrap();
    // A malformed option value is a usage error (exit 2), like an unknown option.
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("QUESTION=VALUE"));
}

#[test]
fn rules_questions_lists_every_question_id() {
    let out = rolltriage().args(["rules", "questions"]).output().unwrap();
    assert!(out.status.success());
    let text = String::from_utf8_lossy(&out.stdout);
    for id in [
        "starring.after_splice",
        "telescoping.when",
        "core_slip.where",
        "tin_canning.between_bands",
    ] {
        assert!(text.contains(id), "{id}");
    }
}
