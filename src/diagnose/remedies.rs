//! Merge, deduplicate, group and order the remedies of the likely causes; the what-if check
//! that re-solves the roll with a remedy's setting change applied.

use std::collections::BTreeMap;

use super::indicators::{Indicators, format_value, indicator_spec};
use super::rank::{evaluate, rank};
use super::rules::{Comparison, RuleBase, SettingChange, Test};
use super::{MergedRemedy, RankedCause, WhatIf};
use crate::case::ResolvedCase;
use crate::model::{SolverOptions, Taper, UpsetBand};

/// A cause counts as likely (its remedies are listed) from this belief up.
pub const LIKELY_BELIEF: f64 = 0.15;

/// Merge the remedies of the likely causes among `causes` (already ranked and cut to size).
/// Only rules of the observed `symptoms` and the cause catalogue contribute remedies.
pub fn merge(rules: &RuleBase, symptoms: &[String], causes: &[RankedCause]) -> Vec<MergedRemedy> {
    // remedy → (causes answered in rank order, belief sum)
    let mut merged: BTreeMap<&str, (Vec<String>, f64)> = BTreeMap::new();
    for cause in causes.iter().filter(|c| c.belief >= LIKELY_BELIEF) {
        let from_rules = symptoms
            .iter()
            .filter_map(|s| rules.symptom(s))
            .flat_map(|s| s.rules.iter())
            .filter(|r| r.cause == cause.id)
            .flat_map(|r| r.remedies.iter());
        let from_catalogue = rules
            .causes
            .get(&cause.id)
            .into_iter()
            .flat_map(|c| c.remedies.iter());
        for remedy in from_rules.chain(from_catalogue) {
            let entry = merged.entry(remedy.as_str()).or_default();
            if !entry.0.contains(&cause.id) {
                entry.0.push(cause.id.clone());
                entry.1 += cause.belief;
            }
        }
    }
    let mut out: Vec<(MergedRemedy, f64, super::rules::Cost)> = merged
        .into_iter()
        .filter_map(|(id, (answers, belief_sum))| {
            let remedy = rules.remedies.get(id)?;
            Some((
                MergedRemedy {
                    id: id.to_string(),
                    text: remedy.text.clone(),
                    group: remedy.group.clone(),
                    cost: remedy.cost.as_str().to_string(),
                    answers,
                    cautions: remedy.cautions.clone(),
                    what_if: None,
                },
                belief_sum,
                remedy.cost,
            ))
        })
        .collect();
    // Most likely causes answered first: the belief answered counts each likely cause weighted
    // by how likely it is, so two weak causes never push the leading cause's remedy down. Then
    // cheapest to try, then the number of causes answered. Beliefs within 0.05 count as equal so
    // cost decides between remedies for the same causes.
    out.sort_by(|a, b| {
        let bucket = |belief: f64| (belief / 0.05).round() as i64;
        bucket(b.1)
            .cmp(&bucket(a.1))
            .then(a.2.cmp(&b.2))
            .then(b.0.answers.len().cmp(&a.0.answers.len()))
            .then(b.1.total_cmp(&a.1))
            .then_with(|| a.0.id.cmp(&b.0.id))
    });
    out.into_iter().map(|(m, _, _)| m).collect()
}

/// True when the remedy carries a machine-readable setting change.
pub fn changes_setting(rules: &RuleBase, remedy: &str) -> bool {
    rules
        .remedies
        .get(remedy)
        .is_some_and(|r| !r.changes.is_empty())
}

/// Apply setting changes to a copy of the case.
pub fn apply_changes(case: &ResolvedCase, changes: &[SettingChange]) -> ResolvedCase {
    let mut out = case.clone();
    let core_r = case.core.outside_diameter / 2.0;
    let outer_r = case.roll.outer_diameter / 2.0;
    for change in changes {
        let schedule = &mut out.winding.tension;
        match *change {
            SettingChange::TensionScale(f) => {
                schedule.start_tension *= f;
                if let Taper::Steps { steps } = &mut schedule.taper {
                    for s in steps.iter_mut() {
                        s.tension *= f;
                    }
                }
                for u in schedule.upsets.iter_mut() {
                    u.tension *= f;
                }
            }
            SettingChange::TaperBy(d) => set_taper(schedule, None, d),
            SettingChange::TaperTo(t) => set_taper(schedule, Some(t), 0.0),
            SettingChange::NipScale(f) => {
                out.winding.nip_load = out.winding.nip_load.map(|n| n * f);
            }
            SettingChange::SpeedScale(f) => out.winding.speed *= f,
            SettingChange::CoreStiffnessScale(f) => {
                out.core.stiffness = out.core.stiffness.scaled(f);
            }
            SettingChange::CoreCrushScale(f) => out.core.crush_pressure *= f,
            SettingChange::ClearUpsets => schedule.upsets.clear(),
            SettingChange::CoreZoneTensionScale(f) => {
                let band = UpsetBand {
                    from_radius: core_r,
                    to_radius: core_r + 0.1 * (outer_r - core_r),
                    tension: schedule.start_tension * f,
                };
                schedule.upsets.push(band);
            }
        }
    }
    out
}

