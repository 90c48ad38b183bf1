//! One increment of the accretion: the moduli over the increment, the shooting solve of the
//! tridiagonal system and the modulus iteration.

use super::{
    HOLD_INCREMENTS, MAX_MODULUS_ITERATIONS, ModelError, ModulusUpdate, RadialStiffness, Solver,
};

impl Solver {
    /// Eθ/Er at node `i` for a trial increment `trial` (δσr, negative in compression).
    #[inline(always)]
    pub(super) fn stiffness_ratio(&self, i: usize, trial: f64) -> f64 {
        let p = self.pressure[i];
        let er = match self.update {
            ModulusUpdate::Explicit => self.law.modulus_at(p),
            ModulusUpdate::Iterated => self.law.modulus_at(p - 0.5 * trial),
            ModulusUpdate::Secant => self.law.secant_modulus(p, p - trial),
        };
        self.tangential_modulus / er
    }

    /// Negated normalised diagonal of rows `from..to` into `out` (one block of the chain, so it
    /// stays in the first-level cache until the chain reads it), specialised per stiffness law
    /// and modulus update so the loops stay tight. The iterated and secant updates also store
    /// each row's modulus sensitivity.
    #[inline(always)]
    pub(super) fn fill_diagonal(&mut self, from: usize, to: usize, out: &mut [f64]) {
        let et = self.tangential_modulus;
        let pressure = &self.pressure[from..to];
        let guess = &self.guess[from..to];
        let beta = &self.beta[from..to];
        let gamma = &self.gamma[from..to];
        let sensitivity = &mut self.sensitivity[from..to];
        let out = &mut out[..to - from];
        match (self.law, self.update) {
            (RadialStiffness::Pfeiffer { k1, k2 }, ModulusUpdate::Explicit) => {
                let scale = et / k2;
                // Only a held deep part reads the sensitivity of an explicit solve.
                if self.may_hold {
                    for i in 0..out.len() {
                        let inverse = 1.0 / (pressure[i].max(0.0) + k1);
                        out[i] = gamma[i] * scale * inverse - beta[i];
                        sensitivity[i] = 0.5 * inverse;
                    }
                } else {
                    for i in 0..out.len() {
                        out[i] = gamma[i] * scale / (pressure[i].max(0.0) + k1) - beta[i];
                    }
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
                    out[i - from] = self.gamma[i] * g - self.beta[i];
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
    pub(super) fn shoot(
        &mut self,
        top: usize,
        load: f64,
        restart: Option<usize>,
        scale_from: usize,
    ) {
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
        #[cfg(target_arch = "x86_64")]
        if self.wide {
            // SAFETY: `wide` is set only when the processor reports AVX2 (`Solver::new`).
            unsafe { self.shoot_rows_avx2(begin, top, scale_from) };
            return;
        }
        self.shoot_rows::<false>(begin, top, scale_from);
    }

    /// The rows `begin..top` of [`Self::shoot`] (the chain below `begin` is in place): build,
    /// shoot, rescale, then scale the solution to the loads. `WIDE`: compiled into the AVX2 build
    /// (the chain then runs on register pairs, see [`advance_chain_pairs`]).
    #[inline(always)]
    fn shoot_rows<const WIDE: bool>(&mut self, begin: usize, top: usize, scale_from: usize) {
        // The rows are built and shot in blocks of CHAIN_BLOCK nodes: a block's diagonal is
        // computed into a small buffer and read back by the chain at once, so the divisions of
        // the stiffness law overlap the serial chain and the diagonal never goes to memory.
        let mut diagonal = [0.0; CHAIN_BLOCK];
        let mut previous = self.raw[begin - 1];
        let mut current = self.raw[begin];
        let mut block = begin;
        while block < top {
            let block_end = (block + CHAIN_BLOCK).min(top);
            let diagonal = &mut diagonal[..block_end - block];
            self.fill_diagonal(block, block_end, diagonal);
            (previous, current) = chain_block::<WIDE>(
                &self.lower[block..block_end],
                diagonal,
                (previous, current),
                &mut self.raw[block + 1..block_end + 1],
            );
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

    /// [`Self::shoot_rows`] compiled for AVX2 (see [`super::wide_vectors`]).
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx2")]
    fn shoot_rows_avx2(&mut self, begin: usize, top: usize, scale_from: usize) {
        self.shoot_rows::<true>(begin, top, scale_from);
    }

    /// Initial trial increment: the previous increment moved outward with the top (by radius,
    /// so it follows the surface through the per-wrap window and barely moves on the coarse
    /// elements deep in the roll), scaled by the ratio of the loads.
    pub(super) fn predict(&mut self, low: usize, top: usize, load: f64) {
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
    pub(super) fn increment(&mut self, loads: &[f64]) -> Result<(), ModelError> {
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
    pub(super) fn increment_again(&mut self) -> Result<(), ModelError> {
        self.increments -= 1;
        let loads = self.loads.clone();
        self.increment(&loads)
    }
}

/// Nodes per block of the shooting chain: the rescaling test runs once per block, and a block's
/// rows (a few kilobytes) stay in the first-level cache between building and shooting them.
const CHAIN_BLOCK: usize = 64;

/// One block of the chain: [`advance_chain_pairs`] in the AVX2 build (`WIDE`, only called from
/// it), [`advance_chain`] otherwise. Both give the same bits.
#[inline(always)]
fn chain_block<const WIDE: bool>(
    lower: &[f64],
    diagonal: &[f64],
    state: (f64, f64),
    out: &mut [f64],
) -> (f64, f64) {
    #[cfg(target_arch = "x86_64")]
    if WIDE {
        // SAFETY: `WIDE` is true only in `shoot_rows_avx2`, which runs only when the processor
        // reports AVX2 (`Solver::new`).
        return unsafe { advance_chain_pairs(lower, diagonal, state, out) };
    }
    advance_chain(lower, diagonal, state, out)
}

/// Advance the serial chain x[i+1] = −ā·x[i−1] − b̄·x[i] over one block (`lower` = −ā,
/// `diagonal` = −b̄, `out` = x of the next nodes) from the two values below it; returns the last
/// two values. Four nodes per step: all four new values are combinations of the two previous
/// ones with coefficients computed off the dependency path, so the path carries one
/// multiply-add per four nodes. Exact slices of four keep bounds checks out of the loop.
#[inline(always)]
fn advance_chain(
    lower: &[f64],
    diagonal: &[f64],
    (mut previous, mut current): (f64, f64),
    out: &mut [f64],
) -> (f64, f64) {
    let whole = out.len() / 4 * 4;
    let steps = lower[..whole]
        .chunks_exact(4)
        .zip(diagonal[..whole].chunks_exact(4))
        .zip(out[..whole].chunks_exact_mut(4));
    for ((q, p), x) in steps {
        let (q0, p0) = (q[0], p[0]);
        let (q1, p1) = (q[1], p[1]);
        let (q2, p2) = (q[2], p[2]);
        let (q3, p3) = (q[3], p[3]);
        // x[j+n] = a_n·previous + b_n·current, the coefficients by the same recurrence.
        let (a2, b2) = (p1 * q0, q1 + p1 * p0);
        let (a3, b3) = (q2 * q0 + p2 * a2, q2 * p0 + p2 * b2);
        let (a4, b4) = (q3 * a2 + p3 * a3, q3 * b2 + p3 * b3);
        let x3 = a3 * previous + b3 * current;
        let x4 = a4 * previous + b4 * current;
        x[0] = q0 * previous + p0 * current;
        x[1] = a2 * previous + b2 * current;
        x[2] = x3;
        x[3] = x4;
        (previous, current) = (x3, x4);
    }
    single_steps(
        &lower[whole..],
        &diagonal[whole..],
        (previous, current),
        &mut out[whole..],
    )
}

/// The chain one node per step (the last nodes of a block that are not a whole four).
#[inline(always)]
fn single_steps(
    lower: &[f64],
    diagonal: &[f64],
    (mut previous, mut current): (f64, f64),
    out: &mut [f64],
) -> (f64, f64) {
    for ((q, p), x) in lower.iter().zip(diagonal).zip(out.iter_mut()) {
        let next = q * previous + p * current;
        previous = current;
        current = next;
        *x = next;
    }
    (previous, current)
}

/// [`advance_chain`] on register pairs: the coefficients of a step come as pairs (a_n, b_n) in
/// the two lanes of one register, the four new values as pairs (x1, x2) and (x3, x4): 9
/// two-lane multiplications per four nodes. Every lane does the multiplications and additions
/// of [`advance_chain`] in the same order (no fused multiply-add), so the bits are the same.
/// The compiler packs the scalar version partly into four-lane registers, with cross-lane
/// shuffles (several cycles each) on the dependency path; here the path is one in-lane
/// broadcast, one multiplication and one addition per four nodes.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
#[inline]
fn advance_chain_pairs(
    lower: &[f64],
    diagonal: &[f64],
    (previous, current): (f64, f64),
    out: &mut [f64],
) -> (f64, f64) {
    use std::arch::x86_64::{
        __m128d, _mm_add_pd, _mm_cvtsd_f64, _mm_mul_pd, _mm_set_pd, _mm_set1_pd, _mm_storeu_pd,
        _mm_unpackhi_pd, _mm_unpacklo_pd,
    };
    let whole = out.len() / 4 * 4;
    // Lanes (low, high) = (x[i−1], x[i]) of the two values below the next step.
    let mut below: __m128d = _mm_set_pd(current, previous);
    let steps = lower[..whole]
        .chunks_exact(4)
        .zip(diagonal[..whole].chunks_exact(4))
        .zip(out[..whole].chunks_exact_mut(4));
    for ((q, p), x) in steps {
        let qp0 = _mm_set_pd(p[0], q[0]);
        // −0.0 leaves a2 = p1·q0 exactly as it is (x + (−0) = x for every x, zeros included).
        let ab2 = _mm_add_pd(_mm_mul_pd(_mm_set1_pd(p[1]), qp0), _mm_set_pd(q[1], -0.0));
        let ab3 = _mm_add_pd(
            _mm_mul_pd(_mm_set1_pd(q[2]), qp0),
            _mm_mul_pd(_mm_set1_pd(p[2]), ab2),
        );
        let ab4 = _mm_add_pd(
            _mm_mul_pd(_mm_set1_pd(q[3]), ab2),
            _mm_mul_pd(_mm_set1_pd(p[3]), ab3),
        );
        let previous = _mm_unpacklo_pd(below, below);
        let current = _mm_unpackhi_pd(below, below);
        let x12 = _mm_add_pd(
            _mm_mul_pd(_mm_unpacklo_pd(qp0, ab2), previous),
            _mm_mul_pd(_mm_unpackhi_pd(qp0, ab2), current),
        );
        let x34 = _mm_add_pd(
            _mm_mul_pd(_mm_unpacklo_pd(ab3, ab4), previous),
            _mm_mul_pd(_mm_unpackhi_pd(ab3, ab4), current),
        );
        let (low, high) = x.split_at_mut(2);
        // SAFETY: each half of the four-element chunk holds two f64 (unaligned store).
        unsafe {
            _mm_storeu_pd(low.as_mut_ptr(), x12);
            _mm_storeu_pd(high.as_mut_ptr(), x34);
        }
        below = x34;
    }
    let state = (
        _mm_cvtsd_f64(below),
        _mm_cvtsd_f64(_mm_unpackhi_pd(below, below)),
    );
    single_steps(
        &lower[whole..],
        &diagonal[whole..],
        state,
        &mut out[whole..],
    )
}
