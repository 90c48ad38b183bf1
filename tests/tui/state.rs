//! State-machine tests of the terminal UI: key sequences in, app state out, no terminal.

use crate::tui_support;

use rolltriage::tui::app::{
    ConfirmPopup, HelpPopup, PendingAction, Popup, ResultsFocus, Screen, Setting, SymptomFocus,
    TrainingPopup, WalkStage,
};
use rolltriage::tui::event::Key;
use rolltriage::tui::job::Purpose;
use tui_support::*;

fn type_text(app: &mut rolltriage::tui::app::App, text: &str) {
    for c in text.chars() {
        app.handle_key(Key::Char(c));
    }
}

#[test]
fn opens_on_the_symptom_picker_with_a_clean_case() {
    let app = app();
    assert_eq!(app.screen, Screen::Symptoms);
    assert!(!app.session.dirty);
    assert!(app.session.case.symptoms.is_empty());
}

#[test]
fn typing_an_alias_finds_the_symptom_and_enter_picks_it() {
    let mut app = app();
    type_text(&mut app, "coning");
    assert_eq!(
        app.symptoms.highlighted_symptom(&app.session).unwrap().id,
        "telescoping"
    );
    app.handle_key(Key::Enter);
    assert!(app.session.is_selected("telescoping"));
    assert!(app.session.dirty);
    // Esc clears the search; a second symptom by another alias.
    app.handle_key(Key::Esc);
    assert_eq!(app.symptoms.query, "");
    type_text(&mut app, "stars");
    assert_eq!(
        app.symptoms.highlighted_symptom(&app.session).unwrap().id,
        "starring"
    );
    app.handle_key(Key::Enter);
    let ids: Vec<&str> = app
        .session
        .case
        .symptoms
        .iter()
        .map(|s| s.id.as_str())
        .collect();
    assert_eq!(ids, ["telescoping", "starring"]);
    // Enter again unpicks.
    app.handle_key(Key::Enter);
    assert!(!app.session.is_selected("starring"));
}

#[test]
fn q_is_search_text_on_the_symptom_list_not_quit() {
    let mut app = app();
    type_text(&mut app, "q");
    assert!(!app.should_quit);
    assert_eq!(app.symptoms.query, "q");
}

#[test]
fn where_on_the_roll_and_questions_are_stored_in_the_case() {
    let mut app = app();
    type_text(&mut app, "telesc");
    app.handle_key(Key::Right);
    assert_eq!(app.symptoms.focus, SymptomFocus::Details);
    // Saying where it shows also picks it.
    app.handle_key(Key::Right);
    let observed = &app.session.case.symptoms[0];
    assert_eq!(observed.id, "telescoping");
    assert_eq!(observed.place.as_deref(), Some("core"));
    app.handle_key(Key::Right);
    assert_eq!(app.session.case.symptoms[0].place.as_deref(), Some("body"));
    app.handle_key(Key::Left);
    app.handle_key(Key::Left);
    assert_eq!(
        app.session.case.symptoms[0].place.as_deref(),
        Some("whole_roll")
    );
    // The yes/no question.
    app.handle_key(Key::Down);
    app.handle_key(Key::Char('y'));
    assert_eq!(
        app.session.case.answers["telescoping_after_handling"],
        "yes"
    );
    app.handle_key(Key::Enter);
    assert_eq!(app.session.case.answers["telescoping_after_handling"], "no");
    app.handle_key(Key::Char('u'));
    assert_eq!(
        app.session.case.answers["telescoping_after_handling"],
        "unknown"
    );
    app.handle_key(Key::Esc);
    assert_eq!(app.symptoms.focus, SymptomFocus::List);
}

#[test]
fn choice_questions_store_the_choice_id() {
    let mut app = app();
    type_text(&mut app, "spoking");
    app.handle_key(Key::Right);
    app.handle_key(Key::Down);
    app.handle_key(Key::Right);
    assert_eq!(app.session.case.answers["starring_radius"], "near_core");
    app.handle_key(Key::Right);
    assert_eq!(app.session.case.answers["starring_radius"], "mid_roll");
    // y is not one of this question's answers: ignored.
    app.handle_key(Key::Char('y'));
    assert_eq!(app.session.case.answers["starring_radius"], "mid_roll");
}

fn go_to_field(app: &mut rolltriage::tui::app::App, path: &str) {
    let index = rolltriage::tui::fields::FIELDS
        .iter()
        .position(|f| f.path == path)
        .unwrap();
    app.handle_key(Key::Home);
    for _ in 0..index {
        app.handle_key(Key::Down);
    }
}

