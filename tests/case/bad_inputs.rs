//! The bad-input corpus (tests/bad_inputs/): every broken case file is refused with the right
//! kind of error, a message naming the file and the field, and no panic. The 10 MB file is
//! generated into a temporary folder rather than committed.

use std::path::{Path, PathBuf};

use rolltriage::case::{Case, CaseError, MAX_CASE_FILE_BYTES};
use rolltriage::units::UnitError;

fn corpus_dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/bad_inputs")
}

/// Load and resolve, catching panics so one bad file cannot hide the others.
fn outcome(path: &Path) -> Result<CaseError, String> {
    let owned = path.to_path_buf();
    match std::panic::catch_unwind(move || Case::load_resolved(&owned)) {
        Ok(Ok(_)) => Err(format!("{} was accepted", path.display())),
        Ok(Err(error)) => Ok(error),
        Err(_) => Err(format!("{} made the loader panic", path.display())),
    }
}

/// The message of a case that resolves but whose answers the shipped rule base refuses.
fn answers_outcome(path: &Path) -> Result<String, String> {
    let resolved = Case::load_resolved(path).map_err(|e| format!("{e}"))?;
    let rules = rolltriage::diagnose::rules::RuleBase::embedded().map_err(|e| e.to_string())?;
    match rolltriage::diagnose::check_answers(&rules, &resolved.answers) {
        Ok(()) => Err(format!("{}: answers were accepted", path.display())),
        Err(error) => Ok(format!("{}: {error}", path.display())),
    }
}

/// Words that belong to the code, not to a message for a winder operator.
const RUST_WORDS: &[&str] = &["struct ", "f64", "u128", "i128", "QuantityText", "Input`"];

/// The kind of error a corpus file must produce.
#[derive(Debug, Clone, Copy)]
enum Expect {
    MissingUnit,
    UnknownUnit,
    WrongKind,
    NotANumber,
    Syntax,
    UnknownKey,
    OutOfRange,
    UnknownName,
    Invalid,
    NotUtf8,
    /// The case resolves but an answer names no question of the shipped rule base (what
    /// `case check` and `diagnose` refuse).
    UnknownAnswer,
}

fn kind_matches(kind: Expect, error: &CaseError) -> bool {
    match (kind, error) {
        (Expect::MissingUnit, CaseError::Quantity { error, .. }) => {
            matches!(**error, UnitError::MissingUnit { .. })
        }
        (Expect::UnknownUnit, CaseError::Quantity { error, .. }) => {
            matches!(**error, UnitError::UnknownUnit { .. })
        }
        (Expect::WrongKind, CaseError::Quantity { error, .. }) => {
            matches!(**error, UnitError::WrongKind { .. })
        }
        (Expect::NotANumber, CaseError::Quantity { error, .. }) => {
            matches!(**error, UnitError::NotANumber { .. })
        }
        (Expect::Syntax, CaseError::Syntax { .. })
        | (Expect::UnknownKey, CaseError::UnknownKey { .. })
        | (Expect::OutOfRange, CaseError::OutOfRange { .. })
        | (Expect::UnknownName, CaseError::UnknownName { .. })
        | (Expect::Invalid, CaseError::Invalid { .. })
        | (Expect::NotUtf8, CaseError::NotUtf8 { .. }) => true,
        _ => false,
    }
}

