//! Saving a case into an existing case file by editing its text in place, so the user's
//! comments, key order, blank lines and untouched values stay as written.
//!
//! The file's parsed case and the case to save are compared as YAML trees; each difference
//! becomes one edit of the text: a changed value replaces only its value token (a trailing
//! comment on the line stays), a new key is added under its parent with the parent's
//! indentation (before the next key that follows it in the schema's order, or at the end of
//! the parent), a removed key loses its lines, a list whose length changed is written out
//! again. A quantity changed from a value typed with a unit ("3.5 pli") to an SI number is
//! written in the typed unit. The edited text is parsed back and must give exactly the case to
//! save; when it does not, or the text cannot be edited safely (flow style, anchors, tags,
//! block scalars), [`edit_in_place`] says why and the caller rewrites the whole file.

use yaml::{Mapping, Value};

use super::Case;
use super::yaml_guard::{self, PathStep};

/// Why a case file cannot be edited in place (the whole file is then rewritten).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct NotInPlace(pub String);

impl std::fmt::Display for NotInPlace {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.0)
    }
}

/// True when `text` has a YAML comment (a `#` at a line start or after a space).
pub fn has_comments(text: &str) -> bool {
    text.lines()
        .any(|l| l.trim_start().starts_with('#') || l.contains(" #"))
}

/// One step of a path into the YAML tree, owned.
#[derive(Debug, Clone, PartialEq)]
enum Step {
    Key(String),
    Index(usize),
}

/// One difference between the file and the case to save.
#[derive(Debug)]
enum Change {
    /// Write this value at the path (its key may be missing from the text).
    Set(Vec<Step>, Value),
    /// Remove the key at the path.
    Remove(Vec<Step>),
}

/// The text of the case file `old` (as read) changed into `case`, keeping everything the
/// change does not touch; see the module docs.
pub fn edit_in_place(old: &str, case: &Case) -> Result<String, NotInPlace> {
    let unreadable =
        |e: &dyn std::fmt::Display| NotInPlace(format!("it is not a readable case ({e})"));
    let before = Case::from_yaml_str(old, "the file").map_err(|e| unreadable(&e))?;
    let before = yaml::to_value(&before).map_err(|e| unreadable(&e))?;
    let mut after = yaml::to_value(case).map_err(|e| unreadable(&e))?;
    keep_typed_units(&before, &mut after, &mut Vec::new());
    let mut changes = Vec::new();
    diff(&before, &after, &mut Vec::new(), &mut changes);
    let mut text = old.to_string();
    // One edit at a time, each located on the text as it is then: no offsets to keep in step.
    for change in &changes {
        text = apply(&text, change, &after)?;
    }
    let check = Case::from_yaml_str(&text, "the edited file")
        .ok()
        .and_then(|c| yaml::to_value(&c).ok());
    if check.as_ref() != Some(&after) {
        return Err(NotInPlace(
            "its layout could not be edited in place without changing other values".into(),
        ));
    }
    Ok(text)
}

/// Where the user typed a quantity with a unit and the case to save holds an SI number for it,
/// write the number in the typed unit.
fn keep_typed_units(before: &Value, after: &mut Value, path: &mut Vec<String>) {
    match (before, after) {
        (Value::Mapping(b), Value::Mapping(a)) => {
            for (key, value) in a.iter_mut() {
                if let (Some(name), Some(old)) = (key.as_str(), b.get(key)) {
                    path.push(name.to_string());
                    keep_typed_units(old, value, path);
                    path.pop();
                }
            }
        }
        (Value::Sequence(b), Value::Sequence(a)) => {
            path.push("[]".to_string());
            for (old, value) in b.iter().zip(a.iter_mut()) {
                keep_typed_units(old, value, path);
            }
            path.pop();
        }
        (Value::String(typed), after @ Value::Number(_)) => {
            let field = path.join(".").replace(".[]", "[]");
            let kind = super::registry::field(&field).and_then(|f| match f.kind {
                super::registry::FieldKind::Quantity(kind) => Some(kind),
                _ => None,
            });
            if let (Some(kind), Some(si)) = (kind, after.as_f64())
                && let Some(text) = crate::units::in_typed_unit(si, typed, kind)
            {
                *after = Value::String(text);
            }
        }
        _ => {}
    }
}

