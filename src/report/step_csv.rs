//! The per-pass time-series CSV written straight into one byte buffer: the same bytes as
//! serializing [`super::plan::StepRow`]s with the `csv` crate ([`super::to_csv`]), at a fraction
//! of the cost (no row structs, no time strings, no scheme-name copies, fixed-decimal numbers).
//!
//! Numbers: a value rounded to `d` decimals is `k / 10^d` for a whole `k`; while `|k| < 10^15`
//! (at most 15 significant digits) and the value is 0 or at least 1e-5, the shortest decimal
//! that reads back as the rounded value (what `ryu`, the `csv` crate's float writer, prints) is
//! `k / 10^d` itself with its trailing zeros cut: the next decimal of 15 digits or fewer lies at
//! least 1e-15 of the value away, farther than the half-ulp (1.1e-16 of the value) within which a
//! decimal reads back as the same double. So [`push_rounded`] writes the digits of `k` directly
//! (`12.5`, `0.0001`, `300.0`), and hands every other value (below 1e-5: `ryu` then writes an
//! exponent; huge, infinite or NaN) to `ryu`. `tests::fixed_matches_ryu` checks this against
//! `ryu` itself.

use super::plan::CAUTION;
use super::round;
use crate::plan::prepare::RateSet;
use crate::plan::series::Step;
use crate::plan::PassSeries;
use chrono::{DateTime, Datelike, Timelike, Utc};

/// The header row, in the field order of [`super::plan::StepRow`].
pub const STEP_HEADER: &str = "time,t_s,azimuth_deg,elevation_deg,range_km,range_rate_km_s,doppler_hz,off_nadir_deg,eirp_dbw,free_space_loss_db,atmospheric_loss_db,sky_temperature_k,sky_noise_k,ground_noise_k,man_made_noise_k,sun_noise_k,moon_noise_k,receiver_noise_k,antenna_temperature_k,system_temperature_k,g_over_t_db_k,cn0_dbhz,sun_separation_deg,moon_separation_deg,rate_bps,ebn0_db,margin_db,closed,tracked,adaptive_scheme,adaptive_rate_bps,rain_atmospheric_loss_db,rain_sky_noise_k,rain_ground_noise_k,rain_sun_noise_k,rain_moon_noise_k,rain_antenna_temperature_k,rain_system_temperature_k,rain_cn0_dbhz,rain_margin_db";

/// Bytes of one row of the shipped example, rounded up (to size the buffer once).
const ROW_BYTES: usize = 340;

const POW10: [f64; 7] = [1.0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6];

/// Write `round(x, decimals)` as the `csv` crate writes that `f64` (see the module note).
pub fn push_rounded(buf: &mut Vec<u8>, x: f64, decimals: usize) {
    // Zero (either sign) first: a fifth of a pass's noise terms are exactly 0 (no man-made noise,
    // the Moon and often the Sun out of the beam's reach), written as the digits below would.
    if x == 0.0 {
        buf.extend_from_slice(b"0.0");
        return;
    }
    let scaled = x * POW10[decimals];
    // (an infinity fails the second test)
    if scaled.is_nan() || scaled.abs() >= 1e15 {
        push_rounded_slow(buf, x, decimals);
        return;
    }
    // `scaled.round()` without the library call: below 2^53 the fraction `scaled - trunc` is
    // exact, and halves go away from zero as `f64::round` takes them.
    let whole = scaled as i64;
    let frac = scaled - whole as f64;
    let k = whole + i64::from(frac >= 0.5) - i64::from(frac <= -0.5);
    if k != 0 && (k as f64 / POW10[decimals]).abs() < 1e-5 {
        push_ryu(buf, k as f64 / POW10[decimals] + 0.0);
        return;
    }
    // The trailing zeros of the decimals are cut (`300.0`: one zero kept); the digits are then
    // written right to left, two per step from a table, into a stack buffer copied once: the
    // decimals padded to their width, the point, the whole part (at least `0`), the sign.
    let mut n = k.unsigned_abs();
    let mut width = decimals;
    while width > 0 && n.is_multiple_of(10) {
        n /= 10;
        width -= 1;
    }
    // Division by a constant per width (a multiply and a shift, not a hardware divide).
    let (whole, frac) = match width {
        0 => (n, 0),
        1 => (n / 10, n % 10),
        2 => (n / 100, n % 100),
        3 => (n / 1_000, n % 1_000),
        4 => (n / 10_000, n % 10_000),
        5 => (n / 100_000, n % 100_000),
        _ => (n / 1_000_000, n % 1_000_000),
    };
    // At most a sign, 15 digits, a point and a kept zero.
    let mut out = [b'0'; 24];
    let mut at = out.len();
    if width == 0 {
        at -= 1; // the kept zero
    } else {
        at = write_digits(&mut out, at, frac, width);
    }
    at -= 1;
    out[at] = b'.';
    at = write_digits(&mut out, at, whole, 1);
    if k < 0 {
        at -= 1;
        out[at] = b'-';
    }
    buf.extend_from_slice(&out[at..]);
}

