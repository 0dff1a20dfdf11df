//! The element set every input form ends in.

use chrono::{DateTime, Utc};

/// One satellite's mean elements, ready for SGP4.
#[derive(Debug, Clone, PartialEq)]
pub struct ElementSet {
    /// Object name (line 0 of a 3-line set, `OBJECT_NAME` of an OMM); `None` for a 2-line set.
    pub name: Option<String>,
    /// Satellite catalog number.
    pub norad_id: u64,
    /// Element epoch (UTC).
    pub epoch: DateTime<Utc>,
    /// The elements in the form the `sgp4` crate consumes (angles in degrees, mean motion in rev/day).
    pub elements: sgp4::Elements,
    /// Keywords of the set's OMM that are not OMM keywords and were ignored (fields an element-set
    /// provider adds), in the order of the file; empty for a TLE.
    pub ignored_keywords: Vec<String>,
}

impl ElementSet {
    /// Wrap `sgp4::Elements`, taking name, catalog number and epoch from them.
    pub fn from_elements(elements: sgp4::Elements) -> ElementSet {
        ElementSet {
            name: elements.object_name.clone(),
            norad_id: elements.norad_id,
            epoch: elements.datetime.and_utc(),
            elements,
            ignored_keywords: Vec::new(),
        }
    }

    /// Semi-major axis from the mean motion, a = (mu / n^2)^(1/3) with n in rad/s and the WGS-72
    /// mu of SGP4 (the one rule, used by the propagator and the pfd geometry), km.
    pub fn semi_major_axis_km(&self) -> f64 {
        let n_rad_s = self.elements.mean_motion * std::f64::consts::TAU / 86_400.0;
        (super::propagate::WGS72_MU_KM3_S2 / (n_rad_s * n_rad_s)).cbrt()
    }

    /// A label for messages: the name if there is one, else the catalog number.
    pub fn label(&self) -> String {
        match &self.name {
            Some(n) => format!("{n} ({})", self.norad_id),
            None => format!("catalog number {}", self.norad_id),
        }
    }
}
