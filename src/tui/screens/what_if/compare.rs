//! The what-if comparison in words: indicator values in the user's units, how much each moved
//! ("same", "×140", "+12 %"), the before → after rows and a taper design's limits.

use crate::taper_design::{TaperDesign, TaperShape};
use crate::tui::job::SolveOutcome;
use crate::tui::screens::{compact_stress, sig3};
use crate::units::UnitSystem;

/// An indicator's value in the user's units where it has one ("1.2 pli", "116 %").
pub(super) fn format_value(id: &str, value: f64, unit: &str, units: UnitSystem) -> String {
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
        rows.extend(margin_rows(before, after, units));
        rows.extend(indicators);
    } else {
        rows.extend(margin_rows(before, after, units));
    }
    rows
}

/// The failure margins before and after: a heading, then per failure its smallest margin and
/// the change of verdict, and under it where the smallest margin sits before → after. The
/// rows of the reports' comparison ([`crate::report::margin_comparison`]).
fn margin_rows(before: &SolveOutcome, after: &SolveOutcome, units: UnitSystem) -> Vec<[String; 4]> {
    let margins = crate::report::margin_comparison(
        &crate::report::margins_section(&before.resolved, &before.profile, units).rows,
        &crate::report::margins_section(&after.resolved, &after.profile, units).rows,
    );
    let mut rows = vec![text_row(
        "Margins against each failure (capacity / demand):",
    )];
    for m in margins {
        let change = if m.verdict_change.is_empty() {
            "same".to_string()
        } else {
            m.verdict_change.clone()
        };
        rows.push([
            m.mechanism.clone(),
            m.before_text.clone(),
            m.after_text.clone(),
            change,
        ]);
        if m.before_where != "—" || m.after_where != "—" {
            rows.push(text_row(&format!(
                "  where: {}; {}",
                m.where_text(),
                m.verdict_text
            )));
        }
    }
    rows
}

/// A row of words alone (drawn dim across the table).
fn text_row(text: &str) -> [String; 4] {
    [
        text.to_string(),
        String::new(),
        String::new(),
        String::new(),
    ]
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
        rows.push(text_row(sentence));
    }
    rows
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
