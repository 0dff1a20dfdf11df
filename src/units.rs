//! Unit helpers and physical constants, each with its source.
//!
//! dB and linear values never mix silently: every conversion goes through
//! one of the functions here, and every quantity carries its unit in its name.

/// Boltzmann constant, J/K. Exact by definition (SI 2019 redefinition, BIPM SI Brochure 9th ed., Table 1).
pub const BOLTZMANN_J_PER_K: f64 = 1.380649e-23;

/// 10 log10(k) in dB(W/K/Hz): -228.59917 (computed from the exact value above) (from the exact value above).
pub const BOLTZMANN_DBW_PER_K_HZ: f64 = -228.599_167_173_217_67;

/// Speed of light in vacuum, m/s. Exact by definition (SI, BIPM SI Brochure 9th ed.).
pub const SPEED_OF_LIGHT_M_S: f64 = 299_792_458.0;

/// WGS-84 semi-major axis, km (NIMA TR8350.2, 3rd ed., Table 3.1).
pub const WGS84_A_KM: f64 = 6378.137;

/// WGS-84 flattening (NIMA TR8350.2, 3rd ed., Table 3.1).
pub const WGS84_F: f64 = 1.0 / 298.257_223_563;

/// Reference temperature for noise figure conversions, K (IEEE Std 145 / ITU-R P.372 use T0 = 290 K).
pub const T0_K: f64 = 290.0;

/// Cosmic microwave background temperature, K (Fixsen 2009, ApJ 707, 916: 2.72548 K; rounded to 2.725 K).
pub const CMB_K: f64 = 2.725;

/// Ratio (power) to dB: 10 log10(x).
#[inline]
pub fn ratio_to_db(ratio: f64) -> f64 {
    10.0 * ratio.log10()
}

/// dB to ratio (power): 10^(x/10).
#[inline]
pub fn db_to_ratio(db: f64) -> f64 {
    10f64.powf(db / 10.0)
}

/// Watts to dBW.
#[inline]
pub fn watts_to_dbw(watts: f64) -> f64 {
    ratio_to_db(watts)
}

/// dBW to watts.
#[inline]
pub fn dbw_to_watts(dbw: f64) -> f64 {
    db_to_ratio(dbw)
}

/// Noise figure (dB) to equivalent noise temperature (K) at T0 = 290 K: T = T0 (F - 1).
#[inline]
pub fn noise_figure_db_to_temperature_k(nf_db: f64) -> f64 {
    T0_K * (db_to_ratio(nf_db) - 1.0)
}

/// Equivalent noise temperature (K) to noise figure (dB) at T0 = 290 K: F = 1 + T/T0.
#[inline]
pub fn temperature_k_to_noise_figure_db(t_k: f64) -> f64 {
    ratio_to_db(1.0 + t_k / T0_K)
}

/// Wavelength in metres for a frequency in Hz.
#[inline]
pub fn wavelength_m(frequency_hz: f64) -> f64 {
    SPEED_OF_LIGHT_M_S / frequency_hz
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn boltzmann_db_matches_exact_constant() {
        assert!((ratio_to_db(BOLTZMANN_J_PER_K) - BOLTZMANN_DBW_PER_K_HZ).abs() < 1e-9);
    }

    #[test]
    fn db_round_trip() {
        for x in [1e-3, 0.5, 1.0, 2.0, 1e6] {
            assert!((db_to_ratio(ratio_to_db(x)) - x).abs() / x < 1e-12);
        }
        // 3 dB noise figure is about 288.6 K (common practice: "3 dB NF ~ 290 K").
        assert!((noise_figure_db_to_temperature_k(3.0) - 288.626_8).abs() < 1e-3);
    }
}
