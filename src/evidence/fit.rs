//! The inverse estimate: which wound-in tension (and, where the data allow, which stack
//! stiffness) makes the model match what was measured on the roll.
//!
//! Parameters are logarithms of scales on the case's settings, x = (ln s_T[, ln s_K]):
//! s_T multiplies all wound-in tension (the web tension schedule with its steps and upsets, and
//! the nip load, so the nip's μ·N share too); s_K multiplies the radial stiffness law's
//! pressure at a given strain (Pfeiffer K1, a constant modulus, a power law's coefficient by
//! s_K^(1−n)). Data are the measured mean radial compression (from length or weight and
//! diameter) and calibrated hardness readings turned into pressures. The residuals
//! (model − measured)/σ are minimised by Levenberg–Marquardt with a central-difference
//! Jacobian; the standard errors come from the Jacobian at the solution,
//! cov = (JᵀJ)⁻¹·χ²/(m − p) when there are more data than parameters (the scatter of the data
//! sets the scale, as SciPy's `curve_fit` does by default), and cov = (JᵀJ)⁻¹ with the stated
//! uncertainties when there are exactly as many. Standard errors of the scales follow by the
//! delta method, SE(s) = s·SE(ln s). Refusals say why: no data that fixes the level, data that
//! cannot tell tension from stiffness, a scale beyond 1/20…20, a measurement the model does not
//! respond to.

use std::cell::Cell;

use nalgebra::{DMatrix, DVector};
use serde::{Deserialize, Serialize};

use super::measurements::Measurements;
use super::{EvidenceError, geometry, hardness};
use crate::calibrate::levenberg_marquardt::{LeastSquaresModel, LmOptions, minimise};
use crate::model::{ModelError, Profile, RadialStiffness, Resolution, WindingProblem};
use crate::units::{QuantityKind, UnitSystem, compact_length, compact_stress, format_quantity};

/// Relative standard uncertainty given to a hardness reading turned into a pressure through a
/// calibration, plus a floor of [`CALIBRATED_FLOOR`] of the largest such pressure (so readings
/// near zero pressure do not get infinite weight). An order of magnitude for hand-held testers
/// (from memory); with more data than parameters the fit's own scatter rescales it.
pub const CALIBRATED_UNCERTAINTY: f64 = 0.10;
pub const CALIBRATED_FLOOR: f64 = 0.02;

/// Largest scale either way the fit accepts (1/20 … 20).
pub const SCALE_LIMIT: f64 = 20.0;

/// Parameter pairs more correlated than this cannot be told apart.
pub const MAX_CORRELATION: f64 = 0.99;

/// Central-difference step in ln s.
const STEP: f64 = 0.01;

/// Which scales to fit.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct FitOptions {
    /// Also fit the stack stiffness scale when the data allow it.
    pub stiffness: bool,
    pub max_iterations: usize,
}

impl Default for FitOptions {
    fn default() -> Self {
        FitOptions {
            stiffness: true,
            max_iterations: 30,
        }
    }
}

/// A fitted scale with its standard error.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Estimate {
    pub value: f64,
    pub standard_error: f64,
}

/// One datum of the fit: measured against fitted.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FitResidual {
    /// "mean radial compression" or "pressure at ⌀ 612 mm".
    pub what: String,
    /// SI (share or Pa).
    pub measured: f64,
    pub fitted: f64,
    /// Standard uncertainty used to weight it (same unit).
    pub sigma: f64,
    /// m, for a pressure datum: lets the text name the place in the chosen units (not in JSON).
    #[serde(skip)]
    pub diameter: Option<f64>,
}

