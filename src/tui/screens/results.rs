//! Results: summary figures, the pressure and tangential-stress plots with the roll's zones, the
//! ranked causes (Enter shows each reason: indicator, value, threshold) and the merged remedy
//! list with its groups and cautions.

use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Widget};

use super::plot::{Band, Drawn, Glyph, ReferenceLine, Series, ZonePlot, legend};
use super::{compact_length, compact_stress};
use crate::diagnose::Diagnosis;
use crate::model::Profile;
use crate::tui::component::{ANY, Action, Binding, Component, Handled, Screen};
use crate::tui::event::Key;
use crate::tui::job::SolveOutcome;
use crate::tui::session::Session;
use crate::tui::theme::Theme;
use crate::units::UnitSystem;

/// The results screen's keys.
#[rustfmt::skip]
pub const KEYS: &[Binding] = &[
    Binding::help("← →", "causes / remedies"),
    Binding::both(ANY, "↑↓", "move", "↑ ↓", "move"),
    Binding::line(ANY, "←→", "pane"),
    Binding::both(ANY, "Enter", "reasons/try", "Enter on a cause", "show its reasons: indicator, value, threshold"),
    Binding::help("Enter on a remedy", "try it on the What-if screen"),
    Binding::help("↓ past the last / PgUp PgDn End", "scroll on: what the answer rests on, the cautions"),
];

#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum ResultsFocus {
    #[default]
    Causes,
    Remedies,
}

#[derive(Debug, Clone, PartialEq, Default)]
pub struct ResultsScreen {
    pub focus: ResultsFocus,
    pub cause: usize,
    /// Cause IDs whose reasons are shown.
    pub expanded: std::collections::BTreeSet<String>,
    pub remedy: usize,
    /// Rows each pane is scrolled past what keeps its selection in view (↓ past the last item,
    /// PgDn, End): how the sections below the lists ("What the answer rests on", the last
    /// remedy's cautions) are reached in a small window.
    pub cause_past: u16,
    pub remedy_past: u16,
    /// How far past its selection each pane could scroll when last drawn (causes, remedies):
    /// keys clamp to it so ↑ answers at once after pressing ↓ or End too often. A cache of
    /// the last frame's layout, not state the screen depends on.
    pub reach: std::cell::Cell<(u16, u16)>,
}

impl ResultsScreen {
    /// A new baseline arrived: back to the top of both lists.
    pub fn on_new_baseline(&mut self) {
        self.cause = 0;
        self.remedy = 0;
        self.cause_past = 0;
        self.remedy_past = 0;
    }

    /// The focused pane's selection, item count, extra scroll and how far it can scroll.
    fn pane(&mut self, causes: usize, remedies: usize) -> (&mut usize, usize, &mut u16, u16) {
        let (cause_reach, remedy_reach) = self.reach.get();
        match self.focus {
            ResultsFocus::Causes => (&mut self.cause, causes, &mut self.cause_past, cause_reach),
            ResultsFocus::Remedies => (
                &mut self.remedy,
                remedies,
                &mut self.remedy_past,
                remedy_reach,
            ),
        }
    }

    /// ↑ ↓ PgUp PgDn Home End in the focused pane: ↓ on the last item scrolls on.
    fn scroll(&mut self, key: Key, causes: usize, remedies: usize) {
        let (selected, count, past, reach) = self.pane(causes, remedies);
        let last = count.saturating_sub(1);
        match key {
            Key::Up if *past > 0 => *past = (*past).min(reach).saturating_sub(1),
            Key::Up => *selected = selected.saturating_sub(1),
            Key::Down if *selected >= last => *past = past.saturating_add(1).min(reach),
            Key::Down => *selected += 1,
            Key::PageDown => *past = past.saturating_add(5).min(reach),
            Key::PageUp => *past = (*past).min(reach).saturating_sub(5),
            Key::End => {
                *selected = last;
                // The frame clamps it; ↑ clamps to the drawn reach first.
                *past = u16::MAX;
            }
            Key::Home => {
                *selected = 0;
                *past = 0;
            }
            _ => {}
        }
    }

