//! The case file: web, core, roll, winding settings, observed symptoms and answers to the
//! symptom questions. Parse (YAML, our own schema), validate, resolve against presets into SI,
//! and save atomically.
//!
//! Every quantity is a string with its unit (`"3 pli"`, `"76 um"`) or a plain number in SI
//! (m, N/m, Pa, m/s; °C for temperature; a fraction for percentages). The format is described
//! in docs/case-format.md.
//!
//! Guards: files over [`MAX_CASE_FILE_BYTES`] are refused before parsing; the YAML parser's own
//! limits on nesting depth (128) and alias expansion stop deep or "billion laughs" documents;
//! duplicate keys are refused everywhere.

use std::collections::BTreeMap;

use serde::{Deserialize, Serialize};

use crate::model::schedule::TensionStep;
use crate::model::{
    CoreStiffness, RadialStiffness, Taper, TensionSchedule, UpsetBand, WindingMethod,
};
use crate::presets::{self, Sourced};
use crate::units::{QuantityKind, UnitSystem, format_quantity, parse_quantity};

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

/// Largest case file accepted (bytes). Real cases are a few kilobytes; refusing anything larger
/// before parsing keeps a stray log file or a generated monster from eating memory.
pub const MAX_CASE_FILE_BYTES: u64 = 1024 * 1024;

/// Errors reading, validating, resolving or saving a case file. Every message names the file
/// (or origin), the field and what is accepted.
#[derive(Debug, thiserror::Error)]
pub enum CaseError {
    #[error("{origin}: {message}")]
    Invalid { origin: String, message: String },
    /// A unit error without a file name (prefer [`CaseError::Quantity`]). Boxed to keep the
    /// error small; `From<UnitError>` still works with `?`.
    #[error(transparent)]
    Unit(Box<crate::units::UnitError>),
    #[error("cannot read {path}: {source}")]
    Read {
        path: std::path::PathBuf,
        source: std::io::Error,
    },
    #[error(transparent)]
    Save(#[from] crate::fsutil::SaveError),
    /// The file is larger than [`MAX_CASE_FILE_BYTES`]; it was not parsed.
    #[error("{origin}: the file is {size} bytes; a case file may be at most {limit} bytes")]
    TooLarge {
        origin: String,
        size: u64,
        limit: u64,
    },
    /// The file is not UTF-8 text.
    #[error(
        "{origin}: line {line}: not UTF-8 text (bad byte at offset {offset}); save the case as UTF-8"
    )]
    NotUtf8 {
        origin: String,
        line: usize,
        offset: usize,
    },
    /// YAML that does not parse or does not fit the schema (wrong type, missing field,
    /// duplicate key, alias or nesting limits).
    #[error("{origin}: line {line}, column {column}: {message}")]
    Syntax {
        origin: String,
        line: usize,
        column: usize,
        message: String,
    },
    /// A key the schema does not know.
    #[error("{origin}: line {line}, column {column}: unknown key `{key}` in {section}{}; accepted keys: {accepted}", suggestion_text(.suggestion.as_deref()))]
    UnknownKey {
        origin: String,
        line: u32,
        column: u32,
        /// Where the key was found (`web`, `winding.taper`, `the top level`, ...).
        section: String,
        key: String,
        suggestion: Option<Box<str>>,
        accepted: Box<str>,
    },
    /// A quantity with a missing, unknown or wrong-kind unit.
    #[error("{origin}: {source}")]
    Quantity {
        origin: String,
        source: Box<crate::units::UnitError>,
    },
    /// A value outside its accepted range.
    #[error("{origin}: {field} = {given} is out of range; accepted: {accepted}")]
    OutOfRange {
        origin: String,
        field: String,
        given: String,
        accepted: String,
    },
    /// A name (symptom, place, preset, law, method, material) that is not in its list.
    #[error("{origin}: {field}: unknown {what} \"{given}\"{}; accepted: {accepted}", suggestion_text(*.suggestion))]
    UnknownName {
        origin: String,
        field: String,
        what: &'static str,
        given: Box<str>,
        suggestion: Option<&'static str>,
        accepted: Box<str>,
    },
}

impl From<crate::units::UnitError> for CaseError {
    fn from(error: crate::units::UnitError) -> Self {
        CaseError::Unit(Box::new(error))
    }
}

fn suggestion_text(suggestion: Option<&str>) -> String {
    match suggestion {
        Some(s) => format!(" (did you mean `{s}`?)"),
        None => String::new(),
    }
}

impl Case {
    /// Parse a case from YAML text; `origin` (usually the file name) is used in messages.
    pub fn from_yaml_str(text: &str, origin: &str) -> Result<Case, CaseError> {
        if text.len() as u64 > MAX_CASE_FILE_BYTES {
            return Err(CaseError::TooLarge {
                origin: origin.to_string(),
                size: text.len() as u64,
                limit: MAX_CASE_FILE_BYTES,
            });
        }
        // A generic pass first: it rejects duplicate keys anywhere (also inside `answers`, which
        // a typed map would silently overwrite) and applies the parser's nesting and
        // alias-expansion limits before any typed work.
        if let Err(error) = yaml::from_str::<yaml::Value>(text) {
            return Err(yaml_error(origin, text, &error));
        }
        yaml::from_str::<Case>(text).map_err(|error| yaml_error(origin, text, &error))
    }

    /// Parse a case from raw bytes (checks size and UTF-8 first).
    pub fn from_yaml_bytes(bytes: &[u8], origin: &str) -> Result<Case, CaseError> {
        if bytes.len() as u64 > MAX_CASE_FILE_BYTES {
            return Err(CaseError::TooLarge {
                origin: origin.to_string(),
                size: bytes.len() as u64,
                limit: MAX_CASE_FILE_BYTES,
            });
        }
        let text = std::str::from_utf8(bytes).map_err(|error| {
            let offset = error.valid_up_to();
            CaseError::NotUtf8 {
                origin: origin.to_string(),
                line: bytes[..offset].iter().filter(|b| **b == b'\n').count() + 1,
                offset,
            }
        })?;
        Case::from_yaml_str(text, origin)
    }

