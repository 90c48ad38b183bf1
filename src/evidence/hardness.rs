//! Hardness readings against the computed pressure: the shape along the radius (rank
//! correlation after normalising, where it is soft and hard, a soft band the model does not
//! have), readings turned into pressures by the user's calibration, and the pattern across the
//! width, which the one-dimensional model cannot compute at all.

use serde::{Deserialize, Serialize};

use super::measurements::{CalibrationPoint, HardnessProfile, LaneHardness};
use crate::model::Profile;

/// A dip in the normalised readings deeper than this share of the reading range, beyond any
/// dip in the computed pressure at the same diameters, counts as a soft band. A threshold of
/// our own choosing: a quarter of the range is well above the scatter of repeated readings
/// with hand-held testers (common practice, from memory).
pub const SOFT_BAND_SHARE: f64 = 0.25;

/// Lanes within this share of the extreme (of the lane range) count as the hard or soft ones.
const LANE_EXTREME_SHARE: f64 = 0.2;

/// Spearman's rank correlation of two equally long samples (average ranks for ties; Pearson's
/// correlation of the ranks). `None` for fewer than 3 pairs or a sample without spread.
pub fn spearman(x: &[f64], y: &[f64]) -> Option<f64> {
    if x.len() != y.len() || x.len() < 3 {
        return None;
    }
    let (rx, ry) = (ranks(x), ranks(y));
    let n = rx.len() as f64;
    let (mx, my) = (rx.iter().sum::<f64>() / n, ry.iter().sum::<f64>() / n);
    let mut sxy = 0.0;
    let mut sxx = 0.0;
    let mut syy = 0.0;
    for (a, b) in rx.iter().zip(&ry) {
        sxy += (a - mx) * (b - my);
        sxx += (a - mx) * (a - mx);
        syy += (b - my) * (b - my);
    }
    (sxx > 0.0 && syy > 0.0).then(|| sxy / (sxx * syy).sqrt())
}

/// Ranks 1..n, tied values sharing their average rank.
fn ranks(values: &[f64]) -> Vec<f64> {
    let mut order: Vec<usize> = (0..values.len()).collect();
    order.sort_by(|&a, &b| values[a].total_cmp(&values[b]));
    let mut out = vec![0.0; values.len()];
    let mut i = 0;
    while i < order.len() {
        let mut j = i;
        while j + 1 < order.len() && values[order[j + 1]] == values[order[i]] {
            j += 1;
        }
        let rank = (i + j) as f64 / 2.0 + 1.0;
        for &k in &order[i..=j] {
            out[k] = rank;
        }
        i = j + 1;
    }
    out
}

/// Values scaled to 0 (lowest) … 1 (highest); all 0.5 when they have no spread.
pub fn normalise(values: &[f64]) -> Vec<f64> {
    let lo = values.iter().copied().fold(f64::INFINITY, f64::min);
    let hi = values.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    if hi > lo {
        values.iter().map(|v| (v - lo) / (hi - lo)).collect()
    } else {
        vec![0.5; values.len()]
    }
}

/// Interlayer pressure (Pa) of a tester reading through the user's calibration points (linear
/// between neighbouring points). `None` outside the calibrated range: extrapolating a tester's
/// calibration is not safe.
pub fn calibrated_pressure(points: &[CalibrationPoint], reading: f64) -> Option<f64> {
    let first = points.first()?;
    let last = points.last()?;
    if reading < first.reading || reading > last.reading {
        return None;
    }
    points.windows(2).find_map(|w| {
        let (a, b) = (w[0], w[1]);
        (reading >= a.reading && reading <= b.reading).then(|| {
            let t = (reading - a.reading) / (b.reading - a.reading);
            a.pressure + t * (b.pressure - a.pressure)
        })
    })
}

/// One reading beside the computed pressure at its diameter.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct HardnessPoint {
    /// m
    pub diameter: f64,
    /// In the tester's units.
    pub reading: f64,
    /// Computed interlayer pressure at this diameter (Pa).
    pub computed_pressure: f64,
    /// The reading through the calibration (Pa), when calibrated and inside its range.
    pub measured_pressure: Option<f64>,
    /// Hardness scaled 0 (softest reading) … 1 (hardest); computed pressure scaled the same way.
    pub normalised_reading: f64,
    pub normalised_computed: f64,
}

