//! Issue 14 leftovers: rule files and material libraries have the case files' 1 MiB cap and
//! refuse pipes; `calibrate stack --write-library` range-checks what it writes and what it reads
//! with the ranges of a case file's `web.radial_stiffness` and `web.thickness`.

use crate::support::{root, run};
use std::path::{Path, PathBuf};
use std::process::Command;

use rolltriage::calibrate::MaterialLibrary;
use rolltriage::diagnose::rules::RuleBase;

/// A copy of the shipped rule directory in `dir`.
fn rules_copy(dir: &Path) -> PathBuf {
    let rules = dir.join("rules");
    std::fs::create_dir(&rules).unwrap();
    for entry in std::fs::read_dir(root().join("rules")).unwrap() {
        let path = entry.unwrap().path();
        if rolltriage::fsutil::is_yaml(&path) {
            std::fs::copy(&path, rules.join(path.file_name().unwrap())).unwrap();
        }
    }
    rules
}

#[test]
fn a_rule_file_over_1_mib_is_refused_naming_the_file() {
    let dir = tempfile::tempdir().unwrap();
    let rules = rules_copy(dir.path());
    assert!(
        RuleBase::load_dir(&rules).is_ok(),
        "the copy loads as shipped"
    );
    let file = rules.join("starring.yaml");
    let text = std::fs::read_to_string(&file).unwrap();
    crate::support::write_past_the_size_limit(&file, &text);
    let message = RuleBase::load_dir(&rules).unwrap_err().to_string();
    assert!(message.contains("starring.yaml"), "{message}");
    assert!(message.contains("rule file"), "{message}");
    assert!(message.contains("1 MiB"), "{message}");
    // The command line says the same and exits 1.
    let (code, err) = run(&["rules", "check", rules.to_str().unwrap()]);
    assert_eq!(code, Some(1), "{err}");
    assert!(
        err.contains("starring.yaml") && err.contains("1 MiB"),
        "{err}"
    );
}

#[cfg(unix)]
#[test]
fn a_pipe_in_the_rule_folder_is_refused_not_waited_on() {
    let dir = tempfile::tempdir().unwrap();
    let rules = rules_copy(dir.path());
    let fifo = rules.join("zz_pipe.yaml");
    if !Command::new("mkfifo")
        .arg(&fifo)
        .status()
        .is_ok_and(|s| s.success())
    {
        return;
    }
    let message = RuleBase::load_dir(&rules).unwrap_err().to_string();
    assert!(message.contains("zz_pipe.yaml"), "{message}");
    assert!(message.contains("not a regular file"), "{message}");
}

const GOOD_ENTRY: &str = "  - id: harbour_news
    radial_stiffness: {law: pfeiffer, k1: 8.1 kPa, k2: 38.2}
    caliper: 70 um
";

#[test]
fn a_library_entry_outside_the_case_range_is_refused_on_read() {
    // K1 of 5 GPa: the case file accepts at most 100 MPa (docs/case-format.md).
    let text = format!(
        "format: rolltriage-materials 1\nmaterials:\n{GOOD_ENTRY}  - id: too_stiff\n    radial_stiffness: {{law: pfeiffer, k1: 5 GPa, k2: 38.2}}\n"
    );
    let message = MaterialLibrary::from_yaml_str(&text, "lib.yaml")
        .unwrap_err()
        .to_string();
    assert!(message.contains("lib.yaml"), "{message}");
    assert!(message.contains("materials[1] (too_stiff)"), "{message}");
    assert!(message.contains("web.radial_stiffness.k1"), "{message}");
    assert!(message.contains("100 MPa"), "{message}");
    // A caliper the case file would refuse (a metre), and a fit record with a NaN R².
    for (bad, field) in [
        (GOOD_ENTRY.replace("70 um", "1 m"), "web.thickness"),
        (
            format!(
                "{GOOD_ENTRY}    fit: {{source: s.csv, points: 9, r_squared: .nan, k1_standard_error: 1 kPa, k2_standard_error: 0.1, weighting: relative, max_measured_pressure: 1 MPa}}\n"
            ),
            "fit.r_squared",
        ),
    ] {
        let text = format!("format: rolltriage-materials 1\nmaterials:\n{bad}");
        let message = MaterialLibrary::from_yaml_str(&text, "lib.yaml")
            .unwrap_err()
            .to_string();
        assert!(message.contains(field), "{field}: {message}");
    }
    let good = format!("format: rolltriage-materials 1\nmaterials:\n{GOOD_ENTRY}");
    assert!(MaterialLibrary::from_yaml_str(&good, "lib.yaml").is_ok());
}

#[test]
fn write_library_refuses_a_fit_outside_the_case_range_and_keeps_the_file() {
    // The stack tested in MPa with P = 1000·(e^(10ε) − 1) fits K1 = 1,000 MPa (issue 14, item 5):
    // what --write-case refuses, --write-library refuses too.
    let dir = tempfile::tempdir().unwrap();
    let library = dir.path().join("materials.yaml");
    std::fs::write(
        &library,
        format!("format: rolltriage-materials 1\nmaterials:\n{GOOD_ENTRY}"),
    )
    .unwrap();
    let before = std::fs::read(&library).unwrap();
    let csv = root().join("tests/hardening/stack_csv/k1_1000_mpa.csv");
    let (code, err) = run(&[
        "calibrate",
        "stack",
        csv.to_str().unwrap(),
        "--write-library",
        library.to_str().unwrap(),
        "--material-id",
        "too_stiff",
    ]);
    assert_eq!(code, Some(1), "{err}");
    assert!(err.contains("materials.yaml"), "{err}");
    assert!(err.contains("web.radial_stiffness.k1"), "{err}");
    assert!(err.contains("100 MPa"), "{err}");
    assert!(err.contains("left unchanged"), "{err}");
    assert_eq!(std::fs::read(&library).unwrap(), before);
}
