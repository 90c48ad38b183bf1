//! The what-if check: re-solve the roll with a remedy's setting changes and compare the
//! driving indicator before and after. The change appliers (to a resolved case, and written
//! back into a case file) live in [`apply`].

pub mod apply;
pub mod margins;

pub use apply::{
    Setting, SettingStep, WhatIfError, apply_changes, apply_step, changes_setting, describe_change,
    keep_changes, trial_case, write_into_case,
};
pub use margins::MarginShift;

use super::indicators::levers::LEVER_IDS;
use super::indicators::{EVIDENCE_IDS, INPUT_INDICATORS, Indicators, format_value, indicator_spec};
use super::rank::{evaluate, rank};
use super::rules::{Comparison, RuleBase, SettingChange, Test};
use super::words::{belief_label, indicator_label};
use super::{MergedRemedy, RankedCause, WhatIf, WhatIfWords};
use crate::case::ResolvedCase;
use crate::model::SolverOptions;

/// True for an indicator test that a re-solve can move: what was measured on the roll and the
/// core-pressure levers of the case as wound stay as they are in every what-if, so they can
/// neither show a remedy's effect nor mark it as doing little.
fn movable(test: &Test) -> bool {
    match test {
        Test::Indicator { id, .. } => {
            !EVIDENCE_IDS.contains(&id.as_str()) && !LEVER_IDS.contains(&id.as_str())
        }
        _ => false,
    }
}

/// Pick the indicator to show before/after: among the tests that drive the cause, the one the
/// change moves most (relative), preferring tests that hold now; ties go to the larger weight.
fn pick_driver<'a>(
    candidates: &[(&'a Test, bool, f64)],
    before: &Indicators,
    after: &Indicators,
) -> Option<&'a Test> {
    let change = |t: &Test| -> f64 {
        let Test::Indicator { id, zone, .. } = t else {
            return 0.0;
        };
        match (before.get(id, *zone), after.get(id, *zone)) {
            (Some(b), Some(a)) => (a - b).abs() / b.abs().max(a.abs()).max(1e-30),
            _ => 0.0,
        }
    };
    // A remedy's own setting moves its input indicator by construction: show the stress state
    // first (see `deciding_test`).
    let from_profile = |t: &Test| match t {
        Test::Indicator { id, .. } => !INPUT_INDICATORS.contains(&id.as_str()),
        _ => false,
    };
    let best = |only_holding: bool, only_profile: bool| {
        candidates
            .iter()
            .filter(|(_, holds, _)| !only_holding || *holds)
            .filter(|(t, _, _)| !only_profile || from_profile(t))
            .filter(|(t, _, _)| change(t) > 1e-3)
            .max_by(|a, b| {
                change(a.0)
                    .total_cmp(&change(b.0))
                    .then(a.2.total_cmp(&b.2))
            })
            .map(|(t, _, _)| *t)
    };
    // Tests that hold now come first, so the row shows an indicator that decides the cause and
    // not a stress-state value still short of its threshold; when none that holds moves, the
    // strongest holding one is shown unmoved (what `deciding_test` picks).
    let strongest_holding = || {
        candidates
            .iter()
            .filter(|(_, holds, _)| *holds)
            .max_by(|a, b| {
                from_profile(a.0)
                    .cmp(&from_profile(b.0))
                    .then(a.2.total_cmp(&b.2))
            })
            .map(|(t, _, _)| *t)
    };
    best(true, true)
        .or_else(|| best(true, false))
        .or_else(strongest_holding)
        .or_else(|| best(false, true))
        .or_else(|| best(false, false))
        .or_else(|| {
            // Nothing moves: show the strongest holding test (or the strongest at all).
            candidates
                .iter()
                .max_by(|a, b| a.1.cmp(&b.1).then(a.2.total_cmp(&b.2)))
                .map(|(t, _, _)| *t)
        })
}

