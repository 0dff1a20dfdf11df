//! Free-space loss, Shannon limit, antennas, polarization.

use crate::common::tolerance::*;
use passbudget::link::antenna::*;
use passbudget::link::capacity::*;
use passbudget::link::path::{free_space_loss_db, PathError};
use passbudget::link::polarization::*;

#[test]
fn free_space_loss_textbook_values() {
    // Friis, 20 log10(4 pi d / lambda): 1000 km at 8.2 GHz = 170.72 dB (computed from the formula)
    let l = free_space_loss_db(1000.0, 8.2e9).unwrap();
    assert!((l - 170.7).abs() < REF_DB + 0.03, "{l}");
    // textbook engineering form (common practice): L = 32.45 + 20 log10(d_km) + 20 log10(f_MHz)
    for (d, f) in [
        (1000.0, 8.2e9),
        (2500.0, 2.25e9),
        (35786.0, 4e9),
        (500.0, 26e9),
    ] {
        let textbook = 32.45 + 20.0 * f64::log10(d) + 20.0 * f64::log10(f / 1e6);
        assert!((free_space_loss_db(d, f).unwrap() - textbook).abs() < REF_DB);
    }
    // 6.02 dB per doubling of range
    let d2 = free_space_loss_db(2000.0, 8.2e9).unwrap() - l;
    assert!((d2 - 20.0 * 2f64.log10()).abs() < IDENTITY_DB);
    assert!(
        matches!(free_space_loss_db(-1.0, 8e9), Err(PathError::Range { range_km }) if range_km == -1.0)
    );
    assert!(free_space_loss_db(1.0, 0.0).is_err());
}

#[test]
fn shannon_limit_tends_to_minus_1_59_db() {
    // Shannon 1948: Eb/N0 -> ln 2 = -1.5917 dB as eta -> 0
    let l = shannon_limit_ebn0_db(1e-9).unwrap();
    assert!((l - (-1.59)).abs() < 0.01, "{l}");
    assert!((l - 10.0 * std::f64::consts::LN_2.log10()).abs() < 1e-6);
    // eta = 2: (4 - 1)/2 = 1.5 -> 1.76 dB (first principles)
    assert!((shannon_limit_ebn0_db(2.0).unwrap() - 10.0 * 1.5f64.log10()).abs() < IDENTITY_DB);
    // C = B log2(1 + S/N): 1 MHz at 15 (11.76 dB) -> 4 Mbit/s
    assert!((shannon_capacity_bps(1e6, 15.0).unwrap() - 4e6).abs() < 1e-3);
    assert!(shannon_gap_db(3.0, 0.0).is_err());
    assert!(bi_awgn_limit_ebn0_db(1.0).is_err());
}

#[test]
fn cos_n_exponent_from_directivity() {
    // D = 2 (n + 1) for a cos^n power pattern over the forward hemisphere: 10 dBi -> n = 4
    let n = cos_exponent_from_gain(10.0).unwrap();
    assert!((n - 4.0).abs() < 1e-12);
    // first principles: numerical directivity 4 pi / integral(cos^n dOmega) equals 2(n+1)
    let steps = 20000;
    let h = std::f64::consts::FRAC_PI_2 / steps as f64;
    let mut integral = 0.0;
    for i in 0..steps {
        let t = (i as f64 + 0.5) * h;
        integral += t.cos().powf(n) * t.sin() * h * 2.0 * std::f64::consts::PI;
    }
    let d = 4.0 * std::f64::consts::PI / integral;
    assert!((d - 2.0 * (n + 1.0)).abs() / d < 1e-6);
    let tx = Transmitter::new(&TransmitterSpec {
        power: TxPower::Watts(2.0),
        line_loss_db: 1.0,
        pattern: TxPattern::CosN {
            boresight_gain_dbi: 10.0,
            n: None,
        },
    })
    .unwrap();
    // G(60 deg) = 10 + 40 log10(0.5) = -2.04 dBi
    let g = tx.gain_dbi(60.0).unwrap();
    assert!((g.gain_dbi - (10.0 + 40.0 * 0.5f64.log10())).abs() < 1e-9);
    // EIRP = 10 log10(2) - 1 + G
    let (eirp, _) = tx.eirp_dbw(0.0).unwrap();
    assert!((eirp - (10.0 * 2f64.log10() - 1.0 + 10.0)).abs() < 1e-12);
    assert!(matches!(
        tx.gain_dbi(90.0),
        Err(AntennaError::OffNadir { .. })
    ));
    assert!(matches!(
        cos_exponent_from_gain(2.0),
        Err(AntennaError::CosGainTooLow { .. })
    ));
}

