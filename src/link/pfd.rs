//! Power flux-density (pfd) at the Earth's surface against the limits of the ITU Radio
//! Regulations, Article 21 (No. 21.16, Table 21-4): a limit per reference bandwidth (4 kHz or
//! 1 MHz) that depends on the angle of arrival δ above the horizontal plane,
//!
//! ```text
//! limit(δ) = L0                 0 <= δ <= 5 deg
//!          = L0 + 0.5 (δ - 5)   5 <  δ <= 25 deg
//!          = L0 + 10            25 < δ <= 90 deg        dB(W/m2) in the reference bandwidth
//! ```
//!
//! under free-space conditions, for all methods of modulation. The form of the rows is confirmed
//! through 47 CFR §25.208, which states the same three-part form for the FSS bands it mirrors
//! ("(δ−5)/2", "obtained under assumed free-space propagation conditions";
//! <http://hallikainen.org/org/FCC/FccRules/2016/25/208>).
//!
//! How each band row is known (`BandLimit::status`, shown by every output that uses it):
//! * **25.5-27 GHz (EESS, space-to-Earth)**: -115 dB(W/m2) in any 1 MHz at 0-5 deg,
//!   -115 + 0.5 (δ - 5) at 5-25 deg, -105 at 25-90 deg, read in 47 CFR §25.208(p) ("the Earth
//!   exploration-satellite service in the band 25.5-27 GHz"; eCFR text after 89 FR 34167 of
//!   30 April 2024, read in a public mirror of the eCFR, `section-25.208.md`): the FCC's
//!   domestic rule for that band. The Radio Regulations' own text was not read, so the row is
//!   confirmed in that rule, not in the Regulations.
//! * **2025-2110, 2200-2300 and 8025-8500 MHz**: **from memory**. No readable copy of the Radio
//!   Regulations, of a national rule or of an ITU-R or CEPT text quoting these rows was found
//!   (docs/REFERENCES.md §12 lists what was searched).
//!
//! The pfd of a carrier spread uniformly over its occupied bandwidth B (the modem's Rs (1 + roll-off)):
//!
//! ```text
//! pfd = EIRP - 10 log10(4 pi d^2) - 10 log10(max(B, B_ref) / B_ref)      dB(W/m2) in B_ref
//! ```
//!
//! (a carrier narrower than B_ref puts all of its power in one reference bandwidth). Whether an
//! emission complies is for the administration to decide; this is a planning estimate.
//!
//! A raised-cosine spectrum (`pfd.spectrum: raised-cosine`, [`Spectrum::RaisedCosine`]) instead:
//! the power spectral density of a carrier of symbol rate Rs = B / (1 + α) shaped by the
//! raised-cosine spectrum of roll-off α (J. G. Proakis, *Digital Communications*, 4th ed.,
//! section 9.2, the raised-cosine spectrum X_rc(f); from memory, not re-read), normalized to the
//! carrier power P:
//!
//! ```text
//! S(f) = P / Rs                                              |f| <= (1 - α) Rs / 2
//!      = P / (2 Rs) [1 + cos(π / (α Rs) (|f| - (1 - α) Rs / 2))]   (1 - α) Rs / 2 < |f| <= (1 + α) Rs / 2
//!      = 0                                                   beyond
//! ```
//!
//! S is even and non-increasing in |f|, so the reference bandwidth holding the most power is the
//! one centred on the carrier, and its share is the closed-form integral
//! `2 F(B_ref / 2)`, with F(x) = ∫_0^x S / P:
//!
//! ```text
//! F(x) = x / Rs                                               x <= f1 = (1 - α) Rs / 2
//!      = f1 / Rs + [(x - f1) + (α Rs / π) sin(π (x - f1) / (α Rs))] / (2 Rs)   f1 < x <= f2
//!      = 1 / 2                                                x > f2 = (1 + α) Rs / 2
//! ```
//!
//! For B_ref << Rs the share is B_ref / Rs: 10 log10(1 + α) dB above the uniform assumption.

