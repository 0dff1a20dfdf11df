//! The typed results of planning: per pass, per mode, per day, per station and over the window.
//! Unrounded; [`crate::report`] rounds when it serializes.

use super::inputs::SatelliteError;
use super::mask::MaskAccumulator;
use super::network::Segment;
use super::prepare::{PrepareError, StationModel};
use super::rate::OptionId;
use super::series::{PassWarnings, SeriesError, Step};
use super::window::{Window, WindowError};
use crate::geometry::Pass;
use crate::orbit::PropagationError;
use chrono::{DateTime, NaiveDate, Utc};

/// One crossing of a rate's threshold: when, and where the satellite was.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Crossing {
    pub time: DateTime<Utc>,
    pub elevation_deg: f64,
    pub azimuth_deg: f64,
}

/// Where the chosen rate starts and stops counting in a pass (its first and last counted run).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Closing {
    pub from: Crossing,
    pub until: Crossing,
}

/// Results of one mode (fixed-rate choice, adaptive, Shannon) for one weather case of a pass.
#[derive(Debug, Clone, PartialEq)]
pub struct ModeResult {
    /// Chosen ladder option, or `None` when no rate closes for the dwell time.
    pub option: Option<OptionId>,
    /// Where the chosen rate closes; `None` when no rate closes.
    pub closing: Option<Closing>,
    /// Lowest margin over the counted seconds of the chosen rate, dB.
    pub min_margin_db: Option<f64>,
    /// Margin at the pass's highest step, dB: of the chosen rate, or of the lowest-threshold
    /// ladder rate when none closes (then usually negative). `None` for a pass of no step.
    pub tca_margin_db: Option<f64>,
    /// Highest Eb/N0 of the pass at the chosen rate (at the lowest-threshold ladder rate if none closes), dB.
    pub max_ebn0_db: f64,
    pub closed_s: f64,
    pub volume_bits: f64,
    pub adaptive_volume_bits: f64,
    pub adaptive_switches: usize,
    pub shannon_volume_bits: f64,
}

/// The plan of one pass.
#[derive(Debug, Clone)]
pub struct PassPlan {
    /// 1-based number in AOS order over all stations.
    pub number: usize,
    pub station_index: usize,
    pub pass: Pass,
    pub clear: ModeResult,
    pub rain: Option<ModeResult>,
    /// Fixed-rate closed intervals (clear sky), seconds from the window start, for the network total.
    pub segments: Vec<Segment>,
    pub warnings: PassWarnings,
    pub steps: usize,
    /// The Sun and the Moon near the beam during the pass (clear sky).
    pub bodies: BodyExposure,
    /// The worst margin of the pfd at the station against the band's Article 21 limit over the
    /// pass, at the chosen rate's occupied bandwidth, dB (`None`: no row for the band).
    pub pfd_margin_db: Option<f64>,
    /// What the station's mount could not follow (`None`: the station gives no mount).
    pub mount: Option<MountTracking>,
}

/// The mount over one pass.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct MountTracking {
    /// Seconds the mount cannot follow (steps where it points further from the satellite than
    /// the tolerance, each standing for the time to the next step): counted as lost.
    pub lost_s: f64,
    /// Seconds in which an axis rate or acceleration demanded is beyond its limit (the keyhole
    /// itself; the lost time adds the time to catch up).
    pub rate_exceeded_s: f64,
    /// The largest rates the two axes need over the pass, deg/s (absolute values).
    pub peak_primary_rate_deg_s: f64,
    pub peak_secondary_rate_deg_s: f64,
}

impl MountTracking {
    /// Gather the mount's figures over a pass's steps.
    pub fn over(steps: &[Step]) -> MountTracking {
        steps
            .iter()
            .fold(MountTracking::default(), |m, s| MountTracking {
                lost_s: m.lost_s + if s.untracked { s.weight_s } else { 0.0 },
                rate_exceeded_s: m.rate_exceeded_s + if s.rate_exceeded { s.weight_s } else { 0.0 },
                peak_primary_rate_deg_s: m.peak_primary_rate_deg_s.max(s.primary_rate_deg_s.abs()),
                peak_secondary_rate_deg_s: m
                    .peak_secondary_rate_deg_s
                    .max(s.secondary_rate_deg_s.abs()),
            })
    }
}

