//! The antenna mount (what it cannot follow is lost) and the pfd check against the Radio
//! Regulations' Article 21 limits, on the shipped example (invented satellite and stations) and on
//! bad input.

use crate::common::bin::{clean_error, json, root, run, success, write};
use passbudget::geometry::mount::keyhole_seconds_closed_form;
use passbudget::orbit::Propagator;

const MISSION: &str = "examples/wrenlet-1.yaml";

/// Pass 6 of the example (Sierra Baja, 86.5 deg, an az-el mount of 8 deg/s in azimuth): the
/// seconds its azimuth rate limit is exceeded against the closed form of `geometry::mount`
/// (straight-line pass; derived there from first principles), with the speed and the closest
/// range of the SGP4 geometry at closest approach; and the lost seconds, which add the time the
/// mount needs to catch up, are at least that and are taken off the pass's volume.
#[test]
fn keyhole_of_the_example_overhead_pass_against_the_closed_form() {
    let doc = json(&run(&["plan", MISSION, "--days", "1", "--format", "json"]));
    let p = doc["passes"]
        .as_array()
        .unwrap()
        .iter()
        .find(|p| p["number"] == 6)
        .unwrap();
    assert_eq!(p["station"], "Sierra Baja");
    let e = p["max_elevation_deg"].as_f64().unwrap();
    assert!((e - 86.5).abs() < 0.1, "{e}");
    let setup = crate::common::plan::load_plan_setup(&root().join(MISSION));
    let prop = Propagator::new(&setup.elements).unwrap();
    let tca = chrono::DateTime::parse_from_rfc3339(p["tca"].as_str().unwrap())
        .unwrap()
        .with_timezone(&chrono::Utc);
    let state = prop.ecef_at(&tca).unwrap();
    let station = setup
        .stations
        .iter()
        .find(|s| s.station.name == "Sierra Baja")
        .unwrap();
    let look = station.observer.look(&state);
    // the station is fixed in the Earth-fixed frame: the satellite's speed there is its speed
    // relative to the station; at closest approach it is across the line of sight
    let v = state.velocity_km_s;
    let speed = (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]).sqrt();
    assert!(
        look.range_rate_km_s.abs() < 0.05,
        "{}",
        look.range_rate_km_s
    );
    let limit = station.station.mount.unwrap().primary_max_rate_deg_s;
    let want = keyhole_seconds_closed_form(speed, look.range_km, e, limit);
    let got = p["mount_rate_exceeded_s"].as_f64().unwrap();
    // 1 s steps (a run of n steps counts n s) and the track's curvature: 1.5 s
    assert!((got - want).abs() <= 1.5, "{got} s vs closed form {want} s");
    let peak = p["peak_primary_rate_deg_s"].as_f64().unwrap();
    let want_peak = (speed / look.range_km).to_degrees() / e.to_radians().cos();
    assert!(
        (peak - want_peak).abs() < 0.05 * want_peak,
        "{peak} vs {want_peak}"
    );
    let lost = p["mount_lost_s"].as_f64().unwrap();
    assert!(lost >= got && lost > 0.0, "{lost}");
    // Without the mount the pass brings more.
    let free = json(&run(&[
        "plan",
        MISSION,
        "--days",
        "1",
        "--format",
        "json",
        "--set",
        "station.sierra-baja.mount.primary_max_rate_deg_s=100",
    ]));
    let q = &free["passes"].as_array().unwrap()[5];
    assert_eq!(q["number"], 6);
    assert_eq!(q["mount_lost_s"], 0.0);
    let (v_free, v_mount) = (
        q["volume_bits"].as_f64().unwrap(),
        p["volume_bits"].as_f64().unwrap(),
    );
    let rate = p["rate_bps"].as_f64().unwrap();
    assert!(v_free > v_mount, "{v_free} {v_mount}");
    // Lost seconds at the chosen rate, within one step at each edge of the gap.
    assert!(
        (v_free - v_mount - lost * rate).abs() <= 2.0 * rate,
        "{v_free} {v_mount}"
    );
}

