//! Integration tests of diagnosis: the rule base (lint and consistency), scenario tables, ranking properties,
//! the Markdown output and the `diagnose` command.
//!
//! One test binary per area (each module a former stand-alone test file), so the crate is
//! linked once per area instead of once per file. See DEVELOPERS.md, "Tests".

mod common;
#[path = "../shared/fixtures.rs"]
mod fixtures;

mod cli;
mod core_levers;
mod evidence_compare;
mod evidence_units;
mod field_scenarios;
mod markdown;
mod properties;
mod rule_text_units;
mod rules_consistency;
mod rules_lint;
mod scenario_table;
mod scenarios;
mod sensitivity;
mod what_if_margins;
