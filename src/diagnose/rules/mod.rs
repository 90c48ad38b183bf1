//! Rule-base YAML schema → validated, compiled rules; lint with file/line errors.
//!
//! A rule directory holds `causes.yaml` (cause catalogue), `remedies.yaml` (remedy catalogue),
//! `cautions.yaml` (safety cautions) and one `<symptom>.yaml` per symptom. The schema is
//! described in `docs/rules.md`. The shipped rule base is compiled into the binary.

use std::collections::{BTreeMap, BTreeSet};
use std::path::Path;

use super::indicators::{self, Dimension, ZoneUse};
use crate::model::ZoneName;
use crate::units::UnitSystem;
use crate::vocabulary;

mod compile;
mod quantities;
mod raw;

use compile::*;

/// A rule-base error naming file, line and the closest valid name.
#[derive(Debug, thiserror::Error)]
pub enum RuleError {
    #[error("{file}:{line}: {message}")]
    Invalid {
        file: String,
        line: usize,
        message: String,
    },
    #[error("cannot read rule directory {path}: {message}")]
    Read { path: String, message: String },
    /// One rule file that is too large, not a regular file or not text.
    #[error(transparent)]
    File(#[from] crate::fsutil::ReadError),
    #[error("{count} problems in the rule base:\n{listing}")]
    Many { count: usize, listing: String },
}

/// The shipped rule files, compiled into the binary.
const EMBEDDED: &[(&str, &str)] = &[
    ("causes.yaml", include_str!("../../../rules/causes.yaml")),
    (
        "remedies.yaml",
        include_str!("../../../rules/remedies.yaml"),
    ),
    (
        "cautions.yaml",
        include_str!("../../../rules/cautions.yaml"),
    ),
    (
        "telescoping.yaml",
        include_str!("../../../rules/telescoping.yaml"),
    ),
    (
        "starring.yaml",
        include_str!("../../../rules/starring.yaml"),
    ),
    (
        "blocking.yaml",
        include_str!("../../../rules/blocking.yaml"),
    ),
    (
        "crushed_core.yaml",
        include_str!("../../../rules/crushed_core.yaml"),
    ),
    (
        "bulk_loss.yaml",
        include_str!("../../../rules/bulk_loss.yaml"),
    ),
    (
        "cinching.yaml",
        include_str!("../../../rules/cinching.yaml"),
    ),
    (
        "soft_roll.yaml",
        include_str!("../../../rules/soft_roll.yaml"),
    ),
    (
        "out_of_round.yaml",
        include_str!("../../../rules/out_of_round.yaml"),
    ),
    (
        "wrinkles.yaml",
        include_str!("../../../rules/wrinkles.yaml"),
    ),
    (
        "gauge_bands.yaml",
        include_str!("../../../rules/gauge_bands.yaml"),
    ),
    ("dishing.yaml", include_str!("../../../rules/dishing.yaml")),
    ("bursts.yaml", include_str!("../../../rules/bursts.yaml")),
    (
        "core_slip.yaml",
        include_str!("../../../rules/core_slip.yaml"),
    ),
    (
        "tin_canning.yaml",
        include_str!("../../../rules/tin_canning.yaml"),
    ),
];

// ---------------------------------------------------------------------------------------------
// Compiled rule base.

/// A cause in the catalogue.
#[derive(Debug, Clone, PartialEq)]
pub struct CauseInfo {
    pub id: String,
    pub title: String,
    pub mechanism: String,
    /// Remedies that answer this cause whatever the symptom.
    pub remedies: Vec<String>,
}

/// How costly a remedy is to try.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub enum Cost {
    Low,
    Medium,
    High,
}

impl Cost {
    pub fn as_str(self) -> &'static str {
        match self {
            Cost::Low => "low",
            Cost::Medium => "medium",
            Cost::High => "high",
        }
    }
}

/// Remedy groups, in display order.
pub const REMEDY_GROUPS: [&str; 5] = [
    "winder_setting",
    "equipment",
    "material_or_core",
    "handling_and_storage",
    "process_upstream",
];

