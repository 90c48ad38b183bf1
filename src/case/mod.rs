//! The case file: web, core, roll, winding settings, observed symptoms and answers to the
//! symptom questions. Parse (YAML, our own schema), validate, resolve against presets into SI,
//! and save atomically.
//!
//! Every quantity is a string with its unit (`"3 pli"`, `"76 um"`) or a plain number in SI
//! (m, N/m, Pa, m/s; °C for temperature; a fraction for percentages). The format is described
//! in docs/case-format.md.
//!
//! The parts: [`schema`] (the structs as written), [`yaml_guard`] (size, duplicate-key, nesting
//! and alias guards, and error locating), [`registry`] (every field's path, label, range,
//! default, help and example), `resolve` (into SI), [`resolved`] (the result), [`starter`]
//! (`case new`). Loading and saving are here.
//!
//! Guards: files over [`MAX_CASE_FILE_BYTES`] are refused before parsing; the YAML parser's own
//! limits on nesting depth (128) and alias expansion stop deep or "billion laughs" documents;
//! duplicate keys are refused everywhere.

pub mod edit;
pub mod measurements;
pub mod registry;
mod resolve;
pub mod resolved;
pub mod schema;
pub mod starter;
pub mod yaml_guard;

pub use registry::MAX_LAYERS;
pub use resolved::{
    AssumedValue, ResolvedCase, ResolvedCore, ResolvedRoll, ResolvedWeb, ResolvedWinding,
    ValueOrigin,
};
pub use schema::{
    Case, CoreInput, DrumsInput, NipPointInput, ObservedSymptom, QuantityText,
    RadialStiffnessInput, RollInput, StepInput, TaperInput, TensionPointInput, UpsetInput,
    WebInput, WindingInput,
};
pub use starter::starter_yaml;