/// The two-digit groups 00 to 99.
const DIGIT_PAIRS: &[u8; 200] = b"\
0001020304050607080910111213141516171819\
2021222324252627282930313233343536373839\
4041424344454647484950515253545556575859\
6061626364656667686970717273747576777879\
8081828384858687888990919293949596979899";

/// Writes the digits of `n` ending before `end` of `out` (which holds `'0'` bytes), at least
/// `min_digits` of them (the leading ones zeros), and returns where they begin.
#[inline(always)]
fn write_digits(out: &mut [u8; 24], end: usize, mut n: u64, min_digits: usize) -> usize {
    let mut at = end;
    while n >= 100 {
        let pair = (n % 100) as usize * 2;
        n /= 100;
        at -= 2;
        out[at..at + 2].copy_from_slice(&DIGIT_PAIRS[pair..pair + 2]);
    }
    if n >= 10 {
        let pair = n as usize * 2;
        at -= 2;
        out[at..at + 2].copy_from_slice(&DIGIT_PAIRS[pair..pair + 2]);
    } else if n > 0 || at == end {
        at -= 1;
        out[at] = b'0' + n as u8;
    }
    // The leading zeros are already in `out`.
    at.min(end - min_digits)
}

/// [`push_rounded`] for values outside the fixed-decimal range: `ryu` on the rounded value.
fn push_rounded_slow(buf: &mut Vec<u8>, x: f64, decimals: usize) {
    let k = (x * POW10[decimals]).round();
    push_ryu(buf, k / POW10[decimals] + 0.0);
}

/// A float as the `csv` crate writes it (`ryu`).
pub(crate) fn push_ryu(buf: &mut Vec<u8>, x: f64) {
    buf.extend_from_slice(ryu::Buffer::new().format(x).as_bytes());
}

pub(crate) fn push_u64(buf: &mut Vec<u8>, n: u64) {
    let mut out = [b'0'; 24];
    let end = out.len();
    let at = write_digits(&mut out, end, n, 1);
    buf.extend_from_slice(&out[at..]);
}

/// A quantity that is usually whole, as [`super::whole`] serializes it through the `csv` crate.
fn push_whole(buf: &mut Vec<u8>, x: f64) {
    if x.fract() == 0.0 && x.abs() < 9.007_199_254_740_992e15 {
        let n = x as i64;
        if n < 0 {
            buf.push(b'-');
        }
        push_u64(buf, n.unsigned_abs());
    } else {
        push_ryu(buf, x);
    }
}

fn push_opt(buf: &mut Vec<u8>, x: Option<f64>, decimals: usize) {
    if let Some(x) = x {
        push_rounded(buf, x, decimals);
    }
}

/// A text field, quoted as the `csv` crate quotes it (only when it holds `,`, `"`, CR or LF).
pub(crate) fn push_text(buf: &mut Vec<u8>, s: &str) {
    if s.bytes().any(|b| matches!(b, b',' | b'"' | b'\r' | b'\n')) {
        buf.push(b'"');
        for b in s.bytes() {
            if b == b'"' {
                buf.push(b'"');
            }
            buf.push(b);
        }
        buf.push(b'"');
    } else {
        buf.extend_from_slice(s.as_bytes());
    }
}

fn push_2(buf: &mut Vec<u8>, n: u32) {
    buf.extend_from_slice(&[b'0' + (n / 10) as u8, b'0' + (n % 10) as u8]);
}

/// `aos + t_s` as [`crate::timefmt::format_ms`] writes it (`2026-12-02T01:23:45.678Z`): the
/// offset rounded to the microsecond, the milliseconds cut. Years outside 0-9999 and leap
/// seconds go through `format_ms` itself.
fn push_time(buf: &mut Vec<u8>, aos: &DateTime<Utc>, t_s: f64) {
    let t = crate::timefmt::add_seconds(aos, t_s);
    // The fields from the naive UTC time: each of `DateTime`'s own getters applies the offset
    // again.
    let n = t.naive_utc();
    let year = n.year();
    if !(0..=9999).contains(&year) || n.nanosecond() >= 1_000_000_000 {
        buf.extend_from_slice(crate::timefmt::format_ms(&t).as_bytes());
        return;
    }
    let y = year as u32;
    push_2(buf, y / 100);
    push_2(buf, y % 100);
    buf.push(b'-');
    push_2(buf, n.month());
    buf.push(b'-');
    push_2(buf, n.day());
    buf.push(b'T');
    push_2(buf, n.hour());
    buf.push(b':');
    push_2(buf, n.minute());
    buf.push(b':');
    push_2(buf, n.second());
    let ms = n.nanosecond() / 1_000_000;
    buf.extend_from_slice(&[
        b'.',
        b'0' + (ms / 100) as u8,
        b'0' + (ms / 10 % 10) as u8,
        b'0' + (ms % 10) as u8,
        b'Z',
    ]);
}

