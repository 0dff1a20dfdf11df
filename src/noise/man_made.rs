//! Man-made noise of a station's surroundings: the median external noise figure of
//! ITU-R P.372 §5, Table 1 (the categories of its Fig. 10): `Fam = c − d log10 f` (dB above
//! k T0 b, f in MHz), as an antenna noise temperature `Ta = T0 10^(Fam/10)` with T0 = 290 K
//! (P.372 eq. (3) form). Coefficients as in ITU-R Study Group 3's own P.372 code
//! (docs/REFERENCES.md §8, status C).
//!
//! Validity: 0.3 MHz to 250 MHz (the range of the curves); outside it [`man_made_noise`] answers
//! with the curve extrapolated and says so, for the caller to warn. The values are medians over
//! locations and time; the decile deviations of Table 2 are several dB.

/// Reference temperature T0 of the noise figure, K.
pub const T0_K: f64 = 290.0;

/// The frequency range of the Table 1 curves, MHz.
pub const FREQUENCY_RANGE_MHZ: (f64, f64) = (0.3, 250.0);

/// Man-made noise environment of a station (ITU-R P.372 Table 1).
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Environment {
    City,
    Residential,
    Rural,
    QuietRural,
}

impl Environment {
    /// `(c, d)` of `Fam = c − d log10 f_MHz` (P.372 Table 1).
    pub fn coefficients(self) -> (f64, f64) {
        match self {
            Environment::City => (76.8, 27.7),
            Environment::Residential => (72.5, 27.7),
            Environment::Rural => (67.2, 27.7),
            Environment::QuietRural => (53.6, 28.6),
        }
    }
}

/// Median man-made noise at `frequency_hz`: the noise figure Fam (dB above k T0 b), the antenna
/// temperature it stands for (K), and whether the frequency lies outside the curves' range.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ManMadeNoise {
    pub fam_db: f64,
    pub temperature_k: f64,
    pub extrapolated: bool,
}

/// Man-made noise of `environment` at `frequency_hz` (P.372 Table 1).
pub fn man_made_noise(environment: Environment, frequency_hz: f64) -> ManMadeNoise {
    let f_mhz = frequency_hz / 1e6;
    let (c, d) = environment.coefficients();
    // Fam = c − d log10 f  (dB above k T0 b)
    let fam_db = c - d * f_mhz.log10();
    // Ta = T0 10^(Fam/10)
    ManMadeNoise {
        fam_db,
        temperature_k: T0_K * 10f64.powf(fam_db / 10.0),
        extrapolated: !(FREQUENCY_RANGE_MHZ.0..=FREQUENCY_RANGE_MHZ.1).contains(&f_mhz),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn table_one_values() {
        // ITU-R P.372 Table 1 (docs/REFERENCES.md §8), worked by hand at 100 MHz (log10 f = 2):
        // city 76.8 − 55.4 = 21.4 dB, quiet rural 53.6 − 57.2 = −3.6 dB.
        let city = man_made_noise(Environment::City, 100e6);
        assert!((city.fam_db - 21.4).abs() < 1e-9);
        // Ta = 290 · 10^2.14 = 40 031 K
        assert!((city.temperature_k - 290.0 * 10f64.powf(2.14)).abs() < 1e-6);
        assert!((city.temperature_k - 40_031.0).abs() < 1.0);
        let quiet = man_made_noise(Environment::QuietRural, 100e6);
        assert!((quiet.fam_db + 3.6).abs() < 1e-9);
        assert!(!quiet.extrapolated);
        // 437.5 MHz lies above the curves: extrapolated, and said so.
        assert!(man_made_noise(Environment::Rural, 437.5e6).extrapolated);
        // The order of the categories holds at every frequency of the curves.
        for f in [0.3e6, 1e6, 30e6, 250e6] {
            let t = |e| man_made_noise(e, f).temperature_k;
            assert!(t(Environment::City) > t(Environment::Residential));
            assert!(t(Environment::Residential) > t(Environment::Rural));
            assert!(t(Environment::Rural) > t(Environment::QuietRural));
        }
    }
}
