//! The results list keeps its cause numbers apart from the open/closed marker and in one column
//! once the numbers reach two digits ("▸ 9." next to "▸10." was unreadable).

use crate::tui_support::*;
use rolltriage::tui::app::App;

/// The sample case's results with the diagnosis padded to `count` causes.
fn results_with(count: usize) -> App {
    let mut app = app();
    app.set_case(sample_case(), Some("cases/reel7.yaml".into()));
    let mut solved = outcome(1.0);
    if let Ok(d) = solved.diagnosis.as_mut() {
        let model = d.causes[2].clone();
        while d.causes.len() < count {
            let mut extra = model.clone();
            extra.id = format!("extra_{}", d.causes.len());
            extra.title = format!("Extra cause {}", d.causes.len() + 1);
            d.causes.push(extra);
        }
    }
    finish_requests(&mut app, &solved, &solved);
    app
}

/// Column of the "." after each cause number, keyed by the number, from the drawn screen.
fn number_columns(screen: &str) -> Vec<(u32, usize, String)> {
    let mut found = Vec::new();
    for row in screen.lines() {
        let chars: Vec<char> = row.chars().collect();
        for (at, c) in chars.iter().enumerate() {
            if *c != '▸' && *c != '▾' {
                continue;
            }
            let rest: String = chars[at + 1..].iter().collect();
            let digits: String = rest
                .trim_start()
                .chars()
                .take_while(char::is_ascii_digit)
                .collect();
            if digits.is_empty() {
                continue;
            }
            let dot = at + 1 + rest.find('.').map_or(0, |d| rest[..d].chars().count());
            let shown: String = chars[at..=dot.min(chars.len() - 1)].iter().collect();
            found.push((digits.parse().unwrap_or(0), dot, shown));
        }
    }
    found
}

#[test]
fn two_digit_cause_numbers_keep_a_space_and_one_column() {
    let app = results_with(12);
    let screen = draw(&app, 120, 40);
    let numbers = number_columns(&screen);
    assert!(
        numbers.iter().any(|(n, _, _)| *n >= 10),
        "two-digit causes drawn:\n{screen}"
    );
    for (n, _, shown) in &numbers {
        assert!(
            shown.chars().nth(1) == Some(' '),
            "cause {n} runs into its marker: {shown:?}\n{screen}"
        );
    }
    let first = numbers[0].1;
    assert!(
        numbers.iter().all(|(_, dot, _)| *dot == first),
        "numbers not in one column: {numbers:?}"
    );
}

#[test]
fn single_digit_lists_draw_as_before() {
    let screen = draw(&results_with(3), 120, 40);
    assert!(screen.contains("▸ 1. "), "{screen}");
}