/// The pass's time series marks the steps the mount cannot follow (`tracked` false): as many
/// seconds as `mount_lost_s`, around the highest step, and none of them counts for the fixed
/// rate (`closed`) or the adaptive schedule.
#[test]
fn the_lost_steps_count_for_nothing_in_the_time_series() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("out");
    let o = run(&[
        "plan",
        MISSION,
        "--days",
        "1",
        "--quiet",
        "--out",
        out.to_str().unwrap(),
    ]);
    assert!(o.status.success());
    let csv = std::fs::read_dir(&out)
        .unwrap()
        .map(|e| e.unwrap().path())
        .find(|p| p.to_string_lossy().contains("pass-006-sierra-baja"))
        .unwrap();
    let mut r = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_path(&csv)
        .unwrap();
    let h = r.headers().unwrap().clone();
    let col = |k: &str| h.iter().position(|x| x == k).unwrap();
    let (tracked, closed, adaptive, elevation, t) = (
        col("tracked"),
        col("closed"),
        col("adaptive_scheme"),
        col("elevation_deg"),
        col("t_s"),
    );
    let rows: Vec<csv::StringRecord> = r.records().map(|x| x.unwrap()).collect();
    let lost: Vec<&csv::StringRecord> = rows.iter().filter(|x| &x[tracked] == "false").collect();
    // 1 s steps: each stands for one second
    assert_eq!(lost.len(), 11);
    let top = rows
        .iter()
        .max_by(|a, b| {
            let e = |x: &csv::StringRecord| x[elevation].parse::<f64>().unwrap();
            e(a).total_cmp(&e(b))
        })
        .unwrap();
    let t_top: f64 = top[t].parse().unwrap();
    for x in &lost {
        assert_eq!(&x[closed], "false");
        assert_eq!(&x[adaptive], "");
        let dt = (x[t].parse::<f64>().unwrap() - t_top).abs();
        assert!(dt < 15.0, "lost step {dt} s from the highest");
    }
}

/// A mount limit of zero or below, a key of another mount type, a missing key: one line naming
/// the file, the line and the key.
#[test]
fn bad_mount_input_is_refused_with_its_line() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(root().join("stations/sierra-baja.yaml")).unwrap();
    let mission_text = std::fs::read_to_string(root().join(MISSION))
        .unwrap()
        .replace("../stations/", "")
        .replace(
            "elements: sat.tle",
            &format!("elements: {}", root().join("examples/sat.tle").display()),
        );
    for f in ["nordkam.yaml", "pulau-reka.yaml"] {
        std::fs::copy(root().join("stations").join(f), dir.path().join(f)).unwrap();
    }
    let mission = write(dir.path(), "mission.yaml", &mission_text);
    let line_of = |t: &str, key: &str| t.lines().position(|l| l.contains(key)).unwrap() + 1;
    for (from, to, key) in [
        (
            "primary_max_rate_deg_s: 8 ",
            "primary_max_rate_deg_s: 0 ",
            "mount.primary_max_rate_deg_s",
        ),
        (
            "secondary_max_rate_deg_s: 5 ",
            "secondary_max_rate_deg_s: -2 ",
            "mount.secondary_max_rate_deg_s",
        ),
        (
            "primary_max_acceleration_deg_s2: 5",
            "primary_max_acceleration_deg_s2: 0",
            "mount.primary_max_acceleration_deg_s2",
        ),
        ("type: az-el", "type: x-y", "mount.axis_azimuth_deg"),
    ] {
        let t = text.replace(from, to);
        assert_ne!(t, text, "{from}");
        write(dir.path(), "sierra-baja.yaml", &t);
        let o = run(&["plan", &mission, "--days", "1"]);
        let line = if key == "mount.axis_azimuth_deg" {
            // a missing key: the line of its block
            line_of(&t, "mount:")
        } else {
            line_of(&t, to.trim())
        };
        clean_error(&o, &[&format!("sierra-baja.yaml:{line}:"), key]);
    }
}

