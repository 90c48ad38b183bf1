//! Issue 14, item 6 (terminal UI side): Ctrl-S never saves over a shipped demo case without
//! the user typing the path; other case files still save in place.

use crate::tui_support;

use std::path::{Path, PathBuf};
use std::sync::Arc;

use rolltriage::diagnose::rules::RuleBase;
use rolltriage::tui::app::{App, FilePopup, FilePurpose, Popup};
use rolltriage::tui::event::Key;
use rolltriage::tui::{Options, build_app};

const DEMO: &str = "cases/harbour_newsprint_telescoping.yaml";

/// A copy of the shipped layout (rules/causes.yaml beside cases/) in a temporary folder.
fn shipped_layout() -> (tempfile::TempDir, PathBuf) {
    let root = tempfile::tempdir().unwrap();
    let source = Path::new(env!("CARGO_MANIFEST_DIR"));
    std::fs::create_dir_all(root.path().join("rules")).unwrap();
    std::fs::create_dir_all(root.path().join("cases/training")).unwrap();
    std::fs::copy(
        source.join("rules/causes.yaml"),
        root.path().join("rules/causes.yaml"),
    )
    .unwrap();
    let demo = root.path().join(DEMO);
    std::fs::copy(source.join(DEMO), &demo).unwrap();
    (root, demo)
}

fn open(path: &Path) -> App {
    let options = Options {
        case: Some(path.to_path_buf()),
        ..Options::default()
    };
    build_app(&options, Arc::new(RuleBase::embedded().unwrap())).unwrap()
}

#[test]
fn the_source_tree_demo_cases_are_recognised() {
    let demo = Path::new(env!("CARGO_MANIFEST_DIR")).join(DEMO);
    assert!(rolltriage::fsutil::is_shipped_demo_case(&demo));
    let training =
        Path::new(env!("CARGO_MANIFEST_DIR")).join("cases/training/telescoping_newsprint.yaml");
    assert!(rolltriage::fsutil::is_shipped_demo_case(&training));
    let fixture = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/minimal.yaml");
    assert!(!rolltriage::fsutil::is_shipped_demo_case(&fixture));
}

#[test]
fn ctrl_s_on_a_demo_case_asks_for_a_file_name() {
    let (_root, demo) = shipped_layout();
    let before = std::fs::read(&demo).unwrap();
    let mut app = open(&demo);
    app.session.dirty = true;
    app.handle_key(Key::Ctrl('s'));
    assert!(
        matches!(
            app.popup(),
            Some(Popup::File(FilePopup {
                purpose: FilePurpose::SaveAs,
                ..
            }))
        ),
        "expected the save prompt, got {:?} / {:?}",
        app.popup(),
        app.session.status
    );
    assert_eq!(std::fs::read(&demo).unwrap(), before);
}

#[test]
fn a_key_storm_never_touches_a_demo_case() {
    let (_root, demo) = shipped_layout();
    let before = std::fs::read(&demo).unwrap();
    let mut app = open(&demo);
    // Enter is left out: in the save prompt it would save under the suggested new name in
    // the current folder, which is the user's choice, not an overwrite.
    let keys = [
        Key::Ctrl('s'),
        Key::Char('1'),
        Key::Char('x'),
        Key::Tab,
        Key::Down,
        Key::Up,
        Key::Esc,
        Key::Backspace,
        Key::F(2),
        Key::F(3),
        Key::F(4),
        Key::Ctrl('s'),
        Key::Char('+'),
        Key::Right,
    ];
    let mut seed: u64 = 0x5eed_1234;
    for _ in 0..5000 {
        seed ^= seed << 13;
        seed ^= seed >> 7;
        seed ^= seed << 17;
        let key = keys[(seed % keys.len() as u64) as usize];
        if app.should_quit {
            break;
        }
        app.handle_key(key);
    }
    assert_eq!(std::fs::read(&demo).unwrap(), before);
}

#[test]
fn ctrl_s_on_the_users_own_case_saves_in_place() {
    let dir = tempfile::tempdir().unwrap();
    let mine = dir.path().join("mine.yaml");
    std::fs::copy(Path::new(env!("CARGO_MANIFEST_DIR")).join(DEMO), &mine).unwrap();
    let mut app = open(&mine);
    app.session.case.title = "Reel 7".into();
    app.session.dirty = true;
    let before = std::fs::read_to_string(&mine).unwrap();
    app.handle_key(Key::Ctrl('s'));
    assert!(app.popup().is_none(), "{:?}", app.session.status);
    // The file is edited in place: only the title line changed, its comments stay.
    let after = std::fs::read_to_string(&mine).unwrap();
    assert!(after.contains("title: Reel 7"), "{after}");
    let changed: Vec<_> = before
        .lines()
        .zip(after.lines())
        .filter(|(a, b)| a != b)
        .collect();
    assert_eq!(changed.len(), 1, "{changed:?}");
    assert_eq!(before.lines().count(), after.lines().count());
}

#[test]
fn export_refuses_an_unknown_extension_like_the_command_line() {
    // Issue 14 item 10: `report -o r.pdf` is refused; the UI wrote Markdown into r.pdf.
    let folder = tempfile::tempdir().unwrap();
    let mut app = tui_support::app();
    app.set_case(tui_support::sample_case(), None);
    tui_support::finish_requests(
        &mut app,
        &tui_support::outcome(1.0),
        &tui_support::outcome(1.0),
    );
    let path = folder.path().join("r.pdf");
    let error = app.export_to(&path).unwrap_err().to_string();
    assert!(error.contains(".md, .html or .json"), "{error}");
    assert!(!path.exists());
    app.export_to(&folder.path().join("r.md")).unwrap();
}
