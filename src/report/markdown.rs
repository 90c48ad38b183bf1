//! Markdown rendering of a report document.

use std::fmt::Write;

use super::document::{MarginsSection, RemedyEntry, ReportDocument};
use super::text_chart::TextCharts;

/// Markdown table cells may not contain pipes or line breaks.
fn cell(text: &str) -> String {
    text.replace('|', "\\|").replace('\n', " ")
}

pub(super) fn render(doc: &ReportDocument, charts: &TextCharts) -> String {
    let mut out = String::new();
    let _ = write_report(&mut out, doc, charts);
    out
}

fn write_report(out: &mut String, doc: &ReportDocument, charts: &TextCharts) -> std::fmt::Result {
    write_title(out, doc)?;
    write_case(out, doc)?;
    write_sensitivity(out, doc)?;
    write_complaint(out, doc)?;
    super::past_section::markdown(out, doc)?;
    write_stress(out, doc, charts)?;
    write_margins(out, &doc.margins)?;
    write_measured(out, doc, charts)?;
    write_causes(out, doc)?;
    write_remedies(out, doc)?;
    write_remedy_comparison(out, doc)?;
    write_cautions(out, doc)?;
    write_model_limits(out, doc)?;
    Ok(())
}

/// The title and the line saying when, by what and from which file the report was made.
fn write_title(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    let case = &doc.case;
    writeln!(out, "# Roll complaint report: {}", case.title)?;
    writeln!(out)?;
    writeln!(
        out,
        "Made {} with {} {}{}.",
        doc.meta.date,
        doc.meta.tool,
        doc.meta.tool_version,
        doc.meta
            .source_file
            .as_ref()
            .map(|f| format!(" from `{f}`"))
            .unwrap_or_default()
    )?;
    writeln!(out)?;
    Ok(())
}

/// "Case": description, symptoms, answers, notes and the inputs, given or assumed.
fn write_case(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    let case = &doc.case;
    writeln!(out, "## Case")?;
    writeln!(out)?;
    if let Some(description) = &case.description {
        writeln!(out, "{description}")?;
        writeln!(out)?;
    }
    writeln!(out, "Observed symptoms:")?;
    writeln!(out)?;
    for symptom in &case.symptoms {
        write!(
            out,
            "- **{}**",
            crate::diagnose::words::symptom_title(&symptom.id)
        )?;
        if let Some(place) = &symptom.place {
            write!(out, " (at {})", place.replace('_', " "))?;
        }
        if let Some(notes) = &symptom.notes {
            write!(out, ": {}", notes.trim())?;
        }
        writeln!(out)?;
    }
    writeln!(out)?;
    if !case.answers.is_empty() {
        writeln!(out, "Answers to the symptom questions:")?;
        writeln!(out)?;
        for (question, answer) in &case.answers {
            writeln!(
                out,
                "- {}",
                crate::diagnose::words::answer_plain(question, answer)
            )?;
        }
        writeln!(out)?;
    }
    if let Some(notes) = &case.notes {
        writeln!(out, "Notes: {notes}")?;
        writeln!(out)?;
    }
    writeln!(out, "### Inputs")?;
    writeln!(out)?;
    writeln!(out, "| Input | Value | Given or assumed |")?;
    writeln!(out, "|---|---|---|")?;
    for line in &case.inputs {
        let origin = line.origin_text();
        writeln!(
            out,
            "| {} | {} | {} |",
            cell(&line.label),
            cell(&line.value),
            cell(&origin)
        )?;
    }
    writeln!(out)?;
    writeln!(out, "{}", super::document::assumed_summary(&case.inputs))?;
    writeln!(out)?;
    Ok(())
}

/// "What the answer rests on": the assumed inputs the ranking depends on most.
fn write_sensitivity(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    if let Some(sensitivity) = &doc.sensitivity {
        writeln!(out, "### What the answer rests on")?;
        writeln!(out)?;
        let mut in_list = false;
        for line in sensitivity.lines(super::SENSITIVITY_SHOWN) {
            let item = line.starts_with("- ");
            if in_list && !item {
                writeln!(out)?;
            }
            writeln!(out, "{line}")?;
            if !item {
                writeln!(out)?;
            }
            in_list = item;
        }
        if in_list {
            writeln!(out)?;
        }
    }
    Ok(())
}

/// "Complaint record": the case's complaint lines, when it has any.
fn write_complaint(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    // After the case's inputs, so "### Inputs" stays under "## Case" (as in the HTML).
    if !doc.complaint.is_empty() {
        writeln!(out, "## Complaint record")?;
        writeln!(out)?;
        for (label, value) in &doc.complaint {
            writeln!(out, "- **{label}**: {value}")?;
        }
        writeln!(out)?;
    }
    Ok(())
}

