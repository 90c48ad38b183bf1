//! What the design needs before any solve: limits and options in their ranges, a core crush
//! pressure and a web strength to design against, and a roll larger than its core. Owns the
//! roll's radii and the largest taper searched, which every later step reads.

use crate::case::ResolvedCase;

use super::{DesignOptions, TaperError, TaperLimits, TaperShape};

/// The roll's radii and the largest taper searched, from checked inputs.
#[derive(Debug, Clone, Copy)]
pub(super) struct Frame {
    /// Core outside radius, m.
    pub rc: f64,
    /// Finished roll radius, m.
    pub big_r: f64,
    /// Largest taper fraction searched (0 < f ≤ 1).
    pub max_taper: f64,
}

/// Check the limits, the options and the case inputs the design depends on; the first problem
/// found is the error.
pub(super) fn check_inputs(
    case: &ResolvedCase,
    limits: &TaperLimits,
    options: &DesignOptions,
) -> Result<Frame, TaperError> {
    limits.validate()?;
    if !(case.core.crush_pressure.is_finite() && case.core.crush_pressure > 0.0) {
        return Err(TaperError::Unusable {
            field: "core.crush_pressure",
            reason: "core.crush_pressure must be a positive pressure to design against it",
        });
    }
    if !(case.web.strength.is_finite() && case.web.strength > 0.0) {
        return Err(TaperError::Unusable {
            field: "web.strength",
            reason: "web.strength must be a positive tension to design against it",
        });
    }
    if let Some(n) = options.steps
        && !(2..=50).contains(&n)
    {
        return Err(TaperError::OutOfRange {
            field: "steps",
            value: n as f64,
            accepted: "2 to 50 steps",
        });
    }
    let max_taper = options.max_taper.unwrap_or(match options.shape {
        TaperShape::Linear => 0.8,
        TaperShape::Hyperbolic => 1.0,
    });
    if !(max_taper > 0.0 && max_taper <= 1.0) {
        return Err(TaperError::OutOfRange {
            field: "max_taper",
            value: max_taper,
            accepted: "0 < fraction ≤ 1",
        });
    }
    let rc = case.core.outside_diameter / 2.0;
    let big_r = case.roll.outer_diameter / 2.0;
    if !(big_r > rc && case.web.thickness > 0.0) {
        return Err(TaperError::Unusable {
            field: "roll.outer_diameter",
            reason: "the roll diameter must exceed the core's outside diameter",
        });
    }
    Ok(Frame {
        rc,
        big_r,
        max_taper,
    })
}
