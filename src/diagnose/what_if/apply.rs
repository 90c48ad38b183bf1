//! Setting changes applied to a case: the rule base's remedy changes and the what-if screen's
//! steps each change a copy of the *resolved* case, and one writer
//! ([`write_into_case`]) carries a changed resolved case back into the case file, so a change
//! means the same thing whether it is solved or kept.

use super::super::rules::{RuleBase, SettingChange};
use crate::case::{Case, QuantityText, ResolvedCase, TaperInput};
use crate::model::{CoreStiffness, Taper, UpsetBand};
use crate::units::{QuantityKind, UnitSystem, compact_stress, format_quantity, sig3};

/// Why a setting change cannot be tried or written into the case file.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum WhatIfError {
    #[error("the taper is a list of steps or a tension programme; edit it in the case file")]
    SteppedTaper,
    #[error("the core is rigid: a stiffer core changes nothing")]
    RigidCore,
    #[error("tension steps or upset bands: change them in the case file")]
    TensionBands,
    #[error("a core-zone tension band cannot be kept automatically: add it to the case file")]
    CoreZoneBand,
}

/// A winder setting the what-if screen steps up and down.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Setting {
    Tension,
    Taper,
    NipLoad,
    Core,
    Speed,
}

impl Setting {
    pub const ALL: [Setting; 5] = [
        Setting::Tension,
        Setting::Taper,
        Setting::NipLoad,
        Setting::Core,
        Setting::Speed,
    ];

    pub fn label(self) -> &'static str {
        match self {
            Setting::Tension => "Web tension",
            Setting::Taper => "Taper",
            Setting::NipLoad => "Nip load",
            Setting::Core => "Core",
            Setting::Speed => "Line speed",
        }
    }

    /// What one step does, for the help text.
    pub fn step_text(self) -> &'static str {
        match self {
            Setting::Tension => "±10 % per step",
            Setting::Taper => "±5 points per step",
            Setting::NipLoad => "±20 % per step",
            Setting::Core => "core stiffness ×2 / ÷2 per step, same size",
            Setting::Speed => "±10 % per step",
        }
    }
}

/// One setting moved by a number of steps from the case as it stands.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct SettingStep {
    pub setting: Setting,
    pub steps: i32,
}

/// A light nip to start from when the case has none: the first step up gives 1 pli
/// (175.1 N/m).
const LIGHT_NIP: f64 = 175.126_835_3 / 1.2;

/// The resolved case with `step` applied, and the change in plain words
/// ("Web tension 525 N/m → 578 N/m").
pub fn apply_step(
    resolved: &ResolvedCase,
    step: SettingStep,
    units: UnitSystem,
) -> Result<(ResolvedCase, String), WhatIfError> {
    let mut out = resolved.clone();
    let steps = f64::from(step.steps);
    let fmt = |v: f64, kind| format_quantity(v, kind, units);
    let description = match step.setting {
        Setting::Tension => {
            let before = resolved.winding.tension.start_tension;
            let after = (before * (1.0 + 0.1 * steps)).max(before * 0.1);
            out.winding.tension.start_tension = after;
            format!(
                "Web tension {} → {}",
                fmt(before, QuantityKind::ForcePerWidth),
                fmt(after, QuantityKind::ForcePerWidth)
            )
        }
        Setting::Taper => {
            // A roll without taper is tried with a hyperbolic one (constant-torque winders).
            let (kind, before) = match &resolved.winding.tension.taper {
                Taper::None => ("hyperbolic", 0.0),
                Taper::Linear { fraction } => ("linear", *fraction),
                Taper::Hyperbolic { fraction } => ("hyperbolic", *fraction),
                Taper::Steps { .. } | Taper::Programme { .. } => {
                    return Err(WhatIfError::SteppedTaper);
                }
            };
            let after = (before + 0.05 * steps).clamp(0.0, 0.9);
            out.winding.tension.taper = match kind {
                _ if after == 0.0 => Taper::None,
                "linear" => Taper::Linear { fraction: after },
                _ => Taper::Hyperbolic { fraction: after },
            };
            format!(
                "Taper {:.0} % → {:.0} % ({kind})",
                before * 100.0,
                after * 100.0
            )
        }
        Setting::NipLoad => {
            let before = resolved.winding.nip_load;
            let after = before.unwrap_or(LIGHT_NIP) * 1.2_f64.powf(steps);
            let after = (after >= 1.0).then_some(after);
            out.winding.nip_load = after;
            let text = |v: Option<f64>| {
                v.map_or("none".to_string(), |v| fmt(v, QuantityKind::ForcePerWidth))
            };
            format!("Nip load {} → {}", text(before), text(after))
        }
        Setting::Core => {
            // Same core size, stiffer or softer: the effective stiffness Ec doubles or halves
            // per step (written as a measured stiffness, which overrides the modulus).
            let before = resolved.core.stiffness.effective_stiffness();
            if !before.is_finite() {
                return Err(WhatIfError::RigidCore);
            }
            let after = before * 2.0_f64.powi(step.steps);
            out.core.stiffness = CoreStiffness::Measured { stiffness: after };
            format!(
                "Core stiffness Ec {} → {}",
                compact_stress(before, units),
                compact_stress(after, units)
            )
        }
        Setting::Speed => {
            let before = resolved.winding.speed;
            let after = (before * (1.0 + 0.1 * steps)).max(before * 0.1);
            out.winding.speed = after;
            format!(
                "Line speed {} → {}",
                fmt(before, QuantityKind::Speed),
                fmt(after, QuantityKind::Speed)
            )
        }
    };
    Ok((out, description))
}

