//! The complaint's story (F7) and the complaint history (F8), driven by keys without a
//! terminal: a case opened from a file shows what the file said, edits are checked and kept as
//! typed, saving writes them back; the history popup lists, shows, finds similar complaints and
//! adds the case, with the store's work done by `history_job::run_request` as the worker
//! thread would. Snapshots at 80×24 and 120×40.

use crate::tui_support;

use std::path::{Path, PathBuf};

use crate::tui_support::draw;
use rolltriage::case::Case;
use rolltriage::diagnose::rules::RuleBase;
use rolltriage::history::Location;
use rolltriage::tui::app::{App, HistoryView, Popup};
use rolltriage::tui::event::Key;
use rolltriage::tui::history_job::run_request;
use rolltriage::tui::popups::story::{ActionPart, CausePart, Field};

const FIXTURE: &str = "tests/history_fixtures/line4_film_telescoping.yaml";
const SIZES: [(u16, u16); 2] = [(80, 24), (120, 40)];

fn fixture() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join(FIXTURE)
}

/// The app on the fixture's case, opened from its file.
fn opened() -> App {
    let mut app = tui_support::app();
    app.open_path(&fixture(), rolltriage::tui::app::OpenPurpose::WholeCase)
        .unwrap();
    app.session.take_requests();
    app
}

fn type_text(app: &mut App, text: &str) {
    for c in text.chars() {
        app.handle_key(Key::Char(c));
    }
}

fn story_field(app: &App) -> Option<Field> {
    match app.popups.last() {
        Some(Popup::Story(p)) => p.field(&app.session),
        _ => None,
    }
}

/// Move the story popup's selection to `field`.
fn select(app: &mut App, field: Field) {
    app.handle_key(Key::Home);
    for _ in 0..80 {
        if story_field(app) == Some(field) {
            return;
        }
        app.handle_key(Key::Down);
    }
    panic!("no row {field:?}");
}

/// Replace the text of `field` with `text` and press Enter.
fn enter(app: &mut App, field: Field, text: &str) {
    select(app, field);
    app.handle_key(Key::Enter);
    app.handle_key(Key::Ctrl('u'));
    type_text(app, text);
    app.handle_key(Key::Enter);
}

fn story_error(app: &App) -> Option<String> {
    match app.popups.last() {
        Some(Popup::Story(p)) => p.error.clone(),
        _ => None,
    }
}

#[test]
fn the_story_shows_what_the_file_said() {
    let mut app = opened();
    app.handle_key(Key::F(7));
    assert!(matches!(app.popup(), Some(Popup::Story(_))));
    let screen = draw(&app, 120, 40);
    for said in [
        "Line 4 film rolls telescoping at the printer",
        "HF-2026-031",
        "Quaymoor Press",
        "2026-11-20",
        "6",
        "2, 5",
        "customer",
        "Held the other 18 rolls",
    ] {
        assert!(screen.contains(said), "{said} missing:\n{screen}");
    }
    for (w, h) in SIZES {
        insta::assert_snapshot!(format!("story_{w}x{h}"), draw(&app, w, h));
    }
}

