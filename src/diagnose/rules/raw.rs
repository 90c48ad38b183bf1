//! The raw rule-file schema: what the YAML says, before names and thresholds are checked.

use std::collections::BTreeMap;

use serde::Deserialize;

// ---------------------------------------------------------------------------------------------
// Raw schema (what the YAML says).

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawCauseFile {
    #[serde(default)]
    pub(super) sources: Vec<String>,
    pub(super) causes: BTreeMap<String, RawCause>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawCause {
    pub(super) title: String,
    pub(super) mechanism: String,
    #[serde(default)]
    pub(super) remedies: Vec<String>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawRemedyFile {
    #[serde(default)]
    pub(super) sources: Vec<String>,
    pub(super) remedies: BTreeMap<String, RawRemedy>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawRemedy {
    pub(super) text: String,
    pub(super) group: String,
    pub(super) cost: String,
    #[serde(default)]
    pub(super) cautions: Vec<String>,
    #[serde(default)]
    pub(super) change: Vec<RawChange>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawChange {
    pub(super) setting: String,
    #[serde(default)]
    pub(super) scale: Option<f64>,
    #[serde(default)]
    pub(super) by_percent_points: Option<f64>,
    #[serde(default)]
    pub(super) to_percent: Option<f64>,
    #[serde(default)]
    pub(super) clear: Option<bool>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawCautionFile {
    #[serde(default)]
    pub(super) sources: Vec<String>,
    pub(super) cautions: BTreeMap<String, RawCaution>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawCaution {
    pub(super) title: String,
    pub(super) text: String,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawSymptomFile {
    pub(super) symptom: String,
    pub(super) title: String,
    pub(super) description: String,
    #[serde(default)]
    pub(super) aliases: Vec<String>,
    #[serde(default)]
    pub(super) places: Vec<String>,
    #[serde(default)]
    pub(super) sources: Vec<String>,
    #[serde(default)]
    pub(super) questions: Vec<RawQuestion>,
    pub(super) causes: Vec<RawRule>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawQuestion {
    pub(super) id: String,
    pub(super) text: String,
    #[serde(default)]
    pub(super) choices: Vec<RawChoice>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawChoice {
    pub(super) id: String,
    pub(super) text: String,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawRule {
    pub(super) cause: String,
    pub(super) because: String,
    pub(super) prior: f64,
    #[serde(default)]
    pub(super) evidence: Vec<RawEvidence>,
    #[serde(default)]
    pub(super) remedies: Vec<String>,
}

#[derive(Debug, Deserialize)]
#[serde(untagged)]
pub(super) enum RawThreshold {
    Number(f64),
    Text(String),
}

#[derive(Debug, Deserialize)]
#[serde(untagged)]
pub(super) enum OneOrMany {
    One(String),
    Many(Vec<String>),
}

impl OneOrMany {
    pub(super) fn into_vec(self) -> Vec<String> {
        match self {
            OneOrMany::One(s) => vec![s],
            OneOrMany::Many(v) => v,
        }
    }
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawEvidence {
    #[serde(default)]
    pub(super) indicator: Option<String>,
    #[serde(default)]
    pub(super) zone: Option<String>,
    #[serde(default)]
    pub(super) above: Option<RawThreshold>,
    #[serde(default)]
    pub(super) below: Option<RawThreshold>,
    #[serde(default)]
    pub(super) question: Option<String>,
    #[serde(default)]
    pub(super) is: Option<OneOrMany>,
    #[serde(default)]
    pub(super) material: Option<OneOrMany>,
    #[serde(default)]
    pub(super) method: Option<OneOrMany>,
    #[serde(default)]
    pub(super) place: Option<OneOrMany>,
    pub(super) weight: f64,
    /// `cause` (default) or `symptom`: see [`super::Scope`].
    #[serde(default)]
    pub(super) scope: Option<String>,
    pub(super) says: String,
}
