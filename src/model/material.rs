//! Radial stiffness laws of a stack of web layers: Pfeiffer exponential, constant, power law.
//!
//! Each law gives the tangent radial modulus Er(P), the radial strain ε(P) of the stack from the
//! stress-free state, and the secant modulus between two pressures (the exact modulus of a finite
//! pressure increment, used by the accretion solver).

/// Radial stiffness law Er(P) of the wound stack.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
#[serde(tag = "law", rename_all = "snake_case")]
pub enum RadialStiffness {
    /// Pfeiffer (TAPPI 49(8):342, 1966): P = K1·(e^(K2·ε) − 1), so Er = K2·(P + K1).
    /// `k1` in Pa, `k2` dimensionless.
    Pfeiffer { k1: f64, k2: f64 },
    /// Constant radial modulus (Pa).
    Constant { modulus: f64 },
    /// Power law Er = C·max(P, 1 Pa)^n with C in Pa^(1−n), 0 ≤ n < 1 accepted.
    /// Below 1 Pa the modulus is held at C (so an unloaded stack is not infinitely soft).
    /// A power-law fit of stack-compression data is a common curve-fit form (common practice);
    /// Pfeiffer's law is the usual published choice.
    PowerLaw { coefficient: f64, exponent: f64 },
}

/// Pressure below which the power law is held constant (Pa).
const POWER_LAW_FLOOR: f64 = 1.0;

impl RadialStiffness {
    /// Tangent radial modulus at interlayer pressure `pressure` (Pa).
    pub fn modulus_at(&self, pressure: f64) -> f64 {
        let p = pressure.max(0.0);
        match *self {
            RadialStiffness::Pfeiffer { k1, k2 } => k2 * (p + k1),
            RadialStiffness::Constant { modulus } => modulus,
            RadialStiffness::PowerLaw {
                coefficient,
                exponent,
            } => coefficient * p.max(POWER_LAW_FLOOR).powf(exponent),
        }
    }

    /// Radial (compressive) strain of the stack at pressure `pressure`, from zero pressure:
    /// ε(P) = ∫₀ᴾ dp / Er(p).
    pub fn strain_at(&self, pressure: f64) -> f64 {
        let p = pressure.max(0.0);
        match *self {
            RadialStiffness::Pfeiffer { k1, k2 } => (p / k1).ln_1p() / k2,
            RadialStiffness::Constant { modulus } => p / modulus,
            RadialStiffness::PowerLaw {
                coefficient,
                exponent,
            } => {
                let floor = POWER_LAW_FLOOR;
                if p <= floor {
                    p / coefficient
                } else {
                    let n = exponent;
                    floor / coefficient
                        + (p.powf(1.0 - n) - floor.powf(1.0 - n)) / (coefficient * (1.0 - n))
                }
            }
        }
    }

    /// Logarithmic slope d(ln Er)/dP at `pressure` (1/Pa): the relative change of the tangent
    /// modulus per pascal. The accretion solver uses it to judge when a trial increment is
    /// close enough.
    pub fn log_slope(&self, pressure: f64) -> f64 {
        let p = pressure.max(0.0);
        match *self {
            RadialStiffness::Pfeiffer { k1, .. } => 1.0 / (p + k1),
            RadialStiffness::Constant { .. } => 0.0,
            RadialStiffness::PowerLaw { exponent, .. } => exponent / p.max(POWER_LAW_FLOOR),
        }
    }

    /// Secant modulus ΔP/Δε between pressures `from` and `to` (Pa). With it, the radial strain
    /// increment of a finite pressure step is exactly the law's strain difference.
    /// Falls back to the tangent modulus at the mid pressure for vanishing steps.
    pub fn secant_modulus(&self, from: f64, to: f64) -> f64 {
        let a = from.max(0.0);
        let b = to.max(0.0);
        let step = b - a;
        match *self {
            RadialStiffness::Constant { modulus } => modulus,
            RadialStiffness::Pfeiffer { k1, k2 } => {
                let relative = step / (a + k1);
                if relative.abs() < 1e-7 {
                    // Series of x/ln(1+x) = 1 + x/2 − x²/12: avoids 0/0.
                    k2 * (a + k1) * (1.0 + relative / 2.0 - relative * relative / 12.0)
                } else {
                    k2 * step / relative.ln_1p()
                }
            }
            RadialStiffness::PowerLaw { .. } => {
                let scale = self.modulus_at(0.5 * (a + b));
                let strain = self.strain_at(b) - self.strain_at(a);
                if step.abs() < 1e-9 * (a + b + 1.0) || strain <= 0.0 {
                    scale
                } else {
                    step / strain
                }
            }
        }
    }

    /// Check the parameters; returns a description of the accepted range on failure.
    pub fn validate(&self) -> Result<(), super::ModelError> {
        use super::ModelError::OutOfRange;
        let positive = |field: &'static str, value: f64| {
            if value.is_finite() && value > 0.0 {
                Ok(())
            } else {
                Err(OutOfRange {
                    field,
                    value,
                    accepted: "a finite value > 0",
                })
            }
        };
        match *self {
            RadialStiffness::Pfeiffer { k1, k2 } => {
                positive("radial_stiffness.k1", k1)?;
                positive("radial_stiffness.k2", k2)
            }
            RadialStiffness::Constant { modulus } => positive("radial_stiffness.modulus", modulus),
            RadialStiffness::PowerLaw {
                coefficient,
                exponent,
            } => {
                positive("radial_stiffness.coefficient", coefficient)?;
                if exponent.is_finite() && (0.0..1.0).contains(&exponent) {
                    Ok(())
                } else {
                    Err(OutOfRange {
                        field: "radial_stiffness.exponent",
                        value: exponent,
                        accepted: "0 ≤ n < 1",
                    })
                }
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn pfeiffer_strain_and_modulus_are_consistent() {
        let law = RadialStiffness::Pfeiffer { k1: 5e3, k2: 50.0 };
        // P = K1 (e^(K2 ε) − 1) inverted (Pfeiffer 1966).
        let p = 2.0e5;
        let eps = law.strain_at(p);
        assert!((5e3 * ((50.0 * eps).exp() - 1.0) - p).abs() < 1e-6 * p);
        // Secant over a step equals ΔP/Δε.
        let s = law.secant_modulus(1e4, 3e4);
        let expect = 2e4 / (law.strain_at(3e4) - law.strain_at(1e4));
        assert!((s - expect).abs() < 1e-9 * expect);
        // Small step → tangent at the middle.
        let t = law.secant_modulus(1e4, 1e4 + 1e-6);
        assert!((t - law.modulus_at(1e4)).abs() < 1e-6 * t);
    }

    #[test]
    fn power_law_secant_matches_strain_difference() {
        let law = RadialStiffness::PowerLaw {
            coefficient: 2.0e3,
            exponent: 0.5,
        };
        let s = law.secant_modulus(100.0, 400.0);
        let expect = 300.0 / (law.strain_at(400.0) - law.strain_at(100.0));
        assert!((s - expect).abs() < 1e-9 * expect);
    }
}
