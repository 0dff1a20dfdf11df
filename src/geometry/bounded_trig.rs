//! Sine and cosine for bounded arguments, cheaper than the C library's (no large-argument
//! reduction, no call): the pass search's predicted skip ([`super::passes`]: angles of at most a
//! few tens of radians), and the station's noise set-up, which evaluates millions of them on
//! angles within ±2π: the terrain integral's quadrature nodes and azimuth offsets
//! ([`crate::noise::terrain`]), the antenna-noise rings ([`crate::noise::antenna_table`]) and
//! the Sun's and Moon's disk coupling ([`crate::noise::disk`]).
//!
//! Method (standard argument reduction and minimax polynomials; the coefficients are those of
//! fdlibm's `k_sin.c` / `k_cos.c` and its `pio2_1` / `pio2_1t` of `e_rem_pio2.c` (Sun
//! Microsystems, 1993), confirmed digit for digit against musl's copies (`src/math/__sin.c`,
//! `__cos.c`, `__rem_pio2.c`), and checked against the standard library's `sin`/`cos` in the
//! tests): x = n π/2 + r with n the nearest
//! integer to 2x/π and |r| <= π/4, r computed in two parts (Cody-Waite: π/2's first 33 bits,
//! then the rest; for |x| <= [`MAX_ARGUMENT`] the product n × first part and the difference
//! x - n × first part are exact), then odd/even polynomials in r of degree 13/12, and the
//! quadrant from n mod 4.
//!
//! Valid for |x| <= [`MAX_ARGUMENT`]; absolute error below [`MAX_ERROR`] there (the test sweeps
//! the whole range against the standard library). Outside it the standard library is used.

// The constants are written with the digits of their source (more than a double holds).
#![allow(clippy::excessive_precision)]

/// Largest |x| (rad) of the fast path.
pub const MAX_ARGUMENT: f64 = 1024.0;
/// Bound on the absolute error of [`sin_cos`] against the exact sine and cosine, checked in the
/// tests against the standard library (itself within 1 ulp, 1.1e-16 here): 4 ulp of 1.
pub const MAX_ERROR: f64 = 9e-16;

const FRAC_2_PI: f64 = std::f64::consts::FRAC_2_PI;
/// π/2 to 33 bits, and π/2 less that.
const PIO2_HI: f64 = 1.570_796_326_734_125_614_17;
const PIO2_LO: f64 = 6.077_100_506_506_192_249_32e-11;

const S1: f64 = -1.666_666_666_666_663_243_48e-1;
const S2: f64 = 8.333_333_333_322_489_461_24e-3;
const S3: f64 = -1.984_126_982_985_794_931_34e-4;
const S4: f64 = 2.755_731_370_707_006_767_89e-6;
const S5: f64 = -2.505_076_025_340_686_341_95e-8;
const S6: f64 = 1.589_690_995_211_550_102_21e-10;

const C1: f64 = 4.166_666_666_666_660_190_37e-2;
const C2: f64 = -1.388_888_888_887_410_957_49e-3;
const C3: f64 = 2.480_158_728_947_672_941_78e-5;
const C4: f64 = -2.755_731_435_139_066_330_35e-7;
const C5: f64 = 2.087_572_321_298_174_827_90e-9;
const C6: f64 = -1.135_964_755_778_819_482_65e-11;

/// 1.5 × 2^52: adding and subtracting it rounds a double of magnitude below 2^51 to the nearest
/// integer (ties to even) with two additions (`f64::round` is a library call on the baseline
/// x86-64 target).
const ROUNDER: f64 = 6_755_399_441_055_744.0;

/// The reduction x = n π/2 + r: (r, n mod 4).
#[inline]
fn reduce(x: f64) -> (f64, i64) {
    let n = (x * FRAC_2_PI + ROUNDER) - ROUNDER;
    let r = (x - n * PIO2_HI) - n * PIO2_LO;
    (r, (n as i64) & 3)
}

/// sin r on |r| <= π/4.
#[inline]
fn sin_poly(r: f64) -> f64 {
    let z = r * r;
    r + r * z * (S1 + z * (S2 + z * (S3 + z * (S4 + z * (S5 + z * S6)))))
}

/// cos r on |r| <= π/4.
#[inline]
fn cos_poly(r: f64) -> f64 {
    let z = r * r;
    1.0 - 0.5 * z + z * z * (C1 + z * (C2 + z * (C3 + z * (C4 + z * (C5 + z * C6)))))
}

/// (sin x, cos x).
#[inline]
pub fn sin_cos(x: f64) -> (f64, f64) {
    if !fast(x) {
        return x.sin_cos();
    }
    let (r, q) = reduce(x);
    let (s, c) = (sin_poly(r), cos_poly(r));
    match q {
        0 => (s, c),
        1 => (c, -s),
        2 => (-s, -c),
        _ => (-c, s),
    }
}

/// sin x (one polynomial) as cos(x + 3π/2), which is cos(x - π/2).
#[inline]
pub fn sin(x: f64) -> f64 {
    if fast(x) {
        cos_turned(x, 3)
    } else {
        x.sin()
    }
}

/// cos x (one polynomial).
#[inline]
pub fn cos(x: f64) -> f64 {
    if fast(x) {
        cos_turned(x, 0)
    } else {
        x.cos()
    }
}

/// `x` is in the fast range (and not NaN).
#[inline]
fn fast(x: f64) -> bool {
    x.abs() <= MAX_ARGUMENT
}

/// cos(x + turns π/2) for `x` in the fast range.
#[inline]
fn cos_turned(x: f64, turns: i64) -> f64 {
    let (r, q) = reduce(x);
    match (q + turns) & 3 {
        0 => cos_poly(r),
        1 => -sin_poly(r),
        2 => -cos_poly(r),
        _ => sin_poly(r),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Against the standard library over the whole fast range, the quadrant edges and a dense
    /// sweep of the range the pass search uses (0 to 20 rad).
    #[test]
    fn matches_the_standard_library() {
        let check = |x: f64| {
            let (s, c) = sin_cos(x);
            assert!(
                (s - x.sin()).abs() <= MAX_ERROR,
                "sin {x:e}: {s:e} {:e}",
                x.sin()
            );
            assert!(
                (c - x.cos()).abs() <= MAX_ERROR,
                "cos {x:e}: {c:e} {:e}",
                x.cos()
            );
            assert!((cos(x) - x.cos()).abs() <= MAX_ERROR, "cos {x:e}");
            assert_eq!(sin(x).to_bits(), s.to_bits(), "sin {x:e}");
        };
        for k in -2600..=2600 {
            let edge = f64::from(k) * std::f64::consts::FRAC_PI_4;
            for d in [-1e-12, -1e-15, 0.0, 1e-15, 1e-12] {
                check(edge + d);
            }
        }
        for i in 0..2_000_000 {
            check(f64::from(i) * 1e-5);
        }
        let mut x = 0x9e37_79b9_7f4a_7c15u64;
        for _ in 0..1_000_000 {
            x ^= x << 13;
            x ^= x >> 7;
            x ^= x << 17;
            let unit = (x >> 11) as f64 / (1u64 << 53) as f64;
            check((2.0 * unit - 1.0) * MAX_ARGUMENT);
        }
        for x in [0.0, -0.0, 1e-300, MAX_ARGUMENT, -MAX_ARGUMENT, 2e3, 1e10] {
            check(x);
        }
        assert!(sin_cos(f64::NAN).0.is_nan());
        assert!(sin(f64::NAN).is_nan() && cos(f64::NAN).is_nan());
    }
}
