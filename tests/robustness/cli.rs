//! Issue 14, item 10: exit codes as documented (0 ok, 1 bad input, 2 usage). A bad option
//! value is a usage error like an unknown option; units the docs name are accepted, and the
//! documented limits are the ones the code applies.

use crate::support::run;

const CASE: &str = "cases/harbour_newsprint_telescoping.yaml";

#[test]
fn bad_option_values_are_usage_errors() {
    let cases: &[(&[&str], &str)] = &[
        (
            &["stress", CASE, "--resolution", "grouped:0"],
            "--resolution",
        ),
        (&["stress", CASE, "--resolution", "fine"], "--resolution"),
        (&["diagnose", CASE, "--answer", "foo"], "--answer"),
        (&["report", CASE, "-o", "-", "--format", "pdf"], "--format"),
        (&["report", CASE, "-o", "-", "--units", "cgs"], "--units"),
        (
            &["report", CASE, "-o", "-", "--date", "yesterday"],
            "--date",
        ),
        (&["taper", CASE, "--core-share", "5"], "--core-share"),
        (&["taper", CASE, "--core-share", "NaN"], "--core-share"),
        (&["taper", CASE, "--tension-share", "2"], "--tension-share"),
        (
            &["taper", CASE, "--starring-share", "1"],
            "--starring-share",
        ),
        (&["taper", CASE, "--steps", "0"], "--steps"),
        (&["taper", CASE, "--max-taper", "lots"], "--max-taper"),
        (
            &["taper", CASE, "--min-outer-pressure", "14"],
            "--min-outer-pressure",
        ),
        (
            &["calibrate", "stack", "x.csv", "--initial-height", "3 kPa"],
            "--initial-height",
        ),
        (
            &["calibrate", "stack", "x.csv", "--layers", "0"],
            "--layers",
        ),
        (&["train", "--list", "--units", "cgs"], "--units"),
    ];
    for (args, option) in cases {
        let (code, err) = run(args);
        assert_eq!(code, Some(2), "{args:?}: {err}");
        assert!(err.contains(option), "{args:?}: {err}");
    }
}

#[test]
fn the_unit_the_limits_are_stated_in_is_accepted() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(format!("{}/{CASE}", env!("CARGO_MANIFEST_DIR"))).unwrap();
    // docs/case-format.md states web.strength "at most 10 MN/m".
    let good = dir.path().join("mn.yaml");
    std::fs::write(
        &good,
        text.replace("strength: 2.4 kN/m", "strength: 0.0024 MN/m"),
    )
    .unwrap();
    let (code, err) = run(&["case", "check", good.to_str().unwrap()]);
    assert_eq!(code, Some(0), "{err}");
}

#[test]
fn the_documented_tension_cap_is_the_one_applied() {
    // docs/case-format.md: winding.tension "at most 1000 kN/m; below the web strength".
    let docs = std::fs::read_to_string(format!(
        "{}/docs/case-format.md",
        env!("CARGO_MANIFEST_DIR")
    ))
    .unwrap();
    assert!(docs.contains("more than 0 N/m and at most 1000 kN/m; below the web strength"));
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(format!("{}/{CASE}", env!("CARGO_MANIFEST_DIR"))).unwrap();
    let strong = text.replace("strength: 2.4 kN/m", "strength: 10 MN/m");
    let over = dir.path().join("over.yaml");
    std::fs::write(
        &over,
        strong.replace("tension: 0.5 pli", "tension: 1.5 MN/m"),
    )
    .unwrap();
    let (code, err) = run(&["case", "check", over.to_str().unwrap()]);
    assert_eq!(code, Some(1), "{err}");
    assert!(err.contains("winding.tension"), "{err}");
    let under = dir.path().join("under.yaml");
    std::fs::write(
        &under,
        strong.replace("tension: 0.5 pli", "tension: 0.9 MN/m"),
    )
    .unwrap();
    let (code, err) = run(&["case", "check", under.to_str().unwrap()]);
    assert_eq!(code, Some(0), "{err}");
}

#[test]
fn per_layer_on_a_huge_roll_is_refused_with_the_expected_time() {
    // Issue 14 item 9: per-layer cost grows as the square of the wraps (2 M wraps ≈ 10 h).
    let case = "tests/hardening/large_rolls/roll_436k_wraps.yaml";
    let (code, err) = run(&["stress", case, "--resolution", "per-layer"]);
    assert_eq!(code, Some(1), "{err}");
    assert!(err.contains("roll_436k_wraps.yaml"), "{err}");
    assert!(err.contains("436218 wraps"), "{err}");
    assert!(err.contains("would take about"), "{err}");
    assert!(err.contains("300000 wraps"), "{err}");
    assert!(err.contains("grouped:"), "{err}");
}
