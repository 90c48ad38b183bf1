//! The expert system: indicators computed from a profile and a case, YAML rules, ranking of
//! causes with reasons, merged remedies with cautions, and the what-if check. No terminal code.

pub mod indicators;
pub mod rank;
pub mod remedies;
pub mod render;
pub mod rules;
pub mod search;
pub mod what_if;

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
#[derive(Debug, Clone, Default)]
pub struct DiagnoseOptions {
    /// Keep at most this many causes (0 = all with positive belief).
    pub top: usize,
    /// Re-solve remedies that change a winder setting (the what-if check).
    pub what_if: bool,
    /// Numerical options of every solve (the case's own and the what-if re-solves).
    pub solver: crate::model::SolverOptions,
    /// Solver to use instead of `model::solve` (alternative solvers, tests); `None` = the
    /// crate's solver.
    pub solve_with: Option<SolveFn>,
}

/// A stress solver: `model::solve` or a stand-in with the same contract.
pub type SolveFn =
    fn(&crate::model::WindingProblem) -> Result<crate::model::Profile, crate::model::ModelError>;

impl PartialEq for DiagnoseOptions {
    // Function pointers have no meaningful identity; two options are equal when they agree on
    // everything else and on whether a stand-in solver is set.
    fn eq(&self, other: &Self) -> bool {
        self.top == other.top
            && self.what_if == other.what_if
            && self.solver == other.solver
            && self.solve_with.is_some() == other.solve_with.is_some()
    }
}

impl DiagnoseOptions {
    /// Solve `problem` with the configured solver.
    pub fn solve(
        &self,
        problem: &crate::model::WindingProblem,
    ) -> Result<crate::model::Profile, crate::model::ModelError> {
        match self.solve_with {
            Some(f) => f(problem),
            None => crate::model::solve(problem),
        }
    }
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
            let hint = crate::vocabulary::closest(&symptom.id, known)
                .map(|c| format!(" (did you mean `{c}`?)"))
                .unwrap_or_default();
            return Err(DiagnoseError::Input(format!(
                "symptoms: unknown symptom `{}`{hint}",
                symptom.id
            )));
        }
        if let Some(place) = &symptom.place
            && !crate::vocabulary::PLACES.contains(&place.as_str())
        {
            return Err(DiagnoseError::Input(format!(
                "symptoms: `{}` where = `{place}` is not one of {}",
                symptom.id,
                crate::vocabulary::PLACES.join(", ")
            )));
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
            let hint = crate::vocabulary::closest(question, ids.iter().copied())
                .map(|c| format!(" (did you mean `{c}`?)"))
                .unwrap_or_default();
            return Err(DiagnoseError::Input(format!(
                "answers: unknown question `{question}`{hint}"
            )));
        };
        let accepted = q.accepted();
        if !accepted.contains(&value.as_str()) {
            let hint = crate::vocabulary::closest(value, accepted.iter().copied())
                .map(|c| format!(" (did you mean `{c}`?)"))
                .unwrap_or_default();
            return Err(DiagnoseError::Input(format!(
                "answers: `{question}` = `{value}` is not accepted; accepted: {}{hint}",
                accepted.join(", ")
            )));
        }
    }
    Ok(())
}

