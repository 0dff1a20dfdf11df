//! Overrides of mission and station keys from the command line (`--set KEY=VALUE`).
//!
//! An override addresses a key by its dotted path: `transmitter.power_w=5` and
//! `planning.step_s=2` in the mission file, `station.NAME.antenna.diameter_m=3.7` in the file of
//! the station named NAME (`station.*.KEY` in every station's). NAME is the station's `name`, with
//! case and punctuation ignored (`Pulau Reka`, `pulau-reka` and `PULAU_REKA` match alike). The
//! value is YAML (`5`, `rhcp`, `[[0, 3], [90, 5]]`; `null` removes an optional key).
//!
//! The overrides are applied to the parsed YAML tree of the file, which then goes through the
//! same deserialization and the same validation as the file alone: one validator owns every rule.
//! An error caused by an override names the `--set` argument instead of a line
//! ([`ConfigError::set`]). Setting one key of a pair the file takes only one of (`power_w` or
//! `power_dbw`, `window.end` or `window.days`, the LNA's noise temperature or figure) removes the
//! other.

use super::station::same_station;
use super::{parse_yaml, ConfigError};
use serde_yaml::{Mapping, Value};
use std::path::Path;

/// Pairs of keys of which a file gives at most one: setting one removes the other.
const EITHER: &[(&str, &str)] = &[
    ("transmitter.power_w", "transmitter.power_dbw"),
    ("window.end", "window.days"),
    (
        "receiver.lna_noise_temperature_k",
        "receiver.lna_noise_figure_db",
    ),
];

/// Top-level keys of a station file: given at the mission level they get a hint.
const STATION_KEYS: &[&str] = &[
    "latitude_deg",
    "longitude_deg",
    "altitude_m",
    "min_elevation_deg",
    "horizon_mask",
    "antenna",
    "receiver",
    "climate",
    "man_made_noise",
    "solar_flux_sfu",
];

/// Which file an override belongs to.
#[derive(Debug, Clone, PartialEq)]
enum Target {
    Mission,
    /// `station.REST`: the station's name and the key, split when the names are known.
    Station(String),
}

/// One `--set KEY=VALUE`.
#[derive(Debug, Clone, PartialEq)]
pub struct Override {
    /// The argument as given, for messages.
    pub arg: String,
    /// The option that gave it (`--set`, or `compare`'s `--set-b`), for messages.
    pub flag: &'static str,
    target: Target,
    value: Value,
}

/// An override resolved for one file: the key inside it, the value, the argument.
#[derive(Debug, Clone, PartialEq)]
pub struct Applied {
    pub key: String,
    pub arg: String,
    pub flag: &'static str,
    value: Value,
}

impl Applied {
    /// The option and its argument as given (`--set KEY=VALUE`), for messages.
    pub fn given(&self) -> String {
        format!("{} {}", self.flag, self.arg)
    }
}

/// The overrides of one run, in the order given (a later one wins over an earlier one).
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Overrides {
    items: Vec<Override>,
}

/// A `--set` argument that cannot be read.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("{flag} {arg}: {message}")]
pub struct OverrideError {
    pub flag: &'static str,
    pub arg: String,
    pub message: String,
}

impl Override {
    /// The option and its argument as given (`--set KEY=VALUE`), for messages.
    pub fn given(&self) -> String {
        format!("{} {}", self.flag, self.arg)
    }

    /// Read `KEY=VALUE` given by `--set`.
    pub fn parse(arg: &str) -> Result<Override, OverrideError> {
        Override::parse_as(arg, "--set")
    }

    /// Read `KEY=VALUE` given by the option `flag` (named so in messages).
    pub fn parse_as(arg: &str, flag: &'static str) -> Result<Override, OverrideError> {
        let err = |m: &str| OverrideError {
            flag,
            arg: arg.to_string(),
            message: m.to_string(),
        };
        let (key, text) = arg
            .split_once('=')
            .ok_or_else(|| err("expected KEY=VALUE, e.g. transmitter.power_w=5"))?;
        let key = key.trim();
        if key.is_empty() || key.split('.').any(|s| s.trim().is_empty()) {
            return Err(err(
                "the key is a dotted path of names, e.g. planning.step_s",
            ));
        }
        if super::too_deep(text).is_some() {
            return Err(err(&format!(
                "the value nests brackets more than {} deep",
                super::MAX_FLOW_DEPTH
            )));
        }
        let value: Value =
            serde_yaml::from_str(text).map_err(|e| err(&format!("the value is not YAML: {e}")))?;
        let target = match key.strip_prefix("station.") {
            Some(rest) => {
                if !rest.contains('.') {
                    return Err(err("a station key reads station.NAME.KEY (or station.*.KEY), e.g. station.Nordkam.antenna.diameter_m"));
                }
                Target::Station(rest.to_string())
            }
            None if key == "station" => return Err(err("a station key reads station.NAME.KEY")),
            None => Target::Mission,
        };
        Ok(Override {
            arg: arg.to_string(),
            flag,
            target,
            value,
        })
    }

