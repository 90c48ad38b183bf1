//! Report rendering on a hand-built profile and diagnosis, so the snapshots do not move when the
//! solver or the rule base is tuned. The real demo cases are covered in tests/report/demo.rs.

use std::collections::BTreeMap;

use rolltriage::case::{
    AssumedValue, Case, ObservedSymptom, ResolvedCase, ResolvedCore, ResolvedRoll, ResolvedWeb,
};
use rolltriage::diagnose::sensitivity::{InputSensitivity, Sensitivity, Trial};
use rolltriage::diagnose::{Caution, Diagnosis, MergedRemedy, RankedCause, Reason, WhatIf};
use rolltriage::model::{
    CoreStiffness, Profile, ProfileSummary, RadialStiffness, Taper, WindingMethod, Zone, ZoneName,
};
use rolltriage::report::{
    Format, RemedyComparison, ReportInput, ReportMeta, build_document, plots, render,
};
use rolltriage::units::UnitSystem;

const CORE_RADIUS: f64 = 0.0508;
const OUTER_RADIUS: f64 = 0.5;

/// A made-up but physically shaped profile: pressure falling from the core to zero at the
/// outside, tangential stress compressive near the core and equal to `surface_stress` outside.
fn synthetic_profile(core_pressure: f64, surface_stress: f64) -> Profile {
    let nodes = 101;
    let mut profile = Profile::default();
    for i in 0..nodes {
        let x = i as f64 / (nodes - 1) as f64;
        let r = CORE_RADIUS + x * (OUTER_RADIUS - CORE_RADIUS);
        profile.radius.push(r);
        profile.pressure.push(core_pressure * (1.0 - x).powi(2));
        profile
            .tangential_stress
            .push(surface_stress * (1.6 * x - 0.6) - 2.0e5 * (1.0 - x));
        profile.radial_strain.push(0.05 * (1.0 - x));
        profile.wound_in_tension.push(90.0);
    }
    let cuts = [0usize, 5, 30, 70, 95, 101];
    for (k, name) in ZoneName::ALL.iter().enumerate() {
        let (start, end) = (cuts[k], cuts[k + 1]);
        profile.zones.push(Zone {
            name: *name,
            start,
            end,
            inner_radius: profile.radius[start],
            outer_radius: if end < nodes {
                profile.radius[end]
            } else {
                OUTER_RADIUS
            },
        });
    }
    profile.summary = ProfileSummary {
        core_pressure,
        peak_pressure: core_pressure,
        peak_pressure_radius: CORE_RADIUS,
        min_tangential_stress: profile
            .tangential_stress
            .iter()
            .copied()
            .fold(f64::INFINITY, f64::min),
        min_tangential_radius: CORE_RADIUS,
        physical_layers: 5910,
        ..ProfileSummary::default()
    };
    profile.solver.elements = 100;
    profile.solver.grid.layers_per_element = 59;
    profile
}

