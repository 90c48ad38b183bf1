//! Winder types and the parts of the wound-in tension each one adds: nip-induced tension with
//! its levelling-off, centre torque on a surface winder, drum torque differential, and the
//! roll's own weight on the drums of a two-drum winder. Also the nip programme (nip load as a
//! table against diameter, as winders are set).
//!
//! Sources:
//! * Nip-induced tension NIT = μk·N with μk the *kinetic* web-to-web friction coefficient:
//!   centre winding with an undriven rider (Good, Wu & Fikes, J. Appl. Mech. 61:182, 1994) and
//!   surface winding (Good, Hartwig & Markum, Proc. 5th Int. Conf. Web Handling, Oklahoma State
//!   University, 1999; μk = 0.19 newsprint on newsprint). Balaji & Good ("Wound-in-tension in
//!   a non-woven web") summarise the measurements on film and paper: WIT is proportional to
//!   the nip load at lower loads, with a slope approaching μk, and becomes independent of the
//!   nip load at higher loads, for both surface winding and centre winding with a rider; for a
//!   nonwoven polyethylene the slope was much less than μk.
//!   We model that as NIT = μk·min(N, N_plateau). The knee N_plateau is not a material constant
//!   in those papers; the default 2000 N/m (about 10 pli) is the trade guidance that μ·N is a
//!   good estimate for low to moderate nip loads up to that level (common practice, PFFC "Web
//!   Lines: Winding process fundamentals", part 1). Nip loads above it get a warning.
//! * Centre torque: a torque M (per width) at the core adds M/r to the tension of the wrap
//!   wound at radius r (statics of the winding roll: torque = force × radius).
//! * Drum torque differential on a two-drum winder: the extra torque ΔM (per width) of the
//!   second (front) drum over the drum the web wraps acts at the drum radius Rd and pulls the
//!   outer layer with ΔM/Rd (statics of the drum; the sign convention is ours: positive tightens).
//! * Roll weight on two drums: weight per width w = ρ·g·π·(r² − rc²) (core and shaft left out);
//!   the roll sits on both drums, each contact line at angle θ from the vertical with
//!   sin θ = (s/2)/(r + Rd), s the drum centre distance, so each drum carries (w + N_rider)/(2·cos θ).
//!   The nip that winds the web on is the drum nip, so that load drives the nip-induced tension.

/// Standard gravity (m/s², NIST SP 811 / CODATA conventional value).
pub const STANDARD_GRAVITY: f64 = 9.806_65;

/// Nip load per unit width (N/m) above which the nip-induced tension no longer grows (default
/// knee of the levelling-off; see the module notes).
pub const NIP_MODEL_LIMIT: f64 = 2000.0;

/// Contact angle from the vertical (rad) above which a two-drum geometry gets a warning: the
/// drum shares grow fast as the roll sinks between the drums.
pub const STEEP_DRUM_ANGLE: f64 = std::f64::consts::FRAC_PI_3;

/// Winder type, as the trade names them. Centre winding with or without a lay-on (rider) roll
/// is [`WindingMethod::Centre`] with or without a nip load.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum WindingMethod {
    /// Centre (spindle) winding; a nip load means a lay-on or rider roll bears on the roll.
    #[default]
    Centre,
    /// Gap winding: a roller runs close to the roll without touching it. No nip, so no
    /// nip-induced tension, and the air is not squeezed out.
    Gap,
    /// Surface winding on one driven drum; the nip load is the drum nip.
    Surface,
    /// Surface winding on two drums; the roll's weight adds to the drum nips as it grows.
    TwoDrum,
    /// Surface winding with a centre drive adding torque at the core (torque split).
    CentreSurface,
}

impl WindingMethod {
    pub const ALL: [WindingMethod; 5] = [
        WindingMethod::Centre,
        WindingMethod::Gap,
        WindingMethod::Surface,
        WindingMethod::TwoDrum,
        WindingMethod::CentreSurface,
    ];
    /// The IDs case files and rules use, in the order of [`WindingMethod::ALL`].
    pub const IDS: [&'static str; 5] = ["centre", "gap", "surface", "two_drum", "centre_surface"];

    /// The ID case files and rules use (the serde name).
    pub fn id(self) -> &'static str {
        match self {
            WindingMethod::Centre => "centre",
            WindingMethod::Gap => "gap",
            WindingMethod::Surface => "surface",
            WindingMethod::TwoDrum => "two_drum",
            WindingMethod::CentreSurface => "centre_surface",
        }
    }

