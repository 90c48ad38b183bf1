//! Reading stack-compression test data: a CSV of pressure against strain, or against stack
//! height with the stack's initial height, units in the column headers.
//!
//! Accepted headers (case-insensitive, unit in `[...]` or `(...)`):
//! `strain` (a fraction), `strain [%]`, `height [mm]` (any length unit), `pressure [kPa]`
//! (any stress unit). Lines starting with `#` are comments; `# key: value` comments at the top
//! carry metadata: `initial_height`, `layers`, `sample`, `material`.
//!
//! Read exactly: a data row with more cells than the header is an error (a decimal-comma file
//! would otherwise be read as extra columns), line endings may be LF, CRLF or CR alone, and
//! files over [`MAX_STACK_FILE_BYTES`] are refused unread, like case files.
//!
//! Spreadsheet exports where the comma is the decimal separator use semicolons between cells:
//! a header row with a semicolon makes the file semicolon-separated, and its cells may then
//! use a decimal comma ("0,05"; one comma, no point). In a comma-separated file a decimal
//! comma stays an error, as above.

use std::collections::BTreeMap;
use std::io::Read;
use std::path::Path;

use crate::units::{QuantityKind, parse_quantity};

use super::CalibrateError;

/// One measured point, in SI.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct StackPoint {
    /// 1-based line number in the file, for messages.
    pub line: usize,
    /// Compressive strain of the stack (dimensionless, 0 at the initial height).
    pub strain: f64,
    /// Pressure on the stack, Pa.
    pub pressure: f64,
}

/// The test as read from the file.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct StackTest {
    /// Where it came from (file name).
    pub origin: String,
    /// Every point in test order.
    pub points: Vec<StackPoint>,
    /// Initial stack height (m), when the data were heights.
    pub initial_height: Option<f64>,
    /// Number of layers in the stack, when given.
    pub layers: Option<usize>,
    /// Free-text metadata from `# key: value` comments.
    pub metadata: BTreeMap<String, String>,
    /// Things worth telling the user about how the file was read.
    pub notes: Vec<String>,
}

impl StackTest {
    /// Caliper of one layer (m) from the initial height and the layer count.
    pub fn caliper(&self) -> Option<f64> {
        match (self.initial_height, self.layers) {
            (Some(h), Some(n)) if n > 0 => Some(h / n as f64),
            _ => None,
        }
    }
}

/// Options that may override the file's metadata.
#[derive(Debug, Clone, Default)]
pub struct StackReadOptions {
    /// Initial stack height (m), overrides `# initial_height:`.
    pub initial_height: Option<f64>,
    /// Layer count, overrides `# layers:`.
    pub layers: Option<usize>,
}

#[derive(Debug, Clone, Copy, PartialEq)]
enum Abscissa {
    /// Strain, multiplied by this factor to get a fraction (1 or 0.01).
    Strain(f64),
    /// Height, multiplied by this factor to get metres.
    Height(f64),
}

/// Split `pressure [kPa]` into (`pressure`, `Some("kPa")`).
fn split_header(header: &str) -> (String, Option<String>) {
    let h = header.trim();
    for (open, close) in [('[', ']'), ('(', ')')] {
        if let (Some(a), Some(b)) = (h.find(open), h.rfind(close))
            && b > a
        {
            let name = h[..a].trim().to_lowercase();
            let unit = h[a + 1..b].trim().to_string();
            return (name, Some(unit));
        }
    }
    (h.to_lowercase(), None)
}

/// SI factor of a unit by asking the units module for the value of "1 <unit>".
fn unit_factor(
    origin: &str,
    column: usize,
    header: &str,
    unit: &str,
    kind: QuantityKind,
) -> Result<f64, CalibrateError> {
    let field = format!("{origin} column {column} header \"{header}\"");
    let value = parse_quantity(&field, &format!("1 {unit}"), kind)?;
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        Err(CalibrateError::Header {
            origin: origin.to_string(),
            column,
            message: format!("unit \"{unit}\" in \"{header}\" is not a plain scale factor"),
        })
    }
}

