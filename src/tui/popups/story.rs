//! The complaint's story (F7): the case title, description and notes, each symptom's notes and
//! the complaint record (docs/history.md) — shown as the case file says them and edited in
//! place. Each row is one field; a typed value is checked when it is entered (dates, counts,
//! the fixed word lists, cause names) and a refused one stays in the editor with the reason.
//! Ctrl-S saves the case file (atomically, like every save).

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};

use crate::case::Case;
use crate::complaint::{
    Complaint, ConfirmedCause, CorrectiveAction, FOUND_AT, SOURCES, STATUSES, VERIFICATION_RESULTS,
};
use crate::tui::component::{Action, Binding, Component, Handled};
use crate::tui::event::Key;
use crate::tui::session::Session;
use crate::tui::theme::Theme;

use super::edit_field::{self, Typed};
use super::{CHOICE, MOVE, TYPING};

/// A part of a confirmed cause.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CausePart {
    Cause,
    Evidence,
    On,
    By,
}

/// A part of a corrective action.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ActionPart {
    Action,
    Owner,
    Due,
    Done,
}

/// One editable row.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Field {
    Title,
    Description,
    Notes,
    /// Notes of the n-th observed symptom.
    SymptomNotes(usize),
    Reference,
    Source,
    Customer,
    Received,
    Line,
    Grade,
    Lot,
    ParentRoll,
    Set,
    RollsAffected,
    RollsChecked,
    SlitPositions,
    FoundAt,
    Containment,
    Status,
    Cause(usize, CausePart),
    AddCause,
    Action(usize, ActionPart),
    AddAction,
    VerificationResult,
    VerificationCheckedOn,
    VerificationNotes,
}

impl Field {
    /// The fixed word list of a choice row (changed with ←/→).
    fn choices(self) -> Option<&'static [&'static str]> {
        match self {
            Field::Source => Some(&SOURCES),
            Field::FoundAt => Some(&FOUND_AT),
            Field::Status => Some(&STATUSES),
            Field::VerificationResult => Some(&VERIFICATION_RESULTS),
            _ => None,
        }
    }
}

/// A row of the popup: a section heading or a field with its label.
#[derive(Debug, Clone, PartialEq)]
pub struct Row {
    pub label: String,
    pub field: Option<Field>,
}

fn heading(label: &str) -> Row {
    Row {
        label: label.to_string(),
        field: None,
    }
}

fn row(label: impl Into<String>, field: Field) -> Row {
    Row {
        label: label.into(),
        field: Some(field),
    }
}

/// The rows for `case`, in reading order.
pub fn rows(case: &Case, ctx: &Session) -> Vec<Row> {
    let c = case.complaint.clone().unwrap_or_default();
    let mut out = vec![
        heading("The case"),
        row("Title", Field::Title),
        row("Description", Field::Description),
        row("Notes", Field::Notes),
    ];
    if !case.symptoms.is_empty() {
        out.push(heading("What was seen"));
        for (i, s) in case.symptoms.iter().enumerate() {
            let name = ctx
                .catalogue
                .get(&s.id)
                .map(|info| info.name.clone())
                .unwrap_or_else(|| crate::tui::catalogue::plain_name(&s.id));
            out.push(row(format!("Notes: {name}"), Field::SymptomNotes(i)));
        }
    }
    out.extend([
        heading("Complaint record"),
        row("Reference", Field::Reference),
        row("From", Field::Source),
        row("Customer", Field::Customer),
        row("Received", Field::Received),
        row("Line", Field::Line),
        row("Grade", Field::Grade),
        row("Lot", Field::Lot),
        row("Parent roll", Field::ParentRoll),
        row("Set", Field::Set),
        row("Rolls affected", Field::RollsAffected),
        row("Rolls checked", Field::RollsChecked),
        row("Slit positions", Field::SlitPositions),
        row("Found at", Field::FoundAt),
        row("Containment", Field::Containment),
        row("Status", Field::Status),
        heading("Confirmed causes"),
    ]);
    for i in 0..c.confirmed_causes.len() {
        out.extend([
            row(
                format!("Cause {}", i + 1),
                Field::Cause(i, CausePart::Cause),
            ),
            row("  evidence", Field::Cause(i, CausePart::Evidence)),
            row("  confirmed on", Field::Cause(i, CausePart::On)),
            row("  confirmed by", Field::Cause(i, CausePart::By)),
        ]);
    }
    out.push(row("+ add a cause", Field::AddCause));
    out.push(heading("Corrective actions"));
    for i in 0..c.actions.len() {
        out.extend([
            row(
                format!("Action {}", i + 1),
                Field::Action(i, ActionPart::Action),
            ),
            row("  owner", Field::Action(i, ActionPart::Owner)),
            row("  due", Field::Action(i, ActionPart::Due)),
            row("  done", Field::Action(i, ActionPart::Done)),
        ]);
    }
    out.push(row("+ add an action", Field::AddAction));
    out.extend([
        heading("Did it stop?"),
        row("Result", Field::VerificationResult),
        row("Checked on", Field::VerificationCheckedOn),
        row("Verification notes", Field::VerificationNotes),
    ]);
    out
}

