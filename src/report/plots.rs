//! SVG plots for reports, drawn with plotters' SVG backend in a look of our own: interlayer
//! pressure and tangential stress against roll diameter (what an operator measures), zones
//! shaded and named above the plot in staggered rows so names never run into each other, the
//! core's rated crush pressure marked only at the core (and flagged when it is off the scale),
//! compression drawn in its own panel on its own scale, the chosen remedy's profile dashed.
//!
//! No framed legend over the data: a plot with one curve has none (the axis names it); with more
//! a plain key sits under the plot. Tick labels carry no needless ".0", and the right margin
//! leaves room for the last one.
//!
//! Text is written as SVG `<text>` elements; plotters only estimates its width (no font crates),
//! the browser picks the real font, so widths here are estimates with room to spare.

use plotters::chart::MeshStyle;
use plotters::coord::Shift;
use plotters::coord::types::RangedCoordf64;
use plotters::prelude::*;

use super::{ReportError, ReportInput};
use crate::model::{Profile, Zone};
use crate::units::UnitSystem;

/// Plot size in SVG pixels (the tangential plot is taller when it has a compression panel).
pub const PLOT_SIZE: (u32, u32) = (760, 400);
const SPLIT_PLOT_HEIGHT: u32 = 520;
/// At most this many points per curve (enough for a smooth line, keeps the file small).
const MAX_PLOT_POINTS: usize = 400;

/// Series labels in the key, also used by tests to find them in the SVG.
pub const LABEL_AFTER_SUFFIX: &str = "after remedy";
pub const LABEL_CRUSH: &str = "core rated crush pressure";
/// The flag written when the crush rating is above the plotted range.
pub const LABEL_CRUSH_OFF_SCALE: &str = "off scale";
/// The note written when no layer is in tangential compression.
pub const LABEL_NO_COMPRESSION: &str = "no layer is in tangential compression";

pub(super) const BEFORE_COLOUR: RGBColor = RGBColor(31, 88, 160);
const AFTER_COLOUR: RGBColor = RGBColor(214, 110, 0);
const CRUSH_COLOUR: RGBColor = RGBColor(170, 0, 0);
pub(super) const AXIS_COLOUR: RGBColor = RGBColor(90, 90, 90);
const ZONE_SHADES: [RGBColor; 2] = [RGBColor(228, 228, 228), RGBColor(246, 246, 246)];

pub(super) const FONT: &str = "sans-serif";
pub(super) const TICK_FONT: u32 = 14;
pub(super) const DESC_FONT: u32 = 15;
const ZONE_FONT: u32 = 13;
/// Rows of zone names above the plot, and the height of one.
const ZONE_ROWS: i32 = 3;
const ZONE_ROW_HEIGHT: i32 = 15;
/// Room for the key under the plot (two rows at most).
pub(super) const KEY_HEIGHT: u32 = 40;
const KEY_ROW_HEIGHT: i32 = 18;
/// Room right of the plot so the last tick label is not cut off.
pub(super) const RIGHT_MARGIN: u32 = 30;

/// Which quantity a plot shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PlotKind {
    Pressure,
    Tangential,
}

/// A unit to draw an axis in: name and how many SI units one of it is.
#[derive(Debug, Clone, Copy)]
pub(super) struct AxisUnit {
    pub(super) name: &'static str,
    pub(super) size: f64,
}

pub(super) fn length_unit(system: UnitSystem) -> AxisUnit {
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
pub(super) fn stress_unit(largest: f64, system: UnitSystem) -> AxisUnit {
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

/// The plots' axes: no grid, grey axes and tick labels in the plots' fonts, tick labels
/// without needless zeros, about 8 ticks across and 6 up.
pub(super) fn plain_mesh<'m, 'a, 'b, DB: DrawingBackend>(
    mesh: &'m mut MeshStyle<'a, 'b, RangedCoordf64, RangedCoordf64, DB>,
) -> &'m mut MeshStyle<'a, 'b, RangedCoordf64, RangedCoordf64, DB> {
    mesh.disable_mesh()
        .axis_style(AXIS_COLOUR)
        .label_style((FONT, TICK_FONT).into_font().color(&AXIS_COLOUR))
        .axis_desc_style((FONT, DESC_FONT))
        .x_label_formatter(&tick_text)
        .y_label_formatter(&tick_text)
        .x_labels(8)
        .y_labels(6)
}

fn tick_text(value: &f64) -> String {
    tick_label(*value)
}

