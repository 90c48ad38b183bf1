//! The parts every screen and popup share: the [`Component`] trait (key handling, key hints,
//! drawing), the [`Action`]s a component asks the app for, and the [`Binding`] tables that are
//! the UI's one key map — the status line and the help screen are both generated from them.

use std::path::PathBuf;

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;

use super::event::Key;
use super::popups::Popup;
use super::session::Session;
use super::theme::Theme;

/// Whether a component used a key.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Handled {
    Yes,
    No,
}

/// The screens, in the order Tab visits them.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Screen {
    Symptoms,
    Inputs,
    Results,
    WhatIf,
}

impl Screen {
    pub const ALL: [Screen; 4] = [
        Screen::Symptoms,
        Screen::Inputs,
        Screen::Results,
        Screen::WhatIf,
    ];

    pub fn title(self) -> &'static str {
        match self {
            Screen::Symptoms => "Symptoms",
            Screen::Inputs => "Roll & winding",
            Screen::Results => "Results",
            Screen::WhatIf => "What-if",
        }
    }

    fn index(self) -> usize {
        Screen::ALL.iter().position(|s| *s == self).unwrap_or(0)
    }

    pub fn next(self) -> Screen {
        Screen::ALL[(self.index() + 1) % Screen::ALL.len()]
    }

    pub fn previous(self) -> Screen {
        Screen::ALL[(self.index() + Screen::ALL.len() - 1) % Screen::ALL.len()]
    }
}

/// Something that throws away unsaved changes, waiting for the user's word.
#[derive(Debug, Clone, PartialEq)]
pub enum PendingAction {
    Quit,
    NewCase,
    Open(PathBuf),
    /// Open a training walk-through's case (index into `Session::walkthroughs`).
    Training(usize),
}

/// What an open-file prompt loads.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum OpenPurpose {
    /// Replace the whole case.
    WholeCase,
    /// Take web, core, roll and winding from the file; keep the symptoms and answers.
    InputsOnly,
}

/// What a component asks the app to do; queued on the [`Session`] and carried out by the app
/// after the key, in order.
#[derive(Debug, Clone, PartialEq)]
pub enum Action {
    /// The case was edited: the what-if trial of the old case is dropped.
    CaseEdited,
    GoTo(Screen),
    /// Open a popup over everything.
    Push(Popup),
    /// Close the popup on top.
    Close,
    /// Save to the case's file, or ask for a name.
    Save,
    /// Save under this name (the save-as popup); a failure is shown in the popup.
    SaveTo(PathBuf),
    /// Save, then carry on with the action (the unsaved-changes popup).
    SaveThen(PendingAction),
    /// Ask before discarding unsaved changes, then do it.
    Ask(PendingAction),
    /// Do it now (the changes were discarded).
    Perform(PendingAction),
    /// Load a case file; a failure is shown in the popup.
    Open(PathBuf, OpenPurpose),
    /// Write a report; a failure is shown in the popup.
    Export(PathBuf),
    /// Try a remedy's setting changes on the what-if screen.
    TryRemedy(String),
}

/// One key binding as the user reads it: a short form for the status line, a long one for the
/// help screen, or both. `modes` says in which of its component's modes the status line shows
/// it (a bit mask; 0 = help screen only).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Binding {
    pub modes: u8,
    pub line: Option<(&'static str, &'static str)>,
    pub help: Option<(&'static str, &'static str)>,
}

/// The mode of a component with a single mode.
pub const ANY: u8 = 0xff;

impl Binding {
    /// On the status line (in `modes`) and in the help screen.
    pub const fn both(
        modes: u8,
        keys: &'static str,
        what: &'static str,
        help_keys: &'static str,
        help_what: &'static str,
    ) -> Binding {
        Binding {
            modes,
            line: Some((keys, what)),
            help: Some((help_keys, help_what)),
        }
    }

    /// On the status line only.
    pub const fn line(modes: u8, keys: &'static str, what: &'static str) -> Binding {
        Binding {
            modes,
            line: Some((keys, what)),
            help: None,
        }
    }

    /// In the help screen only.
    pub const fn help(keys: &'static str, what: &'static str) -> Binding {
        Binding {
            modes: 0,
            line: None,
            help: Some((keys, what)),
        }
    }
}

/// A hint on the status line: (keys, what they do).
pub type Hint = (&'static str, &'static str);

/// The status-line hints of `map` in `mode`, in table order.
pub fn line_hints(map: &[Binding], mode: u8) -> Vec<Hint> {
    map.iter()
        .filter(|b| b.modes & mode != 0)
        .filter_map(|b| b.line)
        .collect()
}

/// The help-screen entries of `map`, in table order.
pub fn help_entries(map: &[Binding]) -> Vec<Hint> {
    map.iter().filter_map(|b| b.help).collect()
}

/// A screen or a popup: its own state, keys, hints and drawing. It changes shared state through
/// the [`Session`] and asks for everything else with [`Session::push`].
pub trait Component {
    /// Handle one key.
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled;

    /// The component's key map (status line and help screen).
    fn key_map(&self) -> &'static [Binding];

    /// The mode whose bindings the status line shows now (see [`Binding::modes`]).
    fn mode(&self, _ctx: &Session) -> u8 {
        ANY
    }

    /// The status-line hints, most useful first.
    fn hints(&self, ctx: &Session) -> Vec<Hint> {
        line_hints(self.key_map(), self.mode(ctx))
    }

    /// True when letters typed here are text, not commands.
    fn is_typing(&self) -> bool {
        false
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer);
}
