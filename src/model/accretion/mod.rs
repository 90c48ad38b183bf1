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
//! Tangential (hoop) stress is kept in the conservative thin-ring form. The ring between node i
//! and the next node (one wrap, or in grouped resolution one element of wraps) carries a hoop
//! force per unit width F_i = Σ σθ·h over its wraps, and radial statics of that ring say
//! F_i = (r·σr) at its outer face − (r·σr) at its inner face, whatever the material law. Each
//! increment δσr therefore moves F_i by r_{i+1}·δσr_{i+1} − r_i·δσr_i (zero above the top: the
//! outer surface is free): every node's r·δσr leaves the ring above it and enters the ring below
//! it, so the sum telescopes and the accumulated hoop stress σθ_i = F_i/(r_{i+1} − r_i) equals
//! the statics of the finished roll exactly (to rounding), in per-layer and grouped resolution
//! alike. A new wrap's own load −T/s on its own node gives it F = T, i.e. its wound-in stress
//! T/h. Dropping a node merges its ring into the one below (F adds). See docs/theory.md §3.5.
//!
//! Per-layer resolution is the reference: one node per wrap, one increment per wrap, moduli
//! settled to 1e-9. Grouped resolution keeps element boundaries deep in the roll and a graded
//! region of finer nodes under the surface, lays batches of wraps (each with its own load) in one
//! increment, and holds the deep part of the stack between full solves (docs/theory.md §3.4).

use super::{ModelError, ModulusUpdate, Profile, RadialStiffness, WindingProblem, profile};

/// Largest accepted layer count (memory is a few tens of bytes per node).
pub const MAX_LAYERS: usize = 20_000_000;

/// Relative size below which an increment is treated as zero deeper in the stack.
pub const SKIP_THRESHOLD: f64 = 1e-13;

/// Convergence tolerance of the iterated and secant modulus updates in grouped resolution: an
/// increment is settled when, at every node, the change between the trial increment and the
/// one that comes out of the solve moves the node's modulus by less than this share, weighted by
/// the node's share of the load. The test is on the moduli, not on the increment itself: deep in
/// the roll an increment is far smaller than the pressure already there, so a trial value that
/// is off there changes nothing.
pub const MODULUS_TOLERANCE: f64 = 1e-6;

/// The same tolerance in per-layer resolution, the reference the grouped solve is checked
/// against.
pub const REFERENCE_MODULUS_TOLERANCE: f64 = 1e-9;

/// Iteration cap of the modulus update of one increment.
pub const MAX_MODULUS_ITERATIONS: usize = 60;

/// In grouped resolution the outermost wraps are kept at one node per wrap over this many decay
/// lengths λ = r/√(Eθ/Er) of an increment (at the surface pressure), so the steep part of each
/// increment is resolved; deeper wraps are merged into elements. See docs/theory.md.
pub const WINDOW_DECAY_LENGTHS: f64 = 3.0;

/// In grouped resolution consecutive wraps are laid in one increment, each wrap with its own
/// load on its own node, in batches of about this share of the surface decay length
/// λ(0) = s/√(Eθ/Er(0)) at the current radius (at least one wrap). Within a batch the moduli are
/// held at the secant over the batch's whole pressure change; see docs/theory.md for the
/// measured effect.
pub const BATCH_DECAY_SHARE: f64 = 0.1;

/// In grouped resolution the deep part of the roll, where one increment changes the pressure by
/// a tiny share of what is already there, is *held*: its response to an increment keeps the
/// shape computed at the last full solve, only the part above it is solved each increment, and
/// the held increments are added to the deep nodes in one pass later. A node is held only while
/// the increments collected for it change its pressure — and so its radial modulus — by less
/// than this share of `P + K1` (the relative modulus change d(ln Er)/dP·ΔP). See docs/theory.md.
pub const HOLD_TOLERANCE: f64 = 1e-3;

/// Number of increments (weighted by their size) a held part is kept before a full solve
/// refreshes it; the per-increment share allowed for a held node is
/// `HOLD_TOLERANCE / HOLD_INCREMENTS`.
pub const HOLD_INCREMENTS: f64 = 32.0;

/// In grouped resolution node spacing in the graded region under the surface grows with depth:
/// a node at depth d wraps is kept while the spacing there is at most d / `GRADING_RATIO`
/// (see [`lattice_spacing`]).
pub const GRADING_RATIO: usize = 4;

/// Wraps between two compactions of the graded region.
const COMPACT_EVERY: usize = 4;

/// Bounds of the per-wrap window of grouped resolution (wraps).
pub const WINDOW_MIN: usize = 24;
pub const WINDOW_MAX: usize = 1500;

