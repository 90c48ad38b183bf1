//! Popups drawn over the screen: help, "unsaved changes", open a file, save as.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Clear, Paragraph, Widget, Wrap};

use super::{centred, help};
use crate::tui::app::{
    App, CalibratePrompt, OpenPurpose, PendingAction, Popup, WalkStage, WalkthroughRun,
};
use crate::tui::theme::Theme;

pub fn render(app: &App, popup: &Popup, theme: Theme, area: Rect, buf: &mut Buffer) {
    match popup {
        Popup::Help => {
            let mut lines = Vec::new();
            for (section, keys) in help::sections() {
                lines.push(Line::from(Span::styled(section, theme.title())));
                for (key, what) in keys {
                    lines.push(Line::from(vec![
                        Span::styled(format!("  {key:<24}"), theme.key()),
                        Span::raw(what),
                    ]));
                }
            }
            let rect = centred(area, 80, area.height.saturating_sub(2));
            let room = usize::from(rect.height.saturating_sub(2));
            let last_start = lines.len().saturating_sub(room) as u16;
            let scroll = app.help_scroll.min(last_start);
            let more = if scroll < last_start { " ↓ more" } else { "" };
            Clear.render(rect, buf);
            Paragraph::new(lines)
                .scroll((scroll, 0))
                .block(Block::bordered().title(format!(" Keys — ↑↓ scroll, Esc closes{more} ")))
                .render(rect, buf);
        }
        Popup::Confirm(action) => {
            let doing = match action {
                PendingAction::Quit => "quitting".to_string(),
                PendingAction::NewCase => "starting a blank case".to_string(),
                PendingAction::Open(path) => format!("opening {}", path.display()),
                PendingAction::Training(_) => "opening the walk-through".to_string(),
            };
            let lines = vec![
                Line::from(format!("The case has unsaved changes. Before {doing}:")),
                Line::from(""),
                Line::from(vec![
                    Span::styled("  s ", theme.key()),
                    Span::raw("save, then continue"),
                ]),
                Line::from(vec![
                    Span::styled("  d ", theme.key()),
                    Span::raw("discard the changes and continue"),
                ]),
                Line::from(vec![
                    Span::styled("  Esc ", theme.key()),
                    Span::raw("go back"),
                ]),
            ];
            let rect = centred(area, 60, 7);
            Clear.render(rect, buf);
            Paragraph::new(lines)
                .wrap(Wrap { trim: false })
                .block(Block::bordered().title(" Unsaved changes "))
                .render(rect, buf);
        }
        Popup::Open(prompt) => {
            let title = match prompt.purpose {
                OpenPurpose::WholeCase => " Open a case file ",
                OpenPurpose::InputsOnly => " Take the inputs from a case file (symptoms kept) ",
            };
            let mut lines = path_prompt("file: ", &prompt.input, prompt.error.as_deref(), theme);
            lines.push(Line::from(Span::styled(
                "found nearby (↑↓ then Enter):",
                theme.dim(),
            )));
            let rect = centred(area, 72, area.height.saturating_sub(4).min(16));
            let room = usize::from(rect.height.saturating_sub(2)).saturating_sub(lines.len());
            let first = prompt
                .selected
                .unwrap_or(0)
                .saturating_sub(room.saturating_sub(1));
            for (i, name) in prompt.suggestions.iter().enumerate().skip(first).take(room) {
                let style = if prompt.selected == Some(i) {
                    theme.selected()
                } else {
                    theme.plain()
                };
                lines.push(Line::from(Span::styled(format!("  {name}"), style)));
            }
            if prompt.suggestions.is_empty() {
                lines.push(Line::from(Span::styled(
                    "  (no .yaml files in ./cases or here)",
                    theme.dim(),
                )));
            }
            Clear.render(rect, buf);
            Paragraph::new(lines)
                .wrap(Wrap { trim: false })
                .block(Block::bordered().title(title))
                .render(rect, buf);
        }
        Popup::Export { input, error } => {
            let mut lines = path_prompt("file: ", input, error.as_deref(), theme);
            lines.push(Line::from(Span::styled(
                "Markdown (.md), HTML with plots (.html) or JSON (.json), by the file name.",
                theme.dim(),
            )));
            let rect = centred(area, 64, 6);
            Clear.render(rect, buf);
            Paragraph::new(lines)
                .wrap(Wrap { trim: false })
                .block(Block::bordered().title(" Export a report "))
                .render(rect, buf);
        }
        Popup::Training { selected } => {
            let rect = centred(area, 76, area.height.saturating_sub(4).min(18));
            let room = usize::from(rect.height.saturating_sub(2));
            let first = selected.saturating_sub(room.saturating_sub(1));
            let mut lines = Vec::new();
            for (i, loaded) in app.walkthroughs.iter().enumerate().skip(first).take(room) {
                let w = &loaded.walkthrough;
                let style = if i == *selected {
                    theme.selected()
                } else {
                    theme.plain()
                };
                let level = w.level.as_deref().unwrap_or("");
                lines.push(Line::from(Span::styled(
                    format!(" {} [{level}]", w.title),
                    style,
                )));
            }
            Clear.render(rect, buf);
            Paragraph::new(lines)
                .block(Block::bordered().title(" Training walk-throughs — Enter starts one "))
                .render(rect, buf);
        }
        Popup::Walkthrough(run) => walkthrough(run, theme, area, buf),
        Popup::Calibrate(prompt) => calibrate(app, prompt, theme, area, buf),
        Popup::Notice { title, text } => {
            let rect = centred(area, 70, area.height.saturating_sub(4).min(14));
            Clear.render(rect, buf);
            Paragraph::new(text.clone())
                .wrap(Wrap { trim: false })
                .block(Block::bordered().title(format!(" {title} ")))
                .render(rect, buf);
        }
        Popup::SaveAs { input, error } => {
            let mut lines = path_prompt("file: ", input, error.as_deref(), theme);
            lines.push(Line::from(Span::styled(
                format!(
                    "The case \"{}\" is written to a temporary file, then renamed.",
                    app.case.title
                ),
                theme.dim(),
            )));
            let rect = centred(area, 64, 6);
            Clear.render(rect, buf);
            Paragraph::new(lines)
                .wrap(Wrap { trim: false })
                .block(Block::bordered().title(" Save the case as "))
                .render(rect, buf);
        }
    }
}

