//! The winder's own settings: nip programme, levelling-off load, centre torque and the drums
//! of a two-drum winder, each checked against the winder type and turned into per-width SI.

use crate::model::{DrumSet, NipProgramme, WindingMethod};
use crate::units::QuantityKind;

use super::super::registry as reg;
use super::super::{CaseError, ResolvedCore, ResolvedRoll, ResolvedWeb, WindingInput};
use super::Resolver;
use super::winding::OutwardList;

/// What the winder adds to the winding settings.
pub(super) struct WinderSettings {
    pub nip_programme: Option<NipProgramme>,
    pub nip_plateau: f64,
    pub centre_torque: Option<f64>,
    pub drums: Option<DrumSet>,
}

impl Resolver {
    pub(super) fn winder(
        &mut self,
        method: WindingMethod,
        winding: &WindingInput,
        web: &ResolvedWeb,
        core: &ResolvedCore,
        roll: &ResolvedRoll,
    ) -> Result<WinderSettings, CaseError> {
        let nip_programme = self.nip_programme(winding, core, roll)?;
        let nip_plateau =
            self.quantity_or(&reg::NIP_PLATEAU, winding.nip_plateau.as_ref(), None, None)?;
        let centre_torque = match (&winding.centre_torque, method) {
            (Some(text), WindingMethod::CentreSurface) => {
                Some(self.required_quantity(&reg::CENTRE_TORQUE, Some(text))? / web.width)
            }
            (Some(_), other) => {
                return Err(self.invalid(format!(
                    "winding.centre_torque is given but winding.method is `{}`; a centre torque applies to `centre_surface` winders",
                    other.id()
                )));
            }
            (None, WindingMethod::CentreSurface) => {
                self.assume(
                    reg::CENTRE_TORQUE.path,
                    "none".to_string(),
                    "",
                    "default: no centre drive torque, wound as a surface winder",
                );
                None
            }
            (None, _) => None,
        };
        let drums = match (&winding.drums, method) {
            (Some(input), WindingMethod::TwoDrum | WindingMethod::CentreSurface) => {
                Some(self.drums(Some(input), web, core)?)
            }
            (None, WindingMethod::TwoDrum) => Some(self.drums(None, web, core)?),
            (Some(_), other) => {
                return Err(self.invalid(format!(
                    "winding.drums is given but winding.method is `{}`; drums apply to `two_drum` and `centre_surface` winders",
                    other.id()
                )));
            }
            (None, _) => None,
        };
        Ok(WinderSettings {
            nip_programme,
            nip_plateau,
            centre_torque,
            drums,
        })
    }

    fn nip_programme(
        &mut self,
        winding: &WindingInput,
        core: &ResolvedCore,
        roll: &ResolvedRoll,
    ) -> Result<Option<NipProgramme>, CaseError> {
        if winding.nip_programme.is_empty() {
            return Ok(None);
        }
        if winding.nip_load.is_some() {
            return Err(self.invalid(
                "winding.nip_load and winding.nip_programme are both given; keep one (the programme gives the load at each diameter)",
            ));
        }
        let list = OutwardList::new("winding.nip_programme", "point", core, roll);
        let points = self.read_outward(
            list,
            &winding.nip_programme,
            |point| ("diameter", &point.diameter),
            |this, field, point| {
                let load_field = format!("{field}.nip_load");
                let load = this
                    .quantity(
                        &load_field,
                        Some(&point.nip_load),
                        QuantityKind::ForcePerWidth,
                    )?
                    .unwrap_or(f64::NAN);
                this.check(&load_field, load, &reg::NIP_POINT_LOAD.range())
            },
        )?;
        Ok(Some(NipProgramme { points }))
    }

    fn drums(
        &mut self,
        input: Option<&super::super::DrumsInput>,
        web: &ResolvedWeb,
        core: &ResolvedCore,
    ) -> Result<DrumSet, CaseError> {
        let diameter = self.quantity_or(
            &reg::DRUM_DIAMETER,
            input.and_then(|d| d.diameter.as_ref()),
            None,
            None,
        )?;
        let distance = match input.and_then(|d| d.centre_distance.as_ref()) {
            Some(text) => self.required_quantity(&reg::DRUM_DISTANCE, Some(text))?,
            None => {
                let value = diameter + 0.02;
                self.assume(
                    reg::DRUM_DISTANCE.path,
                    reg::DRUM_DISTANCE.range().show(value),
                    "",
                    "common practice: drum diameter plus a narrow 20 mm gap between the drums",
                );
                value
            }
        };
        let differential = match input.and_then(|d| d.torque_differential.as_ref()) {
            Some(text) => self.required_quantity(&reg::DRUM_DIFFERENTIAL, Some(text))?,
            None => {
                self.assume(
                    reg::DRUM_DIFFERENTIAL.path,
                    "0 N·m".to_string(),
                    "",
                    "default: both drums at the same torque",
                );
                0.0
            }
        };
        let drums = DrumSet {
            drum_radius: diameter / 2.0,
            centre_distance: distance,
            torque_differential: differential / web.width,
        };
        drums
            .validate(core.outside_diameter / 2.0)
            .map_err(|e| self.invalid(e.to_string()))?;
        Ok(drums)
    }
}