#[test]
fn unit_aware_fields_accept_trade_units_and_reject_wrong_ones_in_place() {
    let mut app = app();
    app.handle_key(Key::Tab);
    assert_eq!(app.screen, Screen::Inputs);
    go_to_field(&mut app, "winding.tension");
    type_text(&mut app, "3 pli");
    app.handle_key(Key::Enter);
    assert_eq!(app.inputs.error, None);
    assert_eq!(
        rolltriage::tui::fields::get(&app.session.case, "winding.tension").as_deref(),
        Some("3 pli")
    );
    // A length is not a tension: rejected, the text stays for correction, the case unchanged.
    go_to_field(&mut app, "winding.tension");
    type_text(&mut app, "48 mil");
    app.handle_key(Key::Enter);
    let error = app.inputs.error.clone().expect("rejected");
    let expected = rolltriage::units::parse_quantity(
        "winding.tension",
        "48 mil",
        rolltriage::units::QuantityKind::ForcePerWidth,
    )
    .unwrap_err()
    .to_string();
    assert_eq!(error, expected);
    assert_eq!(app.inputs.editing.as_deref(), Some("48 mil"));
    assert_eq!(
        rolltriage::tui::fields::get(&app.session.case, "winding.tension").as_deref(),
        Some("3 pli")
    );
    // Correct it in place.
    for _ in 0.."48 mil".len() {
        app.handle_key(Key::Backspace);
    }
    type_text(&mut app, "525 N/m");
    app.handle_key(Key::Enter);
    assert_eq!(app.inputs.error, None);
    assert_eq!(
        rolltriage::tui::fields::get(&app.session.case, "winding.tension").as_deref(),
        Some("525 N/m")
    );
    // Delete clears the field back to "assumed".
    go_to_field(&mut app, "winding.tension");
    app.handle_key(Key::Delete);
    assert_eq!(
        rolltriage::tui::fields::get(&app.session.case, "winding.tension"),
        None
    );
}

#[test]
fn presets_and_choices_cycle_with_arrows() {
    let mut app = app();
    app.handle_key(Key::F(3));
    go_to_field(&mut app, "web.preset");
    app.handle_key(Key::Right);
    assert_eq!(app.session.case.web.preset.as_deref(), Some("newsprint"));
    app.handle_key(Key::Right);
    assert_eq!(app.session.case.web.preset.as_deref(), Some("pet_film"));
    go_to_field(&mut app, "winding.taper.kind");
    // ← from a blank choice takes the last kind; the form edits the programme's points too.
    app.handle_key(Key::Left);
    assert_eq!(
        app.session.case.winding.taper.as_ref().unwrap().kind,
        "programme"
    );
    app.handle_key(Key::Left);
    assert_eq!(
        app.session.case.winding.taper.as_ref().unwrap().kind,
        "steps"
    );
}

#[test]
fn leaving_for_results_queues_one_solve_and_shows_the_outcome() {
    let mut app = app();
    app.set_case(sample_case(), None);
    assert_eq!(app.screen, Screen::Results);
    let requests = app.take_requests();
    assert_eq!(requests.len(), 1);
    assert_eq!(requests[0].purpose, Purpose::Baseline);
    assert!(app.session.is_solving());
    // Switching screens while the solve runs queues nothing more.
    app.handle_key(Key::Tab);
    app.handle_key(Key::BackTab);
    assert!(app.take_requests().is_empty());
    app.on_job(rolltriage::tui::job::JobMessage::Progress {
        id: requests[0].id,
        fraction: 0.4,
    });
    assert_eq!(app.session.running_baseline.unwrap().fraction, 0.4);
    app.on_job(rolltriage::tui::job::JobMessage::Finished {
        id: requests[0].id,
        purpose: Purpose::Baseline,
        generation: requests[0].generation,
        result: Ok(Box::new(outcome(1.0))),
    });
    assert!(!app.session.is_solving());
    assert!(app.session.current_outcome().is_some());
}

#[test]
fn stale_results_are_marked_and_resolved_again_on_return() {
    let mut app = app();
    app.set_case(sample_case(), None);
    finish_requests(&mut app, &outcome(1.0), &outcome(1.0));
    app.handle_key(Key::F(2));
    app.handle_key(Key::Enter); // unpick the first symptom: the case changed
    assert!(app.session.baseline_is_stale());
    app.handle_key(Key::F(4));
    assert_eq!(app.take_requests().len(), 1);
}