    fn enter(&mut self, ctx: &mut Session) {
        let Some(diagnosis) = ctx.latest_diagnosis() else {
            return;
        };
        match self.focus {
            ResultsFocus::Causes => {
                if let Some(id) = diagnosis.causes.get(self.cause).map(|c| c.id.clone())
                    && !self.expanded.remove(&id)
                {
                    self.expanded.insert(id);
                }
            }
            ResultsFocus::Remedies => {
                let Some(id) = diagnosis.remedies.get(self.remedy).map(|r| r.id.clone()) else {
                    return;
                };
                if ctx.remedy_is_tryable(&id) {
                    ctx.push(Action::GoTo(Screen::WhatIf));
                    ctx.push(Action::TryRemedy(id));
                } else {
                    ctx.set_status(format!(
                        "{id}: not a winder setting change the what-if can try"
                    ));
                }
            }
        }
    }
}

impl Component for ResultsScreen {
    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        let (causes, remedies) = ctx
            .latest_diagnosis()
            .map_or((0, 0), |d| (d.causes.len(), d.remedies.len()));
        match key {
            Key::Left => self.focus = ResultsFocus::Causes,
            Key::Right => self.focus = ResultsFocus::Remedies,
            Key::Up | Key::Down | Key::PageUp | Key::PageDown | Key::Home | Key::End => {
                self.scroll(key, causes, remedies)
            }
            Key::Enter | Key::Char(' ') => self.enter(ctx),
            Key::Char('w') => ctx.push(Action::GoTo(Screen::WhatIf)),
            _ => return Handled::No,
        }
        Handled::Yes
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        let (state, app) = (self, ctx);
        let Some(outcome) = app.latest_outcome() else {
            let text = waiting_text(app).unwrap_or_default();
            super::wrapped(text, true)
                .block(Block::bordered().title(" Results "))
                .render(area, buf);
            return;
        };
        let plots_height = (area.height.saturating_sub(2) * 9 / 20).max(7);
        let [summary, plots, lists] = Layout::vertical([
            Constraint::Length(3),
            Constraint::Length(plots_height),
            Constraint::Min(3),
        ])
        .areas(area);
        let mut summary_lines = summary_lines(outcome, app.units, theme);
        summary_lines.push(assumed_line(outcome, theme, summary.width));
        if app.baseline_is_stale() {
            summary_lines.insert(
                0,
                Line::from(Span::styled(
                    "Out of date: inputs changed since this solve — ^R to solve again.",
                    theme.warn(),
                )),
            );
        }
        super::wrapped(summary_lines, true).render(summary, buf);
        render_plots(
            &outcome.profile,
            None,
            outcome.resolved.core.crush_pressure,
            app.units,
            theme,
            plots,
            buf,
        );

        let [causes, remedies] =
            Layout::horizontal([Constraint::Percentage(50), Constraint::Percentage(50)])
                .areas(lists);
        match &outcome.diagnosis {
            Ok(diagnosis) => {
                let cause_reach = render_causes(state, app, diagnosis, theme, causes, buf);
                let remedy_reach = render_remedies(state, diagnosis, theme, remedies, buf);
                state.reach.set((cause_reach, remedy_reach));
            }
            Err(error) => {
                super::wrapped(format!("No diagnosis: {error}"), true)
                    .block(Block::bordered().title(" Ranked causes "))
                    .render(lists, buf);
            }
        }
    }
}

/// What to draw when there is nothing to show yet (or the result is out of date).
pub fn waiting_text(app: &Session) -> Option<String> {
    if let Some(running) = app.running_baseline {
        return Some(format!(
            "Solving the wound-roll stresses… {:.0}% (the screen stays live; keep working)",
            running.fraction * 100.0
        ));
    }
    match &app.baseline {
        None => Some(match &app.resolved {
            Err(e) if !e.to_string().is_empty() => format!("Inputs are not complete yet: {e}"),
            _ => "No results yet: ^R solves the case.".into(),
        }),
        Some(b) => b.result.as_ref().err().map(|e| format!("No results: {e}")),
    }
}

