//! Rule-base YAML schema → validated, compiled rules; lint with file/line errors.
//!
//! A rule directory holds `causes.yaml` (cause catalogue), `remedies.yaml` (remedy catalogue),
//! `cautions.yaml` (safety cautions) and one `<symptom>.yaml` per symptom. The schema is
//! described in `docs/rules.md`. The shipped rule base is compiled into the binary.

use std::collections::{BTreeMap, BTreeSet};
use std::path::Path;

use serde::Deserialize;

use super::indicators::{self, Dimension, ZoneUse};
use crate::model::ZoneName;
use crate::vocabulary;

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
    ("causes.yaml", include_str!("../../rules/causes.yaml")),
    ("remedies.yaml", include_str!("../../rules/remedies.yaml")),
    ("cautions.yaml", include_str!("../../rules/cautions.yaml")),
    (
        "telescoping.yaml",
        include_str!("../../rules/telescoping.yaml"),
    ),
    ("starring.yaml", include_str!("../../rules/starring.yaml")),
    ("blocking.yaml", include_str!("../../rules/blocking.yaml")),
    (
        "crushed_core.yaml",
        include_str!("../../rules/crushed_core.yaml"),
    ),
    ("bulk_loss.yaml", include_str!("../../rules/bulk_loss.yaml")),
    ("cinching.yaml", include_str!("../../rules/cinching.yaml")),
    ("soft_roll.yaml", include_str!("../../rules/soft_roll.yaml")),
    (
        "out_of_round.yaml",
        include_str!("../../rules/out_of_round.yaml"),
    ),
    ("wrinkles.yaml", include_str!("../../rules/wrinkles.yaml")),
    (
        "gauge_bands.yaml",
        include_str!("../../rules/gauge_bands.yaml"),
    ),
    ("dishing.yaml", include_str!("../../rules/dishing.yaml")),
    ("bursts.yaml", include_str!("../../rules/bursts.yaml")),
    ("core_slip.yaml", include_str!("../../rules/core_slip.yaml")),
    (
        "tin_canning.yaml",
        include_str!("../../rules/tin_canning.yaml"),
    ),
];