/// Largest case file accepted (bytes). Real cases are a few kilobytes; refusing anything larger
/// before parsing keeps a stray log file or a generated monster from eating memory.
pub const MAX_CASE_FILE_BYTES: u64 = crate::fsutil::MAX_INPUT_FILE_BYTES;

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
    /// The field is not called `source` on purpose: the message already includes it, and an
    /// error chain printer (`{:#}`) would print it a second time.
    #[error("cannot read {path}: {error}")]
    Read {
        path: std::path::PathBuf,
        error: std::io::Error,
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
    /// As for `Read`, the unit error is part of the message, not a separate cause.
    #[error("{origin}: {error}")]
    Quantity {
        origin: String,
        error: Box<crate::units::UnitError>,
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

/// Check a radial stiffness law as a case file's `web.radial_stiffness` accepts it (ranges of
/// the field registry and the model's own check). Material libraries hold the same law and are
/// checked with this, so a library entry is always one a case can use.
pub fn check_radial_stiffness(
    origin: &str,
    input: &RadialStiffnessInput,
) -> Result<crate::model::RadialStiffness, CaseError> {
    resolve::Resolver::check_radial_law(origin, input)
}

/// Check a caliper (web thickness) as a case file's `web.thickness` accepts it.
pub fn check_caliper(origin: &str, value: &QuantityText) -> Result<f64, CaseError> {
    resolve::Resolver::check_thickness(origin, value)
}

impl Case {
    /// Parse a case from YAML text; `origin` (usually the file name) is used in messages.
    pub fn from_yaml_str(text: &str, origin: &str) -> Result<Case, CaseError> {
        yaml_guard::parse_guarded(text, origin)
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
        Case::load_with_text(path).map(|(case, _)| case)
    }

    /// [`Case::load`], also returning the file's text so that a later resolve error can name
    /// the line of its field ([`Case::resolve_in_file`]).
    pub fn load_with_text(path: &std::path::Path) -> Result<(Case, String), CaseError> {
        use std::io::Read;
        let origin = path.display().to_string();
        let read_error = |error| CaseError::Read {
            path: path.to_path_buf(),
            error,
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
        let case = Case::from_yaml_bytes(&bytes, &origin)?;
        // UTF-8 was checked by `from_yaml_bytes`.
        let text = String::from_utf8(bytes).unwrap_or_default();
        Ok((case, text))
    }

    /// The case as YAML text (the schema of this module).
    pub fn to_yaml_string(&self) -> Result<String, CaseError> {
        yaml::to_string(self).map_err(|error| CaseError::Invalid {
            origin: "the case".to_string(),
            message: format!("cannot write the case as YAML: {error}"),
        })
    }

    /// Save atomically (temporary file + rename): a failed save leaves the old file intact.
    /// An existing case file is edited in place, keeping its comments and layout (see
    /// [`edit`]); the answer says how the file was written.
    pub fn save(&self, path: &std::path::Path) -> Result<SaveHow, CaseError> {
        let plan = self.save_plan(path)?;
        plan.write(path)?;
        Ok(plan.how)
    }

    /// What [`Case::save`] would write to `path`, without writing: the text and how it was
    /// made. Lets a caller ask before comments are dropped.
    pub fn save_plan(&self, path: &std::path::Path) -> Result<SavePlan, CaseError> {
        let old = match std::fs::metadata(path) {
            Err(error) if error.kind() == std::io::ErrorKind::NotFound => None,
            // A folder, pipe or device: the save refuses it with its own message.
            Ok(meta) if !meta.is_file() => None,
            _ => Some(Case::load_with_text(path).map(|(_, text)| text)),
        };
        let Some(old) = old else {
            return Ok(SavePlan {
                text: self.to_yaml_string()?,
                how: SaveHow::New,
            });
        };
        let edited = match &old {
            Ok(text) => edit::edit_in_place(text, self),
            Err(error) => Err(edit::NotInPlace(format!(
                "it is not a readable case ({error})"
            ))),
        };
        match edited {
            Ok(text) => Ok(SavePlan {
                text,
                how: SaveHow::InPlace,
            }),
            Err(reason) => Ok(SavePlan {
                text: self.to_yaml_string()?,
                how: SaveHow::Rewritten {
                    reason: reason.0,
                    dropped_comments: old.as_deref().is_ok_and(edit::has_comments),
                },
            }),
        }
    }

    /// The unit system the case's quantities are mostly typed in ("3.5 pli", "48 mil", "1200
    /// fpm", "40 in" are US; "900 m/min", "76 um" SI), counted over the web, core, roll,
    /// winding and measurements sections; `None` when none is typed with a unit. A tie reads
    /// as SI ([`crate::units::typed_system`]).
    pub fn typed_units(&self) -> Option<crate::units::UnitSystem> {
        let sections = [
            serde_json::to_value(&self.web),
            serde_json::to_value(&self.core),
            serde_json::to_value(&self.roll),
            serde_json::to_value(&self.winding),
            serde_json::to_value(&self.measurements),
        ];
        let mut texts = Vec::new();
        for section in sections.into_iter().flatten() {
            quantity_texts(&section, &mut texts);
        }
        crate::units::typed_system(texts.iter().map(String::as_str))
    }

    /// Resolve units and presets into SI; lists the assumed values. Messages say "the case"
    /// (the title is never echoed: it can be anything, of any length); use
    /// [`Case::resolve_as`] or [`Case::load_resolved`] to name the file instead.
    pub fn resolve(&self) -> Result<ResolvedCase, CaseError> {
        self.resolve_as("the case")
    }

    /// Resolve, naming `origin` (usually the file name) in every message.
    pub fn resolve_as(&self, origin: &str) -> Result<ResolvedCase, CaseError> {
        resolve::Resolver::new(origin).resolve(self)
    }

    /// Resolve a case read from a file whose text is `text`, naming `origin` and, where the
    /// field is written in the file, its line in every message (as the parser does for unknown
    /// keys).
    pub fn resolve_in_file(&self, origin: &str, text: &str) -> Result<ResolvedCase, CaseError> {
        self.resolve_as(origin).map_err(|error| error.located(text))
    }

    /// Load a file and resolve it, naming the file and the field's line in every message.
    pub fn load_resolved(path: &std::path::Path) -> Result<ResolvedCase, CaseError> {
        let (case, text) = Case::load_with_text(path)?;
        case.resolve_in_file(&path.display().to_string(), &text)
    }
}

/// Every string in `value` (quantities among them), for [`Case::typed_units`].
pub fn quantity_texts(value: &serde_json::Value, out: &mut Vec<String>) {
    match value {
        serde_json::Value::String(s) => out.push(s.clone()),
        serde_json::Value::Array(items) => items.iter().for_each(|v| quantity_texts(v, out)),
        serde_json::Value::Object(map) => map.values().for_each(|v| quantity_texts(v, out)),
        _ => {}
    }
}

/// How [`Case::save`] wrote (or would write) a case file.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum SaveHow {
    /// The case was written in full as a new file (there was none, or the caller replaces
    /// another file).
    New,
    /// The file's text was edited in place: comments, order and untouched values are kept.
    InPlace,
    /// The file was written again from the case, because it could not be edited in place
    /// (`reason`, in plain words: "it uses flow style …"); `dropped_comments` when it had
    /// comments, which are then lost.
    Rewritten {
        reason: String,
        dropped_comments: bool,
    },
}

/// The text [`Case::save`] writes and how it was made ([`Case::save_plan`]).
#[derive(Debug, Clone)]
pub struct SavePlan {
    pub text: String,
    pub how: SaveHow,
}

impl SavePlan {
    /// Write the text atomically to `path`.
    pub fn write(&self, path: &std::path::Path) -> Result<(), CaseError> {
        crate::fsutil::save_atomic(path, self.text.as_bytes())?;
        Ok(())
    }
}

impl CaseError {
    /// Add the line of the field this error is about, found in the case file's `text`, after
    /// the origin ("case.yaml: line 3: winding.speed: ..."). Errors about fields that are not
    /// written in the file (a preset's value, a missing key) are returned unchanged.
    pub fn located(mut self, text: &str) -> CaseError {
        let at_line = |origin: &mut String, field: &str| {
            if let Some(line) = yaml_guard::field_line(text, field) {
                *origin = format!("{origin}: line {line}");
            }
        };
        match &mut self {
            CaseError::Quantity { origin, error } => at_line(origin, error.field()),
            CaseError::OutOfRange { origin, field, .. }
            | CaseError::UnknownName { origin, field, .. } => at_line(origin, field),
            _ => {}
        }
        self
    }
}
