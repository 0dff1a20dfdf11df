//! Chart rendering checks on SYNTHETIC data (invented satellite and stations, toy geometry and
//! toy link numbers made up for these tests only – they check drawing, not physics).
//!
//! Set `PASSBUDGET_CHART_DUMP=/some/dir` to also write every rendered chart there for viewing.

use chrono::{DateTime, Duration, NaiveDate, Utc};
use passbudget::chart::*;
use passbudget::timefmt::utc;

/// SYNTHETIC pass: a circular 550 km orbit over a spherical Earth, crossing at `offset_deg`
/// central angle from the station; toy Eb/N0, noise and loss curves.
fn synthetic_pass(pass_number: usize, aos: DateTime<Utc>, offset_deg: f64) -> PassChartData {
    let re_km = 6371.0f64;
    let r_km = re_km + 550.0;
    let omega = (398600.4418f64 / r_km.powi(3)).sqrt(); // rad/s
    let beta = offset_deg.to_radians();
    let elev = |dt: f64| {
        let g = (beta.cos() * (omega * dt).cos()).acos();
        let el = ((g.cos() - re_km / r_km) / g.sin()).atan().to_degrees();
        let rho = (re_km * re_km + r_km * r_km - 2.0 * re_km * r_km * g.cos()).sqrt();
        (el, rho)
    };
    // half-duration: where elevation crosses 0
    let mut half = 0.0;
    while elev(half).0 > 0.0 {
        half += 1.0;
    }
    let dur = 2.0 * half;
    let ladder = [5e6, 10e6, 25e6, 50e6, 100e6];
    let req_db = 4.4; // toy threshold + implementation loss
    let margin_req = 3.0;
    let chosen = 25e6;
    let mut samples = Vec::new();
    let mut t = 0.0;
    while t <= dur {
        let (el, rho) = elev(t - half);
        let el_c = el.max(0.5);
        let atm = (0.25 / el_c.to_radians().sin()).min(8.0);
        let tsys = 95.0 + 180.0 * (-el_c / 6.0).exp();
        // toy C/N0 in dB-Hz
        let cn0 = 93.0 - 20.0 * (rho / 1000.0).log10() - atm - 10.0 * (tsys / 100.0).log10();
        let ebn0 = cn0 - 10.0 * f64::log10(chosen);
        let margin = ebn0 - req_db;
        let adaptive = ladder
            .iter()
            .rev()
            .find(|&&r| cn0 - 10.0 * f64::log10(r) - req_db >= margin_req)
            .copied();
        samples.push(PassChartSample {
            t_s: t,
            elevation_deg: el,
            // toy azimuth: track heading south, closest on the east side
            azimuth_deg: (160.0 + f64::atan2(beta, -omega * (t - half)).to_degrees())
                .rem_euclid(360.0),
            range_km: rho,
            ebn0_db: ebn0,
            margin_db: margin,
            closed: margin >= margin_req,
            tracked: true,
            adaptive_rate_bps: adaptive,
            system_temperature_k: tsys,
            // toy split of Tsys: 70 K receiver, the rest shared by sky (80 %) and ground
            sky_noise_k: 0.8 * (tsys - 70.0),
            ground_noise_k: 0.2 * (tsys - 70.0),
            man_made_noise_k: 0.0,
            sun_noise_k: 0.0,
            moon_noise_k: 0.0,
            receiver_noise_k: 70.0,
            atmospheric_loss_db: atm,
            // toy terrain: 8 deg towards the first half of the pass, 5 deg after
            mask_elevation_deg: if t < half { 8.0 } else { 5.0 },
            // toy rain case: 2 dB more loss and 40 K more noise
            rain: Some(PassChartRain {
                ebn0_db: ebn0 - 2.0 - 10.0 * ((tsys + 40.0) / tsys).log10(),
                system_temperature_k: tsys + 40.0,
                atmospheric_loss_db: atm + 2.0,
            }),
        });
        t += 10.0;
    }
    let first = samples.iter().find(|s| s.closed).map(|s| s.t_s);
    let last = samples.iter().rev().find(|s| s.closed).map(|s| s.t_s);
    let at = |s: f64| aos + Duration::milliseconds((s * 1000.0) as i64);
    let closed_s = match (first, last) {
        (Some(a), Some(b)) => b - a,
        _ => 0.0,
    };
    let adaptive_bits: f64 = samples
        .iter()
        .map(|s| s.adaptive_rate_bps.unwrap_or(0.0) * 10.0)
        .sum();
    let max_el = samples
        .iter()
        .map(|s| s.elevation_deg)
        .fold(f64::MIN, f64::max);
    PassChartData {
        warnings: Vec::new(),
        starts_before_window: false,
        ends_after_window: false,
        satellite: "KESTREL-7 (synthetic)".into(),
        station: "Sierra Baja".into(),
        pass_number,
        pass_id: format!(
            "sierra-baja-{}",
            (aos + Duration::seconds(half as i64)).format("%Y%m%dT%H%MZ")
        ),
        aos,
        tca: at(half),
        los: at(dur),
        max_elevation_deg: max_el,
        rate_bps: first.map(|_| chosen),
        scheme: first.map(|_| "ccsds-rs-cc".to_string()),
        volume_bits: chosen * closed_s,
        adaptive_volume_bits: adaptive_bits,
        required_ebn0_db: first.map(|_| req_db),
        required_margin_db: margin_req,
        closes_from: first.map(at),
        closes_until: last.map(at),
        rain_exceedance_percent: Some(1.0),
        rain_rate_bps: first.map(|_| 10e6),
        rain_volume_bits: Some(10e6 * closed_s),
        samples,
    }
}

fn sample_pass() -> PassChartData {
    synthetic_pass(3, utc(2026, 12, 2, 1, 23, 17), 3.0)
}

fn dump(name: &str, bytes: &[u8]) {
    if let Ok(dir) = std::env::var("PASSBUDGET_CHART_DUMP") {
        std::fs::create_dir_all(&dir).unwrap();
        std::fs::write(std::path::Path::new(&dir).join(name), bytes).unwrap();
    }
}

