//! End-to-end checks of `passes` and `track`: the binary on the shipped example and on bad input.
//! Bad input must give one clear line on stderr naming the file and what is wrong, a non-zero exit
//! code, and no panic.

use crate::common::bin::{
    clean_error as assert_clean_error, command as bin, json, root, run, success, write,
};

/// `command` on the shipped elements (examples/sat.tle) at the Nordkam station, with `more`.
fn nordkam(command: &str, more: &[&str]) -> std::process::Output {
    let mut args = vec![command, "--tle", "examples/sat.tle"];
    args.extend(["--station", "stations/nordkam.yaml"]);
    args.extend(more);
    run(&args)
}

const WINDOW: [&str; 4] = ["--start", "2026-12-02T00:00:00Z", "--days", "1"];

#[test]
fn passes_json_follows_the_output_contract() {
    let mut args = vec![
        "passes",
        "--tle",
        "examples/sat.tle",
        "--station",
        "stations/nordkam.yaml",
        "--station",
        "stations/sierra-baja.yaml",
        "--format",
        "json",
    ];
    args.extend(WINDOW);
    let out = run(&args);
    let doc = json(&out);
    let passes = doc["passes"].as_array().unwrap();
    assert!(passes.len() > 5);
    let keys = [
        "satellite",
        "norad_id",
        "station",
        "aos",
        "tca",
        "los",
        "duration_s",
        "max_elevation_deg",
        "aos_azimuth_deg",
        "tca_azimuth_deg",
        "los_azimuth_deg",
        "min_range_km",
        "starts_before_window",
        "ends_after_window",
    ];
    for p in passes {
        for k in keys {
            assert!(p.get(k).is_some(), "missing {k}");
        }
        // RFC 3339 UTC with milliseconds, e.g. 2026-12-02T01:23:45.678Z
        let aos = p["aos"].as_str().unwrap();
        assert_eq!(aos.len(), 24, "{aos}");
        assert!(aos.ends_with('Z') && aos.as_bytes()[19] == b'.');
    }
    let aos: Vec<&str> = passes.iter().map(|p| p["aos"].as_str().unwrap()).collect();
    let mut sorted = aos.clone();
    sorted.sort();
    assert_eq!(aos, sorted, "sorted by AOS");
    assert!(passes.iter().any(|p| p["station"] == "Sierra Baja"));
}

#[test]
fn passes_csv_has_one_header_row_and_mission_inputs_work() {
    let out = run(&[
        "passes",
        "--mission",
        "examples/wrenlet-1.yaml",
        "--days",
        "0.5",
        "--format",
        "csv",
    ]);
    let text = success(&out);
    // The caution first, as a comment line (every CSV carries it), then one header row.
    assert!(text.starts_with("# Planning estimates only"), "{text}");
    let mut lines = text.lines().filter(|l| !l.starts_with('#'));
    assert_eq!(lines.next().unwrap(), "satellite,norad_id,station,pass_id,aos,tca,los,duration_s,max_elevation_deg,aos_azimuth_deg,tca_azimuth_deg,los_azimuth_deg,min_range_km,starts_before_window,ends_after_window");
    assert!(lines.count() > 3);
}

#[test]
fn mask_flag_removes_low_passes() {
    let base = [
        "passes",
        "--mission",
        "examples/wrenlet-1.yaml",
        "--format",
        "json",
    ];
    let count = |extra: &[&str]| {
        let mut a = base.to_vec();
        a.extend(extra);
        let doc = json(&run(&a));
        let p = doc["passes"].as_array().unwrap().clone();
        p
    };
    let all = count(&[]);
    let high = count(&["--mask", "30"]);
    assert!(high.len() < all.len());
    assert!(high
        .iter()
        .all(|p| p["max_elevation_deg"].as_f64().unwrap() >= 30.0));
}