/// A soft band in the readings that the computed pressure does not have.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct SoftBand {
    /// m
    pub diameter: f64,
    /// Depth of the dip below the softer neighbour, share of the reading range.
    pub depth: f64,
    /// Depth of the computed pressure's dip there, same measure (0 when none).
    pub computed_depth: f64,
}

/// Readings along the radius compared with the computed pressure profile.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct HardnessComparison {
    /// By diameter, smallest first.
    pub points: Vec<HardnessPoint>,
    /// Spearman rank correlation of hardness and computed pressure (−1 … 1); `None` below 3
    /// readings.
    pub rank_correlation: Option<f64>,
    pub softest_diameter: f64,
    pub computed_softest_diameter: f64,
    pub hardest_diameter: f64,
    pub computed_hardest_diameter: f64,
    /// Deepest dip the model does not explain (excess depth), if any beyond [`SOFT_BAND_SHARE`].
    pub soft_band: Option<SoftBand>,
    /// Largest unexplained dip (share of the range, ≥ 0); `None` below 3 readings.
    pub unexplained_dip: Option<f64>,
    /// Readings left out (outside the roll), with the reason.
    pub left_out: Vec<String>,
}

/// Compare readings along the radius with the computed pressure.
pub fn compare_profile(
    hardness: &HardnessProfile,
    profile: &Profile,
) -> Option<HardnessComparison> {
    let (rc, ro) = (*profile.radius.first()?, *profile.radius.last()?);
    let mut left_out = Vec::new();
    let mut kept: Vec<(f64, f64)> = Vec::new();
    for r in &hardness.readings {
        let radius = r.diameter / 2.0;
        // Half a millimetre of slack for diameters read off a tape at the core or the outside.
        if radius < rc - 5e-4 || radius > ro + 5e-4 {
            left_out.push(format!(
                "reading {} at {:.0} mm is outside the roll ({:.0} to {:.0} mm) and was left out",
                r.value,
                r.diameter * 1e3,
                2e3 * rc,
                2e3 * ro
            ));
        } else {
            kept.push((r.diameter, r.value));
        }
    }
    kept.sort_by(|a, b| a.0.total_cmp(&b.0));
    if kept.len() < 2 {
        return None;
    }
    let sign = if hardness.higher_is_harder { 1.0 } else { -1.0 };
    let hard: Vec<f64> = kept.iter().map(|&(_, v)| sign * v).collect();
    let computed: Vec<f64> = kept
        .iter()
        .map(|&(d, _)| Profile::interpolate(&profile.pressure, &profile.radius, d / 2.0))
        .collect();
    let (nh, nc) = (normalise(&hard), normalise(&computed));
    let points: Vec<HardnessPoint> = kept
        .iter()
        .enumerate()
        .map(|(i, &(d, v))| HardnessPoint {
            diameter: d,
            reading: v,
            computed_pressure: computed[i],
            measured_pressure: calibrated_pressure(&hardness.calibration, v),
            normalised_reading: nh[i],
            normalised_computed: nc[i],
        })
        .collect();
    let arg = |v: &[f64], better: fn(f64, f64) -> bool| {
        (0..v.len()).fold(0, |b, i| if better(v[i], v[b]) { i } else { b })
    };
    let lower = |a: f64, b: f64| a < b;
    let higher = |a: f64, b: f64| a > b;
    let dip = |v: &[f64], i: usize| (v[i - 1].min(v[i + 1]) - v[i]).max(0.0);
    let mut soft_band: Option<SoftBand> = None;
    let mut unexplained: Option<f64> = None;
    for (i, &(diameter, _)) in kept
        .iter()
        .enumerate()
        .take(kept.len().saturating_sub(1))
        .skip(1)
    {
        let (depth, computed_depth) = (dip(&nh, i), dip(&nc, i));
        let excess = (depth - computed_depth).max(0.0);
        unexplained = Some(unexplained.map_or(excess, |u: f64| u.max(excess)));
        if excess > SOFT_BAND_SHARE && soft_band.is_none_or(|b| excess > b.depth - b.computed_depth)
        {
            soft_band = Some(SoftBand {
                diameter,
                depth,
                computed_depth,
            });
        }
    }
    Some(HardnessComparison {
        rank_correlation: spearman(&hard, &computed),
        softest_diameter: kept[arg(&hard, lower)].0,
        computed_softest_diameter: kept[arg(&computed, lower)].0,
        hardest_diameter: kept[arg(&hard, higher)].0,
        computed_hardest_diameter: kept[arg(&computed, higher)].0,
        soft_band,
        unexplained_dip: unexplained,
        points,
        left_out,
    })
}

