//! The indicator catalogue: every number the rules may test, with its dimension, zones and
//! meaning.

use super::{Dimension, IndicatorSpec, ZoneUse};

/// Every indicator the rules may test.
pub const INDICATORS: &[IndicatorSpec] = &[
    spec(
        "core_pressure",
        Dimension::Pressure,
        ZoneUse::None,
        "interlayer pressure on the core surface",
    ),
    spec(
        "core_pressure_ratio",
        Dimension::Ratio,
        ZoneUse::None,
        "pressure on the core divided by the core's rated crush pressure (above 1 = overloaded)",
    ),
    spec(
        "first_wraps_pressure_ratio",
        Dimension::Ratio,
        ZoneUse::None,
        "mean pressure in the first wraps (core zone) over that of the inner zone (under 1 = the first wraps are held less hard than the wraps outside them)",
    ),
    spec(
        "core_pressure_size_share",
        Dimension::Fraction,
        ZoneUse::None,
        "share of the computed core pressure that the outer half of the build adds (re-solved at half the build; near 0 = roll size cannot move it)",
    ),
    spec(
        "core_pressure_taper_share",
        Dimension::Fraction,
        ZoneUse::None,
        "share of the computed core pressure that 30 percent points more taper removes (re-solved; near 0 = taper cannot move it)",
    ),
    spec(
        "peak_pressure",
        Dimension::Pressure,
        ZoneUse::None,
        "highest interlayer pressure anywhere in the roll",
    ),
    spec(
        "peak_pressure_position",
        Dimension::Fraction,
        ZoneUse::None,
        "where the pressure peaks, as a share of the build from the core (0) to the outside (1)",
    ),
    spec(
        "pressure_min",
        Dimension::Pressure,
        ZoneUse::Required,
        "lowest interlayer pressure in the zone",
    ),
    spec(
        "pressure_mean",
        Dimension::Pressure,
        ZoneUse::Required,
        "mean interlayer pressure in the zone (averaged over radius)",
    ),
    spec(
        "pressure_max",
        Dimension::Pressure,
        ZoneUse::Required,
        "highest interlayer pressure in the zone",
    ),
    spec(
        "low_pressure_extent",
        Dimension::Fraction,
        ZoneUse::Optional,
        "share of the zone's build where the interlayer pressure is below 20 kPa (loosely held layers)",
    ),
    spec(
        "telescoping_margin",
        Dimension::Ratio,
        ZoneUse::None,
        "smallest ratio, over every interface, of the friction the pressure gives to the axial shear of lifting the roll by its core (with the shock factor); below 1 = layers slide",
    ),
    spec(
        "min_tangential_stress",
        Dimension::Pressure,
        ZoneUse::Optional,
        "most compressive tangential (hoop) stress in the zone; negative = compression",
    ),
    spec(
        "min_tangential_position",
        Dimension::Fraction,
        ZoneUse::None,
        "where the most compressive tangential stress sits, as a share of the build from the core",
    ),
    spec(
        "compressive_band_extent",
        Dimension::Fraction,
        ZoneUse::Optional,
        "share of the zone's build where the layers are in tangential compression",
    ),
    spec(
        "compressive_stress_ratio",
        Dimension::Ratio,
        ZoneUse::Optional,
        "most compressive tangential stress in the zone divided by the web stress at winding (0 = none)",
    ),
    spec(
        "slip_margin",
        Dimension::Ratio,
        ZoneUse::None,
        "smallest ratio, over every interface inside the surface wraps and every event (start-up, stops, unwind), of the friction torque the interface can carry to the torque it must pass (below 1 = layers slip)",
    ),
    spec(
        "speed_change_slip_margin",
        Dimension::Ratio,
        ZoneUse::None,
        "the slip margin over the speed-change events only (start-up, normal stop, emergency stop): what the roll's inertia asks of the layers",
    ),
    spec(
        "core_slip_margin",
        Dimension::Ratio,
        ZoneUse::None,
        "the same ratio at the core/web interface, smallest over the events (below 1 = the roll turns on its core)",
    ),
    spec(
        "shaft_slip_margin",
        Dimension::Ratio,
        ZoneUse::None,
        "the chuck or shaft torque rating over the torque the core must pass, smallest over the events (below 1 = the core turns on its chuck); only when the case gives the rating",
    ),
    spec(
        "air_film_ratio",
        Dimension::Ratio,
        ZoneUse::None,
        "entrained air film thickness divided by the combined surface roughness (above ~1 the layers float)",
    ),
    spec(
        "wit_strength_share",
        Dimension::Fraction,
        ZoneUse::None,
        "highest wound-in tension as a share of the web's tensile strength",
    ),
    spec(
        "wit_drop",
        Dimension::Fraction,
        ZoneUse::None,
        "fall of the wound-in tension from the core to the outside, as a share of the value at the core",
    ),
    spec(
        "wit_step",
        Dimension::Fraction,
        ZoneUse::None,
        "largest jump of wound-in tension between neighbouring layers, as a share of the mean wound-in tension (steps, upsets)",
    ),
    spec(
        "build_ratio",
        Dimension::Ratio,
        ZoneUse::None,
        "finished roll diameter divided by core outside diameter",
    ),
    spec(
        "radial_strain_max",
        Dimension::Fraction,
        ZoneUse::Optional,
        "largest radial compressive strain of the stack in the zone",
    ),
    spec(
        "build_compression",
        Dimension::Fraction,
        ZoneUse::None,
        "mean radial compressive strain over the build: share of the loose web thickness pressed out",
    ),
    spec(
        "core_stiffness_ratio",
        Dimension::Ratio,
        ZoneUse::None,
        "effective core stiffness divided by the radial modulus of the first wraps (low = soft core)",
    ),
    spec(
        "acceleration_torque_share",
        Dimension::Ratio,
        ZoneUse::None,
        "torque to accelerate the full roll to line speed divided by the steady tension torque",
    ),
    spec(
        "speed",
        Dimension::Speed,
        ZoneUse::None,
        "line speed at the winder",
    ),
    spec(
        "web_tension",
        Dimension::ForcePerWidth,
        ZoneUse::None,
        "web tension at the start of the roll, per unit width",
    ),
    spec(
        "web_stress",
        Dimension::Pressure,
        ZoneUse::None,
        "web tension at the start of the roll divided by the web thickness",
    ),
    spec(
        "winding_strain",
        Dimension::Fraction,
        ZoneUse::None,
        "machine-direction strain of the web at winding: web tension / (tangential modulus × thickness)",
    ),
    spec(
        "nip_wit_share",
        Dimension::Fraction,
        ZoneUse::None,
        "share of the wound-in tension that comes from the nip (friction × nip load), 0 without a nip",
    ),
    spec(
        "tension_to_usual",
        Dimension::Ratio,
        ZoneUse::None,
        "web tension divided by the usual tension for this web: the case's recipe value, else the grade's typical winding stress × caliper (1 = usual)",
    ),
    spec(
        "tension_to_recipe",
        Dimension::Ratio,
        ZoneUse::None,
        "web tension divided by the recipe tension the case states (absent when not stated)",
    ),
    spec(
        "tension_strength_share",
        Dimension::Fraction,
        ZoneUse::None,
        "web tension at the start as a share of the web's tensile strength",
    ),
    spec(
        "nip_load",
        Dimension::ForcePerWidth,
        ZoneUse::None,
        "nip (rider or lay-on roll) load per unit width; 0 when there is no nip",
    ),
    spec(
        "nip_to_tension",
        Dimension::Ratio,
        ZoneUse::None,
        "nip load divided by web tension",
    ),
    spec(
        "taper",
        Dimension::Percent,
        ZoneUse::None,
        "tension taper from core to outside in percent of the starting tension",
    ),
    spec(
        "temperature",
        Dimension::Temperature,
        ZoneUse::None,
        "web temperature at the winder (absent when not given)",
    ),
    spec(
        "thickness",
        Dimension::Length,
        ZoneUse::None,
        "web thickness (caliper)",
    ),
    spec(
        "roll_diameter",
        Dimension::Length,
        ZoneUse::None,
        "finished roll diameter",
    ),
    spec(
        "friction",
        Dimension::Ratio,
        ZoneUse::None,
        "web-to-web friction coefficient",
    ),
    // Measured evidence (src/evidence): present only when the case carries the measurement.
    spec(
        "measured_density_ratio",
        Dimension::Ratio,
        ZoneUse::None,
        "wound density measured (length or weight and diameter) divided by the computed one (below 1 = looser than the settings give)",
    ),
    spec(
        "density_deviation",
        Dimension::Ratio,
        ZoneUse::None,
        "measured minus computed mean radial compression in standard uncertainties of the measurement (below −2 = clearly looser than the settings give, above 2 = clearly denser)",
    ),
    spec(
        "hardness_shape_agreement",
        Dimension::Ratio,
        ZoneUse::None,
        "rank correlation of the hardness readings along the radius with the computed pressure (1 = same shape, 0 = none)",
    ),
    spec(
        "hardness_soft_band",
        Dimension::Fraction,
        ZoneUse::None,
        "deepest dip in the hardness readings the computed pressure does not have, as a share of the readings' range",
    ),
    spec(
        "lane_hardness_spread",
        Dimension::Fraction,
        ZoneUse::None,
        "hardness spread across the width (hardest minus softest lane over the mean); the model cannot compute it",
    ),
    spec(
        "end_line_offset",
        Dimension::Length,
        ZoneUse::None,
        "largest sideways offset of a straight line drawn on the roll end (0 = stayed straight)",
    ),
    spec(
        "end_line_bend_position",
        Dimension::Fraction,
        ZoneUse::None,
        "where the line on the roll end bends, as a share of the build from the core (middle of the bend)",
    ),
    spec(
        "slip_location_match",
        Dimension::Ratio,
        ZoneUse::None,
        "1 when the line on the roll end bends where the computed friction torque capacity is lowest, 0 when not",
    ),
    spec(
        "core_bore_ratio",
        Dimension::Ratio,
        ZoneUse::None,
        "measured closing of the core bore divided by the computed elastic closing under the core pressure",
    ),
    spec(
        "bad_roll_share",
        Dimension::Fraction,
        ZoneUse::None,
        "share of the rolls in the set that are bad",
    ),
    spec(
        "bad_edge_share",
        Dimension::Fraction,
        ZoneUse::None,
        "share of the bad rolls that sat at the two edge positions of the set",
    ),
    spec(
        "bad_parent_share",
        Dimension::Fraction,
        ZoneUse::None,
        "share of the parent rolls looked at that gave bad rolls",
    ),
];

pub(super) const fn spec(
    id: &'static str,
    dimension: Dimension,
    zones: ZoneUse,
    meaning: &'static str,
) -> IndicatorSpec {
    IndicatorSpec {
        id,
        dimension,
        zones,
        meaning,
    }
}
