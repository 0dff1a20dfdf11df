//! Engineering-unit text for the quantities an operator reads: rates, volumes, bandwidths and
//! frequencies, with about three significant digits and an SI prefix chosen from the value
//! (`19.2 kbit/s`, `2.5 Mbit/s`, `31.2 Gbit`, `375 MHz`). One owner for every table, note and
//! chart, so a 9.6 kbit/s link never prints as "0 Mb/s".

/// `1 pass`, `2 passes`, `0 stations`: a count with its noun (English plural: `-es` after an
/// `s`), for every line that counts (the `station(s)` form read `1 station(s)`).
pub fn counted(n: usize, noun: &str) -> String {
    match (n, noun.ends_with('s')) {
        (1, _) => format!("1 {noun}"),
        (_, true) => format!("{n} {noun}es"),
        (_, false) => format!("{n} {noun}s"),
    }
}

/// A display unit for bit volumes chosen from the largest value to show: (divisor, unit name).
pub fn volume_unit(max_bits: f64) -> (f64, &'static str) {
    prefixed(max_bits, ["bit", "kbit", "Mbit", "Gbit", "Tbit"])
}

/// A display unit for rates chosen from the largest value to show: (divisor, unit name).
pub fn rate_unit(max_bps: f64) -> (f64, &'static str) {
    prefixed(max_bps, ["bit/s", "kbit/s", "Mbit/s", "Gbit/s", "Tbit/s"])
}

/// A display unit for frequencies and bandwidths: (divisor, unit name).
pub fn hertz_unit(max_hz: f64) -> (f64, &'static str) {
    prefixed(max_hz, ["Hz", "kHz", "MHz", "GHz", "THz"])
}

fn prefixed(max: f64, names: [&'static str; 5]) -> (f64, &'static str) {
    let a = max.abs();
    let (mut div, mut i) = (1.0, 0);
    while i + 1 < names.len() && a >= div * 1e3 {
        div *= 1e3;
        i += 1;
    }
    (div, names[i])
}

/// A volume: `31.2 Gbit`, `850 Mbit`, `9.6 kbit`.
pub fn volume(bits: f64) -> String {
    with_unit(bits, volume_unit(bits))
}

/// A rate: `50 Mbit/s`, `1.5 Mbit/s`, `19.2 kbit/s`.
pub fn rate(bps: f64) -> String {
    with_unit(bps, rate_unit(bps))
}

/// A bandwidth or frequency: `375 MHz`, `25 kHz`, `8.2 GHz`.
pub fn hertz(hz: f64) -> String {
    with_unit(hz, hertz_unit(hz))
}

/// A carrier frequency in MHz, the trade's unit, with its decimals: `437.5 MHz`, `8212.5 MHz`.
pub fn frequency_mhz(hz: f64) -> String {
    if !hz.is_finite() {
        return "n/a".into();
    }
    let s = format!("{:.3}", hz / 1e6);
    format!("{} MHz", s.trim_end_matches('0').trim_end_matches('.'))
}

/// A budget line's value in a unit of Hz, bit/s or baud, from 10^4 up, with an SI prefix and
/// five significant digits (`8.2125 GHz`, `22.87 Mbit/s`, `11.435 Mbaud`): the budget keeps more
/// digits than a table of many passes. `None` for other units, smaller or non-finite values
/// (printed as they are).
pub fn budget_value(x: f64, unit: &str) -> Option<(String, &'static str)> {
    let names = match unit {
        "Hz" => ["Hz", "kHz", "MHz", "GHz", "THz"],
        "bit/s" => ["bit/s", "kbit/s", "Mbit/s", "Gbit/s", "Tbit/s"],
        "baud" => ["baud", "kbaud", "Mbaud", "Gbaud", "Tbaud"],
        _ => return None,
    };
    if !x.is_finite() || x.abs() < 1e4 {
        return None;
    }
    let (div, name) = prefixed(x, names);
    let v = x / div;
    // five significant digits: 1 <= |v| < 1000 here
    let decimals = 4 - v.abs().log10().floor().clamp(0.0, 2.0) as usize;
    let s = format!("{v:.decimals$}");
    let s = s.trim_end_matches('0').trim_end_matches('.').to_string();
    Some((s, name))
}

fn with_unit(x: f64, (div, unit): (f64, &str)) -> String {
    if !x.is_finite() {
        return "n/a".into();
    }
    format!("{} {unit}", three_digits(x / div))
}

/// A number in a unit chosen elsewhere (a table column), with about three significant digits:
/// 31.2, 850, 1.5, 0.25, 0.0012.
pub fn three_digits(x: f64) -> String {
    if !x.is_finite() {
        return "n/a".into();
    }
    let a = x.abs();
    let decimals = if a == 0.0 || a >= 100.0 {
        0
    } else {
        // digits after the point for three significant digits
        (2 - a.log10().floor() as i32).clamp(0, 9) as usize
    };
    let s = fixed(x, decimals);
    let s = if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s
    };
    if s == "-0" {
        "0".into()
    } else {
        s
    }
}

