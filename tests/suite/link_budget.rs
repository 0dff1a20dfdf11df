//! The prepared link budget: hand-computed check, rate/elevation/rain behaviour,
//! typed errors, and no allocation in `evaluate`.

use crate::common::alloc::thread_allocations;
use crate::common::tolerance::*;
use passbudget::link::antenna::*;
use passbudget::link::budget::*;
use passbudget::link::modcod::{scheme, OperatingPoint};
use passbudget::noise::system::*;
use passbudget::noise::ExternalNoise;
use proptest::prelude::*;

fn spec() -> LinkModelSpec {
    crate::common::fixtures::link_spec(20e6)
}

fn op(name: &str) -> OperatingPoint {
    scheme(name).unwrap().operating_point(None).unwrap()
}

const GEOM: BudgetGeometry = BudgetGeometry {
    elevation_deg: 30.0,
    range_km: 1200.0,
    off_nadir_deg: 50.0,
};
/// Invented antenna noise terms (as a station's table would give them), K.
const EXT: ExternalNoise = ExternalNoise {
    sky_k: 20.0,
    ground_k: 8.0,
    man_made_k: 3.0,
    sun_k: 0.0,
    moon_k: 0.0,
};
const ATM: AtmosphereLoss = AtmosphereLoss {
    total_db: 0.3,
    absorptive_db: 0.25,
    mean_radiating_temperature_k: 275.0,
};

#[test]
fn hand_computed_budget() {
    let m = LinkModel::new(&spec()).unwrap();
    let r = m.rate_spec(2e6, op("ccsds-cc-r1/2"), 0.35, 1.5).unwrap();
    let v = m.evaluate(GEOM, ATM, EXT, r).unwrap();
    // Written out from first principles, independent of the library's helpers:
    let c = 299_792_458.0;
    let k = 1.380649e-23;
    let lambda = c / 8.2e9;
    let pi = std::f64::consts::PI;
    let db = |x: f64| 10.0 * x.log10();
    let n = 10f64.powf(0.6) / 2.0 - 1.0; // cos^n from D = 2(n+1)
    let eirp = db(2.0) - 1.0 + 6.0 + 10.0 * n * (50f64.to_radians().cos()).log10();
    let fsl = 20.0 * (4.0 * pi * 1200e3 / lambda).log10();
    let g = db(0.6 * (pi * 3.7 / lambda).powi(2));
    let bw = 70.0 * lambda / 3.7;
    let point = 12.0 * (0.05 / bw).powi(2);
    let rho_s = 10f64.powf(-2.0 / 20.0);
    let rho_g = 10f64.powf(-1.0 / 20.0);
    let plf = 0.5
        + (4.0 * rho_s * rho_g - (rho_s * rho_s - 1.0) * (rho_g * rho_g - 1.0))
            / (2.0 * (1.0 + rho_s * rho_s) * (1.0 + rho_g * rho_g));
    let pol = -db(plf) + 0.2;
    let tbg = 2.725 + 290.0 * 10f64.powf(5.2) * (8200f64).powf(-2.3);
    let tr = 10f64.powf(-0.025);
    let tsky = 275.0 * (1.0 - tr) + tbg * tr;
    let ta = 20.0 + 8.0 + 3.0; // the given terms (EXT)
    let l = 10f64.powf(0.03);
    let trx = (l - 1.0) * 290.0 + l * 60.0 + l * 290.0 * (10f64.powf(0.6) - 1.0) / 1000.0;
    let tsys = ta + trx;
    let gt = g - db(tsys);
    let cn0 = eirp - fsl - 0.3 - pol - point + gt - db(k);
    let rs = 2e6 / 1.0; // QPSK rate 1/2: 1 info bit per symbol
    let ebn0 = cn0 - db(2e6);
    let checks = [
        ("eirp", v.eirp_dbw, eirp),
        ("fsl", v.free_space_loss_db, fsl),
        ("gain", v.antenna_gain_dbi, g),
        ("pointing", v.pointing_loss_db, point),
        ("pol", v.polarization_loss_db, pol),
        ("tsky", v.sky_temperature_k, tsky),
        ("ta", v.antenna_temperature_k, ta),
        ("tsys", v.system_temperature_k, tsys),
        ("g/t", v.g_over_t_db_k, gt),
        ("cn0", v.cn0_dbhz, cn0),
        ("rs", v.symbol_rate_baud, rs),
        ("bocc", v.occupied_bandwidth_hz, rs * 1.35),
        ("ebn0", v.ebn0_db, ebn0),
        ("esn0", v.esn0_db, cn0 - db(rs)),
        ("margin", v.margin_db, ebn0 - 4.4 - 1.5),
        (
            "shannon",
            v.shannon_capacity_bps,
            rs * 1.35 * (1.0 + 10f64.powf(cn0 / 10.0) / (rs * 1.35)).log2(),
        ),
    ];
    for (what, got, want) in checks {
        assert!(
            (got - want).abs() <= 1e-9 * want.abs().max(1.0),
            "{what}: {got} vs {want}"
        );
    }
    assert!(v.galactic_extrapolated && !v.pattern_clamped && !v.below_horizon);
    // Shannon capacity exceeds the rate whenever the margin is positive
    if v.margin_db > 0.0 {
        assert!(v.shannon_capacity_bps > v.rate_bps);
    }
}

