//! Full triage speed: solve a demo-size case, rank causes, merge remedies and re-solve every
//! setting-change remedy (what-if). Target: under 50 ms in release for a demo case.
//!
//! Uses the crate's solver; while it is not implemented the stand-alone Hakiel solve of the
//! tests stands in (tests/common).

use criterion::{Criterion, criterion_group, criterion_main};
use rolltriage::diagnose::{self, DiagnoseOptions, rules::RuleBase};

#[path = "../tests/common/mod.rs"]
mod common;

fn triage(c: &mut Criterion) {
    let rules = RuleBase::embedded().expect("shipped rules");
    let telescoping = common::harbour_telescoping_demo();
    let coated = common::harbour_coated_no_taper_demo();
    let options = DiagnoseOptions {
        top: 5,
        what_if: true,
        solve_with: Some(common::solve),
        ..DiagnoseOptions::default()
    };
    c.bench_function("triage_harbour_telescoping_with_what_if", |b| {
        b.iter(|| diagnose::triage(&rules, &telescoping, &options).expect("triage"))
    });
    c.bench_function("triage_harbour_coated_two_symptoms_with_what_if", |b| {
        b.iter(|| diagnose::triage(&rules, &coated, &options).expect("triage"))
    });
    let profile = common::profile(&coated);
    let rank_only = DiagnoseOptions {
        what_if: false,
        ..options.clone()
    };
    c.bench_function("diagnose_rules_only", |b| {
        b.iter(|| diagnose::diagnose(&rules, &coated, &profile, &rank_only).expect("diagnose"))
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
