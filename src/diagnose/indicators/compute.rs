//! Computing the indicators from a case and its profile: inputs, stress state, mechanics
//! margins and the judgements against the grade.

use super::*;

impl Indicators {
    /// How hard the first wraps are held against the wraps just outside them: the mean
    /// pressure of the core zone over that of the inner zone. On a sound start the pressure is
    /// highest at the core and the ratio is 1 or more; slack first wraps (a low core-zone
    /// tension, a soft core giving way) show as a ratio under 1.
    pub(super) fn add_first_wraps(&mut self) {
        let core = self.get("pressure_mean", Some(ZoneName::Core));
        let inner = self.get("pressure_mean", Some(ZoneName::Inner));
        if let (Some(core), Some(inner)) = (core, inner)
            && inner > 0.0
        {
            self.set("first_wraps_pressure_ratio", None, core / inner);
        }
    }

    pub(super) fn add_case_inputs(&mut self, case: &ResolvedCase) {
        let tension = case.winding.tension.start_tension;
        let thickness = case.web.thickness;
        self.set("speed", None, case.winding.speed);
        self.set("web_tension", None, tension);
        if thickness > 0.0 {
            self.set("web_stress", None, tension / thickness);
            if case.web.tangential_modulus > 0.0 {
                self.set(
                    "winding_strain",
                    None,
                    tension / (thickness * case.web.tangential_modulus),
                );
            }
        }
        if case.web.strength > 0.0 {
            self.set("tension_strength_share", None, tension / case.web.strength);
        }
        if let Some((usual, _)) = crate::usual_tension::usual_tension(case)
            && usual > 0.0
        {
            self.set("tension_to_usual", None, tension / usual);
        }
        if let Some(recipe) = case.winding.recipe_tension.filter(|t| *t > 0.0) {
            self.set("tension_to_recipe", None, tension / recipe);
        }
        let nip = case.winding.nip_load.unwrap_or(0.0);
        self.set("nip_load", None, nip);
        if tension > 0.0 {
            self.set("nip_to_tension", None, nip / tension);
        }
        // Wound-in tension from the nip: μk·N with its levelling-off, as the model computes it
        // (Good, Wu & Fikes 1994; Good, Hartwig & Markum 1999).
        let nip_part = case.nip_induced_tension_at_core();
        if tension + nip_part > 0.0 {
            self.set("nip_wit_share", None, nip_part / (tension + nip_part));
        }
        self.set("taper", None, taper_percent(case));
        if let Some(t) = case.winding.temperature {
            self.set("temperature", None, t);
        }
        self.set("thickness", None, thickness);
        self.set("roll_diameter", None, case.roll.outer_diameter);
        self.set("friction", None, case.web.friction);
        if case.core.outside_diameter > 0.0 {
            self.set(
                "build_ratio",
                None,
                case.roll.outer_diameter / case.core.outside_diameter,
            );
        }
    }

    pub(super) fn add_profile(&mut self, case: &ResolvedCase, profile: &Profile) {
        let n = profile
            .radius
            .len()
            .min(profile.pressure.len())
            .min(profile.tangential_stress.len());
        if n == 0 {
            return;
        }
        let r = &profile.radius[..n];
        let p = &profile.pressure[..n];
        let s = &profile.tangential_stress[..n];
        let core_r = r[0];
        let outer_r = r[n - 1];
        let build = (outer_r - core_r).max(f64::MIN_POSITIVE);
        let position = |i: usize| (r[i] - core_r) / build;

        // Core pressure and its ratio to the rating.
        let core_p = if profile.summary.core_pressure > 0.0 {
            profile.summary.core_pressure
        } else {
            p[0]
        };
        self.set("core_pressure", None, core_p);
        if case.core.crush_pressure > 0.0 {
            self.set(
                "core_pressure_ratio",
                None,
                core_p / case.core.crush_pressure,
            );
        }
        let (peak_i, peak) = argmax(p);
        self.set("peak_pressure", None, peak);
        self.set("peak_pressure_position", None, position(peak_i));
        let (min_i, min_s) = argmin(s);
        self.set("min_tangential_stress", None, min_s);
        self.set("min_tangential_position", None, position(min_i));

        let web_stress = if case.web.thickness > 0.0 {
            case.winding.tension.start_tension / case.web.thickness
        } else {
            0.0
        };

        self.add_zone_bands(profile, n, web_stress);
        self.add_build_and_tension(case, profile, n);
        self.add_core_and_margins(case, profile, core_p, core_r, outer_r);

        // Air film: the solver's estimate when present, otherwise the foil-bearing estimate.
        let ratio = match &profile.air_film {
            // The film as wound (after the nip where there is one): the same figure the
            // reports print.
            Some((start, outside)) => start.ratio_to_roughness.max(outside.ratio_to_roughness),
            None => foil_bearing_ratio(case, outer_r),
        };
        self.set("air_film_ratio", None, ratio);
    }

