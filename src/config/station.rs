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
//! ```
//! The radio blocks are documented key by key in the README.

use super::locate::{key_line, list_item_line};
use super::{parse_yaml, read_text, ConfigError, DefaultUsed};
use serde::Deserialize;
use std::path::{Path, PathBuf};

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
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct AntennaFile {
    diameter_m: Option<f64>,
    efficiency: Option<f64>,
    gain_dbi: Option<f64>,
    pointing_error_deg: Option<f64>,
    polarization: Option<String>,
    axial_ratio_db: Option<f64>,
    spillover_fraction: Option<f64>,
    ground_temperature_k: Option<f64>,
    radome_loss_db: Option<f64>,
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

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct ClimateFile {
    pressure_hpa: Option<f64>,
    temperature_k: Option<f64>,
    water_vapour_density_g_m3: Option<f64>,
    rain_rate_001_mm_h: Option<f64>,
    rain_height_km: Option<f64>,
    cloud_liquid_kg_m2: Option<f64>,
    wet_refractivity: Option<f64>,
}

/// Polarization sense of an antenna.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum PolarizationSense {
    Rhcp,
    Lhcp,
    Linear,
}

impl PolarizationSense {
    pub fn parse(text: &str) -> Option<Self> {
        match text.to_ascii_lowercase().as_str() {
            "rhcp" | "right" => Some(Self::Rhcp),
            "lhcp" | "left" => Some(Self::Lhcp),
            "linear" => Some(Self::Linear),
            _ => None,
        }
    }
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
    pub spillover_fraction: f64,
    pub ground_temperature_k: f64,
    pub radome_loss_db: f64,
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
    pub cloud_liquid_kg_m2: Option<f64>,
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
    /// Keys filled from defaults, with the value and its source: reported in outputs.
    pub defaults: Vec<DefaultUsed>,
}

struct Checker<'a> {
    path: &'a Path,
    text: &'a str,
}

impl Checker<'_> {
    fn err(&self, key: &[&str], msg: impl Into<String>) -> ConfigError {
        let dotted = key.join(".");
        ConfigError::new(
            self.path,
            key_line(self.text, key),
            Some(&dotted),
            format!("{dotted}: {}", msg.into()),
        )
    }
    fn range(
        &self,
        key: &[&str],
        v: f64,
        lo: f64,
        hi: f64,
        unit: &str,
    ) -> Result<f64, ConfigError> {
        if !v.is_finite() || v < lo || v > hi {
            return Err(self.err(key, format!("{v} is out of range ({lo} to {hi} {unit})")));
        }
        Ok(v)
    }
}

impl Station {
    /// Load and validate a station file.
    pub fn load(path: &Path) -> Result<Station, ConfigError> {
        let text = read_text(path)?;
        Self::from_yaml(path, &text)
    }

