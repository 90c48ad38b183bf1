//! The symptom list the picker searches: names, aliases, descriptions and the questions asked
//! about each symptom, plus the one fuzzy-matching function the UI uses.
//!
//! The catalogue is built from the rule base (titles, aliases, descriptions, places, questions)
//! and searched with the diagnosis layer's symptom search; a catalogue built from the vocabulary
//! alone (tests, a rule base without a symptom) uses the same kind of fuzzy match locally.

use std::sync::Arc;

use fuzzy_matcher::FuzzyMatcher;
use fuzzy_matcher::skim::SkimMatcherV2;

use crate::diagnose::rules::RuleBase;

/// One question asked about a symptom; the answer is stored in `Case::answers[id]`.
#[derive(Debug, Clone, PartialEq)]
pub struct QuestionInfo {
    pub id: String,
    pub text: String,
    /// Choice IDs; empty means the answer is yes / no / unknown.
    pub choices: Vec<String>,
    /// The choices in words, beside `choices` (empty: the IDs are shown with spaces).
    pub choice_texts: Vec<String>,
}

impl QuestionInfo {
    /// The answers offered, in the order Enter cycles through them.
    pub fn options(&self) -> Vec<String> {
        if self.choices.is_empty() {
            YES_NO_UNKNOWN.iter().map(|s| s.to_string()).collect()
        } else {
            let mut options = self.choices.clone();
            options.push("unknown".to_string());
            options
        }
    }

    /// An answer as a person reads it: the choice's text ("in storage"), never its ID.
    pub fn answer_text(&self, answer: &str) -> String {
        self.choices
            .iter()
            .position(|c| c == answer)
            .and_then(|i| self.choice_texts.get(i))
            .cloned()
            .unwrap_or_else(|| answer.replace('_', " "))
    }
}

/// Answers of a plain question.
pub const YES_NO_UNKNOWN: [&str; 3] = ["yes", "no", "unknown"];

/// One symptom (roll defect) as the picker shows it.
#[derive(Debug, Clone, PartialEq)]
pub struct SymptomInfo {
    pub id: String,
    pub name: String,
    pub aliases: Vec<String>,
    pub description: String,
    /// Where on the roll this symptom can show; empty means any of `vocabulary::PLACES`.
    pub places: Vec<String>,
    pub questions: Vec<QuestionInfo>,
}

/// A search hit: which symptom, its score, and the alias that matched best (if not the name).
#[derive(Debug, Clone, PartialEq)]
pub struct Match {
    pub index: usize,
    pub score: i64,
    pub via_alias: Option<String>,
}

/// Every symptom the picker offers.
#[derive(Debug, Clone, Default)]
pub struct Catalogue {
    pub symptoms: Vec<SymptomInfo>,
    /// The rule base searched by `diagnose::search`, when the catalogue came from one.
    rules: Option<Arc<RuleBase>>,
}

/// Fuzzy score of `pattern` against `text` (higher is better), `None` when it does not match.
/// The only place the UI calls the fuzzy matcher.
pub fn fuzzy_score(pattern: &str, text: &str) -> Option<i64> {
    SkimMatcherV2::default()
        .ignore_case()
        .fuzzy_match(text, pattern.trim())
}

/// "crushed_core" → "Crushed core".
pub fn plain_name(id: &str) -> String {
    let words = id.replace('_', " ");
    let mut chars = words.chars();
    match chars.next() {
        Some(first) => first.to_uppercase().chain(chars).collect(),
        None => String::new(),
    }
}

impl Catalogue {
    /// Built from the symptom IDs alone (plain names, no aliases or questions): the fallback
    /// when the rule base says nothing about a symptom.
    pub fn from_vocabulary() -> Catalogue {
        Catalogue {
            symptoms: crate::vocabulary::SYMPTOM_IDS
                .iter()
                .map(|id| SymptomInfo {
                    id: id.to_string(),
                    name: plain_name(id),
                    aliases: Vec::new(),
                    description: String::new(),
                    places: Vec::new(),
                    questions: Vec::new(),
                })
                .collect(),
            rules: None,
        }
    }

    /// Built from the rule base: titles, aliases, descriptions, places and questions of each
    /// symptom, in the rule base's order.
    pub fn from_rules(rules: Arc<RuleBase>) -> Catalogue {
        let symptoms = rules
            .symptoms
            .iter()
            .map(|s| SymptomInfo {
                id: s.id.clone(),
                name: s.title.clone(),
                aliases: s.aliases.clone(),
                description: s.description.clone(),
                places: s.places.clone(),
                questions: s
                    .questions
                    .iter()
                    .map(|q| QuestionInfo {
                        id: q.id.clone(),
                        text: q.text.clone(),
                        choices: if q.yes_no {
                            Vec::new()
                        } else {
                            q.choices.iter().map(|c| c.id.clone()).collect()
                        },
                        choice_texts: if q.yes_no {
                            Vec::new()
                        } else {
                            q.choices.iter().map(|c| c.text.clone()).collect()
                        },
                    })
                    .collect(),
            })
            .collect();
        Catalogue {
            symptoms,
            rules: Some(rules),
        }
    }