pub fn summary_lines(
    outcome: &SolveOutcome,
    units: UnitSystem,
    theme: Theme,
) -> Vec<Line<'static>> {
    let s = &outcome.profile.summary;
    let crush = outcome.resolved.core.crush_pressure;
    // Without a crush rating there is no ratio: say so instead of printing "NaN×".
    let ratio = (crush > 0.0).then(|| s.core_pressure / crush);
    let ratio_style = if ratio.is_some_and(|r| r >= 1.0) {
        theme.error()
    } else {
        theme.plain()
    };
    let ratio_text = match ratio {
        Some(r) if r.is_finite() => format!("({r:.2}× crush rating)"),
        _ => "(no crush rating)".to_string(),
    };
    vec![
        Line::from(vec![
            Span::raw(format!(
                "Core pressure {} ",
                compact_stress(s.core_pressure, units)
            )),
            Span::styled(ratio_text, ratio_style),
            Span::raw(format!(
                " · peak {} at ⌀ {}",
                compact_stress(s.peak_pressure, units),
                compact_length(2.0 * s.peak_pressure_radius, units)
            )),
        ]),
        Line::from(format!(
            "Most compressive hoop stress {} at ⌀ {} · {} layers in {} elements",
            compact_stress(s.min_tangential_stress, units),
            compact_length(2.0 * s.min_tangential_radius, units),
            s.physical_layers,
            outcome.profile.solver.elements
        )),
    ]
}

/// How many assumed inputs the results screen names as moving the ranking most (the command
/// line's "What the answer rests on" shows as many).
pub const MOVERS_SHOWN: usize = crate::diagnose::render::SENSITIVITY_SHOWN;

/// "⚠ 13 of 20 inputs assumed (…): causes shown at 68 % of their belief" — how much of the
/// answer rests on defaults, and how the shown beliefs were lowered for it.
pub fn assumed_line(outcome: &SolveOutcome, theme: Theme, width: u16) -> Line<'static> {
    let share = crate::report::AssumedShare::of(&outcome.resolved);
    if share.assumed == 0 {
        return Line::from(Span::styled(
            format!("All {} inputs given in the case.", share.total),
            theme.dim(),
        ));
    }
    let mut text = format!(
        "⚠ {} of {} inputs assumed: beliefs shown at {:.0} % (F3 to enter them)",
        share.assumed,
        share.total,
        share.factor() * 100.0
    );
    // Name as many as fit on the line: those that move the ranking most when known, else the
    // assumed inputs in the order of the form.
    let movers = outcome.movers();
    let (labels, mut lead) = if movers.is_empty() {
        (
            share.labels.iter().map(String::as_str).collect::<Vec<_>>(),
            ": ",
        )
    } else {
        (movers.clone(), "; moves the ranking most: ")
    };
    let room = usize::from(width);
    // A narrow window keeps the first mover in view: the heading shortens, since F3 is on
    // the tab line anyway and the movers are what to enter first.
    if let Some(first) = movers.first()
        && text.chars().count() + lead.chars().count() + first.chars().count() > room
    {
        text = format!(
            "⚠ {}/{} assumed, at {:.0} %",
            share.assumed,
            share.total,
            share.factor() * 100.0
        );
        lead = "; moves it most: ";
    }
    let mut names = String::new();
    for (i, label) in labels.iter().enumerate() {
        let more = labels.len() - i - 1;
        let candidate = if names.is_empty() {
            format!("{lead}{label}")
        } else {
            format!("{names}, {label}")
        };
        let tail = if more > 0 {
            format!(" +{more}")
        } else {
            String::new()
        };
        if text.chars().count() + candidate.chars().count() + tail.chars().count() > room {
            if !names.is_empty() {
                names.push_str(&format!(" +{}", more + 1));
            }
            break;
        }
        names = candidate;
    }
    text.push_str(&names);
    Line::from(Span::styled(text, theme.warn()))
}

