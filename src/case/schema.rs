//! The case file as written: the serde structs of the YAML schema, before presets and unit
//! conversion. Names of materials, laws and methods stay text here (what the user typed); the
//! resolver turns them into the enums of `vocabulary` with a "did you mean" when they are not
//! known. Every key here has its entry in [`super::registry`] (a test checks).

use std::collections::BTreeMap;

use serde::{Deserialize, Serialize};

/// A quantity as written in a case file: a string with a unit, or a number in SI.
///
/// Read with its own visitor rather than `#[serde(untagged)]`: an untagged enum buffers the
/// value and loses its position, so a wrong type was blamed on the first key of the section.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(untagged)]
pub enum QuantityText {
    Number(f64),
    Text(String),
}

/// What a quantity must look like, for messages.
pub const QUANTITY_EXPECTED: &str = "a quantity: a string with its unit such as \"76 um\" or \"2 pli\", or a plain number in SI units";

impl<'de> Deserialize<'de> for QuantityText {
    fn deserialize<D: serde::Deserializer<'de>>(deserializer: D) -> Result<Self, D::Error> {
        struct Quantity;
        impl serde::de::Visitor<'_> for Quantity {
            type Value = QuantityText;

            fn expecting(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
                f.write_str(QUANTITY_EXPECTED)
            }

            fn visit_f64<E: serde::de::Error>(self, v: f64) -> Result<QuantityText, E> {
                Ok(QuantityText::Number(v))
            }

            fn visit_i64<E: serde::de::Error>(self, v: i64) -> Result<QuantityText, E> {
                Ok(QuantityText::Number(v as f64))
            }

            fn visit_u64<E: serde::de::Error>(self, v: u64) -> Result<QuantityText, E> {
                Ok(QuantityText::Number(v as f64))
            }

            fn visit_i128<E: serde::de::Error>(self, v: i128) -> Result<QuantityText, E> {
                Ok(QuantityText::Number(v as f64))
            }

            fn visit_u128<E: serde::de::Error>(self, v: u128) -> Result<QuantityText, E> {
                Ok(QuantityText::Number(v as f64))
            }

            fn visit_str<E: serde::de::Error>(self, v: &str) -> Result<QuantityText, E> {
                Ok(QuantityText::Text(v.to_string()))
            }
        }
        deserializer.deserialize_any(Quantity)
    }
}

/// The case file as written (before presets and unit conversion).
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Case {
    pub title: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub description: Option<String>,
    #[serde(default)]
    pub web: WebInput,
    #[serde(default)]
    pub core: CoreInput,
    #[serde(default)]
    pub roll: RollInput,
    #[serde(default)]
    pub winding: WindingInput,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub symptoms: Vec<ObservedSymptom>,
    /// Answers to symptom questions, by question ID ("yes" / "no" / "unknown" / a choice ID).
    #[serde(default, skip_serializing_if = "BTreeMap::is_empty")]
    pub answers: BTreeMap<String, String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub notes: Option<String>,
    /// The complaint record (docs/history.md); every field optional.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub complaint: Option<crate::complaint::Complaint>,
    /// What was measured on the bad roll (docs/evidence.md).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub measurements: Option<super::measurements::MeasurementsInput>,
}

#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WebInput {
    /// Preset ID (see `presets`), e.g. `newsprint`, `pet_film`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub preset: Option<String>,
    /// Material kind: paper, board, film, foil, nonwoven, laminate.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub material: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub thickness: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub width: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub tangential_modulus: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub radial_stiffness: Option<RadialStiffnessInput>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub poisson_ratio: Option<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub friction: Option<f64>,
    /// Kinetic web-to-web friction (nip-induced tension); `friction` is the static one.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub kinetic_friction: Option<f64>,
    /// Density of the web, kg/m³ (roll weight on drums, centrifugal unloading).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub density: Option<f64>,
    /// RMS roughness of one surface.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub roughness: Option<QuantityText>,
    /// Tensile strength per unit width (force per width).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub strength: Option<QuantityText>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RadialStiffnessInput {
    /// `pfeiffer`, `constant` or `power_law`.
    pub law: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub k1: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub k2: Option<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub modulus: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub coefficient: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub exponent: Option<f64>,
}

