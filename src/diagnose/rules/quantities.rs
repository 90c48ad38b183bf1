//! Quantities in rule texts: `{50 kPa}` in an explanation, a remedy, a caution or a question is a
//! number with its unit that is printed in the user's units ("50 kPa", "7.25 psi"). Owns the
//! placeholder syntax, its check (a malformed placeholder is a rule-base error naming file,
//! line and rule) and the rendering of a compiled rule base into one unit system.

use std::path::Path;

use super::compile::{Problems, line_of};
use super::{RuleBase, Test};
use crate::units::{QuantityKind, UnitSystem, format_quantity, parse_quantity, sig3};

/// The kinds a placeholder may hold: a percentage or a ratio reads the same in every unit
/// system and needs none.
const KINDS: [QuantityKind; 8] = [
    QuantityKind::Stress,
    QuantityKind::Length,
    QuantityKind::ForcePerWidth,
    QuantityKind::Speed,
    QuantityKind::Force,
    QuantityKind::Torque,
    QuantityKind::Temperature,
    QuantityKind::Mass,
];

/// The SI value and kind of the quantity inside one placeholder ("50 kPa"), or why it is not one.
fn quantity(inside: &str) -> Result<(f64, QuantityKind), String> {
    let has_unit = inside
        .trim()
        .trim_start_matches(|c: char| c.is_ascii_digit() || matches!(c, '.' | '+' | '-'))
        .chars()
        .any(|c| !c.is_whitespace());
    if has_unit {
        for kind in KINDS {
            if let Ok(value) = parse_quantity("placeholder", inside, kind) {
                return Ok((value, kind));
            }
        }
    }
    Err(format!(
        "`{{{inside}}}` is not a quantity: write a number and its unit inside the braces, e.g. `{{50 kPa}}` or `{{76 mm}}` (a percentage or a ratio needs no braces)"
    ))
}

/// Every problem with the placeholders of `text`: an unclosed or stray brace, or braces that do
/// not hold a number with a unit.
fn problems_of(text: &str) -> Vec<String> {
    let mut out = Vec::new();
    let mut rest = text;
    while let Some(at) = rest.find(['{', '}']) {
        if rest[at..].starts_with('}') {
            out.push("a `}` without its `{`: quantities are written `{50 kPa}`".to_string());
            rest = &rest[at + 1..];
            continue;
        }
        let after = &rest[at + 1..];
        match after.find(['{', '}']) {
            Some(end) if after[end..].starts_with('}') => {
                if let Err(message) = quantity(&after[..end]) {
                    out.push(message);
                }
                rest = &after[end + 1..];
            }
            _ => {
                out.push("a `{` without its `}`: quantities are written `{50 kPa}`".to_string());
                rest = after;
            }
        }
    }
    out
}

/// `text` with each `{quantity}` printed in `units` with three significant figures, like the
/// values and thresholds beside it ("{50 kPa}" → "50 kPa" or "7.25 psi"). A malformed
/// placeholder (refused when the rule base is loaded) is left as written.
pub(super) fn render(text: &str, units: UnitSystem) -> String {
    if !text.contains('{') {
        return text.to_string();
    }
    let mut out = String::with_capacity(text.len());
    let mut rest = text;
    while let Some(at) = rest.find('{') {
        let after = &rest[at + 1..];
        let Some(end) = after.find('}') else { break };
        out.push_str(&rest[..at]);
        match quantity(&after[..end]) {
            Ok((value, kind)) => {
                let printed = format_quantity(value, kind, units);
                let (number, unit) = printed.split_once(' ').unwrap_or((&printed, ""));
                match number.parse::<f64>() {
                    Ok(n) => out.push_str(&format!("{} {unit}", sig3(n))),
                    Err(_) => out.push_str(&printed),
                }
            }
            Err(_) => out.push_str(&rest[at..at + end + 2]),
        }
        rest = &after[end + 1..];
    }
    out.push_str(rest);
    out
}

