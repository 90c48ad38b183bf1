//! The Rust solver against an independent SciPy implementation of Hakiel's nonlinear accretion
//! model (tests/reference/nonlinear_accretion.py, banded LAPACK solve per layer; committed
//! output nonlinear_accretion.json): paper roll on a hollow core, film roll on a rigid core, a
//! tapered roll with an upset band. Every node within 1 %; hoop stress in the conservative
//! per-wrap form on both sides; the thin-layer sequence of a soft roll.

use rolltriage::model::{
    CoreStiffness, ModulusUpdate, RadialStiffness, Resolution, SolverOptions, TensionSchedule,
    WindingMethod, WindingProblem, WindingSetup,
    schedule::{Taper, UpsetBand},
    solve,
};
use serde_json::Value;

fn results() -> Vec<Value> {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/nonlinear_accretion.json"
    ))
    .unwrap();
    let v: Value = serde_json::from_str(&text).unwrap();
    v["results"].as_array().unwrap().clone()
}

fn f(v: &Value, key: &str) -> f64 {
    v[key].as_f64().unwrap()
}

pub fn problem_from(case: &Value, update: ModulusUpdate, resolution: Resolution) -> WindingProblem {
    let rc = f(case, "core_radius");
    let h = f(case, "thickness");
    let layers = case["layers"].as_u64().unwrap() as f64;
    let core = &case["core"];
    let core = match core["kind"].as_str().unwrap() {
        "rigid" => CoreStiffness::Rigid,
        "measured" => CoreStiffness::Measured {
            stiffness: f(core, "stiffness"),
        },
        _ => CoreStiffness::Hollow {
            inner_radius: f(core, "inner_radius"),
            outer_radius: f(core, "outer_radius"),
            modulus: f(core, "modulus"),
            poisson_ratio: f(core, "poisson_ratio"),
        },
    };
    let mut tension = TensionSchedule::constant(f(case, "tension"));
    if case["taper"].is_object() {
        tension.taper = Taper::Linear {
            fraction: f(&case["taper"], "fraction"),
        };
    }
    for band in case["upsets"].as_array().unwrap() {
        tension.upsets.push(UpsetBand {
            from_radius: f(band, "from_radius"),
            to_radius: f(band, "to_radius"),
            tension: f(band, "tension"),
        });
    }
    WindingProblem {
        core_radius: rc,
        outer_radius: rc + layers * h,
        thickness: h,
        tangential_modulus: f(case, "tangential_modulus"),
        radial_stiffness: RadialStiffness::Pfeiffer {
            k1: f(case, "k1"),
            k2: f(case, "k2"),
        },
        poisson_ratio: f(case, "poisson_ratio"),
        core,
        winding: WindingSetup {
            method: WindingMethod::Centre,
            tension,
            nip_load: None,
            friction: 0.3,
            speed: 0.0,
            combined_roughness: 1e-6,
            ..WindingSetup::default()
        },
        options: SolverOptions {
            resolution,
            modulus_update: update,
        },
    }
}

/// Largest deviation relative to the local value, with a floor of 1e-4 of the largest magnitude
/// (values cross zero).
fn worst_relative(got: &[f64], reference: &[f64]) -> f64 {
    assert_eq!(got.len(), reference.len());
    let scale = reference.iter().fold(0.0f64, |m, v| m.max(v.abs()));
    got.iter()
        .zip(reference)
        .map(|(a, b)| (a - b).abs() / b.abs().max(1e-4 * scale))
        .fold(0.0, f64::max)
}

fn column(v: &Value, key: &str) -> Vec<f64> {
    v[key]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_f64().unwrap())
        .collect()
}

#[test]
fn per_layer_secant_matches_scipy_everywhere() {
    for result in results() {
        let case = &result["case"];
        let profile = solve(&problem_from(
            case,
            ModulusUpdate::Secant,
            Resolution::PerLayer,
        ))
        .unwrap();
        let pressure = worst_relative(&profile.pressure, &column(&result, "pressure"));
        let tangential = worst_relative(
            &profile.tangential_stress,
            &column(&result, "tangential_stress"),
        );
        eprintln!(
            "{}: pressure {pressure:.2e}, tangential {tangential:.2e}",
            case["name"]
        );
        assert!(
            pressure < 0.01,
            "{}: pressure off by {pressure}",
            case["name"]
        );
        assert!(
            tangential < 0.01,
            "{}: σθ off by {tangential}",
            case["name"]
        );
    }
}

/// The thin-layer sequence of the reference script: a soft roll wound from 1, 2, 4 and 8 times
/// thinner wraps at the same wound-in stress; the script's most compressive (conservative,
/// per-wrap) hoop stress at each caliper and the Richardson limit of the two thinnest.
#[test]
fn thin_layer_hoop_sequence_matches_scipy() {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/nonlinear_accretion.json"
    ))
    .unwrap();
    let v: Value = serde_json::from_str(&text).unwrap();
    let thin = &v["thin_layer"];
    let expected = column(thin, "min_tangential_stress");
    let limit = f(thin, "limit");
    let mut got = Vec::new();
    for (split, reference) in thin["splits"].as_array().unwrap().iter().zip(&expected) {
        let split = split.as_f64().unwrap();
        let mut case = thin["case"].clone();
        case["thickness"] = (f(&case, "thickness") / split).into();
        case["layers"] = (case["layers"].as_u64().unwrap() * split as u64).into();
        case["tension"] = (f(&case, "tension") / split).into();
        let profile = solve(&problem_from(
            &case,
            ModulusUpdate::Secant,
            Resolution::PerLayer,
        ))
        .unwrap();
        let value = profile.summary.min_tangential_stress;
        let error = (value - reference).abs() / reference.abs();
        eprintln!("split {split}: {value:.1} Pa against {reference:.1} Pa ({error:.1e})");
        assert!(error < 1e-6, "split {split}: {error}");
        got.push(value);
    }
    // Each halving moves the value closer to the reference's thin-layer limit.
    for pair in got.windows(2) {
        assert!(
            (pair[1] - limit).abs() < (pair[0] - limit).abs(),
            "{got:?} {limit}"
        );
    }
}

