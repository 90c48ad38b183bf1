//! How the records map to the store's SQL rows, for both servers: the columns read back,
//! the inserts of a complaint, a version and a status change, and the derived key columns of
//! `complaints` (a copy of the latest version's values, with the similarity key).

use serde::Serialize;

use super::records::{
    ComplaintFacts, ComplaintSummary, ScanRow, StatusChange, StoredComplaint, StoredVersion,
};
use super::sql::{Connection, Row, Value};
use super::{HistoryError, similar};
use crate::complaint::Complaint;

/// Words stored space-separated with a space at both ends, so `LIKE '% word %'` finds whole
/// words only.
fn words<S: AsRef<str>>(items: &[S]) -> String {
    let mut out = String::from(" ");
    for item in items {
        out.push_str(item.as_ref());
        out.push(' ');
    }
    out
}

fn split_words(text: Option<&str>) -> Vec<String> {
    text.unwrap_or("")
        .split_whitespace()
        .map(str::to_string)
        .collect()
}

fn json(value: &impl Serialize) -> Result<String, HistoryError> {
    serde_json::to_string(value).map_err(|e| HistoryError::Input(format!("cannot encode: {e}")))
}

/// The derived columns of `complaints` for one version.
pub(super) struct Derived {
    reference: Option<String>,
    title: String,
    received: Option<String>,
    line: Option<String>,
    grade: Option<String>,
    customer: Option<String>,
    status: String,
    symptoms: String,
    places: String,
    material: String,
    confirmed: String,
    ranked: String,
    features: Vec<u8>,
}

impl Derived {
    pub(super) fn of(version: &StoredVersion) -> Derived {
        let c = &version.complaint;
        let resolved = &version.resolved;
        let mut symptoms: Vec<String> = Vec::new();
        let mut places: Vec<String> = Vec::new();
        for s in resolved["symptoms"].as_array().into_iter().flatten() {
            if let Some(id) = s["id"].as_str() {
                if !symptoms.iter().any(|x| x == id) {
                    symptoms.push(id.to_string());
                }
                if let Some(place) = s["where"].as_str() {
                    places.push(format!("{id}@{place}"));
                }
            }
        }
        let ranked: Vec<String> = version
            .causes
            .as_array()
            .into_iter()
            .flatten()
            .filter_map(|c| c["id"].as_str().map(str::to_string))
            .collect();
        let indicators: Vec<crate::diagnose::indicators::IndicatorValue> =
            serde_json::from_value(version.indicators.clone()).unwrap_or_default();
        let material = resolved["web"]["material"].as_str().unwrap_or("");
        let key = similar::Key::new(
            &symptoms,
            &places,
            c.grade.as_deref(),
            material,
            &indicators,
        );
        Derived {
            reference: c.reference.clone(),
            title: resolved["title"].as_str().unwrap_or("").to_string(),
            received: c.received.clone(),
            line: c.line.clone(),
            grade: c.grade.clone(),
            customer: c.customer.clone(),
            status: c.status_or_open().to_string(),
            symptoms: words(&symptoms),
            places: words(&places),
            material: material.to_string(),
            confirmed: words(&c.confirmed_cause_ids()),
            ranked: words(&ranked),
            features: key.encode(),
        }
    }
}

// Both lists read the id, then the facts of `ComplaintFacts` in its order, then the ranking
// (`facts_from`); the summary reads its version and date between the id and the facts.
pub(super) const SUMMARY_COLUMNS: &str = "id, latest_version, created_at, reference, title, received, line, grade, status, symptoms, confirmed, ranked";

pub(super) const SCAN_COLUMNS: &str =
    "id, reference, title, received, line, grade, status, symptoms, confirmed, ranked";

pub(super) const VERSION_COLUMNS: &str = "version, recorded_at, change, app_version, rules_version, case_text, resolved_json, indicators_json, causes_json, remedies_json, complaint_json";

