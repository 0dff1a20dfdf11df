//! The prepared link budget: build a [`LinkModel`] once (validated), then
//! [`LinkModel::evaluate`] it at every instant of a pass (pure, no allocation).
//!
//! Budget chain (all dB quantities; Friis transmission equation in dB form):
//!   EIRP     = P_tx - L_line + G_tx(off-nadir)
//!   C/N0     = EIRP - L_fs - A_atm - L_pol - L_point + G/T - 10 log10(k)      (dBHz)
//!   G/T      = G_rx - 10 log10(Tsys)   (reference point: antenna terminals, see noise::system)
//!   Tsys     = T_antenna + T_receiver,  T_antenna = T_sky + T_ground + T_man-made
//!              (the terms of `noise::ExternalNoise`, given per instant by the caller, which
//!              interpolates them from the station's antenna-noise tables: `noise::antenna_table`)
//!   Tsky(boresight) = Tmr (1 - 10^(-A_abs/10)) + Tbg 10^(-A_abs/10)          (P.618-14 eq. 69;
//!              reported as the sky brightness along the boresight, not used in Tsys)
//!   Rs       = Rb / m_info (m_info = information bits per symbol);  B_occ = Rs (1 + roll-off)
//!   Eb/N0    = C/N0 - 10 log10(Rb);  Es/N0 = C/N0 - 10 log10(Rs)
//!   margin   = Eb/N0 - required Eb/N0 - implementation loss
//!   Shannon  = B_occ log2(1 + C/(N0 B_occ));  gap = required Eb/N0 - (2^eta_B - 1)/eta_B in dB,
//!              eta_B = Rb / B_occ (one bandwidth for every Shannon figure, see `link::capacity`)
//! k = Boltzmann constant (exact, SI 2019, `crate::units`).

use crate::link::antenna::{
    AntennaError, GroundAntenna, GroundAntennaSpec, Transmitter, TransmitterSpec,
};
use crate::link::capacity::{shannon_capacity_unchecked, shannon_limit_unchecked};
use crate::link::modcod::OperatingPoint;
use crate::link::path::{free_space_loss_constant_db, PathError};
use crate::link::polarization::{
    polarization_loss_db, EllipseOrientation, Polarization, PolarizationError,
};
use crate::noise::sky::{background_temperature_k, sky_temperature_unchecked, SkyError, SkyRange};
use crate::noise::system::{NoiseError, Receiver, ReceiverSpec};
use crate::noise::ExternalNoise;
use crate::units::{db_to_ratio, ratio_to_db, BOLTZMANN_DBW_PER_K_HZ};

