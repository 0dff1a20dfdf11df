//! Hardening of the command line and the planner: a closed stderr, repeated stations, windows out
//! of range, one propagation stop per plan, configuration messages, element-set histories and a
//! dense horizon mask. The missions are the invented WRENLET-1 example with its invented stations.

use crate::common::bin::{clean_error, command, json, root, run, success, write};
use passbudget::config::mission::Mission;
use passbudget::geometry::HorizonMask;
use passbudget::orbit::tle::with_checksum;
use passbudget::orbit::{load_elements, Propagator};
use passbudget::plan::{PlanRequest, Planner};
use passbudget::timefmt::{add_seconds, parse_utc};
use std::io::Read;
use std::path::Path;
use std::process::Stdio;

/// The shipped mission rewritten into `dir` with absolute paths, `elements` as its element file
/// and the window `start` + `days`.
fn mission_in(dir: &Path, elements: &str, start: &str, days: f64) -> String {
    let r = root();
    let text = std::fs::read_to_string(r.join("examples/wrenlet-1.yaml"))
        .unwrap()
        .replace("elements: sat.tle", &format!("elements: {elements}"))
        .replace("../stations/", &format!("{}/stations/", r.display()))
        .replace("start: 2026-12-01T12:00:00Z", &format!("start: {start}"))
        .replace("days: 7", &format!("days: {days}"));
    write(dir, "mission.yaml", &text)
}

/// The shipped mission rewritten into `dir` for one day from its epoch, with its own elements.
fn one_day_mission_in(dir: &Path) -> String {
    let elements = root().join("examples/sat.tle").display().to_string();
    mission_in(dir, &elements, "2026-12-01T12:00:00Z", 1.0)
}

/// `atmosphere` for the station file `station` at 8.2 GHz and 30 deg (the arguments).
fn atmosphere_at_30_deg(station: &str) -> [&str; 7] {
    [
        "atmosphere",
        "--station",
        station,
        "--frequency-ghz",
        "8.2",
        "--elevation-deg",
        "30",
    ]
}

/// Runs the binary with stderr connected to a pipe whose read end is closed before the binary
/// writes to it; returns the exit code and stdout.
fn run_with_closed_stderr(args: &[&str]) -> (Option<i32>, String) {
    let mut child = command()
        .current_dir(root())
        .args(args)
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("binary runs");
    drop(child.stderr.take());
    let mut out = String::new();
    child
        .stdout
        .take()
        .unwrap()
        .read_to_string(&mut out)
        .unwrap();
    (child.wait().unwrap().code(), out)
}

// ---- item 1: a closed stderr costs nothing on stdout ----

#[test]
fn closed_stderr_keeps_the_result() {
    // A note (the satellite does not rise over the station in 15 minutes) and the element-age
    // warning (30 days) are written to the closed stderr; both runs must still succeed.
    let passes = [
        "passes",
        "--tle",
        "examples/sat.tle",
        "--station",
        "stations/pulau-reka.yaml",
        "--start",
        "2026-12-01T12:00:00Z",
        "--days",
        "0.01",
        "--format",
        "json",
    ];
    let (code, out) = run_with_closed_stderr(&passes);
    assert_eq!(code, Some(0), "stdout: {out}");
    let doc: serde_json::Value = serde_json::from_str(&out).expect("full JSON on stdout");
    assert_eq!(doc["passes"].as_array().unwrap().len(), 0);

    let plan = [
        "plan",
        "examples/wrenlet-1.yaml",
        "--days",
        "30",
        "--format",
        "json",
    ];
    let (code, out) = run_with_closed_stderr(&plan);
    assert_eq!(code, Some(0));
    let doc: serde_json::Value = serde_json::from_str(&out).expect("full JSON on stdout");
    assert!(doc["totals"]["passes"].as_u64().unwrap() > 100);
}

