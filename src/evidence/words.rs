//! Evidence in words: the indicator values the rule base tests, the text lines of each
//! comparison (in the unit system asked for), and the measured-against-computed rows of
//! reports.

use super::*;

/// Lane spread below which the text calls the width even (the rules use 5 % the same way).
const EVEN_LANES: f64 = 0.05;

/// A diameter (or a small length such as a bore closing): mm in SI, inches in US units.
fn mm(metres: f64, units: UnitSystem) -> String {
    if units == UnitSystem::Us {
        return compact_length(metres, units);
    }
    let v = metres * 1e3;
    if v.abs() >= 100.0 {
        format!("{v:.0} mm")
    } else if v.abs() >= 1.0 {
        format!("{v:.1} mm")
    } else {
        format!("{v:.2} mm")
    }
}

/// A pressure: kPa or MPa in SI, psi in US units.
fn kpa(pascal: f64, units: UnitSystem) -> String {
    if units == UnitSystem::Us {
        return compact_stress(pascal, units);
    }
    if pascal.abs() >= 1e6 {
        format!("{:.2} MPa", pascal / 1e6)
    } else {
        format!("{:.0} kPa", pascal / 1e3)
    }
}

/// The note on a measured diameter away from the solved one; rebuilt per unit system.
pub(super) fn diameter_note(d: &DensityComparison, units: UnitSystem) -> String {
    format!(
        "the measured diameter ({}) differs from the diameter the case was solved at ({}) \
         by more than 2 %: the computed compression is that of the case's roll",
        mm(d.measured_diameter, units),
        mm(d.solved_diameter, units)
    )
}

/// "⌀ …" of the softest reading, the computed lowest pressure, the hardest reading and the
/// computed highest pressure.
fn extremes(h: &HardnessComparison, units: UnitSystem) -> [String; 4] {
    [
        h.softest_diameter,
        h.computed_softest_diameter,
        h.hardest_diameter,
        h.computed_hardest_diameter,
    ]
    .map(|d| format!("⌀ {}", mm(d, units)))
}

/// "hard lanes [1, 5], soft lanes [3], both edges hard".
fn lane_words(l: &LaneComparison) -> String {
    format!(
        "hard lanes {:?}, soft lanes {:?}{}",
        l.hard_lanes,
        l.soft_lanes,
        if l.hard_edges {
            ", both edges hard"
        } else {
            ""
        }
    )
}

fn pct(share: f64) -> String {
    format!("{:.1} %", share * 100.0)
}

impl Evidence {
    /// True when nothing was compared.
    pub fn is_empty(&self) -> bool {
        self.density.is_none()
            && self.hardness.is_none()
            && self.lanes.is_none()
            && self.end_line.is_none()
            && self.core_bore.is_none()
            && self.set.is_none()
    }

    /// The values the rule base may test (IDs listed in docs/rules.md); a measurement not
    /// taken gives no value, so rules testing it stay neutral.
    pub fn indicators(&self) -> Vec<EvidenceIndicator> {
        self.indicators_in(UnitSystem::Si)
    }

    /// [`Evidence::indicators`] with the details' diameters, lengths and pressures in `units`
    /// (the values are the same; densities stay kg/m³, as in [`Evidence::lines_in`]).
    pub fn indicators_in(&self, units: UnitSystem) -> Vec<EvidenceIndicator> {
        let mut out = Indicators(Vec::new());
        if let Some(d) = &self.density {
            density_indicators(d, units, &mut out);
        }
        if let Some(h) = &self.hardness {
            hardness_indicators(h, units, &mut out);
        }
        if let Some(l) = &self.lanes {
            out.push(
                "lane_hardness_spread",
                l.spread,
                format!(
                    "{}; the model computes one value across the width",
                    lane_words(l)
                ),
            );
        }
        if let Some(s) = &self.end_line {
            end_line_indicators(s, units, &mut out);
        }
        if let Some(c) = &self.core_bore
            && let Some(ratio) = c.ratio
        {
            out.push(
                "core_bore_ratio",
                ratio,
                format!(
                    "bore closed {} measured, {} computed under {} on the core",
                    mm(c.measured, units),
                    mm(c.computed.unwrap_or(0.0), units),
                    kpa(c.core_pressure, units)
                ),
            );
        }
        if let Some(s) = &self.set {
            set_indicators(s, &mut out);
        }
        out.0
    }

