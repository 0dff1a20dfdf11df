//! The contact plan end to end: the JSON contract of `plan` for the single-satellite and the
//! fleet examples, every booking constraint checked on the shipped fleet, the iCalendar files
//! against RFC 5545's structure, and bad fleet input.
//!
//! Sources: RFC 5545 (iCalendar) section 3.1 (content lines end with CRLF), section 3.4 (a
//! VCALENDAR object), section 3.6.1 (VEVENT with UID, DTSTAMP, DTSTART), section 3.3.5 (UTC
//! DATE-TIME form `YYYYMMDDTHHMMSSZ`). The constraints are the definition of a valid
//! schedule, checked independently of the scheduler from its published outputs.

use crate::common::bin::{clean_error, json, run, success, write};
use chrono::{DateTime, Utc};
use passbudget::timefmt::parse_utc;
use serde_json::Value;

const FLEET: &str = "examples/fleet/kestrel-fleet.yaml";
const SINGLE: &str = "examples/wrenlet-1.yaml";

fn time(v: &Value) -> DateTime<Utc> {
    DateTime::parse_from_rfc3339(v.as_str().unwrap())
        .unwrap()
        .with_timezone(&Utc)
}

fn num(v: &Value) -> f64 {
    v.as_f64().unwrap()
}

/// The contract of issue "contact plan": contacts, satellites, stations, schedule_bound and
/// totals.delivered_bits (the sum over the contacts), with every listed field present.
fn check_contract(doc: &Value) {
    for c in doc["contacts"].as_array().unwrap() {
        for k in [
            "satellite",
            "station",
            "start",
            "end",
            "rate_bps",
            "volume_bits",
        ] {
            assert!(!c[k].is_null(), "contact without {k}: {c}");
        }
    }
    for s in doc["satellites"].as_array().unwrap() {
        for k in ["name", "delivered_bits"] {
            assert!(!s[k].is_null(), "satellite without {k}: {s}");
        }
        for k in [
            "generated_bits",
            "lost_bits",
            "storage_peak_bits",
            "max_latency_s",
        ] {
            assert!(s.get(k).is_some(), "satellite without {k}: {s}");
        }
    }
    for s in doc["stations"].as_array().unwrap() {
        for k in ["name", "booked_s", "utilization"] {
            assert!(!s[k].is_null(), "station without {k}: {s}");
        }
        assert!((0.0..=1.0).contains(&num(&s["utilization"])), "{s}");
    }
    let b = &doc["schedule_bound"];
    let sum: f64 = doc["contacts"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| num(&c["volume_bits"]))
        .sum();
    assert_eq!(num(&doc["totals"]["delivered_bits"]), sum);
    assert!(
        num(&b["delivered_upper_bits"]) >= sum * (1.0 - 1e-9),
        "bound below delivered: {b}"
    );
    assert!((0.0..=1.0).contains(&num(&b["gap"])), "{b}");
}

/// Every booking constraint, from the published contacts: one contact per antenna at a time
/// with the set-up (turnaround) before it; one downlink per satellite at a time (the example's
/// satellites have one transmitter each); blocked periods kept free; rules respected.
fn check_constraints(doc: &Value, blocked: &[(&str, &str, &str)]) {
    let contacts = doc["contacts"].as_array().unwrap();
    for (i, a) in contacts.iter().enumerate() {
        let (a0, a1, s0) = (time(&a["start"]), time(&a["end"]), time(&a["setup_start"]));
        assert!(a1 > a0 && s0 <= a0, "{a}");
        for b in &contacts[i + 1..] {
            let (b0, b1, bs) = (time(&b["start"]), time(&b["end"]), time(&b["setup_start"]));
            if a["antenna"] == b["antenna"] {
                assert!(
                    a1 <= bs || b1 <= s0,
                    "antenna overlap (set-up included):\n{a}\n{b}"
                );
            }
            if a["satellite"] == b["satellite"] {
                assert!(
                    a1 <= b0 || b1 <= a0,
                    "one satellite twice at once:\n{a}\n{b}"
                );
            }
        }
        for (station, from, to) in blocked {
            if a["station"] == *station {
                let (f, t) = (time(&Value::from(*from)), time(&Value::from(*to)));
                assert!(a1 <= f || s0 >= t, "contact in a blocked period: {a}");
            }
        }
    }
}

