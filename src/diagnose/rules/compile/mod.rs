//! Compiling raw rule files into the rule base: problems collected with file and line, YAML
//! parsing and line helpers, name checks against the registries, and the `add_*` entry points
//! per catalogue. Remedies compile in `remedy`, symptoms and their evidence in `symptom`.

use super::raw::*;
use super::*;

mod remedy;
mod symptom;

pub(super) use remedy::check_remedy;
use remedy::*;
use symptom::*;

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
