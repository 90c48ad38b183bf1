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

/// The demo roll with its measured diameter made 800 mm for the same 10 700 m: by the
/// conservation of the web's cross-section (π·(R² − r²) = length × caliper) the roll could not
/// be that small at any plausible tension, so the fit is refused.
fn too_small_roll(dir: &std::path::Path) -> std::path::PathBuf {
    let text = std::fs::read_to_string(format!("{}/{CASE}", env!("CARGO_MANIFEST_DIR"))).unwrap();
    let edited = text.replacen(
        "measurements:\n  diameter: 1000 mm\n",
        "measurements:\n  diameter: 800 mm\n",
        1,
    );
    assert_ne!(edited, text);
    let path = dir.join("too_small.yaml");
    std::fs::write(&path, edited).unwrap();
    path
}

#[test]
fn a_roll_the_fit_cannot_explain_is_reported_as_not_estimated_in_every_format() {
    let dir = tempfile::tempdir().unwrap();
    let case = too_small_roll(dir.path());
    let case = case.to_str().unwrap();
    // 10 700 m × 76 µm = 0.813 m² of web cross-section; ⌀ 800 mm on a ⌀ 101.6 mm core holds
    // π·(0.4² − 0.0508²) = 0.495 m²: 39 % radial compression, far beyond any tension scale
    // the fit allows (the fit's limit is 20 × the settings).
    let write = |extension: &str| {
        let out = dir.path().join(format!("r.{extension}"));
        run(&["report", case, "-o", out.to_str().unwrap(), "--no-what-if"]);
        std::fs::read_to_string(out).unwrap()
    };
    let reason = "tension scale: the measurements ask for a scale beyond 1/20…20 of the settings";
    let markdown = write("md");
    let section = markdown
        .split("### What the roll says about its winding\n")
        .nth(1)
        .unwrap();
    assert!(
        section.contains(&format!("- Not estimated — {reason}")),
        "{section}"
    );
    assert!(!section.contains("the roll says"), "{section}");
    let html = write("html");
    assert!(html.contains("<h3 id=\"estimate\">What the roll says about its winding</h3>"));
    assert!(
        html.contains(&format!("<li>Not estimated — {reason}")),
        "{html}"
    );
    let json: serde_json::Value = serde_json::from_str(&write("json")).unwrap();
    let estimate = &json["measured"]["estimate"];
    assert!(estimate["fit"]["tension_scale"].is_null(), "{estimate}");
    let refused = estimate["fit"]["refused"].as_array().unwrap();
    assert!(
        refused
            .iter()
            .any(|r| r.as_str().unwrap().starts_with(reason)),
        "{estimate}"
    );
    assert!(estimate["lines"].as_array().unwrap().iter().any(|l| {
        l.as_str()
            .unwrap()
            .starts_with(&format!("Not estimated — {reason}"))
    }));
}

#[test]
fn an_estimate_that_cannot_be_made_says_why_in_every_format() {
    use rolltriage::diagnose::rules::RuleBase;
    use rolltriage::report::{Format, PrepareOptions, prepare_from_path, render};
    let rules = RuleBase::embedded().unwrap();
    let options = PrepareOptions {
        date: Some("2026-12-02".into()),
        what_if: false,
        ..PrepareOptions::default()
    };
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join(CASE);
    let input = prepare_from_path(&path, &rules, &options).unwrap();
    // The estimate as the report makes it, with a solver that cannot solve the roll: the
    // error the fit returns is the reason the report gives.
    let measurements = input.resolved.measurements.clone().unwrap();
    let failing = |_: &rolltriage::model::WindingProblem| {
        Err(rolltriage::model::ModelError::NotConverged(
            "the roll could not be solved".into(),
        ))
    };
    let reason = rolltriage::evidence::estimate(
        &measurements,
        &input.resolved.problem(options.solver),
        &failing,
        &rolltriage::evidence::FitOptions::default(),
    )
    .unwrap_err()
    .to_string();
    assert!(reason.contains("the roll could not be solved"), "{reason}");
    let input = input.with_estimate(Some(Err(reason.clone())));
    let markdown = render(&input, Format::Markdown).unwrap();
    assert!(
        markdown.contains(&format!(
            "### What the roll says about its winding\n\n- Not estimated: {reason}\n"
        )),
        "{markdown}"
    );
    let html = render(&input, Format::Html).unwrap();
    let escaped = reason.replace('&', "&amp;").replace('\'', "&#39;");
    assert!(
        html.contains(&format!("<li>Not estimated: {escaped}</li>")),
        "{html}"
    );
    let json: serde_json::Value =
        serde_json::from_str(&render(&input, Format::Json).unwrap()).unwrap();
    let estimate = &json["measured"]["estimate"];
    assert_eq!(estimate["not_estimated"].as_str(), Some(reason.as_str()));
    assert!(estimate.get("fit").is_none(), "{estimate}");
}
