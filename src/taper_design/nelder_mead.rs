//! Bounded Nelder–Mead simplex search (Nelder & Mead, Computer Journal 7:308, 1965) on the unit
//! box: trial points are clamped into [0, 1]ⁿ, so the search never leaves the allowed range.

/// Minimise `f` over [0, 1]ⁿ from `start` with an initial simplex of edge `step`. Stops after
/// `max_evaluations` or when the simplex's values and size both shrink below `tolerance`.
/// Returns the best point and its value.
pub fn minimise(
    f: &mut dyn FnMut(&[f64]) -> f64,
    start: &[f64],
    step: f64,
    tolerance: f64,
    max_evaluations: usize,
) -> (Vec<f64>, f64) {
    let n = start.len();
    let clamp = |x: Vec<f64>| -> Vec<f64> { x.into_iter().map(|v| v.clamp(0.0, 1.0)).collect() };
    let mut evaluations = 0usize;
    let mut eval = |x: &[f64], evaluations: &mut usize| {
        *evaluations += 1;
        let v = f(x);
        if v.is_nan() { f64::INFINITY } else { v }
    };
    let mut simplex: Vec<(Vec<f64>, f64)> = Vec::with_capacity(n + 1);
    let x0 = clamp(start.to_vec());
    let v0 = eval(&x0, &mut evaluations);
    simplex.push((x0.clone(), v0));
    for i in 0..n {
        let mut x = x0.clone();
        // Step inward when the start sits on the upper bound.
        x[i] = if x[i] + step <= 1.0 {
            x[i] + step
        } else {
            x[i] - step
        };
        let x = clamp(x);
        let v = eval(&x, &mut evaluations);
        simplex.push((x, v));
    }
    while evaluations < max_evaluations {
        simplex.sort_by(|a, b| a.1.total_cmp(&b.1));
        let best = simplex[0].1;
        let worst = simplex[n].1;
        let size = simplex
            .iter()
            .skip(1)
            .map(|(x, _)| {
                x.iter()
                    .zip(&simplex[0].0)
                    .map(|(a, b)| (a - b).abs())
                    .fold(0.0, f64::max)
            })
            .fold(0.0, f64::max);
        if (worst - best).abs() <= tolerance && size <= tolerance {
            break;
        }
        let centroid: Vec<f64> = (0..n)
            .map(|j| simplex[..n].iter().map(|(x, _)| x[j]).sum::<f64>() / n as f64)
            .collect();
        let along = |t: f64| -> Vec<f64> {
            clamp(
                centroid
                    .iter()
                    .zip(&simplex[n].0)
                    .map(|(c, w)| c + t * (c - w))
                    .collect(),
            )
        };
        let reflected = along(1.0);
        let vr = eval(&reflected, &mut evaluations);
        if vr < simplex[0].1 {
            let expanded = along(2.0);
            let ve = eval(&expanded, &mut evaluations);
            simplex[n] = if ve < vr {
                (expanded, ve)
            } else {
                (reflected, vr)
            };
        } else if vr < simplex[n - 1].1 {
            simplex[n] = (reflected, vr);
        } else {
            let (contracted, vc) = if vr < simplex[n].1 {
                let c = along(0.5);
                let v = eval(&c, &mut evaluations);
                (c, v)
            } else {
                let c = along(-0.5);
                let v = eval(&c, &mut evaluations);
                (c, v)
            };
            if vc < simplex[n].1.min(vr) {
                simplex[n] = (contracted, vc);
            } else {
                // Shrink towards the best point.
                let best_x = simplex[0].0.clone();
                for item in simplex.iter_mut().skip(1) {
                    let x: Vec<f64> = item
                        .0
                        .iter()
                        .zip(&best_x)
                        .map(|(a, b)| b + 0.5 * (a - b))
                        .collect();
                    let v = eval(&x, &mut evaluations);
                    *item = (x, v);
                }
            }
        }
    }
    simplex.sort_by(|a, b| a.1.total_cmp(&b.1));
    simplex.swap_remove(0)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn finds_an_interior_minimum() {
        let mut f = |x: &[f64]| (x[0] - 0.3).powi(2) + 2.0 * (x[1] - 0.7).powi(2);
        let (x, v) = minimise(&mut f, &[0.9, 0.1], 0.2, 1e-9, 500);
        assert!(
            (x[0] - 0.3).abs() < 1e-4 && (x[1] - 0.7).abs() < 1e-4,
            "{x:?}"
        );
        assert!(v < 1e-8);
    }

    #[test]
    fn stays_in_the_box_for_a_minimum_outside_it() {
        let mut f = |x: &[f64]| (x[0] - 1.5).powi(2) + (x[1] + 0.5).powi(2);
        let (x, _) = minimise(&mut f, &[0.5, 0.5], 0.2, 1e-9, 500);
        assert!((x[0] - 1.0).abs() < 1e-3 && x[1].abs() < 1e-3, "{x:?}");
    }
}
