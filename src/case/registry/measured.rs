//! Registry entries of the `measurements` section (docs/evidence.md): what was measured on the
//! bad roll. Listed in [`super::FIELDS`] after `notes`.

use super::{DefaultValue, Field, FieldKind, above, from, plain, plain_above, plain_from};
use crate::units::QuantityKind as Q;

use DefaultValue::{Fixed, Required, Rule};
use FieldKind::{Choice, List, Number, Quantity, Section, Text};

const YES_NO: &[&str] = &["true", "false"];

pub const MEASUREMENTS: Field = Field {
    help: "What was measured on the bad roll; compared with the computed stresses (docs/evidence.md).",
    ..plain("measurements", "Measurements", Section)
};
pub const DIAMETER: Field = Field {
    range: Some(above(0.0, 5.0, Q::Length)),
    accepted_also: "with `length`, or with `weight` and `basis_weight`",
    help: "Outside diameter measured on the roll.",
    example: "1012 mm",
    ..plain(
        "measurements.diameter",
        "Measured diameter",
        Quantity(Q::Length),
    )
};
pub const LENGTH: Field = Field {
    range: Some(above(0.0, 1.0e8, Q::Length)),
    accepted_also: "not with `weight`",
    help: "Wound length (length counter).",
    example: "10700 m",
    ..plain(
        "measurements.length",
        "Measured wound length",
        Quantity(Q::Length),
    )
};
pub const WEIGHT: Field = Field {
    range: Some(above(0.0, 1.0e5, Q::Mass)),
    accepted_also: "with `basis_weight`; not with `length`",
    help: "Net weight of web on the roll (core weight taken off).",
    example: "1150 kg",
    ..plain(
        "measurements.weight",
        "Measured net weight",
        Quantity(Q::Mass),
    )
};
pub const BASIS_WEIGHT: Field = Field {
    range: Some(above(0.0, 5.0, Q::BasisWeight)),
    help: "Basis weight (grammage) of the web, to turn the weight into a length.",
    example: "45 g/m2",
    ..plain(
        "measurements.basis_weight",
        "Basis weight",
        Quantity(Q::BasisWeight),
    )
};
pub const WIDTH: Field = Field {
    range: Some(above(0.0, 20.0, Q::Length)),
    default: Rule("`web.width` when given there"),
    help: "Width of the weighed roll.",
    example: "1680 mm",
    ..plain(
        "measurements.width",
        "Measured roll width",
        Quantity(Q::Length),
    )
};
pub const UNCERTAINTY: Field = Field {
    help: "Standard uncertainties of the size measurement.",
    ..plain(
        "measurements.uncertainty",
        "Measurement uncertainty",
        Section,
    )
};
pub const U_AMOUNT: Field = Field {
    range: Some(above(0.0, 1.0, Q::Percent)),
    default: Fixed(crate::presets::Sourced {
        value: 0.005,
        source: "(from memory) a length counter or roll scale",
    }),
    help: "Of the length or weight.",
    example: "0.5 %",
    ..plain(
        "measurements.uncertainty.amount",
        "Length or weight uncertainty",
        Quantity(Q::Percent),
    )
};
pub const U_DIAMETER: Field = Field {
    range: Some(above(0.0, 0.1, Q::Length)),
    default: Fixed(crate::presets::Sourced {
        value: 1.0e-3,
        source: "(from memory) a diameter tape",
    }),
    help: "Of the diameter.",
    example: "1 mm",
    ..plain(
        "measurements.uncertainty.diameter",
        "Diameter uncertainty",
        Quantity(Q::Length),
    )
};
pub const U_CALIPER: Field = Field {
    range: Some(above(0.0, 1.0, Q::Percent)),
    default: Fixed(crate::presets::Sourced {
        value: 0.02,
        source: "(from memory) spread of caliper readings",
    }),
    help: "Of the web caliper; it dominates the density comparison.",
    example: "2 %",
    ..plain(
        "measurements.uncertainty.caliper",
        "Caliper uncertainty",
        Quantity(Q::Percent),
    )
};
pub const HARDNESS: Field = Field {
    help: "Hardness readings along the radius, on the tester's own scale.",
    ..plain(
        "measurements.hardness",
        "Hardness along the radius",
        Section,
    )
};
pub const HARDNESS_DIRECTION: Field = Field {
    default: Rule("true"),
    help: "`false` for a tester whose reading falls as the roll gets harder.",
    ..plain(
        "measurements.hardness.higher_is_harder",
        "Higher reading is harder",
        Choice(YES_NO),
    )
};
pub const READINGS: Field = Field {
    accepted_also: "at least 2",
    help: "`{diameter, value}` pairs.",
    ..plain("measurements.hardness.readings", "Hardness readings", List)
};
pub const READING_DIAMETER: Field = Field {
    range: Some(above(0.0, 5.0, Q::Length)),
    default: Required,
    help: "Where the reading was taken.",
    ..plain(
        "measurements.hardness.readings[].diameter",
        "Reading diameter",
        Quantity(Q::Length),
    )
};
pub const READING_VALUE: Field = Field {
    default: Required,
    help: "The tester's reading.",
    ..plain("measurements.hardness.readings[].value", "Reading", Number)
};
pub const CALIBRATION: Field = Field {
    accepted_also: "at least 2 points, readings increasing, pressures strictly monotone",
    help: "`{reading, pressure}` points turning readings into interlayer pressure.",
    ..plain(
        "measurements.hardness.calibration",
        "Tester calibration",
        List,
    )
};
pub const CAL_READING: Field = Field {
    default: Required,
    help: "A reading.",
    ..plain(
        "measurements.hardness.calibration[].reading",
        "Calibration reading",
        Number,
    )
};
pub const CAL_PRESSURE: Field = Field {
    range: Some(from(0.0, 1.0e9, Q::Stress)),
    default: Required,
    help: "The interlayer pressure that gives it.",
    ..plain(
        "measurements.hardness.calibration[].pressure",
        "Calibration pressure",
        Quantity(Q::Stress),
    )
};
pub const LANES: Field = Field {
    help: "Hardness readings across the width; the one-dimensional model cannot compute them.",
    ..plain("measurements.lanes", "Hardness across the width", Section)
};
pub const LANES_DIRECTION: Field = Field {
    default: Rule("true"),
    help: "`false` for a tester whose reading falls as the roll gets harder.",
    ..plain(
        "measurements.lanes.higher_is_harder",
        "Higher reading is harder",
        Choice(YES_NO),
    )
};
pub const LANE_READINGS: Field = Field {
    accepted_also: "at least 2 numbers, lane 1 (the reference edge) first",
    help: "One reading per lane.",
    ..plain("measurements.lanes.readings", "Lane readings", List)
};
pub const END_LINE: Field = Field {
    help: "A straight radial line drawn on the roll end before unwinding or handling.",
    ..plain("measurements.end_line", "Line on the roll end", Section)
};
pub const BEND: Field = Field {
    default: Required,
    help: "Where the line bends.",
    ..plain(
        "measurements.end_line.bend",
        "Where the line bends",
        Choice(&["straight", "near_core", "band", "throughout"]),
    )
};
pub const BEND_FROM: Field = Field {
    range: Some(above(0.0, 5.0, Q::Length)),
    accepted_also: "only with `bend: band`",
    help: "Inner diameter of the band.",
    ..plain(
        "measurements.end_line.from_diameter",
        "Band from diameter",
        Quantity(Q::Length),
    )
};
pub const BEND_TO: Field = Field {
    range: Some(above(0.0, 5.0, Q::Length)),
    accepted_also: "only with `bend: band`, larger than `from_diameter`",
    help: "Outer diameter of the band.",
    ..plain(
        "measurements.end_line.to_diameter",
        "Band to diameter",
        Quantity(Q::Length),
    )
};
pub const BEND_DIRECTION: Field = Field {
    help: "Which way the inner part turned against the outer part.",
    ..plain(
        "measurements.end_line.direction",
        "Bend direction",
        Choice(&["with_winding", "against_winding"]),
    )
};
pub const BEND_OFFSET: Field = Field {
    range: Some(from(0.0, 1.0, Q::Length)),
    help: "Largest sideways offset of the line.",
    ..plain(
        "measurements.end_line.offset",
        "Line offset",
        Quantity(Q::Length),
    )
};
pub const CORE_BORE: Field = Field {
    range: Some(from(0.0, 0.5, Q::Length)),
    help: "How much the core's inside diameter closed.",
    example: "1.2 mm",
    ..plain(
        "measurements.core_bore_reduction",
        "Core bore reduction",
        Quantity(Q::Length),
    )
};
pub const SET: Field = Field {
    help: "The set of rolls slit side by side from one parent roll.",
    ..plain("measurements.set", "The set", Section)
};
pub const SET_ROLLS: Field = Field {
    range: Some(plain_above(0.0, 1000.0)),
    default: Required,
    help: "Rolls in the set.",
    ..plain("measurements.set.rolls", "Rolls in the set", Number)
};
pub const SET_BAD: Field = Field {
    range: Some(plain_from(0.0, 1000.0)),
    accepted_also: "at most `rolls`",
    default: Required,
    help: "How many of them are bad.",
    ..plain("measurements.set.bad", "Bad rolls", Number)
};
pub const SET_POSITIONS: Field = Field {
    accepted_also: "slit positions 1 to `rolls`",
    help: "Slit positions of the bad rolls (1 and `rolls` are the edges).",
    ..plain("measurements.set.bad_positions", "Bad positions", List)
};
pub const SET_PARENT: Field = Field {
    help: "Name or number of the parent roll.",
    ..plain("measurements.set.parent_roll", "Parent roll", Text)
};
pub const SET_PARENT_POSITION: Field = Field {
    help: "Where in the parent roll the set came from.",
    ..plain(
        "measurements.set.position_in_parent",
        "Position in the parent roll",
        Choice(&["outside", "middle", "near_core"]),
    )
};
pub const SET_PARENTS: Field = Field {
    range: Some(plain_above(0.0, 10000.0)),
    help: "Parent rolls looked at.",
    ..plain(
        "measurements.set.parent_rolls",
        "Parent rolls looked at",
        Number,
    )
};
pub const SET_BAD_PARENTS: Field = Field {
    range: Some(plain_from(0.0, 10000.0)),
    accepted_also: "with `parent_rolls`, at most that",
    help: "How many of them gave bad rolls.",
    ..plain(
        "measurements.set.bad_parent_rolls",
        "Parent rolls with bad rolls",
        Number,
    )
};
