//! Issue 14, item 9: the taper search is bounded by a work budget, not only by the input
//! size. A roll too large for the least search is refused before any solve; a search that uses
//! its budget up ends with a message; the demo cases design well within the default budget.

use std::path::PathBuf;
use std::process::Command;

use rolltriage::case::Case;
use rolltriage::model::Resolution;
use rolltriage::taper_design::budget::{DEFAULT_WORK_BUDGET, solve_work};
use rolltriage::taper_design::{DesignOptions, TaperError, TaperLimits, design_with};

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

const HUGE: &str = "tests/hardening/large_rolls/roll_436k_wraps.yaml";

#[test]
fn solve_work_counts_a_pass_over_the_wraps_plus_the_node_work() {
    // 1,000 wraps per-layer: 1,000 + 1,000²; in 100 elements: 1,000 + 100².
    assert_eq!(solve_work(1000, Resolution::PerLayer), 1_001_000);
    assert_eq!(
        solve_work(1000, Resolution::Elements { count: 100 }),
        11_000
    );
    assert_eq!(solve_work(1000, Resolution::Grouped { layers: 10 }), 11_000);
    // Automatic: per-layer up to the model's per-layer limit, above it its first two grids.
    assert_eq!(solve_work(1000, Resolution::Auto), 1_001_000);
    assert_eq!(
        solve_work(100_000, Resolution::Auto),
        2 * 100_000 + 400 * 400 + 800 * 800
    );
}

#[test]
fn a_roll_too_large_for_the_budget_is_refused_before_any_solve() {
    let case = Case::load(&root().join(HUGE)).unwrap().resolve().unwrap();
    let error = design_with(&case, &TaperLimits::default(), &DesignOptions::default())
        .expect_err("436,000 wraps are over the budget");
    let TaperError::OverBudget {
        wraps,
        largest_wraps,
        ..
    } = error
    else {
        panic!("expected OverBudget, got {error:?}");
    };
    assert!(wraps > 400_000, "{wraps}");
    assert!((30_000..wraps).contains(&largest_wraps), "{largest_wraps}");
    let text = error.to_string();
    assert!(text.contains("wraps"), "{text}");
    assert!(text.contains("budget"), "{text}");
}

#[test]
fn the_taper_command_on_a_huge_roll_ends_at_once_with_a_message() {
    let out = Command::new(env!("CARGO_BIN_EXE_rolltriage"))
        .args(["taper", HUGE])
        .current_dir(root())
        .output()
        .unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(1), "{err}");
    assert!(err.contains("roll_436k_wraps.yaml"), "{err}");
    assert!(err.contains("wraps"), "{err}");
    assert!(err.contains("budget"), "{err}");
}

#[test]
fn a_search_that_uses_its_budget_up_ends_with_a_message() {
    let (case, limits, full) = coated_roll_full_design();
    assert!(
        full.work > 0 && full.work <= DEFAULT_WORK_BUDGET / 2,
        "{}",
        full.work
    );
    // A budget a little short of what this search needed: it starts, then stops with a message.
    let options = DesignOptions {
        work_budget: full.work - 1,
        ..DesignOptions::default()
    };
    match design_with(&case, &limits, &options) {
        Err(error @ TaperError::BudgetUsedUp { .. }) => {
            let text = error.to_string();
            assert!(text.contains("budget"), "{text}");
            assert!(text.contains("no design is given"), "{text}");
            // The count names every solve the budget paid for, not only the searched
            // schedules: the current schedule's check on the fine grid and the re-solves
            // that correct the search for its coarser grid, adding up to the total, which
            // cannot exceed the solves of the full design.
            let done = solve_counts(&text);
            assert_eq!(done[0], done[1] + done[2] + done[3], "{text}");
            assert!(done[0] < full.solves, "{text}");
            assert!(done[2] >= 1 && done[3] >= 1, "{text}");
        }
        other => panic!("expected BudgetUsedUp, got {other:?}"),
    }
    // With exactly what it needed it gives the same design.
    let options = DesignOptions {
        work_budget: full.work,
        ..DesignOptions::default()
    };
    assert_eq!(design_with(&case, &limits, &options).unwrap(), full);
}

/// The coated-paper starring demo, the default limits and its design with the default budget:
/// the run whose work the budget tests cut short.
fn coated_roll_full_design() -> (
    rolltriage::case::ResolvedCase,
    TaperLimits,
    rolltriage::taper_design::TaperDesign,
) {
    let case = Case::load(&root().join("cases/harbour_coated_starring_no_taper.yaml"))
        .unwrap()
        .resolve()
        .unwrap();
    let limits = TaperLimits::default();
    let full = design_with(&case, &limits, &DesignOptions::default()).unwrap();
    (case, limits, full)
}

/// The numbers of "(N solves: S searched schedules, C checks on the fine grid, R re-solves for
/// the grid corrections)" in a budget message: [N, S, C, R].
fn solve_counts(text: &str) -> [usize; 4] {
    let inside = text.split('(').nth(1).unwrap().split(')').next().unwrap();
    let numbers: Vec<usize> = inside
        .split(|c: char| !c.is_ascii_digit())
        .filter(|w| !w.is_empty())
        .map(|w| w.parse().unwrap())
        .collect();
    assert_eq!(numbers.len(), 4, "{text}");
    [numbers[0], numbers[1], numbers[2], numbers[3]]
}

#[test]
fn a_budget_used_up_early_counts_the_current_schedule_check_too() {
    let (case, limits, full) = coated_roll_full_design();
    // 60 % of the work: the search starts (the least search fits) and stops before it has
    // verified a candidate; the current schedule was checked on the fine grid first.
    let options = DesignOptions {
        work_budget: full.work * 6 / 10,
        ..DesignOptions::default()
    };
    let error = design_with(&case, &limits, &options).unwrap_err();
    let text = error.to_string();
    let [total, searched, checks, corrections] = solve_counts(&text);
    assert_eq!(checks, 1, "{text}");
    assert!(corrections <= 1, "{text}");
    assert_eq!(total, searched + checks + corrections, "{text}");
    // The budget as set, not rounded down to whole millions.
    let millions = options.work_budget as f64 / 1e6;
    assert!(
        text.contains(&format!(
            "budget of {} million",
            rolltriage::units::sig3(millions)
        )),
        "{text}"
    );
}

/// Prints the work of every demo case's design (run with `--ignored --nocapture`) to choose the
/// default budget from.
#[test]
#[ignore]
fn demo_case_work() {
    for entry in std::fs::read_dir(root().join("cases")).unwrap() {
        let path = entry.unwrap().path();
        if !rolltriage::fsutil::is_yaml(&path) || path.ends_with("EXPECTED.yaml") {
            continue;
        }
        let case = Case::load(&path).unwrap().resolve().unwrap();
        let design = design_with(&case, &TaperLimits::default(), &DesignOptions::default());
        let work = design.as_ref().map(|d| d.work).unwrap_or(0);
        println!("{} {work} {}", path.display(), design.is_ok());
    }
}
