//! Stable identifiers shared by case files, rules, tests and the UI.
//!
//! Changing an ID here breaks saved case files and rule files: add, never rename.

/// Symptom (roll defect) IDs. One rule file per symptom lives in `rules/`.
pub const SYMPTOM_IDS: [&str; 14] = [
    "telescoping",
    "starring",
    "blocking",
    "crushed_core",
    "bulk_loss",
    "cinching",
    "soft_roll",
    "out_of_round",
    "wrinkles",
    "gauge_bands",
    "dishing",
    "bursts",
    "core_slip",
    "tin_canning",
];

/// Cause IDs every rule base must define (it may add more).
pub const CAUSE_IDS: [&str; 21] = [
    "tension_too_high",
    "tension_too_low",
    "taper_missing",
    "taper_excessive",
    "tension_upset",
    "nip_load_too_high",
    "nip_load_too_low",
    "air_entrainment",
    "low_web_friction",
    "core_too_weak",
    "core_too_soft",
    "loose_start",
    "caliper_variation",
    "moisture_temperature_change",
    "build_ratio_too_large",
    "handling_damage",
    "storage_stress",
    "acceleration_torque",
    "web_misalignment",
    "tacky_web",
    "winding_too_hot",
];

/// Where on the roll a symptom is seen (the IDs of [`Place`]).
pub const PLACES: [&str; 5] = ["core", "body", "outside", "edges", "whole_roll"];

/// A closed list of words with stable IDs: an enum, its IDs in order, and the spellings also
/// accepted when reading (`aluminum`, `center`). Serialised as the ID.
macro_rules! word_list {
    ($(#[$meta:meta])* $name:ident { $($(#[$vmeta:meta])* $variant:ident = $id:literal $(| $alias:literal)*),+ $(,)? }) => {
        $(#[$meta])*
        #[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, serde::Serialize, serde::Deserialize)]
        pub enum $name {
            $($(#[$vmeta])* #[serde(rename = $id)] $variant),+
        }

        impl $name {
            /// Every value, in the documented order.
            pub const ALL: &'static [$name] = &[$($name::$variant),+];
            /// The IDs, in the same order.
            pub const IDS: &'static [&'static str] = &[$($id),+];

            /// The stable ID, as written in case and rule files.
            pub fn id(self) -> &'static str {
                match self {
                    $($name::$variant => $id),+
                }
            }

            /// The value for an ID or one of its accepted spellings.
            pub fn from_id(word: &str) -> Option<$name> {
                match word {
                    $($id $(| $alias)* => Some($name::$variant),)+
                    _ => None,
                }
            }
        }

        impl std::fmt::Display for $name {
            fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
                f.write_str(self.id())
            }
        }
    };
}

word_list! {
    /// Kind of web material (`web.material`); picks the default preset and the density.
    WebMaterial {
        Paper = "paper",
        Board = "board",
        Film = "film",
        Foil = "foil",
        Nonwoven = "nonwoven",
        Laminate = "laminate",
    }
}

word_list! {
    /// Core material (`core.material`); `rigid` means an infinitely stiff core.
    CoreMaterial {
        Paper = "paper",
        Steel = "steel",
        Aluminium = "aluminium" | "aluminum",
        Plastic = "plastic",
        Rigid = "rigid",
    }
}

word_list! {
    /// Form of the tension taper in a case file (`winding.taper.kind`).
    TaperKind {
        None = "none",
        Linear = "linear",
        Hyperbolic = "hyperbolic",
        Steps = "steps",
        Programme = "programme",
    }
}

word_list! {
    /// Law of the radial stiffness of the wound stack (`web.radial_stiffness.law`).
    RadialLaw {
        Pfeiffer = "pfeiffer",
        Constant = "constant",
        PowerLaw = "power_law",
    }
}

word_list! {
    /// Where on the roll a symptom is seen (`symptoms[].where`).
    Place {
        Core = "core",
        Body = "body",
        Outside = "outside",
        Edges = "edges",
        WholeRoll = "whole_roll",
    }
}

/// IDs of the winding methods, in the documented order (the model owns the list).
pub const WINDING_METHOD_IDS: &[&str] = &crate::model::WindingMethod::IDS;

impl crate::model::WindingMethod {
    /// The method for an ID or one of its accepted spellings (`center`, `centre-surface`).
    pub fn from_id(word: &str) -> Option<crate::model::WindingMethod> {
        use crate::model::WindingMethod;
        match word {
            "centre" | "center" => Some(WindingMethod::Centre),
            "gap" => Some(WindingMethod::Gap),
            "surface" => Some(WindingMethod::Surface),
            "two_drum" | "two-drum" => Some(WindingMethod::TwoDrum),
            "centre_surface" | "center_surface" | "centre-surface" | "center-surface" => {
                Some(WindingMethod::CentreSurface)
            }
            _ => None,
        }
    }
}

/// True when `id` is a known symptom ID.
pub fn is_symptom(id: &str) -> bool {
    SYMPTOM_IDS.contains(&id)
}

/// The closest candidate to `given` by Jaro–Winkler similarity, if any is reasonably close.
/// Used for every "did you mean" in error messages.
pub fn closest<'a, I>(given: &str, candidates: I) -> Option<&'a str>
where
    I: IntoIterator<Item = &'a str>,
{
    let mut best: Option<(&str, f64)> = None;
    for candidate in candidates {
        let score = strsim::jaro_winkler(&given.to_lowercase(), &candidate.to_lowercase());
        if best.is_none_or(|(_, b)| score > b) {
            best = Some((candidate, score));
        }
    }
    best.filter(|(_, score)| *score >= 0.7).map(|(c, _)| c)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn word_lists_round_trip_their_ids() {
        for m in WebMaterial::ALL {
            assert_eq!(WebMaterial::from_id(m.id()), Some(*m));
        }
        assert_eq!(
            CoreMaterial::from_id("aluminum"),
            Some(CoreMaterial::Aluminium)
        );
        assert_eq!(Place::IDS, PLACES.as_slice());
        for m in WINDING_METHOD_IDS {
            assert_eq!(
                crate::model::WindingMethod::from_id(m).map(|m| m.id()),
                Some(*m)
            );
        }
    }

    #[test]
    fn closest_suggests_near_misses() {
        assert_eq!(closest("telescopng", SYMPTOM_IDS), Some("telescoping"));
        assert_eq!(closest("zzzzzz", SYMPTOM_IDS), None);
    }
}