/// Errors of the link budget (each carries the offending value).
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum BudgetError {
    #[error("frequency must be positive and finite, got {frequency_hz} Hz")]
    Frequency { frequency_hz: f64 },
    #[error(transparent)]
    Antenna(#[from] AntennaError),
    #[error(transparent)]
    Polarization(#[from] PolarizationError),
    #[error(transparent)]
    Noise(#[from] NoiseError),
    #[error(transparent)]
    Sky(#[from] SkyError),
    #[error(transparent)]
    Path(#[from] PathError),
    #[error("maximum occupied bandwidth must be positive and finite, got {value_hz} Hz")]
    MaxBandwidth { value_hz: f64 },
    #[error("data rate must be positive and finite, got {rate_bps} bit/s")]
    Rate { rate_bps: f64 },
    #[error("roll-off must be in [0, 1], got {value}")]
    RollOff { value: f64 },
    #[error("implementation loss must be >= 0 dB and finite, got {loss_db} dB")]
    ImplementationLoss { loss_db: f64 },
    #[error("rate {} occupies {}, more than the allowed {} (modem.max_bandwidth_hz)", crate::engfmt::rate(*.rate_bps), hz5(*.occupied_bandwidth_hz), hz5(*.max_bandwidth_hz))]
    RateExceedsBandwidth {
        rate_bps: f64,
        occupied_bandwidth_hz: f64,
        max_bandwidth_hz: f64,
    },
    #[error("range must be positive and finite, got {range_km} km")]
    Range { range_km: f64 },
    #[error("elevation must be within [-90, 90] deg, got {elevation_deg} deg")]
    Elevation { elevation_deg: f64 },
    #[error("atmospheric loss must be >= 0 dB and finite, got total {total_db} dB, absorptive {absorptive_db} dB")]
    Atmosphere { total_db: f64, absorptive_db: f64 },
    #[error("mean radiating temperature must be >= 0 K and finite, got {value_k} K")]
    MeanRadiatingTemperature { value_k: f64 },
    #[error("noise terms must be >= 0 K and finite, got sky {sky_k} K, ground {ground_k} K, man-made {man_made_k} K, Sun {sun_k} K, Moon {moon_k} K")]
    ExternalNoise {
        sky_k: f64,
        ground_k: f64,
        man_made_k: f64,
        sun_k: f64,
        moon_k: f64,
    },
}

/// Polarization of both ends plus a fixed extra loss (radome, other).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PolarizationSpec {
    pub spacecraft: Polarization,
    pub ground: Polarization,
    pub orientation: EllipseOrientation,
    pub extra_loss_db: f64,
}

/// Everything the link model is built from.
#[derive(Debug, Clone, PartialEq)]
pub struct LinkModelSpec {
    pub frequency_hz: f64,
    pub transmitter: TransmitterSpec,
    pub ground_antenna: GroundAntennaSpec,
    pub receiver: ReceiverSpec,
    pub polarization: PolarizationSpec,
    /// Largest occupied bandwidth Rs (1 + roll-off) allowed (e.g. the band allocation), Hz.
    pub max_occupied_bandwidth_hz: Option<f64>,
}

/// Geometry at one instant.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BudgetGeometry {
    pub elevation_deg: f64,
    pub range_km: f64,
    /// Angle between the spacecraft antenna boresight (nadir) and the station direction.
    pub off_nadir_deg: f64,
}

/// Atmospheric numbers at one instant (from the atmosphere models, as plain inputs).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AtmosphereLoss {
    /// Total attenuation on the path (gas + cloud + rain + scintillation), dB.
    pub total_db: f64,
    /// Absorptive part (excluding scintillation), dB: drives the sky noise.
    pub absorptive_db: f64,
    /// Mean radiating temperature, K (P.618-14 §3: 275 K without local data).
    pub mean_radiating_temperature_k: f64,
}

impl AtmosphereLoss {
    /// No atmosphere (vacuum): 0 dB, Tmr = 275 K (irrelevant at 0 dB).
    pub const CLEAR_VACUUM: AtmosphereLoss = AtmosphereLoss {
        total_db: 0.0,
        absorptive_db: 0.0,
        mean_radiating_temperature_k: 275.0,
    };
}

/// A validated rate choice: data rate, scheme at its operating point, roll-off,
/// implementation loss.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RateSpec {
    rate_bps: f64,
    operating: OperatingPoint,
    roll_off: f64,
    implementation_loss_db: f64,
}

impl RateSpec {
    pub fn new(
        rate_bps: f64,
        operating: OperatingPoint,
        roll_off: f64,
        implementation_loss_db: f64,
    ) -> Result<Self, BudgetError> {
        if !(rate_bps > 0.0 && rate_bps.is_finite()) {
            return Err(BudgetError::Rate { rate_bps });
        }
        if !(0.0..=1.0).contains(&roll_off) {
            return Err(BudgetError::RollOff { value: roll_off });
        }
        if !(implementation_loss_db >= 0.0 && implementation_loss_db.is_finite()) {
            return Err(BudgetError::ImplementationLoss {
                loss_db: implementation_loss_db,
            });
        }
        Ok(Self {
            rate_bps,
            operating,
            roll_off,
            implementation_loss_db,
        })
    }

    pub fn rate_bps(&self) -> f64 {
        self.rate_bps
    }
    pub fn operating(&self) -> &OperatingPoint {
        &self.operating
    }
    pub fn roll_off(&self) -> f64 {
        self.roll_off
    }
    pub fn implementation_loss_db(&self) -> f64 {
        self.implementation_loss_db
    }
    /// Symbol rate Rs = Rb / m_info, baud (m_info = information bits per symbol = bits per symbol
    /// x code rate x framing efficiency).
    pub fn symbol_rate_baud(&self) -> f64 {
        self.rate_bps / self.operating.spectral_efficiency
    }
    /// Channel (coded) bit rate Rc = Rs x bits per symbol, bit/s: the information rate with the
    /// framing overhead and the code's redundancy.
    pub fn channel_rate_bps(&self) -> f64 {
        self.symbol_rate_baud() * self.operating.bits_per_symbol as f64
    }
    /// Occupied bandwidth Rs (1 + roll-off), Hz.
    pub fn occupied_bandwidth_hz(&self) -> f64 {
        self.symbol_rate_baud() * (1.0 + self.roll_off)
    }
}

/// Every number of the budget at one instant. Copy, no allocation.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BudgetValues {
    /// Spacecraft antenna gain toward the station, dBi.
    pub spacecraft_gain_dbi: f64,
    pub eirp_dbw: f64,
    pub free_space_loss_db: f64,
    pub atmospheric_loss_db: f64,
    pub polarization_loss_db: f64,
    pub pointing_loss_db: f64,
    pub antenna_gain_dbi: f64,
    /// Sky brightness along the boresight (P.618-14 eq. 69), K: shown for reference; the sky's
    /// share of the antenna temperature is `sky_noise_k`.
    pub sky_temperature_k: f64,
    /// Sky above the horizon through the whole pattern, K.
    pub sky_noise_k: f64,
    /// Ground below the horizon through the whole pattern, K.
    pub ground_noise_k: f64,
    /// Man-made noise of the surroundings (ITU-R P.372 Table 1), K.
    pub man_made_noise_k: f64,
    /// The Sun's disk through the pattern, K (0 when not known: a budget without a time, whose
    /// outputs then say "not evaluated", `plan::instant`).
    pub sun_noise_k: f64,
    /// The Moon's disk through the pattern, K.
    pub moon_noise_k: f64,
    /// Angle between the pointing and the Sun's centre, deg (`None` without a time).
    pub sun_separation_deg: Option<f64>,
    /// Angle between the pointing and the Moon's centre, deg (`None` without a time).
    pub moon_separation_deg: Option<f64>,
    /// Receiver (Friis cascade at the antenna terminals), K.
    pub receiver_noise_k: f64,
    /// Sum of the external terms (sky, ground, man-made, Sun, Moon), K.
    pub antenna_temperature_k: f64,
    /// Antenna temperature + receiver noise, K.
    pub system_temperature_k: f64,
    pub g_over_t_db_k: f64,
    pub cn0_dbhz: f64,
    /// Information rate, bit/s (Eb is per information bit).
    pub rate_bps: f64,
    /// Channel (coded) bit rate: symbol rate x bits per symbol, bit/s.
    pub channel_rate_bps: f64,
    pub symbol_rate_baud: f64,
    pub occupied_bandwidth_hz: f64,
    pub ebn0_db: f64,
    pub esn0_db: f64,
    pub required_ebn0_db: f64,
    pub margin_db: f64,
    /// Shannon capacity over the occupied bandwidth B = Rs (1 + roll-off), bit/s.
    pub shannon_capacity_bps: f64,
    /// Required Eb/N0 minus the Shannon limit at eta = Rb / B (the same B), dB.
    pub shannon_gap_db: f64,
    /// The spacecraft pattern table was clamped at one of its ends.
    pub pattern_clamped: bool,
    /// The galactic background was extrapolated above its stated range (small term).
    pub galactic_extrapolated: bool,
    /// The station direction is below the geometric horizon (elevation < 0).
    pub below_horizon: bool,
}

