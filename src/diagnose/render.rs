//! Plain-text and Markdown renderings of a diagnosis (used by `rolltriage diagnose`; the report
//! module owns the full complaint reports).

use std::fmt::Write;

use super::Diagnosis;

const GROUP_TITLES: [(&str, &str); 5] = [
    ("winder_setting", "Winder settings"),
    ("equipment", "Equipment"),
    ("material_or_core", "Material or core"),
    ("handling_and_storage", "Handling and storage"),
    ("process_upstream", "Upstream process"),
];

fn group_title(group: &str) -> &str {
    GROUP_TITLES
        .iter()
        .find(|(g, _)| *g == group)
        .map(|(_, t)| *t)
        .unwrap_or(group)
}

/// Groups in the order their first remedy appears (the list is already in the order to try).
fn groups_in_order(diagnosis: &Diagnosis) -> Vec<&str> {
    let mut out: Vec<&str> = Vec::new();
    for r in &diagnosis.remedies {
        if !out.contains(&r.group.as_str()) {
            out.push(&r.group);
        }
    }
    out
}

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

/// Plain text for the terminal.
pub fn render_text(title: &str, diagnosis: &Diagnosis) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "Diagnosis: {title}\n");
    if diagnosis.causes.is_empty() {
        let _ = writeln!(
            out,
            "No cause reached positive belief. Add symptoms or answers."
        );
    }
    for (i, c) in diagnosis.causes.iter().enumerate() {
        let _ = writeln!(
            out,
            "{}. {} ({}) — belief {:.2}",
            i + 1,
            c.title,
            c.id,
            c.belief
        );
        let _ = writeln!(out, "   {}", c.mechanism);
        for r in &c.reasons {
            let _ = writeln!(out, "     {}", reason_line(r));
        }
        out.push('\n');
    }
    if !diagnosis.remedies.is_empty() {
        let _ = writeln!(out, "Remedies (in the order to try)");
        for group in groups_in_order(diagnosis) {
            let _ = writeln!(out, "  {}", group_title(group));
            for r in diagnosis.remedies.iter().filter(|r| r.group == group) {
                let _ = writeln!(out, "  - {} [{}; cost {}]", r.text, r.id, r.cost);
                let _ = writeln!(out, "      answers: {}", r.answers.join(", "));
                if !r.cautions.is_empty() {
                    let _ = writeln!(out, "      cautions: {}", r.cautions.join(", "));
                }
                if let Some(w) = r.what_if.as_ref().filter(|w| w.indicator.is_empty()) {
                    let _ = writeln!(out, "      what-if: {}", w.note);
                } else if let Some(w) = &r.what_if {
                    let flag = if w.worse {
                        "  WARNING: makes it worse"
                    } else {
                        ""
                    };
                    let _ = writeln!(
                        out,
                        "      what-if: {} {} → {}{flag} ({})",
                        w.indicator, w.before, w.after, w.note
                    );
                }
            }
        }
        out.push('\n');
    }
    if !diagnosis.cautions.is_empty() {
        let _ = writeln!(out, "Cautions");
        for c in &diagnosis.cautions {
            let _ = writeln!(out, "  ! {} [{}]: {}", c.title, c.id, c.text);
        }
    }
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
        let _ = writeln!(
            out,
            "### {}. {} (`{}`) — belief {:.2}\n",
            i + 1,
            c.title,
            c.id,
            c.belief
        );
        let _ = writeln!(out, "{}\n", c.mechanism);
        let _ = writeln!(
            out,
            "| weight | symptom | test | zone | value | threshold | why |"
        );
        let _ = writeln!(out, "|---:|---|---|---|---|---|---|");
        for r in &c.reasons {
            let _ = writeln!(
                out,
                "| {:+.2} | {} | {} | {} | {} | {} | {} |",
                r.weight,
                r.symptom,
                r.test,
                r.zone.clone().unwrap_or_default(),
                r.value.clone().unwrap_or_default(),
                r.threshold.clone().unwrap_or_default().replace('|', "\\|"),
                r.text.replace('|', "\\|")
            );
        }
        out.push('\n');
    }
    if !diagnosis.remedies.is_empty() {
        let _ = writeln!(out, "## Remedies (in the order to try)\n");
        for group in groups_in_order(diagnosis) {
            let _ = writeln!(out, "### {}\n", group_title(group));
            for r in diagnosis.remedies.iter().filter(|r| r.group == group) {
                let _ = writeln!(out, "- **{}** (`{}`, cost {})", r.text, r.id, r.cost);
                let _ = writeln!(out, "  - answers: {}", r.answers.join(", "));
                if !r.cautions.is_empty() {
                    let _ = writeln!(out, "  - cautions: {}", r.cautions.join(", "));
                }
                if let Some(w) = r.what_if.as_ref().filter(|w| w.indicator.is_empty()) {
                    let _ = writeln!(out, "  - what-if: {}", w.note);
                } else if let Some(w) = &r.what_if {
                    let flag = if w.worse {
                        " — **warning: makes it worse**"
                    } else {
                        ""
                    };
                    let _ = writeln!(
                        out,
                        "  - what-if: {} {} → {}{flag} ({})",
                        w.indicator, w.before, w.after, w.note
                    );
                }
            }
            out.push('\n');
        }
    }
    if !diagnosis.cautions.is_empty() {
        let _ = writeln!(out, "## Cautions\n");
        for c in &diagnosis.cautions {
            let _ = writeln!(out, "- **{}** (`{}`): {}", c.title, c.id, c.text);
        }
        out.push('\n');
    }
    out
}
