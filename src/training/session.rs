//! A trainee's run through one walk-through: the computed stress state of its case, answers,
//! feedback and the score.

use super::{Question, TrainingError, Walkthrough, fill_placeholders, text_plot};
use crate::case::{Case, ResolvedCase};
use crate::diagnose::{DiagnoseOptions, Diagnosis, pipeline, rules::RuleBase};
use crate::model::{Profile, Resolution, SolverOptions};
use crate::units::UnitSystem;

/// The computed state of a walk-through's case.
#[derive(Debug, Clone, PartialEq)]
pub struct Computed {
    pub resolved: ResolvedCase,
    pub profile: Profile,
    /// `None` when the rule base could not diagnose the case (the feedback still quotes the
    /// stresses).
    pub diagnosis: Option<Diagnosis>,
}

/// The case and, when the solve worked, its computed state.
#[derive(Debug, Clone, PartialEq)]
pub struct TrainingContext {
    pub case: Case,
    pub computed: Option<Computed>,
    /// Why the case could not be computed, if it could not.
    pub problem: Option<String>,
    pub units: UnitSystem,
}

impl TrainingContext {
    /// Resolve, solve and diagnose `case`. A failure is kept as `problem`, not returned: the
    /// walk-through still runs on its written answers.
    pub fn compute(case: Case, rules: Option<&RuleBase>, units: UnitSystem) -> TrainingContext {
        let options = DiagnoseOptions {
            solver: TRAINING_SOLVER,
            ..DiagnoseOptions::default()
        };
        let computed = match rules {
            Some(rules) => {
                pipeline::triage(rules, (&case).into(), &options, &mut |_| true).map(|t| Computed {
                    resolved: t.resolved,
                    profile: t.profile,
                    diagnosis: t.diagnosis.ok(),
                })
            }
            None => pipeline::solve_case((&case).into(), TRAINING_SOLVER, &mut |_| true).map(|s| {
                Computed {
                    resolved: s.resolved,
                    profile: s.profile,
                    diagnosis: None,
                }
            }),
        }
        .map_err(|e| e.to_string());
        match computed {
            Ok(computed) => TrainingContext {
                case,
                computed: Some(computed),
                problem: None,
                units,
            },
            Err(problem) => TrainingContext {
                case,
                computed: None,
                problem: Some(problem),
                units,
            },
        }
    }

    /// A context without any computed state (used when the solver is not wanted).
    pub fn uncomputed(case: Case, units: UnitSystem) -> TrainingContext {
        TrainingContext {
            case,
            computed: None,
            problem: None,
            units,
        }
    }
}

/// Training feedback needs the shape and size of the stresses, not the last per cent: layers are
/// grouped into about [`TRAINING_ELEMENTS`] elements (with the solver's default modulus update)
/// so a walk-through starts at once even in a debug build.
pub const TRAINING_ELEMENTS: usize = 300;

const TRAINING_SOLVER: SolverOptions = SolverOptions {
    resolution: Resolution::Elements {
        count: TRAINING_ELEMENTS,
    },
    modulus_update: crate::model::ModulusUpdate::Secant,
};

/// What the trainee is told after answering one question.
#[derive(Debug, Clone, PartialEq)]
pub struct Feedback {
    /// 0-based question index.
    pub question: usize,
    /// 0-based chosen and correct choice.
    pub chosen: usize,
    pub correct_choice: usize,
    pub correct: bool,
    pub correct_text: String,
    /// The chosen choice's own feedback, if the file gives one.
    pub choice_feedback: Option<String>,
    /// The explanation with this roll's computed numbers filled in.
    pub explanation: String,
    /// A text plot of the computed curve, when the question asks for one and it was computed.
    pub plot: Option<String>,
}

impl Feedback {
    /// The feedback as terminal text.
    pub fn to_text(&self) -> String {
        let mut out = String::new();
        if self.correct {
            out.push_str("Correct.\n");
        } else {
            out.push_str(&format!(
                "Not quite. The best answer is {}: {}\n",
                self.correct_choice + 1,
                self.correct_text.trim()
            ));
        }
        if let Some(feedback) = &self.choice_feedback {
            out.push_str(feedback.trim());
            out.push('\n');
        }
        out.push_str(self.explanation.trim());
        out.push('\n');
        if let Some(plot) = &self.plot {
            out.push('\n');
            out.push_str(plot);
        }
        out
    }
}