#[test]
fn track_csv_and_json_with_doppler() {
    let out = nordkam(
        "track",
        &[
            "--start",
            "2026-12-02T07:22:00Z",
            "--end",
            "2026-12-02T07:32:00Z",
            "--step",
            "30",
            "--frequency-mhz",
            "8212.5",
            "--format",
            "json",
        ],
    );
    let doc = json(&out);
    let track = doc["track"].as_array().unwrap();
    assert_eq!(track.len(), 21);
    for p in track {
        let rr = p["range_rate_km_s"].as_f64().unwrap();
        let d = p["doppler_hz"].as_f64().unwrap();
        // Approaching (rr < 0) gives a positive shift: f_d = -f rr / c.
        assert!((d + 8212.5e6 * rr / 299_792.458).abs() < 1.0);
    }
    let out = nordkam(
        "track",
        &[
            "--start",
            "2026-12-02T07:22:00Z",
            "--end",
            "2026-12-02T07:23:00Z",
            "--step",
            "30",
        ],
    );
    let text = success(&out);
    assert_eq!(
        text.lines().find(|l| !l.starts_with('#')).unwrap(),
        "time,azimuth_deg,elevation_deg,range_km,range_rate_km_s,doppler_hz,sun_separation_deg"
    );
    assert!(
        text.lines()
            .filter(|l| !l.starts_with('#'))
            .nth(1)
            .unwrap()
            .contains(",,"),
        "doppler_hz empty without a frequency"
    );
}

/// The track's `sun_separation_deg` is the angle between the satellite and the Sun. Reference:
/// the Sun's direction from astropy 8.0.2 at Sierra Baja (tests/data/geometry/sun_astropy.csv, row
/// 2026-12-02T08:51:00Z), separated from the track's own azimuth and elevation by the spherical
/// law of cosines; tolerance 0.01 deg (the low-precision Sun's stated accuracy, plus rounding).
#[test]
fn track_sun_separation_matches_an_independent_sun() {
    let out = run(&[
        "track",
        "--tle",
        "examples/sat.tle",
        "--station",
        "stations/sierra-baja.yaml",
        "--start",
        "2026-12-02T08:51:00Z",
        "--end",
        "2026-12-02T08:52:00Z",
        "--step",
        "60",
        "--format",
        "json",
    ]);
    let doc = json(&out);
    let p = &doc["track"][0];
    assert_eq!(p["time"].as_str().unwrap(), "2026-12-02T08:51:00.000Z");
    let (az, el) = (
        p["azimuth_deg"].as_f64().unwrap().to_radians(),
        p["elevation_deg"].as_f64().unwrap().to_radians(),
    );
    let (saz, sel) = (135.435367f64.to_radians(), 15.231757f64.to_radians());
    let expected = (el.sin() * sel.sin() + el.cos() * sel.cos() * (az - saz).cos())
        .clamp(-1.0, 1.0)
        .acos()
        .to_degrees();
    let got = p["sun_separation_deg"].as_f64().unwrap();
    assert!((got - expected).abs() < 0.01, "{got} vs {expected}");
}

#[test]
fn stale_elements_warn() {
    let out = nordkam(
        "passes",
        &["--start", "2027-01-20T00:00:00Z", "--days", "1"],
    );
    success(&out);
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(stderr.contains("STALE ELEMENTS"), "{stderr}");
    let out = nordkam(
        "passes",
        &["--start", "2026-12-10T00:00:00Z", "--days", "1"],
    );
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(
        stderr.contains("warning") && stderr.contains("1-3 km a day"),
        "{stderr}"
    );
}

/// `passes` and `track` follow `plan`'s rule for a window more than 90 days from the epoch:
/// refused with one line naming the flag, and the flag goes ahead with the strongest warning.
#[test]
fn a_window_far_from_the_epoch_is_refused_unless_allowed() {
    let far = ["--start", "2030-12-01T00:00:00Z", "--days", "1"];
    for command in ["passes", "track"] {
        assert_clean_error(
            &nordkam(command, &far),
            &["days after the epoch", "90 days", "--allow-stale-elements"],
        );
        let mut args = far.to_vec();
        args.push("--allow-stale-elements");
        let out = nordkam(command, &args);
        success(&out);
        let stderr = String::from_utf8_lossy(&out.stderr);
        assert!(
            stderr.contains("STALE ELEMENTS") && stderr.contains("not meaningful"),
            "{command}: {stderr}"
        );
    }
}

