//! The limits a designed schedule must meet, the search options, and the design's result types.

use serde::Serialize;

use crate::model::{ModelError, Profile, Resolution, Taper, TensionSchedule};

/// Default share of the rated crush pressure the core may carry. Common practice: keep a
/// margin below the maker's rating because ratings are short-term tests and cores creep.
pub const DEFAULT_CORE_SHARE: f64 = 0.8;
/// Default smallest telescoping margin: friction must hold the handling shear (which already
/// carries the shock factor of `mechanics::Events`) at every interface. Margins below 1 are the
/// ones the diagnosis' telescoping rules count as evidence; set a higher one from your own
/// roll-handling experience.
pub const DEFAULT_MIN_TELESCOPING_MARGIN: f64 = 1.0;
/// Default share of the peak pressure below which a compressive band counts as starring risk:
/// the model's own low-pressure share (see `model::profile`).
pub const DEFAULT_STARRING_PRESSURE_SHARE: f64 = crate::model::profile::LOW_PRESSURE_SHARE;
/// Smallest starring margin (`mechanics::starring`: buckling stress of a wrap on the stack over
/// its hoop compression) the starring limit accepts, besides having no low-pressure compressive
/// band: below 1 the model's own wraps buckle.
pub const MIN_STARRING_MARGIN: f64 = 1.0;
/// Default largest wound-in tension as a share of the web's tensile strength. Common practice
/// (from memory): winding tension is usually set at 10–25 % of the web's tensile strength.
pub const DEFAULT_TENSION_SHARE: f64 = 0.25;
/// Default design margin: every limit is met with this share to spare in the search, so the
/// re-solve at full resolution still meets it.
pub const DEFAULT_DESIGN_MARGIN: f64 = 0.05;

/// The limits a designed schedule must meet.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct TaperLimits {
    /// Core pressure ≤ core_share × rated crush pressure (0 < share ≤ 1.5).
    pub core_share: f64,
    /// Smallest telescoping margin (friction capacity / handling shear) ≥ this.
    pub min_telescoping_margin: f64,
    /// A node with compressive tangential stress and pressure below this share of the peak
    /// pressure is starring risk (0 < share < 1).
    pub starring_pressure_share: f64,
    /// Largest wound-in tension ≤ tension_share × web strength (0 < share ≤ 1).
    pub tension_share: f64,
}

impl Default for TaperLimits {
    fn default() -> Self {
        TaperLimits {
            core_share: DEFAULT_CORE_SHARE,
            min_telescoping_margin: DEFAULT_MIN_TELESCOPING_MARGIN,
            starring_pressure_share: DEFAULT_STARRING_PRESSURE_SHARE,
            tension_share: DEFAULT_TENSION_SHARE,
        }
    }
}

/// Shape of the continuous taper.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum TaperShape {
    /// T = T0·(1 − f·(r − rc)/(R − rc)).
    #[default]
    Linear,
    /// T = T0·(1 − f·(1 − rc/r)); f = 1 is constant torque.
    Hyperbolic,
}

/// How the search runs.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct DesignOptions {
    pub shape: TaperShape,
    /// Wind the taper as this many equal-build steps (2..=50) instead of a continuous ramp.
    pub steps: Option<usize>,
    /// Largest taper fraction searched (0 < f ≤ 1); default 0.8 linear, 1.0 hyperbolic.
    pub max_taper: Option<f64>,
    /// Share by which every limit must be met in the search.
    pub design_margin: f64,
    /// Elements of the grouped resolution used in the search.
    pub search_elements: usize,
    /// Grid points over start tension and over taper.
    pub grid: (usize, usize),
    /// Resolution of the before/after solves that the limits are finally checked on.
    pub verify_resolution: Resolution,
    /// Most solver work the design may do, in wrap-steps ([`super::budget::solve_work`]).
    pub work_budget: u64,
}

