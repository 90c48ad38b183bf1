//! Symptoms: symptom files compiled — heading, questions, cause rules and the evidence
//! each rule tests (indicator, zone, threshold, answers, scope).

use super::*;

pub(super) fn compile_symptom(
    raw: RawSymptomFile,
    file: &str,
    text: &str,
    base: &RuleBase,
    problems: &mut Problems,
) -> Option<SymptomRules> {
    let before = problems.list.len();
    check_symptom_heading(&raw, file, text, problems);
    let questions = compile_questions(raw.questions, &raw.symptom, file, text, problems);
    let mut rules = Vec::new();
    let mut last_line = 0;
    for rule in raw.causes {
        let line = line_of_after(text, &rule.cause, last_line);
        last_line = line;
        check_cause_rule(&rule, &rules, file, text, line, base, problems);
        let evidence = compile_rule_evidence(
            rule.evidence,
            &raw.symptom,
            &questions,
            file,
            text,
            line,
            problems,
        );
        rules.push(CauseRule {
            cause: rule.cause,
            because: rule.because.trim().to_string(),
            prior: rule.prior,
            evidence,
            remedies: rule.remedies,
        });
    }
    (problems.list.len() == before).then(|| SymptomRules {
        id: raw.symptom,
        title: raw.title,
        description: raw.description.trim().to_string(),
        aliases: raw.aliases,
        places: raw.places,
        sources: raw.sources,
        questions,
        rules,
        file: file.to_string(),
    })
}

/// The symptom file's head: a known symptom ID, known places, and sources cited.
fn check_symptom_heading(raw: &RawSymptomFile, file: &str, text: &str, problems: &mut Problems) {
    if !vocabulary::is_symptom(&raw.symptom) {
        problems.add(
            file,
            line_of(text, &raw.symptom),
            &format!(
                "unknown symptom `{}`{}",
                raw.symptom,
                did_you_mean(&raw.symptom, vocabulary::SYMPTOM_IDS)
            ),
        );
    }
    for place in &raw.places {
        if !vocabulary::PLACES.contains(&place.as_str()) {
            problems.add(
                file,
                line_of(text, place),
                &format!(
                    "unknown place `{place}`; accepted: {}{}",
                    vocabulary::PLACES.join(", "),
                    did_you_mean(place, vocabulary::PLACES)
                ),
            );
        }
    }
    if raw.sources.is_empty() {
        problems.add(file, 1, "a symptom file must cite its sources (`sources:`)");
    }
}

/// The questions a symptom file asks: IDs under the symptom's prefix, each once; a question
/// without choices is a yes/no question.
fn compile_questions(
    raw: Vec<RawQuestion>,
    symptom: &str,
    file: &str,
    text: &str,
    problems: &mut Problems,
) -> Vec<Question> {
    let mut questions: Vec<Question> = Vec::new();
    for q in raw {
        let line = line_of(text, &q.id);
        let prefix = format!("{symptom}.");
        if !q.id.starts_with(&prefix) {
            problems.add(
                file,
                line,
                &format!("question `{}` must start with `{prefix}`", q.id),
            );
        }
        if questions.iter().any(|x| x.id == q.id) {
            problems.add(file, line, &format!("question `{}` is defined twice", q.id));
        }
        let yes_no = q.choices.is_empty();
        let choices = if yes_no {
            vec![
                Choice {
                    id: "yes".into(),
                    text: "yes".into(),
                },
                Choice {
                    id: "no".into(),
                    text: "no".into(),
                },
            ]
        } else {
            q.choices
                .into_iter()
                .map(|c| Choice {
                    id: c.id,
                    text: c.text,
                })
                .collect()
        };
        questions.push(Question {
            id: q.id,
            text: q.text.trim().to_string(),
            choices,
            yes_no,
        });
    }
    questions
}

/// A symptom → cause link: a known cause, linked once in the file, a prior in 0..1 and
/// remedies from the catalogue.
fn check_cause_rule(
    rule: &RawRule,
    earlier: &[CauseRule],
    file: &str,
    text: &str,
    line: usize,
    base: &RuleBase,
    problems: &mut Problems,
) {
    if !base.causes.contains_key(&rule.cause) {
        problems.add(
            file,
            line,
            &format!(
                "unknown cause `{}`{}",
                rule.cause,
                did_you_mean(&rule.cause, base.causes.keys().map(String::as_str))
            ),
        );
    }
    if earlier.iter().any(|r| r.cause == rule.cause) {
        problems.add(
            file,
            line,
            &format!("cause `{}` is linked twice in this file", rule.cause),
        );
    }
    if !(0.0..=1.0).contains(&rule.prior) {
        problems.add(
            file,
            line_of_after(text, "prior", line),
            &format!(
                "cause `{}`: prior {} is out of range; accepted 0..1",
                rule.cause, rule.prior
            ),
        );
    }
    let owner = format!("cause `{}`: ", rule.cause);
    let site = Site::new(file, text, line, &owner);
    for remedy in &rule.remedies {
        check_listed(
            remedy,
            "remedy",
            &base.remedies,
            "remedies.yaml",
            &site,
            problems,
        );
    }
}

