//! The Friis receiver cascade and the system noise temperature.
//!
//! Reference point: **the antenna output terminals** (feed/waveguide input). Tsys =
//! T_antenna + T_receiver, where T_receiver is the Friis cascade of feed/line loss,
//! LNA and later stages referred to that point; the matching gain is the antenna
//! gain itself, so G/T = G_antenna - 10 log10(Tsys) with no feed loss subtracted
//! (the feed loss is inside T_receiver).
//!
//! Friis cascade (H. T. Friis, "Noise Figures of Radio Receivers", Proc. IRE 32
//! (1944) 419-422): T = T1 + T2/G1 + T3/(G1 G2) + ...; a passive loss L at physical
//! temperature Tp has gain 1/L and noise temperature (L - 1) Tp.
//!
//! The antenna's own temperature (sky, ground, man-made) comes from the pattern integral of
//! [`super::antenna_table`]; this module adds the receiver.

use crate::units::{db_to_ratio, noise_figure_db_to_temperature_k};

/// Errors of the system-noise model.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
pub enum NoiseError {
    #[error("loss must be >= 0 dB and finite, got {loss_db} dB ({what})")]
    Loss { what: &'static str, loss_db: f64 },
    #[error("temperature must be >= 0 K and finite, got {temperature_k} K ({what})")]
    Temperature {
        what: &'static str,
        temperature_k: f64,
    },
    #[error("noise figure must be >= 0 dB and finite, got {nf_db} dB ({what})")]
    NoiseFigure { what: &'static str, nf_db: f64 },
    #[error("gain must be finite, got {gain_db} dB ({what})")]
    Gain { what: &'static str, gain_db: f64 },
}

/// One stage of a receiver cascade: available gain and input-referred noise temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Stage {
    pub gain_db: f64,
    pub noise_temperature_k: f64,
}

impl Stage {
    /// A passive loss `loss_db` at physical temperature `physical_k`: gain -L dB,
    /// noise temperature (L - 1) Tp.
    pub fn passive_loss(loss_db: f64, physical_k: f64) -> Self {
        Self {
            gain_db: -loss_db,
            noise_temperature_k: (db_to_ratio(loss_db) - 1.0) * physical_k,
        }
    }

    /// An active stage given by noise figure (dB, at T0 = 290 K) and gain (dB).
    pub fn from_noise_figure(noise_figure_db: f64, gain_db: f64) -> Self {
        Self {
            gain_db,
            noise_temperature_k: noise_figure_db_to_temperature_k(noise_figure_db),
        }
    }
}

/// Friis cascade noise temperature (K) referred to the input of the first stage:
/// T = T1 + T2/G1 + T3/(G1 G2) + ...
pub fn friis_cascade_k(stages: &[Stage]) -> f64 {
    let mut total = 0.0;
    let mut gain = 1.0;
    for s in stages {
        total += s.noise_temperature_k / gain;
        gain *= db_to_ratio(s.gain_db);
    }
    total
}

/// LNA noise, as a noise temperature or a noise figure.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum LnaNoise {
    TemperatureK(f64),
    NoiseFigureDb(f64),
}

/// Receiving chain as given by the user.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ReceiverSpec {
    /// Feed/waveguide loss between antenna terminals and LNA input, dB.
    pub feed_loss_db: f64,
    /// Physical temperature of that loss, K (typically 290 K).
    pub feed_temperature_k: f64,
    pub lna_noise: LnaNoise,
    pub lna_gain_db: f64,
    /// Lumped noise figure of everything after the LNA (cables, down-converter, demodulator), dB.
    pub later_noise_figure_db: f64,
}

/// A validated receiver: its cascade noise temperature referred to the antenna terminals.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Receiver {
    stages: [Stage; 3],
    receiver_temperature_k: f64,
}

impl Receiver {
    pub fn new(spec: &ReceiverSpec) -> Result<Self, NoiseError> {
        if !(spec.feed_loss_db >= 0.0 && spec.feed_loss_db.is_finite()) {
            return Err(NoiseError::Loss {
                what: "feed loss",
                loss_db: spec.feed_loss_db,
            });
        }
        check_temperature("feed physical temperature", spec.feed_temperature_k)?;
        let lna_t = match spec.lna_noise {
            LnaNoise::TemperatureK(t) => {
                check_temperature("LNA noise temperature", t)?;
                t
            }
            LnaNoise::NoiseFigureDb(nf) => {
                check_nf("LNA", nf)?;
                noise_figure_db_to_temperature_k(nf)
            }
        };
        if !spec.lna_gain_db.is_finite() {
            return Err(NoiseError::Gain {
                what: "LNA gain",
                gain_db: spec.lna_gain_db,
            });
        }
        check_nf("later stages", spec.later_noise_figure_db)?;
        let stages = [
            Stage::passive_loss(spec.feed_loss_db, spec.feed_temperature_k),
            Stage {
                gain_db: spec.lna_gain_db,
                noise_temperature_k: lna_t,
            },
            Stage::from_noise_figure(spec.later_noise_figure_db, 0.0),
        ];
        Ok(Self {
            stages,
            receiver_temperature_k: friis_cascade_k(&stages),
        })
    }

    /// Receiver noise temperature referred to the antenna terminals, K.
    pub fn temperature_k(&self) -> f64 {
        self.receiver_temperature_k
    }

    /// The three cascade stages (feed loss, LNA, later stages).
    pub fn stages(&self) -> &[Stage; 3] {
        &self.stages
    }
}

fn check_temperature(what: &'static str, t: f64) -> Result<(), NoiseError> {
    if t >= 0.0 && t.is_finite() {
        Ok(())
    } else {
        Err(NoiseError::Temperature {
            what,
            temperature_k: t,
        })
    }
}

fn check_nf(what: &'static str, nf_db: f64) -> Result<(), NoiseError> {
    if nf_db >= 0.0 && nf_db.is_finite() {
        Ok(())
    } else {
        Err(NoiseError::NoiseFigure { what, nf_db })
    }
}

/// Thermal noise power (W) of a source at `temperature_k` over `bandwidth_hz`: N = k T B.
pub fn thermal_noise_power_w(temperature_k: f64, bandwidth_hz: f64) -> f64 {
    // N = k T B
    crate::units::BOLTZMANN_J_PER_K * temperature_k * bandwidth_hz
}
