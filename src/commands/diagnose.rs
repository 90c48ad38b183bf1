//! `rolltriage diagnose`: ranked causes with reasons, the merged remedy list and cautions.

use std::path::PathBuf;

use anyhow::{Context, bail};
use rolltriage::case::{Case, ObservedSymptom};
use rolltriage::diagnose::{self, DiagnoseOptions, rules::RuleBase};
use rolltriage::units::UnitSystem;

#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum)]
pub enum Format {
    #[default]
    Text,
    Json,
    Markdown,
}

#[derive(Debug, clap::Args)]
pub struct DiagnoseArgs {
    /// Case file (YAML).
    pub case: PathBuf,
    /// Output format.
    #[arg(long, value_enum, default_value_t = Format::Text)]
    pub format: Format,
    /// Show at most N causes (0 = all with positive belief).
    #[arg(long, value_name = "N", default_value_t = 5)]
    pub top: usize,
    /// Add an observed symptom (ID or a word people use, e.g. "coning"); repeatable.
    #[arg(long = "symptom", value_name = "ID")]
    pub symptoms: Vec<String>,
    /// Answer a symptom question, e.g. `starring.after_splice=yes`; repeatable.
    #[arg(long = "answer", value_name = "QUESTION=VALUE", value_parser = super::arg_check::answer)]
    pub answers: Vec<String>,
    /// Use the rule base in DIR instead of the shipped one.
    #[arg(long = "rules", value_name = "DIR")]
    pub rules: Option<PathBuf>,
    /// Skip the what-if re-solves of setting changes.
    #[arg(long)]
    pub no_what_if: bool,
    /// Also print the IDs of causes, remedies and cautions (as the rule files and JSON use them).
    #[arg(long, short = 'v')]
    pub verbose: bool,
    /// Complaint history to learn from (SQLite file, postgres:// URL, or `default`): site
    /// experience joins the ranking as its own reason and similar past complaints are listed.
    #[arg(long = "history", value_name = "PATH|URL")]
    pub history: Option<String>,
    /// With --history: list similar past complaints but leave site experience out of the ranking.
    #[arg(long, requires = "history")]
    pub no_site_history: bool,
    #[arg(long = "measure", value_name = "KEY=VALUE", help = super::measure::MEASURE_HELP)]
    pub measure: Vec<String>,
    /// Units of the measured-evidence lines and reasons in the text output: si or us (in, ft,
    /// psi). Default: the units the measurements are typed in (SI when they say nothing).
    #[arg(long, value_enum)]
    pub units: Option<super::units_arg::UnitsArg>,
}

/// The rule base: `--rules DIR` or the shipped one, quantities in SI.
pub fn load_rules(dir: Option<&PathBuf>) -> anyhow::Result<RuleBase> {
    load_rules_in(dir, UnitSystem::Si)
}

/// [`load_rules`] with the quantities in the rule texts (`{50 kPa}`) in `units`. The outputs
/// take symptom titles and question words from the rule base loaded last (`words::use_rules`),
/// so a symptom only in `--rules DIR` reads in that folder's words.
pub fn load_rules_in(dir: Option<&PathBuf>, units: UnitSystem) -> anyhow::Result<RuleBase> {
    let rules = match dir {
        Some(d) => RuleBase::load_dir_in(d, units)
            .with_context(|| format!("loading rules from {}", d.display()))?,
        None => RuleBase::embedded_in(units).context("loading the shipped rule base")?,
    };
    diagnose::words::use_rules(&rules);
    Ok(rules)
}

