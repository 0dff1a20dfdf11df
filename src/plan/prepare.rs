//! From validated configuration to prepared models: one [`StationModel`] per station (geometry,
//! atmosphere, link), the rate options of the mission's modem, and the Shannon bandwidth.
//!
//! Errors here name the file and, where the configuration knows it, the line (an unknown scheme in
//! the ladder, a rate the bandwidth cannot carry).

use crate::atmosphere::{
    mean_radiating_temperature_k, AtmosphereSite, PathSpec, PreparedAtmosphere, Weather,
};
use crate::config::mission::Mission;
use crate::config::mission::{ModemConfig, TransmitterConfig};
use crate::config::station::{GainSpec, GroundAntenna, Receiver, Station};
use crate::config::ConfigError;
use crate::geometry::{HorizonMask, Observer};
use crate::link::antenna::{dish_beamwidth_deg, GroundAntennaSpec, TransmitterSpec, TxPower};
use crate::link::budget::{LinkModel, LinkModelSpec, PolarizationSpec, RateSpec};
use crate::link::polarization::{EllipseOrientation, Polarization};
use crate::noise::pattern::NoisePattern;
use crate::noise::system::{LnaNoise, ReceiverSpec};
use crate::plan::bodies::BodyNoise;
use crate::plan::noise::{NoiseInputs, StationNoise};
use crate::plan::path_table::PathTables;
use crate::plan::rate::{OptionId, RateOption};
use crate::units::wavelength_m;

/// Aperture efficiency assumed when a station gives its gain but no diameter, to estimate the
/// equivalent diameter for beamwidth and scintillation: the default aperture efficiency of the
/// defaults table (common practice for a parabolic reflector).
pub const ASSUMED_EFFICIENCY: f64 = crate::config::defaults::ANTENNA_EFFICIENCY.value;

/// Error preparing a mission for the budget or the plan.
#[derive(Debug, thiserror::Error)]
pub enum PrepareError {
    #[error(transparent)]
    Config(#[from] ConfigError),
    #[error("{file}: {message}")]
    Model { file: String, message: String },
    /// A value out of its range in [`crate::config::limits`].
    #[error("{}: {source}", .source.key)]
    Range {
        #[source]
        source: crate::config::limits::RangeError,
    },
}

fn model_err(
    file: &std::path::Path,
    line: Option<usize>,
    message: impl std::fmt::Display,
) -> PrepareError {
    PrepareError::Model {
        file: match line {
            Some(l) => format!("{}:{l}", file.display()),
            None => file.display().to_string(),
        },
        message: message.to_string(),
    }
}

/// Everything a station needs for the budget, prepared once.
#[derive(Debug, Clone)]
pub struct StationModel {
    pub station: Station,
    pub observer: Observer,
    pub mask: HorizonMask,
    pub link: LinkModel,
    pub atmosphere: PreparedAtmosphere,
    /// The antenna's noise: pattern, tables per weather case, man-made term.
    pub noise: StationNoise,
    /// The elevation-only terms of the path (attenuation, boresight sky, transmissivity),
    /// tabulated per weather case for the plan's steps.
    pub path: PathTables,
    /// The Sun and the Moon seen through the same pattern.
    pub bodies: BodyNoise<NoisePattern>,
    /// Mean radiating temperature of the atmosphere, K (P.618-14 eq (70) from the surface temperature).
    pub mean_radiating_temperature_k: f64,
    /// Ground antenna diameter used for scintillation (given, or estimated from the gain), m.
    pub antenna_diameter_m: f64,
    /// Polarization tilt used for P.838 (45 deg for circular polarization).
    pub polarization_tilt_deg: f64,
    /// The minimum elevation the operator configured (station file or override), deg. The pass
    /// search may use a lower one (the mask trade-off searches from 0 deg).
    pub configured_min_elevation_deg: f64,
}

/// The modem's rate options, prepared.
#[derive(Debug, Clone)]
pub struct RateSet {
    /// The fixed-rate ladder, in file order.
    pub ladder: Vec<RateOption>,
    pub ladder_specs: Vec<RateSpec>,
    /// Options of the adaptive mode, sorted by rate: the adaptive block's schemes at its symbol
    /// rate (one waveform, as a real ACM/VCM modem); the ladder's rates too only with
    /// `modem.adaptive.with_ladder`; the ladder alone without an adaptive block.
    pub adaptive: Vec<RateOption>,
    pub adaptive_specs: Vec<RateSpec>,
    /// Bandwidth for Shannon's bound: `modem.max_bandwidth_hz`, else the widest option, Hz.
    pub shannon_bandwidth_hz: f64,
    pub required_margin_db: f64,
    pub implementation_loss_db: f64,
    pub min_dwell_s: f64,
    /// Extra margin before the adaptive mode switches up, dB (0 without an adaptive block).
    pub hysteresis_db: f64,
    /// Data lost at each change of the adaptive scheme, s (0 without an adaptive block).
    pub relock_s: f64,
    /// Notes on the thresholds (e.g. a scheme whose figure is for another error rate than asked).
    pub warnings: Vec<String>,
}

impl RateSet {
    /// Whether the adaptive volume is at least the fixed-rate volume by construction: every
    /// ladder rate is an adaptive option and switching costs nothing (no hysteresis, no re-lock).
    pub fn adaptive_dominates(&self) -> bool {
        self.hysteresis_db == 0.0
            && self.relock_s == 0.0
            && self.ladder.iter().all(|l| {
                self.adaptive.iter().any(|a| {
                    a.rate_bps == l.rate_bps && a.threshold_cn0_dbhz <= l.threshold_cn0_dbhz
                })
            })
    }