fn text(value: &Option<String>) -> String {
    value.clone().unwrap_or_default()
}

/// The field's value as the case file has it (choice words as written).
pub fn value(case: &Case, field: Field) -> String {
    let c = case.complaint.clone().unwrap_or_default();
    let cause = |i: usize| c.confirmed_causes.get(i).cloned().unwrap_or_default();
    let action = |i: usize| c.actions.get(i).cloned().unwrap_or_default();
    let verification = c.verification.clone().unwrap_or_default();
    match field {
        Field::Title => case.title.clone(),
        Field::Description => text(&case.description),
        Field::Notes => text(&case.notes),
        Field::SymptomNotes(i) => case
            .symptoms
            .get(i)
            .and_then(|s| s.notes.clone())
            .unwrap_or_default(),
        Field::Reference => text(&c.reference),
        Field::Source => text(&c.source),
        Field::Customer => text(&c.customer),
        Field::Received => text(&c.received),
        Field::Line => text(&c.line),
        Field::Grade => text(&c.grade),
        Field::Lot => text(&c.lot),
        Field::ParentRoll => text(&c.parent_roll),
        Field::Set => text(&c.set),
        Field::RollsAffected => c.rolls_affected.map(|n| n.to_string()).unwrap_or_default(),
        Field::RollsChecked => c.rolls_checked.map(|n| n.to_string()).unwrap_or_default(),
        Field::SlitPositions => c
            .slit_positions
            .iter()
            .map(u32::to_string)
            .collect::<Vec<_>>()
            .join(", "),
        Field::FoundAt => text(&c.found_at),
        Field::Containment => text(&c.containment),
        Field::Status => text(&c.status),
        Field::Cause(i, CausePart::Cause) => cause(i).cause,
        Field::Cause(i, CausePart::Evidence) => text(&cause(i).evidence),
        Field::Cause(i, CausePart::On) => text(&cause(i).confirmed_on),
        Field::Cause(i, CausePart::By) => text(&cause(i).confirmed_by),
        Field::Action(i, ActionPart::Action) => action(i).action,
        Field::Action(i, ActionPart::Owner) => text(&action(i).owner),
        Field::Action(i, ActionPart::Due) => text(&action(i).due),
        Field::Action(i, ActionPart::Done) => text(&action(i).done),
        Field::AddCause | Field::AddAction => String::new(),
        Field::VerificationResult => text(&verification.result),
        Field::VerificationCheckedOn => text(&verification.checked_on),
        Field::VerificationNotes => text(&verification.notes),
    }
}

/// The value as a person reads it: choice words and cause IDs in plain words.
fn shown(case: &Case, field: Field, ctx: &Session) -> String {
    let raw = value(case, field);
    match field {
        Field::Cause(_, CausePart::Cause) => ctx.catalogue.cause_title(&raw),
        f if f.choices().is_some() => raw.replace('_', " "),
        _ => raw,
    }
}

/// Blank text is "not given".
fn given(text: &str) -> Option<String> {
    let t = text.trim();
    (!t.is_empty()).then(|| t.to_string())
}

fn count(label: &str, text: &str) -> Result<Option<u32>, String> {
    match given(text) {
        None => Ok(None),
        Some(t) => t.parse::<u32>().map(Some).map_err(|_| {
            format!(
                "{label}: `{t}` is not a whole number; accepted: 0, 1, 2, … (blank = not given)"
            )
        }),
    }
}