fn fixture(with_remedy: bool) -> ReportInput {
    let case = Case {
        title: "Test mill newsprint — telescoped rolls".into(),
        description: Some("Invented fixture: a newsprint roll wound slack telescoped.".into()),
        notes: Some("All values invented for the test.".into()),
        symptoms: vec![ObservedSymptom {
            id: "telescoping".into(),
            place: Some("body".into()),
            notes: Some("Middle layers moved 30 mm | sideways.".into()),
        }],
        ..Case::default()
    };
    let mut answers = BTreeMap::new();
    answers.insert("after_splice".to_string(), "no".to_string());
    let resolved = ResolvedCase {
        title: case.title.clone(),
        web: ResolvedWeb {
            preset: Some("newsprint".into()),
            material: rolltriage::vocabulary::WebMaterial::Paper,
            thickness: 76e-6,
            width: 1.68,
            tangential_modulus: 4.8e9,
            radial_stiffness: RadialStiffness::Pfeiffer { k1: 5e3, k2: 50.0 },
            poisson_ratio: 0.01,
            friction: 0.45,
            kinetic_friction: 0.45,
            density: 1000.0,
            roughness: 3e-6,
            strength: 2400.0,
        },
        core: ResolvedCore {
            preset: None,
            material: rolltriage::vocabulary::CoreMaterial::Paper,
            inside_diameter: 0.0762,
            outside_diameter: 2.0 * CORE_RADIUS,
            stiffness: CoreStiffness::Hollow {
                inner_radius: 0.0381,
                outer_radius: CORE_RADIUS,
                modulus: 1.2e9,
                poisson_ratio: 0.3,
            },
            crush_pressure: 4e6,
            support: rolltriage::model::CoreSupport::Free,
            crush_basis: rolltriage::model::core_crush::CrushBasis::Given,
            shaft_torque_rating: None,
        },
        roll: ResolvedRoll {
            outer_diameter: 2.0 * OUTER_RADIUS,
            length: 9800.0,
        },
        winding: crate::fixtures::winding(
            WindingMethod::CentreSurface,
            87.6,
            Taper::None,
            Some(150.0),
            15.0,
        ),
        symptoms: case.symptoms.clone(),
        answers,
        assumed: vec![AssumedValue {
            field: "web.roughness".into(),
            value: "3 µm".into(),
            source: "preset newsprint (from memory)".into(),
            origin: Default::default(),
        }],
        measurements: None,
    };
    let diagnosis = Diagnosis {
        causes: vec![
            RankedCause {
                id: "tension_too_low".into(),
                title: "Web tension too low".into(),
                mechanism: "Too little wound-in tension leaves too little pressure between layers \
                            to hold them against axial forces."
                    .into(),
                belief: 0.8125,
                reasons: vec![
                    Reason {
                        symptom: "telescoping".into(),
                        test: "prior".into(),
                        zone: None,
                        value: None,
                        threshold: None,
                        weight: 0.5,
                        text: "Telescoping is often a slack roll.".into(),
                    },
                    Reason {
                        symptom: "telescoping".into(),
                        test: "wound_in_tension_share".into(),
                        zone: None,
                        value: Some("3.7 %".into()),
                        threshold: Some("< 8 %".into()),
                        weight: 0.625,
                        text: "Wound-in tension is a small share of the web's strength.".into(),
                    },
                ],
            },
            RankedCause {
                id: "air_entrainment".into(),
                title: "Air carried into the roll".into(),
                mechanism: "An air film between layers cuts friction.".into(),
                belief: 0.2,
                reasons: vec![Reason {
                    symptom: "telescoping".into(),
                    test: "prior".into(),
                    zone: None,
                    value: None,
                    threshold: None,
                    weight: 0.2,
                    text: "Air at speed can float the layers.".into(),
                }],
            },
        ],
        remedies: vec![
            MergedRemedy {
                id: "raise_tension".into(),
                text: "Raise web tension to 12–15 % of the web's strength.".into(),
                group: "winder_setting".into(),
                cost: "low".into(),
                answers: vec!["tension_too_low".into()],
                cautions: vec!["web_break".into()],
                what_if: Some(WhatIf {
                    indicator: "pressure_mean (middle)".into(),
                    before: "4.1 kPa".into(),
                    after: "11.8 kPa".into(),
                    worse: false,
                    small_effect: false,
                    note: "More pressure in the body holds the layers.".into(),
                    margins: vec![],
                    words: Default::default(),
                }),
            },
            MergedRemedy {
                id: "raise_nip_load".into(),
                text: "Raise rider-roll load in steps of 10 %.".into(),
                group: "winder_setting".into(),
                cost: "low".into(),
                answers: vec!["tension_too_low".into(), "air_entrainment".into()],
                cautions: vec!["in_running_nip".into()],
                what_if: None,
            },
        ],
        cautions: vec![
            Caution {
                id: "in_running_nip".into(),
                title: "In-running nips".into(),
                text: "Never reach into a nip on a turning roll; follow local codes, site \
                       procedures and lockout/tagout practice."
                    .into(),
            },
            Caution {
                id: "web_break".into(),
                title: "Web breaks & threading".into(),
                text: "Higher tension raises the risk of breaks <snap-back>; follow site \
                       procedures."
                    .into(),
            },
        ],
        indicators: vec![],
        evidence: None,
    };
    let profile = synthetic_profile(60e3, 1.15e6);
    let remedy = with_remedy.then(|| {
        let mut after_case = resolved.clone();
        after_case.winding.tension.start_tension = 300.0;
        RemedyComparison {
            remedy_id: "raise_tension".into(),
            remedy_text: "Raise web tension to 12–15 % of the web's strength.".into(),
            change: "web tension 87.6 N/m → 300 N/m".into(),
            after_case,
            after: synthetic_profile(180e3, 3.9e6),
        }
    });
    ReportInput {
        case,
        resolved,
        profile,
        diagnosis,
        remedy,
        meta: ReportMeta {
            date: "2026-12-02".into(),
            tool: "rolltriage".into(),
            tool_version: "0.0.0-test".into(),
            source_file: Some("cases/test.yaml".into()),
        },
        units: UnitSystem::Si,
        sensitivity: Some(fixture_sensitivity()),
        similar_past: None,
        estimate: None,
    }
}

