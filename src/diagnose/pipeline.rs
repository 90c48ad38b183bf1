//! The one triage pipeline: case → resolved inputs → mechanics problem → stress solve →
//! diagnosis (indicators, ranking, remedies, what-if re-solves), with progress and
//! cancellation. The CLI (`stress`, `diagnose`), the terminal UI's solver job, reports and the
//! training walk-throughs all run it; none of them strings the steps together itself.
//!
//! Grid policy: the case's own solve uses the caller's [`SolverOptions`]; every what-if re-solve
//! asks the model for the grid that solve actually used ([`crate::model::Grid::resolution`]), so
//! before and after are compared on the same discretisation and the case needs no second solve.

use std::sync::Mutex;
use std::sync::atomic::{AtomicBool, Ordering};

use super::{
    Caution, DiagnoseError, DiagnoseOptions, Diagnosis, check_answers, indicators,
    observed_symptoms, rank, remedies, rules::RuleBase, what_if,
};
use crate::case::{Case, ResolvedCase};
use crate::mechanics::table::MarginTable;
use crate::model::{ModelError, Profile, SolverOptions};

/// Progress callback: called with the fraction done (0..=1); returning `false` cancels the work,
/// which then ends with [`ModelError::Cancelled`]. `Send` because what-if re-solves run on
/// worker threads and report through it.
pub type Progress<'a> = &'a mut (dyn FnMut(f64) -> bool + Send);

/// What the pipeline starts from.
#[derive(Debug, Clone, Copy)]
pub enum CaseInputs<'a> {
    /// A case file as read: resolved first.
    File(&'a Case),
    /// Inputs already resolved (and perhaps changed, e.g. a remedy tried in the UI).
    Resolved(&'a ResolvedCase),
}

impl<'a> From<&'a Case> for CaseInputs<'a> {
    fn from(case: &'a Case) -> Self {
        CaseInputs::File(case)
    }
}

impl<'a> From<&'a ResolvedCase> for CaseInputs<'a> {
    fn from(case: &'a ResolvedCase) -> Self {
        CaseInputs::Resolved(case)
    }
}

/// The stress state of a case.
#[derive(Debug, Clone, PartialEq)]
pub struct Solved {
    pub resolved: ResolvedCase,
    pub profile: Profile,
}

/// The stress state and its diagnosis. The diagnosis can fail on its own (an unknown symptom
/// or answer, rule trouble) while the stresses stand.
#[derive(Debug)]
pub struct Triage {
    pub resolved: ResolvedCase,
    pub profile: Profile,
    pub diagnosis: Result<Diagnosis, DiagnoseError>,
}

/// Resolve and solve: the first half of the pipeline (the `stress` command stops here).
pub fn solve_case(
    inputs: CaseInputs<'_>,
    solver: SolverOptions,
    progress: Progress<'_>,
) -> Result<Solved, DiagnoseError> {
    let resolved = match inputs {
        CaseInputs::File(case) => case.resolve()?,
        CaseInputs::Resolved(resolved) => resolved.clone(),
    };
    let profile = crate::model::solve_with_progress(&resolved.problem(solver), progress)?;
    Ok(Solved { resolved, profile })
}

/// Resolve, solve and diagnose. Progress runs over the case's solve and then the what-if
/// re-solves (when `options.what_if`).
pub fn triage(
    rules: &RuleBase,
    inputs: CaseInputs<'_>,
    options: &DiagnoseOptions,
    progress: Progress<'_>,
) -> Result<Triage, DiagnoseError> {
    let solve_share = if options.what_if { 0.5 } else { 1.0 };
    let Solved { resolved, profile } =
        solve_case(inputs, options.solver, &mut |f| progress(solve_share * f))?;
    let diagnosis = diagnose_solved(rules, &resolved, &profile, options, &mut |f| {
        progress(solve_share + (1.0 - solve_share) * f)
    });
    if let Err(DiagnoseError::Model(ModelError::Cancelled)) = diagnosis {
        return Err(ModelError::Cancelled.into());
    }
    Ok(Triage {
        resolved,
        profile,
        diagnosis,
    })
}

