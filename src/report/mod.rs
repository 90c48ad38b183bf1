//! Complaint reports: one document model ([`ReportDocument`]) built from a solved and diagnosed
//! case, rendered as Markdown, self-contained HTML with SVG plots, or JSON for other systems.
//!
//! The terminal UI and the `report` command both call [`prepare`] (solve, diagnose, optional
//! remedy re-solve) and then [`render`]. Everything that changes from run to run (the date, the
//! tool version) lives in [`ReportMeta`] so callers and tests can pin it.

mod document;
mod html;
mod json;
mod markdown;
pub mod measured_plot;
mod past_section;
pub mod plots;
mod prepare;
pub mod text_chart;

pub use document::{
    ASSUMED_DISCOUNT, AssumedShare, CaseSummary, CauseEntry, EstimateSection, InputLine,
    MODEL_LIMITS, MarginComparison, MarginLine, MarginsSection, MeasuredSection, ProfilePoint,
    Quantity, ReasonEntry, RemedyComparisonSummary, RemedyEntry, ReportDocument, StressSummary,
    ZoneSummary, build_document, margin_comparison, margins_section,
};
pub use prepare::{PrepareOptions, Solved, comparison, prepare, prepare_from_path, solved_report};

use crate::case::{Case, ResolvedCase};
use crate::diagnose::Diagnosis;
use crate::model::Profile;
use crate::units::UnitSystem;

/// How many assumed inputs a report names under "What the answer rests on".
pub const SENSITIVITY_SHOWN: usize = crate::diagnose::sensitivity::SHOWN;

/// Output formats of a report.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Format {
    #[default]
    Markdown,
    Html,
    Json,
}

impl Format {
    pub const ALL: [Format; 3] = [Format::Markdown, Format::Html, Format::Json];

    pub fn as_str(self) -> &'static str {
        match self {
            Format::Markdown => "markdown",
            Format::Html => "html",
            Format::Json => "json",
        }
    }

    /// The format a file name implies by its extension (`.md`, `.markdown`, `.html`, `.htm`,
    /// `.json`), if any.
    pub fn from_path(path: &std::path::Path) -> Option<Format> {
        let extension = path.extension()?.to_str()?.to_ascii_lowercase();
        match extension.as_str() {
            "md" | "markdown" => Some(Format::Markdown),
            "html" | "htm" => Some(Format::Html),
            "json" => Some(Format::Json),
            _ => None,
        }
    }
}

impl std::str::FromStr for Format {
    type Err = ReportError;
    fn from_str(text: &str) -> Result<Format, ReportError> {
        match text.trim().to_ascii_lowercase().as_str() {
            "markdown" | "md" => Ok(Format::Markdown),
            "html" | "htm" => Ok(Format::Html),
            "json" => Ok(Format::Json),
            other => Err(ReportError::UnknownFormat(other.to_string())),
        }
    }
}

/// When and by what a report was made. Pinned in tests so snapshots stay stable.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct ReportMeta {
    /// Date the report was made, `YYYY-MM-DD`.
    pub date: String,
    pub tool: String,
    pub tool_version: String,
    /// The case file the report was made from, as given by the user.
    pub source_file: Option<String>,
}

impl ReportMeta {
    /// Today's date (UTC) and this build's version.
    pub fn now(source_file: Option<String>) -> ReportMeta {
        ReportMeta::dated(&today_utc(), source_file)
    }

    /// A fixed date and this build's version.
    pub fn dated(date: &str, source_file: Option<String>) -> ReportMeta {
        ReportMeta {
            date: date.to_string(),
            tool: "rolltriage".to_string(),
            tool_version: env!("CARGO_PKG_VERSION").to_string(),
            source_file,
        }
    }
}

/// A chosen remedy applied to the case and re-solved: the "after" of a before/after comparison.
#[derive(Debug, Clone, PartialEq)]
pub struct RemedyComparison {
    pub remedy_id: String,
    pub remedy_text: String,
    /// What was changed, in words with units (e.g. "web tension 0.5 pli → 1.7 pli").
    pub change: String,
    pub after_case: ResolvedCase,
    pub after: Profile,
}

/// Everything a report is made of.
#[derive(Debug, Clone, PartialEq)]
pub struct ReportInput {
    /// The case as written (title, description, notes, symptoms).
    pub case: Case,
    pub resolved: ResolvedCase,
    pub profile: Profile,
    pub diagnosis: Diagnosis,
    pub remedy: Option<RemedyComparison>,
    pub meta: ReportMeta,
    pub units: UnitSystem,
    /// Which assumed inputs the answer rests on ([`crate::diagnose::sensitivity`]); `None` when
    /// not worked out (a report exported from the terminal UI without it).
    pub sensitivity: Option<crate::diagnose::sensitivity::Sensitivity>,
    /// Similar past complaints from a history store (`report --history`); `None` without one.
    pub similar_past: Option<Vec<crate::history::PastComplaint>>,
    /// The inverse estimate of the wound-in tension from the measurements (as `rolltriage
    /// compare` and the UI's F9 page show it), or why it could not be made; `None` without
    /// measurements or when not worked out.
    pub estimate: Option<Result<crate::evidence::InverseEstimate, String>>,
}

