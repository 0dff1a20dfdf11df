//! Output: the serialized row types (the public wire format, kept apart from the domain types so it
//! stays stable when internals change), CSV and JSON, the files of a plan's output folder, and
//! atomic file writing.

mod atomic;
pub mod budget;
pub mod calendar;
pub mod compare;
pub mod contacts;
pub mod files;
pub mod geometry;
pub mod plan;
mod staging;
pub mod step_csv;
pub mod transits;

pub use staging::{
    read_manifest, recover, CommitMethod, CommitMode, FolderError, Recovery, Staging, Step,
    JOURNAL, MANIFEST,
};

pub use atomic::{write_atomic, write_output, write_staged, WriteMode};

/// Two names of one run that give the same file names.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum NameClash {
    #[error(
        "stations '{first}' and '{second}' would write the same file names ({slug}): rename one"
    )]
    Stations {
        first: String,
        second: String,
        slug: String,
    },
    #[error("station '{station}' would write the same file names as the charts of all stations ({slug}): rename it")]
    Network { station: String, slug: String },
}

/// Check that the stations of one run give distinct file names (their [`slug`]s differ from each
/// other and from the all-stations label of the mask chart). Call it before any work: otherwise
/// one station's files would replace the other's.
pub fn check_file_names<'a>(stations: impl IntoIterator<Item = &'a str>) -> Result<(), NameClash> {
    let network = slug(crate::plan::NETWORK_LABEL);
    let mut seen: Vec<(&str, String)> = Vec::new();
    for name in stations {
        let s = slug(name);
        if s == network {
            return Err(NameClash::Network {
                station: name.into(),
                slug: s,
            });
        }
        if let Some((first, _)) = seen.iter().find(|(_, x)| *x == s) {
            return Err(NameClash::Stations {
                first: (*first).into(),
                second: name.into(),
                slug: s,
            });
        }
        seen.push((name, s));
    }
    Ok(())
}

/// Serialize rows to CSV text: `#` comment lines first (the [`plan::CAUTION`] every output
/// carries, then one `# warning: ...` line per warning), then one header row and the rows. Read it
/// with `#` as the comment character (pandas: `comment="#"`; the `csv` crate:
/// `ReaderBuilder::comment(Some(b'#'))`).
pub fn to_csv<T: serde::Serialize + Default>(
    rows: &[T],
    warnings: &[String],
) -> Result<String, csv::Error> {
    let mut head = format!("# {}\n", plan::CAUTION);
    for w in warnings {
        // one line each, whatever the text holds
        head.push_str(&format!("# warning: {}\n", w.replace(['\n', '\r'], " ")));
    }
    if rows.is_empty() {
        // The header row all the same (a reader given only `#` lines finds no columns): the
        // one a row of the type writes.
        let mut w = csv::Writer::from_writer(Vec::new());
        w.serialize(T::default())?;
        let bytes = w
            .into_inner()
            .map_err(|e| csv::Error::from(e.into_error()))?;
        let text = String::from_utf8(bytes).expect("csv writes UTF-8");
        let header = text.lines().next().unwrap_or_default();
        return Ok(format!("{head}{header}\n"));
    }
    let mut w = csv::Writer::from_writer(head.into_bytes());
    for r in rows {
        w.serialize(r)?;
    }
    let bytes = w
        .into_inner()
        .map_err(|e| csv::Error::from(e.into_error()))?;
    Ok(String::from_utf8(bytes).expect("csv writes UTF-8"))
}

/// The longest [`slug`], in bytes: with the longest prefix and suffix of a result file and the
/// temporary name of an atomic write, a file name stays far below the 255 bytes most file systems
/// allow.
pub const MAX_SLUG_BYTES: usize = 64;

/// File-name-safe lower-case slug: `Sierra Baja` -> `sierra-baja`, `Nord-Kam` -> `nord-kam`,
/// `Ñu` -> `ñu`, `東京` -> `東京`: the name's words ([`crate::infile::name_words`], the rule
/// `--station NAME` compares by) joined by `-`; a name with no letter or digit gives `unnamed`. A slug longer
/// than [`MAX_SLUG_BYTES`] keeps its beginning (whole characters) and ends in `-` and 8 hex digits
/// of a hash of the whole name (64-bit FNV-1a, folded), so that two long names that differ only
/// further on still give different slugs (and [`check_file_names`] catches the rare equal hash).
pub fn slug(name: &str) -> String {
    let words = crate::infile::name_words(name);
    let s = match words.is_empty() {
        true => "unnamed".to_string(),
        false => words.join("-"),
    };
    if s.len() <= MAX_SLUG_BYTES {
        return s;
    }
    let h = crate::infile::normal_form(name)
        .bytes()
        .fold(0xcbf2_9ce4_8422_2325u64, |h, b| {
            (h ^ u64::from(b)).wrapping_mul(0x0100_0000_01b3)
        });
    let tag = format!("-{:08x}", (h ^ (h >> 32)) as u32);
    let mut end = MAX_SLUG_BYTES - tag.len();
    while !s.is_char_boundary(end) {
        end -= 1;
    }
    format!("{}{tag}", s[..end].trim_end_matches('-'))
}

