//! Integration tests of the terminal UI: app state driven by keys, the solve job, screen snapshots and the tmux
//! smoke scripts.
//!
//! One test binary per area (each module a former stand-alone test file), so the crate is
//! linked once per area instead of once per file. See DEVELOPERS.md, "Tests".

#[path = "../shared/fixtures.rs"]
mod fixtures;
mod tui_support;

mod job;
mod margins;
mod measure;
mod numbering;
mod operator;
mod plot_labels;
mod screens;
mod smoke;
mod state;
mod story_history;
mod wrap;
