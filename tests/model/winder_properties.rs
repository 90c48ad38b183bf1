//! Invariants of the winder relations and the core tube over random valid inputs (proptest):
//! wound-in tension never below zero and never falling with nip load; the nip-induced part
//! never above μk × the knee (the levelling-off); the orthotropic core softens as its radial
//! modulus falls and a shaft only stiffens it; a nip never thickens the air film.

use proptest::prelude::*;
use rolltriage::model::{
    CoreStiffness, CoreSupport, DrumSet, TensionSchedule, WindingMethod, WindingSetup,
};

fn method() -> impl Strategy<Value = WindingMethod> {
    prop_oneof![
        Just(WindingMethod::Centre),
        Just(WindingMethod::Gap),
        Just(WindingMethod::Surface),
        Just(WindingMethod::TwoDrum),
        Just(WindingMethod::CentreSurface),
    ]
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]

    #[test]
    fn wound_in_tension_grows_with_nip_and_levels_off(
        method in method(),
        tension in 10.0f64..2000.0,
        kinetic in 0.05f64..0.8,
        nip in 0.0f64..20_000.0,
        extra in 0.0f64..5000.0,
        radius in 0.06f64..0.6,
        torque in -50.0f64..200.0,
    ) {
        let setup = |n: f64| WindingSetup {
            method,
            tension: TensionSchedule::constant(tension),
            nip_load: Some(n),
            friction: 0.8,
            kinetic_friction: Some(kinetic),
            centre_torque: Some(torque),
            web_density: Some(800.0),
            drums: Some(DrumSet { drum_radius: 0.25, centre_distance: 0.55, torque_differential: 10.0 }),
            ..WindingSetup::default()
        };
        let (low, high) = (setup(nip), setup(nip + extra));
        let (a, b) = (low.wound_in_tension(radius, 0.05, 0.6), high.wound_in_tension(radius, 0.05, 0.6));
        prop_assert!(a >= 0.0 && b >= 0.0);
        prop_assert!(b >= a - 1e-9);
        prop_assert!(high.nip_induced_tension_at(radius, 0.05) <= kinetic * high.plateau_load() + 1e-9);
    }

    #[test]
    fn orthotropic_core_softens_with_the_radial_modulus_and_a_shaft_stiffens_it(
        a in 0.02f64..0.15,
        wall in 0.003f64..0.03,
        hoop in 0.5e9f64..5e9,
        share in 0.005f64..1.0,
        factor in 0.1f64..0.99,
        nu in 0.0f64..0.45,
    ) {
        let tube = |radial: f64, support| CoreStiffness::Tube {
            inner_radius: a,
            outer_radius: a + wall,
            hoop_modulus: hoop,
            radial_modulus: radial,
            poisson_ratio: nu,
            support,
        };
        let stiff = tube(share * hoop, CoreSupport::Free).effective_stiffness();
        let soft = tube(factor * share * hoop, CoreSupport::Free).effective_stiffness();
        prop_assert!(soft > 0.0 && soft <= stiff * (1.0 + 1e-12));
        let held = tube(share * hoop, CoreSupport::Shaft).effective_stiffness();
        prop_assert!(held >= stiff * (1.0 - 1e-12));
    }

    #[test]
    fn a_nip_never_thickens_the_air_film(
        speed in 0.0f64..40.0,
        tension in 10.0f64..2000.0,
        roughness in 0.01e-6f64..20e-6,
        radius in 0.05f64..1.0,
    ) {
        let free = rolltriage::model::air::film_at(radius, speed, tension, roughness, false);
        let nipped = rolltriage::model::air::film_at(radius, speed, tension, roughness, true);
        prop_assert!(nipped.thickness <= free.thickness);
        prop_assert!(nipped.traction >= free.traction);
        prop_assert!((0.0..=1.0).contains(&free.traction));
    }
}
