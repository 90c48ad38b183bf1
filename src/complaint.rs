//! The complaint record: the `complaint:` section of a case file. Which rolls, whose complaint,
//! what was contained, what the cause turned out to be, what was changed and whether it worked.
//!
//! Every field is optional (a complaint is written down while it is still being investigated);
//! names are our own, in plain words. [`Complaint::check`] validates what is given: dates,
//! the fixed word lists, counts that agree, and cause IDs against the rule base.

use serde::{Deserialize, Serialize};

/// The status words, in the order a complaint normally moves through them.
pub const STATUSES: [&str; 4] = ["open", "contained", "cause_confirmed", "closed"];
/// Who raised the complaint.
pub const SOURCES: [&str; 2] = ["customer", "internal"];
/// Where the defect was found.
pub const FOUND_AT: [&str; 4] = ["winder", "warehouse", "customer", "in_transit"];
/// Result of checking whether a corrective action worked.
pub const VERIFICATION_RESULTS: [&str; 4] = ["stopped", "reduced", "not_stopped", "not_checked"];

/// The complaint record of a case.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Complaint {
    /// The plant's own complaint number, e.g. `QP-2026-014`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub reference: Option<String>,
    /// `customer` or `internal`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub source: Option<String>,
    /// Customer name (kept in the store the user chose; `history export --anonymise` drops it).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub customer: Option<String>,
    /// Date the complaint was received, `YYYY-MM-DD`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub received: Option<String>,
    /// Winder or line, e.g. `W3` or `line 4`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub line: Option<String>,
    /// Product or grade.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub grade: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub lot: Option<String>,
    /// Parent (jumbo, mill) roll the affected rolls were slit from.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub parent_roll: Option<String>,
    /// Set (one winder cycle across the width).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub set: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub rolls_affected: Option<u32>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub rolls_checked: Option<u32>,
    /// Slit positions of the affected rolls, numbered across the winder (1 = first position).
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub slit_positions: Vec<u32>,
    /// `winder`, `warehouse`, `customer` or `in_transit`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub found_at: Option<String>,
    /// What was held or sorted.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub containment: Option<String>,
    /// `open`, `contained`, `cause_confirmed` or `closed`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub status: Option<String>,
    /// Causes confirmed on the winder, each with the evidence that confirmed it.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub confirmed_causes: Vec<ConfirmedCause>,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub actions: Vec<CorrectiveAction>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub verification: Option<Verification>,
}

/// A cause confirmed on the winder.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ConfirmedCause {
    /// Cause ID from the rule base (`rolltriage rules questions` and rules/causes.yaml).
    pub cause: String,
    /// What showed it (a trial, a measurement, a finding).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub evidence: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub confirmed_on: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub confirmed_by: Option<String>,
}

/// A corrective action.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CorrectiveAction {
    pub action: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub owner: Option<String>,
    /// Date due, `YYYY-MM-DD`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub due: Option<String>,
    /// Date done, `YYYY-MM-DD`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub done: Option<String>,
}

/// Did the defect stop after the corrective actions?
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Verification {
    /// `stopped`, `reduced`, `not_stopped` or `not_checked`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub result: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub checked_on: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub notes: Option<String>,
}

/// True for a real calendar date written `YYYY-MM-DD` (years 1900–2999).
pub fn is_date(text: &str) -> bool {
    let parts: Vec<&str> = text.split('-').collect();
    if parts.len() != 3
        || parts[0].len() != 4
        || parts[1].len() != 2
        || parts[2].len() != 2
        || !parts.iter().all(|p| p.bytes().all(|b| b.is_ascii_digit()))
    {
        return false;
    }
    let (Ok(year), Ok(month), Ok(day)) = (
        parts[0].parse::<u32>(),
        parts[1].parse::<u32>(),
        parts[2].parse::<u32>(),
    ) else {
        return false;
    };
    let leap = (year % 4 == 0 && year % 100 != 0) || year % 400 == 0;
    let days = match month {
        1 | 3 | 5 | 7 | 8 | 10 | 12 => 31,
        4 | 6 | 9 | 11 => 30,
        2 if leap => 29,
        2 => 28,
        _ => return false,
    };
    (1900..=2999).contains(&year) && (1..=days).contains(&day)
}