    /// The family the rule base speaks of (`centre`, `surface`, `centre_surface`): a gap
    /// winder is centre-driven, a two-drum winder is a surface winder.
    pub fn family(self) -> &'static str {
        match self {
            WindingMethod::Centre | WindingMethod::Gap => "centre",
            WindingMethod::Surface | WindingMethod::TwoDrum => "surface",
            WindingMethod::CentreSurface => "centre_surface",
        }
    }

    /// Plain words for screens and reports.
    pub fn describe(self) -> &'static str {
        match self {
            WindingMethod::Centre => "centre winding",
            WindingMethod::Gap => "gap winding",
            WindingMethod::Surface => "surface winding (one drum)",
            WindingMethod::TwoDrum => "two-drum surface winding",
            WindingMethod::CentreSurface => "centre-surface winding",
        }
    }

    /// True when the winder's torque comes through the core (the layers carry it to the
    /// surface): centre, gap and centre-surface.
    pub fn centre_driven(self) -> bool {
        matches!(
            self,
            WindingMethod::Centre | WindingMethod::Gap | WindingMethod::CentreSurface
        )
    }

    /// True for the surface winders, whose drum always makes a nip.
    pub fn drum_driven(self) -> bool {
        matches!(
            self,
            WindingMethod::Surface | WindingMethod::TwoDrum | WindingMethod::CentreSurface
        )
    }
}

/// Nip load as a table against roll radius, interpolated linearly and held flat beyond the
/// first and last points.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct NipProgramme {
    /// (radius m, nip load N/m), radii strictly increasing.
    pub points: Vec<(f64, f64)>,
}

impl NipProgramme {
    /// Nip load (N/m) at `radius`.
    pub fn load_at(&self, radius: f64) -> f64 {
        let points = &self.points;
        let Some(&(first_r, first_n)) = points.first() else {
            return 0.0;
        };
        if radius <= first_r {
            return first_n;
        }
        for pair in points.windows(2) {
            let (r0, n0) = pair[0];
            let (r1, n1) = pair[1];
            if radius <= r1 {
                let t = (radius - r0) / (r1 - r0);
                return n0 + t * (n1 - n0);
            }
        }
        points.last().map_or(first_n, |&(_, n)| n)
    }

    /// Check the table; names the field and the accepted range on failure.
    pub fn validate(&self) -> Result<(), super::ModelError> {
        use super::ModelError::OutOfRange;
        if self.points.is_empty() {
            return Err(OutOfRange {
                field: "winding.nip_programme",
                value: 0.0,
                accepted: "at least one point",
            });
        }
        let mut last = f64::NEG_INFINITY;
        for &(radius, load) in &self.points {
            if !(radius.is_finite() && radius > last && radius > 0.0) {
                return Err(OutOfRange {
                    field: "winding.nip_programme.diameter",
                    value: 2.0 * radius,
                    accepted: "finite diameters > 0, increasing from the core outward",
                });
            }
            if !(load.is_finite() && load >= 0.0) {
                return Err(OutOfRange {
                    field: "winding.nip_programme.nip_load",
                    value: load,
                    accepted: "a finite load ≥ 0 N/m",
                });
            }
            last = radius;
        }
        Ok(())
    }
}

/// Geometry and drive of the two drums of a two-drum winder.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct DrumSet {
    /// Drum radius (m).
    pub drum_radius: f64,
    /// Distance between the two drum centres (m).
    pub centre_distance: f64,
    /// Torque of the front drum minus the torque of the drum the web wraps, per width
    /// (N·m per m); positive tightens the roll.
    pub torque_differential: f64,
}

impl DrumSet {
    /// Angle (rad) between the vertical and the line from the roll centre to a drum centre
    /// for a roll of radius `radius`; `None` when the roll would drop between the drums.
    pub fn contact_angle(&self, radius: f64) -> Option<f64> {
        let sine = 0.5 * self.centre_distance / (radius + self.drum_radius);
        (sine.is_finite() && (0.0..1.0).contains(&sine)).then(|| sine.asin())
    }

    /// Load per width (N/m) on each drum nip from a vertical load per width `vertical`
    /// (roll weight plus rider load) at roll radius `radius`: vertical / (2·cos θ).
    pub fn share_per_drum(&self, vertical: f64, radius: f64) -> f64 {
        match self.contact_angle(radius) {
            Some(angle) => vertical / (2.0 * angle.cos()),
            None => f64::INFINITY,
        }
    }

    /// Tension per width (N/m) the torque differential adds: ΔM / Rd.
    pub fn differential_tension(&self) -> f64 {
        self.torque_differential / self.drum_radius
    }

    /// Check the geometry against the core radius; names the field on failure.
    pub fn validate(&self, core_radius: f64) -> Result<(), super::ModelError> {
        use super::ModelError::OutOfRange;
        if !(self.drum_radius.is_finite() && self.drum_radius > 0.0) {
            return Err(OutOfRange {
                field: "winding.drums.diameter",
                value: 2.0 * self.drum_radius,
                accepted: "a finite diameter > 0 m",
            });
        }
        if !(self.centre_distance.is_finite() && self.centre_distance > 2.0 * self.drum_radius) {
            return Err(OutOfRange {
                field: "winding.drums.centre_distance",
                value: self.centre_distance,
                accepted: "more than one drum diameter (the drums must not overlap)",
            });
        }
        if self.contact_angle(core_radius).is_none() {
            return Err(OutOfRange {
                field: "winding.drums.centre_distance",
                value: self.centre_distance,
                accepted: "less than the core diameter plus one drum diameter (else the core drops between the drums)",
            });
        }
        if !self.torque_differential.is_finite() {
            return Err(OutOfRange {
                field: "winding.drums.torque_differential",
                value: self.torque_differential,
                accepted: "a finite torque per width",
            });
        }
        Ok(())
    }
}

