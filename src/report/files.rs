//! The files of a plan's output folder: one CSV time series per pass (written by [`CsvSink`] as
//! each pass is planned) and the summaries (`summary.json`, `summary.csv`, `days.csv`,
//! `masks.csv`). Files are written atomically; the folder as a whole is staged by
//! [`super::Staging`].

use super::plan::PlanDoc;
use super::{to_csv, write_output, WriteMode};
use crate::plan::{PassSeries, PassSink, Planner};
use std::path::{Path, PathBuf};

/// Error writing an output file: the file and what went wrong.
#[derive(Debug, thiserror::Error)]
#[error("{}: cannot write: {message}", path.display())]
pub struct FileError {
    pub path: PathBuf,
    pub message: String,
    /// The kind of the input/output error, if it was one (a full disk is `StorageFull`).
    pub kind: Option<std::io::ErrorKind>,
}

pub(crate) fn file_error(path: &Path, e: impl std::fmt::Display) -> FileError {
    FileError {
        path: path.to_path_buf(),
        message: e.to_string(),
        kind: None,
    }
}

pub(crate) fn io_error(path: &Path, e: std::io::Error) -> FileError {
    FileError {
        kind: Some(e.kind()),
        ..file_error(path, e)
    }
}

/// The name of a pass's files before their extension, the one rule of its time series and its
/// chart: `pass-NNN-<pass id>`, the pass's number and its identifier as the tables print them
/// ([`super::pass_id`], the minute of highest elevation), `pass-016-sierra-baja-20261202T0854Z`;
/// `pass-NNN` without an identifier (chart data made by hand may leave it empty). The number is
/// padded with zeros to three digits, or to the width of `pass_count` (the plan's last number)
/// when that is wider, so that the files sort in pass order by name in any plan:
/// `pass-0016-...` among 1,500 passes.
pub fn pass_file_stem(number: usize, pass_count: usize, pass_id: &str) -> String {
    let width = pass_count
        .checked_ilog10()
        .map_or(1, |d| d as usize + 1)
        .max(3);
    match pass_id {
        "" => format!("pass-{number:0width$}"),
        id => format!("pass-{number:0width$}-{id}"),
    }
}

/// File name of a pass's time series: [`pass_file_stem`]`.csv`.
pub fn pass_csv_name(number: usize, pass_count: usize, pass_id: &str) -> String {
    format!("{}.csv", pass_file_stem(number, pass_count, pass_id))
}

/// Writes each pass's time series CSV into a folder.
pub struct CsvSink<'a> {
    pub planner: &'a Planner,
    pub dir: &'a Path,
    /// [`WriteMode::Staged`] when `dir` is a staging folder ([`super::Staging::path`]).
    pub mode: WriteMode,
}

impl PassSink for CsvSink<'_> {
    type Error = FileError;
    fn pass(&self, s: &PassSeries<'_>) -> Result<(), FileError> {
        let st = &self.planner.stations()[s.plan.station_index].station.name;
        let path = self.dir.join(pass_csv_name(
            s.plan.number,
            s.pass_count,
            &super::pass_id(st, &s.plan.pass),
        ));
        // The element age (the one warning of the whole run that every number depends on), then
        // the pass's own.
        let w = self.planner.window();
        let mut warnings: Vec<String> =
            crate::plan::inputs::element_age_warning(self.planner.elements(), w.start(), w.end())
                .into_iter()
                .collect();
        warnings.extend(s.plan.warnings.lines(self.planner.frequency_hz()));
        let text = super::step_csv::pass_csv(s, self.planner.rates(), &warnings);
        write_output(&path, &text, self.mode).map_err(|e| io_error(&path, e))
    }
}

/// The plan summary as JSON text (the `plan --format json` output and `summary.json`).
pub fn summary_json(doc: &PlanDoc) -> String {
    serde_json::to_string_pretty(doc).expect("the plan summary serializes") + "\n"
}

/// Write `summary.json`, `summary.csv`, `days.csv` and `masks.csv` into `dir`.
pub fn write_summaries(dir: &Path, doc: &PlanDoc, mode: WriteMode) -> Result<(), FileError> {
    let w = &doc.assumptions.warnings;
    let files: [(&str, Result<String, csv::Error>); 4] = [
        ("summary.json", Ok(summary_json(doc))),
        ("summary.csv", to_csv(&doc.passes, w)),
        ("days.csv", to_csv(&doc.days, w)),
        ("masks.csv", to_csv(&doc.usable_masks, w)),
    ];
    for (name, text) in files {
        let path = dir.join(name);
        let text = text.map_err(|e| file_error(&path, e))?;
        write_output(&path, text.as_bytes(), mode).map_err(|e| io_error(&path, e))?;
    }
    Ok(())
}

