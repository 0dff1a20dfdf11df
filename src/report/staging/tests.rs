use super::journal::Journal;
use super::*;

fn put(dir: &Path, name: &str, text: &str) {
    std::fs::write(dir.join(name), text).unwrap();
}

fn read(dir: &Path, name: &str) -> String {
    std::fs::read_to_string(dir.join(name)).unwrap()
}

/// The visible names of the folder, sorted.
fn visible(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = list_names(dir)
        .unwrap()
        .into_iter()
        .filter(|n| !n.starts_with('.'))
        .collect();
    v.sort();
    v
}

fn hidden(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = list_names(dir)
        .unwrap()
        .into_iter()
        .filter(|n| n.starts_with('.'))
        .collect();
    v.sort();
    v
}

fn names(set: &BTreeSet<String>) -> Vec<&str> {
    set.iter().map(String::as_str).collect()
}

/// Stage `files` and commit them.
fn run(dir: &Path, files: &[(&str, &str)], mode: CommitMode) -> Result<(), FolderError> {
    let s = Staging::new(dir)?;
    for (n, t) in files {
        put(s.path(), n, t);
    }
    s.commit(mode).map(|_| ())
}

#[test]
fn replace_removes_only_what_the_manifest_lists() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path();
    // Files of the user that merely look like ours.
    put(out, "pass-999-my-notes.csv", "mine");
    put(out, "summary-of-meeting.png", "mine");
    run(
        out,
        &[("summary.json", "1"), ("pass-001-a-x.csv", "1")],
        CommitMode::Replace,
    )
    .unwrap();
    // The second run no longer has pass 1: the manifest lists it, so it goes.
    run(
        out,
        &[("summary.json", "2"), ("pass-002-a-y.csv", "2")],
        CommitMode::Replace,
    )
    .unwrap();
    assert_eq!(
        visible(out),
        [
            "pass-002-a-y.csv",
            "pass-999-my-notes.csv",
            "summary-of-meeting.png",
            "summary.json"
        ]
    );
    assert_eq!(read(out, "summary.json"), "2");
    assert_eq!(read(out, "pass-999-my-notes.csv"), "mine");
    assert_eq!(hidden(out), [MANIFEST]);
    assert_eq!(
        names(&read_manifest(out).unwrap()),
        ["pass-002-a-y.csv", "summary.json"]
    );
}

#[test]
fn add_keeps_the_other_files_of_earlier_runs() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path();
    run(out, &[("a.png", "1"), ("b.png", "1")], CommitMode::Replace).unwrap();
    run(out, &[("b.png", "2"), ("c.png", "2")], CommitMode::Add).unwrap();
    assert_eq!(visible(out), ["a.png", "b.png", "c.png"]);
    assert_eq!(read(out, "b.png"), "2");
    assert_eq!(
        names(&read_manifest(out).unwrap()),
        ["a.png", "b.png", "c.png"]
    );
}

#[test]
fn a_file_not_written_by_passbudget_is_never_replaced() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path();
    put(out, "summary.json", "the user's own");
    let e = run(out, &[("summary.json", "new")], CommitMode::Replace).unwrap_err();
    assert!(e.to_string().contains("not written by passbudget"), "{e}");
    assert_eq!(read(out, "summary.json"), "the user's own");
    // A destination that is a folder: nothing changes.
    std::fs::create_dir(out.join("days.csv")).unwrap();
    let e = run(out, &[("days.csv", "d")], CommitMode::Replace).unwrap_err();
    assert!(e.to_string().contains("not a plain file"), "{e}");
    assert!(hidden(out).is_empty(), "{:?}", hidden(out));
}

