//! The `--out` folder: file names unique per station, the new set swapped in as one folder (or,
//! where it cannot be, moved in under a journal that the next run completes), a manifest so that
//! only passbudget's own files are replaced or removed, leftovers of interrupted runs removed, and
//! no run that would fill the disk without being asked.

use crate::common::bin::{clean_error, command, root, run, success, write};
use crate::common::plan::load_plan_setup;
use passbudget::chart::ChartFormat;
use passbudget::report::files::{estimate_output, ChartBytes, OutputRequest};
use passbudget::report::{read_manifest, MANIFEST};
use std::collections::BTreeMap;
use std::path::Path;
use std::process::Output;

const MISSION: &str = "examples/wrenlet-1.yaml";

/// A copy of the shipped mission over stations at Nordkam's site with the given names.
fn mission_with_stations(dir: &Path, names: &[&str]) -> String {
    let station = std::fs::read_to_string(root().join("stations/nordkam.yaml")).unwrap();
    let mission = std::fs::read_to_string(root().join(MISSION)).unwrap();
    let mut list = String::new();
    for (k, n) in names.iter().enumerate() {
        let p = write(
            dir,
            &format!("st{k}.yaml"),
            &station.replace("name: Nordkam", &format!("name: \"{n}\"")),
        );
        list.push_str(&format!("  - {p}\n"));
    }
    let stations = "  - ../stations/nordkam.yaml\n  - ../stations/sierra-baja.yaml\n  - ../stations/pulau-reka.yaml\n";
    assert!(mission.contains(stations));
    let text = mission.replace(stations, &list).replace(
        "sat.tle",
        &root().join("examples/sat.tle").to_string_lossy(),
    );
    write(dir, "mission.yaml", &text)
}

/// Every file of a folder (hidden ones too) with its bytes.
fn contents(dir: &Path) -> BTreeMap<String, Vec<u8>> {
    std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap())
        .filter(|e| e.file_type().unwrap().is_file())
        .map(|e| {
            (
                e.file_name().to_string_lossy().into_owned(),
                std::fs::read(e.path()).unwrap(),
            )
        })
        .collect()
}

fn names(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    v.sort();
    v
}

fn hidden(dir: &Path) -> Vec<String> {
    names(dir)
        .into_iter()
        .filter(|n| n.starts_with('.'))
        .collect()
}

/// The manifest's names equal the folder's result files (all visible files but `keep`).
fn manifest_matches(dir: &Path, keep: &[&str]) {
    let listed: Vec<String> = read_manifest(dir).unwrap().into_iter().collect();
    let visible: Vec<String> = names(dir)
        .into_iter()
        .filter(|n| !n.starts_with('.') && !keep.contains(&n.as_str()))
        .collect();
    assert_eq!(listed, visible);
}

fn plan_into(out: &Path, extra: &[&str]) -> Output {
    let o = out.to_string_lossy().into_owned();
    let mut args = vec!["plan", MISSION, "--out", &o];
    args.extend_from_slice(extra);
    run(&args)
}

/// Stations whose names give the same file names are refused before any work, with two worker
/// threads (before: both threads wrote the same temporary file) and with one (before: one
/// station's charts replaced the other's). Such names are one name to `--station NAME` too, so
/// the mission itself refuses them when it is read; the output folder's own check
/// (`report::check_file_names`) stays behind it.
#[test]
fn stations_with_the_same_file_names_are_refused_before_any_work() {
    let dir = tempfile::tempdir().unwrap();
    let mission = mission_with_stations(dir.path(), &["Nord Kam", "Nord-Kam"]);
    for threads in ["1", "2"] {
        let out = dir.path().join(format!("out{threads}"));
        let o = out.to_string_lossy().into_owned();
        let r = command()
            .current_dir(root())
            .env("RAYON_NUM_THREADS", threads)
            .args(["plan", &mission, "--days", "0.5", "--out", &o, "--charts"])
            .output()
            .unwrap();
        clean_error(&r, &["two stations are named 'Nord Kam' and 'Nord-Kam'"]);
        assert!(
            !out.exists(),
            "the run created {} and left it",
            out.display()
        );
    }
}