#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CoreInput {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub preset: Option<String>,
    /// paper, steel, aluminium, plastic, rigid.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub material: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub inside_diameter: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub outside_diameter: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub modulus: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub poisson_ratio: Option<f64>,
    /// Measured effective core stiffness Ec, overrides modulus/geometry.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub stiffness: Option<QuantityText>,
    /// Supplier's radial (bladder) crush pressure.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub crush_pressure: Option<QuantityText>,
    /// Radial (through-the-wall) modulus; `modulus` is the hoop modulus.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub radial_modulus: Option<QuantityText>,
    /// `free` or `shaft` (on an expanding shaft).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub support: Option<String>,
    /// Supplier's flat crush load per length of core (force per width, e.g. "40 kN/m").
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub flat_crush: Option<QuantityText>,
    /// Hoop compressive strength of the wall, for the crush estimate.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub compressive_strength: Option<QuantityText>,
}

#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RollInput {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub diameter: Option<QuantityText>,
    /// Wound length; used when diameter is not given.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub length: Option<QuantityText>,
}

#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WindingInput {
    /// centre, gap, surface, two_drum, centre_surface.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub method: Option<String>,
    /// Web tension at the start of the roll (force per width).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub tension: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub taper: Option<TaperInput>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub nip_load: Option<QuantityText>,
    /// Nip load against diameter; replaces `nip_load`.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub nip_programme: Vec<NipPointInput>,
    /// Nip load above which the nip-induced tension no longer grows.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub nip_plateau: Option<QuantityText>,
    /// Centre torque of a centre-surface winder (whole width).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub centre_torque: Option<QuantityText>,
    /// Drum geometry and torque differential of a two-drum winder.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub drums: Option<DrumsInput>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub speed: Option<QuantityText>,
    /// Bands of diameter wound at a different tension.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub upsets: Vec<UpsetInput>,
    /// Web temperature at the winder.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub temperature: Option<QuantityText>,
    /// Time to reach line speed (acceleration torque check), e.g. "20 s" as a plain number of seconds.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub acceleration_time: Option<f64>,
    /// The web tension this grade usually runs at on this winder (the recipe value), when known;
    /// the diagnosis judges the tension against it.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub recipe_tension: Option<QuantityText>,
    /// Time of a normal stop from line speed, seconds (slip check).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub stop_time: Option<f64>,
    /// Time of an emergency stop from line speed, seconds (slip check).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub emergency_stop_time: Option<f64>,
    /// Unwind tension at the customer (slip check when a full roll is braked).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub unwind_tension: Option<QuantityText>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TaperInput {
    /// none, linear, hyperbolic, steps.
    pub kind: String,
    /// Taper amount in percent ("25 %"), for linear and hyperbolic.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub amount: Option<QuantityText>,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub steps: Vec<StepInput>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct StepInput {
    pub from_diameter: QuantityText,
    pub tension: QuantityText,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct NipPointInput {
    pub diameter: QuantityText,
    pub nip_load: QuantityText,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DrumsInput {
    /// Drum diameter.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub diameter: Option<QuantityText>,
    /// Distance between the two drum centres.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub centre_distance: Option<QuantityText>,
    /// Front drum torque minus the torque of the drum the web wraps (whole width).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub torque_differential: Option<QuantityText>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct UpsetInput {
    pub from_diameter: QuantityText,
    pub to_diameter: QuantityText,
    pub tension: QuantityText,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ObservedSymptom {
    /// Symptom ID from `vocabulary::SYMPTOM_IDS`.
    pub id: String,
    /// core, body, outside, edges, whole_roll.
    #[serde(default, rename = "where", skip_serializing_if = "Option::is_none")]
    pub place: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub notes: Option<String>,
}

impl ObservedSymptom {
    /// Where the symptom was seen, when that is one of the known places (the resolver refuses
    /// any other word).
    pub fn where_seen(&self) -> Option<crate::vocabulary::Place> {
        self.place
            .as_deref()
            .and_then(crate::vocabulary::Place::from_id)
    }
}
