//! Shared helpers of the diagnosis tests: invented scenario cases built directly in Rust (so the
//! tests do not depend on the case-file parser) and a profile source.
//!
//! `profile()` and [`SOLVER`] use the crate's solver at about 200 elements. A small stand-alone
//! Hakiel solver below (Hakiel, TAPPI J. 70(5), 1987: r²·p'' + 3r·p' + (1 − Eθ/Er)·p = 0 per
//! added element, Pfeiffer radial law, elastic core boundary r·p' = p·(Eθ/Ec − 1 + ν) at the
//! core) gives the fast profiles of the property sweeps.
#![allow(dead_code)]

use std::collections::BTreeMap;

use rolltriage::case::{
    ObservedSymptom, ResolvedCase, ResolvedCore, ResolvedRoll, ResolvedWeb, ResolvedWinding,
};
use rolltriage::model::{
    CoreStiffness, Grid, ModelError, Profile, ProfileSummary, RadialStiffness, Resolution,
    SolverOptions, SolverStats, Taper, TensionSchedule, UpsetBand, WindingMethod, WindingProblem,
    Zone, ZoneName,
};

/// Newsprint-like paper, 45 g/m², 75 µm; values typical of the grade (from memory).
pub fn newsprint(title: &str) -> ResolvedCase {
    ResolvedCase {
        title: title.to_string(),
        web: ResolvedWeb {
            preset: None,
            material: rolltriage::vocabulary::WebMaterial::Paper,
            thickness: 75e-6,
            width: 1.6,
            tangential_modulus: 4.0e9,
            radial_stiffness: RadialStiffness::Pfeiffer {
                k1: 5.0e3,
                k2: 60.0,
            },
            poisson_ratio: 0.01,
            friction: 0.4,
            kinetic_friction: 0.4,
            density: 1000.0,
            roughness: 3.0e-6,
            // ~2.7 kN/m machine-direction tensile strength (tensile index ~60 N·m/g × 45 g/m², from memory).
            strength: 2700.0,
        },
        core: paper_core(0.0762, 0.1016, 2.0e9, 2.5e6),
        roll: ResolvedRoll {
            outer_diameter: 1.0,
            length: 0.0,
        },
        winding: ResolvedWinding {
            method: WindingMethod::Centre,
            tension: TensionSchedule {
                start_tension: 350.0,
                taper: Taper::Linear { fraction: 0.2 },
                upsets: vec![],
            },
            nip_load: Some(350.0),
            nip_programme: None,
            nip_plateau: rolltriage::model::winder::NIP_MODEL_LIMIT,
            centre_torque: None,
            drums: None,
            speed: 15.0,
            temperature: None,
            acceleration_time: None,
            stop_time: None,
            emergency_stop_time: None,
            unwind_tension: None,
        },
        symptoms: vec![],
        answers: BTreeMap::new(),
        assumed: vec![],
    }
}

/// Biaxially oriented PET film, 23 µm; typical values (from memory).
pub fn pet_film(title: &str) -> ResolvedCase {
    ResolvedCase {
        title: title.to_string(),
        web: ResolvedWeb {
            preset: None,
            material: rolltriage::vocabulary::WebMaterial::Film,
            thickness: 23e-6,
            width: 1.2,
            tangential_modulus: 4.5e9,
            radial_stiffness: RadialStiffness::Pfeiffer {
                k1: 30.0e3,
                k2: 120.0,
            },
            poisson_ratio: 0.01,
            friction: 0.35,
            kinetic_friction: 0.35,
            density: 1000.0,
            roughness: 0.05e-6,
            // ~200 MPa × 23 µm ≈ 4.6 kN/m (from memory).
            strength: 4600.0,
        },
        core: paper_core(0.1524, 0.1778, 3.0e9, 3.0e6),
        roll: ResolvedRoll {
            outer_diameter: 0.6,
            length: 0.0,
        },
        winding: ResolvedWinding {
            method: WindingMethod::Centre,
            tension: TensionSchedule {
                start_tension: 120.0,
                taper: Taper::Linear { fraction: 0.25 },
                upsets: vec![],
            },
            nip_load: Some(350.0),
            nip_programme: None,
            nip_plateau: rolltriage::model::winder::NIP_MODEL_LIMIT,
            centre_torque: None,
            drums: None,
            speed: 4.0,
            temperature: Some(25.0),
            acceleration_time: None,
            stop_time: None,
            emergency_stop_time: None,
            unwind_tension: None,
        },
        symptoms: vec![],
        answers: BTreeMap::new(),
        assumed: vec![],
    }
}