/// One band of Table 21-4.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BandLimit {
    pub low_mhz: f64,
    pub high_mhz: f64,
    /// The services the row is for, as the table names them.
    pub services: &'static str,
    /// The limit for angles of arrival 0-5 deg, dB(W/m2) in the reference bandwidth.
    pub low_angle_limit_dbw_m2: f64,
    /// Reference bandwidth, Hz (4 kHz or 1 MHz).
    pub reference_bandwidth_hz: f64,
    /// How well the row is known: [`FROM_MEMORY`], or the text it was read in.
    pub status: &'static str,
}

/// The rows of Table 21-4 passbudget knows (space-to-Earth bands of the space science services).
/// The 25.5-27 GHz row is read in 47 CFR §25.208(p); the others are from memory (see the module
/// documentation).
pub const TABLE_21_4: &[BandLimit] = &[
    BandLimit {
        low_mhz: 2025.0,
        high_mhz: 2110.0,
        services: "space operation, Earth exploration-satellite, space research (space-to-Earth, space-to-space)",
        low_angle_limit_dbw_m2: -154.0,
        reference_bandwidth_hz: 4e3,
        status: FROM_MEMORY,
    },
    BandLimit {
        low_mhz: 2200.0,
        high_mhz: 2300.0,
        services: "space operation, Earth exploration-satellite, space research (space-to-Earth, space-to-space)",
        low_angle_limit_dbw_m2: -154.0,
        reference_bandwidth_hz: 4e3,
        status: FROM_MEMORY,
    },
    BandLimit {
        low_mhz: 8025.0,
        high_mhz: 8500.0,
        services: "Earth exploration-satellite, space research (space-to-Earth)",
        low_angle_limit_dbw_m2: -150.0,
        reference_bandwidth_hz: 4e3,
        status: FROM_MEMORY,
    },
    BandLimit {
        low_mhz: 25_500.0,
        high_mhz: 27_000.0,
        services: "Earth exploration-satellite (space-to-Earth)",
        low_angle_limit_dbw_m2: -115.0,
        reference_bandwidth_hz: 1e6,
        status: CFR_25_208_P,
    },
];

/// The status of a row not read in the Radio Regulations text.
pub const FROM_MEMORY: &str =
    "from memory: Radio Regulations Article 21 Table 21-4 row not confirmed in the text";

/// The status of the 25.5-27 GHz row: read in the FCC's rule that carries the limit.
pub const CFR_25_208_P: &str = "read in 47 CFR 25.208(p) (FCC rule for EESS space-to-Earth in 25.5-27 GHz, eCFR text after 89 FR 34167, 30 April 2024): -115 dB(W/m2) in 1 MHz at 0-5 deg, +0.5 dB/deg, -105 at 25-90 deg; the Radio Regulations text itself not read";

/// The Earth's radius for the angle-of-arrival geometry: WGS-84 equatorial radius, km.
pub const EARTH_RADIUS_KM: f64 = crate::units::WGS84_A_KM;

impl BandLimit {
    /// The band of `frequency_hz`, if passbudget's table has one.
    pub fn for_frequency(frequency_hz: f64) -> Option<&'static BandLimit> {
        let f_mhz = frequency_hz / 1e6;
        TABLE_21_4
            .iter()
            .find(|b| f_mhz >= b.low_mhz && f_mhz <= b.high_mhz)
    }

    /// The limit at angle of arrival `arrival_deg`, dB(W/m2) in the reference bandwidth.
    pub fn limit_dbw_m2(&self, arrival_deg: f64) -> f64 {
        let d = arrival_deg.clamp(0.0, 90.0);
        self.low_angle_limit_dbw_m2 + 0.5 * (d.clamp(5.0, 25.0) - 5.0)
    }
}

/// How the carrier's power is spread over its occupied bandwidth (`pfd.spectrum`).
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Spectrum {
    /// Uniform over the occupied bandwidth B (the default).
    Uniform,
    /// The raised-cosine spectrum of the modem's roll-off α over B = Rs (1 + α).
    RaisedCosine { roll_off: f64 },
}

