//! Cinching and core slip: the torque each interface must pass in a named event against the
//! torque its friction can carry, over every interface of the finished roll.
//!
//! Capacity per unit width of the interface at radius r: μ·P(r)·2π·r². Demand per unit width,
//! with J the polar moment of inertia per unit width of a solid annulus of web (ρ·π·(b⁴ − a⁴)/2)
//! and α = v / (R·t) the angular acceleration of a speed change v in time t at the outside:
//!
//! | event | centre drive (and centre-surface, taken as centre) | surface drive |
//! |---|---|---|
//! | start-up | T·R + J(r..R)·α | J(rc..r)·α |
//! | normal stop | abs(T·R − J(r..R)·α) | J(rc..r)·α |
//! | emergency stop (tension lost) | J(r..R)·α | J(rc..r)·α |
//! | unwind braking at the customer | T_u·R | T_u·R |
//!
//! A centre drive passes the torque from the core out through every interface to the wraps
//! outside r; a surface drive turns the outside and must drag the wraps inside r (the core's own
//! inertia is left out). The tensile outermost wraps (the `surface` zone) carry the tension in
//! their own hoop stress and are not checked. Node 0 is the core/web interface: its margin is the
//! core-slip margin. When the case gives the chuck or shaft torque rating, the core/shaft
//! interface is checked too: the torque the core must pass (the demand at the core/web
//! interface; the core's own inertia left out) against the rating per width. The roll is taken
//! at full diameter (pressure relief as wraps come off on
//! unwinding is not modelled).

use serde::Serialize;

use super::{InterfaceMargins, MechanicsInputs};
use crate::model::{Profile, WindingMethod, ZoneName};

/// The events the torque check covers.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Event {
    StartUp,
    NormalStop,
    EmergencyStop,
    Unwind,
}

impl Event {
    pub const ALL: [Event; 4] = [
        Event::StartUp,
        Event::NormalStop,
        Event::EmergencyStop,
        Event::Unwind,
    ];
    /// Plain words.
    pub fn title(self) -> &'static str {
        match self {
            Event::StartUp => "start-up ramp",
            Event::NormalStop => "normal stop",
            Event::EmergencyStop => "emergency stop",
            Event::Unwind => "unwind braking",
        }
    }
}

/// Margins of one event.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EventMargins {
    pub event: Event,
    pub margins: InterfaceMargins,
}

/// The torque check of a roll.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TorqueCheck {
    pub events: Vec<EventMargins>,
    /// Smallest margin over every event and interface, the event and the radius (m).
    pub min_margin: f64,
    pub worst_event: Event,
    pub min_radius: f64,
    /// Smallest margin of the core/web interface over the events, and that event.
    pub core_margin: f64,
    pub core_event: Event,
    /// Smallest margin over the speed-change events only (start-up, normal stop, emergency
    /// stop): what the roll's inertia asks of the interfaces.
    pub speed_change_margin: f64,
    /// Rating / demand at the core/shaft interface, smallest over the events, and that event;
    /// `None` without a chuck or shaft torque rating.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub shaft_margin: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub shaft_event: Option<Event>,
}

/// Polar moment of inertia per unit width of a web annulus from a to b (kg·m²/m).
pub fn annulus_inertia(density: f64, a: f64, b: f64) -> f64 {
    density * std::f64::consts::PI * (b.powi(4) - a.powi(4)).max(0.0) / 2.0
}

/// Torque demand per unit width (N·m/m) at radius r in `event`.
pub fn demand(inputs: &MechanicsInputs, outer: f64, r: f64, event: Event) -> f64 {
    let e = &inputs.events;
    let alpha = |time: f64| {
        if time > 0.0 && outer > 0.0 {
            inputs.speed / (outer * time)
        } else {
            0.0
        }
    };
    let tension_torque = inputs.outer_tension * outer;
    let outside = annulus_inertia(inputs.density, r, outer);
    let inside = annulus_inertia(inputs.density, inputs.core_radius.min(r), r);
    let centre = !matches!(inputs.method, WindingMethod::Surface);
    match (event, centre) {
        (Event::StartUp, true) => tension_torque + outside * alpha(e.start_ramp_time),
        (Event::NormalStop, true) => (tension_torque - outside * alpha(e.normal_stop_time)).abs(),
        (Event::EmergencyStop, true) => outside * alpha(e.emergency_stop_time),
        (Event::StartUp, false) => inside * alpha(e.start_ramp_time),
        (Event::NormalStop, false) => inside * alpha(e.normal_stop_time),
        (Event::EmergencyStop, false) => inside * alpha(e.emergency_stop_time),
        (Event::Unwind, _) => e.unwind_tension.unwrap_or(inputs.outer_tension) * outer,
    }
}

