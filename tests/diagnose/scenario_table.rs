//! Table-driven diagnosis scenarios (tests/scenarios/diagnose.yaml): each row is an invented roll
//! built from a base web of tests/common, with changed settings, observed symptoms and the
//! operator's answers, and what must rank first (or in the top three, or above another cause).
//! Every row names the outside source its expectation comes from — a publication or a trade
//! fact marked `common practice` — in its `source` field; the table is checked as a whole so one
//! run reports every row that disagrees.

use crate::common;

use std::collections::{BTreeMap, BTreeSet};

use common::*;
use rolltriage::case::ResolvedCase;
use rolltriage::diagnose::{self, DiagnoseOptions, Diagnosis, rules::RuleBase};
use rolltriage::model::{Taper, WindingMethod};
use rolltriage::vocabulary::SYMPTOM_IDS;

#[derive(Debug, serde::Deserialize)]
#[serde(deny_unknown_fields)]
struct Table {
    scenarios: Vec<Scenario>,
}

#[derive(Debug, serde::Deserialize)]
#[serde(deny_unknown_fields)]
struct Scenario {
    name: String,
    source: String,
    base: String,
    #[serde(default)]
    set: Settings,
    /// A band wound at another tension: [from diameter m, to diameter m, tension N/m].
    #[serde(default)]
    upset: Option<[f64; 3]>,
    symptoms: Vec<String>,
    #[serde(default, rename = "where")]
    place: BTreeMap<String, String>,
    #[serde(default)]
    answers: BTreeMap<String, String>,
    #[serde(default)]
    first: Option<String>,
    #[serde(default)]
    top3: Vec<String>,
    /// Pairs [lower, higher]: `higher` must outrank `lower` (or `lower` be absent).
    #[serde(default)]
    below: Vec<[String; 2]>,
    /// Causes that must not rank first.
    #[serde(default)]
    not_first: Vec<String>,
    /// Remedy pairs [earlier, later] in the merged list (the row then runs the what-if
    /// re-solves, which order remedies of one cause by their computed effect).
    #[serde(default)]
    remedy_order: Vec<[String; 2]>,
    /// Remedies the re-solve must flag as predicted to do little.
    #[serde(default)]
    little: Vec<String>,
    /// Remedies the re-solve must not flag as predicted to do little.
    #[serde(default)]
    not_little: Vec<String>,
}

/// Changes to the base roll, SI units.
#[derive(Debug, Default, serde::Deserialize)]
#[serde(deny_unknown_fields)]
struct Settings {
    tension: Option<f64>,
    /// Linear taper as a fraction (0.2 = 20 %); 0 = constant tension.
    taper: Option<f64>,
    hyperbolic_taper: Option<f64>,
    /// Nip load N/m; 0 = no nip roll.
    nip: Option<f64>,
    speed: Option<f64>,
    temperature: Option<f64>,
    diameter: Option<f64>,
    friction: Option<f64>,
    roughness: Option<f64>,
    thickness: Option<f64>,
    width: Option<f64>,
    strength: Option<f64>,
    material: Option<String>,
    method: Option<String>,
    acceleration_time: Option<f64>,
    core_modulus: Option<f64>,
    core_crush: Option<f64>,
    /// The usual (recipe) tension the case states, N/m.
    recipe_tension: Option<f64>,
}

fn table() -> Table {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/scenarios/diagnose.yaml");
    let text = std::fs::read_to_string(path).unwrap();
    yaml::from_str(&text).unwrap_or_else(|e| panic!("{path}: {e}"))
}

