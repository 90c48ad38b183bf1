//! The entries of the field registry: one constant per case-file key and [`FIELDS`], the list
//! in schema order.

use super::{
    DefaultValue, Field, FieldKind, PresetFamily, above, from, plain, plain_above, plain_from,
};
use crate::units::QuantityKind;
use crate::vocabulary::{
    CoreMaterial, Place, RadialLaw, TaperKind, WINDING_METHOD_IDS, WebMaterial,
};

use DefaultValue::{CorePreset as FromCore, Fixed, Required, Rule, WebPreset as FromWeb};
use FieldKind::{Choice, List, Map, Number, Preset, Quantity, Section, Text};
use QuantityKind as Q;

/// Core support states, as written in case files.
pub const CORE_SUPPORTS: &[&str] = &["free", "shaft"];

pub const TITLE: Field = Field {
    form: Some("Title"),
    accepted_also: "not empty",
    default: Required,
    help: "Short title of the case.",
    example: "Reel 4 telescoped",
    ..plain("title", "Title", Text)
};
pub const DESCRIPTION: Field = Field {
    help: "What was seen, on which rolls, since when.",
    ..plain("description", "Description", Text)
};
pub const WEB: Field = Field {
    help: "The web being wound.",
    ..plain("web", "Web", Section)
};
pub const WEB_PRESET: Field = Field {
    form: Some("Web preset"),
    default: Rule(
        "by `material`: paper → `newsprint`, board → `board`, film/laminate → `pet_film`, foil → `aluminium_foil`, nonwoven → `spunbond_nonwoven`",
    ),
    help: "Generic web the missing values come from.",
    example: "newsprint",
    ..plain("web.preset", "Web preset", Preset(PresetFamily::Web))
};
pub const WEB_MATERIAL: Field = Field {
    form: Some("Material"),
    default: Rule("the preset's"),
    help: "Kind of web.",
    example: "paper",
    ..plain("web.material", "Web material", Choice(WebMaterial::IDS))
};
pub const WEB_THICKNESS: Field = Field {
    form: Some("Thickness"),
    range: Some(from(0.5e-6, 10e-3, Q::Length)),
    accepted_also: "less than the core outside radius",
    default: FromWeb(|p| p.thickness),
    help: "Caliper of one layer.",
    example: "76 um",
    ..plain("web.thickness", "Web thickness", Quantity(Q::Length))
};
pub const WEB_WIDTH: Field = Field {
    form: Some("Width"),
    range: Some(from(1e-3, 20.0, Q::Length)),
    default: Fixed(crate::presets::DEFAULT_WIDTH),
    help: "Web width (results are per unit width).",
    example: "2.4 m",
    ..plain("web.width", "Web width", Quantity(Q::Length))
};
pub const WEB_MODULUS: Field = Field {
    form: Some("MD modulus"),
    range: Some(from(1e6, 400e9, Q::Stress)),
    default: FromWeb(|p| p.tangential_modulus),
    help: "Machine-direction (tangential) modulus of the web.",
    example: "4 GPa",
    ..plain(
        "web.tangential_modulus",
        "Tangential (machine-direction) modulus",
        Quantity(Q::Stress),
    )
};
pub const RADIAL_STIFFNESS: Field = Field {
    default: Rule("Pfeiffer with the preset's K1, K2"),
    help: "How the stack stiffens under radial pressure: `law` and the constants of that law, no others.",
    ..plain("web.radial_stiffness", "Radial stiffness law", Section)
};
pub const RADIAL_LAW: Field = Field {
    form: Some("Radial law"),
    default: Required,
    help: "pfeiffer: P = K1·(e^(K2·ε) − 1), so Er = K2·(P + K1) (Pfeiffer 1966); constant: Er = modulus; power_law: Er = C·Pⁿ with P in Pa.",
    example: "pfeiffer",
    ..plain(
        "web.radial_stiffness.law",
        "Radial stiffness law",
        Choice(RadialLaw::IDS),
    )
};
pub const K1: Field = Field {
    form: Some("Pfeiffer K1"),
    range: Some(above(0.0, 100e6, Q::Stress)),
    default: FromWeb(|p| p.k1),
    help: "Pfeiffer K1 (law `pfeiffer`).",
    example: "5 kPa",
    ..plain(
        "web.radial_stiffness.k1",
        "Pfeiffer K1",
        Quantity(Q::Stress),
    )
};
pub const K2: Field = Field {
    form: Some("Pfeiffer K2"),
    // Er = K2·(P + K1): a vanishing K2 leaves the stack without radial stiffness and the
    // solution without a finite value; published fits are in the tens to hundreds.
    range: Some(plain_from(1.0, 1e5)),
    default: FromWeb(|p| p.k2),
    help: "Pfeiffer K2 (law `pfeiffer`).",
    example: "50",
    ..plain("web.radial_stiffness.k2", "Pfeiffer K2", Number)
};
pub const RADIAL_MODULUS: Field = Field {
    form: Some("Radial modulus"),
    // A vanishing modulus gives no finite solution (1e-300 Pa made every pressure NaN).
    range: Some(from(1e3, 400e9, Q::Stress)),
    default: Required,
    help: "Constant radial modulus (law `constant`).",
    example: "20 MPa",
    ..plain(
        "web.radial_stiffness.modulus",
        "Radial modulus",
        Quantity(Q::Stress),
    )
};
pub const POWER_COEFFICIENT: Field = Field {
    // As for the constant modulus: a vanishing coefficient gives no finite solution.
    range: Some(from(1e-3, 1e12, Q::Stress)),
    default: Required,
    help: "Coefficient C of Er = C·Pⁿ (law `power_law`), taken in Pa-based units.",
    example: "2000",
    ..plain(
        "web.radial_stiffness.coefficient",
        "Power-law coefficient",
        Quantity(Q::Stress),
    )
};
pub const POWER_EXPONENT: Field = Field {
    // The solver integrates Er = C·Pⁿ only for n below 1.
    range: Some(plain_from(0.0, 1.0).below_max()),
    default: Required,
    help: "Exponent n of Er = C·Pⁿ (law `power_law`).",
    example: "0.6",
    ..plain(
        "web.radial_stiffness.exponent",
        "Power-law exponent",
        Number,
    )
};
pub const WEB_POISSON: Field = Field {
    form: Some("Poisson ratio"),
    // The accretion model needs ν below 0.5 (incompressible stack).
    range: Some(plain_from(0.0, 0.5).below_max()),
    default: FromWeb(|p| p.poisson_ratio),
    help: "Poisson ratio ν of the wound stack.",
    example: "0.01",
    ..plain("web.poisson_ratio", "Poisson ratio of the stack", Number)
};
pub const FRICTION: Field = Field {
    form: Some("Web-web friction"),
    range: Some(plain_above(0.0, 2.0)),
    default: FromWeb(|p| p.friction),
    help: "Static web-to-web friction coefficient: judges slip (cinching, telescoping, core slip).",
    example: "0.4",
    ..plain("web.friction", "Web-to-web friction", Number)
};
pub const KINETIC_FRICTION: Field = Field {
    form: Some("Kinetic friction"),
    range: Some(plain_above(0.0, 2.0)),
    default: FromWeb(|p| p.kinetic_friction),
    help: "Kinetic web-to-web friction coefficient: drives the nip-induced tension (the outer layer slips under the nip).",
    example: "0.2",
    ..plain(
        "web.kinetic_friction",
        "Web-to-web kinetic friction",
        Number,
    )
};
pub const DENSITY: Field = Field {
    form: Some("Density (kg/m³)"),
    range: Some(plain_from(10.0, 25_000.0)),
    default: FromWeb(|p| p.density),
    accepted_also: "when left out: `basis_weight` over `thickness` if the basis weight is given, else the preset's",
    help: "Density of the web in kg/m³ (basis weight over caliper): roll weight on winder drums, centrifugal unloading, the handling and inertia loads of the telescoping and slip checks.",
    example: "600",
    ..plain("web.density", "Web density (kg/m³)", Number)
};
pub const WEB_BASIS_WEIGHT: Field = Field {
    form: Some("Basis weight"),
    range: Some(above(0.0, 5.0, Q::BasisWeight)),
    accepted_also: "gives a density (over the caliper) in the density's range",
    default: Rule("not used (the density comes from `density` or the preset)"),
    help: "Basis weight (grammage) of the web; over the caliper it gives the density when `density` is not given.",
    example: "45 g/m2",
    ..plain(
        "web.basis_weight",
        "Web basis weight",
        Quantity(Q::BasisWeight),
    )
};
pub const ROUGHNESS: Field = Field {
    form: Some("Roughness (RMS)"),
    // The air-film check divides by the roughness: 0 would make the ratio infinite. 10 nm is
    // smoother than polished foil.
    range: Some(from(10e-9, 200e-6, Q::Length)),
    default: FromWeb(|p| p.roughness),
    help: "RMS roughness of one surface.",
    example: "3 um",
    ..plain(
        "web.roughness",
        "Surface roughness (RMS, one side)",
        Quantity(Q::Length),
    )
};
pub const STRENGTH: Field = Field {
    form: Some("Tensile strength"),
    range: Some(above(0.0, 1e7, Q::ForcePerWidth)),
    default: FromWeb(|p| p.strength),
    help: "Machine-direction tensile strength per width.",
    example: "3 kN/m",
    ..plain(
        "web.strength",
        "Tensile strength",
        Quantity(Q::ForcePerWidth),
    )
};
pub const CORE: Field = Field {
    help: "The core the roll is wound on.",
    ..plain("core", "Core", Section)
};
pub const CORE_PRESET: Field = Field {
    form: Some("Core preset"),
    default: Rule(
        "by `material` and the web (paper core 3 in for paper, 6 in for film/foil); nearest outside diameter when only that is given",
    ),
    help: "Generic core the missing values come from.",
    example: "paper_3in",
    ..plain("core.preset", "Core preset", Preset(PresetFamily::Core))
};
pub const CORE_MATERIAL: Field = Field {
    form: Some("Core material"),
    accepted_also: "`aluminum` is read as aluminium; must match the preset's material when both are given",
    default: Rule("the preset's"),
    help: "Core material; `rigid` is an infinitely stiff core.",
    example: "paper",
    ..plain("core.material", "Core material", Choice(CoreMaterial::IDS))
};
pub const CORE_INSIDE: Field = Field {
    form: Some("Core inside dia."),
    range: Some(from(0.0, 2.0, Q::Length)),
    accepted_also: "less than the outside diameter",
    default: FromCore(|p| p.inside_diameter),
    help: "Bore of the core (preset, or the outside diameter minus the preset's wall).",
    example: "76 mm",
    ..plain(
        "core.inside_diameter",
        "Core inside diameter",
        Quantity(Q::Length),
    )
};
pub const CORE_OUTSIDE: Field = Field {
    form: Some("Core outside dia."),
    range: Some(from(5e-3, 2.0, Q::Length)),
    default: FromCore(|p| p.outside_diameter),
    help: "Outside diameter where winding starts (preset, or the inside diameter plus the preset's wall).",
    example: "100 mm",
    ..plain(
        "core.outside_diameter",
        "Core outside diameter",
        Quantity(Q::Length),
    )
};
pub const CORE_MODULUS: Field = Field {
    form: Some("Core modulus"),
    range: Some(from(1e6, 400e9, Q::Stress)),
    default: FromCore(|p| p.modulus),
    help: "Modulus of the core material, for the hollow-cylinder (Lamé) stiffness.",
    example: "3 GPa",
    ..plain("core.modulus", "Core modulus", Quantity(Q::Stress))
};
pub const CORE_POISSON: Field = Field {
    range: Some(plain_from(0.0, 0.49)),
    default: FromCore(|p| p.poisson_ratio),
    help: "Poisson ratio of the core material.",
    example: "0.3",
    ..plain("core.poisson_ratio", "Core Poisson ratio", Number)
};
pub const CORE_STIFFNESS: Field = Field {
    // A vanishing core stiffness gives no finite solution (1e-300 Pa made every pressure NaN).
    range: Some(from(1e3, 1e12, Q::Stress)),
    default: Rule("— (from modulus and geometry, or rigid)"),
    help: "A measured effective core stiffness Ec; overrides modulus and geometry.",
    example: "1 GPa",
    ..plain("core.stiffness", "Core stiffness", Quantity(Q::Stress))
};
pub const CRUSH: Field = Field {
    form: Some("Core crush rating"),
    range: Some(above(0.0, 1e9, Q::Stress)),
    default: FromCore(|p| p.crush_pressure),
    accepted_also: "without it or `flat_crush`, estimated from the wall stress or buckling",
    help: "Supplier's radial (bladder) crush pressure, compared with the pressure on the core directly.",
    example: "2 MPa",
    ..plain(
        "core.crush_pressure",
        "Core rated crush pressure",
        Quantity(Q::Stress),
    )
};
pub const CORE_RADIAL_MODULUS: Field = Field {
    form: Some("Core radial E"),
    range: Some(from(1e5, 400e9, Q::Stress)),
    default: FromCore(|p| p.radial_modulus),
    accepted_also: "for steel, aluminium and plastic it follows `modulus` when not given",
    help: "Radial (through-the-wall) modulus of the core; spiral-wound paper cores are strongly orthotropic (Gerhardt 1990).",
    example: "40 MPa",
    ..plain(
        "core.radial_modulus",
        "Core radial modulus",
        Quantity(Q::Stress),
    )
};
pub const CORE_SUPPORT: Field = Field {
    form: Some("Core support"),
    default: Rule("free (shaft pulled, in storage: the state in which cores crush)"),
    help: "Whether the core sits on an expanding shaft (bore held) or is free; the winding solve and the crush check use it.",
    example: "free",
    ..plain("core.support", "Core support", Choice(CORE_SUPPORTS))
};
pub const FLAT_CRUSH: Field = Field {
    form: Some("Core flat crush"),
    range: Some(above(0.0, 1e8, Q::ForcePerWidth)),
    default: Rule("none"),
    help: "Supplier's flat crush load per length of core (4 kN per 100 mm = 40 kN/m), turned into a radial pressure 6·W/(π·t).",
    example: "40 kN/m",
    ..plain(
        "core.flat_crush",
        "Core flat crush rating",
        Quantity(Q::ForcePerWidth),
    )
};
pub const CORE_STRENGTH: Field = Field {
    range: Some(above(0.0, 2e9, Q::Stress)),
    default: FromCore(|p| p.compressive_strength),
    help: "Hoop compressive strength of the core wall, for the crush estimate when no rating is given.",
    example: "20 MPa",
    ..plain(
        "core.compressive_strength",
        "Core wall compressive strength",
        Quantity(Q::Stress),
    )
};
pub const ROLL: Field = Field {
    help: "The finished roll.",
    ..plain("roll", "Roll", Section)
};
pub const ROLL_DIAMETER: Field = Field {
    form: Some("Roll diameter"),
    range: Some(above(0.0, 5.0, Q::Length)),
    accepted_also: "at least one layer larger than the core outside diameter, at most 2 million layers",
    default: Fixed(crate::presets::DEFAULT_ROLL_DIAMETER),
    help: "Finished roll diameter; from `length` when only that is given (R = √(rc² + L·h/π)).",
    example: "1 m",
    ..plain("roll.diameter", "Roll diameter", Quantity(Q::Length))
};
pub const ROLL_LENGTH: Field = Field {
    form: Some("Wound length"),
    range: Some(above(0.0, 1e8, Q::Length)),
    accepted_also: "at least one wrap around the core",
    default: Rule("from `diameter`"),
    help: "Wound length; used when the diameter is not given (L = π(R² − rc²)/h).",
    example: "12000 m",
    ..plain("roll.length", "Wound length", Quantity(Q::Length))
};
pub const WINDING: Field = Field {
    help: "How the roll was wound.",
    ..plain("winding", "Winding", Section)
};
pub const METHOD: Field = Field {
    form: Some("Winding method"),
    accepted_also: "`center`, `center_surface` are read too",
    default: Rule("centre"),
    help: "Centre, surface or centre-surface winding.",
    example: "centre",
    ..plain(
        "winding.method",
        "Winding method",
        Choice(WINDING_METHOD_IDS),
    )
};
pub const TENSION: Field = Field {
    form: Some("Web tension"),
    range: Some(above(0.0, 1e6, Q::ForcePerWidth)),
    accepted_also: "below the web strength; refused beside a tension programme (taper kind `programme`)",
    default: FromWeb(|p| p.typical_tension),
    help: "Web tension at the start of the roll (force per width).",
    example: "3 pli",
    ..plain(
        "winding.tension",
        "Web tension at the core",
        Quantity(Q::ForcePerWidth),
    )
};
pub const TAPER: Field = Field {
    default: Rule("none (constant tension)"),
    help: "How the tension falls from the core outward.",
    ..plain("winding.taper", "Taper", Section)
};
pub const TAPER_KIND: Field = Field {
    form: Some("Taper"),
    default: Required,
    help: "Form of the taper.",
    example: "hyperbolic",
    ..plain("winding.taper.kind", "Taper kind", Choice(TaperKind::IDS))
};
pub const TAPER_AMOUNT: Field = Field {
    form: Some("Taper amount"),
    // At 100 % a linear taper winds the last wrap at no tension, where the air film is
    // infinite.
    range: Some(from(0.0, 1.0, Q::Percent).below_max()),
    accepted_also: "required for linear and hyperbolic, refused for none, steps and programme",
    default: Rule("—"),
    help: "Share of the starting tension taken off by the outside (`\"25 %\"` or `0.25`).",
    example: "25 %",
    ..plain("winding.taper.amount", "Taper amount", Quantity(Q::Percent))
};
pub const TAPER_STEPS: Field = Field {
    example: "300 mm: 2.5 pli; 450 mm: 2 pli",
    form: Some("Tension steps"),
    accepted_also: "for `steps` only; diameters within the roll and increasing from the core outward",
    help: "Tension steps: from each diameter on, the web runs at the step's tension.",
    ..plain("winding.taper.steps", "Tension steps", List)
};
pub const STEP_FROM: Field = Field {
    accepted_also: "within the roll (core outside diameter to roll diameter)",
    default: Required,
    help: "Diameter from which the step's tension applies.",
    example: "300 mm",
    ..plain(
        "winding.taper.steps[].from_diameter",
        "Step start diameter",
        Quantity(Q::Length),
    )
};
pub const STEP_TENSION: Field = Field {
    range: Some(above(0.0, 1e6, Q::ForcePerWidth)),
    accepted_also: "below the web strength",
    default: Required,
    help: "Tension of the step.",
    example: "2.5 pli",
    ..plain(
        "winding.taper.steps[].tension",
        "Step tension",
        Quantity(Q::ForcePerWidth),
    )
};
pub const NIP: Field = Field {
    form: Some("Nip load"),
    range: Some(from(0.0, 1e5, Q::ForcePerWidth)),
    default: Rule("none (no nip or rider roll)"),
    help: "Rider or lay-on roll load per width.",
    example: "10 pli",
    ..plain("winding.nip_load", "Nip load", Quantity(Q::ForcePerWidth))
};
pub const SPEED: Field = Field {
    form: Some("Line speed"),
    range: Some(above(0.0, 60.0, Q::Speed)),
    default: Fixed(crate::presets::DEFAULT_SPEED),
    help: "Line speed at the winder.",
    example: "1200 fpm",
    ..plain("winding.speed", "Line speed", Quantity(Q::Speed))
};
pub const UPSETS: Field = Field {
    help: "Bands wound at another tension (a splice, a controller fault).",
    ..plain("winding.upsets", "Tension upset band", List)
};
pub const UPSET_FROM: Field = Field {
    accepted_also: "within the roll",
    default: Required,
    help: "Diameter where the band starts.",
    example: "600 mm",
    ..plain(
        "winding.upsets[].from_diameter",
        "Upset start diameter",
        Quantity(Q::Length),
    )
};
pub const UPSET_TO: Field = Field {
    accepted_also: "within the roll, larger than from_diameter",
    default: Required,
    help: "Diameter where the band ends.",
    example: "620 mm",
    ..plain(
        "winding.upsets[].to_diameter",
        "Upset end diameter",
        Quantity(Q::Length),
    )
};
pub const UPSET_TENSION: Field = Field {
    // A band at no tension has an infinite air film.
    range: Some(above(0.0, 1e6, Q::ForcePerWidth)),
    accepted_also: "below the web strength",
    default: Required,
    help: "Tension the band was wound at.",
    example: "3 pli",
    ..plain(
        "winding.upsets[].tension",
        "Upset tension",
        Quantity(Q::ForcePerWidth),
    )
};
pub const TEMPERATURE: Field = Field {
    form: Some("Web temperature"),
    range: Some(from(-60.0, 300.0, Q::Temperature)),
    default: Rule("not used"),
    help: "Web temperature at the winder.",
    example: "35 °C",
    ..plain(
        "winding.temperature",
        "Web temperature",
        Quantity(Q::Temperature),
    )
};
pub const ACCELERATION: Field = Field {
    form: Some("Run-up time (s)"),
    range: Some(plain_above(0.0, 3600.0)),
    default: Rule(
        "20 s for the layer-slip check (assumed; docs/theory.md §5); the acceleration-torque share needs a given time",
    ),
    help: "Time to reach line speed in seconds (acceleration torque and layer-slip checks).",
    example: "20",
    ..plain("winding.acceleration_time", "Time to line speed", Number)
};
pub const RECIPE_TENSION: Field = Field {
    form: Some("Usual tension (recipe)"),
    range: Some(above(0.0, 1e6, Q::ForcePerWidth)),
    accepted_also: "below the web strength",
    default: Rule("not used: the tension is judged against the grade's typical winding stress"),
    help: "The web tension this grade usually runs at on this winder (the recipe value), if known.",
    example: "2 pli",
    ..plain(
        "winding.recipe_tension",
        "Usual tension (recipe)",
        Quantity(Q::ForcePerWidth),
    )
};
pub const SYMPTOMS: Field = Field {
    help: "Observed defects.",
    ..plain("symptoms", "Symptoms", List)
};
pub const SYMPTOM_ID: Field = Field {
    accepted_also: "a symptom ID (below); an unknown ID is refused with the closest one suggested",
    default: Required,
    help: "Which defect.",
    example: "telescoping",
    ..plain(
        "symptoms[].id",
        "Symptom",
        Choice(&crate::vocabulary::SYMPTOM_IDS),
    )
};
pub const SYMPTOM_WHERE: Field = Field {
    help: "Where on the roll it is seen.",
    example: "body",
    ..plain("symptoms[].where", "Where on the roll", Choice(Place::IDS))
};
pub const SYMPTOM_NOTES: Field = Field {
    help: "How it looks, how many rolls.",
    ..plain("symptoms[].notes", "Symptom notes", Text)
};
pub const ANSWERS: Field = Field {
    accepted_also: "question ID → `yes`, `no`, `unknown` or a choice ID of that question",
    help: "Answers to the symptom questions of the rule base.",
    ..plain("answers", "Answers", Map)
};
pub const NOTES: Field = Field {
    help: "Anything else.",
    ..plain("notes", "Notes", Text)
};
/// The complaint record's own fields and checks live in `complaint.rs` (docs/history.md).
pub const COMPLAINT: Field = Field {
    help: "The complaint record: reference, customer, dates, rolls, status, confirmed causes, actions (docs/history.md).",
    ..plain("complaint", "Complaint record", Section)
};

