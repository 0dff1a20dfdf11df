//! Wire format of `plan` and `mask`: JSON/CSV rows (public interface; field names are stable and
//! documented in the README), built from the plan's domain types.

use crate::orbit::ElementSet;
use crate::plan::prepare::{RateSet, StationModel};
use crate::plan::series::Step;
use crate::plan::{ModeResult, PassPlan, PassSeries, Plan};
use crate::report::round;
use crate::timefmt::{add_seconds, format_ms};
use chrono::{DateTime, NaiveDate, Utc};
use serde::Serialize;
use std::collections::BTreeMap;

/// One pass of the plan.
#[derive(Debug, Clone, Serialize)]
pub struct PlanPassRow {
    pub number: usize,
    pub satellite: String,
    pub station: String,
    pub aos: String,
    pub tca: String,
    pub los: String,
    pub duration_s: f64,
    pub max_elevation_deg: f64,
    pub rate_bps: Option<f64>,
    pub scheme: Option<String>,
    pub closes_from: Option<String>,
    pub closes_until: Option<String>,
    pub closes_from_elevation_deg: Option<f64>,
    pub closes_until_elevation_deg: Option<f64>,
    pub closes_from_azimuth_deg: Option<f64>,
    pub closes_until_azimuth_deg: Option<f64>,
    pub min_margin_db: Option<f64>,
    pub max_ebn0_db: f64,
    pub volume_bits: f64,
    pub adaptive_volume_bits: f64,
    pub shannon_volume_bits: f64,
    pub adaptive_switches: usize,
    pub fixed_efficiency: f64,
    pub adaptive_efficiency: f64,
    pub rain_rate_bps: Option<f64>,
    pub rain_scheme: Option<String>,
    pub rain_volume_bits: Option<f64>,
    pub rain_adaptive_volume_bits: Option<f64>,
    pub rain_shannon_volume_bits: Option<f64>,
    pub starts_before_window: bool,
    pub ends_after_window: bool,
    /// Model-range warnings raised along this pass (clear sky and rain case), joined by "; ".
    pub warnings: String,
}

fn ratio(a: f64, b: f64) -> f64 {
    if b > 0.0 {
        round(a / b, 4)
    } else {
        0.0
    }
}

fn ms(t: &Option<DateTime<Utc>>) -> Option<String> {
    t.as_ref().map(format_ms)
}

impl PlanPassRow {
    pub fn new(set: &ElementSet, stations: &[StationModel], p: &PassPlan) -> Self {
        let c = &p.clear;
        let r2 = |x: Option<f64>| x.map(|v| round(v, 3));
        PlanPassRow {
            number: p.number,
            satellite: crate::cli::common::satellite_name(set),
            station: stations[p.station_index].station.name.clone(),
            aos: format_ms(&p.pass.aos),
            tca: format_ms(&p.pass.tca),
            los: format_ms(&p.pass.los),
            duration_s: round(p.pass.duration_s(), 3),
            max_elevation_deg: round(p.pass.max_elevation_deg, 3),
            rate_bps: c.rate_bps,
            scheme: c.scheme.clone(),
            closes_from: ms(&c.closes_from),
            closes_until: ms(&c.closes_until),
            closes_from_elevation_deg: r2(c.closes_from_elevation_deg),
            closes_until_elevation_deg: r2(c.closes_until_elevation_deg),
            closes_from_azimuth_deg: r2(c.closes_from_azimuth_deg),
            closes_until_azimuth_deg: r2(c.closes_until_azimuth_deg),
            min_margin_db: r2(c.min_margin_db),
            max_ebn0_db: round(c.max_ebn0_db, 3),
            volume_bits: c.volume_bits.round(),
            adaptive_volume_bits: c.adaptive_volume_bits.round(),
            shannon_volume_bits: c.shannon_volume_bits.round(),
            adaptive_switches: c.adaptive_switches,
            fixed_efficiency: ratio(c.volume_bits, c.shannon_volume_bits),
            adaptive_efficiency: ratio(c.adaptive_volume_bits, c.shannon_volume_bits),
            rain_rate_bps: p.rain.as_ref().and_then(|r| r.rate_bps),
            rain_scheme: p.rain.as_ref().and_then(|r| r.scheme.clone()),
            rain_volume_bits: p.rain.as_ref().map(|r| r.volume_bits.round()),
            rain_adaptive_volume_bits: p.rain.as_ref().map(|r| r.adaptive_volume_bits.round()),
            rain_shannon_volume_bits: p.rain.as_ref().map(|r| r.shannon_volume_bits.round()),
            starts_before_window: p.pass.starts_before_window,
            ends_after_window: p.pass.ends_after_window,
            warnings: p.warnings.messages().join("; "),
        }
    }
}

