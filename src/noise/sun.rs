//! The Sun as a radio source: the brightness temperature of its disk versus frequency.
//!
//! * **Quiet Sun:** a visual reading of ITU-R P.372-14, Fig. 12 (brightness temperature of the
//!   quiet Sun, 0.05-100 GHz) at 17 frequencies (docs/REFERENCES.md §8, status [C-code]: the
//!   reading carried in a textbook's companion code, not re-read from the figure here),
//!   interpolated linearly in log T against log f. Outside 0.05-100 GHz [`quiet_sun_brightness_k`]
//!   returns [`SunNoiseError::FrequencyOutOfRange`]. The figure is a median over the solar cycle;
//!   the active Sun is hotter, by orders of magnitude during radio bursts. A measured quiet-Sun
//!   level at 37 GHz, 8100 ± 300 K (Kallunki & Tornikoski, Solar Physics 293:156, 2018;
//!   docs/REFERENCES.md §8), lies 30 % above the reading there (6230 K): take the figure as
//!   good to some tens of per cent.
//! * **Active Sun:** an observed solar flux density `S` (solar flux units, 1 sfu =
//!   1e-22 W m^-2 Hz^-1, both polarizations) at the link frequency, turned into the brightness
//!   temperature of a uniform disk of solid angle Ω by the Rayleigh-Jeans law
//!   `T = S λ² / (2 k Ω)` ([`brightness_from_flux_sfu`]; exact inversion of `S = 2 k T Ω / λ²`,
//!   valid while h f << k T, i.e. everywhere in the microwave range for T > 100 K).
//! * **Disk size:** the optical photosphere, radius 695 700 km (IAU 2015 Resolution B3, nominal
//!   solar radius, from memory), at the Sun's distance: 0.2665 deg angular radius at 1 AU
//!   ([`sun_angular_radius_deg`], [`MEAN_ANGULAR_RADIUS_DEG`]; mean angular diameter 0.533 deg).
//!   The radio Sun is somewhat larger than the optical disk below a few GHz (the corona); taking
//!   the optical disk for both the P.372 values and the flux conversion keeps the flux-to-
//!   temperature round trip exact and is common practice.
//!
//! The antenna temperature the disk adds is [`crate::noise::disk`]'s job; the atmosphere in front
//! of the disk attenuates its emission (the caller multiplies by the path transmissivity).

use crate::units::{wavelength_m, BOLTZMANN_J_PER_K};

/// One solar flux unit, W m^-2 Hz^-1 (definition of the unit).
pub const SFU_W_M2_HZ: f64 = 1e-22;

/// Nominal solar radius, km (IAU 2015 Resolution B3; from memory).
pub const SUN_RADIUS_KM: f64 = 695_700.0;

/// Angular radius of the solar disk at 1 AU, deg: asin(695 700 km / 1 AU) = 0.26646 deg.
pub const MEAN_ANGULAR_RADIUS_DEG: f64 = 0.266_46;

/// Frequency range of the P.372 Fig. 12 reading, Hz.
pub const QUIET_SUN_RANGE_HZ: (f64, f64) = (0.05e9, 100e9);

/// P.372-14 Fig. 12 read at these frequencies (GHz, brightness temperature K);
/// docs/REFERENCES.md §8.
const QUIET_SUN_FIG12: [(f64, f64); 17] = [
    (0.05, 1.0e6),
    (0.2, 1.0e6),
    (1.0, 2.0e5),
    (2.0, 9.0e4),
    (3.0, 4.5e4),
    (4.0, 2.9e4),
    (5.0, 2.0e4),
    (6.0, 1.6e4),
    (7.0, 1.4e4),
    (8.0, 1.3e4),
    (9.0, 1.2e4),
    (10.0, 1.0e4),
    (20.0, 7.0e3),
    (30.0, 6.3e3),
    (40.0, 6.2e3),
    (50.0, 6.0e3),
    (100.0, 6.0e3),
];

