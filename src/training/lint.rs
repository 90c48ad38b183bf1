//! Lint of walk-through files: every question has at least two choices and exactly one correct
//! answer, IDs are unique, placeholders, zones and causes are known, and every referenced case
//! exists and parses.

use std::collections::BTreeSet;

use super::placeholders::{is_known, placeholders_in};
use super::{LoadedWalkthrough, Walkthrough, load_case};
use crate::model::ZoneName;
use crate::vocabulary::{CAUSE_IDS, closest};

/// One problem found by the lint, naming the file (or walk-through) and the question.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct LintProblem {
    pub origin: String,
    pub message: String,
}

impl std::fmt::Display for LintProblem {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}: {}", self.origin, self.message)
    }
}

fn origin_of(loaded: &LoadedWalkthrough) -> String {
    match &loaded.path {
        Some(path) => path.display().to_string(),
        None => format!("shipped walk-through {}", loaded.walkthrough.id),
    }
}

/// Lint every walk-through file in `dir`. A file that does not parse is a problem, not an error.
pub fn lint_dir(dir: &std::path::Path) -> Result<Vec<LintProblem>, super::TrainingError> {
    let paths = crate::fsutil::yaml_files(dir).map_err(|source| super::TrainingError::Read {
        path: dir.to_path_buf(),
        error: source,
    })?;
    let mut problems = Vec::new();
    let mut loaded = Vec::new();
    for path in paths {
        match Walkthrough::load(&path) {
            Ok(walkthrough) => loaded.push(LoadedWalkthrough {
                walkthrough,
                path: Some(path),
            }),
            Err(error) => problems.push(LintProblem {
                origin: path.display().to_string(),
                message: match error {
                    super::TrainingError::Invalid { message, .. } => message,
                    other => other.to_string(),
                },
            }),
        }
    }
    if loaded.is_empty() && problems.is_empty() {
        problems.push(LintProblem {
            origin: dir.display().to_string(),
            message: "no walk-through files (*.yaml) found".to_string(),
        });
    }
    problems.extend(lint_walkthroughs(&loaded));
    Ok(problems)
}

/// Lint walk-throughs already loaded.
pub fn lint_walkthroughs(walkthroughs: &[LoadedWalkthrough]) -> Vec<LintProblem> {
    let mut problems = Vec::new();
    let mut ids = BTreeSet::new();
    for loaded in walkthroughs {
        let origin = origin_of(loaded);
        let mut problem = |message: String| {
            problems.push(LintProblem {
                origin: origin.clone(),
                message,
            })
        };
        let w = &loaded.walkthrough;
        if !ids.insert(w.id.clone()) {
            problem(format!("walk-through ID \"{}\" is used twice", w.id));
        }
        if w.id.trim().is_empty() || w.id.contains(char::is_whitespace) {
            problem(format!("walk-through ID \"{}\" must be one word", w.id));
        }
        if let Some(level) = &w.level
            && !["beginner", "intermediate", "advanced"].contains(&level.as_str())
        {
            problem(format!(
                "level \"{level}\" is not known; accepted: beginner, intermediate, advanced"
            ));
        }
        match load_case(loaded) {
            Ok(case) => {
                if case.symptoms.is_empty() {
                    problem(format!("case \"{}\" has no symptoms to show", w.case));
                }
            }
            Err(error) => problem(error.to_string()),
        }
        if w.questions.is_empty() {
            problem("has no questions".to_string());
        }
        let mut question_ids = BTreeSet::new();
        let mut texts: Vec<(&str, String)> = Vec::new();
        if let Some(summary) = &w.summary {
            texts.push(("summary", summary.clone()));
        }
        if let Some(introduction) = &w.introduction {
            texts.push(("introduction", introduction.clone()));
        }
        for (index, q) in w.questions.iter().enumerate() {
            let at = format!("question {} ({})", index + 1, q.id);
            if !question_ids.insert(q.id.clone()) {
                problem(format!("{at}: question ID used twice"));
            }
            if q.choices.len() < 2 {
                problem(format!(
                    "{at}: needs at least 2 choices, has {}",
                    q.choices.len()
                ));
            }
            let correct = q.choices.iter().filter(|c| c.correct).count();
            if correct != 1 {
                problem(format!(
                    "{at}: needs exactly one correct choice, has {correct}"
                ));
            }
            let mut seen = BTreeSet::new();
            for (number, choice) in q.choices.iter().enumerate() {
                if !seen.insert(choice.text.trim().to_lowercase()) {
                    problem(format!(
                        "{at}: choice {} repeats another choice",
                        number + 1
                    ));
                }
                if let Some(zone) = &choice.zone
                    && !ZoneName::ALL.iter().any(|z| z.as_str() == zone)
                {
                    problem(format!(
                        "{at}: choice {}: unknown zone \"{zone}\"; accepted: core, inner, middle, outer, surface",
                        number + 1
                    ));
                }
                if let Some(cause) = &choice.cause
                    && !CAUSE_IDS.contains(&cause.as_str())
                {
                    let hint = closest(cause, CAUSE_IDS)
                        .map(|c| format!(" (did you mean \"{c}\"?)"))
                        .unwrap_or_default();
                    problem(format!(
                        "{at}: choice {}: unknown cause \"{cause}\"{hint}",
                        number + 1
                    ));
                }
                if let Some(feedback) = &choice.feedback {
                    texts.push(("choice feedback", feedback.clone()));
                }
                texts.push(("choice", choice.text.clone()));
            }
            // Every text the trainee reads is filled, the prompt too; an unknown name would be
            // shown as written ("{roll_diametre}").
            texts.push(("prompt", q.prompt.clone()));
            texts.push(("explanation", q.explanation.clone()));
            if q.explanation.trim().is_empty() {
                problem(format!("{at}: explanation is empty"));
            }
        }
        for (what, text) in texts {
            for placeholder in placeholders_in(&text) {
                if !is_known(&placeholder) {
                    let (name, _) = placeholder.split_once(':').unwrap_or((&placeholder, ""));
                    let hint = closest(name, super::PLACEHOLDERS.iter().map(|(n, _)| *n))
                        .map(|c| format!(" (did you mean \"{c}\"?)"))
                        .unwrap_or_default();
                    problem(format!(
                        "{what}: unknown placeholder {{{placeholder}}}{hint}; zone placeholders \
                         take a zone, e.g. {{pressure_mean:outer}}"
                    ));
                }
            }
        }
    }
    problems
}
