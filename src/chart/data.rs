//! Input types of the chart module: plain data (chrono and std types only), filled in by the
//! planner or by tests. The chart code never sees planner internals.

use chrono::{DateTime, NaiveDate, Utc};

/// Output file format of a chart.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum ChartFormat {
    /// 8-bit RGB PNG.
    Png,
    /// SVG 1.1 text (fonts are referenced by family name, `sans-serif`).
    Svg,
}

impl ChartFormat {
    /// File name extension without the dot: `png` or `svg`.
    pub fn extension(self) -> &'static str {
        match self {
            ChartFormat::Png => "png",
            ChartFormat::Svg => "svg",
        }
    }
}

/// One instant of a pass, as the pass chart needs it.
#[derive(Debug, Clone, PartialEq)]
pub struct PassChartSample {
    /// Seconds since AOS.
    pub t_s: f64,
    pub elevation_deg: f64,
    pub azimuth_deg: f64,
    pub range_km: f64,
    /// Eb/N0 at the chosen rate (or at the lowest ladder rate when no rate closes), dB.
    pub ebn0_db: f64,
    /// Margin at the chosen rate, dB.
    pub margin_db: f64,
    /// Whether the chosen rate closes (margin at least the required margin) at this instant.
    pub closed: bool,
    /// Whether the antenna follows the satellite here (false where the mount's rate limits lose
    /// it, or in a followed stretch between two such too short for the modem to lock: nothing
    /// counts there).
    pub tracked: bool,
    /// Highest ladder rate that closes at this instant (adaptive operation), if any.
    pub adaptive_rate_bps: Option<f64>,
    /// System noise temperature (the sum of the terms below), K.
    pub system_temperature_k: f64,
    /// Its terms, K: sky and ground through the antenna's pattern, man-made, the Sun's and the
    /// Moon's disks, receiver.
    pub sky_noise_k: f64,
    pub ground_noise_k: f64,
    pub man_made_noise_k: f64,
    pub sun_noise_k: f64,
    pub moon_noise_k: f64,
    pub receiver_noise_k: f64,
    pub atmospheric_loss_db: f64,
    /// The station's mask at the satellite's azimuth (the larger of the minimum elevation and
    /// the horizon mask), deg.
    pub mask_elevation_deg: f64,
    /// Availability (rain) case at the same rate as `ebn0_db`, when planned: Eb/N0 (dB), system
    /// noise temperature (K) and atmospheric loss (dB).
    pub rain: Option<PassChartRain>,
}

/// The availability (rain) case at one instant of a pass.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PassChartRain {
    pub ebn0_db: f64,
    pub system_temperature_k: f64,
    pub atmospheric_loss_db: f64,
}

/// Everything the pass chart shows about one pass.
#[derive(Debug, Clone, PartialEq)]
pub struct PassChartData {
    pub satellite: String,
    pub station: String,
    pub pass_number: usize,
    /// The pass's identifier, which does not change with the window
    /// ([`crate::report::pass_id`], e.g. `sierra-baja-20261202T0854Z`); empty when none.
    pub pass_id: String,
    /// The window cuts the pass: `aos` is then the window's start, `los` its end, and `tca` the
    /// highest point within the window.
    pub starts_before_window: bool,
    pub ends_after_window: bool,
    pub aos: DateTime<Utc>,
    pub tca: DateTime<Utc>,
    pub los: DateTime<Utc>,
    pub max_elevation_deg: f64,
    /// Chosen fixed rate; `None` when no ladder rate closes.
    pub rate_bps: Option<f64>,
    /// Modulation and coding of the chosen rate, e.g. `ccsds-rs-cc`.
    pub scheme: Option<String>,
    /// Volume at the fixed rate, bits.
    pub volume_bits: f64,
    /// Volume with adaptive rate, bits.
    pub adaptive_volume_bits: f64,
    /// Eb/N0 where the margin is 0 (required Eb/N0 plus implementation loss) for the chosen rate, dB.
    pub required_ebn0_db: Option<f64>,
    /// Margin the operator requires above `required_ebn0_db`, dB.
    pub required_margin_db: f64,
    /// First instant the chosen rate closes.
    pub closes_from: Option<DateTime<Utc>>,
    /// Last instant the chosen rate closes.
    pub closes_until: Option<DateTime<Utc>>,
    /// The availability case, when planned: rain exceeded this percentage of an average year.
    pub rain_exceedance_percent: Option<f64>,
    /// The rain case's fixed rate (`None`: no rate closes in rain) and its volume, bits.
    pub rain_rate_bps: Option<f64>,
    pub rain_volume_bits: Option<f64>,
    pub samples: Vec<PassChartSample>,
    /// Warnings printed in the footer under the caution (e.g. stale elements).
    pub warnings: Vec<String>,
}

