//! What web tension is usual for a grade: the typical winding stress (tension per unit caliper)
//! of each web material from trade tension tables, the web presets' own typical tension, and
//! the case's recipe value when the user states it. The diagnosis judges a tension as high or
//! low against this, not against one strain threshold for every web.
//!
//! Trade tables give tension per width per mil of caliper for films and foil, and per grade for
//! paper and board; they are guidelines that vary by a factor of about two between sources and
//! grades (`common practice`). Stress = tension / caliper; 1 pli per mil = 175.127 N/m over
//! 25.4 µm = 6.895 MPa.

use crate::case::ResolvedCase;
use crate::vocabulary::WebMaterial;

/// 1 pli per mil of caliper as a stress (Pa): 4.448 222 N / 0.0254 m / 25.4e-6 m (NIST SP 811
/// factors for lbf and inch).
pub const PLI_PER_MIL: f64 = 4.448_221_615_260_5 / 0.0254 / 25.4e-6;

/// The typical winding stress of one web material with where it comes from.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TypicalStress {
    pub material: WebMaterial,
    /// Pa: usual web tension divided by caliper.
    pub stress: f64,
    pub source: &'static str,
}

/// Typical winding stress per web material.
pub const TYPICAL_STRESS: [TypicalStress; 6] = [
    TypicalStress {
        material: WebMaterial::Paper,
        stress: 0.65 * PLI_PER_MIL,
        source: "common practice: trade tension tables give about 1 pli for 30 lb (newsprint-like) up to 3 pli for 80 lb paper, about 0.3–0.9 pli per mil of caliper; the middle of that range",
    },
    TypicalStress {
        material: WebMaterial::Board,
        stress: 0.33 * PLI_PER_MIL,
        source: "common practice: trade tension tables give about 3 pli for 8 pt up to 8–11 pli for 30 pt board, about 0.27–0.38 pli per mil",
    },
    TypicalStress {
        material: WebMaterial::Film,
        stress: 0.5 * PLI_PER_MIL,
        source: "common practice: trade tension tables give 0.25–0.3 pli per mil for polyethylene, polypropylene and nylon and 0.75 pli per mil for polyester; the middle of that range (name the film's preset for its own value)",
    },
    TypicalStress {
        material: WebMaterial::Foil,
        stress: 1.0 * PLI_PER_MIL,
        source: "common practice: trade tension tables give about 1 pli per mil for aluminium foil",
    },
    TypicalStress {
        material: WebMaterial::Nonwoven,
        stress: 0.2 * 175.126_835_3 / 200e-6,
        source: "(from memory) nonwovens wind at a fraction of a pli; 0.2 pli on a 200 µm spunbond",
    },
    TypicalStress {
        material: WebMaterial::Laminate,
        stress: 0.5 * PLI_PER_MIL,
        source: "common practice: trade tables sum the plies' tensions (film 0.25–0.75 pli per mil, foil 1 pli per mil) and add about 0.1 pli",
    },
];

/// The typical winding stress of `material`.
pub fn typical_stress(material: WebMaterial) -> &'static TypicalStress {
    TYPICAL_STRESS
        .iter()
        .find(|t| t.material == material)
        .unwrap_or(&TYPICAL_STRESS[0])
}

/// Where the usual tension of a case came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum UsualFrom {
    /// The case's recipe value (`winding.recipe_tension`).
    Recipe,
    /// The web preset's typical tension, scaled to the case's caliper.
    Preset,
    /// The web material's typical winding stress × the case's caliper.
    Material,
}

/// The usual web tension (N/m) for the case's web and where it came from: the recipe value when
/// stated, else the preset's typical stress (its typical tension over its caliper) × the case's
/// caliper, else the material's typical stress × the caliper. `None` without a caliper.
pub fn usual_tension(case: &ResolvedCase) -> Option<(f64, UsualFrom)> {
    if let Some(recipe) = case.winding.recipe_tension.filter(|t| *t > 0.0) {
        return Some((recipe, UsualFrom::Recipe));
    }
    let thickness = case.web.thickness;
    if thickness <= 0.0 {
        return None;
    }
    if let Some(p) = case
        .web
        .preset
        .as_deref()
        .and_then(crate::presets::web_preset)
        && p.material == case.web.material
        && p.thickness.value > 0.0
    {
        let stress = p.typical_tension.value / p.thickness.value;
        return Some((stress * thickness, UsualFrom::Preset));
    }
    Some((
        typical_stress(case.web.material).stress * thickness,
        UsualFrom::Material,
    ))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn one_pli_per_mil_is_6_9_mpa() {
        // NIST SP 811: 1 lbf = 4.448 222 N, 1 in = 0.0254 m; 1 pli/mil = 6.894 757 MPa (= 1 psi × 1000).
        assert!((PLI_PER_MIL - 6.894_757e6).abs() < 1.0);
    }

    #[test]
    fn every_material_has_a_typical_stress_with_a_source() {
        for m in WebMaterial::ALL {
            let t = typical_stress(*m);
            assert_eq!(t.material, *m);
            assert!(t.stress > 0.0 && !t.source.is_empty());
        }
    }

    #[test]
    fn film_tables_order_foil_above_polyester_above_polyolefins() {
        // Trade tension tables (common practice): foil 1, polyester 0.75, PE/PP 0.25 pli per mil;
        // the generic film value sits between polyester and the polyolefins.
        let film = typical_stress(WebMaterial::Film).stress;
        assert!(film > 0.25 * PLI_PER_MIL && film < 0.75 * PLI_PER_MIL);
        assert!(typical_stress(WebMaterial::Foil).stress > 0.75 * PLI_PER_MIL);
    }
}
