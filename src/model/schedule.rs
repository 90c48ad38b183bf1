//! Web tension versus radius: constant, linear taper, hyperbolic taper, steps, a tension
//! programme (a table of diameter and tension, as winders' recipes store it), upset bands.

/// How tension falls from the core to the outside.
#[derive(Debug, Clone, PartialEq, Default, serde::Serialize, serde::Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum Taper {
    /// Constant tension.
    #[default]
    None,
    /// Tension falls linearly with radius by `fraction` (0..=1) of the starting value at the outside.
    Linear { fraction: f64 },
    /// T(r) = T0·(1 − fraction·(1 − rc/r)) — implementer documents the exact form (constant
    /// torque is the limit fraction = 1).
    Hyperbolic { fraction: f64 },
    /// Tension steps: from `radius` (m) outward the tension is `tension` (N/m).
    Steps { steps: Vec<TensionStep> },
    /// Tension programme: tension (N/m) given at radii (m), strictly increasing, interpolated
    /// linearly in radius between points and held flat inside the first and outside the last.
    Programme { points: Vec<TensionStep> },
}

#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct TensionStep {
    pub radius: f64,
    pub tension: f64,
}

/// A band of radii wound at a different tension (a tension upset: spike or drop).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct UpsetBand {
    pub from_radius: f64,
    pub to_radius: f64,
    /// Web tension inside the band (N/m).
    pub tension: f64,
}

/// Step lists up to this long are looked up by a plain scan and may be in any order; longer
/// ones must be in increasing radius and are searched by bisection.
pub const SHORT_STEP_LIST: usize = 32;

/// Web tension as a function of radius.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct TensionSchedule {
    /// Web tension at the core (N/m).
    pub start_tension: f64,
    pub taper: Taper,
    pub upsets: Vec<UpsetBand>,
}

impl TensionSchedule {
    /// A constant tension with no taper and no upsets.
    pub fn constant(tension: f64) -> Self {
        TensionSchedule {
            start_tension: tension,
            taper: Taper::None,
            upsets: Vec::new(),
        }
    }

    /// Web tension (N/m) at radius `radius` of a roll wound from `core_radius` to `outer_radius`.
    ///
    /// * linear: T = T0·(1 − f·(r − rc)/(R − rc)), so the outermost wrap runs at (1 − f)·T0;
    /// * hyperbolic: T = T0·(1 − f·(1 − rc/r)); f = 1 is constant torque (T·r constant);
    /// * steps: T0 until the first step radius, then each step's tension from its radius outward
    ///   (see [`TensionSchedule::scheduled_tension_at`] for long step lists);
    /// * programme: linear interpolation in radius between the table's points, the first
    ///   point's tension inside it and the last point's outside it (T0 only for an empty table);
    /// * an upset band overrides the schedule for from_radius ≤ r < to_radius (last band wins).
    pub fn tension_at(&self, radius: f64, core_radius: f64, outer_radius: f64) -> f64 {
        let mut tension = self.scheduled_tension_at(radius, core_radius, outer_radius);
        for band in &self.upsets {
            if radius >= band.from_radius && radius < band.to_radius {
                tension = band.tension;
            }
        }
        tension.max(0.0)
    }

    /// The schedule's web tension (N/m) at `radius`, upsets left out (what the operator sets):
    /// the taper law of the crate, written once (see [`TensionSchedule::tension_at`]). Among
    /// steps, the one with the largest radius at or below `radius` applies; of two steps at the
    /// same radius the later one. Lists of more than [`SHORT_STEP_LIST`] steps must be in
    /// increasing radius ([`TensionSchedule::validate`] refuses them otherwise, and the case
    /// file requires it anyway): their step is found by binary search, so a solve costs
    /// wraps × log(steps) rather than wraps × steps.
    pub fn scheduled_tension_at(&self, radius: f64, core_radius: f64, outer_radius: f64) -> f64 {
        let t0 = self.start_tension;
        let tension = match &self.taper {
            Taper::None => t0,
            Taper::Linear { fraction } => {
                let span = (outer_radius - core_radius).max(f64::MIN_POSITIVE);
                let build = ((radius - core_radius) / span).clamp(0.0, 1.0);
                t0 * (1.0 - fraction * build)
            }
            Taper::Hyperbolic { fraction } => {
                t0 * (1.0 - fraction * (1.0 - core_radius / radius.max(core_radius)))
            }
            Taper::Steps { steps } if steps.len() <= SHORT_STEP_LIST => {
                // Any order: the largest radius at or below `radius`, the later on a tie.
                let mut value = t0;
                let mut best = f64::NEG_INFINITY;
                for step in steps {
                    if step.radius <= radius && step.radius >= best {
                        best = step.radius;
                        value = step.tension;
                    }
                }
                value
            }
            Taper::Steps { steps } => {
                // In increasing radius: the last step at or inside `radius`.
                match steps.partition_point(|step| step.radius <= radius) {
                    0 => t0,
                    after => steps[after - 1].tension,
                }
            }
            Taper::Programme { points } => programme_tension(points, radius, t0),
        };
        tension.max(0.0)
    }

