//! Loading what a plan starts from: the satellite's element set (chosen from its file) and the
//! name the outputs give it. Shared by the planner and the geometry commands.

use crate::orbit::{
    load_elements, select_for_window, ElementSet, OrbitInputError, PropagationError, Propagator,
    SelectError, Selection, SelectionRule,
};
use std::path::{Path, PathBuf};

/// Error loading the satellite.
#[derive(Debug, thiserror::Error)]
pub enum SatelliteError {
    #[error(transparent)]
    File(#[from] OrbitInputError),
    #[error("{path}: no element sets in the file")]
    Empty { path: PathBuf },
    #[error("{path}: {source}")]
    Select {
        path: PathBuf,
        #[source]
        source: SelectError,
    },
    #[error("{path}: {label}: {source}")]
    Propagator {
        path: PathBuf,
        label: String,
        #[source]
        source: PropagationError,
    },
}

/// Load an element file and choose one element set for a window starting at `window_start`
/// (`sat`: catalog number or name; optional when the file holds one satellite). An element-set
/// history (several sets of one satellite) gives the latest set at or before the window start, or
/// the earliest if all are later ([`select_for_window`]); the [`Selection`] says which and why.
/// SGP4 is initialized to check the elements.
pub fn load_satellite(
    path: &Path,
    sat: Option<&str>,
    window_start: chrono::DateTime<chrono::Utc>,
) -> Result<(ElementSet, Propagator, Selection), SatelliteError> {
    let sets = load_elements(path)?;
    if sets.is_empty() {
        return Err(SatelliteError::Empty {
            path: path.to_path_buf(),
        });
    }
    let (set, selection) =
        select_for_window(&sets, sat, window_start).map_err(|source| SatelliteError::Select {
            path: path.to_path_buf(),
            source,
        })?;
    let prop = Propagator::new(&set).map_err(|source| SatelliteError::Propagator {
        path: path.to_path_buf(),
        label: set.label(),
        source,
    })?;
    Ok((set, prop, selection))
}

/// The notes on the element set chosen: which set of an element-set history it is (none when
/// only one set of the satellite was in the file), and the keywords of its OMM that were not
/// OMM keywords and were ignored.
pub fn element_notes(set: &ElementSet, selection: &Selection) -> Vec<String> {
    selection_note(set, selection)
        .into_iter()
        .chain(ignored_keywords_note(set))
        .collect()
}

/// The keywords of the set's OMM outside CCSDS 502.0-B-3 that were ignored: up to eight, then how
/// many more.
fn ignored_keywords_note(set: &ElementSet) -> Option<String> {
    let keys = &set.ignored_keywords;
    if keys.is_empty() {
        return None;
    }
    let shown = keys.len().min(8);
    let more = match keys.len() - shown {
        0 => String::new(),
        n => format!(" and {n} more"),
    };
    // A provider's field names are short; a long key is cut, so that it cannot flood the notes.
    let cut = |k: &String| match k.char_indices().nth(40) {
        Some((i, _)) => format!("{}...", &k[..i]),
        None => k.clone(),
    };
    Some(format!(
        "element set of {}: {} outside CCSDS 502.0-B-3 ignored (not read): {}{more}",
        set.label(),
        crate::engfmt::counted(keys.len(), "keyword"),
        keys[..shown].iter().map(cut).collect::<Vec<_>>().join(", "),
    ))
}

/// The note saying which set of an element-set history was chosen (None when only one set of
/// the satellite was in the file).
fn selection_note(set: &ElementSet, selection: &Selection) -> Option<String> {
    let rule = match selection.rule {
        SelectionRule::Only => return None,
        SelectionRule::LatestAtOrBeforeStart => "the latest at or before the window start",
        SelectionRule::EarliestAfterStart => {
            "the earliest: every set of the file is later than the window start"
        }
    };
    Some(format!(
        "element set chosen: epoch {}, 1 of {} sets of {}: {rule}",
        crate::timefmt::format_ms(&selection.epoch),
        selection.candidates,
        set.norad_id,
    ))
}

/// The satellite's name for outputs: its name, or its catalog number.
pub fn satellite_name(set: &ElementSet) -> String {
    set.name.clone().unwrap_or_else(|| set.norad_id.to_string())
}

/// Beyond this many days between the element epoch and either end of the window, planning is
/// refused unless the caller allows stale elements: SGP4 errors by then are hundreds to
/// thousands of km for a LEO orbit, so pass times are off by minutes and the passes themselves
/// may not exist (common practice: element sets are refreshed daily to weekly).
pub const MAX_ELEMENT_AGE_DAYS: f64 = 90.0;

/// How far a window reaches from the element epoch.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ElementAge {
    /// Largest distance in days between the epoch and either end of the window.
    pub days: f64,
    /// Whether that farthest end lies before the epoch (a window before the elements).
    pub before_epoch: bool,
    /// A window of no length (one instant).
    pub instant: bool,
}

