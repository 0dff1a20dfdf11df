//! Cloud attenuation: ITU-R P.840-9 (08/2023).
//!
//! Slant-path attenuation `A = L·K_L(f)/sin θ` dB (5° ≤ θ ≤ 90°; Annex 1 §3.1), with L the
//! integrated cloud liquid water content (kg/m², the quantity of the P.840-9 maps; not the
//! "reduced" liquid water content of the P.840-7/-8 maps, which goes with Kl at 0 °C) and the
//! mass absorption coefficient
//!
//! ```text
//! K_L(f) = Kl(f, 273.75 K) · [ A1 exp(−(f − f1)²/σ1) + A2 exp(−(f − f2)²/σ2) + A3 ]
//! A1 = 0.1522, A2 = 11.51, A3 = −10.4912, f1 = −23.9589 GHz, f2 = 219.2096 GHz,
//! σ1 = 3.2991e3 GHz², σ2 = 2.7595e6 GHz²
//! ```
//!
//! where Kl is the double-Debye Rayleigh coefficient of liquid water ((dB/km)/(g/m³)):
//!
//! ```text
//! θ = 300/T;  ε0 = 77.66 + 103.3(θ − 1);  ε1 = 0.0671 ε0;  ε2 = 3.52
//! fp = 20.20 − 146(θ − 1) + 316(θ − 1)² GHz;  fs = 39.8 fp GHz
//! ε'' = f(ε0 − ε1)/(fp(1 + (f/fp)²)) + f(ε1 − ε2)/(fs(1 + (f/fs)²))
//! ε'  = (ε0 − ε1)/(1 + (f/fp)²) + (ε1 − ε2)/(1 + (f/fs)²) + ε2
//! η = (2 + ε')/ε'';   Kl = 0.819 f/(ε''(1 + η²))
//! ```
//!
//! (the Kl expression of P.840-6/-7/-8 eqs (2)-(11), kept in P.840-9 as the basis of K_L).
//! Validity: the K_L fit is stated for 1-200 GHz (from memory); outside that the module
//! still evaluates it but the caller is warned. Below 5° elevation the 1/sin θ law
//! is not valid; the caller clamps θ to 5° and is warned.

/// Frequency range for the P.840-9 K_L approximation, GHz (from memory).
pub const FREQUENCY_RANGE_GHZ: (f64, f64) = (1.0, 200.0);
/// Lowest elevation for the slant formula, degrees.
pub const ELEVATION_MIN_DEG: f64 = 5.0;

/// Double-Debye specific attenuation coefficient Kl((dB/km)/(g/m³)) of liquid water at
/// temperature `temperature_k` (P.840-8 eqs (2)-(11); same expression in P.840-6/-7).
pub fn kl_double_debye(frequency_ghz: f64, temperature_k: f64) -> f64 {
    let f = frequency_ghz;
    let th = 300.0 / temperature_k;
    let e0 = 77.66 + 103.3 * (th - 1.0);
    let e1 = 0.0671 * e0;
    let e2 = 3.52;
    let fp = 20.20 - 146.0 * (th - 1.0) + 316.0 * (th - 1.0) * (th - 1.0);
    let fs = 39.8 * fp;
    let rp = f / fp;
    let rs = f / fs;
    let e_im = f * (e0 - e1) / (fp * (1.0 + rp * rp)) + f * (e1 - e2) / (fs * (1.0 + rs * rs));
    let e_re = (e0 - e1) / (1.0 + rp * rp) + (e1 - e2) / (1.0 + rs * rs) + e2;
    let eta = (2.0 + e_re) / e_im;
    0.819 * f / (e_im * (1.0 + eta * eta))
}

/// Mass absorption coefficient K_L (dB per kg/m²) of P.840-9.
pub fn mass_absorption_coefficient_p840_9(frequency_ghz: f64) -> f64 {
    const A1: f64 = 0.1522;
    const A2: f64 = 11.51;
    const A3: f64 = -10.4912;
    const F1: f64 = -23.9589;
    const F2: f64 = 219.2096;
    const S1: f64 = 3.2991e3;
    const S2: f64 = 2.7595e6;
    let f = frequency_ghz;
    // K_L = Kl(f, 273.75 K) [A1 e^(−(f−f1)²/σ1) + A2 e^(−(f−f2)²/σ2) + A3]
    kl_double_debye(f, 273.75)
        * (A1 * (-(f - F1) * (f - F1) / S1).exp() + A2 * (-(f - F2) * (f - F2) / S2).exp() + A3)
}

/// Slant-path cloud attenuation `A = L K_L / sin θ` dB (P.840-9), θ ≥ 5°.
#[inline]
pub fn attenuation_p840_9_db(liquid_kg_m2: f64, kl_db_per_kg_m2: f64, elevation_deg: f64) -> f64 {
    liquid_kg_m2 * kl_db_per_kg_m2 / elevation_deg.to_radians().sin()
}
