//! `rolltriage history` and `diagnose --history` as a user runs them, on SQLite files on disk:
//! the round trip add → list → confirm → show → similar → export → import, site experience as
//! its own reason, and the refusals (locked store, newer schema, not a store, bad import).

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

const FIXTURE: &str = "tests/history_fixtures/line4_film_telescoping.yaml";

fn rolltriage(store: &Path) -> Command {
    let mut c = Command::new(env!("CARGO_BIN_EXE_rolltriage"));
    c.current_dir(env!("CARGO_MANIFEST_DIR"))
        .env_remove("ROLLTRIAGE_HISTORY")
        .args(["history", "--history"])
        .arg(store);
    c
}

fn ok(out: Output) -> String {
    assert!(
        out.status.success(),
        "exit {:?}: {}",
        out.status.code(),
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8_lossy(&out.stdout).into_owned()
}

fn fails(out: Output) -> String {
    assert_eq!(
        out.status.code(),
        Some(1),
        "{}",
        String::from_utf8_lossy(&out.stdout)
    );
    String::from_utf8_lossy(&out.stderr).into_owned()
}

/// A copy of the fixture with another reference, line and received date.
fn variant(dir: &Path, name: &str, reference: &str, line: &str) -> PathBuf {
    let text = std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join(FIXTURE))
        .unwrap()
        .replace("HF-2026-031", reference)
        .replace("line: \"4\"", &format!("line: \"{line}\""));
    let path = dir.join(name);
    std::fs::write(&path, text).unwrap();
    path
}

#[test]
fn add_list_confirm_show_and_performance() {
    let dir = tempfile::tempdir().unwrap();
    let store = dir.path().join("h.sqlite");
    let text = ok(rolltriage(&store).args(["add", FIXTURE]).output().unwrap());
    assert!(text.contains("Stored complaint 1 (version 1)"), "{text}");
    // The same reference again is refused, naming the way to add a version.
    let err = fails(rolltriage(&store).args(["add", FIXTURE]).output().unwrap());
    assert!(err.contains("--update 1"), "{err}");
    let text = ok(rolltriage(&store)
        .args(["add", FIXTURE, "--update", "1"])
        .output()
        .unwrap());
    assert!(text.contains("version 2"), "{text}");

    let text = ok(rolltriage(&store)
        .args(["list", "--line", "4", "--symptom", "telescoping"])
        .output()
        .unwrap());
    assert!(
        text.contains("1 complaint(s)") && text.contains("PET 23"),
        "{text}"
    );

    let err = fails(
        rolltriage(&store)
            .args([
                "confirm",
                "1",
                "--cause",
                "tension_to_low",
                "--evidence",
                "x",
            ])
            .output()
            .unwrap(),
    );
    assert!(err.contains("did you mean `tension_too_low`"), "{err}");
    let text = ok(rolltriage(&store)
        .args([
            "confirm",
            "1",
            "--cause",
            "air_entrainment",
            "--evidence",
            "slower trial: no telescoping",
            "--by",
            "shift lead",
        ])
        .output()
        .unwrap());
    assert!(
        text.contains("version 3") && text.contains("ranked it 1"),
        "{text}"
    );

    let text = ok(rolltriage(&store).args(["show", "1"]).output().unwrap());
    for expected in [
        "version 3 of 3",
        "Quaymoor Press",
        "6 of 24 checked",
        "air_entrainment — slower trial: no telescoping",
        "contained → cause confirmed",
        "Restore the tension set point",
    ] {
        assert!(text.contains(expected), "missing {expected:?} in\n{text}");
    }
    let case = ok(rolltriage(&store)
        .args(["show", "1", "--version", "1", "--case"])
        .output()
        .unwrap());
    assert!(
        case.starts_with("title: Line 4 film rolls telescoping"),
        "{case}"
    );
    let text = ok(rolltriage(&store).args(["performance"]).output().unwrap());
    assert!(
        text.contains("confirmed cause: 1") && text.contains("ranked first: 1 (100 %)"),
        "{text}"
    );

    let text = ok(rolltriage(&store)
        .args(["status", "1", "closed", "--note", "no repeat in 4 weeks"])
        .output()
        .unwrap());
    assert!(text.contains("status closed"), "{text}");
    let err = fails(
        rolltriage(&store)
            .args(["status", "1", "done"])
            .output()
            .unwrap(),
    );
    assert!(
        err.contains("accepted: open, contained, cause_confirmed, closed"),
        "{err}"
    );
}

