//! Modulation and coding schemes: a registry of named schemes, each knowing its
//! bits per symbol, code rate, spectral efficiency (information bits per channel
//! symbol) and the Eb/N0 it needs for a target error rate.
//!
//! Threshold sources:
//! * Uncoded BPSK/QPSK (Gray): exact, Pb = Q(sqrt(2 Eb/N0)), inverted numerically
//!   (BER 1e-5 -> 9.59 dB; cf. Roddy, *Satellite Communications*, 4th ed., p. 353: 9.6 dB).
//! * Uncoded 8PSK (Gray): nearest-neighbour approximation (Proakis & Salehi, *Digital
//!   Communications*, 5th ed., §4.3): Ps ~ 2 Q(sqrt(2 Es/N0) sin(pi/M)), Pb ~ Ps / log2 M.
//!   Good to ~0.1 dB for Pb <= 1e-3 (the union bound tightens as Pb falls); BER
//!   above 1e-2 is refused ([`ModcodError::ApproximationRange`]).
//! * CCSDS codes (CCSDS 131.0-B TM Synchronization and Channel Coding; curves in
//!   CCSDS 130.1-G TM Synchronization and Channel Coding - Summary of Concept and
//!   Rationale): the Green Book gives curves, not tabulated thresholds. **Every CCSDS
//!   value here is "from memory"** (curve readings recalled, not re-read from the
//!   document; typical uncertainty +-0.3..0.5 dB), except the CC r7/8 - r1/2 gap of
//!   about 2.4 dB, which 130.1-G-1 §4.6 states in text. They are tested only as
//!   plausibility bands and against the binary-input AWGN capacity bound of their rate.
//! * DVB-S2: ETSI EN 302 307-1, Table 13, ideal Es/N0 at quasi-error-free PER = 1e-7,
//!   AWGN, normal FECFRAME (64 800 bits), no pilots; spectral efficiency
//!   eta = (K_bch - 80) / (64800 / log2 M + 90) (80 BBHEADER bits, 90 PLHEADER symbols);
//!   Eb/N0 = Es/N0 - 10 log10(eta).
//!
//! Eb/N0 is always per information bit. Frame overheads outside the code (CCSDS
//! attached sync markers, DVB-S2 pilots) are not included for CCSDS (framing efficiency 1; the
//! mission's own schemes of [`crate::link::schemes`] carry an overhead); for DVB-S2 the
//! BBHEADER and PLHEADER are included through eta.
//!
//! A second and a third search of the published text (2026-12-02: 130.1-G-1/-2 pages, 131.0-B
//! copies, 131.4-M-1, DSN 810-005 module 208) found the CCSDS figures' captions but no table or
//! sentence giving a threshold with its error rate: the CCSDS thresholds stay "from memory"
//! (docs/REFERENCES.md §2 lists what was searched).
//!
//! Target error rate: a coded scheme's threshold is for the error rate and measure
//! (BER, FER, PER) of the figure it came from. Requesting another rate returns the
//! nearest tabulated point (distance in log10) flagged [`TargetMatch::Nearest`].
//! Uncoded schemes accept any BER in (0, 0.5) (default 1e-5).
//!
//! Registry (README-ready; Eb/N0 per information bit, AWGN, ideal demodulation):
//!
//! | name | rate | error rate | Eb/N0 dB | status |
//! |---|---|---|---|---|
//! | bpsk, qpsk | 1 | BER (any; default 1e-5) | 9.59 at 1e-5 | computed, exact |
//! | 8psk | 1 | BER (any) | ~13.0 at 1e-5 | computed, nearest-neighbour approx. |
//! | ccsds-cc-r1/2 | 1/2 | BER 1e-5 / 1e-6 | 4.4 / 5.0 | from memory |
//! | ccsds-cc-r2/3, r3/4, r5/6 | | BER 1e-5 | 5.0, 5.5, 6.1 | from memory |
//! | ccsds-cc-r7/8 | 7/8 | BER 1e-5 | 6.8 | from memory (r1/2) + 2.4 dB gap stated in 130.1-G-1 §4.6 |
//! | ccsds-rs-cc (RS(255,223) I=5 + CC r1/2) | 0.437 | BER 1e-5 / 1e-6 | 2.3 / 2.5 | from memory |
//! | ccsds-turbo-r1/2, r1/3, r1/4, r1/6 (k 8920) | | BER 1e-6 | 1.0, 0.5, 0.2, 0.0 | from memory |
//! | ccsds-ldpc-r7/8 (8160,7136) | 0.8745 | BER 1e-6 | 4.0 | from memory |
//! | ccsds-ar4ja-r{1/2,2/3,4/5}-k1024 | | FER 1e-4 | 2.0, 3.0, 3.9 | from memory |
//! | ccsds-ar4ja-r{1/2,2/3,4/5}-k4096 | | FER 1e-4 | 1.4, 2.4, 3.3 | from memory |
//! | ccsds-ar4ja-r{1/2,2/3,4/5}-k16384 | | FER 1e-4 | 1.0, 2.0, 2.9 | from memory |
//! | dvbs2-{qpsk,8psk,16apsk,32apsk}-r (28 MODCODs) | | PER 1e-7 (QEF) | Table 13 Es/N0 - 10 log10 eta | EN 302 307-1 Table 13 |
//!
//! Every "from memory" value exceeds the binary-input AWGN capacity bound of its rate
//! (tested); the turbo r1/2 gain over RS+CC (1.5 dB) lies in the 0.9-1.6 dB range the
//! 130.1-G-1 text gives (tested).

