//! Orbit input and propagation.
//!
//! * [`tle`] reads two-line element sets (2-line and 3-line form, several satellites per file).
//! * [`omm`] reads CCSDS Orbit Mean-Elements Messages (CCSDS 502.0-B-3, and B-2) in JSON and
//!   KVN form.
//! * [`propagate`] runs SGP4/SDP4 (Vallado, Crawford, Hujsak, Kelso, "Revisiting Spacetrack
//!   Report #3", AIAA 2006-6753) through the `sgp4` crate with WGS-72 constants.
//! * [`spline`] interpolates Earth-fixed states between SGP4 knots over a pass (a cubic through
//!   four knots, position and velocity each on its own; near-Earth orbits; deep-space orbits are
//!   propagated directly).
//! * [`frames`] turns TEME states into Earth-fixed states (GMST IAU-82) and WGS-84 geodetic
//!   coordinates (NIMA TR8350.2) into Earth-centred Earth-fixed coordinates.
//!
//! * [`checks`] holds the element range checks both readers apply (errors name the TLE line and
//!   columns or the OMM keyword, line and column).
//! * [`fuzz_entry`] holds the bodies of the cargo-fuzz targets in `fuzz/`.
//!
//! Every input form ends in the same [`ElementSet`]; [`load_elements`] detects the form of a file.
//! [`select`] picks one set by catalog number or name; [`select_for_window`] also resolves an
//! element-set history (several sets of one satellite) by epoch.

pub mod checks;
mod elements;
pub mod frames;
pub mod fuzz_entry;
pub mod omm;
pub mod propagate;
pub mod spline;
pub mod tle;

use std::path::{Path, PathBuf};

use chrono::{DateTime, Utc};

pub use checks::{check_element_ranges, ElementField, RangeViolation};
pub use elements::ElementSet;
pub use frames::{EcefState, TemeState};
pub use omm::OmmError;
pub use propagate::{PropagationError, Propagator};
pub use spline::EcefSpline;
pub use tle::TleError;

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
        /// Boxed: the OMM error is large (value, reason and position).
        #[source]
        source: Box<OmmError>,
    },
    /// An XML file (OMM's XML form is not read).
    #[error("{path}: {XML_NOT_READ}")]
    Xml { path: PathBuf },
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
    /// XML (the first non-blank character is `<`): CCSDS OMM has an XML form, which is not read.
    Xml,
}

/// Detect the form of element text: JSON if the first non-blank character is `[` or `{`, XML
/// if it is `<`, KVN if the text contains `CCSDS_OMM_VERS`, otherwise TLE. A leading UTF-8
/// byte-order mark is skipped.
pub fn detect_format(text: &str) -> ElementFormat {
    match checks::strip_bom(text).trim_start().chars().next() {
        Some('[') | Some('{') => ElementFormat::OmmJson,
        Some('<') => ElementFormat::Xml,
        _ if text.contains("CCSDS_OMM_VERS") => ElementFormat::OmmKvn,
        _ => ElementFormat::Tle,
    }
}

/// Parse element text of any supported form (see [`detect_format`]). Lines may end in LF, CR LF
/// or a lone CR (a file saved with the old Mac line endings reads as its lines, not as one).
pub fn parse_elements(text: &str) -> Result<Vec<ElementSet>, ParseError> {
    let lone_cr = text.split("\r\n").any(|piece| piece.contains('\r'));
    let text: std::borrow::Cow<str> = if lone_cr {
        text.replace("\r\n", "\n").replace('\r', "\n").into()
    } else {
        text.into()
    };
    match detect_format(&text) {
        ElementFormat::Tle => tle::parse_tle(&text).map_err(ParseError::Tle),
        ElementFormat::OmmJson => omm::parse_omm_json(&text).map_err(ParseError::Omm),
        ElementFormat::OmmKvn => omm::parse_omm_kvn(&text).map_err(ParseError::Omm),
        ElementFormat::Xml => Err(ParseError::Xml),
    }
}

/// Error of [`parse_elements`] (no file name; [`load_elements`] adds it).
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ParseError {
    #[error(transparent)]
    Tle(TleError),
    #[error(transparent)]
    Omm(OmmError),
    #[error("{XML_NOT_READ}")]
    Xml,
}

const XML_NOT_READ: &str = "an XML file (OMM in XML?), which is not read: give the elements as TLE, OMM KVN or OMM JSON (CCSDS 502.0-B-3 defines the same keywords in each)";

