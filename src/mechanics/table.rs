//! The margins table: for every failure mechanism the smallest margin over the roll, where it
//! is, the demand and capacity behind it and a plain verdict. Reports, the `stress` command and
//! the terminal UI's margins popup all show this one table; it calls the same functions the
//! diagnosis indicators read ([`super::telescoping::handling_margins`],
//! [`super::torque::torque_check`], [`super::starring::buckling_margins`]), so no view computes a
//! margin of its own. Core crush is the pressure on the core against the core's rated crush
//! pressure (one interface, the core's outside).

use serde::Serialize;

use super::torque::{self, Event};
use super::{InterfaceMargins, MARGIN_CAP, MechanicsInputs, margin, starring, telescoping};
use crate::model::Profile;

/// Margins below this but at least 1 hold with little to spare: the reserve taper design keeps
/// on the core (80 % of the rating, common practice: ratings are short-term tests), used here
/// for every mechanism as a reading aid, not as a criterion.
pub const CLOSE_MARGIN: f64 = 1.25;

/// The mechanisms of the table, in the order it lists them.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case", tag = "mechanism", content = "event")]
pub enum Mechanism {
    /// Axial shear of handling against friction (telescoping).
    Telescoping,
    /// Torque of an event against friction × pressure × 2πr² (cinching; at the core, core slip).
    Slip(Event),
    /// Torque the core passes against the chuck or shaft torque rating.
    ShaftGrip,
    /// Hoop compression against the buckling stress of a wrap on the stack (starring).
    Starring,
    /// Pressure on the core against its rated crush pressure.
    CoreCrush,
}

impl Mechanism {
    /// Stable ID for JSON.
    pub fn id(self) -> String {
        match self {
            Mechanism::Telescoping => "telescoping".into(),
            Mechanism::Slip(event) => format!("slip_{}", event_id(event)),
            Mechanism::ShaftGrip => "shaft_grip".into(),
            Mechanism::Starring => "starring".into(),
            Mechanism::CoreCrush => "core_crush".into(),
        }
    }

    /// Plain words for the table's first column.
    pub fn title(self) -> String {
        match self {
            Mechanism::Telescoping => "Telescoping, roll lifted by its core".into(),
            Mechanism::Slip(event) => format!("Layer slip, {}", event.title()),
            Mechanism::ShaftGrip => "Core on its chuck or shaft".into(),
            Mechanism::Starring => "Starring (wrap buckling)".into(),
            Mechanism::CoreCrush => "Core crush".into(),
        }
    }

    /// The margin's name in a one-line text ("telescoping margin 0.80 → 1.30").
    pub fn margin_name(self) -> String {
        match self {
            Mechanism::Telescoping => "telescoping margin".into(),
            Mechanism::Slip(event) => format!("slip margin, {}", event.title()),
            Mechanism::ShaftGrip => "grip margin of the chuck or shaft".into(),
            Mechanism::Starring => "starring margin".into(),
            Mechanism::CoreCrush => "core crush margin".into(),
        }
    }

    /// What happens when the margin is below 1.
    pub fn failure(self) -> &'static str {
        match self {
            Mechanism::Telescoping => "layers slide along the axis",
            Mechanism::Slip(_) => "layers slip round (cinching; at the core, core slip)",
            Mechanism::ShaftGrip => "the core turns on its chuck or shaft",
            Mechanism::Starring => "wraps buckle",
            Mechanism::CoreCrush => "the core crushes",
        }
    }

    /// What demand and capacity are, in words.
    pub fn demand_words(self) -> &'static str {
        match self {
            Mechanism::Telescoping => "handling shear / friction",
            Mechanism::Slip(_) => "torque / friction torque",
            Mechanism::ShaftGrip => "torque / rating",
            Mechanism::Starring => "hoop compression / buckling stress",
            Mechanism::CoreCrush => "core pressure / rated crush",
        }
    }

    /// The unit family of demand and capacity.
    pub fn measure(self) -> Measure {
        match self {
            Mechanism::Slip(_) | Mechanism::ShaftGrip => Measure::TorquePerWidth,
            _ => Measure::Stress,
        }
    }
}

