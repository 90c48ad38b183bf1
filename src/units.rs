//! Quantities with units at the edges, SI inside: parse "2.5 pli", "48 mil", "1200 fpm",
//! "60 psi" and print values in SI or US trade units.
//!
//! Conventions:
//! - Every kind returns its SI value (m, N/m, Pa, m/s, N, N·m), except temperature, which is
//!   returned in degrees Celsius (the case and the model store °C; differences equal kelvin),
//!   and percent, which is returned as a fraction (`"25 %"` → 0.25).
//! - Text must carry a unit. A bare number in text is [`UnitError::MissingUnit`], except a bare
//!   `0` (zero is zero in every unit; not for temperature) and a bare number for
//!   [`QuantityKind::Percent`], which is read as a fraction (`0.25`).
//! - A plain YAML number (not a string) in a case file is SI by contract; that is handled by
//!   `case::QuantityText::Number`, not here.
//! - Unit symbols are matched without regard to case (`"mpa"` is MPa: milli-pascal is not a
//!   unit anyone uses for a web, so there is no ambiguity among the accepted symbols).
//!
//! Conversion factors are the exact or rounded values of NIST Special Publication 811 (2008),
//! Appendix B (the tests check each against it).

/// The physical kind a field expects; decides which units are accepted.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum QuantityKind {
    /// m, mm, µm/um, in, mil, ft
    Length,
    /// N/m, kN/m, pli (lbf/in)
    ForcePerWidth,
    /// Pa, kPa, MPa, GPa, psi, ksi
    Stress,
    /// m/s, m/min, fpm, ft/min
    Speed,
    /// N, kN, lbf
    Force,
    /// N·m, lbf·ft, lbf·in
    Torque,
    /// °C, K, °F
    Temperature,
    /// %, or a plain fraction
    Percent,
    /// kg, g, t, lb (a roll's weight)
    Mass,
    /// g/m² (gsm), kg/m², lb/3000 ft², lb/3300 ft² (basis weight, grammage)
    BasisWeight,
}

impl QuantityKind {
    /// Every kind, in a stable order.
    pub const ALL: [QuantityKind; 10] = [
        QuantityKind::Length,
        QuantityKind::ForcePerWidth,
        QuantityKind::Stress,
        QuantityKind::Speed,
        QuantityKind::Force,
        QuantityKind::Torque,
        QuantityKind::Temperature,
        QuantityKind::Percent,
        QuantityKind::Mass,
        QuantityKind::BasisWeight,
    ];

    /// Plain-words name used in messages ("a length", "a stress or pressure").
    pub fn name(self) -> &'static str {
        match self {
            QuantityKind::Length => "length",
            QuantityKind::ForcePerWidth => "force per width (tension, nip load)",
            QuantityKind::Stress => "stress or pressure",
            QuantityKind::Speed => "speed",
            QuantityKind::Force => "force",
            QuantityKind::Torque => "torque",
            QuantityKind::Temperature => "temperature",
            QuantityKind::Percent => "percentage",
            QuantityKind::Mass => "weight (mass)",
            QuantityKind::BasisWeight => "basis weight (mass per area)",
        }
    }

    /// The unit symbols accepted for this kind, for messages and help text.
    pub fn accepted(self) -> &'static str {
        match self {
            QuantityKind::Length => "m, cm, mm, um (µm), in, mil, ft",
            QuantityKind::ForcePerWidth => "N/m, N/mm, kN/m, pli (lbf/in)",
            QuantityKind::Stress => "Pa, kPa, MPa, GPa, N/mm2, bar, psi, ksi",
            QuantityKind::Speed => "m/s, m/min, fpm (ft/min), ft/s",
            QuantityKind::Force => "N, kN, lbf",
            QuantityKind::Torque => "N·m (N m, Nm), kN·m, lbf·ft, lbf·in",
            QuantityKind::Temperature => "°C (C, degC), K, °F (F, degF)",
            QuantityKind::Percent => "% (or a plain fraction such as 0.25)",
            QuantityKind::Mass => "kg, g, t, lb",
            QuantityKind::BasisWeight => "g/m2 (gsm), kg/m2, lb/3000 ft2, lb/3300 ft2",
        }
    }
}

/// Which unit system to print in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum UnitSystem {
    #[default]
    Si,
    Us,
}

