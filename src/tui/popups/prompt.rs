//! The popup that asks for a file name (save as, export), and the one line of text every file
//! prompt edits. The path goes to the app, which shows a failure back in the popup.

use std::path::PathBuf;

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};

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

    /// Type or delete a character (the last error goes); false for any other key.
    pub fn edit(&mut self, key: Key) -> bool {
        match key {
            Key::Backspace => {
                self.input.pop();
            }
            Key::Char(c) => self.input.push(c),
            _ => return false,
        }
        self.error = None;
        true
    }

    /// Edit the text; `Some(path)` on Enter, Esc closes the popup.
    fn key(&mut self, key: Key, ctx: &mut Session) -> Option<String> {
        match key {
            Key::Esc => ctx.push(Action::Close),
            Key::Enter => return Some(self.input.trim().to_string()),
            _ => {
                self.edit(key);
                self.error = None;
            }
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

/// What a file popup does with the path.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FilePurpose {
    /// Save the case under a new name.
    SaveAs,
    /// Write a report of the results; the format follows the file's extension.
    Export,
}

/// Ask for a file to save the case to or to write a report into.
#[derive(Debug, Clone, PartialEq)]
pub struct FilePopup {
    pub purpose: FilePurpose,
    pub prompt: PathPrompt,
}

impl FilePopup {
    pub fn new(purpose: FilePurpose, suggested: String) -> Self {
        FilePopup {
            purpose,
            prompt: PathPrompt::new(suggested),
        }
    }
}

const SAVE_AS_KEYS: &[Binding] = &[
    Binding::line(ANY, "type", "file name"),
    Binding::line(ANY, "Enter", "save"),
    Binding::line(ANY, "Esc", "cancel"),
];

const EXPORT_KEYS: &[Binding] = &[
    Binding::line(ANY, "type", "file (.md .html .json)"),
    Binding::line(ANY, "Enter", "write"),
    Binding::line(ANY, "Esc", "cancel"),
];

impl Component for FilePopup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        let Some(text) = self.prompt.key(key, ctx) else {
            return Handled::Yes;
        };
        match self.purpose {
            FilePurpose::SaveAs if text.is_empty() => {
                self.prompt.error = Some("type a file name".into())
            }
            FilePurpose::SaveAs => ctx.push(Action::SaveTo(PathBuf::from(text))),
            FilePurpose::Export => ctx.push(Action::Export(PathBuf::from(text))),
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        match self.purpose {
            FilePurpose::SaveAs => SAVE_AS_KEYS,
            FilePurpose::Export => EXPORT_KEYS,
        }
    }

    /// The prompt with one line of explanation under it.
    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        let (note, title) = match self.purpose {
            FilePurpose::SaveAs => (
                format!(
                    "The case \"{}\" is written to a temporary file, then renamed.",
                    ctx.case.title
                ),
                " Save the case as ",
            ),
            FilePurpose::Export => (
                "Markdown (.md), HTML with plots (.html) or JSON (.json), by the file name."
                    .to_string(),
                " Export a report ",
            ),
        };
        let prompt = &self.prompt;
        let mut lines = path_prompt("file: ", &prompt.input, prompt.error.as_deref(), theme);
        lines.push(Line::from(Span::styled(note, theme.dim())));
        let rect = centred(area, 64, 6);
        super::framed(lines, title, rect, buf);
    }
}
