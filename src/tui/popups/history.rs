//! The plant's complaint history (F8): browse the stored complaints, read one, see the past
//! complaints most like the case on screen with their confirmed causes and what worked, and
//! add the case to the history. Every store access runs off the UI thread
//! ([`crate::tui::history_job`]); this popup only asks and shows the answers.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Clear, Paragraph, Widget};

use crate::history::{ComplaintSummary, PastComplaint, StoredComplaint};
use crate::tui::component::{Action, Binding, Component, Handled};
use crate::tui::event::Key;
use crate::tui::history_job::{HistoryAnswer, HistoryReply, HistoryTask};
use crate::tui::session::Session;
use crate::tui::theme::Theme;

/// Something asked of the store: not asked, waiting for request `n`, answered or failed.
#[derive(Debug, Clone, PartialEq, Default)]
pub enum Loaded<T> {
    #[default]
    Idle,
    Waiting(u64),
    Ready(T),
    Failed(String),
}

impl<T> Loaded<T> {
    fn waiting_for(&self, id: u64) -> bool {
        matches!(self, Loaded::Waiting(n) if *n == id)
    }
}

/// What the popup shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum HistoryView {
    #[default]
    List,
    /// One stored complaint.
    Complaint,
    /// Past complaints like the case on screen.
    Similar,
}

/// The list and how many complaints the store holds.
#[derive(Debug, Clone, PartialEq)]
pub struct Listing {
    pub complaints: Vec<ComplaintSummary>,
    pub total: usize,
}

#[derive(Debug, Clone, PartialEq, Default)]
pub struct HistoryPopup {
    pub view: HistoryView,
    pub list: Loaded<Listing>,
    pub selected: usize,
    pub shown: Loaded<Box<StoredComplaint>>,
    pub similar: Loaded<Vec<PastComplaint>>,
    /// Adding the case to the history: the request waited for.
    pub adding: Option<u64>,
    /// The last thing done ("Stored as complaint 12 …") or why it was not.
    pub note: Option<String>,
    pub scroll: u16,
    /// The case generation the similar complaints were asked for.
    pub similar_for: u64,
}

#[rustfmt::skip]
pub const KEYS: &[Binding] = &[
    Binding::both(LIST, "↑↓", "pick", "↑↓ PgUp PgDn", "pick a complaint / scroll"),
    Binding::both(LIST, "Enter", "show", "Enter", "show one: its record, causes ranked then, versions"),
    Binding::both(ANY_VIEW, "s", "similar", "s", "past complaints like this one and what worked"),
    Binding::both(ANY_VIEW, "a", "add this case", "a", "add the case on screen to the history"),
    Binding::both(LIST, "r", "reload", "r", "read the list again"),
    Binding::both(LIST, "Esc", "close", "Esc", "back to the list / close"),
    Binding::line(DETAIL, "Esc", "back to the list"),
];

const LIST: u8 = 1;
const DETAIL: u8 = 2;
const ANY_VIEW: u8 = LIST | DETAIL;

impl HistoryPopup {
    /// Open on the list (asked for at once), or on the reason there is no store.
    pub fn open(ctx: &mut Session) -> HistoryPopup {
        let mut popup = HistoryPopup::default();
        popup.reload(ctx);
        popup
    }

    fn reload(&mut self, ctx: &mut Session) {
        self.list = match ctx.queue_history(HistoryTask::List) {
            Ok(id) => Loaded::Waiting(id),
            Err(reason) => Loaded::Failed(reason),
        };
    }

    fn ask_similar(&mut self, ctx: &mut Session) {
        self.view = HistoryView::Similar;
        self.scroll = 0;
        if ctx.case.symptoms.is_empty() {
            self.similar =
                Loaded::Failed("Pick the symptoms of this case first (F2): similar complaints are found by what was seen.".into());
            return;
        }
        self.similar_for = ctx.generation;
        self.similar = match ctx.queue_history(HistoryTask::Similar(Box::new(ctx.case.clone()))) {
            Ok(id) => Loaded::Waiting(id),
            Err(reason) => Loaded::Failed(reason),
        };
    }

