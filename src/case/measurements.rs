//! The `measurements` section of a case file: what was measured on the bad roll, as written
//! (quantities with units), and its resolution into the SI types of [`crate::evidence`].
//! Docs: docs/case-format.md (`measurements`) and docs/evidence.md.

use serde::{Deserialize, Serialize};

use super::{CaseError, QuantityText};
use crate::evidence::{
    BendDirection, BendPlace, CalibrationPoint, EndLine, EvidenceError, HardnessProfile,
    HardnessReading, LaneHardness, LaneReading, Measurements, RollSet, RollSize, SizeUncertainty,
    WoundAmount,
};
use crate::units::{QuantityKind, parse_quantity};

/// The section as written.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MeasurementsInput {
    /// Measured outside diameter of the roll.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub diameter: Option<QuantityText>,
    /// Wound length (length counter), or `weight` with `basis_weight`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub length: Option<QuantityText>,
    /// Net weight of web on the roll (core weight taken off).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub weight: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub basis_weight: Option<QuantityText>,
    /// Width of the roll, when the weight is given and the web width is not.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub width: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub uncertainty: Option<UncertaintyInput>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub hardness: Option<HardnessInput>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub lanes: Option<LanesInput>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub end_line: Option<EndLineInput>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub core_bore_reduction: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub set: Option<SetInput>,
}

#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct UncertaintyInput {
    /// Of the length or weight, a percentage.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub amount: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub diameter: Option<QuantityText>,
    /// Of the caliper, a percentage.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub caliper: Option<QuantityText>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ReadingInput {
    pub diameter: QuantityText,
    pub value: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CalibrationInput {
    pub reading: f64,
    pub pressure: QuantityText,
}

#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct HardnessInput {
    /// `false` for a tester whose reading falls as the roll gets harder.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub higher_is_harder: Option<bool>,
    #[serde(default)]
    pub readings: Vec<ReadingInput>,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub calibration: Vec<CalibrationInput>,
}

#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LanesInput {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub higher_is_harder: Option<bool>,
    /// One reading per lane, lane 1 (the reference edge) first.
    #[serde(default)]
    pub readings: Vec<f64>,
}

/// Where the line on the roll end bends.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum BendInput {
    Straight,
    NearCore,
    Band,
    Throughout,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct EndLineInput {
    pub bend: BendInput,
    /// For `band`: the band's diameters.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub from_diameter: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub to_diameter: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub direction: Option<BendDirection>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub offset: Option<QuantityText>,
}

/// The set of rolls as written: it holds counts and names only (no quantities to parse), so
/// the case file writes the evidence type itself.
pub type SetInput = RollSet;

impl MeasurementsInput {
    /// True when the section holds nothing.
    pub fn is_empty(&self) -> bool {
        *self == MeasurementsInput::default()
    }
}

struct Reader<'a> {
    origin: &'a str,
}

impl Reader<'_> {
    fn out_of_range(&self, field: &str, given: String, accepted: &str) -> CaseError {
        CaseError::OutOfRange {
            origin: self.origin.to_string(),
            field: field.to_string(),
            given,
            accepted: accepted.to_string(),
        }
    }

    fn quantity(
        &self,
        field: &str,
        value: &QuantityText,
        kind: QuantityKind,
    ) -> Result<f64, CaseError> {
        match value {
            QuantityText::Number(n) if n.is_finite() => Ok(*n),
            QuantityText::Number(n) => {
                Err(self.out_of_range(field, n.to_string(), "a finite number"))
            }
            QuantityText::Text(text) => {
                parse_quantity(field, text, kind).map_err(|e| CaseError::Quantity {
                    origin: self.origin.to_string(),
                    error: Box::new(e),
                })
            }
        }
    }

    fn optional(
        &self,
        field: &str,
        value: Option<&QuantityText>,
        kind: QuantityKind,
    ) -> Result<Option<f64>, CaseError> {
        value.map(|v| self.quantity(field, v, kind)).transpose()
    }
}

/// Resolve the section into SI. `web_width` is the case's web width when it was given (not
/// assumed): a weight needs a width to become a length. `None` for an empty section.
pub fn resolve(
    input: &MeasurementsInput,
    origin: &str,
    web_width: Option<f64>,
) -> Result<Option<Measurements>, CaseError> {
    if input.is_empty() {
        return Ok(None);
    }
    let r = Reader { origin };
    let mut out = Measurements {
        size: size(&r, input, web_width)?,
        ..Measurements::default()
    };
    if let Some(h) = &input.hardness {
        out.hardness = Some(HardnessProfile {
            readings: h
                .readings
                .iter()
                .enumerate()
                .map(|(i, x)| {
                    let field = format!("measurements.hardness.readings[{i}].diameter");
                    Ok(HardnessReading {
                        diameter: r.quantity(&field, &x.diameter, QuantityKind::Length)?,
                        value: x.value,
                    })
                })
                .collect::<Result<_, CaseError>>()?,
            higher_is_harder: h.higher_is_harder.unwrap_or(true),
            calibration: h
                .calibration
                .iter()
                .enumerate()
                .map(|(i, c)| {
                    let field = format!("measurements.hardness.calibration[{i}].pressure");
                    Ok(CalibrationPoint {
                        reading: c.reading,
                        pressure: r.quantity(&field, &c.pressure, QuantityKind::Stress)?,
                    })
                })
                .collect::<Result<_, CaseError>>()?,
        });
    }
    if let Some(l) = &input.lanes {
        out.lanes = Some(LaneHardness {
            readings: l
                .readings
                .iter()
                .enumerate()
                .map(|(i, &value)| LaneReading {
                    lane: i as u32 + 1,
                    value,
                })
                .collect(),
            higher_is_harder: l.higher_is_harder.unwrap_or(true),
        });
    }
    if let Some(e) = &input.end_line {
        out.end_line = Some(end_line(&r, e)?);
    }
    out.core_bore_reduction = r.optional(
        "measurements.core_bore_reduction",
        input.core_bore_reduction.as_ref(),
        QuantityKind::Length,
    )?;
    out.set = input.set.clone();
    out.validate().map_err(|e| match e {
        EvidenceError::OutOfRange {
            field,
            value,
            accepted,
        } => r.out_of_range(&field, value, &accepted),
        other => CaseError::Invalid {
            origin: origin.to_string(),
            message: other.to_string(),
        },
    })?;
    Ok(Some(out))
}