    /// `text` (a reason quoting an indicator's detail, stored in SI as the JSON has it) with
    /// every evidence detail in it rewritten in `units`; other text is left as it is.
    pub fn localise(&self, text: &str, units: UnitSystem) -> String {
        if units == UnitSystem::Si || text.is_empty() {
            return text.to_string();
        }
        let mut pairs: Vec<(String, String)> = self
            .indicators_in(UnitSystem::Si)
            .into_iter()
            .zip(self.indicators_in(units))
            .map(|(si, local)| (si.detail, local.detail))
            .collect();
        // The longest first: one detail can begin with another (density and its deviation).
        pairs.sort_by_key(|(si, _)| std::cmp::Reverse(si.len()));
        pairs
            .iter()
            .fold(text.to_string(), |out, (si, local)| out.replace(si, local))
    }

    /// Plain-words lines, measured beside computed, for the text output and reports (SI).
    pub fn lines(&self) -> Vec<String> {
        self.lines_in(UnitSystem::Si)
    }

    /// [`Evidence::lines`] with diameters, lengths and pressures in `units`.
    pub fn lines_in(&self, units: UnitSystem) -> Vec<String> {
        let mut out = Vec::new();
        if let Some(d) = &self.density {
            out.push(density_line(d, units));
        }
        if let Some(h) = &self.hardness {
            out.extend(hardness_lines(h, units));
        }
        if let Some(l) = &self.lanes {
            out.push(lanes_line(l));
        }
        if let Some(s) = &self.end_line {
            out.push(end_line_line(s, units));
        }
        if let Some(c) = &self.core_bore {
            out.push(core_bore_line(c, units));
        }
        if let Some(s) = &self.set {
            out.push(set_line(s));
        }
        // Notes are stored as SI text (JSON); the one that carries diameters is rebuilt in `units`.
        let si_note = self
            .density
            .as_ref()
            .map(|d| diameter_note(d, UnitSystem::Si));
        out.extend(self.notes.iter().map(|n| match (&self.density, &si_note) {
            (Some(d), Some(si)) if n == si => format!("Note: {}.", diameter_note(d, units)),
            _ => format!("Note: {n}."),
        }));
        out
    }
}

/// Indicators being collected; a value that is not finite is left out (the rule stays neutral).
struct Indicators(Vec<EvidenceIndicator>);

impl Indicators {
    fn push(&mut self, id: &'static str, value: f64, detail: String) {
        if value.is_finite() {
            self.0.push(EvidenceIndicator { id, value, detail });
        }
    }
}

/// `measured_density_ratio`, and `density_deviation` where the compression has an uncertainty.
fn density_indicators(d: &DensityComparison, units: UnitSystem, out: &mut Indicators) {
    let detail = match (d.measured_density, d.computed_density) {
        (Some(m), Some(c)) => format!(
            "measured {m:.0} kg/m³ (⌀ {} for {}), computed {c:.0} kg/m³ (⌀ {})",
            mm(d.measured_diameter, units),
            web_length(d.length, units),
            mm(d.computed_diameter, units)
        ),
        _ => format!(
            "measured ⌀ {} for {} (compression {}), computed ⌀ {} (compression {})",
            mm(d.measured_diameter, units),
            web_length(d.length, units),
            pct(d.measured_compression),
            mm(d.computed_diameter, units),
            pct(d.computed_compression)
        ),
    };
    out.push("measured_density_ratio", d.density_ratio, detail.clone());
    if d.compression_uncertainty > 0.0 {
        out.push(
            "density_deviation",
            (d.measured_compression - d.computed_compression) / d.compression_uncertainty,
            format!(
                "{detail}; compression {} ± {} measured, {} computed",
                pct(d.measured_compression),
                pct(d.compression_uncertainty),
                pct(d.computed_compression)
            ),
        );
    }
}

