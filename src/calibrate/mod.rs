//! Calibration of web material parameters from measurements.
//!
//! Owns the stack-compression fit: read a stack test ([`stack_data`]), keep its loading branch,
//! fit Pfeiffer's law P = K1·(e^(K2·ε) − 1) (Pfeiffer, TAPPI 49(8):342, 1966) by
//! Levenberg–Marquardt ([`levenberg_marquardt`]) from a log-linear start, and report the fit with
//! standard errors, R² and residuals. [`library`] stores fitted materials in our own file format;
//! [`apply_to_case`] writes a fit into a case's `web.radial_stiffness`.

pub mod levenberg_marquardt;
pub mod library;
pub mod stack_data;
pub mod write_case;

use nalgebra::{DMatrix, DVector};

pub use library::{MaterialEntry, MaterialLibrary};
pub use stack_data::{
    LoadingBranch, MAX_STACK_FILE_BYTES, StackPoint, StackReadOptions, StackTest, loading_branch,
    parse_stack_csv, read_stack_file,
};

use levenberg_marquardt::{LeastSquaresModel, LmOptions};

/// Errors of calibration. Data errors name the file, line and column.
#[derive(Debug, thiserror::Error)]
pub enum CalibrateError {
    #[error("{origin}: cannot read the CSV: {message}")]
    Csv { origin: String, message: String },
    #[error("{origin} column {column}: {message}")]
    Header {
        origin: String,
        column: usize,
        message: String,
    },
    #[error("{origin} line {line}, column {column} ({header}): {message}")]
    Value {
        origin: String,
        line: usize,
        column: usize,
        header: String,
        message: String,
    },
    #[error("{origin} line {line} (after line {previous_line}): {message}")]
    NotMonotone {
        origin: String,
        line: usize,
        previous_line: usize,
        message: String,
    },
    #[error("{origin}: \"{key}\": {message}")]
    Metadata {
        origin: String,
        key: String,
        message: String,
    },
    #[error(transparent)]
    Unit(#[from] crate::units::UnitError),
    #[error("{origin}: {message}")]
    TooFewPoints { origin: String, message: String },
    #[error("{origin}: the fit failed: {message}")]
    FitFailed { origin: String, message: String },
    #[error("{path}: {message}")]
    Library { path: String, message: String },
    #[error(transparent)]
    Save(#[from] crate::fsutil::SaveError),
    #[error(transparent)]
    NotFinite(#[from] crate::finite::NonFinite),
    /// A material library that is too large, not a regular file or not text.
    #[error(transparent)]
    Unreadable(crate::fsutil::ReadError),
    /// The field is not called `source`: the message already includes it, and a chain
    /// printer would repeat it.
    #[error("cannot read {path}: {error}")]
    Read {
        path: std::path::PathBuf,
        error: std::io::Error,
    },
}

/// How residuals are weighted in the least-squares sum.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Weighting {
    /// Plain pressure residuals: suits a load cell with a constant absolute error; the
    /// high-pressure points dominate and K1 (the low-pressure end) is loosely determined.
    Absolute,
    /// Residuals divided by the measured pressure (floored at 1 % of the largest pressure):
    /// every decade of pressure counts alike. The default, because a wound roll spans the whole
    /// range (kPa near the surface, MPa at the core) and stack tests are run over decades.
    #[default]
    Relative,
}

impl Weighting {
    /// Share of the largest pressure below which relative weights stop growing (zero-pressure
    /// rows would otherwise get an infinite weight).
    pub const RELATIVE_FLOOR: f64 = 0.01;
}

/// Thresholds for the fit's warnings (our own choice, common practice in curve fitting).
#[derive(Debug, Clone, Copy)]
pub struct FitOptions {
    pub weighting: Weighting,
    /// Fewer loading points than this draw a warning (at least 3 are required).
    pub few_points: usize,
    /// R² below this draws a poor-fit warning.
    pub min_r_squared: f64,
    /// A parameter whose standard error exceeds this share of its value draws a warning.
    pub max_relative_standard_error: f64,
}

impl Default for FitOptions {
    fn default() -> Self {
        FitOptions {
            weighting: Weighting::Relative,
            few_points: 8,
            min_r_squared: 0.99,
            max_relative_standard_error: 0.10,
        }
    }
}

/// One point of the fit with its residual (for residual plots).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct FitPoint {
    pub line: usize,
    pub strain: f64,
    /// Measured pressure, Pa.
    pub pressure: f64,
    /// Pressure of the fitted law at this strain, Pa.
    pub fitted: f64,
    /// fitted − measured, Pa.
    pub residual: f64,
    /// Externally studentized residual ([`studentized_residuals`]); `None` where it is not
    /// defined (too few rows, a row the fit must pass through).
    pub studentized: Option<f64>,
}

/// The fitted Pfeiffer law and its quality.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct PfeifferFit {
    /// Pa
    pub k1: f64,
    /// dimensionless
    pub k2: f64,
    /// Standard errors from covariance = s²·(JᵀJ)⁻¹, s² = weighted SSR / (n − 2).
    pub k1_standard_error: f64,
    pub k2_standard_error: f64,
    /// Correlation coefficient between the K1 and K2 estimates.
    pub correlation: f64,
    /// R² of the sum the fit minimised: 1 − Σw²r² / Σw²(P − P̄w)², with the fit's weights w
    /// and the weighted mean P̄w (plain R² for absolute weighting). With relative weights a
    /// plain R² is ruled by the largest pressures: one absurd row gave R² = 1.00000 beside a
    /// 52 MPa RMS residual.
    pub r_squared: f64,
    /// Root-mean-square pressure residual, Pa (unweighted).
    pub rms_residual: f64,
    pub weighting: Weighting,
    /// Log-linear start values (K1, K2).
    pub start: (f64, f64),
    pub iterations: usize,
    /// Loading points used.
    pub points: Vec<FitPoint>,
    /// Rows left out as unloading/reloading.
    pub dropped_unloading: usize,
    /// Lines of the rows flagged as outliers ([`studentized_residuals`] beyond
    /// [`OUTLIER_STUDENTIZED`] and off by [`OUTLIER_FACTOR_SHARE`]); still in the fit.
    pub outliers: Vec<usize>,
    pub warnings: Vec<String>,
}

