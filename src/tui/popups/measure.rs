//! Measurements on the bad roll (F9): the case's `measurements` section shown and edited row by
//! row (size, hardness along the radius and across the width, the line on the roll end, the
//! core bore, the set), and — on its second page (`v`) — the measured values against the
//! computed ones ([`super::measure_view`]). Each typed value is checked on Enter (a refused one
//! stays in the editor with the reason). The rows edit a draft of the section; the draft goes
//! into the case as soon as the whole section resolves as the case file would (a diameter
//! waits for its length, a band for its second diameter), and the case is then solved again on
//! the worker thread, through the same triage pipeline as `diagnose --measure`.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::text::{Line, Span};

use crate::case::QuantityText;
use crate::case::measurements::{
    BendInput, EndLineInput, HardnessInput, LanesInput, MeasurementsInput, ReadingInput, SetInput,
};
use crate::evidence::{BendDirection, ParentPosition};
use crate::tui::component::{Action, Binding, Component, Handled};
use crate::tui::event::Key;
use crate::tui::session::Session;
use crate::tui::theme::Theme;
use crate::units::{QuantityKind, parse_quantity};

use super::edit_field::{self, Typed};

/// One editable row.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Field {
    Diameter,
    Length,
    Weight,
    BasisWeight,
    Width,
    Hardness,
    HardnessScale,
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
}

