//! The rows of the measurements popup (F9): one per field of the case's `measurements:`
//! section (every field the case file accepts, [`Field::paths`]), what each accepts, how its
//! value shows and how typed text goes into the section (checked for its kind of unit, kept as
//! typed). The popup itself is [`super::measure`].

use crate::case::QuantityText;
use crate::case::measurements::{
    BendInput, CalibrationInput, EndLineInput, HardnessInput, LanesInput, MeasurementsInput,
    ReadingInput, SetInput, UncertaintyInput,
};
use crate::evidence::{BendDirection, ParentPosition};
use crate::units::{QuantityKind, parse_quantity};

/// One editable row.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Field {
    Diameter,
    Length,
    Weight,
    BasisWeight,
    Width,
    AmountUncertainty,
    DiameterUncertainty,
    CaliperUncertainty,
    Hardness,
    HardnessScale,
    Calibration,
    Lanes,
    LanesScale,
    Bend,
    BandFrom,
    BandTo,
    Direction,
    Offset,
    CoreBore,
    Rolls,
    Bad,
    Positions,
    ParentRoll,
    InParent,
    ParentRolls,
    BadParentRolls,
}

/// The rows in reading order: (section heading or none, label, field).
pub const ROWS: &[(Option<&str>, &str, Field)] = &[
    (Some("Size of the roll"), "Diameter", Field::Diameter),
    (None, "Wound length", Field::Length),
    (None, "or net weight", Field::Weight),
    (None, "Basis weight", Field::BasisWeight),
    (None, "Roll width", Field::Width),
    (
        Some("How sure the size is (standard uncertainty)"),
        "Length or weight ±",
        Field::AmountUncertainty,
    ),
    (None, "Diameter ±", Field::DiameterUncertainty),
    (None, "Caliper ±", Field::CaliperUncertainty),
    (
        Some("Hardness along the radius"),
        "Readings",
        Field::Hardness,
    ),
    (None, "Tester", Field::HardnessScale),
    (None, "Calibration", Field::Calibration),
    (Some("Hardness across the width"), "Lanes", Field::Lanes),
    (None, "Tester", Field::LanesScale),
    (Some("Line on the roll end"), "Bends", Field::Bend),
    (None, "Band from ⌀", Field::BandFrom),
    (None, "Band to ⌀", Field::BandTo),
    (None, "Inner part turned", Field::Direction),
    (None, "Largest offset", Field::Offset),
    (Some("Core"), "Bore closed by", Field::CoreBore),
    (Some("The set"), "Rolls in the set", Field::Rolls),
    (None, "Bad rolls", Field::Bad),
    (None, "Bad positions", Field::Positions),
    (None, "Parent roll", Field::ParentRoll),
    (None, "Place in parent", Field::InParent),
    (None, "Parent rolls seen", Field::ParentRolls),
    (None, "  with bad rolls", Field::BadParentRolls),
];

const SCALES: [&str; 3] = ["", "higher is harder", "lower is harder"];
const BENDS: [&str; 5] = ["", "straight", "near the core", "in a band", "throughout"];
const DIRECTIONS: [&str; 3] = ["", "with the winding", "against the winding"];
const PLACES: [&str; 4] = ["", "outside", "middle", "near the core"];

