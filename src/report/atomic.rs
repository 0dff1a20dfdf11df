//! Atomic file writing (a leaf module shared by the output folder and the chart files).

use std::io::Write;
use std::path::Path;
use std::sync::atomic::{AtomicU64, Ordering};

/// A number unique within this process, for temporary and staging names (with the process id
/// they are unique on the machine).
pub(crate) fn next_serial() -> u64 {
    static SERIAL: AtomicU64 = AtomicU64::new(0);
    SERIAL.fetch_add(1, Ordering::Relaxed)
}

/// Write `bytes` to `path` atomically: write a temporary file in the same folder (named with the
/// process id and a per-process serial number, so two writers never share one), flush it to disk,
/// then rename it over the target. A reader never sees a half-written file.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> std::io::Result<()> {
    let dir = path
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| "out".into());
    let tmp = dir.join(format!(
        ".{name}.tmp-{}-{}",
        std::process::id(),
        next_serial()
    ));
    let result = (|| {
        let mut f = std::fs::File::create(&tmp)?;
        f.write_all(bytes)?;
        f.sync_all()?;
        std::fs::rename(&tmp, path)
    })();
    if result.is_err() {
        let _ = std::fs::remove_file(&tmp);
    }
    result
}

/// How an output file is written.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum WriteMode {
    /// [`write_atomic`]: a temporary file, flushed to disk, renamed over the target. For a file
    /// written where readers may look.
    #[default]
    Atomic,
    /// [`write_staged`]: into a staging folder ([`super::Staging`]), whose commit makes the whole
    /// set durable with one flush and puts it in place atomically.
    Staged,
}

/// Write a file of a staging folder: created and written in place, not flushed. Nobody reads the
/// staging folder before its commit, which flushes every staged file with one call before it puts
/// the set in place ([`super::Staging::commit`]); a run killed before the commit leaves a staging
/// folder the next run removes.
pub fn write_staged(path: &Path, bytes: &[u8]) -> std::io::Result<()> {
    let result = std::fs::File::create(path).and_then(|mut f| {
        f.write_all(bytes)?;
        start_writeback(&f);
        Ok(())
    });
    if result.is_err() {
        let _ = std::fs::remove_file(path);
    }
    result
}

/// Ask the kernel to start writing a staged file to disk now, without waiting for it, so that the
/// commit's one flush finds most of the set already written (on Linux, `posix_fadvise` with
/// `POSIX_FADV_DONTNEED` starts the write-out of the file's dirty pages and returns; it frees the
/// pages only once they are clean). A hint only: durability still comes from the commit's flush,
/// and a refusal is ignored. Measured with `strace -T` on the README's main command (ext4): the
/// commit's `syncfs` took 24-30 ms without it, 2-11 ms with it.
fn start_writeback(f: &std::fs::File) {
    #[cfg(target_os = "linux")]
    {
        let _ = rustix::fs::fadvise(f, 0, None, rustix::fs::Advice::DontNeed);
    }
    #[cfg(not(target_os = "linux"))]
    let _ = f;
}

/// Write `bytes` to `path` in `mode`.
pub fn write_output(path: &Path, bytes: &[u8], mode: WriteMode) -> std::io::Result<()> {
    match mode {
        WriteMode::Atomic => write_atomic(path, bytes),
        WriteMode::Staged => write_staged(path, bytes),
    }
}
