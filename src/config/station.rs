//! Station file: one ground station per YAML file.
//!
//! ```yaml
//! name: Example Ridge              # required
//! latitude_deg: 47.25               # required, -90..90 (WGS-84 geodetic)
//! longitude_deg: 11.4               # required, -180..360 (east positive)
//! altitude_m: 620                   # required, above the WGS-84 ellipsoid, -500..9000
//! min_elevation_deg: 5              # optional, default 0
//! horizon_mask:                     # optional: [azimuth_deg, elevation_deg] points, wrapped at 360
//!   - [0, 2]
//!   - [120, 9]
//! antenna: {...}                    # optional for passes/track, required for budget/plan
//! receiver: {...}
//! climate: {...}
//! mount: {type: az-el, primary_max_rate_deg_s: 8, secondary_max_rate_deg_s: 5}   # optional
//! ```
//! The radio blocks are documented key by key in the README.

use super::defaults as dflt;
use super::limits;
use super::overrides::{parse_with, Overrides};
use super::{parse_yaml, read_yaml_text, Checker, ConfigError, DefaultUsed};
pub use crate::link::polarization::PolarizationSense;
use serde::Deserialize;
use std::path::{Path, PathBuf};

/// The station's name alone, to know which overrides apply before the file is read.
#[derive(Debug, Clone, Deserialize)]
struct NameOnly {
    name: String,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct StationFile {
    name: String,
    latitude_deg: f64,
    longitude_deg: f64,
    altitude_m: f64,
    #[serde(default)]
    min_elevation_deg: Option<f64>,
    #[serde(default)]
    horizon_mask: Option<Vec<[f64; 2]>>,
    #[serde(default)]
    antenna: Option<AntennaFile>,
    #[serde(default)]
    receiver: Option<ReceiverFile>,
    #[serde(default)]
    climate: Option<ClimateFile>,
    #[serde(default)]
    man_made_noise: Option<crate::noise::man_made::Environment>,
    #[serde(default)]
    solar_flux_sfu: Option<f64>,
    #[serde(default)]
    mount: Option<MountFile>,
    #[serde(default)]
    antennas: Option<f64>,
    #[serde(default)]
    booking: Option<super::fleet::BookingFile>,
}

/// The mount's geometry, by name in the file.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
enum MountType {
    #[serde(rename = "az-el")]
    AzEl,
    #[serde(rename = "x-y")]
    XY,
    #[serde(rename = "tilted-az-el")]
    TiltedAzEl,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct MountFile {
    #[serde(rename = "type")]
    kind: MountType,
    primary_max_rate_deg_s: f64,
    secondary_max_rate_deg_s: f64,
    primary_max_acceleration_deg_s2: Option<f64>,
    secondary_max_acceleration_deg_s2: Option<f64>,
    axis_azimuth_deg: Option<f64>,
    tilt_deg: Option<f64>,
    tilt_azimuth_deg: Option<f64>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct AntennaFile {
    diameter_m: Option<f64>,
    efficiency: Option<f64>,
    gain_dbi: Option<f64>,
    pointing_error_deg: Option<f64>,
    polarization: Option<PolarizationSense>,
    axial_ratio_db: Option<f64>,
    /// Removed: kept only to answer with the keys that replace it.
    spillover_fraction: Option<f64>,
    ground_temperature_k: Option<f64>,
    ground_emissivity: Option<f64>,
    radome_loss_db: Option<f64>,
    noise_pattern: Option<Vec<[f64; 2]>>,
    measured_noise_temperature_k: Option<Vec<[f64; 2]>>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct ReceiverFile {
    lna_noise_temperature_k: Option<f64>,
    lna_noise_figure_db: Option<f64>,
    lna_gain_db: Option<f64>,
    feed_loss_db: Option<f64>,
    feed_temperature_k: Option<f64>,
    followon_noise_figure_db: Option<f64>,
}

#[derive(Debug, Clone, Default, Deserialize)]
#[serde(deny_unknown_fields)]
struct ClimateFile {
    pressure_hpa: Option<f64>,
    temperature_k: Option<f64>,
    water_vapour_density_g_m3: Option<f64>,
    rain_rate_001_mm_h: Option<f64>,
    rain_height_km: Option<f64>,
    /// Retired (one L for both weather cases): accepted by the parser only to name its successors.
    cloud_liquid_kg_m2: Option<serde::de::IgnoredAny>,
    cloud_liquid_clear_kg_m2: Option<f64>,
    cloud_liquid_exceedance_kg_m2: Option<f64>,
    wet_refractivity: Option<f64>,
}

/// How the ground antenna's gain is known.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum GainSpec {
    /// Parabolic aperture: G = eta (pi D / lambda)^2.
    Aperture { diameter_m: f64, efficiency: f64 },
    /// Gain given directly (dBi); the diameter, if given, sets the beamwidth.
    Given {
        gain_dbi: f64,
        diameter_m: Option<f64>,
    },
}

/// Ground antenna, validated.
#[derive(Debug, Clone, PartialEq)]
pub struct GroundAntenna {
    pub gain: GainSpec,
    pub pointing_error_deg: f64,
    pub polarization: PolarizationSense,
    pub axial_ratio_db: f64,
    /// Physical temperature of the ground (and of a radome), K.
    pub ground_temperature_k: f64,
    /// Emissivity of the ground seen by the sidelobes, 0-1.
    pub ground_emissivity: f64,
    pub radome_loss_db: f64,
    /// Measured power pattern for noise, `[off_axis_deg, gain_dbi]` from 0 to 180 deg; `None`:
    /// the reference pattern (Gaussian main beam + ITU-R S.465-6 envelope).
    pub noise_pattern: Option<Vec<[f64; 2]>>,
    /// Measured clear-sky antenna temperature, `[elevation_deg, temperature_k]` (Y-factor).
    pub measured_noise_temperature_k: Option<Vec<[f64; 2]>>,
}

/// Receiving chain, validated. Temperatures in K, losses and gains in dB.
#[derive(Debug, Clone, PartialEq)]
pub struct Receiver {
    pub lna_noise_temperature_k: f64,
    pub lna_gain_db: f64,
    pub feed_loss_db: f64,
    pub feed_temperature_k: f64,
    pub followon_noise_figure_db: f64,
}

/// Station climate, validated. Defaults are the ITU-R P.835 mean annual global reference atmosphere
/// at the surface (P.835-6 §1: 1013.25 hPa, 288.15 K, 7.5 g/m3).
#[derive(Debug, Clone, PartialEq)]
pub struct Climate {
    pub pressure_hpa: f64,
    pub temperature_k: f64,
    pub water_vapour_density_g_m3: f64,
    pub rain_rate_001_mm_h: Option<f64>,
    pub rain_height_km: Option<f64>,
    /// Integrated cloud liquid water content L (ITU-R P.840-9) for the clear-sky budget, kg/m2.
    pub cloud_liquid_clear_kg_m2: Option<f64>,
    /// L (ITU-R P.840-9) exceeded for the availability exceedance, kg/m2.
    pub cloud_liquid_exceedance_kg_m2: Option<f64>,
    pub wet_refractivity: Option<f64>,
}

/// A validated ground station.
#[derive(Debug, Clone, PartialEq)]
pub struct Station {
    pub name: String,
    pub source: PathBuf,
    pub latitude_deg: f64,
    pub longitude_deg: f64,
    pub altitude_m: f64,
    pub min_elevation_deg: f64,
    pub horizon_mask: Vec<[f64; 2]>,
    pub antenna: Option<GroundAntenna>,
    pub receiver: Option<Receiver>,
    pub climate: Climate,
    /// Man-made noise category of the surroundings (ITU-R P.372 Table 1); `None`: not counted.
    pub man_made_noise: Option<crate::noise::man_made::Environment>,
    /// Observed solar flux density at the link frequency, sfu; `None`: the quiet Sun of ITU-R P.372.
    pub solar_flux_sfu: Option<f64>,
    /// The antenna mount and its axis limits; `None`: every step is taken as trackable.
    pub mount: Option<crate::geometry::Mount>,
    /// Identical antennas at the site, each booked on its own in the contact plan.
    pub antennas: usize,
    /// The antennas' booking rules (turnaround, minimum contact, blocked periods).
    pub booking: super::fleet::Booking,
    /// Keys filled from defaults, with the value and its source: reported in outputs.
    pub defaults: Vec<DefaultUsed>,
}

impl Station {
    /// Load and validate a station file.
    pub fn load(path: &Path) -> Result<Station, ConfigError> {
        Self::load_with(path, &Overrides::default())
    }

    /// Load and validate a station file with the `--set station.NAME.KEY=VALUE` overrides that
    /// name it applied (validated as the file is).
    pub fn load_with(path: &Path, overrides: &Overrides) -> Result<Station, ConfigError> {
        let text = read_yaml_text(path)?;
        Self::from_yaml_with(path, &text, overrides)
    }

    /// Parse and validate station YAML text; `path` is used in messages.
    pub fn from_yaml(path: &Path, text: &str) -> Result<Station, ConfigError> {
        Self::from_yaml_with(path, text, &Overrides::default())
    }

    /// [`Station::from_yaml`] with overrides.
    pub fn from_yaml_with(
        path: &Path,
        text: &str,
        overrides: &Overrides,
    ) -> Result<Station, ConfigError> {
        let applied = match overrides.is_empty() {
            true => Vec::new(),
            // The overrides that apply follow from the station's name in the file.
            false => match parse_yaml::<NameOnly>(path, text) {
                Ok(n) => overrides.station(n.name.trim()),
                Err(_) => Vec::new(),
            },
        };
        let file: StationFile = parse_with(path, text, &applied)?;
        let mut c = Checker::new(path, text, &applied);
        if file.name.trim().is_empty() {
            return Err(c.err("name", "must not be empty"));
        }
        crate::infile::check_yaml_name(&file.name).map_err(|m| c.err("name", m))?;
        let latitude_deg = c.range(&limits::LATITUDE_DEG, file.latitude_deg)?;
        let mut longitude_deg = c.range(&limits::LONGITUDE_DEG, file.longitude_deg)?;
        if longitude_deg > 180.0 {
            longitude_deg -= 360.0;
        }
        let altitude_m = c.range(&limits::ALTITUDE_M, file.altitude_m)?;
        let min_elevation_deg = c.or_default(
            &limits::MIN_ELEVATION_DEG,
            file.min_elevation_deg,
            &dflt::MIN_ELEVATION_DEG,
        )?;
        let horizon_mask = horizon_mask(&c, file.horizon_mask.unwrap_or_default())?;
        let antenna = file
            .antenna
            .as_ref()
            .map(|a| antenna(&mut c, a))
            .transpose()?;
        let receiver = file
            .receiver
            .as_ref()
            .map(|r| receiver(&mut c, r))
            .transpose()?;
        let climate = climate(&mut c, &file.climate.unwrap_or_default())?;
        let solar_flux_sfu = c.optional(&limits::SOLAR_FLUX_SFU, file.solar_flux_sfu)?;
        let mount = file.mount.as_ref().map(|m| mount(&c, m)).transpose()?;
        let antennas = whole(&c, &limits::ANTENNAS, file.antennas)?.unwrap_or(1);
        let booking = super::fleet::booking(&mut c, &file.booking.unwrap_or_default())?;
        Ok(Station {
            name: file.name.trim().to_string(),
            source: path.to_path_buf(),
            latitude_deg,
            longitude_deg,
            altitude_m,
            min_elevation_deg,
            horizon_mask,
            antenna,
            receiver,
            climate,
            man_made_noise: file.man_made_noise,
            solar_flux_sfu,
            mount,
            antennas,
            booking,
            defaults: c.defaults,
        })
    }
}

/// A whole number within its range (`antennas: 2`), or `None` when not given.
pub(super) fn whole(
    c: &Checker,
    r: &limits::Range,
    v: Option<f64>,
) -> Result<Option<usize>, ConfigError> {
    let Some(v) = c.optional(r, v)? else {
        return Ok(None);
    };
    if v.fract() != 0.0 {
        return Err(c.err(r.key, format!("{v} is not a whole number")));
    }
    Ok(Some(v as usize))
}

/// Whether `given` (from the command line) names the station `name`: the same words, with case
/// and every run of characters other than letters and digits ignored (`Pulau Reka`,
/// `pulau-reka` and `PULAU_REKA` all name the station `Pulau Reka`), both in Unicode normal form
/// C (a precomposed `é` and `e` with a combining accent are one letter).
pub fn same_station(given: &str, name: &str) -> bool {
    let g = crate::infile::name_words(given);
    !g.is_empty() && g == crate::infile::name_words(name)
}

/// Horizon mask points `[azimuth_deg, elevation_deg]`, checked and sorted by azimuth.
fn horizon_mask(c: &Checker, mut mask: Vec<[f64; 2]>) -> Result<Vec<[f64; 2]>, ConfigError> {
    let az = limits::MASK_AZIMUTH_DEG;
    for (i, p) in mask.iter().enumerate() {
        // The upper end of the azimuth range is excluded: the mask wraps at 360.
        if !az.contains(p[0]) || p[0] == az.max {
            let msg = format!(
                "azimuth {} is out of range ({} up to but not including {} deg; the mask wraps at 360)",
                limits::short_number(p[0]),
                az.min,
                az.max
            );
            return Err(c.item_err(az.key, i, msg));
        }
        if let Err(e) = limits::MASK_ELEVATION_DEG.check(p[1]) {
            return Err(c.item_err(az.key, i, format!("elevation {e}")));
        }
    }
    mask.sort_by(|a, b| a[0].total_cmp(&b[0]));
    if let Some(w) = mask.windows(2).find(|w| w[0][0] == w[1][0]) {
        let msg = format!(
            "two points at azimuth {} deg",
            limits::short_number(w[0][0])
        );
        return Err(c.err(az.key, msg));
    }
    Ok(mask)
}

/// The mount block: its type, the keys that type needs, and the axis limits.
fn mount(c: &Checker, m: &MountFile) -> Result<crate::geometry::Mount, ConfigError> {
    use crate::geometry::MountKind;
    use limits as l;
    let needed = |r: &l::Range, v: Option<f64>, kind: &str| match v {
        Some(v) => c.range(r, v),
        None => Err(c.err(r.key, format!("required for a mount of type {kind}"))),
    };
    let unused = |r: &l::Range, v: Option<f64>, kind: &str| match v {
        Some(_) => Err(c.err(r.key, format!("does not apply to a mount of type {kind}"))),
        None => Ok(()),
    };
    let (axis, tilt, tilt_az) = (
        &l::MOUNT_AXIS_AZIMUTH_DEG,
        &l::MOUNT_TILT_DEG,
        &l::MOUNT_TILT_AZIMUTH_DEG,
    );
    let kind = match m.kind {
        MountType::AzEl => {
            unused(axis, m.axis_azimuth_deg, "az-el")?;
            unused(tilt, m.tilt_deg, "az-el")?;
            unused(tilt_az, m.tilt_azimuth_deg, "az-el")?;
            MountKind::AzEl
        }
        MountType::XY => {
            unused(tilt, m.tilt_deg, "x-y")?;
            unused(tilt_az, m.tilt_azimuth_deg, "x-y")?;
            MountKind::XY {
                axis_azimuth_deg: needed(axis, m.axis_azimuth_deg, "x-y")?,
            }
        }
        MountType::TiltedAzEl => {
            unused(axis, m.axis_azimuth_deg, "tilted-az-el")?;
            MountKind::TiltedAzEl {
                tilt_deg: needed(tilt, m.tilt_deg, "tilted-az-el")?,
                tilt_azimuth_deg: needed(tilt_az, m.tilt_azimuth_deg, "tilted-az-el")?,
            }
        }
    };
    Ok(crate::geometry::Mount {
        kind,
        primary_max_rate_deg_s: c.range(&l::MOUNT_MAX_RATE_DEG_S, m.primary_max_rate_deg_s)?,
        secondary_max_rate_deg_s: c.range(
            &l::MOUNT_SECONDARY_MAX_RATE_DEG_S,
            m.secondary_max_rate_deg_s,
        )?,
        primary_max_acceleration_deg_s2: c.optional(
            &l::MOUNT_MAX_ACCELERATION_DEG_S2,
            m.primary_max_acceleration_deg_s2,
        )?,
        secondary_max_acceleration_deg_s2: c.optional(
            &l::MOUNT_SECONDARY_MAX_ACCELERATION_DEG_S2,
            m.secondary_max_acceleration_deg_s2,
        )?,
    })
}

/// The ground antenna block.
fn antenna(c: &mut Checker, a: &AntennaFile) -> Result<GroundAntenna, ConfigError> {
    use limits as l;
    if a.spillover_fraction.is_some() {
        return Err(c.err(
            "antenna.spillover_fraction",
            "this key was removed: the ground the antenna sees through its sidelobes and spillover now comes from its reference pattern (ITU-R S.465-6 envelope, see the README's noise section); set antenna.ground_emissivity and antenna.ground_temperature_k instead",
        ));
    }
    let gain = antenna_gain(c, a)?;
    let pointing_error_deg = c.or_default(
        &l::POINTING_ERROR_DEG,
        a.pointing_error_deg,
        &dflt::POINTING_ERROR_DEG,
    )?;
    let polarization = match a.polarization {
        Some(p) => p,
        None => c.default(&dflt::GROUND_POLARIZATION),
    };
    Ok(GroundAntenna {
        gain,
        pointing_error_deg,
        polarization,
        axial_ratio_db: c.or_default(
            &l::GROUND_AXIAL_RATIO_DB,
            a.axial_ratio_db,
            &dflt::GROUND_AXIAL_RATIO_DB,
        )?,
        ground_temperature_k: c.or_default(
            &l::GROUND_TEMPERATURE_K,
            a.ground_temperature_k,
            &dflt::GROUND_TEMPERATURE_K,
        )?,
        ground_emissivity: c.or_default(
            &l::GROUND_EMISSIVITY,
            a.ground_emissivity,
            &dflt::GROUND_EMISSIVITY,
        )?,
        radome_loss_db: c.or_default(
            &l::RADOME_LOSS_DB,
            a.radome_loss_db,
            &dflt::RADOME_LOSS_DB,
        )?,
        noise_pattern: a
            .noise_pattern
            .as_ref()
            .map(|t| noise_pattern(c, t))
            .transpose()?,
        measured_noise_temperature_k: a
            .measured_noise_temperature_k
            .as_ref()
            .map(|t| {
                let (e, k) = (
                    &l::MEASURED_NOISE_ELEVATION_DEG,
                    &l::MEASURED_NOISE_TEMPERATURE_K,
                );
                rising_table(c, t, (e, "elevation"), (k, "temperature"))
            })
            .transpose()?,
    })
}

/// A measured noise pattern: a rising table from 0 to 180 deg off axis.
fn noise_pattern(c: &Checker, t: &[[f64; 2]]) -> Result<Vec<[f64; 2]>, ConfigError> {
    let (a, g) = (
        &limits::NOISE_PATTERN_OFF_AXIS_DEG,
        &limits::NOISE_PATTERN_GAIN_DBI,
    );
    let t = rising_table(c, t, (a, "off-axis angle"), (g, "gain"))?;
    if t[0][0] != 0.0 || t[t.len() - 1][0] != 180.0 {
        return Err(c.err(
            a.key,
            "the first point must be at 0 deg and the last at 180 deg (the whole pattern)",
        ));
    }
    Ok(t)
}

/// A table of at least two points, the first column rising, each column within its range.
fn rising_table(
    c: &Checker,
    points: &[[f64; 2]],
    first: (&limits::Range, &str),
    second: (&limits::Range, &str),
) -> Result<Vec<[f64; 2]>, ConfigError> {
    let key = first.0.key;
    if points.len() < 2 {
        return Err(c.err(key, "needs at least two points"));
    }
    for (i, pt) in points.iter().enumerate() {
        let bad = |msg: String| Err(c.item_err(key, i, msg));
        for (v, (r, what)) in [(pt[0], first), (pt[1], second)] {
            if let Err(e) = r.check(v) {
                return bad(format!("{what} {e}"));
            }
        }
        if i > 0 && pt[0] <= points[i - 1][0] {
            return bad(format!(
                "the {} must rise from one point to the next",
                first.1
            ));
        }
    }
    Ok(points.to_vec())
}

/// The ground antenna's gain: given in dBi, or from a diameter and an aperture efficiency.
fn antenna_gain(c: &mut Checker, a: &AntennaFile) -> Result<GainSpec, ConfigError> {
    let diameter_m = c.optional(&limits::ANTENNA_DIAMETER_M, a.diameter_m)?;
    match (a.gain_dbi, diameter_m, a.efficiency) {
        (Some(_), _, Some(_)) => Err(c.err(
            limits::ANTENNA_GAIN_DBI.key,
            "give either gain_dbi or diameter_m with efficiency, not both",
        )),
        (Some(g), d, None) => Ok(GainSpec::Given {
            gain_dbi: c.range(&limits::ANTENNA_GAIN_DBI, g)?,
            diameter_m: d,
        }),
        (None, Some(d), e) => Ok(GainSpec::Aperture {
            diameter_m: d,
            efficiency: c.or_default(&limits::ANTENNA_EFFICIENCY, e, &dflt::ANTENNA_EFFICIENCY)?,
        }),
        (None, None, _) => Err(c.err("antenna", "needs diameter_m (with efficiency) or gain_dbi")),
    }
}

/// The receiving chain block.
fn receiver(c: &mut Checker, r: &ReceiverFile) -> Result<Receiver, ConfigError> {
    use limits as l;
    let lna_noise_temperature_k = match (r.lna_noise_temperature_k, r.lna_noise_figure_db) {
        (Some(_), Some(_)) => {
            return Err(c.err(
                l::LNA_NOISE_FIGURE_DB.key,
                "give lna_noise_temperature_k or lna_noise_figure_db, not both",
            ))
        }
        (Some(t), None) => c.range(&l::LNA_NOISE_TEMPERATURE_K, t)?,
        (None, Some(nf)) => {
            crate::units::noise_figure_db_to_temperature_k(c.range(&l::LNA_NOISE_FIGURE_DB, nf)?)
        }
        (None, None) => {
            return Err(c.err(
                "receiver",
                "needs lna_noise_temperature_k or lna_noise_figure_db",
            ))
        }
    };
    Ok(Receiver {
        lna_noise_temperature_k,
        lna_gain_db: c.or_default(&l::LNA_GAIN_DB, r.lna_gain_db, &dflt::LNA_GAIN_DB)?,
        feed_loss_db: c.or_default(&l::FEED_LOSS_DB, r.feed_loss_db, &dflt::FEED_LOSS_DB)?,
        feed_temperature_k: c.or_default(
            &l::FEED_TEMPERATURE_K,
            r.feed_temperature_k,
            &dflt::FEED_TEMPERATURE_K,
        )?,
        followon_noise_figure_db: c.or_default(
            &l::FOLLOWON_NOISE_FIGURE_DB,
            r.followon_noise_figure_db,
            &dflt::FOLLOWON_NOISE_FIGURE_DB,
        )?,
    })
}

/// The climate block (absent: every key from its default or unset).
fn climate(c: &mut Checker, f: &ClimateFile) -> Result<Climate, ConfigError> {
    use limits as l;
    if f.cloud_liquid_kg_m2.is_some() {
        return Err(c.err(
            "climate.cloud_liquid_kg_m2",
            "replaced by climate.cloud_liquid_clear_kg_m2 (clear sky: a median or typical L) and \
             climate.cloud_liquid_exceedance_kg_m2 (availability case: L at the exceedance)",
        ));
    }
    Ok(Climate {
        pressure_hpa: c.or_default(&l::PRESSURE_HPA, f.pressure_hpa, &dflt::PRESSURE_HPA)?,
        temperature_k: c.or_default(&l::TEMPERATURE_K, f.temperature_k, &dflt::TEMPERATURE_K)?,
        water_vapour_density_g_m3: c.or_default(
            &l::WATER_VAPOUR_DENSITY_G_M3,
            f.water_vapour_density_g_m3,
            &dflt::WATER_VAPOUR_DENSITY_G_M3,
        )?,
        rain_rate_001_mm_h: c.optional(&l::RAIN_RATE_001_MM_H, f.rain_rate_001_mm_h)?,
        rain_height_km: c.optional(&l::RAIN_HEIGHT_KM, f.rain_height_km)?,
        cloud_liquid_clear_kg_m2: c
            .optional(&l::CLOUD_LIQUID_CLEAR_KG_M2, f.cloud_liquid_clear_kg_m2)?,
        cloud_liquid_exceedance_kg_m2: c.optional(
            &l::CLOUD_LIQUID_EXCEEDANCE_KG_M2,
            f.cloud_liquid_exceedance_kg_m2,
        )?,
        wet_refractivity: c.optional(&l::WET_REFRACTIVITY, f.wet_refractivity)?,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn load(text: &str) -> Result<Station, ConfigError> {
        Station::from_yaml(Path::new("st.yaml"), text)
    }

    const GOOD: &str = "name: Test Hill\nlatitude_deg: 45\nlongitude_deg: 7\naltitude_m: 300\n";

    #[test]
    fn minimal_station_loads_with_defaults() {
        let s = load(GOOD).unwrap();
        assert_eq!(s.min_elevation_deg, 0.0);
        assert!(s.defaults.iter().any(|d| d.key == "climate.pressure_hpa"));
        assert!(s.antenna.is_none());
    }

    #[test]
    fn unknown_key_names_line() {
        let e = load(&format!("{GOOD}antena:\n  diameter_m: 3\n")).unwrap_err();
        assert_eq!(e.line, Some(5));
        assert!(e.message.contains("antena"), "{e}");
    }

    #[test]
    fn missing_key_is_error() {
        let e = load("name: a\nlatitude_deg: 1\naltitude_m: 2\n").unwrap_err();
        assert!(e.message.contains("longitude_deg"), "{e}");
    }

    #[test]
    fn out_of_range_names_line_and_key() {
        let e = load("name: a\nlatitude_deg: 91\nlongitude_deg: 7\naltitude_m: 300\n").unwrap_err();
        assert_eq!(e.line, Some(2));
        assert_eq!(e.key.as_deref(), Some("latitude_deg"));
        let e = load(&format!("{GOOD}horizon_mask:\n  - [0, 3]\n  - [90, 95]\n")).unwrap_err();
        assert_eq!(e.line, Some(7));
        let e = load(&format!(
            "{GOOD}antenna:\n  diameter_m: 3\n  efficiency: 1.2\n"
        ))
        .unwrap_err();
        assert_eq!(e.line, Some(7));
        assert!(e.to_string().contains("antenna.efficiency"), "{e}");
    }

    #[test]
    fn polarization_default_is_recorded_by_name() {
        let s = load(&format!("{GOOD}antenna:\n  diameter_m: 3\n")).unwrap();
        assert_eq!(s.antenna.unwrap().polarization, PolarizationSense::Rhcp);
        let d = s
            .defaults
            .iter()
            .find(|d| d.key == "antenna.polarization")
            .unwrap();
        assert_eq!(d.value, "rhcp");
        let d = s
            .defaults
            .iter()
            .find(|d| d.key == "antenna.efficiency")
            .unwrap();
        assert_eq!(d.value, "0.55");
    }

    #[test]
    fn polarization_names_any_case_and_wrong_name_with_line() {
        for (name, want) in [
            ("RHCP", PolarizationSense::Rhcp),
            ("right", PolarizationSense::Rhcp),
            ("lhcp", PolarizationSense::Lhcp),
            ("Linear", PolarizationSense::Linear),
        ] {
            let s = load(&format!(
                "{GOOD}antenna:\n  diameter_m: 3\n  polarization: {name}\n"
            ));
            assert_eq!(s.unwrap().antenna.unwrap().polarization, want, "{name}");
        }
        let e = load(&format!(
            "{GOOD}antenna:\n  diameter_m: 3\n  polarization: rh\n"
        ))
        .unwrap_err();
        assert_eq!(e.line, Some(7));
        assert!(e.message.contains("unknown variant `rh`"), "{e}");
    }

    /// `--station NAME`'s rule: case, punctuation and Unicode form set aside (a behaviour check;
    /// the forms by UAX #15 §1.1, the lower case of U+0130 by Unicode SpecialCasing.txt).
    #[test]
    fn station_names_match_by_their_words() {
        assert!(same_station("pulau-reka", "Pulau Reka"));
        assert!(same_station("PULAU_REKA", "Pulau Reka"));
        assert!(!same_station("pulaureka", "Pulau Reka"));
        assert!(same_station("p\u{e9}rez alta", "Pe\u{301}rez-Alta"));
        assert!(same_station("izmir", "\u{130}zmir"));
        assert!(same_station("IZMIR", "\u{130}zmir"));
        assert!(!same_station("", "Nordkam"));
    }

    #[test]
    fn mask_azimuth_wraps_at_360() {
        let e = load(&format!("{GOOD}horizon_mask:\n  - [0, 3]\n  - [360, 5]\n")).unwrap_err();
        assert_eq!(e.line, Some(7));
        assert!(e.message.contains("azimuth 360"), "{e}");
    }
}
