//! Case files: parse, resolve against presets, validate, save atomically.

use std::path::{Path, PathBuf};

use approx::assert_relative_eq;
use rolltriage::case::{Case, CaseError};
use rolltriage::model::{CoreStiffness, RadialStiffness, Taper, WindingMethod};

fn fixture(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests/fixtures")
        .join(name)
}

fn parse(text: &str) -> Result<Case, CaseError> {
    Case::from_yaml_str(text, "test.yaml")
}

fn resolve(text: &str) -> Result<rolltriage::case::ResolvedCase, CaseError> {
    parse(text)?.resolve_as("test.yaml")
}

#[test]
fn complete_case_resolves_without_assumptions() {
    let resolved = Case::load_resolved(&fixture("complete_newsprint.yaml")).unwrap();
    // Nothing left out; values equal to the named preset's are kept as preset copies and the
    // wound length computed from the diameter is marked computed (issue 19: provenance).
    assert!(
        resolved.assumed.iter().all(|a| !a.is_default()),
        "{:#?}",
        resolved.assumed
    );
    assert_relative_eq!(resolved.web.thickness, 76e-6, max_relative = 1e-12);
    assert_relative_eq!(resolved.web.width, 1.6);
    assert_eq!(
        resolved.web.radial_stiffness,
        RadialStiffness::Pfeiffer { k1: 5e3, k2: 50.0 }
    );
    // 1 pli = 175.1268 N/m (NIST SP 811).
    assert_relative_eq!(
        resolved.winding.tension.start_tension,
        1.5 * 175.1268,
        max_relative = 1e-6
    );
    assert_eq!(
        resolved.winding.tension.taper,
        Taper::Linear { fraction: 0.25 }
    );
    assert_eq!(resolved.winding.method, WindingMethod::CentreSurface);
    assert_relative_eq!(resolved.winding.speed, 25.0, max_relative = 1e-12);
    assert_eq!(resolved.winding.temperature, Some(35.0));
    // Upset diameters become radii.
    let upset = resolved.winding.tension.upsets[0];
    assert_relative_eq!(upset.from_radius, 0.3, max_relative = 1e-12);
    assert_relative_eq!(upset.to_radius, 0.31, max_relative = 1e-12);
    assert_relative_eq!(upset.tension, 3.0 * 175.1268, max_relative = 1e-6);
    match resolved.core.stiffness {
        CoreStiffness::Hollow {
            inner_radius,
            outer_radius,
            modulus,
            poisson_ratio,
        } => {
            assert_relative_eq!(inner_radius, 0.0381, max_relative = 1e-12);
            assert_relative_eq!(outer_radius, 0.0508, max_relative = 1e-12);
            assert_relative_eq!(modulus, 2e9);
            assert_relative_eq!(poisson_ratio, 0.3);
        }
        other => panic!("expected a hollow core, got {other:?}"),
    }
    // Length of an ideal stack, L = π(R² − rc²)/h.
    let expected = std::f64::consts::PI * (0.5f64.powi(2) - 0.0508f64.powi(2)) / 76e-6;
    assert_relative_eq!(resolved.roll.length, expected, max_relative = 1e-12);
}

#[test]
fn minimal_case_takes_everything_from_presets_and_says_so() {
    let resolved = Case::load_resolved(&fixture("minimal.yaml")).unwrap();
    let fields: Vec<&str> = resolved.assumed.iter().map(|a| a.field.as_str()).collect();
    for field in [
        "web.preset",
        "web.thickness",
        "web.tangential_modulus",
        "web.radial_stiffness.k1",
        "web.radial_stiffness.k2",
        "web.friction",
        "web.roughness",
        "web.strength",
        "core.preset",
        "core.inside_diameter",
        "core.outside_diameter",
        "core.modulus",
        "core.crush_pressure",
        "roll.diameter",
        "roll.length",
        "winding.method",
        "winding.tension",
        "winding.taper.kind",
        "winding.nip_load",
        "winding.speed",
    ] {
        assert!(fields.contains(&field), "{field} missing from {fields:?}");
    }
    for assumed in &resolved.assumed {
        assert!(!assumed.source.is_empty(), "{assumed:?}");
        assert!(!assumed.value.is_empty(), "{assumed:?}");
    }
    // The defaults: newsprint on a 3 in paper core.
    assert_eq!(resolved.web.preset.as_deref(), Some("newsprint"));
    assert_eq!(resolved.core.preset.as_deref(), Some("paper_3in"));
    let tension = resolved
        .assumed
        .iter()
        .find(|a| a.field == "winding.tension")
        .unwrap();
    assert!(tension.source.contains("preset newsprint"), "{tension:?}");
}

