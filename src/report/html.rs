//! Self-contained HTML rendering: one file, inline CSS, inline SVG plots, no scripts, no links.

use std::fmt::Write;

use super::document::{MarginsSection, RemedyEntry, ReportDocument};
use super::measured_plot::HardnessPlot;

/// Escape text for HTML element content and attribute values.
pub(crate) fn escape(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            _ => out.push(c),
        }
    }
    out
}

const STYLE: &str = "body{font-family:sans-serif;max-width:60em;margin:2em auto;padding:0 1em;\
color:#222;line-height:1.4}table{border-collapse:collapse;margin:0.5em 0 1em}\
th,td{border:1px solid #bbb;padding:0.25em 0.6em;text-align:left;vertical-align:top}\
th{background:#eee}.assumed{color:#8a4b00}.worse{color:#a00000;font-weight:bold}\
figure{margin:1em 0}figcaption{font-size:0.9em;color:#555}.meta{color:#555}\
.caution{border-left:4px solid #c80;padding-left:0.6em}";

pub(super) fn render(
    doc: &ReportDocument,
    pressure_svg: &str,
    tangential_svg: &str,
    hardness_plot: Option<&HardnessPlot>,
) -> String {
    let mut out = String::new();
    let _ = write_report(&mut out, doc, pressure_svg, tangential_svg, hardness_plot);
    out
}

fn write_report(
    out: &mut String,
    doc: &ReportDocument,
    pressure_svg: &str,
    tangential_svg: &str,
    hardness_plot: Option<&HardnessPlot>,
) -> std::fmt::Result {
    write_head(out, doc)?;
    write_case(out, doc)?;
    write_sensitivity(out, doc)?;
    write_complaint(out, doc)?;
    super::past_section::html(out, doc)?;
    write_stress(out, doc, pressure_svg, tangential_svg)?;
    write_margins(out, &doc.margins)?;
    write_measured(out, doc, hardness_plot)?;
    write_causes(out, doc)?;
    write_remedies(out, doc)?;
    write_remedy_comparison(out, doc)?;
    write_cautions(out, doc)?;
    write_model_limits(out, doc)?;
    writeln!(out, "</body>")?;
    writeln!(out, "</html>")?;
    Ok(())
}

/// The document head and the title, with when, by what and from which file the report was made.
fn write_head(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    let case = &doc.case;
    writeln!(out, "<!DOCTYPE html>")?;
    writeln!(out, "<html lang=\"en\">")?;
    writeln!(out, "<head>")?;
    writeln!(out, "<meta charset=\"utf-8\">")?;
    writeln!(
        out,
        "<title>Roll complaint report: {}</title>",
        escape(&case.title)
    )?;
    writeln!(out, "<style>{STYLE}</style>")?;
    writeln!(out, "</head>")?;
    writeln!(out, "<body>")?;
    writeln!(
        out,
        "<h1>Roll complaint report: {}</h1>",
        escape(&case.title)
    )?;
    writeln!(
        out,
        "<p class=\"meta\">Made {} with {} {}{}.</p>",
        escape(&doc.meta.date),
        escape(&doc.meta.tool),
        escape(&doc.meta.tool_version),
        doc.meta
            .source_file
            .as_ref()
            .map(|f| format!(" from <code>{}</code>", escape(f)))
            .unwrap_or_default()
    )?;
    Ok(())
}