#[test]
fn causes_expand_and_remedies_lead_to_what_if() {
    let mut app = app();
    app.set_case(sample_case(), None);
    finish_requests(&mut app, &outcome(1.0), &outcome(1.0));
    app.handle_key(Key::Enter);
    assert!(app.results.expanded.contains("tension_too_low"));
    app.handle_key(Key::Enter);
    assert!(app.results.expanded.is_empty());
    app.handle_key(Key::Down);
    app.handle_key(Key::Enter);
    assert!(app.results.expanded.contains("taper_excessive"));
    // Remedies: "raise_tension" is a setting the what-if can try.
    app.handle_key(Key::Right);
    assert_eq!(app.results.focus, ResultsFocus::Remedies);
    app.session.resolved = Ok(resolved("Sample"));
    app.handle_key(Key::Enter);
    assert_eq!(app.screen, Screen::WhatIf);
    assert_eq!(app.what_if.remedy.as_deref(), Some("raise_tension"));
    // The trial solves the resolved case with the rule's change: tension ×1.15.
    let request = app
        .take_requests()
        .into_iter()
        .find(|r| r.purpose == Purpose::WhatIf)
        .unwrap();
    let trial = request
        .resolved
        .expect("remedy trials carry the changed resolved case");
    assert!((trial.winding.tension.start_tension - 525.0 * 1.15).abs() < 1e-9);
    // Keeping it writes the new tension into the case.
    app.handle_key(Key::Char('a'));
    // Written in the user's units, rounded to four figures (603.75 N/m).
    assert_eq!(
        app.session.case.winding.tension,
        Some(rolltriage::case::QuantityText::Text("603.8 N/m".into()))
    );
    // "store_rolls_on_end" changes no winder setting.
    assert!(!app.session.remedy_is_tryable("store_rolls_on_end"));
}

#[test]
fn what_if_changes_one_setting_and_can_be_kept() {
    let mut app = app();
    app.set_case(sample_case(), None);
    finish_requests(&mut app, &outcome(1.0), &outcome(1.0));
    app.session.resolved = Ok(resolved("Sample"));
    app.handle_key(Key::F(5));
    assert_eq!(app.screen, Screen::WhatIf);
    // Web tension up two steps: +20 % of 525 N/m.
    app.handle_key(Key::Right);
    app.handle_key(Key::Right);
    let requests = app.take_requests();
    let what_if: Vec<_> = requests
        .iter()
        .filter(|r| r.purpose == Purpose::WhatIf)
        .collect();
    assert!(!what_if.is_empty());
    match what_if.last().unwrap().case.winding.tension {
        Some(rolltriage::case::QuantityText::Number(v)) => assert!((v - 630.0).abs() < 1e-9),
        ref other => panic!("unexpected tension {other:?}"),
    }
    assert!(
        app.what_if
            .description
            .as_deref()
            .unwrap()
            .starts_with("Web tension")
    );
    // A different setting replaces the change: one setting at a time.
    app.handle_key(Key::Down);
    app.handle_key(Key::Right);
    assert_eq!(app.what_if.change.unwrap().setting, Setting::Taper);
    let taper = app
        .take_requests()
        .pop()
        .unwrap()
        .case
        .winding
        .taper
        .unwrap();
    assert_eq!(taper.kind, "hyperbolic");
    // Keep it: the case changes and is unsaved.
    app.session.dirty = false;
    app.handle_key(Key::Char('a'));
    assert!(app.session.dirty);
    assert_eq!(
        app.session.case.winding.taper.as_ref().unwrap().kind,
        "hyperbolic"
    );
    assert!(app.what_if.change.is_none());
}

#[test]
fn what_if_messages_of_an_older_request_are_ignored() {
    let mut app = app();
    app.set_case(sample_case(), None);
    finish_requests(&mut app, &outcome(1.0), &outcome(1.0));
    app.session.resolved = Ok(resolved("Sample"));
    app.handle_key(Key::F(5));
    app.handle_key(Key::Right);
    let old = app.take_requests().pop().unwrap();
    app.handle_key(Key::Right);
    let new = app.take_requests().pop().unwrap();
    app.on_job(rolltriage::tui::job::JobMessage::Finished {
        id: old.id,
        purpose: Purpose::WhatIf,
        generation: old.generation,
        result: Ok(Box::new(outcome(0.5))),
    });
    assert!(app.what_if.outcome.is_none());
    app.on_job(rolltriage::tui::job::JobMessage::Finished {
        id: new.id,
        purpose: Purpose::WhatIf,
        generation: new.generation,
        result: Ok(Box::new(outcome(0.8))),
    });
    assert!(app.what_if.outcome.is_some());
}

