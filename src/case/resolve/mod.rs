//! Resolve a case as written into SI: parse each quantity, check it against the registry's
//! range, fill what is missing from the presets (recording it as assumed), and turn names into
//! the enums of `vocabulary`. The web and the core are resolved here, the roll and the winding
//! settings in `winding`.

mod density;
mod tension_forms;
mod winder;
mod winding;

use crate::model::core_crush::{self, CrushBasis, CrushRatings};
use crate::model::{CoreStiffness, CoreSupport, RadialStiffness};
use crate::presets::{self, CorePreset, Sourced, WebPreset};
use crate::units::{QuantityKind, UnitSystem, format_quantity, parse_quantity};
use crate::vocabulary::{CoreMaterial, Place, RadialLaw, WebMaterial};

use super::registry::{self as reg, Field, Range};
use super::{
    AssumedValue, Case, CaseError, CoreInput, QuantityText, RadialStiffnessInput, ResolvedCase,
    ResolvedCore, ResolvedWeb, ValueOrigin, WebInput,
};

/// Resolves one case; `origin` names the file (or the case) in every message.
pub(super) struct Resolver {
    pub(super) origin: String,
    pub(super) assumed: Vec<AssumedValue>,
    /// The web and core presets the case names (not the defaults picked for it): a value given
    /// equal to one of theirs is recorded as a preset copy.
    pub(super) named_web: Option<&'static WebPreset>,
    pub(super) named_core: Option<&'static CorePreset>,
}

/// A value written by `case new` is the preset's value printed to about four significant
/// figures; within this share it is taken as the preset's value, unchanged.
pub(super) const PRESET_COPY_TOLERANCE: f64 = 5e-3;

impl Resolver {
    fn unit_error(&self, source: crate::units::UnitError) -> CaseError {
        CaseError::Quantity {
            origin: self.origin.clone(),
            error: Box::new(source),
        }
    }

    fn invalid(&self, message: impl Into<String>) -> CaseError {
        CaseError::Invalid {
            origin: self.origin.clone(),
            message: message.into(),
        }
    }

    fn out_of_range(&self, field: &str, given: String, accepted: String) -> CaseError {
        CaseError::OutOfRange {
            origin: self.origin.clone(),
            field: field.to_string(),
            given,
            accepted,
        }
    }

