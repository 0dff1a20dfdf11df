//! Gaseous attenuation: ITU-R P.676-12 (08/2019).
//!
//! * Specific attenuation γo (dry air) and γw (water vapour): Annex 1 §1, line-by-line
//!   sum over the 44 oxygen lines (Table 1) and 35 water-vapour lines (Table 2),
//!   eq (1) and the line-strength, width, shape and dry-continuum equations of §1. Valid 1-1000 GHz. The tables are identical in P.676-13.
//! * Slant path: Annex 2 §2 equivalent-height method of **P.676-12** (Annex 2 §2.1,
//!   Tables 3 and 4), valid 1-350 GHz, 5°-90° elevation:
//!   `A = (γo·ho + γw·hw) / sin θ`.
//!   The optional integrated-water-vapour form (Annex 2 §2.3) is in
//!   [`zenith_water_vapour_attenuation_from_vt_db`].
//! * Below 5° elevation: the curved-Earth form of Annex 2 §2.2.2 as given in earlier
//!   editions (P.676-10/-11) and retained in public P.676-12 implementations:
//!   `A = γ·sqrt(h)·sqrt(Re + h1)·F(x)/cos θ`, `F(x) = 1/(0.661x + 0.339·sqrt(x² + 5.51))`,
//!   `x = tan θ·sqrt((Re + h1)/h)`, Re = 8500 km (effective Earth radius), evaluated with γ
//!   at the station itself (so the factor exp(−h1/h) that would refer sea-level γ to the
//!   station height is 1). This form tends to the cosecant law at large x and stays
//!   finite at 0°; at 5° it is about 7 % below the cosecant form (curvature).
//!
//! Pressures: `p` is the **dry-air** pressure in hPa; the water-vapour partial pressure is
//! `e = ρ·T/216.7` hPa (P.676-12 Annex 1 §1); total pressure is `p + e`.

