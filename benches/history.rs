//! Complaint history speed on a SQLite store on disk. Targets: `history similar` over 100,000
//! stored complaints under 200 ms (open the store, read every complaint's key values, rank by
//! distance), and adding one complaint under 50 ms including the solve (the full triage with
//! what-if, as `history add` runs it, then the insert). Figures go into the README and
//! docs/performance.md.
//!
//! The 100,000 complaints are the test fixture with its indicators spread by a fixed
//! pseudo-random factor, several symptoms, lines and grades; their stored versions carry the
//! indicators without their explanations to keep the file near 300 MB (the scan reads the
//! `complaints` table only, so the size of the versions does not change what is timed).
//!
//! The machine these run on is shared; on a busy one the wall-clock figures mostly measure the
//! wait for a core. `history_add_cpu/…` therefore also measure adding one complaint in the
//! process's processor time (every thread, Linux `CLOCK_PROCESS_CPUTIME_ID`), which counts
//! the work itself.

use std::time::Duration;

use criterion::measurement::{Measurement, ValueFormatter, WallTime};
use criterion::{Criterion, criterion_group, criterion_main};
use rolltriage::diagnose::{DiagnoseOptions, rules::RuleBase};
use rolltriage::history::{self, Entry, Location, StoredComplaint, StoredVersion, similar};

const FIXTURE: &str = "tests/history_fixtures/line4_film_telescoping.yaml";
const STORED: usize = 100_000;

fn entry(rules: &RuleBase, what_if: bool) -> Entry {
    let text = std::fs::read_to_string(FIXTURE).expect("fixture");
    let options = DiagnoseOptions {
        top: 0,
        what_if,
        ..DiagnoseOptions::default()
    };
    Entry::compute(rules, &text, FIXTURE, &options).expect("fixture diagnoses")
}

