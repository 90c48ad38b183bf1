//! The expert system: indicators computed from a profile and a case, YAML rules, ranking of
//! causes with reasons, merged remedies with cautions, the what-if check, and the one triage
//! [`pipeline`] from a case to its diagnosis. No terminal code.

pub mod indicators;
pub mod pipeline;
pub mod rank;
pub mod remedies;
pub mod render;
pub mod rules;
pub mod search;
pub mod sensitivity;
pub mod what_if;
pub mod words;

pub use search::{SymptomMatch, resolve_symptom, search_symptoms};

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
    /// What was measured on the roll against what was computed (docs/evidence.md); absent
    /// when nothing was measured.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub evidence: Option<crate::evidence::Evidence>,
}

/// Remedy groups in words: the one name each group has in the CLI, the UI and reports.
pub const GROUP_TITLES: [(&str, &str); 5] = [
    ("winder_setting", "Winder settings"),
    ("equipment", "Equipment"),
    ("material_or_core", "Material and core"),
    ("handling_and_storage", "Handling and storage"),
    ("process_upstream", "Upstream process"),
];

/// The plain-words name of a remedy group (an unknown group shows its ID with spaces).
pub fn group_title(group: &str) -> String {
    GROUP_TITLES
        .iter()
        .find(|(g, _)| *g == group)
        .map(|(_, t)| (*t).to_string())
        .unwrap_or_else(|| group.replace('_', " "))
}

impl Diagnosis {
    /// The title of a ranked cause, or its ID in words when it is not ranked.
    pub fn cause_title(&self, id: &str) -> String {
        self.causes
            .iter()
            .find(|c| c.id == id)
            .map(|c| c.title.clone())
            .unwrap_or_else(|| id.replace('_', " "))
    }

    /// "Web tension too low; Slippery web" — the causes a remedy answers, in words.
    pub fn answers_text(&self, remedy: &MergedRemedy) -> String {
        remedy
            .answers
            .iter()
            .map(|id| self.cause_title(id))
            .collect::<Vec<_>>()
            .join("; ")
    }

    /// The cautions of one remedy, in full.
    pub fn cautions_of<'a>(
        &'a self,
        remedy: &'a MergedRemedy,
    ) -> impl Iterator<Item = &'a Caution> {
        self.cautions
            .iter()
            .filter(|c| remedy.cautions.contains(&c.id))
    }

    /// The titles of one remedy's cautions, joined.
    pub fn caution_titles(&self, remedy: &MergedRemedy) -> String {
        self.cautions_of(remedy)
            .map(|c| c.title.clone())
            .collect::<Vec<_>>()
            .join(", ")
    }
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
    /// Cost to try: low, medium, high.
    pub cost: String,
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
    /// True when the re-solve predicts the change does little here: the deciding indicator of
    /// every cause it answers moves by less than [`remedies::SMALL_EFFECT`] of its value and
    /// stays past the rule threshold.
    #[serde(default)]
    pub small_effect: bool,
    pub note: String,
    /// The failure margins relevant to the causes the remedy answers that the change moves
    /// (`what_if::margins`), from the mechanics layer's margins table; empty when none moves.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub margins: Vec<what_if::MarginShift>,
    /// `indicator` and `note` in plain words for people (screens, text, reports); JSON keeps
    /// the IDs above. Empty on a what-if read back from JSON.
    #[serde(skip)]
    pub words: WhatIfWords,
}

/// A what-if's indicator and note in words ("wound-in tension step", "belief in 'Tension
/// upset'").
#[derive(Debug, Clone, Default, PartialEq)]
pub struct WhatIfWords {
    pub indicator: String,
    pub note: String,
}

impl WhatIf {
    /// The indicator in words (its ID with spaces when the words are not known).
    pub fn indicator_text(&self) -> String {
        if self.words.indicator.is_empty() {
            self.indicator.replace('_', " ")
        } else {
            self.words.indicator.clone()
        }
    }

    /// The moved margins in words, "; "-separated ("starring margin 0.80 → 1.30"); empty when
    /// none moved.
    pub fn margins_text(&self) -> String {
        self.margins
            .iter()
            .map(|m| {
                if m.words.is_empty() {
                    format!(
                        "{} {} → {}",
                        m.mechanism.replace('_', " "),
                        m.before,
                        m.after
                    )
                } else {
                    m.words.clone()
                }
            })
            .collect::<Vec<_>>()
            .join("; ")
    }

    /// `note` followed by the failure margins the change moves ("…; starring margin 0.80 →
    /// 1.30"): the what-if line of the text output and the reports' remedy list.
    pub fn with_margins(&self, note: &str) -> String {
        let margins = self.margins_text();
        match (note.is_empty(), margins.is_empty()) {
            (_, true) => note.to_string(),
            (true, false) => margins,
            (false, false) => format!("{note}; {margins}"),
        }
    }

