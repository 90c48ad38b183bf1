//! Render tests: every screen drawn on ratatui's TestBackend at 80×24 (the smallest terminal we
//! support) and 120×40, compared with committed insta snapshots. Drawn in monochrome: the
//! snapshots hold only the characters, which must carry all the meaning without colour.

use crate::tui_support;

use ratatui::Terminal;
use ratatui::backend::TestBackend;
use rolltriage::tui::app::App;
use rolltriage::tui::event::Key;
use rolltriage::tui::screens::AppView;
use rolltriage::tui::theme::Theme;
use tui_support::*;

const SIZES: [(u16, u16); 2] = [(80, 24), (120, 40)];

fn snapshot_all_sizes(name: &str, app: &App) {
    for (w, h) in SIZES {
        insta::assert_snapshot!(format!("{name}_{w}x{h}"), draw(app, w, h));
    }
}

fn type_text(app: &mut App, text: &str) {
    for c in text.chars() {
        app.handle_key(Key::Char(c));
    }
}

fn with_results() -> App {
    let mut app = app();
    app.set_case(sample_case(), Some("cases/reel7.yaml".into()));
    finish_requests(&mut app, &outcome(1.0), &outcome(1.0));
    app
}

#[test]
fn symptoms_screen() {
    let mut app = app();
    type_text(&mut app, "telesc");
    app.handle_key(Key::Enter);
    app.handle_key(Key::Esc);
    type_text(&mut app, "st");
    snapshot_all_sizes("symptoms", &app);
}

#[test]
fn symptoms_details_with_questions() {
    let mut app = app();
    type_text(&mut app, "coning");
    app.handle_key(Key::Right);
    app.handle_key(Key::Right);
    app.handle_key(Key::Right);
    app.handle_key(Key::Right);
    app.handle_key(Key::Down);
    app.handle_key(Key::Char('y'));
    snapshot_all_sizes("symptoms_details", &app);
}

#[test]
fn inputs_screen_with_a_rejected_entry() {
    let mut app = app();
    app.handle_key(Key::F(3));
    let index = rolltriage::tui::fields::FIELDS
        .iter()
        .position(|f| f.path == "winding.tension")
        .unwrap();
    for _ in 0..index {
        app.handle_key(Key::Down);
    }
    type_text(&mut app, "48 mil");
    app.handle_key(Key::Enter);
    // A fixed resolved case so the snapshot does not follow edits to the preset table.
    app.session.resolved = Ok(resolved_with_assumed());
    snapshot_all_sizes("inputs_rejected", &app);
}

#[test]
fn results_screen() {
    let app = with_results();
    snapshot_all_sizes("results", &app);
}

#[test]
fn results_with_reasons_and_remedies_focused() {
    let mut app = with_results();
    app.handle_key(Key::Enter);
    app.handle_key(Key::Right);
    app.handle_key(Key::Down);
    snapshot_all_sizes("results_reasons", &app);
}

#[test]
fn results_while_solving() {
    let mut app = app();
    app.set_case(sample_case(), None);
    let request = app.take_requests().pop().unwrap();
    app.on_job(rolltriage::tui::job::JobMessage::Progress {
        id: request.id,
        fraction: 0.42,
    });
    snapshot_all_sizes("results_solving", &app);
}

#[test]
fn a_result_with_nan_shows_a_plain_message_on_the_results_screen() {
    // The job refuses a profile with a NaN (crate::finite, as the command line does); the
    // results screen says so in words and never draws "NaN".
    let mut app = app();
    app.set_case(sample_case(), None);
    let request = app.take_requests().pop().unwrap();
    let error =
        rolltriage::finite::ensure_finite("the stress profile", &[1.0, f64::NAN]).unwrap_err();
    app.on_job(rolltriage::tui::job::JobMessage::Finished {
        id: request.id,
        purpose: request.purpose,
        generation: request.generation,
        result: Err(rolltriage::tui::job::JobError::NotFinite(error)),
    });
    for (w, h) in SIZES {
        let screen = draw(&app, w, h);
        assert!(screen.contains("No results"), "{screen}");
        assert!(screen.contains("could not be"), "{screen}");
        assert!(!screen.contains("NaN"), "{screen}");
    }
}

