//! Pass search: propagation budget, completeness against a brute-force 1 s scan, window
//! edges, never-setting / never-rising satellites, stop on propagation error, invariants.
//! The brute-force scan is an independent check of the search (same geometry, no skipping).

use crate::common::tolerance::SCAN_TIME_S;
use passbudget::geometry::passes::GUARANTEED_PASS_S;
use passbudget::geometry::{find_passes, track, HorizonMask, Observer, Pass};
use passbudget::orbit::{load_elements, parse_elements, Propagator};
use passbudget::timefmt::{add_seconds, seconds_between, utc};
use proptest::prelude::*;
use std::path::Path;

fn wrenlet() -> Propagator {
    let sets = load_elements(Path::new("examples/sat.tle")).unwrap();
    Propagator::new(&sets[0]).unwrap()
}

/// Invented station, mid-latitude (45.5 N, 120.3 W, 600 m; not a real ground station).
fn station() -> Observer {
    Observer::new(45.5, -120.3, 600.0).unwrap()
}

/// Intervals above the mask from a 1 s scan: (start s, end s) with crossings interpolated.
fn scan(prop: &Propagator, obs: &Observer, mask: &HorizonMask, days: f64) -> Vec<(f64, f64)> {
    let t0 = utc(2026, 12, 1, 12, 0, 0);
    let n = (days * 86400.0) as usize;
    let g = |i: usize| {
        let l = obs.look(&prop.ecef_at(&add_seconds(&t0, i as f64)).unwrap());
        l.elevation_deg - mask.limit_deg(l.azimuth_deg)
    };
    let mut out = Vec::new();
    let mut prev = g(0);
    let mut start = if prev > 0.0 { Some(0.0) } else { None };
    for i in 1..=n {
        let cur = g(i);
        let x = (i - 1) as f64 + prev / (prev - cur);
        if prev <= 0.0 && cur > 0.0 {
            start = Some(x);
        } else if prev > 0.0 && cur <= 0.0 {
            if let Some(s) = start.take() {
                out.push((s, x));
            }
        }
        prev = cur;
    }
    if let Some(s) = start {
        out.push((s, n as f64));
    }
    out
}

fn check_against_scan(mask: HorizonMask, days: f64) -> usize {
    check_scan_for(&wrenlet(), &station(), mask, days)
}

fn check_scan_for(prop: &Propagator, obs: &Observer, mask: HorizonMask, days: f64) -> usize {
    let (prop, obs) = (prop, obs);
    let t0 = utc(2026, 12, 1, 12, 0, 0);
    let found = find_passes(prop, obs, &mask, t0, add_seconds(&t0, days * 86400.0));
    assert!(found.stopped.is_none());
    let brute = scan(prop, obs, &mask, days);
    for (a, b) in &brute {
        if b - a < GUARANTEED_PASS_S {
            continue;
        }
        let hit = found.passes.iter().find(|p| {
            (seconds_between(&t0, &p.aos) - a).abs() < SCAN_TIME_S
                && (seconds_between(&t0, &p.los) - b).abs() < SCAN_TIME_S
        });
        assert!(
            hit.is_some(),
            "scan pass {a:.1}..{b:.1} s not found; found {:#?}",
            found.passes
        );
    }
    // Nothing invented: every pass found is in the scan.
    for p in &found.passes {
        let a = seconds_between(&t0, &p.aos);
        assert!(
            brute.iter().any(|(s, _)| (s - a).abs() < SCAN_TIME_S),
            "extra pass {p:?}"
        );
    }
    brute
        .iter()
        .filter(|(a, b)| b - a >= GUARANTEED_PASS_S)
        .count()
}

#[test]
fn no_pass_missed_flat_mask() {
    assert!(check_against_scan(HorizonMask::flat(0.0).unwrap(), 2.0) >= 8);
}

#[test]
fn no_pass_missed_with_terrain_mask() {
    // Invented terrain: a ridge to the north-east and a low southern horizon.
    let mask = HorizonMask::new(
        5.0,
        vec![
            [20.0, 8.0],
            [60.0, 25.0],
            [100.0, 6.0],
            [200.0, 3.0],
            [300.0, 12.0],
        ],
    )
    .unwrap();
    assert!(check_against_scan(mask, 2.0) >= 4);
}

