//! Quantities written in rule texts (`{50 kPa}` in an explanation, remedy or question) print in
//! the units the user chose, and a malformed placeholder is a rule-base error naming file, line
//! and rule. Outside reference: 1 psi = 6894.757 Pa (NIST SP 811, appendix B), so
//! 50 kPa = 7.25 psi and 1 MPa = 145 psi.

use rolltriage::diagnose::rules::RuleBase;
use rolltriage::units::UnitSystem;

use super::common::rolltriage_ok;

fn case(name: &str) -> String {
    format!("{}/cases/{name}", env!("CARGO_MANIFEST_DIR"))
}

#[test]
fn explanation_quantities_follow_units_in_the_diagnose_text() {
    let soft = case("harbour_spunbond_soft_roll.yaml");
    let us = rolltriage_ok(&["diagnose", &soft, "--units", "us", "--no-what-if"]);
    assert!(
        us.contains(
            "(rule: below 7.25 psi) — Mean pressure in the middle of the roll is below 7.25 psi."
        ),
        "{us}"
    );
    let si = rolltriage_ok(&["diagnose", &soft, "--units", "si", "--no-what-if"]);
    assert!(
        si.contains(
            "(rule: below 50 kPa) — Mean pressure in the middle of the roll is below 50 kPa."
        ),
        "{si}"
    );
    for text in [&us, &si] {
        assert!(!text.contains('{') && !text.contains('}'), "{text}");
    }
    assert!(!us.contains("kPa") && !us.contains("MPa"), "{us}");
    // JSON keeps SI whatever --units says.
    let json = rolltriage_ok(&[
        "diagnose",
        &soft,
        "--units",
        "us",
        "--format",
        "json",
        "--no-what-if",
    ]);
    assert!(json.contains("is below 50 kPa."), "{json}");
}

#[test]
fn every_placeholder_of_the_shipped_rules_renders_in_both_systems() {
    for units in [UnitSystem::Si, UnitSystem::Us] {
        let base = RuleBase::embedded_in(units).unwrap();
        let mut texts: Vec<&str> = Vec::new();
        for s in &base.symptoms {
            texts.extend(s.questions.iter().map(|q| q.text.as_str()));
            for r in &s.rules {
                texts.push(&r.because);
                texts.extend(r.evidence.iter().map(|e| e.says.as_str()));
            }
        }
        texts.extend(base.remedies.values().map(|r| r.text.as_str()));
        texts.extend(base.causes.values().map(|c| c.mechanism.as_str()));
        texts.extend(base.cautions.values().map(|c| c.text.as_str()));
        for text in texts {
            assert!(!text.contains('{') && !text.contains('}'), "{text}");
        }
    }
    // The question of blocking: 35 °C × 1.8 + 32 = 95 °F (NIST SP 811).
    let us = RuleBase::embedded_in(UnitSystem::Us).unwrap();
    let question = us.question("blocking.warm_storage").map(|q| q.text.clone());
    assert!(
        question
            .as_deref()
            .is_some_and(|q| q.contains("above 95 °F")),
        "{question:?}"
    );
}

#[test]
fn a_malformed_placeholder_is_an_error_naming_file_line_and_rule() {
    let dir = tempfile::tempdir().unwrap();
    let shipped = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("rules");
    for entry in std::fs::read_dir(&shipped).unwrap() {
        let path = entry.unwrap().path();
        std::fs::copy(&path, dir.path().join(path.file_name().unwrap())).unwrap();
    }
    let file = dir.path().join("soft_roll.yaml");
    let text = std::fs::read_to_string(&file).unwrap();
    let broken = text.replacen("below {50 kPa}.", "below {50 kPaa}.", 1);
    assert_ne!(broken, text);
    std::fs::write(&file, &broken).unwrap();
    let line = broken
        .lines()
        .position(|l| l.contains("{50 kPaa}"))
        .unwrap()
        + 1;
    let error = RuleBase::load_dir(dir.path()).unwrap_err().to_string();
    assert!(
        error.contains(&format!("soft_roll.yaml:{line}:")),
        "{error}"
    );
    assert!(
        error.contains("rule for cause `tension_too_low`"),
        "{error}"
    );
    assert!(error.contains("`{50 kPaa}` is not a quantity"), "{error}");
}

/// The shipped rules copied into a temporary folder, with telescoping renamed in the plant's own
/// words and a question of the plant's own added.
fn plant_rules() -> tempfile::TempDir {
    let dir = tempfile::tempdir().unwrap();
    let shipped = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("rules");
    for entry in std::fs::read_dir(&shipped).unwrap() {
        let path = entry.unwrap().path();
        std::fs::copy(&path, dir.path().join(path.file_name().unwrap())).unwrap();
    }
    let file = dir.path().join("telescoping.yaml");
    let text = std::fs::read_to_string(&file).unwrap();
    let edited = text
        .replacen(
            "title: Telescoping (layers slid sideways)",
            "title: Coned roll (the plant's word)",
            1,
        )
        .replacen(
            "questions:\n",
            "questions:\n  - id: telescoping.core_clamp\n    text: Was the roll carried with the core clamp?\n",
            1,
        )
        .replacen(
            "      - {indicator: tension_to_usual, below: 0.6, weight: 0.35,",
            "      - {question: telescoping.core_clamp, is: \"yes\", weight: 0.1, says: \"Carried by the core clamp.\"}\n      - {indicator: tension_to_usual, below: 0.6, weight: 0.35,",
            1,
        );
    assert_eq!(edited.matches("core_clamp").count(), 2, "{edited}");
    std::fs::write(&file, edited).unwrap();
    dir
}

#[test]
fn a_rules_folder_names_its_symptoms_and_questions_in_its_own_words() {
    let rules = plant_rules();
    let rules = rules.path().to_str().unwrap();
    let telescoping = case("harbour_newsprint_telescoping.yaml");
    let text = rolltriage_ok(&[
        "diagnose",
        &telescoping,
        "--rules",
        rules,
        "--answer",
        "telescoping.core_clamp=yes",
        "--top",
        "0",
        "--no-what-if",
    ]);
    assert!(
        text.contains(
            "Coned roll (the plant's word): Was the roll carried with the core clamp? yes — Carried by the core clamp."
        ),
        "{text}"
    );
    assert!(
        !text.contains("Telescoping (layers slid sideways)"),
        "{text}"
    );
    assert!(
        !text.contains("core_clamp") && !text.contains("core clamp = yes"),
        "{text}"
    );
    let report = rolltriage_ok(&[
        "report",
        &telescoping,
        "--rules",
        rules,
        "--no-what-if",
        "-o",
        "-",
    ]);
    assert!(report.contains("Coned roll (the plant's word)"), "{report}");
    // Without the folder the shipped words are back.
    let shipped = rolltriage_ok(&["diagnose", &telescoping, "--no-what-if"]);
    assert!(
        shipped.contains("Telescoping (layers slid sideways):"),
        "{shipped}"
    );
}