/// A fleet's `days`: every UTC date of the window (12:00 on 12-01 for 7 days touches 8 dates),
/// each with the contacts' volumes split at midnight in proportion to their time, computed here
/// from the contact rows alone; together the delivered total.
fn check_days(doc: &serde_json::Value) {
    let t = |s: &serde_json::Value| parse_utc(s.as_str().unwrap()).unwrap();
    let mut by_day: std::collections::BTreeMap<String, f64> = Default::default();
    for c in doc["contacts"].as_array().unwrap() {
        let (a, b, v) = (t(&c["start"]), t(&c["end"]), num(&c["volume_bits"]));
        let span_s = (b - a).as_seconds_f64();
        let mut at = a;
        while at < b {
            let midnight = (at.date_naive() + chrono::Days::new(1))
                .and_hms_opt(0, 0, 0)
                .unwrap();
            let to = b.min(midnight.and_utc());
            *by_day.entry(at.date_naive().to_string()).or_default() +=
                v * (to - at).as_seconds_f64() / span_s;
            at = to;
        }
    }
    let days = doc["days"].as_array().unwrap();
    let dates: Vec<&str> = days.iter().map(|d| d["date"].as_str().unwrap()).collect();
    assert_eq!(dates.first(), Some(&"2026-12-01"));
    assert_eq!(dates.len(), 8, "{dates:?}");
    let mut sum = 0.0;
    for d in days {
        let want = by_day
            .get(d["date"].as_str().unwrap())
            .copied()
            .unwrap_or(0.0);
        assert!(
            (num(&d["delivered_bits"]) - want).abs() <= 1.0,
            "{d}: {want}"
        );
        sum += num(&d["delivered_bits"]);
    }
    assert!(
        (sum - num(&doc["totals"]["delivered_bits"])).abs() <= 8.0,
        "{sum}"
    );
}

#[test]
fn the_fleet_example_gives_the_contract_and_keeps_every_constraint() {
    let doc = json(&run(&["plan", FLEET, "--format", "json", "--quiet"]));
    check_contract(&doc);
    check_constraints(
        &doc,
        &[(
            "Sierra Baja",
            "2026-12-03T06:00:00Z",
            "2026-12-03T18:00:00Z",
        )],
    );
    check_days(&doc);
    let sats = doc["satellites"].as_array().unwrap();
    assert_eq!(sats.len(), 4);
    for s in sats {
        // Conservation: what was on board at the start plus what was made is delivered, lost or
        // still on board. Initial fills from the mission file.
        let initial = match s["name"].as_str().unwrap() {
            "KESTREL-A" => 2.0e11,
            "KESTREL-C" => 1.0e11,
            _ => 0.0,
        };
        assert_eq!(num(&s["initial_fill_bits"]), initial, "{s}");
        let (g, d, l, f) = (
            num(&s["generated_bits"]),
            num(&s["delivered_bits"]),
            num(&s["lost_bits"]),
            num(&s["final_fill_bits"]),
        );
        assert!(
            (initial + g - d - l - f).abs() <= 16.0,
            "not conserved: {s}"
        );
        assert!(num(&s["storage_peak_bits"]) <= 1.0e12, "{s}");
    }
    // Rules of the example: Pulau Reka books no contact peaking below 10 deg, Punta Gaviota none
    // shorter than 120 s.
    for c in doc["contacts"].as_array().unwrap() {
        if c["station"] == "Punta Gaviota" {
            assert!(num(&c["duration_s"]) >= 120.0 - 1e-6, "{c}");
        }
    }
    // No pass is booked in two pieces on the two antennas of Punta Gaviota (the antenna rounds
    // move a split pass whole onto one antenna).
    let mut seen = std::collections::HashSet::new();
    for c in doc["contacts"].as_array().unwrap() {
        let key = (c["satellite"].to_string(), c["pass_id"].to_string());
        assert!(seen.insert(key), "a pass booked twice: {c}");
    }
    // The headline is the schedule's, never above the unconstrained sum over passes.
    let t = &doc["totals"];
    assert!(num(&t["delivered_bits"]) <= num(&t["unconstrained_volume_bits"]));
}

