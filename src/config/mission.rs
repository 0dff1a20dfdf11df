//! Mission file: the satellite, its transmitter and modem, the stations and the planning window.
//! Every key is documented in the README ("Mission file"). Paths are relative to the mission file.

use super::defaults as dflt;
use super::limits;
use super::overrides::{parse_with, Overrides};
use super::{read_yaml_text, Checker, ConfigError, DefaultUsed};
use crate::config::station::{same_station, Station};
use crate::link::antenna::TxPattern;
use crate::link::modcod::ErrorMeasure;
use crate::link::polarization::PolarizationSense;
use crate::link::schemes::{
    EbN0Basis, Framing, SchemeRegistry, UserScheme, UserSchemeSpec, UserThreshold,
};
use serde::Deserialize;
use std::path::{Path, PathBuf};

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct MissionFile {
    name: String,
    #[serde(default)]
    satellite: Option<SatelliteFile>,
    #[serde(default)]
    satellites: Option<Vec<SatelliteFile>>,
    #[serde(default)]
    booking: Option<Vec<super::fleet::BookingRuleFile>>,
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
    #[serde(default)]
    pfd: Option<PfdFile>,
}

/// The pfd check's options (`pfd:`).
#[derive(Debug, Clone, Default, Deserialize)]
#[serde(deny_unknown_fields)]
struct PfdFile {
    #[serde(default)]
    spectrum: Option<PfdSpectrum>,
}

/// How the pfd check spreads a carrier's power over its occupied bandwidth (`pfd.spectrum`): a
/// closed set, so a wrong name is serde's error, with its line.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum PfdSpectrum {
    /// Uniform over the occupied bandwidth (the default).
    #[default]
    Uniform,
    /// The raised-cosine spectrum of the modem's `roll_off`.
    RaisedCosine,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct SatelliteFile {
    #[serde(default)]
    name: Option<String>,
    elements: String,
    #[serde(default)]
    select: Option<String>,
    #[serde(default)]
    priority: Option<f64>,
    #[serde(default)]
    downlinks: Option<f64>,
    #[serde(default)]
    onboard: Option<super::fleet::OnboardFile>,
    #[serde(default)]
    transmitter: Option<TransmitterFile>,
    #[serde(default)]
    modem: Option<ModemFile>,
}

#[derive(Debug, Clone, Default, Deserialize)]
#[serde(deny_unknown_fields)]
struct WindowFile {
    start: Option<String>,
    end: Option<String>,
    days: Option<f64>,
}

