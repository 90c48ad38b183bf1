//! Numbers the rules may test, computed once per profile and case.
//!
//! Every indicator has a stable ID, a dimension (which decides the units a rule threshold may be
//! written in), a unit for display and a one-line meaning. The formulas are listed in
//! `docs/rules.md`. Rules name indicators and zones, never array positions.

use std::collections::BTreeMap;

use serde::{Deserialize, Serialize};

use crate::case::ResolvedCase;
use crate::model::{Profile, Taper, WindingMethod, ZoneName};

/// One computed indicator value.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct IndicatorValue {
    pub id: String,
    pub zone: Option<String>,
    /// Value in SI (Pa, m, m/s, N/m, °C) or as a dimensionless ratio; `taper` is in percent.
    pub value: f64,
    pub unit: String,
    pub meaning: String,
}

/// What kind of quantity an indicator is; decides accepted threshold units and formatting.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Dimension {
    /// Pa (pressure or stress; accepts Pa, kPa, MPa, psi).
    Pressure,
    /// Share 0..1 (accepts a plain fraction or "%").
    Fraction,
    /// Plain ratio, no unit.
    Ratio,
    /// Percent points (taper); accepts "%" or a plain number of percent.
    Percent,
    /// m/s (accepts m/s, m/min, fpm, ft/min).
    Speed,
    /// N/m (accepts N/m, kN/m, pli).
    ForcePerWidth,
    /// °C (accepts C, °C, degC).
    Temperature,
    /// m (accepts m, mm, um, µm, mil, in).
    Length,
}

/// Whether an indicator takes a zone.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ZoneUse {
    /// Whole roll only.
    None,
    /// Whole roll when no zone is named, else the named zone.
    Optional,
    /// A zone must be named.
    Required,
}

/// The definition of one indicator.
#[derive(Debug, Clone, Copy)]
pub struct IndicatorSpec {
    pub id: &'static str,
    pub dimension: Dimension,
    pub zones: ZoneUse,
    pub meaning: &'static str,
}

/// The indicators read straight from the case's inputs (settings and web data), not from the
/// solved stress state: a remedy that changes a setting moves them by construction, so the
/// what-if judges a remedy's effect on the others first.
pub const INPUT_INDICATORS: &[&str] = &[
    "speed",
    "web_tension",
    "web_stress",
    "winding_strain",
    "tension_strength_share",
    "tension_to_usual",
    "tension_to_recipe",
    "nip_load",
    "nip_to_tension",
    "nip_wit_share",
    "taper",
    "temperature",
    "thickness",
    "roll_diameter",
    "friction",
    "build_ratio",
];

/// The indicators that come from measurements (src/evidence), not from the solve.
pub const EVIDENCE_IDS: &[&str] = &[
    "measured_density_ratio",
    "density_deviation",
    "hardness_shape_agreement",
    "hardness_soft_band",
    "lane_hardness_spread",
    "end_line_offset",
    "end_line_bend_position",
    "slip_location_match",
    "core_bore_ratio",
    "bad_roll_share",
    "bad_edge_share",
    "bad_parent_share",
];

/// Pressure below which a layer counts as loosely held (20 kPa ≈ 3 psi): an order of magnitude
/// for the interlayer pressure below which layers slide under handling loads — `common practice`,
/// value `(from memory)`.
pub const LOW_PRESSURE_LIMIT: f64 = 20.0e3;

