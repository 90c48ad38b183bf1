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
    let mut ok = check_remedy_group(id, &raw.group, file, text, line, problems);
    let cost = remedy_cost(id, &raw.cost, file, text, line, problems);
    ok &= cost.is_some();
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
        match compile_change(id, &change, file, at, problems) {
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
        cost: cost.unwrap_or(Cost::High),
        cautions: raw.cautions,
        changes,
    })
}

/// Whether a remedy's `group` is one of [`REMEDY_GROUPS`]; reports it when not.
fn check_remedy_group(
    id: &str,
    group: &str,
    file: &str,
    text: &str,
    line: usize,
    problems: &mut Problems,
) -> bool {
    if REMEDY_GROUPS.contains(&group) {
        return true;
    }
    problems.add(
        file,
        line_of_after(text, group, line),
        &format!(
            "remedy `{id}`: unknown group `{group}`; accepted: {}{}",
            REMEDY_GROUPS.join(", "),
            did_you_mean(group, REMEDY_GROUPS)
        ),
    );
    false
}

/// A remedy's `cost` word; None (reported) when it is not low, medium or high.
fn remedy_cost(
    id: &str,
    cost: &str,
    file: &str,
    text: &str,
    line: usize,
    problems: &mut Problems,
) -> Option<Cost> {
    match cost {
        "low" => Some(Cost::Low),
        "medium" => Some(Cost::Medium),
        "high" => Some(Cost::High),
        other => {
            problems.add(
                file,
                line_of_after(text, other, line),
                &format!("remedy `{id}`: cost `{other}` is not one of low, medium, high"),
            );
            None
        }
    }
}

/// One `change:` entry of a remedy (a setting and how it changes), checked against the range
/// each setting accepts; None when it was reported.
fn compile_change(
    id: &str,
    change: &RawChange,
    file: &str,
    at: usize,
    problems: &mut Problems,
) -> Option<SettingChange> {
    let factor = |problems: &mut Problems, range: (f64, f64)| {
        change_scale(id, change, range, file, at, problems)
    };
    match change.setting.as_str() {
        "tension" => factor(problems, (0.3, 2.0)).map(SettingChange::TensionScale),
        "nip_load" => factor(problems, (0.0, 3.0)).map(SettingChange::NipScale),
        "speed" => factor(problems, (0.1, 2.0)).map(SettingChange::SpeedScale),
        "core_stiffness" => factor(problems, (0.1, 100.0)).map(SettingChange::CoreStiffnessScale),
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
    }
}

/// The `scale` of a change, when present and inside `range` (low end open, high end closed).
fn change_scale(
    id: &str,
    change: &RawChange,
    range: (f64, f64),
    file: &str,
    at: usize,
    problems: &mut Problems,
) -> Option<f64> {
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
}

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

pub(super) fn check_words(
    values: &[String],
    accepted: &[&str],
    what: &str,
    file: &str,
    line: usize,
    problems: &mut Problems,
) {
    refuse_unlisted(values, accepted, file, line, problems, |v, list| {
        format!("unknown {what} `{v}`; accepted: {list}")
    });
}

/// Reports each of `values` not in `accepted`: `refused(value, accepted words joined)` and the
/// closest accepted word.
fn refuse_unlisted(
    values: &[String],
    accepted: &[&str],
    file: &str,
    line: usize,
    problems: &mut Problems,
    refused: impl Fn(&str, &str) -> String,
) {
    for v in values {
        if !accepted.contains(&v.as_str()) {
            let message = refused(v, &accepted.join(", "));
            let hint = did_you_mean(v, accepted.iter().copied());
            problems.add(file, line, &format!("{message}{hint}"));
        }
    }
}

// ---------------------------------------------------------------------------------------------
// Reading the files of a rule directory into the rule base.

/// A rule file's name without its folder.
pub(super) fn file_base_name(f: &str) -> String {
    Path::new(f)
        .file_name()
        .map(|n| n.to_string_lossy().to_string())
        .unwrap_or_default()
}

/// The catalogue file `name` (found in the rule directory, or reported missing) with its
/// parsed contents.
fn parse_catalogue<'a, T: serde::de::DeserializeOwned>(
    name: &str,
    found: Option<&'a (String, String)>,
    problems: &mut Problems,
) -> Option<(&'a str, &'a str, T)> {
    let Some((file, text)) = found else {
        problems.add(name, 1, &format!("the rule directory has no {name}"));
        return None;
    };
    parse::<T>(file, text, problems).map(|raw| (file.as_str(), text.as_str(), raw))
}

/// Reads the cause catalogue (`causes.yaml`, when found) into `base`; every cause of the
/// vocabulary must be there. Returns `(file, text, remedy)` for each remedy a cause names, to
/// check once the remedy catalogue is read.
pub(super) fn add_causes<'a>(
    base: &mut RuleBase,
    found: Option<&'a (String, String)>,
    problems: &mut Problems,
) -> Vec<(&'a str, &'a str, String)> {
    let mut remedy_refs = Vec::new();
    let Some((file, text, raw)) = parse_catalogue::<RawCauseFile>("causes.yaml", found, problems)
    else {
        return remedy_refs;
    };
    base.sources.extend(raw.sources);
    for (id, cause) in raw.causes {
        for remedy in &cause.remedies {
            remedy_refs.push((file, text, remedy.clone()));
        }
        base.causes.insert(
            id.clone(),
            CauseInfo {
                id,
                title: cause.title,
                mechanism: cause.mechanism,
                remedies: cause.remedies,
            },
        );
    }
    for required in vocabulary::CAUSE_IDS {
        if !base.causes.contains_key(required) {
            problems.add(
                file,
                1,
                &format!("cause `{required}` of the vocabulary is missing"),
            );
        }
    }
    remedy_refs
}

/// Reads the caution catalogue (`cautions.yaml`, when found) into `base`.
pub(super) fn add_cautions(
    base: &mut RuleBase,
    found: Option<&(String, String)>,
    problems: &mut Problems,
) {
    let Some((_, _, raw)) = parse_catalogue::<RawCautionFile>("cautions.yaml", found, problems)
    else {
        return;
    };
    base.sources.extend(raw.sources);
    for (id, c) in raw.cautions {
        base.cautions.insert(
            id.clone(),
            CautionInfo {
                id,
                title: c.title,
                text: c.text,
            },
        );
    }
}

/// Reads and compiles the remedy catalogue (`remedies.yaml`, when found) into `base`; the
/// cautions must be read first.
pub(super) fn add_remedies(
    base: &mut RuleBase,
    found: Option<&(String, String)>,
    problems: &mut Problems,
) {
    let Some((file, text, raw)) =
        parse_catalogue::<RawRemedyFile>("remedies.yaml", found, problems)
    else {
        return;
    };
    base.sources.extend(raw.sources);
    for (id, r) in raw.remedies {
        if let Some(remedy) = compile_remedy(&id, r, file, text, base, problems) {
            base.remedies.insert(id, remedy);
        }
    }
}

/// Compiles one symptom file into `base`; a symptom defined by two files is reported.
pub(super) fn add_symptom(base: &mut RuleBase, file: &str, text: &str, problems: &mut Problems) {
    let Some(raw) = parse::<RawSymptomFile>(file, text, problems) else {
        return;
    };
    if let Some(symptom) = compile_symptom(raw, file, text, base, problems) {
        if base.symptoms.iter().any(|s| s.id == symptom.id) {
            problems.add(
                file,
                line_of(text, &symptom.id),
                &format!("symptom `{}` is defined twice", symptom.id),
            );
        } else {
            base.symptoms.push(symptom);
        }
    }
}
