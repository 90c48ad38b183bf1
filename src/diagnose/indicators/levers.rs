//! Core-pressure levers: how far the roll's size and its taper can move the computed core
//! pressure for this web, found by re-solving the case wound to half its build and with 30
//! percent points more taper.
//!
//! On soft webs the accretion model's core pressure saturates within a few centimetres of
//! build: the layers wound later compress the stack beneath them instead of loading the core,
//! so neither a bigger roll nor missing taper raises it. The rules read these two shares so a
//! crushed core blames roll size or taper only where the model says they matter (issue 15 §5).

use super::Indicators;
use crate::case::ResolvedCase;
use crate::model::{Profile, SolverOptions, Taper};

/// The indicators only the case as wound has (a what-if keeps the values of the case as wound:
/// they describe the web and the roll, not the remedy).
pub const LEVER_IDS: &[&str] = &["core_pressure_size_share", "core_pressure_taper_share"];

/// Taper added for the taper lever, percent points as a fraction (a usual first trial is
/// 10–30 points, `common practice`).
const TAPER_STEP: f64 = 0.30;

impl Indicators {
    /// Add the two lever shares (left out where the re-solve fails or the case cannot take the
    /// change: the rules testing them then stay neutral).
    pub(super) fn add_core_levers(&mut self, case: &ResolvedCase, profile: &Profile) {
        let full = profile.summary.core_pressure;
        if full <= 0.0 {
            return;
        }
        if let Some(half) = core_pressure_of(&half_build(case)) {
            self.set("core_pressure_size_share", None, share(full, half));
        }
        if let Some(tapered) = more_taper(case).and_then(|c| core_pressure_of(&c)) {
            self.set("core_pressure_taper_share", None, share(full, tapered));
        }
    }
}

/// The share of `full` that the change to `changed` removes (0 when it removes nothing or
/// raises it).
fn share(full: f64, changed: f64) -> f64 {
    ((full - changed) / full).clamp(0.0, 1.0)
}

fn core_pressure_of(case: &ResolvedCase) -> Option<f64> {
    let profile = crate::model::solve(&case.problem(SolverOptions::default())).ok()?;
    Some(profile.summary.core_pressure.max(0.0))
}

/// The case wound to half its build thickness (same core, same settings).
pub fn half_build(case: &ResolvedCase) -> ResolvedCase {
    let mut out = case.clone();
    let core = case.core.outside_diameter;
    out.roll.outer_diameter = core + (case.roll.outer_diameter - core) / 2.0;
    if case.roll.outer_diameter > 0.0 {
        out.roll.length *= (out.roll.outer_diameter.powi(2) - core.powi(2))
            / (case.roll.outer_diameter.powi(2) - core.powi(2)).max(1e-12);
    }
    out
}

/// The case with [`TAPER_STEP`] more taper; `None` for stepped tension or where the taper is
/// already near its limit.
pub fn more_taper(case: &ResolvedCase) -> Option<ResolvedCase> {
    let mut out = case.clone();
    let taper = &mut out.winding.tension.taper;
    *taper = match *taper {
        Taper::None => Taper::Linear {
            fraction: TAPER_STEP,
        },
        Taper::Linear { fraction } if fraction + TAPER_STEP <= 0.9 => Taper::Linear {
            fraction: fraction + TAPER_STEP,
        },
        Taper::Hyperbolic { fraction } if fraction + TAPER_STEP <= 0.9 => Taper::Hyperbolic {
            fraction: fraction + TAPER_STEP,
        },
        _ => return None,
    };
    Some(out)
}
