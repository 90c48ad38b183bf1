//! SVG plots for reports, drawn with plotters' SVG backend: interlayer pressure and tangential
//! stress against radius, zones shaded and labelled, the core's rated crush pressure and the zero
//! line marked, and the chosen remedy's profile overlaid.
//!
//! Text is written as SVG `<text>` elements; plotters only estimates its width (no font crates),
//! the browser picks the real font.

use plotters::prelude::*;

use super::{ReportError, ReportInput};
use crate::model::{Profile, Zone};
use crate::units::UnitSystem;

/// Plot size in SVG pixels.
pub const PLOT_SIZE: (u32, u32) = (760, 380);
/// At most this many points per curve (enough for a smooth line, keeps the file small).
const MAX_PLOT_POINTS: usize = 400;

/// Series labels, also used by tests to find the curves in the SVG.
pub const LABEL_PRESSURE: &str = "interlayer pressure";
pub const LABEL_TANGENTIAL: &str = "tangential stress";
pub const LABEL_AFTER_SUFFIX: &str = "after remedy";
pub const LABEL_CRUSH: &str = "core rated crush pressure";

const BEFORE_COLOUR: RGBColor = RGBColor(31, 88, 160);
const AFTER_COLOUR: RGBColor = RGBColor(214, 110, 0);
const CRUSH_COLOUR: RGBColor = RGBColor(170, 0, 0);
const ZONE_SHADES: [RGBColor; 2] = [RGBColor(225, 225, 225), RGBColor(245, 245, 245)];

/// Which quantity a plot shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PlotKind {
    Pressure,
    Tangential,
}

/// A unit to draw an axis in: name and how many SI units one of it is.
#[derive(Debug, Clone, Copy)]
struct AxisUnit {
    name: &'static str,
    size: f64,
}

fn length_unit(system: UnitSystem) -> AxisUnit {
    match system {
        UnitSystem::Si => AxisUnit {
            name: "mm",
            size: 1e-3,
        },
        UnitSystem::Us => AxisUnit {
            name: "in",
            size: 0.0254,
        },
    }
}

/// A readable stress unit for values up to `largest` (Pa).
fn stress_unit(largest: f64, system: UnitSystem) -> AxisUnit {
    match system {
        UnitSystem::Si if largest >= 2e6 => AxisUnit {
            name: "MPa",
            size: 1e6,
        },
        UnitSystem::Si => AxisUnit {
            name: "kPa",
            size: 1e3,
        },
        // 1 psi = 6894.757 Pa (NIST SP 811).
        UnitSystem::Us if largest >= 2e3 * 6894.757 => AxisUnit {
            name: "ksi",
            size: 6894.757e3,
        },
        UnitSystem::Us => AxisUnit {
            name: "psi",
            size: 6894.757,
        },
    }
}

/// Pressure plot of the report input (before, and after the chosen remedy if any).
pub fn pressure_svg(input: &ReportInput) -> Result<String, ReportError> {
    let after = input.remedy.as_ref().map(|r| &r.after);
    stress_svg(
        PlotKind::Pressure,
        &input.profile,
        after,
        Some(input.resolved.core.crush_pressure),
        input.units,
    )
}

/// Tangential-stress plot of the report input (before, and after the chosen remedy if any).
pub fn tangential_svg(input: &ReportInput) -> Result<String, ReportError> {
    let after = input.remedy.as_ref().map(|r| &r.after);
    stress_svg(
        PlotKind::Tangential,
        &input.profile,
        after,
        None,
        input.units,
    )
}

fn values(profile: &Profile, kind: PlotKind) -> &[f64] {
    match kind {
        PlotKind::Pressure => &profile.pressure,
        PlotKind::Tangential => &profile.tangential_stress,
    }
}