#[test]
fn bad_inputs_give_one_clear_line() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    let good = std::fs::read_to_string(root().join("examples/sat.tle")).unwrap();
    let lines: Vec<&str> = good.lines().collect();
    // Wrong checksum: change the last digit of line 2.
    let mut l2 = lines[2].to_string();
    let last = l2.pop().unwrap();
    l2.push(if last == '0' { '1' } else { '0' });
    let bad_sum = write(
        d,
        "sum.tle",
        &format!("{}\n{}\n{}\n", lines[0], lines[1], l2),
    );
    let truncated = write(
        d,
        "trunc.tle",
        &format!("{}\n{}\n{}\n", lines[0], lines[1], &lines[2][..50]),
    );
    let empty = write(d, "empty.tle", "");
    // Two satellites of the same name (catalog numbers 99901 and 99902): no history of one
    // satellite, so neither the name nor an empty query chooses.
    let other = |l: &str| {
        passbudget::orbit::tle::with_checksum(&l.replacen("99901", "99902", 1)[..68]).unwrap()
    };
    let two = write(
        d,
        "two.tle",
        &format!(
            "{good}{}\n{}\n{}\n",
            lines[0],
            other(lines[1]),
            other(lines[2])
        ),
    );
    let omm = write(
        d,
        "omm.json",
        r#"[{"OBJECT_NAME":"X","NORAD_CAT_ID":99901,"EPOCH":"2026-12-01T12:00:00","ECCENTRICITY":0.001,"INCLINATION":97.6,"RA_OF_ASC_NODE":10,"ARG_OF_PERICENTER":0,"MEAN_ANOMALY":0,"BSTAR":0.0001,"MEAN_MOTION_DOT":0,"MEAN_MOTION_DDOT":0}]"#,
    );
    let station = write(
        d,
        "st.yaml",
        "name: X\nlatitude_deg: 10\nlongitude_deg: 10\naltitude_m: 0\nelevation_mask: 3\n",
    );
    let st = "stations/nordkam.yaml";
    let w = WINDOW;
    let cases: Vec<(Vec<&str>, Vec<&str>)> = vec![
        (
            vec!["passes", "--tle", "no/such.tle", "--station", st],
            vec!["no/such.tle"],
        ),
        (
            vec!["passes", "--tle", &bad_sum, "--station", st],
            vec!["sum.tle", "line 3", "checksum"],
        ),
        (
            vec!["passes", "--tle", &truncated, "--station", st],
            vec!["trunc.tle", "line 3"],
        ),
        (
            vec!["passes", "--tle", &empty, "--station", st],
            vec!["empty.tle"],
        ),
        (
            vec!["passes", "--tle", &two, "--station", st],
            vec!["two.tle", "choose one"],
        ),
        (
            vec![
                "passes",
                "--tle",
                &two,
                "--sat",
                "nothing-like-it",
                "--station",
                st,
            ],
            vec!["two.tle", "nothing-like-it"],
        ),
        // Both sets carry the name WRENLET-1 with different catalog numbers: ambiguous. (Sets of
        // one catalog number are a history: the set for the window is chosen, see hardening.rs.)
        (
            vec![
                "passes",
                "--tle",
                &two,
                "--sat",
                "wrenlet-1",
                "--station",
                st,
            ],
            vec!["two.tle", "matches 2"],
        ),
        (
            vec!["passes", "--tle", &omm, "--station", st],
            vec!["omm.json", "MEAN_MOTION"],
        ),
        (
            vec!["passes", "--tle", "examples/sat.tle", "--station", &station],
            vec!["st.yaml", ":5", "elevation_mask"],
        ),
        (
            vec![
                "passes",
                "--tle",
                "examples/sat.tle",
                "--station",
                "no/station.yaml",
            ],
            vec!["no/station.yaml"],
        ),
    ];
    for (mut args, needles) in cases {
        args.extend(w);
        let out = run(&args);
        assert_clean_error(&out, &needles);
    }
    // Bad window or step on the shipped example: (command, window and step options, needles).
    let day = ["--start", "2026-12-02T00:00:00Z", "--days", "1"];
    let backwards = [
        "--start",
        "2026-12-02T00:00:00Z",
        "--end",
        "2026-12-01T00:00:00Z",
    ];
    let cases: [(&str, Vec<&str>, &[&str]); 4] = [
        ("passes", backwards.to_vec(), &["not after its start"]),
        (
            "track",
            [&day[..], &["--step", "0"]].concat(),
            &["--step", "0.01 to 86400 s"],
        ),
        ("track", [&day[..], &["--step", "-5"]].concat(), &["--step"]),
        (
            "passes",
            vec!["--start", "tomorrow", "--days", "1"],
            &["--start", "RFC 3339"],
        ),
    ];
    for (command, window, needles) in cases {
        let mut args = vec![command, "--tle", "examples/sat.tle", "--station", st];
        args.extend(window);
        assert_clean_error(&run(&args), needles);
    }
}