/// A paper core, diameters in m, wall modulus and rated crush pressure in Pa.
pub fn paper_core(inside: f64, outside: f64, modulus: f64, crush: f64) -> ResolvedCore {
    ResolvedCore {
        preset: None,
        material: rolltriage::vocabulary::CoreMaterial::Paper,
        inside_diameter: inside,
        outside_diameter: outside,
        stiffness: CoreStiffness::Hollow {
            inner_radius: inside / 2.0,
            outer_radius: outside / 2.0,
            modulus,
            poisson_ratio: 0.3,
        },
        crush_pressure: crush,
        support: rolltriage::model::CoreSupport::Free,
        crush_basis: rolltriage::model::core_crush::CrushBasis::Given,
    }
}

pub fn with_symptoms(mut case: ResolvedCase, ids: &[&str]) -> ResolvedCase {
    case.symptoms = ids
        .iter()
        .map(|id| ObservedSymptom {
            id: id.to_string(),
            place: None,
            notes: None,
        })
        .collect();
    case
}

pub fn at(mut case: ResolvedCase, symptom: &str, place: &str) -> ResolvedCase {
    for s in case.symptoms.iter_mut().filter(|s| s.id == symptom) {
        s.place = Some(place.to_string());
    }
    case
}

pub fn answer(mut case: ResolvedCase, question: &str, value: &str) -> ResolvedCase {
    case.answers.insert(question.to_string(), value.to_string());
    case
}

pub fn upset(mut case: ResolvedCase, from_d: f64, to_d: f64, tension: f64) -> ResolvedCase {
    case.winding.tension.upsets.push(UpsetBand {
        from_radius: from_d / 2.0,
        to_radius: to_d / 2.0,
        tension,
    });
    case
}

/// Solver options of the diagnosis tests: about 200 elements instead of the automatic halving
/// keeps them quick (they also run in debug builds); the model's own grid policy picks the
/// layers per element.
pub const SOLVER: SolverOptions = SolverOptions {
    resolution: Resolution::Elements { count: 200 },
    modulus_update: rolltriage::model::ModulusUpdate::Secant,
};

/// The stress profile of a case: the crate's solver at [`SOLVER`].
pub fn profile(case: &ResolvedCase) -> Profile {
    rolltriage::model::solve(&case.problem(SOLVER)).expect("solve")
}

fn scheduled_tension(s: &TensionSchedule, rc: f64, ro: f64, r: f64) -> f64 {
    if let Some(u) = s
        .upsets
        .iter()
        .rev()
        .find(|u| r >= u.from_radius && r < u.to_radius)
    {
        return u.tension;
    }
    let t0 = s.start_tension;
    match &s.taper {
        Taper::None => t0,
        Taper::Linear { fraction } => t0 * (1.0 - fraction * (r - rc) / (ro - rc)),
        Taper::Hyperbolic { fraction } => t0 * (1.0 - fraction * (1.0 - rc / r)),
        Taper::Steps { steps } => steps
            .iter()
            .rfind(|st| st.radius <= r)
            .map(|st| st.tension)
            .unwrap_or(t0),
    }
}

fn strain_of(law: &RadialStiffness, p: f64) -> f64 {
    match *law {
        RadialStiffness::Pfeiffer { k1, k2 } => (1.0 + p.max(0.0) / k1).ln() / k2,
        RadialStiffness::Constant { modulus } => p / modulus,
        RadialStiffness::PowerLaw { .. } => 0.0,
    }
}

/// Secant radial modulus between pressures `p0` and `p1` (tangent when they coincide).
fn secant_modulus(law: &RadialStiffness, p0: f64, p1: f64) -> f64 {
    if p1 - p0 > 1e-9 * (1.0 + p0) {
        let de = strain_of(law, p1) - strain_of(law, p0);
        if de > 0.0 {
            return ((p1 - p0) / de).max(1.0);
        }
    }
    law.modulus_at(p0).max(1.0)
}