/// The outlier rule: a row whose externally studentized residual exceeds this in size
/// (common practice for a gross error in a least-squares fit; a normal residual is beyond 4 in
/// fewer than 1 in 10 000 rows).
pub const OUTLIER_STUDENTIZED: f64 = 4.0;

/// ... and whose measured pressure is more than a factor of 2 from the law's (the residual
/// exceeds half the larger of the two): a gross error, not the scatter and slight misfit of
/// an honest test, which the studentized residual alone flags in the demo tests' top rows.
pub const OUTLIER_FACTOR_SHARE: f64 = 0.5;

/// Externally studentized residuals of a least-squares fit with `p` parameters (Belsley, Kuh
/// and Welsch, "Regression Diagnostics", Wiley 1980): t_i = e_i / (s_(i)·√(1 − h_ii)), with
/// e the weighted residuals, h_ii the leverages from the weighted Jacobian J
/// (diagonal of J(JᵀJ)⁻¹Jᵀ) and s_(i)² = (Σe² − e_i²/(1 − h_ii)) / (n − p − 1), the residual
/// variance without row i, so the outlier does not hide itself. `None` for a row with
/// leverage 1 (the fit passes through it whatever it says) or too few rows.
pub fn studentized_residuals(e: &[f64], jacobian: &DMatrix<f64>) -> Vec<Option<f64>> {
    let (n, p) = (e.len(), jacobian.ncols());
    let Some(inverse) = (jacobian.transpose() * jacobian).try_inverse() else {
        return vec![None; n];
    };
    if n < p + 2 || jacobian.nrows() != n {
        return vec![None; n];
    }
    let ssr: f64 = e.iter().map(|v| v * v).sum();
    (0..n)
        .map(|i| {
            let row = jacobian.row(i);
            let h = (row * &inverse * row.transpose())[(0, 0)];
            let free = 1.0 - h;
            if free.is_nan() || free <= 1e-12 {
                return None;
            }
            let s2 = (ssr - e[i] * e[i] / free) / (n - p - 1) as f64;
            (s2 > 0.0).then(|| e[i] / (s2.sqrt() * free.sqrt()))
        })
        .collect()
}

