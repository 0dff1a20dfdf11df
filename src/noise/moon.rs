//! The Moon as a radio source: the brightness temperature of its disk by phase.
//!
//! Source: about 140 K at new Moon to 280 K at full Moon, roughly independent of frequency
//! (attributed to Rec. ITU-R P.372-8 in a textbook's companion code, docs/REFERENCES.md §8,
//! status [C-code]; not found in the P.372 text here). The model is linear in the illuminated
//! fraction k (0 new, 1 full): `Tb = 140 K + 140 K · k` ([`moon_brightness_k`]); an interpolation
//! between the two stated end points, our choice. Independent cross-check of the level: the
//! phase-averaged disk brightness of about 215-221 K measured at 40-150 GHz (Xu et al. 2020,
//! ApJ 891, 134, as carried in their public model code; [C-code]) lies at the model's mid-phase
//! value, 210 K.
//!
//! Validity: microwave frequencies, about 1-100 GHz (from memory: below about 1 GHz the Moon's
//! brightness approaches its subsurface temperature, ~225 K, with little phase dependence; the
//! phase swing also lags the optical phase by a few days at centimetre wavelengths, which this
//! model ignores). [`moon_brightness_k`] returns an error outside [`FREQUENCY_RANGE_HZ`].
//! Uncertainty: tens of kelvin.

/// Brightness at new Moon, K (P.372-8 via docs/REFERENCES.md §8).
pub const NEW_MOON_K: f64 = 140.0;

/// Brightness at full Moon, K (P.372-8 via docs/REFERENCES.md §8).
pub const FULL_MOON_K: f64 = 280.0;

/// Mean lunar radius, km (IAU, from memory).
pub const MOON_RADIUS_KM: f64 = 1737.4;

/// Frequencies over which the phase model is offered, Hz.
pub const FREQUENCY_RANGE_HZ: (f64, f64) = (1e9, 100e9);

/// A lunar brightness that cannot be given.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
pub enum MoonNoiseError {
    #[error("frequency {frequency_hz} Hz is outside the Moon's brightness model (1-100 GHz)")]
    FrequencyOutOfRange { frequency_hz: f64 },
    #[error("illuminated fraction {fraction} must lie in [0, 1]")]
    Fraction { fraction: f64 },
}

/// Disk brightness temperature of the Moon (K) at illuminated fraction `illuminated_fraction`
/// (0 new, 1 full; [`crate::geometry::moon`] gives it) and `frequency_hz`.
pub fn moon_brightness_k(
    illuminated_fraction: f64,
    frequency_hz: f64,
) -> Result<f64, MoonNoiseError> {
    if !(FREQUENCY_RANGE_HZ.0..=FREQUENCY_RANGE_HZ.1).contains(&frequency_hz) {
        return Err(MoonNoiseError::FrequencyOutOfRange { frequency_hz });
    }
    if !(0.0..=1.0).contains(&illuminated_fraction) {
        return Err(MoonNoiseError::Fraction {
            fraction: illuminated_fraction,
        });
    }
    // Tb = T_new + (T_full − T_new) k
    Ok(NEW_MOON_K + (FULL_MOON_K - NEW_MOON_K) * illuminated_fraction)
}

/// Angular radius of the Moon seen from `distance_km` (topocentric), deg: asin(R_moon / d).
pub fn moon_angular_radius_deg(distance_km: f64) -> f64 {
    (MOON_RADIUS_KM / distance_km)
        .clamp(-1.0, 1.0)
        .asin()
        .to_degrees()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn end_points_and_range() {
        // 140 K new, 280 K full (P.372-8 via docs/REFERENCES.md §8)
        assert_eq!(moon_brightness_k(0.0, 8e9).unwrap(), 140.0);
        assert_eq!(moon_brightness_k(1.0, 32e9).unwrap(), 280.0);
        assert_eq!(moon_brightness_k(0.5, 20e9).unwrap(), 210.0);
        assert!(moon_brightness_k(0.5, 0.4e9).is_err());
        assert!(moon_brightness_k(1.2, 8e9).is_err());
        assert!(moon_brightness_k(f64::NAN, 8e9).is_err());
    }

    #[test]
    fn angular_size() {
        // At the mean distance 384 400 km the Moon's angular diameter is about 0.518 deg
        // (asin(1737.4 / 384400) = 0.25897 deg radius) [COMP].
        let r = moon_angular_radius_deg(384_400.0);
        assert!((r - 0.258_97).abs() < 1e-4, "{r}");
    }
}
