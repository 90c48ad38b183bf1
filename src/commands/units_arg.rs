//! The `--units` option shared by the subcommands that print quantities: one clap value list
//! (`si`, `us`) and its mapping to the library's [`UnitSystem`].

use rolltriage::units::UnitSystem;

/// Units to print in: SI, or the US trade units (pli, mil, fpm, psi, in).
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum UnitsArg {
    Si,
    Us,
}

impl UnitsArg {
    /// The library's unit system for this choice.
    pub fn system(self) -> UnitSystem {
        match self {
            UnitsArg::Si => UnitSystem::Si,
            UnitsArg::Us => UnitSystem::Us,
        }
    }
}
