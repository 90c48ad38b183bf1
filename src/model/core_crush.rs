//! Core crush: the interlayer pressure on the core that the core is judged to carry, from the
//! supplier's rating when there is one, otherwise from an estimate of the wall's strength and
//! of buckling, whichever is lower. Each result says which state (free or on a shaft) it
//! judged and on what basis.
//!
//! * Radial (bladder) crush pressure: the test presses the core's outside with a uniform
//!   pressure, which is what the wound roll does, so the rating is compared with the
//!   interlayer pressure at the core directly (ratio 1). The test is short; a roll sits for
//!   weeks, and paperboard creeps, so a margin below the rating is prudent (common practice).
//! * Flat crush (kN per 100 mm of core length, between two flat plates): a thin ring under a
//!   diametral line load W per length has its largest bending moment W·R/π under the loads
//!   (Roark's Formulas for Stress and Strain, thin circular rings; from memory), so it fails
//!   when 6·W·R/(π·t²) reaches the wall's strength; a uniform pressure p gives hoop stress
//!   p·R/t. Taking the same strength for both, the equivalent radial pressure is
//!   p = 6·W/(π·t). A rough equivalence: bending and compressive strength of paperboard differ.
//! * Estimate: the hoop stress at the wall per unit pressure from the tube solution in
//!   [`super::core`] (orthotropic for paper cores, Gerhardt 1990) reaching the material's
//!   compressive strength; and elastic buckling of a long ring under external pressure,
//!   p_cr = 3·E·I/R³ = Eθ·t³/(4·Rm³) per unit length (Timoshenko & Gere, Theory of Elastic
//!   Stability, ring under uniform external pressure; from memory), with Rm the mid-wall
//!   radius. A core on a shaft cannot buckle inward, so buckling is judged only for a free core.

use super::core::{CoreStiffness, CoreSupport};

/// What the crush limit rests on.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum CrushBasis {
    /// Supplier's radial (bladder) crush pressure.
    SupplierRadial,
    /// Supplier's flat crush load, converted to a radial pressure.
    SupplierFlat,
    /// Hoop stress at the wall reaching the compressive strength.
    WallStrength,
    /// Elastic buckling of the free tube.
    Buckling,
    /// A value given without its kind (kept from older cases).
    Given,
}

impl CrushBasis {
    /// Plain words for reports.
    pub fn describe(self) -> &'static str {
        match self {
            CrushBasis::SupplierRadial => "supplier's radial crush rating",
            CrushBasis::SupplierFlat => "supplier's flat crush rating converted to a pressure",
            CrushBasis::WallStrength => "estimate: wall hoop stress reaching the core's strength",
            CrushBasis::Buckling => "estimate: buckling of the free core",
            CrushBasis::Given => "crush pressure given in the case",
        }
    }
}

/// The supplier's ratings, as typed in the case.
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize, serde::Deserialize)]
pub struct CrushRatings {
    /// Radial (bladder) crush pressure (Pa).
    pub radial_pressure: Option<f64>,
    /// Flat crush load per unit core length (N/m; 1 kN per 100 mm = 10 kN/m).
    pub flat_load: Option<f64>,
}

/// The crush limit used for the check.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct CrushLimit {
    /// Interlayer pressure on the core the core is judged to carry (Pa).
    pub pressure: f64,
    pub basis: CrushBasis,
    /// The state judged.
    pub support: CoreSupport,
}

/// Radial pressure (Pa) equivalent to a flat crush load `flat_load` (N per m of core length)
/// on a wall `wall_thickness` thick: 6·W/(π·t) (see the module notes).
pub fn flat_crush_to_pressure(flat_load: f64, wall_thickness: f64) -> f64 {
    6.0 * flat_load / (std::f64::consts::PI * wall_thickness)
}

/// Elastic buckling pressure (Pa) of a long free tube: Eθ·t³/(4·Rm³).
pub fn buckling_pressure(hoop_modulus: f64, inner_radius: f64, outer_radius: f64) -> f64 {
    let t = outer_radius - inner_radius;
    let rm = 0.5 * (outer_radius + inner_radius);
    hoop_modulus * t * t * t / (4.0 * rm * rm * rm)
}

