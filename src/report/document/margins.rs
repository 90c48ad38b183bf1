//! "Margins against each failure": the mechanics layer's one margins table
//! ([`crate::mechanics::table::margin_table`], the functions the diagnosis reads) in the
//! user's units, for the report formats and the terminal UI's margins popup.

use serde::{Deserialize, Serialize};

use super::{Quantity, round_sig};
use crate::case::ResolvedCase;
use crate::mechanics::MechanicsInputs;
use crate::mechanics::table::{MarginRow, Measure, Verdict, margin_table};
use crate::model::Profile;
use crate::units::{QuantityKind, UnitSystem, format_quantity};

/// The margins table of a report.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct MarginsSection {
    /// Some wrap is in hoop compression; false = starring cannot start.
    pub hoop_compression: bool,
    pub rows: Vec<MarginLine>,
}

/// One mechanism's smallest margin, where it is, and the demand and capacity behind it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MarginLine {
    /// Stable ID (`telescoping`, `slip_start_up`, `slip_normal_stop`, `slip_emergency_stop`,
    /// `slip_unwind`, `shaft_grip`, `starring`, `core_crush`).
    pub id: String,
    pub mechanism: String,
    /// Capacity / demand, smallest over the roll (capped at 1000).
    pub margin: f64,
    pub margin_text: String,
    /// `fails`, `close`, `holds` or `no_demand`.
    pub verdict: String,
    pub verdict_text: String,
    /// Roll diameter of the smallest margin.
    pub diameter: Quantity,
    /// The weakest band as roll diameters in mm, inner and outer.
    pub band_mm: [f64; 2],
    /// Where, in the user's units: one diameter or the band ("⌀ 310–340 mm").
    pub where_text: String,
    /// Where as a share of the build from the core (0) to the outside (1).
    pub build_share: f64,
    /// What demand and capacity are ("torque / friction torque").
    pub measures: String,
    /// Demand and capacity at the smallest margin; torques for the whole web width.
    pub demand: Quantity,
    pub capacity: Quantity,
}

impl MarginLine {
    /// The verdict of the row (`NoDemand` for an ID not known, e.g. from an older JSON).
    pub fn verdict_kind(&self) -> Verdict {
        Verdict::from_id(&self.verdict).unwrap_or(Verdict::NoDemand)
    }
}

impl MarginsSection {
    /// A plain sentence under the table.
    pub fn note(&self) -> &'static str {
        if self.hoop_compression {
            "Margin = capacity / demand at the weakest interface; below 1 the roll fails there. \
             Torques are for the whole web width."
        } else {
            "Margin = capacity / demand at the weakest interface; below 1 the roll fails there. \
             Torques are for the whole web width. No wrap is in hoop compression: starring \
             cannot start."
        }
    }
}

/// The margins table of a solved case in `units`.
pub fn margins_section(
    resolved: &ResolvedCase,
    profile: &Profile,
    units: UnitSystem,
) -> MarginsSection {
    let inputs = MechanicsInputs::from_case(resolved);
    let table = margin_table(profile, &inputs, resolved.core.crush_pressure);
    let width = resolved.web.width;
    let rows = table
        .rows
        .iter()
        .map(|row| margin_line(row, table.build_share(row.radius), width, units))
        .collect();
    MarginsSection {
        hoop_compression: table.hoop_compression,
        rows,
    }
}

fn margin_line(row: &MarginRow, build_share: f64, width: f64, units: UnitSystem) -> MarginLine {
    let amount = |value: f64| match row.mechanism.measure() {
        Measure::Stress => Quantity::new(value, QuantityKind::Stress, units),
        Measure::TorquePerWidth => Quantity::new(value * width, QuantityKind::Torque, units),
    };
    let diameter = |radius: f64| format_quantity(2.0 * radius, QuantityKind::Length, units);
    let where_text = if !row.has_demand {
        "—".to_string()
    } else if row.is_band() {
        format!("⌀ {}–{}", diameter(row.band.0), diameter(row.band.1))
    } else {
        format!("⌀ {}", diameter(row.radius))
    };
    MarginLine {
        id: row.mechanism.id(),
        mechanism: row.mechanism.title(),
        margin: round_sig(row.margin, 4),
        margin_text: row.margin_text(),
        verdict: row.verdict().id().to_string(),
        verdict_text: row.verdict_text(),
        diameter: Quantity::new(2.0 * row.radius, QuantityKind::Length, units),
        band_mm: [
            round_sig(2e3 * row.band.0, 5),
            round_sig(2e3 * row.band.1, 5),
        ],
        where_text,
        build_share: round_sig(build_share, 3),
        measures: row.mechanism.demand_words().to_string(),
        demand: amount(row.demand),
        capacity: amount(row.capacity),
    }
}
