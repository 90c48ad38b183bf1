//! Issue 14, item 8: stack-test CSV read exactly: extra cells beyond the header are an error,
//! CR-only line endings are read, and a size limit like the case files'.

use crate::support::{root, run};
use std::path::Path;
use std::process::Command;

use rolltriage::calibrate::{
    FitOptions, MAX_STACK_FILE_BYTES, StackReadOptions, fit_pfeiffer, parse_stack_csv,
    read_stack_file,
};

#[test]
fn decimal_comma_rows_are_refused_naming_the_line() {
    let path = root().join("tests/hardening/stack_csv/decimal_comma.csv");
    let text = read_stack_file(&path).unwrap();
    let error = parse_stack_csv(&text, "comma.csv", &StackReadOptions::default()).unwrap_err();
    let message = error.to_string();
    assert!(message.contains("comma.csv line 3"), "{message}");
    assert!(message.contains("4 cells"), "{message}");
    assert!(message.contains("decimal comma"), "{message}");
    let (code, err) = run(&["calibrate", "stack", path.to_str().unwrap()]);
    assert_eq!(code, Some(1), "{err}");
    assert!(err.contains("decimal_comma.csv"), "{err}");
}

#[test]
fn cr_only_line_endings_give_the_same_fit() {
    let path = root().join("cases/calibration/harbour_news_45.csv");
    let lf = read_stack_file(&path).unwrap();
    let cr = lf.replace('\n', "\r");
    let crlf = lf.replace('\n', "\r\n");
    let options = StackReadOptions::default();
    let reference = fit_pfeiffer(
        &parse_stack_csv(&lf, "lf", &options).unwrap(),
        &FitOptions::default(),
    )
    .unwrap();
    for (name, text) in [("cr", cr), ("crlf", crlf)] {
        let test = parse_stack_csv(&text, name, &options).unwrap();
        assert_eq!(
            test.metadata,
            parse_stack_csv(&lf, "lf", &options).unwrap().metadata
        );
        let fit = fit_pfeiffer(&test, &FitOptions::default()).unwrap();
        assert_eq!(fit.k1, reference.k1, "{name}");
        assert_eq!(fit.k2, reference.k2, "{name}");
        assert_eq!(fit.points.len(), reference.points.len(), "{name}");
    }
}

#[test]
fn files_over_the_limit_are_refused_unread() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("logger.csv");
    let mut text = String::from("strain,pressure [kPa]\n");
    let mut i = 1u64;
    while (text.len() as u64) <= MAX_STACK_FILE_BYTES {
        text.push_str(&format!("{:.7},{:.4}\n", i as f64 * 1e-7, i as f64 * 1e-3));
        i += 1;
    }
    std::fs::write(&path, &text).unwrap();
    let message = read_stack_file(&path).unwrap_err().to_string();
    assert!(message.contains("logger.csv"), "{message}");
    assert!(message.contains("1024 KiB"), "{message}");
    let message = parse_stack_csv(&text, "x.csv", &StackReadOptions::default())
        .unwrap_err()
        .to_string();
    assert!(message.contains("limit"), "{message}");
}

#[cfg(unix)]
#[test]
fn a_pipe_is_refused_instead_of_waited_on() {
    let dir = tempfile::tempdir().unwrap();
    let fifo = dir.path().join("data.csv");
    let made = Command::new("mkfifo").arg(&fifo).status();
    if !made.is_ok_and(|s| s.success()) {
        return;
    }
    let message = read_stack_file(Path::new(&fifo)).unwrap_err().to_string();
    assert!(message.contains("not a regular file"), "{message}");
}

#[test]
fn material_libraries_have_the_same_size_limit_and_refuse_pipes() {
    use rolltriage::calibrate::MaterialLibrary;
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("materials.yaml");
    crate::support::write_past_the_size_limit(
        &path,
        "format: rolltriage-materials 1\nmaterials: []\n",
    );
    let message = MaterialLibrary::load_or_new(&path).unwrap_err().to_string();
    assert!(message.contains("materials.yaml"), "{message}");
    assert!(message.contains("1 MiB"), "{message}");
    #[cfg(unix)]
    {
        let fifo = dir.path().join("pipe.yaml");
        if Command::new("mkfifo")
            .arg(&fifo)
            .status()
            .is_ok_and(|s| s.success())
        {
            let message = MaterialLibrary::load_or_new(&fifo).unwrap_err().to_string();
            assert!(message.contains("not a regular file"), "{message}");
        }
    }
}