/// "Case": description, symptoms, answers, notes and the inputs, given or assumed.
fn write_case(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    let case = &doc.case;
    writeln!(out, "<h2 id=\"case\">Case</h2>")?;
    if let Some(description) = &case.description {
        writeln!(out, "<p>{}</p>", escape(description))?;
    }
    writeln!(out, "<p>Observed symptoms:</p>")?;
    writeln!(out, "<ul>")?;
    for symptom in &case.symptoms {
        let title = crate::diagnose::words::symptom_title(&symptom.id);
        write!(out, "<li><strong>{}</strong>", escape(&title))?;
        if let Some(place) = &symptom.place {
            write!(out, " (at {})", escape(&place.replace('_', " ")))?;
        }
        if let Some(notes) = &symptom.notes {
            write!(out, ": {}", escape(notes.trim()))?;
        }
        writeln!(out, "</li>")?;
    }
    writeln!(out, "</ul>")?;
    if !case.answers.is_empty() {
        writeln!(out, "<p>Answers to the symptom questions:</p>")?;
        writeln!(out, "<ul>")?;
        for (question, answer) in &case.answers {
            let words = crate::diagnose::words::answer_plain(question, answer);
            writeln!(out, "<li>{}</li>", escape(&words))?;
        }
        writeln!(out, "</ul>")?;
    }
    if let Some(notes) = &case.notes {
        writeln!(out, "<p>Notes: {}</p>", escape(notes))?;
    }
    writeln!(out, "<h3>Inputs</h3>")?;
    writeln!(out, "<table id=\"inputs\">")?;
    writeln!(
        out,
        "<tr><th>Input</th><th>Value</th><th>Given or assumed</th></tr>"
    )?;
    for line in &case.inputs {
        let class = if line.assumed {
            " class=\"assumed\""
        } else {
            ""
        };
        let origin = line.origin_text();
        writeln!(
            out,
            "<tr{class}><td>{}</td><td>{}</td><td>{}</td></tr>",
            escape(&line.label),
            escape(&line.value),
            escape(&origin)
        )?;
    }
    writeln!(out, "</table>")?;
    writeln!(
        out,
        "<p>{}</p>",
        escape(&super::document::assumed_summary(&case.inputs))
    )?;
    Ok(())
}

/// "What the answer rests on": the assumed inputs the ranking depends on most.
fn write_sensitivity(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    if let Some(sensitivity) = &doc.sensitivity {
        writeln!(out, "<h3 id=\"rests-on\">What the answer rests on</h3>")?;
        let mut in_list = false;
        for line in sensitivity.lines(super::SENSITIVITY_SHOWN) {
            match line.strip_prefix("- ") {
                Some(item) => {
                    if !in_list {
                        writeln!(out, "<ul id=\"sensitivity\">")?;
                    }
                    writeln!(out, "<li>{}</li>", escape(item))?;
                    in_list = true;
                }
                None => {
                    if in_list {
                        writeln!(out, "</ul>")?;
                    }
                    writeln!(out, "<p>{}</p>", escape(&line))?;
                    in_list = false;
                }
            }
        }
        if in_list {
            writeln!(out, "</ul>")?;
        }
    }
    Ok(())
}

/// "Complaint record": the case's complaint lines, when it has any.
fn write_complaint(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    if !doc.complaint.is_empty() {
        writeln!(out, "<h2 id=\"complaint\">Complaint record</h2>")?;
        writeln!(out, "<table id=\"complaint-record\">")?;
        for (label, value) in &doc.complaint {
            writeln!(
                out,
                "<tr><th>{}</th><td>{}</td></tr>",
                escape(label),
                escape(value)
            )?;
        }
        writeln!(out, "</table>")?;
    }
    Ok(())
}

