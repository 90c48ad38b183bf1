//! The JSON layout of a [`Profile`]: the solver's figures (grid and work) are written inside
//! `summary`, between the physics fields, in the order outputs have always had, so a profile
//! split into physics and solver figures still reads and writes the same documents.

use super::{AirFilm, Band, Grid, Profile, ProfileSummary, SolverStats, Zone};

#[derive(serde::Serialize, serde::Deserialize)]
pub(super) struct ProfileRecord {
    radius: Vec<f64>,
    pressure: Vec<f64>,
    tangential_stress: Vec<f64>,
    radial_strain: Vec<f64>,
    wound_in_tension: Vec<f64>,
    zones: Vec<Zone>,
    summary: SummaryRecord,
    air_film: Option<(AirFilm, AirFilm)>,
    warnings: Vec<String>,
    #[serde(default)]
    thickness: f64,
}

#[derive(serde::Serialize, serde::Deserialize)]
struct SummaryRecord {
    core_pressure: f64,
    peak_pressure: f64,
    peak_pressure_radius: f64,
    min_tangential_stress: f64,
    min_tangential_radius: f64,
    physical_layers: usize,
    elements: usize,
    layers_per_element: usize,
    #[serde(default)]
    core_radial_strain: f64,
    #[serde(default)]
    compressive_low_pressure_band: Option<Band>,
    #[serde(default)]
    outer_low_pressure_share: f64,
    #[serde(default)]
    group_halving_change: Option<f64>,
    #[serde(default)]
    increments: usize,
    #[serde(default)]
    solves: usize,
}

impl From<Profile> for ProfileRecord {
    fn from(p: Profile) -> Self {
        let s = p.summary;
        let stats = p.solver;
        ProfileRecord {
            radius: p.radius,
            pressure: p.pressure,
            tangential_stress: p.tangential_stress,
            radial_strain: p.radial_strain,
            wound_in_tension: p.wound_in_tension,
            zones: p.zones,
            summary: SummaryRecord {
                core_pressure: s.core_pressure,
                peak_pressure: s.peak_pressure,
                peak_pressure_radius: s.peak_pressure_radius,
                min_tangential_stress: s.min_tangential_stress,
                min_tangential_radius: s.min_tangential_radius,
                physical_layers: s.physical_layers,
                elements: stats.elements,
                layers_per_element: stats.grid.layers_per_element,
                core_radial_strain: s.core_radial_strain,
                compressive_low_pressure_band: s.compressive_low_pressure_band,
                outer_low_pressure_share: s.outer_low_pressure_share,
                group_halving_change: stats.group_halving_change,
                increments: stats.increments,
                solves: stats.solves,
            },
            air_film: p.air_film,
            warnings: p.warnings,
            thickness: p.thickness,
        }
    }
}

impl From<ProfileRecord> for Profile {
    fn from(r: ProfileRecord) -> Self {
        let s = r.summary;
        Profile {
            radius: r.radius,
            pressure: r.pressure,
            tangential_stress: r.tangential_stress,
            radial_strain: r.radial_strain,
            wound_in_tension: r.wound_in_tension,
            zones: r.zones,
            summary: ProfileSummary {
                core_pressure: s.core_pressure,
                peak_pressure: s.peak_pressure,
                peak_pressure_radius: s.peak_pressure_radius,
                min_tangential_stress: s.min_tangential_stress,
                min_tangential_radius: s.min_tangential_radius,
                physical_layers: s.physical_layers,
                core_radial_strain: s.core_radial_strain,
                compressive_low_pressure_band: s.compressive_low_pressure_band,
                outer_low_pressure_share: s.outer_low_pressure_share,
            },
            solver: SolverStats {
                grid: Grid {
                    layers_per_element: s.layers_per_element,
                },
                elements: s.elements,
                increments: s.increments,
                solves: s.solves,
                group_halving_change: s.group_halving_change,
            },
            air_film: r.air_film,
            warnings: r.warnings,
            thickness: r.thickness,
        }
    }
}