#[test]
fn what_if_screen_before_and_after() {
    let mut app = with_results();
    app.session.resolved = Ok(resolved("Sample"));
    app.handle_key(Key::F(5));
    app.handle_key(Key::Right);
    finish_requests(&mut app, &outcome(1.0), &outcome(0.8));
    snapshot_all_sizes("what_if", &app);
}

#[test]
fn help_popup() {
    let mut app = app();
    app.handle_key(Key::F(1));
    snapshot_all_sizes("help", &app);
}

#[test]
fn unsaved_changes_popup() {
    let mut app = app();
    type_text(&mut app, "telesc");
    app.handle_key(Key::Enter);
    app.handle_key(Key::Ctrl('q'));
    snapshot_all_sizes("confirm_quit", &app);
}

#[test]
fn monochrome_and_colour_draw_the_same_characters() {
    let app = with_results();
    let mono = draw(&app, 80, 24);
    let mut terminal = Terminal::new(TestBackend::new(80, 24)).unwrap();
    terminal
        .draw(|frame| {
            frame.render_widget(
                AppView {
                    app: &app,
                    theme: Theme { color: true },
                },
                frame.area(),
            )
        })
        .unwrap();
    assert_eq!(mono, terminal.backend().to_string());
}

#[test]
fn plots_label_every_zone_and_the_reference_lines_at_120_columns() {
    let app = with_results();
    let screen = draw(&app, 120, 40);
    for label in ["inner", "middle", "outer", "crush rating"] {
        assert!(screen.contains(label), "missing {label}:\n{screen}");
    }
}

#[test]
fn training_picker() {
    let mut app = app();
    app.session.walkthroughs = rolltriage::training::library::embedded().unwrap();
    app.handle_key(Key::Ctrl('t'));
    // Draw only the first size: the list itself follows the shipped walk-throughs.
    let screen = draw(&app, 80, 24);
    assert!(screen.contains("Training walk-throughs"), "{screen}");
    assert!(
        screen.contains(&app.session.walkthroughs[0].walkthrough.title),
        "{screen}"
    );
    // Every row shows its level whole: a long title is cut with "…", not the level.
    let shown = app.session.walkthroughs.len().min(16);
    for loaded in &app.session.walkthroughs[..shown] {
        let level = format!("[{}]", loaded.walkthrough.level.as_deref().unwrap_or(""));
        let start: String = loaded.walkthrough.title.chars().take(20).collect();
        let row = screen.lines().find(|l| l.contains(&start)).unwrap();
        assert!(row.contains(&level), "{row}\n{screen}");
    }
}

#[test]
fn training_walkthrough_question_and_feedback() {
    let mut app = app();
    app.session.walkthroughs = rolltriage::training::library::embedded().unwrap();
    // A fixed shuffle, so the snapshot holds still.
    app.training_seed = Some(7);
    let index = app
        .session
        .walkthroughs
        .iter()
        .position(|w| w.walkthrough.id == "telescoping_newsprint")
        .unwrap();
    app.handle_key(Key::Ctrl('t'));
    for _ in 0..index {
        app.handle_key(Key::Down);
    }
    app.handle_key(Key::Enter);
    app.handle_key(Key::Enter);
    app.handle_key(Key::Down);
    insta::assert_snapshot!("training_question_80x24", draw(&app, 80, 24));
    // The choices are shuffled (seed 7 here): answer wrong wherever the right one landed.
    let best = match app.popup() {
        Some(rolltriage::tui::popups::Popup::Walkthrough(run)) => run.session.walkthrough.questions
            [0]
        .choices
        .iter()
        .position(|c| c.correct)
        .unwrap(),
        other => panic!("expected a walk-through, got {other:?}"),
    };
    let wrong = usize::from(best == 0);
    app.handle_key(Key::Char(char::from(b'1' + wrong as u8)));
    let feedback = draw(&app, 80, 24);
    let expected = format!("Not quite. The best answer is {}", best + 1);
    assert!(feedback.contains(&expected), "{feedback}");
}

#[test]
fn stack_calibration_fit() {
    let mut app = app();
    app.set_case(sample_case(), None);
    app.handle_key(Key::F(3));
    // The key is on the inputs screen's help line, which stays within 80 columns.
    let screen = draw(&app, 80, 24);
    let help_line = screen.lines().last().unwrap();
    assert!(help_line.contains("^K calibrate"), "{help_line}");
    assert!(help_line.contains("^Q quit"), "{help_line}");
    app.handle_key(Key::Ctrl('k'));
    type_text(&mut app, "cases/calibration/harbour_news_45.csv");
    app.handle_key(Key::Enter);
    insta::assert_snapshot!("stack_calibration_80x24", draw(&app, 80, 24));
}

