//! rolltriage — diagnose wound-roll defects from the stress state inside the roll.
//!
//! Flow: `symptoms + approximate roll inputs → wound-roll stress profile → zone indicators →
//! ranked causes with evidence → one merged remedy list (+ cautions)`.
//!
//! Dependency direction: `tui`, `report`, `training`, `taper_design` → `diagnose` → `model` → `units`.
//! `model` never imports `diagnose`; only `tui` imports ratatui/crossterm.

pub mod calibrate;
pub mod case;
pub mod complaint;
pub mod diagnose;
pub mod evidence;
pub mod finite;
pub mod fsutil;
pub mod history;
pub mod mechanics;
pub mod model;
pub mod presets;
pub mod report;
pub mod signals;
pub mod taper_design;
pub mod training;
pub mod tui;
pub mod units;
pub mod usual_tension;
pub mod vocabulary;