pub(crate) fn push_bool(buf: &mut Vec<u8>, b: bool) {
    buf.extend_from_slice(if b { b"true" } else { b"false" });
}

/// The `#` lines that open every CSV output, as [`super::to_csv`] writes them: the caution, then
/// one `# warning: ...` line per warning (line breaks inside a warning become spaces).
pub(crate) fn push_comment_lines(buf: &mut Vec<u8>, warnings: &[String]) {
    buf.extend_from_slice(b"# ");
    buf.extend_from_slice(CAUTION.as_bytes());
    buf.push(b'\n');
    for w in warnings {
        buf.extend_from_slice(b"# warning: ");
        buf.extend_from_slice(w.replace(['\n', '\r'], " ").as_bytes());
        buf.push(b'\n');
    }
}

/// The whole time-series CSV of one pass: the caution and warning comment lines, the header and
/// one row per step, byte for byte what [`super::to_csv`] gives for
/// [`super::plan::step_rows`].
pub fn pass_csv(series: &PassSeries, rates: &RateSet, warnings: &[String]) -> Vec<u8> {
    let mut buf = Vec::with_capacity(1024 + series.steps.len() * ROW_BYTES);
    push_comment_lines(&mut buf, warnings);
    if series.steps.is_empty() {
        return buf;
    }
    buf.extend_from_slice(STEP_HEADER.as_bytes());
    buf.push(b'\n');
    let (_, o) = rates.display_option(series.plan.clear.option);
    // The fields that are the same on every row of a scheme (the fixed rate; each adaptive
    // option's name and rate), written once per pass.
    let mut fixed_rate = Vec::new();
    push_whole(&mut fixed_rate, o.rate_bps);
    let adaptive: Vec<Vec<u8>> = rates
        .adaptive
        .iter()
        .map(|a| {
            let mut b = Vec::new();
            push_text(&mut b, &a.scheme);
            b.push(b',');
            push_whole(&mut b, round(a.rate_bps, 1));
            b
        })
        .collect();
    let (ebn0_db, margin_db) = (o.ebn0_at(), o.margin_at());
    let aos = series.plan.pass.aos;
    for (i, s) in series.steps.iter().enumerate() {
        let a = series
            .adaptive
            .get(i)
            .copied()
            .flatten()
            .map(|j| &adaptive[j as usize]);
        push_step(&mut buf, &aos, s);
        buf.extend_from_slice(&fixed_rate);
        buf.push(b',');
        push_rounded(&mut buf, ebn0_db(s.cn0_dbhz), 4);
        buf.push(b',');
        push_rounded(&mut buf, margin_db(s.cn0_dbhz), 4);
        buf.push(b',');
        push_bool(&mut buf, series.counted(i));
        buf.push(b',');
        push_bool(&mut buf, !s.untracked);
        buf.push(b',');
        match a {
            Some(a) => buf.extend_from_slice(a),
            None => buf.push(b','),
        }
        let r = s.rain;
        for (x, d) in [
            (r.map(|r| r.atmospheric_loss_db), 4),
            (r.map(|r| r.sky_noise_k), 3),
            (r.map(|r| r.ground_noise_k), 3),
            (r.map(|r| r.sun_noise_k), 3),
            (r.map(|r| r.moon_noise_k), 3),
            (r.map(|r| r.antenna_temperature_k), 3),
            (r.map(|r| r.system_temperature_k), 3),
            (r.map(|r| r.cn0_dbhz), 4),
            (r.map(|r| margin_db(r.cn0_dbhz)), 4),
        ] {
            buf.push(b',');
            push_opt(&mut buf, x, d);
        }
        buf.push(b'\n');
    }
    buf
}

