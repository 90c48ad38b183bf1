//! Compiling raw rule files into the rule base: name checks, thresholds in trade units,
//! problems collected with file and line.

use super::raw::*;
use super::*;

// ---------------------------------------------------------------------------------------------
// Compilation helpers.

#[derive(Default)]
pub(super) struct Problems {
    list: Vec<(String, usize, String)>,
}

impl Problems {
    pub(super) fn add(&mut self, file: &str, line: usize, message: &str) {
        self.list
            .push((file.to_string(), line.max(1), message.to_string()));
    }

    pub(super) fn into_result(self, base: RuleBase) -> Result<RuleBase, RuleError> {
        match self.list.len() {
            0 => Ok(base),
            1 => {
                let (file, line, message) = self.list.into_iter().next().unwrap_or_default();
                Err(RuleError::Invalid {
                    file,
                    line,
                    message,
                })
            }
            count => Err(RuleError::Many {
                count,
                listing: self
                    .list
                    .iter()
                    .map(|(f, l, m)| format!("  {f}:{l}: {m}"))
                    .collect::<Vec<_>>()
                    .join("\n"),
            }),
        }
    }
}

/// Parse YAML, turning serde's message into one with a line and a "did you mean".
pub(super) fn parse<T: serde::de::DeserializeOwned>(
    file: &str,
    text: &str,
    problems: &mut Problems,
) -> Option<T> {
    // Aliases are refused before parsing: expanding an alias chain costs work exponential in
    // the file size.
    if let Some((line, _)) = crate::case::yaml_guard::first_alias(text) {
        problems.add(
            file,
            line,
            "a YAML alias (`*name`) is not accepted in a rule file; write the value out instead",
        );
        return None;
    }
    match yaml::from_str::<T>(text) {
        Ok(v) => Some(v),
        Err(e) => {
            let line = e.location().map(|l| l.line()).unwrap_or(1);
            let message = e.to_string();
            let hint = unknown_field_hint(&message);
            problems.add(file, line, &format!("{message}{hint}"));
            None
        }
    }
}

/// For "unknown field `x`, expected one of `a`, `b`" messages: the closest expected name.
pub(super) fn unknown_field_hint(message: &str) -> String {
    if !message.contains("unknown field") && !message.contains("unknown variant") {
        return String::new();
    }
    let quoted: Vec<&str> = message.split('`').skip(1).step_by(2).collect();
    let Some((given, expected)) = quoted.split_first() else {
        return String::new();
    };
    match vocabulary::closest(given, expected.iter().copied()) {
        Some(best) => format!(" (did you mean `{best}`?)"),
        None => String::new(),
    }
}

/// Line (1-based) of the first line mentioning `needle` as a whole word; 1 when not found.
pub(super) fn line_of(text: &str, needle: &str) -> usize {
    line_of_after(text, needle, 0)
}

/// Like [`line_of`] but only lines after `after` (1-based) count.
pub(super) fn line_of_after(text: &str, needle: &str, after: usize) -> usize {
    for (i, line) in text.lines().enumerate() {
        if i < after {
            continue;
        }
        let mut rest = line;
        while let Some(pos) = rest.find(needle) {
            let before = rest[..pos].chars().next_back();
            let after_c = rest[pos + needle.len()..].chars().next();
            let word =
                |c: Option<char>| c.is_some_and(|c| c.is_alphanumeric() || c == '_' || c == '.');
            if !word(before) && !word(after_c) {
                return i + 1;
            }
            rest = &rest[pos + needle.len()..];
        }
    }
    if after > 0 { after } else { 1 }
}

pub(super) fn did_you_mean<'a, I: IntoIterator<Item = &'a str>>(
    given: &str,
    candidates: I,
) -> String {
    match vocabulary::closest(given, candidates) {
        Some(best) => format!(" (did you mean `{best}`?)"),
        None => String::new(),
    }
}

/// Where a name refers to a catalogue entry: the file, its text, the line to search from and
/// what the message starts with (`remedy `x`: `, or nothing).
pub(super) struct Site<'a> {
    file: &'a str,
    text: &'a str,
    after: usize,
    owner: &'a str,
}

impl<'a> Site<'a> {
    pub(super) fn new(file: &'a str, text: &'a str, after: usize, owner: &'a str) -> Self {
        Site {
            file,
            text,
            after,
            owner,
        }
    }
}

/// Reports `name` (a `kind`, e.g. `remedy`) unless `catalogue` (read from `catalogue_file`)
/// holds it, at the first line naming it after `site.after`, with the closest valid name.
/// Returns whether it is there.
pub(super) fn check_listed<V>(
    name: &str,
    kind: &str,
    catalogue: &BTreeMap<String, V>,
    catalogue_file: &str,
    site: &Site,
    problems: &mut Problems,
) -> bool {
    if catalogue.contains_key(name) {
        return true;
    }
    problems.add(
        site.file,
        line_of_after(site.text, name, site.after),
        &format!(
            "{}{kind} `{name}` is not in {catalogue_file}{}",
            site.owner,
            did_you_mean(name, catalogue.keys().map(String::as_str))
        ),
    );
    false
}