#[test]
fn no_direct_print_in_the_sources() {
    // Every stderr line goes through cli::warn / cli::note (which ignore write errors); stdout is
    // written through the command's writer only.
    fn walk(dir: &Path, found: &mut Vec<String>) {
        for e in std::fs::read_dir(dir).unwrap() {
            let p = e.unwrap().path();
            if p.is_dir() {
                walk(&p, found);
            } else if p.extension().is_some_and(|x| x == "rs") {
                let text = std::fs::read_to_string(&p).unwrap();
                // Unit tests at the end of a file may print.
                let code = text.split("#[cfg(test)]").next().unwrap();
                for (n, line) in code.lines().enumerate() {
                    let l = line.trim_start();
                    if l.starts_with("//") {
                        continue;
                    }
                    for m in ["eprintln!", "eprint!", "println!", "print!(", "dbg!"] {
                        if l.contains(m) {
                            found.push(format!("{}:{}: {l}", p.display(), n + 1));
                        }
                    }
                }
            }
        }
    }
    let mut found = Vec::new();
    walk(&root().join("src"), &mut found);
    assert!(found.is_empty(), "{found:#?}");
}

// ---- item 5: values that slip through ----

#[test]
fn the_same_station_twice_is_refused() {
    let o = run(&[
        "passes",
        "--tle",
        "examples/sat.tle",
        "--station",
        "stations/nordkam.yaml",
        "--station",
        "./stations/nordkam.yaml",
        "--start",
        "2026-12-01T12:00:00Z",
    ]);
    clean_error(&o, &["--station", "given twice", "nordkam.yaml"]);
    // Two files naming the same station.
    let dir = tempfile::tempdir().unwrap();
    let copy = write(
        dir.path(),
        "copy.yaml",
        &std::fs::read_to_string(root().join("stations/nordkam.yaml")).unwrap(),
    );
    let o = run(&[
        "passes",
        "--tle",
        "examples/sat.tle",
        "--station",
        "stations/nordkam.yaml",
        "--station",
        &copy,
        "--start",
        "2026-12-01T12:00:00Z",
    ]);
    clean_error(&o, &["--station", "'Nordkam'"]);
}

#[test]
fn huge_windows_are_refused_at_once() {
    let t = std::time::Instant::now();
    for cmd in ["passes", "track"] {
        let base = [
            cmd,
            "--tle",
            "examples/sat.tle",
            "--station",
            "stations/nordkam.yaml",
            "--start",
            "2026-12-01T12:00:00Z",
        ];
        let o = run(&[&base[..], &["--days", "1e9"]].concat());
        clean_error(&o, &["--days", "window length"]);
        let o = run(&[&base[..], &["--end", "2126-12-01T12:00:00Z"]].concat());
        clean_error(&o, &["--end", "2126-12-01", "longer than"]);
    }
    // Refused before any propagation: far below the time of one 100-year search (common practice
    // bound: a generous 60 s for four debug-build runs).
    assert!(t.elapsed().as_secs() < 60, "{:?}", t.elapsed());
}

// ---- item 6: one propagation stop per plan ----

/// Invented very-low satellite with a high drag term: SGP4 fails within days.
fn decaying_tle() -> String {
    let l1 = "1 99903U          26335.50000000  .00500000  00000-0  50000-2 0    10";
    let l2 = "2 99903  51.6000  10.0000 0005000   0.0000   0.0000 16.30000000    10";
    format!(
        "SINKER-DEMO\n{}\n{}\n",
        with_checksum(&l1[..68]).unwrap(),
        with_checksum(&l2[..68]).unwrap()
    )
}

