//! Replays the seed corpora of the cargo-fuzz targets (`fuzz/corpus/tle`, `omm_json`,
//! `omm_kvn`) through the same library entry points the targets call
//! (`passbudget::orbit::fuzz_entry`), on the stable toolchain: a panic fails the test.
//! Each seed is also replayed cut short and with single bytes replaced (deterministic
//! mutations), which reaches many error paths of the readers.

use std::path::{Path, PathBuf};

use passbudget::orbit::{fuzz_entry, omm, tle, Propagator};

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

/// The seed, then cut at every 5th byte, then with bytes replaced at a stride.
fn replay(target: &str, entry: fn(&[u8])) -> usize {
    let mut runs = 0;
    for (_, seed) in corpus(target) {
        entry(&seed);
        runs += 1;
        for cut in (0..seed.len()).step_by(5) {
            entry(&seed[..cut]);
            runs += 1;
        }
        for pos in (0..seed.len()).step_by(3) {
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
