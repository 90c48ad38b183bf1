//! Symptom picker: a search line, the matching symptoms (picked ones marked), and the details
//! of the highlighted symptom — description, where on the roll it shows, its questions.

use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Paragraph, Widget};

use crate::case::ObservedSymptom;
use crate::tui::catalogue::{Catalogue, Match, SymptomInfo, plain_name};
use crate::tui::component::{Binding, Component, Handled};
use crate::tui::event::Key;
use crate::tui::fields;
use crate::tui::session::Session;
use crate::tui::theme::Theme;
use crate::vocabulary::PLACES;

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SymptomFocus {
    List,
    Details,
}

const LIST: u8 = 1;
const DETAILS: u8 = 2;

/// The symptom screen's keys.
#[rustfmt::skip]
pub const KEYS: &[Binding] = &[
    Binding::both(LIST, "type", "search", "type", "search names and the words people use"),
    Binding::help("↑ ↓  PgUp PgDn", "move"),
    Binding::line(LIST, "↑↓ Enter", "pick"),
    Binding::help("Enter", "pick / unpick the highlighted symptom"),
    Binding::both(LIST, "→", "details", "→ then ↑ ↓", "say where on the roll it shows, answer its questions"),
    Binding::line(DETAILS, "↑↓", "row"),
    Binding::line(DETAILS, "←→", "set"),
    Binding::both(DETAILS, "y/n/u", "answer", "← →  Enter  y n u", "change the highlighted answer"),
    Binding::both(DETAILS, "Esc", "back", "Esc", "clear the search / back to the list"),
];

#[derive(Debug, Clone, PartialEq)]
pub struct SymptomsScreen {
    pub query: String,
    pub matches: Vec<Match>,
    /// Index into `matches`.
    pub highlighted: usize,
    pub focus: SymptomFocus,
    /// Row of the details pane: 0 = where on the roll, 1.. = questions.
    pub detail_row: usize,
}

impl SymptomsScreen {
    pub fn new(catalogue: &Catalogue) -> Self {
        SymptomsScreen {
            query: String::new(),
            matches: catalogue.search(""),
            highlighted: 0,
            focus: SymptomFocus::List,
            detail_row: 0,
        }
    }

