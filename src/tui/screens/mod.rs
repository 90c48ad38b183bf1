//! The screens, one module each (state, keys, hints, drawing), the frame around them (tabs,
//! status, help line) and the shared plot widget. Drawing changes no state.

pub mod inputs;
pub mod plot;
pub mod results;
pub mod symptoms;
pub mod what_if;

use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span, Text};
use ratatui::widgets::{Block, Paragraph, Widget, Wrap};

use super::app::{App, Screen, tab_labels};
use super::component::Component;
use super::theme::Theme;
pub use crate::units::{compact_length, compact_stress, sig3};

/// The whole UI drawn for one frame.
pub struct AppView<'a> {
    pub app: &'a App,
    pub theme: Theme,
}

impl Widget for &App {
    fn render(self, area: Rect, buf: &mut Buffer) {
        AppView {
            app: self,
            theme: Theme::from_env(),
        }
        .render(area, buf);
    }
}

pub(crate) const SPINNER: [char; 8] = ['⠁', '⠂', '⠄', '⡀', '⢀', '⠠', '⠐', '⠈'];

/// The smallest window the screens are laid out for; below it only a message is drawn.
pub const MIN_WIDTH: u16 = 60;
pub const MIN_HEIGHT: u16 = 16;

impl Widget for AppView<'_> {
    fn render(self, area: Rect, buf: &mut Buffer) {
        let app = self.app;
        let session = &app.session;
        let theme = self.theme;
        if area.width < MIN_WIDTH || area.height < MIN_HEIGHT {
            // Cut-off screens mislead more than no screen: say what is needed instead.
            let lines = vec![
                Line::from(Span::styled("Window too small", theme.warn())),
                Line::from(format!(
                    "{}×{} here; rolltriage needs at least {MIN_WIDTH}×{MIN_HEIGHT}.",
                    area.width, area.height
                )),
                Line::from("Enlarge the window, or press Ctrl-Q to quit."),
            ];
            wrapped(lines, true).render(area, buf);
            return;
        }
        let [header, body, status, help_line] = Layout::vertical([
            Constraint::Length(1),
            Constraint::Min(0),
            Constraint::Length(1),
            Constraint::Length(1),
        ])
        .areas(area);

        // Tabs on the left, the case name and solver state on the right.
        let mut spans = Vec::new();
        for (label, screen) in tab_labels().into_iter().zip(Screen::ALL) {
            let style = if screen == app.screen {
                theme.selected()
            } else {
                theme.plain()
            };
            spans.push(Span::styled(label, style));
            spans.push(Span::raw(" "));
        }
        Paragraph::new(Line::from(spans)).render(header, buf);
        let mut right = String::new();
        if let Some(running) = session.running_baseline.or(session.running_what_if) {
            let frame = SPINNER[(session.tick as usize) % SPINNER.len()];
            right.push_str(&format!(
                "{frame} solving{:>4.0}%  ",
                running.fraction * 100.0
            ));
        }
        let name = session
            .case_path
            .as_ref()
            .and_then(|p| p.file_name())
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_else(|| "new case".into());
        right.push_str(&name);
        if session.dirty {
            right.push_str(" *changed");
        }
        let tabs_width: usize = tab_labels().iter().map(|l| l.chars().count() + 1).sum();
        let room = usize::from(header.width).saturating_sub(tabs_width + 1);
        if room > 8 {
            let shown: String = if right.chars().count() > room {
                let skip = right.chars().count() - room + 1;
                format!("…{}", right.chars().skip(skip).collect::<String>())
            } else {
                right
            };
            Paragraph::new(Line::from(Span::styled(shown, theme.dim())).right_aligned())
                .render(header, buf);
        }

        app.render_screen(theme, body, buf);

        if let Some(message) = &session.status {
            Paragraph::new(Line::from(Span::styled(message.clone(), theme.warn())))
                .render(status, buf);
        }
        help_line_widget(app, theme).render(help_line, buf);

        for popup in &app.popups {
            popup.render(session, theme, area, buf);
        }
        plain_spaces(area, buf);
    }
}

/// The no-break spaces that kept numbers with their units while wrapping are drawn as plain
/// spaces: the terminal shows the same, and text copied off the screen has ordinary spaces.
fn plain_spaces(area: Rect, buf: &mut Buffer) {
    let no_break = crate::units::NO_BREAK.to_string();
    for y in area.top()..area.bottom() {
        for x in area.left()..area.right() {
            if let Some(cell) = buf.cell_mut((x, y))
                && cell.symbol() == no_break
            {
                cell.set_symbol(" ");
            }
        }
    }
}

/// The always-visible key line: as many hints as fit.
fn help_line_widget(app: &App, theme: Theme) -> Paragraph<'static> {
    let mut spans = Vec::new();
    for (key, what) in app.key_hints() {
        spans.push(Span::styled(key.to_string(), theme.key()));
        spans.push(Span::raw(format!(" {what}  ")));
    }
    Paragraph::new(Line::from(spans))
}

/// A word-wrapped paragraph of `text` whose numbers keep their units on the same row (see
/// [`keep_units`]): every wrapped text of the screens and popups is drawn through it.
pub fn wrapped<'a>(text: impl Into<Text<'a>>, trim: bool) -> Paragraph<'a> {
    let mut text = text.into();
    for line in &mut text.lines {
        keep_units(line);
    }
    Paragraph::new(text).wrap(Wrap { trim })
}

