//! Failure mechanisms as demand against capacity at every interface of a solved roll: the one
//! criterion per mechanism that diagnosis indicators, taper-design limits, what-if rows, reports
//! and the terminal UI all read (docs/theory.md §5).
//!
//! * [`telescoping`]: axial shear of handling (the roll lifted by its core or stood on end)
//!   against static friction × interlayer pressure.
//! * [`torque`]: cinching and core slip — the torque each interface must pass in named events
//!   (start-up, normal stop, emergency stop, unwind braking) against friction × pressure × 2πr².
//! * [`starring`]: hoop compression of each wrap against the buckling stress of a layer on the
//!   elastic foundation of the stack (Hetényi's beam on an elastic foundation, Er at the local
//!   pressure).
//!
//! Inputs are SI and come from [`MechanicsInputs`] (built from a resolved case by
//! [`MechanicsInputs::from_case`]: `winding.acceleration_time`, `stop_time`,
//! `emergency_stop_time`, `unwind_tension`, `handling_shock_factor`, and the core's
//! `shaft_torque_rating`); what the case does not give takes the defaults
//! listed in [`Events`], stated as assumed. Layer above `model`: nothing here solves, it reads profiles.

pub mod starring;
pub mod table;
pub mod telescoping;
pub mod torque;

use serde::Serialize;

use crate::case::ResolvedCase;
use crate::model::{Profile, RadialStiffness, WindingMethod};

/// Standard acceleration of gravity, m/s² (CGPM 1901; NIST SP 330).
pub const GRAVITY: f64 = 9.806_65;

/// Margins above this are reported as this value (the demand is negligible there).
pub const MARGIN_CAP: f64 = 1.0e3;

/// The events whose loads the roll must carry, with the assumed defaults.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Events {
    /// Dynamic factor on the roll's own weight when it is lifted by its core or set down on end.
    /// Default 2: a suddenly applied load doubles the static stress (strength-of-materials
    /// textbook result for a load applied without drop height, e.g. Gere & Timoshenko,
    /// Mechanics of Materials, "suddenly applied load") — assumed.
    pub shock_factor: f64,
    /// Time to ramp from standstill to line speed (s); the case's `winding.acceleration_time`
    /// when given, else [`DEFAULT_RAMP_TIME`] (assumed).
    pub start_ramp_time: f64,
    /// Time of a normal stop from line speed (s): `winding.stop_time`, else the start ramp time.
    pub normal_stop_time: f64,
    /// Time of an emergency stop from line speed (s): `winding.emergency_stop_time`, else
    /// [`DEFAULT_EMERGENCY_STOP_TIME`] (assumed). The web tension is taken as lost in an emergency stop (a web break is the
    /// usual trigger), so the interfaces carry the inertia alone.
    pub emergency_stop_time: f64,
    /// Unwind tension at the customer, N/m: `winding.unwind_tension`; `None` = the web tension
    /// the outside was wound at (assumed).
    pub unwind_tension: Option<f64>,
    /// Torque rating of the chuck or shaft per unit width of web (N·m/m):
    /// `core.shaft_torque_rating` / `web.width`; `None` = the core/shaft interface is not checked.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub shaft_torque_rating: Option<f64>,
}

/// Default start-up and normal stop ramp (s): `(from memory)` typical of production winders,
/// assumed when the case gives no acceleration time; the resolver lists it as assumed with its
/// source ([`crate::presets::DEFAULT_RAMP_TIME`]).
pub const DEFAULT_RAMP_TIME: f64 = crate::presets::DEFAULT_RAMP_TIME.value;

/// Default emergency stop time (s): `(from memory)` a few seconds on production winders,
/// assumed and listed so ([`crate::presets::DEFAULT_EMERGENCY_STOP_TIME`]).
pub const DEFAULT_EMERGENCY_STOP_TIME: f64 = crate::presets::DEFAULT_EMERGENCY_STOP_TIME.value;

/// Default dynamic factor on roll weight in handling (see [`Events::shock_factor`]); the case
/// field `winding.handling_shock_factor` overrides it, and the resolver lists this default as
/// assumed with its source ([`crate::presets::DEFAULT_SHOCK_FACTOR`]).
pub const DEFAULT_SHOCK_FACTOR: f64 = crate::presets::DEFAULT_SHOCK_FACTOR.value;