/// (file, kind of error, fragments the message must contain).
const CORPUS: &[(&str, Expect, &[&str])] = &[
    // Wrong, missing or unknown units.
    (
        "wrong_unit_thickness.yaml",
        Expect::WrongKind,
        &["web.thickness", "76 pli", "a length is needed", "mil"],
    ),
    (
        "tension_as_torque.yaml",
        Expect::WrongKind,
        &[
            "line 3",
            "winding.tension",
            "torque",
            "pli",
            "a stress in the web",
            "total force",
        ],
    ),
    (
        "thickness_without_unit.yaml",
        Expect::MissingUnit,
        &["web.thickness", "has no unit", "um"],
    ),
    (
        "unknown_unit.yaml",
        Expect::UnknownUnit,
        &["winding.speed", "furlongs", "fpm"],
    ),
    (
        "not_a_number.yaml",
        Expect::NotANumber,
        &["web.width", "wide"],
    ),
    // Missing or empty fields, wrong shapes.
    (
        "missing_title.yaml",
        Expect::Syntax,
        &["missing field `title`"],
    ),
    (
        "empty_file.yaml",
        Expect::Syntax,
        &["missing field `title`"],
    ),
    ("empty_title.yaml", Expect::Invalid, &["title is empty"]),
    (
        "not_a_mapping.yaml",
        Expect::Syntax,
        &["line 1", "invalid type: a list", "section"],
    ),
    (
        "two_documents.yaml",
        Expect::Syntax,
        &["more than one document"],
    ),
    (
        "quantity_wrong_type.yaml",
        Expect::Syntax,
        &["line 4", "web.thickness", "expected a quantity", "76 um"],
    ),
    (
        "yaml_syntax_error.yaml",
        Expect::Syntax,
        &["line 4, column 1", "flow sequence"],
    ),
    (
        "pfeiffer_missing_k2.yaml",
        Expect::Invalid,
        &["web.radial_stiffness.k2 is required", "pfeiffer"],
    ),
    (
        "steps_with_linear_kind.yaml",
        Expect::Invalid,
        &["winding.taper.steps", "kind `steps`"],
    ),
    // Negative, zero and absurd values.
    (
        "negative_thickness.yaml",
        Expect::OutOfRange,
        &["web.thickness = -76 µm", "at least 0.5 µm"],
    ),
    (
        "zero_width.yaml",
        Expect::OutOfRange,
        &["web.width = 0 m", "at least 1 mm"],
    ),
    (
        "negative_friction.yaml",
        Expect::OutOfRange,
        &["web.friction = -0.3", "more than 0"],
    ),
    (
        "absurd_roll_diameter.yaml",
        Expect::OutOfRange,
        &["roll.diameter = 50 m", "at most 5 m"],
    ),
    (
        "absurd_layer_count.yaml",
        Expect::OutOfRange,
        &["roll.diameter", "layers"],
    ),
    (
        "below_absolute_zero.yaml",
        Expect::OutOfRange,
        &["winding.temperature = -300 °C", "-60 °C"],
    ),
    (
        "core_poisson_too_large.yaml",
        Expect::OutOfRange,
        &["core.poisson_ratio = 0.6", "0.49"],
    ),
    (
        "nan_number.yaml",
        Expect::OutOfRange,
        &["web.thickness = NaN", "finite"],
    ),
    (
        "tension_above_strength.yaml",
        Expect::OutOfRange,
        &["winding.tension = 50 kN/m", "web strength", "break"],
    ),
    // Geometry that cannot be.
    (
        "core_bigger_than_roll.yaml",
        Expect::OutOfRange,
        &["roll.diameter = 400 mm", "core is bigger than the roll"],
    ),
    (
        "core_bore_not_smaller.yaml",
        Expect::OutOfRange,
        &[
            "core.inside_diameter",
            "less than the core outside diameter",
        ],
    ),
    (
        "upset_outside_roll.yaml",
        Expect::OutOfRange,
        &["winding.upsets[0].to_diameter = 2 m", "at most 1 m"],
    ),
    (
        "steps_not_ascending.yaml",
        Expect::OutOfRange,
        &[
            "winding.taper.steps[1].from_diameter",
            "from the core outward",
        ],
    ),
    // Taper over 100 % and below 0 %.
    (
        "taper_over_100_percent.yaml",
        Expect::OutOfRange,
        &["winding.taper.amount = 120 %", "100 %"],
    ),
    (
        "taper_negative.yaml",
        Expect::OutOfRange,
        &["winding.taper.amount = -10 %", "at least 0 %"],
    ),
    // Unknown keys and names, with the closest valid one suggested.
    (
        "unknown_top_level_key.yaml",
        Expect::UnknownKey,
        &["line 2", "`symptom`", "did you mean `symptoms`"],
    ),
    (
        "unknown_nested_key.yaml",
        Expect::UnknownKey,
        &["line 3", "in winding", "did you mean `tension`"],
    ),
    (
        "unknown_symptom.yaml",
        Expect::UnknownName,
        &["symptoms[0].id", "did you mean `telescoping`"],
    ),
    (
        "unknown_place.yaml",
        Expect::UnknownName,
        &["symptoms[0].where", "middle", "whole_roll"],
    ),
    (
        "unknown_radial_law.yaml",
        Expect::UnknownName,
        &["web.radial_stiffness.law", "did you mean `pfeiffer`"],
    ),
    (
        "unknown_winding_method.yaml",
        Expect::UnknownName,
        &["winding.method", "turret", "centre_surface"],
    ),
    (
        "unknown_web_preset.yaml",
        Expect::UnknownName,
        &["web.preset", "did you mean `newsprint`"],
    ),
    // Duplicate keys, also where a typed map would silently keep the last one.
    (
        "duplicate_key.yaml",
        Expect::Syntax,
        &["line 4", "duplicate entry with key \"web\""],
    ),
    (
        "duplicate_answer.yaml",
        Expect::Syntax,
        &["line 4", "duplicate entry with key \"splice_nearby\""],
    ),
    // Hostile files: alias bomb, deep nesting, not UTF-8.
    // Aliases are refused before anything expands them: the 8-level chain of ten references
    // per level would be 10⁸ nodes.
    (
        "alias_bomb.yaml",
        Expect::Syntax,
        &["line 4, column 10", "YAML alias", "not accepted"],
    ),
    (
        "alias_bomb_8x10.yaml",
        Expect::Syntax,
        &["line 4, column 10", "YAML alias", "write the value out"],
    ),
    // `case check` accepts exactly what the solver accepts.
    (
        "power_law_exponent_one_or_more.yaml",
        Expect::OutOfRange,
        &["web.radial_stiffness.exponent = 1.5", "less than 1"],
    ),
    (
        "web_poisson_half.yaml",
        Expect::OutOfRange,
        &["web.poisson_ratio = 0.5", "less than 0.5"],
    ),
    (
        "roll_one_nanometre_over_core.yaml",
        Expect::OutOfRange,
        &["roll.diameter", "at least one layer over the core"],
    ),
    (
        "roll_length_tiny.yaml",
        Expect::OutOfRange,
        &["roll.length", "at least one wrap around the core"],
    ),
    (
        "thickness_not_below_core_radius.yaml",
        Expect::OutOfRange,
        &["web.thickness = 10 mm", "less than the core outside radius"],
    ),
    (
        "core_poisson_on_rigid_core.yaml",
        Expect::OutOfRange,
        &["core.poisson_ratio = 7", "at most 0.49"],
    ),
    (
        "core_poisson_with_stiffness.yaml",
        Expect::OutOfRange,
        &["core.poisson_ratio = 7", "at most 0.49"],
    ),
    (
        "unknown_answer.yaml",
        Expect::UnknownAnswer,
        &["answers", "unknown question `splice_nearby`"],
    ),
    // Values the model cannot compute (non-finite results) are refused with the range named.
    (
        "constant_modulus_tiny.yaml",
        Expect::OutOfRange,
        &["web.radial_stiffness.modulus = 1e-300 Pa", "at least 1 kPa"],
    ),
    (
        "core_stiffness_tiny.yaml",
        Expect::OutOfRange,
        &["core.stiffness = 1e-300 Pa", "at least 1 kPa"],
    ),
    (
        "pfeiffer_k2_tiny.yaml",
        Expect::OutOfRange,
        &["web.radial_stiffness.k2 = 1e-300", "at least 1 and"],
    ),
    (
        "power_coefficient_tiny.yaml",
        Expect::OutOfRange,
        &[
            "web.radial_stiffness.coefficient = 1e-300 Pa",
            "at least 0.001 Pa",
        ],
    ),
    (
        "roughness_zero.yaml",
        Expect::OutOfRange,
        &["web.roughness = 0 m", "at least 0.01 µm"],
    ),
    (
        "linear_taper_100_percent.yaml",
        Expect::OutOfRange,
        &["winding.taper.amount = 100 %", "less than 100 %"],
    ),
    (
        "upset_at_zero_tension.yaml",
        Expect::OutOfRange,
        &["winding.upsets[0].tension = 0 N/m", "more than 0 N/m"],
    ),
    // Errors name the right field, in plain words.
    (
        "wrong_type_blames_its_key.yaml",
        Expect::Syntax,
        &["line 2, column 31", "web.width", "expected a quantity"],
    ),
    (
        "section_of_wrong_type.yaml",
        Expect::Syntax,
        &["web:", "expected a section of `key: value` lines"],
    ),
    (
        "number_of_wrong_type.yaml",
        Expect::Syntax,
        &["web.friction", "expected a plain number"],
    ),
    (
        "whole_number_too_large.yaml",
        Expect::Syntax,
        &["web.poisson_ratio", "too large to read"],
    ),
    (
        "roll_length_too_long.yaml",
        Expect::OutOfRange,
        &["roll.length = 90000000 m", "roll diameter", "at most 5 m"],
    ),
    (
        "deep_nesting.yaml",
        Expect::Syntax,
        &["recursion limit exceeded", "nested too deeply"],
    ),
    ("not_utf8.yaml", Expect::NotUtf8, &["line 2", "not UTF-8"]),
    // Measurements (docs/evidence.md).
    (
        "measured_bad_rolls_exceed_set.yaml",
        Expect::OutOfRange,
        &["measurements.set.bad", "0 to 4"],
    ),
    (
        "measured_weight_without_basis_weight.yaml",
        Expect::OutOfRange,
        &["measurements.basis_weight", "with measurements.weight"],
    ),
    (
        "measured_weight_in_metres.yaml",
        Expect::WrongKind,
        &["measurements.weight", "weight (mass)", "kg"],
    ),
    // Tension programme, handling shock factor, shaft rating, basis weight (issues 15 and 16).
    (
        "programme_beside_tension.yaml",
        Expect::Invalid,
        &["winding.tension", "tension programme"],
    ),
    (
        "programme_points_backwards.yaml",
        Expect::OutOfRange,
        &[
            "winding.taper.points[1].diameter",
            "larger than the previous point",
        ],
    ),
    (
        "shock_factor_below_one.yaml",
        Expect::OutOfRange,
        &["winding.handling_shock_factor = 0.5", "at least 1"],
    ),
    (
        "shaft_torque_rating_zero.yaml",
        Expect::OutOfRange,
        &["core.shaft_torque_rating = 0 N·m", "more than 0 N·m"],
    ),
    (
        "basis_weight_too_heavy_for_caliper.yaml",
        Expect::OutOfRange,
        &["web.basis_weight = 80 g/m²", "density"],
    ),
];