// Invented high orbits: a 12 h Molniya-type (e = 0.72) and a 12 h near-circular one.
const HIGH_TLE: &str = "\
MOLNIYA-DEMO
1 99904U          26335.50000000  .00000000  00000-0  00000-0 0    10
2 99904  63.4000  40.0000 7200000 270.0000  10.0000  2.00613000    10
MEO-DEMO
1 99905U          26335.50000000  .00000000  00000-0  00000-0 0    10
2 99905  55.0000 120.0000 0050000  30.0000  60.0000  2.00560000    10
";

#[test]
fn no_pass_missed_deep_space() {
    let sets = parse_elements(&fix_checksums(HIGH_TLE)).unwrap();
    let obs = Observer::new(55.0, 37.0, 200.0).unwrap();
    for set in &sets {
        let prop = Propagator::new(set).unwrap();
        let n = check_scan_for(&prop, &obs, HorizonMask::flat(10.0).unwrap(), 1.5);
        assert!(n >= 1, "{}", set.label());
    }
}

#[test]
fn propagation_budget_leo_seven_days() {
    // Issue target: at most 300 SGP4 evaluations per LEO satellite-day.
    let prop = wrenlet();
    let t0 = utc(2026, 12, 1, 12, 0, 0);
    for (mask, lat) in [
        (HorizonMask::flat(0.0).unwrap(), 45.5),
        (HorizonMask::flat(10.0).unwrap(), 35.25),
    ] {
        let obs = Observer::new(lat, -120.3, 600.0).unwrap();
        let found = find_passes(&prop, &obs, &mask, t0, add_seconds(&t0, 7.0 * 86400.0));
        let per_day = found.propagations as f64 / 7.0;
        eprintln!(
            "{} passes, {per_day:.0} propagations per day",
            found.passes.len()
        );
        assert!(found.passes.len() >= 14);
        assert!(per_day <= 300.0, "{per_day} propagations per satellite-day");
    }
}

/// Propagations per satellite-day of the pass search over the grid of the issue: stations at
/// 0, 45 and 61 deg latitude, flat masks of 0, 5 and 10 deg, 7 days, for WRENLET-1 and three
/// invented LEO variants (400 km at 51.6 deg, 800 km sun-synchronous, 1200 km at 65 deg).
/// Returns (average over all, average for WRENLET-1).
fn grid_propagations_per_day() -> (f64, f64) {
    let t0 = utc(2026, 12, 1, 12, 0, 0);
    let days = 7.0;
    let base = load_elements(Path::new("examples/sat.tle"))
        .unwrap()
        .remove(0);
    // (mean motion rev/day, inclination deg, RAAN deg)
    let orbits = [
        (
            base.elements.mean_motion,
            base.elements.inclination,
            base.elements.right_ascension,
        ),
        (15.50, 51.6, 30.0),
        (14.28, 98.6, 150.0),
        (13.30, 65.0, 270.0),
    ];
    let (mut all, mut first, mut n) = (0.0, 0.0, 0.0);
    for (k, (mm, incl, raan)) in orbits.into_iter().enumerate() {
        let mut set = base.clone();
        set.elements.mean_motion = mm;
        set.elements.inclination = incl;
        set.elements.right_ascension = raan;
        let prop = Propagator::new(&set).unwrap();
        for lat in [0.0, 45.0, 61.0] {
            let obs = Observer::new(lat, 10.0, 100.0).unwrap();
            for mask_deg in [0.0, 5.0, 10.0] {
                let mask = HorizonMask::flat(mask_deg).unwrap();
                let found = find_passes(&prop, &obs, &mask, t0, add_seconds(&t0, days * 86400.0));
                assert!(found.stopped.is_none());
                assert!(!found.passes.is_empty(), "{mm} rev/day over {lat} deg");
                let per_day = found.propagations as f64 / days;
                eprintln!(
                    "orbit {k} ({mm} rev/day, {incl} deg), station {lat} deg, mask {mask_deg} deg: {} passes, {per_day:.0} propagations per day",
                    found.passes.len()
                );
                all += per_day;
                n += 1.0;
                if k == 0 {
                    first += per_day / 9.0;
                }
            }
        }
    }
    (all / n, first)
}