/// "Stress inside the roll": the summary figures, zones, warnings and the two plots.
fn write_stress(
    out: &mut String,
    doc: &ReportDocument,
    pressure_svg: &str,
    tangential_svg: &str,
) -> std::fmt::Result {
    let stress = &doc.stress;
    writeln!(out, "<h2 id=\"stress\">Stress inside the roll</h2>")?;
    writeln!(out, "<table id=\"stress-summary\">")?;
    writeln!(out, "<tr><th>Figure</th><th>Value</th></tr>")?;
    writeln!(
        out,
        "<tr><td>Pressure on the core</td><td>{} ({:.0} % of the rated {})</td></tr>",
        escape(&stress.core_pressure.text),
        stress.core_pressure_ratio * 100.0,
        escape(&stress.core_crush_pressure.text)
    )?;
    writeln!(
        out,
        "<tr><td>Peak interlayer pressure</td><td>{} at diameter {}</td></tr>",
        escape(&stress.peak_pressure.text),
        escape(&stress.peak_pressure_diameter.text)
    )?;
    writeln!(
        out,
        "<tr><td>Most compressive tangential stress</td><td>{} at diameter {}</td></tr>",
        escape(&stress.min_tangential_stress.text),
        escape(&stress.min_tangential_diameter.text)
    )?;
    writeln!(
        out,
        "<tr><td>Wound-in tension, core → outside</td><td>{} → {}</td></tr>",
        escape(&stress.wound_in_tension_start.text),
        escape(&stress.wound_in_tension_end.text)
    )?;
    if let Some((start, end)) = stress.air_film_ratio {
        writeln!(
            out,
            "<tr><td>Air film / combined roughness, start → outside</td><td>{start} → {end}</td></tr>"
        )?;
    }
    if let Some(weight) = &stress.roll_weight {
        writeln!(
            out,
            "<tr><td>Roll weight (web, core left out)</td><td>{}</td></tr>",
            escape(&weight.text)
        )?;
    }
    writeln!(out, "</table>")?;
    if !stress.zones.is_empty() {
        writeln!(out, "<table id=\"zones\">")?;
        writeln!(
            out,
            "<tr><th>Zone</th><th>Diameter from</th><th>to</th><th>Pressure min</th><th>mean</th>\
             <th>max</th><th>Lowest tangential stress</th></tr>"
        )?;
        for zone in &stress.zones {
            writeln!(
                out,
                "<tr><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td></tr>",
                escape(&zone.zone),
                escape(&zone.inner_diameter.text),
                escape(&zone.outer_diameter.text),
                escape(&zone.pressure_min.text),
                escape(&zone.pressure_mean.text),
                escape(&zone.pressure_max.text),
                escape(&zone.tangential_stress_min.text)
            )?;
        }
        writeln!(out, "</table>")?;
    }
    for warning in &stress.warnings {
        writeln!(out, "<p class=\"worse\">Warning: {}</p>", escape(warning))?;
    }
    let after_note = if doc.remedy_comparison.is_some() {
        " Dashed: after the chosen remedy."
    } else {
        ""
    };
    writeln!(out, "<figure id=\"pressure-plot\">")?;
    writeln!(out, "{pressure_svg}")?;
    writeln!(
        out,
        "<figcaption>Interlayer pressure against roll diameter, zones shaded.{after_note}</figcaption>"
    )?;
    writeln!(out, "</figure>")?;
    writeln!(out, "<figure id=\"tangential-plot\">")?;
    writeln!(out, "{tangential_svg}")?;
    writeln!(
        out,
        "<figcaption>Tangential (hoop) stress against roll diameter, zones shaded: tension above, \
         compression (layers pushed together along the web) in its own panel below, on its own \
         scale.{after_note}</figcaption>"
    )?;
    writeln!(out, "</figure>")?;
    Ok(())
}

/// "Measured on the roll, against the model", with the hardness plot and the inverse estimate of the wound-in tension.
fn write_measured(
    out: &mut String,
    doc: &ReportDocument,
    hardness_plot: Option<&HardnessPlot>,
) -> std::fmt::Result {
    if let Some(measured) = &doc.measured {
        writeln!(
            out,
            "<h2 id=\"measured\">Measured on the roll, against the model</h2>"
        )?;
        writeln!(
            out,
            "<table><thead><tr><th></th><th>Measured</th><th>Computed</th></tr></thead><tbody>"
        )?;
        for r in &measured.rows {
            writeln!(
                out,
                "<tr><td>{}</td><td>{}</td><td>{}</td></tr>",
                escape(&r.what),
                escape(&r.measured),
                escape(&r.computed)
            )?;
        }
        writeln!(out, "</tbody></table>")?;
        writeln!(out, "<ul>")?;
        for line in measured.lines.iter().filter(|l| !l.starts_with("  ")) {
            writeln!(out, "<li>{}</li>", escape(line))?;
        }
        writeln!(out, "</ul>")?;
        if let Some(plot) = hardness_plot {
            writeln!(out, "<figure id=\"hardness-plot\">")?;
            writeln!(out, "{}", plot.svg)?;
            writeln!(out, "<figcaption>{}</figcaption>", escape(&plot.caption))?;
            writeln!(out, "</figure>")?;
        }
        if let Some(estimate) = &measured.estimate {
            write_estimate(out, estimate)?;
        }
    }
    Ok(())
}

