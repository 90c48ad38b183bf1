//! What every component shares: the case being edited and its resolved inputs, the latest
//! solve, the solves running and waiting to start, the status line and the action queue. No
//! screen state and no terminal code.

use std::collections::BTreeMap;
use std::path::PathBuf;
use std::sync::Arc;

use crate::case::{AssumedValue, Case, CaseError, ResolvedCase};
use crate::diagnose::rules::SettingChange;
use crate::units::UnitSystem;

use super::catalogue::Catalogue;
use super::component::Action;
use super::fields::PresetFamily;
use super::history_job::{HistoryRequest, HistoryTask};
use super::job::{JobError, JobRequest, Purpose, SolveOutcome, Task};

/// Latest finished baseline solve.
#[derive(Debug, Clone, PartialEq)]
pub struct Baseline {
    pub generation: u64,
    pub result: Result<Box<SolveOutcome>, JobError>,
}

#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Running {
    pub id: u64,
    pub generation: u64,
    pub fraction: f64,
}

/// The shared state of the UI.
#[derive(Debug, Clone)]
pub struct Session {
    pub case: Case,
    pub case_path: Option<PathBuf>,
    /// Unsaved changes exist.
    pub dirty: bool,
    /// Bumped on every change of the case; results remember the generation they came from.
    pub generation: u64,
    pub resolved: Result<ResolvedCase, Arc<CaseError>>,
    pub catalogue: Catalogue,
    pub web_presets: Vec<String>,
    pub core_presets: Vec<String>,
    pub units: UnitSystem,
    /// The units were chosen (`--units`, or Ctrl-U): opening a case no longer follows the
    /// units it is typed in.
    pub units_chosen: bool,
    pub baseline: Option<Baseline>,
    pub running_baseline: Option<Running>,
    pub running_what_if: Option<Running>,
    /// One-line message for the status line (saved, not accepted, ...).
    pub status: Option<String>,
    /// Spinner frame counter.
    pub tick: u64,
    /// Setting changes of each remedy, from the rule base (what the what-if applies).
    pub remedy_changes: BTreeMap<String, Vec<SettingChange>>,
    /// Training walk-throughs offered by ^T.
    pub walkthroughs: Vec<crate::training::LoadedWalkthrough>,
    /// The complaint history store (as `rolltriage history` finds it), or why there is none.
    pub history: Result<crate::history::Location, String>,
    /// The past complaints the history screen found similar to the case, with the case
    /// generation they were found for (exports include them while the case is unchanged).
    pub similar_past: Option<(u64, Vec<crate::history::PastComplaint>)>,
    requests: Vec<JobRequest>,
    history_requests: Vec<HistoryRequest>,
    next_job_id: u64,
    actions: Vec<Action>,
}

/// Why the history screen has nothing to show when no store is configured.
pub const NO_HISTORY: &str = "No complaint history store is configured. Start the UI with `rolltriage tui --history PATH` (or set ROLLTRIAGE_HISTORY) to browse the plant's past complaints.";

/// The title of a blank case.
pub const NEW_CASE: &str = "New case";

impl Session {
    pub fn new(catalogue: Catalogue, web_presets: Vec<String>, core_presets: Vec<String>) -> Self {
        let case = Case {
            title: NEW_CASE.into(),
            ..Case::default()
        };
        let resolved = case.resolve().map_err(Arc::new);
        Session {
            case,
            case_path: None,
            dirty: false,
            generation: 0,
            resolved,
            catalogue,
            web_presets,
            core_presets,
            units: UnitSystem::Si,
            units_chosen: false,
            baseline: None,
            running_baseline: None,
            running_what_if: None,
            status: None,
            tick: 0,
            remedy_changes: BTreeMap::new(),
            walkthroughs: Vec::new(),
            history: Err(NO_HISTORY.into()),
            similar_past: None,
            requests: Vec::new(),
            history_requests: Vec::new(),
            next_job_id: 1,
            actions: Vec::new(),
        }
    }

    /// Ask the app for something (carried out after the current key).
    pub fn push(&mut self, action: Action) {
        self.actions.push(action);
    }

    /// The actions asked for since the last call.
    pub fn take_actions(&mut self) -> Vec<Action> {
        std::mem::take(&mut self.actions)
    }

    pub fn set_status(&mut self, message: impl Into<String>) {
        self.status = Some(message.into());
    }

    /// The case's story (title, description, notes, complaint record) was edited: unsaved, but
    /// nothing the solve reads changed, so the results stay current.
    pub fn story_edited(&mut self) {
        self.dirty = true;
    }

    /// Ask for history work (carried out off the UI thread); its request number, or the
    /// reason when no store is configured.
    pub fn queue_history(&mut self, task: HistoryTask) -> Result<u64, String> {
        let location = self.history.clone()?;
        let id = self.next_job_id;
        self.next_job_id += 1;
        self.history_requests
            .push(HistoryRequest { id, location, task });
        Ok(id)
    }

