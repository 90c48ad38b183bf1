//! `rolltriage rules`: lint a rule directory, list symptoms and their questions.

use std::path::PathBuf;

use anyhow::bail;

use std::fmt::Write as _;

use super::diagnose::load_rules;
use super::output::write_stdout;

#[derive(Debug, clap::Args)]
pub struct RulesArgs {
    #[command(subcommand)]
    pub command: RulesCommand,
}

#[derive(Debug, clap::Subcommand)]
pub enum RulesCommand {
    /// Check a rule directory (default: the shipped rules) for errors and coverage gaps.
    Check {
        /// Rule directory; omit to check the rules built into the binary.
        dir: Option<PathBuf>,
    },
    /// List symptoms with their questions and accepted answers.
    Questions {
        /// Rule directory; omit for the shipped rules.
        #[arg(long = "rules", value_name = "DIR")]
        rules: Option<PathBuf>,
    },
}

pub fn run(args: &RulesArgs) -> anyhow::Result<()> {
    match &args.command {
        RulesCommand::Check { dir } => {
            let base = load_rules(dir.as_ref())?;
            let warnings = base.lint();
            let where_ = dir
                .as_ref()
                .map(|d| d.display().to_string())
                .unwrap_or_else(|| "shipped rules".into());
            for w in &warnings {
                eprintln!("warning: {where_}: {w}");
            }
            let rules: usize = base.symptoms.iter().map(|s| s.rules.len()).sum();
            let evidence: usize = base
                .symptoms
                .iter()
                .flat_map(|s| s.rules.iter())
                .map(|r| r.evidence.len())
                .sum();
            let questions: usize = base.symptoms.iter().map(|s| s.questions.len()).sum();
            write_stdout(&format!(
                "{where_}: {} symptoms, {} causes, {rules} symptom-cause rules, {evidence} evidence tests, {questions} questions, {} remedies, {} cautions\n",
                base.symptoms.len(),
                base.causes.len(),
                base.remedies.len(),
                base.cautions.len()
            ))?;
            if !warnings.is_empty() {
                bail!("{} coverage problems in {where_}", warnings.len());
            }
            Ok(())
        }
        RulesCommand::Questions { rules } => {
            let base = load_rules(rules.as_ref())?;
            let mut text = String::new();
            for s in &base.symptoms {
                let _ = writeln!(text, "{} — {}", s.id, s.title);
                for q in &s.questions {
                    let answers: Vec<&str> = q.accepted();
                    let _ = writeln!(text, "  {}: {} [{}]", q.id, q.text, answers.join(" | "));
                }
            }
            write_stdout(&text)
        }
    }
}
