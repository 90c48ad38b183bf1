//! `rolltriage stress`: compute the stress state inside the wound roll of a case file and print
//! its summary (table) or its full profile (JSON, CSV).

use std::path::PathBuf;

use anyhow::{Context, bail};
use rolltriage::case::Case;
use rolltriage::diagnose::pipeline::{self, Solved};
use rolltriage::model::{
    self, ModulusUpdate, Profile, Resolution, SolverOptions, ZoneName, profile::zone_cuts,
};
use rolltriage::units::{
    self, METRES_PER_INCH, NEWTONS_PER_METRE_PER_PLI, PASCALS_PER_PSI, QuantityKind, UnitSystem,
};

#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum)]
pub enum Format {
    /// Summary figures and zone statistics with units.
    #[default]
    Table,
    /// The full profile and summary (SI units, field names say the unit).
    Json,
    /// One row per node, units in the header.
    Csv,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum)]
pub enum Units {
    /// SI (m, mm, kPa, N/m).
    #[default]
    Si,
    /// US trade units (in, psi, pli).
    Us,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum)]
pub enum ModulusChoice {
    /// Radial modulus at the pressure before each increment (Hakiel's original scheme).
    Explicit,
    /// Tangent modulus at the mid-increment pressure, iterated to convergence.
    Iterated,
    /// Secant modulus over each increment, iterated to convergence (exact for the law).
    #[default]
    Secant,
}

#[derive(Debug, clap::Args)]
pub struct StressArgs {
    /// Case file (YAML).
    pub case: PathBuf,
    /// Output format.
    #[arg(long, value_enum, default_value_t = Format::Table)]
    pub format: Format,
    /// Units for the table and CSV output.
    #[arg(long, value_enum, default_value_t = Units::Si)]
    pub units: Units,
    /// Write the output to FILE (saved atomically) instead of standard output.
    #[arg(long, value_name = "FILE")]
    pub out: Option<PathBuf>,
    /// auto, per-layer, or grouped:K (K wraps per element).
    #[arg(long, value_name = "MODE", default_value = "auto", value_parser = super::arg_check::resolution)]
    pub resolution: String,
    /// How the radial modulus is taken over each increment.
    #[arg(long, value_enum, default_value_t = ModulusChoice::Secant)]
    pub modulus: ModulusChoice,
    /// For CSV/JSON: at most N nodes (evenly spaced plus key points); 0 = every node.
    #[arg(long, value_name = "N", default_value_t = 0)]
    pub max_points: usize,
}

/// Per-layer solves cost about wraps² × this many seconds on one core of a current machine
/// (measured: 150,000 wraps took 194 s; 5,900 wraps 0.1 s). Used for the expected time.
const PER_LAYER_SECONDS_PER_WRAP_SQUARED: f64 = 8e-9;

/// Above this many wraps `--resolution per-layer` warns with the expected time (about 7 s).
pub const PER_LAYER_WARN_WRAPS: usize = 30_000;

/// Above this many wraps `--resolution per-layer` is refused (it would take over 10 minutes);
/// grouped resolution gives the same profile to plotting accuracy.
pub const PER_LAYER_MAX_WRAPS: usize = 300_000;

fn minutes_text(seconds: f64) -> String {
    if seconds < 90.0 {
        format!("{seconds:.0} s")
    } else if seconds < 5400.0 {
        format!("{:.0} min", seconds / 60.0)
    } else {
        format!("{:.1} h", seconds / 3600.0)
    }
}