impl PfeifferFit {
    /// The fitted law in the model's terms.
    pub fn radial_stiffness(&self) -> crate::model::RadialStiffness {
        crate::model::RadialStiffness::Pfeiffer {
            k1: self.k1,
            k2: self.k2,
        }
    }
    /// Pressure of the fitted law at `strain` (Pa).
    pub fn pressure_at(&self, strain: f64) -> f64 {
        pfeiffer_pressure(self.k1, self.k2, strain)
    }
    /// Largest measured pressure, Pa (the law is extrapolated beyond it).
    pub fn max_measured_pressure(&self) -> f64 {
        self.points.iter().map(|p| p.pressure).fold(0.0, f64::max)
    }
}

/// Pfeiffer's law P = K1·(e^(K2·ε) − 1).
pub fn pfeiffer_pressure(k1: f64, k2: f64, strain: f64) -> f64 {
    k1 * (k2 * strain).exp_m1()
}

struct PfeifferModel<'a> {
    strain: &'a [f64],
    pressure: &'a [f64],
    weight: &'a [f64],
}

impl LeastSquaresModel for PfeifferModel<'_> {
    fn residuals(&self, x: &DVector<f64>) -> Option<DVector<f64>> {
        let (k1, k2) = (x[0], x[1]);
        if !(k1 > 0.0 && k2 > 0.0) {
            return None;
        }
        let r = DVector::from_iterator(
            self.strain.len(),
            self.strain
                .iter()
                .zip(self.pressure)
                .zip(self.weight)
                .map(|((&e, &p), &w)| w * (pfeiffer_pressure(k1, k2, e) - p)),
        );
        r.iter().all(|v| v.is_finite()).then_some(r)
    }
    fn jacobian(&self, x: &DVector<f64>) -> Option<DMatrix<f64>> {
        let (k1, k2) = (x[0], x[1]);
        let n = self.strain.len();
        let mut j = DMatrix::zeros(n, 2);
        for i in 0..n {
            let e = self.strain[i];
            let w = self.weight[i];
            j[(i, 0)] = w * (k2 * e).exp_m1();
            j[(i, 1)] = w * k1 * e * (k2 * e).exp();
        }
        j.iter().all(|v| v.is_finite()).then_some(j)
    }
}

/// Least-squares line y = a + b·x; returns (a, b).
fn line_fit(x: &[f64], y: &[f64]) -> Option<(f64, f64)> {
    let n = x.len() as f64;
    if x.len() < 2 {
        return None;
    }
    let mx = x.iter().sum::<f64>() / n;
    let my = y.iter().sum::<f64>() / n;
    let sxx: f64 = x.iter().map(|v| (v - mx) * (v - mx)).sum();
    let sxy: f64 = x.iter().zip(y).map(|(a, b)| (a - mx) * (b - my)).sum();
    if sxx <= 0.0 {
        return None;
    }
    let b = sxy / sxx;
    Some((my - b * mx, b))
}

/// Start values from the log-linear form: ln(P + K1) = ln K1 + K2·ε. The first pass drops K1
/// inside the logarithm (valid where e^(K2·ε) ≫ 1); a few fixed-point passes then restore it.
pub fn log_linear_start(strain: &[f64], pressure: &[f64]) -> Option<(f64, f64)> {
    let (xs, ys): (Vec<f64>, Vec<f64>) = strain
        .iter()
        .zip(pressure)
        .filter(|(_, p)| **p > 0.0)
        .map(|(e, p)| (*e, p.ln()))
        .unzip();
    let (a, b) = line_fit(&xs, &ys)?;
    let (mut k1, mut k2) = (a.exp(), b);
    if !(k1.is_finite() && k1 > 0.0 && k2 > 0.0) {
        return None;
    }
    for _ in 0..100 {
        let ys: Vec<f64> = pressure.iter().map(|p| (p + k1).ln()).collect();
        let Some((a, b)) = line_fit(strain, &ys) else {
            break;
        };
        let (n1, n2) = (a.exp(), b);
        if !(n1.is_finite() && n1 > 0.0 && n2 > 0.0) {
            break;
        }
        let change = ((n1 - k1) / k1).abs().max(((n2 - k2) / k2).abs());
        k1 = n1;
        k2 = n2;
        if change < 1e-10 {
            break;
        }
    }
    Some((k1, k2))
}

