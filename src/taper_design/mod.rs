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

pub mod nelder_mead;

use serde::Serialize;

use crate::case::ResolvedCase;
use crate::model::{
    ModelError, Profile, Resolution, SolverOptions, Taper, TensionSchedule, schedule::TensionStep,
};

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
    fn index(self) -> usize {
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
    fn at_most(limit: Limit, value: f64, allowed: f64) -> Self {
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
    let starring = LimitCheck {
        limit: Limit::Starring,
        value: longest,
        allowed: 0.0,
        margin: if depth > 0.0 { -depth } else { 1.0 },
        met: depth <= 0.0,
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
    let search = Resolution::Elements {
        count: options.search_elements.max(10),
    };
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

    let (nu, nv) = (options.grid.0.max(3), options.grid.1.max(2));
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
    })
}

/// Find the pair of limits that no searched schedule meets together (the most conflicting one),
/// and what each would have to be relaxed to.
fn find_conflict(cx: &Context, trials: &[Trial], k: Corrections) -> Conflict {
    let (case, limits) = (cx.case, cx.limits);
    let margins: Vec<[f64; 4]> = trials.iter().map(|t| t.margins(k, cx)).collect();
    let values: Vec<[f64; 4]> = trials.iter().map(|t| t.values(k)).collect();
    let best_pair = |a: Limit, b: Limit| {
        margins
            .iter()
            .map(|m| m[a.index()].min(m[b.index()]))
            .fold(f64::NEG_INFINITY, f64::max)
    };
    // A limit that fails on its own comes first.
    let mut worst: Option<(Limit, Limit, f64)> = None;
    for a in Limit::ALL {
        let m = best_pair(a, a);
        if m < 0.0 && worst.is_none_or(|w| m < w.2) {
            worst = Some((a, a, m));
        }
    }
    if worst.is_none() {
        for (i, a) in Limit::ALL.iter().enumerate() {
            for b in Limit::ALL.iter().skip(i + 1) {
                let m = best_pair(*a, *b);
                if worst.is_none_or(|w| m < w.2) {
                    worst = Some((*a, *b, m));
                }
            }
        }
    }
    let (first, second, best_margin) =
        worst.unwrap_or((Limit::CorePressure, Limit::Telescoping, 0.0));
    let mut advice = Vec::new();
    if first == second {
        advice.push(format!(
            "{} cannot be met by any searched schedule on its own (best margin {:.0} %); relax {} or change the roll (core, web or roll size)",
            first.title(),
            100.0 * best_margin,
            first.option()
        ));
    } else {
        for (relax, keep) in [(first, second), (second, first)] {
            // Best value of `relax` among schedules that meet `keep`.
            let best = (0..trials.len())
                .filter(|&i| margins[i][keep.index()] >= 0.0)
                .max_by(|&x, &y| margins[x][relax.index()].total_cmp(&margins[y][relax.index()]));
            if let Some(i) = best {
                advice.push(relax_advice(
                    case,
                    limits,
                    relax,
                    keep,
                    values[i][relax.index()],
                ));
            }
        }
        if best_margin >= 0.0 {
            advice.push(
                "each pair can be met, but not all four together; relax either of the named limits"
                    .into(),
            );
        }
    }
    Conflict {
        first,
        second,
        best_margin,
        advice,
    }
}

fn kpa(p: f64) -> String {
    crate::units::format_quantity(
        p,
        crate::units::QuantityKind::Stress,
        crate::units::UnitSystem::Si,
    )
}

fn relax_advice(
    case: &ResolvedCase,
    limits: &TaperLimits,
    relax: Limit,
    keep: Limit,
    best: f64,
) -> String {
    let keeping = format!("While {} is met", keep.title());
    match relax {
        Limit::CorePressure => {
            let share = best / case.core.crush_pressure;
            let stronger = kpa(best / limits.core_share);
            if share <= 1.0 {
                format!(
                    "{keeping}, the core pressure is at least {}: raise {} to {:.2} (now {:.2}) or use a core rated for {stronger} or more",
                    kpa(best),
                    relax.option(),
                    share,
                    limits.core_share,
                )
            } else {
                format!(
                    "{keeping}, the core pressure is at least {}, above the core's rating: use a core rated for {stronger} or more",
                    kpa(best),
                )
            }
        }
        Limit::Telescoping => format!(
            "{keeping}, the telescoping margin reaches at most {:.2}: lower {} to that (now {:.2}), or handle the rolls more gently",
            best,
            relax.option(),
            limits.min_telescoping_margin
        ),
        Limit::WoundInTension => format!(
            "{keeping}, the wound-in tension must reach {:.0} N/m: raise {} to {:.2} (now {:.2}) if the web's strength allows it",
            best,
            relax.option(),
            best / case.web.strength,
            limits.tension_share
        ),
        Limit::Starring => format!(
            "{keeping}, a compressive low-pressure band of {:.0} % of the build remains: relax the other limit, or change the core or web",
            100.0 * best
        ),
    }
}