impl Field {
    /// The fixed word list of a choice row (changed with ←/→ or Enter).
    pub fn choices(self) -> Option<&'static [&'static str]> {
        match self {
            Field::HardnessScale | Field::LanesScale => Some(&SCALES),
            Field::Bend => Some(&BENDS),
            Field::Direction => Some(&DIRECTIONS),
            Field::InParent => Some(&PLACES),
            _ => None,
        }
    }

    /// What the row accepts, shown under the list.
    pub fn hint(self) -> &'static str {
        match self {
            Field::Diameter => "outside diameter with its unit, e.g. 1012 mm or 39.8 in",
            Field::Length => "length counter, e.g. 10700 m or 35000 ft (or give the weight)",
            Field::Weight => "net web weight, core off, e.g. 520 kg or 1150 lb",
            Field::BasisWeight => "with the weight: e.g. 45 g/m2",
            Field::Width => "with the weight, when the case gives no web width: e.g. 1.6 m",
            Field::AmountUncertainty => "of the length counter or scale, e.g. 0.5 % (blank: 0.5 %)",
            Field::DiameterUncertainty => "of the diameter tape, e.g. 1 mm (blank: 1 mm)",
            Field::CaliperUncertainty => {
                "of the web caliper; it dominates the density comparison, e.g. 2 % (blank: 2 %)"
            }
            Field::Calibration => {
                "READING:PRESSURE pairs turning your tester's readings into interlayer pressure, \
                 e.g. 40:50 kPa, 60:400 kPa (the fit of the wound-in tension uses them)"
            }
            Field::Hardness => {
                "DIAMETER:READING pairs in your tester's scale, e.g. 300 mm:41, 600 mm:48, 900 mm:52"
            }
            Field::Lanes => "one reading per lane, lane 1 (reference edge) first, e.g. 52, 49, 51",
            Field::HardnessScale | Field::LanesScale => {
                "which way your tester reads (blank: higher is harder)"
            }
            Field::Bend => "where the straight line drawn on the roll end bends",
            Field::BandFrom | Field::BandTo => "for a band: its diameters, e.g. 500 mm",
            Field::Direction => "which way the inner part moved against the outer part",
            Field::Offset => "largest sideways offset of the line, e.g. 12 mm",
            Field::CoreBore => "how much the core's inside diameter closed, e.g. 0.8 mm",
            Field::Rolls | Field::Bad => "a whole number",
            Field::Positions => {
                "slit positions of the bad rolls (1 and the last are edges), e.g. 1, 5"
            }
            Field::ParentRoll => "its name or number",
            Field::InParent => "where in the parent roll the set was slit from",
            Field::ParentRolls => "how many parent rolls were looked at",
            Field::BadParentRolls => "how many of those parent rolls gave bad rolls",
        }
    }
}

fn quantity_text(q: &Option<QuantityText>) -> String {
    match q {
        None => String::new(),
        Some(QuantityText::Text(t)) => t.clone(),
        Some(QuantityText::Number(n)) => n.to_string(),
    }
}

fn scale_word(higher_is_harder: Option<bool>) -> &'static str {
    match higher_is_harder {
        None => "",
        Some(true) => SCALES[1],
        Some(false) => SCALES[2],
    }
}

fn join<T: ToString>(items: impl Iterator<Item = T>) -> String {
    items.map(|x| x.to_string()).collect::<Vec<_>>().join(", ")
}

impl Field {
    /// The case-file fields (registry paths, src/case/registry/measured.rs) the row edits; a
    /// test checks that every measurement field of the registry has its row.
    pub fn paths(self) -> &'static [&'static str] {
        match self {
            Field::Diameter => &["measurements.diameter"],
            Field::Length => &["measurements.length"],
            Field::Weight => &["measurements.weight"],
            Field::BasisWeight => &["measurements.basis_weight"],
            Field::Width => &["measurements.width"],
            Field::AmountUncertainty => &[
                "measurements.uncertainty",
                "measurements.uncertainty.amount",
            ],
            Field::DiameterUncertainty => &["measurements.uncertainty.diameter"],
            Field::CaliperUncertainty => &["measurements.uncertainty.caliper"],
            Field::Hardness => &[
                "measurements.hardness",
                "measurements.hardness.readings",
                "measurements.hardness.readings[].diameter",
                "measurements.hardness.readings[].value",
            ],
            Field::HardnessScale => &["measurements.hardness.higher_is_harder"],
            Field::Calibration => &[
                "measurements.hardness.calibration",
                "measurements.hardness.calibration[].reading",
                "measurements.hardness.calibration[].pressure",
            ],
            Field::Lanes => &["measurements.lanes", "measurements.lanes.readings"],
            Field::LanesScale => &["measurements.lanes.higher_is_harder"],
            Field::Bend => &["measurements.end_line", "measurements.end_line.bend"],
            Field::BandFrom => &["measurements.end_line.from_diameter"],
            Field::BandTo => &["measurements.end_line.to_diameter"],
            Field::Direction => &["measurements.end_line.direction"],
            Field::Offset => &["measurements.end_line.offset"],
            Field::CoreBore => &["measurements.core_bore_reduction"],
            Field::Rolls => &["measurements.set", "measurements.set.rolls"],
            Field::Bad => &["measurements.set.bad"],
            Field::Positions => &["measurements.set.bad_positions"],
            Field::ParentRoll => &["measurements.set.parent_roll"],
            Field::InParent => &["measurements.set.position_in_parent"],
            Field::ParentRolls => &["measurements.set.parent_rolls"],
            Field::BadParentRolls => &["measurements.set.bad_parent_rolls"],
        }
    }
}