/// The two plots side by side; with `before`, the earlier profile is overlaid in bullets.
/// Returns where each plot put its labels and curves.
pub fn render_plots(
    profile: &Profile,
    before: Option<&Profile>,
    crush_pressure: f64,
    units: UnitSystem,
    theme: Theme,
    area: Rect,
    buf: &mut Buffer,
) -> [Drawn; 2] {
    let [left, right] =
        Layout::horizontal([Constraint::Percentage(50), Constraint::Percentage(50)]).areas(area);
    let bands: Vec<Band> = profile
        .zones
        .iter()
        .map(|z| Band {
            label: z.name.as_str().to_string(),
            from: 2.0 * z.inner_radius,
            to: 2.0 * z.outer_radius,
        })
        .collect();
    let format_y = |v: f64| compact_stress(v, units);
    let format_x = |v: f64| compact_length(v, units);
    let zero = ReferenceLine {
        y: 0.0,
        label: String::new(),
        glyph: '─',
        style: theme.dim(),
    };
    // Positions are diameters (what an operator measures): x = 2 r.
    let pairs = |xs: &[f64], ys: &[f64]| -> Vec<(f64, f64)> {
        xs.iter().map(|r| 2.0 * r).zip(ys.iter().copied()).collect()
    };
    let curves = |pick: fn(&Profile) -> &Vec<f64>| {
        let mut series = Vec::new();
        if let Some(before) = before {
            series.push(Series {
                points: pairs(&before.radius, pick(before)),
                glyph: Glyph::Bullet,
                style: theme.curve_before(),
            });
        }
        series.push(Series {
            points: pairs(&profile.radius, pick(profile)),
            glyph: Glyph::Braille,
            style: theme.curve(),
        });
        series
    };
    let legend_items: &[(&str, &str)] = if before.is_some() {
        &[("⣿", "after"), ("•", "before")]
    } else {
        &[]
    };
    let title = |name: &str| {
        let mut line = Line::from(format!(" {name} "));
        if !legend_items.is_empty() {
            line.spans.extend(legend(legend_items).spans);
            line.spans.push(Span::raw(" "));
        }
        line
    };
    let mut pressure_lines = vec![zero.clone()];
    if crush_pressure > 0.0 && crush_pressure.is_finite() {
        pressure_lines.push(ReferenceLine {
            y: crush_pressure,
            label: "crush rating".into(),
            glyph: '═',
            style: theme.limit_line(),
        });
    }
    let pressure = ZonePlot {
        block: Block::bordered().title(title("Interlayer pressure")),
        series: curves(|p| &p.pressure),
        bands: bands.clone(),
        lines: pressure_lines,
        format_y: &format_y,
        format_x: &format_x,
        band_style: theme.zone_label(),
        axis_style: theme.dim(),
    }
    .draw(left, buf);
    let hoop = ZonePlot {
        block: Block::bordered().title(title("Hoop stress σθ")),
        series: curves(|p| &p.tangential_stress),
        bands,
        lines: vec![zero],
        format_y: &format_y,
        format_x: &format_x,
        band_style: theme.zone_label(),
        axis_style: theme.dim(),
    }
    .draw(right, buf);
    [pressure, hoop]
}

fn belief_bar(belief: f64) -> String {
    let filled = (belief.clamp(0.0, 1.0) * 5.0).round() as usize;
    format!("{}{}", "■".repeat(filled), "□".repeat(5 - filled))
}

