//! The background solver: resolve the case, solve the wound-roll stresses, diagnose — on a
//! worker thread, reporting progress and the result over a channel so the UI never waits.
//! A newer request of the same purpose cancels the older one. Results pass the same guard on
//! numbers as the command line's ([`crate::finite`]): a NaN or infinity comes back as a
//! [`JobError::NotFinite`] the screens show in words, never as "NaN" on a plot or a figure.

use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::mpsc::{Receiver, Sender, channel};

use crate::case::{Case, CaseError, ResolvedCase};
use crate::diagnose::pipeline::CaseInputs;
use crate::diagnose::sensitivity::Sensitivity;
use crate::diagnose::{DiagnoseError, DiagnoseOptions, Diagnosis, rules::RuleBase};
use crate::finite::{NonFinite, ensure_finite};
use crate::model::Profile;
use crate::taper_design::{TaperDesign, TaperError, TaperLimits};

/// Why a job (or its diagnosis) gave no result. The library errors are shared (`Arc`) so a
/// message can be cloned into the screens' state; the text is what the screens show.
#[derive(Debug, Clone, thiserror::Error)]
pub enum JobError {
    /// The case could not be resolved.
    #[error("inputs: {0}")]
    Inputs(Arc<CaseError>),
    /// The stress solve (or the rule base it needs) failed.
    #[error("stress solve: {0}")]
    Solve(Arc<DiagnoseError>),
    /// The stresses are fine but the diagnosis failed (e.g. rule trouble).
    #[error("diagnosis: {0}")]
    Diagnosis(Arc<DiagnoseError>),
    #[error("taper design: {0}")]
    Design(Arc<TaperError>),
    /// A result held a NaN or infinity: the inputs are outside what the model can compute.
    /// Shown in words, without the raw value the command line names.
    #[error(
        "{}: {} could not be computed; the inputs are outside what the model can handle: {}",
        .0.what,
        .0.field,
        .0.hint
    )]
    NotFinite(NonFinite),
    /// The worker panicked (caught; the UI stays up).
    #[error(
        "the solver stopped unexpectedly (internal error){}",
        with_space(detail)
    )]
    Stopped { detail: String },
    #[error("cannot start the solver thread: {0}")]
    NoThread(Arc<std::io::Error>),
}

fn with_space(detail: &str) -> String {
    if detail.trim().is_empty() {
        String::new()
    } else {
        format!(" {}", detail.trim_end())
    }
}

/// Two errors are equal when they are of the same kind and read the same (the library errors
/// inside do not all compare).
impl PartialEq for JobError {
    fn eq(&self, other: &JobError) -> bool {
        std::mem::discriminant(self) == std::mem::discriminant(other)
            && self.to_string() == other.to_string()
    }
}

impl From<CaseError> for JobError {
    fn from(error: CaseError) -> JobError {
        JobError::Inputs(Arc::new(error))
    }
}

/// Why a solve was asked for; results are filed under their purpose.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Purpose {
    /// The case as it stands (results screen).
    Baseline,
    /// The case with one setting changed (what-if screen).
    WhatIf,
}

/// A solve the app asks the runtime to start.
#[derive(Debug, Clone, PartialEq)]
pub struct JobRequest {
    pub id: u64,
    pub purpose: Purpose,
    /// The app's case generation the request was made from (results older than the case are
    /// shown as out of date).
    pub generation: u64,
    pub case: Case,
    /// Already resolved (and changed) inputs to solve instead of resolving `case` — a remedy
    /// tried on the what-if screen changes the resolved case directly.
    pub resolved: Option<Box<ResolvedCase>>,
    pub task: Task,
}

/// What the worker does with the request.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Task {
    /// Resolve, solve, diagnose.
    #[default]
    Solve,
    /// Design a taper schedule for the case (`taper_design::design`, default limits).
    DesignTaper,
}

/// Everything one solve produces.
#[derive(Debug, Clone, PartialEq)]
pub struct SolveOutcome {
    pub resolved: ResolvedCase,
    pub profile: Profile,
    /// The diagnosis can fail on its own (e.g. rule trouble) while the stresses are fine.
    pub diagnosis: Result<Diagnosis, JobError>,
    /// The sensitivity run (each assumed input moved across its plausible range, the triage
    /// re-run): `None` when the case has no assumed inputs, or the run failed. The results
    /// screen and exported reports show its lines; [`SolveOutcome::movers`] comes from it.
    pub sensitivity: Option<Sensitivity>,
    /// The inverse estimate of the wound-in tension (and stack stiffness) from the case's
    /// measurements, as `rolltriage compare` computes it; `None` when nothing was measured or
    /// the solve was of a changed case (what-if). An error is kept as its message.
    pub estimate: Option<Result<crate::evidence::InverseEstimate, String>>,
}

impl SolveOutcome {
    /// The assumed inputs that move the ranking most, in words, most influential first (the
    /// results screen names them; [`Sensitivity::movers`]). Empty when no sensitivity run is
    /// available, and the screen then names the assumed inputs instead.
    pub fn movers(&self) -> Vec<&str> {
        self.sensitivity
            .as_ref()
            .map_or_else(Vec::new, Sensitivity::movers)
    }
}

