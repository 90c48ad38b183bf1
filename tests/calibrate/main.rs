//! Integration tests of stack-test calibration: the fit against SciPy, the library, bad data and the
//! `calibrate` command.
//!
//! One test binary per area (each module a former stand-alone test file), so the crate is
//! linked once per area instead of once per file. See DEVELOPERS.md, "Tests".

mod bad_data;
mod cli;
mod fit;
mod library;
mod spreadsheet_csv;