/// Every indicator the rules may test.
pub const INDICATORS: &[IndicatorSpec] = &[
    spec(
        "core_pressure",
        Dimension::Pressure,
        ZoneUse::None,
        "interlayer pressure on the core surface",
    ),
    spec(
        "core_pressure_ratio",
        Dimension::Ratio,
        ZoneUse::None,
        "pressure on the core divided by the core's rated crush pressure (above 1 = overloaded)",
    ),
    spec(
        "peak_pressure",
        Dimension::Pressure,
        ZoneUse::None,
        "highest interlayer pressure anywhere in the roll",
    ),
    spec(
        "peak_pressure_position",
        Dimension::Fraction,
        ZoneUse::None,
        "where the pressure peaks, as a share of the build from the core (0) to the outside (1)",
    ),
    spec(
        "pressure_min",
        Dimension::Pressure,
        ZoneUse::Required,
        "lowest interlayer pressure in the zone",
    ),
    spec(
        "pressure_mean",
        Dimension::Pressure,
        ZoneUse::Required,
        "mean interlayer pressure in the zone (averaged over radius)",
    ),
    spec(
        "pressure_max",
        Dimension::Pressure,
        ZoneUse::Required,
        "highest interlayer pressure in the zone",
    ),
    spec(
        "low_pressure_extent",
        Dimension::Fraction,
        ZoneUse::Optional,
        "share of the zone's build where the interlayer pressure is below 20 kPa (loosely held layers)",
    ),
    spec(
        "telescoping_margin",
        Dimension::Ratio,
        ZoneUse::None,
        "smallest ratio, over every interface, of the friction the pressure gives to the axial shear of lifting the roll by its core (with the shock factor); below 1 = layers slide",
    ),
    spec(
        "starring_margin",
        Dimension::Ratio,
        ZoneUse::None,
        "smallest ratio, over every interface, of the stress that buckles a wrap on the elastic foundation of the stack around it to the wrap's hoop compression (docs/theory.md §5.3); below 1 = the wrap buckles (starring); 1000 = no hoop compression",
    ),
    spec(
        "starring_margin_position",
        Dimension::Fraction,
        ZoneUse::None,
        "where the starring margin is smallest, as a share of the build from the core (0 = at the core)",
    ),
    spec(
        "min_tangential_stress",
        Dimension::Pressure,
        ZoneUse::Optional,
        "most compressive tangential (hoop) stress in the zone; negative = compression",
    ),
    spec(
        "min_tangential_position",
        Dimension::Fraction,
        ZoneUse::None,
        "where the most compressive tangential stress sits, as a share of the build from the core",
    ),
    spec(
        "compressive_band_extent",
        Dimension::Fraction,
        ZoneUse::Optional,
        "share of the zone's build where the layers are in tangential compression",
    ),
    spec(
        "compressive_stress_ratio",
        Dimension::Ratio,
        ZoneUse::Optional,
        "most compressive tangential stress in the zone divided by the web stress at winding (0 = none)",
    ),
    spec(
        "slip_margin",
        Dimension::Ratio,
        ZoneUse::None,
        "smallest ratio, over every interface inside the surface wraps and every event (start-up, stops, unwind), of the friction torque the interface can carry to the torque it must pass (below 1 = layers slip)",
    ),
    spec(
        "speed_change_slip_margin",
        Dimension::Ratio,
        ZoneUse::None,
        "the slip margin over the speed-change events only (start-up, normal stop, emergency stop): what the roll's inertia asks of the layers",
    ),
    spec(
        "core_slip_margin",
        Dimension::Ratio,
        ZoneUse::None,
        "the same ratio at the core/web interface, smallest over the events (below 1 = the roll turns on its core)",
    ),
    spec(
        "air_film_ratio",
        Dimension::Ratio,
        ZoneUse::None,
        "entrained air film thickness divided by the combined surface roughness (above ~1 the layers float)",
    ),
    spec(
        "wit_strength_share",
        Dimension::Fraction,
        ZoneUse::None,
        "highest wound-in tension as a share of the web's tensile strength",
    ),
    spec(
        "wit_drop",
        Dimension::Fraction,
        ZoneUse::None,
        "fall of the wound-in tension from the core to the outside, as a share of the value at the core",
    ),
    spec(
        "wit_step",
        Dimension::Fraction,
        ZoneUse::None,
        "largest jump of wound-in tension between neighbouring layers, as a share of the mean wound-in tension (steps, upsets)",
    ),
    spec(
        "build_ratio",
        Dimension::Ratio,
        ZoneUse::None,
        "finished roll diameter divided by core outside diameter",
    ),
    spec(
        "radial_strain_max",
        Dimension::Fraction,
        ZoneUse::Optional,
        "largest radial compressive strain of the stack in the zone",
    ),
    spec(
        "build_compression",
        Dimension::Fraction,
        ZoneUse::None,
        "mean radial compressive strain over the build: share of the loose web thickness pressed out",
    ),
    spec(
        "core_stiffness_ratio",
        Dimension::Ratio,
        ZoneUse::None,
        "effective core stiffness divided by the radial modulus of the first wraps (low = soft core)",
    ),
    spec(
        "acceleration_torque_share",
        Dimension::Ratio,
        ZoneUse::None,
        "torque to accelerate the full roll to line speed divided by the steady tension torque",
    ),
    spec(
        "speed",
        Dimension::Speed,
        ZoneUse::None,
        "line speed at the winder",
    ),
    spec(
        "web_tension",
        Dimension::ForcePerWidth,
        ZoneUse::None,
        "web tension at the start of the roll, per unit width",
    ),
    spec(
        "web_stress",
        Dimension::Pressure,
        ZoneUse::None,
        "web tension at the start of the roll divided by the web thickness",
    ),
    spec(
        "winding_strain",
        Dimension::Fraction,
        ZoneUse::None,
        "machine-direction strain of the web at winding: web tension / (tangential modulus × thickness)",
    ),
    spec(
        "nip_wit_share",
        Dimension::Fraction,
        ZoneUse::None,
        "share of the wound-in tension that comes from the nip (friction × nip load), 0 without a nip",
    ),
    spec(
        "tension_to_usual",
        Dimension::Ratio,
        ZoneUse::None,
        "web tension divided by the usual tension for this web: the case's recipe value, else the grade's typical winding stress × caliper (1 = usual)",
    ),
    spec(
        "tension_to_recipe",
        Dimension::Ratio,
        ZoneUse::None,
        "web tension divided by the recipe tension the case states (absent when not stated)",
    ),
    spec(
        "tension_strength_share",
        Dimension::Fraction,
        ZoneUse::None,
        "web tension at the start as a share of the web's tensile strength",
    ),
    spec(
        "nip_load",
        Dimension::ForcePerWidth,
        ZoneUse::None,
        "nip (rider or lay-on roll) load per unit width; 0 when there is no nip",
    ),
    spec(
        "nip_to_tension",
        Dimension::Ratio,
        ZoneUse::None,
        "nip load divided by web tension",
    ),
    spec(
        "taper",
        Dimension::Percent,
        ZoneUse::None,
        "tension taper from core to outside in percent of the starting tension",
    ),
    spec(
        "temperature",
        Dimension::Temperature,
        ZoneUse::None,
        "web temperature at the winder (absent when not given)",
    ),
    spec(
        "thickness",
        Dimension::Length,
        ZoneUse::None,
        "web thickness (caliper)",
    ),
    spec(
        "roll_diameter",
        Dimension::Length,
        ZoneUse::None,
        "finished roll diameter",
    ),
    spec(
        "friction",
        Dimension::Ratio,
        ZoneUse::None,
        "web-to-web friction coefficient",
    ),
    // Measured evidence (src/evidence): present only when the case carries the measurement.
    spec(
        "measured_density_ratio",
        Dimension::Ratio,
        ZoneUse::None,
        "wound density measured (length or weight and diameter) divided by the computed one (below 1 = looser than the settings give)",
    ),
    spec(
        "density_deviation",
        Dimension::Ratio,
        ZoneUse::None,
        "measured minus computed mean radial compression in standard uncertainties of the measurement (below −2 = clearly looser than the settings give, above 2 = clearly denser)",
    ),
    spec(
        "hardness_shape_agreement",
        Dimension::Ratio,
        ZoneUse::None,
        "rank correlation of the hardness readings along the radius with the computed pressure (1 = same shape, 0 = none)",
    ),
    spec(
        "hardness_soft_band",
        Dimension::Fraction,
        ZoneUse::None,
        "deepest dip in the hardness readings the computed pressure does not have, as a share of the readings' range",
    ),
    spec(
        "lane_hardness_spread",
        Dimension::Fraction,
        ZoneUse::None,
        "hardness spread across the width (hardest minus softest lane over the mean); the model cannot compute it",
    ),
    spec(
        "end_line_offset",
        Dimension::Length,
        ZoneUse::None,
        "largest sideways offset of a straight line drawn on the roll end (0 = stayed straight)",
    ),
    spec(
        "end_line_bend_position",
        Dimension::Fraction,
        ZoneUse::None,
        "where the line on the roll end bends, as a share of the build from the core (middle of the bend)",
    ),
    spec(
        "slip_location_match",
        Dimension::Ratio,
        ZoneUse::None,
        "1 when the line on the roll end bends where the computed friction torque capacity is lowest, 0 when not",
    ),
    spec(
        "core_bore_ratio",
        Dimension::Ratio,
        ZoneUse::None,
        "measured closing of the core bore divided by the computed elastic closing under the core pressure",
    ),
    spec(
        "bad_roll_share",
        Dimension::Fraction,
        ZoneUse::None,
        "share of the rolls in the set that are bad",
    ),
    spec(
        "bad_edge_share",
        Dimension::Fraction,
        ZoneUse::None,
        "share of the bad rolls that sat at the two edge positions of the set",
    ),
    spec(
        "bad_parent_share",
        Dimension::Fraction,
        ZoneUse::None,
        "share of the parent rolls looked at that gave bad rolls",
    ),
];

