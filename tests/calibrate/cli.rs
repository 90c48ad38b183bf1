//! `rolltriage calibrate stack` end to end: the report, JSON, writing into a case and a library,
//! and exit codes on bad data.

use std::process::Command;

use rolltriage::case::Case;
use rolltriage::model::RadialStiffness;

fn bin() -> Command {
    let mut c = Command::new(env!("CARGO_BIN_EXE_rolltriage"));
    c.current_dir(env!("CARGO_MANIFEST_DIR"));
    c
}

#[test]
fn the_report_lists_parameters_warnings_and_residuals() {
    let out = bin()
        .args([
            "calibrate",
            "stack",
            "cases/calibration/harbour_news_45.csv",
        ])
        .output()
        .unwrap();
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).unwrap();
    insta::assert_snapshot!("calibrate_news_45_report", text);
}

#[test]
fn json_output_carries_the_fit() {
    let out = bin()
        .args([
            "calibrate",
            "stack",
            "cases/calibration/harbour_bopp_25.csv",
            "--json",
        ])
        .output()
        .unwrap();
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    // SciPy's curve_fit on the same file, relative weighting (tests/reference/curve_fit_pfeiffer.json).
    let k1 = v["fit"]["k1"].as_f64().unwrap();
    assert!((k1 / 18_932.937_428_419_5 - 1.0).abs() < 1e-3, "{k1}");
    assert_eq!(v["fit"]["points"].as_array().unwrap().len(), 14);
    // 400 layers given, no initial height: no caliper.
    assert!(v["caliper_m"].is_null());
}

#[test]
fn write_case_and_library_round_trip() {
    let dir = tempfile::tempdir().unwrap();
    let case_path = dir.path().join("case.yaml");
    std::fs::copy(
        format!(
            "{}/cases/harbour_coated_crushed_core.yaml",
            env!("CARGO_MANIFEST_DIR")
        ),
        &case_path,
    )
    .unwrap();
    let library = dir.path().join("materials.yaml");
    let out = bin()
        .args([
            "calibrate",
            "stack",
            "cases/calibration/harbour_lwc_60_height.csv",
        ])
        .arg("--write-case")
        .arg(&case_path)
        .arg("--write-library")
        .arg(&library)
        .args(["--material-id", "harbour_lwc_60"])
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    // 60 µm stack caliper against the case's 55 µm: within 10 %, no warning.
    assert!(!String::from_utf8_lossy(&out.stderr).contains("differs"));
    let resolved = Case::load(&case_path).unwrap().resolve().unwrap();
    let RadialStiffness::Pfeiffer { k1, k2 } = resolved.web.radial_stiffness else {
        panic!("pfeiffer expected")
    };
    // SciPy, relative weighting: K1 = 9016.53 Pa, K2 = 27.9277 (5 significant digits stored).
    assert!((k1 / 9_016.532_649_992_196 - 1.0).abs() < 1e-4, "{k1}");
    assert!((k2 / 27.927_720_936_243_645 - 1.0).abs() < 1e-4, "{k2}");
    let lib = rolltriage::calibrate::MaterialLibrary::load_or_new(&library).unwrap();
    assert_eq!(lib.materials.len(), 1);
}

#[test]
fn bad_data_exit_1_with_line_and_column() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("bad.csv");
    std::fs::write(&path, "strain,pressure [kPa]\n0.01,1\n0.02,NaN\n").unwrap();
    let out = bin()
        .args(["calibrate", "stack"])
        .arg(&path)
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8(out.stderr).unwrap();
    assert!(err.contains("line 3, column 2"), "{err}");
}

#[test]
fn library_needs_a_material_id() {
    let out = bin()
        .args([
            "calibrate",
            "stack",
            "cases/calibration/harbour_bopp_25.csv",
            "--write-library",
            "x.yaml",
        ])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
}