/// Text as lines, one `Line` per line of text (so wrapping keeps the paragraphs).
/// The head of a popup that asks for a file path: the label, the text typed so far with a
/// cursor, and the last error (if any) under it.
fn path_prompt(
    label: &'static str,
    input: &str,
    error: Option<&str>,
    theme: Theme,
) -> Vec<Line<'static>> {
    let mut lines = vec![Line::from(vec![
        Span::styled(label, theme.key()),
        Span::raw(format!("{input}▏")),
    ])];
    if let Some(error) = error {
        lines.push(Line::from(Span::styled(error.to_string(), theme.error())));
    }
    lines
}

fn text_lines(text: &str) -> Vec<Line<'static>> {
    text.lines().map(|l| Line::from(l.to_string())).collect()
}

fn walkthrough(run: &WalkthroughRun, theme: Theme, area: Rect, buf: &mut Buffer) {
    let session = &run.session;
    let total = session.walkthrough.questions.len();
    let (stage, mut lines) = match &run.stage {
        WalkStage::Briefing => ("the story".to_string(), {
            let mut lines = text_lines(&session.briefing());
            lines.push(Line::from(""));
            lines.push(Line::from(Span::styled(
                format!("{total} questions follow. Enter starts."),
                theme.dim(),
            )));
            lines
        }),
        WalkStage::Question { index, highlighted } => {
            let mut lines = Vec::new();
            if let Some(q) = session.walkthrough.questions.get(*index) {
                lines.push(Line::from(Span::styled(
                    format!("{} — {}", q.topic.as_str(), q.prompt.trim()),
                    theme.title(),
                )));
                lines.push(Line::from(""));
                for (i, choice) in q.choices.iter().enumerate() {
                    let (marker, style) = if i == *highlighted {
                        ("▶", theme.selected())
                    } else {
                        (" ", theme.plain())
                    };
                    lines.push(Line::from(Span::styled(
                        format!("{marker} {}. {}", i + 1, choice.text.trim()),
                        style,
                    )));
                }
            }
            (format!("question {} of {total}", index + 1), lines)
        }
        WalkStage::Feedback { index, feedback } => {
            let mut lines = text_lines(&feedback.to_text());
            lines.push(Line::from(""));
            let next = if index + 1 < total {
                "Enter: next question"
            } else {
                "Enter: your score"
            };
            lines.push(Line::from(Span::styled(next, theme.dim())));
            (
                format!("answer to question {} of {total}", index + 1),
                lines,
            )
        }
        WalkStage::Done => ("score".to_string(), text_lines(&session.closing())),
    };
    let score = session.score();
    lines.insert(
        0,
        Line::from(Span::styled(
            format!("{} correct so far of {}", score.correct, score.total),
            theme.dim(),
        )),
    );
    let rect = centred(area, 78, area.height.saturating_sub(2));
    Clear.render(rect, buf);
    Paragraph::new(lines)
        .wrap(Wrap { trim: false })
        .scroll((run.scroll, 0))
        .block(Block::bordered().title(format!(
            " {} — {stage} · Esc leaves ",
            session.walkthrough.title
        )))
        .render(rect, buf);
}

