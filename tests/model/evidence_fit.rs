//! The inverse estimate (src/evidence/fit.rs) against outside references: the SciPy
//! `least_squares` fit of tests/reference/inverse_tension_fit.py (same synthetic measurements,
//! independent model and optimiser), recovery of a known tension scale from synthetic
//! measurements made with the model plus seeded noise, and the refusals.

use crate::model_support;

use rolltriage::evidence::{
    CalibrationPoint, FitOptions, HardnessProfile, HardnessReading, Measurements, RollSize,
    SizeUncertainty, WoundAmount, estimate, fit::scaled_problem, geometry,
};
use rolltriage::model::{CoreStiffness, Profile, WindingProblem, solve};
use serde_json::Value;

fn reference() -> Value {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/inverse_tension_fit.json"
    ))
    .unwrap();
    serde_json::from_str(&text).unwrap()
}

fn f(v: &Value, key: &str) -> f64 {
    v[key].as_f64().unwrap()
}

/// The reference script's paper roll on a hollow fibre core, per layer.
fn reference_problem(case: &Value) -> WindingProblem {
    let core = &case["core"];
    let mut p = model_support::roll(
        f(case, "core_radius"),
        f(case, "thickness"),
        case["layers"].as_u64().unwrap() as usize,
        f(case, "tangential_modulus"),
        f(case, "k1"),
        f(case, "k2"),
        f(case, "tension"),
        CoreStiffness::Hollow {
            inner_radius: f(core, "inner_radius"),
            outer_radius: f(core, "outer_radius"),
            modulus: f(core, "modulus"),
            poisson_ratio: f(core, "poisson_ratio"),
        },
    );
    p.poisson_ratio = f(case, "poisson_ratio");
    p
}

/// Reading = pressure in kPa, as the reference script calibrates it.
fn kpa_calibration() -> Vec<CalibrationPoint> {
    vec![
        CalibrationPoint {
            reading: 0.0,
            pressure: 0.0,
        },
        CalibrationPoint {
            reading: 1000.0,
            pressure: 1.0e6,
        },
    ]
}

fn reference_measurements(v: &Value, with_hardness: bool) -> Measurements {
    let m = &v["measurements"];
    let u = &v["uncertainty"];
    Measurements {
        size: Some(RollSize {
            diameter: f(m, "diameter"),
            amount: WoundAmount::Length {
                length: f(m, "length"),
            },
            uncertainty: SizeUncertainty {
                amount: f(u, "amount"),
                diameter: f(u, "diameter"),
                caliper: f(u, "caliper"),
            },
        }),
        hardness: with_hardness.then(|| HardnessProfile {
            readings: m["readings"]
                .as_array()
                .unwrap()
                .iter()
                .map(|r| HardnessReading {
                    diameter: f(r, "diameter"),
                    value: f(r, "value"),
                })
                .collect(),
            higher_is_harder: true,
            calibration: kpa_calibration(),
        }),
        ..Measurements::default()
    }
}

fn crate_solve(p: &WindingProblem) -> Result<Profile, rolltriage::model::ModelError> {
    solve(p)
}

