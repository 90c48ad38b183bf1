//! Material library file (our own YAML format): fitted radial-stiffness laws by material ID,
//! each with the numbers that say how good the fit was and where the data came from.
//!
//! ```yaml
//! format: rolltriage-materials 1
//! materials:
//!   - id: bay_news_45
//!     title: Bay Mill 45 g/m² news, stack test 2026-11
//!     radial_stiffness: {law: pfeiffer, k1: "8.1 kPa", k2: 38.2}
//!     fit: {source: cases/calibration/bay_news_45.csv, points: 18, r_squared: 0.9991, ...}
//! ```

use std::path::Path;

use serde::{Deserialize, Serialize};

use super::{CalibrateError, PfeifferFit, Weighting};
use crate::case::RadialStiffnessInput;

/// The format tag written in every library file.
pub const FORMAT: &str = "rolltriage-materials 1";

/// A material library file.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MaterialLibrary {
    pub format: String,
    #[serde(default)]
    pub materials: Vec<MaterialEntry>,
}

impl Default for MaterialLibrary {
    fn default() -> Self {
        MaterialLibrary {
            format: FORMAT.to_string(),
            materials: Vec::new(),
        }
    }
}

/// One material.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MaterialEntry {
    /// Lowercase letters, digits and `_`.
    pub id: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub title: Option<String>,
    pub radial_stiffness: RadialStiffnessInput,
    /// Caliper of one layer from the stack test (initial height / layers), when known.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub caliper: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub fit: Option<FitRecord>,
}

/// How a library entry was obtained.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FitRecord {
    pub source: String,
    pub points: usize,
    pub r_squared: f64,
    pub k1_standard_error: String,
    pub k2_standard_error: f64,
    pub weighting: Weighting,
    /// Largest measured pressure: the law is an extrapolation above it.
    pub max_measured_pressure: String,
}

impl MaterialEntry {
    /// A library entry from a fit.
    pub fn from_fit(
        id: &str,
        title: Option<String>,
        source: &str,
        fit: &PfeifferFit,
        caliper: Option<f64>,
    ) -> MaterialEntry {
        MaterialEntry {
            id: id.to_string(),
            title,
            radial_stiffness: super::radial_stiffness_input(fit),
            caliper: caliper.map(|c| format!("{} um", number(super::significant(c * 1e6, 4)))),
            fit: Some(FitRecord {
                source: source.to_string(),
                points: fit.points.len(),
                r_squared: super::significant(fit.r_squared, 6),
                k1_standard_error: format!(
                    "{} kPa",
                    number(super::significant(fit.k1_standard_error / 1e3, 3))
                ),
                k2_standard_error: super::significant(fit.k2_standard_error, 3),
                weighting: fit.weighting,
                max_measured_pressure: format!(
                    "{} kPa",
                    number(super::significant(fit.max_measured_pressure() / 1e3, 4))
                ),
            }),
        }
    }
}

use super::write_case::case_number as number;

/// Check a material ID: lowercase letters, digits and `_`, starting with a letter.
pub fn check_id(id: &str) -> Result<(), String> {
    let ok = id.chars().next().is_some_and(|c| c.is_ascii_lowercase())
        && id
            .chars()
            .all(|c| c.is_ascii_lowercase() || c.is_ascii_digit() || c == '_');
    if ok {
        Ok(())
    } else {
        Err(format!(
            "material ID \"{id}\" is not accepted: use lowercase letters, digits and _, starting with a letter"
        ))
    }
}

impl MaterialLibrary {
    /// Parse a library file's text.
    pub fn from_yaml_str(text: &str, origin: &str) -> Result<MaterialLibrary, CalibrateError> {
        // Aliases are refused before parsing: expanding an alias chain costs work exponential
        // in the file size.
        if let Some((line, column)) = crate::case::yaml_guard::first_alias(text) {
            return Err(CalibrateError::Library {
                path: origin.to_string(),
                message: format!(
                    "line {line}, column {column}: a YAML alias (`*name`) is not accepted in a material library; write the value out instead"
                ),
            });
        }
        let library: MaterialLibrary =
            yaml::from_str(text).map_err(|e| CalibrateError::Library {
                path: origin.to_string(),
                message: e.to_string(),
            })?;
        if library.format != FORMAT {
            return Err(CalibrateError::Library {
                path: origin.to_string(),
                message: format!(
                    "format \"{}\" is not known; accepted: \"{FORMAT}\"",
                    library.format
                ),
            });
        }
        for m in &library.materials {
            check_id(&m.id).map_err(|message| CalibrateError::Library {
                path: origin.to_string(),
                message,
            })?;
        }
        Ok(library)
    }

    /// Read a library file; a missing file is an empty library. Like case files, a library
    /// is at most 1 MiB, and a pipe or device is refused rather than waited on.
    pub fn load_or_new(path: &Path) -> Result<MaterialLibrary, CalibrateError> {
        if let Ok(meta) = std::fs::metadata(path) {
            let refused = |message: &str| CalibrateError::Library {
                path: path.display().to_string(),
                message: message.to_string(),
            };
            if !meta.is_file() {
                return Err(refused("not a regular file (a folder, pipe or device)"));
            }
            if meta.len() > crate::case::MAX_CASE_FILE_BYTES {
                return Err(refused(
                    "larger than 1 MiB, the limit for material libraries; not read",
                ));
            }
        }
        match std::fs::read_to_string(path) {
            Ok(text) => MaterialLibrary::from_yaml_str(&text, &path.display().to_string()),
            Err(e) if e.kind() == std::io::ErrorKind::NotFound => Ok(MaterialLibrary::default()),
            Err(source) => Err(CalibrateError::Read {
                path: path.to_path_buf(),
                error: source,
            }),
        }
    }

    /// Add an entry, replacing one with the same ID; returns true when it replaced one.
    pub fn upsert(&mut self, entry: MaterialEntry) -> bool {
        if let Some(existing) = self.materials.iter_mut().find(|m| m.id == entry.id) {
            *existing = entry;
            true
        } else {
            self.materials.push(entry);
            false
        }
    }

    pub fn get(&self, id: &str) -> Option<&MaterialEntry> {
        self.materials.iter().find(|m| m.id == id)
    }

    /// Save atomically.
    pub fn save(&self, path: &Path) -> Result<(), CalibrateError> {
        let text = yaml::to_string(self).map_err(|e| CalibrateError::Library {
            path: path.display().to_string(),
            message: e.to_string(),
        })?;
        let text = format!(
            "# rolltriage material library: fitted radial-stiffness laws (SI or units as written)\n{text}"
        );
        crate::fsutil::save_atomic(path, text.as_bytes())?;
        Ok(())
    }
}