#[test]
fn propagation_budget_over_the_station_and_mask_grid() {
    let (average, wrenlet) = grid_propagations_per_day();
    eprintln!("average {average:.1} propagations per satellite-day (WRENLET-1 alone {wrenlet:.1})");
    // Target of the pass-search issue: <= 150 per LEO satellite-day averaged over the grid.
    assert!(average <= 150.0, "{average}");
    assert!(wrenlet <= 150.0, "{wrenlet}");
}

#[test]
fn window_edges_are_flagged() {
    let prop = wrenlet();
    let obs = station();
    let mask = HorizonMask::flat(0.0).unwrap();
    let t0 = utc(2026, 12, 1, 12, 0, 0);
    let all = find_passes(&prop, &obs, &mask, t0, add_seconds(&t0, 86400.0)).passes;
    let p = &all[1];
    let mid = add_seconds(&p.aos, 0.5 * p.duration_s());
    // Window starting inside the pass and ending inside the next one.
    let q = &all[2];
    let end = add_seconds(&q.aos, 30.0);
    let cut = find_passes(&prop, &obs, &mask, mid, end).passes;
    assert_eq!(cut.len(), 2);
    assert!(cut[0].starts_before_window && cut[0].aos == mid && !cut[0].ends_after_window);
    assert!((seconds_between(&cut[0].los, &p.los)).abs() < 0.1);
    assert!(cut[1].ends_after_window && cut[1].los == end && !cut[1].starts_before_window);
}

// Invented geostationary satellite at 240 E-ish and an invented polar-orbit-blind station.
const GEO_TLE: &str = "\
GEO-DEMO
1 99902U          26335.50000000  .00000000  00000-0  00000-0 0    10
2 99902   0.0500 100.0000 0001000   0.0000 140.0000  1.00270000    10
";

fn fix_checksums(text: &str) -> String {
    text.lines()
        .map(|l| {
            if l.starts_with("1 ") || l.starts_with("2 ") {
                passbudget::orbit::tle::with_checksum(&l[..68]).unwrap()
            } else {
                l.to_string()
            }
        })
        .collect::<Vec<_>>()
        .join("\n")
}

#[test]
fn never_setting_and_never_rising() {
    let sets = parse_elements(&fix_checksums(GEO_TLE)).unwrap();
    let prop = Propagator::new(&sets[0]).unwrap();
    let t0 = utc(2026, 12, 1, 12, 0, 0);
    let end = add_seconds(&t0, 86400.0);
    let mask = HorizonMask::flat(5.0).unwrap();
    // Sub-satellite longitude: find it, then put one station under it and one opposite.
    let s = prop.ecef_at(&t0).unwrap();
    let lon = s.position_km[1].atan2(s.position_km[0]).to_degrees();
    let under = Observer::new(10.0, lon, 0.0).unwrap();
    let r = find_passes(&prop, &under, &mask, t0, end);
    assert_eq!(r.passes.len(), 1, "{:?}", r.passes);
    let p: &Pass = &r.passes[0];
    assert!(p.starts_before_window && p.ends_after_window && p.aos == t0 && p.los == end);
    assert!(p.max_elevation_deg > 70.0);
    let opposite = Observer::new(-10.0, lon + 180.0, 0.0).unwrap();
    let r = find_passes(&prop, &opposite, &mask, t0, end);
    assert!(r.passes.is_empty() && r.stopped.is_none());
    assert!(r.propagations < 500, "{}", r.propagations);
}

// Invented very-low satellite with high drag: SGP4 fails within days.
const DECAY_TLE: &str = "\
SINKER-DEMO
1 99903U          26335.50000000  .00500000  00000-0  50000-2 0    10
2 99903  51.6000  10.0000 0005000   0.0000   0.0000 16.30000000    10
";