pub(super) fn check_remedy(
    id: &str,
    file: &str,
    text: &str,
    base: &RuleBase,
    problems: &mut Problems,
) {
    let site = Site::new(file, text, 0, "");
    check_listed(
        id,
        "remedy",
        &base.remedies,
        "remedies.yaml",
        &site,
        problems,
    );
}

pub(super) fn compile_remedy(
    id: &str,
    raw: RawRemedy,
    file: &str,
    text: &str,
    base: &RuleBase,
    problems: &mut Problems,
) -> Option<Remedy> {
    let line = line_of(text, id);
    let mut ok = true;
    if !REMEDY_GROUPS.contains(&raw.group.as_str()) {
        problems.add(
            file,
            line_of_after(text, &raw.group, line),
            &format!(
                "remedy `{id}`: unknown group `{}`; accepted: {}{}",
                raw.group,
                REMEDY_GROUPS.join(", "),
                did_you_mean(&raw.group, REMEDY_GROUPS)
            ),
        );
        ok = false;
    }
    let cost = match raw.cost.as_str() {
        "low" => Cost::Low,
        "medium" => Cost::Medium,
        "high" => Cost::High,
        other => {
            problems.add(
                file,
                line_of_after(text, other, line),
                &format!("remedy `{id}`: cost `{other}` is not one of low, medium, high"),
            );
            ok = false;
            Cost::High
        }
    };
    let owner = format!("remedy `{id}`: ");
    let site = Site::new(file, text, line, &owner);
    for caution in &raw.cautions {
        ok &= check_listed(
            caution,
            "caution",
            &base.cautions,
            "cautions.yaml",
            &site,
            problems,
        );
    }
    let mut changes = Vec::new();
    for change in raw.change {
        let at = line_of_after(text, &change.setting, line);
        let factor = |problems: &mut Problems, range: (f64, f64)| -> Option<f64> {
            match change.scale {
                Some(f) if f > range.0 && f <= range.1 => Some(f),
                Some(f) => {
                    problems.add(
                        file,
                        at,
                        &format!(
                            "remedy `{id}`: scale {f} for `{}` is out of range; accepted {} < scale ≤ {}",
                            change.setting, range.0, range.1
                        ),
                    );
                    None
                }
                None => {
                    problems.add(
                        file,
                        at,
                        &format!("remedy `{id}`: setting `{}` needs `scale`", change.setting),
                    );
                    None
                }
            }
        };
        let compiled = match change.setting.as_str() {
            "tension" => factor(problems, (0.3, 2.0)).map(SettingChange::TensionScale),
            "nip_load" => factor(problems, (0.0, 3.0)).map(SettingChange::NipScale),
            "speed" => factor(problems, (0.1, 2.0)).map(SettingChange::SpeedScale),
            "core_stiffness" => {
                factor(problems, (0.1, 100.0)).map(SettingChange::CoreStiffnessScale)
            }
            "core_crush_rating" => factor(problems, (0.1, 10.0)).map(SettingChange::CoreCrushScale),
            "core_zone_tension" => {
                factor(problems, (0.3, 2.0)).map(SettingChange::CoreZoneTensionScale)
            }
            "tension_upsets" => match change.clear {
                Some(true) => Some(SettingChange::ClearUpsets),
                _ => {
                    problems.add(
                        file,
                        at,
                        &format!("remedy `{id}`: `tension_upsets` needs `clear: true`"),
                    );
                    None
                }
            },
            "taper" => match (change.by_percent_points, change.to_percent) {
                (Some(d), None) if (-90.0..=90.0).contains(&d) && d != 0.0 => {
                    Some(SettingChange::TaperBy(d))
                }
                (None, Some(t)) if (0.0..=90.0).contains(&t) => Some(SettingChange::TaperTo(t)),
                _ => {
                    problems.add(
                        file,
                        at,
                        &format!(
                            "remedy `{id}`: `taper` needs either `by_percent_points` (−90..90, not 0) or `to_percent` (0..90)"
                        ),
                    );
                    None
                }
            },
            other => {
                problems.add(
                    file,
                    at,
                    &format!(
                        "remedy `{id}`: unknown setting `{other}`; accepted: {}{}",
                        SETTINGS.join(", "),
                        did_you_mean(other, SETTINGS)
                    ),
                );
                None
            }
        };
        match compiled {
            Some(c) => changes.push(c),
            None => ok = false,
        }
    }
    if raw.text.trim().is_empty() {
        problems.add(file, line, &format!("remedy `{id}` has no text"));
        ok = false;
    }
    ok.then(|| Remedy {
        id: id.to_string(),
        text: raw.text.trim().to_string(),
        group: raw.group,
        cost,
        cautions: raw.cautions,
        changes,
    })
}

