//! Integration tests of the complaint history: the store through the library (SQLite), the
//! `history` commands, and the same behaviour on PostgreSQL when ROLLTRIAGE_TEST_PG is set.
//!
//! One test binary per area (each module a former stand-alone test file), so the crate is
//! linked once per area instead of once per file. See DEVELOPERS.md, "Tests".

mod cli;
mod pg;
mod report;
mod store;