#[test]
fn a_single_satellite_plan_books_hand_overs_and_never_exceeds_the_network_total() {
    let doc = json(&run(&["plan", SINGLE, "--format", "json", "--quiet"]));
    check_contract(&doc);
    check_constraints(&doc, &[]);
    // One transmitter over three stations: the delivered data cannot exceed the network total,
    // which counts each second once at the best station with no turnaround.
    let t = &doc["totals"];
    assert!(num(&t["delivered_bits"]) <= num(&t["network_volume_bits"]) + 1.0);
    assert!(num(&t["delivered_bits"]) > 0.5 * num(&t["network_volume_bits"]));
    // The days share the delivered data out (contacts across midnight split by their time).
    let days: f64 = doc["days"]
        .as_array()
        .unwrap()
        .iter()
        .map(|d| num(&d["delivered_bits"]))
        .sum();
    let n = doc["days"].as_array().unwrap().len() as f64;
    assert!((days - num(&t["delivered_bits"])).abs() <= n, "{days}");
}

#[test]
fn the_table_puts_the_delivered_data_first() {
    let out = success(&run(&["plan", FLEET, "--quiet"]));
    let first = out.lines().nth(1).unwrap();
    assert!(first.starts_with("Delivered (contact plan)"), "{first}");
    assert!(out.contains("Contact plan (booked contacts):"), "{out}");
    let single = success(&run(&["plan", SINGLE, "--quiet", "--days", "1"]));
    assert!(single
        .lines()
        .nth(1)
        .unwrap()
        .starts_with("Delivered (contact plan)"));
    assert!(single.contains("unconstrained"), "{single}");
}

/// A fleet's outputs flag the values recalled from memory as a single satellite's plan does (the
/// shipped fleet flies the built-in CCSDS schemes in the 8025-8500 MHz band).
#[test]
fn a_fleet_plan_flags_the_values_recalled_from_memory() {
    let csv = success(&run(&[
        "plan", FLEET, "--quiet", "--days", "1", "--format", "csv",
    ]));
    let flagged: Vec<&str> = csv
        .lines()
        .filter(|l| l.starts_with('#') && l.contains("from memory"))
        .collect();
    assert_eq!(flagged.len(), 2, "{csv}");
    assert!(
        flagged.iter().any(|l| l.contains("required Eb/N0")),
        "{csv}"
    );
    assert!(flagged.iter().any(|l| l.contains("pfd limit")), "{csv}");
    let doc = json(&run(&[
        "plan", FLEET, "--quiet", "--days", "1", "--format", "json",
    ]));
    let text = doc.to_string();
    assert!(text.contains("from memory: the pfd limit"), "{text}");
}