/// A solar brightness that cannot be given.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
pub enum SunNoiseError {
    #[error("frequency {frequency_hz} Hz is outside the quiet-Sun curve of ITU-R P.372 Fig. 12 (0.05-100 GHz)")]
    FrequencyOutOfRange { frequency_hz: f64 },
    #[error("solar flux {flux_sfu} sfu must be finite and positive")]
    Flux { flux_sfu: f64 },
    #[error("solar disk radius {angular_radius_deg} deg must be finite, positive and below 5 deg")]
    Radius { angular_radius_deg: f64 },
}

/// Brightness temperature of the quiet Sun's disk at `frequency_hz`, K (P.372-14 Fig. 12, log-log
/// interpolation of the figure reading).
pub fn quiet_sun_brightness_k(frequency_hz: f64) -> Result<f64, SunNoiseError> {
    let f_ghz = frequency_hz / 1e9;
    let (lo, hi) = (
        QUIET_SUN_FIG12[0].0,
        QUIET_SUN_FIG12[QUIET_SUN_FIG12.len() - 1].0,
    );
    if !(lo..=hi).contains(&f_ghz) {
        return Err(SunNoiseError::FrequencyOutOfRange { frequency_hz });
    }
    let i = QUIET_SUN_FIG12
        .windows(2)
        .position(|w| f_ghz <= w[1].0)
        .unwrap_or(QUIET_SUN_FIG12.len() - 2);
    let ((f0, t0), (f1, t1)) = (QUIET_SUN_FIG12[i], QUIET_SUN_FIG12[i + 1]);
    // log T = log T0 + (log f - log f0) / (log f1 - log f0) * (log T1 - log T0)
    let x = (f_ghz / f0).ln() / (f1 / f0).ln();
    Ok((t0.ln() + x * (t1 / t0).ln()).exp())
}

/// Solid angle of a disk of angular radius `angular_radius_deg`, sr: Ω = 2π (1 − cos r).
pub fn disk_solid_angle_sr(angular_radius_deg: f64) -> f64 {
    std::f64::consts::TAU * (1.0 - angular_radius_deg.to_radians().cos())
}

/// Angular radius of the Sun's photosphere seen from `distance_km`, deg: asin(R_sun / d).
pub fn sun_angular_radius_deg(distance_km: f64) -> f64 {
    (SUN_RADIUS_KM / distance_km)
        .clamp(-1.0, 1.0)
        .asin()
        .to_degrees()
}

fn check_radius(angular_radius_deg: f64) -> Result<(), SunNoiseError> {
    if angular_radius_deg.is_finite() && angular_radius_deg > 0.0 && angular_radius_deg < 5.0 {
        Ok(())
    } else {
        Err(SunNoiseError::Radius { angular_radius_deg })
    }
}

/// Uniform-disk brightness temperature (K) of a source of flux density `flux_sfu` (sfu, both
/// polarizations) at `frequency_hz`, disk radius `angular_radius_deg`: T = S λ² / (2 k Ω)
/// (Rayleigh-Jeans).
pub fn brightness_from_flux_sfu(
    flux_sfu: f64,
    frequency_hz: f64,
    angular_radius_deg: f64,
) -> Result<f64, SunNoiseError> {
    if !(flux_sfu.is_finite() && flux_sfu > 0.0) {
        return Err(SunNoiseError::Flux { flux_sfu });
    }
    check_radius(angular_radius_deg)?;
    let lambda = wavelength_m(frequency_hz);
    let s = flux_sfu * SFU_W_M2_HZ;
    Ok(s * lambda * lambda / (2.0 * BOLTZMANN_J_PER_K * disk_solid_angle_sr(angular_radius_deg)))
}

/// Flux density (sfu) of a uniform disk of brightness `brightness_k` at `frequency_hz`:
/// S = 2 k T Ω / λ² (the inverse of [`brightness_from_flux_sfu`]).
pub fn flux_sfu_from_brightness(
    brightness_k: f64,
    frequency_hz: f64,
    angular_radius_deg: f64,
) -> f64 {
    let lambda = wavelength_m(frequency_hz);
    2.0 * BOLTZMANN_J_PER_K * brightness_k * disk_solid_angle_sr(angular_radius_deg)
        / (lambda * lambda)
        / SFU_W_M2_HZ
}

