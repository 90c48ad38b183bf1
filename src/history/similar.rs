//! Similar past complaints: a distance between two complaints over their symptoms, where the
//! symptoms showed, the grade and material, and the computed indicators.
//!
//! The distance is Gower's general coefficient (Gower, Biometrics 27:857–871, 1971) with fixed
//! weights: each part is a dissimilarity in 0..1, parts that cannot be compared (no grade on
//! one side, no common indicator) drop out, and the result is the weighted mean of the rest:
//!
//! | part | dissimilarity | weight |
//! |---|---|---|
//! | symptoms | Jaccard distance of the two symptom sets | 0.35 |
//! | where found | Jaccard distance of the `symptom@place` pairs (both must give places) | 0.10 |
//! | grade | 0 same (ignoring case), 1 different (both must give one) | 0.10 |
//! | material | 0 same, 1 different | 0.05 |
//! | indicators | mean over the indicators both have of abs(a − b) / range | 0.40 |
//!
//! Indicators are first put on a comparable footing: each is stored as
//! `sign(x)·ln(1 + |x|/s)` with a scale `s` per unit (1 kPa for stresses, 10 N/m for force per
//! width, 1 m/s, 1 mm, 1 % and 0.1 for plain ratios), so a pressure of 20 kPa and one of
//! 40 kPa are as far apart as 200 kPa and 400 kPa; the range is the spread of that value over
//! the complaints searched (Gower's range normalisation), so every indicator counts alike.

use crate::diagnose::indicators::IndicatorValue;

/// The indicators compared, in the stored order. Changing this list changes
/// [`KEY_LAYOUT`]; stored keys of another layout are not compared.
pub const FEATURES: [(&str, Option<&str>); 40] = [
    ("acceleration_torque_share", None),
    ("air_film_ratio", None),
    ("build_compression", None),
    ("build_ratio", None),
    ("compressive_band_extent", None),
    ("compressive_stress_ratio", None),
    ("core_pressure", None),
    ("core_pressure_ratio", None),
    ("core_stiffness_ratio", None),
    ("friction", None),
    ("low_pressure_extent", None),
    ("min_tangential_position", None),
    ("min_tangential_stress", None),
    ("nip_load", None),
    ("nip_to_tension", None),
    ("nip_wit_share", None),
    ("peak_pressure", None),
    ("peak_pressure_position", None),
    ("roll_diameter", None),
    ("slip_margin", None),
    ("speed", None),
    ("taper", None),
    ("tension_strength_share", None),
    ("thickness", None),
    ("web_stress", None),
    ("web_tension", None),
    ("winding_strain", None),
    ("wit_drop", None),
    ("wit_step", None),
    ("wit_strength_share", None),
    ("pressure_mean", Some("core")),
    ("pressure_mean", Some("inner")),
    ("pressure_mean", Some("middle")),
    ("pressure_mean", Some("outer")),
    ("pressure_mean", Some("surface")),
    ("min_tangential_stress", Some("core")),
    ("min_tangential_stress", Some("inner")),
    ("min_tangential_stress", Some("middle")),
    ("min_tangential_stress", Some("outer")),
    ("min_tangential_stress", Some("surface")),
];

/// Version of the stored similarity key (the layout below and the feature list and transform
/// above); a key of another layout is compared on nothing and sorts last.
pub const KEY_LAYOUT: u8 = 1;

const W_SYMPTOMS: f64 = 0.35;
const W_PLACES: f64 = 0.10;
const W_GRADE: f64 = 0.10;
const W_MATERIAL: f64 = 0.05;
const W_INDICATORS: f64 = 0.40;

/// Number of compared indicators.
pub const N: usize = FEATURES.len();

fn scale(unit: &str) -> f64 {
    match unit {
        "Pa" => 1e3,
        "N/m" => 10.0,
        "m/s" => 1.0,
        "m" => 1e-3,
        "%" => 1.0,
        _ => 0.1,
    }
}