/// RFC 5545: CRLF line ends (3.1), one VCALENDAR (3.4), a VEVENT per booked contact of the
/// station with UID, DTSTAMP, DTSTART and DTEND in UTC form (3.6.1, 3.3.5).
#[test]
fn calendars_are_rfc_5545_with_one_event_per_contact() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("out");
    let o = run(&[
        "plan",
        FLEET,
        "--quiet",
        "--format",
        "json",
        "--out",
        out.to_str().unwrap(),
    ]);
    let doc = json(&o);
    for st in doc["stations"].as_array().unwrap() {
        let name = st["name"].as_str().unwrap();
        let slug = name.to_lowercase().replace(' ', "-");
        let text = std::fs::read_to_string(out.join(format!("calendar-{slug}.ics"))).unwrap();
        assert!(text.starts_with("BEGIN:VCALENDAR\r\n"), "{text}");
        assert!(text.trim_end().ends_with("END:VCALENDAR"));
        assert_eq!(
            text.matches('\n').count(),
            text.matches("\r\n").count(),
            "content lines end with CRLF"
        );
        let events = text.matches("BEGIN:VEVENT").count();
        let n = doc["contacts"]
            .as_array()
            .unwrap()
            .iter()
            .filter(|c| c["station"] == name)
            .count();
        assert_eq!(events, n, "{name}");
        let utc = |line: &str| {
            let v = line.split(':').nth(1).unwrap().trim_end();
            v.len() == 16 && v.ends_with('Z') && v.as_bytes()[8] == b'T'
        };
        for key in ["UID:", "DTSTAMP:", "DTSTART:", "DTEND:"] {
            let lines: Vec<&str> = text.lines().filter(|l| l.starts_with(key)).collect();
            assert_eq!(lines.len(), n, "{key} in {name}");
            if key != "UID:" {
                assert!(
                    lines.iter().all(|l| utc(l)),
                    "{key} not UTC DATE-TIME: {lines:?}"
                );
            }
        }
    }
    for f in [
        "contacts.csv",
        "satellites.csv",
        "stations.csv",
        "summary.json",
        "passes.csv",
    ] {
        assert!(out.join(f).is_file(), "{f}");
    }
}

#[test]
fn bad_fleet_input_names_the_file_line_and_key() {
    let dir = tempfile::tempdir().unwrap();
    let root = crate::common::bin::root();
    let fleet = std::fs::read_to_string(root.join(FLEET)).unwrap();
    for f in ["kestrel.tle", "kestrel-c-imaging.csv"] {
        std::fs::copy(root.join("examples/fleet").join(f), dir.path().join(f)).unwrap();
    }
    let stations = root.join("stations").display().to_string();
    let fleet = fleet.replace("../../stations", &stations);
    // A name given twice: the line of that item (nested `- ` lines do not count as items; see
    // `config::locate`).
    let cases: [(&str, &str, &[&str]); 7] = [
        // names that differ only in case or punctuation are one name to --satellite
        (
            "name: KESTREL-B",
            "name: kestrel_a",
            &[":16:", "'KESTREL-A' and 'kestrel_a'"],
        ),
        (
            "name: KESTREL-D",
            "name: KESTREL-A",
            &[":29:", "two satellites are named 'KESTREL-A'"],
        ),
        (
            "name: KESTREL-B",
            "name: KESTREL-A",
            &[":16:", "two satellites are named 'KESTREL-A'"],
        ),
        (
            "storage_bits: 2.56e11",
            "storage_bits: -1",
            &[":33:", "onboard.storage_bits", "out of range"],
        ),
        (
            "station: Pulau Reka",
            "station: Nowhere",
            &[":53:", "booking[1]", "Nowhere"],
        ),
        (
            "end: 2026-12-03T18:00:00Z",
            "end: noon",
            &[":51:", "booking.blocked", "RFC 3339"],
        ),
        (
            "generation_bps: 6.0e6",
            "generation_bps: -5",
            &[":34:", "generation_bps", "out of range"],
        ),
    ];
    for (from, to, needles) in cases {
        assert!(fleet.contains(from), "{from}");
        let m = write(dir.path(), "m.yaml", &fleet.replacen(from, to, 1));
        clean_error(&run(&["plan", &m]), needles);
    }
    let csv = "start,end,rate_bps\n2026-12-01T13:30:00Z,2026-12-01T13:40:00Z,1e6\n2026-12-01T13:35:00Z,2026-12-01T13:50:00Z,1e6\n";
    write(dir.path(), "kestrel-c-imaging.csv", csv);
    let m = write(dir.path(), "m.yaml", &fleet);
    clean_error(
        &run(&["plan", &m]),
        &["kestrel-c-imaging.csv:3", "overlapping"],
    );
    // Two names of punctuation alone are no words to compare loosely, but the same name all the
    // same.
    let dashes = fleet.replacen("name: KESTREL-A", "name: '--'", 1).replacen(
        "name: KESTREL-B",
        "name: '--'",
        1,
    );
    let m = write(dir.path(), "m.yaml", &dashes);
    clean_error(&run(&["plan", &m]), &["two satellites are named '--'"]);
    // Two station files whose names differ only in case: one station to --station NAME.
    let nordkam = std::fs::read_to_string(root.join("stations/nordkam.yaml")).unwrap();
    assert!(nordkam.contains("name: Nordkam"));
    write(
        dir.path(),
        "nk2.yaml",
        &nordkam.replacen("name: Nordkam", "name: NORDKAM", 1),
    );
    let two = fleet.replacen("stations:\n", "stations:\n  - nk2.yaml\n", 1);
    let m = write(dir.path(), "m.yaml", &two);
    clean_error(
        &run(&["plan", &m]),
        &["stations", "'NORDKAM' and 'Nordkam'"],
    );
    // A list of satellites given by --set has no lines in the file: its items' errors name the
    // argument, not the line of the file's own first satellite's key (it said `:11: priority`).
    let set = "satellites=[{name: X, elements: kestrel.tle, select: KESTREL-B, priority: 0}]";
    let o = run(&["plan", FLEET, "--set", set]);
    clean_error(&o, &[&format!("--set {set}: satellites[0] (X): priority")]);
    assert!(!String::from_utf8_lossy(&o.stderr).contains(":11:"));
}

