//! The no-change answer: when the current schedule already has the requested shape, stays within
//! the largest taper searched and meets every limit with the design margin, it is the design (the
//! criterion's distance from it is zero) and no search runs.

use crate::model::Taper;

use super::run::DesignRun;
use super::trial::Trial;
use super::words::explain;
use super::{Evaluation, Limit, TaperDesign, TaperShape, build_schedule, operator_table};

/// The current taper fraction when the current schedule is kept as it is, None when the
/// search must run.
pub(super) fn kept_fraction(run: &DesignRun, before: &Evaluation) -> Option<f64> {
    let options = run.options;
    let tension = &run.cx.case.winding.tension;
    let current_fraction = match (&tension.taper, options.shape) {
        (Taper::None, _) => Some(0.0),
        (Taper::Linear { fraction }, TaperShape::Linear)
        | (Taper::Hyperbolic { fraction }, TaperShape::Hyperbolic) => Some(*fraction),
        _ => None,
    };
    current_fraction.filter(|&fraction| {
        options.steps.is_none()
            && tension.upsets.is_empty()
            && fraction <= run.frame.max_taper
            && before.all_met()
            && before.worst_margin() >= options.design_margin
    })
}

/// The design that keeps the current schedule: its checks are the ones of `before`.
pub(super) fn kept_design(run: &DesignRun, before: Evaluation, fraction: f64) -> TaperDesign {
    let (case, options) = (run.cx.case, run.options);
    let (rc, big_r) = (run.frame.rc, run.frame.big_r);
    let start = case.winding.tension.start_tension;
    let trial = Trial {
        start,
        fraction,
        raw: [0.0; 4],
        band: 0.0,
    };
    let schedule = build_schedule(options.shape, None, start, fraction, rc, big_r);
    let after = Evaluation {
        schedule: schedule.clone(),
        checks: before.checks.clone(),
        profile: before.profile.clone(),
    };
    let binding: Vec<Limit> = after
        .checks
        .iter()
        .filter(|c| c.margin < options.design_margin + 0.05)
        .map(|c| c.limit)
        .collect();
    let explanation = explain(case, &before, &after, true, &binding, None, trial, start);
    TaperDesign {
        feasible: true,
        shape: options.shape,
        steps: None,
        start_tension: start,
        taper_fraction: fraction,
        table: operator_table(&schedule, rc, big_r, None),
        schedule,
        limits: *run.cx.limits,
        before,
        after,
        binding,
        conflict: None,
        explanation,
        solves: run.solves,
        work: run.work_used(),
    }
}