fn diff(before: &Value, after: &Value, path: &mut Vec<Step>, out: &mut Vec<Change>) {
    match (before, after) {
        (Value::Mapping(b), Value::Mapping(a)) => {
            for (key, value) in a {
                let Some(name) = key.as_str() else { continue };
                path.push(Step::Key(name.to_string()));
                match b.get(key) {
                    Some(old) => diff(old, value, path, out),
                    None => out.push(Change::Set(path.clone(), value.clone())),
                }
                path.pop();
            }
            for key in b.keys() {
                if let Some(name) = key.as_str()
                    && !a.contains_key(key)
                {
                    path.push(Step::Key(name.to_string()));
                    out.push(Change::Remove(path.clone()));
                    path.pop();
                }
            }
        }
        // A list item by item only when the items are mappings in both and the length is the
        // same; otherwise the list is written out again.
        (Value::Sequence(b), Value::Sequence(a))
            if b.len() == a.len()
                && b.iter()
                    .zip(a)
                    .all(|(x, y)| x.is_mapping() && y.is_mapping()) =>
        {
            for (index, (old, value)) in b.iter().zip(a).enumerate() {
                path.push(Step::Index(index));
                diff(old, value, path, out);
                path.pop();
            }
        }
        (b, a) if b == a => {}
        _ => out.push(Change::Set(path.clone(), after.clone())),
    }
}

fn steps(path: &[Step]) -> Vec<PathStep<'_>> {
    path.iter()
        .map(|s| match s {
            Step::Key(k) => PathStep::Key(k),
            Step::Index(i) => PathStep::Index(*i),
        })
        .collect()
}

/// The value at `path` in `tree`.
fn value_at<'a>(tree: &'a Value, path: &[Step]) -> Option<&'a Value> {
    path.iter().try_fold(tree, |v, step| match step {
        Step::Key(k) => v.get(k.as_str()),
        Step::Index(i) => v.get(*i),
    })
}

/// Lines of `text` with their line endings.
fn raw_lines(text: &str) -> Vec<&str> {
    text.split_inclusive('\n').collect()
}

/// The line ending the file uses.
fn newline(text: &str) -> &'static str {
    if text.contains("\r\n") { "\r\n" } else { "\n" }
}

/// `{key: value}` as block YAML lines, each indented by `indent`, nested mappings by the
/// file's `step` (lists keep the writer's layout: their items' keys line up after the dash).
fn rendered(
    key: &str,
    value: &Value,
    indent: usize,
    step: usize,
    nl: &str,
) -> Result<Vec<String>, NotInPlace> {
    let mut map = Mapping::new();
    map.insert(Value::String(key.to_string()), value.clone());
    let text = yaml::to_string(&map)
        .map_err(|e| NotInPlace(format!("a value cannot be written ({e})")))?;
    let has_list = text.lines().any(|l| l.trim_start().starts_with('-'));
    Ok(text
        .lines()
        .map(|l| {
            let own = l.len() - l.trim_start_matches(' ').len();
            let own = if has_list { own } else { own / 2 * step };
            format!(
                "{}{}{nl}",
                " ".repeat(indent + own),
                l.trim_start_matches(' ')
            )
        })
        .collect())
}

/// Carry out one change on `text`.
fn apply(text: &str, change: &Change, after: &Value) -> Result<String, NotInPlace> {
    let nl = newline(text);
    let lines = raw_lines(text);
    let join = |parts: Vec<String>| parts.concat();
    let owned = |range: std::ops::Range<usize>| lines[range].iter().map(|l| l.to_string());
    match change {
        Change::Remove(path) => {
            let Some(at) = yaml_guard::locate(text, &steps(path)) else {
                return Ok(text.to_string());
            };
            if lines[at.line].trim_start().starts_with('-') {
                return Err(NotInPlace(
                    "a list item's first key cannot be removed in place".into(),
                ));
            }
            Ok(join(
                owned(0..at.line)
                    .chain(owned(at.end..lines.len()))
                    .collect(),
            ))
        }
        Change::Set(path, value) => {
            let Some((Step::Key(key), parent)) = path.split_last() else {
                return Err(NotInPlace("a list item cannot be replaced in place".into()));
            };
            match yaml_guard::locate(text, &steps(path)) {
                Some(at) => {
                    let line = lines[at.line];
                    let (head, token, tail) = split_value(line, at.column)?;
                    if token.starts_with(['{', '[', '&', '*', '!', '|', '>']) {
                        return Err(NotInPlace(
                            "it uses flow style, anchors, tags or block text where a value changed"
                                .into(),
                        ));
                    }
                    let block = rendered(key, value, at.column, indent_step(text), nl)?;
                    let first = block.first().map(String::as_str).unwrap_or_default();
                    let inline = first
                        .trim_start()
                        .split_once(':')
                        .map_or("", |(_, v)| v.trim_end_matches(['\r', '\n']).trim());
                    let new_line = if inline.is_empty() {
                        format!("{}{}", head.trim_end(), tail)
                    } else {
                        let quoted =
                            quoted_like(token, value).unwrap_or_else(|| inline.to_string());
                        format!("{head}{quoted}{tail}")
                    };
                    let mut parts: Vec<String> = owned(0..at.line).collect();
                    parts.push(new_line);
                    parts.extend(block.into_iter().skip(1));
                    parts.extend(owned(at.end..lines.len()));
                    Ok(join(parts))
                }
                None => insert(text, parent, key, after, nl),
            }
        }
    }
}

