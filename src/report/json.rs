//! JSON rendering: the document model as pretty-printed JSON (schema `rolltriage-report/1`).

use super::ReportError;
use super::document::ReportDocument;

pub(super) fn render(doc: &ReportDocument) -> Result<String, ReportError> {
    let mut text = serde_json::to_string_pretty(doc)?;
    text.push('\n');
    Ok(text)
}
