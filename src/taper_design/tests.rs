//! Unit tests of the limit checks and schedules.

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
            recipe_tension: None,
            stop_time: None,
            emergency_stop_time: None,
            unwind_tension: None,
        },
        symptoms: vec![],
        answers: Default::default(),
        assumed: vec![],
        measurements: None,
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
