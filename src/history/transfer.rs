//! Export (JSON with every version, or one CSV line per complaint) and import (the JSON export,
//! validated like case files before anything is written). `--anonymise` replaces customer
//! names everywhere in the export, free text included, by "customer 1", "customer 2", ….

use serde::{Deserialize, Serialize};

use super::{HistoryError, StoredComplaint};
use crate::diagnose::rules::RuleBase;

/// The `format` field of a JSON export.
pub const FORMAT: &str = "rolltriage complaint history";
/// Version of the export layout.
pub const FORMAT_VERSION: i64 = 1;
/// Largest export file `import` reads.
pub const MAX_IMPORT_BYTES: u64 = 512 * 1024 * 1024;

/// A JSON export file.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ExportFile {
    pub format: String,
    pub format_version: i64,
    pub exported_at: String,
    pub anonymised: bool,
    pub complaints: Vec<StoredComplaint>,
}

/// Wrap complaints as an export file.
pub fn export_file(complaints: Vec<StoredComplaint>, anonymise: bool) -> ExportFile {
    let mut file = ExportFile {
        format: FORMAT.into(),
        format_version: FORMAT_VERSION,
        exported_at: super::now_utc(),
        anonymised: anonymise,
        complaints,
    };
    if anonymise {
        anonymise_all(&mut file.complaints);
    }
    file
}

/// Replace every customer name (from any version's complaint record) wherever it appears.
pub fn anonymise_all(complaints: &mut [StoredComplaint]) {
    let mut names: Vec<String> = Vec::new();
    for c in complaints.iter() {
        for v in &c.versions {
            if let Some(name) = &v.complaint.customer
                && !name.trim().is_empty()
                && !names.contains(name)
            {
                names.push(name.clone());
            }
            if let Ok(case) = crate::case::Case::from_yaml_str(&v.case_text, "stored case")
                && let Some(name) = case.complaint.and_then(|c| c.customer)
                && !name.trim().is_empty()
                && !names.contains(&name)
            {
                names.push(name);
            }
        }
    }
    // Longest first, so a name that contains another is replaced whole.
    let mut order: Vec<usize> = (0..names.len()).collect();
    order.sort_by_key(|&i| std::cmp::Reverse(names[i].len()));
    let replace = |text: &str| -> String {
        let mut out = text.to_string();
        for &i in &order {
            out = out.replace(&names[i], &format!("customer {}", i + 1));
        }
        out
    };
    for c in complaints.iter_mut() {
        for v in &mut c.versions {
            v.case_text = replace(&v.case_text);
            for value in [
                &mut v.resolved,
                &mut v.indicators,
                &mut v.causes,
                &mut v.remedies,
            ] {
                replace_in_json(value, &replace);
            }
            let mut record = serde_json::to_value(&v.complaint).unwrap_or_default();
            replace_in_json(&mut record, &replace);
            if let Ok(new) = serde_json::from_value(record) {
                v.complaint = new;
            }
        }
        for s in &mut c.status_changes {
            s.note = s.note.as_deref().map(replace);
        }
    }
}

fn replace_in_json(value: &mut serde_json::Value, replace: &dyn Fn(&str) -> String) {
    match value {
        serde_json::Value::String(s) => *s = replace(s),
        serde_json::Value::Array(items) => {
            for item in items {
                replace_in_json(item, replace);
            }
        }
        serde_json::Value::Object(map) => {
            for item in map.values_mut() {
                replace_in_json(item, replace);
            }
        }
        _ => {}
    }
}

/// The CSV export: one line per complaint (its latest version), columns in plain words.
pub fn to_csv(complaints: &[StoredComplaint]) -> Result<String, HistoryError> {
    let mut writer = csv::Writer::from_writer(Vec::new());
    let error = |e: csv::Error| HistoryError::Input(format!("cannot write CSV: {e}"));
    writer
        .write_record([
            "number",
            "version",
            "reference",
            "received",
            "recorded",
            "source",
            "customer",
            "line",
            "grade",
            "lot",
            "rolls_affected",
            "rolls_checked",
            "found_at",
            "symptoms",
            "status",
            "confirmed_causes",
            "evidence",
            "ranked_first",
            "ranked_top_three",
            "rules_version",
            "title",
        ])
        .map_err(error)?;
    for c in complaints {
        let Some(v) = c.latest() else { continue };
        let r = &v.complaint;
        let symptoms: Vec<String> = v.resolved["symptoms"]
            .as_array()
            .into_iter()
            .flatten()
            .filter_map(|s| s["id"].as_str().map(str::to_string))
            .collect();
        let ranked: Vec<String> = v.ranked_causes().into_iter().map(|c| c.id).collect();
        let evidence: Vec<String> = r
            .confirmed_causes
            .iter()
            .filter_map(|c| c.evidence.clone())
            .collect();
        let count = |n: Option<u32>| n.map(|n| n.to_string()).unwrap_or_default();
        writer
            .write_record([
                c.id.to_string(),
                v.version.to_string(),
                r.reference.clone().unwrap_or_default(),
                r.received.clone().unwrap_or_default(),
                v.recorded_at.clone(),
                r.source.clone().unwrap_or_default(),
                r.customer.clone().unwrap_or_default(),
                r.line.clone().unwrap_or_default(),
                r.grade.clone().unwrap_or_default(),
                r.lot.clone().unwrap_or_default(),
                count(r.rolls_affected),
                count(r.rolls_checked),
                r.found_at.clone().unwrap_or_default(),
                symptoms.join(" "),
                r.status_or_open().to_string(),
                r.confirmed_cause_ids().join(" "),
                evidence.join(" | "),
                ranked.first().cloned().unwrap_or_default(),
                ranked.iter().take(3).cloned().collect::<Vec<_>>().join(" "),
                v.rules_version.clone(),
                v.resolved["title"].as_str().unwrap_or("").to_string(),
            ])
            .map_err(error)?;
    }
    let bytes = writer
        .into_inner()
        .map_err(|e| HistoryError::Input(format!("cannot write CSV: {e}")))?;
    String::from_utf8(bytes).map_err(|e| HistoryError::Input(format!("cannot write CSV: {e}")))
}

