//! The one table of accepted ranges. A quantity has one range wherever it is given: in a mission
//! or station file, on the command line, or through the library's planning request. The README's
//! "Limits" table mirrors this file.

/// An accepted closed range for one quantity, with its unit for messages.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Range {
    /// The key in the files (dotted), used in messages.
    pub key: &'static str,
    pub min: f64,
    pub max: f64,
    pub unit: &'static str,
}

/// A value outside its [`Range`] (or not a finite number).
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("{value} is out of range ({min} to {max}{unit})", unit = unit_suffix(.unit))]
pub struct RangeError {
    pub key: &'static str,
    pub value: String,
    pub min: f64,
    pub max: f64,
    pub unit: &'static str,
}

fn unit_suffix(unit: &str) -> String {
    if unit.is_empty() {
        String::new()
    } else {
        format!(" {unit}")
    }
}

impl Range {
    /// `v` if it is finite and within the range.
    pub fn check(&self, v: f64) -> Result<f64, RangeError> {
        if v.is_finite() && v >= self.min && v <= self.max {
            Ok(v)
        } else {
            Err(RangeError {
                key: self.key,
                value: short_number(v),
                min: self.min,
                max: self.max,
                unit: self.unit,
            })
        }
    }

    pub fn contains(&self, v: f64) -> bool {
        self.check(v).is_ok()
    }
}

/// A number for a message: plain when short, else in exponent form (never hundreds of digits).
pub fn short_number(v: f64) -> String {
    let plain = format!("{v}");
    if plain.len() <= 16 {
        plain
    } else {
        format!("{v:.6e}")
    }
}

/// Budget time step along each pass, s. Above 10 s the closing edges and the dwell rule are
/// miscounted; below 0.01 s a pass has more steps than is useful (and memory grows).
pub const STEP_S: Range = Range {
    key: "planning.step_s",
    min: 0.01,
    max: 10.0,
    unit: "s",
};

/// Length of a planning window, days (ten years).
pub const WINDOW_DAYS: Range = Range {
    key: "window.days",
    min: 0.0001,
    max: 3660.0,
    unit: "days",
};

/// Availability case: percentage of an average year the rain attenuation is exceeded (the
/// ITU-R P.618-14 §2.2.1.1 method is valid for 0.001 % to 5 %).
pub const EXCEEDANCE_PERCENT: Range = Range {
    key: "planning.exceedance_percent",
    min: 0.001,
    max: 5.0,
    unit: "%",
};

/// Minimum elevation of a station or of a mask override, deg.
pub const MIN_ELEVATION_DEG: Range = Range {
    key: "min_elevation_deg",
    min: -5.0,
    max: 90.0,
    unit: "deg",
};

/// Downlink carrier frequency, MHz (VHF to W band, the span of the ITU-R models used).
pub const FREQUENCY_MHZ: Range = Range {
    key: "transmitter.frequency_mhz",
    min: 30.0,
    max: 100_000.0,
    unit: "MHz",
};

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ranges_check_and_report() {
        assert_eq!(STEP_S.check(1.0), Ok(1.0));
        assert!(STEP_S.check(f64::NAN).is_err());
        let e = STEP_S.check(1e-6).unwrap_err();
        assert_eq!(e.to_string(), "0.000001 is out of range (0.01 to 10 s)");
        let e = FREQUENCY_MHZ.check(1e300).unwrap_err();
        assert!(e.to_string().starts_with("1.000000e300 is out"), "{e}");
    }
}