/// The rate-free part of the budget at one instant ([`LinkModel::evaluate_link`]). Copy, no
/// allocation.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LinkValues {
    /// Spacecraft antenna gain toward the station, dBi.
    pub spacecraft_gain_dbi: f64,
    pub eirp_dbw: f64,
    pub free_space_loss_db: f64,
    pub atmospheric_loss_db: f64,
    /// Sky brightness along the boresight (P.618-14 eq. 69), K.
    pub sky_temperature_k: f64,
    /// The external noise terms it was given, K.
    pub external: ExternalNoise,
    /// Receiver (Friis cascade at the antenna terminals), K.
    pub receiver_noise_k: f64,
    pub antenna_temperature_k: f64,
    pub system_temperature_k: f64,
    pub g_over_t_db_k: f64,
    pub cn0_dbhz: f64,
    /// The spacecraft pattern table was clamped at one of its ends.
    pub pattern_clamped: bool,
    /// The station direction is below the geometric horizon (elevation < 0).
    pub below_horizon: bool,
}

/// The weather-free terms of a link at one instant ([`LinkModel::geometry_terms`], the only
/// maker: crate-private, so no caller hands [`LinkModel::link_through`] unchecked terms).
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct GeometryTerms {
    /// Spacecraft antenna gain toward the station, dBi.
    pub spacecraft_gain_dbi: f64,
    pub eirp_dbw: f64,
    pub free_space_loss_db: f64,
    /// The spacecraft pattern table was clamped at one of its ends.
    pub pattern_clamped: bool,
    /// The station direction is below the geometric horizon (elevation < 0).
    pub below_horizon: bool,
}

/// One line of the printed budget.
#[derive(Debug, Clone, PartialEq)]
pub struct BudgetItem {
    pub name: &'static str,
    /// `None`: not evaluated (the Sun and the Moon of a budget without a time, `budget
    /// --elevation-deg`; the source says why).
    pub value: Option<f64>,
    pub unit: &'static str,
    /// Where the value comes from (a scheme's name for its threshold, so not always static).
    pub source: std::borrow::Cow<'static, str>,
}

/// A prepared, validated link: everything that does not change during a pass.
#[derive(Debug, Clone, PartialEq)]
pub struct LinkModel {
    frequency_hz: f64,
    transmitter: Transmitter,
    ground: GroundAntenna,
    receiver: Receiver,
    polarization_loss_db: f64,
    /// The fixed extra loss included in `polarization_loss_db` (radome, other), dB.
    polarization_extra_db: f64,
    background_k: f64,
    sky_range: SkyRange,
    fsl_constant_db: f64,
    max_occupied_bandwidth_hz: Option<f64>,
}