/// `budget --format json`'s pfd at its own geometry, recomputed by hand from its EIRP, range and
/// occupied bandwidth: pfd = EIRP - 10 log10(4 pi d^2) - 10 log10(B / 4 kHz), against the
/// 8025-8500 MHz row (from memory: -150 dB(W/m2) in 4 kHz at 0-5 deg, +0.5 dB/deg to -140 at 25
/// deg and above; the form as in 47 CFR §25.208).
#[test]
fn budget_pfd_fields_by_hand() {
    for elevation in ["3", "10", "20", "40"] {
        let d = json(&run(&[
            "budget",
            MISSION,
            "--station",
            "nordkam",
            "--elevation-deg",
            elevation,
            "--format",
            "json",
        ]));
        let f = |k: &str| d[k].as_f64().unwrap();
        let d_m = f("range_km") * 1e3;
        let want = f("eirp_dbw")
            - 10.0 * (4.0 * std::f64::consts::PI * d_m * d_m).log10()
            - 10.0 * (f("occupied_bandwidth_hz") / 4e3).log10();
        assert!(
            (f("pfd_dbw_m2") - want).abs() < 2e-4,
            "{} vs {want}",
            f("pfd_dbw_m2")
        );
        assert_eq!(f("pfd_reference_bandwidth_hz"), 4000.0);
        let e: f64 = elevation.parse().unwrap();
        let limit = -150.0 + 0.5 * (e.clamp(5.0, 25.0) - 5.0);
        assert_eq!(f("pfd_limit_dbw_m2"), limit);
        assert!((f("pfd_margin_db") - (limit - f("pfd_dbw_m2"))).abs() < 2e-4);
        assert!(d["pfd_limit_status"]
            .as_str()
            .unwrap()
            .contains("from memory"));
    }
    // No row for the band: null fields and a warning, not an error.
    let d = json(&run(&[
        "budget",
        MISSION,
        "--station",
        "nordkam",
        "--elevation-deg",
        "10",
        "--set",
        "transmitter.frequency_mhz=5000",
        "--format",
        "json",
    ]));
    assert!(d["pfd_dbw_m2"].is_null() && d["pfd_margin_db"].is_null());
    assert!(d["warnings"]
        .to_string()
        .contains("no Article 21 Table 21-4 row"));
}

/// A transmitter 34 dB stronger than the example's (5 kW) is over the limit: the plan still runs
/// (exit 0), warns on stderr and in `assumptions.warnings` and the passes' warnings, and the `pfd`
/// block's worst margins are each option's minimum over 0-90 deg, the example's own by 34 dB less.
#[test]
fn plan_pfd_over_the_limit_is_a_warning() {
    let base = json(&run(&["plan", MISSION, "--days", "1", "--format", "json"]));
    let o = run(&[
        "plan",
        MISSION,
        "--days",
        "1",
        "--format",
        "json",
        "--set",
        "transmitter.power_w=5000",
    ]);
    let loud = json(&o);
    let stderr = String::from_utf8_lossy(&o.stderr);
    assert!(
        stderr.contains("exceeds the Article 21 Table 21-4 limit"),
        "{stderr}"
    );
    assert!(stderr.contains("compliance is for the administration to decide"));
    let (a, b) = (&base["pfd"], &loud["pfd"]);
    assert_eq!(a["band"], "8025-8500 MHz");
    assert_eq!(a["reference_bandwidth_hz"], 4000.0);
    let gain_db = 10.0 * (5000.0f64 / 2.0).log10();
    for (x, y) in a["options"]
        .as_array()
        .unwrap()
        .iter()
        .zip(b["options"].as_array().unwrap())
    {
        let (mx, my) = (
            x["worst_margin_db"].as_f64().unwrap(),
            y["worst_margin_db"].as_f64().unwrap(),
        );
        assert!(mx > 0.0 && my < 0.0);
        assert!((mx - my - gain_db).abs() < 2e-4, "{mx} {my}");
        let limit = x["limit_dbw_m2"].as_f64().unwrap();
        let angle = x["worst_arrival_deg"].as_f64().unwrap();
        assert_eq!(limit, -150.0 + 0.5 * (angle.clamp(5.0, 25.0) - 5.0));
    }
    let warnings = loud["assumptions"]["warnings"].to_string();
    assert!(warnings.contains("pfd:"), "{warnings}");
    for (p, q) in base["passes"]
        .as_array()
        .unwrap()
        .iter()
        .zip(loud["passes"].as_array().unwrap())
    {
        let (mp, mq) = (
            p["pfd_margin_db"].as_f64().unwrap(),
            q["pfd_margin_db"].as_f64().unwrap(),
        );
        assert!(mp > 0.0, "{mp}");
        if mq < 0.0 {
            assert!(q["warnings"].as_str().unwrap().contains("pfd:"));
        }
    }
}

