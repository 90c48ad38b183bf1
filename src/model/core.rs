//! Core stiffness: rigid, hollow isotropic cylinder (Lamé), hollow cylindrically orthotropic
//! tube (spiral-wound paper cores: hoop and radial modulus differ, Gerhardt, J. Eng. Mater.
//! Technol. 112:144, 1990), or a measured value; on an expanding shaft or free. Also the hoop
//! stresses at the wall that the crush estimate in [`super::core_crush`] reads.
//!
//! Orthotropic tube in plane stress under external pressure p (Lekhnitskii's solution for a
//! cylindrically orthotropic ring): σr = C1·r^(k−1) + C2·r^(−k−1), σθ = k·(C1·r^(k−1) −
//! C2·r^(−k−1)) with k = √(Eθ/Er). With c = a/b (bore over outside radius) and the Poisson ratio
//! ν defined by εθ = (σθ − ν·σr)/Eθ:
//! * free bore (σr(a) = 0): σθ(b)/σr(b) = k·(1 + c^2k)/(1 − c^2k);
//! * bore held by a shaft (u(a) = 0): with m = (k − ν)/(k + ν), σθ(b)/σr(b) = k·(1 − m·c^2k)/(1 + m·c^2k);
//!
//! and the effective stiffness seen by the first wrap is Ec = p/(−u(b)/b) = Eθ/(σθ(b)/σr(b) − ν).
//! For k = 1 and a free bore this is Lamé's Ec = E/((b² + a²)/(b² − a²) − ν).

/// Whether the core's bore is held while the roll is wound or judged.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum CoreSupport {
    /// Nothing inside the core: after the shaft is pulled, in storage. The state in which
    /// cores crush.
    #[default]
    Free,
    /// On an expanding shaft (or chucks that hold the bore), taken as rigid.
    Shaft,
}

impl CoreSupport {
    /// Plain words for reports.
    pub fn describe(self) -> &'static str {
        match self {
            CoreSupport::Free => "free core (no shaft inside)",
            CoreSupport::Shaft => "core on an expanding shaft",
        }
    }
}

/// Effective radial stiffness of the core as seen by the first wrap.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum CoreStiffness {
    /// Infinitely stiff core.
    Rigid,
    /// Hollow isotropic cylinder with a free bore, radii in m, modulus in Pa (the special case
    /// of [`CoreStiffness::Tube`] with equal moduli and no shaft).
    Hollow {
        inner_radius: f64,
        outer_radius: f64,
        modulus: f64,
        poisson_ratio: f64,
    },
    /// Hollow cylindrically orthotropic tube: hoop (tangential) and radial modulus in Pa.
    Tube {
        inner_radius: f64,
        outer_radius: f64,
        hoop_modulus: f64,
        radial_modulus: f64,
        poisson_ratio: f64,
        support: CoreSupport,
    },
    /// Measured effective core stiffness Ec (Pa).
    Measured { stiffness: f64 },
}

/// Wall stresses of a tube per unit external pressure (compression negative).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct WallStress {
    /// σθ/p at the bore.
    pub hoop_at_bore: f64,
    /// σθ/p at the outside surface.
    pub hoop_at_outside: f64,
}

impl WallStress {
    /// Largest hoop stress magnitude per unit pressure and where it is ("bore" or "outside").
    pub fn governing(&self) -> (f64, &'static str) {
        if self.hoop_at_bore.abs() >= self.hoop_at_outside.abs() {
            (self.hoop_at_bore.abs(), "bore")
        } else {
            (self.hoop_at_outside.abs(), "outside")
        }
    }
}

/// σθ/σr at the outside surface and the wall stresses per unit pressure of a tube with bore
/// ratio `c` = a/b, modulus ratio `k` = √(Eθ/Er), Poisson ratio `nu`, in the given support.
fn tube_solution(c: f64, k: f64, nu: f64, support: CoreSupport) -> (f64, WallStress) {
    let c2k = c.powf(2.0 * k);
    match support {
        CoreSupport::Free => {
            let outside = k * (1.0 + c2k) / (1.0 - c2k);
            let bore = 2.0 * k * c.powf(k - 1.0) / (1.0 - c2k);
            (
                outside,
                WallStress {
                    hoop_at_bore: -bore,
                    hoop_at_outside: -outside,
                },
            )
        }
        CoreSupport::Shaft => {
            let m = (k - nu) / (k + nu);
            let outside = k * (1.0 - m * c2k) / (1.0 + m * c2k);
            let bore = k * (1.0 - m) * c.powf(k - 1.0) / (1.0 + m * c2k);
            (
                outside,
                WallStress {
                    hoop_at_bore: -bore,
                    hoop_at_outside: -outside,
                },
            )
        }
    }
}

