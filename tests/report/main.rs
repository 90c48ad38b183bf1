//! Integration tests of reports: rendering (Markdown, JSON) and the demo cases end to end.
//!
//! One test binary per area (each module a former stand-alone test file), so the crate is
//! linked once per area instead of once per file. See DEVELOPERS.md, "Tests".

mod demo;
mod estimate;
#[path = "../shared/fixtures.rs"]
mod fixtures;
mod measured_plot;
mod render;