#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum UnitError {
    #[error("{field}: \"{given}\" has no unit; accepted: {accepted}")]
    MissingUnit {
        field: String,
        given: String,
        accepted: String,
    },
    #[error("{field}: unknown unit \"{unit}\" in \"{given}\"; accepted: {accepted}")]
    UnknownUnit {
        field: String,
        given: String,
        unit: String,
        accepted: String,
    },
    #[error("{field}: \"{given}\" is a {found}, but a {expected} is needed; accepted: {accepted}")]
    WrongKind {
        field: String,
        given: String,
        found: String,
        expected: String,
        accepted: String,
    },
    #[error("{field}: \"{given}\" is not a number with a unit; accepted: {accepted}")]
    NotANumber {
        field: String,
        given: String,
        accepted: String,
    },
    /// A comma that may be a decimal comma or a thousands separator ("1,500").
    #[error(
        "{field}: \"{given}\" is ambiguous: the comma may be a decimal comma or a thousands separator; write {as_decimal} or {as_thousands}"
    )]
    AmbiguousComma {
        field: String,
        given: String,
        as_decimal: String,
        as_thousands: String,
    },
}

impl UnitError {
    /// The field the error is about, as the caller named it.
    pub fn field(&self) -> &str {
        match self {
            UnitError::MissingUnit { field, .. }
            | UnitError::UnknownUnit { field, .. }
            | UnitError::WrongKind { field, .. }
            | UnitError::NotANumber { field, .. }
            | UnitError::AmbiguousComma { field, .. } => field,
        }
    }
}

// NIST SP 811 (2008), Appendix B.8/B.9 factors.
/// 1 in = 0.0254 m exactly.
pub const METRES_PER_INCH: f64 = 0.0254;
/// 1 ft = 0.3048 m exactly.
pub const METRES_PER_FOOT: f64 = 0.3048;
/// 1 mil = 0.001 in = 2.54e-5 m exactly.
pub const METRES_PER_MIL: f64 = 2.54e-5;
/// 1 lbf = 4.448 221 615 260 5 N (standard gravity times the avoirdupois pound, exact).
pub const NEWTONS_PER_POUND_FORCE: f64 = 4.448_221_615_260_5;
/// 1 pli = 1 lbf/in.
pub const NEWTONS_PER_METRE_PER_PLI: f64 = NEWTONS_PER_POUND_FORCE / METRES_PER_INCH;
/// 1 psi = 1 lbf/in².
pub const PASCALS_PER_PSI: f64 = NEWTONS_PER_POUND_FORCE / (METRES_PER_INCH * METRES_PER_INCH);
/// 1 ft/min = 0.00508 m/s exactly.
pub const METRES_PER_SECOND_PER_FPM: f64 = METRES_PER_FOOT / 60.0;
/// Avoirdupois pound, exact (NIST SP 811, Appendix B).
pub const KILOGRAMS_PER_POUND: f64 = 0.453_592_37;
/// One pound per 3000 ft² and per 3300 ft² (the paper trade's reams), in kg/m²:
/// 0.45359237 kg / (3000 or 3300 × 0.09290304 m²), the foot exact (NIST SP 811).
pub const KG_PER_M2_PER_LB_3000: f64 =
    KILOGRAMS_PER_POUND / (3000.0 * METRES_PER_FOOT * METRES_PER_FOOT);
pub const KG_PER_M2_PER_LB_3300: f64 =
    KILOGRAMS_PER_POUND / (3300.0 * METRES_PER_FOOT * METRES_PER_FOOT);

/// How a unit maps to the internal value: `internal = given · factor + offset`.
struct Unit {
    symbols: &'static [&'static str],
    kind: QuantityKind,
    factor: f64,
    offset: f64,
}

const fn unit(symbols: &'static [&'static str], kind: QuantityKind, factor: f64) -> Unit {
    Unit {
        symbols,
        kind,
        factor,
        offset: 0.0,
    }
}