#[test]
fn quitting_with_unsaved_changes_asks_first() {
    let mut app = app();
    type_text(&mut app, "telesc");
    app.handle_key(Key::Enter);
    app.handle_key(Key::Ctrl('q'));
    assert_eq!(
        app.popup(),
        Some(&Popup::Confirm(ConfirmPopup(PendingAction::Quit)))
    );
    assert!(!app.should_quit);
    app.handle_key(Key::Esc);
    assert_eq!(app.popup(), None);
    assert!(!app.should_quit);
    app.handle_key(Key::Ctrl('q'));
    app.handle_key(Key::Char('d'));
    assert!(app.should_quit);
}

#[test]
fn quitting_a_clean_case_is_immediate_and_q_works_off_text_screens() {
    let mut app = app();
    app.handle_key(Key::F(4));
    app.take_requests();
    app.handle_key(Key::Char('q'));
    assert!(app.should_quit);
}

#[test]
fn save_writes_the_case_atomically_and_clears_the_modified_mark() {
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("reel7.yaml");
    let mut app = app();
    type_text(&mut app, "telesc");
    app.handle_key(Key::Enter);
    app.handle_key(Key::Ctrl('s'));
    // No file yet: asks for a name, suggested from the title.
    match app.popup() {
        Some(Popup::File(p)) => assert_eq!(p.prompt.input, "new_case.yaml"),
        other => panic!("expected the save prompt, got {other:?}"),
    }
    for _ in 0.."new_case.yaml".len() {
        app.handle_key(Key::Backspace);
    }
    type_text(&mut app, path.to_str().unwrap());
    app.handle_key(Key::Enter);
    assert_eq!(app.popup(), None, "status: {:?}", app.session.status);
    assert!(!app.session.dirty);
    let text = std::fs::read_to_string(&path).unwrap();
    assert!(text.contains("telescoping"), "{text}");
    // No temporary file left behind.
    let leftovers: Vec<_> = std::fs::read_dir(folder.path())
        .unwrap()
        .flatten()
        .filter(|e| e.file_name().to_string_lossy().ends_with(".tmp"))
        .collect();
    assert!(leftovers.is_empty());
    // Save and quit from the confirmation.
    type_text(&mut app, "x");
    app.handle_key(Key::Ctrl('q'));
    app.handle_key(Key::Char('s'));
    assert!(app.should_quit);
}

#[test]
fn help_popup_opens_and_closes() {
    let mut app = app();
    app.handle_key(Key::F(1));
    assert_eq!(app.popup(), Some(&Popup::Help(HelpPopup::default())));
    // Keys do not leak through the popup.
    app.handle_key(Key::Char('x'));
    assert_eq!(app.symptoms.query, "");
    app.handle_key(Key::Esc);
    assert_eq!(app.popup(), None);
}

#[test]
fn help_line_always_names_help_save_and_quit() {
    let mut app = app();
    for screen in [Key::F(2), Key::F(3), Key::F(4), Key::F(5)] {
        app.handle_key(screen);
        let keys: Vec<&str> = app.key_hints().iter().map(|(k, _)| *k).collect();
        for needed in ["F1", "^S", "^Q", "Tab"] {
            assert!(keys.contains(&needed), "{:?} lacks {needed}", app.screen);
        }
    }
}

#[test]
fn mouse_click_on_a_tab_switches_screen() {
    let mut app = app();
    let labels = rolltriage::tui::app::tab_labels();
    let column = (labels[0].chars().count() + 1 + labels[1].chars().count() + 1 + 2) as u16;
    app.handle_event(rolltriage::tui::event::Event::Mouse(
        rolltriage::tui::event::Mouse::Click { column, row: 0 },
    ));
    assert_eq!(app.screen, Screen::Results);
}

