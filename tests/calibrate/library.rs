//! Writing fitted materials: the material library file round-trips, and a fit goes into a case's
//! web.radial_stiffness.

use rolltriage::calibrate::{
    FitOptions, MaterialEntry, MaterialLibrary, StackReadOptions, apply_to_case, fit_pfeiffer,
    parse_stack_csv,
};
use rolltriage::case::{Case, QuantityText};

fn demo_fit() -> (
    rolltriage::calibrate::StackTest,
    rolltriage::calibrate::PfeifferFit,
) {
    let file = "cases/calibration/harbour_lwc_60_height.csv";
    let text = std::fs::read_to_string(format!("{}/{file}", env!("CARGO_MANIFEST_DIR"))).unwrap();
    let test = parse_stack_csv(&text, file, &StackReadOptions::default()).unwrap();
    let fit = fit_pfeiffer(&test, &FitOptions::default()).unwrap();
    (test, fit)
}

#[test]
fn library_round_trips_and_replaces_by_id() {
    let (test, fit) = demo_fit();
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("materials.yaml");
    let mut library = MaterialLibrary::load_or_new(&path).unwrap();
    assert!(library.materials.is_empty());
    let entry = MaterialEntry::from_fit("harbour_lwc_60", None, "demo", &fit, test.caliper());
    assert!(!library.upsert(entry.clone()));
    library.save(&path).unwrap();

    let mut again = MaterialLibrary::load_or_new(&path).unwrap();
    assert_eq!(again, library);
    let stored = again.get("harbour_lwc_60").unwrap();
    assert_eq!(stored.radial_stiffness.law, "pfeiffer");
    assert_eq!(stored.caliper.as_deref(), Some("60 um"));
    // K2 stored to 5 significant digits.
    assert!((stored.radial_stiffness.k2.unwrap() / fit.k2 - 1.0).abs() < 1e-4);
    assert!(again.upsert(entry));
    assert_eq!(again.materials.len(), 1);
}

#[test]
fn library_rejects_unknown_format_and_bad_ids() {
    let e = MaterialLibrary::from_yaml_str("format: other\nmaterials: []\n", "lib.yaml")
        .unwrap_err()
        .to_string();
    assert!(
        e.contains("lib.yaml") && e.contains("rolltriage-materials 1"),
        "{e}"
    );
    let e = MaterialLibrary::from_yaml_str(
        "format: rolltriage-materials 1\nmaterials:\n  - id: Bad Id\n    radial_stiffness: {law: pfeiffer}\n",
        "lib.yaml",
    )
    .unwrap_err()
    .to_string();
    assert!(e.contains("Bad Id"), "{e}");
}

#[test]
fn fit_goes_into_the_case_radial_stiffness() {
    let (_, fit) = demo_fit();
    let mut case = Case {
        title: "demo".into(),
        ..Case::default()
    };
    apply_to_case(&mut case, &fit);
    let rs = case.web.radial_stiffness.as_ref().unwrap();
    assert_eq!(rs.law, "pfeiffer");
    let Some(QuantityText::Text(k1)) = &rs.k1 else {
        panic!("k1 must be a quantity with a unit")
    };
    let kpa: f64 = k1.trim_end_matches(" kPa").parse().unwrap();
    assert!((kpa * 1e3 / fit.k1 - 1.0).abs() < 1e-4, "{k1}");
}
