//! Rain height: ITU-R P.839.
//!
//! The station's own rain height is used whenever it is given. Otherwise this module
//! supplies the **approximate latitude rule of P.839-2 (10/1999)** for the mean 0 °C
//! isotherm height, used here directly as the rain height hR:
//!
//! ```text
//! h0 = 5 − 0.075 (φ − 23)   km   for φ > 23°        (Northern hemisphere)
//! h0 = 5                    km   for −21° ≤ φ ≤ 23°
//! h0 = 5 + 0.1 (φ + 21)     km   for −71° ≤ φ < −21°
//! h0 = 0                    km   for φ < −71°
//! ```
//!
//! Caveats (all reasons to give the station value instead):
//! * this rule is superseded by the digital maps of P.839-3/-4 (hR = h0 + 0.36 km with h0 from
//!   a 1.5° grid); differences of several hundred metres are usual (e.g. 51.5° N, 0.14° W: rule 2.86 km,
//!   P.839-4 map 2.45 km);
//! * whether P.839-2 adds 0.36 km to h0 is not confirmed here (from memory: no);
//! * the regional variant for North America and Europe west of 60° E
//!   (hR = 3.2 − 0.075 (φ − 35) km, 35°-70° N) needs the longitude, which the site does not
//!   carry, so it is not applied;
//! * the rule is clipped at 0 km toward the North Pole.
//!
//! Source of the rule: as written in the P.839-2 class of ITU-Rpy (S1 in the project's
//! REFERENCES §5); treat as approximate.

/// Approximate rain height (km above mean sea level) from latitude, P.839-2 latitude rule.
pub fn rain_height_p839_2_km(latitude_deg: f64) -> f64 {
    let phi = latitude_deg;
    let h = if phi > 23.0 {
        // h0 = 5 − 0.075 (φ − 23)
        5.0 - 0.075 * (phi - 23.0)
    } else if phi >= -21.0 {
        5.0
    } else if phi >= -71.0 {
        // h0 = 5 + 0.1 (φ + 21)
        5.0 + 0.1 * (phi + 21.0)
    } else {
        0.0
    };
    h.max(0.0)
}
