//! Measurements against the computed profile (src/evidence) and their effect on the ranking.
//! Outside references named beside each check: annulus geometry (hand-checked), Lamé's
//! thick-walled cylinder, the definition of Spearman's rank correlation, and the rule base's own
//! documented thresholds for the ranking tests.

use crate::common;

use rolltriage::diagnose::{DiagnoseOptions, diagnose, rules::RuleBase};
use rolltriage::evidence::{
    BendPlace, EndLine, HardnessProfile, HardnessReading, LaneHardness, LaneReading, Measurements,
    RollSet, RollSize, SizeUncertainty, WoundAmount, compare, geometry,
};
use rolltriage::model::{CoreStiffness, Profile};

fn newsprint() -> (rolltriage::case::ResolvedCase, Profile) {
    let case = common::newsprint("evidence");
    let profile = common::profile(&case);
    (case, profile)
}

fn size_for(case: &rolltriage::case::ResolvedCase, profile: &Profile, ratio: f64) -> RollSize {
    // A length whose loose stack fills the solved roll; the diameter the roll would have with
    // `ratio` times the computed wound density.
    let (rc, ro, h) = (
        case.core.outside_diameter / 2.0,
        case.roll.outer_diameter / 2.0,
        case.web.thickness,
    );
    let length = std::f64::consts::PI * (ro * ro - rc * rc) / h;
    let eps = geometry::model_mean_compression(profile).unwrap();
    let measured_eps = 1.0 - (1.0 - eps) / ratio;
    RollSize {
        diameter: geometry::diameter_for(length, h, 2.0 * rc, measured_eps),
        amount: WoundAmount::Length { length },
        uncertainty: SizeUncertainty::default(),
    }
}

#[test]
fn density_comparison_recovers_the_ratio_it_was_built_with() {
    let (case, profile) = newsprint();
    let problem = case.problem(Default::default());
    for ratio in [0.9, 1.0, 1.04] {
        let m = Measurements {
            size: Some(size_for(&case, &profile, ratio)),
            ..Measurements::default()
        };
        let e = compare(&m, &problem, &profile).unwrap();
        let d = e.density.unwrap();
        // ρ_measured/ρ_computed = (1 − ε̄_computed)/(1 − ε̄_measured) (annulus geometry).
        assert!(
            (d.density_ratio - ratio).abs() < 1e-9,
            "{}",
            d.density_ratio
        );
        if ratio == 1.0 {
            assert!((d.computed_diameter - d.measured_diameter).abs() < 1e-9);
        }
    }
    // By weight: 45 g/m² × 1.6 m wide; the same length gives the same comparison, plus densities.
    let size = size_for(&case, &profile, 0.95);
    let length = size.amount.length();
    let m = Measurements {
        size: Some(RollSize {
            amount: WoundAmount::Weight {
                weight: length * 0.045 * 1.6,
                basis_weight: 0.045,
                width: 1.6,
            },
            ..size
        }),
        ..Measurements::default()
    };
    let d = compare(&m, &problem, &profile).unwrap().density.unwrap();
    assert!((d.density_ratio - 0.95).abs() < 1e-9);
    let (measured, computed) = (d.measured_density.unwrap(), d.computed_density.unwrap());
    assert!((measured / computed - 0.95).abs() < 1e-9);
}

