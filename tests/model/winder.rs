//! Winder types, nip programme, air traction and orthotropic cores against outside references:
//! tests/reference/winder_wit.py (published wound-in tension relations, two-drum statics solved
//! with NumPy) and tests/reference/orthotropic_core.py (the tube's displacement equations solved
//! with SciPy's solve_bvp).

use crate::model_support::soft_paper;
use rolltriage::model::{
    CoreStiffness, CoreSupport, DrumSet, NipProgramme, TensionSchedule, WindingMethod,
    WindingSetup, solve,
};

fn reference(name: &str) -> serde_json::Value {
    let path = format!("{}/tests/reference/{name}", env!("CARGO_MANIFEST_DIR"));
    serde_json::from_str(&std::fs::read_to_string(path).unwrap()).unwrap()
}

fn method(id: &str) -> WindingMethod {
    match id {
        "centre" => WindingMethod::Centre,
        "gap" => WindingMethod::Gap,
        "surface" => WindingMethod::Surface,
        "two_drum" => WindingMethod::TwoDrum,
        "centre_surface" => WindingMethod::CentreSurface,
        other => panic!("unknown method {other}"),
    }
}

#[test]
fn each_winder_type_gives_the_published_wound_in_tension() {
    let data = reference("winder_wit.json");
    let rc = data["core_radius"].as_f64().unwrap();
    for case in data["cases"].as_array().unwrap() {
        let f = |key: &str| case.get(key).and_then(|v| v.as_f64());
        let setup = WindingSetup {
            method: method(case["method"].as_str().unwrap()),
            tension: TensionSchedule::constant(data["tension"].as_f64().unwrap()),
            nip_load: f("nip_load"),
            friction: data["static_friction"].as_f64().unwrap(),
            kinetic_friction: data["kinetic_friction"].as_f64(),
            centre_torque: f("centre_torque"),
            web_density: f("density"),
            drums: f("drum_radius").map(|drum_radius| DrumSet {
                drum_radius,
                centre_distance: f("centre_distance").unwrap(),
                torque_differential: f("torque_differential").unwrap(),
            }),
            ..WindingSetup::default()
        };
        let r = f("radius").unwrap();
        let wit = setup.wound_in_tension(r, rc, 0.5);
        let expected = f("wit").unwrap();
        assert!(
            (wit - expected).abs() < 1e-9 * expected,
            "{} at r = {r}: {wit} vs {expected}",
            case["method"]
        );
        if let Some(n) = f("drum_nip_load") {
            let got = setup.nip_load_at(r, rc);
            assert!((got - n).abs() < 1e-9 * n, "drum nip {got} vs {n}");
        }
    }
}

#[test]
fn two_drum_weight_makes_wound_in_tension_grow_at_constant_rider_load() {
    let mut problem = soft_paper(3000);
    problem.winding.method = WindingMethod::TwoDrum;
    problem.winding.nip_load = Some(300.0);
    problem.winding.kinetic_friction = Some(0.19);
    problem.winding.web_density = Some(590.0);
    problem.winding.drums = Some(DrumSet {
        drum_radius: 0.25,
        centre_distance: 0.55,
        torque_differential: 0.0,
    });
    let profile = solve(&problem).unwrap();
    let wit = &profile.wound_in_tension;
    assert!(
        wit[wit.len() - 1] > wit[0] + 100.0,
        "{:?}",
        (wit[0], wit[wit.len() - 1])
    );
    // The same rider load without the roll's weight: the difference is the weight's share,
    // μk·w/(2·cos θ), and it grows with the roll. (The rider's own share falls as the roll
    // rises out from between the drums, so the rider alone would not make the tension grow.)
    problem.winding.web_density = None;
    let rider_only = solve(&problem).unwrap();
    let added: Vec<f64> = wit
        .iter()
        .zip(&rider_only.wound_in_tension)
        .map(|(a, b)| a - b)
        .collect();
    assert!(
        added.windows(2).all(|w| w[1] >= w[0] - 1e-9),
        "weight share not growing"
    );
    let rider = &rider_only.wound_in_tension;
    assert!(rider[rider.len() - 1] < rider[0]);
}

