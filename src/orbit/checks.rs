//! Range checks of the mean elements shared by the TLE and OMM readers.
//!
//! Bounds: inclination 0 to 180 deg, right ascension of the ascending node, argument of perigee
//! and mean anomaly 0 to 360 deg, eccentricity 0 to < 1 (definitions of the classical elements,
//! e.g. Vallado, "Fundamentals of Astrodynamics and Applications", 4th ed., §2.4). Mean motion
//! above 0 and at most [`MAX_MEAN_MOTION_REV_PER_DAY`].

/// Largest accepted mean motion, rev/day. Kepler's third law with WGS-72 μ and a semi-major axis
/// of one WGS-72 Earth radius (6378.135 km) gives a period of 84.49 min, 17.04 rev/day; no
/// Earth orbit can go round faster. 17 rev/day as the round bound is common practice.
pub const MAX_MEAN_MOTION_REV_PER_DAY: f64 = 17.0;

/// One of the six checked elements.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ElementField {
    Inclination,
    RightAscension,
    Eccentricity,
    ArgumentOfPerigee,
    MeanAnomaly,
    MeanMotion,
}

impl ElementField {
    /// Name for messages ("inclination").
    pub fn label(self) -> &'static str {
        match self {
            ElementField::Inclination => "inclination",
            ElementField::RightAscension => "right ascension of the ascending node",
            ElementField::Eccentricity => "eccentricity",
            ElementField::ArgumentOfPerigee => "argument of perigee",
            ElementField::MeanAnomaly => "mean anomaly",
            ElementField::MeanMotion => "mean motion",
        }
    }

    /// Unit for messages ("deg", "rev/day", "" for eccentricity).
    pub fn unit(self) -> &'static str {
        match self {
            ElementField::Eccentricity => "",
            ElementField::MeanMotion => "rev/day",
            _ => "deg",
        }
    }

    /// The accepted range in words ("0 to 180 deg").
    pub fn allowed(self) -> &'static str {
        match self {
            ElementField::Inclination => "0 to 180 deg",
            ElementField::Eccentricity => "0 to below 1",
            ElementField::MeanMotion => "above 0 and at most 17 rev/day",
            _ => "0 to 360 deg",
        }
    }

    /// The OMM keyword (CCSDS 502.0-B-3 §4).
    pub fn omm_keyword(self) -> &'static str {
        match self {
            ElementField::Inclination => "INCLINATION",
            ElementField::RightAscension => "RA_OF_ASC_NODE",
            ElementField::Eccentricity => "ECCENTRICITY",
            ElementField::ArgumentOfPerigee => "ARG_OF_PERICENTER",
            ElementField::MeanAnomaly => "MEAN_ANOMALY",
            ElementField::MeanMotion => "MEAN_MOTION",
        }
    }

    /// First and last column (1-based) on TLE line 2, per the NORAD two-line format
    /// (Hoots & Roehrich, Spacetrack Report No. 3, 1980): inclination 9-16, RAAN 18-25,
    /// eccentricity 27-33, argument of perigee 35-42, mean anomaly 44-51, mean motion 53-63.
    pub fn tle_columns(self) -> (usize, usize) {
        match self {
            ElementField::Inclination => (9, 16),
            ElementField::RightAscension => (18, 25),
            ElementField::Eccentricity => (27, 33),
            ElementField::ArgumentOfPerigee => (35, 42),
            ElementField::MeanAnomaly => (44, 51),
            ElementField::MeanMotion => (53, 63),
        }
    }

    fn accepts(self, v: f64) -> bool {
        if !v.is_finite() {
            return false;
        }
        match self {
            ElementField::Inclination => (0.0..=180.0).contains(&v),
            ElementField::Eccentricity => (0.0..1.0).contains(&v),
            ElementField::MeanMotion => v > 0.0 && v <= MAX_MEAN_MOTION_REV_PER_DAY,
            _ => (0.0..=360.0).contains(&v),
        }
    }
}

/// An element outside its accepted range.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RangeViolation {
    pub field: ElementField,
    pub value: f64,
}

impl RangeViolation {
    /// The value with its unit, short form for huge or tiny numbers ("197.45 deg", "1e308 rev/day").
    pub fn value_text(&self) -> String {
        let v = self.value;
        let num = if v != 0.0 && v.is_finite() && (v.abs() >= 1e6 || v.abs() < 1e-4) {
            format!("{v:e}")
        } else {
            format!("{v}")
        };
        match self.field.unit() {
            "" => num,
            u => format!("{num} {u}"),
        }
    }
}

/// Check the six elements of `e` against their ranges; the first violation is returned.
pub fn check_element_ranges(e: &sgp4::Elements) -> Result<(), RangeViolation> {
    for (field, value) in [
        (ElementField::Inclination, e.inclination),
        (ElementField::RightAscension, e.right_ascension),
        (ElementField::Eccentricity, e.eccentricity),
        (ElementField::ArgumentOfPerigee, e.argument_of_perigee),
        (ElementField::MeanAnomaly, e.mean_anomaly),
        (ElementField::MeanMotion, e.mean_motion),
    ] {
        if !field.accepts(value) {
            return Err(RangeViolation { field, value });
        }
    }
    Ok(())
}

/// Remove a UTF-8 byte-order mark (U+FEFF) at the start of a text.
pub fn strip_bom(text: &str) -> &str {
    text.strip_prefix('\u{feff}').unwrap_or(text)
}

#[cfg(test)]
mod tests {
    use super::super::propagate::{WGS72_MU_KM3_S2, WGS72_RADIUS_KM};
    use super::*;

    #[test]
    fn mean_motion_bound_is_one_earth_radius_orbit() {
        // Kepler's third law, n = sqrt(mu / a^3), with a = WGS-72 radius: 17.04 rev/day.
        let n_rad_s = (WGS72_MU_KM3_S2 / WGS72_RADIUS_KM.powi(3)).sqrt();
        let rev_day = n_rad_s * 86_400.0 / std::f64::consts::TAU;
        assert!((rev_day - 17.04).abs() < 0.01, "{rev_day}");
        assert!(MAX_MEAN_MOTION_REV_PER_DAY < rev_day);
    }

    #[test]
    fn bounds() {
        assert!(ElementField::Inclination.accepts(180.0));
        assert!(!ElementField::Inclination.accepts(197.45));
        assert!(!ElementField::Inclination.accepts(-0.1));
        assert!(!ElementField::Eccentricity.accepts(1.0));
        assert!(!ElementField::MeanMotion.accepts(0.0));
        assert!(!ElementField::MeanMotion.accepts(1e308));
        assert!(!ElementField::MeanAnomaly.accepts(f64::NAN));
        assert!(ElementField::RightAscension.accepts(359.9999));
        let v = RangeViolation {
            field: ElementField::MeanMotion,
            value: 1e308,
        };
        assert_eq!(v.value_text(), "1e308 rev/day");
    }

    #[test]
    fn bom_stripped_once() {
        assert_eq!(strip_bom("\u{feff}1 "), "1 ");
        assert_eq!(strip_bom("abc"), "abc");
    }
}
