//! Calibrate the web's radial stiffness: a stack-compression CSV is fitted with Pfeiffer's law
//! (the same library call as `rolltriage calibrate stack`), shown, and on Enter written into
//! the case.

use std::path::{Path, PathBuf};

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};

use super::prompt::{PathPrompt, path_prompt};
use crate::calibrate::{CalibrateError, FitOptions, PfeifferFit, StackReadOptions};
use crate::tui::component::{Action, Binding, Component, Handled};
use crate::tui::event::Key;
use crate::tui::screens::centred;
use crate::tui::session::Session;
use crate::tui::theme::Theme;

/// A CSV path, then the fit to confirm.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct CalibratePopup {
    /// The CSV path, and why the file could not be read or fitted.
    pub prompt: PathPrompt,
    /// The fit of the file named in the prompt, waiting for Enter to be written into the case.
    pub fit: Option<StackFit>,
}

/// A fitted stack test, as the popup shows it.
#[derive(Debug, Clone, PartialEq)]
pub struct StackFit {
    pub origin: String,
    pub fit: PfeifferFit,
    /// Notes from reading the file and warnings about the fit, one line each.
    pub warnings: Vec<String>,
}

const ASKING: u8 = 1;
const FITTED: u8 = 2;

#[rustfmt::skip]
const KEYS: &[Binding] = &[
    Binding::line(FITTED, "Enter", "write K1 K2 into the case"),
    Binding::line(FITTED, "type", "other file"),
    Binding::line(ASKING, "type", "CSV file"),
    Binding::line(ASKING, "Enter", "fit"),
    Binding::line(ASKING | FITTED, "Esc", "cancel"),
];

/// Read a stack-compression CSV and fit Pfeiffer's law to it with the command line's default
/// options (relative weighting). `thickness` is the case's web thickness (m), to warn when the
/// stack's caliper does not match it.
pub fn fit_stack_file(path: &Path, thickness: Option<f64>) -> Result<StackFit, CalibrateError> {
    let (test, fit) = crate::calibrate::fit_stack_file(
        path,
        &StackReadOptions::default(),
        &FitOptions::default(),
    )?;
    let mut warnings: Vec<String> = test.notes.iter().map(|n| format!("note: {n}")).collect();
    warnings.extend(fit.warnings.iter().map(|w| format!("warning: {w}")));
    if let Some(warning) =
        thickness.and_then(|t| crate::calibrate::caliper_warning(&test, t, "web thickness"))
    {
        warnings.push(format!("warning: {warning}"));
    }
    Ok(StackFit {
        origin: path.display().to_string(),
        fit,
        warnings,
    })
}

impl CalibratePopup {
    /// Write the fit into the case's web radial stiffness (law pfeiffer).
    fn apply(fitted: &StackFit, ctx: &mut Session) {
        crate::calibrate::apply_to_case(&mut ctx.case, &fitted.fit);
        ctx.edited();
        ctx.set_status(format!(
            "Web radial stiffness: pfeiffer K1 {} kPa, K2 {} from {} (unsaved)",
            crate::calibrate::significant(fitted.fit.k1 / 1e3, 5),
            crate::calibrate::significant(fitted.fit.k2, 5),
            fitted.origin
        ));
    }
}

impl Component for CalibratePopup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        match key {
            Key::Esc => ctx.push(Action::Close),
            Key::Enter => match self.fit.take() {
                Some(fitted) => {
                    CalibratePopup::apply(&fitted, ctx);
                    ctx.push(Action::Close);
                }
                None => {
                    let path = PathBuf::from(self.prompt.input.trim());
                    let thickness = ctx.resolved.as_ref().ok().map(|r| r.web.thickness);
                    match fit_stack_file(&path, thickness) {
                        Ok(fitted) => {
                            self.fit = Some(fitted);
                            self.prompt.error = None;
                        }
                        Err(error) => self.prompt.error = Some(error.to_string()),
                    }
                }
            },
            // Another file: the fit shown is no longer its fit.
            _ if self.prompt.edit(key) => self.fit = None,
            _ => {}
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn mode(&self, _ctx: &Session) -> u8 {
        if self.fit.is_some() { FITTED } else { ASKING }
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        render(self, ctx, theme, area, buf);
    }
}

fn render(prompt: &CalibratePopup, app: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
    let stress = |pa: f64| crate::units::compact_stress(pa, app.units);
    let mut lines = path_prompt(
        "CSV file: ",
        &prompt.prompt.input,
        prompt.prompt.error.as_deref(),
        theme,
    );
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
    super::framed(lines, " Calibrate: stack-compression test ", rect, buf);
}
