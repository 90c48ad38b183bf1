//! The shipped walk-throughs and demo cases, embedded in the binary so `rolltriage train` works
//! from any folder. The files live in `cases/` and `cases/training/`.

use super::{LoadedWalkthrough, TrainingError, Walkthrough};

macro_rules! embed {
    ($($name:literal),* $(,)?) => {
        [$(($name, include_str!(concat!("../../cases/", $name)))),*]
    };
}

/// Demo case files by file name.
pub const DEMO_CASES: [(&str, &str); 17] = embed![
    "harbour_newsprint_telescoping.yaml",
    "harbour_newsprint_bursts.yaml",
    "harbour_newsprint_out_of_round.yaml",
    "harbour_coated_crushed_core.yaml",
    "harbour_coated_starring_no_taper.yaml",
    "harbour_kraft_telescoping_air.yaml",
    "harbour_bopp_starring.yaml",
    "harbour_bopp_wrinkles.yaml",
    "harbour_pet_cinching.yaml",
    "harbour_ldpe_gauge_bands.yaml",
    "harbour_cpp_blocking.yaml",
    "harbour_foil_core_slip.yaml",
    "harbour_foil_tin_canning.yaml",
    "harbour_spunbond_soft_roll.yaml",
    "harbour_spunbond_bulk_loss.yaml",
    "harbour_spunlace_dishing.yaml",
    "harbour_newsprint_soft_measured.yaml",
];

/// Shipped walk-through files by file name (under `cases/training/`).
pub const WALKTHROUGHS: [(&str, &str); 10] = embed![
    "training/telescoping_newsprint.yaml",
    "training/crushed_core_coated.yaml",
    "training/starring_after_restart.yaml",
    "training/wrinkles_air_film.yaml",
    "training/tin_canning_soft_core.yaml",
    "training/bulk_loss_jumbo.yaml",
    "training/cinching_steep_taper.yaml",
    "training/bursts_hard_winding.yaml",
    "training/core_slip_fast_ramp.yaml",
    "training/soft_roll_measured.yaml",
];

/// The text of a shipped demo case, by file name (a leading `cases/` is ignored).
pub fn demo_case(name: &str) -> Option<&'static str> {
    let name = name.strip_prefix("cases/").unwrap_or(name);
    DEMO_CASES
        .iter()
        .find(|(n, _)| *n == name)
        .map(|(_, text)| *text)
}

/// The shipped walk-throughs, parsed.
pub fn embedded() -> Result<Vec<LoadedWalkthrough>, TrainingError> {
    WALKTHROUGHS
        .iter()
        .map(|(name, text)| {
            Walkthrough::from_yaml_str(text, &format!("cases/{name}")).map(|walkthrough| {
                LoadedWalkthrough {
                    walkthrough,
                    path: None,
                }
            })
        })
        .collect()
}
