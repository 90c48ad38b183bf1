//! Issue 14, item 5: `calibrate stack --write-case` never writes an invalid case: a fit
//! outside the case file's accepted range is refused with the reason and the file left
//! byte-for-byte as it was; comments survive the edit (or the user must agree to lose them);
//! no number is written with hundreds of digits.

use crate::support::{root, run};
use std::path::{Path, PathBuf};

fn case_copy(dir: &Path, text_edit: impl Fn(String) -> String) -> PathBuf {
    let text =
        std::fs::read_to_string(root().join("cases/harbour_newsprint_telescoping.yaml")).unwrap();
    let path = dir.join("case.yaml");
    std::fs::write(&path, text_edit(text)).unwrap();
    path
}

fn stack(name: &str) -> String {
    root().join(name).display().to_string()
}

#[test]
fn a_fit_outside_the_case_range_is_refused_and_the_file_untouched() {
    let dir = tempfile::tempdir().unwrap();
    let path = case_copy(dir.path(), |t| t);
    let before = std::fs::read(&path).unwrap();
    let csv = stack("tests/hardening/stack_csv/k1_1000_mpa.csv");
    let (code, err) = run(&[
        "calibrate",
        "stack",
        &csv,
        "--write-case",
        path.to_str().unwrap(),
    ]);
    assert_eq!(code, Some(1), "{err}");
    assert!(err.contains("web.radial_stiffness.k1"), "{err}");
    assert!(err.contains("100 MPa"), "{err}");
    assert!(err.contains("left unchanged"), "{err}");
    assert_eq!(std::fs::read(&path).unwrap(), before);
}

#[test]
fn absurd_data_never_reach_the_case() {
    let dir = tempfile::tempdir().unwrap();
    let path = case_copy(dir.path(), |t| t);
    let before = std::fs::read(&path).unwrap();
    for name in ["near_float_limit.csv", "near_zero_pressures.csv"] {
        let csv = stack(&format!("tests/hardening/stack_csv/{name}"));
        let (code, err) = run(&[
            "calibrate",
            "stack",
            &csv,
            "--write-case",
            path.to_str().unwrap(),
        ]);
        assert_eq!(code, Some(1), "{name}: {err}");
        assert_eq!(std::fs::read(&path).unwrap(), before, "{name}");
    }
}

#[test]
fn comments_and_layout_survive_the_edit() {
    let dir = tempfile::tempdir().unwrap();
    let path = case_copy(dir.path(), |t| {
        format!(
            "# Reel 4471, PM2 — my notes\n{}",
            t.replace(
                "friction: 0.45",
                "friction: 0.45  # measured on the incline"
            )
        )
    });
    let csv = stack("cases/calibration/harbour_news_45.csv");
    let (code, err) = run(&[
        "calibrate",
        "stack",
        &csv,
        "--write-case",
        path.to_str().unwrap(),
    ]);
    assert_eq!(code, Some(0), "{err}");
    let text = std::fs::read_to_string(&path).unwrap();
    assert!(text.starts_with("# Reel 4471, PM2 — my notes\n"), "{text}");
    assert!(
        text.contains("friction: 0.45  # measured on the incline"),
        "{text}"
    );
    assert!(
        text.contains("    law: pfeiffer\n    k1: 4.3981 kPa\n    k2: 21.272\n"),
        "{text}"
    );
    // Every other line is as it was.
    let original =
        std::fs::read_to_string(root().join("cases/harbour_newsprint_telescoping.yaml")).unwrap();
    let changed = original
        .lines()
        .zip(text.lines().skip(1))
        .filter(|(a, b)| a != b)
        .count();
    assert_eq!(changed, 3, "{text}");
    // No number with dozens of digits.
    let longest_digits = text
        .split(|c: char| !c.is_ascii_digit())
        .map(str::len)
        .max()
        .unwrap();
    assert!(longest_digits < 20);
    rolltriage::case::Case::load_resolved(&path).unwrap();
}

#[test]
fn a_rewrite_that_would_drop_comments_needs_consent() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("flow.yaml");
    let text =
        "# keep me\ntitle: flow style\nweb: {preset: newsprint}\nsymptoms:\n  - id: telescoping\n";
    std::fs::write(&path, text).unwrap();
    let csv = stack("cases/calibration/harbour_news_45.csv");
    let (code, err) = run(&[
        "calibrate",
        "stack",
        &csv,
        "--write-case",
        path.to_str().unwrap(),
    ]);
    assert_eq!(code, Some(1), "{err}");
    assert!(err.contains("--drop-comments"), "{err}");
    assert_eq!(std::fs::read_to_string(&path).unwrap(), text);
    let (code, err) = run(&[
        "calibrate",
        "stack",
        &csv,
        "--write-case",
        path.to_str().unwrap(),
        "--drop-comments",
    ]);
    assert_eq!(code, Some(0), "{err}");
    assert!(err.contains("comments were not kept"), "{err}");
    let case = rolltriage::case::Case::load_resolved(&path).unwrap();
    assert!(matches!(
        case.web.radial_stiffness,
        rolltriage::model::RadialStiffness::Pfeiffer { .. }
    ));
}