/// Decode a PNG (palette or RGB); return (width, height, number of distinct colours, share of
/// non-white pixels).
fn png_stats(bytes: &[u8]) -> (u32, u32, usize, f64) {
    let mut decoder = png::Decoder::new(std::io::Cursor::new(bytes));
    // palette PNGs: expand each index to its RGB colour
    decoder.set_transformations(png::Transformations::EXPAND);
    let mut reader = decoder.read_info().expect("valid PNG header");
    let mut buf = vec![
        0;
        reader
            .output_buffer_size()
            .expect("an image size that fits in memory")
    ];
    let info = reader.next_frame(&mut buf).expect("valid PNG data");
    let px = &buf[..info.buffer_size()];
    let ch = info.color_type.samples();
    let mut colours = std::collections::BTreeSet::new();
    let mut ink = 0usize;
    for p in px.chunks(ch) {
        colours.insert(p[..3].to_vec());
        if p[..3] != [255, 255, 255] {
            ink += 1;
        }
    }
    let total = (info.width * info.height) as f64;
    (info.width, info.height, colours.len(), ink as f64 / total)
}

fn assert_not_blank(bytes: &[u8], w: u32, h: u32) {
    let (pw, ph, colours, ink) = png_stats(bytes);
    assert_eq!((pw, ph), (w, h));
    assert!(colours > 50, "only {colours} distinct colours");
    assert!(ink > 0.03, "only {:.1} % non-white pixels", ink * 100.0);
}

/// Draws a chart as PNG (written as `name`.png when dumping; checked for size and content) and as
/// SVG, checks that the SVG carries every needle and that a second drawing gives the same bytes.
fn render_checked(
    name: &str,
    (width, height): (u32, u32),
    draw: impl Fn(ChartFormat) -> Result<Vec<u8>, ChartError>,
    needles: &[&str],
) {
    let png = draw(ChartFormat::Png).unwrap();
    dump(&format!("{name}.png"), &png);
    assert_not_blank(&png, width, height);
    let svg = String::from_utf8(draw(ChartFormat::Svg).unwrap()).unwrap();
    for needle in needles {
        assert!(svg.contains(needle), "SVG lacks {needle:?}");
    }
    assert_eq!(draw(ChartFormat::Png).unwrap(), png);
    assert_eq!(draw(ChartFormat::Svg).unwrap(), svg.into_bytes());
}

#[test]
fn pass_png_has_size_and_content() {
    let png = draw_pass(&sample_pass(), ChartFormat::Png).unwrap();
    dump("pass.png", &png);
    assert_not_blank(&png, 1600, 1000);
}

#[test]
fn pass_svg_has_labels() {
    let d = sample_pass();
    let svg = String::from_utf8(draw_pass(&d, ChartFormat::Svg).unwrap()).unwrap();
    dump("pass.svg", svg.as_bytes());
    assert!(svg.starts_with("<svg"));
    for needle in [
        &format!(
            "KESTREL-7 (synthetic) over Sierra Baja · pass 3 ({}) · 2026-12-02",
            d.pass_id
        ),
        "25 Mbit/s ccsds-rs-cc",
        "Elevation (deg)",
        "Slant range (km)",
        "Eb/N0 (dB)",
        "Rate (Mbit/s)",
        "Noise temp. (K)",
        "rain case (1 %),",
        "Tsys, rain case (1 %)",
        "station mask at the",
        "rain (1 %): 10 Mbit/s",
        "Time (UTC)",
        "AOS 01:23:17",
        &format!("LOS {}", d.los.format("%H:%M:%S")),
        &format!("TCA {}", d.tca.format("%H:%M:%S")),
        &format!("closes from {}", d.closes_from.unwrap().format("%H:%M:%S")),
        &format!(
            "closes until {}",
            d.closes_until.unwrap().format("%H:%M:%S")
        ),
        "\n01:24\n",
    ] {
        assert!(svg.contains(needle), "SVG lacks {needle:?}");
    }
}

#[test]
fn pass_chart_is_deterministic() {
    let d = sample_pass();
    for f in [ChartFormat::Png, ChartFormat::Svg] {
        assert_eq!(draw_pass(&d, f).unwrap(), draw_pass(&d, f).unwrap());
    }
}

#[test]
fn pass_without_closing_rate() {
    // far-off pass: low elevation, nothing closes
    let mut d = synthetic_pass(7, utc(2026, 12, 2, 5, 0, 0), 19.0);
    d.rate_bps = None;
    d.scheme = None;
    d.required_ebn0_db = None;
    d.closes_from = None;
    d.closes_until = None;
    d.volume_bits = 0.0;
    let png = draw_pass(&d, ChartFormat::Png).unwrap();
    dump("pass-none.png", &png);
    assert_not_blank(&png, 1600, 1000);
    let svg = String::from_utf8(draw_pass(&d, ChartFormat::Svg).unwrap()).unwrap();
    assert!(svg.contains("no rate closes"));
    assert!(svg.contains("no ladder rate closes on this pass"));
}

#[test]
fn pass_with_short_closing_window_keeps_labels_apart() {
    let d = synthetic_pass(9, utc(2026, 12, 2, 7, 0, 0), 17.5);
    let (a, b) = (d.closes_from.unwrap(), d.closes_until.unwrap());
    assert!(
        (b - a).num_seconds() < 200,
        "synthetic pass should close briefly: {}",
        (b - a).num_seconds()
    );
    let png = draw_pass(&d, ChartFormat::Png).unwrap();
    dump("pass-short.png", &png);
    assert_not_blank(&png, 1600, 1000);
    let svg = String::from_utf8(draw_pass(&d, ChartFormat::Svg).unwrap()).unwrap();
    assert!(svg.contains(&format!(" closes until {}", b.format("%H:%M:%S"))));
}

