//! The app: the screens, the popup stack and the shared [`Session`], and the one place where
//! the components' [`Action`]s are carried out (open, save, export, switch screen, ...). No
//! terminal code: driven by [`Key`]s and [`JobMessage`]s, so every behaviour can be tested
//! without a terminal. Solves are not run here — they are queued as [`JobRequest`]s that the
//! runtime hands to the background job.

use std::path::{Path, PathBuf};

use crate::case::{Case, CaseError};
use crate::units::UnitSystem;

pub use super::component::{OpenPurpose, PendingAction, Screen};
pub use super::popups::{
    CalibratePopup, ConfirmPopup, FilePopup, FilePurpose, HelpPopup, HistoryPopup, HistoryView,
    MarginsPopup, MeasurePopup, OpenPopup, PathPrompt, Popup, StackFit, StoryPopup, TrainingPopup,
    WalkStage, WalkthroughRun,
};
pub use super::screens::inputs::InputsScreen;
pub use super::screens::results::{ResultsFocus, ResultsScreen};
pub use super::screens::symptoms::{SymptomFocus, SymptomsScreen};
pub use super::screens::what_if::{WhatIfScreen, design_summary};
pub use crate::diagnose::what_if::{Setting, SettingStep};

use super::catalogue::Catalogue;
use super::component::{ANY, Action, Binding, Component, Hint, line_hints};
use super::event::{Event, Key, Mouse};
use super::job::{JobMessage, JobRequest, Purpose};
use super::session::{NEW_CASE, Session};

/// Keys that work on every screen.
#[rustfmt::skip]
pub const GLOBAL_KEYS: &[Binding] = &[
    Binding::both(ANY, "Tab", "screens", "Tab / Shift-Tab", "next / previous screen"),
    Binding::help("F2 F3 F4 F5", "Symptoms / Roll & winding / Results / What-if"),
    Binding::both(ANY, "F1", "help", "F1 (? off text)", "this help"),
    Binding::both(ANY, "^S", "save", "Ctrl-S", "save the case (asks for a file name the first time)"),
    Binding::help("Ctrl-O", "open a case file"),
    Binding::help("Ctrl-N", "start a blank case"),
    Binding::help("Ctrl-L", "take the inputs from a saved case, keep the symptoms"),
    Binding::help("Ctrl-R", "solve again"),
    Binding::help("Ctrl-U", "SI / US units; on Roll & winding also converts the entered values"),
    Binding::help("Ctrl-E", "export a report (.md, .html or .json by the file name)"),
    Binding::help("Ctrl-T / F6", "training walk-throughs: answer a guided case"),
    Binding::help("F7", "the complaint's story and the complaint record"),
    Binding::help("F8", "the plant's complaint history, similar complaints"),
    Binding::help("F9", "measurements on the roll, against the computed"),
    Binding::help("F10", "margins against each failure (telescoping, slip, starring, core crush)"),
    Binding::both(ANY, "^Q", "quit", "Ctrl-Q (q off text)", "quit — asks when there are unsaved changes"),
];