#[test]
fn length_gives_diameter_and_steps_become_radii() {
    let resolved = Case::load_resolved(&fixture("film_us_units.yaml")).unwrap();
    let h = 0.92 * 25.4e-6;
    let rc = 3.5 * 0.0254;
    let length = 30000.0 * 0.3048;
    // R = √(rc² + L·h/π), the inverse of L = π(R² − rc²)/h.
    let radius = (rc * rc + length * h / std::f64::consts::PI).sqrt();
    assert_relative_eq!(
        resolved.roll.outer_diameter,
        2.0 * radius,
        max_relative = 1e-12
    );
    assert_relative_eq!(resolved.roll.length, length, max_relative = 1e-12);
    match &resolved.winding.tension.taper {
        Taper::Steps { steps } => {
            assert_eq!(steps.len(), 2);
            assert_relative_eq!(steps[0].radius, 6.0 * 0.0254, max_relative = 1e-12);
            assert_relative_eq!(steps[1].tension, 0.5 * 175.1268, max_relative = 1e-6);
        }
        other => panic!("expected steps, got {other:?}"),
    }
    assert_relative_eq!(
        resolved.winding.speed,
        1200.0 * 0.00508,
        max_relative = 1e-12
    );
    assert!(resolved.assumed.iter().any(|a| a.field == "roll.diameter"));
}

#[test]
fn plain_numbers_are_si_and_rigid_core_is_rigid() {
    let resolved = Case::load_resolved(&fixture("rigid_core_si_numbers.yaml")).unwrap();
    assert_eq!(resolved.core.stiffness, CoreStiffness::Rigid);
    assert_relative_eq!(resolved.web.thickness, 9e-6);
    assert_relative_eq!(resolved.winding.tension.start_tension, 60.0);
    assert_eq!(
        resolved.winding.tension.taper,
        Taper::Hyperbolic { fraction: 0.3 }
    );
}

#[test]
fn core_materials_give_their_stiffness() {
    let steel = resolve("title: t\ncore: {material: steel}\n").unwrap();
    match steel.core.stiffness {
        CoreStiffness::Hollow { modulus, .. } => assert_relative_eq!(modulus, 200e9),
        other => panic!("{other:?}"),
    }
    assert_eq!(steel.core.preset.as_deref(), Some("steel_6in"));
    let aluminium = resolve("title: t\ncore: {material: aluminum}\n").unwrap();
    assert_eq!(
        aluminium.core.material,
        rolltriage::vocabulary::CoreMaterial::Aluminium
    );
    let measured = resolve("title: t\ncore: {stiffness: \"150 MPa\"}\n").unwrap();
    assert_eq!(
        measured.core.stiffness,
        CoreStiffness::Measured { stiffness: 150e6 }
    );
    // Only the outside diameter given: the preset's wall gives the bore.
    let sized = resolve("title: t\ncore: {material: paper, outside_diameter: \"7 in\"}\n").unwrap();
    assert_eq!(sized.core.preset.as_deref(), Some("paper_6in"));
    assert_relative_eq!(
        sized.core.inside_diameter,
        6.0 * 0.0254,
        max_relative = 1e-12
    );
}

#[test]
fn paper_core_preset_is_orthotropic_and_its_crush_is_estimated() {
    // Orthotropic tube (Gerhardt 1990) solved numerically in tests/reference/orthotropic_core.py:
    // 3 in bore, 1/2 in wall, Eθ = 2 GPa, Er = 40 MPa, free → Ec/Eθ = 0.142508.
    let resolved = resolve("title: t\ncore: {preset: paper_3in}\n").unwrap();
    assert_relative_eq!(
        resolved.core.stiffness.effective_stiffness() / 2e9,
        0.142508,
        max_relative = 1e-5
    );
    assert_eq!(resolved.core.support, rolltriage::model::CoreSupport::Free);
    assert_eq!(
        resolved.core.crush_basis,
        rolltriage::model::core_crush::CrushBasis::WallStrength
    );
    // Wall strength 20 MPa over the outer-wall hoop stress 7.317 p (same reference) = 2.73 MPa.
    assert_relative_eq!(
        resolved.core.crush_pressure,
        20e6 / 7.317165,
        max_relative = 1e-5
    );
    let crush = resolved
        .assumed
        .iter()
        .find(|a| a.field == "core.crush_pressure")
        .unwrap();
    assert!(crush.source.contains("free core"), "{crush:?}");
    // A flat crush rating of 4 kN per 100 mm on the 12.7 mm wall: 6·40e3/(π·0.0127) = 6.015 MPa.
    let rated = resolve("title: t\ncore: {preset: paper_3in, flat_crush: 40 kN/m}\n").unwrap();
    assert_relative_eq!(rated.core.crush_pressure, 6.015e6, max_relative = 1e-3);
    // On a shaft the core is stiffer.
    let held = resolve("title: t\ncore: {preset: paper_3in, support: shaft}\n").unwrap();
    assert!(
        held.core.stiffness.effective_stiffness() > resolved.core.stiffness.effective_stiffness()
    );
}