#[test]
fn help_line_fits_80_columns_on_every_screen() {
    let mut app = app();
    let check = |app: &rolltriage::tui::app::App| {
        let width: usize = app
            .key_hints()
            .iter()
            .map(|(k, w)| k.chars().count() + 1 + w.chars().count() + 2)
            .sum::<usize>()
            - 2;
        assert!(width <= 80, "{:?}: help line is {width} wide", app.screen);
    };
    check(&app);
    app.handle_key(Key::Right);
    check(&app);
    app.handle_key(Key::Esc);
    for screen in [Key::F(3), Key::F(4), Key::F(5)] {
        app.handle_key(screen);
        check(&app);
    }
    app.handle_key(Key::F(3));
    app.handle_key(Key::Char('3'));
    check(&app);
}

#[test]
fn a_blank_case_shows_preset_values_as_assumed_not_entered() {
    let app = app();
    // The case layer resolves a blank case from presets and defaults; every field it fills
    // is listed as assumed, and the form shows it so.
    let resolved = app
        .session
        .resolved
        .as_ref()
        .expect("a blank case resolves from presets");
    assert!(!resolved.assumed.is_empty());
    for field in ["web.thickness", "winding.method"] {
        assert!(
            app.session.assumed(field).is_some(),
            "{field} should be assumed"
        );
        assert_eq!(rolltriage::tui::fields::get(&app.session.case, field), None);
    }
}

#[test]
fn export_writes_a_report_of_the_results_in_the_format_of_the_file_name() {
    let folder = tempfile::tempdir().unwrap();
    let mut app = app();
    app.set_case(sample_case(), None);
    finish_requests(&mut app, &outcome(1.0), &outcome(1.0));
    app.handle_key(Key::Ctrl('e'));
    match app.popup() {
        Some(Popup::File(p)) => {
            assert!(p.prompt.input.ends_with("_report.md"), "{}", p.prompt.input)
        }
        other => panic!("expected the export prompt, got {other:?}"),
    }
    app.popups.clear();
    for (name, needle) in [
        ("r.md", "Web tension too low for this web"),
        ("r.json", "tension_too_low"),
    ] {
        let path = folder.path().join(name);
        app.export_to(&path).unwrap();
        let text = std::fs::read_to_string(&path).unwrap();
        assert!(text.contains(needle), "{name}: {text}");
    }
}

#[test]
fn export_refuses_out_of_date_results() {
    let folder = tempfile::tempdir().unwrap();
    let mut app = app();
    app.set_case(sample_case(), None);
    finish_requests(&mut app, &outcome(1.0), &outcome(1.0));
    app.handle_key(Key::F(2));
    app.handle_key(Key::Enter); // the case changes
    assert!(app.export_to(&folder.path().join("r.md")).is_err());
}

fn start_walkthrough(app: &mut rolltriage::tui::app::App, id: &str) {
    // A known shuffle, so a failure can be replayed.
    app.training_seed = Some(7);
    app.session.walkthroughs = rolltriage::training::library::embedded().unwrap();
    let index = app
        .session
        .walkthroughs
        .iter()
        .position(|w| w.walkthrough.id == id)
        .unwrap();
    app.handle_key(Key::Ctrl('t'));
    assert_eq!(
        app.popup(),
        Some(&Popup::Training(TrainingPopup { selected: 0 }))
    );
    for _ in 0..index {
        app.handle_key(Key::Down);
    }
    app.handle_key(Key::Enter);
}

/// The (0-based) choice of question `q` the walk-through file marks correct, in the order the
/// open walk-through shows them (after its shuffle).
fn correct_choice(app: &rolltriage::tui::app::App, q: usize) -> usize {
    match app.popup() {
        Some(Popup::Walkthrough(run)) => run.session.walkthrough.questions[q]
            .choices
            .iter()
            .position(|c| c.correct)
            .expect("every question has a correct choice"),
        other => panic!("expected a walk-through, got {other:?}"),
    }
}

fn walk_stage(app: &rolltriage::tui::app::App) -> WalkStage {
    match app.popup() {
        Some(Popup::Walkthrough(run)) => run.stage.clone(),
        other => panic!(
            "expected a walk-through, got {other:?} ({:?})",
            app.session.status
        ),
    }
}

