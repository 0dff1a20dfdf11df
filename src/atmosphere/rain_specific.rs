//! Rain specific attenuation: ITU-R P.838-3 (03/2005).
//!
//! `γR = k·R^α` dB/km (eq (1)), with k and α from the curve-fitting functions of
//! eqs (2) and (3) and the coefficients of Tables 1-4, and the combination for path
//! elevation θ and polarization tilt τ of eqs (4) and (5).
//! Valid 1-1000 GHz (P.838-3 §1).

/// Frequency range of the P.838-3 fit, GHz.
pub const FREQUENCY_RANGE_GHZ: (f64, f64) = (1.0, 1000.0);

/// Coefficients of one `log10 k` fit (P.838-3 Tables 1 and 2): a_j, b_j, c_j (j = 1..4), m_k, c_k.
struct KFit {
    a: [f64; 4],
    b: [f64; 4],
    c: [f64; 4],
    m: f64,
    ck: f64,
}

/// Coefficients of one α fit (P.838-3 Tables 3 and 4): a_j, b_j, c_j (j = 1..5), m_α, c_α.
struct AlphaFit {
    a: [f64; 5],
    b: [f64; 5],
    c: [f64; 5],
    m: f64,
    ca: f64,
}

/// P.838-3 Table 1: coefficients for kH.
const K_H: KFit = KFit {
    a: [-5.33980, -0.35351, -0.23789, -0.94158],
    b: [-0.10008, 1.26970, 0.86036, 0.64552],
    c: [1.13098, 0.45400, 0.15354, 0.16817],
    m: -0.18961,
    ck: 0.71147,
};

/// P.838-3 Table 2: coefficients for kV.
const K_V: KFit = KFit {
    a: [-3.80595, -3.44965, -0.39902, 0.50167],
    b: [0.56934, -0.22911, 0.73042, 1.07319],
    c: [0.81061, 0.51059, 0.11899, 0.27195],
    m: -0.16398,
    ck: 0.63297,
};

/// P.838-3 Table 3: coefficients for αH.
const ALPHA_H: AlphaFit = AlphaFit {
    a: [-0.14318, 0.29591, 0.32177, -5.37610, 16.1721],
    b: [1.82442, 0.77564, 0.63773, -0.96230, -3.29980],
    c: [-0.55187, 0.19822, 0.13164, 1.47828, 3.43990],
    m: 0.67849,
    ca: -1.95537,
};

/// P.838-3 Table 4: coefficients for αV.
const ALPHA_V: AlphaFit = AlphaFit {
    a: [-0.07771, 0.56727, -0.20238, -48.2991, 48.5833],
    b: [2.33840, 0.95545, 1.14520, 0.791669, 0.791459],
    c: [-0.76284, 0.54039, 0.26809, 0.116226, 0.116479],
    m: -0.053739,
    ca: 0.83433,
};

/// `log10 k = Σ_{j=1..4} a_j exp(−((log10 f − b_j)/c_j)²) + m_k log10 f + c_k`  (P.838-3 eq (2))
fn k_fit(fit: &KFit, log_f: f64) -> f64 {
    let mut s = fit.m * log_f + fit.ck;
    for j in 0..4 {
        let u = (log_f - fit.b[j]) / fit.c[j];
        s += fit.a[j] * (-u * u).exp();
    }
    10f64.powf(s)
}

/// `α = Σ_{j=1..5} a_j exp(−((log10 f − b_j)/c_j)²) + m_α log10 f + c_α`  (P.838-3 eq (3))
fn alpha_fit(fit: &AlphaFit, log_f: f64) -> f64 {
    let mut s = fit.m * log_f + fit.ca;
    for j in 0..5 {
        let u = (log_f - fit.b[j]) / fit.c[j];
        s += fit.a[j] * (-u * u).exp();
    }
    s
}

/// Horizontal- and vertical-polarization coefficients at one frequency (P.838-3 eqs (2), (3)).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct RainCoefficients {
    pub k_h: f64,
    pub alpha_h: f64,
    pub k_v: f64,
    pub alpha_v: f64,
}

impl RainCoefficients {
    /// Evaluate the P.838-3 fits at `frequency_ghz` (meaningful 1-1000 GHz).
    pub fn p838_3(frequency_ghz: f64) -> Self {
        let lf = frequency_ghz.log10();
        Self {
            k_h: k_fit(&K_H, lf),
            alpha_h: alpha_fit(&ALPHA_H, lf),
            k_v: k_fit(&K_V, lf),
            alpha_v: alpha_fit(&ALPHA_V, lf),
        }
    }

    /// Path coefficients (k, α) for elevation θ and polarization tilt τ (45° = circular):
    ///
    /// `k = [kH + kV + (kH − kV) cos²θ cos2τ] / 2`  (P.838-3 eq (4))
    /// `α = [kH αH + kV αV + (kH αH − kV αV) cos²θ cos2τ] / (2k)`  (P.838-3 eq (5))
    #[inline]
    pub fn for_path(&self, elevation_deg: f64, tilt_deg: f64) -> (f64, f64) {
        let c = elevation_deg.to_radians().cos();
        let w = c * c * (2.0 * tilt_deg.to_radians()).cos();
        self.for_path_weight(w)
    }

    /// As [`Self::for_path`] with the precomputed weight `w = cos²θ·cos2τ`.
    #[inline]
    pub fn for_path_weight(&self, w: f64) -> (f64, f64) {
        let k = (self.k_h + self.k_v + (self.k_h - self.k_v) * w) / 2.0;
        let kah = self.k_h * self.alpha_h;
        let kav = self.k_v * self.alpha_v;
        let alpha = (kah + kav + (kah - kav) * w) / (2.0 * k);
        (k, alpha)
    }
}

/// `γR = k R^α` dB/km  (P.838-3 eq (1)); R in mm/h.
#[inline]
pub fn specific_attenuation_db_km(k: f64, alpha: f64, rain_rate_mm_h: f64) -> f64 {
    k * rain_rate_mm_h.powf(alpha)
}