impl CoreStiffness {
    /// Effective stiffness Ec (Pa); `f64::INFINITY` for a rigid core (see the module notes).
    pub fn effective_stiffness(&self) -> f64 {
        match *self {
            CoreStiffness::Rigid => f64::INFINITY,
            CoreStiffness::Hollow {
                inner_radius: a,
                outer_radius: b,
                modulus,
                poisson_ratio,
            } => modulus / ((b * b + a * a) / (b * b - a * a) - poisson_ratio),
            CoreStiffness::Tube {
                hoop_modulus,
                poisson_ratio,
                ..
            } => self.wall_solution().map_or(f64::NAN, |(ratio, _)| {
                hoop_modulus / (ratio - poisson_ratio)
            }),
            CoreStiffness::Measured { stiffness } => stiffness,
        }
    }

    /// Hoop stresses at the wall per unit external pressure, for the tube forms; `None` for a
    /// rigid or measured core (no wall to judge).
    pub fn wall_stress(&self) -> Option<WallStress> {
        self.wall_solution().map(|(_, wall)| wall)
    }

    /// The tube forms' solution per unit external pressure: the ratio that sets the effective
    /// stiffness and the wall's hoop stresses (an isotropic hollow core as a free tube with
    /// equal moduli); `None` for a rigid or measured core. Always `Some` for a `Tube`.
    fn wall_solution(&self) -> Option<(f64, WallStress)> {
        let (inner_radius, outer_radius, k, poisson_ratio, support) = match *self {
            CoreStiffness::Hollow {
                inner_radius,
                outer_radius,
                poisson_ratio,
                ..
            } => (
                inner_radius,
                outer_radius,
                1.0,
                poisson_ratio,
                CoreSupport::Free,
            ),
            CoreStiffness::Tube {
                inner_radius,
                outer_radius,
                hoop_modulus,
                radial_modulus,
                poisson_ratio,
                support,
            } => {
                let k = (hoop_modulus / radial_modulus).sqrt();
                (inner_radius, outer_radius, k, poisson_ratio, support)
            }
            CoreStiffness::Rigid | CoreStiffness::Measured { .. } => return None,
        };
        Some(tube_solution(
            inner_radius / outer_radius,
            k,
            poisson_ratio,
            support,
        ))
    }

    /// How the bore is held (free for every form but a tube on a shaft).
    pub fn support(&self) -> CoreSupport {
        match *self {
            CoreStiffness::Tube { support, .. } => support,
            _ => CoreSupport::Free,
        }
    }