/// Every accepted unit. Symbols are compared after lower-casing and removing spaces, `·`, `*`,
/// `-` between the factors of a product unit (so "N·m", "N m", "N-m" and "Nm" are one unit).
const UNITS: &[Unit] = &[
    // Length
    unit(
        &["m", "metre", "metres", "meter", "meters"],
        QuantityKind::Length,
        1.0,
    ),
    unit(&["cm"], QuantityKind::Length, 0.01),
    unit(&["mm"], QuantityKind::Length, 0.001),
    unit(
        &["um", "µm", "μm", "micron", "microns"],
        QuantityKind::Length,
        1e-6,
    ),
    unit(&["nm"], QuantityKind::Length, 1e-9),
    unit(
        &["in", "inch", "inches", "\""],
        QuantityKind::Length,
        METRES_PER_INCH,
    ),
    unit(
        &["mil", "mils", "thou"],
        QuantityKind::Length,
        METRES_PER_MIL,
    ),
    unit(
        &["ft", "foot", "feet", "'"],
        QuantityKind::Length,
        METRES_PER_FOOT,
    ),
    // Force per width
    unit(&["n/m"], QuantityKind::ForcePerWidth, 1.0),
    unit(&["n/mm"], QuantityKind::ForcePerWidth, 1000.0),
    unit(&["n/cm"], QuantityKind::ForcePerWidth, 100.0),
    unit(&["kn/m"], QuantityKind::ForcePerWidth, 1000.0),
    // The case file's own limits are stated in MN/m (web strength at most 10 MN/m). Symbols
    // are matched without case, so `parse_quantity` refuses the millinewton spelling "mN/m"
    // rather than read it as a million times too large.
    unit(&["mn/m"], QuantityKind::ForcePerWidth, 1e6),
    unit(
        &["pli", "lbf/in", "lb/in", "lbs/in"],
        QuantityKind::ForcePerWidth,
        NEWTONS_PER_METRE_PER_PLI,
    ),
    // Stress and pressure
    unit(&["pa", "n/m2", "n/m²"], QuantityKind::Stress, 1.0),
    unit(&["kpa"], QuantityKind::Stress, 1e3),
    unit(&["mpa", "n/mm2", "n/mm²"], QuantityKind::Stress, 1e6),
    unit(&["gpa"], QuantityKind::Stress, 1e9),
    // NIST SP 811 B.8: 1 bar = 1e5 Pa exactly.
    unit(&["bar"], QuantityKind::Stress, 1e5),
    unit(
        &["psi", "lbf/in2", "lbf/in²"],
        QuantityKind::Stress,
        PASCALS_PER_PSI,
    ),
    unit(&["ksi"], QuantityKind::Stress, 1e3 * PASCALS_PER_PSI),
    // Speed
    unit(&["m/s"], QuantityKind::Speed, 1.0),
    unit(&["m/min", "mpm"], QuantityKind::Speed, 1.0 / 60.0),
    unit(
        &["fpm", "ft/min", "feet/min"],
        QuantityKind::Speed,
        METRES_PER_SECOND_PER_FPM,
    ),
    unit(&["ft/s", "fps"], QuantityKind::Speed, METRES_PER_FOOT),
    // Force
    unit(&["n", "newton", "newtons"], QuantityKind::Force, 1.0),
    unit(&["kn"], QuantityKind::Force, 1e3),
    unit(&["lbf"], QuantityKind::Force, NEWTONS_PER_POUND_FORCE),
    // Torque (the product symbols lose their separators before matching)
    unit(&["nm"], QuantityKind::Torque, 1.0),
    unit(&["knm"], QuantityKind::Torque, 1e3),
    unit(
        &["lbfft", "ftlbf", "lbft", "ftlb"],
        QuantityKind::Torque,
        NEWTONS_PER_POUND_FORCE * METRES_PER_FOOT,
    ),
    unit(
        &["lbfin", "inlbf", "lbin", "inlb"],
        QuantityKind::Torque,
        NEWTONS_PER_POUND_FORCE * METRES_PER_INCH,
    ),
    // Temperature, returned in °C.
    unit(
        &["°c", "ºc", "c", "degc", "celsius"],
        QuantityKind::Temperature,
        1.0,
    ),
    Unit {
        symbols: &["k", "kelvin"],
        kind: QuantityKind::Temperature,
        factor: 1.0,
        offset: -273.15,
    },
    // NIST SP 811 B.9: t/°C = (t/°F − 32)/1.8
    Unit {
        symbols: &["°f", "ºf", "f", "degf", "fahrenheit"],
        kind: QuantityKind::Temperature,
        factor: 1.0 / 1.8,
        offset: -32.0 / 1.8,
    },
    // Percent, returned as a fraction.
    unit(&["%", "percent", "pct"], QuantityKind::Percent, 0.01),
    unit(&["kg", "kilogram", "kilograms"], QuantityKind::Mass, 1.0),
    unit(&["g", "gram", "grams"], QuantityKind::Mass, 1e-3),
    unit(&["t", "tonne", "tonnes"], QuantityKind::Mass, 1e3),
    unit(
        &["lb", "lbs", "pound", "pounds"],
        QuantityKind::Mass,
        KILOGRAMS_PER_POUND,
    ),
    unit(&["g/m2", "g/m²", "gsm"], QuantityKind::BasisWeight, 1e-3),
    unit(&["kg/m2", "kg/m²"], QuantityKind::BasisWeight, 1.0),
    unit(
        &["lb/3000ft2", "lb/3000ft²"],
        QuantityKind::BasisWeight,
        KG_PER_M2_PER_LB_3000,
    ),
    unit(
        &["lb/3300ft2", "lb/3300ft²"],
        QuantityKind::BasisWeight,
        KG_PER_M2_PER_LB_3300,
    ),
];