    /// How the adaptive mode switches.
    pub fn switching(&self) -> super::rate::Switching {
        super::rate::Switching {
            hysteresis_db: self.hysteresis_db,
            relock_s: self.relock_s,
        }
    }

    /// The ladder option with the lowest C/N0 threshold (the first of equals): the rate the
    /// per-step Eb/N0 and margin are shown for when no rate closes.
    pub fn lowest_threshold(&self) -> (usize, &RateOption) {
        self.ladder
            .iter()
            .enumerate()
            .min_by(|a, b| a.1.threshold_cn0_dbhz.total_cmp(&b.1.threshold_cn0_dbhz))
            .expect("a rate set has at least one ladder option")
    }

    /// The option the per-step Eb/N0 and margin of a pass are shown for: the chosen rate, else
    /// the lowest-threshold rate.
    pub fn display_option(&self, chosen: Option<OptionId>) -> (usize, &RateOption) {
        match chosen {
            Some(OptionId(k)) => (k, &self.ladder[k]),
            None => self.lowest_threshold(),
        }
    }
}

/// The radio blocks a budget needs, present: the mission's transmitter, the station's antenna and
/// receiver. From here on they are plain references, not options.
struct RadioBlocks<'a> {
    tx: &'a TransmitterConfig,
    ant: &'a GroundAntenna,
    rx: &'a Receiver,
}

fn radio_blocks<'a>(
    mission: &'a Mission,
    st: &'a Station,
) -> Result<RadioBlocks<'a>, PrepareError> {
    let file = &st.source;
    let tx = mission.transmitter.as_ref().ok_or_else(|| {
        model_err(
            &mission.source,
            None,
            "the mission has no transmitter block; the budget needs one",
        )
    })?;
    let ant = st.antenna.as_ref().ok_or_else(|| model_err(file, None, "the station has no antenna block; the budget needs antenna.diameter_m or antenna.gain_dbi"))?;
    let rx = st.receiver.as_ref().ok_or_else(|| model_err(file, None, "the station has no receiver block; the budget needs receiver.lna_noise_temperature_k or lna_noise_figure_db"))?;
    Ok(RadioBlocks { tx, ant, rx })
}

/// Prepare one station for this mission's transmitter.
pub fn station_model(
    mission: &Mission,
    st: &Station,
    mask_override: Option<f64>,
) -> Result<StationModel, PrepareError> {
    station_model_reusing(mission, st, mask_override, None)
}

