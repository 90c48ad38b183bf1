//! Setting changes written into the case: a kept change in the user's units, a typed target
//! value turned into the changes that reach it.

use crate::case::QuantityText;
use crate::diagnose::rules::SettingChange;
use crate::diagnose::what_if::Setting;
use crate::units::UnitSystem;

/// A kept change reaches the case file as a bare SI number: write each changed setting as a
/// text in the user's units instead ("1.755 pli", not 307.2628794874298).
pub fn written_in_units(
    before: &crate::case::Case,
    after: &mut crate::case::Case,
    units: UnitSystem,
) {
    use crate::units::{QuantityKind, format_quantity};
    type Field = fn(&mut crate::case::Case) -> &mut Option<QuantityText>;
    // The settings a what-if changes, with the kind of quantity each is.
    const SETTINGS: [(Field, QuantityKind); 5] = [
        (|c| &mut c.winding.tension, QuantityKind::ForcePerWidth),
        (|c| &mut c.winding.nip_load, QuantityKind::ForcePerWidth),
        (|c| &mut c.winding.speed, QuantityKind::Speed),
        (|c| &mut c.core.stiffness, QuantityKind::Stress),
        (|c| &mut c.core.crush_pressure, QuantityKind::Stress),
    ];
    let mut old = before.clone();
    for (field, kind) in SETTINGS {
        let old = field(&mut old).clone();
        let new = field(after);
        if let Some(QuantityText::Number(value)) = *new
            && old != *new
        {
            *new = Some(QuantityText::Text(format_quantity(value, kind, units)));
        }
    }
}

/// The setting changes that bring `setting` to the typed value `text` (in any accepted unit).
pub fn target_changes(
    setting: Setting,
    text: &str,
    resolved: &crate::case::ResolvedCase,
) -> Result<Vec<SettingChange>, String> {
    use crate::units::{QuantityKind, parse_quantity};
    let parse = |kind| parse_quantity(setting.label(), text, kind).map_err(|e| e.to_string());
    let positive = |value: f64| {
        if value.is_finite() && value > 0.0 {
            Ok(value)
        } else {
            Err(format!("{}: give a value above zero", setting.label()))
        }
    };
    let change = match setting {
        Setting::Tension => {
            let value = positive(parse(QuantityKind::ForcePerWidth)?)?;
            SettingChange::TensionScale(value / resolved.winding.tension.start_tension)
        }
        Setting::Taper => {
            let mut value = parse(QuantityKind::Percent)?;
            // "20" means 20 %, as the screen shows taper in percent.
            if !text.contains('%') && value > 1.0 {
                value /= 100.0;
            }
            if !(0.0..=0.9).contains(&value) {
                return Err("Taper: give 0 to 90 %".into());
            }
            SettingChange::TaperTo(value * 100.0)
        }
        Setting::NipLoad => {
            let value = positive(parse(QuantityKind::ForcePerWidth)?)?;
            match resolved.winding.nip_load {
                Some(before) if before > 0.0 => SettingChange::NipScale(value / before),
                _ => {
                    return Err(
                        "Nip load: this case has no nip; set one on the Roll & winding screen                          or use → from none"
                            .into(),
                    );
                }
            }
        }
        Setting::Core => {
            let value = positive(parse(QuantityKind::Stress)?)?;
            let before = resolved.core.stiffness.effective_stiffness();
            if !before.is_finite() || before <= 0.0 {
                return Err("Core: the core is rigid; a typed stiffness changes nothing".into());
            }
            SettingChange::CoreStiffnessScale(value / before)
        }
        Setting::Speed => {
            let value = positive(parse(QuantityKind::Speed)?)?;
            SettingChange::SpeedScale(value / resolved.winding.speed)
        }
    };
    Ok(vec![change])
}