/// How far a change moves the indicator of `test` toward its good side, as a share of its value
/// before (positive = better: lower for an "above" test, higher for a "below" test). `None` when
/// the indicator is missing before or after.
pub(crate) fn gain(test: &Test, before: &Indicators, after: &Indicators) -> Option<f64> {
    let Test::Indicator {
        id,
        zone,
        comparison,
        ..
    } = test
    else {
        return None;
    };
    let (b, a) = (before.get(id, *zone)?, after.get(id, *zone)?);
    let scale = b.abs().max(1e-30);
    Some(match comparison {
        Comparison::Above => (b - a) / scale,
        Comparison::Below => (a - b) / scale,
    })
}

/// The case as it stands, which every what-if compares against.
#[derive(Debug, Clone, Copy)]
pub struct Before<'a> {
    pub rules: &'a RuleBase,
    /// The observed symptom IDs.
    pub symptoms: &'a [String],
    pub case: &'a ResolvedCase,
    pub indicators: &'a Indicators,
    pub causes: &'a [RankedCause],
}

impl<'a> Before<'a> {
    /// The indicator tests that raise belief in `cause` under the observed symptoms, each with
    /// whether it holds now and its weight.
    pub(crate) fn driving_tests(&self, cause: &str) -> Vec<(&'a Test, bool, f64)> {
        let mut out = Vec::new();
        for symptom in self.symptoms.iter().filter_map(|s| self.rules.symptom(s)) {
            for rule in symptom.rules.iter().filter(|r| r.cause == cause) {
                for ev in &rule.evidence {
                    if ev.weight <= 0.0 || !movable(&ev.test) {
                        continue;
                    }
                    // An indicator without a value (a measurement not taken) has nothing to show.
                    let Some((holds, _, _)) =
                        evaluate(&ev.test, &symptom.id, self.case, self.indicators)
                    else {
                        continue;
                    };
                    out.push((&ev.test, holds, ev.weight));
                }
            }
        }
        out
    }

    /// The indicator test that decides `cause` in this case: of the indicator tests that raise
    /// it and hold now, the strongest on the solved stress state, else the strongest on the
    /// case's inputs (a setting a remedy changes moves its own input indicator by construction,
    /// so the stress state judges first); ties go to the first in the rule base. `None` when no
    /// indicator test holds: the cause then rests on answers or priors, which no setting change
    /// moves.
    pub(crate) fn deciding_test(&self, cause: &str) -> Option<&'a Test> {
        let from_profile = |t: &Test| match t {
            Test::Indicator { id, .. } => !INPUT_INDICATORS.contains(&id.as_str()),
            _ => false,
        };
        let mut best: Option<(&Test, (bool, f64))> = None;
        for (test, holds, weight) in self.driving_tests(cause) {
            let key = (from_profile(test), weight);
            // Stress-state tests before input tests, then the larger weight.
            if holds
                && best
                    .is_none_or(|(_, k)| (key.0, key.1).partial_cmp(&k).is_some_and(|o| o.is_gt()))
            {
                best = Some((test, key));
            }
        }
        best.map(|(t, _)| t)
    }
}

/// Re-solve the case with the remedy's setting changes and report the driving indicator
/// before and after. `None` for remedies that change no setting.
pub fn what_if(before: &Before, remedy: &MergedRemedy, solver: SolverOptions) -> Option<WhatIf> {
    let changes = &before.rules.remedies.get(&remedy.id)?.changes;
    if changes.is_empty() {
        return None;
    }
    let changed = apply_changes(before.case, changes);
    if !needs_solve(changes) {
        // Only the rating changes: the stress state is the same, no re-solve needed.
        return Some(rating_only(before, &changed, remedy));
    }
    let solved = crate::model::solve(&changed.problem(solver));
    what_if_solved(before, remedy, &changed, solved.as_ref())
}

/// True when the changes alter the stress state (anything but the crush rating).
pub fn needs_solve(changes: &[SettingChange]) -> bool {
    changes
        .iter()
        .any(|c| !matches!(c, SettingChange::CoreCrushScale(_)))
}

