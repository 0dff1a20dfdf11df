//! CCSDS Orbit Mean-Elements Message (OMM), CCSDS 502.0-B-3 (Orbit Data Messages, 2023), §4
//! (a 502.0-B-2 message, 2009, is read the same way: B-3 adds keywords; that it removes none
//! of the OMM's is from memory), in its two common encodings:
//!
//! * JSON: an object, or an array of objects, with the OMM keywords as keys (numbers may be
//!   JSON numbers or strings), as distributed by element-set providers.
//! * KVN: `KEY = value` lines (CCSDS 502.0-B-2 and B-3, the KVN section), `COMMENT` lines,
//!   blank lines; a value may be followed by its unit in square brackets
//!   (`MEAN_MOTION = 15.05 [rev/day]`), which must then be the keyword's unit in Table 4-3 of
//!   CCSDS 502.0-B-3 (checked for the keywords read here). A file may hold several messages,
//!   each starting with `CCSDS_OMM_VERS`.
//!
//! Only SGP4 mean elements are accepted (an SGP4-XP set, with `BTERM` and `AGOM`, is refused
//! by its `MEAN_ELEMENT_THEORY`): `MEAN_ELEMENT_THEORY`, `REF_FRAME`, `TIME_SYSTEM`,
//! `CENTER_NAME`, if present, must be `SGP4` (or `SGP/SGP4`), `TEME`, `UTC`, `EARTH`.
//! Required keywords: `NORAD_CAT_ID`, `EPOCH`,
//! `MEAN_MOTION`, `ECCENTRICITY`, `INCLINATION`, `RA_OF_ASC_NODE`, `ARG_OF_PERICENTER`,
//! `MEAN_ANOMALY`, `BSTAR`, `MEAN_MOTION_DOT`, `MEAN_MOTION_DDOT`. Optional: `OBJECT_NAME`,
//! `OBJECT_ID`, `CLASSIFICATION_TYPE` (default U), `ELEMENT_SET_NO`, `REV_AT_EPOCH`,
//! `EPHEMERIS_TYPE` (default 0). `EPOCH` is ISO 8601 UTC, calendar (`2026-12-01T12:00:00.000`)
//! or day-of-year (`2026-335T12:00:00`) form, optional trailing `Z`. A key outside the OMM
//! keyword set is ignored (and listed in [`ElementSet::ignored_keywords`]) unless it is a
//! misspelling of a keyword read here ([`check_unknown`]), which is an error.

use std::collections::HashMap;

use chrono::NaiveDateTime;

use super::checks::{check_element_ranges, strip_bom};
use super::elements::ElementSet;

/// A malformed OMM. `line` is the 1-based line number (KVN); `object` the 0-based index of the
/// message in the file (messages name it counted from 1: "message 1" is the first).
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum OmmError {
    #[error("no element sets: the file holds no OMM")]
    Empty,
    #[error("JSON error at line {line}, column {column}: {reason}")]
    Json {
        line: usize,
        column: usize,
        reason: String,
    },
    #[error("message {}: JSON value is not an object of OMM keywords", .object + 1)]
    NotAnObject { object: usize },
    #[error("message {}{}: required keyword {field} is missing", .object + 1, line_suffix(*.line))]
    MissingField {
        object: usize,
        field: &'static str,
        line: Option<usize>,
    },
    #[error("message {}{}: {field} = '{value}' is not valid: {reason}", .object + 1, position_suffix(*.line, *.column))]
    InvalidValue {
        object: usize,
        field: String,
        value: String,
        reason: String,
        line: Option<usize>,
        /// Column (1-based, in characters) of the value (KVN) or key (JSON).
        column: Option<usize>,
    },
    #[error("message {}{}: keyword {key} is given twice{}", .object + 1, position_suffix(*.line, *.column), first_suffix(*.first_line))]
    DuplicateKey {
        object: usize,
        key: String,
        line: Option<usize>,
        column: Option<usize>,
        first_line: Option<usize>,
    },
    #[error("message {}{}: key {key:?} {reason}", .object + 1, position_suffix(*.line, *.column))]
    BadKey {
        object: usize,
        key: String,
        reason: String,
        line: Option<usize>,
        column: Option<usize>,
    },
    #[error("message {}{}: unknown keyword {key}: not an OMM keyword of CCSDS 502.0-B-3, and close to {near}, which the message lacks (a misspelling?)", .object + 1, position_suffix(*.line, *.column))]
    UnknownKey {
        object: usize,
        key: String,
        line: Option<usize>,
        column: Option<usize>,
        /// The keyword read here that the message lacks and the unknown one is close to.
        near: &'static str,
    },
    #[error("line {line}: expected 'KEY = value', found '{text}'")]
    KvnSyntax { line: usize, text: String },
}

fn line_suffix(line: Option<usize>) -> String {
    match line {
        Some(l) => format!(" (line {l})"),
        None => String::new(),
    }
}

fn position_suffix(line: Option<usize>, column: Option<usize>) -> String {
    match (line, column) {
        (Some(l), Some(c)) => format!(" (line {l}, column {c})"),
        (Some(l), None) => format!(" (line {l})"),
        _ => String::new(),
    }
}

fn first_suffix(line: Option<usize>) -> String {
    match line {
        Some(l) => format!(" (first on line {l})"),
        None => String::new(),
    }
}

/// One keyword's value and where it is (1-based line and column, when known).
#[derive(Debug, Clone, Default)]
struct Entry {
    value: String,
    line: Option<usize>,
    column: Option<usize>,
    /// A required keyword given as JSON null: refused after the theory is checked.
    null: bool,
}

/// One message's keywords.
type Fields = HashMap<String, Entry>;

