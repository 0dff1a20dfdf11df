//! Wire format of `plan` and `mask`: JSON/CSV rows (public interface; field names are stable and
//! documented in the README), built from the plan's typed results. Rounding happens here and only
//! here.

use crate::config::DefaultUsed;
use crate::plan::prepare::RateSet;
use crate::plan::rate::RateOption;
use crate::plan::results::ratio;
use crate::plan::series::Step;
use crate::plan::{
    DayTotals, ModeResult, PassPlan, PassSeries, Plan, Planner, Totals, TradeoffSeries, UsableMask,
};
use crate::report::round;
use crate::timefmt::{add_seconds, format_ms};
use serde::Serialize;

/// One pass of the plan.
#[derive(Debug, Clone, Serialize, Default)]
pub struct PlanPassRow {
    pub number: usize,
    /// The pass's identifier, the same whatever the window ([`crate::report::pass_id`]).
    pub pass_id: String,
    pub satellite: String,
    pub station: String,
    pub aos: String,
    pub tca: String,
    pub los: String,
    pub duration_s: f64,
    pub max_elevation_deg: f64,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub rate_bps: Option<f64>,
    pub scheme: Option<String>,
    pub closes_from: Option<String>,
    pub closes_until: Option<String>,
    pub closes_from_elevation_deg: Option<f64>,
    pub closes_until_elevation_deg: Option<f64>,
    pub closes_from_azimuth_deg: Option<f64>,
    pub closes_until_azimuth_deg: Option<f64>,
    pub min_margin_db: Option<f64>,
    pub tca_margin_db: Option<f64>,
    pub max_ebn0_db: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub adaptive_volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub shannon_volume_bits: f64,
    pub adaptive_switches: usize,
    pub fixed_efficiency: f64,
    pub adaptive_efficiency: f64,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub rain_rate_bps: Option<f64>,
    pub rain_scheme: Option<String>,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub rain_volume_bits: Option<f64>,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub rain_adaptive_volume_bits: Option<f64>,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub rain_shannon_volume_bits: Option<f64>,
    pub min_sun_separation_deg: Option<f64>,
    pub max_sun_noise_k: f64,
    pub sun_degraded_s: f64,
    pub min_moon_separation_deg: Option<f64>,
    pub max_moon_noise_k: f64,
    /// The worst pfd margin at the station over the pass (limit minus pfd, chosen rate), dB;
    /// null when passbudget has no Article 21 row for the band.
    pub pfd_margin_db: Option<f64>,
    /// Seconds the station's mount cannot follow (lost); null without a mount.
    pub mount_lost_s: Option<f64>,
    /// Seconds in which an axis rate or acceleration demanded exceeds the mount's limit.
    pub mount_rate_exceeded_s: Option<f64>,
    /// The largest rates the mount's primary and secondary axes need, deg/s; null without a mount.
    pub peak_primary_rate_deg_s: Option<f64>,
    pub peak_secondary_rate_deg_s: Option<f64>,
    pub starts_before_window: bool,
    pub ends_after_window: bool,
    /// Model-range warnings raised along this pass (clear sky and rain case), joined by "; ".
    pub warnings: String,
}

fn chosen<'a>(rates: &'a RateSet, m: &ModeResult) -> Option<&'a RateOption> {
    m.option.map(|k| &rates.ladder[k.0])
}