const fn spec(
    id: &'static str,
    dimension: Dimension,
    zones: ZoneUse,
    meaning: &'static str,
) -> IndicatorSpec {
    IndicatorSpec {
        id,
        dimension,
        zones,
        meaning,
    }
}

/// The definition of indicator `id`.
pub fn indicator_spec(id: &str) -> Option<&'static IndicatorSpec> {
    INDICATORS.iter().find(|s| s.id == id)
}

/// Display unit of a dimension.
pub fn unit_of(dimension: Dimension) -> &'static str {
    match dimension {
        Dimension::Pressure => "Pa",
        Dimension::Fraction | Dimension::Ratio => "",
        Dimension::Percent => "%",
        Dimension::Speed => "m/s",
        Dimension::ForcePerWidth => "N/m",
        Dimension::Temperature => "°C",
        Dimension::Length => "m",
    }
}

/// Format a value of `dimension` with a readable unit.
pub fn format_value(value: f64, dimension: Dimension) -> String {
    match dimension {
        Dimension::Pressure => {
            if value.abs() >= 1.0e6 {
                format!("{} MPa", sig(value / 1.0e6))
            } else {
                format!("{} kPa", sig(value / 1.0e3))
            }
        }
        Dimension::Fraction => format!("{} %", sig(value * 100.0)),
        Dimension::Ratio => sig(value),
        Dimension::Percent => format!("{} %", sig(value)),
        Dimension::Speed => format!("{} m/min", sig(value * 60.0)),
        Dimension::ForcePerWidth => format!("{} N/m", sig(value)),
        Dimension::Temperature => format!("{} °C", sig(value)),
        Dimension::Length => {
            if value.abs() >= 1.0e-3 {
                format!("{} mm", sig(value * 1.0e3))
            } else {
                format!("{} µm", sig(value * 1.0e6))
            }
        }
    }
}

