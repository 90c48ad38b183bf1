//! Merge, deduplicate, group and order the remedies of the likely causes. The what-if check
//! (re-solve with a remedy's setting change) lives in [`super::what_if`].

use std::collections::BTreeMap;

use super::rules::RuleBase;
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