/// Fit Pfeiffer's law to the loading branch of a stack test.
pub fn fit_pfeiffer(test: &StackTest, options: &FitOptions) -> Result<PfeifferFit, CalibrateError> {
    let branch = loading_branch(test)?;
    let mut warnings = Vec::new();
    if let Some(line) = branch.unloading_from_line {
        warnings.push(format!(
            "unloading starts at line {line}: fitted the loading branch only ({} rows), left out {} unloading/reloading rows",
            branch.points.len(),
            branch.dropped
        ));
    }
    fit_points(
        &test.origin,
        &branch.points,
        options,
        branch.dropped,
        warnings,
    )
}

/// The measured points as the least-squares sum sees them.
struct FitData {
    strain: Vec<f64>,
    pressure: Vec<f64>,
    /// Weight of each residual ([`Weighting`]).
    weight: Vec<f64>,
}

impl FitData {
    /// At least 3 points, 2 of them at a positive pressure; weights by `weighting`.
    fn new(
        origin: &str,
        points: &[StackPoint],
        weighting: Weighting,
    ) -> Result<FitData, CalibrateError> {
        let n = points.len();
        if n < 3 {
            return Err(CalibrateError::TooFewPoints {
                origin: origin.to_string(),
                message: format!(
                    "{n} loading point(s); the two Pfeiffer parameters and their uncertainty need at least 3 (10 or more spread over the pressure range are better)"
                ),
            });
        }
        let strain: Vec<f64> = points.iter().map(|p| p.strain).collect();
        let pressure: Vec<f64> = points.iter().map(|p| p.pressure).collect();
        let positive = pressure.iter().filter(|p| **p > 0.0).count();
        if positive < 2 {
            return Err(CalibrateError::TooFewPoints {
                origin: origin.to_string(),
                message: "fewer than 2 rows with a positive pressure; nothing to fit".into(),
            });
        }
        let max_pressure = pressure.iter().cloned().fold(0.0, f64::max);
        let weight: Vec<f64> = match weighting {
            Weighting::Absolute => vec![1.0; n],
            Weighting::Relative => pressure
                .iter()
                .map(|p| 1.0 / p.max(Weighting::RELATIVE_FLOOR * max_pressure))
                .collect(),
        };
        Ok(FitData {
            strain,
            pressure,
            weight,
        })
    }

    /// Levenberg–Marquardt from the log-linear start; returns the start and the solution.
    fn solve(
        &self,
        origin: &str,
    ) -> Result<((f64, f64), levenberg_marquardt::LmSolution), CalibrateError> {
        let start = log_linear_start(&self.strain, &self.pressure).ok_or_else(|| {
            CalibrateError::FitFailed {
                origin: origin.to_string(),
                message: "no log-linear start: pressure does not rise with strain".into(),
            }
        })?;
        let model = PfeifferModel {
            strain: &self.strain,
            pressure: &self.pressure,
            weight: &self.weight,
        };
        let solution = levenberg_marquardt::minimise(
            &model,
            DVector::from_vec(vec![start.0, start.1]),
            &LmOptions::default(),
        )
        .ok_or_else(|| CalibrateError::FitFailed {
            origin: origin.to_string(),
            message: "the start values are outside the law's domain".into(),
        })?;
        Ok((start, solution))
    }
}

/// Standard errors of K1 and K2 and their correlation. Covariance = s²·(JᵀJ)⁻¹ with s² from
/// the weighted residuals (as SciPy's curve_fit does with absolute_sigma=False); NaN with a
/// warning when JᵀJ is singular.
fn parameter_uncertainty(
    solution: &levenberg_marquardt::LmSolution,
    n: usize,
    warnings: &mut Vec<String>,
) -> (f64, f64, f64) {
    let dof = (n - 2) as f64;
    let s2 = solution.residuals.norm_squared() / dof;
    let normal = solution.jacobian.transpose() * &solution.jacobian;
    match normal.try_inverse() {
        Some(inv) => {
            let v1 = (s2 * inv[(0, 0)]).max(0.0);
            let v2 = (s2 * inv[(1, 1)]).max(0.0);
            let c = if v1 > 0.0 && v2 > 0.0 {
                s2 * inv[(0, 1)] / (v1.sqrt() * v2.sqrt())
            } else {
                0.0
            };
            (v1.sqrt(), v2.sqrt(), c)
        }
        None => {
            warnings.push("the parameters cannot be separated by these data (singular JᵀJ); no uncertainty available".into());
            (f64::NAN, f64::NAN, f64::NAN)
        }
    }
}

