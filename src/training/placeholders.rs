//! `{placeholders}` in walk-through explanations, filled from the computed profile and
//! diagnosis so the feedback quotes this roll's numbers rather than canned text.

use super::session::Computed;
use crate::model::{Profile, ZoneName};
use crate::units::{QuantityKind, UnitSystem, format_quantity};

/// Every placeholder name and what it stands for. Zone placeholders take a zone after a colon,
/// e.g. `{pressure_mean:outer}`.
pub const PLACEHOLDERS: [(&str, &str); 30] = [
    ("core_pressure", "interlayer pressure on the core"),
    ("crush_pressure", "the core's rated crush pressure"),
    (
        "core_pressure_percent",
        "core pressure as a percentage of the crush rating",
    ),
    ("peak_pressure", "highest interlayer pressure in the roll"),
    ("peak_pressure_radius", "radius of the highest pressure"),
    (
        "min_tangential_stress",
        "most compressive tangential stress",
    ),
    (
        "min_tangential_radius",
        "radius of the most compressive tangential stress",
    ),
    ("web_tension", "web tension at the start of the roll"),
    ("wound_in_tension", "wound-in tension at the core"),
    (
        "wound_in_tension_outside",
        "wound-in tension at the outside",
    ),
    (
        "tension_share",
        "web tension as a percentage of the web's strength",
    ),
    ("nip_load", "nip load, or 'no nip'"),
    ("speed", "line speed"),
    ("roll_diameter", "finished roll diameter"),
    ("core_diameter", "core outside diameter"),
    ("layers", "number of layers in the roll"),
    (
        "air_film_ratio",
        "air-film thickness over combined roughness at the outside",
    ),
    ("top_cause", "title of the cause the tool ranks first"),
    ("top_cause_belief", "belief in the first-ranked cause"),
    (
        "pressure_mean",
        "mean pressure in a zone (`{pressure_mean:middle}`)",
    ),
    ("pressure_min", "lowest pressure in a zone"),
    ("pressure_max", "highest pressure in a zone"),
    (
        "tangential_min",
        "most compressive tangential stress in a zone",
    ),
    ("tangential_max", "highest tangential stress in a zone"),
    ("zone_radii", "radius range of a zone (`{zone_radii:core}`)"),
    ("measured_length", "wound length measured on the roll"),
    ("measured_diameter", "diameter measured on the roll"),
    (
        "computed_diameter",
        "diameter the model gives for the measured length",
    ),
    (
        "measured_compression",
        "mean radial compression from the measured size, with its uncertainty",
    ),
    ("computed_compression", "mean radial compression computed"),
];

/// True when `{name}` or `{name:zone}` is a known placeholder.
pub(crate) fn is_known(placeholder: &str) -> bool {
    let (name, zone) = split(placeholder);
    let known = PLACEHOLDERS.iter().any(|(n, _)| *n == name);
    let zoned = is_zoned(name);
    match zone {
        Some(zone) => known && zoned && ZoneName::ALL.iter().any(|z| z.as_str() == zone),
        None => known && !zoned,
    }
}

fn is_zoned(name: &str) -> bool {
    matches!(
        name,
        "pressure_mean"
            | "pressure_min"
            | "pressure_max"
            | "tangential_min"
            | "tangential_max"
            | "zone_radii"
    )
}

fn split(placeholder: &str) -> (&str, Option<&str>) {
    match placeholder.split_once(':') {
        Some((name, zone)) => (name.trim(), Some(zone.trim())),
        None => (placeholder.trim(), None),
    }
}

/// Every `{...}` in `text`, in order.
pub(crate) fn placeholders_in(text: &str) -> Vec<String> {
    let mut found = Vec::new();
    let mut rest = text;
    while let Some(start) = rest.find('{') {
        let after = &rest[start + 1..];
        match after.find('}') {
            Some(end) => {
                found.push(after[..end].to_string());
                rest = &after[end + 1..];
            }
            None => break,
        }
    }
    found
}

fn zone_values<'a>(profile: &'a Profile, zone: &str, data: &'a [f64]) -> Option<&'a [f64]> {
    let zone = profile.zones.iter().find(|z| z.name.as_str() == zone)?;
    let values = data.get(zone.start..zone.end.min(data.len()))?;
    (!values.is_empty()).then_some(values)
}

