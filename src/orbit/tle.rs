//! Two-line element sets (TLE) in 2-line and 3-line form.
//!
//! Format: the fixed-column NORAD two-line format as documented with SGP4 in Hoots & Roehrich,
//! "Spacetrack Report No. 3" (1980), and Vallado et al., AIAA 2006-6753 (SGP4-VER.TLE).
//! Each data line has 69 columns; column 69 is a modulo-10 checksum: the sum of all digits in
//! columns 1-68, counting each minus sign as 1, modulo 10.
//!
//! Accepted input, line by line (blank lines and lines starting with `#` are ignored; SGP4-VER.TLE
//! uses `#` comment lines):
//! * an optional name line (3-line form; a leading `0 ` is removed), then
//! * line 1 (starts with `1 `) and line 2 (starts with `2 `), same catalog number.
//!
//! Lines longer than 69 columns are accepted when column 70 is blank: only the first 69
//! columns are read. This tolerates trailing text such as the start/stop/step columns that
//! SGP4-VER.TLE (Vallado et al. 2006) appends to line 2. Trailing whitespace and `\r` are ignored.
//! A blank ephemeris-type column (line 1, column 63; e.g. catalog 11801 of SGP4-VER.TLE) is
//! read as 0, as the published code does (its integer read of a blank field gives 0).
//! Field decoding (including Alpha-5 catalog numbers) is done by the `sgp4` crate.

use super::checks::{check_element_ranges, strip_bom};
use super::elements::ElementSet;

/// A malformed TLE file. `line` is the 1-based line number in the file.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum TleError {
    #[error("no element sets: the file is empty")]
    Empty,
    #[error("line {line}: contains non-ASCII characters")]
    NonAscii { line: usize },
    #[error("line {line}: the name line {reason}")]
    ControlCharacter { line: usize, reason: String },
    #[error("line {line}: {length} columns, a TLE data line needs 69")]
    Length { line: usize, length: usize },
    #[error("line {line}: column 70 must be blank when a line is longer than 69 columns, found '{found}'")]
    TrailingText { line: usize, found: char },
    #[error("line {line}: expected TLE line {expected}, found a line starting with '{found}'")]
    LineNumber {
        line: usize,
        expected: u8,
        found: String,
    },
    #[error("line {line}: TLE line 1 is not followed by line 2 (end of file)")]
    MissingLine2 { line: usize },
    #[error("line {line}: a name line with no TLE line 1 after it (end of file); an element file holds TLEs, CCSDS OMM KVN (with CCSDS_OMM_VERS) or OMM JSON (an object or a list)")]
    MissingLine1 { line: usize },
    #[error("line {line}: checksum (sum of digits, '-' = 1, mod 10) is {expected}, column 69 says '{found}'")]
    Checksum {
        line: usize,
        expected: u8,
        found: char,
    },
    #[error("line {line}: catalog number '{line2}' differs from '{line1}' on line 1")]
    CatalogMismatch {
        line: usize,
        line1: String,
        line2: String,
    },
    #[error("line {line}, columns {first_column}-{last_column}: {field} {value} is out of range ({allowed})")]
    OutOfRange {
        line: usize,
        first_column: usize,
        last_column: usize,
        /// Element name ("inclination", "epoch day").
        field: &'static str,
        /// The value with its unit ("197.45 deg").
        value: String,
        /// The accepted range ("0 to 180 deg").
        allowed: String,
    },
    #[error("line {line}, columns {first_column}-{last_column}: {reason}")]
    Field {
        line: usize,
        first_column: usize,
        last_column: usize,
        reason: String,
    },
}

/// Modulo-10 checksum of columns 1-68: digits count their value, '-' counts 1.
pub fn checksum(line: &str) -> u8 {
    let sum: u32 = line
        .bytes()
        .take(68)
        .map(|b| match b {
            b'0'..=b'9' => (b - b'0') as u32,
            b'-' => 1,
            _ => 0,
        })
        .sum();
    (sum % 10) as u8
}

/// Check one data line's length, trailing text and checksum; return its 69 columns.
fn data_columns(raw: &str, line: usize) -> Result<&str, TleError> {
    if !raw.is_ascii() {
        return Err(TleError::NonAscii { line });
    }
    if raw.len() < 69 {
        return Err(TleError::Length {
            line,
            length: raw.len(),
        });
    }
    if raw.len() > 69 {
        let c70 = raw.as_bytes()[69] as char;
        if !c70.is_ascii_whitespace() {
            return Err(TleError::TrailingText { line, found: c70 });
        }
    }
    let cols = &raw[..69];
    let expected = checksum(cols);
    let found = cols.as_bytes()[68] as char;
    if found.to_digit(10) != Some(expected as u32) {
        return Err(TleError::Checksum {
            line,
            expected,
            found,
        });
    }
    Ok(cols)
}