fn one_of(field: &str, value: &Option<String>, accepted: &[&str]) -> Result<(), String> {
    match value {
        Some(v) if !accepted.contains(&v.as_str()) => {
            let hint = crate::vocabulary::closest(v, accepted.iter().copied())
                .map(|c| format!(" (did you mean `{c}`?)"))
                .unwrap_or_default();
            Err(format!(
                "complaint.{field}: `{v}` is not accepted; accepted: {}{hint}",
                accepted.join(", ")
            ))
        }
        _ => Ok(()),
    }
}

fn date(field: &str, value: &Option<String>) -> Result<(), String> {
    match value {
        Some(v) if !is_date(v) => Err(format!(
            "complaint.{field}: `{v}` is not a date; accepted: YYYY-MM-DD, e.g. 2026-12-02"
        )),
        _ => Ok(()),
    }
}

impl Complaint {
    /// The status, `open` when none is written.
    pub fn status_or_open(&self) -> &str {
        self.status.as_deref().unwrap_or("open")
    }

    /// Check the record. `causes` are the known cause IDs (the rule base's); `None` leaves cause
    /// IDs to a later check against the rule base in use. The message names the field and what
    /// is accepted.
    pub fn check(&self, causes: Option<&[&str]>) -> Result<(), String> {
        one_of("source", &self.source, &SOURCES)?;
        one_of("found_at", &self.found_at, &FOUND_AT)?;
        one_of("status", &self.status, &STATUSES)?;
        date("received", &self.received)?;
        if let (Some(affected), Some(checked)) = (self.rolls_affected, self.rolls_checked)
            && affected > checked
        {
            return Err(format!(
                "complaint.rolls_affected: {affected} is more than rolls_checked ({checked}); accepted: 0 to {checked}"
            ));
        }
        if self.slit_positions.contains(&0) {
            return Err(
                "complaint.slit_positions: 0 is not a position; accepted: 1, 2, 3, … counted across the winder"
                    .into(),
            );
        }
        for (i, c) in self.confirmed_causes.iter().enumerate() {
            if let Some(causes) = causes
                && !causes.contains(&c.cause.as_str())
            {
                let hint = crate::vocabulary::closest(&c.cause, causes.iter().copied())
                    .map(|s| format!(" (did you mean `{s}`?)"))
                    .unwrap_or_default();
                return Err(format!(
                    "complaint.confirmed_causes[{i}].cause: `{}` is not a cause of the rule base{hint}",
                    c.cause
                ));
            }
            date(
                &format!("confirmed_causes[{i}].confirmed_on"),
                &c.confirmed_on,
            )?;
        }
        for (i, a) in self.actions.iter().enumerate() {
            if a.action.trim().is_empty() {
                return Err(format!(
                    "complaint.actions[{i}].action: empty; say what was changed"
                ));
            }
            date(&format!("actions[{i}].due"), &a.due)?;
            date(&format!("actions[{i}].done"), &a.done)?;
        }
        if let Some(v) = &self.verification {
            one_of("verification.result", &v.result, &VERIFICATION_RESULTS)?;
            date("verification.checked_on", &v.checked_on)?;
        }
        Ok(())
    }

    /// The record in plain words, one (label, value) line per field given, in the order a
    /// reader wants them (reports and `history show`).
    pub fn lines(&self) -> Vec<(&'static str, String)> {
        self.lines_titled(&|id| id.to_string())
    }