/// The result of the inverse estimate.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct InverseEstimate {
    /// Scale on all wound-in tension; `None` when refused.
    pub tension_scale: Option<Estimate>,
    /// Scale on the stack's radial stiffness; `None` when not fitted or refused.
    pub stiffness_scale: Option<Estimate>,
    /// Wound-in tension at the core per the settings (N/m) and as fitted.
    pub settings_tension: f64,
    pub effective_tension: Option<f64>,
    pub data_points: usize,
    /// χ²/(m − p), when m > p.
    pub reduced_chi_square: Option<f64>,
    pub residuals: Vec<FitResidual>,
    pub iterations: usize,
    pub converged: bool,
    /// Why a quantity was not estimated.
    pub refused: Vec<String>,
}

/// The problem with all wound-in tension × `tension` and the stack stiffness × `stiffness`.
pub fn scaled_problem(problem: &WindingProblem, tension: f64, stiffness: f64) -> WindingProblem {
    let mut p = problem.clone();
    let schedule = &mut p.winding.tension;
    schedule.start_tension *= tension;
    if let crate::model::Taper::Steps { steps } | crate::model::Taper::Programme { points: steps } =
        &mut schedule.taper
    {
        for s in steps {
            s.tension *= tension;
        }
    }
    for band in &mut schedule.upsets {
        band.tension *= tension;
    }
    if let Some(n) = p.winding.nip_load.as_mut() {
        *n *= tension;
    }
    p.radial_stiffness = match p.radial_stiffness {
        RadialStiffness::Pfeiffer { k1, k2 } => RadialStiffness::Pfeiffer {
            k1: k1 * stiffness,
            k2,
        },
        RadialStiffness::Constant { modulus } => RadialStiffness::Constant {
            modulus: modulus * stiffness,
        },
        RadialStiffness::PowerLaw {
            coefficient,
            exponent,
        } => RadialStiffness::PowerLaw {
            coefficient: coefficient * stiffness.powf(1.0 - exponent),
            exponent,
        },
    };
    p
}

/// A datum: what the model is asked for and the measured value.
#[derive(Debug, Clone, Copy)]
enum Datum {
    Compression {
        measured: f64,
        sigma: f64,
    },
    Pressure {
        radius: f64,
        measured: f64,
        sigma: f64,
    },
}

impl Datum {
    fn model_value(&self, profile: &Profile) -> Option<f64> {
        match *self {
            Datum::Compression { .. } => geometry::model_mean_compression(profile),
            Datum::Pressure { radius, .. } => Some(Profile::interpolate(
                &profile.pressure,
                &profile.radius,
                radius,
            )),
        }
    }
    fn measured(&self) -> (f64, f64) {
        match *self {
            Datum::Compression { measured, sigma }
            | Datum::Pressure {
                measured, sigma, ..
            } => (measured, sigma),
        }
    }
}

type Solver<'a> = &'a dyn Fn(&WindingProblem) -> Result<Profile, ModelError>;

struct FitModel<'a> {
    problem: &'a WindingProblem,
    data: &'a [Datum],
    solve: Solver<'a>,
    /// Parameters fitted: tension only (1) or tension and stiffness (2).
    parameters: usize,
    solves: Cell<usize>,
}

impl FitModel<'_> {
    fn values(&self, x: &DVector<f64>) -> Option<Vec<f64>> {
        if x.iter().any(|v| v.abs() > SCALE_LIMIT.ln() + 1.0) {
            return None;
        }
        let stiffness = if self.parameters > 1 { x[1].exp() } else { 1.0 };
        let problem = scaled_problem(self.problem, x[0].exp(), stiffness);
        self.solves.set(self.solves.get() + 1);
        let profile = (self.solve)(&problem).ok()?;
        self.data.iter().map(|d| d.model_value(&profile)).collect()
    }
}

