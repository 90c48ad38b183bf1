//! Hakiel's nonlinear accretion solver (per-layer and grouped resolution).
//!
//! Winding is simulated as a sequence of increments. In each increment one or more wraps are
//! laid on the current outer node of the wound stack; the stack answers with a radial stress
//! increment δσr that solves (Hakiel, TAPPI J. 70(5):113, 1987)
//!
//! ```text
//! r²·δσr'' + 3r·δσr' + (1 − Eθ/Er)·δσr = 0     on [rc, s]
//! δσr(s) = −T/s                                 (T wound-in tension per unit width)
//! rc·δσr'(rc) = (Eθ/Ec − 1 + ν)·δσr(rc)         (core; rigid core Eθ/Ec = 0)
//! ```
//!
//! discretised with second-order central differences on a uniform grid (a ghost node carries
//! the core condition). The tridiagonal system is homogeneous except at the outer node, so it is
//! solved by shooting from the core outward with normalised rows: the recurrence
//! `x[i+1] = −(ā[i]·x[i−1] + b̄[i]·x[i])` has no division on its dependency chain, and shooting
//! outward is stable because the wanted solution is the one growing outward. The result is then
//! scaled so that the outer node carries −T/s. Increments decay into the stack roughly like
//! (r/s)^√(Eθ/Er); nodes where an increment has fallen below [`SKIP_THRESHOLD`] of the applied
//! load are skipped (the shooting starts above them with a zero value below), see
//! docs/theory.md for the error bound.
//!
//! Tangential stress of a wrap starts at its wound-in stress T/h and accumulates
//! δσθ = δσr + r·δσr' from every later increment.

use super::{
    ModelError, ModulusUpdate, Profile, RadialStiffness, Resolution, WindingProblem, profile,
};

/// Auto resolution solves per-layer up to this many physical layers, grouped above it.
/// Chosen so a per-layer solve of a stiff film (the slowest web: increments reach the core)
/// stays well under a second; see docs/performance.md.
pub const PER_LAYER_LIMIT: usize = 3000;

/// Number of elements auto resolution aims for when it groups layers.
pub const AUTO_ELEMENTS: usize = 400;

/// Largest accepted layer count (memory is a few tens of bytes per node).
pub const MAX_LAYERS: usize = 20_000_000;

/// Relative size below which an increment is treated as zero deeper in the stack.
pub const SKIP_THRESHOLD: f64 = 1e-13;

/// Convergence tolerance of the iterated and secant modulus updates, relative to the
/// increment's outer load.
pub const MODULUS_TOLERANCE: f64 = 1e-10;

/// Iteration cap of the modulus update of one increment.
pub const MAX_MODULUS_ITERATIONS: usize = 60;

/// In grouped resolution, each sub-increment is kept small enough that the pressure it adds at
/// the outer node is at most this share of the stiffness scale there (K1 + P for Pfeiffer).
/// See docs/theory.md ("Grouped resolution").
pub const GROUPED_STEP_SHARE: f64 = 0.25;

/// Solve the finished-roll stress state.
pub fn solve(problem: &WindingProblem) -> Result<Profile, ModelError> {
    solve_with_progress(problem, &mut |_| true)
}

/// Solve, calling `progress(fraction_done)` now and then; returning `false` cancels the solve.
pub fn solve_with_progress(
    problem: &WindingProblem,
    progress: &mut dyn FnMut(f64) -> bool,
) -> Result<Profile, ModelError> {
    validate(problem)?;
    let layers = layer_count(problem);
    match problem.options.resolution {
        Resolution::PerLayer => run(problem, layers, 1, progress),
        Resolution::Grouped { layers: group } => {
            if group == 0 {
                return Err(ModelError::OutOfRange {
                    field: "resolution.layers",
                    value: 0.0,
                    accepted: "at least 1 layer per element",
                });
            }
            run(problem, layers, group.min(layers), progress)
        }
        Resolution::Auto => {
            if layers <= PER_LAYER_LIMIT {
                run(problem, layers, 1, progress)
            } else {
                solve_auto_grouped(problem, layers, progress)
            }
        }
    }
}

