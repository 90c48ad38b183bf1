//! The UI state machine: which screen is open, what the user typed, the case being edited, the
//! latest results. No terminal code: driven by [`Key`]s and [`JobMessage`]s, so every behaviour
//! can be tested without a terminal. Solves are not run here — the app queues [`JobRequest`]s
//! that the runtime hands to the background job.

use std::collections::{BTreeMap, BTreeSet};

use crate::diagnose::rules::SettingChange as RuleChange;
use std::path::{Path, PathBuf};

use crate::case::{Case, ObservedSymptom, QuantityText, ResolvedCase, TaperInput};
use crate::model::Taper;
use crate::units::UnitSystem;
use crate::vocabulary::PLACES;

use super::catalogue::{Catalogue, Match};
use super::event::{Event, Key, Mouse};
use super::fields::{self, FIELDS, FieldKind, PresetFamily};
use super::job::{JobMessage, JobRequest, Purpose, SolveOutcome};

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

/// Labels of the screen tabs as drawn on the top line; shared with mouse hit-testing.
pub fn tab_labels() -> Vec<String> {
    Screen::ALL
        .iter()
        .enumerate()
        .map(|(i, s)| format!(" F{} {} ", i + 2, s.title()))
        .collect()
}

/// Something that throws away unsaved changes, waiting for the user's word.
#[derive(Debug, Clone, PartialEq)]
pub enum PendingAction {
    Quit,
    NewCase,
    Open(PathBuf),
    /// Open a training walk-through's case (index into `App::walkthroughs`).
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

#[derive(Debug, Clone, PartialEq)]
pub struct FilePrompt {
    pub purpose: OpenPurpose,
    pub input: String,
    /// Case files found in `cases/` and the current folder.
    pub suggestions: Vec<String>,
    pub selected: Option<usize>,
    pub error: Option<String>,
}

#[derive(Debug, Clone, PartialEq)]
pub enum Popup {
    Help,
    Confirm(PendingAction),
    Open(FilePrompt),
    SaveAs {
        input: String,
        error: Option<String>,
    },
    /// Export a report; the format follows the file's extension (.md, .html, .json).
    Export {
        input: String,
        error: Option<String>,
    },
    /// Pick a training walk-through (index into `App::walkthroughs`).
    Training {
        selected: usize,
    },
    /// A training walk-through being answered inside the UI.
    Walkthrough(Box<WalkthroughRun>),
    /// Fit the web's radial stiffness (Pfeiffer K1, K2) to a stack-compression test CSV.
    Calibrate(Box<CalibratePrompt>),
    /// A message; any key closes it.
    Notice {
        title: String,
        text: String,
    },
}

/// The stack-compression calibration popup: a CSV path, then the fit to confirm.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct CalibratePrompt {
    pub input: String,
    /// The fit of the file named in `input`, waiting for Enter to be written into the case.
    pub fit: Option<StackFit>,
    /// Why the file could not be read or fitted.
    pub error: Option<String>,
}

/// A fitted stack test, as the popup shows it.
#[derive(Debug, Clone, PartialEq)]
pub struct StackFit {
    pub origin: String,
    pub fit: crate::calibrate::PfeifferFit,
    /// Notes from reading the file and warnings about the fit, one line each.
    pub warnings: Vec<String>,
}

/// Read a stack-compression CSV and fit Pfeiffer's law to it, the same library calls as
/// `rolltriage calibrate stack` with its default options (relative weighting). `thickness` is the
/// case's web thickness (m), to warn when the stack's caliper does not match it.
pub fn fit_stack_file(path: &Path, thickness: Option<f64>) -> Result<StackFit, String> {
    use crate::calibrate::{FitOptions, StackReadOptions, fit_pfeiffer, parse_stack_csv};
    let origin = path.display().to_string();
    let text = crate::calibrate::read_stack_file(path).map_err(|e| e.to_string())?;
    let test =
        parse_stack_csv(&text, &origin, &StackReadOptions::default()).map_err(|e| e.to_string())?;
    let fit = fit_pfeiffer(&test, &FitOptions::default()).map_err(|e| e.to_string())?;
    crate::finite::ensure_finite(&format!("the stack fit of {origin}"), &fit)
        .map_err(|e| e.to_string())?;
    let mut warnings: Vec<String> = test.notes.iter().map(|n| format!("note: {n}")).collect();
    warnings.extend(fit.warnings.iter().map(|w| format!("warning: {w}")));
    if let (Some(caliper), Some(t)) = (test.caliper(), thickness)
        && t > 0.0
        && (caliper / t - 1.0).abs() > 0.10
    {
        warnings.push(format!(
            "warning: the stack's caliper ({:.1} µm) differs from the case's web thickness \
             ({:.1} µm) by more than 10 %; is this the same web?",
            caliper * 1e6,
            t * 1e6
        ));
    }
    Ok(StackFit {
        origin,
        fit,
        warnings,
    })
}

/// Where a trainee is in an in-UI walk-through.
#[derive(Debug, Clone, PartialEq)]
pub enum WalkStage {
    /// The story and what was seen.
    Briefing,
    /// Question `index` (0-based) with choice `highlighted` (0-based) under the cursor.
    Question { index: usize, highlighted: usize },
    /// The feedback on the answer to question `index`.
    Feedback {
        index: usize,
        feedback: Box<crate::training::Feedback>,
    },
    /// The score and the summary.
    Done,
}

/// A walk-through answered inside the UI: the library's [`crate::training::Session`] checks the
/// answers and writes the feedback with this roll's computed values, as `rolltriage train` does.
#[derive(Debug, Clone, PartialEq)]
pub struct WalkthroughRun {
    pub session: crate::training::Session,
    pub stage: WalkStage,
    /// First line shown (long feedback scrolls).
    pub scroll: u16,
}

impl WalkthroughRun {
    fn question_count(&self) -> usize {
        self.session.walkthrough.questions.len()
    }

    fn choice_count(&self, index: usize) -> usize {
        self.session
            .walkthrough
            .questions
            .get(index)
            .map_or(0, |q| q.choices.len())
    }

    /// The stage after `index`: the next question, or the score.
    fn after(&self, index: usize) -> WalkStage {
        if index + 1 < self.question_count() {
            WalkStage::Question {
                index: index + 1,
                highlighted: 0,
            }
        } else {
            WalkStage::Done
        }
    }