impl LeastSquaresModel for FitModel<'_> {
    fn residuals(&self, x: &DVector<f64>) -> Option<DVector<f64>> {
        let values = self.values(x)?;
        Some(DVector::from_iterator(
            values.len(),
            values.iter().zip(self.data).map(|(v, d)| {
                let (m, s) = d.measured();
                (v - m) / s
            }),
        ))
    }

    fn jacobian(&self, x: &DVector<f64>) -> Option<DMatrix<f64>> {
        let mut jac = DMatrix::zeros(self.data.len(), x.len());
        for j in 0..x.len() {
            let (mut up, mut down) = (x.clone(), x.clone());
            up[j] += STEP;
            down[j] -= STEP;
            let (a, b) = (self.values(&up)?, self.values(&down)?);
            for (i, d) in self.data.iter().enumerate() {
                jac[(i, j)] = (a[i] - b[i]) / (2.0 * STEP * d.measured().1);
            }
        }
        Some(jac)
    }
}

/// Collect the data the measurements offer; notes say what was left out.
fn collect_data(
    measurements: &Measurements,
    problem: &WindingProblem,
    notes: &mut Vec<String>,
) -> Vec<Datum> {
    let mut data = Vec::new();
    if let Some(size) = &measurements.size {
        let core_d = 2.0 * problem.core_radius;
        let measured = geometry::mean_compression(
            size.amount.length(),
            size.diameter,
            core_d,
            problem.thickness,
        );
        let r = size.diameter / 2.0;
        let rc = problem.core_radius;
        let u = size.uncertainty;
        let area = r * u.diameter / (r * r - rc * rc).max(f64::MIN_POSITIVE);
        let relative = (u.amount.powi(2) + u.caliper.powi(2) + area.powi(2)).sqrt();
        data.push(Datum::Compression {
            measured,
            sigma: relative * (1.0 - measured),
        });
    }
    if let Some(h) = &measurements.hardness {
        if h.calibration.is_empty() {
            notes.push(
                "hardness readings without a calibration give the shape of the pressure, not its \
                 level, and are not used in the fit"
                    .into(),
            );
        } else {
            let (rc, ro) = (problem.core_radius, problem.outer_radius);
            let pressures: Vec<(f64, f64)> = h
                .readings
                .iter()
                .filter(|r| r.diameter / 2.0 >= rc && r.diameter / 2.0 <= ro)
                .filter_map(|r| {
                    hardness::calibrated_pressure(&h.calibration, r.value)
                        .map(|p| (r.diameter / 2.0, p))
                })
                .collect();
            let skipped = h.readings.len() - pressures.len();
            if skipped > 0 {
                notes.push(format!(
                    "{skipped} hardness reading(s) outside the roll or the calibrated range were \
                     left out of the fit"
                ));
            }
            let largest = pressures.iter().map(|p| p.1).fold(0.0, f64::max);
            for (radius, measured) in pressures {
                data.push(Datum::Pressure {
                    radius,
                    measured,
                    sigma: (CALIBRATED_UNCERTAINTY * measured + CALIBRATED_FLOOR * largest)
                        .max(1.0),
                });
            }
        }
    }
    data
}

