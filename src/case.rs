//! The case file: web, core, roll, winding settings, observed symptoms and answers to the
//! symptom questions. Parse (YAML, our own schema), validate, resolve against presets into SI,
//! and save atomically.
//!
//! Every quantity is a string with its unit (`"3 pli"`, `"76 um"`) or a plain number in SI.

use std::collections::BTreeMap;

use serde::{Deserialize, Serialize};

/// A quantity as written in a case file: a string with a unit, or a number in SI.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(untagged)]
pub enum QuantityText {
    Number(f64),
    Text(String),
}

/// The case file as written (before presets and unit conversion).
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Case {
    pub title: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub description: Option<String>,
    #[serde(default)]
    pub web: WebInput,
    #[serde(default)]
    pub core: CoreInput,
    #[serde(default)]
    pub roll: RollInput,
    #[serde(default)]
    pub winding: WindingInput,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub symptoms: Vec<ObservedSymptom>,
    /// Answers to symptom questions, by question ID ("yes" / "no" / "unknown" / a choice ID).
    #[serde(default, skip_serializing_if = "BTreeMap::is_empty")]
    pub answers: BTreeMap<String, String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub notes: Option<String>,
}

#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WebInput {
    /// Preset ID (see `presets`), e.g. `newsprint`, `pet_film`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub preset: Option<String>,
    /// Material kind: paper, board, film, foil, nonwoven, laminate.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub material: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub thickness: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub width: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub tangential_modulus: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub radial_stiffness: Option<RadialStiffnessInput>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub poisson_ratio: Option<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub friction: Option<f64>,
    /// RMS roughness of one surface.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub roughness: Option<QuantityText>,
    /// Tensile strength per unit width (force per width).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub strength: Option<QuantityText>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RadialStiffnessInput {
    /// `pfeiffer`, `constant` or `power_law`.
    pub law: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub k1: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub k2: Option<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub modulus: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub coefficient: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub exponent: Option<f64>,
}

#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CoreInput {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub preset: Option<String>,
    /// paper, steel, aluminium, plastic, rigid.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub material: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub inside_diameter: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub outside_diameter: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub modulus: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub poisson_ratio: Option<f64>,
    /// Measured effective core stiffness Ec, overrides modulus/geometry.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub stiffness: Option<QuantityText>,
    /// Rated crush pressure (external radial pressure the core carries).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub crush_pressure: Option<QuantityText>,
}

#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RollInput {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub diameter: Option<QuantityText>,
    /// Wound length; used when diameter is not given.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub length: Option<QuantityText>,
}

