//! Integration tests of taper design: the library and the `taper` command.
//!
//! One test binary per area (each module a former stand-alone test file), so the crate is
//! linked once per area instead of once per file. See DEVELOPERS.md, "Tests".

mod blame;
mod budget;
mod cli;
mod design;
#[path = "../shared/fixtures.rs"]
mod fixtures;
mod programme;