#[test]
fn winder_settings_resolve_per_width_and_by_type() {
    let case = resolve(
        "title: t\nweb: {width: 2 m}\nwinding: {method: centre_surface, centre_torque: 100 N·m, nip_load: 1 kN/m}\n",
    )
    .unwrap();
    assert_relative_eq!(case.winding.centre_torque.unwrap(), 50.0);
    let drums = resolve("title: t\nwinding: {method: two_drum, nip_load: 500 N/m}\n").unwrap();
    let set = drums.winding.drums.unwrap();
    assert_relative_eq!(set.drum_radius, 0.25);
    assert!(
        drums
            .assumed
            .iter()
            .any(|a| a.field == "winding.drums.centre_distance")
    );
    let refused = resolve("title: t\nwinding: {method: centre, centre_torque: 100 N·m}\n");
    assert!(refused.unwrap_err().to_string().contains("centre_surface"));
    let programme = resolve(
        "title: t\nroll: {diameter: 1 m}\nwinding: {nip_programme: [{diameter: 200 mm, nip_load: 2 kN/m}, {diameter: 800 mm, nip_load: 1 kN/m}]}\n",
    )
    .unwrap();
    let p = programme.winding.nip_programme.unwrap();
    assert_relative_eq!(p.load_at(0.25), 1500.0);
    assert!(
        !programme
            .assumed
            .iter()
            .any(|a| a.field == "winding.nip_load")
    );
}

#[test]
fn hollow_core_stiffness_matches_lame() {
    // Lamé thick-walled cylinder under external pressure (e.g. Timoshenko & Goodier, Theory of
    // Elasticity, §28): radial compliance at the outer surface gives
    // Ec = E / ((b² + a²)/(b² − a²) − ν).
    // A paper core given with equal hoop and radial moduli is isotropic.
    let resolved = resolve("title: t\ncore: {preset: paper_3in, radial_modulus: 2 GPa}\n").unwrap();
    let (a, b): (f64, f64) = (0.0381, 0.0508);
    let expected = 2e9 / ((b * b + a * a) / (b * b - a * a) - 0.3);
    assert_relative_eq!(
        resolved.core.stiffness.effective_stiffness(),
        expected,
        max_relative = 1e-12
    );
}

#[test]
fn radial_laws_parse() {
    let constant =
        resolve("title: t\nweb: {radial_stiffness: {law: constant, modulus: \"20 MPa\"}}\n")
            .unwrap();
    assert_eq!(
        constant.web.radial_stiffness,
        RadialStiffness::Constant { modulus: 20e6 }
    );
    let power = resolve(
        "title: t\nweb: {radial_stiffness: {law: power_law, coefficient: 1000, exponent: 0.8}}\n",
    )
    .unwrap();
    assert_eq!(
        power.web.radial_stiffness,
        RadialStiffness::PowerLaw {
            coefficient: 1000.0,
            exponent: 0.8
        }
    );
}

#[test]
fn unknown_key_suggests_the_closest() {
    let error = parse("title: t\nweb:\n  thikness: \"76 um\"\n").unwrap_err();
    match &error {
        CaseError::UnknownKey {
            key,
            suggestion,
            line,
            section,
            ..
        } => {
            assert_eq!(key, "thikness");
            assert_eq!(suggestion.as_deref(), Some("thickness"));
            assert_eq!(*line, 3);
            assert_eq!(section, "web");
        }
        other => panic!("expected UnknownKey, got {other:?}"),
    }
    let message = error.to_string();
    assert!(message.starts_with("test.yaml: line 3"), "{message}");
    assert!(message.contains("did you mean `thickness`"), "{message}");
}

#[test]
fn yaml_errors_carry_line_and_column() {
    let error = parse("title: t\nweb:\n  thickness: [1, 2\n").unwrap_err();
    match error {
        CaseError::Syntax { line, column, .. } => {
            assert!(line >= 3, "line {line}");
            assert!(column >= 1);
        }
        other => panic!("expected Syntax, got {other:?}"),
    }
}

#[test]
fn unknown_symptom_suggests_the_closest() {
    let error = resolve("title: t\nsymptoms: [{id: telescopng}]\n").unwrap_err();
    match &error {
        CaseError::UnknownName {
            field, suggestion, ..
        } => {
            assert_eq!(field, "symptoms[0].id");
            assert_eq!(suggestion.as_deref(), Some("telescoping"));
        }
        other => panic!("expected UnknownName, got {other:?}"),
    }
}

