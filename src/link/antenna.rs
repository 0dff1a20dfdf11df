//! Spacecraft transmitter + antenna pattern, and the ground antenna (gain,
//! half-power beamwidth, pointing loss).
//!
//! * cos^n pattern: a power pattern P(theta) = cos^n(theta) for theta < 90 deg (zero
//!   behind) has directivity D = 2 (n + 1) (integrate cos^n over the hemisphere:
//!   D = 4 pi / (2 pi / (n + 1))). Given only a boresight gain G0 (taken equal to
//!   the directivity, i.e. 100 % efficiency) n = G0_lin / 2 - 1; a caller may give
//!   n explicitly instead, then G0 is used as given. Valid 0 <= theta < 90 deg.
//! * Table pattern: gain vs off-nadir angle, linear interpolation in dBi; outside
//!   the table the end value is used (clamped) and the result is flagged.
//! * Ground dish gain G = eta (pi D / lambda)^2 (aperture antenna, e.g. Balanis,
//!   *Antenna Theory*, 3rd ed., ch. 15 aperture efficiency).
//! * Half-power beamwidth theta_3dB = 70 lambda / D degrees (common practice for
//!   a tapered-illumination parabolic dish; uniform illumination gives 58.4 lambda/D).
//! * Pointing loss L = 12 (theta_err / theta_3dB)^2 dB (common practice: the
//!   parabolic approximation of the main lobe matching -3 dB at theta_3dB / 2).

use crate::units::{db_to_ratio, ratio_to_db, watts_to_dbw, wavelength_m};

/// Errors of the antenna and transmitter models.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum AntennaError {
    #[error("transmitter power must be positive and finite, got {watts} W")]
    PowerWatts { watts: f64 },
    #[error("transmitter power must be finite, got {dbw} dBW")]
    PowerDbw { dbw: f64 },
    #[error("loss must be >= 0 dB and finite, got {loss_db} dB ({what})")]
    Loss { what: &'static str, loss_db: f64 },
    #[error("gain must be finite, got {gain_dbi} dBi")]
    Gain { gain_dbi: f64 },
    #[error("cos^n exponent must be >= 0 and finite, got {n}")]
    CosExponent { n: f64 },
    #[error("boresight gain {gain_dbi} dBi is below 3.01 dBi, too low for a cos^n pattern (n = G/2 - 1 < 0)")]
    CosGainTooLow { gain_dbi: f64 },
    #[error("pattern table needs at least one point")]
    EmptyTable,
    #[error("pattern table row {index}: off-nadir {off_nadir_deg} deg / gain {gain_dbi} dBi must be finite, angles strictly increasing in [0, 180]")]
    TableRow {
        index: usize,
        off_nadir_deg: f64,
        gain_dbi: f64,
    },
    #[error("aperture efficiency must be in (0, 1], got {value}")]
    Efficiency { value: f64 },
    #[error("dish diameter must be positive and finite, got {diameter_m} m")]
    Diameter { diameter_m: f64 },
    #[error("beamwidth must be positive and finite, got {beamwidth_deg} deg")]
    Beamwidth { beamwidth_deg: f64 },
    #[error("pointing error must be >= 0 and finite, got {pointing_error_deg} deg")]
    PointingError { pointing_error_deg: f64 },
    #[error("frequency must be positive and finite, got {frequency_hz} Hz")]
    Frequency { frequency_hz: f64 },
    #[error(
        "off-nadir angle {off_nadir_deg} deg is outside the cos^n pattern's range [0, 90) deg"
    )]
    OffNadir { off_nadir_deg: f64 },
}

