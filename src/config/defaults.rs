//! The one table of defaults: the value a key takes when a file leaves it out, and where that value
//! comes from. Defaults marked `reported` are listed in the outputs (`defaults`), so a reader sees
//! every assumption that was not in the files; the unreported ones are "nothing there" values (no
//! loss, one step per second).

use crate::link::polarization::PolarizationSense;

const COMMON: &str = "common practice";
const T0: &str = "reference temperature T0";
const P835: &str = "ITU-R P.835-6 mean annual global reference atmosphere";

/// A default value of one key, with its source.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DefaultValue<T: 'static> {
    /// The key in the files (dotted), as in [`crate::config::limits::Range::key`].
    pub key: &'static str,
    pub value: T,
    pub source: &'static str,
    /// Whether the default is listed among the assumptions of the outputs.
    pub reported: bool,
}

/// How a default value is shown in the outputs.
pub trait Shown: Copy {
    fn shown(&self) -> String;
}

impl Shown for f64 {
    fn shown(&self) -> String {
        super::limits::short_number(*self)
    }
}

impl Shown for PolarizationSense {
    fn shown(&self) -> String {
        self.name().to_string()
    }
}

const fn reported<T>(key: &'static str, value: T, source: &'static str) -> DefaultValue<T> {
    DefaultValue {
        key,
        value,
        source,
        reported: true,
    }
}

const fn silent<T>(key: &'static str, value: T, source: &'static str) -> DefaultValue<T> {
    DefaultValue {
        key,
        value,
        source,
        reported: false,
    }
}

// ---- Mission file ------------------------------------------------------------------------------

pub const STEP_S: DefaultValue<f64> = silent("planning.step_s", 1.0, "one budget step per second");
pub const HYSTERESIS_DB: DefaultValue<f64> = reported(
    "modem.adaptive.hysteresis_db",
    0.5,
    "common practice: a switch up needs half a dB more than the threshold",
);
pub const RELOCK_S: DefaultValue<f64> = reported(
    "modem.adaptive.relock_s",
    1.0,
    "common practice for a receiver that re-acquires frame lock after a change of scheme",
);
pub const MASK_SHARE_PERCENT: DefaultValue<f64> = silent(
    "planning.mask_share_percent",
    95.0,
    "a rate's usable mask holds on 95 % of passes",
);
pub const LINE_LOSS_DB: DefaultValue<f64> =
    silent("transmitter.line_loss_db", 0.0, "no loss given");
pub const OTHER_LOSS_DB: DefaultValue<f64> =
    silent("transmitter.other_loss_db", 0.0, "no loss given");
pub const TX_POLARIZATION: DefaultValue<PolarizationSense> = reported(
    "transmitter.antenna.polarization",
    PolarizationSense::Rhcp,
    "common practice for a spacecraft downlink antenna",
);
pub const TX_AXIAL_RATIO_DB: DefaultValue<f64> = reported(
    "transmitter.antenna.axial_ratio_db",
    3.0,
    "common practice for a wide-beam spacecraft antenna off boresight",
);
pub const ROLL_OFF: DefaultValue<f64> =
    reported("modem.roll_off", 0.35, "common practice (SRRC filtering)");
pub const IMPLEMENTATION_LOSS_DB: DefaultValue<f64> = reported(
    "modem.implementation_loss_db",
    1.5,
    "common practice for a planning budget",
);
pub const REQUIRED_MARGIN_DB: DefaultValue<f64> = reported("modem.required_margin_db", 3.0, COMMON);
pub const TARGET_BER: DefaultValue<f64> = reported(
    "modem.target_ber",
    1e-6,
    "common practice for a data downlink before framing",
);
pub const MIN_DWELL_S: DefaultValue<f64> = reported(
    "modem.min_dwell_s",
    10.0,
    "common practice for acquisition and frame lock",
);

// ---- Contact plan ------------------------------------------------------------------------------

pub const INITIAL_FILL_BITS: DefaultValue<f64> = silent(
    "onboard.initial_fill_bits",
    0.0,
    "an empty store at the window start",
);
pub const PRIORITY: DefaultValue<f64> = silent("satellites.priority", 1.0, "every satellite alike");
pub const DOWNLINKS: DefaultValue<f64> = silent("satellites.downlinks", 1.0, "one transmitter");
pub const ANTENNAS: DefaultValue<f64> = silent("antennas", 1.0, "one antenna per station file");
pub const TURNAROUND_S: DefaultValue<f64> = reported(
    "booking.turnaround_s",
    60.0,
    "common practice: slew to the next AOS and configure the receiver",
);