#[derive(Debug, Clone, Default, Deserialize)]
#[serde(deny_unknown_fields)]
struct PlanningFile {
    step_s: Option<f64>,
    exceedance_percent: Option<f64>,
    mask_deg: Option<f64>,
    mask_share_percent: Option<f64>,
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

/// The closed set of spacecraft antenna patterns: a wrong name is serde's error, with its line.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "snake_case")]
enum PatternKind {
    Fixed,
    CosN,
    Table,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct TxAntennaFile {
    pattern: PatternKind,
    gain_dbi: Option<f64>,
    table: Option<Vec<[f64; 2]>>,
    polarization: Option<PolarizationSense>,
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
    schemes: Vec<SchemeFile>,
    #[serde(default)]
    ladder: Vec<LadderStepFile>,
    #[serde(default)]
    adaptive: Option<AdaptiveFile>,
}

/// A ladder item: one rate (`rate_bps`, the information rate) or one scheme at several symbol
/// rates (`symbol_rates_baud`).
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct LadderStepFile {
    rate_bps: Option<f64>,
    symbol_rates_baud: Option<Vec<f64>>,
    scheme: String,
}

/// What a user scheme's error rate counts.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "lowercase")]
enum MeasureFile {
    Ber,
    Fer,
    Per,
}

/// Which bit a user scheme's Eb/N0 is stated per.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "snake_case")]
enum EbN0PerFile {
    CodeInputBit,
    InformationBit,
}

/// One of the mission's own schemes (`modem.schemes`).
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct SchemeFile {
    name: String,
    bits_per_symbol: u32,
    code_rate: f64,
    required_ebn0_db: Option<f64>,
    required_esn0_db: Option<f64>,
    table: Option<Vec<[f64; 2]>>,
    ebn0_per: Option<EbN0PerFile>,
    error_rate: f64,
    error_measure: MeasureFile,
    overhead: Option<OverheadFile>,
}

/// A user scheme's framing overhead: one frame's bits, or the efficiency itself.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct OverheadFile {
    sync_marker_bits: Option<u64>,
    parity_bits: Option<u64>,
    header_bits: Option<u64>,
    frame_bits: Option<u64>,
    efficiency: Option<f64>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct AdaptiveFile {
    symbol_rate_baud: f64,
    schemes: Vec<String>,
    hysteresis_db: Option<f64>,
    relock_s: Option<f64>,
    with_ladder: Option<bool>,
}

/// Spacecraft transmitter, validated. The pattern is the link model's own: the file gives no
/// cos^n exponent, so a `cos_n` pattern always has `n: None` (derived from the boresight gain).
#[derive(Debug, Clone, PartialEq)]
pub struct TransmitterConfig {
    pub frequency_hz: f64,
    pub power_dbw: f64,
    pub line_loss_db: f64,
    pub other_loss_db: f64,
    pub pattern: TxPattern,
    pub polarization: PolarizationSense,
    pub axial_ratio_db: f64,
}

/// One step of the fixed-rate ladder.
#[derive(Debug, Clone, PartialEq)]
pub struct LadderStep {
    /// Information rate, bit/s (given, or the symbol rate x the scheme's spectral efficiency).
    pub rate_bps: f64,
    /// The scheme's name as the registry spells it (lower case).
    pub scheme: String,
    /// The symbol rate, when the step was given by `symbol_rates_baud`.
    pub symbol_rate_baud: Option<f64>,
    /// 1-based line in the mission file, for later errors (unknown scheme, bandwidth).
    pub line: Option<usize>,
}

/// Adaptive (variable coding and modulation) configuration.
#[derive(Debug, Clone, PartialEq)]
pub struct AdaptiveConfig {
    pub symbol_rate_baud: f64,
    pub schemes: Vec<(String, Option<usize>)>,
    /// Extra margin a higher scheme needs before the modem switches up to it, dB.
    pub hysteresis_db: f64,
    /// Data lost at each change of scheme while the receiver re-locks, s.
    pub relock_s: f64,
    /// Also switch among the fixed ladder's rates (a second waveform; off by default).
    pub with_ladder: bool,
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
    /// The schemes the ladder and the adaptive set may name: the built-in catalogue and the
    /// mission's own (`modem.schemes`).
    pub schemes: SchemeRegistry,
    /// 1-based line of the `modem` key in the mission file, for later errors about the block.
    pub line: Option<usize>,
}

/// One satellite of the mission, validated: its elements, its radio (its own blocks, else the
/// mission's shared ones) and what the contact plan needs.
#[derive(Debug, Clone)]
pub struct SatelliteConfig {
    /// The name given in the file (`None`: the element set's name is used).
    pub name: Option<String>,
    pub elements_path: PathBuf,
    pub select: Option<String>,
    /// Weight of this satellite's delivered bits in the contact plan.
    pub priority_weight: f64,
    /// Downlinks it can run at once.
    pub max_downlinks: usize,
    /// Its data on board (`None`: it always has data to send; no storage is followed).
    pub onboard: Option<super::fleet::Onboard>,
    pub transmitter: Option<TransmitterConfig>,
    pub modem: Option<ModemConfig>,
    /// 1-based line of the satellite in the mission file.
    pub line: Option<usize>,
}

/// A validated mission.
#[derive(Debug, Clone)]
pub struct Mission {
    pub name: String,
    pub source: PathBuf,
    /// Every satellite of the mission (one for the `satellite:` form). The fields below that
    /// describe one satellite (`elements_path`, `select`, `transmitter`, `modem`) are the first
    /// one's; [`Mission::for_satellite`] gives the mission seen by another.
    pub satellites: Vec<SatelliteConfig>,
    pub elements_path: PathBuf,
    pub select: Option<String>,
    pub stations: Vec<Station>,
    pub start: Option<chrono::DateTime<chrono::Utc>>,
    pub end: Option<chrono::DateTime<chrono::Utc>>,
    pub days: Option<f64>,
    pub step_s: f64,
    pub exceedance_percent: Option<f64>,
    pub mask_deg: Option<f64>,
    /// Share of passes on which a rate must close above its usable mask, % (the robust mask).
    pub mask_share_percent: f64,
    /// `pfd.spectrum` (default uniform).
    pub pfd_spectrum: PfdSpectrum,
    pub transmitter: Option<TransmitterConfig>,
    pub modem: Option<ModemConfig>,
    pub defaults: Vec<DefaultUsed>,
    /// The keys given by `--set` (the dotted key, the option and argument as given), for
    /// messages about them raised after validation ([`Mission::origin`]).
    pub set_keys: Vec<(String, String)>,
}

/// The planning window as validated: start, end, days.
type Window = (
    Option<chrono::DateTime<chrono::Utc>>,
    Option<chrono::DateTime<chrono::Utc>>,
    Option<f64>,
);

impl Mission {
    /// The spectrum the pfd check assumes ([`crate::link::pfd::Spectrum`]): uniform, or the
    /// raised cosine of this satellite's modem roll-off.
    pub fn pfd_spectrum(&self) -> crate::link::pfd::Spectrum {
        match self.pfd_spectrum {
            PfdSpectrum::Uniform => crate::link::pfd::Spectrum::Uniform,
            PfdSpectrum::RaisedCosine => crate::link::pfd::Spectrum::RaisedCosine {
                roll_off: self
                    .modem
                    .as_ref()
                    .map_or(dflt::ROLL_OFF.value, |m| m.roll_off),
            },
        }
    }

    /// Load and validate a mission file and the station files it names.
    pub fn load(path: &Path) -> Result<Mission, ConfigError> {
        Self::load_with(path, &Overrides::default())
    }

    /// Load and validate a mission file and its station files with `--set` overrides applied
    /// (see [`crate::config::overrides`]); every override naming a station must reach one.
    pub fn load_with(path: &Path, overrides: &Overrides) -> Result<Mission, ConfigError> {
        let text = read_yaml_text(path)?;
        Self::from_yaml_with(path, &text, overrides)
    }

    /// Parse and validate mission YAML text, loading the station files it names (relative to
    /// `path`'s folder); `path` is used in messages.
    pub fn from_yaml(path: &Path, text: &str) -> Result<Mission, ConfigError> {
        Self::from_yaml_with(path, text, &Overrides::default())
    }

