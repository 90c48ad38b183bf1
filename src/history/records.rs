//! The records of the history store as the library sees them: a complaint with its versions
//! and status changes, the list and scan rows, the filters of `history list`, and the new
//! version computed from a case ([`Entry`]). How they map to SQL rows is in `rows`.

use serde::{Deserialize, Serialize};

use super::HistoryError;
use crate::complaint::Complaint;
use crate::diagnose::{Diagnosis, RankedCause};

/// Everything recorded for one version of a complaint.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct StoredVersion {
    pub version: i64,
    pub recorded_at: String,
    /// `added`, `edited`, `confirmed`, `status` or `imported`.
    pub change: String,
    pub app_version: String,
    pub rules_version: String,
    /// The case file as entered (YAML text).
    pub case_text: String,
    /// The resolved inputs (SI, presets applied, with the assumed list).
    pub resolved: serde_json::Value,
    /// The computed indicators.
    pub indicators: serde_json::Value,
    /// The causes as ranked and shown then, with their reasons.
    pub causes: serde_json::Value,
    /// The merged remedies and cautions as shown then.
    pub remedies: serde_json::Value,
    pub complaint: Complaint,
}

/// One status change.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct StatusChange {
    pub version: i64,
    pub changed_at: String,
    pub from_status: Option<String>,
    pub to_status: String,
    pub note: Option<String>,
}

/// A complaint with all its versions.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct StoredComplaint {
    pub id: i64,
    pub created_at: String,
    pub versions: Vec<StoredVersion>,
    pub status_changes: Vec<StatusChange>,
}

impl StoredComplaint {
    pub fn latest(&self) -> Option<&StoredVersion> {
        self.versions.last()
    }
}

/// One line of `history list`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ComplaintSummary {
    pub id: i64,
    pub version: i64,
    pub reference: Option<String>,
    pub title: String,
    pub received: Option<String>,
    pub recorded: String,
    pub line: Option<String>,
    pub grade: Option<String>,
    pub status: String,
    pub symptoms: Vec<String>,
    pub confirmed: Vec<String>,
    pub ranked_first: Option<String>,
}

/// Filters of `history list` (all must hold; dates compare the received date, or the recorded
/// date when none was given, as `YYYY-MM-DD` text).
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Filter {
    pub line: Option<String>,
    pub grade: Option<String>,
    pub symptom: Option<String>,
    pub status: Option<String>,
    pub from: Option<String>,
    pub to: Option<String>,
}

/// What a list of past complaints shows of one: shared by [`ScanRow`] and the similar
/// complaints' `similar::Match` (flattened there, so its JSON keeps these keys in this order).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ComplaintFacts {
    pub reference: Option<String>,
    pub title: String,
    pub received: Option<String>,
    pub line: Option<String>,
    pub grade: Option<String>,
    pub status: String,
    pub symptoms: Vec<String>,
    pub confirmed: Vec<String>,
}

/// What the similarity search, the site experience and the site performance read per complaint.
#[derive(Debug, Clone, PartialEq)]
pub struct ScanRow {
    pub id: i64,
    pub facts: ComplaintFacts,
    /// Cause IDs as the diagnosis ranked them, first first.
    pub ranked: Vec<String>,
}

/// The data of a new version computed from a case.
#[derive(Debug, Clone)]
pub struct Entry {
    pub case_text: String,
    pub case: crate::case::Case,
    pub resolved: crate::case::ResolvedCase,
    pub diagnosis: Diagnosis,
    pub rules_version: String,
}

impl StoredVersion {
    /// A first (or edited) version computed from a case.
    pub fn from_entry(entry: &Entry, change: &str) -> Result<StoredVersion, HistoryError> {
        let d = &entry.diagnosis;
        Ok(StoredVersion {
            version: 0,
            recorded_at: super::now_utc(),
            change: change.to_string(),
            app_version: env!("CARGO_PKG_VERSION").to_string(),
            rules_version: entry.rules_version.clone(),
            case_text: entry.case_text.clone(),
            resolved: to_value(&entry.resolved)?,
            indicators: to_value(&d.indicators)?,
            causes: to_value(&d.causes)?,
            remedies: serde_json::json!({
                "remedies": to_value(&d.remedies)?,
                "cautions": to_value(&d.cautions)?,
            }),
            complaint: entry.case.complaint.clone().unwrap_or_default(),
        })
    }

    /// The causes as ranked then.
    pub fn ranked_causes(&self) -> Vec<RankedCause> {
        serde_json::from_value(self.causes.clone()).unwrap_or_default()
    }
}

fn to_value(value: &impl Serialize) -> Result<serde_json::Value, HistoryError> {
    serde_json::to_value(value).map_err(|e| HistoryError::Input(format!("cannot encode: {e}")))
}

impl Entry {
    /// Parse, resolve and diagnose a case (the full triage with `options`), checking its
    /// complaint record against the rule base. `origin` names the case in messages.
    pub fn compute(
        rules: &crate::diagnose::rules::RuleBase,
        case_text: &str,
        origin: &str,
        options: &crate::diagnose::DiagnoseOptions,
    ) -> Result<Entry, HistoryError> {
        let input = |m: String| HistoryError::Input(m);
        let case = crate::case::Case::from_yaml_str(case_text, origin)
            .map_err(|e| input(e.to_string()))?;
        if let Some(record) = &case.complaint {
            let causes: Vec<&str> = rules.causes.keys().map(String::as_str).collect();
            record
                .check(Some(&causes))
                .map_err(|m| input(format!("{origin}: {m}")))?;
        }
        let resolved = case.resolve_as(origin).map_err(|e| input(e.to_string()))?;
        if resolved.symptoms.is_empty() {
            return Err(input(format!(
                "{origin}: no symptoms observed; a complaint needs at least one entry under `symptoms:`"
            )));
        }
        let (_profile, diagnosis) = crate::diagnose::triage(rules, &resolved, options)
            .map_err(|e| input(format!("{origin}: {e}")))?;
        Ok(Entry {
            case_text: case_text.to_string(),
            case,
            resolved,
            diagnosis,
            rules_version: super::rules_version(rules),
        })
    }

    /// The observed symptom IDs, deduplicated in case order.
    pub fn symptoms(&self) -> Vec<String> {
        super::similar::case_profile_parts(&self.resolved).0
    }

    /// The line named by the complaint record, if any.
    pub fn line(&self) -> Option<&str> {
        self.case.complaint.as_ref().and_then(|c| c.line.as_deref())
    }
}
