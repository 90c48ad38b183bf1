//! Compact fixed-width text charts for the Markdown report (a Markdown file has no pictures of
//! its own): the interlayer pressure and the hoop stress against roll diameter, and the hardness
//! readings against the computed pressure where measurements exist. Plain ASCII in a code
//! block, so any viewer lines it up; the same data and scales as the HTML report's SVG plots.

use std::fmt::Write;

use super::ReportInput;
use super::measured_plot::hardness_series;
use super::plots::{length_unit, stress_unit, tick_label};
use crate::model::Profile;

/// Columns of the plot area (one profile sample each) and its rows.
pub const CHART_WIDTH: usize = 60;
pub const CHART_HEIGHT: usize = 10;
/// Width of the y-axis labels.
const LABEL_WIDTH: usize = 9;

/// One set of points and the character that marks them.
struct Series<'a> {
    points: &'a [(f64, f64)],
    mark: char,
}

/// The charts of a report, each a fenced code block with a line above it.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct TextCharts {
    pub pressure: String,
    pub hoop: String,
    /// Hardness readings against the computed pressure; `None` without comparable readings.
    pub hardness: Option<String>,
}

/// The text charts of a report input.
pub fn charts(input: &ReportInput) -> Result<TextCharts, super::ReportError> {
    let profile = &input.profile;
    let x_unit = length_unit(input.units);
    let largest = |values: &[f64]| values.iter().fold(1.0f64, |m, v| m.max(v.abs()));
    let sample = |values: &[f64], size: f64| -> Vec<(f64, f64)> {
        across(profile)
            .map(|r| {
                let y = Profile::interpolate(values, &profile.radius, r) / size;
                (2.0 * r / x_unit.size, y)
            })
            .collect()
    };
    let p_unit = stress_unit(largest(&profile.pressure), input.units);
    let pressure = sample(&profile.pressure, p_unit.size);
    let t_unit = stress_unit(largest(&profile.tangential_stress), input.units);
    let hoop = sample(&profile.tangential_stress, t_unit.size);
    let x_name = format!("roll diameter ({})", x_unit.name);
    let hardness = hardness_series(input)?.map(|h| {
        let title = format!("{} against {x_name}; o readings, * computed", h.y_desc);
        chart(
            &title,
            &[
                Series {
                    points: &h.computed,
                    mark: '*',
                },
                Series {
                    points: &h.readings,
                    mark: 'o',
                },
            ],
            (h.x_range.start, h.x_range.end),
        )
    });
    let x_span = |points: &[(f64, f64)]| {
        (
            points.first().map_or(0.0, |p| p.0),
            points.last().map_or(1.0, |p| p.0),
        )
    };
    Ok(TextCharts {
        pressure: chart(
            &format!("Interlayer pressure ({}) against {x_name}", p_unit.name),
            &[Series {
                points: &pressure,
                mark: '*',
            }],
            x_span(&pressure),
        ),
        hoop: chart(
            &format!(
                "Hoop stress ({}) against {x_name}; below the zero line = compression",
                t_unit.name
            ),
            &[Series {
                points: &hoop,
                mark: '*',
            }],
            x_span(&hoop),
        ),
        hardness,
    })
}

/// One radius per chart column, core to outside.
fn across(profile: &Profile) -> impl Iterator<Item = f64> + '_ {
    let first = profile.radius.first().copied().unwrap_or(0.0);
    let last = profile.radius.last().copied().unwrap_or(0.0);
    (0..CHART_WIDTH).map(move |i| first + (last - first) * i as f64 / (CHART_WIDTH - 1) as f64)
}

/// A chart of `series` over `x_span`, the y range taking in zero; a title line, then a code
/// block with the y labels (top, zero, bottom), the plot, the x axis and its end labels.
fn chart(title: &str, series: &[Series], x_span: (f64, f64)) -> String {
    let values = series.iter().flat_map(|s| s.points.iter().map(|p| p.1));
    let high = values.clone().fold(0.0f64, f64::max);
    let low = values.fold(0.0f64, f64::min);
    let (high, low) = if high > low {
        (high, low)
    } else {
        (low + 1.0, low)
    };
    let row_of = |y: f64| {
        let share = (high - y) / (high - low);
        ((share * (CHART_HEIGHT - 1) as f64).round() as usize).min(CHART_HEIGHT - 1)
    };
    let (x0, x1) = x_span;
    let column_of = |x: f64| {
        let share = if x1 > x0 { (x - x0) / (x1 - x0) } else { 0.0 };
        ((share * (CHART_WIDTH - 1) as f64).round().max(0.0) as usize).min(CHART_WIDTH - 1)
    };
    let zero = row_of(0.0);
    let mut grid = vec![vec![' '; CHART_WIDTH]; CHART_HEIGHT];
    if low < 0.0 {
        grid[zero] = vec!['-'; CHART_WIDTH];
    }
    for s in series {
        for &(x, y) in s.points {
            if x.is_finite() && y.is_finite() {
                grid[row_of(y)][column_of(x)] = s.mark;
            }
        }
    }
    let mut out = format!("{title}:\n\n```text\n");
    for (i, row) in grid.iter().enumerate() {
        let label = if i == 0 {
            tick_label(high)
        } else if i == CHART_HEIGHT - 1 {
            tick_label(low)
        } else if i == zero {
            "0".to_string()
        } else {
            String::new()
        };
        let axis = if label.is_empty() { '|' } else { '+' };
        let line: String = row.iter().collect();
        let _ = writeln!(out, "{label:>LABEL_WIDTH$} {axis}{}", line.trim_end());
    }
    let _ = writeln!(out, "{:>LABEL_WIDTH$} +{}", "", "-".repeat(CHART_WIDTH));
    let left = tick_label(x0);
    let right = tick_label(x1);
    let gap = (CHART_WIDTH + 1).saturating_sub(left.len() + right.len());
    let _ = writeln!(out, "{:>LABEL_WIDTH$} {left}{}{right}", "", " ".repeat(gap));
    out.push_str("```\n");
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A straight line from (0, 0) to (1, 1) runs corner to corner: the first point on the zero
    /// row at the left, the last on the top row at the right (plain geometry of the grid).
    #[test]
    fn a_straight_line_runs_corner_to_corner() {
        let points: Vec<(f64, f64)> = (0..CHART_WIDTH)
            .map(|i| {
                let x = i as f64 / (CHART_WIDTH - 1) as f64;
                (x, x)
            })
            .collect();
        let text = chart(
            "line",
            &[Series {
                points: &points,
                mark: '*',
            }],
            (0.0, 1.0),
        );
        let rows: Vec<&str> = text
            .lines()
            .filter(|l| l.contains('+') || l.contains('|'))
            .collect();
        assert!(rows[0].ends_with('*'), "{text}");
        assert!(rows[CHART_HEIGHT - 1].starts_with("        0 +*"), "{text}");
    }

    /// Negative values get a zero line with the curve below it.
    #[test]
    fn compression_sits_below_the_zero_line() {
        let points = [(0.0, -2.0), (1.0, 1.0)];
        let text = chart(
            "hoop",
            &[Series {
                points: &points,
                mark: '*',
            }],
            (0.0, 1.0),
        );
        let zero = text
            .lines()
            .position(|l| l.starts_with("        0 +"))
            .unwrap();
        let bottom = text
            .lines()
            .position(|l| l.starts_with("       -2 +*"))
            .unwrap();
        assert!(bottom > zero, "{text}");
        assert!(text.lines().nth(zero).unwrap().contains("---"), "{text}");
    }
}
