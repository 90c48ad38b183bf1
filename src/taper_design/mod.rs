//! Taper design: find a tension schedule (start tension and taper, linear or hyperbolic,
//! optionally in steps) that keeps the finished roll inside four limits at once:
//!
//! * **core pressure** at most a chosen share of the core's rated crush pressure;
//! * **starring**: no band with compressive tangential stress and low pressure (pressure below a
//!   share of the roll's peak pressure — the same definition the profile summary uses);
//! * **telescoping**: at every interface, friction × pressure at least a chosen multiple of the
//!   axial shear of lifting the roll by its core (the margin of `mechanics::telescoping`, the
//!   same one diagnosis tests, so a designed roll is never one the diagnosis calls too soft);
//! * **wound-in tension** at most a safe share of the web's strength.
//!
//! Criterion (documented in docs/taper-design.md): among schedules that meet every limit with the
//! design margin, keep the start tension as close as possible to the one the winder runs now
//! (capped at the tension limit) and use as little taper as needed. The search is a grid over
//! (start tension, taper) followed by a bounded Nelder–Mead refinement, on the grouped solver
//! resolution; the chosen schedule is re-solved at the normal resolution and checked again.
//! When no schedule meets every limit the pairs of limits that cannot hold together are found
//! from the same evaluations and the most conflicting pair is named with what to relax.
//! The search runs within a work budget ([`budget`]): a roll too large for it is refused at
//! once, and a search that uses the budget up ends with a message instead of running on.

pub mod budget;
mod choose;
mod inputs;
mod keep;
mod limits;
pub mod nelder_mead;
mod run;
mod search;
#[cfg(test)]
mod tests;
mod trial;
mod words;

pub use limits::*;
use trial::{Context, Corrections, Trial};
pub use words::operator_table;

use crate::case::ResolvedCase;
use crate::model::{
    Profile, Resolution, SolverOptions, Taper, TensionSchedule, schedule::TensionStep,
};

/// Tension of a continuous ramp at radius `r` (N/m): the model's taper law
/// ([`TensionSchedule::scheduled_tension_at`]).
fn ramp_tension(shape: TaperShape, start: f64, fraction: f64, r: f64, rc: f64, big_r: f64) -> f64 {
    TensionSchedule {
        start_tension: start,
        taper: shape.taper(fraction),
        upsets: Vec::new(),
    }
    .scheduled_tension_at(r, rc, big_r)
}

/// The schedule for a ramp (or its steps): steps split the build into equal radial bands, each
/// wound at the ramp's tension at the band's middle.
pub fn build_schedule(
    shape: TaperShape,
    steps: Option<usize>,
    start: f64,
    fraction: f64,
    rc: f64,
    big_r: f64,
) -> TensionSchedule {
    match steps {
        None => TensionSchedule {
            start_tension: start,
            taper: shape.taper(fraction),
            upsets: Vec::new(),
        },
        Some(n) => {
            let n = n.max(1);
            let band = (big_r - rc) / n as f64;
            let mid = |k: usize| rc + band * (k as f64 + 0.5);
            TensionSchedule {
                start_tension: ramp_tension(shape, start, fraction, mid(0), rc, big_r),
                taper: Taper::Steps {
                    steps: (1..n)
                        .map(|k| TensionStep {
                            radius: rc + band * k as f64,
                            tension: ramp_tension(shape, start, fraction, mid(k), rc, big_r),
                        })
                        .collect(),
                },
                upsets: Vec::new(),
            }
        }
    }
}

