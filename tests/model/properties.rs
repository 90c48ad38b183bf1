//! Invariants of the accretion solver over random valid inputs (proptest, few cases so the suite
//! stays fast).

use crate::model_support;

use model_support::roll;
use proptest::prelude::*;
use rolltriage::model::{CoreStiffness, ModulusUpdate, Resolution, solve};

fn inputs() -> impl Strategy<Value = rolltriage::model::WindingProblem> {
    (
        0.03f64..0.1,
        10e-6f64..150e-6,
        30usize..400,
        1e9f64..1e10,
        1e3f64..5e4,
        20f64..400.0,
        50f64..800.0,
        prop_oneof![Just(0.0), 1e8f64..1e10],
    )
        .prop_map(|(rc, h, layers, et, k1, k2, t, ec)| {
            let core = if ec == 0.0 {
                CoreStiffness::Rigid
            } else {
                CoreStiffness::Measured { stiffness: ec }
            };
            roll(rc, h, layers, et, k1, k2, t, core)
        })
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 24, ..ProptestConfig::default() })]

    #[test]
    fn pressure_is_finite_non_negative_and_zero_outside(problem in inputs()) {
        let p = solve(&problem).unwrap();
        let peak = p.summary.peak_pressure;
        prop_assert!(peak > 0.0);
        for (&pr, &s) in p.pressure.iter().zip(&p.tangential_stress) {
            prop_assert!(pr.is_finite() && s.is_finite());
            prop_assert!(pr >= -1e-9 * peak);
        }
        prop_assert_eq!(*p.pressure.last().unwrap(), 0.0);
    }

    #[test]
    fn more_tension_gives_more_core_pressure(problem in inputs(), factor in 1.05f64..2.0) {
        let base = solve(&problem).unwrap().summary.core_pressure;
        let mut tighter = problem.clone();
        tighter.winding.tension.start_tension *= factor;
        let more = solve(&tighter).unwrap().summary.core_pressure;
        prop_assert!(more > base, "{} vs {}", more, base);
    }

    #[test]
    fn grouped_agrees_with_per_layer(problem in inputs()) {
        let mut per_layer = problem.clone();
        per_layer.options.resolution = Resolution::PerLayer;
        per_layer.options.modulus_update = ModulusUpdate::Secant;
        let mut grouped = per_layer.clone();
        grouped.options.resolution = Resolution::Grouped { layers: 5 };
        let a = solve(&per_layer).unwrap().summary.core_pressure;
        let b = solve(&grouped).unwrap().summary.core_pressure;
        prop_assert!((a - b).abs() < 0.01 * a, "{} vs {}", a, b);
    }
}
