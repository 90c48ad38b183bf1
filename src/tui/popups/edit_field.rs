//! The one-line text editor and the frame shared by the row-editing popups (the complaint's
//! story, F7, and the measurements, F9): the keys that edit the typed text, the bordered popup
//! over the screens with its list of `label  value` rows and the detail lines under it, and the
//! clipping of a value to its room. The popups keep their own rows, checks and hints.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Clear, Paragraph, Widget};

use crate::tui::event::Key;
use crate::tui::theme::Theme;

/// What a key did to the text being typed.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Typed {
    /// The text changed (or the key was not for the editor); keep typing.
    Editing,
    /// Enter: check the text and keep it.
    Enter,
    /// Esc: drop the text.
    Cancel,
}

/// Apply `key` to `typed`: characters, Backspace, Ctrl-U (clear), Ctrl-W (the last word).
pub fn edit(typed: &mut String, key: Key) -> Typed {
    match key {
        Key::Char(c) => typed.push(c),
        Key::Backspace => {
            typed.pop();
        }
        Key::Ctrl('u') => typed.clear(),
        Key::Ctrl('w') => {
            let kept = typed.trim_end().rfind(' ').map_or(0, |i| i + 1);
            typed.truncate(kept);
        }
        Key::Enter => return Typed::Enter,
        Key::Esc => return Typed::Cancel,
        _ => {}
    }
    Typed::Editing
}

/// Move the selection among rows `0..=last` with ↑↓, PgUp/PgDn (ten rows), Home and End;
/// false for any other key.
pub fn move_selection(selected: &mut usize, last: usize, key: Key) -> bool {
    *selected = match key {
        Key::Up => selected.saturating_sub(1),
        Key::Down => (*selected + 1).min(last),
        Key::PageUp => selected.saturating_sub(10),
        Key::PageDown => (*selected + 10).min(last),
        Key::Home => 0,
        Key::End => last,
        _ => return false,
    };
    true
}

/// `text` cut to `width` characters, ending in "…" when cut (the full text shows below).
pub fn clip(text: &str, width: usize) -> String {
    if text.chars().count() <= width {
        text.to_string()
    } else {
        let mut cut: String = text.chars().take(width.saturating_sub(1)).collect();
        cut.push('…');
        cut
    }
}

/// The popup's two parts inside its border: the rows and the detail lines under them.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Frame {
    /// Everything inside the border (a page drawn without rows uses all of it).
    pub inner: Rect,
    pub list: Rect,
    pub detail: Rect,
    /// Width of the label column.
    pub label_width: usize,
}

/// Draw the bordered popup titled `title` over everything but the status and key lines, and
/// split its inside into the list and four detail lines. `None` when the room is too small to
/// show anything. `labels` gives the label column's width: (narrow, from 100 columns).
pub fn frame(title: &str, labels: (usize, usize), area: Rect, buf: &mut Buffer) -> Option<Frame> {
    let rect = Rect {
        height: area.height.saturating_sub(2),
        ..area
    };
    Clear.render(rect, buf);
    let block = Block::bordered().title(title.to_string());
    let inner = block.inner(rect);
    block.render(rect, buf);
    if inner.height < 3 || inner.width < 20 {
        return None;
    }
    let detail_height = 4u16.min(inner.height / 3);
    let list = Rect {
        height: inner.height - detail_height,
        ..inner
    };
    let detail = Rect {
        y: inner.y + list.height,
        height: detail_height,
        ..inner
    };
    let label_width = if inner.width >= 100 {
        labels.1
    } else {
        labels.0
    };
    Some(Frame {
        inner,
        list,
        detail,
        label_width,
    })
}

impl Frame {
    /// One `label  value` row; the value clipped to the room left of the label.
    pub fn row(&self, label: &str, value: &str, selected: bool, theme: Theme) -> Line<'static> {
        let width = self.label_width;
        let room = usize::from(self.list.width).saturating_sub(width + 2);
        let style = if selected {
            theme.selected()
        } else {
            theme.plain()
        };
        Line::from(vec![
            Span::styled(format!(" {label:<width$} "), theme.key()),
            Span::styled(clip(value, room), style),
        ])
    }

    /// Draw `lines` scrolled so that line `selected_line` stays in view.
    pub fn render_list(&self, lines: Vec<Line<'_>>, selected_line: usize, buf: &mut Buffer) {
        let first = (selected_line + 2).saturating_sub(usize::from(self.list.height));
        Paragraph::new(lines)
            .scroll((first as u16, 0))
            .render(self.list, buf);
    }

    /// A dim rule across the detail part, the first of its lines.
    pub fn rule(&self, theme: Theme) -> Line<'static> {
        Line::from(Span::styled(
            "─".repeat(usize::from(self.detail.width)),
            theme.dim(),
        ))
    }

    /// Draw the detail lines, wrapped as the screens wrap (a number keeps its unit on its row).
    pub fn render_detail(&self, lines: Vec<Line<'_>>, buf: &mut Buffer) {
        crate::tui::screens::wrapped(lines, false).render(self.detail, buf);
    }
}
