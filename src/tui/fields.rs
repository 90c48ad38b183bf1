//! The inputs form: which case fields it shows, how each is edited (a quantity with units, a
//! plain number, a choice, a preset ID, text), and reading/writing them on a [`Case`]. The rows,
//! labels, examples, choice lists and accepted ranges come from the case field registry
//! ([`crate::case::registry`]): a field marked for the form there appears here.

use std::sync::LazyLock;

use crate::case::registry::{self, Field, Range};
use crate::case::{Case, QuantityText, TaperInput};
use crate::units::{QuantityKind, parse_quantity};

pub use crate::case::registry::PresetFamily;

/// How a field is edited and checked.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum FieldKind {
    /// A number with a unit, checked with `units::parse_quantity` and the field's range.
    Quantity(QuantityKind),
    /// A plain number in an accepted range.
    Number { min: f64, max: f64 },
    /// One of a fixed list of words (←/→ cycles through them).
    Choice(&'static [&'static str]),
    /// A web or core preset ID (←/→ cycles through the known presets).
    Preset(PresetFamily),
    /// Free text.
    Text,
}

/// One row of the inputs form.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FieldSpec {
    /// Dotted path in the case file, also the key of `ResolvedCase::assumed`.
    pub path: &'static str,
    pub group: &'static str,
    pub label: &'static str,
    pub kind: FieldKind,
    /// An example the user can type.
    pub example: &'static str,
    /// The accepted range of a number or quantity, from the registry.
    pub range: Option<Range>,
}

/// The taper kinds the form offers: `steps` needs a list of steps, which the form does not
/// edit (write them in the case file).
const FORM_TAPER_KINDS: &[&str] = &["none", "linear", "hyperbolic"];

/// The form group of a registry field: its top-level section.
fn group(field: &Field) -> &'static str {
    match field.path.split('.').next() {
        Some("web") => "Web",
        Some("core") => "Core",
        Some("roll") => "Roll",
        Some("winding") => "Winding",
        _ => "Case",
    }
}

fn spec(field: &'static Field, label: &'static str) -> Option<FieldSpec> {
    let kind = match field.kind {
        registry::FieldKind::Quantity(kind) => FieldKind::Quantity(kind),
        registry::FieldKind::Number => {
            let range = field.range();
            FieldKind::Number {
                min: range.min,
                max: range.max,
            }
        }
        registry::FieldKind::Choice(_) if field.path == registry::TAPER_KIND.path => {
            FieldKind::Choice(FORM_TAPER_KINDS)
        }
        registry::FieldKind::Choice(words) => FieldKind::Choice(words),
        registry::FieldKind::Preset(family) => FieldKind::Preset(family),
        registry::FieldKind::Text => FieldKind::Text,
        registry::FieldKind::Section | registry::FieldKind::List | registry::FieldKind::Map => {
            return None;
        }
    };
    Some(FieldSpec {
        path: field.path,
        group: group(field),
        label,
        kind,
        example: field.example,
        range: field.range,
    })
}

/// Every field of the form, in display order (the registry's fields marked for the form).
pub static FIELDS: LazyLock<Vec<FieldSpec>> = LazyLock::new(|| {
    registry::FIELDS
        .iter()
        .filter_map(|f| f.form.and_then(|label| spec(f, label)))
        .collect()
});

use FieldKind::{Choice, Number, Preset, Quantity, Text};

/// A choice or preset value as a person reads it: "centre-surface winding", a preset's title;
/// other words with spaces for underscores. The case file keeps the ID.
pub fn value_words(spec: &FieldSpec, value: &str) -> String {
    match spec.kind {
        FieldKind::Preset(PresetFamily::Web) => crate::presets::web_preset(value)
            .map_or_else(|| value.to_string(), |p| p.name.to_string()),
        FieldKind::Preset(PresetFamily::Core) => crate::presets::core_preset(value)
            .map_or_else(|| value.to_string(), |p| p.name.to_string()),
        FieldKind::Choice(_) if spec.path == "winding.method" => match value {
            "centre" => "centre winding".into(),
            "gap" => "gap winding".into(),
            "surface" => "surface winding".into(),
            "two_drum" => "two-drum winding".into(),
            "centre_surface" => "centre-surface winding".into(),
            other => other.replace('_', " "),
        },
        FieldKind::Choice(_) => value.replace('_', " "),
        _ => value.to_string(),
    }
}

