//! `rolltriage stress` end to end on the README's demo case: summary table with units, JSON and
//! CSV profiles, atomic --out, bad options.

use std::process::Command;

fn stress(args: &[&str]) -> std::process::Output {
    Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .arg("stress")
        .arg("cases/harbour_newsprint_telescoping.yaml")
        .args(args)
        .output()
        .unwrap()
}

#[test]
fn table_shows_summary_and_zones_in_si_and_us_units() {
    let out = stress(&["--resolution", "grouped:40"]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(text.contains("Pressure on the core"));
    assert!(text.contains("kPa"));
    for zone in ["core", "inner", "middle", "outer", "surface"] {
        assert!(
            text.contains(&format!("\n  {zone} ")),
            "zone {zone} missing:\n{text}"
        );
    }
    let us =
        String::from_utf8(stress(&["--resolution", "grouped:40", "--units", "us"]).stdout).unwrap();
    assert!(us.contains("psi") && us.contains(" in"));
}

#[test]
fn json_and_csv_carry_the_profile() {
    let out = stress(&[
        "--resolution",
        "grouped:40",
        "--format",
        "json",
        "--max-points",
        "50",
    ]);
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let pressure = v["profile"]["pressure"].as_array().unwrap();
    assert!(pressure.len() <= 50 && pressure.len() > 10);
    assert_eq!(pressure.last().unwrap().as_f64().unwrap(), 0.0);
    let core = v["profile"]["summary"]["core_pressure"].as_f64().unwrap();
    assert!(core > 0.0);

    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("profile.csv");
    let out = stress(&[
        "--resolution",
        "grouped:40",
        "--format",
        "csv",
        "--out",
        file.to_str().unwrap(),
    ]);
    assert!(out.status.success());
    assert!(out.stdout.is_empty());
    let csv = std::fs::read_to_string(&file).unwrap();
    assert!(csv.starts_with("radius_mm,build_fraction,zone,pressure_kPa"));
    // The first data row is the core: its pressure equals the JSON core pressure (kPa).
    let first: Vec<&str> = csv.lines().nth(1).unwrap().split(',').collect();
    let p: f64 = first[3].parse().unwrap();
    assert!((p * 1e3 - core).abs() < 1e-4 * core);
}

#[test]
fn bad_options_fail_with_a_message() {
    let out = stress(&["--resolution", "coarse"]);
    // A bad option value is a usage error (exit 2).
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("grouped:K"));
}

#[test]
fn the_roll_weight_is_printed_in_the_table_and_the_json() {
    // The demo case by hand, ρ·π·(R² − r²)·w (hollow cylinder): ρ = 590 kg/m³, ⌀ 1000 mm on a
    // ⌀ 101.6 mm core, 1680 mm wide: 590 · 1.68 · π · (0.25 − 0.0508²) = 991.2 · 0.777291
    // = 770.45 kg; / 0.45359237 kg per lb (NIST SP 811) = 1698.6 lb.
    let text = String::from_utf8(stress(&["--resolution", "grouped:40"]).stdout).unwrap();
    assert!(
        text.contains("Roll weight (web, core left out)         770.5 kg"),
        "{text}"
    );
    let us =
        String::from_utf8(stress(&["--resolution", "grouped:40", "--units", "us"]).stdout).unwrap();
    assert!(
        us.contains("Roll weight (web, core left out)         1699 lb"),
        "{us}"
    );
    let out = stress(&["--resolution", "grouped:40", "--format", "json"]);
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let kg = v["roll_mass"].as_f64().unwrap();
    assert!((kg - 770.45).abs() < 0.01, "{kg}");
}