impl ElementAge {
    pub fn of(
        set: &ElementSet,
        start: chrono::DateTime<chrono::Utc>,
        end: chrono::DateTime<chrono::Utc>,
    ) -> ElementAge {
        let days =
            |t: chrono::DateTime<chrono::Utc>| (t - set.epoch).num_seconds() as f64 / 86400.0;
        let (a, b) = (days(start), days(end));
        let far = if a.abs() >= b.abs() { a } else { b };
        ElementAge {
            days: far.abs(),
            before_epoch: far < 0.0,
            instant: start == end,
        }
    }

    fn reach(&self, set: &ElementSet) -> String {
        format!(
            "{} {:.1} days {} the epoch of {} ({})",
            if self.instant {
                "the time is"
            } else {
                "the window reaches"
            },
            self.days,
            if self.before_epoch { "before" } else { "after" },
            set.label(),
            crate::timefmt::format_ms(&set.epoch),
        )
    }
}

/// Error: the window is too far from the element epoch (see [`MAX_ELEMENT_AGE_DAYS`]).
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("{reach}, more than the {MAX_ELEMENT_AGE_DAYS} days allowed: positions that far from the epoch are off by hundreds to thousands of km; get elements near the window")]
pub struct StaleElements {
    reach: String,
    pub days: f64,
}

/// Refuse a window more than [`MAX_ELEMENT_AGE_DAYS`] from the epoch unless `allow`.
pub fn check_element_age(
    set: &ElementSet,
    start: chrono::DateTime<chrono::Utc>,
    end: chrono::DateTime<chrono::Utc>,
    allow: bool,
) -> Result<(), StaleElements> {
    let age = ElementAge::of(set, start, end);
    if allow || age.days <= MAX_ELEMENT_AGE_DAYS {
        Ok(())
    } else {
        Err(StaleElements {
            reach: age.reach(set),
            days: age.days,
        })
    }
}

/// The orbit class the element-age warning is worded by.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum OrbitClass {
    /// Low Earth orbit: [`LEO_MIN_REV_PER_DAY`] or more.
    Leo,
    /// Near the geostationary arc ([`super::transits::near_geostationary`]).
    NearGeostationary,
    /// Any other (medium, highly elliptical, ...).
    Other,
}

/// Mean motion from which an orbit counts as low Earth orbit, rev/day: a period of 128 min or
/// less (common practice: the usual upper bound of LEO, about 2000 km altitude).
pub const LEO_MIN_REV_PER_DAY: f64 = 1440.0 / 128.0;

impl OrbitClass {
    pub fn of(set: &ElementSet) -> OrbitClass {
        if set.elements.mean_motion >= LEO_MIN_REV_PER_DAY {
            OrbitClass::Leo
        } else if super::transits::near_geostationary(set) {
            OrbitClass::NearGeostationary
        } else {
            OrbitClass::Other
        }
    }

    /// How the position error grows with the age, for a warning (7 to 30 days of age `d`).
    fn growth(self, d: f64) -> String {
        match self {
            OrbitClass::Leo => format!("errors grow by roughly 1-3 km a day along track for a LEO element set (common practice), so about {:.0}-{:.0} km now: check pass times against fresh elements", d, 3.0 * d),
            OrbitClass::NearGeostationary => "for a near-geostationary element set the error grows along the arc, and station-keeping manoeuvres since the epoch are not in the elements (common practice): check the satellite's position against fresh elements".into(),
            OrbitClass::Other => "the error grows with the age at a rate passbudget does not estimate for this orbit (neither LEO nor near-geostationary): check pass times against fresh elements".into(),
        }
    }
}

/// The element-age warning, if any, its words scaled with the age and worded by orbit class
/// ([`OrbitClass`]): more than 7 days between the epoch and either end of the window warns; more
/// than 30 days warns strongly; more than [`MAX_ELEMENT_AGE_DAYS`] (only reached when stale
/// elements were allowed) says the positions are meaningless. A LEO element set's along-track
/// error grows by roughly 1-3 km a day in its first week and faster after, with drag (common
/// practice); the growth is not modelled.
pub fn element_age_warning(
    set: &ElementSet,
    start: chrono::DateTime<chrono::Utc>,
    end: chrono::DateTime<chrono::Utc>,
) -> Option<String> {
    age_warning(set, &ElementAge::of(set, start, end))
}

/// [`element_age_warning`] for an age already worked out.
pub fn age_warning(set: &ElementSet, age: &ElementAge) -> Option<String> {
    let reach = age.reach(set);
    let d = age.days;
    if d > MAX_ELEMENT_AGE_DAYS {
        Some(format!("STALE ELEMENTS: {reach}, more than the {MAX_ELEMENT_AGE_DAYS} days passbudget accepts without --allow-stale-elements; errors of hundreds to thousands of km: pass times, geometry and every number that follows from them are not meaningful"))
    } else if d > 30.0 {
        Some(match OrbitClass::of(set) {
            OrbitClass::Leo => format!("STALE ELEMENTS: {reach}; errors of many tens to hundreds of km are likely for a LEO element set (pass times off by tens of seconds to minutes): get fresh elements before relying on these numbers"),
            class => format!("STALE ELEMENTS: {reach}; {}; get fresh elements before relying on these numbers", class.growth(d)),
        })
    } else if d > 7.0 {
        Some(format!("{reach}; {}", OrbitClass::of(set).growth(d)))
    } else {
        None
    }
}

