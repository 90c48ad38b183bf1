//! What-if: change one winder setting (or try a remedy that is one), re-solve in the background,
//! and compare: before/after curves overlaid, indicators side by side.

use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Paragraph, Widget, Wrap};

use super::results::render_plots;
use super::{compact_stress, sig3};
use crate::case::{QuantityText, TaperInput};
use crate::diagnose::what_if::{
    Setting, SettingStep, apply_changes, describe_change, keep_changes, trial_case,
};
use crate::taper_design::{TaperDesign, TaperShape};
use crate::tui::component::{ANY, Binding, Component, Handled};
use crate::tui::event::Key;
use crate::tui::job::{JobError, Purpose, SolveOutcome, Task};
use crate::tui::session::Session;
use crate::tui::theme::Theme;
use crate::units::UnitSystem;

fn format_value(value: f64, unit: &str, units: UnitSystem) -> String {
    if unit == "Pa" {
        compact_stress(value, units)
    } else if unit.is_empty() || unit == "1" {
        sig3(value)
    } else {
        format!("{} {unit}", sig3(value))
    }
}

/// Rows of (what, before, after, change) comparing two outcomes, biggest relative change first
/// after the three summary figures.
pub fn comparison(
    before: &SolveOutcome,
    after: &SolveOutcome,
    units: UnitSystem,
) -> Vec<[String; 4]> {
    let change = |b: f64, a: f64| {
        if b.abs() > f64::EPSILON {
            format!("{:+.0}%", (a - b) / b.abs() * 100.0)
        } else if a.abs() > f64::EPSILON {
            "new".to_string()
        } else {
            "0%".to_string()
        }
    };
    let (sb, sa) = (&before.profile.summary, &after.profile.summary);
    let mut rows = vec![
        [
            "core pressure".into(),
            compact_stress(sb.core_pressure, units),
            compact_stress(sa.core_pressure, units),
            change(sb.core_pressure, sa.core_pressure),
        ],
        [
            "peak pressure".into(),
            compact_stress(sb.peak_pressure, units),
            compact_stress(sa.peak_pressure, units),
            change(sb.peak_pressure, sa.peak_pressure),
        ],
        [
            "lowest σθ".into(),
            compact_stress(sb.min_tangential_stress, units),
            compact_stress(sa.min_tangential_stress, units),
            change(sb.min_tangential_stress, sa.min_tangential_stress),
        ],
    ];
    if let (Ok(db), Ok(da)) = (&before.diagnosis, &after.diagnosis) {
        let mut indicator_rows: Vec<(f64, [String; 4])> = Vec::new();
        for b in &db.indicators {
            if let Some(a) = da
                .indicators
                .iter()
                .find(|a| a.id == b.id && a.zone == b.zone)
            {
                let relative = if b.value.abs() > f64::EPSILON {
                    ((a.value - b.value) / b.value).abs()
                } else {
                    a.value.abs()
                };
                let name = match &b.zone {
                    Some(zone) => format!("{} [{zone}]", b.id),
                    None => b.id.clone(),
                };
                indicator_rows.push((
                    relative,
                    [
                        name,
                        format_value(b.value, &b.unit, units),
                        format_value(a.value, &a.unit, units),
                        change(b.value, a.value),
                    ],
                ));
            }
        }
        indicator_rows.sort_by(|x, y| y.0.total_cmp(&x.0));
        rows.extend(indicator_rows.into_iter().map(|(_, row)| row));
        // Beliefs first (only those that moved), then indicators by size of change.
        let mut belief_rows = Vec::new();
        for cause in db.causes.iter().take(5) {
            let after_belief = da
                .causes
                .iter()
                .find(|c| c.id == cause.id)
                .map_or(0.0, |c| c.belief);
            if ((after_belief - cause.belief) * 100.0).abs() >= 0.5 {
                belief_rows.push([
                    format!("belief {}", cause.id),
                    format!("{:.0}%", cause.belief * 100.0),
                    format!("{:.0}%", after_belief * 100.0),
                    format!("{:+.0} pts", (after_belief - cause.belief) * 100.0),
                ]);
            }
        }
        let indicators = rows.split_off(3);
        rows.extend(belief_rows);
        rows.extend(indicators);
    }
    rows
}