/// Hardness across the width.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct LaneComparison {
    /// (lane, reading), by lane.
    pub readings: Vec<(u32, f64)>,
    pub mean: f64,
    /// (hardest − softest) / |mean| of the readings, as read (a share).
    pub spread: f64,
    pub hard_lanes: Vec<u32>,
    pub soft_lanes: Vec<u32>,
    /// Both edge lanes harder than every inner lane.
    pub hard_edges: bool,
}

/// Summarise the lane readings. The one-dimensional model computes one pressure for the whole
/// width, so there is nothing computed to compare with: the spread itself is the evidence.
pub fn compare_lanes(lanes: &LaneHardness) -> Option<LaneComparison> {
    let mut readings: Vec<(u32, f64)> = lanes.readings.iter().map(|r| (r.lane, r.value)).collect();
    readings.sort_by_key(|r| r.0);
    if readings.len() < 2 {
        return None;
    }
    let sign = if lanes.higher_is_harder { 1.0 } else { -1.0 };
    let hard: Vec<f64> = readings.iter().map(|r| sign * r.1).collect();
    let mean = readings.iter().map(|r| r.1).sum::<f64>() / readings.len() as f64;
    let lo = hard.iter().copied().fold(f64::INFINITY, f64::min);
    let hi = hard.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let range = hi - lo;
    let spread = if mean.abs() > 0.0 {
        range / mean.abs()
    } else {
        0.0
    };
    let pick = |near: f64| -> Vec<u32> {
        if range <= 0.0 {
            return Vec::new();
        }
        readings
            .iter()
            .zip(&hard)
            .filter(|(_, h)| (*h - near).abs() <= LANE_EXTREME_SHARE * range)
            .map(|(r, _)| r.0)
            .collect()
    };
    let inner_max = hard[1..hard.len() - 1]
        .iter()
        .copied()
        .fold(f64::NEG_INFINITY, f64::max);
    let hard_edges = hard.len() >= 3 && hard[0] > inner_max && hard[hard.len() - 1] > inner_max;
    Some(LaneComparison {
        hard_lanes: pick(hi),
        soft_lanes: pick(lo),
        readings,
        mean,
        spread,
        hard_edges,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn spearman_matches_hand_ranks() {
        // Perfect monotone → 1; reversed → −1 (definition of the rank correlation).
        assert_eq!(spearman(&[1.0, 2.0, 3.0], &[10.0, 20.0, 40.0]), Some(1.0));
        assert_eq!(spearman(&[1.0, 2.0, 3.0], &[5.0, 4.0, 1.0]), Some(-1.0));
        // Hand-checked without ties: ranks (1,2,3,4,5) vs (2,1,4,3,5): Σd² = 4,
        // ρ = 1 − 6·4/(5·24) = 0.8 (Spearman's formula for untied ranks).
        let r = spearman(&[1.0, 2.0, 3.0, 4.0, 5.0], &[2.0, 1.0, 4.0, 3.0, 5.0]).unwrap();
        assert!((r - 0.8).abs() < 1e-12);
        assert_eq!(spearman(&[1.0, 1.0, 1.0], &[1.0, 2.0, 3.0]), None);
    }

    #[test]
    fn calibration_interpolates_inside_its_range_only() {
        let points = [
            CalibrationPoint {
                reading: 40.0,
                pressure: 50e3,
            },
            CalibrationPoint {
                reading: 60.0,
                pressure: 250e3,
            },
        ];
        assert_eq!(calibrated_pressure(&points, 50.0), Some(150e3));
        assert_eq!(calibrated_pressure(&points, 70.0), None);
    }
}
