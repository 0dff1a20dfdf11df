//! Replays the seed corpora of the cargo-fuzz targets (`fuzz/corpus/tle`, `omm_json`,
//! `omm_kvn`, `station`, `mission`, `plan`) through the same library entry points the targets
//! call (`passbudget::{orbit, config, plan}::fuzz_entry`), on the stable toolchain: a panic fails
//! the test. Each seed is also replayed cut short and with single bytes replaced (deterministic
//! mutations), which reaches many error paths of the readers.

use std::path::{Path, PathBuf};

use passbudget::config::mission::Mission;
use passbudget::config::station::Station;
use passbudget::orbit::{fuzz_entry, omm, tle, Propagator};
use passbudget::{config, plan};

fn corpus(target: &str) -> Vec<(PathBuf, Vec<u8>)> {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("fuzz/corpus")
        .join(target);
    let mut files: Vec<(PathBuf, Vec<u8>)> = std::fs::read_dir(&dir)
        .unwrap_or_else(|e| panic!("{}: {e}", dir.display()))
        .map(|e| e.unwrap().path())
        .filter(|p| p.is_file())
        .map(|p| {
            let bytes = std::fs::read(&p).unwrap();
            (p, bytes)
        })
        .collect();
    files.sort();
    assert!(files.len() >= 5, "{}: too few seeds", dir.display());
    files
}

/// The seed, then cut at every 5th byte, then with bytes replaced at every 3rd.
fn replay(target: &str, entry: fn(&[u8])) -> usize {
    replay_strided(target, entry, 5, 3)
}

/// The seed, then cut at every `cut_stride`th byte, then with bytes replaced at every
/// `replace_stride`th.
fn replay_strided(
    target: &str,
    entry: fn(&[u8]),
    cut_stride: usize,
    replace_stride: usize,
) -> usize {
    let mut runs = 0;
    for (_, seed) in corpus(target) {
        entry(&seed);
        runs += 1;
        for cut in (0..seed.len()).step_by(cut_stride) {
            entry(&seed[..cut]);
            runs += 1;
        }
        for pos in (0..seed.len()).step_by(replace_stride) {
            for b in [b'0', b'9', b'-', b' ', b'.', b'\n', b'"', b'=', 0xff] {
                let mut m = seed.clone();
                m[pos] = b;
                entry(&m);
                runs += 1;
            }
        }
    }
    runs
}

#[test]
fn tle_corpus_replays_without_panic() {
    assert!(replay("tle", fuzz_entry::tle) > 100);
}

#[test]
fn omm_json_corpus_replays_without_panic() {
    assert!(replay("omm_json", fuzz_entry::omm_json) > 100);
}

#[test]
fn omm_kvn_corpus_replays_without_panic() {
    assert!(replay("omm_kvn", fuzz_entry::omm_kvn) > 100);
}

#[test]
fn station_corpus_replays_without_panic() {
    assert!(replay("station", config::fuzz_entry::station) > 100);
}

/// A mission validation reads three station files: a coarser stride keeps the test short.
#[test]
fn mission_corpus_replays_without_panic() {
    assert!(replay_strided("mission", config::fuzz_entry::mission, 23, 17) > 100);
}

/// A plan costs milliseconds, not microseconds: each seed is cut at a few places and a few of
/// its bytes replaced, as many as make the whole replay a few seconds in release.
#[test]
fn plan_corpus_replays_without_panic() {
    assert!(replay_strided("plan", plan::fuzz_entry::plan, 401, 397) > 100);
}

fn seed_text(target: &str, name: &str) -> String {
    let p = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("fuzz/corpus")
        .join(target)
        .join(name);
    std::fs::read_to_string(&p).unwrap_or_else(|e| panic!("{}: {e}", p.display()))
}

/// The station and mission seeds that should validate do, and the broken ones are refused (so
/// the replay reaches both the validation and the error paths).
#[test]
fn config_seeds_validate_or_are_refused() {
    let path = Path::new("seed.yaml");
    for name in [
        "nordkam.yaml",
        "bom.yaml",
        "minimal.yaml",
        "non-latin-name.yaml",
        "anchors-aliases.yaml",
        "tabs-and-crlf.yaml",
    ] {
        Station::from_yaml(path, &seed_text("station", name)).unwrap_or_else(|e| panic!("{e}"));
    }
    for name in [
        "empty.yaml",
        "nan-latitude.yaml",
        "huge-numbers.yaml",
        "duplicate-key.yaml",
        "noise-figure-and-temperature.yaml",
        "wrong-types.yaml",
        "mask-edges.yaml",
    ] {
        assert!(
            Station::from_yaml(path, &seed_text("station", name)).is_err(),
            "{name}"
        );
    }
    let mission_path = config::fuzz_entry::mission_path().unwrap();
    let mission = |name: &str| Mission::from_yaml(&mission_path, &seed_text("mission", name));
    for name in [
        "wrenlet-1.yaml",
        "bom.yaml",
        "omm-json-elements.yaml",
        "omm-kvn-no-modem.yaml",
        "non-latin-name.yaml",
        "minimal.yaml",
        "cos-n-and-fixed.yaml",
    ] {
        mission(name).unwrap_or_else(|e| panic!("{name}: {e}"));
    }
    for name in [
        "empty.yaml",
        "duplicate-key.yaml",
        "nan-frequency.yaml",
        "huge-numbers.yaml",
        "end-before-start.yaml",
        "same-station-twice.yaml",
        "missing-station-file.yaml",
    ] {
        assert!(mission(name).is_err(), "{name}");
    }
}

