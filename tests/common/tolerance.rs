//! Test tolerances, each with the reason for its size.

// --- orbit/geometry ---

/// SGP4 position vs the published verification output (tcppver.out, Vallado et al. 2006,
/// AIAA 2006-6753), km. The file prints 8 decimals; python-sgp4 reproduces it within 2e-7
/// (REFERENCES.md §10). The printed rounding is 5e-9 km; we observe at most 5e-9 km. 1e-6 km
/// (1 mm) leaves room for floating-point order differences and is far below SGP4's ~1 km accuracy.
pub const SGP4_POSITION_KM: f64 = 1e-6;
/// SGP4 velocity vs tcppver.out, km/s (9 decimals printed, observed <= 5e-10 km/s; 1e-5 m/s).
pub const SGP4_VELOCITY_KM_S: f64 = 1e-8;

/// Look angles vs Skyfield, deg (required accuracy of the issue: 0.02 deg).
pub const LOOK_ANGLE_DEG: f64 = 0.02;
/// Slant range vs Skyfield, km (required: 0.1 km).
pub const RANGE_KM: f64 = 0.1;
/// Range rate vs Skyfield, km/s (1 m/s: Doppler at 8 GHz within 27 Hz).
pub const RANGE_RATE_KM_S: f64 = 1e-3;
/// Elevation rate vs Skyfield, deg/s (1e-4 deg/s moves a predicted crossing by < 0.01 s
/// for the LEO rates of ~0.05-0.8 deg/s that matter; it feeds only the Newton steps).
pub const ELEVATION_RATE_DEG_S: f64 = 1e-4;
/// AOS/TCA/LOS vs Skyfield, s (required: 1 s).
pub const PASS_TIME_S: f64 = 1.0;
/// Maximum elevation vs Skyfield, deg (required: 0.05 deg).
pub const MAX_ELEVATION_DEG: f64 = 0.05;
/// AOS/LOS vs a brute-force 1 s scan, s: the scan brackets each crossing within 1 s.
pub const SCAN_TIME_S: f64 = 1.0;
