//! The one registry of case fields: for every key of the case file its dotted path, plain-words
//! label, kind (unit kind, choice list, ...), accepted range, where a missing value comes from,
//! help text and an example. The resolver checks values against these ranges and takes defaults
//! from here; the terminal UI's inputs form, `case new`'s starter file, the report's input table
//! and the field tables of docs/case-format.md all read it. A test checks that every key of the
//! schema (`super::schema`) has an entry.

use crate::presets::{CorePreset, Sourced, WebPreset};
use crate::units::{QuantityKind, UnitSystem, format_quantity};

mod measured;
mod table;
mod winder;

pub use measured::*;
pub use table::*;
pub use winder::*;

/// Accepted range of a number: `min <= value <= max` (`min < value` when `min_exclusive`,
/// `value < max` when `max_exclusive`), and always finite.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Range {
    pub min: f64,
    pub max: f64,
    pub min_exclusive: bool,
    pub max_exclusive: bool,
    /// The quantity kind, for printing the limits with a unit; `None` for a plain number.
    pub kind: Option<QuantityKind>,
}

/// A field with no range, no form row and nothing else required: the common case for
/// sections, text and lists (the entry tables start from it with `..plain(…)`).
pub(crate) const fn plain(path: &'static str, label: &'static str, kind: FieldKind) -> Field {
    Field {
        path,
        label,
        form: None,
        kind,
        range: None,
        accepted_also: "",
        default: DefaultValue::Rule("none"),
        help: "",
        example: "",
    }
}

/// `min < value <= max`, a quantity.
pub const fn above(min: f64, max: f64, kind: QuantityKind) -> Range {
    Range {
        min,
        max,
        min_exclusive: true,
        max_exclusive: false,
        kind: Some(kind),
    }
}

/// `min <= value <= max`, a quantity.
pub const fn from(min: f64, max: f64, kind: QuantityKind) -> Range {
    Range {
        min,
        max,
        min_exclusive: false,
        max_exclusive: false,
        kind: Some(kind),
    }
}

/// `min < value <= max`, a plain number.
pub(crate) const fn plain_above(min: f64, max: f64) -> Range {
    Range {
        min,
        max,
        min_exclusive: true,
        max_exclusive: false,
        kind: None,
    }
}

/// `min <= value <= max`, a plain number.
pub(crate) const fn plain_from(min: f64, max: f64) -> Range {
    Range {
        min,
        max,
        min_exclusive: false,
        max_exclusive: false,
        kind: None,
    }
}

impl Range {
    /// The same range with its upper limit excluded (`value < max`).
    pub const fn below_max(self) -> Range {
        Range {
            max_exclusive: true,
            ..self
        }
    }

    /// `value` as the user would write it (SI unit for a quantity).
    pub fn show(&self, value: f64) -> String {
        match self.kind {
            Some(kind) => format_quantity(value, kind, UnitSystem::Si),
            // Very small or large plain numbers in exponent form (1e-300, not 300 zeros).
            None if value != 0.0 && (value.abs() < 1e-4 || value.abs() >= 1e15) => {
                format!("{value:e}")
            }
            None => format!("{value}"),
        }
    }

    /// The range in words, e.g. "more than 0 Pa and at most 100 MPa".
    pub fn describe(&self) -> String {
        let low = if self.min_exclusive {
            format!("more than {}", self.show(self.min))
        } else {
            format!("at least {}", self.show(self.min))
        };
        if self.max_exclusive {
            format!("{low} and less than {}", self.show(self.max))
        } else {
            format!("{low} and at most {}", self.show(self.max))
        }
    }

    pub fn contains(&self, value: f64) -> bool {
        let low = if self.min_exclusive {
            value > self.min
        } else {
            value >= self.min
        };
        let high = if self.max_exclusive {
            value < self.max
        } else {
            value <= self.max
        };
        low && high && value.is_finite()
    }
}

/// A preset family, for fields that name a preset.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PresetFamily {
    Web,
    Core,
}

/// What kind of value a field holds.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum FieldKind {
    /// A number with a unit (or a plain number in SI).
    Quantity(QuantityKind),
    /// A plain number (the range says which).
    Number,
    /// One of a fixed list of words.
    Choice(&'static [&'static str]),
    /// A web or core preset ID.
    Preset(PresetFamily),
    /// Free text.
    Text,
    /// A mapping of further fields (listed under its path).
    Section,
    /// A list of mappings (its fields are listed under `path[]`).
    List,
    /// A mapping of IDs to words (`answers`).
    Map,
}

/// Where a value the case file leaves out comes from.
#[derive(Debug, Clone, Copy)]
pub enum DefaultValue {
    /// The field must be given.
    Required,
    /// A value of the web preset.
    WebPreset(fn(&WebPreset) -> Sourced),
    /// A value of the core preset.
    CorePreset(fn(&CorePreset) -> Sourced),
    /// A fixed value with its source.
    Fixed(Sourced),
    /// Worked out from other values or left out; the text says how.
    Rule(&'static str),
}

/// One key of the case file.
#[derive(Debug, Clone, Copy)]
pub struct Field {
    /// Dotted path (`web.thickness`); list items as `winding.upsets[].tension`. Also the key of
    /// `ResolvedCase::assumed`.
    pub path: &'static str,
    /// Plain-words label (reports, docs).
    pub label: &'static str,
    /// The label of its row in the terminal UI's inputs form; `None` when the form does not
    /// show it.
    pub form: Option<&'static str>,
    pub kind: FieldKind,
    /// Accepted range of a number or quantity.
    pub range: Option<Range>,
    /// What else is required of the value (limits that depend on other fields), or the whole
    /// accepted text when there is no range.
    pub accepted_also: &'static str,
    pub default: DefaultValue,
    /// What it means, in a sentence.
    pub help: &'static str,
    /// An example the user can type.
    pub example: &'static str,
}

impl Field {
    /// The key within its section (`thickness` for `web.thickness`).
    pub fn key(&self) -> &'static str {
        self.path.rsplit('.').next().unwrap_or(self.path)
    }

