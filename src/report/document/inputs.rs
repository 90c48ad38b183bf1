//! The case section of a report: the symptoms and answers, and every input as a labelled line
//! marked given, assumed (left out or a preset value written unchanged) or computed; how much
//! of the answer rests on assumed inputs ([`AssumedShare`]).

use serde::{Deserialize, Serialize};

use super::round_sig;
use crate::case::ResolvedCase;
use crate::model::{CoreStiffness, RadialStiffness, Taper, WindingMethod};
use crate::report::ReportInput;
use crate::units::{QuantityKind, UnitSystem, format_quantity};

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct InputLine {
    /// Dotted field path, as in the case file.
    pub field: String,
    pub label: String,
    pub value: String,
    /// True when the value came from a preset or default rather than the case file.
    pub assumed: bool,
    /// Where an assumed value came from.
    pub source: Option<String>,
    /// How a value not typed by hand came about: left out (`default`), written unchanged from
    /// its preset (`preset`) or computed from other inputs (`computed`).
    #[serde(default)]
    pub origin: Option<crate::case::ValueOrigin>,
}

impl InputLine {
    /// The "given or assumed" cell in words.
    pub fn origin_text(&self) -> String {
        use crate::case::ValueOrigin;
        let source = self.source.clone().unwrap_or_default();
        let with = |what: &str| {
            if source.is_empty() {
                what.to_string()
            } else {
                format!("{what}: {source}")
            }
        };
        match self.origin {
            Some(ValueOrigin::Default) => with("assumed"),
            Some(ValueOrigin::Preset) => with("preset value, unchanged"),
            Some(ValueOrigin::Computed) if source.starts_with("computed") => source,
            Some(ValueOrigin::Computed) => with("computed"),
            None => "given".to_string(),
        }
    }
}

