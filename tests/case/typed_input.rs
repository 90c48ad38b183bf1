//! Issue 19, "Command line and files": what users type is accepted and echoed back converted
//! (decimal commas, tension as a web stress or a total force), errors are printed once and
//! name the line of the field.
//!
//! Hand values: 1 psi = 6894.757 Pa and 1 pli = 175.1268 N/m (NIST SP 811, Appendix B);
//! tension per width = stress in the web × caliper, = total force ÷ width (the definition of a
//! force per width).

use std::path::PathBuf;
use std::process::Command;

use rolltriage::case::{Case, ValueOrigin};
use rolltriage::units::{QuantityKind, UnitError, parse_quantity};

fn run(args: &[&str]) -> (Option<i32>, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .args(args)
        .env("NO_COLOR", "1")
        .output()
        .unwrap();
    (
        out.status.code(),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

fn write_case(name: &str, text: &str) -> (tempfile::TempDir, PathBuf) {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join(name);
    std::fs::write(&path, text).unwrap();
    (dir, path)
}

fn close(a: f64, b: f64, rel: f64) -> bool {
    (a - b).abs() <= rel * b.abs()
}

#[test]
fn decimal_commas_are_read_where_unambiguous() {
    let pli = 175.126_8; // N/m per pli, NIST SP 811
    let t = parse_quantity("t", "0,5 pli", QuantityKind::ForcePerWidth).unwrap();
    assert!(close(t, 0.5 * pli, 1e-6), "{t}");
    assert!(close(
        parse_quantity("d", "12,7 mm", QuantityKind::Length).unwrap(),
        0.0127,
        1e-12
    ));
    // After a leading zero three decimals are no thousands group.
    assert!(close(
        parse_quantity("d", "0,076mm", QuantityKind::Length).unwrap(),
        76e-6,
        1e-12
    ));
    assert!(close(
        parse_quantity("f", "1,5e3 N", QuantityKind::Force).unwrap(),
        1500.0,
        1e-12
    ));
    assert!(close(
        parse_quantity("p", "12,5 %", QuantityKind::Percent).unwrap(),
        0.125,
        1e-12
    ));
}

#[test]
fn ambiguous_or_grouped_commas_are_refused_with_both_readings() {
    let error =
        parse_quantity("winding.tension", "1,500 N/m", QuantityKind::ForcePerWidth).unwrap_err();
    assert!(matches!(error, UnitError::AmbiguousComma { .. }), "{error}");
    let message = error.to_string();
    assert!(message.contains("winding.tension"), "{message}");
    assert!(
        message.contains("\"1.500 N/m\"") && message.contains("\"1500 N/m\""),
        "{message}"
    );
    for text in ["1,500,000 N", "1.5,0 N", ",5 N", "5, N"] {
        let error = parse_quantity("f", text, QuantityKind::Force).unwrap_err();
        assert!(
            matches!(error, UnitError::NotANumber { .. }),
            "{text}: {error}"
        );
    }
}

const NEWSPRINT: &str =
    "title: conversions\nweb:\n  preset: newsprint\n  thickness: \"76 um\"\n  width: \"2,5 m\"\n";

fn resolved_tension(winding: &str) -> (f64, String) {
    let text = format!("{NEWSPRINT}winding:\n{winding}");
    let case = Case::from_yaml_str(&text, "t.yaml").unwrap();
    let resolved = case.resolve_in_file("t.yaml", &text).unwrap();
    let note = resolved
        .assumed
        .iter()
        .find(|a| a.field == "winding.tension")
        .map(|a| {
            assert_eq!(a.origin, ValueOrigin::Computed);
            assert!(a.is_conversion());
            format!("{} [{}]", a.value, a.source)
        })
        .unwrap_or_default();
    (resolved.winding.tension.start_tension, note)
}

#[test]
fn tension_as_a_web_stress_is_times_the_caliper() {
    // 1.8 MPa × 76 µm = 136.8 N/m = 0.7811 pli.
    let (t, note) = resolved_tension("  tension: \"1.8 MPa\"\n");
    assert!(close(t, 136.8, 1e-9), "{t}");
    assert!(
        note.contains("136.8 N/m") && note.contains("0.7811 pli"),
        "{note}"
    );
    assert!(note.contains("1.8 MPa") && note.contains("76 µm"), "{note}");
    // 3 psi × 76 µm = 3 × 6894.757 Pa × 76e-6 m = 1.5720 N/m.
    let (t, _) = resolved_tension("  tension: \"3 psi\"\n");
    assert!(close(t, 3.0 * 6894.757 * 76e-6, 1e-6), "{t}");
}

#[test]
fn tension_as_a_total_force_is_over_the_width() {
    // 150 N over 2.5 m = 60 N/m; 100 lbf over 2.5 m = 444.82 / 2.5 = 177.93 N/m.
    let (t, note) = resolved_tension("  tension: \"150 N\"\n");
    assert!(close(t, 60.0, 1e-12), "{t}");
    assert!(note.contains("150 N") && note.contains("2.5 m"), "{note}");
    let (t, _) = resolved_tension("  tension: \"100 lbf\"\n");
    assert!(close(t, 100.0 * 4.448_221_615_260_5 / 2.5, 1e-12), "{t}");
    // Taper steps and upsets take the same forms.
    let text = format!(
        "{NEWSPRINT}winding:\n  tension: \"200 N/m\"\n  taper:\n    kind: steps\n    steps:\n      - from_diameter: \"300 mm\"\n        tension: \"1 MPa\"\n"
    );
    let resolved = Case::from_yaml_str(&text, "t")
        .unwrap()
        .resolve_in_file("t", &text)
        .unwrap();
    match &resolved.winding.tension.taper {
        rolltriage::model::Taper::Steps { steps } => {
            assert!(close(steps[0].tension, 76.0, 1e-9), "{}", steps[0].tension)
        }
        other => panic!("{other:?}"),
    }
}

#[test]
fn a_total_force_needs_a_given_width() {
    let text = "title: t\nweb:\n  preset: newsprint\nwinding:\n  tension: \"150 N\"\n";
    let error = Case::from_yaml_str(text, "t.yaml")
        .unwrap()
        .resolve_in_file("t.yaml", text)
        .unwrap_err()
        .to_string();
    assert!(
        error.contains("winding.tension") && error.contains("web.width"),
        "{error}"
    );
}

#[test]
fn conversions_are_echoed_by_case_check_and_stress() {
    let (_dir, path) = write_case(
        "c.yaml",
        &format!("{NEWSPRINT}winding:\n  tension: \"1,8 MPa\"\n  unwind_tension: \"500 N\"\n"),
    );
    let path = path.to_str().unwrap();
    let (code, out, err) = run(&["case", "check", path]);
    assert_eq!(code, Some(0), "{err}");
    assert!(
        out.contains("winding.tension = 136.8 N/m (0.7811 pli)")
            && out.contains("web stress \"1,8 MPa\" × caliper 76 µm"),
        "{out}"
    );
    assert!(
        out.contains("winding.unwind_tension = 200 N/m") && out.contains("\"500 N\" ÷ width 2.5 m"),
        "{out}"
    );
    let (code, out, err) = run(&["stress", path]);
    assert_eq!(code, Some(0), "{err}");
    assert!(
        out.contains("Converted (as given in the case file):"),
        "{out}"
    );
    assert!(out.contains("winding.tension = 136.8 N/m"), "{out}");
}

#[test]
fn errors_are_printed_once() {
    let (code, _, err) = run(&["calibrate", "stack", "no/such/stack.csv"]);
    assert_eq!(code, Some(1));
    assert_eq!(err.matches("No such file or directory").count(), 1, "{err}");
    for command in ["stress", "diagnose", "taper", "compare"] {
        let (code, _, err) = run(&[command, "no/such/case.yaml"]);
        assert_eq!(code, Some(1), "{command}: {err}");
        assert_eq!(err.matches("No such file").count(), 1, "{command}: {err}");
        assert_eq!(err.lines().count(), 1, "{command}: {err}");
    }
    let (_dir, path) = write_case("u.yaml", "title: t\nweb:\n  thickness: \"76 pli\"\n");
    for command in ["stress", "diagnose", "taper", "case check"] {
        let mut args: Vec<&str> = command.split(' ').collect();
        args.push(path.to_str().unwrap());
        let (code, _, err) = run(&args);
        assert_eq!(code, Some(1), "{command}: {err}");
        assert_eq!(
            err.matches("is a force per width").count(),
            1,
            "{command}: {err}"
        );
        assert_eq!(err.matches("web.thickness").count(), 1, "{command}: {err}");
    }
}

#[test]
fn unit_errors_name_the_line_like_unknown_keys() {
    let (_dir, path) = write_case(
        "u.yaml",
        "title: t\n# the web\nweb:\n  preset: newsprint\n  thickness: \"76 pli\"\n",
    );
    let (code, _, err) = run(&["stress", path.to_str().unwrap()]);
    assert_eq!(code, Some(1));
    assert!(err.contains("u.yaml: line 5: web.thickness"), "{err}");
    let (_dir, path) = write_case(
        "s.yaml",
        "title: t\nsymptoms:\n  - id: telescoping\n    where: middle\n",
    );
    let (_, _, err) = run(&["case", "check", path.to_str().unwrap()]);
    assert!(err.contains("s.yaml: line 4: symptoms[0].where"), "{err}");
    let (_dir, path) = write_case("k.yaml", "title: t\nweb:\n  thikness: \"76 um\"\n");
    let (_, _, err) = run(&["stress", path.to_str().unwrap()]);
    assert!(
        err.contains("k.yaml: line 3, column 3: unknown key"),
        "{err}"
    );
}