impl Default for DesignOptions {
    fn default() -> Self {
        DesignOptions {
            shape: TaperShape::Linear,
            steps: None,
            max_taper: None,
            design_margin: DEFAULT_DESIGN_MARGIN,
            search_elements: 120,
            grid: (11, 9),
            verify_resolution: Resolution::Auto,
            work_budget: super::budget::DEFAULT_WORK_BUDGET,
        }
    }
}

/// The four limits.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Limit {
    CorePressure,
    Starring,
    Telescoping,
    WoundInTension,
}

impl Limit {
    pub const ALL: [Limit; 4] = [
        Limit::CorePressure,
        Limit::Starring,
        Limit::Telescoping,
        Limit::WoundInTension,
    ];
    pub(super) fn index(self) -> usize {
        self as usize
    }
    /// Plain-words name.
    pub fn title(self) -> &'static str {
        match self {
            Limit::CorePressure => "core pressure",
            Limit::Starring => "no starring band",
            Limit::Telescoping => "telescoping margin",
            Limit::WoundInTension => "wound-in tension",
        }
    }
    /// The `rolltriage taper` option that sets it.
    pub fn option(self) -> &'static str {
        match self {
            Limit::CorePressure => "--core-share",
            Limit::Starring => "--starring-share",
            Limit::Telescoping => "--min-telescoping-margin",
            Limit::WoundInTension => "--tension-share",
        }
    }
}

/// One limit checked on one profile.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct LimitCheck {
    pub limit: Limit,
    /// Core pressure (Pa); starring band extent (share of the build); smallest telescoping
    /// margin (ratio); largest wound-in tension (N/m).
    pub value: f64,
    /// The allowed maximum (core, starring, tension) or minimum (telescoping), same unit.
    pub allowed: f64,
    /// Relative margin, positive when met (e.g. 0.1 = 10 % to spare).
    pub margin: f64,
    pub met: bool,
}

impl LimitCheck {
    /// A limit whose `value` may not exceed `allowed`; the margin is the share of `allowed`
    /// left over.
    pub(super) fn at_most(limit: Limit, value: f64, allowed: f64) -> Self {
        LimitCheck {
            limit,
            value,
            allowed,
            margin: 1.0 - value / allowed,
            met: value <= allowed,
        }
    }
}

/// A schedule and the roll it winds.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Evaluation {
    pub schedule: TensionSchedule,
    pub checks: Vec<LimitCheck>,
    pub profile: Profile,
}

impl Evaluation {
    pub fn all_met(&self) -> bool {
        self.checks.iter().all(|c| c.met)
    }
    pub fn check(&self, limit: Limit) -> Option<&LimitCheck> {
        self.checks.iter().find(|c| c.limit == limit)
    }
    pub fn worst_margin(&self) -> f64 {
        self.checks
            .iter()
            .map(|c| c.margin)
            .fold(f64::INFINITY, f64::min)
    }
}

/// One row of the operator's table.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct ScheduleRow {
    /// Roll diameter, m.
    pub diameter: f64,
    /// Web tension to set from this diameter on, N/m.
    pub tension: f64,
}

/// Two limits that no searched schedule meets together, and what to relax.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Conflict {
    pub first: Limit,
    /// Equal to `first` when one limit cannot be met on its own.
    pub second: Limit,
    /// Best worst-margin of the pair over every searched schedule (negative).
    pub best_margin: f64,
    /// Plain-words advice: which option to change and to what.
    pub advice: Vec<String>,
}

