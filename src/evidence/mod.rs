//! Measured evidence: what people measure on the bad roll, compared with what the model
//! computes for it, and the inverse estimate of the wound-in tension the roll actually got.
//!
//! Owns the measurement types ([`measurements`]), the comparisons (density and mean radial
//! compression from the roll's size, hardness shape along the radius, the lane pattern across
//! the width, the bend of a line on the roll end against the slip capacity, the core bore
//! against the computed core deformation, the pattern of bad rolls in the set), the indicator
//! values the rule base tests ([`Evidence::indicators`]; they, the text lines and the report
//! rows are worded in `words`) and the least-squares fit of a tension
//! (and stiffness) scale ([`fit`]). Depends on `model` only (and the small Levenberg–Marquardt
//! solver the stack-test calibration also uses). Theory and limits: docs/evidence.md.

pub mod fit;
pub mod geometry;
pub mod hardness;
pub mod measurements;
pub mod slip;
mod words;

use serde::{Deserialize, Serialize};

pub use fit::{Estimate, FitOptions, InverseEstimate, estimate};
pub use hardness::{HardnessComparison, LaneComparison};
pub use measurements::{
    BendDirection, BendPlace, CalibrationPoint, EndLine, HardnessProfile, HardnessReading,
    LaneHardness, LaneReading, Measurements, ParentPosition, RollSet, RollSize, SizeUncertainty,
    WoundAmount,
};
pub use slip::SlipComparison;
pub use words::ComparisonRow;
use words::diameter_note;

use crate::model::{Profile, WindingProblem};
use crate::units::{UnitSystem, compact_length, compact_stress, web_length};

/// Errors of the evidence layer; messages name the field and what is accepted.
#[derive(Debug, thiserror::Error, PartialEq)]
pub enum EvidenceError {
    #[error("{field} = {value} is out of range: accepted {accepted}")]
    OutOfRange {
        field: String,
        value: String,
        accepted: String,
    },
    #[error(transparent)]
    Model(#[from] crate::model::ModelError),
}

/// Size of the roll against the computed compression.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct DensityComparison {
    /// Wound length (m), given or from the weight.
    pub length: f64,
    /// Measured outside diameter (m).
    pub measured_diameter: f64,
    /// Diameter the model predicts for that length (m).
    pub computed_diameter: f64,
    /// Mean radial compression of the stack, measured and computed (shares).
    pub measured_compression: f64,
    pub computed_compression: f64,
    /// Standard uncertainty of the measured compression (share).
    pub compression_uncertainty: f64,
    /// Measured wound density / computed wound density = (1 − ε̄ computed)/(1 − ε̄ measured).
    pub density_ratio: f64,
    /// Wound densities (kg/m³) when a basis weight is known.
    pub measured_density: Option<f64>,
    pub computed_density: Option<f64>,
    /// Diameter the case was solved at (m).
    pub solved_diameter: f64,
}

/// Core bore closing, measured against the elastic closing under the computed core pressure.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct CoreBoreComparison {
    /// m
    pub measured: f64,
    /// m; `None` when the core is given only by a measured stiffness.
    pub computed: Option<f64>,
    /// Computed pressure on the core (Pa).
    pub core_pressure: f64,
    /// measured / computed; `None` when nothing is computed or the computed value is 0.
    pub ratio: Option<f64>,
}

/// What the pattern of bad rolls in the set says.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum SetPatternKind {
    /// Every roll of the set is bad: the settings, not the web's profile.
    AllRolls,
    /// Only the edge positions are bad.
    Edges,
    /// One position (lane) only.
    OneLane,
    /// Some rolls, no single pattern.
    SomeRolls,
    /// None bad.
    NoneBad,
}

/// The set the roll came from.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SetPattern {
    pub rolls: u32,
    pub bad: u32,
    /// bad / rolls.
    pub bad_share: f64,
    /// Share of the bad rolls (with known positions) at the two edge positions.
    pub edge_share: Option<f64>,
    /// Bad parent rolls / parent rolls looked at.
    pub parent_share: Option<f64>,
    pub pattern: SetPatternKind,
    pub position_in_parent: Option<ParentPosition>,
    pub parent_roll: Option<String>,
}

/// Every comparison of the measurements with the computed profile.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct Evidence {
    pub density: Option<DensityComparison>,
    pub hardness: Option<HardnessComparison>,
    pub lanes: Option<LaneComparison>,
    pub end_line: Option<SlipComparison>,
    pub core_bore: Option<CoreBoreComparison>,
    pub set: Option<SetPattern>,
    /// What could not be compared, and why; limits of a comparison.
    pub notes: Vec<String>,
}

/// One evidence indicator for the rule base, with the measured and computed values side by side
/// in words.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct EvidenceIndicator {
    pub id: &'static str,
    pub value: f64,
    /// "measured 812 kg/m³, computed 873 kg/m³" and the like.
    pub detail: String,
}

