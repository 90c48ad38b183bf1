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
mod limits;
pub mod nelder_mead;
#[cfg(test)]
mod tests;
mod words;

pub use limits::*;
pub use words::operator_table;
use words::{explain, find_conflict};

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

/// One searched schedule, solved at the search resolution.
#[derive(Debug, Clone, Copy)]
struct Trial {
    start: f64,
    fraction: f64,
    /// Values at the search resolution: core pressure (Pa), starring margin, lowest outer
    /// pressure (Pa), largest wound-in tension (N/m).
    raw: [f64; 4],
    /// Starring band extent (share of the build).
    band: f64,
}

/// Factors that carry search-resolution values to the verification resolution. A grouped solve
/// can be biased on soft webs; the factors are measured where it matters (at the candidate) and
/// the search is repeated with them (output correction).
#[derive(Debug, Clone, Copy)]
struct Corrections {
    core: f64,
    outer: f64,
}

impl Corrections {
    const NONE: Corrections = Corrections {
        core: 1.0,
        outer: 1.0,
    };
    fn between(search: &[LimitCheck], verified: &[LimitCheck]) -> Corrections {
        let ratio = |limit: Limit| {
            let s = search.iter().find(|c| c.limit == limit).map(|c| c.value);
            let v = verified.iter().find(|c| c.limit == limit).map(|c| c.value);
            match (s, v) {
                (Some(s), Some(v)) if s > 0.0 && v > 0.0 => (v / s).clamp(0.1, 10.0),
                _ => 1.0,
            }
        };
        Corrections {
            core: ratio(Limit::CorePressure),
            outer: ratio(Limit::Telescoping),
        }
    }
}

struct Context<'a> {
    case: &'a ResolvedCase,
    limits: &'a TaperLimits,
}

impl Trial {
    fn from_checks(start: f64, fraction: f64, checks: &[LimitCheck]) -> Trial {
        let mut t = Trial {
            start,
            fraction,
            raw: [0.0; 4],
            band: 0.0,
        };
        for c in checks {
            t.raw[c.limit.index()] = if c.limit == Limit::Starring {
                t.band = c.value;
                c.margin
            } else {
                c.value
            };
        }
        t
    }
    /// Corrected values (starring: band extent).
    fn values(&self, k: Corrections) -> [f64; 4] {
        [
            self.raw[0] * k.core,
            self.band,
            self.raw[2] * k.outer,
            self.raw[3],
        ]
    }
    /// Corrected margins, same definitions as [`check_limits`].
    fn margins(&self, k: Corrections, cx: &Context) -> [f64; 4] {
        let v = self.values(k);
        let outer = v[2] / cx.limits.min_telescoping_margin - 1.0;
        [
            1.0 - v[0] / (cx.limits.core_share * cx.case.core.crush_pressure),
            self.raw[1],
            outer,
            1.0 - v[3] / (cx.limits.tension_share * cx.case.web.strength),
        ]
    }
    fn worst(&self, k: Corrections, cx: &Context) -> f64 {
        self.margins(k, cx)
            .iter()
            .cloned()
            .fold(f64::INFINITY, f64::min)
    }
}

