//! `rolltriage case`: start a case file from presets, check case files, list the presets.

use std::io::Write;
use std::path::PathBuf;

use anyhow::{Context, bail};
use rolltriage::case::{Case, ResolvedCase, ValueOrigin, starter_yaml};
use rolltriage::diagnose::{self, rules::RuleBase};
use rolltriage::presets::{self, Sourced};
use rolltriage::units::{QuantityKind, format_quantity};

use super::units_arg::UnitsArg;

const EXAMPLES: &str = "\
Examples:
  rolltriage case new --web pet_film --core paper_6in -o cases/my_film.yaml
  rolltriage case check cases/harbour_*.yaml
  rolltriage case check --assumed cases/harbour_newsprint_telescoping.yaml
  rolltriage case presets --units us";

#[derive(Debug, clap::Args)]
#[command(after_help = EXAMPLES)]
pub struct CaseArgs {
    #[command(subcommand)]
    pub what: CaseCommand,
}

#[derive(Debug, clap::Subcommand)]
pub enum CaseCommand {
    /// Write a complete starting case from a web and a core preset (values commented with
    /// their sources).
    New(NewArgs),
    /// Check case files: parse, apply presets, validate every value. Exit 1 if any fails.
    Check(CheckArgs),
    /// List the web and core presets with every value's source.
    Presets(PresetsArgs),
}

#[derive(Debug, clap::Args)]
pub struct NewArgs {
    /// Web preset ID (see `rolltriage case presets`).
    #[arg(long, default_value = "newsprint", value_name = "PRESET")]
    pub web: String,
    /// Core preset ID; by default the usual core for the web's material.
    #[arg(long, value_name = "PRESET")]
    pub core: Option<String>,
    /// Where to write the case; prints to standard output when omitted.
    #[arg(short, long, value_name = "FILE")]
    pub output: Option<PathBuf>,
    /// Replace FILE if it already exists.
    #[arg(long)]
    pub force: bool,
}

#[derive(Debug, clap::Args)]
pub struct CheckArgs {
    /// Case files to check.
    #[arg(required = true, value_name = "FILE")]
    pub files: Vec<PathBuf>,
    /// Also list the values taken from presets or defaults.
    #[arg(long)]
    pub assumed: bool,
    /// Check symptoms and answers against the rule base in DIR instead of the shipped one
    /// (as `diagnose --rules DIR` would read them).
    #[arg(long = "rules", value_name = "DIR")]
    pub rules: Option<PathBuf>,
}

#[derive(Debug, clap::Args)]
pub struct PresetsArgs {
    /// Units to print in.
    #[arg(long, value_enum, default_value_t = UnitsArg::Si)]
    pub units: UnitsArg,
    /// Print the presets as JSON (values in SI) instead of text.
    #[arg(long)]
    pub json: bool,
}

pub fn run(args: &CaseArgs) -> anyhow::Result<()> {
    match &args.what {
        CaseCommand::New(a) => new(a),
        CaseCommand::Check(a) => check(a),
        CaseCommand::Presets(a) => list_presets(a),
    }
}

fn new(args: &NewArgs) -> anyhow::Result<()> {
    let web = presets::web_preset(&args.web).with_context(|| {
        unknown_preset_message("web", &args.web, presets::suggest_web(&args.web))
    })?;
    let core = match &args.core {
        Some(id) => presets::core_preset(id)
            .with_context(|| unknown_preset_message("core", id, presets::suggest_core(id)))?,
        None => presets::default_core_for(None, web.material, None),
    };
    let text = starter_yaml(web, core);
    // The starting case must itself pass the check.
    Case::from_yaml_str(&text, "starting case")
        .and_then(|c| c.resolve_as("starting case"))
        .context("internal error: the starting case does not check")?;
    match &args.output {
        None => super::output::write_stdout(&text)?,
        Some(path) => {
            if path.exists() && !args.force {
                bail!(
                    "{} already exists; use --force to replace it",
                    path.display()
                );
            }
            rolltriage::fsutil::save_atomic(path, text.as_bytes())
                .with_context(|| format!("cannot write {}", path.display()))?;
            eprintln!(
                "wrote {} (web {}, core {}); edit it, then run `rolltriage case check {}`",
                path.display(),
                web.id,
                core.id,
                path.display()
            );
        }
    }
    Ok(())
}

fn unknown_preset_message(what: &str, id: &str, suggestion: Option<&str>) -> String {
    let ids: Vec<&str> = if what == "web" {
        presets::web_presets().iter().map(|p| p.id).collect()
    } else {
        presets::core_presets().iter().map(|p| p.id).collect()
    };
    let hint = suggestion
        .map(|s| format!(" (did you mean `{s}`?)"))
        .unwrap_or_default();
    format!(
        "unknown {what} preset \"{id}\"{hint}; accepted: {}",
        ids.join(", ")
    )
}

/// Resolve a case file and check its symptoms and answers against the rule base: the same
/// checks `stress` and `diagnose` make, so a file that passes here runs there.
fn check_one(path: &std::path::Path, rules: &RuleBase) -> anyhow::Result<ResolvedCase> {
    let resolved = Case::load_resolved(path)?;
    diagnose::observed_symptoms(rules, &resolved)
        .and_then(|_| diagnose::check_answers(rules, &resolved.answers))
        .with_context(|| path.display().to_string())?;
    Ok(resolved)
}

