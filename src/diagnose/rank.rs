//! Evidence combination and ranking; every score decomposes into its reasons.
//!
//! Method: certainty factors (Shortliffe & Buchanan, Math. Biosci. 23:351–379, 1975), combined
//! order-independently:
//! * within one symptom rule, the prior and every piece of evidence that holds are certainty
//!   factors in −1..1. All positive ones are combined with `a + b·(1 − a)`, all negative ones with
//!   `a + b·(1 + a)`, and the two results with `(p + n) / (1 − min(|p|, |n|))`;
//! * across symptoms the per-symptom beliefs in the same cause are combined the same way, so
//!   several symptoms reinforce a cause they share.
//!
//! Grouping by sign first makes the result independent of the order of rules and evidence
//! (the plain pairwise formula is not associative for mixed signs). Every function is monotone
//! non-decreasing in each certainty factor, which the monotonicity tests rely on.

use std::collections::BTreeMap;

use super::indicators::{Indicators, format_value};
use super::rules::{Comparison, RuleBase, Scope, Test};
use super::{RankedCause, Reason};
use crate::case::ResolvedCase;
use crate::model::ZoneName;

/// Combine certainty factors order-independently (see module docs).
pub fn combine(factors: &[f64]) -> f64 {
    let positive = factors
        .iter()
        .filter(|f| **f > 0.0)
        .fold(0.0, |a, b| a + b * (1.0 - a));
    let negative = factors
        .iter()
        .filter(|f| **f < 0.0)
        .fold(0.0, |a, b| a + b * (1.0 + a));
    let smaller = positive.abs().min(negative.abs());
    if smaller >= 1.0 {
        // Certain for and certain against: undefined in the algebra; treat as no belief.
        return 0.0;
    }
    (positive + negative) / (1.0 - smaller)
}

/// One symptom's belief in a cause from all the factors that hold (`all`) and those of them
/// about the cause itself (`about_cause`: the prior and the evidence of scope `cause`).
/// Evidence scoped to the symptom may take the symptom's support away, down to no belief, but
/// not below what the evidence about the cause says (see `rules::Scope`). Monotone
/// non-decreasing in every factor: the maximum and minimum of monotone functions are monotone.
pub fn symptom_belief(all: &[f64], about_cause: &[f64]) -> f64 {
    combine(all).max(combine(about_cause).min(0.0))
}

/// Does `test` hold for this case? `None` when it cannot be decided (indicator not computed,
/// question unanswered or answered `unknown`): neutral evidence.
pub fn evaluate(
    test: &Test,
    symptom: &str,
    case: &ResolvedCase,
    indicators: &Indicators,
) -> Option<(bool, Option<String>, Option<String>)> {
    match test {
        Test::Indicator {
            id,
            zone,
            comparison,
            threshold,
            dimension,
        } => {
            let value = indicators.get(id, *zone)?;
            let holds = match comparison {
                Comparison::Above => value > *threshold,
                Comparison::Below => value < *threshold,
            };
            let sign = match comparison {
                Comparison::Above => ">",
                Comparison::Below => "<",
            };
            // Measured evidence quotes the measurement and the computed value side by side.
            let shown = match indicators.detail(id) {
                Some(detail) => format!("{} ({detail})", format_value(value, *dimension)),
                None => format_value(value, *dimension),
            };
            Some((
                holds,
                Some(shown),
                Some(format!("{sign} {}", format_value(*threshold, *dimension))),
            ))
        }
        Test::Answer { question, values } => {
            let answer = case.answers.get(question)?;
            if answer == "unknown" {
                return None;
            }
            Some((
                values.iter().any(|v| v == answer),
                Some(answer.clone()),
                Some(format!("= {}", values.join(" or "))),
            ))
        }
        Test::Material(values) => Some((
            values.contains(&case.web.material),
            Some(case.web.material.id().to_string()),
            Some(format!("= {}", ids(values))),
        )),
        Test::Method(values) => {
            // A rule may name the winder type or its family: a gap winder is centre-driven,
            // two drums are a surface winder.
            let method = case.winding.method;
            Some((
                values
                    .iter()
                    .any(|v| v == method.id() || v == method.family()),
                Some(method.id().to_string()),
                Some(format!("= {}", values.join(" or "))),
            ))
        }
        Test::Place(values) => {
            let place = case
                .symptoms
                .iter()
                .find(|s| s.id == symptom)
                .and_then(|s| s.where_seen())?;
            Some((
                values.contains(&place),
                Some(place.id().to_string()),
                Some(format!("= {}", ids(values))),
            ))
        }
    }
}

/// The IDs of closed-list words, joined as the rule text would say them.
fn ids<T: std::fmt::Display>(values: &[T]) -> String {
    let words: Vec<String> = values.iter().map(|v| v.to_string()).collect();
    words.join(" or ")
}

