//! The complaint history on a real PostgreSQL server: the same behaviour as on SQLite
//! (tests/history/store.rs). The server is a throw-away cluster started by tests/pg/start.sh
//! (.ci/run does it); its URL comes in `ROLLTRIAGE_TEST_PG`. Without it these tests pass with
//! a note, so `cargo test --release` needs no server.
//!
//! Each test works in a database of its own, created here with the `postgres` client (test
//! set-up only; the crate reaches PostgreSQL through `rolltriage::history` alone).

use std::process::Command;

use rolltriage::diagnose::{DiagnoseOptions, rules::RuleBase};
use rolltriage::history::{self, Entry, Filter, Location, Store};

const FIXTURE: &str = "tests/history_fixtures/line4_film_telescoping.yaml";

/// A fresh database on the test server, as a URL; `None` (with a note) when no server is set.
fn fresh_database(name: &str) -> Option<String> {
    let Ok(url) = std::env::var("ROLLTRIAGE_TEST_PG") else {
        eprintln!("note: ROLLTRIAGE_TEST_PG is not set; PostgreSQL test `{name}` skipped");
        return None;
    };
    let mut admin = postgres::Client::connect(&url, postgres::NoTls).expect("test server");
    let db = format!("rt_{name}");
    admin
        .batch_execute(&format!("DROP DATABASE IF EXISTS {db}"))
        .unwrap();
    admin
        .batch_execute(&format!("CREATE DATABASE {db}"))
        .unwrap();
    let (base, _) = url.rsplit_once('/').expect("URL with a database");
    Some(format!("{base}/{db}"))
}

fn entry_with(reference: &str, line: &str) -> Entry {
    let rules = RuleBase::embedded().unwrap();
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join(FIXTURE);
    let text = std::fs::read_to_string(path).unwrap();
    let options = DiagnoseOptions {
        what_if: false,
        ..DiagnoseOptions::default()
    };
    let mut e = Entry::compute(&rules, &text, FIXTURE, &options).unwrap();
    let record = e.case.complaint.as_mut().unwrap();
    record.reference = Some(reference.into());
    record.line = Some(line.into());
    e
}

fn open(url: &str) -> Store {
    history::open(&Location::Server(url.to_string()), history::DEFAULT_WAIT).unwrap()
}

fn confirm(store: &mut Store, id: i64, cause: &str) -> i64 {
    store
        .add_version(
            id,
            |previous| {
                let mut next = previous.clone();
                next.change = "confirmed".into();
                next.complaint
                    .confirmed_causes
                    .push(rolltriage::complaint::ConfirmedCause {
                        cause: cause.into(),
                        evidence: Some("trial".into()),
                        ..Default::default()
                    });
                next.complaint.status = Some("cause_confirmed".into());
                Ok(next)
            },
            None,
        )
        .unwrap()
}

#[test]
fn postgres_store_keeps_versions_and_filters_like_sqlite() {
    let Some(url) = fresh_database("versions") else {
        return;
    };
    let mut store = open(&url);
    assert_eq!(store.schema_version().unwrap(), history::SCHEMA_VERSION);
    let a = store.add(&entry_with("A", "4")).unwrap();
    let b = store.add(&entry_with("B", "W3")).unwrap();
    let first = store.get(a).unwrap();
    assert_eq!(confirm(&mut store, a, "tension_too_low"), 2);
    drop(store);
    let mut store = open(&url);
    let after = store.get(a).unwrap();
    assert_eq!(after.versions.len(), 2);
    assert_eq!(after.versions[0], first.versions[0]);
    assert_eq!(after.status_changes.len(), 1);
    let line = Filter {
        line: Some("w3".into()),
        ..Filter::default()
    };
    let ids: Vec<i64> = store.list(&line).unwrap().iter().map(|s| s.id).collect();
    assert_eq!(ids, vec![b]);
    let status = Filter {
        status: Some("cause_confirmed".into()),
        ..Filter::default()
    };
    let ids: Vec<i64> = store.list(&status).unwrap().iter().map(|s| s.id).collect();
    assert_eq!(ids, vec![a]);
    assert_eq!(store.scan_confirmed().unwrap().len(), 1);
    assert_eq!(store.find_reference("B").unwrap(), Some(b));
}

