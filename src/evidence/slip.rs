//! Where the layers would slip first: the friction torque each interface can carry,
//! μ·P(r)·2π·r² per unit width (the interlayer pressure times the friction coefficient is the
//! shear stress the interface carries; over the circumference 2πr at lever arm r it is a
//! torque), compared with where a line drawn on the roll end bends.
//!
//! The same capacity, from the core to the end of the `middle` zone, is what the diagnosis's
//! `slip_margin` indicator uses; the outer wraps are held by their own tension and left out.

use serde::{Deserialize, Serialize};

use super::measurements::{BendDirection, BendPlace, EndLine};
use crate::model::{Profile, WindingProblem, ZoneName};

/// Build fraction up to which a bend counts as "near the core" (the `core` zone and the first
/// part of `inner`); our own cut, shown in docs/evidence.md.
pub const NEAR_CORE_SHARE: f64 = 0.15;

/// Slack (share of the build) when asking whether the weakest interface lies in an observed band:
/// readings of a band's diameters off the roll end are rough.
pub const BAND_SLACK: f64 = 0.05;

/// Interfaces whose capacity is within this factor of the lowest form the weak band.
pub const WEAK_FACTOR: f64 = 1.5;

/// The line on the roll end against the computed slip capacity.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SlipComparison {
    pub observed: BendPlace,
    pub direction: Option<BendDirection>,
    /// Largest sideways offset of the line (m).
    pub offset: Option<f64>,
    /// Diameter (m) and build fraction of the interface with the lowest friction torque capacity.
    pub weakest_diameter: f64,
    pub weakest_fraction: f64,
    /// Its capacity, N·m per m of width.
    pub weakest_capacity: f64,
    /// Its capacity divided by the torque of the outer wrap's wound-in tension, W(R)·R.
    pub weakest_margin: Option<f64>,
    /// Diameters (m) of the band where the capacity is within [`WEAK_FACTOR`] of the lowest.
    pub weak_band: (f64, f64),
    /// Build fractions the observation covers (`None` for a straight line).
    pub observed_fractions: Option<(f64, f64)>,
    /// Does the bend sit where the model says slip starts? `None` for a straight line.
    pub agrees: Option<bool>,
}

/// Friction torque capacity per unit width at each node from the core to the end of the
/// `middle` zone: (radius m, N·m/m).
pub fn torque_capacity(profile: &Profile, friction: f64) -> Vec<(f64, f64)> {
    let n = profile.radius.len().min(profile.pressure.len());
    let limit = profile
        .zone(ZoneName::Middle)
        .map(|z| z.end.min(n))
        .unwrap_or(n * 3 / 4)
        .max(1)
        .min(n);
    (0..limit)
        .map(|i| {
            let r = profile.radius[i];
            (
                r,
                friction * profile.pressure[i] * 2.0 * std::f64::consts::PI * r * r,
            )
        })
        .collect()
}

/// Compare the line on the roll end with the computed capacities.
pub fn compare(
    line: &EndLine,
    problem: &WindingProblem,
    profile: &Profile,
) -> Option<SlipComparison> {
    let capacity = torque_capacity(profile, problem.winding.friction);
    let (weak_i, &(weak_r, weak_c)) = capacity
        .iter()
        .enumerate()
        .min_by(|a, b| a.1.1.total_cmp(&b.1.1))?;
    let (rc, ro) = (*profile.radius.first()?, *profile.radius.last()?);
    let build = (ro - rc).max(f64::MIN_POSITIVE);
    let fraction = |r: f64| ((r - rc) / build).clamp(0.0, 1.0);
    // The contiguous run of weak interfaces around the weakest one.
    let weak = |i: usize| capacity[i].1 <= WEAK_FACTOR * weak_c;
    let mut lo = weak_i;
    while lo > 0 && weak(lo - 1) {
        lo -= 1;
    }
    let mut hi = weak_i;
    while hi + 1 < capacity.len() && weak(hi + 1) {
        hi += 1;
    }
    let considered_end = fraction(capacity.last().map_or(ro, |c| c.0));
    let observed_fractions = match line.bend {
        BendPlace::Straight => None,
        BendPlace::NearCore => Some((0.0, NEAR_CORE_SHARE)),
        BendPlace::Band {
            from_diameter,
            to_diameter,
        } => Some((fraction(from_diameter / 2.0), fraction(to_diameter / 2.0))),
        BendPlace::Throughout => Some((0.0, 1.0)),
    };
    let weakest_fraction = fraction(weak_r);
    let agrees = observed_fractions.map(|(a, b)| match line.bend {
        // Gradual bending throughout: slip spread over the roll, which the capacity explains
        // when the weak interfaces cover at least half of the part considered.
        BendPlace::Throughout => {
            (fraction(capacity[hi].0) - fraction(capacity[lo].0)) >= 0.5 * considered_end
        }
        _ => weakest_fraction >= a - BAND_SLACK && weakest_fraction <= b + BAND_SLACK,
    });
    let applied = problem
        .winding
        .wound_in_tension(ro, problem.core_radius, problem.outer_radius)
        * ro;
    Some(SlipComparison {
        observed: line.bend,
        direction: line.direction,
        offset: line.offset,
        weakest_diameter: 2.0 * weak_r,
        weakest_fraction,
        weakest_capacity: weak_c,
        weakest_margin: (applied > 0.0).then(|| weak_c / applied),
        weak_band: (2.0 * capacity[lo].0, 2.0 * capacity[hi].0),
        observed_fractions,
        agrees,
    })
}