/// Rows of (limit, before, after, allowed) for a taper design, then its explanation.
pub fn design_rows(
    design: &crate::taper_design::TaperDesign,
    units: UnitSystem,
) -> Vec<[String; 4]> {
    use crate::taper_design::Limit;
    let show = |limit: Limit, v: f64| match limit {
        Limit::CorePressure => compact_stress(v, units),
        Limit::Telescoping => format!("{v:.2}"),
        Limit::Starring => format!("{:.1}%", v * 100.0),
        Limit::WoundInTension => {
            crate::units::format_quantity(v, crate::units::QuantityKind::ForcePerWidth, units)
        }
    };
    let mut rows = Vec::new();
    for after in &design.after.checks {
        let before = design.before.check(after.limit).map(|c| c.value);
        let bound = if after.limit == Limit::Telescoping {
            "≥"
        } else {
            "≤"
        };
        rows.push([
            format!(
                "{} {}",
                if after.met { "✓" } else { "✗" },
                after.limit.title()
            ),
            before.map_or("—".into(), |v| show(after.limit, v)),
            show(after.limit, after.value),
            format!("{bound}{}", show(after.limit, after.allowed)),
        ]);
    }
    for sentence in design.explanation.iter().take(4) {
        rows.push([
            sentence.clone(),
            String::new(),
            String::new(),
            String::new(),
        ]);
    }
    rows
}

/// The what-if screen's keys.
#[rustfmt::skip]
pub const KEYS: &[Binding] = &[
    Binding::both(ANY, "↑↓", "pick", "↑ ↓", "pick a setting or a remedy"),
    Binding::both(ANY, "←→", "change", "← →", "change the setting one step down / up"),
    Binding::help("Enter", "try the highlighted remedy"),
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
}

