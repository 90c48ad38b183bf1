//! A chosen remedy applied to the case and re-solved: the before/after figures of a report.

use serde::{Deserialize, Serialize};

use super::Quantity;
use super::margins::{MarginLine, margins_section};
use crate::mechanics::table::Verdict;
use crate::model::Profile;
use crate::report::ReportInput;
use crate::units::{QuantityKind, UnitSystem};

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RemedyComparisonSummary {
    pub remedy_id: String,
    pub remedy_text: String,
    pub change: String,
    /// (label, before, after) for the headline figures.
    pub figures: Vec<ComparisonFigure>,
    /// Every failure's smallest margin before and after, from the margins table of each.
    #[serde(default)]
    pub margins: Vec<MarginComparison>,
}

/// One failure's smallest margin before and after a change: the rows of the two margins tables
/// ([`margins_section`]) side by side.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MarginComparison {
    /// The mechanism's stable ID (as `MarginLine::id`).
    pub id: String,
    pub mechanism: String,
    pub before: f64,
    pub before_text: String,
    pub after: f64,
    pub after_text: String,
    /// Where the smallest margin is, before and after ("⌀ 310–340 mm").
    pub before_where: String,
    pub after_where: String,
    /// Verdict IDs (`fails`, `close`, `holds`, `no_demand`) before and after.
    pub before_verdict: String,
    pub after_verdict: String,
    /// The verdict after, in words ("holds, little to spare").
    pub verdict_text: String,
    /// The change of verdict in words ("now holds"); empty when the verdict stays.
    pub verdict_change: String,
}

impl MarginComparison {
    /// The verdict after with its change when it moved ("holds (now holds)").
    pub fn verdict_after_text(&self) -> String {
        if self.verdict_change.is_empty() {
            self.verdict_text.clone()
        } else {
            format!("{} ({})", self.verdict_text, self.verdict_change)
        }
    }

    /// Where before → after, once when the place stays ("⌀ 946 mm").
    pub fn where_text(&self) -> String {
        if self.before_where == self.after_where {
            self.after_where.clone()
        } else {
            format!("{} → {}", self.before_where, self.after_where)
        }
    }
}

/// The margins of two tables side by side, in the order of `before` (a mechanism missing after,
/// such as the shaft row without a rating, is left out).
pub fn margin_comparison(before: &[MarginLine], after: &[MarginLine]) -> Vec<MarginComparison> {
    before
        .iter()
        .filter_map(|b| Some((b, after.iter().find(|a| a.id == b.id)?)))
        .map(|(b, a)| MarginComparison {
            id: b.id.clone(),
            mechanism: b.mechanism.clone(),
            before: b.margin,
            before_text: b.margin_text.clone(),
            after: a.margin,
            after_text: a.margin_text.clone(),
            before_where: b.where_text.clone(),
            after_where: a.where_text.clone(),
            before_verdict: b.verdict.clone(),
            after_verdict: a.verdict.clone(),
            verdict_text: a.verdict_text.clone(),
            verdict_change: Verdict::change_word(b.verdict_kind(), a.verdict_kind())
                .unwrap_or_default(),
        })
        .collect()
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ComparisonFigure {
    pub label: String,
    pub before: Quantity,
    pub after: Quantity,
}

fn zone_pressure_mean(profile: &Profile, zone: &str) -> Option<f64> {
    let zone = profile.zones.iter().find(|z| z.name.as_str() == zone)?;
    let values = profile
        .pressure
        .get(zone.start..zone.end.min(profile.pressure.len()))?;
    if values.is_empty() {
        return None;
    }
    Some(values.iter().sum::<f64>() / values.len() as f64)
}

/// The before/after figures of the chosen remedy, when one was applied.
pub(super) fn remedy_comparison(
    input: &ReportInput,
    units: UnitSystem,
) -> Option<RemedyComparisonSummary> {
    input.remedy.as_ref().map(|comparison| {
        let before = &input.profile.summary;
        let after = &comparison.after.summary;
        let stress_figure = |label: &str, b: f64, a: f64| ComparisonFigure {
            label: label.to_string(),
            before: Quantity::new(b, QuantityKind::Stress, units),
            after: Quantity::new(a, QuantityKind::Stress, units),
        };
        let mut figures = vec![
            stress_figure("Core pressure", before.core_pressure, after.core_pressure),
            stress_figure("Peak pressure", before.peak_pressure, after.peak_pressure),
            stress_figure(
                "Most compressive tangential stress",
                before.min_tangential_stress,
                after.min_tangential_stress,
            ),
        ];
        for zone in ["middle", "outer"] {
            let b = zone_pressure_mean(&input.profile, zone);
            let a = zone_pressure_mean(&comparison.after, zone);
            if let (Some(b), Some(a)) = (b, a) {
                figures.push(stress_figure(&format!("Mean pressure, {zone} zone"), b, a));
            }
        }
        let margins = margin_comparison(
            &margins_section(&input.resolved, &input.profile, units).rows,
            &margins_section(&comparison.after_case, &comparison.after, units).rows,
        );
        RemedyComparisonSummary {
            remedy_id: comparison.remedy_id.clone(),
            remedy_text: comparison.remedy_text.clone(),
            change: comparison.change.clone(),
            figures,
            margins,
        }
    })
}