    /// Whole-roll and per-zone band measures of the first `n` nodes (pressure, hoop
    /// compression, radial strain); `web_stress` is the start tension over the web thickness.
    fn add_zone_bands(&mut self, profile: &Profile, n: usize, web_stress: f64) {
        let r = &profile.radius[..n];
        let p = &profile.pressure[..n];
        let s = &profile.tangential_stress[..n];
        let mut ranges: Vec<(Option<ZoneName>, usize, usize)> = vec![(None, 0, n)];
        for zone in &profile.zones {
            let start = zone.start.min(n);
            let end = zone.end.min(n);
            if end > start {
                ranges.push((Some(zone.name), start, end));
            }
        }
        for &(zone, start, end) in &ranges {
            let rr = &r[start..end];
            let pp = &p[start..end];
            let ss = &s[start..end];
            let weights = radial_weights(r, start, end);
            let total: f64 = weights.iter().sum();
            let share = |pred: &dyn Fn(usize) -> bool| -> f64 {
                if total <= 0.0 {
                    return if (0..rr.len()).all(pred) { 1.0 } else { 0.0 };
                }
                (0..rr.len())
                    .filter(|&i| pred(i))
                    .map(|i| weights[i])
                    .sum::<f64>()
                    / total
            };
            let mean_p = if total > 0.0 {
                (0..pp.len()).map(|i| pp[i] * weights[i]).sum::<f64>() / total
            } else {
                pp.iter().sum::<f64>() / pp.len() as f64
            };
            let min_zone_s = ss.iter().copied().fold(f64::INFINITY, f64::min);
            if zone.is_some() {
                self.set(
                    "pressure_min",
                    zone,
                    pp.iter().copied().fold(f64::INFINITY, f64::min),
                );
                self.set("pressure_mean", zone, mean_p);
                self.set(
                    "pressure_max",
                    zone,
                    pp.iter().copied().fold(f64::NEG_INFINITY, f64::max),
                );
                self.set("min_tangential_stress", zone, min_zone_s);
            }
            self.set(
                "low_pressure_extent",
                zone,
                share(&|i| pp[i] < LOW_PRESSURE_LIMIT),
            );
            self.set("compressive_band_extent", zone, share(&|i| ss[i] < 0.0));
            if web_stress > 0.0 {
                self.set(
                    "compressive_stress_ratio",
                    zone,
                    (-min_zone_s).max(0.0) / web_stress,
                );
            }
            if profile.radial_strain.len() >= end {
                let strain = &profile.radial_strain[start..end];
                self.set(
                    "radial_strain_max",
                    zone,
                    strain.iter().copied().fold(0.0, f64::max),
                );
            }
        }
    }

    /// Mean radial strain over the build and the wound-in tension measures.
    fn add_build_and_tension(&mut self, case: &ResolvedCase, profile: &Profile, n: usize) {
        let r = &profile.radius[..n];
        // Mean radial strain over the build (bulk pressed out of the roll).
        if profile.radial_strain.len() >= n {
            let weights = radial_weights(r, 0, n);
            let total: f64 = weights.iter().sum();
            if total > 0.0 {
                let mean = (0..n)
                    .map(|i| profile.radial_strain[i] * weights[i])
                    .sum::<f64>()
                    / total;
                self.set("build_compression", None, mean);
            }
        }

        // Wound-in tension measures.
        if profile.wound_in_tension.len() >= n {
            let wit = &profile.wound_in_tension[..n];
            let max_wit = wit.iter().copied().fold(0.0, f64::max);
            if case.web.strength > 0.0 {
                self.set("wit_strength_share", None, max_wit / case.web.strength);
            }
            if wit[0] > 0.0 {
                self.set("wit_drop", None, (wit[0] - wit[n - 1]) / wit[0]);
            }
            let mean_wit = wit.iter().sum::<f64>() / n as f64;
            if mean_wit > 0.0 {
                let step = wit
                    .windows(2)
                    .map(|w| (w[1] - w[0]).abs())
                    .fold(0.0, f64::max);
                self.set("wit_step", None, step / mean_wit);
            }
        }
    }

