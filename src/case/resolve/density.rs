//! The web density, the one the winder model (roll weight, centrifugal unloading) and the
//! failure mechanisms (handling shear, inertia) read: given, from basis weight and caliper, or
//! the preset's.

use crate::presets::WebPreset;

use super::super::registry as reg;
use super::super::{CaseError, WebInput};
use super::Resolver;

impl Resolver {
    /// The web density: given; else basis weight over caliper when the basis weight is given
    /// (listed as computed); else the preset's (listed as assumed).
    pub(super) fn density(
        &mut self,
        web: &WebInput,
        thickness: f64,
        preset: Option<&WebPreset>,
    ) -> Result<f64, CaseError> {
        let basis_weight = match web.basis_weight.as_ref() {
            Some(text) => Some(self.required_quantity(&reg::WEB_BASIS_WEIGHT, Some(text))?),
            None => None,
        };
        match (web.density, basis_weight) {
            (None, Some(grammage)) => {
                let density = grammage / thickness;
                let range = reg::DENSITY.range();
                if !range.contains(density) {
                    return Err(self.out_of_range(
                        reg::WEB_BASIS_WEIGHT.path,
                        reg::WEB_BASIS_WEIGHT.range().show(grammage),
                        format!(
                            "a basis weight that over the caliper {} gives a density {} kg/m³ (here {})",
                            reg::WEB_THICKNESS.range().show(thickness),
                            range.describe(),
                            range.show(density)
                        ),
                    ));
                }
                self.computed(
                    reg::DENSITY.path,
                    range.show(density),
                    "computed from the basis weight and the caliper: ρ = basis weight / thickness",
                );
                Ok(density)
            }
            (given, _) => self.number_or(&reg::DENSITY, given, preset, None),
        }
    }
}