/// The case file with `step` written into it, and the change in plain words.
pub fn trial_case(
    case: &Case,
    resolved: &ResolvedCase,
    step: SettingStep,
    units: UnitSystem,
) -> Result<(Case, String), WhatIfError> {
    let (after, description) = apply_step(resolved, step, units)?;
    Ok((write_into_case(case, resolved, &after)?, description))
}

/// The case file with a remedy's changes written into its inputs, for the changes a case file
/// can say directly; the others are refused with a reason.
pub fn keep_changes(
    case: &Case,
    resolved: &ResolvedCase,
    changes: &[SettingChange],
) -> Result<Case, WhatIfError> {
    write_into_case(case, resolved, &apply_changes(resolved, changes))
}

/// A taper as the case file writes it: kind and "N %".
fn taper_input(taper: &Taper) -> Result<TaperInput, WhatIfError> {
    let (kind, fraction) = match *taper {
        Taper::None => ("none", 0.0),
        Taper::Linear { fraction } => ("linear", fraction),
        Taper::Hyperbolic { fraction } => ("hyperbolic", fraction),
        Taper::Steps { .. } | Taper::Programme { .. } => return Err(WhatIfError::SteppedTaper),
    };
    Ok(TaperInput {
        kind: kind.into(),
        amount: Some(QuantityText::Text(format!("{} %", sig3(fraction * 100.0)))),
        steps: Vec::new(),
        points: Vec::new(),
    })
}

/// Write the winder settings in which `after` differs from `before` (both resolved from
/// `case`) into a copy of the case file. The one way a change reaches the case file, for the
/// what-if steps and the remedies alike.
pub fn write_into_case(
    case: &Case,
    before: &ResolvedCase,
    after: &ResolvedCase,
) -> Result<Case, WhatIfError> {
    let mut out = case.clone();
    let (old, new) = (&before.winding.tension, &after.winding.tension);
    if new.start_tension != old.start_tension {
        // A scaled tension also scales the absolute tensions of steps and upset bands, which a
        // single number in the case file cannot say.
        let steps_scaled = matches!(new.taper, Taper::Steps { .. } | Taper::Programme { .. })
            && new.taper != old.taper;
        let bands_scaled = new.upsets != old.upsets && !new.upsets.is_empty();
        if steps_scaled || bands_scaled {
            return Err(WhatIfError::TensionBands);
        }
        out.winding.tension = Some(QuantityText::Number(new.start_tension));
    }
    if new.taper != old.taper {
        out.winding.taper = Some(taper_input(&new.taper)?);
    }
    if new.upsets != old.upsets {
        if !new.upsets.is_empty() {
            return Err(WhatIfError::CoreZoneBand);
        }
        out.winding.upsets.clear();
    }
    if after.winding.nip_load != before.winding.nip_load {
        out.winding.nip_load = after.winding.nip_load.map(QuantityText::Number);
    }
    if after.winding.speed != before.winding.speed {
        out.winding.speed = Some(QuantityText::Number(after.winding.speed));
    }
    if after.core.crush_pressure != before.core.crush_pressure {
        out.core.crush_pressure = Some(QuantityText::Number(after.core.crush_pressure));
    }
    if after.core.stiffness != before.core.stiffness {
        let stiffness = after.core.stiffness.effective_stiffness();
        if !stiffness.is_finite() {
            return Err(WhatIfError::RigidCore);
        }
        out.core.stiffness = Some(QuantityText::Number(stiffness));
        // A measured stiffness has no wall to estimate the crush pressure from: keep the
        // estimate the case had.
        if out.core.crush_pressure.is_none() && out.core.flat_crush.is_none() {
            out.core.crush_pressure = Some(QuantityText::Number(after.core.crush_pressure));
        }
    }
    if after.winding.nip_programme != before.winding.nip_programme
        && let Some(programme) = &after.winding.nip_programme
    {
        out.winding.nip_programme = programme
            .points
            .iter()
            .map(|&(radius, load)| crate::case::NipPointInput {
                diameter: QuantityText::Number(2.0 * radius),
                nip_load: QuantityText::Number(load),
            })
            .collect();
    }
    Ok(out)
}

