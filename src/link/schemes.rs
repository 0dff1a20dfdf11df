//! The mission's own modulation and coding schemes (`modem.schemes` in the mission file) and the
//! per-mission registry that holds them beside the built-in catalogue of [`crate::link::modcod`].
//!
//! A user scheme is a name, bits per symbol, a code rate, a framing overhead and one threshold at
//! a stated error rate and measure (BER, FER, PER): a required Eb/N0, a required Es/N0, or a table
//! of error rate against Eb/N0 interpolated at the stated error rate.
//!
//! ## Rates and Eb/N0
//! * information rate R_i: the ladder's `rate_bps`; volumes are information bits.
//! * framing efficiency e = information bits / bits entering the code (the frame at the input of
//!   the code of rate r, with its sync marker, outer-code parity and headers):
//!   e = (frame - sync marker - parity - header) / frame, or given directly.
//! * channel (coded) bit rate R_c = R_i / (e r); symbol rate R_s = R_c / bits per symbol;
//!   spectral efficiency eta = R_i / R_s = bits per symbol x r x e.
//! * Eb/N0 is per information bit everywhere in the budget. A threshold stated per bit entering
//!   the code (`ebn0_per: code_input_bit`, the way a code's curve is published) becomes, per
//!   information bit, Eb/N0 - 10 log10(e) (each information bit carries the energy of 1/e code
//!   input bits); one stated per information bit (`information_bit`, e.g. measured end to end) is
//!   used as it is; an Es/N0 threshold becomes Es/N0 - 10 log10(eta).
//!
//! A table is interpolated linearly in log10(error rate) between its two points around the
//! stated error rate (no extrapolation: the stated error rate must lie within the table).

use crate::link::capacity::shannon_limit_unchecked;
use crate::link::modcod::{
    close_names, schemes as builtin, ErrorMeasure, ModcodError, OperatingPoint, Provenance,
    SchemeName, TargetMatch, SCHEME_NAME_MAX,
};
use crate::units::ratio_to_db;

/// Provenance text of every user scheme.
pub const USER_SOURCE: &str = "user-defined in the mission file (modem.schemes)";

/// Which bit a user's Eb/N0 threshold (value or table) is stated per.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EbN0Basis {
    /// Per bit entering the code (a code's published curve).
    CodeInputBit,
    /// Per information bit (after the framing overhead).
    InformationBit,
}

/// The threshold of a user scheme.
#[derive(Debug, Clone, PartialEq)]
pub enum UserThreshold {
    /// Required Eb/N0, dB, per the given bit.
    EbN0 { db: f64, per: EbN0Basis },
    /// Required Es/N0 (per channel symbol), dB.
    EsN0 { db: f64 },
    /// `(error_rate, Eb/N0 dB)` points, per the given bit, interpolated at the scheme's error rate.
    Table {
        points: Vec<(f64, f64)>,
        per: EbN0Basis,
    },
}

/// The framing overhead of a user scheme, at the input of its code.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Framing {
    /// No overhead (efficiency 1).
    None,
    /// One frame's bits: the sync marker, outer-code parity and header bits within `frame_bits`.
    Frame {
        sync_marker_bits: u64,
        parity_bits: u64,
        header_bits: u64,
        frame_bits: u64,
    },
    /// Information bits per bit entering the code, (0, 1].
    Efficiency(f64),
}

impl Framing {
    /// Information bits per bit entering the code.
    pub fn efficiency(&self) -> Result<f64, SchemeError> {
        match *self {
            Framing::None => Ok(1.0),
            Framing::Efficiency(e) => {
                if e > 0.0 && e <= 1.0 {
                    Ok(e)
                } else {
                    Err(SchemeError::Efficiency { value: e })
                }
            }
            Framing::Frame {
                sync_marker_bits,
                parity_bits,
                header_bits,
                frame_bits,
            } => {
                let overhead = sync_marker_bits as f64 + parity_bits as f64 + header_bits as f64;
                let frame = frame_bits as f64;
                if frame_bits == 0 || overhead >= frame {
                    return Err(SchemeError::Overhead {
                        overhead_bits: overhead,
                        frame_bits: frame,
                    });
                }
                // e = (frame - sync marker - parity - header) / frame
                Ok((frame - overhead) / frame)
            }
        }
    }
}

/// Everything a user gives for one scheme.
#[derive(Debug, Clone, PartialEq)]
pub struct UserSchemeSpec {
    pub name: String,
    pub bits_per_symbol: u32,
    pub code_rate: f64,
    pub threshold: UserThreshold,
    /// The error rate the threshold is for (a table is interpolated here).
    pub error_rate: f64,
    pub measure: ErrorMeasure,
    pub framing: Framing,
}

