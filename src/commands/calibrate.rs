//! `rolltriage calibrate`: fit material parameters from measurements.

use std::path::PathBuf;

use rolltriage::calibrate::{
    self, FitOptions, MaterialEntry, MaterialLibrary, PfeifferFit, StackReadOptions, StackTest,
    Weighting,
};
use rolltriage::units::{QuantityKind, format_quantity, parse_quantity};

use super::units_arg::UnitsArg;

#[derive(Debug, clap::Args)]
pub struct CalibrateArgs {
    #[command(subcommand)]
    pub what: CalibrateCommand,
}

#[derive(Debug, clap::Subcommand)]
pub enum CalibrateCommand {
    /// Fit Pfeiffer's radial-stiffness law P = K1·(e^(K2·ε) − 1) to a stack-compression test.
    ///
    /// DATA.csv holds pressure against strain or against stack height, units in the header:
    /// "strain,pressure [kPa]" or "height [mm],pressure [psi]". Comment lines start with #;
    /// "# initial_height: 25.4 mm" and "# layers: 200" give the stack's size.
    Stack(StackArgs),
}

#[derive(Debug, clap::Args)]
pub struct StackArgs {
    /// The stack test CSV.
    pub data: PathBuf,
    /// Initial stack height, e.g. "25.4 mm" (overrides the file's "# initial_height:").
    #[arg(long, value_name = "LENGTH", value_parser = super::arg_check::length)]
    pub initial_height: Option<String>,
    /// Number of layers in the stack (overrides the file's "# layers:").
    #[arg(long, value_name = "N", value_parser = super::arg_check::count)]
    pub layers: Option<usize>,
    /// Residual weighting: relative (each residual as a share of its pressure; every decade
    /// counts alike) or absolute (plain pressure; the high-pressure rows dominate).
    #[arg(long, value_enum, default_value_t = WeightingArg::Relative)]
    pub weighting: WeightingArg,
    /// Units to print in.
    #[arg(long, value_enum, default_value_t = UnitsArg::Si)]
    pub units: UnitsArg,
    /// Print the fit as JSON (parameters, uncertainty, residuals) instead of a table.
    #[arg(long)]
    pub json: bool,
    /// Write the fitted law into this case file's web.radial_stiffness (saved atomically;
    /// only those lines change). Refused, the file untouched, when the fit is outside the
    /// case file's accepted range.
    #[arg(long, value_name = "CASE.yaml")]
    pub write_case: Option<PathBuf>,
    /// With --write-case: allow a full rewrite of a case file whose layout cannot be edited in
    /// place, which drops its comments.
    #[arg(long, requires = "write_case")]
    pub drop_comments: bool,
    /// Add or replace the fitted material in this material library file (created if missing).
    #[arg(long, value_name = "LIBRARY.yaml", requires = "material_id")]
    pub write_library: Option<PathBuf>,
    /// Material ID for --write-library (lowercase letters, digits, _).
    #[arg(long, value_name = "ID")]
    pub material_id: Option<String>,
    /// Title stored with the library entry.
    #[arg(long)]
    pub title: Option<String>,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum WeightingArg {
    Absolute,
    Relative,
}

pub fn run(args: &CalibrateArgs) -> anyhow::Result<()> {
    match &args.what {
        CalibrateCommand::Stack(a) => run_stack(a),
    }
}

fn run_stack(args: &StackArgs) -> anyhow::Result<()> {
    let text = calibrate::read_stack_file(&args.data)?;
    let origin = args.data.display().to_string();
    let initial_height = args
        .initial_height
        .as_deref()
        .map(|t| parse_quantity("--initial-height", t, QuantityKind::Length))
        .transpose()?;
    let test = calibrate::parse_stack_csv(
        &text,
        &origin,
        &StackReadOptions {
            initial_height,
            layers: args.layers,
        },
    )?;
    let options = FitOptions {
        weighting: match args.weighting {
            WeightingArg::Absolute => Weighting::Absolute,
            WeightingArg::Relative => Weighting::Relative,
        },
        ..FitOptions::default()
    };
    let fit = calibrate::fit_pfeiffer(&test, &options)?;
    rolltriage::finite::ensure_finite(&format!("the stack fit of {origin}"), &fit)?;

    if args.json {
        let value = serde_json::json!({
            "source": origin,
            "fit": fit,
            "caliper_m": test.caliper(),
            "notes": test.notes,
        });
        super::output::write_stdout(&(serde_json::to_string_pretty(&value)? + "\n"))?;
    } else {
        super::output::write_stdout(&render_fit(&test, &fit, args.units))?;
    }

    if let Some(path) = &args.write_case {
        // Loaded first only for the caliper check; the write below re-reads and checks it.
        if let Ok(case) = rolltriage::case::Case::load(path) {
            warn_on_caliper_mismatch(path, &case, &test);
        }
        let edit = calibrate::write_case::write_fit_into_case(path, &fit, args.drop_comments)?;
        eprintln!(
            "wrote web.radial_stiffness (pfeiffer, K1 {} kPa, K2 {}) into {}{}",
            calibrate::write_case::case_number(calibrate::significant(fit.k1 / 1e3, 5)),
            calibrate::write_case::case_number(calibrate::significant(fit.k2, 5)),
            path.display(),
            match edit {
                calibrate::write_case::CaseEdit::InPlace => "; the rest of the file is unchanged",
                calibrate::write_case::CaseEdit::Rewritten =>
                    " (the file was rewritten; its comments were not kept)",
            }
        );
    }
    if let Some(path) = &args.write_library {
        let id = args.material_id.as_deref().unwrap_or_default();
        calibrate::library::check_id(id).map_err(anyhow::Error::msg)?;
        let mut library = MaterialLibrary::load_or_new(path)?;
        let entry = MaterialEntry::from_fit(id, args.title.clone(), &origin, &fit, test.caliper());
        let replaced = library.upsert(entry);
        library.save(path)?;
        eprintln!(
            "{} material \"{id}\" in {}",
            if replaced { "replaced" } else { "added" },
            path.display()
        );
    }
    Ok(())
}

/// Warn when the stack's caliper differs from the case's web thickness by more than 10 %.
fn warn_on_caliper_mismatch(
    path: &std::path::Path,
    case: &rolltriage::case::Case,
    test: &StackTest,
) {
    let Some(thickness) = case.web.thickness.as_ref() else {
        return;
    };
    let field = format!("{} web.thickness", path.display());
    let thickness = match thickness {
        rolltriage::case::QuantityText::Number(v) => Some(*v),
        rolltriage::case::QuantityText::Text(t) => {
            parse_quantity(&field, t, QuantityKind::Length).ok()
        }
    };
    if let Some(warning) =
        thickness.and_then(|t| calibrate::caliper_warning(test, t, "web.thickness"))
    {
        eprintln!("warning: {warning}");
    }
}

/// 1 psi in Pa (NIST SP 811: 1 lbf = 4.448 221 615 260 5 N, 1 in = 0.0254 m).
const PSI: f64 = 4.448_221_615_260_5 / (0.0254 * 0.0254);

fn pressure_text(pa: f64, units: UnitsArg) -> String {
    format_quantity(pa, QuantityKind::Stress, units.system())
}

/// The fit as a plain-text report: parameters, quality, warnings, residuals.
pub fn render_fit(test: &StackTest, fit: &PfeifferFit, units: UnitsArg) -> String {
    use std::fmt::Write;
    let mut out = String::new();
    let _ = writeln!(out, "Stack-compression fit: {}", test.origin);
    let _ = writeln!(out, "Law: P = K1·(e^(K2·ε) − 1)  (Pfeiffer 1966)");
    let _ = writeln!(
        out,
        "  K1 = {} ± {}   (standard error)",
        pressure_text(fit.k1, units),
        pressure_text(fit.k1_standard_error, units)
    );
    let _ = writeln!(out, "  K2 = {:.4} ± {:.4}", fit.k2, fit.k2_standard_error);
    let _ = writeln!(out, "  correlation(K1, K2) = {:.3}", fit.correlation);
    let _ = writeln!(
        out,
        "  R² = {:.5}   RMS residual = {}   points = {}   weighting = {:?}   iterations = {}",
        fit.r_squared,
        pressure_text(fit.rms_residual, units),
        fit.points.len(),
        fit.weighting,
        fit.iterations
    );
    let _ = writeln!(
        out,
        "  start (log-linear): K1 = {}, K2 = {:.4}",
        pressure_text(fit.start.0, units),
        fit.start.1
    );
    let _ = writeln!(
        out,
        "  measured up to {}; the law is extrapolated above it",
        pressure_text(fit.max_measured_pressure(), units)
    );
    if let Some(c) = test.caliper() {
        let _ = writeln!(
            out,
            "  caliper from the stack: {:.1} µm ({:.3} mil)",
            c * 1e6,
            c / 0.0254e-3
        );
    }
    for note in &test.notes {
        let _ = writeln!(out, "note: {note}");
    }
    for w in &fit.warnings {
        let _ = writeln!(out, "warning: {w}");
    }
    let _ = writeln!(out);
    let (unit, scale) = match units {
        UnitsArg::Si => ("kPa", 1e3),
        UnitsArg::Us => ("psi", PSI),
    };
    // Three pressure columns of the same width: measured, fitted, residual.
    let heads =
        ["measured", "fitted", "residual"].map(|h| format!("{:>14}", format!("{h} {unit}")));
    let _ = writeln!(out, "{:>6} {:>10} {}", "line", "strain", heads.join(" "));
    for p in &fit.points {
        let pressures = [p.pressure, p.fitted, p.residual].map(|v| format!("{:>14.4}", v / scale));
        let _ = writeln!(
            out,
            "{:>6} {:>10.5} {}",
            p.line,
            p.strain,
            pressures.join(" ")
        );
    }
    out
}
