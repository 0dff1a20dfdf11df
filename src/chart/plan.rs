//! Charts of a plan: converts the planner's typed results into the chart inputs of [`super::data`]
//! and draws them. [`ChartSink`] draws each pass chart as its pass is planned (from the worker
//! threads) and keeps the sky tracks; [`window_charts`] then draws the sky charts (per station and
//! UTC day), the mask charts (per station and all stations) and the plan summary.

use super::{
    draw_mask, draw_pass, draw_sky, draw_summary, mask_file_name, pass_file_name, save_in,
    sky_file_name, sky_pass_file_name, summary_file_name, ChartError, ChartFormat, DayTotals,
    MaskChartData, MaskRateSeries, PassChartData, PassChartRain, PassChartSample, SkyChartData,
    SkyPass, SkyPoint, SummaryBar, SummaryChartData,
};
use crate::plan::inputs::satellite_name;
use crate::plan::summary::tradeoff;
use crate::plan::Scope;
use crate::plan::{PassSeries, PassSink, Plan, Planner};
use crate::report::WriteMode;
use chrono::NaiveDate;
use std::collections::BTreeMap;
use std::path::{Path, PathBuf};
use std::sync::Mutex;

/// Sky-track points kept per pass (every 5 s is plenty for a polar plot).
const SKY_POINT_STEP_S: f64 = 5.0;

/// Which window charts to draw.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct WindowCharts {
    pub sky: bool,
    pub mask: bool,
    pub summary: bool,
}

/// Draws pass charts as passes are planned and keeps every pass's sky track for the window charts.
pub struct ChartSink<'a> {
    planner: &'a Planner,
    dir: &'a Path,
    format: ChartFormat,
    /// Draw the pass charts (else only keep the sky tracks).
    passes: bool,
    /// Only this pass number.
    only: Option<usize>,
    /// How the chart files are written ([`ChartSink::staged`]).
    mode: WriteMode,
    sky: Mutex<BTreeMap<usize, Vec<SkyPoint>>>,
}

impl<'a> ChartSink<'a> {
    pub fn new(
        planner: &'a Planner,
        dir: &'a Path,
        format: ChartFormat,
        passes: bool,
        only: Option<usize>,
    ) -> Self {
        ChartSink {
            planner,
            dir,
            format,
            passes,
            only,
            mode: WriteMode::Atomic,
            sky: Mutex::new(BTreeMap::new()),
        }
    }

    /// Write the charts as the files of a staging folder ([`WriteMode::Staged`]): `dir` is
    /// [`crate::report::Staging::path`], whose commit flushes them.
    pub fn staged(mut self) -> Self {
        self.mode = WriteMode::Staged;
        self
    }
}

impl PassSink for ChartSink<'_> {
    type Error = ChartError;
    fn pass(&self, s: &PassSeries<'_>) -> Result<(), ChartError> {
        if self.only.is_some_and(|n| n != s.plan.number) {
            return Ok(());
        }
        let points = sky_points(self.planner, s);
        self.sky
            .lock()
            .unwrap_or_else(|e| e.into_inner())
            .insert(s.plan.number, points);
        if self.passes {
            let data = pass_chart_data(self.planner, s);
            let path = self.dir.join(pass_file_name(
                s.plan.number,
                s.pass_count,
                &data.pass_id,
                self.format,
            ));
            save_in(&path, &draw_pass(&data, self.format)?, self.mode)?;
        }
        Ok(())
    }
}

/// The warnings every chart of a plan prints under its caution: the element-age warning when the
/// window lies more than a week from the element epoch (the CSV and JSON carry every warning).
pub fn chart_warnings(planner: &Planner) -> Vec<String> {
    let w = planner.window();
    crate::plan::inputs::element_age_warning(planner.elements(), w.start(), w.end())
        .into_iter()
        .collect()
}

