//! The margins popup (F10): "Margins against each failure" — for each mechanism the smallest
//! margin, where it is as a roll diameter, the demand and capacity behind it and a plain
//! verdict. The very table the reports print ([`crate::report::margins_section`]), drawn from
//! the latest solve in the session's units.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};

use crate::report::{MarginLine, MarginsSection};
use crate::tui::component::{ANY, Action, Binding, Component, Handled};
use crate::tui::event::Key;
use crate::tui::screens::{centred, hang};
use crate::tui::session::Session;
use crate::tui::theme::Theme;

/// First line shown.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct MarginsPopup {
    pub scroll: u16,
}

pub const KEYS: &[Binding] = &[
    Binding::both(ANY, "↑↓", "scroll", "↑↓ PgUp PgDn", "scroll the table"),
    Binding::both(ANY, "Esc", "close", "Esc / F10", "close the margins"),
];

impl Component for MarginsPopup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        let closes = matches!(key, Key::Esc | Key::F(10) | Key::Char('q'));
        if closes {
            ctx.push(Action::Close);
        } else {
            super::scroll_key(&mut self.scroll, key, 100);
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        let outer = centred(area, 110, area.height.saturating_sub(2));
        let width = usize::from(outer.width.saturating_sub(2));
        let lines = match ctx.latest_outcome() {
            None => vec![Line::from(Span::styled(
                "No solved roll yet: the margins appear once the roll is solved (Ctrl-R solves \
                 again).",
                theme.dim(),
            ))],
            Some(outcome) => {
                let section =
                    crate::report::margins_section(&outcome.resolved, &outcome.profile, ctx.units);
                let mut lines = table_lines(&section, theme, width);
                if ctx.current_outcome().is_none() {
                    lines.insert(
                        0,
                        Line::from(Span::styled(
                            "Out of date: the case changed since this solve.",
                            theme.warn(),
                        )),
                    );
                }
                lines
            }
        };
        // As tall as the table (wrapped lines counted), at most the screen.
        let needed: usize = lines
            .iter()
            .map(|l| l.width().div_ceil(width.max(1)).max(1))
            .sum();
        let rect = centred(
            area,
            outer.width,
            (needed as u16).saturating_add(2).min(outer.height),
        );
        // Wrapped as the screens wrap: a number keeps its unit on its row.
        super::framed_scrolled(
            lines,
            self.scroll,
            "Margins against each failure — Esc closes",
            rect,
            buf,
        );
    }
}

/// Two lines a mechanism: name, margin and where; then the verdict with demand and capacity.
fn table_lines(section: &MarginsSection, theme: Theme, width: usize) -> Vec<Line<'static>> {
    let name_width = section
        .rows
        .iter()
        .map(|r| r.mechanism.chars().count())
        .max()
        .unwrap_or(0)
        .min(40);
    let mut lines = vec![Line::from(Span::styled(
        format!(" {:<name_width$}  {:>9}  Where", "Failure", "Margin"),
        theme.title(),
    ))];
    for row in &section.rows {
        lines.push(Line::from(vec![
            Span::raw(format!(" {:<name_width$}  ", row.mechanism)),
            Span::styled(format!("{:>9}", row.margin_text), verdict_style(row, theme)),
            Span::raw(format!("  {}", row.where_text)),
        ]));
        lines.extend(hang(
            Line::from(vec![
                Span::raw("   "),
                Span::styled(row.verdict_text.clone(), verdict_style(row, theme)),
                Span::styled(
                    format!(
                        " — {} {} / {}",
                        row.measures, row.demand.text, row.capacity.text
                    ),
                    theme.dim(),
                ),
            ]),
            width,
            5,
        ));
    }
    lines.push(Line::from(""));
    lines.extend(hang(
        Line::from(Span::styled(format!(" {}", section.note()), theme.dim())),
        width,
        1,
    ));
    lines
}

fn verdict_style(row: &MarginLine, theme: Theme) -> ratatui::style::Style {
    match row.verdict.as_str() {
        "fails" => theme.error(),
        "close" => theme.warn(),
        _ => theme.plain(),
    }
}
