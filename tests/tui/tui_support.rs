//! Hand-built sample data for the terminal-UI tests: a catalogue with aliases and questions, a
//! resolved case, a profile and a diagnosis. The numbers are an invented illustration of the
//! shapes the screens must draw (pressure rising toward the core, tangential stress tensile at
//! the outside and compressive near the core); they are not a solve and check no physics.
#![allow(dead_code)]

use std::collections::BTreeMap;

use rolltriage::case::{
    AssumedValue, Case, ObservedSymptom, ResolvedCase, ResolvedCore, ResolvedRoll, ResolvedWeb,
};
use rolltriage::diagnose::indicators::IndicatorValue;
use rolltriage::diagnose::rules::SettingChange;
use rolltriage::diagnose::{Caution, Diagnosis, MergedRemedy, RankedCause, Reason};
use rolltriage::model::{
    CoreStiffness, Profile, ProfileSummary, RadialStiffness, Taper, WindingMethod, Zone, ZoneName,
};
use rolltriage::tui::app::App;
use rolltriage::tui::catalogue::{Catalogue, QuestionInfo};
use rolltriage::tui::job::{JobMessage, Purpose, SolveOutcome};

pub fn catalogue() -> Catalogue {
    let mut catalogue = Catalogue::from_vocabulary();
    for s in &mut catalogue.symptoms {
        match s.id.as_str() {
            "telescoping" => {
                s.aliases = vec!["coning".into(), "sliding layers".into()];
                s.description =
                    "Layers have slid sideways so the roll end is a cone, not a flat face.".into();
                s.questions = vec![QuestionInfo {
                    id: "telescoping_after_handling".into(),
                    text: "Did it appear only after the roll was moved?".into(),
                    choices: vec![],
                    choice_texts: vec![],
                }];
            }
            "starring" => {
                s.aliases = vec!["stars".into(), "spoking".into()];
                s.description = "Star-shaped buckles seen on the roll end.".into();
                s.questions = vec![QuestionInfo {
                    id: "starring_radius".into(),
                    text: "Where do the stars start?".into(),
                    choices: vec!["near_core".into(), "mid_roll".into()],
                    choice_texts: vec!["near the core".into(), "in the middle of the roll".into()],
                }];
            }
            "blocking" => {
                s.aliases = vec!["sticking".into()];
                s.description = "Layers stick together and tear on unwinding.".into();
            }
            _ => {}
        }
    }
    catalogue
}

pub fn app() -> App {
    let mut app = App::new(
        catalogue(),
        vec!["newsprint".into(), "pet_film".into()],
        vec!["paper_3in".into(), "steel_6in".into()],
    );
    // The setting changes the rule base gives these sample remedies.
    app.session.remedy_changes = [
        (
            "raise_tension".to_string(),
            vec![SettingChange::TensionScale(1.15)],
        ),
        (
            "add_nip_load".to_string(),
            vec![SettingChange::NipScale(1.2)],
        ),
    ]
    .into_iter()
    .collect();
    app
}

pub fn resolved(title: &str) -> ResolvedCase {
    ResolvedCase {
        title: title.into(),
        web: ResolvedWeb {
            preset: Some("newsprint".into()),
            material: rolltriage::vocabulary::WebMaterial::Paper,
            thickness: 76e-6,
            width: 2.4,
            tangential_modulus: 4e9,
            radial_stiffness: RadialStiffness::Pfeiffer {
                k1: 100.0,
                k2: 50.0,
            },
            poisson_ratio: 0.01,
            friction: 0.4,
            kinetic_friction: 0.4,
            density: 1000.0,
            roughness: 3e-6,
            strength: 3000.0,
        },
        core: ResolvedCore {
            preset: Some("paper_3in".into()),
            material: rolltriage::vocabulary::CoreMaterial::Paper,
            inside_diameter: 0.0762,
            outside_diameter: 0.1,
            stiffness: CoreStiffness::Measured { stiffness: 1e9 },
            crush_pressure: 1.5e6,
            support: rolltriage::model::CoreSupport::Free,
            crush_basis: rolltriage::model::core_crush::CrushBasis::Given,
            shaft_torque_rating: None,
        },
        roll: ResolvedRoll {
            outer_diameter: 1.0,
            length: 9000.0,
        },
        winding: crate::fixtures::winding(WindingMethod::Centre, 525.0, Taper::None, None, 10.0),
        symptoms: vec![],
        answers: BTreeMap::new(),
        assumed: vec![],
        measurements: None,
    }
}