/// Oxygen line table, ITU-R P.676-12 Annex 1 Table 1 (identical in P.676-13):
/// `[f0 GHz, a1, a2, a3, a4, a5, a6]`. Copy cross-checked row by row
/// against two independent public copies (ITU-Rpy data file
/// `v12_lines_oxygen.txt`, CRC-COVLIB `ITURP_676.cpp`).
pub const OXYGEN_LINES: [[f64; 7]; 44] = [
    [50.474214, 0.975, 9.651, 6.690, 0.0, 2.566, 6.850],
    [50.987745, 2.529, 8.653, 7.170, 0.0, 2.246, 6.800],
    [51.503360, 6.193, 7.709, 7.640, 0.0, 1.947, 6.729],
    [52.021429, 14.320, 6.819, 8.110, 0.0, 1.667, 6.640],
    [52.542418, 31.240, 5.983, 8.580, 0.0, 1.388, 6.526],
    [53.066934, 64.290, 5.201, 9.060, 0.0, 1.349, 6.206],
    [53.595775, 124.600, 4.474, 9.550, 0.0, 2.227, 5.085],
    [54.130025, 227.300, 3.800, 9.960, 0.0, 3.170, 3.750],
    [54.671180, 389.700, 3.182, 10.370, 0.0, 3.558, 2.654],
    [55.221384, 627.100, 2.618, 10.890, 0.0, 2.560, 2.952],
    [55.783815, 945.300, 2.109, 11.340, 0.0, -1.172, 6.135],
    [56.264774, 543.400, 0.014, 17.030, 0.0, 3.525, -0.978],
    [56.363399, 1331.800, 1.654, 11.890, 0.0, -2.378, 6.547],
    [56.968211, 1746.600, 1.255, 12.230, 0.0, -3.545, 6.451],
    [57.612486, 2120.100, 0.910, 12.620, 0.0, -5.416, 6.056],
    [58.323877, 2363.700, 0.621, 12.950, 0.0, -1.932, 0.436],
    [58.446588, 1442.100, 0.083, 14.910, 0.0, 6.768, -1.273],
    [59.164204, 2379.900, 0.387, 13.530, 0.0, -6.561, 2.309],
    [59.590983, 2090.700, 0.207, 14.080, 0.0, 6.957, -0.776],
    [60.306056, 2103.400, 0.207, 14.150, 0.0, -6.395, 0.699],
    [60.434778, 2438.000, 0.386, 13.390, 0.0, 6.342, -2.825],
    [61.150562, 2479.500, 0.621, 12.920, 0.0, 1.014, -0.584],
    [61.800158, 2275.900, 0.910, 12.630, 0.0, 5.014, -6.619],
    [62.411220, 1915.400, 1.255, 12.170, 0.0, 3.029, -6.759],
    [62.486253, 1503.000, 0.083, 15.130, 0.0, -4.499, 0.844],
    [62.997984, 1490.200, 1.654, 11.740, 0.0, 1.856, -6.675],
    [63.568526, 1078.000, 2.108, 11.340, 0.0, 0.658, -6.139],
    [64.127775, 728.700, 2.617, 10.880, 0.0, -3.036, -2.895],
    [64.678910, 461.300, 3.181, 10.380, 0.0, -3.968, -2.590],
    [65.224078, 274.000, 3.800, 9.960, 0.0, -3.528, -3.680],
    [65.764779, 153.000, 4.473, 9.550, 0.0, -2.548, -5.002],
    [66.302096, 80.400, 5.200, 9.060, 0.0, -1.660, -6.091],
    [66.836834, 39.800, 5.982, 8.580, 0.0, -1.680, -6.393],
    [67.369601, 18.560, 6.818, 8.110, 0.0, -1.956, -6.475],
    [67.900868, 8.172, 7.708, 7.640, 0.0, -2.216, -6.545],
    [68.431006, 3.397, 8.652, 7.170, 0.0, -2.492, -6.600],
    [68.960312, 1.334, 9.650, 6.690, 0.0, -2.773, -6.650],
    [118.750334, 940.300, 0.010, 16.640, 0.0, -0.439, 0.079],
    [368.498246, 67.400, 0.048, 16.400, 0.0, 0.000, 0.000],
    [424.763020, 637.700, 0.044, 16.400, 0.0, 0.000, 0.000],
    [487.249273, 237.400, 0.049, 16.000, 0.0, 0.000, 0.000],
    [715.392902, 98.100, 0.145, 16.000, 0.0, 0.000, 0.000],
    [773.839490, 572.300, 0.141, 16.200, 0.0, 0.000, 0.000],
    [834.145546, 183.100, 0.145, 14.700, 0.0, 0.000, 0.000],
];