/// A journaled commit stopped after `n` moves (as by a kill), then recovered as by a later
/// process.
fn interrupted_then_recovered(n: usize) {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path();
    let old: Vec<(String, String)> = (0..5)
        .map(|i| (format!("pass-{i:03}-old.csv"), format!("old {i}")))
        .collect();
    let old_ref: Vec<(&str, &str)> = old.iter().map(|(a, b)| (a.as_str(), b.as_str())).collect();
    run(out, &old_ref, CommitMode::Replace).unwrap();
    let new: Vec<(String, String)> = (3..9)
        .map(|i| (format!("pass-{i:03}-old.csv"), format!("new {i}")))
        .collect();
    let s = Staging::journaled(out, "test".into()).unwrap();
    for (name, text) in &new {
        put(s.path(), name, text);
    }
    let e = s
        .commit_with(CommitMode::Replace, |k| {
            if matches!(k, Step::Moved(m) if m >= n) {
                ControlFlow::Break(())
            } else {
                ControlFlow::Continue(())
            }
        })
        .unwrap_err();
    assert!(matches!(e, FolderError::Stopped));
    assert!(out.join(JOURNAL).exists());
    // The next run's start: the process that wrote the journal is gone.
    let me = std::process::id();
    let r = recover_with(out, &|pid| pid != me).unwrap();
    assert!(r.completed_commit);
    let names: Vec<String> = new.iter().map(|(a, _)| a.clone()).collect();
    assert_eq!(visible(out), names, "the complete new set after {n} moves");
    for (name, text) in &new {
        assert_eq!(&read(out, name), text);
    }
    assert_eq!(hidden(out), [MANIFEST]);
}

#[test]
fn an_interrupted_journaled_commit_is_completed_at_every_step() {
    for n in 1..=6 {
        interrupted_then_recovered(n);
    }
}

#[test]
fn leftovers_of_dead_processes_are_removed_and_live_ones_kept() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path();
    put(out, "summary.json", "x");
    for d in [
        ".passbudget-staging-4000001-0",
        ".passbudget-previous-4000002",
        ".passbudget-staging-77-3",
    ] {
        std::fs::create_dir(out.join(d)).unwrap();
        put(&out.join(d), "pass-001-a.csv", "stale");
    }
    put(out, ".passbudget-manifest.tmp-4000003-9", "half");
    put(out, ".passbudget-stagingX", "not ours");
    let r = recover_with(out, &|pid| pid == 77).unwrap();
    assert_eq!(r.removed_leftovers, 3);
    assert_eq!(
        hidden(out),
        [".passbudget-staging-77-3", ".passbudget-stagingX"]
    );
    assert_eq!(visible(out), ["summary.json"]);
    // A journal of a running process is not touched.
    let j = Journal {
        pid: 77,
        staging: ".passbudget-staging-77-3".into(),
        moves: vec!["pass-001-a.csv".into()],
        removes: vec![],
        manifest: vec!["pass-001-a.csv".into()],
    };
    put(out, JOURNAL, &j.to_text());
    let e = recover_with(out, &|pid| pid == 77).unwrap_err();
    assert!(matches!(e, FolderError::Busy { pid: Some(77) }), "{e}");
    assert_eq!(Journal::parse(&j.to_text()).unwrap(), j);
    assert!(
        Journal::parse("passbudget-journal 1\npid 1\nstaging .passbudget-staging-1-0\nmove a")
            .is_err()
    );
}

#[test]
fn leftover_names() {
    assert_eq!(leftover_pid(".passbudget-staging-123-4"), Some(123));
    assert_eq!(leftover_pid(".passbudget-previous-55"), Some(55));
    assert_eq!(leftover_pid(".passbudget-journal.tmp-9-1"), Some(9));
    assert_eq!(leftover_pid(".passbudget-write-check-8"), Some(8));
    assert_eq!(leftover_pid(MANIFEST), None);
    assert_eq!(leftover_pid(JOURNAL), None);
    assert_eq!(leftover_pid(".passbudget-staging-12x"), None);
    assert_eq!(leftover_pid("pass-001-a.csv"), None);
}

/// What a reader of the folder sees: every visible entry with its bytes (a folder as `<dir>`),
/// and the manifest's names.
#[cfg(target_os = "linux")]
#[derive(Debug, Clone, PartialEq, Eq)]
struct Seen {
    files: BTreeSet<(String, String)>,
    manifest: BTreeSet<String>,
}