/// The element-age warning of a fleet's charts: one satellite's warning as [`chart_warnings`]
/// gives it; of several, one line that counts them and gives the oldest's (a footer of a
/// warning per satellite grew by two lines a satellite; the CSV and JSON files carry each).
pub fn fleet_chart_warnings(planners: &[&Planner]) -> Vec<String> {
    use crate::plan::inputs::{age_warning, ElementAge};
    let aged: Vec<(f64, String)> = planners
        .iter()
        .filter_map(|p| {
            let (set, w) = (p.elements(), p.window());
            let age = ElementAge::of(set, w.start(), w.end());
            Some((age.days, age_warning(set, &age)?))
        })
        .collect();
    let oldest = aged
        .iter()
        .fold(None, |o: Option<&(f64, String)>, a| match o {
            Some(b) if b.0 >= a.0 => Some(b),
            _ => Some(a),
        });
    match (aged.len(), oldest) {
        (n, Some((_, text))) if n > 1 => vec![format!(
            "the element sets of {n} satellites are old for this window (each warned in the CSV and JSON files); the oldest: {text}"
        )],
        _ => aged.into_iter().map(|(_, text)| text).collect(),
    }
}

/// The pass chart input of one pass.
pub fn pass_chart_data(planner: &Planner, s: &PassSeries) -> PassChartData {
    let plan = s.plan;
    let rates = planner.rates();
    let (_, o) = rates.display_option(plan.clear.option);
    let chosen = plan.clear.option.map(|k| &rates.ladder[k.0]);
    let st = &planner.stations()[plan.station_index];
    let samples = s
        .steps
        .iter()
        .enumerate()
        .map(|(i, x)| PassChartSample {
            t_s: x.t_s,
            elevation_deg: x.elevation_deg,
            azimuth_deg: x.azimuth_deg,
            range_km: x.range_km,
            ebn0_db: o.ebn0_db(x.cn0_dbhz),
            margin_db: o.margin_db(x.cn0_dbhz),
            closed: s.counted(i),
            tracked: !x.untracked,
            adaptive_rate_bps: s
                .adaptive
                .get(i)
                .copied()
                .flatten()
                .map(|j| rates.adaptive[j as usize].rate_bps),
            system_temperature_k: x.system_temperature_k,
            sky_noise_k: x.sky_noise_k,
            ground_noise_k: x.ground_noise_k,
            man_made_noise_k: x.man_made_noise_k,
            sun_noise_k: x.sun_noise_k,
            moon_noise_k: x.moon_noise_k,
            receiver_noise_k: x.receiver_noise_k,
            atmospheric_loss_db: x.atmospheric_loss_db,
            mask_elevation_deg: st
                .mask
                .limit_deg(x.azimuth_deg)
                .max(st.configured_min_elevation_deg),
            rain: x.rain.map(|r| PassChartRain {
                ebn0_db: o.ebn0_db(r.cn0_dbhz),
                system_temperature_k: r.system_temperature_k,
                atmospheric_loss_db: r.atmospheric_loss_db,
            }),
        })
        .collect();
    PassChartData {
        warnings: chart_warnings(planner),
        satellite: satellite_name(planner.elements()),
        station: planner.stations()[plan.station_index].station.name.clone(),
        pass_number: plan.number,
        pass_id: crate::report::pass_id(&st.station.name, &plan.pass),
        starts_before_window: plan.pass.starts_before_window,
        ends_after_window: plan.pass.ends_after_window,
        aos: plan.pass.aos,
        tca: plan.pass.tca,
        los: plan.pass.los,
        max_elevation_deg: plan.pass.max_elevation_deg,
        rate_bps: chosen.map(|c| c.rate_bps),
        scheme: chosen.map(|c| c.scheme.clone()),
        volume_bits: plan.clear.volume_bits,
        adaptive_volume_bits: plan.clear.adaptive_volume_bits,
        required_ebn0_db: Some(o.required_ebn0_db + o.implementation_loss_db),
        required_margin_db: rates.required_margin_db,
        closes_from: plan.clear.closing.map(|c| c.from.time),
        closes_until: plan.clear.closing.map(|c| c.until.time),
        rain_exceedance_percent: plan.rain.as_ref().and(planner.exceedance_percent()),
        rain_rate_bps: plan
            .rain
            .as_ref()
            .and_then(|r| r.option)
            .map(|k| rates.ladder[k.0].rate_bps),
        rain_volume_bits: plan.rain.as_ref().map(|r| r.volume_bits),
        samples,
    }
}