pub(super) fn validate(problem: &WindingProblem) -> Result<(), ModelError> {
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

mod increment;
mod lattice;
mod stack;
#[cfg(test)]
mod tests;

use lattice::{
    batch_at, finest_spacing, lattice_levels, lattice_spacing, window_at, window_layers,
};

/// The grid and running state of one solve. Nodes are kept in radial order; node 0 is the core
/// surface. In grouped resolution the outermost `window` nodes are one per wrap and older wraps
/// that are not element boundaries are dropped now and then (compaction).
struct Solver {
    law: RadialStiffness,
    update: ModulusUpdate,
    tangential_modulus: f64,
    core_coefficient: f64,
    radius: Vec<f64>,
    /// True for nodes kept for good (element boundaries).
    permanent: Vec<bool>,
    /// Wrap number of each node (0 = the first wrap on the core).
    wrap: Vec<usize>,
    /// Negated normalised lower coefficient −A/C of each row.
    lower: Vec<f64>,
    /// Normalised diagonal (B − g)/C = beta − gamma·g with g = Eθ/Er.
    beta: Vec<f64>,
    gamma: Vec<f64>,
    pressure: Vec<f64>,
    /// Hoop force per unit width (N/m) of the ring from this node to the next (or to the
    /// outside): Σ σθ·h over its wraps (see the module docs).
    hoop_force: Vec<f64>,
    wound_in: Vec<f64>,
    /// The increment δσr of the current solve.
    shot: Vec<f64>,
    /// The unscaled homogeneous solution of the current solve (valid from `zero_below` up).
    raw: Vec<f64>,
    /// Half the logarithmic slope ½·d(ln Er)/dP at each node's pressure: the relative change of
    /// a node's modulus per pascal of change in its trial increment (an upper bound).
    sensitivity: Vec<f64>,
    /// Nodes below this carry a zero increment in the current solve (see the rescaling).
    zero_below: usize,
    /// Trial increment the moduli are evaluated with (iterated and secant updates).
    guess: Vec<f64>,
    /// First node included in the increments (nodes below are skipped).
    low: usize,
    previous_load: f64,
    /// Radius of the node the previous increment was applied at.
    previous_top_radius: f64,
    /// Scale of the last solve below its batch of loaded wraps (δσr = scale · raw there).
    scale: f64,
    /// Loads (Pa) of the wraps of the current increment, one per top node, bottom first.
    loads: Vec<f64>,
    /// Cumulative scale from the top of each loaded wrap of the current increment: the
    /// increment at loaded node `first + k` is `cumulative[k] · raw`.
    cumulative: Vec<f64>,
    /// Whether deep nodes may be held (grouped resolution only).
    may_hold: bool,
    /// Modulus convergence tolerance of this solve.
    tolerance: f64,
    /// Nodes `low..held_top` are held (0: nothing held). Their increments since the last full
    /// solve are `held_scale · raw`, not yet added to pressure and hoop force.
    held_top: usize,
    held_scale: f64,
    /// Scale of the full solve the held shape comes from, and the held increments' size in
    /// units of it.
    held_reference: f64,
    held_weight: f64,
    /// The held shape is zero below this node (the chain was rescaled above it).
    held_zero_below: usize,
    /// Nodes the compaction never touches again lie below this index (set by the run).
    fixed_below: usize,
    iterations: usize,
    increments: usize,
    /// The processor has AVX2: the vector loops run in their AVX2 build (see [`wide_vectors`]).
    wide: bool,
}

/// Whether the solver's vector loops (row building, chain, scaling, accumulation) may run in
/// their AVX2 build, chosen once per solve from what the processor reports. The default x86-64
/// build uses two-lane SSE2; four lanes take about a tenth off a per-layer solve. Only AVX2 is
/// enabled, never FMA: a fused multiply-add rounds once where the portable build rounds twice,
/// and results must not depend on the processor (both builds give bit-identical results).
/// AVX-512 measured slower on the build machine.
fn wide_vectors() -> bool {
    #[cfg(target_arch = "x86_64")]
    {
        std::arch::is_x86_feature_detected!("avx2")
    }
    #[cfg(not(target_arch = "x86_64"))]
    {
        false
    }
}

impl Solver {
    fn new(problem: &WindingProblem, capacity: usize) -> Self {
        let v = || Vec::with_capacity(capacity);
        Solver {
            law: problem.radial_stiffness,
            update: problem.options.modulus_update,
            tangential_modulus: problem.tangential_modulus,
            core_coefficient: problem
                .core
                .boundary_coefficient(problem.tangential_modulus, problem.poisson_ratio),
            radius: v(),
            permanent: Vec::with_capacity(capacity),
            wrap: Vec::with_capacity(capacity),
            lower: v(),
            beta: v(),
            gamma: v(),
            pressure: v(),
            hoop_force: v(),
            wound_in: v(),
            shot: v(),
            raw: v(),
            sensitivity: v(),
            zero_below: 0,
            guess: v(),
            low: 0,
            previous_load: 0.0,
            previous_top_radius: 0.0,
            scale: 0.0,
            loads: Vec::new(),
            cumulative: Vec::new(),
            may_hold: false,
            tolerance: MODULUS_TOLERANCE,
            held_top: 0,
            held_scale: 0.0,
            held_reference: 0.0,
            held_weight: 0.0,
            held_zero_below: 0,
            fixed_below: 0,
            iterations: 0,
            increments: 0,
            wide: wide_vectors(),
        }
    }

    fn len(&self) -> usize {
        self.radius.len()
    }

    /// Add a wrap node at the outside (it becomes the loaded top).
    /// Its hoop force starts at zero: the wrap's own load gives it its wound-in tension.
    fn push(&mut self, wrap: usize, radius: f64, wound_in: f64, permanent: bool) {
        self.radius.push(radius);
        self.permanent.push(permanent);
        self.wrap.push(wrap);
        self.lower.push(0.0);
        self.beta.push(0.0);
        self.gamma.push(0.0);
        self.pressure.push(0.0);
        self.hoop_force.push(0.0);
        self.wound_in.push(wound_in);
        self.shot.push(0.0);
        self.raw.push(0.0);
        self.sensitivity.push(0.0);
        self.guess.push(0.0);
        let n = self.len();
        if n >= 3 {
            self.set_row(n - 2);
        }
    }

    /// Finite-difference row of node `i` (0 < i < len−1) on the non-uniform grid.
    fn set_row(&mut self, i: usize) {
        let r = self.radius[i];
        let hm = r - self.radius[i - 1];
        let hp = self.radius[i + 1] - r;
        let sum = hm + hp;
        let (m2, c2, p2) = (2.0 / (sum * hm), -2.0 / (hm * hp), 2.0 / (sum * hp));
        let (m1, c1, p1) = (-hp / (hm * sum), (hp - hm) / (hm * hp), hm / (hp * sum));
        let a = r * r * m2 + 3.0 * r * m1;
        let b = r * r * c2 + 3.0 * r * c1 + 1.0;
        let c = r * r * p2 + 3.0 * r * p1;
        self.lower[i] = -a / c;
        self.beta[i] = b / c;
        self.gamma[i] = 1.0 / c;
    }
}

/// In grouped resolution the wraps next to the core are graded like the region under the
/// surface over this many times the per-wrap window of [`window_layers`] (at most
/// [`WINDOW_MAX`] wraps): the window is taken at zero pressure, and the pressure at the core
/// lengthens the decay length there severalfold.
pub const CORE_WINDOW_FACTOR: usize = 4;

/// Relative change of wound-in tension from one wrap to the next above which grouped resolution
/// keeps element boundaries on both sides (a schedule step or an upset edge; a smooth taper
/// changes by far less per wrap).
pub const JUMP_SHARE: f64 = 0.01;

fn is_jump(previous: f64, tension: f64) -> bool {
    (tension - previous).abs() > JUMP_SHARE * tension.abs().max(previous.abs())
}

/// Run the accretion with `group` layers per element (1 = per-layer) over `layers` wraps.
pub(super) fn run(
    problem: &WindingProblem,
    layers: usize,
    group: usize,
    progress: &mut dyn FnMut(f64) -> bool,
) -> Result<Profile, ModelError> {
    run_on(problem, layers, group, wide_vectors(), progress)
}

/// [`run`] with the vector loops' build chosen by the caller (`wide`: AVX2, only where the
/// processor has it); the tests compare the two builds.
fn run_on(
    problem: &WindingProblem,
    layers: usize,
    group: usize,
    wide: bool,
    progress: &mut dyn FnMut(f64) -> bool,
) -> Result<Profile, ModelError> {
    let h = problem.thickness;
    let rc = problem.core_radius;
    let outer = rc + layers as f64 * h;
    let mut window = if group > 1 { window_layers(problem) } else { 0 };
    let capacity = layers.div_ceil(group) + 2 * window + 2;
    let mut solver = Solver::new(problem, capacity);
    solver.wide = wide && wide_vectors();
    solver.may_hold = group > 1;
    solver.tolerance = if group > 1 {
        MODULUS_TOLERANCE
    } else {
        REFERENCE_MODULUS_TOLERANCE
    };
    let winding = &problem.winding;
    let wit = |layer: usize| winding.wound_in_tension(rc + layer as f64 * h, rc, outer);

    // Work is about Σ nodes per increment; report progress by wraps squared (per-layer) or wraps.
    let mut next_report = 0usize;
    let report_every = (layers / 200).max(1);
    let mut compacted_to = 1usize;
    let mut next_compaction = 0usize;
    let levels = lattice_levels(group);
    // The first wraps on the core are graded from one node per wrap up to the element size, the
    // same nested lattices as under the surface: a soft core or a stiff web puts a boundary
    // layer there (hoop compression of the first wraps) that one element would average away.
    let core_window = if group > 1 {
        (CORE_WINDOW_FACTOR * window_layers(problem)).min(WINDOW_MAX)
    } else {
        0
    };
    let core_finest = finest_spacing(problem, rc);
    let on_core_lattice = |wrap: usize| {
        wrap < core_window
            && wrap.is_multiple_of(lattice_spacing(wrap, core_window, core_finest, &levels))
    };
    let explicit = matches!(problem.options.modulus_update, ModulusUpdate::Explicit);
    let mut layer = 0;
    let mut loads = Vec::with_capacity(64);
    let mut previous_tension = 0.0;
    while layer < layers {
        // Batches (grouped resolution only) start once a few wraps lie on the core.
        // The explicit update takes each wrap's modulus before that wrap, so it lays one wrap
        // at a time.
        let size = if group > 1 && solver.len() >= 4 && !explicit {
            batch_at(problem, rc + layer as f64 * h, window, group)
        } else {
            1
        };
        let end = (layer + size).min(layers);
        loads.clear();
        for wrap in layer..end {
            let s = rc + wrap as f64 * h;
            let t = wit(wrap);
            // Both sides of a jump in wound-in tension (a step, the edges of an upset band) are
            // kept as element boundaries, so the kinks of the pressure there stay on the grid.
            let jump = wrap > 0 && is_jump(previous_tension, t);
            if jump && let Some(below) = solver.permanent.last_mut() {
                *below = true;
            }
            let permanent = jump || wrap.is_multiple_of(group) || on_core_lattice(wrap);
            solver.push(wrap, s, t, permanent);
            loads.push(t / s);
            previous_tension = t;
        }
        if loads.iter().sum::<f64>() > 0.0 {
            solver.increment(&loads)?;
        }
        layer = end;
        if group > 1 && layer >= next_compaction {
            next_compaction = layer + COMPACT_EVERY;
            let top_wrap = layer - 1;
            // The graded region reaches `window` wraps deep; it follows the decay length at the
            // pressure its deepest wrap has reached (Er grows with pressure, so increments reach
            // deeper as the wraps settle).
            let bottom = compacted_to.min(solver.len() - 1);
            window = window_at(
                problem,
                solver.radius[bottom],
                solver.pressure[bottom],
                group,
            );
            let finest = finest_spacing(problem, rc + top_wrap as f64 * h);
            let keep = |wrap: usize| {
                let depth = top_wrap - wrap;
                wrap.is_multiple_of(lattice_spacing(depth, window, finest, &levels))
            };
            solver.compact(compacted_to, &keep);
            // Below the first node less than `window` deep only element boundaries are left.
            compacted_to = (compacted_to..solver.len())
                .find(|&i| top_wrap - solver.wrap[i] < window)
                .unwrap_or(solver.len())
                .max(1);
            solver.fixed_below = compacted_to - 1;
        }
        if layer >= next_report {
            next_report += report_every;
            let fraction = if group == 1 {
                let done = layer as f64;
                done * done / (layers as f64 * layers as f64)
            } else {
                layer as f64 / layers as f64
            };
            if !progress(fraction) {
                return Err(ModelError::Cancelled);
            }
        }
    }
    solver.release_held();
    let last_tension = wit(layers - 1);
    let mut radius = solver.radius;
    radius.push(outer);
    let mut pressure = solver.pressure;
    pressure.push(0.0);
    // σθ of each ring is its hoop force over its radial extent; the outer surface node repeats
    // the outermost wrap's value.
    let mut tangential: Vec<f64> = solver
        .hoop_force
        .iter()
        .zip(radius.iter().zip(&radius[1..]))
        .map(|(force, (inner, next))| force / (next - inner))
        .collect();
    tangential.push(tangential.last().copied().unwrap_or(last_tension / h));
    let mut wound_in = solver.wound_in;
    wound_in.push(last_tension);
    let law = problem.radial_stiffness;
    let strain = pressure.iter().map(|&p| law.strain_at(p)).collect();

    let warnings = winding.warnings(rc, outer, h);
    let air_start = winding.air_film(rc, rc, outer);
    let air_end = winding.air_film(outer, rc, outer);
    let _ = progress(1.0);
    Ok(profile::build(
        profile::Raw {
            radius,
            pressure,
            tangential_stress: tangential,
            radial_strain: strain,
            wound_in_tension: wound_in,
            physical_layers: layers,
            grid: super::Grid {
                layers_per_element: group,
            },
            increments: solver.increments,
            solves: solver.iterations,
            air_film: Some((air_start, air_end)),
            warnings,
        },
        problem,
    ))
}
