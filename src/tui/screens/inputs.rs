//! Roll and winding inputs: one row per field with what was entered, what will be assumed (and
//! from where), or that it is blank; the field being typed shows its text and, when the entry
//! was not accepted, the reason right under it.

use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Paragraph, Widget, Wrap};

use crate::tui::app::App;
use crate::tui::fields::{self, FIELDS, FieldKind, PresetFamily};
use crate::tui::theme::Theme;

fn accepted_text(kind: FieldKind) -> String {
    match kind {
        FieldKind::Quantity(q) => q.accepted().to_string(),
        FieldKind::Number { min, max } => format!("a plain number {min}…{max}"),
        FieldKind::Choice(options) => format!("←→: {}", options.join(" / ")),
        FieldKind::Preset(_) => "←→ through the presets, or type an ID".to_string(),
        FieldKind::Text => "any text".to_string(),
    }
}

pub fn render(app: &App, theme: Theme, area: Rect, buf: &mut Buffer) {
    let [table, info] = Layout::vertical([Constraint::Min(5), Constraint::Length(5)]).areas(area);
    let state = &app.inputs;
    let inner_height = usize::from(table.height.saturating_sub(2)).max(1);
    // The error line under the selected field takes one row.
    let room = if state.error.is_some() {
        inner_height.saturating_sub(2).max(1)
    } else {
        inner_height
    };
    let first = state.selected.saturating_sub(room - 1);
    let label_width = 18;
    // group (8) + label + two spaces + tag (8) inside the borders.
    let value_width = usize::from(table.width.saturating_sub(2))
        .saturating_sub(8 + label_width + 2 + 8)
        .clamp(8, 90);
    let mut lines = Vec::new();
    let mut last_group = "";
    for (row, spec) in FIELDS.iter().enumerate().skip(first).take(room) {
        let selected = row == state.selected;
        let entered = fields::get(&app.case, spec.path);
        let group = if spec.group != last_group || row == first {
            spec.group
        } else {
            ""
        };
        last_group = spec.group;
        let (value, tag, tag_style) = match (&state.editing, selected, &entered) {
            (Some(text), true, _) => (format!("{text}▏"), "typing", theme.key()),
            (_, _, Some(text)) => (text.clone(), "entered", theme.good()),
            _ => match app.assumed(spec.path) {
                Some(assumed) => (
                    format!("{} ({})", assumed.value, assumed.source),
                    "assumed",
                    theme.assumed(),
                ),
                None => ("—".to_string(), "blank", theme.dim()),
            },
        };
        let value: String = if value.chars().count() > value_width {
            let mut v: String = value.chars().take(value_width - 1).collect();
            v.push('…');
            v
        } else {
            value
        };
        let pointer = if selected { "▸" } else { " " };
        let row_style = if selected && state.editing.is_none() {
            theme.selected()
        } else {
            theme.plain()
        };
        lines.push(Line::from(vec![
            Span::styled(format!("{group:<8}"), theme.dim()),
            Span::styled(
                format!("{pointer}{:<w$}", spec.label, w = label_width - 1),
                row_style,
            ),
            Span::styled(format!(" {value:<value_width$} "), row_style),
            Span::styled(format!("{tag:>8}"), tag_style),
        ]));
        if selected && let Some(error) = &state.error {
            lines.push(Line::from(Span::styled(
                format!("        ✗ {error}"),
                theme.error(),
            )));
        }
    }
    Paragraph::new(lines)
        .wrap(Wrap { trim: false })
        .block(Block::bordered().title(" Roll and winding inputs — entered, assumed or blank "))
        .render(table, buf);

    let spec = FIELDS[state.selected.min(FIELDS.len() - 1)];
    let resolved_line = match &app.resolved {
        Ok(resolved) => Line::from(Span::styled(
            format!(
                "Inputs complete: {} values assumed from presets/defaults.",
                resolved.assumed.len()
            ),
            theme.good(),
        )),
        Err(error) if error.is_empty() => Line::from(""),
        Err(error) => Line::from(Span::styled(
            format!("Not solvable yet: {error}"),
            theme.warn(),
        )),
    };
    // On a preset row, say what the chosen preset is.
    let current = fields::get(&app.case, spec.path);
    let about = match (spec.kind, current.as_deref()) {
        (FieldKind::Preset(PresetFamily::Web), Some(id)) => crate::presets::web_preset(id)
            .map(|p| format!("{id}: {}", p.name))
            .unwrap_or_else(|| format!("{id}: not a known web preset")),
        (FieldKind::Preset(PresetFamily::Core), Some(id)) => crate::presets::core_preset(id)
            .map(|p| format!("{id}: {}", p.name))
            .unwrap_or_else(|| format!("{id}: not a known core preset")),
        _ => format!(
            "e.g. \"{}\"  accepted: {}",
            spec.example,
            accepted_text(spec.kind)
        ),
    };
    let info_lines = vec![
        Line::from(vec![
            Span::styled(format!("{}: ", spec.label), theme.title()),
            Span::raw(about),
        ]),
        resolved_line,
        Line::from(Span::styled(
            "Start from: ^N blank case · presets on the preset rows (←→) · ^L inputs from a saved case · ^O open a case",
            theme.dim(),
        )),
    ];
    Paragraph::new(info_lines)
        .wrap(Wrap { trim: true })
        .block(Block::bordered())
        .render(info, buf);
}
