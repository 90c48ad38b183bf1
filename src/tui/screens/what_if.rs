//! What-if: change one winder setting (or try a remedy that is one), re-solve in the background,
//! and compare: before/after curves overlaid, indicators side by side.

use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Paragraph, Widget, Wrap};

use super::results::render_plots;
use super::{compact_stress, sig3};
use crate::tui::app::{App, Setting};
use crate::tui::job::SolveOutcome;
use crate::tui::theme::Theme;
use crate::units::UnitSystem;

fn format_value(value: f64, unit: &str, units: UnitSystem) -> String {
    if unit == "Pa" {
        compact_stress(value, units)
    } else if unit.is_empty() || unit == "1" {
        sig3(value)
    } else {
        format!("{} {unit}", sig3(value))
    }
}

/// Rows of (what, before, after, change) comparing two outcomes, biggest relative change first
/// after the three summary figures.
pub fn comparison(
    before: &SolveOutcome,
    after: &SolveOutcome,
    units: UnitSystem,
) -> Vec<[String; 4]> {
    let change = |b: f64, a: f64| {
        if b.abs() > f64::EPSILON {
            format!("{:+.0}%", (a - b) / b.abs() * 100.0)
        } else if a.abs() > f64::EPSILON {
            "new".to_string()
        } else {
            "0%".to_string()
        }
    };
    let (sb, sa) = (&before.profile.summary, &after.profile.summary);
    let mut rows = vec![
        [
            "core pressure".into(),
            compact_stress(sb.core_pressure, units),
            compact_stress(sa.core_pressure, units),
            change(sb.core_pressure, sa.core_pressure),
        ],
        [
            "peak pressure".into(),
            compact_stress(sb.peak_pressure, units),
            compact_stress(sa.peak_pressure, units),
            change(sb.peak_pressure, sa.peak_pressure),
        ],
        [
            "lowest σθ".into(),
            compact_stress(sb.min_tangential_stress, units),
            compact_stress(sa.min_tangential_stress, units),
            change(sb.min_tangential_stress, sa.min_tangential_stress),
        ],
    ];
    if let (Ok(db), Ok(da)) = (&before.diagnosis, &after.diagnosis) {
        let mut indicator_rows: Vec<(f64, [String; 4])> = Vec::new();
        for b in &db.indicators {
            if let Some(a) = da
                .indicators
                .iter()
                .find(|a| a.id == b.id && a.zone == b.zone)
            {
                let relative = if b.value.abs() > f64::EPSILON {
                    ((a.value - b.value) / b.value).abs()
                } else {
                    a.value.abs()
                };
                let name = match &b.zone {
                    Some(zone) => format!("{} [{zone}]", b.id),
                    None => b.id.clone(),
                };
                indicator_rows.push((
                    relative,
                    [
                        name,
                        format_value(b.value, &b.unit, units),
                        format_value(a.value, &a.unit, units),
                        change(b.value, a.value),
                    ],
                ));
            }
        }
        indicator_rows.sort_by(|x, y| y.0.total_cmp(&x.0));
        rows.extend(indicator_rows.into_iter().map(|(_, row)| row));
        // Beliefs first (only those that moved), then indicators by size of change.
        let mut belief_rows = Vec::new();
        for cause in db.causes.iter().take(5) {
            let after_belief = da
                .causes
                .iter()
                .find(|c| c.id == cause.id)
                .map_or(0.0, |c| c.belief);
            if ((after_belief - cause.belief) * 100.0).abs() >= 0.5 {
                belief_rows.push([
                    format!("belief {}", cause.id),
                    format!("{:.0}%", cause.belief * 100.0),
                    format!("{:.0}%", after_belief * 100.0),
                    format!("{:+.0} pts", (after_belief - cause.belief) * 100.0),
                ]);
            }
        }
        let indicators = rows.split_off(3);
        rows.extend(belief_rows);
        rows.extend(indicators);
    }
    rows
}

/// Rows of (limit, before, after, allowed) for a taper design, then its explanation.
pub fn design_rows(
    design: &crate::taper_design::TaperDesign,
    units: UnitSystem,
) -> Vec<[String; 4]> {
    use crate::taper_design::Limit;
    let show = |limit: Limit, v: f64| match limit {
        Limit::CorePressure => compact_stress(v, units),
        Limit::Telescoping => format!("{v:.2}"),
        Limit::Starring => format!("{:.1}%", v * 100.0),
        Limit::WoundInTension => {
            crate::units::format_quantity(v, crate::units::QuantityKind::ForcePerWidth, units)
        }
    };
    let mut rows = Vec::new();
    for after in &design.after.checks {
        let before = design.before.check(after.limit).map(|c| c.value);
        let bound = if after.limit == Limit::Telescoping {
            "≥"
        } else {
            "≤"
        };
        rows.push([
            format!(
                "{} {}",
                if after.met { "✓" } else { "✗" },
                after.limit.title()
            ),
            before.map_or("—".into(), |v| show(after.limit, v)),
            show(after.limit, after.value),
            format!("{bound}{}", show(after.limit, after.allowed)),
        ]);
    }
    for sentence in design.explanation.iter().take(4) {
        rows.push([
            sentence.clone(),
            String::new(),
            String::new(),
            String::new(),
        ]);
    }
    rows
}

