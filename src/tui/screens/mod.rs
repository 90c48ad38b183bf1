//! Rendering: the frame around every screen (tabs, status, help line), one file per screen, the
//! popups, and the shared plot widget. Everything draws from `&App`; nothing here changes state.

pub mod help;
pub mod inputs;
pub mod plot;
pub mod popups;
pub mod results;
pub mod symptoms;
pub mod what_if;

use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Paragraph, Widget, Wrap};

use super::app::{App, Screen, tab_labels};
use super::theme::Theme;
use crate::units::UnitSystem;

/// The whole UI drawn for one frame.
pub struct AppView<'a> {
    pub app: &'a App,
    pub theme: Theme,
}

impl Widget for &App {
    fn render(self, area: Rect, buf: &mut Buffer) {
        AppView {
            app: self,
            theme: Theme::from_env(),
        }
        .render(area, buf);
    }
}

const SPINNER: [char; 8] = ['⠁', '⠂', '⠄', '⡀', '⢀', '⠠', '⠐', '⠈'];

impl Widget for AppView<'_> {
    fn render(self, area: Rect, buf: &mut Buffer) {
        let app = self.app;
        let theme = self.theme;
        let [header, body, status, help_line] = Layout::vertical([
            Constraint::Length(1),
            Constraint::Min(0),
            Constraint::Length(1),
            Constraint::Length(1),
        ])
        .areas(area);

        // Tabs on the left, the case name and solver state on the right.
        let mut spans = Vec::new();
        for (label, screen) in tab_labels().into_iter().zip(Screen::ALL) {
            let style = if screen == app.screen {
                theme.selected()
            } else {
                theme.plain()
            };
            spans.push(Span::styled(label, style));
            spans.push(Span::raw(" "));
        }
        Paragraph::new(Line::from(spans)).render(header, buf);
        let mut right = String::new();
        if let Some(running) = app.running_baseline.or(app.running_what_if) {
            let frame = SPINNER[(app.tick as usize) % SPINNER.len()];
            right.push_str(&format!(
                "{frame} solving{:>4.0}%  ",
                running.fraction * 100.0
            ));
        }
        let name = app
            .case_path
            .as_ref()
            .and_then(|p| p.file_name())
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_else(|| "new case".into());
        right.push_str(&name);
        if app.dirty {
            right.push_str(" *changed");
        }
        let tabs_width: usize = tab_labels().iter().map(|l| l.chars().count() + 1).sum();
        let room = usize::from(header.width).saturating_sub(tabs_width + 1);
        if room > 8 {
            let shown: String = if right.chars().count() > room {
                let skip = right.chars().count() - room + 1;
                format!("…{}", right.chars().skip(skip).collect::<String>())
            } else {
                right
            };
            Paragraph::new(Line::from(Span::styled(shown, theme.dim())).right_aligned())
                .render(header, buf);
        }

        match app.screen {
            Screen::Symptoms => symptoms::render(app, theme, body, buf),
            Screen::Inputs => inputs::render(app, theme, body, buf),
            Screen::Results => results::render(app, theme, body, buf),
            Screen::WhatIf => what_if::render(app, theme, body, buf),
        }

        if let Some(message) = &app.status {
            Paragraph::new(Line::from(Span::styled(message.clone(), theme.warn())))
                .render(status, buf);
        }
        help_line_widget(app, theme).render(help_line, buf);

        if let Some(popup) = &app.popup {
            popups::render(app, popup, theme, area, buf);
        }
    }
}

/// The always-visible key line: as many hints as fit.
fn help_line_widget(app: &App, theme: Theme) -> Paragraph<'static> {
    let mut spans = Vec::new();
    for (key, what) in app.key_hints() {
        spans.push(Span::styled(key.to_string(), theme.key()));
        spans.push(Span::raw(format!(" {what}  ")));
    }
    Paragraph::new(Line::from(spans))
}

/// A stress in compact form for plot axes and tables: "412 kPa", "1.25 MPa", "59.8 psi".
pub fn compact_stress(value: f64, units: UnitSystem) -> String {
    match units {
        UnitSystem::Si => {
            let a = value.abs();
            if a >= 1e6 {
                format!("{} MPa", sig3(value / 1e6))
            } else if a >= 1e3 {
                format!("{} kPa", sig3(value / 1e3))
            } else {
                format!("{} Pa", sig3(value))
            }
        }
        UnitSystem::Us => {
            let psi = value / 6_894.757_293_168;
            if psi.abs() >= 1e3 {
                format!("{} ksi", sig3(psi / 1e3))
            } else {
                format!("{} psi", sig3(psi))
            }
        }
    }
}

/// A radius in compact form: "48 mm" or "1.9 in".
pub fn compact_length(value: f64, units: UnitSystem) -> String {
    match units {
        UnitSystem::Si => format!("{} mm", sig3(value * 1e3)),
        UnitSystem::Us => format!("{} in", sig3(value / 0.0254)),
    }
}

/// Three significant figures without trailing zeros.
pub fn sig3(value: f64) -> String {
    if value == 0.0 || !value.is_finite() {
        return format!("{}", if value.is_finite() { 0.0 } else { value });
    }
    let digits = (2 - value.abs().log10().floor() as i32).clamp(0, 6) as usize;
    let text = format!("{value:.digits$}");
    if text.contains('.') {
        text.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        text
    }
}

/// Scroll offset that keeps logical line `target` (and the line after it) of a wrapped
/// paragraph in a box `width`×`height` (inside its borders) in view. Word wrapping can take a
/// row more than the estimate, hence the spare line.
pub fn scroll_to_keep(lines: &[Line], target: usize, width: u16, height: u16) -> u16 {
    let width = usize::from(width).max(1);
    let rows = |l: &Line| l.width().div_ceil(width).max(1);
    let before: usize = lines.iter().take(target).map(rows).sum();
    let here = lines.get(target).map_or(1, rows);
    (before + here + 1).saturating_sub(usize::from(height)) as u16
}

/// Draw `lines` word-wrapped inside `block`, scrolled so that logical line `target` stays in
/// view (`None`: from the top).
pub fn render_scrolled<'a>(
    lines: Vec<Line<'a>>,
    target: Option<usize>,
    block: Block<'a>,
    area: Rect,
    buf: &mut Buffer,
) {
    let scroll = target.map_or(0, |target| {
        scroll_to_keep(
            &lines,
            target,
            area.width.saturating_sub(2),
            area.height.saturating_sub(2),
        )
    });
    Paragraph::new(lines)
        .wrap(Wrap { trim: false })
        .scroll((scroll, 0))
        .block(block)
        .render(area, buf);
}

/// A centred rectangle `width`×`height` inside `area` (clipped to it).
pub fn centred(area: Rect, width: u16, height: u16) -> Rect {
    let width = width.min(area.width);
    let height = height.min(area.height);
    Rect {
        x: area.x + (area.width - width) / 2,
        y: area.y + (area.height - height) / 2,
        width,
        height,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn compact_numbers() {
        assert_eq!(sig3(412_345.0), "412345");
        assert_eq!(sig3(1.2504), "1.25");
        assert_eq!(sig3(-0.5), "-0.5");
        assert_eq!(compact_stress(412_345.0, UnitSystem::Si), "412 kPa");
        assert_eq!(compact_stress(-1_250_000.0, UnitSystem::Si), "-1.25 MPa");
        // 1 psi = 6894.757 Pa (NIST SP 811, appendix B).
        assert_eq!(compact_stress(6_894.757, UnitSystem::Us), "1 psi");
        assert_eq!(compact_length(0.0508, UnitSystem::Us), "2 in");
    }
}
