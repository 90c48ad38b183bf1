//! The store's operations, written once for both servers: add a complaint, add a version
//! (edit, confirmation, status change), read one, list with filters, scan for the similarity
//! search and the site experience, and write imported complaints. Versions are only ever
//! inserted; the `complaints` row keeps a copy of the latest version's key values.

use serde::{Deserialize, Serialize};

use super::sql::{Connection, Kind, Row, Value};
use super::{HistoryError, migrate, similar};
use crate::complaint::Complaint;
use crate::diagnose::{Diagnosis, RankedCause};

/// An open history store.
#[derive(Debug)]
pub struct Store {
    conn: Connection,
}

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
struct Derived {
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
    fn of(version: &StoredVersion) -> Derived {
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

// Both lists read the id, then the facts of `ComplaintFacts` in its order, then the ranking
// (`facts_from`); the summary reads its version and date between the id and the facts.
const SUMMARY_COLUMNS: &str = "id, latest_version, created_at, reference, title, received, line, grade, status, symptoms, confirmed, ranked";

const SCAN_COLUMNS: &str =
    "id, reference, title, received, line, grade, status, symptoms, confirmed, ranked";

const VERSION_COLUMNS: &str = "version, recorded_at, change, app_version, rules_version, case_text, resolved_json, indicators_json, causes_json, remedies_json, complaint_json";

impl Store {
    /// Check the schema (refusing a newer one unaltered), switch a SQLite file to WAL, apply
    /// pending migrations.
    pub(super) fn from_connection(mut conn: Connection) -> Result<Store, HistoryError> {
        migrate::check(&mut conn)?;
        if conn.kind() == Kind::Sqlite {
            // WAL lets readers go on while one writer writes; NORMAL sync is durable at every
            // checkpoint and never corrupts on a crash (SQLite documentation, "WAL mode").
            conn.batch("PRAGMA journal_mode = WAL; PRAGMA synchronous = NORMAL;")?;
        }
        migrate::apply(&mut conn)?;
        Ok(Store { conn })
    }

    /// Where the store is, for messages.
    pub fn place(&self) -> String {
        self.conn.place()
    }

    /// Run `work` in one write transaction: all of it is stored, or none.
    fn write<T>(
        &mut self,
        work: impl FnOnce(&mut Connection) -> Result<T, HistoryError>,
    ) -> Result<T, HistoryError> {
        self.conn.begin_write()?;
        match work(&mut self.conn) {
            Ok(v) => {
                self.conn.commit()?;
                Ok(v)
            }
            Err(e) => {
                self.conn.rollback();
                Err(e)
            }
        }
    }

    /// Store a new complaint; its number.
    pub fn add(&mut self, entry: &Entry) -> Result<i64, HistoryError> {
        let version = StoredVersion::from_entry(entry, "added")?;
        let stored = StoredComplaint {
            id: 0,
            created_at: version.recorded_at.clone(),
            versions: vec![version],
            status_changes: Vec::new(),
        };
        self.write(|conn| insert_complaint(conn, &stored, None))
    }

    /// Store complaints read from an export, all or none; their new numbers.
    pub fn import(&mut self, complaints: &[StoredComplaint]) -> Result<Vec<i64>, HistoryError> {
        self.write(|conn| {
            complaints
                .iter()
                .map(|c| insert_complaint(conn, c, Some("imported")))
                .collect()
        })
    }

    /// Record a new version of complaint `id` made by `change` applied to its latest version;
    /// `status_note` is recorded with a status change. The new version number.
    pub fn add_version(
        &mut self,
        id: i64,
        change: impl FnOnce(&StoredVersion) -> Result<StoredVersion, HistoryError>,
        status_note: Option<&str>,
    ) -> Result<i64, HistoryError> {
        let place = self.place();
        self.write(|conn| {
            // Taking the next number first locks the complaint's row (PostgreSQL) or the file
            // (SQLite), so two confirmations of one complaint get distinct versions.
            let rows = conn.query(
                "UPDATE complaints SET latest_version = latest_version + 1 WHERE id = ? RETURNING latest_version",
                &[id.into()],
            )?;
            let Some(next) = rows.first().and_then(|r| r.first()).and_then(Value::int) else {
                return Err(HistoryError::NoSuchComplaint { place, id });
            };
            let previous = read_version(conn, &place, id, next - 1)?;
            let mut new = change(&previous)?;
            new.version = next;
            insert_version(conn, id, &new)?;
            let (from, to) = (
                previous.complaint.status_or_open(),
                new.complaint.status_or_open(),
            );
            if from != to {
                insert_status(
                    conn,
                    id,
                    &StatusChange {
                        version: next,
                        changed_at: new.recorded_at.clone(),
                        from_status: Some(from.to_string()),
                        to_status: to.to_string(),
                        note: status_note.map(str::to_string),
                    },
                )?;
            }
            update_derived(conn, id, &Derived::of(&new))?;
            Ok(next)
        })
    }

    /// The number of the complaint with this reference, if one is stored.
    pub fn find_reference(&mut self, reference: &str) -> Result<Option<i64>, HistoryError> {
        let rows = self.conn.query(
            "SELECT id FROM complaints WHERE reference = ? ORDER BY id LIMIT 1",
            &[reference.into()],
        )?;
        Ok(rows.first().and_then(|r| r.first()).and_then(Value::int))
    }

    /// One complaint with every version and status change.
    pub fn get(&mut self, id: i64) -> Result<StoredComplaint, HistoryError> {
        let place = self.place();
        let head = self.conn.query(
            "SELECT created_at, latest_version FROM complaints WHERE id = ?",
            &[id.into()],
        )?;
        let Some(row) = head.into_iter().next() else {
            return Err(HistoryError::NoSuchComplaint { place, id });
        };
        let created_at = row[0].text().unwrap_or("").to_string();
        let latest = row[1].int().unwrap_or(0);
        let sql = format!(
            "SELECT {VERSION_COLUMNS} FROM complaint_versions WHERE complaint_id = ? AND version <= ? ORDER BY version"
        );
        let rows = self.conn.query(&sql, &[id.into(), latest.into()])?;
        let versions = rows
            .into_iter()
            .map(|r| version_from_row(&place, id, r))
            .collect::<Result<Vec<_>, _>>()?;
        let rows = self.conn.query(
            "SELECT version, changed_at, from_status, to_status, note FROM status_changes WHERE complaint_id = ? AND version <= ? ORDER BY version",
            &[id.into(), latest.into()],
        )?;
        let status_changes = rows
            .into_iter()
            .map(|r| {
                let mut it = r.into_iter();
                let mut next = || it.next().unwrap_or(Value::Text(None));
                StatusChange {
                    version: next().int().unwrap_or(0),
                    changed_at: next().into_text().unwrap_or_default(),
                    from_status: next().into_text(),
                    to_status: next().into_text().unwrap_or_default(),
                    note: next().into_text(),
                }
            })
            .collect();
        Ok(StoredComplaint {
            id,
            created_at,
            versions,
            status_changes,
        })
    }

    /// Every complaint number, oldest first.
    pub fn ids(&mut self) -> Result<Vec<i64>, HistoryError> {
        let rows = self
            .conn
            .query("SELECT id FROM complaints ORDER BY id", &[])?;
        Ok(rows.iter().filter_map(|r| r.first()?.int()).collect())
    }

    /// Number of complaints stored.
    pub fn count(&mut self) -> Result<i64, HistoryError> {
        let rows = self.conn.query("SELECT count(*) FROM complaints", &[])?;
        Ok(rows
            .first()
            .and_then(|r| r.first())
            .and_then(Value::int)
            .unwrap_or(0))
    }

    /// Complaints matching `filter`, newest first.
    pub fn list(&mut self, filter: &Filter) -> Result<Vec<ComplaintSummary>, HistoryError> {
        let mut sql = format!("SELECT {SUMMARY_COLUMNS} FROM complaints WHERE 1 = 1");
        let mut params: Vec<Value> = Vec::new();
        // Line and grade compare without regard to case; symptoms and status are IDs.
        const RECEIVED: &str = "coalesce(received, substr(created_at, 1, 10))";
        let conditions = [
            (
                filter.line.clone(),
                " AND lower(line) = lower(?)".to_string(),
            ),
            (
                filter.grade.clone(),
                " AND lower(grade) = lower(?)".to_string(),
            ),
            (
                filter.symptom.as_ref().map(|s| format!("% {s} %")),
                " AND symptoms LIKE ?".to_string(),
            ),
            (filter.status.clone(), " AND status = ?".to_string()),
            (filter.from.clone(), format!(" AND {RECEIVED} >= ?")),
            (filter.to.clone(), format!(" AND {RECEIVED} <= ?")),
        ];
        for (value, clause) in conditions {
            if let Some(value) = value {
                sql.push_str(&clause);
                params.push(value.into());
            }
        }
        sql.push_str(" ORDER BY id DESC");
        let rows = self.conn.query(&sql, &params)?;
        Ok(rows.into_iter().map(summary_from_row).collect())
    }

    /// Every complaint's similarity key (the one wide scan of the similarity search).
    pub fn similarity_keys(&mut self) -> Result<Vec<(i64, similar::Key)>, HistoryError> {
        let mut out = Vec::new();
        self.conn
            .query_each("SELECT id, features FROM complaints", &[], |row| {
                let id = row.first().and_then(Value::int).unwrap_or(0);
                let key = similar::Key::decode(row.get(1).and_then(Value::blob).unwrap_or(&[]));
                out.push((id, key));
                Ok(())
            })?;
        Ok(out)
    }

    /// The key values of the listed complaints (any order; missing numbers are left out).
    pub fn rows(&mut self, ids: &[i64]) -> Result<Vec<ScanRow>, HistoryError> {
        let mut out = Vec::with_capacity(ids.len());
        let sql = format!("SELECT {SCAN_COLUMNS} FROM complaints WHERE id = ?");
        for id in ids {
            let rows = self.conn.query(&sql, &[(*id).into()])?;
            out.extend(rows.into_iter().map(scan_from_row));
        }
        Ok(out)
    }

    /// Every complaint's key values, oldest first.
    pub fn scan(&mut self) -> Result<Vec<ScanRow>, HistoryError> {
        let sql = format!("SELECT {SCAN_COLUMNS} FROM complaints ORDER BY id");
        let mut out = Vec::new();
        self.conn.query_each(&sql, &[], |row| {
            out.push(scan_from_row(row));
            Ok(())
        })?;
        Ok(out)
    }

    /// Only complaints with a confirmed cause (the site experience and performance need no more).
    pub fn scan_confirmed(&mut self) -> Result<Vec<ScanRow>, HistoryError> {
        let sql =
            format!("SELECT {SCAN_COLUMNS} FROM complaints WHERE confirmed <> ' ' ORDER BY id");
        let mut out = Vec::new();
        self.conn.query_each(&sql, &[], |row| {
            out.push(scan_from_row(row));
            Ok(())
        })?;
        Ok(out)
    }

    /// The schema version of the open store.
    pub fn schema_version(&mut self) -> Result<i64, HistoryError> {
        let rows = self
            .conn
            .query("SELECT max(version) FROM history_schema", &[])?;
        Ok(rows
            .first()
            .and_then(|r| r.first())
            .and_then(Value::int)
            .unwrap_or(0))
    }

    /// SQLite only: `PRAGMA integrity_check` says `ok` (tests, and `history check`).
    pub fn integrity_ok(&mut self) -> Result<bool, HistoryError> {
        match self.conn.kind() {
            Kind::Sqlite => {
                let rows = self.conn.query("PRAGMA integrity_check", &[])?;
                Ok(rows.len() == 1 && rows[0].first().and_then(Value::text) == Some("ok"))
            }
            Kind::Postgres => Ok(true),
        }
    }
}

fn insert_complaint(
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

fn insert_version(conn: &mut Connection, id: i64, v: &StoredVersion) -> Result<(), HistoryError> {
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

fn insert_status(conn: &mut Connection, id: i64, s: &StatusChange) -> Result<(), HistoryError> {
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

fn update_derived(conn: &mut Connection, id: i64, d: &Derived) -> Result<(), HistoryError> {
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

fn read_version(
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

fn version_from_row(place: &str, id: i64, row: Row) -> Result<StoredVersion, HistoryError> {
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

fn summary_from_row(row: Row) -> ComplaintSummary {
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

fn scan_from_row(row: Row) -> ScanRow {
    let mut it = row.into_iter();
    let mut next = || it.next().unwrap_or(Value::Text(None));
    ScanRow {
        id: next().int().unwrap_or(0),
        facts: facts_from(&mut next),
        ranked: split_words(next().text()),
    }
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
