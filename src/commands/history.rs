//! `rolltriage history`: record complaints with what the tool computed, list, show, confirm the
//! cause, find similar past complaints, report the site performance, export and import.

use std::fmt::Write as _;
use std::path::PathBuf;
use std::time::Duration;

use anyhow::{Context, bail};
use rolltriage::complaint::{ConfirmedCause, STATUSES};
use rolltriage::diagnose::{DiagnoseOptions, Diagnosis, rules::RuleBase};
use rolltriage::history::{
    self, Entry, Filter, Location, Store, StoredComplaint, experience, similar, transfer,
};

use super::diagnose::load_rules;
use super::output::write_stdout;

#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum)]
pub enum Format {
    #[default]
    Text,
    Json,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum)]
pub enum ExportFormat {
    #[default]
    Json,
    Csv,
}

/// Where the store is and how long to wait for it (shared by every history subcommand and by
/// `diagnose --history`).
#[derive(Debug, Clone, clap::Args)]
pub struct StoreArgs {
    /// The history store: a SQLite file, a `postgres://user@host/db` URL, or `default` for the
    /// per-user store (docs/history.md). Default: $ROLLTRIAGE_HISTORY or the per-user store.
    #[arg(long = "history", value_name = "PATH|URL", global = true)]
    pub history: Option<String>,
    /// Seconds to wait for another writer's lock or for the server before giving up.
    #[arg(
        long = "wait",
        value_name = "SECONDS",
        default_value_t = 5.0,
        global = true
    )]
    pub wait: f64,
}

#[derive(Debug, clap::Args)]
#[command(after_help = "Examples:
  rolltriage history add cases/harbour_newsprint_telescoping.yaml
  rolltriage history list --symptom telescoping --status open
  rolltriage history confirm 12 --cause tension_too_low --evidence \"trial at 1.7 pli: no telescoping\"
  rolltriage history similar new_complaint.yaml
  rolltriage history export --format csv --anonymise -o complaints.csv
  rolltriage history list --history postgres://mill@db.local/rolltriage")]
pub struct HistoryArgs {
    #[command(flatten)]
    pub store: StoreArgs,
    #[command(subcommand)]
    pub command: HistoryCommand,
}

#[derive(Debug, clap::Subcommand)]
pub enum HistoryCommand {
    /// Diagnose a case and store it as a complaint (or as a new version with --update).
    Add(AddArgs),
    /// List stored complaints, newest first.
    List(ListArgs),
    /// Show one complaint: record, status changes, versions, the ranking as shown then.
    Show(ShowArgs),
    /// Record a confirmed cause and the evidence (a new version; status becomes cause_confirmed).
    Confirm(ConfirmArgs),
    /// Change a complaint's status (a new version): open, contained, cause_confirmed, closed.
    Status(StatusArgs),
    /// The stored complaints most like a case, with their confirmed causes.
    Similar(SimilarArgs),
    /// How often the confirmed cause was ranked first / in the first three.
    Performance(PerformanceArgs),
    /// Write every complaint as JSON (all versions, importable) or CSV (one line each).
    Export(ExportArgs),
    /// Add the complaints of a JSON export (validated first; all or nothing).
    Import(ImportArgs),
}

#[derive(Debug, clap::Args)]
pub struct AddArgs {
    /// Case file (YAML) with symptoms and, ideally, a `complaint:` section.
    pub case: PathBuf,
    /// Store as a new version of complaint ID instead of a new complaint.
    #[arg(long, value_name = "ID", conflicts_with = "new")]
    pub update: Option<i64>,
    /// Store as a new complaint even if its reference is already stored.
    #[arg(long)]
    pub new: bool,
    /// Leave site experience out of the ranking.
    #[arg(long)]
    pub no_site_history: bool,
    /// Use the rule base in DIR instead of the shipped one.
    #[arg(long = "rules", value_name = "DIR")]
    pub rules: Option<PathBuf>,
    #[arg(long, value_enum, default_value_t = Format::Text)]
    pub format: Format,
}