/// The result of a walk-through.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub struct Score {
    pub correct: usize,
    pub answered: usize,
    pub total: usize,
}

impl Score {
    pub fn percent(&self) -> f64 {
        if self.total == 0 {
            0.0
        } else {
            100.0 * self.correct as f64 / self.total as f64
        }
    }
}

impl std::fmt::Display for Score {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(
            f,
            "{} of {} correct ({:.0} %)",
            self.correct,
            self.total,
            self.percent()
        )?;
        if self.answered < self.total {
            write!(f, ", {} not answered", self.total - self.answered)?;
        }
        Ok(())
    }
}

/// Is choice `choice` (0-based) the correct answer to question `question` (0-based)?
pub fn check_answer(
    walkthrough: &Walkthrough,
    question: usize,
    choice: usize,
) -> Result<bool, TrainingError> {
    let q = question_at(walkthrough, question)?;
    if choice >= q.choices.len() {
        return Err(TrainingError::ChoiceOutOfRange {
            question: question + 1,
            given: choice + 1,
            count: q.choices.len(),
        });
    }
    Ok(q.choices[choice].correct)
}

fn question_at(walkthrough: &Walkthrough, question: usize) -> Result<&Question, TrainingError> {
    walkthrough
        .questions
        .get(question)
        .ok_or(TrainingError::QuestionOutOfRange {
            given: question + 1,
            count: walkthrough.questions.len(),
        })
}

/// One trainee's pass through a walk-through.
#[derive(Debug, Clone, PartialEq)]
pub struct Session {
    pub walkthrough: Walkthrough,
    pub context: TrainingContext,
    answers: Vec<Option<usize>>,
}

impl Session {
    pub fn new(walkthrough: Walkthrough, context: TrainingContext) -> Session {
        let count = walkthrough.questions.len();
        Session {
            walkthrough,
            context,
            answers: vec![None; count],
        }
    }

    /// Shuffle every question's choices with `seed` (the same seed gives the same order), so
    /// the correct answer is not where the file's author happened to write it. Everything
    /// after this (question text, answers, feedback, score) uses the shuffled order.
    pub fn shuffle_choices(&mut self, seed: u64) {
        // SplitMix64 (Steele, Lea and Flood, OOPSLA 2014) and Fisher–Yates: small, portable,
        // the same sequence on every machine.
        let mut state = seed;
        let mut next = move || {
            state = state.wrapping_add(0x9E37_79B9_7F4A_7C15);
            let mut z = state;
            z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
            z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
            z ^ (z >> 31)
        };
        for question in &mut self.walkthrough.questions {
            for i in (1..question.choices.len()).rev() {
                let j = (next() % (i as u64 + 1)) as usize;
                question.choices.swap(i, j);
            }
        }
    }

    /// The prompt of question `index` (0-based) with this roll's numbers filled in.
    pub fn prompt(&self, index: usize) -> Result<String, TrainingError> {
        let q = question_at(&self.walkthrough, index)?;
        Ok(self.fill(q.prompt.trim()))
    }

    /// The text of choice `choice` of question `index` (0-based), numbers filled in.
    pub fn choice_text(&self, index: usize, choice: usize) -> Option<String> {
        let q = self.walkthrough.questions.get(index)?;
        q.choices.get(choice).map(|c| self.fill(c.text.trim()))
    }

    fn fill(&self, text: &str) -> String {
        fill_placeholders(text, self.context.computed.as_ref(), self.context.units)
    }

    /// True when every question has an answer.
    pub fn finished(&self) -> bool {
        self.answers.iter().all(Option::is_some)
    }