/// A validated user scheme.
#[derive(Debug, Clone, PartialEq)]
pub struct UserScheme {
    pub name: SchemeName,
    pub bits_per_symbol: u32,
    pub code_rate: f64,
    pub framing: Framing,
    pub framing_efficiency: f64,
    /// Information bits per channel symbol: bits per symbol x code rate x framing efficiency.
    pub spectral_efficiency: f64,
    pub threshold: UserThreshold,
    pub error_rate: f64,
    pub measure: ErrorMeasure,
    /// Required Eb/N0 per information bit at `error_rate`, dB.
    pub required_ebn0_db: f64,
}

/// What is wrong with a user scheme. [`SchemeError::key`] names the scheme's key at fault.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SchemeError {
    #[error("a name of 1 to {SCHEME_NAME_MAX} bytes is needed, got {name:?}")]
    Name { name: String },
    #[error("{value} is not a whole number of bits per symbol from 1 to 16")]
    BitsPerSymbol { value: u32 },
    #[error("{value} is not in (0, 1]")]
    CodeRate { value: f64 },
    #[error("no threshold: give one of required_ebn0_db, required_esn0_db or table")]
    NoThreshold,
    #[error("give only one of required_ebn0_db, required_esn0_db and table")]
    TwoThresholds,
    #[error("{value} is not an error rate in (0, 0.5)")]
    ErrorRate { value: f64 },
    #[error("needs at least two points [error_rate, ebn0_db], got {count}")]
    TablePoints { count: usize },
    #[error("point {point}: {what}")]
    TablePoint { point: usize, what: String },
    #[error("not monotonic: point {point} ({error_rate:e} at {ebn0_db} dB) against point {other} ({other_error_rate:e} at {other_ebn0_db} dB); a lower error rate must need more Eb/N0")]
    TableNotMonotonic {
        point: usize,
        error_rate: f64,
        ebn0_db: f64,
        other: usize,
        other_error_rate: f64,
        other_ebn0_db: f64,
    },
    #[error("{value:e} lies outside the table's error rates ({min:e} to {max:e}); the table is not extrapolated")]
    OutsideTable { value: f64, min: f64, max: f64 },
    #[error("{overhead_bits} bits of sync marker, parity and header leave no information in a frame of {frame_bits} bits (overhead of 100 % or more)")]
    Overhead { overhead_bits: f64, frame_bits: f64 },
    #[error("efficiency {value} is not in (0, 1] (an overhead above 100 % or a negative one)")]
    Efficiency { value: f64 },
    #[error("{what} {value} dB is not a finite number")]
    NotFinite { what: &'static str, value: f64 },
    #[error("{required_ebn0_db:.3} dB per information bit is below Shannon's limit {limit_db:.3} dB at {eta:.4} bit/symbol")]
    BelowShannon {
        required_ebn0_db: f64,
        limit_db: f64,
        eta: f64,
    },
}

impl SchemeError {
    /// The key of the scheme's entry that is at fault.
    pub fn key(&self, threshold: &UserThreshold) -> &'static str {
        match self {
            SchemeError::Name { .. } => "name",
            SchemeError::BitsPerSymbol { .. } => "bits_per_symbol",
            SchemeError::CodeRate { .. } => "code_rate",
            SchemeError::NoThreshold | SchemeError::TwoThresholds => "required_ebn0_db",
            SchemeError::ErrorRate { .. } | SchemeError::OutsideTable { .. } => "error_rate",
            SchemeError::TablePoints { .. }
            | SchemeError::TablePoint { .. }
            | SchemeError::TableNotMonotonic { .. } => "table",
            SchemeError::Overhead { .. } => "overhead",
            SchemeError::Efficiency { .. } => "overhead.efficiency",
            SchemeError::NotFinite { .. } | SchemeError::BelowShannon { .. } => match threshold {
                UserThreshold::EbN0 { .. } => "required_ebn0_db",
                UserThreshold::EsN0 { .. } => "required_esn0_db",
                UserThreshold::Table { .. } => "table",
            },
        }
    }
}

