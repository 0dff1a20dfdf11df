//! Configuration files: station files and mission files (YAML).
//!
//! Two stages, as in DESIGN.md: serde structs that mirror the file
//! (`deny_unknown_fields`, so a misspelt key is an error; serde enums for the closed sets, so a
//! wrong name is an error with its line), then validation, one function per block, through one
//! context (`Checker`) shared by the mission and station files, so the physics only ever sees
//! valid values. Every error names the file, the line and the key (or, for a value given by
//! `--set`, the argument: [`overrides`]). Accepted ranges are in [`limits`], defaults in
//! [`defaults`]; the YAML crate is used in [`parse_yaml`] and [`overrides`] only.

pub mod defaults;
pub mod fleet;
pub mod fuzz_entry;
pub mod limits;
pub mod locate;
pub mod mission;
pub mod overrides;
pub mod station;

use std::path::{Path, PathBuf};

/// A configuration error: which file, which line (1-based, when known), which key, and what is
/// wrong. A value given on the command line (`--set KEY=VALUE`) is named by its argument in
/// place of a line: `file: --set KEY=VALUE: message`.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("{}{}: {message}", path.display(), match set {
    Some(s) => format!(": {s}"),
    None => line.map(|l| format!(":{l}")).unwrap_or_default(),
})]
pub struct ConfigError {
    pub path: PathBuf,
    pub line: Option<usize>,
    pub key: Option<String>,
    pub message: String,
    /// The option and argument that gave the value (`--set KEY=VALUE`), when the error is
    /// about one.
    pub set: Option<String>,
}

impl ConfigError {
    pub fn new(
        path: &Path,
        line: Option<usize>,
        key: Option<&str>,
        message: impl Into<String>,
    ) -> Self {
        ConfigError {
            path: path.to_path_buf(),
            line,
            key: key.map(str::to_string),
            message: message.into(),
            set: None,
        }
    }

    /// The same error, about the value of an override (no line): `given` is the option and its
    /// argument, `--set KEY=VALUE`.
    pub fn set_by(mut self, given: &str) -> Self {
        self.set = Some(given.to_string());
        self.line = None;
        self
    }
}

/// Read a whole text file under the input rule of [`crate::infile`], mapping I/O errors to a
/// [`ConfigError`].
pub fn read_text(path: &Path) -> Result<String, ConfigError> {
    read_limited(path, crate::infile::MAX_INPUT_BYTES)
}

/// [`read_text`] for a mission or station file (YAML): at most [`MAX_YAML_BYTES`], since the
/// YAML parser holds about 20 times a file's size in memory while it reads it.
pub fn read_yaml_text(path: &Path) -> Result<String, ConfigError> {
    read_limited(path, MAX_YAML_BYTES)
}

fn read_limited(path: &Path, max_bytes: u64) -> Result<String, ConfigError> {
    crate::infile::read_text_limited(path, max_bytes)
        .map_err(|e| ConfigError::new(path, None, None, format!("cannot read file: {e}")))
}

/// Most bytes of a mission or station file (16 MiB; the shipped ones are a few kilobytes, a
/// terrain profile of 10,000 points about 300 KB).
pub const MAX_YAML_BYTES: u64 = 16 * 1024 * 1024;

/// Parse YAML into `T`, turning serde_yaml's error (which carries a line) into a [`ConfigError`].
/// The only place that knows the YAML crate: swapping it is a change here alone.
pub fn parse_yaml<T: serde::de::DeserializeOwned>(
    path: &Path,
    text: &str,
) -> Result<T, ConfigError> {
    if text.trim().is_empty() {
        return Err(ConfigError::new(path, None, None, "file is empty"));
    }
    if let Some(line) = too_deep(text) {
        return Err(ConfigError::new(
            path,
            Some(line),
            None,
            format!(
                "brackets nested more than {MAX_FLOW_DEPTH} deep (our files need a few levels)"
            ),
        ));
    }
    serde_yaml::from_str(text).map_err(|e| {
        let mut line = e.location().map(|l| l.line());
        // serde_yaml messages look like "antenna: unknown field `x`, expected ... at line 5 column 3";
        // the location is reported separately, so strip it from the text.
        let mut message = e.to_string();
        if let Some(i) = message.find(" at line ") {
            message.truncate(i);
        }
        // A number too large for a 64-bit float (1e400) is read as a string by the YAML crate.
        message = overflowing_number(&message).unwrap_or(message);
        // A duplicate key is reported at the start of its mapping: point at the duplicate instead.
        if let (Some(l), Some(key)) = (line, duplicate_field(&message)) {
            line = locate::duplicate_key_line(text, l, key).or(line);
        }
        ConfigError::new(path, line, None, message)
    })
}