/// Diagnose a case whose profile is already computed (progress covers the what-if re-solves).
pub fn diagnose_solved(
    rules: &RuleBase,
    case: &ResolvedCase,
    profile: &Profile,
    options: &DiagnoseOptions,
    progress: Progress<'_>,
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
        let what_if = WhatIfContext {
            before: what_if::Before {
                rules,
                symptoms: &symptoms,
                case,
                indicators: &indicators,
                causes: &causes,
            },
            solver: SolverOptions {
                resolution: profile.solver.grid.resolution(),
                ..options.solver
            },
            profile,
        };
        let after = what_if.fill(&mut remedies, progress)?;
        remedies::order_by_effect(&what_if.before, &mut remedies, &after);
    }
    let _ = progress(1.0);
    // A remedy the re-solve shows making the physics worse is kept (with its warning) but tried
    // last; the sort is stable so the order among the others stands.
    remedies.sort_by_key(|r| r.what_if.as_ref().is_some_and(|w| w.worse));
    remedies::group_in_order(&mut remedies);
    let cautions = rules
        .cautions
        .iter()
        .filter(|(id, _)| remedies.iter().any(|r| r.cautions.contains(id)))
        .map(|(_, c)| Caution {
            id: c.id.clone(),
            title: c.title.clone(),
            text: c.text.clone(),
        })
        .collect();
    let evidence = match case.measurements.as_ref().filter(|m| !m.is_empty()) {
        Some(m) => Some(crate::evidence::compare(
            m,
            &case.problem(options.solver),
            profile,
        )?),
        None => None,
    };
    Ok(Diagnosis {
        causes,
        remedies,
        cautions,
        indicators: indicators.values(),
        evidence,
    })
}

/// The case as it stands, diagnosed, its stress state, and the grid its changed versions are
/// re-solved on.
struct WhatIfContext<'a> {
    before: what_if::Before<'a>,
    solver: SolverOptions,
    profile: &'a Profile,
}

impl WhatIfContext<'_> {
    /// Fill each setting-changing remedy's before/after row; return each remedy's indicators
    /// after its change (`None` for remedies that change no setting or whose solve failed), for
    /// ordering by effect. Each distinct changed case is solved and its indicators computed once.
    fn fill(
        &self,
        remedies: &mut [super::MergedRemedy],
        progress: Progress<'_>,
    ) -> Result<Vec<Option<indicators::Indicators>>, DiagnoseError> {
        // Distinct changed cases that need a solve; no-op changes and rating-only changes need
        // none.
        let changed: Vec<Option<ResolvedCase>> = remedies
            .iter()
            .map(|r| {
                let changes = &self.before.rules.remedies.get(&r.id)?.changes;
                (!changes.is_empty() && what_if::needs_solve(changes))
                    .then(|| what_if::apply_changes(self.before.case, changes))
            })
            .collect();
        let mut distinct: Vec<&ResolvedCase> = Vec::new();
        for c in changed.iter().flatten() {
            if c != self.before.case && !distinct.contains(&c) {
                distinct.push(c);
            }
        }
        let solved = solve_all(&distinct, self.solver, progress)?;
        // Each changed case's indicators and margins table, read from its one solve.
        let solved: Vec<Result<(indicators::Indicators, MarginTable), ModelError>> = distinct
            .iter()
            .zip(solved)
            .map(|(c, s)| {
                s.map(|p| {
                    (
                        indicators::Indicators::compute_after_change(c, &p, self.before.indicators),
                        what_if::margins::table_of(c, &p),
                    )
                })
            })
            .collect();
        let before_margins = what_if::margins::table_of(self.before.case, self.profile);
        let unchanged = indicators::Indicators::default();
        let mut after = Vec::with_capacity(remedies.len());
        for (remedy, changed_case) in remedies.iter_mut().zip(&changed) {
            match changed_case {
                None => {
                    remedy.what_if = what_if::what_if(&self.before, remedy, self.solver);
                    // A rating-only change keeps the stress state: its indicators and margins
                    // are the case's profile read against the new rating (no solve).
                    let rated = self
                        .before
                        .rules
                        .remedies
                        .get(&remedy.id)
                        .filter(|r| !r.changes.is_empty())
                        .map(|r| what_if::apply_changes(self.before.case, &r.changes));
                    if let Some(c) = &rated {
                        let margins = what_if::margins::table_of(c, self.profile);
                        add_margins(remedy, &before_margins, &margins);
                    }
                    after.push(rated.map(|c| {
                        indicators::Indicators::compute_after_change(
                            &c,
                            self.profile,
                            self.before.indicators,
                        )
                    }));
                }
                Some(c) => {
                    // A changed case equal to the case was not solved: what_if_after answers
                    // "nothing to change" without looking at the indicators.
                    let result = distinct
                        .iter()
                        .position(|d| *d == c)
                        .map_or(Ok((&unchanged, None)), |i| {
                            solved[i].as_ref().map(|(ind, table)| (ind, Some(table)))
                        });
                    let indicators = result.map(|(ind, _)| ind);
                    remedy.what_if = what_if::what_if_after(&self.before, remedy, c, indicators);
                    if let Ok((_, Some(margins))) = result {
                        add_margins(remedy, &before_margins, margins);
                    }
                    after.push(indicators.ok().filter(|_| c != self.before.case).cloned());
                }
            }
        }
        Ok(after)
    }
}