    /// The note in words (the note as stored when the words are not known).
    pub fn note_text(&self) -> &str {
        if self.words.note.is_empty() {
            &self.note
        } else {
            &self.words.note
        }
    }
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
    /// The case's inputs could not be resolved (boxed: a case error carries file and field).
    #[error(transparent)]
    Case(Box<crate::case::CaseError>),
    /// The measurements could not be compared with the profile (names the field).
    #[error("measurements: {0}")]
    Evidence(#[from] crate::evidence::EvidenceError),
    #[error("symptoms: unknown symptom `{id}`{}", did_you_mean(suggestion))]
    UnknownSymptom {
        id: String,
        suggestion: Option<String>,
    },
    #[error("symptoms: `{symptom}` where = `{place}` is not one of {}", accepted.join(", "))]
    UnknownPlace {
        symptom: String,
        place: String,
        accepted: Vec<String>,
    },
    #[error("answers: unknown question `{question}`{}", did_you_mean(suggestion))]
    UnknownQuestion {
        question: String,
        suggestion: Option<String>,
    },
    #[error(
        "answers: `{question}` = `{value}` is not accepted; accepted: {}{}",
        accepted.join(", "),
        did_you_mean(suggestion)
    )]
    AnswerNotAccepted {
        question: String,
        value: String,
        accepted: Vec<String>,
        suggestion: Option<String>,
    },
}

impl From<crate::case::CaseError> for DiagnoseError {
    fn from(error: crate::case::CaseError) -> Self {
        DiagnoseError::Case(Box::new(error))
    }
}

/// The " (did you mean `x`?)" tail of a message, or nothing.
fn did_you_mean(suggestion: &Option<String>) -> String {
    suggestion
        .as_ref()
        .map(|c| format!(" (did you mean `{c}`?)"))
        .unwrap_or_default()
}

/// Options of a diagnosis.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct DiagnoseOptions {
    /// Keep at most this many causes (0 = all with positive belief).
    pub top: usize,
    /// Re-solve remedies that change a winder setting (the what-if check).
    pub what_if: bool,
    /// Numerical options of the case's own solve; the what-if re-solves use the grid that solve
    /// used (see [`pipeline`]).
    pub solver: crate::model::SolverOptions,
}

/// The observed symptom IDs of a case, deduplicated in case order; unknown IDs are errors with
/// a "did you mean".
pub fn observed_symptoms(
    rules: &rules::RuleBase,
    case: &crate::case::ResolvedCase,
) -> Result<Vec<String>, DiagnoseError> {
    let mut out: Vec<String> = Vec::new();
    for symptom in &case.symptoms {
        if rules.symptom(&symptom.id).is_none() {
            let known = rules.symptoms.iter().map(|s| s.id.as_str());
            return Err(DiagnoseError::UnknownSymptom {
                id: symptom.id.clone(),
                suggestion: crate::vocabulary::closest(&symptom.id, known).map(str::to_string),
            });
        }
        if let Some(place) = &symptom.place
            && !crate::vocabulary::PLACES.contains(&place.as_str())
        {
            return Err(DiagnoseError::UnknownPlace {
                symptom: symptom.id.clone(),
                place: place.clone(),
                accepted: crate::vocabulary::PLACES
                    .iter()
                    .map(|p| p.to_string())
                    .collect(),
            });
        }
        if !out.contains(&symptom.id) {
            out.push(symptom.id.clone());
        }
    }
    Ok(out)
}

/// Check every answer names a known question and an accepted value.
pub fn check_answers(
    rules: &rules::RuleBase,
    answers: &std::collections::BTreeMap<String, String>,
) -> Result<(), DiagnoseError> {
    for (question, value) in answers {
        let Some(q) = rules.question(question) else {
            let ids = rules.question_ids();
            return Err(DiagnoseError::UnknownQuestion {
                question: question.clone(),
                suggestion: crate::vocabulary::closest(question, ids.iter().copied())
                    .map(str::to_string),
            });
        };
        let accepted = q.accepted();
        if !accepted.contains(&value.as_str()) {
            return Err(DiagnoseError::AnswerNotAccepted {
                question: question.clone(),
                value: value.clone(),
                suggestion: crate::vocabulary::closest(value, accepted.iter().copied())
                    .map(str::to_string),
                accepted: accepted.iter().map(|a| a.to_string()).collect(),
            });
        }
    }
    Ok(())
}

/// Check the case's symptoms and answers against the rule base (cheap: do it before a solve).
pub fn check_inputs(
    rules: &rules::RuleBase,
    case: &crate::case::ResolvedCase,
) -> Result<(), DiagnoseError> {
    observed_symptoms(rules, case)?;
    check_answers(rules, &case.answers)
}

/// Diagnose a resolved case whose profile is already computed (no progress reports).
pub fn diagnose(
    rules: &rules::RuleBase,
    case: &crate::case::ResolvedCase,
    profile: &crate::model::Profile,
    options: &DiagnoseOptions,
) -> Result<Diagnosis, DiagnoseError> {
    pipeline::diagnose_solved(rules, case, profile, options, &mut |_| true)
}

/// Solve the case's stress state and diagnose it, through the one [`pipeline`]; the inputs are
/// checked before the solve so a mistyped symptom or answer fails at once.
pub fn triage(
    rules: &rules::RuleBase,
    case: &crate::case::ResolvedCase,
    options: &DiagnoseOptions,
) -> Result<(crate::model::Profile, Diagnosis), DiagnoseError> {
    check_inputs(rules, case)?;
    let triage = pipeline::triage(rules, case.into(), options, &mut |_| true)?;
    Ok((triage.profile, triage.diagnosis?))
}
