//! The shipped rules do not contradict themselves or leave a hazard without its caution: a
//! rule's remedies (its own and the cause catalogue's) never undo the mechanism the rule names,
//! remedies that touch knives, static or stop ramps carry the caution for it, and no remedy
//! asks to change an emergency stop (ISO 13850: the emergency stop is a safety function set by
//! the machine's risk assessment).

use rolltriage::diagnose::rules::RuleBase;

fn rules() -> RuleBase {
    RuleBase::embedded().unwrap()
}

/// Every remedy a symptom's rule for `cause` can list: the rule's own and the catalogue's.
fn remedies_of(rules: &RuleBase, symptom: &str, cause: &str) -> Vec<String> {
    let rule = rules
        .symptom(symptom)
        .unwrap()
        .rules
        .iter()
        .find(|r| r.cause == cause)
        .unwrap_or_else(|| panic!("{symptom} has no rule for {cause}"));
    let mut all = rule.remedies.clone();
    all.extend(rules.causes[cause].remedies.iter().cloned());
    all
}

#[test]
fn a_dish_that_forms_on_end_is_not_answered_by_storing_on_end() {
    let rules = rules();
    let remedies = remedies_of(&rules, "dishing", "storage_stress");
    assert!(
        !remedies.iter().any(|r| r == "store_on_end"),
        "{remedies:?}"
    );
    // Where side storage is the mechanism, storing on end stays the answer.
    let remedies = remedies_of(&rules, "out_of_round", "storage_stress");
    assert!(remedies.iter().any(|r| r == "store_on_end"), "{remedies:?}");
}

#[test]
fn no_remedy_asks_to_change_an_emergency_stop() {
    let rules = rules();
    for remedy in rules.remedies.values() {
        let text = remedy.text.to_lowercase();
        if text.contains("emergency") {
            assert!(
                text.contains("safety function") && text.contains("not a setting to change"),
                "{}: {}",
                remedy.id,
                remedy.text
            );
        }
        if text.contains("stop ramp") || text.contains("braking") {
            assert!(
                remedy
                    .cautions
                    .iter()
                    .any(|c| c == "stop_ramps_and_safety_functions"),
                "{} changes ramps without the stop-ramp caution",
                remedy.id
            );
        }
    }
}

#[test]
fn knives_and_static_carry_their_cautions() {
    let rules = rules();
    for remedy in rules.remedies.values() {
        let text = remedy.text.to_lowercase();
        let has = |c: &str| remedy.cautions.iter().any(|x| x == c);
        if text.contains("slitter") || text.contains("knife") || text.contains("knives") {
            assert!(
                has("slitter_knives"),
                "{} needs the knife caution",
                remedy.id
            );
        }
        if text.contains("static") {
            assert!(
                has("static_electricity"),
                "{} needs the static caution",
                remedy.id
            );
        }
    }
    for id in [
        "slitter_knives",
        "static_electricity",
        "stop_ramps_and_safety_functions",
    ] {
        let caution = &rules.cautions[id];
        assert!(
            caution.text.contains("lockout/tagout"),
            "{id} must defer to local codes, site procedures and lockout"
        );
    }
}

#[test]
fn every_rule_file_cites_a_published_source() {
    // At least one citation per file that is not only a rule of thumb.
    for symptom in rules().symptoms {
        assert!(
            symptom
                .sources
                .iter()
                .any(|s| !s.to_lowercase().starts_with("common practice")),
            "{}: only rules of thumb cited",
            symptom.id
        );
    }
}