fn first_char(s: &str) -> String {
    s.chars().next().map(String::from).unwrap_or_default()
}

fn is_line1(s: &str) -> bool {
    s.starts_with("1 ")
}

fn is_line2(s: &str) -> bool {
    s.starts_with("2 ")
}

/// Parse TLE text (2-line and 3-line sets may be mixed). An empty file is an error. A UTF-8
/// byte-order mark at the start is skipped. Elements out of range (see
/// [`super::checks`]) are errors naming line and columns.
pub fn parse_tle(text: &str) -> Result<Vec<ElementSet>, TleError> {
    let lines: Vec<(usize, &str)> = strip_bom(text)
        .lines()
        .enumerate()
        .map(|(i, l)| (i + 1, l.trim_end()))
        .filter(|(_, l)| !l.is_empty() && !l.starts_with('#'))
        .collect();
    if lines.is_empty() {
        return Err(TleError::Empty);
    }
    let mut sets = Vec::new();
    let mut i = 0;
    while i < lines.len() {
        let (n, l) = lines[i];
        let mut name = None;
        let (n1, l1) = if is_line1(l) {
            (n, l)
        } else if is_line2(l) {
            return Err(TleError::LineNumber {
                line: n,
                expected: 1,
                found: first_char(l),
            });
        } else {
            // A name line; the 3-line form sometimes prefixes it with "0 ".
            let trimmed = l.trim();
            crate::infile::check_name(trimmed)
                .map_err(|reason| TleError::ControlCharacter { line: n, reason })?;
            name = Some(
                trimmed
                    .strip_prefix("0 ")
                    .unwrap_or(trimmed)
                    .trim()
                    .to_string(),
            );
            i += 1;
            match lines.get(i) {
                Some(&(n1, l1)) if is_line1(l1) => (n1, l1),
                Some(&(n1, l1)) => {
                    return Err(TleError::LineNumber {
                        line: n1,
                        expected: 1,
                        found: first_char(l1),
                    })
                }
                None => return Err(TleError::MissingLine1 { line: n }),
            }
        };
        i += 1;
        let (n2, l2) = match lines.get(i) {
            Some(&(n2, l2)) if is_line2(l2) => (n2, l2),
            Some(&(n2, l2)) => {
                return Err(TleError::LineNumber {
                    line: n2,
                    expected: 2,
                    found: first_char(l2),
                })
            }
            None => return Err(TleError::MissingLine2 { line: n1 }),
        };
        i += 1;
        sets.push(decode_set(name, (n1, l1), (n2, l2))?);
    }
    Ok(sets)
}

/// Check and decode one line pair (file line number and text of each).
fn decode_set(
    name: Option<String>,
    (n1, l1): (usize, &str),
    (n2, l2): (usize, &str),
) -> Result<ElementSet, TleError> {
    let c1 = data_columns(l1, n1)?;
    let c2 = data_columns(l2, n2)?;
    let id1 = c1[2..7].trim();
    let id2 = c2[2..7].trim();
    if id1 != id2 {
        return Err(TleError::CatalogMismatch {
            line: n2,
            line1: id1.to_string(),
            line2: id2.to_string(),
        });
    }
    // Blank ephemeris type (column 63) -> '0' (does not change the checksum).
    let mut b1 = [0u8; 69];
    b1.copy_from_slice(c1.as_bytes());
    if b1[62] == b' ' {
        b1[62] = b'0';
    }
    check_epoch(c1, n1)?;
    let elements =
        sgp4::Elements::from_tle(name, &b1, c2.as_bytes()).map_err(|e| field_error(&e, n1, n2))?;
    check_element_ranges(&elements).map_err(|v| {
        let (first_column, last_column) = v.field.tle_columns();
        TleError::OutOfRange {
            line: n2,
            first_column,
            last_column,
            field: v.field.label(),
            value: v.value_text(),
            allowed: v.field.allowed().to_string(),
        }
    })?;
    Ok(ElementSet::from_elements(elements))
}