/// One point of a sky track.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SkyPoint {
    pub azimuth_deg: f64,
    pub elevation_deg: f64,
    /// Margin at the chosen rate, dB; `None` when no budget was computed here.
    pub margin_db: Option<f64>,
    /// Whether the antenna follows the satellite here (see [`PassChartSample::tracked`]).
    pub tracked: bool,
}

/// One pass drawn on the sky chart. AOS, TCA and LOS markers go at the first point, the
/// highest point and the last point; the track carries `label` beside its highest point, and the
/// table beside the chart lists the label with the times, the maximum elevation and the rate.
#[derive(Debug, Clone, PartialEq)]
pub struct SkyPass {
    /// Short track label, the pass number, e.g. `16`.
    pub label: String,
    pub points: Vec<SkyPoint>,
    pub aos: DateTime<Utc>,
    pub tca: DateTime<Utc>,
    pub los: DateTime<Utc>,
    pub max_elevation_deg: f64,
    /// The fixed rate whose margin colours the track; `None` when no rate closes (the track's
    /// margin is then that of the ladder rate with the lowest threshold).
    pub rate_bps: Option<f64>,
}

/// A polar sky chart of one station: horizon mask and one or more pass tracks.
#[derive(Debug, Clone, PartialEq)]
pub struct SkyChartData {
    pub station: String,
    pub satellite: String,
    /// Free text for the title, e.g. `2026-12-02`.
    pub title_date: String,
    pub min_elevation_deg: f64,
    /// Horizon mask points `[azimuth_deg, elevation_deg]`, linear between points, wrapping at 360.
    pub horizon_mask: Vec<[f64; 2]>,
    pub required_margin_db: f64,
    pub passes: Vec<SkyPass>,
    /// Warnings printed in the footer under the caution (e.g. stale elements).
    pub warnings: Vec<String>,
}

/// Volume per day against mask elevation for one ladder rate.
#[derive(Debug, Clone, PartialEq)]
pub struct MaskRateSeries {
    /// e.g. `50 Mbit/s ccsds-rs-cc`. The chart adds "never closes" when every value is 0.
    pub label: String,
    /// One value per entry of [`MaskChartData::masks_deg`].
    pub volume_bits_per_day: Vec<f64>,
}

/// Mask trade-off: what raising the elevation mask costs.
#[derive(Debug, Clone, PartialEq)]
pub struct MaskChartData {
    /// Station name or `network`.
    pub scope: String,
    /// Mask elevations, degrees (typically 0..=40).
    pub masks_deg: Vec<f64>,
    /// Contact time per day above each mask, seconds.
    pub contact_s_per_day: Vec<f64>,
    pub rates: Vec<MaskRateSeries>,
    /// The configured mask of each station in the scope: (station name, deg). One entry for a
    /// station's chart; every station for the all-stations chart (each gets its own line).
    pub configured_masks_deg: Vec<(String, f64)>,
    /// Warnings printed in the footer under the caution (e.g. stale elements).
    pub warnings: Vec<String>,
}

/// One pass on the plan summary timeline.
#[derive(Debug, Clone, PartialEq)]
pub struct SummaryBar {
    pub aos: DateTime<Utc>,
    pub los: DateTime<Utc>,
    /// Index into [`SummaryChartData::stations`].
    pub station_index: usize,
    pub volume_bits: f64,
    pub adaptive_volume_bits: f64,
}

/// Volume totals of one UTC day.
#[derive(Debug, Clone, PartialEq)]
pub struct DayTotals {
    pub date: NaiveDate,
    pub fixed_bits: f64,
    pub adaptive_bits: f64,
    /// Shannon-capacity bound on the same passes.
    pub shannon_bits: f64,
    /// The network total of the day's passes: each second counted once, at the station with the
    /// highest fixed rate (`None`: not given).
    pub network_bits: Option<f64>,
    /// Fixed-rate volume in the availability (rain) case, when planned.
    pub rain_bits: Option<f64>,
}

/// Plan summary over the whole window.
#[derive(Debug, Clone, PartialEq)]
pub struct SummaryChartData {
    pub satellite: String,
    /// What the contact plan delivers over the window, bits: the subtitle's first figure (the
    /// bars and daily totals count every pass, unconstrained).
    pub delivered_bits: Option<f64>,
    pub start: DateTime<Utc>,
    pub end: DateTime<Utc>,
    pub stations: Vec<String>,
    pub passes: Vec<SummaryBar>,
    pub days: Vec<DayTotals>,
    /// The availability case's exceedance percentage, when planned (for the legend).
    pub rain_exceedance_percent: Option<f64>,
    /// Warnings printed in the footer under the caution (e.g. stale elements).
    pub warnings: Vec<String>,
}