impl LinkModel {
    /// Validate the spec and precompute the constant parts of the budget.
    pub fn new(spec: &LinkModelSpec) -> Result<Self, BudgetError> {
        let f = spec.frequency_hz;
        if !(f > 0.0 && f.is_finite()) {
            return Err(BudgetError::Frequency { frequency_hz: f });
        }
        let transmitter = Transmitter::new(&spec.transmitter)?;
        let ground = GroundAntenna::new(&spec.ground_antenna, f)?;
        let receiver = Receiver::new(&spec.receiver)?;
        let p = &spec.polarization;
        let polarization_loss_db =
            polarization_loss_db(&p.spacecraft, &p.ground, p.orientation, p.extra_loss_db)?;
        let (background_k, sky_range) = background_temperature_k(f)?;
        if let Some(b) = spec.max_occupied_bandwidth_hz {
            if !(b > 0.0 && b.is_finite()) {
                return Err(BudgetError::MaxBandwidth { value_hz: b });
            }
        }
        Ok(Self {
            frequency_hz: f,
            transmitter,
            ground,
            receiver,
            polarization_loss_db,
            polarization_extra_db: p.extra_loss_db,
            background_k,
            sky_range,
            fsl_constant_db: free_space_loss_constant_db(f),
            max_occupied_bandwidth_hz: spec.max_occupied_bandwidth_hz,
        })
    }

    pub fn frequency_hz(&self) -> f64 {
        self.frequency_hz
    }
    pub fn transmitter(&self) -> &Transmitter {
        &self.transmitter
    }
    pub fn ground_antenna(&self) -> &GroundAntenna {
        &self.ground
    }
    pub fn receiver(&self) -> &Receiver {
        &self.receiver
    }
    pub fn polarization_loss_db(&self) -> f64 {
        self.polarization_loss_db
    }
    /// Background behind the atmosphere (CMB + galactic), K.
    pub fn background_temperature_k(&self) -> f64 {
        self.background_k
    }
    pub fn max_occupied_bandwidth_hz(&self) -> Option<f64> {
        self.max_occupied_bandwidth_hz
    }

    /// A rate spec validated against this model's bandwidth limit.
    pub fn rate_spec(
        &self,
        rate_bps: f64,
        operating: OperatingPoint,
        roll_off: f64,
        implementation_loss_db: f64,
    ) -> Result<RateSpec, BudgetError> {
        let r = RateSpec::new(rate_bps, operating, roll_off, implementation_loss_db)?;
        self.check_bandwidth(&r)?;
        Ok(r)
    }

    fn check_bandwidth(&self, r: &RateSpec) -> Result<(), BudgetError> {
        if let Some(max) = self.max_occupied_bandwidth_hz {
            let occ = r.occupied_bandwidth_hz();
            if occ > max {
                return Err(BudgetError::RateExceedsBandwidth {
                    rate_bps: r.rate_bps,
                    occupied_bandwidth_hz: occ,
                    max_bandwidth_hz: max,
                });
            }
        }
        Ok(())
    }

    /// The budget at one instant, with the antenna's noise terms `external` (from the station's
    /// antenna-noise tables). Pure; allocates nothing.
    pub fn evaluate(
        &self,
        geometry: BudgetGeometry,
        atmosphere: AtmosphereLoss,
        external: ExternalNoise,
        rate: RateSpec,
    ) -> Result<BudgetValues, BudgetError> {
        // Tsky along the boresight (P.618-14 eq. 69), for reference
        let sky_temperature_k = sky_temperature_unchecked(
            atmosphere.absorptive_db,
            atmosphere.mean_radiating_temperature_k,
            self.background_k,
        );
        self.evaluate_with_sky(geometry, atmosphere, sky_temperature_k, external, rate)
    }

    /// [`Self::evaluate`] with the boresight sky brightness given (a plan's step interpolates it
    /// from the station's path table, `plan::path_table`, with the attenuation).
    pub fn evaluate_with_sky(
        &self,
        geometry: BudgetGeometry,
        atmosphere: AtmosphereLoss,
        sky_temperature_k: f64,
        external: ExternalNoise,
        rate: RateSpec,
    ) -> Result<BudgetValues, BudgetError> {
        let link = self.evaluate_link(geometry, atmosphere, sky_temperature_k, external)?;
        self.with_rate(&link, rate)
    }

    /// The part of the budget that does not depend on the rate, down to C/N0 (what a plan's step
    /// keeps: each rate option then reduces to a C/N0 threshold). Pure; allocates nothing.
    #[inline]
    pub fn evaluate_link(
        &self,
        geometry: BudgetGeometry,
        atmosphere: AtmosphereLoss,
        sky_temperature_k: f64,
        external: ExternalNoise,
    ) -> Result<LinkValues, BudgetError> {
        let terms = self.geometry_terms(&geometry)?;
        self.link_through(&terms, atmosphere, sky_temperature_k, external)
    }

