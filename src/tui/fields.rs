//! The inputs form: which case fields it shows, how each is edited (a quantity with units, a
//! plain number, a choice, a preset ID, text, a two-column table such as the nip programme), and
//! reading/writing them on a [`Case`]. Everything comes from the case field registry
//! ([`crate::case::registry`]): a field marked for the form there appears here, and it is read
//! and written by its dotted path through the case file's own serde form, so a new field needs
//! no code in the terminal UI.

use std::sync::LazyLock;

use serde_json::{Map, Value};

use crate::case::Case;
use crate::case::registry::{self, DefaultValue, Field, Range};
use crate::units::{QuantityKind, parse_quantity};

pub use crate::case::registry::PresetFamily;

/// How a field is edited and checked.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum FieldKind {
    /// A number with a unit, checked with `units::parse_quantity` and the field's range.
    Quantity(QuantityKind),
    /// A plain number in an accepted range.
    Number { min: f64, max: f64 },
    /// One of a fixed list of words (←/→ cycles through them).
    Choice(&'static [&'static str]),
    /// A web or core preset ID (←/→ cycles through the known presets).
    Preset(PresetFamily),
    /// Free text.
    Text,
    /// A list of rows of two quantities (a diameter and a value), typed as
    /// `400 mm: 5 pli; 800 mm: 3 pli`; the columns are the registry fields of the list's items.
    Table {
        /// The item fields' paths (`winding.nip_programme[].diameter`, ...).
        columns: [&'static str; 2],
    },
}

/// One row of the inputs form.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FieldSpec {
    /// Dotted path in the case file, also the key of `ResolvedCase::assumed`.
    pub path: &'static str,
    pub group: &'static str,
    pub label: &'static str,
    pub kind: FieldKind,
    /// An example the user can type.
    pub example: &'static str,
    /// The accepted range of a number or quantity, from the registry.
    pub range: Option<Range>,
}

/// The form group of a registry field: its top-level section.
fn group(field: &Field) -> &'static str {
    match field.path.split('.').next() {
        Some("web") => "Web",
        Some("core") => "Core",
        Some("roll") => "Roll",
        Some("winding") => "Winding",
        _ => "Case",
    }
}

/// The two quantity columns of a list field's items, when it has exactly those.
fn table_columns(field: &'static Field) -> Option<[&'static str; 2]> {
    let items = format!("{}[]", field.path);
    let columns: Vec<&'static Field> = registry::FIELDS
        .iter()
        .copied()
        .filter(|f| f.section() == items)
        .collect();
    match columns.as_slice() {
        [a, b]
            if matches!(a.kind, registry::FieldKind::Quantity(_))
                && matches!(b.kind, registry::FieldKind::Quantity(_)) =>
        {
            Some([a.path, b.path])
        }
        _ => None,
    }
}

fn spec(field: &'static Field, label: &'static str) -> Option<FieldSpec> {
    let kind = match field.kind {
        registry::FieldKind::Quantity(kind) => FieldKind::Quantity(kind),
        registry::FieldKind::Number => {
            let range = field.range();
            FieldKind::Number {
                min: range.min,
                max: range.max,
            }
        }
        registry::FieldKind::Choice(words) => FieldKind::Choice(words),
        registry::FieldKind::Preset(family) => FieldKind::Preset(family),
        registry::FieldKind::Text => FieldKind::Text,
        registry::FieldKind::List => FieldKind::Table {
            columns: table_columns(field)?,
        },
        registry::FieldKind::Section | registry::FieldKind::Map => return None,
    };
    Some(FieldSpec {
        path: field.path,
        group: group(field),
        label,
        kind,
        example: field.example,
        range: field.range,
    })
}