/// Three significant digits, no trailing zeros, no exponent for everyday magnitudes.
fn sig(value: f64) -> String {
    if !value.is_finite() {
        return if value > 0.0 {
            "∞".into()
        } else {
            "—".into()
        };
    }
    if value == 0.0 {
        return "0".into();
    }
    let magnitude = value.abs().log10().floor() as i32;
    let decimals = (2 - magnitude).clamp(0, 6) as usize;
    let text = format!("{value:.decimals$}");
    if text.contains('.') {
        text.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        text
    }
}

/// All indicator values of one profile and case.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Indicators {
    values: BTreeMap<(String, Option<ZoneName>), f64>,
    /// Measured and computed values in words, for the measured-evidence indicators.
    details: BTreeMap<String, String>,
}

impl Indicators {
    /// The value of `id` in `zone` (or for the whole roll), if it could be computed.
    pub fn get(&self, id: &str, zone: Option<ZoneName>) -> Option<f64> {
        self.values.get(&(id.to_string(), zone)).copied()
    }

    /// The measured and computed values behind an evidence indicator, in words.
    pub fn detail(&self, id: &str) -> Option<&str> {
        self.details.get(id).map(String::as_str)
    }

    /// Add the measured-evidence indicators (none when nothing was measured: rules testing
    /// them stay neutral).
    pub fn add_evidence(&mut self, evidence: &crate::evidence::Evidence) {
        for e in evidence.indicators() {
            self.set(e.id, None, e.value);
            self.details.insert(e.id.to_string(), e.detail);
        }
    }