    /// One key; returns false when the walk-through is left.
    fn key(&mut self, key: Key) -> bool {
        if key == Key::Esc {
            return false;
        }
        match key {
            Key::Up if !matches!(self.stage, WalkStage::Question { .. }) => {
                self.scroll = self.scroll.saturating_sub(1);
                return true;
            }
            Key::Down if !matches!(self.stage, WalkStage::Question { .. }) => {
                self.scroll = self.scroll.saturating_add(1).min(200);
                return true;
            }
            Key::PageUp => {
                self.scroll = self.scroll.saturating_sub(10);
                return true;
            }
            Key::PageDown => {
                self.scroll = self.scroll.saturating_add(10).min(200);
                return true;
            }
            _ => {}
        }
        match self.stage.clone() {
            WalkStage::Briefing => {
                if matches!(key, Key::Enter | Key::Char(' ') | Key::Right) {
                    self.stage = if self.question_count() == 0 {
                        WalkStage::Done
                    } else {
                        WalkStage::Question {
                            index: 0,
                            highlighted: 0,
                        }
                    };
                    self.scroll = 0;
                }
            }
            WalkStage::Question { index, highlighted } => {
                let count = self.choice_count(index);
                let chosen = match key {
                    Key::Up => {
                        self.stage = WalkStage::Question {
                            index,
                            highlighted: highlighted.saturating_sub(1),
                        };
                        None
                    }
                    Key::Down => {
                        self.stage = WalkStage::Question {
                            index,
                            highlighted: (highlighted + 1).min(count.saturating_sub(1)),
                        };
                        None
                    }
                    Key::Enter => Some(highlighted),
                    Key::Char(c @ '1'..='9') => {
                        let n = usize::from(c as u8 - b'1');
                        (n < count).then_some(n)
                    }
                    _ => None,
                };
                if let Some(choice) = chosen {
                    match self.session.answer(index, choice) {
                        Ok(feedback) => {
                            self.stage = WalkStage::Feedback {
                                index,
                                feedback: Box::new(feedback),
                            };
                        }
                        // A malformed walk-through file: skip the question, do not stop.
                        Err(_) => self.stage = self.after(index),
                    }
                    self.scroll = 0;
                }
            }
            WalkStage::Feedback { index, .. } => {
                if matches!(key, Key::Enter | Key::Char(' ') | Key::Right) {
                    self.stage = self.after(index);
                    self.scroll = 0;
                }
            }
            WalkStage::Done => {
                if matches!(key, Key::Enter | Key::Char(' ')) {
                    return false;
                }
            }
        }
        true
    }
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SymptomFocus {
    List,
    Details,
}

#[derive(Debug, Clone, PartialEq)]
pub struct SymptomsState {
    pub query: String,
    pub matches: Vec<Match>,
    /// Index into `matches`.
    pub highlighted: usize,
    pub focus: SymptomFocus,
    /// Row of the details pane: 0 = where on the roll, 1.. = questions.
    pub detail_row: usize,
}

#[derive(Debug, Clone, PartialEq, Default)]
pub struct InputsState {
    /// Index into `fields::FIELDS`.
    pub selected: usize,
    /// The text being typed, while a field is being edited.
    pub editing: Option<String>,
    /// Why the last entry was not accepted (shown under the field).
    pub error: Option<String>,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum ResultsFocus {
    #[default]
    Causes,
    Remedies,
}

#[derive(Debug, Clone, PartialEq, Default)]
pub struct ResultsState {
    pub focus: ResultsFocus,
    pub cause: usize,
    /// Cause IDs whose reasons are shown.
    pub expanded: BTreeSet<String>,
    pub remedy: usize,
}

/// A winder setting the what-if screen can change.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Setting {
    Tension,
    Taper,
    NipLoad,
    Core,
    Speed,
}

impl Setting {
    pub const ALL: [Setting; 5] = [
        Setting::Tension,
        Setting::Taper,
        Setting::NipLoad,
        Setting::Core,
        Setting::Speed,
    ];

    pub fn label(self) -> &'static str {
        match self {
            Setting::Tension => "Web tension",
            Setting::Taper => "Taper",
            Setting::NipLoad => "Nip load",
            Setting::Core => "Core",
            Setting::Speed => "Line speed",
        }
    }

    /// What one step of ←/→ does, for the help text.
    pub fn step_text(self) -> &'static str {
        match self {
            Setting::Tension => "±10 % per step",
            Setting::Taper => "±5 points per step",
            Setting::NipLoad => "±20 % per step",
            Setting::Core => "core stiffness ×2 / ÷2 per step, same size",
            Setting::Speed => "±10 % per step",
        }
    }
}

/// One setting moved by a number of steps from the case as it stands.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct SettingChange {
    pub setting: Setting,
    pub steps: i32,
}

#[derive(Debug, Clone, PartialEq, Default)]
pub struct WhatIfState {
    /// 0..5 = settings, 5.. = remedies that change a setting.
    pub row: usize,
    pub change: Option<SettingChange>,
    /// A remedy being tried instead (its changes come from the rule base).
    pub remedy: Option<String>,
    /// Plain words for the change ("Web tension 525 N/m → 578 N/m").
    pub description: Option<String>,
    pub outcome: Option<(u64, Box<SolveOutcome>)>,
    /// A designed taper schedule (what-if `d`), with the generation it was made for.
    pub design: Option<(u64, Box<crate::taper_design::TaperDesign>)>,
    pub error: Option<String>,
}

/// Latest finished baseline solve.
#[derive(Debug, Clone, PartialEq)]
pub struct Baseline {
    pub generation: u64,
    pub result: Result<Box<SolveOutcome>, String>,
}

#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Running {
    pub id: u64,
    pub generation: u64,
    pub fraction: f64,
}

/// The whole UI state.
#[derive(Debug, Clone)]
pub struct App {
    pub screen: Screen,
    pub popup: Option<Popup>,
    pub case: Case,
    pub case_path: Option<PathBuf>,
    /// Unsaved changes exist.
    pub dirty: bool,
    /// Bumped on every change of the case; results remember the generation they came from.
    pub generation: u64,
    pub resolved: Result<ResolvedCase, String>,
    pub catalogue: Catalogue,
    pub web_presets: Vec<String>,
    pub core_presets: Vec<String>,
    pub units: UnitSystem,
    pub symptoms: SymptomsState,
    pub inputs: InputsState,
    pub results: ResultsState,
    pub what_if: WhatIfState,
    pub baseline: Option<Baseline>,
    pub running_baseline: Option<Running>,
    pub running_what_if: Option<Running>,
    /// One-line message for the status line (saved, not accepted, ...).
    pub status: Option<String>,
    /// Spinner frame counter.
    pub tick: u64,
    /// First line shown in the help popup.
    pub help_scroll: u16,
    pub should_quit: bool,
    /// Setting changes of each remedy, from the rule base (what the what-if applies).
    pub remedy_changes: BTreeMap<String, Vec<RuleChange>>,
    /// Training walk-throughs offered by ^T.
    pub walkthroughs: Vec<crate::training::LoadedWalkthrough>,
    requests: Vec<JobRequest>,
    next_job_id: u64,
}

impl App {
    pub fn new(catalogue: Catalogue, web_presets: Vec<String>, core_presets: Vec<String>) -> App {
        let case = Case {
            title: "New case".into(),
            ..Case::default()
        };
        let matches = catalogue.search("");
        let mut app = App {
            screen: Screen::Symptoms,
            popup: None,
            resolved: Err(String::new()),
            case,
            case_path: None,
            dirty: false,
            generation: 0,
            catalogue,
            web_presets,
            core_presets,
            units: UnitSystem::Si,
            symptoms: SymptomsState {
                query: String::new(),
                matches,
                highlighted: 0,
                focus: SymptomFocus::List,
                detail_row: 0,
            },
            inputs: InputsState::default(),
            results: ResultsState::default(),
            what_if: WhatIfState::default(),
            baseline: None,
            running_baseline: None,
            running_what_if: None,
            status: None,
            tick: 0,
            help_scroll: 0,
            should_quit: false,
            walkthroughs: Vec::new(),
            remedy_changes: BTreeMap::new(),
            requests: Vec::new(),
            next_job_id: 1,
        };
        app.refresh_resolved();
        app
    }

    /// Replace the case (opened from a file or built by a test); the UI opens on the results
    /// when the case already names symptoms, else on the symptom picker.
    pub fn set_case(&mut self, case: Case, path: Option<PathBuf>) {
        self.case = case;
        self.case_path = path;
        self.dirty = false;
        self.generation += 1;
        self.baseline = None;
        self.what_if = WhatIfState::default();
        self.results = ResultsState::default();
        self.inputs = InputsState::default();
        self.refresh_resolved();
        if self.case.symptoms.is_empty() {
            self.screen = Screen::Symptoms;
        } else {
            self.go_to(Screen::Results);
        }
    }

    /// Open a case file; errors go to the status line.
    pub fn open_path(&mut self, path: &Path, purpose: OpenPurpose) -> Result<(), String> {
        let loaded = Case::load(path).map_err(|e| e.to_string())?;
        match purpose {
            OpenPurpose::WholeCase => self.set_case(loaded, Some(path.to_path_buf())),
            OpenPurpose::InputsOnly => {
                self.case.web = loaded.web;
                self.case.core = loaded.core;
                self.case.roll = loaded.roll;
                self.case.winding = loaded.winding;
                if self.case.title.is_empty() || self.case.title == "New case" {
                    self.case.title = loaded.title;
                }
                self.changed();
            }
        }
        self.status = Some(format!("Loaded {}", path.display()));
        Ok(())
    }

    /// The solves waiting to be started (taken by the runtime).
    pub fn take_requests(&mut self) -> Vec<JobRequest> {
        std::mem::take(&mut self.requests)
    }

    pub fn is_solving(&self) -> bool {
        self.running_baseline.is_some() || self.running_what_if.is_some()
    }

