//! `compare --units`: the measured-evidence lines in the unit system the user chose. The
//! conversions themselves are tested in src/units.rs; here the command as a user runs it.
//! Outside reference: 1 in = 25.4 mm exactly (NIST SP 811, appendix B).

use std::process::Command;

use super::common::rolltriage_ok;

fn compare(units: Option<&str>) -> String {
    let case = format!(
        "{}/cases/harbour_newsprint_soft_measured.yaml",
        env!("CARGO_MANIFEST_DIR")
    );
    let mut cmd = Command::new(env!("CARGO_BIN_EXE_rolltriage"));
    cmd.arg("compare").arg(case);
    if let Some(u) = units {
        cmd.args(["--units", u]);
    }
    let out = cmd.output().unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8(out.stdout).unwrap()
}

#[test]
fn us_units_print_inches_feet_psi_and_pli_and_no_si_units() {
    let text = compare(Some("us"));
    // The case's roll was measured at ⌀ 1000 mm: 1000 / 25.4 = 39.37 in.
    assert!(text.contains("wound to ⌀ 39.4 in measured"), "{text}");
    assert!(text.contains(" ft wound"), "{text}");
    assert!(text.contains(" psi"), "{text}");
    assert!(text.contains(" pli at the core"), "{text}");
    for si in [" mm", "kPa", "MPa", " N/m", " m wound"] {
        assert!(!text.contains(si), "{si} in US output:\n{text}");
    }
}

#[test]
fn si_output_is_unchanged_and_the_default() {
    // The snapshot was checked byte for byte against the output from before `--units` existed.
    let text = compare(None);
    assert_eq!(text, compare(Some("si")));
    insta::assert_snapshot!("compare_soft_measured_si", text);
}

const MEASURED: &str = "cases/harbour_newsprint_soft_measured.yaml";

/// The demo case with its measurements typed in inches and feet (1 in = 25.4 mm and
/// 1 ft = 0.3048 m exactly, NIST SP 811 appendix B).
fn typed_in_inches(folder: &std::path::Path) -> std::path::PathBuf {
    let text = std::fs::read_to_string(format!("{}/{MEASURED}", env!("CARGO_MANIFEST_DIR")))
        .unwrap()
        .replace("diameter: 1000 mm", "diameter: 39.37 in")
        .replace("length: 10700 m", "length: 35105 ft")
        .replace("diameter: 1 mm,", "diameter: 0.04 in,")
        .replace("{diameter: 200 mm,", "{diameter: 7.874 in,")
        .replace("{diameter: 400 mm,", "{diameter: 15.75 in,")
        .replace("{diameter: 600 mm,", "{diameter: 23.62 in,")
        .replace("{diameter: 800 mm,", "{diameter: 31.5 in,")
        .replace("{diameter: 950 mm,", "{diameter: 37.4 in,");
    let path = folder.join("typed_in_inches.yaml");
    std::fs::write(&path, text).unwrap();
    path
}

#[test]
fn diagnose_reasons_quote_the_measurement_in_the_chosen_units() {
    let case = format!("{}/{MEASURED}", env!("CARGO_MANIFEST_DIR"));
    let si = rolltriage_ok(&["diagnose", &case]);
    // 1000 mm = 39.37 in; 10700 m / 0.3048 = 35105 ft; 984 mm = 38.7 in.
    assert!(
        si.contains("density deviation = -2.9 (measured ⌀ 1000 mm for 10700 m"),
        "{si}"
    );
    let us = rolltriage_ok(&["diagnose", &case, "--units", "us"]);
    assert!(
        us.contains("density deviation = -2.9 (measured ⌀ 39.4 in for 35105 ft"),
        "{us}"
    );
    assert!(us.contains("computed ⌀ 38.7 in"), "{us}");
    // The reasons and the evidence lines carry no SI length, and the what-if lines no SI
    // pressure (a what-if quotes no length).
    for line in us.lines() {
        for si_unit in [" mm", " m ", " m)", "kPa"] {
            assert!(!line.contains(si_unit), "{si_unit} in US output: {line}");
        }
    }
    // JSON stays SI.
    let json = rolltriage_ok(&["diagnose", &case, "--format", "json"]);
    assert!(
        json.contains("measured ⌀ 1000 mm for 10700 m"),
        "JSON not SI"
    );
}