impl PlanPassRow {
    pub fn new(planner: &Planner, p: &PassPlan) -> Self {
        let rates = planner.rates();
        let c = &p.clear;
        let r3 = |x: f64| round(x, 3);
        let o = chosen(rates, c);
        let rain = p.rain.as_ref();
        let rain_o = rain.and_then(|r| chosen(rates, r));
        let station = &planner.stations()[p.station_index].station.name;
        PlanPassRow {
            number: p.number,
            pass_id: crate::report::pass_id(station, &p.pass),
            satellite: crate::plan::fleet::name_of(planner),
            station: station.clone(),
            aos: format_ms(&p.pass.aos),
            tca: format_ms(&p.pass.tca),
            los: format_ms(&p.pass.los),
            duration_s: r3(p.pass.duration_s()),
            max_elevation_deg: r3(p.pass.max_elevation_deg),
            rate_bps: o.map(|o| o.rate_bps),
            scheme: o.map(|o| o.scheme.clone()),
            closes_from: c.closing.map(|x| format_ms(&x.from.time)),
            closes_until: c.closing.map(|x| format_ms(&x.until.time)),
            closes_from_elevation_deg: c.closing.map(|x| r3(x.from.elevation_deg)),
            closes_until_elevation_deg: c.closing.map(|x| r3(x.until.elevation_deg)),
            closes_from_azimuth_deg: c
                .closing
                .map(|x| super::round_azimuth(x.from.azimuth_deg, 3)),
            closes_until_azimuth_deg: c
                .closing
                .map(|x| super::round_azimuth(x.until.azimuth_deg, 3)),
            min_margin_db: c.min_margin_db.map(r3),
            tca_margin_db: c.tca_margin_db.map(r3),
            max_ebn0_db: r3(c.max_ebn0_db),
            volume_bits: c.volume_bits.round(),
            adaptive_volume_bits: c.adaptive_volume_bits.round(),
            shannon_volume_bits: c.shannon_volume_bits.round(),
            adaptive_switches: c.adaptive_switches,
            fixed_efficiency: round(ratio(c.volume_bits, c.shannon_volume_bits), 4),
            adaptive_efficiency: round(ratio(c.adaptive_volume_bits, c.shannon_volume_bits), 4),
            rain_rate_bps: rain_o.map(|o| o.rate_bps),
            rain_scheme: rain_o.map(|o| o.scheme.clone()),
            rain_volume_bits: rain.map(|r| r.volume_bits.round()),
            rain_adaptive_volume_bits: rain.map(|r| r.adaptive_volume_bits.round()),
            rain_shannon_volume_bits: rain.map(|r| r.shannon_volume_bits.round()),
            min_sun_separation_deg: p.bodies.min_sun_separation_deg.map(r3),
            max_sun_noise_k: r3(p.bodies.max_sun_noise_k),
            sun_degraded_s: r3(p.bodies.sun_degraded_s),
            min_moon_separation_deg: p.bodies.min_moon_separation_deg.map(r3),
            max_moon_noise_k: r3(p.bodies.max_moon_noise_k),
            pfd_margin_db: p.pfd_margin_db.map(r3),
            mount_lost_s: p.mount.map(|m| r3(m.lost_s)),
            mount_rate_exceeded_s: p.mount.map(|m| r3(m.rate_exceeded_s)),
            peak_primary_rate_deg_s: p.mount.map(|m| r3(m.peak_primary_rate_deg_s)),
            peak_secondary_rate_deg_s: p.mount.map(|m| r3(m.peak_secondary_rate_deg_s)),
            starts_before_window: p.pass.starts_before_window,
            ends_after_window: p.pass.ends_after_window,
            warnings: p.warnings.lines(planner.frequency_hz()).join("; "),
        }
    }
}

/// Totals over the window.
#[derive(Debug, Clone, Serialize)]
pub struct TotalsRow {
    /// What the contact plan delivers: the sum over its booked contacts (absent where no
    /// contact plan was made).
    #[serde(
        serialize_with = "crate::report::whole_opt",
        skip_serializing_if = "Option::is_none"
    )]
    pub delivered_bits: Option<f64>,
    pub passes: usize,
    pub passes_closing: usize,
    pub contact_s: f64,
    pub closed_s: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub adaptive_volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub shannon_volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub network_volume_bits: f64,
    pub network_contact_s: f64,
    pub fixed_efficiency: f64,
    pub adaptive_efficiency: f64,
    /// The best single ladder rate used for every pass of the window (a modem set once), and its volume.
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub single_rate_bps: Option<f64>,
    pub single_rate_scheme: Option<String>,
    #[serde(serialize_with = "crate::report::whole")]
    pub single_rate_volume_bits: f64,
    pub rain_passes_closing: Option<usize>,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub rain_volume_bits: Option<f64>,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub rain_adaptive_volume_bits: Option<f64>,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub rain_shannon_volume_bits: Option<f64>,
    pub days: f64,
}

