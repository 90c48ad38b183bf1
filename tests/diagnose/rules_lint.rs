//! The shipped rule base loads, lints clean and covers the vocabulary; broken rule files are
//! reported with file, line and the closest valid name.

use rolltriage::diagnose::rules::RuleBase;
use rolltriage::vocabulary::{CAUSE_IDS, SYMPTOM_IDS};

fn shipped_files() -> Vec<(String, String)> {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("rules");
    let mut out: Vec<(String, String)> = std::fs::read_dir(&dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.extension().is_some_and(|x| x == "yaml"))
        .map(|p| {
            (
                format!("rules/{}", p.file_name().unwrap().to_string_lossy()),
                std::fs::read_to_string(&p).unwrap(),
            )
        })
        .collect();
    out.sort();
    out
}

fn replace(files: &[(String, String)], name: &str, from: &str, to: &str) -> Vec<(String, String)> {
    files
        .iter()
        .map(|(f, t)| {
            if f.ends_with(name) {
                assert!(t.contains(from), "{from} not in {name}");
                (f.clone(), t.replacen(from, to, 1))
            } else {
                (f.clone(), t.clone())
            }
        })
        .collect()
}

fn error_of(files: &[(String, String)]) -> String {
    match RuleBase::from_files(files) {
        Ok(_) => panic!("expected a rule error"),
        Err(e) => e.to_string(),
    }
}

#[test]
fn shipped_rules_load_and_lint_clean() {
    let base = RuleBase::embedded().unwrap();
    assert_eq!(base.lint(), Vec::<String>::new());
    // The directory on disk is the same rule base as the embedded one.
    let disk = RuleBase::load_dir(&std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("rules"))
        .unwrap();
    assert_eq!(disk.symptoms.len(), base.symptoms.len());
    assert_eq!(disk.remedies.len(), base.remedies.len());
}

#[test]
fn every_symptom_and_cause_of_the_vocabulary_is_covered() {
    let base = RuleBase::embedded().unwrap();
    for id in SYMPTOM_IDS {
        let s = base
            .symptom(id)
            .unwrap_or_else(|| panic!("no rules for {id}"));
        assert!(!s.title.is_empty() && !s.description.is_empty());
        assert!(s.aliases.len() >= 3, "{id} needs aliases for search");
        assert!(!s.places.is_empty(), "{id} needs places");
        assert!(!s.questions.is_empty(), "{id} needs questions");
        assert!(
            s.rules.len() >= 3,
            "{id} should tell at least three causes apart"
        );
        assert!(!s.sources.is_empty(), "{id} must cite sources");
    }
    for id in CAUSE_IDS {
        let c = &base.causes[id];
        assert!(
            !c.title.is_empty() && c.mechanism.len() > 40,
            "{id} needs a mechanism"
        );
        let reachable = base
            .symptoms
            .iter()
            .any(|s| s.rules.iter().any(|r| r.cause == id));
        assert!(reachable, "cause {id} unreachable");
    }
}

#[test]
fn every_remedy_is_referenced_and_every_caution_used() {
    let base = RuleBase::embedded().unwrap();
    for id in base.remedies.keys() {
        let used = base
            .symptoms
            .iter()
            .flat_map(|s| s.rules.iter())
            .any(|r| r.remedies.contains(id))
            || base.causes.values().any(|c| c.remedies.contains(id));
        assert!(used, "remedy {id} never referenced");
    }
    for id in base.cautions.keys() {
        assert!(
            base.remedies.values().any(|r| r.cautions.contains(id)),
            "caution {id} unused"
        );
        // Every caution defers to local rules and lockout/tagout practice.
        assert!(
            base.cautions[id].text.contains("lockout/tagout"),
            "caution {id}"
        );
    }
    // Remedies that change a winder setting touching running equipment carry a caution.
    for r in base.remedies.values() {
        if r.group == "equipment" {
            assert!(
                !r.cautions.is_empty(),
                "equipment remedy {} needs a caution",
                r.id
            );
        }
    }
}

