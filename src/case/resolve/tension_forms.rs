//! Tension as people give it: a force per width (the case file's own kind), a stress in the web
//! (`"3 psi"`, `"1.8 MPa"`: times the caliper) or the total force on the web (`"150 N"`:
//! divided by the width). A converted value is recorded as computed, with the text it came
//! from, so `case check`, `stress` and reports echo it back.

use crate::units::{QuantityKind, UnitError, UnitSystem, format_quantity, parse_quantity};

use super::super::{CaseError, QuantityText, ResolvedWeb};
use super::Resolver;

/// What a tension field accepts beyond a force per width, for messages.
const OTHER_FORMS: &str = "or a stress in the web (Pa, kPa, MPa, psi; times the caliper), or the total force on the web (N, kN, lbf; divided by the width)";

/// "228.7 N/m (1.306 pli)": a tension in both unit systems, for the echo of a conversion.
fn both_systems(value: f64) -> String {
    format!(
        "{} ({})",
        format_quantity(value, QuantityKind::ForcePerWidth, UnitSystem::Si),
        format_quantity(value, QuantityKind::ForcePerWidth, UnitSystem::Us)
    )
}

impl Resolver {
    /// A tension field (N/m) that may also be written as a web stress or a total force.
    pub(super) fn tension_quantity(
        &mut self,
        field: &str,
        value: Option<&QuantityText>,
        web: &ResolvedWeb,
    ) -> Result<Option<f64>, CaseError> {
        let Some(QuantityText::Text(text)) = value else {
            return self.quantity(field, value, QuantityKind::ForcePerWidth);
        };
        let error = match parse_quantity(field, text, QuantityKind::ForcePerWidth) {
            Ok(tension) => return Ok(Some(tension)),
            Err(UnitError::WrongKind {
                field,
                given,
                found,
                expected,
                accepted,
            }) => UnitError::WrongKind {
                field,
                given,
                found,
                expected,
                accepted: format!("{accepted}, {OTHER_FORMS}"),
            },
            Err(other) => return Err(self.unit_error(other)),
        };
        let given = |kind| parse_quantity(field, text, kind).ok();
        let assumed = |path: &str| {
            self.assumed
                .iter()
                .any(|a| a.field == path && a.is_default())
        };
        if let Some(stress) = given(QuantityKind::Stress) {
            // Tension per width = stress × caliper (the stress acts on the web's cross-section).
            let tension = stress * web.thickness;
            let caliper = format_quantity(web.thickness, QuantityKind::Length, UnitSystem::Si);
            let caveat = if assumed("web.thickness") {
                " (the caliper is assumed; give web.thickness)"
            } else {
                ""
            };
            let how = format!(
                "converted from the web stress \"{}\" × caliper {caliper}{caveat}",
                text.trim()
            );
            self.computed(field, both_systems(tension), &how);
            return Ok(Some(tension));
        }
        if let Some(force) = given(QuantityKind::Force) {
            // An assumed width (the 1 m default) would make the tension up.
            if assumed("web.width") {
                return Err(self.invalid(format!(
                    "{field}: \"{}\" is the total force on the web; turning it into a tension per width needs the web width: give web.width",
                    text.trim()
                )));
            }
            let tension = force / web.width;
            let width = format_quantity(web.width, QuantityKind::Length, UnitSystem::Si);
            let how = format!(
                "converted from the total force \"{}\" ÷ width {width}",
                text.trim()
            );
            self.computed(field, both_systems(tension), &how);
            return Ok(Some(tension));
        }
        Err(self.unit_error(error))
    }
}