impl TotalsRow {
    pub fn new(t: &Totals, rates: &RateSet) -> Self {
        let single = t.single_rate.map(|(k, v)| (&rates.ladder[k.0], v));
        TotalsRow {
            delivered_bits: None,
            passes: t.passes,
            passes_closing: t.passes_closing,
            contact_s: round(t.contact_s, 1),
            closed_s: round(t.closed_s, 1),
            volume_bits: t.volume_bits.round(),
            adaptive_volume_bits: t.adaptive_volume_bits.round(),
            shannon_volume_bits: t.shannon_volume_bits.round(),
            network_volume_bits: t.network.volume_bits.round(),
            network_contact_s: round(t.network.contact_s, 1),
            fixed_efficiency: round(t.fixed_efficiency(), 4),
            adaptive_efficiency: round(t.adaptive_efficiency(), 4),
            single_rate_bps: single.map(|(o, _)| o.rate_bps),
            single_rate_scheme: single.map(|(o, _)| o.scheme.clone()),
            single_rate_volume_bits: single.map(|(_, v)| v.round()).unwrap_or(0.0),
            rain_passes_closing: t.rain.map(|r| r.passes_closing),
            rain_volume_bits: t.rain.map(|r| r.volume_bits.round()),
            rain_adaptive_volume_bits: t.rain.map(|r| r.adaptive_volume_bits.round()),
            rain_shannon_volume_bits: t.rain.map(|r| r.shannon_volume_bits.round()),
            days: round(t.days, 4),
        }
    }
}

/// Totals of one UTC day (passes counted on the day of their AOS).
#[derive(Debug, Clone, Serialize, Default)]
pub struct DayRow {
    pub date: String,
    /// What the contact plan delivers this UTC day (a contact across midnight split by its time),
    /// bits; absent where no contact plan was made.
    #[serde(
        serialize_with = "crate::report::whole_opt",
        skip_serializing_if = "Option::is_none"
    )]
    pub delivered_bits: Option<f64>,
    pub passes: usize,
    pub contact_s: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub adaptive_volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub shannon_volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub rain_volume_bits: Option<f64>,
}

impl From<&DayTotals> for DayRow {
    fn from(d: &DayTotals) -> Self {
        DayRow {
            date: d.date.to_string(),
            delivered_bits: None,
            passes: d.passes,
            contact_s: round(d.contact_s, 1),
            volume_bits: d.volume_bits.round(),
            adaptive_volume_bits: d.adaptive_volume_bits.round(),
            shannon_volume_bits: d.shannon_volume_bits.round(),
            rain_volume_bits: d.rain_volume_bits.map(f64::round),
        }
    }
}

/// Usable elevation mask of one ladder rate at one station.
#[derive(Debug, Clone, Serialize, Default)]
pub struct UsableMaskRow {
    pub station: String,
    #[serde(serialize_with = "crate::report::whole")]
    pub rate_bps: f64,
    pub scheme: String,
    /// Lowest elevation at which this rate closes on every pass whenever the satellite is above it; null if it never closes.
    pub usable_mask_deg: Option<f64>,
    pub station_mask_deg: f64,
    pub passes: usize,
    pub passes_closing: usize,
    /// Lowest elevation above which it closes on `mask_share_percent` % of the passes; null if it never closes.
    pub robust_mask_deg: Option<f64>,
    pub mask_share_percent: f64,
    /// How many passes fail above the robust mask (listed in the JSON's `mask_failures`).
    pub passes_failing: usize,
}

/// A pass on which a rate fails above its robust mask: where, and by how much.
#[derive(Debug, Clone, Serialize)]
pub struct MaskFailureRow {
    pub station: String,
    #[serde(serialize_with = "crate::report::whole")]
    pub rate_bps: f64,
    pub scheme: String,
    pub pass: usize,
    pub pass_id: String,
    /// The highest step of the pass where the rate does not count.
    pub time: String,
    pub elevation_deg: f64,
    /// The rate's margin there, dB; below `required_margin_db` it misses by the difference (at
    /// or above it, the step closed but its run was shorter than the dwell time).
    pub margin_db: f64,
    pub required_margin_db: f64,
    /// Seconds of the pass in which the Sun raises the system noise temperature by more than
    /// 1 dB (its pass row's `sun_degraded_s`): a failure high in the sky is often the Sun's.
    pub sun_degraded_s: f64,
}

impl MaskFailureRow {
    /// The rows of every usable mask's failures, in the order of the masks.
    pub fn rows(planner: &Planner, plan: &Plan, masks: &[UsableMask]) -> Vec<Self> {
        let mut out = Vec::new();
        for m in masks {
            let o = &planner.rates().ladder[m.option.0];
            let station = &planner.stations()[m.station_index].station.name;
            for f in &m.failures {
                let pass = plan.passes.iter().find(|p| p.number == f.pass_number);
                out.push(MaskFailureRow {
                    station: station.clone(),
                    rate_bps: o.rate_bps,
                    scheme: o.scheme.clone(),
                    pass: f.pass_number,
                    pass_id: pass
                        .map(|p| crate::report::pass_id(station, &p.pass))
                        .unwrap_or_default(),
                    time: format_ms(&f.time),
                    elevation_deg: round(f.step.elevation_deg, 3),
                    margin_db: round(f.step.margin_db, 3),
                    required_margin_db: planner.rates().required_margin_db,
                    sun_degraded_s: pass.map_or(0.0, |p| round(p.bodies.sun_degraded_s, 3)),
                });
            }
        }
        out
    }
}