    /// The same core with its moduli (or measured stiffness) multiplied by `factor`.
    pub fn scaled(&self, factor: f64) -> CoreStiffness {
        let mut scaled = *self;
        match &mut scaled {
            CoreStiffness::Rigid => {}
            CoreStiffness::Hollow { modulus, .. } => *modulus *= factor,
            CoreStiffness::Tube {
                hoop_modulus,
                radial_modulus,
                ..
            } => {
                *hoop_modulus *= factor;
                *radial_modulus *= factor;
            }
            CoreStiffness::Measured { stiffness } => *stiffness *= factor,
        }
        scaled
    }

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
                check_radii(inner_radius, outer_radius)?;
                check_modulus("core.modulus", modulus)?;
                check_poisson(poisson_ratio)
            }
            CoreStiffness::Tube {
                inner_radius,
                outer_radius,
                hoop_modulus,
                radial_modulus,
                poisson_ratio,
                ..
            } => {
                check_radii(inner_radius, outer_radius)?;
                check_modulus("core.modulus", hoop_modulus)?;
                check_modulus("core.radial_modulus", radial_modulus)?;
                check_poisson(poisson_ratio)?;
                // Positive-definite compliance needs ν² < Eθ/Er (always true for ν < 0.5
                // when Eθ ≥ Er); reject a radial modulus so far above the hoop one that it fails.
                if poisson_ratio * poisson_ratio >= hoop_modulus / radial_modulus {
                    return Err(OutOfRange {
                        field: "core.radial_modulus",
                        value: radial_modulus,
                        accepted: "below hoop modulus / ν² (a physically possible material)",
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

fn check_radii(inner_radius: f64, outer_radius: f64) -> Result<(), super::ModelError> {
    use super::ModelError::OutOfRange;
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
    Ok(())
}

fn check_modulus(field: &'static str, modulus: f64) -> Result<(), super::ModelError> {
    if modulus.is_finite() && modulus > 0.0 {
        Ok(())
    } else {
        Err(super::ModelError::OutOfRange {
            field,
            value: modulus,
            accepted: "a finite modulus > 0 Pa",
        })
    }
}

fn check_poisson(poisson_ratio: f64) -> Result<(), super::ModelError> {
    if poisson_ratio.is_finite() && (0.0..0.5).contains(&poisson_ratio) {
        Ok(())
    } else {
        Err(super::ModelError::OutOfRange {
            field: "core.poisson_ratio",
            value: poisson_ratio,
            accepted: "0 ≤ ν < 0.5",
        })
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
        // Lamé bore hoop stress under external pressure: −2·b²/(b² − a²)·p = −4.5714·p.
        let wall = core.wall_stress().unwrap();
        assert!((wall.hoop_at_bore + 4.571_43).abs() < 1e-4);
    }

    #[test]
    fn orthotropic_tube_reduces_to_lame_with_equal_moduli() {
        let tube = CoreStiffness::Tube {
            inner_radius: 0.0381,
            outer_radius: 0.0508,
            hoop_modulus: 2e9,
            radial_modulus: 2e9,
            poisson_ratio: 0.3,
            support: CoreSupport::Free,
        };
        let lame = CoreStiffness::Hollow {
            inner_radius: 0.0381,
            outer_radius: 0.0508,
            modulus: 2e9,
            poisson_ratio: 0.3,
        };
        let (t, l) = (tube.effective_stiffness(), lame.effective_stiffness());
        assert!((t - l).abs() < 1e-9 * l, "{t} vs {l}");
        let (tw, lw) = (tube.wall_stress().unwrap(), lame.wall_stress().unwrap());
        assert!((tw.hoop_at_bore - lw.hoop_at_bore).abs() < 1e-12);
        assert!((tw.hoop_at_outside - lw.hoop_at_outside).abs() < 1e-12);
    }

    #[test]
    fn a_soft_radial_direction_softens_the_core_and_moves_the_peak_outward() {
        // Gerhardt (1990): in paper tubes the hoop stress is concentrated at the outer wall.
        let tube = |radial: f64| CoreStiffness::Tube {
            inner_radius: 0.0381,
            outer_radius: 0.0508,
            hoop_modulus: 2e9,
            radial_modulus: radial,
            poisson_ratio: 0.3,
            support: CoreSupport::Free,
        };
        assert!(tube(40e6).effective_stiffness() < tube(2e9).effective_stiffness());
        assert_eq!(tube(40e6).wall_stress().unwrap().governing().1, "outside");
        assert_eq!(tube(2e9).wall_stress().unwrap().governing().1, "bore");
    }

    #[test]
    fn a_shaft_stiffens_the_core() {
        // Solid disc limit (a → 0): Ec = E/(1 − ν) for both supports (plane stress).
        for support in [CoreSupport::Free, CoreSupport::Shaft] {
            let disc = CoreStiffness::Tube {
                inner_radius: 0.0,
                outer_radius: 0.05,
                hoop_modulus: 1.0,
                radial_modulus: 1.0,
                poisson_ratio: 0.3,
                support,
            };
            assert!((disc.effective_stiffness() - 1.0 / 0.7).abs() < 1e-12);
        }
        let tube = |support| CoreStiffness::Tube {
            inner_radius: 0.0381,
            outer_radius: 0.0508,
            hoop_modulus: 2e9,
            radial_modulus: 40e6,
            poisson_ratio: 0.3,
            support,
        };
        assert!(
            tube(CoreSupport::Shaft).effective_stiffness()
                > tube(CoreSupport::Free).effective_stiffness()
        );
    }
}