#[test]
fn pass_edge_cases_do_not_panic() {
    let mut empty = sample_pass();
    empty.samples.clear();
    let svg = String::from_utf8(draw_pass(&empty, ChartFormat::Svg).unwrap()).unwrap();
    assert!(svg.contains("no samples for this pass"));
    let png = draw_pass(&empty, ChartFormat::Png).unwrap();
    assert_eq!(png_stats(&png).0, 1600);

    let mut one = sample_pass();
    let mid = one.samples.len() / 2;
    one.samples = vec![one.samples[mid].clone()];
    one.samples[0].t_s = 0.0;
    one.los = one.aos;
    one.tca = one.aos;
    let png = draw_pass(&one, ChartFormat::Png).unwrap();
    dump("pass-one.png", &png);
    assert_eq!(png_stats(&png).0, 1600);

    let mut nan = sample_pass();
    for (i, s) in nan.samples.iter_mut().enumerate() {
        if i % 7 == 0 {
            s.ebn0_db = f64::NAN;
            s.range_km = f64::INFINITY;
        }
    }
    nan.required_margin_db = f64::NAN;
    nan.max_elevation_deg = f64::NAN;
    let svg = String::from_utf8(draw_pass(&nan, ChartFormat::Svg).unwrap()).unwrap();
    assert!(!svg.contains("NaN"), "NaN leaked into the SVG");
}

#[test]
fn save_pass_writes_file_atomically() {
    let dir = tempfile::tempdir().unwrap();
    let d = sample_pass();
    let name = pass_file_name(d.pass_number, 9, &d.pass_id, ChartFormat::Png);
    assert_eq!(name, "pass-003-sierra-baja-20261202T0129Z.png");
    let path = dir.path().join(&name);
    save_pass(&d, &path, ChartFormat::Png).unwrap();
    assert_eq!(
        std::fs::read(&path).unwrap(),
        draw_pass(&d, ChartFormat::Png).unwrap()
    );
    // only the chart, no temporary file left behind
    assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
    // a folder that does not exist: an IO error naming the path
    let bad = dir.path().join("missing").join(&name);
    match save_pass(&d, &bad, ChartFormat::Png) {
        Err(ChartError::Io { path, .. }) => assert_eq!(path, bad),
        other => panic!("expected an IO error, got {other:?}"),
    }
}

#[test]
fn charts_draw_in_parallel() {
    let passes: Vec<_> = (0..6)
        .map(|i| {
            synthetic_pass(
                i,
                utc(2026, 12, 2, 1, 0, 0) + Duration::hours(i as i64 * 2),
                i as f64 * 3.0,
            )
        })
        .collect();
    let serial: Vec<_> = passes
        .iter()
        .map(|p| draw_pass(p, ChartFormat::Png).unwrap())
        .collect();
    let parallel: Vec<_> = std::thread::scope(|s| {
        let hs: Vec<_> = passes
            .iter()
            .map(|p| s.spawn(move || draw_pass(p, ChartFormat::Png).unwrap()))
            .collect();
        hs.into_iter().map(|h| h.join().unwrap()).collect()
    });
    assert_eq!(serial, parallel);
}

/// SYNTHETIC day of passes at one station for the sky chart.
fn sample_sky() -> SkyChartData {
    let mut passes = Vec::new();
    for (i, (hour, offset, rot)) in [
        (1, 3.0, 0.0),
        (3, 12.0, 40.0),
        (13, 7.0, 180.0),
        (15, 17.0, 215.0),
    ]
    .into_iter()
    .enumerate()
    {
        let p = synthetic_pass(i + 1, utc(2026, 12, 2, hour, 10, 0), offset);
        passes.push(SkyPass {
            label: p.pass_number.to_string(),
            points: p
                .samples
                .iter()
                .enumerate()
                .map(|(k, s)| SkyPoint {
                    azimuth_deg: (s.azimuth_deg + rot - 160.0).rem_euclid(360.0),
                    elevation_deg: s.elevation_deg,
                    // the last few points of the first pass have no budget
                    margin_db: if i == 0 && k + 5 > p.samples.len() {
                        None
                    } else {
                        Some(s.margin_db)
                    },
                    tracked: true,
                })
                .collect(),
            aos: p.aos,
            tca: p.tca,
            los: p.los,
            max_elevation_deg: p.max_elevation_deg,
            rate_bps: p.rate_bps,
        });
    }
    SkyChartData {
        warnings: Vec::new(),
        station: "Sierra Baja".into(),
        satellite: "KESTREL-7 (synthetic)".into(),
        title_date: "2026-12-02".into(),
        min_elevation_deg: 5.0,
        horizon_mask: vec![
            [0.0, 3.0],
            [40.0, 12.0],
            [70.0, 18.0],
            [110.0, 6.0],
            [250.0, 2.0],
            [300.0, 9.0],
        ],
        required_margin_db: 3.0,
        passes,
    }
}

#[test]
fn sky_renders() {
    let d = sample_sky();
    render_checked(
        "sky",
        (1400, 1000),
        |f| draw_sky(&d, f),
        &[
            "Sierra Baja",
            "\nN\n",
            "\nE\n",
            // the table beside the sky: the pass number with its times and rate
            "Passes (UTC)",
            "01:10:00",
            &d.passes[2].los.format("%H:%M:%S").to_string(),
            "25 Mbit/s",
            "Clear-sky margin at the pass&apos;s rate",
            "margin &lt; 0 dB",
            "no budget",
            "below horizon mask",
        ],
    );
    // no passes, no mask: still a chart
    let mut empty = d.clone();
    empty.passes.clear();
    empty.horizon_mask.clear();
    let svg = String::from_utf8(draw_sky(&empty, ChartFormat::Svg).unwrap()).unwrap();
    assert!(svg.contains("no passes to show"));
    // one-point pass
    let mut one = d;
    one.passes.truncate(1);
    one.passes[0].points.truncate(1);
    draw_sky(&one, ChartFormat::Png).unwrap();
}

/// SYNTHETIC mask trade-off: toy contact-time curve; each rate closes only above a toy
/// elevation, so its volume is flat below that elevation.
fn sample_mask() -> MaskChartData {
    let masks: Vec<f64> = (0..=40).map(f64::from).collect();
    let contact = |m: f64| 4.0 * 3600.0 * ((90.0 - m) / 90.0).powi(3);
    let ladder = [
        (10e6, 0.0, "10 Mbit/s bpsk-cc"),
        (25e6, 8.0, "25 Mbit/s qpsk-rs-cc"),
        (50e6, 15.0, "50 Mbit/s qpsk-ldpc"),
        (100e6, 25.0, "100 Mbit/s 8psk-ldpc"),
    ];
    MaskChartData {
        warnings: Vec::new(),
        scope: "Sierra Baja".into(),
        contact_s_per_day: masks.iter().map(|&m| contact(m)).collect(),
        rates: ladder
            .iter()
            .map(|&(r, el, label)| MaskRateSeries {
                label: label.into(),
                volume_bits_per_day: masks.iter().map(|&m| r * contact(m.max(el))).collect(),
            })
            .collect(),
        masks_deg: masks,
        configured_masks_deg: vec![("Sierra Baja".into(), 10.0)],
    }
}

