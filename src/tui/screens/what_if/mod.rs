//! What-if: change one winder setting (or try a remedy that is one), re-solve in the background,
//! and compare: before/after curves overlaid, indicators side by side.
//!
//! `compare` puts the results side by side in words, `settings` writes changes into the case,
//! `view` draws the screen.

mod compare;
mod settings;
mod view;

use view::{render_choices, render_comparison};

pub use compare::{change_text, comparison, design_rows, design_summary};
pub use settings::{target_changes, written_in_units};

use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};

use super::sig3;
use crate::case::{QuantityText, TaperInput};
use crate::diagnose::rules::SettingChange;
use crate::diagnose::what_if::{
    Setting, SettingStep, apply_changes, describe_change, keep_changes, trial_case,
};
use crate::taper_design::{TaperDesign, TaperShape};
use crate::tui::component::{ANY, Binding, Component, Handled};
use crate::tui::event::Key;
use crate::tui::job::{JobError, Purpose, SolveOutcome, Task};
use crate::tui::session::Session;
use crate::tui::theme::Theme;

/// The description shown while a taper design runs.
pub(super) const DESIGNING: &str = "Designing a taper schedule (many solves)…";

/// The what-if screen's keys.
#[rustfmt::skip]
pub const KEYS: &[Binding] = &[
    Binding::both(ANY, "↑↓", "pick", "↑ ↓", "pick a setting or a remedy"),
    Binding::both(ANY, "←→", "step", "← →", "change the setting one step down / up"),
    Binding::both(ANY, "t", "set", "t", "type the value to try for the highlighted setting (Enter tries it, Esc cancels)"),
    Binding::help("Enter", "try the highlighted remedy"),
    Binding::help("PgUp / PgDn", "scroll the before → after table"),
    Binding::both(ANY, "d", "taper", "d", "design a taper that keeps the roll inside every limit"),
    Binding::both(ANY, "a", "keep", "a / r", "keep the change (or the designed taper) in the case / reset"),
];

#[derive(Debug, Clone, PartialEq, Default)]
pub struct WhatIfScreen {
    /// 0..5 = settings, 5.. = remedies that change a setting.
    pub row: usize,
    pub change: Option<SettingStep>,
    /// A remedy being tried instead (its changes come from the rule base).
    pub remedy: Option<String>,
    /// Plain words for the change ("Web tension 525 N/m → 578 N/m").
    pub description: Option<String>,
    pub outcome: Option<(u64, Box<SolveOutcome>)>,
    /// A designed taper schedule (what-if `d`), with the generation it was made for.
    pub design: Option<(u64, Box<TaperDesign>)>,
    pub error: Option<String>,
    /// A value being typed for the highlighted setting (`t`).
    pub typing: Option<String>,
    /// A typed value being tried: its setting changes and their words.
    pub target: Option<(Vec<SettingChange>, String)>,
    /// First row of the before → after table shown.
    pub scroll: u16,
}

/// Why a what-if cannot start: the inputs do not resolve.
pub(super) fn fix_inputs_first(ctx: &Session) -> Option<String> {
    ctx.resolved
        .as_ref()
        .err()
        .map(|e| format!("fix the inputs first: {e}"))
}

impl WhatIfScreen {
    /// The case was edited: the trial of the old case no longer applies.
    pub fn on_case_edited(&mut self) {
        self.outcome = None;
        self.change = None;
        self.description = None;
        self.target = None;
        self.scroll = 0;
        // A design made for the old case (or just kept into it) no longer compares with the
        // case as it stands.
        self.design = None;
    }

    /// A finished what-if solve.
    pub fn on_solved(&mut self, generation: u64, result: Result<Box<SolveOutcome>, JobError>) {
        match result {
            Ok(outcome) => {
                self.outcome = Some((generation, outcome));
                self.error = None;
            }
            Err(error) => {
                self.outcome = None;
                self.error = Some(error.to_string());
            }
        }
    }

    /// A finished taper design.
    pub fn on_designed(
        &mut self,
        generation: u64,
        result: Result<Box<TaperDesign>, JobError>,
        ctx: &Session,
    ) {
        match result {
            Ok(design) => {
                self.description = Some(design_summary(&design, ctx.units));
                self.design = Some((generation, design));
                self.error = None;
            }
            Err(error) => self.error = Some(error.to_string()),
        }
    }