fn sky_points(planner: &Planner, s: &PassSeries) -> Vec<SkyPoint> {
    let (_, o) = planner.rates().display_option(s.plan.clear.option);
    let mut out = Vec::new();
    let mut next_t = 0.0;
    let last = s.steps.len().saturating_sub(1);
    let mut untracked = false;
    for (i, x) in s.steps.iter().enumerate() {
        // every step where the mount loses or regains the satellite is kept, so the track
        // changes its look there
        if x.t_s + 1e-9 >= next_t || i == last || x.untracked != untracked {
            untracked = x.untracked;
            out.push(SkyPoint {
                azimuth_deg: x.azimuth_deg,
                elevation_deg: x.elevation_deg,
                margin_db: Some(o.margin_db(x.cn0_dbhz)),
                tracked: !x.untracked,
            });
            next_t = x.t_s + SKY_POINT_STEP_S;
        }
    }
    out
}

/// Sky charts (per station and UTC day), mask charts (per station and all stations; they need a
/// plan run with the trade-off) and the summary, drawn in parallel. Returns the files written,
/// in that order.
pub fn window_charts(
    planner: &Planner,
    plan: &Plan,
    sink: &ChartSink,
    dir: &Path,
    which: WindowCharts,
) -> Result<Vec<PathBuf>, ChartError> {
    let mut jobs = Vec::new();
    if which.sky {
        jobs.extend(sky_charts(planner, plan, sink, dir));
    }
    if which.mask {
        if let Some(masks) = &plan.tradeoff_masks {
            jobs.extend(mask_charts(planner, plan, masks, dir, sink));
        }
    }
    if which.summary {
        jobs.push(summary_chart(planner, plan, dir, sink));
    }
    use rayon::prelude::*;
    jobs.into_par_iter()
        .map(|(path, chart)| {
            let bytes = match &chart {
                WindowChart::Sky(d) => draw_sky(d, sink.format)?,
                WindowChart::Mask(d) => draw_mask(d, sink.format)?,
                WindowChart::Summary(d) => draw_summary(d, sink.format)?,
            };
            save_in(&path, &bytes, sink.mode)?;
            Ok(path)
        })
        .collect()
}

/// One window chart's input.
enum WindowChart {
    Sky(SkyChartData),
    Mask(MaskChartData),
    Summary(Box<SummaryChartData>),
}

fn sky_charts(
    planner: &Planner,
    plan: &Plan,
    sink: &ChartSink,
    dir: &Path,
) -> Vec<(PathBuf, WindowChart)> {
    let tracks = sink.sky.lock().unwrap_or_else(|e| e.into_inner());
    let mut groups: BTreeMap<(usize, NaiveDate), Vec<SkyPass>> = BTreeMap::new();
    for x in &plan.passes {
        if let Some(points) = tracks.get(&x.number) {
            groups
                .entry((x.station_index, x.pass.aos.date_naive()))
                .or_default()
                .push(SkyPass {
                    label: x.number.to_string(),
                    points: points.clone(),
                    aos: x.pass.aos,
                    tca: x.pass.tca,
                    los: x.pass.los,
                    max_elevation_deg: x.pass.max_elevation_deg,
                    rate_bps: x.clear.option.map(|k| planner.rates().ladder[k.0].rate_bps),
                });
        }
    }
    drop(tracks);
    let satellite = satellite_name(planner.elements());
    // One chart per station and day.
    groups
        .into_iter()
        .map(|((si, day), passes)| {
            let st = &planner.stations()[si];
            let data = SkyChartData {
                warnings: chart_warnings(planner),
                station: st.station.name.clone(),
                satellite: satellite.clone(),
                title_date: day.format("%Y-%m-%d").to_string(),
                min_elevation_deg: st.configured_min_elevation_deg,
                horizon_mask: st.station.horizon_mask.clone(),
                required_margin_db: planner.rates().required_margin_db,
                passes,
            };
            // One pass alone (`chart --pass ID`) gets its own name, from the pass's identifier:
            // the day's chart of every pass keeps its file.
            let one = sink
                .only
                .and_then(|n| plan.passes.iter().find(|x| x.number == n));
            let name = match one {
                Some(x) => sky_pass_file_name(
                    &crate::report::pass_id(&st.station.name, &x.pass),
                    sink.format,
                ),
                None => sky_file_name(&st.station.name, day, sink.format),
            };
            (dir.join(name), WindowChart::Sky(data))
        })
        .collect()
}