/// Normalise a unit symbol for lookup: lower case, no spaces or product separators.
/// "nm" is both nanometre (length) and newton-metre (torque); the lookup prefers the unit of the
/// kind the field expects, so "12 nm" is a torque in a torque field and a length elsewhere.
fn normalise_unit(unit: &str) -> String {
    unit.trim()
        .to_lowercase()
        .chars()
        .filter(|c| !matches!(c, ' ' | '·' | '⋅' | '*' | '-' | '\u{a0}' | '.'))
        .collect()
}

fn find_unit(symbol: &str, expected: QuantityKind) -> Option<&'static Unit> {
    let matches = |u: &&Unit| u.symbols.iter().any(|s| normalise_unit(s) == symbol);
    UNITS
        .iter()
        .filter(|u| u.kind == expected)
        .find(matches)
        .or_else(|| UNITS.iter().find(matches))
}

/// First symbols of the US customary units in [`UNITS`].
const US_UNITS: &[&str] = &[
    "in",
    "mil",
    "ft",
    "pli",
    "psi",
    "ksi",
    "fpm",
    "ft/s",
    "lbf",
    "lbfft",
    "lbfin",
    "°f",
    "lb",
    "lb/3000ft2",
    "lb/3300ft2",
];

/// The unit system most of `texts` are typed in ("39.8 in" and "35000 ft" are US, "1012 mm"
/// SI); `None` when none of them is a number with a unit. A tie reads as SI. Percentages and
/// bare numbers count for neither.
pub fn typed_system<'a>(texts: impl IntoIterator<Item = &'a str>) -> Option<UnitSystem> {
    let (mut si, mut us) = (0usize, 0usize);
    for text in texts {
        let Some((_, symbol)) = split_number(text.trim()) else {
            continue;
        };
        let symbol = normalise_unit(symbol);
        let Some(unit) = UNITS
            .iter()
            .find(|u| u.symbols.iter().any(|s| normalise_unit(s) == symbol))
        else {
            continue;
        };
        if unit.kind == QuantityKind::Percent {
            continue;
        }
        if US_UNITS.contains(&unit.symbols[0]) {
            us += 1;
        } else {
            si += 1;
        }
    }
    match (si, us) {
        (0, 0) => None,
        (si, us) if us > si => Some(UnitSystem::Us),
        _ => Some(UnitSystem::Si),
    }
}

/// `value` (internal units of `kind`) written in the unit of `typed`, the text a user typed
/// for the same field ("3.5 pli" → "4.025 pli"), with the fewest digits that parse back to
/// exactly `value` (or, where none does, to within one part in 10¹²); `None` when `typed` has
/// no unit of that kind.
/// Keeps a changed value in the unit the user chose when a case file is saved.
pub fn in_typed_unit(value: f64, typed: &str, kind: QuantityKind) -> Option<String> {
    if !value.is_finite() {
        return None;
    }
    let (_, unit_text) = split_number(typed.trim())?;
    let unit = find_unit(&normalise_unit(unit_text), kind).filter(|u| u.kind == kind)?;
    let number = (value - unit.offset) / unit.factor;
    // The typed separator and symbol as written ("3.5 pli", "76um", "80 %"). A product with
    // the unit's factor cannot reach every binary number, so when no text parses back to
    // exactly `value`, the shortest within one part in 10¹² (far below any measurement) does.
    let close = |exact: bool| {
        (1..=17).find_map(|digits| {
            let text = format!("{}{unit_text}", shortest(number, digits));
            let back = parse_quantity("", &text, kind).ok()?;
            let near = (back - value).abs() <= 1e-12 * value.abs();
            (back == value || (!exact && near)).then_some(text)
        })
    };
    close(true).or_else(|| close(false))
}

/// `value` rounded to `digits` significant digits, written without trailing zeros or an
/// exponent ("4.025", "0.0012", "120").
fn shortest(value: f64, digits: usize) -> String {
    let text = format!("{value:.prec$e}", prec = digits - 1);
    // Display of an f64 never uses an exponent and gives the shortest digits of the rounded
    // value.
    let rounded: f64 = text.parse().unwrap_or(value);
    format!("{rounded}")
}