fn check(args: &CheckArgs) -> anyhow::Result<()> {
    let rules = super::diagnose::load_rules(args.rules.as_ref())?;
    let mut out = super::output::stdout();
    let mut failed = 0usize;
    for path in &args.files {
        match check_one(path, &rules) {
            Ok(resolved) => {
                writeln!(
                    out,
                    "ok      {}  ({} symptom(s), {} value(s) assumed{})",
                    path.display(),
                    resolved.symptoms.len(),
                    resolved.assumed.iter().filter(|a| a.is_default()).count(),
                    origin_counts(&resolved.assumed)
                )?;
                // Values given in another form, echoed in the unit the model uses.
                for a in resolved.assumed.iter().filter(|a| a.is_conversion()) {
                    writeln!(out, "          {} = {}  [{}]", a.field, a.value, a.source)?;
                }
                if args.assumed {
                    for a in resolved.assumed.iter().filter(|a| !a.is_conversion()) {
                        let how = match a.origin {
                            ValueOrigin::Default => "",
                            ValueOrigin::Preset => "preset value, unchanged: ",
                            ValueOrigin::Computed => "",
                        };
                        writeln!(
                            out,
                            "          {} = {}  [{how}{}]",
                            a.field, a.value, a.source
                        )?;
                    }
                }
            }
            Err(error) => {
                failed += 1;
                writeln!(out, "FAILED  {}", path.display())?;
                // Flush first so the FAILED line comes before the message on a terminal.
                out.flush()?;
                eprintln!("error: {}", super::output::error_text(&error));
            }
        }
    }
    if failed > 0 {
        bail!(
            "{failed} of {} case file(s) failed the check",
            args.files.len()
        );
    }
    Ok(())
}

fn list_presets(args: &PresetsArgs) -> anyhow::Result<()> {
    use QuantityKind as Q;
    let mut out = super::output::stdout();
    if args.json {
        let all = serde_json::json!({
            "units": "SI (m, Pa, N/m)",
            "webs": presets::web_presets(),
            "cores": presets::core_presets(),
        });
        writeln!(out, "{}", serde_json::to_string_pretty(&all)?)?;
        return Ok(());
    }
    let system = args.units.system();
    let show = |out: &mut super::output::Stdout,
                label: &str,
                value: Sourced,
                kind: Option<QuantityKind>|
     -> std::io::Result<()> {
        let text = match kind {
            Some(kind) => format_quantity(value.value, kind, system),
            None => format!("{}", value.value),
        };
        writeln!(out, "    {label:<20} {text:<14} {}", value.source)
    };
    writeln!(
        out,
        "Web presets (generic grades; approximate — calibrate before trusting):"
    )?;
    for p in presets::web_presets() {
        writeln!(out, "\n  {}  — {} [{}]", p.id, p.name, p.material)?;
        let rows = [
            ("thickness", p.thickness, Some(Q::Length)),
            ("tangential modulus", p.tangential_modulus, Some(Q::Stress)),
            ("Pfeiffer K1", p.k1, Some(Q::Stress)),
            ("Pfeiffer K2", p.k2, None),
            ("Poisson ratio", p.poisson_ratio, None),
            ("static friction", p.friction, None),
            ("kinetic friction", p.kinetic_friction, None),
            ("density (kg/m³)", p.density, None),
            ("roughness (RMS)", p.roughness, Some(Q::Length)),
            ("strength", p.strength, Some(Q::ForcePerWidth)),
            ("typical tension", p.typical_tension, Some(Q::ForcePerWidth)),
        ];
        for (label, value, kind) in rows {
            show(&mut out, label, value, kind)?;
        }
    }
    writeln!(out, "\nCore presets:")?;
    for p in presets::core_presets() {
        writeln!(out, "\n  {}  — {} [{}]", p.id, p.name, p.material)?;
        let rows = [
            ("inside diameter", p.inside_diameter, Some(Q::Length)),
            ("outside diameter", p.outside_diameter, Some(Q::Length)),
            ("hoop modulus", p.modulus, Some(Q::Stress)),
            ("radial modulus", p.radial_modulus, Some(Q::Stress)),
            ("Poisson ratio", p.poisson_ratio, None),
            (
                "compressive strength",
                p.compressive_strength,
                Some(Q::Stress),
            ),
            ("crush pressure", p.crush_pressure, Some(Q::Stress)),
        ];
        for (label, value, kind) in rows {
            show(&mut out, label, value, kind)?;
        }
    }
    writeln!(
        out,
        "\nA core with `material: rigid` is infinitely stiff; `stiffness:` gives a measured Ec."
    )?;
    Ok(())
}

/// ", 14 preset value(s) unchanged, 1 computed" for the values the file gives as its preset's
/// or that were computed from others (empty when there are none).
fn origin_counts(assumed: &[rolltriage::case::AssumedValue]) -> String {
    let presets = assumed
        .iter()
        .filter(|a| a.origin == ValueOrigin::Preset)
        .count();
    let computed = assumed
        .iter()
        .filter(|a| a.origin == ValueOrigin::Computed)
        .count();
    let mut out = String::new();
    if presets > 0 {
        out.push_str(&format!(", {presets} preset value(s) unchanged"));
    }
    if computed > 0 {
        out.push_str(&format!(", {computed} computed"));
    }
    out
}