#[cfg(target_os = "linux")]
fn seen(dir: &Path) -> Seen {
    let files = visible(dir)
        .into_iter()
        .map(|n| {
            let text = std::fs::read_to_string(dir.join(&n)).unwrap_or_else(|_| "<dir>".into());
            (n, text)
        })
        .collect();
    Seen {
        files,
        manifest: read_manifest(dir).unwrap(),
    }
}

/// The hidden entries of passbudget next to `out` in its parent.
#[cfg(target_os = "linux")]
fn siblings(out: &Path) -> Vec<String> {
    list_names(out.parent().unwrap())
        .unwrap()
        .into_iter()
        .filter(|n| n.contains(".passbudget-"))
        .collect()
}

/// A folder with an earlier result set and files of the user (one linked elsewhere too).
fn folder_with_previous_set(root: &Path) -> PathBuf {
    let out = root.join("out");
    std::fs::create_dir(&out).unwrap();
    put(&out, "notes.txt", "the user's notes");
    put(&out, "pass-999-my-notes.csv", "the user's table");
    let old: Vec<(String, String)> = (0..4)
        .map(|i| (format!("pass-{i:03}-a.csv"), format!("old {i}")))
        .collect();
    let old: Vec<(&str, &str)> = old.iter().map(|(a, b)| (a.as_str(), b.as_str())).collect();
    run(&out, &old, CommitMode::Replace).unwrap();
    out
}

fn stage_new(out: &Path) -> Staging {
    let s = Staging::new(out).unwrap();
    for i in 2..7 {
        put(s.path(), &format!("pass-{i:03}-a.csv"), &format!("new {i}"));
    }
    s
}

/// The steps of a swapped commit with two files of the user to keep.
#[cfg(target_os = "linux")]
const SWAP_STEPS: [Step; 6] = [
    Step::Locked,
    Step::Linked(1),
    Step::Linked(2),
    Step::Complete,
    Step::Swapped,
    Step::Restored,
];

/// A swapped commit stopped at each of its steps (as by a kill): at every moment the folder holds
/// exactly the previous set or exactly the new one, never a mix; the next run (recover, as
/// another process) leaves exactly that set, gives back a file of the user replaced during the
/// run, and removes everything beside the folder.
#[cfg(target_os = "linux")]
#[test]
fn a_swap_stopped_at_any_step_leaves_the_old_or_the_new_set() {
    let reference = tempfile::tempdir().unwrap();
    let r_out = folder_with_previous_set(reference.path());
    let old = seen(&r_out);
    let s = stage_new(&r_out);
    assert_eq!(
        s.commit(CommitMode::Replace).unwrap(),
        CommitMethod::Swapped
    );
    let new = seen(&r_out);
    assert_ne!(old, new);
    assert!(new
        .files
        .contains(&("notes.txt".into(), "the user's notes".into())));
    assert!(siblings(&r_out).is_empty(), "{:?}", siblings(&r_out));
    for stop in SWAP_STEPS {
        let root = tempfile::tempdir().unwrap();
        let out = folder_with_previous_set(root.path());
        let s = stage_new(&out);
        let e = s
            .commit_with(CommitMode::Replace, |k| {
                // The folder as a reader sees it at every step up to the stop.
                let now = seen(&out);
                assert!(now == old || now == new, "at {k}: {now:?}");
                if k == stop {
                    ControlFlow::Break(())
                } else {
                    ControlFlow::Continue(())
                }
            })
            .unwrap_err();
        assert!(matches!(e, FolderError::Stopped), "{e}");
        let before_swap = matches!(stop, Step::Locked | Step::Linked(_) | Step::Complete);
        assert_eq!(&seen(&out), if before_swap { &old } else { &new }, "{stop}");
        let me = std::process::id();
        recover_with(&out, &|pid| pid != me).unwrap();
        assert_eq!(&seen(&out), if before_swap { &old } else { &new }, "{stop}");
        assert!(siblings(&out).is_empty(), "{stop}: {:?}", siblings(&out));
        assert_eq!(hidden(&out), [MANIFEST], "{stop}");
    }
}