#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WindingInput {
    /// centre, surface, centre_surface.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub method: Option<String>,
    /// Web tension at the start of the roll (force per width).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub tension: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub taper: Option<TaperInput>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub nip_load: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub speed: Option<QuantityText>,
    /// Bands of diameter wound at a different tension.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub upsets: Vec<UpsetInput>,
    /// Web temperature at the winder.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub temperature: Option<QuantityText>,
    /// Time to reach line speed (acceleration torque check), e.g. "20 s" as a plain number of seconds.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub acceleration_time: Option<f64>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TaperInput {
    /// none, linear, hyperbolic, steps.
    pub kind: String,
    /// Taper amount in percent ("25 %"), for linear and hyperbolic.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub amount: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub steps: Vec<StepInput>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct StepInput {
    pub from_diameter: QuantityText,
    pub tension: QuantityText,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct UpsetInput {
    pub from_diameter: QuantityText,
    pub to_diameter: QuantityText,
    pub tension: QuantityText,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ObservedSymptom {
    /// Symptom ID from `vocabulary::SYMPTOM_IDS`.
    pub id: String,
    /// core, body, outside, edges, whole_roll.
    #[serde(default, rename = "where", skip_serializing_if = "Option::is_none")]
    pub place: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub notes: Option<String>,
}

/// A case resolved into SI with presets applied: what the model and the rules consume.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ResolvedCase {
    pub title: String,
    pub web: ResolvedWeb,
    pub core: ResolvedCore,
    pub roll: ResolvedRoll,
    pub winding: ResolvedWinding,
    pub symptoms: Vec<ObservedSymptom>,
    pub answers: BTreeMap<String, String>,
    /// Values that were not given and came from a preset or default.
    pub assumed: Vec<AssumedValue>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ResolvedWeb {
    /// Preset ID used for missing values, if any.
    pub preset: Option<String>,
    /// paper, board, film, foil, nonwoven, laminate.
    pub material: String,
    /// m
    pub thickness: f64,
    /// m
    pub width: f64,
    /// Pa
    pub tangential_modulus: f64,
    pub radial_stiffness: crate::model::RadialStiffness,
    pub poisson_ratio: f64,
    pub friction: f64,
    /// RMS roughness of one surface, m
    pub roughness: f64,
    /// Tensile strength per width, N/m
    pub strength: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ResolvedCore {
    pub preset: Option<String>,
    pub material: String,
    /// m
    pub inside_diameter: f64,
    /// m
    pub outside_diameter: f64,
    pub stiffness: crate::model::CoreStiffness,
    /// Pa
    pub crush_pressure: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ResolvedRoll {
    /// m
    pub outer_diameter: f64,
    /// Wound length, m
    pub length: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ResolvedWinding {
    pub method: crate::model::WindingMethod,
    pub tension: crate::model::TensionSchedule,
    /// N/m
    pub nip_load: Option<f64>,
    /// m/s
    pub speed: f64,
    /// °C
    pub temperature: Option<f64>,
    /// s
    pub acceleration_time: Option<f64>,
}

/// One value that was not in the case file.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct AssumedValue {
    /// Dotted field path, e.g. `web.tangential_modulus`.
    pub field: String,
    /// The value used, formatted with its unit.
    pub value: String,
    /// Where it came from: preset ID and the value's source note.
    pub source: String,
}

/// Errors reading, validating, resolving or saving a case file. Every message names the file
/// (or origin), the field and what is accepted.
#[derive(Debug, thiserror::Error)]
pub enum CaseError {
    #[error("{origin}: {message}")]
    Invalid { origin: String, message: String },
    #[error(transparent)]
    Unit(#[from] crate::units::UnitError),
    #[error("cannot read {path}: {source}")]
    Read {
        path: std::path::PathBuf,
        source: std::io::Error,
    },
    #[error(transparent)]
    Save(#[from] crate::fsutil::SaveError),
}

impl Case {
    /// Parse a case from YAML text; `origin` (usually the file name) is used in messages.
    pub fn from_yaml_str(_text: &str, origin: &str) -> Result<Case, CaseError> {
        Err(CaseError::Invalid {
            origin: origin.to_string(),
            message: "case parsing not implemented yet".into(),
        })
    }

    /// Read and parse a case file.
    pub fn load(path: &std::path::Path) -> Result<Case, CaseError> {
        let text = std::fs::read_to_string(path).map_err(|source| CaseError::Read {
            path: path.to_path_buf(),
            source,
        })?;
        Case::from_yaml_str(&text, &path.display().to_string())
    }

    /// Resolve units and presets into SI; lists the assumed values.
    pub fn resolve(&self) -> Result<ResolvedCase, CaseError> {
        Err(CaseError::Invalid {
            origin: self.title.clone(),
            message: "case resolution not implemented yet".into(),
        })
    }
}

impl ResolvedCase {
    /// The mechanics problem for this case.
    pub fn problem(&self, options: crate::model::SolverOptions) -> crate::model::WindingProblem {
        crate::model::WindingProblem {
            core_radius: self.core.outside_diameter / 2.0,
            outer_radius: self.roll.outer_diameter / 2.0,
            thickness: self.web.thickness,
            tangential_modulus: self.web.tangential_modulus,
            radial_stiffness: self.web.radial_stiffness,
            poisson_ratio: self.web.poisson_ratio,
            core: self.core.stiffness,
            winding: crate::model::WindingSetup {
                method: self.winding.method,
                tension: self.winding.tension.clone(),
                nip_load: self.winding.nip_load,
                friction: self.web.friction,
                speed: self.winding.speed,
                // Two contacting surfaces of the same web: RMS roughnesses add in quadrature.
                combined_roughness: self.web.roughness * std::f64::consts::SQRT_2,
            },
            options,
        }
    }
}
