//! Measurements on the bad roll (F9): the case's `measurements` section shown and edited row by
//! row (the rows, one per field the case file accepts, are in [`super::measure_rows`]), and —
//! on its second page (`v`) — the measured values against the computed ones and the inverse
//! estimate of the wound-in tension ([`super::measure_view`]). Each typed value is checked on
//! Enter (a refused one stays in the editor with the reason). The rows edit a draft of the
//! section; the draft goes into the case as soon as the whole section resolves as the case file
//! would (a diameter waits for its length, a band for its second diameter), and the case is
//! then solved again on the worker thread, through the same triage pipeline as
//! `diagnose --measure`.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};

use crate::case::measurements::MeasurementsInput;
use crate::tui::component::{Action, Binding, Component, Handled};
use crate::tui::event::Key;
use crate::tui::session::Session;
use crate::tui::theme::Theme;

use super::edit_field::{self, Typed};
pub use super::measure_rows::{Field, ROWS, set, value};
use super::{CHOICE, MOVE, TYPING};

/// Which page the popup shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Page {
    #[default]
    Edit,
    Compare,
}

/// The measurements popup: a draft of the section, the row being edited, the page.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct MeasurePopup {
    pub draft: MeasurementsInput,
    pub selected: usize,
    pub editing: Option<String>,
    /// Why the last entry was refused.
    pub error: Option<String>,
    /// Why the draft is not (yet) in the case: the section does not resolve as it stands.
    pub pending: Option<String>,
    pub page: Page,
    /// First line shown on the comparison page.
    pub scroll: u16,
}

#[rustfmt::skip]
pub const KEYS: &[Binding] = &[
    Binding::both(MOVE, "↑↓", "move", "↑↓ PgUp PgDn", "move between the measurements"),
    Binding::both(MOVE, "Enter", "edit", "Enter", "edit the measurement (Enter again checks and keeps it, Esc cancels)"),
    Binding::both(CHOICE, "←→", "choose", "←→", "choose (tester scale, where the line bends, direction, place in parent)"),
    Binding::both(MOVE, "Del", "clear", "Delete", "clear the measurement"),
    Binding::both(MOVE | COMPARE, "v", "measured vs computed", "v", "switch between the measurements and measured against computed"),
    Binding::line(COMPARE, "↑↓", "scroll"),
    Binding::both(MOVE | COMPARE, "^S", "save", "Ctrl-S", "save the case file"),
    Binding::both(MOVE | COMPARE, "Esc", "close", "Esc", "close (accepted measurements stay in the case until you save)"),
    Binding::both(TYPING, "Enter", "keep", "Ctrl-U", "while typing: clear the text"),
    Binding::line(TYPING, "Esc", "cancel"),
];

const COMPARE: u8 = 8;

impl MeasurePopup {
    /// Open on the case's measurements.
    pub fn open(ctx: &Session) -> MeasurePopup {
        let draft = ctx.case.measurements.clone().unwrap_or_default();
        let mut popup = MeasurePopup {
            draft,
            ..MeasurePopup::default()
        };
        popup.pending = popup.check(ctx).err();
        popup
    }

    pub fn field(&self) -> Field {
        ROWS[self.selected.min(ROWS.len() - 1)].2
    }

    /// The case with the draft in place, resolved as the case file would be.
    fn check(&self, ctx: &Session) -> Result<Option<MeasurementsInput>, String> {
        let section = (!self.draft.is_empty()).then(|| self.draft.clone());
        let mut case = ctx.case.clone();
        case.measurements = section.clone();
        match case.resolve() {
            Ok(_) => Ok(section),
            // Another section's trouble is the inputs screen's to show; the draft can still go in.
            Err(_) if ctx.resolved.is_err() => Ok(section),
            Err(e) => Err(e.to_string()),
        }
    }

    /// Put the draft into the case when it resolves; solve again (off the UI thread).
    fn apply(&mut self, ctx: &mut Session) {
        match self.check(ctx) {
            Ok(section) => {
                self.pending = None;
                if ctx.case.measurements != section {
                    ctx.case.measurements = section;
                    ctx.edited();
                    ctx.ensure_baseline();
                }
            }
            Err(reason) => self.pending = Some(reason),
        }
    }

    fn commit(&mut self, ctx: &mut Session, field: Field, typed: String) {
        let mut draft = self.draft.clone();
        match set(&mut draft, field, &typed) {
            Ok(()) => {
                self.draft = draft;
                self.editing = None;
                self.error = None;
                self.apply(ctx);
            }
            Err(message) => {
                self.editing = Some(typed);
                self.error = Some(message);
            }
        }
    }