/// A rule-base setting change in plain words ("tension ×1.15", "taper +15 points").
pub fn describe_change(change: &SettingChange) -> String {
    match *change {
        SettingChange::TensionScale(f) => format!("tension ×{f}"),
        SettingChange::TaperBy(p) => format!("taper {p:+} points"),
        SettingChange::TaperTo(p) => format!("taper to {p} %"),
        SettingChange::NipScale(f) => format!("nip load ×{f}"),
        SettingChange::SpeedScale(f) => format!("speed ×{f}"),
        SettingChange::CoreStiffnessScale(f) => format!("core stiffness ×{f}"),
        SettingChange::CoreCrushScale(f) => format!("core crush rating ×{f}"),
        SettingChange::ClearUpsets => "no tension upsets".to_string(),
        SettingChange::CoreZoneTensionScale(f) => format!("core-zone tension ×{f}"),
    }
}

/// True when the remedy carries a machine-readable setting change.
pub fn changes_setting(rules: &RuleBase, remedy: &str) -> bool {
    rules
        .remedies
        .get(remedy)
        .is_some_and(|r| !r.changes.is_empty())
}

/// Apply setting changes to a copy of the case.
pub fn apply_changes(case: &ResolvedCase, changes: &[SettingChange]) -> ResolvedCase {
    let mut out = case.clone();
    let core_r = case.core.outside_diameter / 2.0;
    let outer_r = case.roll.outer_diameter / 2.0;
    for change in changes {
        let schedule = &mut out.winding.tension;
        match *change {
            SettingChange::TensionScale(f) => {
                schedule.start_tension *= f;
                if let Taper::Steps { steps } | Taper::Programme { points: steps } =
                    &mut schedule.taper
                {
                    for s in steps.iter_mut() {
                        s.tension *= f;
                    }
                }
                for u in schedule.upsets.iter_mut() {
                    u.tension *= f;
                }
            }
            SettingChange::TaperBy(d) => set_taper(schedule, None, d),
            SettingChange::TaperTo(t) => set_taper(schedule, Some(t), 0.0),
            SettingChange::NipScale(f) => {
                out.winding.nip_load = out.winding.nip_load.map(|n| n * f);
                if let Some(programme) = out.winding.nip_programme.as_mut() {
                    for point in programme.points.iter_mut() {
                        point.1 *= f;
                    }
                }
            }
            SettingChange::SpeedScale(f) => out.winding.speed *= f,
            SettingChange::CoreStiffnessScale(f) => {
                out.core.stiffness = out.core.stiffness.scaled(f);
            }
            SettingChange::CoreCrushScale(f) => out.core.crush_pressure *= f,
            SettingChange::ClearUpsets => schedule.upsets.clear(),
            SettingChange::CoreZoneTensionScale(f) => {
                let band = UpsetBand {
                    from_radius: core_r,
                    to_radius: core_r + 0.1 * (outer_r - core_r),
                    tension: schedule.start_tension * f,
                };
                schedule.upsets.push(band);
            }
        }
    }
    out
}