#[test]
fn edits_are_checked_kept_as_typed_and_saved_back() {
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("complaint.yaml");
    std::fs::copy(fixture(), &path).unwrap();
    let mut app = tui_support::app();
    app.open_path(&path, rolltriage::tui::app::OpenPurpose::WholeCase)
        .unwrap();
    let generation = app.session.generation;
    app.handle_key(Key::F(7));

    enter(&mut app, Field::Customer, "Kestrel Labels");
    enter(&mut app, Field::Notes, "Seen by the night shift first");
    enter(
        &mut app,
        Field::SymptomNotes(0),
        "Cone about 10 mm on the drive side",
    );
    enter(
        &mut app,
        Field::Description,
        "Six rolls coned at the customer.",
    );
    enter(&mut app, Field::RollsAffected, "7");
    enter(&mut app, Field::SlitPositions, "2, 5 6");
    assert!(app.session.dirty);
    // The story is not an input of the solve: the results stay current.
    assert_eq!(app.session.generation, generation);

    // A date that is not one is refused; the text stays for correcting.
    enter(&mut app, Field::Received, "last Tuesday");
    let error = story_error(&app).expect("refused");
    assert!(error.contains("YYYY-MM-DD"), "{error}");
    match app.popup() {
        Some(Popup::Story(p)) => assert_eq!(p.editing.as_deref(), Some("last Tuesday")),
        other => panic!("{other:?}"),
    }
    assert!(draw(&app, 80, 24).contains("Not accepted"));
    for (w, h) in SIZES {
        insta::assert_snapshot!(format!("story_refused_{w}x{h}"), draw(&app, w, h));
    }
    app.handle_key(Key::Esc);
    assert_eq!(story_error(&app), None);

    // More rolls affected than checked contradicts the record.
    enter(&mut app, Field::RollsAffected, "30");
    assert!(story_error(&app).unwrap().contains("rolls_checked"));
    app.handle_key(Key::Esc);

    // Choices move with ←/→; a cause is picked by its name; actions are added by typing.
    select(&mut app, Field::Status);
    app.handle_key(Key::Right);
    enter(&mut app, Field::AddCause, "tension too low");
    enter(
        &mut app,
        Field::Cause(0, CausePart::Evidence),
        "trial at 1.7 pli",
    );
    enter(&mut app, Field::Cause(0, CausePart::On), "2026-11-24");
    enter(&mut app, Field::AddAction, "Check the tension transducer");
    enter(&mut app, Field::Action(1, ActionPart::Owner), "maintenance");
    // not checked → (blank) → stopped
    select(&mut app, Field::VerificationResult);
    app.handle_key(Key::Right);
    app.handle_key(Key::Right);
    // An unknown cause is refused with a suggestion.
    enter(&mut app, Field::AddCause, "tension to low");
    assert!(story_error(&app).unwrap().contains("did you mean"));
    app.handle_key(Key::Esc);

    // Ctrl-S inside the popup saves the file; what was typed comes back from it.
    app.handle_key(Key::Ctrl('s'));
    assert!(!app.session.dirty, "{:?}", app.session.status);
    let saved = Case::load(&path).unwrap();
    let c = saved.complaint.clone().unwrap();
    assert_eq!(c.customer.as_deref(), Some("Kestrel Labels"));
    assert_eq!(
        saved.notes.as_deref(),
        Some("Seen by the night shift first")
    );
    assert_eq!(
        saved.symptoms[0].notes.as_deref(),
        Some("Cone about 10 mm on the drive side")
    );
    assert_eq!(
        saved.description.as_deref(),
        Some("Six rolls coned at the customer.")
    );
    assert_eq!(c.rolls_affected, Some(7));
    assert_eq!(c.slit_positions, vec![2, 5, 6]);
    assert_eq!(c.received.as_deref(), Some("2026-11-20"));
    assert_eq!(c.status.as_deref(), Some("cause_confirmed"));
    assert_eq!(c.confirmed_causes.len(), 1);
    assert_eq!(c.confirmed_causes[0].cause, "tension_too_low");
    assert_eq!(
        c.confirmed_causes[0].evidence.as_deref(),
        Some("trial at 1.7 pli")
    );
    assert_eq!(c.actions.len(), 2);
    assert_eq!(c.actions[1].owner.as_deref(), Some("maintenance"));
    assert_eq!(
        c.verification.clone().and_then(|v| v.result).as_deref(),
        Some("stopped")
    );
    assert!(
        c.check(Some(&rolltriage::vocabulary::CAUSE_IDS[..]))
            .is_ok(),
        "the saved record passes the case-file checks"
    );

    // Delete on a cause's first row removes it; on a field it clears it.
    select(&mut app, Field::Cause(0, CausePart::Cause));
    app.handle_key(Key::Delete);
    select(&mut app, Field::Customer);
    app.handle_key(Key::Delete);
    let c = app.session.case.complaint.clone().unwrap();
    assert!(c.confirmed_causes.is_empty());
    assert_eq!(c.customer, None);
    // The title cannot be emptied.
    enter(&mut app, Field::Title, "  ");
    assert!(story_error(&app).unwrap().contains("title"));
    app.handle_key(Key::Esc);
    app.handle_key(Key::Esc);
    assert!(app.popup().is_none());
}