    /// The key inside the mission file, or inside the file of the station named `station`.
    fn key_for(&self, station: Option<&str>) -> Option<String> {
        let key = self
            .arg
            .split_once('=')
            .map(|(k, _)| k.trim())
            .unwrap_or("");
        match (&self.target, station) {
            (Target::Mission, None) => Some(key.to_string()),
            (Target::Station(rest), Some(name)) => {
                if let Some(k) = rest.strip_prefix("*.") {
                    return Some(k.to_string());
                }
                // The name may itself hold dots: try every split point.
                rest.match_indices('.').find_map(|(i, _)| {
                    (same_station(&rest[..i], name)).then(|| rest[i + 1..].to_string())
                })
            }
            _ => None,
        }
    }
}

impl Overrides {
    /// Read every `--set` argument.
    pub fn parse<S: AsRef<str>>(args: &[S]) -> Result<Overrides, OverrideError> {
        Overrides::parse_as(args, "--set")
    }

    /// Read every argument of the option `flag` (`compare`'s `--set-b`: its errors name it).
    pub fn parse_as<S: AsRef<str>>(
        args: &[S],
        flag: &'static str,
    ) -> Result<Overrides, OverrideError> {
        let items = args
            .iter()
            .map(|a| Override::parse_as(a.as_ref(), flag))
            .collect::<Result<_, _>>()?;
        Ok(Overrides { items })
    }

    /// These overrides followed by `more` (which win where both set a key).
    pub fn and(&self, more: &Overrides) -> Overrides {
        let mut items = self.items.clone();
        items.extend(more.items.iter().cloned());
        Overrides { items }
    }

    pub fn is_empty(&self) -> bool {
        self.items.is_empty()
    }

    /// The overrides of the mission file.
    pub fn mission(&self) -> Vec<Applied> {
        self.resolved(None)
    }

    /// The overrides of the file of the station named `name`.
    pub fn station(&self, name: &str) -> Vec<Applied> {
        self.resolved(Some(name))
    }

    fn resolved(&self, station: Option<&str>) -> Vec<Applied> {
        self.items
            .iter()
            .filter_map(|o| {
                o.key_for(station).map(|key| Applied {
                    key,
                    arg: o.arg.clone(),
                    flag: o.flag,
                    value: o.value.clone(),
                })
            })
            .collect()
    }

    /// These overrides without those naming only stations called `names` (stations read from
    /// elsewhere than the file being loaded).
    pub fn except_stations(&self, names: &[&str]) -> Overrides {
        let items = self
            .items
            .iter()
            .filter(|o| match &o.target {
                Target::Station(rest) => {
                    rest.starts_with("*.") || !names.iter().any(|n| o.key_for(Some(n)).is_some())
                }
                Target::Mission => true,
            })
            .cloned()
            .collect();
        Overrides { items }
    }

    /// Every station override must reach a station: one naming none of `names` is an error
    /// (`path`: the file that lists the stations, for the message).
    pub fn check_stations(&self, path: &Path, names: &[&str]) -> Result<(), ConfigError> {
        for o in &self.items {
            if let Target::Station(rest) = &o.target {
                if rest.starts_with("*.") || names.iter().any(|n| o.key_for(Some(n)).is_some()) {
                    continue;
                }
                let msg = format!(
                    "no station of this run is named so (stations: {}); write station.NAME.KEY with NAME as in the station file, or station.*.KEY for every station",
                    names.join(", ")
                );
                return Err(ConfigError::new(path, None, None, msg).set_by(&o.given()));
            }
        }
        Ok(())
    }
}

