//! Invented fixtures shared by the tests and the benchmarks (benches include this file with
//! `#[path]`): an X-band link (a 3.7 m dish, a cos^n spacecraft antenna) and a mid-latitude
//! station site. Invented data, for exercising the code only; not a reference.

use passbudget::atmosphere::{AtmosphereSite, PathSpec};
use passbudget::link::antenna::{GroundAntennaSpec, TransmitterSpec, TxPattern, TxPower};
use passbudget::link::budget::{LinkModelSpec, PolarizationSpec};
use passbudget::link::polarization::{EllipseOrientation, Polarization, PolarizationSense};
use passbudget::noise::system::{LnaNoise, ReceiverSpec};

/// Invented demo station and spacecraft (X band, 3.7 m dish); occupied bandwidth up to `max_bandwidth_hz`.
pub fn link_spec(max_bandwidth_hz: f64) -> LinkModelSpec {
    LinkModelSpec {
        frequency_hz: 8.2e9,
        transmitter: TransmitterSpec {
            power: TxPower::Watts(2.0),
            line_loss_db: 1.0,
            pattern: TxPattern::CosN {
                boresight_gain_dbi: 6.0,
                n: None,
            },
        },
        ground_antenna: GroundAntennaSpec::Dish {
            diameter_m: 3.7,
            efficiency: 0.6,
            pointing_error_deg: 0.05,
        },
        receiver: ReceiverSpec {
            feed_loss_db: 0.3,
            feed_temperature_k: 290.0,
            lna_noise: LnaNoise::TemperatureK(60.0),
            lna_gain_db: 30.0,
            later_noise_figure_db: 6.0,
        },
        polarization: PolarizationSpec {
            spacecraft: Polarization {
                sense: PolarizationSense::Rhcp,
                axial_ratio_db: 2.0,
            },
            ground: Polarization {
                sense: PolarizationSense::Rhcp,
                axial_ratio_db: 1.0,
            },
            orientation: EllipseOrientation::WorstCase,
            extra_loss_db: 0.2,
        },
        max_occupied_bandwidth_hz: Some(max_bandwidth_hz),
    }
}

/// Invented mid-latitude station (not a real site).
pub fn atmosphere_site() -> AtmosphereSite {
    AtmosphereSite {
        latitude_deg: 47.3,
        altitude_km: 0.42,
        pressure_hpa: 965.0,
        temperature_k: 284.0,
        water_vapour_density_g_m3: 8.1,
        rain_rate_001_mm_h: 32.0,
        rain_height_km: Some(3.1),
        cloud_liquid_clear_kg_m2: Some(0.4),
        cloud_liquid_exceedance_kg_m2: Some(0.4),
        wet_refractivity: None,
    }
}

/// The path of the invented link at `frequency_ghz` (circular polarization, the 3.7 m dish).
pub fn atmosphere_path(frequency_ghz: f64) -> PathSpec {
    PathSpec {
        frequency_ghz,
        polarization_tilt_deg: 45.0,
        antenna_diameter_m: 3.7,
        antenna_efficiency: 0.6,
    }
}

/// The invented Sierra Baja station's horizon profile (the shipped `stations/sierra-baja.yaml`'s
/// `horizon_mask`, 2-12 deg): `[azimuth_deg, elevation_deg]` points.
pub const SIERRA_BAJA_PROFILE: [[f64; 2]; 7] = [
    [0.0, 2.0],
    [60.0, 4.0],
    [110.0, 9.0],
    [150.0, 12.0],
    [200.0, 6.0],
    [270.0, 3.0],
    [330.0, 2.0],
];
