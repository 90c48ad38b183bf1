//! Versioned schema migrations (src/history/migrations/<server>/NNNN_name.sql), applied in
//! order when a store is opened. Each runs in its own write transaction together with the row
//! that records it in `history_schema`, so a store is always at exactly one version.

use super::HistoryError;
use super::sql::{Connection, Kind, Value};

struct Migration {
    version: i64,
    note: &'static str,
    sqlite: &'static str,
    postgres: &'static str,
}

const MIGRATIONS: &[Migration] = &[Migration {
    version: 1,
    note: "complaints, versions, status changes",
    sqlite: include_str!("migrations/sqlite/0001_initial.sql"),
    postgres: include_str!("migrations/postgres/0001_initial.sql"),
}];

/// The newest schema version this build knows.
pub const LATEST: i64 = 1;

/// An arbitrary fixed key: PostgreSQL sessions migrating the same database take turns.
const POSTGRES_MIGRATION_LOCK: i64 = 0x726f_6c6c_7472;

fn current_version(conn: &mut Connection) -> Result<Option<i64>, HistoryError> {
    if !conn.has_table("history_schema")? {
        return Ok(None);
    }
    let rows = conn.query("SELECT max(version) FROM history_schema", &[])?;
    Ok(Some(
        rows.first()
            .and_then(|r| r.first())
            .and_then(Value::int)
            .unwrap_or(0),
    ))
}

/// Check the store's version without writing anything: a newer schema, or a database of some
/// other program, is refused before any change.
pub fn check(conn: &mut Connection) -> Result<(), HistoryError> {
    match current_version(conn)? {
        Some(found) if found > LATEST => Err(HistoryError::NewerSchema {
            place: conn.place(),
            found,
            known: LATEST,
        }),
        Some(_) => Ok(()),
        None => {
            let foreign = match conn.kind() {
                // A SQLite file is ours alone: any table means it belongs to someone else.
                Kind::Sqlite => conn.table_count()? > 0,
                // A PostgreSQL database may hold other tables; ours must not be half there.
                Kind::Postgres => conn.has_table("complaints")?,
            };
            if foreign {
                Err(HistoryError::NotAStore {
                    place: conn.place(),
                    message: "it holds tables but no `history_schema` table".into(),
                })
            } else {
                Ok(())
            }
        }
    }
}

/// Apply every migration newer than the store's version.
pub fn apply(conn: &mut Connection) -> Result<(), HistoryError> {
    if current_version(conn)?.is_some_and(|v| v >= LATEST) {
        return Ok(());
    }
    for migration in MIGRATIONS {
        conn.begin_write()?;
        let result = apply_one(conn, migration);
        match result {
            Ok(()) => conn.commit()?,
            Err(e) => {
                conn.rollback();
                return Err(e);
            }
        }
    }
    Ok(())
}

fn apply_one(conn: &mut Connection, migration: &Migration) -> Result<(), HistoryError> {
    if conn.kind() == Kind::Postgres {
        conn.execute(
            "SELECT pg_advisory_xact_lock(?)",
            &[POSTGRES_MIGRATION_LOCK.into()],
        )?;
    }
    // Someone else may have migrated while this connection waited for the lock.
    let now = current_version(conn)?;
    if let Some(v) = now {
        if v > LATEST {
            return Err(HistoryError::NewerSchema {
                place: conn.place(),
                found: v,
                known: LATEST,
            });
        }
        if v >= migration.version {
            return Ok(());
        }
    }
    let sql = match conn.kind() {
        Kind::Sqlite => migration.sqlite,
        Kind::Postgres => migration.postgres,
    };
    conn.batch(sql)?;
    conn.execute(
        "INSERT INTO history_schema (version, applied_at, note) VALUES (?, ?, ?)",
        &[
            migration.version.into(),
            super::now_utc().into(),
            migration.note.into(),
        ],
    )?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn migrations_are_numbered_one_after_another() {
        for (i, m) in MIGRATIONS.iter().enumerate() {
            assert_eq!(m.version, i as i64 + 1);
        }
        assert_eq!(MIGRATIONS.last().map(|m| m.version), Some(LATEST));
    }
}
