//! The ground antenna's reference power pattern for noise: a Gaussian main beam joined to the
//! sidelobe envelope of ITU-R S.465-6, normalized so that it integrates to 4 pi sr.
//!
//! * Main beam (common practice): `G(psi) = G0 exp(-psi^2 / (2 sigma^2))`, sigma =
//!   theta_3dB / sqrt(8 ln 2) (so the beam is 3 dB down at theta_3dB / 2), with the station's peak
//!   gain G0 and half-power beamwidth theta_3dB (`link::antenna::GroundAntenna`).
//! * Sidelobes: Rec. ITU-R S.465-6 (01/2010), "Reference radiation pattern for earth station
//!   antennas in the fixed-satellite service for use in coordination and interference assessment
//!   in the frequency range from 2 to 31 GHz", recommends 2:
//!   `G = 32 - 25 log10(psi)` dBi for psi_min <= psi < 48 deg, `G = -10` dBi for
//!   48 <= psi <= 180 deg, with
//!   `psi_min = max(1 deg, 100 lambda/D)` for D/lambda >= 50 and
//!   `psi_min = max(2 deg, 114 (D/lambda)^-1.09)` for D/lambda < 50.
//!   (Confirmed against two independent open implementations of the Recommendation;
//!   docs/REFERENCES.md §9.) The Recommendation leaves psi < psi_min to the main beam; here the
//!   envelope is held at its psi_min value inside psi_min (a plateau like the first-sidelobe
//!   level of RR Appendix 8) and the pattern is the Gaussian until it first falls below that
//!   held envelope (the join angle psi_j), the envelope beyond.
//! * Normalization: the envelope is an upper bound of the sidelobe peaks, so it holds more power
//!   than a real antenna's sidelobes. The main beam is kept as it is (it fixes the peak gain and
//!   the main-beam efficiency) and the envelope beyond psi_j is scaled by one factor k so that
//!   `(1/4 pi) ∫ G dOmega = 1`, i.e. `(1/2) ∫_0^pi G(psi) sin psi dpsi = 1`, evaluated with the
//!   same quadrature the noise integral uses (so an isotropic sky of T gives T to rounding). If
//!   the Gaussian alone holds more than [`MAX_MAIN_BEAM_FRACTION`] of the power (a peak gain and
//!   beamwidth that do not fit together, e.g. an efficiency near 1 with the 70 lambda/D rule),
//!   its width is reduced until it holds that fraction, and a warning is raised.
//!
//! Validity: S.465-6 is stated for 2-31 GHz; outside it the envelope is used as an estimate and
//! [`PatternWarnings::frequency_outside_envelope_range`] is raised. For small D/lambda (below
//! about 20) psi_min exceeds 30 deg and the envelope is mostly its -10 dBi floor; the Gaussian
//! main beam of a low-gain antenna (a Yagi) is itself an approximation: give a measured pattern
//! (`antenna.noise_pattern`) for such antennas.

use crate::units::{db_to_ratio, ratio_to_db};

/// Highest share of the power the Gaussian main beam may hold before its width is reduced (our
/// choice: it leaves at least 5 % of the power to the sidelobes and the ground, the order of a
/// reflector's spillover and sidelobe loss, common practice).
pub const MAX_MAIN_BEAM_FRACTION: f64 = 0.95;

/// Frequency range of ITU-R S.465-6, Hz.
pub const ENVELOPE_FREQUENCY_RANGE_HZ: (f64, f64) = (2e9, 31e9);