/// Check the epoch of line 1: year in columns 19-20 (two digits; 57-99 = 19xx, 00-56 = 20xx, the
/// NORAD convention), day of year with fraction in columns 21-32, from 1 to below one more than
/// the days of that year (Spacetrack Report No. 3, 1980, element set format).
fn check_epoch(c1: &str, line: usize) -> Result<(), TleError> {
    let field = |first_column, last_column, reason: &str| TleError::Field {
        line,
        first_column,
        last_column,
        reason: reason.to_string(),
    };
    let yy = &c1[18..20];
    if !yy.bytes().all(|b| b.is_ascii_digit()) {
        return Err(field(19, 20, "expected a two-digit epoch year"));
    }
    let yy: i32 = yy.parse().unwrap_or(0);
    let year = if yy < 57 { 2000 + yy } else { 1900 + yy };
    let day_text = c1[20..32].trim();
    let day: f64 = day_text
        .parse()
        .ok()
        .filter(|d: &f64| {
            d.is_finite() && day_text.bytes().all(|b| b.is_ascii_digit() || b == b'.')
        })
        .ok_or_else(|| {
            field(
                21,
                32,
                "expected the epoch day of year (such as 335.50000000)",
            )
        })?;
    let leap = (year % 4 == 0 && year % 100 != 0) || year % 400 == 0;
    let days = if leap { 366.0 } else { 365.0 };
    if !(1.0..days + 1.0).contains(&day) {
        return Err(TleError::OutOfRange {
            line,
            first_column: 21,
            last_column: 32,
            field: "epoch day",
            value: format!("{day}"),
            allowed: format!("1 to below {} for {year}", days + 1.0),
        });
    }
    Ok(())
}

/// Map an `sgp4` crate field error to our line/column error. The crate's error keeps its
/// fields private; its Display text names the line ("on TLE line 1/2") and the 0-based
/// character range ("between characters A and B").
fn field_error(e: &sgp4::TleError, n1: usize, n2: usize) -> TleError {
    let text = e.to_string();
    let on_line_2 = text.contains("on TLE line 2");
    let line = if on_line_2 { n2 } else { n1 };
    let mut first_column = 1;
    let mut last_column = 69;
    if let Some(pos) = text.find("between characters ") {
        let rest = &text[pos + "between characters ".len()..];
        let mut parts = rest.split(" and ");
        if let (Some(a), Some(b)) = (parts.next(), parts.next()) {
            if let (Ok(a), Ok(b)) = (a.trim().parse::<usize>(), b.trim().parse::<usize>()) {
                first_column = a + 1;
                last_column = b;
            }
        }
    }
    let reason = text
        .strip_prefix("TLE parse error: ")
        .unwrap_or(&text)
        .split(" on TLE line")
        .next()
        .unwrap_or(&text)
        .to_string();
    let reason = match element_name(if on_line_2 { 2 } else { 1 }, first_column) {
        Some(name) => format!("{name}: {reason}"),
        None => reason,
    };
    TleError::Field {
        line,
        first_column,
        last_column,
        reason,
    }
}

/// The element a column of TLE line 1 or 2 belongs to (the element set format of Spacetrack
/// Report No. 3, 1980, columns 1-based).
fn element_name(line_number: u8, column: usize) -> Option<&'static str> {
    let fields: &[(usize, usize, &str)] = match line_number {
        1 => &[
            (3, 7, "catalog number"),
            (8, 8, "classification"),
            (10, 17, "international designator"),
            (19, 32, "epoch"),
            (34, 43, "first derivative of the mean motion"),
            (45, 52, "second derivative of the mean motion"),
            (54, 61, "drag term BSTAR"),
            (63, 63, "ephemeris type"),
            (65, 68, "element set number"),
        ],
        _ => &[
            (3, 7, "catalog number"),
            (9, 16, "inclination"),
            (18, 25, "right ascension of the ascending node"),
            (27, 33, "eccentricity"),
            (35, 42, "argument of perigee"),
            (44, 51, "mean anomaly"),
            (53, 63, "mean motion"),
            (64, 68, "revolution number"),
        ],
    };
    fields
        .iter()
        .find(|(a, b, _)| (*a..=*b).contains(&column))
        .map(|f| f.2)
}

/// Append the checksum to a data line given as its columns 1-68 (for writing test and example
/// files). Returns `None` if the text is not 68 ASCII columns.
pub fn with_checksum(columns_1_to_68: &str) -> Option<String> {
    if columns_1_to_68.len() != 68 || !columns_1_to_68.is_ascii() {
        return None;
    }
    Some(format!("{columns_1_to_68}{}", checksum(columns_1_to_68)))
}

#[cfg(test)]
mod tests {
    use super::*;

