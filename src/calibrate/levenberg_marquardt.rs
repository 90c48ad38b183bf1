//! A small Levenberg–Marquardt least-squares solver on nalgebra (Marquardt 1963, with
//! Marquardt's diagonal scaling and Nielsen's damping update, Nielsen 1999, IMM-REP-1999-05).
//!
//! Minimises ½·Σ rᵢ(x)² for a residual vector r and its Jacobian J = ∂r/∂x.

use nalgebra::{DMatrix, DVector};

/// Stopping rules and limits.
#[derive(Debug, Clone, Copy)]
pub struct LmOptions {
    pub max_iterations: usize,
    /// Stop when every component of the step is below `step_tolerance·(|x| + step_tolerance)`.
    pub step_tolerance: f64,
    /// Stop when the gradient's largest component is below this (in cost units per unit x).
    pub gradient_tolerance: f64,
    /// Stop when the relative decrease of the cost falls below this.
    pub cost_tolerance: f64,
}

impl Default for LmOptions {
    fn default() -> Self {
        LmOptions {
            max_iterations: 500,
            step_tolerance: 1e-13,
            gradient_tolerance: 1e-30,
            cost_tolerance: 1e-16,
        }
    }
}

/// What the solver found.
#[derive(Debug, Clone)]
pub struct LmSolution {
    pub parameters: DVector<f64>,
    pub residuals: DVector<f64>,
    pub jacobian: DMatrix<f64>,
    pub iterations: usize,
    pub converged: bool,
}

/// Residuals and Jacobian at a point; `None` when the point is outside the model's domain
/// (the solver then treats the step as rejected and raises the damping).
pub trait LeastSquaresModel {
    fn residuals(&self, x: &DVector<f64>) -> Option<DVector<f64>>;
    fn jacobian(&self, x: &DVector<f64>) -> Option<DMatrix<f64>>;
}

/// Run Levenberg–Marquardt from `start`. Returns `None` when the start itself is outside the
/// model's domain.
pub fn minimise(
    model: &dyn LeastSquaresModel,
    start: DVector<f64>,
    options: &LmOptions,
) -> Option<LmSolution> {
    let mut x = start;
    let mut r = model.residuals(&x)?;
    let mut jac = model.jacobian(&x)?;
    let mut cost = 0.5 * r.norm_squared();
    let mut normal = jac.transpose() * &jac;
    let mut gradient = jac.transpose() * &r;
    let largest_diagonal = normal.diagonal().iter().cloned().fold(0.0_f64, f64::max);
    let mut damping = 1e-3 * largest_diagonal.max(f64::MIN_POSITIVE);
    let mut growth = 2.0;
    let mut converged = false;
    let mut iterations = 0;

    while iterations < options.max_iterations {
        iterations += 1;
        if gradient.amax() <= options.gradient_tolerance {
            converged = true;
            break;
        }
        // Marquardt scaling: damp each parameter in proportion to its own curvature, which keeps
        // the step invariant to the parameters' units (K1 in Pa and K2 dimensionless).
        let mut damped = normal.clone();
        for i in 0..damped.nrows() {
            let d = normal[(i, i)].max(1e-300);
            damped[(i, i)] += damping * d;
        }
        let step = match damped.cholesky() {
            Some(c) => c.solve(&(-&gradient)),
            None => {
                damping *= growth;
                growth *= 2.0;
                continue;
            }
        };
        let small_step = step
            .iter()
            .zip(x.iter())
            .all(|(s, xi)| s.abs() <= options.step_tolerance * (xi.abs() + options.step_tolerance));
        if small_step {
            converged = true;
            break;
        }
        let trial = &x + &step;
        let trial_residuals = model.residuals(&trial);
        let trial_cost = trial_residuals
            .as_ref()
            .map(|tr| 0.5 * tr.norm_squared())
            .filter(|c| c.is_finite());
        // Predicted decrease of the local quadratic model: ½·δᵀ(λ·D·δ − g).
        let mut scaled = step.clone();
        for i in 0..scaled.len() {
            scaled[i] *= damping * normal[(i, i)].max(1e-300);
        }
        let predicted = 0.5 * step.dot(&(scaled - &gradient));
        match (trial_residuals, trial_cost) {
            (Some(tr), Some(tc)) if tc < cost && predicted > 0.0 => {
                let gain = (cost - tc) / predicted;
                let Some(trial_jacobian) = model.jacobian(&trial) else {
                    damping *= growth;
                    growth *= 2.0;
                    continue;
                };
                let relative_decrease = (cost - tc) / cost.max(f64::MIN_POSITIVE);
                x = trial;
                r = tr;
                jac = trial_jacobian;
                cost = tc;
                normal = jac.transpose() * &jac;
                gradient = jac.transpose() * &r;
                damping *= (1.0_f64 / 3.0).max(1.0 - (2.0 * gain - 1.0).powi(3));
                growth = 2.0;
                if relative_decrease < options.cost_tolerance {
                    converged = true;
                    break;
                }
            }
            _ => {
                damping *= growth;
                growth *= 2.0;
                if !damping.is_finite() {
                    break;
                }
            }
        }
    }
    Some(LmSolution {
        parameters: x,
        residuals: r,
        jacobian: jac,
        iterations,
        converged,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Rosenbrock as a least-squares problem: r = (10(x2 − x1²), 1 − x1); minimum at (1, 1)
    /// (Rosenbrock 1960, the usual test function).
    struct Rosenbrock;
    impl LeastSquaresModel for Rosenbrock {
        fn residuals(&self, x: &DVector<f64>) -> Option<DVector<f64>> {
            Some(DVector::from_vec(vec![
                10.0 * (x[1] - x[0] * x[0]),
                1.0 - x[0],
            ]))
        }
        fn jacobian(&self, x: &DVector<f64>) -> Option<DMatrix<f64>> {
            Some(DMatrix::from_row_slice(
                2,
                2,
                &[-20.0 * x[0], 10.0, -1.0, 0.0],
            ))
        }
    }

    #[test]
    fn finds_the_rosenbrock_minimum() {
        let s = minimise(
            &Rosenbrock,
            DVector::from_vec(vec![-1.2, 1.0]),
            &LmOptions::default(),
        )
        .unwrap();
        assert!(s.converged);
        assert!((s.parameters[0] - 1.0).abs() < 1e-8);
        assert!((s.parameters[1] - 1.0).abs() < 1e-8);
    }
}
