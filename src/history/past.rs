//! Similar past complaints told for a person: each match with its confirmed causes in plain
//! words (and the evidence that confirmed them), the corrective actions taken and whether the
//! defect stopped. The one source of the "similar past complaints" block of reports and of the
//! terminal UI's history screen.

use serde::{Deserialize, Serialize};

use super::{HistoryError, Store, experience, similar};
use crate::complaint::Complaint;
use crate::diagnose::rules::RuleBase;

/// A past complaint found similar to the case at hand, with what was found and what worked.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct PastComplaint {
    /// Complaint number in the store.
    pub id: i64,
    /// 0 = alike, 1 = nothing in common (docs/history.md).
    pub distance: f64,
    pub reference: Option<String>,
    pub title: String,
    pub received: Option<String>,
    pub line: Option<String>,
    pub grade: Option<String>,
    /// Status in plain words ("cause confirmed").
    pub status: String,
    /// Symptoms in plain words.
    pub symptoms: Vec<String>,
    /// Confirmed causes in plain words, each with its evidence when one was written.
    pub confirmed: Vec<String>,
    /// Corrective actions, with owner and dates when given.
    pub actions: Vec<String>,
    /// Whether the defect stopped, in plain words; `None` when nobody checked yet.
    pub verification: Option<String>,
}

/// "crushed_core" → "crushed core".
fn words(id: &str) -> String {
    id.replace('_', " ")
}

impl PastComplaint {
    /// A match told with its complaint record (`None` when the record could not be read: the
    /// match is still shown, with its confirmed causes from the store's summary).
    pub fn from_match(rules: &RuleBase, m: &similar::Match, record: Option<&Complaint>) -> Self {
        let confirmed = match record {
            Some(r) if !r.confirmed_causes.is_empty() => r
                .confirmed_causes
                .iter()
                .map(|c| {
                    let title = experience::cause_title(rules, &c.cause);
                    match c.evidence.as_deref().map(str::trim) {
                        Some(e) if !e.is_empty() => format!("{title} — {e}"),
                        _ => title,
                    }
                })
                .collect(),
            _ => m
                .confirmed
                .iter()
                .map(|c| experience::cause_title(rules, c))
                .collect(),
        };
        let actions = record
            .map(|r| {
                r.actions
                    .iter()
                    .map(|a| {
                        let mut extra = Vec::new();
                        if let Some(o) = &a.owner {
                            extra.push(format!("owner {o}"));
                        }
                        if let Some(d) = &a.done {
                            extra.push(format!("done {d}"));
                        } else if let Some(d) = &a.due {
                            extra.push(format!("due {d}"));
                        }
                        if extra.is_empty() {
                            a.action.clone()
                        } else {
                            format!("{} ({})", a.action, extra.join(", "))
                        }
                    })
                    .collect()
            })
            .unwrap_or_default();
        let verification = record.and_then(|r| r.verification.as_ref()).map(|v| {
            let mut text = words(v.result.as_deref().unwrap_or("not_checked"));
            if let Some(d) = &v.checked_on {
                text.push_str(&format!(", checked {d}"));
            }
            if let Some(n) = v.notes.as_deref().map(str::trim).filter(|n| !n.is_empty()) {
                text.push_str(&format!(" — {n}"));
            }
            text
        });
        PastComplaint {
            id: m.id,
            distance: m.distance,
            reference: m.reference.clone(),
            title: m.title.clone(),
            received: m.received.clone(),
            line: m.line.clone(),
            grade: m.grade.clone(),
            status: words(&m.status),
            symptoms: m.symptoms.iter().map(|s| words(s)).collect(),
            confirmed,
            actions,
            verification,
        }
    }

    /// "line 4, news 45" — where and on what it happened, when known.
    pub fn place(&self) -> String {
        // A bare number is a line number ("4" reads as "line 4").
        let line = self.line.as_ref().map(|l| {
            if l.chars().all(|c| c.is_ascii_digit()) {
                format!("line {l}")
            } else {
                l.clone()
            }
        });
        [line, self.grade.clone()]
            .into_iter()
            .flatten()
            .collect::<Vec<_>>()
            .join(", ")
    }

    /// What the confirmed cause was, in one line ("not confirmed yet (open)" when none).
    pub fn cause_line(&self) -> String {
        if self.confirmed.is_empty() {
            format!("not confirmed yet ({})", self.status)
        } else {
            self.confirmed.join("; ")
        }
    }

    /// What was done and whether it worked, in one line; `None` when nothing was recorded.
    pub fn worked_line(&self) -> Option<String> {
        match (self.actions.is_empty(), &self.verification) {
            (true, None) => None,
            (true, Some(v)) => Some(format!("result: {v}")),
            (false, None) => Some(format!("{} (result not checked)", self.actions.join("; "))),
            (false, Some(v)) => Some(format!("{} → {v}", self.actions.join("; "))),
        }
    }
}

/// The `top` stored complaints nearest to `entry` (leaving out complaint `except`), each with
/// its confirmed causes, actions and verification read from its latest version.
pub fn similar_past(
    store: &mut Store,
    rules: &RuleBase,
    entry: &super::Entry,
    top: usize,
    except: Option<i64>,
) -> Result<Vec<PastComplaint>, HistoryError> {
    let matches = similar::search(store, entry, top, except)?;
    let mut out = Vec::with_capacity(matches.len());
    for m in &matches {
        // One damaged version must not hide the match: it is shown from its summary.
        let record = store
            .get(m.id)
            .ok()
            .and_then(|c| c.latest().map(|v| v.complaint.clone()));
        out.push(PastComplaint::from_match(rules, m, record.as_ref()));
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::complaint::{ConfirmedCause, CorrectiveAction, Verification};

    #[test]
    fn a_match_reads_in_plain_words() {
        let rules = RuleBase::embedded().expect("shipped rules");
        let m = similar::Match {
            id: 4,
            distance: 0.125,
            reference: Some("QP-1".into()),
            title: "Reel 4 telescoped".into(),
            received: Some("2026-03-01".into()),
            line: Some("W3".into()),
            grade: None,
            status: "cause_confirmed".into(),
            symptoms: vec!["telescoping".into()],
            confirmed: vec!["tension_too_low".into()],
            ranked_first: None,
        };
        let record = Complaint {
            confirmed_causes: vec![ConfirmedCause {
                cause: "tension_too_low".into(),
                evidence: Some("trial at 1.7 pli".into()),
                ..ConfirmedCause::default()
            }],
            actions: vec![CorrectiveAction {
                action: "raise tension to 1.7 pli".into(),
                owner: Some("shift B".into()),
                done: Some("2026-03-04".into()),
                ..CorrectiveAction::default()
            }],
            verification: Some(Verification {
                result: Some("stopped".into()),
                ..Verification::default()
            }),
            ..Complaint::default()
        };
        let p = PastComplaint::from_match(&rules, &m, Some(&record));
        assert!(
            !p.confirmed[0].contains("tension_too_low"),
            "{:?}",
            p.confirmed
        );
        assert!(p.confirmed[0].ends_with("— trial at 1.7 pli"));
        assert_eq!(
            p.worked_line().as_deref(),
            Some("raise tension to 1.7 pli (owner shift B, done 2026-03-04) → stopped")
        );
        assert_eq!(p.status, "cause confirmed");
        assert_eq!(p.place(), "W3");
        let bare = PastComplaint::from_match(&rules, &m, None);
        assert_eq!(bare.worked_line(), None);
        assert_eq!(bare.confirmed.len(), 1);
    }
}