    /// Read and parse a case file. Files over [`MAX_CASE_FILE_BYTES`] are refused unread.
    pub fn load(path: &std::path::Path) -> Result<Case, CaseError> {
        use std::io::Read;
        let origin = path.display().to_string();
        let read_error = |source| CaseError::Read {
            path: path.to_path_buf(),
            source,
        };
        let file = std::fs::File::open(path).map_err(read_error)?;
        let size = file.metadata().map_err(read_error)?.len();
        if size > MAX_CASE_FILE_BYTES {
            return Err(CaseError::TooLarge {
                origin,
                size,
                limit: MAX_CASE_FILE_BYTES,
            });
        }
        // Read at most one byte past the limit, in case the file grows or is not a regular file.
        let mut bytes = Vec::new();
        file.take(MAX_CASE_FILE_BYTES + 1)
            .read_to_end(&mut bytes)
            .map_err(read_error)?;
        Case::from_yaml_bytes(&bytes, &origin)
    }

    /// The case as YAML text (the schema of this module).
    pub fn to_yaml_string(&self) -> Result<String, CaseError> {
        yaml::to_string(self).map_err(|error| CaseError::Invalid {
            origin: self.title.clone(),
            message: format!("cannot write the case as YAML: {error}"),
        })
    }

    /// Save atomically (temporary file + rename): a failed save leaves the old file intact.
    pub fn save(&self, path: &std::path::Path) -> Result<(), CaseError> {
        let text = self.to_yaml_string()?;
        crate::fsutil::save_atomic(path, text.as_bytes())?;
        Ok(())
    }

    /// Resolve units and presets into SI; lists the assumed values. Messages name the case by
    /// its title; use [`Case::resolve_as`] to name the file instead.
    pub fn resolve(&self) -> Result<ResolvedCase, CaseError> {
        self.resolve_as(&format!("case \"{}\"", self.title))
    }

    /// Resolve, naming `origin` (usually the file name) in every message.
    pub fn resolve_as(&self, origin: &str) -> Result<ResolvedCase, CaseError> {
        Resolver {
            origin: origin.to_string(),
            assumed: Vec::new(),
        }
        .resolve(self)
    }

    /// Load a file and resolve it, naming the file in every message.
    pub fn load_resolved(path: &std::path::Path) -> Result<ResolvedCase, CaseError> {
        Case::load(path)?.resolve_as(&path.display().to_string())
    }
}

/// A complete starting case for `web` and `core`, as commented YAML: every value written out
/// with its unit and, in a comment, where it came from. Edit the values you know.
pub fn starter_yaml(web: &presets::WebPreset, core: &presets::CorePreset) -> String {
    let q = |value: f64, kind: QuantityKind| format_quantity(value, kind, UnitSystem::Si);
    let line =
        |key: &str, value: String, source: &str| format!("  {key}: \"{value}\"  # {source}\n");
    let plain = |key: &str, value: f64, source: &str| format!("  {key}: {value}  # {source}\n");
    let mut out = String::new();
    out.push_str(
        "# rolltriage case file. Quantities are strings with a unit (\"76 um\", \"1.5 pli\")\n",
    );
    out.push_str("# or plain numbers in SI (m, N/m, Pa, m/s). See docs/case-format.md.\n");
    out.push_str(
        "# Values below come from generic presets: replace them with your own where you can.\n",
    );
    out.push_str("title: New case\n");
    out.push_str("description: What was seen, on which rolls, since when.\n");
    out.push_str(&format!("web:\n  preset: {}  # {}\n", web.id, web.name));
    out.push_str(&format!(
        "  material: {}  # paper, board, film, foil, nonwoven, laminate\n",
        web.material
    ));
    out.push_str(&line(
        "thickness",
        q(web.thickness.value, QuantityKind::Length),
        web.thickness.source,
    ));
    out.push_str(&line(
        "width",
        q(presets::DEFAULT_WIDTH.value, QuantityKind::Length),
        presets::DEFAULT_WIDTH.source,
    ));
    out.push_str(&line(
        "tangential_modulus",
        q(web.tangential_modulus.value, QuantityKind::Stress),
        web.tangential_modulus.source,
    ));
    out.push_str("  radial_stiffness:  # Pfeiffer (1966): P = K1·(exp(K2·strain) − 1)\n    law: pfeiffer  # pfeiffer, constant or power_law\n");
    out.push_str(&format!(
        "  {}",
        line("k1", q(web.k1.value, QuantityKind::Stress), web.k1.source)
    ));
    out.push_str(&format!("  {}", plain("k2", web.k2.value, web.k2.source)));
    out.push_str(&plain(
        "poisson_ratio",
        web.poisson_ratio.value,
        web.poisson_ratio.source,
    ));
    out.push_str(&plain("friction", web.friction.value, web.friction.source));
    out.push_str(&line(
        "roughness",
        q(web.roughness.value, QuantityKind::Length),
        web.roughness.source,
    ));
    out.push_str(&line(
        "strength",
        q(web.strength.value, QuantityKind::ForcePerWidth),
        web.strength.source,
    ));
    out.push_str(&format!("core:\n  preset: {}  # {}\n", core.id, core.name));
    out.push_str(&format!(
        "  material: {}  # paper, steel, aluminium, plastic, rigid\n",
        core.material
    ));
    out.push_str(&line(
        "inside_diameter",
        q(core.inside_diameter.value, QuantityKind::Length),
        core.inside_diameter.source,
    ));
    out.push_str(&line(
        "outside_diameter",
        q(core.outside_diameter.value, QuantityKind::Length),
        core.outside_diameter.source,
    ));
    out.push_str(&line(
        "modulus",
        q(core.modulus.value, QuantityKind::Stress),
        core.modulus.source,
    ));
    out.push_str(&plain(
        "poisson_ratio",
        core.poisson_ratio.value,
        core.poisson_ratio.source,
    ));
    out.push_str(&line(
        "crush_pressure",
        q(core.crush_pressure.value, QuantityKind::Stress),
        core.crush_pressure.source,
    ));
    out.push_str("roll:\n");
    out.push_str(&line(
        "diameter",
        q(presets::DEFAULT_ROLL_DIAMETER.value, QuantityKind::Length),
        "finished roll diameter; or give length instead",
    ));
    out.push_str("winding:\n  method: centre  # centre, surface or centre_surface\n");
    out.push_str(&line(
        "tension",
        q(web.typical_tension.value, QuantityKind::ForcePerWidth),
        web.typical_tension.source,
    ));
    out.push_str("  taper:\n    kind: linear  # none, linear, hyperbolic or steps\n    amount: \"20 %\"  # share of the starting tension taken off by the outside\n");
    out.push_str(
        "  nip_load: \"0 N/m\"  # rider or lay-on roll load per width; 0 when there is none\n",
    );
    out.push_str(&line(
        "speed",
        q(presets::DEFAULT_SPEED.value, QuantityKind::Speed),
        presets::DEFAULT_SPEED.source,
    ));
    out.push_str("  # upsets:  # bands wound at a different tension, e.g. after a splice\n");
    out.push_str(
        "  #   - {from_diameter: \"600 mm\", to_diameter: \"620 mm\", tension: \"3 pli\"}\n",
    );
    out.push_str("symptoms:  # IDs: ");
    out.push_str(&crate::vocabulary::SYMPTOM_IDS.join(", "));
    out.push_str("\n  - id: telescoping\n    where: body  # core, body, outside, edges or whole_roll\n    notes: How it looks and how many rolls.\n");
    out.push_str("notes: Anything else (shift, grade change, splice, storage).\n");
    out
}