/// The registry field of a table column (its path came from the registry).
fn column(path: &'static str) -> &'static Field {
    registry::field(path).unwrap_or(&registry::NOTES)
}

/// Every field of the form, in display order (the registry's fields marked for the form).
pub static FIELDS: LazyLock<Vec<FieldSpec>> = LazyLock::new(|| {
    registry::FIELDS
        .iter()
        .filter_map(|f| f.form.and_then(|label| spec(f, label)))
        .collect()
});

use FieldKind::{Choice, Number, Preset, Quantity, Table, Text};

/// A choice or preset value as a person reads it: "centre-surface winding", a preset's title;
/// other words with spaces for underscores. The case file keeps the ID.
pub fn value_words(spec: &FieldSpec, value: &str) -> String {
    match spec.kind {
        FieldKind::Preset(PresetFamily::Web) => crate::presets::web_preset(value)
            .map_or_else(|| value.to_string(), |p| p.name.to_string()),
        FieldKind::Preset(PresetFamily::Core) => crate::presets::core_preset(value)
            .map_or_else(|| value.to_string(), |p| p.name.to_string()),
        FieldKind::Choice(_) if spec.path == "winding.method" => match value {
            "centre" => "centre winding".into(),
            "gap" => "gap winding".into(),
            "surface" => "surface winding".into(),
            "two_drum" => "two-drum winding".into(),
            "centre_surface" => "centre-surface winding".into(),
            other => other.replace('_', " "),
        },
        FieldKind::Choice(_) => value.replace('_', " "),
        _ => value.to_string(),
    }
}

/// Rewrite every entered quantity of the form in `units` ("525 N/m" → "3.001 pli"); returns
/// how many changed. Texts that do not parse are left as typed.
pub fn convert_units(case: &mut Case, units: crate::units::UnitSystem) -> usize {
    let mut converted = 0;
    for spec in FIELDS.iter() {
        let FieldKind::Quantity(kind) = spec.kind else {
            continue;
        };
        // A percentage reads the same in both systems.
        if kind == QuantityKind::Percent {
            continue;
        }
        let Some(text) = get(case, spec.path) else {
            continue;
        };
        let Ok(value) = parse_quantity(spec.path, &text, kind) else {
            continue;
        };
        let new = crate::units::format_quantity(value, kind, units);
        if new != text && set(case, spec, Some(&new)).is_ok() {
            converted += 1;
        }
    }
    converted
}

/// Find a field by its path.
pub fn field(path: &str) -> Option<&'static FieldSpec> {
    FIELDS.iter().find(|f| f.path == path)
}

/// A scalar of the case file as typed (numbers in Rust's shortest form); `None` when blank.
fn scalar_text(value: &Value) -> Option<String> {
    match value {
        Value::String(text) if text.is_empty() => None,
        Value::String(text) => Some(text.clone()),
        Value::Number(n) => n.as_f64().map(|v| format!("{v}")),
        _ => None,
    }
}

/// The node at a dotted path.
fn lookup<'a>(root: &'a Value, path: &str) -> Option<&'a Value> {
    path.split('.').try_fold(root, |node, key| node.get(key))
}

/// The text as entered in the case (None when the field is blank).
pub fn get(case: &Case, path: &str) -> Option<String> {
    let root = serde_json::to_value(case).ok()?;
    let node = lookup(&root, path)?;
    match (field(path).map(|f| f.kind), node) {
        (Some(Table { columns }), Value::Array(rows)) if !rows.is_empty() => Some(
            rows.iter()
                .map(|row| {
                    let cell = |c: &'static str| row.get(column(c).key()).and_then(scalar_text);
                    format!(
                        "{}: {}",
                        cell(columns[0]).unwrap_or_default(),
                        cell(columns[1]).unwrap_or_default()
                    )
                })
                .collect::<Vec<_>>()
                .join("; "),
        ),
        _ => scalar_text(node),
    }
}

/// Why a value typed into a field is not accepted (shown under the field).
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FieldError {
    #[error(transparent)]
    Unit(#[from] crate::units::UnitError),
    #[error("{0}: not a field of the form")]
    NotInForm(String),
    #[error("{path}: \"{text}\" is not accepted; a plain number {accepted}")]
    Number {
        path: &'static str,
        text: String,
        accepted: String,
    },
    #[error("{path}: {shown} is not accepted; {accepted}")]
    OutOfRange {
        path: &'static str,
        shown: String,
        accepted: String,
    },
    #[error("{path}: \"{text}\" is not accepted; one of {}", options.join(", "))]
    Choice {
        path: &'static str,
        text: String,
        options: &'static [&'static str],
    },
    #[error(
        "{path}: \"{text}\" is not accepted; rows of `{first}: {second}` separated by `;`, e.g. {example}"
    )]
    Table {
        path: &'static str,
        text: String,
        first: &'static str,
        second: &'static str,
        example: &'static str,
    },
    #[error("{path}: the case cannot hold this value ({reason})")]
    Case { path: &'static str, reason: String },
}