#[derive(Debug, clap::Args)]
pub struct ListArgs {
    #[arg(long)]
    pub line: Option<String>,
    #[arg(long)]
    pub grade: Option<String>,
    /// Symptom ID.
    #[arg(long)]
    pub symptom: Option<String>,
    /// open, contained, cause_confirmed or closed.
    #[arg(long)]
    pub status: Option<String>,
    /// Received on or after DATE (YYYY-MM-DD).
    #[arg(long, value_name = "DATE")]
    pub from: Option<String>,
    /// Received on or before DATE (YYYY-MM-DD).
    #[arg(long, value_name = "DATE")]
    pub to: Option<String>,
    #[arg(long, value_enum, default_value_t = Format::Text)]
    pub format: Format,
}

#[derive(Debug, clap::Args)]
pub struct ShowArgs {
    pub id: i64,
    /// Show this version instead of the latest.
    #[arg(long, value_name = "N")]
    pub version: Option<i64>,
    /// Print the case file as entered (YAML) instead.
    #[arg(long)]
    pub case: bool,
    #[arg(long, value_enum, default_value_t = Format::Text)]
    pub format: Format,
}

#[derive(Debug, clap::Args)]
pub struct ConfirmArgs {
    pub id: i64,
    /// Cause ID (see rules/causes.yaml), e.g. tension_too_low.
    #[arg(long)]
    pub cause: String,
    /// What confirmed it: the trial, measurement or finding.
    #[arg(long)]
    pub evidence: String,
    /// Who confirmed it.
    #[arg(long, value_name = "NAME")]
    pub by: Option<String>,
    /// Date confirmed (YYYY-MM-DD); today (UTC) by default.
    #[arg(long, value_name = "DATE")]
    pub on: Option<String>,
    #[arg(long = "rules", value_name = "DIR")]
    pub rules: Option<PathBuf>,
}

#[derive(Debug, clap::Args)]
pub struct StatusArgs {
    pub id: i64,
    /// open, contained, cause_confirmed or closed.
    pub status: String,
    /// Why (kept with the status change).
    #[arg(long)]
    pub note: Option<String>,
}

#[derive(Debug, clap::Args)]
pub struct SimilarArgs {
    pub case: PathBuf,
    /// How many to show.
    #[arg(long, value_name = "N", default_value_t = 5)]
    pub top: usize,
    #[arg(long = "rules", value_name = "DIR")]
    pub rules: Option<PathBuf>,
    #[arg(long, value_enum, default_value_t = Format::Text)]
    pub format: Format,
}

#[derive(Debug, clap::Args)]
pub struct PerformanceArgs {
    #[arg(long, value_enum, default_value_t = Format::Text)]
    pub format: Format,
}

#[derive(Debug, clap::Args)]
pub struct ExportArgs {
    /// Output file; `-` (the default) writes to standard output.
    #[arg(short, long, default_value = "-")]
    pub output: PathBuf,
    #[arg(long, value_enum, default_value_t = ExportFormat::Json)]
    pub format: ExportFormat,
    /// Replace customer names everywhere by "customer 1", "customer 2", ….
    #[arg(long, alias = "anonymize")]
    pub anonymise: bool,
}

#[derive(Debug, clap::Args)]
pub struct ImportArgs {
    /// A JSON file written by `history export`.
    pub file: PathBuf,
    #[arg(long = "rules", value_name = "DIR")]
    pub rules: Option<PathBuf>,
}

impl StoreArgs {
    pub fn location(&self) -> anyhow::Result<Location> {
        match self.history.as_deref() {
            None | Some("default") => Ok(Location::default_for_user()?),
            Some(text) => Ok(Location::parse(text)),
        }
    }