/// Every field of the case file, in schema order (the inputs form keeps this order).
pub const FIELDS: &[&Field] = &[
    &TITLE,
    &DESCRIPTION,
    &WEB,
    &WEB_PRESET,
    &WEB_MATERIAL,
    &WEB_THICKNESS,
    &WEB_WIDTH,
    &WEB_MODULUS,
    &RADIAL_STIFFNESS,
    &RADIAL_LAW,
    &K1,
    &K2,
    &RADIAL_MODULUS,
    &POWER_COEFFICIENT,
    &POWER_EXPONENT,
    &WEB_POISSON,
    &FRICTION,
    &KINETIC_FRICTION,
    &DENSITY,
    &WEB_BASIS_WEIGHT,
    &ROUGHNESS,
    &STRENGTH,
    &CORE,
    &CORE_PRESET,
    &CORE_MATERIAL,
    &CORE_INSIDE,
    &CORE_OUTSIDE,
    &CORE_MODULUS,
    &CORE_POISSON,
    &CORE_STIFFNESS,
    &CRUSH,
    &CORE_RADIAL_MODULUS,
    &CORE_SUPPORT,
    &FLAT_CRUSH,
    &CORE_STRENGTH,
    &super::SHAFT_TORQUE_RATING,
    &ROLL,
    &ROLL_DIAMETER,
    &ROLL_LENGTH,
    &WINDING,
    &METHOD,
    &TENSION,
    &TAPER,
    &TAPER_KIND,
    &TAPER_AMOUNT,
    &TAPER_STEPS,
    &STEP_FROM,
    &STEP_TENSION,
    &super::TAPER_POINTS,
    &super::POINT_DIAMETER,
    &super::POINT_TENSION,
    &NIP,
    &super::NIP_PROGRAMME,
    &super::NIP_POINT_DIAMETER,
    &super::NIP_POINT_LOAD,
    &super::NIP_PLATEAU,
    &super::CENTRE_TORQUE,
    &super::DRUMS,
    &super::DRUM_DIAMETER,
    &super::DRUM_DISTANCE,
    &super::DRUM_DIFFERENTIAL,
    &SPEED,
    &UPSETS,
    &UPSET_FROM,
    &UPSET_TO,
    &UPSET_TENSION,
    &TEMPERATURE,
    &ACCELERATION,
    &RECIPE_TENSION,
    &super::STOP_TIME,
    &super::EMERGENCY_STOP_TIME,
    &super::UNWIND_TENSION,
    &super::SHOCK_FACTOR,
    &SYMPTOMS,
    &SYMPTOM_ID,
    &SYMPTOM_WHERE,
    &SYMPTOM_NOTES,
    &ANSWERS,
    &NOTES,
    &COMPLAINT,
    &super::MEASUREMENTS,
    &super::DIAMETER,
    &super::LENGTH,
    &super::WEIGHT,
    &super::BASIS_WEIGHT,
    &super::WIDTH,
    &super::UNCERTAINTY,
    &super::U_AMOUNT,
    &super::U_DIAMETER,
    &super::U_CALIPER,
    &super::HARDNESS,
    &super::HARDNESS_DIRECTION,
    &super::READINGS,
    &super::READING_DIAMETER,
    &super::READING_VALUE,
    &super::CALIBRATION,
    &super::CAL_READING,
    &super::CAL_PRESSURE,
    &super::LANES,
    &super::LANES_DIRECTION,
    &super::LANE_READINGS,
    &super::END_LINE,
    &super::BEND,
    &super::BEND_FROM,
    &super::BEND_TO,
    &super::BEND_DIRECTION,
    &super::BEND_OFFSET,
    &super::CORE_BORE,
    &super::SET,
    &super::SET_ROLLS,
    &super::SET_BAD,
    &super::SET_POSITIONS,
    &super::SET_PARENT,
    &super::SET_PARENT_POSITION,
    &super::SET_PARENTS,
    &super::SET_BAD_PARENTS,
];