    fn unknown_name(
        &self,
        field: &str,
        what: &'static str,
        given: &str,
        accepted: &[&'static str],
    ) -> CaseError {
        CaseError::UnknownName {
            origin: self.origin.clone(),
            field: field.to_string(),
            what,
            given: given.into(),
            suggestion: crate::vocabulary::closest(given, accepted.iter().copied()),
            accepted: accepted.join(", ").into(),
        }
    }

    /// Parse a quantity as written; `None` when absent.
    fn quantity(
        &self,
        field: &str,
        value: Option<&QuantityText>,
        kind: QuantityKind,
    ) -> Result<Option<f64>, CaseError> {
        match value {
            None => Ok(None),
            Some(QuantityText::Number(number)) => {
                if number.is_finite() {
                    Ok(Some(*number))
                } else {
                    Err(self.out_of_range(field, number.to_string(), "a finite number".to_string()))
                }
            }
            Some(QuantityText::Text(text)) => parse_quantity(field, text, kind)
                .map(Some)
                .map_err(|e| self.unit_error(e)),
        }
    }

    fn check(&self, field: &str, value: f64, range: &Range) -> Result<f64, CaseError> {
        if range.contains(value) {
            Ok(value)
        } else {
            Err(self.out_of_range(field, range.show(value), range.describe()))
        }
    }

    /// A quantity that must be in the field's range, or the field's default from the presets
    /// (recorded as assumed).
    fn quantity_or(
        &mut self,
        field: &Field,
        value: Option<&QuantityText>,
        web: Option<&WebPreset>,
        core: Option<&CorePreset>,
    ) -> Result<f64, CaseError> {
        let kind = field.range().kind.unwrap_or(QuantityKind::Percent);
        let value = self.quantity(field.path, value, kind)?;
        self.number_or(field, value, web, core)
    }

    /// A plain number that must be in the field's range, or the field's default from the
    /// presets (recorded as assumed).
    pub(super) fn number_or(
        &mut self,
        field: &Field,
        value: Option<f64>,
        web: Option<&WebPreset>,
        core: Option<&CorePreset>,
    ) -> Result<f64, CaseError> {
        let range = field.range();
        match (value, field.preset_value(web, core)) {
            (Some(v), _) => {
                let v = self.check(field.path, v, &range)?;
                self.note_preset_copy(field, v);
                Ok(v)
            }
            (None, Some((fallback, from))) => Ok(self.assumed(field.path, &range, fallback, &from)),
            (None, None) => Err(self.invalid(format!("{} is required", field.path))),
        }
    }

    /// Record the preset value `fallback` of a missing `field` as assumed and return it.
    fn assumed(&mut self, field: &str, range: &Range, fallback: Sourced, from: &str) -> f64 {
        self.assume(field, range.show(fallback.value), from, fallback.source);
        fallback.value
    }

    /// Record a given value that equals the named preset's value (or the fixed default, in a
    /// case that names a preset) as a preset copy: `case new` wrote it, nobody measured it.
    fn note_preset_copy(&mut self, field: &Field, value: f64) {
        let named = match field.default {
            reg::DefaultValue::WebPreset(_) => self.named_web.is_some(),
            reg::DefaultValue::CorePreset(_) => self.named_core.is_some(),
            reg::DefaultValue::Fixed(_) => self.named_web.is_some() || self.named_core.is_some(),
            _ => false,
        };
        if !named {
            return;
        }
        let Some((preset, from)) = field.preset_value(self.named_web, self.named_core) else {
            return;
        };
        let scale = preset.value.abs().max(f64::MIN_POSITIVE);
        if (value - preset.value).abs() / scale <= PRESET_COPY_TOLERANCE {
            let shown = field.range().show(value);
            self.push_assumed(field.path, shown, &from, preset.source, ValueOrigin::Preset);
        }
    }

    fn assume(&mut self, field: &str, value: String, from: &str, source: &str) {
        self.push_assumed(field, value, from, source, ValueOrigin::Default);
    }

    /// Record a value computed from other inputs (shown as computed, not given).
    pub(super) fn computed(&mut self, field: &str, value: String, how: &str) {
        self.push_assumed(field, value, "", how, ValueOrigin::Computed);
    }

    pub(super) fn push_assumed(
        &mut self,
        field: &str,
        value: String,
        from: &str,
        source: &str,
        origin: ValueOrigin,
    ) {
        let source = if from.is_empty() {
            source.to_string()
        } else {
            format!("{from}: {source}")
        };
        self.assumed.push(AssumedValue {
            field: field.to_string(),
            value,
            source,
            origin,
        });
    }

    pub(super) fn resolve(mut self, case: &Case) -> Result<ResolvedCase, CaseError> {
        if case.title.trim().is_empty() {
            return Err(self.invalid("title is empty; give the case a short title"));
        }
        if let Some(record) = &case.complaint {
            record.check(None).map_err(|m| self.invalid(m))?;
        }
        let web = self.web(&case.web)?;
        if case.web.preset.is_none() {
            self.note_default_preset("web", web.preset.as_deref());
        }
        let core = self.core(&case.core, &web)?;
        if case.core.preset.is_none() {
            self.note_default_preset("core", core.preset.as_deref());
        }
        let roll = self.roll(&case.roll, &web, &core)?;
        let winding = self.winding(&case.winding, &web, &core, &roll)?;
        for (index, symptom) in case.symptoms.iter().enumerate() {
            if !crate::vocabulary::is_symptom(&symptom.id) {
                return Err(self.unknown_name(
                    &format!("symptoms[{index}].id"),
                    "symptom",
                    &symptom.id,
                    &crate::vocabulary::SYMPTOM_IDS,
                ));
            }
            if let Some(place) = &symptom.place
                && Place::from_id(place).is_none()
            {
                return Err(self.unknown_name(
                    &format!("symptoms[{index}].where"),
                    "place on the roll",
                    place,
                    Place::IDS,
                ));
            }
        }
        // A weight needs the width; an assumed width would make up a length.
        let width_given = !self.assumed.iter().any(|a| a.field == "web.width");
        let measurements = match &case.measurements {
            Some(input) => {
                super::measurements::resolve(input, &self.origin, width_given.then_some(web.width))?
            }
            None => None,
        };
        let resolved = ResolvedCase {
            title: case.title.clone(),
            web,
            core,
            roll,
            winding,
            symptoms: case.symptoms.clone(),
            answers: case.answers.clone(),
            assumed: std::mem::take(&mut self.assumed),
            measurements,
        };
        self.model_accepts(&resolved)?;
        Ok(resolved)
    }

    /// The model's own parameter checks, as a guard: the registry's ranges are at least as
    /// strict, so a case that resolves is one the solver accepts (`case check` and `stress`
    /// agree). Should one ever fail, the message names the case field.
    fn model_accepts(&self, case: &ResolvedCase) -> Result<(), CaseError> {
        let problem = case.problem(crate::model::SolverOptions::default());
        let checks = [
            problem.radial_stiffness.validate(),
            problem.core.validate(),
            problem.winding.validate(),
        ];
        for check in checks {
            match check {
                Ok(()) => {}
                Err(crate::model::ModelError::OutOfRange {
                    field,
                    value,
                    accepted,
                }) => {
                    let field = match field {
                        "core.inner_radius" => "core.inside_diameter".to_string(),
                        "core.outer_radius" => "core.outside_diameter".to_string(),
                        f if f.starts_with("radial_stiffness.") => format!("web.{f}"),
                        f => f.to_string(),
                    };
                    return Err(self.out_of_range(&field, format!("{value}"), accepted.into()));
                }
                Err(other) => return Err(self.invalid(other.to_string())),
            }
        }
        Ok(())
    }

    /// A preset chosen by default is listed as assumed only when some value actually came from
    /// it, so a case that gives every value resolves with nothing assumed.
    fn note_default_preset(&mut self, section: &str, id: Option<&str>) {
        let Some(id) = id else { return };
        let from = format!("preset {id}:");
        let prefix = format!("{section}.");
        let used = self
            .assumed
            .iter()
            .any(|a| a.field.starts_with(&prefix) && a.source.starts_with(&from));
        if used {
            self.assume(
                &format!("{section}.preset"),
                id.to_string(),
                "",
                &format!("default {section} preset for the material and size given; name one with {section}.preset"),
            );
        }
    }

    /// A name from a closed list, or an "unknown name" error with a suggestion.
    fn word<T>(
        &self,
        field: &Field,
        what: &'static str,
        given: &str,
        parse: fn(&str) -> Option<T>,
        accepted: &[&'static str],
    ) -> Result<T, CaseError> {
        parse(given).ok_or_else(|| self.unknown_name(field.path, what, given, accepted))
    }

    fn web(&mut self, web: &WebInput) -> Result<ResolvedWeb, CaseError> {
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

    /// A required quantity in the field's range (its presence is checked by the caller).
    pub(super) fn required_quantity(
        &self,
        field: &Field,
        value: Option<&QuantityText>,
    ) -> Result<f64, CaseError> {
        let range = field.range();
        let kind = range.kind.unwrap_or(QuantityKind::Percent);
        match self.quantity(field.path, value, kind)? {
            Some(v) => self.check(field.path, v, &range),
            None => Err(self.invalid(format!("{} is required", field.path))),
        }
    }

    /// A required plain number in the field's range.
    fn required_number(&self, field: &Field, value: Option<f64>) -> Result<f64, CaseError> {
        match value {
            Some(v) => self.check(field.path, v, &field.range()),
            None => Err(self.invalid(format!("{} is required", field.path))),
        }
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
        let mut resolver = Resolver {
            origin: origin.to_string(),
            assumed: Vec::new(),
            named_web: None,
            named_core: None,
        };
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
        let resolver = Resolver {
            origin: origin.to_string(),
            assumed: Vec::new(),
            named_web: None,
            named_core: None,
        };
        resolver.required_quantity(&reg::WEB_THICKNESS, Some(value))
    }

    fn core(&mut self, core: &CoreInput, web: &ResolvedWeb) -> Result<ResolvedCore, CaseError> {
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