fn test_name(test: &Test) -> (String, Option<ZoneName>) {
    match test {
        Test::Indicator { id, zone, .. } => (id.clone(), *zone),
        Test::Answer { question, .. } => (question.clone(), None),
        Test::Material(_) => ("material".into(), None),
        Test::Method(_) => ("method".into(), None),
        Test::Place(_) => ("place".into(), None),
    }
}

/// Rank the causes of the observed symptoms `symptoms` (IDs known to `rules`). All causes
/// reached get a belief; the list is sorted by belief (descending), then ID, and only causes
/// with positive belief are kept.
pub fn rank(
    rules: &RuleBase,
    symptoms: &[String],
    case: &ResolvedCase,
    indicators: &Indicators,
) -> Vec<RankedCause> {
    // cause → (per-symptom beliefs, reasons)
    let mut per_cause: BTreeMap<&str, (Vec<f64>, Vec<Reason>)> = BTreeMap::new();
    for symptom_id in symptoms {
        let Some(symptom) = rules.symptom(symptom_id) else {
            continue;
        };
        for rule in &symptom.rules {
            let mut factors = vec![rule.prior];
            let mut about_cause = vec![rule.prior];
            let mut reasons = vec![Reason {
                symptom: symptom.id.clone(),
                test: "prior".into(),
                zone: None,
                value: None,
                threshold: None,
                weight: rule.prior,
                text: rule.because.clone(),
            }];
            for evidence in &rule.evidence {
                let Some((holds, value, threshold)) =
                    evaluate(&evidence.test, &symptom.id, case, indicators)
                else {
                    continue;
                };
                if !holds {
                    continue;
                }
                factors.push(evidence.weight);
                if evidence.scope == Scope::Cause {
                    about_cause.push(evidence.weight);
                }
                let (test, zone) = test_name(&evidence.test);
                reasons.push(Reason {
                    symptom: symptom.id.clone(),
                    test,
                    zone: zone.map(|z| z.as_str().to_string()),
                    value,
                    threshold,
                    weight: evidence.weight,
                    text: evidence.says.clone(),
                });
            }
            let entry = per_cause.entry(rule.cause.as_str()).or_default();
            entry.0.push(symptom_belief(&factors, &about_cause));
            entry.1.extend(reasons);
        }
    }
    let mut out: Vec<RankedCause> = per_cause
        .into_iter()
        .filter_map(|(id, (beliefs, reasons))| {
            let belief = combine(&beliefs);
            let info = rules.causes.get(id)?;
            Some(RankedCause {
                id: id.to_string(),
                title: info.title.clone(),
                mechanism: info.mechanism.clone(),
                belief: belief.clamp(-1.0, 1.0),
                reasons,
            })
        })
        .collect();
    out.sort_by(|a, b| b.belief.total_cmp(&a.belief).then_with(|| a.id.cmp(&b.id)));
    out.retain(|c| c.belief > 0.0);
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    // Shortliffe & Buchanan (1975) combination: two confirming factors 0.6 and 0.5 give
    // 0.6 + 0.5·0.4 = 0.8; 0.6 with −0.4 gives 0.2 / (1 − 0.4) = 0.333….
    #[test]
    fn certainty_factors_combine_as_published() {
        assert!((combine(&[0.6, 0.5]) - 0.8).abs() < 1e-12);
        assert!((combine(&[0.6, -0.4]) - 0.2 / 0.6).abs() < 1e-12);
        assert!((combine(&[-0.6, -0.5]) + 0.8).abs() < 1e-12);
        assert_eq!(combine(&[]), 0.0);
    }

    // Scoped evidence: prior 0.3 and −0.7 combine to (0.3 − 0.7)/(1 − 0.3) = −0.571…; scoped to
    // the symptom it stops at no belief; about the cause it stays. Scoped evidence never lowers
    // a symptom below its cause-level belief, and positive beliefs are untouched.
    #[test]
    fn symptom_scoped_evidence_stops_at_no_belief() {
        assert!((combine(&[0.3, -0.7]) + 0.4 / 0.7).abs() < 1e-12);
        assert_eq!(symptom_belief(&[0.3, -0.7], &[0.3]), 0.0);
        assert!((symptom_belief(&[0.3, -0.7], &[0.3, -0.7]) + 0.4 / 0.7).abs() < 1e-12);
        // A cause-level −0.5 with a scoped −0.7: the cause-level belief −0.2/0.7 is the floor.
        let floor = combine(&[0.3, -0.5]);
        assert!((symptom_belief(&[0.3, -0.5, -0.7], &[0.3, -0.5]) - floor).abs() < 1e-12);
        assert!((symptom_belief(&[0.6, -0.2], &[0.6]) - combine(&[0.6, -0.2])).abs() < 1e-12);
    }

    #[test]
    fn combination_does_not_depend_on_order() {
        let a = combine(&[0.3, -0.5, 0.7, -0.2]);
        let b = combine(&[-0.2, 0.7, -0.5, 0.3]);
        assert!((a - b).abs() < 1e-12);
    }
}