    pub fn wait(&self) -> anyhow::Result<Duration> {
        if !(self.wait.is_finite() && (0.0..=3600.0).contains(&self.wait)) {
            bail!(
                "--wait: {} is not accepted; accepted: 0 to 3600 seconds",
                self.wait
            );
        }
        Ok(Duration::from_secs_f64(self.wait))
    }

    /// Open the store, creating it when missing.
    pub fn open(&self) -> anyhow::Result<Store> {
        let location = self.location()?;
        Ok(history::open(&location, self.wait()?)?)
    }

    /// Open for reading: a file that does not exist yet is an error, not a new store.
    pub fn open_existing(&self) -> anyhow::Result<Store> {
        let location = self.location()?;
        if location.is_missing_file() {
            bail!(
                "no history store at {} yet; `rolltriage history add CASE` starts one",
                location.describe()
            );
        }
        Ok(history::open(&location, self.wait()?)?)
    }
}

pub fn run(args: &HistoryArgs) -> anyhow::Result<()> {
    match &args.command {
        HistoryCommand::Add(a) => add(&args.store, a),
        HistoryCommand::List(a) => list(&args.store, a),
        HistoryCommand::Show(a) => show(&args.store, a),
        HistoryCommand::Confirm(a) => confirm(&args.store, a),
        HistoryCommand::Status(a) => status(&args.store, a),
        HistoryCommand::Similar(a) => similar_cmd(&args.store, a),
        HistoryCommand::Performance(a) => performance(&args.store, a),
        HistoryCommand::Export(a) => export(&args.store, a),
        HistoryCommand::Import(a) => import(&args.store, a),
    }
}

fn read_case(path: &PathBuf) -> anyhow::Result<String> {
    let bytes = std::fs::read(path).with_context(|| format!("reading {}", path.display()))?;
    if bytes.len() as u64 > rolltriage::case::MAX_CASE_FILE_BYTES {
        bail!(
            "{}: {} bytes is more than the {} bytes a case file may have",
            path.display(),
            bytes.len(),
            rolltriage::case::MAX_CASE_FILE_BYTES
        );
    }
    String::from_utf8(bytes).with_context(|| format!("{}: not UTF-8 text", path.display()))
}

/// Diagnose a case for the history (all causes, what-if on) with site experience applied when
/// `site` is given; `top` causes kept (0 = all).
pub fn compute_entry(
    rules: &RuleBase,
    path: &PathBuf,
    site: Option<&mut Store>,
    top: usize,
) -> anyhow::Result<Entry> {
    let text = read_case(path)?;
    let options = DiagnoseOptions {
        top: 0,
        what_if: true,
        ..DiagnoseOptions::default()
    };
    let mut entry = Entry::compute(rules, &text, &path.display().to_string(), &options)?;
    entry.diagnosis = with_site_history(rules, &entry, site, top)?;
    Ok(entry)
}

/// The entry's diagnosis with the site-experience reasons (when a store is given), cut to `top`.
pub fn with_site_history(
    rules: &RuleBase,
    entry: &Entry,
    site: Option<&mut Store>,
    top: usize,
) -> anyhow::Result<Diagnosis> {
    let confirmed = match site {
        Some(store) => store.scan_confirmed()?,
        None => Vec::new(),
    };
    Ok(experience::apply(
        rules,
        &entry.symptoms(),
        entry.diagnosis.clone(),
        &confirmed,
        entry.line(),
        top,
    ))
}