impl UsableMaskRow {
    pub fn new(planner: &Planner, m: &UsableMask) -> Self {
        let o = &planner.rates().ladder[m.option.0];
        UsableMaskRow {
            station: planner.stations()[m.station_index].station.name.clone(),
            rate_bps: o.rate_bps,
            scheme: o.scheme.clone(),
            usable_mask_deg: m.usable_mask_deg.map(|v| round(v, 2)),
            station_mask_deg: m.station_mask_deg,
            passes: m.passes,
            passes_closing: m.passes_closing,
            robust_mask_deg: m.robust_mask_deg.map(|v| round(v, 2)),
            mask_share_percent: planner.mission().mask_share_percent,
            passes_failing: m.failures.len(),
        }
    }
}

/// One point of the mask trade-off.
#[derive(Debug, Clone, Serialize, Default)]
pub struct TradeoffRow {
    pub scope: String,
    pub mask_deg: f64,
    pub contact_s_per_day: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub rate_bps: f64,
    pub scheme: String,
    #[serde(serialize_with = "crate::report::whole")]
    pub volume_bits_per_day: f64,
}

impl TradeoffRow {
    /// The rows of a trade-off, scope by scope, mask by mask, option by option.
    pub fn rows(planner: &Planner, series: &[TradeoffSeries]) -> Vec<TradeoffRow> {
        let mut rows = Vec::new();
        for t in series {
            let scope = t.scope.label(planner.stations());
            for (i, &mask) in t.masks_deg.iter().enumerate() {
                for o in &t.volume_bits_per_day {
                    let option = &planner.rates().ladder[o.option.0];
                    rows.push(TradeoffRow {
                        scope: scope.clone(),
                        mask_deg: mask as f64,
                        contact_s_per_day: round(t.contact_s_per_day[i], 1),
                        rate_bps: option.rate_bps,
                        scheme: option.scheme.clone(),
                        volume_bits_per_day: o.values[i].round(),
                    });
                }
            }
        }
        rows
    }
}

/// One row of a pass's time series CSV.
#[derive(Debug, Clone, Serialize, Default)]
pub struct StepRow {
    pub time: String,
    pub t_s: f64,
    pub azimuth_deg: f64,
    pub elevation_deg: f64,
    pub range_km: f64,
    pub range_rate_km_s: f64,
    pub doppler_hz: f64,
    pub off_nadir_deg: f64,
    pub eirp_dbw: f64,
    pub free_space_loss_db: f64,
    pub atmospheric_loss_db: f64,
    pub sky_temperature_k: f64,
    pub sky_noise_k: f64,
    pub ground_noise_k: f64,
    pub man_made_noise_k: f64,
    pub sun_noise_k: f64,
    pub moon_noise_k: f64,
    pub receiver_noise_k: f64,
    pub antenna_temperature_k: f64,
    pub system_temperature_k: f64,
    pub g_over_t_db_k: f64,
    pub cn0_dbhz: f64,
    pub sun_separation_deg: Option<f64>,
    pub moon_separation_deg: Option<f64>,
    /// Rate the Eb/N0 and margin are given for: the chosen fixed rate, else the lowest ladder rate.
    #[serde(serialize_with = "crate::report::whole")]
    pub rate_bps: f64,
    pub ebn0_db: f64,
    pub margin_db: f64,
    /// The chosen fixed rate counts this step (margin met, inside a run of at least the dwell time).
    pub closed: bool,
    /// The station's mount can follow this step (always true without a mount).
    pub tracked: bool,
    pub adaptive_scheme: Option<String>,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub adaptive_rate_bps: Option<f64>,
    pub rain_atmospheric_loss_db: Option<f64>,
    pub rain_sky_noise_k: Option<f64>,
    pub rain_ground_noise_k: Option<f64>,
    pub rain_sun_noise_k: Option<f64>,
    pub rain_moon_noise_k: Option<f64>,
    pub rain_antenna_temperature_k: Option<f64>,
    pub rain_system_temperature_k: Option<f64>,
    pub rain_cn0_dbhz: Option<f64>,
    pub rain_margin_db: Option<f64>,
}

