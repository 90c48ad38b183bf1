//! Training walk-throughs: the shipped set is complete and consistent with the demo table, the
//! lint catches broken files, answers are checked and scored deterministically, and the binary
//! runs a walk-through in scripted and in line-by-line (no TTY) mode.

use std::collections::BTreeMap;
use std::io::Write;
use std::path::Path;
use std::process::{Command, Stdio};

use rolltriage::case::Case;
use rolltriage::training::{
    Session, Topic, TrainingContext, check_answer, fill_placeholders, library, lint_dir,
    lint_walkthroughs,
};
use rolltriage::units::UnitSystem;

fn root() -> &'static Path {
    Path::new(env!("CARGO_MANIFEST_DIR"))
}

#[derive(serde::Deserialize)]
struct Expected {
    cases: BTreeMap<String, ExpectedCase>,
}

#[derive(serde::Deserialize)]
struct ExpectedCase {
    cause: String,
    #[allow(dead_code)]
    top: usize,
    #[allow(dead_code)]
    why: String,
}

#[test]
fn at_least_eight_shipped_walkthroughs_cover_the_four_question_kinds() {
    let all = library::embedded().unwrap();
    assert!(all.len() >= 8, "only {} walk-throughs", all.len());
    for loaded in &all {
        let w = &loaded.walkthrough;
        for topic in [
            Topic::ZoneAtRisk,
            Topic::Cause,
            Topic::Remedy,
            Topic::Safety,
        ] {
            assert!(
                w.questions.iter().any(|q| q.topic == topic),
                "{}: no {:?} question",
                w.id,
                topic
            );
        }
        // Every safety question's correct answer defers to site procedures or lockout/tagout,
        // and its explanation repeats the usual caution.
        for q in w.questions.iter().filter(|q| q.topic == Topic::Safety) {
            let correct = &q.choices[q.correct_choice().unwrap()].text;
            let text = format!("{correct} {}", q.explanation).to_lowercase();
            assert!(
                text.contains("procedure") || text.contains("lockout"),
                "{}: {}",
                w.id,
                q.id
            );
        }
    }
}

#[test]
fn shipped_files_on_disk_match_the_embedded_set() {
    let on_disk = rolltriage::training::load_dir(&root().join("cases/training")).unwrap();
    let embedded = library::embedded().unwrap();
    let ids = |v: &[rolltriage::training::LoadedWalkthrough]| {
        let mut ids: Vec<String> = v.iter().map(|l| l.walkthrough.id.clone()).collect();
        ids.sort();
        ids
    };
    assert_eq!(ids(&on_disk), ids(&embedded));
}

#[test]
fn correct_cause_answers_agree_with_the_demo_table() {
    let text = std::fs::read_to_string(root().join("cases/EXPECTED.yaml")).unwrap();
    let expected: Expected = yaml::from_str(&text).unwrap();
    for loaded in library::embedded().unwrap() {
        let w = &loaded.walkthrough;
        let intended = &expected.cases[&w.case].cause;
        for q in w.questions.iter().filter(|q| q.topic == Topic::Cause) {
            let correct = &q.choices[q.correct_choice().unwrap()];
            assert_eq!(correct.cause.as_ref(), Some(intended), "{}: {}", w.id, q.id);
        }
    }
}

#[test]
fn answers_are_checked_and_scored() {
    let all = library::embedded().unwrap();
    let w = &all
        .iter()
        .find(|l| l.walkthrough.id == "telescoping_newsprint")
        .unwrap()
        .walkthrough;
    // The file says: zone → choice 2, cause → 1, remedy → 1, safety → 2.
    assert!(check_answer(w, 0, 1).unwrap());
    assert!(!check_answer(w, 0, 0).unwrap());
    assert!(check_answer(w, 1, 0).unwrap());
    assert!(check_answer(w, 9, 0).is_err());
    assert!(check_answer(w, 0, 9).is_err());

    let case_text = library::demo_case(&w.case).unwrap();
    let case: Case = yaml::from_str(case_text).unwrap();
    let mut session = Session::new(w.clone(), TrainingContext::uncomputed(case, UnitSystem::Si));
    let right = session.answer(0, 1).unwrap();
    assert!(right.correct);
    let wrong = session.answer(1, 2).unwrap();
    assert!(!wrong.correct);
    assert_eq!(wrong.correct_choice, 0);
    assert!(wrong.to_text().contains("The best answer is 1"));
    let score = session.score();
    assert_eq!((score.correct, score.answered, score.total), (1, 2, 4));
    assert!(
        session
            .closing()
            .contains("1 of 4 correct (25 %), 2 not answered")
    );
    // Without a computed state the explanation says so instead of inventing numbers.
    assert!(right.explanation.contains("(not computed)"));
    assert!(right.plot.is_none());
}

#[test]
fn placeholders_left_alone_when_unknown() {
    let filled = fill_placeholders("{core_pressure} and {not_a_value}", None, UnitSystem::Si);
    assert_eq!(filled, "(not computed) and {not_a_value}");
}

const GOOD_CASE: &str = "harbour_newsprint_telescoping.yaml";

fn write_walkthrough(dir: &Path, name: &str, body: &str) {
    std::fs::write(dir.join(name), body).unwrap();
}