// ---- Station file ------------------------------------------------------------------------------

pub const MIN_ELEVATION_DEG: DefaultValue<f64> =
    reported("min_elevation_deg", 0.0, "geometric horizon");
pub const ANTENNA_EFFICIENCY: DefaultValue<f64> = reported(
    "antenna.efficiency",
    0.55,
    "common practice for a parabolic reflector",
);
pub const POINTING_ERROR_DEG: DefaultValue<f64> = reported(
    "antenna.pointing_error_deg",
    0.0,
    "perfect pointing assumed",
);
pub const GROUND_POLARIZATION: DefaultValue<PolarizationSense> =
    reported("antenna.polarization", PolarizationSense::Rhcp, COMMON);
pub const GROUND_AXIAL_RATIO_DB: DefaultValue<f64> = reported(
    "antenna.axial_ratio_db",
    1.0,
    "common practice for a ground feed",
);
pub const GROUND_EMISSIVITY: DefaultValue<f64> = reported(
    "antenna.ground_emissivity",
    0.9,
    "common practice for dry soil and vegetation at microwave frequencies",
);
pub const GROUND_TEMPERATURE_K: DefaultValue<f64> =
    reported("antenna.ground_temperature_k", 290.0, T0);
pub const RADOME_LOSS_DB: DefaultValue<f64> =
    silent("antenna.radome_loss_db", 0.0, "no radome given");
pub const LNA_GAIN_DB: DefaultValue<f64> = reported(
    "receiver.lna_gain_db",
    30.0,
    "common practice for a feed-mounted LNA",
);
pub const FEED_LOSS_DB: DefaultValue<f64> = reported(
    "receiver.feed_loss_db",
    0.0,
    "LNA at the feed, no loss before it",
);
pub const FEED_TEMPERATURE_K: DefaultValue<f64> =
    reported("receiver.feed_temperature_k", 290.0, T0);
pub const FOLLOWON_NOISE_FIGURE_DB: DefaultValue<f64> = reported(
    "receiver.followon_noise_figure_db",
    10.0,
    "common practice for a down-converter after the LNA",
);
/// ITU-R P.835-6 §1, mean annual global reference atmosphere at the surface.
pub const PRESSURE_HPA: DefaultValue<f64> = reported("climate.pressure_hpa", 1013.25, P835);
/// ITU-R P.835-6 §1.
pub const TEMPERATURE_K: DefaultValue<f64> = reported("climate.temperature_k", 288.15, P835);
/// ITU-R P.835-6 §1 (surface water-vapour density of the reference standard atmosphere).
pub const WATER_VAPOUR_DENSITY_G_M3: DefaultValue<f64> =
    reported("climate.water_vapour_density_g_m3", 7.5, P835);

// ---- Requests (command line and library) ------------------------------------------------------

/// Window length when neither the request nor the mission gives an end or a length.
pub const WINDOW_DAYS: DefaultValue<f64> = silent("window.days", 1.0, "one day from the start");
/// Aperture assumed for scintillation (ITU-R P.618-14 §2.4.1 aperture averaging) when a station
/// file has no antenna block (the `atmosphere` command only; `budget` and `plan` need an antenna).
pub const SCINTILLATION_DIAMETER_M: DefaultValue<f64> = reported(
    "antenna.diameter_m",
    1.0,
    "scintillation aperture averaging: 1 m assumed (no antenna block in the station file)",
);
/// Aperture efficiency that goes with [`SCINTILLATION_DIAMETER_M`].
pub const SCINTILLATION_EFFICIENCY: DefaultValue<f64> = reported(
    "antenna.efficiency",
    0.5,
    "scintillation aperture averaging: efficiency 0.5 assumed (no antenna block in the station file)",
);
/// Polarization tilt for ITU-R P.838-3: 45 deg stands for circular polarization.
pub const POLARIZATION_TILT_DEG: DefaultValue<f64> = silent(
    "polarization_tilt_deg",
    45.0,
    "circular polarization (ITU-R P.838-3 eqs (4)-(5) with tau = 45 deg)",
);
/// Step of a look-angle track, s.
pub const TRACK_STEP_S: DefaultValue<f64> =
    silent("track.step_s", 10.0, "common practice for pointing tables");

