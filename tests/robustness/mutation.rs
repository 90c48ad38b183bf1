//! Seeded mutation harness (issue 14, "keep it fixed"): case files, rule files, material
//! libraries and stack-test CSVs are mutated (extreme numbers, deleted/duplicated/swapped
//! lines, aliases, junk, wrong units, truncation, decimal commas, CR line endings) and fed to
//! the library and to the real binary. Asserted for every mutant:
//!
//! - no panic, and no run beyond the time budget;
//! - a refusal names the file it refuses (exit 1 with the file in the message for the binary);
//! - a success prints parseable output with no NaN or infinity in it (exit 0).
//!
//! `cargo test --release` runs a bounded count (a few thousand mutants, well under two
//! minutes). For a long local campaign:
//! `ROLLTRIAGE_MUTANTS=200000 ROLLTRIAGE_SEED=7 cargo test --release --test mutation_harness -- --ignored`
//! A failing mutant is written to target/mutants/ with the seed and index that made it.

use crate::support::root;
use std::panic::AssertUnwindSafe;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::sync::mpsc;
use std::time::{Duration, Instant};

use rolltriage::calibrate::{
    FitOptions, MaterialLibrary, StackReadOptions, fit_pfeiffer, parse_stack_csv, read_stack_file,
};
use rolltriage::case::Case;
use rolltriage::diagnose::{DiagnoseOptions, rules::RuleBase, triage};

/// Wall-clock budget of one in-process mutant (solve and diagnosis included). Generous: the
/// machine running CI is shared; real hangs run forever.
const BUDGET: Duration = Duration::from_secs(20);

/// xorshift64*: small, seeded, the same on every platform.
struct Rng(u64);
impl Rng {
    fn next(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_f491_4f6c_dd1d)
    }
    fn below(&mut self, n: usize) -> usize {
        (self.next() % n.max(1) as u64) as usize
    }
    fn pick<'a, T>(&mut self, items: &'a [T]) -> &'a T {
        &items[self.below(items.len())]
    }
}

const EXTREME_NUMBERS: &[&str] = &[
    "0",
    "-0",
    "-1",
    "1e-300",
    "1e300",
    "1.7976931348623157e308",
    "5e-324",
    "1e999",
    "-1e999",
    ".nan",
    ".inf",
    "NaN",
    "inf",
    "99999999999999999999999",
    "0.0000001",
    "1e6",
    "0.5",
    "1",
    "2",
    "7",
    "100",
    "\"\"",
    "[]",
    "{}",
    "~",
];

const UNITS: &[&str] = &[
    "mm", "m", "um", "in", "mil", "kPa", "MPa", "GPa", "Pa", "psi", "pli", "N/m", "kN/m", "MN/m",
    "mN/m", "%", "fpm", "m/min", "°C", "K", "N", "", "lbf", "bogus",
];

const JUNK_LINES: &[&str] = &[
    "a: &a [1, 2, 3]",
    "b: *a",
    "<<: *a",
    "? complex",
    "- - -",
    "x: !!binary AAAA",
    "{",
    "]",
    "\t- tab",
    "title: [unclosed",
    "\u{feff}title: bom",
    "  id: nosuch_symptom",
    "&x y: *x",
    "law: pfeiffer",
    "kind: steps",
    "- {from_diameter: 300 mm, to_diameter: 200 mm, tension: 1 pli}",
    "0,05,1,5",
    "strain,pressure [kPa],extra",
    "# initial_height: -3 mm",
    "# layers: 0",
];

fn replace_number(text: &str, rng: &mut Rng) -> String {
    // Positions of number-like tokens.
    let bytes = text.as_bytes();
    let mut spans = Vec::new();
    let mut i = 0;
    while i < bytes.len() {
        if bytes[i].is_ascii_digit() {
            let start = i;
            while i < bytes.len()
                && (bytes[i].is_ascii_digit() || matches!(bytes[i], b'.' | b'e' | b'-' | b'+'))
            {
                i += 1;
            }
            spans.push((start, i));
        } else {
            i += 1;
        }
    }
    if spans.is_empty() {
        return text.to_string();
    }
    let (a, b) = *rng.pick(&spans);
    format!("{}{}{}", &text[..a], rng.pick(EXTREME_NUMBERS), &text[b..])
}