/// Water-vapour line table, ITU-R P.676-12 Annex 1 Table 2 (identical in P.676-13):
/// `[f0 GHz, b1, b2, b3, b4, b5, b6]`. Cross-checked against the same two public
/// copies as [`OXYGEN_LINES`].
pub const WATER_VAPOUR_LINES: [[f64; 7]; 35] = [
    [22.235080, 0.1079, 2.144, 26.38, 0.76, 5.087, 1.00],
    [67.803960, 0.0011, 8.732, 28.58, 0.69, 4.930, 0.82],
    [119.995940, 0.0007, 8.353, 29.48, 0.70, 4.780, 0.79],
    [183.310087, 2.273, 0.668, 29.06, 0.77, 5.022, 0.85],
    [321.225630, 0.0470, 6.179, 24.04, 0.67, 4.398, 0.54],
    [325.152888, 1.514, 1.541, 28.23, 0.64, 4.893, 0.74],
    [336.227764, 0.0010, 9.825, 26.93, 0.69, 4.740, 0.61],
    [380.197353, 11.67, 1.048, 28.11, 0.54, 5.063, 0.89],
    [390.134508, 0.0045, 7.347, 21.52, 0.63, 4.810, 0.55],
    [437.346667, 0.0632, 5.048, 18.45, 0.60, 4.230, 0.48],
    [439.150807, 0.9098, 3.595, 20.07, 0.63, 4.483, 0.52],
    [443.018343, 0.1920, 5.048, 15.55, 0.60, 5.083, 0.50],
    [448.001085, 10.41, 1.405, 25.64, 0.66, 5.028, 0.67],
    [470.888999, 0.3254, 3.597, 21.34, 0.66, 4.506, 0.65],
    [474.689092, 1.260, 2.379, 23.20, 0.65, 4.804, 0.64],
    [488.490108, 0.2529, 2.852, 25.86, 0.69, 5.201, 0.72],
    [503.568532, 0.0372, 6.731, 16.12, 0.61, 3.980, 0.43],
    [504.482692, 0.0124, 6.731, 16.12, 0.61, 4.010, 0.45],
    [547.676440, 0.9785, 0.158, 26.00, 0.70, 4.500, 1.00],
    [552.020960, 0.1840, 0.158, 26.00, 0.70, 4.500, 1.00],
    [556.935985, 497.0, 0.159, 30.86, 0.69, 4.552, 1.00],
    [620.700807, 5.015, 2.391, 24.38, 0.71, 4.856, 0.68],
    [645.766085, 0.0067, 8.633, 18.00, 0.60, 4.000, 0.50],
    [658.005280, 0.2732, 7.816, 32.10, 0.69, 4.140, 1.00],
    [752.033113, 243.4, 0.396, 30.86, 0.68, 4.352, 0.84],
    [841.051732, 0.0134, 8.177, 15.90, 0.33, 5.760, 0.45],
    [859.965698, 0.1325, 8.055, 30.60, 0.68, 4.090, 0.84],
    [899.303175, 0.0547, 7.914, 29.85, 0.68, 4.530, 0.90],
    [902.611085, 0.0386, 8.429, 28.65, 0.70, 5.100, 0.95],
    [906.205957, 0.1836, 5.110, 24.08, 0.70, 4.700, 0.53],
    [916.171582, 8.400, 1.441, 26.73, 0.70, 5.150, 0.78],
    [923.112692, 0.0079, 10.293, 29.00, 0.70, 5.000, 0.80],
    [970.315022, 9.009, 1.919, 25.50, 0.64, 4.940, 0.67],
    [987.926764, 134.6, 0.257, 29.85, 0.68, 4.550, 0.90],
    [1780.000000, 17506.0, 0.952, 196.3, 2.00, 24.15, 5.00],
];

/// P.676-12 Annex 2 Table 3: (c_i, f_i GHz) for the t2 term of the oxygen equivalent height.
const HO_T2_LINES: [(f64, f64); 7] = [
    (0.1597, 118.750334),
    (0.1066, 368.498246),
    (0.1325, 424.763020),
    (0.1242, 487.249273),
    (0.0938, 715.392902),
    (0.1448, 773.839490),
    (0.1374, 834.145546),
];

/// P.676-12 Annex 2 Table 4: (f_i GHz, a_i, b_i) for the water-vapour equivalent height.
const HW_LINES: [(f64, f64, f64); 14] = [
    (22.23508, 1.52, 2.56),
    (183.310087, 7.62, 10.2),
    (325.152888, 1.56, 2.7),
    (380.197353, 4.15, 5.7),
    (439.150807, 0.2, 0.91),
    (448.001085, 1.63, 2.46),
    (474.689092, 0.76, 2.22),
    (488.490108, 0.26, 2.49),
    (556.935985, 7.81, 10.0),
    (620.70087, 1.25, 2.35),
    (752.033113, 16.2, 20.0),
    (916.171582, 1.47, 2.58),
    (970.315022, 1.36, 2.44),
    (987.926764, 1.6, 1.86),
];

/// Lower frequency limit of the P.676 methods, GHz.
pub const FREQUENCY_MIN_GHZ: f64 = 1.0;
/// Upper frequency limit of the Annex 2 slant-path method, GHz (Annex 1 goes to 1000 GHz).
pub const SLANT_FREQUENCY_MAX_GHZ: f64 = 350.0;
/// Effective Earth radius used by the low-elevation form, km (P.676 Annex 2 §2.2.2).
pub const EFFECTIVE_EARTH_RADIUS_KM: f64 = 8500.0;

