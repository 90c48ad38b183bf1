//! Wound-in tension of each wrap from the winder's settings: web tension (with its taper), the
//! nip-induced part, centre torque or drum torque differential, and the roll's weight on the
//! drums of a two-drum winder; plus the entrained-air film and the warnings about inputs
//! outside the validity of these relations. The relations and their sources are in
//! [`super::winder`] and [`super::air`]; docs/theory.md explains them.

use super::air;
use super::schedule::TensionSchedule;
use super::winder::{self, DrumSet, NipProgramme};

pub use super::air::{AIR_VISCOSITY, AirFilm, TRACTION_LOSS_RATIO, air_film_thickness};
pub use super::winder::{NIP_MODEL_LIMIT, WindingMethod};

/// Share of the wound-in stress above which centrifugal unloading (ρ·V²) gets a warning
/// (our threshold: at a tenth the outer wraps lose a noticeable part of their tension).
pub const CENTRIFUGAL_WARNING_SHARE: f64 = 0.1;

/// Winding settings in SI.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct WindingSetup {
    pub method: WindingMethod,
    /// Web tension schedule (N/m).
    pub tension: TensionSchedule,
    /// Nip load per unit width (N/m) of the lay-on/rider roll or drum loading; `None` when no
    /// nip or rider roll. On a two-drum winder this is the rider load; the roll's weight is
    /// added on the drums.
    pub nip_load: Option<f64>,
    /// Nip load against diameter; replaces `nip_load` where given.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub nip_programme: Option<NipProgramme>,
    /// Static web-to-web friction coefficient (slip checks: cinching, telescoping, core slip).
    pub friction: f64,
    /// Kinetic web-to-web friction coefficient (nip-induced tension); `None` uses `friction`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub kinetic_friction: Option<f64>,
    /// Line speed (m/s).
    pub speed: f64,
    /// Combined RMS surface roughness of two contacting web surfaces (m), for the air film check.
    pub combined_roughness: f64,
    /// Nip load (N/m) above which the nip-induced tension no longer grows; `None` uses
    /// [`NIP_MODEL_LIMIT`].
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub nip_plateau_load: Option<f64>,
    /// Centre torque per unit width (N·m per m) of a centre-surface winder.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub centre_torque: Option<f64>,
    /// Drum geometry and torque differential of a two-drum winder.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub drums: Option<DrumSet>,
    /// Density of the wound web (kg/m³): roll weight on the drums, centrifugal unloading.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub web_density: Option<f64>,
    /// The web lets air through (paper, board, nonwovens).
    #[serde(default, skip_serializing_if = "std::ops::Not::not")]
    pub permeable_web: bool,
    /// The web is a nonwoven (measured nip-induced tension well below μk·N).
    #[serde(default, skip_serializing_if = "std::ops::Not::not")]
    pub nonwoven: bool,
}

impl Default for WindingSetup {
    /// Centre winding at zero tension, no nip, no friction, at rest: a base for struct update.
    fn default() -> Self {
        WindingSetup {
            method: WindingMethod::Centre,
            tension: TensionSchedule::constant(0.0),
            nip_load: None,
            nip_programme: None,
            friction: 0.0,
            kinetic_friction: None,
            speed: 0.0,
            combined_roughness: 0.0,
            nip_plateau_load: None,
            centre_torque: None,
            drums: None,
            web_density: None,
            permeable_web: false,
            nonwoven: false,
        }
    }
}

/// Torque per unit width (N·m per m of width) a centre drive must apply at roll radius
/// `radius` to hold web tension `tension`: M = T·r (statics of the winding roll, ignoring
/// acceleration and bearing friction).
pub fn centre_wind_torque_per_width(tension: f64, radius: f64) -> f64 {
    tension * radius
}

impl WindingSetup {
    /// Kinetic friction used for the nip-induced tension.
    pub fn kinetic(&self) -> f64 {
        self.kinetic_friction.unwrap_or(self.friction)
    }