    /// [`Mission::from_yaml`] with overrides.
    pub fn from_yaml_with(
        path: &Path,
        text: &str,
        overrides: &Overrides,
    ) -> Result<Mission, ConfigError> {
        let applied = overrides.mission();
        let file: MissionFile = parse_with(path, text, &applied)?;
        let mut c = Checker::new(path, text, &applied);
        if file.name.trim().is_empty() {
            return Err(c.err("name", "must not be empty"));
        }
        crate::infile::check_yaml_name(&file.name).map_err(|m| c.err("name", m))?;
        let base = path.parent().map(Path::to_path_buf).unwrap_or_default();
        let stations = stations(&c, &base, &file.stations, overrides)?;
        let names: Vec<&str> = stations.iter().map(|s| s.name.as_str()).collect();
        overrides.check_stations(path, &names)?;
        let (start, end, days) = window(&c, &file.window.clone().unwrap_or_default())?;
        let p = file.planning.clone().unwrap_or_default();
        let step_s = c.or_default(&limits::STEP_S, p.step_s, &dflt::STEP_S)?;
        let exceedance_percent = c.optional(&limits::EXCEEDANCE_PERCENT, p.exceedance_percent)?;
        let mask_deg = c.optional(&limits::PLANNING_MASK_DEG, p.mask_deg)?;
        let mask_share_percent = c.or_default(
            &limits::MASK_SHARE_PERCENT,
            p.mask_share_percent,
            &dflt::MASK_SHARE_PERCENT,
        )?;
        let transmitter = file
            .transmitter
            .as_ref()
            .map(|t| transmitter(&mut c, t))
            .transpose()?;
        let modem = file.modem.as_ref().map(|m| modem(&mut c, m)).transpose()?;
        let satellites = satellites(&mut c, &file, &base, (&transmitter, &modem))?;
        let mut stations = stations;
        booking_rules(
            &c,
            file.booking.as_deref().unwrap_or_default(),
            &mut stations,
        )?;
        let first = &satellites[0];
        Ok(Mission {
            name: file.name,
            source: path.to_path_buf(),
            elements_path: first.elements_path.clone(),
            select: first.select.clone(),
            transmitter: first.transmitter.clone(),
            modem: first.modem.clone(),
            satellites,
            stations,
            start,
            end,
            days,
            step_s,
            exceedance_percent,
            mask_deg,
            mask_share_percent,
            pfd_spectrum: file
                .pfd
                .as_ref()
                .and_then(|p| p.spectrum)
                .unwrap_or_default(),
            defaults: c.defaults,
            set_keys: applied.iter().map(|a| (a.key.clone(), a.given())).collect(),
        })
    }

    /// The mission as satellite `index` sees it: its elements and radio in the single-satellite
    /// fields, and itself as the only satellite.
    pub fn for_satellite(&self, index: usize) -> Mission {
        let s = &self.satellites[index];
        Mission {
            elements_path: s.elements_path.clone(),
            select: s.select.clone(),
            transmitter: s.transmitter.clone(),
            modem: s.modem.clone(),
            satellites: vec![s.clone()],
            ..self.clone()
        }
    }