/// Serialize a quantity that is usually a whole number (a rate in bit/s, a volume in bits) as an
/// integer when it is one (`50000000`, not `50000000.0`), else as a float.
pub fn whole<S: serde::Serializer>(x: &f64, s: S) -> Result<S::Ok, S::Error> {
    // 2^53: every integer below it is exact in an f64
    if x.fract() == 0.0 && x.abs() < 9.007_199_254_740_992e15 {
        s.serialize_i64(*x as i64)
    } else {
        s.serialize_f64(*x)
    }
}

/// [`whole`] for an optional quantity (`None` stays empty/null).
pub fn whole_opt<S: serde::Serializer>(x: &Option<f64>, s: S) -> Result<S::Ok, S::Error> {
    match x {
        Some(v) => whole(v, s),
        None => s.serialize_none(),
    }
}

/// The identifier of a pass that does not change with the window: the station's [`slug`] and
/// the minute (UTC) of the pass's highest elevation, `nordkam-20261202T0111Z`. For a pass the
/// window cuts, that is the highest point of the whole pass, outside the window if need be
/// ([`crate::geometry::Pass::full_tca`]); the minute is cut, not rounded.
pub fn pass_id(station: &str, pass: &crate::geometry::Pass) -> String {
    pass_id_at(station, &pass.full_tca)
}

/// [`pass_id`] from the station's name and the pass's `full_tca`.
pub fn pass_id_at(station: &str, full_tca: &chrono::DateTime<chrono::Utc>) -> String {
    pass_id_slugged(&slug(station), full_tca)
}

/// [`pass_id_at`] from the station's [`slug`], made once for many passes.
pub fn pass_id_slugged(station_slug: &str, full_tca: &chrono::DateTime<chrono::Utc>) -> String {
    [station_slug, "-", &crate::timefmt::file_stamp(full_tca)].concat()
}

/// Round to `digits` decimals for stable, readable output (JSON/CSV are deterministic anyway).
pub fn round(x: f64, digits: i32) -> f64 {
    let s = 10f64.powi(digits);
    // + 0.0 turns a negative zero (a tiny negative value rounded) into 0
    (x * s).round() / s + 0.0
}

/// [`round`] for an azimuth in [0, 360): a value that rounds up to 360 is written as 0, the same
/// direction, so that no output holds an azimuth of 360 ([`crate::engfmt::azimuth`] is the rule
/// for text).
pub fn round_azimuth(azimuth_deg: f64, digits: i32) -> f64 {
    crate::geometry::wrap360_deg(round(azimuth_deg, digits))
}

/// Minutes:seconds for durations in tables, hours:minutes:seconds from an hour (a satellite
/// that never sets: `48:00:00`, not `2880:00`).
pub fn mm_ss(seconds: f64) -> String {
    let s = seconds.max(0.0).round() as i64;
    match s < 3600 {
        true => format!("{}:{:02}", s / 60, s % 60),
        false => hh_mm_ss(seconds),
    }
}

