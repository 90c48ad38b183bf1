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

use super::ScanRow;

/// The indicators compared, in the stored order. Changing this list changes
/// [`FEATURE_LAYOUT`]; stored features of another layout are not compared.
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

/// Version of the feature list and transform; stored with nothing else, it only guards the
/// length check in [`decode`].
pub const FEATURE_LAYOUT: u8 = 1;

const W_SYMPTOMS: f64 = 0.35;
const W_PLACES: f64 = 0.10;
const W_GRADE: f64 = 0.10;
const W_MATERIAL: f64 = 0.05;
const W_INDICATORS: f64 = 0.40;

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

/// The compared features of a complaint (NaN where an indicator was not computed).
pub fn features(indicators: &[IndicatorValue]) -> Vec<f32> {
    FEATURES
        .iter()
        .map(|(id, zone)| {
            indicators
                .iter()
                .find(|i| i.id == *id && i.zone.as_deref() == *zone)
                .filter(|i| i.value.is_finite())
                .map(|i| {
                    let s = scale(&i.unit);
                    (i.value.signum() * (1.0 + i.value.abs() / s).ln()) as f32
                })
                .unwrap_or(f32::NAN)
        })
        .collect()
}

/// Features as stored: one layout byte, then little-endian `f32`s.
pub fn encode(features: &[f32]) -> Vec<u8> {
    let mut out = Vec::with_capacity(1 + 4 * features.len());
    out.push(FEATURE_LAYOUT);
    for f in features {
        out.extend_from_slice(&f.to_le_bytes());
    }
    out
}

/// Stored features back; empty when the layout differs (such a complaint is compared on
/// symptoms, places, grade and material only).
pub fn decode(bytes: &[u8]) -> Vec<f32> {
    match bytes.split_first() {
        Some((&FEATURE_LAYOUT, rest)) if rest.len() == 4 * FEATURES.len() => rest
            .chunks_exact(4)
            .map(|c| f32::from_le_bytes([c[0], c[1], c[2], c[3]]))
            .collect(),
        _ => Vec::new(),
    }
}

/// A complaint to compare: the new case or a stored one.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Profile<'a> {
    pub symptoms: &'a [String],
    pub places: &'a [String],
    pub grade: Option<&'a str>,
    pub material: &'a str,
    pub features: &'a [f32],
}

impl<'a> Profile<'a> {
    pub fn of(row: &'a ScanRow) -> Profile<'a> {
        Profile {
            symptoms: &row.symptoms,
            places: &row.places,
            grade: row.grade.as_deref(),
            material: &row.material,
            features: &row.features,
        }
    }
}

fn jaccard_distance(a: &[String], b: &[String]) -> f64 {
    let common = a.iter().filter(|x| b.contains(x)).count();
    let union = a.len() + b.len() - common;
    if union == 0 {
        0.0
    } else {
        1.0 - common as f64 / union as f64
    }
}

/// Per-feature range (max − min) over `rows` and the query.
pub fn ranges(query: &[f32], rows: &[ScanRow]) -> Vec<f32> {
    let n = FEATURES.len();
    let mut low = vec![f32::INFINITY; n];
    let mut high = vec![f32::NEG_INFINITY; n];
    let mut take = |f: &[f32]| {
        if f.len() == n {
            for k in 0..n {
                let v = f[k];
                if v.is_finite() {
                    low[k] = low[k].min(v);
                    high[k] = high[k].max(v);
                }
            }
        }
    };
    take(query);
    for r in rows {
        take(&r.features);
    }
    low.iter()
        .zip(&high)
        .map(|(l, h)| if h > l { h - l } else { 0.0 })
        .collect()
}

/// The distance (module docs) between two complaints, 0 (alike) to 1.
pub fn distance(a: &Profile<'_>, b: &Profile<'_>, ranges: &[f32]) -> f64 {
    let mut sum = W_SYMPTOMS * jaccard_distance(a.symptoms, b.symptoms);
    let mut weight = W_SYMPTOMS;
    if !a.places.is_empty() && !b.places.is_empty() {
        sum += W_PLACES * jaccard_distance(a.places, b.places);
        weight += W_PLACES;
    }
    if let (Some(ga), Some(gb)) = (a.grade, b.grade) {
        sum += W_GRADE * f64::from(u8::from(!ga.trim().eq_ignore_ascii_case(gb.trim())));
        weight += W_GRADE;
    }
    sum += W_MATERIAL * f64::from(u8::from(a.material != b.material));
    weight += W_MATERIAL;
    if a.features.len() == ranges.len() && b.features.len() == ranges.len() {
        let mut total = 0.0f32;
        let mut count = 0u32;
        for k in 0..ranges.len() {
            let (x, y) = (a.features[k], b.features[k]);
            if x.is_finite() && y.is_finite() {
                count += 1;
                if ranges[k] > 0.0 {
                    total += ((x - y).abs() / ranges[k]).min(1.0);
                }
            }
        }
        if count > 0 {
            sum += W_INDICATORS * f64::from(total / count as f32);
            weight += W_INDICATORS;
        }
    }
    sum / weight
}

/// One past complaint found similar.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Match {
    pub id: i64,
    pub distance: f64,
    pub reference: Option<String>,
    pub title: String,
    pub received: Option<String>,
    pub line: Option<String>,
    pub grade: Option<String>,
    pub status: String,
    pub symptoms: Vec<String>,
    pub confirmed: Vec<String>,
    pub ranked_first: Option<String>,
}

