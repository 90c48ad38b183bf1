//! The running state of one design: the checked inputs, the work account that is charged before
//! every solve ([`super::budget`]), the count of solves, and every schedule the search has tried
//! (each solved once at the search resolution and remembered).

use crate::case::ResolvedCase;
use crate::model::{Resolution, TensionSchedule};

use super::budget::{self, Budget};
use super::inputs::Frame;
use super::trial::{Context, Trial};
use super::{DesignOptions, Evaluation, TaperError, TaperLimits, build_schedule, evaluate};

/// One design in progress.
pub(super) struct DesignRun<'a> {
    pub cx: Context<'a>,
    pub options: &'a DesignOptions,
    pub frame: Frame,
    /// Resolution of the search's solves (grouped, fast).
    pub search: Resolution,
    /// Resolution the current and the chosen schedules are checked at.
    pub verify: Resolution,
    budget: Budget,
    /// Solves counted so far; the searched trials are added when the search ends.
    pub solves: usize,
    /// Every schedule tried in the search, in the order they were solved.
    pub trials: Vec<Trial>,
    /// The first solver error of a searched schedule (reported when no schedule solved at all).
    pub failure: Option<TaperError>,
    /// Solves made so far by kind, for the message when the budget runs out (searched
    /// schedules counted as they are solved, failures included).
    pub done: budget::SolveCount,
}

impl<'a> DesignRun<'a> {
    /// Set up the account; refused at once when even the least search does not fit the budget.
    pub fn start(
        case: &'a ResolvedCase,
        limits: &'a TaperLimits,
        options: &'a DesignOptions,
        frame: Frame,
    ) -> Result<DesignRun<'a>, TaperError> {
        let verify = options.verify_resolution;
        let search = Resolution::Elements {
            count: options.search_elements.max(10),
        };
        let layers = crate::model::layer_count_between(frame.rc, frame.big_r, case.web.thickness);
        let budget = Budget::new(options.work_budget, layers, search, verify);
        let run = DesignRun {
            cx: Context { case, limits },
            options,
            frame,
            search,
            verify,
            budget,
            solves: 0,
            trials: Vec::new(),
            failure: None,
            done: budget::SolveCount::default(),
        };
        let (nu, nv) = run.grid();
        run.budget.check_start(nu * nv + nv, search, verify)?;
        Ok(run)
    }

    /// Grid points over start tension and over taper.
    pub fn grid(&self) -> (usize, usize) {
        (self.options.grid.0.max(3), self.options.grid.1.max(2))
    }

    /// Charge a solve before it runs; an error naming the solves made so far, by kind, once the
    /// budget is used up.
    pub fn charge(&mut self, resolution: Resolution) -> Result<(), TaperError> {
        let work = budget::solve_work(self.budget.layers, resolution);
        if self.budget.charge(work) {
            Ok(())
        } else {
            Err(self.budget.exhausted(self.done))
        }
    }

    /// Solver work used so far, in wrap-steps.
    pub fn work_used(&self) -> u64 {
        self.budget.used
    }

    /// The schedule of a searched start tension and taper, in the requested shape and steps.
    pub fn schedule_of(&self, start: f64, fraction: f64) -> TensionSchedule {
        let f = &self.frame;
        build_schedule(
            self.options.shape,
            self.options.steps,
            start,
            fraction,
            f.rc,
            f.big_r,
        )
    }

    /// Check the case's own schedule at the verification resolution.
    pub fn check_current(&mut self) -> Result<Evaluation, TaperError> {
        self.charge(self.verify)?;
        let case = self.cx.case;
        let before = evaluate(case, &case.winding.tension, self.cx.limits, self.verify)?;
        self.solves += 1;
        self.done.checks += 1;
        Ok(before)
    }

    /// Solve one searched schedule (once: a schedule tried before is answered from the list).
    /// None when the budget is used up (the search stops at its next check) or the solve failed
    /// (the first failure is kept).
    pub fn try_schedule(&mut self, start: f64, fraction: f64) -> Option<Trial> {
        if let Some(t) = self
            .trials
            .iter()
            .find(|t| t.start == start && t.fraction == fraction)
        {
            return Some(*t);
        }
        if self.charge(self.search).is_err() {
            return None;
        }
        self.done.searched += 1;
        let schedule = self.schedule_of(start, fraction);
        match evaluate(self.cx.case, &schedule, self.cx.limits, self.search) {
            Ok(e) => {
                let t = Trial::from_checks(start, fraction, &e.checks);
                self.trials.push(t);
                Some(t)
            }
            Err(e) => {
                self.failure.get_or_insert(e);
                None
            }
        }
    }
}