#[test]
fn training_walkthrough_is_answered_inside_the_ui_and_scored() {
    let mut app = app();
    start_walkthrough(&mut app, "telescoping_newsprint");
    // Its case is open, on the symptoms (the walk-through asks for the cause).
    assert!(!app.session.case.symptoms.is_empty());
    assert_eq!(app.screen, Screen::Symptoms);
    assert_eq!(walk_stage(&app), WalkStage::Briefing);
    app.handle_key(Key::Enter);
    assert_eq!(
        walk_stage(&app),
        WalkStage::Question {
            index: 0,
            highlighted: 0
        }
    );
    // The choices are shuffled (a fixed seed here), so the test finds the right answers by
    // the file's `correct` marks, not by where cases/training/telescoping_newsprint.yaml
    // writes them.
    let right = |app: &rolltriage::tui::app::App, q: usize| correct_choice(app, q);
    // Question 1 by its number: right.
    let answer = right(&app, 0);
    app.handle_key(Key::Char(char::from(b'1' + answer as u8)));
    match walk_stage(&app) {
        WalkStage::Feedback { index, feedback } => {
            assert_eq!(index, 0);
            assert!(feedback.correct);
            assert_eq!(feedback.chosen, answer);
        }
        other => panic!("expected feedback, got {other:?}"),
    }
    app.handle_key(Key::Enter);
    // A number with no choice behind it is ignored.
    app.handle_key(Key::Char('9'));
    assert!(matches!(
        walk_stage(&app),
        WalkStage::Question { index: 1, .. }
    ));
    // Question 2 by the arrows and Enter: right.
    for _ in 0..right(&app, 1) {
        app.handle_key(Key::Down);
    }
    app.handle_key(Key::Enter);
    app.handle_key(Key::Enter);
    // Question 3: the arrows to a wrong choice, Enter; the feedback names the best answer.
    let best = right(&app, 2);
    let wrong = usize::from(best == 0);
    for _ in 0..wrong {
        app.handle_key(Key::Down);
    }
    app.handle_key(Key::Enter);
    match walk_stage(&app) {
        WalkStage::Feedback { index, feedback } => {
            assert_eq!(index, 2);
            assert!(!feedback.correct);
            assert_eq!(feedback.correct_choice, best);
            let text = feedback.to_text();
            assert!(
                text.starts_with(&format!("Not quite. The best answer is {}", best + 1)),
                "{text}"
            );
        }
        other => panic!("expected feedback, got {other:?}"),
    }
    app.handle_key(Key::Enter);
    // Question 4 (the safety one): right.
    let answer = right(&app, 3);
    app.handle_key(Key::Char(char::from(b'1' + answer as u8)));
    app.handle_key(Key::Enter);
    assert_eq!(walk_stage(&app), WalkStage::Done);
    match app.popup() {
        Some(Popup::Walkthrough(run)) => {
            let score = run.session.score();
            assert_eq!((score.correct, score.answered, score.total), (3, 4, 4));
            assert!(
                run.session
                    .closing()
                    .starts_with("Score: 3 of 4 correct (75 %)")
            );
        }
        other => panic!("{other:?}"),
    }
    app.handle_key(Key::Enter);
    assert_eq!(app.popup(), None);
    assert_eq!(
        app.session.status.as_deref(),
        Some("Walk-through finished: 3 of 4 correct (75 %)")
    );
}

#[test]
fn escape_leaves_a_walkthrough_half_way() {
    let mut app = app();
    start_walkthrough(&mut app, "telescoping_newsprint");
    app.handle_key(Key::Enter);
    // A wrong answer to question 1 (the one the file does not mark correct, wherever it sits).
    let wrong = usize::from(correct_choice(&app, 0) == 0);
    app.handle_key(Key::Char(char::from(b'1' + wrong as u8)));
    app.handle_key(Key::Esc);
    assert_eq!(app.popup(), None);
    assert_eq!(
        app.session.status.as_deref(),
        Some("Walk-through stopped: 0 of 4 correct (0 %), 3 not answered")
    );
    // The case stays open and the UI answers keys again.
    assert!(!app.session.case.symptoms.is_empty());
    app.handle_key(Key::F(3));
    assert_eq!(app.screen, Screen::Inputs);
}