/// Parse OMM JSON (an object or an array of objects). A leading UTF-8 byte-order mark is
/// skipped. Keys are matched case-insensitively; a key given twice in one object, a misspelt
/// keyword ([`check_unknown`]) and `null` for a required keyword are errors; `null` for an
/// optional keyword counts as absent; other keys outside the OMM keyword set are ignored and
/// listed in [`ElementSet::ignored_keywords`].
pub fn parse_omm_json(text: &str) -> Result<Vec<ElementSet>, OmmError> {
    let doc: json::Doc = serde_json::from_str(strip_bom(text)).map_err(|e| {
        // serde_json's text ends in its own " at line L column C": the message gives it once.
        let full = e.to_string();
        let at = format!(" at line {} column {}", e.line(), e.column());
        OmmError::Json {
            line: e.line(),
            column: e.column(),
            reason: full.strip_suffix(&at).unwrap_or(&full).to_string(),
        }
    })?;
    let objects = match doc {
        json::Doc::Many(a) => a,
        json::Doc::One(o) => vec![o],
    };
    if objects.is_empty() {
        return Err(OmmError::Empty);
    }
    let positions = json::key_positions(strip_bom(text));
    let mut objects_seen = 0;
    objects
        .iter()
        .enumerate()
        .map(|(i, o)| {
            let json::Item::Object(entries) = o else {
                return Err(OmmError::NotAnObject { object: i });
            };
            let pos = positions
                .get(objects_seen)
                .filter(|p| p.len() == entries.len());
            objects_seen += 1;
            build(i, &json_fields(i, entries, pos)?, None)
        })
        .collect()
}

/// One JSON object's entries as [`Fields`], checking keys and `null`s. `positions`: line and
/// column of each key, in the order of `entries`, if known.
fn json_fields(
    object: usize,
    entries: &[(String, serde_json::Value)],
    positions: Option<&Vec<(usize, usize)>>,
) -> Result<Fields, OmmError> {
    let mut fields = Fields::new();
    for (i, (k, v)) in entries.iter().enumerate() {
        // Spaces around a key are not part of it (as in KVN).
        let key = k.trim().to_ascii_uppercase();
        let (line, column) = match positions.and_then(|p| p.get(i)) {
            Some(&(l, c)) => (Some(l), Some(c)),
            None => (None, None),
        };
        if let Some(first) = fields.get(&key) {
            return Err(OmmError::DuplicateKey {
                object,
                key,
                line,
                column,
                first_line: first.line,
            });
        }
        let null = v.is_null();
        let s = match v {
            serde_json::Value::String(s) => s.clone(),
            serde_json::Value::Number(n) => n.to_string(),
            serde_json::Value::Null if REQUIRED.contains(&key.as_str()) => "null".to_string(),
            serde_json::Value::Null => continue,
            other => other.to_string(),
        };
        fields.insert(
            key,
            Entry {
                value: s,
                line,
                column,
                null,
            },
        );
    }
    Ok(fields)
}

/// Parse OMM KVN text (one or more messages). A leading UTF-8 byte-order mark is skipped. A
/// keyword given twice in one message and a misspelt keyword ([`check_unknown`]) are errors
/// naming the line; other keywords outside the OMM set are ignored as in JSON.
pub fn parse_omm_kvn(text: &str) -> Result<Vec<ElementSet>, OmmError> {
    let mut messages: Vec<Fields> = Vec::new();
    for (i, raw) in strip_bom(text).lines().enumerate() {
        let line = i + 1;
        let l = raw.trim();
        if l.is_empty() || l.starts_with("COMMENT") {
            continue;
        }
        let syntax = || OmmError::KvnSyntax {
            line,
            text: l.to_string(),
        };
        let (key, value) = l.split_once('=').ok_or_else(syntax)?;
        let key = key.trim().to_ascii_uppercase();
        if key.is_empty() {
            return Err(syntax());
        }
        // Column of the value's first character (1-based, in characters).
        let leading = raw.chars().count() - raw.trim_start().chars().count();
        let column = Some(leading + l.chars().count() - value.trim_start().chars().count() + 1);
        if key == "CCSDS_OMM_VERS" || messages.is_empty() {
            messages.push(Fields::new());
        }
        let object = messages.len() - 1;
        let value = without_unit(&key, value).map_err(|reason| OmmError::InvalidValue {
            object,
            field: key.clone(),
            value: value.trim().to_string(),
            reason,
            line: Some(line),
            column,
        })?;
        if let Some(m) = messages.last_mut() {
            if let Some(first) = m.get(&key) {
                return Err(OmmError::DuplicateKey {
                    object,
                    key,
                    line: Some(line),
                    column,
                    first_line: first.line,
                });
            }
            let entry = Entry {
                value,
                line: Some(line),
                column,
                null: false,
            };
            m.insert(key, entry);
        }
    }
    if messages.is_empty() {
        return Err(OmmError::Empty);
    }
    messages
        .iter()
        .enumerate()
        .map(|(i, f)| build(i, f, f.values().filter_map(|e| e.line).min()))
        .collect()
}

/// The OMM keywords of CCSDS 502.0-B-3 (Orbit Data Messages, 2023), §4.2 tables 4-1 (header),
/// 4-2 (metadata) and 4-3 (data: mean Keplerian elements, spacecraft parameters, TLE-related
/// parameters, covariance): those of 502.0-B-2 (2009), from memory, and the four B-3 adds, from
/// memory: the header's CLASSIFICATION and MESSAGE_ID (Table 4-1) and an SGP4-XP set's BTERM and
/// AGOM (Table 4-3, "BSTAR or BTERM", "MEAN_MOTION_DDOT or AGOM"; confirmed, with CLASSIFICATION
/// as the B-3 header keyword, in a registry data-standards library's OMM class: pub.dev
/// `spacedatastandards`). User-defined keywords start with `USER_DEFINED_`.
const OMM_KEYWORDS: [&str; 59] = [
    // Header
    "CCSDS_OMM_VERS",
    "COMMENT",
    "CLASSIFICATION",
    "CREATION_DATE",
    "ORIGINATOR",
    "MESSAGE_ID",
    // Metadata
    "OBJECT_NAME",
    "OBJECT_ID",
    "CENTER_NAME",
    "REF_FRAME",
    "REF_FRAME_EPOCH",
    "TIME_SYSTEM",
    "MEAN_ELEMENT_THEORY",
    // Mean Keplerian elements
    "EPOCH",
    "SEMI_MAJOR_AXIS",
    "MEAN_MOTION",
    "ECCENTRICITY",
    "INCLINATION",
    "RA_OF_ASC_NODE",
    "ARG_OF_PERICENTER",
    "MEAN_ANOMALY",
    "GM",
    // Spacecraft parameters
    "MASS",
    "SOLAR_RAD_AREA",
    "SOLAR_RAD_COEFF",
    "DRAG_AREA",
    "DRAG_COEFF",
    // TLE-related parameters
    "EPHEMERIS_TYPE",
    "CLASSIFICATION_TYPE",
    "NORAD_CAT_ID",
    "ELEMENT_SET_NO",
    "REV_AT_EPOCH",
    "BSTAR",
    "BTERM",
    "MEAN_MOTION_DOT",
    "MEAN_MOTION_DDOT",
    "AGOM",
    // Covariance (lower triangle of the 6x6 position-velocity matrix)
    "COV_REF_FRAME",
    "CX_X",
    "CY_X",
    "CY_Y",
    "CZ_X",
    "CZ_Y",
    "CZ_Z",
    "CX_DOT_X",
    "CX_DOT_Y",
    "CX_DOT_Z",
    "CX_DOT_X_DOT",
    "CY_DOT_X",
    "CY_DOT_Y",
    "CY_DOT_Z",
    "CY_DOT_X_DOT",
    "CY_DOT_Y_DOT",
    "CZ_DOT_X",
    "CZ_DOT_Y",
    "CZ_DOT_Z",
    "CZ_DOT_X_DOT",
    "CZ_DOT_Y_DOT",
    "CZ_DOT_Z_DOT",
];