/// `hardness_shape_agreement` and `hardness_soft_band`, each where it could be computed.
fn hardness_indicators(h: &HardnessComparison, units: UnitSystem, out: &mut Indicators) {
    if let Some(rho) = h.rank_correlation {
        out.push("hardness_shape_agreement", rho, {
            let [soft, model_soft, hard, model_hard] = extremes(h, units);
            format!(
                "softest reading at {soft}, computed lowest pressure at {model_soft}; \
                     hardest at {hard}, computed at {model_hard}"
            )
        });
    }
    if let Some(dip) = h.unexplained_dip {
        let detail = match &h.soft_band {
            Some(b) => format!(
                "soft band at ⌀ {}: readings dip {} of their range, computed pressure {}",
                mm(b.diameter, units),
                pct(b.depth),
                pct(b.computed_depth)
            ),
            None => "no soft band the computed pressure does not have".into(),
        };
        out.push("hardness_soft_band", dip, detail);
    }
}

/// `end_line_offset`, and where the bend's place is known `slip_location_match` and
/// `end_line_bend_position`.
fn end_line_indicators(s: &SlipComparison, units: UnitSystem, out: &mut Indicators) {
    out.push(
        "end_line_offset",
        s.offset.unwrap_or(0.0),
        format!("line on the roll end: {}", bend_words(&s.observed, units)),
    );
    if let (Some(agrees), Some((a, b))) = (s.agrees, s.observed_fractions) {
        out.push(
            "slip_location_match",
            if agrees { 1.0 } else { 0.0 },
            format!(
                "bends at {:.0}–{:.0} % of the build; computed weakest interface at ⌀ {} ({:.0} % of the build)",
                a * 100.0,
                b * 100.0,
                mm(s.weakest_diameter, units),
                s.weakest_fraction * 100.0
            ),
        );
        out.push(
            "end_line_bend_position",
            0.5 * (a + b),
            format!("line on the roll end: {}", bend_words(&s.observed, units)),
        );
    }
}

/// `bad_roll_share`, and the edge and parent-roll shares where they were looked at.
fn set_indicators(s: &SetPattern, out: &mut Indicators) {
    out.push(
        "bad_roll_share",
        s.bad_share,
        format!("{} of {} rolls in the set bad", s.bad, s.rolls),
    );
    if let Some(e) = s.edge_share {
        out.push(
            "bad_edge_share",
            e,
            format!("{} of the bad rolls at the two edge positions", pct(e)),
        );
    }
    if let Some(p) = s.parent_share {
        out.push(
            "bad_parent_share",
            p,
            format!("{} of the parent rolls looked at gave bad rolls", pct(p)),
        );
    }
}

/// The roll size line: measured diameter and compression against the model's, and what the
/// gap says about the wound-in tension.
fn density_line(d: &DensityComparison, units: UnitSystem) -> String {
    let mut line = format!(
        "Roll size: {} wound to ⌀ {} measured; the model predicts ⌀ {}. Mean radial \
         compression {} measured (± {}), {} computed; wound density measured/computed {:.3}.",
        web_length(d.length, units),
        mm(d.measured_diameter, units),
        mm(d.computed_diameter, units),
        pct(d.measured_compression),
        pct(d.compression_uncertainty),
        pct(d.computed_compression),
        d.density_ratio
    );
    // Densities stay in kg/m³ in both systems: no US trade unit for wound density is usual.
    if let (Some(m), Some(c)) = (d.measured_density, d.computed_density) {
        line.push_str(&format!(" ({m:.0} against {c:.0} kg/m³.)"));
    }
    let gap = d.measured_compression - d.computed_compression;
    if gap.abs() > 2.0 * d.compression_uncertainty {
        line.push_str(if gap < 0.0 {
            " Larger than the model for its length: less wound-in tension than the \
             settings say (tension reading, entrained air, nip)."
        } else {
            " Smaller than the model for its length: more wound-in tension than the \
             settings say."
        });
    } else {
        line.push_str(" Within the measurement's uncertainty of the model.");
    }
    line
}

