//! The resolved case: every value in SI with presets applied, the enums of `vocabulary` in
//! place of names, and the list of values that were assumed. What the model and the rules
//! consume.

use std::collections::BTreeMap;

use serde::{Deserialize, Serialize};

use super::ObservedSymptom;
use crate::vocabulary::{CoreMaterial, WebMaterial};

/// A case resolved into SI with presets applied: what the model and the rules consume.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ResolvedCase {
    pub title: String,
    pub web: ResolvedWeb,
    pub core: ResolvedCore,
    pub roll: ResolvedRoll,
    pub winding: ResolvedWinding,
    pub symptoms: Vec<ObservedSymptom>,
    pub answers: BTreeMap<String, String>,
    /// Values that were not given and came from a preset or default.
    pub assumed: Vec<AssumedValue>,
    /// What was measured on the bad roll (docs/evidence.md); `None` when nothing was.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub measurements: Option<crate::evidence::Measurements>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ResolvedWeb {
    /// Preset ID used for missing values, if any.
    pub preset: Option<String>,
    pub material: WebMaterial,
    /// m
    pub thickness: f64,
    /// m
    pub width: f64,
    /// Pa
    pub tangential_modulus: f64,
    pub radial_stiffness: crate::model::RadialStiffness,
    pub poisson_ratio: f64,
    /// Static web-to-web friction (slip checks).
    pub friction: f64,
    /// Kinetic web-to-web friction (nip-induced tension).
    pub kinetic_friction: f64,
    /// kg/m³
    pub density: f64,
    /// RMS roughness of one surface, m
    pub roughness: f64,
    /// Tensile strength per width, N/m
    pub strength: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ResolvedCore {
    pub preset: Option<String>,
    pub material: CoreMaterial,
    /// m
    pub inside_diameter: f64,
    /// m
    pub outside_diameter: f64,
    pub stiffness: crate::model::CoreStiffness,
    /// Interlayer pressure on the core the core is judged to carry (Pa).
    pub crush_pressure: f64,
    /// The state the core was judged in (and wound in).
    pub support: crate::model::CoreSupport,
    /// What `crush_pressure` rests on.
    pub crush_basis: crate::model::core_crush::CrushBasis,
    /// Torque rating of the chuck or shaft holding the core, N·m for the whole width; `None`
    /// when the case gives none (the core/shaft interface is then not checked).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub shaft_torque_rating: Option<f64>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ResolvedRoll {
    /// m
    pub outer_diameter: f64,
    /// Wound length, m
    pub length: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ResolvedWinding {
    pub method: crate::model::WindingMethod,
    pub tension: crate::model::TensionSchedule,
    /// N/m
    pub nip_load: Option<f64>,
    /// Nip load against radius; replaces `nip_load` where given.
    pub nip_programme: Option<crate::model::NipProgramme>,
    /// Knee of the nip-induced tension's levelling-off, N/m.
    pub nip_plateau: f64,
    /// Centre torque per width (N·m per m) of a centre-surface winder.
    pub centre_torque: Option<f64>,
    /// Two-drum geometry (torque differential per width).
    pub drums: Option<crate::model::DrumSet>,
    /// m/s
    pub speed: f64,
    /// °C
    pub temperature: Option<f64>,
    /// s
    pub acceleration_time: Option<f64>,
    /// N/m: the tension this grade usually runs at (recipe value), when the case states it.
    #[serde(default)]
    pub recipe_tension: Option<f64>,
    /// Normal stop time, s (`None`: the acceleration time, else the mechanics default).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub stop_time: Option<f64>,
    /// Emergency stop time, s (`None`: the mechanics default).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub emergency_stop_time: Option<f64>,
    /// Unwind tension at the customer, N/m (`None`: the tension the outside was wound at).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub unwind_tension: Option<f64>,
    /// Dynamic factor on the roll's weight in handling as given; `None` takes
    /// [`crate::mechanics::DEFAULT_SHOCK_FACTOR`] (listed as assumed by the resolver).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub handling_shock_factor: Option<f64>,
}

/// One value that was not in the case file.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct AssumedValue {
    /// Dotted field path, e.g. `web.tangential_modulus`.
    pub field: String,
    /// The value used, formatted with its unit.
    pub value: String,
    /// Where it came from: preset ID and the value's source note.
    pub source: String,
    /// Whether it was left out, copied unchanged from its preset, or computed from others.
    #[serde(default)]
    pub origin: ValueOrigin,
}

/// How a value of [`ResolvedCase::assumed`] came about. All three are guesses of a kind: the
/// results say how much of the answer rests on them.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum ValueOrigin {
    /// Not in the case file: taken from a preset or a fixed default.
    #[default]
    Default,
    /// In the case file but equal to the named preset's (or the fixed default's) value, as
    /// `case new` writes it: still the preset's value, not a measurement.
    Preset,
    /// Computed from other inputs (wound length from the diameters and the caliper, ...).
    Computed,
}

impl AssumedValue {
    /// True for a value the case file did not give at all (not a preset copy or computed).
    pub fn is_default(&self) -> bool {
        self.origin == ValueOrigin::Default
    }

    /// True for a value given in another form and converted (a tension written as a web
    /// stress or a total force): given, but worth echoing back in the unit the model uses.
    pub fn is_conversion(&self) -> bool {
        self.origin == ValueOrigin::Computed && self.source.starts_with("converted from")
    }
}

impl ResolvedCase {
    /// The mass of the wound web (kg), core left out: [`crate::model::winder::roll_mass`] with
    /// the web's density and width and the roll's and core's outside diameters.
    pub fn roll_mass(&self) -> f64 {
        crate::model::winder::roll_mass(
            self.web.density,
            self.roll.outer_diameter / 2.0,
            self.core.outside_diameter / 2.0,
            self.web.width,
        )
    }

    /// The mechanics problem for this case.
    pub fn problem(&self, options: crate::model::SolverOptions) -> crate::model::WindingProblem {
        crate::model::WindingProblem {
            core_radius: self.core.outside_diameter / 2.0,
            outer_radius: self.roll.outer_diameter / 2.0,
            thickness: self.web.thickness,
            tangential_modulus: self.web.tangential_modulus,
            radial_stiffness: self.web.radial_stiffness,
            poisson_ratio: self.web.poisson_ratio,
            core: self.core.stiffness,
            winding: crate::model::WindingSetup {
                method: self.winding.method,
                tension: self.winding.tension.clone(),
                nip_load: self.winding.nip_load,
                nip_programme: self.winding.nip_programme.clone(),
                friction: self.web.friction,
                kinetic_friction: Some(self.web.kinetic_friction),
                speed: self.winding.speed,
                // Two contacting surfaces of the same web: RMS roughnesses add in quadrature.
                combined_roughness: self.web.roughness * std::f64::consts::SQRT_2,
                nip_plateau_load: Some(self.winding.nip_plateau),
                centre_torque: self.winding.centre_torque,
                drums: self.winding.drums,
                web_density: Some(self.web.density),
                permeable_web: matches!(
                    self.web.material,
                    WebMaterial::Paper | WebMaterial::Board | WebMaterial::Nonwoven
                ),
                nonwoven: self.web.material == WebMaterial::Nonwoven,
            },
            options,
        }
    }

    /// Nip-induced tension (N/m) of the first wrap on the core, as the model computes it
    /// (kinetic friction, levelling-off, drum weight share).
    pub fn nip_induced_tension_at_core(&self) -> f64 {
        let rc = self.core.outside_diameter / 2.0;
        self.problem(crate::model::SolverOptions::default())
            .winding
            .nip_induced_tension_at(rc, rc)
    }
}