/// [`station_model`], taking the station's atmosphere, noise, path and Sun/Moon tables from
/// `reuse` (the same station prepared for another satellite of a fleet) when it was prepared at
/// the same frequency: those depend only on the station and the frequency, and building them is
/// most of the cost of preparing a station.
pub fn station_model_reusing(
    mission: &Mission,
    st: &Station,
    mask_override: Option<f64>,
    reuse: Option<&StationModel>,
) -> Result<StationModel, PrepareError> {
    station_model_for(mission, st, mask_override, reuse, None)
}

/// [`station_model_reusing`] with the tables of the availability case `availability`
/// ([`availability_weather_for`]) prepared at once, as [`StationModel::prepare_weather`] would:
/// a station with terrain so gets the terrain noise tables of both weather cases built together.
pub fn station_model_for(
    mission: &Mission,
    st: &Station,
    mask_override: Option<f64>,
    reuse: Option<&StationModel>,
    availability: Option<Weather>,
) -> Result<StationModel, PrepareError> {
    let file = &st.source;
    let radio = radio_blocks(mission, st)?;
    let observer = Observer::new(st.latitude_deg, st.longitude_deg, st.altitude_m)
        .map_err(|e| model_err(file, None, e))?;
    let min = mask_override.unwrap_or(st.min_elevation_deg);
    let mask = HorizonMask::new(min, st.horizon_mask.clone())
        .map_err(|e| model_err(file, None, format!("horizon_mask: {e}")))?;
    let frequency_hz = radio.tx.frequency_hz;
    let (diameter_m, efficiency) = antenna_aperture(&radio.ant.gain, frequency_hz);
    let link = link_model(mission, st, &radio, diameter_m)?;
    let same = |r: &&StationModel| r.station == *st && r.link.frequency_hz() == frequency_hz;
    if let Some(r) = reuse.filter(same) {
        return Ok(StationModel {
            station: st.clone(),
            observer,
            mask,
            link,
            atmosphere: r.atmosphere,
            noise: r.noise.clone(),
            path: r.path.clone(),
            bodies: r.bodies.clone(),
            mean_radiating_temperature_k: r.mean_radiating_temperature_k,
            antenna_diameter_m: diameter_m,
            polarization_tilt_deg: r.polarization_tilt_deg,
            configured_min_elevation_deg: min,
        });
    }
    let site = atmosphere_site(st);
    // Circular polarization: tilt 45 deg in P.838-3 eqs (4)-(5); linear: the same 45 deg is used as
    // the orientation along a pass is not known (documented in the README).
    let polarization_tilt_deg = 45.0;
    let path = PathSpec {
        frequency_ghz: frequency_hz / 1e9,
        polarization_tilt_deg,
        antenna_diameter_m: diameter_m,
        antenna_efficiency: efficiency,
    };
    let atmosphere = PreparedAtmosphere::new(&site, &path)
        .map_err(|e| model_err(file, None, format!("atmosphere: {e}")))?;
    let tmr_k = mean_radiating_temperature_k(st.climate.temperature_k);
    let noise = station_noise(
        st,
        radio.ant,
        (&link, &atmosphere),
        tmr_k,
        diameter_m,
        availability,
    )?;
    let path = PathTables::new(&atmosphere, tmr_k, link.background_temperature_k());
    let bodies = BodyNoise::new(
        noise.pattern(),
        link.ground_antenna().beamwidth_deg,
        link.frequency_hz(),
        st.solar_flux_sfu,
    )
    .map_err(|e| model_err(&st.source, None, format!("Sun and Moon noise: {e}")))?
    .with_terrain(crate::noise::terrain::terrain_profile(&st.horizon_mask));
    Ok(StationModel {
        station: st.clone(),
        observer,
        mask,
        link,
        atmosphere,
        noise,
        path,
        bodies,
        mean_radiating_temperature_k: tmr_k,
        antenna_diameter_m: diameter_m,
        polarization_tilt_deg,
        configured_min_elevation_deg: min,
    })
}

