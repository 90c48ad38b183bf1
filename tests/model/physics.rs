//! Trade facts about wound rolls (common practice: what winders observe and every published
//! winding model reproduces), handbook checks of the core and air-film formulas, and profile
//! helpers.

use crate::model_support;

use model_support::{roll, soft_paper, stiff_film};
use rolltriage::model::{
    CoreStiffness, ZoneName,
    schedule::{Taper, UpsetBand},
    solve,
    wound_in::{AIR_VISCOSITY, air_film_thickness},
};

fn paper_on(core: CoreStiffness) -> rolltriage::model::WindingProblem {
    roll(0.0508, 76e-6, 1200, 5.0e9, 5.0e3, 50.0, 350.0, core)
}

#[test]
fn pressure_is_zero_outside_and_rises_toward_a_stiff_core() {
    // common practice: constant tension on a stiff core gives a pressure that is zero at the
    // outside and rises toward the core.
    for problem in [soft_paper(1200), stiff_film(1500)] {
        let p = solve(&problem).unwrap();
        let n = p.pressure.len();
        assert_eq!(p.pressure[n - 1], 0.0);
        let at = |f: f64| p.pressure[((n - 1) as f64 * f) as usize];
        assert!(p.pressure[0] > at(0.5) && at(0.5) > at(0.95) && at(0.95) > 0.0);
        assert_eq!(p.summary.peak_pressure, p.pressure[0]);
    }
}

#[test]
fn outer_wrap_carries_the_wound_in_stress_and_turns_compressive_beneath() {
    // common practice (Hakiel 1987 profiles): the outermost wrap is at the wound-in stress and
    // wraps further in lose hoop tension as later wraps compress them, until it turns
    // compressive. The model puts the zero crossing of this soft web ~290 wraps (~22 mm, 24 % of
    // the build) beneath the surface, not within a few wraps.
    let problem = soft_paper(1200);
    let p = solve(&problem).unwrap();
    let n = p.tangential_stress.len();
    let wound_in_stress = 350.0 / 76e-6;
    assert!((p.tangential_stress[n - 1] - wound_in_stress).abs() < 1e-6 * wound_in_stress);
    assert!((p.tangential_stress[n - 2] - wound_in_stress).abs() < 1e-6 * wound_in_stress);
    let first_compressive = (0..n)
        .rev()
        .find(|&i| p.tangential_stress[i] < 0.0)
        .unwrap();
    let depth = n - 1 - first_compressive;
    eprintln!("compressive {depth} wraps below the surface");
    assert!(
        depth > 10 && (depth as f64) < 0.3 * n as f64,
        "{depth} wraps"
    );
    // Hoop stress falls monotonically over the outer wraps.
    for i in (n - 100)..(n - 1) {
        assert!(p.tangential_stress[i] <= p.tangential_stress[i + 1] + 1e-9);
    }
    // The surface zone is exactly the outer tensile wraps.
    let surface = p.zone(ZoneName::Surface).unwrap();
    assert!(
        p.tangential_stress[surface.start..surface.end]
            .iter()
            .all(|&s| s > 0.0)
    );
    // It ends where the hoop stress turns compressive or at its depth cap (zone_cuts).
    let cap = rolltriage::model::profile::zone_cuts::SURFACE_MAX_DEPTH;
    assert!(
        p.tangential_stress[surface.start - 1] <= 0.0
            || p.build_fraction(surface.start - 1) < 1.0 - cap
    );
}

#[test]
fn a_softer_core_lowers_core_pressure() {
    // common practice; the core stiffness enters through the Lamé cylinder (Roark's Formulas).
    let rigid = solve(&paper_on(CoreStiffness::Rigid))
        .unwrap()
        .summary
        .core_pressure;
    let hollow = |modulus: f64| CoreStiffness::Hollow {
        inner_radius: 0.0381,
        outer_radius: 0.0508,
        modulus,
        poisson_ratio: 0.3,
    };
    let stiff = solve(&paper_on(hollow(10e9)))
        .unwrap()
        .summary
        .core_pressure;
    let soft = solve(&paper_on(hollow(1e9))).unwrap().summary.core_pressure;
    assert!(rigid > stiff && stiff > soft, "{rigid} {stiff} {soft}");
}

#[test]
fn lame_core_check_value() {
    // Lamé thick-walled cylinder under external pressure (Roark's Formulas for Stress and
    // Strain, thick-walled cylinders): a = 38.1 mm, b = 50.8 mm, ν = 0.3 → Ec = 0.30568·E.
    let core = CoreStiffness::Hollow {
        inner_radius: 0.0381,
        outer_radius: 0.0508,
        modulus: 2.0e9,
        poisson_ratio: 0.3,
    };
    assert!((core.effective_stiffness() / 2.0e9 - 0.30568).abs() < 5e-6);
}

#[test]
fn taper_lowers_core_pressure() {
    // common practice: taper tension is the usual remedy for crushed cores and starring.
    let mut base = stiff_film(1500);
    let flat = solve(&base).unwrap().summary.core_pressure;
    base.winding.tension.taper = Taper::Linear { fraction: 0.3 };
    let linear = solve(&base).unwrap().summary.core_pressure;
    base.winding.tension.taper = Taper::Hyperbolic { fraction: 0.5 };
    let hyperbolic = solve(&base).unwrap().summary.core_pressure;
    assert!(
        linear < flat && hyperbolic < flat,
        "{flat} {linear} {hyperbolic}"
    );
}

