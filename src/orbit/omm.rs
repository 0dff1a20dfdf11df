//! CCSDS Orbit Mean-Elements Message (OMM), CCSDS 502.0-B-2 (Orbit Data Messages, 2009), §4,
//! in its two common encodings:
//!
//! * JSON: an object, or an array of objects, with the OMM keywords as keys (numbers may be
//!   JSON numbers or strings), as distributed by element-set providers.
//! * KVN: `KEY = value` lines (CCSDS 502.0-B-2 §6), `COMMENT` lines, blank lines; a value may
//!   be followed by its unit in square brackets (`MEAN_MOTION = 15.05 [rev/day]`), which is
//!   ignored. A file may hold several messages, each starting with `CCSDS_OMM_VERS`.
//!
//! Only SGP4 mean elements are accepted: `MEAN_ELEMENT_THEORY`, `REF_FRAME`, `TIME_SYSTEM`, if
//! present, must be `SGP4` (or `SGP/SGP4`), `TEME`, `UTC`. Required keywords: `NORAD_CAT_ID`, `EPOCH`,
//! `MEAN_MOTION`, `ECCENTRICITY`, `INCLINATION`, `RA_OF_ASC_NODE`, `ARG_OF_PERICENTER`,
//! `MEAN_ANOMALY`, `BSTAR`, `MEAN_MOTION_DOT`, `MEAN_MOTION_DDOT`. Optional: `OBJECT_NAME`,
//! `OBJECT_ID`, `CLASSIFICATION_TYPE` (default U), `ELEMENT_SET_NO`, `REV_AT_EPOCH`,
//! `EPHEMERIS_TYPE` (default 0). `EPOCH` is ISO 8601 UTC, calendar (`2026-12-01T12:00:00.000`)
//! or day-of-year (`2026-335T12:00:00`) form, optional trailing `Z`.

use std::collections::HashMap;

use chrono::NaiveDateTime;

use super::ElementSet;

