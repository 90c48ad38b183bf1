//! What the stack keeps between increments: adding an increment to pressure and hoop stress,
//! the held deep part, the skipped decayed part and the compaction of the graded region.

use super::{HOLD_INCREMENTS, HOLD_TOLERANCE, SKIP_THRESHOLD, Solver};

impl Solver {
    /// Drop the nodes at or above `from` that are neither permanent nor wanted by `keep` (called
    /// with the node's wrap number); the finite-difference rows around them are rebuilt.
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

    /// Add the collected increments of the held nodes to their pressure and tangential stress.
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
        self.add_increment(&values, low, held, held);
        self.guess = values;
    }

    /// Add δσr = `values` to the pressure of nodes `from..pressure_end` and δσθ = δσr + r·δσr'
    /// to the tangential stress of nodes `from..hoop_end` (the stencil reads `values` one node
    /// further out). At the bottom of the solved stack the core condition r·δσr' = c·δσr, or a
    /// zero value below the first included node, stands in for the missing neighbour.
    pub(super) fn add_increment(
        &mut self,
        values: &[f64],
        from: usize,
        pressure_end: usize,
        hoop_end: usize,
    ) {
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
    pub(super) fn accumulate(&mut self, from: usize, top: usize) {
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