/// Turn a YAML error into a message with line and column, rewriting serde's wording where a
/// winder operator would not follow it.
fn yaml_error(origin: &str, text: &str, error: &yaml::Error) -> CaseError {
    let mut message = error.to_string();
    // Some duplicate-key errors come without a usable position (line 1, column 1).
    let (line, column) = duplicate_key_location(text, &message)
        .or_else(|| error.location().map(|l| (l.line(), l.column())))
        .unwrap_or((1, 1));
    // serde_norway and libyaml put " at line L column C" into the text; we print the location
    // ourselves, once.
    while let Some(at) = message.find(" at line ") {
        let end = message[at..].find(',').map_or(message.len(), |i| at + i);
        message.replace_range(at..end, "");
    }
    // "web: unknown field `thikness`, expected one of `preset`, `material`, ..."
    if let Some(at) = message.find("unknown field `") {
        let section = message[..at].trim_end_matches(": ").trim().to_string();
        let rest = &message[at + "unknown field `".len()..];
        if let Some(end) = rest.find('`') {
            let key = rest[..end].to_string();
            let expected: Vec<&str> = rest[end + 1..]
                .split('`')
                .enumerate()
                .filter(|(i, _)| i % 2 == 1)
                .map(|(_, s)| s)
                .collect();
            let suggestion =
                crate::vocabulary::closest(&key, expected.iter().copied()).map(Box::from);
            return CaseError::UnknownKey {
                origin: origin.to_string(),
                line: u32::try_from(line).unwrap_or(u32::MAX),
                column: u32::try_from(column).unwrap_or(u32::MAX),
                section: if section.is_empty() {
                    "the top level".to_string()
                } else {
                    section
                },
                key,
                suggestion,
                accepted: if expected.is_empty() {
                    "none here".into()
                } else {
                    expected.join(", ").into()
                },
            };
        }
    }
    const UNTAGGED: &str = "data did not match any variant of untagged enum QuantityText";
    if let Some(at) = message.find(UNTAGGED) {
        // The parser loses the field name here but points at its key: read it from the text.
        let section = message[..at].trim_end_matches(": ").trim().to_string();
        let field = match key_at(text, line, column) {
            Some(key) if section.is_empty() => key,
            Some(key) => format!("{section}.{key}"),
            None => section,
        };
        message = format!(
            "{field}: expected a quantity: a string with its unit such as \"76 um\" or \"2 pli\", or a plain number in SI units"
        );
    }
    if message.contains("repetition limit exceeded") {
        message.push_str(" (too many YAML alias expansions; write the values out instead)");
    }
    if message.contains("recursion limit exceeded") {
        message.push_str(" (the YAML is nested too deeply for a case file)");
    }
    CaseError::Syntax {
        origin: origin.to_string(),
        line,
        column,
        message,
    }
}

/// The mapping key starting at 1-based `line`, `column`, if there is one.
fn key_at(text: &str, line: usize, column: usize) -> Option<String> {
    let row = text.lines().nth(line.checked_sub(1)?)?;
    let rest = row.get(column.checked_sub(1)?..)?;
    let key = rest.split(':').next()?.trim();
    let plain = !key.is_empty() && key.chars().all(|c| c.is_ascii_alphanumeric() || c == '_');
    plain.then(|| key.to_string())
}

/// The parser reports some duplicate keys without a position: find the second line that
/// starts with that key.
fn duplicate_key_location(text: &str, message: &str) -> Option<(usize, usize)> {
    let start = message.find("duplicate entry with key \"")? + "duplicate entry with key \"".len();
    let key = &message[start..start + message[start..].find('"')?];
    let mut seen = 0;
    for (index, line) in text.lines().enumerate() {
        let trimmed = line.trim_start();
        let rest = trimmed.strip_prefix(key).map(str::trim_start);
        if rest.is_some_and(|r| r.starts_with(':')) {
            seen += 1;
            if seen == 2 {
                return Some((index + 1, line.len() - trimmed.len() + 1));
            }
        }
    }
    None
}

/// Accepted range of a quantity: `min <= value <= max` (or `min < value` when `min_exclusive`).
struct Range {
    min: f64,
    max: f64,
    min_exclusive: bool,
    kind: Option<QuantityKind>,
}

const fn above(min: f64, max: f64, kind: QuantityKind) -> Range {
    Range {
        min,
        max,
        min_exclusive: true,
        kind: Some(kind),
    }
}

const fn from(min: f64, max: f64, kind: QuantityKind) -> Range {
    Range {
        min,
        max,
        min_exclusive: false,
        kind: Some(kind),
    }
}

const fn plain_above(min: f64, max: f64) -> Range {
    Range {
        min,
        max,
        min_exclusive: true,
        kind: None,
    }
}

const fn plain_from(min: f64, max: f64) -> Range {
    Range {
        min,
        max,
        min_exclusive: false,
        kind: None,
    }
}

impl Range {
    fn show(&self, value: f64) -> String {
        match self.kind {
            Some(kind) => format_quantity(value, kind, UnitSystem::Si),
            None => format!("{value}"),
        }
    }

    fn describe(&self) -> String {
        let low = if self.min_exclusive {
            format!("more than {}", self.show(self.min))
        } else {
            format!("at least {}", self.show(self.min))
        };
        format!("{low} and at most {}", self.show(self.max))
    }

