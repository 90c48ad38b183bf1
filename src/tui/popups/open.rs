//! Open a case file, or take only its inputs: a path typed or picked from the case files
//! found nearby.

use std::path::PathBuf;

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};

use super::prompt::{PathPrompt, path_prompt};
use crate::tui::component::{ANY, Action, Binding, Component, Handled, OpenPurpose};
use crate::tui::event::Key;
use crate::tui::screens::centred;
use crate::tui::session::Session;
use crate::tui::theme::Theme;

#[derive(Debug, Clone, PartialEq)]
pub struct OpenPopup {
    pub purpose: OpenPurpose,
    pub prompt: PathPrompt,
    /// Case files found in `cases/` and the current folder.
    pub suggestions: Vec<String>,
    pub selected: Option<usize>,
}

const KEYS: &[Binding] = &[
    Binding::line(ANY, "type", "file name"),
    Binding::line(ANY, "↑↓", "pick"),
    Binding::line(ANY, "Enter", "open"),
    Binding::line(ANY, "Esc", "cancel"),
];

impl OpenPopup {
    pub fn new(purpose: OpenPurpose) -> Self {
        OpenPopup {
            purpose,
            prompt: PathPrompt::default(),
            suggestions: case_files_nearby(),
            selected: None,
        }
    }
}

impl Component for OpenPopup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        match key {
            Key::Esc => ctx.push(Action::Close),
            Key::Enter => {
                let text = match (self.selected, self.prompt.input.trim().is_empty()) {
                    (Some(i), true) => self.suggestions.get(i).cloned().unwrap_or_default(),
                    _ => self.prompt.input.trim().to_string(),
                };
                if text.is_empty() {
                    self.prompt.error = Some("type a file name or pick one with ↑↓".into());
                } else {
                    ctx.push(Action::Open(PathBuf::from(text), self.purpose));
                }
            }
            Key::Up | Key::Down => {
                let n = self.suggestions.len();
                if n > 0 {
                    self.selected = Some(match (self.selected, key) {
                        (None, Key::Down) => 0,
                        (None, _) => n - 1,
                        (Some(i), Key::Down) => (i + 1).min(n - 1),
                        (Some(i), _) => i.saturating_sub(1),
                    });
                    self.prompt.input.clear();
                }
            }
            // Typing a name replaces the pick.
            Key::Char(_) if self.prompt.edit(key) => self.selected = None,
            _ => {
                self.prompt.edit(key);
            }
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn render(&self, _ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        let title = match self.purpose {
            OpenPurpose::WholeCase => " Open a case file ",
            OpenPurpose::InputsOnly => " Take the inputs from a case file (symptoms kept) ",
        };
        let prompt = &self.prompt;
        let mut lines = path_prompt("file: ", &prompt.input, prompt.error.as_deref(), theme);
        lines.push(Line::from(Span::styled(
            "found nearby (↑↓ then Enter):",
            theme.dim(),
        )));
        let rect = centred(area, 72, area.height.saturating_sub(4).min(16));
        let room = usize::from(rect.height.saturating_sub(2)).saturating_sub(lines.len());
        let first = self
            .selected
            .unwrap_or(0)
            .saturating_sub(room.saturating_sub(1));
        for (i, name) in self.suggestions.iter().enumerate().skip(first).take(room) {
            let style = if self.selected == Some(i) {
                theme.selected()
            } else {
                theme.plain()
            };
            lines.push(Line::from(Span::styled(format!("  {name}"), style)));
        }
        if self.suggestions.is_empty() {
            lines.push(Line::from(Span::styled(
                "  (no .yaml files in ./cases or here)",
                theme.dim(),
            )));
        }
        super::framed(lines, title, rect, buf);
    }
}

/// Case files in `cases/` and the current folder, for the open prompt.
pub fn case_files_nearby() -> Vec<String> {
    let mut found = Vec::new();
    for folder in ["cases", "."] {
        if let Ok(entries) = std::fs::read_dir(folder) {
            for entry in entries.flatten() {
                let path = entry.path();
                if crate::fsutil::is_yaml(&path) {
                    let shown = if folder == "." {
                        path.file_name().map(|n| n.to_string_lossy().into_owned())
                    } else {
                        Some(path.display().to_string())
                    };
                    found.extend(shown);
                }
            }
        }
    }
    found.sort();
    found
}
