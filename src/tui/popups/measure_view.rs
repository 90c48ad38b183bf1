//! The measurements popup's second page: measured against computed. The hardness readings
//! along the radius, scaled as the evidence module scales them (softest reading 0, hardest 1;
//! the computed pressure by the same rule over the readings' diameters), drawn over the computed
//! pressure profile against the diameter; under it every comparison with its verdict in plain
//! words, the lines `rolltriage compare` prints ([`crate::evidence::Evidence::lines_in`]), and
//! what the roll says about its winding: the inverse estimate of the wound-in tension ("the
//! settings say X, the roll says Y") with the fit's quality and uncertainty, or why it cannot be
//! estimated ([`crate::evidence::InverseEstimate::lines_in`], computed by the worker with the
//! solve). Diameters, lengths and pressures follow the session's units (Ctrl-U). It reads the
//! latest solve; nothing is computed on the UI thread.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};
use ratatui::widgets::Widget;

use crate::evidence::HardnessComparison;
use crate::model::Profile;
use crate::tui::session::Session;
use crate::tui::theme::Theme;
use crate::units::{UnitSystem, compact_length};

/// Marks on the plot (readable without colour).
pub const COMPUTED_MARK: char = '·';
pub const READING_MARK: char = '●';

/// The plot as rows of characters, `width` × `height`, top row hardest. `None` when the profile
/// is empty.
pub fn plot_rows(
    profile: &Profile,
    hardness: &HardnessComparison,
    width: usize,
    height: usize,
) -> Option<Vec<String>> {
    let (rc, ro) = (*profile.radius.first()?, *profile.radius.last()?);
    if width < 4 || height < 3 || ro <= rc {
        return None;
    }
    // The evidence module scales the computed pressure over the readings' diameters.
    let at = hardness.points.iter().map(|p| p.computed_pressure);
    let (mut lo, mut hi) = at.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), p| {
        (a.min(p), b.max(p))
    });
    if !(hi - lo).is_finite() || hi - lo <= f64::EPSILON {
        lo = profile
            .pressure
            .iter()
            .copied()
            .fold(f64::INFINITY, f64::min);
        hi = profile
            .pressure
            .iter()
            .copied()
            .fold(f64::NEG_INFINITY, f64::max);
    }
    let span = (hi - lo).max(f64::MIN_POSITIVE);
    let scaled = |p: f64| (p - lo) / span;
    // Room for the profile beyond the readings' range, within reason.
    let smin = profile
        .pressure
        .iter()
        .map(|&p| scaled(p))
        .fold(0.0_f64, f64::min)
        .max(-1.0);
    let smax = profile
        .pressure
        .iter()
        .map(|&p| scaled(p))
        .fold(1.0_f64, f64::max)
        .min(2.0);
    let mut grid = vec![vec![' '; width]; height];
    let row_of = |s: f64| {
        let share = (s - smin) / (smax - smin).max(f64::MIN_POSITIVE);
        let row = ((1.0 - share) * (height - 1) as f64).round();
        (row >= 0.0 && row <= (height - 1) as f64).then_some(row as usize)
    };
    for (col, cell_row) in (0..width).map(|c| (c, c)) {
        let r = rc + (ro - rc) * col as f64 / (width - 1) as f64;
        let p = Profile::interpolate(&profile.pressure, &profile.radius, r);
        if let Some(row) = row_of(scaled(p)) {
            grid[row][cell_row] = COMPUTED_MARK;
        }
    }
    for point in &hardness.points {
        let share = (point.diameter / 2.0 - rc) / (ro - rc);
        let col = (share.clamp(0.0, 1.0) * (width - 1) as f64).round() as usize;
        if let Some(row) = row_of(point.normalised_reading) {
            grid[row][col] = READING_MARK;
        }
    }
    Some(grid.into_iter().map(|r| r.into_iter().collect()).collect())
}

fn diameter(metres: f64, units: UnitSystem) -> String {
    match units {
        UnitSystem::Si => format!("⌀ {:.0} mm", metres * 1e3),
        UnitSystem::Us => format!("⌀ {}", compact_length(metres, units)),
    }
}