pub(super) fn compile_symptom(
    raw: RawSymptomFile,
    file: &str,
    text: &str,
    base: &RuleBase,
    problems: &mut Problems,
) -> Option<SymptomRules> {
    let before = problems.list.len();
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
    let mut questions: Vec<Question> = Vec::new();
    for q in raw.questions {
        let line = line_of(text, &q.id);
        let prefix = format!("{}.", raw.symptom);
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
    let mut rules = Vec::new();
    let mut last_line = 0;
    for rule in raw.causes {
        let line = line_of_after(text, &rule.cause, last_line);
        last_line = line;
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
        if rules.iter().any(|r: &CauseRule| r.cause == rule.cause) {
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
        let mut evidence = Vec::new();
        let mut evidence_line = line;
        for ev in rule.evidence {
            let key = ev
                .indicator
                .as_deref()
                .or(ev.question.as_deref())
                .unwrap_or("weight");
            evidence_line = line_of_after(text, key, evidence_line);
            if let Some(e) =
                compile_evidence(ev, &raw.symptom, &questions, file, evidence_line, problems)
            {
                evidence.push(e);
            }
        }
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
        let zone = match ev.zone.as_deref() {
            None => None,
            Some(z) => match ZoneName::ALL.iter().find(|n| n.as_str() == z) {
                Some(n) => Some(*n),
                None => {
                    problems.add(
                        file,
                        line,
                        &format!(
                            "unknown zone `{z}`; accepted: core, inner, middle, outer, surface{}",
                            did_you_mean(z, ZoneName::ALL.iter().map(|n| n.as_str()))
                        ),
                    );
                    None
                }
            },
        };
        match (spec.zones, zone.is_some(), ev.zone.is_some()) {
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
        let (comparison, raw_threshold) = match (ev.above, ev.below) {
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
        let threshold = match raw_threshold {
            RawThreshold::Number(v) => match spec.dimension {
                Dimension::Fraction if !(0.0..=1.0).contains(&v) => {
                    problems.add(
                        file,
                        line,
                        &format!("indicator `{id}` is a share 0..1; {v} is out of range (write \"{v} %\" for percent)"),
                    );
                    v
                }
                _ => v,
            },
            RawThreshold::Text(t) => match indicators::parse_threshold(&t, spec.dimension) {
                Ok(v) => v,
                Err(message) => {
                    problems.add(file, line, &format!("indicator `{id}`: {message}"));
                    0.0
                }
            },
        };
        Test::Indicator {
            id,
            zone,
            comparison,
            threshold,
            dimension: spec.dimension,
        }
    } else if let Some(question) = ev.question {
        let values = ev.is.map(OneOrMany::into_vec).unwrap_or_default();
        match questions.iter().find(|q| q.id == question) {
            None => {
                let known: Vec<&str> = questions.iter().map(|q| q.id.as_str()).collect();
                problems.add(
                    file,
                    line,
                    &format!(
                        "question `{question}` is not asked in this file (symptom `{symptom}`){}",
                        did_you_mean(&question, known.iter().copied())
                    ),
                );
            }
            Some(q) => {
                if values.is_empty() {
                    problems.add(
                        file,
                        line,
                        &format!(
                            "question evidence `{question}` needs `is:` (one answer or a list)"
                        ),
                    );
                }
                let accepted: Vec<&str> = q.choices.iter().map(|c| c.id.as_str()).collect();
                for v in &values {
                    if !accepted.contains(&v.as_str()) {
                        problems.add(
                            file,
                            line,
                            &format!(
                                "question `{question}`: answer `{v}` is not one of {}{}",
                                accepted.join(", "),
                                did_you_mean(v, accepted.iter().copied())
                            ),
                        );
                    }
                }
            }
        }
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
    let scope = match ev.scope.as_deref() {
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
    };
    (problems.list.len() == before).then(|| Evidence {
        test,
        weight: ev.weight,
        scope,
        says: ev.says.trim().to_string(),
    })
}

pub(super) fn check_words(
    values: &[String],
    accepted: &[&str],
    what: &str,
    file: &str,
    line: usize,
    problems: &mut Problems,
) {
    for v in values {
        if !accepted.contains(&v.as_str()) {
            problems.add(
                file,
                line,
                &format!(
                    "unknown {what} `{v}`; accepted: {}{}",
                    accepted.join(", "),
                    did_you_mean(v, accepted.iter().copied())
                ),
            );
        }
    }
}