/// R² of the weighted sum the fit minimised (see `PfeifferFit::r_squared`).
fn weighted_r_squared(weight: &[f64], pressure: &[f64], fit_points: &[FitPoint]) -> f64 {
    let w2: Vec<f64> = weight.iter().map(|w| w * w).collect();
    let mean = w2.iter().zip(pressure).map(|(w, p)| w * p).sum::<f64>() / w2.iter().sum::<f64>();
    let sst: f64 = w2
        .iter()
        .zip(pressure)
        .map(|(w, p)| w * (p - mean) * (p - mean))
        .sum();
    let weighted_ssr: f64 = w2
        .iter()
        .zip(fit_points)
        .map(|(w, p)| w * p.residual * p.residual)
        .sum();
    if sst > 0.0 {
        1.0 - weighted_ssr / sst
    } else {
        f64::NAN
    }
}

/// Set each point's studentized residual and flag the outliers (beyond
/// [`OUTLIER_STUDENTIZED`] and off by more than [`OUTLIER_FACTOR_SHARE`]) with a warning each;
/// returns their lines.
fn flag_outliers(
    fit_points: &mut [FitPoint],
    weight: &[f64],
    jacobian: &DMatrix<f64>,
    warnings: &mut Vec<String>,
) -> Vec<usize> {
    let weighted: Vec<f64> = weight
        .iter()
        .zip(fit_points.iter())
        .map(|(w, p)| w * p.residual)
        .collect();
    let studentized = studentized_residuals(&weighted, jacobian);
    for (point, t) in fit_points.iter_mut().zip(&studentized) {
        point.studentized = t.filter(|t| t.is_finite());
    }
    let flagged: Vec<(usize, f64)> = studentized
        .into_iter()
        .enumerate()
        .filter_map(|(i, t)| t.filter(|t| t.abs() > OUTLIER_STUDENTIZED).map(|t| (i, t)))
        .filter(|&(i, _)| {
            let p = &fit_points[i];
            p.residual.abs() > OUTLIER_FACTOR_SHARE * p.fitted.abs().max(p.pressure.abs())
        })
        .collect();
    for &(i, score) in &flagged {
        let p = &fit_points[i];
        let stress = |v| {
            crate::units::format_quantity(
                v,
                crate::units::QuantityKind::Stress,
                crate::units::UnitSystem::Si,
            )
        };
        warnings.push(format!(
            "line {}: the measured {} is an outlier (the law gives {}; studentized residual {score:.1}, beyond ±{OUTLIER_STUDENTIZED}, more than a factor of 2 off); check the row, or remove it and fit again",
            p.line,
            stress(p.pressure),
            stress(p.fitted),
        ));
    }
    flagged.iter().map(|&(i, _)| fit_points[i].line).collect()
}

/// Warnings on the fit as a whole: few points, a poor R², a poorly determined parameter,
/// residuals that run in long same-sign stretches.
fn quality_warnings(fit: &PfeifferFit, options: &FitOptions, warnings: &mut Vec<String>) {
    let n = fit.points.len();
    let r_squared = fit.r_squared;
    if n < options.few_points {
        warnings.push(format!(
            "only {n} loading points; the uncertainties are rough — {} or more spread over the pressure range are better",
            options.few_points
        ));
    }
    if r_squared < options.min_r_squared {
        warnings.push(format!(
            "poor fit: R² = {r_squared:.4} is below {}; the exponential law may not describe this material, or the data are noisy",
            options.min_r_squared
        ));
    }
    for (name, value, se) in [
        ("K1", fit.k1, fit.k1_standard_error),
        ("K2", fit.k2, fit.k2_standard_error),
    ] {
        if se.is_finite() && se > options.max_relative_standard_error * value.abs() {
            warnings.push(format!(
                "{name} is poorly determined: its standard error is {:.0} % of its value",
                100.0 * se / value.abs()
            ));
        }
    }
    if let Some(z) = runs_test_z(&fit.points)
        && z < -2.58
    {
        warnings.push(format!(
            "the residuals run in long same-sign stretches (runs test z = {z:.1}): the law misses the curve's shape systematically; check the residuals table"
        ));
    }
}

