//! Engineering-unit text for the quantities an operator reads: rates, volumes, bandwidths and
//! frequencies, with about three significant digits and an SI prefix chosen from the value
//! (`19.2 kbit/s`, `2.5 Mbit/s`, `31.2 Gbit`, `375 MHz`). One owner for every table, note and
//! chart, so a 9.6 kbit/s link never prints as "0 Mb/s".

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
    let s = format!("{x:.decimals$}");
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

#[cfg(test)]
mod tests {
    use super::*;

    // The expected strings follow SI prefix usage (BIPM SI Brochure, 9th ed., section 3);
    // three significant digits is common practice for operator tables.
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