    fn ask_add(&mut self, ctx: &mut Session) {
        if self.adding.is_some() {
            return;
        }
        if ctx.case.symptoms.is_empty() {
            self.note = Some("Not added: a complaint needs at least one symptom (F2).".into());
            return;
        }
        match ctx.queue_history(HistoryTask::Add(Box::new(ctx.case.clone()))) {
            Ok(id) => {
                self.adding = Some(id);
                self.note = Some("Adding this case to the history (solving it first)…".into());
            }
            Err(reason) => self.note = Some(reason),
        }
    }

    /// Take an answer from the store; false when it was not for this popup.
    pub fn on_reply(&mut self, reply: HistoryReply, ctx: &mut Session) -> bool {
        let id = reply.id;
        if self.adding == Some(id) {
            self.adding = None;
            match reply.result {
                Ok(HistoryAnswer::Added { id: number, place }) => {
                    self.note = Some(format!("Stored as complaint {number} in {place}."));
                    self.reload(ctx);
                }
                Ok(_) => {}
                Err(e) => self.note = Some(format!("Not added: {e}")),
            }
            return true;
        }
        if self.list.waiting_for(id) {
            self.list = match reply.result {
                Ok(HistoryAnswer::List { complaints, total }) => {
                    self.selected = self.selected.min(complaints.len().saturating_sub(1));
                    Loaded::Ready(Listing { complaints, total })
                }
                Ok(_) => Loaded::Idle,
                Err(e) => Loaded::Failed(e),
            };
            return true;
        }
        if self.shown.waiting_for(id) {
            self.shown = match reply.result {
                Ok(HistoryAnswer::Show(c)) => Loaded::Ready(c),
                Ok(_) => Loaded::Idle,
                Err(e) => Loaded::Failed(e),
            };
            return true;
        }
        if self.similar.waiting_for(id) {
            self.similar = match reply.result {
                Ok(HistoryAnswer::Similar(p)) => {
                    ctx.similar_past = Some((self.similar_for, p.clone()));
                    Loaded::Ready(p)
                }
                Ok(_) => Loaded::Idle,
                Err(e) => Loaded::Failed(e),
            };
            return true;
        }
        false
    }

    fn selected_id(&self) -> Option<i64> {
        match &self.list {
            Loaded::Ready(l) => l.complaints.get(self.selected).map(|c| c.id),
            _ => None,
        }
    }

    fn list_lines(&self, ctx: &Session, theme: Theme, width: usize) -> (Vec<Line<'static>>, usize) {
        let mut lines = Vec::new();
        let mut selected_line = 0;
        match &self.list {
            Loaded::Idle => {}
            Loaded::Waiting(_) => lines.push(Line::from("Reading the history store…")),
            Loaded::Failed(reason) => lines.push(Line::from(reason.clone())),
            Loaded::Ready(listing) => {
                let place = ctx
                    .history
                    .as_ref()
                    .map(|l| l.describe())
                    .unwrap_or_default();
                let shown = if listing.total > listing.complaints.len() {
                    format!(", the newest {} listed", listing.complaints.len())
                } else {
                    String::new()
                };
                lines.push(Line::from(Span::styled(
                    format!("{} complaint(s) in {place}{shown}", listing.total),
                    theme.dim(),
                )));
                if listing.complaints.is_empty() {
                    lines.push(Line::from("No complaints stored yet: a adds this case."));
                }
                lines.push(Line::from(Span::styled(
                    format!(
                        "{:>5}  {:<10}  {:<15}  {}",
                        "No.", "Received", "Status", "Title; what was seen — confirmed cause"
                    ),
                    theme.title(),
                )));
                for (i, c) in listing.complaints.iter().enumerate() {
                    let when = c
                        .received
                        .clone()
                        .unwrap_or_else(|| c.recorded.chars().take(10).collect());
                    let seen: Vec<String> =
                        c.symptoms.iter().map(|s| s.replace('_', " ")).collect();
                    let cause = if c.confirmed.is_empty() {
                        "not confirmed".to_string()
                    } else {
                        c.confirmed
                            .iter()
                            .map(|id| ctx.catalogue.cause_title(id))
                            .collect::<Vec<_>>()
                            .join(", ")
                    };
                    let style = if i == self.selected {
                        selected_line = lines.len();
                        theme.selected()
                    } else {
                        theme.plain()
                    };
                    let row = format!(
                        "{:>5}  {:<10}  {:<15}  {}",
                        c.id,
                        when,
                        c.status.replace('_', " "),
                        c.title,
                    );
                    lines.push(Line::from(Span::styled(
                        super::edit_field::clip(&row, width),
                        style,
                    )));
                    lines.push(Line::from(Span::styled(
                        format!("{:>7}{} — {cause}", "", seen.join(", ")),
                        theme.dim(),
                    )));
                }
            }
        }
        (lines, selected_line)
    }