/// How close the Sun and the Moon came to the beam in one pass, and what they cost (clear sky).
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct BodyExposure {
    /// Smallest angle between the pointing and the Sun's centre, deg (`None`: a pass of no step).
    pub min_sun_separation_deg: Option<f64>,
    /// Largest antenna temperature added by the Sun, K.
    pub max_sun_noise_k: f64,
    /// Seconds in which the Sun raises the system noise temperature by more than 1 dB.
    pub sun_degraded_s: f64,
    /// Smallest angle between the pointing and the Moon's centre, deg.
    pub min_moon_separation_deg: Option<f64>,
    /// Largest antenna temperature added by the Moon, K.
    pub max_moon_noise_k: f64,
}

/// The rise of the system noise temperature (dB) above which the Sun is said to degrade a step.
pub const SUN_DEGRADED_RISE_DB: f64 = 1.0;

/// How much the Sun raises a step's system noise temperature: 10 log10(Tsys / (Tsys - T_sun)), dB.
pub fn sun_rise_db(s: &Step) -> f64 {
    10.0 * (s.system_temperature_k / (s.system_temperature_k - s.sun_noise_k)).log10()
}

/// Whether the Sun raises the step's system noise temperature by more than
/// [`SUN_DEGRADED_RISE_DB`]: `sun_rise_db(s) > 1`, for every input. For Tsys > 0 a rise of 1 dB
/// needs T_sun = (1 - 10^-0.1) Tsys = 0.206 Tsys; at 0.2 Tsys or less the rise is at most
/// 10 log10(1 / 0.8) = 0.97 dB, so there the logarithm is not taken (most steps: the Sun set or
/// far from the beam). Any other Tsys (0 or less, NaN) takes the logarithm.
#[inline]
pub fn sun_degrades(s: &Step) -> bool {
    let tsys_k = s.system_temperature_k;
    let at_most_0_97_db = tsys_k > 0.0 && s.sun_noise_k <= 0.2 * tsys_k;
    !at_most_0_97_db && sun_rise_db(s) > SUN_DEGRADED_RISE_DB
}

impl BodyExposure {
    /// Gather the bodies' figures over a pass's steps.
    pub fn over(steps: &[Step]) -> BodyExposure {
        let min = |a: Option<f64>, b: Option<f64>| match (a, b) {
            (Some(x), Some(y)) => Some(x.min(y)),
            (x, None) | (None, x) => x,
        };
        steps
            .iter()
            .fold(BodyExposure::default(), |e, s| BodyExposure {
                min_sun_separation_deg: min(e.min_sun_separation_deg, s.sun_separation_deg),
                max_sun_noise_k: e.max_sun_noise_k.max(s.sun_noise_k),
                sun_degraded_s: e.sun_degraded_s + if sun_degrades(s) { s.weight_s } else { 0.0 },
                min_moon_separation_deg: min(e.min_moon_separation_deg, s.moon_separation_deg),
                max_moon_noise_k: e.max_moon_noise_k.max(s.moon_noise_k),
            })
    }
}

/// Everything a sink gets for one pass: the plan and its time series.
pub struct PassSeries<'a> {
    pub plan: &'a PassPlan,
    pub steps: &'a [Step],
    /// Adaptive option index per step (clear sky), into `RateSet::adaptive`.
    pub adaptive: &'a [Option<u16>],
    /// Counted runs (step indices, inclusive) of the chosen fixed rate; empty when none closes.
    pub chosen_runs: &'a [(usize, usize)],
    /// How many passes the plan numbers (the pass numbers run from 1 to it): the pass's file
    /// names pad its number to this count's width ([`crate::report::files::pass_file_stem`]).
    pub pass_count: usize,
}