/// The row's value as it shows (and as the editor starts).
pub fn value(m: &MeasurementsInput, field: Field) -> String {
    let end = m.end_line.as_ref();
    let set = m.set.as_ref();
    let uncertainty = m.uncertainty.clone().unwrap_or_default();
    match field {
        Field::Diameter => quantity_text(&m.diameter),
        Field::Length => quantity_text(&m.length),
        Field::Weight => quantity_text(&m.weight),
        Field::BasisWeight => quantity_text(&m.basis_weight),
        Field::Width => quantity_text(&m.width),
        Field::AmountUncertainty => quantity_text(&uncertainty.amount),
        Field::DiameterUncertainty => quantity_text(&uncertainty.diameter),
        Field::CaliperUncertainty => quantity_text(&uncertainty.caliper),
        Field::Calibration => m.hardness.as_ref().map_or_else(String::new, |h| {
            join(
                h.calibration
                    .iter()
                    .map(|c| format!("{}:{}", c.reading, quantity_text(&Some(c.pressure.clone())))),
            )
        }),
        Field::Hardness => m.hardness.as_ref().map_or_else(String::new, |h| {
            join(
                h.readings
                    .iter()
                    .map(|r| format!("{}:{}", quantity_text(&Some(r.diameter.clone())), r.value)),
            )
        }),
        Field::HardnessScale => {
            scale_word(m.hardness.as_ref().and_then(|h| h.higher_is_harder)).to_string()
        }
        Field::Lanes => m
            .lanes
            .as_ref()
            .map_or_else(String::new, |l| join(l.readings.iter())),
        Field::LanesScale => {
            scale_word(m.lanes.as_ref().and_then(|l| l.higher_is_harder)).to_string()
        }
        Field::Bend => match end.map(|e| e.bend) {
            None => "",
            Some(BendInput::Straight) => BENDS[1],
            Some(BendInput::NearCore) => BENDS[2],
            Some(BendInput::Band) => BENDS[3],
            Some(BendInput::Throughout) => BENDS[4],
        }
        .to_string(),
        Field::BandFrom => end.map_or_else(String::new, |e| quantity_text(&e.from_diameter)),
        Field::BandTo => end.map_or_else(String::new, |e| quantity_text(&e.to_diameter)),
        Field::Direction => match end.and_then(|e| e.direction) {
            None => "",
            Some(BendDirection::WithWinding) => DIRECTIONS[1],
            Some(BendDirection::AgainstWinding) => DIRECTIONS[2],
        }
        .to_string(),
        Field::Offset => end.map_or_else(String::new, |e| quantity_text(&e.offset)),
        Field::CoreBore => quantity_text(&m.core_bore_reduction),
        Field::Rolls => set.map_or_else(String::new, |s| s.rolls.to_string()),
        Field::Bad => set.map_or_else(String::new, |s| s.bad.to_string()),
        Field::Positions => set.map_or_else(String::new, |s| join(s.bad_positions.iter())),
        Field::ParentRoll => set.and_then(|s| s.parent_roll.clone()).unwrap_or_default(),
        Field::ParentRolls => set
            .and_then(|s| s.parent_rolls)
            .map_or_else(String::new, |n| n.to_string()),
        Field::BadParentRolls => set
            .and_then(|s| s.bad_parent_rolls)
            .map_or_else(String::new, |n| n.to_string()),
        Field::InParent => match set.and_then(|s| s.position_in_parent) {
            None => "",
            Some(ParentPosition::Outside) => PLACES[1],
            Some(ParentPosition::Middle) => PLACES[2],
            Some(ParentPosition::NearCore) => PLACES[3],
        }
        .to_string(),
    }
}