/// The time series rows of one pass.
pub fn step_rows(series: &PassSeries, rates: &RateSet) -> Vec<StepRow> {
    let p = series.plan;
    let (_, o) = rates.display_option(p.clear.option);
    series
        .steps
        .iter()
        .enumerate()
        .map(|(i, s): (usize, &Step)| {
            let a = series
                .adaptive
                .get(i)
                .copied()
                .flatten()
                .map(|j| &rates.adaptive[j as usize]);
            StepRow {
                time: format_ms(&add_seconds(&p.pass.aos, s.t_s)),
                t_s: round(s.t_s, 3),
                azimuth_deg: super::round_azimuth(s.azimuth_deg, 4),
                elevation_deg: round(s.elevation_deg, 4),
                range_km: round(s.range_km, 4),
                range_rate_km_s: round(s.range_rate_km_s, 6),
                doppler_hz: round(s.doppler_hz, 1),
                off_nadir_deg: round(s.off_nadir_deg, 4),
                eirp_dbw: round(s.eirp_dbw, 4),
                free_space_loss_db: round(s.free_space_loss_db, 4),
                atmospheric_loss_db: round(s.atmospheric_loss_db, 4),
                sky_temperature_k: round(s.sky_temperature_k, 3),
                sky_noise_k: round(s.sky_noise_k, 3),
                ground_noise_k: round(s.ground_noise_k, 3),
                man_made_noise_k: round(s.man_made_noise_k, 3),
                sun_noise_k: round(s.sun_noise_k, 3),
                moon_noise_k: round(s.moon_noise_k, 3),
                receiver_noise_k: round(s.receiver_noise_k, 3),
                antenna_temperature_k: round(s.antenna_temperature_k, 3),
                system_temperature_k: round(s.system_temperature_k, 3),
                g_over_t_db_k: round(s.g_over_t_db_k, 4),
                cn0_dbhz: round(s.cn0_dbhz, 4),
                sun_separation_deg: s.sun_separation_deg.map(|x| round(x, 3)),
                moon_separation_deg: s.moon_separation_deg.map(|x| round(x, 3)),
                rate_bps: o.rate_bps,
                ebn0_db: round(o.ebn0_db(s.cn0_dbhz), 4),
                margin_db: round(o.margin_db(s.cn0_dbhz), 4),
                closed: series.counted(i),
                tracked: !s.untracked,
                adaptive_scheme: a.map(|x| x.scheme.clone()),
                adaptive_rate_bps: a.map(|x| round(x.rate_bps, 1)),
                rain_atmospheric_loss_db: s.rain.map(|r| round(r.atmospheric_loss_db, 4)),
                rain_sky_noise_k: s.rain.map(|r| round(r.sky_noise_k, 3)),
                rain_ground_noise_k: s.rain.map(|r| round(r.ground_noise_k, 3)),
                rain_sun_noise_k: s.rain.map(|r| round(r.sun_noise_k, 3)),
                rain_moon_noise_k: s.rain.map(|r| round(r.moon_noise_k, 3)),
                rain_antenna_temperature_k: s.rain.map(|r| round(r.antenna_temperature_k, 3)),
                rain_system_temperature_k: s.rain.map(|r| round(r.system_temperature_k, 3)),
                rain_cn0_dbhz: s.rain.map(|r| round(r.cn0_dbhz, 4)),
                rain_margin_db: s.rain.map(|r| round(o.margin_db(r.cn0_dbhz), 4)),
            }
        })
        .collect()
}

/// A default taken instead of a value from a file, with the file.
#[derive(Debug, Clone, Serialize)]
pub struct DefaultRow {
    pub file: String,
    pub key: String,
    pub source: String,
    pub value: String,
}

impl DefaultRow {
    fn new(file: &std::path::Path, d: &DefaultUsed) -> Self {
        DefaultRow {
            file: file.display().to_string(),
            key: d.key.clone(),
            source: d.source.clone(),
            value: d.value.clone(),
        }
    }
}

/// One rate option with the provenance of its threshold (fields in alphabetical order, as
/// published before the types were introduced).
#[derive(Debug, Clone, Serialize)]
pub struct RateOptionRow {
    /// Channel (coded) bit rate: symbol rate x bits per symbol, bit/s.
    pub channel_rate_bps: f64,
    pub error_measure: String,
    pub error_rate: f64,
    /// Information bits per bit entering the code (1 without framing overhead).
    pub framing_efficiency: f64,
    pub mode: &'static str,
    pub occupied_bandwidth_hz: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub rate_bps: f64,
    pub required_ebn0_db: f64,
    pub scheme: String,
    pub symbol_rate_baud: f64,
    pub threshold_cn0_dbhz: f64,
    pub threshold_source: &'static str,
    pub threshold_status: &'static str,
}