#[test]
fn mask_renders() {
    let d = sample_mask();
    render_checked(
        "mask",
        (1600, 1000),
        |f| draw_mask(&d, f),
        &[
            "Elevation mask (deg)",
            "Contact per day (h)",
            "Volume per day (Gbit)",
            "configured mask 10.0°",
            "100 Mbit/s 8psk-ldpc",
        ],
    );
    let mut bad = d.clone();
    bad.rates[1].volume_bits_per_day.pop();
    assert!(matches!(
        draw_mask(&bad, ChartFormat::Png),
        Err(ChartError::LengthMismatch {
            expected: 41,
            got: 40,
            ..
        })
    ));
    let mut empty = d;
    empty.masks_deg.clear();
    empty.contact_s_per_day.clear();
    empty.rates.clear();
    let svg = String::from_utf8(draw_mask(&empty, ChartFormat::Svg).unwrap()).unwrap();
    assert!(svg.contains("no mask values to plot"));
}

/// SYNTHETIC 7-day plan at three invented stations, about 150 passes.
fn sample_summary() -> SummaryChartData {
    summary_over(7)
}

/// [`sample_summary`]'s passes and days over `days` days.
fn summary_over(n_days: i64) -> SummaryChartData {
    let start = utc(2026, 12, 2, 0, 0, 0);
    let stations = vec![
        "Sierra Baja".to_string(),
        "Punta Lenga".to_string(),
        "Isla Corva".to_string(),
    ];
    let mut passes = Vec::new();
    let mut k = 0u64;
    let mut t = start + Duration::minutes(37);
    while t < start + Duration::days(n_days) {
        // toy pseudo-random volumes from a fixed integer sequence (deterministic)
        k = k
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        let u = (k >> 33) as f64 / (1u64 << 31) as f64;
        let dur = Duration::seconds(240 + (u * 480.0) as i64);
        passes.push(SummaryBar {
            aos: t,
            los: t + dur,
            station_index: (k >> 20) as usize % 3,
            volume_bits: if u < 0.1 { 0.0 } else { u * 30e9 },
            adaptive_volume_bits: u * 42e9,
        });
        t += Duration::minutes(67);
    }
    let days = (0..n_days)
        .map(|i| {
            let day = start + Duration::days(i);
            let of_day = passes
                .iter()
                .filter(|p| p.aos >= day && p.aos < day + Duration::days(1));
            let (f, a) = of_day.fold((0.0, 0.0), |(f, a), p| {
                (f + p.volume_bits, a + p.adaptive_volume_bits)
            });
            DayTotals {
                date: day.date_naive(),
                fixed_bits: f,
                adaptive_bits: a,
                shannon_bits: 1.6 * a,
                network_bits: Some(0.9 * f),
                rain_bits: Some(0.7 * f),
            }
        })
        .collect();
    SummaryChartData {
        delivered_bits: Some(1.5e12),
        warnings: Vec::new(),
        satellite: "KESTREL-7 (synthetic)".into(),
        start,
        end: start + Duration::days(n_days),
        stations,
        passes,
        days,
        rain_exceedance_percent: Some(1.0),
    }
}

#[test]
fn summary_renders() {
    let d = sample_summary();
    assert!(d.passes.len() > 140);
    render_checked(
        "summary",
        (1600, 1000),
        |f| draw_summary(&d, f),
        &[
            "Plan summary · KESTREL-7 (synthetic)",
            "Volume per pass (Gbit)",
            "Volume per day (Gbit)",
            "Punta Lenga",
            "Shannon bound",
            "2026-12-03",
            "Thu 12-03",
            "network: each second",
            "fixed rate, rain",
            "% of Shannon",
            "Share of Shannon&apos;s bound",
        ],
    );
    // a window of whole days: no day is marked partial
    let svg = String::from_utf8(draw_summary(&d, ChartFormat::Svg).unwrap()).unwrap();
    assert!(!svg.contains("partial day"));
    assert_eq!(
        summary_file_name(&d.satellite, &d.start, &d.end, ChartFormat::Svg),
        "summary-kestrel-7-synthetic-20261202-20261209.svg"
    );
    let mut empty = d;
    empty.passes.clear();
    empty.days.clear();
    empty.end = empty.start;
    let svg = String::from_utf8(draw_summary(&empty, ChartFormat::Svg).unwrap()).unwrap();
    assert!(svg.contains("no passes in the window"));
    let _ = NaiveDate::from_ymd_opt(2026, 12, 2);
}

#[test]
fn non_finite_inputs_do_not_leak_or_panic() {
    let no_nan = |bytes: Vec<u8>| {
        let svg = String::from_utf8(bytes).unwrap();
        assert!(
            !svg.contains("NaN") && !svg.contains("inf"),
            "non-finite text in SVG"
        );
    };
    let mut sky = sample_sky();
    sky.passes[0].points[3].azimuth_deg = f64::NAN;
    sky.passes[1].points[5].margin_db = Some(f64::INFINITY);
    sky.horizon_mask.push([f64::NAN, 7.0]);
    sky.min_elevation_deg = f64::NAN;
    sky.required_margin_db = f64::NAN;
    no_nan(draw_sky(&sky, ChartFormat::Svg).unwrap());
    draw_sky(&sky, ChartFormat::Png).unwrap();

    let mut mask = sample_mask();
    mask.contact_s_per_day[4] = f64::NAN;
    mask.rates[0].volume_bits_per_day[7] = f64::INFINITY;
    mask.configured_masks_deg[0].1 = f64::NAN;
    no_nan(draw_mask(&mask, ChartFormat::Svg).unwrap());
    draw_mask(&mask, ChartFormat::Png).unwrap();

    let mut sum = sample_summary();
    sum.passes[2].volume_bits = f64::NAN;
    sum.passes[3].adaptive_volume_bits = f64::INFINITY;
    sum.days[1].shannon_bits = f64::NAN;
    no_nan(draw_summary(&sum, ChartFormat::Svg).unwrap());
    draw_summary(&sum, ChartFormat::Png).unwrap();
}

