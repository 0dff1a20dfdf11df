//! What a plan adds up to: totals over the window, per UTC day, the usable mask per station and
//! rate, and the mask trade-off, computed from the passes. Typed and unrounded.

use super::mask::{MaskAccumulator, OpenSteps, MAX_MASK_DEG};
use super::prepare::{RateSet, StationModel};
use super::rate::OptionId;
use super::results::{
    DayTotals, MaskFailure, ModeResult, NetworkTotal, OptionSeries, PassPlan, RainTotals, Scope,
    Totals, TradeoffSeries, UsableMask, SUN_DEGRADED_RISE_DB,
};
use super::window::Window;
use chrono::NaiveDate;

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

/// Totals over the window; `by_rate` is each ladder rate's clear-sky volume summed over the
/// passes (in ladder order), bits.
pub fn totals(
    p: &[PassPlan],
    by_rate: &[f64],
    rain_planned: bool,
    network: NetworkTotal,
    days: f64,
) -> Totals {
    let mut single: Option<(OptionId, f64)> = None;
    for (k, &v) in by_rate.iter().enumerate() {
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
    let mut by_day: std::collections::BTreeMap<NaiveDate, DayTotals> = window
        .utc_dates()
        .into_iter()
        .map(|d| (d, empty_day(d)))
        .collect();
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

/// Usable masks per station and ladder rate, from the per-station mask accumulators: the strict
/// mask (the rate closes on every pass above it) and, from `passes` (the planned passes, with
/// their highest open steps in the same order), the robust mask: the lowest elevation above
/// which the rate closes on at least `share_percent` % of the station's passes, with the passes
/// that fail above it.
pub fn usable_masks(
    masks: &[MaskAccumulator],
    (passes, open): (&[PassPlan], &OpenSteps),
    stations: &[StationModel],
    rates: &RateSet,
    share_percent: f64,
) -> Vec<UsableMask> {
    let mut rows = Vec::new();
    for (i, st) in stations.iter().enumerate() {
        let acc = &masks[i];
        let station_mask = st.configured_min_elevation_deg;
        let own: Vec<(usize, &PassPlan)> = passes
            .iter()
            .enumerate()
            .filter(|(_, p)| p.station_index == i)
            .collect();
        for k in 0..rates.ladder.len() {
            // the strict mask by the same rounding rule as the robust one, so robust <= strict
            let usable_mask_deg = acc
                .usable_mask_deg(k, f64::NEG_INFINITY)
                .map(|h| round_up_mask_deg(h).max(station_mask));
            // a rate that never closes has no mask to fail above
            let robust =
                usable_mask_deg.and(robust_mask((&own, open), k, share_percent, station_mask));
            rows.push(UsableMask {
                station_index: i,
                option: OptionId(k),
                usable_mask_deg,
                robust_mask_deg: robust.as_ref().map(|r| r.0),
                failures: robust.map(|r| r.1).unwrap_or_default(),
                station_mask_deg: station_mask,
                passes: acc.passes,
                passes_closing: acc.passes_closing[k],
            });
        }
    }
    rows
}

/// The resolution of both usable masks (strict and robust), deg.
pub const ROBUST_MASK_STEP_DEG: f64 = 0.1;

/// The one rounding rule of the usable masks: an elevation rounded up to
/// [`ROBUST_MASK_STEP_DEG`] (a mask is a bound the rate closes above, so it rounds up). Applied to
/// the strict mask (the highest step of any pass where the rate does not count) and the robust one
/// (a quantile of the same per-pass elevations, never above their maximum), it keeps
/// robust <= strict. The 1e-9 step guard keeps an elevation already on the grid (14.8 computed as
/// 14.800000000000001) from moving up a step.
pub fn round_up_mask_deg(elevation_deg: f64) -> f64 {
    let steps = (elevation_deg / ROBUST_MASK_STEP_DEG - 1e-9).ceil();
    // whole tenths, then back to degrees with one division (no accumulated error)
    steps / (1.0 / ROBUST_MASK_STEP_DEG)
}

/// The robust mask of ladder option `k` over one station's passes and the passes failing above
/// it; `None` without passes. A pass fails above elevation M when its highest step where the
/// rate does not count lies above M; the robust mask is the lowest M (not below the station's
/// mask) that at least `share_percent` % of the passes do not fail above, rounded up by
/// [`round_up_mask_deg`] (so a pass that opens the rate a hundredth of a degree above its
/// neighbours is not listed as failing). A pass fails when its elevation, rounded by the same
/// rule, lies above the mask: with the robust mask equal to the strict one, no pass fails.
fn robust_mask(
    (passes, open): (&[(usize, &PassPlan)], &OpenSteps),
    k: usize,
    share_percent: f64,
    station_mask_deg: f64,
) -> Option<(f64, Vec<MaskFailure>)> {
    if passes.is_empty() {
        return None;
    }
    let mut highest: Vec<f64> = passes
        .iter()
        .map(|&(j, _)| open.highest_open_elevation_deg(j, k))
        .collect();
    highest.sort_by(f64::total_cmp);
    // the smallest count of passes that makes the share, at least one
    let need = ((share_percent / 100.0 * passes.len() as f64) - 1e-9)
        .ceil()
        .max(1.0) as usize;
    let quantile = highest[need.min(highest.len()) - 1];
    let mask_deg = round_up_mask_deg(quantile).max(station_mask_deg);
    let failures = passes
        .iter()
        .filter_map(|&(j, p)| {
            let step = open.step(j, k)?;
            (round_up_mask_deg(step.elevation_deg) > mask_deg).then_some(MaskFailure {
                pass_number: p.number,
                station_index: p.station_index,
                time: crate::timefmt::add_seconds(&p.pass.aos, step.t_s),
                step,
            })
        })
        .collect();
    Some((mask_deg, failures))
}

/// The mask trade-off for each station and for all stations together, masks 0..=40 deg in
/// `step_deg` steps, from per-station accumulators (normally [`super::Plan::tradeoff_masks`]).
pub fn tradeoff(
    masks: &[MaskAccumulator],
    rates: &RateSet,
    days: f64,
    step_deg: usize,
) -> Vec<TradeoffSeries> {
    let mut all = MaskAccumulator::new(rates.ladder.len());
    for m in masks {
        all.merge(m);
    }
    let scopes = masks
        .iter()
        .enumerate()
        .map(|(i, m)| (Scope::Station(i), m))
        .chain(std::iter::once((Scope::AllStations, &all)));
    let masks_deg: Vec<usize> = (0..=MAX_MASK_DEG).step_by(step_deg.max(1)).collect();
    scopes
        .map(|(scope, acc)| TradeoffSeries {
            scope,
            contact_s_per_day: masks_deg
                .iter()
                .map(|&m| acc.contact_above_s(m) / days)
                .collect(),
            volume_bits_per_day: (0..rates.ladder.len())
                .map(|k| OptionSeries {
                    option: OptionId(k),
                    values: masks_deg
                        .iter()
                        .map(|&m| acc.volume_above_bits(k, m) / days)
                        .collect(),
                })
                .collect(),
            masks_deg: masks_deg.clone(),
        })
        .collect()
}

/// The note for a station with no pass in the window: the satellite does not rise above its
/// mask, or (`cut`) the propagation stopped first. One owner for `passes` and `plan`.
pub fn no_pass_note(satellite: &str, station: &str, cut: bool) -> String {
    if cut {
        format!("{satellite} has no pass over {station} before the propagation stops")
    } else {
        format!("{satellite} does not rise above the mask of {station} in the window")
    }
}

/// Notes for the stations with no pass in a plan (their rows would otherwise read only as
/// "never closes, 0 of 0").
pub fn no_pass_notes(
    satellite: &str,
    passes: &[PassPlan],
    stations: &[StationModel],
    stopped: &[Option<crate::orbit::PropagationError>],
) -> Vec<String> {
    stations
        .iter()
        .enumerate()
        .filter(|(i, _)| !passes.iter().any(|p| p.station_index == *i))
        .map(|(i, s)| {
            let cut = stopped.get(i).is_some_and(|e| e.is_some());
            no_pass_note(satellite, &s.station.name, cut)
        })
        .collect()
}

/// Most passes [`sun_note`] names one by one; beyond it the note gives the count and the worst.
pub const SUN_NOTE_LISTED: usize = NOTE_LISTED;

/// What the Sun did to the window's passes, in one line: the passes where it raised the system
/// noise temperature by more than [`SUN_DEGRADED_RISE_DB`] ([`degraded_note`]), else its closest
/// approach to a beam. `None` for a plan without passes, or where the Sun is not modelled.
pub fn sun_note(passes: &[PassPlan], stations: &[StationModel]) -> Option<String> {
    let name = |p: &PassPlan| stations[p.station_index].station.name.as_str();
    let degraded: Vec<SunDegraded> = passes
        .iter()
        .filter(|p| p.bodies.sun_degraded_s > 0.0)
        .map(|p| SunDegraded {
            number: p.number,
            station: name(p),
            degraded_s: p.bodies.sun_degraded_s,
            max_sun_noise_k: p.bodies.max_sun_noise_k,
        })
        .collect();
    if !degraded.is_empty() {
        return Some(degraded_note(degraded));
    }
    // Where the Sun's noise is not modelled (the frequency is outside its figure: a warning says
    // so) its closest approach would read as harmless: such stations' passes are left out.
    let modelled = |p: &&PassPlan| !stations[p.station_index].bodies.warnings().sun_not_modelled;
    let closest = passes
        .iter()
        .filter(modelled)
        .filter_map(|p| p.bodies.min_sun_separation_deg.map(|d| (d, p)))
        .min_by(|a, b| a.0.total_cmp(&b.0))?;
    let (d, p) = closest;
    Some(format!(
        "Sun: raises no step's system noise temperature by {SUN_DEGRADED_RISE_DB} dB; closest to a beam {d:.1} deg (pass {}, {}), adding at most {:.2} K",
        p.number,
        name(p),
        p.bodies.max_sun_noise_k
    ))
}

/// Most passes a note names one by one ([`sun_note`], [`adaptive_note`]).
pub const NOTE_LISTED: usize = 5;

/// The adaptive mode delivering nothing on passes where a fixed rate closes, in one line: its
/// easiest scheme needs more C/N0 than the ladder's easiest rate (another waveform, README "How
/// the plan decides"), so its 0 beside a fixed volume is expected. Names up to [`NOTE_LISTED`]
/// passes (beyond, the first of them and the count) and their stations. `None` when no such
/// pass (or no option).
pub fn adaptive_note(
    passes: &[PassPlan],
    stations: &[StationModel],
    rates: &super::prepare::RateSet,
) -> Option<String> {
    let easiest = |o: &[super::rate::RateOption]| {
        o.iter()
            .min_by(|a, b| a.threshold_cn0_dbhz.total_cmp(&b.threshold_cn0_dbhz))
            .cloned()
    };
    let (adaptive, fixed) = (easiest(&rates.adaptive)?, easiest(&rates.ladder)?);
    let shut: Vec<&PassPlan> = passes
        .iter()
        .filter(|p| p.clear.volume_bits > 0.0 && p.clear.adaptive_volume_bits == 0.0)
        .collect();
    let mut names: Vec<&str> = Vec::new();
    for p in &shut {
        let name = stations[p.station_index].station.name.as_str();
        if !names.contains(&name) {
            names.push(name);
        }
    }
    let numbers: Vec<String> = (shut.iter().take(NOTE_LISTED))
        .map(|p| p.number.to_string())
        .collect();
    let which = match shut.len() {
        0 => return None,
        1 => format!("pass {}", numbers[0]),
        n if n <= NOTE_LISTED => format!("passes {}", and_list(&numbers)),
        n => format!("{n} passes (the first {})", and_list(&numbers)),
    };
    let rate = crate::engfmt::rate;
    Some(format!(
        "adaptive: 0 bits in {which} at {} although a fixed rate closes there: its easiest scheme ({}, {}) needs {:.1} dBHz C/N0 with the margin, {:.1} dB more than the ladder's easiest ({}, {}, {:.1} dBHz)",
        names.join(", "),
        adaptive.scheme,
        rate(adaptive.rate_bps),
        adaptive.threshold_cn0_dbhz,
        adaptive.threshold_cn0_dbhz - fixed.threshold_cn0_dbhz,
        fixed.scheme,
        rate(fixed.rate_bps),
        fixed.threshold_cn0_dbhz,
    ))
}

/// `a`, `a and b`, `a, b and c`.
fn and_list(items: &[String]) -> String {
    match items {
        [] => String::new(),
        [one] => one.clone(),
        [rest @ .., last] => format!("{} and {last}", rest.join(", ")),
    }
}

/// A pass in which the Sun degrades steps, for [`degraded_note`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SunDegraded<'a> {
    pub number: usize,
    pub station: &'a str,
    pub degraded_s: f64,
    pub max_sun_noise_k: f64,
}

/// The Sun note of passes it degrades (in pass order): each of them up to [`SUN_NOTE_LISTED`];
/// beyond it their count and time in all, then the [`SUN_NOTE_LISTED`] of highest noise (in pass
/// order), so that a year's note stays one readable line.
pub fn degraded_note(mut degraded: Vec<SunDegraded>) -> String {
    let count = degraded.len();
    let total_s: f64 = degraded.iter().map(|p| p.degraded_s).sum();
    if count > SUN_NOTE_LISTED {
        degraded.sort_by(|a, b| b.max_sun_noise_k.total_cmp(&a.max_sun_noise_k));
        degraded.truncate(SUN_NOTE_LISTED);
        degraded.sort_by_key(|p| p.number);
    }
    let listed: Vec<String> = degraded
        .iter()
        .map(|p| {
            format!(
                "pass {} ({}, {:.0} s, up to {:.0} K)",
                p.number, p.station, p.degraded_s, p.max_sun_noise_k
            )
        })
        .collect();
    let rise = format!(
        "Sun: raises the system noise temperature by more than {SUN_DEGRADED_RISE_DB} dB in"
    );
    if count > SUN_NOTE_LISTED {
        format!(
            "{rise} {count} passes ({total_s:.0} s in all; `sun-transits` lists each), the highest in {}",
            listed.join(", ")
        )
    } else {
        format!("{rise} {}", listed.join(", "))
    }
}

#[cfg(test)]
mod tests {
    use super::{degraded_note, round_up_mask_deg, SunDegraded, SUN_NOTE_LISTED};

    fn degraded(number: usize, degraded_s: f64, max_sun_noise_k: f64) -> SunDegraded<'static> {
        SunDegraded {
            number,
            station: "Alpha",
            degraded_s,
            max_sun_noise_k,
        }
    }

    /// Up to five degraded passes are each named in pass order; beyond five, the note gives
    /// their count and time in all and names the five of highest noise, still in pass order.
    #[test]
    fn sun_note_names_each_pass_up_to_five_then_the_worst() {
        let few: Vec<_> = (1..=SUN_NOTE_LISTED)
            .map(|k| degraded(k, 2.0, 10.0 * k as f64))
            .collect();
        let note = degraded_note(few);
        assert!(note.ends_with("in pass 1 (Alpha, 2 s, up to 10 K), pass 2 (Alpha, 2 s, up to 20 K), pass 3 (Alpha, 2 s, up to 30 K), pass 4 (Alpha, 2 s, up to 40 K), pass 5 (Alpha, 2 s, up to 50 K)"), "{note}");
        let noise_k = [30.0, 900.0, 5.0, 700.0, 60.0, 800.0, 1.0, 1000.0];
        let many: Vec<_> = noise_k
            .iter()
            .enumerate()
            .map(|(i, &k)| degraded(10 * (i + 1), 3.0, k))
            .collect();
        let note = degraded_note(many);
        assert!(note.contains("in 8 passes (24 s in all;"), "{note}");
        assert!(note.ends_with("the highest in pass 20 (Alpha, 3 s, up to 900 K), pass 40 (Alpha, 3 s, up to 700 K), pass 50 (Alpha, 3 s, up to 60 K), pass 60 (Alpha, 3 s, up to 800 K), pass 80 (Alpha, 3 s, up to 1000 K)"), "{note}");
    }

    /// The one rounding rule of the usable masks: up to the next 0.1 deg, an elevation already on
    /// the grid unchanged (also when computed with floating-point noise).
    #[test]
    fn masks_round_up_to_a_tenth() {
        for (el, want) in [
            (14.81, 14.9),
            (14.8, 14.8),
            (14.8 + 2e-15, 14.8),
            (14.8 - 2e-15, 14.8),
            (5.76, 5.8),
            (12.87, 12.9),
            (0.0, 0.0),
            (-0.04, 0.0),
        ] {
            assert_eq!(round_up_mask_deg(el), want, "{el}");
        }
        assert_eq!(round_up_mask_deg(f64::NEG_INFINITY), f64::NEG_INFINITY);
    }
}
