//! Sky temperature, galactic background, Friis cascade, antenna temperature, kTB.

use crate::common::tolerance::*;
use passbudget::noise::sky::*;
use passbudget::noise::system::*;

#[test]
fn p618_sky_temperature_check_values() {
    // ITU-R P.618-14 §3 eq. (69), Tmr = 275 K, background 2.7 K; docs/REFERENCES.md §4d [COMP]
    for (a_db, want) in [
        (0.0, 2.7),
        (1.0, 58.7044),
        (3.0, 138.5267),
        (10.0, 247.7700),
    ] {
        let t = sky_temperature_p618_k(a_db, 275.0, 2.7).unwrap();
        assert!((t - want).abs() < CHECK_4DP, "A={a_db}: {t}");
    }
    // eq. (70): Ts = 288.15 K -> Tmr = 270.7415 K
    assert!((mean_radiating_temperature_p618_k(288.15).unwrap() - 270.7415).abs() < CHECK_4DP);
    assert!(matches!(
        sky_temperature_p618_k(-1.0, 275.0, 2.7),
        Err(SkyError::Attenuation { .. })
    ));
}

#[test]
fn p372_galactic_background() {
    // P.372 galactic curve Fa = 52 - 23 log10 f_MHz; docs/REFERENCES.md §8: 100 MHz -> Fa 6.0 dB, Ta ~ 1155 K
    let (t, r) = galactic_temperature_p372_k(100e6).unwrap();
    assert!((t - 290.0 * 10f64.powf(0.6)).abs() < 1e-9);
    assert!((t - 1155.0).abs() / 1155.0 < REF_REL);
    assert_eq!(r, SkyRange::InRange);
    // above 1 GHz: continued power law, flagged, small beside the CMB at X band
    let (tx, rx) = background_temperature_k(8.2e9).unwrap();
    assert_eq!(rx, SkyRange::GalacticExtrapolated);
    assert!(tx > 2.725 && tx < 2.725 + 0.1);
    assert!(galactic_temperature_p372_k(5e6).is_err());
}

#[test]
fn friis_cascade_first_principles() {
    // First principles (Friis 1944): feed 0.5 dB at 290 K, LNA 50 K / 30 dB, later NF 8 dB.
    // T = (L-1) 290 + L 50 + L * 290 (10^0.8 - 1) / 1000
    let l = 10f64.powf(0.05);
    let want = (l - 1.0) * 290.0 + l * 50.0 + l * 290.0 * (10f64.powf(0.8) - 1.0) / 1000.0;
    let rx = Receiver::new(&ReceiverSpec {
        feed_loss_db: 0.5,
        feed_temperature_k: 290.0,
        lna_noise: LnaNoise::TemperatureK(50.0),
        lna_gain_db: 30.0,
        later_noise_figure_db: 8.0,
    })
    .unwrap();
    assert!((rx.temperature_k() - want).abs() < 1e-9);
    assert!((rx.temperature_k() - 93.21).abs() < 0.01); // hand arithmetic
                                                        // a passive attenuator at T0 has noise figure equal to its loss (IEEE Std 145 definition of F)
    let t = friis_cascade_k(&[Stage::passive_loss(3.0, 290.0)]);
    assert!((passbudget::units::temperature_k_to_noise_figure_db(t) - 3.0).abs() < 1e-12);
    // two-stage textbook form F = F1 + (F2 - 1)/G1 (Friis 1944), NF 2 dB / 20 dB then NF 10 dB
    let f1 = 10f64.powf(0.2);
    let f2 = 10f64.powf(1.0);
    let f = f1 + (f2 - 1.0) / 100.0;
    let t2 = friis_cascade_k(&[
        Stage::from_noise_figure(2.0, 20.0),
        Stage::from_noise_figure(10.0, 0.0),
    ]);
    assert!((t2 - 290.0 * (f - 1.0)).abs() < 1e-9);
    let bad = Receiver::new(&ReceiverSpec {
        feed_loss_db: -0.5,
        feed_temperature_k: 290.0,
        lna_noise: LnaNoise::NoiseFigureDb(0.8),
        lna_gain_db: 30.0,
        later_noise_figure_db: 8.0,
    });
    assert!(matches!(bad, Err(NoiseError::Loss { loss_db, .. }) if loss_db == -0.5));
}

#[test]
fn thermal_noise_ktb() {
    // kTB of a 300 K source over 60 kHz ~ 0.25 fW (common practice)
    let n = thermal_noise_power_w(300.0, 60e3);
    assert!((n - 0.25e-15).abs() / 0.25e-15 < REF_REL, "{n}");
}