#[test]
fn a_decay_is_reported_once_at_the_first_failing_second() {
    let dir = tempfile::tempdir().unwrap();
    let tle = write(dir.path(), "sinker.tle", &decaying_tle());
    let path = mission_in(dir.path(), &tle, "2026-12-01T12:00:00Z", 30.0);
    let text = std::fs::read_to_string(&path).unwrap();
    std::fs::write(
        &path,
        text.replace("select: \"99901\"", "select: \"99903\""),
    )
    .unwrap();
    let mission = Mission::load(Path::new(&path)).unwrap();
    let plan = Planner::new(&mission, &PlanRequest::default())
        .unwrap()
        .collect()
        .unwrap();
    let stops: Vec<&String> = plan
        .warnings
        .iter()
        .filter(|w| w.contains("propagation stop"))
        .collect();
    let head: Vec<&&String> = stops
        .iter()
        .filter(|w| w.contains("propagation stops at "))
        .collect();
    assert_eq!(head.len(), 1, "{stops:#?}");
    // The time, in RFC 3339, right after "stops at ".
    let after = head[0].split("propagation stops at ").nth(1).unwrap();
    let t = parse_utc(after.split_whitespace().next().unwrap()).unwrap();
    assert!(
        head[0].contains("no passes after it are planned"),
        "{}",
        head[0]
    );
    // It is the first failing second: propagation works 1 s before and fails at it.
    let set = load_elements(Path::new(&tle)).unwrap().remove(0);
    let prop = Propagator::new(&set).unwrap();
    assert!(prop.ecef_at(&t).is_err());
    assert!(prop.ecef_at(&add_seconds(&t, -1.0)).is_ok());
    // Per station only whether passes were cut, without a time of its own.
    let cut: Vec<&&String> = stops.iter().filter(|w| w.contains("passes cut")).collect();
    assert_eq!(cut.len(), plan.stopped.iter().flatten().count());
    assert!(!cut.is_empty());
    // (no year in them: the one time is in the line above)
    assert!(cut.iter().all(|w| !w.contains("2026")), "{cut:#?}");
    assert!(!plan.passes.is_empty());
    assert!(plan.passes.iter().all(|p| p.pass.los <= t));
    // `passes` over the same stations: the same one stop, once.
    let o = run(&["passes", "--mission", &path, "--format", "json"]);
    let listed = json(&o)["passes"].as_array().unwrap().len();
    assert_eq!(listed, plan.passes.len());
    let err = String::from_utf8_lossy(&o.stderr);
    let lines: Vec<&str> = err
        .lines()
        .filter(|l| l.contains("propagation stops at "))
        .collect();
    assert_eq!(lines.len(), 1, "{err}");
    assert!(
        lines[0].contains(&passbudget::timefmt::format_ms(&t)),
        "{err}"
    );
    // The time once in each line (before: the error repeated it, with the minutes from epoch).
    let stamp = passbudget::timefmt::format_ms(&t);
    for line in [head[0].as_str(), lines[0]] {
        assert_eq!(line.matches("2026-").count(), 1, "{line}");
        assert!(!line.contains("min from epoch"), "{line}");
    }
    // `track` (a step of 7 min) reports the same first failing second, not its step's time
    // (before: "propagation stopped" at the sample time, a different time and resolution).
    let o = run(&[
        "track",
        "--tle",
        &tle,
        "--station",
        "stations/nordkam.yaml",
        "--start",
        "2026-12-01T12:00:00Z",
        "--days",
        "30",
        "--step",
        "420",
    ]);
    let err = String::from_utf8_lossy(&o.stderr);
    let lines: Vec<&str> = err.lines().filter(|l| l.contains("propagation")).collect();
    assert_eq!(lines.len(), 1, "{err}");
    assert!(
        lines[0].contains(&format!("propagation stops at {stamp} (")),
        "{err}"
    );
    assert!(lines[0].ends_with("; the track ends there"), "{err}");
}

// ---- item 7: messages ----

#[test]
fn an_overflowing_number_is_named() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(root().join("stations/nordkam.yaml"))
        .unwrap()
        .replace("altitude_m: 210", "altitude_m: 1e400");
    let st = write(dir.path(), "st.yaml", &text);
    let o = run(&atmosphere_at_30_deg(&st));
    clean_error(&o, &["st.yaml:6:", "1e400 is not a finite number"]);
}

#[test]
fn a_missing_station_file_names_the_mission_line() {
    let dir = tempfile::tempdir().unwrap();
    let path = one_day_mission_in(dir.path());
    let text = std::fs::read_to_string(&path)
        .unwrap()
        .replace("sierra-baja.yaml", "no-such-station.yaml");
    std::fs::write(&path, text).unwrap();
    let o = run(&["plan", &path]);
    clean_error(
        &o,
        &["mission.yaml:10:", "stations", "no-such-station.yaml"],
    );
}

