//! A training walk-through answered inside the UI: the story, each question with its choices,
//! the feedback on each answer, and the score.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Clear, Widget};

use crate::tui::component::{Action, Binding, Component, Handled};
use crate::tui::event::Key;
use crate::tui::screens::centred;
use crate::tui::session::Session;
use crate::tui::theme::Theme;

const QUESTION: u8 = 1;
const DONE: u8 = 2;
const READING: u8 = 4;

/// The walk-through's keys.
#[rustfmt::skip]
pub const KEYS: &[Binding] = &[
    Binding::line(DONE, "Enter/Esc", "close"),
    Binding::both(READING, "Enter", "next", "Enter", "start / next question / close after the score"),
    Binding::both(QUESTION, "1-9", "answer", "1-9, or ↑ ↓ then Enter", "answer the question"),
    Binding::line(QUESTION, "↑↓ Enter", "pick"),
    Binding::both(DONE | READING, "↑↓", "scroll", "↑ ↓  PgUp PgDn", "scroll the story and the feedback"),
    Binding::both(QUESTION | READING, "Esc", "leave", "Esc", "leave the walk-through (its case stays open)"),
];

/// Where a trainee is in an in-UI walk-through.
#[derive(Debug, Clone, PartialEq)]
pub enum WalkStage {
    /// The story and what was seen.
    Briefing,
    /// Question `index` (0-based) with choice `highlighted` (0-based) under the cursor.
    Question { index: usize, highlighted: usize },
    /// The feedback on the answer to question `index`.
    Feedback {
        index: usize,
        feedback: Box<crate::training::Feedback>,
    },
    /// The score and the summary.
    Done,
}

/// A walk-through answered inside the UI: the library's [`crate::training::Session`] checks the
/// answers and writes the feedback with this roll's computed values, as `rolltriage train` does.
#[derive(Debug, Clone, PartialEq)]
pub struct WalkthroughRun {
    pub session: crate::training::Session,
    /// The seed the choices were shuffled with (shown, so the same order can be given again
    /// with `rolltriage train --seed`).
    pub seed: u64,
    pub stage: WalkStage,
    /// First line shown (long feedback scrolls).
    pub scroll: u16,
}

impl WalkthroughRun {
    fn question_count(&self) -> usize {
        self.session.walkthrough.questions.len()
    }

    fn choice_count(&self, index: usize) -> usize {
        self.session
            .walkthrough
            .questions
            .get(index)
            .map_or(0, |q| q.choices.len())
    }

    /// The stage after `index`: the next question, or the score.
    fn after(&self, index: usize) -> WalkStage {
        if index + 1 < self.question_count() {
            WalkStage::Question {
                index: index + 1,
                highlighted: 0,
            }
        } else {
            WalkStage::Done
        }
    }

    /// One key; returns false when the walk-through is left.
    pub fn key(&mut self, key: Key) -> bool {
        if key == Key::Esc {
            return false;
        }
        match key {
            Key::Up if !matches!(self.stage, WalkStage::Question { .. }) => {
                self.scroll = self.scroll.saturating_sub(1);
                return true;
            }
            Key::Down if !matches!(self.stage, WalkStage::Question { .. }) => {
                self.scroll = self.scroll.saturating_add(1).min(200);
                return true;
            }
            Key::PageUp => {
                self.scroll = self.scroll.saturating_sub(10);
                return true;
            }
            Key::PageDown => {
                self.scroll = self.scroll.saturating_add(10).min(200);
                return true;
            }
            _ => {}
        }
        match self.stage.clone() {
            WalkStage::Briefing => {
                if matches!(key, Key::Enter | Key::Char(' ') | Key::Right) {
                    self.stage = if self.question_count() == 0 {
                        WalkStage::Done
                    } else {
                        WalkStage::Question {
                            index: 0,
                            highlighted: 0,
                        }
                    };
                    self.scroll = 0;
                }
            }
            WalkStage::Question { index, highlighted } => {
                let count = self.choice_count(index);
                let chosen = match key {
                    Key::Up => {
                        self.stage = WalkStage::Question {
                            index,
                            highlighted: highlighted.saturating_sub(1),
                        };
                        None
                    }
                    Key::Down => {
                        self.stage = WalkStage::Question {
                            index,
                            highlighted: (highlighted + 1).min(count.saturating_sub(1)),
                        };
                        None
                    }
                    Key::Enter => Some(highlighted),
                    Key::Char(c @ '1'..='9') => {
                        let n = usize::from(c as u8 - b'1');
                        (n < count).then_some(n)
                    }
                    _ => None,
                };
                if let Some(choice) = chosen {
                    match self.session.answer(index, choice) {
                        Ok(feedback) => {
                            self.stage = WalkStage::Feedback {
                                index,
                                feedback: Box::new(feedback),
                            };
                        }
                        // A malformed walk-through file: skip the question, do not stop.
                        Err(_) => self.stage = self.after(index),
                    }
                    self.scroll = 0;
                }
            }
            WalkStage::Feedback { index, .. } => {
                if matches!(key, Key::Enter | Key::Char(' ') | Key::Right) {
                    self.stage = self.after(index);
                    self.scroll = 0;
                }
            }
            WalkStage::Done => {
                if matches!(key, Key::Enter | Key::Char(' ')) {
                    return false;
                }
            }
        }
        true
    }
}

