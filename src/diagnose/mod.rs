//! The expert system: indicators computed from a profile and a case, YAML rules, ranking of
//! causes with reasons, merged remedies with cautions, and the what-if check. No terminal code.

pub mod indicators;
pub mod rank;
pub mod remedies;
pub mod rules;

use serde::{Deserialize, Serialize};

/// The answer to "this roll is defective — why, and what do we change?".
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct Diagnosis {
    /// Causes, most likely first.
    pub causes: Vec<RankedCause>,
    /// One merged, deduplicated remedy list, in the order to try.
    pub remedies: Vec<MergedRemedy>,
    /// Cautions touched by any listed remedy.
    pub cautions: Vec<Caution>,
    /// Every indicator value computed for this case.
    pub indicators: Vec<indicators::IndicatorValue>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RankedCause {
    pub id: String,
    pub title: String,
    pub mechanism: String,
    /// Combined belief, 0..=1.
    pub belief: f64,
    /// Every contribution to `belief`.
    pub reasons: Vec<Reason>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Reason {
    /// Symptom rule the reason came from.
    pub symptom: String,
    /// What was tested: `prior`, an indicator ID, a question ID or a case input.
    pub test: String,
    pub zone: Option<String>,
    /// The value found, formatted with its unit.
    pub value: Option<String>,
    /// The threshold, formatted with its unit and comparison (e.g. "> 0.8").
    pub threshold: Option<String>,
    /// Signed contribution (certainty factor or weight) this reason made.
    pub weight: f64,
    /// Plain-words explanation.
    pub text: String,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MergedRemedy {
    pub id: String,
    pub text: String,
    /// winder_setting, equipment, material_or_core, handling_and_storage, process_upstream.
    pub group: String,
    /// Cause IDs this remedy answers.
    pub answers: Vec<String>,
    /// Caution IDs that apply.
    pub cautions: Vec<String>,
    /// Re-solved effect for remedies that change a winder setting.
    pub what_if: Option<WhatIf>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct WhatIf {
    pub indicator: String,
    pub before: String,
    pub after: String,
    /// True when the change makes the driving indicator worse.
    pub worse: bool,
    pub note: String,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Caution {
    pub id: String,
    pub title: String,
    pub text: String,
}

/// Errors of the diagnosis layer.
#[derive(Debug, thiserror::Error)]
pub enum DiagnoseError {
    #[error(transparent)]
    Rules(#[from] rules::RuleError),
    #[error(transparent)]
    Model(#[from] crate::model::ModelError),
    #[error("{0}")]
    Input(String),
}

/// Options of a diagnosis.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct DiagnoseOptions {
    /// Keep at most this many causes (0 = all with positive belief).
    pub top: usize,
    /// Re-solve remedies that change a winder setting (the what-if check).
    pub what_if: bool,
}

/// Diagnose a resolved case whose profile is already computed.
pub fn diagnose(
    _rules: &rules::RuleBase,
    _case: &crate::case::ResolvedCase,
    _profile: &crate::model::Profile,
    _options: &DiagnoseOptions,
) -> Result<Diagnosis, DiagnoseError> {
    Err(DiagnoseError::Input("diagnosis not implemented yet".into()))
}