pub(super) fn insert_complaint(
    conn: &mut Connection,
    complaint: &StoredComplaint,
    change_override: Option<&str>,
) -> Result<i64, HistoryError> {
    let Some(last) = complaint.versions.last() else {
        return Err(HistoryError::Input(
            "a complaint without any version cannot be stored".into(),
        ));
    };
    let latest = complaint.versions.len() as i64;
    let d = Derived::of(last);
    let rows = conn.query(
        "INSERT INTO complaints (created_at, latest_version, reference, title, received, line, grade, customer, status, symptoms, places, material, confirmed, ranked, features) \
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id",
        &[
            complaint.created_at.as_str().into(),
            latest.into(),
            d.reference.into(),
            d.title.into(),
            d.received.into(),
            d.line.into(),
            d.grade.into(),
            d.customer.into(),
            d.status.into(),
            d.symptoms.into(),
            d.places.into(),
            d.material.into(),
            d.confirmed.into(),
            d.ranked.into(),
            d.features.into(),
        ],
    )?;
    let Some(id) = rows.first().and_then(|r| r.first()).and_then(Value::int) else {
        return Err(HistoryError::Database {
            place: conn.place(),
            message: "the new complaint got no number".into(),
        });
    };
    for (i, v) in complaint.versions.iter().enumerate() {
        let mut v = v.clone();
        v.version = i as i64 + 1;
        if let Some(change) = change_override
            && i + 1 == complaint.versions.len()
            && complaint.versions.len() == 1
        {
            // A single-version import says where it came from; longer histories keep theirs.
            v.change = change.to_string();
        }
        insert_version(conn, id, &v)?;
    }
    for s in &complaint.status_changes {
        insert_status(conn, id, s)?;
    }
    Ok(id)
}

pub(super) fn insert_version(
    conn: &mut Connection,
    id: i64,
    v: &StoredVersion,
) -> Result<(), HistoryError> {
    conn.execute(
        "INSERT INTO complaint_versions (complaint_id, version, recorded_at, change, app_version, rules_version, case_text, resolved_json, indicators_json, causes_json, remedies_json, complaint_json) \
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)",
        &[
            id.into(),
            v.version.into(),
            v.recorded_at.as_str().into(),
            v.change.as_str().into(),
            v.app_version.as_str().into(),
            v.rules_version.as_str().into(),
            v.case_text.as_str().into(),
            json(&v.resolved)?.into(),
            json(&v.indicators)?.into(),
            json(&v.causes)?.into(),
            json(&v.remedies)?.into(),
            json(&v.complaint)?.into(),
        ],
    )?;
    Ok(())
}

pub(super) fn insert_status(
    conn: &mut Connection,
    id: i64,
    s: &StatusChange,
) -> Result<(), HistoryError> {
    conn.execute(
        "INSERT INTO status_changes (complaint_id, version, changed_at, from_status, to_status, note) VALUES (?, ?, ?, ?, ?, ?)",
        &[
            id.into(),
            s.version.into(),
            s.changed_at.as_str().into(),
            s.from_status.clone().into(),
            s.to_status.as_str().into(),
            s.note.clone().into(),
        ],
    )?;
    Ok(())
}

pub(super) fn update_derived(
    conn: &mut Connection,
    id: i64,
    d: &Derived,
) -> Result<(), HistoryError> {
    conn.execute(
        "UPDATE complaints SET reference = ?, title = ?, received = ?, line = ?, grade = ?, customer = ?, status = ?, symptoms = ?, places = ?, material = ?, confirmed = ?, ranked = ?, features = ? WHERE id = ?",
        &[
            d.reference.clone().into(),
            d.title.as_str().into(),
            d.received.clone().into(),
            d.line.clone().into(),
            d.grade.clone().into(),
            d.customer.clone().into(),
            d.status.as_str().into(),
            d.symptoms.as_str().into(),
            d.places.as_str().into(),
            d.material.as_str().into(),
            d.confirmed.as_str().into(),
            d.ranked.as_str().into(),
            d.features.clone().into(),
            id.into(),
        ],
    )?;
    Ok(())
}