#[test]
fn taper_design_runs_as_a_background_job_and_can_be_kept() {
    let mut app = app();
    app.set_case(sample_case(), None);
    finish_requests(&mut app, &outcome(1.0), &outcome(1.0));
    // A small roll (about 260 wraps) keeps the many solves of the design quick in debug builds.
    let mut small = resolved("Sample");
    small.roll.outer_diameter = 0.14;
    app.session.resolved = Ok(small);
    app.handle_key(Key::F(5));
    app.handle_key(Key::Char('d'));
    let request = app.take_requests().pop().unwrap();
    assert_eq!(request.task, rolltriage::tui::job::Task::DesignTaper);
    assert!(app.session.is_solving());
    // Run the real design on the sample case, as the worker thread would.
    let design =
        rolltriage::taper_design::design(request.resolved.as_ref().unwrap(), &Default::default())
            .unwrap();
    app.on_job(rolltriage::tui::job::JobMessage::DesignFinished {
        id: request.id,
        generation: request.generation,
        result: Ok(Box::new(design.clone())),
    });
    assert!(!app.session.is_solving());
    assert!(
        app.what_if
            .description
            .as_deref()
            .unwrap()
            .starts_with("Designed taper")
    );
    app.handle_key(Key::Char('a'));
    assert!(app.session.dirty);
    // The designed tension is written in the user's units, not as a bare SI number.
    assert_eq!(
        app.session.case.winding.tension,
        Some(rolltriage::case::QuantityText::Text(
            rolltriage::units::format_quantity(
                design.start_tension,
                rolltriage::units::QuantityKind::ForcePerWidth,
                app.session.units
            )
        ))
    );
    assert!(app.session.case.winding.taper.is_some());
}

#[test]
fn core_step_doubles_the_effective_core_stiffness_at_the_same_size() {
    let mut app = app();
    app.set_case(sample_case(), None);
    finish_requests(&mut app, &outcome(1.0), &outcome(1.0));
    app.session.resolved = Ok(resolved("Sample"));
    app.handle_key(Key::F(5));
    for _ in 0..3 {
        app.handle_key(Key::Down);
    }
    app.handle_key(Key::Right);
    assert_eq!(app.what_if.change.unwrap().setting, Setting::Core);
    let request = app.take_requests().pop().unwrap();
    // The sample core is a measured Ec of 1 GPa.
    match request.case.core.stiffness {
        Some(rolltriage::case::QuantityText::Number(v)) => assert!((v - 2e9).abs() < 1.0),
        ref other => panic!("unexpected stiffness {other:?}"),
    }
    assert!(
        request.case.core.outside_diameter.is_none(),
        "core size unchanged"
    );
}

fn calibrate_popup(app: &rolltriage::tui::app::App) -> &rolltriage::tui::app::CalibratePopup {
    match app.popup() {
        Some(Popup::Calibrate(prompt)) => prompt,
        other => panic!("expected the calibration popup, got {other:?}"),
    }
}

fn type_into(app: &mut rolltriage::tui::app::App, text: &str) {
    for c in text.chars() {
        app.handle_key(Key::Char(c));
    }
}

#[test]
fn stack_calibration_fits_the_csv_and_writes_k1_k2_into_the_case() {
    let mut app = app();
    app.set_case(sample_case(), None);
    app.handle_key(Key::F(3));
    app.handle_key(Key::Ctrl('k'));
    type_into(&mut app, "cases/calibration/harbour_news_45.csv");
    app.handle_key(Key::Enter);
    let prompt = calibrate_popup(&app);
    assert_eq!(prompt.prompt.error, None);
    let fitted = prompt.fit.as_ref().unwrap();
    // SciPy's curve_fit on the same file, relative weighting
    // (tests/reference/curve_fit_pfeiffer.json): K1 4398.08 Pa, K2 21.2723, 19 loading points.
    let rel = |a: f64, b: f64| (a - b).abs() / b;
    assert!(
        rel(fitted.fit.k1, 4398.079832042864) < 1e-3,
        "{}",
        fitted.fit.k1
    );
    assert!(
        rel(fitted.fit.k2, 21.272339472054416) < 1e-3,
        "{}",
        fitted.fit.k2
    );
    assert!(rel(fitted.fit.k1_standard_error, 83.44074773345993) < 0.05);
    assert_eq!(fitted.fit.points.len(), 19);
    // Nothing is written until it is confirmed.
    assert!(!app.session.dirty);
    let generation = app.session.generation;
    app.handle_key(Key::Enter);
    assert_eq!(app.popup(), None);
    assert!(app.session.dirty);
    assert!(app.session.generation > generation);
    let stiffness = app.session.case.web.radial_stiffness.clone().unwrap();
    assert_eq!(stiffness.law, "pfeiffer");
    assert!(rel(stiffness.k2.unwrap(), 21.272339472054416) < 1e-3);
    // The case resolves with the fitted law in Pa.
    match app.session.resolved.as_ref().unwrap().web.radial_stiffness {
        rolltriage::model::RadialStiffness::Pfeiffer { k1, k2 } => {
            assert!(rel(k1, 4398.079832042864) < 1e-3, "{k1}");
            assert!(rel(k2, 21.272339472054416) < 1e-3, "{k2}");
        }
        ref other => panic!("{other:?}"),
    }
    assert!(app.session.status.as_deref().unwrap().contains("unsaved"));
}