/// The rows in reading order: (section heading or none, label, field).
pub const ROWS: &[(Option<&str>, &str, Field)] = &[
    (Some("Size of the roll"), "Diameter", Field::Diameter),
    (None, "Wound length", Field::Length),
    (None, "or net weight", Field::Weight),
    (None, "Basis weight", Field::BasisWeight),
    (None, "Roll width", Field::Width),
    (
        Some("Hardness along the radius"),
        "Readings",
        Field::Hardness,
    ),
    (None, "Tester", Field::HardnessScale),
    (Some("Hardness across the width"), "Lanes", Field::Lanes),
    (None, "Tester", Field::LanesScale),
    (Some("Line on the roll end"), "Bends", Field::Bend),
    (None, "Band from Ø", Field::BandFrom),
    (None, "Band to Ø", Field::BandTo),
    (None, "Inner part turned", Field::Direction),
    (None, "Largest offset", Field::Offset),
    (Some("Core"), "Bore closed by", Field::CoreBore),
    (Some("The set"), "Rolls in the set", Field::Rolls),
    (None, "Bad rolls", Field::Bad),
    (None, "Bad positions", Field::Positions),
    (None, "Parent roll", Field::ParentRoll),
    (None, "Place in parent", Field::InParent),
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

/// The row's value as it shows (and as the editor starts).
pub fn value(m: &MeasurementsInput, field: Field) -> String {
    let end = m.end_line.as_ref();
    let set = m.set.as_ref();
    match field {
        Field::Diameter => quantity_text(&m.diameter),
        Field::Length => quantity_text(&m.length),
        Field::Weight => quantity_text(&m.weight),
        Field::BasisWeight => quantity_text(&m.basis_weight),
        Field::Width => quantity_text(&m.width),
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

fn readings(text: &str) -> Result<Vec<ReadingInput>, String> {
    items(text)
        .map(|item| {
            let (d, r) = item.rsplit_once(':').ok_or_else(|| {
                format!("hardness: \"{item}\" is not DIAMETER:READING, e.g. 300 mm:41")
            })?;
            let diameter = quantity("hardness diameter", d, QuantityKind::Length, false)?
                .ok_or_else(|| format!("hardness: \"{item}\" has no diameter"))?;
            Ok(ReadingInput {
                diameter,
                value: number("hardness reading", r)?,
            })
        })
        .collect()
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
        Field::BandFrom | Field::BandTo | Field::Offset | Field::Direction if blank => {
            if let Some(e) = m.end_line.as_mut() {
                match field {
                    Field::BandFrom => e.from_diameter = None,
                    Field::BandTo => e.to_diameter = None,
                    Field::Offset => e.offset = None,
                    _ => e.direction = None,
                }
            }
        }
        Field::BandFrom | Field::BandTo | Field::Offset | Field::Direction
            if m.end_line.is_none() =>
        {
            return Err("say first where the line bends (the row above)".into());
        }
        Field::BandFrom => {
            end_mut(m).from_diameter = quantity("band from", text, K::Length, false)?
        }
        Field::BandTo => end_mut(m).to_diameter = quantity("band to", text, K::Length, false)?,
        Field::Offset => end_mut(m).offset = quantity("offset", text, K::Length, true)?,
        Field::Direction => {
            let v = pick(
                text,
                &DIRECTIONS,
                &[BendDirection::WithWinding, BendDirection::AgainstWinding],
            )?;
            end_mut(m).direction = v;
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
        Field::Bad | Field::Positions | Field::ParentRoll | Field::InParent
            if m.set.is_none() && !blank =>
        {
            return Err("give the number of rolls in the set first".into());
        }
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
    }
    tidy(m);
    Ok(())
}

/// Drop groups left empty by clearing.
fn tidy(m: &mut MeasurementsInput) {
    if m.hardness
        .as_ref()
        .is_some_and(|h| h.readings.is_empty() && h.higher_is_harder.is_none())
    {
        m.hardness = None;
    }
    if m.lanes
        .as_ref()
        .is_some_and(|l| l.readings.is_empty() && l.higher_is_harder.is_none())
    {
        m.lanes = None;
    }
}

/// Which page the popup shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Page {
    #[default]
    Edit,
    Compare,
}

/// The measurements popup: a draft of the section, the row being edited, the page.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct MeasurePopup {
    pub draft: MeasurementsInput,
    pub selected: usize,
    pub editing: Option<String>,
    /// Why the last entry was refused.
    pub error: Option<String>,
    /// Why the draft is not (yet) in the case: the section does not resolve as it stands.
    pub pending: Option<String>,
    pub page: Page,
    /// First line shown on the comparison page.
    pub scroll: u16,
}

#[rustfmt::skip]
pub const KEYS: &[Binding] = &[
    Binding::both(MOVE, "↑↓", "move", "↑↓ PgUp PgDn", "move between the measurements"),
    Binding::both(MOVE, "Enter", "edit", "Enter", "edit the measurement (Enter again checks and keeps it, Esc cancels)"),
    Binding::both(CHOICE, "←→", "choose", "←→", "choose (tester scale, where the line bends, direction, place in parent)"),
    Binding::both(MOVE, "Del", "clear", "Delete", "clear the measurement"),
    Binding::both(MOVE | COMPARE, "v", "measured vs computed", "v", "switch between the measurements and measured against computed"),
    Binding::line(COMPARE, "↑↓", "scroll"),
    Binding::both(MOVE | COMPARE, "^S", "save", "Ctrl-S", "save the case file"),
    Binding::both(MOVE | COMPARE, "Esc", "close", "Esc", "close (accepted measurements stay in the case until you save)"),
    Binding::both(TYPING, "Enter", "keep", "Ctrl-U", "while typing: clear the text"),
    Binding::line(TYPING, "Esc", "cancel"),
];

const MOVE: u8 = 1;
const CHOICE: u8 = 2;
const TYPING: u8 = 4;
const COMPARE: u8 = 8;

impl MeasurePopup {
    /// Open on the case's measurements.
    pub fn open(ctx: &Session) -> MeasurePopup {
        let draft = ctx.case.measurements.clone().unwrap_or_default();
        let mut popup = MeasurePopup {
            draft,
            ..MeasurePopup::default()
        };
        popup.pending = popup.check(ctx).err();
        popup
    }

    pub fn field(&self) -> Field {
        ROWS[self.selected.min(ROWS.len() - 1)].2
    }

    /// The case with the draft in place, resolved as the case file would be.
    fn check(&self, ctx: &Session) -> Result<Option<MeasurementsInput>, String> {
        let section = (!self.draft.is_empty()).then(|| self.draft.clone());
        let mut case = ctx.case.clone();
        case.measurements = section.clone();
        match case.resolve() {
            Ok(_) => Ok(section),
            // Another section's trouble is the inputs screen's to show; the draft can still go in.
            Err(_) if ctx.resolved.is_err() => Ok(section),
            Err(e) => Err(e.to_string()),
        }
    }

    /// Put the draft into the case when it resolves; solve again (off the UI thread).
    fn apply(&mut self, ctx: &mut Session) {
        match self.check(ctx) {
            Ok(section) => {
                self.pending = None;
                if ctx.case.measurements != section {
                    ctx.case.measurements = section;
                    ctx.edited();
                    ctx.ensure_baseline();
                }
            }
            Err(reason) => self.pending = Some(reason),
        }
    }

    fn commit(&mut self, ctx: &mut Session, field: Field, typed: String) {
        let mut draft = self.draft.clone();
        match set(&mut draft, field, &typed) {
            Ok(()) => {
                self.draft = draft;
                self.editing = None;
                self.error = None;
                self.apply(ctx);
            }
            Err(message) => {
                self.editing = Some(typed);
                self.error = Some(message);
            }
        }
    }

    fn step(&mut self, ctx: &mut Session, field: Field, forward: bool) {
        let Some(words) = field.choices() else {
            return;
        };
        let current = value(&self.draft, field);
        let n = words.len();
        let at = words.iter().position(|w| *w == current).unwrap_or(0);
        let next = if forward {
            (at + 1) % n
        } else {
            (at + n - 1) % n
        };
        self.commit(ctx, field, words[next].to_string());
        self.editing = None;
    }

    fn edit_key(&mut self, key: Key, ctx: &mut Session) {
        let field = self.field();
        let Some(typed) = &mut self.editing else {
            return;
        };
        match edit_field::edit(typed, key) {
            Typed::Enter => {
                let typed = typed.clone();
                self.commit(ctx, field, typed);
            }
            Typed::Cancel => {
                self.editing = None;
                self.error = None;
            }
            Typed::Editing => {}
        }
    }
}

impl Component for MeasurePopup {
    fn on_key(&mut self, key: Key, ctx: &mut Session) -> Handled {
        if self.editing.is_some() {
            self.edit_key(key, ctx);
            return Handled::Yes;
        }
        let last = ROWS.len() - 1;
        let field = self.field();
        match (self.page, key) {
            (_, Key::Char('v')) => {
                self.page = match self.page {
                    Page::Edit => Page::Compare,
                    Page::Compare => Page::Edit,
                };
                if self.page == Page::Compare {
                    ctx.ensure_baseline();
                }
            }
            (_, Key::Ctrl('s')) => ctx.push(Action::Save),
            (_, Key::Esc | Key::F(9)) => ctx.push(Action::Close),
            (Page::Compare, Key::Up) => self.scroll = self.scroll.saturating_sub(1),
            (Page::Compare, Key::Down) => self.scroll = self.scroll.saturating_add(1),
            (Page::Compare, Key::PageUp) => self.scroll = self.scroll.saturating_sub(10),
            (Page::Compare, Key::PageDown) => self.scroll = self.scroll.saturating_add(10),
            (Page::Compare, _) => {}
            (Page::Edit, _) if edit_field::move_selection(&mut self.selected, last, key) => {}
            (Page::Edit, Key::Left | Key::Right) if field.choices().is_some() => {
                self.error = None;
                self.step(ctx, field, key == Key::Right);
            }
            (Page::Edit, Key::Enter) if field.choices().is_some() => self.step(ctx, field, true),
            (Page::Edit, Key::Enter) => {
                self.error = None;
                self.editing = Some(value(&self.draft, field));
            }
            (Page::Edit, Key::Delete) => self.commit(ctx, field, String::new()),
            _ => {}
        }
        Handled::Yes
    }

    fn key_map(&self) -> &'static [Binding] {
        KEYS
    }

    fn mode(&self, _ctx: &Session) -> u8 {
        if self.editing.is_some() {
            TYPING
        } else if self.page == Page::Compare {
            COMPARE
        } else if self.field().choices().is_some() {
            MOVE | CHOICE
        } else {
            MOVE
        }
    }

    fn is_typing(&self) -> bool {
        self.editing.is_some()
    }

    fn render(&self, ctx: &Session, theme: Theme, area: Rect, buf: &mut Buffer) {
        let title = match self.page {
            Page::Edit => " Measured on the roll (v: measured against computed, Esc closes) ",
            Page::Compare => " Measured against computed (v: the measurements, Esc closes) ",
        };
        let Some(frame) = edit_field::frame(title, (18, 22), area, buf) else {
            return;
        };
        match self.page {
            Page::Edit => self.render_rows(theme, &frame, buf),
            Page::Compare => super::measure_view::render(ctx, self.scroll, theme, frame.inner, buf),
        }
    }
}