fn render_causes(
    state: &ResultsScreen,
    app: &Session,
    diagnosis: &Diagnosis,
    theme: Theme,
    area: Rect,
    buf: &mut Buffer,
) -> u16 {
    let focus = state.focus == ResultsFocus::Causes;
    let factor = app.latest_outcome().map_or(1.0, |o| {
        crate::report::AssumedShare::of(&o.resolved).factor()
    });
    let mut lines: Vec<Line> = Vec::new();
    let mut target = 0;
    if app.case.symptoms.is_empty() {
        lines.push(Line::from(
            "No symptoms picked: F2, then type what you see on the roll.",
        ));
    } else if diagnosis.causes.is_empty() {
        lines.push(Line::from(
            "No cause stands out for these symptoms and inputs.",
        ));
    }
    // Numbers right-aligned to the widest with a space after the marker, so "▸ 9." and
    // "▸10." never run together and the bars stay in one column.
    let number_width = diagnosis.causes.len().to_string().len() + 1;
    for (i, cause) in diagnosis.causes.iter().enumerate() {
        let selected = i == state.cause;
        if selected {
            target = lines.len();
        }
        let open = state.expanded.contains(&cause.id);
        let marker = if open { "▾" } else { "▸" };
        let style = if selected && focus {
            theme.selected()
        } else {
            theme.plain()
        };
        lines.push(Line::from(vec![
            Span::styled(
                format!(
                    "{marker}{:>number_width$}. {} {:>3.0}% ",
                    i + 1,
                    belief_bar(cause.belief * factor),
                    cause.belief * factor * 100.0
                ),
                style,
            ),
            Span::styled(cause.title.clone(), style),
        ]));
        if open {
            if !cause.mechanism.is_empty() {
                lines.push(Line::from(Span::styled(
                    format!("     {}", cause.mechanism),
                    theme.dim(),
                )));
            }
            for reason in &cause.reasons {
                lines.push(reason_line(reason, diagnosis, app.units, theme));
            }
        }
    }
    // Wrapped lines hang under their item: the cause title under the title, a reason under
    // its text.
    let width = usize::from(area.width.saturating_sub(2));
    let (mut hung, (hung_target, _)) = hang_lines(lines, width, (target, target), |line| {
        if line
            .spans
            .first()
            .is_some_and(|s| s.content.starts_with("   "))
        {
            8
        } else {
            // Under the title: marker, number, ". ", bar, " ", percentage.
            14 + number_width
        }
    });
    hung.extend(rests_on_lines(app, theme, width));
    super::render_scrolled_past(
        hung,
        (hung_target, hung_target),
        state.cause_past,
        Block::bordered().title(" Ranked causes "),
        area,
        buf,
    )
}

/// One reason under an opened cause: its signed weight, what was tested and the reason's text.
fn reason_line(
    reason: &crate::diagnose::Reason,
    diagnosis: &Diagnosis,
    units: UnitSystem,
    theme: Theme,
) -> Line<'static> {
    let sign = if reason.weight >= 0.0 { "+" } else { "−" };
    // What was tested, in the same words as the command line and the reports
    // (`words::reason_tested`): the indicator's title and value, or the question
    // and the answer in words. The prior and the site history have no test to
    // name: their text says it all. Measured evidence quotes the measurement in the
    // session's units.
    let mut shown = reason.clone();
    if let (Some(e), Some(value)) = (&diagnosis.evidence, &reason.value) {
        shown.value = Some(e.localise(value, units));
    }
    let tested = crate::diagnose::words::reason_tested(&shown);
    let plain = tested.is_none();
    let test = tested.unwrap_or_default();
    Line::from(vec![
        Span::styled(format!("   {sign}{:.2} ", reason.weight.abs()), theme.key()),
        Span::raw(test),
        Span::styled(
            if plain {
                reason.text.clone()
            } else {
                format!(" — {}", reason.text)
            },
            theme.dim(),
        ),
    ])
}

/// What the answer rests on (the job's sensitivity run, made when the case has assumed
/// inputs): below the causes, in the command line's words; nothing without one.
fn rests_on_lines(app: &Session, theme: Theme, width: usize) -> Vec<Line<'static>> {
    let rests_on = app
        .latest_outcome()
        .and_then(|o| o.sensitivity.as_ref())
        .map(|s| s.lines(MOVERS_SHOWN))
        .unwrap_or_default();
    let mut out = Vec::new();
    if !rests_on.is_empty() {
        out.push(Line::from(""));
        out.push(Line::from(Span::styled(
            "What the answer rests on",
            theme.title(),
        )));
        for line in rests_on {
            let line = Line::from(Span::styled(line, theme.dim()));
            out.extend(super::hang(line, width, 2));
        }
    }
    out
}

/// `lines` wrapped to `width`, each hanging at `indent(line)`, with where the selected item's
/// first and last line (`target`, indices into `lines`) begin and end among the wrapped lines.
fn hang_lines(
    lines: Vec<Line<'static>>,
    width: usize,
    target: (usize, usize),
    indent: impl Fn(&Line) -> usize,
) -> (Vec<Line<'static>>, (usize, usize)) {
    let mut hung: Vec<Line> = Vec::new();
    let (mut hung_target, mut hung_end) = (0, 0);
    for (i, line) in lines.into_iter().enumerate() {
        if i == target.0 {
            hung_target = hung.len();
        }
        let indent = indent(&line);
        hung.extend(super::hang(line, width, indent));
        if i == target.1.max(target.0) {
            hung_end = hung.len() - 1;
        }
    }
    (hung, (hung_target, hung_end))
}

