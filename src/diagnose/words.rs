//! Plain-words names of indicators for people (screens, text output, reports). JSON and
//! `--verbose` keep the IDs; everything a person reads goes through [`indicator_title`] or
//! [`indicator_label`].

/// Short names of the indicators, in the words of the trade where one exists.
const TITLES: &[(&str, &str)] = &[
    ("core_pressure", "pressure on the core"),
    ("core_pressure_ratio", "core pressure / crush rating"),
    ("peak_pressure", "highest pressure"),
    ("peak_pressure_position", "where the pressure peaks"),
    ("pressure_min", "lowest pressure"),
    ("pressure_mean", "mean pressure"),
    ("pressure_max", "highest pressure"),
    ("low_pressure_extent", "share loosely held"),
    ("telescoping_margin", "telescoping margin"),
    ("min_tangential_stress", "most compressive hoop stress"),
    (
        "min_tangential_position",
        "where the hoop stress is most compressive",
    ),
    ("compressive_band_extent", "share in hoop compression"),
    ("compressive_stress_ratio", "hoop compression / web stress"),
    ("slip_margin", "slip margin"),
    ("speed_change_slip_margin", "slip margin at speed changes"),
    ("core_slip_margin", "slip margin at the core"),
    ("shaft_slip_margin", "grip margin of the chuck or shaft"),
    ("starring_margin", "starring margin (wrap buckling)"),
    (
        "starring_margin_position",
        "where the starring margin is smallest",
    ),
    (
        "first_wraps_pressure_ratio",
        "pressure in the first wraps / inner zone",
    ),
    (
        "core_pressure_size_share",
        "share of core pressure from the outer half of the build",
    ),
    (
        "core_pressure_taper_share",
        "core pressure removed by more taper",
    ),
    ("air_film_ratio", "air film / roughness"),
    ("wit_strength_share", "wound-in tension / web strength"),
    ("wit_drop", "wound-in tension drop"),
    ("wit_step", "wound-in tension step"),
    ("build_ratio", "roll diameter / core diameter"),
    ("radial_strain_max", "largest radial strain"),
    ("build_compression", "mean radial compression"),
    ("core_stiffness_ratio", "core stiffness / first wraps"),
    (
        "acceleration_torque_share",
        "acceleration torque / tension torque",
    ),
    ("speed", "line speed"),
    ("web_tension", "web tension"),
    ("web_stress", "web stress"),
    ("winding_strain", "web strain at winding"),
    ("nip_wit_share", "share of wound-in tension from the nip"),
    ("tension_to_usual", "tension / usual tension"),
    ("tension_to_recipe", "tension / recipe tension"),
    ("tension_strength_share", "tension / web strength"),
    ("nip_load", "nip load"),
    ("nip_to_tension", "nip load / tension"),
    ("taper", "taper"),
    ("temperature", "web temperature"),
    ("thickness", "web thickness"),
    ("roll_diameter", "roll diameter"),
    ("friction", "web-to-web friction"),
    ("measured_density_ratio", "measured / computed density"),
    ("density_deviation", "density deviation"),
    ("hardness_shape_agreement", "hardness profile agreement"),
    ("hardness_soft_band", "soft band in hardness"),
    ("lane_hardness_spread", "hardness spread across lanes"),
    ("end_line_offset", "end-line offset"),
    ("end_line_bend_position", "where the end line bends"),
    ("slip_location_match", "slip location match"),
    ("core_bore_ratio", "core bore ratio"),
    ("bad_roll_share", "share of bad rolls"),
    ("bad_edge_share", "share of bad edge rolls"),
    ("bad_parent_share", "share of bad parent rolls"),
];

/// "wit_step" → "wound-in tension step"; an indicator not in the table reads as its ID with
/// spaces.
pub fn indicator_title(id: &str) -> String {
    TITLES
        .iter()
        .find(|(i, _)| *i == id)
        .map(|(_, t)| (*t).to_string())
        .unwrap_or_else(|| id.replace('_', " "))
}

/// The indicator with its zone: "mean pressure (middle zone)".
pub fn indicator_label(id: &str, zone: Option<&str>) -> String {
    match zone {
        Some(z) => format!("{} ({z} zone)", indicator_title(id)),
        None => indicator_title(id),
    }
}

/// "belief in 'Web tension too low'".
pub fn belief_label(cause_title: &str) -> String {
    format!("belief in '{cause_title}'")
}

/// The shipped rule base, read once, for the names of symptoms and the words of questions and
/// answers when no rule base was named with [`use_rules`].
fn shipped_rules() -> Option<&'static super::rules::RuleBase> {
    static RULES: std::sync::OnceLock<Option<super::rules::RuleBase>> = std::sync::OnceLock::new();
    RULES
        .get_or_init(|| super::rules::RuleBase::embedded().ok())
        .as_ref()
}

/// The rule base a command diagnoses with (a `--rules` folder, or the shipped rules with their
/// quantities in the chosen units), named once by the command that loaded it.
static IN_USE: std::sync::RwLock<Option<std::sync::Arc<super::rules::RuleBase>>> =
    std::sync::RwLock::new(None);

/// Name the rule base whose words (symptom titles, questions and answers) the outputs use: a
/// symptom or question only in a `--rules` folder then reads in that folder's own words, and
/// quantities in question texts in the units it was loaded in. Without it, the shipped rules
/// in SI. For commands and the terminal UI, which diagnose with one rule base at a time.
pub fn use_rules(rules: &super::rules::RuleBase) {
    if let Ok(mut in_use) = IN_USE.write() {
        *in_use = Some(std::sync::Arc::new(rules.clone()));
    }
}

