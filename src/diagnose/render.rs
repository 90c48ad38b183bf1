//! Plain-text and Markdown renderings of a diagnosis (used by `rolltriage diagnose`; the report
//! module owns the full complaint reports).

use std::fmt::Write;

use super::Diagnosis;
use crate::units::UnitSystem;

use super::remedies::heading;

fn reason_line(r: &super::Reason) -> String {
    // The prior and site history are reasons without an indicator test: their text says it all.
    if r.test == "prior" || r.test == "site_history" {
        return format!("{:+.2}  [{}] {}", r.weight, r.symptom, r.text);
    }
    let zone = r
        .zone
        .as_ref()
        .map(|z| format!(" in {z}"))
        .unwrap_or_default();
    let value = r.value.clone().unwrap_or_default();
    let threshold = r.threshold.clone().unwrap_or_default();
    format!(
        "{:+.2}  [{}] {}{zone} = {value} ({threshold}): {}",
        r.weight, r.symptom, r.test, r.text
    )
}

/// `text` with every pressure written in SI ("495 kPa", "1.2 MPa") in `units` instead: the
/// what-if lines carry their values as text made in SI.
fn pressures_in(text: &str, units: UnitSystem) -> String {
    if units == UnitSystem::Si {
        return text.to_string();
    }
    let words: Vec<&str> = text.split(' ').collect();
    let mut out: Vec<String> = Vec::with_capacity(words.len());
    let mut i = 0;
    while i < words.len() {
        let unit = words.get(i + 1).map(|w| {
            let bare = w.trim_end_matches([',', ';', ':', ')', '.']);
            (bare, &w[bare.len()..])
        });
        let scale = match unit {
            Some(("Pa", _)) => Some(1.0),
            Some(("kPa", _)) => Some(1e3),
            Some(("MPa", _)) => Some(1e6),
            _ => None,
        };
        match (scale, words[i].parse::<f64>(), unit) {
            (Some(scale), Ok(value), Some((_, tail))) => {
                out.push(format!(
                    "{}{tail}",
                    crate::units::compact_stress(value * scale, units)
                ));
                i += 2;
            }
            _ => {
                out.push(words[i].to_string());
                i += 1;
            }
        }
    }
    out.join(" ")
}

/// Plain text for the terminal; `verbose` adds the IDs of causes, remedies and cautions.
pub fn render_text(title: &str, diagnosis: &Diagnosis, verbose: bool) -> String {
    render_text_in(title, diagnosis, verbose, UnitSystem::Si)
}

/// [`render_text`] with the measured-evidence lines in `units` (the ranking text has no units).
pub fn render_text_in(
    title: &str,
    diagnosis: &Diagnosis,
    verbose: bool,
    units: UnitSystem,
) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "Diagnosis: {title}\n");
    if diagnosis.causes.is_empty() {
        let _ = writeln!(
            out,
            "No cause reached positive belief. Add symptoms or answers."
        );
    }
    for (i, c) in diagnosis.causes.iter().enumerate() {
        let id = if verbose {
            format!(" ({})", c.id)
        } else {
            String::new()
        };
        let _ = writeln!(out, "{}. {}{id} — belief {:.2}", i + 1, c.title, c.belief);
        let _ = writeln!(out, "   {}", c.mechanism);
        for r in &c.reasons {
            // A measured-evidence reason quotes its measurement in the chosen units.
            let value = match (&diagnosis.evidence, &r.value) {
                (Some(e), Some(v)) => Some(e.localise(v, units)),
                _ => r.value.clone(),
            };
            // A value or rule threshold that is a pressure follows the chosen units too.
            let value = value.map(|v| pressures_in(&v, units));
            let threshold = r.threshold.as_deref().map(|t| pressures_in(t, units));
            let r = &super::Reason {
                value,
                threshold,
                ..r.clone()
            };
            // IDs with --verbose, words otherwise.
            let line = if verbose {
                reason_line(r)
            } else {
                format!("{:+.2}  {}", r.weight, super::words::reason_plain(r))
            };
            let _ = writeln!(out, "     {line}");
        }
        out.push('\n');
    }
    if let Some(evidence) = diagnosis.evidence.as_ref().filter(|e| !e.is_empty()) {
        let _ = writeln!(out, "Measured on the roll, against the model");
        for line in evidence.lines_in(units) {
            let _ = writeln!(out, "  {line}");
        }
        out.push('\n');
    }
    if !diagnosis.remedies.is_empty() {
        let _ = writeln!(out, "Remedies (in the order to try)");
        for (i, r) in diagnosis.remedies.iter().enumerate() {
            if let Some(h) = heading(&diagnosis.remedies, i) {
                let _ = writeln!(out, "  {h}");
            }
            let id = if verbose {
                format!("{}; ", r.id)
            } else {
                String::new()
            };
            let _ = writeln!(out, "  {}. {} [{id}cost {}]", i + 1, r.text, r.cost);
            let _ = writeln!(out, "      answers: {}", diagnosis.answers_text(r));
            for c in diagnosis.cautions_of(r) {
                let _ = writeln!(out, "      ! caution, {}: {}", c.title, c.text);
            }
            // IDs with --verbose, words otherwise.
            let (indicator, note) = match &r.what_if {
                Some(w) if verbose => (w.indicator.replace('_', " "), w.note.clone()),
                Some(w) => (w.indicator_text(), w.note_text().to_string()),
                None => (String::new(), String::new()),
            };
            if r.what_if.as_ref().is_some_and(|w| w.indicator.is_empty()) {
                let _ = writeln!(out, "      what-if: {}", pressures_in(&note, units));
            } else if let Some(w) = &r.what_if {
                let flag = if w.worse {
                    "  WARNING: makes it worse"
                } else {
                    ""
                };
                let _ = writeln!(
                    out,
                    "      what-if: {indicator} {} → {}{flag} ({})",
                    pressures_in(&w.before, units),
                    pressures_in(&w.after, units),
                    pressures_in(&w.with_margins(&note), units),
                );
            }
        }
        out.push('\n');
    }
    if !diagnosis.cautions.is_empty() {
        let _ = writeln!(out, "Cautions");
        for c in &diagnosis.cautions {
            if verbose {
                let _ = writeln!(out, "  ! {} [{}]: {}", c.title, c.id, c.text);
            } else {
                let _ = writeln!(out, "  ! {}: {}", c.title, c.text);
            }
        }
    }
    out
}

