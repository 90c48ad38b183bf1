//! Bad stack-test data give clear errors naming the file, line and column.

use rolltriage::calibrate::{
    CalibrateError, FitOptions, StackReadOptions, fit_pfeiffer, parse_stack_csv,
};

fn read(text: &str) -> Result<rolltriage::calibrate::StackTest, CalibrateError> {
    parse_stack_csv(text, "test.csv", &StackReadOptions::default())
}

fn fit(text: &str) -> Result<rolltriage::calibrate::PfeifferFit, CalibrateError> {
    fit_pfeiffer(&read(text)?, &FitOptions::default())
}

fn message(r: Result<impl std::fmt::Debug, CalibrateError>) -> String {
    r.expect_err("must fail").to_string()
}

#[test]
fn negative_strain_names_line_and_column() {
    let m = message(read("strain,pressure [kPa]\n0.01,1\n-0.02,2\n"));
    assert!(m.contains("test.csv line 3, column 1 (strain)"), "{m}");
    assert!(m.contains("negative strain"), "{m}");
}

#[test]
fn height_above_the_initial_height_is_a_negative_strain() {
    let m = message(read(
        "# initial_height: 10 mm\nheight [mm],pressure [kPa]\n9.9,1\n10.2,2\n",
    ));
    assert!(m.contains("line 4, column 1"), "{m}");
    assert!(m.contains("negative strain"), "{m}");
}

#[test]
fn non_monotone_strain_names_both_lines() {
    let m = message(fit(
        "strain,pressure [kPa]\n0.01,1\n0.03,3\n0.02,4\n0.04,5\n",
    ));
    assert!(m.contains("line 4 (after line 3)"), "{m}");
    assert!(m.contains("does not rise"), "{m}");
}

#[test]
fn nan_and_text_are_rejected() {
    let m = message(read("strain,pressure [kPa]\n0.01,1\n0.02,NaN\n"));
    assert!(m.contains("line 3, column 2 (pressure [kPa])"), "{m}");
    assert!(m.contains("not a finite number"), "{m}");
    let m = message(read("strain,pressure [kPa]\n0.01,abc\n"));
    assert!(m.contains("line 2, column 2"), "{m}");
    let m = message(read("strain,pressure [kPa]\n0.01,\n"));
    assert!(m.contains("is empty"), "{m}");
}

#[test]
fn one_point_is_too_few() {
    let m = message(fit("strain,pressure [kPa]\n0.01,1\n"));
    assert!(m.contains("1 loading point"), "{m}");
    assert!(m.contains("at least 3"), "{m}");
}

#[test]
fn a_header_without_units_is_rejected() {
    let m = message(read("strain,pressure\n0.01,1\n"));
    assert!(m.contains("column 2"), "{m}");
    assert!(m.contains("has no unit"), "{m}");
    assert!(m.contains("pressure [kPa]"), "{m}");
    let m = message(read("height,pressure [kPa]\n9,1\n"));
    assert!(m.contains("column 1"), "{m}");
    assert!(m.contains("height [mm]"), "{m}");
}

#[test]
fn missing_columns_and_unknown_units_are_named() {
    let m = message(read("time [s],pressure [kPa]\n1,1\n"));
    assert!(m.contains("no strain or height column"), "{m}");
    let m = message(read("strain,force [N]\n0.1,1\n"));
    assert!(m.contains("no pressure column"), "{m}");
    let m = message(read("strain [furlong],pressure [kPa]\n0.1,1\n"));
    assert!(m.contains("strain unit \"furlong\""), "{m}");
    let m = message(read("strain,pressure [bananas]\n0.1,1\n"));
    assert!(m.contains("bananas"), "{m}");
}

#[test]
fn percent_strain_without_the_percent_unit_is_caught() {
    let m = message(read("strain,pressure [kPa]\n5,1\n"));
    assert!(m.contains("strain [%]"), "{m}");
}

#[test]
fn negative_pressure_is_rejected() {
    let m = message(read("strain,pressure [kPa]\n0.01,-1\n"));
    assert!(m.contains("line 2, column 2"), "{m}");
}

#[test]
fn height_data_need_an_initial_height() {
    let m = message(read("height [mm],pressure [kPa]\n9.9,1\n9.8,2\n"));
    assert!(m.contains("initial_height"), "{m}");
    // A first row at zero pressure supplies it.
    let t = read("height [mm],pressure [kPa]\n10,0\n9.8,2\n").unwrap();
    assert!((t.points[1].strain - 0.02).abs() < 1e-12);
    assert!(t.notes.iter().any(|n| n.contains("line 2")));
}

#[test]
fn an_empty_file_is_an_error_not_a_panic() {
    assert!(read("").is_err());
    assert!(fit("strain,pressure [kPa]\n").is_err());
}
