//! Roll and winding inputs: one row per field with what was entered, what will be assumed (and
//! from where), or that it is blank; the field being typed shows its text and, when the entry
//! was not accepted, the reason right under it.

use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Widget};

use crate::tui::component::{Action, Binding, Component, Handled};
use crate::tui::event::Key;
use crate::tui::fields::{self, FIELDS, FieldKind, PresetFamily};
use crate::tui::popups::Popup;
use crate::tui::session::Session;
use crate::tui::theme::Theme;

const BROWSE: u8 = 1;
const EDIT: u8 = 2;

/// The input screen's keys. Delete (clear) is in the help screen only: the line has 80 columns.
#[rustfmt::skip]
pub const KEYS: &[Binding] = &[
    Binding::both(BROWSE, "↑↓", "move", "↑ ↓", "move between fields"),
    Binding::line(EDIT, "type", "value+unit"),
    Binding::both(BROWSE, "type", "edit", "type or Enter", "edit: a number and its unit, e.g. 3 pli, 525 N/m, 48 mil"),
    Binding::line(EDIT, "Enter", "ok"),
    Binding::line(EDIT, "Esc", "cancel"),
    Binding::help("Enter / Esc", "accept (checked at once) / cancel"),
    Binding::help("Ctrl-U / Ctrl-W", "while typing: clear the text / the last word (else Ctrl-U switches units and converts the form)"),
    Binding::both(BROWSE, "←→", "set", "← →", "choose on choice and preset rows"),
    Binding::help("Delete", "clear a field: the preset or default value is used"),
    Binding::both(BROWSE, "^K", "calibrate", "Ctrl-K", "fit Pfeiffer K1, K2 to a stack-test CSV"),
];

#[derive(Debug, Clone, PartialEq, Default)]
pub struct InputsScreen {
    /// Index into `fields::FIELDS`.
    pub selected: usize,
    /// The text being typed, while a field is being edited.
    pub editing: Option<String>,
    /// Why the last entry was not accepted (shown under the field).
    pub error: Option<String>,
}

impl InputsScreen {
    fn edit_key(&mut self, key: Key, mut text: String, ctx: &mut Session) {
        let spec = FIELDS[self.selected.min(FIELDS.len() - 1)];
        match key {
            Key::Esc => self.error = None,
            Key::Enter | Key::Tab => match fields::set(&mut ctx.case, &spec, Some(&text)) {
                Ok(()) => {
                    self.error = None;
                    ctx.edited();
                    if key == Key::Enter {
                        self.selected = (self.selected + 1).min(FIELDS.len() - 1);
                    }
                }
                Err(message) => {
                    // Rejected in place: keep the text so it can be corrected.
                    self.error = Some(message.to_string());
                    self.editing = Some(text);
                }
            },
            Key::Backspace => {
                text.pop();
                self.editing = Some(text);
            }
            // Shell habits: Ctrl-U clears the text, Ctrl-W the last word.
            Key::Ctrl('u') => self.editing = Some(String::new()),
            Key::Ctrl('w') => {
                let kept = text.trim_end().rfind(' ').map_or(0, |i| i + 1);
                text.truncate(kept);
                self.editing = Some(text);
            }
            Key::Char(c) => {
                text.push(c);
                self.editing = Some(text);
            }
            _ => self.editing = Some(text),
        }
    }

    fn browse_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        let last = FIELDS.len() - 1;
        let spec = FIELDS[self.selected.min(last)];
        match key {
            Key::Ctrl('k') => ctx.push(Action::Push(Popup::Calibrate(Box::default()))),
            Key::Up => {
                self.selected = self.selected.saturating_sub(1);
                self.error = None;
            }
            Key::Down => {
                self.selected = (self.selected + 1).min(last);
                self.error = None;
            }
            Key::PageUp => self.selected = self.selected.saturating_sub(8),
            Key::PageDown => self.selected = (self.selected + 8).min(last),
            Key::Home => self.selected = 0,
            Key::End => self.selected = last,
            Key::Enter => {
                self.editing = Some(fields::get(&ctx.case, spec.path).unwrap_or_default())
            }
            Key::Delete | Key::Backspace
                if fields::get(&ctx.case, spec.path).is_some()
                    && fields::set(&mut ctx.case, &spec, None).is_ok() =>
            {
                ctx.edited();
            }
            Key::Left | Key::Right => {
                let options: Vec<String> = match spec.kind {
                    FieldKind::Choice(options) => options.iter().map(|o| o.to_string()).collect(),
                    FieldKind::Preset(family) => ctx.preset_options(family).to_vec(),
                    _ => Vec::new(),
                };
                let current = fields::get(&ctx.case, spec.path);
                if let Some(next) = fields::cycle(&options, current.as_deref(), key == Key::Right)
                    && fields::set(&mut ctx.case, &spec, Some(&next)).is_ok()
                {
                    ctx.edited();
                }
            }
            Key::Char(c) => {
                // Typing on a field starts editing it: quick entry without Enter first.
                self.editing = Some(c.to_string());
                self.error = None;
            }
            _ => return Handled::No,
        }
        Handled::Yes
    }
}