/// Parse a file's YAML into `T` with the overrides applied to its tree. Without overrides this is
/// [`parse_yaml`]. An error the file alone also has is reported as the file's (with its line);
/// one only the overrides cause names the `--set` argument.
pub(crate) fn parse_with<T: serde::de::DeserializeOwned>(
    path: &Path,
    text: &str,
    overrides: &[Applied],
) -> Result<T, ConfigError> {
    if overrides.is_empty() {
        return parse_yaml(path, text);
    }
    let mut tree: Value = match parse_yaml(path, text) {
        Ok(v) => v,
        Err(e) => return Err(parse_yaml::<T>(path, text).err().unwrap_or(e)),
    };
    for o in overrides {
        set(&mut tree, o).map_err(|m| {
            ConfigError::new(path, None, Some(&o.key), format!("{}: {m}", o.key)).set_by(&o.given())
        })?;
    }
    let changed = serde_yaml::to_string(&tree)
        .map_err(|e| ConfigError::new(path, None, None, format!("cannot apply --set: {e}")))?;
    match parse_yaml::<T>(path, &changed) {
        Ok(t) => Ok(t),
        Err(e) => match parse_yaml::<T>(path, text) {
            Err(file) => Err(file),
            Ok(_) => Err(blame(path, &e.message, overrides)),
        },
    }
}

/// Look up the text of one of the `--set` keys: the path of `key`, without a line.
pub(crate) fn overridden<'a>(overrides: &'a [Applied], key: &str) -> Option<&'a Applied> {
    overrides
        .iter()
        .rev()
        .find(|o| key == o.key || key.starts_with(&format!("{}.", o.key)))
}

/// Put `o`'s value at its dotted key, creating missing blocks; removes the other key of an
/// [`EITHER`] pair.
fn set(tree: &mut Value, o: &Applied) -> Result<(), String> {
    let parts: Vec<&str> = o.key.split('.').map(str::trim).collect();
    // (the key inside its file: a station's name, which may hold a bracket, is not part of it)
    if let Some(i) = parts.iter().position(|p| p.contains('[')) {
        let list = [&parts[..i], &[parts[i].split('[').next().unwrap_or("")]].concat();
        let list = list.join(".");
        return Err(format!(
            "one item of a list cannot be set: give the whole list as the value of {list} (YAML flow style, e.g. {list}=[...])"
        ));
    }
    let mut node = tree;
    for (i, part) in parts.iter().enumerate() {
        if node.is_null() {
            *node = Value::Mapping(Mapping::new());
        }
        let map = match node {
            Value::Mapping(m) => m,
            Value::Sequence(_) => {
                return Err(format!(
                    "{} is a list: give the whole list as the value (YAML flow style, e.g. [[0, 3], [90, 5]])",
                    parts[..i].join(".")
                ))
            }
            _ => return Err(format!("{} is a value, not a block", parts[..i].join("."))),
        };
        let k = Value::String((*part).to_string());
        if i + 1 == parts.len() {
            for (a, b) in EITHER {
                let other = if o.key == *a {
                    b
                } else if o.key == *b {
                    a
                } else {
                    continue;
                };
                map.remove(Value::String(other.rsplit('.').next().unwrap_or("").into()));
            }
            map.insert(k, o.value.clone());
            return Ok(());
        }
        node = map.entry(k).or_insert(Value::Null);
    }
    Ok(())
}

