//! Shared test rolls for the mechanics tests.
#![allow(dead_code)]

use rolltriage::model::{
    CoreStiffness, ModulusUpdate, RadialStiffness, Resolution, SolverOptions, TensionSchedule,
    WindingMethod, WindingProblem, WindingSetup,
};

/// A roll of `layers` wraps of a web with Pfeiffer constants `k1`, `k2`.
#[allow(clippy::too_many_arguments)]
pub fn roll(
    core_radius: f64,
    thickness: f64,
    layers: usize,
    tangential_modulus: f64,
    k1: f64,
    k2: f64,
    tension: f64,
    core: CoreStiffness,
) -> WindingProblem {
    WindingProblem {
        core_radius,
        outer_radius: core_radius + layers as f64 * thickness,
        thickness,
        tangential_modulus,
        radial_stiffness: RadialStiffness::Pfeiffer { k1, k2 },
        poisson_ratio: 0.01,
        core,
        winding: WindingSetup {
            method: WindingMethod::Centre,
            tension: TensionSchedule::constant(tension),
            nip_load: None,
            friction: 0.3,
            speed: 0.0,
            combined_roughness: 1e-6,
            ..WindingSetup::default()
        },
        options: SolverOptions {
            resolution: Resolution::PerLayer,
            modulus_update: ModulusUpdate::Secant,
        },
    }
}

/// The soft paper-like web of the numerics checks: K1 = 5 kPa, K2 = 50, h = 76 µm,
/// WIT = 350 N/m (Eθ = 5 GPa, rigid core rc = 50 mm).
pub fn soft_paper(layers: usize) -> WindingProblem {
    roll(
        0.05,
        76e-6,
        layers,
        5.0e9,
        5.0e3,
        50.0,
        350.0,
        CoreStiffness::Rigid,
    )
}

/// The stiff film web of the speed targets: rc = 76.2 mm, h = 23 µm, Eθ = 4.5 GPa,
/// K1 = 10 kPa, K2 = 300, 175 N/m, rigid core.
pub fn stiff_film(layers: usize) -> WindingProblem {
    roll(
        0.0762,
        23e-6,
        layers,
        4.5e9,
        10.0e3,
        300.0,
        175.0,
        CoreStiffness::Rigid,
    )
}

pub fn with(
    mut p: WindingProblem,
    resolution: Resolution,
    update: ModulusUpdate,
) -> WindingProblem {
    p.options = SolverOptions {
        resolution,
        modulus_update: update,
    };
    p
}

pub fn relative(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs()
}