    fn complaint_lines(&self, ctx: &Session, theme: Theme) -> Vec<Line<'static>> {
        let c = match &self.shown {
            Loaded::Idle => return vec![],
            Loaded::Waiting(_) => return vec![Line::from("Reading the complaint…")],
            Loaded::Failed(reason) => return vec![Line::from(reason.clone())],
            Loaded::Ready(c) => c,
        };
        let mut lines = Vec::new();
        let Some(latest) = c.latest() else {
            return vec![Line::from(format!("Complaint {} has no versions.", c.id))];
        };
        let title = latest.resolved["title"].as_str().unwrap_or("").to_string();
        lines.push(Line::from(Span::styled(
            format!("Complaint {} — {title}", c.id),
            theme.title(),
        )));
        for (label, value) in latest
            .complaint
            .lines_titled(&|id| ctx.catalogue.cause_title(id))
        {
            lines.push(Line::from(vec![
                Span::styled(format!("{label:<18}"), theme.key()),
                Span::raw(value),
            ]));
        }
        lines.push(Line::from(""));
        lines.push(Line::from(Span::styled(
            "Likely causes as ranked then",
            theme.title(),
        )));
        for (i, cause) in latest.ranked_causes().iter().take(5).enumerate() {
            lines.push(Line::from(format!(
                "  {}. {} — belief {:.2}",
                i + 1,
                cause.title,
                cause.belief
            )));
        }
        lines.push(Line::from(""));
        lines.push(Line::from(Span::styled("Versions", theme.title())));
        for v in &c.versions {
            lines.push(Line::from(format!(
                "  {}  {}  {}",
                v.version, v.recorded_at, v.change
            )));
        }
        for s in &c.status_changes {
            lines.push(Line::from(format!(
                "  status {} → {} ({}){}",
                s.from_status.as_deref().unwrap_or("—").replace('_', " "),
                s.to_status.replace('_', " "),
                s.changed_at,
                s.note
                    .as_deref()
                    .map(|n| format!(": {n}"))
                    .unwrap_or_default()
            )));
        }
        lines
    }

    fn similar_lines(&self, theme: Theme, width: usize) -> Vec<Line<'static>> {
        let past = match &self.similar {
            Loaded::Idle => return vec![],
            Loaded::Waiting(_) => {
                return vec![Line::from("Solving this case and searching the history…")];
            }
            Loaded::Failed(reason) => return vec![Line::from(reason.clone())],
            Loaded::Ready(p) => p,
        };
        let mut lines = vec![Line::from(Span::styled(
            "Past complaints most like this case (distance 0 = alike, 1 = nothing in common)",
            theme.title(),
        ))];
        if past.is_empty() {
            lines.push(Line::from("None stored yet."));
        }
        for p in past {
            lines.push(Line::from(Span::styled(
                format!(
                    "{:>5}  distance {:.2}  {}  {}",
                    p.id,
                    p.distance,
                    p.received.as_deref().unwrap_or("no date"),
                    p.title
                ),
                theme.key(),
            )));
            let place = p.place();
            let mut told = vec![("seen", p.symptoms.join(", "))];
            if !place.is_empty() {
                told.push(("where", place));
            }
            told.push(("cause", p.cause_line()));
            told.push((
                "what was done",
                p.worked_line()
                    .unwrap_or_else(|| "nothing recorded".to_string()),
            ));
            for (label, text) in told {
                lines.extend(indented(&format!("       {label}: "), &text, width));
            }
        }
        lines
    }
}

