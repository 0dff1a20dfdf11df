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
    ///
    /// ```
    /// use passbudget::config::limits::STEP_S;
    ///
    /// assert_eq!(STEP_S.check(1.0), Ok(1.0));
    /// let e = STEP_S.check(30.0).unwrap_err();
    /// assert_eq!(e.to_string(), "30 is out of range (0.01 to 10 s)");
    /// ```
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

/// Share of a station's passes on which a rate must close above its usable mask, %.
pub const MASK_SHARE_PERCENT: Range = Range {
    key: "planning.mask_share_percent",
    min: 50.0,
    max: 100.0,
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

// ---- Mission file: planning -------------------------------------------------------------------

/// Planning override of every station's minimum elevation, deg (the same span as
/// [`MIN_ELEVATION_DEG`]).
pub const PLANNING_MASK_DEG: Range = Range {
    key: "planning.mask_deg",
    min: MIN_ELEVATION_DEG.min,
    max: MIN_ELEVATION_DEG.max,
    unit: "deg",
};

// ---- Mission file: transmitter ----------------------------------------------------------------

/// Transmitter output power, dBW (0.1 mW to 10 kW).
pub const POWER_DBW: Range = Range {
    key: "transmitter.power_dbw",
    min: -40.0,
    max: 40.0,
    unit: "dBW",
};

/// Transmitter output power, W: the same span as [`POWER_DBW`] (-40 dBW = 1e-4 W, 40 dBW = 1e4 W).
pub const POWER_W: Range = Range {
    key: "transmitter.power_w",
    min: 1e-4,
    max: 1e4,
    unit: "W",
};

/// Loss from amplifier output to antenna port, dB.
pub const LINE_LOSS_DB: Range = Range {
    key: "transmitter.line_loss_db",
    min: 0.0,
    max: 20.0,
    unit: "dB",
};

/// Any other fixed loss of the downlink, dB.
pub const OTHER_LOSS_DB: Range = Range {
    key: "transmitter.other_loss_db",
    min: 0.0,
    max: 30.0,
    unit: "dB",
};

/// Spacecraft antenna gain of a `fixed` pattern, dBi.
pub const TX_FIXED_GAIN_DBI: Range = Range {
    key: "transmitter.antenna.gain_dbi",
    min: -20.0,
    max: 60.0,
    unit: "dBi",
};

/// Boresight gain of a `cos_n` pattern, dBi: n = G/2 - 1 must not be negative (G >= 3.01 dBi).
pub const TX_COS_N_GAIN_DBI: Range = Range {
    key: "transmitter.antenna.gain_dbi",
    min: 3.1,
    max: 60.0,
    unit: "dBi",
};

/// Off-nadir angle of a `table` pattern point, deg.
pub const TX_TABLE_OFF_NADIR_DEG: Range = Range {
    key: "transmitter.antenna.table",
    min: 0.0,
    max: 180.0,
    unit: "deg",
};

/// Gain of a `table` pattern point, dBi.
pub const TX_TABLE_GAIN_DBI: Range = Range {
    key: "transmitter.antenna.table",
    min: -60.0,
    max: 60.0,
    unit: "dBi",
};

/// Spacecraft antenna axial ratio, dB.
pub const TX_AXIAL_RATIO_DB: Range = Range {
    key: "transmitter.antenna.axial_ratio_db",
    min: 0.0,
    max: 60.0,
    unit: "dB",
};

// ---- Mission file: modem ----------------------------------------------------------------------

/// Root-raised-cosine roll-off factor.
pub const ROLL_OFF: Range = Range {
    key: "modem.roll_off",
    min: 0.0,
    max: 1.0,
    unit: "",
};

/// Modem implementation loss, dB.
pub const IMPLEMENTATION_LOSS_DB: Range = Range {
    key: "modem.implementation_loss_db",
    min: 0.0,
    max: 10.0,
    unit: "dB",
};

/// Margin a rate must keep to count as closed, dB.
pub const REQUIRED_MARGIN_DB: Range = Range {
    key: "modem.required_margin_db",
    min: -10.0,
    max: 20.0,
    unit: "dB",
};

/// Target bit error rate.
pub const TARGET_BER: Range = Range {
    key: "modem.target_ber",
    min: 1e-12,
    max: 1e-2,
    unit: "",
};

/// Largest occupied bandwidth allowed, Hz.
pub const MAX_BANDWIDTH_HZ: Range = Range {
    key: "modem.max_bandwidth_hz",
    min: 1.0,
    max: 1e10,
    unit: "Hz",
};

/// Shortest run of closed seconds that counts, s.
pub const MIN_DWELL_S: Range = Range {
    key: "modem.min_dwell_s",
    min: 0.0,
    max: 600.0,
    unit: "s",
};

/// Information rate of a ladder step, bit/s (1 bit/s to 100 Gbit/s).
pub const RATE_BPS: Range = Range {
    key: "modem.ladder.rate_bps",
    min: 1.0,
    max: 1e11,
    unit: "bit/s",
};

/// Symbol rate of the adaptive mode, baud.
/// Symbol rate of a ladder item given as `symbol_rates_baud`, baud (the adaptive mode's range).
pub const LADDER_SYMBOL_RATE_BAUD: Range = Range {
    key: "modem.ladder.symbol_rates_baud",
    min: 1.0,
    max: 1e10,
    unit: "baud",
};

/// Bits per channel symbol of a user scheme (BPSK 1 to 65536-ary 16).
pub const SCHEME_BITS_PER_SYMBOL: Range = Range {
    key: "modem.schemes.bits_per_symbol",
    min: 1.0,
    max: 16.0,
    unit: "",
};

/// Error rate a user scheme's threshold is for (BER, FER or PER).
pub const SCHEME_ERROR_RATE: Range = Range {
    key: "modem.schemes.error_rate",
    min: 1e-15,
    max: 0.4,
    unit: "",
};

/// Required Eb/N0 of a user scheme, dB (Shannon's limit is -1.59 dB; checked against the limit
/// at the scheme's spectral efficiency too).
pub const SCHEME_EBN0_DB: Range = Range {
    key: "modem.schemes.required_ebn0_db",
    min: -2.0,
    max: 40.0,
    unit: "dB",
};

/// Required Es/N0 of a user scheme, dB.
pub const SCHEME_ESN0_DB: Range = Range {
    key: "modem.schemes.required_esn0_db",
    min: -15.0,
    max: 40.0,
    unit: "dB",
};

/// A point of a user scheme's table: its error rate.
pub const SCHEME_TABLE_ERROR_RATE: Range = Range {
    key: "modem.schemes.table",
    min: 1e-15,
    max: 0.4,
    unit: "",
};

/// A point of a user scheme's table: its Eb/N0, dB.
pub const SCHEME_TABLE_EBN0_DB: Range = Range {
    key: "modem.schemes.table",
    min: -2.0,
    max: 40.0,
    unit: "dB",
};

/// Extra margin before the adaptive modem switches up, dB.
pub const HYSTERESIS_DB: Range = Range {
    key: "modem.adaptive.hysteresis_db",
    min: 0.0,
    max: 10.0,
    unit: "dB",
};

/// Data lost at each change of scheme while the receiver re-locks, s.
pub const RELOCK_S: Range = Range {
    key: "modem.adaptive.relock_s",
    min: 0.0,
    max: 600.0,
    unit: "s",
};

pub const SYMBOL_RATE_BAUD: Range = Range {
    key: "modem.adaptive.symbol_rate_baud",
    min: 1.0,
    max: 1e10,
    unit: "baud",
};

// ---- Station file -----------------------------------------------------------------------------

/// Station latitude, deg (WGS-84 geodetic).
pub const LATITUDE_DEG: Range = Range {
    key: "latitude_deg",
    min: -90.0,
    max: 90.0,
    unit: "deg",
};

/// Station longitude, deg east (above 180 wraps to negative).
pub const LONGITUDE_DEG: Range = Range {
    key: "longitude_deg",
    min: -180.0,
    max: 360.0,
    unit: "deg",
};

/// Station height above the WGS-84 ellipsoid, m.
pub const ALTITUDE_M: Range = Range {
    key: "altitude_m",
    min: -500.0,
    max: 9000.0,
    unit: "m",
};

/// Azimuth of a horizon-mask point, deg. The upper end itself is refused: the mask wraps at 360.
pub const MASK_AZIMUTH_DEG: Range = Range {
    key: "horizon_mask",
    min: 0.0,
    max: 360.0,
    unit: "deg",
};

/// Elevation of a horizon-mask point, deg (the span of [`MIN_ELEVATION_DEG`]).
pub const MASK_ELEVATION_DEG: Range = Range {
    key: "horizon_mask",
    min: MIN_ELEVATION_DEG.min,
    max: MIN_ELEVATION_DEG.max,
    unit: "deg",
};

/// Ground antenna diameter, m.
pub const ANTENNA_DIAMETER_M: Range = Range {
    key: "antenna.diameter_m",
    min: 0.05,
    max: 100.0,
    unit: "m",
};

/// Ground antenna gain given directly, dBi.
pub const ANTENNA_GAIN_DBI: Range = Range {
    key: "antenna.gain_dbi",
    min: -10.0,
    max: 90.0,
    unit: "dBi",
};

/// Ground antenna aperture efficiency (a fraction; below 1 % is not a working reflector).
pub const ANTENNA_EFFICIENCY: Range = Range {
    key: "antenna.efficiency",
    min: 0.01,
    max: 1.0,
    unit: "",
};

/// Largest rate of a mount axis, deg/s (a limit of 0 would stop the antenna).
pub const MOUNT_MAX_RATE_DEG_S: Range = Range {
    key: "mount.primary_max_rate_deg_s",
    min: 0.01,
    max: 100.0,
    unit: "deg/s",
};

/// Largest rate of the mount's secondary axis, deg/s.
pub const MOUNT_SECONDARY_MAX_RATE_DEG_S: Range = Range {
    key: "mount.secondary_max_rate_deg_s",
    ..MOUNT_MAX_RATE_DEG_S
};

/// Largest acceleration of a mount axis, deg/s2.
pub const MOUNT_MAX_ACCELERATION_DEG_S2: Range = Range {
    key: "mount.primary_max_acceleration_deg_s2",
    min: 0.01,
    max: 1000.0,
    unit: "deg/s2",
};

/// Largest acceleration of the mount's secondary axis, deg/s2.
pub const MOUNT_SECONDARY_MAX_ACCELERATION_DEG_S2: Range = Range {
    key: "mount.secondary_max_acceleration_deg_s2",
    ..MOUNT_MAX_ACCELERATION_DEG_S2
};

/// Azimuth of an x-y mount's X axis, deg (0 and 180 are the same north-south axis).
pub const MOUNT_AXIS_AZIMUTH_DEG: Range = Range {
    key: "mount.axis_azimuth_deg",
    min: 0.0,
    max: 360.0,
    unit: "deg",
};

/// Tilt of a tilted az-el mount's base from the horizontal, deg.
pub const MOUNT_TILT_DEG: Range = Range {
    key: "mount.tilt_deg",
    min: 0.0,
    max: 90.0,
    unit: "deg",
};

/// Azimuth towards which a tilted az-el mount's base is tilted, deg.
pub const MOUNT_TILT_AZIMUTH_DEG: Range = Range {
    key: "mount.tilt_azimuth_deg",
    min: 0.0,
    max: 360.0,
    unit: "deg",
};

/// Ground antenna pointing error, deg.
pub const POINTING_ERROR_DEG: Range = Range {
    key: "antenna.pointing_error_deg",
    min: 0.0,
    max: 10.0,
    unit: "deg",
};

/// Ground antenna axial ratio, dB.
pub const GROUND_AXIAL_RATIO_DB: Range = Range {
    key: "antenna.axial_ratio_db",
    min: 0.0,
    max: 60.0,
    unit: "dB",
};

/// Observed solar flux density at the link frequency, sfu (1e-22 W m^-2 Hz^-1): from below the
/// quiet Sun at any frequency of the P.372 figure to the largest radio bursts (about 1e6 sfu,
/// from memory).
pub const SOLAR_FLUX_SFU: Range = Range {
    key: "solar_flux_sfu",
    min: 1.0,
    max: 1e7,
    unit: "sfu",
};

/// Emissivity of the ground seen by the antenna's sidelobes (1 - e of the sky is reflected).
pub const GROUND_EMISSIVITY: Range = Range {
    key: "antenna.ground_emissivity",
    min: 0.0,
    max: 1.0,
    unit: "",
};

/// Physical temperature of the ground seen by the sidelobes (and of a radome), K.
pub const GROUND_TEMPERATURE_K: Range = Range {
    key: "antenna.ground_temperature_k",
    min: 150.0,
    max: 350.0,
    unit: "K",
};

/// Off-axis angle of a point of a measured noise pattern (`antenna.noise_pattern`), deg.
pub const NOISE_PATTERN_OFF_AXIS_DEG: Range = Range {
    key: "antenna.noise_pattern",
    min: 0.0,
    max: 180.0,
    unit: "deg",
};

/// Gain of a point of a measured noise pattern, dBi.
pub const NOISE_PATTERN_GAIN_DBI: Range = Range {
    key: "antenna.noise_pattern",
    min: -60.0,
    max: 90.0,
    unit: "dBi",
};

/// Elevation of a point of a measured antenna temperature table, deg (the range of
/// `min_elevation_deg`).
pub const MEASURED_NOISE_ELEVATION_DEG: Range = Range {
    key: "antenna.measured_noise_temperature_k",
    min: -5.0,
    max: 90.0,
    unit: "deg",
};

/// Antenna temperature of a point of a measured table, K.
pub const MEASURED_NOISE_TEMPERATURE_K: Range = Range {
    key: "antenna.measured_noise_temperature_k",
    min: 0.0,
    max: 5000.0,
    unit: "K",
};

/// Radome loss, dB.
pub const RADOME_LOSS_DB: Range = Range {
    key: "antenna.radome_loss_db",
    min: 0.0,
    max: 10.0,
    unit: "dB",
};

/// LNA noise temperature, K.
pub const LNA_NOISE_TEMPERATURE_K: Range = Range {
    key: "receiver.lna_noise_temperature_k",
    min: 1.0,
    max: 5000.0,
    unit: "K",
};

/// LNA noise figure, dB.
pub const LNA_NOISE_FIGURE_DB: Range = Range {
    key: "receiver.lna_noise_figure_db",
    min: 0.01,
    max: 15.0,
    unit: "dB",
};

/// LNA gain, dB.
pub const LNA_GAIN_DB: Range = Range {
    key: "receiver.lna_gain_db",
    min: 0.0,
    max: 80.0,
    unit: "dB",
};

/// Loss between feed and LNA, dB.
pub const FEED_LOSS_DB: Range = Range {
    key: "receiver.feed_loss_db",
    min: 0.0,
    max: 10.0,
    unit: "dB",
};

/// Physical temperature of the feed loss, K.
pub const FEED_TEMPERATURE_K: Range = Range {
    key: "receiver.feed_temperature_k",
    min: 4.0,
    max: 400.0,
    unit: "K",
};

/// Noise figure of the stages after the LNA, dB.
pub const FOLLOWON_NOISE_FIGURE_DB: Range = Range {
    key: "receiver.followon_noise_figure_db",
    min: 0.0,
    max: 30.0,
    unit: "dB",
};

/// Surface pressure, hPa.
pub const PRESSURE_HPA: Range = Range {
    key: "climate.pressure_hpa",
    min: 300.0,
    max: 1100.0,
    unit: "hPa",
};

/// Surface temperature, K.
pub const TEMPERATURE_K: Range = Range {
    key: "climate.temperature_k",
    min: 200.0,
    max: 330.0,
    unit: "K",
};

/// Surface water-vapour density, g/m3.
pub const WATER_VAPOUR_DENSITY_G_M3: Range = Range {
    key: "climate.water_vapour_density_g_m3",
    min: 0.0,
    max: 40.0,
    unit: "g/m3",
};

/// Rain rate exceeded 0.01 % of an average year, mm/h.
pub const RAIN_RATE_001_MM_H: Range = Range {
    key: "climate.rain_rate_001_mm_h",
    min: 0.0,
    max: 300.0,
    unit: "mm/h",
};

/// Rain height, km.
pub const RAIN_HEIGHT_KM: Range = Range {
    key: "climate.rain_height_km",
    min: 0.0,
    max: 8.0,
    unit: "km",
};

/// Integrated cloud liquid water content L (ITU-R P.840-9) for the clear-sky budget, kg/m2.
pub const CLOUD_LIQUID_CLEAR_KG_M2: Range = Range {
    key: "climate.cloud_liquid_clear_kg_m2",
    min: 0.0,
    max: 10.0,
    unit: "kg/m2",
};

/// Integrated cloud liquid water content L (ITU-R P.840-9) at the availability exceedance, kg/m2.
pub const CLOUD_LIQUID_EXCEEDANCE_KG_M2: Range = Range {
    key: "climate.cloud_liquid_exceedance_kg_m2",
    min: 0.0,
    max: 10.0,
    unit: "kg/m2",
};

/// Wet term of the surface refractivity, N-units.
pub const WET_REFRACTIVITY: Range = Range {
    key: "climate.wet_refractivity",
    min: 0.0,
    max: 200.0,
    unit: "N-units",
};

/// Carrier frequency given in GHz (the `atmosphere` command), the same span as [`FREQUENCY_MHZ`].
pub const FREQUENCY_GHZ: Range = Range {
    key: "frequency_ghz",
    min: 0.03,
    max: 100.0,
    unit: "GHz",
};

/// Elevation of a budget or an atmosphere at one instant, deg.
pub const ELEVATION_DEG: Range = Range {
    key: "elevation_deg",
    min: 0.0,
    max: 90.0,
    unit: "deg",
};

/// Polarization tilt relative to the horizontal for ITU-R P.838-3, deg.
pub const POLARIZATION_TILT_DEG: Range = Range {
    key: "polarization_tilt_deg",
    min: -90.0,
    max: 90.0,
    unit: "deg",
};

/// Step of a look-angle track, s (a day at the most).
pub const TRACK_STEP_S: Range = Range {
    key: "track.step_s",
    min: 0.01,
    max: 86400.0,
    unit: "s",
};

/// Where one key has several ranges, what each one applies to (shown beside the key in the
/// README's Limits table; a test checks that every key given twice is told apart here).
pub const APPLIES_TO: &[(Range, &str)] = &[
    (TX_FIXED_GAIN_DBI, "pattern `fixed`"),
    (TX_COS_N_GAIN_DBI, "pattern `cos_n`, boresight"),
    (
        TX_TABLE_OFF_NADIR_DEG,
        "pattern `table`, a point's off-nadir angle",
    ),
    (TX_TABLE_GAIN_DBI, "pattern `table`, a point's gain"),
    (MASK_AZIMUTH_DEG, "a point's azimuth, 360 itself refused"),
    (MASK_ELEVATION_DEG, "a point's elevation"),
    (NOISE_PATTERN_OFF_AXIS_DEG, "a point's off-axis angle"),
    (NOISE_PATTERN_GAIN_DBI, "a point's gain"),
    (MEASURED_NOISE_ELEVATION_DEG, "a point's elevation"),
    (MEASURED_NOISE_TEMPERATURE_K, "a point's temperature"),
    (SCHEME_TABLE_ERROR_RATE, "a point's error rate"),
    (SCHEME_TABLE_EBN0_DB, "a point's Eb/N0"),
];

/// What `r` applies to where its key has several ranges ([`APPLIES_TO`]); empty otherwise.
pub fn applies_to(r: &Range) -> &'static str {
    APPLIES_TO
        .iter()
        .find(|(q, _)| q == r)
        .map_or("", |(_, what)| what)
}

