//! Fuzz entry points for the configuration files: the bodies of the cargo-fuzz targets `station`
//! and `mission` in `fuzz/` and of the stable-toolchain corpus replay test
//! (`tests/suite/fuzz_replay.rs`), so both run the same code.
//!
//! Each takes arbitrary bytes (invalid UTF-8 is skipped, as [`super::read_text`] would refuse it)
//! and validates them; errors are expected and ignored. The property under test is that no input
//! panics, and that an error always names the file it is about.
//!
//! A mission names its station files and element file relative to itself, so the `mission`
//! target validates its bytes as if they were a mission file in the `examples/` folder of a copy
//! of the shipped example ([`fixture_dir`]): the shipped mission's relative paths resolve there.

use super::mission::Mission;
use super::station::Station;
use super::ConfigError;
use std::path::{Path, PathBuf};
use std::sync::OnceLock;

/// The shipped files copied into the fixture folder: (path under the folder, contents).
pub const SHIPPED_FILES: [(&str, &str); 7] = [
    (
        "stations/nordkam.yaml",
        include_str!("../../stations/nordkam.yaml"),
    ),
    (
        "stations/sierra-baja.yaml",
        include_str!("../../stations/sierra-baja.yaml"),
    ),
    (
        "stations/pulau-reka.yaml",
        include_str!("../../stations/pulau-reka.yaml"),
    ),
    (
        "examples/wrenlet-1.yaml",
        include_str!("../../examples/wrenlet-1.yaml"),
    ),
    ("examples/sat.tle", include_str!("../../examples/sat.tle")),
    (
        "examples/sat-omm.json",
        include_str!("../../examples/sat-omm.json"),
    ),
    (
        "examples/sat-omm.kvn",
        include_str!("../../examples/sat-omm.kvn"),
    ),
];

/// A folder under the system's temporary folder holding a copy of the shipped example's stations
/// and elements ([`SHIPPED_FILES`]), written on first use in a process. Its name carries a hash of
/// the contents, so every process of one build shares one folder, and each file is written under a
/// temporary name and renamed into place, so a process never reads a half-written file. `None`
/// when it cannot be written.
pub fn fixture_dir() -> Option<&'static Path> {
    static DIR: OnceLock<Option<PathBuf>> = OnceLock::new();
    DIR.get_or_init(|| {
        let name = format!("passbudget-fuzz-fixture-{:016x}", contents_hash());
        let dir = std::env::temp_dir().join(name);
        for (name, text) in SHIPPED_FILES {
            let path = dir.join(name);
            if std::fs::read_to_string(&path).is_ok_and(|t| t == text) {
                continue;
            }
            std::fs::create_dir_all(path.parent()?).ok()?;
            let part = path.with_extension(format!("part-{}", std::process::id()));
            std::fs::write(&part, text).ok()?;
            std::fs::rename(&part, &path).ok()?;
        }
        Some(dir)
    })
    .as_deref()
}

/// FNV-1a (64 bit) over the names and contents of [`SHIPPED_FILES`].
fn contents_hash() -> u64 {
    let bytes = SHIPPED_FILES
        .iter()
        .flat_map(|(n, t)| n.bytes().chain(t.bytes()));
    bytes.fold(0xcbf2_9ce4_8422_2325, |h, b| {
        (h ^ u64::from(b)).wrapping_mul(0x0000_0100_0000_01b3)
    })
}

/// Where the fuzzed mission text claims to live: `examples/fuzz-mission.yaml` in the fixture
/// folder (the file itself is never written; only its folder matters).
pub fn mission_path() -> Option<PathBuf> {
    Some(fixture_dir()?.join("examples/fuzz-mission.yaml"))
}

/// Fuzz target `station`: [`Station::from_yaml`].
pub fn station(data: &[u8]) {
    let path = Path::new("fuzz-station.yaml");
    if let Ok(text) = std::str::from_utf8(data) {
        if let Err(e) = Station::from_yaml(path, text) {
            check_error(&e, path);
        }
    }
}

/// Fuzz target `mission`: [`Mission::from_yaml`], with the station files and elements of the
/// shipped example at hand (see [`fixture_dir`]).
pub fn mission(data: &[u8]) {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    let Some(path) = mission_path() else {
        return;
    };
    if let Err(e) = Mission::from_yaml(&path, text) {
        // A station file's error names the station file, not the mission.
        assert!(!e.path.as_os_str().is_empty(), "error without a file: {e}");
        assert!(!e.message.is_empty(), "error without a message: {e:?}");
        assert_ne!(e.line, Some(0), "line numbers are 1-based: {e}");
    }
}

/// An error names the file it was given, carries a message, and a line (when it has one) is 1-based.
fn check_error(e: &ConfigError, path: &Path) {
    assert_eq!(e.path, path, "{e}");
    assert!(!e.message.is_empty(), "error without a message: {e:?}");
    assert_ne!(e.line, Some(0), "line numbers are 1-based: {e}");
}