/// `find` asked of the rule base in use first, then of the shipped one.
fn from_rules<T>(find: impl Fn(&super::rules::RuleBase) -> Option<T>) -> Option<T> {
    let in_use = IN_USE.read().ok().and_then(|r| r.clone());
    in_use
        .as_deref()
        .and_then(&find)
        .or_else(|| shipped_rules().and_then(&find))
}

/// "telescoping" → "Telescoping": a symptom's name as the rule base gives it (the rule file's
/// `title:`); a symptom no rule base knows reads as its ID with spaces.
pub fn symptom_title(id: &str) -> String {
    from_rules(|r| r.symptom(id).map(|s| s.title.clone())).unwrap_or_else(|| id.replace('_', " "))
}

/// A rule threshold in words: "< 0.6" → "below 0.6", "> 1" → "above 1".
fn threshold_words(threshold: &str) -> String {
    if let Some(t) = threshold.strip_prefix("< ") {
        format!("below {t}")
    } else if let Some(t) = threshold.strip_prefix("> ") {
        format!("above {t}")
    } else {
        threshold.to_string()
    }
}

/// What a reason tested, in words, without its explanation: "tension / usual tension = 0.333
/// (rule: below 0.6)" for an indicator, "When did it give way? under handling" for an answer;
/// `None` for the prior and the site history, whose text says it all. The value is taken as
/// it stands (the caller localises measured evidence first).
pub fn reason_tested(reason: &super::Reason) -> Option<String> {
    if reason.test == "prior" || reason.test == "site_history" {
        return None;
    }
    if let Some(plain) = from_rules(|r| {
        r.question(&reason.test)
            .map(|q| answered(q, reason.value.as_deref().unwrap_or_default()))
    }) {
        return Some(plain);
    }
    // Where on the roll the symptom shows: "seen at the core".
    if reason.test == "place" {
        let place = reason.value.as_deref().unwrap_or_default();
        return Some(format!("seen at the {}", place.replace('_', " ")));
    }
    let mut out = indicator_label(&reason.test, reason.zone.as_deref());
    if let Some(value) = &reason.value {
        out.push_str(&format!(" = {value}"));
    }
    // A rule that asks for one value ("= core") says nothing the value does not.
    if let Some(threshold) = reason.threshold.as_ref().filter(|t| !t.starts_with("= ")) {
        out.push_str(&format!(" (rule: {})", threshold_words(threshold)));
    }
    Some(out)
}

/// A question and the answer given, in words: "When did the layers shift? when the roll was
/// moved, lifted or unwound".
fn answered(question: &super::rules::Question, answer: &str) -> String {
    let answer = question
        .choices
        .iter()
        .find(|c| c.id == answer)
        .map_or_else(|| answer.replace('_', " "), |c| c.text.trim().to_string());
    format!("{} {answer}", question.text.trim())
}

/// An answer of the case (`answers:` in the case file) in words, for reports; a question no
/// rule base knows reads as its ID and answer with spaces.
pub fn answer_plain(question: &str, answer: &str) -> String {
    match from_rules(|r| r.question(question).map(|q| answered(q, answer))) {
        Some(plain) => plain,
        None => format!(
            "{}: {}",
            question.replace(['_', '.'], " "),
            answer.replace('_', " ")
        ),
    }
}

/// One reason as a person reads it: "Telescoping: tension / usual tension = 0.333 (rule: below
/// 0.6). Web tension is under 60 % ..." (without the weight, which each output places itself).
pub fn reason_plain(reason: &super::Reason) -> String {
    let symptom = symptom_title(&reason.symptom);
    match reason_tested(reason) {
        Some(tested) => format!("{symptom}: {tested} — {}", reason.text.trim()),
        None => format!("{symptom}: {}", reason.text.trim()),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn an_answer_reads_as_the_question_and_the_choice_in_words() {
        let plain = answer_plain("telescoping.when", "handling");
        assert!(plain.starts_with("When did the layers shift?"), "{plain}");
        assert!(
            !plain.contains('_') && !plain.contains("telescoping.when"),
            "{plain}"
        );
        assert_eq!(answer_plain("after_splice", "no"), "after splice: no");
    }

    #[test]
    fn every_indicator_has_a_title() {
        for spec in super::super::indicators::INDICATORS {
            assert!(
                TITLES.iter().any(|(id, _)| *id == spec.id),
                "indicator {} has no plain-words title",
                spec.id
            );
        }
    }

    #[test]
    fn reasons_read_as_words() {
        let reason = |test: &str, value: &str, threshold: &str| super::super::Reason {
            symptom: "telescoping".into(),
            test: test.into(),
            zone: None,
            value: Some(value.into()),
            threshold: Some(threshold.into()),
            weight: 0.35,
            text: "Why.".into(),
        };
        let line = reason_plain(&reason("tension_to_usual", "0.333", "< 0.6"));
        assert!(!line.contains("tension_to_usual") && !line.contains("[telescoping]"));
        assert!(line.ends_with("tension / usual tension = 0.333 (rule: below 0.6) — Why."));
        let line = reason_plain(&reason("telescoping.when", "handling", "= handling"));
        assert!(
            line.ends_with(
                "When did the layers shift? when the roll was moved, lifted or unwound — Why."
            ),
            "{line}"
        );
    }

    #[test]
    fn labels_read_as_words() {
        assert_eq!(indicator_title("wit_step"), "wound-in tension step");
        assert_eq!(
            indicator_label("pressure_mean", Some("middle")),
            "mean pressure (middle zone)"
        );
        assert_eq!(indicator_title("not_known"), "not known");
    }
}
