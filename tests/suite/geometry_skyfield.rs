//! Look angles and passes of the invented WRENLET-1 (examples/sat.tle) over an invented station
//! against Skyfield 1.55 + python-sgp4 2.27, computed once by tests/data/orbit/make_reference.py
//! (UT1 = UTC, no polar motion, WGS-72 SGP4; calls recorded in the JSON file).

use crate::common::tolerance::{
    ELEVATION_RATE_DEG_S, LOOK_ANGLE_DEG, MAX_ELEVATION_DEG, PASS_TIME_S, RANGE_KM, RANGE_RATE_KM_S,
};
use passbudget::geometry::{find_passes, HorizonMask, Observer};
use passbudget::orbit::{load_elements, Propagator};
use passbudget::timefmt::{add_seconds, seconds_between, utc};
use serde_json::Value;
use std::path::Path;

fn reference() -> Value {
    let text = std::fs::read_to_string("tests/data/orbit/skyfield_reference.json").unwrap();
    serde_json::from_str(&text).unwrap()
}

fn setup(r: &Value) -> (Propagator, Observer) {
    let sets = load_elements(Path::new("examples/sat.tle")).unwrap();
    assert_eq!(
        r["tle"][1].as_str().unwrap(),
        std::fs::read_to_string("examples/sat.tle")
            .unwrap()
            .lines()
            .nth(1)
            .unwrap()
    );
    let st = &r["station"];
    let obs = Observer::new(
        st["latitude_deg"].as_f64().unwrap(),
        st["longitude_deg"].as_f64().unwrap(),
        st["altitude_m"].as_f64().unwrap(),
    )
    .unwrap();
    (Propagator::new(&sets[0]).unwrap(), obs)
}

fn angle_diff(a: f64, b: f64) -> f64 {
    let d = (a - b).rem_euclid(360.0);
    d.min(360.0 - d)
}

#[test]
fn look_angles_match_skyfield() {
    let r = reference();
    let (prop, obs) = setup(&r);
    let origin = utc(2026, 12, 1, 12, 0, 0);
    let looks = r["looks"].as_array().unwrap();
    assert!(looks.len() > 100);
    let (mut wa, mut we, mut wr, mut wrr) = (0f64, 0f64, 0f64, 0f64);
    let (mut wn, mut wer) = (0f64, 0f64);
    for l in looks {
        let t = add_seconds(&origin, l["seconds_from_2026_12_01T12"].as_f64().unwrap());
        let look = obs.look(&prop.ecef_at(&t).unwrap());
        let el = l["elevation_deg"].as_f64().unwrap();
        let de = (look.elevation_deg - el).abs();
        // Azimuth differences shrink in true angle by cos(el); compare on the sky.
        let da = angle_diff(look.azimuth_deg, l["azimuth_deg"].as_f64().unwrap())
            * el.to_radians().cos();
        let dr = (look.range_km - l["range_km"].as_f64().unwrap()).abs();
        let drr = (look.range_rate_km_s - l["range_rate_km_s"].as_f64().unwrap()).abs();
        let dn = (look.off_nadir_deg - l["off_nadir_deg"].as_f64().unwrap()).abs();
        let der = (look.elevation_rate_deg_s - l["elevation_rate_deg_s"].as_f64().unwrap()).abs();
        assert!(
            dn < LOOK_ANGLE_DEG,
            "off-nadir at {t}: {} vs {} (Skyfield ITRS vectors)",
            look.off_nadir_deg,
            l["off_nadir_deg"]
        );
        assert!(
            der < ELEVATION_RATE_DEG_S,
            "elevation rate at {t}: {} vs {} (Skyfield)",
            look.elevation_rate_deg_s,
            l["elevation_rate_deg_s"]
        );
        wn = wn.max(dn);
        wer = wer.max(der);
        wa = wa.max(da);
        we = we.max(de);
        wr = wr.max(dr);
        wrr = wrr.max(drr);
        assert!(
            de < LOOK_ANGLE_DEG,
            "elevation at {t}: {} vs {el} (Skyfield)",
            look.elevation_deg
        );
        assert!(
            da < LOOK_ANGLE_DEG,
            "azimuth at {t}: {} vs {} (Skyfield)",
            look.azimuth_deg,
            l["azimuth_deg"]
        );
        assert!(
            dr < RANGE_KM,
            "range at {t}: {} vs {} (Skyfield)",
            look.range_km,
            l["range_km"]
        );
        assert!(
            drr < RANGE_RATE_KM_S,
            "range rate at {t}: {} vs {} (Skyfield)",
            look.range_rate_km_s,
            l["range_rate_km_s"]
        );
    }
    eprintln!("worst: az {wa:e} deg, el {we:e} deg, range {wr:e} km, range rate {wrr:e} km/s, off-nadir {wn:e} deg, el rate {wer:e} deg/s");
}

#[test]
fn passes_match_skyfield() {
    let r = reference();
    let (prop, obs) = setup(&r);
    let origin = utc(2026, 12, 1, 12, 0, 0);
    let end = add_seconds(&origin, r["span_s"].as_f64().unwrap());
    let mask = HorizonMask::flat(0.0).unwrap();
    let found = find_passes(&prop, &obs, &mask, origin, end);
    assert!(found.stopped.is_none());
    let expected = r["passes"].as_array().unwrap();
    // Skyfield's find_events lists passes with a culmination inside the window.
    let ours: Vec<_> = found
        .passes
        .iter()
        .filter(|p| !p.starts_before_window && !p.ends_after_window)
        .collect();
    assert_eq!(ours.len(), expected.len(), "{:#?}", found.passes);
    let mut worst_t: f64 = 0.0;
    let mut worst_el: f64 = 0.0;
    for (p, e) in ours.iter().zip(expected) {
        for (ours_t, key) in [(p.aos, "aos_s"), (p.tca, "tca_s"), (p.los, "los_s")] {
            let d = (seconds_between(&origin, &ours_t) - e[key].as_f64().unwrap()).abs();
            worst_t = worst_t.max(d);
            assert!(
                d < PASS_TIME_S,
                "{key}: ours {ours_t}, Skyfield {} s from origin",
                e[key]
            );
        }
        let de = (p.max_elevation_deg - e["max_elevation_deg"].as_f64().unwrap()).abs();
        worst_el = worst_el.max(de);
        assert!(
            de < MAX_ELEVATION_DEG,
            "max elevation {} vs {}",
            p.max_elevation_deg,
            e["max_elevation_deg"]
        );
    }
    eprintln!("worst pass time {worst_t:.4} s, max elevation {worst_el:e} deg; {} propagations for 2 days", found.propagations);
}
