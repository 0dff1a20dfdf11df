//! `passbudget chart` and the chart files of `plan --charts`: converts the plan's results into the
//! chart module's input types and draws them (pass charts in parallel, as each pass is planned).

use crate::chart::{
    mask_file_name, pass_file_name, save_mask, save_pass, save_sky, save_summary, sky_file_name,
    summary_file_name, ChartFormat, DayTotals, MaskChartData, MaskRateSeries, PassChartData,
    PassChartSample, SkyChartData, SkyPass, SkyPoint, SummaryBar, SummaryChartData,
};
use crate::cli::common::satellite_name;
use crate::cli::plan::{check_out_dir, prepare, run_plan, Prepared, WindowArgs};
use crate::plan::{PassSeries, Plan};
use crate::report::plan::{display_option, totals, tradeoff};
use crate::timefmt::seconds_between;
use anyhow::{bail, Result};
use chrono::NaiveDate;
use std::collections::BTreeMap;
use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::Mutex;

/// Chart file format on the command line.
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum ChartFormatArg {
    Png,
    Svg,
}

impl From<ChartFormatArg> for ChartFormat {
    fn from(a: ChartFormatArg) -> Self {
        match a {
            ChartFormatArg::Png => ChartFormat::Png,
            ChartFormatArg::Svg => ChartFormat::Svg,
        }
    }
}

/// Which charts `chart` draws.
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum ChartKind {
    Pass,
    Sky,
    Mask,
    Summary,
    All,
}

#[derive(Debug, Clone, clap::Args)]
pub struct ChartArgs {
    #[command(flatten)]
    pub window: WindowArgs,
    /// Draw only pass N (its pass chart and sky track); the numbers are those of `plan`.
    #[arg(long, value_name = "N", conflicts_with = "all")]
    pub pass: Option<usize>,
    /// Draw every pass (the default).
    #[arg(long)]
    pub all: bool,
    #[arg(long, value_enum, default_value = "all")]
    pub kind: ChartKind,
    #[arg(long, value_enum, default_value = "png")]
    pub format: ChartFormatArg,
    /// Folder for the chart files.
    #[arg(long, value_name = "DIR", default_value = "charts")]
    pub out: PathBuf,
}

/// Sky-track points kept per pass (every 5 s is plenty for a polar plot).
const SKY_POINT_STEP_S: f64 = 5.0;

/// Collects what the window charts need from each pass while the plan runs.
#[derive(Default)]
pub struct ChartCollector {
    sky: Mutex<BTreeMap<usize, Vec<SkyPoint>>>,
}

/// Build the pass chart input from a pass and its time series.
pub fn pass_chart_data(p: &Prepared, s: &PassSeries) -> PassChartData {
    let plan = s.plan;
    let rates = &p.rates;
    let k = display_option(rates, plan);
    let o = &rates.ladder[k];
    let lr = crate::units::ratio_to_db(o.rate_bps);
    let runs = s.chosen_runs;
    let samples = s
        .steps
        .iter()
        .enumerate()
        .map(|(i, x)| PassChartSample {
            t_s: x.t_s,
            elevation_deg: x.elevation_deg,
            azimuth_deg: x.azimuth_deg,
            range_km: x.range_km,
            ebn0_db: x.cn0_dbhz - lr,
            margin_db: x.cn0_dbhz - lr - o.required_ebn0_db - rates.implementation_loss_db,
            closed: runs.iter().any(|&(a, b)| a <= i && i <= b),
            adaptive_rate_bps: s
                .adaptive
                .get(i)
                .copied()
                .flatten()
                .map(|j| rates.adaptive[j as usize].rate_bps),
            system_temperature_k: x.system_temperature_k,
            atmospheric_loss_db: x.atmospheric_loss_db,
        })
        .collect();
    PassChartData {
        satellite: satellite_name(&p.elements),
        station: p.stations[plan.station_index].station.name.clone(),
        pass_number: plan.number,
        aos: plan.pass.aos,
        tca: plan.pass.tca,
        los: plan.pass.los,
        max_elevation_deg: plan.pass.max_elevation_deg,
        rate_bps: plan.clear.rate_bps,
        scheme: plan.clear.scheme.clone(),
        volume_bits: plan.clear.volume_bits,
        adaptive_volume_bits: plan.clear.adaptive_volume_bits,
        required_ebn0_db: Some(o.required_ebn0_db + rates.implementation_loss_db),
        required_margin_db: rates.required_margin_db,
        closes_from: plan.clear.closes_from,
        closes_until: plan.clear.closes_until,
        samples,
    }
}

