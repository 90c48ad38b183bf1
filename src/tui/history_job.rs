//! The history store's work off the UI thread: list the plant's complaints, read one, find the
//! complaints similar to the case on screen, add the case to the history. Each request opens
//! the store on a worker thread and sends its answer back over a channel (the history
//! counterpart of [`super::job`]); [`run_request`] does the same work on the calling thread
//! for tests.

use std::sync::Arc;
use std::sync::mpsc::{Receiver, Sender, channel};

use crate::case::Case;
use crate::diagnose::DiagnoseOptions;
use crate::diagnose::rules::RuleBase;
use crate::history::{
    self, ComplaintSummary, Entry, Filter, HistoryError, Location, PastComplaint, StoredComplaint,
};

/// At most this many complaints are listed (newest first); `rolltriage history list` filters
/// the rest.
pub const LIST_LIMIT: usize = 500;
/// Similar past complaints shown for the case on screen.
pub const SIMILAR_TOP: usize = 5;

/// What to do with the store.
#[derive(Debug, Clone, PartialEq)]
pub enum HistoryTask {
    /// The newest complaints.
    List,
    /// One complaint with all its versions.
    Show(i64),
    /// The complaints nearest to this case (solved first, as `history similar` does).
    Similar(Box<Case>),
    /// Store this case as a new complaint (as `history add` does).
    Add(Box<Case>),
}

#[derive(Debug, Clone, PartialEq)]
pub struct HistoryRequest {
    pub id: u64,
    pub location: Location,
    pub task: HistoryTask,
}

/// The answer to a request.
#[derive(Debug, Clone, PartialEq)]
pub enum HistoryAnswer {
    /// Newest first, at most [`LIST_LIMIT`]; `total` is how many are stored.
    List {
        complaints: Vec<ComplaintSummary>,
        total: usize,
    },
    Show(Box<StoredComplaint>),
    Similar(Vec<PastComplaint>),
    /// The new complaint's number and the store's place.
    Added {
        id: i64,
        place: String,
    },
}

#[derive(Debug, Clone, PartialEq)]
pub struct HistoryReply {
    pub id: u64,
    pub result: Result<HistoryAnswer, String>,
}

/// "No store yet" as the user reads it.
pub fn missing_store_message(location: &Location) -> String {
    format!(
        "No history store at {} yet. Press a to add this case as its first complaint, or use `rolltriage history add CASE`.",
        location.describe()
    )
}

/// The case as a history entry: parsed back from its YAML (so the stored text is what a saved
/// file would hold), resolved and diagnosed with what-if, as `history add` does.
fn entry_of(rules: &RuleBase, case: &Case) -> Result<Entry, HistoryError> {
    let text = case
        .to_yaml_string()
        .map_err(|e| HistoryError::Input(e.to_string()))?;
    let options = DiagnoseOptions {
        top: 0,
        what_if: true,
        ..DiagnoseOptions::default()
    };
    Entry::compute(rules, &text, "the case on screen", &options)
}

fn answer(rules: &RuleBase, request: &HistoryRequest) -> Result<HistoryAnswer, String> {
    let location = &request.location;
    let reading = !matches!(request.task, HistoryTask::Add(_));
    if reading && location.is_missing_file() {
        return Err(missing_store_message(location));
    }
    let mut store = history::open(location, history::DEFAULT_WAIT).map_err(|e| e.to_string())?;
    let text = |e: HistoryError| e.to_string();
    match &request.task {
        HistoryTask::List => {
            let mut complaints = store.list(&Filter::default()).map_err(text)?;
            let total = complaints.len();
            complaints.truncate(LIST_LIMIT);
            Ok(HistoryAnswer::List { complaints, total })
        }
        HistoryTask::Show(id) => Ok(HistoryAnswer::Show(Box::new(store.get(*id).map_err(text)?))),
        HistoryTask::Similar(case) => {
            let entry = entry_of(rules, case).map_err(text)?;
            let past = history::similar_past(&mut store, rules, &entry, SIMILAR_TOP, None)
                .map_err(text)?;
            Ok(HistoryAnswer::Similar(past))
        }
        HistoryTask::Add(case) => {
            let entry = entry_of(rules, case).map_err(text)?;
            // As `history add`: a reference already stored is not stored twice.
            if let Some(reference) = entry
                .case
                .complaint
                .as_ref()
                .and_then(|c| c.reference.clone())
                && let Some(existing) = store.find_reference(&reference).map_err(text)?
            {
                return Err(format!(
                    "complaint reference {reference} is already stored as number {existing}; record a new version with `rolltriage history add CASE --update {existing}` (nothing was written)"
                ));
            }
            let id = store.add(&entry).map_err(text)?;
            Ok(HistoryAnswer::Added {
                id,
                place: store.place(),
            })
        }
    }
}

/// Do the request's work on the calling thread.
pub fn run_request(rules: &RuleBase, request: &HistoryRequest) -> HistoryReply {
    HistoryReply {
        id: request.id,
        result: answer(rules, request),
    }
}

/// Starts history requests on worker threads and collects their answers.
pub struct HistoryRunner {
    rules: Arc<RuleBase>,
    sender: Sender<HistoryReply>,
    receiver: Receiver<HistoryReply>,
}

impl HistoryRunner {
    pub fn new(rules: Arc<RuleBase>) -> HistoryRunner {
        let (sender, receiver) = channel();
        HistoryRunner {
            rules,
            sender,
            receiver,
        }
    }

    /// Start `request` on a new thread; its answer arrives through [`HistoryRunner::try_recv`].
    pub fn start(&self, request: HistoryRequest) {
        let rules = Arc::clone(&self.rules);
        let sender = self.sender.clone();
        let id = request.id;
        let spawned = std::thread::Builder::new()
            .name(super::job::SOLVER_THREAD_NAME.into())
            .spawn(move || {
                // A panic in the solve or the store must not take the UI down with it.
                let reply = std::panic::catch_unwind(std::panic::AssertUnwindSafe(|| {
                    run_request(&rules, &request)
                }))
                .unwrap_or_else(|_| HistoryReply {
                    id,
                    result: Err("the history work stopped unexpectedly (internal error)".into()),
                });
                let _ = sender.send(reply);
            });
        if let Err(error) = spawned {
            let _ = self.sender.send(HistoryReply {
                id,
                result: Err(format!("cannot start the history thread: {error}")),
            });
        }
    }

    /// The next answer, if one is waiting.
    pub fn try_recv(&self) -> Option<HistoryReply> {
        self.receiver.try_recv().ok()
    }
}
