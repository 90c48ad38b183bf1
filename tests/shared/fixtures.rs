//! Fixtures shared by several test areas, included with
//! `#[path = "../shared/fixtures.rs"] mod fixtures;` in the area's `main.rs`: the one place a
//! test spells out every field of the resolved winding settings, so a new winder input is added
//! here once instead of in every hand-built case.

use rolltriage::case::ResolvedWinding;
use rolltriage::model::{Taper, TensionSchedule, WindingMethod};

/// Winding settings with the method, start tension (N/m), taper, nip load (N/m) and speed (m/s)
/// given and every other input (programme, torque, drums, temperature, event times) not given.
pub fn winding(
    method: WindingMethod,
    start_tension: f64,
    taper: Taper,
    nip_load: Option<f64>,
    speed: f64,
) -> ResolvedWinding {
    ResolvedWinding {
        method,
        tension: TensionSchedule {
            start_tension,
            taper,
            upsets: vec![],
        },
        nip_load,
        nip_programme: None,
        nip_plateau: rolltriage::model::winder::NIP_MODEL_LIMIT,
        centre_torque: None,
        drums: None,
        speed,
        temperature: None,
        acceleration_time: None,
        recipe_tension: None,
        stop_time: None,
        emergency_stop_time: None,
        unwind_tension: None,
        handling_shock_factor: None,
    }
}
