//! The store's operations, written once for both servers: add a complaint, add a version
//! (edit, confirmation, status change), read one, list with filters, scan for the similarity
//! search and the site experience, and write imported complaints. Versions are only ever
//! inserted; the `complaints` row keeps a copy of the latest version's key values. The records
//! are in `records`, their SQL rows in `rows`.

use super::records::{
    ComplaintSummary, Entry, Filter, ScanRow, StatusChange, StoredComplaint, StoredVersion,
};
use super::rows::{
    Derived, SCAN_COLUMNS, SUMMARY_COLUMNS, VERSION_COLUMNS, insert_complaint, insert_status,
    insert_version, read_version, scan_from_row, summary_from_row, update_derived,
    version_from_row,
};
use super::sql::{Connection, Kind, Value};
use super::{HistoryError, migrate, similar};

/// An open history store.
#[derive(Debug)]
pub struct Store {
    conn: Connection,
}

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
        self.scan_where("")
    }

    /// Only complaints with a confirmed cause (the site experience and performance need no more).
    pub fn scan_confirmed(&mut self) -> Result<Vec<ScanRow>, HistoryError> {
        self.scan_where("WHERE confirmed <> ' '")
    }

    /// The key values of the complaints a fixed `WHERE` clause selects (empty: all), oldest
    /// first, read row by row.
    fn scan_where(&mut self, condition: &str) -> Result<Vec<ScanRow>, HistoryError> {
        let sql = format!("SELECT {SCAN_COLUMNS} FROM complaints {condition} ORDER BY id");
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