/// A tick label without needless zeros: 250 not 250.0, 0.5 not 0.50, never "-0".
pub fn tick_label(value: f64) -> String {
    if !value.is_finite() {
        return String::new();
    }
    let magnitude = value.abs();
    let decimals = if magnitude >= 100.0 {
        0
    } else if magnitude >= 10.0 {
        1
    } else if magnitude >= 1.0 {
        2
    } else {
        4
    };
    let text = format!("{value:.decimals$}");
    let text = if text.contains('.') {
        text.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        text
    };
    if text == "-0" { "0".to_string() } else { text }
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

/// Points (diameter, value) in axis units, thinned to at most `MAX_PLOT_POINTS`.
fn curve(profile: &Profile, kind: PlotKind, x: AxisUnit, y: AxisUnit) -> Vec<(f64, f64)> {
    let data = values(profile, kind);
    let count = profile.radius.len().min(data.len());
    let step = count.div_ceil(MAX_PLOT_POINTS).max(1);
    let point = |i: usize| (2.0 * profile.radius[i] / x.size, data[i] / y.size);
    let mut points: Vec<(f64, f64)> = (0..count)
        .step_by(step)
        .map(point)
        .filter(|(a, b)| a.is_finite() && b.is_finite())
        .collect();
    if count > 0 && !(count - 1).is_multiple_of(step) {
        points.push(point(count - 1));
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

/// One panel of a plot: its value range (SI), unit, axis name and which side of zero it shows.
struct Panel {
    low: f64,
    high: f64,
    unit: AxisUnit,
    name: String,
    /// Values are clamped to this side of zero (the other panel shows the rest).
    side: Side,
}

#[derive(Clone, Copy, PartialEq)]
enum Side {
    Both,
    Tension,
    Compression,
}

/// What goes on every panel: the curves, the zones and the x axis.
struct Frame<'a> {
    kind: PlotKind,
    before: &'a Profile,
    after: Option<&'a Profile>,
    x_unit: AxisUnit,
    x_range: std::ops::Range<f64>,
}

/// One entry of the key under the plot.
pub(super) struct KeyEntry {
    pub(super) text: String,
    pub(super) colour: RGBColor,
    pub(super) dashed: bool,
    pub(super) marker: bool,
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
    let (largest, smallest) = value_extremes(&profiles, kind);
    let x_unit = length_unit(units);
    let frame = Frame {
        kind,
        before,
        after,
        x_unit,
        x_range: diameter_range(&profiles, x_unit),
    };

    // The crush rating applies at the core only; it widens the scale when it is within half as
    // much again of the peak, and is flagged at the top edge when it is further off.
    let rating = crush_pressure.filter(|c| *c > 0.0 && c.is_finite());
    let crush = Crush {
        rating,
        on_scale: rating.filter(|c| *c <= 1.5 * largest.max(f64::MIN_POSITIVE)),
    };
    let panels = match kind {
        PlotKind::Pressure => {
            let top = largest.max(crush.on_scale.unwrap_or(0.0)).max(1.0);
            vec![Panel {
                low: 0.0,
                high: top * 1.1,
                unit: stress_unit(top, units),
                name: "Interlayer pressure".to_string(),
                side: Side::Both,
            }]
        }
        PlotKind::Tangential => tangential_panels(largest, smallest, units),
    };
    let key = plot_key(kind, after.is_some(), &crush, smallest, units);
    draw_plot(&frame, &panels, &key, &crush)
}

/// The core's rated crush pressure (when given and positive) and, when it fits the scale, the
/// same value to draw as a bar at the core.
struct Crush {
    rating: Option<f64>,
    on_scale: Option<f64>,
}

/// Largest value (at least 0) and smallest value (at most 0) of the finite values plotted.
fn value_extremes(profiles: &[&Profile], kind: PlotKind) -> (f64, f64) {
    let (mut largest, mut smallest) = (0.0f64, 0.0f64);
    for p in profiles {
        for v in values(p, kind).iter().filter(|v| v.is_finite()) {
            largest = largest.max(*v);
            smallest = smallest.min(*v);
        }
    }
    (largest, smallest)
}

/// The diameter axis: from the smallest core to the largest roll of the profiles, in `x_unit`.
fn diameter_range(profiles: &[&Profile], x_unit: AxisUnit) -> std::ops::Range<f64> {
    let d_min = profiles
        .iter()
        .filter_map(|p| p.radius.first())
        .fold(f64::INFINITY, |a, b| a.min(*b))
        * 2.0
        / x_unit.size;
    let d_max = profiles
        .iter()
        .filter_map(|p| p.radius.last())
        .fold(f64::NEG_INFINITY, |a, b| a.max(*b))
        * 2.0
        / x_unit.size;
    if d_max > d_min && d_min.is_finite() && d_max.is_finite() {
        d_min..d_max
    } else {
        d_min..d_min + 1.0
    }
}

/// The key under the plot. The axis names the quantity; the key only tells the curves apart,
/// gives the crush rating and says when no layer is in compression.
fn plot_key(
    kind: PlotKind,
    with_after: bool,
    crush: &Crush,
    smallest: f64,
    units: UnitSystem,
) -> Vec<KeyEntry> {
    let mut key: Vec<KeyEntry> = Vec::new();
    if with_after {
        key.push(KeyEntry {
            text: "before".to_string(),
            colour: BEFORE_COLOUR,
            dashed: false,
            marker: false,
        });
        key.push(KeyEntry {
            text: LABEL_AFTER_SUFFIX.to_string(),
            colour: AFTER_COLOUR,
            dashed: true,
            marker: false,
        });
    }
    if kind == PlotKind::Pressure
        && let Some(c) = crush.rating
    {
        let unit = stress_unit(c, units);
        let value = format!("{} {}", tick_label(c / unit.size), unit.name);
        let text = if crush.on_scale.is_some() {
            format!("{LABEL_CRUSH} {value} (bar at the core)")
        } else {
            format!("▲ {LABEL_CRUSH} {value}, {LABEL_CRUSH_OFF_SCALE} (above the top of the plot)")
        };
        key.push(KeyEntry {
            text,
            colour: CRUSH_COLOUR,
            dashed: false,
            marker: crush.on_scale.is_none(),
        });
    }
    if kind == PlotKind::Tangential && smallest >= 0.0 {
        key.push(KeyEntry {
            text: LABEL_NO_COMPRESSION.to_string(),
            colour: AXIS_COLOUR,
            dashed: false,
            marker: true,
        });
    }
    key
}

/// Lays out the panels (stacked when there are two) and the key, and writes the SVG.
fn draw_plot(
    frame: &Frame<'_>,
    panels: &[Panel],
    key: &[KeyEntry],
    crush: &Crush,
) -> Result<String, ReportError> {
    let kind = frame.kind;
    let height = if panels.len() > 1 {
        SPLIT_PLOT_HEIGHT
    } else {
        PLOT_SIZE.1
    };
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (PLOT_SIZE.0, height)).into_drawing_area();
        root.fill(&WHITE).map_err(|e| plot_error(kind, e))?;
        let body_height = height - KEY_HEIGHT;
        let (body, key_area) = root.split_vertically(body_height);
        let top_room = (ZONE_ROWS * ZONE_ROW_HEIGHT + 8) as u32;
        let areas: Vec<DrawingArea<SVGBackend<'_>, Shift>> = if panels.len() > 1 {
            // The tension panel gets the larger share; compression is usually the smaller story
            // in size, not in importance, and has its own scale.
            let split = top_room + (body_height - top_room) * 55 / 100;
            let (upper, lower) = body.split_vertically(split);
            vec![upper, lower]
        } else {
            vec![body]
        };
        let last = panels.len() - 1;
        for (index, (panel, area)) in panels.iter().zip(&areas).enumerate() {
            let options = PanelOptions {
                zone_names: index == 0,
                x_axis: index == last,
                // A gap between the panels keeps their two zero labels apart.
                top_room: if index == 0 { top_room } else { 14 },
                crush: crush
                    .on_scale
                    .filter(|_| index == 0 && kind == PlotKind::Pressure),
                crush_flag: crush.rating.is_some() && crush.on_scale.is_none() && index == 0,
            };
            draw_panel(&root, area, frame, panel, &options)?;
        }
        draw_key(&key_area, key).map_err(|e| plot_error(kind, e))?;
        root.present().map_err(|e| plot_error(kind, e))?;
    }
    Ok(svg)
}

