//! Test tolerances, one place, each with the reason for its size.

// --- link/noise ---

/// Accuracy required against published references for identical inputs (brief: 2 % or 0.05 dB).
pub const REF_DB: f64 = 0.05;
/// Relative accuracy against published references (brief: 2 %).
pub const REF_REL: f64 = 0.02;
/// Same closed form evaluated two ways: only floating-point rounding separates them.
pub const IDENTITY_DB: f64 = 1e-9;
/// Relative agreement with scipy.special (both ~1e-15; our erfc series/continued fraction ~1e-13).
pub const SCIPY_REL: f64 = 1e-12;
/// DVB-S2 Table 13 Es/N0 is printed with 2 decimals: half a unit in the last place.
pub const TABLE13_ESN0_DB: f64 = 0.005;
/// Spectral efficiencies are printed with 6 decimals: half a unit in the last place.
pub const ETA_ABS: f64 = 5e-7;
/// Check values printed with 4 decimals (K): half a unit in the last place plus rounding.
pub const CHECK_4DP: f64 = 6e-5;
/// REFERENCES §2 BI-AWGN bounds are printed with 3 decimals; our quadrature/bisection adds < 1e-4 dB.
pub const BIAWGN_DB: f64 = 1e-3;
/// "From memory" coding thresholds: plausibility band only (REFERENCES §2: +-0.5 dB).
pub const FROM_MEMORY_BAND_DB: f64 = 0.5;