impl Component for WalkthroughRun {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        if !self.key(key) {
            let score = self.session.score();
            let how = if self.session.finished() {
                "finished"
            } else {
                "stopped"
            };
            ctx.set_status(format!("Walk-through {how}: {score}"));
            ctx.push(Action::Close);
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn mode(&self, _ctx: &Session) -> u8 {
        match self.stage {
            WalkStage::Question { .. } => QUESTION,
            WalkStage::Done => DONE,
            _ => READING,
        }
    }

    fn render(&self, _ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        render(self, theme, area, buf);
    }
}

fn text_lines(text: &str) -> Vec<Line<'static>> {
    text.lines().map(|l| Line::from(l.to_string())).collect()
}

fn render(run: &WalkthroughRun, theme: Theme, area: Rect, buf: &mut Buffer) {
    let session = &run.session;
    let total = session.walkthrough.questions.len();
    let (stage, mut lines) = match &run.stage {
        WalkStage::Briefing => ("the story".to_string(), {
            let mut lines = text_lines(&session.briefing());
            lines.push(Line::from(""));
            lines.push(Line::from(Span::styled(
                format!("{total} questions follow. Enter starts."),
                theme.dim(),
            )));
            lines
        }),
        WalkStage::Question { index, highlighted } => {
            let mut lines = Vec::new();
            if let Some(q) = session.walkthrough.questions.get(*index) {
                // The question first; the topic is the file's bookkeeping.
                lines.push(Line::from(Span::styled(
                    session.prompt(*index).unwrap_or_default(),
                    theme.title(),
                )));
                lines.push(Line::from(""));
                for i in 0..q.choices.len() {
                    let (marker, style) = if i == *highlighted {
                        ("▶", theme.selected())
                    } else {
                        (" ", theme.plain())
                    };
                    lines.push(Line::from(Span::styled(
                        format!(
                            "{marker} {}. {}",
                            i + 1,
                            session.choice_text(*index, i).unwrap_or_default()
                        ),
                        style,
                    )));
                }
            }
            (format!("question {} of {total}", index + 1), lines)
        }
        WalkStage::Feedback { index, feedback } => {
            let mut lines = text_lines(&feedback.to_text());
            lines.push(Line::from(""));
            let next = if index + 1 < total {
                "Enter: next question"
            } else {
                "Enter: your score"
            };
            lines.push(Line::from(Span::styled(next, theme.dim())));
            (
                format!("answer to question {} of {total}", index + 1),
                lines,
            )
        }
        WalkStage::Done => ("score".to_string(), text_lines(&session.closing())),
    };
    let score = session.score();
    lines.insert(
        0,
        Line::from(Span::styled(
            format!(
                "{} correct so far of {} · choices shuffled with seed {}",
                score.correct, score.total, run.seed
            ),
            theme.dim(),
        )),
    );
    let rect = centred(area, 78, area.height.saturating_sub(2));
    Clear.render(rect, buf);
    crate::tui::screens::wrapped(lines, false)
        .scroll((run.scroll, 0))
        .block(Block::bordered().title(format!(
            " {} — {stage} · Esc leaves ",
            session.walkthrough.title
        )))
        .render(rect, buf);
}
