//! Integration tests of training walkthroughs.
//!
//! One test binary per area (each module a former stand-alone test file), so the crate is
//! linked once per area instead of once per file. See DEVELOPERS.md, "Tests".

mod measured;
mod walkthroughs;
