//! Wound-in tension from the winding method (web tension, nip, centre-wind torque) and the
//! entrained-air film estimate.

use super::schedule::TensionSchedule;

#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum WindingMethod {
    #[default]
    Centre,
    Surface,
    CentreSurface,
}

/// Winding settings in SI.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct WindingSetup {
    pub method: WindingMethod,
    /// Web tension schedule (N/m).
    pub tension: TensionSchedule,
    /// Nip load per unit width (N/m); `None` when no nip/rider roll.
    pub nip_load: Option<f64>,
    /// Web-to-web friction coefficient (used for the nip-induced part and slip checks).
    pub friction: f64,
    /// Line speed (m/s).
    pub speed: f64,
    /// Combined RMS surface roughness of two contacting web surfaces (m), for the air film check.
    pub combined_roughness: f64,
}

/// Entrained-air film estimate at one radius.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct AirFilm {
    /// Foil-bearing film thickness h0 (m).
    pub thickness: f64,
    /// h0 divided by the combined roughness; above ~1 traction is lost.
    pub ratio_to_roughness: f64,
    /// True when a nip is present and suppresses the film.
    pub suppressed_by_nip: bool,
}