/// The tension panel and, when any layer is in compression, a compression panel with its own
/// scale (a compression of a few kPa under a tension of tens of MPa would otherwise be a flat
/// line on zero).
fn tangential_panels(largest: f64, smallest: f64, units: UnitSystem) -> Vec<Panel> {
    let tension = Panel {
        low: 0.0,
        high: largest.max(1.0) * 1.1,
        unit: stress_unit(largest.max(1.0), units),
        name: "Tension".to_string(),
        side: Side::Tension,
    };
    let compression = Panel {
        low: smallest.min(-1.0) * 1.1,
        high: 0.0,
        unit: stress_unit(-smallest.min(-1.0), units),
        name: "Compression".to_string(),
        side: Side::Compression,
    };
    match (largest > 0.0, smallest < 0.0) {
        (true, true) => vec![tension, compression],
        (false, true) => vec![compression],
        _ => vec![Panel {
            name: "Tangential stress".to_string(),
            ..tension
        }],
    }
}

struct PanelOptions {
    zone_names: bool,
    x_axis: bool,
    top_room: u32,
    crush: Option<f64>,
    crush_flag: bool,
}

type Chart<'a, 'b> = ChartContext<'a, SVGBackend<'b>, Cartesian2d<RangedCoordf64, RangedCoordf64>>;