#[test]
fn a_fleet_needs_a_satellite_for_single_satellite_commands() {
    clean_error(
        &run(&["mask", FLEET]),
        &["4 satellites", "--satellite NAME"],
    );
    let doc = json(&run(&[
        "plan",
        FLEET,
        "--satellite",
        "kestrel-c",
        "--days",
        "1",
        "--format",
        "json",
        "--quiet",
    ]));
    assert_eq!(doc["satellite"], "KESTREL-C");
    assert!(doc["passes"]
        .as_array()
        .unwrap()
        .iter()
        .all(|p| p["satellite"] == "KESTREL-C"));
    clean_error(
        &run(&["plan", FLEET, "--satellite", "kestrel-x", "--days", "1"]),
        &["--satellite kestrel-x", "not a satellite of the mission"],
    );
}

/// `budget`, `passes` and `track` concern one satellite too: on a fleet mission they need
/// `--satellite` (they used to take the first satellite without a word), and with it they use that
/// satellite's orbit and transmitter. KESTREL-D's own transmitter (1 W, 1 dB line loss, a fixed
/// 3 dBi patch, examples/fleet/kestrel-fleet.yaml) gives EIRP = 10 log10(1 W) - 1 + 3 = 2.00 dBW
/// by hand, where the shared transmitter (2 W) would give more.
#[test]
fn budget_passes_and_track_name_the_fleets_satellite() {
    let budget = [
        "budget",
        FLEET,
        "--station",
        "nordkam",
        "--elevation-deg",
        "10",
    ];
    for cmd in [
        budget.to_vec(),
        vec!["passes", FLEET, "--days", "1"],
        vec!["track", FLEET, "--station", "nordkam", "--days", "0.01"],
    ] {
        clean_error(&run(&cmd), &["4 satellites", "--satellite NAME"]);
    }
    let b = json(&run(&[
        &budget[..],
        &["--satellite", "kestrel-d", "--format", "json"],
    ]
    .concat()));
    assert_eq!(b["satellite"], "KESTREL-D");
    assert!(
        (b["eirp_dbw"].as_f64().unwrap() - 2.0).abs() < 0.005,
        "{}",
        b["eirp_dbw"]
    );
    let p = json(&run(&[
        "passes",
        FLEET,
        "--days",
        "1",
        "--satellite",
        "KESTREL-D",
        "--format",
        "json",
    ]));
    let passes = p["passes"].as_array().unwrap();
    assert!(!passes.is_empty());
    assert!(passes.iter().all(|x| x["satellite"] == "KESTREL-D"), "{p}");
    clean_error(
        &run(&[
            "track",
            FLEET,
            "--station",
            "nordkam",
            "--satellite",
            "kestrel-x",
        ]),
        &["--satellite kestrel-x", "not a satellite of the mission"],
    );
    clean_error(
        &run(&[
            "budget",
            SINGLE,
            "--station",
            "nordkam",
            "--elevation-deg",
            "10",
            "--satellite",
            "WRENLET-2",
        ]),
        &["the mission's one satellite is WRENLET-1 (99901)"],
    );
}