    /// The history requests waiting to be started (taken by the runtime).
    pub fn take_history_requests(&mut self) -> Vec<HistoryRequest> {
        std::mem::take(&mut self.history_requests)
    }

    /// The case was edited in place: unsaved, a new generation, resolved again.
    pub fn edited(&mut self) {
        self.dirty = true;
        self.generation += 1;
        self.refresh_resolved();
        self.push(Action::CaseEdited);
    }

    /// Replace the case (opened, new, a walk-through's): saved as it is, nothing solved yet.
    pub fn replace_case(&mut self, case: Case, path: Option<PathBuf>) {
        self.case = case;
        self.case_path = path;
        self.dirty = false;
        self.generation += 1;
        self.baseline = None;
        self.refresh_resolved();
    }

    pub fn refresh_resolved(&mut self) {
        self.resolved = self.case.resolve().map_err(Arc::new);
    }

    /// The solves waiting to be started (taken by the runtime).
    pub fn take_requests(&mut self) -> Vec<JobRequest> {
        std::mem::take(&mut self.requests)
    }

    pub fn is_solving(&self) -> bool {
        self.running_baseline.is_some() || self.running_what_if.is_some()
    }

    /// The baseline outcome, if it is for the case as it stands now.
    pub fn current_outcome(&self) -> Option<&SolveOutcome> {
        match &self.baseline {
            Some(Baseline {
                generation,
                result: Ok(outcome),
            }) if *generation == self.generation => Some(outcome),
            _ => None,
        }
    }

    /// The latest baseline outcome, current or not.
    pub fn latest_outcome(&self) -> Option<&SolveOutcome> {
        match &self.baseline {
            Some(Baseline {
                result: Ok(outcome),
                ..
            }) => Some(outcome),
            _ => None,
        }
    }

    /// The diagnosis of the latest outcome, if it has one.
    pub fn latest_diagnosis(&self) -> Option<&crate::diagnose::Diagnosis> {
        self.latest_outcome()?.diagnosis.as_ref().ok()
    }

    pub fn baseline_is_stale(&self) -> bool {
        self.baseline
            .as_ref()
            .is_none_or(|b| b.generation != self.generation)
    }

    /// Queue a solve (or a taper design) of `case`, or of already changed resolved inputs.
    pub fn queue(
        &mut self,
        purpose: Purpose,
        case: Case,
        resolved: Option<ResolvedCase>,
        task: Task,
    ) {
        let id = self.next_job_id;
        self.next_job_id += 1;
        let running = Some(Running {
            id,
            generation: self.generation,
            fraction: 0.0,
        });
        match purpose {
            Purpose::Baseline => self.running_baseline = running,
            Purpose::WhatIf => self.running_what_if = running,
        }
        self.requests.push(JobRequest {
            id,
            purpose,
            generation: self.generation,
            case,
            resolved: resolved.map(Box::new),
            task,
        });
    }

    /// Queue a baseline solve of the case as it stands.
    pub fn solve_again(&mut self) {
        self.queue(Purpose::Baseline, self.case.clone(), None, Task::Solve);
    }

    /// Ask for a baseline solve unless one for this generation is done or running.
    pub fn ensure_baseline(&mut self) {
        let running_now = self
            .running_baseline
            .is_some_and(|r| r.generation == self.generation);
        if self.baseline_is_stale() && !running_now {
            self.solve_again();
        }
    }

    /// The assumed value (and its source) for a field path, from the resolved case.
    pub fn assumed(&self, path: &str) -> Option<&AssumedValue> {
        self.resolved
            .as_ref()
            .ok()?
            .assumed
            .iter()
            .find(|a| a.field == path)
    }

    pub fn preset_options(&self, family: PresetFamily) -> &[String] {
        match family {
            PresetFamily::Web => &self.web_presets,
            PresetFamily::Core => &self.core_presets,
        }
    }

    pub fn is_selected(&self, id: &str) -> bool {
        self.case.symptoms.iter().any(|s| s.id == id)
    }

    /// True when the rule base gives `remedy` a machine-readable setting change.
    pub fn remedy_is_tryable(&self, remedy: &str) -> bool {
        self.remedy_changes
            .get(remedy)
            .is_some_and(|changes| !changes.is_empty())
    }

    /// Remedies in the current diagnosis that change a winder setting: (ID, text).
    pub fn what_if_remedies(&self) -> Vec<(String, String)> {
        self.latest_diagnosis()
            .map(|d| {
                d.remedies
                    .iter()
                    .filter(|r| self.remedy_is_tryable(&r.id))
                    .map(|r| (r.id.clone(), r.text.clone()))
                    .collect()
            })
            .unwrap_or_default()
    }
}
