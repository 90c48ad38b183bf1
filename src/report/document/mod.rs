//! The report's document model: every number already formatted with its unit next to its SI
//! value, so Markdown, HTML and JSON say exactly the same thing. This module owns the document
//! type, its quantities and the assembly ([`build_document`]); the sections live in
//! [`inputs`] (the case and its given or assumed inputs), [`stress`] (the stress summary and
//! zones), [`comparison`] (a remedy applied and re-solved) and [`margins`] (the margins
//! against each failure).

mod comparison;
mod inputs;
mod margins;
mod stress;

pub use comparison::{MarginComparison, RemedyComparisonSummary, margin_comparison};
pub use inputs::{ASSUMED_DISCOUNT, AssumedShare, CaseSummary, InputLine, assumed_summary};
pub use margins::{MarginLine, MarginsSection, margins_section};
pub use stress::{StressSummary, ZoneSummary, stress_summary};

use serde::{Deserialize, Serialize};

use super::{ReportError, ReportInput, ReportMeta};
use crate::diagnose::{Caution, MergedRemedy};
use crate::model::Profile;
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

pub(crate) use crate::units::round_sig;

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
    /// Margins against each failure mechanism (demand against capacity at every interface).
    #[serde(default)]
    pub margins: MarginsSection,
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
    /// What the roll says about its winding: the inverse estimate of the wound-in tension;
    /// absent when it was not worked out.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub estimate: Option<EstimateSection>,
}

/// The inverse estimate of the wound-in tension in the report's units, as `rolltriage compare`
/// prints it, or the reason it could not be made.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct EstimateSection {
    /// Plain-words lines; lines indented by two spaces detail the line before (fit residuals).
    pub lines: Vec<String>,
    /// Why no estimate could be made; absent when one was.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub not_estimated: Option<String>,
    /// The full estimate in SI units, for other systems; absent when none was made.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub fit: Option<crate::evidence::InverseEstimate>,
}

impl EstimateSection {
    fn new(
        estimate: &Result<crate::evidence::InverseEstimate, String>,
        units: UnitSystem,
    ) -> EstimateSection {
        match estimate {
            Ok(fit) => EstimateSection {
                lines: fit.lines_in(units),
                not_estimated: None,
                fit: Some(fit.clone()),
            },
            Err(reason) => EstimateSection {
                lines: vec![format!("Not estimated: {reason}")],
                not_estimated: Some(reason.clone()),
                fit: None,
            },
        }
    }
}

/// At most this many profile points go into a report (enough to redraw the curves).
pub const PROFILE_POINTS: usize = 60;

/// Build the format-neutral document.
pub fn build_document(input: &ReportInput) -> Result<ReportDocument, ReportError> {
    if input.profile.radius.is_empty() {
        return Err(ReportError::EmptyProfile);
    }
    let units = input.units;
    let case = inputs::case_summary(input);
    let stress = stress_summary(&input.resolved, &input.profile, units);
    let causes = cause_entries(input, units);
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
    let remedy_comparison = comparison::remedy_comparison(input, units);
    Ok(ReportDocument {
        schema: "rolltriage-report/2".to_string(),
        meta: input.meta.clone(),
        case,
        stress,
        margins: margins_section(&input.resolved, &input.profile, units),
        causes,
        remedies,
        cautions: input.diagnosis.cautions.clone(),
        indicators,
        remedy_comparison,
        similar_past: input.similar_past.clone(),
        complaint: complaint_lines(input),
        model_limits: MODEL_LIMITS.iter().map(|s| s.to_string()).collect(),
        profile: thin_profile(&input.profile, PROFILE_POINTS),
        measured: measured_section(input, units),
        sensitivity: input.sensitivity.clone().filter(|s| !s.is_empty()),
    })
}

/// The ranked causes, numbered, with their reasons.
fn cause_entries(input: &ReportInput, units: UnitSystem) -> Vec<CauseEntry> {
    input
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
        .collect()
}

/// The complaint record's lines, confirmed causes by their titles as the ranking names them
/// (plain words for a cause the ranking does not list); none without a record.
fn complaint_lines(input: &ReportInput) -> Vec<(String, String)> {
    input
        .case
        .complaint
        .as_ref()
        .map(|c| {
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
        .unwrap_or_default()
}

/// Measured against computed, when the case has measurements.
fn measured_section(input: &ReportInput, units: UnitSystem) -> Option<MeasuredSection> {
    input
        .diagnosis
        .evidence
        .as_ref()
        .filter(|e| !e.is_empty())
        .map(|e| MeasuredSection {
            rows: e.rows_in(units),
            lines: e.lines_in(units),
            evidence: e.clone(),
            estimate: input
                .estimate
                .as_ref()
                .map(|estimate| EstimateSection::new(estimate, units)),
        })
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