/// On a mission of one satellite, `--satellite` must name it (the element set's name, any case,
/// or its catalog number): a mistyped name is an error, not the one satellite's plan.
#[test]
fn a_single_satellite_mission_checks_the_satellite_named() {
    let example = SINGLE;
    for name in ["WRENLET-1", "wrenlet-1", "99901"] {
        let doc = json(&run(&[
            "plan",
            example,
            "--satellite",
            name,
            "--days",
            "1",
            "--format",
            "json",
            "--quiet",
        ]));
        assert_eq!(doc["satellite"], "WRENLET-1", "{name}");
    }
    clean_error(
        &run(&["plan", example, "--satellite", "WRENLET-2", "--days", "1"]),
        &[
            "--satellite WRENLET-2",
            "the mission's one satellite is WRENLET-1 (99901)",
        ],
    );
}

/// A satellite that gets no contact, and a store that overflows, are results: the run succeeds,
/// every satellite is listed with no delivery, and the loss is what the store could not hold
/// (generated + initial fill - capacity, nothing delivered).
#[test]
fn no_contact_and_a_full_store_are_results_not_errors() {
    let dir = tempfile::tempdir().unwrap();
    let root = crate::common::bin::root();
    for f in ["kestrel.tle", "kestrel-c-imaging.csv"] {
        std::fs::copy(root.join("examples/fleet").join(f), dir.path().join(f)).unwrap();
    }
    let fleet = std::fs::read_to_string(root.join(FLEET))
        .unwrap()
        .replace(
            "../../stations",
            &root.join("stations").display().to_string(),
        )
        .replace("min_peak_elevation_deg: 10", "min_peak_elevation_deg: 90");
    // Keep Pulau Reka alone, where no pass peaks at 90 deg.
    let keep: String = fleet
        .lines()
        .filter(|l| !l.contains("stations/") || l.contains("pulau-reka"))
        .filter(|l| !l.contains("station: Sierra Baja"))
        .filter(|l| !l.contains("blocked:") && !l.contains("{ start:"))
        .map(|l| format!("{l}\n"))
        .collect();
    let m = write(dir.path(), "m.yaml", &keep);
    let doc = json(&run(&[
        "plan", &m, "--format", "json", "--quiet", "--days", "2",
    ]));
    assert_eq!(doc["contacts"].as_array().unwrap().len(), 0);
    for s in doc["satellites"].as_array().unwrap() {
        assert_eq!(num(&s["delivered_bits"]), 0.0, "{s}");
        assert_eq!(s["max_latency_s"], Value::Null, "{s}");
    }
    let d = doc["satellites"]
        .as_array()
        .unwrap()
        .iter()
        .find(|s| s["name"] == "KESTREL-D")
        .unwrap();
    // 6 Mbit/s for 2 days = 1.0368e12 bit into a 2.56e11 bit store, empty at the start.
    assert!(
        (num(&d["lost_bits"]) - (1.0368e12 - 2.56e11)).abs() < 1e3,
        "{d}"
    );
    assert_eq!(num(&d["final_fill_bits"]), 2.56e11);
}

