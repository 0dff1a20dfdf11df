//! The journaled commit (the fallback where two folders cannot be exchanged atomically): the
//! staged files are moved into the output folder one by one under a journal that the next run
//! completes after an interruption.

use super::{
    io_at, read_manifest, sync_dir, write_manifest, CommitMode, FolderError, Step, JOURNAL, PREFIX,
};
use std::collections::BTreeSet;
use std::io::Write;
use std::ops::ControlFlow;
use std::path::Path;

const JOURNAL_HEADER: &str = "passbudget-journal 1";

/// Commit the files staged in `staging` (a folder inside `dir`) under a journal. The caller holds
/// the folder's lock; `staged` are the staged names.
pub(super) fn commit(
    dir: &Path,
    staging: &Path,
    staged: Vec<String>,
    mode: CommitMode,
    hook: &mut dyn FnMut(Step) -> ControlFlow<()>,
) -> Result<(), FolderError> {
    let old = read_manifest(dir)?;
    super::check_destinations(dir, &staged, &old)?;
    let remove: Vec<String> = match mode {
        CommitMode::Replace => old
            .iter()
            .filter(|n| !staged.contains(n))
            .cloned()
            .collect(),
        CommitMode::Add => Vec::new(),
    };
    let mut keep: BTreeSet<String> = staged.iter().cloned().collect();
    if mode == CommitMode::Add {
        keep.extend(old);
    }
    let journal = Journal {
        pid: std::process::id(),
        staging: super::file_name(staging),
        moves: staged,
        removes: remove,
        manifest: keep.into_iter().collect(),
    };
    sync_dir(staging)?;
    write_journal(dir, &journal)?;
    if hook(Step::Journaled).is_break() {
        return Err(FolderError::Stopped);
    }
    roll_forward(dir, &journal, hook)
}

/// Roll forward the journal of an interrupted commit in `dir`, if there is one. A journal of a
/// running process is [`FolderError::Busy`]. Returns whether there was one.
pub(super) fn recover(dir: &Path, alive: &dyn Fn(u32) -> bool) -> Result<bool, FolderError> {
    let jpath = dir.join(JOURNAL);
    if !jpath.exists() {
        return Ok(false);
    }
    let j = read_journal(&jpath)?;
    if alive(j.pid) {
        return Err(FolderError::Busy { pid: Some(j.pid) });
    }
    roll_forward(dir, &j, &mut |_| ControlFlow::Continue(()))?;
    Ok(true)
}

/// The steps of a commit after the journal; each can be repeated.
pub(super) fn roll_forward(
    dir: &Path,
    j: &Journal,
    hook: &mut dyn FnMut(Step) -> ControlFlow<()>,
) -> Result<(), FolderError> {
    let staging = dir.join(&j.staging);
    for (i, n) in j.moves.iter().enumerate() {
        let from = staging.join(n);
        if from.exists() {
            let to = dir.join(n);
            std::fs::rename(&from, &to).map_err(io_at(&to))?;
        }
        if hook(Step::Moved(i + 1)).is_break() {
            return Err(FolderError::Stopped);
        }
    }
    for n in &j.removes {
        let p = dir.join(n);
        if std::fs::symlink_metadata(&p).is_ok_and(|m| m.file_type().is_file()) {
            std::fs::remove_file(&p).map_err(io_at(&p))?;
        }
    }
    write_manifest(dir, &j.manifest, None)?;
    if staging.exists() {
        std::fs::remove_dir_all(&staging).map_err(io_at(&staging))?;
    }
    sync_dir(dir)?;
    let jpath = dir.join(JOURNAL);
    std::fs::remove_file(&jpath).map_err(io_at(&jpath))?;
    sync_dir(dir)
}

#[derive(Debug, Clone, PartialEq, Eq)]
pub(super) struct Journal {
    pub(super) pid: u32,
    pub(super) staging: String,
    pub(super) moves: Vec<String>,
    pub(super) removes: Vec<String>,
    pub(super) manifest: Vec<String>,
}

impl Journal {
    pub(super) fn to_text(&self) -> String {
        let mut t = format!(
            "{JOURNAL_HEADER}\npid {}\nstaging {}\n",
            self.pid, self.staging
        );
        for (key, names) in [
            ("move", &self.moves),
            ("remove", &self.removes),
            ("keep", &self.manifest),
        ] {
            for n in names {
                t.push_str(&format!("{key} {n}\n"));
            }
        }
        t.push_str("end\n");
        t
    }

    pub(super) fn parse(text: &str) -> Result<Journal, String> {
        let mut lines = text.lines();
        if lines.next() != Some(JOURNAL_HEADER) || !text.ends_with("end\n") {
            return Err("not a complete journal".into());
        }
        let mut j = Journal {
            pid: 0,
            staging: String::new(),
            moves: Vec::new(),
            removes: Vec::new(),
            manifest: Vec::new(),
        };
        for l in lines.filter(|l| *l != "end") {
            let (key, value) = l.split_once(' ').ok_or(format!("line '{l}'"))?;
            let value = value.to_string();
            if value.contains('/') || value.starts_with("..") {
                return Err(format!("name '{value}' is not a plain file name"));
            }
            match key {
                "pid" => j.pid = value.parse().map_err(|_| format!("pid '{value}'"))?,
                "staging" => j.staging = value,
                "move" => j.moves.push(value),
                "remove" => j.removes.push(value),
                "keep" => j.manifest.push(value),
                _ => return Err(format!("line '{l}'")),
            }
        }
        if !j.staging.starts_with(PREFIX) {
            return Err("no staging folder".into());
        }
        Ok(j)
    }
}

fn read_journal(path: &Path) -> Result<Journal, FolderError> {
    let text = std::fs::read_to_string(path).map_err(io_at(path))?;
    Journal::parse(&text).map_err(|reason| FolderError::BadJournal {
        path: path.to_path_buf(),
        reason,
    })
}

/// Write the journal atomically and exclusively: a synced temporary file is hard-linked to the
/// journal's name, which fails if a journal exists. A journal of a process no longer running is
/// completed first (the caller holds the folder's lock).
fn write_journal(dir: &Path, j: &Journal) -> Result<(), FolderError> {
    let jpath = dir.join(JOURNAL);
    let tmp = dir.join(format!(
        "{JOURNAL}.tmp-{}-{}",
        std::process::id(),
        crate::report::atomic::next_serial()
    ));
    let written = (|| {
        let mut f = std::fs::File::create(&tmp)?;
        f.write_all(j.to_text().as_bytes())?;
        f.sync_all()
    })();
    written.map_err(io_at(&tmp))?;
    let mut linked = std::fs::hard_link(&tmp, &jpath);
    if linked
        .as_ref()
        .is_err_and(|e| e.kind() == std::io::ErrorKind::AlreadyExists)
    {
        if let Err(e) = recover(dir, &super::process_alive) {
            let _ = std::fs::remove_file(&tmp);
            return Err(e);
        }
        linked = std::fs::hard_link(&tmp, &jpath);
    }
    let _ = std::fs::remove_file(&tmp);
    linked.map_err(io_at(&jpath))?;
    sync_dir(dir)
}
