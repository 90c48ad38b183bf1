//! Which assumed inputs the answer rests on: every input a case left to a preset or default is
//! moved, one at a time, to the low and the high end of its plausible range, the case is
//! re-run through the triage pipeline (solve and rank, no what-if), and the inputs are listed by
//! how much they change the answer — first those that put another cause first, then by how far
//! they move the belief in the cause ranked first.
//!
//! The plausible range of a value is stated with it ([`Spread`]): for a web or core preset value,
//! the spread of that value over the shipped presets of the same kind (paper, film, ...), at
//! least ±25 % around the value used; for a fixed default, a stated factor either way. Given
//! values are never moved; choices (winding method, taper, nip) and values with no plain numeric
//! spread (core size) are listed as not varied.
//!
//! Cost: two solves per varied input at most, on the grid the case's own solve used, in parallel
//! through the pipeline; inputs that do not enter the stress solve (web strength, the core's
//! crush rating) only re-rank the case's own profile.

use serde::{Deserialize, Serialize};

use super::pipeline::{self, Progress};
use super::rules::{RuleBase, SettingChange};
use super::{DiagnoseError, DiagnoseOptions, Diagnosis};
use crate::case::registry::{self, DefaultValue};
use crate::case::{ResolvedCase, ValueOrigin};
use crate::model::{CoreStiffness, ModelError, Profile, RadialStiffness, SolverOptions};
use crate::presets::{CorePreset, WebPreset};

/// The least spread given to an unmeasured preset value, either way, when the presets of its
/// kind agree more closely than that: a preset is a generic grade, the roll at hand is not.
pub const MIN_PRESET_SPREAD: f64 = 0.25;

/// A belief change smaller than this is reported as no change (beliefs are shown to 2 decimals).
pub const NO_CHANGE: f64 = 0.005;

/// How the plausible range of an assumed value is found.
#[derive(Debug, Clone, Copy)]
enum Spread {
    /// The value over the shipped presets of the same web material.
    WebPresets,
    /// The value over the shipped presets of the same core material.
    CorePresets,
    /// The value used times `low` and times `high`, for the stated reason.
    Factor {
        low: f64,
        high: f64,
        source: &'static str,
    },
}

/// One assumed input that can be moved: its registry path, how to read and write it on a
/// resolved case, and its plausible range.
struct Knob {
    path: &'static str,
    get: fn(&ResolvedCase) -> Option<f64>,
    set: fn(&mut ResolvedCase, f64),
    spread: Spread,
}

const TENSION_SPREAD: &str = "half to one and a half times the rule-of-thumb tension \
     (rolltriage's stated spread: a rule of thumb is a starting point, not the setting)";
const SPEED_SPREAD: &str =
    "half to twice the assumed speed (rolltriage's stated spread for an unknown line speed)";
const DIAMETER_SPREAD: &str = "0.6 to 1.5 times the assumed diameter \
     (rolltriage's stated spread for an unknown finished roll)";
const PLATEAU_SPREAD: &str = "half to twice the assumed knee (rolltriage's stated spread)";

fn pfeiffer(case: &ResolvedCase) -> Option<(f64, f64)> {
    match case.web.radial_stiffness {
        RadialStiffness::Pfeiffer { k1, k2 } => Some((k1, k2)),
        _ => None,
    }
}

fn set_pfeiffer(case: &mut ResolvedCase, k1: Option<f64>, k2: Option<f64>) {
    if let RadialStiffness::Pfeiffer { k1: a, k2: b } = &mut case.web.radial_stiffness {
        *a = k1.unwrap_or(*a);
        *b = k2.unwrap_or(*b);
    }
}

fn scaled(case: &mut ResolvedCase, change: SettingChange) {
    *case = super::what_if::apply_changes(case, &[change]);
}