#[test]
fn atmosphere_and_budget_warnings_go_to_stderr() {
    // Sierra Baja at 2 deg: the low-elevation forms are used (a model-range warning).
    let args = [
        "atmosphere",
        "--station",
        "stations/sierra-baja.yaml",
        "--frequency-ghz",
        "8.2",
        "--elevation-deg",
        "2",
    ];
    let o = run(&args);
    let out = success(&o);
    assert!(!out.contains("warning"), "{out}");
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(err.lines().any(|l| l.starts_with("warning: ")), "{err}");
    let j = json(&run(&[&args[..], &["--format", "json"]].concat()));
    assert!(!j["warnings"].as_array().unwrap().is_empty());
}

#[test]
fn the_element_age_warning_prints_once() {
    let runs: [&[&str]; 3] = [
        &["plan", "examples/wrenlet-1.yaml", "--days", "30"],
        &[
            "passes",
            "--mission",
            "examples/wrenlet-1.yaml",
            "--days",
            "30",
        ],
        &[
            "budget",
            "examples/wrenlet-1.yaml",
            "--station",
            "Nordkam",
            "--at",
            "2026-12-20T01:28:12Z",
        ],
    ];
    for args in runs {
        let o = run(args);
        let all = format!(
            "{}{}",
            String::from_utf8_lossy(&o.stdout),
            String::from_utf8_lossy(&o.stderr)
        );
        let n = all.matches("days after the epoch").count();
        assert_eq!(n, 1, "{args:?}: {all}");
    }
}

// ---- item 8: element-set histories ----

/// examples/sat.tle three times with epochs 5 days apart (day 330.5, 335.5, 340.5 of 2026),
/// checksums recomputed.
fn history_tle() -> String {
    let text = std::fs::read_to_string(root().join("examples/sat.tle")).unwrap();
    let lines: Vec<&str> = text.lines().collect();
    let mut out = String::new();
    for day in ["26330.50000000", "26335.50000000", "26340.50000000"] {
        let l1 = lines[1].replace("26335.50000000", day);
        out.push_str(&format!(
            "{}\n{}\n{}\n",
            lines[0],
            with_checksum(&l1[..68]).unwrap(),
            lines[2]
        ));
    }
    out
}

#[test]
fn a_history_file_gives_the_set_for_the_window() {
    let dir = tempfile::tempdir().unwrap();
    let tle = write(dir.path(), "history.tle", &history_tle());
    // passes: the set of day 335.5 (2026-12-01 12:00) is the latest at or before 12-03.
    let o = run(&[
        "passes",
        "--tle",
        &tle,
        "--sat",
        "99901",
        "--station",
        "stations/nordkam.yaml",
        "--start",
        "2026-12-03T00:00:00Z",
        "--format",
        "json",
    ]);
    let j = json(&o);
    assert!(!j["passes"].as_array().unwrap().is_empty());
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(
        err.contains("note: element set chosen: epoch 2026-12-01T12:00:00.000Z, 1 of 3 sets of 99901: the latest at or before the window start"),
        "{err}"
    );
    // plan: the same choice, in the assumptions' warnings and from the library.
    let path = mission_in(dir.path(), &tle, "2026-12-07T00:00:00Z", 1.0);
    let j = json(&run(&["plan", &path, "--format", "json"]));
    let w = j["assumptions"]["warnings"].as_array().unwrap();
    assert!(
        w.iter().any(|x| x
            .as_str()
            .unwrap()
            .starts_with("element set chosen: epoch 2026-12-06T12:00:00.000Z, 1 of 3 sets")),
        "{w:?}"
    );
    // budget: the same choice as a note on stderr (it was a warning: line), kept in the
    // JSON's warnings as the plan keeps it.
    let at = ["--station", "nordkam", "--elevation-deg", "30"];
    let o = run(&[&["budget", &path, "--format", "json"][..], &at[..]].concat());
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(
        err.contains("note: element set chosen: epoch 2026-12-06T12:00:00.000Z, 1 of 3 sets"),
        "{err}"
    );
    assert!(!err.contains("warning: element set chosen"), "{err}");
    let w = json(&o)["warnings"].as_array().unwrap().clone();
    assert!(
        w.iter().any(|x| x
            .as_str()
            .unwrap()
            .starts_with("element set chosen: epoch 2026-12-06")),
        "{w:?}"
    );
    // mask, sun-transits and compare keep it in their JSON too (they printed it on stderr
    // alone, so --quiet lost it); compare marks it as both runs'.
    for (cmd, want) in [
        ("mask", "element set chosen"),
        ("sun-transits", "element set chosen"),
        ("compare", "runs A and B: element set chosen"),
    ] {
        let o = run(&[cmd, &path, "--days", "0.3", "--format", "json", "--quiet"]);
        let w = json(&o)["warnings"].as_array().unwrap().clone();
        assert!(
            w.iter().any(|x| x.as_str().unwrap().starts_with(want)),
            "{cmd}: {w:?}"
        );
    }
    let mission = Mission::load(Path::new(&path)).unwrap();
    let planner = Planner::new(&mission, &PlanRequest::default()).unwrap();
    assert_eq!(planner.selection().candidates, 3);
    assert_eq!(planner.selection().index, 2);
    // Every set later than the window start: the earliest.
    let o = run(&[
        "track",
        "--tle",
        &tle,
        "--station",
        "stations/nordkam.yaml",
        "--start",
        "2026-11-20T00:00:00Z",
        "--days",
        "0.01",
    ]);
    success(&o);
    assert!(String::from_utf8_lossy(&o.stderr)
        .contains("epoch 2026-11-26T12:00:00.000Z, 1 of 3 sets of 99901: the earliest"));
}

