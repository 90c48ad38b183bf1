//! Site experience: the causes confirmed for past complaints become one more certainty factor
//! per cause, shown as its own reason; and how well the tool has ranked the causes that were
//! later confirmed.
//!
//! The rule, for every observed symptom `s` of the new case:
//! * the candidates are the `m` causes the rule base names for `s`;
//! * the evidence is the `n` past complaints with symptom `s` and a confirmed cause — those on
//!   the case's own line when it names a line and that line has any, else the whole site;
//! * a candidate confirmed in `k` of them gets the Laplace-smoothed frequency
//!   `p = (k + 1) / (n + m)`, which is the uniform `u = 1/m` when nothing is known and moves
//!   toward `k/n` as complaints accumulate;
//! * the certainty factor is `B·(p − u)/(1 − u)` when `p ≥ u` and `B·(p − u)/u` below, so it
//!   lies in −B..B, is 0 with no history, and B = [`MAX_FACTOR`] keeps history from
//!   outweighing the physics.
//!
//! The factor is combined with the cause's belief exactly as the rule base combines evidence
//! (`diagnose::rank::combine`). History only reorders: no cause is added or removed, and a
//! cause history speaks against keeps at least [`MIN_BELIEF`] (or its own smaller belief) so
//! it stays on the list. Switch it off with `--no-site-history`.

use std::collections::BTreeMap;

use serde::Serialize;

use super::ScanRow;
use crate::diagnose::rules::RuleBase;
use crate::diagnose::{Caution, Diagnosis, RankedCause, Reason, rank::combine, remedies};

/// Largest certainty factor site history can give or take.
pub const MAX_FACTOR: f64 = 0.4;
/// A cause history speaks against stays on the list with at least this belief.
pub const MIN_BELIEF: f64 = 0.01;
/// The `test` of a site-history reason.
pub const REASON_TEST: &str = "site_history";

/// The certainty factor of a cause confirmed `k` times in `n` complaints with `m` candidates
/// (module docs).
pub fn factor(k: usize, n: usize, m: usize) -> f64 {
    if n == 0 || m < 2 {
        return 0.0;
    }
    let u = 1.0 / m as f64;
    let p = (k as f64 + 1.0) / (n as f64 + m as f64);
    let cf = if p >= u {
        (p - u) / (1.0 - u)
    } else {
        (p - u) / u
    };
    MAX_FACTOR * cf.clamp(-1.0, 1.0)
}

/// Which past complaints were counted.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Scope {
    Line(String),
    Site,
}

fn plain_title(title: &str) -> String {
    let mut chars = title.chars();
    match chars.next() {
        Some(first) => first.to_lowercase().collect::<String>() + chars.as_str(),
        None => String::new(),
    }
}

/// Add the site-history reason to every cause of `diagnosis` for which past complaints exist,
/// re-sort, keep `top` causes (0 = all), and merge the remedies again for the new order
/// (keeping the what-if results already computed). `line` is the case's line, if it names one.
pub fn apply(
    rules: &RuleBase,
    symptoms: &[String],
    mut diagnosis: Diagnosis,
    confirmed: &[ScanRow],
    line: Option<&str>,
    top: usize,
) -> Diagnosis {
    for symptom in symptoms {
        let Some(rules_of) = rules.symptom(symptom) else {
            continue;
        };
        let mut candidates: Vec<&str> = rules_of.rules.iter().map(|r| r.cause.as_str()).collect();
        candidates.sort_unstable();
        candidates.dedup();
        let with_symptom: Vec<&ScanRow> = confirmed
            .iter()
            .filter(|r| {
                r.facts.symptoms.iter().any(|s| s == symptom) && !r.facts.confirmed.is_empty()
            })
            .collect();
        let on_line: Vec<&ScanRow> = match line {
            Some(l) => with_symptom
                .iter()
                .copied()
                .filter(|r| {
                    r.facts
                        .line
                        .as_deref()
                        .is_some_and(|x| x.trim().eq_ignore_ascii_case(l.trim()))
                })
                .collect(),
            None => Vec::new(),
        };
        let (scope, counted) = match line {
            Some(l) if !on_line.is_empty() => (Scope::Line(l.to_string()), on_line),
            _ => (Scope::Site, with_symptom),
        };
        let n = counted.len();
        if n == 0 {
            continue;
        }
        let symptom_title = plain_title(&rules_of.title);
        let symptom_word = symptom_title
            .split(" (")
            .next()
            .unwrap_or(&symptom_title)
            .to_string();
        for cause in diagnosis.causes.iter_mut() {
            if !candidates.contains(&cause.id.as_str()) {
                continue;
            }
            let k = counted
                .iter()
                .filter(|r| r.facts.confirmed.contains(&cause.id))
                .count();
            let cf = factor(k, n, candidates.len());
            let place = match &scope {
                // "line 4" or "W3" are both used as line names; do not say "line line 4".
                Scope::Line(l) if l.trim().to_lowercase().starts_with("line") => {
                    format!(" on {}", l.trim())
                }
                Scope::Line(l) => format!(" on line {}", l.trim()),
                Scope::Site => " at this site".to_string(),
            };
            let text = format!(
                "site history: {k} of {n} confirmed {symptom_word} complaints{place} were {}",
                plain_title(&cause.title)
            );
            let original = cause.belief;
            let combined = combine(&[original, cf]);
            cause.belief = combined.max(original.min(MIN_BELIEF)).clamp(-1.0, 1.0);
            cause.reasons.push(Reason {
                symptom: symptom.clone(),
                test: REASON_TEST.into(),
                zone: None,
                value: Some(format!("{k} of {n}")),
                threshold: None,
                weight: cf,
                text,
            });
        }
    }
    diagnosis
        .causes
        .sort_by(|a, b| b.belief.total_cmp(&a.belief).then_with(|| a.id.cmp(&b.id)));
    if top > 0 {
        diagnosis.causes.truncate(top);
    }
    remerge(rules, symptoms, diagnosis)
}