    /// Knee of the nip-induced tension's levelling-off (N/m).
    pub fn plateau_load(&self) -> f64 {
        self.nip_plateau_load.unwrap_or(NIP_MODEL_LIMIT)
    }

    /// The drums whose geometry adds the roll's weight, if this winder has two.
    fn weight_drums(&self) -> Option<&DrumSet> {
        match self.method {
            WindingMethod::TwoDrum | WindingMethod::CentreSurface => self.drums.as_ref(),
            _ => None,
        }
    }

    /// Rider, lay-on or drum loading (N/m) at `radius` as set on the winder (programme first).
    /// Zero for a gap winder, whose roller does not touch the roll.
    pub fn applied_nip_load(&self, radius: f64) -> f64 {
        if self.method == WindingMethod::Gap {
            return 0.0;
        }
        match &self.nip_programme {
            Some(programme) => programme.load_at(radius),
            None => self.nip_load.unwrap_or(0.0).max(0.0),
        }
    }

    /// Load (N/m) on the nip that winds the web on at `radius`: the applied load, plus on two
    /// drums the roll's own weight, shared per drum by the drum geometry.
    pub fn nip_load_at(&self, radius: f64, core_radius: f64) -> f64 {
        let applied = self.applied_nip_load(radius);
        match self.weight_drums() {
            Some(drums) => {
                let weight = self.web_density.map_or(0.0, |rho| {
                    winder::roll_weight_per_width(rho, radius, core_radius)
                });
                drums.share_per_drum(applied + weight, radius)
            }
            None => applied,
        }
    }

    /// True when a nip or rider roll bears on the winding roll somewhere in the build.
    pub fn has_nip(&self) -> bool {
        if self.method == WindingMethod::Gap {
            return false;
        }
        self.method.drum_driven()
            || self.nip_load.is_some_and(|n| n > 0.0)
            || self
                .nip_programme
                .as_ref()
                .is_some_and(|p| p.points.iter().any(|&(_, n)| n > 0.0))
    }

    /// Nip-induced tension (N/m) of the wrap wound at `radius` (μk·N with its levelling-off).
    pub fn nip_induced_tension_at(&self, radius: f64, core_radius: f64) -> f64 {
        winder::nip_induced_tension(
            self.nip_load_at(radius, core_radius),
            self.kinetic(),
            self.plateau_load(),
        )
    }

    /// Tension (N/m) the drives add through torque at `radius`: centre torque M/r on a
    /// centre-surface winder, drum torque differential ΔM/Rd on two drums.
    pub fn torque_tension_at(&self, radius: f64) -> f64 {
        let mut added = 0.0;
        if self.method == WindingMethod::CentreSurface
            && let Some(torque) = self.centre_torque
            && radius > 0.0
        {
            added += torque / radius;
        }
        if let Some(drums) = self.weight_drums() {
            added += drums.differential_tension();
        }
        added
    }

    /// Wound-in tension per unit width (N/m) of the wrap wound at `radius`: web tension from
    /// the schedule, plus the nip-induced part, plus the torque part; never below zero.
    pub fn wound_in_tension(&self, radius: f64, core_radius: f64, outer_radius: f64) -> f64 {
        let web = self.tension.tension_at(radius, core_radius, outer_radius);
        (web + self.nip_induced_tension_at(radius, core_radius) + self.torque_tension_at(radius))
            .max(0.0)
    }

    /// Air film estimate at `radius` with the web tension of the schedule there.
    pub fn air_film(&self, radius: f64, core_radius: f64, outer_radius: f64) -> AirFilm {
        let tension = self.tension.tension_at(radius, core_radius, outer_radius);
        air::film_at(
            radius,
            self.speed,
            tension,
            self.combined_roughness,
            self.has_nip(),
        )
    }

