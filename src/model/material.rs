//! Radial stiffness laws of a stack of web layers: Pfeiffer exponential, constant, power law.

/// Radial stiffness law Er(P) of the wound stack.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
#[serde(tag = "law", rename_all = "snake_case")]
pub enum RadialStiffness {
    /// Pfeiffer (TAPPI 49(8):342, 1966): P = K1·(e^(K2·ε) − 1), so Er = K2·(P + K1).
    /// `k1` in Pa, `k2` dimensionless.
    Pfeiffer { k1: f64, k2: f64 },
    /// Constant radial modulus (Pa).
    Constant { modulus: f64 },
    /// Power law Er = C·P^n — implementer documents the exact form and source.
    PowerLaw { coefficient: f64, exponent: f64 },
}

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
            } => coefficient * p.max(1.0).powf(exponent),
        }
    }
}