#[test]
fn stack_calibration_reports_bad_files_in_the_popup() {
    let mut app = app();
    app.set_case(sample_case(), None);
    app.handle_key(Key::F(3));
    app.handle_key(Key::Ctrl('k'));
    type_into(&mut app, "cases/calibration/no_such_file.csv");
    app.handle_key(Key::Enter);
    let error = calibrate_popup(&app).prompt.error.clone().unwrap();
    assert!(error.contains("no_such_file.csv"), "{error}");
    assert!(calibrate_popup(&app).fit.is_none());

    let folder = tempfile::tempdir().unwrap();
    let bad = folder.path().join("bad.csv");
    std::fs::write(&bad, "strain,pressure [kPa]\n0.01,abc\nnot,a,row\n").unwrap();
    for _ in 0..40 {
        app.handle_key(Key::Backspace);
    }
    type_into(&mut app, bad.to_str().unwrap());
    app.handle_key(Key::Enter);
    let error = calibrate_popup(&app).prompt.error.clone().unwrap();
    assert!(error.contains("bad.csv"), "{error}");
    // Enter again with the error shown does not write anything; Esc closes.
    app.handle_key(Key::Enter);
    app.handle_key(Key::Esc);
    assert_eq!(app.popup(), None);
    assert!(!app.session.dirty);
    assert!(app.session.case.web.radial_stiffness.is_none());
}

#[test]
fn esc_run_together_with_a_letter_is_esc_then_the_letter() {
    // Terminals send Esc then "c" as Alt-c when they arrive together (a busy machine): the
    // search must be cleared, then "c" typed, not "c" added to the old search.
    let mut app = app();
    type_text(&mut app, "telesc");
    app.handle_event(rolltriage::tui::event::Event::Key(Key::Alt('c')));
    assert_eq!(app.symptoms.query, "c");
}

/// Opening a case shows it in the units it is typed in, unless `--units` or Ctrl-U chose.
#[test]
fn a_case_opens_in_the_units_it_is_typed_in() {
    use rolltriage::tui::app::OpenPurpose;
    use rolltriage::tui::{Options, build_app};
    use rolltriage::units::UnitSystem;
    let folder = tempfile::tempdir().unwrap();
    let us = folder.path().join("us.yaml");
    std::fs::write(
        &us,
        "title: t\nweb:\n  thickness: 3 mil\n  width: 60 in\nwinding:\n  tension: 2 pli\n  speed: 1200 fpm\n  nip_load: 1 kN/m\n",
    )
    .unwrap();
    let si = folder.path().join("si.yaml");
    std::fs::write(
        &si,
        "title: t\nweb:\n  thickness: 76 um\nwinding:\n  tension: 2 pli\n  speed: 900 m/min\n",
    )
    .unwrap();
    let rules = std::sync::Arc::new(rolltriage::diagnose::rules::RuleBase::embedded().unwrap());
    let open = |case: &std::path::Path, units: Option<UnitSystem>| {
        let options = Options {
            case: Some(case.to_path_buf()),
            units,
            ..Options::default()
        };
        build_app(&options, std::sync::Arc::clone(&rules)).unwrap()
    };
    assert_eq!(
        open(&us, None).session.units,
        UnitSystem::Us,
        "4 US against 1 SI"
    );
    assert_eq!(
        open(&si, None).session.units,
        UnitSystem::Si,
        "2 SI against 1 US"
    );
    assert_eq!(
        open(&us, Some(UnitSystem::Si)).session.units,
        UnitSystem::Si,
        "--units wins"
    );
    // Opening another file from the UI follows that file, until Ctrl-U chose.
    let mut app = open(&us, None);
    app.open_path(&si, OpenPurpose::WholeCase).unwrap();
    assert_eq!(app.session.units, UnitSystem::Si);
    app.handle_key(Key::Ctrl('u'));
    assert_eq!(app.session.units, UnitSystem::Us);
    app.open_path(&si, OpenPurpose::WholeCase).unwrap();
    assert_eq!(app.session.units, UnitSystem::Us, "the user's choice stays");
}
