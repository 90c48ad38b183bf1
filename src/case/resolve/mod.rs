//! Resolve a case as written into SI: parse each quantity, check it against the registry's
//! range, fill what is missing from the presets (recording it as assumed), and turn names into
//! the enums of `vocabulary`. This module owns the [`Resolver`] and the order of the sections
//! (web, core, roll, winding, symptoms, measurements) and the model's own checks as a guard;
//! `values` reads and records one value, `web` and `core_section` resolve those sections, `winding`
//! the roll and the winding settings (with `winder`, `tension_forms`, `density`).

mod core_section;
mod density;
mod tension_forms;
mod values;
mod web;
mod winder;
mod winding;

use crate::presets::{CorePreset, WebPreset};
use crate::vocabulary::Place;

use super::{AssumedValue, Case, CaseError, ResolvedCase};

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
    /// A resolver with nothing assumed yet that names `origin` in its messages.
    pub(super) fn new(origin: &str) -> Self {
        Resolver {
            origin: origin.to_string(),
            assumed: Vec::new(),
            named_web: None,
            named_core: None,
        }
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
}