/// Capacity of a satellite's store and its fill, bits (up to 1 Pbit).
pub const STORAGE_BITS: Range = Range {
    key: "onboard.storage_bits",
    min: 0.0,
    max: 1e15,
    unit: "bit",
};

/// Data generation rate of a payload, bit/s (0 to 100 Gbit/s).
pub const GENERATION_BPS: Range = Range {
    key: "onboard.generation_bps",
    min: 0.0,
    max: 1e11,
    unit: "bit/s",
};

/// Priority weight of a satellite in the contact plan (delivered bits count this many times).
pub const PRIORITY: Range = Range {
    key: "satellites.priority",
    min: 0.001,
    max: 1000.0,
    unit: "",
};

/// Downlinks a satellite can run at once.
pub const DOWNLINKS: Range = Range {
    key: "satellites.downlinks",
    min: 1.0,
    max: 16.0,
    unit: "",
};

/// Identical antennas at one station.
pub const ANTENNAS: Range = Range {
    key: "antennas",
    min: 1.0,
    max: 64.0,
    unit: "",
};

/// Slew and set-up time of an antenna before each contact, s (up to 1 h).
pub const TURNAROUND_S: Range = Range {
    key: "booking.turnaround_s",
    min: 0.0,
    max: 3600.0,
    unit: "s",
};