/// Totals over the window.
#[derive(Debug, Clone, Serialize)]
pub struct Totals {
    pub passes: usize,
    pub passes_closing: usize,
    pub contact_s: f64,
    pub closed_s: f64,
    pub volume_bits: f64,
    pub adaptive_volume_bits: f64,
    pub shannon_volume_bits: f64,
    pub network_volume_bits: f64,
    pub network_contact_s: f64,
    pub fixed_efficiency: f64,
    pub adaptive_efficiency: f64,
    /// The best single ladder rate used for every pass of the window (a modem set once), and its volume.
    pub single_rate_bps: Option<f64>,
    pub single_rate_scheme: Option<String>,
    pub single_rate_volume_bits: f64,
    pub rain_passes_closing: Option<usize>,
    pub rain_volume_bits: Option<f64>,
    pub rain_adaptive_volume_bits: Option<f64>,
    pub rain_shannon_volume_bits: Option<f64>,
    pub days: f64,
}

/// Totals of one UTC day (passes counted on the day of their AOS).
#[derive(Debug, Clone, Serialize)]
pub struct DayRow {
    pub date: String,
    pub passes: usize,
    pub contact_s: f64,
    pub volume_bits: f64,
    pub adaptive_volume_bits: f64,
    pub shannon_volume_bits: f64,
    pub rain_volume_bits: Option<f64>,
}

/// Usable elevation mask of one ladder rate at one station.
#[derive(Debug, Clone, Serialize)]
pub struct UsableMaskRow {
    pub station: String,
    pub rate_bps: f64,
    pub scheme: String,
    /// Lowest elevation at which this rate closes on every pass whenever the satellite is above it; null if it never closes.
    pub usable_mask_deg: Option<f64>,
    pub station_mask_deg: f64,
    pub passes: usize,
    pub passes_closing: usize,
}

/// One point of the mask trade-off.
#[derive(Debug, Clone, Serialize)]
pub struct TradeoffRow {
    pub scope: String,
    pub mask_deg: f64,
    pub contact_s_per_day: f64,
    pub rate_bps: f64,
    pub scheme: String,
    pub volume_bits_per_day: f64,
}

fn sum_mode(passes: &[PassPlan], f: impl Fn(&ModeResult) -> f64, rain: bool) -> f64 {
    passes
        .iter()
        .filter_map(|p| {
            if rain {
                p.rain.as_ref()
            } else {
                Some(&p.clear)
            }
        })
        .map(f)
        .sum::<f64>()
        + 0.0 // an empty sum is -0.0; report 0
}

