//! Shared helpers of the diagnosis tests: invented scenario cases built directly in Rust (so the
//! tests do not depend on the case-file parser) and a profile source.
//!
//! `profile()` and [`SOLVER`] use the crate's solver at about 200 elements; the property sweeps
//! use it at a coarser grid ([`coarse_profile`]).
#![allow(dead_code)]

use std::collections::BTreeMap;

use rolltriage::case::{
    ObservedSymptom, ResolvedCase, ResolvedCore, ResolvedRoll, ResolvedWeb, ResolvedWinding,
};
use rolltriage::model::{
    CoreStiffness, Profile, RadialStiffness, Resolution, SolverOptions, Taper, UpsetBand,
    WindingMethod,
};

/// Newsprint-like paper, 45 g/m², 75 µm; values typical of the grade (from memory).
pub fn newsprint(title: &str) -> ResolvedCase {
    ResolvedCase {
        title: title.to_string(),
        web: ResolvedWeb {
            preset: None,
            material: rolltriage::vocabulary::WebMaterial::Paper,
            thickness: 75e-6,
            width: 1.6,
            tangential_modulus: 4.0e9,
            radial_stiffness: RadialStiffness::Pfeiffer {
                k1: 5.0e3,
                k2: 60.0,
            },
            poisson_ratio: 0.01,
            friction: 0.4,
            kinetic_friction: 0.4,
            density: 1000.0,
            roughness: 3.0e-6,
            // ~2.7 kN/m machine-direction tensile strength (tensile index ~60 N·m/g × 45 g/m², from memory).
            strength: 2700.0,
        },
        core: paper_core(0.0762, 0.1016, 2.0e9, 2.5e6),
        roll: ResolvedRoll {
            outer_diameter: 1.0,
            length: 0.0,
        },
        winding: crate::fixtures::winding(
            WindingMethod::Centre,
            350.0,
            Taper::Linear { fraction: 0.2 },
            Some(350.0),
            15.0,
        ),
        symptoms: vec![],
        answers: BTreeMap::new(),
        assumed: vec![],
        measurements: None,
    }
}

/// Biaxially oriented PET film, 23 µm; typical values (from memory).
pub fn pet_film(title: &str) -> ResolvedCase {
    ResolvedCase {
        title: title.to_string(),
        web: ResolvedWeb {
            preset: None,
            material: rolltriage::vocabulary::WebMaterial::Film,
            thickness: 23e-6,
            width: 1.2,
            tangential_modulus: 4.5e9,
            radial_stiffness: RadialStiffness::Pfeiffer {
                k1: 30.0e3,
                k2: 120.0,
            },
            poisson_ratio: 0.01,
            friction: 0.35,
            kinetic_friction: 0.35,
            density: 1000.0,
            roughness: 0.05e-6,
            // ~200 MPa × 23 µm ≈ 4.6 kN/m (from memory).
            strength: 4600.0,
        },
        core: paper_core(0.1524, 0.1778, 3.0e9, 3.0e6),
        roll: ResolvedRoll {
            outer_diameter: 0.6,
            length: 0.0,
        },
        winding: ResolvedWinding {
            temperature: Some(25.0),
            ..crate::fixtures::winding(
                WindingMethod::Centre,
                120.0,
                Taper::Linear { fraction: 0.25 },
                Some(350.0),
                4.0,
            )
        },
        symptoms: vec![],
        answers: BTreeMap::new(),
        assumed: vec![],
        measurements: None,
    }
}

/// A paper core, diameters in m, wall modulus and rated crush pressure in Pa.
pub fn paper_core(inside: f64, outside: f64, modulus: f64, crush: f64) -> ResolvedCore {
    ResolvedCore {
        preset: None,
        material: rolltriage::vocabulary::CoreMaterial::Paper,
        inside_diameter: inside,
        outside_diameter: outside,
        stiffness: CoreStiffness::Hollow {
            inner_radius: inside / 2.0,
            outer_radius: outside / 2.0,
            modulus,
            poisson_ratio: 0.3,
        },
        crush_pressure: crush,
        support: rolltriage::model::CoreSupport::Free,
        crush_basis: rolltriage::model::core_crush::CrushBasis::Given,
        shaft_torque_rating: None,
    }
}

pub fn with_symptoms(mut case: ResolvedCase, ids: &[&str]) -> ResolvedCase {
    case.symptoms = ids
        .iter()
        .map(|id| ObservedSymptom {
            id: id.to_string(),
            place: None,
            notes: None,
        })
        .collect();
    case
}