/// Fit the tension scale (and the stiffness scale where the data allow) to the measurements.
/// `solve` is the stress solver (the crate's `model::solve` or a stand-in).
pub fn estimate(
    measurements: &Measurements,
    problem: &WindingProblem,
    solve: Solver<'_>,
    options: &FitOptions,
) -> Result<InverseEstimate, EvidenceError> {
    measurements.validate()?;
    let mut out = InverseEstimate {
        settings_tension: problem.winding.wound_in_tension(
            problem.core_radius,
            problem.core_radius,
            problem.outer_radius,
        ),
        ..InverseEstimate::default()
    };
    let data = collect_data(measurements, problem, &mut out.refused);
    out.data_points = data.len();
    let has_compression = data.iter().any(|d| matches!(d, Datum::Compression { .. }));
    let pressures = data.len() - usize::from(has_compression);
    if data.is_empty() {
        out.refused.push(
            "tension scale: no measured size (length or weight with diameter) and no calibrated \
             hardness readings, so nothing fixes the level of the wound-in tension"
                .into(),
        );
        return Ok(out);
    }
    // One grid for every solve of the fit, so the residuals are smooth in the parameters: the
    // grid the solve at the settings used (the model's grid policy).
    let first = solve(problem)?;
    let mut fixed = problem.clone();
    if problem.options.resolution == Resolution::Auto {
        fixed.options.resolution = first.solver.grid.resolution();
    }
    let mut parameters = 1;
    if options.stiffness {
        if has_compression && pressures >= 2 {
            parameters = 2;
        } else {
            out.refused.push(
                "stiffness scale: needs both the roll's size (its compression) and at least two \
                 calibrated hardness readings (pressures); with one kind of data tension and \
                 stiffness trade off against each other"
                    .into(),
            );
        }
    }
    loop {
        match fit_once(&fixed, &data, solve, parameters, options)? {
            FitOutcome::Done(fit) => {
                let refused = std::mem::take(&mut out.refused);
                out = InverseEstimate {
                    settings_tension: out.settings_tension,
                    data_points: out.data_points,
                    refused,
                    ..fit
                };
                out.effective_tension = out.tension_scale.map(|s| s.value * out.settings_tension);
                return Ok(out);
            }
            FitOutcome::Refused(reason) if parameters == 2 => {
                out.refused.push(format!("stiffness scale: {reason}"));
                parameters = 1;
            }
            FitOutcome::Refused(reason) => {
                out.refused.push(format!("tension scale: {reason}"));
                return Ok(out);
            }
        }
    }
}

enum FitOutcome {
    Done(InverseEstimate),
    Refused(String),
}

fn fit_once(
    problem: &WindingProblem,
    data: &[Datum],
    solve: Solver<'_>,
    parameters: usize,
    options: &FitOptions,
) -> Result<FitOutcome, EvidenceError> {
    let model = FitModel {
        problem,
        data,
        solve,
        parameters,
        solves: Cell::new(0),
    };
    let lm = LmOptions {
        max_iterations: options.max_iterations,
        step_tolerance: 1e-6,
        gradient_tolerance: 1e-12,
        cost_tolerance: 1e-10,
    };
    let Some(solution) = minimise(&model, DVector::zeros(parameters), &lm) else {
        return Err(EvidenceError::Model(ModelError::NotConverged(
            "the case as set could not be solved for the fit".into(),
        )));
    };
    let x = &solution.parameters;
    if x.iter().any(|v| v.abs() >= SCALE_LIMIT.ln()) {
        return Ok(FitOutcome::Refused(format!(
            "the measurements ask for a scale beyond 1/{SCALE_LIMIT:.0}…{SCALE_LIMIT:.0} of the \
             settings; check the caliper, the core and the stiffness inputs"
        )));
    }
    let jac = &solution.jacobian;
    let normal = jac.transpose() * jac;
    // A measurement the model does not respond to cannot fix the parameter.
    if (0..parameters).any(|j| normal[(j, j)].sqrt() < 1e-3) {
        return Ok(FitOutcome::Refused(
            "the measured values hardly change with it in the model (less than 0.001 standard \
             uncertainties per unit of its logarithm)"
                .into(),
        ));
    }
    let Some(inverse) = normal.clone().try_inverse() else {
        return Ok(FitOutcome::Refused(
            "the data cannot tell it apart from the tension (singular normal matrix)".into(),
        ));
    };
    let m = data.len();
    let chi2 = solution.residuals.norm_squared();
    let reduced = (m > parameters).then(|| chi2 / (m - parameters) as f64);
    let cov = inverse * reduced.unwrap_or(1.0);
    if parameters == 2 {
        let corr = cov[(0, 1)] / (cov[(0, 0)] * cov[(1, 1)]).sqrt();
        if !corr.is_finite() || corr.abs() > MAX_CORRELATION {
            return Ok(FitOutcome::Refused(format!(
                "the data cannot tell it apart from the tension (correlation {corr:.3})"
            )));
        }
    }
    let scale = |j: usize| Estimate {
        value: x[j].exp(),
        standard_error: x[j].exp() * cov[(j, j)].max(0.0).sqrt(),
    };
    let fitted = model.values(x).unwrap_or_default();
    let residuals = data
        .iter()
        .zip(&fitted)
        .map(|(d, &f)| {
            let (measured, sigma) = d.measured();
            FitResidual {
                what: match d {
                    Datum::Compression { .. } => "mean radial compression".into(),
                    Datum::Pressure { radius, .. } => {
                        format!("pressure at ⌀ {:.0} mm", 2e3 * radius)
                    }
                },
                measured,
                fitted: f,
                sigma,
                diameter: match d {
                    Datum::Compression { .. } => None,
                    Datum::Pressure { radius, .. } => Some(2.0 * radius),
                },
            }
        })
        .collect();
    Ok(FitOutcome::Done(InverseEstimate {
        tension_scale: Some(scale(0)),
        stiffness_scale: (parameters == 2).then(|| scale(1)),
        reduced_chi_square: reduced,
        residuals,
        iterations: solution.iterations,
        converged: solution.converged,
        ..InverseEstimate::default()
    }))
}