/// Whether `key` (upper case) is an OMM keyword of CCSDS 502.0-B-3 or a `USER_DEFINED_...` one.
pub fn is_omm_keyword(key: &str) -> bool {
    (key.starts_with("USER_DEFINED_") && key.len() > "USER_DEFINED_".len())
        || OMM_KEYWORDS.contains(&key)
}

const REQUIRED: [&str; 11] = [
    "NORAD_CAT_ID",
    "EPOCH",
    "MEAN_MOTION",
    "ECCENTRICITY",
    "INCLINATION",
    "RA_OF_ASC_NODE",
    "ARG_OF_PERICENTER",
    "MEAN_ANOMALY",
    "BSTAR",
    "MEAN_MOTION_DOT",
    "MEAN_MOTION_DDOT",
];

/// Build message `object` from its keywords; `message_line` (KVN: its first line) is given in
/// "missing keyword" errors.
fn build(object: usize, f: &Fields, message_line: Option<usize>) -> Result<ElementSet, OmmError> {
    let ignored_keywords = check_unknown(object, f)?;
    let invalid = |field: &str, reason: &str| {
        let e = f.get(field).cloned().unwrap_or_default();
        OmmError::InvalidValue {
            object,
            field: field.to_string(),
            value: e.value,
            reason: reason.to_string(),
            line: e.line,
            column: e.column,
        }
    };
    let text = |field: &str| f.get(field).map(|e| e.value.trim());
    let num = |field: &str| -> Result<f64, OmmError> {
        let v = text(field).unwrap_or("");
        v.parse::<f64>()
            .ok()
            .filter(|x| x.is_finite())
            .ok_or_else(|| invalid(field, "expected a number"))
    };
    let int_or = |field: &str, default: u64| -> Result<u64, OmmError> {
        match text(field) {
            None | Some("") => Ok(default),
            Some(v) => v
                .parse::<u64>()
                .map_err(|_| invalid(field, "expected a non-negative integer")),
        }
    };
    // An SGP4-XP set lacks BSTAR: its theory says why before the missing keyword does.
    check_theory(f, &invalid)?;
    check_missing(object, f, message_line)?;
    let norad_id = int_or("NORAD_CAT_ID", 0)?;
    let epoch_text = text("EPOCH").unwrap_or("");
    let datetime = parse_epoch(epoch_text).map_err(|why| invalid("EPOCH", why))?;
    let classification = match text("CLASSIFICATION_TYPE").unwrap_or("U") {
        "U" | "" => sgp4::Classification::Unclassified,
        "C" => sgp4::Classification::Classified,
        "S" => sgp4::Classification::Secret,
        _ => return Err(invalid("CLASSIFICATION_TYPE", "expected U, C or S")),
    };
    let name = text("OBJECT_NAME")
        .filter(|s| !s.is_empty())
        .map(str::to_string);
    if let Some(n) = name.as_deref() {
        crate::infile::check_name(n).map_err(|m| invalid("OBJECT_NAME", &m))?;
    }
    let elements = sgp4::Elements {
        object_name: name,
        international_designator: text("OBJECT_ID")
            .filter(|s| !s.is_empty())
            .map(str::to_string),
        norad_id,
        classification,
        datetime,
        mean_motion_dot: num("MEAN_MOTION_DOT")?,
        mean_motion_ddot: num("MEAN_MOTION_DDOT")?,
        drag_term: num("BSTAR")?,
        element_set_number: int_or("ELEMENT_SET_NO", 0)?,
        inclination: num("INCLINATION")?,
        right_ascension: num("RA_OF_ASC_NODE")?,
        eccentricity: num("ECCENTRICITY")?,
        argument_of_perigee: num("ARG_OF_PERICENTER")?,
        mean_anomaly: num("MEAN_ANOMALY")?,
        mean_motion: num("MEAN_MOTION")?,
        revolution_number: int_or("REV_AT_EPOCH", 0)?,
        ephemeris_type: int_or("EPHEMERIS_TYPE", 0)?.min(u8::MAX as u64) as u8,
    };
    check_element_ranges(&elements).map_err(|v| {
        invalid(
            v.field.omm_keyword(),
            &format!(
                "{} {} is out of range ({})",
                v.field.label(),
                v.value_text(),
                v.field.allowed()
            ),
        )
    })?;
    Ok(ElementSet {
        ignored_keywords,
        ..ElementSet::from_elements(elements)
    })
}

/// The first required keyword a message lacks.
fn first_missing(f: &Fields) -> Option<&'static str> {
    REQUIRED.iter().copied().find(|k| !f.contains_key(*k))
}

/// The keywords this reader takes a value from (beyond [`REQUIRED`]): a misspelling of one of
/// them would change what is read, silently for an optional one.
const READ_OPTIONAL: [&str; 11] = [
    "CCSDS_OMM_VERS",
    "MEAN_ELEMENT_THEORY",
    "REF_FRAME",
    "TIME_SYSTEM",
    "CENTER_NAME",
    "CLASSIFICATION_TYPE",
    "EPHEMERIS_TYPE",
    "OBJECT_NAME",
    "OBJECT_ID",
    "ELEMENT_SET_NO",
    "REV_AT_EPOCH",
];

