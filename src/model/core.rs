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