impl Spectrum {
    /// The largest share of the carrier's power in any window of `reference_bandwidth_hz`, for a
    /// carrier of `occupied_bandwidth_hz` (0 < share <= 1).
    pub fn peak_share(&self, occupied_bandwidth_hz: f64, reference_bandwidth_hz: f64) -> f64 {
        match *self {
            Spectrum::Uniform => {
                reference_bandwidth_hz / occupied_bandwidth_hz.max(reference_bandwidth_hz)
            }
            Spectrum::RaisedCosine { roll_off } => {
                let a = roll_off.clamp(0.0, 1.0);
                let rs = occupied_bandwidth_hz / (1.0 + a);
                (2.0 * raised_cosine_half_share(rs, a, reference_bandwidth_hz / 2.0)).min(1.0)
            }
        }
    }

    /// The words of the outputs: `uniform over the occupied bandwidth` or the roll-off's shape.
    pub fn label(&self) -> String {
        match self {
            Spectrum::Uniform => "spectrum uniform over the occupied bandwidth".into(),
            Spectrum::RaisedCosine { roll_off } => {
                format!("raised-cosine spectrum of roll-off {roll_off} (the worst B_ref window, centred)")
            }
        }
    }
}

/// F(x) = ∫_0^x S(f) df / P of the raised-cosine spectrum of symbol rate `rs` and roll-off `a`
/// (module documentation).
fn raised_cosine_half_share(rs: f64, a: f64, x: f64) -> f64 {
    let f1 = (1.0 - a) * rs / 2.0;
    let f2 = (1.0 + a) * rs / 2.0;
    if x <= f1 {
        x / rs
    } else if x <= f2 && a > 0.0 {
        let u = x - f1;
        f1 / rs
            + (u + a * rs / std::f64::consts::PI * (std::f64::consts::PI * u / (a * rs)).sin())
                / (2.0 * rs)
    } else {
        0.5
    }
}

/// pfd of `eirp_dbw` at `distance_km`, spread uniformly over `occupied_bandwidth_hz`, in
/// `reference_bandwidth_hz`, dB(W/m2).
pub fn pfd_dbw_m2(
    eirp_dbw: f64,
    distance_km: f64,
    occupied_bandwidth_hz: f64,
    reference_bandwidth_hz: f64,
) -> f64 {
    pfd_shaped_dbw_m2(
        eirp_dbw,
        distance_km,
        occupied_bandwidth_hz,
        reference_bandwidth_hz,
        Spectrum::Uniform,
    )
}

/// pfd of `eirp_dbw` at `distance_km` with the `spectrum`'s largest share of the power in one
/// `reference_bandwidth_hz`, dB(W/m2): EIRP - 10 log10(4 pi d^2) + 10 log10(share).
pub fn pfd_shaped_dbw_m2(
    eirp_dbw: f64,
    distance_km: f64,
    occupied_bandwidth_hz: f64,
    reference_bandwidth_hz: f64,
    spectrum: Spectrum,
) -> f64 {
    pfd_with_share_dbw_m2(
        eirp_dbw,
        distance_km,
        peak_share_db(occupied_bandwidth_hz, reference_bandwidth_hz, spectrum),
    )
}

/// 10 log10 of the `spectrum`'s largest share of the power in one `reference_bandwidth_hz` of an
/// `occupied_bandwidth_hz` carrier, dB (0 or less): a constant of the carrier, worked out once
/// per pass by the plan.
pub fn peak_share_db(
    occupied_bandwidth_hz: f64,
    reference_bandwidth_hz: f64,
    spectrum: Spectrum,
) -> f64 {
    match spectrum {
        // the uniform case exactly as before: 10 log10(max(B, B_ref) / B_ref)
        Spectrum::Uniform => {
            -10.0
                * (occupied_bandwidth_hz.max(reference_bandwidth_hz) / reference_bandwidth_hz)
                    .log10()
        }
        s => {
            10.0 * s
                .peak_share(occupied_bandwidth_hz, reference_bandwidth_hz)
                .log10()
        }
    }
}

/// pfd of `eirp_dbw` at `distance_km` with `share_db` ([`peak_share_db`]) of it in the reference
/// bandwidth, dB(W/m2): EIRP - 10 log10(4 pi d^2) + share.
pub fn pfd_with_share_dbw_m2(eirp_dbw: f64, distance_km: f64, share_db: f64) -> f64 {
    let d_m = distance_km * 1e3;
    let spread_db = 10.0 * (4.0 * std::f64::consts::PI * d_m * d_m).log10();
    eirp_dbw - spread_db + share_db
}

