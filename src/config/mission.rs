//! Mission file: the satellite, its transmitter and modem, the stations and the planning window.
//! Every key is documented in the README ("Mission file"). Paths are relative to the mission file.

use super::locate::{key_line, list_item_line};
use super::{parse_yaml, read_text, ConfigError, DefaultUsed};
use crate::config::station::{PolarizationSense, Station};
use serde::Deserialize;
use std::path::{Path, PathBuf};

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct MissionFile {
    name: String,
    satellite: SatelliteFile,
    #[serde(default)]
    stations: Vec<String>,
    #[serde(default)]
    window: Option<WindowFile>,
    #[serde(default)]
    planning: Option<PlanningFile>,
    #[serde(default)]
    transmitter: Option<TransmitterFile>,
    #[serde(default)]
    modem: Option<ModemFile>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct SatelliteFile {
    elements: String,
    #[serde(default)]
    select: Option<String>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct WindowFile {
    start: Option<String>,
    end: Option<String>,
    days: Option<f64>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct PlanningFile {
    step_s: Option<f64>,
    exceedance_percent: Option<f64>,
    mask_deg: Option<f64>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct TransmitterFile {
    frequency_mhz: f64,
    power_w: Option<f64>,
    power_dbw: Option<f64>,
    line_loss_db: Option<f64>,
    other_loss_db: Option<f64>,
    antenna: TxAntennaFile,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct TxAntennaFile {
    pattern: String,
    gain_dbi: Option<f64>,
    table: Option<Vec<[f64; 2]>>,
    polarization: Option<String>,
    axial_ratio_db: Option<f64>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct ModemFile {
    roll_off: Option<f64>,
    implementation_loss_db: Option<f64>,
    required_margin_db: Option<f64>,
    target_ber: Option<f64>,
    max_bandwidth_hz: Option<f64>,
    min_dwell_s: Option<f64>,
    #[serde(default)]
    ladder: Vec<LadderStepFile>,
    #[serde(default)]
    adaptive: Option<AdaptiveFile>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct LadderStepFile {
    rate_bps: f64,
    scheme: String,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct AdaptiveFile {
    symbol_rate_baud: f64,
    schemes: Vec<String>,
}

/// Spacecraft antenna pattern as configured.
#[derive(Debug, Clone, PartialEq)]
pub enum TxPatternConfig {
    Fixed { gain_dbi: f64 },
    CosN { boresight_gain_dbi: f64 },
    Table { points: Vec<[f64; 2]> },
}

/// Spacecraft transmitter, validated.
#[derive(Debug, Clone, PartialEq)]
pub struct TransmitterConfig {
    pub frequency_hz: f64,
    pub power_dbw: f64,
    pub line_loss_db: f64,
    pub other_loss_db: f64,
    pub pattern: TxPatternConfig,
    pub polarization: PolarizationSense,
    pub axial_ratio_db: f64,
}

/// One step of the fixed-rate ladder.
#[derive(Debug, Clone, PartialEq)]
pub struct LadderStep {
    pub rate_bps: f64,
    pub scheme: String,
    /// 1-based line in the mission file, for later errors (unknown scheme, bandwidth).
    pub line: Option<usize>,
}

/// Adaptive (variable coding and modulation) configuration.
#[derive(Debug, Clone, PartialEq)]
pub struct AdaptiveConfig {
    pub symbol_rate_baud: f64,
    pub schemes: Vec<(String, Option<usize>)>,
}

/// Modem, validated.
#[derive(Debug, Clone, PartialEq)]
pub struct ModemConfig {
    pub roll_off: f64,
    pub implementation_loss_db: f64,
    pub required_margin_db: f64,
    pub target_ber: f64,
    pub max_bandwidth_hz: Option<f64>,
    /// Shortest run of closed seconds that counts (acquisition and frame lock), s.
    pub min_dwell_s: f64,
    pub ladder: Vec<LadderStep>,
    pub adaptive: Option<AdaptiveConfig>,
}

/// A validated mission.
#[derive(Debug, Clone)]
pub struct Mission {
    pub name: String,
    pub source: PathBuf,
    pub elements_path: PathBuf,
    pub select: Option<String>,
    pub stations: Vec<Station>,
    pub start: Option<chrono::DateTime<chrono::Utc>>,
    pub end: Option<chrono::DateTime<chrono::Utc>>,
    pub days: Option<f64>,
    pub step_s: f64,
    pub exceedance_percent: Option<f64>,
    pub mask_deg: Option<f64>,
    pub transmitter: Option<TransmitterConfig>,
    pub modem: Option<ModemConfig>,
    pub defaults: Vec<DefaultUsed>,
}

impl Mission {
    /// Load and validate a mission file and the station files it names.
    pub fn load(path: &Path) -> Result<Mission, ConfigError> {
        let text = read_text(path)?;
        Self::from_yaml(path, &text)
    }

    pub fn from_yaml(path: &Path, text: &str) -> Result<Mission, ConfigError> {
        let file: MissionFile = parse_yaml(path, text)?;
        let err = |key: &[&str], msg: String| {
            let dotted = key.join(".");
            ConfigError::new(
                path,
                key_line(text, key),
                Some(&dotted),
                format!("{dotted}: {msg}"),
            )
        };
        let range =
            |key: &[&str], v: f64, lo: f64, hi: f64, unit: &str| -> Result<f64, ConfigError> {
                if !v.is_finite() || v < lo || v > hi {
                    return Err(err(
                        key,
                        format!("{v} is out of range ({lo} to {hi} {unit})"),
                    ));
                }
                Ok(v)
            };
        let base = path.parent().map(Path::to_path_buf).unwrap_or_default();
        let resolve = |p: &str| -> PathBuf {
            let pb = PathBuf::from(p);
            if pb.is_absolute() {
                pb
            } else {
                base.join(pb)
            }
        };
        let mut defaults = Vec::new();
        let mut stations = Vec::new();
        for s in &file.stations {
            stations.push(Station::load(&resolve(s))?);
        }
        for (i, a) in stations.iter().enumerate() {
            if stations[..i].iter().any(|b| b.name == a.name) {
                let line = list_item_line(text, &["stations"], i);
                return Err(ConfigError::new(
                    path,
                    line,
                    Some("stations"),
                    format!("stations: two stations are named '{}'", a.name),
                ));
            }
        }
        let (mut start, mut end, mut days) = (None, None, None);
        if let Some(w) = &file.window {
            if let Some(s) = &w.start {
                start =
                    Some(crate::timefmt::parse_utc(s).map_err(|m| err(&["window", "start"], m))?);
            }
            if let Some(s) = &w.end {
                end = Some(crate::timefmt::parse_utc(s).map_err(|m| err(&["window", "end"], m))?);
            }
            if let Some(d) = w.days {
                days = Some(range(&["window", "days"], d, 0.0001, 3660.0, "days")?);
            }
            if end.is_some() && days.is_some() {
                return Err(err(
                    &["window", "days"],
                    "give window.end or window.days, not both".into(),
                ));
            }
            if let (Some(s), Some(e)) = (start, end) {
                if e <= s {
                    return Err(err(
                        &["window", "end"],
                        "the end is not after the start".into(),
                    ));
                }
            }
        }
        let p = file.planning.clone().unwrap_or(PlanningFile {
            step_s: None,
            exceedance_percent: None,
            mask_deg: None,
        });
        let step_s = match p.step_s {
            Some(v) => range(&["planning", "step_s"], v, 0.01, 10.0, "s")?,
            None => 1.0,
        };
        let exceedance_percent = p
            .exceedance_percent
            .map(|v| range(&["planning", "exceedance_percent"], v, 0.001, 5.0, "%"))
            .transpose()?;
        let mask_deg = p
            .mask_deg
            .map(|v| range(&["planning", "mask_deg"], v, -5.0, 90.0, "deg"))
            .transpose()?;

        let transmitter = match &file.transmitter {
            None => None,
            Some(t) => {
                let frequency_mhz = range(
                    &["transmitter", "frequency_mhz"],
                    t.frequency_mhz,
                    30.0,
                    100_000.0,
                    "MHz",
                )?;
                let power_dbw = match (t.power_w, t.power_dbw) {
                    (Some(_), Some(_)) => {
                        return Err(err(
                            &["transmitter", "power_dbw"],
                            "give power_w or power_dbw, not both".into(),
                        ))
                    }
                    (Some(w), None) => {
                        if !(w.is_finite() && w > 0.0) {
                            return Err(err(
                                &["transmitter", "power_w"],
                                format!("{w} W: power must be positive"),
                            ));
                        }
                        crate::units::watts_to_dbw(w)
                    }
                    (None, Some(d)) => range(&["transmitter", "power_dbw"], d, -40.0, 40.0, "dBW")?,
                    (None, None) => {
                        return Err(err(&["transmitter"], "needs power_w or power_dbw".into()))
                    }
                };
                let line_loss_db = t
                    .line_loss_db
                    .map(|v| range(&["transmitter", "line_loss_db"], v, 0.0, 20.0, "dB"))
                    .transpose()?
                    .unwrap_or(0.0);
                let other_loss_db = t
                    .other_loss_db
                    .map(|v| range(&["transmitter", "other_loss_db"], v, 0.0, 30.0, "dB"))
                    .transpose()?
                    .unwrap_or(0.0);
                let a = &t.antenna;
                let pattern = match a.pattern.as_str() {
                    "fixed" => TxPatternConfig::Fixed {
                        gain_dbi: range(
                            &["transmitter", "antenna", "gain_dbi"],
                            a.gain_dbi.ok_or_else(|| {
                                err(
                                    &["transmitter", "antenna"],
                                    "pattern 'fixed' needs gain_dbi".into(),
                                )
                            })?,
                            -20.0,
                            60.0,
                            "dBi",
                        )?,
                    },
                    "cos_n" => TxPatternConfig::CosN {
                        boresight_gain_dbi: range(
                            &["transmitter", "antenna", "gain_dbi"],
                            a.gain_dbi.ok_or_else(|| {
                                err(
                                    &["transmitter", "antenna"],
                                    "pattern 'cos_n' needs gain_dbi (boresight)".into(),
                                )
                            })?,
                            3.1,
                            60.0,
                            "dBi",
                        )?,
                    },
                    "table" => {
                        let points = a.table.clone().ok_or_else(|| {
                            err(
                                &["transmitter", "antenna"],
                                "pattern 'table' needs table: [[off_nadir_deg, gain_dbi], ...]"
                                    .into(),
                            )
                        })?;
                        if points.len() < 2 {
                            return Err(err(
                                &["transmitter", "antenna", "table"],
                                "needs at least two points".into(),
                            ));
                        }
                        for (i, pt) in points.iter().enumerate() {
                            if !(0.0..=180.0).contains(&pt[0])
                                || !pt[1].is_finite()
                                || i > 0 && pt[0] <= points[i - 1][0]
                            {
                                let line =
                                    list_item_line(text, &["transmitter", "antenna", "table"], i);
                                return Err(ConfigError::new(path, line, Some("transmitter.antenna.table"), format!("transmitter.antenna.table point {}: off-nadir angles must rise from 0 to 180 deg and gains must be finite numbers", i + 1)));
                            }
                        }
                        TxPatternConfig::Table { points }
                    }
                    other => {
                        return Err(err(
                            &["transmitter", "antenna", "pattern"],
                            format!("'{other}' is not one of fixed, cos_n, table"),
                        ))
                    }
                };
                let polarization = match &a.polarization {
                    Some(s) => PolarizationSense::parse(s).ok_or_else(|| {
                        err(
                            &["transmitter", "antenna", "polarization"],
                            format!("'{s}' is not one of rhcp, lhcp, linear"),
                        )
                    })?,
                    None => PolarizationSense::Rhcp,
                };
                let axial_ratio_db = match a.axial_ratio_db {
                    Some(v) => range(
                        &["transmitter", "antenna", "axial_ratio_db"],
                        v,
                        0.0,
                        60.0,
                        "dB",
                    )?,
                    None => {
                        defaults.push(DefaultUsed {
                            key: "transmitter.antenna.axial_ratio_db".into(),
                            value: "3".into(),
                            source:
                                "common practice for a wide-beam spacecraft antenna off boresight"
                                    .into(),
                        });
                        3.0
                    }
                };
                Some(TransmitterConfig {
                    frequency_hz: frequency_mhz * 1e6,
                    power_dbw,
                    line_loss_db,
                    other_loss_db,
                    pattern,
                    polarization,
                    axial_ratio_db,
                })
            }
        };

        let modem = match &file.modem {
            None => None,
            Some(m) => {
                let roll_off = m
                    .roll_off
                    .map(|v| range(&["modem", "roll_off"], v, 0.0, 1.0, ""))
                    .transpose()?
                    .unwrap_or_else(|| {
                        defaults.push(DefaultUsed {
                            key: "modem.roll_off".into(),
                            value: "0.35".into(),
                            source: "common practice (SRRC filtering)".into(),
                        });
                        0.35
                    });
                let implementation_loss_db = m
                    .implementation_loss_db
                    .map(|v| range(&["modem", "implementation_loss_db"], v, 0.0, 10.0, "dB"))
                    .transpose()?
                    .unwrap_or_else(|| {
                        defaults.push(DefaultUsed {
                            key: "modem.implementation_loss_db".into(),
                            value: "1.5".into(),
                            source: "common practice for a planning budget".into(),
                        });
                        1.5
                    });
                let required_margin_db = m
                    .required_margin_db
                    .map(|v| range(&["modem", "required_margin_db"], v, -10.0, 20.0, "dB"))
                    .transpose()?
                    .unwrap_or_else(|| {
                        defaults.push(DefaultUsed {
                            key: "modem.required_margin_db".into(),
                            value: "3".into(),
                            source: "common practice".into(),
                        });
                        3.0
                    });
                let target_ber = m
                    .target_ber
                    .map(|v| range(&["modem", "target_ber"], v, 1e-12, 1e-2, ""))
                    .transpose()?
                    .unwrap_or(1e-6);
                let max_bandwidth_hz = m
                    .max_bandwidth_hz
                    .map(|v| range(&["modem", "max_bandwidth_hz"], v, 1.0, 1e10, "Hz"))
                    .transpose()?;
                let min_dwell_s = m
                    .min_dwell_s
                    .map(|v| range(&["modem", "min_dwell_s"], v, 0.0, 600.0, "s"))
                    .transpose()?
                    .unwrap_or(10.0);
                let mut ladder = Vec::new();
                for (i, st) in m.ladder.iter().enumerate() {
                    let line = list_item_line(text, &["modem", "ladder"], i);
                    if !(st.rate_bps.is_finite() && st.rate_bps > 0.0) {
                        return Err(ConfigError::new(
                            path,
                            line,
                            Some("modem.ladder"),
                            format!(
                                "modem.ladder step {}: rate_bps {} must be positive",
                                i + 1,
                                st.rate_bps
                            ),
                        ));
                    }
                    ladder.push(LadderStep {
                        rate_bps: st.rate_bps,
                        scheme: st.scheme.clone(),
                        line,
                    });
                }
                let adaptive = match &m.adaptive {
                    None => None,
                    Some(a) => {
                        let symbol_rate_baud = range(
                            &["modem", "adaptive", "symbol_rate_baud"],
                            a.symbol_rate_baud,
                            1.0,
                            1e10,
                            "baud",
                        )?;
                        if a.schemes.is_empty() {
                            return Err(err(
                                &["modem", "adaptive", "schemes"],
                                "needs at least one scheme".into(),
                            ));
                        }
                        let schemes = a
                            .schemes
                            .iter()
                            .enumerate()
                            .map(|(i, s)| {
                                (
                                    s.clone(),
                                    list_item_line(text, &["modem", "adaptive", "schemes"], i),
                                )
                            })
                            .collect();
                        Some(AdaptiveConfig {
                            symbol_rate_baud,
                            schemes,
                        })
                    }
                };
                Some(ModemConfig {
                    roll_off,
                    implementation_loss_db,
                    required_margin_db,
                    target_ber,
                    max_bandwidth_hz,
                    min_dwell_s,
                    ladder,
                    adaptive,
                })
            }
        };
        Ok(Mission {
            name: file.name,
            source: path.to_path_buf(),
            elements_path: resolve(&file.satellite.elements),
            select: file.satellite.select,
            stations,
            start,
            end,
            days,
            step_s,
            exceedance_percent,
            mask_deg,
            transmitter,
            modem,
            defaults,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn minimal_mission() {
        let m = Mission::from_yaml(
            Path::new("/tmp/m.yaml"),
            "name: t\nsatellite:\n  elements: sat.tle\n",
        )
        .unwrap();
        assert_eq!(m.elements_path, PathBuf::from("/tmp/sat.tle"));
        assert!(m.stations.is_empty());
        assert_eq!(m.step_s, 1.0);
    }

    #[test]
    fn negative_power_is_error_with_line() {
        let t = "name: t\nsatellite:\n  elements: sat.tle\ntransmitter:\n  frequency_mhz: 8200\n  power_w: -2\n  antenna:\n    pattern: fixed\n    gain_dbi: 3\n";
        let e = Mission::from_yaml(Path::new("m.yaml"), t).unwrap_err();
        assert_eq!(e.line, Some(6));
        assert!(e.message.contains("positive"), "{e}");
    }

    #[test]
    fn unknown_modem_key() {
        let t = "name: t\nsatellite:\n  elements: sat.tle\nmodem:\n  rolloff: 0.3\n";
        let e = Mission::from_yaml(Path::new("m.yaml"), t).unwrap_err();
        assert_eq!(e.line, Some(5));
    }
}