impl StationModel {
    /// Prepare the antenna-noise and path tables of `weather` (the availability case) for this
    /// station.
    pub fn prepare_weather(&mut self, weather: Weather) {
        self.noise.prepare_weather(&self.atmosphere, weather);
        self.path.prepare_weather(weather);
    }
}

/// The station's noise model: the reference pattern of its antenna (peak gain and beamwidth of the
/// link model, D/lambda of its aperture) or its measured pattern, its ground, its man-made noise
/// and a measured antenna temperature; the clear-sky table.
fn station_noise(
    st: &Station,
    ant: &GroundAntenna,
    (link, atmosphere): (&LinkModel, &PreparedAtmosphere),
    tmr_k: f64,
    diameter_m: f64,
    availability: Option<Weather>,
) -> Result<StationNoise, PrepareError> {
    let f = link.frequency_hz();
    let ga = link.ground_antenna();
    let pattern = match &ant.noise_pattern {
        Some(rows) => crate::noise::pattern::NoisePattern::measured(rows),
        None => crate::noise::pattern::NoisePattern::reference(
            ga.gain_dbi,
            ga.beamwidth_deg,
            diameter_m / wavelength_m(f),
            f,
        ),
    }
    .map_err(|e| model_err(&st.source, None, format!("ground antenna pattern: {e}")))?;
    let ground = crate::noise::antenna_table::GroundSpec {
        temperature_k: ant.ground_temperature_k,
        emissivity: ant.ground_emissivity,
    };
    let inputs = NoiseInputs {
        pattern,
        ground,
        mean_radiating_temperature_k: tmr_k,
        background_k: link.background_temperature_k(),
        frequency_hz: f,
        man_made: st.man_made_noise,
        measured: ant.measured_noise_temperature_k.clone(),
        terrain: crate::noise::terrain::terrain_profile(&st.horizon_mask),
    };
    Ok(StationNoise::new(inputs, atmosphere, availability))
}

/// The ground antenna as the link model wants it; a gain given directly takes the beamwidth of its
/// aperture (`diameter_m`, given or equivalent).
fn ground_antenna_spec(
    ant: &GroundAntenna,
    diameter_m: f64,
    frequency_hz: f64,
    file: &std::path::Path,
) -> Result<GroundAntennaSpec, PrepareError> {
    Ok(match ant.gain {
        GainSpec::Aperture {
            diameter_m,
            efficiency,
        } => GroundAntennaSpec::Dish {
            diameter_m,
            efficiency,
            pointing_error_deg: ant.pointing_error_deg,
        },
        GainSpec::Given { gain_dbi, .. } => GroundAntennaSpec::Gain {
            gain_dbi,
            beamwidth_deg: dish_beamwidth_deg(diameter_m, frequency_hz)
                .map_err(|e| model_err(file, None, e))?,
            pointing_error_deg: ant.pointing_error_deg,
        },
    })
}

