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
/// assumed when the case gives no acceleration time.
pub const DEFAULT_RAMP_TIME: f64 = 20.0;

/// Default emergency stop time (s): `(from memory)` a few seconds on production winders,
/// assumed.
pub const DEFAULT_EMERGENCY_STOP_TIME: f64 = 4.0;

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
}

impl InterfaceMargins {
    fn new(radius: Vec<f64>, demand: Vec<f64>, capacity: Vec<f64>) -> InterfaceMargins {
        let mut min_margin = MARGIN_CAP;
        let mut min_radius = radius.first().copied().unwrap_or(0.0);
        for i in 0..radius.len() {
            let m = margin(capacity[i], demand[i]);
            if m < min_margin {
                min_margin = m;
                min_radius = radius[i];
            }
        }
        InterfaceMargins {
            radius,
            demand,
            capacity,
            min_margin,
            min_radius,
        }
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
