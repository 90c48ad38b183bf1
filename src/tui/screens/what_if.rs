//! What-if: change one winder setting (or try a remedy that is one), re-solve in the background,
//! and compare: before/after curves overlaid, indicators side by side.

use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Widget};

use super::results::render_plots;
use super::{compact_stress, sig3};
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
use crate::units::UnitSystem;

/// An indicator's value in the user's units where it has one ("1.2 pli", "116 %").
fn format_value(id: &str, value: f64, unit: &str, units: UnitSystem) -> String {
    use crate::diagnose::indicators::{Dimension, format_value as by_dimension, indicator_spec};
    use crate::units::{QuantityKind, format_quantity};
    match indicator_spec(id).map(|s| s.dimension) {
        _ if unit == "Pa" => compact_stress(value, units),
        Some(Dimension::ForcePerWidth) => {
            format_quantity(value, QuantityKind::ForcePerWidth, units)
        }
        Some(Dimension::Speed) => format_quantity(value, QuantityKind::Speed, units),
        Some(Dimension::Length) => format_quantity(value, QuantityKind::Length, units),
        Some(dimension) => by_dimension(value, dimension),
        None if unit.is_empty() || unit == "1" => sig3(value),
        None => format!("{} {unit}", sig3(value)),
    }
}

/// How much a value moved, in words a person reads at a glance: "same", "×140" for a big
/// factor, "+12 %" otherwise, "new" from zero. Never "+13950 %" or "−0 %".
pub fn change_text(before: f64, after: f64) -> String {
    let scale = before.abs().max(after.abs());
    if scale <= f64::EPSILON || (after - before).abs() <= 0.005 * scale {
        return "same".into();
    }
    if before.abs() <= f64::EPSILON {
        return "new".into();
    }
    let ratio = after / before;
    if ratio >= 10.0 || (ratio > 0.0 && ratio <= 0.1) {
        return format!("×{}", sig3(ratio));
    }
    let percent = (after - before) / before.abs() * 100.0;
    if percent.abs() < 0.5 {
        "same".into()
    } else {
        format!("{percent:+.0} %")
    }
}