/// The compared indicator values of a complaint, transformed (NaN where not computed).
pub fn features(indicators: &[IndicatorValue]) -> [f32; N] {
    let mut out = [f32::NAN; N];
    for (slot, (id, zone)) in out.iter_mut().zip(FEATURES.iter()) {
        if let Some(i) = indicators
            .iter()
            .find(|i| i.id == *id && i.zone.as_deref() == *zone)
            .filter(|i| i.value.is_finite())
        {
            let s = scale(&i.unit);
            *slot = (i.value.signum() * (1.0 + i.value.abs() / s).ln()) as f32;
        }
    }
    out
}

/// FNV-1a of the lower-cased, trimmed text: equal texts (ignoring case) give equal numbers;
/// 0 stands for "not given".
fn text_hash(text: Option<&str>) -> u64 {
    let Some(t) = text.map(str::trim).filter(|t| !t.is_empty()) else {
        return 0;
    };
    let mut hash: u64 = 0xcbf2_9ce4_8422_2325;
    for byte in t.to_lowercase().bytes() {
        hash ^= u64::from(byte);
        hash = hash.wrapping_mul(0x0000_0100_0000_01b3);
    }
    hash.max(1)
}

/// Everything the distance needs of one complaint, in a fixed binary form (stored in the
/// `features` column so that the search reads one small value per complaint).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Key {
    /// Bit i: symptom `vocabulary::SYMPTOM_IDS[i]` observed.
    pub symptoms: u32,
    /// Bit 5·i + j: symptom i seen at `vocabulary::PLACES[j]`.
    pub places: u128,
    pub grade: u64,
    pub material: u64,
    pub features: [f32; N],
    /// False for a stored key of another layout.
    pub valid: bool,
}

impl Key {
    /// The key of a complaint: symptom IDs with their places (`symptom@place`), grade,
    /// web material and indicators.
    pub fn new(
        symptoms: &[String],
        places: &[String],
        grade: Option<&str>,
        material: &str,
        indicators: &[IndicatorValue],
    ) -> Key {
        let index = |id: &str| crate::vocabulary::SYMPTOM_IDS.iter().position(|s| *s == id);
        let mut key = Key {
            symptoms: 0,
            places: 0,
            grade: text_hash(grade),
            material: text_hash(Some(material)),
            features: features(indicators),
            valid: true,
        };
        for s in symptoms {
            if let Some(i) = index(s) {
                key.symptoms |= 1 << i;
            }
        }
        for p in places {
            let Some((s, place)) = p.split_once('@') else {
                continue;
            };
            let j = crate::vocabulary::PLACES.iter().position(|x| *x == place);
            if let (Some(i), Some(j)) = (index(s), j) {
                key.places |= 1u128 << (5 * i + j);
            }
        }
        key
    }

    /// Stored form: layout byte, symptoms, places, grade, material, features (little-endian).
    pub fn encode(&self) -> Vec<u8> {
        let mut out = Vec::with_capacity(KEY_BYTES);
        out.push(KEY_LAYOUT);
        out.extend_from_slice(&self.symptoms.to_le_bytes());
        out.extend_from_slice(&self.places.to_le_bytes());
        out.extend_from_slice(&self.grade.to_le_bytes());
        out.extend_from_slice(&self.material.to_le_bytes());
        for f in &self.features {
            out.extend_from_slice(&f.to_le_bytes());
        }
        out
    }

    /// A stored key back; a key of another layout or length comes back invalid.
    pub fn decode(bytes: &[u8]) -> Key {
        let mut key = Key {
            symptoms: 0,
            places: 0,
            grade: 0,
            material: 0,
            features: [f32::NAN; N],
            valid: false,
        };
        if bytes.len() != KEY_BYTES || bytes[0] != KEY_LAYOUT {
            return key;
        }
        let take = |at: usize, n: usize| &bytes[at..at + n];
        let mut b4 = [0u8; 4];
        let mut b8 = [0u8; 8];
        let mut b16 = [0u8; 16];
        b4.copy_from_slice(take(1, 4));
        key.symptoms = u32::from_le_bytes(b4);
        b16.copy_from_slice(take(5, 16));
        key.places = u128::from_le_bytes(b16);
        b8.copy_from_slice(take(21, 8));
        key.grade = u64::from_le_bytes(b8);
        b8.copy_from_slice(take(29, 8));
        key.material = u64::from_le_bytes(b8);
        for (k, slot) in key.features.iter_mut().enumerate() {
            b4.copy_from_slice(take(37 + 4 * k, 4));
            *slot = f32::from_le_bytes(b4);
        }
        key.valid = true;
        key
    }
}

