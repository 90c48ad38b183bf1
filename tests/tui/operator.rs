//! The operator's screens (issue 19): plain words, diameters, units as the user chose them,
//! the what-if table (words, scrolling, typed targets, changes as before → after), the form's
//! extra rows and keys, saving messages and small windows. Key-driven, no terminal.

use crate::tui_support;

use crate::tui_support::draw;
use rolltriage::case::{Case, QuantityText};
use rolltriage::diagnose::sensitivity::{InputSensitivity, Sensitivity};
use rolltriage::tui::app::{App, Screen};
use rolltriage::tui::event::Key;
use rolltriage::tui::job::Purpose;
use rolltriage::tui::screens::what_if::{change_text, comparison};
use rolltriage::units::UnitSystem;
use tui_support::*;

fn type_text(app: &mut App, text: &str) {
    for c in text.chars() {
        app.handle_key(Key::Char(c));
    }
}

fn with_results() -> App {
    let mut app = app();
    app.set_case(sample_case(), None);
    finish_requests(&mut app, &outcome(1.0), &outcome(1.0));
    app.session.resolved = Ok(resolved("Sample"));
    app
}

/// Move the form's cursor to the row of `path`.
fn to_field(app: &mut App, path: &str) {
    app.handle_key(Key::F(3));
    app.handle_key(Key::Home);
    let index = rolltriage::tui::fields::FIELDS
        .iter()
        .position(|f| f.path == path)
        .unwrap_or_else(|| panic!("{path} is not a form row"));
    for _ in 0..index {
        app.handle_key(Key::Down);
    }
}

#[test]
fn changes_read_at_a_glance() {
    assert_eq!(change_text(1.0, 140.5), "×140");
    assert_eq!(change_text(100.0, 112.0), "+12 %");
    assert_eq!(change_text(100.0, 88.0), "-12 %");
    // Tiny moves are "same", never "−0 %"; from zero a value is "new".
    assert_eq!(change_text(100.0, 100.2), "same");
    assert_eq!(change_text(-100.0, -100.1), "same");
    assert_eq!(change_text(0.0, 0.0), "same");
    assert_eq!(change_text(0.0, 5.0), "new");
}

#[test]
fn what_if_rows_are_named_in_words() {
    let rows = comparison(&outcome(1.0), &outcome(0.8), UnitSystem::Si);
    for [name, _, _, change] in &rows {
        assert!(!name.contains('_'), "an ID in a row name: {name}");
        assert!(
            !change.contains("-0 %") && !change.contains("−0"),
            "{change}"
        );
    }
    assert!(
        rows.iter().any(|r| r[0].starts_with("belief in '")),
        "{rows:?}"
    );
    assert_eq!(
        rolltriage::diagnose::words::indicator_title("wit_step"),
        "wound-in tension step"
    );
}

#[test]
fn a_typed_target_is_tried_and_kept_in_the_users_units() {
    let mut app = with_results();
    app.session.units = UnitSystem::Us;
    app.handle_key(Key::F(5));
    assert_eq!(app.what_if.row, 0, "web tension is the first row");
    app.handle_key(Key::Char('t'));
    assert!(app.is_typing(), "t starts typing a value: q must not quit");
    type_text(&mut app, "3 pli");
    app.handle_key(Key::Enter);
    let request = app
        .take_requests()
        .into_iter()
        .rfind(|r| r.purpose == Purpose::WhatIf)
        .expect("a what-if solve");
    // 3 pli = 525.38 N/m (1 lbf/in = 175.127 N/m, NIST SP 811 factors).
    let tension = request.resolved.unwrap().winding.tension.start_tension;
    assert!((tension - 3.0 * 175.126_835_3).abs() < 1e-6, "{tension}");
    // Kept: written as the user works ("3 pli"), not as a bare SI number.
    app.handle_key(Key::Char('a'));
    assert_eq!(
        app.session.case.winding.tension,
        Some(QuantityText::Text("3 pli".into()))
    );
    assert!(app.session.dirty);
}

#[test]
fn a_bad_typed_target_says_why() {
    let mut app = with_results();
    app.handle_key(Key::F(5));
    app.handle_key(Key::Char('t'));
    type_text(&mut app, "3 mil");
    app.handle_key(Key::Enter);
    let error = app.what_if.error.clone().unwrap_or_default();
    assert!(error.contains("pli"), "names the accepted units: {error}");
}

#[test]
fn the_what_if_table_scrolls_and_resets_on_a_new_trial() {
    let mut app = with_results();
    app.handle_key(Key::F(5));
    app.handle_key(Key::Right);
    finish_requests(&mut app, &outcome(1.0), &outcome(0.8));
    app.handle_key(Key::PageDown);
    assert!(app.what_if.scroll > 0);
    let text = draw(&app, 80, 24);
    assert!(text.contains("PgUp/PgDn"), "{text}");
    app.handle_key(Key::Right);
    assert_eq!(app.what_if.scroll, 0);
}