/// Fit Pfeiffer's law to points already known to be a loading branch.
pub fn fit_points(
    origin: &str,
    points: &[StackPoint],
    options: &FitOptions,
    dropped_unloading: usize,
    mut warnings: Vec<String>,
) -> Result<PfeifferFit, CalibrateError> {
    let n = points.len();
    let data = FitData::new(origin, points, options.weighting)?;
    let (start, solution) = data.solve(origin)?;
    let (k1, k2) = (solution.parameters[0], solution.parameters[1]);
    if !solution.converged {
        warnings.push(format!(
            "the fit stopped after {} iterations without meeting its tolerance; treat the result with care",
            solution.iterations
        ));
    }
    let (k1_se, k2_se, correlation) = parameter_uncertainty(&solution, n, &mut warnings);
    let mut fit_points: Vec<FitPoint> = points
        .iter()
        .map(|p| {
            let fitted = pfeiffer_pressure(k1, k2, p.strain);
            FitPoint {
                line: p.line,
                strain: p.strain,
                pressure: p.pressure,
                fitted,
                residual: fitted - p.pressure,
                studentized: None,
            }
        })
        .collect();
    let r_squared = weighted_r_squared(&data.weight, &data.pressure, &fit_points);
    let ssr: f64 = fit_points.iter().map(|p| p.residual * p.residual).sum();
    let rms_residual = (ssr / n as f64).sqrt();
    let outliers = flag_outliers(
        &mut fit_points,
        &data.weight,
        &solution.jacobian,
        &mut warnings,
    );
    let mut fit = PfeifferFit {
        k1,
        k2,
        k1_standard_error: k1_se,
        k2_standard_error: k2_se,
        correlation,
        r_squared,
        rms_residual,
        weighting: options.weighting,
        start,
        iterations: solution.iterations,
        points: fit_points,
        dropped_unloading,
        outliers,
        warnings: Vec::new(),
    };
    quality_warnings(&fit, options, &mut warnings);
    fit.warnings = warnings;
    Ok(fit)
}

/// Wald–Wolfowitz runs test on the residual signs (Wald & Wolfowitz, Ann. Math. Stat. 11, 1940):
/// z-score of the number of sign runs; strongly negative means systematic misfit.
fn runs_test_z(points: &[FitPoint]) -> Option<f64> {
    let signs: Vec<bool> = points
        .iter()
        .filter(|p| p.residual != 0.0)
        .map(|p| p.residual > 0.0)
        .collect();
    let n_pos = signs.iter().filter(|s| **s).count() as f64;
    let n_neg = signs.len() as f64 - n_pos;
    if n_pos < 2.0 || n_neg < 2.0 || signs.len() < 10 {
        return None;
    }
    let runs = 1.0 + signs.windows(2).filter(|w| w[0] != w[1]).count() as f64;
    let n = n_pos + n_neg;
    let mean = 1.0 + 2.0 * n_pos * n_neg / n;
    let var = (mean - 1.0) * (mean - 2.0) / (n - 1.0);
    (var > 0.0).then(|| (runs - mean) / var.sqrt())
}

/// The fitted law as it is written into a case file.
pub fn radial_stiffness_input(fit: &PfeifferFit) -> crate::case::RadialStiffnessInput {
    crate::case::RadialStiffnessInput {
        law: "pfeiffer".into(),
        k1: Some(crate::case::QuantityText::Text(format!(
            "{} kPa",
            write_case::case_number(significant(fit.k1 / 1e3, 5))
        ))),
        k2: Some(significant(fit.k2, 5)),
        modulus: None,
        coefficient: None,
        exponent: None,
    }
}

/// Round to `digits` significant digits (keeps case files readable without losing the fit).
pub fn significant(value: f64, digits: i32) -> f64 {
    crate::units::round_sig(value, digits)
}

/// Write the fit into a case's `web.radial_stiffness` (in memory; the caller saves).
pub fn apply_to_case(case: &mut crate::case::Case, fit: &PfeifferFit) {
    case.web.radial_stiffness = Some(radial_stiffness_input(fit));
}

