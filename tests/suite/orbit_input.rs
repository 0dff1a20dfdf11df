//! Element input: TLE format errors (format per Vallado et al. 2006 / Spacetrack Report #3:
//! 69 columns, mod-10 checksum in column 69), CCSDS OMM (CCSDS 502.0-B-3 and B-2) JSON and KVN,
//! selection, and the three example files giving the same elements.

use passbudget::orbit::{
    detect_format, load_elements, omm::parse_omm_json, omm::parse_omm_kvn, parse_elements, select,
    tle::parse_tle, ElementFormat, OmmError, OrbitInputError, SelectError, TleError,
};
use std::path::Path;

const NAME: &str = "WRENLET-1";
const L1: &str = "1 99901U          26335.50000000  .00001200  00000-0  12000-3 0   127";
const L2: &str = "2 99901  97.5950 215.3000 0011500  90.0000 270.0000 15.05472000  1231";

#[test]
fn example_files_load_to_the_same_elements() {
    let tle = load_elements(Path::new("examples/sat.tle")).unwrap();
    let json = load_elements(Path::new("examples/sat-omm.json")).unwrap();
    let kvn = load_elements(Path::new("examples/sat-omm.kvn")).unwrap();
    for sets in [&json, &kvn] {
        assert_eq!(sets.len(), 1);
        let (a, b) = (&tle[0], &sets[0]);
        assert_eq!(a.name, b.name);
        assert_eq!(a.norad_id, b.norad_id);
        assert_eq!(a.epoch, b.epoch);
        let (x, y) = (&a.elements, &b.elements);
        for (p, q) in [
            (x.inclination, y.inclination),
            (x.right_ascension, y.right_ascension),
            (x.eccentricity, y.eccentricity),
            (x.argument_of_perigee, y.argument_of_perigee),
            (x.mean_anomaly, y.mean_anomaly),
            (x.mean_motion, y.mean_motion),
            (x.drag_term, y.drag_term),
            (x.mean_motion_dot, y.mean_motion_dot),
            (x.mean_motion_ddot, y.mean_motion_ddot),
        ] {
            assert!((p - q).abs() <= 1e-12 * p.abs().max(1.0), "{p} vs {q}");
        }
        assert_eq!(x.revolution_number, y.revolution_number);
        assert_eq!(x.element_set_number, y.element_set_number);
    }
    assert_eq!(tle[0].name.as_deref(), Some(NAME));
    assert_eq!(tle[0].epoch.to_rfc3339(), "2026-12-01T12:00:00+00:00");
}

#[test]
fn two_and_three_line_sets_mixed() {
    let text = format!("{NAME}\n{L1}\n{L2}\n{L1}\n{L2}\n");
    let sets = parse_tle(&text).unwrap();
    assert_eq!(sets.len(), 2);
    assert_eq!(sets[0].name.as_deref(), Some(NAME));
    assert_eq!(sets[1].name, None);
}

#[test]
fn checksum_error_names_line_and_digits() {
    let bad = format!("{}8", &L1[..68]);
    let err = parse_tle(&format!("{NAME}\n{bad}\n{L2}\n")).unwrap_err();
    assert_eq!(
        err,
        TleError::Checksum {
            line: 2,
            expected: 7,
            found: '8'
        }
    );
    assert!(err.to_string().starts_with("line 2: checksum"));
}

#[test]
fn truncated_line() {
    let err = parse_tle(&format!("{L1}\n{}\n", &L2[..60])).unwrap_err();
    assert_eq!(
        err,
        TleError::Length {
            line: 2,
            length: 60
        }
    );
}

#[test]
fn trailing_text_must_be_separated() {
    assert!(parse_tle(&format!("{L1}\n{L2}   extra columns\n")).is_ok());
    let err = parse_tle(&format!("{L1}\n{L2}x\n")).unwrap_err();
    assert_eq!(
        err,
        TleError::TrailingText {
            line: 2,
            found: 'x'
        }
    );
}