/// The remedies and cautions for the causes as now ordered; what-if results computed before
/// are kept by remedy.
fn remerge(rules: &RuleBase, symptoms: &[String], mut diagnosis: Diagnosis) -> Diagnosis {
    let before: BTreeMap<String, _> = diagnosis
        .remedies
        .iter()
        .map(|r| (r.id.clone(), r.what_if.clone()))
        .collect();
    let mut merged = remedies::merge(rules, symptoms, &diagnosis.causes);
    for r in &mut merged {
        r.what_if = before.get(&r.id).cloned().flatten();
    }
    merged.sort_by_key(|r| r.what_if.as_ref().is_some_and(|w| w.worse));
    let mut cautions: Vec<Caution> = Vec::new();
    for (id, c) in &rules.cautions {
        if merged.iter().any(|r| r.cautions.contains(id)) {
            cautions.push(Caution {
                id: c.id.clone(),
                title: c.title.clone(),
                text: c.text.clone(),
            });
        }
    }
    diagnosis.remedies = merged;
    diagnosis.cautions = cautions;
    diagnosis
}

/// How well the tool ranked the causes confirmed later.
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct Performance {
    /// Complaints with a confirmed cause and a stored ranking.
    pub confirmed: usize,
    /// Of those, how many had a confirmed cause ranked first.
    pub first: usize,
    /// … and in the first three.
    pub top_three: usize,
}

/// Count over complaints with a confirmed cause: was one of their confirmed causes ranked first
/// / in the first three by the ranking stored with the complaint?
pub fn performance(rows: &[ScanRow]) -> Performance {
    let mut out = Performance::default();
    for r in rows.iter().filter(|r| !r.facts.confirmed.is_empty()) {
        out.confirmed += 1;
        let hit = |n: usize| {
            r.ranked
                .iter()
                .take(n)
                .any(|c| r.facts.confirmed.contains(c))
        };
        out.first += usize::from(hit(1));
        out.top_three += usize::from(hit(3));
    }
    out
}

/// Plain words for a cause that is ranked (a title), for lists.
pub fn cause_title(rules: &RuleBase, id: &str) -> String {
    rules
        .causes
        .get(id)
        .map(|c| c.title.clone())
        .unwrap_or_else(|| id.to_string())
}

/// Keep only what the list needs from a ranked cause (for messages about confirmation).
pub fn rank_of(causes: &[RankedCause], id: &str) -> Option<usize> {
    causes.iter().position(|c| c.id == id).map(|i| i + 1)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn no_history_is_no_effect_and_the_factor_is_bounded() {
        assert_eq!(factor(0, 0, 8), 0.0);
        for n in [1, 4, 20, 1000] {
            for k in [0, n / 2, n] {
                let f = factor(k, n, 8);
                assert!((-MAX_FACTOR..=MAX_FACTOR).contains(&f), "{k}/{n}: {f}");
            }
        }
        // Laplace's rule of succession: 3 of 4 with 8 candidates gives (3+1)/(4+8) = 1/3,
        // against the uniform 1/8: (1/3 − 1/8)/(7/8) = 0.238…, times the bound.
        assert!((factor(3, 4, 8) - MAX_FACTOR * (1.0 / 3.0 - 0.125) / 0.875).abs() < 1e-12);
        // More complaints with the same share give a stronger factor (shrinkage fades).
        assert!(factor(30, 40, 8) > factor(3, 4, 8));
        assert!(factor(0, 40, 8) < factor(0, 4, 8));
    }
}