#[test]
fn table_pattern_interpolates_and_flags_clamping() {
    let tx = Transmitter::new(&TransmitterSpec {
        power: TxPower::Dbw(3.0),
        line_loss_db: 0.5,
        pattern: TxPattern::Table(vec![[0.0, 6.0], [30.0, 4.0], [60.0, -2.0]]),
    })
    .unwrap();
    let g = tx.gain_dbi(45.0).unwrap();
    assert!((g.gain_dbi - 1.0).abs() < 1e-12 && !g.clamped);
    assert_eq!(tx.gain_dbi(30.0).unwrap().gain_dbi, 4.0);
    let out = tx.gain_dbi(70.0).unwrap();
    assert!(out.clamped && out.gain_dbi == -2.0);
    let bad = Transmitter::new(&TransmitterSpec {
        power: TxPower::Dbw(3.0),
        line_loss_db: 0.5,
        pattern: TxPattern::Table(vec![[0.0, 6.0], [0.0, 4.0]]),
    });
    assert!(matches!(bad, Err(AntennaError::TableRow { index: 1, .. })));
    let neg = Transmitter::new(&TransmitterSpec {
        power: TxPower::Watts(-5.0),
        line_loss_db: 0.5,
        pattern: TxPattern::Fixed { gain_dbi: 3.0 },
    });
    assert!(matches!(neg, Err(AntennaError::PowerWatts { watts }) if watts == -5.0));
}

#[test]
fn dish_gain_beamwidth_pointing() {
    let f = 8.2e9;
    let lambda = 299_792_458.0 / f;
    // aperture form G = 4 pi A_eff / lambda^2 (same physics written with the area)
    let d = 3.7;
    let area = std::f64::consts::PI * d * d / 4.0;
    let g = dish_gain_dbi(d, 0.6, f).unwrap();
    assert!(
        (g - 10.0 * (4.0 * std::f64::consts::PI * 0.6 * area / (lambda * lambda)).log10()).abs()
            < 1e-9
    );
    assert!((dish_beamwidth_deg(d, f).unwrap() - 70.0 * lambda / d).abs() < 1e-12);
    // pointing error of half the beamwidth -> 3 dB (the -3 dB point; common practice)
    assert!((pointing_loss_db(0.35, 0.7).unwrap() - 3.0).abs() < 1e-12);
    assert!(
        matches!(dish_gain_dbi(d, 1.2, f), Err(AntennaError::Efficiency { value }) if value == 1.2)
    );
    assert!(matches!(
        dish_gain_dbi(d, 0.0, f),
        Err(AntennaError::Efficiency { .. })
    ));
    assert!(matches!(
        pointing_loss_db(-0.1, 0.7),
        Err(AntennaError::PointingError { .. })
    ));
}

fn pol(sense: PolarizationSense, ar: f64) -> Polarization {
    Polarization {
        sense,
        axial_ratio_db: ar,
    }
}

