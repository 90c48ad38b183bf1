//! Numbers the rules may test, computed once per profile and case.
//!
//! Every indicator has a stable ID, a dimension (which decides the units a rule threshold may be
//! written in), a unit for display and a one-line meaning. The formulas are listed in
//! `docs/rules.md`. Rules name indicators and zones, never array positions.

use std::collections::BTreeMap;

use serde::{Deserialize, Serialize};

use crate::case::ResolvedCase;
use crate::model::{Profile, Taper, WindingMethod, ZoneName};

mod catalogue;
mod compute;
pub mod levers;

pub use catalogue::INDICATORS;
pub use compute::taper_percent;

/// One computed indicator value.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct IndicatorValue {
    pub id: String,
    pub zone: Option<String>,
    /// Value in SI (Pa, m, m/s, N/m, °C) or as a dimensionless ratio; `taper` is in percent.
    pub value: f64,
    pub unit: String,
    pub meaning: String,
}

/// What kind of quantity an indicator is; decides accepted threshold units and formatting.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Dimension {
    /// Pa (pressure or stress; accepts Pa, kPa, MPa, psi).
    Pressure,
    /// Share 0..1 (accepts a plain fraction or "%").
    Fraction,
    /// Plain ratio, no unit.
    Ratio,
    /// Percent points (taper); accepts "%" or a plain number of percent.
    Percent,
    /// m/s (accepts m/s, m/min, fpm, ft/min).
    Speed,
    /// N/m (accepts N/m, kN/m, pli).
    ForcePerWidth,
    /// °C (accepts C, °C, degC).
    Temperature,
    /// m (accepts m, mm, um, µm, mil, in).
    Length,
}

/// Whether an indicator takes a zone.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ZoneUse {
    /// Whole roll only.
    None,
    /// Whole roll when no zone is named, else the named zone.
    Optional,
    /// A zone must be named.
    Required,
}

/// The definition of one indicator.
#[derive(Debug, Clone, Copy)]
pub struct IndicatorSpec {
    pub id: &'static str,
    pub dimension: Dimension,
    pub zones: ZoneUse,
    pub meaning: &'static str,
}

/// The indicators read straight from the case's inputs (settings and web data), not from the
/// solved stress state: a remedy that changes a setting moves them by construction, so the
/// what-if judges a remedy's effect on the others first.
pub const INPUT_INDICATORS: &[&str] = &[
    "speed",
    "web_tension",
    "web_stress",
    "winding_strain",
    "tension_strength_share",
    "tension_to_usual",
    "tension_to_recipe",
    "nip_load",
    "nip_to_tension",
    "nip_wit_share",
    "taper",
    "temperature",
    "thickness",
    "roll_diameter",
    "friction",
    "build_ratio",
];

/// The indicators that come from measurements (src/evidence), not from the solve.
pub const EVIDENCE_IDS: &[&str] = &[
    "measured_density_ratio",
    "density_deviation",
    "hardness_shape_agreement",
    "hardness_soft_band",
    "lane_hardness_spread",
    "end_line_offset",
    "end_line_bend_position",
    "slip_location_match",
    "core_bore_ratio",
    "bad_roll_share",
    "bad_edge_share",
    "bad_parent_share",
];

/// Pressure below which a layer counts as loosely held (20 kPa ≈ 3 psi): an order of magnitude
/// for the interlayer pressure below which layers slide under handling loads — `common practice`,
/// value `(from memory)`.
pub const LOW_PRESSURE_LIMIT: f64 = 20.0e3;

/// The definition of indicator `id`.
pub fn indicator_spec(id: &str) -> Option<&'static IndicatorSpec> {
    INDICATORS.iter().find(|s| s.id == id)
}

/// Display unit of a dimension.
pub fn unit_of(dimension: Dimension) -> &'static str {
    match dimension {
        Dimension::Pressure => "Pa",
        Dimension::Fraction | Dimension::Ratio => "",
        Dimension::Percent => "%",
        Dimension::Speed => "m/s",
        Dimension::ForcePerWidth => "N/m",
        Dimension::Temperature => "°C",
        Dimension::Length => "m",
    }
}