/// Split "12.5e-3 mm" into its number text and unit text. `None` when it does not start with a
/// plain decimal number (no "inf", "NaN", hex or thousands separators).
fn split_number(text: &str) -> Option<(&str, &str)> {
    let bytes = text.as_bytes();
    let mut i = 0;
    if i < bytes.len() && (bytes[i] == b'+' || bytes[i] == b'-') {
        i += 1;
    }
    let digits_start = i;
    while i < bytes.len() && bytes[i].is_ascii_digit() {
        i += 1;
    }
    let mut digits = i - digits_start;
    if i < bytes.len() && bytes[i] == b'.' {
        i += 1;
        let fraction_start = i;
        while i < bytes.len() && bytes[i].is_ascii_digit() {
            i += 1;
        }
        digits += i - fraction_start;
    }
    if digits == 0 {
        return None;
    }
    // An exponent only when followed by digits, so "5 e" stays a (bad) unit.
    if i < bytes.len() && (bytes[i] == b'e' || bytes[i] == b'E') {
        let mut j = i + 1;
        if j < bytes.len() && (bytes[j] == b'+' || bytes[j] == b'-') {
            j += 1;
        }
        let exponent_start = j;
        while j < bytes.len() && bytes[j].is_ascii_digit() {
            j += 1;
        }
        if j > exponent_start {
            i = j;
        }
    }
    Some((&text[..i], &text[i..]))
}

/// A number written with a decimal comma ("0,5 pli", as spreadsheets and many countries write
/// it) with the comma turned into a point; the text unchanged when its number has no comma.
/// Unambiguous only with one comma, no point and not exactly three digits after the comma:
/// "1,500" may be 1.5 or 1500 and is refused, except after a leading zero ("0,500"), which no
/// thousands separator follows. Several commas (thousands groups) are not a number.
fn decimal_comma(field: &str, text: &str, trimmed: &str) -> Result<String, UnitError> {
    let end = trimmed
        .find(|c: char| !(c.is_ascii_digit() || matches!(c, ',' | '.' | '+' | '-')))
        .unwrap_or(trimmed.len());
    let number = &trimmed[..end];
    if !number.contains(',') {
        return Ok(trimmed.to_string());
    }
    let (before, after) = number.split_once(',').unwrap_or((number, ""));
    let digits = before.trim_start_matches(['+', '-']);
    let plain = |s: &str| !s.is_empty() && s.bytes().all(|b| b.is_ascii_digit());
    if !plain(digits) || !plain(after) {
        return Err(UnitError::NotANumber {
            field: field.to_string(),
            given: text.to_string(),
            accepted: "a number with a decimal point or one decimal comma (\"0.5\" or \"0,5\"), no thousands separators, then its unit".to_string(),
        });
    }
    if after.len() == 3 && !digits.trim_start_matches('0').is_empty() {
        let unit = &trimmed[end..];
        return Err(UnitError::AmbiguousComma {
            field: field.to_string(),
            given: text.to_string(),
            as_decimal: format!("\"{before}.{after}{unit}\""),
            as_thousands: format!("\"{before}{after}{unit}\""),
        });
    }
    Ok(format!("{before}.{after}{}", &trimmed[end..]))
}

/// Parse `text` as a quantity of `kind` for the field `field`; returns the SI value (°C for
/// temperature, a fraction for percent; see the module docs). A decimal comma is read where it
/// is unambiguous ("0,5 pli"; see `decimal_comma`).
pub fn parse_quantity(field: &str, text: &str, kind: QuantityKind) -> Result<f64, UnitError> {
    let owned;
    let trimmed = if text.contains(',') {
        owned = decimal_comma(field, text, text.trim())?;
        owned.as_str()
    } else {
        text.trim()
    };
    let not_a_number = || UnitError::NotANumber {
        field: field.to_string(),
        given: text.to_string(),
        accepted: kind.accepted().to_string(),
    };
    let (number_text, unit_text) = split_number(trimmed).ok_or_else(not_a_number)?;
    let number: f64 = number_text.parse().map_err(|_| not_a_number())?;
    if !number.is_finite() {
        return Err(not_a_number());
    }
    let symbol = normalise_unit(unit_text);
    if unit_text.trim_start().starts_with("mN") || unit_text.trim_start().starts_with("mn") {
        // Millinewtons: no winding quantity is that small, and "mn/m" is MN/m to the lookup.
        return Err(UnitError::UnknownUnit {
            field: field.to_string(),
            given: text.to_string(),
            unit: unit_text.trim().to_string(),
            accepted: kind.accepted().to_string(),
        });
    }
    if symbol.is_empty() {
        return match kind {
            QuantityKind::Percent => Ok(number),
            QuantityKind::Temperature => Err(UnitError::MissingUnit {
                field: field.to_string(),
                given: text.to_string(),
                accepted: kind.accepted().to_string(),
            }),
            _ if number == 0.0 => Ok(0.0),
            _ => Err(UnitError::MissingUnit {
                field: field.to_string(),
                given: text.to_string(),
                accepted: kind.accepted().to_string(),
            }),
        };
    }
    let Some(found) = find_unit(&symbol, kind) else {
        return Err(UnitError::UnknownUnit {
            field: field.to_string(),
            given: text.to_string(),
            unit: unit_text.trim().to_string(),
            accepted: kind.accepted().to_string(),
        });
    };
    if found.kind != kind {
        return Err(UnitError::WrongKind {
            field: field.to_string(),
            given: text.to_string(),
            found: found.kind.name().to_string(),
            expected: kind.name().to_string(),
            accepted: kind.accepted().to_string(),
        });
    }
    let value = number * found.factor + found.offset;
    if !value.is_finite() {
        return Err(not_a_number());
    }
    Ok(value)
}