/// Points (radius, value) in axis units, thinned to at most `MAX_PLOT_POINTS`.
fn curve(profile: &Profile, kind: PlotKind, x: AxisUnit, y: AxisUnit) -> Vec<(f64, f64)> {
    let data = values(profile, kind);
    let count = profile.radius.len().min(data.len());
    let step = count.div_ceil(MAX_PLOT_POINTS).max(1);
    let mut points: Vec<(f64, f64)> = (0..count)
        .step_by(step)
        .map(|i| (profile.radius[i] / x.size, data[i] / y.size))
        .filter(|(a, b)| a.is_finite() && b.is_finite())
        .collect();
    if count > 0 && !(count - 1).is_multiple_of(step) {
        let last = count - 1;
        points.push((profile.radius[last] / x.size, data[last] / y.size));
    }
    points
}

fn plot_error(kind: PlotKind, error: impl std::fmt::Display) -> ReportError {
    ReportError::Plot {
        plot: match kind {
            PlotKind::Pressure => "pressure".to_string(),
            PlotKind::Tangential => "tangential stress".to_string(),
        },
        message: error.to_string(),
    }
}

/// Draw one plot as an SVG document string.
pub fn stress_svg(
    kind: PlotKind,
    before: &Profile,
    after: Option<&Profile>,
    crush_pressure: Option<f64>,
    units: UnitSystem,
) -> Result<String, ReportError> {
    if before.radius.is_empty() {
        return Err(ReportError::EmptyProfile);
    }
    let profiles: Vec<&Profile> = std::iter::once(before).chain(after).collect();
    let mut largest: f64 = 0.0;
    let mut smallest: f64 = 0.0;
    for p in &profiles {
        for v in values(p, kind).iter().filter(|v| v.is_finite()) {
            largest = largest.max(*v);
            smallest = smallest.min(*v);
        }
    }
    // Show the crush line only when it is on the scale of the curve (within 3× of its peak).
    let crush =
        crush_pressure.filter(|c| *c > 0.0 && c.is_finite() && *c <= 3.0 * largest.max(1.0));
    if let Some(c) = crush {
        largest = largest.max(c);
    }
    let x_unit = length_unit(units);
    let y_unit = stress_unit(largest.max(-smallest), units);
    let r_min = profiles
        .iter()
        .filter_map(|p| p.radius.first())
        .fold(f64::INFINITY, |a, b| a.min(*b))
        / x_unit.size;
    let r_max = profiles
        .iter()
        .filter_map(|p| p.radius.last())
        .fold(f64::NEG_INFINITY, |a, b| a.max(*b))
        / x_unit.size;
    let span = (largest - smallest).max(1.0) / y_unit.size;
    // Head room above the curves for the legend.
    let y_top = largest / y_unit.size + 0.3 * span;
    let y_bottom = smallest / y_unit.size - 0.05 * span;
    let x_range = if r_max > r_min {
        r_min..r_max
    } else {
        r_min..r_min + 1.0
    };

    // No caption inside the SVG: the zone names sit above the plot area and the report's
    // figure caption names the plot.
    let (quantity, label) = match kind {
        PlotKind::Pressure => ("Interlayer pressure", LABEL_PRESSURE),
        PlotKind::Tangential => ("Tangential stress", LABEL_TANGENTIAL),
    };
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, PLOT_SIZE).into_drawing_area();
        root.fill(&WHITE).map_err(|e| plot_error(kind, e))?;
        let mut chart = ChartBuilder::on(&root)
            .margin(12)
            .margin_top(26)
            .x_label_area_size(42)
            .y_label_area_size(64)
            .build_cartesian_2d(x_range, y_bottom..y_top)
            .map_err(|e| plot_error(kind, e))?;
        chart
            .configure_mesh()
            .disable_mesh()
            .label_style(("sans-serif", 15))
            .axis_desc_style(("sans-serif", 16))
            .x_desc(format!("Radius ({})", x_unit.name))
            .y_desc(format!("{quantity} ({})", y_unit.name))
            .draw()
            .map_err(|e| plot_error(kind, e))?;

        draw_zones(&mut chart, &before.zones, x_unit, y_bottom, y_top, kind)?;
        label_zones(&root, &chart, &before.zones, x_unit, y_top, kind)?;

        if kind == PlotKind::Tangential && y_bottom < 0.0 && y_top > 0.0 {
            chart
                .draw_series(std::iter::once(PathElement::new(
                    vec![(r_min, 0.0), (r_max, 0.0)],
                    BLACK.stroke_width(1),
                )))
                .map_err(|e| plot_error(kind, e))?;
        }
        if let Some(c) = crush {
            let level = c / y_unit.size;
            chart
                .draw_series(std::iter::once(PathElement::new(
                    vec![(r_min, level), (r_max, level)],
                    CRUSH_COLOUR.stroke_width(1),
                )))
                .map_err(|e| plot_error(kind, e))?
                .label(LABEL_CRUSH)
                .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], CRUSH_COLOUR));
        }

        let before_label = if after.is_some() {
            format!("{label}, before")
        } else {
            label.to_string()
        };
        chart
            .draw_series(LineSeries::new(
                curve(before, kind, x_unit, y_unit),
                BEFORE_COLOUR.stroke_width(2),
            ))
            .map_err(|e| plot_error(kind, e))?
            .label(before_label)
            .legend(|(x, y)| {
                PathElement::new(vec![(x, y), (x + 20, y)], BEFORE_COLOUR.stroke_width(2))
            });
        if let Some(after) = after {
            chart
                .draw_series(LineSeries::new(
                    curve(after, kind, x_unit, y_unit),
                    AFTER_COLOUR.stroke_width(2),
                ))
                .map_err(|e| plot_error(kind, e))?
                .label(format!("{label}, {LABEL_AFTER_SUFFIX}"))
                .legend(|(x, y)| {
                    PathElement::new(vec![(x, y), (x + 20, y)], AFTER_COLOUR.stroke_width(2))
                });
        }
        chart
            .configure_series_labels()
            .position(SeriesLabelPosition::UpperMiddle)
            .background_style(WHITE.mix(0.85))
            .border_style(BLACK)
            .label_font(("sans-serif", 16))
            .draw()
            .map_err(|e| plot_error(kind, e))?;
        root.present().map_err(|e| plot_error(kind, e))?;
    }
    Ok(svg)
}