/// Rewrite every entered quantity of the form in `units` ("525 N/m" → "3.001 pli"); returns
/// how many changed. Texts that do not parse are left as typed.
pub fn convert_units(case: &mut Case, units: crate::units::UnitSystem) -> usize {
    let mut converted = 0;
    for spec in FIELDS.iter() {
        let FieldKind::Quantity(kind) = spec.kind else {
            continue;
        };
        // A percentage reads the same in both systems.
        if kind == QuantityKind::Percent {
            continue;
        }
        let Some(text) = get(case, spec.path) else {
            continue;
        };
        let Ok(value) = parse_quantity(spec.path, &text, kind) else {
            continue;
        };
        let new = crate::units::format_quantity(value, kind, units);
        if new != text && set(case, spec, Some(&new)).is_ok() {
            converted += 1;
        }
    }
    converted
}

/// Find a field by its path.
pub fn field(path: &str) -> Option<&'static FieldSpec> {
    FIELDS.iter().find(|f| f.path == path)
}

fn quantity_text(q: &Option<QuantityText>) -> Option<String> {
    q.as_ref().map(|q| match q {
        QuantityText::Number(n) => format!("{n}"),
        QuantityText::Text(t) => t.clone(),
    })
}

/// The text as entered in the case (None when the field is blank).
pub fn get(case: &Case, path: &str) -> Option<String> {
    match path {
        "title" => (!case.title.is_empty()).then(|| case.title.clone()),
        "web.preset" => case.web.preset.clone(),
        "web.material" => case.web.material.clone(),
        "web.thickness" => quantity_text(&case.web.thickness),
        "web.width" => quantity_text(&case.web.width),
        "web.tangential_modulus" => quantity_text(&case.web.tangential_modulus),
        "web.radial_stiffness.law" => case.web.radial_stiffness.as_ref().map(|r| r.law.clone()),
        "web.radial_stiffness.k1" => case
            .web
            .radial_stiffness
            .as_ref()
            .and_then(|r| quantity_text(&r.k1)),
        "web.radial_stiffness.k2" => case
            .web
            .radial_stiffness
            .as_ref()
            .and_then(|r| r.k2.map(|v| format!("{v}"))),
        "web.radial_stiffness.modulus" => case
            .web
            .radial_stiffness
            .as_ref()
            .and_then(|r| quantity_text(&r.modulus)),
        "web.poisson_ratio" => case.web.poisson_ratio.map(|v| format!("{v}")),
        "web.friction" => case.web.friction.map(|v| format!("{v}")),
        "web.kinetic_friction" => case.web.kinetic_friction.map(|v| format!("{v}")),
        "web.density" => case.web.density.map(|v| format!("{v}")),
        "web.roughness" => quantity_text(&case.web.roughness),
        "web.strength" => quantity_text(&case.web.strength),
        "core.preset" => case.core.preset.clone(),
        "core.material" => case.core.material.clone(),
        "core.inside_diameter" => quantity_text(&case.core.inside_diameter),
        "core.outside_diameter" => quantity_text(&case.core.outside_diameter),
        "core.modulus" => quantity_text(&case.core.modulus),
        "core.crush_pressure" => quantity_text(&case.core.crush_pressure),
        "core.radial_modulus" => quantity_text(&case.core.radial_modulus),
        "core.support" => case.core.support.clone(),
        "core.flat_crush" => quantity_text(&case.core.flat_crush),
        "roll.diameter" => quantity_text(&case.roll.diameter),
        "roll.length" => quantity_text(&case.roll.length),
        "winding.method" => case.winding.method.clone(),
        "winding.tension" => quantity_text(&case.winding.tension),
        "winding.taper.kind" => case.winding.taper.as_ref().map(|t| t.kind.clone()),
        "winding.taper.amount" => case
            .winding
            .taper
            .as_ref()
            .and_then(|t| quantity_text(&t.amount)),
        "winding.nip_load" => quantity_text(&case.winding.nip_load),
        "winding.centre_torque" => quantity_text(&case.winding.centre_torque),
        "winding.speed" => quantity_text(&case.winding.speed),
        "winding.temperature" => quantity_text(&case.winding.temperature),
        "winding.acceleration_time" => case.winding.acceleration_time.map(|v| format!("{v}")),
        "winding.recipe_tension" => quantity_text(&case.winding.recipe_tension),
        _ => None,
    }
}

