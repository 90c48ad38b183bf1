//! `rolltriage train`: guided training walk-throughs, interactive or scripted, and their lint.

use std::io::{BufRead, Write};
use std::path::PathBuf;

use anyhow::Context;

use rolltriage::diagnose::rules::RuleBase;
use rolltriage::training::{
    LoadedWalkthrough, Session, TrainingContext, find, library, lint_dir, lint_walkthroughs,
    load_case, load_dir,
};
use rolltriage::units::UnitSystem;

#[derive(Debug, Default, clap::Args)]
#[command(after_help = "Examples:
  rolltriage train --list
  rolltriage train telescoping_newsprint              (interactive: type the number of your answer)
  rolltriage train telescoping_newsprint --seed 7 --answers 2,1,1,2
  rolltriage train --lint cases/training")]
pub struct TrainArgs {
    /// Walk-through ID (see --list) or a walk-through file.
    pub walkthrough: Option<String>,
    /// List the walk-throughs.
    #[arg(long)]
    pub list: bool,
    /// Answer every question from this comma-separated list of choice numbers (scripted mode;
    /// needs --seed, since the choices are shuffled).
    #[arg(long, value_delimiter = ',', requires = "seed")]
    pub answers: Option<Vec<usize>>,
    /// Shuffle the choices with this seed (the same seed gives the same order); without it a
    /// new order each session, and the seed is printed so the run can be repeated.
    #[arg(long)]
    pub seed: Option<u64>,
    /// Check every walk-through file in DIR and exit.
    #[arg(long, value_name = "DIR")]
    pub lint: Option<PathBuf>,
    /// Load walk-throughs from DIR instead of the shipped set.
    #[arg(long, value_name = "DIR")]
    pub dir: Option<PathBuf>,
    /// Print quantities in SI (default) or US trade units: si or us.
    #[arg(long, default_value = "si", value_parser = super::arg_check::unit_system)]
    pub units: String,
}

fn units(text: &str) -> anyhow::Result<UnitSystem> {
    match text.to_ascii_lowercase().as_str() {
        "si" | "metric" => Ok(UnitSystem::Si),
        "us" | "imperial" => Ok(UnitSystem::Us),
        other => anyhow::bail!("--units: \"{other}\" is not known; accepted: si, us"),
    }
}

fn available(args: &TrainArgs) -> anyhow::Result<Vec<LoadedWalkthrough>> {
    match &args.dir {
        Some(dir) => {
            load_dir(dir).with_context(|| format!("loading walk-throughs from {}", dir.display()))
        }
        None => library::embedded().context("loading the shipped walk-throughs"),
    }
}

pub fn run(args: &TrainArgs) -> anyhow::Result<()> {
    match run_inner(args) {
        // The reader closed the pipe (e.g. `| head`): not an error of ours.
        Err(error)
            if error
                .downcast_ref::<std::io::Error>()
                .is_some_and(|e| e.kind() == std::io::ErrorKind::BrokenPipe) =>
        {
            Ok(())
        }
        other => other,
    }
}