/// Diagnose a resolved case whose profile is already computed.
pub fn diagnose(
    rules: &rules::RuleBase,
    case: &crate::case::ResolvedCase,
    profile: &crate::model::Profile,
    options: &DiagnoseOptions,
) -> Result<Diagnosis, DiagnoseError> {
    let symptoms = observed_symptoms(rules, case)?;
    check_answers(rules, &case.answers)?;
    let indicators = indicators::Indicators::compute(case, profile);
    let mut causes = rank::rank(rules, &symptoms, case, &indicators);
    if options.top > 0 {
        causes.truncate(options.top);
    }
    let mut remedies = remedies::merge(rules, &symptoms, &causes);
    if options.what_if
        && remedies
            .iter()
            .any(|r| what_if::changes_setting(rules, &r.id))
    {
        // Before and after are compared at the same (what-if) resolution so the direction of a
        // change is never an artefact of different discretisations. An automatic resolution
        // that grouped the roll re-solves on the grid it chose, so the case as it stands needs
        // no second solve.
        let solver = match (
            options.solver.resolution,
            profile.summary.layers_per_element,
        ) {
            (crate::model::Resolution::Auto, k) if k > 1 => crate::model::SolverOptions {
                resolution: crate::model::Resolution::Grouped { layers: k },
                ..options.solver
            },
            _ => what_if::what_if_solver(case, options.solver),
        };
        let what_if_options = DiagnoseOptions {
            solver,
            ..options.clone()
        };
        let same_grid = what_if_options.solver == options.solver
            || match what_if_options.solver.resolution {
                crate::model::Resolution::Grouped { layers } => {
                    profile.summary.layers_per_element == layers
                }
                _ => false,
            };
        let baseline = if same_grid {
            (indicators.clone(), causes.clone())
        } else {
            let profile = what_if_options.solve(&case.problem(what_if_options.solver))?;
            let base_indicators = indicators::Indicators::compute(case, &profile);
            let base_causes = rank::rank(rules, &symptoms, case, &base_indicators);
            (base_indicators, base_causes)
        };
        // Distinct changed cases that need a solve; no-op changes and rating-only changes need none.
        let changed: Vec<Option<crate::case::ResolvedCase>> = remedies
            .iter()
            .map(|r| {
                let changes = &rules.remedies.get(&r.id)?.changes;
                (!changes.is_empty() && what_if::needs_solve(changes))
                    .then(|| what_if::apply_changes(case, changes))
            })
            .collect();
        let mut distinct: Vec<&crate::case::ResolvedCase> = Vec::new();
        for c in changed.iter().flatten() {
            if c != case && !distinct.contains(&c) {
                distinct.push(c);
            }
        }
        let solved = solve_all(&distinct, &what_if_options);
        let unchanged = crate::model::Profile::default();
        let before = what_if::Before {
            rules,
            symptoms: &symptoms,
            case,
            indicators: &baseline.0,
            causes: &baseline.1,
        };
        for (remedy, changed_case) in remedies.iter_mut().zip(&changed) {
            remedy.what_if = match changed_case {
                None => what_if::what_if(&before, remedy, &what_if_options),
                Some(c) => {
                    // A changed case equal to the case itself was not solved: what_if_solved
                    // answers "nothing to change" without looking at the profile.
                    let result = distinct
                        .iter()
                        .position(|d| *d == c)
                        .map_or(Ok(&unchanged), |i| solved[i].as_ref());
                    what_if::what_if_solved(&before, remedy, c, result)
                }
            };
        }
    }
    // A remedy the re-solve shows making the physics worse is kept (with its warning) but tried
    // last; the sort is stable so the order among the others stands.
    remedies.sort_by_key(|r| r.what_if.as_ref().is_some_and(|w| w.worse));
    let mut cautions: Vec<Caution> = Vec::new();
    for id in rules.cautions.keys() {
        if remedies.iter().any(|r| r.cautions.contains(id))
            && let Some(c) = rules.cautions.get(id)
        {
            cautions.push(Caution {
                id: c.id.clone(),
                title: c.title.clone(),
                text: c.text.clone(),
            });
        }
    }
    Ok(Diagnosis {
        causes,
        remedies,
        cautions,
        indicators: indicators.values(),
    })
}

/// Solve several what-if cases, in parallel where the machine has cores to spare.
fn solve_all(
    cases: &[&crate::case::ResolvedCase],
    options: &DiagnoseOptions,
) -> Vec<Result<crate::model::Profile, crate::model::ModelError>> {
    let threads = std::thread::available_parallelism()
        .map(|n| n.get())
        .unwrap_or(1)
        .clamp(1, 4)
        .min(cases.len().max(1));
    if threads <= 1 {
        return cases
            .iter()
            .map(|c| options.solve(&c.problem(options.solver)))
            .collect();
    }
    let chunk = cases.len().div_ceil(threads);
    std::thread::scope(|scope| {
        let handles: Vec<_> = cases
            .chunks(chunk)
            .map(|part| {
                let handle = scope.spawn(move || {
                    part.iter()
                        .map(|c| options.solve(&c.problem(options.solver)))
                        .collect::<Vec<_>>()
                });
                (part.len(), handle)
            })
            .collect();
        handles
            .into_iter()
            .flat_map(|(len, h)| {
                h.join().unwrap_or_else(|_| {
                    (0..len)
                        .map(|_| {
                            Err(crate::model::ModelError::NotConverged(
                                "a what-if solve panicked".into(),
                            ))
                        })
                        .collect()
                })
            })
            .collect()
    })
}

/// Solve the case's stress state and diagnose it: the one call the UI and the CLI need.
pub fn triage(
    rules: &rules::RuleBase,
    case: &crate::case::ResolvedCase,
    options: &DiagnoseOptions,
) -> Result<(crate::model::Profile, Diagnosis), DiagnoseError> {
    // Check the cheap things before the solve.
    observed_symptoms(rules, case)?;
    check_answers(rules, &case.answers)?;
    let profile = options.solve(&case.problem(options.solver))?;
    let diagnosis = diagnose(rules, case, &profile, options)?;
    Ok((profile, diagnosis))
}