    /// The symptom under the highlight, if the list is not empty.
    pub fn highlighted_symptom<'a>(&self, ctx: &'a Session) -> Option<&'a SymptomInfo> {
        let m = self.matches.get(self.highlighted)?;
        ctx.catalogue.symptoms.get(m.index)
    }

    fn research(&mut self, ctx: &Session) {
        self.matches = ctx.catalogue.search(&self.query);
        self.highlighted = 0;
        self.detail_row = 0;
    }

    fn toggle_highlighted(&mut self, ctx: &mut Session) {
        let Some(id) = self.highlighted_symptom(ctx).map(|s| s.id.clone()) else {
            return;
        };
        if ctx.is_selected(&id) {
            ctx.case.symptoms.retain(|s| s.id != id);
        } else {
            ctx.case.symptoms.push(ObservedSymptom {
                id,
                place: None,
                notes: None,
            });
        }
        ctx.edited();
    }

    fn list_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        let last = self.matches.len().saturating_sub(1);
        match key {
            Key::Up => self.highlighted = self.highlighted.saturating_sub(1),
            Key::Down => self.highlighted = (self.highlighted + 1).min(last),
            Key::PageUp => self.highlighted = self.highlighted.saturating_sub(5),
            Key::PageDown => self.highlighted = (self.highlighted + 5).min(last),
            Key::Home => self.highlighted = 0,
            Key::End => self.highlighted = last,
            Key::Enter => self.toggle_highlighted(ctx),
            Key::Right if !self.matches.is_empty() => {
                self.focus = SymptomFocus::Details;
                self.detail_row = 0;
            }
            Key::Esc => {
                self.query.clear();
                self.research(ctx);
            }
            Key::Backspace => {
                self.query.pop();
                self.research(ctx);
            }
            Key::Char(c) => {
                self.query.push(c);
                self.research(ctx);
            }
            _ => return Handled::No,
        }
        Handled::Yes
    }

    fn details_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        let rows = 1 + self
            .highlighted_symptom(ctx)
            .map_or(0, |s| s.questions.len());
        match key {
            Key::Esc => self.focus = SymptomFocus::List,
            Key::Up => {
                if self.detail_row == 0 {
                    self.focus = SymptomFocus::List;
                } else {
                    self.detail_row -= 1;
                }
            }
            Key::Down => self.detail_row = (self.detail_row + 1).min(rows - 1),
            Key::Right | Key::Enter | Key::Char(' ') => self.cycle_detail(ctx, true),
            Key::Left => self.cycle_detail(ctx, false),
            Key::Char('y') => self.answer_current(ctx, "yes"),
            Key::Char('n') => self.answer_current(ctx, "no"),
            Key::Char('u') => self.answer_current(ctx, "unknown"),
            Key::Char('t') => self.toggle_highlighted(ctx),
            _ => return Handled::No,
        }
        Handled::Yes
    }

    /// Change the value on the current details row: the place, or the question's answer.
    fn cycle_detail(&mut self, ctx: &mut Session, forward: bool) {
        let Some(symptom) = self.highlighted_symptom(ctx).cloned() else {
            return;
        };
        if self.detail_row == 0 {
            let places: Vec<String> = if symptom.places.is_empty() {
                PLACES.iter().map(|p| p.to_string()).collect()
            } else {
                symptom.places.clone()
            };
            let current = ctx
                .case
                .symptoms
                .iter()
                .find(|s| s.id == symptom.id)
                .and_then(|s| s.place.clone());
            let next = fields::cycle(&places, current.as_deref(), forward);
            // Saying where a symptom shows means it was seen: select it too.
            match ctx.case.symptoms.iter_mut().find(|s| s.id == symptom.id) {
                Some(observed) => observed.place = next,
                None => ctx.case.symptoms.push(ObservedSymptom {
                    id: symptom.id.clone(),
                    place: next,
                    notes: None,
                }),
            }
            ctx.edited();
        } else if let Some(question) = symptom.questions.get(self.detail_row - 1) {
            let options = question.options();
            let current = ctx.case.answers.get(&question.id).cloned();
            if let Some(next) = fields::cycle(&options, current.as_deref(), forward) {
                ctx.case.answers.insert(question.id.clone(), next);
                ctx.edited();
            }
        }
    }

    fn answer_current(&mut self, ctx: &mut Session, answer: &str) {
        if self.detail_row == 0 {
            return;
        }
        let Some(question) = self
            .highlighted_symptom(ctx)
            .and_then(|s| s.questions.get(self.detail_row - 1))
            .cloned()
        else {
            return;
        };
        if question.options().iter().any(|o| o == answer) {
            ctx.case
                .answers
                .insert(question.id.clone(), answer.to_string());
            ctx.edited();
        }
    }
}

impl Component for SymptomsScreen {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        match self.focus {
            SymptomFocus::List => self.list_key(key, ctx),
            SymptomFocus::Details => self.details_key(key, ctx),
        }
    }

    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn mode(&self, _ctx: &Session) -> u8 {
        match self.focus {
            SymptomFocus::List => LIST,
            SymptomFocus::Details => DETAILS,
        }
    }

    fn is_typing(&self) -> bool {
        self.focus == SymptomFocus::List
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        render(self, ctx, theme, area, buf);
    }
}

fn render(state: &SymptomsScreen, app: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
    let [left, right] =
        Layout::horizontal([Constraint::Percentage(46), Constraint::Percentage(54)]).areas(area);
    let [search, list, picked] = Layout::vertical([
        Constraint::Length(3),
        Constraint::Min(3),
        Constraint::Length(3),
    ])
    .areas(left);

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
    super::wrapped(picked_text, true)
        .block(Block::bordered().title(" Picked "))
        .render(picked, buf);

    render_details(state, app, theme, right, buf);
}

fn render_details(
    state: &SymptomsScreen,
    app: &Session,
    theme: Theme,
    area: Rect,
    buf: &mut Buffer,
) {
    let details_focus = state.focus == SymptomFocus::Details;
    let block = Block::bordered().title(if details_focus {
        " About this symptom — ←→ changes the row "
    } else {
        " About this symptom "
    });
    let Some(symptom) = state.highlighted_symptom(app) else {
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
            .map(|a| question.answer_text(a))
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