fn draw_panel(
    root: &DrawingArea<SVGBackend<'_>, Shift>,
    area: &DrawingArea<SVGBackend<'_>, Shift>,
    frame: &Frame<'_>,
    panel: &Panel,
    options: &PanelOptions,
) -> Result<(), ReportError> {
    let kind = frame.kind;
    let err = |e: &dyn std::fmt::Display| plot_error(kind, e);
    let y = panel.unit;
    let (y_low, y_high) = (panel.low / y.size, panel.high / y.size);
    let y_range = if y_high > y_low {
        y_low..y_high
    } else {
        y_low..y_low + 1.0
    };
    let mut chart = ChartBuilder::on(area)
        .margin_left(10)
        .margin_right(RIGHT_MARGIN)
        .margin_top(options.top_room)
        .margin_bottom(4)
        .x_label_area_size(if options.x_axis { 44 } else { 0 })
        .y_label_area_size(78)
        .build_cartesian_2d(frame.x_range.clone(), y_range.clone())
        .map_err(|e| err(&e))?;
    let x_desc = format!("Roll diameter ({})", frame.x_unit.name);
    let y_desc = format!("{} ({})", panel.name, y.name);
    let mut mesh = chart.configure_mesh();
    plain_mesh(&mut mesh).y_desc(y_desc);
    if options.x_axis {
        mesh.x_desc(x_desc);
    } else {
        mesh.x_labels(0);
    }
    mesh.draw().map_err(|e| err(&e))?;

    let zones = &frame.before.zones;
    for (index, zone) in zones.iter().enumerate() {
        let Some((x0, x1)) = zone_span(zone, frame.x_unit) else {
            continue;
        };
        let shade = ZONE_SHADES[index % ZONE_SHADES.len()];
        chart
            .draw_series(std::iter::once(Rectangle::new(
                [(x0, y_range.start), (x1, y_range.end)],
                shade.filled(),
            )))
            .map_err(|e| err(&e))?;
    }
    if options.zone_names {
        label_zones(root, &chart, zones, frame.x_unit, y_range.end).map_err(|e| err(&e))?;
    }

    draw_curves(&mut chart, frame, panel)?;

    let core_x = frame.x_range.start;
    let span = frame.x_range.end - frame.x_range.start;
    if let Some(c) = options.crush {
        // A short bar at the core, where the rating applies, not a line across the roll.
        let level = c / y.size;
        chart
            .draw_series(std::iter::once(PathElement::new(
                vec![(core_x, level), (core_x + 0.06 * span, level)],
                CRUSH_COLOUR.stroke_width(3),
            )))
            .map_err(|e| err(&e))?;
    }
    if options.crush_flag {
        let (px, py) = chart.backend_coord(&(core_x, y_range.end));
        root.draw(&Polygon::new(
            vec![(px + 4, py + 12), (px + 10, py + 2), (px + 16, py + 12)],
            CRUSH_COLOUR.filled(),
        ))
        .map_err(|e| err(&e))?;
    }
    Ok(())
}

/// The case's curve (solid) and the remedy's (dashed), each kept to the panel's side of zero.
fn draw_curves(
    chart: &mut Chart<'_, '_>,
    frame: &Frame<'_>,
    panel: &Panel,
) -> Result<(), ReportError> {
    let kind = frame.kind;
    let clamp = |points: Vec<(f64, f64)>| -> Vec<(f64, f64)> {
        points
            .into_iter()
            .map(|(x, v)| match panel.side {
                Side::Both => (x, v),
                Side::Tension => (x, v.max(0.0)),
                Side::Compression => (x, v.min(0.0)),
            })
            .collect()
    };
    let before = clamp(curve(frame.before, kind, frame.x_unit, panel.unit));
    chart
        .draw_series(LineSeries::new(before, BEFORE_COLOUR.stroke_width(2)))
        .map_err(|e| plot_error(kind, e))?;
    if let Some(after) = frame.after {
        let points = clamp(curve(after, kind, frame.x_unit, panel.unit));
        chart
            .draw_series(DashedLineSeries::new(
                points,
                9,
                5,
                AFTER_COLOUR.stroke_width(2),
            ))
            .map_err(|e| plot_error(kind, e))?;
    }
    Ok(())
}