    /// Ask for a taper schedule that keeps the roll inside every limit (`taper_design`).
    pub fn design_taper(&mut self, ctx: &mut Session) {
        let resolved = match &ctx.resolved {
            Ok(resolved) => resolved.clone(),
            Err(error) => {
                self.error = Some(format!("fix the inputs first: {error}"));
                return;
            }
        };
        self.clear(ctx);
        self.description = Some(DESIGNING.into());
        let case = ctx.case.clone();
        ctx.queue(Purpose::WhatIf, case, Some(resolved), Task::DesignTaper);
    }

    fn clear(&mut self, ctx: &mut Session) {
        *self = WhatIfScreen {
            row: self.row,
            ..WhatIfScreen::default()
        };
        ctx.running_what_if = None;
    }

    /// Apply `change` to a copy of the case and queue its solve.
    pub fn set_change(&mut self, change: SettingStep, ctx: &mut Session) {
        self.change = Some(change);
        self.remedy = None;
        self.target = None;
        if let Some(row) = Setting::ALL.iter().position(|s| *s == change.setting)
            && self.row < Setting::ALL.len()
        {
            self.row = row;
        }
        self.run(ctx);
    }

    /// Try a remedy's own setting changes (from the rule base) on the case.
    pub fn try_remedy(&mut self, remedy: &str, ctx: &mut Session) {
        self.change = None;
        self.target = None;
        self.remedy = Some(remedy.to_string());
        self.run(ctx);
    }

    /// Try the value typed for `setting` ("3 pli", "20 %", "900 fpm").
    pub fn try_value(&mut self, setting: Setting, text: &str, ctx: &mut Session) {
        let resolved = match &ctx.resolved {
            Ok(resolved) => resolved,
            Err(error) => {
                self.error = Some(format!("fix the inputs first: {error}"));
                return;
            }
        };
        match target_changes(setting, text, resolved) {
            Ok(changes) => {
                let words: Vec<String> = changes.iter().map(describe_change).collect();
                let description = format!("{}: {}", setting.label(), words.join(", "));
                self.change = None;
                self.remedy = None;
                self.target = Some((changes, description));
                self.run(ctx);
            }
            Err(error) => self.error = Some(error),
        }
    }

    /// Queue the solve of the change being tried (again, after ^R).
    pub fn run(&mut self, ctx: &mut Session) {
        self.scroll = 0;
        let trial = match (&self.remedy, self.change, &ctx.resolved) {
            (_, _, Err(_))
                if self.remedy.is_some() || self.change.is_some() || self.target.is_some() =>
            {
                Err(fix_inputs_first(ctx).unwrap_or_default())
            }
            (_, _, Ok(resolved)) if self.target.is_some() => {
                let (changes, description) = self.target.clone().unwrap_or_default();
                Ok((
                    ctx.case.clone(),
                    Some(apply_changes(resolved, &changes)),
                    description,
                ))
            }
            (Some(remedy), _, Ok(resolved)) => {
                let changes = ctx.remedy_changes.get(remedy).cloned().unwrap_or_default();
                let words: Vec<String> = changes.iter().map(describe_change).collect();
                Ok((
                    ctx.case.clone(),
                    Some(apply_changes(resolved, &changes)),
                    format!("{remedy}: {}", words.join(", ")),
                ))
            }
            (None, Some(change), Ok(resolved)) => {
                trial_case(&ctx.case, resolved, change, ctx.units)
                    .map(|(case, description)| (case, None, description))
                    .map_err(|e| e.to_string())
            }
            _ => return,
        };
        match trial {
            Ok((case, resolved, description)) => {
                self.description = Some(description);
                self.error = None;
                ctx.ensure_baseline();
                ctx.queue(Purpose::WhatIf, case, resolved, Task::Solve);
            }
            Err(error) => {
                self.description = None;
                self.error = Some(error);
                self.outcome = None;
            }
        }
    }

