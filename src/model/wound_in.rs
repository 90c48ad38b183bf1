//! Wound-in tension from the winding method (web tension, nip, centre-wind torque) and the
//! entrained-air film estimate.

use super::schedule::TensionSchedule;

#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum WindingMethod {
    #[default]
    Centre,
    Surface,
    CentreSurface,
}

impl WindingMethod {
    pub const ALL: [WindingMethod; 3] = [
        WindingMethod::Centre,
        WindingMethod::Surface,
        WindingMethod::CentreSurface,
    ];
    /// The IDs case files and rules use, in the order of [`WindingMethod::ALL`].
    pub const IDS: [&'static str; 3] = ["centre", "surface", "centre_surface"];

    /// The ID case files and rules use (the serde name).
    pub fn id(self) -> &'static str {
        match self {
            WindingMethod::Centre => "centre",
            WindingMethod::Surface => "surface",
            WindingMethod::CentreSurface => "centre_surface",
        }
    }
}

/// Winding settings in SI.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct WindingSetup {
    pub method: WindingMethod,
    /// Web tension schedule (N/m).
    pub tension: TensionSchedule,
    /// Nip load per unit width (N/m); `None` when no nip/rider roll.
    pub nip_load: Option<f64>,
    /// Web-to-web friction coefficient (used for the nip-induced part and slip checks).
    pub friction: f64,
    /// Line speed (m/s).
    pub speed: f64,
    /// Combined RMS surface roughness of two contacting web surfaces (m), for the air film check.
    pub combined_roughness: f64,
}

/// Entrained-air film estimate at one radius.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct AirFilm {
    /// Foil-bearing film thickness h0 (m).
    pub thickness: f64,
    /// h0 divided by the combined roughness; above ~1 traction is lost.
    pub ratio_to_roughness: f64,
    /// True when a nip is present and suppresses the film.
    pub suppressed_by_nip: bool,
}

/// Dynamic viscosity of air near 20 °C (Pa·s), a handbook value (from memory: 1.81e-5).
pub const AIR_VISCOSITY: f64 = 1.8e-5;

/// Nip load per unit width (N/m) above which the μ·N nip-induced tension is no longer a fair
/// estimate (the measurements behind it were taken at moderate loads; at higher loads the
/// nip-induced tension levels off and depends on the web's radial stiffness).
pub const NIP_MODEL_LIMIT: f64 = 2000.0;

/// Ratio h0 / combined roughness above which the web is taken to float on air (traction lost).
pub const TRACTION_LOSS_RATIO: f64 = 1.0;

/// Foil-bearing estimate of the entrained-air film (Knox & Sweeney, Ind. Eng. Chem. Process
/// Des. Dev. 10(2):201, 1971): h0 = 0.643·R·(12·μ_air·V/T)^(2/3), R roll radius (m), V speed
/// (m/s), T web tension (N/m). Returns 0 for zero speed; infinite for zero tension.
pub fn air_film_thickness(radius: f64, speed: f64, tension: f64, viscosity: f64) -> f64 {
    if speed <= 0.0 || radius <= 0.0 {
        return 0.0;
    }
    if tension <= 0.0 {
        return f64::INFINITY;
    }
    0.643 * radius * (12.0 * viscosity * speed / tension).powf(2.0 / 3.0)
}

/// Torque per unit width (N·m per m of width) a centre drive must apply at roll radius
/// `radius` to hold web tension `tension`: M = T·r (statics of the winding roll, ignoring
/// acceleration and bearing friction).
pub fn centre_wind_torque_per_width(tension: f64, radius: f64) -> f64 {
    tension * radius
}

impl WindingSetup {
    /// True when a nip or rider roll bears on the winding roll.
    pub fn has_nip(&self) -> bool {
        self.nip_load.is_some_and(|n| n > 0.0)
    }

    /// Nip-induced tension (N/m): μ·N, the friction the nip drags into the outer layer
    /// (centre winding with a nip and surface winding). Zero without a nip.
    pub fn nip_induced_tension(&self) -> f64 {
        match (self.method, self.nip_load) {
            (_, Some(n)) if n > 0.0 => self.friction * n,
            _ => 0.0,
        }
    }

    /// Wound-in tension per unit width (N/m) of the wrap wound at `radius`: web tension from the
    /// schedule plus the nip-induced part.
    pub fn wound_in_tension(&self, radius: f64, core_radius: f64, outer_radius: f64) -> f64 {
        self.tension.tension_at(radius, core_radius, outer_radius) + self.nip_induced_tension()
    }

    /// Air film estimate at `radius` with the web tension of the schedule there.
    pub fn air_film(&self, radius: f64, core_radius: f64, outer_radius: f64) -> AirFilm {
        let tension = self.tension.tension_at(radius, core_radius, outer_radius);
        let thickness = air_film_thickness(radius, self.speed, tension, AIR_VISCOSITY);
        let ratio = if self.combined_roughness > 0.0 {
            thickness / self.combined_roughness
        } else if thickness > 0.0 {
            f64::INFINITY
        } else {
            0.0
        };
        AirFilm {
            thickness,
            ratio_to_roughness: ratio,
            suppressed_by_nip: self.has_nip(),
        }
    }

    /// Warnings about inputs outside the validity of the simple models used here.
    pub fn warnings(&self) -> Vec<String> {
        let mut out = Vec::new();
        if let Some(n) = self.nip_load
            && n > NIP_MODEL_LIMIT
        {
            out.push(format!(
                "nip load {:.0} N/m is above {:.0} N/m: the nip-induced tension μ·N is \
                 likely overestimated there",
                n, NIP_MODEL_LIMIT
            ));
        }
        if matches!(
            self.method,
            WindingMethod::Surface | WindingMethod::CentreSurface
        ) && !self.has_nip()
        {
            out.push("surface winding without a nip load: no nip-induced tension added".into());
        }
        out
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
        if !(self.friction.is_finite() && (0.0..=2.0).contains(&self.friction)) {
            return Err(OutOfRange {
                field: "web.friction",
                value: self.friction,
                accepted: "0 to 2",
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

    #[test]
    fn method_ids_are_the_serde_names() {
        for (method, id) in WindingMethod::ALL.iter().zip(WindingMethod::IDS) {
            assert_eq!(method.id(), id);
            assert_eq!(serde_json::to_string(method).unwrap(), format!("\"{id}\""));
        }
    }

    #[test]
    fn knox_sweeney_check_value() {
        // Knox & Sweeney (1971) foil bearing: R = 0.1 m, V = 5 m/s, T = 200 N/m,
        // μ = 1.8e-5 Pa·s → h0 ≈ 19.8 µm.
        let h0 = air_film_thickness(0.1, 5.0, 200.0, 1.8e-5);
        assert!((h0 - 19.8e-6).abs() < 0.05e-6, "h0 = {h0}");
    }

    #[test]
    fn nip_adds_mu_n_and_warns_when_heavy() {
        let setup = WindingSetup {
            method: WindingMethod::Centre,
            tension: TensionSchedule::constant(200.0),
            nip_load: Some(2500.0),
            friction: 0.3,
            speed: 5.0,
            combined_roughness: 1e-6,
        };
        assert!((setup.wound_in_tension(0.1, 0.05, 0.2) - 950.0).abs() < 1e-9);
        assert_eq!(setup.warnings().len(), 1);
        assert!(setup.air_film(0.1, 0.05, 0.2).suppressed_by_nip);
    }
}