    // Line pair of catalog 00005 from SGP4-VER.TLE (Vallado et al. 2006; docs/REFERENCES.md §10).
    const L1: &str = "1 00005U 58002B   00179.78495062  .00000023  00000-0  28098-4 0  4753";
    const L2: &str = "2 00005  34.2682 348.7242 1859667 331.7664  19.3264 10.82419157413667     0.00      4320.0        360.00";

    #[test]
    fn checksum_of_published_lines() {
        assert_eq!(checksum(L1), 3);
        assert_eq!(checksum(L2), 7);
    }

    #[test]
    fn parses_two_line_form_with_trailing_columns() {
        let sets = parse_tle(&format!("{L1}\n{L2}\n")).unwrap();
        assert_eq!(sets.len(), 1);
        assert_eq!(sets[0].norad_id, 5);
        assert_eq!(sets[0].name, None);
        assert!((sets[0].elements.eccentricity - 0.1859667).abs() < 1e-12);
    }

    #[test]
    fn name_line_with_zero_prefix() {
        let sets = parse_tle(&format!("0 SAT A\n{L1}\r\n{L2}\n\n")).unwrap();
        assert_eq!(sets[0].name.as_deref(), Some("SAT A"));
    }

    // The shipped example set (examples/sat.tle), an invented satellite.
    const W1: &str = "1 99901U          26335.50000000  .00001200  00000-0  12000-3 0   127";
    const W2: &str = "2 99901  97.5950 215.3000 0011500  90.0000 270.0000 15.05472000  1231";

    /// Replace columns `first..=last` (1-based) of a data line and fix the checksum.
    fn patch(line: &str, first: usize, text: &str) -> String {
        let mut cols = line[..68].to_string();
        cols.replace_range(first - 1..first - 1 + text.len(), text);
        with_checksum(&cols).unwrap()
    }

    #[test]
    fn inclination_out_of_range_names_columns() {
        let l2 = patch(W2, 9, "197.4500");
        let err = parse_tle(&format!("{W1}\n{l2}\n")).unwrap_err();
        assert_eq!(
            err.to_string(),
            "line 2, columns 9-16: inclination 197.45 deg is out of range (0 to 180 deg)"
        );
    }

    #[test]
    fn other_elements_out_of_range() {
        for (first, text, columns) in [
            (18, "360.5000", (18, 25)),
            (35, "361.0000", (35, 42)),
            (44, "400.0000", (44, 51)),
            (53, "17.50000000", (53, 63)),
        ] {
            let l2 = patch(W2, first, text);
            match parse_tle(&format!("X\n{W1}\n{l2}\n")).unwrap_err() {
                TleError::OutOfRange {
                    line: 3,
                    first_column,
                    last_column,
                    ..
                } => assert_eq!((first_column, last_column), columns, "{text}"),
                other => panic!("{text}: {other:?}"),
            }
        }
    }

    #[test]
    fn zero_mean_motion_gives_line_and_columns() {
        let l2 = patch(W2, 53, " 0.00000000");
        let err = parse_tle(&format!("{W1}\n{l2}\n")).unwrap_err();
        let msg = err.to_string();
        assert!(
            msg.starts_with("line 2, columns 53-63: mean motion 0 rev/day"),
            "{msg}"
        );
    }

    #[test]
    fn bad_day_of_year_blames_day_columns() {
        for day in ["367.50000000", "000.50000000", "366.50000000"] {
            let l1 = patch(W1, 21, day);
            let err = parse_tle(&format!("{l1}\n{W2}\n")).unwrap_err();
            assert!(
                matches!(
                    err,
                    TleError::OutOfRange {
                        line: 1,
                        first_column: 21,
                        last_column: 32,
                        ..
                    }
                ),
                "{day}: {err:?}"
            );
        }
        // 2024 is a leap year: day 366.5 is valid.
        let l1 = patch(W1, 19, "24366.50000000");
        assert!(parse_tle(&format!("{l1}\n{W2}\n")).is_ok());
        let l1 = patch(W1, 21, "3x5.50000000");
        let err = parse_tle(&format!("{l1}\n{W2}\n")).unwrap_err();
        assert!(
            matches!(
                err,
                TleError::Field {
                    first_column: 21,
                    last_column: 32,
                    ..
                }
            ),
            "{err:?}"
        );
    }

    #[test]
    fn byte_order_mark_is_skipped() {
        let sets = parse_tle(&format!("\u{feff}{W1}\n{W2}\n")).unwrap();
        assert_eq!(sets[0].norad_id, 99901);
        let sets = parse_tle(&format!("\u{feff}WRENLET-1\n{W1}\n{W2}\n")).unwrap();
        assert_eq!(sets[0].name.as_deref(), Some("WRENLET-1"));
    }
}
