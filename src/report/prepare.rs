//! From a case to a [`ReportInput`]: resolve, solve, diagnose, and re-solve with the chosen
//! remedy applied for the before/after comparison.

use super::{RemedyComparison, ReportError, ReportInput, ReportMeta};
use crate::case::{Case, ResolvedCase};
use crate::diagnose::pipeline::{self, Triage};
use crate::diagnose::rules::SettingChange;
use crate::diagnose::what_if::apply_changes;
use crate::diagnose::{DiagnoseError, DiagnoseOptions, Diagnosis, rules::RuleBase};
use crate::model::{Profile, SolverOptions, Taper, solve};
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
    /// Re-solve every setting-changing remedy for its predicted effect (the diagnosis' what-if).
    pub what_if: bool,
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

/// Resolve, solve and diagnose `case` through the triage pipeline; apply the chosen remedy if
/// any and re-solve it on the grid the case's own solve used.
pub fn prepare(
    case: &Case,
    rules: &RuleBase,
    options: &PrepareOptions,
) -> Result<ReportInput, ReportError> {
    let diagnose_options = DiagnoseOptions {
        top: 0,
        what_if: options.what_if,
        solver: options.solver,
    };
    let Triage {
        resolved,
        profile,
        diagnosis,
    } = pipeline::triage(rules, case.into(), &diagnose_options, &mut |_| true)
        .map_err(report_error)?;
    let diagnosis = diagnosis.map_err(report_error)?;
    let same_grid = SolverOptions {
        resolution: profile.solver.grid.resolution(),
        ..options.solver
    };
    let remedy = match &options.remedy {
        None => None,
        Some(id) => {
            let (after_case, change) = apply_remedy(rules, &resolved, id, options.units)?;
            let after = solve(&after_case.problem(same_grid))?;
            Some(comparison(&diagnosis, id, change, after_case, after))
        }
    };
    let sensitivity = crate::diagnose::sensitivity::sensitivity(
        rules,
        &resolved,
        &profile,
        &diagnosis,
        options.solver,
        &mut |_| true,
    )
    .map_err(report_error)?;
    let estimate = resolved
        .measurements
        .as_ref()
        .map(|measurements| inverse_estimate(measurements, &resolved, options.solver));
    let meta = match &options.date {
        Some(date) => ReportMeta::dated(date, options.source_file.clone()),
        None => ReportMeta::now(options.source_file.clone()),
    };
    Ok(solved_report(
        case,
        Solved {
            resolved,
            profile,
            diagnosis,
        },
        remedy,
        meta,
        options.units,
    )
    .with_sensitivity(sensitivity)
    .with_estimate(estimate))
}

/// `evidence::estimate` with the default fit options, as `rolltriage compare` and the UI's F9
/// page run it. Like the F9 page, a failed fit does not stop the report: its reason is kept
/// so the report says why the roll's tension could not be estimated.
fn inverse_estimate(
    measurements: &crate::evidence::Measurements,
    resolved: &ResolvedCase,
    solver: SolverOptions,
) -> Result<crate::evidence::InverseEstimate, String> {
    crate::evidence::estimate(
        measurements,
        &resolved.problem(solver),
        &solve,
        &crate::evidence::FitOptions::default(),
    )
    .map_err(|e| e.to_string())
}

/// A case already resolved, solved and diagnosed (e.g. by the terminal UI's background job).
#[derive(Debug, Clone, PartialEq)]
pub struct Solved {
    pub resolved: ResolvedCase,
    pub profile: Profile,
    pub diagnosis: Diagnosis,
}

/// The report input of a case already solved: no solve here, so the UI can export what it
/// shows without waiting.
pub fn solved_report(
    case: &Case,
    solved: Solved,
    remedy: Option<RemedyComparison>,
    meta: ReportMeta,
    units: UnitSystem,
) -> ReportInput {
    ReportInput {
        case: case.clone(),
        resolved: solved.resolved,
        profile: solved.profile,
        diagnosis: solved.diagnosis,
        remedy,
        meta,
        units,
        sensitivity: None,
        similar_past: None,
        estimate: None,
    }
}

/// The before/after comparison of remedy `id` (its text from the diagnosis' remedy list, else
/// the ID), with the changed case `after_case` solved as `after`.
pub fn comparison(
    diagnosis: &Diagnosis,
    id: &str,
    change: String,
    after_case: ResolvedCase,
    after: Profile,
) -> RemedyComparison {
    RemedyComparison {
        remedy_id: id.to_string(),
        remedy_text: diagnosis
            .remedies
            .iter()
            .find(|r| r.id == id)
            .map_or_else(|| id.to_string(), |r| r.text.clone()),
        change,
        after_case,
        after,
    }
}