/// Deepest nesting of YAML flow collections (`[...]`, `{...}`) a file may hold. The YAML parser
/// takes time growing with the square of that depth (tens of seconds for a 200 KB line of
/// brackets), so deeper text is refused before it is parsed.
pub const MAX_FLOW_DEPTH: usize = 64;

/// The line (1-based) where flow collections first nest deeper than [`MAX_FLOW_DEPTH`], if they
/// do. A bracket counts where YAML reads it as a flow indicator: anywhere inside a flow
/// collection, and in block context where a value starts (after the indentation, `- `, `? `, a
/// `:` or another indicator). A quote opens a quoted scalar only where a value starts, and the
/// quoted scalar may run over several lines (`''` and `\"` escape their quote); brackets inside
/// it, in a plain scalar of block context (`x: a[1]`) and in comments do not count. A block
/// scalar's lines (`|`, `>`) are read as any other line: brackets at their starts count, which
/// can only refuse text nested 64 deep there.
pub(crate) fn too_deep(text: &str) -> Option<usize> {
    let (mut depth, mut quote) = (0usize, None::<char>);
    for (i, line) in text.lines().enumerate() {
        // `starts`: the next non-blank character begins a value; `pending`: the last character
        // was an indicator (`:` anywhere, `-` or `?` where a value starts) that a blank confirms.
        let (mut starts, mut pending, mut after_blank) = (true, false, true);
        let mut chars = line.chars().peekable();
        while let Some(c) = chars.next() {
            if let Some(q) = quote {
                match c {
                    '\\' if q == '"' => {
                        chars.next();
                    }
                    '\'' if q == '\'' && chars.peek() == Some(&'\'') => {
                        chars.next();
                    }
                    c if c == q => quote = None,
                    _ => {}
                }
                (starts, pending, after_blank) = (false, false, false);
                continue;
            }
            if c.is_whitespace() {
                starts |= pending;
                (pending, after_blank) = (false, true);
                continue;
            }
            if c == '#' && after_blank {
                break;
            }
            let in_flow = depth > 0;
            let (next_starts, next_pending) = match c {
                '\'' | '"' if starts => {
                    quote = Some(c);
                    (false, false)
                }
                '[' | '{' if starts || in_flow => {
                    depth += 1;
                    if depth > MAX_FLOW_DEPTH {
                        return Some(i + 1);
                    }
                    (true, false)
                }
                ']' | '}' if in_flow => {
                    depth -= 1;
                    (false, false)
                }
                ',' if in_flow => (true, false),
                ':' if in_flow => (true, false),
                ':' => (false, true),
                '-' | '?' if starts => (false, true),
                _ => (false, false),
            };
            (starts, pending, after_blank) = (next_starts, next_pending, false);
        }
    }
    None
}

/// serde_yaml's `invalid type: string "1e400", expected f64` for a number that overflows a
/// 64-bit float, reworded: `1e400 is not a finite number ...` (the key prefix is kept).
fn overflowing_number(message: &str) -> Option<String> {
    const HEAD: &str = "invalid type: string \"";
    let at = message.find(HEAD)?;
    let rest = &message[at + HEAD.len()..];
    let text = &rest[..rest.find('"')?];
    let value: f64 = text.trim().parse().ok()?;
    if value.is_finite() || !text.chars().any(|c| c.is_ascii_digit()) {
        return None;
    }
    Some(format!(
        "{}{text} is not a finite number (beyond the range of a 64-bit float)",
        &message[..at]
    ))
}

/// The key named by a "duplicate field `key`" message.
fn duplicate_field(message: &str) -> Option<&str> {
    let rest = &message[message.find("duplicate field `")? + "duplicate field `".len()..];
    Some(&rest[..rest.find('`')?])
}