/// "3 of 20 inputs were assumed …" for the report's inputs table.
pub fn assumed_summary(inputs: &[InputLine]) -> String {
    use crate::case::ValueOrigin;
    let count = |o: ValueOrigin| inputs.iter().filter(|l| l.origin == Some(o)).count();
    let (defaults, presets, computed) = (
        count(ValueOrigin::Default),
        count(ValueOrigin::Preset),
        count(ValueOrigin::Computed),
    );
    let mut out = format!(
        "{} of {} inputs were assumed from presets or defaults",
        defaults + presets,
        inputs.len()
    );
    if presets > 0 {
        out.push_str(&format!(
            " ({presets} of them preset values written into the case file unchanged)"
        ));
    }
    if computed > 0 {
        out.push_str(&format!("; {computed} computed from other inputs"));
    }
    out.push('.');
    out
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SymptomLine {
    pub id: String,
    #[serde(rename = "where")]
    pub place: Option<String>,
    pub notes: Option<String>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CaseSummary {
    pub title: String,
    pub description: Option<String>,
    pub notes: Option<String>,
    pub source_file: Option<String>,
    pub symptoms: Vec<SymptomLine>,
    pub answers: Vec<(String, String)>,
    pub inputs: Vec<InputLine>,
}

pub(super) fn case_summary(input: &ReportInput) -> CaseSummary {
    let resolved = &input.resolved;
    let symptoms = resolved
        .symptoms
        .iter()
        .map(|s| SymptomLine {
            id: s.id.clone(),
            place: s.place.clone(),
            notes: s.notes.clone(),
        })
        .collect();
    CaseSummary {
        title: resolved.title.clone(),
        description: input
            .case
            .description
            .as_ref()
            .map(|d| d.trim().to_string()),
        notes: input.case.notes.as_ref().map(|n| n.trim().to_string()),
        source_file: input.meta.source_file.clone(),
        symptoms,
        answers: resolved
            .answers
            .iter()
            .map(|(k, v)| (k.clone(), v.clone()))
            .collect(),
        inputs: input_lines(resolved, input.units),
    }
}

/// The resolved inputs as labelled lines, each marked when it was assumed.
pub fn input_lines(resolved: &ResolvedCase, units: UnitSystem) -> Vec<InputLine> {
    let mut lines = web_and_core_values(resolved, units);
    lines.extend(winding_values(resolved, units));
    lines.extend(event_values(resolved, units));
    if let Some(rating) = resolved.core.shaft_torque_rating {
        lines.push((
            "core.shaft_torque_rating".into(),
            format_quantity(rating, QuantityKind::Torque, units),
        ));
    }
    lines
        .into_iter()
        .map(|(field, value)| input_line(resolved, field, value))
        .collect()
}

/// `(field, value)` of the web's and the core's inputs.
fn web_and_core_values(resolved: &ResolvedCase, units: UnitSystem) -> Vec<(String, String)> {
    use QuantityKind::*;
    let q = |value: f64, kind: QuantityKind| format_quantity(value, kind, units);
    let web = &resolved.web;
    let core = &resolved.core;
    vec![
        ("web.material".into(), web.material.to_string()),
        ("web.thickness".into(), q(web.thickness, Length)),
        ("web.width".into(), q(web.width, Length)),
        (
            "web.tangential_modulus".into(),
            q(web.tangential_modulus, Stress),
        ),
        (
            "web.radial_stiffness".into(),
            radial_stiffness_text(&web.radial_stiffness, units),
        ),
        ("web.friction".into(), format!("{:.2}", web.friction)),
        ("web.roughness".into(), q(web.roughness, Length)),
        ("web.strength".into(), q(web.strength, ForcePerWidth)),
        ("core.material".into(), core.material.to_string()),
        (
            "core.inside_diameter".into(),
            q(core.inside_diameter, Length),
        ),
        (
            "core.outside_diameter".into(),
            q(core.outside_diameter, Length),
        ),
        (
            "core.stiffness".into(),
            core_stiffness_text(&core.stiffness, units),
        ),
        ("core.crush_pressure".into(), q(core.crush_pressure, Stress)),
    ]
}

/// `(field, value)` of the roll's size and the winder's settings, upsets and temperature.
fn winding_values(resolved: &ResolvedCase, units: UnitSystem) -> Vec<(String, String)> {
    use QuantityKind::*;
    let q = |value: f64, kind: QuantityKind| format_quantity(value, kind, units);
    let winding = &resolved.winding;
    let mut lines: Vec<(String, String)> = vec![
        (
            "roll.diameter".into(),
            q(resolved.roll.outer_diameter, Length),
        ),
        ("roll.length".into(), q(resolved.roll.length, Length)),
        (
            "winding.method".into(),
            method_text(winding.method).to_string(),
        ),
        (
            "winding.tension".into(),
            q(winding.tension.start_tension, ForcePerWidth),
        ),
        (
            "winding.taper".into(),
            taper_text(&winding.tension.taper, units),
        ),
        (
            "winding.nip_load".into(),
            winding
                .nip_load
                .map(|n| q(n, ForcePerWidth))
                .unwrap_or_else(|| "none".to_string()),
        ),
        ("winding.speed".into(), q(winding.speed, Speed)),
    ];
    for (index, upset) in winding.tension.upsets.iter().enumerate() {
        lines.push((
            format!("winding.upsets[{index}]"),
            format!(
                "{} from diameter {} to {}",
                q(upset.tension, ForcePerWidth),
                q(2.0 * upset.from_radius, Length),
                q(2.0 * upset.to_radius, Length)
            ),
        ));
    }
    if let Some(t) = winding.temperature {
        lines.push(("winding.temperature".into(), q(t, Temperature)));
    }
    if let Some(t) = winding.recipe_tension {
        lines.push(("winding.recipe_tension".into(), q(t, ForcePerWidth)));
    }
    lines
}

/// `(field, value)` of the events of the slip and telescoping checks, as the mechanics take
/// them (given, or the default the resolver lists as assumed).
fn event_values(resolved: &ResolvedCase, units: UnitSystem) -> Vec<(String, String)> {
    let events = crate::mechanics::MechanicsInputs::from_case(resolved);
    let seconds = |t: f64| format!("{} s", round_sig(t, 4));
    vec![
        (
            "winding.acceleration_time".into(),
            seconds(events.events.start_ramp_time),
        ),
        (
            "winding.stop_time".into(),
            seconds(events.events.normal_stop_time),
        ),
        (
            "winding.emergency_stop_time".into(),
            seconds(events.events.emergency_stop_time),
        ),
        (
            "winding.unwind_tension".into(),
            format_quantity(
                events.events.unwind_tension.unwrap_or(events.outer_tension),
                QuantityKind::ForcePerWidth,
                units,
            ),
        ),
        (
            "winding.handling_shock_factor".into(),
            format!("{}", round_sig(events.events.shock_factor, 3)),
        ),
    ]
}

/// One input line: its label, and whether (and where from) the value was assumed.
fn input_line(resolved: &ResolvedCase, field: String, value: String) -> InputLine {
    let assumed = resolved.assumed.iter().find(|a| {
        a.field == field
            || a.field.starts_with(&format!("{field}."))
            || (field == "roll.diameter" && a.field == "roll.outer_diameter")
            || (field == "core.stiffness" && a.field == "core.modulus")
    });
    InputLine {
        label: input_label(&field).to_string(),
        value,
        assumed: assumed.is_some_and(|a| a.origin != crate::case::ValueOrigin::Computed),
        source: assumed.map(|a| a.source.clone()),
        origin: assumed.map(|a| a.origin),
        field,
    }
}

/// The plain-words label of an input line, from the case field registry (`winding.upsets[2]`
/// takes the label of `winding.upsets`).
fn input_label(field: &str) -> &'static str {
    let path = field.split('[').next().unwrap_or(field);
    crate::case::registry::field(path).map_or("", |f| f.label)
}

fn method_text(method: WindingMethod) -> &'static str {
    method.describe()
}

