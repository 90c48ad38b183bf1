//! Choosing the designed schedule and explaining it: the verified candidate that meets every
//! limit and scores best, or, when none does, the searched schedule closest to meeting them
//! (verified too) with the pair of limits that conflict; then the binding limits, the operator's
//! table and the plain-words explanation.

use super::run::DesignRun;
use super::search::Searched;
use super::trial::Trial;
use super::words::{explain, find_conflict};
use super::{Evaluation, Limit, TaperDesign, TaperError, evaluate, operator_table};

/// The chosen schedule and its verified check, and whether it meets every limit.
pub(super) struct Choice {
    trial: Trial,
    after: Evaluation,
    feasible: bool,
}

/// Choose among the verified candidates; with none feasible, verify the searched schedule with
/// the best worst margin.
pub(super) fn choose(run: &mut DesignRun, searched: &Searched) -> Result<Choice, TaperError> {
    let objective = searched.objective;
    let verified_score =
        |(t, e): &(Trial, Evaluation)| objective.score(t.start, t.fraction, e.worst_margin());
    let chosen = searched
        .verified
        .iter()
        .filter(|(_, e)| e.all_met())
        .min_by(|a, b| verified_score(a).total_cmp(&verified_score(b)))
        .cloned();
    if let Some((trial, after)) = chosen {
        return Ok(Choice {
            trial,
            after,
            feasible: true,
        });
    }
    let (k, cx) = (searched.k, run.cx);
    let t = *run
        .trials
        .iter()
        .max_by(|a, b| a.worst(k, &cx).total_cmp(&b.worst(k, &cx)))
        .unwrap_or(&run.trials[0]);
    run.charge(run.verify)?;
    let schedule = run.schedule_of(t.start, t.fraction);
    let after = evaluate(cx.case, &schedule, cx.limits, run.verify)?;
    run.solves += 1;
    run.done.checks += 1;
    Ok(Choice {
        trial: t,
        after,
        feasible: false,
    })
}

/// The design of a searched schedule: binding limits (feasible) or the conflict (infeasible),
/// the operator's table and the explanation against `before`.
pub(super) fn designed(
    run: &DesignRun,
    before: Evaluation,
    searched: &Searched,
    choice: Choice,
) -> TaperDesign {
    let Choice {
        trial,
        after,
        feasible,
    } = choice;
    let (case, options) = (run.cx.case, run.options);
    let margin = searched.objective.margin;
    let binding: Vec<Limit> = if feasible {
        after
            .checks
            .iter()
            .filter(|c| c.margin < margin + 0.05 && c.margin < 1.0)
            .map(|c| c.limit)
            .collect()
    } else {
        Vec::new()
    };
    let conflict = if feasible {
        None
    } else {
        Some(find_conflict(&run.cx, &run.trials, searched.k))
    };
    let table = operator_table(
        &after.schedule,
        run.frame.rc,
        run.frame.big_r,
        options.steps,
    );
    let explanation = explain(
        case,
        &before,
        &after,
        feasible,
        &binding,
        conflict.as_ref(),
        trial,
        searched.target,
    );
    TaperDesign {
        feasible,
        shape: options.shape,
        steps: options.steps,
        start_tension: trial.start,
        taper_fraction: trial.fraction,
        schedule: after.schedule.clone(),
        limits: *run.cx.limits,
        before,
        after,
        binding,
        conflict,
        table,
        explanation,
        solves: run.solves,
        work: run.work_used(),
    }
}