#[test]
fn broken_pipe_exits_quietly() {
    use std::io::Read;
    use std::process::Stdio;
    let mut child = bin()
        .current_dir(root())
        .args([
            "track",
            "--tle",
            "examples/sat.tle",
            "--station",
            "stations/nordkam.yaml",
            "--start",
            "2026-12-02T00:00:00Z",
            "--days",
            "2",
            "--step",
            "1",
        ])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let mut buf = [0u8; 64];
    child.stdout.as_mut().unwrap().read_exact(&mut buf).unwrap();
    drop(child.stdout.take());
    let status = child.wait().unwrap();
    let mut err = String::new();
    child
        .stderr
        .as_mut()
        .unwrap()
        .read_to_string(&mut err)
        .unwrap();
    assert_eq!(status.code(), Some(0), "{err}");
    assert!(err.is_empty(), "{err}");
}

/// An OMM JSON with the fields an element-set provider adds (common practice; the names from
/// memory) finds the same passes as the shipped one and says, in one note, which fields it
/// ignored; a misspelt keyword is still refused, naming the keyword it is close to.
#[test]
fn provider_fields_in_omm_json_are_ignored_with_a_note() {
    let dir = tempfile::tempdir().unwrap();
    let shipped = std::fs::read_to_string(root().join("examples/sat-omm.json")).unwrap();
    let extra = "\"SEMIMAJOR_AXIS\": \"6903.1\",\n    \"PERIOD\": \"95.65\",\n    \
                 \"OBJECT_TYPE\": \"PAYLOAD\",\n    \"GP_ID\": 12,\n    \"MEAN_MOTION\"";
    let provider = write(
        dir.path(),
        "provider.json",
        &shipped.replacen("\"MEAN_MOTION\"", extra, 1),
    );
    let passes = |tle: &str| {
        let mut args = vec!["passes", "--tle", tle, "--station", "stations/nordkam.yaml"];
        args.extend(WINDOW);
        run(&args)
    };
    let (plain, with) = (passes("examples/sat-omm.json"), passes(&provider));
    assert_eq!(success(&plain), success(&with));
    let note = String::from_utf8_lossy(&with.stderr);
    assert!(
        note.contains(
            "note: element set of WRENLET-1 (99901): 4 keywords outside CCSDS 502.0-B-3 \
             ignored (not read): SEMIMAJOR_AXIS, PERIOD, OBJECT_TYPE, GP_ID"
        ),
        "{note}"
    );
    assert!(!String::from_utf8_lossy(&plain.stderr).contains("ignored"));
    let misspelt = write(
        dir.path(),
        "misspelt.json",
        &shipped.replacen("\"ECCENTRICITY\"", "\"ECCENTRICTY\"", 1),
    );
    assert_clean_error(
        &passes(&misspelt),
        &["misspelt.json", "ECCENTRICTY", "close to ECCENTRICITY"],
    );
    // A fleet whose two satellites come from such a file names each one's ignored fields once
    // (a fleet plan kept only some notes of its satellites' plans, and not this one).
    let second = shipped
        .replacen("\"WRENLET-1\"", "\"WRENLET-2\"", 1)
        .replacen("99901", "99902", 1);
    let both = format!(
        "[{}, {}]",
        shipped
            .replacen("\"MEAN_MOTION\"", extra, 1)
            .trim()
            .trim_matches(['[', ']']),
        second.trim().trim_matches(['[', ']'])
    );
    let file = write(dir.path(), "both.json", &both);
    let mission = std::fs::read_to_string(root().join("examples/wrenlet-1.yaml")).unwrap();
    let fleet = mission
        .replace(
            "satellite:\n  elements: sat.tle          # TLE/3LE, CCSDS OMM JSON or KVN; relative to this file\n  select: \"99901\" ",
            &format!("satellites:\n  - {{ name: WRENLET-1, elements: {file}, select: \"99901\" }}\n  - {{ name: WRENLET-2, elements: {file}, select: \"99902\" }}\n #"),
        )
        .replace("../stations/", &format!("{}/stations/", root().display()));
    assert_ne!(fleet, mission);
    let fleet = write(dir.path(), "fleet.yaml", &fleet);
    let o = run(&["plan", &fleet, "--days", "1"]);
    success(&o);
    let err = String::from_utf8_lossy(&o.stderr);
    let lines: Vec<&str> = err
        .lines()
        .filter(|l| l.contains("ignored (not read)"))
        .collect();
    assert_eq!(lines.len(), 1, "{err}");
    assert!(lines[0].contains("WRENLET-1 (99901): 4 keywords"), "{err}");
}