/// A name with a precomposed letter (U+00E9) and the same name saved decomposed (`e` and the
/// combining acute U+0301) are one name, canonically equivalent by the Unicode Standard (UAX #15,
/// "Unicode Normalization Forms", section 1.1): two such stations are refused as one name,
/// `--station` typed either way finds the station, and its files are named alike. Before, the
/// accent became a `-` (`pe-rez`), and the two were two stations.
#[test]
fn a_name_precomposed_or_decomposed_is_one_name() {
    let dir = tempfile::tempdir().unwrap();
    let (composed, decomposed) = ("P\u{e9}rez Alta", "Pe\u{301}rez Alta");
    let two = mission_with_stations(dir.path(), &[composed, decomposed]);
    clean_error(
        &run(&["plan", &two, "--days", "0.3"]),
        &["two stations are named", "Unicode form"],
    );
    // The two station files given to `passes` name one station.
    let tle = root()
        .join("examples/sat.tle")
        .to_string_lossy()
        .into_owned();
    let files = [0, 1].map(|k| dir.path().join(format!("st{k}.yaml")));
    let files = files.map(|f| f.to_string_lossy().into_owned());
    let two_files = ["--station", &files[0], "--station", &files[1]];
    let start = ["--start", "2026-12-01T12:00:00Z", "--days", "0.3"];
    clean_error(
        &run(&[&["passes", "--tle", &tle][..], &two_files, &start].concat()),
        &["two --station values name the station"],
    );
    // An element set's object name saved decomposed is found by `--sat` typed precomposed.
    let text = std::fs::read_to_string(&tle).unwrap();
    let first = text.lines().next().unwrap().to_string();
    let renamed = write(
        dir.path(),
        "named.tle",
        &text.replacen(&first, "PE\u{301}REZ-1", 1),
    );
    let by_name = [
        "--sat",
        "p\u{e9}rez-1",
        "--station",
        &files[0],
        "--format",
        "json",
    ];
    let p = run(&[&["passes", "--tle", &renamed][..], &by_name, &start].concat());
    let p = crate::common::bin::json(&p);
    let first_pass = &p["passes"][0];
    assert_eq!(first_pass["satellite"], "PE\u{301}REZ-1");
    let one = mission_with_stations(dir.path(), &[decomposed]);
    let at = ["--elevation-deg", "30", "--format", "json"];
    let b = run(&[&["budget", &one, "--station", composed][..], &at[..]].concat());
    assert_eq!(crate::common::bin::json(&b)["station"], decomposed);
    let out = dir.path().join("out");
    let o = out.to_string_lossy().into_owned();
    let args = ["plan", &one, "--days", "0.3", "--out", &o, "--charts"];
    success(&run(&args));
    assert!(names(&out).contains(&"mask-p\u{e9}rez-alta.png".to_string()));
    // `chart --pass ID` takes the identifier in capitals, the accent decomposed.
    let id = first_pass["pass_id"].as_str().unwrap();
    assert!(id.starts_with("p\u{e9}rez-alta-"), "{id}");
    let upper = id.replace('\u{e9}', "E\u{301}").to_uppercase();
    let charts = dir.path().join("charts");
    let c = charts.to_string_lossy().into_owned();
    let pass = ["--pass", &upper, "--kind", "sky", "--out", &c];
    success(&run(
        &[&["chart", &one, "--days", "0.3"][..], &pass].concat()
    ));
    assert!(names(&charts).contains(&format!("sky-{id}.png")));
}

/// Station names in non-Latin scripts keep their letters in the file names (before: all became
/// `unnamed`, and one station's sky and mask charts replaced the other's).
#[test]
fn non_latin_station_names_give_their_own_files() {
    let dir = tempfile::tempdir().unwrap();
    let mission = mission_with_stations(dir.path(), &["東京局", "Москва"]);
    let out = dir.path().join("out");
    let o = out.to_string_lossy().into_owned();
    success(&run(&[
        "plan",
        &mission,
        "--days",
        "0.3",
        "--out",
        &o,
        "--charts",
        "--chart-format",
        "svg",
    ]));
    let n = names(&out);
    for f in [
        "mask-東京局.svg",
        "mask-москва.svg",
        "mask-all-stations.svg",
    ] {
        assert!(n.contains(&f.to_string()), "{f} not in {n:?}");
    }
    let csv = |s: &str| {
        n.iter()
            .filter(|x| x.contains(s) && x.ends_with(".csv"))
            .count()
    };
    assert!(
        csv("-東京局-") > 0 && csv("-東京局-") == csv("-москва-"),
        "{n:?}"
    );
    assert!(!n.iter().any(|x| x.contains("unnamed")), "{n:?}");
}

