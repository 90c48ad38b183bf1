//! Integration tests of the case file: parsing, resolving, the bad-input corpus, the demo cases, unit
//! conversions, the `case` commands and the README's promises.
//!
//! One test binary per area (each module a former stand-alone test file), so the crate is
//! linked once per area instead of once per file. See DEVELOPERS.md, "Tests".

mod bad_inputs;
mod case_file;
mod cli;
mod cli_output;
mod demo_cases;
mod readme;
mod typed_input;
mod units;