/// A quantity typed into `field`: checked for its kind of unit and sign, kept as typed.
fn quantity(
    label: &str,
    text: &str,
    kind: QuantityKind,
    zero_ok: bool,
) -> Result<Option<QuantityText>, String> {
    let text = text.trim();
    if text.is_empty() {
        return Ok(None);
    }
    let v = parse_quantity(label, text, kind).map_err(|e| e.to_string())?;
    if !(v > 0.0 || (zero_ok && v == 0.0)) {
        return Err(format!(
            "{label} = {text}: accepted {}",
            if zero_ok {
                "zero or more"
            } else {
                "more than zero"
            }
        ));
    }
    Ok(Some(QuantityText::Text(text.to_string())))
}

fn number(label: &str, text: &str) -> Result<f64, String> {
    let t = text.trim();
    t.parse::<f64>()
        .ok()
        .filter(|v| v.is_finite())
        .ok_or_else(|| format!("{label}: \"{t}\" is not a number"))
}

fn count(label: &str, text: &str) -> Result<u32, String> {
    let t = text.trim();
    t.parse::<u32>()
        .map_err(|_| format!("{label}: \"{t}\" is not a whole number (0 or more)"))
}

fn items(text: &str) -> impl Iterator<Item = &str> {
    text.split([',', ';'])
        .map(str::trim)
        .filter(|s| !s.is_empty())
}

/// `LEFT:RIGHT` pairs separated by commas; `what` names them in a refusal ("hardness",
/// "DIAMETER:READING", "300 mm:41"), `read` turns one pair's two sides into its entry.
fn pairs<T>(
    text: &str,
    what: [&str; 3],
    read: impl Fn(&str, &str) -> Result<T, String>,
) -> Result<Vec<T>, String> {
    let [name, form, example] = what;
    items(text)
        .map(|item| {
            let (left, right) = item
                .rsplit_once(':')
                .ok_or_else(|| format!("{name}: \"{item}\" is not {form}, e.g. {example}"))?;
            read(left, right)
        })
        .collect()
}

/// A quantity a pair cannot do without.
fn required(quantity: Option<QuantityText>, missing: &str) -> Result<QuantityText, String> {
    quantity.ok_or_else(|| missing.to_string())
}

fn readings(text: &str) -> Result<Vec<ReadingInput>, String> {
    pairs(
        text,
        ["hardness", "DIAMETER:READING", "300 mm:41"],
        |d, r| {
            let diameter = quantity("hardness diameter", d, QuantityKind::Length, false)?;
            Ok(ReadingInput {
                diameter: required(diameter, "hardness: a reading has no diameter")?,
                value: number("hardness reading", r)?,
            })
        },
    )
}

fn calibration(text: &str) -> Result<Vec<CalibrationInput>, String> {
    pairs(
        text,
        ["calibration", "READING:PRESSURE", "40:50 kPa"],
        |r, p| {
            let pressure = quantity("calibration pressure", p, QuantityKind::Stress, true)?;
            Ok(CalibrationInput {
                reading: number("calibration reading", r)?,
                pressure: required(pressure, "calibration: a point has no pressure")?,
            })
        },
    )
}

/// A count that may be left blank.
fn optional_count(label: &str, text: &str) -> Result<Option<u32>, String> {
    if text.trim().is_empty() {
        return Ok(None);
    }
    count(label, text).map(Some)
}

fn set_mut(m: &mut MeasurementsInput) -> &mut SetInput {
    m.set.get_or_insert_with(|| SetInput {
        rolls: 0,
        bad: 0,
        bad_positions: Vec::new(),
        parent_roll: None,
        position_in_parent: None,
        parent_rolls: None,
        bad_parent_rolls: None,
    })
}