#[test]
fn hardness_that_follows_the_pressure_agrees_and_a_dip_is_a_soft_band() {
    let (case, profile) = newsprint();
    let problem = case.problem(Default::default());
    let (rc, ro) = (profile.radius[0], *profile.radius.last().unwrap());
    let at = |t: f64| rc + t * (ro - rc);
    let readings: Vec<HardnessReading> = [0.1, 0.3, 0.5, 0.7, 0.9]
        .iter()
        .map(|&t| HardnessReading {
            diameter: 2.0 * at(t),
            value: 20.0 + Profile::interpolate(&profile.pressure, &profile.radius, at(t)) / 1e4,
        })
        .collect();
    let mut m = Measurements {
        hardness: Some(HardnessProfile {
            readings: readings.clone(),
            higher_is_harder: true,
            calibration: vec![],
        }),
        ..Measurements::default()
    };
    let h = compare(&m, &problem, &profile).unwrap().hardness.unwrap();
    // A monotone transform of the same values has rank correlation 1 (definition).
    assert_eq!(h.rank_correlation, Some(1.0));
    assert!(h.soft_band.is_none());
    // Soften the middle reading well below both neighbours.
    let mut dipped = readings.clone();
    let low = dipped.iter().map(|r| r.value).fold(f64::INFINITY, f64::min);
    dipped[2].value = low - 5.0;
    m.hardness.as_mut().unwrap().readings = dipped;
    let e = compare(&m, &problem, &profile).unwrap();
    let band = e.hardness.as_ref().unwrap().soft_band.expect("soft band");
    assert!((band.diameter - 2.0 * at(0.5)).abs() < 1e-9);
    let soft = e
        .indicators()
        .into_iter()
        .find(|i| i.id == "hardness_soft_band")
        .unwrap();
    assert!(soft.value > 0.25 && soft.detail.contains("soft band"));
    // A tester whose reading falls as the roll gets harder: reversed readings agree as well.
    let reversed: Vec<HardnessReading> = readings
        .iter()
        .map(|r| HardnessReading {
            value: -r.value,
            ..*r
        })
        .collect();
    m.hardness = Some(HardnessProfile {
        readings: reversed,
        higher_is_harder: false,
        calibration: vec![],
    });
    let h = compare(&m, &problem, &profile).unwrap().hardness.unwrap();
    assert_eq!(h.rank_correlation, Some(1.0));
}

#[test]
fn core_bore_is_compared_with_lame() {
    let (case, profile) = newsprint();
    let problem = case.problem(Default::default());
    let m = Measurements {
        core_bore_reduction: Some(0.5e-3),
        ..Measurements::default()
    };
    let c = compare(&m, &problem, &profile).unwrap().core_bore.unwrap();
    // Lamé, external pressure p on a tube a = 38.1 mm, b = 50.8 mm, E = 2 GPa:
    // Δd = 4·p·a·b²/(E·(b² − a²)) (Timoshenko & Goodier, thick-walled cylinder).
    let (a, b, e) = (0.0381, 0.0508, 2.0e9);
    let p = profile.pressure[0];
    let expect = 4.0 * p * a * b * b / (e * (b * b - a * a));
    assert!((c.computed.unwrap() - expect).abs() < 1e-12);
    assert!((c.ratio.unwrap() - 0.5e-3 / expect).abs() < 1e-9);
    // A core known only by a measured stiffness: not computed, said so.
    let mut measured = problem.clone();
    measured.core = CoreStiffness::Measured { stiffness: 1e8 };
    let e = compare(&m, &measured, &profile).unwrap();
    assert!(e.core_bore.unwrap().computed.is_none());
    assert!(e.notes.iter().any(|n| n.contains("measured stiffness")));
}

#[test]
fn end_line_and_set_pattern() {
    let (case, profile) = newsprint();
    let problem = case.problem(Default::default());
    let m = Measurements {
        end_line: Some(EndLine {
            bend: BendPlace::NearCore,
            direction: None,
            offset: Some(4e-3),
        }),
        set: Some(RollSet {
            rolls: 6,
            bad: 2,
            bad_positions: vec![1, 6],
            parent_roll: Some("PR 4411".into()),
            position_in_parent: None,
            parent_rolls: Some(4),
            bad_parent_rolls: Some(1),
        }),
        lanes: Some(LaneHardness {
            readings: (1..=6)
                .map(|lane| LaneReading {
                    lane,
                    value: if lane == 1 || lane == 6 { 60.0 } else { 50.0 },
                })
                .collect(),
            higher_is_harder: true,
        }),
        ..Measurements::default()
    };
    let e = compare(&m, &problem, &profile).unwrap();
    let s = e.end_line.as_ref().unwrap();
    // The weakest interface (lowest μ·P·2πr²) is a node of the inner part of the roll.
    let capacity = rolltriage::evidence::slip::torque_capacity(&profile, case.web.friction);
    let lowest = capacity.iter().map(|c| c.1).fold(f64::INFINITY, f64::min);
    assert_eq!(s.weakest_capacity, lowest);
    assert_eq!(s.agrees, Some(s.weakest_fraction <= 0.15 + 0.05));
    let set = e.set.as_ref().unwrap();
    assert_eq!(set.pattern, rolltriage::evidence::SetPatternKind::Edges);
    assert_eq!(set.edge_share, Some(1.0));
    assert_eq!(set.parent_share, Some(0.25));
    let lanes = e.lanes.as_ref().unwrap();
    // (60 − 50)/mean(53.33) = 0.1875.
    assert!((lanes.spread - 10.0 / (320.0 / 6.0)).abs() < 1e-12);
    assert!(lanes.hard_edges);
    assert!(e.notes.iter().any(|n| n.contains("one-dimensional")));
    let ids: Vec<&str> = e.indicators().iter().map(|i| i.id).collect();
    for id in [
        "end_line_offset",
        "slip_location_match",
        "end_line_bend_position",
        "bad_roll_share",
        "bad_edge_share",
        "bad_parent_share",
        "lane_hardness_spread",
    ] {
        assert!(ids.contains(&id), "{id} missing from {ids:?}");
    }
}