/// Check the four limits on a profile.
pub fn check_limits(
    case: &ResolvedCase,
    profile: &Profile,
    limits: &TaperLimits,
) -> Vec<LimitCheck> {
    let n = profile.pressure.len();
    let core_pressure = if profile.summary.core_pressure > 0.0 || n == 0 {
        profile.summary.core_pressure
    } else {
        profile.pressure[0]
    };
    let core_allowed = limits.core_share * case.core.crush_pressure;
    let core = LimitCheck::at_most(Limit::CorePressure, core_pressure, core_allowed);

    // Starring: nodes with σθ < 0 and P below the share of the peak. The margin is +1 when there
    // is none; otherwise minus the depth of the worst node into the risk set, so the search can
    // tell a slight band from a deep one.
    let peak = profile.pressure.iter().cloned().fold(0.0, f64::max);
    let low = limits.starring_pressure_share * peak;
    let stress_scale = (limits.tension_share * case.web.strength / case.web.thickness).max(1.0);
    let risk = |i: usize| profile.tangential_stress[i] < 0.0 && profile.pressure[i] < low;
    let mut depth: f64 = 0.0;
    let mut longest = 0.0_f64;
    let mut run_start: Option<usize> = None;
    let span = match (profile.radius.first(), profile.radius.last()) {
        (Some(a), Some(b)) if b > a => b - a,
        _ => 1.0,
    };
    for i in 0..=n {
        let hit = i < n && risk(i);
        if hit {
            let d = (-profile.tangential_stress[i] / stress_scale)
                .min(1.0 - profile.pressure[i] / low.max(f64::MIN_POSITIVE));
            depth = depth.max(d);
            run_start.get_or_insert(i);
        } else if let Some(s) = run_start.take() {
            let outer = profile.radius[i.min(n - 1)];
            longest = longest.max((outer - profile.radius[s]) / span);
        }
    }
    // And the mechanics layer's starring margin, the one the diagnosis reads: no wrap may carry
    // more hoop compression than buckles it on the foundation of the stack.
    let buckling = crate::mechanics::starring::buckling_margins(
        profile,
        &crate::mechanics::MechanicsInputs::from_case(case),
    );
    let buckling_margin = buckling.min_margin / MIN_STARRING_MARGIN - 1.0;
    let starring = LimitCheck {
        limit: Limit::Starring,
        value: longest,
        allowed: 0.0,
        margin: (if depth > 0.0 { -depth } else { 1.0 }).min(buckling_margin),
        met: depth <= 0.0 && buckling.min_margin >= MIN_STARRING_MARGIN,
    };

    // Telescoping: the mechanics layer's margin, the one the diagnosis reads.
    let telescoping = crate::mechanics::telescoping::handling_margins(
        profile,
        &crate::mechanics::MechanicsInputs::from_case(case),
    );
    let outer = LimitCheck {
        limit: Limit::Telescoping,
        value: telescoping.min_margin,
        allowed: limits.min_telescoping_margin,
        margin: telescoping.min_margin / limits.min_telescoping_margin - 1.0,
        met: telescoping.min_margin >= limits.min_telescoping_margin,
    };

    let wit_max = profile.wound_in_tension.iter().cloned().fold(0.0, f64::max);
    let wit_allowed = limits.tension_share * case.web.strength;
    let tension = LimitCheck::at_most(Limit::WoundInTension, wit_max, wit_allowed);
    vec![core, starring, outer, tension]
}

/// Solve a case with another schedule and check the limits.
pub fn evaluate(
    case: &ResolvedCase,
    schedule: &TensionSchedule,
    limits: &TaperLimits,
    resolution: Resolution,
) -> Result<Evaluation, TaperError> {
    let mut problem = case.problem(SolverOptions {
        resolution,
        ..SolverOptions::default()
    });
    problem.winding.tension = schedule.clone();
    let profile = crate::model::solve(&problem)?;
    let checks = check_limits(case, &profile, limits);
    Ok(Evaluation {
        schedule: schedule.clone(),
        checks,
        profile,
    })
}

/// Design with the default search options.
pub fn design(case: &ResolvedCase, limits: &TaperLimits) -> Result<TaperDesign, TaperError> {
    design_with(case, limits, &DesignOptions::default())
}

/// Design a schedule; see the module documentation for the criterion. The steps: check the
/// inputs, check the current schedule, keep it when it already meets every limit, else search
/// start tension and taper, choose among the verified candidates and explain the choice.
pub fn design_with(
    case: &ResolvedCase,
    limits: &TaperLimits,
    options: &DesignOptions,
) -> Result<TaperDesign, TaperError> {
    let frame = inputs::check_inputs(case, limits, options)?;
    let mut run = run::DesignRun::start(case, limits, options, frame)?;
    let before = run.check_current()?;
    if let Some(fraction) = keep::kept_fraction(&run, &before) {
        return Ok(keep::kept_design(&run, before, fraction));
    }
    let searched = search::search(&mut run, &before)?;
    let choice = choose::choose(&mut run, &searched)?;
    Ok(choose::designed(&run, before, &searched, choice))
}