#[test]
fn f7_and_f8_do_not_clash_and_are_in_the_help() {
    let sections = rolltriage::tui::popups::help::sections();
    let everywhere = &sections[0].1;
    assert!(everywhere.iter().any(|(k, _)| *k == "F7"));
    assert!(everywhere.iter().any(|(k, _)| *k == "F8"));
    assert!(sections.iter().any(|(s, _)| s.contains("story")));
    assert!(sections.iter().any(|(s, _)| s.contains("history")));
    // Their help lines fit the 80-column help box (2 + 24 columns of keys, then the text).
    for (section, entries) in &sections {
        if section.contains("F7") || section.contains("F8") {
            for (keys, what) in entries {
                assert!(2 + 24 + what.chars().count() <= 78, "{keys}: {what}");
            }
        }
    }
    for (keys, what) in everywhere
        .iter()
        .filter(|(k, _)| k.starts_with("F7") || k.starts_with("F8"))
    {
        assert!(2 + 24 + what.chars().count() <= 78, "{keys}: {what}");
    }
    let mut app = tui_support::app();
    // The help still scrolls to its last section at 80×24 with the two new sections.
    app.handle_key(Key::F(1));
    for _ in 0..10 {
        app.handle_key(Key::PageDown);
    }
    let help = draw(&app, 80, 24);
    assert!(help.contains("Reading the plots"), "{help}");
    assert!(help.contains("crush rating"), "{help}");
    app.handle_key(Key::Esc);
    // No other key of the app opens these popups, and they close with their own key.
    app.handle_key(Key::F(7));
    app.handle_key(Key::F(7));
    assert!(app.popup().is_none());
    app.handle_key(Key::F(8));
    assert!(matches!(app.popup(), Some(Popup::History(_))));
    app.handle_key(Key::Esc);
    assert!(app.popup().is_none());
}

#[test]
fn history_without_a_store_says_so() {
    let mut app = tui_support::app();
    app.handle_key(Key::F(8));
    assert!(app.take_history_requests().is_empty());
    let screen = draw(&app, 80, 24);
    assert!(
        screen.contains("No complaint history store is configured"),
        "{screen}"
    );
    for (w, h) in SIZES {
        insta::assert_snapshot!(format!("history_no_store_{w}x{h}"), draw(&app, w, h));
    }
    // A configured store that does not exist yet is named, not created by reading.
    let folder = tempfile::tempdir().unwrap();
    let store = folder.path().join("none.sqlite");
    app.handle_key(Key::Esc);
    app.session.history = Ok(Location::File(store.clone()));
    app.handle_key(Key::F(8));
    pump(&mut app);
    assert!(!store.exists());
    assert!(draw(&app, 120, 40).contains("No history store at"));
}

/// Do the queued history work as the worker thread would and hand the answers back.
fn pump(app: &mut App) {
    let rules = RuleBase::embedded().unwrap();
    for _ in 0..10 {
        let requests = app.take_history_requests();
        if requests.is_empty() {
            return;
        }
        for request in requests {
            let reply = run_request(&rules, &request);
            app.on_history(reply);
        }
    }
}

fn history_view(app: &App) -> HistoryView {
    match app.popup() {
        Some(Popup::History(p)) => p.view,
        other => panic!("{other:?}"),
    }
}

/// The drawn screen with the temporary store's path replaced.
fn redacted(app: &App, w: u16, h: u16, store: &Path) -> String {
    // Padded to the path's width so the frame stays aligned.
    let path = store.display().to_string();
    let width = path.chars().count();
    draw(app, w, h).replace(&path, &format!("{:<width$}", "[store]"))
}