// ---------------------------------------------------------------------------------------------
// Raw schema (what the YAML says).

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawCauseFile {
    #[serde(default)]
    sources: Vec<String>,
    causes: BTreeMap<String, RawCause>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawCause {
    title: String,
    mechanism: String,
    #[serde(default)]
    remedies: Vec<String>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawRemedyFile {
    #[serde(default)]
    sources: Vec<String>,
    remedies: BTreeMap<String, RawRemedy>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawRemedy {
    text: String,
    group: String,
    cost: String,
    #[serde(default)]
    cautions: Vec<String>,
    #[serde(default)]
    change: Vec<RawChange>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawChange {
    setting: String,
    #[serde(default)]
    scale: Option<f64>,
    #[serde(default)]
    by_percent_points: Option<f64>,
    #[serde(default)]
    to_percent: Option<f64>,
    #[serde(default)]
    clear: Option<bool>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawCautionFile {
    #[serde(default)]
    sources: Vec<String>,
    cautions: BTreeMap<String, RawCaution>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawCaution {
    title: String,
    text: String,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSymptomFile {
    symptom: String,
    title: String,
    description: String,
    #[serde(default)]
    aliases: Vec<String>,
    #[serde(default)]
    places: Vec<String>,
    #[serde(default)]
    sources: Vec<String>,
    #[serde(default)]
    questions: Vec<RawQuestion>,
    causes: Vec<RawRule>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawQuestion {
    id: String,
    text: String,
    #[serde(default)]
    choices: Vec<RawChoice>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawChoice {
    id: String,
    text: String,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawRule {
    cause: String,
    because: String,
    prior: f64,
    #[serde(default)]
    evidence: Vec<RawEvidence>,
    #[serde(default)]
    remedies: Vec<String>,
}

#[derive(Debug, Deserialize)]
#[serde(untagged)]
enum RawThreshold {
    Number(f64),
    Text(String),
}

#[derive(Debug, Deserialize)]
#[serde(untagged)]
enum OneOrMany {
    One(String),
    Many(Vec<String>),
}

impl OneOrMany {
    fn into_vec(self) -> Vec<String> {
        match self {
            OneOrMany::One(s) => vec![s],
            OneOrMany::Many(v) => v,
        }
    }
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawEvidence {
    #[serde(default)]
    indicator: Option<String>,
    #[serde(default)]
    zone: Option<String>,
    #[serde(default)]
    above: Option<RawThreshold>,
    #[serde(default)]
    below: Option<RawThreshold>,
    #[serde(default)]
    question: Option<String>,
    #[serde(default)]
    is: Option<OneOrMany>,
    #[serde(default)]
    material: Option<OneOrMany>,
    #[serde(default)]
    method: Option<OneOrMany>,
    #[serde(default)]
    place: Option<OneOrMany>,
    weight: f64,
    says: String,
}

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

/// One piece of evidence: a test and the certainty factor it adds when it holds.
#[derive(Debug, Clone, PartialEq)]
pub struct Evidence {
    pub test: Test,
    /// Certainty factor in −1..=1 (negative = evidence against).
    pub weight: f64,
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
    /// The rule base shipped inside the binary.
    pub fn embedded() -> Result<RuleBase, RuleError> {
        let files: Vec<(String, String)> = EMBEDDED
            .iter()
            .map(|(name, text)| (format!("rules/{name}"), (*text).to_string()))
            .collect();
        RuleBase::from_files(&files)
    }

    /// Load a rule directory (overrides the shipped rules).
    pub fn load_dir(path: &Path) -> Result<RuleBase, RuleError> {
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
        RuleBase::from_files(&files)
    }

    /// Compile a set of `(file name, text)` pairs. Every problem found is reported, each with
    /// file and line.
    pub fn from_files(files: &[(String, String)]) -> Result<RuleBase, RuleError> {
        let mut problems = Problems::default();
        let mut base = RuleBase::default();
        let base_name = |f: &str| {
            Path::new(f)
                .file_name()
                .map(|n| n.to_string_lossy().to_string())
                .unwrap_or_default()
        };
        let find = |wanted: &str| files.iter().find(|(f, _)| base_name(f) == wanted);

        // Catalogues first: symptom files refer to them.
        let mut remedy_refs: Vec<(String, String, String)> = Vec::new(); // (file, text, remedy)
        match find("causes.yaml") {
            None => problems.add("causes.yaml", 1, "the rule directory has no causes.yaml"),
            Some((file, text)) => {
                if let Some(raw) = parse::<RawCauseFile>(file, text, &mut problems) {
                    base.sources.extend(raw.sources);
                    for (id, cause) in raw.causes {
                        for remedy in &cause.remedies {
                            remedy_refs.push((file.clone(), text.clone(), remedy.clone()));
                        }
                        base.causes.insert(
                            id.clone(),
                            CauseInfo {
                                id,
                                title: cause.title,
                                mechanism: cause.mechanism,
                                remedies: cause.remedies,
                            },
                        );
                    }
                    for required in vocabulary::CAUSE_IDS {
                        if !base.causes.contains_key(required) {
                            problems.add(
                                file,
                                1,
                                &format!("cause `{required}` of the vocabulary is missing"),
                            );
                        }
                    }
                }
            }
        }
        match find("cautions.yaml") {
            None => problems.add(
                "cautions.yaml",
                1,
                "the rule directory has no cautions.yaml",
            ),
            Some((file, text)) => {
                if let Some(raw) = parse::<RawCautionFile>(file, text, &mut problems) {
                    base.sources.extend(raw.sources);
                    for (id, c) in raw.cautions {
                        base.cautions.insert(
                            id.clone(),
                            CautionInfo {
                                id,
                                title: c.title,
                                text: c.text,
                            },
                        );
                    }
                }
            }
        }
        match find("remedies.yaml") {
            None => problems.add(
                "remedies.yaml",
                1,
                "the rule directory has no remedies.yaml",
            ),
            Some((file, text)) => {
                if let Some(raw) = parse::<RawRemedyFile>(file, text, &mut problems) {
                    base.sources.extend(raw.sources);
                    for (id, r) in raw.remedies {
                        if let Some(remedy) =
                            compile_remedy(&id, r, file, text, &base, &mut problems)
                        {
                            base.remedies.insert(id, remedy);
                        }
                    }
                }
            }
        }
        for (file, text, remedy) in &remedy_refs {
            check_remedy(remedy, file, text, &base, &mut problems);
        }

        // Symptom files.
        for (file, text) in files {
            let name = base_name(file);
            if matches!(
                name.as_str(),
                "causes.yaml" | "remedies.yaml" | "cautions.yaml"
            ) {
                continue;
            }
            let Some(raw) = parse::<RawSymptomFile>(file, text, &mut problems) else {
                continue;
            };
            if let Some(symptom) = compile_symptom(raw, file, text, &base, &mut problems) {
                if base.symptoms.iter().any(|s| s.id == symptom.id) {
                    problems.add(
                        file,
                        line_of(text, &symptom.id),
                        &format!("symptom `{}` is defined twice", symptom.id),
                    );
                } else {
                    base.symptoms.push(symptom);
                }
            }
        }
        base.symptoms.sort_by_key(|s| {
            vocabulary::SYMPTOM_IDS
                .iter()
                .position(|x| *x == s.id)
                .unwrap_or(usize::MAX)
        });
        base.sources.sort();
        base.sources.dedup();
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

// ---------------------------------------------------------------------------------------------
// Compilation helpers.

#[derive(Default)]
struct Problems {
    list: Vec<(String, usize, String)>,
}

impl Problems {
    fn add(&mut self, file: &str, line: usize, message: &str) {
        self.list
            .push((file.to_string(), line.max(1), message.to_string()));
    }

    fn into_result(self, base: RuleBase) -> Result<RuleBase, RuleError> {
        match self.list.len() {
            0 => Ok(base),
            1 => {
                let (file, line, message) = self.list.into_iter().next().unwrap_or_default();
                Err(RuleError::Invalid {
                    file,
                    line,
                    message,
                })
            }
            count => Err(RuleError::Many {
                count,
                listing: self
                    .list
                    .iter()
                    .map(|(f, l, m)| format!("  {f}:{l}: {m}"))
                    .collect::<Vec<_>>()
                    .join("\n"),
            }),
        }
    }
}

/// Parse YAML, turning serde's message into one with a line and a "did you mean".
fn parse<T: serde::de::DeserializeOwned>(
    file: &str,
    text: &str,
    problems: &mut Problems,
) -> Option<T> {
    // Aliases are refused before parsing: expanding an alias chain costs work exponential in
    // the file size.
    if let Some((line, _)) = crate::case::yaml_guard::first_alias(text) {
        problems.add(
            file,
            line,
            "a YAML alias (`*name`) is not accepted in a rule file; write the value out instead",
        );
        return None;
    }
    match yaml::from_str::<T>(text) {
        Ok(v) => Some(v),
        Err(e) => {
            let line = e.location().map(|l| l.line()).unwrap_or(1);
            let message = e.to_string();
            let hint = unknown_field_hint(&message);
            problems.add(file, line, &format!("{message}{hint}"));
            None
        }
    }
}

/// For "unknown field `x`, expected one of `a`, `b`" messages: the closest expected name.
fn unknown_field_hint(message: &str) -> String {
    if !message.contains("unknown field") && !message.contains("unknown variant") {
        return String::new();
    }
    let quoted: Vec<&str> = message.split('`').skip(1).step_by(2).collect();
    let Some((given, expected)) = quoted.split_first() else {
        return String::new();
    };
    match vocabulary::closest(given, expected.iter().copied()) {
        Some(best) => format!(" (did you mean `{best}`?)"),
        None => String::new(),
    }
}

/// Line (1-based) of the first line mentioning `needle` as a whole word; 1 when not found.
fn line_of(text: &str, needle: &str) -> usize {
    line_of_after(text, needle, 0)
}

/// Like [`line_of`] but only lines after `after` (1-based) count.
fn line_of_after(text: &str, needle: &str, after: usize) -> usize {
    for (i, line) in text.lines().enumerate() {
        if i < after {
            continue;
        }
        let mut rest = line;
        while let Some(pos) = rest.find(needle) {
            let before = rest[..pos].chars().next_back();
            let after_c = rest[pos + needle.len()..].chars().next();
            let word =
                |c: Option<char>| c.is_some_and(|c| c.is_alphanumeric() || c == '_' || c == '.');
            if !word(before) && !word(after_c) {
                return i + 1;
            }
            rest = &rest[pos + needle.len()..];
        }
    }
    if after > 0 { after } else { 1 }
}

fn did_you_mean<'a, I: IntoIterator<Item = &'a str>>(given: &str, candidates: I) -> String {
    match vocabulary::closest(given, candidates) {
        Some(best) => format!(" (did you mean `{best}`?)"),
        None => String::new(),
    }
}

fn check_remedy(id: &str, file: &str, text: &str, base: &RuleBase, problems: &mut Problems) {
    if !base.remedies.contains_key(id) {
        problems.add(
            file,
            line_of(text, id),
            &format!(
                "remedy `{id}` is not in remedies.yaml{}",
                did_you_mean(id, base.remedies.keys().map(String::as_str))
            ),
        );
    }
}

fn compile_remedy(
    id: &str,
    raw: RawRemedy,
    file: &str,
    text: &str,
    base: &RuleBase,
    problems: &mut Problems,
) -> Option<Remedy> {
    let line = line_of(text, id);
    let mut ok = true;
    if !REMEDY_GROUPS.contains(&raw.group.as_str()) {
        problems.add(
            file,
            line_of_after(text, &raw.group, line),
            &format!(
                "remedy `{id}`: unknown group `{}`; accepted: {}{}",
                raw.group,
                REMEDY_GROUPS.join(", "),
                did_you_mean(&raw.group, REMEDY_GROUPS)
            ),
        );
        ok = false;
    }
    let cost = match raw.cost.as_str() {
        "low" => Cost::Low,
        "medium" => Cost::Medium,
        "high" => Cost::High,
        other => {
            problems.add(
                file,
                line_of_after(text, other, line),
                &format!("remedy `{id}`: cost `{other}` is not one of low, medium, high"),
            );
            ok = false;
            Cost::High
        }
    };
    for caution in &raw.cautions {
        if !base.cautions.contains_key(caution) {
            problems.add(
                file,
                line_of_after(text, caution, line),
                &format!(
                    "remedy `{id}`: caution `{caution}` is not in cautions.yaml{}",
                    did_you_mean(caution, base.cautions.keys().map(String::as_str))
                ),
            );
            ok = false;
        }
    }
    let mut changes = Vec::new();
    for change in raw.change {
        let at = line_of_after(text, &change.setting, line);
        let factor = |problems: &mut Problems, range: (f64, f64)| -> Option<f64> {
            match change.scale {
                Some(f) if f > range.0 && f <= range.1 => Some(f),
                Some(f) => {
                    problems.add(
                        file,
                        at,
                        &format!(
                            "remedy `{id}`: scale {f} for `{}` is out of range; accepted {} < scale ≤ {}",
                            change.setting, range.0, range.1
                        ),
                    );
                    None
                }
                None => {
                    problems.add(
                        file,
                        at,
                        &format!("remedy `{id}`: setting `{}` needs `scale`", change.setting),
                    );
                    None
                }
            }
        };
        let compiled = match change.setting.as_str() {
            "tension" => factor(problems, (0.3, 2.0)).map(SettingChange::TensionScale),
            "nip_load" => factor(problems, (0.0, 3.0)).map(SettingChange::NipScale),
            "speed" => factor(problems, (0.1, 2.0)).map(SettingChange::SpeedScale),
            "core_stiffness" => {
                factor(problems, (0.1, 100.0)).map(SettingChange::CoreStiffnessScale)
            }
            "core_crush_rating" => factor(problems, (0.1, 10.0)).map(SettingChange::CoreCrushScale),
            "core_zone_tension" => {
                factor(problems, (0.3, 2.0)).map(SettingChange::CoreZoneTensionScale)
            }
            "tension_upsets" => match change.clear {
                Some(true) => Some(SettingChange::ClearUpsets),
                _ => {
                    problems.add(
                        file,
                        at,
                        &format!("remedy `{id}`: `tension_upsets` needs `clear: true`"),
                    );
                    None
                }
            },
            "taper" => match (change.by_percent_points, change.to_percent) {
                (Some(d), None) if (-90.0..=90.0).contains(&d) && d != 0.0 => {
                    Some(SettingChange::TaperBy(d))
                }
                (None, Some(t)) if (0.0..=90.0).contains(&t) => Some(SettingChange::TaperTo(t)),
                _ => {
                    problems.add(
                        file,
                        at,
                        &format!(
                            "remedy `{id}`: `taper` needs either `by_percent_points` (−90..90, not 0) or `to_percent` (0..90)"
                        ),
                    );
                    None
                }
            },
            other => {
                problems.add(
                    file,
                    at,
                    &format!(
                        "remedy `{id}`: unknown setting `{other}`; accepted: {}{}",
                        SETTINGS.join(", "),
                        did_you_mean(other, SETTINGS)
                    ),
                );
                None
            }
        };
        match compiled {
            Some(c) => changes.push(c),
            None => ok = false,
        }
    }
    if raw.text.trim().is_empty() {
        problems.add(file, line, &format!("remedy `{id}` has no text"));
        ok = false;
    }
    ok.then(|| Remedy {
        id: id.to_string(),
        text: raw.text.trim().to_string(),
        group: raw.group,
        cost,
        cautions: raw.cautions,
        changes,
    })
}

fn compile_symptom(
    raw: RawSymptomFile,
    file: &str,
    text: &str,
    base: &RuleBase,
    problems: &mut Problems,
) -> Option<SymptomRules> {
    let before = problems.list.len();
    if !vocabulary::is_symptom(&raw.symptom) {
        problems.add(
            file,
            line_of(text, &raw.symptom),
            &format!(
                "unknown symptom `{}`{}",
                raw.symptom,
                did_you_mean(&raw.symptom, vocabulary::SYMPTOM_IDS)
            ),
        );
    }
    for place in &raw.places {
        if !vocabulary::PLACES.contains(&place.as_str()) {
            problems.add(
                file,
                line_of(text, place),
                &format!(
                    "unknown place `{place}`; accepted: {}{}",
                    vocabulary::PLACES.join(", "),
                    did_you_mean(place, vocabulary::PLACES)
                ),
            );
        }
    }
    if raw.sources.is_empty() {
        problems.add(file, 1, "a symptom file must cite its sources (`sources:`)");
    }
    let mut questions: Vec<Question> = Vec::new();
    for q in raw.questions {
        let line = line_of(text, &q.id);
        let prefix = format!("{}.", raw.symptom);
        if !q.id.starts_with(&prefix) {
            problems.add(
                file,
                line,
                &format!("question `{}` must start with `{prefix}`", q.id),
            );
        }
        if questions.iter().any(|x| x.id == q.id) {
            problems.add(file, line, &format!("question `{}` is defined twice", q.id));
        }
        let yes_no = q.choices.is_empty();
        let choices = if yes_no {
            vec![
                Choice {
                    id: "yes".into(),
                    text: "yes".into(),
                },
                Choice {
                    id: "no".into(),
                    text: "no".into(),
                },
            ]
        } else {
            q.choices
                .into_iter()
                .map(|c| Choice {
                    id: c.id,
                    text: c.text,
                })
                .collect()
        };
        questions.push(Question {
            id: q.id,
            text: q.text.trim().to_string(),
            choices,
            yes_no,
        });
    }
    let mut rules = Vec::new();
    let mut last_line = 0;
    for rule in raw.causes {
        let line = line_of_after(text, &rule.cause, last_line);
        last_line = line;
        if !base.causes.contains_key(&rule.cause) {
            problems.add(
                file,
                line,
                &format!(
                    "unknown cause `{}`{}",
                    rule.cause,
                    did_you_mean(&rule.cause, base.causes.keys().map(String::as_str))
                ),
            );
        }
        if rules.iter().any(|r: &CauseRule| r.cause == rule.cause) {
            problems.add(
                file,
                line,
                &format!("cause `{}` is linked twice in this file", rule.cause),
            );
        }
        if !(0.0..=1.0).contains(&rule.prior) {
            problems.add(
                file,
                line_of_after(text, "prior", line),
                &format!(
                    "cause `{}`: prior {} is out of range; accepted 0..1",
                    rule.cause, rule.prior
                ),
            );
        }
        for remedy in &rule.remedies {
            if !base.remedies.contains_key(remedy) {
                problems.add(
                    file,
                    line_of_after(text, remedy, line),
                    &format!(
                        "cause `{}`: remedy `{remedy}` is not in remedies.yaml{}",
                        rule.cause,
                        did_you_mean(remedy, base.remedies.keys().map(String::as_str))
                    ),
                );
            }
        }
        let mut evidence = Vec::new();
        let mut evidence_line = line;
        for ev in rule.evidence {
            let key = ev
                .indicator
                .as_deref()
                .or(ev.question.as_deref())
                .unwrap_or("weight");
            evidence_line = line_of_after(text, key, evidence_line);
            if let Some(e) =
                compile_evidence(ev, &raw.symptom, &questions, file, evidence_line, problems)
            {
                evidence.push(e);
            }
        }
        rules.push(CauseRule {
            cause: rule.cause,
            because: rule.because.trim().to_string(),
            prior: rule.prior,
            evidence,
            remedies: rule.remedies,
        });
    }
    (problems.list.len() == before).then(|| SymptomRules {
        id: raw.symptom,
        title: raw.title,
        description: raw.description.trim().to_string(),
        aliases: raw.aliases,
        places: raw.places,
        sources: raw.sources,
        questions,
        rules,
        file: file.to_string(),
    })
}

const METHODS: &[&str] = vocabulary::WINDING_METHOD_IDS;

fn compile_evidence(
    ev: RawEvidence,
    symptom: &str,
    questions: &[Question],
    file: &str,
    line: usize,
    problems: &mut Problems,
) -> Option<Evidence> {
    let before = problems.list.len();
    if !(-1.0..=1.0).contains(&ev.weight) || ev.weight == 0.0 {
        problems.add(
            file,
            line,
            &format!(
                "evidence weight {} is out of range; accepted −1..1, not 0",
                ev.weight
            ),
        );
    }
    let kinds = [
        ev.indicator.is_some(),
        ev.question.is_some(),
        ev.material.is_some(),
        ev.method.is_some(),
        ev.place.is_some(),
    ]
    .iter()
    .filter(|x| **x)
    .count();
    if kinds != 1 {
        problems.add(
            file,
            line,
            "each evidence entry tests exactly one of `indicator`, `question`, `material`, `method`, `place`",
        );
        return None;
    }
    let test = if let Some(id) = ev.indicator {
        let Some(spec) = indicators::indicator_spec(&id) else {
            problems.add(
                file,
                line,
                &format!(
                    "unknown indicator `{id}`{}",
                    did_you_mean(&id, indicators::INDICATORS.iter().map(|s| s.id))
                ),
            );
            return None;
        };
        let zone = match ev.zone.as_deref() {
            None => None,
            Some(z) => match ZoneName::ALL.iter().find(|n| n.as_str() == z) {
                Some(n) => Some(*n),
                None => {
                    problems.add(
                        file,
                        line,
                        &format!(
                            "unknown zone `{z}`; accepted: core, inner, middle, outer, surface{}",
                            did_you_mean(z, ZoneName::ALL.iter().map(|n| n.as_str()))
                        ),
                    );
                    None
                }
            },
        };
        match (spec.zones, zone.is_some(), ev.zone.is_some()) {
            (ZoneUse::Required, false, false) => problems.add(
                file,
                line,
                &format!("indicator `{id}` needs a `zone` (core, inner, middle, outer, surface)"),
            ),
            (ZoneUse::None, _, true) => problems.add(
                file,
                line,
                &format!("indicator `{id}` is for the whole roll and takes no `zone`"),
            ),
            _ => {}
        }
        let (comparison, raw_threshold) = match (ev.above, ev.below) {
            (Some(t), None) => (Comparison::Above, t),
            (None, Some(t)) => (Comparison::Below, t),
            _ => {
                problems.add(
                    file,
                    line,
                    &format!("indicator `{id}` needs exactly one of `above` or `below`"),
                );
                return None;
            }
        };
        let threshold = match raw_threshold {
            RawThreshold::Number(v) => match spec.dimension {
                Dimension::Fraction if !(0.0..=1.0).contains(&v) => {
                    problems.add(
                        file,
                        line,
                        &format!("indicator `{id}` is a share 0..1; {v} is out of range (write \"{v} %\" for percent)"),
                    );
                    v
                }
                _ => v,
            },
            RawThreshold::Text(t) => match indicators::parse_threshold(&t, spec.dimension) {
                Ok(v) => v,
                Err(message) => {
                    problems.add(file, line, &format!("indicator `{id}`: {message}"));
                    0.0
                }
            },
        };
        Test::Indicator {
            id,
            zone,
            comparison,
            threshold,
            dimension: spec.dimension,
        }
    } else if let Some(question) = ev.question {
        let values = ev.is.map(OneOrMany::into_vec).unwrap_or_default();
        match questions.iter().find(|q| q.id == question) {
            None => {
                let known: Vec<&str> = questions.iter().map(|q| q.id.as_str()).collect();
                problems.add(
                    file,
                    line,
                    &format!(
                        "question `{question}` is not asked in this file (symptom `{symptom}`){}",
                        did_you_mean(&question, known.iter().copied())
                    ),
                );
            }
            Some(q) => {
                if values.is_empty() {
                    problems.add(
                        file,
                        line,
                        &format!(
                            "question evidence `{question}` needs `is:` (one answer or a list)"
                        ),
                    );
                }
                let accepted: Vec<&str> = q.choices.iter().map(|c| c.id.as_str()).collect();
                for v in &values {
                    if !accepted.contains(&v.as_str()) {
                        problems.add(
                            file,
                            line,
                            &format!(
                                "question `{question}`: answer `{v}` is not one of {}{}",
                                accepted.join(", "),
                                did_you_mean(v, accepted.iter().copied())
                            ),
                        );
                    }
                }
            }
        }
        Test::Answer { question, values }
    } else if let Some(m) = ev.material {
        let values = m.into_vec();
        let accepted = vocabulary::WebMaterial::IDS;
        check_words(&values, accepted, "material", file, line, problems);
        Test::Material(
            values
                .iter()
                .filter_map(|v| vocabulary::WebMaterial::from_id(v))
                .collect(),
        )
    } else if let Some(m) = ev.method {
        let values = m.into_vec();
        check_words(&values, METHODS, "method", file, line, problems);
        Test::Method(values)
    } else if let Some(p) = ev.place {
        let values = p.into_vec();
        check_words(
            &values,
            vocabulary::Place::IDS,
            "place",
            file,
            line,
            problems,
        );
        Test::Place(
            values
                .iter()
                .filter_map(|v| vocabulary::Place::from_id(v))
                .collect(),
        )
    } else {
        return None;
    };
    if ev.zone.is_some() && !matches!(test, Test::Indicator { .. }) {
        problems.add(file, line, "`zone` belongs to indicator evidence only");
    }
    (problems.list.len() == before).then(|| Evidence {
        test,
        weight: ev.weight,
        says: ev.says.trim().to_string(),
    })
}

fn check_words(
    values: &[String],
    accepted: &[&str],
    what: &str,
    file: &str,
    line: usize,
    problems: &mut Problems,
) {
    for v in values {
        if !accepted.contains(&v.as_str()) {
            problems.add(
                file,
                line,
                &format!(
                    "unknown {what} `{v}`; accepted: {}{}",
                    accepted.join(", "),
                    did_you_mean(v, accepted.iter().copied())
                ),
            );
        }
    }
}
