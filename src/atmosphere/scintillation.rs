//! Tropospheric scintillation fade depth: ITU-R P.618-14 (08/2023) §2.4.1, eqs (42)-(49)
//! (same steps in P.618-13). Valid 4-55 GHz, elevation θ ≥ 5°, 0.01 % < p ≤ 50 %.
//!
//! Nwet comes from the site, or from surface temperature and water-vapour density through
//! the wet term of ITU-R P.453-14 eq. (4): `Nwet = 72·e/T + 3.75e5·e/T²`, with the water-vapour
//! pressure `e = ρ·T/216.7` hPa (P.453-14 eq. (10)). (The single-term `3.732e5·e/T²` belongs
//! to the older total-pressure form `N = 77.6/T·(P + 4810·e/T)`; with the dry term of eq. (3),
//! `77.6·Pd/T`, the wet term needs both of its parts.)
//!
//! Below 5° the §2.4.2/§2.4.3 low-elevation method is not implemented: the caller
//! evaluates this model at 5° and raises a warning.

/// Frequency range of §2.4.1, GHz.
pub const FREQUENCY_RANGE_GHZ: (f64, f64) = (4.0, 55.0);
/// Lowest elevation of §2.4.1, degrees.
pub const ELEVATION_MIN_DEG: f64 = 5.0;
/// Height of the turbulent layer hL, m (P.618-14 eq (43)).
pub const TURBULENT_LAYER_HEIGHT_M: f64 = 1000.0;

/// Wet refractivity from T (K) and ρ (g/m³), N-units.
pub fn wet_refractivity_p453(temperature_k: f64, water_vapour_density_g_m3: f64) -> f64 {
    // e = ρ T / 216.7 hPa  (P.453-14 eq. (10))
    let e = water_vapour_density_g_m3 * temperature_k / 216.7;
    // Nwet = 72 e/T + 3.75e5 e/T²  (P.453-14 eq. (4))
    72.0 * e / temperature_k + 3.75e5 * e / (temperature_k * temperature_k)
}

/// Step 3: `σref = 3.6e-3 + 1e-4 Nwet` dB (eq (42)).
#[inline]
pub fn sigma_ref_db(wet_refractivity: f64) -> f64 {
    3.6e-3 + 1e-4 * wet_refractivity
}

/// Step 5: effective antenna diameter `Deff = sqrt(η) D` m (eq (44)).
#[inline]
pub fn effective_diameter_m(antenna_diameter_m: f64, antenna_efficiency: f64) -> f64 {
    antenna_efficiency.sqrt() * antenna_diameter_m
}

/// Steps 4, 6, 7: standard deviation of the signal σ (dB) at elevation θ ≥ 5°.
///
/// `L = 2 hL/(sqrt(sin²θ + 2.35e-4) + sin θ)` m (eq (43));
/// `x = 1.22 Deff² f/L` (eq (46));
/// `g(x) = sqrt(3.86 (x² + 1)^(11/12) sin[(11/6) atan(1/x)] − 7.08 x^(5/6))` (eq (45)),
/// taken as 0 when the radicand is negative (x ≳ 7: the antenna averages the scintillation out);
/// `σ = σref f^(7/12) g(x)/(sin θ)^1.2` (eq (47)).
#[inline]
pub fn sigma_db(sigma_ref_db: f64, frequency_ghz: f64, deff_m: f64, elevation_deg: f64) -> f64 {
    sigma_from_parts_db(
        sigma_ref_db * frequency_ghz.powf(7.0 / 12.0),
        1.22 * deff_m * deff_m * frequency_ghz,
        elevation_deg,
    )
}

/// [`sigma_db`] with its elevation-independent parts precomputed:
/// `scale_db = σref·f^(7/12)` and `x_numerator_m = 1.22·Deff²·f`, so `x = x_numerator_m/L`.
#[inline]
pub fn sigma_from_parts_db(scale_db: f64, x_numerator_m: f64, elevation_deg: f64) -> f64 {
    let s = elevation_deg.to_radians().sin();
    // L = 2 hL/(sqrt(sin²θ + 2.35e-4) + sin θ)  (eq (43))
    let l_m = 2.0 * TURBULENT_LAYER_HEIGHT_M / ((s * s + 2.35e-4).sqrt() + s);
    // x = 1.22 Deff² f/L  (eq (46))
    let x = x_numerator_m / l_m;
    // g(x) = sqrt(3.86 (x² + 1)^(11/12) sin[(11/6) atan(1/x)] − 7.08 x^(5/6))  (eq (45))
    let radicand = 3.86 * (x * x + 1.0).powf(11.0 / 12.0) * ((11.0 / 6.0) * (1.0 / x).atan()).sin()
        - 7.08 * x.powf(5.0 / 6.0);
    if radicand <= 0.0 {
        return 0.0;
    }
    // σ = σref f^(7/12) g(x)/(sin θ)^1.2  (eq (47))
    scale_db * radicand.sqrt() / s.powf(1.2)
}

/// Step 8: time-percentage factor
/// `a(p) = −0.061 (log10 p)³ + 0.072 (log10 p)² − 1.71 log10 p + 3.0` (eq (48)).
#[inline]
pub fn percentage_factor(percent: f64) -> f64 {
    let lp = percent.log10();
    -0.061 * lp * lp * lp + 0.072 * lp * lp - 1.71 * lp + 3.0
}
