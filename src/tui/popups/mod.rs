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