    /// The roll's story and symptoms, as the trainee first sees them.
    pub fn briefing(&self) -> String {
        let case = &self.context.case;
        let mut out = format!(
            "{}\n{}\n\n",
            self.walkthrough.title,
            "=".repeat(self.walkthrough.title.chars().count())
        );
        if let Some(intro) = &self.walkthrough.introduction {
            out.push_str(&self.fill(intro.trim()));
            out.push_str("\n\n");
        }
        out.push_str(&format!("Case: {}\n", case.title));
        if let Some(description) = &case.description {
            out.push_str(description.trim());
            out.push('\n');
        }
        out.push_str("\nWhat was seen:\n");
        for symptom in &case.symptoms {
            out.push_str(&format!("  - {}", symptom.id.replace('_', " ")));
            if let Some(place) = &symptom.place {
                out.push_str(&format!(" (at {})", place.replace('_', " ")));
            }
            if let Some(notes) = &symptom.notes {
                out.push_str(&format!(": {}", notes.trim()));
            }
            out.push('\n');
        }
        if let Some(notes) = &case.notes {
            out.push_str(&format!("\nNotes: {}\n", notes.trim()));
        }
        if let Some(problem) = &self.context.problem {
            out.push_str(&format!(
                "\n(The stress state could not be computed: {problem}. Feedback will be given \
                 without this roll's numbers.)\n"
            ));
        }
        out
    }

    /// Question `index` (0-based) with its numbered choices.
    pub fn question_text(&self, index: usize) -> Result<String, TrainingError> {
        let q = question_at(&self.walkthrough, index)?;
        // The question itself first; its topic is the file's bookkeeping, not the trainee's.
        let mut out = format!(
            "Question {} of {}: {}\n",
            index + 1,
            self.walkthrough.questions.len(),
            self.prompt(index)?
        );
        for number in 0..q.choices.len() {
            let text = self.choice_text(index, number).unwrap_or_default();
            out.push_str(&format!("  {}. {text}\n", number + 1));
        }
        Ok(out)
    }

    /// Record choice `choice` (0-based) for question `question` (0-based) and explain.
    pub fn answer(&mut self, question: usize, choice: usize) -> Result<Feedback, TrainingError> {
        let correct = check_answer(&self.walkthrough, question, choice)?;
        let q = question_at(&self.walkthrough, question)?;
        let correct_choice = q.correct_choice().ok_or_else(|| TrainingError::Invalid {
            origin: self.walkthrough.id.clone(),
            message: format!("question {} has no single correct choice", question + 1),
        })?;
        let computed = self.context.computed.as_ref();
        let units = self.context.units;
        let fill = |text: &str| fill_placeholders(text, computed, units);
        let plot = match (q.plot, computed) {
            (Some(kind), Some(c)) => Some(text_plot::render(&c.profile, kind, 60, 10, units)),
            _ => None,
        };
        let mut explanation = fill(&q.explanation);
        if q.topic == super::Topic::Cause
            && let Some(diagnosis) = computed.and_then(|c| c.diagnosis.as_ref())
        {
            let ranked: Vec<String> = diagnosis
                .causes
                .iter()
                .take(3)
                .enumerate()
                .map(|(i, c)| format!("{}. {} ({:.2})", i + 1, c.title, c.belief))
                .collect();
            if !ranked.is_empty() {
                explanation.push_str(&format!(
                    "\nThe tool's own ranking for this roll: {}.",
                    ranked.join("; ")
                ));
            }
        }
        let feedback = Feedback {
            question,
            chosen: choice,
            correct_choice,
            correct,
            correct_text: fill(&q.choices[correct_choice].text),
            choice_feedback: q.choices[choice].feedback.as_deref().map(fill),
            explanation,
            plot,
        };
        self.answers[question] = Some(choice);
        Ok(feedback)
    }

    pub fn score(&self) -> Score {
        let answered = self.answers.iter().filter(|a| a.is_some()).count();
        let correct = self
            .answers
            .iter()
            .enumerate()
            .filter(|(q, a)| {
                a.is_some_and(|choice| check_answer(&self.walkthrough, *q, choice).unwrap_or(false))
            })
            .count();
        Score {
            correct,
            answered,
            total: self.walkthrough.questions.len(),
        }
    }

    /// The closing text: score and summary.
    pub fn closing(&self) -> String {
        let mut out = format!("Score: {}\n", self.score());
        if let Some(summary) = &self.walkthrough.summary {
            out.push_str(&fill_placeholders(
                summary,
                self.context.computed.as_ref(),
                self.context.units,
            ));
            out.push('\n');
        }
        out
    }
}
