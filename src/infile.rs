//! Reading a file the user names (a mission, a station, an element set, a generation profile):
//! one rule for every input. The file must be a regular file or a pipe (`<(...)` in a shell), not
//! a device such as `/dev/zero`, and may hold at most [`MAX_INPUT_BYTES`]: an input that never
//! ends is refused after that many bytes instead of filling the memory.

use std::io::Read;
use std::path::Path;

/// Most bytes an input file may hold (256 MiB: a generation profile of several million rows or
/// an element-set history of a million sets fits; our own inputs are kilobytes).
pub const MAX_INPUT_BYTES: u64 = 256 * 1024 * 1024;

/// The whole text of the input file at `path` (UTF-8), under the rule of this module. The error
/// is the operating system's, or says why the file was refused.
pub fn read_text(path: &Path) -> std::io::Result<String> {
    read_text_limited(path, MAX_INPUT_BYTES)
}

/// [`read_text`] with another size limit (for tests).
pub fn read_text_limited(path: &Path, max_bytes: u64) -> std::io::Result<String> {
    let file = std::fs::File::open(path)?;
    refuse_devices(&file.metadata()?.file_type())?;
    let mut text = String::new();
    file.take(max_bytes + 1).read_to_string(&mut text)?;
    if text.len() as u64 > max_bytes {
        return Err(std::io::Error::other(format!(
            "the file holds more than {} MiB, the most an input file may hold",
            max_bytes / (1024 * 1024)
        )));
    }
    Ok(text)
}

/// A name read from an input file (of a mission, a station, a satellite, a scheme, an element
/// set's object), refused with the reason when it holds a control character (ESC, BEL, CR,
/// DEL...) or a text-reordering one ([`reorders_text`]). Names go into tables on a terminal, CSV,
/// calendars and file names, where such a character would act on the terminal or break a
/// calendar's lines; every reader of a name refuses one through this rule.
pub fn check_name(name: &str) -> Result<(), String> {
    match control_character(name) {
        None => Ok(()),
        Some(c) => {
            let kind = match c.is_control() {
                true => "a control character",
                false => "a text-reordering character",
            };
            Err(format!(
                "holds {kind} (U+{:04X}); a name may hold only printable characters",
                u32::from(c)
            ))
        }
    }
}

/// A name in Unicode normal form C, the one form every comparison of names and every file name
/// made from one uses: a letter with an accent typed precomposed (`é`, U+00E9) and one saved as the
/// letter and a combining accent (`e` U+0301), canonically equivalent by the Unicode Standard
/// (UAX #15 §1.1), give one text.
pub fn normal_form(name: &str) -> String {
    use unicode_normalization::UnicodeNormalization;
    name.nfc().collect()
}

/// The words of a name, the one rule by which names are compared (`same_station`) and made into
/// file names (`report::slug`): in [`normal_form`], split at every run of characters other than
/// letters and digits, each word lower-cased to its letters and digits alone (`İ` lower-cases to
/// `i` and a combining dot, which is dropped).
pub fn name_words(name: &str) -> Vec<String> {
    normal_form(name)
        .split(|c: char| !c.is_alphanumeric())
        .map(|w| {
            (w.chars().flat_map(char::to_lowercase))
                .filter(|c| c.is_alphanumeric())
                .collect::<String>()
        })
        .filter(|w| !w.is_empty())
        .collect()
}

/// A name read from a YAML file: [`check_name`], and not one of YAML's spellings of no value
/// (`~`, `null`), which a text field receives as those characters (`name: ~` named a station
/// "~" in every table and file name).
pub fn check_yaml_name(name: &str) -> Result<(), String> {
    if matches!(name.trim(), "~" | "null" | "Null" | "NULL") {
        return Err(format!(
            "is '{}', which YAML reads as no value; give another name",
            name.trim()
        ));
    }
    check_name(name)
}

/// The first character of `name` that [`check_name`] refuses.
fn control_character(name: &str) -> Option<char> {
    name.chars().find(|&c| c.is_control() || reorders_text(c))
}

/// Unicode's directional embeddings, overrides and isolates (U+202A-U+202E, U+2066-U+2069) and
/// the line and paragraph separators (U+2028, U+2029): invisible characters that reorder or break
/// the text around them on a display.
fn reorders_text(c: char) -> bool {
    matches!(c, '\u{202A}'..='\u{202E}' | '\u{2066}'..='\u{2069}' | '\u{2028}' | '\u{2029}')
}

#[cfg(unix)]
fn refuse_devices(kind: &std::fs::FileType) -> std::io::Result<()> {
    use std::os::unix::fs::FileTypeExt;
    if kind.is_char_device() || kind.is_block_device() || kind.is_socket() {
        return Err(std::io::Error::other(
            "not a file (a device or a socket); give a regular file or a pipe",
        ));
    }
    Ok(())
}

#[cfg(not(unix))]
fn refuse_devices(_: &std::fs::FileType) -> std::io::Result<()> {
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Basis: a behaviour check of the input rule; the Unicode code points of the directional
    /// controls and separators (U+202A-U+202E, U+2066-U+2069, U+2028-U+2029) from memory.
    #[test]
    fn devices_and_oversized_files_are_refused() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("m.yaml");
        std::fs::write(&p, "x".repeat(2 * 1024 * 1024 + 1)).unwrap();
        let e = read_text_limited(&p, 2 * 1024 * 1024).unwrap_err();
        assert!(e.to_string().contains("more than 2 MiB"), "{e}");
        std::fs::write(&p, "name: a\n").unwrap();
        assert_eq!(read_text(&p).unwrap(), "name: a\n");
        // Letters of every script are names; control and reordering characters are not.
        assert_eq!(check_name("Pulau Réka 北 Ålesund"), Ok(()));
        // YAML's null spellings arrive in a text field as themselves (serde_yaml 0.9).
        for n in ["~", " null", "NULL"] {
            assert!(check_yaml_name(n).unwrap_err().contains("no value"), "{n}");
        }
        assert_eq!(check_yaml_name("Nullarbor"), Ok(()));
        for c in [
            '\u{1b}', '\t', '\r', '\u{7f}', '\u{85}', '\u{202E}', '\u{2067}', '\u{2028}',
        ] {
            assert_eq!(control_character(&format!("a{c}b")), Some(c), "{c:?}");
        }
        #[cfg(unix)]
        {
            let e = read_text(Path::new("/dev/zero")).unwrap_err();
            assert!(e.to_string().contains("not a file"), "{e}");
        }
    }
}