fn radial_stiffness_text(law: &RadialStiffness, units: UnitSystem) -> String {
    match *law {
        RadialStiffness::Pfeiffer { k1, k2 } => format!(
            "Pfeiffer, K1 = {}, K2 = {}",
            format_quantity(k1, QuantityKind::Stress, units),
            round_sig(k2, 4)
        ),
        RadialStiffness::Constant { modulus } => format!(
            "constant, Er = {}",
            format_quantity(modulus, QuantityKind::Stress, units)
        ),
        RadialStiffness::PowerLaw {
            coefficient,
            exponent,
        } => format!(
            "power law, C = {}, n = {}",
            format_quantity(coefficient, QuantityKind::Stress, units),
            round_sig(exponent, 4)
        ),
    }
}

fn core_stiffness_text(core: &CoreStiffness, units: UnitSystem) -> String {
    let effective = core.effective_stiffness();
    match *core {
        CoreStiffness::Rigid => "rigid".to_string(),
        CoreStiffness::Hollow {
            modulus,
            poisson_ratio,
            ..
        } => format!(
            "hollow cylinder, E = {}, ν = {}, effective Ec = {}",
            format_quantity(modulus, QuantityKind::Stress, units),
            round_sig(poisson_ratio, 3),
            format_quantity(effective, QuantityKind::Stress, units)
        ),
        CoreStiffness::Tube {
            hoop_modulus,
            radial_modulus,
            poisson_ratio,
            support,
            ..
        } => format!(
            "orthotropic tube, hoop E = {}, radial E = {}, ν = {}, {}, effective Ec = {}",
            format_quantity(hoop_modulus, QuantityKind::Stress, units),
            format_quantity(radial_modulus, QuantityKind::Stress, units),
            round_sig(poisson_ratio, 3),
            support.describe(),
            format_quantity(effective, QuantityKind::Stress, units)
        ),
        CoreStiffness::Measured { stiffness } => format!(
            "measured, Ec = {}",
            format_quantity(stiffness, QuantityKind::Stress, units)
        ),
    }
}

fn taper_text(taper: &Taper, units: UnitSystem) -> String {
    match taper {
        Taper::None => "none (constant tension)".to_string(),
        Taper::Linear { fraction } => format!("linear, {} %", round_sig(fraction * 100.0, 4)),
        Taper::Hyperbolic { fraction } => {
            format!("hyperbolic, {} %", round_sig(fraction * 100.0, 4))
        }
        Taper::Steps { steps } => {
            let parts: Vec<String> = steps
                .iter()
                .map(|s| {
                    format!(
                        "{} from diameter {}",
                        format_quantity(s.tension, QuantityKind::ForcePerWidth, units),
                        format_quantity(2.0 * s.radius, QuantityKind::Length, units)
                    )
                })
                .collect();
            format!("steps: {}", parts.join("; "))
        }
        Taper::Programme { points } => {
            let parts: Vec<String> = points
                .iter()
                .map(|p| {
                    format!(
                        "{} at diameter {}",
                        format_quantity(p.tension, QuantityKind::ForcePerWidth, units),
                        format_quantity(2.0 * p.radius, QuantityKind::Length, units)
                    )
                })
                .collect();
            format!("tension programme: {}", parts.join("; "))
        }
    }
}

/// How much of an answer rests on assumed inputs: how many of the listed inputs were assumed
/// (left out, or preset values written unchanged), their labels, and the factor the shown
/// confidence is multiplied by.
#[derive(Debug, Clone, PartialEq)]
pub struct AssumedShare {
    pub assumed: usize,
    pub total: usize,
    pub labels: Vec<String>,
}

/// Half the confidence at most is taken off, in proportion to the share of inputs assumed: a
/// case that gives nothing keeps half its belief, a case that gives everything all of it. A
/// plain, stated discount rather than a computed uncertainty (see docs/tui.md).
pub const ASSUMED_DISCOUNT: f64 = 0.5;

impl AssumedShare {
    pub fn of(resolved: &ResolvedCase) -> Self {
        let lines = input_lines(resolved, UnitSystem::Si);
        let labels: Vec<String> = lines
            .iter()
            .filter(|l| l.assumed)
            .map(|l| l.label.clone())
            .collect();
        AssumedShare {
            assumed: labels.len(),
            total: lines.len(),
            labels,
        }
    }

    /// The factor applied to a belief before it is shown.
    pub fn factor(&self) -> f64 {
        if self.total == 0 {
            return 1.0;
        }
        1.0 - ASSUMED_DISCOUNT * self.assumed as f64 / self.total as f64
    }
}
