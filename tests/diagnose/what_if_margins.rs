//! The failure margins of the what-if and the starring position indicator read the one margins
//! table (`mechanics::table::margin_table`): the what-if's "before" is the table of the case as
//! wound, the position is the diameter the table names, and every cause of the relevance table
//! is in the shipped rule base.

use std::path::Path;

use rolltriage::case::Case;
use rolltriage::diagnose::DiagnoseOptions;
use rolltriage::diagnose::pipeline::{CaseInputs, triage};
use rolltriage::diagnose::rules::RuleBase;
use rolltriage::diagnose::what_if::margins::{SHOWN_BELOW, causes_with_margins, table_of};
use rolltriage::mechanics::table::Mechanism;

fn demo(name: &str) -> rolltriage::diagnose::pipeline::Triage {
    let path = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("cases")
        .join(name);
    let case = Case::load(&path).expect("demo case loads");
    let rules = RuleBase::embedded().expect("shipped rules");
    let options = DiagnoseOptions {
        what_if: true,
        ..Default::default()
    };
    triage(&rules, CaseInputs::File(&case), &options, &mut |_| true).expect("demo case solves")
}

/// The newsprint telescoping demo: a remedy's margins start from the case's own margins table
/// (one criterion), carry the table's IDs, and only margins below 2 on one side are listed. The
/// firmer start answers the cinching cause; a tighter start presses the layers harder, so the
/// telescoping margin (friction × pressure against handling shear of the same roll weight) goes
/// up — friction capacity grows with interlayer pressure while the handling demand depends on
/// the weight alone (Gere & Timoshenko, suddenly applied load; common practice: wind tighter
/// against telescoping).
#[test]
fn what_if_margins_start_from_the_case_table_and_rise_with_a_firmer_start() {
    let t = demo("harbour_newsprint_telescoping.yaml");
    let diagnosis = t.diagnosis.as_ref().expect("diagnosis");
    let table = table_of(&t.resolved, &t.profile);
    let mut seen = 0;
    for remedy in &diagnosis.remedies {
        let Some(what_if) = &remedy.what_if else {
            continue;
        };
        for shift in &what_if.margins {
            seen += 1;
            let row = table
                .rows
                .iter()
                .find(|r| r.mechanism.id() == shift.mechanism)
                .expect("a mechanism of the table");
            assert!(
                (shift.before - row.margin).abs() <= 1e-3 * row.margin,
                "{}: {} against the table's {}",
                shift.mechanism,
                shift.before,
                row.margin
            );
            assert!(shift.before.min(shift.after) < SHOWN_BELOW);
            assert!(!shift.words.is_empty() && shift.words.contains('→'));
        }
    }
    assert!(seen > 0, "some remedy moves a relevant margin");
    let firm_start = diagnosis
        .remedies
        .iter()
        .filter(|r| r.answers.iter().any(|c| c == "cinching_then_telescoping"))
        .filter_map(|r| r.what_if.as_ref())
        .flat_map(|w| &w.margins)
        .find(|m| m.mechanism == "telescoping")
        .expect("the firmer start moves the telescoping margin");
    assert!(firm_start.after > firm_start.before, "{firm_start:?}");
}

/// `starring_margin_position` is the diameter where the starring row of the margins table sits
/// (twice its radius), in metres, on a demo roll with hoop compression.
#[test]
fn starring_position_is_the_diameter_the_margins_table_names() {
    let t = demo("harbour_bopp_starring.yaml");
    let diagnosis = t.diagnosis.as_ref().expect("diagnosis");
    let position = diagnosis
        .indicators
        .iter()
        .find(|i| i.id == "starring_margin_position")
        .expect("hoop compression: a position");
    assert_eq!(position.unit, "m");
    let row = table_of(&t.resolved, &t.profile)
        .row(Mechanism::Starring)
        .cloned()
        .expect("starring row");
    assert!((position.value - 2.0 * row.radius).abs() < 1e-9);
    // Between the core and the outside of the roll.
    assert!(position.value >= t.resolved.core.outside_diameter);
    assert!(position.value <= t.resolved.roll.outer_diameter);
}

#[test]
fn every_cause_with_margins_is_in_the_shipped_rule_base() {
    let rules = RuleBase::embedded().expect("shipped rules");
    for cause in causes_with_margins() {
        assert!(rules.causes.contains_key(cause), "unknown cause {cause}");
    }
}