/// The fields of a step from `time` to `moon_separation_deg`, each followed by a comma.
fn push_step(buf: &mut Vec<u8>, aos: &DateTime<Utc>, s: &Step) {
    push_time(buf, aos, s.t_s);
    for (x, d) in [
        (s.t_s, 3),
        (super::round_azimuth(s.azimuth_deg, 4), 4),
        (s.elevation_deg, 4),
        (s.range_km, 4),
        (s.range_rate_km_s, 6),
        (s.doppler_hz, 1),
        (s.off_nadir_deg, 4),
        (s.eirp_dbw, 4),
        (s.free_space_loss_db, 4),
        (s.atmospheric_loss_db, 4),
        (s.sky_temperature_k, 3),
        (s.sky_noise_k, 3),
        (s.ground_noise_k, 3),
        (s.man_made_noise_k, 3),
        (s.sun_noise_k, 3),
        (s.moon_noise_k, 3),
        (s.receiver_noise_k, 3),
        (s.antenna_temperature_k, 3),
        (s.system_temperature_k, 3),
        (s.g_over_t_db_k, 4),
        (s.cn0_dbhz, 4),
    ] {
        buf.push(b',');
        push_rounded(buf, x, d);
    }
    buf.push(b',');
    push_opt(buf, s.sun_separation_deg, 3);
    buf.push(b',');
    push_opt(buf, s.moon_separation_deg, 3);
    buf.push(b',');
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Reference: the `csv` crate's own float writer (`ryu`) on the rounded value.
    fn reference(x: f64, d: usize) -> String {
        ryu::Buffer::new().format(round(x, d as i32)).to_string()
    }

    fn fast(x: f64, d: usize) -> String {
        let mut b = Vec::new();
        push_rounded(&mut b, x, d);
        String::from_utf8(b).unwrap()
    }

    /// The fixed-decimal writer against `ryu` (the `csv` crate's float writer) over values of
    /// every magnitude the time series holds and beyond, edge values included.
    #[test]
    fn fixed_matches_ryu() {
        let edges = [
            0.0,
            -0.0,
            1e-7,
            -1e-7,
            4.9e-6,
            5e-6,
            9.99e-6,
            1e-5,
            1.5e-5,
            0.00005,
            0.0001,
            0.5,
            -0.5,
            1.0,
            10.0,
            123.45,
            -123.4567,
            99999.99995,
            1e11,
            1e14,
            9.99e14,
            1e15,
            1e16,
            1e20,
            f64::MAX,
            f64::MIN_POSITIVE,
            f64::INFINITY,
            f64::NEG_INFINITY,
            f64::NAN,
            2.675,
            1.0005,
            0.30000000000000004,
            // exact halves after scaling (rounded away from zero, as `f64::round` does)
            0.25,
            -0.25,
            0.125,
            -0.125,
            0.0625,
            -2.5e-6,
            4503599627.3705,
            -999_999_999.999_999_5,
        ];
        for &x in &edges {
            for d in 0..=6 {
                assert_eq!(fast(x, d), reference(x, d), "x = {x:e}, {d} decimals");
            }
        }
        // A deterministic sweep (64-bit LCG) over magnitudes 1e-8 to 1e12 and both signs.
        let mut rng = crate::test_rng::Lcg::new();
        for _ in 0..400_000 {
            let state = rng.next_u64();
            let unit = crate::test_rng::Lcg::unit_of(state);
            let exp = ((state >> 3) % 21) as i32 - 8;
            let sign = if state & 1 == 0 { 1.0 } else { -1.0 };
            let x = sign * unit * 10f64.powi(exp);
            let d = (state >> 59) as usize % 7;
            assert_eq!(fast(x, d), reference(x, d), "x = {x:e}, {d} decimals");
        }
    }

    /// The whole-number writer against the standard library's integer formatting (the reference
    /// it must equal) at its digit-count edges and extremes.
    #[test]
    fn whole_numbers_match_to_string() {
        for n in [
            0,
            9,
            10,
            99,
            100,
            101,
            12_345,
            10u64.pow(19),
            u64::MAX - 1,
            u64::MAX,
        ] {
            let mut b = Vec::new();
            push_u64(&mut b, n);
            assert_eq!(String::from_utf8(b).unwrap(), n.to_string());
        }
    }

    #[test]
    fn whole_and_text_fields() {
        let mut b = Vec::new();
        push_whole(&mut b, 50e6);
        b.push(b' ');
        push_whole(&mut b, 9600.5);
        b.push(b' ');
        push_text(&mut b, "a,\"b\"");
        assert_eq!(
            String::from_utf8(b).unwrap(),
            "50000000 9600.5 \"a,\"\"b\"\"\""
        );
    }

    #[test]
    fn times_match_format_ms() {
        let aos = crate::timefmt::parse_utc("2026-12-31T23:59:58.9995Z").unwrap();
        for t_s in [0.0, 0.0004, 0.0006, 1.0, 1.25, 86_400.5, 3.0e7] {
            let mut b = Vec::new();
            push_time(&mut b, &aos, t_s);
            let want = crate::timefmt::format_ms(&crate::timefmt::add_seconds(&aos, t_s));
            assert_eq!(String::from_utf8(b).unwrap(), want, "t_s {t_s}");
        }
    }
}