/// Sizes of one chart file, bytes (upper side of the charts of the shipped example, measured).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct ChartBytes {
    /// One pass chart.
    pub pass: u64,
    /// One sky chart (a station's UTC day).
    pub sky: u64,
    /// One mask or summary chart.
    pub window: u64,
}

/// What a run will write into its folder, for [`estimate_output`].
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct OutputRequest {
    /// One time-series CSV per pass (and the four summary files).
    pub csv: bool,
    /// One chart per pass.
    pub pass_charts: bool,
    /// One sky chart per station and UTC day.
    pub sky_charts: bool,
    pub chart_bytes: ChartBytes,
}

/// The estimated size of a run's output.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct OutputEstimate {
    pub passes: usize,
    pub files: u64,
    pub bytes: u64,
}

/// Largest output a run writes without being asked explicitly, bytes (1 GB).
pub const MAX_OUTPUT_BYTES: u64 = 1_000_000_000;
/// Largest number of files a run writes without being asked explicitly.
pub const MAX_OUTPUT_FILES: u64 = 5_000;
/// Bytes of one row of a pass's time-series CSV (the shipped example's two golden pass files
/// average 303 with the itemized clear-sky and rain noise columns; rounded up).
pub const CSV_ROW_BYTES: u64 = 320;

impl OutputEstimate {
    /// Whether the estimate passes [`MAX_OUTPUT_BYTES`] or [`MAX_OUTPUT_FILES`].
    pub fn too_large(&self) -> bool {
        self.bytes > MAX_OUTPUT_BYTES || self.files > MAX_OUTPUT_FILES
    }
}

/// Estimate the output of a run before it starts: the passes are searched (the same search the
/// planner runs, without the budgets), each pass's CSV has one row per step, charts have the
/// sizes of `request.chart_bytes`.
pub fn estimate_output(
    planner: &Planner,
    request: &OutputRequest,
) -> Result<OutputEstimate, crate::orbit::PropagationError> {
    let prop = crate::orbit::Propagator::new(planner.elements())?;
    let w = planner.window();
    let (mut passes, mut rows) = (0usize, 0u64);
    for st in planner.stations() {
        let found = crate::geometry::find_passes(&prop, &st.observer, &st.mask, w.start(), w.end());
        passes += found.passes.len();
        for p in &found.passes {
            let s = (p.los - p.aos).num_milliseconds() as f64 / 1000.0;
            rows += (s / planner.step_s()).ceil() as u64 + 2;
        }
    }
    let n = passes as u64;
    let stations = planner.stations().len() as u64;
    let days = w.days().ceil() as u64 + 1;
    let (mut files, mut bytes) = (0u64, 0u64);
    let c = &request.chart_bytes;
    if request.csv {
        // Per pass, the four summaries, the contact plan's three tables and a calendar per station.
        files += n + 4 + 3 + stations;
        bytes += rows * CSV_ROW_BYTES + n * 4 * 1024;
    }
    if request.pass_charts {
        files += n;
        bytes += n * c.pass;
    }
    if request.sky_charts {
        // Sky charts per station and day, the mask (per station and all stations) and summary
        // charts, and the contact plan's timeline per day (and its storage chart when a store
        // is followed).
        let storage = u64::from(planner.mission().satellites[0].onboard.is_some());
        files += stations * days + stations + 2 + days + storage;
        bytes += stations * days * c.sky + (stations + 2 + days + storage) * c.window;
    }
    Ok(OutputEstimate {
        passes,
        files,
        bytes,
    })
}

#[cfg(feature = "charts")]
impl ChartBytes {
    /// The chart sizes for a format.
    pub fn of(format: crate::chart::ChartFormat) -> ChartBytes {
        match format {
            // Palette PNGs of the shipped example's week (2026-12-04, deflate level 2): pass
            // charts 68-83 kB, sky charts 63-92 kB, mask charts up to 62 kB, the summary 67 kB,
            // timelines up to 65 kB; the shipped fleet's storage chart 94 kB.
            crate::chart::ChartFormat::Png => ChartBytes {
                pass: 95_000,
                sky: 105_000,
                window: 110_000,
            },
            // The same in SVG: pass charts up to 148 kB, sky charts up to 54 kB (the week's 68 kB),
            // mask charts 89 kB (measured before the series lines lost their straight-run points,
            // which made the week's SVG charts a fifth smaller: so a margin now).
            crate::chart::ChartFormat::Svg => ChartBytes {
                pass: 155_000,
                sky: 70_000,
                window: 95_000,
            },
        }
    }
}
