//! `passbudget chart`: the charts of a plan, without its CSV files.

use crate::cli::common::{note, warn};
use crate::cli::output::{
    check_names, check_size, commit, in_out_folder, progress_bar, stage, RunSink,
};
use anyhow::{bail, Result};
use passbudget::chart::plan::{window_charts, ChartSink, WindowCharts};
use passbudget::chart::ChartFormat;
use passbudget::engfmt::counted;
use passbudget::plan::Planner;
use passbudget::report::files::{ChartBytes, OutputRequest};
use passbudget::report::{pass_id, CommitMode};
use std::io::Write;
use std::path::PathBuf;

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
    pub window: crate::cli::window::WindowArgs,
    /// Draw only one pass (its pass chart and sky track): its identifier (`passes` and `plan`
    /// show it, e.g. nordkam-20261202T0111Z) or its number in `plan`'s table for the same window.
    #[arg(long, value_name = "ID|N", conflicts_with = "all")]
    pub pass: Option<String>,
    /// Draw every pass (the default).
    #[arg(long)]
    pub all: bool,
    /// Which charts to draw.
    #[arg(long, value_enum, default_value = "all")]
    pub kind: ChartKind,
    /// Chart file format.
    #[arg(
        long = "chart-format",
        alias = "format",
        value_enum,
        default_value = "png"
    )]
    pub chart_format: ChartFormatArg,
    /// Folder for the chart files.
    #[arg(long, value_name = "DIR", default_value = "charts")]
    pub out: PathBuf,
    /// Write even when the estimate of the charts' size passes the limits (1 GB or 5000 files).
    #[arg(long)]
    pub allow_large_output: bool,
}

/// `passbudget chart`.
pub fn chart(a: ChartArgs, out: &mut dyn Write) -> Result<()> {
    // (one pass draws its pass chart and sky track; the mask and summary charts are the whole
    // window's: the pair drew nothing and said so only in its count)
    if let (Some(p), ChartKind::Mask | ChartKind::Summary) = (&a.pass, a.kind) {
        bail!(
            "--pass {p} draws one pass's pass chart and sky track; --kind {} charts the whole window: give one or the other",
            if a.kind == ChartKind::Mask { "mask" } else { "summary" }
        );
    }
    let staging = stage(&a.out)?;
    let want = |k: ChartKind| a.kind == k || a.kind == ChartKind::All;
    let whole_window = a.pass.is_none();
    let which = WindowCharts {
        sky: want(ChartKind::Sky),
        mask: want(ChartKind::Mask) && whole_window,
        summary: want(ChartKind::Summary) && whole_window,
    };
    let planner = a.window.planner(which.mask)?;
    check_names(&planner)?;
    let pass = a
        .pass
        .as_deref()
        .map(|p| pass_number(&planner, p))
        .transpose()?;
    let format: ChartFormat = a.chart_format.into();
    let request = OutputRequest {
        csv: false,
        pass_charts: want(ChartKind::Pass) && a.pass.is_none(),
        sky_charts: which.sky,
        chart_bytes: ChartBytes::of(format),
    };
    check_size(&planner, &request, a.allow_large_output, &a.out)?;
    let dir = staging.path().to_path_buf();
    let charts = ChartSink::new(&planner, &dir, format, want(ChartKind::Pass), pass).staged();
    let sink = RunSink {
        csv: None,
        charts: Some(&charts),
        bar: progress_bar(&planner),
    };
    let run = planner.run(&sink);
    drop(sink);
    let plan = run.map_err(|e| in_out_folder(e.into(), &staging, &a.out))?;
    // One pass's chart: the warnings and notes of that pass (not every station's); else, and
    // for no such pass (they say why there are so few), the window's.
    match pass.map(|n| (n, plan.passes.iter().find(|x| x.number == n))) {
        Some((_, Some(p))) => {
            warn(&planner.pass_warnings(&plan, p));
            note(&planner.pass_notes(&plan, p));
        }
        missing => {
            warn(&plan.warnings);
            note(&plan.note_lines(|_| true));
            match (missing, plan.passes.len()) {
                (Some((n, _)), 0) => bail!("--pass {n}: the plan has no passes in this window"),
                (Some((n, _)), k) => bail!("--pass {n}: the plan has passes 1 to {k}"),
                (None, _) => {}
            }
        }
    }
    let written = window_charts(&planner, &plan, &charts, &dir, which)
        .map_err(|e| in_out_folder(e.into(), &staging, &a.out))?;
    let passes_drawn = if want(ChartKind::Pass) {
        pass.map(|_| 1).unwrap_or(plan.passes.len())
    } else {
        0
    };
    // Only the charts drawn now are added or replaced: other files in the folder (a plan's CSVs,
    // other passes' charts) are left as they are.
    commit(staging, CommitMode::Add, &a.out)?;
    // the sky charts apart from the window's mask and summary charts (one pass's sky track
    // was counted as a window chart)
    let sky = (written.iter())
        .filter(|p| {
            p.file_name()
                .is_some_and(|n| n.to_string_lossy().starts_with("sky-"))
        })
        .count();
    writeln!(
        out,
        "{}, {} and {} written to {}",
        counted(passes_drawn, "pass chart"),
        counted(sky, "sky chart"),
        counted(written.len() - sky, "mask and summary chart"),
        a.out.display()
    )?;
    Ok(())
}