#[test]
fn propagation_error_stops_search_and_keeps_passes() {
    let sets = parse_elements(&fix_checksums(DECAY_TLE)).unwrap();
    let prop = Propagator::new(&sets[0]).unwrap();
    let t0 = utc(2026, 12, 1, 12, 0, 0);
    let obs = Observer::new(40.0, 20.0, 0.0).unwrap();
    let r = find_passes(
        &prop,
        &obs,
        &HorizonMask::flat(0.0).unwrap(),
        t0,
        add_seconds(&t0, 60.0 * 86400.0),
    );
    let err = r.stopped.expect("the orbit decays within 60 days");
    let minutes = err.minutes().unwrap();
    eprintln!(
        "stopped after {minutes:.0} min with {} passes: {err}",
        r.passes.len()
    );
    assert!(minutes > 0.0 && minutes < 60.0 * 1440.0);
    assert!(!r.passes.is_empty());
    for p in &r.passes {
        assert!(prop.minutes_since_epoch(&p.los) <= minutes);
    }
}

#[test]
fn track_steps_and_ends_on_end() {
    let prop = wrenlet();
    let obs = station();
    let t0 = utc(2026, 12, 1, 12, 0, 0);
    let pts: Vec<_> = track(&prop, &obs, t0, add_seconds(&t0, 100.0), 30.0)
        .map(|r| r.unwrap())
        .collect();
    assert_eq!(pts.len(), 5);
    assert_eq!(pts[4].0, add_seconds(&t0, 100.0));
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 12, .. ProptestConfig::default() })]

    #[test]
    fn pass_invariants(lat in -80.0f64..80.0, lon in -180.0f64..180.0, min_el in 0.0f64..15.0, offset_h in 0.0f64..48.0) {
        let prop = wrenlet();
        let obs = Observer::new(lat, lon, 100.0).unwrap();
        let mask = HorizonMask::flat(min_el).unwrap();
        let t0 = add_seconds(&utc(2026, 12, 1, 12, 0, 0), offset_h * 3600.0);
        let r = find_passes(&prop, &obs, &mask, t0, add_seconds(&t0, 86400.0));
        prop_assert!(r.stopped.is_none());
        for w in r.passes.windows(2) {
            prop_assert!(w[0].los < w[1].aos, "sorted, not overlapping");
        }
        for p in &r.passes {
            prop_assert!(p.aos <= p.tca && p.tca <= p.los);
            if !p.starts_before_window && !p.ends_after_window {
                prop_assert!(p.aos < p.tca && p.tca < p.los);
            }
            prop_assert!(p.max_elevation_deg >= min_el - 1e-6);
            prop_assert!(p.max_elevation_deg <= 90.0 && p.min_range_km > 0.0);
        }
        for item in track(&prop, &obs, t0, add_seconds(&t0, 6000.0), 600.0) {
            let (_, l) = item.unwrap();
            prop_assert!((-90.0..=90.0).contains(&l.elevation_deg) && l.range_km > 0.0);
            prop_assert!((0.0..360.0).contains(&l.azimuth_deg));
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 8, .. ProptestConfig::default() })]

    /// Varied invented LEO orbits (400-1500 km, e < 0.045, any inclination) over random
    /// stations: every pass of >= 20 s in a 1 s scan is found.
    #[test]
    fn no_pass_missed_varied_leo(
        lat in -85.0f64..85.0, lon in -180.0f64..180.0, min_el in 0.0f64..10.0,
        mean_motion in 12.5f64..15.6, ecc in 0.0f64..0.045, incl in 20.0f64..110.0, raan in 0.0f64..360.0,
    ) {
        let mut set = load_elements(Path::new("examples/sat.tle")).unwrap().remove(0);
        set.elements.mean_motion = mean_motion;
        set.elements.eccentricity = ecc;
        set.elements.inclination = incl;
        set.elements.right_ascension = raan;
        // Perigee above ~250 km.
        let a = (398_600.8f64 / (mean_motion * std::f64::consts::TAU / 86400.0).powi(2)).cbrt();
        prop_assume!(a * (1.0 - ecc) > 6378.0 + 250.0);
        let prop = Propagator::new(&set).unwrap();
        let obs = Observer::new(lat, lon, 0.0).unwrap();
        check_scan_for(&prop, &obs, HorizonMask::flat(min_el).unwrap(), 1.0);
    }
}
