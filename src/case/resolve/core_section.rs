//! The core section of a case: material and preset, diameters, support, stiffness (measured,
//! rigid, Lamé's cylinder or an orthotropic tube) and the crush limit (ratings or estimate).

use crate::model::core_crush::{self, CrushBasis, CrushRatings};
use crate::model::{CoreStiffness, CoreSupport};
use crate::presets::{self, CorePreset};
use crate::units::{QuantityKind, UnitSystem, format_quantity};
use crate::vocabulary::CoreMaterial;

use super::super::registry as reg;
use super::super::{CaseError, CoreInput, ResolvedCore, ResolvedWeb};
use super::Resolver;

impl Resolver {
    pub(super) fn core(
        &mut self,
        core: &CoreInput,
        web: &ResolvedWeb,
    ) -> Result<ResolvedCore, CaseError> {
        let material_given = match &core.material {
            Some(m) => Some(self.word(
                &reg::CORE_MATERIAL,
                "core material",
                m,
                CoreMaterial::from_id,
                CoreMaterial::IDS,
            )?),
            None => None,
        };
        let outside_given = self.quantity(
            reg::CORE_OUTSIDE.path,
            core.outside_diameter.as_ref(),
            QuantityKind::Length,
        )?;
        let inside_given = self.quantity(
            reg::CORE_INSIDE.path,
            core.inside_diameter.as_ref(),
            QuantityKind::Length,
        )?;
        let preset = match &core.preset {
            Some(id) => match presets::core_preset(id) {
                Some(p) => p,
                None => {
                    let ids: Vec<&'static str> =
                        presets::core_presets().iter().map(|p| p.id).collect();
                    return Err(self.unknown_name(reg::CORE_PRESET.path, "core preset", id, &ids));
                }
            },
            None => presets::default_core_for(material_given, web.material, outside_given),
        };
        if core.preset.is_some() {
            self.named_core = Some(preset);
        }
        if let Some(m) = material_given
            && m != CoreMaterial::Rigid
            && m != preset.material
        {
            return Err(self.invalid(format!(
                "core.material `{m}` does not match core.preset `{}` (a {} core); drop one of them or pick a {m} preset",
                preset.id, preset.material
            )));
        }
        let from = format!("preset {}", preset.id);
        let material = match material_given {
            Some(m) => m,
            None => {
                self.assume(
                    reg::CORE_MATERIAL.path,
                    preset.material.to_string(),
                    &from,
                    "material of the preset",
                );
                preset.material
            }
        };
        let (inside, outside) = self.core_diameters(preset, inside_given, outside_given)?;
        let support = match &core.support {
            Some(word) => match word.as_str() {
                "free" => CoreSupport::Free,
                "shaft" => CoreSupport::Shaft,
                other => {
                    return Err(self.unknown_name(
                        reg::CORE_SUPPORT.path,
                        "core support",
                        other,
                        reg::CORE_SUPPORTS,
                    ));
                }
            },
            None => {
                self.assume(
                    reg::CORE_SUPPORT.path,
                    "free".to_string(),
                    "",
                    "default: judged as a free core (shaft pulled, in storage), the state in which cores crush",
                );
                CoreSupport::Free
            }
        };
        let stiffness = self.core_stiffness(core, material, preset, inside, outside, support)?;
        let (crush_pressure, crush_basis) =
            self.core_crush(core, preset, &stiffness, inside, outside, support)?;
        let shaft_torque_rating = match core.shaft_torque_rating.as_ref() {
            Some(text) => Some(self.required_quantity(&reg::SHAFT_TORQUE_RATING, Some(text))?),
            None => None,
        };
        Ok(ResolvedCore {
            shaft_torque_rating,
            preset: Some(preset.id.to_string()),
            material,
            inside_diameter: inside,
            outside_diameter: outside,
            stiffness,
            crush_pressure,
            support,
            crush_basis,
        })
    }

    /// The crush limit: the supplier's radial and flat crush ratings (the lower governs), else
    /// an estimate from the wall's hoop stress and buckling, else the preset's value.
    fn core_crush(
        &mut self,
        core: &CoreInput,
        preset: &CorePreset,
        stiffness: &CoreStiffness,
        inside: f64,
        outside: f64,
        support: CoreSupport,
    ) -> Result<(f64, CrushBasis), CaseError> {
        let radial = match &core.crush_pressure {
            Some(text) => Some(self.required_quantity(&reg::CRUSH, Some(text))?),
            None => None,
        };
        let flat = match &core.flat_crush {
            Some(text) => Some(self.required_quantity(&reg::FLAT_CRUSH, Some(text))?),
            None => None,
        };
        let ratings = CrushRatings {
            radial_pressure: radial,
            flat_load: flat,
        };
        if let Some(limit) = core_crush::rated_limit(&ratings, (outside - inside) / 2.0, support) {
            return Ok((limit.pressure, limit.basis));
        }
        let strength = self.quantity_or(
            &reg::CORE_STRENGTH,
            core.compressive_strength.as_ref(),
            None,
            Some(preset),
        )?;
        match core_crush::estimated_limit(stiffness, strength) {
            Some(limit) => {
                self.assume(
                    reg::CRUSH.path,
                    reg::CRUSH.range().show(limit.pressure),
                    "",
                    &format!("{} ({})", limit.basis.describe(), limit.support.describe()),
                );
                Ok((limit.pressure, limit.basis))
            }
            None => {
                let value = self.quantity_or(&reg::CRUSH, None, None, Some(preset))?;
                Ok((value, CrushBasis::Given))
            }
        }
    }