/// The `top` nearest of `rows` to `query`, nearest first (ties: older complaint first).
pub fn nearest(query: &Profile<'_>, rows: &[ScanRow], top: usize) -> Vec<Match> {
    let ranges = ranges(query.features, rows);
    let mut scored: Vec<(f64, usize)> = rows
        .iter()
        .enumerate()
        .map(|(i, r)| (distance(query, &Profile::of(r), &ranges), i))
        .collect();
    let keep = top.min(scored.len());
    if keep == 0 {
        return Vec::new();
    }
    let by = |a: &(f64, usize), b: &(f64, usize)| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1));
    scored.select_nth_unstable_by(keep - 1, by);
    scored.truncate(keep);
    scored.sort_by(by);
    scored
        .into_iter()
        .map(|(d, i)| {
            let r = &rows[i];
            Match {
                id: r.id,
                distance: d,
                reference: r.reference.clone(),
                title: r.title.clone(),
                received: r.received.clone(),
                line: r.line.clone(),
                grade: r.grade.clone(),
                status: r.status.clone(),
                symptoms: r.symptoms.clone(),
                confirmed: r.confirmed.clone(),
                ranked_first: r.ranked.first().cloned(),
            }
        })
        .collect()
}

/// The profile pieces of a new case (symptoms and places as stored).
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

/// The `top` stored complaints nearest to a new case.
pub fn nearest_to_entry(entry: &super::Entry, rows: &[ScanRow], top: usize) -> Vec<Match> {
    let (symptoms, places) = case_profile_parts(&entry.resolved);
    let features = features(&entry.diagnosis.indicators);
    let query = Profile {
        symptoms: &symptoms,
        places: &places,
        grade: entry
            .case
            .complaint
            .as_ref()
            .and_then(|c| c.grade.as_deref()),
        material: &entry.resolved.web.material,
        features: &features,
    };
    nearest(&query, rows, top)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn strings(items: &[&str]) -> Vec<String> {
        items.iter().map(|s| s.to_string()).collect()
    }

    // Jaccard (1901): |A ∩ B| / |A ∪ B|; {a,b} vs {b,c} share 1 of 3.
    #[test]
    fn jaccard_distance_is_one_minus_shared_share() {
        let d = jaccard_distance(&strings(&["a", "b"]), &strings(&["b", "c"]));
        assert!((d - 2.0 / 3.0).abs() < 1e-12);
        assert_eq!(jaccard_distance(&[], &[]), 0.0);
    }

    #[test]
    fn distance_is_zero_to_itself_symmetric_and_at_most_one() {
        let s1 = strings(&["telescoping"]);
        let s2 = strings(&["starring", "telescoping"]);
        let f1 = vec![1.0f32; FEATURES.len()];
        let mut f2 = vec![2.0f32; FEATURES.len()];
        f2[3] = f32::NAN;
        let a = Profile {
            symptoms: &s1,
            places: &[],
            grade: Some("news 45"),
            material: "paper",
            features: &f1,
        };
        let b = Profile {
            symptoms: &s2,
            places: &[],
            grade: Some("NEWS 45"),
            material: "film",
            features: &f2,
        };
        let r = vec![2.0f32; FEATURES.len()];
        assert_eq!(distance(&a, &a, &r), 0.0);
        let ab = distance(&a, &b, &r);
        assert!((ab - distance(&b, &a, &r)).abs() < 1e-12);
        // symptoms 0.5·0.35, grade same, material 1·0.05, indicators 0.5·0.40, over 0.9.
        assert!((ab - (0.175 + 0.05 + 0.2) / 0.9).abs() < 1e-6, "{ab}");
    }

    #[test]
    fn encoded_features_come_back() {
        let f: Vec<f32> = (0..FEATURES.len()).map(|i| i as f32 - 3.5).collect();
        assert_eq!(decode(&encode(&f)), f);
        assert!(decode(&[9, 0, 0]).is_empty());
    }
}
