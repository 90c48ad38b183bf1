//! The report's document model: every number already formatted with its unit next to its SI
//! value, so Markdown, HTML and JSON say exactly the same thing.

use serde::{Deserialize, Serialize};

use super::{ReportError, ReportInput, ReportMeta};
use crate::case::ResolvedCase;
use crate::diagnose::{Caution, MergedRemedy};
use crate::model::{CoreStiffness, Profile, RadialStiffness, Taper, WindingMethod};
use crate::units::{QuantityKind, UnitSystem, format_quantity};

/// Limits of the model every report repeats, so a reader knows what the numbers do not cover.
pub const MODEL_LIMITS: [&str; 8] = [
    "Stresses come from Hakiel's nonlinear accretion model (plane stress, layers wound one on \
     another, Pfeiffer-type radial stiffness); the roll is treated as uniform across its width, so \
     cross-web effects (gauge bands, edge build-up, misalignment) are not computed.",
    "No creep, viscoelastic relaxation, thermal or moisture change after winding: rolls stored for \
     weeks, wound hot or exposed to humidity will differ from the computed state.",
    "Entrained air is only estimated (foil-bearing film thickness against surface roughness); its \
     effect on the stress state is not modelled.",
    "The nip-induced part of the wound-in tension uses a friction times nip-load estimate, valid at \
     moderate nip loads (roughly below 2 kN/m).",
    "Material and core values not given in the case came from generic presets (listed as assumed); \
     results are only as good as these approximate inputs.",
    "Handling, dropping, storage on the side and transport loads are not computed; they enter the \
     diagnosis only through the answers to the symptom questions.",
    "Causes are ranked by a rule base tied to the computed indicators; the ranking is a guide for \
     the investigation, not a proof.",
    "Remedies that involve running equipment must follow local codes, site procedures and \
     lockout/tagout practice.",
];

/// A value with its unit: SI number for machines, formatted text for people.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Quantity {
    pub si: f64,
    pub si_unit: String,
    pub text: String,
}

impl Quantity {
    pub fn new(si: f64, kind: QuantityKind, system: UnitSystem) -> Quantity {
        Quantity {
            si: round_sig(si, 6),
            si_unit: si_unit(kind).to_string(),
            text: format_quantity(si, kind, system),
        }
    }
}

fn si_unit(kind: QuantityKind) -> &'static str {
    match kind {
        QuantityKind::Length => "m",
        QuantityKind::ForcePerWidth => "N/m",
        QuantityKind::Stress => "Pa",
        QuantityKind::Speed => "m/s",
        QuantityKind::Force => "N",
        QuantityKind::Torque => "N·m",
        QuantityKind::Temperature => "°C",
        QuantityKind::Percent => "1",
        QuantityKind::Mass => "kg",
        QuantityKind::BasisWeight => "kg/m²",
    }
}

/// Round to `digits` significant digits so JSON and snapshots do not carry float noise.
pub(crate) fn round_sig(value: f64, digits: i32) -> f64 {
    if value == 0.0 || !value.is_finite() {
        return value;
    }
    let magnitude = value.abs().log10().floor() as i32;
    let scale = 10f64.powi(digits - 1 - magnitude);
    (value * scale).round() / scale
}

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

