//! From a case to a [`ReportInput`]: resolve, solve, diagnose, and re-solve with the chosen
//! remedy applied for the before/after comparison.

use super::{RemedyComparison, ReportError, ReportInput, ReportMeta};
use crate::case::{Case, ResolvedCase};
use crate::diagnose::{DiagnoseOptions, diagnose, rules::RuleBase};
use crate::model::{CoreStiffness, SolverOptions, Taper, solve};
use crate::units::{QuantityKind, UnitSystem, format_quantity};

/// Options of [`prepare`].
#[derive(Debug, Clone, PartialEq, Default)]
pub struct PrepareOptions {
    /// Remedy ID to apply and re-solve for the before/after comparison.
    pub remedy: Option<String>,
    /// Report date `YYYY-MM-DD`; today (UTC) when `None`.
    pub date: Option<String>,
    /// The case file name to print in the report.
    pub source_file: Option<String>,
    pub units: UnitSystem,
    pub solver: SolverOptions,
}

/// Read a case file and prepare its report.
pub fn prepare_from_path(
    path: &std::path::Path,
    rules: &RuleBase,
    options: &PrepareOptions,
) -> Result<ReportInput, ReportError> {
    let case = Case::load(path)?;
    let mut options = options.clone();
    if options.source_file.is_none() {
        options.source_file = Some(path.display().to_string());
    }
    prepare(&case, rules, &options)
}

/// Resolve, solve and diagnose `case`; apply the chosen remedy if any.
pub fn prepare(
    case: &Case,
    rules: &RuleBase,
    options: &PrepareOptions,
) -> Result<ReportInput, ReportError> {
    let resolved = case.resolve()?;
    let profile = solve(&resolved.problem(options.solver))?;
    let diagnosis = diagnose(
        rules,
        &resolved,
        &profile,
        &DiagnoseOptions {
            top: 0,
            what_if: true,
            solver: options.solver,
            ..DiagnoseOptions::default()
        },
    )?;
    let remedy = match &options.remedy {
        None => None,
        Some(id) => {
            let listed = diagnosis.remedies.iter().find(|r| &r.id == id);
            let text = listed.map(|r| r.text.clone()).unwrap_or_else(|| id.clone());
            let (after_case, change) = apply_remedy(&resolved, id, options.units)?;
            let after = solve(&after_case.problem(options.solver))?;
            Some(RemedyComparison {
                remedy_id: id.clone(),
                remedy_text: text,
                change,
                after_case,
                after,
            })
        }
    };
    let meta = match &options.date {
        Some(date) => ReportMeta::dated(date, options.source_file.clone()),
        None => ReportMeta::now(options.source_file.clone()),
    };
    Ok(ReportInput {
        case: case.clone(),
        resolved,
        profile,
        diagnosis,
        remedy,
        meta,
        units: options.units,
    })
}

/// The settings a remedy changes, by the words of its ID (`raise_tension`, `add_taper`,
/// `reduce_nip_load`, `use_stiffer_core`, ...). Sizes are the usual first step on the winder
/// (common practice): tension ±25 %, taper to 25 % or halved, nip ×1.5 or ×0.6, core three times
/// stiffer and twice as strong. Returns the changed case and the change in words.
pub fn apply_remedy(
    resolved: &ResolvedCase,
    remedy_id: &str,
    units: UnitSystem,
) -> Result<(ResolvedCase, String), ReportError> {
    let id = remedy_id.to_ascii_lowercase();
    let raise = ["raise", "increase", "add", "more", "higher", "use", "apply"]
        .iter()
        .any(|w| id.contains(w));
    let lower = ["reduce", "lower", "less", "decrease", "limit", "soften"]
        .iter()
        .any(|w| id.contains(w));
    let mut after = resolved.clone();
    let tension_text = |v: f64| format_quantity(v, QuantityKind::ForcePerWidth, units);
    let change = if id.contains("taper") {
        let before = after.winding.tension.taper.clone();
        let fraction = match before {
            Taper::Linear { fraction } | Taper::Hyperbolic { fraction } => fraction,
            _ => 0.0,
        };
        let new_fraction = if lower && !raise {
            fraction / 2.0
        } else if fraction < 0.25 {
            0.25
        } else {
            (fraction + 0.1).min(0.6)
        };
        after.winding.tension.taper = match before {
            Taper::Hyperbolic { .. } => Taper::Hyperbolic {
                fraction: new_fraction,
            },
            _ => Taper::Linear {
                fraction: new_fraction,
            },
        };
        format!(
            "taper {:.0} % → {:.0} %",
            fraction * 100.0,
            new_fraction * 100.0
        )
    } else if id.contains("nip") || id.contains("rider") || id.contains("lay_on") {
        let before = after.winding.nip_load.unwrap_or(0.0);
        let new = if lower && !raise {
            before * 0.6
        } else if before <= 0.0 {
            // A light rider/lay-on load where there was none (common practice).
            500.0
        } else {
            before * 1.5
        };
        after.winding.nip_load = Some(new);
        format!("nip load {} → {}", tension_text(before), tension_text(new))
    } else if id.contains("tension") {
        let before = after.winding.tension.start_tension;
        let factor = if lower && !raise { 0.75 } else { 1.25 };
        after.winding.tension.start_tension = before * factor;
        for upset in &mut after.winding.tension.upsets {
            upset.tension *= factor;
        }
        if id.contains("upset") || id.contains("spike") || id.contains("splice") {
            after.winding.tension.start_tension = before;
            after.winding.tension.upsets.clear();
            "tension upset bands removed (steady tension through splices and restarts)".to_string()
        } else {
            format!(
                "web tension {} → {}",
                tension_text(before),
                tension_text(before * factor)
            )
        }
    } else if id.contains("core") {
        after.core.stiffness = match after.core.stiffness {
            CoreStiffness::Hollow {
                inner_radius,
                outer_radius,
                modulus,
                poisson_ratio,
            } => CoreStiffness::Hollow {
                inner_radius,
                outer_radius,
                modulus: modulus * 3.0,
                poisson_ratio,
            },
            CoreStiffness::Measured { stiffness } => CoreStiffness::Measured {
                stiffness: stiffness * 3.0,
            },
            CoreStiffness::Rigid => CoreStiffness::Rigid,
        };
        after.core.crush_pressure *= 2.0;
        "core three times stiffer and rated for twice the crush pressure".to_string()
    } else {
        return Err(ReportError::Remedy {
            id: remedy_id.to_string(),
            message: "it does not change a winder setting (tension, taper, nip load or core), \
                      so there is nothing to re-solve; accepted: remedies whose ID names \
                      tension, taper, nip or core"
                .to_string(),
        });
    };
    Ok((after, change))
}