/// A cause as typed: its ID or its title (any case), else the closest as a suggestion.
fn cause_id(text: &str, causes: &[(String, String)]) -> Result<String, String> {
    let t = text.trim();
    if let Some((id, _)) = causes
        .iter()
        .find(|(id, title)| id == t || title.eq_ignore_ascii_case(t) || id.replace('_', " ") == t)
    {
        return Ok(id.clone());
    }
    let hint = crate::vocabulary::closest(t, causes.iter().map(|(_, title)| title.as_str()))
        .map(|c| format!(" (did you mean \"{c}\"?)"))
        .unwrap_or_default();
    Err(format!(
        "cause: \"{t}\" is not a cause the rule base knows{hint}; ←/→ on the row picks one"
    ))
}

/// Write `typed` into the case's `field`; the case is left unchanged when it is refused.
pub fn set(
    case: &mut Case,
    field: Field,
    typed: &str,
    causes: &[(String, String)],
) -> Result<(), String> {
    let mut c = case.complaint.clone().unwrap_or_default();
    let v = given(typed);
    match field {
        Field::Title => {
            case.title = v.ok_or("title: a case needs a title; type a few words")?;
            return Ok(());
        }
        Field::Description => {
            case.description = v;
            return Ok(());
        }
        Field::Notes => {
            case.notes = v;
            return Ok(());
        }
        Field::SymptomNotes(i) => {
            if let Some(s) = case.symptoms.get_mut(i) {
                s.notes = v;
            }
            return Ok(());
        }
        Field::Reference => c.reference = v,
        Field::Source => c.source = v,
        Field::Customer => c.customer = v,
        Field::Received => c.received = v,
        Field::Line => c.line = v,
        Field::Grade => c.grade = v,
        Field::Lot => c.lot = v,
        Field::ParentRoll => c.parent_roll = v,
        Field::Set => c.set = v,
        Field::RollsAffected => c.rolls_affected = count("rolls affected", typed)?,
        Field::RollsChecked => c.rolls_checked = count("rolls checked", typed)?,
        Field::SlitPositions => {
            let mut positions = Vec::new();
            for part in typed
                .split([',', ' ', ';'])
                .filter(|p| !p.trim().is_empty())
            {
                if let Some(n) = count("slit positions", part)? {
                    positions.push(n);
                }
            }
            c.slit_positions = positions;
        }
        Field::FoundAt => c.found_at = v,
        Field::Containment => c.containment = v,
        Field::Status => c.status = v,
        Field::Cause(i, part) => {
            if i >= c.confirmed_causes.len() {
                return Ok(());
            }
            let cause = &mut c.confirmed_causes[i];
            match part {
                CausePart::Cause => match v {
                    Some(t) => cause.cause = cause_id(&t, causes)?,
                    None => return Err("cause: say which cause (Delete removes the cause)".into()),
                },
                CausePart::Evidence => cause.evidence = v,
                CausePart::On => cause.confirmed_on = v,
                CausePart::By => cause.confirmed_by = v,
            }
        }
        Field::AddCause => match v {
            Some(t) => c.confirmed_causes.push(ConfirmedCause {
                cause: cause_id(&t, causes)?,
                ..ConfirmedCause::default()
            }),
            None => return Ok(()),
        },
        Field::Action(i, part) => {
            if i >= c.actions.len() {
                return Ok(());
            }
            let action = &mut c.actions[i];
            match part {
                ActionPart::Action => match v {
                    Some(t) => action.action = t,
                    None => {
                        return Err(
                            "action: say what was changed (Delete removes the action)".into()
                        );
                    }
                },
                ActionPart::Owner => action.owner = v,
                ActionPart::Due => action.due = v,
                ActionPart::Done => action.done = v,
            }
        }
        Field::AddAction => match v {
            Some(t) => c.actions.push(CorrectiveAction {
                action: t,
                ..CorrectiveAction::default()
            }),
            None => return Ok(()),
        },
        Field::VerificationResult | Field::VerificationCheckedOn | Field::VerificationNotes => {
            let mut verification = c.verification.clone().unwrap_or_default();
            match field {
                Field::VerificationResult => verification.result = v,
                Field::VerificationCheckedOn => verification.checked_on = v,
                _ => verification.notes = v,
            }
            c.verification = (verification != Default::default()).then_some(verification);
        }
    }
    // The record's own checks: dates, word lists, affected ≤ checked. Cause IDs were checked
    // above against the causes offered.
    c.check(None)?;
    case.complaint = (c != Complaint::default()).then_some(c);
    Ok(())
}

