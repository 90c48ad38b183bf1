//! The web section of a case: material and preset, caliper, width, moduli, the radial
//! stiffness law, friction, density, roughness and strength.

use crate::model::RadialStiffness;
use crate::presets;
use crate::vocabulary::{RadialLaw, WebMaterial};

use super::super::registry::{self as reg, Field};
use super::super::{CaseError, QuantityText, RadialStiffnessInput, ResolvedWeb, WebInput};
use super::Resolver;

impl Resolver {
    pub(super) fn web(&mut self, web: &WebInput) -> Result<ResolvedWeb, CaseError> {
        let material_given = match &web.material {
            Some(m) => Some(self.word(
                &reg::WEB_MATERIAL,
                "web material",
                m,
                WebMaterial::from_id,
                WebMaterial::IDS,
            )?),
            None => None,
        };
        let preset = match &web.preset {
            Some(id) => match presets::web_preset(id) {
                Some(p) => p,
                None => {
                    let ids: Vec<&'static str> =
                        presets::web_presets().iter().map(|p| p.id).collect();
                    return Err(self.unknown_name(reg::WEB_PRESET.path, "web preset", id, &ids));
                }
            },
            None => presets::default_web_for_material(material_given.unwrap_or(WebMaterial::Paper)),
        };
        if web.preset.is_some() {
            self.named_web = Some(preset);
        }
        let from = format!("preset {}", preset.id);
        let material = match material_given {
            Some(m) => m,
            None => {
                self.assume(
                    reg::WEB_MATERIAL.path,
                    preset.material.to_string(),
                    &from,
                    "material kind of the preset",
                );
                preset.material
            }
        };
        let p = Some(preset);
        let thickness = self.quantity_or(&reg::WEB_THICKNESS, web.thickness.as_ref(), p, None)?;
        let width = self.quantity_or(&reg::WEB_WIDTH, web.width.as_ref(), p, None)?;
        let tangential_modulus =
            self.quantity_or(&reg::WEB_MODULUS, web.tangential_modulus.as_ref(), p, None)?;
        let radial_stiffness = match &web.radial_stiffness {
            Some(input) => self.radial_law(input)?,
            None => {
                let k1 = self.quantity_or(&reg::K1, None, p, None)?;
                let k2 = self.number_or(&reg::K2, None, p, None)?;
                RadialStiffness::Pfeiffer { k1, k2 }
            }
        };
        let poisson_ratio = self.number_or(&reg::WEB_POISSON, web.poisson_ratio, p, None)?;
        let friction = self.number_or(&reg::FRICTION, web.friction, p, None)?;
        let kinetic_friction = match web.kinetic_friction {
            // Kinetic friction does not exceed static: a preset value above the static
            // friction the case gives is held at it.
            None if preset.kinetic_friction.value > friction => {
                self.assume(
                    reg::KINETIC_FRICTION.path,
                    format!("{friction}"),
                    &from,
                    "held at the static friction given (the preset's kinetic value is higher)",
                );
                friction
            }
            given => self.number_or(&reg::KINETIC_FRICTION, given, p, None)?,
        };
        let density = self.density(web, thickness, p)?;
        let roughness = self.quantity_or(&reg::ROUGHNESS, web.roughness.as_ref(), p, None)?;
        let strength = self.quantity_or(&reg::STRENGTH, web.strength.as_ref(), p, None)?;
        Ok(ResolvedWeb {
            preset: Some(preset.id.to_string()),
            material,
            thickness,
            width,
            tangential_modulus,
            radial_stiffness,
            poisson_ratio,
            friction,
            kinetic_friction,
            density,
            roughness,
            strength,
        })
    }

    fn radial_law(&mut self, input: &RadialStiffnessInput) -> Result<RadialStiffness, CaseError> {
        let law = self.word(
            &reg::RADIAL_LAW,
            "radial stiffness law",
            &input.law,
            RadialLaw::from_id,
            RadialLaw::IDS,
        )?;
        let given: [(&Field, bool); 5] = [
            (&reg::K1, input.k1.is_some()),
            (&reg::K2, input.k2.is_some()),
            (&reg::RADIAL_MODULUS, input.modulus.is_some()),
            (&reg::POWER_COEFFICIENT, input.coefficient.is_some()),
            (&reg::POWER_EXPONENT, input.exponent.is_some()),
        ];
        let needs: &[&str] = match law {
            RadialLaw::Pfeiffer => &["k1", "k2"],
            RadialLaw::Constant => &["modulus"],
            RadialLaw::PowerLaw => &["coefficient", "exponent"],
        };
        for (field, present) in given {
            let name = field.key();
            if present && !needs.contains(&name) {
                return Err(self.invalid(format!(
                    "{} is not used by law `{law}`; law `{law}` takes {}",
                    field.path,
                    needs.join(" and ")
                )));
            }
            if !present && needs.contains(&name) {
                return Err(self.invalid(format!(
                    "{} is required for law `{law}` (it takes {})",
                    field.path,
                    needs.join(" and ")
                )));
            }
        }
        Ok(match law {
            RadialLaw::Pfeiffer => {
                let k1 = self.required_quantity(&reg::K1, input.k1.as_ref())?;
                let k2 = self.required_number(&reg::K2, input.k2)?;
                self.note_preset_copy(&reg::K1, k1);
                self.note_preset_copy(&reg::K2, k2);
                RadialStiffness::Pfeiffer { k1, k2 }
            }
            RadialLaw::Constant => RadialStiffness::Constant {
                modulus: self.required_quantity(&reg::RADIAL_MODULUS, input.modulus.as_ref())?,
            },
            RadialLaw::PowerLaw => RadialStiffness::PowerLaw {
                coefficient: self
                    .required_quantity(&reg::POWER_COEFFICIENT, input.coefficient.as_ref())?,
                exponent: self.required_number(&reg::POWER_EXPONENT, input.exponent)?,
            },
        })
    }

    /// A radial stiffness law as a case file's `web.radial_stiffness` accepts it: the law's
    /// fields, each within the registry's range, and the model's own check.
    pub(crate) fn check_radial_law(
        origin: &str,
        input: &RadialStiffnessInput,
    ) -> Result<RadialStiffness, CaseError> {
        let mut resolver = Resolver::new(origin);
        let law = resolver.radial_law(input)?;
        match law.validate() {
            Ok(()) => Ok(law),
            Err(crate::model::ModelError::OutOfRange {
                field,
                value,
                accepted,
            }) => Err(resolver.out_of_range(
                &format!("web.{field}"),
                format!("{value}"),
                accepted.into(),
            )),
            Err(other) => Err(resolver.invalid(other.to_string())),
        }
    }

    /// A web thickness (caliper) as a case file's `web.thickness` accepts it.
    pub(crate) fn check_thickness(origin: &str, value: &QuantityText) -> Result<f64, CaseError> {
        let resolver = Resolver::new(origin);
        resolver.required_quantity(&reg::WEB_THICKNESS, Some(value))
    }
}