/// Check one quantity against its kind and range.
fn check_quantity(
    path: &'static str,
    text: &str,
    kind: QuantityKind,
    range: Option<Range>,
) -> Result<(), FieldError> {
    let value = parse_quantity(path, text, kind)?;
    match range {
        Some(range) if !range.contains(value) => Err(FieldError::OutOfRange {
            path,
            shown: range.show(value),
            accepted: range.describe(),
        }),
        _ => Ok(()),
    }
}

/// The rows of a typed table: `a: b; c: d` into pairs of trimmed, non-empty cells.
fn table_rows(text: &str) -> Option<Vec<(&str, &str)>> {
    text.split(';')
        .map(str::trim)
        .filter(|row| !row.is_empty())
        .map(|row| {
            let (a, b) = row.split_once(':')?;
            let (a, b) = (a.trim(), b.trim());
            (!a.is_empty() && !b.is_empty()).then_some((a, b))
        })
        .collect()
}

/// Check `text` for the field.
pub fn check(spec: &FieldSpec, text: &str) -> Result<(), FieldError> {
    let text = text.trim();
    if text.is_empty() {
        return Ok(());
    }
    match spec.kind {
        Quantity(kind) => check_quantity(spec.path, text, kind, spec.range),
        Number { min, max } => match (text.parse::<f64>(), spec.range) {
            (Ok(v), Some(range)) if range.contains(v) => Ok(()),
            (Ok(v), None) if v.is_finite() && (min..=max).contains(&v) => Ok(()),
            _ => Err(FieldError::Number {
                path: spec.path,
                text: text.to_string(),
                accepted: spec
                    .range
                    .map_or_else(|| format!("from {min} to {max}"), |range| range.describe()),
            }),
        },
        Choice(options) => {
            if options.contains(&text) {
                Ok(())
            } else {
                Err(FieldError::Choice {
                    path: spec.path,
                    text: text.to_string(),
                    options,
                })
            }
        }
        Table { columns } => {
            let rows = table_rows(text).ok_or_else(|| FieldError::Table {
                path: spec.path,
                text: text.to_string(),
                first: column(columns[0]).key(),
                second: column(columns[1]).key(),
                example: spec.example,
            })?;
            for (a, b) in rows {
                for (path, cell) in columns.into_iter().zip([a, b]) {
                    let f = column(path);
                    if let registry::FieldKind::Quantity(kind) = f.kind {
                        check_quantity(f.path, cell, kind, f.range)?;
                    }
                }
            }
            Ok(())
        }
        Preset(_) | Text => Ok(()),
    }
}

/// The case-file value of checked text.
fn value_of(spec: &FieldSpec, text: &str) -> Value {
    match spec.kind {
        Number { .. } => text
            .parse::<f64>()
            .ok()
            .and_then(serde_json::Number::from_f64)
            .map_or(Value::Null, Value::Number),
        Table { columns } => Value::Array(
            table_rows(text)
                .unwrap_or_default()
                .into_iter()
                .map(|(a, b)| {
                    let mut row = Map::new();
                    for (path, cell) in columns.into_iter().zip([a, b]) {
                        row.insert(
                            column(path).key().to_string(),
                            Value::String(cell.to_string()),
                        );
                    }
                    Value::Object(row)
                })
                .collect(),
        ),
        _ => Value::String(text.to_string()),
    }
}

/// A section the form creates gets its required choice (e.g. the taper's kind) from the
/// registry's example for it, so `amount` alone makes a whole taper.
fn fill_required(section: &str, object: &mut Map<String, Value>) {
    for f in registry::section(section) {
        if matches!(f.default, DefaultValue::Required)
            && matches!(f.kind, registry::FieldKind::Choice(_))
            && !object.contains_key(f.key())
        {
            object.insert(f.key().to_string(), Value::String(f.example.to_string()));
        }
    }
}

