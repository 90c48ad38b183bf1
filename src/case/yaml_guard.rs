//! YAML guards and error locating for case files: the size limit, the refusal of YAML aliases
//! (found on the parser's event stream, before anything expands them), the generic pre-pass
//! that refuses duplicate keys and applies the parser's nesting limit, and the rewriting of
//! serde's messages into ones that name the line, the column and the case field.
//!
//! [`first_alias`] is also used for rule files, material libraries and walk-throughs: nobody
//! writes aliases by hand in these files, and an alias chain ("billion laughs") makes the
//! parser's work grow exponentially with the file size.

use std::mem::MaybeUninit;

use serde::de::DeserializeOwned;
use unsafe_libyaml_norway as unsafe_libyaml;

use super::{CaseError, MAX_CASE_FILE_BYTES};

/// The message for a refused alias (files other than case files say it in their own words).
pub const ALIAS_REFUSED: &str =
    "a YAML alias (`*name`) is not accepted in a case file; write the value out instead";

/// Line and column (1-based) of the first YAML alias (`*name`) in `text`, if any. Reads the
/// parser's event stream, where an alias is one event, so the work is linear in the size of the
/// text whatever the aliases would expand to. Text that does not parse gives `None` here: the
/// parse that follows reports the syntax error.
pub fn first_alias(text: &str) -> Option<(usize, usize)> {
    // The parser keeps a pointer to itself once it has an input, so it lives on the heap and
    // does not move.
    let mut storage = Box::<unsafe_libyaml::yaml_parser_t>::new_uninit();
    let parser = storage.as_mut_ptr();
    // SAFETY: `parser` points to writable memory for a `yaml_parser_t`; initialising it is what
    // `yaml_parser_initialize` is for. On failure nothing was allocated.
    if unsafe { unsafe_libyaml::yaml_parser_initialize(parser) }.fail {
        return None;
    }
    // SAFETY: the parser is initialised and has no input yet; `text` outlives the parser (it
    // is deleted at the end of this function) and is valid UTF-8 of `text.len()` bytes.
    unsafe {
        unsafe_libyaml::yaml_parser_set_encoding(parser, unsafe_libyaml::YAML_UTF8_ENCODING);
        unsafe_libyaml::yaml_parser_set_input_string(parser, text.as_ptr(), text.len() as u64);
    }
    let mut found = None;
    loop {
        let mut event = MaybeUninit::<unsafe_libyaml::yaml_event_t>::uninit();
        let event = event.as_mut_ptr();
        // SAFETY: the parser is initialised with a live input; on success `event` is
        // initialised and owned by us until `yaml_event_delete`.
        if unsafe { unsafe_libyaml::yaml_parser_parse(parser, event) }.fail {
            break;
        }
        // SAFETY: `event` was initialised by the successful parse above.
        let (kind, mark) = unsafe { ((*event).type_, (*event).start_mark) };
        // SAFETY: the event is initialised and deleted exactly once.
        unsafe { unsafe_libyaml::yaml_event_delete(event) };
        match kind {
            unsafe_libyaml::YAML_ALIAS_EVENT => {
                found = Some((mark.line as usize + 1, mark.column as usize + 1));
                break;
            }
            unsafe_libyaml::YAML_STREAM_END_EVENT => break,
            _ => {}
        }
    }
    // SAFETY: the parser was initialised above and is deleted exactly once, before the box
    // that owns its memory.
    unsafe { unsafe_libyaml::yaml_parser_delete(parser) };
    drop(storage);
    found
}

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
    if let Some((line, column)) = first_alias(text) {
        return Err(CaseError::Syntax {
            origin: origin.to_string(),
            line,
            column,
            message: ALIAS_REFUSED.to_string(),
        });
    }
    // A generic pass first: it rejects duplicate keys anywhere (also inside `answers`, which
    // a typed map would silently overwrite) and applies the parser's nesting limit before any
    // typed work.
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
    message = plain_type_names(&message);
    if message.contains("repetition limit exceeded") {
        // Not reached for case files (aliases are refused before parsing); kept for safety.
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

/// serde's messages name Rust types ("expected struct WebInput", "expected f64", "integer
/// `…` as u128"): say what the case file needs instead.
fn plain_type_names(message: &str) -> String {
    // A whole number too large for 64 bits fails the generic pass with "as u128, expected any
    // YAML value".
    if let Some(at) = message.find("invalid type: integer `")
        && (message.contains("` as u128") || message.contains("` as i128"))
    {
        let start = at + "invalid type: integer `".len();
        let number = message[start..].split('`').next().unwrap_or("");
        return format!(
            "{}the whole number {number} is too large to read; write it with an exponent (e.g. 1e23) or a unit",
            &message[..at]
        );
    }
    let mut out = message.to_string();
    if let Some(at) = out.find("expected struct ") {
        let end = out[at + "expected struct ".len()..]
            .find(|c: char| !c.is_alphanumeric() && c != '_')
            .map_or(out.len(), |i| at + "expected struct ".len() + i);
        out.replace_range(at..end, "expected a section of `key: value` lines");
    }
    for (rust, plain) in [
        ("expected f64", "expected a plain number"),
        ("expected f32", "expected a plain number"),
        ("expected u64", "expected a whole number"),
        ("expected usize", "expected a whole number"),
        ("expected a sequence", "expected a list"),
        ("expected a map", "expected a mapping of `key: value` lines"),
        ("invalid type: sequence", "invalid type: a list"),
        ("invalid type: map", "invalid type: a mapping"),
    ] {
        out = out.replace(rust, plain);
    }
    out
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

/// One step of a field path: a key (`winding`) or a list index (`[2]`).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum PathStep<'a> {
    Key(&'a str),
    Index(usize),
}

pub(crate) fn path_steps(path: &str) -> Option<Vec<PathStep<'_>>> {
    let mut steps = Vec::new();
    for part in path.split('.') {
        let (key, mut rest) = match part.find('[') {
            Some(at) => (&part[..at], &part[at..]),
            None => (part, ""),
        };
        if !key.is_empty() {
            steps.push(PathStep::Key(key));
        }
        while let Some(inner) = rest.strip_prefix('[') {
            let end = inner.find(']')?;
            steps.push(PathStep::Index(inner[..end].trim().parse().ok()?));
            rest = &inner[end + 1..];
        }
    }
    Some(steps)
}

/// The key of a `key: value` line (quotes removed), if it is one.
fn line_key(content: &str) -> Option<&str> {
    let colon = content.find(':')?;
    let key = content[..colon].trim();
    let key = key
        .strip_prefix('"')
        .and_then(|k| k.strip_suffix('"'))
        .or_else(|| key.strip_prefix('\'').and_then(|k| k.strip_suffix('\'')))
        .unwrap_or(key);
    Some(key)
}

/// Where a field is written in block-style YAML text, found by indentation.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) struct Located {
    /// 0-based index of the field's line (for a list item, its `-` line).
    pub line: usize,
    /// Column of the field's key (for a list item, of the first key after the `-`).
    pub column: usize,
    /// 0-based index one past the last line of its children (the line itself when it has
    /// none); blank and comment lines after the last child are not included.
    pub end: usize,
    /// The indent of its children, when it has any.
    pub children: Option<usize>,
}

