//! Wire format of `compare`: two plans of one window side by side, B against A, per pass and in
//! total (public interface; field names are stable and documented in the README). Passes are
//! matched by their identifier ([`crate::report::pass_id`]), which does not depend on the window
//! or on the numbering; a pass found in one run only (a mask or a station changed) is listed with
//! the other side empty and counts as zero in the differences. Differences are B - A, from the
//! unrounded results; rounding happens here.

use crate::plan::{ModeResult, PassPlan, Plan, Planner};
use crate::report::{pass_id, round};
use crate::timefmt::{format_ms, seconds_between};
use chrono::{DateTime, Utc};
use serde::Serialize;

/// One plan of the comparison: the planner that made it and its result.
#[derive(Clone, Copy)]
pub struct Side<'a> {
    pub planner: &'a Planner,
    pub plan: &'a Plan,
}

/// One pass in either run, with its figures in A and B and their differences (B - A).
#[derive(Debug, Clone, Serialize, PartialEq, Default)]
pub struct PassDiffRow {
    pub pass_id: String,
    pub station: String,
    /// `both`, `a` or `b`: the runs that hold the pass.
    pub in_runs: String,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub a_rate_bps: Option<f64>,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub b_rate_bps: Option<f64>,
    pub a_scheme: Option<String>,
    pub b_scheme: Option<String>,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub a_volume_bits: Option<f64>,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub b_volume_bits: Option<f64>,
    /// Fixed-rate volume, B - A (a pass missing from a run counts 0), bits.
    #[serde(serialize_with = "crate::report::whole")]
    pub diff_volume_bits: f64,
    /// Adaptive volume, B - A, bits.
    #[serde(serialize_with = "crate::report::whole")]
    pub diff_adaptive_volume_bits: f64,
    pub a_closes_from: Option<String>,
    pub b_closes_from: Option<String>,
    /// When the chosen rate starts closing, B - A, s (negative: B closes earlier).
    pub diff_closes_from_s: Option<f64>,
    pub a_closes_until: Option<String>,
    pub b_closes_until: Option<String>,
    /// When the chosen rate stops closing, B - A, s.
    pub diff_closes_until_s: Option<f64>,
    /// The margin at the pass's best step at its chosen rate (at the lowest-threshold ladder rate
    /// when none closes), dB.
    pub a_peak_margin_db: Option<f64>,
    pub b_peak_margin_db: Option<f64>,
    pub diff_peak_margin_db: Option<f64>,
    /// The highest C/N0 of the pass, B - A, dB (independent of the rate chosen).
    pub diff_peak_cn0_db: Option<f64>,
}

/// Totals of both runs and their differences (B - A).
#[derive(Debug, Clone, Serialize, PartialEq)]
pub struct TotalsDiffRow {
    pub a_passes: usize,
    pub b_passes: usize,
    /// Passes in both runs (matched by identifier).
    pub passes_matched: usize,
    pub a_passes_closing: usize,
    pub b_passes_closing: usize,
    #[serde(serialize_with = "crate::report::whole")]
    pub a_volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub b_volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub diff_volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub a_adaptive_volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub b_adaptive_volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub diff_adaptive_volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub a_network_volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub b_network_volume_bits: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub diff_network_volume_bits: f64,
    /// Passes whose chosen rate differs (in both runs).
    pub passes_rate_changed: usize,
}

/// The whole comparison.
#[derive(Debug, Clone, Serialize, PartialEq)]
pub struct Comparison {
    pub window_start: String,
    pub window_end: String,
    pub passes: Vec<PassDiffRow>,
    pub totals: TotalsDiffRow,
}

/// What one pass of one run shows: (rate, scheme, peak margin, peak C/N0) of the clear sky.
struct Figures {
    rate_bps: Option<f64>,
    scheme: Option<String>,
    peak_margin_db: f64,
    peak_cn0_dbhz: f64,
}

fn figures(planner: &Planner, m: &ModeResult) -> Figures {
    let rates = planner.rates();
    // The option whose Eb/N0 `max_ebn0_db` is: the chosen one, else the lowest threshold's.
    let shown = m.option.map_or_else(|| rates.lowest_threshold().0, |o| o.0);
    let o = &rates.ladder[shown];
    let peak_cn0_dbhz = m.max_ebn0_db + crate::units::ratio_to_db(o.rate_bps);
    let chosen = m.option.map(|k| &rates.ladder[k.0]);
    Figures {
        rate_bps: chosen.map(|c| c.rate_bps),
        scheme: chosen.map(|c| c.scheme.clone()),
        peak_margin_db: o.margin_db(peak_cn0_dbhz),
        peak_cn0_dbhz,
    }
}

/// A pass of one run, with its identifier and the time it sorts by.
struct Keyed<'a> {
    id: String,
    station: String,
    time: DateTime<Utc>,
    pass: &'a PassPlan,
}

fn keyed<'a>(s: Side<'a>) -> Vec<Keyed<'a>> {
    s.plan
        .passes
        .iter()
        .map(|p| {
            let station = s.planner.stations()[p.station_index].station.name.clone();
            Keyed {
                id: pass_id(&station, &p.pass),
                station,
                time: p.pass.full_tca,
                pass: p,
            }
        })
        .collect()
}

