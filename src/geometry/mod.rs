//! Station-relative geometry: look angles ([`look`]), azimuth-dependent elevation masks
//! ([`horizon`]) and pass search ([`passes`]).
//!
//! Frames: the satellite state comes Earth-fixed from [`crate::orbit::frames`] (UT1 = UTC, no
//! polar motion); the station is on the WGS-84 ellipsoid (NIMA TR8350.2). Angles are geometric
//! (no refraction).

pub mod body_track;
mod bounded_trig;
pub mod horizon;
pub mod look;
pub mod moon;
pub mod mount;
pub mod passes;
pub mod slant;
pub mod sun;

pub use horizon::{HorizonError, HorizonMask};
pub use look::{doppler_hz, Look, Observer, ObserverError};
pub use mount::{AxisRates, Mount, MountKind};
pub use passes::{find_passes, track, Pass, PassSearch, Track};