/// A station name of 300 characters: the run writes its files under a shortened name (before: it
/// failed only when the files were written, after the work).
#[test]
fn a_very_long_station_name_gives_short_file_names() {
    let dir = tempfile::tempdir().unwrap();
    let long = format!("Nordkam {}", "Long".repeat(73));
    let mission = mission_with_stations(dir.path(), &[&long]);
    let out = dir.path().join("out");
    let o = out.to_string_lossy().into_owned();
    success(&run(&[
        "plan",
        &mission,
        "--days",
        "0.3",
        "--out",
        &o,
        "--charts",
        "--chart-format",
        "svg",
    ]));
    let n = names(&out);
    assert!(
        n.iter().any(|x| x.starts_with("mask-nordkam-longlong")),
        "{n:?}"
    );
    assert!(n.iter().all(|x| x.len() < 120), "{n:?}");
}

/// Files of the user that merely look like outputs survive a run; files of a previous run that
/// the new run does not write are removed because the manifest lists them.
#[test]
fn only_files_passbudget_wrote_are_replaced_or_removed() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("out");
    std::fs::create_dir(&out).unwrap();
    let mine = [
        "pass-999-my-notes.csv",
        "summary-of-meeting.png",
        "notes.txt",
    ];
    for m in mine {
        std::fs::write(out.join(m), format!("{m} by the user")).unwrap();
    }
    success(&plan_into(&out, &["--days", "1"]));
    let first = names(&out);
    manifest_matches(&out, &mine);
    success(&plan_into(&out, &["--days", "0.5"]));
    let second = names(&out);
    assert!(
        second.len() < first.len(),
        "{} then {}",
        first.len(),
        second.len()
    );
    manifest_matches(&out, &mine);
    for m in mine {
        assert_eq!(
            std::fs::read_to_string(out.join(m)).unwrap(),
            format!("{m} by the user")
        );
    }
    assert_eq!(hidden(&out), [MANIFEST]);
}

/// A result file already in the folder that passbudget did not write is not replaced: the run
/// fails with one line and the folder is unchanged.
#[test]
fn a_same_named_file_of_the_user_is_not_replaced() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("out");
    std::fs::create_dir(&out).unwrap();
    std::fs::write(out.join("summary.json"), "the user's").unwrap();
    let before = contents(&out);
    clean_error(
        &plan_into(&out, &["--days", "0.3"]),
        &["summary.json", "not written by passbudget"],
    );
    assert_eq!(contents(&out), before);
}

/// What a reader of the folder sees: the visible files with the length and a 64-bit FNV-1a hash
/// of their bytes, and the manifest's names (the manifest's own bytes name the folder it was
/// built in).
fn state(dir: &Path) -> (BTreeMap<String, (usize, u64)>, Vec<String>) {
    let fnv = |b: &[u8]| {
        b.iter().fold(0xcbf2_9ce4_8422_2325u64, |h, &x| {
            (h ^ u64::from(x)).wrapping_mul(0x0100_0000_01b3)
        })
    };
    let files = contents(dir)
        .into_iter()
        .filter(|(n, _)| !n.starts_with('.'))
        .map(|(n, b)| (n, (b.len(), fnv(&b))))
        .collect();
    (files, read_manifest(dir).unwrap().into_iter().collect())
}

/// Entries of passbudget beside `dir` in its parent (siblings of a swap).
fn beside(dir: &Path) -> Vec<String> {
    let name = dir.file_name().unwrap().to_string_lossy().into_owned();
    names(dir.parent().unwrap())
        .into_iter()
        .filter(|n| n.starts_with(&format!(".{name}.passbudget-")))
        .collect()
}