/// Spacecraft antenna gain pattern versus off-nadir angle.
#[derive(Debug, Clone, PartialEq)]
pub enum TxPattern {
    /// The same gain in every direction of interest.
    Fixed { gain_dbi: f64 },
    /// cos^n power pattern from boresight (nadir); `n = None` derives n from the
    /// boresight gain via D = 2 (n + 1).
    CosN {
        boresight_gain_dbi: f64,
        n: Option<f64>,
    },
    /// Rows `[off_nadir_deg, gain_dbi]`, angles strictly increasing; linear
    /// interpolation; clamped (and flagged) outside.
    Table(Vec<[f64; 2]>),
}

/// Transmitter output power, in watts or dBW.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum TxPower {
    Watts(f64),
    Dbw(f64),
}

/// Transmitter description as given by the user.
#[derive(Debug, Clone, PartialEq)]
pub struct TransmitterSpec {
    pub power: TxPower,
    /// Losses between amplifier output and antenna input (filters, cables), dB.
    pub line_loss_db: f64,
    pub pattern: TxPattern,
}

/// A gain looked up in a pattern, with whether it was clamped at a table end.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PatternGain {
    pub gain_dbi: f64,
    pub clamped: bool,
}

#[derive(Debug, Clone, PartialEq)]
enum PreparedPattern {
    Fixed { gain_dbi: f64 },
    CosN { boresight_gain_dbi: f64, n: f64 },
    Table(Vec<[f64; 2]>),
}

/// A validated transmitter: power after line losses, and the pattern.
#[derive(Debug, Clone, PartialEq)]
pub struct Transmitter {
    power_dbw: f64,
    line_loss_db: f64,
    pattern: PreparedPattern,
}

impl Transmitter {
    pub fn new(spec: &TransmitterSpec) -> Result<Self, AntennaError> {
        let power_dbw = match spec.power {
            TxPower::Watts(w) => {
                if !(w > 0.0 && w.is_finite()) {
                    return Err(AntennaError::PowerWatts { watts: w });
                }
                watts_to_dbw(w)
            }
            TxPower::Dbw(d) => {
                if !d.is_finite() {
                    return Err(AntennaError::PowerDbw { dbw: d });
                }
                d
            }
        };
        check_loss("transmitter line loss", spec.line_loss_db)?;
        let pattern = match &spec.pattern {
            TxPattern::Fixed { gain_dbi } => {
                check_gain(*gain_dbi)?;
                PreparedPattern::Fixed {
                    gain_dbi: *gain_dbi,
                }
            }
            TxPattern::CosN {
                boresight_gain_dbi,
                n,
            } => {
                check_gain(*boresight_gain_dbi)?;
                let n = match n {
                    Some(n) => {
                        if !(*n >= 0.0 && n.is_finite()) {
                            return Err(AntennaError::CosExponent { n: *n });
                        }
                        *n
                    }
                    None => cos_exponent_from_gain(*boresight_gain_dbi)?,
                };
                PreparedPattern::CosN {
                    boresight_gain_dbi: *boresight_gain_dbi,
                    n,
                }
            }
            TxPattern::Table(rows) => {
                if rows.is_empty() {
                    return Err(AntennaError::EmptyTable);
                }
                let mut prev = f64::NEG_INFINITY;
                for (index, r) in rows.iter().enumerate() {
                    let [a, g] = *r;
                    if !(a.is_finite() && g.is_finite() && a > prev && (0.0..=180.0).contains(&a)) {
                        return Err(AntennaError::TableRow {
                            index,
                            off_nadir_deg: a,
                            gain_dbi: g,
                        });
                    }
                    prev = a;
                }
                PreparedPattern::Table(rows.clone())
            }
        };
        Ok(Self {
            power_dbw,
            line_loss_db: spec.line_loss_db,
            pattern,
        })
    }

    /// Amplifier output power, dBW.
    pub fn power_dbw(&self) -> f64 {
        self.power_dbw
    }

    /// Amplifier-to-antenna loss, dB.
    pub fn line_loss_db(&self) -> f64 {
        self.line_loss_db
    }

