//! The complaint history store on SQLite files on disk: versions are never overwritten,
//! filters, several writer processes at once, a writer killed mid-write, and the same
//! behaviour through the library API that the PostgreSQL tests (tests/history/pg.rs) repeat.
//!
//! The writer processes are this test binary started again on one `#[ignore]`d test
//! (`child_*`), so they are real processes with their own connections and file locks.

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::sync::OnceLock;
use std::time::{Duration, Instant};

use rolltriage::diagnose::{DiagnoseOptions, rules::RuleBase};
use rolltriage::history::{self, Entry, Filter, Location, Store, StoredComplaint};

pub const FIXTURE: &str = "tests/history_fixtures/line4_film_telescoping.yaml";

fn fixture_path() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join(FIXTURE)
}

/// The fixture complaint, diagnosed once per process (no what-if: speed).
fn entry() -> Entry {
    static ENTRY: OnceLock<Entry> = OnceLock::new();
    ENTRY
        .get_or_init(|| {
            let rules = RuleBase::embedded().unwrap();
            let text = std::fs::read_to_string(fixture_path()).unwrap();
            let options = DiagnoseOptions {
                what_if: false,
                ..DiagnoseOptions::default()
            };
            Entry::compute(&rules, &text, FIXTURE, &options).unwrap()
        })
        .clone()
}

/// The fixture with another reference (and optionally another line and symptom place).
fn entry_with(reference: &str, line: Option<&str>) -> Entry {
    let mut e = entry();
    let record = e.case.complaint.get_or_insert_with(Default::default);
    record.reference = Some(reference.to_string());
    if let Some(l) = line {
        record.line = Some(l.to_string());
    }
    e
}

fn open(path: &Path) -> Store {
    history::open(&Location::File(path.to_path_buf()), history::DEFAULT_WAIT).unwrap()
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
                        cause: cause.to_string(),
                        evidence: Some("trial".into()),
                        ..Default::default()
                    });
                next.complaint.status = Some("cause_confirmed".into());
                Ok(next)
            },
            Some("confirmed in a trial"),
        )
        .unwrap()
}

#[test]
fn a_confirmation_is_a_new_version_and_the_old_one_stays() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("h.sqlite");
    let mut store = open(&path);
    let id = store.add(&entry()).unwrap();
    let first = store.get(id).unwrap();
    assert_eq!(first.versions.len(), 1);
    assert_eq!(
        first.versions[0].complaint.status.as_deref(),
        Some("contained")
    );
    assert_eq!(confirm(&mut store, id, "tension_too_low"), 2);
    drop(store);

    // A new connection sees both versions, the first unchanged, and the status change.
    let mut store = open(&path);
    let after = store.get(id).unwrap();
    assert_eq!(after.versions.len(), 2);
    assert_eq!(after.versions[0], first.versions[0]);
    assert_eq!(
        after.versions[1].complaint.status.as_deref(),
        Some("cause_confirmed")
    );
    assert_eq!(after.versions[1].case_text, first.versions[0].case_text);
    assert_eq!(after.status_changes.len(), 1);
    assert_eq!(
        after.status_changes[0].from_status.as_deref(),
        Some("contained")
    );
    // Stored per complaint: case as entered, resolved inputs, indicators, ranking, remedies,
    // rule-base version, complaint record.
    let v = &after.versions[0];
    assert!(v.case_text.contains("HF-2026-031"));
    assert_eq!(v.resolved["web"]["material"], "film");
    assert!(v.indicators.as_array().is_some_and(|a| a.len() > 30));
    assert!(!v.ranked_causes().is_empty());
    assert!(v.remedies["remedies"].as_array().is_some());
    assert!(v.rules_version.contains("rules "));
    assert!(store.integrity_ok().unwrap());
}

