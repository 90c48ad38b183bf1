//! The work budget of the taper search. The search solves the roll a few hundred times; each
//! solve costs about one pass over the wraps plus the node work of its increments, so on a very
//! large roll (hundreds of thousands of wraps) the search would run for minutes. The budget is
//! checked before the search starts (the least work any search needs) and charged before every
//! solve, so a design either finishes within it or ends at once with a message saying why.

use crate::model::Resolution;
use crate::model::grid::{AUTO_ELEMENTS, PER_LAYER_LIMIT};

use super::TaperError;

/// Default budget in wrap-steps (see [`solve_work`]): about 10 s of one core on the machines
/// the project is tested on (measured: a 120-element search solve of a 436,000-wrap roll costs
/// about 0.14 s, so about 0.3 µs per wrap-step). The demo cases use at most a quarter of it
/// (9.9 million, `cargo test --release --test taper demo_case_work -- --ignored --nocapture`).
pub const DEFAULT_WORK_BUDGET: u64 = 40_000_000;

/// Work of one solve of a roll of `layers` wraps, in wrap-steps: one pass over the wraps (the
/// wound-in tension and air film of every wrap) plus about elements² node updates (each
/// increment solves the nodes below it). Automatic resolution above the per-layer limit is
/// counted as its first two grids; its halving check can add more, which the charge after the
/// fact does not see, so the estimate is a lower bound there.
pub fn solve_work(layers: usize, resolution: Resolution) -> u64 {
    let layers = layers.max(1) as u64;
    let elements = |per_element: u64| layers.div_ceil(per_element.max(1));
    let grid = |e: u64| layers + e.saturating_mul(e);
    match resolution {
        Resolution::PerLayer => grid(layers),
        Resolution::Grouped { layers: group } => grid(elements(group as u64)),
        Resolution::Elements { count } => grid(elements(layers.div_ceil((count as u64).max(1)))),
        Resolution::Auto if layers <= PER_LAYER_LIMIT as u64 => grid(layers),
        Resolution::Auto => {
            let coarse = (AUTO_ELEMENTS as u64).min(layers);
            grid(coarse) + grid((2 * coarse).min(layers))
        }
    }
}

/// The running account of one design.
#[derive(Debug, Clone, Copy)]
pub(super) struct Budget {
    pub limit: u64,
    pub used: u64,
    pub layers: usize,
    /// Work of one search solve and of one verification solve.
    pub search: u64,
    pub verify: u64,
}

impl Budget {
    pub fn new(limit: u64, layers: usize, search: Resolution, verify: Resolution) -> Budget {
        Budget {
            limit,
            used: 0,
            layers,
            search: solve_work(layers, search),
            verify: solve_work(layers, verify),
        }
    }

    /// The least work any search needs: the current schedule at both resolutions, the grid of
    /// `grid_trials` search solves, and one verified candidate (at both resolutions).
    pub fn least_needed(&self, grid_trials: usize) -> u64 {
        2 * self.verify + (grid_trials as u64 + 2) * self.search
    }

    /// The work of a typical search: about 300 search solves and 8 verification solves (the
    /// demo cases that need a search use 280 to 330 solves).
    pub fn typical_needed(&self) -> u64 {
        8 * self.verify + 300 * self.search
    }

    /// Refuse at once when even the least search does not fit.
    pub fn check_start(
        &self,
        grid_trials: usize,
        search: Resolution,
        verify: Resolution,
    ) -> Result<(), TaperError> {
        let needed = self.least_needed(grid_trials);
        if needed <= self.limit {
            return Ok(());
        }
        // The largest roll (in wraps) a typical search fits in, for the message.
        let fits = |layers: usize| {
            Budget::new(self.limit, layers, search, verify).typical_needed() <= self.limit
        };
        let (mut low, mut high) = (1usize, self.layers);
        while high - low > 1 {
            let mid = low + (high - low) / 2;
            if fits(mid) { low = mid } else { high = mid }
        }
        Err(TaperError::OverBudget {
            wraps: self.layers,
            needed: needed.div_ceil(1_000_000),
            budget: self.limit / 1_000_000,
            largest_wraps: low,
        })
    }

    /// Charge one solve; false (and nothing charged) when it would exceed the budget.
    pub fn charge(&mut self, work: u64) -> bool {
        match self.used.checked_add(work) {
            Some(total) if total <= self.limit => {
                self.used = total;
                true
            }
            _ => false,
        }
    }

    /// The error of a search that ran out of budget before it settled, with the solves made.
    pub fn exhausted(&self, done: SolveCount) -> TaperError {
        TaperError::BudgetUsedUp {
            wraps: self.layers,
            done,
            budget: self.limit as f64 / 1e6,
        }
    }
}

/// The solves a design has made, by kind: what the budget paid for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct SolveCount {
    /// Searched schedules solved on the search grid (those that failed to solve included).
    pub searched: usize,
    /// Schedules checked on the verification grid: the current one, each verified candidate, a
    /// chosen fallback.
    pub checks: usize,
    /// Re-solves on the search grid of the current schedule and of each verified candidate, to
    /// correct the search for its coarser grid.
    pub corrections: usize,
}

impl SolveCount {
    pub fn total(&self) -> usize {
        self.searched + self.checks + self.corrections
    }
}

impl std::fmt::Display for SolveCount {
    /// "195 solves: 193 searched schedules, 1 check on the fine grid, 1 re-solve for the grid
    /// corrections".
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        let plural =
            |n: usize, one: &str, many: &str| format!("{n} {}", if n == 1 { one } else { many });
        write!(
            f,
            "{}: {}, {} on the fine grid, {} for the grid corrections",
            plural(self.total(), "solve", "solves"),
            plural(self.searched, "searched schedule", "searched schedules"),
            plural(self.checks, "check", "checks"),
            plural(self.corrections, "re-solve", "re-solves"),
        )
    }
}