/// For a satellite at `altitude_km` over a spherical Earth of [`EARTH_RADIUS_KM`], the distance
/// (km) and the off-nadir angle (deg) to the point where it arrives at `arrival_deg`:
///
/// ```text
/// sin(off-nadir) = R cos δ / (R + h)
/// d = sqrt((R + h)^2 - R^2 cos^2 δ) - R sin δ
/// ```
pub fn arrival_geometry(altitude_km: f64, arrival_deg: f64) -> (f64, f64) {
    let r = EARTH_RADIUS_KM;
    let rs = r + altitude_km;
    let (s, c) = arrival_deg.to_radians().sin_cos();
    let d = (rs * rs - r * r * c * c).sqrt() - r * s;
    (d, (r * c / rs).asin().to_degrees())
}

/// The pfd at one geometry against the band's limit.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PfdAt {
    pub pfd_dbw_m2: f64,
    pub reference_bandwidth_hz: f64,
    pub limit_dbw_m2: f64,
    /// Limit minus pfd, dB (negative: over the limit).
    pub margin_db: f64,
    /// How the band's row is known ([`BandLimit::status`]).
    pub limit_status: &'static str,
}

impl BandLimit {
    /// The pfd of `eirp_dbw` over `occupied_bandwidth_hz` at `range_km`, arriving at
    /// `elevation_deg` (the angle of arrival at a station is its elevation), and its margin.
    pub fn at(
        &self,
        eirp_dbw: f64,
        range_km: f64,
        elevation_deg: f64,
        occupied_bandwidth_hz: f64,
        spectrum: Spectrum,
    ) -> PfdAt {
        let share_db = self.share_db(occupied_bandwidth_hz, spectrum);
        self.at_share(eirp_dbw, range_km, elevation_deg, share_db)
    }

    /// The carrier's [`peak_share_db`] in this band's reference bandwidth, dB.
    pub fn share_db(&self, occupied_bandwidth_hz: f64, spectrum: Spectrum) -> f64 {
        peak_share_db(occupied_bandwidth_hz, self.reference_bandwidth_hz, spectrum)
    }

    /// [`BandLimit::at`] with the carrier's share already worked out ([`BandLimit::share_db`]):
    /// the same value, for a pass's steps.
    pub fn at_share(
        &self,
        eirp_dbw: f64,
        range_km: f64,
        elevation_deg: f64,
        share_db: f64,
    ) -> PfdAt {
        let pfd = pfd_with_share_dbw_m2(eirp_dbw, range_km, share_db);
        let limit = self.limit_dbw_m2(elevation_deg);
        PfdAt {
            pfd_dbw_m2: pfd,
            reference_bandwidth_hz: self.reference_bandwidth_hz,
            limit_dbw_m2: limit,
            margin_db: limit - pfd,
            limit_status: self.status,
        }
    }

    /// The band as a label: `8025-8500 MHz`.
    pub fn label(&self) -> String {
        format!("{}-{} MHz", self.low_mhz, self.high_mhz)
    }

    /// Whether the row was read in a published text (not from memory).
    pub fn confirmed(&self) -> bool {
        self.status != FROM_MEMORY
    }
}

/// The worst case over the angles of arrival of one carrier.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct WorstArrival {
    /// Limit minus pfd at the worst angle, dB (negative: over the limit).
    pub margin_db: f64,
    pub arrival_deg: f64,
    pub pfd_dbw_m2: f64,
    pub limit_dbw_m2: f64,
}