pub(super) fn read_version(
    conn: &mut Connection,
    place: &str,
    id: i64,
    version: i64,
) -> Result<StoredVersion, HistoryError> {
    let sql = format!(
        "SELECT {VERSION_COLUMNS} FROM complaint_versions WHERE complaint_id = ? AND version = ?"
    );
    let rows = conn.query(&sql, &[id.into(), version.into()])?;
    let Some(row) = rows.into_iter().next() else {
        return Err(HistoryError::Damaged {
            place: place.to_string(),
            id,
            version,
            message: "the version is missing".into(),
        });
    };
    version_from_row(place, id, row)
}

pub(super) fn version_from_row(
    place: &str,
    id: i64,
    row: Row,
) -> Result<StoredVersion, HistoryError> {
    let mut it = row.into_iter();
    let mut next = || it.next().unwrap_or(Value::Text(None));
    let version = next().int().unwrap_or(0);
    let damaged = |message: String| HistoryError::Damaged {
        place: place.to_string(),
        id,
        version,
        message,
    };
    let recorded_at = next().into_text().unwrap_or_default();
    let change = next().into_text().unwrap_or_default();
    let app_version = next().into_text().unwrap_or_default();
    let rules_version = next().into_text().unwrap_or_default();
    let case_text = next().into_text().unwrap_or_default();
    let mut parse = |what: &str| -> Result<serde_json::Value, HistoryError> {
        let text = next().into_text().unwrap_or_default();
        serde_json::from_str(&text).map_err(|e| damaged(format!("{what}: {e}")))
    };
    let resolved = parse("resolved inputs")?;
    let indicators = parse("indicators")?;
    let causes = parse("ranking")?;
    let remedies = parse("remedies")?;
    let complaint_value = parse("complaint record")?;
    let complaint: Complaint = serde_json::from_value(complaint_value)
        .map_err(|e| damaged(format!("complaint record: {e}")))?;
    Ok(StoredVersion {
        version,
        recorded_at,
        change,
        app_version,
        rules_version,
        case_text,
        resolved,
        indicators,
        causes,
        remedies,
        complaint,
    })
}

/// The [`ComplaintFacts`] columns, in their order.
fn facts_from(next: &mut impl FnMut() -> Value) -> ComplaintFacts {
    ComplaintFacts {
        reference: next().into_text(),
        title: next().into_text().unwrap_or_default(),
        received: next().into_text(),
        line: next().into_text(),
        grade: next().into_text(),
        status: next().into_text().unwrap_or_default(),
        symptoms: split_words(next().text()),
        confirmed: split_words(next().text()),
    }
}

pub(super) fn summary_from_row(row: Row) -> ComplaintSummary {
    let mut it = row.into_iter();
    let mut next = || it.next().unwrap_or(Value::Text(None));
    let id = next().int().unwrap_or(0);
    let version = next().int().unwrap_or(0);
    let recorded = next().into_text().unwrap_or_default();
    let facts = facts_from(&mut next);
    let ranked_first = split_words(next().text()).into_iter().next();
    ComplaintSummary {
        id,
        version,
        reference: facts.reference,
        title: facts.title,
        received: facts.received,
        recorded,
        line: facts.line,
        grade: facts.grade,
        status: facts.status,
        symptoms: facts.symptoms,
        confirmed: facts.confirmed,
        ranked_first,
    }
}

pub(super) fn scan_from_row(row: Row) -> ScanRow {
    let mut it = row.into_iter();
    let mut next = || it.next().unwrap_or(Value::Text(None));
    ScanRow {
        id: next().int().unwrap_or(0),
        facts: facts_from(&mut next),
        ranked: split_words(next().text()),
    }
}