/// Winder settings a remedy may change for the what-if re-solve.
pub const SETTINGS: [&str; 8] = [
    "tension",
    "taper",
    "nip_load",
    "speed",
    "core_stiffness",
    "core_crush_rating",
    "tension_upsets",
    "core_zone_tension",
];

/// One machine-readable setting change.
#[derive(Debug, Clone, PartialEq)]
pub enum SettingChange {
    /// Multiply web tension (start tension, steps and upsets) by the factor.
    TensionScale(f64),
    /// Add percent points to the taper (negative = less taper).
    TaperBy(f64),
    /// Set the taper to this many percent.
    TaperTo(f64),
    /// Multiply the nip load by the factor.
    NipScale(f64),
    /// Multiply the line speed by the factor.
    SpeedScale(f64),
    /// Multiply the core's effective stiffness by the factor.
    CoreStiffnessScale(f64),
    /// Multiply the core's rated crush pressure by the factor.
    CoreCrushScale(f64),
    /// Remove tension upset bands (steady tension control).
    ClearUpsets,
    /// Wind the core zone (first tenth of the build) at this multiple of the start tension.
    CoreZoneTensionScale(f64),
}

/// A remedy in the catalogue.
#[derive(Debug, Clone, PartialEq)]
pub struct Remedy {
    pub id: String,
    pub text: String,
    pub group: String,
    pub cost: Cost,
    pub cautions: Vec<String>,
    pub changes: Vec<SettingChange>,
}

/// A safety caution.
#[derive(Debug, Clone, PartialEq)]
pub struct CautionInfo {
    pub id: String,
    pub title: String,
    pub text: String,
}

/// One answer choice of a question.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Choice {
    pub id: String,
    pub text: String,
}

/// A question that tells causes of a symptom apart. Answers live in `Case.answers` by `id`.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Question {
    /// `<symptom>.<name>`, e.g. `starring.after_splice`.
    pub id: String,
    pub text: String,
    /// Accepted answers. Yes/no questions accept `yes`, `no`, `unknown`; choice questions their
    /// choice IDs plus `unknown`.
    pub choices: Vec<Choice>,
    pub yes_no: bool,
}

impl Question {
    /// Accepted answer values.
    pub fn accepted(&self) -> Vec<&str> {
        let mut out: Vec<&str> = self.choices.iter().map(|c| c.id.as_str()).collect();
        out.push("unknown");
        out
    }
}

/// Comparison of an indicator against its threshold.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Comparison {
    Above,
    Below,
}

/// What a piece of evidence tests.
#[derive(Debug, Clone, PartialEq)]
pub enum Test {
    Indicator {
        id: String,
        zone: Option<ZoneName>,
        comparison: Comparison,
        threshold: f64,
        dimension: Dimension,
    },
    Answer {
        question: String,
        values: Vec<String>,
    },
    Material(Vec<vocabulary::WebMaterial>),
    Method(Vec<String>),
    Place(Vec<vocabulary::Place>),
}

/// What a piece of evidence weighs: the cause itself, or the cause as the explanation of the
/// rule's symptom only.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Scope {
    /// The cause itself, whatever the symptom (`scope: cause`, the default): a symptom's belief
    /// pushed below zero counts against the cause for every observed symptom.
    #[default]
    Cause,
    /// The cause as the explanation of this rule's symptom only (`scope: symptom`): the evidence
    /// can take this symptom's support for the cause away, down to no belief, but never counts
    /// against the support other observed symptoms give the cause. For example "taper hardly
    /// moves the core pressure" says missing taper did not crush the core; it says nothing
    /// against missing taper as the cause of stars in the same roll.
    Symptom,
}