/// Files of the user changed while the new folder is built: an edit in place (the linked file is
/// the same file), a file replaced by a new one (as editors save) and a new file are all in the
/// folder after the swap, also when the run is killed right after the exchange and the next run
/// completes it, and also when part of the previous folder was already removed.
#[cfg(target_os = "linux")]
#[test]
fn files_of_the_user_changed_during_the_run_are_kept() {
    for kill in [None, Some(Step::Swapped), Some(Step::Restored)] {
        let root = tempfile::tempdir().unwrap();
        let out = folder_with_previous_set(root.path());
        let s = stage_new(&out);
        let result = s.commit_with(CommitMode::Replace, |k| {
            if k == Step::Complete {
                use std::io::Write;
                std::fs::OpenOptions::new()
                    .append(true)
                    .open(out.join("notes.txt"))
                    .and_then(|mut f| f.write_all(b", edited"))
                    .unwrap();
                put(&out, "saved.tmp", "the user's table, saved again");
                std::fs::rename(out.join("saved.tmp"), out.join("pass-999-my-notes.csv")).unwrap();
                put(&out, "todo.txt", "new during the run");
            }
            if Some(k) == kill {
                if k == Step::Restored {
                    // Part of the previous folder already removed when the kill came.
                    let prev = out.parent().unwrap().join(&siblings(&out)[0]);
                    std::fs::remove_file(prev.join("pass-000-a.csv")).unwrap();
                }
                ControlFlow::Break(())
            } else {
                ControlFlow::Continue(())
            }
        });
        if kill.is_some() {
            let me = std::process::id();
            let r = recover_with(&out, &|pid| pid != me).unwrap();
            assert!(r.completed_commit);
            assert_eq!(
                r.restored_files,
                if kill == Some(Step::Swapped) { 2 } else { 0 }
            );
        } else {
            assert_eq!(result.unwrap(), CommitMethod::Swapped);
        }
        assert_eq!(read(&out, "notes.txt"), "the user's notes, edited");
        assert_eq!(
            read(&out, "pass-999-my-notes.csv"),
            "the user's table, saved again"
        );
        assert_eq!(read(&out, "todo.txt"), "new during the run");
        assert_eq!(read(&out, "pass-006-a.csv"), "new 6");
        assert!(!out.join("pass-000-a.csv").exists());
        assert!(siblings(&out).is_empty(), "{:?}", siblings(&out));
    }
}

/// A folder that holds a folder of the user cannot be swapped (a folder cannot be hard-linked):
/// the commit falls back to the journal and says why; the permissions of the folder are kept by
/// a swap.
#[cfg(target_os = "linux")]
#[test]
fn a_folder_inside_falls_back_to_the_journal_and_permissions_are_kept() {
    use std::os::unix::fs::PermissionsExt;
    let root = tempfile::tempdir().unwrap();
    let out = folder_with_previous_set(root.path());
    std::fs::set_permissions(&out, std::fs::Permissions::from_mode(0o750)).unwrap();
    let s = stage_new(&out);
    assert_eq!(
        s.commit(CommitMode::Replace).unwrap(),
        CommitMethod::Swapped
    );
    let mode = std::fs::metadata(&out).unwrap().permissions().mode();
    assert_eq!(mode & 0o7777, 0o750);
    std::fs::create_dir(out.join("drafts")).unwrap();
    put(&out.join("drafts"), "a.txt", "draft");
    let s = stage_new(&out);
    let m = s.commit(CommitMode::Replace).unwrap();
    assert_eq!(
        m,
        CommitMethod::Journaled {
            reason: "it holds a folder (drafts)".into()
        }
    );
    assert_eq!(read(&out.join("drafts"), "a.txt"), "draft");
    assert_eq!(read(&out, "pass-002-a.csv"), "new 2");
    assert_eq!(hidden(&out), [MANIFEST]);
    assert!(siblings(&out).is_empty(), "{:?}", siblings(&out));
}