#[test]
fn postgres_eight_writers_lose_nothing() {
    let Some(url) = fresh_database("writers") else {
        return;
    };
    drop(open(&url));
    let entry = entry_with("x", "4");
    std::thread::scope(|scope| {
        for w in 0..8 {
            let (url, entry) = (url.clone(), entry.clone());
            scope.spawn(move || {
                let mut store = open(&url);
                for i in 0..200 {
                    let mut e = entry.clone();
                    e.case.complaint.as_mut().unwrap().reference = Some(format!("w{w}-{i}"));
                    let id = store.add(&e).unwrap();
                    if i % 10 == 0 {
                        confirm(&mut store, id, "tension_too_low");
                    }
                }
            });
        }
    });
    let mut store = open(&url);
    assert_eq!(store.count().unwrap(), 1600);
    assert_eq!(store.scan_confirmed().unwrap().len(), 160);
}

#[test]
fn postgres_two_sessions_confirming_one_complaint_get_distinct_versions() {
    let Some(url) = fresh_database("same_complaint") else {
        return;
    };
    let id = open(&url).add(&entry_with("one", "4")).unwrap();
    std::thread::scope(|scope| {
        for _ in 0..4 {
            let url = url.clone();
            scope.spawn(move || {
                let mut store = open(&url);
                for _ in 0..10 {
                    confirm(&mut store, id, "tension_too_low");
                }
            });
        }
    });
    let c = open(&url).get(id).unwrap();
    assert_eq!(c.versions.len(), 41);
    assert!(
        c.versions
            .iter()
            .enumerate()
            .all(|(i, v)| v.version == i as i64 + 1)
    );
}

#[test]
fn postgres_newer_schema_is_refused_unaltered() {
    let Some(url) = fresh_database("newer") else {
        return;
    };
    drop(open(&url));
    let mut raw = postgres::Client::connect(&url, postgres::NoTls).unwrap();
    raw.batch_execute(
        "INSERT INTO history_schema (version, applied_at, note) VALUES (99, 'later', 'future')",
    )
    .unwrap();
    let err = history::open(&Location::Server(url.clone()), history::DEFAULT_WAIT).unwrap_err();
    assert!(
        matches!(err, history::HistoryError::NewerSchema { found: 99, .. }),
        "{err}"
    );
    let n: i64 = raw
        .query_one("SELECT count(*) FROM history_schema", &[])
        .unwrap()
        .get(0);
    assert_eq!(n, 2);
}

#[test]
fn postgres_through_the_command_line() {
    let Some(url) = fresh_database("cli") else {
        return;
    };
    let run = |args: &[&str]| {
        Command::new(env!("CARGO_BIN_EXE_rolltriage"))
            .args(["history", "--history", &url])
            .args(args)
            .current_dir(env!("CARGO_MANIFEST_DIR"))
            .output()
            .unwrap()
    };
    let out = run(&["add", FIXTURE]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let out = run(&[
        "confirm",
        "1",
        "--cause",
        "tension_too_low",
        "--evidence",
        "trial at 1.7 pli",
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let out = run(&["list", "--status", "cause_confirmed"]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("1 complaint(s)"), "{text}");
    let out = run(&["similar", FIXTURE]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("distance 0.00"), "{text}");
}

#[test]
fn an_unreachable_server_is_a_clear_error() {
    // Port 1 on the local machine: nothing listens there (no server needed for this test).
    let out = Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .args([
            "history",
            "--wait",
            "2",
            "--history",
            "postgres://rolltriage@127.0.0.1:1/none",
            "list",
        ])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("cannot reach the history store postgres://"),
        "{err}"
    );
}