/// The value of one placeholder, formatted with its unit; `None` when unknown or not computable.
pub(crate) fn value_of(
    placeholder: &str,
    computed: &Computed,
    units: UnitSystem,
) -> Option<String> {
    let (name, zone) = split(placeholder);
    let profile = &computed.profile;
    let case = &computed.resolved;
    let stress = |v: f64| format_quantity(v, QuantityKind::Stress, units);
    let length = |v: f64| format_quantity(v, QuantityKind::Length, units);
    let tension = |v: f64| format_quantity(v, QuantityKind::ForcePerWidth, units);
    let s = &profile.summary;
    if let Some(zone) = zone {
        let fold_min = |v: &[f64]| v.iter().copied().fold(f64::INFINITY, f64::min);
        let fold_max = |v: &[f64]| v.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        return match name {
            "pressure_mean" => zone_values(profile, zone, &profile.pressure)
                .map(|v| stress(v.iter().sum::<f64>() / v.len() as f64)),
            "pressure_min" => {
                zone_values(profile, zone, &profile.pressure).map(|v| stress(fold_min(v)))
            }
            "pressure_max" => {
                zone_values(profile, zone, &profile.pressure).map(|v| stress(fold_max(v)))
            }
            "tangential_min" => {
                zone_values(profile, zone, &profile.tangential_stress).map(|v| stress(fold_min(v)))
            }
            "tangential_max" => {
                zone_values(profile, zone, &profile.tangential_stress).map(|v| stress(fold_max(v)))
            }
            "zone_radii" => profile
                .zones
                .iter()
                .find(|z| z.name.as_str() == zone)
                .map(|z| format!("{} to {}", length(z.inner_radius), length(z.outer_radius))),
            _ => None,
        };
    }
    let value = match name {
        "core_pressure" => stress(s.core_pressure),
        "crush_pressure" => stress(case.core.crush_pressure),
        "core_pressure_percent" if case.core.crush_pressure > 0.0 => {
            format!(
                "{:.0} %",
                100.0 * s.core_pressure / case.core.crush_pressure
            )
        }
        "peak_pressure" => stress(s.peak_pressure),
        "peak_pressure_radius" => length(s.peak_pressure_radius),
        "min_tangential_stress" => stress(s.min_tangential_stress),
        "min_tangential_radius" => length(s.min_tangential_radius),
        "web_tension" => tension(case.winding.tension.start_tension),
        "wound_in_tension" => tension(*profile.wound_in_tension.first()?),
        "wound_in_tension_outside" => tension(*profile.wound_in_tension.last()?),
        "tension_share" if case.web.strength > 0.0 => format!(
            "{:.0} %",
            100.0 * case.winding.tension.start_tension / case.web.strength
        ),
        "nip_load" => match case.winding.nip_load {
            Some(n) if n > 0.0 => tension(n),
            _ => "no nip".to_string(),
        },
        "speed" => format_quantity(case.winding.speed, QuantityKind::Speed, units),
        "roll_diameter" => length(case.roll.outer_diameter),
        "core_diameter" => length(case.core.outside_diameter),
        "layers" => s.physical_layers.to_string(),
        "air_film_ratio" => {
            let (_, outside) = profile.air_film?;
            if outside.reduced_by_nip {
                format!(
                    "{:.2} (reduced by the nip from {:.1})",
                    outside.ratio_to_roughness,
                    outside.free_thickness / (outside.thickness / outside.ratio_to_roughness)
                )
            } else {
                format!("{:.1}", outside.ratio_to_roughness)
            }
        }
        "top_cause" => computed.diagnosis.as_ref()?.causes.first()?.title.clone(),
        "top_cause_belief" => format!("{:.2}", computed.diagnosis.as_ref()?.causes.first()?.belief),
        "measured_length"
        | "measured_diameter"
        | "computed_diameter"
        | "measured_compression"
        | "computed_compression" => {
            let d = computed.diagnosis.as_ref()?.evidence.as_ref()?.density?;
            match name {
                "measured_length" => length(d.length),
                "measured_diameter" => length(d.measured_diameter),
                "computed_diameter" => length(d.computed_diameter),
                "measured_compression" => format!(
                    "{:.1} % ± {:.1} %",
                    100.0 * d.measured_compression,
                    100.0 * d.compression_uncertainty
                ),
                _ => format!("{:.1} %", 100.0 * d.computed_compression),
            }
        }
        _ => return None,
    };
    Some(value)
}

/// Replace every known `{placeholder}` in `text` with its computed value. Without a computed
/// state, or when a value cannot be computed, the placeholder becomes "(not computed)".
pub fn fill_placeholders(text: &str, computed: Option<&Computed>, units: UnitSystem) -> String {
    let mut out = String::with_capacity(text.len());
    let mut rest = text;
    while let Some(start) = rest.find('{') {
        out.push_str(&rest[..start]);
        let after = &rest[start + 1..];
        let Some(end) = after.find('}') else {
            out.push_str(&rest[start..]);
            return out;
        };
        let placeholder = &after[..end];
        if is_known(placeholder) {
            let value = computed
                .and_then(|c| value_of(placeholder, c, units))
                .unwrap_or_else(|| "(not computed)".to_string());
            out.push_str(&value);
        } else {
            out.push('{');
            out.push_str(placeholder);
            out.push('}');
        }
        rest = &after[end + 1..];
    }
    out.push_str(rest);
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn known_placeholders_and_zones() {
        assert!(is_known("core_pressure"));
        assert!(is_known("pressure_mean:outer"));
        assert!(!is_known("pressure_mean"), "zone placeholders need a zone");
        assert!(
            !is_known("core_pressure:outer"),
            "plain placeholders take no zone"
        );
        assert!(!is_known("pressure_mean:centre"));
        assert_eq!(placeholders_in("a {x} b {y:z} {"), vec!["x", "y:z"]);
    }
}