/// A pipeline error as the report's own: case and model errors keep their kind.
fn report_error(error: DiagnoseError) -> ReportError {
    match error {
        DiagnoseError::Case(e) => ReportError::Case(*e),
        DiagnoseError::Model(e) => ReportError::Model(e),
        e => ReportError::Diagnose(e),
    }
}

/// Apply the setting changes the rule base's remedy `remedy_id` declares; returns the changed
/// case and the changes in words with units. Remedies that change no winder setting (handling,
/// storage, upstream process) have nothing to re-solve and are refused with a message.
pub fn apply_remedy(
    rules: &RuleBase,
    resolved: &ResolvedCase,
    remedy_id: &str,
    units: UnitSystem,
) -> Result<(ResolvedCase, String), ReportError> {
    let Some(remedy) = rules.remedies.get(remedy_id) else {
        let hint = crate::vocabulary::closest(remedy_id, rules.remedies.keys().map(|k| k.as_str()))
            .map(|c| format!(" (did you mean \"{c}\"?)"))
            .unwrap_or_default();
        return Err(ReportError::Remedy {
            id: remedy_id.to_string(),
            message: format!(
                "not in the rule base's remedy catalogue{hint}; `rolltriage diagnose CASE` lists the remedies for a case"
            ),
        });
    };
    if remedy.changes.is_empty() {
        return Err(ReportError::Remedy {
            id: remedy_id.to_string(),
            message: "it changes no winder setting (tension, taper, nip, speed or core), so there \
                      is nothing to re-solve; accepted: a remedy that changes a setting"
                .to_string(),
        });
    }
    let after = apply_changes(resolved, &remedy.changes);
    Ok((
        after.clone(),
        describe_changes(resolved, &after, &remedy.changes, units),
    ))
}

/// The changes in words, with the before and after values.
fn describe_changes(
    before: &ResolvedCase,
    after: &ResolvedCase,
    changes: &[SettingChange],
    units: UnitSystem,
) -> String {
    let tension = |v: f64| format_quantity(v, QuantityKind::ForcePerWidth, units);
    let stress = |v: f64| format_quantity(v, QuantityKind::Stress, units);
    let taper = |t: &Taper| match t {
        Taper::None => "no taper".to_string(),
        Taper::Linear { fraction } => format!("linear taper {:.0} %", fraction * 100.0),
        Taper::Hyperbolic { fraction } => format!("hyperbolic taper {:.0} %", fraction * 100.0),
        Taper::Steps { steps } => format!("{} tension steps", steps.len()),
        Taper::Programme { points } => format!("tension programme of {} points", points.len()),
    };
    let mut parts = Vec::new();
    for change in changes {
        let part = match change {
            SettingChange::TensionScale(_) => format!(
                "web tension {} → {}",
                tension(before.winding.tension.start_tension),
                tension(after.winding.tension.start_tension)
            ),
            SettingChange::TaperBy(_) | SettingChange::TaperTo(_) => format!(
                "{} → {}",
                taper(&before.winding.tension.taper),
                taper(&after.winding.tension.taper)
            ),
            SettingChange::NipScale(_) => format!(
                "nip load {} → {}",
                before
                    .winding
                    .nip_load
                    .map(tension)
                    .unwrap_or_else(|| "none".into()),
                after
                    .winding
                    .nip_load
                    .map(tension)
                    .unwrap_or_else(|| "none".into())
            ),
            SettingChange::SpeedScale(_) => format!(
                "line speed {} → {}",
                format_quantity(before.winding.speed, QuantityKind::Speed, units),
                format_quantity(after.winding.speed, QuantityKind::Speed, units)
            ),
            SettingChange::CoreStiffnessScale(_) => format!(
                "core stiffness {} → {}",
                stress(before.core.stiffness.effective_stiffness()),
                stress(after.core.stiffness.effective_stiffness())
            ),
            SettingChange::CoreCrushScale(_) => format!(
                "core crush rating {} → {}",
                stress(before.core.crush_pressure),
                stress(after.core.crush_pressure)
            ),
            SettingChange::ClearUpsets => {
                "tension upset bands removed (steady tension through splices and restarts)"
                    .to_string()
            }
            SettingChange::CoreZoneTensionScale(f) => format!(
                "first tenth of the build wound at {:.0} % of the start tension",
                f * 100.0
            ),
        };
        parts.push(part);
    }
    parts.join("; ")
}