/// One accretion increment on nodes `0..=k` (node k is the new outer element).
fn solve_increment(
    radius: &[f64],
    er: &[f64],
    e_t: f64,
    core_term: f64,
    dr: f64,
    load: f64,
) -> Vec<f64> {
    let n = radius.len();
    let k = n - 1;
    let mut a = vec![0.0; n];
    let mut b = vec![0.0; n];
    let mut c = vec![0.0; n];
    let mut d = vec![0.0; n];
    for i in 0..k {
        let r = radius[i];
        let g2 = e_t / er[i];
        let lo = r * r / (dr * dr) - 3.0 * r / (2.0 * dr);
        let mid = -2.0 * r * r / (dr * dr) + (1.0 - g2);
        let hi = r * r / (dr * dr) + 3.0 * r / (2.0 * dr);
        if i == 0 {
            // Ghost node from r·p' = c·p: p(−1) = p(1) − 2·dr·c·p(0)/r.
            b[0] = mid - lo * 2.0 * dr * core_term / r;
            c[0] = hi + lo;
        } else {
            a[i] = lo;
            b[i] = mid;
            c[i] = hi;
        }
    }
    b[k] = 1.0;
    d[k] = load;
    for i in 1..n {
        let w = a[i] / b[i - 1];
        b[i] -= w * c[i - 1];
        d[i] -= w * d[i - 1];
    }
    let mut x = vec![0.0; n];
    x[n - 1] = d[n - 1] / b[n - 1];
    for i in (0..n - 1).rev() {
        x[i] = (d[i] - c[i] * x[i + 1]) / b[i];
    }
    x
}

/// Stand-alone grouped-layer Hakiel solve with `elements` elements (secant Er over each increment).
pub fn fallback_solve(problem: &WindingProblem, elements: usize) -> Profile {
    let rc = problem.core_radius;
    let ro = problem.outer_radius;
    let h = problem.thickness;
    let layers = ((ro - rc) / h).round().max(1.0) as usize;
    let m = elements.min(layers).max(2);
    let dr = (ro - rc) / m as f64;
    let layers_per = layers as f64 / m as f64;
    let e_t = problem.tangential_modulus;
    let nu = problem.poisson_ratio;
    let ec = problem.core.effective_stiffness();
    let core_term = if ec.is_finite() { e_t / ec } else { 0.0 } - 1.0 + nu;
    let friction = problem.winding.friction;
    let nip = problem.winding.nip_load.unwrap_or(0.0);
    let radius: Vec<f64> = (0..=m).map(|i| rc + i as f64 * dr).collect();
    let mut p = vec![0.0; m + 1];
    let mut sigma_t = vec![0.0; m + 1];
    let mut wit = vec![0.0; m + 1];
    // Node 0 is the first wrap on the core.
    for k in 1..=m {
        // Wound-in tension of the new element: web tension plus the nip-induced part μ·N.
        let t_web = scheduled_tension(&problem.winding.tension, rc, ro, radius[k]);
        let t_wit = t_web + friction * nip;
        wit[k] = t_wit;
        sigma_t[k] = t_wit / h;
        if k == 1 {
            wit[0] = t_wit;
            sigma_t[0] = t_wit / h;
        }
        // Solve r² δp'' + 3r δp' + (1 − g²) δp = 0 on nodes 0..=k with δp(k) = N·T/r, with
        // Er taken as the secant modulus over the increment (two fixed-point passes).
        let mut dp: Vec<f64> = vec![0.0; k + 1];
        for _pass in 0..3 {
            let er: Vec<f64> = (0..=k)
                .map(|i| secant_modulus(&problem.radial_stiffness, p[i], p[i] + dp[i].max(0.0)))
                .collect();
            dp = solve_increment(
                &radius[..=k],
                &er,
                e_t,
                core_term,
                dr,
                layers_per * t_wit / radius[k],
            );
        }
        for i in 0..k {
            let deriv = if i == 0 {
                core_term * dp[0] / radius[0]
            } else {
                (dp[i + 1] - dp[i - 1]) / (2.0 * dr)
            };
            p[i] += dp[i];
            sigma_t[i] -= dp[i] + radius[i] * deriv;
        }
        p[k] += dp[k];
    }
    let radial_strain: Vec<f64> = p
        .iter()
        .map(|&pi| strain_of(&problem.radial_stiffness, pi))
        .collect();
    let cuts = [0.0, 0.05, 0.3, 0.7, 0.95, 1.0001];
    let zones = ZoneName::ALL
        .iter()
        .enumerate()
        .map(|(z, name)| {
            let start = radius
                .iter()
                .position(|&r| (r - rc) / (ro - rc) >= cuts[z])
                .unwrap_or(m);
            let end = radius
                .iter()
                .position(|&r| (r - rc) / (ro - rc) >= cuts[z + 1])
                .unwrap_or(m + 1);
            Zone {
                name: *name,
                start,
                end,
                inner_radius: radius[start.min(m)],
                outer_radius: radius[(end.max(1) - 1).min(m)],
            }
        })
        .collect();
    let (peak_i, peak) = p
        .iter()
        .copied()
        .enumerate()
        .fold((0, f64::MIN), |b, (i, v)| if v > b.1 { (i, v) } else { b });
    let (min_i, min_s) = sigma_t
        .iter()
        .copied()
        .enumerate()
        .fold((0, f64::MAX), |b, (i, v)| if v < b.1 { (i, v) } else { b });
    Profile {
        summary: ProfileSummary {
            core_pressure: p[0],
            peak_pressure: peak,
            peak_pressure_radius: radius[peak_i],
            min_tangential_stress: min_s,
            min_tangential_radius: radius[min_i],
            physical_layers: layers,
            ..ProfileSummary::default()
        },
        solver: SolverStats {
            grid: Grid {
                layers_per_element: layers_per.round() as usize,
            },
            elements: m,
            ..SolverStats::default()
        },
        radius,
        pressure: p,
        tangential_stress: sigma_t,
        radial_strain,
        wound_in_tension: wit,
        zones,
        air_film: None,
        warnings: vec![],
        thickness: h,
    }
}