/// Read an element file (TLE, OMM JSON or OMM KVN; detected by [`detect_format`]).
pub fn load_elements(path: &Path) -> Result<Vec<ElementSet>, OrbitInputError> {
    let text = crate::infile::read_text(path).map_err(|source| OrbitInputError::Io {
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
            source: Box::new(source),
        },
        ParseError::Xml => OrbitInputError::Xml {
            path: path.to_path_buf(),
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
    #[error("no element set matches '{query}' (by catalog number or name; the file holds {held})")]
    NoMatch {
        query: String,
        /// The satellites the file holds, by label (a few, then how many more).
        held: String,
    },
    #[error("'{query}' matches {} element sets: {}", .candidates.len(), .candidates.join(", "))]
    Ambiguous {
        query: String,
        candidates: Vec<String>,
    },
}

/// The satellites of `sets` for an error, each once by label: up to five, then how many more.
fn held(sets: &[ElementSet]) -> String {
    let mut ids: Vec<u64> = Vec::new();
    let mut labels: Vec<String> = Vec::new();
    for s in sets {
        if !ids.contains(&s.norad_id) {
            ids.push(s.norad_id);
            labels.push(s.label());
        }
    }
    let more = labels.len().saturating_sub(5);
    labels.truncate(5);
    match more {
        0 => labels.join(", "),
        n => format!("{} and {n} more", labels.join(", ")),
    }
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
    let hits = matching(sets, q);
    match hits.len() {
        0 => Err(SelectError::NoMatch {
            query: q.to_string(),
            held: held(sets),
        }),
        1 => Ok(&sets[hits[0]]),
        _ => Err(SelectError::Ambiguous {
            query: q.to_string(),
            candidates: hits.iter().map(|&i| sets[i].label()).collect(),
        }),
    }
}

/// Indices of the sets matching `q` (trimmed): by catalog number if `q` is an integer that
/// some set has, else by name (case-insensitive, exact after trimming).
fn matching(sets: &[ElementSet], q: &str) -> Vec<usize> {
    let mut hits: Vec<usize> = Vec::new();
    if let Ok(id) = q.parse::<u64>() {
        hits.extend((0..sets.len()).filter(|&i| sets[i].norad_id == id));
    }
    if hits.is_empty() {
        let key = |n: &str| crate::infile::normal_form(n.trim()).to_lowercase();
        let ql = key(q);
        hits.extend(
            (0..sets.len()).filter(|&i| sets[i].name.as_deref().is_some_and(|n| key(n) == ql)),
        );
    }
    hits
}

/// Why [`select_for_window`] chose its element set.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SelectionRule {
    /// Only one set matched.
    Only,
    /// Several sets of the satellite: the latest with epoch at or before the window start.
    LatestAtOrBeforeStart,
    /// Several sets of the satellite, all after the window start: the earliest.
    EarliestAfterStart,
}

/// Which element set [`select_for_window`] chose and why, for callers to report.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Selection {
    /// Index of the chosen set in the slice given.
    pub index: usize,
    /// Epoch of the chosen set.
    pub epoch: DateTime<Utc>,
    /// Number of sets that matched the satellite.
    pub candidates: usize,
    /// The rule that chose it.
    pub rule: SelectionRule,
}