#[test]
fn wrong_line_numbers() {
    let err = parse_tle(&format!("{L2}\n{L1}\n")).unwrap_err();
    assert!(
        matches!(
            err,
            TleError::LineNumber {
                line: 1,
                expected: 1,
                ..
            }
        ),
        "{err:?}"
    );
    let err = parse_tle(&format!("{NAME}\n{L1}\n{L1}\n")).unwrap_err();
    assert!(
        matches!(
            err,
            TleError::LineNumber {
                line: 3,
                expected: 2,
                ..
            }
        ),
        "{err:?}"
    );
    let err = parse_tle(&format!("{NAME}\n{L1}\n")).unwrap_err();
    assert_eq!(err, TleError::MissingLine2 { line: 2 });
}

#[test]
fn catalog_numbers_must_match() {
    let other =
        passbudget::orbit::tle::with_checksum(&L2[..68].replacen("99901", "99902", 1)).unwrap();
    let err = parse_tle(&format!("{L1}\n{other}\n")).unwrap_err();
    assert!(
        matches!(err, TleError::CatalogMismatch { line: 2, .. }),
        "{err:?}"
    );
}

#[test]
fn bad_field_reports_columns() {
    // Inclination field made non-numeric; checksum recomputed so the field check is reached.
    let l2 = passbudget::orbit::tle::with_checksum(&L2[..68].replacen(" 97.5950", " 97.5x50", 1))
        .unwrap();
    let err = parse_tle(&format!("{L1}\n{l2}\n")).unwrap_err();
    assert!(
        matches!(
            err,
            TleError::Field {
                line: 2,
                first_column: 9,
                last_column: 16,
                ..
            }
        ),
        "{err:?}"
    );
    // The message names the element of those columns (Spacetrack Report No. 3, 1980, element
    // set format: inclination in columns 9-16 of line 2).
    assert!(
        err.to_string().contains("columns 9-16: inclination:"),
        "{err}"
    );
}

#[test]
fn empty_files() {
    assert_eq!(parse_tle("").unwrap_err(), TleError::Empty);
    assert_eq!(parse_tle("\n  \n").unwrap_err(), TleError::Empty);
    assert_eq!(parse_omm_json("[]").unwrap_err(), OmmError::Empty);
}

#[test]
fn load_error_names_file_and_line() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("bad.tle");
    std::fs::write(&path, format!("{NAME}\n{}8\n{L2}\n", &L1[..68])).unwrap();
    let err = load_elements(&path).unwrap_err();
    assert!(matches!(err, OrbitInputError::Tle { .. }));
    let msg = err.to_string();
    assert!(msg.contains("bad.tle") && msg.contains("line 2"), "{msg}");
    let missing = load_elements(&dir.path().join("none.tle")).unwrap_err();
    assert!(matches!(missing, OrbitInputError::Io { .. }));
}

#[test]
fn format_detection() {
    assert_eq!(detect_format("  [ {}"), ElementFormat::OmmJson);
    assert_eq!(detect_format("{\"A\":1}"), ElementFormat::OmmJson);
    assert_eq!(
        detect_format("CCSDS_OMM_VERS = 2.0\n"),
        ElementFormat::OmmKvn
    );
    assert_eq!(detect_format(L1), ElementFormat::Tle);
    assert_eq!(
        detect_format("\u{feff}  <?xml version=\"1.0\"?>"),
        ElementFormat::Xml
    );
}

/// Files that are not elements, or not in a form read, say what they are instead of what line
/// they lack: an XML file (OMM's XML form) was "expected TLE line 1, found a line starting with
/// '<'", a JSON number "found a line starting with 'end of file'". Basis: behaviour checks (the
/// three forms read are those of CCSDS 502.0-B-3 and Spacetrack Report No. 3).
#[test]
fn files_that_are_not_elements_say_so() {
    let e = parse_elements("<?xml version=\"1.0\"?>\n<ndm><omm/></ndm>\n").unwrap_err();
    assert!(e.to_string().contains("an XML file (OMM in XML?)"), "{e}");
    let e = parse_elements("42\n").unwrap_err().to_string();
    assert!(
        e.starts_with("line 1: a name line with no TLE line 1 after it (end of file)"),
        "{e}"
    );
}