fn parse_number(
    origin: &str,
    line: usize,
    column: usize,
    header: &str,
    text: &str,
    decimal_comma: bool,
) -> Result<f64, CalibrateError> {
    let t = text.trim();
    let with_point;
    let number = if decimal_comma && t.matches(',').count() == 1 && !t.contains('.') {
        with_point = t.replace(',', ".");
        with_point.as_str()
    } else {
        t
    };
    match number.parse::<f64>() {
        Ok(v) if v.is_finite() => Ok(v),
        _ => Err(CalibrateError::Value {
            origin: origin.to_string(),
            line,
            column,
            header: header.to_string(),
            message: if t.is_empty() {
                "is empty; every row needs a number in every column".to_string()
            } else {
                format!("\"{t}\" is not a finite number")
            },
        }),
    }
}

/// Read the metadata comments (`# key: value`) at the top of the file.
fn read_metadata(text: &str) -> BTreeMap<String, String> {
    let mut metadata = BTreeMap::new();
    for line in text.lines() {
        let l = line.trim();
        if l.is_empty() {
            continue;
        }
        let Some(rest) = l.strip_prefix('#') else {
            break;
        };
        if let Some((k, v)) = rest.split_once(':') {
            let key = k.trim().to_lowercase().replace([' ', '-'], "_");
            if !key.is_empty() {
                metadata.insert(key, v.trim().to_string());
            }
        }
    }
    metadata
}

/// Largest stack-test file read (1 MiB, as for case files): tens of thousands of rows, far
/// more than a stack test has.
pub const MAX_STACK_FILE_BYTES: u64 = 1024 * 1024;

fn too_large(origin: &str) -> CalibrateError {
    CalibrateError::Csv {
        origin: origin.to_string(),
        message: format!(
            "the file is larger than {} KiB, the limit for stack-test data; thin the rows out",
            MAX_STACK_FILE_BYTES / 1024
        ),
    }
}

/// Read a stack-test file: a regular file (a pipe or device is refused rather than waited
/// on) of at most [`MAX_STACK_FILE_BYTES`], in UTF-8.
pub fn read_stack_file(path: &Path) -> Result<String, CalibrateError> {
    let origin = path.display().to_string();
    let read_error = |source| CalibrateError::Read {
        path: path.to_path_buf(),
        error: source,
    };
    // Checked before opening: opening a pipe for reading waits for a writer.
    let meta = std::fs::metadata(path).map_err(read_error)?;
    if !meta.is_file() {
        return Err(CalibrateError::Csv {
            origin,
            message: "not a regular file (a folder, pipe or device)".into(),
        });
    }
    if meta.len() > MAX_STACK_FILE_BYTES {
        return Err(too_large(&origin));
    }
    let file = std::fs::File::open(path).map_err(read_error)?;
    let mut bytes = Vec::new();
    file.take(MAX_STACK_FILE_BYTES + 1)
        .read_to_end(&mut bytes)
        .map_err(read_error)?;
    if bytes.len() as u64 > MAX_STACK_FILE_BYTES {
        return Err(too_large(&origin));
    }
    String::from_utf8(bytes).map_err(|e| CalibrateError::Csv {
        origin,
        message: format!(
            "not UTF-8 text (byte {}); save the file as UTF-8 CSV",
            e.utf8_error().valid_up_to()
        ),
    })
}

/// The columns the fit reads, found from the header row.
struct Columns {
    /// Strain or height column (0-based) and how to read it.
    x_index: usize,
    x_kind: Abscissa,
    x_header: String,
    /// Pressure column (0-based) and its SI factor.
    p_index: usize,
    p_factor: f64,
    p_header: String,
}

/// One data row as read: line, strain or height in the file's unit, pressure in Pa.
type RawRow = (usize, f64, f64);