fn svg_text(bytes: Vec<u8>) -> String {
    String::from_utf8(bytes).unwrap()
}

/// Every chart carries the outputs' one caution (the text `summary.json` has in
/// `assumptions.caution`), wrapped to the chart's width: its first sentence fits on one line of
/// every chart, and no word of it is lost.
#[test]
fn every_chart_carries_the_caution() {
    let caution = passbudget::report::plan::CAUTION;
    let first = caution.split(". ").next().unwrap();
    assert!(first.contains("safety-of-life"));
    let words: Vec<&str> = caution.split_whitespace().collect();
    let charts = [
        svg_text(draw_pass(&sample_pass(), ChartFormat::Svg).unwrap()),
        svg_text(draw_sky(&sample_sky(), ChartFormat::Svg).unwrap()),
        svg_text(draw_mask(&sample_mask(), ChartFormat::Svg).unwrap()),
        svg_text(draw_summary(&sample_summary(), ChartFormat::Svg).unwrap()),
    ];
    for svg in &charts {
        assert!(svg.contains(first), "caution missing");
        for w in &words {
            assert!(svg.contains(w), "caution word {w:?} missing");
        }
    }
}

/// A kbit/s link reads in kbit/s on the pass chart: its rate axis, title and legend (a 9.6 kbit/s
/// rate once printed as "0 Mbit/s"). Units as in the SI Brochure (BIPM, 9th ed., section 3).
#[test]
fn pass_chart_of_a_kbit_link_speaks_kbit() {
    let mut d = sample_pass();
    let scale = 9600.0 / d.rate_bps.unwrap();
    d.rate_bps = Some(9600.0);
    d.rain_rate_bps = Some(1200.0);
    for s in &mut d.samples {
        s.adaptive_rate_bps = s.adaptive_rate_bps.map(|r| r * scale);
    }
    let svg = svg_text(draw_pass(&d, ChartFormat::Svg).unwrap());
    for needle in [
        "9.6 kbit/s ccsds-rs-cc",
        "Rate (kbit/s)",
        "Eb/N0 at 9.6 kbit/s",
        "fixed rate 9.6 kbit/s",
        "rain (1 %): 1.2 kbit/s",
    ] {
        assert!(svg.contains(needle), "SVG lacks {needle:?}");
    }
    assert!(!svg.contains("0 Mbit/s"));
    assert!(!svg.contains("Mbit/s)"));
}

/// The pass chart without a rain case draws neither rain line nor rain legend.
#[test]
fn pass_chart_without_rain_case() {
    let mut d = sample_pass();
    d.rain_exceedance_percent = None;
    d.rain_rate_bps = None;
    d.rain_volume_bits = None;
    for s in &mut d.samples {
        s.rain = None;
    }
    let svg = svg_text(draw_pass(&d, ChartFormat::Svg).unwrap());
    assert!(!svg.contains("rain"), "a rain entry without a rain case");
    assert!(svg.contains("Tsys, clear sky"));
}

/// "no budget" is in the sky legend only when a track has a point without a budget (the sample's
/// first pass has some); a legend entry for a look that is never drawn was misleading.
#[test]
fn sky_legend_lists_no_budget_only_when_drawn() {
    let mut d = sample_sky();
    assert!(svg_text(draw_sky(&d, ChartFormat::Svg).unwrap()).contains("no budget"));
    for p in &mut d.passes {
        for q in &mut p.points {
            q.margin_db = q.margin_db.or(Some(1.0));
        }
    }
    let svg = svg_text(draw_sky(&d, ChartFormat::Svg).unwrap());
    assert!(!svg.contains("no budget"));
    // every pass of the sample has a rate: no note on passes without one
    assert!(!svg.contains("none closes"));
    // each track is numbered on the sky and in the table, without AOS/LOS time labels on the sky
    for p in &d.passes {
        assert!(
            svg.contains(&format!("\n{}\n", p.label)),
            "label {}",
            p.label
        );
    }
    assert!(!svg.contains("AOS 0") && !svg.contains("LOS 0"));
    // a pass without a closing rate: the table and the legend say which margin its track shows
    d.passes[1].rate_bps = None;
    let svg = svg_text(draw_sky(&d, ChartFormat::Svg).unwrap());
    assert!(svg.contains("none closes"));
    assert!(svg.contains("lowest-threshold rate"));
}

/// Where the antenna cannot follow the satellite (the mount's rate limits near the zenith), the
/// charts say so: the pass chart shades the stretch in its rate panel, the sky chart draws that
/// part of the track in its own look, each with a legend entry, and neither when every sample is
/// followed (a gap in the rates with no reason beside it, and a track drawn as a working link
/// through the stretch, misled).
///
/// Basis: a behaviour check of what the output says (no published reference applies).
#[test]
fn charts_mark_where_the_antenna_cannot_follow() {
    let key = "antenna cannot follow";
    let mut pass = sample_pass();
    assert!(!svg_text(draw_pass(&pass, ChartFormat::Svg).unwrap()).contains(key));
    let mid = pass.samples.len() / 2;
    for q in &mut pass.samples[mid..mid + 10] {
        q.tracked = false;
        q.closed = false;
    }
    assert!(svg_text(draw_pass(&pass, ChartFormat::Svg).unwrap()).contains(key));

    let mut sky = sample_sky();
    assert!(!svg_text(draw_sky(&sky, ChartFormat::Svg).unwrap()).contains(key));
    let n = sky.passes[1].points.len();
    for q in &mut sky.passes[1].points[n / 2..n / 2 + 5] {
        q.tracked = false;
    }
    assert!(svg_text(draw_sky(&sky, ChartFormat::Svg).unwrap()).contains(key));
}

