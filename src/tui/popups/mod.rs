//! Popups drawn over the screens, one module each with its state, keys, hints and drawing. The
//! app keeps them on a stack; the top one gets every key.

pub mod calibrate;
pub mod confirm;
pub mod help;
pub mod open;
pub mod prompt;
pub mod training;
pub mod walkthrough;

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;

pub use calibrate::{CalibratePopup, StackFit};
pub use confirm::ConfirmPopup;
pub use help::HelpPopup;
pub use open::OpenPopup;
pub use prompt::{ExportPopup, PathPrompt, SaveAsPopup};
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
    SaveAs(SaveAsPopup),
    /// Export a report; the format follows the file's extension (.md, .html, .json).
    Export(ExportPopup),
    /// Pick a training walk-through.
    Training(TrainingPopup),
    /// A training walk-through being answered inside the UI.
    Walkthrough(Box<WalkthroughRun>),
    /// Fit the web's radial stiffness (Pfeiffer K1, K2) to a stack-compression test CSV.
    Calibrate(Box<CalibratePopup>),
}

impl Popup {
    fn component(&self) -> &dyn Component {
        match self {
            Popup::Help(p) => p,
            Popup::Confirm(p) => p,
            Popup::Open(p) => p,
            Popup::SaveAs(p) => p,
            Popup::Export(p) => p,
            Popup::Training(p) => p,
            Popup::Walkthrough(p) => p.as_ref(),
            Popup::Calibrate(p) => p.as_ref(),
        }
    }

    fn component_mut(&mut self) -> &mut dyn Component {
        match self {
            Popup::Help(p) => p,
            Popup::Confirm(p) => p,
            Popup::Open(p) => p,
            Popup::SaveAs(p) => p,
            Popup::Export(p) => p,
            Popup::Training(p) => p,
            Popup::Walkthrough(p) => p.as_mut(),
            Popup::Calibrate(p) => p.as_mut(),
        }
    }

    /// Show why the popup's request failed (file prompts).
    pub fn show_error(&mut self, error: String) {
        match self {
            Popup::Open(p) => p.error = Some(error),
            Popup::SaveAs(p) => p.0.error = Some(error),
            Popup::Export(p) => p.0.error = Some(error),
            _ => {}
        }
    }
}

impl Component for Popup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        self.component_mut().on_key(key, ctx)
    }

    fn key_map(&self) -> &'static [Binding] {
        self.component().key_map()
    }

    fn mode(&self, ctx: &Session) -> u8 {
        self.component().mode(ctx)
    }

    fn hints(&self, ctx: &Session) -> Vec<Hint> {
        self.component().hints(ctx)
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        self.component().render(ctx, theme, area, buf);
    }
}