/// Water-vapour partial pressure, hPa: `e = ρ·T/216.7` (P.676-12 Annex 1 §1).
#[inline]
pub fn water_vapour_pressure_hpa(water_vapour_density_g_m3: f64, temperature_k: f64) -> f64 {
    water_vapour_density_g_m3 * temperature_k / 216.7
}

/// Specific attenuation (γo, γw) in dB/km, P.676-12 Annex 1 §1 (γ = 0.1820·f·N''(f), eq (1)).
///
/// `dry_pressure_hpa` is the dry-air pressure p; ρ in g/m³; T in K.
pub fn specific_attenuation_p676(
    frequency_ghz: f64,
    dry_pressure_hpa: f64,
    water_vapour_density_g_m3: f64,
    temperature_k: f64,
) -> (f64, f64) {
    let f = frequency_ghz;
    let p = dry_pressure_hpa;
    // θ = 300/T;  e = ρT/216.7
    let th = 300.0 / temperature_k;
    let e = water_vapour_pressure_hpa(water_vapour_density_g_m3, temperature_k);

    // Line shape:
    // F_i = f/f_i [ (Δf − δ(f_i − f))/((f_i − f)² + Δf²) + (Δf − δ(f_i + f))/((f_i + f)² + Δf²) ]
    #[inline]
    fn shape(f: f64, fi: f64, df: f64, delta: f64) -> f64 {
        let dm = fi - f;
        let dp = fi + f;
        f / fi * ((df - delta * dm) / (dm * dm + df * df) + (df - delta * dp) / (dp * dp + df * df))
    }

    let th3 = th * th * th;
    let th08 = th.powf(0.8);
    let mut n_ox = 0.0;
    for l in &OXYGEN_LINES {
        let (fi, a1, a2, a3, a4, a5, a6) = (l[0], l[1], l[2], l[3], l[4], l[5], l[6]);
        // S_i = a1·1e-7·p·θ³·exp(a2(1 − θ))
        let s = a1 * 1e-7 * p * th3 * (a2 * (1.0 - th)).exp();
        // Δf = a3·1e-4 (p θ^(0.8 − a4) + 1.1 e θ);  Δf = sqrt(Δf² + 2.25e-6)  (Zeeman splitting)
        let df = a3 * 1e-4 * (p * th.powf(0.8 - a4) + 1.1 * e * th);
        let df = (df * df + 2.25e-6).sqrt();
        // δ = (a5 + a6 θ)·1e-4 (p + e) θ^0.8
        let delta = (a5 + a6 * th) * 1e-4 * (p + e) * th08;
        n_ox += s * shape(f, fi, df, delta);
    }
    // Dry continuum (pressure-induced N2 + Debye spectrum):
    // N''_D = f p θ² [ 6.14e-5/(d(1 + (f/d)²)) + 1.4e-12 p θ^1.5/(1 + 1.9e-5 f^1.5) ],
    // d = 5.6e-4 (p + e) θ^0.8
    let d = 5.6e-4 * (p + e) * th08;
    let n_d = f
        * p
        * th
        * th
        * (6.14e-5 / (d * (1.0 + (f / d) * (f / d)))
            + 1.4e-12 * p * th.powf(1.5) / (1.0 + 1.9e-5 * f.powf(1.5)));
    n_ox += n_d;

    let th35 = th.powf(3.5);
    let mut n_wv = 0.0;
    for l in &WATER_VAPOUR_LINES {
        let (fi, b1, b2, b3, b4, b5, b6) = (l[0], l[1], l[2], l[3], l[4], l[5], l[6]);
        // S_i = b1·1e-1·e·θ^3.5·exp(b2(1 − θ))
        let s = b1 * 1e-1 * e * th35 * (b2 * (1.0 - th)).exp();
        // Δf = b3·1e-4 (p θ^b4 + b5 e θ^b6)
        // Δf = 0.535 Δf + sqrt(0.217 Δf² + 2.1316e-12 f_i²/θ)  (Doppler broadening); δ = 0
        let df = b3 * 1e-4 * (p * th.powf(b4) + b5 * e * th.powf(b6));
        let df = 0.535 * df + (0.217 * df * df + 2.1316e-12 * fi * fi / th).sqrt();
        n_wv += s * shape(f, fi, df, 0.0);
    }
    // γ = 0.1820 f N''(f)  (eq (1))
    (0.1820 * f * n_ox, 0.1820 * f * n_wv)
}