/// The sky chart's track breaks at a point of no position instead of joining its neighbours
/// with a chord across the sky, and a last point without a budget (its marker drawn in the
/// no-budget colour) puts "no budget" in the legend.
///
/// Basis: a behaviour check of what the output says (no published reference applies).
#[test]
fn sky_track_breaks_at_a_gap_and_lists_a_last_unbudgeted_point() {
    let mut d = sample_sky();
    for p in &mut d.passes {
        for q in &mut p.points {
            q.margin_db = q.margin_db.or(Some(5.0));
        }
    }
    let lines = |d: &SkyChartData| {
        svg_text(draw_sky(d, ChartFormat::Svg).unwrap())
            .matches("<polyline")
            .count()
    };
    let whole = lines(&d);
    assert!(!svg_text(draw_sky(&d, ChartFormat::Svg).unwrap()).contains("no budget"));
    let n = d.passes[1].points.len();
    d.passes[1].points[n / 2].azimuth_deg = f64::NAN;
    assert_eq!(lines(&d), whole + 1, "the track is drawn in two pieces");
    let last = d.passes[2].points.len() - 1;
    d.passes[2].points[last].margin_db = None;
    assert!(svg_text(draw_sky(&d, ChartFormat::Svg).unwrap()).contains("no budget"));
}

/// A rate that never closes (every value 0) says so in the legend instead of hiding on the zero
/// line; a rate far below the others gives its largest volume per day.
#[test]
fn mask_legend_marks_never_closing_and_tiny_rates() {
    let mut d = sample_mask();
    let n = d.masks_deg.len();
    d.rates.push(MaskRateSeries {
        label: "9.6 kbit/s cc-r1/2".into(),
        volume_bits_per_day: vec![0.0; n],
    });
    d.rates.push(MaskRateSeries {
        label: "1.2 kbit/s cc-r1/2".into(),
        volume_bits_per_day: (0..n).map(|i| 1e6 * (n - i) as f64).collect(),
    });
    let svg = svg_text(draw_mask(&d, ChartFormat::Svg).unwrap());
    assert!(svg.contains("9.6 kbit/s cc-r1/2"));
    assert!(svg.contains("never closes (on the 0 line)"));
    // the largest value of the tiny rate: 41 x 1 Mbit
    assert!(svg.contains("≤ 41 Mbit/day, near the 0 line"));
    // the rates that close at their scale carry no such note
    assert_eq!(svg.matches("never closes").count(), 1);
    assert_eq!(svg.matches("near the 0 line").count(), 1);
}

/// The all-stations mask chart names each station's configured mask (it said "configured mask
/// 3.0 deg" when the stations used 3, 5 and 5) and draws a line at each distinct value.
#[test]
fn mask_chart_of_all_stations_names_each_mask() {
    let mut d = sample_mask();
    d.scope = "all stations".into();
    d.configured_masks_deg = vec![
        ("Nordkam".into(), 5.0),
        ("Sierra Baja".into(), 3.0),
        ("Pulau Reka".into(), 5.0),
    ];
    let svg = svg_text(draw_mask(&d, ChartFormat::Svg).unwrap());
    assert!(svg
        .contains("configured mask per station: Nordkam 5.0°, Sierra Baja 3.0°, Pulau Reka 5.0°"));
    assert!(!svg.contains("configured mask 3.0°"));
    assert!(svg.contains(" 3.0°") && svg.contains(" 5.0°"));
    // every station at the same mask: said once
    for m in &mut d.configured_masks_deg {
        m.1 = 5.0;
    }
    let svg = svg_text(draw_mask(&d, ChartFormat::Svg).unwrap());
    assert!(svg.contains("configured mask 5.0° at every station"));
}

/// Days the window covers only in part are marked with their hours (a 12 h first day read as a
/// drop in volume), and the rain and network totals are in the legend only when given.
#[test]
fn summary_marks_partial_days() {
    let mut d = sample_summary();
    d.start += Duration::hours(12);
    d.end += Duration::hours(6);
    d.days.push(DayTotals {
        date: NaiveDate::from_ymd_opt(2026, 12, 9).unwrap(),
        fixed_bits: 1e11,
        adaptive_bits: 1.2e11,
        shannon_bits: 2e11,
        network_bits: None,
        rain_bits: None,
    });
    let svg = svg_text(draw_summary(&d, ChartFormat::Svg).unwrap());
    // On the passes' time axis a 12 h day is half as wide as a whole one, too narrow for the long
    // note on this 8-day chart: the hours alone.
    let texts = svg_texts(&svg);
    let marks: Vec<&str> = texts
        .iter()
        .map(|(_, t)| t.as_str())
        .filter(|t| t.ends_with(" h"))
        .collect();
    assert_eq!(marks, ["12 h", "6 h"], "first and last day");
    assert!(svg.contains("day the window"));
    // Over two days the first day's slot is wide enough for the whole note.
    let mut short = sample_summary();
    short.start += Duration::hours(12);
    short.end = short.start + Duration::hours(36);
    short.days.truncate(2);
    let svg = svg_text(draw_summary(&short, ChartFormat::Svg).unwrap());
    assert!(svg.contains("partial day: 12.0 h"), "two-day window");
    for t in &mut d.days {
        t.network_bits = None;
        t.rain_bits = None;
    }
    d.rain_exceedance_percent = None;
    let svg = svg_text(draw_summary(&d, ChartFormat::Svg).unwrap());
    assert!(!svg.contains("network") && !svg.contains("rain"));
}

/// The daily panels stand on the pass timeline's time axis: each day's label lies midway between
/// the two midnights that bound it on the timeline. They were equal slots per day, so with a
/// window opening at noon each day's label and bars stood some hours later on the timeline than
/// that day's passes (the label of 12-03 near the timeline's 12-04 midnight).
/// Basis: a behaviour check of what the chart draws (no published reference applies).
#[test]
fn summary_days_stand_under_their_passes() {
    let mut d = sample_summary();
    d.start += Duration::hours(12);
    let texts = svg_texts(&svg_text(draw_summary(&d, ChartFormat::Svg).unwrap()));
    let x_of = |label: &str| {
        let xs: Vec<f64> = texts
            .iter()
            .filter(|(_, t)| t == label)
            .map(|(x, _)| *x)
            .collect();
        assert_eq!(xs.len(), 1, "{label}: {xs:?}");
        xs[0]
    };
    let (midnight_3, midnight_4) = (x_of("2026-12-03"), x_of("2026-12-04"));
    let day_3 = x_of("Thu 12-03");
    assert!(
        (day_3 - (midnight_3 + midnight_4) / 2.0).abs() <= 2.0,
        "Thu 12-03 at {day_3}, midnights at {midnight_3} and {midnight_4}"
    );
    // The window's first half day (from noon): its label midway between the window start, half a
    // day before the midnight, and the midnight.
    let day_px = midnight_4 - midnight_3;
    let day_2 = x_of("Wed 12-02");
    assert!(
        (day_2 - (midnight_3 - day_px / 4.0)).abs() <= 2.0,
        "Wed 12-02 at {day_2}, midnight at {midnight_3}, a day {day_px} px"
    );
}