/// Tension against diameter for the operator: one row per step, or eleven rows across the build.
pub fn operator_table(
    schedule: &TensionSchedule,
    rc: f64,
    big_r: f64,
    steps: Option<usize>,
) -> Vec<ScheduleRow> {
    match (&schedule.taper, steps) {
        (Taper::Steps { steps }, _) => {
            let mut rows = vec![ScheduleRow {
                diameter: 2.0 * rc,
                tension: schedule.start_tension,
            }];
            rows.extend(steps.iter().map(|s| ScheduleRow {
                diameter: 2.0 * s.radius,
                tension: s.tension,
            }));
            rows
        }
        _ => (0..=10)
            .map(|k| {
                let r = rc + (big_r - rc) * k as f64 / 10.0;
                ScheduleRow {
                    diameter: 2.0 * r,
                    tension: schedule.scheduled_tension_at(r, rc, big_r),
                }
            })
            .collect(),
    }
}

#[allow(clippy::too_many_arguments)]
fn explain(
    case: &ResolvedCase,
    before: &Evaluation,
    after: &Evaluation,
    feasible: bool,
    binding: &[Limit],
    conflict: Option<&Conflict>,
    trial: Trial,
    target: f64,
) -> Vec<String> {
    let mut out = Vec::new();
    if before.all_met() {
        out.push("The current schedule already meets every limit.".to_string());
    } else {
        let failed: Vec<&str> = before
            .checks
            .iter()
            .filter(|c| !c.met)
            .map(|c| c.limit.title())
            .collect();
        out.push(format!(
            "The current schedule fails: {}.",
            failed.join(", ")
        ));
    }
    if feasible {
        out.push(format!(
            "Designed: start {:.0} N/m with {:.0} % taper (the current start is {:.0} N/m); it meets every limit when re-solved.",
            trial.start,
            100.0 * trial.fraction,
            case.winding.tension.start_tension
        ));
        if (trial.start / target - 1.0).abs() < 0.02 {
            out.push(
                "The start tension is kept; the taper is the smallest change from the current one that meets the limits."
                    .into(),
            );
        } else {
            out.push(
                "Taper alone cannot meet the limits at the current start tension, so the start tension moves too."
                    .into(),
            );
        }
        for limit in binding {
            let why = match limit {
                Limit::CorePressure => {
                    "more start tension or less taper would load the core beyond the chosen share of its crush rating"
                }
                Limit::Telescoping => {
                    "less tension (lower start or more taper) would leave some layers too loosely held to carry the roll's weight in handling (telescoping)"
                }
                Limit::WoundInTension => {
                    "a higher start tension would exceed the web's safe share of its strength"
                }
                Limit::Starring => {
                    "a different taper would open a band of compressive tangential stress at low pressure"
                }
            };
            if let Some(c) = after.check(*limit) {
                out.push(format!(
                    "Binding: {} ({:.0} % to spare): {why}.",
                    limit.title(),
                    100.0 * c.margin
                ));
            }
        }
        if binding.contains(&Limit::WoundInTension)
            && let (Some(nip), Some(wit)) =
                (case.winding.nip_load, after.check(Limit::WoundInTension))
        {
            let nip_part = if nip > 0.0 {
                case.nip_induced_tension_at_core()
            } else {
                0.0
            };
            if nip_part > 0.25 * wit.value {
                out.push(format!(
                    "The nip adds about {nip_part:.0} N/m (kinetic friction × nip load) to the wound-in tension; a lighter nip would leave room for more web tension."
                ));
            }
        }
    } else if let Some(c) = conflict {
        if c.first == c.second {
            out.push(format!(
                "No schedule meets every limit: {} cannot be met.",
                c.first.title()
            ));
        } else {
            out.push(format!(
                "No schedule meets every limit: {} and {} conflict — what one needs, the other forbids.",
                c.first.title(),
                c.second.title()
            ));
        }
        out.extend(c.advice.iter().cloned());
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::case::{ResolvedCore, ResolvedRoll, ResolvedWeb, ResolvedWinding};
    use crate::model::{CoreStiffness, RadialStiffness, WindingMethod};

    fn case() -> ResolvedCase {
        ResolvedCase {
            title: "unit".into(),
            web: ResolvedWeb {
                preset: None,
                material: crate::vocabulary::WebMaterial::Film,
                thickness: 100e-6,
                width: 1.0,
                tangential_modulus: 1e9,
                radial_stiffness: RadialStiffness::Constant { modulus: 1e7 },
                poisson_ratio: 0.01,
                friction: 0.3,
                kinetic_friction: 0.3,
                density: 1000.0,
                roughness: 1e-6,
                strength: 1000.0,
            },
            core: ResolvedCore {
                preset: None,
                material: crate::vocabulary::CoreMaterial::Steel,
                inside_diameter: 0.08,
                outside_diameter: 0.1,
                stiffness: CoreStiffness::Rigid,
                crush_pressure: 1e6,
                support: crate::model::CoreSupport::Free,
                crush_basis: crate::model::core_crush::CrushBasis::Given,
            },
            roll: ResolvedRoll {
                outer_diameter: 0.3,
                length: 0.0,
            },
            winding: ResolvedWinding {
                method: WindingMethod::Centre,
                tension: TensionSchedule {
                    start_tension: 100.0,
                    taper: Taper::None,
                    upsets: vec![],
                },
                nip_load: None,
                nip_programme: None,
                nip_plateau: crate::model::winder::NIP_MODEL_LIMIT,
                centre_torque: None,
                drums: None,
                speed: 1.0,
                temperature: None,
                acceleration_time: None,
            },
            symptoms: vec![],
            answers: Default::default(),
            assumed: vec![],
        }
    }

    /// 101 nodes from r = 0.05 to 0.15 m; pressure falls linearly from 500 kPa to 0; σθ is
    /// compressive (−1 MPa) over the given nodes and tensile elsewhere.
    fn profile(compressive: std::ops::Range<usize>) -> Profile {
        let n = 101;
        let radius: Vec<f64> = (0..n).map(|i| 0.05 + 0.001 * i as f64).collect();
        let pressure: Vec<f64> = (0..n).map(|i| 500e3 * (1.0 - i as f64 / 100.0)).collect();
        let tangential_stress: Vec<f64> = (0..n)
            .map(|i| if compressive.contains(&i) { -1e6 } else { 1e6 })
            .collect();
        Profile {
            zones: crate::model::profile::default_zones(&radius, &tangential_stress),
            summary: crate::model::ProfileSummary {
                core_pressure: pressure[0],
                ..Default::default()
            },
            wound_in_tension: vec![100.0; n],
            radial_strain: vec![0.0; n],
            radius,
            pressure,
            tangential_stress,
            ..Default::default()
        }
    }

    #[test]
    fn a_compressive_band_at_high_pressure_is_not_starring() {
        let checks = check_limits(&case(), &profile(10..30), &TaperLimits::default());
        let s = checks[Limit::Starring.index()];
        assert!(s.met && s.margin == 1.0 && s.value == 0.0, "{s:?}");
        // Core: 500 kPa against 0.8 × 1 MPa.
        let c = checks[Limit::CorePressure.index()];
        assert!((c.margin - (1.0 - 500e3 / 800e3)).abs() < 1e-12);
        // Wound-in tension 100 N/m against 0.25 × 1000 N/m.
        let t = checks[Limit::WoundInTension.index()];
        assert!((t.margin - 0.6).abs() < 1e-12);
    }

    #[test]
    fn a_compressive_band_at_low_pressure_is_starring_with_its_extent() {
        // Nodes 80..90: pressure 100–55 kPa, below 125 kPa (25 % of the 500 kPa peak).
        let checks = check_limits(&case(), &profile(80..90), &TaperLimits::default());
        let s = checks[Limit::Starring.index()];
        assert!(!s.met && s.margin < 0.0, "{s:?}");
        // Ten nodes of 1 mm over a 100 mm build.
        assert!((s.value - 0.10).abs() < 1e-9, "{}", s.value);
    }

    #[test]
    fn steps_follow_the_ramp_at_band_middles() {
        let s = build_schedule(TaperShape::Linear, Some(4), 200.0, 0.5, 0.05, 0.25);
        let Taper::Steps { steps } = &s.taper else {
            panic!()
        };
        // Band middles at 1/8, 3/8, 5/8, 7/8 of the build: 200·(1 − 0.5·x).
        assert!((s.start_tension - 187.5).abs() < 1e-9);
        assert_eq!(steps.len(), 3);
        assert!((steps[0].radius - 0.10).abs() < 1e-12);
        assert!((steps[2].tension - 112.5).abs() < 1e-9);
    }
}