/// Check every event at every interface inside the surface zone.
pub fn torque_check(profile: &Profile, inputs: &MechanicsInputs) -> TorqueCheck {
    let n = profile.radius.len();
    let outer = profile
        .radius
        .last()
        .copied()
        .unwrap_or(inputs.outer_radius);
    let end = profile
        .zone(ZoneName::Surface)
        .map(|z| z.start)
        .unwrap_or(n.saturating_sub(1))
        .clamp(1.min(n), n.saturating_sub(1).max(1.min(n)));
    let capacity: Vec<f64> = (0..end)
        .map(|i| {
            let r = profile.radius[i];
            inputs.friction * profile.pressure[i].max(0.0) * 2.0 * std::f64::consts::PI * r * r
        })
        .collect();
    let radius: Vec<f64> = profile.radius[..end].to_vec();
    let events: Vec<EventMargins> = Event::ALL
        .iter()
        .map(|&event| EventMargins {
            event,
            margins: InterfaceMargins::new(
                radius.clone(),
                radius
                    .iter()
                    .map(|&r| demand(inputs, outer, r, event))
                    .collect(),
                capacity.clone(),
            ),
        })
        .collect();
    let worst = events
        .iter()
        .min_by(|a, b| a.margins.min_margin.total_cmp(&b.margins.min_margin));
    let core = events
        .iter()
        .filter(|e| !e.margins.radius.is_empty())
        .map(|e| (e.event, e.margins.margin_at(0)))
        .min_by(|a, b| a.1.total_cmp(&b.1));
    let speed_change_margin = events
        .iter()
        .filter(|e| e.event != Event::Unwind)
        .map(|e| e.margins.min_margin)
        .fold(super::MARGIN_CAP, f64::min);
    let shaft = inputs.events.shaft_torque_rating.and_then(|rating| {
        Event::ALL
            .iter()
            .map(|&event| {
                let demand = demand(inputs, outer, inputs.core_radius, event);
                (event, super::margin(rating, demand))
            })
            .min_by(|a, b| a.1.total_cmp(&b.1))
    });
    TorqueCheck {
        shaft_margin: shaft.map(|s| s.1),
        shaft_event: shaft.map(|s| s.0),
        speed_change_margin,
        min_margin: worst.map_or(super::MARGIN_CAP, |w| w.margins.min_margin),
        worst_event: worst.map_or(Event::StartUp, |w| w.event),
        min_radius: worst.map_or(inputs.core_radius, |w| w.margins.min_radius),
        core_margin: core.map_or(super::MARGIN_CAP, |c| c.1),
        core_event: core.map_or(Event::StartUp, |c| c.0),
        events,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::mechanics::Events;

    /// The core/shaft check against a hand computation: with no speed (no inertia) the torque
    /// the core passes in a start-up, a normal stop and unwind braking is the tension torque
    /// T·R (statics: torque = force × radius), 200 N/m × 0.5 m = 100 N·m per metre of width;
    /// a rating of 50 N·m/m gives 50 / 100 = 0.5, first reached in the start-up.
    #[test]
    fn shaft_margin_is_rating_over_the_torque_the_core_passes() {
        let radius: Vec<f64> = (0..=10).map(|i| 0.05 + 0.045 * f64::from(i)).collect();
        let profile = Profile {
            pressure: vec![1e6; radius.len()],
            radius,
            ..Profile::default()
        };
        // Not read by the torque check: the starring inputs.
        let inputs = crate::mechanics::sample_inputs(Some(50.0));
        let check = torque_check(&profile, &inputs);
        let margin = check.shaft_margin.expect("a rating was given");
        assert!((margin - 0.5).abs() < 1e-12, "{margin}");
        assert_eq!(check.shaft_event, Some(Event::StartUp));
        // Without a rating the interface is not checked.
        let unrated = MechanicsInputs {
            events: Events::default(),
            ..inputs
        };
        assert_eq!(torque_check(&profile, &unrated).shaft_margin, None);
    }
}