// ---- item 9: a dense horizon mask ----

/// Linear interpolation of the profile by scanning every segment (no search), wrapping at 360,
/// then the floor: the definition in src/geometry/horizon.rs, written independently.
fn brute_force_limit(min_deg: f64, pts: &[[f64; 2]], az: f64) -> f64 {
    let n = pts.len();
    for k in 0..n {
        let a = pts[k];
        let mut b = pts[(k + 1) % n];
        if k + 1 == n {
            b[0] += 360.0;
        }
        for x in [az, az + 360.0] {
            if a[0] <= x && x < b[0] {
                let el = a[1] + (b[1] - a[1]) * (x - a[0]) / (b[0] - a[0]);
                return el.max(min_deg);
            }
        }
    }
    unreachable!("every azimuth lies on a segment")
}

#[test]
fn a_ten_thousand_point_mask_matches_a_linear_scan() {
    // Deterministic pseudo-random points and azimuths (64-bit LCG, Knuth's MMIX constants, from
    // memory): no crate needed and the same numbers every run.
    let mut state: u64 = 0x2545_f491_4f6c_dd1d;
    let mut next = move || {
        state = state
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (state >> 11) as f64 / (1u64 << 53) as f64
    };
    let mut pts: Vec<[f64; 2]> = (0..10_000)
        .map(|i| [i as f64 * 0.036 + next() * 0.03, next() * 20.0])
        .collect();
    // Shuffle the order: the mask sorts its points itself.
    pts.reverse();
    let mask = HorizonMask::new(3.0, pts).unwrap();
    let sorted = mask.points().to_vec();
    for _ in 0..20_000 {
        let az = next() * 360.0;
        let want = brute_force_limit(3.0, &sorted, az);
        assert!((mask.limit_deg(az) - want).abs() < 1e-9, "az {az}");
    }
    // Exactly at the vertices and at the wrap.
    for p in sorted.iter().step_by(997) {
        assert!((mask.limit_deg(p[0]) - p[1].max(3.0)).abs() < 1e-9);
    }
    assert!((mask.limit_deg(0.0) - brute_force_limit(3.0, &sorted, 0.0)).abs() < 1e-9);
    let lowest = sorted.iter().map(|p| p[1]).fold(f64::INFINITY, f64::min);
    assert_eq!(mask.lowest_limit_deg(), lowest.max(3.0));
}

// ---- input files that are not ordinary files ----

/// Runs the binary with `stdin_text` piped to its standard input.
fn run_with_stdin(args: &[&str], stdin_text: &str) -> std::process::Output {
    use std::io::Write;
    let mut child = command()
        .current_dir(root())
        .args(args)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("binary runs");
    let mut stdin = child.stdin.take().unwrap();
    let text = stdin_text.to_string();
    let writer = std::thread::spawn(move || {
        // The binary may stop reading early (an error): a broken pipe is not this test's failure.
        let _ = stdin.write_all(text.as_bytes());
    });
    let out = child.wait_with_output().unwrap();
    writer.join().unwrap();
    out
}

