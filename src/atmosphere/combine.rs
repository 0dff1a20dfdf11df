//! Combination of impairments: ITU-R P.618-14 (08/2023) §2.5, eqs (65)-(68).
//!
//! ```text
//! AT(p) = AG(p) + sqrt((AR(p) + AC(p))² + AS(p)²)   for 0.001 % ≤ p ≤ 5 %   (65)
//! AT(p) = AG(p) + sqrt(AC(p)² + AS(p)²)             for 5 % < p ≤ 50 %      (66)
//! AC(p) = AC(5 %), AG(p) = AG(5 %) for p < 5 %                              (67), (68)
//! ```
//!
//! Here AG and AC come from the site's own meteorological values, which stand for the
//! 5 % statistics, so (67)-(68) leave them unchanged for every p.
//!
//! Edition note: P.618-13 used eq (65) for every p with AC(p) = AC(1 %) and AG(p) = AG(1 %)
//! for p < 1 %; the ITU validation workbook rev. 5.1 follows -13. The form is the same
//! for p ≤ 5 %; only the treatment of rain above 5 % differs.

/// Upper limit of eq (65) (rain included), percent.
pub const RAIN_INCLUDED_MAX_PERCENT: f64 = 5.0;

/// Total attenuation AT(p) in dB, P.618-14 eqs (65)/(66).
#[inline]
pub fn total_attenuation_p618_14_db(
    percent: f64,
    gas_db: f64,
    cloud_db: f64,
    rain_db: f64,
    scintillation_db: f64,
) -> f64 {
    let wet = if percent <= RAIN_INCLUDED_MAX_PERCENT {
        rain_db + cloud_db
    } else {
        cloud_db
    };
    gas_db + (wet * wet + scintillation_db * scintillation_db).sqrt()
}