/// "Likely causes": each cause with its mechanism and the reasons for and against it.
fn write_causes(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    writeln!(out, "<h2 id=\"causes\">Likely causes</h2>")?;
    if doc.causes.is_empty() {
        writeln!(out, "<p>No cause reached a positive belief.</p>")?;
    }
    for cause in &doc.causes {
        writeln!(
            out,
            "<h3>{}. {} (belief {:.2})</h3>",
            cause.rank,
            escape(&cause.title),
            cause.belief
        )?;
        if !cause.mechanism.is_empty() {
            writeln!(out, "<p>{}</p>", escape(cause.mechanism.trim()))?;
        }
        writeln!(out, "<ul>")?;
        for reason in &cause.reasons {
            // The reason in words, made in one place for every output.
            let plain = crate::diagnose::words::reason_plain(reason);
            writeln!(out, "<li>{:+.2} — {}</li>", reason.weight, escape(&plain))?;
        }
        writeln!(out, "</ul>")?;
    }
    Ok(())
}

/// "Remedies, in the order to try", with predicted effects and cautions.
fn write_remedies(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    writeln!(
        out,
        "<h2 id=\"remedies\">Remedies, in the order to try</h2>"
    )?;
    let merged: Vec<_> = doc.remedies.iter().map(|e| e.remedy.clone()).collect();
    let mut open_list = false;
    for (i, RemedyEntry { rank, remedy }) in doc.remedies.iter().enumerate() {
        if let Some(heading) = crate::diagnose::remedies::heading(&merged, i) {
            if open_list {
                writeln!(out, "</ol>")?;
            }
            writeln!(out, "<h3>{}</h3>", escape(&heading))?;
            writeln!(out, "<ol start=\"{rank}\">")?;
            open_list = true;
        }
        write!(
            out,
            "<li><strong>{}</strong> [cost {}] — answers {}.",
            escape(remedy.text.trim()),
            escape(&remedy.cost),
            escape(&doc.answers_text(remedy))
        )?;
        if let Some(what_if) = &remedy.what_if {
            write!(
                out,
                "<br>Predicted effect: {} {} → {}",
                escape(&what_if.indicator_text()),
                escape(&what_if.before),
                escape(&what_if.after)
            )?;
            if what_if.worse {
                write!(
                    out,
                    " <span class=\"worse\">WORSE, do not apply without checking</span>"
                )?;
            }
            write!(
                out,
                ". {}",
                escape(&what_if.with_margins(what_if.note_text().trim()))
            )?;
        }
        for caution in doc
            .cautions
            .iter()
            .filter(|c| remedy.cautions.contains(&c.id))
        {
            write!(
                out,
                "<br><span class=\"caution\">⚠ Caution — {}: {}</span>",
                escape(&caution.title),
                escape(caution.text.trim())
            )?;
        }
        writeln!(out, "</li>")?;
    }
    if open_list {
        writeln!(out, "</ol>")?;
    }
    Ok(())
}

/// "What if": the chosen remedy applied and re-solved, before against after.
fn write_remedy_comparison(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    if let Some(comparison) = &doc.remedy_comparison {
        writeln!(
            out,
            "<h2 id=\"what-if\">What if: {}</h2>",
            escape(comparison.remedy_text.trim())
        )?;
        writeln!(
            out,
            "<p>Change applied and re-solved: {}.</p>",
            escape(&comparison.change)
        )?;
        writeln!(out, "<table id=\"comparison\">")?;
        writeln!(out, "<tr><th>Figure</th><th>Before</th><th>After</th></tr>")?;
        for figure in &comparison.figures {
            writeln!(
                out,
                "<tr><td>{}</td><td>{}</td><td>{}</td></tr>",
                escape(&figure.label),
                escape(&figure.before.text),
                escape(&figure.after.text)
            )?;
        }
        writeln!(out, "</table>")?;
        write_margin_comparison(out, &comparison.margins)?;
    }
    Ok(())
}