/// The link model of the mission's transmitter to this station.
fn link_model(
    mission: &Mission,
    st: &Station,
    radio: &RadioBlocks,
    diameter_m: f64,
) -> Result<LinkModel, PrepareError> {
    let RadioBlocks { tx, ant, rx } = *radio;
    let file = &st.source;
    // A radome (or any loss in front of the feed) at the ground temperature attenuates the signal
    // and adds noise: it is folded into the receiver's first passive stage together with the feed
    // loss. Two passive losses L1 (at T1) then L2 (at T2) equal one loss L1 L2 at
    // T = [(L1 - 1) T1 + L1 (L2 - 1) T2] / (L1 L2 - 1)   (Friis cascade of passive stages).
    let (feed_loss_db, feed_temperature_k) = combine_passive(
        ant.radome_loss_db,
        ant.ground_temperature_k,
        rx.feed_loss_db,
        rx.feed_temperature_k,
    );
    let spec = LinkModelSpec {
        frequency_hz: tx.frequency_hz,
        transmitter: TransmitterSpec {
            power: TxPower::Dbw(tx.power_dbw),
            line_loss_db: tx.line_loss_db + tx.other_loss_db,
            pattern: tx.pattern.clone(),
        },
        ground_antenna: ground_antenna_spec(ant, diameter_m, tx.frequency_hz, file)?,
        receiver: ReceiverSpec {
            feed_loss_db,
            feed_temperature_k,
            lna_noise: LnaNoise::TemperatureK(rx.lna_noise_temperature_k),
            lna_gain_db: rx.lna_gain_db,
            later_noise_figure_db: rx.followon_noise_figure_db,
        },
        polarization: PolarizationSpec {
            spacecraft: Polarization {
                sense: tx.polarization,
                axial_ratio_db: tx.axial_ratio_db,
            },
            ground: Polarization {
                sense: ant.polarization,
                axial_ratio_db: ant.axial_ratio_db,
            },
            orientation: EllipseOrientation::WorstCase,
            extra_loss_db: 0.0,
        },
        // Without a stated band, no signal can occupy more than its carrier frequency.
        max_occupied_bandwidth_hz: Some(
            mission
                .modem
                .as_ref()
                .and_then(|m| m.max_bandwidth_hz)
                .unwrap_or(tx.frequency_hz),
        ),
    };
    LinkModel::new(&spec).map_err(|e| model_err(file, None, e))
}

/// The ground antenna's aperture, used for its beamwidth and for scintillation (aperture averaging
/// in ITU-R P.618-14 §2.4.1): the given diameter with its efficiency; a gain given without a
/// diameter stands for the equivalent diameter from G = eta (pi D / lambda)^2 at
/// [`ASSUMED_EFFICIENCY`]. The one rule for `budget`, `plan` and `atmosphere`.
pub fn antenna_aperture(gain: &GainSpec, frequency_hz: f64) -> (f64, f64) {
    match *gain {
        GainSpec::Aperture {
            diameter_m,
            efficiency,
        } => (diameter_m, efficiency),
        GainSpec::Given {
            diameter_m: Some(d),
            ..
        } => (d, ASSUMED_EFFICIENCY),
        GainSpec::Given {
            gain_dbi,
            diameter_m: None,
        } => {
            let lambda_m = wavelength_m(frequency_hz);
            let d = lambda_m / std::f64::consts::PI
                * (crate::units::db_to_ratio(gain_dbi) / ASSUMED_EFFICIENCY).sqrt();
            (d, ASSUMED_EFFICIENCY)
        }
    }
}

/// The atmosphere models' view of a station: position and climate. A missing rain rate is 0 (the
/// availability case refuses to run without one, see [`availability_weather`]).
pub fn atmosphere_site(st: &Station) -> AtmosphereSite {
    let c = &st.climate;
    AtmosphereSite {
        latitude_deg: st.latitude_deg,
        // Height above the ellipsoid used as height above mean sea level (geoid undulation, tens of m, neglected).
        altitude_km: st.altitude_m / 1000.0,
        pressure_hpa: c.pressure_hpa,
        temperature_k: c.temperature_k,
        water_vapour_density_g_m3: c.water_vapour_density_g_m3,
        rain_rate_001_mm_h: c.rain_rate_001_mm_h.unwrap_or(0.0),
        rain_height_km: c.rain_height_km,
        cloud_liquid_clear_kg_m2: c.cloud_liquid_clear_kg_m2,
        cloud_liquid_exceedance_kg_m2: c.cloud_liquid_exceedance_kg_m2,
        wet_refractivity: c.wet_refractivity,
    }
}

/// Two passive losses in cascade as one: `(loss_db, physical_temperature_k)`.
pub fn combine_passive(l1_db: f64, t1_k: f64, l2_db: f64, t2_k: f64) -> (f64, f64) {
    let (l1, l2) = (
        crate::units::db_to_ratio(l1_db),
        crate::units::db_to_ratio(l2_db),
    );
    let l = l1 * l2;
    if l - 1.0 < 1e-12 {
        return (0.0, t2_k);
    }
    let t = ((l1 - 1.0) * t1_k + l1 * (l2 - 1.0) * t2_k) / (l - 1.0);
    (l1_db + l2_db, t)
}