#[test]
fn polarization_loss_limiting_cases() {
    use PolarizationSense::*;
    let w = EllipseOrientation::WorstCase;
    // identical circular -> 0 dB
    assert!(
        polarization_loss_db(&pol(Rhcp, 0.0), &pol(Rhcp, 0.0), w, 0.0)
            .unwrap()
            .abs()
            < 1e-12
    );
    // orthogonal circular: exact -> error, imperfect (1 dB AR each) -> large
    assert!(matches!(
        polarization_loss_db(&pol(Rhcp, 0.0), &pol(Lhcp, 0.0), w, 0.0),
        Err(PolarizationError::CrossPolarized { .. })
    ));
    // opposite senses, equal 1 dB axial ratios, major axes aligned: large (18.8 dB) but finite
    let l = polarization_loss_db(
        &pol(Rhcp, 1.0),
        &pol(Lhcp, 1.0),
        EllipseOrientation::BestCase,
        0.0,
    )
    .unwrap();
    assert!(l > 15.0 && l.is_finite(), "{l}");
    // ... with crossed major axes they are exactly the orthogonal polarization of each other
    assert!(matches!(
        polarization_loss_db(&pol(Rhcp, 1.0), &pol(Lhcp, 1.0), w, 0.0),
        Err(PolarizationError::CrossPolarized { .. })
    ));
    // circular vs linear -> 3.01 dB (any orientation)
    for o in [
        w,
        EllipseOrientation::BestCase,
        EllipseOrientation::TiltDifferenceDeg(17.0),
    ] {
        let l = polarization_loss_db(&pol(Lhcp, 0.0), &pol(Linear, 0.0), o, 0.0).unwrap();
        assert!((l - 3.0103).abs() < 1e-4, "{l}");
    }
    // linear vs linear: cos^2(dtau) (Malus): 45 deg -> 3.01 dB, 60 deg -> 6.02 dB
    let l45 = polarization_loss_db(
        &pol(Linear, 0.0),
        &pol(Linear, 0.0),
        EllipseOrientation::TiltDifferenceDeg(45.0),
        0.0,
    )
    .unwrap();
    assert!((l45 - 3.0103).abs() < 1e-4);
    let l60 = polarization_loss_factor(
        &pol(Linear, 0.0),
        &pol(Linear, 0.0),
        EllipseOrientation::TiltDifferenceDeg(60.0),
    )
    .unwrap();
    assert!((l60 - 0.25).abs() < 1e-12);
    // pure CP wave on a CP antenna of axial ratio r (common practice): PLF = (1 + r)^2 / (2 (1 + r^2));
    // AR 3 dB -> 0.125 dB; does not depend on orientation
    let r = 10f64.powf(3.0 / 20.0);
    let want = -10.0 * ((1.0 + r) * (1.0 + r) / (2.0 * (1.0 + r * r))).log10();
    for o in [w, EllipseOrientation::BestCase] {
        let l = polarization_loss_db(&pol(Rhcp, 0.0), &pol(Rhcp, 3.0), o, 0.0).unwrap();
        assert!((l - want).abs() < 1e-12);
    }
    assert!((want - 0.125).abs() < 0.005);
    // worst case >= best case for two elliptical antennas; extra loss adds
    let worst = polarization_loss_db(&pol(Rhcp, 2.0), &pol(Rhcp, 3.0), w, 0.3).unwrap();
    let best = polarization_loss_db(
        &pol(Rhcp, 2.0),
        &pol(Rhcp, 3.0),
        EllipseOrientation::BestCase,
        0.3,
    )
    .unwrap();
    assert!(worst > best && best > 0.3);
    assert!(polarization_loss_db(&pol(Rhcp, -1.0), &pol(Rhcp, 0.0), w, 0.0).is_err());
    assert!(polarization_loss_db(&pol(Rhcp, 0.0), &pol(Rhcp, 0.0), w, -0.1).is_err());
}

mod properties {
    use passbudget::link::path::free_space_loss_db;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(64))]
        /// Loss grows with range and with frequency (DESIGN.md property list).
        #[test]
        fn loss_grows_with_range_and_frequency(d in 1.0f64..50_000.0, f in 1e8f64..4e10, k in 1.0001f64..10.0) {
            let l = free_space_loss_db(d, f).unwrap();
            prop_assert!(free_space_loss_db(d * k, f).unwrap() > l);
            prop_assert!(free_space_loss_db(d, f * k).unwrap() > l);
        }
    }
}