/// A string value written with the quotes the user used for the old token; `None` to write
/// it as YAML would.
fn quoted_like(token: &str, value: &Value) -> Option<String> {
    let text = value.as_str()?;
    if token.starts_with('"') {
        serde_json::to_string(text).ok()
    } else if token.starts_with('\'') {
        Some(format!("'{}'", text.replace('\'', "''")))
    } else {
        None
    }
}

/// Split a `key: value  # comment` line (its key at `column`) into the part up to the value,
/// the value token and the rest (trailing comment and line ending).
fn split_value(line: &str, column: usize) -> Result<(&str, &str, &str), NotInPlace> {
    let odd = || NotInPlace("a line could not be read as `key: value`".into());
    let rest = line.get(column..).ok_or_else(odd)?;
    let colon = key_end(rest).ok_or_else(odd)?;
    let after = &rest[colon + 1..];
    let start = column + colon + 1 + (after.len() - after.trim_start_matches(' ').len());
    let body = &line[start..];
    let end = match body.chars().next() {
        Some(q @ ('"' | '\'')) => quoted_end(body, q).ok_or_else(odd)?,
        _ => {
            let stop = body
                .find(" #")
                .or_else(|| body.find(['\r', '\n']))
                .unwrap_or(body.len());
            body[..stop].trim_end().len()
        }
    };
    Ok((&line[..start], &body[..end], &body[end..]))
}

/// Byte offset of the colon that ends the key of `content` (a quoted key may hold colons).
fn key_end(content: &str) -> Option<usize> {
    match content.chars().next() {
        Some(q @ ('"' | '\'')) => {
            let close = quoted_end(content, q)?;
            Some(close + content[close..].find(':')?)
        }
        _ => content.find(": ").or_else(|| {
            let t = content.trim_end_matches(['\r', '\n', ' ']);
            t.ends_with(':').then(|| t.len() - 1)
        }),
    }
}

/// The end (one past the closing quote) of the quoted scalar at the start of `text`.
fn quoted_end(text: &str, quote: char) -> Option<usize> {
    let mut chars = text.char_indices().skip(1).peekable();
    while let Some((at, c)) = chars.next() {
        if quote == '"' && c == '\\' {
            chars.next();
        } else if c == quote {
            // '' is an escaped quote inside single quotes.
            if quote == '\'' && chars.peek().is_some_and(|&(_, n)| n == '\'') {
                chars.next();
                continue;
            }
            return Some(at + 1);
        }
    }
    None
}