/// Set the taper to `to` percent, or move it by `by` percent points, whatever its form.
fn set_taper(schedule: &mut crate::model::TensionSchedule, to: Option<f64>, by: f64) {
    let t0 = schedule.start_tension;
    let current = match &schedule.taper {
        Taper::None => 0.0,
        Taper::Linear { fraction } | Taper::Hyperbolic { fraction } => fraction * 100.0,
        Taper::Steps { steps } => steps
            .last()
            .filter(|_| t0 > 0.0)
            .map(|s| (t0 - s.tension) / t0 * 100.0)
            .unwrap_or(0.0),
    };
    let target = to.unwrap_or(current + by).clamp(0.0, 90.0);
    schedule.taper = match std::mem::take(&mut schedule.taper) {
        Taper::None | Taper::Linear { .. } => {
            if target > 0.0 {
                Taper::Linear {
                    fraction: target / 100.0,
                }
            } else {
                Taper::None
            }
        }
        Taper::Hyperbolic { .. } => Taper::Hyperbolic {
            fraction: target / 100.0,
        },
        Taper::Steps { mut steps } => {
            if current > 0.0 {
                let scale = target / current;
                for s in steps.iter_mut() {
                    s.tension = t0 - (t0 - s.tension) * scale;
                }
                Taper::Steps { steps }
            } else {
                Taper::Linear {
                    fraction: target / 100.0,
                }
            }
        }
    };
}

/// The indicator tests that raise belief in `cause` under the observed symptoms, each with
/// whether it holds now and its weight.
fn driving_tests<'a>(
    rules: &'a RuleBase,
    symptoms: &[String],
    cause: &str,
    case: &ResolvedCase,
    indicators: &Indicators,
) -> Vec<(&'a Test, bool, f64)> {
    let mut out = Vec::new();
    for symptom in symptoms.iter().filter_map(|s| rules.symptom(s)) {
        for rule in symptom.rules.iter().filter(|r| r.cause == cause) {
            for ev in &rule.evidence {
                if ev.weight <= 0.0 || !matches!(ev.test, Test::Indicator { .. }) {
                    continue;
                }
                let holds =
                    evaluate(&ev.test, &symptom.id, case, indicators).is_some_and(|(h, _, _)| h);
                out.push((&ev.test, holds, ev.weight));
            }
        }
    }
    out
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
    let best = |only_holding: bool| {
        candidates
            .iter()
            .filter(|(_, holds, _)| !only_holding || *holds)
            .filter(|(t, _, _)| change(t) > 1e-3)
            .max_by(|a, b| {
                change(a.0)
                    .total_cmp(&change(b.0))
                    .then(a.2.total_cmp(&b.2))
            })
            .map(|(t, _, _)| *t)
    };
    best(true).or_else(|| best(false)).or_else(|| {
        // Nothing moves: show the strongest holding test (or the strongest at all).
        candidates
            .iter()
            .max_by(|a, b| a.1.cmp(&b.1).then(a.2.total_cmp(&b.2)))
            .map(|(t, _, _)| *t)
    })
}

/// Re-solve the case with the remedy's setting changes and report the driving indicator
/// before and after. `None` for remedies that change no setting.
#[allow(clippy::too_many_arguments)]
pub fn what_if(
    rules: &RuleBase,
    symptoms: &[String],
    case: &ResolvedCase,
    indicators: &Indicators,
    causes: &[RankedCause],
    remedy: &MergedRemedy,
    solver: SolverOptions,
) -> Option<WhatIf> {
    let changes = &rules.remedies.get(&remedy.id)?.changes;
    if changes.is_empty() {
        return None;
    }
    let changed = apply_changes(case, changes);
    if !needs_solve(changes) {
        // Only the rating changes: the stress state is the same, no re-solve needed.
        return Some(rating_only(case, &changed, indicators, remedy, causes));
    }
    let solved = crate::model::solve(&changed.problem(solver));
    what_if_solved(
        rules, symptoms, case, indicators, causes, remedy, &changed, solved,
    )
}

/// True when the changes alter the stress state (anything but the crush rating).
pub fn needs_solve(changes: &[SettingChange]) -> bool {
    changes
        .iter()
        .any(|c| !matches!(c, SettingChange::CoreCrushScale(_)))
}

