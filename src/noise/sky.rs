//! Sky brightness temperature seen by a ground antenna.
//!
//! * Atmosphere: Rec. ITU-R P.618-14 (08/2023) §3, eq. (69):
//!   Tsky = Tmr (1 - 10^(-A/10)) + Tbg 10^(-A/10), A = absorptive attenuation along
//!   the path (dB, gases + cloud + rain, excluding scintillation), Tmr = mean radiating
//!   temperature; eq. (70): Tmr = 37.34 + 0.81 Ts; Tmr = 275 K without local data.
//!   P.618-14 writes 2.7 K for Tbg; here Tbg is a parameter (see [`background_temperature_k`]).
//! * Background: CMB 2.725 K (crate::units::CMB_K) plus the galactic background of
//!   Rec. ITU-R P.372 (galactic noise curve, median, P.372-10 Table 1 coefficients as
//!   carried in ITU SG3's P.372 code): Fa = 52 - 23 log10(f_MHz) dB above k T0 b, i.e.
//!   T_gal = 290 * 10^(Fa/10) K = 290 * 10^5.2 * f_MHz^-2.3 K.
//!   Range: the curve is stated for HF/VHF from the ionospheric cut-off (~10 MHz)
//!   upward; P.618-14 §3 notes the galactic background is possibly significant only
//!   below about 2 GHz. Treatment above 1 GHz: the same power law is continued
//!   (T_gal < 1.2 K at 2 GHz, < 0.03 K at 10 GHz, so the CMB dominates) and the
//!   result is flagged [`SkyRange::GalacticExtrapolated`]; the outputs warn of it where the
//!   continued term is [`GALACTIC_WARNING_K`] or more ([`galactic_extrapolation_warned`], up to
//!   about 2.1 GHz). Below 10 MHz: error.

use crate::units::{CMB_K, T0_K};

/// Default mean radiating temperature, K (P.618-14 §3: 275 K without local data).
pub const DEFAULT_MEAN_RADIATING_TEMPERATURE_K: f64 = 275.0;

/// Whether a background value is inside the galactic model's stated range.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SkyRange {
    InRange,
    /// Above 1 GHz: galactic power law continued beyond its stated range (small term).
    GalacticExtrapolated,
}

/// Errors of the sky model.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
pub enum SkyError {
    #[error("frequency {frequency_hz} Hz is below the galactic model's range (10 MHz)")]
    FrequencyBelowRange { frequency_hz: f64 },
    #[error("absorptive attenuation must be >= 0 dB and finite, got {absorptive_db} dB")]
    Attenuation { absorptive_db: f64 },
    #[error("temperature must be >= 0 K and finite, got {temperature_k} K ({what})")]
    Temperature {
        what: &'static str,
        temperature_k: f64,
    },
}

/// Galactic background brightness temperature (K), ITU-R P.372 galactic curve:
/// Fa = 52 - 23 log10(f_MHz) dB, T = 290 * 10^(Fa/10).
pub fn galactic_temperature_p372_k(frequency_hz: f64) -> Result<(f64, SkyRange), SkyError> {
    if !(frequency_hz >= 10e6 && frequency_hz.is_finite()) {
        return Err(SkyError::FrequencyBelowRange { frequency_hz });
    }
    let f_mhz = frequency_hz / 1e6;
    // Fa = 52.0 - 23.0 log10(f_MHz)  (dB above k T0 b)
    let fa_db = 52.0 - 23.0 * f_mhz.log10();
    // T_gal = T0 10^(Fa/10)
    let t = T0_K * 10f64.powf(fa_db / 10.0);
    let range = if frequency_hz > 1e9 {
        SkyRange::GalacticExtrapolated
    } else {
        SkyRange::InRange
    };
    Ok((t, range))
}

/// The continued galactic term (above 1 GHz) the outputs warn of, K: from this much up (below
/// about 2.1 GHz); a smaller term, against system temperatures of tens of kelvin and more, is
/// stated in the README instead of in every output. Our rule, no published source.
pub const GALACTIC_WARNING_K: f64 = 1.0;

/// Whether the outputs warn that the galactic background is extrapolated at `frequency_hz`: the
/// one rule of `plan` and `budget` (through `plan::noise::NoiseWarnings`).
pub fn galactic_extrapolation_warned(frequency_hz: f64) -> bool {
    matches!(
        galactic_temperature_p372_k(frequency_hz),
        Ok((t, SkyRange::GalacticExtrapolated)) if t >= GALACTIC_WARNING_K
    )
}

/// Background temperature (K) behind the atmosphere: CMB 2.725 K + galactic (P.372).
pub fn background_temperature_k(frequency_hz: f64) -> Result<(f64, SkyRange), SkyError> {
    let (t_gal, range) = galactic_temperature_p372_k(frequency_hz)?;
    Ok((CMB_K + t_gal, range))
}

/// Mean radiating temperature (K) from the surface temperature (K), P.618-14 eq. (70):
/// Tmr = 37.34 + 0.81 Ts.
pub fn mean_radiating_temperature_p618_k(surface_temperature_k: f64) -> Result<f64, SkyError> {
    if !(surface_temperature_k >= 0.0 && surface_temperature_k.is_finite()) {
        return Err(SkyError::Temperature {
            what: "surface temperature",
            temperature_k: surface_temperature_k,
        });
    }
    Ok(37.34 + 0.81 * surface_temperature_k)
}

/// Sky brightness temperature (K), P.618-14 eq. (69).
pub fn sky_temperature_p618_k(
    absorptive_db: f64,
    mean_radiating_temperature_k: f64,
    background_k: f64,
) -> Result<f64, SkyError> {
    if !(absorptive_db >= 0.0 && absorptive_db.is_finite()) {
        return Err(SkyError::Attenuation { absorptive_db });
    }
    for (what, t) in [
        ("mean radiating temperature", mean_radiating_temperature_k),
        ("background temperature", background_k),
    ] {
        if !(t >= 0.0 && t.is_finite()) {
            return Err(SkyError::Temperature {
                what,
                temperature_k: t,
            });
        }
    }
    Ok(sky_temperature_unchecked(
        absorptive_db,
        mean_radiating_temperature_k,
        background_k,
    ))
}

#[inline]
pub(crate) fn sky_temperature_unchecked(absorptive_db: f64, tmr_k: f64, background_k: f64) -> f64 {
    // Tsky = Tmr (1 - 10^(-A/10)) + Tbg 10^(-A/10)      P.618-14 eq. (69)
    let transmissivity = 10f64.powf(-absorptive_db / 10.0);
    tmr_k * (1.0 - transmissivity) + background_k * transmissivity
}