use crate::link::capacity::shannon_limit_unchecked;
use crate::special::q_inv;
use crate::units::ratio_to_db;

/// Carrier modulation.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Modulation {
    Bpsk,
    Qpsk,
    Psk8,
    Apsk16,
    Apsk32,
}

impl Modulation {
    /// Coded bits per channel symbol, log2 M.
    pub const fn bits_per_symbol(self) -> u32 {
        match self {
            Modulation::Bpsk => 1,
            Modulation::Qpsk => 2,
            Modulation::Psk8 => 3,
            Modulation::Apsk16 => 4,
            Modulation::Apsk32 => 5,
        }
    }
}

/// What the threshold's error rate counts.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ErrorMeasure {
    /// Bit error rate.
    Ber,
    /// Frame (codeword) error rate.
    Fer,
    /// Packet error rate (DVB-S2 QEF).
    Per,
}

/// How well a threshold is known.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Provenance {
    /// Computed from a closed form (named in the string).
    Computed(&'static str),
    /// Read from a published table (named in the string).
    Published(&'static str),
    /// Recalled from a published figure, not re-checked against the document.
    FromMemory(&'static str),
    /// Given by the user in the mission file (`modem.schemes`), named in the string.
    User(&'static str),
}

impl Provenance {
    /// The status word of the outputs (`threshold_status`) and the source text.
    pub fn status_and_source(self) -> (&'static str, &'static str) {
        match self {
            Provenance::Computed(s) => ("computed", s),
            Provenance::Published(s) => ("published", s),
            Provenance::FromMemory(s) => ("from memory", s),
            Provenance::User(s) => ("user", s),
        }
    }
}

/// Longest scheme name, bytes: names are kept inline ([`SchemeName`]) so that an operating point
/// stays `Copy` and the per-step budget allocates nothing.
pub const SCHEME_NAME_MAX: usize = 40;

/// A scheme's name (built-in or from the mission file), stored inline, lower case.
#[derive(Clone, Copy, PartialEq, Eq, Hash)]
pub struct SchemeName {
    len: u8,
    bytes: [u8; SCHEME_NAME_MAX],
}

impl SchemeName {
    /// The name, trimmed and lower-cased; `None` when empty or longer than [`SCHEME_NAME_MAX`]
    /// bytes.
    pub fn new(name: &str) -> Option<SchemeName> {
        let lower = name.trim().to_lowercase();
        let b = lower.as_bytes();
        if b.is_empty() || b.len() > SCHEME_NAME_MAX {
            return None;
        }
        let mut bytes = [0u8; SCHEME_NAME_MAX];
        bytes[..b.len()].copy_from_slice(b);
        Some(SchemeName {
            len: b.len() as u8,
            bytes,
        })
    }

    /// A built-in name (at most [`SCHEME_NAME_MAX`] bytes, lower case: checked by a test).
    const fn builtin(name: &'static str) -> SchemeName {
        let b = name.as_bytes();
        let mut bytes = [0u8; SCHEME_NAME_MAX];
        let mut i = 0;
        while i < b.len() {
            bytes[i] = b[i];
            i += 1;
        }
        SchemeName {
            len: b.len() as u8,
            bytes,
        }
    }

    pub fn as_str(&self) -> &str {
        // Built from a &str cut at its own length: always valid UTF-8.
        std::str::from_utf8(&self.bytes[..self.len as usize]).unwrap_or("")
    }
}

impl std::ops::Deref for SchemeName {
    type Target = str;
    fn deref(&self) -> &str {
        self.as_str()
    }
}

impl std::fmt::Display for SchemeName {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.as_str())
    }
}

impl std::fmt::Debug for SchemeName {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{:?}", self.as_str())
    }
}