/// A folder holding the results of `plan --days 1` and the user's `notes.txt` (and, for `journal`,
/// the user's folder `drafts/`, which makes the commit fall back to the journal).
fn previous_results(dir: &Path, name: &str, journal: bool) -> std::path::PathBuf {
    let out = dir.join(name);
    std::fs::create_dir(&out).unwrap();
    std::fs::write(out.join("notes.txt"), "the user's").unwrap();
    if journal {
        std::fs::create_dir(out.join("drafts")).unwrap();
    }
    success(&plan_into(&out, &["--days", "1"]));
    out
}

/// A kill at each step of the commit (the test hook aborts the process there; `start` is just
/// before it): the folder holds exactly the previous set or exactly the new one, and the next run
/// in that folder leaves exactly that set (swap) or completes the change before anything else
/// (journal: the fallback, here because the folder holds a folder of the user), with nothing
/// left inside or beside the folder.
#[test]
fn a_kill_at_any_step_of_the_commit_leaves_a_complete_set() {
    let dir = tempfile::tempdir().unwrap();
    for journal in [false, true] {
        let old = state(&previous_results(
            dir.path(),
            &format!("old{journal}"),
            journal,
        ));
        let reference = previous_results(dir.path(), &format!("ref{journal}"), journal);
        success(&plan_into(&reference, &["--days", "0.5"]));
        let new = state(&reference);
        let steps: &[&str] = if journal {
            &[
                "start",
                "locked",
                "journaled",
                "moved-1",
                "moved-7",
                "moved-12",
            ]
        } else {
            &[
                "start", "locked", "linked-1", "complete", "swapped", "restored",
            ]
        };
        for stop in steps {
            let out = previous_results(dir.path(), &format!("out-{stop}-{journal}"), journal);
            let o = out.to_string_lossy().into_owned();
            let r = command()
                .current_dir(root())
                .env("PASSBUDGET_TEST_STOP_AT", stop)
                .args(["plan", MISSION, "--days", "0.5", "--out", &o])
                .output()
                .unwrap();
            assert!(!r.status.success(), "the hook stopped the run at {stop}");
            let done = ["swapped", "restored"].contains(stop);
            if !journal {
                let expect = if done { &new } else { &old };
                assert_eq!(&state(&out), expect, "right after a kill at {stop}");
            }
            // The next run (here one that fails on its input right after opening the folder).
            let r = plan_into(&out, &["--step", "0"]);
            clean_error(&r, &["--step"]);
            let journaled = stop.starts_with("moved") || *stop == "journaled";
            let expect = if done || journaled { &new } else { &old };
            assert_eq!(&state(&out), expect, "after a kill at {stop}");
            assert_eq!(hidden(&out), [MANIFEST], "after a kill at {stop}");
            assert!(beside(&out).is_empty(), "{stop}: {:?}", beside(&out));
        }
    }
}

/// One `plan --out` into a folder holding a previous set, killed (SIGKILL) after `delay_ms`; then
/// a failing run in the same folder completes any interrupted change. Returns the folder's state.
fn kill_after(
    dir: &Path,
    k: usize,
    delay_ms: u64,
) -> (BTreeMap<String, (usize, u64)>, Vec<String>) {
    let out = previous_results(dir, &format!("out{k}"), false);
    let o = out.to_string_lossy().into_owned();
    let mut child = command()
        .current_dir(root())
        .args(["plan", MISSION, "--days", "0.5", "--out", &o])
        .stdout(std::process::Stdio::null())
        .stderr(std::process::Stdio::null())
        .spawn()
        .unwrap();
    std::thread::sleep(std::time::Duration::from_millis(delay_ms));
    let _ = child.kill();
    child.wait().unwrap();
    let now = state(&out);
    clean_error(&plan_into(&out, &["--step", "0"]), &["--step"]);
    assert_eq!(state(&out), now, "a kill after {delay_ms} ms");
    assert!(beside(&out).is_empty(), "{:?}", beside(&out));
    now
}

