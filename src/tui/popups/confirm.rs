//! "Unsaved changes": save first, discard, or go back.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};

use crate::tui::component::{ANY, Action, Binding, Component, Handled, PendingAction};
use crate::tui::event::Key;
use crate::tui::screens::centred;
use crate::tui::session::Session;
use crate::tui::theme::Theme;

/// The action waiting for the user's word.
#[derive(Debug, Clone, PartialEq)]
pub struct ConfirmPopup(pub PendingAction);

const KEYS: &[Binding] = &[
    Binding::line(ANY, "s", "save first"),
    Binding::line(ANY, "d", "discard"),
    Binding::line(ANY, "Esc", "cancel"),
];

impl Component for ConfirmPopup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        match key {
            Key::Char('s') | Key::Char('S') => ctx.push(Action::SaveThen(self.0.clone())),
            Key::Char('d') | Key::Char('D') => {
                ctx.dirty = false;
                ctx.push(Action::Close);
                ctx.push(Action::Perform(self.0.clone()));
            }
            Key::Esc | Key::Char('c') => ctx.push(Action::Close),
            _ => {}
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn render(&self, _ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        let doing = match &self.0 {
            PendingAction::Quit => "quitting".to_string(),
            PendingAction::NewCase => "starting a blank case".to_string(),
            PendingAction::Open(path) => format!("opening {}", path.display()),
            PendingAction::Training(_) => "opening the walk-through".to_string(),
        };
        let lines = vec![
            Line::from(format!("The case has unsaved changes. Before {doing}:")),
            Line::from(""),
            Line::from(vec![
                Span::styled("  s ", theme.key()),
                Span::raw("save, then continue"),
            ]),
            Line::from(vec![
                Span::styled("  d ", theme.key()),
                Span::raw("discard the changes and continue"),
            ]),
            Line::from(vec![
                Span::styled("  Esc ", theme.key()),
                Span::raw("go back"),
            ]),
        ];
        let rect = centred(area, 60, 7);
        super::framed(lines, " Unsaved changes ", rect, buf);
    }
}