fn replace_unit(text: &str, rng: &mut Rng) -> String {
    let found: Vec<usize> = UNITS
        .iter()
        .filter(|u| !u.is_empty())
        .filter_map(|u| text.find(&format!(" {u}\n")).map(|p| p + 1))
        .collect();
    if found.is_empty() {
        return text.to_string();
    }
    let at = *rng.pick(&found);
    let end = text[at..].find('\n').map_or(text.len(), |e| at + e);
    format!("{}{}{}", &text[..at], rng.pick(UNITS), &text[end..])
}

fn mutate_once(text: &str, rng: &mut Rng) -> String {
    let mut lines: Vec<String> = text.lines().map(str::to_string).collect();
    let n = lines.len();
    match rng.below(13) {
        0..=2 => return replace_number(text, rng),
        3 => return replace_unit(text, rng),
        4 if n > 0 => {
            lines.remove(rng.below(n));
        }
        5 if n > 0 => {
            let i = rng.below(n);
            let line = lines[i].clone();
            lines.insert(i, line);
        }
        6 if n > 1 => {
            let (a, b) = (rng.below(n), rng.below(n));
            lines.swap(a, b);
        }
        7 => {
            // Truncate at a character boundary.
            let cut = rng.below(text.len() + 1);
            let cut = (0..=cut)
                .rev()
                .find(|&c| text.is_char_boundary(c))
                .unwrap_or(0);
            return text[..cut].to_string();
        }
        8 => {
            let at = rng.below(n + 1);
            lines.insert(at, rng.pick(JUNK_LINES).to_string());
        }
        9 if n > 0 => {
            let i = rng.below(n);
            if rng.below(2) == 0 {
                lines[i] = format!("  {}", lines[i]);
            } else {
                lines[i] = lines[i].trim_start().to_string();
            }
        }
        10 if !text.is_empty() => {
            let mut chars: Vec<char> = text.chars().collect();
            let i = rng.below(chars.len());
            chars[i] = *rng.pick(&[':', '-', '#', '&', '*', '"', '\'', '[', ' ', '\0', 'é', ',']);
            return chars.into_iter().collect();
        }
        11 if n > 0 => {
            // Decimal commas (CSV) or a comma anywhere.
            let i = rng.below(n);
            lines[i] = lines[i].replace('.', ",");
        }
        12 => return text.replace('\n', "\r"),
        _ => {}
    }
    let mut out = lines.join("\n");
    out.push('\n');
    out
}

fn mutate(text: &str, rng: &mut Rng) -> String {
    let mut out = text.to_string();
    for _ in 0..1 + rng.below(3) {
        out = mutate_once(&out, rng);
    }
    out
}

/// Run `work` in a thread with the time budget; panics and overruns become violations.
fn guarded(
    what: &str,
    work: impl FnOnce() -> Result<(), String> + Send + 'static,
) -> Result<(), String> {
    let (send, receive) = mpsc::channel();
    let started = Instant::now();
    std::thread::Builder::new()
        .name("mutant".into())
        .spawn(move || {
            let outcome = std::panic::catch_unwind(AssertUnwindSafe(work));
            let _ = send.send(outcome);
        })
        .unwrap();
    match receive.recv_timeout(BUDGET) {
        Ok(Ok(result)) => result,
        Ok(Err(panic)) => {
            let message = panic
                .downcast_ref::<String>()
                .cloned()
                .or_else(|| panic.downcast_ref::<&str>().map(|s| s.to_string()))
                .unwrap_or_default();
            Err(format!("{what}: panicked: {message}"))
        }
        Err(_) => Err(format!(
            "{what}: still running after {:?} (budget {BUDGET:?})",
            started.elapsed()
        )),
    }
}