/// An illustrative profile: `scale` multiplies the pressures (what-if comparisons).
pub fn profile(scale: f64) -> Profile {
    let (rc, ro, n) = (0.05, 0.5, 120usize);
    let radius: Vec<f64> = (0..n)
        .map(|i| rc + (ro - rc) * i as f64 / (n - 1) as f64)
        .collect();
    let pressure: Vec<f64> = radius
        .iter()
        .map(|r| scale * 1.2e6 * ((ro - r) / (ro - rc)).powf(1.5))
        .collect();
    let tangential: Vec<f64> = radius
        .iter()
        .map(|r| {
            let f = (r - rc) / (ro - rc);
            scale * (-2.5e6 + 9.0e6 * f)
        })
        .collect();
    let cuts = [0.0, 0.05, 0.3, 0.7, 0.95, 1.0];
    let zones = ZoneName::ALL
        .iter()
        .enumerate()
        .map(|(i, name)| {
            let start = (cuts[i] * (n - 1) as f64) as usize;
            let end = (cuts[i + 1] * (n - 1) as f64) as usize;
            Zone {
                name: *name,
                start,
                end,
                inner_radius: radius[start],
                outer_radius: radius[end],
            }
        })
        .collect();
    Profile {
        summary: ProfileSummary {
            core_pressure: pressure[0],
            peak_pressure: pressure[0],
            peak_pressure_radius: rc,
            min_tangential_stress: tangential[0],
            min_tangential_radius: rc,
            physical_layers: 5921,
            ..ProfileSummary::default()
        },
        solver: rolltriage::model::SolverStats {
            grid: rolltriage::model::Grid {
                layers_per_element: 49,
            },
            elements: 120,
            ..Default::default()
        },
        thickness: 76e-6,
        radial_strain: vec![0.0; n],
        wound_in_tension: vec![525.0; n],
        radius,
        pressure,
        tangential_stress: tangential,
        zones,
        air_film: None,
        warnings: vec![],
    }
}

pub fn diagnosis(scale: f64) -> Diagnosis {
    Diagnosis {
        causes: vec![
            RankedCause {
                id: "tension_too_low".into(),
                title: "Web tension too low for this web".into(),
                mechanism: "Too little wound-in tension leaves the outer layers loose.".into(),
                belief: 0.72,
                reasons: vec![
                    Reason {
                        symptom: "telescoping".into(),
                        test: "prior".into(),
                        zone: None,
                        value: None,
                        threshold: None,
                        weight: 0.5,
                        text: "telescoping is often a loose roll".into(),
                    },
                    Reason {
                        symptom: "telescoping".into(),
                        test: "low_pressure_band".into(),
                        zone: Some("outer".into()),
                        value: Some("0.31".into()),
                        threshold: Some("> 0.2".into()),
                        weight: 0.4,
                        text: "a wide band of low pressure near the outside".into(),
                    },
                ],
            },
            RankedCause {
                id: "taper_excessive".into(),
                title: "Too much taper".into(),
                mechanism: "Tension falls so far that the outside of the roll is soft.".into(),
                belief: 0.35 * scale,
                reasons: vec![Reason {
                    symptom: "telescoping".into(),
                    test: "prior".into(),
                    zone: None,
                    value: None,
                    threshold: None,
                    weight: 0.35,
                    text: "common with strong taper".into(),
                }],
            },
            RankedCause {
                id: "air_entrainment".into(),
                title: "Air carried into the roll".into(),
                mechanism: String::new(),
                belief: 0.12,
                reasons: vec![],
            },
        ],
        remedies: vec![
            MergedRemedy {
                id: "raise_tension".into(),
                text: "Raise the web tension in steps of about 10 %".into(),
                group: "winder_setting".into(),
                cost: "low".into(),
                answers: vec!["tension_too_low".into()],
                cautions: vec![],
                what_if: None,
            },
            MergedRemedy {
                id: "add_nip_load".into(),
                text: "Add or raise the nip (rider roll) load".into(),
                group: "winder_setting".into(),
                cost: "low".into(),
                answers: vec!["air_entrainment".into()],
                cautions: vec!["nip_pinch_point".into()],
                what_if: None,
            },
            MergedRemedy {
                id: "store_rolls_on_end".into(),
                text: "Store finished rolls on their ends, not on their faces".into(),
                group: "handling_and_storage".into(),
                cost: "low".into(),
                answers: vec!["tension_too_low".into()],
                cautions: vec![],
                what_if: None,
            },
        ],
        cautions: vec![Caution {
            id: "nip_pinch_point".into(),
            title: "Nip pinch point".into(),
            text: "Change nip settings only with the winder stopped and guarded.".into(),
        }],
        indicators: vec![
            IndicatorValue {
                id: "core_pressure_ratio".into(),
                zone: None,
                value: 0.8 * scale,
                unit: "1".into(),
                meaning: "core pressure over crush rating".into(),
            },
            IndicatorValue {
                id: "low_pressure_band".into(),
                zone: Some("outer".into()),
                value: 0.31 / scale,
                unit: "1".into(),
                meaning: "share of the outer zone below the loose-roll pressure".into(),
            },
        ],
        evidence: None,
    }
}

