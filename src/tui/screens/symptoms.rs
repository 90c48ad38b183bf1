//! Symptom picker: a search line, the matching symptoms (picked ones marked), and the details
//! of the highlighted symptom — description, where on the roll it shows, its questions.

use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Paragraph, Widget, Wrap};

use crate::tui::app::{App, SymptomFocus};
use crate::tui::catalogue::plain_name;
use crate::tui::theme::Theme;

pub fn render(app: &App, theme: Theme, area: Rect, buf: &mut Buffer) {
    let [left, right] =
        Layout::horizontal([Constraint::Percentage(46), Constraint::Percentage(54)]).areas(area);
    let [search, list, picked] = Layout::vertical([
        Constraint::Length(3),
        Constraint::Min(3),
        Constraint::Length(3),
    ])
    .areas(left);

    let state = &app.symptoms;
    let list_focus = state.focus == SymptomFocus::List;
    let cursor = if list_focus { "▏" } else { "" };
    Paragraph::new(Line::from(vec![
        Span::styled("› ", theme.key()),
        Span::raw(format!("{}{cursor}", state.query)),
    ]))
    .block(Block::bordered().title(" Find a symptom "))
    .render(search, buf);

    // Keep the highlighted row in view.
    let inner_height = usize::from(list.height.saturating_sub(2)).max(1);
    let first = state.highlighted.saturating_sub(inner_height - 1);
    let mut lines = Vec::new();
    if state.matches.is_empty() {
        lines.push(Line::from(Span::styled(
            "no symptom matches; Backspace or Esc to widen the search",
            theme.dim(),
        )));
    }
    for (row, hit) in state
        .matches
        .iter()
        .enumerate()
        .skip(first)
        .take(inner_height)
    {
        let Some(symptom) = app.catalogue.symptoms.get(hit.index) else {
            continue;
        };
        let observed = app.case.symptoms.iter().find(|s| s.id == symptom.id);
        let mark = if observed.is_some() { "[x]" } else { "[ ]" };
        let pointer = if row == state.highlighted { "▸" } else { " " };
        // Place and matched word first: the name is what gets cut when the list is narrow.
        let mut text = format!("{pointer}{mark} ");
        if let Some(place) = observed.and_then(|o| o.place.as_deref()) {
            text.push_str(&format!("@{} ", plain_name(place).to_lowercase()));
        }
        if let Some(alias) = &hit.via_alias {
            text.push_str(&format!("“{alias}” "));
        }
        text.push_str(&symptom.name);
        let room = usize::from(list.width.saturating_sub(2));
        if text.chars().count() > room && room > 1 {
            text = text.chars().take(room - 1).collect::<String>() + "…";
        }
        let style = if row == state.highlighted && list_focus {
            theme.selected()
        } else if observed.is_some() {
            theme.good()
        } else {
            theme.plain()
        };
        lines.push(Line::from(Span::styled(text, style)));
    }
    let title = format!(
        " Symptoms {}/{} ",
        state.matches.len(),
        app.catalogue.symptoms.len()
    );
    Paragraph::new(lines)
        .block(Block::bordered().title(title))
        .render(list, buf);

    let picked_text = if app.case.symptoms.is_empty() {
        "none yet — Enter picks the highlighted symptom; ^O opens a saved or demo case".to_string()
    } else {
        app.case
            .symptoms
            .iter()
            .map(|s| match &s.place {
                Some(place) => format!("{} @{place}", s.id),
                None => s.id.clone(),
            })
            .collect::<Vec<_>>()
            .join(", ")
    };
    Paragraph::new(picked_text)
        .wrap(Wrap { trim: true })
        .block(Block::bordered().title(" Picked "))
        .render(picked, buf);

    render_details(app, theme, right, buf);
}

fn render_details(app: &App, theme: Theme, area: Rect, buf: &mut Buffer) {
    let state = &app.symptoms;
    let details_focus = state.focus == SymptomFocus::Details;
    let block = Block::bordered().title(if details_focus {
        " About this symptom — ←→ changes the row "
    } else {
        " About this symptom "
    });
    let Some(symptom) = app.highlighted_symptom() else {
        Paragraph::new("").block(block).render(area, buf);
        return;
    };
    let observed = app.case.symptoms.iter().find(|s| s.id == symptom.id);
    let mut lines = vec![
        Line::from(Span::styled(symptom.name.clone(), theme.title())),
        Line::from(Span::styled(format!("id: {}", symptom.id), theme.dim())),
    ];
    if !symptom.aliases.is_empty() {
        lines.push(Line::from(Span::styled(
            format!("also called: {}", symptom.aliases.join(", ")),
            theme.dim(),
        )));
    }
    lines.push(Line::from(if symptom.description.is_empty() {
        "(no description in the rule base)".to_string()
    } else {
        symptom.description.clone()
    }));
    lines.push(Line::from(""));

    let row_style = |row: usize| {
        if details_focus && state.detail_row == row {
            theme.selected()
        } else {
            theme.plain()
        }
    };
    let place = observed
        .and_then(|o| o.place.clone())
        .unwrap_or_else(|| "not said".into());
    let picked = if observed.is_some() {
        "picked"
    } else {
        "not picked"
    };
    let mut row_lines = vec![lines.len()];
    lines.push(Line::from(vec![
        Span::styled(format!("Where on the roll: ‹ {place} ›"), row_style(0)),
        Span::styled(format!("  ({picked})"), theme.dim()),
    ]));
    for (i, question) in symptom.questions.iter().enumerate() {
        row_lines.push(lines.len());
        let answer = app
            .case
            .answers
            .get(&question.id)
            .cloned()
            .unwrap_or_else(|| "not answered".into());
        lines.push(Line::from(vec![
            Span::styled(format!("{} ", question.text), row_style(i + 1)),
            Span::styled(format!("‹ {answer} ›"), theme.key()),
        ]));
    }
    if symptom.questions.is_empty() {
        lines.push(Line::from(Span::styled(
            "(no questions for this symptom)",
            theme.dim(),
        )));
    }
    // Keep the highlighted row in view.
    let target = row_lines.get(state.detail_row).copied().unwrap_or(0);
    super::render_scrolled(lines, details_focus.then_some(target), block, area, buf);
}