/// Grouped solve with the halving check: solve with k and k/2 layers per element; while the
/// core pressure moves by 1 % or more, halve again.
fn solve_auto_grouped(
    problem: &WindingProblem,
    layers: usize,
    progress: &mut dyn FnMut(f64) -> bool,
) -> Result<Profile, ModelError> {
    let mut group = layers.div_ceil(AUTO_ELEMENTS).max(2);
    let mut coarse = run(problem, layers, group, &mut |f| progress(0.3 * f))?;
    loop {
        let half = (group / 2).max(1);
        let fine = run(problem, layers, half, &mut |f| progress(0.3 + 0.7 * f))?;
        let change = relative_change(coarse.summary.core_pressure, fine.summary.core_pressure);
        let mut result = fine;
        result.summary.group_halving_change = Some(change);
        if change < 0.01 || half == 1 {
            if change >= 0.01 {
                result.warnings.push(format!(
                    "halving the element size still moved core pressure by {:.2} %",
                    100.0 * change
                ));
            }
            return Ok(result);
        }
        group = half;
        coarse = result;
    }
}

fn relative_change(a: f64, b: f64) -> f64 {
    let scale = a.abs().max(b.abs());
    if scale == 0.0 {
        0.0
    } else {
        (a - b).abs() / scale
    }
}

/// Number of physical layers between core and outer radius.
pub fn layer_count(problem: &WindingProblem) -> usize {
    let n = ((problem.outer_radius - problem.core_radius) / problem.thickness).round();
    if n.is_finite() && n >= 1.0 {
        n as usize
    } else {
        0
    }
}

fn validate(problem: &WindingProblem) -> Result<(), ModelError> {
    use ModelError::OutOfRange;
    let p = problem;
    if !(p.core_radius.is_finite() && p.core_radius > 0.0) {
        return Err(OutOfRange {
            field: "core_radius",
            value: p.core_radius,
            accepted: "a finite radius > 0 m",
        });
    }
    if !(p.thickness.is_finite() && p.thickness > 0.0 && p.thickness < p.core_radius) {
        return Err(OutOfRange {
            field: "web.thickness",
            value: p.thickness,
            accepted: "a finite caliper > 0 and smaller than the core radius",
        });
    }
    if !(p.outer_radius.is_finite() && p.outer_radius >= p.core_radius + 0.5 * p.thickness) {
        return Err(OutOfRange {
            field: "roll.outer_radius",
            value: p.outer_radius,
            accepted: "a finite radius at least one caliper larger than the core radius",
        });
    }
    let layers = (p.outer_radius - p.core_radius) / p.thickness;
    if layers > MAX_LAYERS as f64 {
        return Err(OutOfRange {
            field: "roll.outer_radius",
            value: p.outer_radius,
            accepted: "a roll of at most 20 million layers",
        });
    }
    if !(p.tangential_modulus.is_finite() && p.tangential_modulus > 0.0) {
        return Err(OutOfRange {
            field: "web.tangential_modulus",
            value: p.tangential_modulus,
            accepted: "a finite modulus > 0 Pa",
        });
    }
    if !(p.poisson_ratio.is_finite() && (0.0..0.5).contains(&p.poisson_ratio)) {
        return Err(OutOfRange {
            field: "web.poisson_ratio",
            value: p.poisson_ratio,
            accepted: "0 ≤ ν < 0.5",
        });
    }
    p.radial_stiffness.validate()?;
    p.core.validate()?;
    p.winding.validate()?;
    Ok(())
}

/// The grid and running state of one solve.
struct Solver<'a> {
    law: RadialStiffness,
    update: ModulusUpdate,
    tangential_modulus: f64,
    spacing: f64,
    core_coefficient: f64,
    radius: Vec<f64>,
    /// Normalised lower coefficient ā = a/c.
    lower: Vec<f64>,
    /// b̄ = beta − gamma·g with g = Eθ/Er.
    beta: Vec<f64>,
    gamma: Vec<f64>,
    pressure: Vec<f64>,
    tangential: Vec<f64>,
    /// Shooting values, then the increment δσr of the current increment.
    shot: Vec<f64>,
    /// Previous increment (guess for the next one).
    guess: Vec<f64>,
    /// First node included in the increments (nodes below are skipped).
    low: usize,
    previous_load: f64,
    iterations: usize,
    increments: usize,
    _marker: std::marker::PhantomData<&'a ()>,
}