#[test]
fn fit_matches_scipy_least_squares() {
    // tests/reference/inverse_tension_fit.py: scipy.optimize.least_squares on the independent
    // SciPy accretion model (tests/model/reference_scipy.rs compares the two node by node).
    // Measured agreement: scales to about 1e-6, standard errors to about 1e-4 (different
    // finite-difference steps); checked to 0.1 % and 1 %.
    let v = reference();
    let problem = reference_problem(&v["case"]);
    for fit in v["fits"].as_array().unwrap() {
        let parameters = fit["parameters"].as_u64().unwrap() as usize;
        let with_hardness = fit["use_pressures"].as_bool().unwrap();
        let measurements = reference_measurements(&v, with_hardness);
        let options = FitOptions {
            stiffness: parameters == 2,
            ..FitOptions::default()
        };
        let result = estimate(&measurements, &problem, &crate_solve, &options).unwrap();
        let scales = fit["scales"].as_array().unwrap();
        let errors = fit["standard_errors"].as_array().unwrap();
        let tension = result.tension_scale.expect("tension scale fitted");
        let scipy_t = scales[0].as_f64().unwrap();
        let scipy_se = errors[0].as_f64().unwrap();
        eprintln!(
            "{parameters} parameter(s): tension {} ± {} (SciPy {scipy_t} ± {scipy_se}); stiffness {:?}",
            tension.value, tension.standard_error, result.stiffness_scale
        );
        assert!(
            (tension.value / scipy_t - 1.0).abs() < 1e-3,
            "{parameters} parameter(s): tension {} vs SciPy {scipy_t}",
            tension.value
        );
        assert!(
            (tension.standard_error / scipy_se - 1.0).abs() < 0.01,
            "{parameters} parameter(s): SE {} vs SciPy {scipy_se}",
            tension.standard_error
        );
        assert_eq!(
            result.data_points,
            fit["data_points"].as_u64().unwrap() as usize
        );
        if parameters == 2 {
            let k = result.stiffness_scale.expect("stiffness scale fitted");
            let scipy_k = scales[1].as_f64().unwrap();
            let scipy_kse = errors[1].as_f64().unwrap();
            assert!(
                (k.value / scipy_k - 1.0).abs() < 1e-3,
                "{} vs {scipy_k}",
                k.value
            );
            assert!(
                (k.standard_error / scipy_kse - 1.0).abs() < 0.01,
                "{} vs {scipy_kse}",
                k.standard_error
            );
        } else {
            assert!(result.stiffness_scale.is_none());
        }
    }
}

/// xorshift64* (Vigna 2016) and Box–Muller: seeded normal noise without a dependency.
struct Noise(u64);
impl Noise {
    fn uniform(&mut self) -> f64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        (self.0.wrapping_mul(0x2545_F491_4F6C_DD1D) >> 11) as f64 / (1u64 << 53) as f64
    }
    fn normal(&mut self) -> f64 {
        let (u1, u2) = (self.uniform().max(1e-300), self.uniform());
        (-2.0 * u1.ln()).sqrt() * (2.0 * std::f64::consts::PI * u2).cos()
    }
}

/// Measurements of `problem` wound at `scale` times its tension: the roll's diameter for its
/// loose-stack length and calibrated readings at five diameters, with seeded noise.
fn synthetic(problem: &WindingProblem, scale: f64, seed: u64, noise: f64) -> Measurements {
    let truth = solve(&scaled_problem(problem, scale, 1.0)).unwrap();
    let mut rng = Noise(seed);
    let (rc, ro, h) = (problem.core_radius, problem.outer_radius, problem.thickness);
    let length = std::f64::consts::PI * (ro * ro - rc * rc) / h;
    let uncertainty = SizeUncertainty {
        amount: 0.001,
        diameter: 1e-4,
        caliper: 0.005,
    };
    let eps = geometry::model_mean_compression(&truth).unwrap();
    let sigma = 0.005 * (1.0 - eps);
    let diameter = geometry::diameter_for(length, h, 2.0 * rc, eps + noise * sigma * rng.normal());
    let readings = [0.1, 0.3, 0.5, 0.7, 0.9]
        .iter()
        .map(|t| {
            let r = rc + t * (ro - rc);
            let p = Profile::interpolate(&truth.pressure, &truth.radius, r);
            HardnessReading {
                diameter: 2.0 * r,
                value: p * (1.0 + 0.05 * noise * rng.normal()) / 1e3,
            }
        })
        .collect();
    Measurements {
        size: Some(RollSize {
            diameter,
            amount: WoundAmount::Length { length },
            uncertainty,
        }),
        hardness: Some(HardnessProfile {
            readings,
            higher_is_harder: true,
            calibration: kpa_calibration(),
        }),
        ..Measurements::default()
    }
}

