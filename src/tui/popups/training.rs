//! Pick a training walk-through to answer.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};

use crate::tui::component::{ANY, Action, Binding, Component, Handled, PendingAction};
use crate::tui::event::Key;
use crate::tui::screens::centred;
use crate::tui::session::Session;
use crate::tui::theme::Theme;

/// The highlighted walk-through (index into `Session::walkthroughs`).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct TrainingPopup {
    pub selected: usize,
}

const KEYS: &[Binding] = &[
    Binding::line(ANY, "↑↓", "pick"),
    Binding::line(ANY, "Enter", "start"),
    Binding::line(ANY, "Esc", "cancel"),
];

impl Component for TrainingPopup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        match key {
            Key::Up => self.selected = self.selected.saturating_sub(1),
            Key::Down => {
                self.selected = (self.selected + 1).min(ctx.walkthroughs.len().saturating_sub(1))
            }
            Key::Enter => {
                ctx.push(Action::Close);
                ctx.push(Action::Ask(PendingAction::Training(self.selected)));
            }
            Key::Esc => ctx.push(Action::Close),
            _ => {}
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        let rect = centred(area, 76, area.height.saturating_sub(4).min(18));
        let room = usize::from(rect.height.saturating_sub(2));
        let first = self.selected.saturating_sub(room.saturating_sub(1));
        let mut lines = Vec::new();
        for (i, loaded) in ctx.walkthroughs.iter().enumerate().skip(first).take(room) {
            let w = &loaded.walkthrough;
            let style = if i == self.selected {
                theme.selected()
            } else {
                theme.plain()
            };
            // A title too long for the box is cut with "…" so its level stays in view.
            let level = format!(" [{}]", w.level.as_deref().unwrap_or(""));
            let room = usize::from(rect.width.saturating_sub(3)).saturating_sub(level.len());
            let title = if w.title.chars().count() > room {
                let cut: String = w.title.chars().take(room.saturating_sub(1)).collect();
                format!("{}…", cut.trim_end())
            } else {
                w.title.clone()
            };
            lines.push(Line::from(Span::styled(format!(" {title}{level}"), style)));
        }
        super::framed(
            lines,
            " Training walk-throughs — Enter starts one ",
            rect,
            buf,
        );
    }
}
