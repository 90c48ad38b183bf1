//! What people can measure on a finished (or complained-about) roll, in SI: its size for a known
//! length or weight, hardness readings along the radius and across the width, a straight line
//! drawn on the roll end, the closing of the core bore, and which rolls of the set are bad.
//!
//! The case layer turns the user's units into these types; [`Measurements::validate`] checks
//! them again so direct library use cannot feed the comparisons nonsense.

use serde::{Deserialize, Serialize};

use super::EvidenceError;

/// Everything measured on the roll. Every part is optional: a measurement not taken is neutral.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct Measurements {
    /// Outside diameter for a known wound length (or net weight).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub size: Option<RollSize>,
    /// Hardness readings at several diameters (any tester, its own scale).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub hardness: Option<HardnessProfile>,
    /// Hardness readings across the width, one per lane.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub lanes: Option<LaneHardness>,
    /// A straight radial line drawn on the roll end before unwinding or handling.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub end_line: Option<EndLine>,
    /// How much the core's inside diameter closed (m), measured on the bad roll.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub core_bore_reduction: Option<f64>,
    /// The set the roll came from: how many rolls are bad and where they sat.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub set: Option<RollSet>,
}

/// Relative (or absolute) uncertainties of the size measurement, used to weight the density in
/// the inverse estimate and to say how far a density difference can be trusted.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct SizeUncertainty {
    /// Standard uncertainty of the wound length (or weight), as a share (0.005 = 0.5 %).
    pub amount: f64,
    /// Standard uncertainty of the diameter (m).
    pub diameter: f64,
    /// Standard uncertainty of the web caliper, as a share.
    pub caliper: f64,
}

impl Default for SizeUncertainty {
    /// Order-of-magnitude defaults, each `(from memory)`: a length counter or roll scale within
    /// about 0.5 %, a diameter tape read to about 1 mm, and a caliper known to about 2 % (the
    /// spread of caliper readings along and across a reel is of that order).
    fn default() -> Self {
        SizeUncertainty {
            amount: 0.005,
            diameter: 1.0e-3,
            caliper: 0.02,
        }
    }
}

/// Roll diameter with the wound length or the net weight of web on the roll.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RollSize {
    /// Measured outside diameter (m).
    pub diameter: f64,
    pub amount: WoundAmount,
    #[serde(default)]
    pub uncertainty: SizeUncertainty,
}

/// How much web is on the roll.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum WoundAmount {
    /// Wound length (m), e.g. from the winder's length counter.
    Length { length: f64 },
    /// Net weight of web (kg, the core's weight taken off), the web's basis weight (kg/m²) and
    /// the roll's width (m): length = weight / (basis weight · width).
    Weight {
        weight: f64,
        basis_weight: f64,
        width: f64,
    },
}

impl WoundAmount {
    /// Wound length (m).
    pub fn length(&self) -> f64 {
        match *self {
            WoundAmount::Length { length } => length,
            WoundAmount::Weight {
                weight,
                basis_weight,
                width,
            } => weight / (basis_weight * width),
        }
    }

    /// Basis weight (kg/m²) when known, for a density in kg/m³.
    pub fn basis_weight(&self) -> Option<f64> {
        match *self {
            WoundAmount::Length { .. } => None,
            WoundAmount::Weight { basis_weight, .. } => Some(basis_weight),
        }
    }
}

/// One hardness reading at a diameter, in the tester's own units.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct HardnessReading {
    /// Diameter at which it was taken (m).
    pub diameter: f64,
    pub value: f64,
}

/// One point of a calibration of tester readings to interlayer pressure.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct CalibrationPoint {
    pub reading: f64,
    /// Interlayer pressure (Pa) that gives this reading.
    pub pressure: f64,
}

/// Hardness readings along the radius.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct HardnessProfile {
    pub readings: Vec<HardnessReading>,
    /// True (the usual case) when a higher reading means a harder roll.
    #[serde(default = "yes")]
    pub higher_is_harder: bool,
    /// Optional calibration of readings to interlayer pressure (at least two points, readings
    /// strictly increasing, pressure strictly monotone): turns readings into pressures.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub calibration: Vec<CalibrationPoint>,
}

fn yes() -> bool {
    true
}

/// A hardness reading in one lane across the width.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct LaneReading {
    /// Lane number across the width (1 = the lane at the reference edge).
    pub lane: u32,
    pub value: f64,
}

