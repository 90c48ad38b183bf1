//! The grid policy of a solve: how many physical layers (wraps) go into one element, the grid a
//! solve actually used, and the solver's work figures. Callers ask for a [`Resolution`]; only
//! this module turns it into layers per element, so a re-solve that must be compared with an
//! earlier one asks for that solve's [`Grid::resolution`] and gets the same grid.
//!
//! * [`Resolution::PerLayer`]: one node per wrap (the reference).
//! * [`Resolution::Grouped`]: a fixed number of wraps per element.
//! * [`Resolution::Elements`]: about a given number of elements, for callers that need the shape
//!   and size of the stresses quickly (what-if comparisons, taper search, walk-throughs, tests).
//! * [`Resolution::Auto`]: per-layer up to [`PER_LAYER_LIMIT`] wraps, above it grouped with the
//!   halving check (docs/theory.md §3.4).

use super::{ModelError, Profile, Resolution, WindingProblem, accretion};

/// Auto resolution solves per-layer up to this many physical layers, grouped above it.
/// Chosen so a per-layer solve of the slowest web (soft in the machine direction, so increments
/// reach the core) stays near 10 ms; above it the grouped solve with its halving check agrees
/// with per-layer within 0.2 % on the demo rolls (docs/theory.md, docs/performance.md).
pub const PER_LAYER_LIMIT: usize = 1500;

/// Number of elements auto resolution aims for when it groups layers (its first grid).
pub const AUTO_ELEMENTS: usize = 400;

/// Number of physical layers (wraps) between the core radius and the outer radius: the build
/// divided by the caliper, rounded to the nearest wrap; 0 when that is not a positive number.
/// The one layer count of the crate (the solver, the grid policy and every caller use it).
pub fn layer_count_between(core_radius: f64, outer_radius: f64, thickness: f64) -> usize {
    let n = ((outer_radius - core_radius) / thickness).round();
    if n.is_finite() && n >= 1.0 {
        n as usize
    } else {
        0
    }
}

/// Number of physical layers of a problem (see [`layer_count_between`]).
pub fn layer_count(problem: &WindingProblem) -> usize {
    layer_count_between(problem.core_radius, problem.outer_radius, problem.thickness)
}

/// The grid a solve used.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize, serde::Deserialize)]
pub struct Grid {
    /// Physical layers per element of the deep part of the roll (1 = per-layer).
    pub layers_per_element: usize,
}

impl Grid {
    /// The resolution that solves on this grid again (a re-solve compared with this one).
    pub fn resolution(&self) -> Resolution {
        if self.layers_per_element <= 1 {
            Resolution::PerLayer
        } else {
            Resolution::Grouped {
                layers: self.layers_per_element,
            }
        }
    }

    /// True for one node per wrap.
    pub fn is_per_layer(&self) -> bool {
        self.layers_per_element <= 1
    }
}

/// What the solver did: the grid and the work. Not physics: these figures depend on the
/// resolution asked for, the profile's [`super::ProfileSummary`] does not (to the solver's
/// accuracy).
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize, serde::Deserialize)]
pub struct SolverStats {
    pub grid: Grid,
    /// Elements (nodes above the core) of the finished grid.
    pub elements: usize,
    /// Increments (load steps) and tridiagonal solves.
    pub increments: usize,
    pub solves: usize,
    /// Auto grouped resolution: relative change of core pressure when the group size was halved.
    pub group_halving_change: Option<f64>,
}

impl Resolution {
    /// Layers per element for a roll of `layers` wraps, or `None` for the automatic grouped
    /// solve with its halving check.
    fn layers_per_element(self, layers: usize) -> Result<Option<usize>, ModelError> {
        let zero = |field, accepted| ModelError::OutOfRange {
            field,
            value: 0.0,
            accepted,
        };
        match self {
            Resolution::PerLayer => Ok(Some(1)),
            Resolution::Grouped { layers: 0 } => {
                Err(zero("resolution.layers", "at least 1 layer per element"))
            }
            Resolution::Grouped { layers: group } => Ok(Some(group.min(layers).max(1))),
            Resolution::Elements { count: 0 } => {
                Err(zero("resolution.elements", "at least 1 element"))
            }
            Resolution::Elements { count } => Ok(Some(layers.div_ceil(count).max(1))),
            Resolution::Auto => Ok((layers <= PER_LAYER_LIMIT).then_some(1)),
        }
    }
}

/// Solve the finished-roll stress state.
pub fn solve(problem: &WindingProblem) -> Result<Profile, ModelError> {
    solve_with_progress(problem, &mut |_| true)
}