/// The margins against each failure before and after the change; a row that fails after is
/// marked.
fn write_margin_comparison(
    out: &mut String,
    margins: &[super::MarginComparison],
) -> std::fmt::Result {
    if margins.is_empty() {
        return Ok(());
    }
    writeln!(out, "<table id=\"comparison-margins\">")?;
    writeln!(
        out,
        "<tr><th>Failure</th><th>Margin before</th><th>Margin after</th>\
         <th>Where before → after</th><th>Verdict after</th></tr>"
    )?;
    for m in margins {
        let class = if m.after_verdict == "fails" {
            " class=\"worse\""
        } else {
            ""
        };
        writeln!(
            out,
            "<tr{class}><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td></tr>",
            escape(&m.mechanism),
            escape(&m.before_text),
            escape(&m.after_text),
            escape(&m.where_text()),
            escape(&m.verdict_after_text())
        )?;
    }
    writeln!(out, "</table>")
}

/// "Cautions": the diagnosis' cautions, or the general one when there are none.
fn write_cautions(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    writeln!(out, "<h2 id=\"cautions\">Cautions</h2>")?;
    writeln!(out, "<ul>")?;
    if doc.cautions.is_empty() {
        writeln!(
            out,
            "<li class=\"caution\">Work on or near a running winder only as your site procedures \
             allow; follow local codes, site procedures and lockout/tagout practice.</li>"
        )?;
    }
    for caution in &doc.cautions {
        writeln!(
            out,
            "<li class=\"caution\"><strong>{}</strong>: {}</li>",
            escape(&caution.title),
            escape(caution.text.trim())
        )?;
    }
    writeln!(out, "</ul>")?;
    Ok(())
}

/// "Limits of the model".
fn write_model_limits(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    writeln!(out, "<h2 id=\"limits\">Limits of the model</h2>")?;
    writeln!(out, "<ul>")?;
    for limit in &doc.model_limits {
        writeln!(out, "<li>{}</li>", escape(limit))?;
    }
    writeln!(out, "</ul>")?;
    Ok(())
}

/// "Margins against each failure": one row per mechanism, failing rows marked.
fn write_margins(out: &mut String, margins: &MarginsSection) -> std::fmt::Result {
    if margins.rows.is_empty() {
        return Ok(());
    }
    writeln!(out, "<h2 id=\"margins\">Margins against each failure</h2>")?;
    writeln!(out, "<table id=\"margins-table\">")?;
    writeln!(
        out,
        "<tr><th>Failure</th><th>Smallest margin</th><th>Where</th><th>Demand / capacity</th>\
         <th>Verdict</th></tr>"
    )?;
    for row in &margins.rows {
        let class = if row.verdict == "fails" {
            " class=\"worse\""
        } else {
            ""
        };
        writeln!(
            out,
            "<tr{class}><td>{}</td><td>{}</td><td>{}</td><td>{}: {} / {}</td><td>{}</td></tr>",
            escape(&row.mechanism),
            escape(&row.margin_text),
            escape(&row.where_text),
            escape(&row.measures),
            escape(&row.demand.text),
            escape(&row.capacity.text),
            escape(&row.verdict_text)
        )?;
    }
    writeln!(out, "</table>")?;
    writeln!(out, "<p>{}</p>", escape(margins.note()))
}

/// What the roll says about its winding: the inverse estimate's lines, residuals nested.
fn write_estimate(out: &mut String, estimate: &super::EstimateSection) -> std::fmt::Result {
    writeln!(
        out,
        "<h3 id=\"estimate\">What the roll says about its winding</h3>"
    )?;
    writeln!(out, "<ul>")?;
    for line in &estimate.lines {
        match line.strip_prefix("  ") {
            Some(detail) => writeln!(out, "<li class=\"detail\">{}</li>", escape(detail))?,
            None => writeln!(out, "<li>{}</li>", escape(line))?,
        }
    }
    writeln!(out, "</ul>")
}