    fn contains(&self, value: f64) -> bool {
        let low = if self.min_exclusive {
            value > self.min
        } else {
            value >= self.min
        };
        low && value <= self.max && value.is_finite()
    }
}

// Accepted ranges, documented in docs/case-format.md. Wide on purpose: they catch typing
// mistakes and wrong units, not unusual products.
const THICKNESS: Range = from(0.5e-6, 10e-3, QuantityKind::Length);
const WIDTH: Range = from(1e-3, 20.0, QuantityKind::Length);
const WEB_MODULUS: Range = from(1e6, 400e9, QuantityKind::Stress);
const K1: Range = above(0.0, 100e6, QuantityKind::Stress);
const K2: Range = plain_above(0.0, 1e5);
const RADIAL_MODULUS: Range = above(0.0, 400e9, QuantityKind::Stress);
const POWER_COEFFICIENT: Range = above(0.0, 1e12, QuantityKind::Stress);
const POWER_EXPONENT: Range = plain_from(0.0, 2.0);
const STACK_POISSON: Range = plain_from(0.0, 0.5);
const FRICTION: Range = plain_above(0.0, 2.0);
const ROUGHNESS: Range = from(0.0, 200e-6, QuantityKind::Length);
const STRENGTH: Range = above(0.0, 1e7, QuantityKind::ForcePerWidth);
const CORE_INSIDE: Range = from(0.0, 2.0, QuantityKind::Length);
const CORE_OUTSIDE: Range = from(5e-3, 2.0, QuantityKind::Length);
const CORE_MODULUS: Range = from(1e6, 400e9, QuantityKind::Stress);
const CORE_POISSON: Range = plain_from(0.0, 0.49);
const CORE_STIFFNESS: Range = above(0.0, 1e12, QuantityKind::Stress);
const CRUSH: Range = above(0.0, 1e9, QuantityKind::Stress);
const ROLL_DIAMETER: Range = above(0.0, 5.0, QuantityKind::Length);
const ROLL_LENGTH: Range = above(0.0, 1e8, QuantityKind::Length);
const TENSION: Range = above(0.0, 1e6, QuantityKind::ForcePerWidth);
const UPSET_TENSION: Range = from(0.0, 1e6, QuantityKind::ForcePerWidth);
const NIP: Range = from(0.0, 1e5, QuantityKind::ForcePerWidth);
const SPEED: Range = above(0.0, 60.0, QuantityKind::Speed);
const TEMPERATURE: Range = from(-60.0, 300.0, QuantityKind::Temperature);
const ACCELERATION: Range = plain_above(0.0, 3600.0);
const TAPER: Range = from(0.0, 1.0, QuantityKind::Percent);
/// Layer count above which a roll is refused as absurd: two million layers is already a 2 m
/// roll of 0.5 µm capacitor film.
pub const MAX_LAYERS: f64 = 2e6;

const WEB_MATERIALS: [&str; 6] = ["paper", "board", "film", "foil", "nonwoven", "laminate"];
const CORE_MATERIALS: [&str; 5] = ["paper", "steel", "aluminium", "plastic", "rigid"];
const RADIAL_LAWS: [&str; 3] = ["pfeiffer", "constant", "power_law"];
const METHODS: [&str; 3] = ["centre", "surface", "centre_surface"];
const TAPER_KINDS: [&str; 4] = ["none", "linear", "hyperbolic", "steps"];

struct Resolver {
    origin: String,
    assumed: Vec<AssumedValue>,
}

impl Resolver {
    fn unit_error(&self, source: crate::units::UnitError) -> CaseError {
        CaseError::Quantity {
            origin: self.origin.clone(),
            source: Box::new(source),
        }
    }

    fn invalid(&self, message: impl Into<String>) -> CaseError {
        CaseError::Invalid {
            origin: self.origin.clone(),
            message: message.into(),
        }
    }

    fn out_of_range(&self, field: &str, given: String, accepted: String) -> CaseError {
        CaseError::OutOfRange {
            origin: self.origin.clone(),
            field: field.to_string(),
            given,
            accepted,
        }
    }