/// Refuse per-layer resolution on rolls too large for it, warn on large ones.
fn check_per_layer_size(
    problem: &model::WindingProblem,
    case: &std::path::Path,
) -> anyhow::Result<()> {
    let wraps = ((problem.outer_radius - problem.core_radius) / problem.thickness).round();
    if !wraps.is_finite() || wraps < PER_LAYER_WARN_WRAPS as f64 {
        return Ok(());
    }
    let expected = minutes_text(wraps * wraps * PER_LAYER_SECONDS_PER_WRAP_SQUARED);
    let group = (wraps / PER_LAYER_WARN_WRAPS as f64).ceil() as usize;
    if wraps > PER_LAYER_MAX_WRAPS as f64 {
        bail!(
            "{}: --resolution per-layer on {wraps:.0} wraps would take about {expected}; the limit is {PER_LAYER_MAX_WRAPS} wraps. Use --resolution auto or grouped:{group}",
            case.display()
        );
    }
    eprintln!(
        "warning: --resolution per-layer on {wraps:.0} wraps takes about {expected} (grows as the square of the wraps); --resolution grouped:{group} is much faster"
    );
    Ok(())
}

/// Parse `--resolution`.
pub fn parse_resolution(text: &str) -> anyhow::Result<Resolution> {
    let t = text.trim().to_ascii_lowercase();
    match t.as_str() {
        "auto" => Ok(Resolution::Auto),
        "per-layer" | "per_layer" | "layer" => Ok(Resolution::PerLayer),
        _ => {
            if let Some(k) = t
                .strip_prefix("grouped:")
                .or_else(|| t.strip_prefix("grouped="))
                && let Ok(layers) = k.trim().parse::<usize>()
                && layers >= 1
            {
                return Ok(Resolution::Grouped { layers });
            }
            bail!(
                "--resolution {text}: accepted: auto, per-layer, grouped:K with K ≥ 1 wraps per \
                 element"
            )
        }
    }
}

pub fn run(args: &StressArgs) -> anyhow::Result<()> {
    let resolution = parse_resolution(&args.resolution)?;
    // The errors name the file (and the field's line) themselves.
    let (case, text) = Case::load_with_text(&args.case)?;
    let resolved = case.resolve_in_file(&args.case.display().to_string(), &text)?;
    let options = SolverOptions {
        resolution,
        modulus_update: match args.modulus {
            ModulusChoice::Explicit => ModulusUpdate::Explicit,
            ModulusChoice::Iterated => ModulusUpdate::Iterated,
            ModulusChoice::Secant => ModulusUpdate::Secant,
        },
    };
    if resolution == Resolution::PerLayer {
        check_per_layer_size(&resolved.problem(options), &args.case)?;
    }
    let Solved { resolved, profile } = super::progress::with_progress_bar("solving", |progress| {
        pipeline::solve_case((&resolved).into(), options, progress)
    })
    .with_context(|| format!("solving the roll of {}", args.case.display()))?;
    let problem = resolved.problem(options);
    rolltriage::finite::ensure_finite(
        &format!("the stress profile of {}", args.case.display()),
        &profile,
    )?;
    let system = match args.units {
        Units::Si => UnitSystem::Si,
        Units::Us => UnitSystem::Us,
    };
    let shown = if args.max_points > 0 {
        profile.downsampled(args.max_points)
    } else {
        profile.clone()
    };
    let text = match args.format {
        Format::Table => {
            let mechanics = rolltriage::mechanics::MechanicsInputs::from_case(&resolved);
            let mut t = summary_table(&resolved, &problem, &profile, &mechanics, system);
            let (converted, assumed): (Vec<_>, Vec<_>) =
                resolved.assumed.iter().partition(|a| a.is_conversion());
            if !converted.is_empty() {
                t.push_str("\nConverted (as given in the case file):\n");
                for a in &converted {
                    t.push_str(&format!("  {} = {}  ({})\n", a.field, a.value, a.source));
                }
            }
            if !assumed.is_empty() {
                t.push_str("\nAssumed (not in the case file):\n");
                for a in &assumed {
                    t.push_str(&format!("  {} = {}  ({})\n", a.field, a.value, a.source));
                }
            }
            t
        }
        Format::Json => {
            let value = serde_json::json!({
                "title": resolved.title,
                "units": "SI: radius m, pressure Pa, tangential_stress Pa, wound_in_tension N/m, roll_mass kg",
                "roll_mass": resolved.roll_mass(),
                "profile": shown,
            });
            serde_json::to_string_pretty(&value)? + "\n"
        }
        Format::Csv => profile_csv(&shown, system)?,
    };
    match &args.out {
        Some(path) => rolltriage::fsutil::save_atomic(path, text.as_bytes())
            .with_context(|| format!("saving {}", path.display()))?,
        None => super::output::write_stdout(&text)?,
    }
    Ok(())
}

