//! The starter file `rolltriage case new` writes: every field that has a preset or fixed default
//! written out with its unit and, in a comment, where the value came from. The keys, their
//! order, the accepted words and the defaults come from the field registry.

use super::registry::{self as reg, DefaultValue, Field, FieldKind};
use crate::presets::{CorePreset, WebPreset};
use crate::units::{UnitSystem, format_quantity};

/// One `key: value  # comment` line at `indent`, the value formatted as the field's kind.
fn value_line(indent: &str, field: &Field, value: f64, comment: &str) -> String {
    match field.kind {
        FieldKind::Quantity(kind) => format!(
            "{indent}{}: \"{}\"  # {comment}\n",
            field.key(),
            format_quantity(value, kind, UnitSystem::Si)
        ),
        _ => format!("{indent}{}: {value}  # {comment}\n", field.key()),
    }
}

/// The line of a field whose default is a preset or fixed value.
fn default_line(indent: &str, field: &Field, web: &WebPreset, core: &CorePreset) -> String {
    match field.preset_value(Some(web), Some(core)) {
        Some((value, _)) => value_line(indent, field, value.value, value.source),
        None => String::new(),
    }
}

/// The events of the layer-slip check (docs/theory.md §5), written with the defaults the
/// mechanics would assume; the unwind tension as the winding tension.
fn event_lines(web: &WebPreset, core: &CorePreset) -> String {
    use crate::presets::{DEFAULT_EMERGENCY_STOP_TIME, DEFAULT_RAMP_TIME};
    let ramp = DEFAULT_RAMP_TIME;
    let mut out = value_line("  ", &reg::ACCELERATION, ramp.value, ramp.source);
    out.push_str(&value_line("  ", &reg::STOP_TIME, ramp.value, ramp.source));
    let emergency = DEFAULT_EMERGENCY_STOP_TIME;
    out.push_str(&value_line(
        "  ",
        &reg::EMERGENCY_STOP_TIME,
        emergency.value,
        emergency.source,
    ));
    if let Some((tension, _)) = reg::TENSION.preset_value(Some(web), Some(core)) {
        out.push_str(&value_line(
            "  ",
            &reg::UNWIND_TENSION,
            tension.value,
            "the customer's unwind tension; here the winding tension",
        ));
    }
    out
}

/// A choice written with its accepted words as the comment ("a, b or c").
fn choice_line(indent: &str, field: &Field, value: &str, separator: &str) -> String {
    let words = match field.kind {
        FieldKind::Choice(words) => words,
        _ => &[],
    };
    let list = match separator {
        "or" => match words.split_last() {
            Some((last, rest)) if !rest.is_empty() => format!("{} or {last}", rest.join(", ")),
            _ => words.join(", "),
        },
        _ => words.join(", "),
    };
    format!("{indent}{}: {value}  # {list}\n", field.key())
}

/// The opening lines of the web or core section: the preset it starts from (`[id, name]`) and
/// its material kind with the accepted words.
fn section_head(
    section: &str,
    [id, name]: [&str; 2],
    material: &Field,
    material_id: &str,
) -> String {
    format!("{section}:\n  preset: {id}  # {name}\n")
        + &choice_line("  ", material, material_id, ",")
}

/// A complete starting case for `web` and `core`, as commented YAML: every value written out
/// with its unit and, in a comment, where it came from. Edit the values you know.
pub fn starter_yaml(web: &WebPreset, core: &CorePreset) -> String {
    let mut out = String::new();
    out.push_str(
        "# rolltriage case file. Quantities are strings with a unit (\"76 um\", \"1.5 pli\")\n",
    );
    out.push_str("# or plain numbers in SI (m, N/m, Pa, m/s). See docs/case-format.md.\n");
    out.push_str(
        "# Values below come from generic presets: replace them with your own where you can.\n",
    );
    out.push_str(&format!("{}: New case\n", reg::TITLE.key()));
    out.push_str(&format!(
        "{}: {}\n",
        reg::DESCRIPTION.key(),
        reg::DESCRIPTION.help
    ));
    out.push_str(&section_head(
        "web",
        [web.id, web.name],
        &reg::WEB_MATERIAL,
        web.material.id(),
    ));
    for field in [&reg::WEB_THICKNESS, &reg::WEB_WIDTH, &reg::WEB_MODULUS] {
        out.push_str(&default_line("  ", field, web, core));
    }
    out.push_str("  radial_stiffness:  # Pfeiffer (1966): P = K1·(exp(K2·strain) − 1)\n");
    out.push_str(&choice_line("    ", &reg::RADIAL_LAW, "pfeiffer", "or"));
    for field in [&reg::K1, &reg::K2] {
        out.push_str(&default_line("    ", field, web, core));
    }
    for field in [
        &reg::WEB_POISSON,
        &reg::FRICTION,
        &reg::KINETIC_FRICTION,
        &reg::DENSITY,
        &reg::ROUGHNESS,
        &reg::STRENGTH,
    ] {
        out.push_str(&default_line("  ", field, web, core));
    }
    out.push_str(&section_head(
        "core",
        [core.id, core.name],
        &reg::CORE_MATERIAL,
        core.material.id(),
    ));
    for field in reg::section("core") {
        if matches!(field.default, DefaultValue::CorePreset(_)) {
            out.push_str(&default_line("  ", field, web, core));
        }
    }
    out.push_str(&choice_line("  ", &reg::CORE_SUPPORT, "free", "or"));
    out.push_str("roll:\n");
    out.push_str(&value_line(
        "  ",
        &reg::ROLL_DIAMETER,
        crate::presets::DEFAULT_ROLL_DIAMETER.value,
        "finished roll diameter; or give length instead",
    ));
    out.push_str("winding:\n");
    out.push_str(&choice_line("  ", &reg::METHOD, "centre", "or"));
    out.push_str(&default_line("  ", &reg::TENSION, web, core));
    out.push_str("  taper:\n");
    out.push_str(&choice_line("    ", &reg::TAPER_KIND, "linear", "or"));
    out.push_str(&format!(
        "    amount: \"20 %\"  # {}\n",
        "share of the starting tension taken off by the outside"
    ));
    out.push_str(
        "  nip_load: \"0 N/m\"  # rider or lay-on roll load per width; 0 when there is none\n",
    );
    out.push_str(&default_line("  ", &reg::NIP_PLATEAU, web, core));
    out.push_str(&default_line("  ", &reg::SPEED, web, core));
    out.push_str(&default_line("  ", &reg::SHOCK_FACTOR, web, core));
    out.push_str(&event_lines(web, core));
    out.push_str("  # upsets:  # bands wound at a different tension, e.g. after a splice\n");
    out.push_str(
        "  #   - {from_diameter: \"600 mm\", to_diameter: \"620 mm\", tension: \"3 pli\"}\n",
    );
    out.push_str("symptoms:  # IDs: ");
    out.push_str(&crate::vocabulary::SYMPTOM_IDS.join(", "));
    out.push_str("\n  - id: telescoping\n");
    out.push_str(&choice_line("    ", &reg::SYMPTOM_WHERE, "body", "or"));
    out.push_str("    notes: How it looks and how many rolls.\n");
    out.push_str("notes: Anything else (shift, grade change, splice, storage).\n");
    out
}
