//! The measured-against-computed plot of a report: hardness readings along the radius as
//! markers over the computed interlayer pressure, against roll diameter, in the look of
//! [`super::plots`]. Drawn only when the case has hardness readings the evidence could compare.
//!
//! The scale is the one the evidence uses for its shape comparison (src/evidence/hardness.rs):
//! with a tester calibration covering every reading, readings become interlayer pressures and
//! both share a pressure axis; otherwise readings are scaled softest 0 … hardest 1 and the
//! computed pressure is scaled the same way over the same diameters (its lowest value at a
//! reading diameter 0, its highest 1), so the markers compare shapes, not sizes.

use plotters::prelude::*;

use super::plots::{
    AxisUnit, BEFORE_COLOUR, KEY_HEIGHT, KeyEntry, PLOT_SIZE, RIGHT_MARGIN, draw_key, length_unit,
    plain_mesh, stress_unit,
};
use super::{ReportError, ReportInput};
use crate::evidence::HardnessComparison;
use crate::model::Profile;

/// Key texts, also used by tests to find them in the SVG.
pub const LABEL_READINGS: &str = "● hardness readings";
pub const LABEL_COMPUTED: &str = "computed interlayer pressure";

const READING_COLOUR: RGBColor = RGBColor(170, 0, 0);
/// Points of the computed curve between the first and last reading.
const CURVE_POINTS: usize = 200;

/// The plot and the caption that says how it is scaled.
#[derive(Debug, Clone, PartialEq)]
pub struct HardnessPlot {
    pub svg: String,
    pub caption: String,
}

/// How the readings and the computed pressure share one axis.
enum Scale {
    /// Readings through the calibration; the axis is pressure in this unit.
    Calibrated(AxisUnit),
    /// Both scaled 0 … 1 over the reading diameters; computed pressure (Pa) at 0 and at 1.
    Shape { low: f64, high: f64 },
}

/// The hardness plot of the report input; `None` when the case has no comparable readings.
pub fn hardness_svg(input: &ReportInput) -> Result<Option<HardnessPlot>, ReportError> {
    hardness_series(input)?.map(draw).transpose()
}

fn plot_error(error: impl std::fmt::Display) -> ReportError {
    ReportError::Plot {
        plot: "hardness".to_string(),
        message: error.to_string(),
    }
}

fn scale_of(hardness: &HardnessComparison, units: crate::units::UnitSystem) -> Scale {
    let calibrated: Option<Vec<f64>> = hardness
        .points
        .iter()
        .map(|p| p.measured_pressure)
        .collect();
    if let Some(pressures) = calibrated {
        let largest = hardness
            .points
            .iter()
            .map(|p| p.computed_pressure)
            .chain(pressures)
            .fold(0.0f64, f64::max);
        return Scale::Calibrated(stress_unit(largest.max(1.0), units));
    }
    let computed = hardness.points.iter().map(|p| p.computed_pressure);
    let low = computed.clone().fold(f64::INFINITY, f64::min);
    let high = computed.fold(f64::NEG_INFINITY, f64::max);
    Scale::Shape { low, high }
}

/// The computed pressure in plot units; the same formula as `evidence::hardness::normalise`
/// (0.5 when the pressure has no spread over the reading diameters).
fn scaled_pressure(scale: &Scale, pressure: f64) -> f64 {
    match *scale {
        Scale::Calibrated(unit) => pressure / unit.size,
        Scale::Shape { low, high } if high > low => (pressure - low) / (high - low),
        Scale::Shape { .. } => 0.5,
    }
}

/// The readings and the computed curve on one scale, in plot units (x: roll diameter), with
/// their ranges, axis words and caption: what the SVG plot and the Markdown report's text chart
/// both draw.
pub(super) struct HardnessSeries {
    pub(super) readings: Vec<(f64, f64)>,
    pub(super) computed: Vec<(f64, f64)>,
    pub(super) x_range: std::ops::Range<f64>,
    pub(super) y_range: std::ops::Range<f64>,
    pub(super) x_unit: AxisUnit,
    pub(super) y_desc: String,
    pub(super) caption: String,
}

/// The hardness series of the report input; `None` when the case has no comparable readings.
pub(super) fn hardness_series(input: &ReportInput) -> Result<Option<HardnessSeries>, ReportError> {
    let Some(hardness) = input
        .diagnosis
        .evidence
        .as_ref()
        .and_then(|e| e.hardness.as_ref())
        .filter(|h| !h.points.is_empty())
    else {
        return Ok(None);
    };
    if input.profile.radius.is_empty() {
        return Err(ReportError::EmptyProfile);
    }
    series(hardness, &input.profile, input.units).map(Some)
}