/// A mission file given as a pipe (`/dev/stdin`, as `<(...)` in a shell) is read once: `plan`
/// and `compare` (B the same file) used to read it twice and found the second read empty.
/// Basis: a behaviour check of the input rule (no published reference applies).
#[cfg(unix)]
#[test]
fn a_mission_given_as_a_pipe_is_read_once() {
    let dir = tempfile::tempdir().unwrap();
    let path = one_day_mission_in(dir.path());
    let text = std::fs::read_to_string(&path).unwrap();
    let piped = run_with_stdin(&["plan", "/dev/stdin", "--quiet"], &text);
    let direct = run(&["plan", &path, "--quiet"]);
    let (piped, direct) = (success(&piped), success(&direct));
    // The same plan, the file's name apart.
    assert!(piped.contains("WRENLET-1 over 3 stations"), "{piped}");
    assert_eq!(piped.lines().count(), direct.lines().count());
    let o = run_with_stdin(
        &[
            "compare",
            "/dev/stdin",
            "--set-b",
            "transmitter.power_w=5",
            "--quiet",
        ],
        &text,
    );
    let table = success(&o);
    assert!(table.contains("transmitter.power_w=5"), "{table}");
    // A station file as a pipe.
    let st = std::fs::read_to_string(root().join("stations/nordkam.yaml")).unwrap();
    let o = run_with_stdin(&atmosphere_at_30_deg("/dev/stdin"), &st);
    assert!(success(&o).starts_with("Nordkam at 8.2 GHz"));
}

/// A device as an input file is refused at once, not read until the memory runs out.
/// Basis: a behaviour check of the input rule (no published reference applies).
#[cfg(unix)]
#[test]
fn a_device_as_an_input_file_is_refused() {
    let o = run(&["plan", "/dev/zero"]);
    clean_error(&o, &["/dev/zero", "not a file (a device or a socket)"]);
    let o = run(&[
        "passes",
        "examples/wrenlet-1.yaml",
        "--tle",
        "/dev/urandom",
        "--days",
        "1",
    ]);
    clean_error(&o, &["/dev/urandom", "not a file (a device or a socket)"]);
}

/// Brackets nested deeper than the limit are refused with their line before the YAML parser
/// sees them (its time grows with the square of the depth); nesting within it and brackets in
/// quotes or comments do not count.
/// Basis: a behaviour check of the input rule (no published reference applies).
#[test]
fn deeply_nested_yaml_is_refused_with_its_line() {
    let dir = tempfile::tempdir().unwrap();
    let st = std::fs::read_to_string(root().join("stations/nordkam.yaml")).unwrap();
    let lines = st.lines().count();
    let deep = format!("{st}\nextra: {}{}\n", "[".repeat(65), "]".repeat(65));
    let path = write(dir.path(), "deep.yaml", &deep);
    let args = atmosphere_at_30_deg(&path);
    let o = run(&args);
    clean_error(
        &o,
        &[
            &format!("deep.yaml:{}:", lines + 2),
            "nested more than 64 deep",
        ],
    );
    // 64 deep, and brackets in quotes, a plain scalar and comments: parsed, so the unknown key
    // is what is named.
    let open = "[".repeat(100);
    let ok = format!(
        "{st}\nextra: {}{} # {open}\nother: \"{open}\"\nthird: '{open}'\nfourth: a{open}\n",
        "[".repeat(64),
        "]".repeat(64),
    );
    std::fs::write(&path, ok).unwrap();
    let o = run(&args);
    let e = String::from_utf8_lossy(&o.stderr);
    assert!(!o.status.success() && e.contains("extra"), "{e}");
    assert!(!e.contains("nested more than"), "{e}");
    // A `--set` value is YAML too.
    let o = run(&[
        "plan",
        "examples/wrenlet-1.yaml",
        "--set",
        &format!("transmitter.power_w={}2{}", "[".repeat(65), "]".repeat(65)),
    ]);
    clean_error(&o, &["--set", "transmitter.power_w", "more than 64 deep"]);
}