impl Scope {
    /// The words a rule file may use, in the order of the variants.
    pub const IDS: [&'static str; 2] = ["cause", "symptom"];
}

/// One piece of evidence: a test and the certainty factor it adds when it holds.
#[derive(Debug, Clone, PartialEq)]
pub struct Evidence {
    pub test: Test,
    /// Certainty factor in −1..=1 (negative = evidence against).
    pub weight: f64,
    /// Whom the weight is about (see [`Scope`]).
    pub scope: Scope,
    pub says: String,
}

/// A link from a symptom to a cause.
#[derive(Debug, Clone, PartialEq)]
pub struct CauseRule {
    pub cause: String,
    pub because: String,
    /// Belief from the symptom alone, 0..=1.
    pub prior: f64,
    pub evidence: Vec<Evidence>,
    pub remedies: Vec<String>,
}

/// Everything known about one symptom.
#[derive(Debug, Clone, PartialEq)]
pub struct SymptomRules {
    pub id: String,
    pub title: String,
    pub description: String,
    pub aliases: Vec<String>,
    pub places: Vec<String>,
    pub sources: Vec<String>,
    pub questions: Vec<Question>,
    pub rules: Vec<CauseRule>,
    pub file: String,
}

/// The compiled rule base.
#[derive(Debug, Clone, Default)]
pub struct RuleBase {
    pub symptoms: Vec<SymptomRules>,
    pub causes: BTreeMap<String, CauseInfo>,
    pub remedies: BTreeMap<String, Remedy>,
    pub cautions: BTreeMap<String, CautionInfo>,
    /// Literature cited across the files.
    pub sources: Vec<String>,
}

impl RuleBase {
    /// The rule base shipped inside the binary, its quantities in SI.
    pub fn embedded() -> Result<RuleBase, RuleError> {
        RuleBase::embedded_in(UnitSystem::Si)
    }

    /// The shipped rule base with the quantities of its texts (`{50 kPa}`) in `units`.
    pub fn embedded_in(units: UnitSystem) -> Result<RuleBase, RuleError> {
        let files: Vec<(String, String)> = EMBEDDED
            .iter()
            .map(|(name, text)| (format!("rules/{name}"), (*text).to_string()))
            .collect();
        RuleBase::from_files_in(&files, units)
    }

    /// Load a rule directory (overrides the shipped rules), its quantities in SI.
    pub fn load_dir(path: &Path) -> Result<RuleBase, RuleError> {
        RuleBase::load_dir_in(path, UnitSystem::Si)
    }

    /// [`RuleBase::load_dir`] with the quantities of the texts in `units`.
    pub fn load_dir_in(path: &Path, units: UnitSystem) -> Result<RuleBase, RuleError> {
        let read_error = |e: std::io::Error| RuleError::Read {
            path: path.display().to_string(),
            message: e.to_string(),
        };
        let names = crate::fsutil::yaml_files(path).map_err(read_error)?;
        let mut files = Vec::new();
        for name in names {
            // Like case files: at most 1 MiB, and a pipe or device is refused, not waited on.
            let text = crate::fsutil::read_text_limited(
                &name,
                "rule file",
                crate::fsutil::MAX_INPUT_FILE_BYTES,
            )?;
            files.push((name.display().to_string(), text));
        }
        RuleBase::from_files_in(&files, units)
    }

    /// Compile a set of `(file name, text)` pairs, quantities in SI. Every problem found is
    /// reported, each with file and line.
    pub fn from_files(files: &[(String, String)]) -> Result<RuleBase, RuleError> {
        RuleBase::from_files_in(files, UnitSystem::Si)
    }

    /// [`RuleBase::from_files`] with the quantities of the texts (`{50 kPa}`) in `units`.
    pub fn from_files_in(
        files: &[(String, String)],
        units: UnitSystem,
    ) -> Result<RuleBase, RuleError> {
        RuleBase::compile_files(files).map(|base| quantities::in_units(base, units))
    }

