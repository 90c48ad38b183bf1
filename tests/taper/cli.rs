//! `rolltriage taper` end to end: a demo case whose schedule already meets every limit (the
//! design keeps it, so the run is quick), one the diagnosis blames for telescoping, the operator
//! table in SI and trade units, exit codes.

use std::process::Command;

fn bin() -> Command {
    let mut c = Command::new(env!("CARGO_BIN_EXE_rolltriage"));
    c.current_dir(env!("CARGO_MANIFEST_DIR"));
    c
}

#[test]
fn a_schedule_that_meets_every_limit_is_kept_and_tabled() {
    let out = bin()
        .args([
            "taper",
            "cases/harbour_newsprint_out_of_round.yaml",
            "--json",
        ])
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["feasible"], true);
    assert_eq!(v["solves"], 1);
    // The case winds 1.6 pli with a 20 % linear taper: 1.6 lbf/in = 280.20 N/m (NIST SP 811).
    let t0 = v["start_tension_n_per_m"].as_f64().unwrap();
    assert!((t0 - 280.203).abs() < 0.01, "{t0}");
    assert!((v["taper_fraction"].as_f64().unwrap() - 0.2).abs() < 1e-12);
    let table = v["table"].as_array().unwrap();
    assert_eq!(table.len(), 11);
    // From the 101.6 mm core to the 1250 mm roll; 80 % of the start tension at the outside.
    assert!((table[0]["diameter"].as_f64().unwrap() - 0.1016).abs() < 1e-9);
    assert!((table[10]["diameter"].as_f64().unwrap() - 1.25).abs() < 1e-9);
    assert!((table[10]["tension"].as_f64().unwrap() - 0.8 * t0).abs() < 1e-6);
}

/// The newsprint telescoping demo: the diagnosis blames its low tension (telescoping margin
/// below 1), and taper design no longer keeps that schedule (issue: one criterion everywhere).
#[test]
fn the_schedule_the_diagnosis_blames_for_telescoping_is_not_kept() {
    let out = bin()
        .args([
            "taper",
            "cases/harbour_newsprint_telescoping.yaml",
            "--json",
        ])
        .output()
        .unwrap();
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let before = v["before"].as_array().unwrap();
    let telescoping = before.iter().find(|c| c["limit"] == "telescoping").unwrap();
    assert_eq!(telescoping["met"], false);
    assert!(telescoping["value"].as_f64().unwrap() < 1.0);
    // 0.5 pli = 87.56 N/m is not kept: the design winds tighter.
    assert!(v["start_tension_n_per_m"].as_f64().unwrap() > 87.6);
}

#[test]
fn the_text_output_shows_both_unit_systems_and_the_caution() {
    let out = bin()
        .args([
            "taper",
            "cases/harbour_newsprint_telescoping.yaml",
            "--units",
            "us",
        ])
        .output()
        .unwrap();
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(text.contains("diam mm") && text.contains("pli") && text.contains("N/m"));
    assert!(text.contains("psi"), "{text}");
    assert!(text.contains("lockout/tagout"));
}

#[test]
fn bad_options_are_refused() {
    let out = bin()
        .args([
            "taper",
            "cases/harbour_newsprint_telescoping.yaml",
            "--core-share",
            "0",
        ])
        .output()
        .unwrap();
    // A bad option value is a usage error (exit 2), like an unknown option.
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("--core-share"));
    let out = bin()
        .args([
            "taper",
            "cases/harbour_newsprint_telescoping.yaml",
            "--min-telescoping-margin",
            "0",
        ])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("--min-telescoping-margin"));
}

#[test]
fn json_carries_before_and_after_profiles_for_plots() {
    let out = bin()
        .args([
            "taper",
            "cases/harbour_newsprint_telescoping.yaml",
            "--json",
        ])
        .output()
        .unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    for key in ["before_profile", "after_profile"] {
        let r = v[key]["radius_m"].as_array().unwrap();
        assert!(r.len() >= 2 && r.len() <= 200, "{key} {}", r.len());
        assert_eq!(r.len(), v[key]["pressure_pa"].as_array().unwrap().len());
    }
}

/// Issue 19: `--core-share 80` is refused with a message that says 0.8 means 80 % and how to
/// write it; "80 %" and 0.8 are the same setting. Exit 2 like any bad option value.
#[test]
fn core_share_takes_a_fraction_or_a_percentage() {
    let out = bin()
        .args([
            "taper",
            "cases/harbour_newsprint_out_of_round.yaml",
            "--core-share",
            "80",
        ])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("as a fraction it is 8000 %")
            && err.contains("\"80 %\"")
            && err.contains("0.8")
            && err.contains("0.8 means 80 %"),
        "{err}"
    );
    let json = |share: &str| -> serde_json::Value {
        let out = bin()
            .args([
                "taper",
                "cases/harbour_newsprint_out_of_round.yaml",
                "--json",
                "--core-share",
                share,
            ])
            .output()
            .unwrap();
        assert!(
            out.status.success(),
            "{share}: {}",
            String::from_utf8_lossy(&out.stderr)
        );
        serde_json::from_slice(&out.stdout).unwrap()
    };
    let (percent, fraction) = (json("80 %"), json("0.8"));
    assert_eq!(fraction["limits"]["core_share"], 0.8, "{fraction}");
    assert_eq!(percent, fraction);
    assert_eq!(json("80%"), fraction);
}