/// A fleet's satellites share the station tables prepared for the first satellite on the same
/// frequency; every satellite's plan is the same as when it is planned on its own.
#[test]
fn shared_station_tables_change_no_satellite_plan() {
    use passbudget::config::mission::Mission;
    use passbudget::plan::fleet::FleetPlanner;
    use passbudget::plan::{PlanRequest, Planner, WindowRequest};
    let mission = Mission::load(&crate::common::bin::root().join(FLEET)).unwrap();
    let request = PlanRequest {
        window: WindowRequest {
            days: Some(1.0),
            ..Default::default()
        },
        exceedance_percent: Some(1.0),
        ..Default::default()
    };
    let fleet = FleetPlanner::new(&mission, &request).unwrap();
    let (plans, _) = fleet.run().unwrap();
    for (i, plan) in plans.iter().enumerate() {
        let alone = Planner::new(&mission.for_satellite(i), &request)
            .unwrap()
            .collect()
            .unwrap();
        assert_eq!(plan.totals, alone.totals, "satellite {i}");
    }
}

/// A fleet's warnings carry each satellite's adaptive note (prefixed with its name), naming the
/// passes of that satellite where a fixed rate closes and the adaptive mode delivers nothing
/// (the shipped fleet given an adaptive block of DVB-S2 QPSK at 60 Mbaud).
#[test]
fn a_fleet_passes_on_each_satellites_adaptive_note() {
    let doc = json(&run(&[
        "plan",
        "examples/fleet/kestrel-fleet.yaml",
        "--days",
        "2",
        "--set",
        "modem.adaptive={symbol_rate_baud: 60.0e6, schemes: [dvbs2-qpsk-1/4, dvbs2-qpsk-1/2]}",
        "--format",
        "json",
    ]));
    let warnings: Vec<&str> = doc["warnings"]
        .as_array()
        .unwrap()
        .iter()
        .filter_map(|w| w.as_str())
        .collect();
    let mut satellites_with_note = 0;
    for sat in ["KESTREL-A", "KESTREL-B", "KESTREL-C", "KESTREL-D"] {
        let shut: Vec<String> = doc["passes"]
            .as_array()
            .unwrap()
            .iter()
            .filter(|p| p["satellite"] == sat)
            .filter(|p| num(&p["volume_bits"]) > 0.0 && num(&p["adaptive_volume_bits"]) == 0.0)
            .map(|p| p["number"].to_string())
            .collect();
        let note = warnings
            .iter()
            .find(|w| w.starts_with(&format!("{sat}: adaptive: 0 bits in")));
        match (shut.as_slice(), note) {
            ([], None) => {}
            ([one], Some(n)) => assert!(n.contains(&format!(" pass {one} at ")), "{n}"),
            ([rest @ .., last], Some(n)) => {
                let listed = format!(" passes {} and {last} at ", rest.join(", "));
                assert!(shut.len() > 5 || n.contains(&listed), "{listed}: {n}");
            }
            (s, n) => panic!("{sat}: passes {s:?}, note {n:?}"),
        }
        satellites_with_note += usize::from(note.is_some());
    }
    assert!(satellites_with_note >= 2, "{warnings:#?}");
}