fn calibrate(app: &App, prompt: &CalibratePrompt, theme: Theme, area: Rect, buf: &mut Buffer) {
    let stress = |pa: f64| super::compact_stress(pa, app.units);
    let mut lines = path_prompt("CSV file: ", &prompt.input, prompt.error.as_deref(), theme);
    match &prompt.fit {
        None => {
            lines.push(Line::from(Span::styled(
                "Pressure against strain or stack height, units in the header, e.g.",
                theme.dim(),
            )));
            lines.push(Line::from(Span::styled(
                "cases/calibration/harbour_news_45.csv. Enter fits P = K1·(e^(K2·ε) − 1).",
                theme.dim(),
            )));
        }
        Some(fitted) => {
            let fit = &fitted.fit;
            lines.push(Line::from(Span::styled(
                "Pfeiffer P = K1·(e^(K2·ε) − 1), relative weighting",
                theme.title(),
            )));
            // K1 with the command line's precision: it is written into the case.
            let precise = |pa: f64| {
                crate::units::format_quantity(pa, crate::units::QuantityKind::Stress, app.units)
            };
            lines.push(Line::from(format!(
                "  K1 = {} ± {}   (standard error)",
                precise(fit.k1),
                precise(fit.k1_standard_error)
            )));
            lines.push(Line::from(format!(
                "  K2 = {:.4} ± {:.4}",
                fit.k2, fit.k2_standard_error
            )));
            lines.push(Line::from(format!(
                "  R² = {:.5}   points = {}   measured up to {}",
                fit.r_squared,
                fit.points.len(),
                stress(fit.max_measured_pressure())
            )));
            for warning in &fitted.warnings {
                lines.push(Line::from(Span::styled(warning.clone(), theme.error())));
            }
            lines.push(Line::from(Span::styled(
                format!(
                    "Enter writes K1, K2 into the web radial stiffness of \"{}\" (unsaved).",
                    app.case.title
                ),
                theme.dim(),
            )));
        }
    }
    let rect = centred(area, 76, area.height.saturating_sub(4).min(16));
    Clear.render(rect, buf);
    Paragraph::new(lines)
        .wrap(Wrap { trim: false })
        .block(Block::bordered().title(" Calibrate: stack-compression test "))
        .render(rect, buf);
}