/// The inputs that are moved, in the order they are tried.
const KNOBS: &[Knob] = &[
    Knob {
        path: "web.friction",
        get: |c| Some(c.web.friction),
        set: |c, v| c.web.friction = v,
        spread: Spread::WebPresets,
    },
    Knob {
        path: "web.kinetic_friction",
        get: |c| Some(c.web.kinetic_friction),
        set: |c, v| c.web.kinetic_friction = v,
        spread: Spread::WebPresets,
    },
    Knob {
        path: "winding.tension",
        get: |c| Some(c.winding.tension.start_tension),
        set: |c, v| {
            let now = c.winding.tension.start_tension;
            if now > 0.0 {
                scaled(c, SettingChange::TensionScale(v / now));
            }
        },
        spread: Spread::Factor {
            low: 0.5,
            high: 1.5,
            source: TENSION_SPREAD,
        },
    },
    Knob {
        path: "web.radial_stiffness.k1",
        get: |c| pfeiffer(c).map(|(k1, _)| k1),
        set: |c, v| set_pfeiffer(c, Some(v), None),
        spread: Spread::WebPresets,
    },
    Knob {
        path: "web.radial_stiffness.k2",
        get: |c| pfeiffer(c).map(|(_, k2)| k2),
        set: |c, v| set_pfeiffer(c, None, Some(v)),
        spread: Spread::WebPresets,
    },
    Knob {
        path: "web.tangential_modulus",
        get: |c| Some(c.web.tangential_modulus),
        set: |c, v| c.web.tangential_modulus = v,
        spread: Spread::WebPresets,
    },
    Knob {
        path: "web.thickness",
        get: |c| Some(c.web.thickness),
        set: |c, v| c.web.thickness = v,
        spread: Spread::WebPresets,
    },
    Knob {
        path: "web.roughness",
        get: |c| Some(c.web.roughness),
        set: |c, v| c.web.roughness = v,
        spread: Spread::WebPresets,
    },
    Knob {
        path: "web.strength",
        get: |c| Some(c.web.strength),
        set: |c, v| c.web.strength = v,
        spread: Spread::WebPresets,
    },
    Knob {
        path: "web.density",
        get: |c| Some(c.web.density),
        set: |c, v| c.web.density = v,
        spread: Spread::WebPresets,
    },
    Knob {
        path: "winding.speed",
        get: |c| Some(c.winding.speed),
        set: |c, v| {
            let now = c.winding.speed;
            if now > 0.0 {
                scaled(c, SettingChange::SpeedScale(v / now));
            }
        },
        spread: Spread::Factor {
            low: 0.5,
            high: 2.0,
            source: SPEED_SPREAD,
        },
    },
    Knob {
        path: "roll.diameter",
        get: |c| Some(c.roll.outer_diameter),
        set: |c, v| {
            // Never at or inside the core: the case would no longer be a roll.
            if v > c.core.outside_diameter * 1.05 {
                c.roll.outer_diameter = v;
            }
        },
        spread: Spread::Factor {
            low: 0.6,
            high: 1.5,
            source: DIAMETER_SPREAD,
        },
    },
    Knob {
        path: "core.crush_pressure",
        get: |c| Some(c.core.crush_pressure),
        set: |c, v| c.core.crush_pressure = v,
        spread: Spread::CorePresets,
    },
    Knob {
        path: "core.modulus",
        get: |c| match c.core.stiffness {
            CoreStiffness::Hollow { modulus, .. } => Some(modulus),
            CoreStiffness::Tube { hoop_modulus, .. } => Some(hoop_modulus),
            _ => None,
        },
        set: |c, v| match &mut c.core.stiffness {
            CoreStiffness::Hollow { modulus, .. } => *modulus = v,
            CoreStiffness::Tube { hoop_modulus, .. } => *hoop_modulus = v,
            _ => {}
        },
        spread: Spread::CorePresets,
    },
    Knob {
        path: "core.radial_modulus",
        get: |c| match c.core.stiffness {
            CoreStiffness::Tube { radial_modulus, .. } => Some(radial_modulus),
            _ => None,
        },
        set: |c, v| {
            if let CoreStiffness::Tube { radial_modulus, .. } = &mut c.core.stiffness {
                *radial_modulus = v;
            }
        },
        spread: Spread::CorePresets,
    },
    Knob {
        path: "winding.nip_plateau",
        get: |c| {
            (c.winding.nip_load.is_some() || c.winding.nip_programme.is_some())
                .then_some(c.winding.nip_plateau)
        },
        set: |c, v| c.winding.nip_plateau = v,
        spread: Spread::Factor {
            low: 0.5,
            high: 2.0,
            source: PLATEAU_SPREAD,
        },
    },
];

/// What the triage answered with one assumed input moved to one value.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Trial {
    /// The value tried (SI).
    pub value: f64,
    /// The value tried, with its unit.
    pub value_text: String,
    /// ID of the cause ranked first with this value (`None`: no cause reached a belief).
    pub first_cause: Option<String>,
    /// Its title.
    pub first_title: Option<String>,
    /// Its belief.
    pub first_belief: f64,
    /// The belief in the cause the case itself ranks first, with this value.
    pub base_cause_belief: f64,
}