    /// The core's stiffness against the first wraps, torques, and the slip, telescoping and
    /// starring margins of the mechanics layer.
    fn add_core_and_margins(
        &mut self,
        case: &ResolvedCase,
        profile: &Profile,
        core_p: f64,
        core_r: f64,
        outer_r: f64,
    ) {
        // Core stiffness against the radial modulus of the first wraps.
        let ec = case.core.stiffness.effective_stiffness();
        let er = case.web.radial_stiffness.modulus_at(core_p);
        if er > 0.0 {
            let ratio = if ec.is_finite() { ec / er } else { 1.0e6 };
            self.set("core_stiffness_ratio", None, ratio);
        }

        // Torques: steady tension torque (centre winding) plus the torque to accelerate the roll.
        let outer_tension = tension_at(case, outer_r);
        let tension_torque = match case.winding.method {
            WindingMethod::Surface | WindingMethod::TwoDrum => 0.0,
            WindingMethod::Centre | WindingMethod::Gap | WindingMethod::CentreSurface => {
                outer_tension * outer_r
            }
        };
        let acceleration_torque = acceleration_torque_per_width(case, core_r, outer_r);
        if tension_torque > 0.0 {
            self.set(
                "acceleration_torque_share",
                None,
                acceleration_torque / tension_torque,
            );
        }
        // Demand against capacity at every interface (the mechanics layer's one criterion).
        let inputs = crate::mechanics::MechanicsInputs::from_case(case);
        let torque = crate::mechanics::torque::torque_check(profile, &inputs);
        self.set("slip_margin", None, torque.min_margin);
        self.set("core_slip_margin", None, torque.core_margin);
        if let Some(margin) = torque.shaft_margin {
            self.set("shaft_slip_margin", None, margin);
        }
        self.set("speed_change_slip_margin", None, torque.speed_change_margin);
        let telescoping = crate::mechanics::telescoping::handling_margins(profile, &inputs);
        self.set("telescoping_margin", None, telescoping.min_margin);
        let starring = crate::mechanics::starring::buckling_margins(profile, &inputs);
        self.set("starring_margin", None, starring.min_margin);
        // Where, as the roll diameter the margins table and every view print; only when some
        // wrap is in hoop compression (with none, the minimum is the cap and has no place).
        if starring.min_margin < crate::mechanics::MARGIN_CAP {
            self.set("starring_margin_position", None, 2.0 * starring.min_radius);
        }
    }
}

/// Taper in percent of the start tension, whatever form the schedule takes.
pub fn taper_percent(case: &ResolvedCase) -> f64 {
    let schedule = &case.winding.tension;
    match &schedule.taper {
        Taper::None => 0.0,
        Taper::Linear { fraction } | Taper::Hyperbolic { fraction } => fraction * 100.0,
        Taper::Steps { steps } | Taper::Programme { points: steps } => match steps.last() {
            Some(last) if schedule.start_tension > 0.0 => {
                (schedule.start_tension - last.tension) / schedule.start_tension * 100.0
            }
            _ => 0.0,
        },
    }
}

/// Scheduled web tension (no upsets) at radius `r`, N/m: the model's taper law.
fn tension_at(case: &ResolvedCase, r: f64) -> f64 {
    case.winding.tension.scheduled_tension_at(
        r,
        case.core.outside_diameter / 2.0,
        case.roll.outer_diameter / 2.0,
    )
}

/// Torque per unit width to bring the full roll to line speed in the acceleration time.
fn acceleration_torque_per_width(case: &ResolvedCase, core_r: f64, outer_r: f64) -> f64 {
    let Some(time) = case.winding.acceleration_time.filter(|t| *t > 0.0) else {
        return 0.0;
    };
    // Solid annulus: J per width = ρ·π·(R⁴ − rc⁴)/2; α = v / (R·t).
    let inertia = crate::mechanics::torque::annulus_inertia(case.web.density, core_r, outer_r);
    let angular_acceleration = case.winding.speed / (outer_r * time);
    inertia * angular_acceleration
}

/// Foil-bearing estimate of the entrained air film at the outside of the roll divided by the
/// combined roughness. Knox & Sweeney (1971): h0 = 0.643·R·(12·μ·V/T)^(2/3). With a nip the
/// film is taken as squeezed out.
fn foil_bearing_ratio(case: &ResolvedCase, outer_r: f64) -> f64 {
    let t = tension_at(case, outer_r);
    let roughness = case.web.roughness * std::f64::consts::SQRT_2;
    if t <= 0.0 || roughness <= 0.0 {
        return 0.0;
    }
    let nip = case.winding.nip_load.is_some_and(|n| n > 0.0);
    crate::model::air::film_at(outer_r, case.winding.speed, t, roughness, nip).ratio_to_roughness
}

/// Radial extent each node represents inside `[start, end)` (trapezoid weights).
fn radial_weights(r: &[f64], start: usize, end: usize) -> Vec<f64> {
    (start..end)
        .map(|i| {
            let left = if i > start {
                (r[i] - r[i - 1]) / 2.0
            } else {
                0.0
            };
            let right = if i + 1 < end {
                (r[i + 1] - r[i]) / 2.0
            } else {
                0.0
            };
            (left + right).max(0.0)
        })
        .collect()
}

fn argmax(values: &[f64]) -> (usize, f64) {
    values
        .iter()
        .copied()
        .enumerate()
        .fold(
            (0, f64::NEG_INFINITY),
            |b, (i, v)| if v > b.1 { (i, v) } else { b },
        )
}

fn argmin(values: &[f64]) -> (usize, f64) {
    values.iter().copied().enumerate().fold(
        (0, f64::INFINITY),
        |b, (i, v)| if v < b.1 { (i, v) } else { b },
    )
}