/// Set the taper to `to` percent, or move it by `by` percent points, whatever its form.
fn set_taper(schedule: &mut crate::model::TensionSchedule, to: Option<f64>, by: f64) {
    let t0 = schedule.start_tension;
    let current = match &schedule.taper {
        Taper::None => 0.0,
        Taper::Linear { fraction } | Taper::Hyperbolic { fraction } => fraction * 100.0,
        Taper::Steps { steps } | Taper::Programme { points: steps } => steps
            .last()
            .filter(|_| t0 > 0.0)
            .map(|s| (t0 - s.tension) / t0 * 100.0)
            .unwrap_or(0.0),
    };
    let target = to.unwrap_or(current + by).clamp(0.0, 90.0);
    schedule.taper = match std::mem::take(&mut schedule.taper) {
        Taper::None | Taper::Linear { .. } => {
            if target > 0.0 {
                Taper::Linear {
                    fraction: target / 100.0,
                }
            } else {
                Taper::None
            }
        }
        Taper::Hyperbolic { .. } => Taper::Hyperbolic {
            fraction: target / 100.0,
        },
        Taper::Steps { mut steps } => {
            if current > 0.0 {
                let scale = target / current;
                for s in steps.iter_mut() {
                    s.tension = t0 - (t0 - s.tension) * scale;
                }
                Taper::Steps { steps }
            } else {
                Taper::Linear {
                    fraction: target / 100.0,
                }
            }
        }
        // The programme's taper moves about the core tension as the steps' does.
        Taper::Programme { mut points } => {
            if current > 0.0 {
                let scale = target / current;
                for p in points.iter_mut() {
                    p.tension = t0 - (t0 - p.tension) * scale;
                }
                Taper::Programme { points }
            } else {
                Taper::Linear {
                    fraction: target / 100.0,
                }
            }
        }
    };
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A blank case: every value from the presets and defaults.
    fn blank() -> (Case, ResolvedCase) {
        let case = Case {
            title: "Blank".into(),
            ..Case::default()
        };
        let resolved = case.resolve().expect("a blank case resolves from presets");
        (case, resolved)
    }

    #[test]
    fn a_kept_change_resolves_to_what_the_what_if_solved() {
        // The one-applier invariant: writing a change into the case file and resolving it again
        // gives the same inputs the what-if solved.
        let (case, resolved) = blank();
        for changes in [
            vec![SettingChange::TensionScale(1.15)],
            vec![SettingChange::SpeedScale(0.8)],
            vec![SettingChange::CoreCrushScale(2.0)],
            vec![SettingChange::TaperTo(20.0)],
            vec![SettingChange::CoreStiffnessScale(2.0)],
        ] {
            let expected = apply_changes(&resolved, &changes);
            let kept = keep_changes(&case, &resolved, &changes).unwrap();
            let again = kept.resolve().unwrap();
            assert_eq!(
                again.winding.tension, expected.winding.tension,
                "{changes:?}"
            );
            assert_eq!(again.winding.speed, expected.winding.speed, "{changes:?}");
            assert_eq!(again.core.crush_pressure, expected.core.crush_pressure);
            let (a, b) = (
                again.core.stiffness.effective_stiffness(),
                expected.core.stiffness.effective_stiffness(),
            );
            assert!(
                a == b || (a - b).abs() <= 1e-9 * b.abs(),
                "{changes:?}: {a} vs {b}"
            );
        }
    }

    #[test]
    fn steps_change_the_setting_by_the_stated_amount() {
        let (case, resolved) = blank();
        let before = resolved.winding.tension.start_tension;
        let step = SettingStep {
            setting: Setting::Tension,
            steps: 2,
        };
        let (trial, words) = trial_case(&case, &resolved, step, UnitSystem::Si).unwrap();
        assert!(words.starts_with("Web tension"));
        let after = trial.resolve().unwrap().winding.tension.start_tension;
        assert!((after - 1.2 * before).abs() < 1e-9 * before);
        // A roll without taper is tried with a hyperbolic one, 5 points per step.
        let step = SettingStep {
            setting: Setting::Taper,
            steps: 1,
        };
        let (trial, _) = trial_case(&case, &resolved, step, UnitSystem::Si).unwrap();
        let taper = trial.winding.taper.unwrap();
        assert_eq!(taper.kind, "hyperbolic");
        assert_eq!(taper.amount, Some(QuantityText::Text("5 %".into())));
    }

    #[test]
    fn changes_a_case_file_cannot_say_are_refused() {
        let (case, resolved) = blank();
        let changes = [SettingChange::CoreZoneTensionScale(1.2)];
        assert_eq!(
            keep_changes(&case, &resolved, &changes),
            Err(WhatIfError::CoreZoneBand)
        );
        let mut stepped = resolved.clone();
        stepped.winding.tension.taper = Taper::Steps { steps: Vec::new() };
        let step = SettingStep {
            setting: Setting::Taper,
            steps: 1,
        };
        assert_eq!(
            apply_step(&stepped, step, UnitSystem::Si).map(|_| ()),
            Err(WhatIfError::SteppedTaper)
        );
    }
}