/// Read and validate an export file; every problem names the complaint and the field.
/// Nothing is written: the caller stores the result in one transaction.
pub fn read_import(
    bytes: &[u8],
    origin: &str,
    rules: &RuleBase,
) -> Result<Vec<StoredComplaint>, HistoryError> {
    let bad = |message: String| HistoryError::Input(format!("{origin}: {message}"));
    if bytes.len() as u64 > MAX_IMPORT_BYTES {
        return Err(bad(format!(
            "{} bytes is more than the {MAX_IMPORT_BYTES} bytes an import may have",
            bytes.len()
        )));
    }
    let file: ExportFile = serde_json::from_slice(bytes).map_err(|e| {
        bad(format!(
            "not a rolltriage history export (line {}, column {}): {e}",
            e.line(),
            e.column()
        ))
    })?;
    if file.format != FORMAT {
        return Err(bad(format!(
            "format: `{}` is not accepted; accepted: `{FORMAT}`",
            file.format
        )));
    }
    if !(1..=FORMAT_VERSION).contains(&file.format_version) {
        return Err(bad(format!(
            "format_version: {} is not known; accepted: 1 to {FORMAT_VERSION} (a newer rolltriage wrote it?)",
            file.format_version
        )));
    }
    let causes: Vec<&str> = rules.causes.keys().map(String::as_str).collect();
    for (i, c) in file.complaints.iter().enumerate() {
        check_complaint(c, &causes).map_err(|m| bad(format!("complaints[{i}]: {m}")))?;
    }
    Ok(file.complaints)
}

fn check_complaint(c: &StoredComplaint, causes: &[&str]) -> Result<(), String> {
    if c.versions.is_empty() {
        return Err("versions: empty; a complaint has at least one version".into());
    }
    if !is_timestamp(&c.created_at) {
        return Err(format!(
            "created_at: `{}` is not a time; accepted: YYYY-MM-DDTHH:MM:SSZ",
            c.created_at
        ));
    }
    for (j, v) in c.versions.iter().enumerate() {
        let at = format!("versions[{j}]");
        if v.version != j as i64 + 1 {
            return Err(format!(
                "{at}.version: {} where {} was expected (versions count 1, 2, 3, …)",
                v.version,
                j + 1
            ));
        }
        if !is_timestamp(&v.recorded_at) {
            return Err(format!(
                "{at}.recorded_at: `{}` is not a time; accepted: YYYY-MM-DDTHH:MM:SSZ",
                v.recorded_at
            ));
        }
        let case = crate::case::Case::from_yaml_str(&v.case_text, &format!("{at}.case_text"))
            .map_err(|e| e.to_string())?;
        case.resolve_as(&format!("{at}.case_text"))
            .map_err(|e| e.to_string())?;
        v.complaint
            .check(Some(causes))
            .map_err(|m| format!("{at}.{m}"))?;
        serde_json::from_value::<crate::case::ResolvedCase>(v.resolved.clone())
            .map_err(|e| format!("{at}.resolved: {e}"))?;
        serde_json::from_value::<Vec<crate::diagnose::indicators::IndicatorValue>>(
            v.indicators.clone(),
        )
        .map_err(|e| format!("{at}.indicators: {e}"))?;
        serde_json::from_value::<Vec<crate::diagnose::RankedCause>>(v.causes.clone())
            .map_err(|e| format!("{at}.causes: {e}"))?;
    }
    for (j, s) in c.status_changes.iter().enumerate() {
        let at = format!("status_changes[{j}]");
        for status in s.from_status.iter().chain(std::iter::once(&s.to_status)) {
            if !crate::complaint::STATUSES.contains(&status.as_str()) {
                return Err(format!(
                    "{at}: status `{status}` is not accepted; accepted: {}",
                    crate::complaint::STATUSES.join(", ")
                ));
            }
        }
        if s.version < 1 || s.version > c.versions.len() as i64 {
            return Err(format!(
                "{at}.version: {} is not one of the complaint's versions (1 to {})",
                s.version,
                c.versions.len()
            ));
        }
    }
    Ok(())
}

/// `YYYY-MM-DDTHH:MM:SSZ` with a real date.
pub fn is_timestamp(text: &str) -> bool {
    let Some((date, time)) = text.split_once('T') else {
        return false;
    };
    let Some(time) = time.strip_suffix('Z') else {
        return false;
    };
    let parts: Vec<&str> = time.split(':').collect();
    crate::complaint::is_date(date)
        && parts.len() == 3
        && parts
            .iter()
            .zip([24u32, 60, 61])
            .all(|(p, limit)| p.len() == 2 && p.parse::<u32>().is_ok_and(|v| v < limit))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn timestamps_are_checked() {
        assert!(is_timestamp("2026-12-02T09:31:45Z"));
        assert!(!is_timestamp("2026-12-02 09:31:45"));
        assert!(!is_timestamp("2026-12-02T24:00:00Z"));
        assert!(is_timestamp(&super::super::now_utc()));
    }
}