fn event_id(event: Event) -> &'static str {
    match event {
        Event::StartUp => "start_up",
        Event::NormalStop => "normal_stop",
        Event::EmergencyStop => "emergency_stop",
        Event::Unwind => "unwind",
    }
}

/// Demand and capacity are a stress (Pa) or a torque per unit width of web (N·m/m).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Measure {
    Stress,
    TorquePerWidth,
}

/// The verdict on one row.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Verdict {
    /// Margin below 1.
    Fails,
    /// Margin from 1 to [`CLOSE_MARGIN`].
    Close,
    Holds,
    /// No interface carries demand (starring: no wrap in hoop compression).
    NoDemand,
}

impl Verdict {
    /// Stable ID for JSON.
    pub fn id(self) -> &'static str {
        match self {
            Verdict::Fails => "fails",
            Verdict::Close => "close",
            Verdict::Holds => "holds",
            Verdict::NoDemand => "no_demand",
        }
    }

    /// The verdict of a stable ID (as [`Verdict::id`] writes it).
    pub fn from_id(id: &str) -> Option<Verdict> {
        [
            Verdict::Fails,
            Verdict::Close,
            Verdict::Holds,
            Verdict::NoDemand,
        ]
        .into_iter()
        .find(|v| v.id() == id)
    }

    /// One word for narrow columns ("fails", "close", "holds", "unloaded").
    pub fn word(self) -> &'static str {
        match self {
            Verdict::Fails => "fails",
            Verdict::Close => "close",
            Verdict::Holds => "holds",
            Verdict::NoDemand => "unloaded",
        }
    }

    /// A change of verdict in words ("now fails"); `None` when the verdict stays.
    pub fn change_word(before: Verdict, after: Verdict) -> Option<String> {
        (before != after).then(|| format!("now {}", after.word()))
    }
}

/// One mechanism's smallest margin.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MarginRow {
    #[serde(flatten)]
    pub mechanism: Mechanism,
    /// Smallest capacity / demand, capped at [`MARGIN_CAP`].
    pub margin: f64,
    /// Radius of the smallest margin and the weakest band around it (m).
    pub radius: f64,
    pub band: (f64, f64),
    /// Demand and capacity at the smallest margin (Pa, or N·m/m: [`Mechanism::measure`]).
    pub demand: f64,
    pub capacity: f64,
    pub has_demand: bool,
}

impl MarginRow {
    fn from_margins(mechanism: Mechanism, m: &InterfaceMargins) -> MarginRow {
        let mut at = m.min_index.min(m.radius.len().saturating_sub(1));
        // Past the cap every margin reads the same: show the interface nearest to failing.
        if m.min_margin >= MARGIN_CAP && m.has_demand {
            let load = |i: usize| m.demand[i] / m.capacity[i].max(f64::MIN_POSITIVE);
            at = (0..m.radius.len())
                .max_by(|a, b| load(*a).total_cmp(&load(*b)))
                .unwrap_or(at);
        }
        MarginRow {
            mechanism,
            margin: m.min_margin,
            radius: m.radius.get(at).copied().unwrap_or(m.min_radius),
            band: if at == m.min_index {
                m.band
            } else {
                (m.radius[at], m.radius[at])
            },
            demand: m.demand.get(at).copied().unwrap_or(0.0),
            capacity: m.capacity.get(at).copied().unwrap_or(0.0),
            has_demand: m.has_demand,
        }
    }

    /// One interface: the margin is computed here from demand and capacity.
    fn single(mechanism: Mechanism, radius: f64, demand: f64, capacity: f64) -> MarginRow {
        MarginRow {
            mechanism,
            margin: margin(capacity, demand),
            radius,
            band: (radius, radius),
            demand,
            capacity,
            has_demand: demand > 0.0,
        }
    }