#[test]
fn site_experience_is_its_own_reason_and_only_reorders() {
    let dir = tempfile::tempdir().unwrap();
    let store = dir.path().join("h.sqlite");
    // Four past complaints on line 4, three confirmed as nip load too low.
    for i in 0..4 {
        let case = variant(dir.path(), &format!("c{i}.yaml"), &format!("P-{i}"), "4");
        ok(rolltriage(&store).arg("add").arg(&case).output().unwrap());
        let cause = if i < 3 {
            "nip_load_too_low"
        } else {
            "air_entrainment"
        };
        ok(rolltriage(&store)
            .args([
                "confirm",
                &(i + 1).to_string(),
                "--cause",
                cause,
                "--evidence",
                "trial",
            ])
            .output()
            .unwrap());
    }
    let diagnose = |extra: &[&str]| {
        let mut c = Command::new(env!("CARGO_BIN_EXE_rolltriage"));
        c.current_dir(env!("CARGO_MANIFEST_DIR"))
            .args([
                "diagnose",
                FIXTURE,
                "--no-what-if",
                "--top",
                "0",
                "--format",
                "json",
            ])
            .args(extra);
        let v: serde_json::Value = serde_json::from_str(&ok(c.output().unwrap())).unwrap();
        v["causes"]
            .as_array()
            .unwrap()
            .iter()
            .map(|c| {
                (
                    c["id"].as_str().unwrap().to_string(),
                    c["reasons"]
                        .as_array()
                        .unwrap()
                        .iter()
                        .filter(|r| r["test"] == "site_history")
                        .map(|r| r["text"].as_str().unwrap().to_string())
                        .collect::<Vec<_>>(),
                )
            })
            .collect::<Vec<_>>()
    };
    let without = diagnose(&[]);
    let store_arg = store.display().to_string();
    let with = diagnose(&["--history", &store_arg]);
    let ids = |v: &[(String, Vec<String>)]| {
        let mut ids: Vec<String> = v.iter().map(|c| c.0.clone()).collect();
        ids.sort();
        ids
    };
    // Never removes, never adds a cause.
    assert_eq!(ids(&without), ids(&with));
    let nip = with.iter().find(|c| c.0 == "nip_load_too_low").unwrap();
    assert_eq!(
        nip.1,
        vec!["site history: 3 of 4 confirmed telescoping complaints on line 4 were nip load too low (or no nip)".to_string()]
    );
    let rank = |v: &[(String, Vec<String>)], id: &str| v.iter().position(|c| c.0 == id).unwrap();
    assert!(rank(&with, "nip_load_too_low") <= rank(&without, "nip_load_too_low"));
    // Switched off: similar complaints still listed, no site reason.
    let off = diagnose(&["--history", &store_arg, "--no-site-history"]);
    assert!(off.iter().all(|c| c.1.is_empty()));

    let text = ok(Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .args(["diagnose", FIXTURE, "--no-what-if", "--history", &store_arg])
        .output()
        .unwrap());
    assert!(text.contains("Similar past complaints:"), "{text}");
    assert!(text.contains("confirmed: Nip load too low"), "{text}");
}

#[test]
fn export_anonymise_and_import_round_trip() {
    let dir = tempfile::tempdir().unwrap();
    let store = dir.path().join("h.sqlite");
    ok(rolltriage(&store).args(["add", FIXTURE]).output().unwrap());
    ok(rolltriage(&store)
        .args([
            "confirm",
            "1",
            "--cause",
            "tension_too_low",
            "--evidence",
            "trial",
        ])
        .output()
        .unwrap());
    let export = dir.path().join("out.json");
    ok(rolltriage(&store)
        .args(["export", "-o"])
        .arg(&export)
        .output()
        .unwrap());
    let plain = std::fs::read_to_string(&export).unwrap();
    assert!(plain.contains("Quaymoor Press"));
    let anonymous = ok(rolltriage(&store)
        .args(["export", "--anonymise"])
        .output()
        .unwrap());
    assert!(
        !anonymous.contains("Quaymoor"),
        "a customer name left in the export"
    );
    assert!(anonymous.contains("customer 1"));
    let csv = ok(rolltriage(&store)
        .args(["export", "--format", "csv", "--anonymise"])
        .output()
        .unwrap());
    assert!(csv.starts_with("number,version,reference"), "{csv}");
    assert!(
        !csv.contains("Quaymoor") && csv.contains("tension_too_low"),
        "{csv}"
    );

    let other = dir.path().join("other.sqlite");
    let text = ok(rolltriage(&other)
        .arg("import")
        .arg(&export)
        .output()
        .unwrap());
    assert!(text.contains("Imported 1 complaint(s)"), "{text}");
    let text = ok(rolltriage(&other)
        .args(["show", "1", "--format", "json"])
        .output()
        .unwrap());
    let v: serde_json::Value = serde_json::from_str(&text).unwrap();
    assert_eq!(v["versions"].as_array().unwrap().len(), 2);
    assert_eq!(v["status_changes"].as_array().unwrap().len(), 1);

    // A damaged import is refused with the complaint and field named, and nothing is written.
    let broken = plain.replacen(
        "\"status\": \"cause_confirmed\"",
        "\"status\": \"solved\"",
        1,
    );
    let bad = dir.path().join("bad.json");
    std::fs::write(&bad, broken).unwrap();
    let err = fails(rolltriage(&other).arg("import").arg(&bad).output().unwrap());
    assert!(
        err.contains("complaints[0]") && err.contains("complaint.status"),
        "{err}"
    );
    std::fs::write(&bad, "{\"format\": \"something else\"}").unwrap();
    let err = fails(rolltriage(&other).arg("import").arg(&bad).output().unwrap());
    assert!(err.contains("not a rolltriage history export"), "{err}");
    let text = ok(rolltriage(&other).args(["list"]).output().unwrap());
    assert!(text.contains("1 complaint(s)"), "{text}");
}

