//! The measured-against-computed plot: hardness readings over the computed pressure.

use std::path::Path;

use rolltriage::case::Case;
use rolltriage::diagnose::rules::RuleBase;
use rolltriage::evidence::hardness::normalise;
use rolltriage::model::{Resolution, SolverOptions};
use rolltriage::report::measured_plot::{self, LABEL_COMPUTED, LABEL_READINGS};
use rolltriage::report::{Format, PrepareOptions, ReportInput, prepare, render};

fn case_text(name: &str) -> String {
    std::fs::read_to_string(
        Path::new(env!("CARGO_MANIFEST_DIR"))
            .join("cases")
            .join(name),
    )
    .unwrap()
}

fn input(name: &str) -> ReportInput {
    input_from(name, &case_text(name))
}

fn input_from(name: &str, text: &str) -> ReportInput {
    let case = Case::from_yaml_str(text, name).unwrap();
    let rules = RuleBase::embedded().unwrap();
    let options = PrepareOptions {
        date: Some("2026-12-02".into()),
        source_file: Some(format!("cases/{name}")),
        solver: SolverOptions {
            resolution: Resolution::Grouped { layers: 40 },
            ..SolverOptions::default()
        },
        ..PrepareOptions::default()
    };
    prepare(&case, &rules, &options).unwrap()
}

/// The `cx` of every filled circle (the reading markers) with its `cy`.
fn circles(svg: &str) -> Vec<(f64, f64)> {
    let attr = |s: &str, name: &str| -> f64 {
        let start = s.find(&format!(" {name}=\"")).unwrap() + name.len() + 3;
        s[start..].split('"').next().unwrap().parse().unwrap()
    };
    svg.split("<circle")
        .skip(1)
        .map(|s| (attr(s, "cx"), attr(s, "cy")))
        .collect()
}

#[test]
fn hardness_plot_of_the_soft_measured_case() {
    let input = input("harbour_newsprint_soft_measured.yaml");
    let plot = measured_plot::hardness_svg(&input).unwrap().unwrap();
    insta::assert_snapshot!("hardness_svg", plot.svg);
    // The case has no tester calibration: the shape scale, said in the caption and on the axis.
    assert!(
        plot.caption
            .contains("softest reading is 0 and the hardest 1")
    );
    assert!(plot.svg.contains("Softest 0 … hardest 1"));
    assert!(plot.svg.contains("Roll diameter (mm)"));
    assert!(plot.svg.contains(LABEL_READINGS) && plot.svg.contains(LABEL_COMPUTED));

    // One marker per reading (the case has five, all inside the roll), ordered by diameter, and
    // their heights follow the 0 … 1 scaling: the reading with the highest value (rebound tester,
    // higher = harder) is drawn highest, the lowest lowest, the others in between in proportion.
    let marks = circles(&plot.svg);
    assert_eq!(marks.len(), 5);
    assert!(marks.windows(2).all(|w| w[0].0 < w[1].0));
    let values = [62.0, 58.0, 55.0, 51.0, 40.0];
    let expected = normalise(&values);
    let (top, bottom) = (marks[0].1, marks[4].1);
    for (mark, e) in marks.iter().zip(&expected) {
        // SVG y grows downwards; pixel rounding allows about 1 px.
        let drawn = (bottom - mark.1) / (bottom - top);
        assert!((drawn - e).abs() < 0.02, "{drawn} vs {e}");
    }

    let html = render(&input, Format::Html).unwrap();
    let parsed = scraper::Html::parse_document(&html);
    assert!(parsed.errors.is_empty(), "{:?}", parsed.errors);
    let figure = scraper::Selector::parse("#measured ~ figure#hardness-plot svg").unwrap();
    assert_eq!(parsed.select(&figure).count(), 1);
    assert!(html.contains("<figcaption>Hardness readings (points)"));
}

#[test]
fn a_case_without_measurements_has_no_hardness_plot() {
    let input = input("harbour_bopp_starring.yaml");
    assert!(measured_plot::hardness_svg(&input).unwrap().is_none());
    let html = render(&input, Format::Html).unwrap();
    assert!(!html.contains("hardness-plot"));
    assert!(!html.contains(LABEL_READINGS));
}

#[test]
fn calibrated_readings_share_the_pressure_axis() {
    // The soft case with a two-point tester calibration (made up for this test, linear: reading
    // 30 is 10 kPa, reading 70 is 210 kPa) covering every reading.
    let name = "harbour_newsprint_soft_measured.yaml";
    let last = "      - {diameter: 950 mm, value: 40}\n";
    let text = case_text(name);
    assert!(text.contains(last));
    let text = text.replace(
        last,
        &format!(
            "{last}    calibration:\n      - {{reading: 30, pressure: 10 kPa}}\n      \
             - {{reading: 70, pressure: 210 kPa}}\n"
        ),
    );
    let plot = measured_plot::hardness_svg(&input_from(name, &text))
        .unwrap()
        .unwrap();
    assert!(plot.caption.contains("through the tester calibration"));
    assert!(plot.svg.contains("Interlayer pressure (kPa)"));
    assert!(!plot.svg.contains("Softest 0"));
    // A linear calibration keeps the readings' proportions: heights as in the shape scale.
    let marks = circles(&plot.svg);
    assert_eq!(marks.len(), 5);
    let expected = normalise(&[62.0, 58.0, 55.0, 51.0, 40.0]);
    let (top, bottom) = (marks[0].1, marks[4].1);
    for (mark, e) in marks.iter().zip(&expected) {
        let drawn = (bottom - mark.1) / (bottom - top);
        assert!((drawn - e).abs() < 0.02, "{drawn} vs {e}");
    }
}

/// The Markdown report's text charts of the soft measured case: pressure, hoop stress and the
/// hardness readings (o) over the computed pressure (*), on the scale of the SVG plot; the
/// readings sit on the chart where the SVG has its circles (same series). A case without
/// measurements has no hardness chart.
#[test]
fn markdown_text_charts_of_the_soft_measured_case() {
    use rolltriage::report::text_chart;
    let input = input("harbour_newsprint_soft_measured.yaml");
    let charts = text_chart::charts(&input).unwrap();
    let hardness = charts
        .hardness
        .clone()
        .expect("the case has hardness readings");
    let plot = measured_plot::hardness_svg(&input).unwrap().unwrap();
    // One mark per reading (they fall in different columns), as the SVG has one circle each.
    let block = hardness.split("```text").nth(1).unwrap_or_default();
    assert_eq!(
        block.matches('o').count(),
        circles(&plot.svg).len(),
        "{hardness}"
    );
    insta::assert_snapshot!("markdown_pressure_chart", charts.pressure);
    insta::assert_snapshot!("markdown_hoop_chart", charts.hoop);
    insta::assert_snapshot!("markdown_hardness_chart", hardness);
    let markdown = render(&input, Format::Markdown).unwrap();
    assert!(markdown.contains(&charts.pressure));
    assert!(markdown.contains(&charts.hoop));
    assert!(markdown.contains(&hardness));
    let plain = text_chart::charts(&self::input("harbour_newsprint_telescoping.yaml")).unwrap();
    assert!(plain.hardness.is_none());
}
