//! Speed targets of the accretion solver (criterion). Run with `cargo bench --bench solver`;
//! figures go into docs/performance.md.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use rolltriage::model::schedule::TensionStep;
use rolltriage::model::{
    CoreStiffness, ModulusUpdate, RadialStiffness, Resolution, SolverOptions, Taper,
    TensionSchedule, WindingMethod, WindingProblem, WindingSetup, solve,
};

#[allow(clippy::too_many_arguments)]
fn roll(rc: f64, h: f64, layers: usize, et: f64, k1: f64, k2: f64, t: f64) -> WindingProblem {
    WindingProblem {
        core_radius: rc,
        outer_radius: rc + layers as f64 * h,
        thickness: h,
        tangential_modulus: et,
        radial_stiffness: RadialStiffness::Pfeiffer { k1, k2 },
        poisson_ratio: 0.01,
        core: CoreStiffness::Rigid,
        winding: WindingSetup {
            method: WindingMethod::Centre,
            tension: TensionSchedule::constant(t),
            nip_load: None,
            friction: 0.3,
            speed: 0.0,
            combined_roughness: 1e-6,
            ..WindingSetup::default()
        },
        options: SolverOptions::default(),
    }
}

/// The film roll of the targets: 8,000 layers, rc = 76.2 mm, h = 23 µm, Eθ = 4.5 GPa,
/// K1 = 10 kPa, K2 = 300, 175 N/m.
fn film(layers: usize, h: f64) -> WindingProblem {
    roll(0.0762, h, layers, 4.5e9, 10e3, 300.0, 175.0)
}

/// The soft paper-like web: K1 = 5 kPa, K2 = 50, h = 76 µm, 350 N/m.
fn paper(layers: usize) -> WindingProblem {
    roll(0.05, 76e-6, layers, 5.0e9, 5e3, 50.0, 350.0)
}

fn set(mut p: WindingProblem, resolution: Resolution, update: ModulusUpdate) -> WindingProblem {
    p.options = SolverOptions {
        resolution,
        modulus_update: update,
    };
    p
}

fn per_layer(c: &mut Criterion) {
    let mut g = c.benchmark_group("per_layer_8000_film");
    g.sample_size(10);
    for (name, update) in [
        ("explicit", ModulusUpdate::Explicit),
        ("iterated", ModulusUpdate::Iterated),
        ("secant", ModulusUpdate::Secant),
    ] {
        let p = set(film(8000, 23e-6), Resolution::PerLayer, update);
        g.bench_function(name, |b| b.iter(|| solve(black_box(&p)).unwrap()));
    }
    g.finish();
}

fn grouped(c: &mut Criterion) {
    let mut g = c.benchmark_group("grouped_interactive");
    g.sample_size(10);
    // ≤ 500 nodes: 8,000 wraps in elements of 40 plus the per-wrap surface window.
    for (name, p) in [
        ("film_8000_k40", film(8000, 23e-6)),
        ("paper_8000_k40", paper(8000)),
    ] {
        for (update_name, update) in [
            ("explicit", ModulusUpdate::Explicit),
            ("secant", ModulusUpdate::Secant),
        ] {
            let p = set(p.clone(), Resolution::Grouped { layers: 40 }, update);
            g.bench_function(format!("{name}_{update_name}"), |b| {
                b.iter(|| solve(black_box(&p)).unwrap())
            });
        }
    }
    g.finish();
}

fn large(c: &mut Criterion) {
    let mut g = c.benchmark_group("large_100000_layers");
    g.sample_size(10);
    let p = set(
        film(100_000, 12e-6),
        Resolution::Auto,
        ModulusUpdate::Secant,
    );
    g.bench_function("auto_grouped_secant", |b| {
        b.iter(|| solve(black_box(&p)).unwrap())
    });
    let p = set(
        film(100_000, 12e-6),
        Resolution::Grouped { layers: 250 },
        ModulusUpdate::Secant,
    );
    g.bench_function("grouped_250_secant", |b| {
        b.iter(|| solve(black_box(&p)).unwrap())
    });
    g.finish();
}

/// A stepped taper with 15,000 steps on a 100,000-layer roll: the step lookup is a binary
/// search, so this costs about what a plain taper costs (it was steps × wraps before).
fn many_steps(c: &mut Criterion) {
    let mut g = c.benchmark_group("steps_15000_on_100000_layers");
    g.sample_size(10);
    let mut p = set(
        film(100_000, 12e-6),
        Resolution::Auto,
        ModulusUpdate::Secant,
    );
    let (rc, big_r) = (p.core_radius, p.outer_radius);
    p.winding.tension.taper = Taper::Steps {
        steps: (1..15_000)
            .map(|k| TensionStep {
                radius: rc + (big_r - rc) * k as f64 / 15_000.0,
                tension: 175.0 - 50.0 * k as f64 / 15_000.0,
            })
            .collect(),
    };
    g.bench_function("auto_grouped_secant", |b| {
        b.iter(|| solve(black_box(&p)).unwrap())
    });
    g.finish();
}

criterion_group!(benches, per_layer, grouped, large, many_steps);
criterion_main!(benches);
