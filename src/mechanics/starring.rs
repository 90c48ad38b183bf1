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
    use crate::model::{RadialStiffness, WindingMethod};

    fn inputs(radial: RadialStiffness) -> MechanicsInputs {
        MechanicsInputs {
            core_radius: 0.05,
            outer_radius: 0.3,
            density: 700.0,
            friction: 0.4,
            method: WindingMethod::Centre,
            speed: 10.0,
            outer_tension: 300.0,
            events: Default::default(),
            tangential_modulus: 4e9,
            radial_stiffness: radial,
        }
    }

    /// A roll of 101 nodes with the given pressure and hoop stress at build share s.
    fn roll(p: impl Fn(f64) -> f64, hoop: impl Fn(f64) -> f64) -> Profile {
        let s: Vec<f64> = (0..101).map(|i| i as f64 / 100.0).collect();
        Profile {
            radius: s.iter().map(|s| 0.05 + 0.25 * s).collect(),
            pressure: s.iter().map(|s| p(*s)).collect(),
            tangential_stress: s.iter().map(|s| hoop(*s)).collect(),
            ..Default::default()
        }
    }

    const PAPER: RadialStiffness = RadialStiffness::Pfeiffer { k1: 5e3, k2: 50.0 };

    #[test]
    fn no_hoop_compression_is_no_demand() {
        let m = buckling_margins(&roll(|_| 1e5, |_| 1e6), &inputs(PAPER));
        assert_eq!(m.min_margin, crate::mechanics::MARGIN_CAP);
    }

    #[test]
    fn starring_appears_near_the_core_of_an_ordinary_roll() {
        // Common practice: starring appears near the core. An ordinary roll has its deepest hoop
        // compression just outside the core and its pressure highest there; the margin is still
        // smallest at the core because the compression falls faster than the foundation softens.
        let m = buckling_margins(
            &roll(|s| 3e5 * (1.0 - s), |s| -2e5 * (1.0 - 3.0 * s)),
            &inputs(PAPER),
        );
        assert!(m.min_radius < 0.05 + 0.1 * 0.25, "{}", m.min_radius);
    }

    #[test]
    fn a_softer_stack_has_a_smaller_margin() {
        // Common practice: starring shows on soft rolls. Same hoop compression, softer stack.
        let profile = roll(|_| 5e4, |_| -1e5);
        let firm = buckling_margins(&profile, &inputs(PAPER));
        let soft = buckling_margins(
            &profile,
            &inputs(RadialStiffness::Pfeiffer { k1: 1e3, k2: 10.0 }),
        );
        assert!(soft.min_margin < firm.min_margin);
        // σcr ∝ √Er: Er falls from 50·55 kPa to 10·51 kPa.
        let ratio = firm.min_margin / soft.min_margin;
        assert!((ratio - (50.0 * 55e3 / (10.0 * 51e3_f64)).sqrt()).abs() < 1e-9);
    }

    #[test]
    fn a_slack_band_inside_the_roll_is_where_the_margin_is_smallest() {
        // Common practice: starring appears after a tension upset band. A band wound slack sits
        // at low pressure in hoop compression between firm wraps: the smallest margin is there.
        let band = |s: f64| (0.5..0.55).contains(&s);
        let m = buckling_margins(
            &roll(
                |s| if band(s) { 2e3 } else { 2e5 },
                |s| if band(s) { -1e5 } else { -5e4 },
            ),
            &inputs(PAPER),
        );
        let at = (m.min_radius - 0.05) / 0.25;
        assert!((0.495..0.545).contains(&at), "smallest at build share {at}");
    }

    #[test]
    fn foundation_factor_is_root_two_thirds() {
        assert!((FOUNDATION_FACTOR - (2.0_f64 / 3.0).sqrt()).abs() < 1e-15);
    }

    #[test]
    fn critical_stress_is_hetenyi_on_two_sided_foundation() {
        // N = 2·√(k·D), k = 2·Er/h, D = Eθ·h³/12 (Hetényi), divided by h, for any caliper.
        let (et, er) = (5e9_f64, 2.5e5_f64);
        for h in [10e-6, 100e-6, 1e-3] {
            let k = 2.0 * er / h;
            let d = et * h * h * h / 12.0;
            let direct = 2.0 * (k * d).sqrt() / h;
            assert!((critical_stress(et, er) - direct).abs() < 1e-9 * direct);
        }
    }
}