/// Draw the page into `area` (inside the popup's border), scrolled by `scroll` lines.
pub fn render(ctx: &Session, scroll: u16, theme: Theme, area: Rect, buf: &mut Buffer) {
    let mut lines: Vec<Line> = Vec::new();
    let outcome = ctx.current_outcome().or(ctx.latest_outcome());
    let Some(outcome) = outcome else {
        return text_only(&why_no_solve(ctx), theme, area, buf);
    };
    if ctx.baseline_is_stale() {
        lines.push(Line::from(Span::styled(
            "Out of date: the case changed since this solve (solving again…)",
            theme.warn(),
        )));
    }
    let evidence = match &outcome.diagnosis {
        Ok(d) => d.evidence.clone(),
        Err(e) => {
            return text_only(&format!("No comparison: {e}"), theme, area, buf);
        }
    };
    let Some(evidence) = evidence else {
        return text_only(
            "Nothing measured in the case as solved: enter the measurements on the other page (v).",
            theme,
            area,
            buf,
        );
    };
    if let Some(h) = &evidence.hardness {
        let plot_height = if area.height >= 30 { 12 } else { 6 };
        let size = (usize::from(area.width), plot_height);
        lines.extend(hardness_plot(&outcome.profile, h, size, ctx.units, theme));
    }
    lines.push(Line::from(Span::styled(
        "Measured against computed",
        theme.title(),
    )));
    for text in evidence.lines_in(ctx.units) {
        lines.push(Line::from(text));
    }
    lines.push(Line::from(""));
    lines.push(Line::from(Span::styled(
        "What the roll says about its winding",
        theme.title(),
    )));
    match &outcome.estimate {
        Some(Ok(estimate)) => {
            lines.extend(estimate.lines_in(ctx.units).into_iter().map(Line::from));
        }
        Some(Err(reason)) => lines.push(Line::from(Span::styled(
            format!("Not estimated: {reason}"),
            theme.warn(),
        ))),
        None => lines.push(Line::from(Span::styled(
            "Not estimated for this solve: ^R solves the case as written again.",
            theme.dim(),
        ))),
    }
    // Through the screens' wrap so that a number keeps its unit on the same row.
    crate::tui::screens::wrapped(lines, false)
        .scroll((scroll, 0))
        .render(area, buf);
}

/// What the page says while there is no solve to compare with.
fn why_no_solve(ctx: &Session) -> String {
    if ctx.case.measurements.is_none() {
        "Nothing measured yet: enter the measurements on the other page (v).".into()
    } else if ctx.running_baseline.is_some() {
        "Solving the case… the comparison shows when the solve is done.".into()
    } else {
        match &ctx.baseline {
            Some(b) => match &b.result {
                Err(e) => format!("The case could not be solved: {e}"),
                Ok(_) => String::new(),
            },
            None => "Not solved yet: ^R solves the case.".into(),
        }
    }
}

/// The hardness readings over the computed pressure as a character plot of `size` (width,
/// height in rows) with its title, diameter axis and key; nothing when it cannot be drawn.
fn hardness_plot(
    profile: &Profile,
    h: &HardnessComparison,
    (width, plot_height): (usize, usize),
    units: UnitSystem,
    theme: Theme,
) -> Vec<Line<'static>> {
    let label = 6;
    let Some(rows) = plot_rows(profile, h, width.saturating_sub(label + 1), plot_height) else {
        return Vec::new();
    };
    let mut lines = vec![Line::from(Span::styled(
        "Hardness along the radius against the computed pressure (both scaled: softest reading 0, hardest 1)",
        theme.title(),
    ))];
    let last = rows.len() - 1;
    for (i, row) in rows.into_iter().enumerate() {
        let axis = match i {
            0 => "hard  ",
            i if i == last => "soft  ",
            _ => "      ",
        };
        lines.push(Line::from(vec![
            Span::styled(axis, theme.dim()),
            Span::styled(row, theme.curve()),
        ]));
    }
    let (rc, ro) = (
        profile.radius.first().copied().unwrap_or(0.0),
        profile.radius.last().copied().unwrap_or(0.0),
    );
    let left = format!("{:label$}{}", "", diameter(2.0 * rc, units));
    let right = diameter(2.0 * ro, units);
    lines.push(Line::from(Span::styled(
        diameter_axis(&left, &right, width),
        theme.dim(),
    )));
    lines.push(Line::from(Span::styled(
        format!("{READING_MARK} hardness reading   {COMPUTED_MARK} computed pressure"),
        theme.dim(),
    )));
    lines.push(Line::from(""));
    lines
}

/// The plot's x axis: the core's diameter on the left, the roll's on the right and
/// "diameter →" centred between them when there is room.
fn diameter_axis(left: &str, right: &str, width: usize) -> String {
    let middle = "diameter →";
    let gap = width.saturating_sub(left.chars().count() + right.chars().count());
    let pad = gap.saturating_sub(middle.chars().count()) / 2;
    if gap > middle.chars().count() + 1 {
        format!(
            "{left}{:pad$}{middle}{:rest$}{right}",
            "",
            "",
            rest = gap - pad - middle.chars().count()
        )
    } else {
        format!("{left} {right}")
    }
}

fn text_only(text: &str, theme: Theme, area: Rect, buf: &mut Buffer) {
    crate::tui::screens::wrapped(
        Line::from(Span::styled(text.to_string(), theme.dim())),
        false,
    )
    .render(area, buf);
}
