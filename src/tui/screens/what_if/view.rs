//! Drawing the what-if screen: the settings and remedies to try, the before → after table and
//! the plots (after over before).

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Widget};

use super::compare::{comparison, design_rows};
use super::{DESIGNING, WhatIfScreen};
use crate::diagnose::what_if::Setting;
use crate::taper_design::TaperDesign;
use crate::tui::job::SolveOutcome;
use crate::tui::screens::results::render_plots;
use crate::tui::session::Session;
use crate::tui::theme::Theme;

/// Settings, then remedies that are one setting change.
pub(super) fn render_choices(
    state: &WhatIfScreen,
    app: &Session,
    theme: Theme,
    area: Rect,
    buf: &mut Buffer,
) {
    let mut lines = Vec::new();
    for (row, setting) in Setting::ALL.iter().enumerate() {
        let steps = state
            .change
            .filter(|c| c.setting == *setting)
            .map_or(0, |c| c.steps);
        let style = if row == state.row {
            theme.selected()
        } else {
            theme.plain()
        };
        let shown = if steps == 0 {
            "as is".to_string()
        } else {
            format!("{steps:+} step")
        };
        lines.push(Line::from(vec![
            Span::styled(format!("‹ {:<12} › ", setting.label()), style),
            Span::styled(shown, if steps == 0 { theme.dim() } else { theme.key() }),
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
        let style = if row == state.row {
            theme.selected()
        } else {
            theme.plain()
        };
        let mark = if state.remedy.as_deref() == Some(id) {
            "▶"
        } else {
            "•"
        };
        // A long remedy wraps under its text, not back under the mark (as the results lists).
        lines.extend(crate::tui::screens::hang(
            Line::from(Span::styled(format!("{mark} {text}"), style)),
            usize::from(area.width.saturating_sub(2)),
            2,
        ));
    }
    if let (Some(text), Some(setting)) = (&state.typing, Setting::ALL.get(state.row)) {
        lines.push(Line::from(vec![
            Span::styled(format!("{}: ", setting.label()), theme.title()),
            Span::styled(format!("{text}▏"), theme.key()),
        ]));
        lines.push(Line::from(Span::styled(
            "type a value with its unit, Enter tries it, Esc cancels",
            theme.dim(),
        )));
    } else {
        let step_help = Setting::ALL
            .get(state.row)
            .map(|s| s.step_text())
            .unwrap_or("Enter applies the remedy's setting change");
        lines.push(Line::from(Span::styled(step_help, theme.dim())));
    }
    // No trimming: it would strip the hanging indent of a wrapped remedy.
    crate::tui::screens::wrapped(lines, false)
        .block(Block::bordered().title(" Change one setting "))
        .render(area, buf);
}

/// The before/after table and the plots (after over before).
pub(super) fn render_comparison(
    state: &WhatIfScreen,
    app: &Session,
    theme: Theme,
    compare: Rect,
    plots: Rect,
    buf: &mut Buffer,
) {
    let before = app.current_outcome();
    let after = state.outcome.as_ref().map(|(_, o)| o.as_ref());
    let design = state.design.as_ref().map(|(_, d)| d.as_ref());
    let mut text = status_lines(state, app, theme, before.is_some());
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
        text.extend(table_lines(rows, last_header, width, theme));
    }
    render_scrolled(text, state.scroll, compare, buf);
    render_after_plots(app, before, after, design, theme, plots, buf);
}

/// What was changed, an error, and what is running: the lines above the table.
fn status_lines(
    state: &WhatIfScreen,
    app: &Session,
    theme: Theme,
    has_before: bool,
) -> Vec<Line<'static>> {
    let mut text: Vec<Line> = Vec::new();
    match &state.description {
        Some(description) => {
            text.push(Line::from(Span::styled(description.clone(), theme.title())))
        }
        None => text.push(Line::from("Pick a setting with ↑↓ and change it with ←→.")),
    }
    if let Some(error) = &state.error {
        text.push(Line::from(Span::styled(error.clone(), theme.error())));
    }
    if let Some(running) = app.running_what_if {
        let frame =
            crate::tui::screens::SPINNER[(app.tick as usize) % crate::tui::screens::SPINNER.len()];
        if state.design.is_none() && state.description.as_deref() == Some(DESIGNING) {
            // The design reports no fraction: the spinner shows it is working.
            text.push(Line::from(format!(
                "{frame} designing… many solves; keys still work"
            )));
        } else {
            text.push(Line::from(format!(
                "{frame} re-solving… {:.0} %",
                running.fraction * 100.0
            )));
        }
    } else if !has_before && state.change.is_some() {
        text.push(Line::from("waiting for the case's own solve…"));
    }
    text
}

/// The (what, before, after, change) rows as aligned lines `width` wide; a row of words alone
/// is drawn dim across the table.
fn table_lines(
    rows: Vec<[String; 4]>,
    last_header: &str,
    width: usize,
    theme: Theme,
) -> Vec<Line<'static>> {
    let name_width = width.saturating_sub(33).clamp(10, 48);
    let mut text = vec![Line::from(Span::styled(
        format!(
            "{:<name_width$} {:>10} {:>10} {:>10}",
            "", "before", "after", last_header
        ),
        theme.dim(),
    ))];
    for [name, b, a, c] in rows {
        if b.is_empty() && a.is_empty() && c.is_empty() {
            text.push(Line::from(Span::styled(name, theme.dim())));
            continue;
        }
        // A name too long for its column gets a line of its own: words, never cut.
        let name = if name.chars().count() > name_width {
            text.push(Line::from(name));
            String::new()
        } else {
            name
        };
        text.push(Line::from(format!(
            "{name:<name_width$} {b:>10} {a:>10} {c:>10}"
        )));
    }
    text
}

/// The comparison's lines in their bordered box, scrolled by `scroll` but never past the last
/// rows.
fn render_scrolled(text: Vec<Line<'static>>, scroll: u16, area: Rect, buf: &mut Buffer) {
    let visible = usize::from(area.height.saturating_sub(2));
    let most = u16::try_from(text.len().saturating_sub(visible)).unwrap_or(u16::MAX);
    let title = if most > 0 {
        " Before → after  (PgUp/PgDn: more) "
    } else {
        " Before → after  (a keeps the change, r resets) "
    };
    crate::tui::screens::wrapped(text, false)
        .scroll((scroll.min(most), 0))
        .block(Block::bordered().title(title))
        .render(area, buf);
}

/// The plots: a design's after over its before, a change's after over the case, the case alone
/// before anything is tried, or what the solve is waiting for.
fn render_after_plots(
    app: &Session,
    before: Option<&SolveOutcome>,
    after: Option<&SolveOutcome>,
    design: Option<&TaperDesign>,
    theme: Theme,
    plots: Rect,
    buf: &mut Buffer,
) {
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
        (Some(before), Some(after)) => {
            render_plots(
                &after.profile,
                Some(&before.profile),
                after.resolved.core.crush_pressure,
                app.units,
                theme,
                plots,
                buf,
            );
        }
        (Some(before), None) => {
            render_plots(
                &before.profile,
                None,
                before.resolved.core.crush_pressure,
                app.units,
                theme,
                plots,
                buf,
            );
        }
        _ => {
            let text = crate::tui::screens::results::waiting_text(app).unwrap_or_default();
            crate::tui::screens::wrapped(text, true)
                .block(Block::bordered())
                .render(plots, buf);
        }
    }
}