/// The 25.5-27 GHz row against the text it was read in: 47 CFR §25.208(p) (eCFR text after
/// 89 FR 34167, 30 April 2024): for "the Earth exploration-satellite service in the band
/// 25.5-27 GHz", -115 dB(W/m2) in any 1 MHz band at 0-5 deg, -115 + 0.5 (δ - 5) at 5-25 deg and
/// -105 at 25-90 deg, under assumed free-space conditions. The band's edges are the rule's
/// (25.4 and 27.1 GHz have no row), and `budget` reports the row's source, not "from memory".
#[test]
fn ka_row_against_47_cfr_25_208_p() {
    use passbudget::link::pfd::BandLimit;
    let ka = BandLimit::for_frequency(26.0e9).unwrap();
    assert_eq!((ka.low_mhz, ka.high_mhz), (25_500.0, 27_000.0));
    assert_eq!(ka.reference_bandwidth_hz, 1e6);
    for (angle, want) in [
        (0.0, -115.0),
        (5.0, -115.0),
        (10.0, -112.5),
        (15.0, -110.0),
        (25.0, -105.0),
        (60.0, -105.0),
        (90.0, -105.0),
    ] {
        assert_eq!(ka.limit_dbw_m2(angle), want, "{angle}");
    }
    assert!(ka.status.contains("47 CFR 25.208(p)") && ka.confirmed());
    assert!(BandLimit::for_frequency(25.4e9).is_none());
    assert!(BandLimit::for_frequency(27.1e9).is_none());
    // the other rows stay flagged
    for f in [2.05e9, 2.25e9, 8.2e9] {
        assert!(!BandLimit::for_frequency(f).unwrap().confirmed(), "{f}");
    }
    let d = json(&run(&[
        "budget",
        MISSION,
        "--station",
        "nordkam",
        "--elevation-deg",
        "15",
        "--set",
        "transmitter.frequency_mhz=26000",
        "--format",
        "json",
    ]));
    assert_eq!(d["pfd_reference_bandwidth_hz"], 1e6);
    assert_eq!(d["pfd_limit_dbw_m2"], -110.0);
    let status = d["pfd_limit_status"].as_str().unwrap();
    assert!(status.contains("47 CFR 25.208(p)"), "{status}");
    assert!(!status.contains("from memory"), "{status}");
}

/// `budget`'s table and CSV carry the pfd as items (the JSON's `pfd_*` fields), with the row's
/// status in the limit's source; on stdout, so `--quiet` keeps them.
#[test]
fn budget_table_and_csv_carry_the_pfd() {
    let args = |format: &str| {
        run(&[
            "budget",
            MISSION,
            "--station",
            "nordkam",
            "--elevation-deg",
            "20",
            "--quiet",
            "--format",
            format,
        ])
    };
    let d = json(&args("json"));
    let table = success(&args("table"));
    for (item, value) in [
        ("pfd ", format!("{:.2}", d["pfd_dbw_m2"].as_f64().unwrap())),
        ("pfd reference bandwidth", "4000".to_string()),
        (
            "pfd limit",
            format!("{:.2}", d["pfd_limit_dbw_m2"].as_f64().unwrap()),
        ),
        (
            "pfd margin",
            format!("{:.2}", d["pfd_margin_db"].as_f64().unwrap()),
        ),
    ] {
        let line = table
            .lines()
            .find(|l| l.starts_with(item))
            .unwrap_or_else(|| panic!("{item}: {table}"));
        assert!(line.contains(&value), "{line} vs {value}");
    }
    let limit_line = table.lines().find(|l| l.starts_with("pfd limit")).unwrap();
    assert!(limit_line.contains("from memory"), "{limit_line}");
    let csv = success(&args("csv"));
    for name in [
        "pfd,",
        "pfd_reference_bandwidth,",
        "pfd_limit,",
        "pfd_margin,",
    ] {
        assert!(csv.lines().any(|l| l.starts_with(name)), "{name}: {csv}");
    }
}