fn stress(value: f64, system: UnitSystem) -> String {
    units::format_quantity(value, QuantityKind::Stress, system)
}

fn length(value: f64, system: UnitSystem) -> String {
    units::format_quantity(value, QuantityKind::Length, system)
}

fn diameter_at(value: f64, system: UnitSystem) -> String {
    format!("⌀ {}", length(2.0 * value, system))
}

/// "⌀ 310 mm" or, for a band, "⌀ 310 mm–340 mm".
fn diameter_band(band: (f64, f64), system: UnitSystem) -> String {
    if band.1 > band.0 {
        format!(
            "{}–{}",
            diameter_at(band.0, system),
            length(2.0 * band.1, system)
        )
    } else {
        diameter_at(band.0, system)
    }
}

/// The summary table printed by default: the figures, the failure mechanisms' margins, the
/// solver's and the air film's rows, the zones, the warnings.
pub fn summary_table(
    resolved: &rolltriage::case::ResolvedCase,
    problem: &model::WindingProblem,
    profile: &Profile,
    mechanics: &rolltriage::mechanics::MechanicsInputs,
    system: UnitSystem,
) -> String {
    let mut t = String::new();
    t.push_str(&format!("Wound-roll stresses: {}\n\n", resolved.title));
    let mut rows = figure_rows(problem, profile, system);
    // The weight handling lifts and telescoping under handling loads, after the build.
    rows.insert(
        2,
        (
            "Roll weight (web, core left out)",
            units::format_quantity(resolved.roll_mass(), QuantityKind::Mass, system),
        ),
    );
    rows.extend(mechanism_rows(profile, mechanics, system));
    rows.extend(solver_and_air_rows(profile, system));
    let width = rows
        .iter()
        .map(|(k, _)| k.chars().count())
        .max()
        .unwrap_or(0);
    for (k, v) in rows {
        t.push_str(&format!("  {k:<width$}  {v}\n"));
    }
    t.push_str(&zone_table(profile, system));
    if !profile.warnings.is_empty() {
        t.push_str("\nWarnings:\n");
        for w in &profile.warnings {
            t.push_str(&format!("  - {w}\n"));
        }
    }
    t
}

/// The summary figures: wraps and grid, build, core and peak pressure, hoop compression, core
/// strain, the compressive low-pressure band, the soft outer share.
fn figure_rows(
    problem: &model::WindingProblem,
    profile: &Profile,
    system: UnitSystem,
) -> Vec<(&'static str, String)> {
    let s = &profile.summary;
    let grid = &profile.solver.grid;
    let resolution = if grid.is_per_layer() {
        "per layer".to_string()
    } else {
        format!("grouped, {} wraps per element", grid.layers_per_element)
    };
    vec![
        (
            "Wraps",
            format!(
                "{} ({resolution}, {} nodes)",
                s.physical_layers,
                profile.radius.len()
            ),
        ),
        (
            "Build",
            format!(
                "{} to {}",
                diameter_at(problem.core_radius, system),
                diameter_at(problem.outer_radius, system)
            ),
        ),
        ("Pressure on the core", stress(s.core_pressure, system)),
        (
            "Peak pressure",
            format!(
                "{} at {}",
                stress(s.peak_pressure, system),
                diameter_at(s.peak_pressure_radius, system)
            ),
        ),
        (
            "Most compressive tangential stress",
            format!(
                "{} at {}",
                stress(s.min_tangential_stress, system),
                diameter_at(s.min_tangential_radius, system)
            ),
        ),
        (
            "Radial strain at the core",
            format!("{:.2} %", 100.0 * s.core_radial_strain),
        ),
        (
            "Compressive, low-pressure band",
            match s.compressive_low_pressure_band {
                Some(b) => format!(
                    "{:.1} % of the build ({:.0} wraps) from {} to {}",
                    100.0 * b.fraction_of_build,
                    b.wraps,
                    diameter_at(b.inner_radius, system),
                    diameter_at(b.outer_radius, system)
                ),
                None => "none".into(),
            },
        ),
        (
            "Outer zones below 25 % of peak pressure",
            format!("{:.0} %", 100.0 * s.outer_low_pressure_share),
        ),
    ]
}