const KEY_BYTES: usize = 1 + 4 + 16 + 8 + 8 + 4 * N;

fn jaccard_bits(a: u128, b: u128) -> f64 {
    let union = (a | b).count_ones();
    if union == 0 {
        0.0
    } else {
        1.0 - f64::from((a & b).count_ones()) / f64::from(union)
    }
}

/// Per-feature range (max − min) over `keys` and the query.
pub fn ranges<'a>(query: &'a Key, keys: impl Iterator<Item = &'a Key>) -> [f32; N] {
    let mut low = [f32::INFINITY; N];
    let mut high = [f32::NEG_INFINITY; N];
    for key in std::iter::once(query).chain(keys).filter(|k| k.valid) {
        for k in 0..N {
            let v = key.features[k];
            // NaN fails both comparisons and is skipped.
            if v < low[k] {
                low[k] = v;
            }
            if v > high[k] {
                high[k] = v;
            }
        }
    }
    let mut out = [0.0; N];
    for k in 0..N {
        if high[k] > low[k] {
            out[k] = high[k] - low[k];
        }
    }
    out
}

/// The distance (module docs) between two complaints, 0 (alike) to 1; 1 for an invalid key.
pub fn distance(a: &Key, b: &Key, ranges: &[f32; N]) -> f64 {
    if !a.valid || !b.valid {
        return 1.0;
    }
    let mut sum = W_SYMPTOMS * jaccard_bits(u128::from(a.symptoms), u128::from(b.symptoms));
    let mut weight = W_SYMPTOMS;
    if a.places != 0 && b.places != 0 {
        sum += W_PLACES * jaccard_bits(a.places, b.places);
        weight += W_PLACES;
    }
    if a.grade != 0 && b.grade != 0 {
        sum += W_GRADE * f64::from(u8::from(a.grade != b.grade));
        weight += W_GRADE;
    }
    sum += W_MATERIAL * f64::from(u8::from(a.material != b.material));
    weight += W_MATERIAL;
    let mut total = 0.0f32;
    let mut count = 0u32;
    for ((x, y), range) in a.features.iter().zip(&b.features).zip(ranges) {
        if x.is_finite() && y.is_finite() {
            count += 1;
            if *range > 0.0 {
                total += ((x - y).abs() / range).min(1.0);
            }
        }
    }
    if count > 0 {
        sum += W_INDICATORS * f64::from(total / count as f32);
        weight += W_INDICATORS;
    }
    sum / weight
}

/// The `top` nearest of `keys` (complaint number, key) to `query`: (number, distance), nearest
/// first; ties go to the older complaint.
pub fn nearest(query: &Key, keys: &[(i64, Key)], top: usize) -> Vec<(i64, f64)> {
    let ranges = ranges(query, keys.iter().map(|(_, k)| k));
    let mut scored: Vec<(f64, i64)> = keys
        .iter()
        .map(|(id, k)| (distance(query, k, &ranges), *id))
        .collect();
    let keep = top.min(scored.len());
    if keep == 0 {
        return Vec::new();
    }
    let by = |a: &(f64, i64), b: &(f64, i64)| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1));
    scored.select_nth_unstable_by(keep - 1, by);
    scored.truncate(keep);
    scored.sort_by(by);
    scored.into_iter().map(|(d, id)| (id, d)).collect()
}

/// One past complaint found similar.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Match {
    pub id: i64,
    pub distance: f64,
    #[serde(flatten)]
    pub facts: super::ComplaintFacts,
    pub ranked_first: Option<String>,
}