#[test]
fn nip_programme_sets_the_wound_in_tension_by_diameter() {
    let mut problem = soft_paper(2000);
    problem.winding.kinetic_friction = Some(0.2);
    let (rc, outer) = (problem.core_radius, problem.outer_radius);
    problem.winding.nip_programme = Some(NipProgramme {
        points: vec![(rc, 1500.0), (outer, 500.0)],
    });
    let profile = solve(&problem).unwrap();
    // Web tension 350 N/m plus 0.2 × the programme's load: 650 N/m at the core, 450 at the outside.
    assert!((profile.wound_in_tension[0] - 650.0).abs() < 1e-6);
    assert!((profile.wound_in_tension.last().unwrap() - 450.0).abs() < 1.0);
}

#[test]
fn gap_winding_leaves_the_air_in_and_a_nip_reduces_it() {
    let mut problem = soft_paper(500);
    problem.winding.speed = 15.0;
    problem.winding.combined_roughness = 0.5e-6;
    problem.winding.method = WindingMethod::Gap;
    problem.winding.nip_load = Some(500.0);
    let gap = solve(&problem).unwrap();
    let (_, outside) = gap.air_film.unwrap();
    assert!(!outside.reduced_by_nip && outside.traction == 0.0);
    assert!(gap.warnings.iter().any(|w| w.contains("gap winding")));
    // Same settings with the roller touching: the film is reduced, not removed (Forrest).
    problem.winding.method = WindingMethod::Centre;
    let nipped = solve(&problem).unwrap();
    let (_, outside) = nipped.air_film.unwrap();
    assert!(outside.reduced_by_nip && outside.thickness > 0.0 && outside.traction > 0.5);
}

#[test]
fn centrifugal_unloading_warns_at_speed() {
    // ρ·V² against WIT/h: 590 kg/m³ at 60 m/s is 2.1 MPa, over 10 % of 35 N/m / 76 µm = 0.46 MPa.
    let mut problem = soft_paper(300);
    problem.winding.tension = TensionSchedule::constant(35.0);
    problem.winding.web_density = Some(590.0);
    problem.winding.speed = 60.0;
    problem.winding.combined_roughness = 1.0;
    let profile = solve(&problem).unwrap();
    assert!(profile.warnings.iter().any(|w| w.contains("centrifugal")));
    problem.winding.speed = 5.0;
    let profile = solve(&problem).unwrap();
    assert!(!profile.warnings.iter().any(|w| w.contains("centrifugal")));
}

#[test]
fn orthotropic_core_matches_the_numerical_tube_solution() {
    let data = reference("orthotropic_core.json");
    for case in data["cases"].as_array().unwrap() {
        let f = |key: &str| case[key].as_f64().unwrap();
        let support = match case["support"].as_str().unwrap() {
            "shaft" => CoreSupport::Shaft,
            _ => CoreSupport::Free,
        };
        let core = CoreStiffness::Tube {
            inner_radius: f("inner_radius"),
            outer_radius: f("outer_radius"),
            hoop_modulus: f("hoop_modulus"),
            radial_modulus: f("radial_modulus"),
            poisson_ratio: f("poisson_ratio"),
            support,
        };
        let name = case["name"].as_str().unwrap();
        let ec = core.effective_stiffness() / f("hoop_modulus");
        let close = |a: f64, b: f64| (a - b).abs() < 1e-6 * b.abs().max(1.0);
        assert!(
            close(ec, f("effective_over_hoop_modulus")),
            "{name}: Ec {ec}"
        );
        let wall = core.wall_stress().unwrap();
        assert!(
            close(wall.hoop_at_bore, f("hoop_at_bore_over_pressure")),
            "{name}"
        );
        assert!(
            close(wall.hoop_at_outside, f("hoop_at_outside_over_pressure")),
            "{name}"
        );
    }
}

#[test]
fn orthotropic_core_reduces_to_lame_with_equal_moduli() {
    // Lamé thick cylinder (Roark): Ec = E / ((b² + a²)/(b² − a²) − ν).
    let (a, b, e, nu) = (0.0381, 0.0508, 1.5e9, 0.3);
    let tube = CoreStiffness::Tube {
        inner_radius: a,
        outer_radius: b,
        hoop_modulus: e,
        radial_modulus: e,
        poisson_ratio: nu,
        support: CoreSupport::Free,
    };
    let lame = e / ((b * b + a * a) / (b * b - a * a) - nu);
    assert!((tube.effective_stiffness() - lame).abs() < 1e-9 * lame);
}