/// The smallest margin over angles of arrival 0-90 deg (every 0.1 deg) of a carrier of
/// `occupied_bandwidth_hz` from `altitude_km`, with EIRP `eirp_at(off_nadir_deg)`.
pub fn worst_arrival(
    band: &BandLimit,
    altitude_km: f64,
    (occupied_bandwidth_hz, spectrum): (f64, Spectrum),
    eirp_at: impl Fn(f64) -> f64,
) -> WorstArrival {
    (0..=900)
        .map(|k| {
            let arrival_deg = k as f64 * 0.1;
            let (d, off_nadir) = arrival_geometry(altitude_km, arrival_deg);
            let pfd = pfd_shaped_dbw_m2(
                eirp_at(off_nadir),
                d,
                occupied_bandwidth_hz,
                band.reference_bandwidth_hz,
                spectrum,
            );
            let limit = band.limit_dbw_m2(arrival_deg);
            WorstArrival {
                margin_db: limit - pfd,
                arrival_deg,
                pfd_dbw_m2: pfd,
                limit_dbw_m2: limit,
            }
        })
        .min_by(|a, b| a.margin_db.total_cmp(&b.margin_db))
        .expect("901 angles")
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The limit's three parts (the form of 47 CFR §25.208, which mirrors Table 21-4; the
    /// 8025-8500 MHz row's -150 dB(W/m2) in 4 kHz is from memory).
    #[test]
    fn limit_against_the_table_form() {
        let b = BandLimit::for_frequency(8.2e9).unwrap();
        assert_eq!(b.reference_bandwidth_hz, 4e3);
        for (angle, want) in [
            (0.0, -150.0),
            (5.0, -150.0),
            (10.0, -147.5),
            (15.0, -145.0),
            (25.0, -140.0),
            (60.0, -140.0),
            (90.0, -140.0),
        ] {
            assert_eq!(b.limit_dbw_m2(angle), want, "{angle}");
        }
        assert!(BandLimit::for_frequency(5.0e9).is_none());
        // 47 CFR §25.208(p): EESS in 25.5-27 GHz, 1 MHz reference bandwidth
        let ka = BandLimit::for_frequency(26e9).unwrap();
        assert_eq!(ka.reference_bandwidth_hz, 1e6);
        assert!(ka.confirmed() && !b.confirmed());
        assert!(BandLimit::for_frequency(25.3e9).is_none());
        assert!(BandLimit::for_frequency(27.2e9).is_none());
    }

    /// A worked case by hand: EIRP 10 dBW at 1000 km spread over 10 MHz, in 4 kHz:
    /// 10 log10(4 pi (1e6 m)^2) = 10 log10(1.256637e13) = 130.9921 dB;
    /// 10 log10(10e6 / 4e3) = 10 log10(2500) = 33.9794 dB;
    /// pfd = 10 - 130.9921 - 33.9794 = -154.9715 dB(W/m2) in 4 kHz; against -140 at 30 deg,
    /// a margin of 14.97 dB. A 2 kHz carrier puts all its power in one 4 kHz: -120.9921.
    #[test]
    fn worked_case_by_hand() {
        let p = pfd_dbw_m2(10.0, 1000.0, 10e6, 4e3);
        assert!((p + 154.9715).abs() < 1e-4, "{p}");
        let b = BandLimit::for_frequency(8.2e9).unwrap();
        assert!((b.limit_dbw_m2(30.0) - p - 14.9715).abs() < 1e-4);
        assert!((pfd_dbw_m2(10.0, 1000.0, 2e3, 4e3) + 120.9921).abs() < 1e-4);
    }

    /// Geometry: at 90 deg the distance is the altitude and the off-nadir angle 0; at 0 deg the
    /// distance is the tangent sqrt((R+h)^2 - R^2) and sin(off-nadir) = R/(R+h).
    #[test]
    fn arrival_geometry_limits() {
        let (d, t) = arrival_geometry(500.0, 90.0);
        assert!((d - 500.0).abs() < 1e-9 && t.abs() < 1e-6);
        let (d, t) = arrival_geometry(500.0, 0.0);
        let r = EARTH_RADIUS_KM;
        assert!((d - ((r + 500.0).powi(2) - r * r).sqrt()).abs() < 1e-9);
        assert!((t - (r / (r + 500.0)).asin().to_degrees()).abs() < 1e-9);
    }

    /// An isotropic transmitter: the worst angle is where the limit is lowest for the shortest
    /// distance, i.e. at 5 deg (limit still -150, distance shorter than at 0 deg) or overhead.
    #[test]
    fn worst_arrival_of_an_isotropic_carrier() {
        let b = BandLimit::for_frequency(8.2e9).unwrap();
        let w = worst_arrival(b, 600.0, (1e6, Spectrum::Uniform), |_| 0.0);
        let check = |a: f64| {
            let (d, _) = arrival_geometry(600.0, a);
            b.limit_dbw_m2(a) - pfd_dbw_m2(0.0, d, 1e6, 4e3)
        };
        assert_eq!(w.margin_db, check(w.arrival_deg));
        for a in [0.0, 3.0, 5.0, 10.0, 25.0, 45.0, 90.0] {
            assert!(check(a) >= w.margin_db - 1e-12, "{a}");
        }
    }

    /// Raised cosine, B_ref << Rs, by hand: all of B_ref lies in the flat part, where the
    /// density is P / Rs, so the share is B_ref / Rs. Rs = 100 Mbaud, α = 0.35, B = 135 MHz,
    /// B_ref = 4 kHz: share 4e3 / 1e8 = 4e-5 (-43.9794 dB), against the uniform 4e3 / 1.35e8
    /// (-45.2827 dB): 10 log10(1.35) = 1.3033 dB more.
    #[test]
    fn raised_cosine_narrow_reference_by_hand() {
        let rc = Spectrum::RaisedCosine { roll_off: 0.35 };
        let share = rc.peak_share(135e6, 4e3);
        assert!((share - 4e-5).abs() < 1e-15, "{share}");
        let uniform = pfd_dbw_m2(10.0, 1000.0, 135e6, 4e3);
        let shaped = pfd_shaped_dbw_m2(10.0, 1000.0, 135e6, 4e3, rc);
        assert!(
            (shaped - uniform - 1.3033).abs() < 1e-4,
            "{}",
            shaped - uniform
        );
        assert!(
            (shaped - (10.0 - 130.9921 - 43.9794)).abs() < 1e-4,
            "{shaped}"
        );
    }

    /// Raised cosine, B_ref comparable to Rs: the closed form against a numerical integral of
    /// the density over every position of the window (Simpson, 20,000 intervals), whose largest
    /// value is the worst window; and the whole carrier inside a wide B_ref.
    #[test]
    fn raised_cosine_wide_reference_against_an_integral() {
        let density = |rs: f64, a: f64, f: f64| {
            let (f1, f2) = ((1.0 - a) * rs / 2.0, (1.0 + a) * rs / 2.0);
            let x = f.abs();
            if x <= f1 {
                1.0 / rs
            } else if x <= f2 {
                (1.0 + (std::f64::consts::PI / (a * rs) * (x - f1)).cos()) / (2.0 * rs)
            } else {
                0.0
            }
        };
        let simpson = |lo: f64, hi: f64, g: &dyn Fn(f64) -> f64| {
            let n = 20_000;
            let h = (hi - lo) / n as f64;
            let mut sum = g(lo) + g(hi);
            for k in 1..n {
                sum += g(lo + k as f64 * h) * if k % 2 == 1 { 4.0 } else { 2.0 };
            }
            sum * h / 3.0
        };
        for (a, rs, bref) in [
            (0.35, 1e6, 1e6),
            (0.2, 2e6, 1e6),
            (0.5, 1e6, 1.2e6),
            (1.0, 1e6, 0.7e6),
        ] {
            let g = |f: f64| density(rs, a, f);
            // the whole spectrum integrates to 1
            let total = simpson(-(1.0 + a) * rs / 2.0, (1.0 + a) * rs / 2.0, &g);
            assert!((total - 1.0).abs() < 1e-9, "{total}");
            let worst = (-40..=40)
                .map(|k| {
                    let c = k as f64 * rs / 100.0;
                    simpson(c - bref / 2.0, c + bref / 2.0, &g)
                })
                .fold(0.0, f64::max);
            let share = Spectrum::RaisedCosine { roll_off: a }.peak_share(rs * (1.0 + a), bref);
            assert!((share - worst).abs() < 1e-9, "a {a}: {share} vs {worst}");
        }
        let rc = Spectrum::RaisedCosine { roll_off: 0.35 };
        assert_eq!(rc.peak_share(1.35e6, 2e6), 1.0);
        // α = 0: a rectangle of width Rs, the same as uniform
        let rect = Spectrum::RaisedCosine { roll_off: 0.0 };
        assert!((rect.peak_share(1e6, 4e3) - 4e-3).abs() < 1e-15);
    }
}