/// The validation context of one file, shared by the mission and station stages: the file's path
/// and text (to name the line of a key), and the defaults taken so far.
pub(crate) struct Checker<'a> {
    pub path: &'a Path,
    pub text: &'a str,
    pub defaults: Vec<DefaultUsed>,
    /// The `--set` overrides applied to this file: their keys have no line.
    pub overrides: &'a [overrides::Applied],
    /// For a block of a list item checked on its own ([`Checker::item_block`]): the item's text
    /// starts this many lines into the file, and messages name the item first.
    line_offset: usize,
    prefix: String,
}

/// The text of one item of a list (`satellites:`), de-indented so that its keys read as a
/// document's top-level keys, and the 0-based line of the file where it starts.
pub(crate) fn item_block(text: &str, item_line: usize) -> Option<(String, usize)> {
    let lines: Vec<&str> = text.lines().collect();
    let first = lines.get(item_line.checked_sub(1)?)?;
    let dash = first.len() - first.trim_start().len();
    let body = first.trim_start().strip_prefix("- ")?;
    let indent = dash + 2;
    let mut out = vec![body.to_string()];
    for raw in lines.iter().skip(item_line) {
        let t = raw.trim_start();
        let here = raw.len() - t.len();
        if !t.is_empty() && !t.starts_with('#') && here <= dash {
            break;
        }
        out.push(raw.get(indent.min(here)..).unwrap_or("").to_string());
    }
    Some((out.join("\n"), item_line - 1))
}

impl<'a> Checker<'a> {
    pub fn new(path: &'a Path, text: &'a str, overrides: &'a [overrides::Applied]) -> Self {
        Checker {
            path,
            text,
            defaults: Vec::new(),
            overrides,
            line_offset: 0,
            prefix: String::new(),
        }
    }

    /// A checker of one list item's block (from [`item_block`]): lines are the file's, and every
    /// message starts with `prefix` (`satellites[1] (KESTREL-B): `).
    pub fn within(path: &'a Path, block: &'a (String, usize), prefix: String) -> Checker<'a> {
        Checker {
            line_offset: block.1,
            prefix,
            ..Checker::new(path, &block.0, &[])
        }
    }

    /// 1-based line (in the file) of `key` inside the block of the list item at `item_line`.
    pub fn item_key_line(&self, item_line: usize, key: &str) -> Option<usize> {
        locate::item_key_line(self.text, item_line.checked_sub(self.line_offset)?, key)
            .map(|l| l + self.line_offset)
    }

    /// 1-based line of a dotted key (`"antenna.efficiency"`); none for a key set by `--set`.
    pub fn line(&self, key: &str) -> Option<usize> {
        if overrides::overridden(self.overrides, key).is_some() {
            return None;
        }
        locate::key_line(self.text, &key.split('.').collect::<Vec<_>>())
            .map(|l| l + self.line_offset)
    }

    /// 1-based line of item `index` (0-based) of the list under a dotted key.
    pub fn item_line(&self, key: &str, index: usize) -> Option<usize> {
        if overrides::overridden(self.overrides, key).is_some() {
            return None;
        }
        locate::list_item_line(self.text, &key.split('.').collect::<Vec<_>>(), index)
            .map(|l| l + self.line_offset)
    }

    /// The first line of the list item this checker reads, when it reads one.
    fn block_line(&self) -> Option<usize> {
        (self.line_offset > 0).then_some(self.line_offset + 1)
    }

    /// The error as it reads for a key set by `--set`: naming the argument. An error about a
    /// block in which `--set` changed a key (`transmitter: needs power_w or power_dbw` after
    /// `--set transmitter.power_w=`) keeps the block's line and names the arguments too.
    fn named(&self, key: &str, mut e: ConfigError) -> ConfigError {
        if let Some(o) = overrides::overridden(self.overrides, key) {
            return e.set_by(&o.given());
        }
        let inside = format!("{key}.");
        let given: Vec<String> = (self.overrides.iter())
            .filter(|o| o.key.starts_with(&inside))
            .map(|o| o.given())
            .collect();
        if !given.is_empty() {
            e.message
                .push_str(&format!(" (the block as {} changed it)", given.join(" ")));
        }
        e
    }

    /// An error about a dotted key, at the key's line: `file:line: key: msg`.
    pub fn err(&self, key: &str, msg: impl std::fmt::Display) -> ConfigError {
        self.err_at(self.line(key), key, msg)
    }

    /// An error about a dotted key, at a given line.
    pub fn err_at(
        &self,
        line: Option<usize>,
        key: &str,
        msg: impl std::fmt::Display,
    ) -> ConfigError {
        self.named(
            key,
            ConfigError::new(
                self.path,
                line.or(self.block_line()),
                Some(key),
                format!("{}{key}: {msg}", self.prefix),
            ),
        )
    }

    /// An error about item `index` (0-based) of the list under `key`, in the index form of
    /// serde's own errors (`modem.schemes[1].error_measure: ...`): `file:line: key[index]: msg`.
    pub fn item_err(&self, key: &str, index: usize, msg: impl std::fmt::Display) -> ConfigError {
        let line = self.item_line(key, index).or(self.block_line());
        let message = format!("{}{key}[{index}]: {msg}", self.prefix);
        self.named(key, ConfigError::new(self.path, line, Some(key), message))
    }

    /// `v` checked against its range; the error names the range's key and line.
    pub fn range(&self, r: &limits::Range, v: f64) -> Result<f64, ConfigError> {
        r.check(v).map_err(|e| self.err(r.key, e))
    }

    /// An optional value checked against its range.
    pub fn optional(&self, r: &limits::Range, v: Option<f64>) -> Result<Option<f64>, ConfigError> {
        v.map(|x| self.range(r, x)).transpose()
    }

    /// A value checked against its range, or the default (recorded when the table says so).
    pub fn or_default(
        &mut self,
        r: &limits::Range,
        v: Option<f64>,
        d: &defaults::DefaultValue<f64>,
    ) -> Result<f64, ConfigError> {
        match v {
            Some(x) => self.range(r, x),
            None => Ok(self.default(d)),
        }
    }

    /// Take a default, recording it when the table says so.
    pub fn default<T: defaults::Shown>(&mut self, d: &defaults::DefaultValue<T>) -> T {
        if d.reported {
            self.defaults.push(DefaultUsed {
                key: d.key.to_string(),
                value: d.value.shown(),
                source: d.source.to_string(),
            });
        }
        d.value
    }
}