#[derive(Debug, Clone, PartialEq)]
pub enum JobMessage {
    Progress {
        id: u64,
        fraction: f64,
    },
    Finished {
        id: u64,
        purpose: Purpose,
        generation: u64,
        result: Result<Box<SolveOutcome>, JobError>,
    },
    DesignFinished {
        id: u64,
        generation: u64,
        result: Result<Box<TaperDesign>, JobError>,
    },
}

/// Resolve, solve and diagnose `case` on the calling thread, through the triage pipeline.
/// `progress(fraction)` returning false cancels the solve. A profile or diagnosis holding a NaN
/// or infinity is refused like the command line refuses it.
pub fn run_pipeline(
    case: &Case,
    resolved: Option<&ResolvedCase>,
    rules: &RuleBase,
    progress: crate::diagnose::pipeline::Progress<'_>,
) -> Result<SolveOutcome, JobError> {
    let inputs = match resolved {
        Some(resolved) => CaseInputs::Resolved(resolved),
        None => CaseInputs::File(case),
    };
    // A case with assumed inputs also gets a sensitivity run: two solves per assumed input.
    // The triage then takes its share of the progress bar, the moves the rest.
    let assumed = match resolved {
        Some(resolved) => resolved.assumed.len(),
        None => case.resolve().map_or(0, |r| r.assumed.len()),
    };
    let share = 1.0 / (1.0 + 2.0 * assumed as f64);
    let options = DiagnoseOptions {
        top: 0,
        what_if: false,
        ..DiagnoseOptions::default()
    };
    let triage =
        crate::diagnose::pipeline::triage(rules, inputs, &options, &mut |f| progress(f * share))
            .map_err(|e| match e {
                DiagnoseError::Case(e) => JobError::Inputs(Arc::from(e)),
                e => JobError::Solve(Arc::new(e)),
            })?;
    ensure_finite("the stress profile", &triage.profile).map_err(JobError::NotFinite)?;
    let diagnosis = match triage.diagnosis {
        Ok(diagnosis) => ensure_finite("the diagnosis", &diagnosis)
            .map(|()| diagnosis)
            .map_err(JobError::NotFinite),
        Err(e) => Err(JobError::Diagnosis(Arc::new(e))),
    };
    let sensitivity = match &diagnosis {
        Ok(diagnosis) if !triage.resolved.assumed.is_empty() => {
            let mut moves = |f: f64| progress(share + f * (1.0 - share));
            match crate::diagnose::sensitivity::sensitivity(
                rules,
                &triage.resolved,
                &triage.profile,
                diagnosis,
                options.solver,
                &mut moves,
            ) {
                // A newer request took over: end like a cancelled triage.
                Err(e @ DiagnoseError::Model(crate::model::ModelError::Cancelled)) => {
                    return Err(JobError::Solve(Arc::new(e)));
                }
                // The ranking stands without it; the screen then names the assumed inputs.
                other => other.ok(),
            }
            // Like the command line: a move that is not finite is not shown as a number.
            .filter(|s| ensure_finite("the sensitivity", s).is_ok())
            .filter(|s| !s.is_empty())
        }
        _ => None,
    };
    // The inverse estimate of the case as written (not of a what-if change), after the rest
    // so the ranking shows first.
    let estimate = match (&triage.resolved.measurements, resolved) {
        (Some(measurements), None) => {
            inverse_estimate(measurements, &triage.resolved, &options, progress)?
        }
        _ => None,
    };
    Ok(SolveOutcome {
        resolved: triage.resolved,
        profile: triage.profile,
        diagnosis,
        sensitivity,
        estimate,
    })
}

/// `evidence::estimate` with the default fit options (tension and, where the data allow, the
/// stack stiffness), as `rolltriage compare` runs it; each of its re-solves can be cancelled.
fn inverse_estimate(
    measurements: &crate::evidence::Measurements,
    resolved: &ResolvedCase,
    options: &DiagnoseOptions,
    progress: crate::diagnose::pipeline::Progress<'_>,
) -> Result<Option<Result<crate::evidence::InverseEstimate, String>>, JobError> {
    use crate::model::{ModelError, WindingProblem};
    let progress = std::cell::RefCell::new(progress);
    let solve = |problem: &WindingProblem| {
        crate::model::solve_with_progress(problem, &mut |_| (progress.borrow_mut())(1.0))
    };
    let problem = resolved.problem(options.solver);
    let result = crate::evidence::estimate(
        measurements,
        &problem,
        &solve,
        &crate::evidence::FitOptions::default(),
    );
    Ok(Some(match result {
        Err(crate::evidence::EvidenceError::Model(ModelError::Cancelled)) => {
            return Err(JobError::Solve(Arc::new(DiagnoseError::Model(
                ModelError::Cancelled,
            ))));
        }
        Err(e) => Err(e.to_string()),
        Ok(estimate) => match ensure_finite("the inverse estimate", &estimate) {
            Ok(()) => Ok(estimate),
            Err(e) => Err(JobError::NotFinite(e).to_string()),
        },
    }))
}