impl PartialEq<&str> for SchemeName {
    fn eq(&self, other: &&str) -> bool {
        self.as_str() == *other
    }
}

#[derive(Debug, Clone, Copy, PartialEq)]
enum Threshold {
    /// Exact Q-function inversion (BPSK/QPSK) or nearest-neighbour (M-PSK).
    UncodedPsk,
    /// `(error_rate, Eb/N0 dB)` points.
    EbN0Table {
        measure: ErrorMeasure,
        points: &'static [(f64, f64)],
        provenance: Provenance,
    },
    /// `(error_rate, Es/N0 dB)` points.
    EsN0Table {
        measure: ErrorMeasure,
        points: &'static [(f64, f64)],
        provenance: Provenance,
    },
}

/// A named modulation + coding scheme.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Scheme {
    pub name: &'static str,
    pub modulation: Modulation,
    /// Code rate k/n (1 for uncoded).
    pub code_rate: f64,
    /// Information bits per channel symbol.
    pub spectral_efficiency: f64,
    threshold: Threshold,
}

/// Whether the threshold is for the requested error rate.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum TargetMatch {
    /// Computed at exactly the requested (or default) error rate.
    Exact,
    /// The tabulated point nearest to `requested` was used.
    Nearest { requested: f64 },
}

/// A scheme at a chosen error rate: everything the budget needs, Copy.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OperatingPoint {
    /// Index in the scheme registry (the built-in list, then the mission's own schemes:
    /// [`crate::link::schemes::SchemeRegistry`]).
    pub scheme_index: usize,
    pub name: SchemeName,
    pub bits_per_symbol: u32,
    pub code_rate: f64,
    /// Information bits per bit entering the code (1 without framing overhead): the share of
    /// the frame left after sync markers, outer-code parity and headers.
    pub framing_efficiency: f64,
    /// Information bits per channel symbol: bits per symbol x code rate x framing efficiency.
    pub spectral_efficiency: f64,
    pub required_ebn0_db: f64,
    pub required_esn0_db: f64,
    /// Error rate the threshold is for, and what it counts.
    pub error_rate: f64,
    pub measure: ErrorMeasure,
    pub target_match: TargetMatch,
    pub provenance: Provenance,
    /// Required Eb/N0 minus the Shannon limit (2^eta - 1)/eta at eta = bits per symbol, dB: the
    /// gap of the scheme alone, i.e. with B = Rs (roll-off 0). A rate's gap in the budget uses
    /// its occupied bandwidth Rs (1 + roll-off) (`link::capacity`, one bandwidth convention).
    pub shannon_gap_db: f64,
}