/// Round to four significant digits and drop trailing zeros: 0.0760 → "0.076", 1234.5 → "1235".
fn format_number(value: f64) -> String {
    if value == 0.0 || !value.is_finite() {
        return format!("{}", if value == 0.0 { 0.0 } else { value });
    }
    let magnitude = value.abs().log10().floor() as i32;
    if !(-4..=9).contains(&magnitude) {
        // Far from the usual sizes: scientific notation keeps four significant digits.
        let text = format!("{value:.3e}");
        let (mantissa, exponent) = text.split_once('e').unwrap_or((&text, "0"));
        let mantissa = mantissa.trim_end_matches('0').trim_end_matches('.');
        return format!("{mantissa}e{exponent}");
    }
    let decimals = (3 - magnitude).max(0) as usize;
    let mut text = format!("{value:.decimals$}");
    if text.contains('.') {
        while text.ends_with('0') {
            text.pop();
        }
        if text.ends_with('.') {
            text.pop();
        }
    }
    if text == "-0" {
        text = "0".into();
    }
    text
}

/// Pick the display unit for `value` (internal units) and return (scaled value, symbol).
fn display_unit(value: f64, kind: QuantityKind, system: UnitSystem) -> (f64, &'static str) {
    let size = value.abs();
    match (kind, system) {
        (QuantityKind::Length, UnitSystem::Si) => {
            if size == 0.0 || size >= 1.0 {
                (value, "m")
            } else if size >= 1e-3 {
                (value * 1e3, "mm")
            } else {
                (value * 1e6, "µm")
            }
        }
        (QuantityKind::Length, UnitSystem::Us) => {
            // Caliper in mil, everything else (cores, roll diameters, widths) in inches.
            if size != 0.0 && size < 0.1 * METRES_PER_INCH {
                (value / METRES_PER_MIL, "mil")
            } else {
                (value / METRES_PER_INCH, "in")
            }
        }
        (QuantityKind::ForcePerWidth, UnitSystem::Si) => {
            if size >= 1e4 {
                (value / 1e3, "kN/m")
            } else {
                (value, "N/m")
            }
        }
        (QuantityKind::ForcePerWidth, UnitSystem::Us) => (value / NEWTONS_PER_METRE_PER_PLI, "pli"),
        (QuantityKind::Stress, UnitSystem::Si) => {
            if size >= 1e9 {
                (value / 1e9, "GPa")
            } else if size >= 1e6 {
                (value / 1e6, "MPa")
            } else if size >= 1e3 {
                (value / 1e3, "kPa")
            } else {
                (value, "Pa")
            }
        }
        (QuantityKind::Stress, UnitSystem::Us) => {
            if size >= 1e4 * PASCALS_PER_PSI {
                (value / (1e3 * PASCALS_PER_PSI), "ksi")
            } else {
                (value / PASCALS_PER_PSI, "psi")
            }
        }
        // Winders read line speed per minute in both systems.
        (QuantityKind::Speed, UnitSystem::Si) => (value * 60.0, "m/min"),
        (QuantityKind::Speed, UnitSystem::Us) => (value / METRES_PER_SECOND_PER_FPM, "fpm"),
        (QuantityKind::Force, UnitSystem::Si) => {
            if size >= 1e4 {
                (value / 1e3, "kN")
            } else {
                (value, "N")
            }
        }
        (QuantityKind::Force, UnitSystem::Us) => (value / NEWTONS_PER_POUND_FORCE, "lbf"),
        (QuantityKind::Torque, UnitSystem::Si) => (value, "N·m"),
        (QuantityKind::Torque, UnitSystem::Us) => (
            value / (NEWTONS_PER_POUND_FORCE * METRES_PER_FOOT),
            "lbf·ft",
        ),
        (QuantityKind::Temperature, UnitSystem::Si) => (value, "°C"),
        (QuantityKind::Temperature, UnitSystem::Us) => (value * 1.8 + 32.0, "°F"),
        (QuantityKind::Percent, _) => (value * 100.0, "%"),
        (QuantityKind::Mass, UnitSystem::Si) => {
            if size == 0.0 || size >= 1.0 {
                (value, "kg")
            } else {
                (value * 1e3, "g")
            }
        }
        (QuantityKind::Mass, UnitSystem::Us) => (value / KILOGRAMS_PER_POUND, "lb"),
        (QuantityKind::BasisWeight, UnitSystem::Si) => (value * 1e3, "g/m²"),
        (QuantityKind::BasisWeight, UnitSystem::Us) => {
            (value / KG_PER_M2_PER_LB_3000, "lb/3000 ft²")
        }
    }
}