/// A hand-made sensitivity result: the assumed roughness moves the ranking (invented numbers,
/// they only exercise the rendering).
fn fixture_sensitivity() -> Sensitivity {
    let trial = |value: f64, text: &str, first: &str, title: &str, belief: f64, base: f64| Trial {
        value,
        value_text: text.into(),
        first_cause: Some(first.into()),
        first_title: Some(title.into()),
        first_belief: belief,
        base_cause_belief: base,
    };
    Sensitivity {
        first_cause: Some("tension_too_low".into()),
        first_title: Some("Web tension too low".into()),
        first_belief: 0.8125,
        assumed: 1,
        inputs: vec![InputSensitivity {
            field: "web.roughness".into(),
            label: "Surface roughness (RMS, one side)".into(),
            used: "3 µm".into(),
            low: 1e-6,
            high: 5e-6,
            range_text: "1 µm to 5 µm".into(),
            range_source: "the spread of the shipped paper presets, at least ±25 %".into(),
            trials: vec![
                trial(
                    1e-6,
                    "1 µm",
                    "air_entrainment",
                    "Air carried into the roll",
                    0.84,
                    0.8,
                ),
                trial(
                    5e-6,
                    "5 µm",
                    "tension_too_low",
                    "Web tension too low",
                    0.81,
                    0.81,
                ),
            ],
            changes_first_cause: true,
            belief_shift: 0.0125,
        }],
        not_varied: vec![],
        failed: vec![],
    }
}

#[test]
fn markdown_snapshot() {
    let text = render(&fixture(true), Format::Markdown).unwrap();
    insta::assert_snapshot!("report_markdown", text);
}

#[test]
fn json_snapshot_and_round_trip() {
    let text = render(&fixture(true), Format::Json).unwrap();
    let value: serde_json::Value = serde_json::from_str(&text).unwrap();
    assert_eq!(value["schema"], "rolltriage-report/2");
    // IDs stay in JSON: the sensitivity names its field by path.
    assert_eq!(value["sensitivity"]["inputs"][0]["field"], "web.roughness");
    assert_eq!(value["causes"][0]["id"], "tension_too_low");
    assert_eq!(value["meta"]["date"], "2026-12-02");
    // Core pressure survives in SI: 60 kPa as written into the synthetic profile.
    let core = value["stress"]["core_pressure"]["si"].as_f64().unwrap();
    approx::assert_relative_eq!(core, 60e3, max_relative = 1e-9);
    // The document reads back into its own type (other systems can rely on the schema).
    let back: rolltriage::report::ReportDocument = serde_json::from_str(&text).unwrap();
    assert_eq!(back, build_document(&fixture(true)).unwrap());
    insta::assert_snapshot!("report_json", text);
}

#[test]
fn report_lists_assumed_inputs_limits_and_cautions() {
    let doc = build_document(&fixture(false)).unwrap();
    let roughness = doc
        .case
        .inputs
        .iter()
        .find(|l| l.field == "web.roughness")
        .unwrap();
    assert!(roughness.assumed);
    assert!(doc.case.inputs.iter().filter(|l| l.assumed).count() == 1);
    assert!(doc.model_limits.iter().any(|l| l.contains("Hakiel")));
    assert!(
        doc.model_limits
            .iter()
            .any(|l| l.contains("lockout/tagout"))
    );
    assert_eq!(doc.cautions.len(), 2);
    assert!(doc.remedy_comparison.is_none());
    // Zone statistics come from the profile: core zone nodes 0..5 have max pressure = core pressure.
    let core_zone = &doc.stress.zones[0];
    assert_eq!(core_zone.zone, "core");
    approx::assert_relative_eq!(core_zone.pressure_max.si, 60e3, max_relative = 1e-9);
    approx::assert_relative_eq!(
        doc.stress.core_pressure_ratio,
        60e3 / 4e6,
        max_relative = 1e-3
    );
}

