//! Integration tests of the winding mechanics: closed forms, SciPy reference solves, numerics, physics trends,
//! invariants and the `stress` command.
//!
//! One test binary per area (each module a former stand-alone test file), so the crate is
//! linked once per area instead of once per file. See DEVELOPERS.md, "Tests".

mod model_support;

mod cli;
mod closed_form;
mod evidence_fit;
mod hoop;
mod numerics;
mod physics;
mod properties;
mod reference_scipy;
mod winder;
mod winder_properties;