/// "Stress inside the roll": the summary figures, zones, text charts and warnings.
fn write_stress(out: &mut String, doc: &ReportDocument, charts: &TextCharts) -> std::fmt::Result {
    let stress = &doc.stress;
    writeln!(out, "## Stress inside the roll")?;
    writeln!(out)?;
    writeln!(out, "| Figure | Value |")?;
    writeln!(out, "|---|---|")?;
    writeln!(
        out,
        "| Pressure on the core | {} ({:.0} % of the rated {}) |",
        stress.core_pressure.text,
        stress.core_pressure_ratio * 100.0,
        stress.core_crush_pressure.text
    )?;
    writeln!(
        out,
        "| Peak interlayer pressure | {} at diameter {} |",
        stress.peak_pressure.text, stress.peak_pressure_diameter.text
    )?;
    writeln!(
        out,
        "| Most compressive tangential stress | {} at diameter {} |",
        stress.min_tangential_stress.text, stress.min_tangential_diameter.text
    )?;
    writeln!(
        out,
        "| Wound-in tension, core → outside | {} → {} |",
        stress.wound_in_tension_start.text, stress.wound_in_tension_end.text
    )?;
    if let Some((start, end)) = stress.air_film_ratio {
        writeln!(
            out,
            "| Air film / combined roughness, start → outside | {start} → {end} |"
        )?;
    }
    if let Some(weight) = &stress.roll_weight {
        writeln!(
            out,
            "| Roll weight (web, core left out) | {} |",
            weight.text
        )?;
    }
    writeln!(
        out,
        "| Layers (elements × layers per element) | {} ({} × {}) |",
        stress.physical_layers, stress.elements, stress.layers_per_element
    )?;
    writeln!(out)?;
    if !stress.zones.is_empty() {
        writeln!(
            out,
            "| Zone | Diameter from | to | Pressure min | mean | max | Lowest tangential stress |"
        )?;
        writeln!(out, "|---|---|---|---|---|---|---|")?;
        for zone in &stress.zones {
            writeln!(
                out,
                "| {} | {} | {} | {} | {} | {} | {} |",
                zone.zone,
                zone.inner_diameter.text,
                zone.outer_diameter.text,
                zone.pressure_min.text,
                zone.pressure_mean.text,
                zone.pressure_max.text,
                zone.tangential_stress_min.text
            )?;
        }
        writeln!(out)?;
    }
    writeln!(out, "{}", charts.pressure)?;
    writeln!(out, "{}", charts.hoop)?;
    for warning in &stress.warnings {
        writeln!(out, "> Warning: {warning}")?;
        writeln!(out)?;
    }
    Ok(())
}

/// "Measured on the roll, against the model", with the inverse estimate of the wound-in tension.
fn write_measured(out: &mut String, doc: &ReportDocument, charts: &TextCharts) -> std::fmt::Result {
    if let Some(measured) = &doc.measured {
        writeln!(out, "## Measured on the roll, against the model")?;
        writeln!(out)?;
        writeln!(out, "| | Measured | Computed |")?;
        writeln!(out, "|---|---|---|")?;
        for r in &measured.rows {
            writeln!(
                out,
                "| {} | {} | {} |",
                cell(&r.what),
                cell(&r.measured),
                cell(&r.computed)
            )?;
        }
        writeln!(out)?;
        for line in measured.lines.iter().filter(|l| !l.starts_with("  ")) {
            writeln!(out, "- {line}")?;
        }
        writeln!(out)?;
        if let Some(chart) = &charts.hardness {
            writeln!(out, "{chart}")?;
        }
        if let Some(estimate) = &measured.estimate {
            write_estimate(out, estimate)?;
        }
    }
    Ok(())
}

/// "Likely causes": each cause with its mechanism and the reasons for and against it.
fn write_causes(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    writeln!(out, "## Likely causes")?;
    writeln!(out)?;
    if doc.causes.is_empty() {
        writeln!(out, "No cause reached a positive belief.")?;
        writeln!(out)?;
    }
    for cause in &doc.causes {
        writeln!(
            out,
            "### {}. {} (belief {:.2})",
            cause.rank, cause.title, cause.belief
        )?;
        writeln!(out)?;
        if !cause.mechanism.is_empty() {
            writeln!(out, "{}", cause.mechanism.trim())?;
            writeln!(out)?;
        }
        for reason in &cause.reasons {
            // The reason in words, made in one place for every output.
            let plain = crate::diagnose::words::reason_plain(reason);
            write!(out, "- {:+.2} — {plain}", reason.weight)?;
            writeln!(out)?;
        }
        writeln!(out)?;
    }
    Ok(())
}