/// A control character in a name (an element set's name line or OMM `OBJECT_NAME`, a mission, a
/// station) is refused where it is read: names go into terminal tables, CSV and calendars, where
/// ESC or BEL would act on the terminal and a bare CR breaks a calendar line. An empty mission
/// name is refused as an empty station name is, and so is `~` or `null` (YAML's "no value").
/// Basis: a behaviour check of the input rule (no published reference applies).
#[test]
fn control_characters_in_names_are_refused() {
    let dir = tempfile::tempdir().unwrap();
    let tle = std::fs::read_to_string(root().join("examples/sat.tle")).unwrap();
    let data: Vec<&str> = tle.lines().filter(|l| l.starts_with(['1', '2'])).collect();
    let bad_tle = write(
        dir.path(),
        "bad.tle",
        &format!("BAD\u{1b}[31mSAT\n{}\n{}\n", data[0], data[1]),
    );
    let o = run(&[
        "passes",
        "examples/wrenlet-1.yaml",
        "--tle",
        &bad_tle,
        "--days",
        "1",
    ]);
    clean_error(&o, &["bad.tle", "line 1", "control character (U+001B)"]);
    let omm = write(
        dir.path(),
        "omm.json",
        r#"[{"OBJECT_NAME":"X\u0007","NORAD_CAT_ID":99901,"EPOCH":"2026-12-01T12:00:00","MEAN_MOTION":15.05,"ECCENTRICITY":0.001,"INCLINATION":97.6,"RA_OF_ASC_NODE":10,"ARG_OF_PERICENTER":0,"MEAN_ANOMALY":0,"BSTAR":0.0001,"MEAN_MOTION_DOT":0,"MEAN_MOTION_DDOT":0}]"#,
    );
    let o = run(&[
        "passes",
        "examples/wrenlet-1.yaml",
        "--tle",
        &omm,
        "--days",
        "1",
    ]);
    clean_error(
        &o,
        &["omm.json", "OBJECT_NAME", "control character (U+0007)"],
    );
    let path = one_day_mission_in(dir.path());
    let text = std::fs::read_to_string(&path).unwrap();
    let name_line = text.lines().position(|l| l.starts_with("name:")).unwrap() + 1;
    for (name, needle) in [
        ("\"A\\aB\"", "control character (U+0007)"),
        ("\"\"", "must not be empty"),
        // YAML's "no value" arrives in a text field as its spelling (it named a station "~")
        ("~", "is '~', which YAML reads as no value"),
        ("null", "is 'null'"),
    ] {
        let changed: String = text
            .lines()
            .map(|l| match l.starts_with("name:") {
                true => format!("name: {name}\n"),
                false => format!("{l}\n"),
            })
            .collect();
        std::fs::write(&path, changed).unwrap();
        let o = run(&["plan", &path]);
        clean_error(&o, &[&format!("mission.yaml:{name_line}: name"), needle]);
    }
    let st = std::fs::read_to_string(root().join("stations/nordkam.yaml"))
        .unwrap()
        .replace("name: Nordkam", "name: \"Nord\\rkam\"");
    let st = write(dir.path(), "st.yaml", &st);
    let o = run(&atmosphere_at_30_deg(&st));
    clean_error(&o, &["st.yaml:", "name", "control character (U+000D)"]);
    let st = std::fs::read_to_string(root().join("stations/nordkam.yaml"))
        .unwrap()
        .replace("name: Nordkam", "name: ~");
    let st = write(dir.path(), "st.yaml", &st);
    clean_error(
        &run(&atmosphere_at_30_deg(&st)),
        &["st.yaml:", "name: is '~'"],
    );
}

/// `--out` naming a file (or a link to nothing) says the name is not a folder, not only that the
/// folder cannot be created. Basis: a behaviour check (no published reference applies).
#[test]
fn out_naming_a_file_says_it_is_not_a_folder() {
    let dir = tempfile::tempdir().unwrap();
    let file = write(dir.path(), "taken", "mine\n");
    let o = run(&[
        "plan",
        "examples/wrenlet-1.yaml",
        "--days",
        "1",
        "--out",
        &file,
    ]);
    clean_error(&o, &["--out", "taken", "is not a folder"]);
    assert_eq!(std::fs::read_to_string(&file).unwrap(), "mine\n");
}