/// Why opening, saving or exporting did not work (shown in the popup or the status line).
#[derive(Debug, thiserror::Error)]
pub enum AppError {
    #[error(transparent)]
    Case(#[from] CaseError),
    #[error("the results are out of date: solve again first")]
    Stale,
    #[error("no diagnosis to report: {0}")]
    NoDiagnosis(super::job::JobError),
    #[error(transparent)]
    Report(#[from] crate::report::ReportError),
    #[error(transparent)]
    Save(#[from] crate::fsutil::SaveError),
    #[error("cannot tell the report format from \"{0}\"; use an extension .md, .html or .json")]
    UnknownFormat(String),
    #[error(transparent)]
    NotFinite(#[from] crate::finite::NonFinite),
}

/// Labels of the screen tabs as drawn on the top line; shared with mouse hit-testing.
pub fn tab_labels() -> Vec<String> {
    Screen::ALL
        .iter()
        .enumerate()
        .map(|(i, s)| format!(" F{} {} ", i + 2, s.title()))
        .collect()
}

/// The whole UI state.
#[derive(Debug, Clone)]
pub struct App {
    pub session: Session,
    pub screen: Screen,
    pub symptoms: SymptomsScreen,
    pub inputs: InputsScreen,
    pub results: ResultsScreen,
    pub what_if: WhatIfScreen,
    /// Open popups, the top one last; it gets every key.
    pub popups: Vec<Popup>,
    pub should_quit: bool,
    /// The file whose comments the user was told a save drops, because its layout cannot be
    /// edited in place (the next save goes ahead).
    pub comments_warned: Option<PathBuf>,
    /// The seed walk-throughs shuffle their choices with; `None` takes one from the clock (a
    /// new order each time, shown in the popup so a trainer can repeat it). Tests fix it.
    pub training_seed: Option<u64>,
}

impl App {
    pub fn new(catalogue: Catalogue, web_presets: Vec<String>, core_presets: Vec<String>) -> App {
        let symptoms = SymptomsScreen::new(&catalogue);
        App {
            session: Session::new(catalogue, web_presets, core_presets),
            screen: Screen::Symptoms,
            symptoms,
            inputs: InputsScreen::default(),
            results: ResultsScreen::default(),
            what_if: WhatIfScreen::default(),
            popups: Vec::new(),
            should_quit: false,
            comments_warned: None,
            training_seed: None,
        }
    }

    /// The popup on top, if any.
    pub fn popup(&self) -> Option<&Popup> {
        self.popups.last()
    }

    /// Replace the case (opened from a file or built by a test); the UI opens on the results
    /// when the case already names symptoms, else on the symptom picker.
    pub fn set_case(&mut self, case: Case, path: Option<PathBuf>) {
        self.session.replace_case(case, path);
        self.what_if = WhatIfScreen::default();
        self.results = ResultsScreen::default();
        self.inputs = InputsScreen::default();
        if self.session.case.symptoms.is_empty() {
            self.screen = Screen::Symptoms;
        } else {
            self.go_to(Screen::Results);
        }
    }

    /// Show a case opened from a file in the units it is typed in (SI when it says nothing),
    /// unless the user chose the units (`--units`, Ctrl-U).
    pub fn follow_typed_units(&mut self, case: &Case) {
        if !self.session.units_chosen {
            self.session.units = case.typed_units().unwrap_or(UnitSystem::Si);
        }
    }

    /// Open a case file (the whole case, or only its inputs).
    pub fn open_path(&mut self, path: &Path, purpose: OpenPurpose) -> Result<(), AppError> {
        let loaded = Case::load(path)?;
        match purpose {
            OpenPurpose::WholeCase => {
                self.follow_typed_units(&loaded);
                self.set_case(loaded, Some(path.to_path_buf()));
            }
            OpenPurpose::InputsOnly => {
                let case = &mut self.session.case;
                case.web = loaded.web;
                case.core = loaded.core;
                case.roll = loaded.roll;
                case.winding = loaded.winding;
                if case.title.is_empty() || case.title == NEW_CASE {
                    case.title = loaded.title;
                }
                self.session.edited();
                self.run_actions();
            }
        }
        self.session
            .set_status(format!("Loaded {}", path.display()));
        Ok(())
    }

    /// The solves waiting to be started (taken by the runtime).
    pub fn take_requests(&mut self) -> Vec<JobRequest> {
        self.session.take_requests()
    }

    fn go_to(&mut self, screen: Screen) {
        self.screen = screen;
        if matches!(screen, Screen::Results | Screen::WhatIf) {
            self.session.ensure_baseline();
        }
    }

    fn screen_component(&self) -> &dyn Component {
        match self.screen {
            Screen::Symptoms => &self.symptoms,
            Screen::Inputs => &self.inputs,
            Screen::Results => &self.results,
            Screen::WhatIf => &self.what_if,
        }
    }

    /// Hand a key to the open screen.
    fn screen_key(&mut self, key: Key) {
        let session = &mut self.session;
        match self.screen {
            Screen::Symptoms => self.symptoms.on_key(key, session),
            Screen::Inputs => self.inputs.on_key(key, session),
            Screen::Results => self.results.on_key(key, session),
            Screen::WhatIf => self.what_if.on_key(key, session),
        };
    }

    /// Draw the open screen's body.
    pub fn render_screen(
        &self,
        theme: super::theme::Theme,
        area: ratatui::layout::Rect,
        buf: &mut ratatui::buffer::Buffer,
    ) {
        self.screen_component()
            .render(&self.session, theme, area, buf);
    }

    /// Spinner and timers.
    pub fn on_tick(&mut self) {
        self.session.tick = self.session.tick.wrapping_add(1);
    }

    /// A message from the background solver.
    pub fn on_job(&mut self, message: JobMessage) {
        let session = &mut self.session;
        match message {
            JobMessage::Progress { id, fraction } => {
                for running in [&mut session.running_baseline, &mut session.running_what_if]
                    .into_iter()
                    .flatten()
                {
                    if running.id == id {
                        running.fraction = fraction.clamp(0.0, 1.0);
                    }
                }
            }
            JobMessage::DesignFinished {
                id,
                generation,
                result,
            } => {
                if take_running(&mut session.running_what_if, id) {
                    self.what_if.on_designed(generation, result, session);
                }
            }
            JobMessage::Finished {
                id,
                purpose,
                generation,
                result,
            } => match purpose {
                Purpose::Baseline => {
                    take_running(&mut session.running_baseline, id);
                    // Keep the newest result only.
                    if session
                        .baseline
                        .as_ref()
                        .is_none_or(|b| b.generation <= generation)
                    {
                        session.baseline = Some(super::session::Baseline { generation, result });
                        self.results.on_new_baseline();
                    }
                }
                Purpose::WhatIf => {
                    if take_running(&mut session.running_what_if, id) {
                        self.what_if.on_solved(generation, result);
                    }
                }
            },
        }
    }

    /// The history work waiting to be started (taken by the runtime).
    pub fn take_history_requests(&mut self) -> Vec<super::history_job::HistoryRequest> {
        self.session.take_history_requests()
    }

    /// An answer from the history store: to the open history popup that asked for it, or (the
    /// popup was closed) a line on the status line.
    pub fn on_history(&mut self, reply: super::history_job::HistoryReply) {
        for popup in self.popups.iter_mut().rev() {
            if let Popup::History(history) = popup
                && history.on_reply(reply.clone(), &mut self.session)
            {
                self.run_actions();
                return;
            }
        }
        match reply.result {
            Ok(super::history_job::HistoryAnswer::Added { id, place }) => self
                .session
                .set_status(format!("Stored as complaint {id} in {place}")),
            Err(e) => self.session.set_status(format!("History: {e}")),
            Ok(_) => {}
        }
    }

    pub fn handle_event(&mut self, event: Event) {
        match event {
            Event::Key(Key::Alt(c)) => {
                self.handle_key(Key::Esc);
                self.handle_key(Key::Char(c));
            }
            Event::Key(key) => self.handle_key(key),
            Event::Mouse(Mouse::ScrollUp) => self.handle_key(Key::Up),
            Event::Mouse(Mouse::ScrollDown) => self.handle_key(Key::Down),
            Event::Mouse(Mouse::Click { column, row }) => {
                if row == 0 && self.popups.is_empty() {
                    let mut start = 0u16;
                    for (label, screen) in tab_labels().iter().zip(Screen::ALL) {
                        let end = start + label.chars().count() as u16;
                        if (start..end).contains(&column) {
                            self.go_to(screen);
                        }
                        start = end + 1;
                    }
                }
            }
            Event::Resize => {}
        }
    }

    /// True when letters typed on this screen are text, not commands.
    pub fn is_typing(&self) -> bool {
        self.screen_component().is_typing()
    }

    pub fn handle_key(&mut self, key: Key) {
        if let Some(popup) = self.popups.last_mut() {
            popup.on_key(key, &mut self.session);
        } else {
            self.session.status = None;
            if !self.global_key(key) {
                self.screen_key(key);
            }
        }
        self.run_actions();
    }

    /// The keys of [`GLOBAL_KEYS`]; true when `key` was one.
    fn global_key(&mut self, key: Key) -> bool {
        // Tab commits the field being typed instead.
        let editing = self.inputs.editing.is_some();
        match key {
            Key::Tab | Key::BackTab if editing => return false,
            // While a value is typed, Ctrl-U / Ctrl-W clear the text (as in a shell); units
            // switch with Ctrl-U when nothing is being typed.
            Key::Ctrl('u') | Key::Ctrl('w') if editing && self.screen == Screen::Inputs => {
                return false;
            }
            Key::Tab => self.go_to(self.screen.next()),
            Key::BackTab => self.go_to(self.screen.previous()),
            Key::F(1) => self.popups.push(Popup::Help(HelpPopup::default())),
            Key::F(n @ 2..=5) => self.go_to(Screen::ALL[usize::from(n - 2)]),
            Key::Ctrl('s') => self.save(),
            Key::Ctrl('q') | Key::Ctrl('c') => self.ask(PendingAction::Quit),
            Key::Ctrl('n') => self.ask(PendingAction::NewCase),
            Key::Ctrl('o') => self
                .popups
                .push(Popup::Open(OpenPopup::new(OpenPurpose::WholeCase))),
            Key::Ctrl('l') => self
                .popups
                .push(Popup::Open(OpenPopup::new(OpenPurpose::InputsOnly))),
            Key::Ctrl('r') => {
                self.session.solve_again();
                if self.what_if.change.is_some() {
                    self.what_if.run(&mut self.session);
                }
            }
            Key::Ctrl('e') => self.export(),
            Key::Ctrl('t') | Key::F(6) => self.open_training(),
            Key::F(7) => self.popups.push(Popup::Story(StoryPopup::default())),
            Key::F(8) => {
                let popup = HistoryPopup::open(&mut self.session);
                self.popups.push(Popup::History(Box::new(popup)));
            }
            Key::F(9) => {
                let popup = MeasurePopup::open(&self.session);
                self.popups.push(Popup::Measure(Box::new(popup)));
            }
            Key::F(10) => self.popups.push(Popup::Margins(MarginsPopup::default())),
            Key::Ctrl('u') => {
                self.session.units_chosen = true;
                self.session.units = match self.session.units {
                    UnitSystem::Si => UnitSystem::Us,
                    UnitSystem::Us => UnitSystem::Si,
                };
                // On the form, the entered values follow: the case is written in the units
                // the user works in.
                if self.screen == Screen::Inputs {
                    let converted = crate::tui::fields::convert_units(
                        &mut self.session.case,
                        self.session.units,
                    );
                    if converted > 0 {
                        self.session.edited();
                        self.session.set_status(format!(
                            "{converted} entered values converted to {} units",
                            match self.session.units {
                                UnitSystem::Si => "SI",
                                UnitSystem::Us => "US",
                            }
                        ));
                    }
                }
            }
            Key::Char('?') if !self.is_typing() => {
                self.popups.push(Popup::Help(HelpPopup::default()))
            }
            Key::Char('q') if !self.is_typing() => self.ask(PendingAction::Quit),
            _ => return false,
        }
        true
    }

    /// Carry out the actions the components asked for, in order (an action may queue more).
    fn run_actions(&mut self) {
        loop {
            let actions = self.session.take_actions();
            if actions.is_empty() {
                break;
            }
            for action in actions {
                self.run_action(action);
            }
        }
    }

    fn run_action(&mut self, action: Action) {
        match action {
            Action::CaseEdited => self.what_if.on_case_edited(),
            Action::GoTo(screen) => self.go_to(screen),
            Action::Push(popup) => self.popups.push(popup),
            Action::Close => {
                self.popups.pop();
            }
            Action::Save => self.save(),
            Action::SaveTo(path) => {
                self.save_to(&path);
                if self.session.dirty {
                    let error = self.session.status.clone().unwrap_or_default();
                    self.show_error(error);
                } else {
                    self.popups.pop();
                }
            }
            Action::SaveThen(pending) => {
                // Out of the way of the save-as prompt; back when the save did not happen.
                self.popups.pop();
                let open = self.popups.len();
                self.save();
                if !self.session.dirty {
                    self.perform(pending);
                } else if self.popups.len() == open {
                    self.popups.push(Popup::Confirm(ConfirmPopup(pending)));
                }
            }
            Action::Ask(pending) => self.ask(pending),
            Action::Perform(pending) => self.perform(pending),
            Action::Open(path, purpose) => {
                if purpose == OpenPurpose::WholeCase && self.session.dirty {
                    self.popups.pop();
                    let pending = PendingAction::Open(path);
                    self.popups.push(Popup::Confirm(ConfirmPopup(pending)));
                    return;
                }
                match self.open_path(&path, purpose) {
                    // The loaded case replaced the popups' world: close the prompt.
                    Ok(()) => {
                        self.popups.pop();
                    }
                    Err(error) => self.show_error(error.to_string()),
                }
            }
            Action::Export(path) => match self.export_to(&path) {
                Ok(()) => {
                    self.popups.pop();
                }
                Err(error) => self.show_error(error.to_string()),
            },
            Action::TryRemedy(id) => self.what_if.try_remedy(&id, &mut self.session),
        }
    }

    fn show_error(&mut self, error: String) {
        if let Some(popup) = self.popups.last_mut() {
            popup.show_error(error);
        }
    }

    fn ask(&mut self, action: PendingAction) {
        if self.session.dirty {
            self.popups.push(Popup::Confirm(ConfirmPopup(action)));
        } else {
            self.perform(action);
        }
    }

    fn perform(&mut self, action: PendingAction) {
        match action {
            PendingAction::Quit => self.should_quit = true,
            PendingAction::NewCase => {
                let case = Case {
                    title: NEW_CASE.into(),
                    ..Case::default()
                };
                self.set_case(case, None);
            }
            PendingAction::Open(path) => {
                if let Err(error) = self.open_path(&path, OpenPurpose::WholeCase) {
                    self.session.set_status(error.to_string());
                }
            }
            PendingAction::Training(index) => self.open_walkthrough(index),
        }
    }

    /// Save to the case's file, or ask for a file name first (always for a shipped demo case,
    /// so a stray Ctrl-S never overwrites one).
    pub fn save(&mut self) {
        match self.session.case_path.clone() {
            Some(path) if !crate::fsutil::is_shipped_demo_case(&path) => self.save_to(&path),
            _ => {
                let name = suggested_file_name(&self.session.case.title);
                self.popups
                    .push(Popup::File(FilePopup::new(FilePurpose::SaveAs, name)));
            }
        }
    }

    fn save_to(&mut self, path: &Path) {
        if let Some(message) = self.save_refused(path) {
            self.session.set_status(message);
            return;
        }
        // The file the case came from is edited in place; another file chosen with "save as"
        // is replaced (its comments belong to another case).
        let plan = if self.session.case_path.as_deref() == Some(path) {
            self.session.case.save_plan(path)
        } else {
            self.session
                .case
                .to_yaml_string()
                .map(|text| crate::case::SavePlan {
                    text,
                    how: crate::case::SaveHow::New,
                })
        };
        let plan = match plan {
            Ok(plan) => plan,
            Err(error) => return self.session.set_status(format!("Not saved: {error}")),
        };
        // Comments are kept by editing the file in place; when its layout does not allow
        // that, say why once, and the next save goes ahead without them.
        if let crate::case::SaveHow::Rewritten {
            reason,
            dropped_comments: true,
        } = &plan.how
            && self.comments_warned.as_deref() != Some(path)
        {
            self.comments_warned = Some(path.to_path_buf());
            return self.session.set_status(format!(
                "Not saved yet: {} has comments, but {reason}, so the whole file would be written again without them; ^S again saves that way (or save under another name)",
                path.display()
            ));
        }
        match plan.write(path) {
            Ok(()) => {
                self.session.dirty = false;
                self.session.case_path = Some(path.to_path_buf());
                let how = match plan.how {
                    crate::case::SaveHow::InPlace => " (comments and layout kept)",
                    _ => "",
                };
                self.session
                    .set_status(format!("Saved {}{how}", path.display()));
            }
            Err(error) => self.session.set_status(format!("Not saved: {error}")),
        }
    }

    /// Why a save to `path` does not go ahead now, in plain words: a typed value that was not
    /// accepted (saving would silently drop it) or a folder that does not exist.
    fn save_refused(&mut self, path: &Path) -> Option<String> {
        if self.inputs.error.is_some()
            && let Some(text) = &self.inputs.editing
        {
            let label = crate::tui::fields::FIELDS
                .get(self.inputs.selected)
                .map_or("a field", |f| f.label);
            return Some(format!(
                "Not saved: \"{text}\" for {label} was not accepted; correct it (F3) or press Esc, then save"
            ));
        }
        let folder = path.parent().filter(|p| !p.as_os_str().is_empty());
        if let Some(folder) = folder
            && !folder.is_dir()
        {
            return Some(format!(
                "Not saved: the folder {} does not exist",
                folder.display()
            ));
        }
        None
    }

    fn export(&mut self) {
        if self.session.current_outcome().is_none() {
            self.session
                .set_status("Nothing to export yet: solve the case first (F4, or ^R)");
            return;
        }
        let stem = self
            .session
            .case_path
            .as_ref()
            .and_then(|p| p.file_stem())
            .map(|s| s.to_string_lossy().into_owned())
            .unwrap_or_else(|| {
                suggested_file_name(&self.session.case.title)
                    .trim_end_matches(".yaml")
                    .to_string()
            });
        let name = format!("{stem}_report.md");
        self.popups
            .push(Popup::File(FilePopup::new(FilePurpose::Export, name)));
    }

    /// Write a report of the current results (and the remedy being tried, if any) to `path`.
    pub fn export_to(&mut self, path: &Path) -> Result<(), AppError> {
        let session = &self.session;
        let outcome = session.current_outcome().ok_or(AppError::Stale)?;
        let diagnosis = outcome
            .diagnosis
            .as_ref()
            .map_err(|e| AppError::NoDiagnosis(e.clone()))?;
        // As on the command line: an unknown extension is refused, not written as Markdown.
        let format = crate::report::Format::from_path(path)
            .ok_or_else(|| AppError::UnknownFormat(path.display().to_string()))?;
        let remedy = match (&self.what_if.remedy, &self.what_if.outcome) {
            (Some(id), Some((generation, after))) if *generation == session.generation => {
                Some(crate::report::comparison(
                    diagnosis,
                    id,
                    self.what_if.description.clone().unwrap_or_default(),
                    after.resolved.clone(),
                    after.profile.clone(),
                ))
            }
            _ => None,
        };
        let source = session.case_path.as_ref().map(|p| p.display().to_string());
        let mut input = crate::report::solved_report(
            &session.case,
            crate::report::Solved {
                resolved: outcome.resolved.clone(),
                profile: outcome.profile.clone(),
                diagnosis: diagnosis.clone(),
            },
            remedy,
            crate::report::ReportMeta::now(source),
            session.units,
        );
        // What the answer rests on, when the background job measured it for this case.
        if let Some(sensitivity) = &outcome.sensitivity {
            input = input.with_sensitivity(sensitivity.clone());
        }
        // The inverse estimate the F9 page shows, when the job made it for the case as written.
        input = input.with_estimate(outcome.estimate.clone());
        // Similar past complaints the history screen found for this very case (no store
        // access here: exporting stays on the UI thread).
        input.similar_past = session
            .similar_past
            .as_ref()
            .filter(|(generation, _)| *generation == session.generation)
            .map(|(_, past)| past.clone());
        crate::finite::ensure_finite("the stress profile", &input.profile)?;
        crate::finite::ensure_finite("the diagnosis", &input.diagnosis)?;
        let text = crate::report::render(&input, format)?;
        crate::fsutil::save_atomic(path, text.as_bytes())?;
        self.session.set_status(format!(
            "Report written to {} ({})",
            path.display(),
            format.as_str()
        ));
        Ok(())
    }

    fn open_training(&mut self) {
        if self.session.walkthroughs.is_empty() {
            self.session
                .set_status("No training walk-throughs are available");
        } else {
            self.popups.push(Popup::Training(TrainingPopup::default()));
        }
    }

    /// Open a walk-through's case and start answering its questions.
    pub fn open_walkthrough(&mut self, index: usize) {
        let Some(loaded) = self.session.walkthroughs.get(index).cloned() else {
            return;
        };
        match crate::training::load_case(&loaded) {
            Ok(case) => {
                self.set_case(case.clone(), None);
                // The walk-through is about finding the cause: start on the picture, not the answer.
                self.screen = Screen::Symptoms;
                let rules = crate::diagnose::rules::RuleBase::embedded().ok();
                let context = crate::training::TrainingContext::compute(
                    case,
                    rules.as_ref(),
                    self.session.units,
                );
                let mut session = crate::training::Session::new(loaded.walkthrough, context);
                // As `rolltriage train` does: the correct answer is not where the file's author
                // wrote it, and the seed is shown so the same order can be given again.
                let seed = self.training_seed.unwrap_or_else(clock_seed);
                session.shuffle_choices(seed);
                self.popups
                    .push(Popup::Walkthrough(Box::new(WalkthroughRun {
                        session,
                        seed,
                        stage: WalkStage::Briefing,
                        scroll: 0,
                    })));
            }
            Err(error) => self
                .session
                .set_status(format!("Cannot open the walk-through: {error}")),
        }
    }

    /// Keys for the always-visible help line: (key, what it does), most useful first — the
    /// top popup's, or the screen's and then the global ones.
    pub fn key_hints(&self) -> Vec<Hint> {
        match self.popups.last() {
            Some(popup) => popup.hints(&self.session),
            None => {
                let mut hints = self.screen_component().hints(&self.session);
                hints.extend(line_hints(GLOBAL_KEYS, ANY));
                hints
            }
        }
    }
}

/// Clear `slot` when it holds job `id`; true when it did (older jobs' results are ignored).
fn take_running(slot: &mut Option<super::session::Running>, id: u64) -> bool {
    let current = slot.is_some_and(|r| r.id == id);
    if current {
        *slot = None;
    }
    current
}

/// "Reel 4 telescoped" → "reel_4_telescoped.yaml".
pub fn suggested_file_name(title: &str) -> String {
    let slug: String = title
        .trim()
        .to_lowercase()
        .chars()
        .map(|c| if c.is_ascii_alphanumeric() { c } else { '_' })
        .collect();
    let slug = slug.trim_matches('_').to_string();
    format!("{}.yaml", if slug.is_empty() { "case" } else { &slug })
}

/// A shuffle seed from the clock, small enough to read off the screen and type again
/// (the same rule as `rolltriage train` without `--seed`).
fn clock_seed() -> u64 {
    std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(1, |d| d.as_secs() % 1_000_000)
}