/// The plan seeds built from the shipped example plan passes (the replay reaches the planner,
/// with TLE, OMM JSON and KVN elements, one to three stations, with and without the rain case),
/// and the broken ones are refused.
#[test]
fn plan_seeds_plan_or_are_refused() {
    for name in [
        "example-one-day.txt",
        "example-with-elements.txt",
        "three-stations-omm-json.txt",
        "one-station-omm-kvn.txt",
        "ka-band-step-5.txt",
        "no-rain-case-mask-0.txt",
        "bom-and-crlf.txt",
        "high-station-low-mask.txt",
        "non-latin-station.txt",
    ] {
        let plan = plan::fuzz_entry::planned(seed_text("plan", name).as_bytes())
            .unwrap_or_else(|| panic!("{name}: no plan"));
        assert!(!plan.passes.is_empty(), "{name}: no passes");
        assert!(plan.window.days() <= plan::fuzz_entry::MAX_DAYS, "{name}");
    }
    // A station part that is refused leaves the mission's own stations (the shipped three).
    let fallback =
        plan::fuzz_entry::planned(seed_text("plan", "non-latin-station-nan.txt").as_bytes());
    assert_eq!(fallback.map(|p| p.station_masks.len()), Some(3));
    for name in ["empty.txt", "empty-parts.txt"] {
        assert!(
            plan::fuzz_entry::planned(seed_text("plan", name).as_bytes()).is_none(),
            "{name}"
        );
    }
}

/// The valid seeds do reach SGP4 (so the replay exercises propagation, near-Earth and deep
/// space), and the broken ones are refused.
#[test]
fn seeds_reach_propagation_or_are_refused() {
    let text = |target: &str, name: &str| {
        let p = Path::new(env!("CARGO_MANIFEST_DIR"))
            .join("fuzz/corpus")
            .join(target)
            .join(name);
        std::fs::read_to_string(p).unwrap()
    };
    for name in [
        "example-sat.tle",
        "deep-space-12h.tle",
        "geosynchronous.tle",
    ] {
        let sets = tle::parse_tle(&text("tle", name)).unwrap();
        let p = Propagator::new(&sets[0]).unwrap();
        for minutes in fuzz_entry::PROPAGATION_MINUTES {
            p.propagate_minutes(minutes)
                .unwrap_or_else(|e| panic!("{name}: {e}"));
        }
    }
    for name in [
        "bad-day-367.tle",
        "inclination-197.tle",
        "mean-motion-zero.tle",
    ] {
        assert!(tle::parse_tle(&text("tle", name)).is_err(), "{name}");
    }
    assert_eq!(
        omm::parse_omm_json(&text("omm_json", "two-objects.json"))
            .unwrap()
            .len(),
        2
    );
    // A provider's own fields (common practice; the names from memory) are read past.
    let provider = omm::parse_omm_json(&text("omm_json", "provider-fields.json")).unwrap();
    assert_eq!(provider[0].ignored_keywords.len(), 6);
    for name in [
        "null-required.json",
        "duplicate-key.json",
        "huge-mean-motion.json",
    ] {
        assert!(
            omm::parse_omm_json(&text("omm_json", name)).is_err(),
            "{name}"
        );
    }
    // Epoch near the end of the calendar range: parsed, and propagation past that range is
    // an error rather than a date overflow.
    let far = omm::parse_omm_json(&text("omm_json", "far-epoch-high-drag.json")).unwrap();
    let far_kvn = omm::parse_omm_kvn(&text("omm_kvn", "far-epoch-high-drag.kvn")).unwrap();
    assert_eq!(far[0].epoch, far_kvn[0].epoch);
    assert!(Propagator::new(&far[0])
        .unwrap()
        .propagate_minutes(10_080.0)
        .is_err());
    let deep = omm::parse_omm_kvn(&text("omm_kvn", "deep-space-12h.kvn")).unwrap();
    assert!(Propagator::new(&deep[0]).unwrap().period_minutes() > 225.0);
    for name in ["unknown-key.kvn", "duplicate-key.kvn", "no-equals.kvn"] {
        assert!(
            omm::parse_omm_kvn(&text("omm_kvn", name)).is_err(),
            "{name}"
        );
    }
}