/// A day the window covers only in a sliver (a window opening at 23:00) gets no label, which
/// would print over the next day's; the labels that are drawn never overlap (a review found
/// "Tue 12-01" over "Wed 12-02" when the day axis first followed the timeline).
/// Basis: a behaviour check of what the chart draws (no published reference applies).
#[test]
fn summary_day_labels_never_overlap() {
    let mut d = sample_summary();
    d.start += Duration::hours(23);
    let texts = svg_texts(&svg_text(draw_summary(&d, ChartFormat::Svg).unwrap()));
    let days: Vec<(f64, &str)> = texts
        .iter()
        .filter(|(_, t)| t.len() == 9 && t.as_bytes()[3] == b' ' && t.contains("12-0"))
        .map(|(x, t)| (*x, t.as_str()))
        .collect();
    assert!(!days.iter().any(|(_, t)| *t == "Wed 12-02"), "{days:?}");
    assert!(days.iter().any(|(_, t)| *t == "Thu 12-03"), "{days:?}");
    for pair in days.windows(2) {
        // a label of 9 characters at the tick font is about 80 px wide
        assert!(pair[1].0 - pair[0].0 >= 80.0, "{days:?}");
    }
}

/// A week's pass bars (a few pixels wide) are drawn without their edges, which hid their
/// station's colour (the Nordkam bars read as black); the daily bars, wide, keep theirs.
/// Basis: a behaviour check of what the chart draws (no published reference applies).
#[test]
fn narrow_summary_bars_keep_their_colour() {
    let d = sample_summary();
    let svg = svg_text(draw_summary(&d, ChartFormat::Svg).unwrap());
    let edges = svg
        .split("<rect ")
        .filter(|r| r.split('>').next().unwrap_or("").contains("fill=\"none\""))
        .count();
    // the daily panel's 7 days x 4 totals are edged, the legend's keys too; no pass bar is
    assert!(
        edges >= 28 && edges < d.passes.len(),
        "{edges} edged rectangles"
    );
}

/// The text elements of an SVG chart: each one's `x` and its content.
fn svg_texts(svg: &str) -> Vec<(f64, String)> {
    svg.split("<text ")
        .skip(1)
        .filter_map(|t| {
            let x = t.split("x=\"").nth(1)?.split('"').next()?.parse().ok()?;
            let body = t.split_once('>')?.1.split("</text>").next()?;
            Some((x, body.trim().to_string()))
        })
        .collect()
}

/// `chart --pass ID` writes its one-pass sky chart under the pass's identifier and leaves the
/// day's sky chart of every pass as `plan --charts` wrote it (it used to overwrite it).
#[test]
fn chart_of_one_pass_keeps_the_days_sky_chart() {
    use crate::common::bin::{run, success};
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("out");
    let o = out.to_string_lossy().into_owned();
    let mission = "examples/wrenlet-1.yaml";
    success(&run(&[
        "plan", mission, "--days", "1", "--out", &o, "--charts",
    ]));
    let day = NaiveDate::from_ymd_opt(2026, 12, 1).unwrap();
    let days_chart = out.join(sky_file_name("Nordkam", day, ChartFormat::Png));
    let before = std::fs::read(&days_chart).unwrap();
    let one_name = "sky-nordkam-20261201T1852Z.png";
    // pass 3 is Nordkam's first pass of the day (AOS 18:49:37, LOS 18:54:59: the README's table);
    // by its number and by its identifier
    for pass in ["3", "nordkam-20261201T1852Z"] {
        success(&run(&[
            "chart", mission, "--days", "1", "--out", &o, "--pass", pass, "--kind", "sky",
        ]));
        assert_eq!(std::fs::read(&days_chart).unwrap(), before);
        let one = out.join(one_name);
        assert_eq!(
            sky_pass_file_name("nordkam-20261201T1852Z", ChartFormat::Png),
            one_name
        );
        let (w, h, _, _) = png_stats(&std::fs::read(&one).unwrap());
        assert_eq!((w, h), SKY_SIZE);
        std::fs::remove_file(&one).unwrap();
    }
}

/// The summary chart leads with the contact plan's delivered data, the per-pass totals after it
/// labelled as every pass's.
#[test]
fn the_summary_chart_leads_with_the_delivered_data() {
    let svg = String::from_utf8(
        passbudget::chart::draw_summary(&sample_summary(), passbudget::chart::ChartFormat::Svg)
            .unwrap(),
    )
    .unwrap();
    let delivered = svg
        .find("delivered 1.5 Tbit (contact plan)")
        .expect("delivered first");
    let every = svg
        .find("every pass: fixed rate")
        .expect("per-pass totals labelled");
    assert!(delivered < every);
}

/// The PNG charts are drawn straight into colour indices (`chart::indexed`); the same charts
/// drawn the way that replaced (plotters' RGB bitmap backend, then the palette pass) give the same
/// bytes: the sample charts, and the edge cases with no, one and non-finite samples.
#[test]
fn indexed_drawing_gives_the_rgb_backends_bytes() {
    let same = |name: &str, png: Vec<u8>, reference: Vec<u8>| {
        assert!(
            png == reference,
            "{name}: the indexed drawing changed bytes"
        );
    };
    let pass = sample_pass();
    let mut one = sample_pass();
    let mid = one.samples.len() / 2;
    one.samples = vec![one.samples[mid].clone()];
    one.samples[0].t_s = 0.0;
    let mut empty = sample_pass();
    empty.samples.clear();
    let mut nan = sample_pass();
    for (i, s) in nan.samples.iter_mut().enumerate() {
        if i % 7 == 0 {
            s.ebn0_db = f64::NAN;
            s.range_km = f64::INFINITY;
        }
    }
    for (name, p) in [
        ("pass", &pass),
        ("one", &one),
        ("empty", &empty),
        ("nan", &nan),
    ] {
        same(
            name,
            draw_pass(p, ChartFormat::Png).unwrap(),
            draw_reference_png(ReferenceChart::Pass(p)).unwrap(),
        );
    }
    let sky = sample_sky();
    same(
        "sky",
        draw_sky(&sky, ChartFormat::Png).unwrap(),
        draw_reference_png(ReferenceChart::Sky(&sky)).unwrap(),
    );
    let mask = sample_mask();
    same(
        "mask",
        draw_mask(&mask, ChartFormat::Png).unwrap(),
        draw_reference_png(ReferenceChart::Mask(&mask)).unwrap(),
    );
    let summary = sample_summary();
    same(
        "summary",
        draw_summary(&summary, ChartFormat::Png).unwrap(),
        draw_reference_png(ReferenceChart::Summary(&summary)).unwrap(),
    );
}