/// How one assumed input moves the answer.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct InputSensitivity {
    /// Field path as in the case file (e.g. `web.friction`).
    pub field: String,
    /// Its label in words, from the case field registry.
    pub label: String,
    /// The value used, with its unit.
    pub used: String,
    /// The plausible range tried, low to high (SI).
    pub low: f64,
    pub high: f64,
    /// The range in words with units, e.g. "0.3 to 0.5".
    pub range_text: String,
    /// Where the range comes from.
    pub range_source: String,
    pub trials: Vec<Trial>,
    /// Some value in the range puts another cause first.
    pub changes_first_cause: bool,
    /// The largest change of the belief in the case's first cause over the range.
    pub belief_shift: f64,
}

impl InputSensitivity {
    /// True when moving this input changes nothing a reader would see.
    pub fn matters(&self) -> bool {
        self.changes_first_cause || self.belief_shift >= NO_CHANGE
    }

    /// One line in plain words (no IDs), e.g. "Web-to-web friction: assumed 0.3, tried 0.22 to
    /// 0.38 (…). At 0.22, "Slippery web" comes first (belief 0.59)."
    pub fn describe(&self, sensitivity: &Sensitivity) -> String {
        let base = sensitivity.first_cause.as_deref();
        let head = format!(
            "{}: assumed {}, tried {} ({})",
            self.label, self.used, self.range_text, self.range_source
        );
        if self.changes_first_cause
            && let Some(t) = self
                .trials
                .iter()
                .find(|t| t.first_cause.as_deref() != base)
        {
            let becomes = match &t.first_title {
                Some(title) => format!("\"{title}\" comes first (belief {:.2})", t.first_belief),
                None => "no cause keeps a belief".to_string(),
            };
            return format!("{head}. At {}, {becomes}.", t.value_text);
        }
        let title = sensitivity.first_title.clone().unwrap_or_default();
        let beliefs: Vec<String> = self
            .trials
            .iter()
            .map(|t| format!("{:.2} at {}", t.base_cause_belief, t.value_text))
            .collect();
        format!(
            "{head}. Belief in \"{title}\": {:.2} as assumed, {}.",
            sensitivity.first_belief,
            beliefs.join(", ")
        )
    }
}

/// Which assumed inputs the answer rests on, most influential first.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct Sensitivity {
    /// The cause the case ranks first (ID) and its title and belief.
    pub first_cause: Option<String>,
    pub first_title: Option<String>,
    pub first_belief: f64,
    /// How many inputs were assumed (left out, or preset values written unchanged).
    pub assumed: usize,
    /// Every input that was moved, most influential first.
    pub inputs: Vec<InputSensitivity>,
    /// Assumed inputs that were not moved (choices, or no plain numeric spread): field paths.
    pub not_varied: Vec<String>,
    /// Moves whose solve failed (the input and the value, in words); they count as no change.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub failed: Vec<String>,
}

impl Sensitivity {
    /// True when nothing was assumed, so there is nothing to report.
    pub fn is_empty(&self) -> bool {
        self.assumed == 0
    }

    /// The inputs that change what a reader sees, at most `n`, most influential first.
    pub fn top(&self, n: usize) -> impl Iterator<Item = &InputSensitivity> {
        self.inputs.iter().filter(|i| i.matters()).take(n)
    }

    /// The labels of the assumed inputs not moved, in words.
    pub fn not_varied_labels(&self) -> Vec<&'static str> {
        self.not_varied
            .iter()
            .filter_map(|path| registry::field(path).map(|f| f.label))
            .filter(|label| !label.is_empty())
            .collect()
    }

    /// The section in plain words (CLI text, reports): a heading line, then one line per input
    /// that matters (at most `n`), then what was not varied. Empty when nothing was assumed.
    pub fn lines(&self, n: usize) -> Vec<String> {
        if self.is_empty() {
            return Vec::new();
        }
        let mut out = vec![match self.inputs.len() {
            0 => "No assumed number could be varied.".to_string(),
            1 => "The one assumed number was moved to the low and the high end of its plausible \
                  range and the diagnosis re-run."
                .to_string(),
            n => format!(
                "Each of the {n} assumed numbers was moved to the low and the high end of its \
                 plausible range and the diagnosis re-run."
            ),
        }];
        let top: Vec<String> = self.top(n).map(|i| i.describe(self)).collect();
        if top.is_empty() {
            out.push(
                "None of them changes the first cause or its belief by 0.01 or more.".to_string(),
            );
        } else {
            out.push("Those that move the ranking most:".to_string());
            out.extend(top.into_iter().map(|line| format!("- {line}")));
        }
        let not_varied = self.not_varied_labels();
        if !not_varied.is_empty() {
            out.push(format!(
                "Not varied (choices, or no plain range): {}.",
                not_varied.join(", ")
            ));
        }
        if !self.failed.is_empty() {
            out.push(format!(
                "Not computable, counted as no change: {}.",
                self.failed.join("; ")
            ));
        }
        out
    }
}

