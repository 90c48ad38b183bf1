//! Terminal-UI latency on the largest demo case (most wraps): drawing the results and what-if
//! screens, and handling a key press in the symptom search. The solve itself runs off the UI
//! thread and is benchmarked in `solver.rs`/`triage.rs`; here it is done once in setup.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use ratatui::Terminal;
use ratatui::backend::TestBackend;
use rolltriage::case::Case;
use rolltriage::diagnose::rules::RuleBase;
use rolltriage::tui::app::App;
use rolltriage::tui::event::Key;
use rolltriage::tui::job::{JobMessage, Purpose, run_pipeline};
use rolltriage::tui::screens::AppView;
use rolltriage::tui::theme::Theme;

/// The demo case with the most wraps (roll build over caliper).
fn largest_demo_case() -> (std::path::PathBuf, Case) {
    let mut best: Option<(f64, std::path::PathBuf, Case)> = None;
    for entry in std::fs::read_dir("cases").expect("cases/").flatten() {
        let path = entry.path();
        if path.extension().is_none_or(|e| e != "yaml") {
            continue;
        }
        let Ok(case) = Case::load(&path) else {
            continue;
        };
        let Ok(resolved) = case.resolve() else {
            continue;
        };
        let wraps = (resolved.roll.outer_diameter - resolved.core.outside_diameter)
            / 2.0
            / resolved.web.thickness;
        if best.as_ref().is_none_or(|(w, _, _)| wraps > *w) {
            best = Some((wraps, path, case));
        }
    }
    let (_, path, case) = best.expect("a demo case that resolves");
    (path, case)
}

fn bench(c: &mut Criterion) {
    let rules = std::sync::Arc::new(RuleBase::embedded().expect("shipped rules"));
    let (path, case) = largest_demo_case();
    let mut app = rolltriage::tui::build_app(&Default::default(), std::sync::Arc::clone(&rules))
        .expect("app");
    app.set_case(case.clone(), Some(path));
    let outcome = run_pipeline(&case, None, &rules, &mut |_| true).expect("demo case solves");
    eprintln!("largest demo case: {} nodes", outcome.profile.radius.len());
    for request in app.take_requests() {
        app.on_job(JobMessage::Finished {
            id: request.id,
            purpose: Purpose::Baseline,
            generation: request.generation,
            result: Ok(Box::new(outcome.clone())),
        });
    }
    let theme = Theme::monochrome();
    let draw = |app: &App, width, height| {
        let mut terminal = Terminal::new(TestBackend::new(width, height)).expect("terminal");
        terminal
            .draw(|frame| frame.render_widget(AppView { app, theme }, frame.area()))
            .expect("draw");
    };
    c.bench_function("draw results 120x40, largest demo case", |b| {
        b.iter(|| draw(black_box(&app), 120, 40))
    });
    c.bench_function("draw results 80x24, largest demo case", |b| {
        b.iter(|| draw(black_box(&app), 80, 24))
    });
    let mut search = app.clone();
    search.handle_key(Key::F(2));
    c.bench_function("type one letter into the symptom search and redraw", |b| {
        b.iter(|| {
            search.handle_key(Key::Char('s'));
            search.handle_key(Key::Backspace);
            draw(&search, 120, 40);
        })
    });
}

criterion_group!(benches, bench);
criterion_main!(benches);