/// Most edits (Levenshtein: letters inserted, removed or changed) that make a key outside the OMM
/// set a misspelling of a keyword read here ("B_STAR", "REV_AT_EPOC"); element-set providers'
/// own fields ("SEMIMAJOR_AXIS", "PERIOD", "OBJECT_TYPE", "GP_ID") are further from every one the
/// message lacks (common practice: providers add such fields to OMM JSON).
const MISSPELLING_EDITS: usize = 2;

/// The keyword this reader takes, missing from the message, that `key` is a misspelling of: the
/// nearest within [`MISSPELLING_EDITS`], counted in characters after spaces, hyphens and dots are
/// read as underscores ("CENTRE-NAME" is two edits from CENTER_NAME), or one the key cuts short
/// to at least half its length ("TIME_SYS").
fn misspelt(key: &str, f: &Fields) -> Option<&'static str> {
    let key: String = key
        .chars()
        .map(|c| if matches!(c, ' ' | '-' | '.') { '_' } else { c })
        .collect();
    let chars = key.chars().count();
    REQUIRED
        .iter()
        .chain(READ_OPTIONAL.iter())
        .filter(|k| !f.contains_key(**k))
        .filter_map(|k| {
            if k.starts_with(key.as_str()) && 2 * chars >= k.len() {
                return Some((k.len() - chars, *k));
            }
            // Keywords are ASCII: their length is their count of characters.
            (chars.abs_diff(k.len()) <= MISSPELLING_EDITS)
                .then(|| (strsim::levenshtein(&key, k), *k))
                .filter(|(d, _)| *d <= MISSPELLING_EDITS)
        })
        .min()
        .map(|(_, k)| k)
}

/// The keys of a message outside the OMM set, in the order of the file (by line (KVN) or
/// name (JSON)), to be ignored. A key within [`MISSPELLING_EDITS`] of a keyword this reader
/// takes and the message lacks is taken for a misspelling of it: an error naming both. So is an
/// empty key, or one holding a character a name may not hold ([`crate::infile::check_name`]:
/// it would reach the terminal and the outputs' notes).
fn check_unknown(object: usize, f: &Fields) -> Result<Vec<String>, OmmError> {
    let mut unknown: Vec<(&String, &Entry)> =
        f.iter().filter(|(k, _)| !is_omm_keyword(k)).collect();
    unknown.sort_by_key(|(k, e)| (e.line, e.column, k.as_str()));
    for (key, e) in &unknown {
        let bad = |reason: String| OmmError::BadKey {
            object,
            key: key.to_string(),
            reason,
            line: e.line,
            column: e.column,
        };
        if key.is_empty() {
            return Err(bad("is empty".to_string()));
        }
        crate::infile::check_name(key).map_err(bad)?;
        if let Some(near) = misspelt(key, f) {
            return Err(OmmError::UnknownKey {
                object,
                key: key.to_string(),
                line: e.line,
                column: e.column,
                near,
            });
        }
    }
    Ok(unknown.into_iter().map(|(k, _)| k.clone()).collect())
}

/// Every required keyword present, and given a value (JSON null is none).
fn check_missing(object: usize, f: &Fields, message_line: Option<usize>) -> Result<(), OmmError> {
    if let Some(field) = first_missing(f) {
        return Err(OmmError::MissingField {
            object,
            field,
            line: message_line,
        });
    }
    let null = REQUIRED.iter().filter_map(|k| f.get(*k).map(|e| (k, e)));
    match null
        .filter(|(_, e)| e.null)
        .min_by_key(|(_, e)| (e.line, e.column))
    {
        Some((k, e)) => Err(OmmError::InvalidValue {
            object,
            field: k.to_string(),
            value: "null".to_string(),
            reason: "a required keyword needs a value, JSON null given".to_string(),
            line: e.line,
            column: e.column,
        }),
        None => Ok(()),
    }
}

/// A KVN value without the unit in square brackets that may follow a number (CCSDS 502.0-B-3
/// §7: optional, but when given it must be the unit of the keyword in Table 4-3). The units of
/// the keywords this reader uses are checked (without regard to case, as providers write both);
/// a text value (a name, a frame, a time) keeps its brackets (`OBJECT_NAME = SAT [DEB]`).
fn without_unit(key: &str, value: &str) -> Result<String, String> {
    const TEXT: [&str; 14] = [
        "OBJECT_NAME",
        "OBJECT_ID",
        "CENTER_NAME",
        "REF_FRAME",
        "REF_FRAME_EPOCH",
        "COV_REF_FRAME",
        "TIME_SYSTEM",
        "MEAN_ELEMENT_THEORY",
        "CLASSIFICATION_TYPE",
        "EPOCH",
        "CREATION_DATE",
        "ORIGINATOR",
        "MESSAGE_ID",
        "CLASSIFICATION",
    ];
    let value = value.trim();
    if TEXT.contains(&key) || key.starts_with("USER_DEFINED_") {
        return Ok(value.to_string());
    }
    let Some(open) = value.find('[') else {
        return Ok(value.to_string());
    };
    let (number, unit) = (value[..open].trim(), value[open + 1..].trim());
    let Some(unit) = unit.strip_suffix(']').map(str::trim) else {
        return Err("a unit opened with [ is not closed with ]".to_string());
    };
    // Table 4-3 of CCSDS 502.0-B-3: BSTAR's "1/[Earth radii]" also as the XML schema spells it,
    // 1/ER; a keyword of no unit (ECCENTRICITY, the TLE numbers) takes none.
    let expected: &[&str] = match key {
        "MEAN_MOTION" => &["rev/day"],
        "INCLINATION" | "RA_OF_ASC_NODE" | "ARG_OF_PERICENTER" | "MEAN_ANOMALY" => &["deg"],
        "BSTAR" => &["1/ER", "1/[Earth radii]"],
        "MEAN_MOTION_DOT" => &["rev/day**2"],
        "MEAN_MOTION_DDOT" => &["rev/day**3"],
        "ECCENTRICITY" | "NORAD_CAT_ID" | "ELEMENT_SET_NO" | "REV_AT_EPOCH" | "EPHEMERIS_TYPE" => {
            return Err(format!(
                "{key} has no unit (CCSDS 502.0-B-3 Table 4-3), [{unit}] given"
            ))
        }
        _ => return Ok(number.to_string()),
    };
    match expected.iter().any(|e| unit.eq_ignore_ascii_case(e)) {
        true => Ok(number.to_string()),
        false => Err(format!(
            "the unit [{unit}] is not {key}'s unit, [{}] (CCSDS 502.0-B-3 Table 4-3); the value is not converted",
            expected[0]
        )),
    }
}