impl Component for InputsScreen {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        match self.editing.take() {
            Some(text) => {
                self.edit_key(key, text, ctx);
                Handled::Yes
            }
            None => self.browse_key(key, ctx),
        }
    }

    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn mode(&self, _ctx: &Session) -> u8 {
        if self.editing.is_some() { EDIT } else { BROWSE }
    }

    fn is_typing(&self) -> bool {
        true
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        render(self, ctx, theme, area, buf);
    }
}

fn accepted_text(kind: FieldKind) -> String {
    match kind {
        FieldKind::Quantity(q) => q.accepted().to_string(),
        FieldKind::Number { min, max } => format!("a plain number {min}…{max}"),
        FieldKind::Choice(options) => format!("←→: {}", options.join(" / ")),
        FieldKind::Preset(_) => "←→ through the presets, or type an ID".to_string(),
        FieldKind::Text => "any text".to_string(),
        FieldKind::Table { .. } => "rows of diameter: value, separated by ;".to_string(),
    }
}

fn render(state: &InputsScreen, app: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
    let [table, info] = Layout::vertical([Constraint::Min(5), Constraint::Length(5)]).areas(area);
    render_fields(state, app, theme, table, buf);
    render_about(state, app, theme, info, buf);
}

/// The field table: the rows in view, each with its group, label, value and whether the value
/// was entered, assumed or is blank; an error under the selected row.
fn render_fields(state: &InputsScreen, app: &Session, theme: Theme, table: Rect, buf: &mut Buffer) {
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
        let group = if spec.group != last_group || row == first {
            spec.group
        } else {
            ""
        };
        last_group = spec.group;
        let (value, tag, tag_style) = field_value(state, app, spec, selected, theme);
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
    super::wrapped(lines, false)
        .block(Block::bordered().title(" Roll and winding inputs — entered, assumed or blank "))
        .render(table, buf);
}

/// A field's value in words with its tag and the tag's style: what is being typed, what was
/// entered, what was assumed (and from where), or blank.
fn field_value(
    state: &InputsScreen,
    app: &Session,
    spec: &fields::FieldSpec,
    selected: bool,
    theme: Theme,
) -> (String, &'static str, ratatui::style::Style) {
    let entered = fields::get(&app.case, spec.path);
    match (&state.editing, selected, &entered) {
        (Some(text), true, _) => (format!("{text}▏"), "typing", theme.key()),
        (_, _, Some(text)) => (fields::value_words(spec, text), "entered", theme.good()),
        _ => match app.assumed(spec.path) {
            Some(assumed) => (
                format!(
                    "{} ({})",
                    fields::value_words(spec, &assumed.value),
                    assumed.source
                ),
                "assumed",
                theme.assumed(),
            ),
            None => ("—".to_string(), "blank", theme.dim()),
        },
    }
}

/// Under the table: what the selected field accepts (or which preset it holds), whether the
/// inputs can be solved yet, and where to start from.
fn render_about(state: &InputsScreen, app: &Session, theme: Theme, info: Rect, buf: &mut Buffer) {
    let spec = FIELDS[state.selected.min(FIELDS.len() - 1)];
    let resolved_line = match &app.resolved {
        Ok(resolved) => Line::from(Span::styled(
            format!(
                "Inputs complete: {} values assumed from presets/defaults.",
                resolved.assumed.len()
            ),
            theme.good(),
        )),
        Err(error) if error.to_string().is_empty() => Line::from(""),
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
    super::wrapped(info_lines, true)
        .block(Block::bordered())
        .render(info, buf);
}
