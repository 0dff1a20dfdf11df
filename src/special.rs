//! Special functions for error-rate work: the complementary error function,
//! its inverse, and the Gaussian tail function Q.
//!
//! Methods (standard numerical analysis, e.g. Abramowitz & Stegun, *Handbook of
//! Mathematical Functions*, 1964, eqs 7.1.6 and 7.1.14):
//! * `0 <= x < 2.5`: the all-positive series A&S 7.1.6,
//!   erf(x) = 2/sqrt(pi) e^(-x^2) sum_n 2^n x^(2n+1) / (1*3*...*(2n+1)),
//!   then erfc = 1 - erf (relative error of erfc below ~1e-13 on this interval).
//! * `x >= 2.5`: the continued fraction A&S 7.1.14,
//!   erfc(x) = e^(-x^2)/sqrt(pi) * 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + ...)))),
//!   evaluated with the modified Lentz algorithm (relative error ~1e-15).
//! * negative x: erfc(-x) = 2 - erfc(x).
//!
//! Valid for every finite x; erfc underflows to 0 above x ~ 27.

const FRAC_2_SQRT_PI: f64 = std::f64::consts::FRAC_2_SQRT_PI;

/// Complementary error function erfc(x) = 1 - erf(x).
pub fn erfc(x: f64) -> f64 {
    if x.is_nan() {
        return f64::NAN;
    }
    if x < 0.0 {
        return 2.0 - erfc(-x);
    }
    if x < 2.5 {
        1.0 - erf_series(x)
    } else if x < 27.3 {
        erfc_continued_fraction(x)
    } else {
        // erfc(27.3) ~ 1e-325: below the smallest f64 subnormal
        0.0
    }
}

/// Error function erf(x).
pub fn erf(x: f64) -> f64 {
    if x.is_nan() {
        return f64::NAN;
    }
    if x < 0.0 {
        return -erf(-x);
    }
    if x < 2.5 {
        erf_series(x)
    } else {
        1.0 - erfc_continued_fraction(x)
    }
}

// A&S 7.1.6: erf(x) = 2/sqrt(pi) e^(-x^2) sum_{n>=0} 2^n x^(2n+1) / (1*3*...*(2n+1))
fn erf_series(x: f64) -> f64 {
    let x2 = x * x;
    let mut term = x;
    let mut sum = x;
    let mut n = 0.0;
    while n < 200.0 {
        n += 1.0;
        term *= 2.0 * x2 / (2.0 * n + 1.0);
        sum += term;
        if term < sum * 1e-17 {
            break;
        }
    }
    FRAC_2_SQRT_PI * (-x2).exp() * sum
}

// A&S 7.1.14 continued fraction, modified Lentz: f = x + a1/(x + a2/(x + ...)), a_n = n/2.
fn erfc_continued_fraction(x: f64) -> f64 {
    const TINY: f64 = 1e-300;
    let mut f = x;
    let mut c = f;
    let mut d = 0.0;
    let mut n = 0.0;
    while n < 500.0 {
        n += 1.0;
        let a = n / 2.0;
        d = x + a * d;
        if d.abs() < TINY {
            d = TINY;
        }
        d = 1.0 / d;
        c = x + a / c;
        if c.abs() < TINY {
            c = TINY;
        }
        let delta = c * d;
        f *= delta;
        if (delta - 1.0).abs() < 4.0 * f64::EPSILON {
            break;
        }
    }
    0.5 * FRAC_2_SQRT_PI * (-x * x).exp() / f
}

/// Inverse complementary error function: the x with erfc(x) = y, for 0 < y < 2.
///
/// Newton iteration on ln erfc(x) - ln y (ln erfc is concave, so the iteration
/// converges monotonically after the first step), started from the asymptotic
/// form x ~ sqrt(-ln y); relative accuracy ~1e-14. Returns `None` outside (0, 2).
pub fn erfc_inv(y: f64) -> Option<f64> {
    if !(y > 0.0 && y < 2.0) {
        return None;
    }
    if y > 1.0 {
        return erfc_inv(2.0 - y).map(|x| -x);
    }
    if y == 1.0 {
        return Some(0.0);
    }
    let ln_y = y.ln();
    let mut x = (-ln_y).sqrt().max(0.1);
    for _ in 0..100 {
        let e = erfc(x);
        // g(x) = ln erfc(x) - ln y ; g'(x) = -(2/sqrt(pi)) e^(-x^2) / erfc(x)
        let g = e.ln() - ln_y;
        let dg = -FRAC_2_SQRT_PI * (-x * x).exp() / e;
        let step = g / dg;
        let next = (x - step).max(x * 0.5);
        if (next - x).abs() <= 1e-15 * x.abs().max(1.0) {
            return Some(next);
        }
        x = next;
    }
    Some(x)
}

/// Gaussian tail probability Q(x) = 0.5 erfc(x / sqrt 2).
pub fn q_function(x: f64) -> f64 {
    0.5 * erfc(x / std::f64::consts::SQRT_2)
}

/// Inverse of Q: the x with Q(x) = p, for 0 < p < 1. `None` outside (0, 1).
pub fn q_inv(p: f64) -> Option<f64> {
    if !(p > 0.0 && p < 1.0) {
        return None;
    }
    erfc_inv(2.0 * p).map(|x| x * std::f64::consts::SQRT_2)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn erf_erfc_are_complementary_and_symmetric() {
        for x in [-3.0, -1.0, 0.0, 0.3, 1.0, 2.49, 2.51, 4.0] {
            assert!((erf(x) + erfc(x) - 1.0).abs() < 1e-14, "x={x}");
            assert!((erfc(-x) - (2.0 - erfc(x))).abs() < 1e-14);
        }
        // continuity across the method switch at 2.5
        let below = erfc(2.5 - 1e-12);
        let above = erfc(2.5);
        assert!((below - above).abs() / above < 1e-9);
    }

    #[test]
    fn inverse_round_trips() {
        for y in [1e-300, 1e-20, 1e-10, 2e-5, 0.1, 0.5, 1.0, 1.5, 1.999] {
            let x = erfc_inv(y).unwrap();
            assert!((erfc(x) - y).abs() / y < 1e-12, "y={y}");
        }
        assert!(erfc_inv(0.0).is_none());
        assert!(erfc_inv(2.0).is_none());
        assert!(q_inv(1.0).is_none());
    }
}