impl UserScheme {
    /// Validate a user's scheme: name, bits per symbol (1-16), code rate in (0, 1], error rate in
    /// (0, 0.5), framing overhead below 100 %, a table of at least two points whose Eb/N0 rises as
    /// the error rate falls and that spans the error rate, and a threshold (per information bit)
    /// above Shannon's limit at the scheme's spectral efficiency.
    pub fn new(spec: &UserSchemeSpec) -> Result<UserScheme, SchemeError> {
        let name = SchemeName::new(&spec.name).ok_or_else(|| SchemeError::Name {
            name: spec.name.clone(),
        })?;
        if !(1..=16).contains(&spec.bits_per_symbol) {
            return Err(SchemeError::BitsPerSymbol {
                value: spec.bits_per_symbol,
            });
        }
        let r = spec.code_rate;
        if !(r > 0.0 && r <= 1.0) {
            return Err(SchemeError::CodeRate { value: r });
        }
        let p = spec.error_rate;
        if !(p > 0.0 && p < 0.5) {
            return Err(SchemeError::ErrorRate { value: p });
        }
        let e = spec.framing.efficiency()?;
        // eta = bits per symbol x r x e
        let eta = spec.bits_per_symbol as f64 * r * e;
        let required_ebn0_db = match &spec.threshold {
            UserThreshold::EbN0 { db, per } => per_information_bit(finite("Eb/N0", *db)?, *per, e),
            // Eb/N0 = Es/N0 - 10 log10(eta)
            UserThreshold::EsN0 { db } => finite("Es/N0", *db)? - ratio_to_db(eta),
            UserThreshold::Table { points, per } => {
                per_information_bit(interpolate(points, p)?, *per, e)
            }
        };
        let limit_db = shannon_limit_unchecked(eta);
        if required_ebn0_db < limit_db {
            return Err(SchemeError::BelowShannon {
                required_ebn0_db,
                limit_db,
                eta,
            });
        }
        Ok(UserScheme {
            name,
            bits_per_symbol: spec.bits_per_symbol,
            code_rate: r,
            framing: spec.framing,
            framing_efficiency: e,
            spectral_efficiency: eta,
            threshold: spec.threshold.clone(),
            error_rate: p,
            measure: spec.measure,
            required_ebn0_db,
        })
    }

    fn operating_point(&self, scheme_index: usize) -> OperatingPoint {
        let eta = self.spectral_efficiency;
        OperatingPoint {
            scheme_index,
            name: self.name,
            bits_per_symbol: self.bits_per_symbol,
            code_rate: self.code_rate,
            framing_efficiency: self.framing_efficiency,
            spectral_efficiency: eta,
            required_ebn0_db: self.required_ebn0_db,
            // Es/N0 = Eb/N0 + 10 log10(eta)
            required_esn0_db: self.required_ebn0_db + ratio_to_db(eta),
            error_rate: self.error_rate,
            measure: self.measure,
            target_match: TargetMatch::Exact,
            provenance: Provenance::User(USER_SOURCE),
            shannon_gap_db: self.required_ebn0_db - shannon_limit_unchecked(eta),
        }
    }
}

fn finite(what: &'static str, value: f64) -> Result<f64, SchemeError> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(SchemeError::NotFinite { what, value })
    }
}

/// Eb/N0 per information bit from one stated per `per`: Eb_i/N0 = Eb_c/N0 - 10 log10(e).
fn per_information_bit(db: f64, per: EbN0Basis, efficiency: f64) -> f64 {
    match per {
        EbN0Basis::InformationBit => db,
        EbN0Basis::CodeInputBit => db - ratio_to_db(efficiency),
    }
}

/// The table's Eb/N0 at `error_rate`, linear in log10(error rate) between the two points around
/// it; the points (in any order) must rise in Eb/N0 as the error rate falls.
pub fn interpolate(points: &[(f64, f64)], error_rate: f64) -> Result<f64, SchemeError> {
    if points.len() < 2 {
        return Err(SchemeError::TablePoints {
            count: points.len(),
        });
    }
    for (i, &(p, db)) in points.iter().enumerate() {
        if !(p > 0.0 && p < 0.5) {
            let what = format!("error rate {p} is not in (0, 0.5)");
            return Err(SchemeError::TablePoint { point: i + 1, what });
        }
        if !db.is_finite() {
            let what = format!("Eb/N0 {db} dB is not a finite number");
            return Err(SchemeError::TablePoint { point: i + 1, what });
        }
    }
    // Sorted by falling error rate, the Eb/N0 must rise strictly.
    let mut order: Vec<usize> = (0..points.len()).collect();
    order.sort_by(|&a, &b| points[b].0.total_cmp(&points[a].0));
    for w in order.windows(2) {
        let (a, b) = (points[w[0]], points[w[1]]);
        if !(b.0 < a.0 && b.1 > a.1) {
            return Err(SchemeError::TableNotMonotonic {
                point: w[1] + 1,
                error_rate: b.0,
                ebn0_db: b.1,
                other: w[0] + 1,
                other_error_rate: a.0,
                other_ebn0_db: a.1,
            });
        }
    }
    let (max, min) = (points[order[0]].0, points[order[order.len() - 1]].0);
    if !(error_rate >= min && error_rate <= max) {
        return Err(SchemeError::OutsideTable {
            value: error_rate,
            min,
            max,
        });
    }
    let x = error_rate.log10();
    for w in order.windows(2) {
        let (a, b) = (points[w[0]], points[w[1]]);
        if error_rate <= a.0 && error_rate >= b.0 {
            // Eb/N0 = Eb/N0_a + (Eb/N0_b - Eb/N0_a) (log p - log p_a) / (log p_b - log p_a)
            let t = (x - a.0.log10()) / (b.0.log10() - a.0.log10());
            return Ok(a.1 + (b.1 - a.1) * t);
        }
    }
    // Unreachable: the error rate lies within the sorted table's span.
    Err(SchemeError::OutsideTable {
        value: error_rate,
        min,
        max,
    })
}