fn series(
    hardness: &HardnessComparison,
    profile: &Profile,
    units: crate::units::UnitSystem,
) -> Result<HardnessSeries, ReportError> {
    let x_unit = length_unit(units);
    let scale = scale_of(hardness, units);
    let readings: Vec<(f64, f64)> = hardness
        .points
        .iter()
        .map(|p| {
            let y = match &scale {
                Scale::Calibrated(unit) => p.measured_pressure.unwrap_or(0.0) / unit.size,
                Scale::Shape { .. } => p.normalised_reading,
            };
            (p.diameter / x_unit.size, y)
        })
        .collect();
    let computed = computed_curve(hardness, profile, &scale, x_unit);

    let (rc, ro) = match (profile.radius.first(), profile.radius.last()) {
        (Some(a), Some(b)) if b > a => (*a, *b),
        _ => return Err(ReportError::EmptyProfile),
    };
    let x_range = 2.0 * rc / x_unit.size..2.0 * ro / x_unit.size;
    let values = readings.iter().chain(&computed).map(|p| p.1);
    let y_low = values.clone().fold(0.0f64, f64::min);
    let y_high = values.fold(1e-9f64, f64::max);
    let pad = 0.08 * (y_high - y_low);
    let y_range = match scale {
        Scale::Calibrated(_) => 0.0..y_high + pad,
        Scale::Shape { .. } => y_low - pad..y_high + pad,
    };
    let y_desc = match &scale {
        Scale::Calibrated(unit) => format!("Interlayer pressure ({})", unit.name),
        Scale::Shape { .. } => "Softest 0 … hardest 1".to_string(),
    };

    let caption = match scale {
        Scale::Calibrated(_) => "Hardness readings turned into interlayer pressure through the \
             tester calibration (points), over the computed interlayer pressure (line), against \
             roll diameter."
            .to_string(),
        Scale::Shape { .. } => "Hardness readings (points) over the computed interlayer pressure \
             (line), against roll diameter. Without a tester calibration both are scaled to \
             compare shapes: the softest reading is 0 and the hardest 1; the computed pressure \
             is 0 at its lowest and 1 at its highest value at the reading diameters, so the line \
             can leave 0 … 1 between them."
            .to_string(),
    };
    Ok(HardnessSeries {
        readings,
        computed,
        x_range,
        y_range,
        x_unit,
        y_desc,
        caption,
    })
}

/// The SVG plot of the series.
fn draw(series: HardnessSeries) -> Result<HardnessPlot, ReportError> {
    let x_unit = series.x_unit;
    let (readings, computed) = (series.readings, series.computed);
    let (x_range, y_range) = (series.x_range, series.y_range);
    let (y_desc, caption) = (series.y_desc, series.caption);
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, PLOT_SIZE).into_drawing_area();
        root.fill(&WHITE).map_err(plot_error)?;
        let (body, key_area) = root.split_vertically(PLOT_SIZE.1 - KEY_HEIGHT);
        let mut chart = ChartBuilder::on(&body)
            .margin_left(10)
            .margin_right(RIGHT_MARGIN)
            .margin_top(16)
            .margin_bottom(4)
            .x_label_area_size(44)
            .y_label_area_size(78)
            .build_cartesian_2d(x_range, y_range)
            .map_err(plot_error)?;
        plain_mesh(&mut chart.configure_mesh())
            .x_desc(format!("Roll diameter ({})", x_unit.name))
            .y_desc(y_desc)
            .draw()
            .map_err(plot_error)?;
        chart
            .draw_series(LineSeries::new(computed, BEFORE_COLOUR.stroke_width(2)))
            .map_err(plot_error)?;
        chart
            .draw_series(
                readings
                    .iter()
                    .map(|&p| Circle::new(p, 5, READING_COLOUR.filled())),
            )
            .map_err(plot_error)?;
        let key = [
            KeyEntry {
                text: LABEL_COMPUTED.to_string(),
                colour: BEFORE_COLOUR,
                dashed: false,
                marker: false,
            },
            KeyEntry {
                text: LABEL_READINGS.to_string(),
                colour: READING_COLOUR,
                dashed: false,
                marker: true,
            },
        ];
        draw_key(&key_area, &key).map_err(plot_error)?;
        root.present().map_err(plot_error)?;
    }
    Ok(HardnessPlot { svg, caption })
}

/// The computed pressure between the first and the last reading (the shape scale means
/// nothing outside them; with a calibration the same span keeps the two comparable).
fn computed_curve(
    hardness: &HardnessComparison,
    profile: &Profile,
    scale: &Scale,
    x_unit: AxisUnit,
) -> Vec<(f64, f64)> {
    let (Some(first), Some(last)) = (hardness.points.first(), hardness.points.last()) else {
        return Vec::new();
    };
    let (d0, d1) = (first.diameter, last.diameter);
    let steps = if d1 > d0 { CURVE_POINTS } else { 0 };
    (0..=steps)
        .map(|i| {
            let d = if steps == 0 {
                d0
            } else {
                d0 + (d1 - d0) * i as f64 / steps as f64
            };
            let p = Profile::interpolate(&profile.pressure, &profile.radius, d / 2.0);
            (d / x_unit.size, scaled_pressure(scale, p))
        })
        .filter(|(x, y)| x.is_finite() && y.is_finite())
        .collect()
}