fn add(store_args: &StoreArgs, args: &AddArgs) -> anyhow::Result<()> {
    let rules = load_rules(args.rules.as_ref())?;
    let mut store = store_args.open()?;
    let site = (!args.no_site_history).then_some(&mut store);
    let entry = compute_entry(&rules, &args.case, site, 0)?;
    let reference = entry
        .case
        .complaint
        .as_ref()
        .and_then(|c| c.reference.clone());
    let (id, version) = match args.update {
        Some(id) => {
            let version = store.add_version(
                id,
                |_previous| history::StoredVersion::from_entry(&entry, "edited"),
                None,
            )?;
            (id, version)
        }
        None => {
            if !args.new
                && let Some(reference) = &reference
                && let Some(existing) = store.find_reference(reference)?
            {
                bail!(
                    "complaint reference {reference} is already stored as number {existing}; use --update {existing} to record a new version of it, or --new to store it separately (nothing was written)"
                );
            }
            (store.add(&entry)?, 1)
        }
    };
    let matches = similar::search(&mut store, &entry, 3, Some(id))?;
    if args.format == Format::Json {
        let value = serde_json::json!({
            "id": id,
            "version": version,
            "store": store.place(),
            "causes": entry.diagnosis.causes,
            "similar": matches,
        });
        return write_stdout(&(serde_json::to_string_pretty(&value)? + "\n"));
    }
    let mut out = String::new();
    writeln!(
        out,
        "Stored complaint {id} (version {version}) in {}",
        store.place()
    )?;
    writeln!(out, "\nLikely causes, as recorded:")?;
    for (i, c) in entry.diagnosis.causes.iter().take(5).enumerate() {
        writeln!(out, "  {}. {} — belief {:.2}", i + 1, c.title, c.belief)?;
        for r in c
            .reasons
            .iter()
            .filter(|r| r.test == experience::REASON_TEST)
        {
            writeln!(out, "       {:+.2}  {}", r.weight, r.text)?;
        }
    }
    write_similar(&mut out, &rules, &matches)?;
    write_stdout(&out)
}

/// The "similar past complaints" block shared by `add`, `similar` and `diagnose --history`.
pub fn write_similar(
    out: &mut String,
    rules: &RuleBase,
    matches: &[similar::Match],
) -> anyhow::Result<()> {
    writeln!(out, "\nSimilar past complaints:")?;
    if matches.is_empty() {
        writeln!(out, "  none stored yet")?;
    }
    for m in matches {
        let (id, distance, m) = (m.id, m.distance, &m.facts);
        let when = m.received.clone().unwrap_or_else(|| "no date".into());
        let cause = if m.confirmed.is_empty() {
            format!("not confirmed ({})", m.status.replace('_', " "))
        } else {
            let titles: Vec<String> = m
                .confirmed
                .iter()
                .map(|c| experience::cause_title(rules, c))
                .collect();
            format!("confirmed: {}", titles.join(", "))
        };
        let place = [m.line.as_deref(), m.grade.as_deref()]
            .iter()
            .flatten()
            .copied()
            .collect::<Vec<_>>()
            .join(", ");
        writeln!(
            out,
            "  {:>5}  distance {:.2}  {when}  {}{}",
            id,
            distance,
            m.title,
            if place.is_empty() {
                String::new()
            } else {
                format!(" [{place}]")
            }
        )?;
        writeln!(out, "         {} — {cause}", m.symptoms.join(", "))?;
    }
    Ok(())
}

fn check_date(flag: &str, value: &Option<String>) -> anyhow::Result<()> {
    if let Some(v) = value
        && !rolltriage::complaint::is_date(v)
    {
        bail!("{flag}: \"{v}\" is not a date; accepted: YYYY-MM-DD, e.g. 2026-12-02");
    }
    Ok(())
}

fn check_status(value: &str) -> anyhow::Result<()> {
    if !STATUSES.contains(&value) {
        bail!(
            "status \"{value}\" is not accepted; accepted: {}",
            STATUSES.join(", ")
        );
    }
    Ok(())
}