/// Only SGP4 mean elements of the Earth, in TEME and UTC, are accepted.
fn check_theory(f: &Fields, invalid: &dyn Fn(&str, &str) -> OmmError) -> Result<(), OmmError> {
    for (field, allowed) in [
        ("MEAN_ELEMENT_THEORY", &["SGP4", "SGP/SGP4"][..]),
        ("REF_FRAME", &["TEME"][..]),
        ("TIME_SYSTEM", &["UTC"][..]),
        // CCSDS 502.0-B-3 §4.2.4.6: a TLE-based OMM has CENTER_NAME = EARTH.
        ("CENTER_NAME", &["EARTH"][..]),
    ] {
        if let Some(v) = f.get(field).map(|e| e.value.trim()) {
            if !allowed.iter().any(|a| a.eq_ignore_ascii_case(v)) {
                // SGP4-XP elements (BTERM, AGOM) differ from SGP4's in meaning, not only in name.
                let xp = match v.to_ascii_uppercase().starts_with("SGP4-XP") {
                    true => " (SGP4-XP elements need the SGP4-XP propagator; give SGP4 elements)",
                    false => "",
                };
                return Err(invalid(
                    field,
                    &format!("only {} is supported{xp}", allowed.join(" or ")),
                ));
            }
        }
    }
    Ok(())
}

/// ISO 8601 UTC epoch, calendar or day-of-year form, optional fraction and trailing `Z`. A
/// leap second (`:60`) is refused, as every time passbudget reads (`timefmt::parse_utc`).
fn parse_epoch(s: &str) -> Result<NaiveDateTime, &'static str> {
    use chrono::Timelike;
    let s = s.trim().trim_end_matches('Z');
    for fmt in [
        "%Y-%m-%dT%H:%M:%S%.f",
        "%Y-%jT%H:%M:%S%.f",
        "%Y-%m-%dT%H:%M:%S",
        "%Y-%jT%H:%M:%S",
    ] {
        if let Ok(t) = NaiveDateTime::parse_from_str(s, fmt) {
            if t.nanosecond() >= 1_000_000_000 {
                return Err("a leap second (:60), which passbudget does not take (its time scale has none): give :59 or the next minute");
            }
            return Ok(t);
        }
    }
    Err("expected ISO 8601 UTC such as 2026-12-01T12:00:00.000 or 2026-335T12:00:00")
}

/// JSON reading that keeps every key of an object in order (`serde_json::Value` keeps only the
/// last of repeated keys), so that a repeated keyword can be reported.
mod json {
    use std::fmt;

    use serde::de::{self, Deserialize, Deserializer, IgnoredAny, MapAccess, SeqAccess, Visitor};

    /// One array element (or the top-level value): an object's entries, or anything else.
    pub enum Item {
        Object(Vec<(String, serde_json::Value)>),
        Other,
    }

    /// The whole document: one value or an array of values.
    pub enum Doc {
        One(Item),
        Many(Vec<Item>),
    }

    fn entries<'de, A: MapAccess<'de>>(
        mut map: A,
    ) -> Result<Vec<(String, serde_json::Value)>, A::Error> {
        let mut out = Vec::new();
        while let Some((k, v)) = map.next_entry::<String, serde_json::Value>()? {
            out.push((k, v));
        }
        Ok(out)
    }

    struct ItemVisitor;