#[test]
fn save_then_load_round_trips() {
    let dir = tempfile::tempdir().unwrap();
    let case = Case::load(&fixture("complete_newsprint.yaml")).unwrap();
    let path = dir.path().join("saved.yaml");
    case.save(&path).unwrap();
    let back = Case::load(&path).unwrap();
    assert_eq!(back, case);
    // No temporary file is left behind.
    let names: Vec<_> = std::fs::read_dir(dir.path())
        .unwrap()
        .map(|e| e.unwrap().file_name())
        .collect();
    assert_eq!(names.len(), 1, "{names:?}");
}

#[test]
fn failed_save_leaves_the_old_file_intact() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("case.yaml");
    std::fs::write(&path, "title: the old file\n").unwrap();
    let case = Case::load(&fixture("complete_newsprint.yaml")).unwrap();

    // 1. The target is a directory: writing the temporary file works, the rename fails.
    let folder_target = dir.path().join("folder");
    std::fs::create_dir(&folder_target).unwrap();
    std::fs::write(folder_target.join("keep.txt"), "kept").unwrap();
    let error = case.save(&folder_target).unwrap_err();
    assert!(matches!(error, CaseError::Save(_)), "{error:?}");
    assert_eq!(
        std::fs::read_to_string(folder_target.join("keep.txt")).unwrap(),
        "kept"
    );

    // 2. The parent "folder" is a file: the temporary file cannot be created.
    let error = case.save(&path.join("inside.yaml")).unwrap_err();
    assert!(matches!(error, CaseError::Save(_)), "{error:?}");
    assert_eq!(
        std::fs::read_to_string(&path).unwrap(),
        "title: the old file\n"
    );

    // 3. A read-only folder (skipped when running as root, which ignores permissions).
    #[cfg(unix)]
    {
        use std::os::unix::fs::PermissionsExt;
        let locked = dir.path().join("locked");
        std::fs::create_dir(&locked).unwrap();
        let target = locked.join("case.yaml");
        std::fs::write(&target, "title: the old file\n").unwrap();
        std::fs::set_permissions(&locked, std::fs::Permissions::from_mode(0o555)).unwrap();
        let probe = locked.join("probe");
        let root_like = std::fs::write(&probe, "x").is_ok();
        if !root_like {
            let error = case.save(&target).unwrap_err();
            assert!(matches!(error, CaseError::Save(_)), "{error:?}");
        }
        std::fs::set_permissions(&locked, std::fs::Permissions::from_mode(0o755)).unwrap();
        if !root_like {
            assert_eq!(
                std::fs::read_to_string(&target).unwrap(),
                "title: the old file\n"
            );
        }
    }

    // The original file next to the failed saves is untouched and no temp files remain.
    assert_eq!(
        std::fs::read_to_string(&path).unwrap(),
        "title: the old file\n"
    );
    let leftovers: Vec<_> = std::fs::read_dir(dir.path())
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .filter(|n| n.ends_with(".tmp"))
        .collect();
    assert!(leftovers.is_empty(), "{leftovers:?}");
}

#[test]
fn resolved_case_builds_a_problem() {
    let resolved = Case::load_resolved(&fixture("complete_newsprint.yaml")).unwrap();
    let problem = resolved.problem(Default::default());
    assert_relative_eq!(problem.core_radius, 0.0508, max_relative = 1e-12);
    assert_relative_eq!(problem.outer_radius, 0.5, max_relative = 1e-12);
    assert_relative_eq!(problem.thickness, 76e-6, max_relative = 1e-12);
}

