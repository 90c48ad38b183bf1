//! Hakiel's nonlinear accretion solver (per-layer and grouped resolution).

use super::{ModelError, Profile, WindingProblem};

/// Solve the finished-roll stress state.
pub fn solve(problem: &WindingProblem) -> Result<Profile, ModelError> {
    solve_with_progress(problem, &mut |_| true)
}

/// Solve, calling `progress(fraction_done)` now and then; returning `false` cancels the solve.
pub fn solve_with_progress(
    _problem: &WindingProblem,
    _progress: &mut dyn FnMut(f64) -> bool,
) -> Result<Profile, ModelError> {
    Err(ModelError::NotConverged(
        "solver not implemented yet".into(),
    ))
}
