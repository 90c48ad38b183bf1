//! The inputs form: which case fields it shows, how each is edited (a quantity with units, a
//! plain number, a choice, a preset ID, text), and reading/writing them on a [`Case`].

use crate::case::{Case, QuantityText, TaperInput};
use crate::units::{QuantityKind, parse_quantity};

/// How a field is edited and checked.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum FieldKind {
    /// A number with a unit, checked with `units::parse_quantity`.
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

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PresetFamily {
    Web,
    Core,
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
}

pub const MATERIALS: &[&str] = &["paper", "board", "film", "foil", "nonwoven", "laminate"];
pub const CORE_MATERIALS: &[&str] = &["paper", "plastic", "aluminium", "steel", "rigid"];
pub const WINDING_METHODS: &[&str] = &["centre", "surface", "centre_surface"];
pub const TAPER_KINDS: &[&str] = &["none", "linear", "hyperbolic"];

use FieldKind::{Choice, Number, Preset, Quantity, Text};
use QuantityKind as Q;

/// Every field of the form, in display order.
#[rustfmt::skip]
pub const FIELDS: &[FieldSpec] = &[
    FieldSpec { path: "title", group: "Case", label: "Title", kind: Text, example: "Reel 4 telescoped" },
    FieldSpec { path: "web.preset", group: "Web", label: "Web preset", kind: Preset(PresetFamily::Web), example: "newsprint" },
    FieldSpec { path: "web.material", group: "Web", label: "Material", kind: Choice(MATERIALS), example: "paper" },
    FieldSpec { path: "web.thickness", group: "Web", label: "Thickness", kind: Quantity(Q::Length), example: "76 um" },
    FieldSpec { path: "web.width", group: "Web", label: "Width", kind: Quantity(Q::Length), example: "2.4 m" },
    FieldSpec { path: "web.tangential_modulus", group: "Web", label: "MD modulus", kind: Quantity(Q::Stress), example: "4 GPa" },
    FieldSpec { path: "web.friction", group: "Web", label: "Web-web friction", kind: Number { min: 0.0, max: 2.0 }, example: "0.4" },
    FieldSpec { path: "web.roughness", group: "Web", label: "Roughness (RMS)", kind: Quantity(Q::Length), example: "3 um" },
    FieldSpec { path: "web.strength", group: "Web", label: "Tensile strength", kind: Quantity(Q::ForcePerWidth), example: "3 kN/m" },
    FieldSpec { path: "core.preset", group: "Core", label: "Core preset", kind: Preset(PresetFamily::Core), example: "paper_3in" },
    FieldSpec { path: "core.material", group: "Core", label: "Core material", kind: Choice(CORE_MATERIALS), example: "paper" },
    FieldSpec { path: "core.inside_diameter", group: "Core", label: "Core inside dia.", kind: Quantity(Q::Length), example: "76 mm" },
    FieldSpec { path: "core.outside_diameter", group: "Core", label: "Core outside dia.", kind: Quantity(Q::Length), example: "100 mm" },
    FieldSpec { path: "core.modulus", group: "Core", label: "Core modulus", kind: Quantity(Q::Stress), example: "3 GPa" },
    FieldSpec { path: "core.crush_pressure", group: "Core", label: "Core crush rating", kind: Quantity(Q::Stress), example: "2 MPa" },
    FieldSpec { path: "roll.diameter", group: "Roll", label: "Roll diameter", kind: Quantity(Q::Length), example: "1 m" },
    FieldSpec { path: "roll.length", group: "Roll", label: "Wound length", kind: Quantity(Q::Length), example: "12000 m" },
    FieldSpec { path: "winding.method", group: "Winding", label: "Winding method", kind: Choice(WINDING_METHODS), example: "centre" },
    FieldSpec { path: "winding.tension", group: "Winding", label: "Web tension", kind: Quantity(Q::ForcePerWidth), example: "3 pli" },
    FieldSpec { path: "winding.taper.kind", group: "Winding", label: "Taper", kind: Choice(TAPER_KINDS), example: "hyperbolic" },
    FieldSpec { path: "winding.taper.amount", group: "Winding", label: "Taper amount", kind: Quantity(Q::Percent), example: "25 %" },
    FieldSpec { path: "winding.nip_load", group: "Winding", label: "Nip load", kind: Quantity(Q::ForcePerWidth), example: "10 pli" },
    FieldSpec { path: "winding.speed", group: "Winding", label: "Line speed", kind: Quantity(Q::Speed), example: "1200 fpm" },
    FieldSpec { path: "winding.temperature", group: "Winding", label: "Web temperature", kind: Quantity(Q::Temperature), example: "35 °C" },
    FieldSpec { path: "winding.acceleration_time", group: "Winding", label: "Run-up time (s)", kind: Number { min: 0.0, max: 3600.0 }, example: "20" },
];

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
        "web.friction" => case.web.friction.map(|v| format!("{v}")),
        "web.roughness" => quantity_text(&case.web.roughness),
        "web.strength" => quantity_text(&case.web.strength),
        "core.preset" => case.core.preset.clone(),
        "core.material" => case.core.material.clone(),
        "core.inside_diameter" => quantity_text(&case.core.inside_diameter),
        "core.outside_diameter" => quantity_text(&case.core.outside_diameter),
        "core.modulus" => quantity_text(&case.core.modulus),
        "core.crush_pressure" => quantity_text(&case.core.crush_pressure),
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
        "winding.speed" => quantity_text(&case.winding.speed),
        "winding.temperature" => quantity_text(&case.winding.temperature),
        "winding.acceleration_time" => case.winding.acceleration_time.map(|v| format!("{v}")),
        _ => None,
    }
}

/// Why a value typed into a field is not accepted (shown under the field).
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FieldError {
    #[error(transparent)]
    Unit(#[from] crate::units::UnitError),
    #[error("{0}: not a field of the form")]
    NotInForm(String),
    #[error("{path}: \"{text}\" is not accepted; a plain number from {min} to {max}")]
    Number {
        path: &'static str,
        text: String,
        min: f64,
        max: f64,
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
        Quantity(kind) => Ok(parse_quantity(spec.path, text, kind).map(|_| ())?),
        Number { min, max } => match text.parse::<f64>() {
            Ok(v) if v.is_finite() && (min..=max).contains(&v) => Ok(()),
            _ => Err(FieldError::Number {
                path: spec.path,
                text: text.to_string(),
                min,
                max,
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
        "web.friction" => case.web.friction = number(),
        "web.roughness" => case.web.roughness = quantity(),
        "web.strength" => case.web.strength = quantity(),
        "core.preset" => case.core.preset = owned.clone(),
        "core.material" => case.core.material = owned.clone(),
        "core.inside_diameter" => case.core.inside_diameter = quantity(),
        "core.outside_diameter" => case.core.outside_diameter = quantity(),
        "core.modulus" => case.core.modulus = quantity(),
        "core.crush_pressure" => case.core.crush_pressure = quantity(),
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
        "winding.speed" => case.winding.speed = quantity(),
        "winding.temperature" => case.winding.temperature = quantity(),
        "winding.acceleration_time" => case.winding.acceleration_time = number(),
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
        for f in FIELDS {
            assert_eq!(get(&case, f.path), None, "{}", f.path);
        }
    }

    #[test]
    fn cycling_wraps() {
        let options: Vec<String> = ["a", "b"].iter().map(|s| s.to_string()).collect();
        assert_eq!(cycle(&options, Some("b"), true).as_deref(), Some("a"));
        assert_eq!(cycle(&options, None, false).as_deref(), Some("b"));
    }
}
