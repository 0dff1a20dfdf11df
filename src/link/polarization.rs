//! Polarization mismatch between the spacecraft antenna and the ground antenna.
//!
//! Polarization loss factor for two elliptical polarizations with axial ratios
//! r_w (incident wave) and r_a (receiving antenna), signed by sense (+ for one
//! hand, - for the other), and tilt-angle difference dtau between the major axes:
//!
//!   PLF = 1/2 + [4 r_w r_a + (1 - r_w^2)(1 - r_a^2) cos(2 dtau)] / [2 (1 + r_w^2)(1 + r_a^2)]
//!
//! Source: J. S. Seybold, *Introduction to RF Propagation*, Wiley 2005, ch. 2
//! (polarization coupling of elliptical polarizations; the same result appears in
//! H. Mott, *Antennas for Radar and Communications: A Polarimetric Approach*,
//! Wiley 1992). The attribution (book and chapter) is from memory, not re-read;
//! the formula itself is checked by its limiting cases below and by the
//! independent special case PLF = (1 + r)^2 / (2 (1 + r^2)) for a pure circular
//! wave on an antenna of axial ratio r (tests). The code uses the inverse axial ratios rho = 1/r (|rho| <= 1, rho = 0
//! for linear), obtained by multiplying numerator and denominator by r_w^2 r_a^2:
//!
//!   PLF = 1/2 + [4 rho_w rho_a + (rho_w^2 - 1)(rho_a^2 - 1) cos(2 dtau)] / [2 (1 + rho_w^2)(1 + rho_a^2)]
//!
//! Limiting cases (all tested): same-sense circular -> 1 (0 dB); opposite-sense
//! circular -> 0; circular vs linear -> 1/2 (3.01 dB); linear vs linear -> cos^2(dtau).
//! Sense convention: RHCP and LHCP are both stated for the same propagation
//! direction (the IEEE definition, as seen by the transmitter), so two RHCP antennas
//! (one transmitting, one receiving) match.

use crate::units::ratio_to_db;

/// Polarization sense of an antenna. In files: `rhcp` (or `right`), `lhcp` (or `left`), `linear`,
/// in any letter case.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum PolarizationSense {
    Rhcp,
    Lhcp,
    Linear,
}

impl PolarizationSense {
    /// The names accepted in files (aliases aside), as serde lists them in messages.
    pub const NAMES: &'static [&'static str] = &["rhcp", "lhcp", "linear"];

    /// Parse a name: `rhcp`/`right`, `lhcp`/`left`, `linear`, in any letter case.
    pub fn parse(text: &str) -> Option<Self> {
        match text.to_ascii_lowercase().as_str() {
            "rhcp" | "right" => Some(Self::Rhcp),
            "lhcp" | "left" => Some(Self::Lhcp),
            "linear" => Some(Self::Linear),
            _ => None,
        }
    }

    /// The name written in files and outputs.
    pub fn name(self) -> &'static str {
        match self {
            Self::Rhcp => "rhcp",
            Self::Lhcp => "lhcp",
            Self::Linear => "linear",
        }
    }
}

/// Deserialized through [`PolarizationSense::parse`] (aliases and any letter case); an unknown
/// name is serde's "unknown variant" error, so a YAML reader reports it with its line.
impl<'de> serde::Deserialize<'de> for PolarizationSense {
    fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct Sense;
        impl serde::de::Visitor<'_> for Sense {
            type Value = PolarizationSense;
            fn expecting(&self, f: &mut std::fmt::Formatter) -> std::fmt::Result {
                f.write_str("one of rhcp, lhcp, linear")
            }
            fn visit_str<E: serde::de::Error>(self, s: &str) -> Result<PolarizationSense, E> {
                PolarizationSense::parse(s)
                    .ok_or_else(|| E::unknown_variant(s, PolarizationSense::NAMES))
            }
        }
        d.deserialize_str(Sense)
    }
}

/// An antenna's polarization: sense plus axial ratio in dB (20 log10 of the
/// major/minor field ratio; 0 dB = perfect circular; ignored for `Linear`).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Polarization {
    pub sense: PolarizationSense,
    pub axial_ratio_db: f64,
}