#[test]
fn list_filters_by_line_grade_symptom_status_and_dates() {
    let dir = tempfile::tempdir().unwrap();
    let mut store = open(&dir.path().join("h.sqlite"));
    let a = store.add(&entry_with("A", Some("4"))).unwrap();
    let mut other = entry_with("B", Some("W3"));
    other.case.complaint.as_mut().unwrap().received = Some("2026-10-01".into());
    other.case.complaint.as_mut().unwrap().grade = Some("BOPP 30".into());
    let b = store.add(&other).unwrap();
    confirm(&mut store, b, "air_entrainment");
    let ids = |store: &mut Store, f: Filter| -> Vec<i64> {
        store.list(&f).unwrap().iter().map(|s| s.id).collect()
    };
    assert_eq!(ids(&mut store, Filter::default()), vec![b, a]);
    let line = |l: &str| Filter {
        line: Some(l.into()),
        ..Filter::default()
    };
    assert_eq!(ids(&mut store, line("4")), vec![a]);
    assert_eq!(ids(&mut store, line("w3")), vec![b]);
    let grade = Filter {
        grade: Some("pet 23".into()),
        ..Filter::default()
    };
    assert_eq!(ids(&mut store, grade), vec![a]);
    let status = Filter {
        status: Some("cause_confirmed".into()),
        ..Filter::default()
    };
    assert_eq!(ids(&mut store, status), vec![b]);
    let symptom = |s: &str| Filter {
        symptom: Some(s.into()),
        ..Filter::default()
    };
    assert_eq!(ids(&mut store, symptom("telescoping")).len(), 2);
    assert!(ids(&mut store, symptom("telescop")).is_empty());
    let dates = Filter {
        from: Some("2026-11-01".into()),
        to: Some("2026-11-30".into()),
        ..Filter::default()
    };
    assert_eq!(ids(&mut store, dates), vec![a]);
}

#[test]
fn a_reference_is_found_again() {
    let dir = tempfile::tempdir().unwrap();
    let mut store = open(&dir.path().join("h.sqlite"));
    let id = store.add(&entry()).unwrap();
    assert_eq!(store.find_reference("HF-2026-031").unwrap(), Some(id));
    assert_eq!(store.find_reference("nope").unwrap(), None);
    assert!(matches!(
        store.get(id + 100),
        Err(history::HistoryError::NoSuchComplaint { .. })
    ));
}

// ---------------------------------------------------------------------------------------------
// Several processes.

const WRITERS: usize = 8;
const PER_WRITER: usize = 200;

fn child(test: &str, envs: &[(&str, String)]) -> Command {
    let mut c = Command::new(std::env::current_exe().unwrap());
    c.args([
        test,
        "--exact",
        "--ignored",
        "--nocapture",
        "--test-threads",
        "1",
    ]);
    for (k, v) in envs {
        c.env(k, v);
    }
    c.stdout(Stdio::null()).stderr(Stdio::piped());
    c
}

/// Child process: add `PER_WRITER` complaints one transaction each, confirming every tenth.
#[test]
#[ignore = "started by eight_writer_processes_lose_nothing"]
fn child_writer() {
    let Ok(path) = std::env::var("HISTORY_TEST_STORE") else {
        return;
    };
    let tag = std::env::var("HISTORY_TEST_TAG").unwrap();
    let mut store = history::open(
        &Location::File(PathBuf::from(path)),
        Duration::from_secs(60),
    )
    .unwrap();
    for i in 0..PER_WRITER {
        let id = store.add(&entry_with(&format!("{tag}-{i}"), None)).unwrap();
        if i % 10 == 0 {
            confirm(&mut store, id, "tension_too_low");
        }
    }
}

#[test]
fn eight_writer_processes_lose_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("shared.sqlite");
    drop(open(&path));
    let children: Vec<_> = (0..WRITERS)
        .map(|w| {
            child(
                "store::child_writer",
                &[
                    ("HISTORY_TEST_STORE", path.display().to_string()),
                    ("HISTORY_TEST_TAG", format!("w{w}")),
                ],
            )
            .spawn()
            .unwrap()
        })
        .collect();
    for c in children {
        let out = c.wait_with_output().unwrap();
        assert!(
            out.status.success(),
            "a writer failed: {}",
            String::from_utf8_lossy(&out.stderr)
        );
    }
    let mut store = open(&path);
    assert!(store.integrity_ok().unwrap());
    assert_eq!(store.count().unwrap(), (WRITERS * PER_WRITER) as i64);
    let rows = store.scan().unwrap();
    let mut references: Vec<String> = rows
        .iter()
        .filter_map(|r| r.facts.reference.clone())
        .collect();
    references.sort();
    references.dedup();
    assert_eq!(references.len(), WRITERS * PER_WRITER);
    let confirmed = store.scan_confirmed().unwrap();
    assert_eq!(confirmed.len(), WRITERS * PER_WRITER / 10);
    for r in confirmed.iter().take(20) {
        let c = store.get(r.id).unwrap();
        assert_eq!(c.versions.len(), 2);
        assert_eq!(c.status_changes.len(), 1);
    }
}