/// Plain words for a remedy group ID (the one name the CLI and reports use too).
pub fn group_title(group: &str) -> String {
    crate::diagnose::group_title(group)
}

fn render_remedies(
    state: &ResultsScreen,
    diagnosis: &Diagnosis,
    theme: Theme,
    area: Rect,
    buf: &mut Buffer,
) -> u16 {
    let focus = state.focus == ResultsFocus::Remedies;
    let mut lines: Vec<Line> = Vec::new();
    let mut target = 0;
    let mut target_end = 0;
    if !diagnosis.cautions.is_empty() {
        // Always in view at the top of the pane; each remedy's own cautions follow it in full.
        lines.push(Line::from(Span::styled(
            "⚠ Follow site procedures, local codes and lockout/tagout before working on the winder.",
            theme.warn(),
        )));
    }
    for (i, remedy) in diagnosis.remedies.iter().enumerate() {
        if let Some(heading) = crate::diagnose::remedies::heading(&diagnosis.remedies, i) {
            lines.push(Line::from(Span::styled(heading, theme.title())));
        }
        let selected = i == state.remedy;
        if selected {
            target = lines.len();
        }
        let style = if selected && focus {
            theme.selected()
        } else {
            theme.plain()
        };
        lines.extend(remedy_lines(i, remedy, diagnosis, style, theme));
        if selected {
            target_end = lines.len() - 1;
        }
    }
    if diagnosis.remedies.is_empty() {
        lines.push(Line::from("No remedies listed."));
    }
    // Wrapped lines hang under their text: a remedy under its words (past "12. "), its
    // "for:", effect and caution lines under theirs.
    let width = usize::from(area.width.saturating_sub(2));
    let (hung, reach) = hang_lines(lines, width, (target, target_end), |line| {
        let first = line.spans.first().map_or("", |s| s.content.as_ref());
        if first.starts_with("    ⚠") {
            6
        } else if first.starts_with("    for: ") {
            9
        } else {
            4
        }
    });
    super::render_scrolled_past(
        hung,
        reach,
        state.remedy_past,
        Block::bordered().title(" Remedies, in the order to try "),
        area,
        buf,
    )
}

/// One remedy of the list (number `i`): its words, caution mark and cost, then the answers it
/// is for, its predicted effect and its cautions in full.
fn remedy_lines(
    i: usize,
    remedy: &crate::diagnose::MergedRemedy,
    diagnosis: &Diagnosis,
    style: ratatui::style::Style,
    theme: Theme,
) -> Vec<Line<'static>> {
    let caution = if remedy.cautions.is_empty() {
        ""
    } else {
        " ⚠"
    };
    let mut lines = vec![Line::from(vec![
        Span::styled(format!("{:>2}. {}", i + 1, remedy.text), style),
        Span::styled(caution.to_string(), theme.warn()),
        Span::styled(
            if remedy.cost.is_empty() {
                String::new()
            } else {
                format!(" [cost {}]", remedy.cost)
            },
            theme.dim(),
        ),
    ])];
    if !remedy.answers.is_empty() {
        lines.push(Line::from(Span::styled(
            format!("    for: {}", diagnosis.answers_text(remedy)),
            theme.dim(),
        )));
    }
    if let Some(what_if) = &remedy.what_if
        && !what_if.indicator.is_empty()
    {
        lines.push(Line::from(Span::styled(
            format!(
                "    {}: {} → {}{}",
                what_if.indicator_text(),
                what_if.before,
                what_if.after,
                if what_if.small_effect {
                    " (predicted to do little)"
                } else {
                    ""
                }
            ),
            if what_if.worse {
                theme.error()
            } else {
                theme.good()
            },
        )));
    }
    for caution in diagnosis.cautions_of(remedy) {
        lines.push(Line::from(vec![
            Span::styled(format!("    ⚠ {}: ", caution.title), theme.warn()),
            Span::raw(caution.text.clone()),
        ]));
    }
    lines
}