/// Errors of the scheme registry.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ModcodError {
    #[error("unknown modulation/coding scheme {name:?}{}", if close.is_empty() { "; see the README for the scheme names".to_string() } else { format!("; close names: {}", close.join(", ")) })]
    UnknownScheme { name: String, close: Vec<String> },
    #[error("target error rate must be in (0, 0.5), got {value}")]
    TargetErrorRate { value: f64 },
    #[error("BER {value} is above {max}, where the nearest-neighbour M-PSK approximation stops being useful")]
    ApproximationRange { value: f64, max: f64 },
    #[error("scheme index {index} out of range (registry has {len} schemes)")]
    Index { index: usize, len: usize },
    #[error(
        "scheme {name:?} is a built-in scheme's name; give the mission's own scheme another name"
    )]
    ClashesWithBuiltin { name: String },
    #[error("scheme {name:?} is defined twice")]
    Duplicate { name: String },
}

/// Largest BER accepted by the nearest-neighbour M-PSK (M >= 8) approximation.
pub const MPSK_APPROX_MAX_BER: f64 = 1e-2;

/// Default BER for uncoded schemes when none is requested.
pub const DEFAULT_UNCODED_BER: f64 = 1e-5;

const CCSDS_MEMO: &str = "CCSDS 130.1-G performance curves, from memory (unconfirmed); +-0.5 dB";
const CC_7_8_MEMO: &str =
    "CCSDS 130.1-G: r1/2 value from memory + 2.4 dB r7/8 gap stated in 130.1-G-1 §4.6";
const DVBS2_T13: &str =
    "ETSI EN 302 307-1 Table 13 (ideal Es/N0, QEF PER 1e-7, normal frame, no pilots)";

const fn uncoded(name: &'static str, modulation: Modulation) -> Scheme {
    Scheme {
        name,
        modulation,
        code_rate: 1.0,
        spectral_efficiency: modulation.bits_per_symbol() as f64,
        threshold: Threshold::UncodedPsk,
    }
}

/// A binary CCSDS code on QPSK (Eb/N0 per information bit is the same on BPSK).
const fn ccsds(
    name: &'static str,
    code_rate: f64,
    measure: ErrorMeasure,
    points: &'static [(f64, f64)],
    memo: &'static str,
) -> Scheme {
    Scheme {
        name,
        modulation: Modulation::Qpsk,
        code_rate,
        spectral_efficiency: 2.0 * code_rate,
        threshold: Threshold::EbN0Table {
            measure,
            points,
            provenance: Provenance::FromMemory(memo),
        },
    }
}

/// DVB-S2 MODCOD from K_bch (EN 302 307-1 Table 5a) and Table 13 Es/N0.
const fn dvbs2(
    name: &'static str,
    modulation: Modulation,
    code_rate: f64,
    k_bch: f64,
    points: &'static [(f64, f64)],
) -> Scheme {
    // eta = (K_bch - 80) / (64800 / log2 M + 90)
    let eta = (k_bch - 80.0) / (64800.0 / modulation.bits_per_symbol() as f64 + 90.0);
    Scheme {
        name,
        modulation,
        code_rate,
        spectral_efficiency: eta,
        threshold: Threshold::EsN0Table {
            measure: ErrorMeasure::Per,
            points,
            provenance: Provenance::Published(DVBS2_T13),
        },
    }
}

use ErrorMeasure::{Ber, Fer};
use Modulation::{Apsk16, Apsk32, Psk8, Qpsk};

const TURBO_K: f64 = 8920.0;

