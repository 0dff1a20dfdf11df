//! `passbudget chart` and the chart files of `plan --charts`. (Being wired to src/chart.)

use crate::cli::plan::Prepared;
use crate::plan::{PassSeries, Plan};
use anyhow::Result;
use std::path::Path;

/// Chart file format on the command line.
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum ChartFormatArg {
    Png,
    Svg,
}

pub struct Fmt(pub ChartFormatArg);
impl From<ChartFormatArg> for Fmt {
    fn from(a: ChartFormatArg) -> Self {
        Fmt(a)
    }
}

pub fn pass_chart_hook<'a>(
    _p: &'a Prepared,
    _dir: &'a Path,
    _f: Fmt,
) -> impl Fn(&PassSeries) -> Result<(), String> + Sync + 'a {
    |_s: &PassSeries| Err("charts are not available in this build".to_string())
}

pub fn window_charts(_p: &Prepared, _plan: &Plan, _dir: &Path, _f: Fmt) -> Result<()> {
    anyhow::bail!("charts are not available in this build")
}