/// Delete on a row: a cause's or an action's first row removes it; any other row is cleared.
fn remove(case: &mut Case, field: Field, causes: &[(String, String)]) -> Result<(), String> {
    let Some(mut c) = case.complaint.clone() else {
        return set(case, field, "", causes);
    };
    match field {
        Field::Cause(i, CausePart::Cause) if i < c.confirmed_causes.len() => {
            c.confirmed_causes.remove(i);
        }
        Field::Action(i, ActionPart::Action) if i < c.actions.len() => {
            c.actions.remove(i);
        }
        _ => return set(case, field, "", causes),
    }
    case.complaint = (c != Complaint::default()).then_some(c);
    Ok(())
}

/// The complaint and story popup's state.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct StoryPopup {
    /// Index among the field rows (headings are skipped).
    pub selected: usize,
    /// The text being typed into the selected row.
    pub editing: Option<String>,
    /// Why the last entry was refused.
    pub error: Option<String>,
}

#[rustfmt::skip]
pub const KEYS: &[Binding] = &[
    Binding::both(MOVE, "↑↓", "move", "↑↓ PgUp PgDn", "move between the fields"),
    Binding::both(MOVE, "Enter", "edit", "Enter", "edit the field (Enter again keeps it, Esc cancels)"),
    Binding::both(CHOICE, "←→", "choose", "←→", "choose (from, found at, status, result, cause)"),
    Binding::both(MOVE, "Del", "clear", "Delete", "clear the field; removes a cause or an action"),
    Binding::both(MOVE, "^S", "save", "Ctrl-S", "save the case file"),
    Binding::both(MOVE, "Esc", "close", "Esc", "close (the edits stay in the case until you save)"),
    Binding::both(TYPING, "Enter", "keep", "Ctrl-U / Ctrl-W", "while typing: clear the text / the last word"),
    Binding::line(TYPING, "Esc", "cancel"),
];

impl StoryPopup {
    /// The field rows of the case as it stands.
    fn fields(ctx: &Session) -> Vec<Field> {
        rows(&ctx.case, ctx)
            .into_iter()
            .filter_map(|r| r.field)
            .collect()
    }

    /// The selected field.
    pub fn field(&self, ctx: &Session) -> Option<Field> {
        let fields = StoryPopup::fields(ctx);
        fields
            .get(self.selected.min(fields.len().saturating_sub(1)))
            .copied()
    }

    fn commit(&mut self, ctx: &mut Session, field: Field, typed: String) {
        let causes = ctx.catalogue.causes();
        let before = ctx.case.clone();
        match set(&mut ctx.case, field, &typed, &causes) {
            Ok(()) => {
                self.editing = None;
                self.error = None;
                if ctx.case != before {
                    ctx.story_edited();
                }
            }
            // Keep what was typed so it can be corrected.
            Err(message) => {
                self.editing = Some(typed);
                self.error = Some(message);
            }
        }
    }

    /// ←/→ on a choice row or a cause row: the next or previous word (blank included).
    fn step(&mut self, ctx: &mut Session, field: Field, forward: bool) {
        let current = value(&ctx.case, field);
        let options: Vec<String> = match field {
            Field::Cause(_, CausePart::Cause) => ctx
                .catalogue
                .causes()
                .into_iter()
                .map(|(id, _)| id)
                .collect(),
            f => match f.choices() {
                Some(words) => std::iter::once(String::new())
                    .chain(words.iter().map(|w| w.to_string()))
                    .collect(),
                None => return,
            },
        };
        if options.is_empty() {
            return;
        }
        let at = options.iter().position(|o| *o == current);
        let n = options.len();
        let next = match (at, forward) {
            (Some(i), true) => (i + 1) % n,
            (Some(i), false) => (i + n - 1) % n,
            (None, _) => 0,
        };
        let chosen = options[next].clone();
        self.commit(ctx, field, chosen);
        // A refused choice (e.g. a status the record does not allow yet) is not left typed.
        self.editing = None;
    }
}

fn is_choice(field: Field) -> bool {
    field.choices().is_some() || matches!(field, Field::Cause(_, CausePart::Cause))
}