    /// Warnings about inputs outside the validity of the relations used, for a roll wound from
    /// `core_radius` to `outer_radius` with layers `thickness` thick: heavy nips, missing
    /// settings, entrained air and centrifugal unloading.
    pub fn warnings(&self, core_radius: f64, outer_radius: f64, thickness: f64) -> Vec<String> {
        let mut out = self.setting_warnings(core_radius, outer_radius);
        for (place, radius) in [("core", core_radius), ("outside", outer_radius)] {
            let film = self.air_film(radius, core_radius, outer_radius);
            if let Some(w) = air::film_warning(place, &film) {
                out.push(w);
            }
        }
        if self.permeable_web && out.iter().any(|w| w.starts_with("entrained air")) {
            out.push(
                "entrained air: this web lets air through, which the film estimate (made for \
                 an impermeable web) ignores; the real film is thinner"
                    .into(),
            );
        }
        if let Some(rho) = self.web_density
            && thickness > 0.0
        {
            let wit = self.wound_in_tension(outer_radius, core_radius, outer_radius);
            let spin = winder::centrifugal_stress(rho, self.speed);
            if wit > 0.0 && spin > CENTRIFUGAL_WARNING_SHARE * wit / thickness {
                out.push(format!(
                    "centrifugal unloading: at {:.1} m/s the spinning outer wraps shed ρ·V² = \
                     {:.0} kPa, {:.0} % of their wound-in stress; the outer layers may loosen at speed",
                    self.speed,
                    spin / 1e3,
                    100.0 * spin * thickness / wit
                ));
            }
        }
        out
    }

    fn setting_warnings(&self, core_radius: f64, outer_radius: f64) -> Vec<String> {
        let mut out = Vec::new();
        let plateau = self.plateau_load();
        let heaviest = [core_radius, outer_radius]
            .into_iter()
            .chain(
                self.nip_programme
                    .iter()
                    .flat_map(|p| p.points.iter().map(|&(r, _)| r)),
            )
            .filter(|r| (core_radius..=outer_radius).contains(r))
            .map(|r| self.nip_load_at(r, core_radius))
            .fold(0.0, f64::max);
        if heaviest > plateau {
            out.push(format!(
                "nip load {heaviest:.0} N/m is above {plateau:.0} N/m, where measured nip-induced \
                 tension levels off; the model holds it at μk × {plateau:.0} N/m, which is uncertain there"
            ));
        }
        if self.nonwoven && heaviest > 0.0 {
            out.push(
                "nonwoven web: the nip-induced tension measured on a nonwoven was much less than \
                 μk × nip load (Balaji & Good), so the wound-in tension here is likely overstated"
                    .into(),
            );
        }
        match self.method {
            WindingMethod::Gap if self.nip_load.is_some_and(|n| n > 0.0) => out.push(
                "gap winding: the roller does not touch the roll, so the nip load given is not used"
                    .into(),
            ),
            WindingMethod::Surface if self.applied_nip_load(core_radius) <= 0.0 => out.push(
                "surface winding without a nip load: no nip-induced tension added".into(),
            ),
            WindingMethod::TwoDrum | WindingMethod::CentreSurface => {
                self.drum_warnings(core_radius, &mut out)
            }
            _ => {}
        }
        for radius in [core_radius, outer_radius] {
            let raw = self.tension.tension_at(radius, core_radius, outer_radius)
                + self.nip_induced_tension_at(radius, core_radius)
                + self.torque_tension_at(radius);
            if raw < 0.0 {
                out.push(format!(
                    "the torque settings take away more than the web tension at diameter {:.0} mm; \
                     the wound-in tension is held at zero there",
                    2e3 * radius
                ));
                break;
            }
        }
        out
    }