/// Shortest contact an antenna books, s (up to 1 h).
pub const MIN_CONTACT_S: Range = Range {
    key: "booking.min_contact_s",
    min: 0.0,
    max: 3600.0,
    unit: "s",
};

/// Lowest peak elevation of a contact an antenna books, deg.
pub const MIN_PEAK_ELEVATION_DEG: Range = Range {
    key: "booking.min_peak_elevation_deg",
    min: 0.0,
    max: 90.0,
    unit: "deg",
};

/// Every range above, for the README's table and its check.
pub const ALL: &[Range] = &[
    FREQUENCY_GHZ,
    ELEVATION_DEG,
    POLARIZATION_TILT_DEG,
    TRACK_STEP_S,
    STEP_S,
    WINDOW_DAYS,
    EXCEEDANCE_PERCENT,
    MASK_SHARE_PERCENT,
    MIN_ELEVATION_DEG,
    FREQUENCY_MHZ,
    PLANNING_MASK_DEG,
    POWER_DBW,
    POWER_W,
    LINE_LOSS_DB,
    OTHER_LOSS_DB,
    TX_FIXED_GAIN_DBI,
    TX_COS_N_GAIN_DBI,
    TX_TABLE_OFF_NADIR_DEG,
    TX_TABLE_GAIN_DBI,
    TX_AXIAL_RATIO_DB,
    ROLL_OFF,
    IMPLEMENTATION_LOSS_DB,
    REQUIRED_MARGIN_DB,
    TARGET_BER,
    MAX_BANDWIDTH_HZ,
    MIN_DWELL_S,
    RATE_BPS,
    LADDER_SYMBOL_RATE_BAUD,
    SCHEME_BITS_PER_SYMBOL,
    SCHEME_ERROR_RATE,
    SCHEME_EBN0_DB,
    SCHEME_ESN0_DB,
    SCHEME_TABLE_ERROR_RATE,
    SCHEME_TABLE_EBN0_DB,
    SYMBOL_RATE_BAUD,
    HYSTERESIS_DB,
    RELOCK_S,
    LATITUDE_DEG,
    LONGITUDE_DEG,
    ALTITUDE_M,
    MASK_AZIMUTH_DEG,
    MASK_ELEVATION_DEG,
    ANTENNA_DIAMETER_M,
    ANTENNA_GAIN_DBI,
    ANTENNA_EFFICIENCY,
    POINTING_ERROR_DEG,
    MOUNT_MAX_RATE_DEG_S,
    MOUNT_SECONDARY_MAX_RATE_DEG_S,
    MOUNT_MAX_ACCELERATION_DEG_S2,
    MOUNT_SECONDARY_MAX_ACCELERATION_DEG_S2,
    MOUNT_AXIS_AZIMUTH_DEG,
    MOUNT_TILT_DEG,
    MOUNT_TILT_AZIMUTH_DEG,
    GROUND_AXIAL_RATIO_DB,
    GROUND_EMISSIVITY,
    SOLAR_FLUX_SFU,
    GROUND_TEMPERATURE_K,
    RADOME_LOSS_DB,
    NOISE_PATTERN_OFF_AXIS_DEG,
    NOISE_PATTERN_GAIN_DBI,
    MEASURED_NOISE_ELEVATION_DEG,
    MEASURED_NOISE_TEMPERATURE_K,
    LNA_NOISE_TEMPERATURE_K,
    LNA_NOISE_FIGURE_DB,
    LNA_GAIN_DB,
    FEED_LOSS_DB,
    FEED_TEMPERATURE_K,
    FOLLOWON_NOISE_FIGURE_DB,
    PRESSURE_HPA,
    TEMPERATURE_K,
    WATER_VAPOUR_DENSITY_G_M3,
    RAIN_RATE_001_MM_H,
    RAIN_HEIGHT_KM,
    CLOUD_LIQUID_CLEAR_KG_M2,
    CLOUD_LIQUID_EXCEEDANCE_KG_M2,
    WET_REFRACTIVITY,
    STORAGE_BITS,
    GENERATION_BPS,
    PRIORITY,
    DOWNLINKS,
    ANTENNAS,
    TURNAROUND_S,
    MIN_CONTACT_S,
    MIN_PEAK_ELEVATION_DEG,
];

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
