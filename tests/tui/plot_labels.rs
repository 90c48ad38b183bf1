//! The UI plots keep their words readable: on every demo case, at the plot sizes of the results
//! screen at 80×24 and 120×40, no label cell (zone names, axis values, the crush-rating line's
//! name) lies on a curve cell or on another label's cell.

use std::collections::HashSet;

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use rolltriage::case::Case;
use rolltriage::model::{SolverOptions, solve};
use rolltriage::tui::screens::results::render_plots;
use rolltriage::tui::theme::Theme;
use rolltriage::units::UnitSystem;

/// The plot strip of the results screen in a `width`×`height` terminal (its layout: tab line,
/// three summary lines, then 9/20 of the rest).
fn plot_area(width: u16, height: u16) -> Rect {
    let body = height - 3;
    Rect::new(0, 0, width, (body.saturating_sub(2) * 9 / 20).max(7))
}

#[test]
fn plot_labels_stay_off_the_curves_and_each_other() {
    let mut cases: Vec<_> = std::fs::read_dir("cases")
        .unwrap()
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| {
            p.file_name()
                .is_some_and(|n| n.to_string_lossy().starts_with("harbour_"))
        })
        .collect();
    cases.sort();
    assert!(cases.len() >= 10, "demo cases: {cases:?}");
    let mut labels_seen = 0;
    for path in &cases {
        let resolved = Case::load(path).unwrap().resolve().unwrap();
        let profile = solve(&resolved.problem(SolverOptions::default())).unwrap();
        for (w, h) in [(80, 24), (120, 40)] {
            for units in [UnitSystem::Si, UnitSystem::Us] {
                let area = plot_area(w, h);
                let mut buf = Buffer::empty(area);
                let drawn = render_plots(
                    &profile,
                    None,
                    resolved.core.crush_pressure,
                    units,
                    Theme::monochrome(),
                    area,
                    &mut buf,
                );
                for plot in &drawn {
                    let curve: HashSet<_> = plot.curve.iter().copied().collect();
                    let mut taken = HashSet::new();
                    let all: Vec<Vec<(u16, u16)>> = plot.label_cells().collect();
                    for (i, (cells, label)) in all.iter().zip(&plot.labels).enumerate() {
                        labels_seen += 1;
                        // Words never run together ("outersurface"): the cell after a
                        // label belongs to no other label.
                        if let Some(&(x, y)) = cells.last() {
                            let touching = all
                                .iter()
                                .enumerate()
                                .any(|(j, other)| j != i && other.contains(&(x + 1, y)));
                            assert!(
                                !touching,
                                "{} at {w}x{h}: label {label:?} runs into the next",
                                path.display()
                            );
                        }
                        for &cell in cells {
                            assert!(
                                !curve.contains(&cell),
                                "{} at {w}x{h}: label {label:?} on the curve",
                                path.display()
                            );
                            assert!(
                                taken.insert(cell),
                                "{} at {w}x{h}: label {label:?} on another label",
                                path.display()
                            );
                        }
                    }
                }
            }
        }
    }
    assert!(labels_seen > cases.len() * 8, "{labels_seen} labels");
}