fn end_mut(m: &mut MeasurementsInput) -> &mut EndLineInput {
    m.end_line.get_or_insert(EndLineInput {
        bend: BendInput::Straight,
        from_diameter: None,
        to_diameter: None,
        direction: None,
        offset: None,
    })
}

fn pick<T: Copy>(text: &str, words: &[&str], values: &[T]) -> Result<Option<T>, String> {
    let t = text.trim();
    if t.is_empty() {
        return Ok(None);
    }
    words
        .iter()
        .skip(1)
        .position(|w| *w == t)
        .map(|i| Some(values[i]))
        .ok_or_else(|| format!("\"{t}\": accepted {}", words[1..].join(", ")))
}

/// Put `text` into `field` of the draft, or say why it is refused. Emptied groups disappear
/// from the section, so clearing every row leaves no `measurements:` in the case file.
pub fn set(m: &mut MeasurementsInput, field: Field, text: &str) -> Result<(), String> {
    use QuantityKind as K;
    let blank = text.trim().is_empty();
    match field {
        Field::Diameter => m.diameter = quantity("diameter", text, K::Length, false)?,
        Field::Length => m.length = quantity("wound length", text, K::Length, false)?,
        Field::Weight => m.weight = quantity("weight", text, K::Mass, false)?,
        Field::BasisWeight => {
            m.basis_weight = quantity("basis weight", text, K::BasisWeight, false)?
        }
        Field::Width => m.width = quantity("roll width", text, K::Length, false)?,
        Field::AmountUncertainty | Field::DiameterUncertainty | Field::CaliperUncertainty => {
            set_uncertainty(m, field, text)?
        }
        Field::Calibration => {
            let c = calibration(text)?;
            m.hardness
                .get_or_insert_with(HardnessInput::default)
                .calibration = c;
        }
        Field::Hardness => {
            let r = readings(text)?;
            m.hardness
                .get_or_insert_with(HardnessInput::default)
                .readings = r;
        }
        Field::HardnessScale => {
            let v = pick(text, &SCALES, &[true, false])?;
            m.hardness
                .get_or_insert_with(HardnessInput::default)
                .higher_is_harder = v;
        }
        Field::Lanes => {
            let r = items(text)
                .map(|x| number("lane reading", x))
                .collect::<Result<Vec<_>, _>>()?;
            m.lanes.get_or_insert_with(LanesInput::default).readings = r;
        }
        Field::LanesScale => {
            let v = pick(text, &SCALES, &[true, false])?;
            m.lanes
                .get_or_insert_with(LanesInput::default)
                .higher_is_harder = v;
        }
        Field::Bend => {
            use BendInput as B;
            match pick(
                text,
                &BENDS,
                &[B::Straight, B::NearCore, B::Band, B::Throughout],
            )? {
                Some(b) => end_mut(m).bend = b,
                None => m.end_line = None,
            }
        }
        Field::BandFrom | Field::BandTo | Field::Offset | Field::Direction => {
            set_end_line_detail(m, field, text)?
        }
        Field::CoreBore => {
            m.core_bore_reduction = quantity("core bore closing", text, K::Length, true)?
        }
        Field::Rolls if blank => m.set = None,
        Field::Rolls => {
            let n = count("rolls in the set", text)?;
            if n == 0 {
                return Err("rolls in the set: accepted 1 or more".into());
            }
            set_mut(m).rolls = n;
        }
        Field::Bad
        | Field::Positions
        | Field::ParentRoll
        | Field::InParent
        | Field::ParentRolls
        | Field::BadParentRolls => set_roll_set(m, field, text)?,
    }
    tidy(m);
    Ok(())
}