/// Format an internal value of `kind` (SI; °C for temperature; a fraction for percent) in
/// `system` with four significant digits and its unit. The text parses back with
/// [`parse_quantity`].
pub fn format_quantity(value: f64, kind: QuantityKind, system: UnitSystem) -> String {
    let (scaled, symbol) = display_unit(value, kind, system);
    format!("{} {symbol}", format_number(scaled))
}

/// Round to `digits` significant digits so JSON and snapshots do not carry float noise.
pub fn round_sig(value: f64, digits: i32) -> f64 {
    if value == 0.0 || !value.is_finite() {
        return value;
    }
    let magnitude = value.abs().log10().floor() as i32;
    let scale = 10f64.powi(digits - 1 - magnitude);
    (value * scale).round() / scale
}

/// Three significant figures without trailing zeros ("412345", "1.25", "-0.5"): the compact
/// numbers of plot axes, tables and taper amounts.
pub fn sig3(value: f64) -> String {
    if value == 0.0 || !value.is_finite() {
        return format!("{}", if value.is_finite() { 0.0 } else { value });
    }
    let digits = (2 - value.abs().log10().floor() as i32).clamp(0, 6) as usize;
    let text = format!("{value:.digits$}");
    if text.contains('.') {
        text.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        text
    }
}

/// A stress in compact form for plot axes and tables: "412 kPa", "1.25 MPa", "59.8 psi".
pub fn compact_stress(value: f64, units: UnitSystem) -> String {
    match units {
        UnitSystem::Si => {
            let a = value.abs();
            if a >= 1e6 {
                format!("{} MPa", sig3(value / 1e6))
            } else if a >= 1e3 {
                format!("{} kPa", sig3(value / 1e3))
            } else {
                format!("{} Pa", sig3(value))
            }
        }
        UnitSystem::Us => {
            let psi = value / 6_894.757_293_168;
            if psi.abs() >= 1e3 {
                format!("{} ksi", sig3(psi / 1e3))
            } else {
                format!("{} psi", sig3(psi))
            }
        }
    }
}

/// A radius in compact form: "48 mm" or "1.9 in".
pub fn compact_length(value: f64, units: UnitSystem) -> String {
    match units {
        UnitSystem::Si => format!("{} mm", sig3(value * 1e3)),
        UnitSystem::Us => format!("{} in", sig3(value / 0.0254)),
    }
}

/// A run length of web in whole units: "10700 m" or "35105 ft" (winders count footage in feet).
pub fn web_length(value: f64, units: UnitSystem) -> String {
    match units {
        UnitSystem::Si => format!("{value:.0} m"),
        UnitSystem::Us => format!("{:.0} ft", value / METRES_PER_FOOT),
    }
}

/// The no-break space that joins a number to its unit in text meant to be word-wrapped.
pub const NO_BREAK: char = '\u{a0}';

/// `text` with each plain space between a number and a unit symbol ("2.6 pli", "495 kPa",
/// "80 %", "150 m/min") made a no-break space, so word wrapping (the terminal UI, browsers)
/// never puts the unit on the next line. The one place that knows which words are units: the
/// symbols [`parse_quantity`] accepts, and "%". Text without such a pair comes back borrowed.
/// Only for display: files, JSON and CSV keep plain spaces (the parser reads both).
pub fn keep_with_unit(text: &str) -> std::borrow::Cow<'_, str> {
    let mut joins = Vec::new();
    let mut previous = None;
    for (at, c) in text.char_indices() {
        if c == ' ' && previous.is_some_and(|p: char| p.is_ascii_digit()) {
            let rest = &text[at + 1..];
            let word = rest.split(char::is_whitespace).next().unwrap_or("");
            // A unit may end a clause: "10 %;", "2.6 pli)", "495 kPa.".
            let word = word.trim_end_matches([',', ';', ':', ')', ']', '.', '!', '?']);
            if !word.is_empty() && is_unit_symbol(word) {
                joins.push(at);
            }
        }
        previous = Some(c);
    }
    if joins.is_empty() {
        return std::borrow::Cow::Borrowed(text);
    }
    let mut out = String::with_capacity(text.len() + joins.len());
    let mut from = 0;
    for at in joins {
        out.push_str(&text[from..at]);
        out.push(NO_BREAK);
        from = at + 1;
    }
    out.push_str(&text[from..]);
    std::borrow::Cow::Owned(out)
}