fn list(store_args: &StoreArgs, args: &ListArgs) -> anyhow::Result<()> {
    check_date("--from", &args.from)?;
    check_date("--to", &args.to)?;
    if let Some(s) = &args.status {
        check_status(s)?;
    }
    let mut store = store_args.open_existing()?;
    let filter = Filter {
        line: args.line.clone(),
        grade: args.grade.clone(),
        symptom: args.symptom.clone(),
        status: args.status.clone(),
        from: args.from.clone(),
        to: args.to.clone(),
    };
    let rows = store.list(&filter)?;
    if args.format == Format::Json {
        return write_stdout(&(serde_json::to_string_pretty(&rows)? + "\n"));
    }
    let mut out = String::new();
    writeln!(
        out,
        "{:>6}  {:<10}  {:<8}  {:<12}  {:<15}  {:<24}  title",
        "number", "received", "line", "grade", "status", "symptoms"
    )?;
    for r in &rows {
        let received = r
            .received
            .clone()
            .unwrap_or_else(|| r.recorded.chars().take(10).collect());
        writeln!(
            out,
            "{:>6}  {:<10}  {:<8}  {:<12}  {:<15}  {:<24}  {}",
            r.id,
            received,
            r.line.as_deref().unwrap_or("-"),
            r.grade.as_deref().unwrap_or("-"),
            r.status.replace('_', " "),
            r.symptoms.join(", "),
            r.title
        )?;
    }
    writeln!(out, "{} complaint(s)", rows.len())?;
    write_stdout(&out)
}

fn show(store_args: &StoreArgs, args: &ShowArgs) -> anyhow::Result<()> {
    let mut store = store_args.open_existing()?;
    let complaint = store.get(args.id)?;
    let version = match args.version {
        Some(n) => complaint
            .versions
            .iter()
            .find(|v| v.version == n)
            .with_context(|| {
                format!(
                    "complaint {} has no version {n}; it has versions 1 to {}",
                    args.id,
                    complaint.versions.len()
                )
            })?,
        None => complaint
            .latest()
            .with_context(|| format!("complaint {} has no version", args.id))?,
    };
    if args.case {
        return write_stdout(&version.case_text);
    }
    if args.format == Format::Json {
        return write_stdout(&(serde_json::to_string_pretty(&complaint)? + "\n"));
    }
    write_stdout(&render_show(&complaint, version)?)
}

fn render_show(
    complaint: &StoredComplaint,
    version: &history::StoredVersion,
) -> anyhow::Result<String> {
    let mut out = String::new();
    let r = &version.complaint;
    let title = version.resolved["title"].as_str().unwrap_or("");
    writeln!(out, "Complaint {} — {title}", complaint.id)?;
    writeln!(
        out,
        "version {} of {}, recorded {} ({}), rules {}\n",
        version.version,
        complaint.versions.len(),
        version.recorded_at,
        version.change,
        version.rules_version
    )?;
    for (label, value) in r.lines() {
        writeln!(out, "{label:<17} {value}")?;
    }
    writeln!(out, "\nLikely causes as ranked then")?;
    for (i, c) in version.ranked_causes().iter().take(5).enumerate() {
        writeln!(out, "  {}. {} — belief {:.2}", i + 1, c.title, c.belief)?;
    }
    if !complaint.status_changes.is_empty() {
        writeln!(out, "\nStatus changes")?;
        for s in &complaint.status_changes {
            writeln!(
                out,
                "  {}  {} → {}{}",
                s.changed_at,
                s.from_status.as_deref().unwrap_or("-").replace('_', " "),
                s.to_status.replace('_', " "),
                s.note
                    .as_deref()
                    .map(|n| format!(" ({n})"))
                    .unwrap_or_default()
            )?;
        }
    }
    writeln!(out, "\nVersions")?;
    for v in &complaint.versions {
        writeln!(out, "  {}  {}  {}", v.version, v.recorded_at, v.change)?;
    }
    Ok(out)
}

