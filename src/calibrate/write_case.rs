//! Writing a stack fit into a case file (`calibrate stack --write-case`) without ever leaving
//! an invalid case or silently losing what the user wrote.
//!
//! The new case is checked with the case file's own validation before anything is written;
//! a fit outside the accepted range is refused with the reason and the file is left as it
//! was. The file is saved as every case file is ([`Case::save_plan`]): its text is edited in
//! place, so comments and layout survive, and the edit is parsed back and must give exactly
//! the case with the fit. Where the layout does not allow that (a flow-style `web: {...}`),
//! the file is rewritten from its parsed form, which drops comments: that needs the caller's
//! consent.

use std::path::Path;

use crate::case::{Case, QuantityText, RadialStiffnessInput};

use super::{CalibrateError, PfeifferFit, radial_stiffness_input};

/// How the case file was (or would be) updated.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CaseEdit {
    /// Only the `web.radial_stiffness` lines changed; comments and layout are kept.
    InPlace,
    /// The file was rewritten from its parsed form (it had no comments, or the caller agreed
    /// to drop them).
    Rewritten,
}

/// A number as a case file shows it: plain for ordinary sizes, `2.6e295` form far from them
/// (never hundreds of digits).
pub fn case_number(value: f64) -> String {
    let magnitude = if value == 0.0 {
        0.0
    } else {
        value.abs().log10()
    };
    if (-4.0..10.0).contains(&magnitude) {
        format!("{value}")
    } else {
        format!("{value:e}")
    }
}

/// The radial-stiffness section as case-file lines, indented by `indent`.
fn section_lines(input: &RadialStiffnessInput, indent: &str) -> String {
    let mut text = format!("{indent}radial_stiffness:\n{indent}  law: {}\n", input.law);
    if let Some(k1) = &input.k1 {
        let k1 = match k1 {
            QuantityText::Number(v) => case_number(*v),
            QuantityText::Text(t) => t.clone(),
        };
        text.push_str(&format!("{indent}  k1: {k1}\n"));
    }
    if let Some(k2) = input.k2 {
        text.push_str(&format!("{indent}  k2: {}\n", case_number(k2)));
    }
    text
}

/// Write `fit` into the case file at `path`. Refused, leaving the file untouched, when the
/// case with the fit would not pass the case check (the reason names the field and its
/// accepted range), and when comments would be lost without `drop_comments`.
pub fn write_fit_into_case(
    path: &Path,
    fit: &PfeifferFit,
    drop_comments: bool,
) -> Result<CaseEdit, CalibrateError> {
    let origin = path.display().to_string();
    let refused = |message: String| CalibrateError::Library {
        path: origin.clone(),
        message,
    };
    let read_error = |source| CalibrateError::Read {
        path: path.to_path_buf(),
        error: source,
    };
    // A pipe or device is refused before it is opened (reading one could wait forever).
    if !std::fs::metadata(path).map_err(read_error)?.is_file() {
        return Err(refused("not a regular file; the fit is not written".into()));
    }
    let text = std::fs::read_to_string(path).map_err(read_error)?;
    let mut case = Case::from_yaml_str(&text, &origin)
        .map_err(|e| refused(format!("the fit is not written: {e}")))?;
    let input = radial_stiffness_input(fit);
    case.web.radial_stiffness = Some(input.clone());
    case.resolve_as(&origin).map_err(|e| {
        refused(format!(
            "the fit (K1 {}, K2 {}) is not written because the case would not pass the check: {e}; the file is left unchanged",
            crate::units::format_quantity(
                fit.k1,
                crate::units::QuantityKind::Stress,
                crate::units::UnitSystem::Si
            ),
            case_number(super::significant(fit.k2, 5))
        ))
    })?;
    let not_written = |e: crate::case::CaseError| refused(format!("the fit is not written: {e}"));
    let plan = case.save_plan(path).map_err(not_written)?;
    let edit = match &plan.how {
        crate::case::SaveHow::InPlace => CaseEdit::InPlace,
        crate::case::SaveHow::Rewritten {
            dropped_comments: true,
            ..
        } if !drop_comments => {
            return Err(refused(format!(
                "the fit is not written: the file's layout needs a full rewrite, which drops its comments; pass --drop-comments to accept that, or write these lines under web: yourself:\n{}",
                section_lines(&input, "  ")
            )));
        }
        _ => CaseEdit::Rewritten,
    };
    plan.write(path).map_err(not_written)?;
    Ok(edit)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn input() -> RadialStiffnessInput {
        RadialStiffnessInput {
            law: "pfeiffer".into(),
            k1: Some(QuantityText::Text("4.4 kPa".into())),
            k2: Some(21.27),
            modulus: None,
            coefficient: None,
            exponent: None,
        }
    }

    #[test]
    fn huge_and_tiny_numbers_are_written_in_exponent_form() {
        assert_eq!(case_number(2.6e295), "2.6e295");
        assert_eq!(case_number(1.5e-7), "1.5e-7");
        assert_eq!(case_number(21.27), "21.27");
        assert_eq!(case_number(0.0), "0");
    }

    fn with_fit(text: &str) -> Result<String, crate::case::edit::NotInPlace> {
        let mut case = Case::from_yaml_str(text, "t").unwrap();
        case.web.radial_stiffness = Some(input());
        crate::case::edit::edit_in_place(text, &case)
    }

    #[test]
    fn the_section_is_replaced_and_comments_stay() {
        let text = "# my notes\ntitle: t\nweb:\n  material: paper  # grade A\n  radial_stiffness:\n    law: constant\n    modulus: 1 MPa\n\n  friction: 0.4\ncore:\n  material: rigid\n";
        let edited = with_fit(text).unwrap();
        assert!(edited.contains("# my notes"));
        assert!(edited.contains("# grade A"));
        assert!(
            edited.contains(
                "  radial_stiffness:\n    law: pfeiffer\n    k1: 4.4 kPa\n    k2: 21.27\n"
            ),
            "{edited}"
        );
        assert!(!edited.contains("modulus: 1 MPa"));
        assert!(edited.contains("  friction: 0.4\ncore:"));
    }

    #[test]
    fn the_section_is_added_when_missing() {
        let text = "title: t\nweb:\n  material: paper\ncore:\n  material: rigid\n";
        let edited = with_fit(text).unwrap();
        assert!(
            edited.contains("web:\n  material: paper\n  radial_stiffness:\n    law: pfeiffer\n"),
            "{edited}"
        );
        assert!(edited.ends_with("core:\n  material: rigid\n"));
    }

    #[test]
    fn flow_style_is_not_edited() {
        assert!(with_fit("title: t\nweb: {material: paper}\n").is_err());
    }
}
