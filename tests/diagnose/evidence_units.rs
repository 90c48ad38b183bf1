//! `compare --units`: the measured-evidence lines in the unit system the user chose. The
//! conversions themselves are tested in src/units.rs; here the command as a user runs it.
//! Outside reference: 1 in = 25.4 mm exactly (NIST SP 811, appendix B).

use std::process::Command;

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
    // The case's roll was measured at Ø 1000 mm: 1000 / 25.4 = 39.37 in.
    assert!(text.contains("wound to Ø 39.4 in measured"), "{text}");
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