/// Hours:minutes:seconds for durations in tables.
pub fn hh_mm_ss(seconds: f64) -> String {
    let s = seconds.max(0.0).round() as i64;
    format!("{}:{:02}:{:02}", s / 3600, (s / 60) % 60, s % 60)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The rounded azimuths of the JSON and CSV outputs are in [0, 360) (azimuth clockwise from
    /// north, common practice): 360.0 was written before.
    #[test]
    fn rounded_azimuths_are_below_360() {
        assert_eq!(round_azimuth(359.99996, 4), 0.0);
        assert_eq!(round_azimuth(359.99994, 4), 359.9999);
        assert_eq!(round_azimuth(359.9996, 3), 0.0);
        assert_eq!(round_azimuth(-0.00001, 4), 0.0);
        assert!(round_azimuth(-0.00001, 4).is_sign_positive());
        assert_eq!(round_azimuth(12.34567, 3), 12.346);
    }

    #[test]
    fn atomic_write_replaces_whole_file() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("a.txt");
        write_atomic(&p, b"first").unwrap();
        write_atomic(&p, b"second").unwrap();
        assert_eq!(std::fs::read_to_string(&p).unwrap(), "second");
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
        assert!(write_atomic(&dir.path().join("missing/x.txt"), b"x").is_err());
    }

    #[test]
    fn temporary_names_differ_per_call() {
        // Many writers of one target at once: each has its own temporary file, so none fails
        // and the target holds one writer's whole text.
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("same.csv");
        std::thread::scope(|s| {
            for i in 0..8 {
                let p = &p;
                s.spawn(move || {
                    for _ in 0..50 {
                        write_atomic(p, format!("writer {i}").repeat(1000).as_bytes()).unwrap();
                    }
                });
            }
        });
        let text = std::fs::read_to_string(&p).unwrap();
        assert_eq!(text.len(), 8000, "one writer's whole text");
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
    }

    #[test]
    fn slug_keeps_unicode_letters_and_digits() {
        assert_eq!(slug("Sierra Baja"), "sierra-baja");
        assert_eq!(slug("Nord Kam"), "nord-kam");
        assert_eq!(slug("Nord-Kam"), "nord-kam");
        assert_eq!(slug("  Ñu / Station 2 "), "ñu-station-2");
        assert_eq!(slug("東京局"), "東京局");
        assert_eq!(slug("Москва-2"), "москва-2");
        assert_ne!(slug("東京局"), slug("大阪局"));
        assert_eq!(slug("***"), "unnamed");
        // canonically equivalent (UAX #15 §1.1): one slug
        assert_eq!(slug("Pe\u{301}rez"), "p\u{e9}rez");
        // U+0130 lower-cases to `i` and U+0307 (Unicode SpecialCasing.txt): the dot is dropped
        assert_eq!(slug("\u{130}zmir"), "izmir");
    }

    /// A very long station name gives a slug of at most MAX_SLUG_BYTES bytes that keeps its
    /// beginning and stays unique (before: the whole name went into the file names, and a name of
    /// 300 characters failed only when the files were written, after the work).
    #[test]
    fn long_names_give_short_unique_slugs() {
        let a = format!("Station {}", "x".repeat(300));
        let b = format!("Station {}y", "x".repeat(299));
        for n in [&a, &b] {
            let s = slug(n);
            assert!(s.len() <= MAX_SLUG_BYTES, "{s}");
            assert!(s.starts_with("station-xxxx"), "{s}");
        }
        assert_ne!(slug(&a), slug(&b));
        assert!(check_file_names([a.as_str(), b.as_str()]).is_ok());
        // Cut on a character boundary (3-byte characters), never inside one.
        let s = slug(&"東".repeat(100));
        assert!(s.len() <= MAX_SLUG_BYTES && s.starts_with("東東"), "{s}");
        let exact = "a".repeat(MAX_SLUG_BYTES);
        assert_eq!(slug(&exact), exact);
    }

    #[test]
    fn clashing_station_names_are_refused() {
        let e = check_file_names(["Sierra Baja", "Nord Kam", "Nord-Kam"]).unwrap_err();
        assert_eq!(
            e.to_string(),
            "stations 'Nord Kam' and 'Nord-Kam' would write the same file names (nord-kam): rename one"
        );
        let e = check_file_names(["All Stations"]).unwrap_err();
        assert!(e.to_string().contains("all-stations"), "{e}");
        assert!(check_file_names(["東京局", "大阪局", "Sierra Baja"]).is_ok());
    }

    #[test]
    fn whole_quantities_serialize_as_integers() {
        #[derive(serde::Serialize, Default)]
        struct R {
            #[serde(serialize_with = "whole")]
            rate_bps: f64,
            #[serde(serialize_with = "whole_opt")]
            volume_bits: Option<f64>,
            #[serde(serialize_with = "whole_opt")]
            none_bits: Option<f64>,
            #[serde(serialize_with = "whole")]
            odd_bps: f64,
        }
        let r = R {
            rate_bps: 50e6,
            volume_bits: Some(1.5e12),
            none_bits: None,
            odd_bps: 9600.5,
        };
        assert_eq!(
            to_csv(&[r], &[])
                .unwrap()
                .lines()
                .skip(1)
                .collect::<Vec<_>>()
                .join("\n")
                + "\n",
            "rate_bps,volume_bits,none_bits,odd_bps\n50000000,1500000000000,,9600.5\n"
        );
    }

    #[test]
    fn durations() {
        assert_eq!(mm_ss(605.4), "10:05");
        assert_eq!(mm_ss(59.6), "1:00");
        assert_eq!(mm_ss(3599.4), "59:59");
        assert_eq!(mm_ss(3599.6), "1:00:00");
        assert_eq!(mm_ss(172_800.0), "48:00:00");
    }
}