/// Estimated crush pressure of a tube core from its wall stresses and buckling, with the
/// basis that governs; `None` for a rigid or measured core (nothing to judge the wall by).
pub fn estimated_limit(core: &CoreStiffness, compressive_strength: f64) -> Option<CrushLimit> {
    let wall = core.wall_stress()?;
    let (per_pressure, _) = wall.governing();
    let support = core.support();
    let strength_limit = compressive_strength / per_pressure;
    let buckling = match (*core, support) {
        (_, CoreSupport::Shaft) => f64::INFINITY,
        (
            CoreStiffness::Hollow {
                inner_radius,
                outer_radius,
                modulus,
                ..
            },
            _,
        ) => buckling_pressure(modulus, inner_radius, outer_radius),
        (
            CoreStiffness::Tube {
                inner_radius,
                outer_radius,
                hoop_modulus,
                ..
            },
            _,
        ) => buckling_pressure(hoop_modulus, inner_radius, outer_radius),
        _ => f64::INFINITY,
    };
    Some(if buckling < strength_limit {
        CrushLimit {
            pressure: buckling,
            basis: CrushBasis::Buckling,
            support,
        }
    } else {
        CrushLimit {
            pressure: strength_limit,
            basis: CrushBasis::WallStrength,
            support,
        }
    })
}

/// The limit from the supplier's ratings (the lower when both are given), `None` without any.
pub fn rated_limit(
    ratings: &CrushRatings,
    wall_thickness: f64,
    support: CoreSupport,
) -> Option<CrushLimit> {
    let radial = ratings.radial_pressure.map(|p| CrushLimit {
        pressure: p,
        basis: CrushBasis::SupplierRadial,
        support,
    });
    let flat = ratings.flat_load.map(|w| CrushLimit {
        pressure: flat_crush_to_pressure(w, wall_thickness),
        basis: CrushBasis::SupplierFlat,
        support,
    });
    match (radial, flat) {
        (Some(r), Some(f)) => Some(if f.pressure < r.pressure { f } else { r }),
        (r, f) => r.or(f),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn flat_crush_conversion_check_value() {
        // 4 kN per 100 mm = 40 kN/m on a 12.7 mm wall: 6·40e3/(π·0.0127) = 6.015 MPa.
        let p = flat_crush_to_pressure(40e3, 0.0127);
        assert!((p - 6.015e6).abs() < 1e3, "{p}");
    }

    #[test]
    fn buckling_check_value() {
        // Ring under uniform external pressure, q = 3EI/R³ with I = t³/12 (Timoshenko & Gere):
        // E = 200 GPa, t = 6.35 mm, Rm = 79.375 mm → 200e9·(0.08)³/4 = 25.6 MPa.
        let p = buckling_pressure(200e9, 0.0762, 0.08255);
        assert!((p - 25.6e6).abs() < 0.01e6, "{p}");
    }

    #[test]
    fn lower_rating_governs_and_shaft_removes_buckling() {
        let ratings = CrushRatings {
            radial_pressure: Some(5e6),
            flat_load: Some(10e3),
        };
        let limit = rated_limit(&ratings, 0.0127, CoreSupport::Free).unwrap();
        assert_eq!(limit.basis, CrushBasis::SupplierFlat);
        let thin = |support| CoreStiffness::Tube {
            inner_radius: 0.0762,
            outer_radius: 0.0794,
            hoop_modulus: 2e9,
            radial_modulus: 40e6,
            poisson_ratio: 0.3,
            support,
        };
        let free = estimated_limit(&thin(CoreSupport::Free), 20e6).unwrap();
        assert_eq!(free.basis, CrushBasis::Buckling);
        let held = estimated_limit(&thin(CoreSupport::Shaft), 20e6).unwrap();
        assert_eq!(held.basis, CrushBasis::WallStrength);
        assert_eq!(held.support, CoreSupport::Shaft);
    }
}