/// The registry. Order is stable (indices may be stored).
pub static SCHEMES: &[Scheme] = &[
    uncoded("bpsk", Modulation::Bpsk),
    uncoded("qpsk", Qpsk),
    uncoded("8psk", Psk8),
    // CCSDS 131.0-B §3 convolutional code (7, 1/2) and punctured rates, soft Viterbi.
    ccsds(
        "ccsds-cc-r1/2",
        0.5,
        Ber,
        &[(1e-5, 4.4), (1e-6, 5.0)],
        CCSDS_MEMO,
    ),
    ccsds("ccsds-cc-r2/3", 2.0 / 3.0, Ber, &[(1e-5, 5.0)], CCSDS_MEMO),
    ccsds("ccsds-cc-r3/4", 0.75, Ber, &[(1e-5, 5.5)], CCSDS_MEMO),
    ccsds("ccsds-cc-r5/6", 5.0 / 6.0, Ber, &[(1e-5, 6.1)], CCSDS_MEMO),
    ccsds("ccsds-cc-r7/8", 0.875, Ber, &[(1e-5, 6.8)], CC_7_8_MEMO),
    // RS(255,223) E=16, interleaving I=5, + CC(7,1/2) (131.0-B §4; 130.1-G §6.3).
    ccsds(
        "ccsds-rs-cc",
        223.0 / 255.0 * 0.5,
        Ber,
        &[(1e-5, 2.3), (1e-6, 2.5)],
        CCSDS_MEMO,
    ),
    // Turbo codes, k = 8920 bits, 10 iterations (131.0-B §6; 130.1-G Fig. 7-9).
    // Rate includes the 4 termination bits: k / ((k + 4) / r).
    ccsds(
        "ccsds-turbo-r1/2",
        TURBO_K / ((TURBO_K + 4.0) * 2.0),
        Ber,
        &[(1e-6, 1.0)],
        CCSDS_MEMO,
    ),
    ccsds(
        "ccsds-turbo-r1/3",
        TURBO_K / ((TURBO_K + 4.0) * 3.0),
        Ber,
        &[(1e-6, 0.5)],
        CCSDS_MEMO,
    ),
    ccsds(
        "ccsds-turbo-r1/4",
        TURBO_K / ((TURBO_K + 4.0) * 4.0),
        Ber,
        &[(1e-6, 0.2)],
        CCSDS_MEMO,
    ),
    ccsds(
        "ccsds-turbo-r1/6",
        TURBO_K / ((TURBO_K + 4.0) * 6.0),
        Ber,
        &[(1e-6, 0.0)],
        CCSDS_MEMO,
    ),
    // LDPC (8160, 7136) (131.0-B §7.3).
    ccsds(
        "ccsds-ldpc-r7/8",
        7136.0 / 8160.0,
        Ber,
        &[(1e-6, 4.0)],
        CCSDS_MEMO,
    ),
    // AR4JA LDPC (131.0-B §7.4; 130.1-G §8), frame error rate 1e-4.
    ccsds(
        "ccsds-ar4ja-r1/2-k1024",
        0.5,
        Fer,
        &[(1e-4, 2.0)],
        CCSDS_MEMO,
    ),
    ccsds(
        "ccsds-ar4ja-r2/3-k1024",
        2.0 / 3.0,
        Fer,
        &[(1e-4, 3.0)],
        CCSDS_MEMO,
    ),
    ccsds(
        "ccsds-ar4ja-r4/5-k1024",
        0.8,
        Fer,
        &[(1e-4, 3.9)],
        CCSDS_MEMO,
    ),
    ccsds(
        "ccsds-ar4ja-r1/2-k4096",
        0.5,
        Fer,
        &[(1e-4, 1.4)],
        CCSDS_MEMO,
    ),
    ccsds(
        "ccsds-ar4ja-r2/3-k4096",
        2.0 / 3.0,
        Fer,
        &[(1e-4, 2.4)],
        CCSDS_MEMO,
    ),
    ccsds(
        "ccsds-ar4ja-r4/5-k4096",
        0.8,
        Fer,
        &[(1e-4, 3.3)],
        CCSDS_MEMO,
    ),
    ccsds(
        "ccsds-ar4ja-r1/2-k16384",
        0.5,
        Fer,
        &[(1e-4, 1.0)],
        CCSDS_MEMO,
    ),
    ccsds(
        "ccsds-ar4ja-r2/3-k16384",
        2.0 / 3.0,
        Fer,
        &[(1e-4, 2.0)],
        CCSDS_MEMO,
    ),
    ccsds(
        "ccsds-ar4ja-r4/5-k16384",
        0.8,
        Fer,
        &[(1e-4, 2.9)],
        CCSDS_MEMO,
    ),
    // DVB-S2 (EN 302 307-1), K_bch from Table 5a, Es/N0 from Table 13.
    dvbs2("dvbs2-qpsk-1/4", Qpsk, 0.25, 16008.0, &[(1e-7, -2.35)]),
    dvbs2("dvbs2-qpsk-1/3", Qpsk, 1.0 / 3.0, 21408.0, &[(1e-7, -1.24)]),
    dvbs2("dvbs2-qpsk-2/5", Qpsk, 0.4, 25728.0, &[(1e-7, -0.30)]),
    dvbs2("dvbs2-qpsk-1/2", Qpsk, 0.5, 32208.0, &[(1e-7, 1.00)]),
    dvbs2("dvbs2-qpsk-3/5", Qpsk, 0.6, 38688.0, &[(1e-7, 2.23)]),
    dvbs2("dvbs2-qpsk-2/3", Qpsk, 2.0 / 3.0, 43040.0, &[(1e-7, 3.10)]),
    dvbs2("dvbs2-qpsk-3/4", Qpsk, 0.75, 48408.0, &[(1e-7, 4.03)]),
    dvbs2("dvbs2-qpsk-4/5", Qpsk, 0.8, 51648.0, &[(1e-7, 4.68)]),
    dvbs2("dvbs2-qpsk-5/6", Qpsk, 5.0 / 6.0, 53840.0, &[(1e-7, 5.18)]),
    dvbs2("dvbs2-qpsk-8/9", Qpsk, 8.0 / 9.0, 57472.0, &[(1e-7, 6.20)]),
    dvbs2("dvbs2-qpsk-9/10", Qpsk, 0.9, 58192.0, &[(1e-7, 6.42)]),
    dvbs2("dvbs2-8psk-3/5", Psk8, 0.6, 38688.0, &[(1e-7, 5.50)]),
    dvbs2("dvbs2-8psk-2/3", Psk8, 2.0 / 3.0, 43040.0, &[(1e-7, 6.62)]),
    dvbs2("dvbs2-8psk-3/4", Psk8, 0.75, 48408.0, &[(1e-7, 7.91)]),
    dvbs2("dvbs2-8psk-5/6", Psk8, 5.0 / 6.0, 53840.0, &[(1e-7, 9.35)]),
    dvbs2("dvbs2-8psk-8/9", Psk8, 8.0 / 9.0, 57472.0, &[(1e-7, 10.69)]),
    dvbs2("dvbs2-8psk-9/10", Psk8, 0.9, 58192.0, &[(1e-7, 10.98)]),
    dvbs2(
        "dvbs2-16apsk-2/3",
        Apsk16,
        2.0 / 3.0,
        43040.0,
        &[(1e-7, 8.97)],
    ),
    dvbs2("dvbs2-16apsk-3/4", Apsk16, 0.75, 48408.0, &[(1e-7, 10.21)]),
    dvbs2("dvbs2-16apsk-4/5", Apsk16, 0.8, 51648.0, &[(1e-7, 11.03)]),
    dvbs2(
        "dvbs2-16apsk-5/6",
        Apsk16,
        5.0 / 6.0,
        53840.0,
        &[(1e-7, 11.61)],
    ),
    dvbs2(
        "dvbs2-16apsk-8/9",
        Apsk16,
        8.0 / 9.0,
        57472.0,
        &[(1e-7, 12.89)],
    ),
    dvbs2("dvbs2-16apsk-9/10", Apsk16, 0.9, 58192.0, &[(1e-7, 13.13)]),
    dvbs2("dvbs2-32apsk-3/4", Apsk32, 0.75, 48408.0, &[(1e-7, 12.73)]),
    dvbs2("dvbs2-32apsk-4/5", Apsk32, 0.8, 51648.0, &[(1e-7, 13.64)]),
    dvbs2(
        "dvbs2-32apsk-5/6",
        Apsk32,
        5.0 / 6.0,
        53840.0,
        &[(1e-7, 14.28)],
    ),
    dvbs2(
        "dvbs2-32apsk-8/9",
        Apsk32,
        8.0 / 9.0,
        57472.0,
        &[(1e-7, 15.69)],
    ),
    dvbs2("dvbs2-32apsk-9/10", Apsk32, 0.9, 58192.0, &[(1e-7, 16.05)]),
];

