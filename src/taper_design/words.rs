//! The design in words: conflicting limits and what to relax, the operator's table, and the
//! plain-words explanation.

use super::*;

/// Find the pair of limits that no searched schedule meets together (the most conflicting one),
/// and what each would have to be relaxed to.
pub(super) fn find_conflict(cx: &Context, trials: &[Trial], k: Corrections) -> Conflict {
    let (case, limits) = (cx.case, cx.limits);
    let margins: Vec<[f64; 4]> = trials.iter().map(|t| t.margins(k, cx)).collect();
    let values: Vec<[f64; 4]> = trials.iter().map(|t| t.values(k)).collect();
    let best_pair = |a: Limit, b: Limit| {
        margins
            .iter()
            .map(|m| m[a.index()].min(m[b.index()]))
            .fold(f64::NEG_INFINITY, f64::max)
    };
    // A limit that fails on its own comes first.
    let mut worst: Option<(Limit, Limit, f64)> = None;
    for a in Limit::ALL {
        let m = best_pair(a, a);
        if m < 0.0 && worst.is_none_or(|w| m < w.2) {
            worst = Some((a, a, m));
        }
    }
    if worst.is_none() {
        for (i, a) in Limit::ALL.iter().enumerate() {
            for b in Limit::ALL.iter().skip(i + 1) {
                let m = best_pair(*a, *b);
                if worst.is_none_or(|w| m < w.2) {
                    worst = Some((*a, *b, m));
                }
            }
        }
    }
    let (first, second, best_margin) =
        worst.unwrap_or((Limit::CorePressure, Limit::Telescoping, 0.0));
    let mut advice = Vec::new();
    if first == second {
        advice.push(format!(
            "{} cannot be met by any searched schedule on its own (best margin {:.0} %); relax {} or change the roll (core, web or roll size)",
            first.title(),
            100.0 * best_margin,
            first.option()
        ));
    } else {
        for (relax, keep) in [(first, second), (second, first)] {
            // Best value of `relax` among schedules that meet `keep`.
            let best = (0..trials.len())
                .filter(|&i| margins[i][keep.index()] >= 0.0)
                .max_by(|&x, &y| margins[x][relax.index()].total_cmp(&margins[y][relax.index()]));
            if let Some(i) = best {
                advice.push(relax_advice(
                    case,
                    limits,
                    relax,
                    keep,
                    values[i][relax.index()],
                ));
            }
        }
        if best_margin >= 0.0 {
            advice.push(
                "each pair can be met, but not all four together; relax either of the named limits"
                    .into(),
            );
        }
    }
    Conflict {
        first,
        second,
        best_margin,
        advice,
    }
}

fn kpa(p: f64) -> String {
    crate::units::format_quantity(
        p,
        crate::units::QuantityKind::Stress,
        crate::units::UnitSystem::Si,
    )
}

fn relax_advice(
    case: &ResolvedCase,
    limits: &TaperLimits,
    relax: Limit,
    keep: Limit,
    best: f64,
) -> String {
    let keeping = format!("While {} is met", keep.title());
    match relax {
        Limit::CorePressure => {
            let share = best / case.core.crush_pressure;
            let stronger = kpa(best / limits.core_share);
            if share <= 1.0 {
                format!(
                    "{keeping}, the core pressure is at least {}: raise {} to {:.2} (now {:.2}) or use a core rated for {stronger} or more",
                    kpa(best),
                    relax.option(),
                    share,
                    limits.core_share,
                )
            } else {
                format!(
                    "{keeping}, the core pressure is at least {}, above the core's rating: use a core rated for {stronger} or more",
                    kpa(best),
                )
            }
        }
        Limit::Telescoping => format!(
            "{keeping}, the telescoping margin reaches at most {:.2}: lower {} to that (now {:.2}), or handle the rolls more gently",
            best,
            relax.option(),
            limits.min_telescoping_margin
        ),
        Limit::WoundInTension => format!(
            "{keeping}, the wound-in tension must reach {:.0} N/m: raise {} to {:.2} (now {:.2}) if the web's strength allows it",
            best,
            relax.option(),
            best / case.web.strength,
            limits.tension_share
        ),
        Limit::Starring => format!(
            "{keeping}, a compressive low-pressure band of {:.0} % of the build remains: relax the other limit, or change the core or web",
            100.0 * best
        ),
    }
}

