//! Loading what a plan starts from: the satellite's element set (chosen from its file) and the
//! name the outputs give it. Shared by the planner and the geometry commands.

use crate::orbit::{
    load_elements, select, ElementSet, OrbitInputError, PropagationError, Propagator, SelectError,
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

/// Load an element file and choose one satellite (`sat`: catalog number or name; optional when the
/// file holds one set); SGP4 is initialized to check the elements.
pub fn load_satellite(
    path: &Path,
    sat: Option<&str>,
) -> Result<(ElementSet, Propagator), SatelliteError> {
    let sets = load_elements(path)?;
    if sets.is_empty() {
        return Err(SatelliteError::Empty {
            path: path.to_path_buf(),
        });
    }
    let set = select(&sets, sat)
        .map_err(|source| SatelliteError::Select {
            path: path.to_path_buf(),
            source,
        })?
        .clone();
    let prop = Propagator::new(&set).map_err(|source| SatelliteError::Propagator {
        path: path.to_path_buf(),
        label: set.label(),
        source,
    })?;
    Ok((set, prop))
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