    /// The compiled rule base with its texts as written (placeholders kept).
    fn compile_files(files: &[(String, String)]) -> Result<RuleBase, RuleError> {
        let mut problems = Problems::default();
        let mut base = RuleBase::default();
        let find = |wanted: &str| files.iter().find(|(f, _)| file_base_name(f) == wanted);

        // Catalogues first: symptom files refer to them.
        let remedy_refs = add_causes(&mut base, find("causes.yaml"), &mut problems);
        add_cautions(&mut base, find("cautions.yaml"), &mut problems);
        add_remedies(&mut base, find("remedies.yaml"), &mut problems);
        for (file, text, remedy) in remedy_refs {
            check_remedy(&remedy, file, text, &base, &mut problems);
        }

        // Symptom files.
        for (file, text) in files {
            let name = file_base_name(file);
            if matches!(
                name.as_str(),
                "causes.yaml" | "remedies.yaml" | "cautions.yaml"
            ) {
                continue;
            }
            add_symptom(&mut base, file, text, &mut problems);
        }
        base.symptoms.sort_by_key(|s| {
            vocabulary::SYMPTOM_IDS
                .iter()
                .position(|x| *x == s.id)
                .unwrap_or(usize::MAX)
        });
        base.sources.sort();
        base.sources.dedup();
        quantities::check(&base, files, &mut problems);
        problems.into_result(base)
    }

    /// Coverage problems that do not stop loading (missing symptom files, unreachable causes,
    /// unreferenced remedies and cautions). The shipped rule base has none.
    pub fn lint(&self) -> Vec<String> {
        let mut out = Vec::new();
        for id in vocabulary::SYMPTOM_IDS {
            if self.symptom(id).is_none() {
                out.push(format!("symptom `{id}` has no rule file"));
            }
        }
        let reachable: BTreeSet<&str> = self
            .symptoms
            .iter()
            .flat_map(|s| s.rules.iter().map(|r| r.cause.as_str()))
            .collect();
        for id in self.causes.keys() {
            if !reachable.contains(id.as_str()) {
                out.push(format!("cause `{id}` is not reachable from any symptom"));
            }
        }
        let referenced: BTreeSet<&str> = self
            .symptoms
            .iter()
            .flat_map(|s| s.rules.iter().flat_map(|r| r.remedies.iter()))
            .chain(self.causes.values().flat_map(|c| c.remedies.iter()))
            .map(String::as_str)
            .collect();
        for id in self.remedies.keys() {
            if !referenced.contains(id.as_str()) {
                out.push(format!(
                    "remedy `{id}` is not referenced by any cause or rule"
                ));
            }
        }
        let cautioned: BTreeSet<&str> = self
            .remedies
            .values()
            .flat_map(|r| r.cautions.iter().map(String::as_str))
            .collect();
        for id in self.cautions.keys() {
            if !cautioned.contains(id.as_str()) {
                out.push(format!("caution `{id}` is not used by any remedy"));
            }
        }
        for cause in self.causes.values() {
            if self.causes_remedies(&cause.id).is_empty() {
                out.push(format!("cause `{}` has no remedy", cause.id));
            }
        }
        out
    }

    /// The rules of symptom `id`.
    pub fn symptom(&self, id: &str) -> Option<&SymptomRules> {
        self.symptoms.iter().find(|s| s.id == id)
    }

    /// The question with ID `id`, across all symptoms.
    pub fn question(&self, id: &str) -> Option<&Question> {
        self.symptoms
            .iter()
            .flat_map(|s| s.questions.iter())
            .find(|q| q.id == id)
    }

    /// Every question ID, for "did you mean".
    pub fn question_ids(&self) -> Vec<&str> {
        self.symptoms
            .iter()
            .flat_map(|s| s.questions.iter().map(|q| q.id.as_str()))
            .collect()
    }

    /// Every remedy that answers `cause` from any rule or the catalogue.
    pub fn causes_remedies(&self, cause: &str) -> Vec<&str> {
        let mut out: Vec<&str> = Vec::new();
        let from_rules = self
            .symptoms
            .iter()
            .flat_map(|s| s.rules.iter())
            .filter(|r| r.cause == cause)
            .flat_map(|r| r.remedies.iter());
        let from_catalogue = self
            .causes
            .get(cause)
            .into_iter()
            .flat_map(|c| c.remedies.iter());
        for id in from_rules.chain(from_catalogue) {
            if !out.contains(&id.as_str()) {
                out.push(id);
            }
        }
        out
    }
}
