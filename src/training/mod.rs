//! Guided training walk-throughs: a trainee reads a demo roll's story and symptoms, answers
//! multiple-choice questions (zone at risk, likely cause, remedy to try first, safety
//! precaution) and gets feedback built from the computed stress state, then a score.
//!
//! Walk-throughs are YAML files of our own schema ([`Walkthrough`]) so a plant can write its
//! own; [`lint`] checks them. The shipped set and the demo cases they use are embedded in the
//! binary ([`library`]). The terminal UI uses the same API: [`library::embedded`],
//! [`load_dir`], [`Session`], [`check_answer`], [`Score`].

pub mod library;
pub mod lint;
mod placeholders;
mod session;
pub mod text_plot;

use serde::{Deserialize, Serialize};

pub use lint::{LintProblem, lint_dir, lint_walkthroughs};
pub use placeholders::{PLACEHOLDERS, fill_placeholders};
pub use session::{Computed, Feedback, Score, Session, TrainingContext, check_answer};

/// One guided case.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Walkthrough {
    /// Stable ID used on the command line (`rolltriage train ID`).
    pub id: String,
    pub title: String,
    /// Case file name, looked up next to the walk-through file, in its parent folder, then in
    /// the shipped demo cases.
    pub case: String,
    /// beginner, intermediate, advanced.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub level: Option<String>,
    /// Shown before the case story (e.g. what to look for).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub introduction: Option<String>,
    pub questions: Vec<Question>,
    /// Closing words after the score.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub summary: Option<String>,
}

/// What a question trains.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Topic {
    ZoneAtRisk,
    Cause,
    Remedy,
    Safety,
    Mechanics,
}

impl Topic {
    pub fn as_str(self) -> &'static str {
        match self {
            Topic::ZoneAtRisk => "zone at risk",
            Topic::Cause => "likely cause",
            Topic::Remedy => "remedy to try first",
            Topic::Safety => "safety",
            Topic::Mechanics => "mechanics",
        }
    }
}