mod properties {
    use approx::assert_relative_eq;
    use proptest::prelude::*;
    use rolltriage::case::Case;

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(64))]

        /// Diameter → length (L = π(R² − rc²)/h) → diameter returns the diameter.
        #[test]
        fn diameter_and_length_are_inverse(
            thickness_um in 5.0f64..500.0,
            diameter_mm in 150.0f64..2000.0,
        ) {
            let by_diameter = format!(
                "title: t\nweb: {{thickness: \"{thickness_um} um\"}}\ncore: {{preset: paper_3in}}\nroll: {{diameter: \"{diameter_mm} mm\"}}\n"
            );
            let resolved = Case::from_yaml_str(&by_diameter, "p").unwrap().resolve().unwrap();
            let by_length = format!(
                "title: t\nweb: {{thickness: \"{thickness_um} um\"}}\ncore: {{preset: paper_3in}}\nroll: {{length: {}}}\n",
                resolved.roll.length
            );
            let back = Case::from_yaml_str(&by_length, "p").unwrap().resolve().unwrap();
            assert_relative_eq!(back.roll.outer_diameter, diameter_mm / 1000.0, max_relative = 1e-9);
        }

        /// Save then load gives the same case, whatever the quantities look like.
        #[test]
        fn save_load_round_trip(
            thickness in prop::sample::select(vec!["76 um", "3 mil", "0.08 mm"]),
            tension in 0.1f64..5.0,
            taper in 0u32..100,
            notes in "[a-zA-Z0-9 .,'\"-]{0,40}",
        ) {
            let text = format!(
                "title: round trip\nweb: {{thickness: \"{thickness}\"}}\nwinding: {{tension: \"{tension} pli\", taper: {{kind: linear, amount: \"{taper} %\"}}}}\nnotes: {notes:?}\n"
            );
            let case = Case::from_yaml_str(&text, "p").unwrap();
            let dir = tempfile::tempdir().unwrap();
            let path = dir.path().join("c.yaml");
            case.save(&path).unwrap();
            let back = Case::load(&path).unwrap();
            prop_assert_eq!(&back, &case);
            prop_assert_eq!(back.resolve().unwrap(), case.resolve().unwrap());
        }
    }
}

// ---- The field registry ----------------------------------------------------------------

/// The keys serde accepts in one section of the schema, read from its "unknown key" message
/// (so the list comes from the structs themselves, not from a copy).
fn schema_keys(yaml: &str) -> Vec<String> {
    match parse(yaml) {
        Err(CaseError::UnknownKey { accepted, .. }) => {
            accepted.split(", ").map(str::to_string).collect()
        }
        other => panic!("expected an unknown-key error for {yaml:?}, got {other:?}"),
    }
}

#[test]
fn every_schema_key_is_in_the_field_registry_and_back() {
    use rolltriage::case::registry;
    let sections = [
        ("", "title: t\nzz_unknown: 1\n"),
        ("web", "title: t\nweb: {zz_unknown: 1}\n"),
        (
            "web.radial_stiffness",
            "title: t\nweb: {radial_stiffness: {zz_unknown: 1}}\n",
        ),
        ("core", "title: t\ncore: {zz_unknown: 1}\n"),
        ("roll", "title: t\nroll: {zz_unknown: 1}\n"),
        ("winding", "title: t\nwinding: {zz_unknown: 1}\n"),
        (
            "winding.taper",
            "title: t\nwinding: {taper: {zz_unknown: 1}}\n",
        ),
        (
            "winding.taper.steps[]",
            "title: t\nwinding: {taper: {kind: steps, steps: [{zz_unknown: 1}]}}\n",
        ),
        (
            "winding.upsets[]",
            "title: t\nwinding: {upsets: [{zz_unknown: 1}]}\n",
        ),
        (
            "winding.nip_programme[]",
            "title: t\nwinding: {nip_programme: [{zz_unknown: 1}]}\n",
        ),
        (
            "winding.taper.points[]",
            "title: t\nwinding: {taper: {kind: programme, points: [{zz_unknown: 1}]}}\n",
        ),
        (
            "winding.drums",
            "title: t\nwinding: {drums: {zz_unknown: 1}}\n",
        ),
        ("symptoms[]", "title: t\nsymptoms: [{zz_unknown: 1}]\n"),
        ("measurements", "title: t\nmeasurements: {zz_unknown: 1}\n"),
        (
            "measurements.uncertainty",
            "title: t\nmeasurements: {uncertainty: {zz_unknown: 1}}\n",
        ),
        (
            "measurements.hardness",
            "title: t\nmeasurements: {hardness: {zz_unknown: 1}}\n",
        ),
        (
            "measurements.hardness.readings[]",
            "title: t\nmeasurements: {hardness: {readings: [{zz_unknown: 1}]}}\n",
        ),
        (
            "measurements.hardness.calibration[]",
            "title: t\nmeasurements: {hardness: {calibration: [{zz_unknown: 1}]}}\n",
        ),
        (
            "measurements.lanes",
            "title: t\nmeasurements: {lanes: {zz_unknown: 1}}\n",
        ),
        (
            "measurements.end_line",
            "title: t\nmeasurements: {end_line: {zz_unknown: 1}}\n",
        ),
        (
            "measurements.set",
            "title: t\nmeasurements: {set: {zz_unknown: 1}}\n",
        ),
    ];
    let mut covered = 0;
    for (section, yaml) in sections {
        let mut schema = schema_keys(yaml);
        schema.sort();
        let mut listed: Vec<String> = registry::section(section)
            .map(|f| f.key().to_string())
            .collect();
        listed.sort();
        assert_eq!(
            schema, listed,
            "section `{section}`: schema keys vs registry entries"
        );
        covered += listed.len();
    }
    assert_eq!(
        covered,
        registry::FIELDS.len(),
        "a registry entry lies outside the sections checked here"
    );
}