/// Hardness along the radius: the shape comparison, then one indented line per reading.
fn hardness_lines(h: &HardnessComparison, units: UnitSystem) -> Vec<String> {
    let mut line = match h.rank_correlation {
        Some(rho) => format!(
            "Hardness along the radius: rank correlation with the computed pressure {rho:.2} \
             (1 = same shape)."
        ),
        None => "Hardness along the radius: too few readings for a shape comparison.".into(),
    };
    let [soft, model_soft, hard, model_hard] = extremes(h, units);
    line.push_str(&format!(
        " Softest at {soft} (model: {model_soft}), hardest at {hard} (model: {model_hard})."
    ));
    if let Some(b) = &h.soft_band {
        line.push_str(&format!(
            " Soft band at ⌀ {} the model does not have.",
            mm(b.diameter, units)
        ));
    }
    let mut out = vec![line];
    for p in &h.points {
        out.push(format!(
            "  ⌀ {:>8}  reading {:>7}  {}computed {}",
            mm(p.diameter, units),
            p.reading,
            p.measured_pressure
                .map(|m| format!("≈ {} measured, ", kpa(m, units)))
                .unwrap_or_default(),
            kpa(p.computed_pressure, units)
        ));
    }
    out
}

/// Hardness across the width: even, or which lanes stand out (the model has no lanes).
fn lanes_line(l: &LaneComparison) -> String {
    if l.spread < EVEN_LANES {
        format!(
            "Hardness across the width: even (spread {} of the mean). The model cannot \
             compute lanes; these readings show none.",
            pct(l.spread)
        )
    } else {
        format!(
            "Hardness across the width: spread {} of the mean; {}. The model cannot \
             compute lanes: hard and soft lanes point to caliper variation across the \
             width (gauge bands) or an uneven nip.",
            pct(l.spread),
            lane_words(l)
        )
    }
}

/// The line drawn on the roll end against the model's weakest interface.
fn end_line_line(s: &SlipComparison, units: UnitSystem) -> String {
    let mut line = format!(
        "Line on the roll end: {}{}. The model's weakest interface (lowest friction torque) \
         is at ⌀ {}, weak from ⌀ {} to ⌀ {}",
        bend_words(&s.observed, units),
        s.offset
            .map(|o| format!(", offset {}", mm(o, units)))
            .unwrap_or_default(),
        mm(s.weakest_diameter, units),
        mm(s.weak_band.0, units),
        mm(s.weak_band.1, units)
    );
    line.push_str(match s.agrees {
        Some(true) => ": the bend is where the model expects slip.",
        Some(false) => ": the bend is not where the model expects slip.",
        None => ".",
    });
    line
}

/// The core bore's closing, measured against computed where the core allows it.
fn core_bore_line(c: &CoreBoreComparison, units: UnitSystem) -> String {
    match c.computed {
        Some(comp) => format!(
            "Core bore: closed {} measured, {} computed (elastic, under {} on the core).",
            mm(c.measured, units),
            mm(comp, units),
            kpa(c.core_pressure, units)
        ),
        None => format!(
            "Core bore: closed {} measured; not computed for a core given by stiffness only.",
            mm(c.measured, units)
        ),
    }
}