/// One part of `web.radial_stiffness` (law, K1, K2 or modulus). A constant given without a
/// law means Pfeiffer for K1/K2 and `constant` for a modulus; with nothing left the section
/// goes, so the preset's law applies again.
fn set_radial(case: &mut Case, path: &str, text: Option<String>) {
    use crate::case::schema::RadialStiffnessInput;
    let radial = case
        .web
        .radial_stiffness
        .get_or_insert_with(|| RadialStiffnessInput {
            law: if path.ends_with("modulus") {
                "constant".into()
            } else {
                "pfeiffer".into()
            },
            k1: None,
            k2: None,
            modulus: None,
            coefficient: None,
            exponent: None,
        });
    match path {
        "web.radial_stiffness.law" => radial.law = text.unwrap_or_default(),
        "web.radial_stiffness.k1" => radial.k1 = text.map(QuantityText::Text),
        "web.radial_stiffness.k2" => radial.k2 = text.and_then(|t| t.parse().ok()),
        _ => radial.modulus = text.map(QuantityText::Text),
    }
    let empty = radial.k1.is_none()
        && radial.k2.is_none()
        && radial.modulus.is_none()
        && radial.coefficient.is_none()
        && radial.exponent.is_none();
    if radial.law.is_empty() || (empty && path != "web.radial_stiffness.law") {
        case.web.radial_stiffness = None;
    }
}

/// Why a value typed into a field is not accepted (shown under the field).
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FieldError {
    #[error(transparent)]
    Unit(#[from] crate::units::UnitError),
    #[error("{0}: not a field of the form")]
    NotInForm(String),
    #[error("{path}: \"{text}\" is not accepted; a plain number {accepted}")]
    Number {
        path: &'static str,
        text: String,
        accepted: String,
    },
    #[error("{path}: {shown} is not accepted; {accepted}")]
    OutOfRange {
        path: &'static str,
        shown: String,
        accepted: String,
    },
    #[error("{path}: \"{text}\" is not accepted; one of {}", options.join(", "))]
    Choice {
        path: &'static str,
        text: String,
        options: &'static [&'static str],
    },
}

/// Check `text` for the field.
pub fn check(spec: &FieldSpec, text: &str) -> Result<(), FieldError> {
    let text = text.trim();
    if text.is_empty() {
        return Ok(());
    }
    match spec.kind {
        Quantity(kind) => {
            let value = parse_quantity(spec.path, text, kind)?;
            match spec.range {
                Some(range) if !range.contains(value) => Err(FieldError::OutOfRange {
                    path: spec.path,
                    shown: range.show(value),
                    accepted: range.describe(),
                }),
                _ => Ok(()),
            }
        }
        Number { min, max } => match (text.parse::<f64>(), spec.range) {
            (Ok(v), Some(range)) if range.contains(v) => Ok(()),
            (Ok(v), None) if v.is_finite() && (min..=max).contains(&v) => Ok(()),
            _ => Err(FieldError::Number {
                path: spec.path,
                text: text.to_string(),
                accepted: spec
                    .range
                    .map_or_else(|| format!("from {min} to {max}"), |range| range.describe()),
            }),
        },
        Choice(options) => {
            if options.contains(&text) {
                Ok(())
            } else {
                Err(FieldError::Choice {
                    path: spec.path,
                    text: text.to_string(),
                    options,
                })
            }
        }
        Preset(_) | Text => Ok(()),
    }
}

/// Write `text` (None or empty clears the field) after checking it.
pub fn set(case: &mut Case, spec: &FieldSpec, text: Option<&str>) -> Result<(), FieldError> {
    let text = text.map(str::trim).filter(|t| !t.is_empty());
    if let Some(t) = text {
        check(spec, t)?;
    }
    let owned = text.map(str::to_string);
    let quantity = || owned.clone().map(QuantityText::Text);
    let number = || owned.as_deref().and_then(|t| t.parse::<f64>().ok());
    match spec.path {
        "title" => case.title = owned.clone().unwrap_or_default(),
        "web.preset" => case.web.preset = owned.clone(),
        "web.material" => case.web.material = owned.clone(),
        "web.thickness" => case.web.thickness = quantity(),
        "web.width" => case.web.width = quantity(),
        "web.tangential_modulus" => case.web.tangential_modulus = quantity(),
        "web.radial_stiffness.law"
        | "web.radial_stiffness.k1"
        | "web.radial_stiffness.k2"
        | "web.radial_stiffness.modulus" => set_radial(case, spec.path, owned.clone()),
        "web.poisson_ratio" => case.web.poisson_ratio = number(),
        "web.friction" => case.web.friction = number(),
        "web.kinetic_friction" => case.web.kinetic_friction = number(),
        "web.density" => case.web.density = number(),
        "web.roughness" => case.web.roughness = quantity(),
        "web.strength" => case.web.strength = quantity(),
        "core.preset" => case.core.preset = owned.clone(),
        "core.material" => case.core.material = owned.clone(),
        "core.inside_diameter" => case.core.inside_diameter = quantity(),
        "core.outside_diameter" => case.core.outside_diameter = quantity(),
        "core.modulus" => case.core.modulus = quantity(),
        "core.crush_pressure" => case.core.crush_pressure = quantity(),
        "core.radial_modulus" => case.core.radial_modulus = quantity(),
        "core.support" => case.core.support = owned.clone(),
        "core.flat_crush" => case.core.flat_crush = quantity(),
        "roll.diameter" => case.roll.diameter = quantity(),
        "roll.length" => case.roll.length = quantity(),
        "winding.method" => case.winding.method = owned.clone(),
        "winding.tension" => case.winding.tension = quantity(),
        "winding.taper.kind" => match owned.clone() {
            Some(kind) => {
                let taper = case.winding.taper.get_or_insert_with(|| TaperInput {
                    kind: kind.clone(),
                    amount: None,
                    steps: Vec::new(),
                });
                taper.kind = kind;
            }
            None => case.winding.taper = None,
        },
        "winding.taper.amount" => match quantity() {
            Some(amount) => {
                let taper = case.winding.taper.get_or_insert_with(|| TaperInput {
                    kind: "linear".into(),
                    amount: None,
                    steps: Vec::new(),
                });
                taper.amount = Some(amount);
            }
            None => {
                if let Some(taper) = case.winding.taper.as_mut() {
                    taper.amount = None;
                }
            }
        },
        "winding.nip_load" => case.winding.nip_load = quantity(),
        "winding.centre_torque" => case.winding.centre_torque = quantity(),
        "winding.speed" => case.winding.speed = quantity(),
        "winding.temperature" => case.winding.temperature = quantity(),
        "winding.acceleration_time" => case.winding.acceleration_time = number(),
        "winding.recipe_tension" => case.winding.recipe_tension = quantity(),
        other => return Err(FieldError::NotInForm(other.to_string())),
    }
    Ok(())
}