    /// The baseline outcome, if it is for the case as it stands now.
    pub fn current_outcome(&self) -> Option<&SolveOutcome> {
        match &self.baseline {
            Some(Baseline {
                generation,
                result: Ok(outcome),
            }) if *generation == self.generation => Some(outcome),
            _ => None,
        }
    }

    /// The latest baseline outcome, current or not.
    pub fn latest_outcome(&self) -> Option<&SolveOutcome> {
        match &self.baseline {
            Some(Baseline {
                result: Ok(outcome),
                ..
            }) => Some(outcome),
            _ => None,
        }
    }

    pub fn baseline_is_stale(&self) -> bool {
        self.baseline
            .as_ref()
            .is_none_or(|b| b.generation != self.generation)
    }

    fn changed(&mut self) {
        self.dirty = true;
        self.generation += 1;
        self.what_if.outcome = None;
        self.what_if.change = None;
        self.what_if.description = None;
        self.refresh_resolved();
    }

    fn refresh_resolved(&mut self) {
        self.resolved = self.case.resolve().map_err(|e| e.to_string());
    }

    fn queue(&mut self, purpose: Purpose, case: Case) {
        self.queue_resolved(purpose, case, None);
    }

    fn queue_resolved(&mut self, purpose: Purpose, case: Case, resolved: Option<ResolvedCase>) {
        let id = self.next_job_id;
        self.next_job_id += 1;
        let running = Some(Running {
            id,
            generation: self.generation,
            fraction: 0.0,
        });
        match purpose {
            Purpose::Baseline => self.running_baseline = running,
            Purpose::WhatIf => self.running_what_if = running,
        }
        self.requests.push(JobRequest {
            id,
            purpose,
            generation: self.generation,
            case,
            resolved: resolved.map(Box::new),
            task: super::job::Task::Solve,
        });
    }

    /// Ask for a baseline solve unless one for this generation is done or running.
    pub fn ensure_baseline(&mut self) {
        let running_now = self
            .running_baseline
            .is_some_and(|r| r.generation == self.generation);
        if self.baseline_is_stale() && !running_now {
            self.queue(Purpose::Baseline, self.case.clone());
        }
    }

    fn resolve_again(&mut self) {
        self.queue(Purpose::Baseline, self.case.clone());
        if self.what_if.change.is_some() {
            self.run_what_if();
        }
    }

    fn go_to(&mut self, screen: Screen) {
        self.screen = screen;
        if matches!(screen, Screen::Results | Screen::WhatIf) {
            self.ensure_baseline();
        }
    }

    /// Spinner and timers.
    pub fn on_tick(&mut self) {
        self.tick = self.tick.wrapping_add(1);
    }

    /// A message from the background solver.
    pub fn on_job(&mut self, message: JobMessage) {
        match message {
            JobMessage::Progress { id, fraction } => {
                for running in [&mut self.running_baseline, &mut self.running_what_if]
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
                if self.running_what_if.is_some_and(|r| r.id == id) {
                    self.running_what_if = None;
                    match result {
                        Ok(design) => {
                            self.what_if.description = Some(design_summary(&design, self.units));
                            self.what_if.design = Some((generation, design));
                            self.what_if.error = None;
                        }
                        Err(error) => self.what_if.error = Some(error),
                    }
                }
            }
            JobMessage::Finished {
                id,
                purpose,
                generation,
                result,
            } => match purpose {
                Purpose::Baseline => {
                    if self.running_baseline.is_some_and(|r| r.id == id) {
                        self.running_baseline = None;
                    }
                    // Keep the newest result only.
                    if self
                        .baseline
                        .as_ref()
                        .is_none_or(|b| b.generation <= generation)
                    {
                        self.baseline = Some(Baseline { generation, result });
                        self.results.cause = 0;
                        self.results.remedy = 0;
                    }
                }
                Purpose::WhatIf => {
                    if self.running_what_if.is_some_and(|r| r.id == id) {
                        self.running_what_if = None;
                        match result {
                            Ok(outcome) => {
                                self.what_if.outcome = Some((generation, outcome));
                                self.what_if.error = None;
                            }
                            Err(error) => {
                                self.what_if.outcome = None;
                                self.what_if.error = Some(error);
                            }
                        }
                    }
                }
            },
        }
    }