/// All registered schemes, in a stable order.
pub fn schemes() -> &'static [Scheme] {
    SCHEMES
}

/// Index of a scheme by name (exact, case-insensitive). Unknown names give the
/// closest registered names (edit distance <= 3, or containing the name).
pub fn scheme_index(name: &str) -> Result<usize, ModcodError> {
    let wanted = name.trim().to_lowercase();
    if let Some(i) = SCHEMES.iter().position(|s| s.name == wanted) {
        return Ok(i);
    }
    let names: Vec<&str> = SCHEMES.iter().map(|s| s.name).collect();
    Err(ModcodError::UnknownScheme {
        name: name.to_string(),
        close: close_names(&wanted, &names)
            .into_iter()
            .map(String::from)
            .collect(),
    })
}

/// The names close to `wanted` (edit distance <= 3, or containing it), closest first, at most 6.
pub(crate) fn close_names<'a>(wanted: &str, names: &[&'a str]) -> Vec<&'a str> {
    let mut scored: Vec<(usize, &'a str)> = names
        .iter()
        .filter_map(|&n| {
            let d = edit_distance(wanted, n);
            if d <= 3 || (!wanted.is_empty() && n.contains(wanted)) {
                Some((d, n))
            } else {
                None
            }
        })
        .collect();
    scored.sort_by(|a, b| a.0.cmp(&b.0).then(a.1.cmp(b.1)));
    scored.into_iter().take(6).map(|(_, n)| n).collect()
}

