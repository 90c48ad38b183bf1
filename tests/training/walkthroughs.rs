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
        .args([
            "train",
            "telescoping_newsprint",
            "--seed",
            "7",
            "--answers",
            &three_of_four_right("telescoping_newsprint", 7),
        ])
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
    assert!(stdout.contains("seed 7"), "{stdout}");
    // The feedback quotes computed numbers and draws the text plot.
    assert!(stdout.contains("zone  c"), "{stdout}");
    assert!(!stdout.contains("(not computed)"), "{stdout}");
}

#[test]
fn scripted_run_rejects_wrong_answer_counts_and_ranges() {
    let few = rolltriage()
        .args([
            "train",
            "telescoping_newsprint",
            "--seed",
            "1",
            "--answers",
            "2,1",
        ])
        .output()
        .unwrap();
    assert_eq!(few.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&few.stderr).contains("has 4 questions"));
    // Refused before the story is printed.
    assert!(
        few.stdout.is_empty(),
        "{}",
        String::from_utf8_lossy(&few.stdout)
    );
    // Scripted answers name the seed of the shuffled order.
    let unseeded = rolltriage()
        .args(["train", "telescoping_newsprint", "--answers", "2,1,1,1"])
        .output()
        .unwrap();
    assert_eq!(unseeded.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&unseeded.stderr).contains("--seed"));
    let out_of_range = rolltriage()
        .args([
            "train",
            "telescoping_newsprint",
            "--seed",
            "1",
            "--answers",
            "2,1,9,1",
        ])
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
        .args(["train", "crushed_core_coated", "--seed", "5"])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    // A bad line is asked again; then four answers: all correct in the order of seed 5.
    let lines = format!(
        "seven\n{}\n",
        answers_for("crushed_core_coated", 5, 4).replace(',', "\n")
    );
    child
        .stdin
        .take()
        .unwrap()
        .write_all(lines.as_bytes())
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
        .args(["train", "crushed_core_coated", "--seed", "5"])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .spawn()
        .unwrap();
    let first = answers_for("crushed_core_coated", 5, 4);
    let first = first.split(',').next().unwrap().to_string();
    child
        .stdin
        .take()
        .unwrap()
        .write_all(format!("{first}\n").as_bytes())
        .unwrap();
    let output = child.wait_with_output().unwrap();
    let stdout = String::from_utf8_lossy(&output.stdout);
    assert!(output.status.success());
    assert!(
        stdout.contains("1 of 4 correct (25 %), 3 not answered"),
        "{stdout}"
    );
}

/// Answers (1-based, comma-separated) to `id` shuffled with `seed`: the first three right, the
/// last wrong.
fn three_of_four_right(id: &str, seed: u64) -> String {
    answers_for(id, seed, 3)
}

/// Answers to `id` shuffled with `seed`: the first `right` correct, the others wrong.
fn answers_for(id: &str, seed: u64, right: usize) -> String {
    let all = library::embedded().unwrap();
    let loaded = all.iter().find(|l| l.walkthrough.id == id).unwrap();
    let case = rolltriage::training::load_case(loaded).unwrap();
    let mut session = Session::new(
        loaded.walkthrough.clone(),
        TrainingContext::uncomputed(case, UnitSystem::Si),
    );
    session.shuffle_choices(seed);
    let questions = &session.walkthrough.questions;
    questions
        .iter()
        .enumerate()
        .map(|(i, q)| {
            let correct = q.correct_choice().unwrap();
            let pick = if i < right {
                correct
            } else {
                (correct + 1) % q.choices.len()
            };
            (pick + 1).to_string()
        })
        .collect::<Vec<_>>()
        .join(",")
}

/// Issue 19: the shipped walk-throughs put 26 of 36 correct answers first. Shuffled with a
/// seed, the order is reproducible, differs between seeds, and the correct answer is no longer
/// mostly first (at most half of the questions, over a few seeds).
#[test]
fn choices_are_shuffled_reproducibly_by_seed() {
    let all = library::embedded().unwrap();
    let order = |seed: u64| -> Vec<Vec<String>> {
        let mut orders = Vec::new();
        for loaded in &all {
            let case = rolltriage::training::load_case(loaded).unwrap();
            let mut session = Session::new(
                loaded.walkthrough.clone(),
                TrainingContext::uncomputed(case, UnitSystem::Si),
            );
            session.shuffle_choices(seed);
            for q in &session.walkthrough.questions {
                orders.push(q.choices.iter().map(|c| c.text.clone()).collect());
            }
        }
        orders
    };
    assert_eq!(order(11), order(11));
    assert_ne!(order(11), order(12));
    let first_correct = |seed: u64| -> usize {
        let mut count = 0;
        for loaded in &all {
            let case = rolltriage::training::load_case(loaded).unwrap();
            let mut session = Session::new(
                loaded.walkthrough.clone(),
                TrainingContext::uncomputed(case, UnitSystem::Si),
            );
            session.shuffle_choices(seed);
            count += session
                .walkthrough
                .questions
                .iter()
                .filter(|q| q.correct_choice() == Some(0))
                .count();
        }
        count
    };
    let questions: usize = all.iter().map(|l| l.walkthrough.questions.len()).sum();
    let unshuffled: usize = all
        .iter()
        .flat_map(|l| &l.walkthrough.questions)
        .filter(|q| q.correct_choice() == Some(0))
        .count();
    assert!(
        unshuffled * 2 > questions,
        "the shipped files: {unshuffled} of {questions} first"
    );
    let shuffled: usize = (1..=4).map(first_correct).sum();
    assert!(
        shuffled * 2 <= 4 * questions,
        "{shuffled} of {}",
        4 * questions
    );
}

/// Issue 19: prompts start with the question (no topic label), their placeholders are filled,
/// and the lint catches an unknown placeholder in a prompt or a choice.
#[test]
fn prompts_are_questions_with_numbers_filled_and_linted() {
    for loaded in library::embedded().unwrap() {
        let case = rolltriage::training::load_case(&loaded).unwrap();
        let session = Session::new(
            loaded.walkthrough.clone(),
            TrainingContext::compute(case, None, UnitSystem::Si),
        );
        for (index, q) in loaded.walkthrough.questions.iter().enumerate() {
            let text = session.question_text(index).unwrap();
            let first = text.lines().next().unwrap();
            assert!(
                first.starts_with(&format!("Question {} of ", index + 1)),
                "{first}"
            );
            assert!(
                !first.contains(&format!("({})", q.topic.as_str())) && !first.contains(" — "),
                "{first}"
            );
            assert!(!text.contains('{'), "{}: {text}", loaded.walkthrough.id);
        }
    }
    let dir = tempfile::tempdir().unwrap();
    let shipped = std::fs::read_to_string(format!(
        "{}/cases/training/bulk_loss_jumbo.yaml",
        env!("CARGO_MANIFEST_DIR")
    ))
    .unwrap();
    assert!(shipped.contains("prompt: Jumbo rolls of {roll_diameter}"));
    for (name, broken) in [
        (
            "prompt",
            shipped.replace("rolls of {roll_diameter}", "rolls of {roll_diametre}"),
        ),
        (
            "choice",
            shipped.replace("Use a thicker core", "Use a {core_diametre} core"),
        ),
    ] {
        std::fs::write(dir.path().join("w.yaml"), &broken).unwrap();
        let problems = lint_dir(dir.path()).unwrap();
        assert!(
            problems.iter().any(|p| p
                .to_string()
                .contains(&format!("{name}: unknown placeholder"))),
            "{name}: {problems:#?}"
        );
    }
}