impl Default for Events {
    fn default() -> Self {
        Events {
            shock_factor: DEFAULT_SHOCK_FACTOR,
            start_ramp_time: DEFAULT_RAMP_TIME,
            normal_stop_time: DEFAULT_RAMP_TIME,
            emergency_stop_time: DEFAULT_EMERGENCY_STOP_TIME,
            unwind_tension: None,
            shaft_torque_rating: None,
        }
    }
}

/// What the mechanisms need besides the profile, in SI.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct MechanicsInputs {
    /// Core outside radius and finished roll radius (m).
    pub core_radius: f64,
    pub outer_radius: f64,
    /// Density of the wound web (kg/m³): the resolved `web.density` (given, basis weight over
    /// caliper, or the preset's, each listed in the case's assumed values), the one density the
    /// winder model also uses for roll weight and centrifugal unloading.
    pub density: f64,
    /// Static web-to-web friction coefficient.
    pub friction: f64,
    pub method: WindingMethod,
    /// Line speed (m/s).
    pub speed: f64,
    /// Web tension the outside of the roll was wound at (N/m).
    pub outer_tension: f64,
    pub events: Events,
    /// Machine-direction (hoop) modulus of the web, Pa (starring).
    pub tangential_modulus: f64,
    /// Radial stiffness law of the stack (starring: the foundation of a wrap).
    pub radial_stiffness: RadialStiffness,
}

impl MechanicsInputs {
    /// The inputs of a resolved case; event inputs it lacks take the [`Events`] defaults.
    pub fn from_case(case: &ResolvedCase) -> MechanicsInputs {
        let core_radius = case.core.outside_diameter / 2.0;
        let outer_radius = case.roll.outer_diameter / 2.0;
        let mut events = Events::default();
        let w = &case.winding;
        if let Some(t) = w.acceleration_time.filter(|t| *t > 0.0) {
            events.start_ramp_time = t;
            events.normal_stop_time = t;
        }
        if let Some(t) = w.stop_time.filter(|t| *t > 0.0) {
            events.normal_stop_time = t;
        }
        if let Some(t) = w.emergency_stop_time.filter(|t| *t > 0.0) {
            events.emergency_stop_time = t;
        }
        events.unwind_tension = w.unwind_tension;
        if let Some(k) = w.handling_shock_factor {
            events.shock_factor = k;
        }
        events.shaft_torque_rating = case
            .core
            .shaft_torque_rating
            .filter(|_| case.web.width > 0.0)
            .map(|rating| rating / case.web.width);
        MechanicsInputs {
            core_radius,
            outer_radius,
            density: case.web.density,
            friction: case.web.friction,
            method: case.winding.method,
            speed: case.winding.speed,
            outer_tension: case.winding.tension.scheduled_tension_at(
                outer_radius,
                core_radius,
                outer_radius,
            ),
            events,
            tangential_modulus: case.web.tangential_modulus,
            radial_stiffness: case.web.radial_stiffness,
        }
    }
}

/// Capacity over demand at every interface checked, and where it is smallest.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct InterfaceMargins {
    /// Radius of each interface checked (m), from the core outward.
    pub radius: Vec<f64>,
    /// Demand and capacity in the mechanism's unit (Pa for shear, N·m/m for torque).
    pub demand: Vec<f64>,
    pub capacity: Vec<f64>,
    /// Smallest capacity / demand (capped at [`MARGIN_CAP`]) and its radius (m).
    pub min_margin: f64,
    pub min_radius: f64,
    /// Index of the smallest margin in `radius`.
    #[serde(skip)]
    pub min_index: usize,
    /// The weakest band (inner and outer radius, m): the run of neighbouring interfaces around
    /// the smallest margin that fail (margin below 1) when it fails, else whose margin is within
    /// [`BAND_SPREAD`] of the smallest. What a reader looks for on the roll end.
    pub band: (f64, f64),
    /// True when some interface carries demand. For starring: some wrap is in hoop compression;
    /// false means starring cannot start, whatever the margin's cap says.
    pub has_demand: bool,
}

/// The weakest band of a mechanism that holds: the interfaces whose margin is within this factor
/// of the smallest (10 %, a reading aid, not a criterion).
pub const BAND_SPREAD: f64 = 1.1;