/// Equivalent heights (ho, hw) in km, P.676-12 Annex 2 §2.1 (equation numbers (30)-(38) of the 2019 text, from ITU-Rpy comments).
///
/// `dry_pressure_hpa` is p; the equations use the total-pressure ratio rp = (p + e)/1013.25.
pub fn equivalent_heights_p676_12(
    frequency_ghz: f64,
    dry_pressure_hpa: f64,
    water_vapour_density_g_m3: f64,
    temperature_k: f64,
) -> (f64, f64) {
    let f = frequency_ghz;
    let rho = water_vapour_density_g_m3;
    let t_c = temperature_k - 273.15;
    let e = water_vapour_pressure_hpa(rho, temperature_k);
    let rp = (dry_pressure_hpa + e) / 1013.25;

    // t1 = 5.1040/(1 + 0.066 rp^-2.3) · exp(−((f − 59.7)/(2.87 + 12.4 exp(−7.9 rp)))²)
    let t1 = 5.1040 / (1.0 + 0.066 * rp.powf(-2.3))
        * (-((f - 59.7) / (2.87 + 12.4 * (-7.9 * rp).exp())).powi(2)).exp();
    // t2 = Σ c_i exp(2.12 rp) / ((f − f_i)² + 0.025 exp(2.2 rp))  (Table 3)
    let num = (2.12 * rp).exp();
    let den_w = 0.025 * (2.2 * rp).exp();
    let t2: f64 = HO_T2_LINES
        .iter()
        .map(|&(c, fi)| c * num / ((f - fi) * (f - fi) + den_w))
        .sum();
    // t3 = 0.0114 f/(1 + 0.14 rp^-2.6) · (15.02 f² − 1353 f + 5.333e4)/(f³ − 151.3 f² + 9629 f − 6803)
    let t3 = 0.0114 * f / (1.0 + 0.14 * rp.powf(-2.6)) * (15.02 * f * f - 1353.0 * f + 5.333e4)
        / (f * f * f - 151.3 * f * f + 9629.0 * f - 6803.0);
    // A = 0.7832 + 0.00709 (T − 273.15)
    let a = 0.7832 + 0.00709 * t_c;
    // ho = 6.1 A/(1 + 0.17 rp^-1.1) (1 + t1 + t2 + t3), ho ≤ 10.7 rp^0.3 for f < 70 GHz
    let mut ho = 6.1 * a / (1.0 + 0.17 * rp.powf(-1.1)) * (1.0 + t1 + t2 + t3);
    if f < 70.0 {
        ho = ho.min(10.7 * rp.powf(0.3));
    }

    // A = 1.9298 − 0.04166 (T − 273.15) + 0.0517 ρ;  B = 1.1674 − 0.00622 (T − 273.15) + 0.0063 ρ
    let aw = 1.9298 - 0.04166 * t_c + 0.0517 * rho;
    let bw = 1.1674 - 0.00622 * t_c + 0.0063 * rho;
    // σw = 1.013/(1 + exp(−8.6 (rp − 0.57)))
    let sw = 1.013 / (1.0 + (-8.6 * (rp - 0.57)).exp());
    // hw = A + B Σ a_i σw/((f − f_i)² + b_i σw)  (Table 4)
    let sum: f64 = HW_LINES
        .iter()
        .map(|&(fi, ai, bi)| ai * sw / ((f - fi) * (f - fi) + bi * sw))
        .sum();
    (ho, aw + bw * sum)
}