fn mask_charts(
    planner: &Planner,
    plan: &Plan,
    masks: &[crate::plan::mask::MaskAccumulator],
    dir: &Path,
    sink: &ChartSink,
) -> Vec<(PathBuf, WindowChart)> {
    let stations = planner.stations();
    let ladder = &planner.rates().ladder;
    let mut jobs = Vec::new();
    for t in tradeoff(masks, planner.rates(), plan.window.days(), 1) {
        let configured = |s: &crate::plan::prepare::StationModel| {
            (s.station.name.clone(), s.configured_min_elevation_deg)
        };
        let configured = match t.scope {
            Scope::Station(i) => vec![configured(&stations[i])],
            Scope::AllStations => stations.iter().map(configured).collect(),
        };
        let rates = t
            .volume_bits_per_day
            .iter()
            .map(|o| {
                let option = &ladder[o.option.0];
                MaskRateSeries {
                    label: format!("{} {}", crate::engfmt::rate(option.rate_bps), option.scheme),
                    volume_bits_per_day: o.values.clone(),
                }
            })
            .collect();
        let label = t.scope.label(stations);
        let data = MaskChartData {
            warnings: chart_warnings(planner),
            scope: label.clone(),
            masks_deg: t.masks_deg.iter().map(|&m| m as f64).collect(),
            contact_s_per_day: t.contact_s_per_day.clone(),
            rates,
            configured_masks_deg: configured,
        };
        jobs.push((
            dir.join(mask_file_name(&label, sink.format)),
            WindowChart::Mask(data),
        ));
    }
    jobs
}

/// The network total of one UTC day's passes (the day of their AOS, as the plan's daily totals
/// count them): their fixed-rate segments through the plan's one network rule
/// ([`crate::plan::network::union_volume`]), each second once at the highest rate.
fn day_network_bits(plan: &Plan, date: NaiveDate) -> f64 {
    let segments: Vec<_> = plan
        .passes
        .iter()
        .filter(|x| x.pass.aos.date_naive() == date)
        .flat_map(|x| x.segments.iter().copied())
        .collect();
    crate::plan::network::union_volume(&segments).0
}

fn summary_chart(
    planner: &Planner,
    plan: &Plan,
    dir: &Path,
    sink: &ChartSink,
) -> (PathBuf, WindowChart) {
    let format = sink.format;
    let satellite = satellite_name(planner.elements());
    // The headline is the contact plan's (the same rule as `plan`'s table and summary).
    let delivered_bits = crate::plan::fleet::contact_plan(&[planner], std::slice::from_ref(plan))
        .ok()
        .map(|cp| cp.schedule.contacts.iter().map(|c| c.volume_bits).sum());
    let data = SummaryChartData {
        delivered_bits,
        warnings: chart_warnings(planner),
        satellite: satellite.clone(),
        start: plan.window.start(),
        end: plan.window.end(),
        stations: planner
            .stations()
            .iter()
            .map(|s| s.station.name.clone())
            .collect(),
        passes: plan
            .passes
            .iter()
            .map(|x| SummaryBar {
                aos: x.pass.aos,
                los: x.pass.los,
                station_index: x.station_index,
                volume_bits: x.clear.volume_bits,
                adaptive_volume_bits: x.clear.adaptive_volume_bits,
            })
            .collect(),
        days: plan
            .days
            .iter()
            .map(|d| DayTotals {
                date: d.date,
                fixed_bits: d.volume_bits,
                adaptive_bits: d.adaptive_volume_bits,
                shannon_bits: d.shannon_volume_bits,
                network_bits: Some(day_network_bits(plan, d.date)),
                rain_bits: d.rain_volume_bits,
            })
            .collect(),
        rain_exceedance_percent: plan
            .rain_planned
            .then(|| planner.exceedance_percent())
            .flatten(),
    };
    let path = dir.join(summary_file_name(
        &satellite,
        &plan.window.start(),
        &plan.window.end(),
        format,
    ));
    (path, WindowChart::Summary(Box::new(data)))
}
