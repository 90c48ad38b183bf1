//! `rolltriage report`: write a complaint report for a case (Markdown, HTML with plots, JSON).

use std::path::PathBuf;

use anyhow::Context;

use rolltriage::diagnose::rules::RuleBase;
use rolltriage::report::{Format, PrepareOptions, prepare_from_path, render};
use rolltriage::units::UnitSystem;

#[derive(Debug, clap::Args)]
#[command(after_help = "Examples:
  rolltriage report cases/harbour_newsprint_telescoping.yaml -o complaint.html
  rolltriage report cases/harbour_coated_crushed_core.yaml -o r.md --remedy add_taper
  rolltriage report CASE.yaml -o - --format json      (JSON to standard output)")]
pub struct ReportArgs {
    /// The case file to report on.
    pub case: PathBuf,
    /// Output file; its extension (.md, .html, .json) sets the format unless --format is given.
    /// `-` writes to standard output.
    #[arg(short, long)]
    pub output: PathBuf,
    /// markdown, html or json.
    #[arg(long, value_parser = super::arg_check::report_format)]
    pub format: Option<String>,
    /// Apply this remedy (by ID), re-solve and show before/after.
    #[arg(long)]
    pub remedy: Option<String>,
    /// Date printed in the report (YYYY-MM-DD); today (UTC) by default.
    #[arg(long, value_parser = super::arg_check::date)]
    pub date: Option<String>,
    /// Print quantities in SI or US trade units: si or us. Default: the units the case's
    /// measurements are typed in (SI when there are none).
    #[arg(long, value_parser = super::arg_check::unit_system)]
    pub units: Option<String>,
    /// Skip the predicted effect (what-if re-solve) of each remedy in the list.
    #[arg(long)]
    pub no_what_if: bool,
    /// Rule directory to use instead of the shipped rule base.
    #[arg(long)]
    pub rules: Option<PathBuf>,
    /// Add the similar past complaints from this history store (a SQLite file, a
    /// `postgres://` URL, or `default` for $ROLLTRIAGE_HISTORY or the per-user store).
    #[arg(long = "history", value_name = "PATH|URL")]
    pub history: Option<String>,
}

fn parse_units(text: &str) -> anyhow::Result<UnitSystem> {
    match text.to_ascii_lowercase().as_str() {
        "si" | "metric" => Ok(UnitSystem::Si),
        "us" | "imperial" => Ok(UnitSystem::Us),
        other => anyhow::bail!("--units: \"{other}\" is not known; accepted: si, us"),
    }
}

/// The past complaints of the store at `place` most like the report's case (the store must
/// exist: a report never creates one).
fn similar_past(
    place: &str,
    rules: &RuleBase,
    input: &rolltriage::report::ReportInput,
) -> anyhow::Result<Vec<rolltriage::history::PastComplaint>> {
    use rolltriage::history;
    let store = super::history::StoreArgs {
        history: Some(place.to_string()),
        wait: history::DEFAULT_WAIT.as_secs_f64(),
    };
    let mut store = store.open_existing()?;
    let entry = history::Entry {
        case_text: String::new(),
        case: input.case.clone(),
        resolved: input.resolved.clone(),
        diagnosis: input.diagnosis.clone(),
        rules_version: history::rules_version(rules),
    };
    Ok(history::similar_past(&mut store, rules, &entry, 3, None)?)
}

pub fn run(args: &ReportArgs) -> anyhow::Result<()> {
    let to_stdout = args.output.as_os_str() == "-";
    let format = match &args.format {
        Some(text) => text.parse::<Format>()?,
        None if to_stdout => Format::Markdown,
        None => Format::from_path(&args.output).with_context(|| {
            format!(
                "cannot tell the report format from \"{}\"; use an extension .md, .html or .json, or --format markdown|html|json",
                args.output.display()
            )
        })?,
    };
    let options = PrepareOptions {
        remedy: args.remedy.clone(),
        date: args.date.clone(),
        source_file: Some(args.case.display().to_string()),
        units: match &args.units {
            Some(text) => parse_units(text)?,
            // A case that does not load is reported by `prepare_from_path` below.
            None => rolltriage::case::Case::load(&args.case)
                .ok()
                .and_then(|case| super::measure::typed_units(&case))
                .unwrap_or(UnitSystem::Si),
        },
        what_if: !args.no_what_if,
        ..PrepareOptions::default()
    };
    // Quantities in the rule texts follow the report's units; JSON keeps SI.
    let rule_units = match format {
        Format::Json => UnitSystem::Si,
        _ => options.units,
    };
    let rules = super::diagnose::load_rules_in(args.rules.as_ref(), rule_units)?;
    let mut input = prepare_from_path(&args.case, &rules, &options)
        .with_context(|| format!("preparing the report for {}", args.case.display()))?;
    if let Some(place) = &args.history {
        input.similar_past = Some(similar_past(place, &rules, &input)?);
    }
    let case = args.case.display();
    rolltriage::finite::ensure_finite(&format!("the stress profile of {case}"), &input.profile)?;
    rolltriage::finite::ensure_finite(&format!("the diagnosis of {case}"), &input.diagnosis)?;
    if let Some(sensitivity) = &input.sensitivity {
        let what = format!("the sensitivity to the assumed inputs of {case}");
        rolltriage::finite::ensure_finite(&what, sensitivity)?;
    }
    if let Some(remedy) = &input.remedy {
        let what = format!("the re-solved roll of {case} with {}", remedy.remedy_id);
        rolltriage::finite::ensure_finite(&what, &remedy.after)?;
    }
    let text = render(&input, format).context("rendering the report")?;
    if to_stdout {
        super::output::write_stdout(&text)?;
    } else {
        rolltriage::fsutil::save_atomic(&args.output, text.as_bytes())
            .with_context(|| format!("saving the report to {}", args.output.display()))?;
        eprintln!(
            "wrote {} report to {}",
            format.as_str(),
            args.output.display()
        );
    }
    Ok(())
}