    /// The section path (`web`, `winding.taper`, `winding.upsets[]`; empty for the top level).
    pub fn section(&self) -> &'static str {
        match self.path.rfind('.') {
            Some(at) => &self.path[..at],
            None => "",
        }
    }

    /// The value a missing field takes from the presets, and the preset ID it came from (empty
    /// for a fixed default). `None` when there is no such value.
    pub fn preset_value(
        &self,
        web: Option<&WebPreset>,
        core: Option<&CorePreset>,
    ) -> Option<(Sourced, String)> {
        match self.default {
            DefaultValue::WebPreset(get) => web.map(|w| (get(w), format!("preset {}", w.id))),
            DefaultValue::CorePreset(get) => core.map(|c| (get(c), format!("preset {}", c.id))),
            DefaultValue::Fixed(value) => Some((value, String::new())),
            DefaultValue::Required | DefaultValue::Rule(_) => None,
        }
    }

    /// The accepted range; a field without one accepts any finite number.
    pub fn range(&self) -> Range {
        self.range.unwrap_or(Range {
            min: f64::MIN,
            max: f64::MAX,
            min_exclusive: false,
            max_exclusive: false,
            kind: match self.kind {
                FieldKind::Quantity(kind) => Some(kind),
                _ => None,
            },
        })
    }

    /// The accepted values in words (docs, form hints).
    pub fn accepted_text(&self) -> String {
        let base = match (self.range, self.kind) {
            (Some(range), _) => range.describe(),
            (None, FieldKind::Choice(words)) => words.join(", "),
            (None, FieldKind::Preset(_)) => "see `rolltriage case presets`".to_string(),
            (None, FieldKind::Section) => "below".to_string(),
            (None, _) => String::new(),
        };
        match (base.is_empty(), self.accepted_also.is_empty()) {
            (true, _) => self.accepted_also.to_string(),
            (false, true) => base,
            (false, false) => format!("{base}; {}", self.accepted_also),
        }
    }

    /// Where a missing value comes from, in words (docs).
    pub fn default_text(&self) -> String {
        match self.default {
            DefaultValue::Required => "required".to_string(),
            DefaultValue::WebPreset(_) | DefaultValue::CorePreset(_) => "preset".to_string(),
            DefaultValue::Fixed(value) => match (self.range, self.kind) {
                (Some(range), _) => range.show(value.value),
                (None, FieldKind::Quantity(kind)) => {
                    format_quantity(value.value, kind, UnitSystem::Si)
                }
                _ => format!("{}", value.value),
            },
            DefaultValue::Rule(text) => text.to_string(),
        }
    }

    /// The kind in words (docs).
    pub fn kind_text(&self) -> &'static str {
        match self.kind {
            FieldKind::Quantity(kind) => kind.name(),
            FieldKind::Number => "number",
            FieldKind::Choice(_) => "name",
            FieldKind::Preset(_) => "preset ID",
            FieldKind::Text => "text",
            FieldKind::Section => "section",
            FieldKind::List => "list",
            FieldKind::Map => "map",
        }
    }
}

/// Layer count above which a roll is refused as absurd: two million layers is already a 2 m
/// roll of 0.5 µm capacitor film.
pub const MAX_LAYERS: f64 = 2e6;

/// The field with this dotted path (list items as `winding.upsets[].tension`).
pub fn field(path: &str) -> Option<&'static Field> {
    FIELDS.iter().copied().find(|f| f.path == path)
}

/// The fields of one section (`""` for the top level, `web`, `winding.upsets[]`, ...), in order.
pub fn section(section: &str) -> impl Iterator<Item = &'static Field> + '_ {
    FIELDS
        .iter()
        .copied()
        .filter(move |f| f.section() == section)
}

/// The Markdown table of one section's fields, as docs/case-format.md shows it.
pub fn markdown_table(section_path: &str) -> String {
    let mut out =
        String::from("| Key | Kind | Accepted | Default | Meaning |\n|---|---|---|---|---|\n");
    for f in section(section_path) {
        let cell = |text: &str| {
            if text.is_empty() {
                "—".to_string()
            } else {
                text.replace('|', "\\|")
            }
        };
        out.push_str(&format!(
            "| `{}` | {} | {} | {} | {} |\n",
            f.key(),
            f.kind_text(),
            cell(&f.accepted_text()),
            cell(&f.default_text()),
            cell(f.help),
        ));
    }
    out
}

/// The sections docs/case-format.md has a generated table for.
pub const DOC_SECTIONS: &[&str] = &[
    "",
    "web",
    "web.radial_stiffness",
    "core",
    "roll",
    "winding",
    "winding.taper",
    "winding.taper.steps[]",
    "winding.taper.points[]",
    "winding.upsets[]",
    "winding.nip_programme[]",
    "winding.drums",
    "symptoms[]",
    "measurements",
    "measurements.uncertainty",
    "measurements.hardness",
    "measurements.hardness.readings[]",
    "measurements.hardness.calibration[]",
    "measurements.lanes",
    "measurements.end_line",
    "measurements.set",
];