/// The what-if of a remedy whose changed case `changed` is already solved.
#[allow(clippy::too_many_arguments)]
pub fn what_if_solved(
    rules: &RuleBase,
    symptoms: &[String],
    case: &ResolvedCase,
    indicators: &Indicators,
    causes: &[RankedCause],
    remedy: &MergedRemedy,
    changed: &ResolvedCase,
    solved: Result<crate::model::Profile, crate::model::ModelError>,
) -> Option<WhatIf> {
    // A what-if with no indicator to compare, only a note why.
    let note_only = |note: String| WhatIf {
        indicator: String::new(),
        before: String::new(),
        after: String::new(),
        worse: false,
        note,
    };
    if changed == case {
        return Some(note_only(
            "the setting change does not apply to this case (nothing to change)".into(),
        ));
    }
    let profile = match solved {
        Ok(p) => p,
        Err(e) => {
            return Some(note_only(format!(
                "could not re-solve with the change: {e}"
            )));
        }
    };
    let after_indicators = Indicators::compute(changed, &profile);
    let after_causes = rank(rules, symptoms, changed, &after_indicators);
    let belief = |list: &[RankedCause], id: &str| {
        list.iter()
            .find(|c| c.id == id)
            .map(|c| c.belief)
            .unwrap_or(0.0)
    };
    let primary = remedy.answers.first()?;
    let before_belief = causes
        .iter()
        .find(|c| c.id == *primary)
        .map(|c| c.belief)
        .unwrap_or(0.0);
    let after_belief = belief(&after_causes, primary);
    let mut notes = vec![format!(
        "belief in {primary} {before_belief:.2} → {after_belief:.2}"
    )];
    let mut worse = after_belief > before_belief + 0.02;
    // Side effects: other listed causes that the change makes more likely.
    for other in causes.iter().filter(|c| c.id != *primary) {
        let after = belief(&after_causes, &other.id);
        if after > other.belief + 0.05 {
            notes.push(format!(
                "raises {} {:.2} → {after:.2}",
                other.id, other.belief
            ));
        }
    }
    let candidates = driving_tests(rules, symptoms, primary, case, indicators);
    let (indicator, before_text, after_text) =
        match pick_driver(&candidates, indicators, &after_indicators) {
            Some(Test::Indicator {
                id,
                zone,
                comparison,
                threshold,
                dimension,
            }) => {
                let before = indicators.get(id, *zone);
                let after = after_indicators.get(id, *zone);
                if let (Some(b), Some(a)) = (before, after) {
                    let tolerance = 1e-3 * b.abs().max(a.abs()).max(1e-12);
                    let moved_wrong = match comparison {
                        Comparison::Above => a > b + tolerance,
                        Comparison::Below => a < b - tolerance,
                    };
                    if moved_wrong {
                        worse = true;
                        notes.push(format!("{id} moves the wrong way"));
                    }
                    let still = match comparison {
                        Comparison::Above => a > *threshold,
                        Comparison::Below => a < *threshold,
                    };
                    if still && !moved_wrong {
                        notes.push("a first step: still past the rule threshold".into());
                    }
                    let sign = match comparison {
                        Comparison::Above => "above",
                        Comparison::Below => "below",
                    };
                    notes.push(format!(
                        "rule threshold: {sign} {}",
                        format_value(*threshold, *dimension)
                    ));
                }
                let name = match zone {
                    Some(z) => format!("{id} ({})", z.as_str()),
                    None => id.clone(),
                };
                (
                    name,
                    before
                        .map(|v| format_value(v, *dimension))
                        .unwrap_or_default(),
                    after
                        .map(|v| format_value(v, *dimension))
                        .unwrap_or_default(),
                )
            }
            _ => (
                format!("belief in {primary}"),
                format!("{before_belief:.2}"),
                format!("{after_belief:.2}"),
            ),
        };
    Some(WhatIf {
        indicator,
        before: before_text,
        after: after_text,
        worse,
        note: notes.join("; "),
    })
}

/// What-if for a change of the core's rating alone: the core pressure ratio moves, the stress
/// state does not.
fn rating_only(
    case: &ResolvedCase,
    changed: &ResolvedCase,
    indicators: &Indicators,
    remedy: &MergedRemedy,
    _causes: &[RankedCause],
) -> WhatIf {
    let dimension = indicator_spec("core_pressure_ratio")
        .map(|s| s.dimension)
        .unwrap_or(super::indicators::Dimension::Ratio);
    let before = indicators.get("core_pressure_ratio", None);
    let pressure = indicators.get("core_pressure", None);
    let after = match (pressure, changed.core.crush_pressure > 0.0) {
        (Some(p), true) => Some(p / changed.core.crush_pressure),
        _ => None,
    };
    WhatIf {
        indicator: "core_pressure_ratio".into(),
        before: before
            .map(|v| format_value(v, dimension))
            .unwrap_or_default(),
        after: after
            .map(|v| format_value(v, dimension))
            .unwrap_or_default(),
        worse: false,
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