/// The plan's number of the pass `--pass` names: a number as given, or the pass whose identifier
/// ([`pass_id`]) it is (case ignored).
fn pass_number(planner: &Planner, given: &str) -> Result<usize> {
    if let Ok(n) = given.trim().parse::<usize>() {
        return Ok(n);
    }
    let passes = planner.passes()?;
    let name = |si: usize| &planner.stations()[si].station.name;
    // an identifier is the station's words and the time, lower case but for its T and Z: the
    // given one read by the same rule (any case, Unicode form or separators)
    let wanted = passbudget::infile::name_words(given).join("-");
    if let Some(k) = passes
        .iter()
        .position(|(si, p)| pass_id(name(*si), p).to_lowercase() == wanted)
    {
        return Ok(k + 1);
    }
    let ids: Vec<String> = passes.iter().map(|(si, p)| pass_id(name(*si), p)).collect();
    if let Some((k, id)) = nearest_id(&ids, given.trim()) {
        bail!("--pass {given}: no pass of this window has that identifier; the nearest at that station is {id} (pass {})", k + 1);
    }
    match (ids.first(), ids.last()) {
        (Some(a), Some(b)) => bail!(
            "--pass {given}: no pass of this window has that identifier (the window holds {a} to {b}; `passbudget passes` lists them)"
        ),
        _ => bail!("--pass {given}: the plan has no passes in this window"),
    }
}

/// Among pass identifiers `ids` (`<station>-YYYYMMDDTHHMMZ`), the one of the station `given` names
/// whose minute is nearest the minute it gives, when within 30 minutes (a minute mistyped, or
/// rounded where the identifier cuts): its index and text.
fn nearest_id<'a>(ids: &'a [String], given: &str) -> Option<(usize, &'a str)> {
    let minute = |id: &str| -> Option<(String, chrono::NaiveDateTime)> {
        let (station, stamp) = id.rsplit_once('-')?;
        let t = chrono::NaiveDateTime::parse_from_str(stamp, "%Y%m%dT%H%MZ").ok()?;
        Some((station.to_ascii_lowercase(), t))
    };
    let (station, at) = minute(given)?;
    ids.iter()
        .enumerate()
        .filter_map(|(k, id)| {
            let (s, t) = minute(id)?;
            let off_min = (t - at).num_minutes().abs();
            (s == station && off_min <= 30).then_some((off_min, k, id.as_str()))
        })
        .min()
        .map(|(_, k, id)| (k, id))
}
