//! What the binary adds around a plan run: the staged `--out` folder, the progress bar on a
//! terminal, and the sink that combines the per-pass CSV writer, the chart drawer and the bar.

use anyhow::{Context, Result};
use passbudget::chart::plan::ChartSink;
use passbudget::plan::{PassSeries, PassSink, Planner};
use passbudget::report::files::CsvSink;
use passbudget::report::Staging;
use std::path::Path;

/// Check that `dir` can be written, then open a staging folder inside it.
pub fn stage(dir: &Path) -> Result<Staging> {
    std::fs::create_dir_all(dir)
        .with_context(|| format!("--out {}: cannot create the folder", dir.display()))?;
    let probe = dir.join(".passbudget-write-check");
    std::fs::write(&probe, b"ok")
        .with_context(|| format!("--out {}: the folder cannot be written", dir.display()))?;
    let _ = std::fs::remove_file(&probe);
    Staging::new(dir)
        .with_context(|| format!("--out {}: cannot create a staging folder", dir.display()))
}

/// A progress bar on stderr for runs long enough to want one (indicatif draws only on a terminal).
pub fn progress_bar(planner: &Planner) -> Option<indicatif::ProgressBar> {
    if planner.window().days() * (planner.stations().len() as f64) < 3.0 {
        return None;
    }
    let b = indicatif::ProgressBar::with_draw_target(None, indicatif::ProgressDrawTarget::stderr());
    b.set_style(
        indicatif::ProgressStyle::with_template(
            "planning passes [{bar:40}] {pos}/{len} {elapsed} (about {eta} left)",
        )
        .unwrap_or_else(|_| indicatif::ProgressStyle::default_bar()),
    );
    Some(b)
}

/// What the binary's sink can fail with.
#[derive(Debug, thiserror::Error)]
pub enum RunSinkError {
    #[error(transparent)]
    Csv(#[from] passbudget::report::files::FileError),
    #[error(transparent)]
    Chart(#[from] passbudget::chart::ChartError),
}

/// The binary's sink: per-pass CSV files, pass charts and the progress bar, each optional.
pub struct RunSink<'a> {
    pub csv: Option<CsvSink<'a>>,
    pub charts: Option<&'a ChartSink<'a>>,
    pub bar: Option<indicatif::ProgressBar>,
}

impl PassSink for RunSink<'_> {
    type Error = RunSinkError;
    fn pass(&self, s: &PassSeries<'_>) -> Result<(), Self::Error> {
        if let Some(c) = &self.csv {
            c.pass(s)?;
        }
        if let Some(c) = self.charts {
            c.pass(s)?;
        }
        Ok(())
    }
    fn progress(&self, total: usize) {
        if let Some(b) = &self.bar {
            if b.length() != Some(total as u64) {
                b.set_length(total as u64);
            }
            b.inc(1);
        }
    }
}

impl Drop for RunSink<'_> {
    fn drop(&mut self) {
        if let Some(b) = &self.bar {
            b.finish_and_clear();
        }
    }
}