/// Where propagation of a satellite first fails in a window (to 1 s), and the error there.
#[derive(Debug, Clone)]
pub struct PropagationStop {
    pub time: chrono::DateTime<chrono::Utc>,
    pub error: PropagationError,
}

impl PropagationStop {
    /// The one line that reports the stop, for every command:
    /// `<satellite>: propagation stops at <time> (<kind>: <what failed>); <consequence>`, with
    /// the time once, to the second (the first failing second, [`propagation_stop`]).
    pub fn message(&self, satellite: &str, consequence: &str) -> String {
        format!(
            "{satellite}: propagation stops at {} ({}: {}); {consequence}",
            crate::timefmt::format_ms(&self.time),
            self.kind(),
            self.what()
        )
    }

    /// What failed, without the time (the message gives it once).
    fn what(&self) -> String {
        let number = |x: f64| {
            if x.abs() < 1e6 {
                format!("{x:.6}")
            } else {
                format!("{x:.3e}")
            }
        };
        match &self.error {
            PropagationError::InvalidElements { reason, .. } => reason.clone(),
            PropagationError::Eccentricity { eccentricity, .. } => {
                format!("eccentricity {} outside [0, 1)", number(*eccentricity))
            }
            PropagationError::SemiLatusRectum { .. } => "negative semi-latus rectum".into(),
            PropagationError::Decayed { radius_km, .. } => format!(
                "orbit radius {} km below the Earth's radius",
                number(*radius_km)
            ),
            PropagationError::TimeOutOfRange { minutes, .. } => {
                format!("{} min from epoch not representable", number(*minutes))
            }
        }
    }

    /// What the error means, in a word or two.
    pub fn kind(&self) -> &'static str {
        match self.error {
            PropagationError::Decayed { .. } | PropagationError::SemiLatusRectum { .. } => "decay",
            PropagationError::Eccentricity { .. } => "decay or diverged elements",
            PropagationError::TimeOutOfRange { .. } => "time out of range",
            PropagationError::InvalidElements { .. } => "invalid elements",
        }
    }
}

/// The one time at which propagation first fails in a window starting at `start`, given the
/// errors that stopped each station's pass search (`None`: not stopped): bisection over whole
/// seconds from the window start up to the earliest stop any search met, so that `plan`,
/// `passes` and `track` (each sampling at its own times) report the same second. Each
/// search meets the failure at its own sample time, at or after the first failing second; the
/// satellite has one. None when no search was stopped.
pub fn propagation_stop(
    prop: &Propagator,
    start: chrono::DateTime<chrono::Utc>,
    stopped: &[Option<PropagationError>],
) -> Option<PropagationStop> {
    use crate::timefmt::{add_seconds, seconds_between};
    let at = |e: &PropagationError| match e.minutes() {
        Some(m) => add_seconds(&prop.epoch(), m * 60.0).max(start),
        None => start,
    };
    let earliest = stopped.iter().flatten().min_by_key(|e| at(e))?;
    if let Err(error) = prop.ecef_at(&start) {
        return Some(PropagationStop { time: start, error });
    }
    // Whole seconds from the start, so that every caller (whatever its own sampling) finds the
    // same second: the first whole second after the start at which propagation fails.
    let (mut good, mut bad) = (
        0u64,
        seconds_between(&start, &at(earliest)).ceil().max(1.0) as u64,
    );
    let mut error = earliest.clone();
    if prop.ecef_at(&add_seconds(&start, bad as f64)).is_ok() {
        // The search met the failure between whole seconds (it does not stay failed): report
        // the time the search met.
        return Some(PropagationStop {
            time: at(earliest),
            error,
        });
    }
    while bad - good > 1 {
        let mid = (good + bad) / 2;
        match prop.ecef_at(&add_seconds(&start, mid as f64)) {
            Ok(_) => good = mid,
            Err(e) => {
                bad = mid;
                error = e;
            }
        }
    }
    Some(PropagationStop {
        time: add_seconds(&start, bad as f64),
        error,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The note names up to eight ignored keys, each cut to 40 characters, then how many more.
    #[test]
    fn ignored_keywords_note_cuts_long_keys_and_counts_the_rest() {
        let mut set = crate::orbit::load_elements(Path::new("examples/sat.tle"))
            .unwrap()
            .remove(0);
        assert_eq!(ignored_keywords_note(&set), None);
        let long = "L".repeat(100);
        set.ignored_keywords = std::iter::once(long)
            .chain((1..=9).map(|i| format!("K{i}")))
            .collect();
        let note = ignored_keywords_note(&set).unwrap();
        assert!(
            note.contains(&format!(": {}..., K1, K2", "L".repeat(40))),
            "{note}"
        );
        assert!(!note.contains(&"L".repeat(41)), "{note}");
        assert!(
            note.contains("10 keywords") && note.ends_with("K7 and 2 more"),
            "{note}"
        );
    }
}