/// The evidence entries of one cause link, each found on its own line after the link's line.
fn compile_rule_evidence(
    raw: Vec<RawEvidence>,
    symptom: &str,
    questions: &[Question],
    file: &str,
    text: &str,
    line: usize,
    problems: &mut Problems,
) -> Vec<Evidence> {
    let mut evidence = Vec::new();
    let mut evidence_line = line;
    for ev in raw {
        let key = ev
            .indicator
            .as_deref()
            .or(ev.question.as_deref())
            .unwrap_or("weight");
        evidence_line = line_of_after(text, key, evidence_line);
        if let Some(e) = compile_evidence(ev, symptom, questions, file, evidence_line, problems) {
            evidence.push(e);
        }
    }
    evidence
}

pub(super) const METHODS: &[&str] = vocabulary::WINDING_METHOD_IDS;

pub(super) fn compile_evidence(
    ev: RawEvidence,
    symptom: &str,
    questions: &[Question],
    file: &str,
    line: usize,
    problems: &mut Problems,
) -> Option<Evidence> {
    let before = problems.list.len();
    if !(-1.0..=1.0).contains(&ev.weight) || ev.weight == 0.0 {
        problems.add(
            file,
            line,
            &format!(
                "evidence weight {} is out of range; accepted −1..1, not 0",
                ev.weight
            ),
        );
    }
    let kinds = [
        ev.indicator.is_some(),
        ev.question.is_some(),
        ev.material.is_some(),
        ev.method.is_some(),
        ev.place.is_some(),
    ]
    .iter()
    .filter(|x| **x)
    .count();
    if kinds != 1 {
        problems.add(
            file,
            line,
            "each evidence entry tests exactly one of `indicator`, `question`, `material`, `method`, `place`",
        );
        return None;
    }
    let test = if let Some(id) = ev.indicator {
        indicator_test(
            id,
            ev.zone.as_deref(),
            ev.above,
            ev.below,
            file,
            line,
            problems,
        )?
    } else if let Some(question) = ev.question {
        let values = ev.is.map(OneOrMany::into_vec).unwrap_or_default();
        check_answers(&question, &values, symptom, questions, file, line, problems);
        Test::Answer { question, values }
    } else if let Some(m) = ev.material {
        let values = m.into_vec();
        let accepted = vocabulary::WebMaterial::IDS;
        check_words(&values, accepted, "material", file, line, problems);
        Test::Material(
            values
                .iter()
                .filter_map(|v| vocabulary::WebMaterial::from_id(v))
                .collect(),
        )
    } else if let Some(m) = ev.method {
        let values = m.into_vec();
        check_words(&values, METHODS, "method", file, line, problems);
        Test::Method(values)
    } else if let Some(p) = ev.place {
        let values = p.into_vec();
        check_words(
            &values,
            vocabulary::Place::IDS,
            "place",
            file,
            line,
            problems,
        );
        Test::Place(
            values
                .iter()
                .filter_map(|v| vocabulary::Place::from_id(v))
                .collect(),
        )
    } else {
        return None;
    };
    if ev.zone.is_some() && !matches!(test, Test::Indicator { .. }) {
        problems.add(file, line, "`zone` belongs to indicator evidence only");
    }
    let scope = evidence_scope(ev.scope.as_deref(), file, line, problems);
    (problems.list.len() == before).then(|| Evidence {
        test,
        weight: ev.weight,
        scope,
        says: ev.says.trim().to_string(),
    })
}