/// Add the missing key `key` under `parent`. When the parent is missing too, the highest
/// missing ancestor is added with everything under it.
fn insert(
    text: &str,
    parent: &[Step],
    key: &str,
    after: &Value,
    nl: &str,
) -> Result<String, NotInPlace> {
    // The nearest ancestor written in the text, and the step below it to add.
    let mut depth = parent.len();
    while depth > 0 && yaml_guard::locate(text, &steps(&parent[..depth])).is_none() {
        depth -= 1;
    }
    let full: Vec<Step> = parent
        .iter()
        .cloned()
        .chain(std::iter::once(Step::Key(key.to_string())))
        .collect();
    let (home, added) = (&full[..depth], &full[depth]);
    let Step::Key(added) = added else {
        return Err(NotInPlace("a list item cannot be added in place".into()));
    };
    let value = value_at(after, &full[..=depth])
        .ok_or_else(|| NotInPlace("a value to add was not found".into()))?;
    let Some(at) = yaml_guard::locate(text, &steps(home)) else {
        return Err(NotInPlace("the place for a new key was not found".into()));
    };
    let lines = raw_lines(text);
    if let Some(Step::Key(_)) = home.last() {
        let (_, token, _) = split_value(lines[at.line], at.column)?;
        if !token.is_empty() {
            return Err(NotInPlace(
                "it uses flow style where a key is added (`key: {…}`)".into(),
            ));
        }
    }
    let indent = at.children.unwrap_or(if home.is_empty() {
        0
    } else {
        at.column + indent_step(text)
    });
    // Before the next key that follows it in the schema's order and is written in the text
    // (and the comment lines just above that key, which belong to it); else after the parent.
    let siblings = value_at(after, home).and_then(Value::as_mapping);
    let next = siblings.and_then(|map| {
        map.keys()
            .filter_map(Value::as_str)
            .skip_while(|k| *k != added)
            .skip(1)
            .find_map(|k| {
                let mut path = home.to_vec();
                path.push(Step::Key(k.to_string()));
                yaml_guard::locate(text, &steps(&path))
                    .filter(|l| l.column == indent && !lines[l.line].trim_start().starts_with('-'))
            })
    });
    let mut position = match next {
        Some(next) => {
            let mut line = next.line;
            while line > 0 && {
                let above = lines[line - 1];
                above.trim_start().starts_with('#')
                    && above.len() - above.trim_start().len() == indent
            } {
                line -= 1;
            }
            line
        }
        None if home.is_empty() => lines.len(),
        None => at.end,
    };
    position = position.min(lines.len());
    let mut parts: Vec<String> = lines[..position].iter().map(|l| l.to_string()).collect();
    if parts.last().is_some_and(|l| !l.ends_with('\n')) {
        parts.push(nl.to_string());
    }
    parts.extend(rendered(added, value, indent, indent_step(text), nl)?);
    parts.extend(lines[position..].iter().map(|l| l.to_string()));
    Ok(parts.concat())
}