/// Which computed curve the feedback draws as a text plot.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum PlotChoice {
    Pressure,
    Tangential,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Question {
    pub id: String,
    pub topic: Topic,
    pub prompt: String,
    pub choices: Vec<Choice>,
    /// The mechanics behind the answer. `{placeholders}` are filled from the computed profile
    /// and diagnosis (see [`PLACEHOLDERS`]).
    pub explanation: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub plot: Option<PlotChoice>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Choice {
    pub text: String,
    #[serde(default, skip_serializing_if = "std::ops::Not::not")]
    pub correct: bool,
    /// Shown when the trainee picks this choice.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub feedback: Option<String>,
    /// Zone this choice names (checked against the zone vocabulary).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub zone: Option<String>,
    /// Cause ID this choice names (checked against the cause vocabulary; tests compare the
    /// correct one with the computed ranking).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub cause: Option<String>,
}

impl Question {
    /// Index (0-based) of the correct choice, if exactly one is marked.
    pub fn correct_choice(&self) -> Option<usize> {
        let mut correct = self.choices.iter().enumerate().filter(|(_, c)| c.correct);
        match (correct.next(), correct.next()) {
            (Some((index, _)), None) => Some(index),
            _ => None,
        }
    }
}

/// Errors of the training module.
#[derive(Debug, thiserror::Error)]
pub enum TrainingError {
    /// The field is not called `source`: the message already includes it, and a chain
    /// printer would repeat it.
    #[error("cannot read {path}: {error}")]
    Read {
        path: std::path::PathBuf,
        error: std::io::Error,
    },
    #[error("{origin}: {message}")]
    Invalid { origin: String, message: String },
    #[error("no walk-through \"{given}\"{suggestion}; `rolltriage train --list` shows them")]
    UnknownWalkthrough { given: String, suggestion: String },
    #[error("case \"{case}\" of walk-through {walkthrough} not found (looked in {looked})")]
    CaseNotFound {
        walkthrough: String,
        case: String,
        looked: String,
    },
    #[error("question {question}: choice {given} is out of range; accepted: 1 to {count}")]
    ChoiceOutOfRange {
        question: usize,
        given: usize,
        count: usize,
    },
    #[error("question {given} does not exist; the walk-through has {count} questions")]
    QuestionOutOfRange { given: usize, count: usize },
    #[error(transparent)]
    Case(#[from] crate::case::CaseError),
}

impl Walkthrough {
    /// Parse a walk-through from YAML; `origin` names the file in messages.
    pub fn from_yaml_str(text: &str, origin: &str) -> Result<Walkthrough, TrainingError> {
        // Aliases are refused before parsing: expanding an alias chain costs work exponential
        // in the file size.
        if let Some((line, column)) = crate::case::yaml_guard::first_alias(text) {
            return Err(TrainingError::Invalid {
                origin: origin.to_string(),
                message: format!(
                    "line {line}, column {column}: a YAML alias (`*name`) is not accepted in a walk-through; write the value out instead"
                ),
            });
        }
        yaml::from_str(text).map_err(|e| TrainingError::Invalid {
            origin: origin.to_string(),
            message: e.to_string(),
        })
    }

    /// Read and parse one walk-through file.
    pub fn load(path: &std::path::Path) -> Result<Walkthrough, TrainingError> {
        let text = std::fs::read_to_string(path).map_err(|source| TrainingError::Read {
            path: path.to_path_buf(),
            error: source,
        })?;
        Walkthrough::from_yaml_str(&text, &path.display().to_string())
    }
}

/// A walk-through with where it came from (a file, or the shipped set).
#[derive(Debug, Clone, PartialEq)]
pub struct LoadedWalkthrough {
    pub walkthrough: Walkthrough,
    /// The file, or `None` for a shipped walk-through.
    pub path: Option<std::path::PathBuf>,
}

/// Load every `*.yaml` walk-through in `dir`, sorted by file name.
pub fn load_dir(dir: &std::path::Path) -> Result<Vec<LoadedWalkthrough>, TrainingError> {
    let paths = crate::fsutil::yaml_files(dir).map_err(|source| TrainingError::Read {
        path: dir.to_path_buf(),
        error: source,
    })?;
    paths
        .into_iter()
        .map(|path| {
            Walkthrough::load(&path).map(|walkthrough| LoadedWalkthrough {
                walkthrough,
                path: Some(path),
            })
        })
        .collect()
}

/// Find a walk-through by ID (exact), with a "did you mean" on a miss.
pub fn find<'a>(
    walkthroughs: &'a [LoadedWalkthrough],
    id: &str,
) -> Result<&'a LoadedWalkthrough, TrainingError> {
    if let Some(found) = walkthroughs.iter().find(|w| w.walkthrough.id == id) {
        return Ok(found);
    }
    let suggestion =
        crate::vocabulary::closest(id, walkthroughs.iter().map(|w| w.walkthrough.id.as_str()))
            .map(|s| format!(" (did you mean \"{s}\"?)"))
            .unwrap_or_default();
    Err(TrainingError::UnknownWalkthrough {
        given: id.to_string(),
        suggestion,
    })
}

/// Load the case a walk-through refers to: next to its file, in the parent folder, then the
/// shipped demo cases.
pub fn load_case(loaded: &LoadedWalkthrough) -> Result<crate::case::Case, TrainingError> {
    let name = &loaded.walkthrough.case;
    let mut looked = Vec::new();
    if let Some(path) = &loaded.path {
        for folder in path
            .parent()
            .into_iter()
            .flat_map(|p| [Some(p), p.parent()])
        {
            let Some(folder) = folder else { continue };
            let candidate = folder.join(name);
            if candidate.is_file() {
                return Ok(crate::case::Case::load(&candidate)?);
            }
            looked.push(folder.display().to_string());
        }
    }
    if let Some(text) = library::demo_case(name) {
        return Ok(crate::case::Case::from_yaml_str(text, name)?);
    }
    looked.push("the shipped demo cases".to_string());
    Err(TrainingError::CaseNotFound {
        walkthrough: loaded.walkthrough.id.clone(),
        case: name.clone(),
        looked: looked.join(", "),
    })
}