/// Parse a stack-compression CSV. `origin` names the file in messages.
pub fn parse_stack_csv(
    text: &str,
    origin: &str,
    options: &StackReadOptions,
) -> Result<StackTest, CalibrateError> {
    if text.len() as u64 > MAX_STACK_FILE_BYTES {
        return Err(too_large(origin));
    }
    // Old Mac files end lines with CR alone; the metadata and comment readers split on LF.
    let normalised;
    let text = if text.contains('\r') {
        normalised = text.replace("\r\n", "\n").replace('\r', "\n");
        normalised.as_str()
    } else {
        text
    };
    let metadata = read_metadata(text);
    let mut notes = Vec::new();
    let semicolons = header_uses_semicolons(text);
    if semicolons {
        notes.push(
            "read as semicolon-separated (a spreadsheet export); decimal commas read as decimal points"
                .to_string(),
        );
    }
    let mut reader = csv::ReaderBuilder::new()
        .delimiter(if semicolons { b';' } else { b',' })
        .comment(Some(b'#'))
        .trim(csv::Trim::All)
        .flexible(true)
        .from_reader(text.as_bytes());
    let headers = read_headers(&mut reader, origin)?;
    let columns = find_columns(&headers, origin, &mut notes)?;
    let (initial_height, layers) = height_and_layers(&metadata, options, origin)?;
    let rows = read_rows(&mut reader, headers.len(), &columns, origin, semicolons)?;
    let initial_height =
        settle_initial_height(columns.x_kind, initial_height, &rows, origin, &mut notes)?;
    let points = rows
        .into_iter()
        .map(|row| checked_point(row, &columns, initial_height, origin))
        .collect::<Result<Vec<_>, _>>()?;
    Ok(StackTest {
        origin: origin.to_string(),
        points,
        initial_height,
        layers,
        metadata,
        notes,
    })
}

/// The header row decides the separator (see the module docs): a semicolon in it makes the
/// file semicolon-separated.
fn header_uses_semicolons(text: &str) -> bool {
    text.lines()
        .map(str::trim)
        .find(|l| !l.is_empty() && !l.starts_with('#'))
        .is_some_and(|header| header.contains(';'))
}

/// The header row; an error when the file has none.
fn read_headers(
    reader: &mut csv::Reader<&[u8]>,
    origin: &str,
) -> Result<csv::StringRecord, CalibrateError> {
    let headers = reader
        .headers()
        .map_err(|e| CalibrateError::Csv {
            origin: origin.to_string(),
            message: e.to_string(),
        })?
        .clone();
    if headers.iter().all(|h| h.trim().is_empty()) {
        return Err(CalibrateError::Header {
            origin: origin.to_string(),
            column: 1,
            message: "the file has no header row; expected e.g. \"strain,pressure [kPa]\"".into(),
        });
    }
    Ok(headers)
}

/// Find the strain or height column and the pressure column with their units; other columns
/// are noted as not used. The last matching column of each kind wins.
fn find_columns(
    headers: &csv::StringRecord,
    origin: &str,
    notes: &mut Vec<String>,
) -> Result<Columns, CalibrateError> {
    let mut abscissa: Option<(usize, Abscissa)> = None;
    let mut pressure: Option<(usize, f64)> = None;
    for (index, header) in headers.iter().enumerate() {
        let column = index + 1;
        let (name, unit) = split_header(header);
        let unit_needed = |what: &str, example: &str| CalibrateError::Header {
            origin: origin.to_string(),
            column,
            message: format!(
                "header \"{header}\" has no unit; write the {what} unit in brackets, e.g. \"{example}\""
            ),
        };
        match name.as_str() {
            "strain" | "compressive strain" => {
                let factor = strain_factor(unit.as_deref(), origin, column)?;
                abscissa = Some((index, Abscissa::Strain(factor)));
            }
            "height" | "stack height" | "thickness" | "stack thickness" => {
                let unit = unit.ok_or_else(|| unit_needed("length", "height [mm]"))?;
                let f = unit_factor(origin, column, header, &unit, QuantityKind::Length)?;
                abscissa = Some((index, Abscissa::Height(f)));
            }
            "pressure" | "stress" | "compressive stress" => {
                let unit = unit.ok_or_else(|| unit_needed("pressure", "pressure [kPa]"))?;
                let f = unit_factor(origin, column, header, &unit, QuantityKind::Stress)?;
                pressure = Some((index, f));
            }
            _ => notes.push(format!("column {column} \"{header}\" is not used")),
        }
    }
    let Some((x_index, x_kind)) = abscissa else {
        return Err(CalibrateError::Header {
            origin: origin.to_string(),
            column: headers.len() + 1,
            message: "no strain or height column; expected a header such as \"strain\", \"strain [%]\" or \"height [mm]\"".into(),
        });
    };
    let Some((p_index, p_factor)) = pressure else {
        return Err(CalibrateError::Header {
            origin: origin.to_string(),
            column: headers.len() + 1,
            message: "no pressure column; expected a header such as \"pressure [kPa]\" or \"pressure [psi]\"".into(),
        });
    };
    Ok(Columns {
        x_index,
        x_kind,
        x_header: headers.get(x_index).unwrap_or("").to_string(),
        p_index,
        p_factor,
        p_header: headers.get(p_index).unwrap_or("").to_string(),
    })
}