/// A fixed xorshift sequence: the same store on every run.
struct Sequence(u64);
impl Sequence {
    fn next(&mut self) -> f64 {
        self.0 ^= self.0 << 13;
        self.0 ^= self.0 >> 7;
        self.0 ^= self.0 << 17;
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
}

fn fill(store: &mut history::Store, base: &Entry) {
    const SYMPTOMS: [&str; 5] = [
        "telescoping",
        "starring",
        "crushed_core",
        "cinching",
        "wrinkles",
    ];
    let mut template = StoredVersion::from_entry(base, "added").expect("version");
    let mut indicators = base.diagnosis.indicators.clone();
    for i in &mut indicators {
        i.meaning.clear();
    }
    template.remedies = serde_json::json!({});
    let ids: Vec<serde_json::Value> = base
        .diagnosis
        .causes
        .iter()
        .map(|c| serde_json::json!({"id": c.id}))
        .collect();
    template.causes = serde_json::Value::Array(ids);
    let mut random = Sequence(0x9e37_79b9_7f4a_7c15);
    let mut batch = Vec::with_capacity(5_000);
    for n in 0..STORED {
        let mut v = template.clone();
        let spread: Vec<_> = indicators
            .iter()
            .map(|i| {
                let mut i = i.clone();
                i.value *= 0.3 + 1.4 * random.next();
                i
            })
            .collect();
        v.indicators = serde_json::to_value(&spread).expect("json");
        let s1 = SYMPTOMS[n % SYMPTOMS.len()];
        let s2 = SYMPTOMS[(n / 7) % SYMPTOMS.len()];
        v.resolved["symptoms"] = serde_json::json!([{"id": s1, "where": "body"}, {"id": s2}]);
        v.complaint.reference = Some(format!("B-{n}"));
        v.complaint.line = Some(format!("{}", 1 + n % 6));
        v.complaint.grade = Some(format!("grade {}", n % 40));
        if n % 3 == 0 {
            v.complaint
                .confirmed_causes
                .push(rolltriage::complaint::ConfirmedCause {
                    cause: "tension_too_low".into(),
                    ..Default::default()
                });
        }
        batch.push(StoredComplaint {
            id: 0,
            created_at: v.recorded_at.clone(),
            versions: vec![v],
            status_changes: Vec::new(),
        });
        if batch.len() == 5_000 {
            store.import(&batch).expect("import");
            batch.clear();
        }
    }
    store.import(&batch).expect("import");
}

fn history_speed(c: &mut Criterion) {
    let rules = RuleBase::embedded().expect("shipped rules");
    let dir = tempfile::tempdir().expect("temporary folder");
    let location = Location::File(dir.path().join("bench.sqlite"));
    let query = entry(&rules, false);
    {
        let mut store = history::open(&location, history::DEFAULT_WAIT).expect("store");
        fill(&mut store, &query);
        assert_eq!(store.count().expect("count"), STORED as i64);
    }
    c.bench_function("history_similar_100k", |b| {
        b.iter(|| {
            let mut store = history::open(&location, history::DEFAULT_WAIT).expect("store");
            similar::search(&mut store, &query, 5, None).expect("search")
        })
    });
    let mut store = history::open(&location, history::DEFAULT_WAIT).expect("store");
    c.bench_function("history_read_keys_100k", |b| {
        b.iter(|| store.similarity_keys().expect("keys").len())
    });
    let keys = store.similarity_keys().expect("keys");
    let query_key = similar::entry_key(&query);
    c.bench_function("history_rank_only_100k", |b| {
        b.iter(|| similar::nearest(&query_key, &keys, 5))
    });
    let small = Location::File(dir.path().join("add.sqlite"));
    let mut small_store = history::open(&small, history::DEFAULT_WAIT).expect("store");
    c.bench_function("history_add_one_with_solve", |b| {
        b.iter(|| {
            let e = entry(&rules, true);
            small_store.add(&e).expect("add")
        })
    });
    let ready = entry(&rules, true);
    c.bench_function("history_add_one_insert_only", |b| {
        b.iter(|| small_store.add(&ready).expect("add"))
    });
    c.bench_function("history_add_one_to_100k_with_solve", |b| {
        b.iter(|| {
            let e = entry(&rules, true);
            store.add(&e).expect("add")
        })
    });
}

/// Processor time used by the whole process (all threads) — what a task costs, not how long
/// it waited for a core on a loaded machine. Printed with the wall-clock formatter (ns).
struct ProcessCpuTime(WallTime);

fn process_cpu_time() -> Duration {
    let mut now = libc::timespec {
        tv_sec: 0,
        tv_nsec: 0,
    };
    // SAFETY: `now` is a valid, writable timespec; the clock ID is a constant the C library
    // defines, and clock_gettime writes nothing else.
    let status = unsafe { libc::clock_gettime(libc::CLOCK_PROCESS_CPUTIME_ID, &mut now) };
    assert_eq!(status, 0, "clock_gettime(CLOCK_PROCESS_CPUTIME_ID)");
    Duration::new(now.tv_sec as u64, now.tv_nsec as u32)
}

impl Measurement for ProcessCpuTime {
    type Intermediate = Duration;
    type Value = Duration;
    fn start(&self) -> Duration {
        process_cpu_time()
    }
    fn end(&self, start: Duration) -> Duration {
        process_cpu_time().saturating_sub(start)
    }
    fn add(&self, a: &Duration, b: &Duration) -> Duration {
        *a + *b
    }
    fn zero(&self) -> Duration {
        Duration::ZERO
    }
    fn to_f64(&self, value: &Duration) -> f64 {
        value.as_nanos() as f64
    }
    fn formatter(&self) -> &dyn ValueFormatter {
        self.0.formatter()
    }
}

/// Adding one complaint (full triage with what-if, then the insert) in processor time.
fn history_add_cpu(c: &mut Criterion<ProcessCpuTime>) {
    let rules = RuleBase::embedded().expect("shipped rules");
    let dir = tempfile::tempdir().expect("temporary folder");
    let location = Location::File(dir.path().join("add_cpu.sqlite"));
    let mut store = history::open(&location, history::DEFAULT_WAIT).expect("store");
    let mut group = c.benchmark_group("history_add_cpu");
    group.bench_function("with_solve", |b| {
        b.iter(|| {
            let e = entry(&rules, true);
            store.add(&e).expect("add")
        })
    });
    group.bench_function("triage_only", |b| b.iter(|| entry(&rules, true)));
    let ready = entry(&rules, true);
    group.bench_function("insert_only", |b| {
        b.iter(|| store.add(&ready).expect("add"))
    });
    group.finish();
}

criterion_group! {
    name = benches;
    config = Criterion::default().sample_size(10);
    targets = history_speed
}
criterion_group! {
    name = cpu_benches;
    config = Criterion::default()
        .with_measurement(ProcessCpuTime(WallTime))
        .sample_size(10);
    targets = history_add_cpu
}
criterion_main!(benches, cpu_benches);