/// Hardness readings across the width.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct LaneHardness {
    pub readings: Vec<LaneReading>,
    #[serde(default = "yes")]
    pub higher_is_harder: bool,
}

/// Where the line on the roll end bends.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum BendPlace {
    /// The line stayed straight: no interlayer slip.
    Straight,
    /// It bends in the first wraps near the core.
    NearCore,
    /// It bends in a band between two diameters (m).
    Band {
        from_diameter: f64,
        to_diameter: f64,
    },
    /// It curves gradually over the whole radius.
    Throughout,
}

/// Which way the inner part turned relative to the outer part.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum BendDirection {
    /// Inner layers ran ahead in the direction the roll turned when winding.
    WithWinding,
    /// Inner layers fell behind.
    AgainstWinding,
}

/// A straight radial line drawn on the roll end.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct EndLine {
    pub bend: BendPlace,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub direction: Option<BendDirection>,
    /// Largest sideways offset of the line (m), measured along the circumference.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub offset: Option<f64>,
}

/// Where in the parent roll the set was slit from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum ParentPosition {
    Outside,
    Middle,
    NearCore,
}

/// The set of rolls slit side by side from one parent roll (also the case file's
/// `measurements.set` as written, hence no unknown keys).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RollSet {
    /// Rolls in the set (slit positions 1..=rolls across the width).
    pub rolls: u32,
    /// How many of them are bad.
    pub bad: u32,
    /// Slit positions of the bad rolls (1 and `rolls` are the two edges).
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub bad_positions: Vec<u32>,
    /// Name or number of the parent (jumbo) roll.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub parent_roll: Option<String>,
    /// Where in the parent roll this set came from.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub position_in_parent: Option<ParentPosition>,
    /// Parent rolls looked at, and how many of them gave bad rolls.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub parent_rolls: Option<u32>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub bad_parent_rolls: Option<u32>,
}

fn positive(field: &str, value: f64) -> Result<(), EvidenceError> {
    if value.is_finite() && value > 0.0 {
        Ok(())
    } else {
        Err(EvidenceError::OutOfRange {
            field: field.to_string(),
            value: value.to_string(),
            accepted: "a finite value > 0".into(),
        })
    }
}

fn finite(field: &str, value: f64) -> Result<(), EvidenceError> {
    if value.is_finite() {
        Ok(())
    } else {
        Err(EvidenceError::OutOfRange {
            field: field.to_string(),
            value: value.to_string(),
            accepted: "a finite number".into(),
        })
    }
}

/// A length or pressure of 0 or more; `accepted` says which ("a length ≥ 0").
fn not_negative(field: &str, value: f64, accepted: &str) -> Result<(), EvidenceError> {
    if value.is_finite() && value >= 0.0 {
        Ok(())
    } else {
        Err(EvidenceError::OutOfRange {
            field: field.to_string(),
            value: value.to_string(),
            accepted: accepted.into(),
        })
    }
}

impl Measurements {
    /// True when nothing was measured.
    pub fn is_empty(&self) -> bool {
        *self == Measurements::default()
    }

