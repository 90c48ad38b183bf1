//! Wound-roll mechanics: from web, core and winding settings (all SI) to the stress state inside
//! the roll. No UI, no YAML rules, no case-file parsing — callers build a [`WindingProblem`].
//!
//! Sign convention: `pressure` is the interlayer (radial) pressure, positive in compression
//! (pressure = −σr). `tangential_stress` is σθ, positive in tension.

pub mod accretion;
pub mod air;
pub mod core;
pub mod core_crush;
pub mod grid;
pub mod material;
pub mod profile;
pub mod schedule;
pub mod winder;
pub mod wound_in;

pub use core::{CoreStiffness, CoreSupport};
pub use grid::{Grid, SolverStats, layer_count, layer_count_between, solve, solve_with_progress};
pub use material::RadialStiffness;
pub use profile::{Band, Profile, ProfileSummary, Zone, ZoneName, ZoneStats};
pub use schedule::{Taper, TensionSchedule, UpsetBand};
pub use winder::{DrumSet, NipProgramme};
pub use wound_in::{AirFilm, WindingMethod, WindingSetup};

/// Errors of the mechanics layer. Inputs reaching here are SI and already range-checked by the
/// case layer, but the model checks again so it never panics on direct library use.
#[derive(Debug, Clone, thiserror::Error, PartialEq)]
pub enum ModelError {
    #[error("{field} = {value} is out of range: accepted {accepted}")]
    OutOfRange {
        field: &'static str,
        value: f64,
        accepted: &'static str,
    },
    #[error("the solver did not converge: {0}")]
    NotConverged(String),
    #[error("the solve was cancelled")]
    Cancelled,
}

/// How finely the roll is discretised.
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Resolution {
    /// Per-layer up to a documented layer count, grouped above it.
    #[default]
    Auto,
    /// One node per physical layer.
    PerLayer,
    /// `layers` physical layers per element.
    Grouped { layers: usize },
    /// About `count` elements: per-layer while the roll has at most `count` layers, otherwise
    /// ⌈layers / count⌉ layers per element (see [`grid`]).
    Elements { count: usize },
}

/// How the radial modulus Er is taken over one increment.
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum ModulusUpdate {
    /// Er at the pressure at the start of the increment (Hakiel's original scheme).
    Explicit,
    /// Er re-evaluated at the mid-increment pressure until the increment converges.
    Iterated,
    /// Secant modulus over the increment (exact for the stiffness law over the step).
    #[default]
    Secant,
}

/// Numerical options of a solve.
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize, serde::Deserialize)]
pub struct SolverOptions {
    pub resolution: Resolution,
    pub modulus_update: ModulusUpdate,
}

/// Everything the mechanics needs, in SI units.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct WindingProblem {
    /// Outer radius of the core, where winding starts (m).
    pub core_radius: f64,
    /// Outer radius of the finished roll (m).
    pub outer_radius: f64,
    /// Web thickness (caliper) of one layer (m).
    pub thickness: f64,
    /// Tangential (machine-direction) modulus Eθ of the web (Pa).
    pub tangential_modulus: f64,
    /// Radial stiffness law of the stack of layers.
    pub radial_stiffness: RadialStiffness,
    /// Poisson ratio of the wound stack used in the core boundary condition (ν_θr).
    pub poisson_ratio: f64,
    /// Core stiffness.
    pub core: CoreStiffness,
    /// Winding method, tension schedule, nip, speed: gives the wound-in tension at each radius.
    pub winding: WindingSetup,
    /// Numerical options.
    pub options: SolverOptions,
}
