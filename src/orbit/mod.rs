//! Orbit input and propagation.
//!
//! * [`tle`] reads two-line element sets (2-line and 3-line form, several satellites per file).
//! * [`omm`] reads CCSDS Orbit Mean-Elements Messages (CCSDS 502.0-B-2) in JSON and KVN form.
//! * [`propagate`] runs SGP4/SDP4 (Vallado, Crawford, Hujsak, Kelso, "Revisiting Spacetrack
//!   Report #3", AIAA 2006-6753) through the `sgp4` crate with WGS-72 constants.
//! * [`frames`] turns TEME states into Earth-fixed states (GMST IAU-82) and WGS-84 geodetic
//!   coordinates (NIMA TR8350.2) into Earth-centred Earth-fixed coordinates.
//!
//! Every input form ends in the same [`ElementSet`]; [`load_elements`] detects the form of a file.

pub mod frames;
pub mod omm;
pub mod propagate;
pub mod tle;

use std::path::{Path, PathBuf};

use chrono::{DateTime, Utc};

pub use frames::{EcefState, TemeState};
pub use omm::OmmError;
pub use propagate::{PropagationError, Propagator};
pub use tle::TleError;

/// One satellite's mean elements, ready for SGP4.
#[derive(Debug, Clone, PartialEq)]
pub struct ElementSet {
    /// Object name (line 0 of a 3-line set, `OBJECT_NAME` of an OMM); `None` for a 2-line set.
    pub name: Option<String>,
    /// Satellite catalog number.
    pub norad_id: u64,
    /// Element epoch (UTC).
    pub epoch: DateTime<Utc>,
    /// The elements in the form the `sgp4` crate consumes (angles in degrees, mean motion in rev/day).
    pub elements: sgp4::Elements,
}

impl ElementSet {
    /// Wrap `sgp4::Elements`, taking name, catalog number and epoch from them.
    pub fn from_elements(elements: sgp4::Elements) -> ElementSet {
        ElementSet {
            name: elements.object_name.clone(),
            norad_id: elements.norad_id,
            epoch: elements.datetime.and_utc(),
            elements,
        }
    }

    /// A label for messages: the name if there is one, else the catalog number.
    pub fn label(&self) -> String {
        match &self.name {
            Some(n) => format!("{n} ({})", self.norad_id),
            None => format!("catalog number {}", self.norad_id),
        }
    }
}

/// Error loading an element file: names the file; the inner error names the line.
#[derive(Debug, thiserror::Error)]
pub enum OrbitInputError {
    /// The file could not be read.
    #[error("{path}: cannot read: {source}")]
    Io {
        path: PathBuf,
        #[source]
        source: std::io::Error,
    },
    /// A TLE file is malformed.
    #[error("{path}: {source}")]
    Tle {
        path: PathBuf,
        #[source]
        source: TleError,
    },
    /// An OMM file (JSON or KVN) is malformed.
    #[error("{path}: {source}")]
    Omm {
        path: PathBuf,
        #[source]
        source: OmmError,
    },
}

/// The form of an element file, as detected by [`detect_format`].
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ElementFormat {
    /// Two-line elements (2-line or 3-line form).
    Tle,
    /// CCSDS OMM in JSON (an object or an array of objects).
    OmmJson,
    /// CCSDS OMM in KVN (`KEY = value` lines).
    OmmKvn,
}

/// Detect the form of element text: JSON if the first non-blank character is `[` or `{`,
/// KVN if the text contains `CCSDS_OMM_VERS`, otherwise TLE.
pub fn detect_format(text: &str) -> ElementFormat {
    match text.trim_start().chars().next() {
        Some('[') | Some('{') => ElementFormat::OmmJson,
        _ if text.contains("CCSDS_OMM_VERS") => ElementFormat::OmmKvn,
        _ => ElementFormat::Tle,
    }
}

/// Parse element text of any supported form (see [`detect_format`]).
pub fn parse_elements(text: &str) -> Result<Vec<ElementSet>, ParseError> {
    match detect_format(text) {
        ElementFormat::Tle => tle::parse_tle(text).map_err(ParseError::Tle),
        ElementFormat::OmmJson => omm::parse_omm_json(text).map_err(ParseError::Omm),
        ElementFormat::OmmKvn => omm::parse_omm_kvn(text).map_err(ParseError::Omm),
    }
}

/// Error of [`parse_elements`] (no file name; [`load_elements`] adds it).
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ParseError {
    #[error(transparent)]
    Tle(TleError),
    #[error(transparent)]
    Omm(OmmError),
}

/// Read an element file (TLE, OMM JSON or OMM KVN; detected by [`detect_format`]).
pub fn load_elements(path: &Path) -> Result<Vec<ElementSet>, OrbitInputError> {
    let text = std::fs::read_to_string(path).map_err(|source| OrbitInputError::Io {
        path: path.to_path_buf(),
        source,
    })?;
    parse_elements(&text).map_err(|e| match e {
        ParseError::Tle(source) => OrbitInputError::Tle {
            path: path.to_path_buf(),
            source,
        },
        ParseError::Omm(source) => OrbitInputError::Omm {
            path: path.to_path_buf(),
            source,
        },
    })
}

/// Error choosing one element set with [`select`].
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum SelectError {
    #[error("no element sets to choose from")]
    Empty,
    #[error("{count} element sets given; choose one by catalog number or name")]
    NoneChosen { count: usize },
    #[error("no element set matches '{query}'")]
    NoMatch { query: String },
    #[error("'{query}' matches {} element sets: {}", .candidates.len(), .candidates.join(", "))]
    Ambiguous {
        query: String,
        candidates: Vec<String>,
    },
}

/// Choose one element set: by catalog number (if `query` is an integer and some set has that
/// number), else by name (case-insensitive, exact after trimming). With no query, a single
/// set is chosen; several sets are an error.
pub fn select<'a>(
    sets: &'a [ElementSet],
    query: Option<&str>,
) -> Result<&'a ElementSet, SelectError> {
    if sets.is_empty() {
        return Err(SelectError::Empty);
    }
    let Some(query) = query else {
        return if sets.len() == 1 {
            Ok(&sets[0])
        } else {
            Err(SelectError::NoneChosen { count: sets.len() })
        };
    };
    let q = query.trim();
    let mut hits: Vec<&ElementSet> = Vec::new();
    if let Ok(id) = q.parse::<u64>() {
        hits.extend(sets.iter().filter(|s| s.norad_id == id));
    }
    if hits.is_empty() {
        let ql = q.to_lowercase();
        hits.extend(sets.iter().filter(|s| {
            s.name
                .as_deref()
                .map(|n| n.trim().to_lowercase() == ql)
                .unwrap_or(false)
        }));
    }
    match hits.len() {
        0 => Err(SelectError::NoMatch {
            query: q.to_string(),
        }),
        1 => Ok(hits[0]),
        _ => Err(SelectError::Ambiguous {
            query: q.to_string(),
            candidates: hits.iter().map(|s| s.label()).collect(),
        }),
    }
}
