//! Full triage speed: load a demo case file, solve it with the crate's solver exactly as
//! `rolltriage diagnose` does (automatic resolution with its halving check), rank causes, merge
//! remedies and re-solve every setting-change remedy (what-if). Target: under 50 ms in release
//! for a demo case. Figures go into the README and docs/performance.md.

use criterion::{Criterion, criterion_group, criterion_main};
use rolltriage::case::Case;
use rolltriage::diagnose::{self, DiagnoseOptions, rules::RuleBase};

/// The demo cases timed: the telescoping demo, the two-symptom coated roll, the slowest paper
/// roll (newsprint bursts) and the largest roll (22,917 wraps of foil).
const CASES: [&str; 4] = [
    "harbour_newsprint_telescoping",
    "harbour_coated_starring_no_taper",
    "harbour_newsprint_bursts",
    "harbour_foil_core_slip",
];

fn triage(c: &mut Criterion) {
    let rules = RuleBase::embedded().expect("shipped rules");
    // As the CLI's defaults: the top five causes, what-if on.
    let options = DiagnoseOptions {
        top: 5,
        what_if: true,
        ..DiagnoseOptions::default()
    };
    for name in CASES {
        let path = std::path::PathBuf::from(format!("cases/{name}.yaml"));
        c.bench_function(&format!("triage_{name}"), |b| {
            b.iter(|| {
                let case = Case::load(&path)
                    .expect("demo case")
                    .resolve()
                    .expect("resolves");
                diagnose::triage(&rules, &case, &options).expect("triage")
            })
        });
    }
    let case = Case::load(std::path::Path::new(
        "cases/harbour_coated_starring_no_taper.yaml",
    ))
    .expect("demo case")
    .resolve()
    .expect("resolves");
    let profile = rolltriage::model::solve(&case.problem(Default::default())).expect("solve");
    let rank_only = DiagnoseOptions {
        what_if: false,
        ..options.clone()
    };
    c.bench_function("diagnose_rules_only", |b| {
        b.iter(|| diagnose::diagnose(&rules, &case, &profile, &rank_only).expect("diagnose"))
    });
    c.bench_function("rule_base_load_embedded", |b| {
        b.iter(|| RuleBase::embedded().expect("rules"))
    });
}

criterion_group! {
    name = benches;
    config = Criterion::default().sample_size(20);
    targets = triage
}
criterion_main!(benches);