fn build(s: &Scenario) -> ResolvedCase {
    let mut case = match s.base.as_str() {
        "newsprint" => newsprint(&s.name),
        "pet_film" => pet_film(&s.name),
        other => panic!("{}: unknown base {other}", s.name),
    };
    let set = &s.set;
    if let Some(t) = set.tension {
        case.winding.tension.start_tension = t;
    }
    if let Some(f) = set.taper {
        case.winding.tension.taper = if f == 0.0 {
            Taper::None
        } else {
            Taper::Linear { fraction: f }
        };
    }
    if let Some(f) = set.hyperbolic_taper {
        case.winding.tension.taper = Taper::Hyperbolic { fraction: f };
    }
    if let Some(n) = set.nip {
        case.winding.nip_load = (n > 0.0).then_some(n);
    }
    if let Some(v) = set.speed {
        case.winding.speed = v;
    }
    if let Some(t) = set.temperature {
        case.winding.temperature = Some(t);
    }
    if let Some(d) = set.diameter {
        case.roll.outer_diameter = d;
    }
    if let Some(m) = set.friction {
        case.web.friction = m;
    }
    if let Some(r) = set.roughness {
        case.web.roughness = r;
    }
    if let Some(h) = set.thickness {
        case.web.thickness = h;
    }
    if let Some(w) = set.width {
        case.web.width = w;
    }
    if let Some(s) = set.strength {
        case.web.strength = s;
    }
    if let Some(m) = &set.material {
        case.web.material = rolltriage::vocabulary::WebMaterial::from_id(m)
            .unwrap_or_else(|| panic!("{}: unknown material {m}", s.name));
    }
    if let Some(m) = &set.method {
        case.winding.method = match m.as_str() {
            "centre" => WindingMethod::Centre,
            "surface" => WindingMethod::Surface,
            "centre_surface" => WindingMethod::CentreSurface,
            other => panic!("{}: unknown method {other}", s.name),
        };
    }
    if let Some(t) = set.recipe_tension {
        case.winding.recipe_tension = Some(t);
    }
    if let Some(t) = set.acceleration_time {
        case.winding.acceleration_time = Some(t);
    }
    if set.core_modulus.is_some() || set.core_crush.is_some() {
        let (inside, outside) = (case.core.inside_diameter, case.core.outside_diameter);
        let modulus = set.core_modulus.unwrap_or(match case.core.stiffness {
            rolltriage::model::CoreStiffness::Hollow { modulus, .. } => modulus,
            _ => 2.0e9,
        });
        let crush = set.core_crush.unwrap_or(case.core.crush_pressure);
        case.core = paper_core(inside, outside, modulus, crush);
    }
    if let Some([from, to, tension]) = s.upset {
        case = upset(case, from, to, tension);
    }
    let symptoms: Vec<&str> = s.symptoms.iter().map(String::as_str).collect();
    case = with_symptoms(case, &symptoms);
    for (symptom, place) in &s.place {
        case = at(case, symptom, place);
    }
    for (question, value) in &s.answers {
        case = answer(case, question, value);
    }
    case
}

fn run(rules: &RuleBase, case: &ResolvedCase, what_if: bool) -> Diagnosis {
    // As the CLI's defaults when remedies are checked (the top five causes give the remedies).
    let options = DiagnoseOptions {
        top: if what_if { 5 } else { 0 },
        what_if,
        solver: common::SOLVER,
    };
    diagnose::triage(rules, case, &options).unwrap().1
}

fn rank(d: &Diagnosis, cause: &str) -> Option<usize> {
    d.causes.iter().position(|c| c.id == cause)
}

/// The problems of one scenario, empty when it holds.
fn check(s: &Scenario, d: &Diagnosis) -> Vec<String> {
    let mut problems = Vec::new();
    let first = d.causes.first().map(|c| c.id.as_str());
    if let Some(want) = &s.first
        && first != Some(want.as_str())
    {
        problems.push(format!("first should be {want}"));
    }
    for cause in &s.top3 {
        if rank(d, cause).is_none_or(|r| r >= 3) {
            problems.push(format!("{cause} should be in the top 3"));
        }
    }
    for [lower, higher] in &s.below {
        let l = rank(d, lower).unwrap_or(usize::MAX);
        match rank(d, higher) {
            Some(h) if h < l => {}
            _ => problems.push(format!("{higher} should outrank {lower}")),
        }
    }
    for cause in &s.not_first {
        if first == Some(cause.as_str()) {
            problems.push(format!("{cause} must not lead"));
        }
    }
    let place = |id: &str| d.remedies.iter().position(|r| r.id == id);
    for [earlier, later] in &s.remedy_order {
        match (place(earlier), place(later)) {
            (Some(e), Some(l)) if e < l => {}
            _ => problems.push(format!("remedy {earlier} should come before {later}")),
        }
    }
    let little = |id: &str| {
        d.remedies
            .iter()
            .find(|r| r.id == id)
            .and_then(|r| r.what_if.as_ref())
            .map(|w| w.small_effect)
    };
    for id in &s.little {
        if little(id) != Some(true) {
            problems.push(format!("remedy {id} should be flagged as doing little"));
        }
    }
    for id in &s.not_little {
        if little(id) != Some(false) {
            problems.push(format!("remedy {id} should be listed, with an effect"));
        }
    }
    problems
}

fn listing(d: &Diagnosis) -> String {
    let causes = d
        .causes
        .iter()
        .take(6)
        .map(|c| format!("{} {:.2}", c.id, c.belief))
        .collect::<Vec<_>>()
        .join(", ");
    if d.remedies.iter().all(|r| r.what_if.is_none()) {
        return causes;
    }
    let remedies = d
        .remedies
        .iter()
        .map(|r| match &r.what_if {
            Some(w) if w.small_effect => format!("{} (little)", r.id),
            Some(w) if !w.indicator.is_empty() => {
                format!("{} ({} {} → {})", r.id, w.indicator, w.before, w.after)
            }
            _ => r.id.clone(),
        })
        .collect::<Vec<_>>()
        .join(", ");
    format!("{causes} — remedies: {remedies}")
}