    fn set(&mut self, id: &'static str, zone: Option<ZoneName>, value: f64) {
        if value.is_finite() {
            self.values.insert((id.to_string(), zone), value);
        }
    }

    /// Every value with unit and meaning, for reports.
    pub fn values(&self) -> Vec<IndicatorValue> {
        self.values
            .iter()
            .filter_map(|((id, zone), value)| {
                let spec = indicator_spec(id)?;
                Some(IndicatorValue {
                    id: id.clone(),
                    zone: zone.map(|z| z.as_str().to_string()),
                    value: *value,
                    unit: unit_of(spec.dimension).to_string(),
                    meaning: spec.meaning.to_string(),
                })
            })
            .collect()
    }

    /// Compute every indicator of `profile` for `case`, with the measured evidence when the case
    /// carries measurements (a measurement that cannot be compared is left out: neutral).
    pub fn compute(case: &ResolvedCase, profile: &Profile) -> Indicators {
        let mut out = Indicators::default();
        out.add_case_inputs(case);
        out.add_profile(case, profile);
        if let Some(m) = &case.measurements
            && let Ok(evidence) = crate::evidence::compare(
                m,
                &case.problem(crate::model::SolverOptions::default()),
                profile,
            )
        {
            out.add_evidence(&evidence);
        }
        out
    }

    /// These indicators with the measured evidence of `other` in place of their own: a what-if
    /// re-solve changes the settings, not what was measured on the roll, so the evidence stays
    /// as measured against the case as wound.
    pub fn with_evidence_of(mut self, other: &Indicators) -> Indicators {
        let evidence = |id: &str| EVIDENCE_IDS.contains(&id);
        self.values.retain(|(id, _), _| !evidence(id));
        self.details.clear();
        for ((id, zone), value) in &other.values {
            if evidence(id) {
                self.values.insert((id.clone(), *zone), *value);
            }
        }
        self.details = other.details.clone();
        self
    }