#[test]
fn doubling_the_rate_costs_3_0103_db() {
    let m = LinkModel::new(&spec()).unwrap();
    let a = m
        .evaluate(
            GEOM,
            ATM,
            EXT,
            m.rate_spec(1e6, op("qpsk"), 0.35, 1.0).unwrap(),
        )
        .unwrap();
    let b = m
        .evaluate(
            GEOM,
            ATM,
            EXT,
            m.rate_spec(2e6, op("qpsk"), 0.35, 1.0).unwrap(),
        )
        .unwrap();
    assert!((a.ebn0_db - b.ebn0_db - 3.0103).abs() < 1e-4);
    assert!((a.esn0_db - b.esn0_db - 3.0103).abs() < 1e-4);
    assert!((a.margin_db - b.margin_db - 3.0103).abs() < 1e-4);
    assert_eq!(a.cn0_dbhz, b.cn0_dbhz);
    assert!((b.occupied_bandwidth_hz - 2.0 * a.occupied_bandwidth_hz).abs() < 1e-6);
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]
    #[test]
    fn margin_falls_with_rate(r1 in 1e3f64..3e6, factor in 1.001f64..4.0, el in 1.0f64..90.0) {
        let m = LinkModel::new(&spec()).unwrap();
        let g = BudgetGeometry { elevation_deg: el, ..GEOM };
        let o = op("dvbs2-qpsk-1/2");
        let a = m.evaluate(g, ATM, EXT, m.rate_spec(r1, o, 0.2, 0.5).unwrap()).unwrap();
        let b = m.evaluate(g, ATM, EXT, m.rate_spec(r1 * factor, o, 0.2, 0.5).unwrap()).unwrap();
        prop_assert!(b.margin_db < a.margin_db);
        prop_assert!(a.antenna_temperature_k.is_finite() && a.margin_db.is_finite());
    }
}

#[test]
fn antenna_terms_add_up_and_rain_costs_more_than_its_attenuation() {
    let m = LinkModel::new(&spec()).unwrap();
    let r = m.rate_spec(1e6, op("qpsk"), 0.35, 1.0).unwrap();
    let clear = m.evaluate(GEOM, ATM, EXT, r).unwrap();
    // Ta = sky + ground + man-made; Tsys = Ta + T_rx (noise::system module doc)
    assert_eq!(clear.antenna_temperature_k, 20.0 + 8.0 + 3.0);
    assert_eq!(clear.system_temperature_k, 31.0 + clear.receiver_noise_k);
    assert_eq!(clear.receiver_noise_k, m.receiver().temperature_k());
    let rain = AtmosphereLoss {
        total_db: 3.3,
        absorptive_db: 3.2,
        mean_radiating_temperature_k: 275.0,
    };
    // The pattern-weighted sky of the rain case, as a table would give it.
    let wet_ext = ExternalNoise {
        sky_k: 140.0,
        ..EXT
    };
    let wet = m.evaluate(GEOM, rain, wet_ext, r).unwrap();
    assert!(wet.sky_temperature_k > clear.sky_temperature_k + 100.0);
    assert!(wet.antenna_temperature_k > clear.antenna_temperature_k);
    // rain costs more than its attenuation: the noise rises too (common practice)
    assert!(clear.cn0_dbhz - wet.cn0_dbhz > 3.0);
    let below = m
        .evaluate(
            BudgetGeometry {
                elevation_deg: -1.0,
                ..GEOM
            },
            ATM,
            EXT,
            r,
        )
        .unwrap();
    assert!(below.below_horizon);
    let bad = ExternalNoise {
        ground_k: f64::NAN,
        ..EXT
    };
    assert!(matches!(
        m.evaluate(GEOM, ATM, bad, r),
        Err(BudgetError::ExternalNoise { .. })
    ));
}