#[test]
fn every_scenario_ranks_as_its_source_says() {
    let rules = RuleBase::embedded().unwrap();
    let table = table();
    let mut failures = Vec::new();
    for s in &table.scenarios {
        assert!(!s.source.trim().is_empty(), "{}: name the source", s.name);
        assert!(
            s.first.is_some()
                || !s.top3.is_empty()
                || !s.below.is_empty()
                || !s.remedy_order.is_empty(),
            "{}: expects nothing",
            s.name
        );
        let what_if =
            !(s.remedy_order.is_empty() && s.little.is_empty() && s.not_little.is_empty());
        let d = run(&rules, &build(s), what_if);
        let problems = check(s, &d);
        if !problems.is_empty() {
            failures.push(format!(
                "{}: {} — ranking: {}",
                s.name,
                problems.join("; "),
                listing(&d)
            ));
        }
    }
    assert!(
        failures.is_empty(),
        "{} of {} scenarios disagree:\n{}",
        failures.len(),
        table.scenarios.len(),
        failures.join("\n")
    );
}

#[test]
fn the_table_tells_at_least_three_causes_apart_for_every_symptom() {
    let table = table();
    let mut firsts: BTreeMap<&str, BTreeSet<&str>> = BTreeMap::new();
    for s in &table.scenarios {
        if let (Some(first), [symptom]) = (&s.first, s.symptoms.as_slice()) {
            firsts.entry(symptom).or_default().insert(first);
        }
    }
    for symptom in SYMPTOM_IDS {
        let n = firsts.get(symptom).map_or(0, BTreeSet::len);
        assert!(
            n >= 3,
            "{symptom}: only {n} distinct leading causes in the table"
        );
    }
    let names: BTreeSet<&str> = table.scenarios.iter().map(|s| s.name.as_str()).collect();
    assert_eq!(names.len(), table.scenarios.len(), "scenario names repeat");
}

#[test]
fn every_question_and_answer_in_the_table_exists() {
    let rules = RuleBase::embedded().unwrap();
    for s in table().scenarios {
        for (question, value) in &s.answers {
            let q = rules
                .question(question)
                .unwrap_or_else(|| panic!("{}: unknown question {question}", s.name));
            assert!(
                q.accepted().iter().any(|a| a == value),
                "{}: {question} does not accept {value}",
                s.name
            );
        }
    }
}

/// Every answer the rules count for a cause moves that cause's belief its way and no other:
/// answering with evidence for a cause never lowers it, evidence against never raises it
/// (certainty-factor combination is monotone, Shortliffe & Buchanan 1975). Checked for every
/// question answer of the shipped rules on an ordinary roll.
#[test]
fn adding_an_answer_for_a_cause_never_lowers_it() {
    use rolltriage::diagnose::indicators::Indicators;
    use rolltriage::diagnose::rank::rank;
    use rolltriage::diagnose::rules::Test;

    let rules = RuleBase::embedded().unwrap();
    for symptom in &rules.symptoms {
        let case = with_symptoms(newsprint("ordinary"), &[symptom.id.as_str()]);
        let indicators = Indicators::compute(&case, &profile(&case));
        let ids = vec![symptom.id.clone()];
        let belief = |case: &ResolvedCase, cause: &str| {
            rank(&rules, &ids, case, &indicators)
                .iter()
                .find(|c| c.id == cause)
                .map_or(0.0, |c| c.belief)
        };
        for rule in &symptom.rules {
            let before = belief(&case, &rule.cause);
            for question in &symptom.questions {
                for value in question.accepted() {
                    let weights: Vec<f64> = rule
                        .evidence
                        .iter()
                        .filter(|e| {
                            matches!(&e.test, Test::Answer { question: q, values }
                                if *q == question.id && values.iter().any(|v| v == value))
                        })
                        .map(|e| e.weight)
                        .collect();
                    let after = belief(&answer(case.clone(), &question.id, value), &rule.cause);
                    let what =
                        format!("{} {}={value}: {before} → {after}", rule.cause, question.id);
                    if weights.is_empty() {
                        assert!(
                            (after - before).abs() < 1e-12,
                            "{what}: moved without evidence"
                        );
                    } else if weights.iter().all(|w| *w > 0.0) {
                        assert!(
                            after >= before - 1e-12,
                            "{what}: evidence for it lowered it"
                        );
                    } else if weights.iter().all(|w| *w < 0.0) {
                        assert!(
                            after <= before + 1e-12,
                            "{what}: evidence against it raised it"
                        );
                    }
                }
            }
        }
    }
}
