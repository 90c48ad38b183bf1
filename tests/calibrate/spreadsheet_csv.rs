//! Issue 19: semicolon-separated stack-test CSV from spreadsheet exports (decimal commas) reads
//! the same points and gives the same fit as the comma-separated file; a comma-separated file
//! with decimal commas is still refused (the hardening rule of tests/robustness/csv.rs).

use rolltriage::calibrate::{FitOptions, StackReadOptions, fit_pfeiffer, parse_stack_csv};

fn demo() -> String {
    std::fs::read_to_string(format!(
        "{}/cases/calibration/harbour_news_45.csv",
        env!("CARGO_MANIFEST_DIR")
    ))
    .unwrap()
}

/// The demo file as a spreadsheet in a decimal-comma locale exports it.
fn as_spreadsheet_export(text: &str) -> String {
    text.lines()
        .map(|line| {
            if line.starts_with('#') {
                line.to_string()
            } else {
                line.replace(',', ";").replace('.', ",")
            }
        })
        .collect::<Vec<_>>()
        .join("\r\n")
}

#[test]
fn semicolons_and_decimal_commas_read_like_the_comma_file() {
    let options = StackReadOptions::default();
    let plain = parse_stack_csv(&demo(), "news.csv", &options).unwrap();
    let export = as_spreadsheet_export(&demo());
    assert!(export.contains("0,02431;2,997"), "{export}");
    let read = parse_stack_csv(&export, "news.csv", &options).unwrap();
    assert_eq!(read.points, plain.points);
    assert!(
        read.notes.iter().any(|n| n.contains("semicolon")),
        "{:?}",
        read.notes
    );
    let a = fit_pfeiffer(&plain, &FitOptions::default()).unwrap();
    let b = fit_pfeiffer(&read, &FitOptions::default()).unwrap();
    assert_eq!(a.k1, b.k1);
    assert_eq!(a.k2, b.k2);
}

#[test]
fn semicolon_files_still_refuse_bad_cells_and_extra_cells() {
    let options = StackReadOptions::default();
    let text = "strain;pressure [kPa]\n0,01;1,5\n0,02;3,1;9\n";
    let error = parse_stack_csv(text, "x.csv", &options)
        .unwrap_err()
        .to_string();
    assert!(
        error.contains("x.csv line 3") && error.contains("3 cells"),
        "{error}"
    );
    let text = "strain;pressure [kPa]\n0,01;1.000,5\n";
    let error = parse_stack_csv(text, "x.csv", &options)
        .unwrap_err()
        .to_string();
    assert!(
        error.contains("line 2") && error.contains("1.000,5"),
        "{error}"
    );
    // A comma file with decimal commas: refused as before.
    let text = "strain,pressure [kPa]\n0,01,1,5\n";
    let error = parse_stack_csv(text, "x.csv", &options)
        .unwrap_err()
        .to_string();
    assert!(
        error.contains("decimal comma") && error.contains("semicolons"),
        "{error}"
    );
}
