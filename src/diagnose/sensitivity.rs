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

/// How many of the inputs that move the answer the outputs name: the text and Markdown of
/// `diagnose`, reports, and the results screen's movers.
pub const SHOWN: usize = 3;

/// How the plausible range of an assumed value is found.
#[derive(Debug, Clone, Copy)]
enum Spread {
    /// The value over the shipped presets of the same web or core material (the field's
    /// default says which presets hold it).
    Presets,
    /// The value used times `low` and times `high`, for the stated reason.
    Factor {
        low: f64,
        high: f64,
        source: &'static str,
    },
}

/// How a tried value goes into the case.
#[derive(Debug, Clone, Copy)]
enum Apply {
    /// Written over the number.
    Write,
    /// Through the what-if's change applier, as the ratio of the tried to the used value, so
    /// what goes with the number (tension steps and upsets, ...) moves with it. Nothing moves
    /// when the used value is not positive.
    Scale(fn(f64) -> SettingChange),
    /// Written over the number only above this multiple of the core's outside diameter: a
    /// finished roll at or inside its core would no longer be a roll.
    AboveCore(f64),
}

/// The number of a resolved case a knob moves, for reading and for writing (one accessor for
/// both, so a row cannot read one number and write another); `None` when the case has no such
/// number (e.g. a core modulus on a rigid core).
type Place = fn(&mut ResolvedCase) -> Option<&mut f64>;

/// One assumed input that can be moved: its registry path, where its number sits on a resolved
/// case, how a tried value is put there, and its plausible range.
struct Knob {
    path: &'static str,
    place: Place,
    apply: Apply,
    spread: Spread,
}

impl Knob {
    /// The value the case uses, `None` when it has none or it is not finite.
    fn used(&self, case: &ResolvedCase) -> Option<f64> {
        // The accessor writes as well as reads, so it reads on a copy (cheap beside a solve).
        (self.place)(&mut case.clone())
            .map(|v| *v)
            .filter(|v| v.is_finite())
    }

    /// `case` with this knob's number moved to `value`.
    fn moved(&self, case: &ResolvedCase, value: f64) -> ResolvedCase {
        let mut changed = case.clone();
        let floor = case.core.outside_diameter;
        let Some(number) = (self.place)(&mut changed) else {
            return changed;
        };
        match self.apply {
            Apply::Write => *number = value,
            Apply::AboveCore(factor) if value > floor * factor => *number = value,
            Apply::AboveCore(_) => {}
            Apply::Scale(change) => {
                let now = *number;
                if now > 0.0 {
                    return super::what_if::apply_changes(case, &[change(value / now)]);
                }
            }
        }
        changed
    }
}

const TENSION: Spread = Spread::Factor {
    low: 0.5,
    high: 1.5,
    source: "half to one and a half times the rule-of-thumb tension \
             (rolltriage's stated spread: a rule of thumb is a starting point, not the setting)",
};
const SPEED: Spread = Spread::Factor {
    low: 0.5,
    high: 2.0,
    source: "half to twice the assumed speed (rolltriage's stated spread for an unknown line speed)",
};
const DIAMETER: Spread = Spread::Factor {
    low: 0.6,
    high: 1.5,
    source: "0.6 to 1.5 times the assumed diameter \
             (rolltriage's stated spread for an unknown finished roll)",
};
const PLATEAU: Spread = Spread::Factor {
    low: 0.5,
    high: 2.0,
    source: "half to twice the assumed knee (rolltriage's stated spread)",
};

/// Pfeiffer's K1 and K2 of the web, when its radial stiffness is given that way.
fn pfeiffer(c: &mut ResolvedCase) -> Option<(&mut f64, &mut f64)> {
    match &mut c.web.radial_stiffness {
        RadialStiffness::Pfeiffer { k1, k2 } => Some((k1, k2)),
        _ => None,
    }
}

