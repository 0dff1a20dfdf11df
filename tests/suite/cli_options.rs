//! The command line's one convention (the mission file positional, units in option names, the
//! older spellings kept as hidden aliases), the `--set` overrides, `compare`, and the stable pass
//! identifier (`pass_id`) in `passes`, `plan` and `chart --pass`.

use crate::common::bin::{clean_error, json, root, run, success};
use passbudget::geometry::{find_passes, HorizonMask, Observer};
use passbudget::orbit::Propagator;
use passbudget::plan::inputs::load_satellite;
use passbudget::timefmt::parse_utc;

const EXAMPLE: &str = "examples/wrenlet-1.yaml";

/// 10 log10 2: doubling the transmitter power in watts (first principles: P_dBW = 10 log10 P_W).
const DOUBLE_DB: f64 = 3.010_299_956_639_812;

fn num(v: &serde_json::Value, key: &str) -> f64 {
    v[key]
        .as_f64()
        .unwrap_or_else(|| panic!("{key} missing: {v}"))
}

/// Every older spelling gives exactly the output of the new one (project consistency: the
/// aliases are the same options, no outside source).
#[test]
fn old_spellings_are_hidden_aliases_of_the_new_ones() {
    let same = |old: &[&str], new: &[&str]| {
        let (a, b) = (success(&run(old)), success(&run(new)));
        assert!(!a.is_empty());
        assert_eq!(a, b, "{old:?} against {new:?}");
    };
    let window = ["--start", "2026-12-01T12:00:00Z", "--days", "0.5"];
    let cmd =
        |v: &[&'static str]| -> Vec<&'static str> { v.iter().copied().chain(window).collect() };
    same(
        &cmd(&[
            "passes",
            "--mission",
            EXAMPLE,
            "--mask",
            "7",
            "--format",
            "csv",
        ]),
        &cmd(&["passes", EXAMPLE, "--mask-deg", "7", "--format", "csv"]),
    );
    same(
        &cmd(&[
            "track",
            "--mission",
            EXAMPLE,
            "--station",
            "stations/nordkam.yaml",
            "--step",
            "60",
        ]),
        &cmd(&["track", EXAMPLE, "--station", "Nordkam", "--step-s", "60"]),
    );
    same(
        &cmd(&[
            "plan", EXAMPLE, "--step", "2", "--mask", "6", "--format", "csv",
        ]),
        &cmd(&[
            "plan",
            "--mission",
            EXAMPLE,
            "--step-s",
            "2",
            "--mask-deg",
            "6",
            "--format",
            "csv",
        ]),
    );
    same(
        &cmd(&["mask", EXAMPLE, "--mask-step", "10", "--format", "csv"]),
        &cmd(&["mask", EXAMPLE, "--mask-step-deg", "10", "--format", "csv"]),
    );
    let atm = |f: &[&'static str]| -> Vec<&'static str> {
        let mut v = vec!["atmosphere", "--station", "stations/pulau-reka.yaml"];
        v.extend(f);
        v.extend(["--elevation-deg", "20", "--format", "json"]);
        v
    };
    same(
        &atm(&["--frequency-ghz", "8.2"]),
        &atm(&["--frequency-mhz", "8200"]),
    );
    // budget --station: the station's name in the mission, or its file.
    let b = |st: &'static str| ["budget", EXAMPLE, "--station", st, "--elevation-deg", "30"];
    same(&b("Sierra Baja"), &b("stations/sierra-baja.yaml"));
    same(&b("Sierra Baja"), &b("sierra-baja"));
}

#[test]
fn every_option_has_help_text_and_the_old_spellings_are_hidden() {
    for cmd in [
        "passes",
        "track",
        "atmosphere",
        "budget",
        "plan",
        "mask",
        "chart",
        "sun-transits",
        "compare",
    ] {
        let help = success(&run(&[cmd, "--help"]));
        for line in help.lines().filter(|l| l.trim_start().starts_with("--")) {
            let text = line.trim_start();
            // "--option <VALUE>  Help text": the option, then two spaces or more, then the text.
            let rest = text.split_once("  ").map(|(_, h)| h.trim()).unwrap_or("");
            assert!(!rest.is_empty(), "{cmd}: no help for {text}");
        }
        for old in [
            "--mask ",
            "--step ",
            "--mask-step ",
            "--frequency-ghz",
            "--mission",
        ] {
            assert!(!help.contains(old), "{cmd} --help shows {old}");
        }
    }
}

/// `budget` at one elevation: +3.0103 dB of transmitter power (power_w doubled by --set) gives
/// +3.0103 dB of C/N0 and of margin, everything else equal (the link budget is linear in dB:
/// C/N0 = EIRP - L + G/T - k; first principles).
#[test]
fn set_power_moves_the_margin_by_the_same_decibels() {
    let b = |more: &[&str]| {
        let mut a = vec![
            "budget",
            EXAMPLE,
            "--station",
            "Nordkam",
            "--elevation-deg",
            "25",
            "--format",
            "json",
        ];
        a.extend(more);
        json(&run(&a))
    };
    let base = b(&[]);
    let doubled = b(&["--set", "transmitter.power_w=4"]);
    let d = num(&doubled, "margin_db") - num(&base, "margin_db");
    assert!((d - DOUBLE_DB).abs() < 1e-6, "margin moved by {d} dB");
    // A station key: a larger dish raises G by 20 log10(D2/D1) at the same efficiency
    // (G = eta (pi D / lambda)^2).
    let dish = b(&["--set", "station.nordkam.antenna.diameter_m=14.6"]);
    assert!(num(&dish, "margin_db") > num(&base, "margin_db") + 5.0);
}

#[test]
fn invalid_overrides_are_refused_naming_the_argument() {
    let plan = |set: &str| run(&["plan", EXAMPLE, "--days", "0.2", "--set", set]);
    clean_error(
        &plan("transmitter.power_w=-2"),
        &["--set transmitter.power_w=-2", "power must be positive"],
    );
    // The same range check as the file (config::limits), the same message, no line.
    clean_error(
        &plan("planning.step_s=20"),
        &["--set planning.step_s=20: planning.step_s: 20 is out of range (0.01 to 10 s)"],
    );
    clean_error(
        &plan("station.Nordkam.antenna.efficiency=1.5"),
        &[
            "nordkam.yaml: --set station.Nordkam.antenna.efficiency=1.5",
            "antenna.efficiency",
            "out of range",
        ],
    );
    clean_error(
        &plan("transmitter.powr_w=2"),
        &["--set transmitter.powr_w=2", "unknown field `powr_w`"],
    );
    clean_error(
        &plan("station.Nowhere.altitude_m=3"),
        &["--set station.Nowhere.altitude_m=3", "Nordkam"],
    );
    clean_error(
        &plan("transmitter.power_w"),
        &["--set transmitter.power_w", "KEY=VALUE"],
    );
    // Rules checked after the file's validation (the scheme names, the band) name it too.
    let ladder = "modem.ladder=[{rate_bps: 1e6, scheme: bpsk-9}]";
    clean_error(&plan(ladder), &[&format!("--set {ladder}"), "bpsk-9"]);
    // The dwell rule of the planner names the --set argument too.
    clean_error(
        &plan("planning.step_s=8"),
        &["--set planning.step_s=8", "min_dwell_s"],
    );
    // A block the argument changed, found wanting as a whole, names the argument beside the
    // block's line (it named the line alone, so the file looked at fault).
    clean_error(
        &plan("transmitter.power_w="),
        &[
            "wrenlet-1.yaml:18: transmitter: needs power_w or power_dbw",
            "(the block as --set transmitter.power_w= changed it)",
        ],
    );
}

/// A mission compared with itself differs in nothing (the comparison matches every pass with
/// itself by identifier).
#[test]
fn compare_with_itself_gives_zero_differences() {
    let c = json(&run(&[
        "compare", EXAMPLE, "--days", "1", "--format", "json",
    ]));
    let passes = c["passes"].as_array().unwrap();
    assert!(passes.len() > 10);
    for p in passes {
        assert_eq!(p["in_runs"], "both", "{p}");
        for k in [
            "diff_volume_bits",
            "diff_adaptive_volume_bits",
            "diff_peak_margin_db",
        ] {
            assert_eq!(num(p, k), 0.0, "{k} in {p}");
        }
        assert_eq!(p["a_rate_bps"], p["b_rate_bps"]);
    }
    let t = &c["totals"];
    assert_eq!(t["passes_matched"], t["a_passes"]);
    assert_eq!(num(t, "diff_volume_bits"), 0.0);
    assert_eq!(num(t, "passes_rate_changed"), 0.0);
}

/// compare with --set-b: doubling the power raises every pass's peak C/N0 by 10 log10 2 and,
/// where the chosen rate stays, its peak margin by as much (first principles, as above); the
/// volume never falls and the total rises.
#[test]
fn compare_power_doubling_by_set_b() {
    let c = json(&run(&[
        "compare",
        EXAMPLE,
        "--days",
        "1",
        "--format",
        "json",
        "--set-b",
        "transmitter.power_w=4",
    ]));
    assert_eq!(c["b"]["set"][0], "transmitter.power_w=4");
    let mut same_rate = 0;
    for p in c["passes"].as_array().unwrap() {
        let d = num(p, "diff_peak_cn0_db");
        assert!((d - DOUBLE_DB).abs() < 1e-5, "{p}");
        if p["a_rate_bps"] == p["b_rate_bps"] {
            same_rate += 1;
            let m = num(p, "diff_peak_margin_db");
            assert!((m - DOUBLE_DB).abs() < 2e-3, "{p}");
            // The same threshold is reached earlier and left later.
            assert!(num(p, "diff_closes_from_s") <= 0.0 && num(p, "diff_closes_until_s") >= 0.0);
        }
        assert!(num(p, "diff_volume_bits") >= 0.0, "{p}");
    }
    assert!(same_rate > 5);
    assert!(num(&c["totals"], "diff_volume_bits") > 0.0);
    // A warning both runs raise is listed once, marked as both runs'.
    let warnings: Vec<&str> = c["warnings"]
        .as_array()
        .unwrap()
        .iter()
        .map(|w| w.as_str().unwrap())
        .collect();
    assert!(
        warnings.iter().any(|w| w.starts_with("runs A and B: ")),
        "{warnings:?}"
    );
    let text = |w: &str| w.split_once(": ").unwrap().1.to_string();
    let mut texts: Vec<String> = warnings.iter().map(|w| text(w)).collect();
    texts.sort();
    texts.dedup();
    assert_eq!(texts.len(), warnings.len(), "{warnings:?}");
    // The table shows the C/N0 change beside the peak margins, which a rate change can hide
    // (where B takes a faster rate its peak margin may not move at all).
    let table = success(&run(&[
        "compare",
        EXAMPLE,
        "--days",
        "1",
        "--set-b",
        "transmitter.power_w=4",
    ]));
    let header = table.lines().find(|l| l.starts_with("pass id")).unwrap();
    assert!(header.trim_end().ends_with("diff C/N0 dB"), "{header}");
    let rows = table.lines().filter(|l| l.contains("-2026")).count();
    let plus = table
        .lines()
        .filter(|l| l.contains("-2026") && l.trim_end().ends_with("+3.01"))
        .count();
    assert!(rows > 10 && plus == rows, "{table}");
    // Two mission files: the same file twice is the same as one.
    let two = json(&run(&[
        "compare", EXAMPLE, EXAMPLE, "--days", "0.5", "--format", "json",
    ]));
    assert_eq!(num(&two["totals"], "diff_volume_bits"), 0.0);
}

/// The pass identifier does not move with the window: the same pass seen from windows that
/// start hours apart, and from windows that cut it after its highest point (start) or before it
/// (end), has one identifier (project rule; the TCA itself is checked against Skyfield in
/// geometry_skyfield).
#[test]
fn pass_id_is_the_same_whatever_the_window() {
    let ids = |start: &str, days: &str| -> Vec<(String, serde_json::Value)> {
        let v = json(&run(&[
            "passes", EXAMPLE, "--start", start, "--days", days, "--format", "json",
        ]));
        v["passes"]
            .as_array()
            .unwrap()
            .iter()
            .map(|p| (p["pass_id"].as_str().unwrap().to_string(), p.clone()))
            .collect()
    };
    let wide = ids("2026-12-01T12:00:00Z", "1");
    let (id, whole) = wide
        .iter()
        .find(|(_, p)| p["max_elevation_deg"].as_f64().unwrap() > 30.0)
        .expect("a high pass");
    // Windows starting 1, 5 and 9 hours earlier than the pass's AOS.
    let aos = parse_utc(whole["aos"].as_str().unwrap()).unwrap();
    let tca = parse_utc(whole["tca"].as_str().unwrap()).unwrap();
    for h in [1, 5, 9] {
        let s = (aos - chrono::Duration::hours(h)).to_rfc3339();
        assert!(ids(&s, "1").iter().any(|(i, _)| i == id), "start {s}");
    }
    // Cut after its highest point by the window start, and before it by the window end.
    let after = (tca + chrono::Duration::seconds(90)).to_rfc3339();
    let cut = ids(&after, "0.1");
    assert_eq!(cut[0].0, *id, "window start {after}");
    assert_eq!(cut[0].1["starts_before_window"], true);
    let before = (aos - chrono::Duration::hours(2)).to_rfc3339();
    let end_days = ((tca - aos).num_seconds() as f64 - 60.0 + 7200.0) / 86400.0;
    let cut = ids(&before, &end_days.to_string());
    let last = cut.last().unwrap();
    assert_eq!(last.0, *id);
    assert_eq!(last.1["ends_after_window"], true);
}

/// The library's whole-pass TCA of a pass cut at the window start equals the TCA of the uncut
/// pass to the search's time tolerance (0.02 s, `geometry::passes::TIME_TOLERANCE_S`).
#[test]
fn full_tca_of_a_cut_pass_is_the_uncut_tca() {
    let root = root();
    let start = parse_utc("2026-12-01T12:00:00Z").unwrap();
    let end = parse_utc("2026-12-02T12:00:00Z").unwrap();
    let (set, _, _) =
        load_satellite(&root.join("examples/sat.tle"), None, start).expect("elements");
    let prop = Propagator::new(&set).unwrap();
    let obs = Observer::new(69.65, 18.95, 20.0).unwrap();
    let mask = HorizonMask::new(0.0, Vec::new()).unwrap();
    let whole = find_passes(&prop, &obs, &mask, start, end).passes;
    let p = whole.iter().find(|p| p.max_elevation_deg > 20.0).unwrap();
    assert_eq!(p.full_tca, p.tca);
    for after_s in [30, 120, 200] {
        let s = p.tca + chrono::Duration::seconds(after_s);
        let cut = &find_passes(&prop, &obs, &mask, s, end).passes[0];
        assert!(cut.starts_before_window);
        let dt = (cut.full_tca - p.tca).num_milliseconds().abs();
        assert!(dt <= 20, "{after_s} s after TCA: off by {dt} ms");
    }
    let e = p.tca - chrono::Duration::seconds(100);
    let cut = find_passes(&prop, &obs, &mask, start, e).passes;
    let last = cut.last().unwrap();
    assert!(last.ends_after_window);
    assert!((last.full_tca - p.tca).num_milliseconds().abs() <= 20);
}

/// `chart --pass ID` draws the pass `plan` shows with that identifier (its number in the file
/// name), and only that pass chart.
#[test]
fn chart_pass_takes_the_identifier() {
    let plan = json(&run(&[
        "plan", EXAMPLE, "--days", "0.5", "--format", "json",
    ]));
    let p = &plan["passes"][3];
    let id = p["pass_id"].as_str().unwrap();
    let number = p["number"].as_u64().unwrap();
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("charts");
    success(&run(&[
        "chart",
        EXAMPLE,
        "--days",
        "0.5",
        "--pass",
        id,
        "--kind",
        "pass",
        "--chart-format",
        "svg",
        "--out",
        out.to_str().unwrap(),
    ]));
    let files: Vec<String> = std::fs::read_dir(&out)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .filter(|n| n.starts_with("pass-"))
        .collect();
    assert_eq!(files.len(), 1, "{files:?}");
    assert!(
        files[0].starts_with(&format!("pass-{number:03}-")),
        "{files:?}"
    );
    clean_error(
        &run(&[
            "chart",
            EXAMPLE,
            "--days",
            "0.5",
            "--pass",
            "nordkam-19990101T0000Z",
        ]),
        &["--pass nordkam-19990101T0000Z", "no pass of this window"],
    );
    // An identifier one minute off (a minute misread) names the pass it most likely meant.
    let (stem, minute) = id.split_at(id.len() - 3);
    let off = format!(
        "{stem}{:02}Z",
        (minute[..2].parse::<u32>().unwrap() + 1) % 60
    );
    clean_error(
        &run(&["chart", EXAMPLE, "--days", "0.5", "--pass", &off]),
        &[&format!(
            "the nearest at that station is {id} (pass {number})"
        )],
    );
}

/// `sun-transits` names each transit's pass by the same identifier as `plan` (project
/// consistency: one identifier everywhere).
#[test]
fn sun_transits_carry_the_plan_pass_id() {
    let t = json(&run(&["sun-transits", EXAMPLE, "--format", "json"]));
    let plan = json(&run(&["plan", EXAMPLE, "--format", "json"]));
    let transits = t["transits"].as_array().unwrap();
    assert!(!transits.is_empty());
    for tr in transits {
        let n = tr["pass"].as_u64().unwrap() as usize;
        assert_eq!(tr["pass_id"], plan["passes"][n - 1]["pass_id"], "{tr}");
    }
}