#[test]
fn history_lists_shows_finds_similar_and_adds() {
    let folder = tempfile::tempdir().unwrap();
    let store = folder.path().join("h.sqlite");
    let mut app = opened();
    app.session.history = Ok(Location::File(store.clone()));
    app.handle_key(Key::F(8));
    pump(&mut app);
    // Add the case on screen twice under different references.
    app.handle_key(Key::Char('a'));
    pump(&mut app);
    let screen = draw(&app, 120, 40);
    assert!(screen.contains("Stored as complaint 1"), "{screen}");
    // The same reference again is refused, as `history add` refuses it.
    app.handle_key(Key::Char('a'));
    pump(&mut app);
    assert!(draw(&app, 120, 40).contains("already stored as number 1"));
    // Store a confirmed twin with what was done, through the story popup.
    app.handle_key(Key::Esc);
    app.handle_key(Key::F(7));
    enter(&mut app, Field::Reference, "HF-2026-040");
    enter(&mut app, Field::AddCause, "tension too low");
    // not checked → (blank) → stopped
    select(&mut app, Field::VerificationResult);
    app.handle_key(Key::Right);
    app.handle_key(Key::Right);
    app.handle_key(Key::Esc);
    app.handle_key(Key::F(8));
    pump(&mut app);
    app.handle_key(Key::Char('a'));
    pump(&mut app);
    match app.popup() {
        Some(Popup::History(p)) => match &p.list {
            rolltriage::tui::popups::history::Loaded::Ready(l) => assert_eq!(l.total, 2),
            other => panic!("{other:?}"),
        },
        other => panic!("{other:?}"),
    }
    let list = redacted(&app, 120, 40, &store);
    assert!(list.contains("Line 4 film rolls telescoping"), "{list}");
    // The note under the list is the add's; the list itself is what the snapshot holds.
    if let Some(Popup::History(p)) = app.popups.last_mut() {
        p.note = None;
    }
    for (w, h) in SIZES {
        insta::assert_snapshot!(
            format!("history_list_{w}x{h}"),
            redacted(&app, w, h, &store)
        );
    }

    // Enter shows the selected (newest) complaint: its record, ranking then, versions.
    app.handle_key(Key::Enter);
    assert_eq!(history_view(&app), HistoryView::Complaint);
    pump(&mut app);
    let shown = draw(&app, 120, 40);
    assert!(shown.contains("Complaint 2"), "{shown}");
    assert!(shown.contains("HF-2026-040"), "{shown}");
    assert!(shown.contains("Likely causes as ranked then"), "{shown}");
    assert!(shown.contains("added"), "{shown}");
    app.handle_key(Key::Esc);
    assert_eq!(history_view(&app), HistoryView::List);

    // s: the past complaints like this case, with the confirmed cause and what was done.
    app.handle_key(Key::Char('s'));
    assert_eq!(history_view(&app), HistoryView::Similar);
    pump(&mut app);
    let similar = draw(&app, 120, 40);
    assert!(similar.contains("distance 0.00"), "{similar}");
    assert!(similar.contains("cause: Web tension too low"), "{similar}");
    assert!(
        similar.contains("Restore the tension set point to 1.7 pli"),
        "{similar}"
    );
    assert!(similar.contains("→ stopped"), "{similar}");
    for (w, h) in SIZES {
        insta::assert_snapshot!(format!("history_similar_{w}x{h}"), draw(&app, w, h));
    }
    // The what-was-done lines wrap with their numbers and units together at every width.
    for w in 50..=120 {
        let screen = draw(&app, w, 40);
        let split = crate::wrap::split_on_screen(&screen);
        assert!(split.is_none(), "width {w}: {split:?}");
    }

    // A report exported now carries them (read from the answer, not from the store again).
    app.handle_key(Key::Esc);
    app.handle_key(Key::Esc);
    app.session.solve_again();
    let sample = tui_support::outcome(1.0);
    tui_support::finish_requests(&mut app, &sample, &sample);
    let report = folder.path().join("r.md");
    app.export_to(&report).unwrap();
    let text = std::fs::read_to_string(&report).unwrap();
    assert!(text.contains("## Similar past complaints"), "{text}");
    assert!(text.contains("Web tension too low"), "{text}");
}