impl InterfaceMargins {
    fn new(radius: Vec<f64>, demand: Vec<f64>, capacity: Vec<f64>) -> InterfaceMargins {
        let mut min_margin = MARGIN_CAP;
        let mut min_index = 0;
        for i in 0..radius.len() {
            let m = margin(capacity[i], demand[i]);
            if m < min_margin {
                min_margin = m;
                min_index = i;
            }
        }
        let min_radius = radius.get(min_index).copied().unwrap_or(0.0);
        let mut margins = InterfaceMargins {
            band: (min_radius, min_radius),
            has_demand: demand.iter().any(|d| *d > 0.0),
            radius,
            demand,
            capacity,
            min_margin,
            min_radius,
            min_index,
        };
        margins.band = margins.weakest_band(min_index);
        margins
    }

    /// Inner and outer radius of the run of interfaces around `at` that share the weakness of
    /// the smallest margin (see [`InterfaceMargins::band`]).
    fn weakest_band(&self, at: usize) -> (f64, f64) {
        if self.radius.is_empty() || self.min_margin >= MARGIN_CAP {
            return (self.min_radius, self.min_radius);
        }
        let limit = if self.min_margin < 1.0 {
            1.0
        } else {
            self.min_margin * BAND_SPREAD
        };
        let weak = |i: usize| self.margin_at(i) < limit || i == at;
        let mut inner = at;
        while inner > 0 && weak(inner - 1) {
            inner -= 1;
        }
        let mut outer = at;
        while outer + 1 < self.radius.len() && weak(outer + 1) {
            outer += 1;
        }
        (self.radius[inner], self.radius[outer])
    }

    /// Margin at interface `i`.
    pub fn margin_at(&self, i: usize) -> f64 {
        margin(self.capacity[i], self.demand[i])
    }
}

/// capacity / demand, capped; no demand is the cap.
fn margin(capacity: f64, demand: f64) -> f64 {
    if demand > 0.0 {
        (capacity.max(0.0) / demand).min(MARGIN_CAP)
    } else {
        MARGIN_CAP
    }
}

/// The interfaces of a profile: every node but the outside (node 0 is the core/web interface).
fn interfaces(profile: &Profile) -> std::ops::Range<usize> {
    0..profile.radius.len().saturating_sub(1)
}

/// A simple centre-wound roll's inputs for the unit tests: core ⌀ 100 mm, outside ⌀ 1 m,
/// 700 kg/m³, μ 0.4, standing still (no inertia), 200 N/m at the outside.
#[cfg(test)]
pub(crate) fn sample_inputs(shaft_torque_rating: Option<f64>) -> MechanicsInputs {
    MechanicsInputs {
        core_radius: 0.05,
        outer_radius: 0.5,
        density: 700.0,
        friction: 0.4,
        method: WindingMethod::Centre,
        speed: 0.0,
        outer_tension: 200.0,
        events: Events {
            shaft_torque_rating,
            ..Events::default()
        },
        tangential_modulus: 4e9,
        radial_stiffness: RadialStiffness::Constant { modulus: 1e7 },
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The weakest band of a failing mechanism is the run of failing interfaces around the
    /// smallest margin; of a holding one, the run within 10 % of the smallest (hand-worked).
    #[test]
    fn weakest_band_around_the_smallest_margin() {
        let radius = vec![1.0, 2.0, 3.0, 4.0, 5.0, 6.0];
        let demand = vec![1.0; 6];
        let failing = InterfaceMargins::new(
            radius.clone(),
            demand.clone(),
            vec![2.0, 0.9, 0.5, 0.8, 1.5, 0.7],
        );
        assert_eq!((failing.min_margin, failing.min_radius), (0.5, 3.0));
        assert_eq!(failing.band, (2.0, 4.0));
        assert!(failing.has_demand);
        let holding = InterfaceMargins::new(radius, demand, vec![3.0, 2.1, 2.0, 2.15, 2.3, 2.0]);
        assert_eq!(holding.min_radius, 3.0);
        assert_eq!(holding.band, (2.0, 4.0));
        let unloaded = InterfaceMargins::new(vec![1.0, 2.0], vec![0.0, 0.0], vec![1.0, 1.0]);
        assert!(!unloaded.has_demand);
        assert_eq!(unloaded.band, (1.0, 1.0));
    }
}
