//! A small text plot of pressure or tangential stress against radius, with the zones marked
//! under the axis — for training feedback in a plain terminal (no colours needed).

use crate::model::Profile;
use crate::units::{QuantityKind, UnitSystem, format_quantity};

use super::PlotChoice;

/// Draw `kind` of `profile` in `width` × `height` characters of plot area.
pub fn render(
    profile: &Profile,
    kind: PlotChoice,
    width: usize,
    height: usize,
    units: UnitSystem,
) -> String {
    let data = match kind {
        PlotChoice::Pressure => &profile.pressure,
        PlotChoice::Tangential => &profile.tangential_stress,
    };
    let count = profile.radius.len().min(data.len());
    let width = width.max(10);
    let height = height.max(4);
    if count == 0 {
        return String::from("(no profile to plot)\n");
    }
    let r0 = profile.radius[0];
    let r1 = profile.radius[count - 1];
    let top = data[..count].iter().copied().fold(0.0_f64, f64::max);
    let bottom = data[..count].iter().copied().fold(0.0_f64, f64::min);
    let span = if top > bottom { top - bottom } else { 1.0 };
    // Value in each column: the node nearest the column's radius.
    let column_value = |column: usize| -> (usize, f64) {
        let target = r0 + (r1 - r0) * column as f64 / (width - 1) as f64;
        let index = profile.radius[..count]
            .partition_point(|r| *r < target)
            .min(count - 1);
        (index, data[index])
    };
    let row_of = |value: f64| -> usize {
        let fraction = (top - value) / span;
        ((fraction * (height - 1) as f64).round() as usize).min(height - 1)
    };
    let mut grid = vec![vec![' '; width]; height];
    if bottom < 0.0 {
        let zero = row_of(0.0);
        for cell in grid[zero].iter_mut() {
            *cell = '-';
        }
    }
    let mut zone_strip = vec![' '; width];
    for (column, strip) in zone_strip.iter_mut().enumerate() {
        let (index, value) = column_value(column);
        grid[row_of(value)][column] = '*';
        if let Some(zone) = profile
            .zones
            .iter()
            .find(|z| index >= z.start && index < z.end)
        {
            *strip = zone.name.as_str().chars().next().unwrap_or(' ');
        }
    }
    let label = |v: f64| format_quantity(v, QuantityKind::Stress, units);
    let (title, top_label, bottom_label) = match kind {
        PlotChoice::Pressure => ("Interlayer pressure", label(top), label(bottom)),
        PlotChoice::Tangential => ("Tangential stress", label(top), label(bottom)),
    };
    let margin = top_label.len().max(bottom_label.len());
    let mut out = format!("{title} against radius (core on the left)\n");
    for (row, cells) in grid.iter().enumerate() {
        let tick = if row == 0 {
            top_label.clone()
        } else if row == height - 1 {
            bottom_label.clone()
        } else {
            String::new()
        };
        let line: String = cells.iter().collect();
        out.push_str(&format!("{tick:>margin$} |{}\n", line.trim_end()));
    }
    out.push_str(&format!("{:>margin$} +{}\n", "", "-".repeat(width)));
    let strip: String = zone_strip.iter().collect();
    out.push_str(&format!("{:>margin$}  {}\n", "zone", strip.trim_end()));
    let left = format_quantity(r0, QuantityKind::Length, units);
    let right = format_quantity(r1, QuantityKind::Length, units);
    let gap = width.saturating_sub(left.len() + right.len()).max(1);
    out.push_str(&format!(
        "{:>margin$}  {left}{}{right}\n",
        "radius",
        " ".repeat(gap)
    ));
    out.push_str(&format!(
        "{:>margin$}  zones: c core, i inner, m middle, o outer, s surface{}\n",
        "",
        if bottom < 0.0 { "; - zero line" } else { "" }
    ));
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{Zone, ZoneName};

    fn falling_profile() -> Profile {
        let mut profile = Profile::default();
        for i in 0..=100 {
            let x = i as f64 / 100.0;
            profile.radius.push(0.05 + 0.45 * x);
            profile.pressure.push(1e5 * (1.0 - x));
            profile.tangential_stress.push(2e6 * x - 1e6);
        }
        profile.zones.push(Zone {
            name: ZoneName::Core,
            start: 0,
            end: 50,
            inner_radius: 0.05,
            outer_radius: 0.275,
        });
        profile.zones.push(Zone {
            name: ZoneName::Surface,
            start: 50,
            end: 101,
            inner_radius: 0.275,
            outer_radius: 0.5,
        });
        profile
    }

    #[test]
    fn pressure_plot_falls_from_top_left_to_bottom_right() {
        let text = render(
            &falling_profile(),
            PlotChoice::Pressure,
            20,
            5,
            UnitSystem::Si,
        );
        let rows: Vec<&str> = text.lines().collect();
        // Title, 5 plot rows, axis, zone strip, radius labels, legend.
        assert_eq!(rows.len(), 10, "{text}");
        let first = rows[1].split('|').nth(1).unwrap();
        let last = rows[5].split('|').nth(1).unwrap();
        assert!(first.starts_with('*'), "{text}");
        assert!(last.ends_with('*'), "{text}");
        assert!(rows[7].contains("cccccccccc"), "{text}");
        assert!(rows[7].trim_end().ends_with('s'), "{text}");
        assert!(!text.contains("zero line"));
    }

    #[test]
    fn tangential_plot_draws_the_zero_line_when_stress_changes_sign() {
        let text = render(
            &falling_profile(),
            PlotChoice::Tangential,
            20,
            5,
            UnitSystem::Si,
        );
        assert!(text.contains("zero line"));
        assert!(text.lines().any(|l| l.contains("---")));
    }

    #[test]
    fn empty_profile_says_so() {
        let text = render(
            &Profile::default(),
            PlotChoice::Pressure,
            20,
            5,
            UnitSystem::Si,
        );
        assert!(text.contains("no profile"));
    }
}
