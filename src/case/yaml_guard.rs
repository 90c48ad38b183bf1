//! YAML guards and error locating for case files: the size limit, the generic pre-pass that
//! refuses duplicate keys and applies the parser's nesting and alias limits, and the rewriting
//! of serde's messages into ones that name the line, the column and the case field.

use serde::de::DeserializeOwned;

use super::{CaseError, MAX_CASE_FILE_BYTES};

/// Parse `text` as one YAML document of type `T` behind the case-file guards; `origin` (usually
/// the file name) is used in messages.
pub(crate) fn parse_guarded<T: DeserializeOwned>(text: &str, origin: &str) -> Result<T, CaseError> {
    if text.len() as u64 > MAX_CASE_FILE_BYTES {
        return Err(CaseError::TooLarge {
            origin: origin.to_string(),
            size: text.len() as u64,
            limit: MAX_CASE_FILE_BYTES,
        });
    }
    // A generic pass first: it rejects duplicate keys anywhere (also inside `answers`, which
    // a typed map would silently overwrite) and applies the parser's nesting and
    // alias-expansion limits before any typed work.
    if let Err(error) = yaml::from_str::<yaml::Value>(text) {
        return Err(yaml_error(origin, text, &error));
    }
    yaml::from_str::<T>(text).map_err(|error| yaml_error(origin, text, &error))
}

/// Turn a YAML error into a message with line and column, rewriting serde's wording where a
/// winder operator would not follow it.
pub(crate) fn yaml_error(origin: &str, text: &str, error: &yaml::Error) -> CaseError {
    let mut message = error.to_string();
    // Some duplicate-key errors come without a usable position (line 1, column 1).
    let (line, column) = duplicate_key_location(text, &message)
        .or_else(|| error.location().map(|l| (l.line(), l.column())))
        .unwrap_or((1, 1));
    // serde_norway and libyaml put " at line L column C" into the text; we print the location
    // ourselves, once.
    while let Some(at) = message.find(" at line ") {
        let end = message[at..].find(',').map_or(message.len(), |i| at + i);
        message.replace_range(at..end, "");
    }
    // "web: unknown field `thikness`, expected one of `preset`, `material`, ..."
    if let Some(at) = message.find("unknown field `") {
        let section = message[..at].trim_end_matches(": ").trim().to_string();
        let rest = &message[at + "unknown field `".len()..];
        if let Some(end) = rest.find('`') {
            let key = rest[..end].to_string();
            let expected: Vec<&str> = rest[end + 1..]
                .split('`')
                .enumerate()
                .filter(|(i, _)| i % 2 == 1)
                .map(|(_, s)| s)
                .collect();
            let suggestion =
                crate::vocabulary::closest(&key, expected.iter().copied()).map(Box::from);
            return CaseError::UnknownKey {
                origin: origin.to_string(),
                line: u32::try_from(line).unwrap_or(u32::MAX),
                column: u32::try_from(column).unwrap_or(u32::MAX),
                section: if section.is_empty() {
                    "the top level".to_string()
                } else {
                    section
                },
                key,
                suggestion,
                accepted: if expected.is_empty() {
                    "none here".into()
                } else {
                    expected.join(", ").into()
                },
            };
        }
    }
    const UNTAGGED: &str = "data did not match any variant of untagged enum QuantityText";
    if let Some(at) = message.find(UNTAGGED) {
        // The parser loses the field name here but points at its key: read it from the text.
        let section = message[..at].trim_end_matches(": ").trim().to_string();
        let field = match key_at(text, line, column) {
            Some(key) if section.is_empty() => key,
            Some(key) => format!("{section}.{key}"),
            None => section,
        };
        message = format!(
            "{field}: expected a quantity: a string with its unit such as \"76 um\" or \"2 pli\", or a plain number in SI units"
        );
    }
    if message.contains("repetition limit exceeded") {
        message.push_str(" (too many YAML alias expansions; write the values out instead)");
    }
    if message.contains("recursion limit exceeded") {
        message.push_str(" (the YAML is nested too deeply for a case file)");
    }
    CaseError::Syntax {
        origin: origin.to_string(),
        line,
        column,
        message,
    }
}

/// The mapping key starting at 1-based `line`, `column`, if there is one.
fn key_at(text: &str, line: usize, column: usize) -> Option<String> {
    let row = text.lines().nth(line.checked_sub(1)?)?;
    let rest = row.get(column.checked_sub(1)?..)?;
    let key = rest.split(':').next()?.trim();
    let plain = !key.is_empty() && key.chars().all(|c| c.is_ascii_alphanumeric() || c == '_');
    plain.then(|| key.to_string())
}

/// The parser reports some duplicate keys without a position: find the second line that
/// starts with that key.
fn duplicate_key_location(text: &str, message: &str) -> Option<(usize, usize)> {
    let start = message.find("duplicate entry with key \"")? + "duplicate entry with key \"".len();
    let key = &message[start..start + message[start..].find('"')?];
    let mut seen = 0;
    for (index, line) in text.lines().enumerate() {
        let trimmed = line.trim_start();
        let rest = trimmed.strip_prefix(key).map(str::trim_start);
        if rest.is_some_and(|r| r.starts_with(':')) {
            seen += 1;
            if seen == 2 {
                return Some((index + 1, line.len() - trimmed.len() + 1));
            }
        }
    }
    None
}
