//! Writing a stack fit into a case file (`calibrate stack --write-case`) without ever leaving
//! an invalid case or silently losing what the user wrote.
//!
//! The new case is checked with the case file's own validation before anything is written;
//! a fit outside the accepted range is refused with the reason and the file is left as it
//! was. The `web.radial_stiffness` lines are replaced in the file's text, so comments and
//! layout elsewhere survive; the edit is then parsed back and must give exactly the case with
//! the fit. Where the layout does not allow that (a flow-style `web: {...}`), the file is
//! rewritten from its parsed form, which drops comments: that needs the caller's consent.

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

fn indentation(line: &str) -> usize {
    line.len() - line.trim_start_matches(' ').len()
}

fn is_blank_or_comment(line: &str) -> bool {
    let t = line.trim();
    t.is_empty() || t.starts_with('#')
}

/// Replace (or add) `web.radial_stiffness` in block-style YAML text. `None` when the text is
/// not laid out as plain blocks the edit understands.
fn edit_text(text: &str, input: &RadialStiffnessInput) -> Option<String> {
    let lines: Vec<&str> = text.split_inclusive('\n').collect();
    let web = lines.iter().position(|l| {
        let t = l.trim_end();
        t == "web:" || (t.starts_with("web:") && t[4..].trim_start().starts_with('#'))
    })?;
    // The web block: following lines indented more than zero (blank and comment lines inside).
    let mut end = web + 1;
    let mut child_indent = None;
    for (i, line) in lines.iter().enumerate().skip(web + 1) {
        if is_blank_or_comment(line) {
            continue;
        }
        let ind = indentation(line);
        if ind == 0 {
            break;
        }
        child_indent.get_or_insert(ind);
        end = i + 1;
    }
    let child_indent = child_indent?;
    let pad = " ".repeat(child_indent);
    let key = format!("{pad}radial_stiffness:");
    let start = (web + 1..end)
        .find(|&i| lines[i].starts_with(&key) && indentation(lines[i]) == child_indent);
    let new_section = section_lines(input, &pad);
    let mut out = String::with_capacity(text.len() + new_section.len());
    match start {
        Some(start) => {
            // Its block: the following lines indented deeper (blank lines inside included).
            let mut stop = start + 1;
            for (i, line) in lines.iter().enumerate().take(end).skip(start + 1) {
                if line.trim().is_empty() || indentation(line) > child_indent {
                    stop = i + 1;
                } else {
                    break;
                }
            }
            lines[..start].iter().for_each(|l| out.push_str(l));
            out.push_str(&new_section);
            lines[stop..].iter().for_each(|l| out.push_str(l));
        }
        None => {
            lines[..end].iter().for_each(|l| out.push_str(l));
            if !out.ends_with('\n') {
                out.push('\n');
            }
            out.push_str(&new_section);
            lines[end..].iter().for_each(|l| out.push_str(l));
        }
    }
    Some(out)
}

/// True when the text has a YAML comment (a `#` at a line start or after a space).
fn has_comments(text: &str) -> bool {
    text.lines()
        .any(|l| l.trim_start().starts_with('#') || l.contains(" #"))
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
    if let Some(edited) = edit_text(&text, &input)
        && Case::from_yaml_str(&edited, &origin).is_ok_and(|c| c == case)
    {
        crate::fsutil::save_atomic(path, edited.as_bytes())?;
        return Ok(CaseEdit::InPlace);
    }
    if has_comments(&text) && !drop_comments {
        return Err(refused(format!(
            "the fit is not written: the file's layout needs a full rewrite, which drops its comments; pass --drop-comments to accept that, or write these lines under web: yourself:\n{}",
            section_lines(&input, "  ")
        )));
    }
    case.save(path)
        .map_err(|e| refused(format!("the fit is not written: {e}")))?;
    Ok(CaseEdit::Rewritten)
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

    #[test]
    fn the_section_is_replaced_and_comments_stay() {
        let text = "# my notes\ntitle: t\nweb:\n  material: paper  # grade A\n  radial_stiffness:\n    law: constant\n    modulus: 1 MPa\n\n  friction: 0.4\ncore:\n  material: rigid\n";
        let edited = edit_text(text, &input()).unwrap();
        assert!(edited.contains("# my notes"));
        assert!(edited.contains("# grade A"));
        assert!(
            edited.contains(
                "  radial_stiffness:\n    law: pfeiffer\n    k1: 4.4 kPa\n    k2: 21.27\n"
            )
        );
        assert!(!edited.contains("modulus: 1 MPa"));
        assert!(edited.contains("  friction: 0.4\ncore:"));
    }

    #[test]
    fn the_section_is_added_when_missing() {
        let text = "title: t\nweb:\n  material: paper\ncore:\n  material: rigid\n";
        let edited = edit_text(text, &input()).unwrap();
        assert!(
            edited.contains("web:\n  material: paper\n  radial_stiffness:\n    law: pfeiffer\n")
        );
        assert!(edited.ends_with("core:\n  material: rigid\n"));
    }

    #[test]
    fn flow_style_is_not_edited() {
        assert_eq!(edit_text("web: {material: paper}\n", &input()), None);
    }
}
