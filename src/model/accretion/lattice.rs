//! The grid of grouped resolution: the per-wrap window under the surface, the batch size, and
//! the nested lattices of the graded region.

use super::{
    BATCH_DECAY_SHARE, GRADING_RATIO, WINDOW_DECAY_LENGTHS, WINDOW_MAX, WINDOW_MIN, WindingProblem,
};

/// Per-wrap window (wraps) for grouped resolution: a few decay lengths of an increment at zero
/// pressure, λ = r/√(Eθ/Er(0)), taken at the core where it is shortest.
pub(super) fn window_layers(problem: &WindingProblem) -> usize {
    let g = problem.tangential_modulus / problem.radial_stiffness.modulus_at(0.0);
    let decay = problem.core_radius / g.max(1.0).sqrt();
    let layers = (WINDOW_DECAY_LENGTHS * decay / problem.thickness).ceil();
    (layers as usize).clamp(WINDOW_MIN, WINDOW_MAX)
}

/// Per-wrap window (wraps) for a wrap at `radius` under `pressure`: a few decay lengths
/// λ = r·√(Er(P)/Eθ).
/// Never more than needed to reach elements that resolve the surface decay length, i.e. at
/// most max(λ(0), 2 elements).
pub(super) fn window_at(
    problem: &WindingProblem,
    radius: f64,
    pressure: f64,
    group: usize,
) -> usize {
    let g = problem.tangential_modulus / problem.radial_stiffness.modulus_at(pressure);
    let decay = radius / g.max(1.0).sqrt();
    let layers = (WINDOW_DECAY_LENGTHS * decay / problem.thickness).ceil() as usize;
    let cap = (window_layers(problem) / 3).max(2 * group);
    layers.min(cap).clamp(WINDOW_MIN, WINDOW_MAX)
}

/// Wraps per increment in grouped resolution at outer radius `radius` (see
/// [`BATCH_DECAY_SHARE`]); never more than a quarter of the per-wrap window or one element.
pub(super) fn batch_at(
    problem: &WindingProblem,
    radius: f64,
    window: usize,
    group: usize,
) -> usize {
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
pub(super) fn lattice_levels(group: usize) -> Vec<usize> {
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
pub(super) fn lattice_spacing(
    depth: usize,
    window: usize,
    finest: usize,
    levels: &[usize],
) -> usize {
    if depth >= window {
        return levels[0];
    }
    let allowed = (depth / GRADING_RATIO).min(finest);
    levels.iter().copied().find(|&l| l <= allowed).unwrap_or(1)
}

/// Widest node spacing (wraps) allowed anywhere in the graded region at outer radius `radius`:
/// half the decay length of an increment at zero pressure, λ(0)/2 = s/(2·√(Eθ/Er(0))), the
/// shortest it gets (Er grows with pressure).
pub(super) fn finest_spacing(problem: &WindingProblem, radius: f64) -> usize {
    let g = problem.tangential_modulus / problem.radial_stiffness.modulus_at(0.0);
    let wraps = 0.5 * radius / g.max(1.0).sqrt() / problem.thickness;
    if wraps.is_finite() && wraps >= 1.0 {
        wraps as usize
    } else {
        1
    }
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