#[test]
fn registry_paths_are_unique_and_ranges_sane() {
    use rolltriage::case::registry::{FIELDS, FieldKind};
    for (i, f) in FIELDS.iter().enumerate() {
        assert!(
            FIELDS[..i].iter().all(|g| g.path != f.path),
            "duplicate {}",
            f.path
        );
        assert!(!f.label.is_empty(), "{} has no label", f.path);
        if let Some(range) = f.range {
            assert!(range.min < range.max, "{}", f.path);
            assert!(
                matches!(f.kind, FieldKind::Quantity(_) | FieldKind::Number),
                "{} has a range but is not a number",
                f.path
            );
        }
        if f.form.is_some() {
            assert!(
                !f.example.is_empty(),
                "{} is on the form without an example",
                f.path
            );
        }
    }
}

#[test]
fn every_form_field_has_an_example_that_the_form_accepts() {
    use rolltriage::tui::fields::{FIELDS, check};
    assert!(FIELDS.len() >= 20);
    for spec in FIELDS.iter() {
        assert!(
            check(spec, spec.example).is_ok(),
            "{}: {}",
            spec.path,
            spec.example
        );
    }
}

/// docs/case-format.md carries one generated table per section between
/// `<!-- fields: SECTION -->` and `<!-- end fields -->`. Run with ROLLTRIAGE_UPDATE_DOCS=1 to
/// rewrite them after changing the registry.
#[test]
fn docs_field_tables_match_the_registry() {
    use rolltriage::case::registry::{DOC_SECTIONS, markdown_table};
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("docs/case-format.md");
    let text = std::fs::read_to_string(&path).unwrap();
    let mut out = String::new();
    let mut rest = text.as_str();
    let mut seen = Vec::new();
    while let Some(start) = rest.find("<!-- fields: ") {
        let open_end = start + rest[start..].find("-->").unwrap() + 3;
        let section = rest[start + "<!-- fields: ".len()..open_end - 3].trim();
        let close = open_end + rest[open_end..].find("<!-- end fields -->").unwrap();
        let section = if section == "top" { "" } else { section };
        out.push_str(&rest[..open_end]);
        out.push('\n');
        out.push_str(&markdown_table(section));
        seen.push(section.to_string());
        rest = &rest[close..];
    }
    out.push_str(rest);
    let wanted: Vec<String> = DOC_SECTIONS.iter().map(|s| s.to_string()).collect();
    if std::env::var_os("ROLLTRIAGE_UPDATE_DOCS").is_some() {
        std::fs::write(&path, &out).unwrap();
    }
    assert_eq!(seen, wanted, "docs/case-format.md: generated sections");
    assert!(
        out == text,
        "docs/case-format.md field tables differ from the registry; run the test with ROLLTRIAGE_UPDATE_DOCS=1 and commit"
    );
}

