//! Which assumed inputs the answer rests on (`diagnose::sensitivity`): the library function on a
//! case where one assumed number decides the ranking and on a fully given case, and the
//! `diagnose` command's text and JSON.

use std::path::Path;

use super::common::rolltriage_ok;

use rolltriage::case::Case;
use rolltriage::diagnose::rules::RuleBase;
use rolltriage::diagnose::sensitivity::{Sensitivity, sensitivity};
use rolltriage::diagnose::{DiagnoseOptions, pipeline};

fn path(relative: &str) -> std::path::PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join(relative)
}

fn run(relative: &str) -> Sensitivity {
    let rules = RuleBase::embedded().unwrap();
    let case = Case::load(&path(relative)).unwrap();
    let options = DiagnoseOptions {
        top: 0,
        what_if: false,
        ..DiagnoseOptions::default()
    };
    let triage = pipeline::triage(&rules, (&case).into(), &options, &mut |_| true).unwrap();
    let diagnosis = triage.diagnosis.unwrap();
    sensitivity(
        &rules,
        &triage.resolved,
        &triage.profile,
        &diagnosis,
        options.solver,
        &mut |_| true,
    )
    .unwrap()
}

#[test]
fn assumed_friction_that_flips_the_ranking_is_named_first() {
    let s = run("tests/fixtures/foil_friction_assumed.yaml");
    let first = &s.inputs[0];
    assert_eq!(first.field, "web.friction");
    assert!(first.changes_first_cause, "{first:?}");
    // The telescoping rule's own threshold (rules/telescoping.yaml: friction below about 0.25,
    // a trade figure) lies inside the tried range, so the slippery-web cause comes first at its
    // low end.
    assert!(first.low < 0.25 && first.high > 0.3, "{first:?}");
    let low = first.trials.iter().find(|t| t.value == first.low).unwrap();
    assert_eq!(low.first_cause.as_deref(), Some("low_web_friction"));
    // Given values are never moved: friction is the only assumed number of this case.
    assert_eq!(s.inputs.len(), 1, "{:?}", s.inputs);
    let lines = s.lines(3);
    assert!(
        lines
            .iter()
            .any(|l| l.starts_with("- Web-to-web friction:"))
    );
    assert!(lines.iter().all(|l| !l.contains("web.friction")));
}

#[test]
fn fully_given_case_lists_nothing() {
    // Every value of this demo case is given; only the wound length is computed from them.
    let s = run("cases/harbour_newsprint_telescoping.yaml");
    assert!(s.is_empty());
    assert!(s.inputs.is_empty() && s.not_varied.is_empty());
    assert!(s.lines(3).is_empty());
}

#[test]
fn diagnose_says_in_words_what_the_answer_rests_on() {
    let case = path("tests/fixtures/foil_friction_assumed.yaml");
    let case = case.to_str().unwrap();
    let text = rolltriage_ok(&["diagnose", case, "--no-what-if"]);
    assert!(text.contains("What the answer rests on"), "{text}");
    assert!(text.contains("Web-to-web friction: assumed 0.3"), "{text}");
    assert!(!text.contains("web.friction"), "{text}");
    // IDs in JSON only.
    let json: serde_json::Value =
        serde_json::from_str(&rolltriage_ok(&["diagnose", case, "--format", "json"])).unwrap();
    assert_eq!(json["sensitivity"]["inputs"][0]["field"], "web.friction");
    // A fully given case: no section, and the JSON is the diagnosis alone.
    let demo = path("cases/harbour_newsprint_telescoping.yaml");
    let demo = demo.to_str().unwrap();
    assert!(!rolltriage_ok(&["diagnose", demo, "--no-what-if"]).contains("rests on"));
    let json: serde_json::Value =
        serde_json::from_str(&rolltriage_ok(&["diagnose", demo, "--format", "json"])).unwrap();
    assert!(json.get("sensitivity").is_none());
}