fn run_inner(args: &TrainArgs) -> anyhow::Result<()> {
    if let Some(dir) = &args.lint {
        let problems = lint_dir(dir).with_context(|| format!("linting {}", dir.display()))?;
        if problems.is_empty() {
            return super::output::write_stdout(&format!(
                "{}: all walk-throughs are fine\n",
                dir.display()
            ));
        }
        for problem in &problems {
            eprintln!("{problem}");
        }
        anyhow::bail!("{} problem(s) in {}", problems.len(), dir.display());
    }
    let unit_system = units(&args.units)?;
    let Some(wanted) = &args.walkthrough else {
        return list(&available(args)?);
    };
    if args.list {
        return list(&available(args)?);
    }
    let as_path = PathBuf::from(wanted);
    let loaded = if as_path.is_file() {
        let walkthrough = rolltriage::training::Walkthrough::load(&as_path)?;
        LoadedWalkthrough {
            walkthrough,
            path: Some(as_path),
        }
    } else {
        let all = available(args)?;
        find(&all, wanted)?.clone()
    };
    let problems = lint_walkthroughs(std::slice::from_ref(&loaded));
    if !problems.is_empty() {
        for problem in &problems {
            eprintln!("{problem}");
        }
        anyhow::bail!(
            "walk-through {} has {} problem(s); fix them first",
            loaded.walkthrough.id,
            problems.len()
        );
    }
    let count = loaded.walkthrough.questions.len();
    // Checked before the story is printed (and before the roll is solved).
    if let Some(answers) = &args.answers
        && answers.len() != count
    {
        anyhow::bail!(
            "--answers gives {} answer(s) but walk-through {} has {count} questions",
            answers.len(),
            loaded.walkthrough.id
        );
    }
    let case = load_case(&loaded)?;
    let rules = RuleBase::embedded().ok();
    let context = TrainingContext::compute(case, rules.as_ref(), unit_system);
    let mut session = Session::new(loaded.walkthrough.clone(), context);
    let seed = args.seed.unwrap_or_else(|| {
        std::time::SystemTime::now()
            .duration_since(std::time::UNIX_EPOCH)
            .map_or(1, |d| d.as_secs() % 1_000_000)
    });
    session.shuffle_choices(seed);
    let mut out = super::output::stdout();
    writeln!(out, "{}", session.briefing())?;
    writeln!(
        out,
        "(Choices shuffled with seed {seed}; `--seed {seed}` gives this order again.)\n"
    )?;
    match &args.answers {
        Some(answers) => {
            for (index, answer) in answers.iter().enumerate() {
                writeln!(out, "{}", session.question_text(index)?)?;
                let choice = answer.checked_sub(1).ok_or_else(|| {
                    anyhow::anyhow!("--answers: answer {} is 0; choices start at 1", index + 1)
                })?;
                writeln!(out, "Your answer: {answer}")?;
                let feedback = session.answer(index, choice)?;
                writeln!(out, "{}", feedback.to_text())?;
            }
        }
        None => {
            let stdin = std::io::stdin();
            let mut lines = stdin.lock().lines();
            'questions: for index in 0..count {
                writeln!(out, "{}", session.question_text(index)?)?;
                let choices = session.walkthrough.questions[index].choices.len();
                loop {
                    write!(out, "Your answer (1-{choices}, q to stop): ")?;
                    out.flush()?;
                    let Some(line) = lines.next() else {
                        writeln!(out)?;
                        break 'questions;
                    };
                    let line = line.context("reading your answer")?;
                    let text = line.trim();
                    if text.eq_ignore_ascii_case("q") || text.eq_ignore_ascii_case("quit") {
                        break 'questions;
                    }
                    match text.parse::<usize>() {
                        Ok(n) if (1..=choices).contains(&n) => {
                            let feedback = session.answer(index, n - 1)?;
                            writeln!(out, "\n{}", feedback.to_text())?;
                            break;
                        }
                        _ => writeln!(out, "Please type a number from 1 to {choices}, or q.")?,
                    }
                }
            }
        }
    }
    write!(out, "{}", session.closing())?;
    out.flush()?;
    Ok(())
}

fn list(walkthroughs: &[LoadedWalkthrough]) -> anyhow::Result<()> {
    use std::fmt::Write as _;
    let mut text = format!(
        "{:<26} {:<13} {:>9}  title\n",
        "walk-through", "level", "questions"
    );
    for loaded in walkthroughs {
        let w = &loaded.walkthrough;
        let _ = writeln!(
            text,
            "{:<26} {:<13} {:>9}  {}",
            w.id,
            w.level.as_deref().unwrap_or("-"),
            w.questions.len(),
            w.title
        );
    }
    text.push_str(
        "\nStart one with: rolltriage train ID   (or --answers 1,2,... to run it scripted)\n",
    );
    super::output::write_stdout(&text)
}