/// The 1-based line where the field at `path` (`winding.speed`, `winding.taper.steps[1].at`,
/// `symptoms[0].where`) is written in block-style YAML `text`; `None` when it is not written
/// there (a preset's value, a missing key) or the file uses flow style. Found by indentation,
/// which is how case files are written (`case new`, the UI's save, by hand).
pub(crate) fn field_line(text: &str, path: &str) -> Option<usize> {
    let steps = path_steps(path).filter(|steps| !steps.is_empty())?;
    locate(text, &steps).map(|at| at.line + 1)
}

/// Where the field at `steps` is written in block-style `text` (see [`field_line`]); the
/// empty path is the whole document, at line 0.
pub(crate) fn locate(text: &str, steps: &[PathStep<'_>]) -> Option<Located> {
    // (line index, indent, content) of every line that holds YAML.
    let mut lines: Vec<(usize, usize, String)> = text
        .lines()
        .enumerate()
        .filter_map(|(i, line)| {
            let content = line.trim_start();
            if content.is_empty() || content.starts_with('#') || content.starts_with("---") {
                return None;
            }
            Some((i, line.len() - content.len(), content.to_string()))
        })
        .collect();
    let mut range = 0..lines.len();
    let mut found = (0, 0);
    for step in steps {
        let indent = lines.get(range.start).filter(|_| !range.is_empty())?.1;
        let at = match *step {
            PathStep::Key(key) => range
                .clone()
                .find(|&j| lines[j].1 == indent && line_key(&lines[j].2) == Some(key))?,
            PathStep::Index(index) => {
                let item = range
                    .clone()
                    .filter(|&j| lines[j].1 == indent && lines[j].2.starts_with('-'))
                    .nth(index)?;
                // Read the item's first line as if the dash were a space: its keys then line
                // up with the keys on the lines below it.
                let rest = lines[item].2[1..].to_string();
                let content = rest.trim_start();
                lines[item].1 += 1 + rest.len() - content.len();
                lines[item].2 = content.to_string();
                found = (lines[item].0, lines[item].1);
                let end = (item + 1..range.end)
                    .find(|&j| lines[j].1 <= indent)
                    .unwrap_or(range.end);
                range = if lines[item].2.is_empty() {
                    item + 1..end
                } else {
                    item..end
                };
                continue;
            }
        };
        found = (lines[at].0, lines[at].1);
        // The children: deeper lines, and a list written at the key's own indent.
        let end = (at + 1..range.end)
            .find(|&j| {
                lines[j].1 < indent || (lines[j].1 == indent && !lines[j].2.starts_with('-'))
            })
            .unwrap_or(range.end);
        range = at + 1..end;
    }
    let (line, column) = found;
    let end = if range.is_empty() {
        line + 1
    } else {
        (lines[range.end - 1].0 + 1).max(line + 1)
    };
    let children = (!range.is_empty()).then(|| lines[range.start].1);
    Some(Located {
        line,
        column,
        end,
        children,
    })
}

#[cfg(test)]
mod field_line_tests {
    use super::field_line;

    const TEXT: &str = "title: t\n# a comment\nweb:\n  preset: newsprint\n  thickness: \"76 um\"\nwinding:\n  speed: \"900 furlongs\"\n  taper:\n    kind: steps\n    steps:\n      - at: \"300 mm\"\n        tension: \"1 pli\"\n      - at: \"600 mm\"\n        tension: \"9 psi\"\nsymptoms:\n- id: telescoping\n  where: core\n- id: starring\n  where: middle\n";

    #[test]
    fn finds_keys_and_list_items() {
        assert_eq!(field_line(TEXT, "web.thickness"), Some(5));
        assert_eq!(field_line(TEXT, "winding.speed"), Some(7));
        assert_eq!(field_line(TEXT, "winding.taper.steps[0].at"), Some(11));
        assert_eq!(field_line(TEXT, "winding.taper.steps[1].tension"), Some(14));
        assert_eq!(field_line(TEXT, "winding.taper.steps[1]"), Some(13));
        assert_eq!(field_line(TEXT, "symptoms[1].where"), Some(19));
        assert_eq!(field_line(TEXT, "symptoms[0].id"), Some(16));
    }

    #[test]
    fn fields_not_written_have_no_line() {
        assert_eq!(field_line(TEXT, "web.width"), None);
        assert_eq!(field_line(TEXT, "winding.taper.steps[2].at"), None);
        assert_eq!(field_line(TEXT, "core.preset"), None);
        assert_eq!(field_line(TEXT, "speed"), None);
        assert_eq!(field_line("web: {thickness: 1}", "web.thickness"), None);
    }
}