impl PassSeries<'_> {
    /// Whether the chosen fixed rate counts step `i`.
    pub fn counted(&self, i: usize) -> bool {
        self.chosen_runs.iter().any(|&(a, b)| a <= i && i <= b)
    }
}

/// Error of planning.
#[derive(Debug, thiserror::Error)]
pub enum PlanError {
    #[error(transparent)]
    Prepare(#[from] PrepareError),
    #[error(transparent)]
    Satellite(#[from] SatelliteError),
    #[error(transparent)]
    Window(#[from] WindowError),
    #[error(transparent)]
    StaleElements(#[from] super::inputs::StaleElements),
    /// A request value out of its range or against another rule.
    #[error("{key}: {message}")]
    Request { key: &'static str, message: String },
    /// A request value out of its range in [`crate::config::limits`].
    #[error("{key}: {source}")]
    Range {
        key: &'static str,
        #[source]
        source: crate::config::limits::RangeError,
    },
    #[error("{mission}: the mission lists no stations (stations: [station files])")]
    NoStations { mission: String },
    #[error("pass {number} at {station}: {source}")]
    Pass {
        number: usize,
        station: String,
        #[source]
        source: SeriesError,
    },
    #[error("satellite: {0}")]
    Propagator(#[source] PropagationError),
    /// The contact plan's inputs were refused by the scheduler.
    #[error("contact plan: {0}")]
    Schedule(#[source] crate::schedule::ScheduleError),
    /// A pass sink failed (writing a file, drawing a chart).
    #[error("{0}")]
    Sink(#[source] Box<dyn std::error::Error + Send + Sync>),
}

/// The network total: each second counted once, at the station with the highest fixed rate.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct NetworkTotal {
    pub volume_bits: f64,
    pub contact_s: f64,
}

/// The plan of a window: typed and unrounded (rounding belongs to [`crate::report`]).
#[derive(Debug, Clone)]
pub struct Plan {
    pub passes: Vec<PassPlan>,
    /// Per station: the pass search stopped early (propagation error), with the error.
    pub stopped: Vec<Option<PropagationError>>,
    /// Where the satellite's propagation first failed in the window, if it did: no pass from
    /// then on is planned.
    pub propagation_stop: Option<super::inputs::PropagationStop>,
    pub propagations_search: u64,
    /// Mask accumulators per station (merged over its passes above the configured mask).
    pub station_masks: Vec<MaskAccumulator>,
    /// Mask accumulators per station over the passes searched from 0 deg, when the trade-off was asked.
    pub tradeoff_masks: Option<Vec<MaskAccumulator>>,
    pub network: NetworkTotal,
    pub totals: Totals,
    pub days: Vec<DayTotals>,
    pub usable_masks: Vec<UsableMask>,
    /// Every warning of the plan: models out of range, element age, stopped searches, thresholds.
    pub warnings: Vec<String>,
    /// What the plan says that is not a problem, each of a kind (the element set taken from a
    /// history, a station without passes, the Sun, the adaptive mode, values recalled from
    /// memory), so that a command prints those that concern what it shows ([`Plan::note_lines`]).
    pub notes: Vec<Note>,
    /// The availability (rain) case was planned.
    pub rain_planned: bool,
    /// The adaptive mode can use every ladder rate with no hysteresis and no re-lock time, so
    /// its volume is at least the fixed rate's on every pass ([`super::prepare::RateSet::adaptive_dominates`]).
    pub adaptive_dominates: bool,
    pub window: Window,
}

/// Totals over the window.
#[derive(Debug, Clone, PartialEq)]
pub struct Totals {
    pub passes: usize,
    pub passes_closing: usize,
    pub contact_s: f64,
    pub closed_s: f64,
    /// Sum over passes of the fixed rate chosen per pass (a satellite over two stations at once counts twice).
    pub volume_bits: f64,
    pub adaptive_volume_bits: f64,
    pub shannon_volume_bits: f64,
    pub network: NetworkTotal,
    /// The best single ladder rate used for every pass of the window (a modem set once), and its volume.
    pub single_rate: Option<(OptionId, f64)>,
    /// The availability (rain) case, when planned.
    pub rain: Option<RainTotals>,
    pub days: f64,
}

/// Totals of the availability (rain) case.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RainTotals {
    pub passes_closing: usize,
    pub volume_bits: f64,
    pub adaptive_volume_bits: f64,
    pub shannon_volume_bits: f64,
}

impl Totals {
    /// Fixed-rate volume over Shannon's bound (0 when the bound is 0).
    pub fn fixed_efficiency(&self) -> f64 {
        ratio(self.volume_bits, self.shannon_volume_bits)
    }
    pub fn adaptive_efficiency(&self) -> f64 {
        ratio(self.adaptive_volume_bits, self.shannon_volume_bits)
    }
}

/// `a / b`, or 0 when `b` is not positive.
pub fn ratio(a: f64, b: f64) -> f64 {
    if b > 0.0 {
        a / b
    } else {
        0.0
    }
}

/// Totals of one UTC day (passes counted on the day of their AOS).
#[derive(Debug, Clone, PartialEq)]
pub struct DayTotals {
    pub date: NaiveDate,
    pub passes: usize,
    pub contact_s: f64,
    pub volume_bits: f64,
    pub adaptive_volume_bits: f64,
    pub shannon_volume_bits: f64,
    pub rain_volume_bits: Option<f64>,
}

/// Usable elevation mask of one ladder rate at one station.
#[derive(Debug, Clone, PartialEq)]
pub struct UsableMask {
    pub station_index: usize,
    pub option: OptionId,
    /// Lowest elevation at which this rate closes on every pass whenever the satellite is above it;
    /// `None` if it never closes.
    pub usable_mask_deg: Option<f64>,
    /// Lowest elevation above which it closes on the configured share of passes
    /// (`planning.mask_share_percent`); `None` if it never closes.
    pub robust_mask_deg: Option<f64>,
    /// The passes on which it fails above the robust mask: where, and by how much.
    pub failures: Vec<MaskFailure>,
    pub station_mask_deg: f64,
    pub passes: usize,
    pub passes_closing: usize,
}

/// A pass on which a rate does not count above its robust mask: the highest such step.
#[derive(Debug, Clone, PartialEq)]
pub struct MaskFailure {
    pub pass_number: usize,
    pub station_index: usize,
    pub time: DateTime<Utc>,
    pub step: super::mask::OpenStep,
}

/// What a trade-off or a total covers: one station, or every station together.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Scope {
    Station(usize),
    /// All stations together: the sum over stations, a second seen by two stations counted at
    /// each (unlike [`NetworkTotal`], which counts each second once).
    AllStations,
}

impl Scope {
    /// The name in outputs: the station's name, or "all stations".
    pub fn label(&self, stations: &[StationModel]) -> String {
        match self {
            Scope::Station(i) => stations[*i].station.name.clone(),
            Scope::AllStations => NETWORK_LABEL.to_string(),
        }
    }
}

/// The one spelling of the all-stations scope in outputs.
pub const NETWORK_LABEL: &str = "all stations";

/// The mask trade-off of one scope: for each mask elevation, the contact time and, per ladder
/// option, the fixed-rate volume per day above it.
#[derive(Debug, Clone, PartialEq)]
pub struct TradeoffSeries {
    pub scope: Scope,
    /// Mask elevations, whole degrees, rising.
    pub masks_deg: Vec<usize>,
    /// Contact time per day above each mask, s.
    pub contact_s_per_day: Vec<f64>,
    /// Per ladder option (in ladder order), the volume per day above each mask, bits.
    pub volume_bits_per_day: Vec<OptionSeries>,
}

/// One ladder option's values along the masks of a [`TradeoffSeries`].
#[derive(Debug, Clone, PartialEq)]
pub struct OptionSeries {
    pub option: OptionId,
    pub values: Vec<f64>,
}

#[cfg(test)]
mod tests {
    use super::{sun_degrades, sun_rise_db, SUN_DEGRADED_RISE_DB};
    use crate::plan::series::Step;

    /// The shortcut gives the logarithm's answer: over Sun shares of 0 to 0.99 of Tsys, finely
    /// around the 1 dB share (1 - 10^-0.1 = 0.2057) and the 0.2 cut, and for the inputs no plan
    /// makes (T_sun >= Tsys, negative values, Tsys = 0, infinities, NaN).
    #[test]
    fn sun_degrades_is_the_one_db_rule() {
        let odd = [-1e4, -10.0, -3.0, -0.0, 0.0, 3.0, 10.0, 1e4, f64::INFINITY];
        for tsys_k in odd.iter().chain([&f64::NEG_INFINITY, &f64::NAN]) {
            for sun_k in odd.iter().chain([&-1e-3, &f64::NAN]) {
                let s = Step {
                    system_temperature_k: *tsys_k,
                    sun_noise_k: *sun_k,
                    ..Step::default()
                };
                let by_log = sun_rise_db(&s) > SUN_DEGRADED_RISE_DB;
                assert_eq!(sun_degrades(&s), by_log, "Tsys {tsys_k}, Tsun {sun_k}");
            }
        }
        let edge = 1.0 - 10f64.powf(-0.1);
        let shares = (0..=990)
            .map(|k| k as f64 / 1000.0)
            .chain((-2000..=2000).map(|k| edge + k as f64 * 1e-6))
            .chain((-2000..=2000).map(|k| 0.2 + k as f64 * 1e-6));
        let mut degraded = 0;
        for share in shares {
            for tsys_k in [50.0, 183.7, 1.0e4] {
                let s = Step {
                    system_temperature_k: tsys_k,
                    sun_noise_k: share * tsys_k,
                    ..Step::default()
                };
                let by_log = sun_rise_db(&s) > SUN_DEGRADED_RISE_DB;
                assert_eq!(sun_degrades(&s), by_log, "share {share}, Tsys {tsys_k}");
                degraded += usize::from(by_log);
            }
        }
        assert!(degraded > 1000, "{degraded}");
        let nan = Step {
            system_temperature_k: f64::NAN,
            sun_noise_k: 10.0,
            ..Step::default()
        };
        assert!(!sun_degrades(&nan));
    }
}

/// What a plan's note is about.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum NoteKind {
    /// The element set chosen from a history.
    ElementSet,
    /// A station (or the whole window) without passes, or a search stopped.
    NoPass,
    /// The Sun raising the system noise temperature in some passes.
    Sun,
    /// The adaptive mode delivering nothing where a fixed rate closes.
    Adaptive,
    /// Built-in thresholds recalled from memory: the rates rest on them.
    RecalledThreshold,
    /// A pfd limit row recalled from memory: the pfd margins rest on it.
    RecalledPfd,
}

/// One note of a plan.
#[derive(Debug, Clone, PartialEq)]
pub struct Note {
    pub kind: NoteKind,
    pub text: String,
}

impl Note {
    pub fn new(kind: NoteKind, text: String) -> Note {
        Note { kind, text }
    }
}

impl Plan {
    /// The warnings, then the notes of `kinds`: what an output file carries in its `warnings`
    /// (the values recalled from memory it rests on, so that they stay flagged).
    pub fn warnings_with(&self, kinds: &[NoteKind]) -> Vec<String> {
        (self.warnings.iter().cloned())
            .chain(self.note_lines(|k| kinds.contains(&k)))
            .collect()
    }

    /// The texts of the notes whose kind `keep` accepts, in order.
    pub fn note_lines(&self, keep: impl Fn(NoteKind) -> bool) -> Vec<String> {
        (self.notes.iter())
            .filter(|n| keep(n.kind))
            .map(|n| n.text.clone())
            .collect()
    }
}
