//! The margins popup (F10), driven by keys without a terminal: before a solve it says so; after
//! the demo case is solved (the same pipeline as `diagnose`) it lists every mechanism of the
//! report's margins table with the same margins and places, in the session's units, and closes
//! with Esc or F10. Snapshots at 80×24 and 120×40.

use std::path::Path;

use crate::tui_support::{self, draw};
use rolltriage::tui::app::{App, OpenPurpose, Popup};
use rolltriage::tui::event::Key;

const CASE: &str = "cases/harbour_newsprint_telescoping.yaml";
const SIZES: [(u16, u16); 2] = [(80, 24), (120, 40)];

/// The demo case opened and solved on this thread, as the worker would.
fn solved() -> App {
    let mut app = tui_support::app();
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join(CASE);
    app.open_path(&path, OpenPurpose::WholeCase).unwrap();
    app.session.ensure_baseline();
    tui_support::solve_queued(&mut app);
    assert!(app.session.current_outcome().is_some(), "the demo solves");
    app
}

#[test]
fn f10_opens_and_esc_closes() {
    let mut app = tui_support::app();
    app.handle_key(Key::F(10));
    assert!(matches!(app.popups.last(), Some(Popup::Margins(_))));
    assert!(draw(&app, 80, 24).contains("No solved roll yet"));
    app.handle_key(Key::Esc);
    assert!(app.popups.is_empty());
    app.handle_key(Key::F(10));
    app.handle_key(Key::F(10));
    assert!(app.popups.is_empty(), "F10 closes it again");
}

#[test]
fn popup_shows_the_reports_margins() {
    let mut app = solved();
    app.handle_key(Key::F(10));
    let outcome = app.session.current_outcome().unwrap();
    let section =
        rolltriage::report::margins_section(&outcome.resolved, &outcome.profile, app.session.units);
    let text = draw(&app, 120, 40);
    for row in &section.rows {
        assert!(text.contains(&row.mechanism), "{} missing", row.mechanism);
        assert!(
            text.contains(&row.margin_text),
            "{} missing",
            row.margin_text
        );
        assert!(text.contains(&row.where_text), "{} missing", row.where_text);
    }
    for (w, h) in SIZES {
        insta::assert_snapshot!(format!("margins_{w}x{h}"), draw(&app, w, h));
    }
    // Wrapped as the screens wrap: no width puts a unit on the row after its number.
    for w in 60..=120 {
        let screen = draw(&app, w, 40);
        let split = crate::wrap::split_on_screen(&screen);
        assert!(split.is_none(), "width {w}: {split:?}");
    }
}