#[cfg(test)]
mod tests {
    use super::*;
    use crate::config::limits::{self, Range};

    /// Every numeric default, with the range of its key.
    fn table() -> Vec<(DefaultValue<f64>, Range)> {
        vec![
            (STEP_S, limits::STEP_S),
            (WINDOW_DAYS, limits::WINDOW_DAYS),
            (MASK_SHARE_PERCENT, limits::MASK_SHARE_PERCENT),
            (HYSTERESIS_DB, limits::HYSTERESIS_DB),
            (RELOCK_S, limits::RELOCK_S),
            (SCINTILLATION_DIAMETER_M, limits::ANTENNA_DIAMETER_M),
            (SCINTILLATION_EFFICIENCY, limits::ANTENNA_EFFICIENCY),
            (POLARIZATION_TILT_DEG, limits::POLARIZATION_TILT_DEG),
            (TRACK_STEP_S, limits::TRACK_STEP_S),
            (LINE_LOSS_DB, limits::LINE_LOSS_DB),
            (OTHER_LOSS_DB, limits::OTHER_LOSS_DB),
            (TX_AXIAL_RATIO_DB, limits::TX_AXIAL_RATIO_DB),
            (ROLL_OFF, limits::ROLL_OFF),
            (IMPLEMENTATION_LOSS_DB, limits::IMPLEMENTATION_LOSS_DB),
            (REQUIRED_MARGIN_DB, limits::REQUIRED_MARGIN_DB),
            (TARGET_BER, limits::TARGET_BER),
            (MIN_DWELL_S, limits::MIN_DWELL_S),
            (MIN_ELEVATION_DEG, limits::MIN_ELEVATION_DEG),
            (ANTENNA_EFFICIENCY, limits::ANTENNA_EFFICIENCY),
            (POINTING_ERROR_DEG, limits::POINTING_ERROR_DEG),
            (GROUND_AXIAL_RATIO_DB, limits::GROUND_AXIAL_RATIO_DB),
            (GROUND_EMISSIVITY, limits::GROUND_EMISSIVITY),
            (GROUND_TEMPERATURE_K, limits::GROUND_TEMPERATURE_K),
            (RADOME_LOSS_DB, limits::RADOME_LOSS_DB),
            (LNA_GAIN_DB, limits::LNA_GAIN_DB),
            (FEED_LOSS_DB, limits::FEED_LOSS_DB),
            (FEED_TEMPERATURE_K, limits::FEED_TEMPERATURE_K),
            (FOLLOWON_NOISE_FIGURE_DB, limits::FOLLOWON_NOISE_FIGURE_DB),
            (PRESSURE_HPA, limits::PRESSURE_HPA),
            (TEMPERATURE_K, limits::TEMPERATURE_K),
            (WATER_VAPOUR_DENSITY_G_M3, limits::WATER_VAPOUR_DENSITY_G_M3),
            (PRIORITY, limits::PRIORITY),
            (DOWNLINKS, limits::DOWNLINKS),
            (ANTENNAS, limits::ANTENNAS),
            (TURNAROUND_S, limits::TURNAROUND_S),
        ]
    }

    #[test]
    fn every_default_is_inside_the_range_of_its_key() {
        for (d, r) in table() {
            assert_eq!(d.key, r.key);
            assert!(
                r.contains(d.value),
                "{}: {} outside its range",
                d.key,
                d.value
            );
        }
    }

    #[test]
    fn reference_atmosphere_defaults() {
        // ITU-R P.835-6 §1: surface pressure 1013.25 hPa, temperature 288.15 K, water-vapour
        // density 7.5 g/m3 (mean annual global reference atmosphere).
        assert_eq!(PRESSURE_HPA.value, 1013.25);
        assert_eq!(TEMPERATURE_K.value, 288.15);
        assert_eq!(WATER_VAPOUR_DENSITY_G_M3.value, 7.5);
    }

    #[test]
    fn shown_values() {
        assert_eq!(GROUND_POLARIZATION.value.shown(), "rhcp");
        assert_eq!(GROUND_TEMPERATURE_K.value.shown(), "290");
        assert_eq!(TARGET_BER.value.shown(), "0.000001");
    }
}
