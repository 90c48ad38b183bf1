//! How one value of a case is read: a quantity parsed in its unit, checked against the
//! registry's range, a missing one filled from the presets and recorded as assumed (or as a
//! preset copy), names from closed lists, and the errors that name the field.

use crate::presets::{CorePreset, Sourced, WebPreset};
use crate::units::{QuantityKind, parse_quantity};

use super::super::registry::{self as reg, Field, Range};
use super::super::{AssumedValue, CaseError, QuantityText, ValueOrigin};
use super::{PRESET_COPY_TOLERANCE, Resolver};

impl Resolver {
    pub(super) fn unit_error(&self, source: crate::units::UnitError) -> CaseError {
        CaseError::Quantity {
            origin: self.origin.clone(),
            error: Box::new(source),
        }
    }

    pub(super) fn invalid(&self, message: impl Into<String>) -> CaseError {
        CaseError::Invalid {
            origin: self.origin.clone(),
            message: message.into(),
        }
    }

    pub(super) fn out_of_range(&self, field: &str, given: String, accepted: String) -> CaseError {
        CaseError::OutOfRange {
            origin: self.origin.clone(),
            field: field.to_string(),
            given,
            accepted,
        }
    }

    pub(super) fn unknown_name(
        &self,
        field: &str,
        what: &'static str,
        given: &str,
        accepted: &[&'static str],
    ) -> CaseError {
        CaseError::UnknownName {
            origin: self.origin.clone(),
            field: field.to_string(),
            what,
            given: given.into(),
            suggestion: crate::vocabulary::closest(given, accepted.iter().copied()),
            accepted: accepted.join(", ").into(),
        }
    }

    /// Parse a quantity as written; `None` when absent.
    pub(super) fn quantity(
        &self,
        field: &str,
        value: Option<&QuantityText>,
        kind: QuantityKind,
    ) -> Result<Option<f64>, CaseError> {
        match value {
            None => Ok(None),
            Some(QuantityText::Number(number)) => {
                if number.is_finite() {
                    Ok(Some(*number))
                } else {
                    Err(self.out_of_range(field, number.to_string(), "a finite number".to_string()))
                }
            }
            Some(QuantityText::Text(text)) => parse_quantity(field, text, kind)
                .map(Some)
                .map_err(|e| self.unit_error(e)),
        }
    }

    pub(super) fn check(&self, field: &str, value: f64, range: &Range) -> Result<f64, CaseError> {
        if range.contains(value) {
            Ok(value)
        } else {
            Err(self.out_of_range(field, range.show(value), range.describe()))
        }
    }

    /// A quantity that must be in the field's range, or the field's default from the presets
    /// (recorded as assumed).
    pub(super) fn quantity_or(
        &mut self,
        field: &Field,
        value: Option<&QuantityText>,
        web: Option<&WebPreset>,
        core: Option<&CorePreset>,
    ) -> Result<f64, CaseError> {
        let kind = field.range().kind.unwrap_or(QuantityKind::Percent);
        let value = self.quantity(field.path, value, kind)?;
        self.number_or(field, value, web, core)
    }

    /// A plain number that must be in the field's range, or the field's default from the
    /// presets (recorded as assumed).
    pub(in crate::case) fn number_or(
        &mut self,
        field: &Field,
        value: Option<f64>,
        web: Option<&WebPreset>,
        core: Option<&CorePreset>,
    ) -> Result<f64, CaseError> {
        let range = field.range();
        match (value, field.preset_value(web, core)) {
            (Some(v), _) => {
                let v = self.check(field.path, v, &range)?;
                self.note_preset_copy(field, v);
                Ok(v)
            }
            (None, Some((fallback, from))) => Ok(self.assumed(field.path, &range, fallback, &from)),
            (None, None) => Err(self.invalid(format!("{} is required", field.path))),
        }
    }

    /// Record the preset value `fallback` of a missing `field` as assumed and return it.
    pub(super) fn assumed(
        &mut self,
        field: &str,
        range: &Range,
        fallback: Sourced,
        from: &str,
    ) -> f64 {
        self.assume(field, range.show(fallback.value), from, fallback.source);
        fallback.value
    }

    /// Record a given value that equals the named preset's value (or the fixed default, in a
    /// case that names a preset) as a preset copy: `case new` wrote it, nobody measured it.
    pub(super) fn note_preset_copy(&mut self, field: &Field, value: f64) {
        let named = match field.default {
            reg::DefaultValue::WebPreset(_) => self.named_web.is_some(),
            reg::DefaultValue::CorePreset(_) => self.named_core.is_some(),
            reg::DefaultValue::Fixed(_) => self.named_web.is_some() || self.named_core.is_some(),
            _ => false,
        };
        if !named {
            return;
        }
        let Some((preset, from)) = field.preset_value(self.named_web, self.named_core) else {
            return;
        };
        let scale = preset.value.abs().max(f64::MIN_POSITIVE);
        if (value - preset.value).abs() / scale <= PRESET_COPY_TOLERANCE {
            let shown = field.range().show(value);
            self.push_assumed(field.path, shown, &from, preset.source, ValueOrigin::Preset);
        }
    }

    pub(super) fn assume(&mut self, field: &str, value: String, from: &str, source: &str) {
        self.push_assumed(field, value, from, source, ValueOrigin::Default);
    }

    /// Record a value computed from other inputs (shown as computed, not given).
    pub(in crate::case) fn computed(&mut self, field: &str, value: String, how: &str) {
        self.push_assumed(field, value, "", how, ValueOrigin::Computed);
    }

    pub(in crate::case) fn push_assumed(
        &mut self,
        field: &str,
        value: String,
        from: &str,
        source: &str,
        origin: ValueOrigin,
    ) {
        let source = if from.is_empty() {
            source.to_string()
        } else {
            format!("{from}: {source}")
        };
        self.assumed.push(AssumedValue {
            field: field.to_string(),
            value,
            source,
            origin,
        });
    }

    /// A required quantity in the field's range (its presence is checked by the caller).
    pub(in crate::case) fn required_quantity(
        &self,
        field: &Field,
        value: Option<&QuantityText>,
    ) -> Result<f64, CaseError> {
        let range = field.range();
        let kind = range.kind.unwrap_or(QuantityKind::Percent);
        match self.quantity(field.path, value, kind)? {
            Some(v) => self.check(field.path, v, &range),
            None => Err(self.invalid(format!("{} is required", field.path))),
        }
    }

    /// A required plain number in the field's range.
    pub(super) fn required_number(
        &self,
        field: &Field,
        value: Option<f64>,
    ) -> Result<f64, CaseError> {
        match value {
            Some(v) => self.check(field.path, v, &field.range()),
            None => Err(self.invalid(format!("{} is required", field.path))),
        }
    }

    /// A name from a closed list, or an "unknown name" error with a suggestion.
    pub(super) fn word<T>(
        &self,
        field: &Field,
        what: &'static str,
        given: &str,
        parse: fn(&str) -> Option<T>,
        accepted: &[&'static str],
    ) -> Result<T, CaseError> {
        parse(given).ok_or_else(|| self.unknown_name(field.path, what, given, accepted))
    }
}
