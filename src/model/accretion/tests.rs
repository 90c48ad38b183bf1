//! The AVX2 build of the solver's vector loops against the portable build: the same bits.

use super::{run_on, wide_vectors};
use crate::model::{
    CoreStiffness, ModulusUpdate, RadialStiffness, SolverOptions, TensionSchedule, WindingMethod,
    WindingProblem, WindingSetup,
};

/// A film-like and a soft paper-like roll (the bench rolls of benches/solver.rs, shorter).
fn roll(et: f64, k1: f64, k2: f64, h: f64, tension: f64, layers: usize) -> WindingProblem {
    WindingProblem {
        core_radius: 0.0762,
        outer_radius: 0.0762 + layers as f64 * h,
        thickness: h,
        tangential_modulus: et,
        radial_stiffness: RadialStiffness::Pfeiffer { k1, k2 },
        poisson_ratio: 0.01,
        core: CoreStiffness::Rigid,
        winding: WindingSetup {
            method: WindingMethod::Centre,
            tension: TensionSchedule::constant(tension),
            nip_load: None,
            friction: 0.3,
            speed: 0.0,
            combined_roughness: 1e-6,
            ..WindingSetup::default()
        },
        options: SolverOptions::default(),
    }
}

/// Both builds give bit-identical profiles: AVX2 is enabled without FMA, so every operation
/// rounds as in the two-lane build (a fused multiply-add would not). Skipped where the
/// processor has no AVX2 (there only the portable build runs).
#[test]
fn avx2_build_gives_the_same_bits_as_the_portable_build() {
    if !wide_vectors() {
        return;
    }
    let rolls = [
        roll(4.5e9, 10e3, 300.0, 23e-6, 175.0, 1500),
        roll(5.0e9, 5e3, 50.0, 76e-6, 350.0, 1500),
    ];
    for problem in rolls {
        for update in [
            ModulusUpdate::Explicit,
            ModulusUpdate::Iterated,
            ModulusUpdate::Secant,
        ] {
            for group in [1, 20] {
                let mut p = problem.clone();
                p.options.modulus_update = update;
                let solve = |wide| run_on(&p, 1500, group, wide, &mut |_| true);
                let (Ok(portable), Ok(wide)) = (solve(false), solve(true)) else {
                    panic!("solve failed: {update:?}, {group} wraps per element");
                };
                for (name, a, b) in [
                    ("pressure", &portable.pressure, &wide.pressure),
                    (
                        "hoop stress",
                        &portable.tangential_stress,
                        &wide.tangential_stress,
                    ),
                    ("radius", &portable.radius, &wide.radius),
                ] {
                    let same = a.len() == b.len()
                        && a.iter()
                            .zip(b.iter())
                            .all(|(x, y)| x.to_bits() == y.to_bits());
                    assert!(
                        same,
                        "{name} differs: {update:?}, {group} wraps per element"
                    );
                }
            }
        }
    }
}
