//! Checks of option values run by clap while it parses the command line, so a bad value
//! (`--resolution grouped:0`, `--format pdf`, `--core-share 5`) is a usage error with exit
//! code 2 and the usage line, like an unknown option; each check returns the text unchanged
//! and the command parses it again where it is used.

use rolltriage::units::{QuantityKind, parse_quantity};

/// `--resolution`: auto, per-layer or grouped:K with K ≥ 1.
pub fn resolution(text: &str) -> Result<String, String> {
    super::stress::parse_resolution(text)
        .map(|_| text.to_string())
        .map_err(|e| e.to_string())
}

/// `--answer`: QUESTION=VALUE with both sides given.
pub fn answer(text: &str) -> Result<String, String> {
    match text.split_once('=') {
        Some((question, value)) if !question.trim().is_empty() && !value.trim().is_empty() => {
            Ok(text.to_string())
        }
        _ => Err(format!(
            "\"{text}\" is not QUESTION=VALUE; e.g. starring.after_splice=yes"
        )),
    }
}

/// `report --format`: markdown, html or json.
pub fn report_format(text: &str) -> Result<String, String> {
    text.parse::<rolltriage::report::Format>()
        .map(|_| text.to_string())
        .map_err(|e| e.to_string())
}

/// `--units` given as text: si (metric) or us (imperial).
pub fn unit_system(text: &str) -> Result<String, String> {
    match text.to_ascii_lowercase().as_str() {
        "si" | "metric" | "us" | "imperial" => Ok(text.to_string()),
        _ => Err(format!("\"{text}\" is not known; accepted: si, us")),
    }
}

/// `report --date`: YYYY-MM-DD.
pub fn date(text: &str) -> Result<String, String> {
    let parts: Vec<&str> = text.split('-').collect();
    let ok = parts.len() == 3
        && parts[0].len() == 4
        && parts[1].len() == 2
        && parts[2].len() == 2
        && parts.iter().all(|p| p.chars().all(|c| c.is_ascii_digit()))
        && (1..=12).contains(&parts[1].parse::<u32>().unwrap_or(0))
        && (1..=31).contains(&parts[2].parse::<u32>().unwrap_or(0));
    if ok {
        Ok(text.to_string())
    } else {
        Err(format!(
            "\"{text}\" is not a date; accepted: YYYY-MM-DD, e.g. 2026-12-02"
        ))
    }
}

/// A ratio (a plain number) in the range `ok`.
fn ratio(text: &str, ok: impl Fn(f64) -> bool, accepted: &str) -> Result<f64, String> {
    match text.trim().parse::<f64>() {
        Ok(v) if v.is_finite() && ok(v) => Ok(v),
        _ => Err(format!("\"{text}\" is out of range; accepted: {accepted}")),
    }
}

/// A share: a fraction (0.8) or a percentage ("80 %", "80%"), in the range `ok` as a fraction.
/// A bare number that only makes sense as a percentage ("80") is refused with both ways to
/// write what was probably meant, rather than read as 8000 %.
fn share(text: &str, ok: impl Fn(f64) -> bool, accepted: &str) -> Result<f64, String> {
    let accepted = format!("{accepted}, as a fraction (0.8 means 80 %) or a percentage (\"80 %\")");
    match parse_quantity("share", text, QuantityKind::Percent) {
        Ok(v) if v.is_finite() && ok(v) => Ok(v),
        Ok(v) if !text.contains('%') && v > 1.0 && ok(v / 100.0) => {
            let t = text.trim();
            Err(format!(
                "\"{t}\" is out of range: as a fraction it is {} %; for {t} % write \"{t} %\" or {}; accepted: {accepted}",
                100.0 * v,
                v / 100.0
            ))
        }
        _ => Err(format!("\"{text}\" is out of range; accepted: {accepted}")),
    }
}

/// `taper --core-share`: 0 < share ≤ 1.5 (the taper design's own range).
pub fn core_share(text: &str) -> Result<f64, String> {
    share(
        text,
        |v| v > 0.0 && v <= 1.5,
        "above 0 and at most 1.5 (150 %)",
    )
}

/// `taper --min-telescoping-margin`: 0 < margin ≤ 100 (the taper design's own range).
pub fn telescoping_margin(text: &str) -> Result<f64, String> {
    ratio(
        text,
        |v| v > 0.0 && v <= 100.0,
        "a number above 0, at most 100",
    )
}

/// `taper --starring-share`: 0 < share < 1.
pub fn starring_share(text: &str) -> Result<f64, String> {
    share(text, |v| v > 0.0 && v < 1.0, "above 0 and below 1 (100 %)")
}

/// `taper --tension-share`: 0 < share ≤ 1.
pub fn tension_share(text: &str) -> Result<f64, String> {
    share(
        text,
        |v| v > 0.0 && v <= 1.0,
        "above 0 and at most 1 (100 %)",
    )
}

fn quantity(text: &str, kind: QuantityKind) -> Result<String, String> {
    parse_quantity("value", text, kind)
        .map(|_| text.to_string())
        .map_err(|e| e.to_string())
}

/// A length with its unit ("25.4 mm").
pub fn length(text: &str) -> Result<String, String> {
    quantity(text, QuantityKind::Length)
}

/// A percentage ("60 %" or 0.6).
pub fn percent(text: &str) -> Result<String, String> {
    quantity(text, QuantityKind::Percent)
}

/// A count of at least 1 (`--layers`, `--steps`).
pub fn count(text: &str) -> Result<usize, String> {
    match text.trim().parse::<usize>() {
        Ok(n) if n >= 1 => Ok(n),
        _ => Err(format!("\"{text}\" is not a whole number of at least 1")),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn good_values_pass_and_bad_ones_say_what_is_accepted() {
        assert!(resolution("grouped:4").is_ok());
        assert!(resolution("grouped:0").unwrap_err().contains("K ≥ 1"));
        assert!(answer("a.b=yes").is_ok());
        assert!(answer("foo").is_err());
        assert!(answer("=yes").is_err());
        assert!(report_format("html").is_ok());
        assert!(report_format("pdf").unwrap_err().contains("accepted"));
        assert!(core_share("1.5").is_ok());
        assert!(core_share("5").is_err());
        assert!(core_share("NaN").is_err());
        assert!(date("2026-12-02").is_ok());
        assert!(date("2026-13-02").is_err());
        assert!(count("0").is_err());
        assert!(length("25 mm").is_ok());
        assert!(length("25 kPa").is_err());
    }
}