    pub fn verdict(&self) -> Verdict {
        if !self.has_demand {
            Verdict::NoDemand
        } else if self.margin < 1.0 {
            Verdict::Fails
        } else if self.margin < CLOSE_MARGIN {
            Verdict::Close
        } else {
            Verdict::Holds
        }
    }

    /// The verdict in plain words.
    pub fn verdict_text(&self) -> String {
        match self.verdict() {
            Verdict::NoDemand if self.mechanism == Mechanism::Starring => {
                "no hoop compression: starring cannot start".into()
            }
            Verdict::NoDemand => "no load on it".into(),
            Verdict::Fails => format!("fails: {}", self.mechanism.failure()),
            Verdict::Close => "holds, little to spare".into(),
            Verdict::Holds => "holds".into(),
        }
    }

    /// The margin as text: three significant digits (two decimals below 10), "over 1000" at the
    /// cap, "none" without demand.
    pub fn margin_text(&self) -> String {
        if !self.has_demand {
            "none".into()
        } else if self.margin >= MARGIN_CAP {
            format!("over {MARGIN_CAP:.0}")
        } else if self.margin >= 100.0 {
            format!("{:.0}", self.margin)
        } else if self.margin >= 10.0 {
            format!("{:.1}", self.margin)
        } else {
            format!("{:.2}", self.margin)
        }
    }

    /// True when the weakest band is wider than one interface.
    pub fn is_band(&self) -> bool {
        self.band.1 > self.band.0
    }
}

/// Every mechanism's row, in the order of [`Mechanism`]; the shaft row only with a rating.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MarginTable {
    pub rows: Vec<MarginRow>,
    /// Some wrap is in hoop compression (starring can start at all).
    pub hoop_compression: bool,
    /// Core and outer radius (m), for the build share of a position.
    pub core_radius: f64,
    pub outer_radius: f64,
}

impl MarginTable {
    /// Share of the build from the core (0) to the outside (1) of a radius.
    pub fn build_share(&self, radius: f64) -> f64 {
        let build = self.outer_radius - self.core_radius;
        if build > 0.0 {
            ((radius - self.core_radius) / build).clamp(0.0, 1.0)
        } else {
            0.0
        }
    }

    /// The row of a mechanism.
    pub fn row(&self, mechanism: Mechanism) -> Option<&MarginRow> {
        self.rows.iter().find(|r| r.mechanism == mechanism)
    }
}

/// Pressure on the core (Pa): the solver's summary value, else the first node's pressure —
/// the value the diagnosis' core-pressure indicators read.
pub fn core_pressure(profile: &Profile) -> f64 {
    if profile.summary.core_pressure > 0.0 {
        profile.summary.core_pressure
    } else {
        profile.pressure.first().copied().unwrap_or(0.0)
    }
}

