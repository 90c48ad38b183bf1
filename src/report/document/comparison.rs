//! A chosen remedy applied to the case and re-solved: the before/after figures of a report.

use serde::{Deserialize, Serialize};

use super::Quantity;
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
        RemedyComparisonSummary {
            remedy_id: comparison.remedy_id.clone(),
            remedy_text: comparison.remedy_text.clone(),
            change: comparison.change.clone(),
            figures,
        }
    })
}