    /// Check the schedule; names the field and the accepted range on failure.
    pub fn validate(&self) -> Result<(), super::ModelError> {
        use super::ModelError::OutOfRange;
        let tension = |field: &'static str, value: f64| {
            if value.is_finite() && value >= 0.0 {
                Ok(())
            } else {
                Err(OutOfRange {
                    field,
                    value,
                    accepted: "a finite tension ≥ 0 N/m",
                })
            }
        };
        tension("winding.tension", self.start_tension)?;
        match &self.taper {
            Taper::None => {}
            Taper::Linear { fraction } | Taper::Hyperbolic { fraction } => {
                if !(fraction.is_finite() && (0.0..=1.0).contains(fraction)) {
                    return Err(OutOfRange {
                        field: "winding.taper.amount",
                        value: *fraction,
                        accepted: "0 to 100 %",
                    });
                }
            }
            Taper::Programme { .. } => {}
            Taper::Steps { steps } => {
                let mut previous = f64::NEG_INFINITY;
                for step in steps {
                    tension("winding.taper.steps.tension", step.tension)?;
                    if !(step.radius.is_finite() && step.radius >= 0.0) {
                        return Err(OutOfRange {
                            field: "winding.taper.steps.from_diameter",
                            value: step.radius,
                            accepted: "a finite diameter ≥ 0",
                        });
                    }
                    // The binary search of long lists relies on this order.
                    if step.radius < previous && steps.len() > SHORT_STEP_LIST {
                        return Err(OutOfRange {
                            field: "winding.taper.steps.from_diameter",
                            value: step.radius,
                            accepted: "diameters increasing from the core outward",
                        });
                    }
                    previous = step.radius;
                }
            }
        }
        if let Taper::Programme { points } = &self.taper {
            if points.is_empty() {
                return Err(OutOfRange {
                    field: "winding.taper.points",
                    value: 0.0,
                    accepted: "at least one point",
                });
            }
            let mut previous = f64::NEG_INFINITY;
            for point in points {
                tension("winding.taper.points.tension", point.tension)?;
                // Interpolation and the bisection rely on strictly increasing radii.
                if !(point.radius.is_finite() && point.radius > 0.0 && point.radius > previous) {
                    return Err(OutOfRange {
                        field: "winding.taper.points.diameter",
                        value: 2.0 * point.radius,
                        accepted: "finite diameters > 0, increasing from the core outward",
                    });
                }
                previous = point.radius;
            }
        }
        for band in &self.upsets {
            tension("winding.upsets.tension", band.tension)?;
            if !(band.from_radius.is_finite()
                && band.to_radius.is_finite()
                && band.to_radius > band.from_radius)
            {
                return Err(OutOfRange {
                    field: "winding.upsets.to_diameter",
                    value: band.to_radius,
                    accepted: "a finite diameter larger than from_diameter",
                });
            }
        }
        Ok(())
    }
}

