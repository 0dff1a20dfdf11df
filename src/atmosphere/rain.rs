//! Rain attenuation on an Earth-space path: ITU-R P.618-14 (08/2023) §2.2.1.1, steps 1-10,
//! eqs (1)-(8). The steps are identical in P.618-13 (12/2017).
//!
//! Valid (P.618-14 §2.2.1.1): frequencies up to 55 GHz, exceedance 0.001 %-5 % of an
//! average year. The elevation enters through the slant length (eq (1) for θ ≥ 5°, eq (2)
//! with Re = 8500 km for θ < 5°) and through the reduction factors.

/// Effective Earth radius, km (P.618-14 §2.2.1.1 step 2).
pub const EFFECTIVE_EARTH_RADIUS_KM: f64 = 8500.0;
/// Upper frequency limit of the method, GHz.
pub const FREQUENCY_MAX_GHZ: f64 = 55.0;
/// Exceedance range of step 10, percent.
pub const EXCEEDANCE_RANGE_PERCENT: (f64, f64) = (0.001, 5.0);

/// Path inputs that do not depend on the exceedance probability.
#[derive(Clone, Copy, Debug)]
pub struct RainPath {
    /// Rain height hR, km AMSL.
    pub rain_height_km: f64,
    /// Station height hs, km AMSL.
    pub station_height_km: f64,
    /// Elevation θ, degrees.
    pub elevation_deg: f64,
    /// Station latitude φ, degrees.
    pub latitude_deg: f64,
    /// Frequency f, GHz.
    pub frequency_ghz: f64,
}

/// The 0.01 % result and the intermediate quantities of steps 2-9.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct Rain001 {
    /// Slant length below the rain height Ls, km.
    pub slant_length_km: f64,
    /// Specific attenuation γR at R0.01, dB/km.
    pub specific_attenuation_db_km: f64,
    /// Horizontal reduction factor r0.01.
    pub horizontal_reduction: f64,
    /// Vertical adjustment factor v0.01.
    pub vertical_adjustment: f64,
    /// Effective path length LE, km.
    pub effective_path_km: f64,
    /// A0.01, dB.
    pub attenuation_001_db: f64,
}

/// Steps 2-9: attenuation exceeded for 0.01 % of an average year, dB.
///
/// `k`, `alpha` are the P.838 path coefficients for this elevation and polarization;
/// `rain_rate_001_mm_h` is R0.01 (1-min integration). Returns all zeros when
/// hR − hs ≤ 0 or R0.01 = 0 (steps 2 and 4).
pub fn attenuation_001_p618(
    path: &RainPath,
    k: f64,
    alpha: f64,
    rain_rate_001_mm_h: f64,
) -> Rain001 {
    let dh = path.rain_height_km - path.station_height_km;
    if dh <= 0.0 || rain_rate_001_mm_h <= 0.0 {
        return Rain001::default();
    }
    let th_deg = path.elevation_deg;
    let th = th_deg.to_radians();
    let (sin_t, cos_t) = th.sin_cos();
    let f = path.frequency_ghz;

    // Step 2: Ls = (hR − hs)/sin θ for θ ≥ 5° (eq (1));
    //         Ls = 2(hR − hs)/( sqrt(sin²θ + 2(hR − hs)/Re) + sin θ ) for θ < 5° (eq (2)),
    //         the switch taken by the one rule of `super::elevation`.
    let ls = if !super::elevation::low_elevation_form(th_deg) {
        dh / sin_t
    } else {
        2.0 * dh / ((sin_t * sin_t + 2.0 * dh / EFFECTIVE_EARTH_RADIUS_KM).sqrt() + sin_t)
    };
    // Step 3: LG = Ls cos θ (eq (3))
    let lg = ls * cos_t;
    // Step 5: γR = k R0.01^α (eq (4))
    let gamma_r = k * rain_rate_001_mm_h.powf(alpha);
    // Step 6: r0.01 = 1/(1 + 0.78 sqrt(LG γR / f) − 0.38 (1 − e^(−2 LG))) (eq (5))
    let r001 = 1.0 / (1.0 + 0.78 * (lg * gamma_r / f).sqrt() - 0.38 * (1.0 - (-2.0 * lg).exp()));
    // Step 7: ζ = atan((hR − hs)/(LG r0.01));
    //         LR = LG r0.01/cos θ if ζ > θ, else (hR − hs)/sin θ
    let zeta_deg = (dh / (lg * r001)).atan().to_degrees();
    let lr = if zeta_deg > th_deg {
        lg * r001 / cos_t
    } else {
        dh / sin_t
    };
    //         χ = 36 − |φ| for |φ| < 36°, else 0
    let abs_lat = path.latitude_deg.abs();
    let chi = if abs_lat < 36.0 { 36.0 - abs_lat } else { 0.0 };
    //         v0.01 = 1/(1 + sqrt(sin θ)(31 (1 − e^(−θ/(1+χ))) sqrt(LR γR)/f² − 0.45))
    let v001 = 1.0
        / (1.0
            + sin_t.sqrt()
                * (31.0 * (1.0 - (-th_deg / (1.0 + chi)).exp()) * (lr * gamma_r).sqrt() / (f * f)
                    - 0.45));
    // Step 8: LE = LR v0.01 (eq (6))
    let le = lr * v001;
    // Step 9: A0.01 = γR LE (eq (7))
    Rain001 {
        slant_length_km: ls,
        specific_attenuation_db_km: gamma_r,
        horizontal_reduction: r001,
        vertical_adjustment: v001,
        effective_path_km: le,
        attenuation_001_db: gamma_r * le,
    }
}

/// Step 10: attenuation exceeded for p % (0.001 ≤ p ≤ 5) from A0.01, dB (eq (8)):
///
/// `Ap = A0.01 (p/0.01)^−(0.655 + 0.033 ln p − 0.045 ln A0.01 − β (1 − p) sin θ)`, with
/// β = 0 if p ≥ 1 % or |φ| ≥ 36°; β = −0.005(|φ| − 36) if p < 1 %, |φ| < 36° and θ ≥ 25°;
/// β = −0.005(|φ| − 36) + 1.8 − 4.25 sin θ otherwise.
pub fn scale_to_exceedance_p618(
    attenuation_001_db: f64,
    percent: f64,
    latitude_deg: f64,
    elevation_deg: f64,
) -> f64 {
    if attenuation_001_db <= 0.0 {
        return 0.0;
    }
    let p = percent;
    let abs_lat = latitude_deg.abs();
    let sin_t = elevation_deg.to_radians().sin();
    let beta = if p >= 1.0 || abs_lat >= 36.0 {
        0.0
    } else if elevation_deg >= 25.0 {
        -0.005 * (abs_lat - 36.0)
    } else {
        -0.005 * (abs_lat - 36.0) + 1.8 - 4.25 * sin_t
    };
    let exponent =
        0.655 + 0.033 * p.ln() - 0.045 * attenuation_001_db.ln() - beta * (1.0 - p) * sin_t;
    attenuation_001_db * (p / 0.01).powf(-exponent)
}