impl Component for StoryPopup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        let Some(field) = self.field(ctx) else {
            if key == Key::Esc {
                ctx.push(Action::Close);
            }
            return Handled::Yes;
        };
        if let Some(typed) = &mut self.editing {
            match edit_field::edit(typed, key) {
                Typed::Enter => {
                    let typed = typed.clone();
                    self.commit(ctx, field, typed);
                }
                Typed::Cancel => {
                    self.editing = None;
                    self.error = None;
                }
                Typed::Editing => {}
            }
            return Handled::Yes;
        }
        let last = StoryPopup::fields(ctx).len().saturating_sub(1);
        self.selected = self.selected.min(last);
        if edit_field::move_selection(&mut self.selected, last, key) {
            return Handled::Yes;
        }
        match key {
            Key::Left | Key::Right if is_choice(field) => {
                self.error = None;
                self.step(ctx, field, key == Key::Right);
            }
            Key::Enter if field.choices().is_some() => self.step(ctx, field, true),
            Key::Enter => {
                self.error = None;
                self.editing = Some(value(&ctx.case, field));
            }
            Key::Delete => {
                let causes = ctx.catalogue.causes();
                let before = ctx.case.clone();
                match remove(&mut ctx.case, field, &causes) {
                    Ok(()) => self.error = None,
                    Err(message) => self.error = Some(message),
                }
                if ctx.case != before {
                    ctx.story_edited();
                }
            }
            Key::Ctrl('s') => ctx.push(Action::Save),
            Key::Esc | Key::F(7) => ctx.push(Action::Close),
            _ => {}
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn mode(&self, ctx: &Session) -> u8 {
        super::field_mode(
            self.editing.is_some(),
            self.field(ctx).is_some_and(is_choice),
        )
    }

    fn is_typing(&self) -> bool {
        self.editing.is_some()
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        // The list, then the selected field in full (wrapped) and any refusal.
        let Some(frame) = edit_field::frame(
            " Complaint — the case's story (Esc closes, ^S saves) ",
            (20, 26),
            area,
            buf,
        ) else {
            return;
        };
        let selected_field = self.field(ctx);
        let mut lines = Vec::new();
        let mut selected_line = 0;
        for r in rows(&ctx.case, ctx) {
            match r.field {
                None => lines.push(Line::from(Span::styled(r.label, theme.title()))),
                Some(field) => {
                    let is_selected = Some(field) == selected_field;
                    if is_selected {
                        selected_line = lines.len();
                    }
                    let mut value = match (&self.editing, is_selected) {
                        (Some(typed), true) => format!("{typed}▏"),
                        _ => shown(&ctx.case, field, ctx),
                    };
                    value = value.replace('\n', " ⏎ ");
                    if value.is_empty() && self.editing.is_none() {
                        value = match field {
                            Field::AddCause | Field::AddAction => "Enter to add".into(),
                            f if is_choice(f) => "— (←→ to choose)".into(),
                            _ => "—".into(),
                        };
                    }
                    lines.push(frame.row(&r.label, &value, is_selected, theme));
                }
            }
        }
        frame.render_list(lines, selected_line, buf);
        let mut about = Vec::new();
        if let Some(error) = &self.error {
            about.push(Line::from(Span::styled(
                format!("Not accepted: {error}"),
                theme.error(),
            )));
        } else if let Some(field) = selected_field {
            let full = match &self.editing {
                Some(typed) => typed.clone(),
                None => shown(&ctx.case, field, ctx),
            };
            let hint = match field {
                Field::Received
                | Field::Cause(_, CausePart::On)
                | Field::Action(_, ActionPart::Due | ActionPart::Done)
                | Field::VerificationCheckedOn => "a date, YYYY-MM-DD",
                Field::SlitPositions => "positions across the winder, e.g. 1, 4, 5",
                Field::RollsAffected | Field::RollsChecked => "a whole number",
                Field::Cause(_, CausePart::Cause) | Field::AddCause => {
                    "a cause: ←→ picks one, or type its name"
                }
                _ => "",
            };
            about.push(frame.rule(theme));
            if !hint.is_empty() {
                about.push(Line::from(Span::styled(hint.to_string(), theme.dim())));
            }
            about.push(Line::from(full));
        }
        frame.render_detail(about, buf);
    }
}