/// A scheme by name; see [`scheme_index`].
pub fn scheme(name: &str) -> Result<&'static Scheme, ModcodError> {
    scheme_index(name).map(|i| &SCHEMES[i])
}

/// Operating point of the scheme at `index` (see [`Scheme::operating_point`]).
pub fn operating_point(
    index: usize,
    target_error_rate: Option<f64>,
) -> Result<OperatingPoint, ModcodError> {
    let s = SCHEMES.get(index).ok_or(ModcodError::Index {
        index,
        len: SCHEMES.len(),
    })?;
    s.operating_point_at(index, target_error_rate)
}

fn edit_distance(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    let mut cur = vec![0; b.len() + 1];
    for (i, ca) in a.chars().enumerate() {
        cur[0] = i + 1;
        for (j, cb) in b.iter().enumerate() {
            let sub = prev[j] + usize::from(ca != *cb);
            cur[j + 1] = sub.min(prev[j + 1] + 1).min(cur[j] + 1);
        }
        std::mem::swap(&mut prev, &mut cur);
    }
    prev[b.len()]
}

/// Required Eb/N0 (dB) of uncoded Gray-mapped M-PSK at bit error rate `ber`.
/// M <= 4: exact, Pb = Q(sqrt(2 Eb/N0)). M >= 8: nearest neighbour (Proakis),
/// Pb = (2/k) Q(sqrt(2 k Eb/N0) sin(pi/M)).
pub fn uncoded_psk_required_ebn0_db(modulation: Modulation, ber: f64) -> Result<f64, ModcodError> {
    if !(ber > 0.0 && ber < 0.5) {
        return Err(ModcodError::TargetErrorRate { value: ber });
    }
    let k = modulation.bits_per_symbol() as f64;
    let ebn0 = match modulation {
        Modulation::Bpsk | Modulation::Qpsk => {
            // Pb = Q(sqrt(2 Eb/N0))  ->  Eb/N0 = Qinv(Pb)^2 / 2
            let x = q_inv(ber).ok_or(ModcodError::TargetErrorRate { value: ber })?;
            x * x / 2.0
        }
        _ => {
            let m = 2f64.powf(k);
            // Pb = (2/k) Q(x), x = sqrt(2 k Eb/N0) sin(pi/M)  ->  Eb/N0 = x^2 / (2 k sin^2(pi/M))
            if ber > MPSK_APPROX_MAX_BER {
                return Err(ModcodError::ApproximationRange {
                    value: ber,
                    max: MPSK_APPROX_MAX_BER,
                });
            }
            let p = k * ber / 2.0;
            let x = q_inv(p).ok_or(ModcodError::TargetErrorRate { value: ber })?;
            let s = (std::f64::consts::PI / m).sin();
            x * x / (2.0 * k * s * s)
        }
    };
    Ok(ratio_to_db(ebn0))
}

