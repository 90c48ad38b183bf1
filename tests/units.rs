//! Unit parsing and printing. Conversion factors are checked against NIST Special Publication
//! 811 (2008 edition), "Guide for the Use of the International System of Units (SI)",
//! Appendix B.8 (factors for units listed alphabetically) and B.9 (by kind of quantity).

use approx::assert_relative_eq;
use proptest::prelude::*;
use rolltriage::units::{QuantityKind, UnitError, UnitSystem, format_quantity, parse_quantity};

fn si(text: &str, kind: QuantityKind) -> f64 {
    parse_quantity("test.field", text, kind).unwrap()
}

// --- NIST SP 811 Appendix B checks -------------------------------------------------------

#[test]
fn nist_inch_is_25_4_mm_exactly() {
    // NIST SP 811 B.8: inch (in) → metre (m), 2.54 E−02 (exact).
    assert_eq!(si("1 in", QuantityKind::Length), 0.0254);
    assert_relative_eq!(
        si("1 in", QuantityKind::Length),
        si("25.4 mm", QuantityKind::Length)
    );
}

#[test]
fn nist_foot_is_0_3048_m_exactly() {
    // NIST SP 811 B.8: foot (ft) → metre (m), 3.048 E−01 (exact).
    assert_eq!(si("1 ft", QuantityKind::Length), 0.3048);
}

#[test]
fn nist_mil_is_25_4_um() {
    // NIST SP 811 B.8: mil (0.001 in) → metre (m), 2.54 E−05 (exact).
    assert_relative_eq!(
        si("1 mil", QuantityKind::Length),
        25.4e-6,
        max_relative = 1e-15
    );
    assert_relative_eq!(
        si("1 mil", QuantityKind::Length),
        si("25.4 um", QuantityKind::Length),
        max_relative = 1e-15
    );
    assert_relative_eq!(
        si("1 mil", QuantityKind::Length),
        si("25.4 µm", QuantityKind::Length),
        max_relative = 1e-15
    );
}

#[test]
fn nist_pound_force_is_4_4482216152605_n() {
    // NIST SP 811 B.8: pound-force (lbf) → newton (N), 4.448 222 E+00; the exact value is
    // 0.45359237 kg × 9.80665 m/s² = 4.4482216152605 N.
    assert_relative_eq!(
        si("1 lbf", QuantityKind::Force),
        4.4482216152605,
        max_relative = 1e-15
    );
    assert_relative_eq!(si("2 kN", QuantityKind::Force), 2000.0);
}

#[test]
fn nist_pli_is_175_1268_n_per_m() {
    // NIST SP 811 B.8: pound-force per inch (lbf/in) → newton per metre (N/m), 1.751 268 E+02.
    let pli = si("1 pli", QuantityKind::ForcePerWidth);
    assert_relative_eq!(pli, 175.1268, max_relative = 1e-6);
    assert_relative_eq!(pli, 4.4482216152605 / 0.0254, max_relative = 1e-15);
    assert_relative_eq!(si("1 lbf/in", QuantityKind::ForcePerWidth), pli);
    assert_relative_eq!(si("2.5 kN/m", QuantityKind::ForcePerWidth), 2500.0);
    assert_relative_eq!(si("350 N/m", QuantityKind::ForcePerWidth), 350.0);
}

#[test]
fn mega_newton_per_metre_is_accepted_and_milli_is_refused() {
    // NIST SP 811 section 4 (SI prefixes): mega = 1E+06. The case-format limits are given in
    // MN/m, so the unit named there must parse; "mN/m" (milli) must not be read as mega.
    assert_relative_eq!(si("10 MN/m", QuantityKind::ForcePerWidth), 1.0e7);
    assert_relative_eq!(si("0.002 MN/m", QuantityKind::ForcePerWidth), 2000.0);
    assert!(parse_quantity("web.strength", "300 mN/m", QuantityKind::ForcePerWidth).is_err());
    assert!(parse_quantity("web.strength", "300 mn/m", QuantityKind::ForcePerWidth).is_err());
}