/// Totals and per-day rows.
pub fn totals(plan: &Plan, rates: &RateSet, days: f64) -> (Totals, Vec<DayRow>) {
    let p = &plan.passes;
    let has_rain = plan.rain_planned;
    let volume = sum_mode(p, |m| m.volume_bits, false);
    let adaptive = sum_mode(p, |m| m.adaptive_volume_bits, false);
    let shannon = sum_mode(p, |m| m.shannon_volume_bits, false);
    let mut single: Option<(usize, f64)> = None;
    for k in 0..rates.ladder.len() {
        let v: f64 = p.iter().map(|x| x.clear.volume_by_rate_bits[k]).sum();
        if v > 0.0 && single.is_none_or(|(_, b)| v > b) {
            single = Some((k, v));
        }
    }
    let rain_opt = |f: &dyn Fn(&ModeResult) -> f64| {
        if has_rain {
            Some(sum_mode(p, f, true).round())
        } else {
            None
        }
    };
    let t = Totals {
        passes: p.len(),
        passes_closing: p.iter().filter(|x| x.clear.option.is_some()).count(),
        contact_s: round(p.iter().map(|x| x.pass.duration_s()).sum::<f64>() + 0.0, 1),
        closed_s: round(sum_mode(p, |m| m.closed_s, false), 1),
        volume_bits: volume.round(),
        adaptive_volume_bits: adaptive.round(),
        shannon_volume_bits: shannon.round(),
        network_volume_bits: plan.network_volume_bits.round(),
        network_contact_s: round(plan.network_contact_s, 1),
        fixed_efficiency: ratio(volume, shannon),
        adaptive_efficiency: ratio(adaptive, shannon),
        single_rate_bps: single.map(|(k, _)| rates.ladder[k].rate_bps),
        single_rate_scheme: single.map(|(k, _)| rates.ladder[k].scheme.clone()),
        single_rate_volume_bits: single.map(|(_, v)| v.round()).unwrap_or(0.0),
        rain_passes_closing: if has_rain {
            Some(
                p.iter()
                    .filter(|x| x.rain.as_ref().is_some_and(|r| r.option.is_some()))
                    .count(),
            )
        } else {
            None
        },
        rain_volume_bits: rain_opt(&|m| m.volume_bits),
        rain_adaptive_volume_bits: rain_opt(&|m| m.adaptive_volume_bits),
        rain_shannon_volume_bits: rain_opt(&|m| m.shannon_volume_bits),
        days: round(days, 4),
    };
    let mut by_day: BTreeMap<NaiveDate, DayRow> = BTreeMap::new();
    // Every UTC day of the window has a row, days without passes included.
    let empty_day = |d: NaiveDate| DayRow {
        date: d.to_string(),
        passes: 0,
        contact_s: 0.0,
        volume_bits: 0.0,
        adaptive_volume_bits: 0.0,
        shannon_volume_bits: 0.0,
        rain_volume_bits: if has_rain { Some(0.0) } else { None },
    };
    let last = (plan.end - chrono::Duration::microseconds(1)).date_naive();
    let mut d = plan.start.date_naive();
    while d <= last {
        by_day.insert(d, empty_day(d));
        match d.succ_opt() {
            Some(next) => d = next,
            None => break,
        }
    }
    for x in p {
        let d = x.pass.aos.date_naive();
        let row = by_day.entry(d).or_insert_with(|| empty_day(d));
        row.passes += 1;
        row.contact_s += x.pass.duration_s();
        row.volume_bits += x.clear.volume_bits;
        row.adaptive_volume_bits += x.clear.adaptive_volume_bits;
        row.shannon_volume_bits += x.clear.shannon_volume_bits;
        if let (Some(v), Some(r)) = (row.rain_volume_bits.as_mut(), x.rain.as_ref()) {
            *v += r.volume_bits;
        }
    }
    let days_rows = by_day
        .into_values()
        .map(|mut r| {
            r.contact_s = round(r.contact_s, 1);
            r.volume_bits = r.volume_bits.round();
            r.adaptive_volume_bits = r.adaptive_volume_bits.round();
            r.shannon_volume_bits = r.shannon_volume_bits.round();
            r.rain_volume_bits = r.rain_volume_bits.map(f64::round);
            r
        })
        .collect();
    (t, days_rows)
}

/// Usable masks per station and ladder rate.
pub fn usable_masks(plan: &Plan, stations: &[StationModel], rates: &RateSet) -> Vec<UsableMaskRow> {
    let mut rows = Vec::new();
    for (i, st) in stations.iter().enumerate() {
        let acc = &plan.station_masks[i];
        let station_mask = st.configured_min_elevation_deg;
        for (k, o) in rates.ladder.iter().enumerate() {
            rows.push(UsableMaskRow {
                station: st.station.name.clone(),
                rate_bps: o.rate_bps,
                scheme: o.scheme.clone(),
                usable_mask_deg: acc.usable_mask_deg(k, station_mask).map(|v| round(v, 2)),
                station_mask_deg: station_mask,
                passes: acc.passes,
                passes_closing: acc.passes_closing[k],
            });
        }
    }
    rows
}

/// Mask trade-off rows for each station and for all stations together ("all stations": the sum,
/// overlapping passes counted at each station), masks 0..=40 deg in `step_deg` steps.
pub fn tradeoff(
    plan: &Plan,
    stations: &[StationModel],
    rates: &RateSet,
    days: f64,
    step_deg: usize,
) -> Vec<TradeoffRow> {
    let mut all = crate::plan::mask::MaskAccumulator::new(rates.ladder.len());
    for m in &plan.station_masks {
        all.merge(m);
    }
    let mut scopes: Vec<(String, &crate::plan::mask::MaskAccumulator)> = stations
        .iter()
        .zip(&plan.station_masks)
        .map(|(s, m)| (s.station.name.clone(), m))
        .collect();
    scopes.push(("all stations".into(), &all));
    let mut rows = Vec::new();
    for (scope, acc) in scopes {
        for mask in (0..=crate::plan::mask::MAX_MASK_DEG).step_by(step_deg.max(1)) {
            for (k, o) in rates.ladder.iter().enumerate() {
                rows.push(TradeoffRow {
                    scope: scope.clone(),
                    mask_deg: mask as f64,
                    contact_s_per_day: round(acc.contact_above_s(mask) / days, 1),
                    rate_bps: o.rate_bps,
                    scheme: o.scheme.clone(),
                    volume_bits_per_day: (acc.volume_above_bits(k, mask) / days).round(),
                });
            }
        }
    }
    rows
}