/// Put `value` at `path` (creating sections), or take the key away (`None`). Clearing a
/// required field of a section removes the section (a taper without kind is no taper);
/// clearing required text at the top level leaves it empty; sections left empty go.
fn write(root: &mut Value, path: &str, value: Option<Value>) {
    let keys: Vec<&str> = path.split('.').collect();
    let Some((last, parents)) = keys.split_last() else {
        return;
    };
    let required =
        registry::field(path).is_some_and(|f| matches!(f.default, DefaultValue::Required));
    match value {
        Some(value) => {
            let mut node = root;
            let mut section = String::new();
            for key in parents {
                section = if section.is_empty() {
                    (*key).to_string()
                } else {
                    format!("{section}.{key}")
                };
                let Some(object) = node.as_object_mut() else {
                    return;
                };
                let child = object
                    .entry((*key).to_string())
                    .or_insert_with(|| Value::Object(Map::new()));
                if let Some(created) = child.as_object_mut()
                    && created.is_empty()
                {
                    fill_required(&section, created);
                }
                node = child;
            }
            if let Some(object) = node.as_object_mut() {
                object.insert((*last).to_string(), value);
            }
        }
        None if required && parents.is_empty() => {
            if let Some(object) = root.as_object_mut() {
                object.insert((*last).to_string(), Value::String(String::new()));
            }
        }
        None if required => remove(root, &keys[..keys.len() - 1]),
        None => remove(root, &keys),
    }
}

/// Remove the key at `keys`, then every section on the way that it left empty.
fn remove(root: &mut Value, keys: &[&str]) {
    let Some((last, parents)) = keys.split_last() else {
        return;
    };
    let mut node = &mut *root;
    for key in parents {
        match node.get_mut(*key) {
            Some(child) => node = child,
            None => return,
        }
    }
    if let Some(object) = node.as_object_mut() {
        object.remove(*last);
        if object.is_empty() && !parents.is_empty() {
            remove(root, parents);
        }
    }
}

/// Write `text` (None or empty clears the field) after checking it.
pub fn set(case: &mut Case, spec: &FieldSpec, text: Option<&str>) -> Result<(), FieldError> {
    let text = text.map(str::trim).filter(|t| !t.is_empty());
    if let Some(t) = text {
        check(spec, t)?;
    }
    if field(spec.path).is_none() {
        return Err(FieldError::NotInForm(spec.path.to_string()));
    }
    let failed = |reason: String| FieldError::Case {
        path: spec.path,
        reason,
    };
    let mut root = serde_json::to_value(&*case).map_err(|e| failed(e.to_string()))?;
    write(&mut root, spec.path, text.map(|t| value_of(spec, t)));
    // A radial-stiffness law with none of its constants left says nothing: the section goes,
    // so the preset's law applies again.
    if text.is_none()
        && spec.path.starts_with("web.radial_stiffness.")
        && let Some(Value::Object(web)) = root.get_mut("web")
        && let Some(Value::Object(radial)) = web.get("radial_stiffness")
        && radial.iter().all(|(k, v)| k == "law" || v.is_null())
    {
        web.remove("radial_stiffness");
    }
    *case = serde_json::from_value(root).map_err(|e| failed(e.to_string()))?;
    Ok(())
}