/// The weather of the availability case, checked against the station climate.
pub fn availability_weather(
    percent: Option<f64>,
    stations: &[StationModel],
) -> Result<Option<Weather>, PrepareError> {
    let stations: Vec<&Station> = stations.iter().map(|s| &s.station).collect();
    availability_weather_of(percent, &stations)
}

/// [`availability_weather`] for station files (before they are prepared).
pub fn availability_weather_for(
    percent: Option<f64>,
    stations: &[Station],
) -> Result<Option<Weather>, PrepareError> {
    let stations: Vec<&Station> = stations.iter().collect();
    availability_weather_of(percent, &stations)
}

fn availability_weather_of(
    percent: Option<f64>,
    stations: &[&Station],
) -> Result<Option<Weather>, PrepareError> {
    let Some(p) = percent else { return Ok(None) };
    // The one range of the exceedance (config::limits), for every command and the library.
    let p = crate::config::limits::EXCEEDANCE_PERCENT
        .check(p)
        .map_err(|source| PrepareError::Range { source })?;
    let w = Weather::exceedance(p).map_err(|e| PrepareError::Model {
        file: "exceedance_percent".into(),
        message: e.to_string(),
    })?;
    for s in stations {
        if s.climate.rain_rate_001_mm_h.is_none() {
            return Err(model_err(
                &s.source,
                None,
                "climate.rain_rate_001_mm_h is needed for the availability (rain) case",
            ));
        }
    }
    Ok(Some(w))
}

/// One rate option of the modem: its scheme's operating point at the target error rate, its
/// spectrum on this link and its C/N0 threshold (10 log10 R + required Eb/N0 + implementation
/// loss + required margin). A BER figure at another BER than asked adds a warning (once).
fn rate_option(
    at: &str,
    m: &ModemConfig,
    link: &LinkModel,
    rate_bps: f64,
    name: &str,
    warnings: &mut Vec<String>,
) -> Result<(RateOption, RateSpec), PrepareError> {
    let err = |message: String| PrepareError::Model {
        file: at.to_string(),
        message,
    };
    let idx = m.schemes.index(name).map_err(|e| err(e.to_string()))?;
    let op = m
        .schemes
        .operating_point(idx, Some(m.target_ber))
        .map_err(|e| err(format!("{name}: {e}")))?;
    // FER/PER figures (AR4JA, DVB-S2) are for their own measure and are listed in the plan's
    // assumptions.
    if let (
        crate::link::modcod::TargetMatch::Nearest { requested },
        crate::link::modcod::ErrorMeasure::Ber,
    ) = (op.target_match, op.measure)
    {
        let w = format!(
            "{name}: no threshold at the requested BER {requested:e}; the figure for BER {:e} is used",
            op.error_rate
        );
        if !warnings.contains(&w) {
            warnings.push(w);
        }
    }
    let spec = link
        .rate_spec(rate_bps, op, m.roll_off, m.implementation_loss_db)
        .map_err(|e| err(format!("{name} at {rate_bps} bit/s: {e}")))?;
    let threshold_cn0_dbhz = crate::link::budget::threshold_cn0_dbhz(
        rate_bps,
        op.required_ebn0_db,
        m.implementation_loss_db,
        m.required_margin_db,
    );
    let option = RateOption {
        rate_bps,
        scheme: op.name.to_string(),
        required_ebn0_db: op.required_ebn0_db,
        threshold_cn0_dbhz,
        occupied_bandwidth_hz: spec.occupied_bandwidth_hz(),
        implementation_loss_db: m.implementation_loss_db,
    };
    Ok((option, spec))
}

