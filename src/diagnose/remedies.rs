//! Merge, deduplicate, group and order the remedies of the likely causes, then (after the
//! what-if re-solves) order the remedies of each cause by their computed effect. The what-if
//! check (re-solve with a remedy's setting change) lives in [`super::what_if`].

use std::collections::BTreeMap;

use super::indicators::Indicators;
use super::rules::{Comparison, RuleBase, Test};
use super::what_if;
use super::{MergedRemedy, RankedCause};

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

/// A change that moves the deciding indicator by less than this share of its value (and leaves
/// it past the rule threshold) is reported as predicted to do little: the inputs of a triage are
/// approximate (a few percent at best), so a smaller move is within their uncertainty.
pub const SMALL_EFFECT: f64 = 0.03;

/// Order remedies by their computed effect within each cause, and flag the ones predicted to do
/// little.
///
/// `after[i]` holds the indicators of `remedies[i]`'s changed case (re-solved, or the same
/// stress state with a new core rating), `None` for remedies that change no setting. For every
/// likely cause, the remedies answering it that have an effect on its deciding indicator (see
/// [`what_if::Before::deciding_test`]) trade places among themselves, largest move toward the good side
/// first; every other remedy keeps its place. Causes are taken from the least to the most likely
/// so the most likely cause has the last word where two causes share remedies. The sort is
/// stable: equal effects keep the order by belief and cost.
pub fn order_by_effect(
    before: &what_if::Before,
    remedies: &mut Vec<MergedRemedy>,
    after: &[Option<Indicators>],
) {
    let indicators = before.indicators;
    let mut slots: Vec<(MergedRemedy, Option<&Indicators>)> = remedies
        .drain(..)
        .zip(
            after
                .iter()
                .map(Option::as_ref)
                .chain(std::iter::repeat(None)),
        )
        .collect();
    // The likely causes with the indicator test that decides each.
    let deciding: Vec<(&RankedCause, Option<&Test>)> = before
        .causes
        .iter()
        .filter(|c| c.belief >= LIKELY_BELIEF)
        .map(|c| (c, before.deciding_test(&c.id)))
        .collect();
    for (cause, test) in deciding.iter().rev() {
        let Some(test) = test else { continue };
        let members: Vec<(usize, f64)> = slots
            .iter()
            .enumerate()
            .filter(|(_, (r, _))| r.answers.contains(&cause.id))
            .filter_map(|(i, (_, a))| Some((i, what_if::gain(test, indicators, (*a)?)?)))
            .collect();
        let mut order = members.clone();
        order.sort_by(|a, b| b.1.total_cmp(&a.1));
        let moved: Vec<_> = order.iter().map(|&(i, _)| slots[i].clone()).collect();
        for (&(slot, _), item) in members.iter().zip(moved) {
            slots[slot] = item;
        }
    }
    for (remedy, after) in &mut slots {
        if let (Some(w), Some(after)) = (remedy.what_if.as_mut(), *after)
            && let Some((gain, name)) = small_effect(&deciding, &remedy.answers, indicators, after)
            && !w.worse
        {
            w.small_effect = true;
            let note = format!(
                "predicted to do little here: {name} improves by only {:.1} %",
                100.0 * gain.max(0.0)
            );
            w.note = if w.note.is_empty() {
                note
            } else {
                format!("{note}; {}", w.note)
            };
        }
    }
    remedies.extend(slots.into_iter().map(|(r, _)| r));
}

/// The largest gain of a remedy answering `answers` and the indicator it is on, when the remedy
/// is predicted to do little: every likely cause it answers has a deciding indicator, none moves
/// by [`SMALL_EFFECT`] or more, and each stays past its rule threshold. `None` otherwise (a
/// cause that rests on answers alone cannot be judged by the re-solve).
fn small_effect<'a>(
    deciding: &[(&RankedCause, Option<&'a Test>)],
    answers: &[String],
    before: &Indicators,
    after: &Indicators,
) -> Option<(f64, &'a str)> {
    let mut best: Option<(f64, &str)> = None;
    for (_, test) in deciding.iter().filter(|(c, _)| answers.contains(&c.id)) {
        let test = (*test)?;
        let gain = what_if::gain(test, before, after)?;
        if gain >= SMALL_EFFECT || !test_holds(test, after) {
            return None;
        }
        if best.is_none_or(|(g, _)| gain > g) {
            best = Some((gain, indicator_name(test)));
        }
    }
    best
}

/// The indicator of a test, named as the what-if rows name it ("pressure_mean (middle)").
fn indicator_name(test: &Test) -> &str {
    match test {
        Test::Indicator { id, .. } => id,
        _ => "",
    }
}

/// True when an indicator test holds on `indicators`.
fn test_holds(test: &Test, indicators: &Indicators) -> bool {
    let Test::Indicator {
        id,
        zone,
        comparison,
        threshold,
        ..
    } = test
    else {
        return false;
    };
    indicators.get(id, *zone).is_some_and(|v| match comparison {
        Comparison::Above => v > *threshold,
        Comparison::Below => v < *threshold,
    })
}

/// Keep the list in the order to try but gather each group together, the groups in the order
/// their first remedy comes: the one order the CLI, the UI and reports all show, each group
/// named once. The sort is stable, so within a group the order to try stands. Remedies the
/// what-if shows making things worse stay after all the others (see [`heading`]).
pub fn group_in_order(remedies: &mut [MergedRemedy]) {
    let mut groups: Vec<String> = Vec::new();
    for r in remedies.iter() {
        if !groups.contains(&r.group) {
            groups.push(r.group.clone());
        }
    }
    remedies.sort_by_key(|r| (is_worse(r), groups.iter().position(|g| *g == r.group)));
}

fn is_worse(r: &MergedRemedy) -> bool {
    r.what_if.as_ref().is_some_and(|w| w.worse)
}

/// The heading to print before `remedies[index]`, if it starts a new group: the group's name,
/// or "Predicted to make it worse — try last" for the first of those.
pub fn heading(remedies: &[MergedRemedy], index: usize) -> Option<String> {
    let r = remedies.get(index)?;
    let title = if is_worse(r) {
        "Predicted to make it worse — try last".to_string()
    } else {
        super::group_title(&r.group)
    };
    let new = match index.checked_sub(1).and_then(|i| remedies.get(i)) {
        None => true,
        Some(prev) => (is_worse(prev) != is_worse(r)) || (!is_worse(r) && prev.group != r.group),
    };
    new.then_some(title)
}