/// A pass the window cuts says so: the title names the cut, the edge is labelled with the
/// window's start or end instead of AOS or LOS, and a highest point at that edge is not labelled
/// TCA (the labels `AOS 20:30:00` and `TCA 20:30:00` overlapped, and the chart looked like a
/// whole pass).
///
/// Basis: a behaviour check of what the output says (no published reference applies).
#[test]
fn a_cut_pass_says_it_is_cut() {
    let mut d = sample_pass();
    let whole = svg_text(draw_pass(&d, ChartFormat::Svg).unwrap());
    assert!(whole.contains("AOS ") && whole.contains("TCA ") && !whole.contains("cut by"));
    d.starts_before_window = true;
    d.tca = d.aos;
    let cut = svg_text(draw_pass(&d, ChartFormat::Svg).unwrap());
    // (the SVG escapes the apostrophe)
    assert!(cut.contains("cut by the window"), "{cut}");
    assert!(
        cut.contains("window start ") && !cut.contains("AOS "),
        "{cut}"
    );
    assert!(
        !cut.contains("TCA ") && !cut.contains("closest approach"),
        "{cut}"
    );
    assert!(cut.contains("LOS "), "{cut}");
    // cut at the end with the highest point there: that edge is named, no TCA
    let mut end = sample_pass();
    end.ends_after_window = true;
    end.tca = end.los;
    let svg = svg_text(draw_pass(&end, ChartFormat::Svg).unwrap());
    assert!(svg.contains("window end ") && svg.contains("AOS "), "{svg}");
    assert!(
        !svg.contains("TCA ") && !svg.contains("closest approach"),
        "{svg}"
    );
    // cut at both ends with the highest point inside the window: a TCA like any other
    let mut both = sample_pass();
    (both.starts_before_window, both.ends_after_window) = (true, true);
    let svg = svg_text(draw_pass(&both, ChartFormat::Svg).unwrap());
    assert!(svg.contains("cut by the window at both ends"), "{svg}");
    assert!(
        svg.contains("window start ") && svg.contains("window end "),
        "{svg}"
    );
    assert!(
        svg.contains("TCA ") && svg.contains("closest approach"),
        "{svg}"
    );
}

/// A year on the plan summary: passes too many for bars are dots (bars overlapped into one
/// block, and the adaptive markers over them into a texture), days narrower than a day's bars
/// are a line per total (a year's 1,460 daily bars were sub-pixel slivers) and, the window being
/// in two years, the day labels give the year. The week keeps its bars, markers and weekday
/// labels. (The ticks only at labelled days were checked by viewing the charts.)
/// Basis: a behaviour check of what the chart draws (no published reference applies).
#[test]
fn a_year_summary_stays_readable() {
    let year = summary_over(365);
    let svg = svg_text(draw_summary(&year, ChartFormat::Svg).unwrap());
    assert!(
        svg.contains("dot: fixed-rate volume"),
        "the dense timeline's key"
    );
    assert!(!svg.contains("marker: adaptive volume"));
    // each dot in its station's shape, so the stations differ in more than colour: two of the
    // three stations' dots (triangles, squares) are polygons
    let polygons = svg.matches("<polygon").count();
    assert!(polygons > year.passes.len() / 2, "{polygons} polygons");
    // the rain case's daily bars, in its colour: none in the year (its legend key is a dotted
    // line of 2 px squares), one a day in the week
    let rain_rects = |svg: &str| -> Vec<f64> {
        (svg.split("<rect ").skip(1))
            .filter(|r| {
                r.split('>')
                    .next()
                    .unwrap_or("")
                    .contains("fill=\"#86306F\"")
            })
            .filter_map(|r| r.split("height=\"").nth(1)?.split('"').next()?.parse().ok())
            .collect()
    };
    let year_rain = rain_rects(&svg);
    assert!(
        year_rain.iter().all(|h| *h <= 2.0),
        "{year_rain:?}: the daily totals are lines"
    );
    let texts = svg_texts(&svg);
    let dated = |t: &str| t.len() == 10 && t.as_bytes()[4] == b'-' && t.as_bytes()[7] == b'-';
    assert!(texts
        .iter()
        .any(|(_, t)| dated(t) && t.starts_with("2027-")));
    assert!(
        !texts
            .iter()
            .any(|(_, t)| t.len() == 9 && t.as_bytes()[3] == b' '),
        "weekday labels"
    );
    let week = svg_text(draw_summary(&sample_summary(), ChartFormat::Svg).unwrap());
    assert!(week.contains("marker: adaptive volume") && week.contains("Thu 12-03"));
    // A few days across New Year keep the weekday beside the year.
    let mut new_year = summary_over(3);
    let shift = Duration::days(28);
    (new_year.start, new_year.end) = (new_year.start + shift, new_year.end + shift);
    for p in &mut new_year.passes {
        (p.aos, p.los) = (p.aos + shift, p.los + shift);
    }
    for t in &mut new_year.days {
        t.date += shift;
    }
    let texts = svg_texts(&svg_text(
        draw_summary(&new_year, ChartFormat::Svg).unwrap(),
    ));
    for day in ["Thu 2026-12-31", "Fri 2027-01-01"] {
        assert!(texts.iter().any(|(_, t)| t == day), "{day}: {texts:?}");
    }
    let week_rain = rain_rects(&week);
    assert!(
        week_rain.iter().filter(|h| **h > 2.0).count() >= 7,
        "{week_rain:?}: daily bars"
    );
}