#[test]
fn html_is_valid_and_self_contained() {
    let text = render(&fixture(true), Format::Html).unwrap();
    let document = scraper::Html::parse_document(&text);
    assert!(
        document.errors.is_empty(),
        "HTML parse errors: {:?}",
        document.errors
    );
    let select = |css: &str| scraper::Selector::parse(css).unwrap();
    assert_eq!(document.select(&select("h1")).count(), 1);
    assert_eq!(document.select(&select("figure svg")).count(), 2);
    for id in [
        "#case",
        "#stress",
        "#causes",
        "#remedies",
        "#what-if",
        "#cautions",
        "#limits",
    ] {
        assert_eq!(document.select(&select(id)).count(), 1, "missing {id}");
    }
    // Self-contained: no scripts, no external links or images.
    assert_eq!(document.select(&select("script")).count(), 0);
    assert_eq!(document.select(&select("link")).count(), 0);
    assert_eq!(document.select(&select("img")).count(), 0);
    // Text from the case is escaped, not interpreted.
    assert!(text.contains("&lt;snap-back&gt;"));
    let causes: Vec<String> = document
        .select(&select("h3"))
        .map(|h| h.text().collect::<String>())
        .collect();
    // People read the titles; the IDs stay in the JSON format.
    assert!(causes.iter().any(|c| c.contains("Web tension too low")));
    assert!(!text.contains("tension_too_low"));
    // What the answer rests on, in words.
    assert_eq!(document.select(&select("#rests-on")).count(), 1);
    let rests_on: String = document
        .select(&select("#sensitivity li"))
        .map(|li| li.text().collect::<String>())
        .collect();
    assert!(rests_on.contains("Surface roughness"));
    assert!(!rests_on.contains("web.roughness"));
}

#[test]
fn html_snapshot() {
    insta::assert_snapshot!("report_html", render(&fixture(true), Format::Html).unwrap());
}

#[test]
fn svg_snapshots() {
    let input = fixture(true);
    insta::assert_snapshot!("pressure_svg", plots::pressure_svg(&input).unwrap());
    insta::assert_snapshot!("tangential_svg", plots::tangential_svg(&input).unwrap());
}

/// The text content of every `<text>` element, trimmed.
fn svg_texts(svg: &str) -> Vec<String> {
    svg.split("<text")
        .skip(1)
        .filter_map(|s| s.split_once('>'))
        .map(|(_, rest)| {
            rest.split("</text>")
                .next()
                .unwrap_or("")
                .trim()
                .to_string()
        })
        .collect()
}

/// Count `<polyline>` elements whose stroke is the given colour.
fn polylines_with_stroke(svg: &str, rgb: &str) -> usize {
    svg.split("<polyline")
        .skip(1)
        .filter(|s| s.split("/>").next().unwrap_or("").contains(rgb))
        .count()
}

#[test]
fn svg_plots_hold_before_after_series_zones_and_labels() {
    let input = fixture(true);
    let pressure = plots::pressure_svg(&input).unwrap();
    let tangential = plots::tangential_svg(&input).unwrap();
    for svg in [&pressure, &tangential] {
        assert!(svg.starts_with("<svg"));
        // Before (blue, solid) and after (orange, dashed: many short pieces).
        assert!(polylines_with_stroke(svg, "#1F58A0") >= 1, "before series");
        assert!(
            polylines_with_stroke(svg, "#D66E00") >= 5,
            "after series, dashed"
        );
        for zone in ["core", "inner", "middle", "outer", "surface"] {
            assert!(
                svg_texts(svg).iter().any(|t| t == zone),
                "zone label {zone}"
            );
        }
        // Position as diameter (operators measure diameter), never radius.
        assert!(svg_texts(svg).iter().any(|t| t == "Roll diameter (mm)"));
        assert!(!svg.contains("Radius"));
        // No tick label with a needless ".0".
        assert!(svg_texts(svg).iter().all(|t| !t.ends_with(".0")), "{svg}");
        // The key sits under the plot with no frame around it.
        assert!(!svg.contains("<rect") || !svg.contains("stroke=\"#000000\""));
    }
    assert!(svg_texts(&pressure).iter().any(|t| t == "before"));
    assert!(pressure.contains(plots::LABEL_AFTER_SUFFIX));
    assert!(
        svg_texts(&pressure)
            .iter()
            .any(|t| t == "Interlayer pressure (kPa)")
    );
    // Tension and compression each in a panel of their own.
    assert!(svg_texts(&tangential).iter().any(|t| t == "Tension (MPa)"));
    assert!(
        svg_texts(&tangential)
            .iter()
            .any(|t| t == "Compression (MPa)")
    );
    // The crush rating (4 MPa) is far above the 180 kPa peak: flagged, not drawn across.
    assert!(pressure.contains(plots::LABEL_CRUSH));
    assert!(pressure.contains(plots::LABEL_CRUSH_OFF_SCALE));
}