/// Real kills (SIGKILL) at moments spread over whole runs that replace a previous set: every
/// time, the folder holds exactly the previous or exactly the new set, and after the next run
/// nothing is left beside it.
#[test]
fn a_sigkill_at_any_moment_leaves_the_old_or_the_new_set() {
    let dir = tempfile::tempdir().unwrap();
    let old = state(&previous_results(dir.path(), "old", false));
    let reference = previous_results(dir.path(), "ref", false);
    let started = std::time::Instant::now();
    success(&plan_into(&reference, &["--days", "0.5"]));
    // Kills spread from the start to past the end of a whole run on this machine (whatever its
    // load), so both outcomes occur.
    let run_ms = started.elapsed().as_millis() as u64;
    let spacing_ms = (run_ms * 5 / 4 / 23).max(1);
    let new = state(&reference);
    let (mut seen_old, mut seen_new) = (0, 0);
    // 24 kills spread over a run; then, on a machine so loaded that none landed after the commit
    // (or none before it), later (earlier) ones until each outcome has occurred once.
    let mut delays: Vec<u64> = (0..24u64).map(|k| spacing_ms * k).collect();
    let mut k = 0;
    while k < delays.len() {
        let delay_ms = delays[k];
        let now = kill_after(dir.path(), k, delay_ms);
        assert!(
            now == old || now == new,
            "a kill after {delay_ms} ms: a mixed folder"
        );
        if now == old {
            seen_old += 1;
        } else {
            seen_new += 1;
        }
        k += 1;
        if k == delays.len() && delays.len() < 32 {
            if seen_new == 0 {
                delays.push(delays[k - 1] * 2 + run_ms);
            } else if seen_old == 0 {
                delays.push(0);
            }
        }
    }
    assert!(
        seen_old > 0 && seen_new > 0,
        "{seen_old} old, {seen_new} new"
    );
}

/// A child process killed (SIGKILL) when dropped: a failing assertion leaves no run behind.
struct KillOnDrop(std::process::Child);

impl Drop for KillOnDrop {
    fn drop(&mut self) {
        let _ = self.0.kill();
        let _ = self.0.wait();
    }
}

/// One `plan --days DAYS --charts` into `out`, killed (SIGKILL) as soon as its staging folder,
/// alone beside `out`, holds a CSV. True if the kill landed before the commit: the one folder
/// beside `out` is then the run's own staging folder (its manifest names the run's process);
/// false if the run got to its commit first (then `out` holds its results).
fn kill_once_staging(out: &Path, days: &str) -> bool {
    let o = out.to_string_lossy().into_owned();
    let mut child = KillOnDrop(
        command()
            .current_dir(root())
            .args(["plan", MISSION, "--days", days, "--out", &o, "--charts"])
            .stdout(std::process::Stdio::null())
            .stderr(std::process::Stdio::null())
            .spawn()
            .unwrap(),
    );
    let pid = child.0.id();
    let t0 = std::time::Instant::now();
    let staged_csv = || {
        let b = beside(out);
        b.len() == 1
            && b[0].contains(".passbudget-swap-")
            // (the folder may go between the two reads, at the commit)
            && std::fs::read_dir(out.parent().unwrap().join(&b[0])).is_ok_and(|d| {
                d.flatten()
                    .any(|e| e.file_name().to_string_lossy().ends_with(".csv"))
            })
    };
    while !staged_csv() {
        if let Some(status) = child.0.try_wait().unwrap() {
            assert!(status.success(), "the run failed: {status}");
            return false;
        }
        assert!(t0.elapsed().as_secs() < 60, "no staging folder appeared");
        std::thread::sleep(std::time::Duration::from_millis(5));
    }
    let _ = child.0.kill();
    let status = child.0.wait().unwrap();
    let own = beside(out).iter().any(|n| {
        std::fs::read_to_string(out.parent().unwrap().join(n).join(MANIFEST))
            .is_ok_and(|m| m.starts_with(&format!("#tree {pid}-")))
    });
    assert!(
        own || status.success() || status.code().is_none(),
        "the run failed: {status}"
    );
    own
}