/// A value recorded as taken from a default rather than the file, for reporting.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct DefaultUsed {
    pub key: String,
    pub value: String,
    pub source: String,
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The depth scanner counts brackets where YAML reads them as flow indicators, and nowhere
    /// else. Basis: YAML 1.2.2 §7.4 (flow collections), §7.3 (quoted scalars, `''` and `\"`
    /// escapes), §7.3.3 (plain scalars may hold `[` in block context, not in flow context), from
    /// memory; a behaviour check of the input rule.
    #[test]
    fn flow_depth_is_counted_where_yaml_reads_brackets() {
        let deep = |n: usize| format!("{}{}", "[".repeat(n), "]".repeat(n));
        assert_eq!(too_deep(&format!("a: 1\nx: {}\n", deep(65))), Some(2));
        assert_eq!(too_deep(&format!("x: {}\n", deep(64))), None);
        assert_eq!(too_deep(&format!("- - {}\n", deep(65))), Some(1));
        assert_eq!(too_deep(&format!("{}\n", deep(65))), Some(1));
        // A stray quote inside a plain scalar of a flow collection opens nothing.
        assert_eq!(too_deep(&format!("x: [a', {}]\n", deep(65))), Some(1));
        // Quoted scalars, over several lines, with their escapes: not counted.
        let open = "[".repeat(100);
        assert_eq!(too_deep(&format!("x: '{open}'\n")), None);
        assert_eq!(too_deep(&format!("x: \"{open}\"\n")), None);
        assert_eq!(too_deep(&format!("x: 'it''s {open}'\n")), None);
        assert_eq!(too_deep(&format!("x: \"a \\\" {open}\"\n")), None);
        assert_eq!(too_deep(&format!("x: \"abc\n  {open} def\"\n")), None);
        // ... but a bracket after a quoted scalar that ends on the next line counts.
        assert_eq!(
            too_deep(&format!("x: [\"abc\n def\", {}]\n", deep(65))),
            Some(2)
        );
        // Plain scalars of block context and comments: not counted.
        assert_eq!(too_deep(&"x: a[\n".repeat(100)), None);
        assert_eq!(too_deep(&format!("x: 1 # {open}\n# {open}\n")), None);
        assert_eq!(too_deep(&format!("url: http://h/{open}\n")), None);
    }
}