    /// The core's inside and outside diameters: as given, one from the other and the preset's
    /// wall, or both from the preset.
    fn core_diameters(
        &mut self,
        preset: &CorePreset,
        inside_given: Option<f64>,
        outside_given: Option<f64>,
    ) -> Result<(f64, f64), CaseError> {
        let from = format!("preset {}", preset.id);
        let inside_range = reg::CORE_INSIDE.range();
        let outside_range = reg::CORE_OUTSIDE.range();
        let wall_twice = preset.outside_diameter.value - preset.inside_diameter.value;
        let (inside, outside) = match (inside_given, outside_given) {
            (Some(i), Some(o)) => {
                self.note_preset_copy(&reg::CORE_INSIDE, i);
                self.note_preset_copy(&reg::CORE_OUTSIDE, o);
                (i, o)
            }
            (None, Some(o)) => {
                let i = o - wall_twice;
                self.assume(
                    reg::CORE_INSIDE.path,
                    format_quantity(i, QuantityKind::Length, UnitSystem::Si),
                    &from,
                    "outside diameter given minus the preset's wall",
                );
                (i, o)
            }
            (Some(i), None) => {
                let o = i + wall_twice;
                self.assume(
                    reg::CORE_OUTSIDE.path,
                    format_quantity(o, QuantityKind::Length, UnitSystem::Si),
                    &from,
                    "inside diameter given plus the preset's wall",
                );
                (i, o)
            }
            (None, None) => (
                self.assumed(
                    reg::CORE_INSIDE.path,
                    &inside_range,
                    preset.inside_diameter,
                    &from,
                ),
                self.assumed(
                    reg::CORE_OUTSIDE.path,
                    &outside_range,
                    preset.outside_diameter,
                    &from,
                ),
            ),
        };
        let outside = self.check(reg::CORE_OUTSIDE.path, outside, &outside_range)?;
        let inside = self.check(reg::CORE_INSIDE.path, inside, &inside_range)?;
        if inside >= outside {
            return Err(self.out_of_range(
                reg::CORE_INSIDE.path,
                inside_range.show(inside),
                format!(
                    "less than the core outside diameter {}",
                    outside_range.show(outside)
                ),
            ));
        }
        Ok((inside, outside))
    }

    /// The core's stiffness: measured, rigid, or a hollow cylinder of the given (or preset)
    /// modulus.
    fn core_stiffness(
        &mut self,
        core: &CoreInput,
        material: CoreMaterial,
        preset: &CorePreset,
        inside: f64,
        outside: f64,
        support: CoreSupport,
    ) -> Result<CoreStiffness, CaseError> {
        // A Poisson ratio that is given is checked even when the stiffness does not use it (a
        // rigid or measured core): the file must not carry a value no core can have.
        if let Some(nu) = core.poisson_ratio {
            self.check(reg::CORE_POISSON.path, nu, &reg::CORE_POISSON.range())?;
        }
        if let Some(text) = &core.stiffness {
            if core.modulus.is_some() {
                return Err(self.invalid(
                    "core.stiffness (measured) and core.modulus are both given; keep one",
                ));
            }
            return Ok(CoreStiffness::Measured {
                stiffness: self.required_quantity(&reg::CORE_STIFFNESS, Some(text))?,
            });
        }
        if material == CoreMaterial::Rigid {
            if core.modulus.is_some() {
                return Err(
                    self.invalid("core.modulus is given but core.material is `rigid`; keep one")
                );
            }
            return Ok(CoreStiffness::Rigid);
        }
        let p = Some(preset);
        let modulus = self.quantity_or(&reg::CORE_MODULUS, core.modulus.as_ref(), None, p)?;
        let poisson_ratio = self.number_or(&reg::CORE_POISSON, core.poisson_ratio, None, p)?;
        let radial_modulus = match (&core.radial_modulus, material) {
            (Some(_), _) | (None, CoreMaterial::Paper) => self.quantity_or(
                &reg::CORE_RADIAL_MODULUS,
                core.radial_modulus.as_ref(),
                None,
                p,
            )?,
            // Steel, aluminium and plastic cores are isotropic.
            (None, _) => modulus,
        };
        if radial_modulus == modulus && support == CoreSupport::Free {
            // The isotropic tube with a free bore is Lamé's cylinder.
            return Ok(CoreStiffness::Hollow {
                inner_radius: inside / 2.0,
                outer_radius: outside / 2.0,
                modulus,
                poisson_ratio,
            });
        }
        let tube = CoreStiffness::Tube {
            inner_radius: inside / 2.0,
            outer_radius: outside / 2.0,
            hoop_modulus: modulus,
            radial_modulus,
            poisson_ratio,
            support,
        };
        tube.validate().map_err(|e| self.invalid(e.to_string()))?;
        Ok(tube)
    }
}