/// Errors of the pattern model.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum PatternError {
    #[error("peak gain must be finite, got {gain_dbi} dBi")]
    Gain { gain_dbi: f64 },
    #[error("beamwidth must be positive and finite, got {beamwidth_deg} deg")]
    Beamwidth { beamwidth_deg: f64 },
    #[error("D/lambda must be positive and finite, got {value}")]
    DiameterWavelengths { value: f64 },
    #[error("frequency must be positive and finite, got {frequency_hz} Hz")]
    Frequency { frequency_hz: f64 },
    #[error("measured pattern row {index}: off-axis {off_axis_deg} deg / gain {gain_dbi} dBi must be finite, angles strictly increasing from 0 to 180 deg")]
    TableRow {
        index: usize,
        off_axis_deg: f64,
        gain_dbi: f64,
    },
    #[error(
        "measured pattern needs at least two rows, the first at 0 deg and the last at 180 deg"
    )]
    TableEnds,
}

/// Validity notes of a prepared pattern.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct PatternWarnings {
    /// The frequency is outside the 2-31 GHz of ITU-R S.465-6.
    pub frequency_outside_envelope_range: bool,
    /// The Gaussian main beam was narrowed to hold at most [`MAX_MAIN_BEAM_FRACTION`].
    pub main_beam_narrowed: bool,
    /// The aperture is less than [`MIN_APERTURE_WAVELENGTHS`] across.
    pub aperture_under_a_wavelength: bool,
}

/// Smallest aperture (diameter in wavelengths) the reference pattern is meant for: a Gaussian
/// main beam inside a sidelobe envelope describes an aperture antenna several wavelengths across;
/// below one wavelength its beam would be wider than 70 deg (common practice).
pub const MIN_APERTURE_WAVELENGTHS: f64 = 1.0;

impl PatternWarnings {
    /// Messages for the raised flags, each naming the model and its range.
    pub fn messages(&self) -> impl Iterator<Item = &'static str> {
        [
            (self.frequency_outside_envelope_range, "ground antenna pattern (ITU-R S.465-6): frequency outside 2-31 GHz, the sidelobe envelope is used as an estimate"),
            (self.main_beam_narrowed, "ground antenna pattern: peak gain and beamwidth put more than 95 % of the power in the Gaussian main beam; its width was reduced for the noise integral"),
            (self.aperture_under_a_wavelength, "ground antenna pattern: the aperture (the diameter given, or the one the gain stands for) is under one wavelength across, where the Gaussian beam and ITU-R S.465-6 envelope of an aperture antenna are a rough estimate; give the measured pattern (antenna.noise_pattern)"),
        ]
        .into_iter()
        .filter(|(on, _)| *on)
        .map(|(_, m)| m)
    }
}

/// How the pattern is described.
#[derive(Debug, Clone, PartialEq)]
enum Shape {
    /// Gaussian main beam (peak linear gain, sigma in rad) joined at `join_rad` to the S.465-6
    /// envelope scaled by `k`.
    Reference {
        peak: f64,
        sigma_rad: f64,
        join_rad: f64,
        psi_min_deg: f64,
        k: f64,
    },
    /// Measured: rows (off-axis rad, linear gain before scaling), linear interpolation in dB,
    /// scaled by `k`.
    Measured { rows: Vec<[f64; 2]>, k: f64 },
}

/// A prepared, normalized pattern, symmetric about the boresight.
#[derive(Debug, Clone, PartialEq)]
pub struct NoisePattern {
    shape: Shape,
    warnings: PatternWarnings,
}

/// The S.465-6 psi_min, deg, for an antenna of `d_over_lambda` wavelengths.
pub fn s465_psi_min_deg(d_over_lambda: f64) -> f64 {
    if d_over_lambda >= 50.0 {
        // psi_min = max(1, 100 lambda/D)
        (100.0 / d_over_lambda).max(1.0)
    } else {
        // psi_min = max(2, 114 (D/lambda)^-1.09)
        (114.0 * d_over_lambda.powf(-1.09)).max(2.0)
    }
}

/// The S.465-6 envelope gain (dBi) at `psi_deg`, valid for psi >= psi_min:
/// 32 - 25 log10(psi) below 48 deg, -10 dBi from 48 to 180 deg.
pub fn s465_envelope_dbi(psi_deg: f64) -> f64 {
    if psi_deg < 48.0 {
        32.0 - 25.0 * psi_deg.log10()
    } else {
        -10.0
    }
}

