//! `rolltriage report --history`: the report tells the similar past complaints of the store with
//! their confirmed causes and what was done; without a store the section is absent, and a store
//! that does not exist is refused, not created.

use std::path::Path;
use std::process::{Command, Output};

const FIXTURE: &str = "tests/history_fixtures/line4_film_telescoping.yaml";

fn rolltriage() -> Command {
    let mut c = Command::new(env!("CARGO_BIN_EXE_rolltriage"));
    c.current_dir(env!("CARGO_MANIFEST_DIR"))
        .env_remove("ROLLTRIAGE_HISTORY");
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

fn report(store: Option<&Path>, format: &str) -> Output {
    let mut c = rolltriage();
    c.args([
        "report",
        FIXTURE,
        "-o",
        "-",
        "--no-what-if",
        "--date",
        "2026-12-02",
    ])
    .args(["--format", format]);
    if let Some(store) = store {
        c.arg("--history").arg(store);
    }
    c.output().unwrap()
}

/// The Markdown section from its heading to the next `## `.
fn section(markdown: &str) -> String {
    let start = markdown
        .find("## Similar past complaints")
        .expect("the section");
    let rest = &markdown[start..];
    let end = rest[3..].find("\n## ").map_or(rest.len(), |i| i + 4);
    rest[..end].to_string()
}

#[test]
fn reports_tell_the_similar_past_complaints_and_what_worked() {
    let folder = tempfile::tempdir().unwrap();
    let store = folder.path().join("h.sqlite");
    let history = |args: &[&str]| {
        ok(rolltriage()
            .args(["history", "--history"])
            .arg(&store)
            .args(args)
            .output()
            .unwrap())
    };
    history(&["add", FIXTURE]);
    history(&[
        "confirm",
        "1",
        "--cause",
        "tension_too_low",
        "--evidence",
        "trial at 1.7 pli: no telescoping",
    ]);

    let markdown = ok(report(Some(&store), "markdown"));
    let part = section(&markdown);
    assert!(
        part.contains("Web tension too low — trial at 1.7 pli"),
        "{part}"
    );
    assert!(
        part.contains("Restore the tension set point to 1.7 pli"),
        "{part}"
    );
    assert!(
        !part.contains("tension_too_low"),
        "IDs stay out of reports: {part}"
    );
    insta::assert_snapshot!("similar_past_markdown", part);
    // The complaint record names confirmed causes in words too.
    let record = ok(report(None, "markdown"));
    assert!(!record.contains("Similar past complaints"));

    let html = ok(report(Some(&store), "html"));
    assert!(html.contains("id=\"similar-past\""));
    assert!(html.contains("Web tension too low"));

    let json: serde_json::Value = serde_json::from_str(&ok(report(Some(&store), "json"))).unwrap();
    let past = &json["similar_past"][0];
    assert_eq!(past["id"], 1);
    assert_eq!(past["distance"], 0.0);
    assert!(
        past["confirmed"][0]
            .as_str()
            .unwrap()
            .starts_with("Web tension too low")
    );
}

#[test]
fn a_missing_store_is_refused_not_created() {
    let folder = tempfile::tempdir().unwrap();
    let store = folder.path().join("none.sqlite");
    let out = report(Some(&store), "markdown");
    assert_eq!(out.status.code(), Some(1));
    let message = String::from_utf8_lossy(&out.stderr);
    assert!(message.contains("no history store at"), "{message}");
    assert!(!store.exists());
}