/// Whether `word` is a unit symbol as printed or accepted ("kPa", "m/min", "%", "µm").
fn is_unit_symbol(word: &str) -> bool {
    let key = word.to_lowercase();
    UNITS.iter().any(|u| u.symbols.contains(&key.as_str()))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn splits_numbers_and_units() {
        assert_eq!(split_number("12.5e-3 mm"), Some(("12.5e-3", " mm")));
        assert_eq!(split_number(".5in"), Some((".5", "in")));
        assert_eq!(split_number("5 e"), Some(("5", " e")));
        assert_eq!(split_number("inf m"), None);
        assert_eq!(split_number("-.e3"), None);
    }

    #[test]
    fn nm_is_torque_in_a_torque_field_and_length_elsewhere() {
        let torque = parse_quantity("t", "12 Nm", QuantityKind::Torque).unwrap();
        assert_eq!(torque, 12.0);
        let length = parse_quantity("l", "12 nm", QuantityKind::Length).unwrap();
        assert!((length - 12e-9).abs() < 1e-20);
    }

    #[test]
    fn format_trims_to_four_digits() {
        assert_eq!(format_number(0.076), "0.076");
        assert_eq!(format_number(1234.56), "1235");
        assert_eq!(format_number(-0.0001234567), "-0.0001235");
        assert_eq!(format_number(-0.00001234567), "-1.235e-5");
        assert_eq!(format_number(2.0e12), "2e12");
        assert_eq!(format_number(0.0), "0");
    }

    #[test]
    fn numbers_keep_their_units() {
        let text = "raise 2.6 pli to 3 pli (495 kPa, 80 %; 150 m/min) in 2 steps";
        let joined = keep_with_unit(text);
        assert_eq!(
            joined,
            "raise 2.6\u{a0}pli to 3\u{a0}pli (495\u{a0}kPa, 80\u{a0}%; 150\u{a0}m/min) in 2 steps"
        );
        assert!(matches!(
            keep_with_unit("no numbers here"),
            std::borrow::Cow::Borrowed(_)
        ));
        // Text copied from a screen parses like typed text.
        let copied = format!("2.6{NO_BREAK}pli");
        let value = parse_quantity("t", &copied, QuantityKind::ForcePerWidth).unwrap();
        assert!((value - 2.6 * NEWTONS_PER_METRE_PER_PLI).abs() < 1e-9);
    }

    #[test]
    fn compact_numbers() {
        assert_eq!(sig3(412_345.0), "412345");
        assert_eq!(sig3(1.2504), "1.25");
        assert_eq!(sig3(-0.5), "-0.5");
        assert_eq!(compact_stress(412_345.0, UnitSystem::Si), "412 kPa");
        assert_eq!(compact_stress(-1_250_000.0, UnitSystem::Si), "-1.25 MPa");
        // 1 psi = 6894.757 Pa (NIST SP 811, appendix B).
        assert_eq!(compact_stress(6_894.757, UnitSystem::Us), "1 psi");
        // 1 in = 25.4 mm exactly (NIST SP 811, appendix B).
        assert_eq!(compact_length(0.0508, UnitSystem::Us), "2 in");
    }

    #[test]
    fn typed_system_follows_the_units_typed() {
        let us = ["39.8 in", "35000 ft", "1150 lb", "0.5 %"];
        assert_eq!(typed_system(us), Some(UnitSystem::Us));
        let si = ["1012 mm", "10700 m", "520 kg", "2 %"];
        assert_eq!(typed_system(si), Some(UnitSystem::Si));
        // Mixed: the majority; a tie is SI. Percentages and bare numbers count for neither.
        assert_eq!(
            typed_system(["40 in", "12 ft", "300 mm"]),
            Some(UnitSystem::Us)
        );
        assert_eq!(typed_system(["40 in", "300 mm"]), Some(UnitSystem::Si));
        assert_eq!(typed_system(["2 %", "52", "PM3 reel"]), None);
    }

    #[test]
    fn web_length_in_metres_or_feet() {
        assert_eq!(web_length(10_700.0, UnitSystem::Si), "10700 m");
        // 1 ft = 0.3048 m exactly (NIST SP 811, appendix B): 3048 m is 10000 ft.
        assert_eq!(web_length(3_048.0, UnitSystem::Us), "10000 ft");
    }
}