/// The next (or previous) option of a choice field, starting from the current text.
pub fn cycle(options: &[String], current: Option<&str>, forward: bool) -> Option<String> {
    if options.is_empty() {
        return None;
    }
    let n = options.len();
    let next = match current.and_then(|c| options.iter().position(|o| o == c)) {
        Some(i) if forward => (i + 1) % n,
        Some(i) => (i + n - 1) % n,
        None if forward => 0,
        None => n - 1,
    };
    Some(options[next].clone())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_field_round_trips_a_choice_or_text() {
        let mut case = Case::default();
        let spec = field("winding.method").unwrap();
        set(&mut case, spec, Some("surface")).unwrap();
        assert_eq!(get(&case, "winding.method").as_deref(), Some("surface"));
        assert!(set(&mut case, spec, Some("sideways")).is_err());
        assert_eq!(get(&case, "winding.method").as_deref(), Some("surface"));
        set(&mut case, spec, None).unwrap();
        assert_eq!(get(&case, "winding.method"), None);
    }

    #[test]
    fn numbers_are_range_checked() {
        let mut case = Case::default();
        let spec = field("web.friction").unwrap();
        assert!(set(&mut case, spec, Some("3.5")).is_err());
        set(&mut case, spec, Some("0.35")).unwrap();
        assert_eq!(case.web.friction, Some(0.35));
    }

    #[test]
    fn taper_amount_creates_a_taper() {
        let mut case = Case::default();
        let spec = field("winding.taper.kind").unwrap();
        set(&mut case, spec, Some("hyperbolic")).unwrap();
        assert_eq!(case.winding.taper.as_ref().unwrap().kind, "hyperbolic");
    }

    #[test]
    fn every_path_is_readable() {
        let case = Case::default();
        for f in FIELDS.iter() {
            assert_eq!(get(&case, f.path), None, "{}", f.path);
        }
    }

    #[test]
    fn form_ranges_are_the_registry_ranges() {
        let friction = field("web.friction").unwrap();
        // The case file refuses a friction of 0 (more than 0 is required); so does the form.
        assert!(check(friction, "0").is_err());
        let thickness = field("web.thickness").unwrap();
        assert!(check(thickness, "76 um").is_ok());
        assert!(check(thickness, "5 m").is_err());
        let registry_paths: Vec<&str> = registry::FIELDS
            .iter()
            .filter(|f| f.form.is_some())
            .map(|f| f.path)
            .collect();
        let form_paths: Vec<&str> = FIELDS.iter().map(|f| f.path).collect();
        assert_eq!(registry_paths, form_paths);
    }

    #[test]
    fn cycling_wraps() {
        let options: Vec<String> = ["a", "b"].iter().map(|s| s.to_string()).collect();
        assert_eq!(cycle(&options, Some("b"), true).as_deref(), Some("a"));
        assert_eq!(cycle(&options, None, false).as_deref(), Some("b"));
    }
}
