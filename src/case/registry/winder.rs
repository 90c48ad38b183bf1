//! Registry entries of the winder's own settings (nip programme, levelling-off load, centre
//! torque, drums), the tension programme's points, and the event inputs of the failure
//! mechanisms (stops, unwind, handling shock, chuck or shaft rating). Listed in
//! [`super::FIELDS`] with the rest, in schema order.

use super::{DefaultValue, Field, FieldKind, above, from, plain, plain_above, plain_from};
use crate::units::QuantityKind;

use DefaultValue::{Fixed, Required, Rule};
use FieldKind::{List, Number, Quantity, Section};
use QuantityKind as Q;

/// A programme stored as a table against diameter (the tension and nip programmes), with its
/// own form in the terminal UI: `[path, label]`, an example, the extra acceptance rule, help.
const fn programme(
    [path, label]: [&'static str; 2],
    example: &'static str,
    accepted_also: &'static str,
    help: &'static str,
) -> Field {
    Field {
        example,
        form: Some(label),
        accepted_also,
        help,
        ..plain(path, label, List)
    }
}

/// The diameter of one point of a programme (required): `[path, label]`.
const fn point_diameter(
    [path, label]: [&'static str; 2],
    accepted_also: &'static str,
    example: &'static str,
) -> Field {
    Field {
        accepted_also,
        default: Required,
        help: "Roll diameter of this point of the programme.",
        example,
        ..plain(path, label, Quantity(Q::Length))
    }
}

pub const TAPER_POINTS: Field = programme(
    ["winding.taper.points", "Tension programme"],
    "100 mm: 3 pli; 1000 mm: 2 pli",
    "for `programme` only; diameters within the roll and increasing from the core outward",
    "Tension programme, as winder recipes store it: the tension at each diameter, interpolated linearly and held beyond the first and last point; the tension at the core is the programme's.",
);

pub const POINT_DIAMETER: Field = point_diameter(
    [
        "winding.taper.points[].diameter",
        "Tension programme diameter",
    ],
    "within the roll (core outside diameter to roll diameter)",
    "300 mm",
);

pub const POINT_TENSION: Field = Field {
    range: Some(above(0.0, 1e6, Q::ForcePerWidth)),
    accepted_also: "below the web strength",
    default: Required,
    help: "Web tension at this diameter.",
    example: "2.5 pli",
    ..plain(
        "winding.taper.points[].tension",
        "Tension programme tension",
        Quantity(Q::ForcePerWidth),
    )
};

pub const NIP_PROGRAMME: Field = programme(
    ["winding.nip_programme", "Nip programme"],
    "400 mm: 5 pli; 800 mm: 3 pli",
    "diameters within the roll, increasing; replaces `nip_load`",
    "Nip (rider) load as a table against diameter, interpolated linearly and held beyond its ends.",
);

pub const NIP_POINT_DIAMETER: Field = point_diameter(
    ["winding.nip_programme[].diameter", "Nip programme diameter"],
    "within the roll",
    "400 mm",
);

pub const NIP_POINT_LOAD: Field = Field {
    range: Some(from(0.0, 1e5, Q::ForcePerWidth)),
    default: Required,
    help: "Nip load at this diameter.",
    example: "5 pli",
    ..plain(
        "winding.nip_programme[].nip_load",
        "Nip programme load",
        Quantity(Q::ForcePerWidth),
    )
};

pub const NIP_PLATEAU: Field = Field {
    range: Some(above(0.0, 1e5, Q::ForcePerWidth)),
    default: Fixed(crate::presets::DEFAULT_NIP_PLATEAU),
    help: "Nip load above which the nip-induced tension no longer grows (measurements level off).",
    example: "2 kN/m",
    ..plain(
        "winding.nip_plateau",
        "Nip load where nip-induced tension levels off",
        Quantity(Q::ForcePerWidth),
    )
};

pub const CENTRE_TORQUE: Field = Field {
    form: Some("Centre torque"),
    range: Some(from(-1e6, 1e6, Q::Torque)),
    accepted_also: "centre_surface winders only",
    default: Rule("none (no centre drive torque)"),
    help: "Centre drive torque of a centre-surface winder for the whole width; adds torque/radius to the wound-in tension.",
    example: "150 N·m",
    ..plain(
        "winding.centre_torque",
        "Centre torque",
        Quantity(Q::Torque),
    )
};

pub const DRUMS: Field = Field {
    accepted_also: "two_drum and centre_surface winders only",
    help: "Drum geometry and torque differential of a two-drum winder.",
    ..plain("winding.drums", "Winder drums", Section)
};

pub const DRUM_DIAMETER: Field = Field {
    form: Some("Drum diameter"),
    range: Some(above(0.0, 5.0, Q::Length)),
    default: Fixed(crate::presets::DEFAULT_DRUM_DIAMETER),
    help: "Diameter of each winder drum.",
    example: "500 mm",
    ..plain(
        "winding.drums.diameter",
        "Drum diameter",
        Quantity(Q::Length),
    )
};

pub const DRUM_DISTANCE: Field = Field {
    form: Some("Drum distance"),
    range: Some(above(0.0, 10.0, Q::Length)),
    accepted_also: "more than one drum diameter, less than the core diameter plus one drum diameter",
    default: Rule("drum diameter + 20 mm (common practice: a narrow gap between the drums)"),
    help: "Distance between the two drum centres.",
    example: "520 mm",
    ..plain(
        "winding.drums.centre_distance",
        "Drum centre distance",
        Quantity(Q::Length),
    )
};

pub const DRUM_DIFFERENTIAL: Field = Field {
    form: Some("Drum torque diff."),
    range: Some(from(-1e6, 1e6, Q::Torque)),
    default: Rule("0 (both drums at the same torque)"),
    help: "Front drum torque minus the torque of the drum the web wraps, whole width; positive tightens the roll.",
    example: "40 N·m",
    ..plain(
        "winding.drums.torque_differential",
        "Drum torque differential",
        Quantity(Q::Torque),
    )
};

pub const STOP_TIME: Field = Field {
    range: Some(plain_above(0.0, 3600.0)),
    default: Rule("the run-up time, else 20 s (assumed; docs/theory.md §5)"),
    help: "Time of a normal stop from line speed in seconds (slip check of the layers).",
    example: "20",
    ..plain("winding.stop_time", "Normal stop time", Number)
};

pub const EMERGENCY_STOP_TIME: Field = Field {
    range: Some(plain_above(0.0, 3600.0)),
    default: Rule("4 s, web tension lost (assumed; docs/theory.md §5)"),
    help: "Time of an emergency stop from line speed in seconds (slip check of the layers).",
    example: "4",
    ..plain("winding.emergency_stop_time", "Emergency stop time", Number)
};

pub const UNWIND_TENSION: Field = Field {
    range: Some(from(0.0, 1e5, Q::ForcePerWidth)),
    default: Rule("the tension the outside was wound at (assumed; docs/theory.md §5)"),
    help: "Web tension at the customer's unwind, which the brake holds through the layers.",
    example: "1 pli",
    ..plain(
        "winding.unwind_tension",
        "Unwind tension",
        Quantity(Q::ForcePerWidth),
    )
};

pub const SHOCK_FACTOR: Field = Field {
    form: Some("Shock factor"),
    range: Some(plain_from(1.0, 20.0)),
    default: Fixed(crate::presets::DEFAULT_SHOCK_FACTOR),
    help: "Dynamic factor on the roll's weight when it is lifted by its core or stood on end (telescoping check); 1 is a slow, static lift.",
    example: "2",
    ..plain(
        "winding.handling_shock_factor",
        "Handling shock factor",
        Number,
    )
};

pub const SHAFT_TORQUE_RATING: Field = Field {
    form: Some("Shaft torque"),
    range: Some(above(0.0, 1e7, Q::Torque)),
    default: Rule("not checked (the core/shaft interface is checked only against a given rating)"),
    help: "Torque rating of the chuck or expanding shaft holding the core, whole width: the core-slip check compares the torque the core must pass in start-up, stops and unwind braking with it.",
    example: "800 N·m",
    ..plain(
        "core.shaft_torque_rating",
        "Chuck or shaft torque rating",
        Quantity(Q::Torque),
    )
};
