//! The report's "Similar past complaints" section (Markdown and HTML): the past complaints of
//! the plant's history store most like this case, each with its confirmed causes and what was
//! done about it. Written only when the report was made with a history store.

use std::fmt::Write;

use super::document::ReportDocument;
use super::html::escape;
use crate::history::PastComplaint;

const HEADING: &str = "Similar past complaints";
const NOTE: &str = "From the plant's complaint history, nearest first (distance 0 = alike, 1 = nothing in common: symptoms, where found, grade, material and the computed indicators).";

/// (label, text) lines telling one past complaint.
fn told(p: &PastComplaint) -> Vec<(&'static str, String)> {
    let mut out = vec![("Seen", p.symptoms.join(", "))];
    let place = p.place();
    if !place.is_empty() {
        out.push(("Where", place));
    }
    out.push(("Confirmed cause", p.cause_line()));
    out.push((
        "What was done",
        p.worked_line()
            .unwrap_or_else(|| "nothing recorded".to_string()),
    ));
    out
}

fn headline(p: &PastComplaint) -> String {
    let reference = p
        .reference
        .as_deref()
        .map(|r| format!(" ({r})"))
        .unwrap_or_default();
    format!(
        "Complaint {}{reference}, {}: {} — distance {:.2}",
        p.id,
        p.received.as_deref().unwrap_or("no date"),
        p.title,
        p.distance
    )
}

pub(super) fn markdown(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    let Some(past) = &doc.similar_past else {
        return Ok(());
    };
    writeln!(out, "## {HEADING}")?;
    writeln!(out)?;
    writeln!(out, "{NOTE}")?;
    writeln!(out)?;
    if past.is_empty() {
        writeln!(out, "None stored yet.")?;
        writeln!(out)?;
    }
    for p in past {
        writeln!(out, "- **{}**", headline(p))?;
        for (label, text) in told(p) {
            writeln!(out, "  - {label}: {text}")?;
        }
    }
    if !past.is_empty() {
        writeln!(out)?;
    }
    Ok(())
}

pub(super) fn html(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    let Some(past) = &doc.similar_past else {
        return Ok(());
    };
    writeln!(out, "<h2 id=\"similar-past\">{HEADING}</h2>")?;
    writeln!(out, "<p>{}</p>", escape(NOTE))?;
    if past.is_empty() {
        writeln!(out, "<p>None stored yet.</p>")?;
        return Ok(());
    }
    writeln!(out, "<ul id=\"similar-past-complaints\">")?;
    for p in past {
        writeln!(out, "<li><strong>{}</strong><dl>", escape(&headline(p)))?;
        for (label, text) in told(p) {
            writeln!(out, "<dt>{}</dt><dd>{}</dd>", escape(label), escape(&text))?;
        }
        writeln!(out, "</dl></li>")?;
    }
    writeln!(out, "</ul>")?;
    Ok(())
}