/// A knob's range for this case, or `None` when it has no spread to try.
fn range_of(knob: &Knob, case: &ResolvedCase, used: f64) -> Option<(f64, f64, String)> {
    let field = registry::field(knob.path)?;
    let (mut low, mut high, source) = match knob.spread {
        Spread::Factor { low, high, source } => (used * low, used * high, source.to_string()),
        Spread::WebPresets => {
            let DefaultValue::WebPreset(get) = field.default else {
                return None;
            };
            let kind = case.web.material;
            let values: Vec<f64> = crate::presets::web_presets()
                .iter()
                .filter(|p: &&WebPreset| p.material == kind && !p.id.ends_with("_reference"))
                .map(|p| get(p).value)
                .collect();
            preset_spread(&values, used, &format!("{kind} presets"))
        }
        Spread::CorePresets => {
            let DefaultValue::CorePreset(get) = field.default else {
                return None;
            };
            let kind = case.core.material;
            let values: Vec<f64> = crate::presets::core_presets()
                .iter()
                .filter(|p: &&CorePreset| p.material == kind)
                .map(|p| get(p).value)
                .collect();
            preset_spread(&values, used, &format!("{kind} core presets"))
        }
    };
    // Two significant digits: a plausible range is not known better than that, and the tried
    // values print as a person would write them.
    (low, high) = (round2(low), round2(high));
    let accepted = field.range();
    if !accepted.contains(low) {
        low = used;
    }
    if !accepted.contains(high) {
        high = used;
    }
    (high > low).then_some((low, high, source))
}

fn round2(value: f64) -> f64 {
    if value == 0.0 || !value.is_finite() {
        return value;
    }
    let scale = 10f64.powi(1 - value.abs().log10().floor() as i32);
    (value * scale).round() / scale
}

/// The spread of `values` and `used`, widened to at least ±[`MIN_PRESET_SPREAD`].
fn preset_spread(values: &[f64], used: f64, kind: &str) -> (f64, f64, String) {
    let low = values
        .iter()
        .copied()
        .fold(used * (1.0 - MIN_PRESET_SPREAD), f64::min);
    let high = values
        .iter()
        .copied()
        .fold(used * (1.0 + MIN_PRESET_SPREAD), f64::max);
    (
        low,
        high,
        format!(
            "the spread of the shipped {kind}, at least ±{:.0} %",
            MIN_PRESET_SPREAD * 100.0
        ),
    )
}

/// The inputs of `case` that were assumed (left out, or preset values written unchanged).
fn assumed_paths(case: &ResolvedCase) -> Vec<&str> {
    let mut paths: Vec<&str> = Vec::new();
    for a in &case.assumed {
        // The preset's name is where values came from, not an input of its own.
        let preset = a.field.ends_with(".preset");
        if a.origin != ValueOrigin::Computed && !preset && !paths.contains(&a.field.as_str()) {
            paths.push(a.field.as_str());
        }
    }
    paths
}

/// One changed case to run: which knob, which value.
struct Move {
    knob: usize,
    value: f64,
    case: ResolvedCase,
}