    /// Where a key's value came from, for a message: `file: --set ARG` for a key given by
    /// `--set` (or lying under one), else `file:line` (or `file` without a line).
    pub fn origin(&self, key: &str, line: Option<usize>) -> String {
        let set = self
            .set_keys
            .iter()
            .rev()
            .find(|(k, _)| key == k || key.starts_with(&format!("{k}.")));
        match (set, line) {
            (Some((_, given)), _) => format!("{}: {given}", self.source.display()),
            (None, Some(l)) => format!("{}:{l}", self.source.display()),
            (None, None) => self.source.display().to_string(),
        }
    }
}

/// A path from the mission file: absolute, or relative to the mission file's folder.
pub(super) fn resolve(base: &Path, p: &str) -> PathBuf {
    let pb = PathBuf::from(p);
    if pb.is_absolute() {
        pb
    } else {
        base.join(pb)
    }
}

/// A station file that cannot be read (missing, unreadable, empty) is traced to the mission line
/// that lists it: `mission:line: stations: station file PATH: what is wrong`. Errors inside a
/// station file that was read keep that file's own line.
fn station_file_error(c: &Checker, index: usize, path: &Path, e: ConfigError) -> ConfigError {
    if e.line.is_some() || e.set.is_some() || e.path != path {
        return e;
    }
    let msg = format!("station file {}: {}", path.display(), e.message);
    c.err_at(c.item_line("stations", index), "stations", msg)
}

/// The station files, loaded; two stations may not share a name.
fn stations(
    c: &Checker,
    base: &Path,
    files: &[String],
    overrides: &Overrides,
) -> Result<Vec<Station>, ConfigError> {
    let mut stations: Vec<Station> = Vec::new();
    for (i, f) in files.iter().enumerate() {
        let path = resolve(base, f);
        let s =
            Station::load_with(&path, overrides).map_err(|e| station_file_error(c, i, &path, e))?;
        // compared as --station NAME and --set station.NAME find a station
        let same = |b: &Station| b.name == s.name || same_station(&b.name, &s.name);
        if let Some(b) = stations.iter().find(|b| same(b)) {
            let msg = match b.name == s.name {
                true => format!("two stations are named '{}'", s.name),
                false => format!(
                    "two stations are named '{}' and '{}', one name once case, punctuation and the Unicode form (a precomposed accent or a combining one) are set aside (as --station NAME reads them)",
                    b.name, s.name
                ),
            };
            return Err(c.err_at(c.item_line("stations", i), "stations", msg));
        }
        stations.push(s);
    }
    Ok(stations)
}

/// The satellites: `satellite:` (one) or `satellites:` (a fleet, each named, no name twice), each
/// with its own transmitter and modem or the mission's shared ones.
fn satellites(
    c: &mut Checker,
    file: &MissionFile,
    base: &Path,
    shared: (&Option<TransmitterConfig>, &Option<ModemConfig>),
) -> Result<Vec<SatelliteConfig>, ConfigError> {
    const KEY: &str = "satellites";
    match (&file.satellite, &file.satellites) {
        (Some(s), None) => {
            let one = satellite(c, "satellite", s, base, shared, true)?;
            Ok(vec![one])
        }
        (None, Some(list)) if !list.is_empty() => {
            let mut out: Vec<SatelliteConfig> = Vec::new();
            for (i, s) in list.iter().enumerate() {
                let Some(name) = s.name.as_deref().map(str::trim).filter(|n| !n.is_empty()) else {
                    return Err(c.item_err(KEY, i, "needs a name"));
                };
                crate::infile::check_name(name)
                    .map_err(|m| c.item_err(KEY, i, format!("name {m}")))?;
                // compared as --satellite NAME finds a satellite
                let twin = out.iter().filter_map(|o| o.name.as_deref());
                if let Some(other) = twin
                    .into_iter()
                    .find(|o| *o == name || same_station(o, name))
                {
                    let msg = match other == name {
                        true => format!("two satellites are named '{name}'"),
                        false => format!(
                            "two satellites are named '{other}' and '{name}', one name once case, punctuation and the Unicode form (a precomposed accent or a combining one) are set aside (as --satellite NAME reads them)"
                        ),
                    };
                    return Err(c.item_err(KEY, i, msg));
                }
                let item = c
                    .item_line(KEY, i)
                    .and_then(|l| super::item_block(c.text, l));
                // A list set by `--set` has no lines in the file: its items' errors name the
                // argument (never a line of the file's own list).
                let no_lines = (String::new(), 0);
                let prefix = format!("{KEY}[{i}] ({name}): ");
                let mut sub = Checker::within(c.path, item.as_ref().unwrap_or(&no_lines), prefix);
                let one =
                    satellite(&mut sub, "", s, base, shared, false).map_err(|e| c.named(KEY, e))?;
                for d in sub.defaults {
                    if !c.defaults.iter().any(|e| e.key == d.key) {
                        c.defaults.push(d);
                    }
                }
                out.push(SatelliteConfig {
                    line: c.item_line(KEY, i),
                    ..one
                });
            }
            Ok(out)
        }
        (None, Some(_)) => Err(c.err(KEY, "lists no satellite")),
        (Some(_), Some(_)) => Err(c.err(
            KEY,
            "give satellite (one) or satellites (a fleet), not both",
        )),
        (None, None) => Err(ConfigError::new(
            c.path,
            None,
            Some("satellite"),
            "missing field `satellite` (or `satellites` for a fleet)",
        )),
    }
}

/// One satellite's block, its keys under `prefix` (`"satellite"`, or `""` in an item checker).
fn satellite(
    c: &mut Checker,
    prefix: &str,
    s: &SatelliteFile,
    base: &Path,
    shared: (&Option<TransmitterConfig>, &Option<ModemConfig>),
    single: bool,
) -> Result<SatelliteConfig, ConfigError> {
    let key = |k: &str| match prefix {
        "" => k.to_string(),
        p => format!("{p}.{k}"),
    };
    let priority_weight = match s.priority {
        Some(v) => limits::PRIORITY
            .check(v)
            .map_err(|e| c.err(&key("priority"), e))?,
        None => c.default(&dflt::PRIORITY),
    };
    let max_downlinks = match s.downlinks {
        Some(v) => {
            let n = limits::DOWNLINKS
                .check(v)
                .map_err(|e| c.err(&key("downlinks"), e))?;
            if n.fract() != 0.0 {
                return Err(c.err(&key("downlinks"), format!("{n} is not a whole number")));
            }
            n as usize
        }
        None => c.default(&dflt::DOWNLINKS) as usize,
    };
    let onboard = s
        .onboard
        .as_ref()
        .map(|o| super::fleet::onboard(c, &key("onboard"), o, base))
        .transpose()?;
    if single
        && (s.transmitter.is_some() && shared.0.is_some()
            || s.modem.is_some() && shared.1.is_some())
    {
        return Err(c.err(
            &key("transmitter"),
            "give the transmitter and modem once: in the satellite block or at the top level",
        ));
    }
    let transmitter = match &s.transmitter {
        Some(t) => Some(transmitter(c, t)?),
        None => shared.0.clone(),
    };
    let modem = match &s.modem {
        Some(m) => Some(modem(c, m)?),
        None => shared.1.clone(),
    };
    Ok(SatelliteConfig {
        name: s.name.as_ref().map(|n| n.trim().to_string()),
        elements_path: resolve(base, &s.elements),
        select: s.select.clone(),
        priority_weight,
        max_downlinks,
        onboard,
        transmitter,
        modem,
        line: c.line(if prefix.is_empty() {
            "elements"
        } else {
            prefix
        }),
    })
}

/// The mission's booking rules (`booking:` items naming a station), applied to the stations.
fn booking_rules(
    c: &Checker,
    rules: &[super::fleet::BookingRuleFile],
    stations: &mut [Station],
) -> Result<(), ConfigError> {
    for (i, r) in rules.iter().enumerate() {
        let Some(st) = stations
            .iter_mut()
            .find(|s| crate::config::station::same_station(&r.station, &s.name))
        else {
            let msg = format!("no station of the mission is named '{}'", r.station);
            return Err(c.item_err("booking", i, msg));
        };
        super::fleet::apply_rule(c, i, r, &mut st.booking)?;
    }
    Ok(())
}

/// The planning window: start, and end or length in days.
fn window(c: &Checker, w: &WindowFile) -> Result<Window, ConfigError> {
    let time = |key: &str, s: &Option<String>| {
        s.as_deref()
            .map(|s| crate::timefmt::parse_utc(s).map_err(|m| c.err(key, m)))
            .transpose()
    };
    let start = time("window.start", &w.start)?;
    let end = time("window.end", &w.end)?;
    let days = c.optional(&limits::WINDOW_DAYS, w.days)?;
    if end.is_some() && days.is_some() {
        return Err(c.err(
            limits::WINDOW_DAYS.key,
            "give window.end or window.days, not both",
        ));
    }
    if let (Some(s), Some(e)) = (start, end) {
        if e <= s {
            return Err(c.err("window.end", "the end is not after the start"));
        }
    }
    Ok((start, end, days))
}

/// The transmitter block.
fn transmitter(c: &mut Checker, t: &TransmitterFile) -> Result<TransmitterConfig, ConfigError> {
    let frequency_mhz = c.range(&limits::FREQUENCY_MHZ, t.frequency_mhz)?;
    let power_dbw = power_dbw(c, t)?;
    let line_loss_db = c.or_default(&limits::LINE_LOSS_DB, t.line_loss_db, &dflt::LINE_LOSS_DB)?;
    let other_loss_db = c.or_default(
        &limits::OTHER_LOSS_DB,
        t.other_loss_db,
        &dflt::OTHER_LOSS_DB,
    )?;
    let a = &t.antenna;
    let pattern = tx_pattern(c, a)?;
    let polarization = match a.polarization {
        Some(p) => p,
        None => c.default(&dflt::TX_POLARIZATION),
    };
    let axial_ratio_db = c.or_default(
        &limits::TX_AXIAL_RATIO_DB,
        a.axial_ratio_db,
        &dflt::TX_AXIAL_RATIO_DB,
    )?;
    Ok(TransmitterConfig {
        frequency_hz: frequency_mhz * 1e6,
        power_dbw,
        line_loss_db,
        other_loss_db,
        pattern,
        polarization,
        axial_ratio_db,
    })
}

/// Transmitter power, given in W or in dBW (one of them), as dBW.
fn power_dbw(c: &Checker, t: &TransmitterFile) -> Result<f64, ConfigError> {
    match (t.power_w, t.power_dbw) {
        (Some(_), Some(_)) => {
            Err(c.err(limits::POWER_DBW.key, "give power_w or power_dbw, not both"))
        }
        (Some(w), None) => {
            if w.is_nan() || w <= 0.0 {
                let msg = format!("{} W: power must be positive", limits::short_number(w));
                return Err(c.err(limits::POWER_W.key, msg));
            }
            Ok(crate::units::watts_to_dbw(c.range(&limits::POWER_W, w)?))
        }
        (None, Some(d)) => c.range(&limits::POWER_DBW, d),
        (None, None) => Err(c.err("transmitter", "needs power_w or power_dbw")),
    }
}

/// The spacecraft antenna pattern, from its `pattern` name and the keys that pattern needs.
fn tx_pattern(c: &Checker, a: &TxAntennaFile) -> Result<TxPattern, ConfigError> {
    let needs = |what: &str| c.err("transmitter.antenna", format!("pattern {what}"));
    match a.pattern {
        PatternKind::Fixed => {
            let g = a.gain_dbi.ok_or_else(|| needs("'fixed' needs gain_dbi"))?;
            Ok(TxPattern::Fixed {
                gain_dbi: c.range(&limits::TX_FIXED_GAIN_DBI, g)?,
            })
        }
        PatternKind::CosN => {
            let g = a
                .gain_dbi
                .ok_or_else(|| needs("'cos_n' needs gain_dbi (boresight)"))?;
            Ok(TxPattern::CosN {
                boresight_gain_dbi: c.range(&limits::TX_COS_N_GAIN_DBI, g)?,
                n: None,
            })
        }
        PatternKind::Table => {
            let points = a
                .table
                .as_ref()
                .ok_or_else(|| needs("'table' needs table: [[off_nadir_deg, gain_dbi], ...]"))?;
            Ok(TxPattern::Table(tx_table(c, points)?))
        }
    }
}

/// The points of a `table` pattern: at least two, angles rising within their range, gains within
/// theirs.
fn tx_table(c: &Checker, points: &[[f64; 2]]) -> Result<Vec<[f64; 2]>, ConfigError> {
    let (angle, gain) = (limits::TX_TABLE_OFF_NADIR_DEG, limits::TX_TABLE_GAIN_DBI);
    if points.len() < 2 {
        return Err(c.err(angle.key, "needs at least two points"));
    }
    for (i, pt) in points.iter().enumerate() {
        let bad = |msg: String| Err(c.item_err(angle.key, i, msg));
        if let Err(e) = angle.check(pt[0]) {
            return bad(format!("off-nadir angle {e}"));
        }
        if let Err(e) = gain.check(pt[1]) {
            return bad(format!("gain {e}"));
        }
        if i > 0 && pt[0] <= points[i - 1][0] {
            return bad("off-nadir angles must rise from one point to the next".into());
        }
    }
    Ok(points.to_vec())
}

/// The modem block.
fn modem(c: &mut Checker, m: &ModemFile) -> Result<ModemConfig, ConfigError> {
    use limits as l;
    let schemes = user_schemes(c, &m.schemes)?;
    Ok(ModemConfig {
        roll_off: c.or_default(&l::ROLL_OFF, m.roll_off, &dflt::ROLL_OFF)?,
        implementation_loss_db: c.or_default(
            &l::IMPLEMENTATION_LOSS_DB,
            m.implementation_loss_db,
            &dflt::IMPLEMENTATION_LOSS_DB,
        )?,
        required_margin_db: c.or_default(
            &l::REQUIRED_MARGIN_DB,
            m.required_margin_db,
            &dflt::REQUIRED_MARGIN_DB,
        )?,
        target_ber: c.or_default(&l::TARGET_BER, m.target_ber, &dflt::TARGET_BER)?,
        max_bandwidth_hz: c.optional(&l::MAX_BANDWIDTH_HZ, m.max_bandwidth_hz)?,
        min_dwell_s: c.or_default(&l::MIN_DWELL_S, m.min_dwell_s, &dflt::MIN_DWELL_S)?,
        ladder: ladder(c, &m.ladder, &schemes)?,
        adaptive: m
            .adaptive
            .as_ref()
            .map(|a| adaptive(c, a, &schemes))
            .transpose()?,
        schemes,
        line: c.line("modem"),
    })
}

/// The mission's own schemes with the built-in catalogue: each validated
/// ([`UserScheme::new`]), none named like a built-in scheme or like another.
fn user_schemes(c: &mut Checker, files: &[SchemeFile]) -> Result<SchemeRegistry, ConfigError> {
    const KEY: &str = "modem.schemes";
    let mut user = Vec::new();
    for (i, f) in files.iter().enumerate() {
        // The error's line: the line of the key within the item (of its last part, else of its
        // first: `overhead: { efficiency: 2 }`), else the item's.
        let at = |key: &str, msg: String| {
            let line = c.item_line(KEY, i).map(|l| {
                let find = |k: &str| c.item_key_line(l, k);
                let last = key.rsplit('.').next().unwrap_or(key);
                let first = key.split('.').next().unwrap_or(key);
                find(last).or_else(|| find(first)).unwrap_or(l)
            });
            let full = format!("{KEY}[{i}].{key}");
            c.err_at(line, &full, format!("{msg} (scheme {})", f.name))
        };
        crate::infile::check_yaml_name(&f.name).map_err(|m| at("name", m))?;
        let spec = user_scheme_spec(f).map_err(|(key, msg)| at(key, msg))?;
        let s = UserScheme::new(&spec).map_err(|e| at(e.key(&spec.threshold), e.to_string()))?;
        // Where the choice moves the threshold (an overhead below 100 % efficiency), the basis
        // taken for an Eb/N0 given without `ebn0_per` is listed among the defaults.
        let eb = !matches!(spec.threshold, UserThreshold::EsN0 { .. });
        if f.ebn0_per.is_none() && eb && s.framing_efficiency < 1.0 {
            c.defaults.push(super::DefaultUsed {
                key: format!("modem.schemes.ebn0_per ({})", s.name),
                value: "code_input_bit".into(),
                source: "a code's threshold is stated per bit entering the code".into(),
            });
        }
        user.push(s);
    }
    SchemeRegistry::new(user).map_err(|e| {
        let i = match &e {
            crate::link::modcod::ModcodError::ClashesWithBuiltin { name }
            | crate::link::modcod::ModcodError::Duplicate { name } => files
                .iter()
                .rposition(|f| f.name.trim().eq_ignore_ascii_case(name))
                .unwrap_or(0),
            _ => 0,
        };
        let line = c
            .item_line(KEY, i)
            .map(|l| c.item_key_line(l, "name").unwrap_or(l));
        c.err_at(line, &format!("{KEY}[{i}].name"), e)
    })
}

/// The library's description of one user scheme: its ranges ([`limits`]) checked, one threshold
/// and one form of overhead. An error is `(key, message)`.
fn user_scheme_spec(f: &SchemeFile) -> Result<UserSchemeSpec, (&'static str, String)> {
    let range =
        |key: &'static str, r: &limits::Range, v: f64| r.check(v).map_err(|e| (key, e.to_string()));
    range(
        "bits_per_symbol",
        &limits::SCHEME_BITS_PER_SYMBOL,
        f.bits_per_symbol as f64,
    )?;
    range("error_rate", &limits::SCHEME_ERROR_RATE, f.error_rate)?;
    let per = match f.ebn0_per {
        Some(EbN0PerFile::InformationBit) => EbN0Basis::InformationBit,
        _ => EbN0Basis::CodeInputBit,
    };
    let threshold = match (f.required_ebn0_db, f.required_esn0_db, &f.table) {
        (Some(db), None, None) => UserThreshold::EbN0 {
            db: range("required_ebn0_db", &limits::SCHEME_EBN0_DB, db)?,
            per,
        },
        (None, Some(db), None) => {
            if f.ebn0_per.is_some() {
                let msg = "ebn0_per applies to an Eb/N0 threshold, not to required_esn0_db";
                return Err(("ebn0_per", msg.into()));
            }
            UserThreshold::EsN0 {
                db: range("required_esn0_db", &limits::SCHEME_ESN0_DB, db)?,
            }
        }
        (None, None, Some(t)) => {
            for (k, p) in t.iter().enumerate() {
                let point = |e: limits::RangeError| ("table", format!("point {}: {e}", k + 1));
                limits::SCHEME_TABLE_ERROR_RATE.check(p[0]).map_err(point)?;
                limits::SCHEME_TABLE_EBN0_DB.check(p[1]).map_err(point)?;
            }
            UserThreshold::Table {
                points: t.iter().map(|p| (p[0], p[1])).collect(),
                per,
            }
        }
        (None, None, None) => {
            let msg = "no threshold: give one of required_ebn0_db, required_esn0_db or table";
            return Err(("required_ebn0_db", msg.into()));
        }
        _ => {
            let msg = "give only one of required_ebn0_db, required_esn0_db and table";
            return Err(("required_ebn0_db", msg.into()));
        }
    };
    Ok(UserSchemeSpec {
        name: f.name.clone(),
        bits_per_symbol: f.bits_per_symbol,
        code_rate: f.code_rate,
        threshold,
        error_rate: f.error_rate,
        measure: match f.error_measure {
            MeasureFile::Ber => ErrorMeasure::Ber,
            MeasureFile::Fer => ErrorMeasure::Fer,
            MeasureFile::Per => ErrorMeasure::Per,
        },
        framing: framing(f.overhead.as_ref())?,
    })
}

/// The overhead block: `frame_bits` with the sync marker, parity and header bits in it (each 0
/// when left out), or `efficiency`; not both.
fn framing(o: Option<&OverheadFile>) -> Result<Framing, (&'static str, String)> {
    let Some(o) = o else { return Ok(Framing::None) };
    match (o.frame_bits, o.efficiency) {
        (Some(frame_bits), None) => Ok(Framing::Frame {
            sync_marker_bits: o.sync_marker_bits.unwrap_or(0),
            parity_bits: o.parity_bits.unwrap_or(0),
            header_bits: o.header_bits.unwrap_or(0),
            frame_bits,
        }),
        (None, Some(e)) => {
            if o.sync_marker_bits.or(o.parity_bits).or(o.header_bits).is_some() {
                let msg = "give the frame's bits (frame_bits with sync_marker_bits, parity_bits, header_bits) or efficiency, not both";
                return Err(("overhead", msg.into()));
            }
            Ok(Framing::Efficiency(e))
        }
        (Some(_), Some(_)) => Err((
            "overhead",
            "give frame_bits (with its sync marker, parity and header bits) or efficiency, not both".into(),
        )),
        (None, None) => Err((
            "overhead",
            "needs frame_bits (with sync_marker_bits, parity_bits, header_bits) or efficiency".into(),
        )),
    }
}

/// The fixed-rate ladder: each item a rate (`rate_bps`) or a scheme at several symbol rates
/// (`symbol_rates_baud`), every scheme known to `schemes`, each rate within its range, no step
/// given twice.
fn ladder(
    c: &Checker,
    steps: &[LadderStepFile],
    schemes: &SchemeRegistry,
) -> Result<Vec<LadderStep>, ConfigError> {
    const KEY: &str = "modem.ladder";
    let mut ladder: Vec<LadderStep> = Vec::new();
    // The file's item of each step, for messages.
    let mut items: Vec<usize> = Vec::new();
    for (i, st) in steps.iter().enumerate() {
        let bad = |msg: String| c.item_err(KEY, i, msg);
        let index = schemes.index(&st.scheme).map_err(|e| bad(e.to_string()))?;
        let name = schemes
            .name(index)
            .map(|n| n.to_string())
            .unwrap_or_default();
        let rates: Vec<(f64, Option<f64>)> = match (st.rate_bps, &st.symbol_rates_baud) {
            (Some(r), None) => vec![(r, None)],
            (None, Some(bauds)) if !bauds.is_empty() => {
                let eta = schemes.spectral_efficiency(index);
                let mut v = Vec::new();
                for b in bauds {
                    let b = limits::LADDER_SYMBOL_RATE_BAUD
                        .check(*b)
                        .map_err(|e| bad(format!("symbol_rates_baud {e}")))?;
                    // Rb = Rs x eta (information bits per symbol)
                    v.push((b * eta, Some(b)));
                }
                v
            }
            (None, Some(_)) => return Err(bad("symbol_rates_baud lists no rate".into())),
            (Some(_), Some(_)) => {
                return Err(bad("give rate_bps or symbol_rates_baud, not both".into()))
            }
            (None, None) => return Err(bad("needs rate_bps or symbol_rates_baud".into())),
        };
        for (rate_bps, symbol_rate_baud) in rates {
            if let Err(e) = limits::RATE_BPS.check(rate_bps) {
                return Err(bad(format!("rate_bps {e}")));
            }
            let same = |o: &LadderStep| o.rate_bps == rate_bps && o.scheme == name;
            if let Some(j) = ladder.iter().position(same) {
                let rate = limits::short_number(rate_bps);
                let msg = if items[j] == i {
                    format!("symbol_rates_baud gives {rate} bit/s with {name} twice")
                } else {
                    format!("{rate} bit/s with {name} is already {KEY}[{}]", items[j])
                };
                return Err(bad(msg));
            }
            ladder.push(LadderStep {
                rate_bps,
                scheme: name.clone(),
                symbol_rate_baud,
                line: c.item_line(KEY, i),
            });
            items.push(i);
        }
    }
    Ok(ladder)
}

/// The adaptive (variable coding and modulation) block: at least one scheme, none twice.
fn adaptive(
    c: &mut Checker,
    a: &AdaptiveFile,
    registry: &SchemeRegistry,
) -> Result<AdaptiveConfig, ConfigError> {
    const KEY: &str = "modem.adaptive.schemes";
    let symbol_rate_baud = c.range(&limits::SYMBOL_RATE_BAUD, a.symbol_rate_baud)?;
    if a.schemes.is_empty() {
        return Err(c.err(KEY, "needs at least one scheme"));
    }
    let mut schemes: Vec<(String, Option<usize>)> = Vec::new();
    for (i, s) in a.schemes.iter().enumerate() {
        registry.index(s).map_err(|e| c.item_err(KEY, i, e))?;
        if let Some(j) = schemes.iter().position(|(o, _)| o == s) {
            let msg = format!("{s} is already {KEY}[{j}]");
            return Err(c.item_err(KEY, i, msg));
        }
        schemes.push((s.clone(), c.item_line(KEY, i)));
    }
    let hysteresis_db = c.or_default(
        &limits::HYSTERESIS_DB,
        a.hysteresis_db,
        &dflt::HYSTERESIS_DB,
    )?;
    let relock_s = c.or_default(&limits::RELOCK_S, a.relock_s, &dflt::RELOCK_S)?;
    Ok(AdaptiveConfig {
        symbol_rate_baud,
        schemes,
        hysteresis_db,
        relock_s,
        with_ladder: a.with_ladder.unwrap_or(false),
    })
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

    const HEAD: &str = "name: t\nsatellite:\n  elements: sat.tle\n";

    fn mission(text: &str) -> Result<Mission, ConfigError> {
        Mission::from_yaml(Path::new("m.yaml"), &format!("{HEAD}{text}"))
    }

    /// A transmitter block (lines 4..=9) with the given power line and antenna lines.
    fn tx(power: &str, antenna: &str) -> String {
        format!("transmitter:\n  frequency_mhz: 8200\n  {power}\n  antenna:\n{antenna}")
    }

    const FIXED: &str = "    pattern: fixed\n    gain_dbi: 3\n";

    #[test]
    fn huge_power_w_is_rejected_with_line_and_short_number() {
        let e = mission(&tx("power_w: 1e30", FIXED)).unwrap_err();
        assert_eq!(e.line, Some(6));
        assert_eq!(e.key.as_deref(), Some("transmitter.power_w"));
        assert!(
            e.to_string()
                .starts_with("m.yaml:6: transmitter.power_w: 1.000000e30 is out of range"),
            "{e}"
        );
        assert!(e.message.len() < 100, "{e}");
        // 10 kW is the top of the range in either unit.
        let m = mission(&tx("power_w: 1e4", FIXED)).unwrap();
        assert!((m.transmitter.unwrap().power_dbw - 40.0).abs() < 1e-12);
        assert!(mission(&tx("power_dbw: 40.5", FIXED)).is_err());
    }

    #[test]
    fn power_ranges_agree_in_both_units() {
        // P_dBW = 10 log10(P_W): the two ranges are one range.
        assert!((10.0 * limits::POWER_W.min.log10() - limits::POWER_DBW.min).abs() < 1e-12);
        assert!((10.0 * limits::POWER_W.max.log10() - limits::POWER_DBW.max).abs() < 1e-12);
    }

    #[test]
    fn table_gain_out_of_range_names_its_point() {
        let ant = "    pattern: table\n    table:\n      - [0, 3]\n      - [40, 5500]\n";
        let e = mission(&tx("power_w: 2", ant)).unwrap_err();
        assert_eq!(e.line, Some(11));
        assert!(
            e.message
                .contains("[1]: gain 5500 is out of range (-60 to 60 dBi)"),
            "{e}"
        );
        let ant = "    pattern: table\n    table:\n      - [10, 3]\n      - [5, 4]\n";
        let e = mission(&tx("power_w: 2", ant)).unwrap_err();
        assert_eq!(e.line, Some(11));
        assert!(e.message.contains("rise"), "{e}");
    }

    #[test]
    fn wrong_pattern_name_is_serde_error_with_line() {
        let e = mission(&tx("power_w: 2", "    gain_dbi: 3\n    pattern: cosine\n")).unwrap_err();
        assert_eq!(e.line, Some(9));
        assert!(e.message.contains("unknown variant `cosine`"), "{e}");
        assert!(e.message.contains("`cos_n`"), "{e}");
    }

    #[test]
    fn cos_n_pattern_is_the_link_model_pattern() {
        let m = mission(&tx("power_w: 2", "    pattern: cos_n\n    gain_dbi: 6\n")).unwrap();
        let t = m.transmitter.unwrap();
        assert_eq!(
            t.pattern,
            TxPattern::CosN {
                boresight_gain_dbi: 6.0,
                n: None
            }
        );
        // No polarization given: rhcp, recorded as a default with its name.
        assert_eq!(t.polarization, PolarizationSense::Rhcp);
        let d = m
            .defaults
            .iter()
            .find(|d| d.key == "transmitter.antenna.polarization");
        assert_eq!(d.map(|d| d.value.as_str()), Some("rhcp"));
    }

    #[test]
    fn polarization_aliases_and_wrong_name() {
        let ant = format!("{FIXED}    polarization: Left\n");
        let t = mission(&tx("power_w: 2", &ant))
            .unwrap()
            .transmitter
            .unwrap();
        assert_eq!(t.polarization, PolarizationSense::Lhcp);
        let ant = format!("{FIXED}    polarization: circular\n");
        let e = mission(&tx("power_w: 2", &ant)).unwrap_err();
        assert_eq!(e.line, Some(10));
        assert!(e.message.contains("unknown variant `circular`"), "{e}");
    }

    #[test]
    fn tiny_rate_is_rejected_with_its_line() {
        let t = "modem:\n  ladder:\n    - { rate_bps: 1e6, scheme: qpsk }\n    - { rate_bps: 1e-300, scheme: qpsk }\n";
        let e = mission(t).unwrap_err();
        assert_eq!(e.line, Some(7));
        assert!(
            e.message
                .contains("modem.ladder[1]: rate_bps 1.000000e-300 is out of range"),
            "{e}"
        );
    }

    #[test]
    fn duplicate_ladder_step_is_rejected() {
        let t = "modem:\n  ladder:\n    - { rate_bps: 1e6, scheme: qpsk }\n    - { rate_bps: 1e6, scheme: bpsk }\n    - { rate_bps: 1.0e6, scheme: qpsk }\n";
        let e = mission(t).unwrap_err();
        assert_eq!(e.line, Some(8));
        assert!(
            e.message
                .contains("modem.ladder[2]: 1000000 bit/s with qpsk is already modem.ladder[0]"),
            "{e}"
        );
    }

    /// One item giving the same symbol rate twice names itself once, not "step 2 ... is already
    /// step 2".
    #[test]
    fn duplicate_symbol_rate_within_one_item_is_rejected() {
        let t = "modem:\n  ladder:\n    - { rate_bps: 1e6, scheme: qpsk }\n    - { symbol_rates_baud: [2e6, 2e6], scheme: qpsk }\n";
        let e = mission(t).unwrap_err();
        assert_eq!(e.line, Some(7), "{e}");
        assert!(
            e.message
                .contains("modem.ladder[1]: symbol_rates_baud gives 4000000 bit/s with qpsk twice"),
            "{e}"
        );
        assert!(!e.message.contains("already"), "{e}");
    }

    /// A scheme listed twice in the adaptive set is refused at its line, as a duplicate ladder
    /// step is (before: accepted silently).
    #[test]
    fn duplicate_adaptive_scheme_is_rejected() {
        let t = "modem:\n  ladder:\n    - { rate_bps: 1e6, scheme: qpsk }\n  adaptive:\n    symbol_rate_baud: 1e6\n    schemes:\n      - qpsk\n      - bpsk\n      - qpsk\n";
        let e = mission(t).unwrap_err();
        assert_eq!(e.line, Some(12), "{e}");
        assert!(
            e.message
                .contains("modem.adaptive.schemes[2]: qpsk is already modem.adaptive.schemes[0]"),
            "{e}"
        );
    }

    #[test]
    fn modem_line_and_reported_defaults() {
        let m = mission(
            "planning:\n  step_s: 2\nmodem:\n  ladder:\n    - { rate_bps: 1e6, scheme: qpsk }\n",
        )
        .unwrap();
        let modem = m.modem.unwrap();
        assert_eq!(modem.line, Some(6));
        assert_eq!(modem.ladder[0].line, Some(8));
        assert_eq!((modem.target_ber, modem.min_dwell_s), (1e-6, 10.0));
        let keys: Vec<&str> = m.defaults.iter().map(|d| d.key.as_str()).collect();
        assert_eq!(
            keys,
            [
                "modem.roll_off",
                "modem.implementation_loss_db",
                "modem.required_margin_db",
                "modem.target_ber",
                "modem.min_dwell_s"
            ]
        );
    }

    #[test]
    fn duplicate_yaml_key_is_reported_at_the_duplicate() {
        let e = mission("planning:\n  step_s: 2\n  mask_deg: 5\n  step_s: 3\n").unwrap_err();
        assert!(e.message.contains("duplicate field `step_s`"), "{e}");
        assert_eq!(e.line, Some(7));
        let e = mission("name: u\n").unwrap_err();
        assert!(e.message.contains("duplicate field `name`"), "{e}");
        assert_eq!(e.line, Some(4));
    }
}
