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

/// The note saying which set of an element-set history was chosen (None when only one set of
/// the satellite was in the file).
pub fn selection_note(set: &ElementSet, selection: &Selection) -> Option<String> {
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

/// The element-age warning, if any: more than 7 days between the epoch and either end of the
/// window warns, more than 30 days warns strongly. Along-track error of a LEO element set grows by
/// roughly 1-3 km a day (common practice).
pub fn element_age_warning(
    set: &ElementSet,
    start: chrono::DateTime<chrono::Utc>,
    end: chrono::DateTime<chrono::Utc>,
) -> Option<String> {
    let days =
        |t: chrono::DateTime<chrono::Utc>| ((t - set.epoch).num_seconds() as f64 / 86400.0).abs();
    let worst = days(start).max(days(end));
    let epoch = crate::timefmt::format_ms(&set.epoch);
    if worst > 30.0 {
        Some(format!(
            "STALE ELEMENTS: the window reaches {worst:.1} days from the epoch of {} ({epoch}); along-track errors of several tens of km or more are likely: get fresh elements before relying on these times",
            set.label(),
        ))
    } else if worst > 7.0 {
        Some(format!(
            "the window reaches {worst:.1} days from the epoch of {} ({epoch}); a LEO element set drifts by roughly 1-3 km a day along track (common practice)",
            set.label(),
        ))
    } else {
        None
    }
}