/// A zone's span on the diameter axis, when it has one.
fn zone_span(zone: &Zone, x_unit: AxisUnit) -> Option<(f64, f64)> {
    let x0 = 2.0 * zone.inner_radius / x_unit.size;
    let x1 = 2.0 * zone.outer_radius / x_unit.size;
    (x0.is_finite() && x1.is_finite() && x1 > x0).then_some((x0, x1))
}

/// Estimated width of a text in pixels (no font metrics). The SVG backend writes a font of
/// nominal size `size` at about 0.81 of it, and sans-serif glyphs average about 0.6 em: 0.5 of
/// the nominal size per character, with room to spare.
fn text_width(text: &str, size: u32) -> i32 {
    (text.chars().count() as f64 * f64::from(size) * 0.5).ceil() as i32
}

/// Zone names above the plot area, each centred over its zone; a name that would run into the
/// one before it goes one row up, so narrow zones (core, surface) keep readable names.
fn label_zones(
    root: &DrawingArea<SVGBackend<'_>, Shift>,
    chart: &Chart<'_, '_>,
    zones: &[Zone],
    x_unit: AxisUnit,
    y_top: f64,
) -> Result<(), DrawingAreaErrorKind<std::io::Error>> {
    let (plot_left, plot_right) = {
        let range = chart.plotting_area().get_pixel_range();
        (range.0.start, range.0.end)
    };
    // Right end of the last name placed in each row.
    let mut row_end = [i32::MIN; ZONE_ROWS as usize];
    for zone in zones {
        let Some((x0, x1)) = zone_span(zone, x_unit) else {
            continue;
        };
        let name = zone.name.as_str();
        let width = text_width(name, ZONE_FONT);
        let (left, top) = chart.backend_coord(&(x0, y_top));
        let (right, _) = chart.backend_coord(&(x1, y_top));
        let centre = (left + right) / 2;
        let start = (centre - width / 2).clamp(plot_left, (plot_right - width).max(plot_left));
        let row = (0..ZONE_ROWS as usize)
            .find(|&r| row_end[r] + 6 <= start)
            .unwrap_or(ZONE_ROWS as usize - 1);
        row_end[row] = start + width;
        let baseline = top - 4 - ZONE_ROW_HEIGHT * row as i32;
        root.draw(&Text::new(
            name.to_string(),
            (start, baseline - ZONE_FONT as i32),
            (FONT, ZONE_FONT).into_font().color(&BLACK),
        ))?;
        if row > 0 {
            // A thin tick from a raised name down to its zone.
            root.draw(&PathElement::new(
                vec![(centre, baseline + 2), (centre, top)],
                AXIS_COLOUR.stroke_width(1),
            ))?;
        }
    }
    Ok(())
}

/// The key under the plot: a short sample of each line and its text, no frame; an entry that
/// would run past the right edge starts a second row.
pub(super) fn draw_key(
    area: &DrawingArea<SVGBackend<'_>, Shift>,
    key: &[KeyEntry],
) -> Result<(), DrawingAreaErrorKind<std::io::Error>> {
    const LEFT: i32 = 90;
    let right = PLOT_SIZE.0 as i32 - RIGHT_MARGIN as i32;
    let (mut x, mut y) = (LEFT, 6);
    for entry in key {
        let sample = if entry.marker { 0 } else { 30 };
        let width = sample + text_width(&entry.text, TICK_FONT);
        if x > LEFT && x + width > right {
            (x, y) = (LEFT, y + KEY_ROW_HEIGHT);
        }
        if !entry.marker {
            let pieces: Vec<(i32, i32)> = if entry.dashed {
                vec![(x, x + 9), (x + 14, x + 24)]
            } else {
                vec![(x, x + 24)]
            };
            for (from, to) in pieces {
                area.draw(&PathElement::new(
                    vec![(from, y + 7), (to, y + 7)],
                    entry.colour.stroke_width(2),
                ))?;
            }
        }
        let colour = if entry.marker { entry.colour } else { BLACK };
        area.draw(&Text::new(
            entry.text.clone(),
            (x + sample, y - 1),
            (FONT, TICK_FONT).into_font().color(&colour),
        ))?;
        x += width + 24;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::tick_label;

    #[test]
    fn tick_labels_carry_no_needless_zeros() {
        assert_eq!(tick_label(250.0), "250");
        assert_eq!(tick_label(12.5), "12.5");
        assert_eq!(tick_label(3.0), "3");
        assert_eq!(tick_label(0.25), "0.25");
        assert_eq!(tick_label(-0.0), "0");
        assert_eq!(tick_label(-1e-9), "0");
        assert_eq!(tick_label(1200.0), "1200");
    }
}