impl RateOptionRow {
    fn new(mode: &'static str, o: &RateOption, spec: &crate::link::budget::RateSpec) -> Self {
        let op = spec.operating();
        let (threshold_status, threshold_source) = op.provenance.status_and_source();
        RateOptionRow {
            channel_rate_bps: round(spec.channel_rate_bps(), 1),
            error_measure: format!("{:?}", op.measure).to_uppercase(),
            error_rate: op.error_rate,
            framing_efficiency: round(op.framing_efficiency, 6),
            mode,
            occupied_bandwidth_hz: o.occupied_bandwidth_hz.round(),
            // whole bit/s: an adaptive option's rate is symbol rate x efficiency (128249999.99999999)
            rate_bps: o.rate_bps.round(),
            required_ebn0_db: o.required_ebn0_db,
            scheme: o.scheme.clone(),
            symbol_rate_baud: round(spec.symbol_rate_baud(), 1),
            threshold_cn0_dbhz: round(o.threshold_cn0_dbhz, 4),
            threshold_source,
            threshold_status,
        }
    }
}

/// The caution every output carries (the README's "Cautions" in one paragraph): planning
/// estimates, the licence, RF safety near transmitting antennas, and local codes and licensed
/// practice first.
pub const CAUTION: &str = "Planning estimates only, not for safety-of-life decisions. Frequency use needs a licence and coordination by the national administration. RF safety: keep people out of the beam and near field of transmitting antennas. Defer to local codes and licensed practice.";

/// The `assumptions` block of the plan summary: how the numbers were made. Fields are in
/// alphabetical order (the order the summary has always had).
#[derive(Debug, Clone, Serialize)]
pub struct Assumptions {
    pub adaptive: String,
    /// The adaptive mode's switching as used (given in the mission file or the default): the extra
    /// margin before it switches up, dB; the seconds lost at each change; whether the ladder's
    /// rates are in its set.
    pub adaptive_hysteresis_db: f64,
    pub adaptive_relock_s: f64,
    pub adaptive_with_ladder: bool,
    pub availability_case: Option<String>,
    pub caution: &'static str,
    pub clear_sky: &'static str,
    pub defaults: Vec<DefaultRow>,
    pub element_epoch: String,
    pub exceedance_percent: Option<f64>,
    pub fixed_rate: &'static str,
    pub frames: &'static str,
    pub frequency_hz: Option<f64>,
    pub implementation_loss_db: f64,
    pub min_dwell_s: f64,
    pub network_total: &'static str,
    pub propagator: &'static str,
    pub rate_options: Vec<RateOptionRow>,
    pub required_margin_db: f64,
    pub shannon_bandwidth_hz: f64,
    pub step_s: f64,
    pub warnings: Vec<String>,
    pub window_end: String,
    pub window_start: String,
}

