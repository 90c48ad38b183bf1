//! Fuzzy search over symptom titles and aliases (for the symptom picker and the command line).
//! The fuzzy-matcher crate is wrapped here, behind one function.

use fuzzy_matcher::FuzzyMatcher;
use fuzzy_matcher::skim::SkimMatcherV2;

use super::rules::RuleBase;

/// One search hit.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct SymptomMatch {
    pub id: String,
    pub title: String,
    /// The text that matched best (ID, title or an alias).
    pub matched: String,
    pub score: i64,
}

/// Symptoms matching `query`, best first. An empty query lists every symptom in vocabulary
/// order.
pub fn search_symptoms(rules: &RuleBase, query: &str) -> Vec<SymptomMatch> {
    let query = query.trim().to_lowercase();
    if query.is_empty() {
        return rules
            .symptoms
            .iter()
            .map(|s| SymptomMatch {
                id: s.id.clone(),
                title: s.title.clone(),
                matched: s.title.clone(),
                score: 0,
            })
            .collect();
    }
    let matcher = SkimMatcherV2::default();
    let mut out: Vec<SymptomMatch> = Vec::new();
    for symptom in &rules.symptoms {
        let id_words = symptom.id.replace('_', " ");
        let best = std::iter::once(id_words.as_str())
            .chain(std::iter::once(symptom.title.as_str()))
            .chain(symptom.aliases.iter().map(String::as_str))
            .filter_map(|text| {
                let lower = text.to_lowercase();
                let fuzzy = matcher.fuzzy_match(&lower, &query);
                // Whole-word and prefix hits outrank scattered subsequence hits.
                let bonus = if lower == query {
                    1000
                } else if lower.starts_with(&query) {
                    200
                } else {
                    0
                };
                fuzzy.map(|s| (s + bonus, text))
            })
            .max_by_key(|(score, _)| *score);
        if let Some((score, text)) = best {
            out.push(SymptomMatch {
                id: symptom.id.clone(),
                title: symptom.title.clone(),
                matched: text.to_string(),
                score,
            });
        }
    }
    out.sort_by(|a, b| b.score.cmp(&a.score).then_with(|| a.id.cmp(&b.id)));
    out
}

/// Turn a word typed by a person into a symptom ID: an exact ID, an exact alias or title, or
/// else an error carrying the closest suggestion ("did you mean").
pub fn resolve_symptom(rules: &RuleBase, word: &str) -> Result<String, String> {
    let lower = word.trim().to_lowercase();
    let normal = lower.replace([' ', '-'], "_");
    for symptom in &rules.symptoms {
        if symptom.id == normal
            || symptom.title.to_lowercase() == lower
            || symptom.aliases.iter().any(|a| a.to_lowercase() == lower)
        {
            return Ok(symptom.id.clone());
        }
    }
    let suggestion = search_symptoms(rules, &lower)
        .into_iter()
        .next()
        .map(|m| m.id)
        .or_else(|| {
            crate::vocabulary::closest(&normal, rules.symptoms.iter().map(|s| s.id.as_str()))
                .map(str::to_string)
        });
    Err(match suggestion {
        Some(s) => format!("unknown symptom `{word}` (did you mean `{s}`?)"),
        None => format!(
            "unknown symptom `{word}`; known: {}",
            rules
                .symptoms
                .iter()
                .map(|s| s.id.as_str())
                .collect::<Vec<_>>()
                .join(", ")
        ),
    })
}