    /// The causes a complaint can confirm, as (ID, title) sorted by title: the rule base's, or
    /// the vocabulary's IDs in plain words when the catalogue has no rule base.
    pub fn causes(&self) -> Vec<(String, String)> {
        let mut out: Vec<(String, String)> = match &self.rules {
            Some(rules) => rules
                .causes
                .iter()
                .map(|(id, c)| (id.clone(), c.title.clone()))
                .collect(),
            None => crate::vocabulary::CAUSE_IDS
                .iter()
                .map(|id| (id.to_string(), plain_name(id)))
                .collect(),
        };
        out.sort_by(|a, b| a.1.cmp(&b.1));
        out
    }

    /// A cause's title ("Web tension too low"), or its ID in plain words when it is unknown.
    pub fn cause_title(&self, id: &str) -> String {
        self.causes()
            .into_iter()
            .find(|(c, _)| c == id)
            .map(|(_, t)| t)
            .unwrap_or_else(|| plain_name(id))
    }

    pub fn get(&self, id: &str) -> Option<&SymptomInfo> {
        self.symptoms.iter().find(|s| s.id == id)
    }

    /// Symptoms matching `query` by name, ID or alias, best first; all symptoms in catalogue
    /// order when the query is empty.
    pub fn search(&self, query: &str) -> Vec<Match> {
        if let Some(rules) = &self.rules {
            return crate::diagnose::search::search_symptoms(rules, query)
                .into_iter()
                .filter_map(|hit| {
                    let index = self.symptoms.iter().position(|s| s.id == hit.id)?;
                    let symptom = &self.symptoms[index];
                    let via_alias = symptom
                        .aliases
                        .contains(&hit.matched)
                        .then_some(hit.matched);
                    Some(Match {
                        index,
                        score: hit.score,
                        via_alias,
                    })
                })
                .collect();
        }
        if query.trim().is_empty() {
            return (0..self.symptoms.len())
                .map(|index| Match {
                    index,
                    score: 0,
                    via_alias: None,
                })
                .collect();
        }
        let mut hits: Vec<Match> = Vec::new();
        for (index, symptom) in self.symptoms.iter().enumerate() {
            let mut best: Option<(i64, Option<String>)> = None;
            for text in [&symptom.name, &symptom.id] {
                if let Some(score) = fuzzy_score(query, text)
                    && best.as_ref().is_none_or(|(b, _)| score > *b)
                {
                    best = Some((score, None));
                }
            }
            for alias in &symptom.aliases {
                if let Some(score) = fuzzy_score(query, alias)
                    && best.as_ref().is_none_or(|(b, _)| score > *b)
                {
                    best = Some((score, Some(alias.clone())));
                }
            }
            if let Some((score, via_alias)) = best {
                hits.push(Match {
                    index,
                    score,
                    via_alias,
                });
            }
        }
        // Stable sort keeps catalogue order between equal scores: deterministic lists.
        hits.sort_by_key(|hit| std::cmp::Reverse(hit.score));
        hits
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sample() -> Catalogue {
        let mut catalogue = Catalogue::from_vocabulary();
        if let Some(s) = catalogue.symptoms.iter_mut().find(|s| s.id == "starring") {
            s.aliases = vec!["stars".into(), "spoking".into()];
        }
        catalogue
    }

    #[test]
    fn empty_query_lists_everything_in_order() {
        let c = sample();
        let hits = c.search("");
        assert_eq!(hits.len(), crate::vocabulary::SYMPTOM_IDS.len());
        assert_eq!(hits[0].index, 0);
    }

    #[test]
    fn alias_finds_symptom_and_says_so() {
        let c = sample();
        let hits = c.search("spok");
        let first = &hits[0];
        assert_eq!(c.symptoms[first.index].id, "starring");
        assert_eq!(first.via_alias.as_deref(), Some("spoking"));
    }

    #[test]
    fn fuzzy_name_match_tolerates_gaps() {
        let c = sample();
        let hits = c.search("tlscp");
        assert_eq!(c.symptoms[hits[0].index].id, "telescoping");
    }

    #[test]
    fn plain_names_read_as_words() {
        assert_eq!(plain_name("crushed_core"), "Crushed core");
    }
}