/// A process killed while it plans leaves its staging folder; the next run removes it, as it
/// removes leftovers of other dead processes, and the previous results stay until then.
#[test]
fn leftovers_of_killed_runs_are_removed_by_the_next_run() {
    let dir = tempfile::tempdir().unwrap();
    // A run that ends before the kill lands (a fast machine) is tried again with a longer window
    // in a new folder: the test needs a run killed while it writes.
    let (out, before) = ["3", "10", "30"]
        .iter()
        .enumerate()
        .find_map(|(k, days)| {
            let out = dir.path().join(format!("out{k}"));
            success(&plan_into(&out, &["--days", "0.3"]));
            let before = contents(&out);
            kill_once_staging(&out, days).then_some((out, before))
        })
        .expect("every run ended before the kill");
    assert_eq!(beside(&out).len(), 1, "{:?}", beside(&out));
    // A leftover backup folder of an earlier version, of a process that has ended.
    let mut ended = std::process::Command::new("true").spawn().unwrap();
    let dead = ended.id();
    ended.wait().unwrap();
    std::fs::create_dir(out.join(format!(".passbudget-previous-{dead}"))).unwrap();
    let visible = |m: &BTreeMap<String, Vec<u8>>| {
        m.iter()
            .filter(|(n, _)| !n.starts_with('.'))
            .map(|(n, b)| (n.clone(), b.clone()))
            .collect::<BTreeMap<_, _>>()
    };
    assert_eq!(
        visible(&contents(&out)),
        visible(&before),
        "previous results in place"
    );
    let r = plan_into(&out, &["--step", "0"]);
    clean_error(&r, &["--step"]);
    assert!(String::from_utf8_lossy(&r.stderr).contains("removed 2"));
    assert_eq!(contents(&out), before);
    assert!(beside(&out).is_empty(), "{:?}", beside(&out));
}

/// A run whose output would pass 1 GB or 5000 files is refused before any work, with one line
/// that says how to narrow it, unless the user asks for it.
#[test]
fn a_very_large_output_is_refused_before_any_work() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("out");
    // a year from one element set: allowed explicitly (a long-term volume statistic)
    let year = ["--days", "365", "--allow-stale-elements"];
    let r = plan_into(&out, &[&year[..], &["--charts"]].concat());
    clean_error(
        &r,
        &[
            "--out",
            "files",
            "GB",
            "--days",
            "--charts",
            "--allow-large-output",
        ],
    );
    assert!(
        !out.exists(),
        "the run created {} and left it",
        out.display()
    );
    let r = run(&[
        "chart",
        MISSION,
        "--days",
        "365",
        "--allow-stale-elements",
        "--out",
        &out.to_string_lossy(),
    ]);
    clean_error(&r, &["--allow-large-output"]);
}

/// The estimate is on the upper side of what a run writes, but not far above it (the shipped
/// example, one day, CSVs and PNG charts).
#[test]
fn the_output_estimate_matches_a_real_run() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("out");
    success(&plan_into(&out, &["--days", "1", "--charts"]));
    let files = contents(&out);
    let written_files = files.len() as u64 - 1; // not the manifest
    let written_bytes: u64 = files.values().map(|b| b.len() as u64).sum();
    let setup = load_plan_setup(&root().join(MISSION));
    let start = passbudget::timefmt::utc(2026, 12, 1, 12, 0, 0);
    let planner = setup.planner(start, start + chrono::Duration::days(1));
    let request = OutputRequest {
        csv: true,
        pass_charts: true,
        sky_charts: true,
        chart_bytes: ChartBytes::of(ChartFormat::Png),
    };
    let e = estimate_output(&planner, &request).unwrap();
    assert!(
        e.files >= written_files && e.files <= written_files + 6,
        "{e:?} against {written_files} files"
    );
    assert!(
        e.bytes as f64 >= written_bytes as f64 && (e.bytes as f64) < 1.5 * written_bytes as f64,
        "{e:?} against {written_bytes} bytes"
    );
}

/// A run that fails leaves no trace: an output folder it created is removed again (the README's
/// exit-code section says DIR is unchanged; before, a new empty DIR was left behind).
#[test]
fn a_failed_run_does_not_leave_the_folder_it_created() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("new-folder");
    clean_error(&plan_into(&out, &["--step", "0"]), &["--step"]);
    assert!(!out.exists(), "{} was left behind", out.display());
    // A folder that existed stays, with what it held.
    std::fs::create_dir(&out).unwrap();
    std::fs::write(out.join("notes.txt"), "mine").unwrap();
    clean_error(&plan_into(&out, &["--step", "0"]), &["--step"]);
    assert_eq!(
        std::fs::read_to_string(out.join("notes.txt")).unwrap(),
        "mine"
    );
}
