//! The search of start tension and taper. A grid over both comes first; then up to four rounds
//! each find, for every taper, the feasible start tension closest to the target (scan, then
//! bisection), refine the taper by golden section, polish with a bounded Nelder–Mead, and verify
//! the candidate at the normal resolution. The verification's bias against the search resolution
//! corrects the next round; the rounds end when a verified candidate meets the limits and the
//! corrections have settled.

use crate::model::Taper;

use super::nelder_mead;
use super::run::DesignRun;
use super::trial::{Corrections, Trial};
use super::{Evaluation, TaperError, TaperShape, evaluate};

/// Where the search looks for the start tension and what it aims at.
pub(super) struct StartRange {
    low: f64,
    high: f64,
    /// The start tension the criterion keeps closest to: the current one, capped at the
    /// tension limit less the design margin.
    pub target: f64,
    /// The scanned start tensions: the grid's, then the target itself.
    starts: Vec<f64>,
    /// Ratio between neighbouring grid starts.
    grid_ratio: f64,
}

impl StartRange {
    /// From a tenth of the lower of (current, allowed) up to 1.2 × the allowed wound-in tension,
    /// so infeasible corners are explored too.
    fn new(run: &DesignRun) -> StartRange {
        let (case, limits) = (run.cx.case, run.cx.limits);
        let allowed_tension = limits.tension_share * case.web.strength;
        let current = case
            .winding
            .tension
            .start_tension
            .max(1e-3 * allowed_tension);
        let low = 0.1 * current.min(allowed_tension);
        let high = (1.2 * allowed_tension).max(1.05 * current);
        let target = current.min(allowed_tension * (1.0 - run.options.design_margin));
        let (nu, _) = run.grid();
        let mut range = StartRange {
            low,
            high,
            target,
            starts: Vec::new(),
            grid_ratio: (high / low).powf(1.0 / (nu - 1) as f64),
        };
        range.starts = (0..nu)
            .map(|i| range.start_of(i as f64 / (nu - 1) as f64))
            .chain(std::iter::once(target))
            .collect();
        range
    }

    /// The start tension at `u` (0 to 1) along the range, in log terms.
    fn start_of(&self, u: f64) -> f64 {
        self.low * (self.high / self.low).powf(u)
    }

    /// Where a start tension lies along the range (0 to 1).
    fn to_u(&self, start: f64) -> f64 {
        ((start / self.low).ln() / (self.high / self.low).ln()).clamp(0.0, 1.0)
    }
}

/// What the search minimises: distance of the start tension from the target in log terms, a
/// small price per unit of taper change from the current one (so taper is the first thing
/// moved), and a steep penalty for any limit short of the margin.
#[derive(Debug, Clone, Copy)]
pub(super) struct Objective {
    target: f64,
    /// The current taper when it has the requested shape (clamped to the range), else none.
    reference_taper: f64,
    max_taper: f64,
    /// The design margin every limit must keep.
    pub margin: f64,
}

impl Objective {
    fn new(run: &DesignRun, target: f64) -> Objective {
        let max_taper = run.frame.max_taper;
        let reference_taper = match (&run.cx.case.winding.tension.taper, run.options.shape) {
            (Taper::Linear { fraction }, TaperShape::Linear)
            | (Taper::Hyperbolic { fraction }, TaperShape::Hyperbolic) => {
                fraction.clamp(0.0, max_taper)
            }
            _ => 0.0,
        };
        Objective {
            target,
            reference_taper,
            max_taper,
            margin: run.options.design_margin,
        }
    }

    /// The objective of a schedule whose worst margin is `worst`.
    pub fn score(&self, start: f64, fraction: f64, worst: f64) -> f64 {
        let shortfall = (self.margin - worst).max(0.0);
        (start / self.target).ln().abs()
            + 0.05 * (fraction - self.reference_taper).abs() / self.max_taper
            + 20.0 * shortfall
    }
}

/// What the search leaves for choosing and explaining.
pub(super) struct Searched {
    /// Every verified candidate with its check at the verification resolution.
    pub verified: Vec<(Trial, Evaluation)>,
    /// The last corrections from search to verification resolution.
    pub k: Corrections,
    pub objective: Objective,
    pub target: f64,
}

