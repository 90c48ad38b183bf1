//! `rolltriage compare`: what was measured on the roll against what the model computes for it,
//! and the wound-in tension the roll actually got (the inverse estimate). Also the
//! `--measure KEY=VALUE` options shared with `diagnose`, which add measurements to the case on
//! the command line.

use std::path::PathBuf;

use anyhow::{Context, bail};
use rolltriage::case::Case;
use rolltriage::case::QuantityText;
use rolltriage::case::measurements::{
    BendInput, EndLineInput, HardnessInput, LanesInput, MeasurementsInput, ReadingInput, SetInput,
};
use rolltriage::evidence::{self, FitOptions};

#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum)]
pub enum Format {
    #[default]
    Text,
    Json,
}

/// Help text of `--measure`.
pub const MEASURE_HELP: &str = "Add a measurement taken on the roll, KEY=VALUE; repeatable. \
Keys: diameter, length, weight, basis_weight, width, core_bore_reduction (quantities with units, \
e.g. diameter=\"1012 mm\"); hardness=DIAMETER:READING,... (e.g. \"300mm:41,600mm:48\"); \
lanes=READING,READING,... (lane 1 first); end_line=straight|near_core|throughout|band:FROM:TO \
(e.g. band:500mm:600mm); set=BAD/ROLLS (e.g. 2/6).";

#[derive(Debug, clap::Args)]
pub struct CompareArgs {
    /// Case file (YAML) with a `measurements:` section, or add them with --measure.
    pub case: PathBuf,
    #[arg(long = "measure", value_name = "KEY=VALUE", help = MEASURE_HELP)]
    pub measure: Vec<String>,
    /// Skip the inverse estimate of the wound-in tension (several re-solves).
    #[arg(long)]
    pub no_fit: bool,
    /// Fit the wound-in tension only, not the stack stiffness as well.
    #[arg(long)]
    pub tension_only: bool,
    #[arg(long, value_enum, default_value_t = Format::Text)]
    pub format: Format,
    /// Units of the text output: si (mm, kPa, N/m) or us (in, ft, psi, pli). JSON stays SI.
    /// Default: the units the measurements are typed in (SI when they say nothing).
    #[arg(long, value_enum)]
    pub units: Option<super::units_arg::UnitsArg>,
}

/// The units of the evidence text: `--units` when given, else the units most of the case's
/// measurements are typed in ("39.8 in", "35000 ft", "1150 lb" read as US), else SI.
pub fn chosen_units(
    given: Option<super::units_arg::UnitsArg>,
    case: &Case,
) -> rolltriage::units::UnitSystem {
    match given {
        Some(units) => units.system(),
        None => typed_units(case).unwrap_or(rolltriage::units::UnitSystem::Si),
    }
}

/// The units the case's `measurements:` section is typed in; `None` without units there.
pub fn typed_units(case: &Case) -> Option<rolltriage::units::UnitSystem> {
    let value = serde_json::to_value(case.measurements.as_ref()?).ok()?;
    let mut out = Vec::new();
    rolltriage::case::quantity_texts(&value, &mut out);
    rolltriage::units::typed_system(out.iter().map(String::as_str))
}