/// A malformed OMM. `line` is the 1-based line number (KVN); `object` the 0-based index of the
/// message in the file.
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
    #[error("message {object}: JSON value is not an object of OMM keywords")]
    NotAnObject { object: usize },
    #[error("message {object}{}: required keyword {field} is missing", line_suffix(*.line))]
    MissingField {
        object: usize,
        field: &'static str,
        line: Option<usize>,
    },
    #[error("message {object}{}: {field} = '{value}' is not valid: {reason}", line_suffix(*.line))]
    InvalidValue {
        object: usize,
        field: String,
        value: String,
        reason: String,
        line: Option<usize>,
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

/// One message's keywords: value and (for KVN) line number.
type Fields = HashMap<String, (String, Option<usize>)>;

/// Parse OMM JSON (an object or an array of objects).
pub fn parse_omm_json(text: &str) -> Result<Vec<ElementSet>, OmmError> {
    let value: serde_json::Value = serde_json::from_str(text).map_err(|e| OmmError::Json {
        line: e.line(),
        column: e.column(),
        reason: e.to_string(),
    })?;
    let objects = match value {
        serde_json::Value::Array(a) => a,
        other => vec![other],
    };
    if objects.is_empty() {
        return Err(OmmError::Empty);
    }
    objects
        .iter()
        .enumerate()
        .map(|(i, o)| {
            let map = o.as_object().ok_or(OmmError::NotAnObject { object: i })?;
            let mut fields = Fields::new();
            for (k, v) in map {
                let s = match v {
                    serde_json::Value::String(s) => s.clone(),
                    serde_json::Value::Number(n) => n.to_string(),
                    serde_json::Value::Null => continue,
                    other => other.to_string(),
                };
                fields.insert(k.to_ascii_uppercase(), (s, None));
            }
            build(i, &fields)
        })
        .collect()
}

/// Parse OMM KVN text (one or more messages).
pub fn parse_omm_kvn(text: &str) -> Result<Vec<ElementSet>, OmmError> {
    let mut messages: Vec<Fields> = Vec::new();
    for (i, raw) in text.lines().enumerate() {
        let line = i + 1;
        let l = raw.trim();
        if l.is_empty() || l.starts_with("COMMENT") {
            continue;
        }
        let Some((key, value)) = l.split_once('=') else {
            return Err(OmmError::KvnSyntax {
                line,
                text: l.to_string(),
            });
        };
        let key = key.trim().to_ascii_uppercase();
        if key.is_empty() {
            return Err(OmmError::KvnSyntax {
                line,
                text: l.to_string(),
            });
        }
        // Drop a unit in square brackets after the value.
        let value = match value.find('[') {
            Some(p) => &value[..p],
            None => value,
        }
        .trim()
        .to_string();
        if key == "CCSDS_OMM_VERS" || messages.is_empty() {
            messages.push(Fields::new());
        }
        if let Some(m) = messages.last_mut() {
            m.insert(key, (value, Some(line)));
        }
    }
    if messages.is_empty() {
        return Err(OmmError::Empty);
    }
    messages
        .iter()
        .enumerate()
        .map(|(i, f)| build(i, f))
        .collect()
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

fn build(object: usize, f: &Fields) -> Result<ElementSet, OmmError> {
    // Line for a "missing" error: the message's first line, if known.
    let first_line = f.values().filter_map(|(_, l)| *l).min();
    for field in REQUIRED {
        if !f.contains_key(field) {
            return Err(OmmError::MissingField {
                object,
                field,
                line: first_line,
            });
        }
    }
    let invalid = |field: &str, reason: &str| {
        let (value, line) = f.get(field).cloned().unwrap_or_default();
        OmmError::InvalidValue {
            object,
            field: field.to_string(),
            value,
            reason: reason.to_string(),
            line,
        }
    };
    let text = |field: &str| f.get(field).map(|(v, _)| v.trim());
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
    for (field, allowed) in [
        ("MEAN_ELEMENT_THEORY", &["SGP4", "SGP/SGP4"][..]),
        ("REF_FRAME", &["TEME"][..]),
        ("TIME_SYSTEM", &["UTC"][..]),
    ] {
        if let Some(v) = text(field) {
            if !allowed.iter().any(|a| a.eq_ignore_ascii_case(v)) {
                return Err(invalid(
                    field,
                    &format!("only {} is supported", allowed.join(" or ")),
                ));
            }
        }
    }
    let norad_id = int_or("NORAD_CAT_ID", 0)?;
    let epoch_text = text("EPOCH").unwrap_or("");
    let datetime = parse_epoch(epoch_text).ok_or_else(|| {
        invalid(
            "EPOCH",
            "expected ISO 8601 UTC such as 2026-12-01T12:00:00.000 or 2026-335T12:00:00",
        )
    })?;
    let eccentricity = num("ECCENTRICITY")?;
    if !(0.0..1.0).contains(&eccentricity) {
        return Err(invalid("ECCENTRICITY", "must be in [0, 1)"));
    }
    let mean_motion = num("MEAN_MOTION")?;
    if mean_motion <= 0.0 {
        return Err(invalid("MEAN_MOTION", "must be positive (rev/day)"));
    }
    let classification = match text("CLASSIFICATION_TYPE").unwrap_or("U") {
        "U" | "" => sgp4::Classification::Unclassified,
        "C" => sgp4::Classification::Classified,
        "S" => sgp4::Classification::Secret,
        _ => return Err(invalid("CLASSIFICATION_TYPE", "expected U, C or S")),
    };
    let name = text("OBJECT_NAME")
        .filter(|s| !s.is_empty())
        .map(str::to_string);
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
        eccentricity,
        argument_of_perigee: num("ARG_OF_PERICENTER")?,
        mean_anomaly: num("MEAN_ANOMALY")?,
        mean_motion,
        revolution_number: int_or("REV_AT_EPOCH", 0)?,
        ephemeris_type: int_or("EPHEMERIS_TYPE", 0)?.min(u8::MAX as u64) as u8,
    };
    Ok(ElementSet::from_elements(elements))
}

/// ISO 8601 UTC epoch, calendar or day-of-year form, optional fraction and trailing `Z`.
fn parse_epoch(s: &str) -> Option<NaiveDateTime> {
    let s = s.trim().trim_end_matches('Z');
    for fmt in [
        "%Y-%m-%dT%H:%M:%S%.f",
        "%Y-%jT%H:%M:%S%.f",
        "%Y-%m-%dT%H:%M:%S",
        "%Y-%jT%H:%M:%S",
    ] {
        if let Ok(t) = NaiveDateTime::parse_from_str(s, fmt) {
            return Some(t);
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn epoch_forms() {
        let a = parse_epoch("2026-12-01T12:00:00.000000").unwrap();
        let b = parse_epoch("2026-335T12:00:00Z").unwrap();
        assert_eq!(a, b);
        assert!(parse_epoch("1 Dec 2026").is_none());
    }
}
