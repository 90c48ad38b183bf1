//! Reports of real demo cases: the library pipeline (resolve, solve, diagnose, remedy re-solve)
//! in every format, and the `report` command's file handling and error messages.

use std::path::Path;
use std::process::Command;

use rolltriage::case::Case;
use rolltriage::diagnose::rules::RuleBase;
use rolltriage::model::{Resolution, SolverOptions};
use rolltriage::report::{Format, PrepareOptions, build_document, prepare, render};

fn case(name: &str) -> Case {
    Case::load(
        &Path::new(env!("CARGO_MANIFEST_DIR"))
            .join("cases")
            .join(name),
    )
    .unwrap()
}

/// Grouped layers keep the debug test quick; the report's content does not depend on it.
fn quick_solver() -> SolverOptions {
    SolverOptions {
        resolution: Resolution::Grouped { layers: 40 },
        ..SolverOptions::default()
    }
}

#[test]
fn starring_case_reports_the_upset_and_its_removal_in_every_format() {
    let rules = RuleBase::embedded().unwrap();
    let options = PrepareOptions {
        remedy: Some("fix_tension_upsets".into()),
        date: Some("2026-12-02".into()),
        source_file: Some("cases/harbour_bopp_starring.yaml".into()),
        solver: quick_solver(),
        ..PrepareOptions::default()
    };
    let input = prepare(&case("harbour_bopp_starring.yaml"), &rules, &options).unwrap();
    let doc = build_document(&input).unwrap();
    assert_eq!(doc.causes[0].id, "tension_upset");
    assert!(doc.case.inputs.iter().all(|l| !l.assumed));
    let comparison = doc.remedy_comparison.as_ref().unwrap();
    assert!(comparison.change.contains("upset bands removed"));
    // Removing a high-tension band can only lower the pressure it added inside it (common
    // practice: an upset band of high tension raises pressure beneath it).
    let peak = comparison
        .figures
        .iter()
        .find(|f| f.label == "Peak pressure")
        .unwrap();
    assert!(peak.after.si < peak.before.si);
    // ... and removes the hoop-stress spike the band carried.
    let after_max = input
        .remedy
        .as_ref()
        .unwrap()
        .after
        .tangential_stress
        .iter()
        .copied()
        .fold(f64::MIN, f64::max);
    let before_max = input
        .profile
        .tangential_stress
        .iter()
        .copied()
        .fold(f64::MIN, f64::max);
    assert!(after_max < before_max);

    let markdown = render(&input, Format::Markdown).unwrap();
    assert!(markdown.contains("## What if:"));
    assert!(markdown.contains("Made 2026-12-02 with rolltriage"));
    let json: serde_json::Value =
        serde_json::from_str(&render(&input, Format::Json).unwrap()).unwrap();
    assert_eq!(json["causes"][0]["id"], "tension_upset");
    assert!(json["profile"].as_array().unwrap().len() <= 60);
    let html = render(&input, Format::Html).unwrap();
    let parsed = scraper::Html::parse_document(&html);
    assert!(parsed.errors.is_empty(), "{:?}", parsed.errors);
    let svg = scraper::Selector::parse("figure svg").unwrap();
    assert_eq!(parsed.select(&svg).count(), 2);
    assert!(html.contains(rolltriage::report::plots::LABEL_AFTER_SUFFIX));
}

#[test]
fn a_remedy_that_changes_no_setting_is_refused_with_a_reason() {
    let rules = RuleBase::embedded().unwrap();
    let options = PrepareOptions {
        remedy: Some("gentle_handling".into()),
        solver: quick_solver(),
        ..PrepareOptions::default()
    };
    let error = prepare(
        &case("harbour_newsprint_out_of_round.yaml"),
        &rules,
        &options,
    )
    .unwrap_err();
    assert!(
        error.to_string().contains("changes no winder setting"),
        "{error}"
    );
    let options = PrepareOptions {
        remedy: Some("raise_tensoin".into()),
        solver: quick_solver(),
        ..PrepareOptions::default()
    };
    let error = prepare(
        &case("harbour_newsprint_out_of_round.yaml"),
        &rules,
        &options,
    )
    .unwrap_err();
    assert!(
        error.to_string().contains("did you mean \"raise_tension\""),
        "{error}"
    );
}

fn rolltriage() -> Command {
    Command::new(env!("CARGO_BIN_EXE_rolltriage"))
}

#[test]
fn report_command_picks_the_format_from_the_extension_and_saves_the_file() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("dishing.json");
    // The spunlace case has about a thousand layers: quick even in a debug build.
    let status = rolltriage()
        .args(["report", "cases/harbour_spunlace_dishing.yaml", "-o"])
        .arg(&out)
        .args(["--date", "2026-12-02", "--no-what-if"])
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .unwrap();
    assert!(
        status.status.success(),
        "{}",
        String::from_utf8_lossy(&status.stderr)
    );
    let json: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(&out).unwrap()).unwrap();
    assert_eq!(json["schema"], "rolltriage-report/2");
    assert_eq!(json["meta"]["date"], "2026-12-02");
    assert_eq!(json["causes"][0]["id"], "nip_load_too_high");
}

#[test]
fn report_command_rejects_bad_options_with_clear_messages() {
    let run = |args: &[&str]| {
        let output = rolltriage()
            .args(args)
            .current_dir(env!("CARGO_MANIFEST_DIR"))
            .output()
            .unwrap();
        (
            output.status.code(),
            String::from_utf8_lossy(&output.stderr).into_owned(),
        )
    };
    let case = "cases/harbour_spunlace_dishing.yaml";
    let (code, err) = run(&["report", case, "-o", "/tmp/report.pdf"]);
    assert_eq!(code, Some(1));
    assert!(err.contains(".md, .html or .json"), "{err}");
    // Bad option values are usage errors (exit 2).
    let (code, err) = run(&["report", case, "-o", "x.md", "--format", "docx"]);
    assert_eq!(code, Some(2));
    assert!(err.contains("accepted: markdown"), "{err}");
    let (code, err) = run(&["report", case, "-o", "x.md", "--date", "2.12.2026"]);
    assert_eq!(code, Some(2));
    assert!(err.contains("YYYY-MM-DD"), "{err}");
    let (code, err) = run(&["report", "cases/no_such_case.yaml", "-o", "x.md"]);
    assert_eq!(code, Some(1));
    assert!(err.contains("no_such_case.yaml"), "{err}");
    let (code, _) = run(&["report", case]);
    assert_eq!(code, Some(2), "missing -o is a usage error");
}