/// The margins relevant to the causes `remedy` answers that its change moves, on its what-if
/// row (a row with an indicator: a note-only row says why nothing was compared).
fn add_margins(remedy: &mut super::MergedRemedy, before: &MarginTable, after: &MarginTable) {
    if let Some(w) = remedy.what_if.as_mut().filter(|w| !w.indicator.is_empty()) {
        w.margins = what_if::margins::shifts(&remedy.answers, &w.indicator, before, after);
    }
}

/// Solve several what-if cases, in parallel where the machine has cores to spare. A failed
/// solve is kept as its error (the what-if row says so); a cancelled one cancels them all.
pub(crate) fn solve_all(
    cases: &[&ResolvedCase],
    solver: SolverOptions,
    progress: Progress<'_>,
) -> Result<Vec<Result<Profile, ModelError>>, DiagnoseError> {
    if cases.is_empty() {
        return Ok(Vec::new());
    }
    let threads = std::thread::available_parallelism()
        .map(|n| n.get())
        .unwrap_or(1)
        .clamp(1, 4)
        .min(cases.len());
    let cancelled = AtomicBool::new(false);
    let done = Mutex::new((0usize, progress));
    let total = cases.len() as f64;
    // Each finished solve reports; a `false` from the caller stops the solves still running.
    let report = || {
        if let Ok(mut guard) = done.lock() {
            guard.0 += 1;
            let fraction = guard.0 as f64 / total;
            if !(guard.1)(fraction) {
                cancelled.store(true, Ordering::Relaxed);
            }
        }
    };
    let solve_one = |case: &ResolvedCase| {
        let result = crate::model::solve_with_progress(&case.problem(solver), &mut |_| {
            !cancelled.load(Ordering::Relaxed)
        });
        report();
        result
    };
    let results: Vec<Result<Profile, ModelError>> = if threads <= 1 {
        cases.iter().map(|c| solve_one(c)).collect()
    } else {
        let chunk = cases.len().div_ceil(threads);
        std::thread::scope(|scope| {
            let handles: Vec<_> = cases
                .chunks(chunk)
                .map(|part| {
                    let solve_one = &solve_one;
                    let handle =
                        scope.spawn(move || part.iter().map(|c| solve_one(c)).collect::<Vec<_>>());
                    (part.len(), handle)
                })
                .collect();
            handles
                .into_iter()
                .flat_map(|(len, h)| {
                    h.join().unwrap_or_else(|_| {
                        (0..len)
                            .map(|_| {
                                Err(ModelError::NotConverged("a what-if solve panicked".into()))
                            })
                            .collect()
                    })
                })
                .collect()
        })
    };
    if cancelled.load(Ordering::Relaxed) {
        return Err(ModelError::Cancelled.into());
    }
    Ok(results)
}