    fn unknown_name(
        &self,
        field: &str,
        what: &'static str,
        given: &str,
        accepted: &[&'static str],
    ) -> CaseError {
        CaseError::UnknownName {
            origin: self.origin.clone(),
            field: field.to_string(),
            what,
            given: given.into(),
            suggestion: crate::vocabulary::closest(given, accepted.iter().copied()),
            accepted: accepted.join(", ").into(),
        }
    }

    /// Parse a quantity as written; `None` when absent.
    fn quantity(
        &self,
        field: &str,
        value: Option<&QuantityText>,
        kind: QuantityKind,
    ) -> Result<Option<f64>, CaseError> {
        match value {
            None => Ok(None),
            Some(QuantityText::Number(number)) => {
                if number.is_finite() {
                    Ok(Some(*number))
                } else {
                    Err(self.out_of_range(field, number.to_string(), "a finite number".to_string()))
                }
            }
            Some(QuantityText::Text(text)) => parse_quantity(field, text, kind)
                .map(Some)
                .map_err(|e| self.unit_error(e)),
        }
    }

    fn check(&self, field: &str, value: f64, range: &Range) -> Result<f64, CaseError> {
        if range.contains(value) {
            Ok(value)
        } else {
            Err(self.out_of_range(field, range.show(value), range.describe()))
        }
    }

    /// A quantity that must be in `range`, or the preset value (recorded as assumed).
    fn quantity_or(
        &mut self,
        field: &str,
        value: Option<&QuantityText>,
        range: &Range,
        fallback: Sourced,
        fallback_from: &str,
    ) -> Result<f64, CaseError> {
        let kind = range.kind.unwrap_or(QuantityKind::Percent);
        let value = self.quantity(field, value, kind)?;
        self.number_or(field, value, range, fallback, fallback_from)
    }

    /// A plain number that must be in `range`, or the preset value (recorded as assumed).
    fn number_or(
        &mut self,
        field: &str,
        value: Option<f64>,
        range: &Range,
        fallback: Sourced,
        fallback_from: &str,
    ) -> Result<f64, CaseError> {
        match value {
            Some(v) => self.check(field, v, range),
            None => Ok(self.assumed(field, range, fallback, fallback_from)),
        }
    }

    /// Record the preset value `fallback` of a missing `field` as assumed and return it.
    fn assumed(&mut self, field: &str, range: &Range, fallback: Sourced, from: &str) -> f64 {
        self.assume(field, range.show(fallback.value), from, fallback.source);
        fallback.value
    }

    fn assume(&mut self, field: &str, value: String, from: &str, source: &str) {
        let source = if from.is_empty() {
            source.to_string()
        } else {
            format!("{from}: {source}")
        };
        self.assumed.push(AssumedValue {
            field: field.to_string(),
            value,
            source,
        });
    }

    fn resolve(mut self, case: &Case) -> Result<ResolvedCase, CaseError> {
        if case.title.trim().is_empty() {
            return Err(self.invalid("title is empty; give the case a short title"));
        }
        let web = self.web(&case.web)?;
        if case.web.preset.is_none() {
            self.note_default_preset("web", web.preset.as_deref());
        }
        let core = self.core(&case.core, &web)?;
        if case.core.preset.is_none() {
            self.note_default_preset("core", core.preset.as_deref());
        }
        let roll = self.roll(&case.roll, &web, &core)?;
        let winding = self.winding(&case.winding, &web, &core, &roll)?;
        for (index, symptom) in case.symptoms.iter().enumerate() {
            if !crate::vocabulary::is_symptom(&symptom.id) {
                return Err(self.unknown_name(
                    &format!("symptoms[{index}].id"),
                    "symptom",
                    &symptom.id,
                    &crate::vocabulary::SYMPTOM_IDS,
                ));
            }
            if let Some(place) = &symptom.place
                && !crate::vocabulary::PLACES.contains(&place.as_str())
            {
                return Err(self.unknown_name(
                    &format!("symptoms[{index}].where"),
                    "place on the roll",
                    place,
                    &crate::vocabulary::PLACES,
                ));
            }
        }
        Ok(ResolvedCase {
            title: case.title.clone(),
            web,
            core,
            roll,
            winding,
            symptoms: case.symptoms.clone(),
            answers: case.answers.clone(),
            assumed: self.assumed,
        })
    }

    /// A preset chosen by default is listed as assumed only when some value actually came from
    /// it, so a case that gives every value resolves with nothing assumed.
    fn note_default_preset(&mut self, section: &str, id: Option<&str>) {
        let Some(id) = id else { return };
        let from = format!("preset {id}:");
        let prefix = format!("{section}.");
        let used = self
            .assumed
            .iter()
            .any(|a| a.field.starts_with(&prefix) && a.source.starts_with(&from));
        if used {
            self.assume(
                &format!("{section}.preset"),
                id.to_string(),
                "",
                &format!("default {section} preset for the material and size given; name one with {section}.preset"),
            );
        }
    }

    fn web(&mut self, web: &WebInput) -> Result<ResolvedWeb, CaseError> {
        if let Some(material) = &web.material
            && !WEB_MATERIALS.contains(&material.as_str())
        {
            return Err(self.unknown_name(
                "web.material",
                "web material",
                material,
                &WEB_MATERIALS,
            ));
        }
        let preset = match &web.preset {
            Some(id) => match presets::web_preset(id) {
                Some(p) => p,
                None => {
                    let ids: Vec<&'static str> =
                        presets::web_presets().iter().map(|p| p.id).collect();
                    return Err(self.unknown_name("web.preset", "web preset", id, &ids));
                }
            },
            None => presets::default_web_for_material(web.material.as_deref().unwrap_or("paper")),
        };
        let from = format!("preset {}", preset.id);
        let material = match &web.material {
            Some(m) => m.clone(),
            None => {
                self.assume(
                    "web.material",
                    preset.material.to_string(),
                    &from,
                    "material kind of the preset",
                );
                preset.material.to_string()
            }
        };
        let thickness = self.quantity_or(
            "web.thickness",
            web.thickness.as_ref(),
            &THICKNESS,
            preset.thickness,
            &from,
        )?;
        let width = self.quantity_or(
            "web.width",
            web.width.as_ref(),
            &WIDTH,
            presets::DEFAULT_WIDTH,
            "",
        )?;
        let tangential_modulus = self.quantity_or(
            "web.tangential_modulus",
            web.tangential_modulus.as_ref(),
            &WEB_MODULUS,
            preset.tangential_modulus,
            &from,
        )?;
        let radial_stiffness = match &web.radial_stiffness {
            Some(input) => self.radial_law(input)?,
            None => {
                let k1 =
                    self.quantity_or("web.radial_stiffness.k1", None, &K1, preset.k1, &from)?;
                let k2 = self.number_or("web.radial_stiffness.k2", None, &K2, preset.k2, &from)?;
                RadialStiffness::Pfeiffer { k1, k2 }
            }
        };
        let poisson_ratio = self.number_or(
            "web.poisson_ratio",
            web.poisson_ratio,
            &STACK_POISSON,
            preset.poisson_ratio,
            &from,
        )?;
        let friction = self.number_or(
            "web.friction",
            web.friction,
            &FRICTION,
            preset.friction,
            &from,
        )?;
        let roughness = self.quantity_or(
            "web.roughness",
            web.roughness.as_ref(),
            &ROUGHNESS,
            preset.roughness,
            &from,
        )?;
        let strength = self.quantity_or(
            "web.strength",
            web.strength.as_ref(),
            &STRENGTH,
            preset.strength,
            &from,
        )?;
        Ok(ResolvedWeb {
            preset: Some(preset.id.to_string()),
            material,
            thickness,
            width,
            tangential_modulus,
            radial_stiffness,
            poisson_ratio,
            friction,
            roughness,
            strength,
        })
    }

    fn radial_law(&mut self, input: &RadialStiffnessInput) -> Result<RadialStiffness, CaseError> {
        let law = input.law.as_str();
        let given: [(&str, bool); 5] = [
            ("k1", input.k1.is_some()),
            ("k2", input.k2.is_some()),
            ("modulus", input.modulus.is_some()),
            ("coefficient", input.coefficient.is_some()),
            ("exponent", input.exponent.is_some()),
        ];
        let needs: &[&str] = match law {
            "pfeiffer" => &["k1", "k2"],
            "constant" => &["modulus"],
            "power_law" => &["coefficient", "exponent"],
            other => {
                return Err(self.unknown_name(
                    "web.radial_stiffness.law",
                    "radial stiffness law",
                    other,
                    &RADIAL_LAWS,
                ));
            }
        };
        for (name, present) in given {
            if present && !needs.contains(&name) {
                return Err(self.invalid(format!(
                    "web.radial_stiffness.{name} is not used by law `{law}`; law `{law}` takes {}",
                    needs.join(" and ")
                )));
            }
            if !present && needs.contains(&name) {
                return Err(self.invalid(format!(
                    "web.radial_stiffness.{name} is required for law `{law}` (it takes {})",
                    needs.join(" and ")
                )));
            }
        }
        let missing = || self.invalid("web.radial_stiffness: a required constant is missing");
        Ok(match law {
            "pfeiffer" => {
                let k1 = self
                    .quantity(
                        "web.radial_stiffness.k1",
                        input.k1.as_ref(),
                        QuantityKind::Stress,
                    )?
                    .ok_or_else(missing)?;
                let k1 = self.check("web.radial_stiffness.k1", k1, &K1)?;
                let k2 = self.check(
                    "web.radial_stiffness.k2",
                    input.k2.ok_or_else(missing)?,
                    &K2,
                )?;
                RadialStiffness::Pfeiffer { k1, k2 }
            }
            "constant" => {
                let modulus = self
                    .quantity(
                        "web.radial_stiffness.modulus",
                        input.modulus.as_ref(),
                        QuantityKind::Stress,
                    )?
                    .ok_or_else(missing)?;
                RadialStiffness::Constant {
                    modulus: self.check(
                        "web.radial_stiffness.modulus",
                        modulus,
                        &RADIAL_MODULUS,
                    )?,
                }
            }
            _ => {
                let coefficient = self
                    .quantity(
                        "web.radial_stiffness.coefficient",
                        input.coefficient.as_ref(),
                        QuantityKind::Stress,
                    )?
                    .ok_or_else(missing)?;
                RadialStiffness::PowerLaw {
                    coefficient: self.check(
                        "web.radial_stiffness.coefficient",
                        coefficient,
                        &POWER_COEFFICIENT,
                    )?,
                    exponent: self.check(
                        "web.radial_stiffness.exponent",
                        input.exponent.ok_or_else(missing)?,
                        &POWER_EXPONENT,
                    )?,
                }
            }
        })
    }

    fn core(&mut self, core: &CoreInput, web: &ResolvedWeb) -> Result<ResolvedCore, CaseError> {
        let material_given = match core.material.as_deref() {
            Some("aluminum") => Some("aluminium"),
            Some(m) if CORE_MATERIALS.contains(&m) => Some(m),
            Some(m) => {
                return Err(self.unknown_name(
                    "core.material",
                    "core material",
                    m,
                    &CORE_MATERIALS,
                ));
            }
            None => None,
        };
        let outside_given = self.quantity(
            "core.outside_diameter",
            core.outside_diameter.as_ref(),
            QuantityKind::Length,
        )?;
        let inside_given = self.quantity(
            "core.inside_diameter",
            core.inside_diameter.as_ref(),
            QuantityKind::Length,
        )?;
        let preset = match &core.preset {
            Some(id) => match presets::core_preset(id) {
                Some(p) => p,
                None => {
                    let ids: Vec<&'static str> =
                        presets::core_presets().iter().map(|p| p.id).collect();
                    return Err(self.unknown_name("core.preset", "core preset", id, &ids));
                }
            },
            None => presets::default_core_for(material_given, &web.material, outside_given),
        };
        if let Some(m) = material_given
            && m != "rigid"
            && m != preset.material
        {
            return Err(self.invalid(format!(
                "core.material `{m}` does not match core.preset `{}` (a {} core); drop one of them or pick a {m} preset",
                preset.id, preset.material
            )));
        }
        let from = format!("preset {}", preset.id);
        let material = match material_given {
            Some(m) => m.to_string(),
            None => {
                self.assume(
                    "core.material",
                    preset.material.to_string(),
                    &from,
                    "material of the preset",
                );
                preset.material.to_string()
            }
        };
        let wall_twice = preset.outside_diameter.value - preset.inside_diameter.value;
        let (inside, outside) = match (inside_given, outside_given) {
            (Some(i), Some(o)) => (i, o),
            (None, Some(o)) => {
                let i = o - wall_twice;
                self.assume(
                    "core.inside_diameter",
                    format_quantity(i, QuantityKind::Length, UnitSystem::Si),
                    &from,
                    "outside diameter given minus the preset's wall",
                );
                (i, o)
            }
            (Some(i), None) => {
                let o = i + wall_twice;
                self.assume(
                    "core.outside_diameter",
                    format_quantity(o, QuantityKind::Length, UnitSystem::Si),
                    &from,
                    "inside diameter given plus the preset's wall",
                );
                (i, o)
            }
            (None, None) => (
                self.assumed(
                    "core.inside_diameter",
                    &CORE_INSIDE,
                    preset.inside_diameter,
                    &from,
                ),
                self.assumed(
                    "core.outside_diameter",
                    &CORE_OUTSIDE,
                    preset.outside_diameter,
                    &from,
                ),
            ),
        };
        let outside = self.check("core.outside_diameter", outside, &CORE_OUTSIDE)?;
        let inside = self.check("core.inside_diameter", inside, &CORE_INSIDE)?;
        if inside >= outside {
            return Err(self.out_of_range(
                "core.inside_diameter",
                CORE_INSIDE.show(inside),
                format!(
                    "less than the core outside diameter {}",
                    CORE_OUTSIDE.show(outside)
                ),
            ));
        }
        let stiffness = if let Some(text) = &core.stiffness {
            if core.modulus.is_some() {
                return Err(self.invalid(
                    "core.stiffness (measured) and core.modulus are both given; keep one",
                ));
            }
            let ec = self
                .quantity("core.stiffness", Some(text), QuantityKind::Stress)?
                .unwrap_or(f64::NAN);
            CoreStiffness::Measured {
                stiffness: self.check("core.stiffness", ec, &CORE_STIFFNESS)?,
            }
        } else if material == "rigid" {
            if core.modulus.is_some() {
                return Err(
                    self.invalid("core.modulus is given but core.material is `rigid`; keep one")
                );
            }
            CoreStiffness::Rigid
        } else {
            let modulus = self.quantity_or(
                "core.modulus",
                core.modulus.as_ref(),
                &CORE_MODULUS,
                preset.modulus,
                &from,
            )?;
            let poisson_ratio = self.number_or(
                "core.poisson_ratio",
                core.poisson_ratio,
                &CORE_POISSON,
                preset.poisson_ratio,
                &from,
            )?;
            CoreStiffness::Hollow {
                inner_radius: inside / 2.0,
                outer_radius: outside / 2.0,
                modulus,
                poisson_ratio,
            }
        };
        let crush_pressure = self.quantity_or(
            "core.crush_pressure",
            core.crush_pressure.as_ref(),
            &CRUSH,
            preset.crush_pressure,
            &from,
        )?;
        Ok(ResolvedCore {
            preset: Some(preset.id.to_string()),
            material,
            inside_diameter: inside,
            outside_diameter: outside,
            stiffness,
            crush_pressure,
        })
    }

    fn roll(
        &mut self,
        roll: &RollInput,
        web: &ResolvedWeb,
        core: &ResolvedCore,
    ) -> Result<ResolvedRoll, CaseError> {
        let core_radius = core.outside_diameter / 2.0;
        let diameter = self.quantity(
            "roll.diameter",
            roll.diameter.as_ref(),
            QuantityKind::Length,
        )?;
        let length = self.quantity("roll.length", roll.length.as_ref(), QuantityKind::Length)?;
        // Wound length of an ideal stack: L = π·(R² − rc²)/h.
        let length_of = |d: f64| {
            std::f64::consts::PI * ((d / 2.0).powi(2) - core_radius.powi(2)) / web.thickness
        };
        let (diameter, length) = match (diameter, length) {
            (Some(d), given_length) => {
                let d = self.check("roll.diameter", d, &ROLL_DIAMETER)?;
                if d <= core.outside_diameter {
                    return Err(self.out_of_range(
                        "roll.diameter",
                        ROLL_DIAMETER.show(d),
                        format!(
                            "larger than the core outside diameter {} (the core is bigger than the roll)",
                            CORE_OUTSIDE.show(core.outside_diameter)
                        ),
                    ));
                }
                // The length derived from a given diameter is informational (the model works
                // on radii), so it is not listed as assumed.
                let length = match given_length {
                    Some(l) => self.check("roll.length", l, &ROLL_LENGTH)?,
                    None => length_of(d),
                };
                (d, length)
            }
            (None, Some(l)) => {
                let l = self.check("roll.length", l, &ROLL_LENGTH)?;
                let d =
                    2.0 * (core_radius.powi(2) + l * web.thickness / std::f64::consts::PI).sqrt();
                self.assume(
                    "roll.diameter",
                    ROLL_DIAMETER.show(d),
                    "",
                    "computed from the length and the caliper: R = √(rc² + L·h/π)",
                );
                (self.check("roll.diameter", d, &ROLL_DIAMETER)?, l)
            }
            (None, None) => {
                let fallback = presets::DEFAULT_ROLL_DIAMETER;
                if fallback.value <= core.outside_diameter {
                    return Err(self.invalid(
                        "roll.diameter is needed: the core is larger than the default roll",
                    ));
                }
                let d = self.assumed("roll.diameter", &ROLL_DIAMETER, fallback, "");
                let l = length_of(d);
                self.assume(
                    "roll.length",
                    ROLL_LENGTH.show(l),
                    "",
                    "computed from the diameters and the caliper: L = π(R² − rc²)/h",
                );
                (d, l)
            }
        };
        let layers = (diameter / 2.0 - core_radius) / web.thickness;
        if layers > MAX_LAYERS {
            return Err(self.out_of_range(
                "roll.diameter",
                ROLL_DIAMETER.show(diameter),
                format!(
                    "a build of at most {MAX_LAYERS:e} layers of this caliper ({} would be {layers:.3e} layers)",
                    THICKNESS.show(web.thickness)
                ),
            ));
        }
        Ok(ResolvedRoll {
            outer_diameter: diameter,
            length,
        })
    }

    /// A diameter inside the wound part of the roll, returned as a radius.
    fn radius_in_roll(
        &self,
        field: &str,
        value: &QuantityText,
        core: &ResolvedCore,
        roll: &ResolvedRoll,
    ) -> Result<f64, CaseError> {
        let d = self
            .quantity(field, Some(value), QuantityKind::Length)?
            .unwrap_or(f64::NAN);
        let range = from(
            core.outside_diameter,
            roll.outer_diameter,
            QuantityKind::Length,
        );
        Ok(self.check(field, d, &range)? / 2.0)
    }

    fn tension_below_strength(
        &self,
        field: &str,
        value: f64,
        web: &ResolvedWeb,
        range: &Range,
    ) -> Result<f64, CaseError> {
        let value = self.check(field, value, range)?;
        if value >= web.strength {
            return Err(self.out_of_range(
                field,
                range.show(value),
                format!(
                    "less than the web strength {} (the web would break)",
                    STRENGTH.show(web.strength)
                ),
            ));
        }
        Ok(value)
    }

    /// The `tension` of a listed band (a taper step or an upset) at `{field}.tension`: a
    /// required force per width, in `range` and below the web strength.
    fn band_tension(
        &self,
        field: &str,
        text: &QuantityText,
        web: &ResolvedWeb,
        range: &Range,
    ) -> Result<f64, CaseError> {
        let field = format!("{field}.tension");
        let tension = self
            .quantity(&field, Some(text), QuantityKind::ForcePerWidth)?
            .unwrap_or(f64::NAN);
        self.tension_below_strength(&field, tension, web, range)
    }

    fn winding(
        &mut self,
        winding: &WindingInput,
        web: &ResolvedWeb,
        core: &ResolvedCore,
        roll: &ResolvedRoll,
    ) -> Result<ResolvedWinding, CaseError> {
        let method = match winding.method.as_deref() {
            Some("centre" | "center") => WindingMethod::Centre,
            Some("surface") => WindingMethod::Surface,
            Some("centre_surface" | "center_surface" | "centre-surface" | "center-surface") => {
                WindingMethod::CentreSurface
            }
            Some(other) => {
                return Err(self.unknown_name("winding.method", "winding method", other, &METHODS));
            }
            None => {
                self.assume(
                    "winding.method",
                    "centre".to_string(),
                    "",
                    "default: centre winding",
                );
                WindingMethod::Centre
            }
        };
        let preset_id = web.preset.clone().unwrap_or_default();
        let typical = presets::web_preset(&preset_id)
            .map(|p| p.typical_tension)
            .unwrap_or(presets::web_presets()[0].typical_tension);
        let start_tension = match self.quantity(
            "winding.tension",
            winding.tension.as_ref(),
            QuantityKind::ForcePerWidth,
        )? {
            Some(t) => t,
            None => {
                self.assume(
                    "winding.tension",
                    TENSION.show(typical.value),
                    &format!("preset {preset_id}"),
                    typical.source,
                );
                typical.value
            }
        };
        let start_tension =
            self.tension_below_strength("winding.tension", start_tension, web, &TENSION)?;
        let taper = match &winding.taper {
            None => {
                self.assume(
                    "winding.taper.kind",
                    "none".to_string(),
                    "",
                    "default: constant tension",
                );
                Taper::None
            }
            Some(taper) => self.taper(taper, web, core, roll)?,
        };
        let mut upsets = Vec::with_capacity(winding.upsets.len());
        for (index, upset) in winding.upsets.iter().enumerate() {
            let field = format!("winding.upsets[{index}]");
            let from_radius = self.radius_in_roll(
                &format!("{field}.from_diameter"),
                &upset.from_diameter,
                core,
                roll,
            )?;
            let to_radius = self.radius_in_roll(
                &format!("{field}.to_diameter"),
                &upset.to_diameter,
                core,
                roll,
            )?;
            if to_radius <= from_radius {
                return Err(self.out_of_range(
                    &format!("{field}.to_diameter"),
                    CORE_OUTSIDE.show(2.0 * to_radius),
                    format!(
                        "larger than from_diameter {}",
                        CORE_OUTSIDE.show(2.0 * from_radius)
                    ),
                ));
            }
            let tension = self.band_tension(&field, &upset.tension, web, &UPSET_TENSION)?;
            upsets.push(UpsetBand {
                from_radius,
                to_radius,
                tension,
            });
        }
        let nip_load = match self.quantity(
            "winding.nip_load",
            winding.nip_load.as_ref(),
            QuantityKind::ForcePerWidth,
        )? {
            Some(n) => Some(self.check("winding.nip_load", n, &NIP)?),
            None => {
                self.assume(
                    "winding.nip_load",
                    "none".to_string(),
                    "",
                    "default: no nip or rider roll, so no nip-induced tension",
                );
                None
            }
        };
        let speed = self.quantity_or(
            "winding.speed",
            winding.speed.as_ref(),
            &SPEED,
            presets::DEFAULT_SPEED,
            "",
        )?;
        let temperature = match self.quantity(
            "winding.temperature",
            winding.temperature.as_ref(),
            QuantityKind::Temperature,
        )? {
            Some(t) => Some(self.check("winding.temperature", t, &TEMPERATURE)?),
            None => None,
        };
        let acceleration_time = match winding.acceleration_time {
            Some(t) => Some(self.check("winding.acceleration_time", t, &ACCELERATION)?),
            None => None,
        };
        Ok(ResolvedWinding {
            method,
            tension: TensionSchedule {
                start_tension,
                taper,
                upsets,
            },
            nip_load,
            speed,
            temperature,
            acceleration_time,
        })
    }

    fn taper(
        &mut self,
        taper: &TaperInput,
        web: &ResolvedWeb,
        core: &ResolvedCore,
        roll: &ResolvedRoll,
    ) -> Result<Taper, CaseError> {
        let kind = taper.kind.as_str();
        if !TAPER_KINDS.contains(&kind) {
            return Err(self.unknown_name("winding.taper.kind", "taper kind", kind, &TAPER_KINDS));
        }
        if kind != "steps" && !taper.steps.is_empty() {
            return Err(self.invalid(format!(
                "winding.taper.steps are given but winding.taper.kind is `{kind}`; use kind `steps`"
            )));
        }
        let fraction = |this: &mut Self| -> Result<f64, CaseError> {
            let field = "winding.taper.amount";
            match this.quantity(field, taper.amount.as_ref(), QuantityKind::Percent)? {
                Some(f) => {
                    if f > 1.0 {
                        return Err(this.out_of_range(
                            field,
                            TAPER.show(f),
                            "0 % to 100 % (a taper cannot take away more than all of the tension)"
                                .into(),
                        ));
                    }
                    this.check(field, f, &TAPER)
                }
                None => Err(this.invalid(format!(
                    "{field} is required for a {kind} taper, e.g. amount: \"25 %\""
                ))),
            }
        };
        match kind {
            "none" => {
                if taper.amount.is_some() {
                    return Err(
                        self.invalid("winding.taper.amount is given but the taper kind is `none`")
                    );
                }
                Ok(Taper::None)
            }
            "linear" => Ok(Taper::Linear {
                fraction: fraction(self)?,
            }),
            "hyperbolic" => Ok(Taper::Hyperbolic {
                fraction: fraction(self)?,
            }),
            _ => {
                if taper.amount.is_some() {
                    return Err(self.invalid(
                        "winding.taper.amount is not used by a `steps` taper; give the tension of each step",
                    ));
                }
                if taper.steps.is_empty() {
                    return Err(self.invalid(
                        "winding.taper.steps is empty; a `steps` taper needs at least one step",
                    ));
                }
                let mut steps = Vec::with_capacity(taper.steps.len());
                let mut last_radius = 0.0;
                for (index, step) in taper.steps.iter().enumerate() {
                    let field = format!("winding.taper.steps[{index}]");
                    let radius = self.radius_in_roll(
                        &format!("{field}.from_diameter"),
                        &step.from_diameter,
                        core,
                        roll,
                    )?;
                    if index > 0 && radius <= last_radius {
                        return Err(self.out_of_range(
                            &format!("{field}.from_diameter"),
                            CORE_OUTSIDE.show(2.0 * radius),
                            format!(
                                "larger than the previous step's diameter {} (list steps from the core outward)",
                                CORE_OUTSIDE.show(2.0 * last_radius)
                            ),
                        ));
                    }
                    last_radius = radius;
                    let tension = self.band_tension(&field, &step.tension, web, &TENSION)?;
                    steps.push(TensionStep { radius, tension });
                }
                Ok(Taper::Steps { steps })
            }
        }
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
                ..Default::default()
            },
            options,
        }
    }
}
