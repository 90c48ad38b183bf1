//! The stress section of a report: the headline figures of the solved profile and the
//! per-zone statistics.

use serde::{Deserialize, Serialize};

use super::{Quantity, round_sig};
use crate::case::ResolvedCase;
use crate::model::Profile;
use crate::units::{QuantityKind, UnitSystem};

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ZoneSummary {
    pub zone: String,
    /// Where the zone starts and ends, as roll diameters (what an operator measures).
    pub inner_diameter: Quantity,
    pub outer_diameter: Quantity,
    pub pressure_min: Quantity,
    pub pressure_mean: Quantity,
    pub pressure_max: Quantity,
    pub tangential_stress_min: Quantity,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct StressSummary {
    pub core_pressure: Quantity,
    pub core_crush_pressure: Quantity,
    /// Core pressure divided by the core's rated crush pressure.
    pub core_pressure_ratio: f64,
    pub peak_pressure: Quantity,
    /// Roll diameter at the peak pressure.
    pub peak_pressure_diameter: Quantity,
    pub min_tangential_stress: Quantity,
    pub min_tangential_diameter: Quantity,
    pub wound_in_tension_start: Quantity,
    pub wound_in_tension_end: Quantity,
    pub physical_layers: usize,
    /// The wound web's weight, core left out (`ResolvedCase::roll_mass`); absent in documents
    /// written before it was shown.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub roll_weight: Option<Quantity>,
    pub elements: usize,
    pub layers_per_element: usize,
    pub zones: Vec<ZoneSummary>,
    /// Air-film thickness over combined roughness at the start and at the outside.
    pub air_film_ratio: Option<(f64, f64)>,
    pub warnings: Vec<String>,
}

/// Summary figures and per-zone statistics of a profile.
pub fn stress_summary(
    resolved: &ResolvedCase,
    profile: &Profile,
    units: UnitSystem,
) -> StressSummary {
    use QuantityKind::*;
    let s = &profile.summary;
    let zones = profile
        .zones
        .iter()
        .filter_map(|zone| {
            let end = zone.end.min(profile.pressure.len());
            let pressures = profile.pressure.get(zone.start..end)?;
            let tangential = profile.tangential_stress.get(zone.start..end)?;
            if pressures.is_empty() {
                return None;
            }
            let min = pressures.iter().copied().fold(f64::INFINITY, f64::min);
            let max = pressures.iter().copied().fold(f64::NEG_INFINITY, f64::max);
            let mean = pressures.iter().sum::<f64>() / pressures.len() as f64;
            let tangential_min = tangential.iter().copied().fold(f64::INFINITY, f64::min);
            Some(ZoneSummary {
                zone: zone.name.as_str().to_string(),
                inner_diameter: Quantity::new(2.0 * zone.inner_radius, Length, units),
                outer_diameter: Quantity::new(2.0 * zone.outer_radius, Length, units),
                pressure_min: Quantity::new(min, Stress, units),
                pressure_mean: Quantity::new(mean, Stress, units),
                pressure_max: Quantity::new(max, Stress, units),
                tangential_stress_min: Quantity::new(tangential_min, Stress, units),
            })
        })
        .collect();
    let crush = resolved.core.crush_pressure;
    let ratio = if crush > 0.0 {
        round_sig(s.core_pressure / crush, 4)
    } else {
        0.0
    };
    let wit_start = profile.wound_in_tension.first().copied().unwrap_or(0.0);
    let wit_end = profile.wound_in_tension.last().copied().unwrap_or(0.0);
    StressSummary {
        core_pressure: Quantity::new(s.core_pressure, Stress, units),
        core_crush_pressure: Quantity::new(crush, Stress, units),
        core_pressure_ratio: ratio,
        peak_pressure: Quantity::new(s.peak_pressure, Stress, units),
        peak_pressure_diameter: Quantity::new(2.0 * s.peak_pressure_radius, Length, units),
        min_tangential_stress: Quantity::new(s.min_tangential_stress, Stress, units),
        min_tangential_diameter: Quantity::new(2.0 * s.min_tangential_radius, Length, units),
        wound_in_tension_start: Quantity::new(wit_start, ForcePerWidth, units),
        wound_in_tension_end: Quantity::new(wit_end, ForcePerWidth, units),
        physical_layers: s.physical_layers,
        roll_weight: Some(Quantity::new(resolved.roll_mass(), Mass, units)),
        elements: profile.solver.elements,
        layers_per_element: profile.solver.grid.layers_per_element,
        zones,
        air_film_ratio: profile.air_film.map(|(start, end)| {
            (
                round_sig(start.ratio_to_roughness, 4),
                round_sig(end.ratio_to_roughness, 4),
            )
        }),
        warnings: profile.warnings.clone(),
    }
}
