//! Popups drawn over the screens, one module each with its state, keys, hints and drawing. The
//! app keeps them on a stack; the top one gets every key.

pub mod calibrate;
pub mod confirm;
pub mod edit_field;
pub mod help;
pub mod history;
pub mod margins;
pub mod measure;
pub mod measure_rows;
pub mod measure_view;
pub mod open;
pub mod prompt;
pub mod story;
pub mod training;
pub mod walkthrough;

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;

pub use calibrate::{CalibratePopup, StackFit};
pub use confirm::ConfirmPopup;
pub use help::HelpPopup;
pub use history::{HistoryPopup, HistoryView};
pub use margins::MarginsPopup;
pub use measure::MeasurePopup;
pub use open::OpenPopup;
pub use prompt::{FilePopup, FilePurpose, PathPrompt};
pub use story::StoryPopup;
pub use training::TrainingPopup;
pub use walkthrough::{WalkStage, WalkthroughRun};

use super::component::{Binding, Component, Handled, Hint};
use super::event::Key;
use super::session::Session;
use super::theme::Theme;

#[derive(Debug, Clone, PartialEq)]
pub enum Popup {
    Help(HelpPopup),
    Confirm(ConfirmPopup),
    Open(OpenPopup),
    /// Save the case as, or export a report (the format follows the file's extension).
    File(FilePopup),
    /// Pick a training walk-through.
    Training(TrainingPopup),
    /// A training walk-through being answered inside the UI.
    Walkthrough(Box<WalkthroughRun>),
    /// Fit the web's radial stiffness (Pfeiffer K1, K2) to a stack-compression test CSV.
    Calibrate(Box<CalibratePopup>),
    /// The complaint's story: title, description, notes, symptom notes, complaint record.
    Story(StoryPopup),
    /// The plant's complaint history.
    History(Box<HistoryPopup>),
    /// Measurements on the bad roll, and measured against computed.
    Measure(Box<MeasurePopup>),
    /// Margins against each failure mechanism of the solved roll.
    Margins(MarginsPopup),
}

/// Run `$body` with `$p` bound to the popup's own component.
macro_rules! each_popup {
    ($popup:expr, $p:ident => $body:expr) => {
        match $popup {
            Popup::Help($p) => $body,
            Popup::Confirm($p) => $body,
            Popup::Open($p) => $body,
            Popup::File($p) => $body,
            Popup::Training($p) => $body,
            Popup::Walkthrough($p) => $body,
            Popup::Calibrate($p) => $body,
            Popup::Story($p) => $body,
            Popup::History($p) => $body,
            Popup::Measure($p) => $body,
            Popup::Margins($p) => $body,
        }
    };
}

/// Modes of the status line of the popups that edit a list of fields (story, measurements):
/// moving between fields, on a field with choices, typing into one.
pub const MOVE: u8 = 1;
pub const CHOICE: u8 = 2;
pub const TYPING: u8 = 4;

/// The status-line mode of a field-list popup: typing, or moving (with choices on a choice
/// field).
pub fn field_mode(typing: bool, choice: bool) -> u8 {
    match (typing, choice) {
        (true, _) => TYPING,
        (false, true) => MOVE | CHOICE,
        (false, false) => MOVE,
    }
}

/// The frame of a popup: clear `rect`, draw a bordered box titled `title` and `lines` in it,
/// wrapped as the screens wrap (a number keeps its unit on its row).
pub fn framed(lines: Vec<ratatui::text::Line<'_>>, title: &str, rect: Rect, buf: &mut Buffer) {
    framed_from(lines, 0, title.to_string(), rect, buf);
}

/// [`framed`], showing `lines` from `scroll` (at most so far that the last line is at the
/// bottom); the title (" Keys — Esc closes") says "↓ more" while lines are below.
pub fn framed_scrolled(
    lines: Vec<ratatui::text::Line<'_>>,
    scroll: u16,
    title: &str,
    rect: Rect,
    buf: &mut Buffer,
) {
    let room = usize::from(rect.height.saturating_sub(2));
    let last_start = lines.len().saturating_sub(room) as u16;
    let scroll = scroll.min(last_start);
    let more = if scroll < last_start { " ↓ more" } else { "" };
    framed_from(
        lines,
        scroll,
        format!(" {}{more} ", title.trim()),
        rect,
        buf,
    );
}

fn framed_from(
    lines: Vec<ratatui::text::Line<'_>>,
    scroll: u16,
    title: String,
    rect: Rect,
    buf: &mut Buffer,
) {
    use ratatui::widgets::{Block, Clear, Widget};
    Clear.render(rect, buf);
    crate::tui::screens::wrapped(lines, false)
        .scroll((scroll, 0))
        .block(Block::bordered().title(title))
        .render(rect, buf);
}

/// The scrolling keys of a text popup (↑↓ PgUp PgDn Home) applied to `scroll`, at most `max`;
/// false for any other key.
pub fn scroll_key(scroll: &mut u16, key: Key, max: u16) -> bool {
    *scroll = match key {
        Key::Up => scroll.saturating_sub(1),
        Key::Down => scroll.saturating_add(1).min(max),
        Key::PageUp => scroll.saturating_sub(10),
        Key::PageDown => scroll.saturating_add(10).min(max),
        Key::Home => 0,
        _ => return false,
    };
    true
}

impl Popup {
    /// Show why the popup's request failed (file prompts).
    pub fn show_error(&mut self, error: String) {
        match self {
            Popup::Open(p) => p.prompt.error = Some(error),
            Popup::File(p) => p.prompt.error = Some(error),
            _ => {}
        }
    }
}

impl Component for Popup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        each_popup!(self, p => p.on_key(key, ctx))
    }

    fn key_map(&self) -> &'static [Binding] {
        each_popup!(self, p => p.key_map())
    }

    fn mode(&self, ctx: &Session) -> u8 {
        each_popup!(self, p => p.mode(ctx))
    }

    fn hints(&self, ctx: &Session) -> Vec<Hint> {
        each_popup!(self, p => p.hints(ctx))
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        each_popup!(self, p => p.render(ctx, theme, area, buf))
    }
}