/// Nip-induced tension (N/m) for nip load `nip_load` (N/m) with kinetic web-to-web friction
/// `kinetic_friction`, levelling off at `plateau_load`: μk·min(N, N_plateau) (see module notes).
pub fn nip_induced_tension(nip_load: f64, kinetic_friction: f64, plateau_load: f64) -> f64 {
    if nip_load <= 0.0 {
        return 0.0;
    }
    kinetic_friction * nip_load.min(plateau_load)
}

/// Weight per unit width (N/m) of the wound part of a roll of density `density` (kg/m³) from
/// `core_radius` to `radius`: ρ·g·π·(r² − rc²). Core and shaft are left out.
pub fn roll_weight_per_width(density: f64, radius: f64, core_radius: f64) -> f64 {
    let area = std::f64::consts::PI * (radius * radius - core_radius * core_radius).max(0.0);
    density * STANDARD_GRAVITY * area
}

/// Mass (kg) of the wound web of a roll: density `density` (kg/m³) times the volume of the
/// hollow cylinder from `core_radius` to `outer_radius` over the width `width` (m),
/// ρ·π·(R² − r²)·w (the closed form of a hollow cylinder's volume). Core and shaft are left out;
/// air between the layers and compaction are not counted, so it is the weight of the web as
/// wound, the one handling (lifting, standing a roll on end) and telescoping under handling
/// read.
pub fn roll_mass(density: f64, outer_radius: f64, core_radius: f64, width: f64) -> f64 {
    let area =
        std::f64::consts::PI * (outer_radius * outer_radius - core_radius * core_radius).max(0.0);
    density * area * width
}

/// Centrifugal hoop stress of a spinning layer at surface speed `speed` (m/s): ρ·V² (Pa), the
/// tension a free spinning ring needs to hold itself together (thin rotating ring).
pub fn centrifugal_stress(density: f64, speed: f64) -> f64 {
    density * speed * speed
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
    fn nip_induced_tension_levels_off() {
        // Proportional at low load with the kinetic coefficient (Good, Hartwig & Markum 1999:
        // μk = 0.19 for newsprint), independent of the load above the knee.
        assert!((nip_induced_tension(1000.0, 0.19, 2000.0) - 190.0).abs() < 1e-9);
        assert!((nip_induced_tension(5000.0, 0.19, 2000.0) - 380.0).abs() < 1e-9);
        assert_eq!(nip_induced_tension(0.0, 0.19, 2000.0), 0.0);
    }

    #[test]
    fn programme_interpolates_and_holds() {
        let p = NipProgramme {
            points: vec![(0.1, 1000.0), (0.3, 500.0)],
        };
        assert_eq!(p.load_at(0.05), 1000.0);
        assert!((p.load_at(0.2) - 750.0).abs() < 1e-9);
        assert_eq!(p.load_at(0.5), 500.0);
        assert!(p.validate().is_ok());
    }

    #[test]
    fn drum_share_from_geometry() {
        // Two drums 0.3 m radius, centres 0.7 m apart; roll radius 0.4 m: sin θ = 0.35/0.7 = 0.5,
        // θ = 30°, each drum carries w/(2·cos 30°) = 0.57735·w.
        let drums = DrumSet {
            drum_radius: 0.3,
            centre_distance: 0.7,
            torque_differential: 0.0,
        };
        let share = drums.share_per_drum(1000.0, 0.4);
        assert!((share - 577.350_269).abs() < 1e-5, "{share}");
        assert!(drums.validate(0.1).is_ok());
        assert!(drums.validate(0.05).is_err());
        assert!(drums.contact_angle(0.01).is_none());
    }

    #[test]
    fn roll_mass_by_hand() {
        // A newsprint-like roll by hand, ρ·π·(R² − r²)·w: ρ = 600 kg/m³, ⌀ 1000 mm on a
        // ⌀ 100 mm core, 1.6 m wide: 960 · π · 0.2475 = 960 · 0.777544 = 746.44 kg.
        let m = roll_mass(600.0, 0.5, 0.05, 1.6);
        assert!((m - 746.44).abs() < 0.01, "{m}");
        // No web, no mass; a core larger than the roll is not a negative mass.
        assert_eq!(roll_mass(600.0, 0.05, 0.05, 1.6), 0.0);
        assert_eq!(roll_mass(600.0, 0.04, 0.05, 1.6), 0.0);
        // Consistent with the weight per width: m·g / w = ρ·g·π·(R² − r²).
        let per_width = roll_weight_per_width(600.0, 0.5, 0.05);
        assert!((m * STANDARD_GRAVITY / 1.6 - per_width).abs() < 1e-9);
    }

    #[test]
    fn roll_weight_per_width_check_value() {
        // ρ = 1000 kg/m³, r = 0.5 m, rc = 0: 1000·9.80665·π·0.25 = 7702.2 N/m.
        let w = roll_weight_per_width(1000.0, 0.5, 0.0);
        assert!((w - 7702.2).abs() < 0.1, "{w}");
    }
}
