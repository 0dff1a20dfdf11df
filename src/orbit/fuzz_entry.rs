//! Fuzz entry points: the bodies of the cargo-fuzz targets in `fuzz/` (`tle`, `omm_json`,
//! `omm_kvn`) and of the stable-toolchain corpus replay test `tests/fuzz_replay.rs`, so both run
//! the same code.
//!
//! Each takes arbitrary bytes, parses them (invalid UTF-8 is skipped, as [`super::load_elements`]
//! would refuse it), and for every parsed set (at most [`MAX_SETS`]) starts SGP4 and propagates
//! it to a few times around the epoch, then turns one state Earth-fixed. Errors are expected
//! and ignored; the property under test is that no input panics.

use super::elements::ElementSet;
use super::propagate::Propagator;
use super::{omm, tle};

/// Most sets propagated per input (keeps each fuzz run short).
pub const MAX_SETS: usize = 8;

/// Minutes from epoch propagated for each set: epoch, one LEO period, a day before and after,
/// a week after.
pub const PROPAGATION_MINUTES: [f64; 5] = [0.0, 95.0, -1440.0, 1440.0, 10_080.0];

/// Fuzz target `tle`: [`tle::parse_tle`] then SGP4.
pub fn tle(data: &[u8]) {
    if let Ok(text) = std::str::from_utf8(data) {
        if let Ok(sets) = tle::parse_tle(text) {
            exercise(&sets);
        }
    }
}

/// Fuzz target `omm_json`: [`omm::parse_omm_json`] then SGP4.
pub fn omm_json(data: &[u8]) {
    if let Ok(text) = std::str::from_utf8(data) {
        if let Ok(sets) = omm::parse_omm_json(text) {
            exercise(&sets);
        }
    }
}

/// Fuzz target `omm_kvn`: [`omm::parse_omm_kvn`] then SGP4.
pub fn omm_kvn(data: &[u8]) {
    if let Ok(text) = std::str::from_utf8(data) {
        if let Ok(sets) = omm::parse_omm_kvn(text) {
            exercise(&sets);
        }
    }
}

/// Start SGP4 for each set and propagate it; errors are ignored.
fn exercise(sets: &[ElementSet]) {
    for set in sets.iter().take(MAX_SETS) {
        let Ok(p) = Propagator::new(set) else {
            continue;
        };
        for minutes in PROPAGATION_MINUTES {
            let _ = p.propagate_minutes(minutes);
        }
        let _ = p.ecef_at(&set.epoch);
    }
}