/// Nodes and weights of a Gauss-Legendre rule on [-1, 1] (n = 8, from the standard tables,
/// Abramowitz & Stegun Table 25.4).
pub(crate) const GL8: [(f64, f64); 8] = [
    (-0.960_289_856_497_536_3, 0.101_228_536_290_376_26),
    (-0.796_666_477_413_626_7, 0.222_381_034_453_374_47),
    (-0.525_532_409_916_329, 0.313_706_645_877_887_3),
    (-0.183_434_642_495_649_8, 0.362_683_783_378_362),
    (0.183_434_642_495_649_8, 0.362_683_783_378_362),
    (0.525_532_409_916_329, 0.313_706_645_877_887_3),
    (0.796_666_477_413_626_7, 0.222_381_034_453_374_47),
    (0.960_289_856_497_536_3, 0.101_228_536_290_376_26),
];

/// Nodes and weights of the 4-point Gauss-Legendre rule on [-1, 1] (Abramowitz & Stegun
/// Table 25.4).
pub(crate) const GL4: [(f64, f64); 4] = [
    (-0.861_136_311_594_052_6, 0.347_854_845_137_453_85),
    (-0.339_981_043_584_856_3, 0.652_145_154_862_546_2),
    (0.339_981_043_584_856_3, 0.652_145_154_862_546_2),
    (0.861_136_311_594_052_6, 0.347_854_845_137_453_85),
];

/// Intervals of the main beam in the off-axis rule (quarters of the join angle).
const MAIN_BEAM_INTERVALS: usize = 4;

/// Off-axis quadrature: nodes psi (rad) with weights w such that
/// `(1/2) ∫_0^pi f(psi) sin psi dpsi ≈ Σ w f(psi)` (the sin psi and 1/2 are in w).
#[derive(Debug, Clone, PartialEq)]
pub struct OffAxisRule {
    pub psi_rad: Vec<f64>,
    pub weight: Vec<f64>,
    /// The band of angles each node stands for, rad: its Gauss-Legendre weight's share of the
    /// interval, centred on the node and cut at the interval's ends.
    pub band_rad: Vec<[f64; 2]>,
}

impl OffAxisRule {
    /// Gauss-Legendre on each of the given breakpoint intervals (rad, increasing): 8 points on
    /// the first `fine` intervals (the main beam), 4 on the others (the smooth envelope).
    fn on(breaks: &[f64], fine: usize) -> Self {
        let mut psi_rad = Vec::with_capacity(8 * breaks.len());
        let mut weight = Vec::with_capacity(8 * breaks.len());
        let mut band_rad = Vec::with_capacity(8 * breaks.len());
        for (i, w) in breaks.windows(2).enumerate() {
            let (a, b) = (w[0], w[1]);
            if b <= a {
                continue;
            }
            let half = 0.5 * (b - a);
            let nodes: &[(f64, f64)] = if i < fine { &GL8 } else { &GL4 };
            for &(x, wx) in nodes {
                let p = a + half * (1.0 + x);
                psi_rad.push(p);
                weight.push(0.5 * wx * half * p.sin());
                let h = 0.5 * wx * half;
                band_rad.push([(p - h).max(a), (p + h).min(b)]);
            }
        }
        Self {
            psi_rad,
            weight,
            band_rad,
        }
    }
}

/// The pattern as the disk coupling of the Sun and the Moon sees it (off-axis angle in deg,
/// normalized linear gain).
impl crate::noise::disk::PowerPattern for NoisePattern {
    #[inline]
    fn gain_linear(&self, off_axis_deg: f64) -> f64 {
        self.gain(off_axis_deg.to_radians())
    }