/// Join each number in `line` to its unit with a no-break space ("2.6 pli" stays whole when
/// wrapped): ratatui's word wrapping and [`hang`] break only at plain spaces.
pub fn keep_units(line: &mut Line) {
    for span in &mut line.spans {
        if let std::borrow::Cow::Owned(joined) = crate::units::keep_with_unit(&span.content) {
            span.content = joined.into();
        }
    }
}

/// Rows `line` takes when word-wrapped to `width` cells (an estimate: word wrapping can take a
/// row more, hence the spare line in [`scroll_to_keep`]).
fn rows(line: &Line, width: u16) -> usize {
    line.width().div_ceil(usize::from(width).max(1)).max(1)
}

/// Scroll so that lines `first..=last` show (a remedy with its cautions below it): their end
/// comes into view, but never so far that `first` scrolls off the top.
pub fn scroll_to_keep_block(
    lines: &[Line],
    first: usize,
    last: usize,
    width: u16,
    height: u16,
) -> u16 {
    let before_first: usize = lines.iter().take(first).map(|l| rows(l, width)).sum();
    let to_end = scroll_to_keep(lines, last.max(first), width, height);
    (usize::from(to_end).min(before_first)) as u16
}

/// Scroll offset that keeps logical line `target` (and the line after it) of a wrapped
/// paragraph in a box `width`×`height` (inside its borders) in view.
pub fn scroll_to_keep(lines: &[Line], target: usize, width: u16, height: u16) -> u16 {
    let before: usize = lines.iter().take(target).map(|l| rows(l, width)).sum();
    let here = lines.get(target).map_or(1, |l| rows(l, width));
    (before + here + 1).saturating_sub(usize::from(height)) as u16
}

/// Draw `lines` word-wrapped inside `block`, scrolled so that lines `first..=last` stay in view
/// and then `past` rows further (clamped at the end). Returns how many rows past the kept block
/// the pane could scroll, so keys can clamp to it.
pub fn render_scrolled_past<'a>(
    lines: Vec<Line<'a>>,
    (first, last): (usize, usize),
    past: u16,
    block: Block<'a>,
    area: Rect,
    buf: &mut Buffer,
) -> u16 {
    let (width, height) = (area.width.saturating_sub(2), area.height.saturating_sub(2));
    let keep = scroll_to_keep_block(&lines, first, last, width, height);
    let total: usize = lines.iter().map(|l| rows(l, width)).sum();
    let most = u16::try_from(total.saturating_sub(usize::from(height))).unwrap_or(u16::MAX);
    let reach = most.saturating_sub(keep);
    wrapped(lines, false)
        .scroll((keep.saturating_add(past.min(reach)), 0))
        .block(block)
        .render(area, buf);
    reach
}

/// Word-wrap `line` to `width` cells with its continuation rows indented by `indent` spaces
/// (styles kept), so a wrapped cause or reason reads as one item. Breaks only at plain spaces:
/// a number joined to its unit by a no-break space stays with it.
pub fn hang(mut line: Line<'static>, width: usize, indent: usize) -> Vec<Line<'static>> {
    keep_units(&mut line);
    if width <= indent + 8 || line.width() <= width {
        return vec![line];
    }
    // Words with the spaces before them, each with its span's style.
    let mut tokens: Vec<(String, ratatui::style::Style)> = Vec::new();
    for span in &line.spans {
        let mut word = String::new();
        for c in span.content.chars() {
            if c == ' ' && !word.is_empty() && !word.ends_with(' ') {
                tokens.push((std::mem::take(&mut word), span.style));
            }
            word.push(c);
        }
        if !word.is_empty() {
            tokens.push((word, span.style));
        }
    }
    let mut out = Vec::new();
    let mut current: Vec<Span<'static>> = Vec::new();
    let mut used = 0;
    for (token, style) in tokens {
        let mut token = token;
        let length = token.chars().count();
        if used + length > width && used > indent {
            out.push(Line::from(std::mem::take(&mut current)));
            current.push(Span::raw(" ".repeat(indent)));
            token = token.trim_start().to_string();
            used = indent;
        }
        used += token.chars().count();
        current.push(Span::styled(token, style));
    }
    if !current.is_empty() {
        out.push(Line::from(current));
    }
    out
}

/// Draw `lines` word-wrapped inside `block`, scrolled so that logical line `target` stays in
/// view (`None`: from the top).
pub fn render_scrolled<'a>(
    lines: Vec<Line<'a>>,
    target: Option<usize>,
    block: Block<'a>,
    area: Rect,
    buf: &mut Buffer,
) {
    let target = target.unwrap_or(0);
    render_scrolled_past(lines, (target, target), 0, block, area, buf);
}

/// A centred rectangle `width`×`height` inside `area` (clipped to it).
pub fn centred(area: Rect, width: u16, height: u16) -> Rect {
    let width = width.min(area.width);
    let height = height.min(area.height);
    Rect {
        x: area.x + (area.width - width) / 2,
        y: area.y + (area.height - height) / 2,
        width,
        height,
    }
}