/// The plan's table shows every rate option's worst pfd margin (the JSON's `pfd.options`), and
/// the table's notes and the CSV's `#` lines say which values are from memory: one line for the
/// built-in thresholds (the names grouped) and one for the band's row.
#[test]
fn plan_table_and_csv_flag_the_unconfirmed_values() {
    let d = json(&run(&[
        "plan", MISSION, "--days", "1", "--quiet", "--format", "json",
    ]));
    let o = run(&["plan", MISSION, "--days", "1", "--quiet"]);
    let table = success(&o);
    assert!(
        table.contains("pfd: worst margin per rate option"),
        "{table}"
    );
    for opt in d["pfd"]["options"].as_array().unwrap() {
        let margin = format!("{:.1}", opt["worst_margin_db"].as_f64().unwrap());
        let angle = format!("{:.1} deg", opt["worst_arrival_deg"].as_f64().unwrap());
        let scheme = opt["scheme"].as_str().unwrap();
        assert!(
            table.lines().any(|l| l.contains(scheme)
                && l.contains(&margin)
                && l.contains(&angle)
                && l.contains("from memory")),
            "{opt}: {table}"
        );
    }
    let from_memory: Vec<&str> = table
        .lines()
        .filter(|l| l.starts_with("note: from memory"))
        .collect();
    assert_eq!(from_memory.len(), 2, "{table}");
    assert!(
        from_memory[0].contains("ccsds-rs-cc, ccsds-ldpc-r7/8"),
        "{table}"
    );
    assert!(from_memory[1].contains("8025-8500 MHz"), "{table}");
    // quiet: nothing on stderr, the table keeps them
    assert!(
        o.stderr.is_empty(),
        "{}",
        String::from_utf8_lossy(&o.stderr)
    );
    let csv = success(&run(&[
        "plan", MISSION, "--days", "1", "--quiet", "--format", "csv",
    ]));
    let comments: Vec<&str> = csv.lines().filter(|l| l.starts_with('#')).collect();
    assert_eq!(
        comments
            .iter()
            .filter(|l| l.contains("from memory:"))
            .count(),
        2,
        "{csv}"
    );
    // and the JSON's warnings
    let warnings = d["assumptions"]["warnings"].to_string();
    assert!(
        warnings.contains("from memory: the required Eb/N0"),
        "{warnings}"
    );
}

/// `pfd.spectrum: raised-cosine` (the raised-cosine spectrum of the modem's roll-off; Proakis,
/// Digital Communications, the raised-cosine spectrum, from memory): with a 4 kHz reference far
/// narrower than every option's symbol rate, the density in B_ref is P / Rs instead of
/// P / (Rs (1 + α)), so every worst margin drops by 10 log10(1 + 0.35) = 1.3033 dB (the
/// example's roll-off, the default 0.35) and the budget's pfd rises by as much. A wrong value is
/// refused with the file, line and key.
#[test]
fn raised_cosine_spectrum_moves_the_pfd_by_the_roll_off() {
    let plan = |extra: &[&str]| {
        let mut a = vec![
            "plan", MISSION, "--days", "1", "--quiet", "--format", "json",
        ];
        a.extend_from_slice(extra);
        json(&run(&a))
    };
    let set = ["--set", "pfd.spectrum=raised-cosine"];
    let (u, r) = (plan(&[]), plan(&set));
    let step_db = 10.0 * 1.35f64.log10();
    for (x, y) in u["pfd"]["options"]
        .as_array()
        .unwrap()
        .iter()
        .zip(r["pfd"]["options"].as_array().unwrap())
    {
        let d = x["worst_margin_db"].as_f64().unwrap() - y["worst_margin_db"].as_f64().unwrap();
        assert!((d - step_db).abs() < 2e-4, "{d}");
    }
    assert!(r["pfd"]["method"]
        .as_str()
        .unwrap()
        .contains("raised-cosine"));
    let budget = |extra: &[&str]| {
        let mut a = vec![
            "budget",
            MISSION,
            "--station",
            "nordkam",
            "--elevation-deg",
            "20",
            "--format",
            "json",
        ];
        a.extend_from_slice(extra);
        json(&run(&a))
    };
    let d =
        budget(&set)["pfd_dbw_m2"].as_f64().unwrap() - budget(&[])["pfd_dbw_m2"].as_f64().unwrap();
    assert!((d - step_db).abs() < 2e-4, "{d}");
    // a wrong value: file, line and key
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(root().join(MISSION))
        .unwrap()
        .replace(
            "../stations/",
            &format!("{}/", root().join("stations").display()),
        )
        .replace(
            "elements: sat.tle",
            &format!("elements: {}", root().join("examples/sat.tle").display()),
        )
        + "pfd:\n  spectrum: gaussian\n";
    let lines = text.lines().count();
    let mission = write(dir.path(), "mission.yaml", &text);
    clean_error(
        &run(&["plan", &mission, "--days", "1"]),
        &[
            &format!("mission.yaml:{lines}:"),
            "pfd.spectrum",
            "gaussian",
        ],
    );
}