#[test]
fn bad_measurements_are_refused_with_the_field() {
    let (case, profile) = newsprint();
    let problem = case.problem(Default::default());
    let m = Measurements {
        set: Some(RollSet {
            rolls: 4,
            bad: 5,
            bad_positions: vec![],
            parent_roll: None,
            position_in_parent: None,
            parent_rolls: None,
            bad_parent_rolls: None,
        }),
        ..Measurements::default()
    };
    let err = compare(&m, &problem, &profile).unwrap_err().to_string();
    assert!(
        err.contains("measurements.set.bad") && err.contains("0 to 4"),
        "{err}"
    );
}

fn belief(d: &rolltriage::diagnose::Diagnosis, id: &str) -> f64 {
    d.causes
        .iter()
        .find(|c| c.id == id)
        .map_or(0.0, |c| c.belief)
}

#[test]
fn measurements_move_the_ranking_and_nothing_measured_is_neutral() {
    let rules = RuleBase::embedded().unwrap();
    let case = common::with_symptoms(common::newsprint("soft"), &["soft_roll"]);
    let profile = common::profile(&case);
    let options = DiagnoseOptions::default();
    let plain = diagnose(&rules, &case, &profile, &options).unwrap();
    // An empty measurement section changes nothing.
    let mut empty = case.clone();
    empty.measurements = Some(Measurements::default());
    assert_eq!(diagnose(&rules, &empty, &profile, &options).unwrap(), plain);
    // A roll 10 % less dense than computed (several standard uncertainties) raises "tension
    // too low" (rule threshold: density_deviation below −2)
    // and its reason quotes measured and computed diameters.
    let mut loose = case.clone();
    loose.measurements = Some(Measurements {
        size: Some(size_for(&case, &profile, 0.9)),
        ..Measurements::default()
    });
    let d = diagnose(&rules, &loose, &profile, &options).unwrap();
    assert!(belief(&d, "tension_too_low") > belief(&plain, "tension_too_low"));
    let reason = d
        .causes
        .iter()
        .flat_map(|c| &c.reasons)
        .find(|r| r.test == "density_deviation")
        .expect("density reason");
    let value = reason.value.as_deref().unwrap();
    assert!(
        value.contains("measured") && value.contains("computed"),
        "{value}"
    );
    // Hard and soft lanes raise caliper variation.
    let mut lanes = case.clone();
    lanes.measurements = Some(Measurements {
        lanes: Some(LaneHardness {
            readings: [50.0, 62.0, 48.0, 61.0]
                .iter()
                .enumerate()
                .map(|(i, &value)| LaneReading {
                    lane: i as u32 + 1,
                    value,
                })
                .collect(),
            higher_is_harder: true,
        }),
        ..Measurements::default()
    });
    let d = diagnose(&rules, &lanes, &profile, &options).unwrap();
    assert!(belief(&d, "caliper_variation") > belief(&plain, "caliper_variation"));
}