/// The file's indentation step: the indent of its first indented line (2 when none is).
fn indent_step(text: &str) -> usize {
    text.lines()
        .filter(|l| !l.trim().is_empty() && !l.trim_start().starts_with('#'))
        .map(|l| l.len() - l.trim_start_matches(' ').len())
        .find(|&n| n > 0)
        .unwrap_or(2)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::case::QuantityText;

    const TEXT: &str = "# Measured by the night shift, 3 May\ntitle: W3 reel 41\nweb:\n  preset: newsprint\n  thickness: \"76 um\"  # micrometer, three places\n\n  width: 1680 mm\nwinding:\n  # tension from the drive screen\n  tension: 3.5 pli  # dial reads pli\n  speed: 900 m/min\nsymptoms:\n  - id: telescoping\n    where: body\n";

    fn case() -> Case {
        Case::from_yaml_str(TEXT, "t").unwrap()
    }

    #[test]
    fn an_unchanged_case_leaves_the_text_byte_for_byte() {
        assert_eq!(edit_in_place(TEXT, &case()).unwrap(), TEXT);
    }

    #[test]
    fn every_demo_case_saves_unchanged() {
        let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("cases");
        let mut seen = 0;
        for entry in std::fs::read_dir(dir).unwrap() {
            let path = entry.unwrap().path();
            if path.extension().is_some_and(|e| e == "yaml")
                && let Ok((case, text)) = Case::load_with_text(&path)
            {
                assert_eq!(
                    edit_in_place(&text, &case).unwrap(),
                    text,
                    "{}",
                    path.display()
                );
                seen += 1;
            }
        }
        assert!(seen >= 10, "{seen} demo cases");
    }

    #[test]
    fn a_changed_value_keeps_comments_order_and_its_trailing_comment() {
        let mut case = case();
        case.winding.speed = Some(QuantityText::Text("1000 m/min".into()));
        case.web.thickness = Some(QuantityText::Text("80 um".into()));
        let edited = edit_in_place(TEXT, &case).unwrap();
        let expected = TEXT
            .replace("speed: 900 m/min", "speed: 1000 m/min")
            .replace("\"76 um\"", "\"80 um\"");
        assert_eq!(edited, expected);
    }

    #[test]
    fn an_si_number_for_a_value_typed_with_a_unit_is_written_in_that_unit() {
        let mut case = case();
        // 4 pli = 4 × 175.126835 N/m (NIST SP 811: 1 lbf/in = 175.1268 N/m).
        let si =
            crate::units::parse_quantity("", "4 pli", crate::units::QuantityKind::ForcePerWidth)
                .unwrap();
        case.winding.tension = Some(QuantityText::Number(si));
        let edited = edit_in_place(TEXT, &case).unwrap();
        assert!(
            edited.contains("  tension: 4 pli  # dial reads pli\n"),
            "{edited}"
        );
    }

    #[test]
    fn a_missing_key_is_added_under_its_parent_with_the_file_indentation() {
        let text = "title: t\nweb:\n    preset: newsprint\n# winder\nwinding:\n    speed: 900 m/min  # from the screen\n";
        let mut case = Case::from_yaml_str(text, "t").unwrap();
        case.winding.nip_load = Some(QuantityText::Text("1 kN/m".into()));
        case.core.crush_pressure = Some(QuantityText::Text("2 MPa".into()));
        let edited = edit_in_place(text, &case).unwrap();
        assert_eq!(
            edited,
            "title: t\nweb:\n    preset: newsprint\ncore:\n    crush_pressure: 2 MPa\n# winder\nwinding:\n    nip_load: 1 kN/m\n    speed: 900 m/min  # from the screen\n"
        );
    }

    #[test]
    fn a_removed_key_loses_its_lines_only() {
        let mut case = case();
        case.web.width = None;
        let edited = edit_in_place(TEXT, &case).unwrap();
        assert_eq!(edited, TEXT.replace("  width: 1680 mm\n", ""));
    }

    #[test]
    fn a_list_that_grew_is_written_out_again_in_place() {
        let mut case = case();
        let mut second = case.symptoms[0].clone();
        second.id = "starring".into();
        case.symptoms.push(second);
        let edited = edit_in_place(TEXT, &case).unwrap();
        assert!(edited.starts_with(&TEXT[..TEXT.find("symptoms:").unwrap()]));
        assert_eq!(Case::from_yaml_str(&edited, "t").unwrap(), case);
    }

    #[test]
    fn flow_style_is_refused_with_the_reason() {
        let text = "title: t  # mine\nwinding: {speed: 900 m/min}\n";
        let mut case = Case::from_yaml_str(text, "t").unwrap();
        case.winding.speed = Some(QuantityText::Text("1000 m/min".into()));
        let error = edit_in_place(text, &case).unwrap_err();
        assert!(error.0.contains("flow style"), "{error}");
    }

    #[test]
    fn windows_line_endings_are_kept() {
        let text = TEXT.replace('\n', "\r\n");
        let mut case = case();
        case.winding.speed = Some(QuantityText::Text("1000 m/min".into()));
        case.winding.nip_load = Some(QuantityText::Text("1 kN/m".into()));
        let edited = edit_in_place(&text, &case).unwrap();
        assert!(!edited.replace("\r\n", "").contains('\n'), "{edited:?}");
        assert!(edited.contains("speed: 1000 m/min\r\n"));
    }

    proptest::proptest! {
        /// Any new tension and speed, as SI numbers or as text, reach the file exactly and
        /// leave every other line as written.
        #[test]
        fn edited_values_read_back_exactly(tension in 1.0f64..2000.0, speed in 0.1f64..50.0, text_speed in proptest::bool::ANY) {
            let mut case = case();
            case.winding.tension = Some(QuantityText::Number(tension));
            case.winding.speed = Some(if text_speed {
                QuantityText::Text(format!("{} m/min", (speed * 600.0).round() / 10.0))
            } else {
                QuantityText::Number(speed)
            });
            let edited = edit_in_place(TEXT, &case).unwrap();
            let back = Case::from_yaml_str(&edited, "t").unwrap().resolve().unwrap();
            let want = case.resolve().unwrap();
            // Written in the typed units: equal to one part in 10¹² (a unit factor cannot
            // reach every binary number; units::in_typed_unit).
            let close = |got: f64, want: f64| (got - want).abs() <= 1e-12 * want.abs();
            let (got, want_tension) = (back.winding.tension.start_tension, want.winding.tension.start_tension);
            proptest::prop_assert!(close(got, want_tension), "{got} {want_tension}");
            proptest::prop_assert!(close(back.winding.speed, want.winding.speed), "{} {}", back.winding.speed, want.winding.speed);
            let kept: Vec<&str> = TEXT.lines().filter(|l| !l.contains("tension:") && !l.contains("speed:")).collect();
            let now: Vec<&str> = edited.lines().filter(|l| !l.contains("tension:") && !l.contains("speed:")).collect();
            proptest::prop_assert_eq!(kept, now);
            proptest::prop_assert!(edited.contains("pli  # dial reads pli"));
        }
    }
}