    fn breaks_deg(&self) -> [Option<f64>; 3] {
        match &self.shape {
            Shape::Reference {
                join_rad,
                psi_min_deg,
                ..
            } => [Some(join_rad.to_degrees()), Some(*psi_min_deg), Some(48.0)],
            Shape::Measured { .. } => [None, None, None],
        }
    }
}

impl NoisePattern {
    /// The reference pattern of a station antenna: peak gain `gain_dbi`, half-power beamwidth
    /// `beamwidth_deg`, `d_over_lambda` (diameter in wavelengths, for psi_min) at `frequency_hz`.
    pub fn reference(
        gain_dbi: f64,
        beamwidth_deg: f64,
        d_over_lambda: f64,
        frequency_hz: f64,
    ) -> Result<Self, PatternError> {
        if !gain_dbi.is_finite() {
            return Err(PatternError::Gain { gain_dbi });
        }
        if !(beamwidth_deg > 0.0 && beamwidth_deg.is_finite()) {
            return Err(PatternError::Beamwidth { beamwidth_deg });
        }
        if !(d_over_lambda > 0.0 && d_over_lambda.is_finite()) {
            return Err(PatternError::DiameterWavelengths {
                value: d_over_lambda,
            });
        }
        if !(frequency_hz > 0.0 && frequency_hz.is_finite()) {
            return Err(PatternError::Frequency { frequency_hz });
        }
        let mut warnings = PatternWarnings {
            frequency_outside_envelope_range: !(ENVELOPE_FREQUENCY_RANGE_HZ.0
                ..=ENVELOPE_FREQUENCY_RANGE_HZ.1)
                .contains(&frequency_hz),
            aperture_under_a_wavelength: d_over_lambda < MIN_APERTURE_WAVELENGTHS,
            ..Default::default()
        };
        let peak = db_to_ratio(gain_dbi);
        let psi_min_deg = s465_psi_min_deg(d_over_lambda);
        // sigma = theta_3dB / sqrt(8 ln 2)
        let mut sigma_rad = beamwidth_deg.to_radians() / (8.0 * std::f64::consts::LN_2).sqrt();
        let mut join_rad;
        let k;
        // At most a few narrowing rounds: each scales sigma by sqrt(target / fraction).
        let mut rounds = 0;
        loop {
            join_rad = join_angle_rad(peak, sigma_rad, psi_min_deg);
            let rule = OffAxisRule::on(&breakpoints(join_rad, psi_min_deg), MAIN_BEAM_INTERVALS);
            let (main, envelope) = power_split(&rule, peak, sigma_rad, join_rad, psi_min_deg);
            if main > MAX_MAIN_BEAM_FRACTION && rounds < 20 {
                warnings.main_beam_narrowed = true;
                sigma_rad *= (MAX_MAIN_BEAM_FRACTION / main).sqrt() * 0.999;
                rounds += 1;
                continue;
            }
            if envelope <= 1e-12 {
                // A beam so wide that it never meets the envelope: it is the whole pattern, scaled
                // to 4 pi (its peak then differs from the gain given).
                sigma_rad = sigma_rad.max(1e-9);
                return Ok(Self {
                    shape: Shape::Reference {
                        peak: peak / main,
                        sigma_rad,
                        join_rad,
                        psi_min_deg,
                        k: 0.0,
                    },
                    warnings,
                });
            }
            // k: (1/2) ∫ G sin psi = main + k envelope = 1
            k = (1.0 - main) / envelope;
            break;
        }
        Ok(Self {
            shape: Shape::Reference {
                peak,
                sigma_rad,
                join_rad,
                psi_min_deg,
                k,
            },
            warnings,
        })
    }