#[test]
fn a_high_tension_upset_leaves_compressive_hoop_stress_just_inside_it() {
    // common practice: a tension spike compresses the wraps wound just before it.
    let mut problem = paper_on(CoreStiffness::Rigid);
    let from = 0.0508 + 800.0 * 76e-6;
    problem.winding.tension.upsets.push(UpsetBand {
        from_radius: from,
        to_radius: from + 20.0 * 76e-6,
        tension: 900.0,
    });
    let with_upset = solve(&problem).unwrap();
    problem.winding.tension.upsets.clear();
    let without = solve(&problem).unwrap();
    // The 30 wraps just inside the band.
    let inside = |p: &rolltriage::model::Profile| {
        (0..p.radius.len())
            .filter(|&i| p.radius[i] < from && p.radius[i] > from - 30.0 * 76e-6)
            .map(|i| p.tangential_stress[i])
            .fold(f64::INFINITY, f64::min)
    };
    let a = inside(&with_upset);
    let b = inside(&without);
    eprintln!("min σθ just inside: {a} with the upset, {b} without");
    assert!(a < 0.0 && a < b);
}

#[test]
fn nip_adds_tension_and_core_pressure() {
    // Nip-induced tension μ·N (Good, Wu & Fikes, J. Appl. Mech. 61, 1994).
    let mut problem = stiff_film(1000);
    let bare = solve(&problem).unwrap().summary.core_pressure;
    problem.winding.nip_load = Some(500.0);
    let nipped = solve(&problem).unwrap();
    assert!(nipped.summary.core_pressure > bare);
    let outer_wit = *nipped.wound_in_tension.last().unwrap();
    assert!((outer_wit - (175.0 + 0.3 * 500.0)).abs() < 1e-9);
}

#[test]
fn knox_sweeney_air_film_check_value() {
    // Knox & Sweeney (1971): R = 0.1 m, V = 5 m/s, T = 200 N/m, μ = 1.8e-5 Pa·s → 19.8 µm.
    let h0 = air_film_thickness(0.1, 5.0, 200.0, 1.8e-5);
    assert!((h0 - 19.8e-6).abs() < 0.05e-6, "{h0}");
    assert_eq!(AIR_VISCOSITY, 1.8e-5);
}

#[test]
fn fast_unnipped_winding_warns_about_air() {
    let mut problem = stiff_film(500);
    problem.winding.speed = 10.0;
    problem.winding.combined_roughness = 0.2e-6;
    let p = solve(&problem).unwrap();
    assert!(p.warnings.iter().any(|w| w.contains("entrained air")));
    let (start, _) = p.air_film.unwrap();
    assert!(start.ratio_to_roughness > 1.0 && !start.reduced_by_nip);
    problem.winding.nip_load = Some(300.0);
    let p = solve(&problem).unwrap();
    assert!(!p.warnings.iter().any(|w| w.contains("entrained air")));
}

#[test]
fn zones_cover_the_roll_in_order_and_helpers_answer() {
    let p = solve(&soft_paper(1200)).unwrap();
    let mut next = 0;
    for name in ZoneName::ALL {
        let z = p.zone(name).unwrap();
        assert_eq!(z.start, next);
        next = z.end;
    }
    assert_eq!(next, p.radius.len());
    let core = p.zone_pressure(ZoneName::Core).unwrap();
    assert!(core.min <= core.mean && core.mean <= core.max);
    assert_eq!(core.max, p.summary.core_pressure);
    let (s, r) = p.most_compressive_tangential().unwrap();
    assert_eq!(s, p.summary.min_tangential_stress);
    assert!(r > p.radius[0]);
    let band = p.compressive_band(None).unwrap();
    assert!(band.fraction_of_build > 0.0 && band.wraps > 1.0);
    assert!(p.core_radial_strain() > 0.0);
    // Downsampling keeps the key points.
    let small = p.downsampled(100);
    assert!(small.radius.len() <= 100);
    assert_eq!(small.pressure[0], p.pressure[0]);
    assert_eq!(*small.pressure.last().unwrap(), 0.0);
    assert!(
        small
            .tangential_stress
            .contains(&p.summary.min_tangential_stress)
    );
}

#[test]
fn bad_inputs_are_typed_errors() {
    let mut problem = soft_paper(100);
    problem.thickness = -1.0;
    assert!(solve(&problem).is_err());
    let mut problem = soft_paper(100);
    problem.outer_radius = problem.core_radius;
    assert!(solve(&problem).is_err());
    let mut problem = soft_paper(100);
    problem.winding.tension.start_tension = f64::NAN;
    assert!(solve(&problem).is_err());
}

#[test]
fn power_law_and_constant_stiffness_solve_consistently() {
    use rolltriage::model::{ModulusUpdate, RadialStiffness};
    // A power law Er = C·P^n with n → 0 is the constant law Er = C.
    let mut problem = stiff_film(600);
    problem.radial_stiffness = RadialStiffness::Constant { modulus: 5e7 };
    let constant = solve(&problem).unwrap().summary.core_pressure;
    problem.radial_stiffness = RadialStiffness::PowerLaw {
        coefficient: 5e7,
        exponent: 0.0,
    };
    let power = solve(&problem).unwrap().summary.core_pressure;
    assert!((power - constant).abs() < 1e-9 * constant);
    // A stiffening power law: every modulus update gives a positive, finite profile close to the
    // secant one.
    problem.radial_stiffness = RadialStiffness::PowerLaw {
        coefficient: 2e4,
        exponent: 0.6,
    };
    let mut results = Vec::new();
    for update in [
        ModulusUpdate::Explicit,
        ModulusUpdate::Iterated,
        ModulusUpdate::Secant,
    ] {
        problem.options.modulus_update = update;
        let p = solve(&problem).unwrap();
        assert!(p.pressure.iter().all(|&x| x.is_finite() && x >= 0.0));
        results.push(p.summary.core_pressure);
    }
    assert!((results[1] - results[2]).abs() < 0.01 * results[2]);
}