/// Always the stand-alone solve (snapshots stay stable whatever the crate's solver does).
pub fn fallback_only(problem: &WindingProblem) -> Result<Profile, ModelError> {
    Ok(fallback_solve(problem, 300))
}

/// The Harbour Point W3 telescoping demo (cases/harbour_newsprint_telescoping.yaml) built in
/// Rust: 76 µm newsprint at 0.5 pli, no taper, rider nearly lifted, 900 m/min.
pub fn harbour_telescoping_demo() -> ResolvedCase {
    let mut case = newsprint("Harbour Point PM3 newsprint — telescoped reels for Quaymoor Press");
    case.web.thickness = 76e-6;
    case.web.width = 1.68;
    case.web.tangential_modulus = 4.8e9;
    case.web.radial_stiffness = RadialStiffness::Pfeiffer {
        k1: 5.0e3,
        k2: 50.0,
    };
    case.web.friction = 0.45;
    case.web.strength = 2400.0;
    case.core = paper_core(0.0762, 0.1016, 1.2e9, 4.0e6);
    case.winding.method = WindingMethod::CentreSurface;
    case.winding.tension.start_tension = 87.6;
    case.winding.tension.taper = Taper::None;
    case.winding.nip_load = Some(150.0);
    case.winding.speed = 15.0;
    at(with_symptoms(case, &["telescoping"]), "telescoping", "body")
}

/// The coated-paper starring + crushed core demo (cases/harbour_coated_starring_no_taper.yaml)
/// built in Rust: 55 µm coated paper, 3.5 pli constant tension, 1400 mm roll.
pub fn harbour_coated_no_taper_demo() -> ResolvedCase {
    let mut case = newsprint("Harbour Point coated paper — starred rolls with crushed cores");
    case.web.thickness = 55e-6;
    case.web.width = 1.45;
    case.web.tangential_modulus = 6.0e9;
    case.web.radial_stiffness = RadialStiffness::Pfeiffer {
        k1: 30.0e3,
        k2: 80.0,
    };
    case.web.friction = 0.35;
    case.web.roughness = 1.0e-6;
    case.web.strength = 3000.0;
    case.core = paper_core(0.0762, 0.1016, 1.2e9, 4.0e6);
    case.roll.outer_diameter = 1.4;
    case.winding.method = WindingMethod::CentreSurface;
    case.winding.tension.start_tension = 613.0;
    case.winding.tension.taper = Taper::None;
    case.winding.nip_load = Some(1000.0);
    case.winding.speed = 20.0;
    let case = with_symptoms(case, &["starring", "crushed_core"]);
    at(at(case, "starring", "core"), "crushed_core", "core")
}
