//! Roll geometry from what was measured: the mean radial compression and the wound density of
//! the stack from length (or weight), diameter, core and caliper; the same figures from the
//! computed profile; and the elastic closing of a hollow core's bore under the core pressure.

use crate::model::{CoreStiffness, Profile};

/// Area of the wound annulus per unit width (m²): π·(R² − rc²).
pub fn wound_area(outer_diameter: f64, core_outside_diameter: f64) -> f64 {
    let (r, rc) = (outer_diameter / 2.0, core_outside_diameter / 2.0);
    std::f64::consts::PI * (r * r - rc * rc)
}

/// Mean radial compression of the stack, ε̄ = 1 − π·(R² − rc²)/(L·h): the share of the loose
/// web thickness pressed out. The loose stack of `length` L at caliper h would fill an annulus
/// of area L·h; a wound roll that fills less is compressed by the difference (geometry of the
/// annulus; the same relation the case file uses for an ideal stack, L = π(R² − rc²)/h).
pub fn mean_compression(
    length: f64,
    outer_diameter: f64,
    core_outside_diameter: f64,
    caliper: f64,
) -> f64 {
    1.0 - wound_area(outer_diameter, core_outside_diameter) / (length * caliper)
}

/// Wound density (kg/m³) of a roll: mass per width over the annulus, L·g / (π·(R² − rc²)),
/// with g the basis weight (kg/m²).
pub fn wound_density(
    length: f64,
    basis_weight: f64,
    outer_diameter: f64,
    core_outside_diameter: f64,
) -> f64 {
    length * basis_weight / wound_area(outer_diameter, core_outside_diameter)
}

/// Mean radial compression of the computed profile: the radial strain averaged over the
/// annulus, ∫ε·2πr dr / ∫2πr dr (trapezoid rule on the nodes). The solver's nodes sit at the
/// loose-stack radii, so this is the share of the loose stack the model presses out.
pub fn model_mean_compression(profile: &Profile) -> Option<f64> {
    let n = profile.radius.len().min(profile.radial_strain.len());
    if n < 2 {
        return None;
    }
    let (r, e) = (&profile.radius[..n], &profile.radial_strain[..n]);
    let mut num = 0.0;
    let mut den = 0.0;
    for i in 1..n {
        let dr = r[i] - r[i - 1];
        num += 0.5 * (e[i] * r[i] + e[i - 1] * r[i - 1]) * dr;
        den += 0.5 * (r[i] + r[i - 1]) * dr;
    }
    (den > 0.0).then(|| num / den)
}

/// Outside diameter (m) a roll of `length` reaches when its stack is compressed by
/// `compression` on average: D = 2·√(rc² + L·h·(1 − ε̄)/π).
pub fn diameter_for(
    length: f64,
    caliper: f64,
    core_outside_diameter: f64,
    compression: f64,
) -> f64 {
    let rc = core_outside_diameter / 2.0;
    2.0 * (rc * rc + length * caliper * (1.0 - compression) / std::f64::consts::PI).sqrt()
}

/// Closing of the bore (reduction of the inside diameter, m) of a hollow isotropic core of
/// inside radius a, outside radius b and modulus E under an external pressure p, elastic and
/// plane stress: Lamé's thick-walled cylinder gives the inner-surface displacement
/// u(a) = −2·p·a·b² / (E·(b² − a²)), so Δd = 4·p·a·b² / (E·(b² − a²)).
/// `None` for a rigid core or one given only by a measured stiffness (its bore is not known).
pub fn core_bore_reduction(core: &CoreStiffness, core_pressure: f64) -> Option<f64> {
    match *core {
        CoreStiffness::Hollow {
            inner_radius: a,
            outer_radius: b,
            modulus,
            ..
        } if b > a && modulus > 0.0 => {
            Some(4.0 * core_pressure * a * b * b / (modulus * (b * b - a * a)))
        }
        CoreStiffness::Rigid => Some(0.0),
        _ => None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn compression_from_length_and_diameter_hand_checked() {
        // Hand-checked: rc = 50 mm, R = 500 mm → A = π·(0.25 − 0.0025) = 0.777544 m²;
        // L = 10 000 m at h = 80 µm → L·h = 0.8 m²; ε̄ = 1 − 0.777544/0.8 = 0.028070.
        let e = mean_compression(10_000.0, 1.0, 0.1, 80e-6);
        assert!((e - 0.028070).abs() < 1e-6, "{e}");
        // Round trip: the diameter for that compression is the measured one.
        let d = diameter_for(10_000.0, 80e-6, 0.1, e);
        assert!((d - 1.0).abs() < 1e-12);
        // Density: 10 000 m of 45 g/m² over 0.777544 m² → 578.74 kg/m³ (hand-checked).
        let rho = wound_density(10_000.0, 0.045, 1.0, 0.1);
        assert!((rho - 578.74).abs() < 0.01, "{rho}");
    }

    #[test]
    fn thin_core_bore_matches_the_thin_ring() {
        // Thin ring under external pressure: hoop stress p·a/t, so the radius shrinks by
        // p·a²/(E·t) (Roark's Formulas, thin rings); the Lamé form tends to it as t → 0.
        let (a, t, e, p) = (0.05, 0.0005, 3.0e9, 1.0e6);
        let core = CoreStiffness::Hollow {
            inner_radius: a,
            outer_radius: a + t,
            modulus: e,
            poisson_ratio: 0.3,
        };
        let lame = core_bore_reduction(&core, p).unwrap();
        let thin = 2.0 * p * a * a / (e * t);
        // Wall 1 % of the radius: the two differ by O(t/a), about 1.5 %.
        assert!((lame / thin - 1.0).abs() < 0.02, "{lame} vs {thin}");
        assert_eq!(core_bore_reduction(&CoreStiffness::Rigid, p), Some(0.0));
        assert_eq!(
            core_bore_reduction(&CoreStiffness::Measured { stiffness: 1e8 }, p),
            None
        );
    }
}
