//! Configuration files: station files and mission files (YAML).
//!
//! Two stages, as in DESIGN.md: serde structs that mirror the file
//! (`deny_unknown_fields`, so a misspelt key is an error), then validated
//! constructors, so the physics only ever sees valid values. Every error names
//! the file, the line and the key.

pub mod limits;
pub mod locate;
pub mod mission;
pub mod station;

use std::path::{Path, PathBuf};

/// A configuration error: which file, which line (1-based, when known), which key, and what is wrong.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("{}{}: {message}", path.display(), line.map(|l| format!(":{l}")).unwrap_or_default())]
pub struct ConfigError {
    pub path: PathBuf,
    pub line: Option<usize>,
    pub key: Option<String>,
    pub message: String,
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
        }
    }
}

/// Read a whole text file, mapping I/O errors to a [`ConfigError`].
pub fn read_text(path: &Path) -> Result<String, ConfigError> {
    std::fs::read_to_string(path)
        .map_err(|e| ConfigError::new(path, None, None, format!("cannot read file: {e}")))
}

/// Parse YAML into `T`, turning serde_yaml's error (which carries a line) into a [`ConfigError`].
pub fn parse_yaml<T: serde::de::DeserializeOwned>(
    path: &Path,
    text: &str,
) -> Result<T, ConfigError> {
    if text.trim().is_empty() {
        return Err(ConfigError::new(path, None, None, "file is empty"));
    }
    serde_yaml::from_str(text).map_err(|e| {
        let line = e.location().map(|l| l.line());
        // serde_yaml messages look like "antenna: unknown field `x`, expected ... at line 5 column 3";
        // the location is reported separately, so strip it from the text.
        let mut message = e.to_string();
        if let Some(i) = message.find(" at line ") {
            message.truncate(i);
        }
        ConfigError::new(path, line, None, message)
    })
}

/// A value recorded as taken from a default rather than the file, for reporting.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct DefaultUsed {
    pub key: String,
    pub value: String,
    pub source: String,
}