#[test]
fn saving_with_a_rejected_entry_says_so() {
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("reel.yaml");
    let mut app = app();
    app.session.case_path = Some(path.clone());
    to_field(&mut app, "winding.tension");
    type_text(&mut app, "48 mil");
    app.handle_key(Key::Enter);
    app.handle_key(Key::Ctrl('s'));
    let status = app.session.status.clone().unwrap_or_default();
    assert!(status.starts_with("Not saved"), "{status}");
    assert!(status.contains("48 mil"), "{status}");
    assert!(!status.contains("Saved"), "{status}");
    assert!(!path.exists());
}

#[test]
fn saving_into_a_missing_folder_is_a_plain_message() {
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("no_such_folder").join("reel.yaml");
    let mut app = app();
    app.session.case_path = Some(path);
    app.session.dirty = true;
    app.handle_key(Key::Ctrl('s'));
    let status = app.session.status.clone().unwrap_or_default();
    assert!(status.contains("does not exist"), "{status}");
    // The temporary file (".reel.yaml.PID.N.tmp") is not named.
    assert!(!status.contains(".reel.yaml"), "{status}");
    assert!(app.session.dirty);
}

#[test]
fn saving_keeps_the_files_comments_and_layout() {
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("reel.yaml");
    let text = "# written by case new\ntitle: Reel\nwinding:\n  # from the drive screen\n  tension: 3.5 pli  # J. Ruiz, 3 May\n\n  speed: 900 m/min\n";
    std::fs::write(&path, text).unwrap();
    let mut app = app();
    app.set_case(Case::load(&path).unwrap(), Some(path.clone()));
    // 4 pli as an SI number, as a what-if writes it (the factor itself is checked against
    // NIST SP 811 in tests/case/units.rs).
    let si = rolltriage::units::parse_quantity(
        "",
        "4 pli",
        rolltriage::units::QuantityKind::ForcePerWidth,
    )
    .unwrap();
    app.session.case.winding.tension = Some(QuantityText::Number(si));
    app.session.dirty = true;
    app.handle_key(Key::Ctrl('s'));
    let status = app.session.status.clone().unwrap_or_default();
    assert!(!app.session.dirty, "{status}");
    assert!(status.contains("comments and layout kept"), "{status}");
    assert_eq!(
        std::fs::read_to_string(&path).unwrap(),
        text.replace("3.5 pli", "4 pli"),
        "only the value changed, in the unit the user typed"
    );
}

#[test]
fn a_file_that_cannot_be_edited_in_place_warns_before_its_comments_go() {
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("reel.yaml");
    std::fs::write(&path, "# mine\ntitle: Reel\nwinding: {speed: 900 m/min}\n").unwrap();
    let mut app = app();
    app.set_case(Case::load(&path).unwrap(), Some(path.clone()));
    app.session.case.winding.speed = Some(QuantityText::Text("1000 m/min".into()));
    app.session.dirty = true;
    app.handle_key(Key::Ctrl('s'));
    let status = app.session.status.clone().unwrap_or_default();
    assert!(status.contains("comments"), "{status}");
    assert!(
        status.contains("flow style"),
        "the reason is given: {status}"
    );
    assert!(app.session.dirty);
    assert!(std::fs::read_to_string(&path).unwrap().contains("# mine"));
    app.handle_key(Key::Ctrl('s'));
    assert!(!app.session.dirty, "{:?}", app.session.status);
    let saved = Case::load(&path).unwrap();
    assert_eq!(saved.winding.speed, app.session.case.winding.speed);
}

#[test]
fn ctrl_u_and_ctrl_w_clear_while_typing_and_convert_the_form_otherwise() {
    let mut app = app();
    to_field(&mut app, "winding.tension");
    type_text(&mut app, "52 N/m");
    app.handle_key(Key::Ctrl('w'));
    assert_eq!(app.inputs.editing.as_deref(), Some("52 "));
    app.handle_key(Key::Ctrl('u'));
    assert_eq!(app.inputs.editing.as_deref(), Some(""));
    assert_eq!(
        app.session.units,
        UnitSystem::Si,
        "no unit switch while typing"
    );
    type_text(&mut app, "525.4 N/m");
    app.handle_key(Key::Enter);
    app.handle_key(Key::Ctrl('u'));
    assert_eq!(app.session.units, UnitSystem::Us);
    // 525.4 N/m / 175.127 N/m per pli = 3.000 pli.
    assert_eq!(
        app.session.case.winding.tension,
        Some(QuantityText::Text("3 pli".into()))
    );
}

