//! What a plan adds up to: totals over the window, per UTC day, the usable mask per station and
//! rate, and the mask trade-off. Typed and unrounded; [`crate::report`] rounds when it serializes.

use super::mask::{MaskAccumulator, MAX_MASK_DEG};
use super::prepare::{RateSet, StationModel};
use super::{ModeResult, NetworkTotal, OptionId, PassPlan, Window};
use chrono::NaiveDate;

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
    pub station_mask_deg: f64,
    pub passes: usize,
    pub passes_closing: usize,
}

/// What a trade-off or a total covers: one station, or every station together.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Scope {
    Station(usize),
    /// All stations together (the sum; overlapping passes counted at each station).
    Network,
}

impl Scope {
    /// The name in outputs: the station's name, or "all stations".
    pub fn label(&self, stations: &[StationModel]) -> String {
        match self {
            Scope::Station(i) => stations[*i].station.name.clone(),
            Scope::Network => NETWORK_LABEL.to_string(),
        }
    }
}

/// The one spelling of the all-stations scope in outputs.
pub const NETWORK_LABEL: &str = "all stations";

/// One point of the mask trade-off.
#[derive(Debug, Clone, PartialEq)]
pub struct TradeoffPoint {
    pub scope: Scope,
    pub mask_deg: usize,
    pub contact_s_per_day: f64,
    pub option: OptionId,
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

/// Totals over the window.
pub fn totals(
    p: &[PassPlan],
    rates: &RateSet,
    rain_planned: bool,
    network: NetworkTotal,
    days: f64,
) -> Totals {
    let mut single: Option<(OptionId, f64)> = None;
    for k in 0..rates.ladder.len() {
        let v: f64 = p.iter().map(|x| x.clear.volume_by_rate_bits[k]).sum();
        if v > 0.0 && single.is_none_or(|(_, b)| v > b) {
            single = Some((OptionId(k), v));
        }
    }
    let rain = rain_planned.then(|| RainTotals {
        passes_closing: p
            .iter()
            .filter(|x| x.rain.as_ref().is_some_and(|r| r.option.is_some()))
            .count(),
        volume_bits: sum_mode(p, |m| m.volume_bits, true),
        adaptive_volume_bits: sum_mode(p, |m| m.adaptive_volume_bits, true),
        shannon_volume_bits: sum_mode(p, |m| m.shannon_volume_bits, true),
    });
    Totals {
        passes: p.len(),
        passes_closing: p.iter().filter(|x| x.clear.option.is_some()).count(),
        contact_s: p.iter().map(|x| x.pass.duration_s()).sum::<f64>() + 0.0,
        closed_s: sum_mode(p, |m| m.closed_s, false),
        volume_bits: sum_mode(p, |m| m.volume_bits, false),
        adaptive_volume_bits: sum_mode(p, |m| m.adaptive_volume_bits, false),
        shannon_volume_bits: sum_mode(p, |m| m.shannon_volume_bits, false),
        network,
        single_rate: single,
        rain,
        days,
    }
}

/// Per-day totals: every UTC day of the window has a row, days without passes included.
pub fn days(p: &[PassPlan], window: &Window, rain_planned: bool) -> Vec<DayTotals> {
    let empty_day = |date: NaiveDate| DayTotals {
        date,
        passes: 0,
        contact_s: 0.0,
        volume_bits: 0.0,
        adaptive_volume_bits: 0.0,
        shannon_volume_bits: 0.0,
        rain_volume_bits: rain_planned.then_some(0.0),
    };
    let mut by_day = std::collections::BTreeMap::new();
    let last = (window.end() - chrono::Duration::microseconds(1)).date_naive();
    let mut d = window.start().date_naive();
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
    by_day.into_values().collect()
}

/// Usable masks per station and ladder rate, from the per-station mask accumulators.
pub fn usable_masks(
    masks: &[MaskAccumulator],
    stations: &[StationModel],
    rates: &RateSet,
) -> Vec<UsableMask> {
    let mut rows = Vec::new();
    for (i, st) in stations.iter().enumerate() {
        let acc = &masks[i];
        let station_mask = st.configured_min_elevation_deg;
        for k in 0..rates.ladder.len() {
            rows.push(UsableMask {
                station_index: i,
                option: OptionId(k),
                usable_mask_deg: acc.usable_mask_deg(k, station_mask),
                station_mask_deg: station_mask,
                passes: acc.passes,
                passes_closing: acc.passes_closing[k],
            });
        }
    }
    rows
}

/// The mask trade-off for each station and for all stations together, masks 0..=40 deg in
/// `step_deg` steps, from per-station accumulators (normally [`super::Plan::tradeoff_masks`]).
pub fn tradeoff(
    masks: &[MaskAccumulator],
    rates: &RateSet,
    days: f64,
    step_deg: usize,
) -> Vec<TradeoffPoint> {
    let mut all = MaskAccumulator::new(rates.ladder.len());
    for m in masks {
        all.merge(m);
    }
    let scopes = masks
        .iter()
        .enumerate()
        .map(|(i, m)| (Scope::Station(i), m))
        .chain(std::iter::once((Scope::Network, &all)));
    let mut rows = Vec::new();
    for (scope, acc) in scopes {
        for mask in (0..=MAX_MASK_DEG).step_by(step_deg.max(1)) {
            for k in 0..rates.ladder.len() {
                rows.push(TradeoffPoint {
                    scope,
                    mask_deg: mask,
                    contact_s_per_day: acc.contact_above_s(mask) / days,
                    option: OptionId(k),
                    volume_bits_per_day: acc.volume_above_bits(k, mask) / days,
                });
            }
        }
    }
    rows
}