#[test]
fn lint_finds_every_kind_of_problem() {
    let dir = tempfile::tempdir().unwrap();
    write_walkthrough(
        dir.path(),
        "a.yaml",
        &format!(
            "id: twice
title: Two correct answers
case: {GOOD_CASE}
level: expert
questions:
  - id: q1
    topic: cause
    prompt: Why?
    choices:
      - {{text: One, correct: true, cause: tension_to_low}}
      - {{text: Two, correct: true, zone: centre}}
    explanation: Pressure is {{core_presure}} and {{pressure_mean}}.
  - id: q1
    topic: safety
    prompt: Safe?
    choices:
      - {{text: Yes}}
      - {{text: yes}}
    explanation: ''
"
        ),
    );
    write_walkthrough(
        dir.path(),
        "b.yaml",
        "id: twice
title: Missing case
case: no_such_case.yaml
questions: []
",
    );
    write_walkthrough(dir.path(), "c.yaml", "id: [broken\n");
    let problems = lint_dir(dir.path()).unwrap();
    let text: Vec<String> = problems.iter().map(|p| p.to_string()).collect();
    let has = |needle: &str| {
        assert!(
            text.iter().any(|t| t.contains(needle)),
            "no problem mentioning {needle:?} in {text:#?}"
        )
    };
    has("needs exactly one correct choice, has 2");
    has("needs exactly one correct choice, has 0");
    has("did you mean \"tension_too_low\"");
    has("unknown zone \"centre\"");
    has("unknown placeholder {core_presure}");
    has("did you mean \"core_pressure\"");
    has("unknown placeholder {pressure_mean}");
    has("question ID used twice");
    has("repeats another choice");
    has("explanation is empty");
    has("level \"expert\"");
    has("no_such_case.yaml");
    has("walk-through ID \"twice\" is used twice");
    has("has no questions");
    has("c.yaml");
}

#[test]
fn lint_passes_on_the_shipped_walkthroughs() {
    let problems = lint_dir(&root().join("cases/training")).unwrap();
    assert!(problems.is_empty(), "{problems:#?}");
    let embedded = library::embedded().unwrap();
    assert!(lint_walkthroughs(&embedded).is_empty());
}

fn rolltriage() -> Command {
    Command::new(env!("CARGO_BIN_EXE_rolltriage"))
}

#[test]
fn scripted_run_prints_feedback_and_score() {
    let output = rolltriage()
        .args(["train", "telescoping_newsprint", "--answers", "2,1,1,1"])
        .output()
        .unwrap();
    let stdout = String::from_utf8_lossy(&output.stdout);
    assert!(
        output.status.success(),
        "{}",
        String::from_utf8_lossy(&output.stderr)
    );
    assert!(stdout.contains("Question 4 of 4"));
    assert!(stdout.contains("Score: 3 of 4 correct (75 %)"), "{stdout}");
    // The feedback quotes computed numbers and draws the text plot.
    assert!(stdout.contains("zone  c"), "{stdout}");
    assert!(!stdout.contains("(not computed)"), "{stdout}");
}

#[test]
fn scripted_run_rejects_wrong_answer_counts_and_ranges() {
    let few = rolltriage()
        .args(["train", "telescoping_newsprint", "--answers", "2,1"])
        .output()
        .unwrap();
    assert_eq!(few.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&few.stderr).contains("has 4 questions"));
    let out_of_range = rolltriage()
        .args(["train", "telescoping_newsprint", "--answers", "2,1,9,1"])
        .output()
        .unwrap();
    assert_eq!(out_of_range.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out_of_range.stderr).contains("accepted: 1 to 4"));
    let unknown = rolltriage()
        .args(["train", "telescoping_newsprnt"])
        .output()
        .unwrap();
    assert_eq!(unknown.status.code(), Some(1));
    assert!(
        String::from_utf8_lossy(&unknown.stderr).contains("did you mean \"telescoping_newsprint\"")
    );
}

#[test]
fn interactive_run_reads_lines_without_a_terminal() {
    let mut child = rolltriage()
        .args(["train", "crushed_core_coated"])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    // A bad line is asked again; then four answers: all correct per the file.
    child
        .stdin
        .take()
        .unwrap()
        .write_all(b"seven\n1\n2\n1\n2\n")
        .unwrap();
    let output = child.wait_with_output().unwrap();
    let stdout = String::from_utf8_lossy(&output.stdout);
    assert!(
        output.status.success(),
        "{}",
        String::from_utf8_lossy(&output.stderr)
    );
    assert!(stdout.contains("Please type a number from 1 to 3"));
    assert!(stdout.contains("Score: 4 of 4 correct (100 %)"), "{stdout}");
}

#[test]
fn interactive_run_stops_cleanly_at_end_of_input() {
    let mut child = rolltriage()
        .args(["train", "crushed_core_coated"])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .spawn()
        .unwrap();
    child.stdin.take().unwrap().write_all(b"1\n").unwrap();
    let output = child.wait_with_output().unwrap();
    let stdout = String::from_utf8_lossy(&output.stdout);
    assert!(output.status.success());
    assert!(
        stdout.contains("1 of 4 correct (25 %), 3 not answered"),
        "{stdout}"
    );
}