fn confirm(store_args: &StoreArgs, args: &ConfirmArgs) -> anyhow::Result<()> {
    let rules = load_rules(args.rules.as_ref())?;
    let causes: Vec<&str> = rules.causes.keys().map(String::as_str).collect();
    if !causes.contains(&args.cause.as_str()) {
        let hint = rolltriage::vocabulary::closest(&args.cause, causes.iter().copied())
            .map(|c| format!(" (did you mean `{c}`?)"))
            .unwrap_or_default();
        bail!(
            "--cause: `{}` is not a cause of the rule base{hint}; the causes are listed in rules/causes.yaml",
            args.cause
        );
    }
    if args.evidence.trim().is_empty() {
        bail!("--evidence: empty; say what confirmed the cause (a trial, a measurement)");
    }
    check_date("--on", &args.on)?;
    let mut store = store_args.open_existing()?;
    let cause = ConfirmedCause {
        cause: args.cause.clone(),
        evidence: Some(args.evidence.clone()),
        confirmed_on: Some(
            args.on
                .clone()
                .unwrap_or_else(rolltriage::report::today_utc),
        ),
        confirmed_by: args.by.clone(),
    };
    let version = store.add_version(
        args.id,
        |previous| {
            let mut next = next_version(previous, "confirmed");
            next.complaint.confirmed_causes.push(cause.clone());
            if next.complaint.status_or_open() != "closed" {
                next.complaint.status = Some("cause_confirmed".into());
            }
            Ok(next)
        },
        Some(&format!("confirmed {}", args.cause)),
    )?;
    let ranked = store.get(args.id)?;
    let rank = ranked
        .latest()
        .and_then(|v| experience::rank_of(&v.ranked_causes(), &args.cause));
    let mut out = format!(
        "Complaint {} version {version}: confirmed {}",
        args.id,
        experience::cause_title(&rules, &args.cause)
    );
    match rank {
        Some(n) => writeln!(out, " (the tool had ranked it {n})")?,
        None => writeln!(out, " (the tool had not ranked it)")?,
    }
    write_stdout(&out)
}

/// A copy of the latest version stamped as a new one made by `change` (now, this build); the
/// caller changes its complaint record.
fn next_version(previous: &history::StoredVersion, change: &str) -> history::StoredVersion {
    let mut next = previous.clone();
    next.recorded_at = history::now_utc();
    next.change = change.into();
    next.app_version = env!("CARGO_PKG_VERSION").into();
    next
}

fn status(store_args: &StoreArgs, args: &StatusArgs) -> anyhow::Result<()> {
    check_status(&args.status)?;
    let mut store = store_args.open_existing()?;
    let wanted = args.status.clone();
    let version = store.add_version(
        args.id,
        |previous| {
            let mut next = next_version(previous, "status");
            next.complaint.status = Some(wanted.clone());
            Ok(next)
        },
        args.note.as_deref(),
    )?;
    write_stdout(&format!(
        "Complaint {} version {version}: status {}\n",
        args.id,
        args.status.replace('_', " ")
    ))
}

fn similar_cmd(store_args: &StoreArgs, args: &SimilarArgs) -> anyhow::Result<()> {
    let rules = load_rules(args.rules.as_ref())?;
    let mut store = store_args.open_existing()?;
    let text = read_case(&args.case)?;
    let options = DiagnoseOptions {
        top: 0,
        what_if: false,
        ..DiagnoseOptions::default()
    };
    let entry = Entry::compute(&rules, &text, &args.case.display().to_string(), &options)?;
    let matches = similar::search(&mut store, &entry, args.top, None)?;
    if args.format == Format::Json {
        return write_stdout(&(serde_json::to_string_pretty(&matches)? + "\n"));
    }
    let mut out = format!("Past complaints most like {}\n", args.case.display());
    write_similar(&mut out, &rules, &matches)?;
    writeln!(
        out,
        "\nDistance 0 = alike, 1 = nothing in common (symptoms, where found, grade, material, indicators; docs/history.md)."
    )?;
    write_stdout(&out)
}

