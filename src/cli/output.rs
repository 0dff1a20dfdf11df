//! What the binary adds around a plan run: the staged `--out` folder, the progress bar on a
//! terminal, and the sink that combines the per-pass CSV writer, the chart drawer and the bar.

use anyhow::{Context, Result};
use passbudget::chart::plan::ChartSink;
use passbudget::plan::{PassSeries, PassSink, Planner};
use passbudget::report::files::{
    estimate_output, CsvSink, FileError, OutputRequest, MAX_OUTPUT_BYTES, MAX_OUTPUT_FILES,
};
use passbudget::report::{check_file_names, CommitMethod, CommitMode, Staging, Step};
use std::io::Write;
use std::ops::ControlFlow;
use std::path::Path;

/// Check that `dir` can be written, complete or clear what interrupted runs left there, then open
/// a staging folder inside it.
pub fn stage(dir: &Path) -> Result<Staging> {
    // Staging::new creates the folder if needed (and a failed run removes it again).
    let st = Staging::new(dir).with_context(|| {
        if dir.is_dir() {
            format!("--out {}", dir.display())
        } else if dir.symlink_metadata().is_ok() {
            // A file, a device or a link to nothing holds the name.
            format!(
                "--out {}: is not a folder (something else has that name)",
                dir.display()
            )
        } else {
            format!("--out {}: cannot create the folder", dir.display())
        }
    })?;
    let probe = dir.join(format!(".passbudget-write-check-{}", std::process::id()));
    std::fs::write(&probe, b"ok")
        .with_context(|| format!("--out {}: the folder cannot be written", dir.display()))?;
    let _ = std::fs::remove_file(&probe);
    let r = st.recovery();
    if r.completed_commit {
        note(&format!(
            "--out {}: completed the move of an interrupted run's results",
            dir.display()
        ));
    }
    if r.restored_files > 0 {
        note(&format!(
            "--out {}: moved back {} file(s) of yours changed in the folder during an interrupted run",
            dir.display(),
            r.restored_files
        ));
    }
    if r.removed_leftovers > 0 {
        note(&format!(
            "--out {}: removed {} staging folder(s) or temporary file(s) of interrupted runs",
            dir.display(),
            r.removed_leftovers
        ));
    }
    Ok(st)
}

fn note(text: &str) {
    let _ = writeln!(std::io::stderr(), "note: {text}");
}

/// Refuse a run whose stations give the same file names, before any work.
pub fn check_names(planner: &Planner) -> Result<()> {
    check_file_names(planner.stations().iter().map(|s| s.station.name.as_str()))?;
    Ok(())
}

/// Refuse, before any work, a run whose estimated output passes the limits, unless `allow`.
pub fn check_size(
    planner: &Planner,
    request: &OutputRequest,
    allow: bool,
    out: &Path,
) -> Result<()> {
    if allow {
        return Ok(());
    }
    let e = estimate_output(planner, request)?;
    let narrow = if request.csv {
        "fewer --days, one station listed in the mission file, no --charts"
    } else {
        "fewer --days, one station listed in the mission file, --pass N or --kind"
    };
    if e.too_large() {
        anyhow::bail!(
            "--out {}: this run would write about {} files and {:.1} GB ({} passes; the limits are {} files and {} GB): narrow it ({narrow}) or pass --allow-large-output",
            out.display(),
            e.files,
            e.bytes as f64 / 1e9,
            e.passes,
            MAX_OUTPUT_FILES,
            MAX_OUTPUT_BYTES / 1_000_000_000
        );
    }
    Ok(())
}

/// Put the staged results in place; where the folder could not be swapped in as a whole, say so
/// in a note. `PASSBUDGET_TEST_STOP_AT=STEP` (a test hook) aborts the process at that step of the
/// commit (`start`: just before it; else a [`Step`] in its text form, `swapped`, `moved-3`, ...),
/// as a kill would.
pub fn commit(st: Staging, mode: CommitMode, out: &Path) -> Result<()> {
    let stop = std::env::var("PASSBUDGET_TEST_STOP_AT").ok();
    if stop.as_deref() == Some("start") {
        std::process::abort();
    }
    let method = st
        .commit_with(mode, |step: Step| {
            if stop.as_deref() == Some(step.to_string().as_str()) {
                std::process::abort();
            }
            ControlFlow::Continue(())
        })
        .with_context(|| format!("--out {}: cannot put the results in place", out.display()))?;
    if let CommitMethod::Journaled { reason } = method {
        note(&format!(
            "--out {}: the results were moved in file by file under a journal, not swapped in as one folder ({reason}); see \"Output folder\" in the README",
            out.display()
        ));
    }
    Ok(())
}

/// An error of a run that writes into `st`: the hidden staging path is replaced by the `--out`
/// folder, and a full disk is named as such.
pub fn in_out_folder(e: anyhow::Error, st: &Staging, out: &Path) -> anyhow::Error {
    let full = e.chain().any(|c| {
        c.downcast_ref::<std::io::Error>()
            .is_some_and(|io| io.kind() == std::io::ErrorKind::StorageFull)
    }) || e.chain().any(|c| {
        c.downcast_ref::<FileError>()
            .is_some_and(|f| f.kind == Some(std::io::ErrorKind::StorageFull))
    });
    let text = crate::cli::one_line(&e)
        .replace(&st.path().display().to_string(), &out.display().to_string());
    if full {
        anyhow::anyhow!("--out {}: the disk is full: {text}", out.display())
    } else {
        anyhow::anyhow!(text)
    }
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

#[cfg(test)]
mod tests {
    use super::*;

    /// A full disk while writing into the staging folder is reported naming the --out folder and
    /// the file's place in it, not the hidden staging path.
    #[test]
    fn a_full_disk_names_the_out_folder() {
        let dir = tempfile::tempdir().unwrap();
        let out = dir.path().join("out");
        let st = Staging::new(&out).unwrap();
        let io = std::io::Error::from(std::io::ErrorKind::StorageFull);
        let csv = FileError {
            path: st.path().join("pass-001-a.csv"),
            message: io.to_string(),
            kind: Some(io.kind()),
        };
        let chart = passbudget::chart::ChartError::Io {
            path: st.path().join("sky-a-20261201.png"),
            source: std::io::Error::from(std::io::ErrorKind::StorageFull),
        };
        for (e, file) in [
            (anyhow::Error::from(csv), "pass-001-a.csv"),
            (anyhow::Error::from(chart), "sky-a-20261201.png"),
        ] {
            let text = in_out_folder(e, &st, &out).to_string();
            let head = format!("--out {}: the disk is full: ", out.display());
            assert!(text.starts_with(&head), "{text}");
            assert!(
                text.contains(&out.join(file).display().to_string()),
                "{text}"
            );
            assert!(!text.contains(".passbudget-staging"), "{text}");
        }
        // Another error keeps its text, with the staging path replaced all the same.
        let other = FileError {
            path: st.path().join("days.csv"),
            message: "permission denied".into(),
            kind: Some(std::io::ErrorKind::PermissionDenied),
        };
        let text = in_out_folder(other.into(), &st, &out).to_string();
        assert_eq!(
            text,
            format!(
                "{}: cannot write: permission denied",
                out.join("days.csv").display()
            )
        );
    }
}