/// Format a value of `dimension` with a readable unit.
pub fn format_value(value: f64, dimension: Dimension) -> String {
    match dimension {
        Dimension::Pressure => {
            if value.abs() >= 1.0e6 {
                format!("{} MPa", sig(value / 1.0e6))
            } else {
                format!("{} kPa", sig(value / 1.0e3))
            }
        }
        Dimension::Fraction => format!("{} %", sig(value * 100.0)),
        Dimension::Ratio => sig(value),
        Dimension::Percent => format!("{} %", sig(value)),
        Dimension::Speed => format!("{} m/min", sig(value * 60.0)),
        Dimension::ForcePerWidth => format!("{} N/m", sig(value)),
        Dimension::Temperature => format!("{} °C", sig(value)),
        Dimension::Length => {
            if value.abs() >= 1.0e-3 {
                format!("{} mm", sig(value * 1.0e3))
            } else {
                format!("{} µm", sig(value * 1.0e6))
            }
        }
    }
}

/// Three significant digits, no trailing zeros, no exponent for everyday magnitudes.
fn sig(value: f64) -> String {
    if !value.is_finite() {
        return if value > 0.0 {
            "∞".into()
        } else {
            "—".into()
        };
    }
    if value == 0.0 {
        return "0".into();
    }
    let magnitude = value.abs().log10().floor() as i32;
    let decimals = (2 - magnitude).clamp(0, 6) as usize;
    let text = format!("{value:.decimals$}");
    if text.contains('.') {
        text.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        text
    }
}

/// All indicator values of one profile and case.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Indicators {
    values: BTreeMap<(String, Option<ZoneName>), f64>,
    /// Measured and computed values in words, for the measured-evidence indicators.
    details: BTreeMap<String, String>,
}

impl Indicators {
    /// The value of `id` in `zone` (or for the whole roll), if it could be computed.
    pub fn get(&self, id: &str, zone: Option<ZoneName>) -> Option<f64> {
        self.values.get(&(id.to_string(), zone)).copied()
    }

    /// The measured and computed values behind an evidence indicator, in words.
    pub fn detail(&self, id: &str) -> Option<&str> {
        self.details.get(id).map(String::as_str)
    }

    /// Add the measured-evidence indicators (none when nothing was measured: rules testing
    /// them stay neutral).
    pub fn add_evidence(&mut self, evidence: &crate::evidence::Evidence) {
        for e in evidence.indicators() {
            self.set(e.id, None, e.value);
            self.details.insert(e.id.to_string(), e.detail);
        }
    }

    fn set(&mut self, id: &'static str, zone: Option<ZoneName>, value: f64) {
        if value.is_finite() {
            self.values.insert((id.to_string(), zone), value);
        }
    }

    /// Every value with unit and meaning, for reports.
    pub fn values(&self) -> Vec<IndicatorValue> {
        self.values
            .iter()
            .filter_map(|((id, zone), value)| {
                let spec = indicator_spec(id)?;
                Some(IndicatorValue {
                    id: id.clone(),
                    zone: zone.map(|z| z.as_str().to_string()),
                    value: *value,
                    unit: unit_of(spec.dimension).to_string(),
                    meaning: spec.meaning.to_string(),
                })
            })
            .collect()
    }

    /// Compute every indicator of `profile` for `case`, with the measured evidence when the case
    /// carries measurements (a measurement that cannot be compared is left out: neutral).
    pub fn compute(case: &ResolvedCase, profile: &Profile) -> Indicators {
        let mut out = Indicators::default();
        out.add_case_inputs(case);
        out.add_profile(case, profile);
        out.add_first_wraps();
        out.add_core_levers(case, profile);
        if let Some(m) = &case.measurements
            && let Ok(evidence) = crate::evidence::compare(
                m,
                &case.problem(crate::model::SolverOptions::default()),
                profile,
            )
        {
            out.add_evidence(&evidence);
        }
        out
    }

    /// The indicators of a changed case (a what-if): its own inputs and stress state, with the
    /// measured evidence and the core-pressure levers of the case as wound (`before`). Saves the
    /// lever re-solves and the measurement comparison, whose results would be replaced anyway.
    pub fn compute_after_change(
        case: &ResolvedCase,
        profile: &Profile,
        before: &Indicators,
    ) -> Indicators {
        let mut out = Indicators::default();
        out.add_case_inputs(case);
        out.add_profile(case, profile);
        out.add_first_wraps();
        out.with_evidence_of(before)
    }

    /// These indicators with the measured evidence (and the core-pressure levers) of `other` in
    /// place of their own: a what-if re-solve changes the settings, not what was measured on the
    /// roll, so the evidence stays as measured against the case as wound.
    pub fn with_evidence_of(mut self, other: &Indicators) -> Indicators {
        let evidence = |id: &str| EVIDENCE_IDS.contains(&id) || levers::LEVER_IDS.contains(&id);
        self.values.retain(|(id, _), _| !evidence(id));
        self.details.clear();
        for ((id, zone), value) in &other.values {
            if evidence(id) {
                self.values.insert((id.clone(), *zone), *value);
            }
        }
        self.details = other.details.clone();
        self
    }
}