impl ReportDocument {
    /// The causes a remedy answers, in words.
    pub fn answers_text(&self, remedy: &crate::diagnose::MergedRemedy) -> String {
        remedy
            .answers
            .iter()
            .map(|id| {
                self.causes
                    .iter()
                    .find(|c| c.id == *id)
                    .map(|c| c.title.clone())
                    .unwrap_or_else(|| id.replace('_', " "))
            })
            .collect::<Vec<_>>()
            .join("; ")
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

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ZoneSummary {
    pub zone: String,
    /// Where the zone starts and ends, as roll diameters (what an operator measures).
    pub inner_diameter: Quantity,
    pub outer_diameter: Quantity,
    pub pressure_min: Quantity,
    pub pressure_mean: Quantity,
    pub pressure_max: Quantity,
    pub tangential_stress_min: Quantity,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct StressSummary {
    pub core_pressure: Quantity,
    pub core_crush_pressure: Quantity,
    /// Core pressure divided by the core's rated crush pressure.
    pub core_pressure_ratio: f64,
    pub peak_pressure: Quantity,
    /// Roll diameter at the peak pressure.
    pub peak_pressure_diameter: Quantity,
    pub min_tangential_stress: Quantity,
    pub min_tangential_diameter: Quantity,
    pub wound_in_tension_start: Quantity,
    pub wound_in_tension_end: Quantity,
    pub physical_layers: usize,
    pub elements: usize,
    pub layers_per_element: usize,
    pub zones: Vec<ZoneSummary>,
    /// Air-film thickness over combined roughness at the start and at the outside.
    pub air_film_ratio: Option<(f64, f64)>,
    pub warnings: Vec<String>,
}

/// A reason as the report shows it: the diagnosis's own reason with its weight rounded for
/// stable output.
pub type ReasonEntry = crate::diagnose::Reason;

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CauseEntry {
    pub rank: usize,
    pub id: String,
    pub title: String,
    pub mechanism: String,
    pub belief: f64,
    pub reasons: Vec<ReasonEntry>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RemedyEntry {
    /// Place in the merged remedy list, from 1.
    pub rank: usize,
    #[serde(flatten)]
    pub remedy: MergedRemedy,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct IndicatorEntry {
    pub id: String,
    pub zone: Option<String>,
    pub value: f64,
    pub unit: String,
    pub meaning: String,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RemedyComparisonSummary {
    pub remedy_id: String,
    pub remedy_text: String,
    pub change: String,
    /// (label, before, after) for the headline figures.
    pub figures: Vec<ComparisonFigure>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ComparisonFigure {
    pub label: String,
    pub before: Quantity,
    pub after: Quantity,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ProfilePoint {
    /// Roll diameter at the point (m).
    pub diameter_m: f64,
    pub pressure_pa: f64,
    pub tangential_stress_pa: f64,
}

/// The whole report, format-neutral. Its JSON form is the report's JSON format.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ReportDocument {
    /// Identifies this document layout for other systems.
    pub schema: String,
    pub meta: ReportMeta,
    pub case: CaseSummary,
    pub stress: StressSummary,
    pub causes: Vec<CauseEntry>,
    pub remedies: Vec<RemedyEntry>,
    pub cautions: Vec<Caution>,
    pub indicators: Vec<IndicatorEntry>,
    pub remedy_comparison: Option<RemedyComparisonSummary>,
    /// The case's complaint record as (label, value) lines; empty when the case has none.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub complaint: Vec<(String, String)>,
    pub model_limits: Vec<String>,
    /// The profile thinned to at most [`PROFILE_POINTS`] points, core first.
    pub profile: Vec<ProfilePoint>,
    /// Past complaints like this one from the plant's history store, with their confirmed
    /// causes and what worked; absent when no store was given.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub similar_past: Option<Vec<crate::history::PastComplaint>>,
    /// What was measured on the roll against what was computed; absent without measurements.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub measured: Option<MeasuredSection>,
    /// Which assumed inputs the answer rests on; absent when nothing was assumed or it was not
    /// worked out.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub sensitivity: Option<crate::diagnose::sensitivity::Sensitivity>,
}

/// The measurements against the model (docs/evidence.md).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MeasuredSection {
    pub rows: Vec<crate::evidence::ComparisonRow>,
    /// Plain-words findings and notes.
    pub lines: Vec<String>,
    /// The full comparison, for other systems.
    pub evidence: crate::evidence::Evidence,
}

/// At most this many profile points go into a report (enough to redraw the curves).
pub const PROFILE_POINTS: usize = 60;

/// Build the format-neutral document.
pub fn build_document(input: &ReportInput) -> Result<ReportDocument, ReportError> {
    if input.profile.radius.is_empty() {
        return Err(ReportError::EmptyProfile);
    }
    let units = input.units;
    let case = case_summary(input);
    let stress = stress_summary(&input.resolved, &input.profile, units);
    let causes = input
        .diagnosis
        .causes
        .iter()
        .enumerate()
        .map(|(index, cause)| CauseEntry {
            rank: index + 1,
            id: cause.id.clone(),
            title: cause.title.clone(),
            mechanism: cause.mechanism.clone(),
            belief: round_sig(cause.belief, 4),
            reasons: cause
                .reasons
                .iter()
                .map(|r| ReasonEntry {
                    weight: round_sig(r.weight, 4),
                    // A measured-evidence reason quotes its measurement in the report's units.
                    value: match (&input.diagnosis.evidence, &r.value) {
                        (Some(e), Some(v)) => Some(e.localise(v, units)),
                        _ => r.value.clone(),
                    },
                    ..r.clone()
                })
                .collect(),
        })
        .collect();
    let remedies = input
        .diagnosis
        .remedies
        .iter()
        .enumerate()
        .map(|(index, remedy)| RemedyEntry {
            rank: index + 1,
            remedy: remedy.clone(),
        })
        .collect();
    let indicators = input
        .diagnosis
        .indicators
        .iter()
        .map(|i| IndicatorEntry {
            id: i.id.clone(),
            zone: i.zone.clone(),
            value: round_sig(i.value, 5),
            unit: i.unit.clone(),
            meaning: i.meaning.clone(),
        })
        .collect();
    let remedy_comparison = input.remedy.as_ref().map(|comparison| {
        let before = &input.profile.summary;
        let after = &comparison.after.summary;
        let stress_figure = |label: &str, b: f64, a: f64| ComparisonFigure {
            label: label.to_string(),
            before: Quantity::new(b, QuantityKind::Stress, units),
            after: Quantity::new(a, QuantityKind::Stress, units),
        };
        let mut figures = vec![
            stress_figure("Core pressure", before.core_pressure, after.core_pressure),
            stress_figure("Peak pressure", before.peak_pressure, after.peak_pressure),
            stress_figure(
                "Most compressive tangential stress",
                before.min_tangential_stress,
                after.min_tangential_stress,
            ),
        ];
        for zone in ["middle", "outer"] {
            let b = zone_pressure_mean(&input.profile, zone);
            let a = zone_pressure_mean(&comparison.after, zone);
            if let (Some(b), Some(a)) = (b, a) {
                figures.push(stress_figure(&format!("Mean pressure, {zone} zone"), b, a));
            }
        }
        RemedyComparisonSummary {
            remedy_id: comparison.remedy_id.clone(),
            remedy_text: comparison.remedy_text.clone(),
            change: comparison.change.clone(),
            figures,
        }
    });
    Ok(ReportDocument {
        schema: "rolltriage-report/2".to_string(),
        meta: input.meta.clone(),
        case,
        stress,
        causes,
        remedies,
        cautions: input.diagnosis.cautions.clone(),
        indicators,
        remedy_comparison,
        similar_past: input.similar_past.clone(),
        complaint: input
            .case
            .complaint
            .as_ref()
            .map(|c| {
                // Confirmed causes by their titles, as the ranking names them (plain words
                // for a cause the ranking does not list).
                let title = |id: &str| {
                    input
                        .diagnosis
                        .causes
                        .iter()
                        .find(|c| c.id == id)
                        .map(|c| c.title.clone())
                        .unwrap_or_else(|| id.replace('_', " "))
                };
                c.lines_titled(&title)
                    .into_iter()
                    .map(|(label, value)| (label.to_string(), value))
                    .collect()
            })
            .unwrap_or_default(),
        model_limits: MODEL_LIMITS.iter().map(|s| s.to_string()).collect(),
        profile: thin_profile(&input.profile, PROFILE_POINTS),
        measured: input
            .diagnosis
            .evidence
            .as_ref()
            .filter(|e| !e.is_empty())
            .map(|e| MeasuredSection {
                rows: e.rows_in(units),
                lines: e.lines_in(units),
                evidence: e.clone(),
            }),
        sensitivity: input.sensitivity.clone().filter(|s| !s.is_empty()),
    })
}

fn zone_pressure_mean(profile: &Profile, zone: &str) -> Option<f64> {
    let zone = profile.zones.iter().find(|z| z.name.as_str() == zone)?;
    let values = profile
        .pressure
        .get(zone.start..zone.end.min(profile.pressure.len()))?;
    if values.is_empty() {
        return None;
    }
    Some(values.iter().sum::<f64>() / values.len() as f64)
}

/// Every n-th point, always keeping the first and last.
pub(crate) fn thin_profile(profile: &Profile, max_points: usize) -> Vec<ProfilePoint> {
    let count = profile
        .radius
        .len()
        .min(profile.pressure.len())
        .min(profile.tangential_stress.len());
    if count == 0 {
        return Vec::new();
    }
    let indices: Vec<usize> = if count <= max_points || max_points < 2 {
        (0..count).collect()
    } else {
        (0..max_points)
            .map(|k| (k * (count - 1) + (max_points - 1) / 2) / (max_points - 1))
            .collect()
    };
    indices
        .into_iter()
        .map(|i| ProfilePoint {
            diameter_m: round_sig(2.0 * profile.radius[i], 6),
            pressure_pa: round_sig(profile.pressure[i], 5),
            tangential_stress_pa: round_sig(profile.tangential_stress[i], 5),
        })
        .collect()
}

fn case_summary(input: &ReportInput) -> CaseSummary {
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
    use QuantityKind::*;
    let q = |value: f64, kind: QuantityKind| format_quantity(value, kind, units);
    let web = &resolved.web;
    let core = &resolved.core;
    let winding = &resolved.winding;
    let mut lines: Vec<(String, String)> = vec![
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
    if let Some(t) = winding.acceleration_time {
        lines.push(("winding.acceleration_time".into(), format!("{t} s")));
    }
    lines
        .into_iter()
        .map(|(field, value)| {
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
        })
        .collect()
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

/// Summary figures and per-zone statistics of a profile.
pub fn stress_summary(
    resolved: &ResolvedCase,
    profile: &Profile,
    units: UnitSystem,
) -> StressSummary {
    use QuantityKind::*;
    let s = &profile.summary;
    let zones = profile
        .zones
        .iter()
        .filter_map(|zone| {
            let end = zone.end.min(profile.pressure.len());
            let pressures = profile.pressure.get(zone.start..end)?;
            let tangential = profile.tangential_stress.get(zone.start..end)?;
            if pressures.is_empty() {
                return None;
            }
            let min = pressures.iter().copied().fold(f64::INFINITY, f64::min);
            let max = pressures.iter().copied().fold(f64::NEG_INFINITY, f64::max);
            let mean = pressures.iter().sum::<f64>() / pressures.len() as f64;
            let tangential_min = tangential.iter().copied().fold(f64::INFINITY, f64::min);
            Some(ZoneSummary {
                zone: zone.name.as_str().to_string(),
                inner_diameter: Quantity::new(2.0 * zone.inner_radius, Length, units),
                outer_diameter: Quantity::new(2.0 * zone.outer_radius, Length, units),
                pressure_min: Quantity::new(min, Stress, units),
                pressure_mean: Quantity::new(mean, Stress, units),
                pressure_max: Quantity::new(max, Stress, units),
                tangential_stress_min: Quantity::new(tangential_min, Stress, units),
            })
        })
        .collect();
    let crush = resolved.core.crush_pressure;
    let ratio = if crush > 0.0 {
        round_sig(s.core_pressure / crush, 4)
    } else {
        0.0
    };
    let wit_start = profile.wound_in_tension.first().copied().unwrap_or(0.0);
    let wit_end = profile.wound_in_tension.last().copied().unwrap_or(0.0);
    StressSummary {
        core_pressure: Quantity::new(s.core_pressure, Stress, units),
        core_crush_pressure: Quantity::new(crush, Stress, units),
        core_pressure_ratio: ratio,
        peak_pressure: Quantity::new(s.peak_pressure, Stress, units),
        peak_pressure_diameter: Quantity::new(2.0 * s.peak_pressure_radius, Length, units),
        min_tangential_stress: Quantity::new(s.min_tangential_stress, Stress, units),
        min_tangential_diameter: Quantity::new(2.0 * s.min_tangential_radius, Length, units),
        wound_in_tension_start: Quantity::new(wit_start, ForcePerWidth, units),
        wound_in_tension_end: Quantity::new(wit_end, ForcePerWidth, units),
        physical_layers: s.physical_layers,
        elements: profile.solver.elements,
        layers_per_element: profile.solver.grid.layers_per_element,
        zones,
        air_film_ratio: profile.air_film.map(|(start, end)| {
            (
                round_sig(start.ratio_to_roughness, 4),
                round_sig(end.ratio_to_roughness, 4),
            )
        }),
        warnings: profile.warnings.clone(),
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