/// Run the search; `before` is the current schedule checked at the verification resolution.
pub(super) fn search(run: &mut DesignRun, before: &Evaluation) -> Result<Searched, TaperError> {
    let range = StartRange::new(run);
    let objective = Objective::new(run, range.target);
    scan_grid(run, &range)?;
    let mut k = first_corrections(run, before)?;
    let mut verified: Vec<(Trial, Evaluation)> = Vec::new();
    let mut previous_best_fraction: Option<f64> = None;
    for _round in 0..4 {
        let round = Round {
            range: &range,
            objective,
            k,
        };
        let candidate = round.candidate(run, previous_best_fraction);
        previous_best_fraction = Some(candidate.fraction);
        let (e, next_k) = verify_candidate(run, candidate)?;
        let last_k = k;
        k = next_k;
        let met = e.all_met() && e.worst_margin() >= 0.5 * objective.margin;
        verified.push((candidate, e));
        let settled = (k.core / last_k.core - 1.0).abs() < 0.02
            && (k.outer / last_k.outer - 1.0).abs() < 0.02;
        if met && settled {
            break;
        }
    }
    run.solves += run.trials.len();
    Ok(Searched {
        verified,
        k,
        objective,
        target: range.target,
    })
}

/// The grid over (start tension, taper), then the target start with each grid taper so "keep
/// the start tension" is tried exactly. An error when no schedule solved.
fn scan_grid(run: &mut DesignRun, range: &StartRange) -> Result<(), TaperError> {
    let (nu, nv) = run.grid();
    let max_taper = run.frame.max_taper;
    for i in 0..nu {
        for j in 0..nv {
            let u = i as f64 / (nu - 1) as f64;
            let v = j as f64 / (nv - 1) as f64;
            run.try_schedule(range.start_of(u), v * max_taper);
        }
    }
    for j in 0..nv {
        run.try_schedule(range.target, j as f64 / (nv - 1) as f64 * max_taper);
    }
    if run.trials.is_empty() {
        return Err(run.failure.take().unwrap_or(TaperError::NothingSolved));
    }
    Ok(())
}

/// First corrections: the current schedule at the search resolution against `before`.
fn first_corrections(run: &mut DesignRun, before: &Evaluation) -> Result<Corrections, TaperError> {
    run.charge(run.search)?;
    let case = run.cx.case;
    let k = match evaluate(case, &case.winding.tension, run.cx.limits, run.search) {
        Ok(e) => Corrections::between(&e.checks, &before.checks),
        Err(_) => Corrections::NONE,
    };
    run.solves += 1;
    run.done.corrections += 1;
    Ok(k)
}

/// Verify a candidate: solve it at the verification resolution and again at the search
/// resolution; the pair gives the next corrections.
fn verify_candidate(
    run: &mut DesignRun,
    candidate: Trial,
) -> Result<(Evaluation, Corrections), TaperError> {
    run.charge(run.verify)?;
    run.charge(run.search)?;
    let schedule = run.schedule_of(candidate.start, candidate.fraction);
    let (case, limits) = (run.cx.case, run.cx.limits);
    let e = evaluate(case, &schedule, limits, run.verify)?;
    run.solves += 1;
    run.done.checks += 1;
    let search_checks = evaluate(case, &schedule, limits, run.search)?.checks;
    run.solves += 1;
    run.done.corrections += 1;
    let k = Corrections::between(&search_checks, &e.checks);
    Ok((e, k))
}

/// One round of the search: the round's corrections decide which trials are feasible and how
/// they score.
struct Round<'r> {
    range: &'r StartRange,
    objective: Objective,
    k: Corrections,
}