impl Assumptions {
    pub fn new(planner: &Planner, plan: &Plan) -> Self {
        let mission = planner.mission();
        let rates = planner.rates();
        let mut defaults: Vec<DefaultRow> = mission
            .defaults
            .iter()
            .map(|d| DefaultRow::new(&mission.source, d))
            .collect();
        for s in planner.stations() {
            defaults.extend(
                s.station
                    .defaults
                    .iter()
                    .map(|d| DefaultRow::new(&s.station.source, d)),
            );
        }
        let fixed = rates
            .ladder
            .iter()
            .zip(&rates.ladder_specs)
            .map(|(o, s)| RateOptionRow::new("fixed", o, s));
        let adaptive = rates
            .adaptive
            .iter()
            .zip(&rates.adaptive_specs)
            .map(|(o, s)| RateOptionRow::new("adaptive", o, s));
        let exceedance_percent = planner.exceedance_percent();
        let block = mission.modem.as_ref().and_then(|m| m.adaptive.as_ref());
        Assumptions {
            adaptive: adaptive_rule(block.is_some()),
            adaptive_hysteresis_db: rates.hysteresis_db,
            adaptive_relock_s: rates.relock_s,
            adaptive_with_ladder: block.is_none_or(|a| a.with_ladder),
            availability_case: exceedance_percent.map(|x| format!("rain attenuation exceeded {x} % of an average year applied to every pass (P.618-14), with the cloud liquid water of climate.cloud_liquid_exceedance_kg_m2; planning figure for {:.3} % availability", 100.0 - x)),
            caution: CAUTION,
            clear_sky: "gases (ITU-R P.676-12) and clouds (ITU-R P.840-9) of climate.cloud_liquid_clear_kg_m2; no rain, no scintillation fade",
            defaults,
            element_epoch: format_ms(&planner.elements().epoch),
            exceedance_percent,
            fixed_rate: "per pass, the ladder rate that brings home the most data, counting only runs of at least min_dwell_s with margin >= required_margin_db",
            frames: "TEME to Earth-fixed by GMST (IAU-82); UT1 taken as UTC; polar motion neglected",
            frequency_hz: Some(planner.frequency_hz()),
            implementation_loss_db: rates.implementation_loss_db,
            min_dwell_s: rates.min_dwell_s,
            network_total: "each second counted once, at the station with the highest fixed rate at that second",
            propagator: "SGP4 (sgp4 crate) with WGS-72 constants",
            rate_options: fixed.chain(adaptive).collect(),
            required_margin_db: rates.required_margin_db,
            shannon_bandwidth_hz: rates.shannon_bandwidth_hz,
            step_s: planner.step_s(),
            warnings: (plan.warnings.iter().cloned())
                .chain(plan.notes.iter().map(|n| n.text.clone()))
                .collect(),
            window_end: format_ms(&plan.window.end()),
            window_start: format_ms(&plan.window.start()),
        }
    }
}

/// The adaptive mode's rule in words (`assumptions.adaptive`): one waveform switching with
/// hysteresis and a re-lock time ([`crate::plan::rate`]), its figures in the fields beside it.
fn adaptive_rule(has_block: bool) -> String {
    let set = if has_block {
        "one waveform: the modem.adaptive schemes at its symbol rate (and the ladder's rates only with adaptive_with_ladder)"
    } else {
        "no modem.adaptive block: the ladder's rates as one modem"
    };
    format!("{set}; the link is up on the runs of at least min_dwell_s of its lowest-threshold option; within a run it steps down at once when its scheme stops closing and up only where a higher-rate scheme closes with adaptive_hysteresis_db to spare, losing adaptive_relock_s at each change; adaptive >= fixed holds by construction only with the ladder in the set, hysteresis 0 and re-lock 0")
}

/// The whole plan summary (`summary.json`, `plan --format json`).
#[derive(Debug, Clone, Serialize)]
pub struct PlanDoc {
    pub satellite: String,
    /// The contact plan: `contacts`, `satellites`, `stations`, `schedule_bound`, `scheduler_s`
    /// (present in `plan`'s summary; see [`PlanDoc::attach`]).
    #[serde(flatten)]
    pub contact: Option<super::contacts::ContactDoc>,
    pub passes: Vec<PlanPassRow>,
    pub totals: TotalsRow,
    pub days: Vec<DayRow>,
    pub usable_masks: Vec<UsableMaskRow>,
    /// The passes on which a rate fails above its robust mask (see `usable_masks`).
    pub mask_failures: Vec<MaskFailureRow>,
    /// Every rate option's worst pfd margin over all angles of arrival.
    pub pfd: PfdBlock,
    pub assumptions: Assumptions,
}

/// The pfd check of a plan: the band's Article 21 row and every rate option's worst case over
/// all angles of arrival.
#[derive(Debug, Clone, Serialize)]
pub struct PfdBlock {
    /// `8025-8500 MHz`, or null when passbudget has no row for the frequency.
    pub band: Option<String>,
    pub services: Option<&'static str>,
    pub reference_bandwidth_hz: Option<f64>,
    /// How the limit's row is known.
    pub limit_status: &'static str,
    pub altitude_km: f64,
    pub method: String,
    pub caution: &'static str,
    pub options: Vec<PfdOptionRow>,
}

/// One rate option's worst case over the angles of arrival.
#[derive(Debug, Clone, Serialize)]
pub struct PfdOptionRow {
    pub mode: &'static str,
    #[serde(serialize_with = "crate::report::whole")]
    pub rate_bps: f64,
    pub scheme: String,
    pub occupied_bandwidth_hz: f64,
    /// Limit minus pfd at the worst angle, dB (negative: over the limit).
    pub worst_margin_db: f64,
    pub worst_arrival_deg: f64,
    pub pfd_dbw_m2: f64,
    pub limit_dbw_m2: f64,
}

