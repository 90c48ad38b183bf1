//! Remedies: the remedy catalogue entries checked and compiled — groups, costs, and the
//! change each remedy makes with its scale.

use super::*;

pub(in crate::diagnose::rules) fn check_remedy(
    id: &str,
    file: &str,
    text: &str,
    base: &RuleBase,
    problems: &mut Problems,
) {
    let site = Site::new(file, text, 0, "");
    check_listed(
        id,
        "remedy",
        &base.remedies,
        "remedies.yaml",
        &site,
        problems,
    );
}

pub(super) fn compile_remedy(
    id: &str,
    raw: RawRemedy,
    file: &str,
    text: &str,
    base: &RuleBase,
    problems: &mut Problems,
) -> Option<Remedy> {
    let line = line_of(text, id);
    let mut ok = check_remedy_group(id, &raw.group, file, text, line, problems);
    let cost = remedy_cost(id, &raw.cost, file, text, line, problems);
    ok &= cost.is_some();
    let owner = format!("remedy `{id}`: ");
    let site = Site::new(file, text, line, &owner);
    for caution in &raw.cautions {
        ok &= check_listed(
            caution,
            "caution",
            &base.cautions,
            "cautions.yaml",
            &site,
            problems,
        );
    }
    let mut changes = Vec::new();
    for change in raw.change {
        let at = line_of_after(text, &change.setting, line);
        match compile_change(id, &change, file, at, problems) {
            Some(c) => changes.push(c),
            None => ok = false,
        }
    }
    if raw.text.trim().is_empty() {
        problems.add(file, line, &format!("remedy `{id}` has no text"));
        ok = false;
    }
    ok.then(|| Remedy {
        id: id.to_string(),
        text: raw.text.trim().to_string(),
        group: raw.group,
        cost: cost.unwrap_or(Cost::High),
        cautions: raw.cautions,
        changes,
    })
}

/// Whether a remedy's `group` is one of [`REMEDY_GROUPS`]; reports it when not.
fn check_remedy_group(
    id: &str,
    group: &str,
    file: &str,
    text: &str,
    line: usize,
    problems: &mut Problems,
) -> bool {
    if REMEDY_GROUPS.contains(&group) {
        return true;
    }
    problems.add(
        file,
        line_of_after(text, group, line),
        &format!(
            "remedy `{id}`: unknown group `{group}`; accepted: {}{}",
            REMEDY_GROUPS.join(", "),
            did_you_mean(group, REMEDY_GROUPS)
        ),
    );
    false
}

/// A remedy's `cost` word; None (reported) when it is not low, medium or high.
fn remedy_cost(
    id: &str,
    cost: &str,
    file: &str,
    text: &str,
    line: usize,
    problems: &mut Problems,
) -> Option<Cost> {
    match cost {
        "low" => Some(Cost::Low),
        "medium" => Some(Cost::Medium),
        "high" => Some(Cost::High),
        other => {
            problems.add(
                file,
                line_of_after(text, other, line),
                &format!("remedy `{id}`: cost `{other}` is not one of low, medium, high"),
            );
            None
        }
    }
}

/// One `change:` entry of a remedy (a setting and how it changes), checked against the range
/// each setting accepts; None when it was reported.
fn compile_change(
    id: &str,
    change: &RawChange,
    file: &str,
    at: usize,
    problems: &mut Problems,
) -> Option<SettingChange> {
    let factor = |problems: &mut Problems, range: (f64, f64)| {
        change_scale(id, change, range, file, at, problems)
    };
    match change.setting.as_str() {
        "tension" => factor(problems, (0.3, 2.0)).map(SettingChange::TensionScale),
        "nip_load" => factor(problems, (0.0, 3.0)).map(SettingChange::NipScale),
        "speed" => factor(problems, (0.1, 2.0)).map(SettingChange::SpeedScale),
        "core_stiffness" => factor(problems, (0.1, 100.0)).map(SettingChange::CoreStiffnessScale),
        "core_crush_rating" => factor(problems, (0.1, 10.0)).map(SettingChange::CoreCrushScale),
        "core_zone_tension" => {
            factor(problems, (0.3, 2.0)).map(SettingChange::CoreZoneTensionScale)
        }
        "tension_upsets" => match change.clear {
            Some(true) => Some(SettingChange::ClearUpsets),
            _ => {
                problems.add(
                    file,
                    at,
                    &format!("remedy `{id}`: `tension_upsets` needs `clear: true`"),
                );
                None
            }
        },
        "taper" => match (change.by_percent_points, change.to_percent) {
            (Some(d), None) if (-90.0..=90.0).contains(&d) && d != 0.0 => {
                Some(SettingChange::TaperBy(d))
            }
            (None, Some(t)) if (0.0..=90.0).contains(&t) => Some(SettingChange::TaperTo(t)),
            _ => {
                problems.add(
                    file,
                    at,
                    &format!(
                        "remedy `{id}`: `taper` needs either `by_percent_points` (−90..90, not 0) or `to_percent` (0..90)"
                    ),
                );
                None
            }
        },
        other => {
            problems.add(
                file,
                at,
                &format!(
                    "remedy `{id}`: unknown setting `{other}`; accepted: {}{}",
                    SETTINGS.join(", "),
                    did_you_mean(other, SETTINGS)
                ),
            );
            None
        }
    }
}

/// The `scale` of a change, when present and inside `range` (low end open, high end closed).
fn change_scale(
    id: &str,
    change: &RawChange,
    range: (f64, f64),
    file: &str,
    at: usize,
    problems: &mut Problems,
) -> Option<f64> {
    match change.scale {
        Some(f) if f > range.0 && f <= range.1 => Some(f),
        Some(f) => {
            problems.add(
                file,
                at,
                &format!(
                    "remedy `{id}`: scale {f} for `{}` is out of range; accepted {} < scale ≤ {}",
                    change.setting, range.0, range.1
                ),
            );
            None
        }
        None => {
            problems.add(
                file,
                at,
                &format!("remedy `{id}`: setting `{}` needs `scale`", change.setting),
            );
            None
        }
    }
}