#[test]
fn a_case_typed_in_inches_and_feet_is_answered_in_inches_and_feet() {
    let folder = tempfile::tempdir().unwrap();
    let case = typed_in_inches(folder.path());
    let case = case.to_str().unwrap();
    let diagnosed = rolltriage_ok(&["diagnose", case]);
    assert!(
        diagnosed.contains("measured ⌀ 39.4 in for 35105 ft"),
        "{diagnosed}"
    );
    assert!(
        diagnosed.contains("Roll size: 35105 ft wound to ⌀ 39.4 in"),
        "{diagnosed}"
    );
    let compared = rolltriage_ok(&["compare", case, "--no-fit"]);
    assert!(compared.contains("Softest at ⌀ 37.4 in"), "{compared}");
    // --units still decides when given.
    let si = rolltriage_ok(&["compare", case, "--no-fit", "--units", "si"]);
    assert!(si.contains("Roll size: 10700 m wound to ⌀ 1000 mm"), "{si}");
    // The report follows the typed units too (Markdown, reasons and the measured section).
    let report = folder.path().join("report.md");
    rolltriage_ok(&[
        "report",
        case,
        "-o",
        report.to_str().unwrap(),
        "--no-what-if",
    ]);
    let text = std::fs::read_to_string(&report).unwrap();
    assert!(text.contains("⌀ 39.4 in for 35105 ft"), "{text}");
    assert!(!text.contains("⌀ 1000 mm"), "{text}");
}

/// Each conversion of the evidence texts, against NIST SP 811 appendix B factors:
/// 1 in = 0.0254 m, 1 ft = 0.3048 m, 1 psi = 6894.757 Pa.
#[test]
fn evidence_details_convert_each_quantity() {
    use rolltriage::evidence::{CoreBoreComparison, DensityComparison, Evidence};
    use rolltriage::units::UnitSystem;
    let evidence = Evidence {
        density: Some(DensityComparison {
            length: 3048.0,            // 10000 ft
            measured_diameter: 1.016,  // 40 in
            computed_diameter: 0.9906, // 39 in
            measured_compression: 0.05,
            computed_compression: 0.07,
            compression_uncertainty: 0.01,
            density_ratio: 0.979,
            measured_density: None,
            computed_density: None,
            solved_diameter: 1.016,
        }),
        core_bore: Some(CoreBoreComparison {
            measured: 0.000_508,       // 0.02 in
            computed: Some(0.000_254), // 0.01 in
            core_pressure: 689_475.7,  // 100 psi
            ratio: Some(2.0),
        }),
        ..Evidence::default()
    };
    let detail = |units| {
        evidence
            .indicators_in(units)
            .into_iter()
            .map(|i| i.detail)
            .collect::<Vec<_>>()
            .join(" | ")
    };
    let us = detail(UnitSystem::Us);
    for said in [
        "⌀ 40 in for 10000 ft",
        "⌀ 39 in",
        "0.02 in measured",
        "0.01 in computed",
        "100 psi",
    ] {
        assert!(us.contains(said), "{said} missing: {us}");
    }
    let si = detail(UnitSystem::Si);
    for said in [
        "⌀ 1016 mm for 3048 m",
        "⌀ 991 mm",
        "0.51 mm measured",
        "0.25 mm computed",
        "689 kPa",
    ] {
        assert!(si.contains(said), "{said} missing: {si}");
    }
    // A reason quoting the SI detail reads in US units after `localise`; other text stays.
    let reason = format!("0.979 ({})", evidence.indicators()[0].detail);
    let local = evidence.localise(&reason, UnitSystem::Us);
    assert!(
        local.starts_with("0.979 (measured ⌀ 40 in for 10000 ft"),
        "{local}"
    );
    assert_eq!(evidence.localise(&reason, UnitSystem::Si), reason);
    assert_eq!(evidence.localise("no detail", UnitSystem::Us), "no detail");
}

/// A reason whose value and rule threshold are pressures follows `--units us` (1 psi =
/// 6894.757 Pa, NIST SP 811 Appendix B): 39.8 kPa → 5.77 psi, 50 kPa → 7.25 psi; SI stays kPa.
#[test]
fn diagnose_pressure_reasons_follow_the_units() {
    let case = format!(
        "{}/cases/harbour_spunbond_soft_roll.yaml",
        env!("CARGO_MANIFEST_DIR")
    );
    let si = rolltriage_ok(&["diagnose", &case]);
    assert!(
        si.contains("mean pressure (middle zone) = 39.8 kPa (rule: below 50 kPa)"),
        "{si}"
    );
    let us = rolltriage_ok(&["diagnose", &case, "--units", "us"]);
    assert!(
        us.contains("mean pressure (middle zone) = 5.77 psi (rule: below 7.25 psi)"),
        "{us}"
    );
}