/// How the pfd block was computed, in words; the uniform spectrum's text as it always was.
fn pfd_method(spectrum: crate::link::pfd::Spectrum) -> String {
    const WHERE: &str = "at every angle of arrival 0-90 deg (0.1 deg steps) from the perigee altitude of the mean elements over a spherical Earth of 6378.137 km; free space, no atmospheric loss";
    match spectrum {
        crate::link::pfd::Spectrum::Uniform => format!("pfd = EIRP(off-nadir) - 10 log10(4 pi d^2) - 10 log10(max(B, B_ref) / B_ref), B the option's occupied bandwidth (spectrum uniform over it), {WHERE}"),
        s => format!("pfd = EIRP(off-nadir) - 10 log10(4 pi d^2) + 10 log10(share), share the largest part of the power in one B_ref ({}), {WHERE}", s.label()),
    }
}

impl PfdBlock {
    pub fn new(planner: &Planner) -> Self {
        let c = planner.pfd();
        let r4 = |x: f64| round(x, 4);
        PfdBlock {
            band: c.band.map(|b| b.label()),
            services: c.band.map(|b| b.services),
            reference_bandwidth_hz: c.band.map(|b| b.reference_bandwidth_hz),
            limit_status: match &c.band {
                Some(b) => b.status,
                None => "no Article 21 Table 21-4 row for this frequency in passbudget's table: not checked",
            },
            altitude_km: round(c.altitude_km, 3),
            method: pfd_method(c.spectrum),
            caution: "Compliance with the Radio Regulations is for the administration to decide; this is a planning estimate.",
            options: c
                .options
                .iter()
                .map(|o| PfdOptionRow {
                    mode: o.mode,
                    rate_bps: o.rate_bps.round(),
                    scheme: o.scheme.clone(),
                    occupied_bandwidth_hz: o.occupied_bandwidth_hz.round(),
                    worst_margin_db: r4(o.worst.margin_db),
                    worst_arrival_deg: round(o.worst.arrival_deg, 1),
                    pfd_dbw_m2: r4(o.worst.pfd_dbw_m2),
                    limit_dbw_m2: r4(o.worst.limit_dbw_m2),
                })
                .collect(),
        }
    }
}

impl PlanDoc {
    /// The summary of a plan with its contact plan (what `plan` writes).
    pub fn with_contacts(
        planner: &Planner,
        plan: &Plan,
        contacts: &crate::plan::fleet::ContactPlan,
    ) -> Self {
        let mut doc = PlanDoc::new(planner, plan);
        let plans = std::slice::from_ref(plan);
        doc.attach(super::contacts::ContactDoc::new(
            contacts,
            plans,
            planner.stations(),
        ));
        doc
    }

    /// Add the contact plan: its fields, and the delivered total first among the totals.
    pub fn attach(&mut self, contact: super::contacts::ContactDoc) {
        self.totals.delivered_bits = Some(contact.delivered_bits());
        let by_day = contact.delivered_by_day();
        for d in &mut self.days {
            let day = chrono::NaiveDate::parse_from_str(&d.date, "%Y-%m-%d").ok();
            let bits = day.and_then(|k| by_day.get(&k)).copied().unwrap_or(0.0);
            d.delivered_bits = Some(bits.round());
        }
        self.contact = Some(contact);
    }

    pub fn new(planner: &Planner, plan: &Plan) -> Self {
        PlanDoc {
            passes: plan
                .passes
                .iter()
                .map(|p| PlanPassRow::new(planner, p))
                .collect(),
            ..Self::without_pass_rows(planner, plan)
        }
    }

    /// Every part but the pass rows (`passes` is empty), for a reader that makes each pass's row
    /// when it needs it ([`PlanPassRow::new`]; the `plan` table): the rows are most of the
    /// document, about 1 kB per pass.
    pub fn without_pass_rows(planner: &Planner, plan: &Plan) -> Self {
        PlanDoc {
            satellite: crate::plan::fleet::name_of(planner),
            contact: None,
            passes: Vec::new(),
            totals: TotalsRow::new(&plan.totals, planner.rates()),
            days: plan.days.iter().map(DayRow::from).collect(),
            usable_masks: plan
                .usable_masks
                .iter()
                .map(|m| UsableMaskRow::new(planner, m))
                .collect(),
            mask_failures: MaskFailureRow::rows(planner, plan, &plan.usable_masks),
            pfd: PfdBlock::new(planner),
            assumptions: Assumptions::new(planner, plan),
        }
    }
}