/// The grid check (core pressure change with the elements halved) and the entrained air film,
/// when the solve has them.
fn solver_and_air_rows(profile: &Profile, system: UnitSystem) -> Vec<(&'static str, String)> {
    let mut rows = Vec::new();
    if let Some(change) = profile.solver.group_halving_change {
        rows.push((
            "Core pressure change, elements halved",
            format!("{:.2} % (check: below 1 %)", 100.0 * change),
        ));
    }
    if let Some((start, end)) = profile.air_film {
        rows.push((
            "Entrained air film (Knox & Sweeney)",
            format!(
                "{} at the core, {} at the outside ({:.2} / {:.2} × roughness, {:.0} % of the \
                 friction left at the outside){}",
                length(start.thickness, system),
                length(end.thickness, system),
                start.ratio_to_roughness,
                end.ratio_to_roughness,
                100.0 * end.traction,
                if end.reduced_by_nip {
                    ", reduced by the nip"
                } else {
                    ""
                }
            ),
        ));
    }
    rows
}

/// The zone statistics: diameters, pressure range and mean, most compressive hoop stress.
fn zone_table(profile: &Profile, system: UnitSystem) -> String {
    let mut t = String::new();
    t.push_str(&format!(
        "\nZones (build fractions: core < {:.0} %, inner < {:.0} %, middle < {:.0} %, outer, \
         surface = outermost tensile wraps)\n",
        100.0 * zone_cuts::CORE_END,
        100.0 * zone_cuts::INNER_END,
        100.0 * zone_cuts::MIDDLE_END
    ));
    t.push_str(&format!(
        "  {:<8} {:>24}  {:>14} {:>14} {:>14}  {:>14}\n",
        "zone", "diameters", "min pressure", "mean pressure", "max pressure", "min σθ"
    ));
    for name in ZoneName::ALL {
        let (Some(z), Some(p)) = (profile.zone(name), profile.zone_pressure(name)) else {
            continue;
        };
        let min_t = profile
            .zone_tangential_stress(name)
            .map(|x| stress(x.min, system))
            .unwrap_or_default();
        let span = format!(
            "{}–{}",
            units::format_quantity(2.0 * z.inner_radius, QuantityKind::Length, system),
            units::format_quantity(2.0 * z.outer_radius, QuantityKind::Length, system)
        );
        t.push_str(&format!(
            "  {:<8} {:>24}  {:>14} {:>14} {:>14}  {:>14}\n",
            name.as_str(),
            span,
            stress(p.min, system),
            stress(p.mean, system),
            stress(p.max, system),
            min_t
        ));
    }
    t
}