impl Solver<'_> {
    fn new(problem: &WindingProblem, nodes: usize, spacing: f64) -> Self {
        let mut radius = Vec::with_capacity(nodes);
        let mut lower = Vec::with_capacity(nodes);
        let mut beta = Vec::with_capacity(nodes);
        let mut gamma = Vec::with_capacity(nodes);
        let h2 = spacing * spacing;
        for i in 0..nodes {
            let r = problem.core_radius + i as f64 * spacing;
            let upper = r * r + 1.5 * r * spacing;
            radius.push(r);
            lower.push((r * r - 1.5 * r * spacing) / upper);
            beta.push((-2.0 * r * r + h2) / upper);
            gamma.push(h2 / upper);
        }
        Solver {
            law: problem.radial_stiffness,
            update: problem.options.modulus_update,
            tangential_modulus: problem.tangential_modulus,
            spacing,
            core_coefficient: problem
                .core
                .boundary_coefficient(problem.tangential_modulus, problem.poisson_ratio),
            radius,
            lower,
            beta,
            gamma,
            pressure: vec![0.0; nodes],
            tangential: vec![0.0; nodes],
            shot: vec![0.0; nodes],
            guess: vec![0.0; nodes],
            low: 0,
            previous_load: 0.0,
            iterations: 0,
            increments: 0,
            _marker: std::marker::PhantomData,
        }
    }

    /// Eθ/Er at node `i` for a trial increment `trial` (δσr, negative in compression).
    #[inline(always)]
    fn stiffness_ratio(&self, i: usize, trial: f64) -> f64 {
        let p = self.pressure[i];
        let er = match self.update {
            ModulusUpdate::Explicit => self.law.modulus_at(p),
            ModulusUpdate::Iterated => self.law.modulus_at(p - 0.5 * trial),
            ModulusUpdate::Secant => self.law.secant_modulus(p, p - trial),
        };
        self.tangential_modulus / er
    }

    /// Shoot from `low` to `top` with the moduli from `self.guess`; leaves δσr in `self.shot`
    /// scaled so that the top node carries `-load`.
    fn shoot(&mut self, top: usize, load: f64) {
        let low = self.low;
        if top == low {
            self.shot[top] = -load;
            return;
        }
        let mut zero_below = low;
        // Start values.
        if low == 0 {
            let r0 = self.radius[0];
            let h = self.spacing;
            let c = self.core_coefficient;
            let g0 = self.stiffness_ratio(0, self.guess[0]);
            self.shot[0] = 1.0;
            self.shot[1] =
                (2.0 * r0 * r0 + 2.0 * r0 * c * h - (3.0 * c + 1.0 - g0) * h * h) / (2.0 * r0 * r0);
        } else {
            // A zero value just below the first included node: the increment there is below
            // the skip threshold.
            let g = self.stiffness_ratio(low, self.guess[low]);
            self.shot[low] = 1.0;
            self.shot[low + 1] = -(self.beta[low] - self.gamma[low] * g);
        }
        // Diagonal coefficients first (independent, vectorisable), then the serial chain.
        // `guess` is overwritten with b̄ for the chain (restored by the caller's next guess).
        for i in (low + 1)..top {
            let g = self.stiffness_ratio(i, self.guess[i]);
            self.guess[i] = self.beta[i] - self.gamma[i] * g;
        }
        let mut previous = self.shot[low];
        let mut current = self.shot[low + 1];
        let mut i = low + 1;
        while i < top {
            let next = -(self.lower[i] * previous + self.guess[i] * current);
            previous = current;
            current = next;
            i += 1;
            self.shot[i] = next;
            if i % 64 == 0 && next.abs() > 1e150 {
                // Rescale; everything below is negligible against the top.
                previous *= 1e-150;
                current *= 1e-150;
                self.shot[i - 1] = previous;
                self.shot[i] = current;
                zero_below = i - 1;
            }
        }
        let scale = -load / self.shot[top];
        for value in &mut self.shot[low..zero_below] {
            *value = 0.0;
        }
        for value in &mut self.shot[zero_below..=top] {
            *value *= scale;
        }
    }

    /// One increment: `load` (Pa, = ΣT/s) applied at node `top`. `fresh_top` is true when the
    /// top node was just created (its own wrap is part of this increment).
    fn increment(&mut self, top: usize, load: f64, fresh_top: bool) -> Result<(), ModelError> {
        self.increments += 1;
        // Initial guess from the previous increment, shifted when the top moved.
        let ratio = if self.previous_load > 0.0 {
            load / self.previous_load
        } else {
            0.0
        };
        let low = self.low;
        if fresh_top && top > 0 {
            // self.shot holds the previous increment on [low, top-1].
            for i in (low.max(1)..top).rev() {
                self.guess[i] = self.shot[i - 1] * ratio;
            }
            if low == 0 {
                self.guess[0] = self.shot[0] * ratio;
            }
        } else {
            for i in low..top {
                self.guess[i] = self.shot[i] * ratio;
            }
        }
        self.guess[top] = -load;
        self.previous_load = load;

        let explicit = matches!(self.update, ModulusUpdate::Explicit)
            || matches!(self.law, RadialStiffness::Constant { .. });
        let mut trial: Vec<f64> = Vec::new();
        let mut converged = explicit;
        let mut iteration = 0;
        loop {
            iteration += 1;
            if !explicit {
                trial.clear();
                trial.extend_from_slice(&self.guess[low..=top]);
            }
            self.shoot(top, load);
            self.iterations += 1;
            if explicit {
                break;
            }
            let mut worst: f64 = 0.0;
            for (k, i) in (low..=top).enumerate() {
                worst = worst.max((self.shot[i] - trial[k]).abs());
            }
            if worst <= MODULUS_TOLERANCE * load {
                converged = true;
                break;
            }
            if iteration >= MAX_MODULUS_ITERATIONS {
                break;
            }
            self.guess[low..=top].copy_from_slice(&self.shot[low..=top]);
        }
        if !converged {
            return Err(ModelError::NotConverged(format!(
                "the modulus update did not settle within {MAX_MODULUS_ITERATIONS} iterations \
                 at node {top}; try the explicit modulus update"
            )));
        }
        self.accumulate(top, fresh_top);
        self.advance_skip(top, load);
        Ok(())
    }

    /// Add the increment in `self.shot` to pressure and tangential stress.
    fn accumulate(&mut self, top: usize, fresh_top: bool) {
        let low = self.low;
        let h2 = 2.0 * self.spacing;
        for i in low..=top {
            self.pressure[i] -= self.shot[i];
        }
        for i in low..top {
            let d = self.shot[i];
            let derivative = if i == 0 {
                // Core condition r·δσr' = c·δσr.
                self.core_coefficient * d
            } else {
                let below = if i == low { 0.0 } else { self.shot[i - 1] };
                self.radius[i] * (self.shot[i + 1] - below) / h2
            };
            self.tangential[i] += d + derivative;
        }
        if !fresh_top {
            // The top node of a grouped element receives the later wraps of its own element:
            // one-sided second-order derivative (or the core condition on the first node).
            let d = self.shot[top];
            let derivative = if top == 0 {
                self.core_coefficient * d
            } else if top == 1 || top - 1 < low {
                self.radius[top] * (d - self.shot[top - 1]) / self.spacing
            } else {
                self.radius[top] * (3.0 * d - 4.0 * self.shot[top - 1] + self.shot[top - 2]) / h2
            };
            self.tangential[top] += d + derivative;
        }
    }

    /// Move the first included node outward past nodes the increments no longer reach.
    fn advance_skip(&mut self, top: usize, load: f64) {
        let limit = SKIP_THRESHOLD * load;
        let mut first = self.low;
        while first < top && self.shot[first].abs() < limit {
            first += 1;
        }
        // Keep a margin of nodes under the threshold so the zero start value stays harmless.
        const MARGIN: usize = 8;
        if first >= self.low + 2 * MARGIN {
            self.low = first - MARGIN;
        }
    }
}