pub fn at(mut case: ResolvedCase, symptom: &str, place: &str) -> ResolvedCase {
    for s in case.symptoms.iter_mut().filter(|s| s.id == symptom) {
        s.place = Some(place.to_string());
    }
    case
}

pub fn answer(mut case: ResolvedCase, question: &str, value: &str) -> ResolvedCase {
    case.answers.insert(question.to_string(), value.to_string());
    case
}

pub fn upset(mut case: ResolvedCase, from_d: f64, to_d: f64, tension: f64) -> ResolvedCase {
    case.winding.tension.upsets.push(UpsetBand {
        from_radius: from_d / 2.0,
        to_radius: to_d / 2.0,
        tension,
    });
    case
}

/// Solver options of the diagnosis tests: about 200 elements instead of the automatic halving
/// keeps them quick (they also run in debug builds); the model's own grid policy picks the
/// layers per element.
pub const SOLVER: SolverOptions = SolverOptions {
    resolution: Resolution::Elements { count: 200 },
    modulus_update: rolltriage::model::ModulusUpdate::Secant,
};

/// The stress profile of a case: the crate's solver at [`SOLVER`].
pub fn profile(case: &ResolvedCase) -> Profile {
    rolltriage::model::solve(&case.problem(SOLVER)).expect("solve")
}

/// The crate's solver at `elements` elements: the quick profiles of the property sweeps.
pub fn coarse_profile(case: &ResolvedCase, elements: usize) -> Profile {
    let options = SolverOptions {
        resolution: Resolution::Elements { count: elements },
        ..SOLVER
    };
    rolltriage::model::solve(&case.problem(options)).expect("solve")
}

/// The Harbour Point W3 telescoping demo (cases/harbour_newsprint_telescoping.yaml) built in
/// Rust: 76 µm newsprint at 0.5 pli, no taper, rider nearly lifted, 900 m/min.
pub fn harbour_telescoping_demo() -> ResolvedCase {
    let mut case = newsprint("Harbour Point PM3 newsprint — telescoped reels for Quaymoor Press");
    case.web.thickness = 76e-6;
    case.web.width = 1.68;
    case.web.tangential_modulus = 4.8e9;
    case.web.radial_stiffness = RadialStiffness::Pfeiffer {
        k1: 5.0e3,
        k2: 50.0,
    };
    case.web.friction = 0.45;
    case.web.strength = 2400.0;
    case.core = paper_core(0.0762, 0.1016, 1.2e9, 4.0e6);
    case.winding.method = WindingMethod::CentreSurface;
    case.winding.tension.start_tension = 87.6;
    case.winding.tension.taper = Taper::None;
    case.winding.nip_load = Some(150.0);
    case.winding.speed = 15.0;
    at(with_symptoms(case, &["telescoping"]), "telescoping", "body")
}

/// The coated-paper starring + crushed core demo (cases/harbour_coated_starring_no_taper.yaml)
/// built in Rust: 55 µm coated paper, 3.5 pli constant tension, 1400 mm roll.
pub fn harbour_coated_no_taper_demo() -> ResolvedCase {
    let mut case = newsprint("Harbour Point coated paper — starred rolls with crushed cores");
    case.web.thickness = 55e-6;
    case.web.width = 1.45;
    case.web.tangential_modulus = 6.0e9;
    case.web.radial_stiffness = RadialStiffness::Pfeiffer {
        k1: 30.0e3,
        k2: 80.0,
    };
    case.web.friction = 0.35;
    case.web.roughness = 1.0e-6;
    case.web.strength = 3000.0;
    case.core = paper_core(0.0762, 0.1016, 1.2e9, 4.0e6);
    case.roll.outer_diameter = 1.4;
    case.winding.method = WindingMethod::CentreSurface;
    case.winding.tension.start_tension = 613.0;
    case.winding.tension.taper = Taper::None;
    case.winding.nip_load = Some(1000.0);
    case.winding.speed = 20.0;
    let case = with_symptoms(case, &["starring", "crushed_core"]);
    at(at(case, "starring", "core"), "crushed_core", "core")
}

/// Run the built `rolltriage` with `args`, require success (the error output is the failure
/// message) and return standard output.
pub fn rolltriage_ok(args: &[&str]) -> String {
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .args(args)
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8(out.stdout).unwrap()
}