/// Factor of a strain column's unit to a fraction: none, "-", "1" or "fraction" is 1, "%" is
/// 0.01.
fn strain_factor(unit: Option<&str>, origin: &str, column: usize) -> Result<f64, CalibrateError> {
    match unit {
        None | Some("") | Some("-") | Some("1") | Some("fraction") => Ok(1.0),
        Some("%") => Ok(0.01),
        Some(other) => Err(CalibrateError::Header {
            origin: origin.to_string(),
            column,
            message: format!(
                "strain unit \"{other}\" is not known; accepted: none or \"-\" (a fraction), \"%\""
            ),
        }),
    }
}

/// Initial height and layer count: the option, then the file's metadata comment.
fn height_and_layers(
    metadata: &BTreeMap<String, String>,
    options: &StackReadOptions,
    origin: &str,
) -> Result<(Option<f64>, Option<usize>), CalibrateError> {
    let mut initial_height = options.initial_height;
    if initial_height.is_none()
        && let Some(text) = metadata.get("initial_height")
    {
        let field = format!("{origin} comment \"initial_height\"");
        let value = parse_quantity(&field, text, QuantityKind::Length)?;
        initial_height = Some(value);
    }
    let mut layers = options.layers;
    if layers.is_none()
        && let Some(text) = metadata.get("layers")
    {
        layers = Some(
            text.trim()
                .parse::<usize>()
                .map_err(|_| CalibrateError::Metadata {
                    origin: origin.to_string(),
                    key: "layers".into(),
                    message: format!("\"{text}\" is not a whole number of layers"),
                })?,
        );
    }
    if let Some(n) = layers
        && n == 0
    {
        return Err(CalibrateError::Metadata {
            origin: origin.to_string(),
            key: "layers".into(),
            message: "the layer count must be at least 1".into(),
        });
    }
    Ok((initial_height, layers))
}

/// The data rows as numbers (blank rows skipped): a row with more cells than the header, or a
/// cell that is not a finite number, is an error naming its line and column.
fn read_rows(
    reader: &mut csv::Reader<&[u8]>,
    header_columns: usize,
    columns: &Columns,
    origin: &str,
    decimal_comma: bool,
) -> Result<Vec<RawRow>, CalibrateError> {
    let mut rows: Vec<RawRow> = Vec::new();
    for record in reader.records() {
        let record = record.map_err(|e| CalibrateError::Csv {
            origin: origin.to_string(),
            message: e.to_string(),
        })?;
        let line = record.position().map(|p| p.line() as usize).unwrap_or(0);
        if record.iter().all(|f| f.trim().is_empty()) {
            continue;
        }
        if record.len() > header_columns {
            return Err(CalibrateError::Value {
                origin: origin.to_string(),
                line,
                column: header_columns + 1,
                header: "beyond the header".to_string(),
                message: format!(
                    "the row has {} cells but the header names {} columns; if the numbers use a decimal comma (\"0,05\"), write them with a decimal point, quote them, or separate the cells with semicolons",
                    record.len(),
                    header_columns
                ),
            });
        }
        let field = |index: usize, header: &str| -> Result<f64, CalibrateError> {
            let text = record.get(index).unwrap_or("");
            parse_number(origin, line, index + 1, header, text, decimal_comma)
        };
        let x = field(columns.x_index, &columns.x_header)?;
        let p = field(columns.p_index, &columns.p_header)? * columns.p_factor;
        rows.push((line, x, p));
    }
    Ok(rows)
}