    fn step(&mut self, ctx: &mut Session, field: Field, forward: bool) {
        let Some(words) = field.choices() else {
            return;
        };
        let current = value(&self.draft, field);
        let n = words.len();
        let at = words.iter().position(|w| *w == current).unwrap_or(0);
        let next = if forward {
            (at + 1) % n
        } else {
            (at + n - 1) % n
        };
        self.commit(ctx, field, words[next].to_string());
        self.editing = None;
    }

    fn edit_key(&mut self, key: Key, ctx: &mut Session) {
        let field = self.field();
        let Some(typed) = &mut self.editing else {
            return;
        };
        match edit_field::edit(typed, key) {
            Typed::Enter => {
                let typed = typed.clone();
                self.commit(ctx, field, typed);
            }
            Typed::Cancel => {
                self.editing = None;
                self.error = None;
            }
            Typed::Editing => {}
        }
    }
}

impl Component for MeasurePopup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        if self.editing.is_some() {
            self.edit_key(key, ctx);
            return Handled::Yes;
        }
        let last = ROWS.len() - 1;
        let field = self.field();
        match (self.page, key) {
            (_, Key::Char('v')) => {
                self.page = match self.page {
                    Page::Edit => Page::Compare,
                    Page::Compare => Page::Edit,
                };
                if self.page == Page::Compare {
                    ctx.ensure_baseline();
                }
            }
            (_, Key::Ctrl('s')) => ctx.push(Action::Save),
            (_, Key::Esc | Key::F(9)) => ctx.push(Action::Close),
            (Page::Compare, Key::Up) => self.scroll = self.scroll.saturating_sub(1),
            (Page::Compare, Key::Down) => self.scroll = self.scroll.saturating_add(1),
            (Page::Compare, Key::PageUp) => self.scroll = self.scroll.saturating_sub(10),
            (Page::Compare, Key::PageDown) => self.scroll = self.scroll.saturating_add(10),
            (Page::Compare, _) => {}
            (Page::Edit, _) if edit_field::move_selection(&mut self.selected, last, key) => {}
            (Page::Edit, Key::Left | Key::Right) if field.choices().is_some() => {
                self.error = None;
                self.step(ctx, field, key == Key::Right);
            }
            (Page::Edit, Key::Enter) if field.choices().is_some() => self.step(ctx, field, true),
            (Page::Edit, Key::Enter) => {
                self.error = None;
                self.editing = Some(value(&self.draft, field));
            }
            (Page::Edit, Key::Delete) => self.commit(ctx, field, String::new()),
            _ => {}
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn mode(&self, _ctx: &Session) -> u8 {
        if self.editing.is_none() && self.page == Page::Compare {
            return COMPARE;
        }
        super::field_mode(self.editing.is_some(), self.field().choices().is_some())
    }

    fn is_typing(&self) -> bool {
        self.editing.is_some()
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        let title = match self.page {
            Page::Edit => " Measured on the roll (v: measured against computed, Esc closes) ",
            Page::Compare => " Measured against computed (v: the measurements, Esc closes) ",
        };
        let Some(frame) = edit_field::frame(title, (18, 22), area, buf) else {
            return;
        };
        match self.page {
            Page::Edit => self.render_rows(theme, &frame, buf),
            Page::Compare => super::measure_view::render(ctx, self.scroll, theme, frame.inner, buf),
        }
    }
}

impl MeasurePopup {
    fn render_rows(&self, theme: Theme, frame: &edit_field::Frame, buf: &mut Buffer) {
        let mut lines = Vec::new();
        let mut selected_line = 0;
        for (i, (heading, label, field)) in ROWS.iter().enumerate() {
            if let Some(h) = heading {
                lines.push(Line::from(Span::styled(h.to_string(), theme.title())));
            }
            let is_selected = i == self.selected;
            if is_selected {
                selected_line = lines.len();
            }
            let mut shown = match (&self.editing, is_selected) {
                (Some(typed), true) => format!("{typed}▏"),
                _ => value(&self.draft, *field),
            };
            if shown.is_empty() {
                shown = if field.choices().is_some() {
                    "— (←→ to choose)".into()
                } else {
                    "—".into()
                };
            }
            lines.push(frame.row(label, &shown, is_selected, theme));
        }
        frame.render_list(lines, selected_line, buf);
        let mut about = vec![frame.rule(theme)];
        if let Some(error) = &self.error {
            about.push(Line::from(Span::styled(
                format!("Not accepted: {error}"),
                theme.error(),
            )));
        } else if let Some(pending) = &self.pending {
            about.push(Line::from(Span::styled(
                format!("Not in the case yet: {pending}"),
                theme.warn(),
            )));
        } else {
            about.push(Line::from(Span::styled(
                self.field().hint().to_string(),
                theme.dim(),
            )));
        }
        frame.render_detail(about, buf);
    }
}