/// One row of a pass's time series CSV.
#[derive(Debug, Clone, Serialize)]
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
    pub antenna_temperature_k: f64,
    pub system_temperature_k: f64,
    pub g_over_t_db_k: f64,
    pub cn0_dbhz: f64,
    /// Rate the Eb/N0 and margin are given for: the chosen fixed rate, else the lowest ladder rate.
    pub rate_bps: f64,
    pub ebn0_db: f64,
    pub margin_db: f64,
    /// The chosen fixed rate counts this step (margin met, inside a run of at least the dwell time).
    pub closed: bool,
    pub adaptive_scheme: Option<String>,
    pub adaptive_rate_bps: Option<f64>,
    pub rain_atmospheric_loss_db: Option<f64>,
    pub rain_system_temperature_k: Option<f64>,
    pub rain_cn0_dbhz: Option<f64>,
    pub rain_margin_db: Option<f64>,
}

/// Index of the option the per-step Eb/N0 is shown for: the chosen rate, else the lowest-threshold rate.
pub fn display_option(rates: &RateSet, p: &PassPlan) -> usize {
    p.clear.option.unwrap_or_else(|| {
        (0..rates.ladder.len())
            .min_by(|a, b| {
                rates.ladder[*a]
                    .threshold_cn0_dbhz
                    .total_cmp(&rates.ladder[*b].threshold_cn0_dbhz)
            })
            .unwrap_or(0)
    })
}

/// The time series rows of one pass.
pub fn step_rows(series: &PassSeries, rates: &RateSet) -> Vec<StepRow> {
    let p = series.plan;
    let k = display_option(rates, p);
    let o = &rates.ladder[k];
    let lr = crate::units::ratio_to_db(o.rate_bps);
    let margin = |c: f64| c - lr - o.required_ebn0_db - rates.implementation_loss_db;
    let closed_runs = series.chosen_runs;
    let opt = |x: f64, d: i32| if x.is_nan() { None } else { Some(round(x, d)) };
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
                azimuth_deg: round(s.azimuth_deg, 4),
                elevation_deg: round(s.elevation_deg, 4),
                range_km: round(s.range_km, 4),
                range_rate_km_s: round(s.range_rate_km_s, 6),
                doppler_hz: round(s.doppler_hz, 1),
                off_nadir_deg: round(s.off_nadir_deg, 4),
                eirp_dbw: round(s.eirp_dbw, 4),
                free_space_loss_db: round(s.free_space_loss_db, 4),
                atmospheric_loss_db: round(s.atmospheric_loss_db, 4),
                sky_temperature_k: round(s.sky_temperature_k, 3),
                antenna_temperature_k: round(s.antenna_temperature_k, 3),
                system_temperature_k: round(s.system_temperature_k, 3),
                g_over_t_db_k: round(s.g_over_t_db_k, 4),
                cn0_dbhz: round(s.cn0_dbhz, 4),
                rate_bps: o.rate_bps,
                ebn0_db: round(s.cn0_dbhz - lr, 4),
                margin_db: round(margin(s.cn0_dbhz), 4),
                closed: closed_runs.iter().any(|&(a, b)| a <= i && i <= b),
                adaptive_scheme: a.map(|x| x.scheme.clone()),
                adaptive_rate_bps: a.map(|x| round(x.rate_bps, 1)),
                rain_atmospheric_loss_db: opt(s.rain_atmospheric_loss_db, 4),
                rain_system_temperature_k: opt(s.rain_system_temperature_k, 3),
                rain_cn0_dbhz: opt(s.rain_cn0_dbhz, 4),
                rain_margin_db: opt(margin(s.rain_cn0_dbhz), 4),
            }
        })
        .collect()
}
