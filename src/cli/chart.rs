//! `passbudget chart`: the charts of a plan, without its CSV files.

use crate::cli::common::warn;
use crate::cli::output::{progress_bar, stage, RunSink};
use anyhow::{bail, Context, Result};
use passbudget::chart::plan::{window_charts, ChartSink, WindowCharts};
use passbudget::chart::ChartFormat;
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

/// `passbudget chart`.
pub fn chart(a: ChartArgs, out: &mut dyn Write) -> Result<()> {
    let staging = stage(&a.out)?;
    let want = |k: ChartKind| a.kind == k || a.kind == ChartKind::All;
    let whole_window = a.pass.is_none();
    let which = WindowCharts {
        sky: want(ChartKind::Sky),
        mask: want(ChartKind::Mask) && whole_window,
        summary: want(ChartKind::Summary) && whole_window,
    };
    let planner = a.window.planner(which.mask)?;
    let dir = staging.path().to_path_buf();
    let charts = ChartSink::new(
        &planner,
        &dir,
        a.format.into(),
        want(ChartKind::Pass),
        a.pass,
    );
    let sink = RunSink {
        csv: None,
        charts: Some(&charts),
        bar: progress_bar(&planner),
    };
    let plan = planner.run(&sink)?;
    drop(sink);
    warn(&plan.warnings);
    if let Some(n) = a.pass {
        if !plan.passes.iter().any(|x| x.number == n) {
            bail!("--pass {n}: the plan has passes 1 to {}", plan.passes.len());
        }
    }
    let written = window_charts(&planner, &plan, &charts, &dir, which)?;
    let passes_drawn = if want(ChartKind::Pass) {
        a.pass.map(|_| 1).unwrap_or(plan.passes.len())
    } else {
        0
    };
    // Only the charts drawn now are replaced: other files in the folder (a plan's CSVs, other
    // passes' charts) are left as they are.
    let names = staging
        .staged_names()
        .with_context(|| format!("--out {}", a.out.display()))?;
    staging
        .commit(|n| names.iter().any(|x| x == n))
        .with_context(|| {
            format!(
                "--out {}: cannot move the charts into place",
                a.out.display()
            )
        })?;
    writeln!(
        out,
        "{} pass chart(s) and {} window chart(s) written to {}",
        passes_drawn,
        written.len(),
        a.out.display()
    )?;
    Ok(())
}