/// Rows of (what, before, after, change) comparing two outcomes, biggest relative change first
/// after the three summary figures.
pub fn comparison(
    before: &SolveOutcome,
    after: &SolveOutcome,
    units: UnitSystem,
) -> Vec<[String; 4]> {
    let change = change_text;
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
            "most compressive hoop stress".into(),
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
                let name = crate::diagnose::words::indicator_label(&b.id, b.zone.as_deref());
                indicator_rows.push((
                    relative,
                    [
                        name,
                        format_value(&b.id, b.value, &b.unit, units),
                        format_value(&a.id, a.value, &a.unit, units),
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
                    crate::diagnose::words::belief_label(&cause.title),
                    format!("{:.0} %", cause.belief * 100.0),
                    format!("{:.0} %", after_belief * 100.0),
                    format!("{:+.0} points", (after_belief - cause.belief) * 100.0),
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

/// The description shown while a taper design runs.
const DESIGNING: &str = "Designing a taper schedule (many solves)…";

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

/// A kept change reaches the case file as a bare SI number: write each changed setting as a
/// text in the user's units instead ("1.755 pli", not 307.2628794874298).
pub fn written_in_units(
    before: &crate::case::Case,
    after: &mut crate::case::Case,
    units: UnitSystem,
) {
    use crate::units::{QuantityKind, format_quantity};
    let text = |old: &Option<QuantityText>, new: &mut Option<QuantityText>, kind| {
        if let Some(QuantityText::Number(value)) = *new
            && old != new
        {
            *new = Some(QuantityText::Text(format_quantity(value, kind, units)));
        }
    };
    text(
        &before.winding.tension,
        &mut after.winding.tension,
        QuantityKind::ForcePerWidth,
    );
    text(
        &before.winding.nip_load,
        &mut after.winding.nip_load,
        QuantityKind::ForcePerWidth,
    );
    text(
        &before.winding.speed,
        &mut after.winding.speed,
        QuantityKind::Speed,
    );
    text(
        &before.core.stiffness,
        &mut after.core.stiffness,
        QuantityKind::Stress,
    );
    text(
        &before.core.crush_pressure,
        &mut after.core.crush_pressure,
        QuantityKind::Stress,
    );
}

/// The setting changes that bring `setting` to the typed value `text` (in any accepted unit).
pub fn target_changes(
    setting: Setting,
    text: &str,
    resolved: &crate::case::ResolvedCase,
) -> Result<Vec<SettingChange>, String> {
    use crate::units::{QuantityKind, parse_quantity};
    let parse = |kind| parse_quantity(setting.label(), text, kind).map_err(|e| e.to_string());
    let positive = |value: f64| {
        if value.is_finite() && value > 0.0 {
            Ok(value)
        } else {
            Err(format!("{}: give a value above zero", setting.label()))
        }
    };
    let change = match setting {
        Setting::Tension => {
            let value = positive(parse(QuantityKind::ForcePerWidth)?)?;
            SettingChange::TensionScale(value / resolved.winding.tension.start_tension)
        }
        Setting::Taper => {
            let mut value = parse(QuantityKind::Percent)?;
            // "20" means 20 %, as the screen shows taper in percent.
            if !text.contains('%') && value > 1.0 {
                value /= 100.0;
            }
            if !(0.0..=0.9).contains(&value) {
                return Err("Taper: give 0 to 90 %".into());
            }
            SettingChange::TaperTo(value * 100.0)
        }
        Setting::NipLoad => {
            let value = positive(parse(QuantityKind::ForcePerWidth)?)?;
            match resolved.winding.nip_load {
                Some(before) if before > 0.0 => SettingChange::NipScale(value / before),
                _ => {
                    return Err(
                        "Nip load: this case has no nip; set one on the Roll & winding screen                          or use → from none"
                            .into(),
                    );
                }
            }
        }
        Setting::Core => {
            let value = positive(parse(QuantityKind::Stress)?)?;
            let before = resolved.core.stiffness.effective_stiffness();
            if !before.is_finite() || before <= 0.0 {
                return Err("Core: the core is rigid; a typed stiffness changes nothing".into());
            }
            SettingChange::CoreStiffnessScale(value / before)
        }
        Setting::Speed => {
            let value = positive(parse(QuantityKind::Speed)?)?;
            SettingChange::SpeedScale(value / resolved.winding.speed)
        }
    };
    Ok(vec![change])
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
    if let (Some(text), Some(setting)) = (&state.typing, Setting::ALL.get(state.row)) {
        lines.push(Line::from(vec![
            Span::styled(format!("{}: ", setting.label()), theme.title()),
            Span::styled(format!("{text}▏"), theme.key()),
        ]));
        lines.push(Line::from(Span::styled(
            "type a value with its unit, Enter tries it, Esc cancels",
            theme.dim(),
        )));
    } else {
        let step_help = Setting::ALL
            .get(state.row)
            .map(|s| s.step_text())
            .unwrap_or("Enter applies the remedy's setting change");
        lines.push(Line::from(Span::styled(step_help, theme.dim())));
    }
    super::wrapped(lines, true)
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
        let frame = super::SPINNER[(app.tick as usize) % super::SPINNER.len()];
        if state.design.is_none() && state.description.as_deref() == Some(DESIGNING) {
            // The design reports no fraction: the spinner shows it is working.
            text.push(Line::from(format!(
                "{frame} designing… many solves; keys still work"
            )));
        } else {
            text.push(Line::from(format!(
                "{frame} re-solving… {:.0} %",
                running.fraction * 100.0
            )));
        }
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
        let name_width = width.saturating_sub(33).clamp(10, 48);
        text.push(Line::from(Span::styled(
            format!(
                "{:<name_width$} {:>10} {:>10} {:>10}",
                "", "before", "after", last_header
            ),
            theme.dim(),
        )));
        for [name, b, a, c] in rows {
            if b.is_empty() && a.is_empty() && c.is_empty() {
                text.push(Line::from(Span::styled(name, theme.dim())));
                continue;
            }
            // A name too long for its column gets a line of its own: words, never cut.
            let name = if name.chars().count() > name_width {
                text.push(Line::from(name));
                String::new()
            } else {
                name
            };
            text.push(Line::from(format!(
                "{name:<name_width$} {b:>10} {a:>10} {c:>10}"
            )));
        }
    }
    // Keep the last rows reachable but never scroll past them.
    let visible = usize::from(compare.height.saturating_sub(2));
    let most = u16::try_from(text.len().saturating_sub(visible)).unwrap_or(u16::MAX);
    let scroll = state.scroll.min(most);
    let title = if most > 0 {
        " Before → after  (PgUp/PgDn: more) "
    } else {
        " Before → after  (a keeps the change, r resets) "
    };
    super::wrapped(text, false)
        .scroll((scroll, 0))
        .block(Block::bordered().title(title))
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
        (Some(before), Some(after)) => {
            render_plots(
                &after.profile,
                Some(&before.profile),
                after.resolved.core.crush_pressure,
                app.units,
                theme,
                plots,
                buf,
            );
        }
        (Some(before), None) => {
            render_plots(
                &before.profile,
                None,
                before.resolved.core.crush_pressure,
                app.units,
                theme,
                plots,
                buf,
            );
        }
        _ => {
            let text = super::results::waiting_text(app).unwrap_or_default();
            super::wrapped(text, true)
                .block(Block::bordered())
                .render(plots, buf);
        }
    }
}