    /// What the pattern is, as the outputs name it (the source column of `budget`).
    pub fn label(&self) -> &'static str {
        match self.shape {
            Shape::Reference { .. } => {
                "the reference pattern (Gaussian main beam, ITU-R S.465-6 envelope)"
            }
            Shape::Measured { .. } => "the station's antenna.noise_pattern",
        }
    }

    /// A measured pattern: rows `[off_axis_deg, gain_dbi]` from 0 to 180 deg, angles strictly
    /// increasing; linear interpolation in dB between rows; scaled by one factor so it integrates
    /// to 4 pi sr ([`NoisePattern::scale`] gives the factor).
    pub fn measured(rows: &[[f64; 2]]) -> Result<Self, PatternError> {
        let mut prev = f64::NEG_INFINITY;
        for (index, r) in rows.iter().enumerate() {
            let [a, g] = *r;
            if !(a.is_finite() && g.is_finite() && a > prev && (0.0..=180.0).contains(&a)) {
                return Err(PatternError::TableRow {
                    index,
                    off_axis_deg: a,
                    gain_dbi: g,
                });
            }
            prev = a;
        }
        if rows.len() < 2 || rows[0][0] != 0.0 || rows[rows.len() - 1][0] != 180.0 {
            return Err(PatternError::TableEnds);
        }
        let rows: Vec<[f64; 2]> = rows.iter().map(|r| [r[0].to_radians(), r[1]]).collect();
        let mut p = Self {
            shape: Shape::Measured { rows, k: 1.0 },
            warnings: PatternWarnings::default(),
        };
        let rule = p.rule();
        let total: f64 = rule
            .psi_rad
            .iter()
            .zip(&rule.weight)
            .map(|(&psi, &w)| w * p.gain(psi))
            .sum();
        if let Shape::Measured { k, .. } = &mut p.shape {
            *k = 1.0 / total;
        }
        Ok(p)
    }

    /// Linear gain at off-axis angle `psi_rad` (normalized pattern).
    pub fn gain(&self, psi_rad: f64) -> f64 {
        match &self.shape {
            Shape::Reference {
                peak,
                sigma_rad,
                join_rad,
                psi_min_deg,
                k,
            } => {
                if psi_rad < *join_rad {
                    gaussian(*peak, *sigma_rad, psi_rad)
                } else {
                    k * held_envelope(psi_rad, *psi_min_deg)
                }
            }
            Shape::Measured { rows, k } => k * db_to_ratio(interpolate_db(rows, psi_rad)),
        }
    }

    /// Gain at `psi_deg`, dBi (normalized pattern).
    pub fn gain_dbi(&self, psi_deg: f64) -> f64 {
        ratio_to_db(self.gain(psi_deg.to_radians()))
    }

    /// The factor the envelope (reference) or the whole table (measured) was scaled by.
    pub fn scale(&self) -> f64 {
        match &self.shape {
            Shape::Reference { k, .. } | Shape::Measured { k, .. } => *k,
        }
    }

    /// The angle where the main beam meets the envelope, deg (reference pattern only).
    pub fn join_deg(&self) -> Option<f64> {
        match &self.shape {
            Shape::Reference { join_rad, .. } => Some(join_rad.to_degrees()),
            Shape::Measured { .. } => None,
        }
    }

    /// Share of the power within the main beam (reference: the Gaussian up to the join angle;
    /// measured: within 2.5 half-power half-widths, found from the table).
    pub fn main_beam_efficiency(&self) -> f64 {
        let rule = self.rule();
        let edge = match &self.shape {
            Shape::Reference { join_rad, .. } => *join_rad,
            Shape::Measured { rows, .. } => {
                let peak = rows[0][1];
                let half = rows
                    .windows(2)
                    .find(|w| w[1][1] <= peak - 3.0)
                    .map(|w| {
                        let f = (peak - 3.0 - w[0][1]) / (w[1][1] - w[0][1]);
                        w[0][0] + f * (w[1][0] - w[0][0])
                    })
                    .unwrap_or(std::f64::consts::PI);
                2.5 * half
            }
        };
        rule.psi_rad
            .iter()
            .zip(&rule.weight)
            .filter(|(&p, _)| p < edge)
            .map(|(&p, &w)| w * self.gain(p))
            .sum()
    }

    pub fn warnings(&self) -> PatternWarnings {
        self.warnings
    }

    /// The off-axis quadrature fitted to this pattern's pieces (Gauss-Legendre, 8 points per
    /// interval of the main beam and of a measured table, 4 per interval of the envelope; intervals at the quarters of the main beam, the join, psi_min, then doubling up to 48 deg, then 48-90-135-180).
    pub fn rule(&self) -> OffAxisRule {
        match &self.shape {
            Shape::Reference {
                join_rad,
                psi_min_deg,
                ..
            } => OffAxisRule::on(&breakpoints(*join_rad, *psi_min_deg), MAIN_BEAM_INTERVALS),
            Shape::Measured { rows, .. } => {
                // Every table interval, split in two where it is wider than 5 deg.
                let mut b = vec![0.0];
                for w in rows.windows(2) {
                    let n = ((w[1][0] - w[0][0]) / 5f64.to_radians()).ceil().max(1.0) as usize;
                    for i in 1..=n {
                        b.push(w[0][0] + (w[1][0] - w[0][0]) * i as f64 / n as f64);
                    }
                }
                OffAxisRule::on(&b, usize::MAX)
            }
        }
    }
}