/// Every text a person reads from the rule base, with the file it came from and who owns it
/// ("cause `x`", "remedy `y`"), mutable so [`in_units`] and [`check`] walk the same list.
fn texts_mut(base: &mut RuleBase) -> Vec<(String, String, &mut String)> {
    let mut out: Vec<(String, String, &mut String)> = Vec::new();
    for c in base.causes.values_mut() {
        let owner = format!("cause `{}`", c.id);
        out.push(("causes.yaml".into(), owner.clone(), &mut c.title));
        out.push(("causes.yaml".into(), owner, &mut c.mechanism));
    }
    for r in base.remedies.values_mut() {
        out.push((
            "remedies.yaml".into(),
            format!("remedy `{}`", r.id),
            &mut r.text,
        ));
    }
    for c in base.cautions.values_mut() {
        let owner = format!("caution `{}`", c.id);
        out.push(("cautions.yaml".into(), owner.clone(), &mut c.title));
        out.push(("cautions.yaml".into(), owner, &mut c.text));
    }
    for s in &mut base.symptoms {
        let file = s.file.clone();
        let owner = format!("symptom `{}`", s.id);
        out.push((file.clone(), owner.clone(), &mut s.title));
        out.push((file.clone(), owner, &mut s.description));
        for q in &mut s.questions {
            let owner = format!("question `{}`", q.id);
            out.push((file.clone(), owner.clone(), &mut q.text));
            for c in &mut q.choices {
                out.push((file.clone(), owner.clone(), &mut c.text));
            }
        }
        for rule in &mut s.rules {
            let owner = format!("rule for cause `{}`", rule.cause);
            out.push((file.clone(), owner.clone(), &mut rule.because));
            for e in &mut rule.evidence {
                let owner = match &e.test {
                    Test::Indicator { id, .. } => format!("{owner}, evidence `{id}`"),
                    Test::Answer { question, .. } => format!("{owner}, evidence `{question}`"),
                    _ => owner.clone(),
                };
                out.push((file.clone(), owner, &mut e.says));
            }
        }
    }
    out
}

/// The rule base with every `{quantity}` in its texts printed in `units`.
pub(super) fn in_units(mut base: RuleBase, units: UnitSystem) -> RuleBase {
    for (_, _, text) in texts_mut(&mut base) {
        *text = render(text, units);
    }
    base
}

/// Each malformed placeholder in the compiled rule base as a problem naming the file, the line
/// it is on and the rule that holds it.
pub(super) fn check(base: &RuleBase, files: &[(String, String)], problems: &mut Problems) {
    let mut base = base.clone();
    let base_name = |f: &str| {
        Path::new(f)
            .file_name()
            .map(|n| n.to_string_lossy().to_string())
            .unwrap_or_default()
    };
    for (file, owner, text) in texts_mut(&mut base) {
        let found = problems_of(text);
        if found.is_empty() {
            continue;
        }
        // Catalogue texts name their file by its base name; symptom texts by their path.
        let source = files
            .iter()
            .find(|(f, _)| *f == file || base_name(f) == file);
        let (file, line) = match source {
            Some((f, source)) => {
                let first = text.split(['{', '}']).next().unwrap_or_default();
                let needle = first
                    .split_whitespace()
                    .take(4)
                    .collect::<Vec<_>>()
                    .join(" ");
                let line = if needle.is_empty() {
                    1
                } else {
                    source
                        .lines()
                        .position(|l| l.contains(&needle))
                        .map_or_else(|| line_of(source, &needle), |i| i + 1)
                };
                (f.clone(), line)
            }
            None => (file, 1),
        };
        for message in found {
            problems.add(&file, line, &format!("{owner}: {message}"));
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn placeholders_print_in_the_chosen_units() {
        // 1 psi = 6894.757 Pa, 1 in = 25.4 mm, °F = 1.8 °C + 32 (NIST SP 811, appendix B).
        let text = "below {50 kPa}, above {1 MPa}, on a {76 mm} core, above {35 °C}.";
        assert_eq!(
            render(text, UnitSystem::Si),
            "below 50 kPa, above 1 MPa, on a 76 mm core, above 35 °C."
        );
        assert_eq!(
            render(text, UnitSystem::Us),
            "below 7.25 psi, above 145 psi, on a 2.99 in core, above 95 °F."
        );
        assert_eq!(render("no quantity", UnitSystem::Us), "no quantity");
    }

    #[test]
    fn malformed_placeholders_are_named() {
        assert!(problems_of("below {50 kPa} and {20 kPa}").is_empty());
        assert!(problems_of("plain text").is_empty());
        for bad in [
            "below {50}",
            "below {fifty kPa}",
            "below {50 kPa",
            "below 50 kPa}",
            "below {5 %}",
            "below {50 bananas}",
        ] {
            assert_eq!(problems_of(bad).len(), 1, "{bad}");
        }
    }
}