    fn drum_warnings(&self, core_radius: f64, out: &mut Vec<String>) {
        if self.method == WindingMethod::TwoDrum && self.drums.is_none() {
            out.push(
                "two-drum winding without drum geometry: the roll's weight is not added".into(),
            );
        }
        if self.weight_drums().is_some() && self.web_density.is_none() {
            out.push(
                "two-drum winding without a web density: the roll's weight is not added".into(),
            );
        }
        if let Some(drums) = self.weight_drums()
            && drums
                .contact_angle(core_radius)
                .is_some_and(|a| a > winder::STEEP_DRUM_ANGLE)
        {
            out.push(
                "two-drum winding: the core sits deep between the drums (contact more than 60° \
                 from the vertical), so the drum nips at the start are much heavier than the loads"
                    .into(),
            );
        }
    }

    /// Check the winding settings; names the field and accepted range on failure.
    pub fn validate(&self) -> Result<(), super::ModelError> {
        use super::ModelError::OutOfRange;
        self.tension.validate()?;
        if let Some(n) = self.nip_load
            && !(n.is_finite() && n >= 0.0)
        {
            return Err(OutOfRange {
                field: "winding.nip_load",
                value: n,
                accepted: "a finite load ≥ 0 N/m",
            });
        }
        if let Some(p) = &self.nip_programme {
            p.validate()?;
        }
        let friction_range = |field: &'static str, value: f64| {
            if value.is_finite() && (0.0..=2.0).contains(&value) {
                Ok(())
            } else {
                Err(OutOfRange {
                    field,
                    value,
                    accepted: "0 to 2",
                })
            }
        };
        friction_range("web.friction", self.friction)?;
        if let Some(k) = self.kinetic_friction {
            friction_range("web.kinetic_friction", k)?;
        }
        let positive = |field: &'static str, value: Option<f64>, accepted: &'static str| match value
        {
            Some(v) if !(v.is_finite() && v > 0.0) => Err(OutOfRange {
                field,
                value: v,
                accepted,
            }),
            _ => Ok(()),
        };
        positive(
            "winding.nip_plateau",
            self.nip_plateau_load,
            "a finite load > 0 N/m",
        )?;
        positive(
            "web.density",
            self.web_density,
            "a finite density > 0 kg/m³",
        )?;
        if let Some(m) = self.centre_torque
            && !m.is_finite()
        {
            return Err(OutOfRange {
                field: "winding.centre_torque",
                value: m,
                accepted: "a finite torque per width",
            });
        }
        if !(self.speed.is_finite() && self.speed >= 0.0) {
            return Err(OutOfRange {
                field: "winding.speed",
                value: self.speed,
                accepted: "a finite speed ≥ 0 m/s",
            });
        }
        if !(self.combined_roughness.is_finite() && self.combined_roughness >= 0.0) {
            return Err(OutOfRange {
                field: "web.roughness",
                value: self.combined_roughness,
                accepted: "a finite roughness ≥ 0 m",
            });
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn setup(method: WindingMethod, nip: Option<f64>) -> WindingSetup {
        WindingSetup {
            method,
            tension: TensionSchedule::constant(200.0),
            nip_load: nip,
            friction: 0.4,
            kinetic_friction: Some(0.2),
            speed: 5.0,
            combined_roughness: 1e-6,
            ..WindingSetup::default()
        }
    }

    #[test]
    fn nip_adds_kinetic_mu_n_and_warns_when_heavy() {
        let s = setup(WindingMethod::Centre, Some(2500.0));
        // μk·min(N, 2000) = 0.2·2000 = 400 on top of 200 N/m.
        assert!((s.wound_in_tension(0.1, 0.05, 0.2) - 600.0).abs() < 1e-9);
        assert_eq!(s.setting_warnings(0.05, 0.2).len(), 1);
        assert!(s.air_film(0.1, 0.05, 0.2).ratio_to_roughness <= 1.0);
    }

    #[test]
    fn without_kinetic_friction_the_static_value_is_used() {
        let mut s = setup(WindingMethod::Centre, Some(1000.0));
        s.kinetic_friction = None;
        assert!((s.wound_in_tension(0.1, 0.05, 0.2) - 600.0).abs() < 1e-9);
    }
}