    impl<'de> Visitor<'de> for ItemVisitor {
        type Value = Item;
        fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
            f.write_str("a JSON value")
        }
        fn visit_map<A: MapAccess<'de>>(self, map: A) -> Result<Item, A::Error> {
            Ok(Item::Object(entries(map)?))
        }
        fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Item, A::Error> {
            while seq.next_element::<IgnoredAny>()?.is_some() {}
            Ok(Item::Other)
        }
        fn visit_bool<E: de::Error>(self, _: bool) -> Result<Item, E> {
            Ok(Item::Other)
        }
        fn visit_i64<E: de::Error>(self, _: i64) -> Result<Item, E> {
            Ok(Item::Other)
        }
        fn visit_u64<E: de::Error>(self, _: u64) -> Result<Item, E> {
            Ok(Item::Other)
        }
        fn visit_f64<E: de::Error>(self, _: f64) -> Result<Item, E> {
            Ok(Item::Other)
        }
        fn visit_str<E: de::Error>(self, _: &str) -> Result<Item, E> {
            Ok(Item::Other)
        }
        fn visit_unit<E: de::Error>(self) -> Result<Item, E> {
            Ok(Item::Other)
        }
    }

    impl<'de> Deserialize<'de> for Item {
        fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Item, D::Error> {
            d.deserialize_any(ItemVisitor)
        }
    }

    struct DocVisitor;

    impl<'de> Visitor<'de> for DocVisitor {
        type Value = Doc;
        fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
            f.write_str("an OMM object or an array of OMM objects")
        }
        fn visit_map<A: MapAccess<'de>>(self, map: A) -> Result<Doc, A::Error> {
            Ok(Doc::One(Item::Object(entries(map)?)))
        }
        fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Doc, A::Error> {
            let mut items = Vec::new();
            while let Some(item) = seq.next_element::<Item>()? {
                items.push(item);
            }
            Ok(Doc::Many(items))
        }
        fn visit_bool<E: de::Error>(self, _: bool) -> Result<Doc, E> {
            Ok(Doc::One(Item::Other))
        }
        fn visit_i64<E: de::Error>(self, _: i64) -> Result<Doc, E> {
            Ok(Doc::One(Item::Other))
        }
        fn visit_u64<E: de::Error>(self, _: u64) -> Result<Doc, E> {
            Ok(Doc::One(Item::Other))
        }
        fn visit_f64<E: de::Error>(self, _: f64) -> Result<Doc, E> {
            Ok(Doc::One(Item::Other))
        }
        fn visit_str<E: de::Error>(self, _: &str) -> Result<Doc, E> {
            Ok(Doc::One(Item::Other))
        }
        fn visit_unit<E: de::Error>(self) -> Result<Doc, E> {
            Ok(Doc::One(Item::Other))
        }
    }

    /// Line and column (1-based, column in characters) of each key of each OMM object, in
    /// document order. The OMM objects are the top-level object, or the objects directly in
    /// the top-level array. Only called on text that parsed as JSON.
    pub fn key_positions(text: &str) -> Vec<Vec<(usize, usize)>> {
        let mut out: Vec<Vec<(usize, usize)>> = Vec::new();
        let (mut depth, mut object_depth) = (0usize, 1usize);
        let (mut line, mut column) = (1usize, 0usize);
        let (mut in_string, mut escape) = (false, false);
        let (mut start, mut last_string) = ((0, 0), None);
        for ch in text.chars() {
            if ch == '\n' {
                (line, column) = (line + 1, 0);
                continue;
            }
            column += 1;
            if in_string {
                if escape {
                    escape = false;
                } else if ch == '\\' {
                    escape = true;
                } else if ch == '"' {
                    in_string = false;
                    last_string = (depth == object_depth).then_some(start);
                }
                continue;
            }
            match ch {
                '"' => (in_string, start) = (true, (line, column)),
                ':' if depth == object_depth => {
                    if let (Some(p), Some(keys)) = (last_string.take(), out.last_mut()) {
                        keys.push(p);
                    }
                }
                '[' if depth == 0 => (object_depth, depth) = (2, 1),
                '{' | '[' => {
                    depth += 1;
                    if ch == '{' && depth == object_depth {
                        out.push(Vec::new());
                    }
                }
                '}' | ']' => depth = depth.saturating_sub(1),
                _ => {}
            }
        }
        out
    }

    impl<'de> Deserialize<'de> for Doc {
        fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Doc, D::Error> {
            d.deserialize_any(DocVisitor)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn epoch_forms() {
        let a = parse_epoch("2026-12-01T12:00:00.000000").unwrap();
        let b = parse_epoch("2026-335T12:00:00Z").unwrap();
        assert_eq!(a, b);
        assert!(parse_epoch("1 Dec 2026").is_err());
        // a leap second, refused as in every other time read
        let e = parse_epoch("2026-12-01T11:59:60.000000").unwrap_err();
        assert!(e.contains("leap second"), "{e}");
        let kvn = KVN.replace("EPOCH = 2026-12-01T12:00:00", "EPOCH = 2026-12-01T11:59:60");
        assert_ne!(kvn, KVN, "the example's epoch line");
        let err = parse_omm_kvn(&kvn).unwrap_err().to_string();
        assert!(
            err.contains("EPOCH") && err.contains("leap second"),
            "{err}"
        );
    }

    const KVN: &str = include_str!("../../examples/sat-omm.kvn");
    const JSON: &str = include_str!("../../examples/sat-omm.json");

    /// KVN units: the units of CCSDS 502.0-B-3 Table 4-3 are taken (any case); another unit is
    /// refused with the keyword and its unit, never read as if it were the table's; a text value
    /// keeps its brackets; CENTER_NAME must be EARTH (§4.2.4.6).
    #[test]
    fn kvn_units_are_the_tables() {
        let sets = parse_omm_kvn(&KVN.replace("[rev/day]", "[REV/DAY]")).unwrap();
        assert!((sets[0].elements.mean_motion - 15.05472).abs() < 1e-9);
        for (from, to, key) in [
            (
                "15.05472000 [rev/day]",
                "15.05472000 [rad/s]",
                "MEAN_MOTION",
            ),
            ("97.5950 [deg]", "97.5950 [rad]", "INCLINATION"),
            ("0.00012000 [1/ER]", "0.00012000 [1/m]", "BSTAR"),
            ("0.0 [rev/day**3]", "0.0 [rev/day**2]", "MEAN_MOTION_DDOT"),
            (
                "ECCENTRICITY = 0.0011500",
                "ECCENTRICITY = 0.0011500 [deg]",
                "ECCENTRICITY",
            ),
            ("97.5950 [deg]", "97.5950 [deg", "INCLINATION"),
        ] {
            let kvn = KVN.replace(from, to);
            assert_ne!(kvn, KVN, "{from}");
            let err = parse_omm_kvn(&kvn).unwrap_err();
            assert!(
                matches!(&err, OmmError::InvalidValue { field, .. } if field == key),
                "{err:?}"
            );
            let text = err.to_string();
            assert!(
                text.contains("Table 4-3") || text.contains("not closed"),
                "{err}"
            );
        }
        let long = KVN.replace("[1/ER]", "[1/[Earth radii]]");
        assert_ne!(long, KVN);
        assert_eq!(parse_omm_kvn(&long).unwrap().len(), 1);
        let named = KVN.replace("OBJECT_NAME = WRENLET-1", "OBJECT_NAME = WRENLET-1 [DEB]");
        let sets = parse_omm_kvn(&named).unwrap();
        assert_eq!(sets[0].name.as_deref(), Some("WRENLET-1 [DEB]"));
        let moon = KVN.replace("CENTER_NAME = EARTH", "CENTER_NAME = MOON");
        let err = parse_omm_kvn(&moon).unwrap_err().to_string();
        assert!(
            err.contains("CENTER_NAME") && err.contains("EARTH"),
            "{err}"
        );
    }

    #[test]
    fn range_errors_name_keyword_and_line() {
        let kvn = KVN.replace("INCLINATION = 97.5950", "INCLINATION = 197.45");
        let err = parse_omm_kvn(&kvn).unwrap_err();
        assert_eq!(
            err.to_string(),
            "message 1 (line 16, column 15): INCLINATION = '197.45' is not valid: \
             inclination 197.45 deg is out of range (0 to 180 deg)"
        );
        let json = JSON.replace("\"MEAN_MOTION\": 15.05472", "\"MEAN_MOTION\": 1e308");
        let err = parse_omm_json(&json).unwrap_err();
        assert!(
            matches!(&err, OmmError::InvalidValue { field, .. } if field == "MEAN_MOTION"),
            "{err:?}"
        );
        assert!(err.to_string().contains("1e308 rev/day"), "{err}");
        assert!(err.to_string().contains("(line 14, column 5)"), "{err}");
        for (from, to) in [
            ("RA_OF_ASC_NODE = 215.3000", "RA_OF_ASC_NODE = -1"),
            ("ARG_OF_PERICENTER = 90.0000", "ARG_OF_PERICENTER = 720"),
            ("MEAN_ANOMALY = 270.0000", "MEAN_ANOMALY = 360.5"),
            ("MEAN_MOTION = 15.05472000", "MEAN_MOTION = 0"),
        ] {
            let err = parse_omm_kvn(&KVN.replace(from, to)).unwrap_err();
            assert!(
                matches!(&err, OmmError::InvalidValue { field, line: Some(_), .. } if from.starts_with(field.as_str())),
                "{to}: {err:?}"
            );
        }
    }

    #[test]
    fn byte_order_mark_is_skipped() {
        assert_eq!(parse_omm_kvn(&format!("\u{feff}{KVN}")).unwrap().len(), 1);
        assert_eq!(parse_omm_json(&format!("\u{feff}{JSON}")).unwrap().len(), 1);
    }

    #[test]
    fn duplicate_keys_are_errors() {
        let kvn = KVN.replace(
            "BSTAR = 0.00012000 [1/ER]",
            "BSTAR = 0.00012000\nBSTAR = 0.1",
        );
        assert_eq!(
            parse_omm_kvn(&kvn).unwrap_err(),
            OmmError::DuplicateKey {
                object: 0,
                key: "BSTAR".to_string(),
                line: Some(27),
                column: Some(9),
                first_line: Some(26),
            }
        );
        let json = JSON.replace("\"BSTAR\": 0.00012,", "\"BSTAR\": 0.00012, \"bstar\": 0.1,");
        let err = parse_omm_json(&json).unwrap_err();
        assert_eq!(
            err,
            OmmError::DuplicateKey {
                object: 0,
                key: "BSTAR".to_string(),
                line: Some(25),
                column: Some(23),
                first_line: Some(25),
            }
        );
        assert!(err.to_string().contains("BSTAR"));
    }

    /// Basis: CCSDS 502.0-B-3 Table 4-1 (header: CLASSIFICATION, MESSAGE_ID) and Table 4-3
    /// (SGP4-XP: BTERM, AGOM), from memory; BTERM, AGOM and CLASSIFICATION confirmed in pub.dev
    /// `spacedatastandards` (class OMM). A B-3 message gives the same elements
    /// as the B-2 one it extends; an SGP4-XP set is refused by its theory, not as unknown keywords
    /// or a missing BSTAR (before: "unknown keyword MESSAGE_ID").
    #[test]
    fn version_3_messages_are_read_and_sgp4_xp_is_refused_by_its_theory() {
        let b3 = KVN
            .replace("CCSDS_OMM_VERS = 2.0", "CCSDS_OMM_VERS = 3.0")
            .replace(
                "ORIGINATOR = PASSBUDGET DEMO",
                "CLASSIFICATION = none\nORIGINATOR = PASSBUDGET DEMO\nMESSAGE_ID = DEMO-0001",
            );
        let (a, b) = (parse_omm_kvn(KVN).unwrap(), parse_omm_kvn(&b3).unwrap());
        assert_eq!(
            format!("{:?}", a[0].elements),
            format!("{:?}", b[0].elements)
        );
        let json = JSON.replacen('{', "{\n  \"MESSAGE_ID\": \"DEMO-0001\",", 1);
        assert!(parse_omm_json(&json).is_ok(), "{json}");
        let xp = b3
            .replace(
                "MEAN_ELEMENT_THEORY = SGP4",
                "MEAN_ELEMENT_THEORY = SGP4-XP",
            )
            .replace("BSTAR = 0.00012000 [1/ER]", "BTERM = 0.0125")
            .replace("MEAN_MOTION_DDOT = 0.0 [rev/day**3]", "AGOM = 0.0081");
        let err = parse_omm_kvn(&xp).unwrap_err();
        assert!(
            matches!(&err, OmmError::InvalidValue { field, .. } if field == "MEAN_ELEMENT_THEORY"),
            "{err:?}"
        );
        assert!(err.to_string().contains("SGP4-XP propagator"), "{err}");
        // The same in JSON, where an SGP4-XP set may give BSTAR as null (before: refused for
        // the null BSTAR).
        let xp = JSON
            .replace("\"SGP4\"", "\"SGP4-XP\"")
            .replace("\"BSTAR\": 0.00012", "\"BSTAR\": null, \"BTERM\": 0.0125");
        assert!(xp.contains("SGP4-XP") && xp.contains("BTERM"), "{xp}");
        let err = parse_omm_json(&xp).unwrap_err();
        assert!(
            matches!(&err, OmmError::InvalidValue { field, .. } if field == "MEAN_ELEMENT_THEORY"),
            "{err:?}"
        );
    }

    #[test]
    fn misspelt_keywords_are_errors() {
        let kvn = KVN.replace("ELEMENT_SET_NO", "ELEMENT_SET_NUM");
        let err = parse_omm_kvn(&kvn).unwrap_err();
        assert_eq!(
            err,
            OmmError::UnknownKey {
                object: 0,
                key: "ELEMENT_SET_NUM".to_string(),
                line: Some(24),
                column: Some(19),
                near: "ELEMENT_SET_NO",
            }
        );
        assert!(err.to_string().contains("line 24") && err.to_string().contains("ELEMENT_SET_NUM"));
        let json = JSON.replace("REV_AT_EPOCH", "REV_AT_EPOC");
        assert!(matches!(
            parse_omm_json(&json).unwrap_err(),
            OmmError::UnknownKey { key, line: Some(24), column: Some(5), .. } if key == "REV_AT_EPOC"
        ));
        // A misspelt required keyword: reported as unknown (before: as missing, which did not
        // point at the misspelt line), naming the missing keyword too.
        let json = JSON.replace("\"BSTAR\"", "\"B_STAR\"");
        let err = parse_omm_json(&json).unwrap_err();
        assert!(
            matches!(&err, OmmError::UnknownKey { key, near: "BSTAR", line: Some(_), .. } if key == "B_STAR"),
            "{err:?}"
        );
        assert!(
            err.to_string()
                .ends_with("close to BSTAR, which the message lacks (a misspelling?)"),
            "{err}"
        );
        // A misspelt optional keyword would be read as absent: an error too.
        let kvn = KVN.replace("REF_FRAME", "REF_FRAM");
        assert!(matches!(
            parse_omm_kvn(&kvn).unwrap_err(),
            OmmError::UnknownKey {
                near: "REF_FRAME",
                ..
            }
        ));
        // User-defined keywords are part of the standard's keyword set.
        let kvn = KVN.replace(
            "ORIGINATOR = PASSBUDGET DEMO",
            "ORIGINATOR = X\nUSER_DEFINED_NOTE = 1",
        );
        assert!(parse_omm_kvn(&kvn).is_ok());
    }

    /// Fields an element-set provider adds to OMM JSON (common practice; these names are from
    /// memory) are not OMM keywords: they are ignored, and listed in the order of the file, the
    /// elements read as without them. One of them is one letter from SEMI_MAJOR_AXIS, a keyword
    /// not read here (the mean motion is): no misspelling of anything read.
    #[test]
    fn provider_fields_are_ignored_and_listed() {
        let extra = "\"SEMIMAJOR_AXIS\": \"6903.1\",\n  \"PERIOD\": \"95.65\",\n  \
                     \"OBJECT_TYPE\": \"PAYLOAD\",\n  \"DECAY_DATE\": null,\n  \
                     \"TLE_LINE1\": \"1 99901U ...\",\n  \"GP_ID\": 1,\n  ";
        let json = JSON.replacen("\"MEAN_MOTION\"", &format!("{extra}\"MEAN_MOTION\""), 1);
        assert_ne!(json, JSON);
        let with = parse_omm_json(&json).unwrap();
        let without = parse_omm_json(JSON).unwrap();
        assert_eq!(
            with[0].ignored_keywords,
            [
                "SEMIMAJOR_AXIS",
                "PERIOD",
                "OBJECT_TYPE",
                "TLE_LINE1",
                "GP_ID"
            ]
        );
        assert!(without[0].ignored_keywords.is_empty());
        assert_eq!(with[0].elements, without[0].elements);
        // KVN alike.
        let kvn = KVN.replace(
            "ORIGINATOR = PASSBUDGET DEMO",
            "ORIGINATOR = X\nRCS_SIZE = SMALL",
        );
        assert_eq!(
            parse_omm_kvn(&kvn).unwrap()[0].ignored_keywords,
            ["RCS_SIZE"]
        );
    }

    /// Slips that would change the reading if the key were ignored: another separator, an
    /// invisible character pasted with the key (U+200B, one character of three bytes), a keyword
    /// cut short. Each is refused, naming the keyword; spaces around a JSON key are dropped.
    #[test]
    fn misspellings_past_separators_invisibles_and_cuts_are_refused() {
        for (from, to, near) in [
            ("CENTER_NAME = EARTH", "CENTRE-NAME = MOON", "CENTER_NAME"),
            ("CENTER_NAME = EARTH", "CENTER NAME = MOON", "CENTER_NAME"),
            ("REF_FRAME = TEME", "REF_FRAME\u{200B} = GCRF", "REF_FRAME"),
            ("TIME_SYSTEM = UTC", "TIME_SYS = TAI", "TIME_SYSTEM"),
        ] {
            assert!(KVN.contains(from), "{from}");
            let err = parse_omm_kvn(&KVN.replace(from, to)).unwrap_err();
            assert!(
                matches!(&err, OmmError::UnknownKey { near: n, .. } if *n == near),
                "{to}: {err:?}"
            );
        }
        let json = JSON.replace("\"BSTAR\"", "\" BSTAR \"");
        assert_ne!(json, JSON);
        assert_eq!(
            parse_omm_json(&json).unwrap(),
            parse_omm_json(JSON).unwrap()
        );
    }

    /// A key that is empty or holds a control or text-reordering character is refused (it would
    /// reach the terminal and the outputs' notes), shown escaped.
    #[test]
    fn empty_and_control_character_keys_are_refused() {
        for key in ["", "X\\nday,1,2", "Y\\u001b[31mRED", "Z\\u202eEVIL"] {
            let field = format!("\"{key}\": 1, \"MEAN_MOTION\"");
            let json = JSON.replacen("\"MEAN_MOTION\"", &field, 1);
            let err = parse_omm_json(&json).unwrap_err();
            assert!(matches!(err, OmmError::BadKey { .. }), "{key}: {err:?}");
            let text = err.to_string();
            assert!(!text.chars().any(char::is_control), "{text}");
        }
    }

    #[test]
    fn json_null_for_required_keyword() {
        let json = JSON.replace("\"MEAN_MOTION\": 15.05472", "\"MEAN_MOTION\": null");
        let err = parse_omm_json(&json).unwrap_err();
        assert!(
            matches!(&err, OmmError::InvalidValue { field, value, .. } if field == "MEAN_MOTION" && value == "null"),
            "{err:?}"
        );
        assert!(
            err.to_string()
                .starts_with("message 1 (line 14, column 5): MEAN_MOTION"),
            "{err}"
        );
        // null for an optional keyword counts as absent.
        let json = JSON.replace("\"OBJECT_ID\": \"PB-DEMO-001\"", "\"OBJECT_ID\": null");
        assert!(parse_omm_json(&json).is_ok());
    }

    /// A number beyond f64 in OMM JSON: the position once (before: serde_json's own " at line L
    /// column C" repeated it).
    #[test]
    fn json_number_overflow_gives_the_position_once() {
        let json = JSON.replace("\"MEAN_MOTION\": 15.05472", "\"MEAN_MOTION\": 1e400");
        let err = parse_omm_json(&json).unwrap_err().to_string();
        assert_eq!(err.matches("line").count(), 1, "{err}");
        assert!(err.starts_with("JSON error at line 14, column"), "{err}");
        assert!(err.ends_with("number out of range"), "{err}");
    }

    #[test]
    fn json_key_positions_skip_nested_and_strings() {
        let text = "[\n {\"A\": 1, \"B\": {\"C\": \"x:\\\"y\"}},\n 3,\n {\"D\" : [\"E\"]}\n]";
        assert_eq!(
            json::key_positions(text),
            vec![vec![(2, 3), (2, 11)], vec![(4, 3)]]
        );
        assert_eq!(json::key_positions("{\"K\": 1}"), vec![vec![(1, 2)]]);
    }
}
