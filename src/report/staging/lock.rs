//! The lock of an output folder: held while a run completes what interrupted runs left, and while
//! it commits, so that two runs never read one manifest and both act on it.
//!
//! Unix: `flock(2)` on the folder itself (released by the kernel when the process ends, so a
//! killed run leaves no stale lock). The lock is taken without waiting: a folder locked by another
//! process is [`FolderError::Busy`]. A file system that does not support `flock` runs unlocked
//! (the journal's exclusive creation still keeps two journaled commits apart). Elsewhere there is
//! no lock.

use super::{io_at, FolderError};
use std::path::Path;

/// A held lock; dropping it releases the lock.
pub(super) struct FolderLock {
    #[cfg(unix)]
    _file: Option<std::fs::File>,
}

/// Lock the folder `dir`. The folder may be swapped for another between opening and locking it
/// (a commit of another run): then the lock is taken again on the folder now at that path.
#[cfg(unix)]
pub(super) fn lock(dir: &Path) -> Result<FolderLock, FolderError> {
    use rustix::fs::{flock, FlockOperation};
    use std::os::unix::fs::MetadataExt;
    for _ in 0..16 {
        let file = std::fs::File::open(dir).map_err(io_at(dir))?;
        match flock(&file, FlockOperation::NonBlockingLockExclusive) {
            Ok(()) => {}
            Err(e) if e == rustix::io::Errno::WOULDBLOCK => {
                return Err(FolderError::Busy { pid: None })
            }
            Err(_) => return Ok(FolderLock { _file: None }),
        }
        let held = file.metadata().map_err(io_at(dir))?;
        let now = std::fs::metadata(dir).map_err(io_at(dir))?;
        if (held.dev(), held.ino()) == (now.dev(), now.ino()) {
            return Ok(FolderLock { _file: Some(file) });
        }
    }
    Err(FolderError::Busy { pid: None })
}

#[cfg(not(unix))]
pub(super) fn lock(_dir: &Path) -> Result<FolderLock, FolderError> {
    Ok(FolderLock {})
}