/// The what-if of a remedy whose changed case `changed` is already solved.
pub fn what_if_solved(
    before: &Before,
    remedy: &MergedRemedy,
    changed: &ResolvedCase,
    solved: Result<&crate::model::Profile, &crate::model::ModelError>,
) -> Option<WhatIf> {
    let after = solved.map(|p| Indicators::compute_after_change(changed, p, before.indicators));
    what_if_after(before, remedy, changed, after.as_ref().map_err(|e| *e))
}

/// The what-if of a remedy whose changed case `changed` is solved and its indicators computed
/// (`after`), or whose solve failed.
pub fn what_if_after(
    before: &Before,
    remedy: &MergedRemedy,
    changed: &ResolvedCase,
    after: Result<&Indicators, &crate::model::ModelError>,
) -> Option<WhatIf> {
    let (rules, case, indicators) = (before.rules, before.case, before.indicators);
    // A what-if with no indicator to compare, only a note why.
    let note_only = |note: String| WhatIf {
        indicator: String::new(),
        before: String::new(),
        after: String::new(),
        worse: false,
        small_effect: false,
        margins: Vec::new(),
        words: WhatIfWords {
            indicator: String::new(),
            note: note.clone(),
        },
        note,
    };
    if changed == case {
        return Some(note_only(
            "the setting change does not apply to this case (nothing to change)".into(),
        ));
    }
    let after_indicators = match after {
        Ok(a) => a,
        Err(e) => {
            return Some(note_only(format!(
                "could not re-solve with the change: {e}"
            )));
        }
    };
    let after_causes = rank(rules, before.symptoms, changed, after_indicators);
    let belief = |list: &[RankedCause], id: &str| {
        list.iter()
            .find(|c| c.id == id)
            .map(|c| c.belief)
            .unwrap_or(0.0)
    };
    let primary = remedy.answers.first()?;
    let before_belief = before
        .causes
        .iter()
        .find(|c| c.id == *primary)
        .map(|c| c.belief)
        .unwrap_or(0.0);
    let after_belief = belief(&after_causes, primary);
    let title = |id: &str| {
        rules
            .causes
            .get(id)
            .map_or_else(|| id.replace('_', " "), |c| c.title.clone())
    };
    let mut notes = Notes::default();
    notes.push(
        format!("belief in {primary} {before_belief:.2} → {after_belief:.2}"),
        format!(
            "{} {before_belief:.2} → {after_belief:.2}",
            belief_label(&title(primary))
        ),
    );
    let mut worse = after_belief > before_belief + 0.02;
    // Side effects: other listed causes that the change makes more likely.
    for other in before.causes.iter().filter(|c| c.id != *primary) {
        let after = belief(&after_causes, &other.id);
        if after > other.belief + 0.05 {
            notes.push(
                format!("raises {} {:.2} → {after:.2}", other.id, other.belief),
                format!(
                    "raises {} {:.2} → {after:.2}",
                    belief_label(&title(&other.id)),
                    other.belief
                ),
            );
        }
    }
    let candidates = before.driving_tests(primary);
    let driver = pick_driver(&candidates, indicators, after_indicators).and_then(|test| {
        compare_driver(test, indicators, after_indicators, &mut notes, &mut worse)
    });
    let (indicator, indicator_words, before_text, after_text) = driver.unwrap_or_else(|| {
        (
            format!("belief in {primary}"),
            belief_label(&title(primary)),
            format!("{before_belief:.2}"),
            format!("{after_belief:.2}"),
        )
    });
    Some(WhatIf {
        indicator,
        before: before_text,
        after: after_text,
        worse,
        small_effect: false,
        margins: Vec::new(),
        note: notes.ids.join("; "),
        words: WhatIfWords {
            indicator: indicator_words,
            note: notes.words.join("; "),
        },
    })
}

/// The notes of a what-if twice over: with IDs (JSON, `--verbose`) and in words.
#[derive(Default)]
struct Notes {
    ids: Vec<String>,
    words: Vec<String>,
}