#[test]
fn the_form_shows_radial_stiffness_poisson_and_friction() {
    for path in [
        "web.radial_stiffness.law",
        "web.radial_stiffness.k1",
        "web.radial_stiffness.k2",
        "web.poisson_ratio",
        "web.friction",
    ] {
        assert!(
            rolltriage::tui::fields::field(path).is_some(),
            "{path} is not on the form"
        );
    }
    let mut app = app();
    to_field(&mut app, "web.radial_stiffness.k1");
    type_text(&mut app, "5 kPa");
    app.handle_key(Key::Enter);
    let radial = app.session.case.web.radial_stiffness.clone().unwrap();
    assert_eq!(radial.law, "pfeiffer");
    assert_eq!(radial.k1, Some(QuantityText::Text("5 kPa".into())));
    // Cleared again: the preset's law applies.
    to_field(&mut app, "web.radial_stiffness.k1");
    app.handle_key(Key::Delete);
    assert!(app.session.case.web.radial_stiffness.is_none());
}

#[test]
fn the_reference_web_is_not_offered() {
    let (web, _) = rolltriage::tui::preset_ids();
    assert!(!web.is_empty());
    assert!(web.iter().all(|id| !id.ends_with("_reference")), "{web:?}");
}

#[test]
fn form_values_and_answers_show_words() {
    let mut app = app();
    app.session.case.winding.method = Some("centre_surface".into());
    to_field(&mut app, "winding.method");
    let text = draw(&app, 120, 40);
    assert!(text.contains("centre-surface winding"), "{text}");
    // An answer shows its text, not its ID.
    let app = app_with_answer();
    let text = draw(&app, 120, 40);
    assert!(text.contains("near the core"), "{text}");
    assert!(!text.contains("near_core"), "{text}");
}

fn app_with_answer() -> App {
    let mut app = app();
    type_text(&mut app, "stars");
    app.handle_key(Key::Enter);
    app.session
        .case
        .answers
        .insert("starring_radius".into(), "near_core".into());
    app.handle_key(Key::Right);
    app
}

#[test]
fn plots_run_along_the_diameter() {
    let mut app = with_results();
    app.handle_key(Key::F(4));
    let text = draw(&app, 120, 40);
    assert!(text.contains('⌀'), "{text}");
    assert!(!text.contains("radius"), "{text}");
    assert!(!text.contains(" r "), "{text}");
}

#[test]
fn a_small_window_says_so() {
    let app = with_results();
    let text = draw(&app, 50, 12);
    assert!(text.contains("Window too small"), "{text}");
    let text = draw(&app, 80, 24);
    assert!(!text.contains("Window too small"));
    assert_eq!(app.screen, Screen::Results);
}

/// A sensitivity run (hand-made, invented numbers: they only exercise the screen) in which the
/// assumed friction puts another cause first and the assumed roughness changes nothing.
fn friction_moves_the_ranking() -> Sensitivity {
    let input = |field: &str, label: &str, changes_first_cause: bool| InputSensitivity {
        field: field.into(),
        label: label.into(),
        used: "0.3".into(),
        low: 0.2,
        high: 0.4,
        range_text: "0.2 to 0.4".into(),
        range_source: "the spread of the shipped film presets, at least ±25 %".into(),
        trials: Vec::new(),
        changes_first_cause,
        belief_shift: 0.0,
    };
    Sensitivity {
        first_cause: Some("tension_too_low".into()),
        first_title: Some("Web tension too low".into()),
        first_belief: 0.8,
        assumed: 2,
        inputs: vec![
            input("web.friction", "Web-to-web friction", true),
            input("web.roughness", "Surface roughness (RMS, one side)", false),
        ],
        not_varied: Vec::new(),
        failed: Vec::new(),
    }
}

#[test]
fn the_inputs_that_move_the_ranking_are_named_when_known() {
    let mut app = app();
    app.set_case(sample_case(), None);
    let mut known = outcome(1.0);
    known.resolved = resolved_with_assumed();
    known.sensitivity = Some(friction_moves_the_ranking());
    // Only an input that changes what a reader sees is a mover.
    assert_eq!(known.movers(), ["Web-to-web friction"]);
    finish_requests(&mut app, &known, &known);
    let text = draw(&app, 120, 40);
    assert!(
        text.contains("moves the ranking most: Web-to-web friction"),
        "{text}"
    );
}

#[test]
fn save_as_over_another_file_replaces_it() {
    // Its comments belong to another case: they are not carried into this one.
    let folder = tempfile::tempdir().unwrap();
    let other = folder.path().join("other.yaml");
    std::fs::write(&other, "# reel 12, other grade\ntitle: Reel 12\n").unwrap();
    let mut app = app();
    app.session.case.title = "Reel 7".into();
    app.session.dirty = true;
    // Ctrl-S without a file asks for a name: clear the suggested one, type the other file.
    app.handle_key(Key::Ctrl('s'));
    for _ in 0..100 {
        app.handle_key(Key::Backspace);
    }
    type_text(&mut app, other.to_str().unwrap());
    app.handle_key(Key::Enter);
    assert!(!app.session.dirty, "{:?}", app.session.status);
    let text = std::fs::read_to_string(&other).unwrap();
    assert!(!text.contains("reel 12"), "{text}");
    assert_eq!(Case::load(&other).unwrap().title, "Reel 7");
}