    /// The cos^n exponent in use, if the pattern is cos^n.
    pub fn cos_exponent(&self) -> Option<f64> {
        match self.pattern {
            PreparedPattern::CosN { n, .. } => Some(n),
            _ => None,
        }
    }

    /// Antenna gain toward a direction `off_nadir_deg` from the antenna boresight.
    pub fn gain_dbi(&self, off_nadir_deg: f64) -> Result<PatternGain, AntennaError> {
        if !off_nadir_deg.is_finite() || off_nadir_deg < 0.0 {
            return Err(AntennaError::OffNadir { off_nadir_deg });
        }
        match &self.pattern {
            PreparedPattern::Fixed { gain_dbi } => Ok(PatternGain {
                gain_dbi: *gain_dbi,
                clamped: false,
            }),
            PreparedPattern::CosN {
                boresight_gain_dbi,
                n,
            } => {
                if off_nadir_deg >= 90.0 {
                    return Err(AntennaError::OffNadir { off_nadir_deg });
                }
                // G(theta) = G0 + 10 n log10(cos theta)
                Ok(PatternGain {
                    gain_dbi: boresight_gain_dbi
                        + 10.0 * n * off_nadir_deg.to_radians().cos().log10(),
                    clamped: false,
                })
            }
            PreparedPattern::Table(rows) => Ok(interpolate_table(rows, off_nadir_deg)),
        }
    }

    /// EIRP toward the station, dBW: P - L_line + G(theta).
    pub fn eirp_dbw(&self, off_nadir_deg: f64) -> Result<(f64, PatternGain), AntennaError> {
        let g = self.gain_dbi(off_nadir_deg)?;
        // EIRP = P_tx - L_line + G(theta)
        Ok((self.power_dbw - self.line_loss_db + g.gain_dbi, g))
    }
}

/// cos^n exponent from a boresight gain (dBi): D = 2 (n + 1) -> n = D / 2 - 1.
pub fn cos_exponent_from_gain(boresight_gain_dbi: f64) -> Result<f64, AntennaError> {
    check_gain(boresight_gain_dbi)?;
    let n = db_to_ratio(boresight_gain_dbi) / 2.0 - 1.0;
    if n < 0.0 {
        return Err(AntennaError::CosGainTooLow {
            gain_dbi: boresight_gain_dbi,
        });
    }
    Ok(n)
}

fn interpolate_table(rows: &[[f64; 2]], x: f64) -> PatternGain {
    let first = rows[0];
    let last = rows[rows.len() - 1];
    if x < first[0] {
        return PatternGain {
            gain_dbi: first[1],
            clamped: true,
        };
    }
    if x > last[0] {
        return PatternGain {
            gain_dbi: last[1],
            clamped: true,
        };
    }
    // rows sorted: find the segment [a_i, a_{i+1}] holding x
    let i = rows.partition_point(|r| r[0] <= x).saturating_sub(1);
    if i + 1 >= rows.len() {
        return PatternGain {
            gain_dbi: rows[i][1],
            clamped: false,
        };
    }
    let [a0, g0] = rows[i];
    let [a1, g1] = rows[i + 1];
    // g = g0 + (g1 - g0) (x - a0) / (a1 - a0)
    PatternGain {
        gain_dbi: g0 + (g1 - g0) * (x - a0) / (a1 - a0),
        clamped: false,
    }
}

fn check_gain(gain_dbi: f64) -> Result<(), AntennaError> {
    if gain_dbi.is_finite() {
        Ok(())
    } else {
        Err(AntennaError::Gain { gain_dbi })
    }
}

pub(crate) fn check_loss(what: &'static str, loss_db: f64) -> Result<(), AntennaError> {
    if loss_db >= 0.0 && loss_db.is_finite() {
        Ok(())
    } else {
        Err(AntennaError::Loss { what, loss_db })
    }
}

