//! What the stack keeps between increments: adding an increment to pressure and hoop force,
//! the held deep part, the skipped decayed part and the compaction of the graded region.

use super::{HOLD_INCREMENTS, HOLD_TOLERANCE, SKIP_THRESHOLD, Solver};

impl Solver {
    /// Drop the nodes at or above `from` that are neither permanent nor wanted by `keep` (called
    /// with the node's wrap number); the finite-difference rows around them are rebuilt. A dropped
    /// node's ring joins the ring below it: their hoop forces add, so statics still hold.
    pub(super) fn compact(&mut self, from: usize, keep: &dyn Fn(usize) -> bool) {
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
                self.hoop_force[write] = self.hoop_force[read];
                self.wound_in[write] = self.wound_in[read];
                self.shot[write] = self.shot[read];
                write += 1;
            } else {
                // `write − 1 ≥ first_drop − 1` is the kept node just below (from ≥ 1).
                self.hoop_force[write - 1] += self.hoop_force[read];
            }
        }
        let n = write;
        for v in [
            &mut self.radius,
            &mut self.pressure,
            &mut self.hoop_force,
            &mut self.wound_in,
            &mut self.shot,
            &mut self.lower,
            &mut self.beta,
            &mut self.gamma,
            &mut self.guess,
            &mut self.raw,
            &mut self.sensitivity,
        ] {
            v.truncate(n);
        }
        self.permanent.truncate(n);
        self.wrap.truncate(n);
        for i in (first_drop - 1).max(1)..n.saturating_sub(1) {
            self.set_row(i);
        }
        self.low = self.low.min(first_drop - 1);
    }

    /// After a full solve: hold the deep nodes whose pressure the next `HOLD_INCREMENTS`
    /// increments of this size change by less than `HOLD_TOLERANCE` (relative to their modulus),
    /// and which no compaction will touch.
    pub(super) fn hold_deep_part(&mut self, top: usize) {
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

    /// Add the collected increments of the held nodes to their pressure and hoop force.
    pub(super) fn release_held(&mut self) {
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
        self.add_increment(&values, low, held);
        self.guess = values;
    }

    /// Add δσr = `values` on nodes `from..end` to their pressure and, in the conservative
    /// thin-ring form, to the hoop force: node k's r·δσr leaves ring k (the ring above node k)
    /// and enters ring k − 1 (below it). Above `end − 1` the increment is taken as zero here: at
    /// the top of the stack that is the free outer surface, at the top of the held part the
    /// solved part above has already added its share to ring `end − 1` (see [`Self::accumulate`]).
    pub(super) fn add_increment(&mut self, values: &[f64], from: usize, end: usize) {
        if from >= end {
            return;
        }
        #[cfg(target_arch = "x86_64")]
        if self.wide {
            // SAFETY: `wide` is set only when the processor reports AVX2 (`Solver::new`).
            unsafe { self.add_rings_avx2(values, from, end) };
            return;
        }
        self.add_rings(values, from, end);
    }

    /// [`Self::add_rings`] compiled for AVX2 (see [`super::wide_vectors`]).
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx2")]
    fn add_rings_avx2(&mut self, values: &[f64], from: usize, end: usize) {
        self.add_rings(values, from, end);
    }

    /// The body of [`Self::add_increment`] (`from < end`).
    #[inline(always)]
    fn add_rings(&mut self, values: &[f64], from: usize, end: usize) {
        // Rings from..end−1 lie between two nodes of the range (one pass over equal-length
        // slices, which the compiler vectorises); the top ring of the range has no flux above.
        let m = end - from - 1;
        let (r0, r1) = (&self.radius[from..end - 1], &self.radius[from + 1..end]);
        let (v0, v1) = (&values[from..end - 1], &values[from + 1..end]);
        let force = &mut self.hoop_force[from..end - 1];
        let pressure = &mut self.pressure[from..end - 1];
        for i in 0..m {
            force[i] += r1[i] * v1[i] - r0[i] * v0[i];
            pressure[i] -= v0[i];
        }
        let top = end - 1;
        self.pressure[top] -= values[top];
        self.hoop_force[top] -= self.radius[top] * values[top];
        if from > 0 {
            // The ring below the range (a skipped or held node) takes the flux through its
            // outer face.
            self.hoop_force[from - 1] += self.radius[from] * values[from];
        }
    }

    /// Add the increment in `self.shot` on `from..=top` to pressure and hoop force; `from` is
    /// the bottom of the stack or the top of the held part. A batch of wraps needs no per-wrap
    /// bookkeeping here: the increment at a node is already the sum over the wraps at or above
    /// it, and each wrap's own share is zero above its node (nothing lay there when it was
    /// laid), so the flux form of the summed increment is the sum of the wraps' flux forms.
    pub(super) fn accumulate(&mut self, from: usize, top: usize) {
        let shot = std::mem::take(&mut self.shot);
        self.add_increment(&shot, from, top + 1);
        self.shot = shot;
    }

    /// Move the first included node outward past nodes the increments no longer reach.
    pub(super) fn advance_skip(&mut self, top: usize, load: f64) {
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
