//! Stable identifiers shared by case files, rules, tests and the UI.
//!
//! Changing an ID here breaks saved case files and rule files: add, never rename.

/// Symptom (roll defect) IDs. One rule file per symptom lives in `rules/`.
pub const SYMPTOM_IDS: [&str; 14] = [
    "telescoping",
    "starring",
    "blocking",
    "crushed_core",
    "bulk_loss",
    "cinching",
    "soft_roll",
    "out_of_round",
    "wrinkles",
    "gauge_bands",
    "dishing",
    "bursts",
    "core_slip",
    "tin_canning",
];

/// Cause IDs every rule base must define (it may add more).
pub const CAUSE_IDS: [&str; 21] = [
    "tension_too_high",
    "tension_too_low",
    "taper_missing",
    "taper_excessive",
    "tension_upset",
    "nip_load_too_high",
    "nip_load_too_low",
    "air_entrainment",
    "low_web_friction",
    "core_too_weak",
    "core_too_soft",
    "loose_start",
    "caliper_variation",
    "moisture_temperature_change",
    "build_ratio_too_large",
    "handling_damage",
    "storage_stress",
    "acceleration_torque",
    "web_misalignment",
    "tacky_web",
    "winding_too_hot",
];

/// Where on the roll a symptom is seen.
pub const PLACES: [&str; 5] = ["core", "body", "outside", "edges", "whole_roll"];

/// True when `id` is a known symptom ID.
pub fn is_symptom(id: &str) -> bool {
    SYMPTOM_IDS.contains(&id)
}

/// The closest candidate to `given` by Jaro–Winkler similarity, if any is reasonably close.
/// Used for every "did you mean" in error messages.
pub fn closest<'a, I>(given: &str, candidates: I) -> Option<&'a str>
where
    I: IntoIterator<Item = &'a str>,
{
    let mut best: Option<(&str, f64)> = None;
    for candidate in candidates {
        let score = strsim::jaro_winkler(&given.to_lowercase(), &candidate.to_lowercase());
        if best.is_none_or(|(_, b)| score > b) {
            best = Some((candidate, score));
        }
    }
    best.filter(|(_, score)| *score >= 0.7).map(|(c, _)| c)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn closest_suggests_near_misses() {
        assert_eq!(closest("telescopng", SYMPTOM_IDS), Some("telescoping"));
        assert_eq!(closest("zzzzzz", SYMPTOM_IDS), None);
    }
}