fn names_file(message: &str, path: &str) -> Result<(), String> {
    if message.contains(path) {
        Ok(())
    } else {
        Err(format!("message does not name {path}: {message}"))
    }
}

fn check_case(path: PathBuf, rules: std::sync::Arc<RuleBase>) -> Result<(), String> {
    let p = path.display().to_string();
    let case = match Case::load(&path) {
        Ok(case) => case,
        Err(e) => return names_file(&e.to_string(), &p),
    };
    let resolved = match case.resolve_as(&p) {
        Ok(r) => r,
        Err(e) => return names_file(&e.to_string(), &p),
    };
    REACHED_SOLVE.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
    let options = DiagnoseOptions {
        what_if: false,
        ..DiagnoseOptions::default()
    };
    if resolved.symptoms.is_empty() {
        let problem = resolved.problem(options.solver);
        if let Ok(profile) = rolltriage::model::solve(&problem) {
            let _ = rolltriage::finite::ensure_finite("profile", &profile);
        }
        return Ok(());
    }
    if let Ok((profile, diagnosis)) = triage(&rules, &resolved, &options) {
        let _ = rolltriage::finite::ensure_finite("profile", &profile);
        let _ = rolltriage::finite::ensure_finite("diagnosis", &diagnosis);
        // Every renderer must cope with what the diagnosis holds.
        let _ = rolltriage::diagnose::render::render_text(&resolved.title, &diagnosis, false);
        let _ = serde_json::to_string(&diagnosis).map_err(|e| e.to_string())?;
    }
    Ok(())
}

fn check_csv(path: PathBuf) -> Result<(), String> {
    let p = path.display().to_string();
    let text = match read_stack_file(&path) {
        Ok(t) => t,
        Err(e) => return names_file(&e.to_string(), &p),
    };
    let test = match parse_stack_csv(&text, &p, &StackReadOptions::default()) {
        Ok(t) => t,
        Err(e) => return names_file(&e.to_string(), &p),
    };
    match fit_pfeiffer(&test, &FitOptions::default()) {
        Ok(fit) => {
            REACHED_FIT.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
            let _ = rolltriage::finite::ensure_finite("fit", &fit);
            Ok(())
        }
        Err(e) => names_file(&e.to_string(), &p),
    }
}

fn check_library(path: PathBuf) -> Result<(), String> {
    let p = path.display().to_string();
    match MaterialLibrary::load_or_new(&path) {
        Ok(library) => {
            // What loads must save and load again.
            let copy = path.with_extension("resaved.yaml");
            library
                .save(&copy)
                .map_err(|e| format!("cannot save: {e}"))?;
            MaterialLibrary::load_or_new(&copy)
                .map(|_| ())
                .map_err(|e| format!("saved library does not load: {e}"))
        }
        Err(e) => names_file(&e.to_string(), &p),
    }
}

fn check_rules(
    dir: PathBuf,
    file: String,
    case: std::sync::Arc<rolltriage::case::ResolvedCase>,
) -> Result<(), String> {
    match RuleBase::load_dir(&dir) {
        Ok(rules) => {
            let options = DiagnoseOptions {
                what_if: false,
                ..DiagnoseOptions::default()
            };
            if let Ok((_, diagnosis)) = triage(&rules, &case, &options) {
                let _ = rolltriage::diagnose::render::render_text(&case.title, &diagnosis, false);
            }
            Ok(())
        }
        Err(e) => {
            let m = e.to_string();
            if m.contains(&file) || m.contains(&dir.display().to_string()) {
                Ok(())
            } else {
                Err(format!("rule error does not name {file}: {m}"))
            }
        }
    }
}