/// The Sun's disk brightness for a budget: the quiet Sun of P.372, or an observed flux.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum SunActivity {
    /// ITU-R P.372-14 Fig. 12.
    Quiet,
    /// Observed flux density at the link frequency, sfu.
    FluxSfu(f64),
}

/// Brightness temperature (K) of the Sun's disk at `frequency_hz` for `activity`, the disk taken
/// with `angular_radius_deg` (used by the flux conversion only).
pub fn sun_brightness_k(
    activity: SunActivity,
    frequency_hz: f64,
    angular_radius_deg: f64,
) -> Result<f64, SunNoiseError> {
    match activity {
        SunActivity::Quiet => quiet_sun_brightness_k(frequency_hz),
        SunActivity::FluxSfu(s) => brightness_from_flux_sfu(s, frequency_hz, angular_radius_deg),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn figure_nodes_and_log_interpolation() {
        // The nodes are the figure reading (docs/REFERENCES.md §8).
        for (f, t) in QUIET_SUN_FIG12 {
            let got = quiet_sun_brightness_k(f * 1e9).unwrap();
            assert!((got / t - 1.0).abs() < 1e-12, "{f} GHz: {got}");
        }
        // Log-log midpoint between 10 GHz (1e4 K) and 20 GHz (7e3 K): at sqrt(200) GHz the
        // temperature is sqrt(1e4 * 7e3) = 8366.6 K.
        let t = quiet_sun_brightness_k(200f64.sqrt() * 1e9).unwrap();
        assert!((t - (1e4f64 * 7e3).sqrt()).abs() < 1e-6);
        // Outside the figure: an error, not an extrapolation.
        assert!(quiet_sun_brightness_k(0.049e9).is_err());
        assert!(quiet_sun_brightness_k(101e9).is_err());
        assert!(quiet_sun_brightness_k(f64::NAN).is_err());
    }

    #[test]
    fn disk_size() {
        // asin(695700 / 149597870.7) in deg [COMP]
        let r = sun_angular_radius_deg(crate::geometry::sun::AU_KM);
        assert!((r - MEAN_ANGULAR_RADIUS_DEG).abs() < 1e-5, "{r}");
        // Ω = 6.80e-5 sr, Ω/4π = 5.4e-6 (docs/REFERENCES.md §8 [COMP])
        let omega = disk_solid_angle_sr(r);
        assert!((omega - 6.80e-5).abs() < 0.01e-5, "{omega}");
    }

    #[test]
    fn flux_round_trip_and_errors() {
        for f in [1e9, 8.2e9, 26e9] {
            let t = brightness_from_flux_sfu(250.0, f, MEAN_ANGULAR_RADIUS_DEG).unwrap();
            let s = flux_sfu_from_brightness(t, f, MEAN_ANGULAR_RADIUS_DEG);
            assert!((s / 250.0 - 1.0).abs() < 1e-12);
        }
        assert!(brightness_from_flux_sfu(0.0, 8e9, 0.27).is_err());
        assert!(brightness_from_flux_sfu(100.0, 8e9, 0.0).is_err());
        assert!(brightness_from_flux_sfu(f64::INFINITY, 8e9, 0.27).is_err());
    }

    #[test]
    fn quiet_sun_flux_is_of_the_solar_minimum_order() {
        // The 10.7 cm (2.8 GHz) solar flux index is about 65-70 sfu at solar minimum (from
        // memory; the NOAA/NRC F10.7 record). The P.372 quiet-Sun reading over the optical disk
        // gives the same order: 85 sfu.
        let t = quiet_sun_brightness_k(2.8e9).unwrap();
        let s = flux_sfu_from_brightness(t, 2.8e9, MEAN_ANGULAR_RADIUS_DEG);
        assert!((55.0..120.0).contains(&s), "{s} sfu");
    }
}
