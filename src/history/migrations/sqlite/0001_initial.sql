-- rolltriage complaint history, schema version 1 (SQLite). docs/history.md describes every column.
-- The PostgreSQL file of the same number creates the same tables with that server's types.

CREATE TABLE history_schema (
    version     INTEGER PRIMARY KEY,
    applied_at  TEXT NOT NULL,
    note        TEXT NOT NULL
);

-- One row per complaint. The columns after latest_version repeat the latest version's values
-- so that lists, filters and the similarity scan read one narrow row per complaint.
CREATE TABLE complaints (
    id              INTEGER PRIMARY KEY AUTOINCREMENT,
    created_at      TEXT NOT NULL,
    latest_version  INTEGER NOT NULL,
    reference       TEXT,
    title           TEXT NOT NULL,
    received        TEXT,
    line            TEXT,
    grade           TEXT,
    customer        TEXT,
    status          TEXT NOT NULL,
    symptoms        TEXT NOT NULL,
    places          TEXT NOT NULL,
    material        TEXT NOT NULL,
    confirmed       TEXT NOT NULL,
    ranked          TEXT NOT NULL,
    features        BLOB NOT NULL
);
CREATE INDEX complaints_reference ON complaints (reference);
CREATE INDEX complaints_received ON complaints (received);

-- Every version of every complaint, never updated: an edit, a confirmation or a status
-- change writes a new version.
CREATE TABLE complaint_versions (
    complaint_id    INTEGER NOT NULL REFERENCES complaints (id),
    version         INTEGER NOT NULL,
    recorded_at     TEXT NOT NULL,
    change          TEXT NOT NULL,
    app_version     TEXT NOT NULL,
    rules_version   TEXT NOT NULL,
    case_text       TEXT NOT NULL,
    resolved_json   TEXT NOT NULL,
    indicators_json TEXT NOT NULL,
    causes_json     TEXT NOT NULL,
    remedies_json   TEXT NOT NULL,
    complaint_json  TEXT NOT NULL,
    PRIMARY KEY (complaint_id, version)
);

CREATE TABLE status_changes (
    complaint_id    INTEGER NOT NULL REFERENCES complaints (id),
    version         INTEGER NOT NULL,
    changed_at      TEXT NOT NULL,
    from_status     TEXT,
    to_status       TEXT NOT NULL,
    note            TEXT
);
CREATE INDEX status_changes_complaint ON status_changes (complaint_id);