/// Build the rate options from the mission's modem. `link` is any station's link model (the
/// bandwidth limit and frequency are the mission's).
pub fn rate_set(mission: &Mission, link: &LinkModel) -> Result<RateSet, PrepareError> {
    let path = &mission.source;
    let m = mission.modem.as_ref().ok_or_else(|| {
        model_err(
            path,
            None,
            "the mission has no modem block; the plan needs a rate ladder",
        )
    })?;
    if m.ladder.is_empty() {
        return Err(model_err(
            path,
            m.line,
            "modem.ladder has no rates; give at least one { rate_bps, scheme }",
        ));
    }
    let mut warnings = Vec::new();
    // Where an item came from: its line in the file, or the --set argument that gave it.
    let at = |key: &str, line: Option<usize>| mission.origin(key, line);
    let mut option = |rate_bps: f64, name: &str, at: String| {
        rate_option(&at, m, link, rate_bps, name, &mut warnings)
    };
    let mut ladder = Vec::new();
    let mut ladder_specs = Vec::new();
    for st in &m.ladder {
        let (o, s) = option(st.rate_bps, &st.scheme, at("modem.ladder", st.line))?;
        ladder.push(o);
        ladder_specs.push(s);
    }
    // The ladder switches adaptively only without an adaptive block, or when asked to.
    let union = m.adaptive.as_ref().is_none_or(|a| a.with_ladder);
    let mut adaptive: Vec<(RateOption, RateSpec)> = if union {
        ladder
            .iter()
            .cloned()
            .zip(ladder_specs.iter().cloned())
            .collect()
    } else {
        Vec::new()
    };
    if let Some(a) = &m.adaptive {
        for (name, line) in &a.schemes {
            let at = at("modem.adaptive.schemes", *line);
            let idx = m.schemes.index(name).map_err(|e| PrepareError::Model {
                file: at.clone(),
                message: e.to_string(),
            })?;
            let eta = m.schemes.spectral_efficiency(idx);
            adaptive.push(option(a.symbol_rate_baud * eta, name, at)?);
        }
    }
    adaptive.sort_by(|x, y| {
        x.0.rate_bps
            .total_cmp(&y.0.rate_bps)
            .then(x.0.threshold_cn0_dbhz.total_cmp(&y.0.threshold_cn0_dbhz))
    });
    let widest = adaptive
        .iter()
        .map(|o| o.0.occupied_bandwidth_hz)
        .fold(0.0, f64::max);
    let shannon_bandwidth_hz = m.max_bandwidth_hz.unwrap_or(widest).max(widest);
    let (adaptive, adaptive_specs) = adaptive.into_iter().unzip();
    Ok(RateSet {
        ladder,
        ladder_specs,
        adaptive,
        adaptive_specs,
        shannon_bandwidth_hz,
        required_margin_db: m.required_margin_db,
        implementation_loss_db: m.implementation_loss_db,
        min_dwell_s: m.min_dwell_s,
        hysteresis_db: m.adaptive.as_ref().map_or(0.0, |a| a.hysteresis_db),
        relock_s: m.adaptive.as_ref().map_or(0.0, |a| a.relock_s),
        warnings,
    })
}

#[cfg(test)]
mod tests {
    use super::combine_passive;

    #[test]
    fn passive_losses_in_cascade() {
        // (L - 1) T of the combination equals the Friis sum of the two stages (first principles).
        let (l_db, t) = combine_passive(0.5, 290.0, 0.3, 270.0);
        let (l1, l2) = (10f64.powf(0.05), 10f64.powf(0.03));
        let want = (l1 - 1.0) * 290.0 + l1 * (l2 - 1.0) * 270.0;
        assert!((l_db - 0.8).abs() < 1e-12);
        assert!(((10f64.powf(0.08) - 1.0) * t - want).abs() < 1e-9);
        // A 0.5 dB radome at 290 K alone adds (10^0.05 - 1) 290 = 35.4 K at the antenna terminals.
        let (_, t) = combine_passive(0.5, 290.0, 0.0, 290.0);
        assert!((t - 290.0).abs() < 1e-9);
        assert_eq!(combine_passive(0.0, 290.0, 0.0, 300.0), (0.0, 300.0));
    }
}