/// An indicator test: a known indicator, a zone where the indicator takes one, and one
/// threshold (`above` or `below`) in the indicator's dimension. None when it cannot be built.
fn indicator_test(
    id: String,
    zone: Option<&str>,
    above: Option<RawThreshold>,
    below: Option<RawThreshold>,
    file: &str,
    line: usize,
    problems: &mut Problems,
) -> Option<Test> {
    let Some(spec) = indicators::indicator_spec(&id) else {
        problems.add(
            file,
            line,
            &format!(
                "unknown indicator `{id}`{}",
                did_you_mean(&id, indicators::INDICATORS.iter().map(|s| s.id))
            ),
        );
        return None;
    };
    let zone_name = zone_named(zone, file, line, problems);
    match (spec.zones, zone_name.is_some(), zone.is_some()) {
        (ZoneUse::Required, false, false) => problems.add(
            file,
            line,
            &format!("indicator `{id}` needs a `zone` (core, inner, middle, outer, surface)"),
        ),
        (ZoneUse::None, _, true) => problems.add(
            file,
            line,
            &format!("indicator `{id}` is for the whole roll and takes no `zone`"),
        ),
        _ => {}
    }
    let (comparison, raw_threshold) = match (above, below) {
        (Some(t), None) => (Comparison::Above, t),
        (None, Some(t)) => (Comparison::Below, t),
        _ => {
            problems.add(
                file,
                line,
                &format!("indicator `{id}` needs exactly one of `above` or `below`"),
            );
            return None;
        }
    };
    let threshold = indicator_threshold(&id, spec.dimension, raw_threshold, file, line, problems);
    Some(Test::Indicator {
        id,
        zone: zone_name,
        comparison,
        threshold,
        dimension: spec.dimension,
    })
}

/// The zone an evidence entry names, if any; an unknown name is reported and reads as none.
fn zone_named(
    zone: Option<&str>,
    file: &str,
    line: usize,
    problems: &mut Problems,
) -> Option<ZoneName> {
    let z = zone?;
    let found = ZoneName::ALL.iter().find(|n| n.as_str() == z).copied();
    if found.is_none() {
        problems.add(
            file,
            line,
            &format!(
                "unknown zone `{z}`; accepted: core, inner, middle, outer, surface{}",
                did_you_mean(z, ZoneName::ALL.iter().map(|n| n.as_str()))
            ),
        );
    }
    found
}

/// An indicator threshold in SI: a bare number as it stands (a share must lie in 0..1), a text
/// with a unit converted for the indicator's dimension.
fn indicator_threshold(
    id: &str,
    dimension: Dimension,
    raw: RawThreshold,
    file: &str,
    line: usize,
    problems: &mut Problems,
) -> f64 {
    match raw {
        RawThreshold::Number(v) => {
            if matches!(dimension, Dimension::Fraction) && !(0.0..=1.0).contains(&v) {
                problems.add(
                    file,
                    line,
                    &format!("indicator `{id}` is a share 0..1; {v} is out of range (write \"{v} %\" for percent)"),
                );
            }
            v
        }
        RawThreshold::Text(t) => match indicators::parse_threshold(&t, dimension) {
            Ok(v) => v,
            Err(message) => {
                problems.add(file, line, &format!("indicator `{id}`: {message}"));
                0.0
            }
        },
    }
}

/// Question evidence: the question is asked in this symptom file, and each answer tested
/// (at least one) is one of its choices.
fn check_answers(
    question: &str,
    values: &[String],
    symptom: &str,
    questions: &[Question],
    file: &str,
    line: usize,
    problems: &mut Problems,
) {
    let Some(q) = questions.iter().find(|q| q.id == question) else {
        let known: Vec<&str> = questions.iter().map(|q| q.id.as_str()).collect();
        problems.add(
            file,
            line,
            &format!(
                "question `{question}` is not asked in this file (symptom `{symptom}`){}",
                did_you_mean(question, known.iter().copied())
            ),
        );
        return;
    };
    if values.is_empty() {
        problems.add(
            file,
            line,
            &format!("question evidence `{question}` needs `is:` (one answer or a list)"),
        );
    }
    let accepted: Vec<&str> = q.choices.iter().map(|c| c.id.as_str()).collect();
    refuse_unlisted(values, &accepted, file, line, problems, |v, list| {
        format!("question `{question}`: answer `{v}` is not one of {list}")
    });
}

/// Whom an evidence entry's weight goes to: the cause (default) or the whole symptom.
fn evidence_scope(scope: Option<&str>, file: &str, line: usize, problems: &mut Problems) -> Scope {
    match scope {
        None | Some("cause") => Scope::Cause,
        Some("symptom") => Scope::Symptom,
        Some(other) => {
            problems.add(
                file,
                line,
                &format!(
                    "unknown scope `{other}`; accepted: {}{}",
                    Scope::IDS.join(", "),
                    did_you_mean(other, Scope::IDS)
                ),
            );
            Scope::Cause
        }
    }
}