/// Add `--measure` pairs to the case's measurements (they override the file's values).
pub fn apply_measure_args(case: &mut Case, pairs: &[String]) -> anyhow::Result<()> {
    if pairs.is_empty() {
        return Ok(());
    }
    let m = case
        .measurements
        .get_or_insert_with(MeasurementsInput::default);
    for pair in pairs {
        let Some((key, value)) = pair.split_once('=') else {
            bail!("--measure {pair}: expected KEY=VALUE, e.g. diameter=\"1012 mm\"");
        };
        let (key, value) = (key.trim(), value.trim());
        let text = || Some(QuantityText::Text(value.to_string()));
        match key {
            "diameter" => m.diameter = text(),
            "length" => m.length = text(),
            "weight" => m.weight = text(),
            "basis_weight" => m.basis_weight = text(),
            "width" => m.width = text(),
            "core_bore_reduction" => m.core_bore_reduction = text(),
            "hardness" => {
                let readings = value
                    .split(',')
                    .map(|item| {
                        let (d, r) = item.rsplit_once(':').with_context(|| {
                            format!("--measure hardness: \"{item}\" is not DIAMETER:READING")
                        })?;
                        let reading: f64 = r.trim().parse().with_context(|| {
                            format!("--measure hardness: reading \"{r}\" is not a number")
                        })?;
                        Ok(ReadingInput {
                            diameter: QuantityText::Text(d.trim().to_string()),
                            value: reading,
                        })
                    })
                    .collect::<anyhow::Result<Vec<_>>>()?;
                m.hardness
                    .get_or_insert_with(HardnessInput::default)
                    .readings = readings;
            }
            "lanes" => {
                let readings = value
                    .split(',')
                    .map(|r| {
                        r.trim()
                            .parse::<f64>()
                            .with_context(|| format!("--measure lanes: \"{r}\" is not a number"))
                    })
                    .collect::<anyhow::Result<Vec<_>>>()?;
                m.lanes.get_or_insert_with(LanesInput::default).readings = readings;
            }
            "end_line" => m.end_line = Some(end_line(value)?),
            "set" => {
                let parse = |t: &str| {
                    t.trim().parse::<u32>().with_context(|| {
                        format!("--measure set={value}: expected BAD/ROLLS, e.g. 2/6")
                    })
                };
                let (bad, rolls) = value.split_once('/').with_context(|| {
                    format!("--measure set={value}: expected BAD/ROLLS, e.g. 2/6")
                })?;
                let (bad, rolls) = (parse(bad)?, parse(rolls)?);
                match m.set.as_mut() {
                    Some(s) => {
                        s.bad = bad;
                        s.rolls = rolls;
                    }
                    None => {
                        m.set = Some(SetInput {
                            rolls,
                            bad,
                            bad_positions: Vec::new(),
                            parent_roll: None,
                            position_in_parent: None,
                            parent_rolls: None,
                            bad_parent_rolls: None,
                        })
                    }
                }
            }
            other => {
                let keys = [
                    "diameter",
                    "length",
                    "weight",
                    "basis_weight",
                    "width",
                    "core_bore_reduction",
                    "hardness",
                    "lanes",
                    "end_line",
                    "set",
                ];
                let hint = rolltriage::vocabulary::closest(other, keys.iter().copied())
                    .map(|c| format!(" (did you mean `{c}`?)"))
                    .unwrap_or_default();
                bail!(
                    "--measure: unknown key `{other}`{hint}; accepted: {}",
                    keys.join(", ")
                );
            }
        }
    }
    Ok(())
}

fn end_line(value: &str) -> anyhow::Result<EndLineInput> {
    let mut parts = value.split(':');
    let kind = parts.next().unwrap_or_default().trim();
    let bend = match kind {
        "straight" => BendInput::Straight,
        "near_core" => BendInput::NearCore,
        "throughout" => BendInput::Throughout,
        "band" => BendInput::Band,
        other => bail!(
            "--measure end_line: `{other}` is not one of straight, near_core, throughout, band:FROM:TO"
        ),
    };
    let mut diameter = || {
        parts
            .next()
            .map(|d| QuantityText::Text(d.trim().to_string()))
    };
    let (from_diameter, to_diameter) = (diameter(), diameter());
    Ok(EndLineInput {
        bend,
        from_diameter,
        to_diameter,
        direction: None,
        offset: None,
    })
}

pub fn run(args: &CompareArgs) -> anyhow::Result<()> {
    let (mut case, text) = Case::load_with_text(&args.case)?;
    apply_measure_args(&mut case, &args.measure)?;
    let origin = args.case.display().to_string();
    let resolved = case.resolve_in_file(&origin, &text)?;
    let Some(measurements) = resolved.measurements.clone() else {
        bail!(
            "{origin}: nothing measured; add a `measurements:` section to the case or use --measure KEY=VALUE"
        );
    };
    let problem = resolved.problem(Default::default());
    let context = || format!("comparing the measurements of {origin}");
    let profile = super::progress::with_progress_bar("solving", |progress| {
        rolltriage::model::solve_with_progress(&problem, progress)
    })
    .with_context(context)?;
    let evidence = evidence::compare(&measurements, &problem, &profile).with_context(context)?;
    let estimate = if args.no_fit {
        None
    } else {
        let options = FitOptions {
            stiffness: !args.tension_only,
            ..FitOptions::default()
        };
        Some(
            evidence::estimate(&measurements, &problem, &rolltriage::model::solve, &options)
                .with_context(context)?,
        )
    };
    let text = match args.format {
        Format::Json => {
            serde_json::to_string_pretty(&serde_json::json!({
                "title": resolved.title,
                "measurements": measurements,
                "evidence": evidence,
                "indicators": evidence.indicators(),
                "estimate": estimate,
            }))? + "\n"
        }
        Format::Text => {
            let units = chosen_units(args.units, &case);
            let mut out = format!("{}\n\nMeasured against computed\n", resolved.title);
            for line in evidence.lines_in(units) {
                out.push_str(&format!("  {line}\n"));
            }
            if let Some(e) = &estimate {
                out.push_str("\nWhat the roll says about its winding\n");
                for line in e.lines_in(units) {
                    out.push_str(&format!("  {line}\n"));
                }
            }
            out
        }
    };
    super::output::write_stdout(&text)
}