/// The slip-check event inputs (docs/theory.md §5): read, range-checked, and used by the
/// mechanics layer; a case without them takes the stated defaults.
#[test]
fn event_inputs_reach_the_mechanics() {
    use rolltriage::mechanics::{DEFAULT_EMERGENCY_STOP_TIME, MechanicsInputs};
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/fixtures/complete_newsprint.yaml"
    ))
    .unwrap();
    // The fixture gives every event; take them out to see the defaults.
    let event_keys = [
        "  stop_time:",
        "  emergency_stop_time:",
        "  unwind_tension:",
    ];
    let text: String = text
        .lines()
        .filter(|l| !event_keys.iter().any(|k| l.starts_with(k)))
        .map(|l| format!("{l}\n"))
        .collect();
    let plain = Case::from_yaml_str(&text, "plain.yaml")
        .unwrap()
        .resolve()
        .unwrap();
    let events = MechanicsInputs::from_case(&plain).events;
    assert_eq!(events.normal_stop_time, 20.0);
    assert_eq!(events.emergency_stop_time, DEFAULT_EMERGENCY_STOP_TIME);
    assert_eq!(events.unwind_tension, None);
    // Each default the mechanics take is listed as assumed, like any other left-out value.
    for (path, value) in [
        ("winding.stop_time", "20 s"),
        ("winding.emergency_stop_time", "4 s"),
        ("winding.unwind_tension", "as wound at the outside"),
    ] {
        let assumed = plain.assumed.iter().find(|a| a.field == path);
        assert!(
            assumed.is_some_and(|a| a.is_default() && a.value == value),
            "{path}: {assumed:?}"
        );
    }
    let report_lines = rolltriage::report::AssumedShare::of(&plain);
    assert!(
        report_lines
            .labels
            .iter()
            .any(|l| l == "Emergency stop time")
    );

    let with = text.replace(
        "acceleration_time: 20",
        "acceleration_time: 20\n  stop_time: 30\n  emergency_stop_time: 2.5\n  unwind_tension: 1 pli",
    );
    let resolved = Case::from_yaml_str(&with, "events.yaml")
        .unwrap()
        .resolve()
        .unwrap();
    let events = MechanicsInputs::from_case(&resolved).events;
    assert_eq!(events.start_ramp_time, 20.0);
    assert_eq!(events.normal_stop_time, 30.0);
    assert_eq!(events.emergency_stop_time, 2.5);
    // 1 pli = 175.126835 N/m (NIST SP 811: 1 lbf = 4.448222 N, 1 in = 0.0254 m).
    assert!((events.unwind_tension.unwrap() - 175.126835).abs() < 1e-3);

    let bad = text.replace(
        "acceleration_time: 20",
        "acceleration_time: 20\n  emergency_stop_time: 0",
    );
    let error = Case::from_yaml_str(&bad, "bad.yaml")
        .unwrap()
        .resolve()
        .unwrap_err()
        .to_string();
    assert!(error.contains("winding.emergency_stop_time"), "{error}");

    // The handling shock factor and the chuck rating reach the mechanics; the rating per
    // width is the whole-width rating over the 1.6 m web (1600 N·m / 1.6 m = 1000 N·m/m).
    let with = text
        .replace("handling_shock_factor: 2", "handling_shock_factor: 3")
        .replace("core:\n", "core:\n  shaft_torque_rating: 1600 N·m\n");
    let resolved = Case::from_yaml_str(&with, "shock.yaml")
        .unwrap()
        .resolve()
        .unwrap();
    let inputs = MechanicsInputs::from_case(&resolved);
    assert_eq!(inputs.events.shock_factor, 3.0);
    assert!((inputs.events.shaft_torque_rating.unwrap() - 1000.0).abs() < 1e-9);
    // Left out, the shock factor is the stated default, listed as assumed with its source.
    let without = text.replace("handling_shock_factor: 2", "");
    let resolved = Case::from_yaml_str(&without, "default.yaml")
        .unwrap()
        .resolve()
        .unwrap();
    assert_eq!(
        MechanicsInputs::from_case(&resolved).events.shock_factor,
        2.0
    );
    assert!(
        resolved
            .assumed
            .iter()
            .any(|a| a.field == "winding.handling_shock_factor"
                && a.is_default()
                && a.source.contains("suddenly applied"))
    );
    // The density the mechanics read is the case's: basis weight over caliper when given,
    // 45 g/m² / 76 µm = 592.105 kg/m³ (hand computation), listed as computed.
    let grammage = text.replace("density: 590", "basis_weight: 45 g/m2");
    let resolved = Case::from_yaml_str(&grammage, "grammage.yaml")
        .unwrap()
        .resolve()
        .unwrap();
    let density = MechanicsInputs::from_case(&resolved).density;
    assert!((density - 592.105).abs() < 1e-3, "{density}");
    assert!(
        resolved
            .assumed
            .iter()
            .any(|a| a.field == "web.density" && !a.is_default())
    );
}

// ---- Hostile or careless input (issue 14) ------------------------------------------------

/// An alias chain: `levels` levels of `fan` references each (10⁸ nodes for 8 × 10).
fn alias_chain(levels: usize, fan: usize) -> String {
    let names: Vec<String> = (0..=levels).map(|i| format!("n{i}")).collect();
    let mut text = format!("  {}: &{} [x]\n", names[0], names[0]);
    for i in 1..=levels {
        let refs = vec![format!("*{}", names[i - 1]); fan].join(", ");
        text.push_str(&format!("  {}: &{} [{refs}]\n", names[i], names[i]));
    }
    text
}

#[test]
fn first_alias_finds_aliases_without_expanding_them() {
    use rolltriage::case::yaml_guard::first_alias;
    let bomb = format!("title: t\nanswers:\n{}", alias_chain(8, 10));
    assert_eq!(first_alias(&bomb), Some((4, 12)));
    // Anchors alone, quoted stars and stars inside plain text are not aliases.
    assert_eq!(
        first_alias("title: &t t\nnotes: \"*not\" and 2 * 3\n"),
        None
    );
    // Text that does not parse is left to the parser's own message.
    assert_eq!(first_alias("title: [unclosed\n"), None);
}