impl Scheme {
    pub fn bits_per_symbol(&self) -> u32 {
        self.modulation.bits_per_symbol()
    }

    /// Provenance of the scheme's threshold.
    pub fn provenance(&self) -> Provenance {
        match self.threshold {
            Threshold::UncodedPsk => Provenance::Computed(if self.bits_per_symbol() <= 2 {
                "exact: Pb = Q(sqrt(2 Eb/N0))"
            } else {
                "nearest-neighbour approximation (Proakis & Salehi, Digital Communications 5th ed. §4.3)"
            }),
            Threshold::EbN0Table { provenance, .. } | Threshold::EsN0Table { provenance, .. } => {
                provenance
            }
        }
    }

    /// Tabulated `(error_rate, value_db)` points (value is Eb/N0 for CCSDS, Es/N0
    /// for DVB-S2); empty for computed schemes.
    pub fn tabulated_points(&self) -> &'static [(f64, f64)] {
        match self.threshold {
            Threshold::UncodedPsk => &[],
            Threshold::EbN0Table { points, .. } | Threshold::EsN0Table { points, .. } => points,
        }
    }

    /// The operating point at `target_error_rate` (None: the scheme's default,
    /// its first tabulated point or BER 1e-5 for uncoded schemes).
    pub fn operating_point(
        &self,
        target_error_rate: Option<f64>,
    ) -> Result<OperatingPoint, ModcodError> {
        let index = SCHEMES
            .iter()
            .position(|s| s.name == self.name)
            .unwrap_or(usize::MAX);
        self.operating_point_at(index, target_error_rate)
    }

    pub(crate) fn operating_point_at(
        &self,
        scheme_index: usize,
        target: Option<f64>,
    ) -> Result<OperatingPoint, ModcodError> {
        if let Some(t) = target {
            if !(t > 0.0 && t < 0.5) {
                return Err(ModcodError::TargetErrorRate { value: t });
            }
        }
        let eta = self.spectral_efficiency;
        let eta_db = ratio_to_db(eta);
        let (ebn0_db, error_rate, measure, target_match) = match self.threshold {
            Threshold::UncodedPsk => {
                let ber = target.unwrap_or(DEFAULT_UNCODED_BER);
                (
                    uncoded_psk_required_ebn0_db(self.modulation, ber)?,
                    ber,
                    ErrorMeasure::Ber,
                    TargetMatch::Exact,
                )
            }
            Threshold::EbN0Table {
                measure, points, ..
            } => {
                let (rate, v, m) = pick(points, target);
                (v, rate, measure, m)
            }
            Threshold::EsN0Table {
                measure, points, ..
            } => {
                let (rate, v, m) = pick(points, target);
                // Eb/N0 = Es/N0 - 10 log10(eta)
                (v - eta_db, rate, measure, m)
            }
        };
        Ok(OperatingPoint {
            scheme_index,
            name: SchemeName::builtin(self.name),
            bits_per_symbol: self.bits_per_symbol(),
            code_rate: self.code_rate,
            framing_efficiency: 1.0,
            spectral_efficiency: eta,
            required_ebn0_db: ebn0_db,
            // Es/N0 = Eb/N0 + 10 log10(eta)
            required_esn0_db: ebn0_db + eta_db,
            error_rate,
            measure,
            target_match,
            provenance: self.provenance(),
            shannon_gap_db: ebn0_db - shannon_limit_unchecked(eta),
        })
    }
}

/// Nearest tabulated point to `target` in log10 distance (first point if None).
fn pick(points: &'static [(f64, f64)], target: Option<f64>) -> (f64, f64, TargetMatch) {
    let Some(t) = target else {
        return (points[0].0, points[0].1, TargetMatch::Exact);
    };
    let lt = t.log10();
    let mut best = points[0];
    for p in points.iter().skip(1) {
        if (p.0.log10() - lt).abs() < (best.0.log10() - lt).abs() {
            best = *p;
        }
    }
    let m = if ((best.0 - t) / t).abs() < 1e-9 {
        TargetMatch::Exact
    } else {
        TargetMatch::Nearest { requested: t }
    };
    (best.0, best.1, m)
}