/// Each text element's content, left x, estimated right x and y. The width takes the font size
/// the SVG states at 0.6 em per character, a typical sans-serif average (from memory).
fn text_spans(svg: &str) -> Vec<(String, f64, f64, f64)> {
    svg.split("<text")
        .skip(1)
        .filter_map(|s| {
            let (attrs, rest) = s.split_once('>')?;
            let text = rest.split("</text>").next()?.trim().to_string();
            let number = |key: &str| -> Option<f64> {
                attrs
                    .split(&format!("{key}=\""))
                    .nth(1)?
                    .split('"')
                    .next()?
                    .parse()
                    .ok()
            };
            let x = number("x")?;
            let y = number("y")?;
            let width = text.chars().count() as f64 * number("font-size")? * 0.6;
            Some((text, x, x + width, y))
        })
        .collect()
}

#[test]
fn zone_names_do_not_collide_and_crush_shows_at_the_core_when_on_scale() {
    let mut input = fixture(false);
    // Narrow core and surface zones side by side with their neighbours.
    input.resolved.core.crush_pressure = 70e3;
    let svg = plots::pressure_svg(&input).unwrap();
    let zones: Vec<_> = text_spans(&svg)
        .into_iter()
        .filter(|(t, ..)| ["core", "inner", "middle", "outer", "surface"].contains(&t.as_str()))
        .collect();
    assert_eq!(zones.len(), 5);
    for (i, a) in zones.iter().enumerate() {
        for b in &zones[i + 1..] {
            let same_row = (a.3 - b.3).abs() < 1.0;
            let overlap = a.1 < b.2 && b.1 < a.2;
            assert!(!(same_row && overlap), "{a:?} runs into {b:?}");
        }
    }
    // 70 kPa against a 60 kPa core pressure: on scale, a short bar at the core, in the key.
    assert!(svg.contains(plots::LABEL_CRUSH));
    assert!(!svg.contains(plots::LABEL_CRUSH_OFF_SCALE));
    let red: Vec<&str> = svg
        .split("<polyline")
        .skip(1)
        .filter(|s| s.split("/>").next().unwrap_or("").contains("#AA0000"))
        .collect();
    assert!(!red.is_empty());
    // A single curve needs no key.
    assert!(!svg_texts(&svg).iter().any(|t| t == "before"));
}

#[test]
fn small_compression_gets_its_own_scale() {
    let mut input = fixture(false);
    // 20 MPa of tension outside, 50 kPa of compression at the core: on one scale the
    // compression would be a flat line on zero.
    let n = input.profile.tangential_stress.len();
    for (i, v) in input.profile.tangential_stress.iter_mut().enumerate() {
        let x = i as f64 / (n - 1) as f64;
        *v = if x < 0.2 { -50e3 } else { 20e6 * x };
    }
    let svg = plots::tangential_svg(&input).unwrap();
    let texts = svg_texts(&svg);
    assert!(texts.iter().any(|t| t == "Tension (MPa)"), "{texts:?}");
    assert!(texts.iter().any(|t| t == "Compression (kPa)"), "{texts:?}");
    // Its ticks reach down to the compression (−50 kPa lies on the scale).
    assert!(texts.iter().any(|t| t == "-50" || t == "-40"), "{texts:?}");
}

#[test]
fn no_compression_is_said_not_drawn() {
    let mut input = fixture(false);
    for v in &mut input.profile.tangential_stress {
        *v = v.abs() + 1e3;
    }
    let svg = plots::tangential_svg(&input).unwrap();
    assert!(svg.contains(plots::LABEL_NO_COMPRESSION));
    assert!(!svg.contains("Compression ("));
}

