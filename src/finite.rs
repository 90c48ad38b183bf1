//! The output-side guard on numbers: no NaN or infinity leaves the program as a result.
//!
//! JSON has no NaN; `serde_json` writes one as `null`, which a reader takes for "not given".
//! Every command that prints or saves a result checks it here first and refuses with the name
//! of the first value that could not be computed, so whatever an input range lets through
//! fails loudly instead of silently.

use serde::Serialize;

/// A result held a value that is not a finite number.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error(
    "{what}: {field} could not be computed (the arithmetic gave {value}); the inputs are outside what the model can handle: {hint}"
)]
pub struct NonFinite {
    /// What was being produced ("the stress profile", "the stack fit").
    pub what: String,
    /// Path of the first bad value inside the result, e.g. `profile.pressure[12]`.
    pub field: String,
    /// "NaN", "infinity" or "-infinity".
    pub value: String,
    /// Which inputs feed the value, in plain words.
    pub hint: &'static str,
}

/// The inputs that feed a result field, for the message.
fn hint(field: &str) -> &'static str {
    if field.contains("air_film") {
        "the air film needs a tension above zero on every wrap and web.roughness above zero"
    } else if field.contains("k1") || field.contains("k2") || field.contains("r_squared") {
        "the stack data span a range of pressures the fit cannot handle in double precision; check the pressure unit in the header"
    } else if field.contains("tension") {
        "check winding.tension, its taper and the upsets"
    } else {
        "check web.radial_stiffness, the core stiffness (core section) and winding.tension"
    }
}

/// Refuse `value` when any number in it is NaN or infinite. `what` names the result in the
/// message. Values that cannot be walked (serialisation errors) pass: they fail later where
/// they are written, with their own message.
pub fn ensure_finite<T: Serialize + ?Sized>(what: &str, value: &T) -> Result<(), NonFinite> {
    // YAML keeps NaN and infinity as numbers (.nan, .inf), so walking its value tree finds
    // them; a JSON value would already have turned them into null.
    let Ok(tree) = yaml::to_value(value) else {
        return Ok(());
    };
    match first_non_finite(&tree, String::new()) {
        None => Ok(()),
        Some((field, number)) => Err(NonFinite {
            what: what.to_string(),
            hint: hint(&field),
            field: if field.is_empty() {
                "the value".to_string()
            } else {
                field
            },
            value: if number.is_nan() {
                "NaN".to_string()
            } else if number > 0.0 {
                "infinity".to_string()
            } else {
                "-infinity".to_string()
            },
        }),
    }
}

/// True when every number in `value` is finite.
pub fn is_finite<T: Serialize + ?Sized>(value: &T) -> bool {
    ensure_finite("", value).is_ok()
}

fn first_non_finite(value: &yaml::Value, path: String) -> Option<(String, f64)> {
    match value {
        yaml::Value::Number(n) => n.as_f64().filter(|x| !x.is_finite()).map(|x| (path, x)),
        yaml::Value::Sequence(items) => items
            .iter()
            .enumerate()
            .find_map(|(i, item)| first_non_finite(item, format!("{path}[{i}]"))),
        yaml::Value::Mapping(map) => map.iter().find_map(|(key, item)| {
            let key = match key {
                yaml::Value::String(s) => s.clone(),
                other => yaml::to_string(other)
                    .map(|s| s.trim().to_string())
                    .unwrap_or_default(),
            };
            let child = if path.is_empty() {
                key
            } else {
                format!("{path}.{key}")
            };
            first_non_finite(item, child)
        }),
        yaml::Value::Tagged(tagged) => first_non_finite(&tagged.value, path),
        _ => None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[derive(Serialize)]
    struct Fit {
        k1: f64,
        errors: Vec<f64>,
        note: Option<f64>,
    }

    #[test]
    fn finite_results_pass() {
        let fit = Fit {
            k1: 1.0,
            errors: vec![0.0, -2.5],
            note: None,
        };
        assert!(ensure_finite("the fit", &fit).is_ok());
    }

    #[test]
    fn the_first_bad_value_is_named_by_its_path() {
        let fit = Fit {
            k1: 1.0,
            errors: vec![0.0, f64::NAN],
            note: Some(f64::INFINITY),
        };
        let error = ensure_finite("the fit", &fit).unwrap_err();
        assert_eq!(error.field, "errors[1]");
        assert_eq!(error.value, "NaN");
        assert!(
            error
                .to_string()
                .starts_with("the fit: errors[1] could not")
        );
        let error = ensure_finite("x", &[f64::NEG_INFINITY]).unwrap_err();
        assert_eq!(error.value, "-infinity");
    }
}