/// G0 exp(-psi^2 / (2 sigma^2))
#[inline]
fn gaussian(peak: f64, sigma_rad: f64, psi_rad: f64) -> f64 {
    peak * (-psi_rad * psi_rad / (2.0 * sigma_rad * sigma_rad)).exp()
}

/// The S.465-6 envelope, held at its psi_min value inside psi_min, linear.
#[inline]
fn held_envelope(psi_rad: f64, psi_min_deg: f64) -> f64 {
    let psi_deg = psi_rad.to_degrees().max(psi_min_deg);
    if psi_deg < 48.0 {
        // 10^((32 - 25 log10 psi) / 10) = 10^3.2 psi^-2.5: one root instead of a log and a power
        ENVELOPE_AT_1_DEG / (psi_deg * psi_deg * psi_deg.sqrt())
    } else {
        db_to_ratio(s465_envelope_dbi(psi_deg))
    }
}

/// 10^3.2, the envelope's linear gain at 1 deg.
const ENVELOPE_AT_1_DEG: f64 = 1_584.893_192_461_113_5;

/// The first angle where the Gaussian falls to the held envelope (scan, then bisection).
fn join_angle_rad(peak: f64, sigma_rad: f64, psi_min_deg: f64) -> f64 {
    let below = |p: f64| gaussian(peak, sigma_rad, p) <= held_envelope(p, psi_min_deg);
    let pi = std::f64::consts::PI;
    let step = (sigma_rad / 8.0).min(0.01);
    let mut hi = step;
    while hi < pi && !below(hi) {
        hi += step;
    }
    if hi >= pi {
        return pi;
    }
    let mut lo = hi - step;
    for _ in 0..60 {
        let mid = 0.5 * (lo + hi);
        if below(mid) {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    hi
}

/// Breakpoints of the off-axis quadrature, rad: 0, quarters of the main beam, the join, psi_min, then
/// doubling to 48 deg, then 48, 90, 135, 180 deg.
fn breakpoints(join_rad: f64, psi_min_deg: f64) -> Vec<f64> {
    let pi = std::f64::consts::PI;
    let mut b = vec![
        0.0,
        0.25 * join_rad,
        0.5 * join_rad,
        0.75 * join_rad,
        join_rad,
    ];
    let mut p = join_rad.max(psi_min_deg.to_radians());
    if p > join_rad {
        b.push(p);
    }
    let d48 = 48f64.to_radians();
    while p * 2.0 < d48 {
        p *= 2.0;
        b.push(p);
    }
    for d in [48.0f64, 90.0, 135.0, 180.0] {
        let r = d.to_radians();
        if r > *b.last().unwrap_or(&0.0) {
            b.push(r);
        }
    }
    b.retain(|&x| x <= pi);
    b
}

/// `(main, envelope)`: the power of the Gaussian inside the join and of the unscaled envelope
/// beyond it, as shares of 4 pi.
fn power_split(
    rule: &OffAxisRule,
    peak: f64,
    sigma_rad: f64,
    join_rad: f64,
    psi_min_deg: f64,
) -> (f64, f64) {
    let mut main = 0.0;
    let mut env = 0.0;
    for (&p, &w) in rule.psi_rad.iter().zip(&rule.weight) {
        if p < join_rad {
            main += w * gaussian(peak, sigma_rad, p);
        } else {
            env += w * held_envelope(p, psi_min_deg);
        }
    }
    (main, env)
}

/// Linear interpolation in dB over rows (rad, dB), clamped at the ends.
fn interpolate_db(rows: &[[f64; 2]], psi_rad: f64) -> f64 {
    let i = rows.partition_point(|r| r[0] <= psi_rad);
    if i == 0 {
        return rows[0][1];
    }
    if i >= rows.len() {
        return rows[rows.len() - 1][1];
    }
    let (a, b) = (rows[i - 1], rows[i]);
    a[1] + (b[1] - a[1]) * (psi_rad - a[0]) / (b[0] - a[0])
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The aperture note is raised below one wavelength across and not at or above it (the
    /// aperture a gain stands for: G = 0.55 (pi D / lambda)^2, so 5.3 dBi is 1.0 wavelength).
    #[test]
    fn an_aperture_under_a_wavelength_is_noted() {
        for (dl, noted) in [(0.37, true), (0.99, true), (1.0, false), (101.0, false)] {
            let g = ratio_to_db(0.55 * (std::f64::consts::PI * dl).powi(2));
            let p = NoisePattern::reference(g, (70.0 / dl).min(180.0), dl, 8.2e9).unwrap();
            assert_eq!(p.warnings().aperture_under_a_wavelength, noted, "{dl}");
            let said = p
                .warnings()
                .messages()
                .any(|m| m.contains("under one wavelength"));
            assert_eq!(said, noted, "{dl}");
        }
    }

    #[test]
    fn integrates_to_one() {
        // 3.7 m at 8.2 GHz: D/lambda = 101, G = 0.55 (pi D/lambda)^2, 70 lambda/D.
        let dl = 3.7 * 8.2e9 / 299_792_458.0;
        let g = ratio_to_db(0.55 * (std::f64::consts::PI * dl).powi(2));
        let p = NoisePattern::reference(g, 70.0 / dl, dl, 8.2e9).unwrap();
        let r = p.rule();
        let total: f64 = r
            .psi_rad
            .iter()
            .zip(&r.weight)
            .map(|(&x, &w)| w * p.gain(x))
            .sum();
        assert!((total - 1.0).abs() < 1e-12);
        // The main beam keeps the peak gain.
        assert!((p.gain_dbi(0.0) - g).abs() < 1e-12);
        assert!(p.scale() > 0.0 && p.scale() < 1.0, "k = {}", p.scale());
        // Low and negative gains (a gain given without a diameter, -10 dBi is accepted) still
        // give a pattern that integrates to one.
        for g in [-10.0, -5.0, 0.0, 3.0, 12.0] {
            let dl = (db_to_ratio(g) / 0.55).sqrt() / std::f64::consts::PI;
            let p = NoisePattern::reference(g, 70.0 / dl, dl, 437.5e6).unwrap();
            let r = p.rule();
            let total: f64 = r
                .psi_rad
                .iter()
                .zip(&r.weight)
                .map(|(&x, &w)| w * p.gain(x))
                .sum();
            assert!((total - 1.0).abs() < 1e-9, "{g} dBi: {total}");
        }
    }
}