/// "Remedies, in the order to try", with predicted effects and cautions.
fn write_remedies(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    writeln!(out, "## Remedies, in the order to try")?;
    writeln!(out)?;
    let merged: Vec<_> = doc.remedies.iter().map(|e| e.remedy.clone()).collect();
    for (i, RemedyEntry { rank, remedy }) in doc.remedies.iter().enumerate() {
        if let Some(heading) = crate::diagnose::remedies::heading(&merged, i) {
            writeln!(out, "### {heading}")?;
            writeln!(out)?;
        }
        writeln!(
            out,
            "{}. **{}** [cost {}] — answers {}.",
            rank,
            remedy.text.trim(),
            remedy.cost,
            doc.answers_text(remedy)
        )?;
        if let Some(what_if) = &remedy.what_if {
            writeln!(
                out,
                "   Predicted effect: {} {} → {}{}. {}",
                what_if.indicator_text(),
                what_if.before,
                what_if.after,
                if what_if.worse {
                    " — WORSE, do not apply without checking"
                } else {
                    ""
                },
                what_if.with_margins(what_if.note_text().trim())
            )?;
        }
        for caution in doc
            .cautions
            .iter()
            .filter(|c| remedy.cautions.contains(&c.id))
        {
            writeln!(
                out,
                "   ⚠ Caution — {}: {}",
                caution.title,
                caution.text.trim()
            )?;
        }
    }
    writeln!(out)?;
    Ok(())
}

/// "What if": the chosen remedy applied and re-solved, before against after.
fn write_remedy_comparison(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    if let Some(comparison) = &doc.remedy_comparison {
        writeln!(out, "## What if: {}", comparison.remedy_text.trim())?;
        writeln!(out)?;
        writeln!(out, "Change applied and re-solved: {}.", comparison.change)?;
        writeln!(out)?;
        writeln!(out, "| Figure | Before | After |")?;
        writeln!(out, "|---|---|---|")?;
        for figure in &comparison.figures {
            writeln!(
                out,
                "| {} | {} | {} |",
                figure.label, figure.before.text, figure.after.text
            )?;
        }
        writeln!(out)?;
        write_margin_comparison(out, &comparison.margins)?;
    }
    Ok(())
}

/// The margins against each failure before and after the change.
fn write_margin_comparison(
    out: &mut String,
    margins: &[super::MarginComparison],
) -> std::fmt::Result {
    if margins.is_empty() {
        return Ok(());
    }
    writeln!(
        out,
        "| Failure | Margin before | Margin after | Where before → after | Verdict after |"
    )?;
    writeln!(out, "|---|---|---|---|---|")?;
    for m in margins {
        writeln!(
            out,
            "| {} | {} | {} | {} | {} |",
            cell(&m.mechanism),
            m.before_text,
            m.after_text,
            cell(&m.where_text()),
            cell(&m.verdict_after_text()),
        )?;
    }
    writeln!(out)
}

/// "Cautions": the diagnosis' cautions, or the general one when there are none.
fn write_cautions(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    writeln!(out, "## Cautions")?;
    writeln!(out)?;
    if doc.cautions.is_empty() {
        writeln!(
            out,
            "- Work on or near a running winder only as your site procedures allow; follow local \
             codes, site procedures and lockout/tagout practice."
        )?;
    }
    for caution in &doc.cautions {
        writeln!(out, "- **{}**: {}", caution.title, caution.text.trim())?;
    }
    writeln!(out)?;
    Ok(())
}

/// "Limits of the model".
fn write_model_limits(out: &mut String, doc: &ReportDocument) -> std::fmt::Result {
    writeln!(out, "## Limits of the model")?;
    writeln!(out)?;
    for limit in &doc.model_limits {
        writeln!(out, "- {limit}")?;
    }
    Ok(())
}

/// "Margins against each failure": one row per mechanism.
fn write_margins(out: &mut String, margins: &MarginsSection) -> std::fmt::Result {
    if margins.rows.is_empty() {
        return Ok(());
    }
    writeln!(out, "## Margins against each failure")?;
    writeln!(out)?;
    writeln!(
        out,
        "| Failure | Smallest margin | Where | Demand / capacity | Verdict |"
    )?;
    writeln!(out, "|---|---|---|---|---|")?;
    for row in &margins.rows {
        writeln!(
            out,
            "| {} | {} | {} | {}: {} / {} | {} |",
            cell(&row.mechanism),
            row.margin_text,
            cell(&row.where_text),
            cell(&row.measures),
            cell(&row.demand.text),
            cell(&row.capacity.text),
            cell(&row.verdict_text)
        )?;
    }
    writeln!(out)?;
    writeln!(out, "{}", margins.note())?;
    writeln!(out)
}

/// What the roll says about its winding: the inverse estimate's lines, residuals nested.
fn write_estimate(out: &mut String, estimate: &super::EstimateSection) -> std::fmt::Result {
    writeln!(out, "### What the roll says about its winding")?;
    writeln!(out)?;
    for line in &estimate.lines {
        match line.strip_prefix("  ") {
            Some(detail) => writeln!(out, "  - {detail}")?,
            None => writeln!(out, "- {line}")?,
        }
    }
    writeln!(out)
}