impl Notes {
    fn push(&mut self, ids: String, words: String) {
        self.ids.push(ids);
        self.words.push(words);
    }

    fn push_same(&mut self, text: String) {
        self.words.push(text.clone());
        self.ids.push(text);
    }
}

/// The before/after texts of the driving indicator `test`; adds notes on its direction and
/// threshold, and sets `worse` when the change moves it the wrong way.
fn compare_driver(
    test: &Test,
    indicators: &Indicators,
    after_indicators: &Indicators,
    notes: &mut Notes,
    worse: &mut bool,
) -> Option<(String, String, String, String)> {
    let Test::Indicator {
        id,
        zone,
        comparison,
        threshold,
        dimension,
    } = test
    else {
        return None;
    };
    let before = indicators.get(id, *zone);
    let after = after_indicators.get(id, *zone);
    if let (Some(b), Some(a)) = (before, after) {
        let tolerance = 1e-3 * b.abs().max(a.abs()).max(1e-12);
        let moved_wrong = match comparison {
            Comparison::Above => a > b + tolerance,
            Comparison::Below => a < b - tolerance,
        };
        if moved_wrong {
            *worse = true;
            notes.push(
                format!("{id} moves the wrong way"),
                format!(
                    "{} moves the wrong way",
                    indicator_label(id, zone.map(|z| z.as_str()))
                ),
            );
        }
        let still = match comparison {
            Comparison::Above => a > *threshold,
            Comparison::Below => a < *threshold,
        };
        if still && !moved_wrong {
            notes.push_same("a first step: still past the rule threshold".into());
        }
        let sign = match comparison {
            Comparison::Above => "above",
            Comparison::Below => "below",
        };
        notes.push_same(format!(
            "rule threshold: {sign} {}",
            format_value(*threshold, *dimension)
        ));
    }
    let name = match zone {
        Some(z) => format!("{id} ({})", z.as_str()),
        None => id.clone(),
    };
    Some((
        name,
        indicator_label(id, zone.map(|z| z.as_str())),
        before
            .map(|v| format_value(v, *dimension))
            .unwrap_or_default(),
        after
            .map(|v| format_value(v, *dimension))
            .unwrap_or_default(),
    ))
}

/// What-if for a change of the core's rating alone: the core pressure ratio moves, the stress
/// state does not.
fn rating_only(before: &Before, changed: &ResolvedCase, remedy: &MergedRemedy) -> WhatIf {
    let (case, indicators) = (before.case, before.indicators);
    let dimension = indicator_spec("core_pressure_ratio")
        .map(|s| s.dimension)
        .unwrap_or(super::indicators::Dimension::Ratio);
    let before = indicators.get("core_pressure_ratio", None);
    let pressure = indicators.get("core_pressure", None);
    let after = match (pressure, changed.core.crush_pressure > 0.0) {
        (Some(p), true) => Some(p / changed.core.crush_pressure),
        _ => None,
    };
    let rating = |v: f64| format_value(v, super::indicators::Dimension::Pressure);
    let note_words = format!(
        "rated crush pressure {} → {}",
        rating(case.core.crush_pressure),
        rating(changed.core.crush_pressure)
    );
    WhatIf {
        words: WhatIfWords {
            indicator: indicator_label("core_pressure_ratio", None),
            note: note_words,
        },
        indicator: "core_pressure_ratio".into(),
        before: before
            .map(|v| format_value(v, dimension))
            .unwrap_or_default(),
        after: after
            .map(|v| format_value(v, dimension))
            .unwrap_or_default(),
        worse: false,
        small_effect: false,
        margins: Vec::new(),
        note: format!(
            "rated crush pressure {} → {} for remedy {}",
            format_value(
                case.core.crush_pressure,
                super::indicators::Dimension::Pressure
            ),
            format_value(
                changed.core.crush_pressure,
                super::indicators::Dimension::Pressure
            ),
            remedy.id
        ),
    }
}