impl InverseEstimate {
    /// Plain-words lines: "the settings say X, the roll says Y", the fit's quality, refusals (SI).
    pub fn lines(&self) -> Vec<String> {
        self.lines_in(UnitSystem::Si)
    }

    /// [`InverseEstimate::lines`] with tensions, pressures and diameters in `units`.
    pub fn lines_in(&self, units: UnitSystem) -> Vec<String> {
        let mut out = Vec::new();
        let tension = |v: f64| match units {
            UnitSystem::Si => format!("{v:.0} N/m"),
            UnitSystem::Us => format_quantity(v, QuantityKind::ForcePerWidth, units),
        };
        let pressure = |v: f64| match units {
            UnitSystem::Si => format!("{:.0} kPa", v / 1e3),
            UnitSystem::Us => compact_stress(v, units),
        };
        if let (Some(s), Some(effective)) = (self.tension_scale, self.effective_tension) {
            out.push(format!(
                "Wound-in tension: the settings say {} at the core, the roll says {} \
                 (scale {:.2} ± {:.2}).",
                tension(self.settings_tension),
                tension(effective),
                s.value,
                s.standard_error
            ));
        }
        if let Some(k) = self.stiffness_scale {
            out.push(format!(
                "Stack stiffness: {:.2} ± {:.2} times the case's radial stiffness.",
                k.value, k.standard_error
            ));
        }
        if self.tension_scale.is_some() {
            let quality = match self.reduced_chi_square {
                Some(c) => format!(
                    "reduced chi-square {c:.2} ({} data, 1 = scatter as expected)",
                    self.data_points
                ),
                None => format!(
                    "{} datum per parameter: exact fit, uncertainty from the stated measurement \
                     uncertainties",
                    self.data_points
                ),
            };
            out.push(format!(
                "Fit: {quality}; {} iterations{}.",
                self.iterations,
                if self.converged {
                    ""
                } else {
                    ", not converged"
                }
            ));
            for r in &self.residuals {
                let (m, f, s) = if r.what.starts_with("pressure") {
                    (pressure(r.measured), pressure(r.fitted), pressure(r.sigma))
                } else {
                    (
                        format!("{:.2} %", r.measured * 100.0),
                        format!("{:.2} %", r.fitted * 100.0),
                        format!("{:.2} %", r.sigma * 100.0),
                    )
                };
                let what = match (units, r.diameter) {
                    (UnitSystem::Us, Some(d)) => {
                        format!("pressure at ⌀ {}", compact_length(d, units))
                    }
                    _ => r.what.clone(),
                };
                out.push(format!("  {what}: measured {m} ± {s}, fitted {f}"));
            }
        }
        out.extend(self.refused.iter().map(|r| format!("Not estimated — {r}.")));
        out
    }
}