/// Tension against diameter for the operator: one row per step, or eleven rows across the build.
pub fn operator_table(
    schedule: &TensionSchedule,
    rc: f64,
    big_r: f64,
    steps: Option<usize>,
) -> Vec<ScheduleRow> {
    match (&schedule.taper, steps) {
        (Taper::Steps { steps }, _) => {
            let mut rows = vec![ScheduleRow {
                diameter: 2.0 * rc,
                tension: schedule.start_tension,
            }];
            rows.extend(steps.iter().map(|s| ScheduleRow {
                diameter: 2.0 * s.radius,
                tension: s.tension,
            }));
            rows
        }
        (Taper::Programme { points }, _) => points
            .iter()
            .map(|p| ScheduleRow {
                diameter: 2.0 * p.radius,
                tension: p.tension,
            })
            .collect(),
        _ => (0..=10)
            .map(|k| {
                let r = rc + (big_r - rc) * k as f64 / 10.0;
                ScheduleRow {
                    diameter: 2.0 * r,
                    tension: schedule.scheduled_tension_at(r, rc, big_r),
                }
            })
            .collect(),
    }
}

#[allow(clippy::too_many_arguments)]
pub(super) fn explain(
    case: &ResolvedCase,
    before: &Evaluation,
    after: &Evaluation,
    feasible: bool,
    binding: &[Limit],
    conflict: Option<&Conflict>,
    trial: Trial,
    target: f64,
) -> Vec<String> {
    let mut out = Vec::new();
    if before.all_met() {
        out.push("The current schedule already meets every limit.".to_string());
    } else {
        let failed: Vec<&str> = before
            .checks
            .iter()
            .filter(|c| !c.met)
            .map(|c| c.limit.title())
            .collect();
        out.push(format!(
            "The current schedule fails: {}.",
            failed.join(", ")
        ));
    }
    if feasible {
        out.push(format!(
            "Designed: start {:.0} N/m with {:.0} % taper (the current start is {:.0} N/m); it meets every limit when re-solved.",
            trial.start,
            100.0 * trial.fraction,
            case.winding.tension.start_tension
        ));
        if (trial.start / target - 1.0).abs() < 0.02 {
            out.push(
                "The start tension is kept; the taper is the smallest change from the current one that meets the limits."
                    .into(),
            );
        } else {
            out.push(
                "Taper alone cannot meet the limits at the current start tension, so the start tension moves too."
                    .into(),
            );
        }
        for limit in binding {
            let why = match limit {
                Limit::CorePressure => {
                    "more start tension or less taper would load the core beyond the chosen share of its crush rating"
                }
                Limit::Telescoping => {
                    "less tension (lower start or more taper) would leave some layers too loosely held to carry the roll's weight in handling (telescoping)"
                }
                Limit::WoundInTension => {
                    "a higher start tension would exceed the web's safe share of its strength"
                }
                Limit::Starring => {
                    "a different taper would open a band of compressive tangential stress at low pressure"
                }
            };
            if let Some(c) = after.check(*limit) {
                out.push(format!(
                    "Binding: {} ({:.0} % to spare): {why}.",
                    limit.title(),
                    100.0 * c.margin
                ));
            }
        }
        if binding.contains(&Limit::WoundInTension)
            && let (Some(nip), Some(wit)) =
                (case.winding.nip_load, after.check(Limit::WoundInTension))
        {
            let nip_part = if nip > 0.0 {
                case.nip_induced_tension_at_core()
            } else {
                0.0
            };
            if nip_part > 0.25 * wit.value {
                out.push(format!(
                    "The nip adds about {nip_part:.0} N/m (kinetic friction × nip load) to the wound-in tension; a lighter nip would leave room for more web tension."
                ));
            }
        }
    } else if let Some(c) = conflict {
        if c.first == c.second {
            out.push(format!(
                "No schedule meets every limit: {} cannot be met.",
                c.first.title()
            ));
        } else {
            out.push(format!(
                "No schedule meets every limit: {} and {} conflict — what one needs, the other forbids.",
                c.first.title(),
                c.second.title()
            ));
        }
        out.extend(c.advice.iter().cloned());
    }
    out
}