/// Solve, calling `progress(fraction_done)` now and then; returning `false` cancels the solve
/// (the result is then [`ModelError::Cancelled`]).
pub fn solve_with_progress(
    problem: &WindingProblem,
    progress: &mut dyn FnMut(f64) -> bool,
) -> Result<Profile, ModelError> {
    accretion::validate(problem)?;
    let layers = layer_count(problem);
    match problem.options.resolution.layers_per_element(layers)? {
        Some(group) => accretion::run(problem, layers, group, progress),
        None => solve_auto_grouped(problem, layers, progress),
    }
}

/// Grouped solve with the halving check: solve with k and k/2 layers per element; while the
/// core pressure moves by 1 % or more, halve again.
fn solve_auto_grouped(
    problem: &WindingProblem,
    layers: usize,
    progress: &mut dyn FnMut(f64) -> bool,
) -> Result<Profile, ModelError> {
    let mut group = smooth_group(layers.div_ceil(AUTO_ELEMENTS).max(2));
    let mut coarse = accretion::run(problem, layers, group, &mut |f| progress(0.3 * f))?;
    loop {
        let half = (group / 2).max(1);
        let fine = accretion::run(problem, layers, half, &mut |f| progress(0.3 + 0.7 * f))?;
        let change = relative_change(coarse.summary.core_pressure, fine.summary.core_pressure);
        let mut result = fine;
        result.solver.group_halving_change = Some(change);
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

/// The smallest element size at least `wraps` of the form 2ᵃ·b (a ≥ 1, b = 1, 3 or 5): its
/// halvings keep many divisors, so the graded region under the surface has intermediate
/// spacings (a prime size would jump from one wrap straight to the element).
fn smooth_group(wraps: usize) -> usize {
    (wraps.max(2)..)
        .find(|&n| {
            let mut odd = n;
            while odd % 2 == 0 {
                odd /= 2;
            }
            n % 2 == 0 && matches!(odd, 1 | 3 | 5)
        })
        .unwrap_or(wraps)
}

fn relative_change(a: f64, b: f64) -> f64 {
    let scale = a.abs().max(b.abs());
    if scale == 0.0 {
        0.0
    } else {
        (a - b).abs() / scale
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn smooth_group_rounds_up_to_sizes_with_halvings() {
        assert_eq!(smooth_group(2), 2);
        assert_eq!(smooth_group(7), 8);
        assert_eq!(smooth_group(13), 16);
        assert_eq!(smooth_group(17), 20);
        assert_eq!(smooth_group(29), 32);
        assert_eq!(smooth_group(40), 40);
    }

    #[test]
    fn layer_count_rounds_to_the_nearest_wrap() {
        // 0.1 m of build at 0.1 mm caliper is 1000 wraps; 0.10004 m is still 1000, 0.10006 m 1001.
        assert_eq!(layer_count_between(0.05, 0.15, 1e-4), 1000);
        assert_eq!(layer_count_between(0.05, 0.15004, 1e-4), 1000);
        assert_eq!(layer_count_between(0.05, 0.15006, 1e-4), 1001);
        assert_eq!(layer_count_between(0.05, 0.05, 1e-4), 0);
        assert_eq!(layer_count_between(0.05, 0.15, 0.0), 0);
    }

    #[test]
    fn each_resolution_has_its_grid() {
        let k = |r: Resolution, layers| r.layers_per_element(layers).unwrap();
        assert_eq!(k(Resolution::PerLayer, 5000), Some(1));
        assert_eq!(k(Resolution::Grouped { layers: 10 }, 5000), Some(10));
        assert_eq!(k(Resolution::Grouped { layers: 10 }, 4), Some(4));
        assert_eq!(k(Resolution::Elements { count: 200 }, 5000), Some(25));
        assert_eq!(k(Resolution::Elements { count: 200 }, 5001), Some(26));
        assert_eq!(k(Resolution::Elements { count: 200 }, 150), Some(1));
        assert_eq!(k(Resolution::Auto, PER_LAYER_LIMIT), Some(1));
        assert_eq!(k(Resolution::Auto, PER_LAYER_LIMIT + 1), None);
        assert!(
            Resolution::Elements { count: 0 }
                .layers_per_element(10)
                .is_err()
        );
        assert!(
            Resolution::Grouped { layers: 0 }
                .layers_per_element(10)
                .is_err()
        );
        let grid = Grid {
            layers_per_element: 16,
        };
        assert_eq!(grid.resolution(), Resolution::Grouped { layers: 16 });
        assert_eq!(Grid::default().resolution(), Resolution::PerLayer);
    }
}