    pub fn handle_event(&mut self, event: Event) {
        match event {
            Event::Key(key) => self.handle_key(key),
            Event::Mouse(Mouse::ScrollUp) => self.handle_key(Key::Up),
            Event::Mouse(Mouse::ScrollDown) => self.handle_key(Key::Down),
            Event::Mouse(Mouse::Click { column, row }) => {
                if row == 0 && self.popup.is_none() {
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
        match self.screen {
            Screen::Symptoms => self.symptoms.focus == SymptomFocus::List,
            Screen::Inputs => true,
            Screen::Results | Screen::WhatIf => false,
        }
    }

    pub fn handle_key(&mut self, key: Key) {
        if self.popup.is_some() {
            self.handle_popup_key(key);
            return;
        }
        self.status = None;
        match key {
            Key::Tab if self.inputs.editing.is_none() => return self.go_to(self.screen.next()),
            Key::BackTab if self.inputs.editing.is_none() => {
                return self.go_to(self.screen.previous());
            }
            Key::F(1) => {
                self.help_scroll = 0;
                return self.popup = Some(Popup::Help);
            }
            Key::F(n @ 2..=5) => return self.go_to(Screen::ALL[usize::from(n - 2)]),
            Key::Ctrl('s') => return self.save(),
            Key::Ctrl('q') | Key::Ctrl('c') => return self.ask(PendingAction::Quit),
            Key::Ctrl('n') => return self.ask(PendingAction::NewCase),
            Key::Ctrl('o') => return self.open_prompt(OpenPurpose::WholeCase),
            Key::Ctrl('l') => return self.open_prompt(OpenPurpose::InputsOnly),
            Key::Ctrl('r') => return self.resolve_again(),
            Key::Ctrl('e') => return self.export(),
            Key::Ctrl('t') | Key::F(6) => return self.open_training(),
            Key::Ctrl('u') => {
                self.units = match self.units {
                    UnitSystem::Si => UnitSystem::Us,
                    UnitSystem::Us => UnitSystem::Si,
                };
                return;
            }
            _ => {}
        }
        if !self.is_typing() {
            match key {
                Key::Char('?') => {
                    self.help_scroll = 0;
                    return self.popup = Some(Popup::Help);
                }
                Key::Char('q') => return self.ask(PendingAction::Quit),
                _ => {}
            }
        }
        match self.screen {
            Screen::Symptoms => self.symptoms_key(key),
            Screen::Inputs => self.inputs_key(key),
            Screen::Results => self.results_key(key),
            Screen::WhatIf => self.what_if_key(key),
        }
    }

    // ----- popups, saving, quitting --------------------------------------------------------

    fn ask(&mut self, action: PendingAction) {
        if self.dirty {
            self.popup = Some(Popup::Confirm(action));
        } else {
            self.perform(action);
        }
    }

    fn perform(&mut self, action: PendingAction) {
        match action {
            PendingAction::Quit => self.should_quit = true,
            PendingAction::NewCase => {
                let case = Case {
                    title: "New case".into(),
                    ..Case::default()
                };
                self.set_case(case, None);
            }
            PendingAction::Open(path) => {
                if let Err(error) = self.open_path(&path, OpenPurpose::WholeCase) {
                    self.status = Some(error);
                }
            }
            PendingAction::Training(index) => self.open_walkthrough(index),
        }
    }

    fn open_prompt(&mut self, purpose: OpenPurpose) {
        self.popup = Some(Popup::Open(FilePrompt {
            purpose,
            input: String::new(),
            suggestions: case_files_nearby(),
            selected: None,
            error: None,
        }));
    }

    /// Save to the case's file, or ask for a file name first (always for a shipped demo case,
    /// so a stray Ctrl-S never overwrites one).
    pub fn save(&mut self) {
        match self.case_path.clone() {
            Some(path) if !crate::fsutil::is_shipped_demo_case(&path) => self.save_to(&path),
            _ => {
                self.popup = Some(Popup::SaveAs {
                    input: suggested_file_name(&self.case.title),
                    error: None,
                })
            }
        }
    }

    fn save_to(&mut self, path: &Path) {
        match save_case(&self.case, path) {
            Ok(()) => {
                self.dirty = false;
                self.case_path = Some(path.to_path_buf());
                self.status = Some(format!("Saved {}", path.display()));
            }
            Err(error) => self.status = Some(format!("Not saved: {error}")),
        }
    }

    fn export(&mut self) {
        if self.current_outcome().is_none() {
            self.status = Some("Nothing to export yet: solve the case first (F4, or ^R)".into());
            return;
        }
        let stem = self
            .case_path
            .as_ref()
            .and_then(|p| p.file_stem())
            .map(|s| s.to_string_lossy().into_owned())
            .unwrap_or_else(|| {
                suggested_file_name(&self.case.title)
                    .trim_end_matches(".yaml")
                    .to_string()
            });
        self.popup = Some(Popup::Export {
            input: format!("{stem}_report.md"),
            error: None,
        });
    }

    /// Write a report of the current results (and the remedy being tried, if any) to `path`.
    pub fn export_to(&mut self, path: &Path) -> Result<(), String> {
        let outcome = self
            .current_outcome()
            .ok_or("the results are out of date: solve again first")?;
        let diagnosis = outcome
            .diagnosis
            .as_ref()
            .map_err(|e| format!("no diagnosis to report: {e}"))?;
        // As on the command line: an unknown extension is refused, not written as Markdown.
        let format = crate::report::Format::from_path(path).ok_or_else(|| {
            format!(
                "cannot tell the report format from \"{}\"; use an extension .md, .html or .json",
                path.display()
            )
        })?;
        let remedy = match (&self.what_if.remedy, &self.what_if.outcome) {
            (Some(id), Some((generation, after))) if *generation == self.generation => {
                Some(crate::report::RemedyComparison {
                    remedy_id: id.clone(),
                    remedy_text: diagnosis
                        .remedies
                        .iter()
                        .find(|r| &r.id == id)
                        .map_or_else(|| id.clone(), |r| r.text.clone()),
                    change: self.what_if.description.clone().unwrap_or_default(),
                    after_case: after.resolved.clone(),
                    after: after.profile.clone(),
                })
            }
            _ => None,
        };
        let input = crate::report::ReportInput {
            case: self.case.clone(),
            resolved: outcome.resolved.clone(),
            profile: outcome.profile.clone(),
            diagnosis: diagnosis.clone(),
            remedy,
            meta: crate::report::ReportMeta::now(
                self.case_path.as_ref().map(|p| p.display().to_string()),
            ),
            units: self.units,
        };
        crate::finite::ensure_finite("the stress profile", &input.profile)
            .and_then(|()| crate::finite::ensure_finite("the diagnosis", &input.diagnosis))
            .map_err(|e| e.to_string())?;
        let text = crate::report::render(&input, format).map_err(|e| e.to_string())?;
        crate::fsutil::save_atomic(path, text.as_bytes()).map_err(|e| e.to_string())?;
        self.status = Some(format!(
            "Report written to {} ({})",
            path.display(),
            format.as_str()
        ));
        Ok(())
    }

    fn open_training(&mut self) {
        if self.walkthroughs.is_empty() {
            self.status = Some("No training walk-throughs are available".into());
        } else {
            self.popup = Some(Popup::Training { selected: 0 });
        }
    }

    /// Open a walk-through's case and start answering its questions.
    pub fn open_walkthrough(&mut self, index: usize) {
        let Some(loaded) = self.walkthroughs.get(index).cloned() else {
            return;
        };
        match crate::training::load_case(&loaded) {
            Ok(case) => {
                self.set_case(case.clone(), None);
                // The walk-through is about finding the cause: start on the picture, not the answer.
                self.screen = Screen::Symptoms;
                let rules = crate::diagnose::rules::RuleBase::embedded().ok();
                let context =
                    crate::training::TrainingContext::compute(case, rules.as_ref(), self.units);
                self.popup = Some(Popup::Walkthrough(Box::new(WalkthroughRun {
                    session: crate::training::Session::new(loaded.walkthrough, context),
                    stage: WalkStage::Briefing,
                    scroll: 0,
                })));
            }
            Err(error) => self.status = Some(format!("Cannot open the walk-through: {error}")),
        }
    }

    /// Write a stack fit into the case's web radial stiffness (law pfeiffer).
    fn apply_stack_fit(&mut self, fitted: &StackFit) {
        crate::calibrate::apply_to_case(&mut self.case, &fitted.fit);
        self.changed();
        self.status = Some(format!(
            "Web radial stiffness: pfeiffer K1 {} kPa, K2 {} from {} (unsaved)",
            crate::calibrate::significant(fitted.fit.k1 / 1e3, 5),
            crate::calibrate::significant(fitted.fit.k2, 5),
            fitted.origin
        ));
    }

    fn handle_popup_key(&mut self, key: Key) {
        let Some(popup) = self.popup.take() else {
            return;
        };
        match popup {
            Popup::Help => {
                match key {
                    Key::Up => self.help_scroll = self.help_scroll.saturating_sub(1),
                    Key::Down => self.help_scroll = self.help_scroll.saturating_add(1).min(60),
                    Key::PageUp => self.help_scroll = self.help_scroll.saturating_sub(10),
                    Key::PageDown => self.help_scroll = self.help_scroll.saturating_add(10).min(60),
                    Key::Home => self.help_scroll = 0,
                    _ => {}
                }
                if !matches!(
                    key,
                    Key::Esc | Key::F(1) | Key::Char('?') | Key::Char('q') | Key::Enter
                ) {
                    self.popup = Some(Popup::Help);
                }
            }
            Popup::Confirm(action) => match key {
                Key::Char('s') | Key::Char('S') => {
                    self.save();
                    if self.dirty {
                        // Save failed or needs a name: stay, the message/prompt says why.
                        if self.popup.is_none() {
                            self.popup = Some(Popup::Confirm(action));
                        }
                    } else {
                        self.perform(action);
                    }
                }
                Key::Char('d') | Key::Char('D') => {
                    self.dirty = false;
                    self.perform(action);
                }
                Key::Esc | Key::Char('c') => {}
                _ => self.popup = Some(Popup::Confirm(action)),
            },
            Popup::Open(mut prompt) => match key {
                Key::Esc => {}
                Key::Enter => {
                    let text = match (prompt.selected, prompt.input.trim().is_empty()) {
                        (Some(i), true) => prompt.suggestions.get(i).cloned().unwrap_or_default(),
                        _ => prompt.input.trim().to_string(),
                    };
                    if text.is_empty() {
                        prompt.error = Some("type a file name or pick one with ↑↓".into());
                        self.popup = Some(Popup::Open(prompt));
                        return;
                    }
                    let path = PathBuf::from(&text);
                    if prompt.purpose == OpenPurpose::WholeCase && self.dirty {
                        self.popup = Some(Popup::Confirm(PendingAction::Open(path)));
                        return;
                    }
                    if let Err(error) = self.open_path(&path, prompt.purpose) {
                        prompt.error = Some(error);
                        self.popup = Some(Popup::Open(prompt));
                    }
                }
                Key::Up | Key::Down => {
                    let n = prompt.suggestions.len();
                    if n > 0 {
                        prompt.selected = Some(match (prompt.selected, key) {
                            (None, Key::Down) => 0,
                            (None, _) => n - 1,
                            (Some(i), Key::Down) => (i + 1).min(n - 1),
                            (Some(i), _) => i.saturating_sub(1),
                        });
                        prompt.input.clear();
                    }
                    self.popup = Some(Popup::Open(prompt));
                }
                Key::Backspace => {
                    prompt.input.pop();
                    self.popup = Some(Popup::Open(prompt));
                }
                Key::Char(c) => {
                    prompt.input.push(c);
                    prompt.selected = None;
                    prompt.error = None;
                    self.popup = Some(Popup::Open(prompt));
                }
                _ => self.popup = Some(Popup::Open(prompt)),
            },
            Popup::Notice { .. } => {}
            Popup::Calibrate(mut prompt) => match key {
                Key::Esc => {}
                Key::Enter => match prompt.fit.take() {
                    Some(fitted) => self.apply_stack_fit(&fitted),
                    None => {
                        let path = PathBuf::from(prompt.input.trim());
                        let thickness = self.resolved.as_ref().ok().map(|r| r.web.thickness);
                        match fit_stack_file(&path, thickness) {
                            Ok(fitted) => {
                                prompt.fit = Some(fitted);
                                prompt.error = None;
                            }
                            Err(error) => prompt.error = Some(error),
                        }
                        self.popup = Some(Popup::Calibrate(prompt));
                    }
                },
                Key::Char(c) => {
                    prompt.input.push(c);
                    prompt.fit = None;
                    prompt.error = None;
                    self.popup = Some(Popup::Calibrate(prompt));
                }
                Key::Backspace => {
                    prompt.input.pop();
                    prompt.fit = None;
                    prompt.error = None;
                    self.popup = Some(Popup::Calibrate(prompt));
                }
                _ => self.popup = Some(Popup::Calibrate(prompt)),
            },
            Popup::Walkthrough(mut run) => {
                if run.key(key) {
                    self.popup = Some(Popup::Walkthrough(run));
                } else {
                    let score = run.session.score();
                    self.status = Some(format!("Walk-through left: {score}"));
                }
            }
            Popup::Training { selected } => match key {
                Key::Up => {
                    self.popup = Some(Popup::Training {
                        selected: selected.saturating_sub(1),
                    })
                }
                Key::Down => {
                    self.popup = Some(Popup::Training {
                        selected: (selected + 1).min(self.walkthroughs.len().saturating_sub(1)),
                    })
                }
                Key::Enter => {
                    if self.dirty {
                        self.popup = Some(Popup::Confirm(PendingAction::Training(selected)));
                    } else {
                        self.open_walkthrough(selected);
                    }
                }
                Key::Esc => {}
                _ => self.popup = Some(Popup::Training { selected }),
            },
            Popup::Export { mut input, .. } => match key {
                Key::Esc => {}
                Key::Enter => {
                    let text = input.trim().to_string();
                    if let Err(error) = self.export_to(Path::new(&text)) {
                        self.popup = Some(Popup::Export {
                            input,
                            error: Some(error),
                        });
                    }
                }
                Key::Backspace => {
                    input.pop();
                    self.popup = Some(Popup::Export { input, error: None });
                }
                Key::Char(c) => {
                    input.push(c);
                    self.popup = Some(Popup::Export { input, error: None });
                }
                _ => self.popup = Some(Popup::Export { input, error: None }),
            },
            Popup::SaveAs { mut input, .. } => match key {
                Key::Esc => {}
                Key::Enter => {
                    let text = input.trim().to_string();
                    if text.is_empty() {
                        self.popup = Some(Popup::SaveAs {
                            input,
                            error: Some("type a file name".into()),
                        });
                    } else {
                        self.save_to(Path::new(&text));
                        if self.dirty {
                            self.popup = Some(Popup::SaveAs {
                                input,
                                error: self.status.clone(),
                            });
                        }
                    }
                }
                Key::Backspace => {
                    input.pop();
                    self.popup = Some(Popup::SaveAs { input, error: None });
                }
                Key::Char(c) => {
                    input.push(c);
                    self.popup = Some(Popup::SaveAs { input, error: None });
                }
                _ => self.popup = Some(Popup::SaveAs { input, error: None }),
            },
        }
    }

    // ----- symptoms ------------------------------------------------------------------------

    /// The symptom under the highlight, if the list is not empty.
    pub fn highlighted_symptom(&self) -> Option<&super::catalogue::SymptomInfo> {
        let m = self.symptoms.matches.get(self.symptoms.highlighted)?;
        self.catalogue.symptoms.get(m.index)
    }

    pub fn is_selected(&self, id: &str) -> bool {
        self.case.symptoms.iter().any(|s| s.id == id)
    }

    fn research(&mut self) {
        self.symptoms.matches = self.catalogue.search(&self.symptoms.query);
        self.symptoms.highlighted = 0;
        self.symptoms.detail_row = 0;
    }

    fn toggle_highlighted(&mut self) {
        let Some(id) = self.highlighted_symptom().map(|s| s.id.clone()) else {
            return;
        };
        if self.is_selected(&id) {
            self.case.symptoms.retain(|s| s.id != id);
        } else {
            self.case.symptoms.push(ObservedSymptom {
                id,
                place: None,
                notes: None,
            });
        }
        self.changed();
    }

    fn symptoms_key(&mut self, key: Key) {
        let n = self.symptoms.matches.len();
        match self.symptoms.focus {
            SymptomFocus::List => match key {
                Key::Up => self.symptoms.highlighted = self.symptoms.highlighted.saturating_sub(1),
                Key::Down => {
                    self.symptoms.highlighted =
                        (self.symptoms.highlighted + 1).min(n.saturating_sub(1))
                }
                Key::PageUp => {
                    self.symptoms.highlighted = self.symptoms.highlighted.saturating_sub(5)
                }
                Key::PageDown => {
                    self.symptoms.highlighted =
                        (self.symptoms.highlighted + 5).min(n.saturating_sub(1))
                }
                Key::Home => self.symptoms.highlighted = 0,
                Key::End => self.symptoms.highlighted = n.saturating_sub(1),
                Key::Enter => self.toggle_highlighted(),
                Key::Right if n > 0 => {
                    self.symptoms.focus = SymptomFocus::Details;
                    self.symptoms.detail_row = 0;
                }
                Key::Esc => {
                    self.symptoms.query.clear();
                    self.research();
                }
                Key::Backspace => {
                    self.symptoms.query.pop();
                    self.research();
                }
                Key::Char(c) => {
                    self.symptoms.query.push(c);
                    self.research();
                }
                _ => {}
            },
            SymptomFocus::Details => {
                let rows = 1 + self.highlighted_symptom().map_or(0, |s| s.questions.len());
                match key {
                    Key::Esc => self.symptoms.focus = SymptomFocus::List,
                    Key::Up => {
                        if self.symptoms.detail_row == 0 {
                            self.symptoms.focus = SymptomFocus::List;
                        } else {
                            self.symptoms.detail_row -= 1;
                        }
                    }
                    Key::Down => {
                        self.symptoms.detail_row = (self.symptoms.detail_row + 1).min(rows - 1)
                    }
                    Key::Right | Key::Enter | Key::Char(' ') => self.cycle_detail(true),
                    Key::Left => self.cycle_detail(false),
                    Key::Char('y') => self.answer_current("yes"),
                    Key::Char('n') => self.answer_current("no"),
                    Key::Char('u') => self.answer_current("unknown"),
                    Key::Char('t') => self.toggle_highlighted(),
                    _ => {}
                }
            }
        }
    }

    /// Change the value on the current details row: the place, or the question's answer.
    fn cycle_detail(&mut self, forward: bool) {
        let Some(symptom) = self.highlighted_symptom().cloned() else {
            return;
        };
        if self.symptoms.detail_row == 0 {
            let places: Vec<String> = if symptom.places.is_empty() {
                PLACES.iter().map(|p| p.to_string()).collect()
            } else {
                symptom.places.clone()
            };
            let current = self
                .case
                .symptoms
                .iter()
                .find(|s| s.id == symptom.id)
                .and_then(|s| s.place.clone());
            let next = fields::cycle(&places, current.as_deref(), forward);
            // Saying where a symptom shows means it was seen: select it too.
            match self.case.symptoms.iter_mut().find(|s| s.id == symptom.id) {
                Some(observed) => observed.place = next,
                None => self.case.symptoms.push(ObservedSymptom {
                    id: symptom.id.clone(),
                    place: next,
                    notes: None,
                }),
            }
            self.changed();
        } else if let Some(question) = symptom.questions.get(self.symptoms.detail_row - 1) {
            let options = question.options();
            let current = self.case.answers.get(&question.id).cloned();
            if let Some(next) = fields::cycle(&options, current.as_deref(), forward) {
                self.case.answers.insert(question.id.clone(), next);
                self.changed();
            }
        }
    }

    fn answer_current(&mut self, answer: &str) {
        let Some(symptom) = self.highlighted_symptom().cloned() else {
            return;
        };
        if self.symptoms.detail_row == 0 {
            return;
        }
        if let Some(question) = symptom.questions.get(self.symptoms.detail_row - 1) {
            let accepted = question.options();
            if accepted.iter().any(|o| o == answer) {
                self.case
                    .answers
                    .insert(question.id.clone(), answer.to_string());
                self.changed();
            }
        }
    }

    // ----- inputs --------------------------------------------------------------------------

    /// The assumed value (and its source) for a field path, from the resolved case.
    pub fn assumed(&self, path: &str) -> Option<&crate::case::AssumedValue> {
        self.resolved
            .as_ref()
            .ok()?
            .assumed
            .iter()
            .find(|a| a.field == path)
    }

    fn preset_options(&self, family: PresetFamily) -> &[String] {
        match family {
            PresetFamily::Web => &self.web_presets,
            PresetFamily::Core => &self.core_presets,
        }
    }

    fn inputs_key(&mut self, key: Key) {
        if key == Key::Ctrl('k') && self.inputs.editing.is_none() {
            self.popup = Some(Popup::Calibrate(Box::default()));
            return;
        }
        let spec = FIELDS[self.inputs.selected.min(FIELDS.len() - 1)];
        if let Some(mut text) = self.inputs.editing.take() {
            match key {
                Key::Esc => self.inputs.error = None,
                Key::Enter | Key::Tab => {
                    match fields::set(&mut self.case, &spec, Some(&text)) {
                        Ok(()) => {
                            self.inputs.error = None;
                            self.changed();
                            if key == Key::Enter {
                                self.inputs.selected =
                                    (self.inputs.selected + 1).min(FIELDS.len() - 1);
                            }
                        }
                        Err(message) => {
                            // Rejected in place: keep the text so it can be corrected.
                            self.inputs.error = Some(message);
                            self.inputs.editing = Some(text);
                        }
                    }
                }
                Key::Backspace => {
                    text.pop();
                    self.inputs.editing = Some(text);
                }
                Key::Char(c) => {
                    text.push(c);
                    self.inputs.editing = Some(text);
                }
                _ => self.inputs.editing = Some(text),
            }
            return;
        }
        match key {
            Key::Up => {
                self.inputs.selected = self.inputs.selected.saturating_sub(1);
                self.inputs.error = None;
            }
            Key::Down => {
                self.inputs.selected = (self.inputs.selected + 1).min(FIELDS.len() - 1);
                self.inputs.error = None;
            }
            Key::PageUp => self.inputs.selected = self.inputs.selected.saturating_sub(8),
            Key::PageDown => {
                self.inputs.selected = (self.inputs.selected + 8).min(FIELDS.len() - 1)
            }
            Key::Home => self.inputs.selected = 0,
            Key::End => self.inputs.selected = FIELDS.len() - 1,
            Key::Enter => {
                self.inputs.editing = Some(fields::get(&self.case, spec.path).unwrap_or_default())
            }
            Key::Delete | Key::Backspace
                if fields::get(&self.case, spec.path).is_some()
                    && fields::set(&mut self.case, &spec, None).is_ok() =>
            {
                self.changed();
            }
            Key::Left | Key::Right => {
                let options: Vec<String> = match spec.kind {
                    FieldKind::Choice(options) => options.iter().map(|o| o.to_string()).collect(),
                    FieldKind::Preset(family) => self.preset_options(family).to_vec(),
                    _ => Vec::new(),
                };
                let current = fields::get(&self.case, spec.path);
                if let Some(next) = fields::cycle(&options, current.as_deref(), key == Key::Right)
                    && fields::set(&mut self.case, &spec, Some(&next)).is_ok()
                {
                    self.changed();
                }
            }
            Key::Char(c) => {
                // Typing on a field starts editing it: quick entry without Enter first.
                self.inputs.editing = Some(c.to_string());
                self.inputs.error = None;
            }
            _ => {}
        }
    }

    // ----- results -------------------------------------------------------------------------

    fn results_key(&mut self, key: Key) {
        let (causes, remedies) = self
            .latest_outcome()
            .and_then(|o| o.diagnosis.as_ref().ok())
            .map_or((0, 0), |d| (d.causes.len(), d.remedies.len()));
        let state = &mut self.results;
        match key {
            Key::Left => state.focus = ResultsFocus::Causes,
            Key::Right => state.focus = ResultsFocus::Remedies,
            Key::Up => match state.focus {
                ResultsFocus::Causes => state.cause = state.cause.saturating_sub(1),
                ResultsFocus::Remedies => state.remedy = state.remedy.saturating_sub(1),
            },
            Key::Down => match state.focus {
                ResultsFocus::Causes => {
                    state.cause = (state.cause + 1).min(causes.saturating_sub(1))
                }
                ResultsFocus::Remedies => {
                    state.remedy = (state.remedy + 1).min(remedies.saturating_sub(1))
                }
            },
            Key::Enter | Key::Char(' ') => match state.focus {
                ResultsFocus::Causes => {
                    let id = self
                        .latest_outcome()
                        .and_then(|o| o.diagnosis.as_ref().ok())
                        .and_then(|d| d.causes.get(self.results.cause))
                        .map(|c| c.id.clone());
                    if let Some(id) = id
                        && !self.results.expanded.remove(&id)
                    {
                        self.results.expanded.insert(id);
                    }
                }
                ResultsFocus::Remedies => {
                    let remedy = self
                        .latest_outcome()
                        .and_then(|o| o.diagnosis.as_ref().ok())
                        .and_then(|d| d.remedies.get(self.results.remedy))
                        .map(|r| r.id.clone());
                    if let Some(id) = remedy {
                        if self.remedy_is_tryable(&id) {
                            self.go_to(Screen::WhatIf);
                            self.try_remedy(&id);
                        } else {
                            self.status = Some(format!(
                                "{id}: not a winder setting change the what-if can try"
                            ));
                        }
                    }
                }
            },
            Key::Char('w') => self.go_to(Screen::WhatIf),
            _ => {}
        }
    }

    // ----- what-if -------------------------------------------------------------------------

    /// True when the rule base gives `remedy` a machine-readable setting change.
    pub fn remedy_is_tryable(&self, remedy: &str) -> bool {
        self.remedy_changes
            .get(remedy)
            .is_some_and(|changes| !changes.is_empty())
    }

    /// Remedies in the current diagnosis that change a winder setting: (ID, text).
    pub fn what_if_remedies(&self) -> Vec<(String, String)> {
        self.latest_outcome()
            .and_then(|o| o.diagnosis.as_ref().ok())
            .map(|d| {
                d.remedies
                    .iter()
                    .filter(|r| self.remedy_is_tryable(&r.id))
                    .map(|r| (r.id.clone(), r.text.clone()))
                    .collect()
            })
            .unwrap_or_default()
    }

    fn what_if_key(&mut self, key: Key) {
        let rows = Setting::ALL.len() + self.what_if_remedies().len();
        match key {
            Key::Up => self.what_if.row = self.what_if.row.saturating_sub(1),
            Key::Down => self.what_if.row = (self.what_if.row + 1).min(rows - 1),
            Key::Left | Key::Right => {
                if let Some(setting) = Setting::ALL.get(self.what_if.row).copied() {
                    let delta = if key == Key::Right { 1 } else { -1 };
                    let steps = match self.what_if.change {
                        Some(c) if c.setting == setting => c.steps + delta,
                        _ => delta,
                    };
                    if steps == 0 {
                        self.clear_what_if();
                    } else {
                        self.set_what_if(SettingChange { setting, steps });
                    }
                }
            }
            Key::Enter if self.what_if.row >= Setting::ALL.len() => {
                let remedies = self.what_if_remedies();
                if let Some((id, _)) = remedies.get(self.what_if.row - Setting::ALL.len()) {
                    let id = id.clone();
                    self.try_remedy(&id);
                }
            }
            Key::Char('r') | Key::Esc => self.clear_what_if(),
            Key::Char('d') => self.design_taper(),
            Key::Char('a') => self.adopt_what_if(),
            _ => {}
        }
    }

    /// Ask for a taper schedule that keeps the roll inside every limit (`taper_design`).
    pub fn design_taper(&mut self) {
        let resolved = match &self.resolved {
            Ok(resolved) => resolved.clone(),
            Err(error) => {
                self.what_if.error = Some(format!("fix the inputs first: {error}"));
                return;
            }
        };
        self.clear_what_if();
        self.what_if.description = Some("Designing a taper schedule (many solves)…".into());
        let id = self.next_job_id;
        self.next_job_id += 1;
        self.running_what_if = Some(Running {
            id,
            generation: self.generation,
            fraction: 0.0,
        });
        self.requests.push(JobRequest {
            id,
            purpose: Purpose::WhatIf,
            generation: self.generation,
            case: self.case.clone(),
            resolved: Some(Box::new(resolved)),
            task: super::job::Task::DesignTaper,
        });
    }

    fn clear_what_if(&mut self) {
        self.what_if.design = None;
        self.what_if.change = None;
        self.what_if.remedy = None;
        self.what_if.description = None;
        self.what_if.outcome = None;
        self.what_if.error = None;
        self.running_what_if = None;
    }

    /// Apply `change` to a copy of the case and queue its solve.
    pub fn set_what_if(&mut self, change: SettingChange) {
        self.what_if.change = Some(change);
        self.what_if.remedy = None;
        if let Some(row) = Setting::ALL.iter().position(|s| *s == change.setting)
            && self.what_if.row < Setting::ALL.len()
        {
            self.what_if.row = row;
        }
        self.run_what_if();
    }

    /// Try a remedy's own setting changes (from the rule base) on the case.
    pub fn try_remedy(&mut self, remedy: &str) {
        self.what_if.change = None;
        self.what_if.remedy = Some(remedy.to_string());
        self.run_what_if();
    }

    fn run_what_if(&mut self) {
        if let Some(remedy) = self.what_if.remedy.clone() {
            let changes = self
                .remedy_changes
                .get(&remedy)
                .cloned()
                .unwrap_or_default();
            match &self.resolved {
                Ok(resolved) => {
                    let trial = crate::diagnose::remedies::apply_changes(resolved, &changes);
                    let words: Vec<String> = changes.iter().map(describe_change).collect();
                    self.what_if.description = Some(format!("{remedy}: {}", words.join(", ")));
                    self.what_if.error = None;
                    self.ensure_baseline();
                    self.queue_resolved(Purpose::WhatIf, self.case.clone(), Some(trial));
                }
                Err(error) => {
                    self.what_if.description = None;
                    self.what_if.error = Some(format!("fix the inputs first: {error}"));
                    self.what_if.outcome = None;
                }
            }
            return;
        }
        let Some(change) = self.what_if.change else {
            return;
        };
        match self.trial_case(change) {
            Ok((case, description)) => {
                self.what_if.description = Some(description);
                self.what_if.error = None;
                self.ensure_baseline();
                self.queue(Purpose::WhatIf, case);
            }
            Err(error) => {
                self.what_if.description = None;
                self.what_if.error = Some(error);
                self.what_if.outcome = None;
            }
        }
    }

    /// Keep the what-if change: it becomes part of the case.
    fn adopt_what_if(&mut self) {
        if let Some((_, design)) = self.what_if.design.clone() {
            if design.steps.is_some() {
                self.status = Some("A stepped schedule: enter its steps in the case file".into());
                return;
            }
            let kind = match design.shape {
                crate::taper_design::TaperShape::Linear => "linear",
                crate::taper_design::TaperShape::Hyperbolic => "hyperbolic",
            };
            self.case.winding.tension = Some(QuantityText::Number(design.start_tension));
            self.case.winding.taper = Some(TaperInput {
                kind: kind.into(),
                amount: Some(QuantityText::Text(format!(
                    "{} %",
                    super::screens::sig3(design.taper_fraction * 100.0)
                ))),
                steps: Vec::new(),
            });
            self.changed();
            self.status = Some("Kept the designed taper schedule".into());
            return;
        }
        if let Some(remedy) = self.what_if.remedy.clone() {
            let changes = self
                .remedy_changes
                .get(&remedy)
                .cloned()
                .unwrap_or_default();
            let result = match &self.resolved {
                Ok(resolved) => keep_changes(&self.case, resolved, &changes),
                Err(error) => Err(format!("fix the inputs first: {error}")),
            };
            match result {
                Ok(case) => {
                    self.case = case;
                    self.changed();
                    self.status = Some(format!("Kept: {remedy}"));
                }
                Err(error) => self.status = Some(error),
            }
            return;
        }
        let Some(change) = self.what_if.change else {
            self.status = Some("No change to keep; use ←/→ on a setting first".into());
            return;
        };
        match self.trial_case(change) {
            Ok((case, description)) => {
                self.case = case;
                self.changed();
                self.status = Some(format!("Kept: {description}"));
            }
            Err(error) => self.status = Some(error),
        }
    }

    /// The case with `change` applied, and the change in plain words.
    pub fn trial_case(&self, change: SettingChange) -> Result<(Case, String), String> {
        let resolved = self
            .resolved
            .as_ref()
            .map_err(|e| format!("fix the inputs first: {e}"))?;
        let mut case = self.case.clone();
        let steps = f64::from(change.steps);
        let fmt = |v: f64, kind| crate::units::format_quantity(v, kind, self.units);
        use crate::units::QuantityKind as Q;
        let description = match change.setting {
            Setting::Tension => {
                let before = resolved.winding.tension.start_tension;
                let after = (before * (1.0 + 0.1 * steps)).max(before * 0.1);
                case.winding.tension = Some(QuantityText::Number(after));
                format!(
                    "Web tension {} → {}",
                    fmt(before, Q::ForcePerWidth),
                    fmt(after, Q::ForcePerWidth)
                )
            }
            Setting::Taper => {
                let (kind, before) = match &resolved.winding.tension.taper {
                    Taper::None => ("hyperbolic", 0.0),
                    Taper::Linear { fraction } => ("linear", *fraction),
                    Taper::Hyperbolic { fraction } => ("hyperbolic", *fraction),
                    Taper::Steps { .. } => {
                        return Err("the taper is a list of steps; edit it in the case file".into());
                    }
                };
                let after = (before + 0.05 * steps).clamp(0.0, 0.9);
                case.winding.taper = Some(TaperInput {
                    kind: if after == 0.0 { "none" } else { kind }.into(),
                    amount: Some(QuantityText::Text(format!("{:.0} %", after * 100.0))),
                    steps: Vec::new(),
                });
                format!(
                    "Taper {:.0} % → {:.0} % ({kind})",
                    before * 100.0,
                    after * 100.0
                )
            }
            Setting::NipLoad => {
                let before = resolved.winding.nip_load;
                // Without a nip, the first step up tries a light one: 1 pli (175.1 N/m).
                let start = before.unwrap_or(175.126_835_3 / 1.2);
                let after = start * 1.2_f64.powf(steps);
                let after = (after >= 1.0).then_some(after);
                case.winding.nip_load = after.map(QuantityText::Number);
                let text =
                    |v: Option<f64>| v.map_or("none".to_string(), |v| fmt(v, Q::ForcePerWidth));
                format!("Nip load {} → {}", text(before), text(after))
            }
            Setting::Core => {
                // Same core size, stiffer or softer: the effective stiffness Ec doubles or halves
                // per step (written as a measured stiffness, which overrides the modulus).
                let before = resolved.core.stiffness.effective_stiffness();
                if !before.is_finite() {
                    return Err("the core is rigid: a stiffer core changes nothing".into());
                }
                let after = before * 2.0_f64.powi(change.steps);
                case.core.stiffness = Some(QuantityText::Number(after));
                format!(
                    "Core stiffness Ec {} → {}",
                    super::screens::compact_stress(before, self.units),
                    super::screens::compact_stress(after, self.units)
                )
            }
            Setting::Speed => {
                let before = resolved.winding.speed;
                let after = (before * (1.0 + 0.1 * steps)).max(before * 0.1);
                case.winding.speed = Some(QuantityText::Number(after));
                format!(
                    "Line speed {} → {}",
                    fmt(before, Q::Speed),
                    fmt(after, Q::Speed)
                )
            }
        };
        Ok((case, description))
    }

    /// Keys for the always-visible help line: (key, what it does), most useful first.
    pub fn key_hints(&self) -> Vec<(&'static str, &'static str)> {
        let mut hints: Vec<(&'static str, &'static str)> = match self.popup {
            Some(Popup::Help) => vec![("↑↓ PgUp PgDn", "scroll"), ("Esc", "close help")],
            Some(Popup::Confirm(_)) => {
                vec![("s", "save first"), ("d", "discard"), ("Esc", "cancel")]
            }
            Some(Popup::Open(_)) => vec![
                ("type", "file name"),
                ("↑↓", "pick"),
                ("Enter", "open"),
                ("Esc", "cancel"),
            ],
            Some(Popup::Export { .. }) => vec![
                ("type", "file (.md .html .json)"),
                ("Enter", "write"),
                ("Esc", "cancel"),
            ],
            Some(Popup::Training { .. }) => {
                vec![("↑↓", "pick"), ("Enter", "start"), ("Esc", "cancel")]
            }
            Some(Popup::Calibrate(ref prompt)) => match prompt.fit {
                Some(_) => vec![
                    ("Enter", "write K1 K2 into the case"),
                    ("type", "other file"),
                    ("Esc", "cancel"),
                ],
                None => vec![("type", "CSV file"), ("Enter", "fit"), ("Esc", "cancel")],
            },
            Some(Popup::Walkthrough(ref run)) => match run.stage {
                WalkStage::Question { .. } => {
                    vec![("1-9", "answer"), ("↑↓ Enter", "pick"), ("Esc", "leave")]
                }
                WalkStage::Done => vec![("Enter/Esc", "close"), ("↑↓", "scroll")],
                _ => vec![("Enter", "next"), ("↑↓", "scroll"), ("Esc", "leave")],
            },
            Some(Popup::Notice { .. }) => vec![("any key", "close")],
            Some(Popup::SaveAs { .. }) => {
                vec![("type", "file name"), ("Enter", "save"), ("Esc", "cancel")]
            }
            None => match self.screen {
                Screen::Symptoms => match self.symptoms.focus {
                    SymptomFocus::List => {
                        vec![("type", "search"), ("↑↓ Enter", "pick"), ("→", "details")]
                    }
                    SymptomFocus::Details => vec![
                        ("↑↓", "row"),
                        ("←→", "set"),
                        ("y/n/u", "answer"),
                        ("Esc", "back"),
                    ],
                },
                Screen::Inputs => match self.inputs.editing {
                    Some(_) => vec![("type", "value+unit"), ("Enter", "ok"), ("Esc", "cancel")],
                    // Delete (clear) is in the F1 list: the line has 80 columns.
                    None => vec![
                        ("↑↓", "move"),
                        ("type", "edit"),
                        ("←→", "set"),
                        ("^K", "calibrate"),
                    ],
                },
                Screen::Results => vec![("↑↓", "move"), ("←→", "pane"), ("Enter", "reasons/try")],
                Screen::WhatIf => vec![
                    ("↑↓", "pick"),
                    ("←→", "change"),
                    ("d", "taper"),
                    ("a", "keep"),
                ],
            },
        };
        if self.popup.is_none() {
            hints.extend([
                ("Tab", "screens"),
                ("F1", "help"),
                ("^S", "save"),
                ("^Q", "quit"),
            ]);
        }
        hints
    }
}

/// One line about a taper design: the schedule, and whether it meets every limit.
pub fn design_summary(design: &crate::taper_design::TaperDesign, units: UnitSystem) -> String {
    let shape = match design.shape {
        crate::taper_design::TaperShape::Linear => "linear",
        crate::taper_design::TaperShape::Hyperbolic => "hyperbolic",
    };
    let verdict = if design.feasible {
        "meets every limit"
    } else {
        "no schedule meets every limit (closest shown)"
    };
    format!(
        "Designed taper: start {}, {shape} {} % — {verdict}",
        crate::units::format_quantity(
            design.start_tension,
            crate::units::QuantityKind::ForcePerWidth,
            units
        ),
        super::screens::sig3(design.taper_fraction * 100.0)
    )
}

/// A rule-base setting change in plain words ("tension ×1.15", "taper +15 points").
pub fn describe_change(change: &RuleChange) -> String {
    match *change {
        RuleChange::TensionScale(f) => format!("tension ×{f}"),
        RuleChange::TaperBy(p) => format!("taper {p:+} points"),
        RuleChange::TaperTo(p) => format!("taper to {p} %"),
        RuleChange::NipScale(f) => format!("nip load ×{f}"),
        RuleChange::SpeedScale(f) => format!("speed ×{f}"),
        RuleChange::CoreStiffnessScale(f) => format!("core stiffness ×{f}"),
        RuleChange::CoreCrushScale(f) => format!("core crush rating ×{f}"),
        RuleChange::ClearUpsets => "no tension upsets".to_string(),
        RuleChange::CoreZoneTensionScale(f) => format!("core-zone tension ×{f}"),
    }
}

/// The case with a remedy's changes written into its inputs, for the changes a case file can
/// say directly; the others are refused with a reason.
pub fn keep_changes(
    case: &Case,
    resolved: &ResolvedCase,
    changes: &[RuleChange],
) -> Result<Case, String> {
    let mut out = case.clone();
    let trial = crate::diagnose::remedies::apply_changes(resolved, changes);
    for change in changes {
        match change {
            RuleChange::TensionScale(_) => {
                if !matches!(trial.winding.tension.taper, Taper::Steps { .. })
                    && trial.winding.tension.upsets.is_empty()
                {
                    out.winding.tension =
                        Some(QuantityText::Number(trial.winding.tension.start_tension));
                } else {
                    return Err("tension steps or upset bands: change them in the case file".into());
                }
            }
            RuleChange::TaperBy(_) | RuleChange::TaperTo(_) => {
                let (kind, fraction) = match trial.winding.tension.taper {
                    Taper::None => ("none", 0.0),
                    Taper::Linear { fraction } => ("linear", fraction),
                    Taper::Hyperbolic { fraction } => ("hyperbolic", fraction),
                    Taper::Steps { .. } => {
                        return Err(
                            "the taper is a list of steps: change it in the case file".into()
                        );
                    }
                };
                out.winding.taper = Some(TaperInput {
                    kind: kind.into(),
                    amount: Some(QuantityText::Text(format!(
                        "{} %",
                        super::screens::sig3(fraction * 100.0)
                    ))),
                    steps: Vec::new(),
                });
            }
            RuleChange::NipScale(_) => {
                out.winding.nip_load = trial.winding.nip_load.map(QuantityText::Number);
            }
            RuleChange::SpeedScale(_) => {
                out.winding.speed = Some(QuantityText::Number(trial.winding.speed));
            }
            RuleChange::CoreCrushScale(_) => {
                out.core.crush_pressure = Some(QuantityText::Number(trial.core.crush_pressure));
            }
            RuleChange::CoreStiffnessScale(_) => {
                let stiffness = trial.core.stiffness.effective_stiffness();
                if !stiffness.is_finite() {
                    return Err("the core is rigid already".into());
                }
                out.core.stiffness = Some(QuantityText::Number(stiffness));
            }
            RuleChange::ClearUpsets => out.winding.upsets.clear(),
            RuleChange::CoreZoneTensionScale(_) => {
                return Err("a core-zone tension band cannot be kept automatically: add it to the case file".into());
            }
        }
    }
    Ok(out)
}

/// Case files in `cases/` and the current folder, for the open prompt.
pub fn case_files_nearby() -> Vec<String> {
    let mut found = Vec::new();
    for folder in ["cases", "."] {
        if let Ok(entries) = std::fs::read_dir(folder) {
            for entry in entries.flatten() {
                let path = entry.path();
                if crate::fsutil::is_yaml(&path) {
                    let shown = if folder == "." {
                        path.file_name().map(|n| n.to_string_lossy().into_owned())
                    } else {
                        Some(path.display().to_string())
                    };
                    found.extend(shown);
                }
            }
        }
    }
    found.sort();
    found
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

/// Write the case atomically (temporary file, then rename).
pub fn save_case(case: &Case, path: &Path) -> Result<(), String> {
    case.save(path).map_err(|e| e.to_string())
}
