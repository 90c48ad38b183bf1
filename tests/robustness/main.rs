//! Integration tests of hardening reproducers (tests/hardening/ data) and the seeded mutation harness.
//!
//! One test binary per area (each module a former stand-alone test file), so the crate is
//! linked once per area instead of once per file. See DEVELOPERS.md, "Tests".

#[path = "../shared/fixtures.rs"]
mod fixtures;
#[path = "../tui/tui_support.rs"]
mod tui_support;

mod cli;
mod csv;
mod limits;
mod mutation;
mod output;
mod save;
mod support;
mod tui;
mod write_case;
