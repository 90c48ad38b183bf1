//! Entrained air between the incoming web and the roll: the foil-bearing film estimate, how a
//! nip reduces it, and how much friction (traction) is left at a given film.
//!
//! * Film: Knox & Sweeney, Ind. Eng. Chem. Process Des. Dev. 10(2):201, 1971 (foil bearing,
//!   impermeable web, no side leakage).
//! * Traction: Ducotey & Good, J. Tribol. 121:618, 1999 — minimal traction once the air film is
//!   more than about three combined RMS roughnesses of the two surfaces in contact. Between no
//!   film and that height we take the available friction to fall linearly (our reading of the
//!   criterion; the paper's own traction curve is not reproduced here).
//! * Nip: Forrest (air entrainment in film winding with lay-on rolls) shows that under a nip the
//!   contact pressure is shared between the surface roughness and the compressed air, which
//!   re-expands after the nip: a nip reduces the film, it does not remove it. We take the film
//!   behind a nip as the smaller of the free film and one combined roughness — an order-of-
//!   magnitude reading of that finding, not Forrest's procedure.
//! * Permeable webs (paper, board, nonwovens) bleed air through the sheet, which Ducotey & Good
//!   model with a permeability term. No permeability is asked for here, so the impermeable
//!   estimate is used for every web: for permeable webs the film (and the air risk) is
//!   overstated, and a warning says so.

/// Dynamic viscosity of air near 20 °C (Pa·s), a handbook value (from memory: 1.81e-5).
pub const AIR_VISCOSITY: f64 = 1.8e-5;

/// Film height, in combined RMS roughnesses, at which traction is minimal (Ducotey & Good 1999).
pub const TRACTION_LOSS_RATIO: f64 = 3.0;

/// Film height, in combined RMS roughnesses, above which a warning says traction is reduced.
/// At one roughness our linear reading leaves two thirds of the dry friction.
pub const TRACTION_WARNING_RATIO: f64 = 1.0;

/// Largest film behind a nip, in combined RMS roughnesses (see the module notes on Forrest).
pub const NIP_FILM_RATIO: f64 = 1.0;

/// Entrained-air film estimate at one radius.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct AirFilm {
    /// Film under the wrap being wound (m): the free foil-bearing film, reduced by the nip when
    /// there is one. This is the figure rules, reports and warnings use.
    pub thickness: f64,
    /// Foil-bearing film without a nip (m).
    pub free_thickness: f64,
    /// `thickness` divided by the combined roughness.
    pub ratio_to_roughness: f64,
    /// Share of the dry web-to-web friction still available at this film (1 = full traction,
    /// 0 = the layer floats), after Ducotey & Good (1999).
    pub traction: f64,
    /// True when a nip bears on the roll and reduced the film.
    pub reduced_by_nip: bool,
}

/// Foil-bearing estimate of the entrained-air film (Knox & Sweeney 1971):
/// h0 = 0.643·R·(12·μ_air·V/T)^(2/3), R roll radius (m), V speed (m/s), T web tension (N/m).
/// Returns 0 for zero speed; infinite for zero tension.
pub fn air_film_thickness(radius: f64, speed: f64, tension: f64, viscosity: f64) -> f64 {
    if speed <= 0.0 || radius <= 0.0 {
        return 0.0;
    }
    if tension <= 0.0 {
        return f64::INFINITY;
    }
    0.643 * radius * (12.0 * viscosity * speed / tension).powf(2.0 / 3.0)
}

/// Share of the dry friction available at a film of `ratio` combined roughnesses: 1 at no film,
/// falling linearly to 0 at [`TRACTION_LOSS_RATIO`] (Ducotey & Good 1999, our linear reading).
pub fn traction_share(ratio: f64) -> f64 {
    if ratio.is_nan() {
        return 0.0;
    }
    (1.0 - ratio / TRACTION_LOSS_RATIO).clamp(0.0, 1.0)
}

/// The air film at `radius` for web tension `tension` (N/m), speed `speed` (m/s), combined RMS
/// roughness `roughness` (m), with or without a nip.
pub fn film_at(radius: f64, speed: f64, tension: f64, roughness: f64, nip: bool) -> AirFilm {
    let free = air_film_thickness(radius, speed, tension, AIR_VISCOSITY);
    let thickness = if nip {
        free.min(NIP_FILM_RATIO * roughness)
    } else {
        free
    };
    let ratio = if roughness > 0.0 {
        thickness / roughness
    } else if thickness > 0.0 {
        f64::INFINITY
    } else {
        0.0
    };
    AirFilm {
        thickness,
        free_thickness: free,
        ratio_to_roughness: ratio,
        traction: traction_share(ratio),
        reduced_by_nip: nip && thickness < free,
    }
}

/// A warning for a film that costs traction, naming where on the roll it is; `None` when the
/// film is at or below [`TRACTION_WARNING_RATIO`] roughnesses.
pub fn film_warning(place: &str, film: &AirFilm) -> Option<String> {
    if film.ratio_to_roughness <= TRACTION_WARNING_RATIO {
        return None;
    }
    let microns = film.thickness * 1e6;
    Some(if film.traction <= 0.0 {
        format!(
            "entrained air: the estimated air film at the {place} ({microns:.1} µm) is more than \
             three times the combined roughness; the layers float and friction is mostly lost"
        )
    } else {
        format!(
            "entrained air: the estimated air film at the {place} ({microns:.1} µm) exceeds the \
             combined roughness; about {:.0} % of the layer-to-layer friction is left",
            100.0 * film.traction
        )
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn knox_sweeney_check_value() {
        // Knox & Sweeney (1971) foil bearing: R = 0.1 m, V = 5 m/s, T = 200 N/m,
        // μ = 1.8e-5 Pa·s → h0 = 0.643·0.1·(5.4e-6)^(2/3) ≈ 19.8 µm.
        let h0 = air_film_thickness(0.1, 5.0, 200.0, 1.8e-5);
        assert!((h0 - 19.8e-6).abs() < 0.05e-6, "h0 = {h0}");
    }

    #[test]
    fn traction_is_minimal_from_three_roughnesses() {
        // Ducotey & Good (1999): minimal traction once the film exceeds about 3 σ.
        assert_eq!(traction_share(0.0), 1.0);
        assert_eq!(traction_share(3.0), 0.0);
        assert_eq!(traction_share(10.0), 0.0);
        assert!((traction_share(1.5) - 0.5).abs() < 1e-12);
    }

    #[test]
    fn a_nip_reduces_the_film_but_does_not_remove_it() {
        let free = film_at(0.3, 10.0, 200.0, 2e-6, false);
        let nipped = film_at(0.3, 10.0, 200.0, 2e-6, true);
        assert!(free.ratio_to_roughness > 3.0);
        assert!(nipped.thickness > 0.0 && nipped.thickness < free.thickness);
        assert!(nipped.reduced_by_nip && nipped.traction > 0.0);
        assert!(film_warning("outside", &free).is_some());
        assert!(film_warning("outside", &nipped).is_none());
    }
}