#[test]
fn svg_before_curve_has_every_thinned_point() {
    let input = fixture(false);
    let svg = plots::pressure_svg(&input).unwrap();
    // One curve (plus its legend sample): the curve polyline carries all 101 profile points.
    let longest = svg
        .split("<polyline")
        .skip(1)
        .filter(|s| s.contains("#1F58A0"))
        .map(|s| {
            let points = s.split("points=\"").nth(1).unwrap_or("");
            points
                .split('"')
                .next()
                .unwrap_or("")
                .split_whitespace()
                .count()
        })
        .max()
        .unwrap();
    assert_eq!(longest, 101);
}

#[test]
fn empty_profile_is_an_error_not_a_panic() {
    let mut input = fixture(false);
    input.profile = Profile::default();
    for format in Format::ALL {
        assert!(render(&input, format).is_err());
    }
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig::with_cases(24))]

    /// Any finite profile renders in every format without panicking, the JSON parses, and the
    /// thinned profile keeps the first and last radius.
    #[test]
    fn any_profile_renders_in_every_format(
        pressures in proptest::collection::vec(0.0f64..5e7, 10..300), // five zones need at least five nodes
        scale in -1e7f64..1e7,
    ) {
        let mut input = fixture(false);
        let n = pressures.len();
        let mut profile = synthetic_profile(1.0, 1.0);
        profile.radius = (0..n).map(|i| CORE_RADIUS + (OUTER_RADIUS - CORE_RADIUS) * i as f64 / (n - 1) as f64).collect();
        profile.tangential_stress = pressures.iter().map(|p| scale - p / 3.0).collect();
        profile.pressure = pressures;
        profile.radial_strain = vec![0.0; n];
        profile.wound_in_tension = vec![90.0; n];
        // Zones cover the whole profile whatever its length.
        let cuts = [0, n / 5, 2 * n / 5, 3 * n / 5, 4 * n / 5, n];
        for (k, zone) in profile.zones.iter_mut().enumerate() {
            zone.start = cuts[k];
            zone.end = cuts[k + 1];
            zone.inner_radius = profile.radius[cuts[k].min(n - 1)];
            zone.outer_radius = profile.radius[cuts[k + 1].min(n) - 1];
        }
        input.profile = profile;
        for format in Format::ALL {
            let text = render(&input, format).unwrap();
            proptest::prop_assert!(!text.is_empty());
        }
        let json: serde_json::Value = serde_json::from_str(&render(&input, Format::Json).unwrap()).unwrap();
        let points = json["profile"].as_array().unwrap();
        proptest::prop_assert!(points.len() <= 60 && points.len() >= 2);
        let first = points[0]["diameter_m"].as_f64().unwrap();
        let last = points[points.len() - 1]["diameter_m"].as_f64().unwrap();
        proptest::prop_assert!((first - 2.0 * CORE_RADIUS).abs() < 1e-9);
        proptest::prop_assert!((last - 2.0 * OUTER_RADIUS).abs() < 1e-9);
    }
}

/// The what-if margins of a report are the two margins tables side by side: "before" is the
/// report's own "Margins against each failure" row by row (one criterion, one function), and
/// the core crush row is the rating over the core pressure of each solve (docs/theory.md §5.4:
/// margin = rated crush pressure / core pressure).
#[test]
fn comparison_margins_pair_the_two_margins_tables() {
    let input = fixture(true);
    let doc = rolltriage::report::build_document(&input).unwrap();
    let comparison = doc.remedy_comparison.as_ref().expect("remedy applied");
    assert_eq!(comparison.margins.len(), doc.margins.rows.len());
    for (m, row) in comparison.margins.iter().zip(&doc.margins.rows) {
        assert_eq!(m.id, row.id);
        assert_eq!(m.before, row.margin);
        assert_eq!(m.before_text, row.margin_text);
    }
    let crush = comparison
        .margins
        .iter()
        .find(|m| m.id == "core_crush")
        .expect("core crush row");
    let after_case = &input.remedy.as_ref().unwrap().after_case;
    let expected =
        after_case.core.crush_pressure / input.remedy.as_ref().unwrap().after.summary.core_pressure;
    assert!(
        (crush.after - expected).abs() <= 1e-3 * expected,
        "{} {expected}",
        crush.after
    );
}