/// The next (or previous) option of a choice field, starting from the current text.
pub fn cycle(options: &[String], current: Option<&str>, forward: bool) -> Option<String> {
    if options.is_empty() {
        return None;
    }
    let n = options.len();
    let next = match current.and_then(|c| options.iter().position(|o| o == c)) {
        Some(i) if forward => (i + 1) % n,
        Some(i) => (i + n - 1) % n,
        None if forward => 0,
        None => n - 1,
    };
    Some(options[next].clone())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_field_round_trips_a_choice_or_text() {
        let mut case = Case::default();
        let spec = field("winding.method").unwrap();
        set(&mut case, spec, Some("surface")).unwrap();
        assert_eq!(get(&case, "winding.method").as_deref(), Some("surface"));
        assert!(set(&mut case, spec, Some("sideways")).is_err());
        assert_eq!(get(&case, "winding.method").as_deref(), Some("surface"));
        set(&mut case, spec, None).unwrap();
        assert_eq!(get(&case, "winding.method"), None);
    }

    #[test]
    fn numbers_are_range_checked() {
        let mut case = Case::default();
        let spec = field("web.friction").unwrap();
        assert!(set(&mut case, spec, Some("3.5")).is_err());
        set(&mut case, spec, Some("0.35")).unwrap();
        assert_eq!(case.web.friction, Some(0.35));
    }

    #[test]
    fn taper_amount_creates_a_taper() {
        let mut case = Case::default();
        let spec = field("winding.taper.kind").unwrap();
        set(&mut case, spec, Some("hyperbolic")).unwrap();
        assert_eq!(case.winding.taper.as_ref().unwrap().kind, "hyperbolic");
        // Clearing the kind removes the taper; an amount alone makes one of the example kind.
        set(&mut case, spec, None).unwrap();
        assert_eq!(case.winding.taper, None);
        set(
            &mut case,
            field("winding.taper.amount").unwrap(),
            Some("20 %"),
        )
        .unwrap();
        let taper = case.winding.taper.as_ref().unwrap();
        assert_eq!(taper.kind, registry::TAPER_KIND.example);
        assert!(taper.amount.is_some());
    }

    #[test]
    fn tables_round_trip_and_are_checked_per_cell() {
        let mut case = Case::default();
        let spec = field("winding.nip_programme").unwrap();
        set(&mut case, spec, Some("400 mm: 5 pli; 800 mm : 3 pli")).unwrap();
        assert_eq!(case.winding.nip_programme.len(), 2);
        assert_eq!(
            get(&case, spec.path).as_deref(),
            Some("400 mm: 5 pli; 800 mm: 3 pli")
        );
        // A load in a length unit, and a row without its second cell, are refused in place.
        assert!(set(&mut case, spec, Some("400 mm: 5 mm")).is_err());
        assert!(set(&mut case, spec, Some("400 mm")).is_err());
        assert_eq!(case.winding.nip_programme.len(), 2);
        set(&mut case, spec, None).unwrap();
        assert!(case.winding.nip_programme.is_empty());
        assert_eq!(get(&case, spec.path), None);
    }

    #[test]
    fn drums_rows_write_the_drums_section_and_clearing_removes_it() {
        let mut case = Case::default();
        let spec = field("winding.drums.diameter").unwrap();
        set(&mut case, spec, Some("500 mm")).unwrap();
        assert!(case.winding.drums.is_some());
        assert_eq!(get(&case, spec.path).as_deref(), Some("500 mm"));
        set(&mut case, spec, None).unwrap();
        // An empty drums section would still say "two drums"; the form takes it away.
        assert_eq!(case.winding.drums, None);
    }

    #[test]
    fn clearing_the_title_leaves_it_empty() {
        let mut case = Case {
            title: "Reel 4".into(),
            ..Case::default()
        };
        set(&mut case, field("title").unwrap(), None).unwrap();
        assert_eq!(case.title, "");
        assert_eq!(get(&case, "title"), None);
    }

    #[test]
    fn every_path_is_readable() {
        let case = Case::default();
        for f in FIELDS.iter() {
            assert_eq!(get(&case, f.path), None, "{}", f.path);
        }
    }

    #[test]
    fn form_ranges_are_the_registry_ranges() {
        let friction = field("web.friction").unwrap();
        // The case file refuses a friction of 0 (more than 0 is required); so does the form.
        assert!(check(friction, "0").is_err());
        let thickness = field("web.thickness").unwrap();
        assert!(check(thickness, "76 um").is_ok());
        assert!(check(thickness, "5 m").is_err());
        let registry_paths: Vec<&str> = registry::FIELDS
            .iter()
            .filter(|f| f.form.is_some())
            .map(|f| f.path)
            .collect();
        let form_paths: Vec<&str> = FIELDS.iter().map(|f| f.path).collect();
        assert_eq!(registry_paths, form_paths);
    }

    #[test]
    fn cycling_wraps() {
        let options: Vec<String> = ["a", "b"].iter().map(|s| s.to_string()).collect();
        assert_eq!(cycle(&options, Some("b"), true).as_deref(), Some("a"));
        assert_eq!(cycle(&options, None, false).as_deref(), Some("b"));
    }
}