/// Tension of a programme at `radius`: the two points around it found by bisection (points in
/// increasing radius), linear between them; the end values held beyond the ends; `fallback`
/// for an empty table.
fn programme_tension(points: &[TensionStep], radius: f64, fallback: f64) -> f64 {
    let (Some(first), Some(last)) = (points.first(), points.last()) else {
        return fallback;
    };
    if radius <= first.radius {
        return first.tension;
    }
    if radius >= last.radius {
        return last.tension;
    }
    // First point with a radius above `radius`: 1 ≤ after ≤ len − 1 here.
    let after = points.partition_point(|p| p.radius <= radius);
    let (a, b) = (&points[after - 1], &points[after]);
    let t = (radius - a.radius) / (b.radius - a.radius);
    a.tension + t * (b.tension - a.tension)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn schedules_give_the_documented_tensions() {
        let rc = 0.05;
        let big_r = 0.2;
        let mut s = TensionSchedule::constant(200.0);
        assert_eq!(s.tension_at(0.1, rc, big_r), 200.0);
        s.taper = Taper::Linear { fraction: 0.25 };
        assert!((s.tension_at(big_r, rc, big_r) - 150.0).abs() < 1e-9);
        s.taper = Taper::Hyperbolic { fraction: 1.0 };
        // Constant torque: T·r constant.
        assert!((s.tension_at(0.1, rc, big_r) * 0.1 - 200.0 * rc).abs() < 1e-9);
        s.taper = Taper::Steps {
            steps: vec![TensionStep {
                radius: 0.1,
                tension: 120.0,
            }],
        };
        assert_eq!(s.tension_at(0.099, rc, big_r), 200.0);
        assert_eq!(s.tension_at(0.1, rc, big_r), 120.0);
        s.upsets.push(UpsetBand {
            from_radius: 0.15,
            to_radius: 0.16,
            tension: 400.0,
        });
        assert_eq!(s.tension_at(0.155, rc, big_r), 400.0);
        assert_eq!(s.tension_at(0.16, rc, big_r), 120.0);
        assert_eq!(s.scheduled_tension_at(0.155, rc, big_r), 120.0);
    }

    #[test]
    fn steps_apply_by_radius_not_by_list_order() {
        // Steps listed out of order: the step with the largest radius at or below r applies.
        let s = TensionSchedule {
            start_tension: 300.0,
            taper: Taper::Steps {
                steps: vec![
                    TensionStep {
                        radius: 0.15,
                        tension: 100.0,
                    },
                    TensionStep {
                        radius: 0.10,
                        tension: 200.0,
                    },
                ],
            },
            upsets: Vec::new(),
        };
        assert_eq!(s.scheduled_tension_at(0.12, 0.05, 0.2), 200.0);
        assert_eq!(s.scheduled_tension_at(0.16, 0.05, 0.2), 100.0);
        assert_eq!(s.scheduled_tension_at(0.06, 0.05, 0.2), 300.0);
    }

    /// The step lookup by binary search gives what the plain definition gives (the last step
    /// at or inside the radius; T0 inside the first), for many steps and radii on and
    /// between the step radii.
    #[test]
    fn step_lookup_matches_the_definition() {
        let (rc, big_r) = (0.05, 0.6);
        let steps: Vec<TensionStep> = (1..2000)
            .map(|k| TensionStep {
                radius: rc + (big_r - rc) * k as f64 / 2000.0,
                tension: 100.0 + (k % 37) as f64,
            })
            .collect();
        let definition = |r: f64| {
            steps
                .iter()
                .rev()
                .find(|s| s.radius <= r)
                .map_or(250.0, |s| s.tension)
        };
        let s = TensionSchedule {
            start_tension: 250.0,
            taper: Taper::Steps {
                steps: steps.clone(),
            },
            upsets: Vec::new(),
        };
        for i in 0..=20_000 {
            let r = rc + (big_r - rc) * i as f64 / 20_000.0;
            assert_eq!(s.tension_at(r, rc, big_r), definition(r), "r = {r}");
        }
        for step in &steps {
            assert_eq!(s.tension_at(step.radius, rc, big_r), step.tension);
        }
    }

    #[test]
    fn programme_interpolates_and_holds() {
        // Hand check: points (0.1 m, 300 N/m) and (0.3 m, 100 N/m); at 0.15 m a quarter of the
        // way: 300 − 0.25·200 = 250 N/m; held at 300 inside 0.1 m and at 100 outside 0.3 m.
        let point = |radius, tension| TensionStep { radius, tension };
        let s = TensionSchedule {
            start_tension: 999.0,
            taper: Taper::Programme {
                points: vec![point(0.1, 300.0), point(0.3, 100.0)],
            },
            upsets: Vec::new(),
        };
        assert!((s.tension_at(0.15, 0.05, 0.4) - 250.0).abs() < 1e-9);
        assert_eq!(s.tension_at(0.05, 0.05, 0.4), 300.0);
        assert_eq!(s.tension_at(0.3, 0.05, 0.4), 100.0);
        assert_eq!(s.tension_at(0.4, 0.05, 0.4), 100.0);
        assert!(s.validate().is_ok());
        let mut bad = s.clone();
        bad.taper = Taper::Programme {
            points: vec![point(0.3, 300.0), point(0.1, 100.0)],
        };
        assert!(
            bad.validate()
                .unwrap_err()
                .to_string()
                .contains("increasing")
        );
        bad.taper = Taper::Programme { points: Vec::new() };
        assert!(bad.validate().is_err());
    }

    #[test]
    fn long_step_lists_out_of_order_are_refused() {
        let mut steps: Vec<TensionStep> = (0..=SHORT_STEP_LIST)
            .map(|k| TensionStep {
                radius: 0.1 + 0.001 * k as f64,
                tension: 150.0,
            })
            .collect();
        let mut s = TensionSchedule {
            start_tension: 250.0,
            taper: Taper::Steps {
                steps: steps.clone(),
            },
            upsets: Vec::new(),
        };
        assert!(s.validate().is_ok());
        steps.swap(0, 5);
        s.taper = Taper::Steps { steps };
        let error = s.validate().unwrap_err().to_string();
        assert!(error.contains("increasing"), "{error}");
    }
}
