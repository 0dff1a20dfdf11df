//! Channel capacity: Shannon's AWGN capacity, the Shannon-limit Eb/N0 for a
//! spectral efficiency, and the binary-input AWGN (BI-AWGN) limit for a code rate.
//!
//! Sources: C. E. Shannon, "A Mathematical Theory of Communication", Bell Syst.
//! Tech. J. 27 (1948) (C = B log2(1 + S/N)); the BI-AWGN mutual information is the
//! standard integral, e.g. Richardson & Urbanke, *Modern Coding Theory* (2008), ch. 4.
//! All functions are valid for any positive finite input; other inputs are errors.
//!
//! **One bandwidth for every Shannon figure.** The project's convention: B is the bandwidth the
//! signal occupies, B = Rs (1 + roll-off) for one rate (for the plan's bound over a pass, the
//! band the modem may fill: `modem.max_bandwidth_hz`, else the widest option's occupied
//! bandwidth). The capacity is C = B log2(1 + C/(N0 B)), the spectral efficiency is
//! eta = Rb / B (bit/s/Hz), and the Shannon gap of a rate is its required Eb/N0 minus
//! (2^eta - 1)/eta at that eta. A rate R therefore sits exactly its gap (in Eb/N0) from the
//! capacity line: at Eb/N0 = (2^eta - 1)/eta the capacity over B equals R. With roll-off 0,
//! B = Rs and eta is the scheme's information bits per symbol.

use crate::units::ratio_to_db;

/// Errors of the capacity functions (each carries the offending value).
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
pub enum CapacityError {
    #[error("bandwidth must be positive and finite, got {value_hz} Hz")]
    Bandwidth { value_hz: f64 },
    #[error("signal-to-noise ratio must be non-negative and finite, got {value}")]
    Snr { value: f64 },
    #[error("spectral efficiency must be positive and finite, got {value} bit/symbol")]
    SpectralEfficiency { value: f64 },
    #[error("code rate must be in (0, 1), got {value}")]
    CodeRate { value: f64 },
}

/// Shannon capacity in bit/s of an AWGN channel of bandwidth `bandwidth_hz` at
/// linear signal-to-noise ratio `snr` (Shannon 1948): C = B log2(1 + S/N).
pub fn shannon_capacity_bps(bandwidth_hz: f64, snr: f64) -> Result<f64, CapacityError> {
    if !(bandwidth_hz > 0.0 && bandwidth_hz.is_finite()) {
        return Err(CapacityError::Bandwidth {
            value_hz: bandwidth_hz,
        });
    }
    if !(snr >= 0.0 && snr.is_finite()) {
        return Err(CapacityError::Snr { value: snr });
    }
    Ok(shannon_capacity_unchecked(bandwidth_hz, snr))
}

#[inline]
pub(crate) fn shannon_capacity_unchecked(bandwidth_hz: f64, snr: f64) -> f64 {
    // C = B log2(1 + S/N)
    bandwidth_hz * snr.ln_1p() / std::f64::consts::LN_2
}

/// Shannon-limit Eb/N0 (dB) for spectral efficiency `eta` = R / B (bit/s per Hz of the
/// bandwidth B of the capacity, see the module note): Eb/N0 >= (2^eta - 1) / eta.
/// Tends to ln 2 = -1.59 dB as eta -> 0.
pub fn shannon_limit_ebn0_db(eta: f64) -> Result<f64, CapacityError> {
    if !(eta > 0.0 && eta.is_finite()) {
        return Err(CapacityError::SpectralEfficiency { value: eta });
    }
    Ok(shannon_limit_unchecked(eta))
}

#[inline]
pub(crate) fn shannon_limit_unchecked(eta: f64) -> f64 {
    // Eb/N0_min = (2^eta - 1) / eta, written with expm1 for small eta
    ratio_to_db((eta * std::f64::consts::LN_2).exp_m1() / eta)
}

/// Gap (dB) of a scheme needing `required_ebn0_db` at spectral efficiency `eta` = R / B
/// to the Shannon limit at the same efficiency: required - (2^eta - 1)/eta in dB.
pub fn shannon_gap_db(required_ebn0_db: f64, eta: f64) -> Result<f64, CapacityError> {
    Ok(required_ebn0_db - shannon_limit_ebn0_db(eta)?)
}

/// Mutual information (bit/channel use) of BPSK over real AWGN at Es/N0 (linear):
/// I = 1 - E[log2(1 + exp(-2y/sigma^2))], y ~ N(1, sigma^2), sigma^2 = 1/(2 Es/N0).
/// Composite Simpson rule over y in 1 +- 12 sigma (truncation < 1e-30).
pub fn bi_awgn_mutual_information(esn0: f64) -> f64 {
    let sigma2 = 1.0 / (2.0 * esn0);
    let sigma = sigma2.sqrt();
    let n = 4000usize;
    let (a, b) = (1.0 - 12.0 * sigma, 1.0 + 12.0 * sigma);
    let h = (b - a) / n as f64;
    let norm = 1.0 / (sigma * (2.0 * std::f64::consts::PI).sqrt());
    let integrand = |y: f64| {
        let t = 2.0 * y / sigma2;
        // log2(1 + e^-t), numerically stable for both signs of t
        let l = if t > 0.0 {
            (-t).exp().ln_1p()
        } else {
            -t + t.exp().ln_1p()
        } / std::f64::consts::LN_2;
        norm * (-(y - 1.0) * (y - 1.0) / (2.0 * sigma2)).exp() * l
    };
    let mut sum = integrand(a) + integrand(b);
    for i in 1..n {
        let w = if i % 2 == 1 { 4.0 } else { 2.0 };
        sum += w * integrand(a + i as f64 * h);
    }
    1.0 - sum * h / 3.0
}

/// Eb/N0 (dB) at which the BI-AWGN capacity equals code rate `rate`: no binary
/// code of that rate on BPSK/QPSK can work below it. Bisection to 1e-6 dB.
pub fn bi_awgn_limit_ebn0_db(rate: f64) -> Result<f64, CapacityError> {
    if !(rate > 0.0 && rate < 1.0) {
        return Err(CapacityError::CodeRate { value: rate });
    }
    let (mut lo, mut hi) = (-30.0f64, 30.0f64); // Es/N0 in dB
    while hi - lo > 1e-7 {
        let mid = 0.5 * (lo + hi);
        if bi_awgn_mutual_information(crate::units::db_to_ratio(mid)) < rate {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    // Eb/N0 = Es/N0 / r
    Ok(0.5 * (lo + hi) - ratio_to_db(rate))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn capacity_of_unit_snr_is_bandwidth() {
        assert!((shannon_capacity_bps(1e6, 1.0).unwrap() - 1e6).abs() < 1e-6);
        assert!(shannon_capacity_bps(-1.0, 1.0).is_err());
        assert!(shannon_limit_ebn0_db(0.0).is_err());
        // eta = 1: (2 - 1)/1 = 1 -> 0 dB
        assert!(shannon_limit_ebn0_db(1.0).unwrap().abs() < 1e-12);
    }
}