/// The result of a design.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TaperDesign {
    /// True when the designed schedule meets every limit when re-solved at normal resolution.
    pub feasible: bool,
    pub shape: TaperShape,
    pub steps: Option<usize>,
    /// Start tension of the continuous ramp, N/m.
    pub start_tension: f64,
    /// Taper fraction of the continuous ramp.
    pub taper_fraction: f64,
    /// The schedule to wind (a ramp, or steps).
    pub schedule: TensionSchedule,
    pub limits: TaperLimits,
    /// The case's own schedule.
    pub before: Evaluation,
    /// The designed schedule (or, when infeasible, the one closest to meeting every limit).
    pub after: Evaluation,
    /// Limits that stop the design from staying closer to the current start tension or from
    /// using less taper (their margin is at the design margin).
    pub binding: Vec<Limit>,
    pub conflict: Option<Conflict>,
    pub table: Vec<ScheduleRow>,
    /// Plain-words explanation, one sentence per item.
    pub explanation: Vec<String>,
    /// Solver runs used.
    pub solves: usize,
    /// Solver work used, in wrap-steps (the budget's unit).
    #[serde(skip)]
    pub work: u64,
}

/// Errors of the taper design.
#[derive(Debug, thiserror::Error)]
pub enum TaperError {
    #[error("{field} = {value} is out of range: accepted {accepted}")]
    OutOfRange {
        field: &'static str,
        value: f64,
        accepted: &'static str,
    },
    /// A case input the design needs is missing or unusable.
    #[error("the case cannot be designed for: {reason}")]
    Unusable {
        /// The case field at fault.
        field: &'static str,
        reason: &'static str,
    },
    /// Even the least search on this roll needs more work than the budget: refused before any
    /// solve.
    #[error(
        "the roll has {wraps} wraps: even the smallest taper search on it needs about {needed} million wrap-steps of solver work, more than the design's budget of {budget} million (it would run for minutes); a typical taper search fits rolls of up to about {largest_wraps} wraps at this caliper"
    )]
    OverBudget {
        wraps: usize,
        /// Millions of wrap-steps.
        needed: u64,
        budget: u64,
        /// The largest roll a typical search fits in.
        largest_wraps: usize,
    },
    /// The search used its budget before it settled on a schedule.
    #[error(
        "the taper search on this {wraps}-wrap roll used its budget of {budget} million wrap-steps of solver work before it settled on a schedule ({done}); no design is given",
        budget = crate::units::sig3(*budget)
    )]
    BudgetUsedUp {
        wraps: usize,
        /// The solves made before the budget ran out, by kind.
        done: super::budget::SolveCount,
        /// Millions of wrap-steps.
        budget: f64,
    },
    /// Every searched schedule failed to solve and no solver error was kept.
    #[error("the case cannot be designed for: no schedule could be solved")]
    NothingSolved,
    #[error(transparent)]
    Model(#[from] ModelError),
}

impl TaperLimits {
    /// Check every limit's range.
    pub fn validate(&self) -> Result<(), TaperError> {
        let check = |field, value: f64, ok: bool, accepted| {
            if value.is_finite() && ok {
                Ok(())
            } else {
                Err(TaperError::OutOfRange {
                    field,
                    value,
                    accepted,
                })
            }
        };
        check(
            "core_share",
            self.core_share,
            self.core_share > 0.0 && self.core_share <= 1.5,
            "0 < share ≤ 1.5",
        )?;
        check(
            "min_telescoping_margin",
            self.min_telescoping_margin,
            self.min_telescoping_margin > 0.0 && self.min_telescoping_margin <= 100.0,
            "0 < margin ≤ 100",
        )?;
        check(
            "starring_pressure_share",
            self.starring_pressure_share,
            self.starring_pressure_share > 0.0 && self.starring_pressure_share < 1.0,
            "0 < share < 1",
        )?;
        check(
            "tension_share",
            self.tension_share,
            self.tension_share > 0.0 && self.tension_share <= 1.0,
            "0 < share ≤ 1",
        )
    }
}

impl TaperShape {
    /// The model's taper of this shape.
    pub fn taper(self, fraction: f64) -> Taper {
        match self {
            TaperShape::Linear => Taper::Linear { fraction },
            TaperShape::Hyperbolic => Taper::Hyperbolic { fraction },
        }
    }
}