/// The failure mechanisms' smallest margins and where (docs/theory.md §5), the same functions
/// the diagnosis and taper design read.
fn mechanism_rows(
    profile: &Profile,
    inputs: &rolltriage::mechanics::MechanicsInputs,
    system: UnitSystem,
) -> Vec<(&'static str, String)> {
    use rolltriage::mechanics::{starring, telescoping, torque};
    let telescoping = telescoping::handling_margins(profile, inputs);
    let torque = torque::torque_check(profile, inputs);
    let starring = starring::buckling_margins(profile, inputs);
    let mut rows = vec![
        (
            "Starring margin (wrap buckling)",
            // The margin is capped: a capped value with some compression is "far above 1",
            // not "no compression" (newsprint: −24 kPa against a buckling stress of ~75 MPa).
            if !starring.has_demand {
                "no hoop compression: starring cannot start".to_string()
            } else if starring.min_margin >= rolltriage::mechanics::MARGIN_CAP {
                format!(
                    "over {:.0} (hoop compression far below the buckling stress on the stack)",
                    rolltriage::mechanics::MARGIN_CAP
                )
            } else {
                format!(
                    "{:.2} at {} (buckling stress on the stack / hoop compression; below 1 = wraps buckle)",
                    starring.min_margin,
                    diameter_band(starring.band, system),
                )
            },
        ),
        (
            "Telescoping margin (lifted by its core)",
            format!(
                "{:.2} at {} (friction / handling shear, shock factor {}; below 1 = layers slide)",
                telescoping.min_margin,
                diameter_at(telescoping.min_radius, system),
                inputs.events.shock_factor
            ),
        ),
        (
            "Slip margin (start, stops, unwind)",
            format!(
                "{:.2} at {} in the {} (below 1 = layers slip)",
                torque.min_margin,
                diameter_at(torque.min_radius, system),
                torque.worst_event.title()
            ),
        ),
        (
            "Core slip margin",
            format!(
                "{:.2} in the {}",
                torque.core_margin,
                torque.core_event.title()
            ),
        ),
    ];
    if let (Some(margin), Some(event)) = (torque.shaft_margin, torque.shaft_event) {
        rows.push((
            "Chuck or shaft margin",
            format!(
                "{margin:.2} in the {} (torque rating / torque the core passes; below 1 = the core turns on its chuck)",
                event.title()
            ),
        ));
    }
    rows
}

/// The full profile as CSV, one row per node.
pub fn profile_csv(profile: &Profile, system: UnitSystem) -> anyhow::Result<String> {
    let (radius_unit, radius_scale, stress_unit, stress_scale, tension_unit, tension_scale) =
        match system {
            UnitSystem::Si => ("mm", 1e3, "kPa", 1e-3, "N/m", 1.0),
            UnitSystem::Us => (
                "in",
                1.0 / METRES_PER_INCH,
                "psi",
                1.0 / PASCALS_PER_PSI,
                "pli",
                1.0 / NEWTONS_PER_METRE_PER_PLI,
            ),
        };
    let mut writer = csv::Writer::from_writer(Vec::new());
    writer.write_record([
        format!("radius_{radius_unit}"),
        "build_fraction".into(),
        "zone".into(),
        format!("pressure_{stress_unit}"),
        format!("tangential_stress_{stress_unit}"),
        "radial_strain".into(),
        format!("wound_in_tension_{tension_unit}"),
    ])?;
    for i in 0..profile.radius.len() {
        let zone = profile
            .zones
            .iter()
            .find(|z| i >= z.start && i < z.end)
            .map(|z| z.name.as_str())
            .unwrap_or("");
        writer.write_record([
            format!("{:.6}", profile.radius[i] * radius_scale),
            format!("{:.6}", profile.build_fraction(i)),
            zone.to_string(),
            format!("{:.6e}", profile.pressure[i] * stress_scale),
            format!("{:.6e}", profile.tangential_stress[i] * stress_scale),
            format!("{:.6e}", profile.radial_strain[i]),
            format!("{:.6e}", profile.wound_in_tension[i] * tension_scale),
        ])?;
    }
    let bytes = writer.into_inner().context("finishing the CSV output")?;
    Ok(String::from_utf8(bytes)?)
}