/// Run the accretion with `group` layers per element.
fn run(
    problem: &WindingProblem,
    layers: usize,
    group: usize,
    progress: &mut dyn FnMut(f64) -> bool,
) -> Result<Profile, ModelError> {
    let h = problem.thickness;
    let rc = problem.core_radius;
    let outer = rc + layers as f64 * h;
    let elements = layers.div_ceil(group);
    let spacing = group as f64 * h;
    // Nodes 0..elements are loaded tops; node `elements` is the outer surface.
    let mut solver = Solver::new(problem, elements, spacing);
    let winding = &problem.winding;
    let wit = |layer: usize| winding.wound_in_tension(rc + layer as f64 * h, rc, outer);
    // Pressure change over which Er changes by its own size: K1 + P for Pfeiffer, P/n for the
    // power law; a linear law never needs sub-increments.
    let stiff_scale = |p: f64| match problem.radial_stiffness {
        RadialStiffness::Pfeiffer { k1, .. } => k1 + p,
        RadialStiffness::PowerLaw { exponent, .. } if exponent > 0.0 => p.max(1.0) / exponent,
        _ => f64::INFINITY,
    };

    let mut wound_in = Vec::with_capacity(elements + 1);
    let total_work = (elements as f64) * (elements as f64 + 1.0) / 2.0;
    let mut done_work = 0.0;
    let mut next_report = 0.0;
    for element in 0..elements {
        let first = element * group;
        let last = ((element + 1) * group).min(layers);
        let t0 = wit(first);
        wound_in.push(t0);
        solver.tangential[element] = t0 / h;
        let mut layer = first;
        let mut fresh = true;
        while layer < last {
            // Batch consecutive wraps into one sub-increment while the pressure they add stays a
            // small share of the stiffness scale at the top (always one wrap per increment in
            // per-layer resolution).
            let mut load = 0.0;
            let limit = GROUPED_STEP_SHARE * stiff_scale(solver.pressure[element]);
            let mut end = layer;
            while end < last {
                let s = rc + end as f64 * h;
                let add = wit(end) / s;
                if end > layer && load + add > limit {
                    break;
                }
                load += add;
                end += 1;
            }
            if load > 0.0 {
                solver.increment(element, load, fresh)?;
            }
            fresh = false;
            layer = end;
        }
        done_work += element as f64 + 1.0;
        if done_work >= next_report {
            next_report += total_work / 200.0;
            if !progress(done_work / total_work) {
                return Err(ModelError::Cancelled);
            }
        }
    }
    let last_tension = wit(layers - 1);
    wound_in.push(last_tension);
    let mut radius = solver.radius;
    radius.push(outer);
    let mut pressure = solver.pressure;
    pressure.push(0.0);
    let mut tangential = solver.tangential;
    tangential.push(last_tension / h);
    let law = problem.radial_stiffness;
    let strain = pressure.iter().map(|&p| law.strain_at(p)).collect();

    let mut warnings = winding.warnings();
    let air_start = winding.air_film(rc, rc, outer);
    let air_end = winding.air_film(outer, rc, outer);
    for (place, film) in [("core", air_start), ("outside", air_end)] {
        if film.ratio_to_roughness > super::wound_in::TRACTION_LOSS_RATIO && !film.suppressed_by_nip
        {
            warnings.push(format!(
                "entrained air: the estimated air film at the {place} ({:.1} µm) exceeds the \
                 combined roughness; layers may float and lose traction",
                film.thickness * 1e6
            ));
        }
    }
    let _ = progress(1.0);
    Ok(profile::build(
        profile::Raw {
            radius,
            pressure,
            tangential_stress: tangential,
            radial_strain: strain,
            wound_in_tension: wound_in,
            physical_layers: layers,
            layers_per_element: group,
            increments: solver.increments,
            solves: solver.iterations,
            air_film: Some((air_start, air_end)),
            warnings,
        },
        problem,
    ))
}