#[test]
fn what_if_shows_a_taper_design_with_its_limits() {
    let mut app = with_results();
    // A small roll (about 260 wraps) keeps the design's many solves quick in debug builds.
    let mut small = resolved("Sample");
    small.roll.outer_diameter = 0.14;
    app.session.resolved = Ok(small);
    app.handle_key(Key::F(5));
    app.handle_key(Key::Char('d'));
    let request = app.take_requests().pop().unwrap();
    let design =
        rolltriage::taper_design::design(request.resolved.as_ref().unwrap(), &Default::default())
            .unwrap();
    app.on_job(rolltriage::tui::job::JobMessage::DesignFinished {
        id: request.id,
        generation: request.generation,
        result: Ok(Box::new(design)),
    });
    let screen = draw(&app, 120, 40);
    for text in [
        "Designed taper",
        "allowed",
        "core pressure",
        "wound-in tension",
        "• before",
    ] {
        assert!(screen.contains(text), "missing {text}:\n{screen}");
    }
}

/// Issue 19: an answer resting on assumed inputs says so, names them and lowers the shown
/// beliefs; the selected remedy's caution is shown in full beside it.
#[test]
fn results_resting_on_assumed_inputs_say_so() {
    let mut app = app();
    app.set_case(sample_case(), Some("cases/reel7.yaml".into()));
    let mut assumed = outcome(1.0);
    assumed.resolved = resolved_with_assumed();
    finish_requests(&mut app, &assumed, &assumed);
    app.handle_key(Key::Right);
    app.handle_key(Key::Down);
    snapshot_all_sizes("results_assumed", &app);
    for (w, h) in [(80, 24), (120, 40)] {
        let screen = draw(&app, w, h);
        assert!(screen.contains("inputs assumed"), "{screen}");
        assert!(screen.contains("Nip pinch point"), "{screen}");
    }
}

/// The winder rows of the form (issue 16): the nip programme typed as a table, the drums of a
/// two-drum winder and the centre torque, all from the field registry.
#[test]
fn inputs_screen_with_the_winder_rows() {
    let mut app = app();
    app.handle_key(Key::F(3));
    let go_to = |app: &mut App, path: &str| {
        let index = rolltriage::tui::fields::FIELDS
            .iter()
            .position(|f| f.path == path)
            .unwrap();
        app.handle_key(Key::Home);
        for _ in 0..index {
            app.handle_key(Key::Down);
        }
    };
    go_to(&mut app, "winding.method");
    type_text(&mut app, "two_drum");
    app.handle_key(Key::Enter);
    go_to(&mut app, "winding.nip_programme");
    type_text(&mut app, "400 mm: 5 pli; 800 mm: 3 pli");
    app.handle_key(Key::Enter);
    go_to(&mut app, "winding.drums.diameter");
    type_text(&mut app, "500 mm");
    app.handle_key(Key::Enter);
    assert_eq!(app.session.case.winding.nip_programme.len(), 2);
    assert!(app.session.case.winding.drums.is_some());
    // A fixed resolved case so the snapshot does not follow edits to the preset table.
    app.session.resolved = Ok(resolved_with_assumed());
    snapshot_all_sizes("inputs_winder", &app);
}