/// Compare plan B with plan A, pass by pass and in total.
pub fn compare(a: Side, b: Side) -> Comparison {
    let (ka, kb) = (keyed(a), keyed(b));
    let mut ids: Vec<(DateTime<Utc>, &str)> = ka
        .iter()
        .chain(kb.iter().filter(|k| !ka.iter().any(|x| x.id == k.id)))
        .map(|k| (k.time, k.id.as_str()))
        .collect();
    ids.sort();
    let passes: Vec<PassDiffRow> = ids
        .iter()
        .map(|(_, id)| pass_row(a, b, find(&ka, id), find(&kb, id)))
        .collect();
    let (ta, tb) = (&a.plan.totals, &b.plan.totals);
    let r0 = |x: f64| x.round();
    let totals = TotalsDiffRow {
        a_passes: ta.passes,
        b_passes: tb.passes,
        passes_matched: passes.iter().filter(|p| p.in_runs == "both").count(),
        a_passes_closing: ta.passes_closing,
        b_passes_closing: tb.passes_closing,
        a_volume_bits: r0(ta.volume_bits),
        b_volume_bits: r0(tb.volume_bits),
        diff_volume_bits: r0(tb.volume_bits - ta.volume_bits),
        a_adaptive_volume_bits: r0(ta.adaptive_volume_bits),
        b_adaptive_volume_bits: r0(tb.adaptive_volume_bits),
        diff_adaptive_volume_bits: r0(tb.adaptive_volume_bits - ta.adaptive_volume_bits),
        a_network_volume_bits: r0(ta.network.volume_bits),
        b_network_volume_bits: r0(tb.network.volume_bits),
        diff_network_volume_bits: r0(tb.network.volume_bits - ta.network.volume_bits),
        passes_rate_changed: passes
            .iter()
            .filter(|p| p.in_runs == "both" && p.a_rate_bps != p.b_rate_bps)
            .count(),
    };
    Comparison {
        window_start: format_ms(&a.plan.window.start()),
        window_end: format_ms(&a.plan.window.end()),
        passes,
        totals,
    }
}

fn find<'x>(list: &'x [Keyed<'x>], id: &str) -> Option<&'x Keyed<'x>> {
    list.iter().find(|k| k.id == id)
}

/// One row: the figures of each side that holds the pass, and the differences.
fn pass_row(a: Side, b: Side, pa: Option<&Keyed>, pb: Option<&Keyed>) -> PassDiffRow {
    let fa = pa.map(|k| figures(a.planner, &k.pass.clear));
    let fb = pb.map(|k| figures(b.planner, &k.pass.clear));
    let any = pa.or(pb).expect("a pass of one run at least");
    let both = |f: &dyn Fn(&Keyed, &Keyed) -> Option<f64>| match (pa, pb) {
        (Some(x), Some(y)) => f(x, y),
        _ => None,
    };
    let vol = |k: Option<&Keyed>| k.map_or(0.0, |k| k.pass.clear.volume_bits);
    let adaptive = |k: Option<&Keyed>| k.map_or(0.0, |k| k.pass.clear.adaptive_volume_bits);
    let closing = |k: Option<&Keyed>| k.and_then(|k| k.pass.clear.closing);
    let from = |k: Option<&Keyed>| closing(k).map(|c| format_ms(&c.from.time));
    let until = |k: Option<&Keyed>| closing(k).map(|c| format_ms(&c.until.time));
    let r3 = |x: f64| round(x, 3);
    PassDiffRow {
        pass_id: any.id.clone(),
        station: any.station.clone(),
        in_runs: match (pa, pb) {
            (Some(_), Some(_)) => "both",
            (Some(_), None) => "a",
            _ => "b",
        }
        .into(),
        a_rate_bps: fa.as_ref().and_then(|f| f.rate_bps),
        b_rate_bps: fb.as_ref().and_then(|f| f.rate_bps),
        a_scheme: fa.as_ref().and_then(|f| f.scheme.clone()),
        b_scheme: fb.as_ref().and_then(|f| f.scheme.clone()),
        a_volume_bits: pa.map(|_| vol(pa).round()),
        b_volume_bits: pb.map(|_| vol(pb).round()),
        diff_volume_bits: (vol(pb) - vol(pa)).round(),
        diff_adaptive_volume_bits: (adaptive(pb) - adaptive(pa)).round(),
        a_closes_from: from(pa),
        b_closes_from: from(pb),
        diff_closes_from_s: both(&|x, y| {
            let (cx, cy) = (x.pass.clear.closing?, y.pass.clear.closing?);
            Some(r3(seconds_between(&cx.from.time, &cy.from.time)))
        }),
        a_closes_until: until(pa),
        b_closes_until: until(pb),
        diff_closes_until_s: both(&|x, y| {
            let (cx, cy) = (x.pass.clear.closing?, y.pass.clear.closing?);
            Some(r3(seconds_between(&cx.until.time, &cy.until.time)))
        }),
        a_peak_margin_db: fa.as_ref().map(|f| r3(f.peak_margin_db)),
        b_peak_margin_db: fb.as_ref().map(|f| r3(f.peak_margin_db)),
        diff_peak_margin_db: fa
            .as_ref()
            .zip(fb.as_ref())
            .map(|(x, y)| r3(y.peak_margin_db - x.peak_margin_db)),
        diff_peak_cn0_db: fa
            .as_ref()
            .zip(fb.as_ref())
            .map(|(x, y)| round(y.peak_cn0_dbhz - x.peak_cn0_dbhz, 4)),
    }
}