#[test]
fn nist_psi_is_6894_757_pa() {
    // NIST SP 811 B.8: pound-force per square inch (psi) → pascal (Pa), 6.894 757 E+03;
    // kip per square inch (ksi) → pascal, 6.894 757 E+06.
    assert_relative_eq!(
        si("1 psi", QuantityKind::Stress),
        6894.757,
        max_relative = 1e-7
    );
    assert_relative_eq!(
        si("1 ksi", QuantityKind::Stress),
        6.894757e6,
        max_relative = 1e-7
    );
    assert_relative_eq!(si("3 kPa", QuantityKind::Stress), 3000.0);
    assert_relative_eq!(si("4.5 MPa", QuantityKind::Stress), 4.5e6);
    assert_relative_eq!(si("5 GPa", QuantityKind::Stress), 5e9);
    assert_relative_eq!(si("12 Pa", QuantityKind::Stress), 12.0);
    // NIST SP 811 B.8: bar → pascal, 1.0 E+05 (exact).
    assert_relative_eq!(si("1 bar", QuantityKind::Stress), 1e5);
}

#[test]
fn nist_foot_per_minute_is_0_00508_m_per_s() {
    // NIST SP 811 B.8: foot per minute (ft/min) → metre per second (m/s), 5.08 E−03 (exact).
    assert_relative_eq!(
        si("1 ft/min", QuantityKind::Speed),
        0.00508,
        max_relative = 1e-15
    );
    assert_relative_eq!(
        si("1 fpm", QuantityKind::Speed),
        0.00508,
        max_relative = 1e-15
    );
    assert_relative_eq!(
        si("600 m/min", QuantityKind::Speed),
        10.0,
        max_relative = 1e-15
    );
    assert_relative_eq!(si("7 m/s", QuantityKind::Speed), 7.0);
}

#[test]
fn nist_torque_factors() {
    // NIST SP 811 B.8: pound-force foot (lbf·ft) → N·m, 1.355 818 E+00;
    // pound-force inch (lbf·in) → N·m, 1.129 848 E−01.
    for text in ["1 lbf·ft", "1 lbf ft", "1 lbf*ft", "1 ft·lbf"] {
        assert_relative_eq!(
            si(text, QuantityKind::Torque),
            1.355818,
            max_relative = 1e-6
        );
    }
    assert_relative_eq!(
        si("1 lbf·in", QuantityKind::Torque),
        0.1129848,
        max_relative = 1e-6
    );
    for text in ["3 N·m", "3 N m", "3 Nm", "3 N*m"] {
        assert_relative_eq!(si(text, QuantityKind::Torque), 3.0);
    }
}

#[test]
fn nist_temperature_conversions() {
    // NIST SP 811 B.9: t/°C = T/K − 273.15; t/°C = (t/°F − 32)/1.8. Returned in °C.
    assert_relative_eq!(si("20 °C", QuantityKind::Temperature), 20.0);
    assert_relative_eq!(si("20 C", QuantityKind::Temperature), 20.0);
    assert_relative_eq!(si("20 degC", QuantityKind::Temperature), 20.0);
    assert_relative_eq!(
        si("293.15 K", QuantityKind::Temperature),
        20.0,
        epsilon = 1e-12
    );
    assert_relative_eq!(
        si("212 °F", QuantityKind::Temperature),
        100.0,
        epsilon = 1e-12
    );
    assert_relative_eq!(si("32 F", QuantityKind::Temperature), 0.0, epsilon = 1e-12);
}

#[test]
fn percent_is_a_fraction() {
    assert_relative_eq!(si("25 %", QuantityKind::Percent), 0.25);
    assert_relative_eq!(si("25%", QuantityKind::Percent), 0.25);
    // A bare number for a percentage is a fraction (documented in units.rs).
    assert_relative_eq!(si("0.25", QuantityKind::Percent), 0.25);
}