/// How many assumed inputs the text outputs name.
pub const SENSITIVITY_SHOWN: usize = super::sensitivity::SHOWN;

/// "What the answer rests on" for the terminal; empty when nothing was assumed.
pub fn sensitivity_text(sensitivity: &super::sensitivity::Sensitivity) -> String {
    let lines = sensitivity.lines(SENSITIVITY_SHOWN);
    if lines.is_empty() {
        return String::new();
    }
    let mut out = String::from("\nWhat the answer rests on\n");
    for line in lines {
        let _ = writeln!(out, "  {line}");
    }
    out
}

/// "What the answer rests on" in Markdown; empty when nothing was assumed.
pub fn sensitivity_markdown(sensitivity: &super::sensitivity::Sensitivity) -> String {
    let lines = sensitivity.lines(SENSITIVITY_SHOWN);
    if lines.is_empty() {
        return String::new();
    }
    let mut out = String::from("## What the answer rests on\n\n");
    for line in lines {
        let _ = writeln!(out, "{line}");
    }
    out.push('\n');
    out
}

/// Markdown for reports and tickets.
pub fn render_markdown(title: &str, diagnosis: &Diagnosis) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "# Diagnosis: {title}\n");
    let _ = writeln!(out, "## Likely causes\n");
    if diagnosis.causes.is_empty() {
        let _ = writeln!(out, "No cause reached positive belief.\n");
    }
    for (i, c) in diagnosis.causes.iter().enumerate() {
        let _ = writeln!(out, "### {}. {} — belief {:.2}\n", i + 1, c.title, c.belief);
        let _ = writeln!(out, "{}\n", c.mechanism);
        let _ = writeln!(out, "| weight | symptom | tested | why |");
        let _ = writeln!(out, "|---:|---|---|---|");
        for r in &c.reasons {
            let _ = writeln!(
                out,
                "| {:+.2} | {} | {} | {} |",
                r.weight,
                super::words::symptom_title(&r.symptom),
                super::words::reason_tested(r)
                    .unwrap_or_default()
                    .replace('|', "\\|"),
                r.text.replace('|', "\\|")
            );
        }
        out.push('\n');
    }
    if !diagnosis.remedies.is_empty() {
        let _ = writeln!(out, "## Remedies (in the order to try)\n");
        for (i, r) in diagnosis.remedies.iter().enumerate() {
            if let Some(h) = heading(&diagnosis.remedies, i) {
                if i > 0 {
                    out.push('\n');
                }
                let _ = writeln!(out, "### {h}\n");
            }
            let _ = writeln!(out, "{}. **{}** (cost {})", i + 1, r.text, r.cost);
            let _ = writeln!(out, "   - answers: {}", diagnosis.answers_text(r));
            for c in diagnosis.cautions_of(r) {
                let _ = writeln!(out, "   - ⚠ caution, {}: {}", c.title, c.text);
            }
            if let Some(w) = r.what_if.as_ref().filter(|w| w.indicator.is_empty()) {
                let _ = writeln!(out, "   - what-if: {}", w.note_text());
            } else if let Some(w) = &r.what_if {
                let flag = if w.worse {
                    " — **warning: makes it worse**"
                } else {
                    ""
                };
                let _ = writeln!(
                    out,
                    "   - what-if: {} {} → {}{flag} ({})",
                    w.indicator_text(),
                    w.before,
                    w.after,
                    w.with_margins(w.note_text())
                );
            }
        }
        out.push('\n');
    }
    if !diagnosis.cautions.is_empty() {
        let _ = writeln!(out, "## Cautions\n");
        for c in &diagnosis.cautions {
            let _ = writeln!(out, "- **{}**: {}", c.title, c.text);
        }
        out.push('\n');
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn what_if_pressures_follow_the_units() {
        // 1 psi = 6894.757 Pa (NIST SP 811, appendix B).
        assert_eq!(
            pressures_in(
                "577 kPa → 718 kPa (rule threshold: below 20 kPa)",
                UnitSystem::Us
            ),
            "83.7 psi → 104 psi (rule threshold: below 2.9 psi)"
        );
        assert_eq!(pressures_in("0.735 → 0.49", UnitSystem::Us), "0.735 → 0.49");
        assert_eq!(pressures_in("650 kPa", UnitSystem::Si), "650 kPa");
    }
}