/// Compare `measurements` with `profile`, the solution of `problem`.
pub fn compare(
    measurements: &Measurements,
    problem: &WindingProblem,
    profile: &Profile,
) -> Result<Evidence, EvidenceError> {
    measurements.validate()?;
    let mut out = Evidence::default();
    if let Some(size) = &measurements.size {
        out.density = compare_size(size, problem, profile);
        if let Some(d) = &out.density
            && (d.measured_diameter / d.solved_diameter - 1.0).abs() > 0.02
        {
            out.notes.push(diameter_note(d, UnitSystem::Si));
        }
        if out.density.is_none() {
            out.notes
                .push("the roll's size could not be compared (no computed compression)".into());
        }
    }
    if let Some(h) = &measurements.hardness {
        out.hardness = hardness::compare_profile(h, profile);
        match &out.hardness {
            Some(c) => {
                out.notes.extend(c.left_out.iter().cloned());
                if c.rank_correlation.is_none() {
                    out.notes.push(
                        "hardness shape: at least 3 readings inside the roll are needed for a \
                         rank correlation"
                            .into(),
                    );
                }
            }
            None => out.notes.push(
                "hardness along the radius: fewer than 2 readings lie inside the roll".into(),
            ),
        }
    }
    if let Some(l) = &measurements.lanes {
        out.lanes = hardness::compare_lanes(l);
        out.notes.push(
            "hardness across the width: the model is one-dimensional (one pressure for the whole \
             width) and cannot compute lane differences; the spread itself is the evidence"
                .into(),
        );
    }
    if let Some(line) = &measurements.end_line {
        out.end_line = slip::compare(line, problem, profile);
    }
    if let Some(measured) = measurements.core_bore_reduction {
        let core_pressure = profile.pressure.first().copied().unwrap_or(0.0);
        let computed = geometry::core_bore_reduction(&problem.core, core_pressure);
        if computed.is_none() {
            out.notes.push(
                "core bore: the core is given by a measured stiffness only, so its bore change \
                 is not computed"
                    .into(),
            );
        } else if computed == Some(0.0) {
            out.notes
                .push("core bore: the model takes the core as rigid (no bore change)".into());
        }
        out.core_bore = Some(CoreBoreComparison {
            measured,
            computed,
            core_pressure,
            ratio: computed.filter(|c| *c > 0.0).map(|c| measured / c),
        });
    }
    if let Some(set) = &measurements.set {
        out.set = Some(set_pattern(set));
    }
    Ok(out)
}

fn compare_size(
    size: &RollSize,
    problem: &WindingProblem,
    profile: &Profile,
) -> Option<DensityComparison> {
    let length = size.amount.length();
    let core_d = 2.0 * problem.core_radius;
    let h = problem.thickness;
    let computed = geometry::model_mean_compression(profile)?;
    let measured = geometry::mean_compression(length, size.diameter, core_d, h);
    // Relative uncertainty of the loose-stack share 1 − ε̄ = A/(L·h): length (or weight),
    // caliper and area add in quadrature; δA/A = R·δD/(R² − rc²).
    let r = size.diameter / 2.0;
    let rc = problem.core_radius;
    let u = size.uncertainty;
    let area_share = r * u.diameter / (r * r - rc * rc).max(f64::MIN_POSITIVE);
    let relative = (u.amount.powi(2) + u.caliper.powi(2) + area_share.powi(2)).sqrt();
    let basis = size.amount.basis_weight();
    Some(DensityComparison {
        length,
        measured_diameter: size.diameter,
        computed_diameter: geometry::diameter_for(length, h, core_d, computed),
        measured_compression: measured,
        computed_compression: computed,
        compression_uncertainty: relative * (1.0 - measured),
        density_ratio: (1.0 - computed) / (1.0 - measured),
        measured_density: basis.map(|g| geometry::wound_density(length, g, size.diameter, core_d)),
        computed_density: basis.map(|g| g / (h * (1.0 - computed))),
        solved_diameter: 2.0 * problem.outer_radius,
    })
}

fn set_pattern(set: &RollSet) -> SetPattern {
    let edge = |p: u32| p == 1 || p == set.rolls;
    let known = set.bad_positions.len();
    let edge_share = (known > 0 && set.rolls >= 3)
        .then(|| set.bad_positions.iter().filter(|&&p| edge(p)).count() as f64 / known as f64);
    let mut distinct = set.bad_positions.clone();
    distinct.sort_unstable();
    distinct.dedup();
    let pattern = if set.bad == 0 {
        SetPatternKind::NoneBad
    } else if set.bad == set.rolls {
        SetPatternKind::AllRolls
    } else if set.bad == 1 || (distinct.len() == 1 && known == set.bad as usize) {
        SetPatternKind::OneLane
    } else if edge_share == Some(1.0) && known == set.bad as usize {
        SetPatternKind::Edges
    } else {
        SetPatternKind::SomeRolls
    };
    SetPattern {
        rolls: set.rolls,
        bad: set.bad,
        bad_share: f64::from(set.bad) / f64::from(set.rolls),
        edge_share,
        parent_share: match (set.parent_rolls, set.bad_parent_rolls) {
            (Some(n), Some(b)) if n > 0 => Some(f64::from(b) / f64::from(n)),
            _ => None,
        },
        pattern,
        position_in_parent: set.position_in_parent,
        parent_roll: set.parent_roll.clone(),
    }
}