impl MeasurePopup {
    fn render_rows(&self, theme: Theme, frame: &edit_field::Frame, buf: &mut Buffer) {
        let mut lines = Vec::new();
        let mut selected_line = 0;
        for (i, (heading, label, field)) in ROWS.iter().enumerate() {
            if let Some(h) = heading {
                lines.push(Line::from(Span::styled(h.to_string(), theme.title())));
            }
            let is_selected = i == self.selected;
            if is_selected {
                selected_line = lines.len();
            }
            let mut shown = match (&self.editing, is_selected) {
                (Some(typed), true) => format!("{typed}▏"),
                _ => value(&self.draft, *field),
            };
            if shown.is_empty() {
                shown = if field.choices().is_some() {
                    "— (←→ to choose)".into()
                } else {
                    "—".into()
                };
            }
            lines.push(frame.row(label, &shown, is_selected, theme));
        }
        frame.render_list(lines, selected_line, buf);
        let mut about = vec![frame.rule(theme)];
        if let Some(error) = &self.error {
            about.push(Line::from(Span::styled(
                format!("Not accepted: {error}"),
                theme.error(),
            )));
        } else if let Some(pending) = &self.pending {
            about.push(Line::from(Span::styled(
                format!("Not in the case yet: {pending}"),
                theme.warn(),
            )));
        } else {
            about.push(Line::from(Span::styled(
                self.field().hint().to_string(),
                theme.dim(),
            )));
        }
        frame.render_detail(about, buf);
    }
}