fn size(
    r: &Reader<'_>,
    input: &MeasurementsInput,
    web_width: Option<f64>,
) -> Result<Option<RollSize>, CaseError> {
    let diameter = r.optional(
        "measurements.diameter",
        input.diameter.as_ref(),
        QuantityKind::Length,
    )?;
    let length = r.optional(
        "measurements.length",
        input.length.as_ref(),
        QuantityKind::Length,
    )?;
    let weight = r.optional(
        "measurements.weight",
        input.weight.as_ref(),
        QuantityKind::Mass,
    )?;
    let basis = r.optional(
        "measurements.basis_weight",
        input.basis_weight.as_ref(),
        QuantityKind::BasisWeight,
    )?;
    let width = r.optional(
        "measurements.width",
        input.width.as_ref(),
        QuantityKind::Length,
    )?;
    let amount = match (length, weight) {
        (Some(_), Some(_)) => {
            return Err(r.out_of_range(
                "measurements.weight",
                "given with measurements.length".into(),
                "either the wound length or the weight, not both",
            ));
        }
        (Some(length), None) => Some(WoundAmount::Length { length }),
        (None, Some(weight)) => {
            let Some(basis_weight) = basis else {
                return Err(r.out_of_range(
                    "measurements.basis_weight",
                    "missing".into(),
                    "a basis weight (e.g. \"45 g/m2\") with measurements.weight",
                ));
            };
            let Some(width) = width.or(web_width) else {
                return Err(r.out_of_range(
                    "measurements.width",
                    "missing".into(),
                    "the roll's width (web.width or measurements.width) with measurements.weight",
                ));
            };
            Some(WoundAmount::Weight {
                weight,
                basis_weight,
                width,
            })
        }
        (None, None) => None,
    };
    match (diameter, amount) {
        (Some(diameter), Some(amount)) => {
            let defaults = SizeUncertainty::default();
            let u = input.uncertainty.clone().unwrap_or_default();
            let pick = |field: &str, v: Option<&QuantityText>, kind, default: f64| {
                Ok::<f64, CaseError>(r.optional(field, v, kind)?.unwrap_or(default))
            };
            Ok(Some(RollSize {
                diameter,
                amount,
                uncertainty: SizeUncertainty {
                    amount: pick(
                        "measurements.uncertainty.amount",
                        u.amount.as_ref(),
                        QuantityKind::Percent,
                        defaults.amount,
                    )?,
                    diameter: pick(
                        "measurements.uncertainty.diameter",
                        u.diameter.as_ref(),
                        QuantityKind::Length,
                        defaults.diameter,
                    )?,
                    caliper: pick(
                        "measurements.uncertainty.caliper",
                        u.caliper.as_ref(),
                        QuantityKind::Percent,
                        defaults.caliper,
                    )?,
                },
            }))
        }
        (None, None) => Ok(None),
        (Some(_), None) => Err(r.out_of_range(
            "measurements.diameter",
            "given alone".into(),
            "a diameter with measurements.length, or with measurements.weight and basis_weight",
        )),
        (None, Some(_)) => Err(r.out_of_range(
            "measurements.diameter",
            "missing".into(),
            "the measured diameter with the wound length or weight",
        )),
    }
}

fn end_line(r: &Reader<'_>, e: &EndLineInput) -> Result<EndLine, CaseError> {
    let from = r.optional(
        "measurements.end_line.from_diameter",
        e.from_diameter.as_ref(),
        QuantityKind::Length,
    )?;
    let to = r.optional(
        "measurements.end_line.to_diameter",
        e.to_diameter.as_ref(),
        QuantityKind::Length,
    )?;
    let bend = match e.bend {
        BendInput::Straight => BendPlace::Straight,
        BendInput::NearCore => BendPlace::NearCore,
        BendInput::Throughout => BendPlace::Throughout,
        BendInput::Band => match (from, to) {
            (Some(from_diameter), Some(to_diameter)) => BendPlace::Band {
                from_diameter,
                to_diameter,
            },
            _ => {
                return Err(r.out_of_range(
                    "measurements.end_line",
                    "band without from_diameter and to_diameter".into(),
                    "bend: band with from_diameter and to_diameter",
                ));
            }
        },
    };
    if !matches!(e.bend, BendInput::Band) && (from.is_some() || to.is_some()) {
        return Err(r.out_of_range(
            "measurements.end_line.from_diameter",
            "given for a bend that is not a band".into(),
            "from_diameter and to_diameter only with bend: band",
        ));
    }
    Ok(EndLine {
        bend,
        direction: e.direction,
        offset: r.optional(
            "measurements.end_line.offset",
            e.offset.as_ref(),
            QuantityKind::Length,
        )?,
    })
}
