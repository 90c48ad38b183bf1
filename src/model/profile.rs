//! The result of a solve: per-node radius, pressure, tangential stress, strain, wound-in tension;
//! the named zones and summary figures.

use super::wound_in::AirFilm;

/// Zone names used by rules (see `docs/rules.md`). Cuts are defined in one place, in this module.
#[derive(
    Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, serde::Serialize, serde::Deserialize,
)]
#[serde(rename_all = "snake_case")]
pub enum ZoneName {
    Core,
    Inner,
    Middle,
    Outer,
    Surface,
}

impl ZoneName {
    pub const ALL: [ZoneName; 5] = [
        ZoneName::Core,
        ZoneName::Inner,
        ZoneName::Middle,
        ZoneName::Outer,
        ZoneName::Surface,
    ];
    pub fn as_str(self) -> &'static str {
        match self {
            ZoneName::Core => "core",
            ZoneName::Inner => "inner",
            ZoneName::Middle => "middle",
            ZoneName::Outer => "outer",
            ZoneName::Surface => "surface",
        }
    }
}

/// A named zone: a contiguous range of nodes `[start, end)` and its radii (m).
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct Zone {
    pub name: ZoneName,
    pub start: usize,
    pub end: usize,
    pub inner_radius: f64,
    pub outer_radius: f64,
}

/// Summary figures of a profile.
#[derive(Debug, Clone, PartialEq, Default, serde::Serialize, serde::Deserialize)]
pub struct ProfileSummary {
    /// Pressure on the core (Pa).
    pub core_pressure: f64,
    pub peak_pressure: f64,
    pub peak_pressure_radius: f64,
    /// Most compressive (lowest) tangential stress (Pa) and where.
    pub min_tangential_stress: f64,
    pub min_tangential_radius: f64,
    pub physical_layers: usize,
    pub elements: usize,
    pub layers_per_element: usize,
}

/// Stress state of the finished roll, node 0 at the core surface, last node at the outside.
#[derive(Debug, Clone, PartialEq, Default, serde::Serialize, serde::Deserialize)]
pub struct Profile {
    /// m
    pub radius: Vec<f64>,
    /// Interlayer pressure, Pa, positive in compression.
    pub pressure: Vec<f64>,
    /// σθ, Pa, positive in tension.
    pub tangential_stress: Vec<f64>,
    /// Radial strain (compressive positive), dimensionless.
    pub radial_strain: Vec<f64>,
    /// Wound-in tension per unit width at the time the node was wound (N/m).
    pub wound_in_tension: Vec<f64>,
    pub zones: Vec<Zone>,
    pub summary: ProfileSummary,
    /// Air-film estimate at the core start and at the outside.
    pub air_film: Option<(AirFilm, AirFilm)>,
    /// Human-readable warnings (e.g. nip load outside the validity of the nip model).
    pub warnings: Vec<String>,
}

impl Profile {
    pub fn zone(&self, name: ZoneName) -> Option<&Zone> {
        self.zones.iter().find(|z| z.name == name)
    }
}