    fn add_case_inputs(&mut self, case: &ResolvedCase) {
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

    fn add_profile(&mut self, case: &ResolvedCase, profile: &Profile) {
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

        // Whole-roll and per-zone band measures.
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
        self.set("speed_change_slip_margin", None, torque.speed_change_margin);
        let telescoping = crate::mechanics::telescoping::handling_margins(profile, &inputs);
        self.set("telescoping_margin", None, telescoping.min_margin);
        let starring = crate::mechanics::starring::buckling_margins(profile, &inputs);
        self.set("starring_margin", None, starring.min_margin);
        // Where only when some wrap is in hoop compression (with none, the minimum is the cap).
        if outer_r > core_r && starring.min_margin < crate::mechanics::MARGIN_CAP {
            self.set(
                "starring_margin_position",
                None,
                ((starring.min_radius - core_r) / (outer_r - core_r)).clamp(0.0, 1.0),
            );
        }

        // Air film: the solver's estimate when present, otherwise the foil-bearing estimate.
        let ratio = match &profile.air_film {
            // The film as wound (after the nip where there is one): the same figure the
            // reports print.
            Some((start, outside)) => start.ratio_to_roughness.max(outside.ratio_to_roughness),
            None => foil_bearing_ratio(case, outer_r),
        };
        self.set("air_film_ratio", None, ratio);
    }
}

/// Taper in percent of the start tension, whatever form the schedule takes.
pub fn taper_percent(case: &ResolvedCase) -> f64 {
    let schedule = &case.winding.tension;
    match &schedule.taper {
        Taper::None => 0.0,
        Taper::Linear { fraction } | Taper::Hyperbolic { fraction } => fraction * 100.0,
        Taper::Steps { steps } => match steps.last() {
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
    let inertia = crate::mechanics::torque::annulus_inertia(
        crate::mechanics::density_of(case.web.material),
        core_r,
        outer_r,
    );
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

/// Parse a rule threshold written as a number or "number unit" for an indicator of `dimension`.
/// Returns the value in the indicator's internal unit, or the accepted units on error.
pub fn parse_threshold(text: &str, dimension: Dimension) -> Result<f64, String> {
    let accepted = match dimension {
        Dimension::Pressure => "Pa, kPa, MPa, psi (or a plain number in Pa)",
        Dimension::Fraction => "%, or a plain fraction 0..1",
        Dimension::Ratio => "a plain number",
        Dimension::Percent => "% (or a plain number of percent)",
        Dimension::Speed => "m/s, m/min, fpm, ft/min (or a plain number in m/s)",
        Dimension::ForcePerWidth => "N/m, kN/m, pli (or a plain number in N/m)",
        Dimension::Temperature => "°C, C, degC (or a plain number in °C)",
        Dimension::Length => "m, mm, um, µm, mil, in (or a plain number in m)",
    };
    let trimmed = text.trim();
    let split = trimmed
        .find(|c: char| !(c.is_ascii_digit() || c == '.' || c == '-' || c == '+' || c == 'e'))
        .unwrap_or(trimmed.len());
    let (number, unit) = trimmed.split_at(split);
    let number: f64 = number
        .trim()
        .parse()
        .map_err(|_| format!("\"{text}\" is not a number with a unit; accepted: {accepted}"))?;
    let unit = unit.trim();
    let factor = match (dimension, unit) {
        (_, "") => Some(1.0),
        (Dimension::Pressure, "Pa") => Some(1.0),
        (Dimension::Pressure, "kPa") => Some(1.0e3),
        (Dimension::Pressure, "MPa") => Some(1.0e6),
        (Dimension::Pressure, "psi") => Some(6894.757),
        (Dimension::Fraction, "%") => Some(0.01),
        (Dimension::Percent, "%") => Some(1.0),
        (Dimension::Speed, "m/s") => Some(1.0),
        (Dimension::Speed, "m/min") => Some(1.0 / 60.0),
        (Dimension::Speed, "fpm" | "ft/min") => Some(0.3048 / 60.0),
        (Dimension::ForcePerWidth, "N/m") => Some(1.0),
        (Dimension::ForcePerWidth, "kN/m") => Some(1.0e3),
        (Dimension::ForcePerWidth, "pli") => Some(175.126_8),
        (Dimension::Temperature, "°C" | "C" | "degC") => Some(1.0),
        (Dimension::Length, "m") => Some(1.0),
        (Dimension::Length, "mm") => Some(1.0e-3),
        (Dimension::Length, "um" | "µm") => Some(1.0e-6),
        (Dimension::Length, "mil") => Some(25.4e-6),
        (Dimension::Length, "in") => Some(0.0254),
        _ => None,
    };
    factor
        .map(|f| number * f)
        .ok_or_else(|| format!("unit \"{unit}\" in \"{text}\" does not fit; accepted: {accepted}"))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn thresholds_parse_trade_units() {
        // 1 pli = 1 lbf/in = 4.448222 N / 0.0254 m = 175.127 N/m (exact definitions).
        let pli = parse_threshold("1 pli", Dimension::ForcePerWidth).unwrap();
        assert!((pli - 175.127).abs() < 0.01);
        // 1 psi = 6894.757 Pa (exact definition of the pound-force and inch).
        let psi = parse_threshold("10 psi", Dimension::Pressure).unwrap();
        assert!((psi - 68947.57).abs() < 0.1);
        assert!((parse_threshold("600 m/min", Dimension::Speed).unwrap() - 10.0).abs() < 1e-12);
        assert!((parse_threshold("5 %", Dimension::Fraction).unwrap() - 0.05).abs() < 1e-12);
        assert!(parse_threshold("5 pli", Dimension::Pressure).is_err());
    }

    #[test]
    fn values_format_readably() {
        assert_eq!(format_value(2.1e6, Dimension::Pressure), "2.1 MPa");
        assert_eq!(format_value(35_000.0, Dimension::Pressure), "35 kPa");
        assert_eq!(format_value(0.125, Dimension::Fraction), "12.5 %");
        assert_eq!(format_value(10.0, Dimension::Speed), "600 m/min");
    }
}