fn sky_points(p: &Prepared, s: &PassSeries) -> Vec<SkyPoint> {
    let rates = &p.rates;
    let o = &rates.ladder[display_option(rates, s.plan)];
    let lr = crate::units::ratio_to_db(o.rate_bps);
    let mut out = Vec::new();
    let mut next_t = 0.0;
    let last = s.steps.len().saturating_sub(1);
    for (i, x) in s.steps.iter().enumerate() {
        if x.t_s + 1e-9 >= next_t || i == last {
            out.push(SkyPoint {
                azimuth_deg: x.azimuth_deg,
                elevation_deg: x.elevation_deg,
                margin_db: Some(
                    x.cn0_dbhz - lr - o.required_ebn0_db - rates.implementation_loss_db,
                ),
            });
            next_t = x.t_s + SKY_POINT_STEP_S;
        }
    }
    out
}

/// The per-pass hook of `plan --charts` / `chart`: draws the pass chart (when `passes` is true)
/// and keeps the sky track for the window charts. `only` limits it to one pass number.
pub fn pass_hook<'a>(
    p: &'a Prepared,
    dir: &'a Path,
    format: ChartFormat,
    collector: &'a ChartCollector,
    passes: bool,
    only: Option<usize>,
) -> impl Fn(&PassSeries) -> Result<(), String> + Sync + 'a {
    move |s: &PassSeries| {
        if only.is_some_and(|n| n != s.plan.number) {
            return Ok(());
        }
        collector
            .sky
            .lock()
            .map_err(|_| "chart collector poisoned".to_string())?
            .insert(s.plan.number, sky_points(p, s));
        if passes {
            let data = pass_chart_data(p, s);
            let station = &p.stations[s.plan.station_index].station.name;
            let path = dir.join(pass_file_name(
                s.plan.number,
                station,
                &s.plan.pass.aos,
                format,
            ));
            save_pass(&data, &path, format).map_err(|e| format!("{}: {e}", path.display()))?;
        }
        Ok(())
    }
}

/// Sky charts (per station and UTC day), mask charts (per station and network) and the summary.
pub fn window_charts(
    p: &Prepared,
    plan: &Plan,
    dir: &Path,
    format: ChartFormat,
    collector: &ChartCollector,
    kinds: (bool, bool, bool),
) -> Result<Vec<PathBuf>> {
    let (sky, mask, summary) = kinds;
    let mut written = Vec::new();
    let satellite = satellite_name(&p.elements);
    if sky {
        let tracks = collector
            .sky
            .lock()
            .map_err(|_| anyhow::anyhow!("chart collector poisoned"))?;
        let mut groups: BTreeMap<(usize, NaiveDate), Vec<SkyPass>> = BTreeMap::new();
        for x in &plan.passes {
            if let Some(points) = tracks.get(&x.number) {
                groups
                    .entry((x.station_index, x.pass.aos.date_naive()))
                    .or_default()
                    .push(SkyPass {
                        label: format!("#{:03}", x.number),
                        points: points.clone(),
                        aos: x.pass.aos,
                        tca: x.pass.tca,
                        los: x.pass.los,
                    });
            }
        }
        // One chart per station and day, drawn in parallel.
        use rayon::prelude::*;
        let groups: Vec<((usize, NaiveDate), Vec<SkyPass>)> = groups.into_iter().collect();
        let paths = groups
            .into_par_iter()
            .map(|((si, day), passes)| {
                let st = &p.stations[si];
                let data = SkyChartData {
                    station: st.station.name.clone(),
                    satellite: satellite.clone(),
                    title_date: day.format("%Y-%m-%d").to_string(),
                    min_elevation_deg: st.configured_min_elevation_deg,
                    horizon_mask: st.station.horizon_mask.clone(),
                    required_margin_db: p.rates.required_margin_db,
                    passes,
                };
                let path = dir.join(sky_file_name(&st.station.name, day, format));
                save_sky(&data, &path, format)
                    .map_err(|e| anyhow::anyhow!("{}: {e}", path.display()))?;
                Ok(path)
            })
            .collect::<Result<Vec<PathBuf>>>()?;
        written.extend(paths);
    }
    let days = seconds_between(&p.start, &p.end) / 86400.0;
    if mask {
        let rows = tradeoff(plan, &p.stations, &p.rates, days, 1);
        let mut scopes: Vec<(String, f64)> = p
            .stations
            .iter()
            .map(|s| (s.station.name.clone(), s.configured_min_elevation_deg))
            .collect();
        scopes.push((
            "all stations".into(),
            p.stations
                .iter()
                .map(|s| s.configured_min_elevation_deg)
                .fold(f64::INFINITY, f64::min),
        ));
        for (scope, configured) in scopes {
            let mine: Vec<_> = rows.iter().filter(|r| r.scope == scope).collect();
            let n = p.rates.ladder.len();
            let masks_deg: Vec<f64> = mine.iter().step_by(n).map(|r| r.mask_deg).collect();
            let contact: Vec<f64> = mine
                .iter()
                .step_by(n)
                .map(|r| r.contact_s_per_day)
                .collect();
            let series = p
                .rates
                .ladder
                .iter()
                .enumerate()
                .map(|(k, o)| MaskRateSeries {
                    label: format!("{:.0} Mbit/s {}", o.rate_bps / 1e6, o.scheme),
                    volume_bits_per_day: mine
                        .iter()
                        .skip(k)
                        .step_by(n)
                        .map(|r| r.volume_bits_per_day)
                        .collect(),
                })
                .collect();
            let data = MaskChartData {
                scope: scope.clone(),
                masks_deg,
                contact_s_per_day: contact,
                rates: series,
                configured_mask_deg: configured,
            };
            let path = dir.join(mask_file_name(&scope, format));
            save_mask(&data, &path, format)
                .map_err(|e| anyhow::anyhow!("{}: {e}", path.display()))?;
            written.push(path);
        }
    }
    if summary {
        let (_, day_rows) = totals(plan, &p.rates, days);
        let data = SummaryChartData {
            satellite: satellite.clone(),
            start: p.start,
            end: p.end,
            stations: p.stations.iter().map(|s| s.station.name.clone()).collect(),
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
            days: day_rows
                .iter()
                .filter_map(|d| {
                    Some(DayTotals {
                        date: NaiveDate::parse_from_str(&d.date, "%Y-%m-%d").ok()?,
                        fixed_bits: d.volume_bits,
                        adaptive_bits: d.adaptive_volume_bits,
                        shannon_bits: d.shannon_volume_bits,
                    })
                })
                .collect(),
        };
        let path = dir.join(summary_file_name(&satellite, &p.start, &p.end, format));
        save_summary(&data, &path, format)
            .map_err(|e| anyhow::anyhow!("{}: {e}", path.display()))?;
        written.push(path);
    }
    Ok(written)
}