    /// As [`Complaint::lines`], with each confirmed cause named by `title` (plain words for
    /// people; [`Complaint::lines`] keeps the IDs).
    pub fn lines_titled(&self, title: &dyn Fn(&str) -> String) -> Vec<(&'static str, String)> {
        let mut out: Vec<(&'static str, String)> = Vec::new();
        let mut add = |label: &'static str, value: Option<String>| {
            if let Some(v) = value.filter(|v| !v.trim().is_empty()) {
                out.push((label, v));
            }
        };
        add("Reference", self.reference.clone());
        add("Status", Some(self.status_or_open().replace('_', " ")));
        add("From", self.source.clone());
        add("Customer", self.customer.clone());
        add("Received", self.received.clone());
        add("Line", self.line.clone());
        add("Grade", self.grade.clone());
        add("Lot", self.lot.clone());
        add("Parent roll", self.parent_roll.clone());
        add("Set", self.set.clone());
        add(
            "Rolls affected",
            match (self.rolls_affected, self.rolls_checked) {
                (Some(a), Some(c)) => Some(format!("{a} of {c} checked")),
                (Some(a), None) => Some(a.to_string()),
                (None, Some(c)) => Some(format!("? of {c} checked")),
                (None, None) => None,
            },
        );
        add(
            "Slit positions",
            Some(
                self.slit_positions
                    .iter()
                    .map(u32::to_string)
                    .collect::<Vec<_>>()
                    .join(", "),
            ),
        );
        add(
            "Found at",
            self.found_at.as_ref().map(|f| f.replace('_', " ")),
        );
        add("Containment", self.containment.clone());
        for c in &self.confirmed_causes {
            let who = [c.confirmed_on.as_deref(), c.confirmed_by.as_deref()]
                .iter()
                .flatten()
                .copied()
                .collect::<Vec<_>>()
                .join(", ");
            add(
                "Confirmed cause",
                Some(format!(
                    "{} — {}{}",
                    title(&c.cause),
                    c.evidence.as_deref().unwrap_or("no evidence written"),
                    if who.is_empty() {
                        String::new()
                    } else {
                        format!(" ({who})")
                    }
                )),
            );
        }
        for a in &self.actions {
            let mut extra = Vec::new();
            if let Some(o) = &a.owner {
                extra.push(format!("owner {o}"));
            }
            if let Some(d) = &a.due {
                extra.push(format!("due {d}"));
            }
            if let Some(d) = &a.done {
                extra.push(format!("done {d}"));
            }
            let extra = if extra.is_empty() {
                String::new()
            } else {
                format!(" ({})", extra.join(", "))
            };
            add("Corrective action", Some(format!("{}{extra}", a.action)));
        }
        if let Some(v) = &self.verification {
            add(
                "Verification",
                Some(format!(
                    "{}{}{}",
                    v.result
                        .as_deref()
                        .unwrap_or("not_checked")
                        .replace('_', " "),
                    v.checked_on
                        .as_deref()
                        .map(|d| format!(", checked {d}"))
                        .unwrap_or_default(),
                    v.notes
                        .as_deref()
                        .map(|n| format!(" — {n}"))
                        .unwrap_or_default()
                )),
            );
        }
        out
    }

    /// Confirmed cause IDs, deduplicated, in record order.
    pub fn confirmed_cause_ids(&self) -> Vec<String> {
        let mut out: Vec<String> = Vec::new();
        for c in &self.confirmed_causes {
            if !out.contains(&c.cause) {
                out.push(c.cause.clone());
            }
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    // Gregorian calendar rules (leap years every 4, not every 100, every 400).
    #[test]
    fn dates_follow_the_calendar() {
        assert!(is_date("2024-02-29"));
        assert!(!is_date("2023-02-29"));
        assert!(is_date("2000-02-29"));
        assert!(!is_date("2100-02-29"));
        assert!(!is_date("2026-13-01"));
        assert!(!is_date("2026-4-01"));
        assert!(!is_date("yesterday"));
    }

    #[test]
    fn check_names_the_field() {
        let c = Complaint {
            status: Some("done".into()),
            ..Complaint::default()
        };
        let e = c.check(None).unwrap_err();
        assert!(
            e.contains("complaint.status") && e.contains("cause_confirmed"),
            "{e}"
        );
        let c = Complaint {
            rolls_affected: Some(7),
            rolls_checked: Some(6),
            ..Complaint::default()
        };
        assert!(c.check(None).unwrap_err().contains("rolls_affected"));
        let c = Complaint {
            confirmed_causes: vec![ConfirmedCause {
                cause: "tension_to_low".into(),
                ..ConfirmedCause::default()
            }],
            ..Complaint::default()
        };
        let e = c.check(Some(&["tension_too_low"])).unwrap_err();
        assert!(e.contains("did you mean `tension_too_low`"), "{e}");
    }
}