/// Parse a rule threshold written as a number or "number unit" for an indicator of `dimension`.
/// Returns the value in the indicator's internal unit, or the accepted units on error.
pub fn parse_threshold(text: &str, dimension: Dimension) -> Result<f64, String> {
    let accepted = match dimension {
        Dimension::Pressure => "Pa, kPa, MPa, psi (or a plain number in Pa)",
        Dimension::Fraction => "%, or a plain fraction 0..1",
        Dimension::Ratio => "a plain number",
        Dimension::Percent => "% (or a plain number of percent)",
        Dimension::Speed => "m/s, m/min, fpm, ft/min (or a plain number in m/s)",
        Dimension::ForcePerWidth => "N/m, kN/m, pli (or a plain number in N/m)",
        Dimension::Temperature => "°C, C, degC (or a plain number in °C)",
        Dimension::Length => "m, mm, um, µm, mil, in (or a plain number in m)",
    };
    let trimmed = text.trim();
    let split = trimmed
        .find(|c: char| !(c.is_ascii_digit() || c == '.' || c == '-' || c == '+' || c == 'e'))
        .unwrap_or(trimmed.len());
    let (number, unit) = trimmed.split_at(split);
    let number: f64 = number
        .trim()
        .parse()
        .map_err(|_| format!("\"{text}\" is not a number with a unit; accepted: {accepted}"))?;
    let unit = unit.trim();
    let factor = match (dimension, unit) {
        (_, "") => Some(1.0),
        (Dimension::Pressure, "Pa") => Some(1.0),
        (Dimension::Pressure, "kPa") => Some(1.0e3),
        (Dimension::Pressure, "MPa") => Some(1.0e6),
        (Dimension::Pressure, "psi") => Some(6894.757),
        (Dimension::Fraction, "%") => Some(0.01),
        (Dimension::Percent, "%") => Some(1.0),
        (Dimension::Speed, "m/s") => Some(1.0),
        (Dimension::Speed, "m/min") => Some(1.0 / 60.0),
        (Dimension::Speed, "fpm" | "ft/min") => Some(0.3048 / 60.0),
        (Dimension::ForcePerWidth, "N/m") => Some(1.0),
        (Dimension::ForcePerWidth, "kN/m") => Some(1.0e3),
        (Dimension::ForcePerWidth, "pli") => Some(175.126_8),
        (Dimension::Temperature, "°C" | "C" | "degC") => Some(1.0),
        (Dimension::Length, "m") => Some(1.0),
        (Dimension::Length, "mm") => Some(1.0e-3),
        (Dimension::Length, "um" | "µm") => Some(1.0e-6),
        (Dimension::Length, "mil") => Some(25.4e-6),
        (Dimension::Length, "in") => Some(0.0254),
        _ => None,
    };
    factor
        .map(|f| number * f)
        .ok_or_else(|| format!("unit \"{unit}\" in \"{text}\" does not fit; accepted: {accepted}"))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn thresholds_parse_trade_units() {
        // 1 pli = 1 lbf/in = 4.448222 N / 0.0254 m = 175.127 N/m (exact definitions).
        let pli = parse_threshold("1 pli", Dimension::ForcePerWidth).unwrap();
        assert!((pli - 175.127).abs() < 0.01);
        // 1 psi = 6894.757 Pa (exact definition of the pound-force and inch).
        let psi = parse_threshold("10 psi", Dimension::Pressure).unwrap();
        assert!((psi - 68947.57).abs() < 0.1);
        assert!((parse_threshold("600 m/min", Dimension::Speed).unwrap() - 10.0).abs() < 1e-12);
        assert!((parse_threshold("5 %", Dimension::Fraction).unwrap() - 0.05).abs() < 1e-12);
        assert!(parse_threshold("5 pli", Dimension::Pressure).is_err());
    }

    #[test]
    fn values_format_readably() {
        assert_eq!(format_value(2.1e6, Dimension::Pressure), "2.1 MPa");
        assert_eq!(format_value(35_000.0, Dimension::Pressure), "35 kPa");
        assert_eq!(format_value(0.125, Dimension::Fraction), "12.5 %");
        assert_eq!(format_value(10.0, Dimension::Speed), "600 m/min");
    }
}