/// The symptom IDs and `symptom@place` pairs of a case.
pub fn case_profile_parts(case: &crate::case::ResolvedCase) -> (Vec<String>, Vec<String>) {
    let mut symptoms: Vec<String> = Vec::new();
    let mut places = Vec::new();
    for s in &case.symptoms {
        if !symptoms.contains(&s.id) {
            symptoms.push(s.id.clone());
        }
        if let Some(p) = &s.place {
            places.push(format!("{}@{p}", s.id));
        }
    }
    (symptoms, places)
}

/// The key of a new case.
pub fn entry_key(entry: &super::Entry) -> Key {
    let (symptoms, places) = case_profile_parts(&entry.resolved);
    Key::new(
        &symptoms,
        &places,
        entry
            .case
            .complaint
            .as_ref()
            .and_then(|c| c.grade.as_deref()),
        entry.resolved.web.material.id(),
        &entry.diagnosis.indicators,
    )
}

/// The `top` stored complaints nearest to a new case, leaving out complaint `except`.
pub fn search(
    store: &mut super::Store,
    entry: &super::Entry,
    top: usize,
    except: Option<i64>,
) -> Result<Vec<Match>, super::HistoryError> {
    let mut keys = store.similarity_keys()?;
    if let Some(id) = except {
        keys.retain(|(k, _)| *k != id);
    }
    let found = nearest(&entry_key(entry), &keys, top);
    let ids: Vec<i64> = found.iter().map(|(id, _)| *id).collect();
    let rows = store.rows(&ids)?;
    Ok(found
        .into_iter()
        .filter_map(|(id, distance)| {
            let r = rows.iter().find(|r| r.id == id)?;
            Some(Match {
                id,
                distance,
                facts: r.facts.clone(),
                ranked_first: r.ranked.first().cloned(),
            })
        })
        .collect())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn strings(items: &[&str]) -> Vec<String> {
        items.iter().map(|s| s.to_string()).collect()
    }

    fn key(symptoms: &[&str], grade: &str, material: &str, value: f32) -> Key {
        let mut k = Key::new(&strings(symptoms), &[], Some(grade), material, &[]);
        k.features = [value; N];
        k
    }

    // Jaccard (1901): |A ∩ B| / |A ∪ B|; {a,b} vs {b,c} share 1 of 3.
    #[test]
    fn jaccard_distance_is_one_minus_shared_share() {
        assert!((jaccard_bits(0b011, 0b110) - 2.0 / 3.0).abs() < 1e-12);
        assert_eq!(jaccard_bits(0, 0), 0.0);
    }

    #[test]
    fn distance_is_zero_to_itself_symmetric_and_as_documented() {
        let a = key(&["telescoping"], "news 45", "paper", 1.0);
        let mut b = key(&["starring", "telescoping"], " NEWS 45", "film", 2.0);
        b.features[3] = f32::NAN;
        let r = [2.0f32; N];
        assert_eq!(distance(&a, &a, &r), 0.0);
        let ab = distance(&a, &b, &r);
        assert!((ab - distance(&b, &a, &r)).abs() < 1e-12);
        // symptoms 0.5·0.35, grade same, material 1·0.05, indicators 0.5·0.40, over 0.9.
        assert!((ab - (0.175 + 0.05 + 0.2) / 0.9).abs() < 1e-6, "{ab}");
    }

    #[test]
    fn keys_come_back_from_their_stored_form() {
        let mut k = Key::new(
            &strings(&["telescoping", "cinching"]),
            &strings(&["telescoping@body", "cinching@core"]),
            Some("PET 23"),
            "film",
            &[],
        );
        for (i, f) in k.features.iter_mut().enumerate() {
            *f = i as f32 - 3.5;
        }
        assert_eq!(Key::decode(&k.encode()), k);
        assert!(!Key::decode(&[9, 0, 0]).valid);
        assert_eq!(k.places.count_ones(), 2);
    }
}