/// The amount, diameter or caliper uncertainty of the roll size.
fn set_uncertainty(m: &mut MeasurementsInput, field: Field, text: &str) -> Result<(), String> {
    use QuantityKind as K;
    let (label, kind) = match field {
        Field::AmountUncertainty => ("length or weight uncertainty", K::Percent),
        Field::DiameterUncertainty => ("diameter uncertainty", K::Length),
        _ => ("caliper uncertainty", K::Percent),
    };
    let v = quantity(label, text, kind, false)?;
    let u = m.uncertainty.get_or_insert_with(UncertaintyInput::default);
    match field {
        Field::AmountUncertainty => u.amount = v,
        Field::DiameterUncertainty => u.diameter = v,
        _ => u.caliper = v,
    }
    Ok(())
}

/// The band, offset or direction of the line on the roll end; given only once the bend is.
fn set_end_line_detail(m: &mut MeasurementsInput, field: Field, text: &str) -> Result<(), String> {
    use QuantityKind as K;
    if text.trim().is_empty() {
        if let Some(e) = m.end_line.as_mut() {
            match field {
                Field::BandFrom => e.from_diameter = None,
                Field::BandTo => e.to_diameter = None,
                Field::Offset => e.offset = None,
                _ => e.direction = None,
            }
        }
        return Ok(());
    }
    if m.end_line.is_none() {
        return Err("say first where the line bends (the row above)".into());
    }
    match field {
        Field::BandFrom => {
            end_mut(m).from_diameter = quantity("band from", text, K::Length, false)?
        }
        Field::BandTo => end_mut(m).to_diameter = quantity("band to", text, K::Length, false)?,
        Field::Offset => end_mut(m).offset = quantity("offset", text, K::Length, true)?,
        _ => {
            let v = pick(
                text,
                &DIRECTIONS,
                &[BendDirection::WithWinding, BendDirection::AgainstWinding],
            )?;
            end_mut(m).direction = v;
        }
    }
    Ok(())
}

/// The set's details besides its number of rolls (bad rolls, their positions, the parent
/// roll); given only once the number of rolls is (a blank clears).
fn set_roll_set(m: &mut MeasurementsInput, field: Field, text: &str) -> Result<(), String> {
    let blank = text.trim().is_empty();
    if m.set.is_none() && !blank {
        return Err("give the number of rolls in the set first".into());
    }
    match field {
        Field::Bad => {
            if let Some(s) = m.set.as_mut() {
                s.bad = if blank { 0 } else { count("bad rolls", text)? };
            }
        }
        Field::Positions => {
            let p = items(text)
                .map(|x| count("bad position", x))
                .collect::<Result<Vec<_>, _>>()?;
            if let Some(s) = m.set.as_mut() {
                s.bad_positions = p;
            }
        }
        Field::ParentRoll => {
            if let Some(s) = m.set.as_mut() {
                s.parent_roll = (!blank).then(|| text.trim().to_string());
            }
        }
        Field::InParent => {
            use ParentPosition as P;
            let v = pick(text, &PLACES, &[P::Outside, P::Middle, P::NearCore])?;
            if let Some(s) = m.set.as_mut() {
                s.position_in_parent = v;
            }
        }
        Field::ParentRolls => {
            let n = optional_count("parent rolls looked at", text)?;
            if let Some(s) = m.set.as_mut() {
                s.parent_rolls = n;
            }
        }
        _ => {
            let n = optional_count("parent rolls with bad rolls", text)?;
            if let Some(s) = m.set.as_mut() {
                s.bad_parent_rolls = n;
            }
        }
    }
    Ok(())
}

/// Drop groups left empty by clearing.
fn tidy(m: &mut MeasurementsInput) {
    if m.hardness.as_ref().is_some_and(|h| {
        h.readings.is_empty() && h.calibration.is_empty() && h.higher_is_harder.is_none()
    }) {
        m.hardness = None;
    }
    if m.lanes
        .as_ref()
        .is_some_and(|l| l.readings.is_empty() && l.higher_is_harder.is_none())
    {
        m.lanes = None;
    }
    if m.uncertainty
        .as_ref()
        .is_some_and(|u| *u == UncertaintyInput::default())
    {
        m.uncertainty = None;
    }
}