/// A resolved case listing a few assumed values, as a blank case with presets would.
pub fn resolved_with_assumed() -> ResolvedCase {
    let mut resolved = resolved("New case");
    for (field, value, source) in [
        ("web.material", "paper", "preset newsprint"),
        ("web.thickness", "76 µm", "preset newsprint: sample caliper"),
        (
            "core.crush_pressure",
            "1.5 MPa",
            "preset paper_3in: sample rating",
        ),
        ("roll.diameter", "1 m", "default"),
        ("winding.method", "centre", "default"),
    ] {
        resolved.assumed.push(AssumedValue {
            field: field.into(),
            value: value.into(),
            source: source.into(),
            origin: Default::default(),
        });
    }
    resolved
}

pub fn outcome(scale: f64) -> SolveOutcome {
    SolveOutcome {
        resolved: resolved("Sample"),
        profile: profile(scale),
        diagnosis: Ok(diagnosis(scale)),
        sensitivity: None,
        estimate: None,
    }
}

/// A case with two symptoms, as if opened from a file.
pub fn sample_case() -> Case {
    Case {
        title: "Reel 7 coned on the outside".into(),
        symptoms: vec![
            ObservedSymptom {
                id: "telescoping".into(),
                place: Some("outside".into()),
                notes: None,
            },
            ObservedSymptom {
                id: "starring".into(),
                place: None,
                notes: None,
            },
        ],
        ..Case::default()
    }
}

/// Answer every queued baseline request with `outcome` (as the background job would).
/// A small roll from presets only (core 101.6 mm, roll 130 mm: about 190 wraps of newsprint), so
/// a real solve is quick even in a debug build and the answer rests on assumed inputs.
pub fn small_presets_case() -> Case {
    Case::from_yaml_str(
        r#"
title: Small roll, presets only
web: {preset: newsprint}
core: {preset: paper_3in}
roll: {diameter: "130 mm"}
winding: {tension: "1 pli"}
symptoms:
  - {id: telescoping, where: outside}
"#,
        "small roll",
    )
    .unwrap()
}

pub fn finish_requests(app: &mut App, baseline: &SolveOutcome, what_if: &SolveOutcome) {
    for request in app.take_requests() {
        let outcome = match request.purpose {
            Purpose::Baseline => baseline.clone(),
            Purpose::WhatIf => what_if.clone(),
        };
        app.on_job(JobMessage::Finished {
            id: request.id,
            purpose: request.purpose,
            generation: request.generation,
            result: Ok(Box::new(outcome)),
        });
    }
}

/// The whole app drawn on ratatui's TestBackend, as text (for snapshots).
pub fn draw(app: &App, width: u16, height: u16) -> String {
    let mut terminal =
        ratatui::Terminal::new(ratatui::backend::TestBackend::new(width, height)).unwrap();
    terminal
        .draw(|frame| {
            frame.render_widget(
                rolltriage::tui::screens::AppView {
                    app,
                    theme: rolltriage::tui::theme::Theme::monochrome(),
                },
                frame.area(),
            )
        })
        .unwrap();
    terminal.backend().to_string()
}

/// Run every queued solve on this thread, as the worker would, and hand back the results.
pub fn solve_queued(app: &mut App) {
    let rules = rolltriage::diagnose::rules::RuleBase::embedded().unwrap();
    for request in app.take_requests() {
        let mut progress = |_: f64| true;
        let result = rolltriage::tui::job::run_pipeline(
            &request.case,
            request.resolved.as_deref(),
            &rules,
            &mut progress,
        )
        .map(Box::new);
        app.on_job(JobMessage::Finished {
            id: request.id,
            purpose: request.purpose,
            generation: request.generation,
            result,
        });
    }
}