    /// The weather-free part of [`Self::evaluate_link`]: EIRP toward the station and the
    /// free-space loss, from the geometry alone (a plan's step works them out once for its clear
    /// sky and its rain case). Checks the range and the elevation.
    #[inline]
    pub(crate) fn geometry_terms(
        &self,
        geometry: &BudgetGeometry,
    ) -> Result<GeometryTerms, BudgetError> {
        check_geometry(geometry)?;
        // EIRP = P - L_line + G_tx(theta)
        let (eirp_dbw, tx_gain) = self.transmitter.eirp_dbw(geometry.off_nadir_deg)?;
        Ok(GeometryTerms {
            spacecraft_gain_dbi: tx_gain.gain_dbi,
            eirp_dbw,
            // L_fs = 20 log10(4 pi d / lambda)
            free_space_loss_db: self.fsl_constant_db + 20.0 * geometry.range_km.log10(),
            pattern_clamped: tx_gain.clamped,
            below_horizon: crate::atmosphere::elevation::below_horizon(geometry.elevation_deg),
        })
    }

    /// [`Self::evaluate_link`] from its weather-free part (`terms`, [`Self::geometry_terms`]) and
    /// one weather's path and noise. Checks the atmosphere and the external noise terms.
    #[inline]
    pub(crate) fn link_through(
        &self,
        terms: &GeometryTerms,
        atmosphere: AtmosphereLoss,
        sky_temperature_k: f64,
        external: ExternalNoise,
    ) -> Result<LinkValues, BudgetError> {
        check_atmosphere(&atmosphere)?;
        if !external.is_valid() {
            return Err(BudgetError::ExternalNoise {
                sky_k: external.sky_k,
                ground_k: external.ground_k,
                man_made_k: external.man_made_k,
                sun_k: external.sun_k,
                moon_k: external.moon_k,
            });
        }
        let total_db = atmosphere.total_db;
        let noise = self.noise_at(sky_temperature_k, &external);
        // C/N0 = EIRP - L_fs - A - L_pol - L_point + G/T - 10 log10(k)
        let cn0_dbhz = terms.eirp_dbw
            - terms.free_space_loss_db
            - total_db
            - self.polarization_loss_db
            - self.ground.pointing_loss_db
            + noise.g_over_t_db_k
            - BOLTZMANN_DBW_PER_K_HZ;
        Ok(LinkValues {
            spacecraft_gain_dbi: terms.spacecraft_gain_dbi,
            eirp_dbw: terms.eirp_dbw,
            free_space_loss_db: terms.free_space_loss_db,
            atmospheric_loss_db: total_db,
            sky_temperature_k: noise.sky_temperature_k,
            external,
            receiver_noise_k: self.receiver.temperature_k(),
            antenna_temperature_k: noise.antenna_temperature_k,
            system_temperature_k: noise.system_temperature_k,
            g_over_t_db_k: noise.g_over_t_db_k,
            cn0_dbhz,
            pattern_clamped: terms.pattern_clamped,
            below_horizon: terms.below_horizon,
        })
    }

    /// The whole budget from the rate-free part and a rate (its figures from C/N0), the rate
    /// checked against the bandwidth limit.
    pub fn with_rate(&self, l: &LinkValues, rate: RateSpec) -> Result<BudgetValues, BudgetError> {
        self.check_bandwidth(&rate)?;
        let r = rate_figures(l.cn0_dbhz, &rate);
        let op = &rate.operating;
        Ok(BudgetValues {
            spacecraft_gain_dbi: l.spacecraft_gain_dbi,
            eirp_dbw: l.eirp_dbw,
            free_space_loss_db: l.free_space_loss_db,
            atmospheric_loss_db: l.atmospheric_loss_db,
            polarization_loss_db: self.polarization_loss_db,
            pointing_loss_db: self.ground.pointing_loss_db,
            antenna_gain_dbi: self.ground.gain_dbi,
            sky_temperature_k: l.sky_temperature_k,
            sky_noise_k: l.external.sky_k,
            ground_noise_k: l.external.ground_k,
            man_made_noise_k: l.external.man_made_k,
            sun_noise_k: l.external.sun_k,
            moon_noise_k: l.external.moon_k,
            // set by the caller that knows the time (plan::series::budget_at)
            sun_separation_deg: None,
            moon_separation_deg: None,
            receiver_noise_k: l.receiver_noise_k,
            antenna_temperature_k: l.antenna_temperature_k,
            system_temperature_k: l.system_temperature_k,
            g_over_t_db_k: l.g_over_t_db_k,
            cn0_dbhz: l.cn0_dbhz,
            rate_bps: rate.rate_bps,
            channel_rate_bps: rate.channel_rate_bps(),
            symbol_rate_baud: r.symbol_rate_baud,
            occupied_bandwidth_hz: r.occupied_bandwidth_hz,
            ebn0_db: r.ebn0_db,
            esn0_db: r.esn0_db,
            required_ebn0_db: op.required_ebn0_db,
            margin_db: r.margin_db,
            shannon_capacity_bps: r.shannon_capacity_bps,
            shannon_gap_db: r.shannon_gap_db,
            pattern_clamped: l.pattern_clamped,
            galactic_extrapolated: self.sky_range == SkyRange::GalacticExtrapolated,
            below_horizon: l.below_horizon,
        })
    }