pub fn run(args: &DiagnoseArgs) -> anyhow::Result<()> {
    let rules = load_rules(args.rules.as_ref())?;
    // The errors name the file (and the field's line) themselves.
    let (mut case, text) = Case::load_with_text(&args.case)?;
    super::measure::apply_measure_args(&mut case, &args.measure)?;
    let units = super::measure::chosen_units(args.units, &case);
    // Quantities in the rule texts follow the units of the text output; JSON and Markdown
    // keep SI like the rest of their values.
    let rules = if args.format == Format::Text && units != UnitSystem::Si {
        load_rules_in(args.rules.as_ref(), units)?
    } else {
        rules
    };
    let mut resolved = case.resolve_in_file(&args.case.display().to_string(), &text)?;
    for word in &args.symptoms {
        let id = diagnose::resolve_symptom(&rules, word)
            .map_err(|m| anyhow::anyhow!("--symptom: {m}"))?;
        if !resolved.symptoms.iter().any(|s| s.id == id) {
            resolved.symptoms.push(ObservedSymptom {
                id,
                place: None,
                notes: None,
            });
        }
    }
    for pair in &args.answers {
        let Some((question, value)) = pair.split_once('=') else {
            bail!("--answer {pair}: expected QUESTION=VALUE, e.g. starring.after_splice=yes");
        };
        resolved
            .answers
            .insert(question.trim().to_string(), value.trim().to_string());
    }
    if resolved.symptoms.is_empty() {
        bail!(
            "{}: no symptoms observed; add `symptoms:` to the case or use --symptom ID",
            args.case.display()
        );
    }
    let options = DiagnoseOptions {
        // With a history, all causes are ranked first: site experience may lift one into the top.
        top: if args.history.is_some() { 0 } else { args.top },
        what_if: !args.no_what_if,
        ..DiagnoseOptions::default()
    };
    let context = || format!("diagnosing {}", args.case.display());
    // The cheap checks first, so a mistyped symptom or answer fails before the solve.
    diagnose::check_inputs(&rules, &resolved).with_context(context)?;
    let triage = super::progress::with_progress_bar("diagnosing", |progress| {
        diagnose::pipeline::triage(&rules, (&resolved).into(), &options, progress)
    })
    .with_context(context)?;
    // A non-finite pressure would silently drop its evidence from the ranking.
    let what = format!("the stress profile of {}", args.case.display());
    rolltriage::finite::ensure_finite(&what, &triage.profile)?;
    let mut diagnosis = triage.diagnosis.with_context(context)?;
    // Which assumed inputs the answer rests on, judged on the rule base's own ranking (before
    // site history reorders it).
    let sensitivity = diagnose::sensitivity::sensitivity(
        &rules,
        &triage.resolved,
        &triage.profile,
        &diagnosis,
        options.solver,
        &mut |_| true,
    )
    .with_context(context)?;
    let what = format!(
        "the sensitivity to the assumed inputs of {}",
        args.case.display()
    );
    rolltriage::finite::ensure_finite(&what, &sensitivity)?;
    let mut past = String::new();
    if let Some(place) = &args.history {
        let site = super::history::SiteView::new(place, !args.no_site_history, args.top);
        (diagnosis, past) = site.apply(&rules, &case, &resolved, diagnosis)?;
    }
    let what = format!("the diagnosis of {}", args.case.display());
    rolltriage::finite::ensure_finite(&what, &diagnosis)?;
    let text = match args.format {
        Format::Text => {
            diagnose::render::render_text_in(&resolved.title, &diagnosis, args.verbose, units)
                + &diagnose::render::sensitivity_text(&sensitivity)
                + &past
        }
        Format::Markdown => {
            diagnose::render::render_markdown(&resolved.title, &diagnosis)
                + &diagnose::render::sensitivity_markdown(&sensitivity)
                + &past
        }
        Format::Json => {
            // The diagnosis as before, with the sensitivity appended when anything was assumed.
            #[derive(serde::Serialize)]
            struct Output<'a> {
                #[serde(flatten)]
                diagnosis: &'a diagnose::Diagnosis,
                #[serde(skip_serializing_if = "Option::is_none")]
                sensitivity: Option<&'a diagnose::sensitivity::Sensitivity>,
            }
            let output = Output {
                diagnosis: &diagnosis,
                sensitivity: (!sensitivity.is_empty()).then_some(&sensitivity),
            };
            serde_json::to_string_pretty(&output)? + "\n"
        }
    };
    super::output::write_stdout(&text)
}