/// Ground antenna as given by the user.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum GroundAntennaSpec {
    /// Parabolic dish: gain from diameter and aperture efficiency, beamwidth 70 lambda/D.
    Dish {
        diameter_m: f64,
        efficiency: f64,
        pointing_error_deg: f64,
    },
    /// Gain and half-power beamwidth given directly.
    Gain {
        gain_dbi: f64,
        beamwidth_deg: f64,
        pointing_error_deg: f64,
    },
}

/// A validated ground antenna at one frequency.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GroundAntenna {
    pub gain_dbi: f64,
    pub beamwidth_deg: f64,
    pub pointing_error_deg: f64,
    pub pointing_loss_db: f64,
}

/// Dish gain (dBi): G = eta (pi D / lambda)^2.
pub fn dish_gain_dbi(
    diameter_m: f64,
    efficiency: f64,
    frequency_hz: f64,
) -> Result<f64, AntennaError> {
    check_dish(diameter_m, efficiency, frequency_hz)?;
    let lambda = wavelength_m(frequency_hz);
    // G = eta (pi D / lambda)^2
    Ok(ratio_to_db(
        efficiency * (std::f64::consts::PI * diameter_m / lambda).powi(2),
    ))
}

/// Half-power beamwidth (deg) of a dish: 70 lambda / D (common practice).
pub fn dish_beamwidth_deg(diameter_m: f64, frequency_hz: f64) -> Result<f64, AntennaError> {
    check_dish(diameter_m, 1.0, frequency_hz)?;
    // theta_3dB = 70 lambda / D  degrees
    Ok(70.0 * wavelength_m(frequency_hz) / diameter_m)
}

/// Pointing loss (dB): 12 (theta_err / theta_3dB)^2 (common practice).
pub fn pointing_loss_db(pointing_error_deg: f64, beamwidth_deg: f64) -> Result<f64, AntennaError> {
    if !(pointing_error_deg >= 0.0 && pointing_error_deg.is_finite()) {
        return Err(AntennaError::PointingError { pointing_error_deg });
    }
    if !(beamwidth_deg > 0.0 && beamwidth_deg.is_finite()) {
        return Err(AntennaError::Beamwidth { beamwidth_deg });
    }
    // L_point = 12 (theta_err / theta_3dB)^2
    Ok(12.0 * (pointing_error_deg / beamwidth_deg).powi(2))
}

fn check_dish(diameter_m: f64, efficiency: f64, frequency_hz: f64) -> Result<(), AntennaError> {
    if !(diameter_m > 0.0 && diameter_m.is_finite()) {
        return Err(AntennaError::Diameter { diameter_m });
    }
    if !(efficiency > 0.0 && efficiency <= 1.0) {
        return Err(AntennaError::Efficiency { value: efficiency });
    }
    if !(frequency_hz > 0.0 && frequency_hz.is_finite()) {
        return Err(AntennaError::Frequency { frequency_hz });
    }
    Ok(())
}

impl GroundAntenna {
    pub fn new(spec: &GroundAntennaSpec, frequency_hz: f64) -> Result<Self, AntennaError> {
        let (gain_dbi, beamwidth_deg, pointing_error_deg) = match *spec {
            GroundAntennaSpec::Dish {
                diameter_m,
                efficiency,
                pointing_error_deg,
            } => (
                dish_gain_dbi(diameter_m, efficiency, frequency_hz)?,
                dish_beamwidth_deg(diameter_m, frequency_hz)?,
                pointing_error_deg,
            ),
            GroundAntennaSpec::Gain {
                gain_dbi,
                beamwidth_deg,
                pointing_error_deg,
            } => {
                check_gain(gain_dbi)?;
                (gain_dbi, beamwidth_deg, pointing_error_deg)
            }
        };
        let pointing_loss_db = pointing_loss_db(pointing_error_deg, beamwidth_deg)?;
        Ok(Self {
            gain_dbi,
            beamwidth_deg,
            pointing_error_deg,
            pointing_loss_db,
        })
    }
}