#[test]
fn typed_errors_carry_the_offending_value() {
    let mut s = spec();
    s.transmitter.power = TxPower::Watts(-2.0);
    assert!(matches!(
        LinkModel::new(&s),
        Err(BudgetError::Antenna(AntennaError::PowerWatts { watts })) if watts == -2.0
    ));
    let mut s = spec();
    s.ground_antenna = GroundAntennaSpec::Dish {
        diameter_m: 3.7,
        efficiency: 1.3,
        pointing_error_deg: 0.0,
    };
    assert!(matches!(
        LinkModel::new(&s),
        Err(BudgetError::Antenna(AntennaError::Efficiency { value })) if value == 1.3
    ));
    let mut s = spec();
    s.frequency_hz = -1.0;
    assert!(matches!(
        LinkModel::new(&s),
        Err(BudgetError::Frequency { .. })
    ));
    let mut s = spec();
    s.max_occupied_bandwidth_hz = Some(0.0);
    assert!(matches!(
        LinkModel::new(&s),
        Err(BudgetError::MaxBandwidth { .. })
    ));
    let mut s = spec();
    s.receiver.feed_loss_db = -0.1;
    assert!(matches!(
        LinkModel::new(&s),
        Err(BudgetError::Noise(NoiseError::Loss { .. }))
    ));

    let m = LinkModel::new(&spec()).unwrap();
    // 20 Mbit/s QPSK uncoded: Rs 10 Mbaud * 1.35 = 13.5 MHz fits; 40 Mbit/s does not
    assert!(m.rate_spec(20e6, op("qpsk"), 0.35, 0.0).is_ok());
    match m.rate_spec(40e6, op("qpsk"), 0.35, 0.0) {
        Err(BudgetError::RateExceedsBandwidth {
            rate_bps,
            occupied_bandwidth_hz,
            max_bandwidth_hz,
        }) => {
            assert_eq!(rate_bps, 40e6);
            assert!((occupied_bandwidth_hz - 27e6).abs() < 1e-3);
            assert_eq!(max_bandwidth_hz, 20e6);
        }
        other => panic!("{other:?}"),
    }
    // a RateSpec made without the model is still checked at evaluate
    let loose = RateSpec::new(40e6, op("qpsk"), 0.35, 0.0).unwrap();
    assert!(matches!(
        m.evaluate(GEOM, ATM, EXT, loose),
        Err(BudgetError::RateExceedsBandwidth { .. })
    ));
    assert!(matches!(
        RateSpec::new(0.0, op("qpsk"), 0.35, 0.0),
        Err(BudgetError::Rate { .. })
    ));
    assert!(
        matches!(RateSpec::new(1e6, op("qpsk"), 1.5, 0.0), Err(BudgetError::RollOff { value }) if value == 1.5)
    );
    assert!(matches!(
        RateSpec::new(1e6, op("qpsk"), 0.35, -1.0),
        Err(BudgetError::ImplementationLoss { .. })
    ));
    let r = m.rate_spec(1e6, op("qpsk"), 0.35, 0.0).unwrap();
    let g = BudgetGeometry {
        range_km: -5.0,
        ..GEOM
    };
    assert!(
        matches!(m.evaluate(g, ATM, EXT, r), Err(BudgetError::Range { range_km }) if range_km == -5.0)
    );
    let g = BudgetGeometry {
        elevation_deg: 91.0,
        ..GEOM
    };
    assert!(matches!(
        m.evaluate(g, ATM, EXT, r),
        Err(BudgetError::Elevation { .. })
    ));
    let g = BudgetGeometry {
        off_nadir_deg: 95.0,
        ..GEOM
    };
    assert!(matches!(
        m.evaluate(g, ATM, EXT, r),
        Err(BudgetError::Antenna(AntennaError::OffNadir { .. }))
    ));
    let a = AtmosphereLoss {
        absorptive_db: -0.1,
        ..ATM
    };
    assert!(matches!(
        m.evaluate(GEOM, a, EXT, r),
        Err(BudgetError::Atmosphere { .. })
    ));
    let a = AtmosphereLoss {
        mean_radiating_temperature_k: f64::NAN,
        ..ATM
    };
    assert!(matches!(
        m.evaluate(GEOM, a, EXT, r),
        Err(BudgetError::MeanRadiatingTemperature { .. })
    ));
}

#[test]
fn itemized_budget_agrees_with_values() {
    let m = LinkModel::new(&spec()).unwrap();
    let r = m.rate_spec(2e6, op("ccsds-turbo-r1/2"), 0.35, 1.0).unwrap();
    let v = m.evaluate(GEOM, ATM, EXT, r).unwrap();
    let items = m.itemize(GEOM, ATM, EXT, r).unwrap();
    let get = |n: &str| items.iter().find(|i| i.name == n).unwrap().value.unwrap();
    assert_eq!(get("margin"), v.margin_db);
    assert_eq!(get("cn0"), v.cn0_dbhz);
    assert_eq!(get("required_error_rate"), 1e-6);
    // the printed losses sum: EIRP + losses (negative) + G/T - k = C/N0
    let sum = get("eirp")
        + get("free_space_loss")
        + get("atmospheric_loss")
        + get("polarization_loss")
        + get("pointing_loss")
        + get("g_over_t")
        - get("boltzmann");
    assert!((sum - v.cn0_dbhz).abs() < IDENTITY_DB);
    assert!(items.iter().all(|i| !i.source.is_empty()));
}