    /// Check ranges and consistency; errors name the field (`measurements.…`) and what is
    /// accepted.
    pub fn validate(&self) -> Result<(), EvidenceError> {
        if let Some(size) = &self.size {
            positive("measurements.size.diameter", size.diameter)?;
            match size.amount {
                WoundAmount::Length { length } => positive("measurements.size.length", length)?,
                WoundAmount::Weight {
                    weight,
                    basis_weight,
                    width,
                } => {
                    positive("measurements.size.weight", weight)?;
                    positive("measurements.size.basis_weight", basis_weight)?;
                    positive("measurements.size.width", width)?;
                }
            }
            let u = size.uncertainty;
            for (field, value) in [
                ("measurements.size.uncertainty.amount", u.amount),
                ("measurements.size.uncertainty.diameter", u.diameter),
                ("measurements.size.uncertainty.caliper", u.caliper),
            ] {
                positive(field, value)?;
            }
        }
        if let Some(h) = &self.hardness {
            if h.readings.len() < 2 {
                return Err(EvidenceError::OutOfRange {
                    field: "measurements.hardness.readings".into(),
                    value: format!("{} reading(s)", h.readings.len()),
                    accepted: "at least 2 readings at different diameters".into(),
                });
            }
            for r in &h.readings {
                positive("measurements.hardness.readings.diameter", r.diameter)?;
                finite("measurements.hardness.readings.value", r.value)?;
            }
            validate_calibration(&h.calibration)?;
        }
        if let Some(l) = &self.lanes {
            if l.readings.len() < 2 {
                return Err(EvidenceError::OutOfRange {
                    field: "measurements.lanes.readings".into(),
                    value: format!("{} reading(s)", l.readings.len()),
                    accepted: "at least 2 lanes".into(),
                });
            }
            for r in &l.readings {
                finite("measurements.lanes.readings.value", r.value)?;
            }
        }
        if let Some(line) = &self.end_line {
            if let BendPlace::Band {
                from_diameter,
                to_diameter,
            } = line.bend
            {
                positive("measurements.end_line.from_diameter", from_diameter)?;
                if !(to_diameter.is_finite() && to_diameter > from_diameter) {
                    return Err(EvidenceError::OutOfRange {
                        field: "measurements.end_line.to_diameter".into(),
                        value: to_diameter.to_string(),
                        accepted: "a diameter larger than from_diameter".into(),
                    });
                }
            }
            if let Some(offset) = line.offset {
                not_negative("measurements.end_line.offset", offset, "a length ≥ 0")?;
            }
        }
        if let Some(b) = self.core_bore_reduction {
            not_negative("measurements.core_bore_reduction", b, "a length ≥ 0")?;
        }
        if let Some(set) = &self.set {
            validate_set(set)?;
        }
        Ok(())
    }
}

fn validate_calibration(points: &[CalibrationPoint]) -> Result<(), EvidenceError> {
    if points.is_empty() {
        return Ok(());
    }
    let bad = |accepted: &str| EvidenceError::OutOfRange {
        field: "measurements.hardness.calibration".into(),
        value: format!("{} point(s)", points.len()),
        accepted: accepted.into(),
    };
    if points.len() < 2 {
        return Err(bad("at least 2 points (reading, pressure)"));
    }
    for p in points {
        finite("measurements.hardness.calibration.reading", p.reading)?;
        not_negative(
            "measurements.hardness.calibration.pressure",
            p.pressure,
            "a pressure ≥ 0",
        )?;
    }
    let rising = points.windows(2).all(|w| w[1].reading > w[0].reading);
    let up = points.windows(2).all(|w| w[1].pressure > w[0].pressure);
    let down = points.windows(2).all(|w| w[1].pressure < w[0].pressure);
    if !rising || !(up || down) {
        return Err(bad(
            "readings strictly increasing and pressures strictly increasing (or strictly decreasing)",
        ));
    }
    Ok(())
}

fn validate_set(set: &RollSet) -> Result<(), EvidenceError> {
    let bad = |field: &str, value: String, accepted: String| EvidenceError::OutOfRange {
        field: format!("measurements.set.{field}"),
        value,
        accepted,
    };
    if set.rolls == 0 {
        return Err(bad("rolls", "0".into(), "at least 1 roll".into()));
    }
    if set.bad > set.rolls {
        return Err(bad(
            "bad",
            set.bad.to_string(),
            format!("0 to {} (the rolls in the set)", set.rolls),
        ));
    }
    for &p in &set.bad_positions {
        if p == 0 || p > set.rolls {
            return Err(bad(
                "bad_positions",
                p.to_string(),
                format!("slit positions 1 to {}", set.rolls),
            ));
        }
    }
    if set.bad_positions.len() > set.bad as usize {
        return Err(bad(
            "bad_positions",
            format!("{} positions", set.bad_positions.len()),
            format!("at most {} (the bad rolls)", set.bad),
        ));
    }
    match (set.parent_rolls, set.bad_parent_rolls) {
        (Some(0), _) => Err(bad("parent_rolls", "0".into(), "at least 1".into())),
        (Some(n), Some(b)) if b > n => Err(bad(
            "bad_parent_rolls",
            b.to_string(),
            format!("0 to {n} (the parent rolls looked at)"),
        )),
        (None, Some(_)) => Err(bad(
            "bad_parent_rolls",
            "given without parent_rolls".into(),
            "both parent_rolls and bad_parent_rolls".into(),
        )),
        _ => Ok(()),
    }
}
