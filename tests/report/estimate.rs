//! The inverse estimate of the wound-in tension in reports: the same numbers `rolltriage
//! compare` prints for the same case (one function, the same default fit options), in the
//! report's units, in every format.

use std::process::Command;

const CASE: &str = "cases/harbour_newsprint_soft_measured.yaml";

fn run(args: &[&str]) -> String {
    let output = Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .unwrap();
    assert!(
        output.status.success(),
        "{args:?}: {}",
        String::from_utf8_lossy(&output.stderr)
    );
    String::from_utf8(output.stdout).unwrap()
}

fn report(format: &str, dir: &std::path::Path) -> String {
    let out = dir.join(format!("report.{format}"));
    let path = out.to_str().unwrap();
    run(&[
        "report",
        CASE,
        "-o",
        path,
        "--date",
        "2026-12-02",
        "--no-what-if",
    ]);
    std::fs::read_to_string(&out).unwrap()
}

#[test]
fn report_estimate_equals_the_compare_command() {
    let compare: serde_json::Value =
        serde_json::from_str(&run(&["compare", CASE, "--format", "json"])).unwrap();
    let dir = tempfile::tempdir().unwrap();
    let json: serde_json::Value = serde_json::from_str(&report("json", dir.path())).unwrap();
    let estimate = &json["measured"]["estimate"];
    assert_eq!(estimate["fit"], compare["estimate"]);
    // The demo roll is larger than the model predicts for its length: less tension than set.
    let fit = &estimate["fit"];
    let scale = fit["tension_scale"]["value"].as_f64().unwrap();
    assert!(scale > 0.0 && scale < 1.0, "{scale}");
    assert!(estimate.get("not_estimated").is_none());

    // The words: every line of compare's text section, in the same units, in both documents.
    let text = run(&["compare", CASE]);
    let section = text
        .split("What the roll says about its winding\n")
        .nth(1)
        .unwrap();
    let lines: Vec<&str> = section.lines().map(str::trim).collect();
    assert!(lines[0].starts_with("Wound-in tension: the settings say"));
    let markdown = report("md", dir.path());
    let html = report("html", dir.path());
    assert!(markdown.contains("### What the roll says about its winding"));
    assert!(html.contains("<h3 id=\"estimate\">What the roll says about its winding</h3>"));
    for line in lines {
        assert!(markdown.contains(&format!("- {line}\n")), "{line}");
        // The HTML escapes as the report's writer does (& < > " ').
        let escaped = line
            .replace('&', "&amp;")
            .replace('<', "&lt;")
            .replace('>', "&gt;")
            .replace('"', "&quot;")
            .replace('\'', "&#39;");
        assert!(html.contains(&format!("{escaped}</li>")), "{line}");
    }
}

#[test]
fn report_without_measurements_has_no_estimate() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("r.json");
    run(&[
        "report",
        "cases/harbour_spunlace_dishing.yaml",
        "-o",
        out.to_str().unwrap(),
        "--no-what-if",
    ]);
    let json: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(&out).unwrap()).unwrap();
    assert!(json.get("measured").is_none());
}