/// Child process: import many complaints in one transaction (killed by the parent).
#[test]
#[ignore = "started by a_writer_killed_mid_write_leaves_the_store_consistent"]
fn child_big_import() {
    let Ok(path) = std::env::var("HISTORY_TEST_STORE") else {
        return;
    };
    let mut store = open(Path::new(&path));
    let e = entry();
    let version = history::StoredVersion::from_entry(&e, "added").unwrap();
    let many: Vec<StoredComplaint> = (0..BIG_IMPORT)
        .map(|_| StoredComplaint {
            id: 0,
            created_at: version.recorded_at.clone(),
            versions: vec![version.clone()],
            status_changes: Vec::new(),
        })
        .collect();
    ready();
    store.import(&many).unwrap();
}

/// Child process: add complaints one by one until killed.
#[test]
#[ignore = "started by a_writer_killed_mid_write_leaves_the_store_consistent"]
fn child_endless_adds() {
    let Ok(path) = std::env::var("HISTORY_TEST_STORE") else {
        return;
    };
    let mut store = open(Path::new(&path));
    ready();
    for i in 0..100_000 {
        store.add(&entry_with(&format!("k{i}"), None)).unwrap();
    }
}

const BIG_IMPORT: usize = 2_000;

/// Child side: say "about to write" through a marker file.
fn ready() {
    if let Ok(marker) = std::env::var("HISTORY_TEST_READY") {
        std::fs::write(marker, b"ready").unwrap();
    }
}

/// Wait for the child's marker, let it write for `after`, then kill it.
fn kill_while_writing(mut process: std::process::Child, marker: &Path, after: Duration) {
    let start = Instant::now();
    while !marker.exists() && start.elapsed() < Duration::from_secs(120) {
        if process.try_wait().unwrap().is_some() {
            break;
        }
        std::thread::sleep(Duration::from_millis(2));
    }
    std::thread::sleep(after);
    // SIGKILL on Unix: no destructor, no rollback, no checkpoint runs.
    let _ = process.kill();
    let _ = process.wait();
}

#[test]
fn a_writer_killed_mid_write_leaves_the_store_consistent() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("h.sqlite");
    let marker = dir.path().join("ready");
    let before = {
        let mut store = open(&path);
        store.add(&entry_with("before", None)).unwrap()
    };

    // One big transaction killed half way: all or nothing.
    let envs = [
        ("HISTORY_TEST_STORE", path.display().to_string()),
        ("HISTORY_TEST_READY", marker.display().to_string()),
    ];
    let process = child("store::child_big_import", &envs).spawn().unwrap();
    kill_while_writing(process, &marker, Duration::from_millis(150));
    {
        let mut store = open(&path);
        assert!(store.integrity_ok().unwrap());
        let n = store.count().unwrap();
        assert!(
            n == 1 || n == BIG_IMPORT as i64 + 1,
            "{n} complaints: a torn import"
        );
        assert_eq!(
            store.get(before).unwrap().versions[0]
                .complaint
                .reference
                .as_deref(),
            Some("before")
        );
    }

    // Many small transactions killed at some point: every stored complaint is whole.
    std::fs::remove_file(&marker).unwrap();
    let process = child("store::child_endless_adds", &envs).spawn().unwrap();
    kill_while_writing(process, &marker, Duration::from_millis(300));
    let mut store = open(&path);
    assert!(store.integrity_ok().unwrap());
    let rows = store.scan().unwrap();
    for r in rows.iter().rev().take(50) {
        let c = store.get(r.id).unwrap();
        assert_eq!(c.versions.len(), 1);
        assert_eq!(
            c.versions[0].complaint.reference, r.facts.reference,
            "complaint {} does not match its version",
            r.id
        );
    }
    // And the store takes new work.
    store.add(&entry_with("after", None)).unwrap();
}