/// The core's (hoop) modulus — a hollow core's one modulus, a tube's hoop modulus — and a
/// tube's radial modulus.
fn core_moduli(c: &mut ResolvedCase) -> Option<(&mut f64, Option<&mut f64>)> {
    match &mut c.core.stiffness {
        CoreStiffness::Hollow { modulus, .. } => Some((modulus, None)),
        CoreStiffness::Tube {
            hoop_modulus,
            radial_modulus,
            ..
        } => Some((hoop_modulus, Some(radial_modulus))),
        _ => None,
    }
}

/// The nip's knee, only where the case has a nip.
fn nip_plateau(c: &mut ResolvedCase) -> Option<&mut f64> {
    let w = &mut c.winding;
    (w.nip_load.is_some() || w.nip_programme.is_some()).then_some(&mut w.nip_plateau)
}

/// The inputs that are moved, in the order they are tried: one row per knob.
#[rustfmt::skip]
const KNOBS: &[Knob] = {
    use Apply::{AboveCore, Scale, Write};
    use SettingChange::{SpeedScale, TensionScale};
    use Spread::Presets;
    const fn knob(path: &'static str, place: Place, apply: Apply, spread: Spread) -> Knob {
        Knob { path, place, apply, spread }
    }
    // knob(path in the case file, its number on a resolved case, how a value goes in, range)
    &[
        knob("web.friction",            |c| Some(&mut c.web.friction),            Write, Presets),
        knob("web.kinetic_friction",    |c| Some(&mut c.web.kinetic_friction),    Write, Presets),
        knob("winding.tension",         |c| Some(&mut c.winding.tension.start_tension),
                                        Scale(TensionScale), TENSION),
        knob("web.radial_stiffness.k1", |c| pfeiffer(c).map(|(k1, _)| k1),        Write, Presets),
        knob("web.radial_stiffness.k2", |c| pfeiffer(c).map(|(_, k2)| k2),        Write, Presets),
        knob("web.tangential_modulus",  |c| Some(&mut c.web.tangential_modulus),  Write, Presets),
        knob("web.thickness",           |c| Some(&mut c.web.thickness),           Write, Presets),
        knob("web.roughness",           |c| Some(&mut c.web.roughness),           Write, Presets),
        knob("web.strength",            |c| Some(&mut c.web.strength),            Write, Presets),
        knob("web.density",             |c| Some(&mut c.web.density),             Write, Presets),
        knob("winding.speed",           |c| Some(&mut c.winding.speed),
                                        Scale(SpeedScale), SPEED),
        knob("roll.diameter",           |c| Some(&mut c.roll.outer_diameter),
                                        AboveCore(1.05), DIAMETER),
        knob("core.crush_pressure",     |c| Some(&mut c.core.crush_pressure),     Write, Presets),
        knob("core.modulus",            |c| core_moduli(c).map(|(hoop, _)| hoop), Write, Presets),
        knob("core.radial_modulus",     |c| core_moduli(c).and_then(|(_, radial)| radial),
                                        Write, Presets),
        knob("winding.nip_plateau",     nip_plateau,                              Write, PLATEAU),
    ]
};

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

    /// The labels of the inputs that move the ranking most, at most [`SHOWN`], most influential
    /// first: what the results screen names as the inputs to enter first.
    pub fn movers(&self) -> Vec<&str> {
        self.top(SHOWN).map(|i| i.label.as_str()).collect()
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
        Spread::Presets => {
            let (values, kind) = preset_values(field.default, case)?;
            preset_spread(&values, used, &kind)
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

/// The values of a field with a preset default over the shipped presets of the case's web or
/// core material, and what they are ("film presets"); `None` for a field without one.
fn preset_values(default: DefaultValue, case: &ResolvedCase) -> Option<(Vec<f64>, String)> {
    match default {
        DefaultValue::WebPreset(get) => {
            let kind = case.web.material;
            let values = crate::presets::web_presets()
                .iter()
                .filter(|p: &&WebPreset| p.material == kind && !p.id.ends_with("_reference"))
                .map(|p| get(p).value);
            Some((values.collect(), format!("{kind} presets")))
        }
        DefaultValue::CorePreset(get) => {
            let kind = case.core.material;
            let values = crate::presets::core_presets()
                .iter()
                .filter(|p: &&CorePreset| p.material == kind)
                .map(|p| get(p).value);
            Some((values.collect(), format!("{kind} core presets")))
        }
        _ => None,
    }
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

/// The range tried for one knob: the value used and the low and high ends (SI), and where the
/// range comes from.
struct Tried {
    used: f64,
    low: f64,
    high: f64,
    source: String,
}

/// The moves to run for the `assumed` inputs of `case` (low and high end of each), with each
/// moved knob's range (by knob index). Assumed inputs with nothing to move go to `not_varied`.
fn plan_moves(
    case: &ResolvedCase,
    assumed: &[&str],
    not_varied: &mut Vec<String>,
) -> (Vec<Move>, Vec<Option<Tried>>) {
    let mut moves: Vec<Move> = Vec::new();
    let mut ranges: Vec<Option<Tried>> = KNOBS.iter().map(|_| None).collect();
    for path in assumed {
        let planned = KNOBS
            .iter()
            .position(|k| k.path == *path)
            .and_then(|index| {
                let used = KNOBS[index].used(case)?;
                let (low, high, source) = range_of(&KNOBS[index], case, used)?;
                Some((index, used, low, high, source))
            });
        let Some((index, used, low, high, source)) = planned else {
            not_varied.push((*path).to_string());
            continue;
        };
        for value in [low, high] {
            moves.push(Move {
                knob: index,
                value,
                case: KNOBS[index].moved(case, value),
            });
        }
        ranges[index] = Some(Tried {
            used,
            low,
            high,
            source,
        });
    }
    (moves, ranges)
}

impl Sensitivity {
    /// File `trial` of `knob` (tried over `range`) under its input, which is added on its first
    /// trial.
    fn record(&mut self, knob: &Knob, label: &str, range: &Tried, trial: Trial) {
        let index = match self.inputs.iter().position(|i| i.field == knob.path) {
            Some(index) => index,
            None => {
                let field = registry::field(knob.path);
                let show = |v: f64| field.map_or_else(|| format!("{v}"), |f| f.range().show(v));
                self.inputs.push(InputSensitivity {
                    field: knob.path.to_string(),
                    label: label.to_string(),
                    used: show(range.used),
                    low: range.low,
                    high: range.high,
                    range_text: format!("{} to {}", show(range.low), show(range.high)),
                    range_source: range.source.clone(),
                    trials: Vec::new(),
                    changes_first_cause: false,
                    belief_shift: 0.0,
                });
                self.inputs.len() - 1
            }
        };
        let entry = &mut self.inputs[index];
        entry.changes_first_cause |= trial.first_cause != self.first_cause;
        entry.belief_shift = entry
            .belief_shift
            .max((trial.base_cause_belief - self.first_belief).abs());
        entry.trials.push(trial);
    }
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
    let (moves, ranges) = plan_moves(case, &assumed, &mut result.not_varied);

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
            base_cause_belief: result
                .first_cause
                .as_deref()
                .and_then(|id| trial_diagnosis.causes.iter().find(|c| c.id == id))
                .map_or(0.0, |c| c.belief),
        };
        if let Some(range) = &ranges[m.knob] {
            result.record(knob, label, range, trial);
        }
    }
    // Stable: among equals the knob order (friction, tension, ... first) stands.
    result.inputs.sort_by(|a, b| {
        b.changes_first_cause
            .cmp(&a.changes_first_cause)
            .then(b.belief_shift.total_cmp(&a.belief_shift))
    });
    Ok(result)
}