#[test]
fn recovers_a_known_tension_scale_from_noisy_synthetic_measurements() {
    // The outside reference is the truth the synthetic data were made with: tension × 1.3 on
    // the soft paper roll, noise of one standard uncertainty, three seeds.
    let problem = model_support::soft_paper(250);
    for seed in [7, 11, 2026] {
        let m = synthetic(&problem, 1.3, seed, 1.0);
        let options = FitOptions {
            stiffness: false,
            ..FitOptions::default()
        };
        let fit = estimate(&m, &problem, &crate_solve, &options).unwrap();
        let t = fit.tension_scale.unwrap();
        assert!(fit.converged, "seed {seed}");
        assert!(
            (t.value - 1.3).abs() < 3.0 * t.standard_error && (t.value / 1.3 - 1.0).abs() < 0.08,
            "seed {seed}: {} ± {}",
            t.value,
            t.standard_error
        );
        assert!(t.standard_error > 0.0 && t.standard_error < 0.1);
        let effective = fit.effective_tension.unwrap();
        assert!((effective - 350.0 * t.value).abs() < 1e-9);
    }
    // Without noise the scale comes back to well within a percent.
    let m = synthetic(&problem, 1.3, 1, 0.0);
    let fit = estimate(&m, &problem, &crate_solve, &FitOptions::default()).unwrap();
    let t = fit.tension_scale.unwrap();
    assert!((t.value / 1.3 - 1.0).abs() < 0.005, "{}", t.value);
    if let Some(k) = fit.stiffness_scale {
        assert!((k.value - 1.0).abs() < 0.02, "{}", k.value);
    }
}

#[test]
fn refuses_with_the_reason_when_the_data_cannot_decide() {
    let problem = model_support::soft_paper(120);
    // Nothing measured that fixes the level.
    let none = estimate(
        &Measurements::default(),
        &problem,
        &crate_solve,
        &FitOptions::default(),
    )
    .unwrap();
    assert!(none.tension_scale.is_none());
    assert!(
        none.refused[0].contains("nothing fixes the level"),
        "{:?}",
        none.refused
    );
    // Uncalibrated hardness: the shape only.
    let mut m = synthetic(&problem, 1.0, 3, 0.0);
    m.size = None;
    if let Some(h) = m.hardness.as_mut() {
        h.calibration.clear();
    }
    let shape_only = estimate(&m, &problem, &crate_solve, &FitOptions::default()).unwrap();
    assert!(shape_only.tension_scale.is_none());
    assert!(
        shape_only
            .refused
            .iter()
            .any(|r| r.contains("shape of the pressure, not its level")),
        "{:?}",
        shape_only.refused
    );
    // Density alone: the tension scale, but not the stiffness as well.
    let mut m = synthetic(&problem, 0.9, 3, 0.0);
    m.hardness = None;
    let density_only = estimate(&m, &problem, &crate_solve, &FitOptions::default()).unwrap();
    assert!(density_only.tension_scale.is_some());
    assert!(density_only.stiffness_scale.is_none());
    assert!(
        density_only
            .refused
            .iter()
            .any(|r| r.starts_with("stiffness scale")),
        "{:?}",
        density_only.refused
    );
    // A roll far looser than any tension could make it: refused, not a wild number.
    let mut m = synthetic(&problem, 1.0, 3, 0.0);
    m.hardness = None;
    // 10 % less web than the diameter holds loose: negative compression.
    if let Some(size) = m.size.as_mut()
        && let WoundAmount::Length { length } = &mut size.amount
    {
        *length *= 0.9;
    }
    let impossible = estimate(&m, &problem, &crate_solve, &FitOptions::default()).unwrap();
    assert!(
        impossible.tension_scale.is_none(),
        "{:?}",
        impossible.tension_scale
    );
    assert!(
        impossible.refused.iter().any(|r| r.contains("beyond")),
        "{:?}",
        impossible.refused
    );
}