/// Zenith water-vapour attenuation from the integrated water-vapour content V_t (kg/m²),
/// P.676-12 Annex 2 §2.3, dB. `station_height_km` is clipped to 0-4 km.
///
/// f_ref = 20.6 GHz, p_ref = 845 hPa, ρ_ref = V_t/2.38 g/m³, t_ref = 14 ln(0.22 V_t/2.38) + 3 °C;
/// A_w = 0.0176 V_t γw(f)/γw(f_ref) for 1 ≤ f ≤ 20 GHz, times (a h^b + 1) above 20 GHz.
pub fn zenith_water_vapour_attenuation_from_vt_db(
    frequency_ghz: f64,
    vt_kg_m2: f64,
    station_height_km: f64,
) -> f64 {
    let f = frequency_ghz;
    let p_ref = 845.0;
    let rho_ref = vt_kg_m2 / 2.38;
    let t_ref_k = 14.0 * (0.22 * vt_kg_m2 / 2.38).ln() + 3.0 + 273.15;
    let gw = |fg: f64| specific_attenuation_p676(fg, p_ref, rho_ref, t_ref_k).1;
    let base = 0.0176 * vt_kg_m2 * gw(f) / gw(20.6);
    if f <= 20.0 {
        base
    } else {
        let h = station_height_km.clamp(0.0, 4.0);
        // a = 0.2048 exp(−((f − 22.43)/3.097)²) + 0.2326 exp(−((f − 183.5)/4.096)²)
        //     + 0.2073 exp(−((f − 325)/3.651)²) − 0.1113
        let a = 0.2048 * (-((f - 22.43) / 3.097).powi(2)).exp()
            + 0.2326 * (-((f - 183.5) / 4.096).powi(2)).exp()
            + 0.2073 * (-((f - 325.0) / 3.651).powi(2)).exp()
            - 0.1113;
        // b = 8.741e4 exp(−0.587 f) + 312.2 f^-2.38 + 0.723
        let b = 8.741e4 * (-0.587 * f).exp() + 312.2 * f.powf(-2.38) + 0.723;
        base * (a * h.powf(b) + 1.0)
    }
}

/// Slant-path factor for one gas layer of equivalent height `h_km`, km of "sea-level
/// equivalent" path: the attenuation is `γ · slant_path_factor_km(...)`.
///
/// θ ≥ 5°: `h / sin θ` (P.676-12 Annex 2 §2.2).
/// 0 ≤ θ < 5°: `sqrt(h)·sqrt(Re + h1)·F(x)/cos θ`, `x = tan θ·sqrt((Re + h1)/h)`,
/// `F(x) = 1/(0.661x + 0.339 sqrt(x² + 5.51))` (Annex 2 §2.2.2 of P.676-10/-11).
#[inline]
pub fn slant_path_factor_km(h_km: f64, station_height_km: f64, elevation_deg: f64) -> f64 {
    let el = elevation_deg.to_radians();
    if elevation_deg >= 5.0 {
        h_km / el.sin()
    } else {
        let re_h1 = EFFECTIVE_EARTH_RADIUS_KM + station_height_km.max(0.0);
        let x = el.tan() * (re_h1 / h_km).sqrt();
        let fx = 1.0 / (0.661 * x + 0.339 * (x * x + 5.51).sqrt());
        h_km.sqrt() * re_h1.sqrt() * fx / el.cos()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tables_are_sorted_by_frequency() {
        assert!(OXYGEN_LINES.windows(2).all(|w| w[0][0] < w[1][0]));
        assert!(WATER_VAPOUR_LINES.windows(2).all(|w| w[0][0] < w[1][0]));
    }

    #[test]
    fn low_elevation_factor_tends_to_cosecant() {
        // F(x) → 1/x for large x, so the curved form approaches h/sin θ (P.676 Annex 2 §2.2.2).
        let h = 6.0;
        let curved = slant_path_factor_km(h, 0.0, 4.999_999);
        let flat = h / 4.999_999f64.to_radians().sin();
        assert!(curved < flat && curved > 0.9 * flat);
        assert!(slant_path_factor_km(h, 0.0, 0.0).is_finite());
    }
}