    /// Boresight sky brightness, antenna and system noise temperatures and G/T.
    #[inline]
    fn noise_at(&self, sky_temperature_k: f64, external: &ExternalNoise) -> NoiseFigures {
        // Ta = T_sky + T_ground + T_man-made
        let antenna_temperature_k = external.total_k();
        // Tsys = Ta + T_rx (antenna terminals)
        let system_temperature_k = antenna_temperature_k + self.receiver.temperature_k();
        // G/T = G - 10 log10(Tsys)
        let g_over_t_db_k = self.ground.gain_dbi - ratio_to_db(system_temperature_k);
        NoiseFigures {
            sky_temperature_k,
            antenna_temperature_k,
            system_temperature_k,
            g_over_t_db_k,
        }
    }

    /// The itemized budget for printing (allocates).
    pub fn itemize(
        &self,
        geometry: BudgetGeometry,
        atmosphere: AtmosphereLoss,
        external: ExternalNoise,
        rate: RateSpec,
    ) -> Result<Vec<BudgetItem>, BudgetError> {
        let v = self.evaluate(geometry, atmosphere, external, rate)?;
        let mut items = Vec::with_capacity(39);
        items.extend(self.transmit_items(&v));
        items.extend(path_items(&v, &geometry, self.polarization_extra_db));
        items.extend(self.receive_items(&v));
        items.extend(rate_items(&v, &rate));
        Ok(items)
    }

    /// Budget lines of the transmitting side: frequency, power, line loss, gain, EIRP.
    fn transmit_items(&self, v: &BudgetValues) -> [BudgetItem; 5] {
        let tx = &self.transmitter;
        [
            item("frequency", self.frequency_hz, "Hz", "input"),
            item("transmitter_power", tx.power_dbw(), "dBW", "input"),
            item("transmitter_line_loss", -tx.line_loss_db(), "dB", "input"),
            item(
                "spacecraft_antenna_gain",
                v.spacecraft_gain_dbi,
                "dBi",
                "spacecraft pattern",
            ),
            item("eirp", v.eirp_dbw, "dBW", "P - L_line + G_tx"),
        ]
    }

    /// Budget lines of the receiving side: ground gain, noise temperatures, G/T, Boltzmann.
    fn receive_items(&self, v: &BudgetValues) -> [BudgetItem; 12] {
        [
            item(
                "ground_antenna_gain",
                v.antenna_gain_dbi,
                "dBi",
                "e_ap (pi D / lambda)^2, e_ap the aperture efficiency; or input",
            ),
            item(
                "sky_temperature",
                v.sky_temperature_k,
                "K",
                "boresight sky brightness, ITU-R P.618-14 eq. (69)",
            ),
            item(
                "sky_noise",
                v.sky_noise_k,
                "K",
                "sky over the antenna's noise pattern, P.618-14 eq. (69)",
            ),
            item(
                "ground_noise",
                v.ground_noise_k,
                "K",
                "ground over the antenna's noise pattern: e Tg + (1 - e) Tsky(mirror)",
            ),
            item(
                "man_made_noise",
                v.man_made_noise_k,
                "K",
                "ITU-R P.372 Table 1 (0 when not given)",
            ),
            item(
                "sun_noise",
                v.sun_noise_k,
                "K",
                "solar disk over the antenna's noise pattern, ITU-R P.372 quiet Sun or given flux",
            ),
            item(
                "moon_noise",
                v.moon_noise_k,
                "K",
                "lunar disk over the antenna's noise pattern, 140-280 K by phase (1-100 GHz)",
            ),
            item(
                "antenna_temperature",
                v.antenna_temperature_k,
                "K",
                "sky + ground + man-made + Sun + Moon",
            ),
            item(
                "receiver_temperature",
                v.receiver_noise_k,
                "K",
                "Friis cascade at antenna terminals",
            ),
            item(
                "system_temperature",
                v.system_temperature_k,
                "K",
                "Ta + T_rx",
            ),
            item("g_over_t", v.g_over_t_db_k, "dB/K", "G - 10 log10(Tsys)"),
            item(
                "boltzmann",
                BOLTZMANN_DBW_PER_K_HZ,
                "dBW/K/Hz",
                "SI 2019 exact k",
            ),
        ]
    }
}