/// Choose one element set for a planning window starting at `window_start`. Matching is as in
/// [`select`]; with no query, all sets must belong to one satellite. When several sets of the
/// same catalog number match (an element-set history), the latest set with epoch at or before
/// `window_start` is chosen, or, if all are later, the earliest; of sets with equal epochs the
/// last in the file wins (common practice: a later entry supersedes). Matches of different
/// catalog numbers are [`SelectError::Ambiguous`].
pub fn select_for_window(
    sets: &[ElementSet],
    query: Option<&str>,
    window_start: DateTime<Utc>,
) -> Result<(ElementSet, Selection), SelectError> {
    if sets.is_empty() {
        return Err(SelectError::Empty);
    }
    let (hits, q) = match query {
        Some(q) => (matching(sets, q.trim()), q.trim().to_string()),
        None => ((0..sets.len()).collect(), String::new()),
    };
    let Some(&first) = hits.first() else {
        return Err(SelectError::NoMatch {
            query: q,
            held: held(sets),
        });
    };
    if hits
        .iter()
        .any(|&i| sets[i].norad_id != sets[first].norad_id)
    {
        if query.is_none() {
            return Err(SelectError::NoneChosen { count: sets.len() });
        }
        let mut candidates: Vec<String> = hits.iter().map(|&i| sets[i].label()).collect();
        candidates.dedup();
        return Err(SelectError::Ambiguous {
            query: q,
            candidates,
        });
    }
    let before = hits
        .iter()
        .copied()
        .filter(|&i| sets[i].epoch <= window_start)
        .max_by_key(|&i| (sets[i].epoch, i));
    let (index, rule) = match before {
        _ if hits.len() == 1 => (first, SelectionRule::Only),
        Some(i) => (i, SelectionRule::LatestAtOrBeforeStart),
        None => {
            // All later than the window start: the earliest (last in file among equals).
            let i = hits
                .iter()
                .copied()
                .min_by_key(|&i| (sets[i].epoch, std::cmp::Reverse(i)))
                .unwrap_or(first);
            (i, SelectionRule::EarliestAfterStart)
        }
    };
    Ok((
        sets[index].clone(),
        Selection {
            index,
            epoch: sets[index].epoch,
            candidates: hits.len(),
            rule,
        },
    ))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::timefmt::utc;

    /// A set of catalog `id` with epoch 2026-12-`day` 00:00 UTC (elements of examples/sat.tle).
    fn set(id: u64, name: &str, day: u32) -> ElementSet {
        let text = "1 99901U          26335.50000000  .00001200  00000-0  12000-3 0   127\n\
                    2 99901  97.5950 215.3000 0011500  90.0000 270.0000 15.05472000  1231\n";
        let mut s = tle::parse_tle(text).unwrap().remove(0);
        s.norad_id = id;
        s.name = Some(name.to_string());
        s.epoch = utc(2026, 12, day, 0, 0, 0);
        s
    }

    /// An unmatched query lists each satellite of the file once (a history holds one satellite
    /// many times), five at most and then how many more.
    #[test]
    fn an_unmatched_query_lists_each_satellite_once() {
        let history = vec![set(99901, "W", 1), set(99901, "W", 3), set(99902, "V", 4)];
        let e = select(&history, Some("nothing")).unwrap_err().to_string();
        assert!(e.ends_with("the file holds W (99901), V (99902))"), "{e}");
        let many: Vec<ElementSet> = (0..7).map(|k| set(99910 + k, "S", 1)).collect();
        let e = select(&many, Some("nothing")).unwrap_err().to_string();
        assert!(e.contains("S (99914) and 2 more)"), "{e}");
        assert!(!e.contains("99915"), "{e}");
    }

    #[test]
    fn history_picks_latest_before_window() {
        let sets = vec![
            set(99901, "W", 1),
            set(99901, "W", 5),
            set(99901, "W", 3),
            set(99902, "V", 4),
        ];
        let (chosen, why) =
            select_for_window(&sets, Some("99901"), utc(2026, 12, 4, 0, 0, 0)).unwrap();
        assert_eq!(why.index, 2);
        assert_eq!(chosen.epoch, utc(2026, 12, 3, 0, 0, 0));
        assert_eq!(why.candidates, 3);
        assert_eq!(why.rule, SelectionRule::LatestAtOrBeforeStart);
        // At exactly an epoch: that set.
        let (_, why) = select_for_window(&sets, Some("W"), utc(2026, 12, 5, 0, 0, 0)).unwrap();
        assert_eq!(
            (why.index, why.rule),
            (1, SelectionRule::LatestAtOrBeforeStart)
        );
        // Before all: the earliest.
        let (_, why) = select_for_window(&sets, Some("99901"), utc(2026, 11, 1, 0, 0, 0)).unwrap();
        assert_eq!(
            (why.index, why.rule),
            (0, SelectionRule::EarliestAfterStart)
        );
        // The old function still calls the history ambiguous.
        assert!(matches!(
            select(&sets, Some("99901")),
            Err(SelectError::Ambiguous { .. })
        ));
    }

    #[test]
    fn window_selection_errors_and_single() {
        let t = utc(2026, 12, 4, 0, 0, 0);
        let sets = vec![set(99901, "A", 1), set(99902, "A", 2)];
        assert!(matches!(
            select_for_window(&sets, Some("a"), t),
            Err(SelectError::Ambiguous { .. })
        ));
        assert_eq!(
            select_for_window(&sets, None, t).unwrap_err(),
            SelectError::NoneChosen { count: 2 }
        );
        let e = select_for_window(&sets, Some("x"), t).unwrap_err();
        assert!(matches!(e, SelectError::NoMatch { .. }));
        // the message lists what the file holds, each satellite once
        let held = sets.iter().map(|s| s.label()).collect::<Vec<_>>();
        let text = e.to_string();
        assert!(
            held.iter().all(|l| text.matches(l.as_str()).count() == 1),
            "{text}"
        );
        assert_eq!(
            select_for_window(&[], None, t).unwrap_err(),
            SelectError::Empty
        );
        let (s, why) = select_for_window(&sets, Some("99902"), t).unwrap();
        assert_eq!(
            (s.norad_id, why.rule, why.candidates),
            (99902, SelectionRule::Only, 1)
        );
        // No query, one satellite's history: chosen by epoch.
        let hist = vec![set(99901, "A", 1), set(99901, "A", 2)];
        let (_, why) = select_for_window(&hist, None, t).unwrap();
        assert_eq!(why.index, 1);
    }

    #[test]
    fn bom_does_not_hide_json() {
        assert_eq!(detect_format("\u{feff}[{}]"), ElementFormat::OmmJson);
    }
}
