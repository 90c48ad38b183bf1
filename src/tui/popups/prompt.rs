//! The popups that ask for a file name: save as and export. Both edit one line of text and
//! hand the path to the app, which shows a failure back in the popup.

use std::path::PathBuf;

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Clear, Paragraph, Widget, Wrap};

use crate::tui::component::{ANY, Action, Binding, Component, Handled};
use crate::tui::event::Key;
use crate::tui::screens::centred;
use crate::tui::session::Session;
use crate::tui::theme::Theme;

/// A line of text being typed as a file path, and the last error.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct PathPrompt {
    pub input: String,
    pub error: Option<String>,
}

impl PathPrompt {
    pub fn new(input: String) -> Self {
        PathPrompt { input, error: None }
    }

    /// Edit the text; `Some(path)` on Enter, Esc closes the popup.
    fn key(&mut self, key: Key, ctx: &mut Session) -> Option<String> {
        match key {
            Key::Esc => ctx.push(Action::Close),
            Key::Enter => return Some(self.input.trim().to_string()),
            Key::Backspace => {
                self.input.pop();
                self.error = None;
            }
            Key::Char(c) => {
                self.input.push(c);
                self.error = None;
            }
            _ => self.error = None,
        }
        None
    }
}

/// The head of a popup that asks for a file path: the label, the text typed so far with a
/// cursor, and the last error (if any) under it.
pub fn path_prompt(
    label: &'static str,
    input: &str,
    error: Option<&str>,
    theme: Theme,
) -> Vec<Line<'static>> {
    let mut lines = vec![Line::from(vec![
        Span::styled(label, theme.key()),
        Span::raw(format!("{input}▏")),
    ])];
    if let Some(error) = error {
        lines.push(Line::from(Span::styled(error.to_string(), theme.error())));
    }
    lines
}

/// Draw a file prompt with one line of explanation under it.
fn render_prompt(
    prompt: &PathPrompt,
    note: String,
    title: &'static str,
    theme: Theme,
    area: Rect,
    buf: &mut Buffer,
) {
    let mut lines = path_prompt("file: ", &prompt.input, prompt.error.as_deref(), theme);
    lines.push(Line::from(Span::styled(note, theme.dim())));
    let rect = centred(area, 64, 6);
    Clear.render(rect, buf);
    Paragraph::new(lines)
        .wrap(Wrap { trim: false })
        .block(Block::bordered().title(title))
        .render(rect, buf);
}

/// Save the case under a new name.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct SaveAsPopup(pub PathPrompt);

const SAVE_AS_KEYS: &[Binding] = &[
    Binding::line(ANY, "type", "file name"),
    Binding::line(ANY, "Enter", "save"),
    Binding::line(ANY, "Esc", "cancel"),
];

impl Component for SaveAsPopup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        if let Some(text) = self.0.key(key, ctx) {
            if text.is_empty() {
                self.0.error = Some("type a file name".into());
            } else {
                ctx.push(Action::SaveTo(PathBuf::from(text)));
            }
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        SAVE_AS_KEYS
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        let note = format!(
            "The case \"{}\" is written to a temporary file, then renamed.",
            ctx.case.title
        );
        render_prompt(&self.0, note, " Save the case as ", theme, area, buf);
    }
}

/// Write a report of the results; the format follows the file's extension.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct ExportPopup(pub PathPrompt);

const EXPORT_KEYS: &[Binding] = &[
    Binding::line(ANY, "type", "file (.md .html .json)"),
    Binding::line(ANY, "Enter", "write"),
    Binding::line(ANY, "Esc", "cancel"),
];

impl Component for ExportPopup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        if let Some(text) = self.0.key(key, ctx) {
            ctx.push(Action::Export(PathBuf::from(text)));
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        EXPORT_KEYS
    }

    fn render(&self, _ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        let note =
            "Markdown (.md), HTML with plots (.html) or JSON (.json), by the file name.".into();
        render_prompt(&self.0, note, " Export a report ", theme, area, buf);
    }
}
