//! Telescoping under handling: the axial shear each interface must carry when the roll is lifted
//! by its core or stood on end, against the static friction the interlayer pressure gives.
//!
//! Lifted by the core (or resting on its lower end face) with the axis vertical, the wraps
//! outside radius r weigh ρ·g·π·(R² − r²) per unit width and hang on the interface cylinder of
//! area 2π·r per unit width, so the shear demand is
//!
//! ```text
//! τ(r) = k · ρ·g·(R² − r²) / (2r)        (k: shock factor, Events::shock_factor)
//! ```
//!
//! and the capacity is μ_s·P(r) (Coulomb friction). The margin is capacity / demand; the roll
//! telescopes first where it is smallest. A sideways push on the outside of the roll is not
//! modelled.

use super::{InterfaceMargins, MechanicsInputs, interfaces};
use crate::model::Profile;

/// Shear demand and friction capacity at every interface (Pa), and the smallest margin.
pub fn handling_margins(profile: &Profile, inputs: &MechanicsInputs) -> InterfaceMargins {
    let outer = profile
        .radius
        .last()
        .copied()
        .unwrap_or(inputs.outer_radius);
    let weight = inputs.events.shock_factor * inputs.density * super::GRAVITY;
    let mut radius = Vec::new();
    let mut demand = Vec::new();
    let mut capacity = Vec::new();
    for i in interfaces(profile) {
        let r = profile.radius[i];
        radius.push(r);
        demand.push(weight * (outer * outer - r * r).max(0.0) / (2.0 * r));
        capacity.push(inputs.friction * profile.pressure[i].max(0.0));
    }
    InterfaceMargins::new(radius, demand, capacity)
}