/// Design a taper for the request's case with the default limits.
fn design_taper(request: &JobRequest) -> Result<TaperDesign, JobError> {
    let resolved = match &request.resolved {
        Some(resolved) => resolved.as_ref().clone(),
        None => request.case.resolve()?,
    };
    let design = crate::taper_design::design(&resolved, &TaperLimits::default())
        .map_err(|e| JobError::Design(Arc::new(e)))?;
    ensure_finite("the taper design", &design).map_err(JobError::NotFinite)?;
    Ok(design)
}

/// Name of solver threads; the panic hook leaves the terminal alone for panics on them (they
/// are caught and reported in the UI).
pub const SOLVER_THREAD_NAME: &str = "rolltriage-solver";

fn panic_error(payload: &(dyn std::any::Any + Send)) -> JobError {
    let detail = payload
        .downcast_ref::<&str>()
        .map(|s| s.to_string())
        .or_else(|| payload.downcast_ref::<String>().cloned())
        .unwrap_or_default();
    JobError::Stopped { detail }
}

/// Run `work` on a new solver thread and send its result as `finished(result)`. A panic in the
/// numerics must not take the UI down with it: it is caught and sent as [`JobError::Stopped`];
/// when no thread can be started, the message carries [`JobError::NoThread`].
fn spawn_job<T: 'static>(
    sender: &Sender<JobMessage>,
    work: impl FnOnce() -> Result<T, JobError> + Send + 'static,
    finished: impl Fn(Result<T, JobError>) -> JobMessage + Send + Copy + 'static,
) {
    let thread_sender = sender.clone();
    let spawned = std::thread::Builder::new()
        .name(SOLVER_THREAD_NAME.into())
        .spawn(move || {
            let result = std::panic::catch_unwind(std::panic::AssertUnwindSafe(work))
                .unwrap_or_else(|payload| Err(panic_error(payload.as_ref())));
            let _ = thread_sender.send(finished(result));
        });
    if let Err(error) = spawned {
        let _ = sender.send(finished(Err(JobError::NoThread(Arc::new(error)))));
    }
}

/// Starts solves on worker threads and collects their messages.
pub struct JobRunner {
    rules: Arc<RuleBase>,
    sender: Sender<JobMessage>,
    receiver: Receiver<JobMessage>,
    running: Vec<(Purpose, u64, Arc<AtomicBool>)>,
}

impl JobRunner {
    pub fn new(rules: Arc<RuleBase>) -> JobRunner {
        let (sender, receiver) = channel();
        JobRunner {
            rules,
            sender,
            receiver,
            running: Vec::new(),
        }
    }

    /// Start `request` on a new thread, cancelling an older solve of the same purpose.
    pub fn start(&mut self, request: JobRequest) {
        for (purpose, _, cancel) in &self.running {
            if *purpose == request.purpose {
                cancel.store(true, Ordering::Relaxed);
            }
        }
        self.running
            .retain(|(purpose, _, _)| *purpose != request.purpose);
        let cancel = Arc::new(AtomicBool::new(false));
        self.running
            .push((request.purpose, request.id, Arc::clone(&cancel)));
        let rules = Arc::clone(&self.rules);
        let sender = self.sender.clone();
        let id = request.id;
        let purpose = request.purpose;
        let generation = request.generation;
        if request.task == Task::DesignTaper {
            let finished =
                move |result: Result<TaperDesign, JobError>| JobMessage::DesignFinished {
                    id,
                    generation,
                    result: result.map(Box::new),
                };
            spawn_job(&self.sender, move || design_taper(&request), finished);
            return;
        }
        let finished = move |result: Result<SolveOutcome, JobError>| JobMessage::Finished {
            id,
            purpose,
            generation,
            result: result.map(Box::new),
        };
        let solve = move || {
            let mut last_sent = -1.0;
            let mut progress = |fraction: f64| {
                // Throttle: a message per percent is plenty for a spinner.
                if fraction - last_sent >= 0.01 {
                    last_sent = fraction;
                    let _ = sender.send(JobMessage::Progress { id, fraction });
                }
                !cancel.load(Ordering::Relaxed)
            };
            run_pipeline(
                &request.case,
                request.resolved.as_deref(),
                &rules,
                &mut progress,
            )
        };
        spawn_job(&self.sender, solve, finished);
    }

    /// The next message, if one is waiting.
    pub fn try_recv(&mut self) -> Option<JobMessage> {
        let message = self.receiver.try_recv().ok()?;
        if let JobMessage::Finished { id, .. } | JobMessage::DesignFinished { id, .. } = &message {
            self.running.retain(|(_, running_id, _)| running_id != id);
        }
        Some(message)
    }

    /// Ask every running solve to stop (on quit).
    pub fn cancel_all(&self) {
        for (_, _, cancel) in &self.running {
            cancel.store(true, Ordering::Relaxed);
        }
    }
}