#[test]
fn aliases_are_refused_in_rule_files_libraries_and_walkthroughs() {
    let chain = format!("answers:\n{}", alias_chain(8, 10));
    // A rule file.
    let files: Vec<(String, String)> = vec![("rules/causes.yaml".into(), chain.clone())];
    let error = rolltriage::diagnose::rules::RuleBase::from_files(&files).unwrap_err();
    assert!(error.to_string().contains("YAML alias"), "{error}");
    // A material library.
    let error = rolltriage::calibrate::library::MaterialLibrary::from_yaml_str(&chain, "lib.yaml")
        .unwrap_err();
    assert!(error.to_string().contains("YAML alias"), "{error}");
    assert!(error.to_string().contains("lib.yaml"), "{error}");
    // A training walk-through.
    let error = rolltriage::training::Walkthrough::from_yaml_str(&chain, "walk.yaml").unwrap_err();
    assert!(error.to_string().contains("YAML alias"), "{error}");
}

#[test]
fn the_title_is_not_echoed_into_errors() {
    let title = "T".repeat(10_000);
    let text = format!("title: {title}\nweb: {{thickness: \"-1 mm\"}}\n");
    let error = parse(&text).unwrap().resolve().unwrap_err().to_string();
    assert!(
        !error.contains("TTTT"),
        "{}",
        &error[..200.min(error.len())]
    );
    assert!(error.contains("web.thickness"), "{error}");
}

#[test]
fn a_length_that_makes_too_big_a_roll_names_the_length() {
    let error = resolve("title: t\nweb: {thickness: \"76 um\"}\nroll: {length: \"9e7 m\"}\n")
        .unwrap_err()
        .to_string();
    assert!(error.contains("roll.length"), "{error}");
    assert!(!error.contains("outer_radius"), "{error}");
    let error = resolve("title: t\nweb: {thickness: \"0.5 um\"}\nroll: {length: \"9e6 m\"}\n")
        .unwrap_err()
        .to_string();
    assert!(
        error.contains("roll.length") && error.contains("layers"),
        "{error}"
    );
}

#[test]
fn every_accepted_extreme_solves_to_finite_numbers() {
    // The lower ends of the ranges that guard against non-finite results (modulus, K2,
    // power-law coefficient, core stiffness, roughness, taper just under 100 %): the model
    // computes a finite profile for each, on a coarse grid to keep the test quick.
    let base = "title: t\nweb: {preset: newsprint}\ncore: {preset: paper_3in}\nroll: {diameter: \"300 mm\"}\n";
    let variants = [
        "web: {preset: newsprint, radial_stiffness: {law: constant, modulus: \"1 kPa\"}}",
        "web: {preset: newsprint, radial_stiffness: {law: pfeiffer, k1: \"5 kPa\", k2: 1}}",
        "web: {preset: newsprint, radial_stiffness: {law: power_law, coefficient: 0.001, exponent: 0}}",
        "web: {preset: newsprint, radial_stiffness: {law: power_law, coefficient: 0.001, exponent: 0.999}}",
        "web: {preset: newsprint, roughness: \"0.01 um\"}",
        "core: {preset: paper_3in, stiffness: \"1 kPa\"}",
        "winding: {taper: {kind: linear, amount: \"99.9 %\"}}",
    ];
    for variant in variants {
        let key = variant.split(':').next().unwrap();
        let text: String = base
            .lines()
            .filter(|l| !l.starts_with(&format!("{key}:")))
            .map(|l| format!("{l}\n"))
            .collect::<String>()
            + variant
            + "\n";
        let resolved = resolve(&text).unwrap_or_else(|e| panic!("{variant}: {e}"));
        let options = rolltriage::model::SolverOptions {
            resolution: rolltriage::model::Resolution::Grouped { layers: 50 },
            ..Default::default()
        };
        let profile = rolltriage::model::solve(&resolved.problem(options))
            .unwrap_or_else(|e| panic!("{variant}: {e}"));
        let json = serde_json::to_value(&profile).unwrap();
        let mut nulls = Vec::new();
        non_finite(&json, "", &mut nulls);
        assert!(nulls.is_empty(), "{variant}: not finite: {nulls:?}");
    }
}

/// Paths of the nulls in `value` (serde_json writes NaN and infinity as null), except the
/// fields that are optional by design.
fn non_finite(value: &serde_json::Value, path: &str, out: &mut Vec<String>) {
    const OPTIONAL: &[&str] = &["compressive_low_pressure_band", "group_halving_change"];
    match value {
        serde_json::Value::Null => out.push(path.to_string()),
        serde_json::Value::Array(items) => {
            for (i, item) in items.iter().enumerate() {
                non_finite(item, &format!("{path}[{i}]"), out);
            }
        }
        serde_json::Value::Object(map) => {
            for (key, item) in map {
                if !OPTIONAL.contains(&key.as_str()) {
                    non_finite(item, &format!("{path}.{key}"), out);
                }
            }
        }
        _ => {}
    }
}