fn seeds(folder: &str, ext: &str) -> Vec<(String, String)> {
    let mut out: Vec<(String, String)> = std::fs::read_dir(root().join(folder))
        .unwrap()
        .flatten()
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|e| e == ext))
        .filter_map(|p| {
            let text = std::fs::read_to_string(&p).ok()?;
            Some((p.file_name()?.to_string_lossy().into_owned(), text))
        })
        .collect();
    out.sort();
    out
}

/// Save a failing mutant for reproduction; returns the report line.
fn keep(kind: &str, seed: u64, index: usize, name: &str, text: &str, problem: &str) -> String {
    let dir = root().join("target/mutants");
    let _ = std::fs::create_dir_all(&dir);
    let file = dir.join(format!("{kind}-seed{seed}-{index}-{name}"));
    let _ = std::fs::write(&file, text);
    format!("{}: {problem}", file.display())
}

/// How far the mutants got (printed with --nocapture, to see the campaign is not all
/// rejected at the parser).
static REACHED_SOLVE: std::sync::atomic::AtomicUsize = std::sync::atomic::AtomicUsize::new(0);
static REACHED_FIT: std::sync::atomic::AtomicUsize = std::sync::atomic::AtomicUsize::new(0);

struct Counts {
    cases: usize,
    csvs: usize,
    libraries: usize,
    rules: usize,
    binary: usize,
}

fn campaign(seed: u64, counts: &Counts) -> Vec<String> {
    let mut rng = Rng(seed.wrapping_mul(0x9e37_79b9_7f4a_7c15) | 1);
    let mut failures = Vec::new();
    let work = tempfile::tempdir().unwrap();
    let rules = std::sync::Arc::new(RuleBase::embedded().unwrap());

    let case_seeds = [seeds("cases", "yaml"), seeds("tests/fixtures", "yaml")].concat();
    let case_seeds: Vec<_> = case_seeds
        .into_iter()
        .filter(|(n, _)| n != "EXPECTED.yaml")
        .collect();
    for index in 0..counts.cases {
        let (name, text) = rng.pick(&case_seeds).clone();
        let mutant = mutate(&text, &mut rng);
        let path = work.path().join(format!("case{index}.yaml"));
        std::fs::write(&path, &mutant).unwrap();
        let r = std::sync::Arc::clone(&rules);
        if let Err(problem) = guarded(&name, move || check_case(path, r)) {
            failures.push(keep("case", seed, index, &name, &mutant, &problem));
        }
    }

    let csv_seeds = [
        seeds("cases/calibration", "csv"),
        seeds("tests/hardening/stack_csv", "csv"),
    ]
    .concat();
    for index in 0..counts.csvs {
        let (name, text) = rng.pick(&csv_seeds).clone();
        let mutant = mutate(&text, &mut rng);
        let path = work.path().join(format!("stack{index}.csv"));
        std::fs::write(&path, &mutant).unwrap();
        if let Err(problem) = guarded(&name, move || check_csv(path)) {
            failures.push(keep("csv", seed, index, &name, &mutant, &problem));
        }
    }

    let library_seed =
        std::fs::read_to_string(root().join("cases/calibration/materials.yaml")).unwrap();
    for index in 0..counts.libraries {
        let mutant = mutate(&library_seed, &mut rng);
        let path = work.path().join(format!("library{index}.yaml"));
        std::fs::write(&path, &mutant).unwrap();
        if let Err(problem) = guarded("materials.yaml", move || check_library(path)) {
            failures.push(keep(
                "library",
                seed,
                index,
                "materials.yaml",
                &mutant,
                &problem,
            ));
        }
    }

    let rule_dir = work.path().join("rules");
    std::fs::create_dir_all(&rule_dir).unwrap();
    let rule_seeds = seeds("rules", "yaml");
    for (name, text) in &rule_seeds {
        std::fs::write(rule_dir.join(name), text).unwrap();
    }
    let demo =
        Case::load_resolved(&root().join("cases/harbour_newsprint_telescoping.yaml")).unwrap();
    let demo = std::sync::Arc::new(demo);
    for index in 0..counts.rules {
        let (name, text) = rng.pick(&rule_seeds).clone();
        let mutant = mutate(&text, &mut rng);
        std::fs::write(rule_dir.join(&name), &mutant).unwrap();
        let (dir, file, case) = (rule_dir.clone(), name.clone(), std::sync::Arc::clone(&demo));
        if let Err(problem) = guarded(&name, move || check_rules(dir, file, case)) {
            failures.push(keep("rules", seed, index, &name, &mutant, &problem));
        }
        std::fs::write(rule_dir.join(&name), &text).unwrap();
    }

    // The real binary: exit codes, messages, output.
    for index in 0..counts.binary {
        let (name, text, command) = match rng.below(3) {
            0 | 1 => {
                let (n, t) = rng.pick(&case_seeds).clone();
                let command = *rng.pick(&["stress-json", "diagnose-json", "stress-table", "check"]);
                (n, t, command)
            }
            _ => {
                let (n, t) = rng.pick(&csv_seeds).clone();
                (n, t, "calibrate")
            }
        };
        let mutant = mutate(&text, &mut rng);
        let ext = if command == "calibrate" {
            "csv"
        } else {
            "yaml"
        };
        let path = work.path().join(format!("bin{index}.{ext}"));
        std::fs::write(&path, &mutant).unwrap();
        if let Err(problem) = run_binary(command, &path) {
            failures.push(keep("bin", seed, index, &name, &mutant, &problem));
        }
    }
    eprintln!(
        "mutation campaign seed {seed}: {} case mutants reached the solver, {} CSV mutants were fitted",
        REACHED_SOLVE.load(std::sync::atomic::Ordering::Relaxed),
        REACHED_FIT.load(std::sync::atomic::Ordering::Relaxed)
    );
    failures
}