/// `text` after `prefix`, word-wrapped to `width` with the continuation lines indented under
/// the text (wrapped lines must not run back to the margin), a number kept with its unit.
fn indented(prefix: &str, text: &str, width: usize) -> Vec<Line<'static>> {
    crate::tui::screens::hang(
        Line::from(format!("{prefix}{text}")),
        width,
        prefix.chars().count(),
    )
}

impl Component for HistoryPopup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        let count = match &self.list {
            Loaded::Ready(l) => l.complaints.len(),
            _ => 0,
        };
        let last = count.saturating_sub(1);
        match (self.view, key) {
            (HistoryView::List, Key::Up) => self.selected = self.selected.saturating_sub(1),
            (HistoryView::List, Key::Down) => self.selected = (self.selected + 1).min(last),
            (HistoryView::List, Key::PageUp) => self.selected = self.selected.saturating_sub(10),
            (HistoryView::List, Key::PageDown) => self.selected = (self.selected + 10).min(last),
            (HistoryView::List, Key::Enter) => {
                if let Some(id) = self.selected_id() {
                    self.view = HistoryView::Complaint;
                    self.scroll = 0;
                    self.shown = match ctx.queue_history(HistoryTask::Show(id)) {
                        Ok(n) => Loaded::Waiting(n),
                        Err(reason) => Loaded::Failed(reason),
                    };
                }
            }
            (HistoryView::List, Key::Char('r')) => self.reload(ctx),
            (_, Key::Up) => self.scroll = self.scroll.saturating_sub(1),
            (_, Key::Down) => self.scroll = self.scroll.saturating_add(1).min(200),
            (_, Key::PageUp) => self.scroll = self.scroll.saturating_sub(10),
            (_, Key::PageDown) => self.scroll = self.scroll.saturating_add(10).min(200),
            (_, Key::Char('s')) => self.ask_similar(ctx),
            (_, Key::Char('a')) => self.ask_add(ctx),
            (HistoryView::List, Key::Esc | Key::F(8)) | (_, Key::F(8)) => ctx.push(Action::Close),
            (_, Key::Esc) => {
                self.view = HistoryView::List;
                self.scroll = 0;
            }
            _ => {}
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn mode(&self, _ctx: &Session) -> u8 {
        match self.view {
            HistoryView::List => LIST,
            _ => DETAIL,
        }
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        let rect = Rect {
            height: area.height.saturating_sub(2),
            ..area
        };
        Clear.render(rect, buf);
        let title = match self.view {
            HistoryView::List => " Complaint history — Enter shows one, s similar to this case ",
            HistoryView::Complaint => " Complaint history — one complaint (Esc: back to the list) ",
            HistoryView::Similar => " Complaint history — like this case (Esc: back to the list) ",
        };
        let block = Block::bordered().title(title);
        let inner = block.inner(rect);
        block.render(rect, buf);
        if inner.height < 2 {
            return;
        }
        // The note (added, or why not) takes the last line.
        let body = match &self.note {
            Some(note) => {
                let line = Rect {
                    y: inner.y + inner.height - 1,
                    height: 1,
                    ..inner
                };
                Paragraph::new(Line::from(Span::styled(note.clone(), theme.warn())))
                    .render(line, buf);
                Rect {
                    height: inner.height - 1,
                    ..inner
                }
            }
            None => inner,
        };
        match self.view {
            HistoryView::List => {
                let (lines, selected) = self.list_lines(ctx, theme, usize::from(body.width));
                let first = (selected + 2).saturating_sub(usize::from(body.height));
                let no_store = matches!(self.list, Loaded::Failed(_));
                let paragraph = if no_store {
                    crate::tui::screens::wrapped(lines, false)
                } else {
                    Paragraph::new(lines)
                };
                paragraph.scroll((first as u16, 0)).render(body, buf);
            }
            HistoryView::Complaint => {
                crate::tui::screens::wrapped(self.complaint_lines(ctx, theme), false)
                    .scroll((self.scroll, 0))
                    .render(body, buf)
            }
            HistoryView::Similar => crate::tui::screens::wrapped(
                self.similar_lines(theme, usize::from(body.width)),
                false,
            )
            .scroll((self.scroll, 0))
            .render(body, buf),
        }
    }
}