type Chart<'a, 'b> = ChartContext<
    'a,
    SVGBackend<'b>,
    Cartesian2d<plotters::coord::types::RangedCoordf64, plotters::coord::types::RangedCoordf64>,
>;

fn draw_zones(
    chart: &mut Chart<'_, '_>,
    zones: &[Zone],
    x_unit: AxisUnit,
    y_bottom: f64,
    y_top: f64,
    kind: PlotKind,
) -> Result<(), ReportError> {
    for (index, zone) in zones.iter().enumerate() {
        let x0 = zone.inner_radius / x_unit.size;
        let x1 = zone.outer_radius / x_unit.size;
        if !(x0.is_finite() && x1.is_finite()) || x1 <= x0 {
            continue;
        }
        let shade = ZONE_SHADES[index % ZONE_SHADES.len()];
        chart
            .draw_series(std::iter::once(Rectangle::new(
                [(x0, y_bottom), (x1, y_top)],
                shade.filled(),
            )))
            .map_err(|e| plot_error(kind, e))?;
    }
    Ok(())
}

/// Zone names just above the plot area (outside it, so neither curves nor legend hide them).
fn label_zones(
    root: &DrawingArea<SVGBackend<'_>, plotters::coord::Shift>,
    chart: &Chart<'_, '_>,
    zones: &[Zone],
    x_unit: AxisUnit,
    y_top: f64,
    kind: PlotKind,
) -> Result<(), ReportError> {
    for zone in zones {
        let x0 = zone.inner_radius / x_unit.size;
        let x1 = zone.outer_radius / x_unit.size;
        if !(x0.is_finite() && x1.is_finite()) || x1 <= x0 {
            continue;
        }
        let (left, top) = chart.backend_coord(&(x0, y_top));
        root.draw(&Text::new(
            zone.name.as_str().to_string(),
            (left + 2, top - 18),
            ("sans-serif", 15).into_font().color(&BLACK),
        ))
        .map_err(|e| plot_error(kind, e))?;
    }
    Ok(())
}