/// `passbudget chart`.
pub fn chart(a: ChartArgs, out: &mut dyn Write) -> Result<()> {
    check_out_dir(&a.out)?;
    let staging = crate::report::Staging::new(&a.out).map_err(|e| {
        anyhow::anyhow!(
            "--out {}: cannot create a staging folder: {e}",
            a.out.display()
        )
    })?;
    let final_out = a.out.clone();
    let a = ChartArgs {
        out: staging.path().to_path_buf(),
        ..a
    };
    let p = prepare(&a.window)?;
    let format: ChartFormat = a.format.into();
    let collector = ChartCollector::default();
    let want = |k: ChartKind| a.kind == k || a.kind == ChartKind::All;
    let hook = pass_hook(
        &p,
        &a.out,
        format,
        &collector,
        want(ChartKind::Pass),
        a.pass,
    );
    let plan = run_plan(&p, None, Some(&hook))?;
    if let Some(n) = a.pass {
        if !plan.passes.iter().any(|x| x.number == n) {
            bail!("--pass {n}: the plan has passes 1 to {}", plan.passes.len());
        }
    }
    let sky = want(ChartKind::Sky);
    let whole_window = a.pass.is_none();
    let mut written = window_charts(
        &p,
        &plan,
        &a.out,
        format,
        &collector,
        (sky, false, want(ChartKind::Summary) && whole_window),
    )?;
    if want(ChartKind::Mask) && whole_window {
        // The mask trade-off needs the passes down to 0 deg: plan the window once more from there.
        let p0 = crate::cli::plan::prepare_with_floor(&a.window, Some(0.0))?;
        let plan0 = crate::cli::plan::run_plan_quietly(&p0, None, None, true)?;
        written.extend(window_charts(
            &p0,
            &plan0,
            &a.out,
            format,
            &ChartCollector::default(),
            (false, true, false),
        )?);
    }
    let passes_drawn = if want(ChartKind::Pass) {
        a.pass.map(|_| 1).unwrap_or(plan.passes.len())
    } else {
        0
    };
    // Only the charts drawn now are replaced: other files in the folder (a plan's CSVs, other
    // passes' charts) are left as they are.
    let names = staging
        .staged_names()
        .map_err(|e| anyhow::anyhow!("--out {}: {e}", final_out.display()))?;
    staging
        .commit(|n| names.iter().any(|x| x == n))
        .map_err(|e| {
            anyhow::anyhow!(
                "--out {}: cannot move the charts into place: {e}",
                final_out.display()
            )
        })?;
    writeln!(
        out,
        "{} pass chart(s) and {} window chart(s) written to {}",
        passes_drawn,
        written.len(),
        final_out.display()
    )?;
    Ok(())
}