/// The schemes a mission can use: the built-in catalogue, then the mission's own. Indices below
/// the catalogue's length are built-in ([`crate::link::modcod::SCHEMES`]); the rest are user
/// schemes in file order.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct SchemeRegistry {
    user: Vec<UserScheme>,
}

impl SchemeRegistry {
    /// The catalogue and `user`; a user name may not be a built-in name, nor be given twice.
    pub fn new(user: Vec<UserScheme>) -> Result<SchemeRegistry, ModcodError> {
        for (i, u) in user.iter().enumerate() {
            if builtin().iter().any(|s| u.name == s.name) {
                return Err(ModcodError::ClashesWithBuiltin {
                    name: u.name.to_string(),
                });
            }
            if user[..i].iter().any(|o| o.name == u.name) {
                return Err(ModcodError::Duplicate {
                    name: u.name.to_string(),
                });
            }
        }
        Ok(SchemeRegistry { user })
    }

    /// The mission's own schemes, in file order.
    pub fn user(&self) -> &[UserScheme] {
        &self.user
    }

    /// Index of a scheme by name (case-insensitive); an unknown name lists close names of both
    /// lists.
    pub fn index(&self, name: &str) -> Result<usize, ModcodError> {
        let wanted = name.trim().to_lowercase();
        let n = builtin().len();
        if let Some(i) = builtin().iter().position(|s| s.name == wanted) {
            return Ok(i);
        }
        if let Some(i) = self.user.iter().position(|u| u.name == wanted.as_str()) {
            return Ok(n + i);
        }
        let names: Vec<&str> = builtin()
            .iter()
            .map(|s| s.name)
            .chain(self.user.iter().map(|u| u.name.as_str()))
            .collect();
        Err(ModcodError::UnknownScheme {
            name: name.to_string(),
            close: close_names(&wanted, &names)
                .into_iter()
                .map(String::from)
                .collect(),
        })
    }

    /// The operating point of the scheme at `index`: a built-in one at `target_error_rate` (see
    /// [`crate::link::modcod::Scheme::operating_point`]), a user one at its own error rate.
    pub fn operating_point(
        &self,
        index: usize,
        target_error_rate: Option<f64>,
    ) -> Result<OperatingPoint, ModcodError> {
        let n = builtin().len();
        match (builtin().get(index), self.user.get(index.wrapping_sub(n))) {
            (Some(s), _) => s.operating_point_at(index, target_error_rate),
            (None, Some(u)) => Ok(u.operating_point(index)),
            (None, None) => Err(ModcodError::Index {
                index,
                len: n + self.user.len(),
            }),
        }
    }

    /// Information bits per channel symbol of the scheme at `index` (0 when out of range).
    pub fn spectral_efficiency(&self, index: usize) -> f64 {
        let n = builtin().len();
        match (builtin().get(index), self.user.get(index.wrapping_sub(n))) {
            (Some(s), _) => s.spectral_efficiency,
            (None, Some(u)) => u.spectral_efficiency,
            (None, None) => 0.0,
        }
    }

    /// The canonical (lower-case) name of the scheme at `index`.
    pub fn name(&self, index: usize) -> Option<SchemeName> {
        let n = builtin().len();
        match (builtin().get(index), self.user.get(index.wrapping_sub(n))) {
            (Some(s), _) => SchemeName::new(s.name),
            (None, Some(u)) => Some(u.name),
            (None, None) => None,
        }
    }
}