impl Round<'_> {
    fn worst(&self, run: &DesignRun, t: &Trial) -> f64 {
        t.worst(self.k, &run.cx)
    }

    fn feasible(&self, run: &DesignRun, t: &Trial) -> bool {
        self.worst(run, t) >= self.objective.margin
    }

    fn score(&self, run: &DesignRun, t: &Trial) -> f64 {
        self.objective
            .score(t.start, t.fraction, self.worst(run, t))
    }

    fn column_score(&self, run: &DesignRun, t: &Option<Trial>) -> f64 {
        t.as_ref().map_or(f64::INFINITY, |t| self.score(run, t))
    }

    /// The round's best schedule: the best start for each taper, the taper refined between
    /// the best columns, then polished.
    fn candidate(&self, run: &mut DesignRun, previous_best_fraction: Option<f64>) -> Trial {
        let columns = self.taper_columns(run, previous_best_fraction);
        self.refine_taper(run, &columns);
        self.polish(run)
    }

    /// For one taper: the feasible start tension closest to the target — the nearest feasible
    /// scanned start, then bisection (in log tension) towards the target. `hint`: scan only
    /// the starts within two grid steps of it (and the target).
    fn closest_feasible_start(
        &self,
        run: &mut DesignRun,
        fraction: f64,
        hint: Option<f64>,
    ) -> Option<Trial> {
        let target = self.range.target;
        let grid_ratio = self.range.grid_ratio;
        let mut scanned: Vec<Trial> = self
            .range
            .starts
            .iter()
            .filter(|&&t0| {
                hint.is_none_or(|h| t0 == target || (t0 / h).ln().abs() <= 2.01 * grid_ratio.ln())
            })
            .filter_map(|&t0| run.try_schedule(t0, fraction))
            .collect();
        scanned.sort_by(|a, b| a.start.total_cmp(&b.start));
        let nearest = scanned
            .iter()
            .filter(|t| self.feasible(run, t))
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
            match run.try_schedule(mid, fraction) {
                Some(t) if self.feasible(run, &t) => inside = t,
                Some(t) => outside = t,
                None => break,
            }
        }
        Some(inside)
    }

    /// The best start for each grid taper (after the first round only the columns next to the
    /// last best taper; the corrections change little between rounds), and for the current
    /// taper when it lies inside the range.
    fn taper_columns(
        &self,
        run: &mut DesignRun,
        previous_best_fraction: Option<f64>,
    ) -> Vec<(f64, Option<Trial>)> {
        let (_, nv) = run.grid();
        let max_taper = run.frame.max_taper;
        let mut columns: Vec<(f64, Option<Trial>)> = Vec::new();
        for j in 0..nv {
            let f = j as f64 / (nv - 1) as f64 * max_taper;
            if let Some(previous) = previous_best_fraction
                && (f - previous).abs() > 1.5 * max_taper / (nv - 1) as f64
            {
                continue;
            }
            let t = self.closest_feasible_start(run, f, None);
            columns.push((f, t));
        }
        let reference_taper = self.objective.reference_taper;
        if reference_taper > 0.0 && reference_taper < max_taper {
            let t = self.closest_feasible_start(run, reference_taper, None);
            columns.push((reference_taper, t));
            columns.sort_by(|a, b| a.0.total_cmp(&b.0));
        }
        columns
    }

    /// Golden-section refinement of the taper between the neighbours of the best column.
    fn refine_taper(&self, run: &mut DesignRun, columns: &[(f64, Option<Trial>)]) {
        let best_column = (0..columns.len()).min_by(|&a, &b| {
            self.column_score(run, &columns[a].1)
                .total_cmp(&self.column_score(run, &columns[b].1))
        });
        let Some(j) = best_column else {
            return;
        };
        if columns[j].1.is_none() {
            return;
        }
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
            let t1 = self.closest_feasible_start(run, x1, hint);
            let s1 = self.column_score(run, &t1);
            let t2 = self.closest_feasible_start(run, x2, hint);
            let s2 = self.column_score(run, &t2);
            if s1 <= s2 {
                hi = x2;
            } else {
                lo = x1;
            }
        }
    }

    /// Final polish with a bounded Nelder–Mead on the penalised objective from the best trial
    /// so far; the best trial after it is the candidate.
    fn polish(&self, run: &mut DesignRun) -> Trial {
        let best = self.best_trial(run, &run.trials[0]);
        let max_taper = run.frame.max_taper;
        let mut f = |x: &[f64]| -> f64 {
            match run.try_schedule(self.range.start_of(x[0]), x[1] * max_taper) {
                Some(t) => self.score(run, &t),
                None => f64::INFINITY,
            }
        };
        nelder_mead::minimise(
            &mut f,
            &[self.range.to_u(best.start), best.fraction / max_taper],
            0.02,
            1e-4,
            20,
        );
        self.best_trial(run, &best)
    }

    /// The trial with the lowest score (the first of equals), `fallback` when there is none.
    fn best_trial(&self, run: &DesignRun, fallback: &Trial) -> Trial {
        *run.trials
            .iter()
            .min_by(|a, b| self.score(run, a).total_cmp(&self.score(run, b)))
            .unwrap_or(fallback)
    }
}