/// The initial height of height data: given, or taken from a first row at zero pressure; it
/// must be a positive length. Strain data keep whatever was given.
fn settle_initial_height(
    x_kind: Abscissa,
    given: Option<f64>,
    rows: &[RawRow],
    origin: &str,
    notes: &mut Vec<String>,
) -> Result<Option<f64>, CalibrateError> {
    let initial_height = match x_kind {
        Abscissa::Strain(_) => given,
        Abscissa::Height(f) => match given {
            Some(h) => Some(h),
            None => match rows.first() {
                Some(&(line, h, 0.0)) => {
                    notes.push(format!(
                        "initial height taken from line {line} (the first row, at zero pressure)"
                    ));
                    Some(h * f)
                }
                _ => {
                    return Err(CalibrateError::Metadata {
                        origin: origin.to_string(),
                        key: "initial_height".into(),
                        message: "height data need the stack's initial height: add a comment \"# initial_height: 25.0 mm\", pass --initial-height, or start with a row at zero pressure".into(),
                    });
                }
            },
        },
    };
    if let Some(h0) = initial_height
        && !(h0.is_finite() && h0 > 0.0)
    {
        return Err(CalibrateError::Metadata {
            origin: origin.to_string(),
            key: "initial_height".into(),
            message: format!("initial height {h0} m must be a positive length"),
        });
    }
    Ok(initial_height)
}

/// One row as a point: heights become strain against the initial height; strain must lie in
/// [0, 1) and pressure must not be negative.
fn checked_point(
    (line, x, p): RawRow,
    columns: &Columns,
    initial_height: Option<f64>,
    origin: &str,
) -> Result<StackPoint, CalibrateError> {
    let x_error = |message: String| CalibrateError::Value {
        origin: origin.to_string(),
        line,
        column: columns.x_index + 1,
        header: columns.x_header.clone(),
        message,
    };
    let strain = match columns.x_kind {
        Abscissa::Strain(f) => x * f,
        Abscissa::Height(f) => {
            let h = x * f;
            let h0 = initial_height.unwrap_or(h);
            if h <= 0.0 {
                return Err(x_error(format!("height {x} must be positive")));
            }
            (h0 - h) / h0
        }
    };
    if strain < 0.0 {
        return Err(x_error(match columns.x_kind {
            Abscissa::Height(_) => format!(
                "height {x} is above the initial height, which gives a negative strain ({strain:.4}); accepted: heights at or below the initial height"
            ),
            Abscissa::Strain(_) => {
                format!("negative strain {x}; accepted: 0 ≤ strain < 1 (compression positive)")
            }
        }));
    }
    if strain >= 1.0 {
        return Err(x_error(format!(
            "strain {strain} is not below 1; if the column is in percent write \"strain [%]\""
        )));
    }
    if p < 0.0 {
        return Err(CalibrateError::Value {
            origin: origin.to_string(),
            line,
            column: columns.p_index + 1,
            header: columns.p_header.clone(),
            message: "negative pressure; accepted: pressure ≥ 0 (compression positive)".into(),
        });
    }
    Ok(StackPoint {
        line,
        strain,
        pressure: p,
    })
}

/// The loading branch of a test and what was left out.
#[derive(Debug, Clone, PartialEq)]
pub struct LoadingBranch {
    pub points: Vec<StackPoint>,
    /// Points after the first unloading started (unloading and any reloading).
    pub dropped: usize,
    /// Line where unloading starts, if the data contain unloading.
    pub unloading_from_line: Option<usize>,
}

/// Keep the first loading branch: strain must rise from row to row; a row where strain and
/// pressure both fall starts the unloading, and everything from there on is left out.
/// A row where strain falls while pressure does not is an error (the data are not in test order).
pub fn loading_branch(test: &StackTest) -> Result<LoadingBranch, CalibrateError> {
    let pts = &test.points;
    let mut end = pts.len();
    for i in 1..pts.len() {
        let (a, b) = (pts[i - 1], pts[i]);
        if b.strain > a.strain {
            continue;
        }
        if b.pressure < a.pressure {
            end = i;
            break;
        }
        return Err(CalibrateError::NotMonotone {
            origin: test.origin.clone(),
            line: b.line,
            previous_line: a.line,
            message: format!(
                "strain {:.6} does not rise above {:.6} of line {} while pressure does not fall; sort the loading rows by strain (unloading rows must show falling pressure)",
                b.strain, a.strain, a.line
            ),
        });
    }
    Ok(LoadingBranch {
        points: pts[..end].to_vec(),
        dropped: pts.len() - end,
        unloading_from_line: pts.get(end).map(|p| p.line),
    })
}
