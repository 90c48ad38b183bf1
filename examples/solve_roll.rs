//! Solve one of the standard test rolls and print timing and key figures; used to measure run
//! time and peak memory (`/usr/bin/time -v`) outside the test suite.
//!
//! Usage: cargo run --release --example solve_roll -- film|paper|big [per_layer|grouped:K|auto]
//!        [explicit|iterated|secant] [REPEAT]
//!
//! With REPEAT the solve runs that many more times and the processor time of each run is
//! printed (minimum and median, from /proc/thread-self/schedstat on Linux): on the shared build
//! machine wall clock mostly measures the wait for a core.

use std::time::Instant;

use rolltriage::model::{
    CoreStiffness, ModulusUpdate, RadialStiffness, Resolution, SolverOptions, TensionSchedule,
    WindingMethod, WindingProblem, WindingSetup, solve,
};

fn roll(name: &str) -> WindingProblem {
    let (rc, h, et, k1, k2, wit, layers) = match name {
        // The 8,000-layer film roll of the speed targets.
        "film" => (0.0762, 23e-6, 4.5e9, 10e3, 300.0, 175.0, 8000usize),
        // Soft paper-like web.
        "paper" => (0.05, 76e-6, 5.0e9, 5e3, 50.0, 350.0, 2000),
        // 100,000-layer thin-film roll.
        _ => (0.0762, 12e-6, 4.5e9, 10e3, 300.0, 120.0, 100_000),
    };
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
            tension: TensionSchedule::constant(wit),
            nip_load: None,
            friction: 0.3,
            speed: 0.0,
            combined_roughness: 1e-6,
            ..WindingSetup::default()
        },
        options: SolverOptions::default(),
    }
}

fn main() {
    let args: Vec<String> = std::env::args().collect();
    let mut problem = roll(args.get(1).map_or("film", |s| s.as_str()));
    problem.options.resolution = match args.get(2).map(|s| s.as_str()) {
        Some("per_layer") | None => Resolution::PerLayer,
        Some("auto") => Resolution::Auto,
        Some(other) => Resolution::Grouped {
            layers: other.trim_start_matches("grouped:").parse().unwrap_or(20),
        },
    };
    problem.options.modulus_update = match args.get(3).map(|s| s.as_str()) {
        Some("explicit") => ModulusUpdate::Explicit,
        Some("iterated") => ModulusUpdate::Iterated,
        _ => ModulusUpdate::Secant,
    };
    let start = Instant::now();
    let profile = match solve(&problem) {
        Ok(p) => p,
        Err(e) => {
            eprintln!("error: {e}");
            std::process::exit(1);
        }
    };
    let s = &profile.summary;
    println!(
        "{:?} {:?}: {:.4} s, core pressure {:.6e} Pa, peak {:.6e}, min σθ {:.6e}, layers {}, \
         elements {}, k {}, increments {}, solves {}",
        problem.options.resolution,
        problem.options.modulus_update,
        start.elapsed().as_secs_f64(),
        s.core_pressure,
        s.peak_pressure,
        s.min_tangential_stress,
        s.physical_layers,
        profile.solver.elements,
        profile.solver.grid.layers_per_element,
        profile.solver.increments,
        profile.solver.solves
    );
    let repeat: usize = args.get(4).and_then(|s| s.parse().ok()).unwrap_or(0);
    let mut times = Vec::with_capacity(repeat);
    for _ in 0..repeat {
        let (Some(before), Ok(_), Some(after)) =
            (thread_cpu_ns(), solve(&problem), thread_cpu_ns())
        else {
            eprintln!(
                "error: no processor time (Linux /proc/thread-self/schedstat) or solve failed"
            );
            std::process::exit(1);
        };
        times.push((after - before) as f64 * 1e-6);
    }
    if !times.is_empty() {
        times.sort_by(f64::total_cmp);
        println!(
            "processor time per solve over {} runs: min {:.2} ms, median {:.2} ms",
            times.len(),
            times[0],
            times[times.len() / 2]
        );
    }
}

/// Processor time of this thread so far (ns): the first field of the scheduler statistics.
fn thread_cpu_ns() -> Option<u64> {
    let text = std::fs::read_to_string("/proc/thread-self/schedstat").ok()?;
    text.split_whitespace().next()?.parse().ok()
}