/// A case with assumed inputs (presets, a default): the background job's sensitivity run names
/// what the answer rests on, in the command line's words (`diagnose`'s "What the answer rests
/// on"), and an exported report carries the same section.
#[test]
fn results_say_what_the_answer_rests_on() {
    let case = small_presets_case();
    let rules = rolltriage::diagnose::rules::RuleBase::embedded().unwrap();
    let solved = rolltriage::tui::job::run_pipeline(&case, None, &rules, &mut |_| true).unwrap();
    assert!(!solved.resolved.assumed.is_empty());
    let sensitivity = solved.sensitivity.clone().expect("a sensitivity run");
    // The same run as `diagnose` makes, so the same lines.
    let cli = rolltriage::diagnose::sensitivity::sensitivity(
        &rules,
        &solved.resolved,
        &solved.profile,
        solved.diagnosis.as_ref().unwrap(),
        rolltriage::diagnose::DiagnoseOptions::default().solver,
        &mut |_| true,
    )
    .unwrap();
    assert_eq!(sensitivity.lines(3), cli.lines(3));
    let named: Vec<&str> = cli.top(3).map(|i| i.label.as_str()).collect();
    assert_eq!(solved.movers(), named);
    let mut app = app();
    app.set_case(case, Some("cases/small.yaml".into()));
    finish_requests(&mut app, &solved, &solved);
    assert_eq!(app.screen, rolltriage::tui::component::Screen::Results);
    let screen = draw(&app, 80, 24);
    insta::assert_snapshot!("results_rests_on_80x24", screen);
    assert!(
        screen.contains(&format!("moves it most: {}", named[0])),
        "{screen}"
    );
    // A tall window shows the section itself (its first lines; the pane scrolls).
    let tall = draw(&app, 120, 60);
    for line in cli.lines(3).into_iter().take(3) {
        let start: String = line.chars().take(30).collect();
        assert!(tall.contains(&start), "missing {start}:\n{tall}");
    }
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("r.md");
    app.export_to(&path).unwrap();
    let report = std::fs::read_to_string(&path).unwrap();
    assert!(report.contains("What the answer rests on"), "{report}");
    assert!(report.contains(&cli.lines(3)[0]), "{report}");
}

/// In a small window the sections below the lists are reached by scrolling on: ↓ past the last
/// cause (or End) shows "What the answer rests on" to its last line, and End in the remedies
/// shows the last remedy's cautions; ↑ comes back. Wrapped remedy lines hang under their text.
#[test]
fn results_scroll_to_what_the_answer_rests_on_and_the_cautions() {
    let case = small_presets_case();
    let rules = rolltriage::diagnose::rules::RuleBase::embedded().unwrap();
    let solved = rolltriage::tui::job::run_pipeline(&case, None, &rules, &mut |_| true).unwrap();
    let rests_on = solved
        .sensitivity
        .as_ref()
        .expect("a sensitivity run")
        .lines(3);
    let diagnosis = solved.diagnosis.as_ref().unwrap();
    let last_remedy = diagnosis.remedies.last().expect("remedies");
    let last_caution = diagnosis
        .cautions_of(last_remedy)
        .last()
        .map(|c| c.title.clone());
    // The end of a wrapped line: its last word, which must show when scrolled to the end.
    let last_word = |text: &str| text.split_whitespace().last().unwrap_or("").to_string();
    for (w, h) in [(80, 24), (120, 40)] {
        let mut app = app();
        app.set_case(case.clone(), Some("cases/small.yaml".into()));
        finish_requests(&mut app, &solved, &solved);
        let top = draw(&app, w, h);
        let mut heading_seen = false;
        for _ in 0..60 {
            app.handle_key(Key::Down);
            heading_seen |= draw(&app, w, h).contains("What the answer rests on");
        }
        let end = draw(&app, w, h);
        insta::assert_snapshot!(format!("results_rests_on_end_{w}x{h}"), end);
        assert!(heading_seen, "the heading never scrolled into view");
        let last = rests_on.last().unwrap();
        assert!(
            end.contains(&last_word(last)),
            "missing the end of {last}:\n{end}"
        );
        // ↑ scrolls back a row at a time, then moves the selection.
        for _ in 0..60 {
            app.handle_key(Key::Up);
        }
        assert_eq!(draw(&app, w, h), top);

        app.handle_key(Key::Right);
        app.handle_key(Key::End);
        let end = draw(&app, w, h);
        insta::assert_snapshot!(format!("results_remedies_end_{w}x{h}"), end);
        if let Some(title) = &last_caution {
            assert!(end.contains(title.as_str()), "missing {title}:\n{end}");
        }
        assert!(end.contains(&last_word(&last_remedy.text)), "{end}");
        // Wrapped remedy lines hang under their text: no row of the pane starts in its
        // first column with a word's continuation.
        // Rows are quoted: the pane's border is at cell w/2, its first column the next.
        let half = usize::from(w / 2);
        let title = end
            .lines()
            .position(|l| l.contains("Remedies, in the order"))
            .unwrap();
        for row in end.lines().skip(title + 1) {
            if row.chars().nth(half + 1) != Some('│') {
                continue;
            }
            let first = row.chars().nth(half + 2);
            assert!(
                !first.is_some_and(|c| c.is_lowercase()),
                "unindented continuation: {row}\n{end}"
            );
        }
    }
}