/// Reject a geometry the budget cannot be evaluated at: range, then elevation (an instant's
/// checks run in the order range, elevation, the spacecraft pattern's angle, atmospheric loss,
/// mean radiating temperature; the rate's bandwidth is checked after them).
#[inline]
fn check_geometry(geometry: &BudgetGeometry) -> Result<(), BudgetError> {
    let BudgetGeometry {
        elevation_deg,
        range_km,
        ..
    } = *geometry;
    if !(range_km > 0.0 && range_km.is_finite()) {
        return Err(BudgetError::Range { range_km });
    }
    if !(-90.0..=90.0).contains(&elevation_deg) {
        return Err(BudgetError::Elevation { elevation_deg });
    }
    Ok(())
}

/// Reject an atmosphere the budget cannot be evaluated with: the losses, then the mean
/// radiating temperature.
#[inline]
fn check_atmosphere(atmosphere: &AtmosphereLoss) -> Result<(), BudgetError> {
    let AtmosphereLoss {
        total_db,
        absorptive_db,
        mean_radiating_temperature_k: tmr_k,
    } = *atmosphere;
    if !(total_db >= 0.0
        && total_db.is_finite()
        && absorptive_db >= 0.0
        && absorptive_db.is_finite())
    {
        return Err(BudgetError::Atmosphere {
            total_db,
            absorptive_db,
        });
    }
    if !(tmr_k >= 0.0 && tmr_k.is_finite()) {
        return Err(BudgetError::MeanRadiatingTemperature { value_k: tmr_k });
    }
    Ok(())
}

/// Noise side of the budget at one instant.
#[derive(Debug, Clone, Copy)]
struct NoiseFigures {
    sky_temperature_k: f64,
    antenna_temperature_k: f64,
    system_temperature_k: f64,
    g_over_t_db_k: f64,
}

/// Rate-dependent figures of the budget at one instant.
#[derive(Debug, Clone, Copy)]
struct RateFigures {
    symbol_rate_baud: f64,
    occupied_bandwidth_hz: f64,
    ebn0_db: f64,
    esn0_db: f64,
    margin_db: f64,
    shannon_capacity_bps: f64,
    shannon_gap_db: f64,
}

/// The margin over a scheme's threshold, dB: Eb/N0 - required Eb/N0 - implementation loss. The
/// one margin formula of the project (the plan's `RateOption::margin_db` calls it).
#[inline]
pub fn margin_db(ebn0_db: f64, required_ebn0_db: f64, implementation_loss_db: f64) -> f64 {
    ebn0_db - required_ebn0_db - implementation_loss_db
}

/// The C/N0 at which a rate keeps exactly the required margin, dBHz:
/// 10 log10 R + required Eb/N0 + implementation loss + required margin. The one closing test of
/// the project is `C/N0 >= threshold_cn0_dbhz(..)` (the plan's rate options store it).
#[inline]
pub fn threshold_cn0_dbhz(
    rate_bps: f64,
    required_ebn0_db: f64,
    implementation_loss_db: f64,
    required_margin_db: f64,
) -> f64 {
    crate::units::ratio_to_db(rate_bps)
        + required_ebn0_db
        + implementation_loss_db
        + required_margin_db
}

/// Symbol rate, occupied bandwidth, Eb/N0, Es/N0, margin and Shannon capacity of `rate`
/// at `cn0_dbhz`.
#[inline]
fn rate_figures(cn0_dbhz: f64, rate: &RateSpec) -> RateFigures {
    // Rs = Rb / m_info ; B = Rs (1 + alpha)
    let symbol_rate_baud = rate.symbol_rate_baud();
    let occupied_bandwidth_hz = symbol_rate_baud * (1.0 + rate.roll_off);
    // Eb/N0 = C/N0 - 10 log10(Rb) ; Es/N0 = C/N0 - 10 log10(Rs)
    let ebn0_db = cn0_dbhz - ratio_to_db(rate.rate_bps);
    let esn0_db = cn0_dbhz - ratio_to_db(symbol_rate_baud);
    let margin_db = margin_db(
        ebn0_db,
        rate.operating.required_ebn0_db,
        rate.implementation_loss_db,
    );
    // Every Shannon figure uses one bandwidth, B = Rs (1 + alpha) (crate::link::capacity):
    // C = B log2(1 + C/(N0 B))
    let snr = db_to_ratio(cn0_dbhz) / occupied_bandwidth_hz;
    let shannon_capacity_bps = shannon_capacity_unchecked(occupied_bandwidth_hz, snr);
    // gap = required Eb/N0 - 10 log10((2^eta - 1)/eta), eta = Rb / B
    let shannon_gap_db = rate.operating.required_ebn0_db
        - shannon_limit_unchecked(rate.rate_bps / occupied_bandwidth_hz);
    RateFigures {
        symbol_rate_baud,
        occupied_bandwidth_hz,
        ebn0_db,
        esn0_db,
        margin_db,
        shannon_capacity_bps,
        shannon_gap_db,
    }
}