/// Run one command of the binary on `path` and check exit code, message and output.
fn run_binary(command: &str, path: &Path) -> Result<(), String> {
    let p = path.to_str().unwrap();
    let args: Vec<&str> = match command {
        "stress-json" => vec!["stress", p, "--format", "json"],
        "stress-table" => vec!["stress", p],
        "diagnose-json" => vec!["diagnose", p, "--format", "json", "--no-what-if"],
        "check" => vec!["case", "check", p],
        _ => vec!["calibrate", "stack", p, "--json"],
    };
    let mut child = Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .args(&args)
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .map_err(|e| e.to_string())?;
    // Read the pipes in threads so a large output cannot block the child.
    let mut out = child.stdout.take().unwrap();
    let mut err = child.stderr.take().unwrap();
    let out_reader = std::thread::spawn(move || {
        let mut s = Vec::new();
        let _ = std::io::Read::read_to_end(&mut out, &mut s);
        s
    });
    let err_reader = std::thread::spawn(move || {
        let mut s = Vec::new();
        let _ = std::io::Read::read_to_end(&mut err, &mut s);
        s
    });
    let started = Instant::now();
    let status = loop {
        if let Some(status) = child.try_wait().map_err(|e| e.to_string())? {
            break status;
        }
        if started.elapsed() > BUDGET {
            let _ = child.kill();
            let _ = child.wait();
            return Err(format!("{args:?}: still running after {BUDGET:?}"));
        }
        std::thread::sleep(Duration::from_millis(5));
    };
    let stdout = String::from_utf8_lossy(&out_reader.join().unwrap()).into_owned();
    let stderr = String::from_utf8_lossy(&err_reader.join().unwrap()).into_owned();
    if stderr.contains("panicked") || status.code() == Some(101) || status.code().is_none() {
        return Err(format!("{args:?}: crashed ({status}): {stderr}"));
    }
    match status.code() {
        Some(0) => {
            for bad in ["NaN", "inf ", "Infinity"] {
                if stdout.contains(bad) {
                    return Err(format!("{args:?}: exit 0 with {bad} in the output"));
                }
            }
            if command.ends_with("json") || command == "calibrate" {
                let value = serde_json::from_str::<serde_json::Value>(&stdout)
                    .map_err(|e| format!("{args:?}: exit 0 but the JSON does not parse: {e}"))?;
                // JSON writes NaN as null: the result fields that are always numbers must be.
                let numeric: &[&str] = match command {
                    "stress-json" => &[
                        "/profile/radius",
                        "/profile/pressure",
                        "/profile/tangential_stress",
                        "/profile/wound_in_tension",
                    ],
                    "calibrate" => &[
                        "/fit/k1",
                        "/fit/k2",
                        "/fit/k1_standard_error",
                        "/fit/k2_standard_error",
                        "/fit/r_squared",
                        "/fit/rms_residual",
                        "/fit/correlation",
                    ],
                    _ => &[],
                };
                for pointer in numeric {
                    let all_numbers = match value.pointer(pointer) {
                        Some(serde_json::Value::Array(items)) => {
                            items.iter().all(|v| v.is_number())
                        }
                        Some(v) => v.is_number(),
                        None => false,
                    };
                    if !all_numbers {
                        return Err(format!("{args:?}: exit 0 but {pointer} is not all numbers"));
                    }
                }
            }
            Ok(())
        }
        Some(1) => {
            if !stderr.starts_with("error: ") && !stderr.contains("\nerror: ") {
                return Err(format!(
                    "{args:?}: exit 1 without an error message: {stderr}"
                ));
            }
            if !stderr.contains(p) {
                return Err(format!(
                    "{args:?}: exit 1, message does not name the file: {stderr}"
                ));
            }
            Ok(())
        }
        other => Err(format!("{args:?}: unexpected exit {other:?}: {stderr}")),
    }
}