/// `x` with `decimals` digits after the point: the same text as `format!("{x:.decimals$}")`
/// (the sign of a negative zero kept, ties of the exact binary value to even), without the
/// standard library's exact-decimal conversion for the tables' ordinary values. A value whose
/// scaled fraction lies within the product's rounding error of a tie, or one too large for
/// whole-number arithmetic, takes the standard formatter.
pub fn fixed(x: f64, decimals: usize) -> String {
    let mut s = String::new();
    push_fixed(&mut s, x, decimals);
    s
}

/// An azimuth with `decimals` digits after the point, in [0, 360): [`fixed`] of the azimuth taken
/// modulo 360, and `0` where that text would read 360 (359.7 deg to whole degrees is `0`, the
/// same direction).
pub fn azimuth(azimuth_deg: f64, decimals: usize) -> String {
    // + 0.0: a negative zero is written as 0
    let text = fixed(azimuth_deg.rem_euclid(360.0) + 0.0, decimals);
    match text.starts_with("360") {
        true => fixed(0.0, decimals),
        false => text,
    }
}

/// [`fixed`] appended to `s`.
fn push_fixed(s: &mut String, x: f64, decimals: usize) {
    use std::fmt::Write;
    const POW10: [f64; 10] = [1.0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9];
    // Whole numbers below 2^52 and their fractions are exact in f64.
    const LIMIT: f64 = 4.0e15;
    let scaled = x.abs() * POW10.get(decimals).copied().unwrap_or(f64::INFINITY);
    // The product is within half an ulp of the exact one: |exact - scaled| <= scaled * 2^-53.
    // Away from a tie by more than that, both round to the same whole number.
    let whole = scaled.floor();
    let fraction = scaled - whole;
    // NaN, infinities and large values fail the range test and take the standard formatter.
    let in_range = scaled < LIMIT;
    if !in_range || (fraction - 0.5).abs() <= scaled * 2.3e-16 + f64::MIN_POSITIVE {
        let _ = write!(s, "{x:.decimals$}");
        return;
    }
    let mut k = whole as u64 + u64::from(fraction > 0.5);
    if x.is_sign_negative() {
        s.push('-');
    }
    // The digits from the last, at least one before the point.
    let mut digits = [0u8; 24];
    let mut n = 0;
    loop {
        digits[n] = b'0' + (k % 10) as u8;
        k /= 10;
        n += 1;
        if k == 0 && n > decimals {
            break;
        }
    }
    s.extend(digits[decimals..n].iter().rev().map(|&d| char::from(d)));
    if decimals > 0 {
        s.push('.');
        s.extend(digits[..decimals].iter().rev().map(|&d| char::from(d)));
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Azimuths as written are in [0, 360) at every precision (the convention of azimuth measured
    /// clockwise from north; a behaviour check, common practice): 360 was printed before.
    #[test]
    fn azimuths_are_written_below_360() {
        assert_eq!(azimuth(359.7, 0), "0");
        assert_eq!(azimuth(359.4, 0), "359");
        assert_eq!(azimuth(359.96, 1), "0.0");
        assert_eq!(azimuth(359.94, 1), "359.9");
        assert_eq!(azimuth(359.99996, 4), "0.0000");
        assert_eq!(azimuth(-0.0, 2), "0.00");
        assert_eq!(azimuth(-30.0, 0), "330");
        assert_eq!(azimuth(720.25, 2), "0.25");
    }

    /// The counts in English (a behaviour check; no published reference applies): `1 passes`,
    /// `1 antennas` and `3 station(s)` were printed before.
    #[test]
    fn counts_take_their_plural() {
        assert_eq!(counted(1, "pass"), "1 pass");
        assert_eq!(counted(0, "pass"), "0 passes");
        assert_eq!(counted(1, "antenna"), "1 antenna");
        assert_eq!(counted(3, "station"), "3 stations");
        assert_eq!(counted(2, "sky chart"), "2 sky charts");
    }

    // The expected strings follow SI prefix usage (BIPM SI Brochure, 9th ed., section 3);
    // three significant digits is common practice for operator tables.
    #[test]
    fn budget_values_keep_five_digits() {
        let f = |x: f64, u: &str| budget_value(x, u).map(|(v, n)| format!("{v} {n}"));
        assert_eq!(f(8_212_500_000.0, "Hz").as_deref(), Some("8.2125 GHz"));
        assert_eq!(f(22_869_955.0, "bit/s").as_deref(), Some("22.87 Mbit/s"));
        assert_eq!(f(11_434_978.0, "baud").as_deref(), Some("11.435 Mbaud"));
        assert_eq!(f(95_581_863.0, "bit/s").as_deref(), Some("95.582 Mbit/s"));
        assert_eq!(f(10_000_000.0, "bit/s").as_deref(), Some("10 Mbit/s"));
        assert_eq!(f(437_500_000.0, "Hz").as_deref(), Some("437.5 MHz"));
        assert_eq!(f(9600.0, "bit/s"), None);
        assert_eq!(f(4000.0, "Hz"), None);
        assert_eq!(f(1e9, "dB"), None);
        assert_eq!(f(f64::NAN, "Hz"), None);
    }

    #[test]
    fn rates_keep_their_digits() {
        assert_eq!(rate(50e6), "50 Mbit/s");
        assert_eq!(rate(2.5e6), "2.5 Mbit/s");
        assert_eq!(rate(250e3), "250 kbit/s");
        assert_eq!(rate(19.2e3), "19.2 kbit/s");
        assert_eq!(rate(9600.0), "9.6 kbit/s");
        assert_eq!(rate(1200.0), "1.2 kbit/s");
        assert_eq!(rate(300.0), "300 bit/s");
        assert_eq!(rate(133.7e6), "134 Mbit/s");
        assert_eq!(rate(1.2e9), "1.2 Gbit/s");
    }

    #[test]
    fn volumes_and_bandwidths() {
        assert_eq!(volume(31.24e9), "31.2 Gbit");
        assert_eq!(volume(850e6), "850 Mbit");
        assert_eq!(volume(10.35e12), "10.3 Tbit");
        assert_eq!(volume(0.0), "0 bit");
        assert_eq!(hertz(375e6), "375 MHz");
        assert_eq!(hertz(25e3), "25 kHz");
        assert_eq!(hertz(11.52e3), "11.5 kHz");
        assert_eq!(volume(f64::NAN), "n/a");
        assert_eq!(frequency_mhz(437.5e6), "437.5 MHz");
        assert_eq!(frequency_mhz(8212.5e6), "8212.5 MHz");
        assert_eq!(frequency_mhz(2.2e9), "2200 MHz");
    }

    /// Reference: the standard library's `{:.N}` formatting (exact decimal value, ties to
    /// even) over wide random values, near-ties and edge cases.
    #[test]
    fn fixed_matches_the_standard_formatter() {
        let cases = [
            0.0,
            -0.0,
            0.05,
            0.25,
            -0.25,
            0.35,
            2.5,
            3.5,
            -0.04,
            0.125,
            1e-300,
            9.95,
            99.95,
            0.045,
            1.005,
            4.0e15,
            3.9e15,
            1e16,
            -1e20,
            f64::MAX,
            f64::MIN_POSITIVE,
            f64::NAN,
            f64::INFINITY,
            f64::NEG_INFINITY,
            123456.789,
            8212.5,
        ];
        for x in cases {
            for d in 0..12 {
                assert_eq!(fixed(x, d), format!("{x:.d$}"), "{x:e} with {d} decimals");
            }
        }
        // Deterministic pseudo-random values over many magnitudes (a 64-bit LCG, Knuth's
        // MMIX constants), and the halves and near-halves of their scaled values.
        let mut rng = crate::test_rng::Lcg::new();
        for _ in 0..200_000 {
            let state = rng.next_u64();
            let mantissa = crate::test_rng::Lcg::unit_of(state);
            let exponent = ((state >> 3) % 40) as i32 - 20;
            let sign = if state & 1 == 0 { 1.0 } else { -1.0 };
            let x = sign * mantissa * 10f64.powi(exponent);
            let d = (state >> 7) as usize % 10;
            assert_eq!(fixed(x, d), format!("{x:.d$}"), "{x:e} with {d} decimals");
            let p = 10f64.powi(d as i32);
            let tie = ((x * p).trunc() + 0.5) / p;
            for y in [
                tie,
                f64::from_bits(tie.to_bits() + 1),
                f64::from_bits(tie.to_bits() - 1),
            ] {
                assert_eq!(fixed(y, d), format!("{y:.d$}"), "{y:e} with {d} decimals");
            }
        }
    }

    #[test]
    fn bare_numbers() {
        assert_eq!(three_digits(0.25), "0.25");
        assert_eq!(three_digits(0.0012), "0.0012");
        assert_eq!(three_digits(0.001234), "0.00123");
        assert_eq!(three_digits(-0.0001), "-0.0001");
        assert_eq!(three_digits(1234.4), "1234");
        assert_eq!(three_digits(-0.0), "0");
    }
}
