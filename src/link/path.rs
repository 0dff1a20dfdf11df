//! Free-space path loss (Friis transmission equation).
//!
//! Source: H. T. Friis, "A Note on a Simple Transmission Formula", Proc. IRE 34
//! (1946) 254-256; in dB form L_fs = 20 log10(4 pi d / lambda).
//! Valid in the far field (d >> lambda) for any positive distance and frequency.

use crate::units::SPEED_OF_LIGHT_M_S;

/// Errors of the path-loss function.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
pub enum PathError {
    #[error("range must be positive and finite, got {range_km} km")]
    Range { range_km: f64 },
    #[error("frequency must be positive and finite, got {frequency_hz} Hz")]
    Frequency { frequency_hz: f64 },
}

/// Free-space path loss in dB: L_fs = 20 log10(4 pi d / lambda), lambda = c / f.
pub fn free_space_loss_db(range_km: f64, frequency_hz: f64) -> Result<f64, PathError> {
    if !(range_km > 0.0 && range_km.is_finite()) {
        return Err(PathError::Range { range_km });
    }
    if !(frequency_hz > 0.0 && frequency_hz.is_finite()) {
        return Err(PathError::Frequency { frequency_hz });
    }
    Ok(free_space_loss_constant_db(frequency_hz) + 20.0 * range_km.log10())
}

/// The range-independent part of the loss: 20 log10(4 pi f * 1000 m / c), so that
/// L_fs = constant + 20 log10(range_km). Used by the prepared budget.
#[inline]
pub(crate) fn free_space_loss_constant_db(frequency_hz: f64) -> f64 {
    // 20 log10(4 pi (1 km) / lambda) = 20 log10(4 pi * 1000 * f / c)
    20.0 * (4.0 * std::f64::consts::PI * 1000.0 * frequency_hz / SPEED_OF_LIGHT_M_S).log10()
}