/// Move each assumed input of `case` across its plausible range and re-run the triage.
/// `profile` and `diagnosis` are the case's own (from [`pipeline::triage`]); the moves are solved
/// on the grid `profile` used. Progress runs over the solves; `false` cancels.
pub fn sensitivity(
    rules: &RuleBase,
    case: &ResolvedCase,
    profile: &Profile,
    diagnosis: &Diagnosis,
    solver: SolverOptions,
    progress: Progress<'_>,
) -> Result<Sensitivity, DiagnoseError> {
    let assumed = assumed_paths(case);
    let first = diagnosis.causes.first();
    let mut result = Sensitivity {
        first_cause: first.map(|c| c.id.clone()),
        first_title: first.map(|c| c.title.clone()),
        first_belief: first.map_or(0.0, |c| c.belief),
        assumed: assumed.len(),
        ..Sensitivity::default()
    };
    let mut moves: Vec<Move> = Vec::new();
    let mut ranges: Vec<Option<(f64, f64, f64, String)>> = vec![None; KNOBS.len()];
    for path in &assumed {
        let Some(index) = KNOBS.iter().position(|k| k.path == *path) else {
            result.not_varied.push((*path).to_string());
            continue;
        };
        let knob = &KNOBS[index];
        let Some(used) = (knob.get)(case).filter(|v| v.is_finite()) else {
            result.not_varied.push((*path).to_string());
            continue;
        };
        let Some((low, high, source)) = range_of(knob, case, used) else {
            result.not_varied.push((*path).to_string());
            continue;
        };
        ranges[index] = Some((used, low, high, source));
        for value in [low, high] {
            let mut changed = case.clone();
            (knob.set)(&mut changed, value);
            moves.push(Move {
                knob: index,
                value,
                case: changed,
            });
        }
    }

    let solver = SolverOptions {
        resolution: profile.solver.grid.resolution(),
        ..solver
    };
    let base_problem = case.problem(solver);
    let to_solve: Vec<&ResolvedCase> = moves
        .iter()
        .filter(|m| m.case.problem(solver) != base_problem)
        .map(|m| &m.case)
        .collect();
    let mut solved = pipeline::solve_all(&to_solve, solver, progress)?.into_iter();
    let options = DiagnoseOptions {
        top: 0,
        what_if: false,
        solver,
    };
    let base_first = result.first_cause.clone();
    for m in &moves {
        let knob = &KNOBS[m.knob];
        let label = registry::field(knob.path).map_or(knob.path, |f| f.label);
        let text = registry::field(knob.path)
            .map_or_else(|| format!("{}", m.value), |f| f.range().show(m.value));
        let own;
        let outcome: Result<&Profile, ModelError> = if m.case.problem(solver) == base_problem {
            Ok(profile)
        } else {
            match solved.next() {
                Some(Ok(p)) => {
                    own = p;
                    Ok(&own)
                }
                Some(Err(e)) => Err(e),
                None => Err(ModelError::NotConverged("no solve was run".into())),
            }
        };
        let trial_diagnosis = outcome
            .map_err(DiagnoseError::from)
            .and_then(|p| pipeline::diagnose_solved(rules, &m.case, p, &options, &mut |_| true));
        let trial_diagnosis = match trial_diagnosis {
            Ok(d) => d,
            Err(DiagnoseError::Model(ModelError::Cancelled)) => {
                return Err(ModelError::Cancelled.into());
            }
            Err(_) => {
                result.failed.push(format!("{label} at {text}"));
                continue;
            }
        };
        let top = trial_diagnosis.causes.first();
        let trial = Trial {
            value: m.value,
            value_text: text,
            first_cause: top.map(|c| c.id.clone()),
            first_title: top.map(|c| c.title.clone()),
            first_belief: top.map_or(0.0, |c| c.belief),
            base_cause_belief: base_first
                .as_deref()
                .and_then(|id| trial_diagnosis.causes.iter().find(|c| c.id == id))
                .map_or(0.0, |c| c.belief),
        };
        let Some((used, low, high, source)) = &ranges[m.knob] else {
            continue;
        };
        let entry = match result.inputs.iter_mut().find(|i| i.field == knob.path) {
            Some(entry) => entry,
            None => {
                let field = registry::field(knob.path);
                let show = |v: f64| field.map_or_else(|| format!("{v}"), |f| f.range().show(v));
                result.inputs.push(InputSensitivity {
                    field: knob.path.to_string(),
                    label: label.to_string(),
                    used: show(*used),
                    low: *low,
                    high: *high,
                    range_text: format!("{} to {}", show(*low), show(*high)),
                    range_source: source.clone(),
                    trials: Vec::new(),
                    changes_first_cause: false,
                    belief_shift: 0.0,
                });
                let last = result.inputs.len() - 1;
                &mut result.inputs[last]
            }
        };
        entry.changes_first_cause |= trial.first_cause != base_first;
        entry.belief_shift = entry
            .belief_shift
            .max((trial.base_cause_belief - result.first_belief).abs());
        entry.trials.push(trial);
    }
    // Stable: among equals the knob order (friction, tension, ... first) stands.
    result.inputs.sort_by(|a, b| {
        b.changes_first_cause
            .cmp(&a.changes_first_cause)
            .then(b.belief_shift.total_cmp(&a.belief_shift))
    });
    Ok(result)
}
