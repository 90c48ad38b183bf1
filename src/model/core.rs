//! Core stiffness: rigid, hollow isotropic cylinder (Lamé), or a measured value.

/// Effective radial stiffness of the core as seen by the first wrap.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum CoreStiffness {
    /// Infinitely stiff core.
    Rigid,
    /// Hollow isotropic cylinder, radii in m, modulus in Pa.
    Hollow {
        inner_radius: f64,
        outer_radius: f64,
        modulus: f64,
        poisson_ratio: f64,
    },
    /// Measured effective core stiffness Ec (Pa).
    Measured { stiffness: f64 },
}

impl CoreStiffness {
    /// Effective stiffness Ec (Pa); `f64::INFINITY` for a rigid core.
    /// Hollow cylinder: Ec = E / ((b² + a²)/(b² − a²) − ν) (Lamé thick-walled cylinder).
    pub fn effective_stiffness(&self) -> f64 {
        match *self {
            CoreStiffness::Rigid => f64::INFINITY,
            CoreStiffness::Hollow {
                inner_radius: a,
                outer_radius: b,
                modulus,
                poisson_ratio,
            } => modulus / ((b * b + a * a) / (b * b - a * a) - poisson_ratio),
            CoreStiffness::Measured { stiffness } => stiffness,
        }
    }
}

impl CoreStiffness {
    /// Coefficient c of the core boundary condition r·δσr'(rc) = c·δσr(rc) for a web with
    /// tangential modulus `tangential_modulus` and Poisson ratio ν_θr `poisson_ratio`:
    /// c = Eθ/Ec − 1 + ν (Hakiel 1987; rigid core: c = ν − 1).
    pub fn boundary_coefficient(&self, tangential_modulus: f64, poisson_ratio: f64) -> f64 {
        let ec = self.effective_stiffness();
        let ratio = if ec.is_infinite() {
            0.0
        } else {
            tangential_modulus / ec
        };
        ratio - 1.0 + poisson_ratio
    }

    /// Check the parameters; names the field and the accepted range on failure.
    pub fn validate(&self) -> Result<(), super::ModelError> {
        use super::ModelError::OutOfRange;
        match *self {
            CoreStiffness::Rigid => Ok(()),
            CoreStiffness::Hollow {
                inner_radius,
                outer_radius,
                modulus,
                poisson_ratio,
            } => {
                if !(inner_radius.is_finite() && inner_radius >= 0.0) {
                    return Err(OutOfRange {
                        field: "core.inner_radius",
                        value: inner_radius,
                        accepted: "a finite radius ≥ 0 m",
                    });
                }
                if !(outer_radius.is_finite() && outer_radius > inner_radius) {
                    return Err(OutOfRange {
                        field: "core.outer_radius",
                        value: outer_radius,
                        accepted: "a finite radius larger than the core's inner radius",
                    });
                }
                if !(modulus.is_finite() && modulus > 0.0) {
                    return Err(OutOfRange {
                        field: "core.modulus",
                        value: modulus,
                        accepted: "a finite modulus > 0 Pa",
                    });
                }
                if !(poisson_ratio.is_finite() && (0.0..0.5).contains(&poisson_ratio)) {
                    return Err(OutOfRange {
                        field: "core.poisson_ratio",
                        value: poisson_ratio,
                        accepted: "0 ≤ ν < 0.5",
                    });
                }
                Ok(())
            }
            CoreStiffness::Measured { stiffness } => {
                if stiffness.is_finite() && stiffness > 0.0 {
                    Ok(())
                } else {
                    Err(OutOfRange {
                        field: "core.stiffness",
                        value: stiffness,
                        accepted: "a finite stiffness > 0 Pa",
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
    fn lame_hollow_core_check_value() {
        // Lamé thick-walled cylinder under external pressure (Roark's Formulas, thick cylinders):
        // a = 38.1 mm, b = 50.8 mm, ν = 0.3 → Ec = 0.30568·E.
        let core = CoreStiffness::Hollow {
            inner_radius: 0.0381,
            outer_radius: 0.0508,
            modulus: 1.0,
            poisson_ratio: 0.3,
        };
        assert!((core.effective_stiffness() - 0.30568).abs() < 5e-6);
    }
}