/// Design a schedule; see the module documentation for the criterion.
pub fn design_with(
    case: &ResolvedCase,
    limits: &TaperLimits,
    options: &DesignOptions,
) -> Result<TaperDesign, TaperError> {
    limits.validate()?;
    if !(case.core.crush_pressure.is_finite() && case.core.crush_pressure > 0.0) {
        return Err(TaperError::Unusable {
            field: "core.crush_pressure",
            reason: "core.crush_pressure must be a positive pressure to design against it",
        });
    }
    if !(case.web.strength.is_finite() && case.web.strength > 0.0) {
        return Err(TaperError::Unusable {
            field: "web.strength",
            reason: "web.strength must be a positive tension to design against it",
        });
    }
    if let Some(n) = options.steps
        && !(2..=50).contains(&n)
    {
        return Err(TaperError::OutOfRange {
            field: "steps",
            value: n as f64,
            accepted: "2 to 50 steps",
        });
    }
    let max_taper = options.max_taper.unwrap_or(match options.shape {
        TaperShape::Linear => 0.8,
        TaperShape::Hyperbolic => 1.0,
    });
    if !(max_taper > 0.0 && max_taper <= 1.0) {
        return Err(TaperError::OutOfRange {
            field: "max_taper",
            value: max_taper,
            accepted: "0 < fraction ≤ 1",
        });
    }
    let rc = case.core.outside_diameter / 2.0;
    let big_r = case.roll.outer_diameter / 2.0;
    if !(big_r > rc && case.web.thickness > 0.0) {
        return Err(TaperError::Unusable {
            field: "roll.outer_diameter",
            reason: "the roll diameter must exceed the core's outside diameter",
        });
    }
    let cx = Context { case, limits };
    let verify = options.verify_resolution;
    let mut solves = 0usize;
    let search = Resolution::Elements {
        count: options.search_elements.max(10),
    };
    let (nu, nv) = (options.grid.0.max(3), options.grid.1.max(2));
    let layers = crate::model::layer_count_between(rc, big_r, case.web.thickness);
    let budget = std::cell::Cell::new(budget::Budget::new(
        options.work_budget,
        layers,
        search,
        verify,
    ));
    budget.get().check_start(nu * nv + nv, search, verify)?;
    // Charge a solve before it runs; an error once the budget is used up.
    let charge = |resolution: Resolution, solves: usize| -> Result<(), TaperError> {
        let mut b = budget.get();
        let work = budget::solve_work(b.layers, resolution);
        if b.charge(work) {
            budget.set(b);
            Ok(())
        } else {
            Err(b.exhausted(solves))
        }
    };

    charge(verify, solves)?;
    let before = evaluate(case, &case.winding.tension, limits, verify)?;
    solves += 1;

    // The current schedule already has the requested shape and meets every limit with the
    // design margin: it is the answer (the criterion's distance is zero), no search needed.
    let current_fraction = match (&case.winding.tension.taper, options.shape) {
        (Taper::None, _) => Some(0.0),
        (Taper::Linear { fraction }, TaperShape::Linear)
        | (Taper::Hyperbolic { fraction }, TaperShape::Hyperbolic) => Some(*fraction),
        _ => None,
    };
    if let Some(fraction) = current_fraction
        && options.steps.is_none()
        && case.winding.tension.upsets.is_empty()
        && fraction <= max_taper
        && before.all_met()
        && before.worst_margin() >= options.design_margin
    {
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
        return Ok(TaperDesign {
            feasible: true,
            shape: options.shape,
            steps: None,
            start_tension: start,
            taper_fraction: fraction,
            table: operator_table(&schedule, rc, big_r, None),
            schedule,
            limits: *limits,
            before,
            after,
            binding,
            conflict: None,
            explanation,
            solves,
            work: budget.get().used,
        });
    }

    // Search range of the start tension: from a tenth of the lower of (current, allowed) up to
    // 1.2 × the allowed wound-in tension, so infeasible corners are explored too.
    let allowed_tension = limits.tension_share * case.web.strength;
    let current = case
        .winding
        .tension
        .start_tension
        .max(1e-3 * allowed_tension);
    let t_low = 0.1 * current.min(allowed_tension);
    let t_high = (1.2 * allowed_tension).max(1.05 * current);
    let target = current.min(allowed_tension * (1.0 - options.design_margin));
    let start_of = |u: f64| t_low * (t_high / t_low).powf(u);
    let to_u = |start: f64| ((start / t_low).ln() / (t_high / t_low).ln()).clamp(0.0, 1.0);
    let schedule_of = |start: f64, fraction: f64| {
        build_schedule(options.shape, options.steps, start, fraction, rc, big_r)
    };

    let mut trials: Vec<Trial> = Vec::new();
    let mut failure: Option<TaperError> = None;
    let mut run = |start: f64, fraction: f64, trials: &mut Vec<Trial>| -> Option<Trial> {
        if let Some(t) = trials
            .iter()
            .find(|t| t.start == start && t.fraction == fraction)
        {
            return Some(*t);
        }
        // Over budget: no more solves; the search stops at its next check.
        if charge(search, trials.len()).is_err() {
            return None;
        }
        match evaluate(case, &schedule_of(start, fraction), limits, search) {
            Ok(e) => {
                let t = Trial::from_checks(start, fraction, &e.checks);
                trials.push(t);
                Some(t)
            }
            Err(e) => {
                failure.get_or_insert(e);
                None
            }
        }
    };
    let margin = options.design_margin;
    // Objective (minimised): distance of the start tension from the target in log terms, a
    // small price per unit of taper change from the current one (so taper is the first thing
    // moved), and a steep penalty for any limit short of the margin.
    let reference_taper = match (&case.winding.tension.taper, options.shape) {
        (Taper::Linear { fraction }, TaperShape::Linear)
        | (Taper::Hyperbolic { fraction }, TaperShape::Hyperbolic) => {
            fraction.clamp(0.0, max_taper)
        }
        _ => 0.0,
    };
    let objective = |start: f64, fraction: f64, worst: f64| -> f64 {
        let shortfall = (margin - worst).max(0.0);
        (start / target).ln().abs()
            + 0.05 * (fraction - reference_taper).abs() / max_taper
            + 20.0 * shortfall
    };

    for i in 0..nu {
        for j in 0..nv {
            let u = i as f64 / (nu - 1) as f64;
            let v = j as f64 / (nv - 1) as f64;
            run(start_of(u), v * max_taper, &mut trials);
        }
    }
    // The target itself with each taper, so "keep the start tension" is tried exactly.
    for j in 0..nv {
        run(target, j as f64 / (nv - 1) as f64 * max_taper, &mut trials);
    }
    if trials.is_empty() {
        return Err(failure.unwrap_or(TaperError::NothingSolved));
    }

    // First corrections: the current schedule at both resolutions.
    charge(search, solves + trials.len())?;
    let mut k = match evaluate(case, &case.winding.tension, limits, search) {
        Ok(e) => Corrections::between(&e.checks, &before.checks),
        Err(_) => Corrections::NONE,
    };
    solves += 1;

    let mut verified: Vec<(Trial, Evaluation)> = Vec::new();
    let starts: Vec<f64> = (0..nu)
        .map(|i| start_of(i as f64 / (nu - 1) as f64))
        .chain(std::iter::once(target))
        .collect();
    let mut previous_best_fraction: Option<f64> = None;
    for _round in 0..4 {
        let score = |t: &Trial| objective(t.start, t.fraction, t.worst(k, &cx));
        let feasible = |t: &Trial| t.worst(k, &cx) >= margin;
        // For one taper: the feasible start tension closest to the target — the nearest
        // feasible scanned start, then bisection (in log tension) towards the target.
        // `hint`: scan only the starts within two grid steps of it (and the target).
        let grid_ratio = (t_high / t_low).powf(1.0 / (nu - 1) as f64);
        let mut best_for =
            |fraction: f64, hint: Option<f64>, trials: &mut Vec<Trial>| -> Option<Trial> {
                let mut scanned: Vec<Trial> = starts
                    .iter()
                    .filter(|&&t0| {
                        hint.is_none_or(|h| {
                            t0 == target || (t0 / h).ln().abs() <= 2.01 * grid_ratio.ln()
                        })
                    })
                    .filter_map(|&t0| run(t0, fraction, trials))
                    .collect();
                scanned.sort_by(|a, b| a.start.total_cmp(&b.start));
                let nearest = scanned
                    .iter()
                    .filter(|t| feasible(t))
                    .min_by(|a, b| {
                        (a.start / target)
                            .ln()
                            .abs()
                            .total_cmp(&(b.start / target).ln().abs())
                    })
                    .copied()?;
                if (nearest.start / target - 1.0).abs() < 1e-12 {
                    return Some(nearest);
                }
                // The scanned neighbour on the target's side.
                let toward = scanned
                    .iter()
                    .filter(|t| {
                        if target > nearest.start {
                            t.start > nearest.start
                        } else {
                            t.start < nearest.start
                        }
                    })
                    .min_by(|a, b| {
                        (a.start / nearest.start)
                            .ln()
                            .abs()
                            .total_cmp(&(b.start / nearest.start).ln().abs())
                    })
                    .copied();
                let Some(mut outside) = toward else {
                    return Some(nearest);
                };
                let mut inside = nearest;
                for _ in 0..7 {
                    let mid = (inside.start * outside.start).sqrt();
                    match run(mid, fraction, trials) {
                        Some(t) if feasible(&t) => inside = t,
                        Some(t) => outside = t,
                        None => break,
                    }
                }
                Some(inside)
            };
        let column_score = |t: &Option<Trial>| t.as_ref().map_or(f64::INFINITY, score);
        let mut columns: Vec<(f64, Option<Trial>)> = Vec::new();
        for j in 0..nv {
            let f = j as f64 / (nv - 1) as f64 * max_taper;
            // After the first round only the columns next to the last best taper are bracketed
            // again; the corrections change little between rounds.
            if let Some(previous) = previous_best_fraction
                && (f - previous).abs() > 1.5 * max_taper / (nv - 1) as f64
            {
                continue;
            }
            let t = best_for(f, None, &mut trials);
            columns.push((f, t));
        }
        if reference_taper > 0.0 && reference_taper < max_taper {
            let t = best_for(reference_taper, None, &mut trials);
            columns.push((reference_taper, t));
            columns.sort_by(|a, b| a.0.total_cmp(&b.0));
        }
        let best_column = (0..columns.len())
            .min_by(|&a, &b| column_score(&columns[a].1).total_cmp(&column_score(&columns[b].1)));
        if let Some(j) = best_column
            && columns[j].1.is_some()
        {
            // Golden-section refinement of the taper between the neighbouring columns.
            let mut lo = columns[j.saturating_sub(1)].0;
            let mut hi = columns[(j + 1).min(columns.len() - 1)].0;
            let g = 0.618_033_988_749_895;
            let hint = columns[j].1.map(|t| t.start);
            for _ in 0..5 {
                if hi - lo < 1e-3 {
                    break;
                }
                let x1 = hi - g * (hi - lo);
                let x2 = lo + g * (hi - lo);
                let s1 = column_score(&best_for(x1, hint, &mut trials));
                let s2 = column_score(&best_for(x2, hint, &mut trials));
                if s1 <= s2 {
                    hi = x2;
                } else {
                    lo = x1;
                }
            }
        }
        // Final polish with a bounded Nelder–Mead on the penalised objective.
        let best = *trials
            .iter()
            .min_by(|a, b| score(a).total_cmp(&score(b)))
            .unwrap_or(&trials[0]);
        {
            let mut f = |x: &[f64]| -> f64 {
                match run(start_of(x[0]), x[1] * max_taper, &mut trials) {
                    Some(t) => objective(t.start, t.fraction, t.worst(k, &cx)),
                    None => f64::INFINITY,
                }
            };
            nelder_mead::minimise(
                &mut f,
                &[to_u(best.start), best.fraction / max_taper],
                0.02,
                1e-4,
                20,
            );
        }
        let candidate = *trials
            .iter()
            .min_by(|a, b| score(a).total_cmp(&score(b)))
            .unwrap_or(&best);
        previous_best_fraction = Some(candidate.fraction);
        charge(verify, solves + trials.len())?;
        charge(search, solves + trials.len())?;
        let e = evaluate(
            case,
            &schedule_of(candidate.start, candidate.fraction),
            limits,
            verify,
        )?;
        solves += 1;
        let search_checks = evaluate(
            case,
            &schedule_of(candidate.start, candidate.fraction),
            limits,
            search,
        )?
        .checks;
        solves += 1;
        let last_k = k;
        k = Corrections::between(&search_checks, &e.checks);
        let met = e.all_met() && e.worst_margin() >= 0.5 * margin;
        verified.push((candidate, e));
        let settled = (k.core / last_k.core - 1.0).abs() < 0.02
            && (k.outer / last_k.outer - 1.0).abs() < 0.02;
        if met && settled {
            break;
        }
    }
    solves += trials.len();

    let verified_score =
        |(t, e): &(Trial, Evaluation)| objective(t.start, t.fraction, e.worst_margin());
    let chosen = verified
        .iter()
        .filter(|(_, e)| e.all_met())
        .min_by(|a, b| verified_score(a).total_cmp(&verified_score(b)))
        .cloned();
    let feasible = chosen.is_some();
    let (trial, after) = match chosen {
        Some(c) => c,
        None => {
            // Nothing feasible: show the schedule with the best worst margin.
            let t = *trials
                .iter()
                .max_by(|a, b| a.worst(k, &cx).total_cmp(&b.worst(k, &cx)))
                .unwrap_or(&trials[0]);
            charge(verify, solves)?;
            let e = evaluate(case, &schedule_of(t.start, t.fraction), limits, verify)?;
            solves += 1;
            (t, e)
        }
    };

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
        Some(find_conflict(&cx, &trials, k))
    };
    let table = operator_table(&after.schedule, rc, big_r, options.steps);
    let explanation = explain(
        case,
        &before,
        &after,
        feasible,
        &binding,
        conflict.as_ref(),
        trial,
        target,
    );

    Ok(TaperDesign {
        feasible,
        shape: options.shape,
        steps: options.steps,
        start_tension: trial.start,
        taper_fraction: trial.fraction,
        schedule: after.schedule.clone(),
        limits: *limits,
        before,
        after,
        binding,
        conflict,
        table,
        explanation,
        solves,
        work: budget.get().used,
    })
}