#[test]
fn unit_spelling_is_forgiving_but_exact() {
    assert_relative_eq!(
        si("76um", QuantityKind::Length),
        76e-6,
        max_relative = 1e-12
    );
    assert_relative_eq!(
        si("  3 in  ", QuantityKind::Length),
        0.0762,
        max_relative = 1e-12
    );
    assert_relative_eq!(
        si("1.2e3 mm", QuantityKind::Length),
        1.2,
        max_relative = 1e-12
    );
    assert_relative_eq!(
        si("2 PLI", QuantityKind::ForcePerWidth),
        2.0 * 175.126835,
        max_relative = 1e-6
    );
    assert_relative_eq!(si("-5 °C", QuantityKind::Temperature), -5.0);
    // Zero needs no unit (except a temperature).
    assert_eq!(si("0", QuantityKind::ForcePerWidth), 0.0);
}

// --- Errors ------------------------------------------------------------------------------

#[test]
fn bare_number_is_missing_unit() {
    let error = parse_quantity("web.thickness", "76", QuantityKind::Length).unwrap_err();
    assert!(matches!(error, UnitError::MissingUnit { .. }), "{error:?}");
    let message = error.to_string();
    assert!(message.contains("web.thickness"), "{message}");
    assert!(message.contains("mil"), "{message}");
    let error = parse_quantity("winding.temperature", "0", QuantityKind::Temperature).unwrap_err();
    assert!(matches!(error, UnitError::MissingUnit { .. }), "{error:?}");
}

#[test]
fn unknown_unit_names_the_unit() {
    let error = parse_quantity("roll.diameter", "40 furlongs", QuantityKind::Length).unwrap_err();
    match &error {
        UnitError::UnknownUnit { unit, field, .. } => {
            assert_eq!(unit, "furlongs");
            assert_eq!(field, "roll.diameter");
        }
        other => panic!("expected UnknownUnit, got {other:?}"),
    }
}

#[test]
fn wrong_kind_names_what_is_accepted() {
    let error =
        parse_quantity("winding.tension", "3 psi", QuantityKind::ForcePerWidth).unwrap_err();
    match &error {
        UnitError::WrongKind {
            found,
            expected,
            accepted,
            ..
        } => {
            assert_eq!(found, "stress or pressure");
            assert!(expected.contains("force per width"));
            assert!(accepted.contains("pli"));
        }
        other => panic!("expected WrongKind, got {other:?}"),
    }
    let error = parse_quantity("web.thickness", "3 pli", QuantityKind::Length).unwrap_err();
    assert!(matches!(error, UnitError::WrongKind { .. }));
}

#[test]
fn not_a_number_is_rejected() {
    for text in [
        "", "abc", "inf m", "NaN mm", "1,5 mm", "1e999 m", "--3 m", "m",
    ] {
        let error = parse_quantity("f", text, QuantityKind::Length).unwrap_err();
        assert!(
            matches!(
                error,
                UnitError::NotANumber { .. } | UnitError::UnknownUnit { .. }
            ),
            "{text}: {error:?}"
        );
    }
    let error = parse_quantity("f", "1e999 m", QuantityKind::Length).unwrap_err();
    assert!(matches!(error, UnitError::NotANumber { .. }));
}

// --- Formatting --------------------------------------------------------------------------