#[test]
fn evaluate_allocates_nothing() {
    let m = LinkModel::new(&spec()).unwrap();
    let r = m.rate_spec(2e6, op("dvbs2-8psk-3/4"), 0.2, 1.0).unwrap();
    let before = thread_allocations();
    let mut acc = 0.0;
    for i in 0..1000 {
        let g = BudgetGeometry {
            elevation_deg: 5.0 + (i % 80) as f64,
            range_km: 600.0 + i as f64,
            off_nadir_deg: (i % 60) as f64,
        };
        acc += m.evaluate(g, ATM, EXT, r).unwrap().margin_db;
    }
    let after = thread_allocations();
    assert!(acc.is_finite());
    assert_eq!(after - before, 0, "evaluate allocated");
}

/// One bandwidth for every Shannon figure (README "Conventions"): B = Rs (1 + roll-off) in the
/// capacity C = B log2(1 + C/(N0 B)) and in the gap's efficiency eta = Rb / B, with the Shannon
/// limit Eb/N0 >= (2^eta - 1)/eta (C. E. Shannon, "A Mathematical Theory of Communication",
/// Bell Syst. Tech. J. 27, 1948; "Communication in the Presence of Noise", Proc. IRE 37, 1949).
/// Values worked by hand for 1 Mbit/s of ccsds-cc-r1/2 (1 information bit per symbol, required
/// Eb/N0 4.4 dB at BER 1e-5, the scheme table) with roll-off 0.35: Rs = 1 Mbaud, B = 1.35 MHz,
/// eta = 1/1.35 = 0.7407407 bit/s/Hz; 2^eta = 1.6710336; (2^eta - 1)/eta = 0.6710336 x 1.35 =
/// 0.9058954 = -0.4292197 dB; gap = 4.4 + 0.4292197 = 4.8292197 dB. At C/N0 = 65 dBHz:
/// S/N = 10^6.5 / 1.35e6 = 2.3424279, log2(3.3424279) = 1.7408964, C = 2 350 210.19 bit/s.
/// With roll-off 0 the same rate has B = Rs, eta = 1, limit (2 - 1)/1 = 0 dB, gap 4.4 dB.
#[test]
fn one_bandwidth_for_every_shannon_figure() {
    use passbudget::link::capacity::{shannon_capacity_bps, shannon_limit_ebn0_db};
    let m = LinkModel::new(&spec()).unwrap();
    let r = m.rate_spec(1e6, op("ccsds-cc-r1/2"), 0.35, 1.5).unwrap();
    let v = m.evaluate(GEOM, ATM, EXT, r).unwrap();
    assert!((v.occupied_bandwidth_hz - 1.35e6).abs() < 1e-6);
    assert!(
        (shannon_limit_ebn0_db(1e6 / v.occupied_bandwidth_hz).unwrap() + 0.4292197).abs() < 1e-6
    );
    assert!(
        (v.shannon_gap_db - 4.8292197).abs() < 1e-6,
        "{}",
        v.shannon_gap_db
    );
    let c = shannon_capacity_bps(1.35e6, 10f64.powf(6.5) / 1.35e6).unwrap();
    assert!((c - 2_350_210.19).abs() < 0.01, "{c}");
    // The budget's capacity is the same formula over the same B at its own C/N0.
    let b = v.occupied_bandwidth_hz;
    let want = shannon_capacity_bps(b, 10f64.powf(v.cn0_dbhz / 10.0) / b).unwrap();
    assert!((v.shannon_capacity_bps - want).abs() <= 1e-9 * want);
    // The rate sits exactly its gap from the capacity line: at Eb/N0 = required - gap, the
    // capacity over B equals the rate (S/N = eta (2^eta - 1)/eta = 2^eta - 1).
    let limit_ebn0 = 10f64.powf((v.required_ebn0_db - v.shannon_gap_db) / 10.0);
    let at_limit = shannon_capacity_bps(b, v.rate_bps * limit_ebn0 / b).unwrap();
    assert!(
        (at_limit - v.rate_bps).abs() <= 1e-9 * v.rate_bps,
        "{at_limit}"
    );
    // Roll-off 0: B = Rs and the gap is the scheme's own (eta = bits per symbol).
    let r0 = m.rate_spec(1e6, op("ccsds-cc-r1/2"), 0.0, 1.5).unwrap();
    let v0 = m.evaluate(GEOM, ATM, EXT, r0).unwrap();
    assert!((v0.shannon_gap_db - 4.4).abs() < 1e-12);
    assert_eq!(v0.shannon_gap_db, op("ccsds-cc-r1/2").shannon_gap_db);
}
