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

/// Stage `files` and commit them.
fn run(dir: &Path, files: &[(&str, &str)], mode: CommitMode) -> Result<(), FolderError> {
    let s = Staging::new(dir)?;
    for (n, t) in files {
        put(s.path(), n, t);
    }
    s.commit(mode)
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
    assert_eq!(read(out, MANIFEST), "pass-002-a-y.csv\nsummary.json\n");
}

#[test]
fn add_keeps_the_other_files_of_earlier_runs() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path();
    run(out, &[("a.png", "1"), ("b.png", "1")], CommitMode::Replace).unwrap();
    run(out, &[("b.png", "2"), ("c.png", "2")], CommitMode::Add).unwrap();
    assert_eq!(visible(out), ["a.png", "b.png", "c.png"]);
    assert_eq!(read(out, "b.png"), "2");
    assert_eq!(read(out, MANIFEST), "a.png\nb.png\nc.png\n");
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

/// A commit stopped after `n` moves (as by a kill), then recovered as by a later process.
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
    let s = Staging::new(out).unwrap();
    for (name, text) in &new {
        put(s.path(), name, text);
    }
    let e = s
        .commit_with(CommitMode::Replace, |k| {
            if k >= n {
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
fn an_interrupted_commit_is_completed_at_every_step() {
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
    assert!(matches!(e, FolderError::Busy { pid: 77 }), "{e}");
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
