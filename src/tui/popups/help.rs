//! The help popup: every key, grouped by where it works — generated from the components' key
//! maps, so it always matches the handlers' tables — and how to read the plots.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};

use crate::tui::component::{ANY, Action, Binding, Component, Handled, Hint, help_entries};
use crate::tui::event::Key;
use crate::tui::screens::{self, centred};
use crate::tui::session::Session;
use crate::tui::theme::Theme;

/// First line shown.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct HelpPopup {
    pub scroll: u16,
}

const KEYS: &[Binding] = &[
    Binding::line(ANY, "↑↓ PgUp PgDn", "scroll"),
    Binding::line(ANY, "Esc", "close help"),
];

/// How to read the plots (not keys).
#[rustfmt::skip]
const PLOT_LEGEND: &[Hint] = &[
    ("core inner middle outer", "zones of the roll, named on the top row"),
    ("C … S", "core and surface zones when too narrow for the name"),
    ("· and ┆", "every other zone is dotted; ┆ marks a zone boundary"),
    ("═ crush rating", "the core's rated crush pressure (↑ when off the plot)"),
    ("─", "zero"),
    ("⣿ / •", "the curve (after a change) / before the change"),
];

/// (section, [(key, what it does)]) — the full list shown by F1, in screen order.
pub fn sections() -> Vec<(&'static str, Vec<Hint>)> {
    vec![
        ("Everywhere", help_entries(crate::tui::app::GLOBAL_KEYS)),
        ("Symptoms", help_entries(screens::symptoms::KEYS)),
        ("Roll & winding", help_entries(screens::inputs::KEYS)),
        ("Results", help_entries(screens::results::KEYS)),
        ("What-if", help_entries(screens::what_if::KEYS)),
        (
            "Training walk-through",
            help_entries(super::walkthrough::KEYS),
        ),
        ("Complaint & story (F7)", help_entries(super::story::KEYS)),
        ("Complaint history (F8)", help_entries(super::history::KEYS)),
        ("Measurements (F9)", help_entries(super::measure::KEYS)),
        ("Margins (F10)", help_entries(super::margins::KEYS)),
        ("Reading the plots", PLOT_LEGEND.to_vec()),
    ]
}

impl Component for HelpPopup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        if !super::scroll_key(&mut self.scroll, key, 200)
            && matches!(
                key,
                Key::Esc | Key::F(1) | Key::Char('?') | Key::Char('q') | Key::Enter
            )
        {
            ctx.push(Action::Close);
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn render(&self, _ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        let rect = centred(area, 80, area.height.saturating_sub(2));
        // Long entries wrap under their text instead of running off the box.
        let width = usize::from(rect.width.saturating_sub(2));
        let mut lines = Vec::new();
        for (section, keys) in sections() {
            lines.push(Line::from(Span::styled(section, theme.title())));
            for (key, what) in keys {
                lines.extend(crate::tui::screens::hang(
                    Line::from(vec![
                        Span::styled(format!("  {key:<24}"), theme.key()),
                        Span::raw(what),
                    ]),
                    width,
                    26,
                ));
            }
        }
        super::framed_scrolled(
            lines,
            self.scroll,
            "Keys — ↑↓ scroll, Esc closes",
            rect,
            buf,
        );
    }
}