/// Orientation of the two polarization ellipses relative to each other.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum EllipseOrientation {
    /// Major axes crossed (cos 2 dtau = -1): the largest loss, the planning default.
    WorstCase,
    /// Major axes aligned (cos 2 dtau = +1).
    BestCase,
    /// A stated tilt difference between the major axes, degrees.
    TiltDifferenceDeg(f64),
}

/// Errors of the polarization model.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
pub enum PolarizationError {
    #[error("axial ratio must be >= 0 dB and finite, got {axial_ratio_db} dB")]
    AxialRatio { axial_ratio_db: f64 },
    #[error("additional polarization/radome loss must be >= 0 dB and finite, got {loss_db} dB")]
    ExtraLoss { loss_db: f64 },
    #[error("the antennas are exactly cross-polarized (loss factor {plf}); no power is received")]
    CrossPolarized { plf: f64 },
    #[error("tilt difference must be finite, got {tilt_deg} deg")]
    Tilt { tilt_deg: f64 },
}

fn signed_inverse_axial_ratio(p: &Polarization) -> Result<f64, PolarizationError> {
    if p.sense == PolarizationSense::Linear {
        return Ok(0.0);
    }
    if !(p.axial_ratio_db >= 0.0 && p.axial_ratio_db.is_finite()) {
        return Err(PolarizationError::AxialRatio {
            axial_ratio_db: p.axial_ratio_db,
        });
    }
    // rho = 1 / r, r = 10^(AR_dB / 20) (field ratio)
    let rho = 10f64.powf(-p.axial_ratio_db / 20.0);
    Ok(if p.sense == PolarizationSense::Rhcp {
        rho
    } else {
        -rho
    })
}

/// Polarization loss factor (linear, in [0, 1]) between a transmitting and a
/// receiving antenna (Seybold 2005, ch. 2; see module doc).
pub fn polarization_loss_factor(
    tx: &Polarization,
    rx: &Polarization,
    orientation: EllipseOrientation,
) -> Result<f64, PolarizationError> {
    let rho_w = signed_inverse_axial_ratio(tx)?;
    let rho_a = signed_inverse_axial_ratio(rx)?;
    let cos2 = match orientation {
        EllipseOrientation::WorstCase => -1.0,
        EllipseOrientation::BestCase => 1.0,
        EllipseOrientation::TiltDifferenceDeg(t) => {
            if !t.is_finite() {
                return Err(PolarizationError::Tilt { tilt_deg: t });
            }
            (2.0 * t.to_radians()).cos()
        }
    };
    // PLF = 1/2 + [4 rho_w rho_a + (rho_w^2 - 1)(rho_a^2 - 1) cos 2dtau] / [2 (1 + rho_w^2)(1 + rho_a^2)]
    let num = 4.0 * rho_w * rho_a + (rho_w * rho_w - 1.0) * (rho_a * rho_a - 1.0) * cos2;
    let den = 2.0 * (1.0 + rho_w * rho_w) * (1.0 + rho_a * rho_a);
    Ok((0.5 + num / den).clamp(0.0, 1.0))
}

/// Polarization mismatch loss in dB (>= 0) plus an optional fixed extra loss
/// (radome, other), in dB. Exact cross-polarization (PLF <= 1e-12, i.e. beyond
/// 120 dB, which is rounding noise around PLF = 0) is an error.
pub fn polarization_loss_db(
    tx: &Polarization,
    rx: &Polarization,
    orientation: EllipseOrientation,
    extra_loss_db: f64,
) -> Result<f64, PolarizationError> {
    if !(extra_loss_db >= 0.0 && extra_loss_db.is_finite()) {
        return Err(PolarizationError::ExtraLoss {
            loss_db: extra_loss_db,
        });
    }
    let plf = polarization_loss_factor(tx, rx, orientation)?;
    // PLF below 1e-12 (> 120 dB) is rounding noise around exact cross-polarization
    if plf <= 1e-12 {
        return Err(PolarizationError::CrossPolarized { plf });
    }
    // loss = -10 log10(PLF)
    Ok(-ratio_to_db(plf) + extra_loss_db)
}