#[test]
fn similar_finds_the_same_case_first() {
    let dir = tempfile::tempdir().unwrap();
    let store = dir.path().join("h.sqlite");
    ok(rolltriage(&store)
        .args(["add", "cases/harbour_newsprint_telescoping.yaml"])
        .output()
        .unwrap());
    ok(rolltriage(&store).args(["add", FIXTURE]).output().unwrap());
    ok(rolltriage(&store)
        .args(["add", "cases/harbour_coated_crushed_core.yaml"])
        .output()
        .unwrap());
    let text = ok(rolltriage(&store)
        .args(["similar", FIXTURE, "--format", "json"])
        .output()
        .unwrap());
    let v: serde_json::Value = serde_json::from_str(&text).unwrap();
    let found = v.as_array().unwrap();
    assert_eq!(found[0]["id"], 2);
    assert_eq!(found[0]["distance"], 0.0);
    // Same symptom (telescoping), other material: nearer than another symptom.
    assert_eq!(found[1]["id"], 1);
    assert!(found[1]["distance"].as_f64().unwrap() < found[2]["distance"].as_f64().unwrap());
}

#[test]
fn locked_store_newer_schema_and_foreign_files_are_refused() {
    let dir = tempfile::tempdir().unwrap();
    let store = dir.path().join("h.sqlite");
    ok(rolltriage(&store).args(["add", FIXTURE]).output().unwrap());

    // Another program holds the write lock: a clear message and exit 1, nothing lost.
    {
        let conn = rusqlite::Connection::open(&store).unwrap();
        conn.execute_batch("BEGIN IMMEDIATE").unwrap();
        let case = variant(dir.path(), "c.yaml", "LOCKED-1", "4");
        let before = std::fs::read(&case).unwrap();
        let err = fails(
            rolltriage(&store)
                .args(["--wait", "0.3", "add"])
                .arg(&case)
                .output()
                .unwrap(),
        );
        assert!(
            err.contains("is busy") && err.contains("nothing was written"),
            "{err}"
        );
        assert_eq!(
            std::fs::read(&case).unwrap(),
            before,
            "the case file changed"
        );
        conn.execute_batch("ROLLBACK").unwrap();
    }

    // A store of a newer schema: refused, the file left byte for byte as it was.
    let conn = rusqlite::Connection::open(&store).unwrap();
    conn.execute_batch(
        "PRAGMA wal_checkpoint(TRUNCATE); INSERT INTO history_schema (version, applied_at, note) VALUES (99, 'later', 'future'); PRAGMA wal_checkpoint(TRUNCATE);",
    )
    .unwrap();
    drop(conn);
    let before = std::fs::read(&store).unwrap();
    let err = fails(rolltriage(&store).args(["list"]).output().unwrap());
    assert!(
        err.contains("schema version 99") && err.contains("unaltered"),
        "{err}"
    );
    let err = fails(
        rolltriage(&store)
            .args(["add", FIXTURE, "--new"])
            .output()
            .unwrap(),
    );
    assert!(err.contains("schema version 99"), "{err}");
    assert_eq!(
        std::fs::read(&store).unwrap(),
        before,
        "the store was altered"
    );

    // A case file given as the store: not a database, left alone.
    let case = variant(dir.path(), "d.yaml", "X", "4");
    let before = std::fs::read(&case).unwrap();
    let err = fails(rolltriage(&case).args(["list"]).output().unwrap());
    assert!(err.contains("not a rolltriage history store"), "{err}");
    assert_eq!(std::fs::read(&case).unwrap(), before);

    // Reading a store that does not exist says how to start one.
    let err = fails(
        rolltriage(&dir.path().join("none.sqlite"))
            .args(["list"])
            .output()
            .unwrap(),
    );
    assert!(err.contains("history add CASE"), "{err}");
}

#[test]
fn the_per_user_store_is_in_the_data_folder() {
    let dir = tempfile::tempdir().unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .env_remove("ROLLTRIAGE_HISTORY")
        .env("XDG_DATA_HOME", dir.path())
        .env("HOME", dir.path())
        .args(["history", "add", FIXTURE])
        .output()
        .unwrap();
    ok(out);
    assert!(dir.path().join("rolltriage/history.sqlite").exists());
}

#[test]
fn a_bad_complaint_record_names_the_field() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join(FIXTURE))
        .unwrap()
        .replace("received: 2026-11-20", "received: 2026-02-30");
    let case = dir.path().join("bad.yaml");
    std::fs::write(&case, text).unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .args(["case", "check"])
        .arg(&case)
        .output()
        .unwrap();
    let err =
        String::from_utf8_lossy(&out.stdout).into_owned() + &String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(1), "{err}");
    assert!(
        err.contains("complaint.received") && err.contains("YYYY-MM-DD"),
        "{err}"
    );
}
