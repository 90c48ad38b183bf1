//! Numbers stay with their units when the screens wrap text: a long line full of values is
//! wrapped at every width from 12 to 100 cells, through the paragraph every screen and popup
//! draws with (`screens::wrapped`) and through the hanging indent of the results lists
//! (`screens::hang`), and no row ends with a number whose unit starts the next row.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::Line;
use ratatui::widgets::Widget;
use rolltriage::tui::screens::{hang, wrapped};

const UNITS: [&str; 9] = ["pli", "kPa", "MPa", "%", "mm", "m/min", "µm", "psi", "in"];

const LONG: &str = "Raise the nip load from 2.6 pli to 3.1 pli in steps of 10 %; the core \
    pressure falls from 495 kPa to 412 kPa (crush rating 2.73 MPa) at ⌀ 102 mm, the speed \
    stays at 300 m/min, roughness 4 µm, 80 % of the roll wound at 59.8 psi on a 3 in core.";

/// Rows of text (cells joined, trailing blanks removed).
fn rows(buf: &Buffer) -> Vec<String> {
    let area = buf.area;
    (0..area.height)
        .map(|y| {
            (0..area.width)
                .map(|x| buf[(x, y)].symbol().to_string())
                .collect::<String>()
                .trim_end()
                .to_string()
        })
        .collect()
}

/// The first unit that starts a row right after a row ending with a number.
fn split(rows: &[String]) -> Option<String> {
    rows.windows(2).find_map(|pair| {
        let ends_in_number = pair[0].chars().last().is_some_and(|c| c.is_ascii_digit());
        let next = pair[1].split_whitespace().next().unwrap_or("");
        let next = next.trim_end_matches([',', ';', '.', ')']);
        (ends_in_number && UNITS.contains(&next)).then(|| format!("{}⏎{}", pair[0], pair[1]))
    })
}

/// The first number split from its unit inside a drawn popup or screen (frame lines and the
/// padding inside them removed), if any.
pub fn split_on_screen(screen: &str) -> Option<String> {
    let rows: Vec<String> = screen
        .lines()
        .map(|l| {
            l.trim_matches(|c: char| c == '│' || c.is_whitespace())
                .to_string()
        })
        .collect();
    split(&rows)
}

#[test]
fn wrapped_paragraphs_never_split_a_number_from_its_unit() {
    for width in 12..=100u16 {
        let area = Rect::new(0, 0, width, 40);
        let mut buf = Buffer::empty(area);
        wrapped(LONG, false).render(area, &mut buf);
        let rows = rows(&buf);
        assert!(split(&rows).is_none(), "width {width}: {:?}", split(&rows));
        // Nothing lost: the words all arrive (a no-break space draws as a space).
        let words: usize = rows.iter().map(|r| r.split_whitespace().count()).sum();
        assert!(
            words >= LONG.split_whitespace().count() - UNITS.len() * 2,
            "width {width}"
        );
    }
}

/// The check itself finds splits: a plain paragraph (no joining) splits somewhere.
#[test]
fn a_plain_paragraph_would_split_some() {
    let found = (12..=100u16).any(|width| {
        let area = Rect::new(0, 0, width, 40);
        let mut buf = Buffer::empty(area);
        ratatui::widgets::Paragraph::new(LONG)
            .wrap(ratatui::widgets::Wrap { trim: false })
            .render(area, &mut buf);
        split(&rows(&buf)).is_some()
    });
    assert!(found);
}

#[test]
fn hanging_lines_never_split_a_number_from_its_unit() {
    for width in 20..=100usize {
        let hung = hang(Line::from(LONG), width, 4);
        let rows: Vec<String> = hung
            .iter()
            .map(|l| l.to_string().replace('\u{a0}', " ").trim_end().to_string())
            .collect();
        assert!(split(&rows).is_none(), "width {width}: {:?}", split(&rows));
        for row in &rows {
            assert!(
                row.chars().count() <= width,
                "width {width}: {row:?} too long"
            );
        }
    }
}

/// The joining is invisible: a drawn screen holds plain spaces only (text copied off it too).
#[test]
fn drawn_screens_hold_plain_spaces() {
    let mut app = crate::tui_support::app();
    app.set_case(
        crate::tui_support::sample_case(),
        Some("cases/reel7.yaml".into()),
    );
    let done = crate::tui_support::outcome(1.0);
    crate::tui_support::finish_requests(&mut app, &done, &done);
    for (w, h) in [(80, 24), (120, 40)] {
        let screen = crate::tui_support::draw(&app, w, h);
        assert!(screen.contains(" MPa"), "{screen}");
        assert!(!screen.contains('\u{a0}'), "{screen}");
    }
}