fn performance(store_args: &StoreArgs, args: &PerformanceArgs) -> anyhow::Result<()> {
    let mut store = store_args.open_existing()?;
    let p = experience::performance(&store.scan_confirmed()?);
    if args.format == Format::Json {
        return write_stdout(&(serde_json::to_string_pretty(&p)? + "\n"));
    }
    let share = |k: usize| {
        if p.confirmed == 0 {
            "-".to_string()
        } else {
            format!("{:.0} %", 100.0 * k as f64 / p.confirmed as f64)
        }
    };
    write_stdout(&format!(
        "Complaints with a confirmed cause: {}\nConfirmed cause ranked first: {} ({})\nConfirmed cause in the first three: {} ({})\n",
        p.confirmed,
        p.first,
        share(p.first),
        p.top_three,
        share(p.top_three)
    ))
}

fn export(store_args: &StoreArgs, args: &ExportArgs) -> anyhow::Result<()> {
    let mut store = store_args.open_existing()?;
    let mut complaints = Vec::new();
    for id in store.ids()? {
        complaints.push(store.get(id)?);
    }
    let text = match args.format {
        ExportFormat::Json => {
            serde_json::to_string_pretty(&transfer::export_file(complaints, args.anonymise))? + "\n"
        }
        ExportFormat::Csv => {
            if args.anonymise {
                transfer::anonymise_all(&mut complaints);
            }
            transfer::to_csv(&complaints)?
        }
    };
    if args.output.as_os_str() == "-" {
        write_stdout(&text)
    } else {
        rolltriage::fsutil::save_atomic(&args.output, text.as_bytes())
            .with_context(|| format!("saving the export to {}", args.output.display()))?;
        eprintln!("wrote the history export to {}", args.output.display());
        Ok(())
    }
}

fn import(store_args: &StoreArgs, args: &ImportArgs) -> anyhow::Result<()> {
    let rules = load_rules(args.rules.as_ref())?;
    let size = std::fs::metadata(&args.file)
        .with_context(|| format!("reading {}", args.file.display()))?
        .len();
    if size > transfer::MAX_IMPORT_BYTES {
        bail!(
            "{}: {size} bytes is more than the {} bytes an import may have",
            args.file.display(),
            transfer::MAX_IMPORT_BYTES
        );
    }
    let bytes =
        std::fs::read(&args.file).with_context(|| format!("reading {}", args.file.display()))?;
    let complaints = transfer::read_import(&bytes, &args.file.display().to_string(), &rules)?;
    let mut store = store_args.open()?;
    let ids = store.import(&complaints)?;
    let range = match (ids.first(), ids.last()) {
        (Some(a), Some(b)) => format!(" as numbers {a} to {b}"),
        _ => String::new(),
    };
    write_stdout(&format!(
        "Imported {} complaint(s){range} into {}\n",
        ids.len(),
        store.place()
    ))
}

/// `diagnose --history`: site experience in the ranking and the similar past complaints.
pub struct SiteView {
    store: StoreArgs,
    site_experience: bool,
    top: usize,
}

impl SiteView {
    pub fn new(place: &str, site_experience: bool, top: usize) -> SiteView {
        SiteView {
            store: StoreArgs {
                history: Some(place.to_string()),
                wait: history::DEFAULT_WAIT.as_secs_f64(),
            },
            site_experience,
            top,
        }
    }

    /// The diagnosis (ranked over all causes) with site experience applied and cut to `top`,
    /// and the "similar past complaints" text block.
    pub fn apply(
        &self,
        rules: &RuleBase,
        case: &rolltriage::case::Case,
        resolved: &rolltriage::case::ResolvedCase,
        diagnosis: Diagnosis,
    ) -> anyhow::Result<(Diagnosis, String)> {
        let mut store = self.store.open_existing()?;
        let mut entry = Entry {
            case_text: String::new(),
            case: case.clone(),
            resolved: resolved.clone(),
            diagnosis,
            rules_version: history::rules_version(rules),
        };
        let site = self.site_experience.then_some(&mut store);
        entry.diagnosis = with_site_history(rules, &entry, site, self.top)?;
        let matches = similar::search(&mut store, &entry, 3, None)?;
        let mut text = String::new();
        write_similar(&mut text, rules, &matches)?;
        Ok((entry.diagnosis, text))
    }
}