/// The error serde gives for the overridden tree, laid on the overrides that caused it: those
/// whose key lies on the path the message names, narrowed to the one naming the field in the
/// message when there is one.
fn blame(path: &Path, message: &str, overrides: &[Applied]) -> ConfigError {
    let at = message
        .split_once(": ")
        .map(|(p, _)| p)
        .filter(|p| p.chars().all(|c| c.is_alphanumeric() || "_.[]".contains(c)))
        .map(|p| p.split('[').next().unwrap_or(p).to_string());
    let on_path = |o: &&Applied| match &at {
        Some(p) => {
            o.key == *p
                || o.key.starts_with(&format!("{p}."))
                || p.starts_with(&format!("{}.", o.key))
        }
        None => true,
    };
    let mut hit: Vec<&Applied> = overrides.iter().filter(on_path).collect();
    let named: Vec<&Applied> = hit
        .iter()
        .copied()
        .filter(|o| {
            let below = match &at {
                Some(p) => o.key.strip_prefix(&format!("{p}.")).unwrap_or(&o.key),
                None => &o.key,
            };
            let field = below.split('.').next().unwrap_or("");
            message.contains(&format!("`{field}`"))
        })
        .collect();
    if !named.is_empty() {
        hit = named;
    }
    if hit.is_empty() {
        hit = overrides.iter().collect();
    }
    let mut msg = message.to_string();
    if let Some(o) = hit
        .iter()
        .find(|o| at.is_none() && STATION_KEYS.contains(&o.key.split('.').next().unwrap_or("")))
    {
        msg.push_str(&format!(
            " ({} is a station key: write station.NAME.{})",
            o.key.split('.').next().unwrap_or(""),
            o.key
        ));
    }
    let args: Vec<String> = hit.iter().map(|o| o.given()).collect();
    ConfigError::new(path, None, None, msg).set_by(&args.join(" "))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_keys_values_and_stations() {
        let o = Overrides::parse(&[
            "transmitter.power_w=5",
            "station.Pulau Reka.antenna.diameter_m=3.7",
            "station.*.receiver.lna_gain_db=40",
            "modem.ladder=[{rate_bps: 1e6, scheme: bpsk}]",
        ])
        .unwrap();
        let m = o.mission();
        assert_eq!(m.len(), 2);
        assert_eq!(m[0].key, "transmitter.power_w");
        assert_eq!(m[0].value, Value::Number(5.into()));
        assert!(matches!(m[1].value, Value::Sequence(_)));
        let s = o.station("pulau-reka");
        assert_eq!(s.len(), 2);
        assert_eq!(s[0].key, "antenna.diameter_m");
        assert_eq!(s[1].key, "receiver.lna_gain_db");
        assert_eq!(o.station("Nordkam").len(), 1);
        // A station whose name holds a dot.
        let d = Overrides::parse(&["station.St. Ives.altitude_m=3"]).unwrap();
        assert_eq!(d.station("ST. IVES")[0].key, "altitude_m");
    }

    #[test]
    fn an_item_of_a_list_is_refused_with_the_way_to_set_the_list() {
        let o = Overrides::parse(&[
            "modem.ladder[0].rate_bps=1e6",
            "station.Site [A].horizon_mask[0]=3",
            "station.Site [A].altitude_m=3",
        ])
        .unwrap();
        let mut t: Value = serde_yaml::from_str("modem:\n").unwrap();
        let e = set(&mut t, &o.mission()[0]).unwrap_err();
        assert!(
            e.contains("give the whole list as the value of modem.ladder"),
            "{e}"
        );
        // a station whose name holds a bracket is still a station; its own keys are checked
        let st = o.station("Site [A]");
        assert_eq!(st[1].key, "altitude_m");
        let e = set(&mut t, &st[0]).unwrap_err();
        assert!(e.contains("the value of horizon_mask ("), "{e}");
        set(&mut t, &st[1]).unwrap();
    }

    #[test]
    fn refuses_malformed_arguments() {
        for bad in ["power_w", "=3", "a..b=3", "station.x=1", "a=[1,"] {
            let e = Override::parse(bad).unwrap_err();
            assert!(e.to_string().starts_with(&format!("--set {bad}: ")), "{e}");
        }
    }

    #[test]
    fn sets_nested_keys_and_clears_the_other_of_a_pair() {
        let mut t: Value = serde_yaml::from_str("transmitter:\n  power_w: 2\nplanning:\n").unwrap();
        let o =
            Overrides::parse(&["transmitter.power_dbw=3", "planning.step_s=2", "a.b.c=x"]).unwrap();
        for a in o.mission() {
            set(&mut t, &a).unwrap();
        }
        let text = serde_yaml::to_string(&t).unwrap();
        assert!(!text.contains("power_w"), "{text}");
        assert!(text.contains("power_dbw: 3"), "{text}");
        assert!(text.contains("step_s: 2"), "{text}");
        assert!(text.contains("c: x"), "{text}");
        let mut t: Value = serde_yaml::from_str("ladder:\n  - 1\n").unwrap();
        let o = Overrides::parse(&["ladder.rate=1"]).unwrap();
        assert!(set(&mut t, &o.mission()[0])
            .unwrap_err()
            .contains("is a list"));
    }
}