    /// Keep the what-if change: it becomes part of the case.
    fn adopt(&mut self, ctx: &mut Session) {
        if let Some((_, design)) = self.design.clone() {
            if design.steps.is_some() {
                ctx.set_status("A stepped schedule: enter its steps in the case file");
                return;
            }
            let kind = match design.shape {
                TaperShape::Linear => "linear",
                TaperShape::Hyperbolic => "hyperbolic",
            };
            ctx.case.winding.tension = Some(QuantityText::Text(crate::units::format_quantity(
                design.start_tension,
                crate::units::QuantityKind::ForcePerWidth,
                ctx.units,
            )));
            ctx.case.winding.taper = Some(TaperInput {
                kind: kind.into(),
                amount: Some(QuantityText::Text(format!(
                    "{} %",
                    sig3(design.taper_fraction * 100.0)
                ))),
                steps: Vec::new(),
                points: Vec::new(),
            });
            ctx.edited();
            // The design is in the case now: its table compared with the old case.
            self.design = None;
            self.description = None;
            ctx.set_status("Kept the designed taper schedule");
            return;
        }
        if let (Some((changes, description)), Ok(resolved)) = (&self.target, &ctx.resolved) {
            match keep_changes(&ctx.case, resolved, changes) {
                Ok(mut case) => {
                    let description = description.clone();
                    written_in_units(&ctx.case, &mut case, ctx.units);
                    ctx.case = case;
                    ctx.edited();
                    ctx.set_status(format!("Kept: {description}"));
                }
                Err(error) => ctx.set_status(error.to_string()),
            }
            return;
        }
        let kept = match (&self.remedy, self.change, &ctx.resolved) {
            (None, None, _) => {
                ctx.set_status("No change to keep; use ←/→ on a setting first");
                return;
            }
            (_, _, Err(_)) => Err(fix_inputs_first(ctx).unwrap_or_default()),
            (Some(remedy), _, Ok(resolved)) => {
                let changes = ctx.remedy_changes.get(remedy).cloned().unwrap_or_default();
                keep_changes(&ctx.case, resolved, &changes)
                    .map(|case| (case, remedy.clone()))
                    .map_err(|e| e.to_string())
            }
            (None, Some(change), Ok(resolved)) => {
                trial_case(&ctx.case, resolved, change, ctx.units).map_err(|e| e.to_string())
            }
        };
        match kept {
            Ok((mut case, description)) => {
                written_in_units(&ctx.case, &mut case, ctx.units);
                ctx.case = case;
                ctx.edited();
                ctx.set_status(format!("Kept: {description}"));
            }
            Err(error) => ctx.set_status(error),
        }
    }
}

impl Component for WhatIfScreen {
    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn is_typing(&self) -> bool {
        self.typing.is_some()
    }

    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        if let Some(text) = self.typing.as_mut() {
            match key {
                Key::Char(c) => text.push(c),
                Key::Backspace => {
                    text.pop();
                }
                Key::Esc => self.typing = None,
                Key::Enter => {
                    let text = self.typing.take().unwrap_or_default();
                    if let Some(setting) = Setting::ALL.get(self.row).copied() {
                        self.try_value(setting, &text, ctx);
                    }
                }
                _ => return Handled::No,
            }
            return Handled::Yes;
        }
        let rows = Setting::ALL.len() + ctx.what_if_remedies().len();
        match key {
            Key::Char('t') if self.row < Setting::ALL.len() => {
                self.typing = Some(String::new());
                self.error = None;
            }
            Key::PageDown => self.scroll = self.scroll.saturating_add(5),
            Key::PageUp => self.scroll = self.scroll.saturating_sub(5),
            Key::Up => self.row = self.row.saturating_sub(1),
            Key::Down => self.row = (self.row + 1).min(rows - 1),
            Key::Left | Key::Right => {
                if let Some(setting) = Setting::ALL.get(self.row).copied() {
                    let delta = if key == Key::Right { 1 } else { -1 };
                    let steps = match self.change {
                        Some(c) if c.setting == setting => c.steps + delta,
                        _ => delta,
                    };
                    if steps == 0 {
                        self.clear(ctx);
                    } else {
                        self.set_change(SettingStep { setting, steps }, ctx);
                    }
                }
            }
            Key::Enter if self.row >= Setting::ALL.len() => {
                let remedies = ctx.what_if_remedies();
                if let Some((id, _)) = remedies.get(self.row - Setting::ALL.len()) {
                    self.try_remedy(id, ctx);
                }
            }
            Key::Char('r') | Key::Esc => self.clear(ctx),
            Key::Char('d') => self.design_taper(ctx),
            Key::Char('a') => self.adopt(ctx),
            _ => return Handled::No,
        }
        Handled::Yes
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        let (state, app) = (self, ctx);
        let top_height = (area.height / 2).max(8).min(area.height);
        let [top, plots] =
            Layout::vertical([Constraint::Length(top_height), Constraint::Min(0)]).areas(area);
        let left_width = if area.width >= 110 { 40 } else { 30 };
        let [choices, compare] =
            Layout::horizontal([Constraint::Length(left_width), Constraint::Min(10)]).areas(top);
        render_choices(state, app, theme, choices, buf);
        render_comparison(state, app, theme, compare, plots, buf);
    }
}