/// A file saved with lone CR line endings (the old Mac convention) reads as its lines: the
/// shipped TLE and KVN files so converted give the same elements as the originals. The KVN file
/// read as one line said its first keyword was missing.
///
/// Basis: the shipped example files themselves (the same elements in every line-end form).
#[test]
fn lone_carriage_returns_end_lines() {
    for path in ["examples/sat.tle", "examples/sat-omm.kvn"] {
        let text = std::fs::read_to_string(path).unwrap();
        assert!(!text.contains('\r'));
        let mac = text.replace('\n', "\r");
        let dos = text.replace('\n', "\r\n");
        let want = parse_elements(&text).unwrap();
        assert_eq!(parse_elements(&mac).unwrap(), want, "{path}");
        assert_eq!(parse_elements(&dos).unwrap(), want, "{path}");
    }
}

/// The shipped example file at `path` with `from` replaced by `to`.
fn example_with(path: &str, from: &str, to: &str) -> String {
    let text = std::fs::read_to_string(path).unwrap();
    assert!(text.contains(from), "{path} lacks {from:?}");
    text.replace(from, to)
}

#[test]
fn omm_missing_field_is_named() {
    let json: String = std::fs::read_to_string("examples/sat-omm.json")
        .unwrap()
        .lines()
        .filter(|l| !l.contains("\"BSTAR\""))
        .map(|l| format!("{l}\n"))
        .collect();
    let err = parse_omm_json(&json).unwrap_err();
    assert_eq!(
        err,
        OmmError::MissingField {
            object: 0,
            field: "BSTAR",
            line: None
        }
    );
    let kvn: String = std::fs::read_to_string("examples/sat-omm.kvn")
        .unwrap()
        .lines()
        .filter(|l| !l.starts_with("EPOCH"))
        .map(|l| format!("{l}\n"))
        .collect();
    let err = parse_omm_kvn(&kvn).unwrap_err();
    assert!(
        matches!(
            err,
            OmmError::MissingField {
                field: "EPOCH",
                line: Some(1),
                ..
            }
        ),
        "{err:?}"
    );
    assert!(err.to_string().contains("EPOCH") && err.to_string().contains("line 1"));
}

#[test]
fn omm_bad_value_names_line() {
    let kvn = example_with(
        "examples/sat-omm.kvn",
        "ECCENTRICITY = 0.0011500",
        "ECCENTRICITY = 1.5",
    );
    let err = parse_omm_kvn(&kvn).unwrap_err();
    assert!(
        matches!(err, OmmError::InvalidValue { line: Some(15), .. }),
        "{err:?}"
    );
    let kvn = example_with("examples/sat-omm.kvn", "TEME", "GCRF");
    assert!(matches!(
        parse_omm_kvn(&kvn).unwrap_err(),
        OmmError::InvalidValue { .. }
    ));
    assert!(matches!(
        parse_omm_json("[1, 2]").unwrap_err(),
        OmmError::NotAnObject { object: 0 }
    ));
    assert!(matches!(
        parse_omm_json("[{").unwrap_err(),
        OmmError::Json { line: 1, .. }
    ));
}

#[test]
fn select_by_number_and_name() {
    let l1b =
        passbudget::orbit::tle::with_checksum(&L1[..68].replacen("99901", "99911", 1)).unwrap();
    let l2b =
        passbudget::orbit::tle::with_checksum(&L2[..68].replacen("99901", "99911", 1)).unwrap();
    let text = format!("{NAME}\n{L1}\n{L2}\nOTHER\n{l1b}\n{l2b}\nother\n{l1b}\n{l2b}\n");
    let sets = parse_elements(&text).unwrap();
    assert_eq!(
        select(&sets, Some("99901")).unwrap().name.as_deref(),
        Some(NAME)
    );
    assert_eq!(select(&sets, Some("wrenlet-1")).unwrap().norad_id, 99901);
    assert!(matches!(
        select(&sets, Some("99911")),
        Err(SelectError::Ambiguous { .. })
    ));
    assert!(matches!(
        select(&sets, Some("Other")),
        Err(SelectError::Ambiguous { .. })
    ));
    assert!(matches!(
        select(&sets, Some("nothing")),
        Err(SelectError::NoMatch { .. })
    ));
    assert_eq!(
        select(&sets, None).unwrap_err(),
        SelectError::NoneChosen { count: 3 }
    );
    assert_eq!(select(&sets[..1], None).unwrap().norad_id, 99901);
    assert_eq!(select(&[], None).unwrap_err(), SelectError::Empty);
}
