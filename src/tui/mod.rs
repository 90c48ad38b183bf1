//! Terminal UI (the only module that imports ratatui/crossterm): the app and its action queue
//! ([`app`]), the component trait and key maps ([`component`]), the shared state
//! ([`session`]), one module per screen ([`screens`]) and per popup ([`popups`]), input events
//! ([`event`]), the background solver ([`job`]) and terminal setup with a panic hook
//! ([`terminal`]).

pub mod app;
pub mod catalogue;
pub mod component;
pub mod event;
pub mod fields;
pub mod history_job;
pub mod job;
pub mod popups;
pub mod screens;
pub mod session;
pub mod terminal;
pub mod theme;

use std::path::PathBuf;
use std::sync::Arc;
use std::time::Duration;

use ratatui::crossterm::event as ct;

use crate::diagnose::rules::RuleBase;

/// Errors starting or running the terminal UI.
#[derive(Debug, thiserror::Error)]
pub enum TuiError {
    #[error("terminal: {0}")]
    Terminal(#[from] std::io::Error),
    #[error(transparent)]
    Case(#[from] crate::case::CaseError),
    #[error(transparent)]
    Rules(#[from] crate::diagnose::rules::RuleError),
}

/// How the UI is started.
#[derive(Debug, Clone, Default)]
pub struct Options {
    /// Case file to open; a new case when `None`.
    pub case: Option<PathBuf>,
    /// Rule directory overriding the shipped rules.
    pub rules: Option<PathBuf>,
    /// Units for figures on screen; `None` follows the case file (the units it is mostly
    /// typed in, SI when it says nothing).
    pub units: Option<crate::units::UnitSystem>,
    /// Capture the mouse (wheel scrolls, click on a tab switches screen).
    pub mouse: bool,
    /// The complaint history store as `--history` gives it (a SQLite path, a `postgres://`
    /// URL or `default`); `None` is `$ROLLTRIAGE_HISTORY` or the per-user store, as for
    /// `rolltriage history`.
    pub history: Option<String>,
}

/// Where the history screen finds the store: as `rolltriage history` resolves `--history`.
pub fn history_location(given: Option<&str>) -> Result<crate::history::Location, String> {
    match given {
        None | Some("default") => {
            crate::history::Location::default_for_user().map_err(|e| e.to_string())
        }
        Some(text) => Ok(crate::history::Location::parse(text)),
    }
}

/// Web and core preset IDs offered on the preset rows.
pub fn preset_ids() -> (Vec<String>, Vec<String>) {
    (
        crate::presets::web_presets()
            .iter()
            // The reference web exists for the engine's own checks, not for real rolls.
            .filter(|p| !p.id.ends_with("_reference"))
            .map(|p| p.id.to_string())
            .collect(),
        crate::presets::core_presets()
            .iter()
            .map(|p| p.id.to_string())
            .collect(),
    )
}

/// Build the app for `options` without touching the terminal (also used by tests).
pub fn build_app(options: &Options, rules: Arc<RuleBase>) -> Result<app::App, TuiError> {
    let case = open_case(options)?;
    Ok(build_app_with(options, rules, case))
}

/// The case file named in `options`, loaded (a bad file is a plain error, before any terminal
/// work).
fn open_case(options: &Options) -> Result<Option<crate::case::Case>, TuiError> {
    Ok(match &options.case {
        Some(path) => Some(crate::case::Case::load(path)?),
        None => None,
    })
}

/// The app for `options` with the case already loaded.
fn build_app_with(
    options: &Options,
    rules: Arc<RuleBase>,
    case: Option<crate::case::Case>,
) -> app::App {
    let (web, core) = preset_ids();
    let mut app = app::App::new(
        catalogue::Catalogue::from_rules(Arc::clone(&rules)),
        web,
        core,
    );
    if let Some(units) = options.units {
        app.session.units = units;
        app.session.units_chosen = true;
    }
    // Walk-throughs are optional extras: a broken one must not keep the UI from opening.
    app.session.walkthroughs = crate::training::library::embedded().unwrap_or_default();
    app.session.remedy_changes = rules
        .remedies
        .iter()
        .map(|(id, remedy)| (id.clone(), remedy.changes.clone()))
        .collect();
    app.session.history = history_location(options.history.as_deref());
    if let Some(case) = case {
        app.follow_typed_units(&case);
        app.set_case(case, options.case.clone());
    }
    app
}

/// Run the UI until the user quits. The terminal is restored on every exit path, panics
/// included.
pub fn run(options: &Options) -> Result<(), TuiError> {
    // Load the case before touching the terminal, so a bad file is a plain error message.
    let case = open_case(options)?;
    // Quantities in the rule texts in the units the UI starts in: the chosen ones, else those
    // the case file is typed in (as `App::follow_typed_units` picks them).
    let start_units = options
        .units
        .or_else(|| case.as_ref()?.typed_units())
        .unwrap_or(crate::units::UnitSystem::Si);
    let rules = match &options.rules {
        Some(dir) => RuleBase::load_dir_in(dir, start_units)?,
        None => RuleBase::embedded_in(start_units)?,
    };
    crate::diagnose::words::use_rules(&rules);
    let rules = Arc::new(rules);
    let mut app = build_app_with(options, Arc::clone(&rules), case);
    let theme = theme::Theme::from_env();
    let mut jobs = job::JobRunner::new(Arc::clone(&rules));
    let history = history_job::HistoryRunner::new(rules);
    let mut terminal = terminal::setup(options.mouse)?;
    let result = event_loop(&mut terminal, &mut app, (&mut jobs, &history), theme);
    jobs.cancel_all();
    terminal::teardown(options.mouse);
    result
}

fn event_loop(
    terminal: &mut terminal::UiTerminal,
    app: &mut app::App,
    (jobs, history): (&mut job::JobRunner, &history_job::HistoryRunner),
    theme: theme::Theme,
) -> Result<(), TuiError> {
    // Short poll so progress and the spinner keep moving while a solve runs.
    let tick = Duration::from_millis(100);
    let mut last_tick = std::time::Instant::now();
    while !app.should_quit {
        for request in app.take_requests() {
            jobs.start(request);
        }
        for request in app.take_history_requests() {
            history.start(request);
        }
        terminal.draw(|frame| {
            frame.render_widget(screens::AppView { app, theme }, frame.area());
        })?;
        if ct::poll(tick)? {
            // Drain everything queued so fast typing never lags behind the screen.
            loop {
                if let Some(event) = event::from_crossterm(&ct::read()?) {
                    app.handle_event(event);
                }
                if app.should_quit || !ct::poll(Duration::ZERO)? {
                    break;
                }
            }
        }
        while let Some(message) = jobs.try_recv() {
            app.on_job(message);
        }
        while let Some(reply) = history.try_recv() {
            app.on_history(reply);
        }
        if last_tick.elapsed() >= tick {
            app.on_tick();
            last_tick = std::time::Instant::now();
        }
    }
    Ok(())
}