#[test]
fn unknown_key_reports_file_line_and_closest_name() {
    let files = shipped_files();
    let broken = replace(
        &files,
        "starring.yaml",
        "    prior: 0.3\n",
        "    prior: 0.3\n    evidense: []\n",
    );
    let message = error_of(&broken);
    assert!(message.contains("rules/starring.yaml:"), "{message}");
    assert!(message.contains("evidense"), "{message}");
    assert!(message.contains("did you mean `evidence`"), "{message}");
}

#[test]
fn unknown_cause_indicator_zone_and_remedy_are_named_with_suggestions() {
    let files = shipped_files();
    let m = error_of(&replace(
        &files,
        "crushed_core.yaml",
        "cause: core_too_weak",
        "cause: core_too_wek",
    ));
    assert!(
        m.contains("crushed_core.yaml:") && m.contains("core_too_weak"),
        "{m}"
    );
    let m = error_of(&replace(
        &files,
        "crushed_core.yaml",
        "indicator: core_pressure_ratio",
        "indicator: core_presure_ratio",
    ));
    assert!(
        m.contains("unknown indicator `core_presure_ratio`")
            && m.contains("did you mean `core_pressure_ratio`"),
        "{m}"
    );
    let m = error_of(&replace(
        &files,
        "soft_roll.yaml",
        "zone: middle",
        "zone: midle",
    ));
    assert!(
        m.contains("unknown zone `midle`") && m.contains("middle"),
        "{m}"
    );
    let m = error_of(&replace(
        &files,
        "starring.yaml",
        "remedies: [add_taper]",
        "remedies: [add_tapper]",
    ));
    assert!(
        m.contains("remedy `add_tapper`") && m.contains("did you mean `add_taper`"),
        "{m}"
    );
}

#[test]
fn weights_and_priors_out_of_range_are_errors_with_line() {
    let files = shipped_files();
    let m = error_of(&replace(
        &files,
        "bursts.yaml",
        "weight: 0.5,",
        "weight: 1.5,",
    ));
    assert!(
        m.contains("bursts.yaml:") && m.contains("out of range"),
        "{m}"
    );
    let m = error_of(&replace(&files, "bursts.yaml", "prior: 0.3", "prior: 1.3"));
    assert!(m.contains("prior 1.3 is out of range"), "{m}");
    // The line points at the offending prior, not at the top of the file.
    let line: usize = m
        .split("bursts.yaml:")
        .nth(1)
        .and_then(|r| r.split(':').next())
        .and_then(|n| n.parse().ok())
        .unwrap();
    let text = &files
        .iter()
        .find(|(f, _)| f.ends_with("bursts.yaml"))
        .unwrap()
        .1;
    let expected = text.lines().position(|l| l.contains("prior: 0.3")).unwrap() + 1;
    assert_eq!(line, expected);
}

#[test]
fn threshold_units_must_fit_the_indicator() {
    let files = shipped_files();
    let m = error_of(&replace(
        &files,
        "blocking.yaml",
        "above: \"1 MPa\"",
        "above: \"1 pli\"",
    ));
    assert!(m.contains("pli") && m.contains("accepted"), "{m}");
}

#[test]
fn missing_catalogue_and_unknown_caution_are_errors() {
    let files: Vec<_> = shipped_files()
        .into_iter()
        .filter(|(f, _)| !f.ends_with("cautions.yaml"))
        .collect();
    let m = error_of(&files);
    assert!(m.contains("cautions.yaml"), "{m}");
    let m = error_of(&replace(
        &shipped_files(),
        "remedies.yaml",
        "cautions: [hot_surfaces]",
        "cautions: [hot_surface]",
    ));
    assert!(
        m.contains("caution `hot_surface`") && m.contains("did you mean `hot_surfaces`"),
        "{m}"
    );
}

#[test]
fn unknown_scope_is_an_error_with_the_closest_word() {
    let files = shipped_files();
    let m = error_of(&replace(
        &files,
        "crushed_core.yaml",
        "scope: symptom",
        "scope: symptoms",
    ));
    assert!(
        m.contains("crushed_core.yaml:")
            && m.contains("unknown scope `symptoms`")
            && m.contains("did you mean `symptom`"),
        "{m}"
    );
}