/// Read a stack-compression CSV file and fit Pfeiffer's law to it: what
/// `rolltriage calibrate stack` and the terminal UI's calibration both do.
pub fn fit_stack_file(
    path: &std::path::Path,
    read: &StackReadOptions,
    options: &FitOptions,
) -> Result<(StackTest, PfeifferFit), CalibrateError> {
    let text = read_stack_file(path)?;
    let origin = path.display().to_string();
    let test = parse_stack_csv(&text, &origin, read)?;
    let fit = fit_pfeiffer(&test, options)?;
    // Whatever the input checks let through, a non-finite fit is refused, not shown.
    crate::finite::ensure_finite(&format!("the stack fit of {origin}"), &fit)?;
    Ok((test, fit))
}

/// A warning when the stack's caliper and the case's web thickness (m) differ by more than
/// 10 %: the stack is probably another web. `field` names the thickness as the reader knows it.
pub fn caliper_warning(test: &StackTest, thickness: f64, field: &str) -> Option<String> {
    let caliper = test.caliper()?;
    (thickness > 0.0 && (caliper / thickness - 1.0).abs() > 0.10).then(|| {
        format!(
            "the stack's caliper ({:.1} µm) differs from the case's {field} ({:.1} µm) by more \
             than 10 %; is this the same web?",
            caliper * 1e6,
            thickness * 1e6
        )
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn synthetic(k1: f64, k2: f64, n: usize, max_strain: f64) -> Vec<StackPoint> {
        (0..n)
            .map(|i| {
                let e = max_strain * (i + 1) as f64 / n as f64;
                StackPoint {
                    line: i + 2,
                    strain: e,
                    pressure: pfeiffer_pressure(k1, k2, e),
                }
            })
            .collect()
    }

    #[test]
    fn exact_data_are_recovered_to_rounding() {
        let pts = synthetic(5_000.0, 40.0, 20, 0.12);
        let fit = fit_points("t", &pts, &FitOptions::default(), 0, vec![]).unwrap();
        assert!((fit.k1 / 5_000.0 - 1.0).abs() < 1e-8, "{}", fit.k1);
        assert!((fit.k2 / 40.0 - 1.0).abs() < 1e-8, "{}", fit.k2);
        assert!(fit.r_squared > 0.999_999);
    }

    #[test]
    fn log_linear_start_is_exact_on_exact_data() {
        let pts = synthetic(2_000.0, 25.0, 15, 0.2);
        let e: Vec<f64> = pts.iter().map(|p| p.strain).collect();
        let p: Vec<f64> = pts.iter().map(|p| p.pressure).collect();
        let (k1, k2) = log_linear_start(&e, &p).unwrap();
        assert!((k1 / 2_000.0 - 1.0).abs() < 1e-6);
        assert!((k2 / 25.0 - 1.0).abs() < 1e-6);
    }

    #[test]
    fn significant_digits() {
        assert_eq!(significant(12_345.678, 3), 12_300.0);
        assert_eq!(significant(0.012_345, 2), 0.012);
    }

    #[test]
    fn a_stack_file_fits_as_its_text_does() {
        // fit_stack_file is reading the file plus the two calls the command line makes.
        let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
            .join("cases/calibration/harbour_news_45.csv");
        let read = StackReadOptions::default();
        let options = FitOptions::default();
        let (test, fit) = fit_stack_file(&path, &read, &options).unwrap();
        let text = std::fs::read_to_string(&path).unwrap();
        let direct = parse_stack_csv(&text, &path.display().to_string(), &read).unwrap();
        assert_eq!(test.points.len(), direct.points.len());
        assert_eq!(fit.k1, fit_pfeiffer(&direct, &options).unwrap().k1);
        let missing = fit_stack_file(&path.with_extension("none"), &read, &options);
        assert!(matches!(missing, Err(CalibrateError::Read { .. })));
        // The caliper check: a thickness 5 % off is the same web, 25 % off is not (limit 10 %).
        if let Some(caliper) = test.caliper() {
            assert!(caliper_warning(&test, caliper * 1.05, "t").is_none());
            assert!(caliper_warning(&test, caliper * 1.25, "t").is_some());
        }
    }
}