impl ReportInput {
    /// The same input with the sensitivity to the assumed inputs attached.
    pub fn with_sensitivity(self, sensitivity: crate::diagnose::sensitivity::Sensitivity) -> Self {
        ReportInput {
            sensitivity: Some(sensitivity),
            ..self
        }
    }

    /// The same input with the inverse estimate from the measurements attached (`None` leaves
    /// it out).
    pub fn with_estimate(
        self,
        estimate: Option<Result<crate::evidence::InverseEstimate, String>>,
    ) -> Self {
        ReportInput { estimate, ..self }
    }
}

/// Errors making a report.
#[derive(Debug, thiserror::Error)]
pub enum ReportError {
    #[error("unknown report format \"{0}\"; accepted: markdown (.md), html (.html), json (.json)")]
    UnknownFormat(String),
    #[error("cannot draw the {plot} plot: {message}")]
    Plot { plot: String, message: String },
    #[error("cannot write JSON: {0}")]
    Json(#[from] serde_json::Error),
    #[error(transparent)]
    Case(#[from] crate::case::CaseError),
    #[error(transparent)]
    Model(#[from] crate::model::ModelError),
    #[error(transparent)]
    Diagnose(#[from] crate::diagnose::DiagnoseError),
    #[error("remedy \"{id}\": {message}")]
    Remedy { id: String, message: String },
    #[error("the profile is empty: nothing to report")]
    EmptyProfile,
}

/// Render a report in `format`.
pub fn render(input: &ReportInput, format: Format) -> Result<String, ReportError> {
    let document = build_document(input)?;
    match format {
        Format::Markdown => Ok(markdown::render(&document, &text_chart::charts(input)?)),
        Format::Json => json::render(&document),
        Format::Html => {
            let pressure = plots::pressure_svg(input)?;
            let tangential = plots::tangential_svg(input)?;
            let hardness = measured_plot::hardness_svg(input)?;
            Ok(html::render(
                &document,
                &pressure,
                &tangential,
                hardness.as_ref(),
            ))
        }
    }
}

/// Today's civil date in UTC as `YYYY-MM-DD` (no time-zone crate needed for a date stamp).
pub fn today_utc() -> String {
    let seconds = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs())
        .unwrap_or(0);
    civil_date_from_days((seconds / 86_400) as i64)
}

/// Days since 1970-01-01 → `YYYY-MM-DD` (proleptic Gregorian; H. Hinnant's civil-from-days
/// algorithm, "chrono-Compatible Low-Level Date Algorithms", 2013).
pub fn civil_date_from_days(days: i64) -> String {
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let day_of_era = z.rem_euclid(146_097);
    let year_of_era =
        (day_of_era - day_of_era / 1460 + day_of_era / 36_524 - day_of_era / 146_096) / 365;
    let day_of_year = day_of_era - (365 * year_of_era + year_of_era / 4 - year_of_era / 100);
    let month_index = (5 * day_of_year + 2) / 153;
    let day = day_of_year - (153 * month_index + 2) / 5 + 1;
    let month = if month_index < 10 {
        month_index + 3
    } else {
        month_index - 9
    };
    let year = year_of_era + era * 400 + i64::from(month <= 2);
    format!("{year:04}-{month:02}-{day:02}")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn civil_dates_match_known_days() {
        // Known calendar facts: day 0 is 1970-01-01; 2000-03-01 is day 11017; 2026-12-02 is day 20789.
        assert_eq!(civil_date_from_days(0), "1970-01-01");
        assert_eq!(civil_date_from_days(11_017), "2000-03-01");
        assert_eq!(civil_date_from_days(20_789), "2026-12-02");
        assert_eq!(civil_date_from_days(-1), "1969-12-31");
    }

    #[test]
    fn format_from_extension_and_name() {
        use std::path::Path;
        assert_eq!(
            Format::from_path(Path::new("a/b.MD")),
            Some(Format::Markdown)
        );
        assert_eq!(Format::from_path(Path::new("r.htm")), Some(Format::Html));
        assert_eq!(Format::from_path(Path::new("r.json")), Some(Format::Json));
        assert_eq!(Format::from_path(Path::new("r.txt")), None);
        assert_eq!("HTML".parse::<Format>().unwrap(), Format::Html);
        assert!("pdf".parse::<Format>().is_err());
    }
}