/// A window that starts inside the imaging plan (examples/fleet/kestrel-c-imaging.csv) follows
/// the strips from its start: the run used to stop ("generation[0].start_s: ... is negative").
/// From 13:35 for 12 h: the strip of 13:30-13:40 counts from 13:35 (300 s), those of 17:15,
/// 21:00 and 01:00 whole (600 s each), the one of 04:45 not; at 300 Mbit/s that is
/// 2,100 s x 3e8 = 6.3e11 bits (by hand from the file). Also a window after the last strip.
#[test]
fn imaging_before_the_window_start_is_cut_at_it() {
    // KESTREL-C's generated bits over half a day from `start`
    let generated = |start: &str| -> f64 {
        let doc = json(&run(&[
            "plan", FLEET, "--start", start, "--days", "0.5", "--format", "json", "--quiet",
        ]));
        let sats = doc["satellites"].as_array().unwrap().clone();
        let c = sats.iter().find(|s| s["name"] == "KESTREL-C").unwrap();
        num(&c["generated_bits"])
    };
    assert_eq!(generated("2026-12-01T13:35:00Z"), 6.3e11);
    assert_eq!(generated("2026-12-10T12:00:00Z"), 0.0);
}

/// A contact gives its highest elevation (contacts.csv, the JSON, the table, the calendars):
/// the calendar's "elevation 6.5 to 6.4 deg" read as the contact's range of elevation, where the
/// satellite rose to 8.9 deg in between. Checked against `track` at 1 s over the contact (its
/// points include the contact's two ends), for a contact that spans the pass's highest point
/// and for one cut before it, on the shipped fleet.
///
/// Basis: a behaviour check against the program's own direct look angles (`track`, checked
/// against Skyfield in `geometry_skyfield.rs`); no published reference applies.
#[test]
fn a_contact_gives_its_highest_elevation() {
    let doc = json(&run(&["plan", FLEET, "--format", "json", "--quiet"]));
    let contacts = doc["contacts"].as_array().unwrap();
    let el = |c: &Value, k: &str| num(&c[format!("{k}_elevation_deg").as_str()]);
    let spans_peak = contacts
        .iter()
        .find(|c| el(c, "max") > el(c, "start").max(el(c, "end")) + 1.0)
        .expect("a contact over its pass's highest point");
    let before_peak = contacts
        .iter()
        .find(|c| {
            c["shortened"] == true
                && el(c, "end") > el(c, "start") + 1.0
                && el(c, "max") == el(c, "end")
        })
        .expect("a contact cut while the satellite still rises");
    for c in [spans_peak, before_peak] {
        let track = json(&run(&[
            "track",
            FLEET,
            "--satellite",
            c["satellite"].as_str().unwrap(),
            "--station",
            c["station"].as_str().unwrap(),
            "--start",
            c["start"].as_str().unwrap(),
            "--end",
            c["end"].as_str().unwrap(),
            "--step-s",
            "1",
            "--format",
            "json",
            "--quiet",
        ]));
        let points = track["track"].as_array().unwrap();
        assert_eq!(
            points.last().unwrap()["time"],
            c["end"],
            "the end is a point"
        );
        let highest = points
            .iter()
            .map(|p| num(&p["elevation_deg"]))
            .fold(f64::NEG_INFINITY, f64::max);
        // 0.005 deg: the contact's rounding to 2 decimals; a 1 s grid misses a pass's peak by
        // far less (the elevation rate is zero there).
        assert!(
            (el(c, "max") - highest).abs() <= 0.006,
            "{c}: track's highest {highest}"
        );
        for end in ["start", "end"] {
            assert!(el(c, "max") >= el(c, end), "{c}");
        }
    }
    // The calendar says it in words.
    let dir = tempfile::tempdir().unwrap();
    success(&run(&[
        "plan",
        SINGLE,
        "--days",
        "1",
        "--quiet",
        "--out",
        dir.path().to_str().unwrap(),
    ]));
    let ics = std::fs::read_to_string(dir.path().join("calendar-nordkam.ics")).unwrap();
    let unfolded = ics.replace("\r\n ", "");
    assert!(
        unfolded.contains("deg at the start\\, ") && unfolded.contains(" deg at the highest\\, "),
        "{unfolded}"
    );
}
