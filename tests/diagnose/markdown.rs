//! Markdown output of `rolltriage diagnose` for two demo cases (insta snapshots), solved with
//! the crate's solver at a fixed grouping of about 200 elements (tests/common): the snapshot
//! moves when the rules, the rendering or the solver's numbers change.

use crate::common;

use rolltriage::diagnose::{self, DiagnoseOptions, render, rules::RuleBase};

fn markdown(case: &rolltriage::case::ResolvedCase) -> String {
    let rules = RuleBase::embedded().unwrap();
    let options = DiagnoseOptions {
        top: 5,
        what_if: true,
        solver: common::SOLVER,
    };
    let (_, d) = diagnose::triage(&rules, case, &options).unwrap();
    render::render_markdown(&case.title, &d)
}

#[test]
fn harbour_telescoping_markdown() {
    let case = common::harbour_telescoping_demo();
    let text = markdown(&case);
    // What-if notes name causes and indicators in words; IDs stay in JSON (issue 19).
    assert!(!text.contains("belief in tension_too_low"), "{text}");
    assert!(text.contains("belief in '"), "{text}");
    insta::assert_snapshot!(text);
}

#[test]
fn harbour_coated_no_taper_markdown() {
    let case = common::harbour_coated_no_taper_demo();
    let text = markdown(&case);
    insta::assert_snapshot!(text);
}
