//! `rolltriage taper`: design a tension/taper schedule that keeps the roll inside every limit.

use std::fmt::Write;
use std::path::PathBuf;

use anyhow::Context;
use rolltriage::taper_design::{self, DesignOptions, Limit, TaperDesign, TaperLimits, TaperShape};
use rolltriage::units::{QuantityKind, UnitSystem, format_quantity, parse_quantity};

use super::units_arg::UnitsArg;

#[derive(Debug, clap::Args)]
pub struct TaperArgs {
    /// The case file (web, core, roll, current winding settings).
    pub case: PathBuf,
    /// Largest share of the core's rated crush pressure the core may carry: a fraction
    /// (0.8 means 80 %) or a percentage ("80 %").
    #[arg(long, default_value_t = taper_design::DEFAULT_CORE_SHARE, value_name = "SHARE", value_parser = super::arg_check::core_share)]
    pub core_share: f64,
    /// Smallest telescoping margin allowed: friction × pressure over the axial shear of lifting
    /// the roll by its core, at every interface (see docs/taper-design.md).
    #[arg(long, default_value_t = taper_design::DEFAULT_MIN_TELESCOPING_MARGIN, value_name = "RATIO", value_parser = super::arg_check::telescoping_margin)]
    pub min_telescoping_margin: f64,
    /// Share of the peak pressure below which a compressive band counts as starring risk
    /// (a fraction or a percentage).
    #[arg(long, default_value_t = taper_design::DEFAULT_STARRING_PRESSURE_SHARE, value_name = "SHARE", value_parser = super::arg_check::starring_share)]
    pub starring_share: f64,
    /// Largest wound-in tension as a share of the web's tensile strength (a fraction or a
    /// percentage).
    #[arg(long, default_value_t = taper_design::DEFAULT_TENSION_SHARE, value_name = "SHARE", value_parser = super::arg_check::tension_share)]
    pub tension_share: f64,
    /// Taper shape.
    #[arg(long, value_enum, default_value_t = KindArg::Linear)]
    pub kind: KindArg,
    /// Wind the taper in this many equal-build steps (for winders with stepped tension).
    #[arg(long, value_name = "N", value_parser = super::arg_check::count)]
    pub steps: Option<usize>,
    /// Largest taper searched, e.g. "60 %" (default 80 % linear, 100 % hyperbolic).
    #[arg(long, value_name = "PERCENT", value_parser = super::arg_check::percent)]
    pub max_taper: Option<String>,
    /// Units to print in (both are always shown in the operator table).
    #[arg(long, value_enum, default_value_t = UnitsArg::Si)]
    pub units: UnitsArg,
    /// Print the design as JSON (schedule, checks, table, explanation, before/after profiles
    /// thinned to 200 points for plots).
    #[arg(long)]
    pub json: bool,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum KindArg {
    Linear,
    Hyperbolic,
}

pub fn run(args: &TaperArgs) -> anyhow::Result<()> {
    // The errors name the file (and the field's line) themselves.
    let (case, text) = rolltriage::case::Case::load_with_text(&args.case)?;
    let resolved = case.resolve_in_file(&args.case.display().to_string(), &text)?;
    let max_taper = args
        .max_taper
        .as_deref()
        .map(|t| parse_quantity("--max-taper", t, QuantityKind::Percent))
        .transpose()?;
    let limits = TaperLimits {
        core_share: args.core_share,
        min_telescoping_margin: args.min_telescoping_margin,
        starring_pressure_share: args.starring_share,
        tension_share: args.tension_share,
    };
    let options = DesignOptions {
        shape: match args.kind {
            KindArg::Linear => TaperShape::Linear,
            KindArg::Hyperbolic => TaperShape::Hyperbolic,
        },
        steps: args.steps,
        max_taper,
        ..DesignOptions::default()
    };
    let design = taper_design::design_with(&resolved, &limits, &options)
        .with_context(|| format!("taper design for {}", args.case.display()))?;
    let what = format!("the taper design for {}", args.case.display());
    rolltriage::finite::ensure_finite(&what, &design)?;
    let system = args.units.system();
    if args.json {
        let value = serde_json::json!({
            "case": args.case.display().to_string(),
            "feasible": design.feasible,
            "shape": design.shape,
            "steps": design.steps,
            "start_tension_n_per_m": design.start_tension,
            "taper_fraction": design.taper_fraction,
            "schedule": design.schedule,
            "limits": design.limits,
            "before": design.before.checks,
            "after": design.after.checks,
            "binding": design.binding,
            "conflict": design.conflict,
            "table": design.table,
            "explanation": design.explanation,
            "solves": design.solves,
            "before_profile": plot_series(&design.before.profile),
            "after_profile": plot_series(&design.after.profile),
        });
        super::output::write_stdout(&(serde_json::to_string_pretty(&value)? + "\n"))?;
    } else {
        super::output::write_stdout(&render(&resolved.title, &design, system))?;
    }
    if !design.feasible {
        anyhow::bail!(
            "no schedule meets every limit; see the conflict above and relax one of the named limits"
        );
    }
    Ok(())
}

/// A profile thinned to at most 200 points for plots: radius (m), pressure and tangential
/// stress (Pa), wound-in tension (N/m).
fn plot_series(profile: &rolltriage::model::Profile) -> serde_json::Value {
    let p = profile.downsampled(200);
    serde_json::json!({
        "radius_m": p.radius,
        "pressure_pa": p.pressure,
        "tangential_stress_pa": p.tangential_stress,
        "wound_in_tension_n_per_m": p.wound_in_tension,
    })
}

fn quantity(value: f64, kind: QuantityKind, system: UnitSystem) -> String {
    format_quantity(value, kind, system)
}

fn check_value(limit: Limit, value: f64, system: UnitSystem) -> String {
    match limit {
        Limit::CorePressure => quantity(value, QuantityKind::Stress, system),
        Limit::Telescoping => format!("{value:.2}"),
        Limit::WoundInTension => quantity(value, QuantityKind::ForcePerWidth, system),
        Limit::Starring => {
            if value > 0.0 {
                format!("band {:.1} % of build", 100.0 * value)
            } else {
                "none".to_string()
            }
        }
    }
}

/// The design as text: before/after checks, the operator's table, the explanation, cautions.
pub fn render(title: &str, design: &TaperDesign, system: UnitSystem) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "Taper design: {title}");
    let _ = writeln!(
        out,
        "Shape: {:?}{}",
        design.shape,
        design
            .steps
            .map(|n| format!(", {n} steps"))
            .unwrap_or_default()
    );
    let _ = writeln!(out);
    let _ = writeln!(
        out,
        "{:<36} {:>18} {:>18} {:>22}",
        "limit", "before", "after", "allowed"
    );
    for limit in Limit::ALL {
        let (Some(b), Some(a)) = (design.before.check(limit), design.after.check(limit)) else {
            continue;
        };
        let allowed = match limit {
            Limit::Telescoping => format!("≥ {}", check_value(limit, a.allowed, system)),
            Limit::Starring => "no band".to_string(),
            _ => format!("≤ {}", check_value(limit, a.allowed, system)),
        };
        let mark = |met: bool| if met { "ok" } else { "FAIL" };
        let _ = writeln!(
            out,
            "{:<36} {:>13} {:>4} {:>13} {:>4} {:>22}",
            limit.title(),
            check_value(limit, b.value, system),
            mark(b.met),
            check_value(limit, a.value, system),
            mark(a.met),
            allowed
        );
    }
    let _ = writeln!(out);
    let heading = if design.feasible {
        "Tension to set against roll diameter"
    } else {
        "Closest schedule found (does NOT meet every limit)"
    };
    let _ = writeln!(out, "{heading}:");
    let _ = writeln!(
        out,
        "{:>10} {:>8} {:>10} {:>8}",
        "diam mm", "in", "N/m", "pli"
    );
    for row in &design.table {
        let _ = writeln!(
            out,
            "{:>10.0} {:>8.1} {:>10.0} {:>8.2}",
            row.diameter * 1e3,
            row.diameter / 0.0254,
            row.tension,
            row.tension / PLI
        );
    }
    let _ = writeln!(out);
    for line in &design.explanation {
        let _ = writeln!(out, "- {line}");
    }
    let _ = writeln!(out);
    let _ = writeln!(
        out,
        "Caution: change winder tension settings only as your site procedures allow; keep clear of \
         nips and the winding roll while it turns, and follow lockout/tagout before any work on the \
         machine. The schedule is computed from approximate inputs — trial it on a few rolls first."
    );
    out
}

/// 1 pli = 1 lbf/in in N/m (NIST SP 811: 4.448 221 615 260 5 N / 0.0254 m).
const PLI: f64 = 4.448_221_615_260_5 / 0.0254;
