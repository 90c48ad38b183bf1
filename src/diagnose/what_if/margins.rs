//! The failure margins a what-if shows: which mechanisms of the margins table
//! ([`crate::mechanics::table`]) bear on each cause, in one table, and the before → after of
//! those a remedy's change moves. The rows come from the same `margin_table` the reports, the
//! terminal UI's margins popup and the diagnosis indicators read; nothing here computes a margin.

use serde::{Deserialize, Serialize};

use crate::case::ResolvedCase;
use crate::mechanics::MechanicsInputs;
use crate::mechanics::table::{MarginRow, MarginTable, Mechanism, Verdict, margin_table};
use crate::mechanics::torque::Event;
use crate::model::Profile;
use crate::units::round_sig;

const EVERY_SLIP: [Mechanism; 4] = [
    Mechanism::Slip(Event::StartUp),
    Mechanism::Slip(Event::NormalStop),
    Mechanism::Slip(Event::EmergencyStop),
    Mechanism::Slip(Event::Unwind),
];
const SPEED_CHANGE_SLIP: [Mechanism; 3] = [
    Mechanism::Slip(Event::StartUp),
    Mechanism::Slip(Event::NormalStop),
    Mechanism::Slip(Event::EmergencyStop),
];

/// Causes (rule-base IDs) and the failure mechanisms whose margins tell whether a remedy for
/// the cause works: the failure the cause produces through the stress state (docs/theory.md §5).
/// A cause not listed (a web property, slitting, alignment, …) has no margin a setting moves.
const RELEVANT: &[(&str, &[Mechanism])] = &[
    // Too much pressure from tension or nip: wraps buckle inside, the core is overloaded.
    (
        "tension_too_high",
        &[Mechanism::Starring, Mechanism::CoreCrush],
    ),
    (
        "nip_load_too_high",
        &[Mechanism::Starring, Mechanism::CoreCrush],
    ),
    (
        "taper_missing",
        &[Mechanism::Starring, Mechanism::CoreCrush],
    ),
    (
        "build_ratio_too_large",
        &[Mechanism::Starring, Mechanism::CoreCrush],
    ),
    ("tension_upset", &[Mechanism::Starring]),
    ("core_too_weak", &[Mechanism::CoreCrush]),
    // Too little pressure: friction cannot hold the layers axially or round.
    ("tension_too_low", &[Mechanism::Telescoping]),
    ("taper_excessive", &[Mechanism::Telescoping]),
    ("nip_load_too_low", &[Mechanism::Telescoping]),
    ("air_entrainment", &[Mechanism::Telescoping]),
    ("low_web_friction", &[Mechanism::Telescoping]),
    ("handling_damage", &[Mechanism::Telescoping]),
    // A soft core or a slack start: inner wraps lose hoop support (starring) and grip (slip).
    (
        "core_too_soft",
        &[Mechanism::Starring, Mechanism::Slip(Event::StartUp)],
    ),
    (
        "loose_start",
        &[Mechanism::Starring, Mechanism::Slip(Event::StartUp)],
    ),
    // Torque that the interfaces must pass.
    ("acceleration_torque", &SPEED_CHANGE_SLIP),
    ("unwind_torque", &[Mechanism::Slip(Event::Unwind)]),
    (
        "cinching_then_telescoping",
        &[
            Mechanism::Slip(Event::StartUp),
            Mechanism::Slip(Event::NormalStop),
            Mechanism::Slip(Event::EmergencyStop),
            Mechanism::Slip(Event::Unwind),
            Mechanism::Telescoping,
        ],
    ),
    ("shaft_grip_low", &[Mechanism::ShaftGrip]),
];

