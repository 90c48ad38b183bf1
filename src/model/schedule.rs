//! Web tension versus radius: constant, linear taper, hyperbolic taper, steps, upset bands.

/// How tension falls from the core to the outside.
#[derive(Debug, Clone, PartialEq, Default, serde::Serialize, serde::Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum Taper {
    /// Constant tension.
    #[default]
    None,
    /// Tension falls linearly with radius by `fraction` (0..=1) of the starting value at the outside.
    Linear { fraction: f64 },
    /// T(r) = T0·(1 − fraction·(1 − rc/r)) — implementer documents the exact form (constant
    /// torque is the limit fraction = 1).
    Hyperbolic { fraction: f64 },
    /// Tension steps: from `radius` (m) outward the tension is `tension` (N/m).
    Steps { steps: Vec<TensionStep> },
}

#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct TensionStep {
    pub radius: f64,
    pub tension: f64,
}

/// A band of radii wound at a different tension (a tension upset: spike or drop).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct UpsetBand {
    pub from_radius: f64,
    pub to_radius: f64,
    /// Web tension inside the band (N/m).
    pub tension: f64,
}

/// Web tension as a function of radius.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct TensionSchedule {
    /// Web tension at the core (N/m).
    pub start_tension: f64,
    pub taper: Taper,
    pub upsets: Vec<UpsetBand>,
}