#[test]
fn every_corpus_file_is_refused_with_the_right_error() {
    let mut failures = Vec::new();
    for (name, kind, fragments) in CORPUS {
        let path = corpus_dir().join(name);
        if let Expect::UnknownAnswer = kind {
            match answers_outcome(&path) {
                Err(problem) => failures.push(problem),
                Ok(message) => {
                    for fragment in *fragments {
                        if !message.contains(fragment) {
                            failures.push(format!("{name}: message lacks {fragment:?}: {message}"));
                        }
                    }
                }
            }
            continue;
        }
        match outcome(&path) {
            Err(problem) => failures.push(problem),
            Ok(error) => {
                let message = error.to_string();
                if !kind_matches(*kind, &error) {
                    failures.push(format!("{name}: expected {kind:?}, got {error:?}"));
                }
                if !message.contains(&path.display().to_string()) {
                    failures.push(format!("{name}: message does not name the file: {message}"));
                }
                for fragment in *fragments {
                    if !message.contains(fragment) {
                        failures.push(format!("{name}: message lacks {fragment:?}: {message}"));
                    }
                }
                for word in RUST_WORDS {
                    if message.contains(word) {
                        failures.push(format!(
                            "{name}: message shows code word {word:?}: {message}"
                        ));
                    }
                }
            }
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

#[test]
fn corpus_is_complete_and_listed() {
    let mut on_disk: Vec<String> = std::fs::read_dir(corpus_dir())
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    on_disk.sort();
    let mut listed: Vec<String> = CORPUS.iter().map(|(n, _, _)| n.to_string()).collect();
    listed.sort();
    assert_eq!(on_disk, listed, "every corpus file needs an expectation");
    assert!(CORPUS.len() >= 25);
}

#[test]
fn ten_megabyte_file_is_refused_before_parsing() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("huge.yaml");
    let mut text = String::from("title: huge\nnotes: |\n");
    let line = "  the same line of notes again and again to make a very large file\n";
    while text.len() < 10 * 1024 * 1024 {
        text.push_str(line);
    }
    std::fs::write(&path, &text).unwrap();
    let error = outcome(&path).unwrap();
    match &error {
        CaseError::TooLarge { size, limit, .. } => {
            assert!(*size >= 10 * 1024 * 1024);
            assert_eq!(*limit, MAX_CASE_FILE_BYTES);
        }
        other => panic!("expected TooLarge, got {other:?}"),
    }
    assert!(error.to_string().contains("huge.yaml"));
    // The same guard applies to text handed over directly.
    let error = Case::from_yaml_str(&text, "pasted").unwrap_err();
    assert!(matches!(error, CaseError::TooLarge { .. }), "{error:?}");
}

#[test]
fn a_file_just_under_the_limit_is_parsed() {
    // The guard is a size limit, not a refusal of long notes: 0.9 MiB of notes still loads.
    let mut text = String::from("title: long notes\nnotes: |\n");
    while text.len() < 900 * 1024 {
        text.push_str("  a line of notes\n");
    }
    let case = Case::from_yaml_str(&text, "long.yaml").unwrap();
    assert!(case.notes.unwrap().len() > 700 * 1024);
}

#[test]
fn missing_file_is_a_read_error() {
    let error = Case::load(Path::new("/nonexistent/case.yaml")).unwrap_err();
    assert!(matches!(error, CaseError::Read { .. }), "{error:?}");
    assert!(error.to_string().contains("/nonexistent/case.yaml"));
}

#[test]
fn a_directory_is_a_read_error() {
    let dir = tempfile::tempdir().unwrap();
    let error = Case::load(dir.path()).unwrap_err();
    assert!(matches!(error, CaseError::Read { .. }), "{error:?}");
}

mod never_panics {
    use proptest::prelude::*;
    use rolltriage::case::Case;

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(200))]

        /// Arbitrary bytes never panic the loader.
        #[test]
        fn arbitrary_bytes(bytes in proptest::collection::vec(any::<u8>(), 0..300)) {
            if let Ok(case) = Case::from_yaml_bytes(&bytes, "fuzz") {
                let _ = case.resolve();
            }
        }

        /// Near-valid cases with arbitrary quantity text never panic the resolver.
        #[test]
        fn arbitrary_quantities(
            thickness in ".{0,12}",
            tension in ".{0,12}",
            diameter in ".{0,12}",
            taper in ".{0,8}",
        ) {
            let text = format!(
                "title: t\nweb: {{thickness: {thickness:?}}}\nroll: {{diameter: {diameter:?}}}\nwinding: {{tension: {tension:?}, taper: {{kind: linear, amount: {taper:?}}}}}\n"
            );
            if let Ok(case) = Case::from_yaml_str(&text, "fuzz") {
                let _ = case.resolve();
            }
        }
    }
}

/// The YAML parser itself must keep its guards: if a dependency update removed them, these
/// fail before any case file could exhaust memory or the stack.
mod parser_limits {
    #[test]
    fn alias_expansion_is_limited() {
        let mut text = String::from("a: &a [x, x, x, x, x, x, x, x, x, x]\n");
        let mut previous = 'a';
        for name in "bcdefghij".chars() {
            let refs = vec![format!("*{previous}"); 10].join(", ");
            text.push_str(&format!("{name}: &{name} [{refs}]\n"));
            previous = name;
        }
        let error = yaml::from_str::<yaml::Value>(&text).unwrap_err();
        assert!(
            error.to_string().contains("repetition limit exceeded"),
            "{error}"
        );
    }

    #[test]
    fn nesting_depth_is_limited() {
        let text = format!("{}{}", "[".repeat(10_000), "]".repeat(10_000));
        let error = yaml::from_str::<yaml::Value>(&text).unwrap_err();
        assert!(
            error.to_string().contains("recursion limit exceeded"),
            "{error}"
        );
        // Nesting within the limit is fine.
        let shallow = format!("{}{}", "[".repeat(100), "]".repeat(100));
        assert!(yaml::from_str::<yaml::Value>(&shallow).is_ok());
    }
}