/// The lock is taken before the manifest is read: a second commit into the folder while one holds
/// it is refused (before: each read the manifest, then the later journal won, and the files of
/// the earlier set that the later one did not list stayed behind, counted as the user's).
#[test]
fn a_second_commit_while_one_holds_the_lock_is_refused() {
    let root = tempfile::tempdir().unwrap();
    let out = folder_with_previous_set(root.path());
    let first = stage_new(&out);
    let second = Staging::new(&out).unwrap();
    put(second.path(), "pass-100-b.csv", "second");
    let mut refused = None;
    first
        .commit_with(CommitMode::Replace, |k| {
            if k == Step::Locked {
                refused = Some(Staging::new(&out).err());
            }
            ControlFlow::Continue(())
        })
        .unwrap();
    assert!(
        matches!(refused, Some(Some(FolderError::Busy { pid: None }))),
        "{refused:?}"
    );
    // Staging::new refused while the lock was held; a commit after the first is complete works
    // and replaces exactly the first's set.
    second.commit(CommitMode::Replace).unwrap();
    assert_eq!(names(&read_manifest(&out).unwrap()), ["pass-100-b.csv"]);
    assert_eq!(
        visible(&out),
        ["notes.txt", "pass-100-b.csv", "pass-999-my-notes.csv"]
    );
}

/// Leftovers beside the folder of runs killed at other moments: a sibling killed while its
/// manifest was first written (only a temporary file in it), the probe folder, and a previous
/// folder of which a part (not its manifest, which goes last) was already removed: the next run
/// removes them all and moves nothing into the folder but the user's files.
#[cfg(target_os = "linux")]
#[test]
fn leftovers_beside_the_folder_are_removed_without_touching_it() {
    let root = tempfile::tempdir().unwrap();
    let out = folder_with_previous_set(root.path());
    let before = seen(&out);
    let dead = 4_000_001;
    let early = root.path().join(format!(".out.passbudget-swap-{dead}-0"));
    std::fs::create_dir(&early).unwrap();
    put(
        &early,
        &format!("{MANIFEST}.tmp-{dead}-1").replacen('.', "..", 1),
        "#tree",
    );
    let probe = root
        .path()
        .join(format!(".out.passbudget-swap-{dead}-2-probe"));
    std::fs::create_dir(&probe).unwrap();
    let previous = root.path().join(format!(".out.passbudget-swap-{dead}-3"));
    std::fs::create_dir(&previous).unwrap();
    put(
        &previous,
        MANIFEST,
        "#tree 1-1\npass-000-a.csv\npass-001-a.csv\n",
    );
    put(&previous, "pass-001-a.csv", "older");
    put(&previous, "lost.txt", "a file of the user only here");
    let r = recover_with(&out, &|pid| pid != dead).unwrap();
    assert_eq!(r.removed_leftovers, 3);
    assert_eq!(r.restored_files, 1);
    assert!(r.completed_commit);
    assert!(siblings(&out).is_empty(), "{:?}", siblings(&out));
    let mut expect = before;
    expect
        .files
        .insert(("lost.txt".into(), "a file of the user only here".into()));
    assert_eq!(seen(&out), expect);
    assert_eq!(hidden(&out), [MANIFEST]);
    assert!(swap::is_temporary("..passbudget-manifest.tmp-12-0"));
    assert!(swap::is_temporary(".pass-001-a.csv.tmp-12-3"));
    assert!(!swap::is_temporary("notes.tmp-12-3"));
    assert!(!swap::is_temporary(".notes.tmp-12"));
}

/// The root of the file system is refused before anything is created or written there (the
/// predicate is checked first, so this test never writes into the root even if the refusal
/// broke); any other folder is not the root.
#[test]
fn the_file_system_root_is_refused() {
    let tmp = tempfile::tempdir().unwrap();
    assert!(!is_file_system_root(tmp.path()));
    for root in ["/", "/tmp/.."] {
        assert!(is_file_system_root(Path::new(root)), "{root}");
        assert!(matches!(
            Staging::new(Path::new(root)),
            Err(FolderError::Root { .. })
        ));
    }
}