/// Which rolls of the set were bad, and what that pattern points to.
fn set_line(s: &SetPattern) -> String {
    format!(
        "The set: {} of {} rolls bad ({}){}.",
        s.bad,
        s.rolls,
        match s.pattern {
            SetPatternKind::AllRolls => "all of them: points to the settings",
            SetPatternKind::Edges => "only edge positions: points to the web's profile or the trim",
            SetPatternKind::OneLane => "one position: points to the web's profile or the slitter",
            SetPatternKind::SomeRolls => "some of them",
            SetPatternKind::NoneBad => "none",
        },
        s.parent_share
            .map(|p| format!("; {} of the parent rolls gave bad rolls", pct(p)))
            .unwrap_or_default()
    )
}

/// One row of the measured-against-computed table of reports.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ComparisonRow {
    pub what: String,
    pub measured: String,
    pub computed: String,
}

impl Evidence {
    /// The measured-against-computed table (reports): one row per compared figure (SI).
    pub fn rows(&self) -> Vec<ComparisonRow> {
        self.rows_in(UnitSystem::Si)
    }

    /// [`Evidence::rows`] with diameters, lengths and pressures in `units`.
    pub fn rows_in(&self, units: UnitSystem) -> Vec<ComparisonRow> {
        let mut out = Vec::new();
        let mut row = |what: String, measured: String, computed: String| {
            out.push(ComparisonRow {
                what,
                measured,
                computed,
            })
        };
        if let Some(d) = &self.density {
            row(
                format!("Diameter for {} wound", web_length(d.length, units)),
                mm(d.measured_diameter, units),
                mm(d.computed_diameter, units),
            );
            row(
                "Mean radial compression".into(),
                format!(
                    "{} ± {}",
                    pct(d.measured_compression),
                    pct(d.compression_uncertainty)
                ),
                pct(d.computed_compression),
            );
            // kg/m³ in both systems (no usual US trade unit for wound density).
            if let (Some(m), Some(c)) = (d.measured_density, d.computed_density) {
                row(
                    "Wound density".into(),
                    format!("{m:.0} kg/m³"),
                    format!("{c:.0} kg/m³"),
                );
            }
        }
        if let Some(h) = &self.hardness {
            for p in &h.points {
                row(
                    format!("Hardness at ⌀ {}", mm(p.diameter, units)),
                    match p.measured_pressure {
                        Some(m) => format!("{} (≈ {})", p.reading, kpa(m, units)),
                        None => format!("{} (tester scale)", p.reading),
                    },
                    format!("pressure {}", kpa(p.computed_pressure, units)),
                );
            }
            if let Some(rho) = h.rank_correlation {
                let [soft, model_soft, hard, model_hard] = extremes(h, units);
                row(
                    "Softest / hardest".into(),
                    format!("{soft} / {hard} (rank correlation {rho:.2})"),
                    format!("{model_soft} / {model_hard}"),
                );
            }
        }
        if let Some(l) = &self.lanes {
            row(
                "Hardness spread across the width".into(),
                pct(l.spread),
                "not computed (one-dimensional model)".into(),
            );
        }
        if let Some(s) = &self.end_line {
            row(
                "Line on the roll end".into(),
                bend_words(&s.observed, units),
                format!("weakest interface at ⌀ {}", mm(s.weakest_diameter, units)),
            );
        }
        if let Some(c) = &self.core_bore {
            row(
                "Core bore closing".into(),
                mm(c.measured, units),
                c.computed
                    .map_or_else(|| "not computed".into(), |v| mm(v, units)),
            );
        }
        if let Some(s) = &self.set {
            row(
                "Bad rolls in the set".into(),
                format!("{} of {}", s.bad, s.rolls),
                "—".into(),
            );
        }
        out
    }
}

fn bend_words(place: &BendPlace, units: UnitSystem) -> String {
    match place {
        BendPlace::Straight => "stayed straight".into(),
        BendPlace::NearCore => "bends near the core".into(),
        BendPlace::Band {
            from_diameter,
            to_diameter,
        } => format!(
            "bends in a band from ⌀ {} to ⌀ {}",
            mm(*from_diameter, units),
            mm(*to_diameter, units)
        ),
        BendPlace::Throughout => "curves throughout".into(),
    }
}