#[test]
fn formats_in_trade_units() {
    assert_eq!(
        format_quantity(76e-6, QuantityKind::Length, UnitSystem::Si),
        "76 µm"
    );
    assert_eq!(
        format_quantity(0.1524, QuantityKind::Length, UnitSystem::Si),
        "152.4 mm"
    );
    assert_eq!(
        format_quantity(1.2, QuantityKind::Length, UnitSystem::Si),
        "1.2 m"
    );
    assert_eq!(
        format_quantity(25.4e-6, QuantityKind::Length, UnitSystem::Us),
        "1 mil"
    );
    assert_eq!(
        format_quantity(0.1524, QuantityKind::Length, UnitSystem::Us),
        "6 in"
    );
    assert_eq!(
        format_quantity(175.1268352, QuantityKind::ForcePerWidth, UnitSystem::Us),
        "1 pli"
    );
    assert_eq!(
        format_quantity(350.0, QuantityKind::ForcePerWidth, UnitSystem::Si),
        "350 N/m"
    );
    assert_eq!(
        format_quantity(6894.757, QuantityKind::Stress, UnitSystem::Us),
        "1 psi"
    );
    assert_eq!(
        format_quantity(5e9, QuantityKind::Stress, UnitSystem::Si),
        "5 GPa"
    );
    assert_eq!(
        format_quantity(5e9, QuantityKind::Stress, UnitSystem::Us),
        "725.2 ksi"
    );
    assert_eq!(
        format_quantity(0.00508, QuantityKind::Speed, UnitSystem::Us),
        "1 fpm"
    );
    assert_eq!(
        format_quantity(10.0, QuantityKind::Speed, UnitSystem::Si),
        "600 m/min"
    );
    assert_eq!(
        format_quantity(100.0, QuantityKind::Temperature, UnitSystem::Us),
        "212 °F"
    );
    assert_eq!(
        format_quantity(0.25, QuantityKind::Percent, UnitSystem::Si),
        "25 %"
    );
    assert_eq!(
        format_quantity(0.0, QuantityKind::Stress, UnitSystem::Si),
        "0 Pa"
    );
}

fn any_kind() -> impl Strategy<Value = QuantityKind> {
    prop::sample::select(QuantityKind::ALL.to_vec())
}

fn any_system() -> impl Strategy<Value = UnitSystem> {
    prop::sample::select(vec![UnitSystem::Si, UnitSystem::Us])
}

proptest! {
    /// format → parse returns the value to the four significant digits printed.
    #[test]
    fn format_then_parse_round_trips(
        mantissa in 1.0f64..10.0,
        exponent in -7i32..10,
        negative in any::<bool>(),
        kind in any_kind(),
        system in any_system(),
    ) {
        let sign = if negative && matches!(kind, QuantityKind::Temperature) { -1.0 } else { 1.0 };
        let value = sign * mantissa * 10f64.powi(exponent);
        let text = format_quantity(value, kind, system);
        let back = parse_quantity("round.trip", &text, kind).unwrap();
        // Four significant digits in the displayed unit; temperatures shift by an offset, so
        // compare them absolutely at the printed resolution.
        let tolerance = match kind {
            QuantityKind::Temperature => 6e-4 * value.abs().max((value * 1.8 + 32.0).abs()) + 1e-9,
            _ => 6e-4 * value.abs(),
        };
        prop_assert!((back - value).abs() <= tolerance, "{value} → {text} → {back}");
    }

    /// Every SI/US pair of the same quantity parses to the same SI value.
    #[test]
    fn us_and_si_spellings_agree(x in 0.001f64..10000.0) {
        let a = parse_quantity("f", &format!("{x} in"), QuantityKind::Length).unwrap();
        let b = parse_quantity("f", &format!("{} mm", x * 25.4), QuantityKind::Length).unwrap();
        prop_assert!((a - b).abs() <= 1e-12 * a.abs());
        let a = parse_quantity("f", &format!("{x} pli"), QuantityKind::ForcePerWidth).unwrap();
        let b = parse_quantity("f", &format!("{} N/m", x * 4.4482216152605 / 0.0254), QuantityKind::ForcePerWidth).unwrap();
        prop_assert!((a - b).abs() <= 1e-12 * a.abs());
    }

    /// Arbitrary text never panics.
    #[test]
    fn arbitrary_text_never_panics(text in ".{0,40}", kind in any_kind()) {
        let _ = parse_quantity("f", &text, kind);
    }
}