#[test]
fn per_layer_explicit_core_pressure_matches_scipy() {
    for result in results() {
        let case = &result["case"];
        let profile = solve(&problem_from(
            case,
            ModulusUpdate::Explicit,
            Resolution::PerLayer,
        ))
        .unwrap();
        let expected = f(&result, "core_pressure_explicit");
        let error = (profile.summary.core_pressure - expected).abs() / expected;
        assert!(error < 0.01, "{}: {error}", case["name"]);
    }
}

#[test]
fn grouped_core_and_peak_pressure_match_scipy() {
    for result in results() {
        let case = &result["case"];
        let profile = solve(&problem_from(
            case,
            ModulusUpdate::Secant,
            Resolution::Grouped { layers: 10 },
        ))
        .unwrap();
        let reference = column(&result, "pressure");
        let error = (profile.summary.core_pressure - reference[0]).abs() / reference[0];
        eprintln!("{} grouped: core pressure {error:.2e}", case["name"]);
        assert!(error < 0.01, "{}: {error}", case["name"]);
        // Pressure along the roll, interpolated at the grouped nodes.
        let radius = column(&result, "radius");
        let peak = reference.iter().fold(0.0f64, |m, v| m.max(*v));
        for (r, p) in profile.radius.iter().zip(&profile.pressure) {
            let expected = rolltriage::model::Profile::interpolate(&reference, &radius, *r);
            assert!(
                (p - expected).abs() < 0.01 * peak,
                "{} at r = {r}",
                case["name"]
            );
        }
    }
}

/// The mechanics layer's demand and capacity at every interface against SciPy quadrature over
/// the wraps (tests/reference/mechanics_margins.py): a simple roll with a prescribed linear
/// pressure profile, telescoping under handling and torque for centre and surface drives.
#[test]
fn mechanism_margins_match_the_scipy_reference() {
    use rolltriage::mechanics::{Events, MechanicsInputs, telescoping, torque};
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/mechanics_margins.json"
    ))
    .unwrap();
    let v: Value = serde_json::from_str(&text).unwrap();
    let roll = &v["roll"];
    let (rc, big_r) = (f(roll, "core_radius"), f(roll, "outer_radius"));
    let n = roll["nodes"].as_u64().unwrap() as usize;
    let radius: Vec<f64> = (0..n)
        .map(|i| rc + (big_r - rc) * i as f64 / (n - 1) as f64)
        .collect();
    let pressure: Vec<f64> = radius
        .iter()
        .map(|r| f(roll, "core_pressure") * (big_r - r) / (big_r - rc))
        .collect();
    // Compressive everywhere but the outside: the surface zone is the outermost node only.
    let mut tangential = vec![-1.0; n];
    tangential[n - 1] = 1.0;
    let profile = rolltriage::model::Profile {
        zones: rolltriage::model::profile::default_zones(&radius, &tangential),
        radius,
        pressure,
        tangential_stress: tangential,
        ..Default::default()
    };
    let inputs = |method| MechanicsInputs {
        core_radius: rc,
        outer_radius: big_r,
        density: f(roll, "density"),
        friction: f(roll, "friction"),
        method,
        speed: f(roll, "speed"),
        outer_tension: f(roll, "outer_tension"),
        events: Events {
            shock_factor: f(roll, "shock_factor"),
            start_ramp_time: f(roll, "start_ramp_time"),
            normal_stop_time: f(roll, "normal_stop_time"),
            emergency_stop_time: f(roll, "emergency_stop_time"),
            unwind_tension: None,
        },
    };
    let close = |a: f64, b: f64, what: &str| {
        assert!(
            (a - b).abs() <= 1e-9 * b.abs().max(1e-12),
            "{what}: {a} vs {b}"
        );
    };
    let node = |r: f64| ((r - rc) / (big_r - rc) * (n - 1) as f64).round() as usize;

    let centre = inputs(WindingMethod::Centre);
    let tele = telescoping::handling_margins(&profile, &centre);
    close(
        tele.min_margin,
        f(&v["telescoping"], "min_margin"),
        "telescoping margin",
    );
    close(
        tele.min_radius,
        f(&v["telescoping"], "min_radius"),
        "telescoping radius",
    );
    for s in v["telescoping"]["samples"].as_array().unwrap() {
        let i = node(f(s, "radius"));
        close(tele.demand[i], f(s, "demand"), "telescoping demand");
        close(tele.capacity[i], f(s, "capacity"), "telescoping capacity");
    }

    for (drive, method) in [
        ("centre", WindingMethod::Centre),
        ("surface", WindingMethod::Surface),
    ] {
        let check = torque::torque_check(&profile, &inputs(method));
        for e in &check.events {
            let id = serde_json::to_value(e.event).unwrap();
            let expected = &v[drive]["events"][id.as_str().unwrap()];
            close(e.margins.min_margin, f(expected, "min_margin"), drive);
            close(e.margins.min_radius, f(expected, "min_radius"), drive);
            close(e.margins.margin_at(0), f(expected, "core_margin"), drive);
        }
        for s in v[drive]["samples"].as_array().unwrap() {
            let r = f(s, "radius");
            for event in torque::Event::ALL {
                let id = serde_json::to_value(event).unwrap();
                let demand = torque::demand(&inputs(method), big_r, r, event);
                close(demand, f(s, id.as_str().unwrap()), drive);
            }
        }
    }
}