/// The margins table of a solved roll; `crush_pressure` is the core's rated crush pressure (Pa).
pub fn margin_table(
    profile: &Profile,
    inputs: &MechanicsInputs,
    crush_pressure: f64,
) -> MarginTable {
    let mut rows = vec![MarginRow::from_margins(
        Mechanism::Telescoping,
        &telescoping::handling_margins(profile, inputs),
    )];
    let check = torque::torque_check(profile, inputs);
    for event in &check.events {
        rows.push(MarginRow::from_margins(
            Mechanism::Slip(event.event),
            &event.margins,
        ));
    }
    if let (Some(rating), Some(event)) = (inputs.events.shaft_torque_rating, check.shaft_event) {
        let outer = profile
            .radius
            .last()
            .copied()
            .unwrap_or(inputs.outer_radius);
        let demand = torque::demand(inputs, outer, inputs.core_radius, event);
        rows.push(MarginRow::single(
            Mechanism::ShaftGrip,
            inputs.core_radius,
            demand,
            rating,
        ));
    }
    let starring = starring::buckling_margins(profile, inputs);
    rows.push(MarginRow::from_margins(Mechanism::Starring, &starring));
    rows.push(MarginRow::single(
        Mechanism::CoreCrush,
        inputs.core_radius,
        core_pressure(profile),
        crush_pressure,
    ));
    MarginTable {
        rows,
        hoop_compression: starring.has_demand,
        core_radius: inputs.core_radius,
        outer_radius: inputs.outer_radius,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn inputs(rating: Option<f64>) -> MechanicsInputs {
        crate::mechanics::sample_inputs(rating)
    }

    fn roll(hoop: f64) -> Profile {
        let radius: Vec<f64> = (0..=10).map(|i| 0.05 + 0.045 * f64::from(i)).collect();
        Profile {
            pressure: vec![1e6; radius.len()],
            tangential_stress: vec![hoop; radius.len()],
            radius,
            ..Profile::default()
        }
    }

    /// The shaft row against the hand computation of the torque module's test: T·R =
    /// 200 N/m × 0.5 m = 100 N·m/m against a rating of 50 N·m/m (statics), margin 0.5, fails.
    #[test]
    fn shaft_row_is_rating_over_tension_torque() {
        let table = margin_table(&roll(1e5), &inputs(Some(50.0)), 2e6);
        let shaft = table.row(Mechanism::ShaftGrip).expect("rated");
        assert!((shaft.demand - 100.0).abs() < 1e-9, "{}", shaft.demand);
        assert_eq!(shaft.capacity, 50.0);
        assert!((shaft.margin - 0.5).abs() < 1e-12);
        assert_eq!(shaft.verdict(), Verdict::Fails);
        assert!(table.row(Mechanism::ShaftGrip).is_some());
        assert!(
            margin_table(&roll(1e5), &inputs(None), 2e6)
                .row(Mechanism::ShaftGrip)
                .is_none()
        );
    }

    /// Core crush: 1 MPa on a core rated 2 MPa is a margin of 2 (rating / load); 1.1 MPa
    /// rated is 1.1, close.
    #[test]
    fn core_crush_row_is_rating_over_core_pressure() {
        let table = margin_table(&roll(1e5), &inputs(None), 2e6);
        let crush = table.row(Mechanism::CoreCrush).expect("always listed");
        assert!((crush.margin - 2.0).abs() < 1e-12);
        assert_eq!(crush.verdict(), Verdict::Holds);
        let tight = margin_table(&roll(1e5), &inputs(None), 1.1e6);
        let crush = tight.row(Mechanism::CoreCrush).expect("always listed");
        assert_eq!(crush.verdict(), Verdict::Close);
    }

    #[test]
    fn no_hoop_compression_says_starring_cannot_start() {
        let table = margin_table(&roll(1e5), &inputs(None), 2e6);
        assert!(!table.hoop_compression);
        let row = table.row(Mechanism::Starring).expect("always listed");
        assert_eq!(row.verdict(), Verdict::NoDemand);
        assert_eq!(
            row.verdict_text(),
            "no hoop compression: starring cannot start"
        );
        assert_eq!(row.margin_text(), "none");
        let compressed = margin_table(&roll(-1e5), &inputs(None), 2e6);
        assert!(compressed.hoop_compression);
    }

    /// The table's rows carry the very margins of the mechanism functions (one criterion).
    #[test]
    fn rows_are_the_mechanism_functions_margins() {
        let profile = roll(-1e5);
        let inputs = inputs(None);
        let table = margin_table(&profile, &inputs, 2e6);
        let tele = telescoping::handling_margins(&profile, &inputs);
        let row = table.row(Mechanism::Telescoping).expect("listed");
        assert_eq!(row.margin, tele.min_margin);
        assert_eq!(row.radius, tele.min_radius);
        let check = torque::torque_check(&profile, &inputs);
        for event in &check.events {
            let row = table.row(Mechanism::Slip(event.event)).expect("listed");
            assert_eq!(row.margin, event.margins.min_margin);
        }
        let star = starring::buckling_margins(&profile, &inputs);
        let row = table.row(Mechanism::Starring).expect("listed");
        assert_eq!(row.margin, star.min_margin);
        assert_eq!(margin(row.capacity, row.demand), star.min_margin);
    }
}