pub fn render(app: &App, theme: Theme, area: Rect, buf: &mut Buffer) {
    let top_height = (area.height / 2).max(8).min(area.height);
    let [top, plots] =
        Layout::vertical([Constraint::Length(top_height), Constraint::Min(0)]).areas(area);
    let left_width = if area.width >= 110 { 40 } else { 30 };
    let [choices, compare] =
        Layout::horizontal([Constraint::Length(left_width), Constraint::Min(10)]).areas(top);

    // Settings, then remedies that are one setting change.
    let mut lines = Vec::new();
    for (row, setting) in Setting::ALL.iter().enumerate() {
        let steps = app
            .what_if
            .change
            .filter(|c| c.setting == *setting)
            .map_or(0, |c| c.steps);
        let style = if row == app.what_if.row {
            theme.selected()
        } else {
            theme.plain()
        };
        let state = if steps == 0 {
            "as is".to_string()
        } else {
            format!("{steps:+} step")
        };
        lines.push(Line::from(vec![
            Span::styled(format!("‹ {:<12} › ", setting.label()), style),
            Span::styled(state, if steps == 0 { theme.dim() } else { theme.key() }),
        ]));
    }
    let remedies = app.what_if_remedies();
    if !remedies.is_empty() {
        lines.push(Line::from(Span::styled(
            "Try a remedy (Enter):",
            theme.title(),
        )));
    }
    for (i, (id, text)) in remedies.iter().enumerate() {
        let row = Setting::ALL.len() + i;
        let style = if row == app.what_if.row {
            theme.selected()
        } else {
            theme.plain()
        };
        let mark = if app.what_if.remedy.as_deref() == Some(id) {
            "▶"
        } else {
            "•"
        };
        lines.push(Line::from(Span::styled(format!("{mark} {text}"), style)));
    }
    let step_help = Setting::ALL
        .get(app.what_if.row)
        .map(|s| s.step_text())
        .unwrap_or("Enter applies the remedy's setting change");
    lines.push(Line::from(Span::styled(step_help, theme.dim())));
    Paragraph::new(lines)
        .wrap(Wrap { trim: true })
        .block(Block::bordered().title(" Change one setting "))
        .render(choices, buf);

    let before = app.current_outcome();
    let after = app.what_if.outcome.as_ref().map(|(_, o)| o.as_ref());
    let mut text: Vec<Line> = Vec::new();
    match &app.what_if.description {
        Some(description) => {
            text.push(Line::from(Span::styled(description.clone(), theme.title())))
        }
        None => text.push(Line::from("Pick a setting with ↑↓ and change it with ←→.")),
    }
    if let Some(error) = &app.what_if.error {
        text.push(Line::from(Span::styled(error.clone(), theme.error())));
    }
    if let Some(running) = app.running_what_if {
        text.push(Line::from(format!(
            "re-solving… {:.0}%",
            running.fraction * 100.0
        )));
    } else if before.is_none() && app.what_if.change.is_some() {
        text.push(Line::from("waiting for the case's own solve…"));
    }
    let design = app.what_if.design.as_ref().map(|(_, d)| d.as_ref());
    let rows = match (before, after, design) {
        (Some(before), Some(after), _) => Some(comparison(before, after, app.units)),
        (_, None, Some(design)) => Some(design_rows(design, app.units)),
        _ => None,
    };
    if let Some(rows) = rows {
        let last_header = if design.is_some() && after.is_none() {
            "allowed"
        } else {
            "change"
        };
        let width = usize::from(compare.width.saturating_sub(2));
        let name_width = width.saturating_sub(28).clamp(10, 48);
        text.push(Line::from(Span::styled(
            format!(
                "{:<name_width$} {:>9} {:>9} {:>7}",
                "", "before", "after", last_header
            ),
            theme.dim(),
        )));
        for [name, b, a, c] in rows {
            if b.is_empty() && a.is_empty() && c.is_empty() {
                text.push(Line::from(Span::styled(name, theme.dim())));
                continue;
            }
            let name: String = if name.chars().count() > name_width {
                let mut short: String = name.chars().take(name_width - 1).collect();
                short.push('…');
                short
            } else {
                name
            };
            text.push(Line::from(format!(
                "{name:<name_width$} {b:>9} {a:>9} {c:>7}"
            )));
        }
    }
    Paragraph::new(text)
        .wrap(Wrap { trim: false })
        .block(Block::bordered().title(" Before → after  (a keeps the change, r resets) "))
        .render(compare, buf);

    if let (None, Some(design)) = (after, design) {
        render_plots(
            &design.after.profile,
            Some(&design.before.profile),
            before.map_or(f64::NAN, |b| b.resolved.core.crush_pressure),
            app.units,
            theme,
            plots,
            buf,
        );
        return;
    }
    match (before, after) {
        (Some(before), Some(after)) => render_plots(
            &after.profile,
            Some(&before.profile),
            after.resolved.core.crush_pressure,
            app.units,
            theme,
            plots,
            buf,
        ),
        (Some(before), None) => render_plots(
            &before.profile,
            None,
            before.resolved.core.crush_pressure,
            app.units,
            theme,
            plots,
            buf,
        ),
        _ => {
            let text = super::results::waiting_text(app).unwrap_or_default();
            Paragraph::new(text)
                .wrap(Wrap { trim: true })
                .block(Block::bordered())
                .render(plots, buf);
        }
    }
}