/// One printed budget line.
fn item(
    name: &'static str,
    value: f64,
    unit: &'static str,
    source: impl Into<std::borrow::Cow<'static, str>>,
) -> BudgetItem {
    BudgetItem {
        name,
        value: Some(value),
        unit,
        source: source.into(),
    }
}

/// Budget lines of the path: geometry, free-space, atmospheric, polarization and pointing losses.
fn path_items(v: &BudgetValues, geometry: &BudgetGeometry, extra_db: f64) -> [BudgetItem; 7] {
    [
        item("elevation", geometry.elevation_deg, "deg", "geometry"),
        item("range", geometry.range_km, "km", "geometry"),
        item("off_nadir", geometry.off_nadir_deg, "deg", "geometry"),
        item(
            "free_space_loss",
            -v.free_space_loss_db,
            "dB",
            "Friis: 20 log10(4 pi d / lambda)",
        ),
        item(
            "atmospheric_loss",
            -v.atmospheric_loss_db,
            "dB",
            "atmosphere input (total)",
        ),
        item(
            "polarization_loss",
            -v.polarization_loss_db,
            "dB",
            if extra_db == 0.0 {
                "polarization loss factor (Seybold 2005)"
            } else {
                "polarization loss factor (Seybold 2005) + the spec's extra loss"
            },
        ),
        item(
            "pointing_loss",
            -v.pointing_loss_db,
            "dB",
            "12 (err / theta_3dB)^2, common practice",
        ),
    ]
}

/// Budget lines of the rate: C/N0, rates, bandwidth, Eb/N0, Es/N0, requirement, margin, Shannon.
fn rate_items(v: &BudgetValues, rate: &RateSpec) -> [BudgetItem; 15] {
    let op = &rate.operating;
    [
        item("cn0", v.cn0_dbhz, "dBHz", "EIRP - losses + G/T - k"),
        item("data_rate", v.rate_bps, "bit/s", "input"),
        item(
            "framing_efficiency",
            op.framing_efficiency,
            "",
            "information bits per bit entering the code",
        ),
        item(
            "channel_rate",
            v.channel_rate_bps,
            "bit/s",
            "Rb / (framing efficiency x code rate) = Rs x bits per symbol",
        ),
        item(
            "symbol_rate",
            v.symbol_rate_baud,
            "baud",
            "Rb / information bits per symbol",
        ),
        item(
            "occupied_bandwidth",
            v.occupied_bandwidth_hz,
            "Hz",
            "Rs (1 + roll-off)",
        ),
        item("ebn0", v.ebn0_db, "dB", "C/N0 - 10 log10(Rb)"),
        item("esn0", v.esn0_db, "dB", "C/N0 - 10 log10(Rs)"),
        // the threshold carries its provenance (a value recalled from memory is flagged on it,
        // not on the error rate it is for)
        item(
            "required_ebn0",
            v.required_ebn0_db,
            "dB",
            format!(
                "{} per information bit at the error rate below: {}",
                op.name,
                provenance_text(op)
            ),
        ),
        item(
            "required_error_rate",
            op.error_rate,
            "",
            "the scheme's target error rate",
        ),
        item(
            "implementation_loss",
            -rate.implementation_loss_db,
            "dB",
            "input",
        ),
        item(
            "margin",
            v.margin_db,
            "dB",
            "Eb/N0 - required - implementation loss",
        ),
        item(
            "spectral_efficiency",
            v.rate_bps / v.occupied_bandwidth_hz,
            "bit/s/Hz",
            "eta = Rb / B, B = occupied bandwidth",
        ),
        item(
            "shannon_capacity",
            v.shannon_capacity_bps,
            "bit/s",
            "Shannon 1948: B log2(1 + C/(N0 B)), B = occupied bandwidth",
        ),
        item(
            "shannon_gap",
            v.shannon_gap_db,
            "dB",
            "required Eb/N0 - 10 log10((2^eta - 1)/eta), eta = Rb / B",
        ),
    ]
}

fn provenance_text(op: &OperatingPoint) -> &'static str {
    op.provenance.status_and_source().1
}

/// A bandwidth with five significant digits (`375.24 MHz`): the bandwidth error's two figures
/// stay apart where three digits would print both as `375 MHz`.
fn hz5(hz: f64) -> String {
    match crate::engfmt::budget_value(hz, "Hz") {
        Some((v, unit)) => format!("{v} {unit}"),
        None => format!("{hz} Hz"),
    }
}