    /// Parse and validate station YAML text; `path` is used in messages.
    pub fn from_yaml(path: &Path, text: &str) -> Result<Station, ConfigError> {
        let file: StationFile = parse_yaml(path, text)?;
        let c = Checker { path, text };
        let mut defaults = Vec::new();
        if file.name.trim().is_empty() {
            return Err(c.err(&["name"], "must not be empty"));
        }
        let latitude_deg = c.range(&["latitude_deg"], file.latitude_deg, -90.0, 90.0, "deg")?;
        let mut longitude_deg =
            c.range(&["longitude_deg"], file.longitude_deg, -180.0, 360.0, "deg")?;
        if longitude_deg > 180.0 {
            longitude_deg -= 360.0;
        }
        let altitude_m = c.range(&["altitude_m"], file.altitude_m, -500.0, 9000.0, "m")?;
        let min_elevation_deg = match file.min_elevation_deg {
            Some(v) => c.range(&["min_elevation_deg"], v, -5.0, 90.0, "deg")?,
            None => {
                defaults.push(DefaultUsed {
                    key: "min_elevation_deg".into(),
                    value: "0".into(),
                    source: "geometric horizon".into(),
                });
                0.0
            }
        };
        let mut horizon_mask = file.horizon_mask.unwrap_or_default();
        for (i, p) in horizon_mask.iter().enumerate() {
            let line = list_item_line(text, &["horizon_mask"], i);
            let bad = |m: String| {
                ConfigError::new(
                    path,
                    line,
                    Some("horizon_mask"),
                    format!("horizon_mask point {}: {m}", i + 1),
                )
            };
            if !p[0].is_finite() || p[0] < 0.0 || p[0] >= 360.0 {
                return Err(bad(format!("azimuth {} is out of range (0 up to but not including 360 deg; the mask wraps at 360)", p[0])));
            }
            if !p[1].is_finite() || p[1] < -5.0 || p[1] > 90.0 {
                return Err(bad(format!(
                    "elevation {} is out of range (-5 to 90 deg)",
                    p[1]
                )));
            }
        }
        horizon_mask.sort_by(|a, b| a[0].total_cmp(&b[0]));
        if let Some(w) = horizon_mask.windows(2).find(|w| w[0][0] == w[1][0]) {
            return Err(c.err(
                &["horizon_mask"],
                format!("two points at azimuth {} deg", w[0][0]),
            ));
        }

        let antenna = match &file.antenna {
            None => None,
            Some(a) => Some(Self::antenna(&c, a, &mut defaults)?),
        };
        let receiver = match &file.receiver {
            None => None,
            Some(r) => Some(Self::receiver(&c, r, &mut defaults)?),
        };
        let climate = Self::climate(&c, file.climate.as_ref(), &mut defaults)?;
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
            defaults,
        })
    }

    fn antenna(
        c: &Checker,
        a: &AntennaFile,
        defaults: &mut Vec<DefaultUsed>,
    ) -> Result<GroundAntenna, ConfigError> {
        let mut dflt = |key: &str, value: f64, source: &str| {
            defaults.push(DefaultUsed {
                key: format!("antenna.{key}"),
                value: format!("{value}"),
                source: source.into(),
            });
            value
        };
        let diameter_m = match a.diameter_m {
            Some(d) => Some(c.range(&["antenna", "diameter_m"], d, 0.05, 100.0, "m")?),
            None => None,
        };
        let gain = match (a.gain_dbi, diameter_m, a.efficiency) {
            (Some(g), d, None) => GainSpec::Given {
                gain_dbi: c.range(&["antenna", "gain_dbi"], g, -10.0, 90.0, "dBi")?,
                diameter_m: d,
            },
            (Some(_), _, Some(_)) => {
                return Err(c.err(
                    &["antenna", "gain_dbi"],
                    "give either gain_dbi or diameter_m with efficiency, not both",
                ))
            }
            (None, Some(d), Some(e)) => {
                if !(e > 0.0 && e <= 1.0) {
                    return Err(c.err(&["antenna", "efficiency"], format!("{e} is outside (0, 1]")));
                }
                GainSpec::Aperture {
                    diameter_m: d,
                    efficiency: e,
                }
            }
            (None, Some(d), None) => {
                // 0.55 is the usual planning figure for a prime-focus parabolic reflector (common practice).
                GainSpec::Aperture {
                    diameter_m: d,
                    efficiency: dflt(
                        "efficiency",
                        0.55,
                        "common practice for a parabolic reflector",
                    ),
                }
            }
            (None, None, _) => {
                return Err(c.err(
                    &["antenna"],
                    "needs diameter_m (with efficiency) or gain_dbi",
                ))
            }
        };
        let pointing_error_deg = match a.pointing_error_deg {
            Some(v) => c.range(&["antenna", "pointing_error_deg"], v, 0.0, 10.0, "deg")?,
            None => dflt("pointing_error_deg", 0.0, "perfect pointing assumed"),
        };
        let polarization = match &a.polarization {
            Some(s) => PolarizationSense::parse(s).ok_or_else(|| {
                c.err(
                    &["antenna", "polarization"],
                    format!("'{s}' is not one of rhcp, lhcp, linear"),
                )
            })?,
            None => {
                dflt("polarization", 0.0, "rhcp (value shown as 0)");
                PolarizationSense::Rhcp
            }
        };
        let axial_ratio_db = match a.axial_ratio_db {
            Some(v) => c.range(&["antenna", "axial_ratio_db"], v, 0.0, 60.0, "dB")?,
            None => dflt("axial_ratio_db", 1.0, "common practice for a ground feed"),
        };
        let spillover_fraction = match a.spillover_fraction {
            Some(v) => c.range(&["antenna", "spillover_fraction"], v, 0.0, 0.5, "")?,
            None => dflt(
                "spillover_fraction",
                0.05,
                "common practice for a reflector antenna",
            ),
        };
        let ground_temperature_k = match a.ground_temperature_k {
            Some(v) => c.range(&["antenna", "ground_temperature_k"], v, 150.0, 350.0, "K")?,
            None => dflt("ground_temperature_k", 290.0, "reference temperature T0"),
        };
        let radome_loss_db = match a.radome_loss_db {
            Some(v) => c.range(&["antenna", "radome_loss_db"], v, 0.0, 10.0, "dB")?,
            None => 0.0,
        };
        Ok(GroundAntenna {
            gain,
            pointing_error_deg,
            polarization,
            axial_ratio_db,
            spillover_fraction,
            ground_temperature_k,
            radome_loss_db,
        })
    }

    fn receiver(
        c: &Checker,
        r: &ReceiverFile,
        defaults: &mut Vec<DefaultUsed>,
    ) -> Result<Receiver, ConfigError> {
        let mut dflt = |key: &str, value: f64, source: &str| {
            defaults.push(DefaultUsed {
                key: format!("receiver.{key}"),
                value: format!("{value}"),
                source: source.into(),
            });
            value
        };
        let lna_noise_temperature_k = match (r.lna_noise_temperature_k, r.lna_noise_figure_db) {
            (Some(_), Some(_)) => {
                return Err(c.err(
                    &["receiver", "lna_noise_figure_db"],
                    "give lna_noise_temperature_k or lna_noise_figure_db, not both",
                ))
            }
            (Some(t), None) => c.range(
                &["receiver", "lna_noise_temperature_k"],
                t,
                1.0,
                5000.0,
                "K",
            )?,
            (None, Some(nf)) => {
                let nf = c.range(&["receiver", "lna_noise_figure_db"], nf, 0.01, 15.0, "dB")?;
                crate::units::noise_figure_db_to_temperature_k(nf)
            }
            (None, None) => {
                return Err(c.err(
                    &["receiver"],
                    "needs lna_noise_temperature_k or lna_noise_figure_db",
                ))
            }
        };
        let lna_gain_db = match r.lna_gain_db {
            Some(v) => c.range(&["receiver", "lna_gain_db"], v, 0.0, 80.0, "dB")?,
            None => dflt(
                "lna_gain_db",
                30.0,
                "common practice for a feed-mounted LNA",
            ),
        };
        let feed_loss_db = match r.feed_loss_db {
            Some(v) => c.range(&["receiver", "feed_loss_db"], v, 0.0, 10.0, "dB")?,
            None => dflt("feed_loss_db", 0.0, "LNA at the feed, no loss before it"),
        };
        let feed_temperature_k = match r.feed_temperature_k {
            Some(v) => c.range(&["receiver", "feed_temperature_k"], v, 4.0, 400.0, "K")?,
            None => dflt("feed_temperature_k", 290.0, "reference temperature T0"),
        };
        let followon_noise_figure_db = match r.followon_noise_figure_db {
            Some(v) => c.range(
                &["receiver", "followon_noise_figure_db"],
                v,
                0.0,
                30.0,
                "dB",
            )?,
            None => dflt(
                "followon_noise_figure_db",
                10.0,
                "common practice for a down-converter after the LNA",
            ),
        };
        Ok(Receiver {
            lna_noise_temperature_k,
            lna_gain_db,
            feed_loss_db,
            feed_temperature_k,
            followon_noise_figure_db,
        })
    }

    fn climate(
        c: &Checker,
        f: Option<&ClimateFile>,
        defaults: &mut Vec<DefaultUsed>,
    ) -> Result<Climate, ConfigError> {
        let empty = ClimateFile {
            pressure_hpa: None,
            temperature_k: None,
            water_vapour_density_g_m3: None,
            rain_rate_001_mm_h: None,
            rain_height_km: None,
            cloud_liquid_kg_m2: None,
            wet_refractivity: None,
        };
        let f = f.unwrap_or(&empty);
        let mut dflt = |key: &str, value: f64, source: &str| {
            defaults.push(DefaultUsed {
                key: format!("climate.{key}"),
                value: format!("{value}"),
                source: source.into(),
            });
            value
        };
        const P835: &str = "ITU-R P.835-6 mean annual global reference atmosphere";
        let pressure_hpa = match f.pressure_hpa {
            Some(v) => c.range(&["climate", "pressure_hpa"], v, 300.0, 1100.0, "hPa")?,
            None => dflt("pressure_hpa", 1013.25, P835),
        };
        let temperature_k = match f.temperature_k {
            Some(v) => c.range(&["climate", "temperature_k"], v, 200.0, 330.0, "K")?,
            None => dflt("temperature_k", 288.15, P835),
        };
        let water_vapour_density_g_m3 = match f.water_vapour_density_g_m3 {
            Some(v) => c.range(
                &["climate", "water_vapour_density_g_m3"],
                v,
                0.0,
                40.0,
                "g/m3",
            )?,
            None => dflt("water_vapour_density_g_m3", 7.5, P835),
        };
        let opt = |key: &str,
                   v: Option<f64>,
                   lo: f64,
                   hi: f64,
                   unit: &str|
         -> Result<Option<f64>, ConfigError> {
            v.map(|x| c.range(&["climate", key], x, lo, hi, unit))
                .transpose()
        };
        Ok(Climate {
            pressure_hpa,
            temperature_k,
            water_vapour_density_g_m3,
            rain_rate_001_mm_h: opt(
                "rain_rate_001_mm_h",
                f.rain_rate_001_mm_h,
                0.0,
                300.0,
                "mm/h",
            )?,
            rain_height_km: opt("rain_height_km", f.rain_height_km, 0.0, 8.0, "km")?,
            cloud_liquid_kg_m2: opt(
                "cloud_liquid_kg_m2",
                f.cloud_liquid_kg_m2,
                0.0,
                10.0,
                "kg/m2",
            )?,
            wet_refractivity: opt(
                "wet_refractivity",
                f.wet_refractivity,
                0.0,
                200.0,
                "N-units",
            )?,
        })
    }
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
}