/// The mechanisms relevant to any of `causes`, in the order of the margins table.
pub fn relevant_mechanisms(causes: &[String]) -> Vec<Mechanism> {
    let wanted: Vec<Mechanism> = causes
        .iter()
        .filter_map(|c| RELEVANT.iter().find(|(id, _)| id == c))
        .flat_map(|(_, mechanisms)| mechanisms.iter().copied())
        .collect();
    let order = [Mechanism::Telescoping]
        .into_iter()
        .chain(EVERY_SLIP)
        .chain([
            Mechanism::ShaftGrip,
            Mechanism::Starring,
            Mechanism::CoreCrush,
        ]);
    order.filter(|m| wanted.contains(m)).collect()
}

/// The cause IDs of the relevance table (the rule-base check reads them).
pub fn causes_with_margins() -> impl Iterator<Item = &'static str> {
    RELEVANT.iter().map(|(id, _)| *id)
}

/// One margin before and after a change.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MarginShift {
    /// The mechanism's stable ID (`telescoping`, `slip_start_up`, `starring`, `core_crush`, …).
    pub mechanism: String,
    /// Smallest capacity / demand before and after (capped at 1000).
    pub before: f64,
    pub after: f64,
    /// `fails`, `close`, `holds` or `no_demand`, after the change.
    pub verdict: String,
    /// "starring margin 0.80 → 1.30" for people; empty on a shift read back from JSON.
    #[serde(skip)]
    pub words: String,
}

/// The margins table of a case solved into `profile`.
pub fn table_of(case: &ResolvedCase, profile: &Profile) -> MarginTable {
    margin_table(
        profile,
        &MechanicsInputs::from_case(case),
        case.core.crush_pressure,
    )
}

/// A margin of this or more before and after is left out of a what-if: the roll carries twice
/// the demand there either way, so its move does not tell whether the remedy answers the cause
/// (a reading choice, not a criterion; the verdicts stay those of the margins table).
pub const SHOWN_BELOW: f64 = 2.0;

/// The diagnosis indicator that is the very margin of a mechanism (the what-if row may show it
/// already).
fn indicator_of(mechanism: Mechanism) -> Option<&'static str> {
    match mechanism {
        Mechanism::Telescoping => Some("telescoping_margin"),
        Mechanism::Starring => Some("starring_margin"),
        _ => None,
    }
}

/// The relevant margins of `causes` that the change moves, from `before` to `after`: left out
/// are a margin whose text stays the same, one of [`SHOWN_BELOW`] or more on both sides, and
/// the one the what-if row already shows as its `indicator` (an indicator ID).
pub fn shifts(
    causes: &[String],
    indicator: &str,
    before: &MarginTable,
    after: &MarginTable,
) -> Vec<MarginShift> {
    let shown = indicator.split(' ').next().unwrap_or_default();
    relevant_mechanisms(causes)
        .into_iter()
        .filter(|m| indicator_of(*m) != Some(shown))
        .filter_map(|m| Some((before.row(m)?, after.row(m)?)))
        .filter(|(b, a)| b.margin_text() != a.margin_text())
        .filter(|(b, a)| b.margin.min(a.margin) < SHOWN_BELOW)
        .map(|(b, a)| shift(b, a))
        .collect()
}

fn shift(before: &MarginRow, after: &MarginRow) -> MarginShift {
    let mut words = format!(
        "{} {} → {}",
        before.mechanism.margin_name(),
        before.margin_text(),
        after.margin_text()
    );
    if let Some(change) = Verdict::change_word(before.verdict(), after.verdict()) {
        words = format!("{words}, {change}");
    }
    MarginShift {
        mechanism: before.mechanism.id(),
        before: round_sig(before.margin, 4),
        after: round_sig(after.margin, 4),
        verdict: after.verdict().id().to_string(),
        words,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn relevant_mechanisms_follow_the_table_order_without_repeats() {
        let causes = vec!["cinching_then_telescoping".into(), "tension_too_low".into()];
        let got = relevant_mechanisms(&causes);
        assert_eq!(got.first(), Some(&Mechanism::Telescoping));
        assert_eq!(got.len(), 5);
        assert!(relevant_mechanisms(&["web_misalignment".into()]).is_empty());
    }
}