/// Why a what-if cannot start: the inputs do not resolve.
fn fix_inputs_first(ctx: &Session) -> Option<String> {
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
        self.description = Some("Designing a taper schedule (many solves)…".into());
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
        self.remedy = Some(remedy.to_string());
        self.run(ctx);
    }

    /// Queue the solve of the change being tried (again, after ^R).
    pub fn run(&mut self, ctx: &mut Session) {
        let trial = match (&self.remedy, self.change, &ctx.resolved) {
            (_, _, Err(_)) if self.remedy.is_some() || self.change.is_some() => {
                Err(fix_inputs_first(ctx).unwrap_or_default())
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
            ctx.case.winding.tension = Some(QuantityText::Number(design.start_tension));
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
            ctx.set_status("Kept the designed taper schedule");
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
            Ok((case, description)) => {
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

    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        let rows = Setting::ALL.len() + ctx.what_if_remedies().len();
        match key {
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

/// One line about a taper design: the schedule, and whether it meets every limit.
pub fn design_summary(design: &TaperDesign, units: UnitSystem) -> String {
    let shape = match design.shape {
        TaperShape::Linear => "linear",
        TaperShape::Hyperbolic => "hyperbolic",
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
        sig3(design.taper_fraction * 100.0)
    )
}

/// Settings, then remedies that are one setting change.
fn render_choices(state: &WhatIfScreen, app: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
    let mut lines = Vec::new();
    for (row, setting) in Setting::ALL.iter().enumerate() {
        let steps = state
            .change
            .filter(|c| c.setting == *setting)
            .map_or(0, |c| c.steps);
        let style = if row == state.row {
            theme.selected()
        } else {
            theme.plain()
        };
        let shown = if steps == 0 {
            "as is".to_string()
        } else {
            format!("{steps:+} step")
        };
        lines.push(Line::from(vec![
            Span::styled(format!("‹ {:<12} › ", setting.label()), style),
            Span::styled(shown, if steps == 0 { theme.dim() } else { theme.key() }),
        ]));
    }
    let remedies = app.what_if_remedies();
    if !remedies.is_empty() {
        lines.push(Line::from(Span::styled(
            "Try a remedy (Enter):",
            theme.title(),
        )));
    }
    for (i, (id, text)) in remedies.iter().enumerate() {
        let row = Setting::ALL.len() + i;
        let style = if row == state.row {
            theme.selected()
        } else {
            theme.plain()
        };
        let mark = if state.remedy.as_deref() == Some(id) {
            "▶"
        } else {
            "•"
        };
        lines.push(Line::from(Span::styled(format!("{mark} {text}"), style)));
    }
    let step_help = Setting::ALL
        .get(state.row)
        .map(|s| s.step_text())
        .unwrap_or("Enter applies the remedy's setting change");
    lines.push(Line::from(Span::styled(step_help, theme.dim())));
    Paragraph::new(lines)
        .wrap(Wrap { trim: true })
        .block(Block::bordered().title(" Change one setting "))
        .render(area, buf);
}

/// The before/after table and the plots (after over before).
fn render_comparison(
    state: &WhatIfScreen,
    app: &Session,
    theme: Theme,
    compare: Rect,
    plots: Rect,
    buf: &mut Buffer,
) {
    let before = app.current_outcome();
    let after = state.outcome.as_ref().map(|(_, o)| o.as_ref());
    let mut text: Vec<Line> = Vec::new();
    match &state.description {
        Some(description) => {
            text.push(Line::from(Span::styled(description.clone(), theme.title())))
        }
        None => text.push(Line::from("Pick a setting with ↑↓ and change it with ←→.")),
    }
    if let Some(error) = &state.error {
        text.push(Line::from(Span::styled(error.clone(), theme.error())));
    }
    if let Some(running) = app.running_what_if {
        text.push(Line::from(format!(
            "re-solving… {:.0}%",
            running.fraction * 100.0
        )));
    } else if before.is_none() && state.change.is_some() {
        text.push(Line::from("waiting for the case's own solve…"));
    }
    let design = state.design.as_ref().map(|(_, d)| d.as_ref());
    let rows = match (before, after, design) {
        (Some(before), Some(after), _) => Some(comparison(before, after, app.units)),
        (_, None, Some(design)) => Some(design_rows(design, app.units)),
        _ => None,
    };
    if let Some(rows) = rows {
        let last_header = if design.is_some() && after.is_none() {
            "allowed"
        } else {
            "change"
        };
        let width = usize::from(compare.width.saturating_sub(2));
        let name_width = width.saturating_sub(28).clamp(10, 48);
        text.push(Line::from(Span::styled(
            format!(
                "{:<name_width$} {:>9} {:>9} {:>7}",
                "", "before", "after", last_header
            ),
            theme.dim(),
        )));
        for [name, b, a, c] in rows {
            if b.is_empty() && a.is_empty() && c.is_empty() {
                text.push(Line::from(Span::styled(name, theme.dim())));
                continue;
            }
            let name: String = if name.chars().count() > name_width {
                let mut short: String = name.chars().take(name_width - 1).collect();
                short.push('…');
                short
            } else {
                name
            };
            text.push(Line::from(format!(
                "{name:<name_width$} {b:>9} {a:>9} {c:>7}"
            )));
        }
    }
    Paragraph::new(text)
        .wrap(Wrap { trim: false })
        .block(Block::bordered().title(" Before → after  (a keeps the change, r resets) "))
        .render(compare, buf);

    if let (None, Some(design)) = (after, design) {
        render_plots(
            &design.after.profile,
            Some(&design.before.profile),
            before.map_or(f64::NAN, |b| b.resolved.core.crush_pressure),
            app.units,
            theme,
            plots,
            buf,
        );
        return;
    }
    match (before, after) {
        (Some(before), Some(after)) => render_plots(
            &after.profile,
            Some(&before.profile),
            after.resolved.core.crush_pressure,
            app.units,
            theme,
            plots,
            buf,
        ),
        (Some(before), None) => render_plots(
            &before.profile,
            None,
            before.resolved.core.crush_pressure,
            app.units,
            theme,
            plots,
            buf,
        ),
        _ => {
            let text = super::results::waiting_text(app).unwrap_or_default();
            Paragraph::new(text)
                .wrap(Wrap { trim: true })
                .block(Block::bordered())
                .render(plots, buf);
        }
    }
}