fn report(failures: &[String]) {
    assert!(
        failures.is_empty(),
        "{} mutant(s) broke an invariant (kept in target/mutants/):\n{}",
        failures.len(),
        failures
            .iter()
            .take(30)
            .cloned()
            .collect::<Vec<_>>()
            .join("\n")
    );
}

/// The bounded campaign CI runs (part of `cargo test --release`).
#[test]
fn bounded_mutation_campaign() {
    let failures = campaign(
        20261202,
        &Counts {
            cases: 1500,
            csvs: 1200,
            libraries: 400,
            rules: 300,
            binary: 150,
        },
    );
    report(&failures);
}

/// Every kept regression file (tests/hardening/, tests/bad_inputs/) passes the same checks.
#[test]
fn regression_files_keep_the_invariants() {
    let mut failures = Vec::new();
    for folder in [
        "tests/bad_inputs",
        "tests/hardening/cases",
        "tests/hardening/large_rolls",
    ] {
        for (name, _) in seeds(folder, "yaml") {
            let path = root().join(folder).join(&name);
            for command in ["check", "stress-json"] {
                if let Err(problem) = run_binary(command, &path) {
                    failures.push(problem);
                }
            }
        }
    }
    for (name, _) in seeds("tests/hardening/stack_csv", "csv") {
        let path = root().join("tests/hardening/stack_csv").join(&name);
        if let Err(problem) = run_binary("calibrate", &path) {
            failures.push(problem);
        }
    }
    report(&failures);
}

/// The long local campaign: `ROLLTRIAGE_MUTANTS` mutants of each kind (binary runs a tenth),
/// seed `ROLLTRIAGE_SEED`.
#[test]
#[ignore = "long: run with --ignored, ROLLTRIAGE_MUTANTS and ROLLTRIAGE_SEED"]
fn long_mutation_campaign() {
    let count: usize = std::env::var("ROLLTRIAGE_MUTANTS")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(20_000);
    let seed: u64 = std::env::var("ROLLTRIAGE_SEED")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(1);
    let failures = campaign(
        seed,
        &Counts {
            cases: count,
            csvs: count,
            libraries: count / 4,
            rules: count / 4,
            binary: count / 10,
        },
    );
    report(&failures);
}
