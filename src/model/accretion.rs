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
    /// First-derivative stencil (x[i−1], x[i], x[i+1]) of each node.
    derivative: Vec<[f64; 3]>,
    pressure: Vec<f64>,
    tangential: Vec<f64>,
    wound_in: Vec<f64>,
    /// Negated normalised diagonal of the current solve.
    diagonal: Vec<f64>,
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
    /// solve are `held_scale · raw`, not yet added to pressure and tangential stress.
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
            derivative: Vec::with_capacity(capacity),
            pressure: v(),
            tangential: v(),
            wound_in: v(),
            diagonal: v(),
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
        }
    }

    fn len(&self) -> usize {
        self.radius.len()
    }

    /// Add a wrap node at the outside (it becomes the loaded top).
    fn push(&mut self, wrap: usize, radius: f64, wound_in: f64, stress: f64, permanent: bool) {
        self.radius.push(radius);
        self.permanent.push(permanent);
        self.wrap.push(wrap);
        self.lower.push(0.0);
        self.beta.push(0.0);
        self.gamma.push(0.0);
        self.derivative.push([0.0; 3]);
        self.pressure.push(0.0);
        self.tangential.push(stress);
        self.wound_in.push(wound_in);
        self.diagonal.push(0.0);
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
        self.derivative[i] = [m1, c1, p1];
    }

    /// Drop the nodes at or above `from` that are neither permanent nor wanted by `keep` (called
    /// with the node's wrap number); the finite-difference rows around them are rebuilt.
    fn compact(&mut self, from: usize, keep: &dyn Fn(usize) -> bool) {
        let from = from.max(1);
        let Some(first_drop) =
            (from..self.len()).find(|&i| !self.permanent[i] && !keep(self.wrap[i]))
        else {
            return;
        };
        if self.held_top >= first_drop {
            // The compaction would rebuild rows the held shape depends on.
            self.release_held();
        }
        let mut write = first_drop;
        for read in first_drop..self.len() {
            if self.permanent[read] || keep(self.wrap[read]) {
                self.radius[write] = self.radius[read];
                self.permanent[write] = self.permanent[read];
                self.wrap[write] = self.wrap[read];
                self.pressure[write] = self.pressure[read];
                self.tangential[write] = self.tangential[read];
                self.wound_in[write] = self.wound_in[read];
                self.shot[write] = self.shot[read];
                write += 1;
            }
        }
        let n = write;
        for v in [
            &mut self.radius,
            &mut self.pressure,
            &mut self.tangential,
            &mut self.wound_in,
            &mut self.shot,
            &mut self.lower,
            &mut self.beta,
            &mut self.gamma,
            &mut self.diagonal,
            &mut self.guess,
            &mut self.raw,
            &mut self.sensitivity,
        ] {
            v.truncate(n);
        }
        self.permanent.truncate(n);
        self.wrap.truncate(n);
        self.derivative.truncate(n);
        for i in (first_drop - 1).max(1)..n.saturating_sub(1) {
            self.set_row(i);
        }
        self.low = self.low.min(first_drop - 1);
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

    /// Negated normalised diagonal of rows `from..to`, specialised per stiffness law and
    /// modulus update so the loops stay tight (they are the bulk of the work besides the chain).
    /// The iterated and secant updates also store each row's modulus sensitivity.
    fn fill_diagonal(&mut self, from: usize, to: usize) {
        let et = self.tangential_modulus;
        let pressure = &self.pressure[from..to];
        let guess = &self.guess[from..to];
        let beta = &self.beta[from..to];
        let gamma = &self.gamma[from..to];
        let sensitivity = &mut self.sensitivity[from..to];
        let out = &mut self.diagonal[from..to];
        match (self.law, self.update) {
            (RadialStiffness::Pfeiffer { k1, k2 }, ModulusUpdate::Explicit) => {
                let scale = et / k2;
                for i in 0..out.len() {
                    let inverse = 1.0 / (pressure[i].max(0.0) + k1);
                    out[i] = gamma[i] * scale * inverse - beta[i];
                    sensitivity[i] = 0.5 * inverse;
                }
            }
            (RadialStiffness::Pfeiffer { k1, k2 }, ModulusUpdate::Iterated) => {
                let scale = et / k2;
                for i in 0..out.len() {
                    let mid = (pressure[i] - 0.5 * guess[i]).max(0.0);
                    out[i] = gamma[i] * scale / (mid + k1) - beta[i];
                    sensitivity[i] = 0.5 / (pressure[i].max(0.0) + k1);
                }
            }
            (RadialStiffness::Pfeiffer { k1, k2 }, ModulusUpdate::Secant) => {
                // Er_sec = K2·ΔP/ln(1 + x), x = ΔP/(K1 + P) ⇒ g = (Eθ/K2)/(K1+P) · ln(1+x)/x.
                let scale = et / k2;
                let mut large = false;
                for i in 0..out.len() {
                    let inverse = 1.0 / (pressure[i].max(0.0) + k1);
                    // The secant runs from P to P + ΔP, never below zero pressure.
                    let x = (-guess[i] * inverse).max(k1 * inverse - 1.0);
                    large |= !(-0.2..=0.25).contains(&x);
                    // ln(1+x)/x = 2/(2+x) · atanh(u)/u with u = x/(2+x), and
                    // atanh(u)/u = Σ u²ⁿ/(2n+1); |u| ≤ 1/9 on −0.2 ≤ x ≤ 0.25, so four terms
                    // leave a relative error below 3e-9.
                    let d = 1.0 / (2.0 + x);
                    let w = (x * d) * (x * d);
                    let series = 1.0 + w * (1.0 / 3.0 + w * (1.0 / 5.0 + w * (1.0 / 7.0)));
                    out[i] = gamma[i] * scale * (2.0 * d * series) * inverse - beta[i];
                    sensitivity[i] = 0.5 * inverse;
                }
                if large {
                    // The few rows near the top with a large relative step: exact logarithm.
                    for i in 0..out.len() {
                        let base = pressure[i].max(0.0) + k1;
                        let step = (-guess[i]).max(-pressure[i].max(0.0));
                        if step > 0.25 * base || step < -0.2 * base {
                            let x = step / base;
                            out[i] = gamma[i] * scale * (x.ln_1p() / x) / base - beta[i];
                        }
                    }
                }
            }
            (RadialStiffness::Constant { modulus }, _) => {
                let g = et / modulus;
                for i in 0..out.len() {
                    out[i] = gamma[i] * g - beta[i];
                    sensitivity[i] = 0.0;
                }
            }
            _ => {
                for i in from..to {
                    let g = self.stiffness_ratio(i, self.guess[i]);
                    self.diagonal[i] = self.gamma[i] * g - self.beta[i];
                    self.sensitivity[i] = 0.5 * self.law.log_slope(self.pressure[i]);
                }
            }
        }
    }

    /// Shoot from `low` to `top` with the moduli from `self.guess`; leaves δσr in `self.shot`
    /// scaled so that the top node carries `-load`.
    ///
    /// With `restart = Some(v)` only the rows from `v` up are rebuilt: the trial increment
    /// changed only there, so the homogeneous solution below `v` still holds and the chain
    /// resumes from its two stored values at `v − 1` and `v`.
    fn shoot(&mut self, top: usize, load: f64, restart: Option<usize>, scale_from: usize) {
        let low = self.low;
        if top == low {
            self.shot[top] = -load;
            self.raw[top] = 1.0;
            self.scale = -load;
            self.cumulative.clear();
            self.cumulative.push(-load);
            self.zero_below = low;
            return;
        }
        let begin = match restart {
            Some(v) if v > low + 1 && v > self.zero_below && v < top => v,
            _ => {
                self.zero_below = low;
                if low == 0 {
                    let r0 = self.radius[0];
                    let h = self.radius[1] - r0;
                    let c = self.core_coefficient;
                    let g0 = self.stiffness_ratio(0, self.guess[0]);
                    self.sensitivity[0] = 0.5 * self.law.log_slope(self.pressure[0]);
                    self.raw[0] = 1.0;
                    self.raw[1] = (2.0 * r0 * r0 + 2.0 * r0 * c * h - (3.0 * c + 1.0 - g0) * h * h)
                        / (2.0 * r0 * r0);
                } else {
                    // A zero value just below the first included node: the increment there is
                    // below the skip threshold.
                    let g = self.stiffness_ratio(low, self.guess[low]);
                    self.sensitivity[low] = 0.5 * self.law.log_slope(self.pressure[low]);
                    self.raw[low] = 1.0;
                    self.raw[low + 1] = self.gamma[low] * g - self.beta[low];
                }
                low + 1
            }
        };
        self.fill_diagonal(begin, top);
        // The serial chain x[i+1] = −ā·x[i−1] − b̄·x[i], advanced two nodes at a time: both new
        // values are combinations of the two previous ones with coefficients computed off the
        // dependency path, so the path carries one multiply-add per two nodes.
        let mut previous = self.raw[begin - 1];
        let mut current = self.raw[begin];
        let mut block = begin;
        while block < top {
            let block_end = (block + 64).min(top);
            let lower = &self.lower[block..block_end];
            let diagonal = &self.diagonal[block..block_end];
            let out = &mut self.raw[block + 1..block_end + 1];
            let pairs = out.len() / 2;
            for k in 0..pairs {
                let (q0, p0) = (lower[2 * k], diagonal[2 * k]);
                let (q1, p1) = (lower[2 * k + 1], diagonal[2 * k + 1]);
                let first = q0 * previous + p0 * current;
                let second = (q1 + p1 * p0) * current + (p1 * q0) * previous;
                out[2 * k] = first;
                out[2 * k + 1] = second;
                previous = first;
                current = second;
            }
            if out.len() % 2 == 1 {
                let k = out.len() - 1;
                let next = lower[k] * previous + diagonal[k] * current;
                previous = current;
                current = next;
                out[k] = next;
            }
            block = block_end;
            if current.abs() > 1e150 {
                // Rescale; everything below is negligible against the top.
                previous *= 1e-150;
                current *= 1e-150;
                self.raw[block - 1] = previous;
                self.raw[block] = current;
                self.zero_below = block - 1;
            }
        }
        // Each loaded wrap k carries −load_k at its node, so its share of the solution is
        // (−load_k / raw[t_k])·raw below t_k; a node takes the sum over the wraps at or above it.
        let first = top + 1 - self.loads.len();
        let mut sum = 0.0;
        for k in (0..self.loads.len()).rev() {
            sum -= self.loads[k] / self.raw[first + k];
            self.cumulative[k] = sum;
        }
        let scale = sum;
        self.scale = scale;
        let zero_below = self.zero_below.max(scale_from);
        if scale_from < zero_below {
            self.shot[scale_from..zero_below].fill(0.0);
        }
        let below = first.max(zero_below);
        for (value, raw) in self.shot[zero_below..below]
            .iter_mut()
            .zip(&self.raw[zero_below..below])
        {
            *value = raw * scale;
        }
        for k in 0..self.loads.len() {
            self.shot[first + k] = self.raw[first + k] * self.cumulative[k];
        }
    }

    /// Initial trial increment: the previous increment moved outward with the top (by radius,
    /// so it follows the surface through the per-wrap window and barely moves on the coarse
    /// elements deep in the roll), scaled by the ratio of the loads.
    fn predict(&mut self, low: usize, top: usize, load: f64) {
        let ratio = if self.previous_load > 0.0 {
            load / self.previous_load
        } else {
            0.0
        };
        let shift = (self.radius[top] - self.previous_top_radius).max(0.0);
        let mut j = top;
        for i in (low..top).rev() {
            let target = self.radius[i] - shift;
            while j > low && self.radius[j] > target {
                j -= 1;
            }
            let value = if self.radius[j] >= target || j == top {
                self.shot[j]
            } else {
                let (r0, r1) = (self.radius[j], self.radius[j + 1]);
                let w = (target - r0) / (r1 - r0);
                self.shot[j] + w * (self.shot[j + 1] - self.shot[j])
            };
            self.guess[i] = value * ratio;
        }
        self.guess[top] = -self.loads.last().copied().unwrap_or(load);
    }

    /// One increment: the wraps just pushed on top (one per node, `loads` in Pa = T/s, bottom
    /// first) are laid together, with the moduli held over the increment.
    fn increment(&mut self, loads: &[f64]) -> Result<(), ModelError> {
        self.increments += 1;
        let top = self.len() - 1;
        self.loads.clear();
        self.loads.extend_from_slice(loads);
        self.cumulative.clear();
        self.cumulative.resize(loads.len(), 0.0);
        let load: f64 = loads.iter().sum();
        let first_loaded = top + 1 - loads.len();
        let held = self.held_top;
        let hold = held > 0
            && held + 2 <= first_loaded
            && self.held_weight + 1.0 <= HOLD_INCREMENTS
            && self.zero_below < held;
        if !hold && held > 0 {
            self.release_held();
        }
        let low = self.low.min(top);
        self.low = low;
        // First node solved this increment: the bottom of the stack, or the top of the held part.
        let from = if hold { held } else { low };
        let explicit = matches!(self.update, ModulusUpdate::Explicit)
            || matches!(self.law, RadialStiffness::Constant { .. });
        if !explicit {
            self.predict(from, top, load);
        }
        self.previous_top_radius = self.radius[top];
        self.previous_load = load;
        let scale_from = if hold { held - 1 } else { low };
        let mut iteration = 0;
        let mut restart = if hold { Some(held) } else { None };
        loop {
            iteration += 1;
            self.shoot(top, load, restart, scale_from);
            self.iterations += 1;
            if hold && self.zero_below >= held {
                // The chain was rescaled above the held part, whose stored shape no longer fits:
                // solve this increment in full instead.
                self.release_held();
                return self.increment_again();
            }
            if explicit {
                break;
            }
            // The lowest node whose modulus does not yet match its increment. A node is settled
            // when the change of its increment moves its modulus by less than the tolerance, or
            // is itself that small a share of the increment (the secant modulus never moves by
            // a larger share than the increment does).
            let unsettled = (from..top).find(|&i| {
                let change = (self.shot[i] - self.guess[i]).abs();
                let size = self.shot[i].abs().max(self.guess[i].abs());
                change * self.sensitivity[i] * size > self.tolerance * load
                    && change > self.tolerance * size
            });
            let Some(lowest) = unsettled else {
                break;
            };
            if iteration >= MAX_MODULUS_ITERATIONS {
                return Err(ModelError::NotConverged(format!(
                    "the modulus update did not settle within {MAX_MODULUS_ITERATIONS} \
                     iterations at wrap {}; try the explicit modulus update",
                    self.increments
                )));
            }
            // Nodes below `first` keep their trial values, so only the rows above are rebuilt.
            self.guess[lowest..=top].copy_from_slice(&self.shot[lowest..=top]);
            restart = Some(lowest.max(from));
        }
        if hold {
            self.accumulate(held, top);
            self.held_scale += self.scale;
            self.held_weight += (self.scale / self.held_reference).abs();
        } else {
            self.accumulate(low, top);
            self.advance_skip(top, load);
            if self.may_hold {
                self.hold_deep_part(top);
            }
        }
        Ok(())
    }

    /// Solve the current increment again in full (after a held part had to be released).
    fn increment_again(&mut self) -> Result<(), ModelError> {
        self.increments -= 1;
        let loads = self.loads.clone();
        self.increment(&loads)
    }

    /// After a full solve: hold the deep nodes whose pressure the next `HOLD_INCREMENTS`
    /// increments of this size change by less than `HOLD_TOLERANCE` (relative to their modulus),
    /// and which no compaction will touch.
    fn hold_deep_part(&mut self, top: usize) {
        let low = self.low;
        let limit = HOLD_TOLERANCE / HOLD_INCREMENTS;
        let first_loaded = top + 1 - self.loads.len();
        let ceiling = self.fixed_below.min(first_loaded.saturating_sub(2));
        let mut held = low;
        while held < ceiling && 2.0 * self.shot[held].abs() * self.sensitivity[held] <= limit {
            held += 1;
        }
        // Holding a handful of nodes is not worth the bookkeeping.
        if held >= low + 8 && held > self.zero_below + 1 {
            self.held_top = held;
            self.held_scale = 0.0;
            self.held_reference = self.scale;
            self.held_weight = 0.0;
            self.held_zero_below = self.zero_below;
        } else {
            self.held_top = 0;
        }
    }

    /// Add the collected increments of the held nodes to their pressure and tangential stress.
    fn release_held(&mut self) {
        let held = self.held_top;
        self.held_top = 0;
        if held == 0 || self.held_scale == 0.0 {
            return;
        }
        let factor = self.held_scale;
        self.held_scale = 0.0;
        self.held_weight = 0.0;
        // The held increment is factor · raw on low..=held (zero below the rescaling point).
        // `guess` serves as scratch: the next increment predicts it afresh.
        let low = self.low;
        let zero_below = self.held_zero_below.clamp(low, held);
        let mut values = std::mem::take(&mut self.guess);
        values[low..zero_below].fill(0.0);
        for (value, raw) in values[zero_below..=held]
            .iter_mut()
            .zip(&self.raw[zero_below..=held])
        {
            *value = raw * factor;
        }
        self.add_increment(&values, low, held, held);
        self.guess = values;
    }

    /// Add δσr = `values` to the pressure of nodes `from..pressure_end` and δσθ = δσr + r·δσr'
    /// to the tangential stress of nodes `from..hoop_end` (the stencil reads `values` one node
    /// further out). At the bottom of the solved stack the core condition r·δσr' = c·δσr, or a
    /// zero value below the first included node, stands in for the missing neighbour.
    fn add_increment(&mut self, values: &[f64], from: usize, pressure_end: usize, hoop_end: usize) {
        let low = self.low;
        for (p, d) in self.pressure[from..pressure_end]
            .iter_mut()
            .zip(&values[from..pressure_end])
        {
            *p -= d;
        }
        let mut start = from;
        if from == low && pressure_end > low + 1 {
            if low == 0 {
                self.tangential[0] += (1.0 + self.core_coefficient) * values[0];
            } else {
                let d = values[low];
                let [_, c1, p1] = self.derivative[low];
                self.tangential[low] += d + self.radius[low] * (c1 * d + p1 * values[low + 1]);
            }
            start = low + 1;
        }
        for i in start..hoop_end.max(start) {
            let d = values[i];
            let [m1, c1, p1] = self.derivative[i];
            self.tangential[i] +=
                d + self.radius[i] * (m1 * values[i - 1] + c1 * d + p1 * values[i + 1]);
        }
    }

    /// Add the increment in `self.shot` on `from..=top` to pressure and tangential stress
    /// (δσθ = δσr + r·δσr'); `from` is the bottom of the stack or the top of the held part.
    /// A loaded wrap of the increment takes the tangential increments of the wraps above it
    /// only (while it is the top, its own load gives it none).
    fn accumulate(&mut self, from: usize, top: usize) {
        let first_loaded = top + 1 - self.loads.len();
        let shot = std::mem::take(&mut self.shot);
        self.add_increment(&shot, from, top + 1, first_loaded);
        self.shot = shot;
        let start = if from == self.low && top > from {
            from + 1
        } else {
            from
        };
        for i in first_loaded.max(start)..top {
            let factor = self.cumulative[i + 1 - first_loaded];
            let d = self.raw[i];
            let [m1, c1, p1] = self.derivative[i];
            self.tangential[i] += factor
                * (d + self.radius[i] * (m1 * self.raw[i - 1] + c1 * d + p1 * self.raw[i + 1]));
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

/// Per-wrap window (wraps) for grouped resolution: a few decay lengths of an increment at zero
/// pressure, λ = r/√(Eθ/Er(0)), taken at the core where it is shortest.
fn window_layers(problem: &WindingProblem) -> usize {
    let g = problem.tangential_modulus / problem.radial_stiffness.modulus_at(0.0);
    let decay = problem.core_radius / g.max(1.0).sqrt();
    let layers = (WINDOW_DECAY_LENGTHS * decay / problem.thickness).ceil();
    (layers as usize).clamp(WINDOW_MIN, WINDOW_MAX)
}

/// Per-wrap window (wraps) for a wrap at `radius` under `pressure`: a few decay lengths
/// λ = r·√(Er(P)/Eθ).
/// Never more than needed to reach elements that resolve the surface decay length, i.e. at
/// most max(λ(0), 2 elements).
fn window_at(problem: &WindingProblem, radius: f64, pressure: f64, group: usize) -> usize {
    let g = problem.tangential_modulus / problem.radial_stiffness.modulus_at(pressure);
    let decay = radius / g.max(1.0).sqrt();
    let layers = (WINDOW_DECAY_LENGTHS * decay / problem.thickness).ceil() as usize;
    let cap = (window_layers(problem) / 3).max(2 * group);
    layers.min(cap).clamp(WINDOW_MIN, WINDOW_MAX)
}

/// Wraps per increment in grouped resolution at outer radius `radius` (see
/// [`BATCH_DECAY_SHARE`]); never more than a quarter of the per-wrap window or one element.
fn batch_at(problem: &WindingProblem, radius: f64, window: usize, group: usize) -> usize {
    let g = problem.tangential_modulus / problem.radial_stiffness.modulus_at(0.0);
    let decay = radius / g.max(1.0).sqrt();
    let wraps = (BATCH_DECAY_SHARE * decay / problem.thickness).floor();
    let limit = (window / 4).clamp(1, group.max(1));
    if wraps.is_finite() && wraps >= 1.0 {
        (wraps as usize).min(limit)
    } else {
        1
    }
}

/// Spacings (wraps) of the graded region, coarsest first: `group`, then repeatedly the largest
/// divisor of the previous spacing that is at most half of it, down to 1 (40 → 20, 10, 5, 1), so
/// every coarser lattice is part of every finer one.
fn lattice_levels(group: usize) -> Vec<usize> {
    let mut levels = vec![group.max(1)];
    let mut current = group.max(1);
    while current > 1 {
        let next = (1..=current / 2)
            .rev()
            .find(|&d| current.is_multiple_of(d))
            .unwrap_or(1);
        levels.push(next);
        current = next;
    }
    levels
}

/// Node spacing (wraps) wanted at `depth` wraps under the surface: one element below the graded
/// region; inside it the coarsest level no wider than a `GRADING_RATIO`-th of the depth and no
/// wider than `finest`.
fn lattice_spacing(depth: usize, window: usize, finest: usize, levels: &[usize]) -> usize {
    if depth >= window {
        return levels[0];
    }
    let allowed = (depth / GRADING_RATIO).min(finest);
    levels.iter().copied().find(|&l| l <= allowed).unwrap_or(1)
}

/// Widest node spacing (wraps) allowed anywhere in the graded region at outer radius `radius`:
/// half the decay length of an increment at zero pressure, λ(0)/2 = s/(2·√(Eθ/Er(0))), the
/// shortest it gets (Er grows with pressure).
fn finest_spacing(problem: &WindingProblem, radius: f64) -> usize {
    let g = problem.tangential_modulus / problem.radial_stiffness.modulus_at(0.0);
    let wraps = 0.5 * radius / g.max(1.0).sqrt() / problem.thickness;
    if wraps.is_finite() && wraps >= 1.0 {
        wraps as usize
    } else {
        1
    }
}

/// Run the accretion with `group` layers per element (1 = per-layer) over `layers` wraps.
pub(super) fn run(
    problem: &WindingProblem,
    layers: usize,
    group: usize,
    progress: &mut dyn FnMut(f64) -> bool,
) -> Result<Profile, ModelError> {
    let h = problem.thickness;
    let rc = problem.core_radius;
    let outer = rc + layers as f64 * h;
    let mut window = if group > 1 { window_layers(problem) } else { 0 };
    let capacity = layers.div_ceil(group) + 2 * window + 2;
    let mut solver = Solver::new(problem, capacity);
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
    let explicit = matches!(problem.options.modulus_update, ModulusUpdate::Explicit);
    let mut layer = 0;
    let mut loads = Vec::with_capacity(64);
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
            solver.push(wrap, s, t, t / h, wrap % group == 0);
            loads.push(t / s);
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
    let mut tangential = solver.tangential;
    tangential.push(last_tension / h);
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lattice_levels_nest() {
        assert_eq!(lattice_levels(40), vec![40, 20, 10, 5, 1]);
        assert_eq!(lattice_levels(8), vec![8, 4, 2, 1]);
        assert_eq!(lattice_levels(7), vec![7, 1]);
        assert_eq!(lattice_levels(1), vec![1]);
        for group in 1..200 {
            let levels = lattice_levels(group);
            for pair in levels.windows(2) {
                assert_eq!(pair[0] % pair[1], 0, "{group}: {levels:?}");
            }
            assert_eq!(levels.last(), Some(&1));
        }
    }

    #[test]
    fn lattice_spacing_grows_with_depth_and_is_one_element_below_the_window() {
        let levels = lattice_levels(40);
        assert_eq!(lattice_spacing(0, 80, 100, &levels), 1);
        assert_eq!(lattice_spacing(19, 80, 100, &levels), 1);
        assert_eq!(lattice_spacing(20, 80, 100, &levels), 5);
        assert_eq!(lattice_spacing(40, 80, 100, &levels), 10);
        assert_eq!(lattice_spacing(79, 80, 100, &levels), 10);
        assert_eq!(lattice_spacing(80, 80, 100, &levels), 40);
        // The decay length caps the spacing.
        assert_eq!(lattice_spacing(79, 80, 6, &levels), 5);
    }
}
