//! Starring: buckling of one wrap under hoop compression, held in shape by the elastic
//! foundation of the stack around it.
//!
//! Starring is wraps buckled inward in radial lines on the roll end. Hakiel (TAPPI J. 70(5):113,
//! 1987) traced it to compressive tangential (hoop) stress inside the wound roll; compression
//! alone does not buckle a layer that its neighbours hold, so the check is the buckling of the
//! layer on the elastic foundation of the stack — the mechanism the winding literature discusses
//! for starring (from memory: the layer-buckling studies of Lee & Wickert and of Good and
//! co-workers; the search tool did not return those papers, so no formula is taken from them).
//!
//! The wrap at r is a beam (per unit width) of bending stiffness D = Eθ·h³/12 resting on a Winkler
//! foundation: the wraps inside and outside it, each one caliper h deep with the stack's tangent
//! radial modulus Er(P) at the local interlayer pressure, so k = 2·Er(P)/h. The classic critical
//! axial force of a long beam on an elastic foundation (Hetényi, *Beams on Elastic Foundation*,
//! 1946; Timoshenko & Gere, *Theory of Elastic Stability*, §2.10 — from memory) is N = 2·√(k·D),
//! so the critical hoop stress is
//!
//! ```text
//! σcr(r) = 2·√(k·D)/h = √(2/3) · √(Eθ · Er(P(r)))        (independent of the caliper)
//! ```
//!
//! Demand is the hoop compression −σθ(r) (the model's one hoop stress, `Profile::tangential_stress`);
//! wraps in hoop tension have no demand. The margin is σcr / (−σθ); below 1 the wrap buckles.
//! Low pressure enters through Er(P): the softer the stack around a compressed wrap, the smaller
//! its margin.

use super::{InterfaceMargins, MechanicsInputs};
use crate::model::Profile;

/// √(2/3): the factor of √(Eθ·Er) in the critical stress of a layer on a two-sided Winkler
/// foundation one caliper deep (see the module docs).
pub const FOUNDATION_FACTOR: f64 = 0.816_496_580_927_726;

/// Critical hoop compression (Pa, positive) of a wrap of machine-direction modulus `eθ` in a
/// stack of tangent radial modulus `er` (Pa).
pub fn critical_stress(tangential_modulus: f64, radial_modulus: f64) -> f64 {
    FOUNDATION_FACTOR * (tangential_modulus.max(0.0) * radial_modulus.max(0.0)).sqrt()
}

/// Hoop compression demand and buckling capacity at every interface (Pa), and the smallest margin.
pub fn buckling_margins(profile: &Profile, inputs: &MechanicsInputs) -> InterfaceMargins {
    let radial = &inputs.radial_stiffness;
    let tangential_modulus = inputs.tangential_modulus;
    let mut radius = Vec::new();
    let mut demand = Vec::new();
    let mut capacity = Vec::new();
    for i in super::interfaces(profile) {
        radius.push(profile.radius[i]);
        demand.push((-profile.tangential_stress[i]).max(0.0));
        let er = radial.modulus_at(profile.pressure[i]);
        capacity.push(critical_stress(tangential_modulus, er));
    }
    InterfaceMargins::new(radius, demand, capacity)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn foundation_factor_is_root_two_thirds() {
        assert!((FOUNDATION_FACTOR - (2.0_f64 / 3.0).sqrt()).abs() < 1e-15);
    }

    #[test]
    fn critical_stress_is_hetenyi_on_two_sided_foundation() {
        // N = 2·√(k·D), k = 2·Er/h, D = Eθ·h³/12 (Hetényi), divided by h, for any caliper.
        let (et, er) = (5e9, 2.5e5);
        for h in [10e-6, 100e-6, 1e-3] {
            let k = 2.0 * er / h;
            let d = et * h * h * h / 12.0;
            let direct = 2.0 * (k * d).sqrt() / h;
            assert!((critical_stress(et, er) - direct).abs() < 1e-9 * direct);
        }
    }
}
