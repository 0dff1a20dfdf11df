//! The mission's own modulation and coding schemes (`modem.schemes`): thresholds read from a
//! table, framing overhead against a CCSDS frame, the three rates of an option, ladders given as
//! symbol rates, and the bad input that is refused with its file, line and key.

use crate::common::bin::{clean_error, json, root, run, write};
use crate::common::data::read_csv;
use passbudget::config::mission::Mission;
use passbudget::link::capacity::shannon_limit_ebn0_db;
use passbudget::link::modcod::{scheme, uncoded_psk_required_ebn0_db, Modulation};
use passbudget::link::schemes::{
    interpolate, EbN0Basis, Framing, SchemeRegistry, UserScheme, UserSchemeSpec, UserThreshold,
};
use std::path::Path;

/// A mission around the shipped example's elements and Nordkam station, with `modem` as its
/// modem block (indented by two spaces), whose first line is line 17.
fn mission_text(modem: &str) -> String {
    let r = root();
    format!(
        "name: user schemes\n\
         satellite:\n  elements: {}\n\
         stations:\n  - {}\n\
         window:\n  start: 2026-12-01T00:00:00Z\n  days: 1\n\
         transmitter:\n  frequency_mhz: 8212.5\n  power_w: 2\n  line_loss_db: 1\n  \
         antenna:\n    pattern: cos_n\n    gain_dbi: 6\n\
         modem:\n{modem}",
        r.join("examples/sat.tle").display(),
        r.join("stations/nordkam.yaml").display(),
    )
}

fn load(modem: &str) -> Result<Mission, passbudget::config::ConfigError> {
    Mission::from_yaml(Path::new("/tmp/user-schemes.yaml"), &mission_text(modem))
}

/// Uncoded BPSK as a user table: the scipy 1.17.1 points of `tests/data/link/scipy_bpsk_ebn0.csv`
/// (BER 1e-5, 1e-6, 1e-7; required Eb/N0 from Pb = Q(sqrt(2 Eb/N0))).
fn bpsk_table() -> Vec<(f64, f64)> {
    read_csv("link/scipy_bpsk_ebn0.csv")
        .iter()
        .map(|r| (r.num("ber"), r.num("ebn0_db")))
        .collect()
}

fn table_scheme(points: Vec<(f64, f64)>, error_rate: f64) -> UserSchemeSpec {
    UserSchemeSpec {
        name: "bpsk-table".into(),
        bits_per_symbol: 1,
        code_rate: 1.0,
        threshold: UserThreshold::Table {
            points,
            per: EbN0Basis::InformationBit,
        },
        error_rate,
        measure: passbudget::link::modcod::ErrorMeasure::Ber,
        framing: Framing::None,
    }
}

#[test]
fn a_table_reproduces_its_points_and_interpolates_in_log_error_rate() {
    // scipy 1.17.1 norm.isf (tests/data/link/scipy_bpsk_ebn0.csv): the table's own points come
    // back exactly, whatever the order the table is given in.
    let table = bpsk_table();
    for &(ber, db) in &table {
        let s = UserScheme::new(&table_scheme(table.clone(), ber)).unwrap();
        assert_eq!(s.required_ebn0_db, db, "BER {ber}");
        let mut reversed = table.clone();
        reversed.reverse();
        assert_eq!(interpolate(&reversed, ber).unwrap(), db);
    }
    // Between two points: linear in log10(error rate) (the README's rule): at 10^-5.5 the mean of
    // the 1e-5 and 1e-6 values; at 10^-5.25 a quarter of the way.
    let (a, b) = (table[0].1, table[1].1);
    let mid = interpolate(&table, 10f64.powf(-5.5)).unwrap();
    assert!((mid - (a + b) / 2.0).abs() < 1e-12, "{mid}");
    let quarter = interpolate(&table, 10f64.powf(-5.25)).unwrap();
    assert!((quarter - (a + 0.25 * (b - a))).abs() < 1e-12, "{quarter}");
    // The exact BPSK curve (Q-function inversion, itself checked against the same scipy file)
    // bends between decades: the interpolation stays within 0.05 dB of it there.
    let exact = uncoded_psk_required_ebn0_db(Modulation::Bpsk, 10f64.powf(-5.5)).unwrap();
    assert!((mid - exact).abs() < 0.05, "{mid} vs {exact}");
    assert!(mid != exact);
    // Outside the table: refused, not extrapolated.
    assert!(interpolate(&table, 1e-8).is_err());
    assert!(interpolate(&table, 1e-4).is_err());
}

/// CCSDS 131.0-B-2 §4.3.8 (TM Synchronization and Channel Coding, Blue Book, August 2011),
/// read in a public copy of the text: "when E = 16 and k = 223, for I=5 [the Reed-Solomon check
/// symbols are] always 1280 bits"; "The Attached Sync Marker used with R-S code [...] shall be the
/// 32-bit pattern [...]; shall precede the Transmitted Codeblock". With I = 5 the codeblock is
/// 5 x 255 octets = 10200 bits, the Transfer Frame in it 5 x 223 octets = 8920 bits.
const RS_CHECK_BITS: u64 = 1280;
const ASM_BITS: u64 = 32;
const CODEBLOCK_BITS: u64 = 5 * 255 * 8;
const TRANSFER_FRAME_BITS: u64 = 5 * 223 * 8;

#[test]
fn framing_overhead_reproduces_a_ccsds_reed_solomon_frame() {
    // The numbers of the Blue Book text agree with each other: frame + check symbols = codeblock.
    assert_eq!(TRANSFER_FRAME_BITS + RS_CHECK_BITS, CODEBLOCK_BITS);
    // One transmitted unit: ASM + codeblock = 10232 bits, of which 8920 carry the Transfer Frame:
    // efficiency 8920 / 10232 = 0.871775 (computed from the Blue Book's numbers).
    let frame = Framing::Frame {
        sync_marker_bits: ASM_BITS,
        parity_bits: RS_CHECK_BITS,
        header_bits: 0,
        frame_bits: ASM_BITS + CODEBLOCK_BITS,
    };
    let e = frame.efficiency().unwrap();
    assert!((e - 8920.0 / 10232.0).abs() < 1e-15, "{e}");
    assert!((e - 0.871775).abs() < 5e-7, "{e}");
    // The codeblock alone (no marker) is the RS(255,223) code rate 223/255 (131.0-B-2 §4.3):
    // a user scheme of RS(255,223) I=5 as overhead inside a rate-1/2 convolutional code has the
    // built-in `ccsds-rs-cc` spectral efficiency 2 x 1/2 x 223/255.
    let rs_inside_cc = UserScheme::new(&UserSchemeSpec {
        name: "rs-in-cc".into(),
        bits_per_symbol: 2,
        code_rate: 0.5,
        threshold: UserThreshold::EbN0 {
            db: 2.5,
            per: EbN0Basis::InformationBit,
        },
        error_rate: 1e-6,
        measure: passbudget::link::modcod::ErrorMeasure::Ber,
        framing: Framing::Frame {
            sync_marker_bits: 0,
            parity_bits: RS_CHECK_BITS,
            header_bits: 0,
            frame_bits: CODEBLOCK_BITS,
        },
    })
    .unwrap();
    let builtin = scheme("ccsds-rs-cc").unwrap();
    assert!((rs_inside_cc.spectral_efficiency - builtin.spectral_efficiency).abs() < 1e-15);
    // Eb/N0 per information bit from one per bit entering the code: + 10 log10(1 / e), here
    // 10 log10(10232 / 8920) = 0.5960 dB (computed).
    let per_code_bit = UserScheme::new(&UserSchemeSpec {
        name: "asm-rs".into(),
        bits_per_symbol: 2,
        code_rate: 1.0,
        threshold: UserThreshold::EbN0 {
            db: 6.0,
            per: EbN0Basis::CodeInputBit,
        },
        error_rate: 1e-5,
        measure: passbudget::link::modcod::ErrorMeasure::Fer,
        framing: frame,
    })
    .unwrap();
    let want = 6.0 + 10.0 * (10232.0f64 / 8920.0).log10();
    assert!((per_code_bit.required_ebn0_db - want).abs() < 1e-12);
    assert!((want - 6.0 - 0.5960).abs() < 1e-4);
}

#[test]
fn a_user_scheme_reports_its_three_rates_and_its_threshold_in_the_budget() {
    // A QPSK link carrying CCSDS RS frames with their marker (the frame of the test above),
    // 20 Mbit/s of information: channel rate 20e6 x 10232 / 8920, symbol rate half of it.
    let modem = "  schemes:\n    - name: Own-RS-QPSK\n      bits_per_symbol: 2\n      code_rate: 1\n      required_ebn0_db: 4.3\n      ebn0_per: information_bit\n      error_rate: 1.0e-5\n      error_measure: fer\n      overhead: { sync_marker_bits: 32, parity_bits: 1280, frame_bits: 10232 }\n  ladder:\n    - { rate_bps: 20.0e6, scheme: own-rs-qpsk }\n";
    let dir = tempfile::tempdir().unwrap();
    let m = write(dir.path(), "m.yaml", &mission_text(modem));
    let b = json(&run(&[
        "budget",
        &m,
        "--station",
        "Nordkam",
        "--elevation-deg",
        "30",
        "--format",
        "json",
    ]));
    let channel = 20e6 * 10232.0 / 8920.0;
    assert_eq!(b["scheme"], "own-rs-qpsk");
    assert_eq!(b["rate_bps"].as_f64().unwrap(), 20e6);
    assert!((b["channel_rate_bps"].as_f64().unwrap() - channel).abs() < 0.1);
    assert!((b["symbol_rate_baud"].as_f64().unwrap() - channel / 2.0).abs() < 0.1);
    assert!((b["framing_efficiency"].as_f64().unwrap() - 8920.0 / 10232.0).abs() < 1e-6);
    assert_eq!(b["required_ebn0_db"].as_f64().unwrap(), 4.3);
    // Eb/N0 is per information bit: C/N0 - 10 log10(Rb).
    let ebn0 = b["cn0_dbhz"].as_f64().unwrap() - 10.0 * 20e6f64.log10();
    assert!((b["ebn0_db"].as_f64().unwrap() - ebn0).abs() < 2e-4);
    let item = |name: &str| {
        b["items"]
            .as_array()
            .unwrap()
            .iter()
            .find(|i| i["name"] == name)
            .cloned()
            .unwrap_or_else(|| panic!("no item {name}"))
    };
    assert!((item("channel_rate")["value"].as_f64().unwrap() - channel).abs() < 0.1);
    // the threshold carries its provenance
    let source = item("required_ebn0")["source"]
        .as_str()
        .unwrap()
        .to_string();
    assert!(
        source.ends_with("user-defined in the mission file (modem.schemes)"),
        "{source}"
    );
}

#[test]
fn a_ladder_item_gives_one_scheme_at_several_symbol_rates() {
    let modem = "  schemes:\n    - name: own-ldpc\n      bits_per_symbol: 2\n      code_rate: 0.8745\n      table: [[1.0e-3, 3.6], [1.0e-5, 4.0], [1.0e-7, 4.3]]\n      error_rate: 1.0e-6\n      error_measure: ber\n  ladder:\n    - { scheme: own-ldpc, symbol_rates_baud: [1.0e6, 2.0e6, 5.0e6] }\n    - { scheme: dvbs2-qpsk-1/2, symbol_rates_baud: [1.0e6] }\n    - { rate_bps: 2.0e6, scheme: qpsk }\n";
    let m = load(modem).unwrap();
    let modem = m.modem.unwrap();
    let rates: Vec<(f64, &str)> = modem
        .ladder
        .iter()
        .map(|s| (s.rate_bps, s.scheme.as_str()))
        .collect();
    // Rb = Rs x bits per symbol x code rate x framing efficiency (2 x 0.8745 here).
    let eta = 2.0 * 0.8745;
    assert_eq!(rates.len(), 5);
    for (k, rs) in [1e6, 2e6, 5e6].iter().enumerate() {
        assert!((rates[k].0 - rs * eta).abs() < 1e-6, "{rates:?}");
        assert_eq!(rates[k].1, "own-ldpc");
        assert_eq!(modem.ladder[k].symbol_rate_baud, Some(*rs));
        assert_eq!(modem.ladder[k].line, modem.ladder[0].line);
    }
    // A built-in scheme by symbol rate: its Table 13 efficiency (ETSI EN 302 307-1, normal frame,
    // no pilots: (32208 - 80) / (32400 + 90) = 0.988858 bit/symbol for QPSK 1/2).
    assert!((rates[3].0 - 1e6 * (32208.0 - 80.0) / (32400.0 + 90.0)).abs() < 1e-6);
    assert_eq!(rates[4], (2e6, "qpsk"));
    // The table's threshold at 1e-6: half-way in log(error rate) between 4.0 and 4.3 dB.
    let reg: &SchemeRegistry = &modem.schemes;
    let op = reg
        .operating_point(reg.index("OWN-LDPC").unwrap(), Some(1e-6))
        .unwrap();
    assert!((op.required_ebn0_db - 4.15).abs() < 1e-12);
    assert!(op.required_ebn0_db > shannon_limit_ebn0_db(eta).unwrap());
}

#[test]
fn a_user_scheme_plans_like_a_built_in_one() {
    // The same threshold under two names: a user copy of `qpsk` at BER 1e-6 (10.5298 dB, the
    // scipy 1.17.1 value of tests/data/link/scipy_bpsk_ebn0.csv) and the built-in one at the
    // mission's target_ber 1e-6 give the same plan.
    let bpsk_1e6 = bpsk_table()[1];
    assert_eq!(bpsk_1e6.0, 1e-6);
    let own = format!(
        "  target_ber: 1.0e-6\n  schemes:\n    - {{ name: own-qpsk, bits_per_symbol: 2, code_rate: 1, required_ebn0_db: {}, error_rate: 1.0e-6, error_measure: ber }}\n  ladder:\n    - {{ rate_bps: 2.0e6, scheme: own-qpsk }}\n",
        bpsk_1e6.1
    );
    let builtin =
        "  target_ber: 1.0e-6\n  ladder:\n    - { rate_bps: 2.0e6, scheme: qpsk }\n".to_string();
    let dir = tempfile::tempdir().unwrap();
    let plan = |name: &str, modem: &str| {
        let m = write(dir.path(), name, &mission_text(modem));
        json(&run(&["plan", &m, "--format", "json", "--quiet"]))
    };
    let (a, b) = (plan("own.yaml", &own), plan("builtin.yaml", &builtin));
    assert_eq!(a["totals"]["volume_bits"], b["totals"]["volume_bits"]);
    assert!(a["totals"]["volume_bits"].as_f64().unwrap() > 0.0);
    let opt = &a["assumptions"]["rate_options"][0];
    assert_eq!(opt["scheme"], "own-qpsk");
    assert_eq!(opt["threshold_status"], "user");
    assert_eq!(
        opt["threshold_cn0_dbhz"],
        b["assumptions"]["rate_options"][0]["threshold_cn0_dbhz"]
    );
}

/// The modem block that the bad-input cases edit: a user scheme on lines 18-24 (its name on 18),
/// the ladder item on line 26.
const GOOD: &str = "  schemes:\n    - name: own-ldpc\n      bits_per_symbol: 2\n      code_rate: 0.8745\n      table: [[1.0e-3, 3.6], [1.0e-5, 4.0], [1.0e-7, 4.3]]\n      error_rate: 1.0e-6\n      error_measure: ber\n      overhead: { sync_marker_bits: 32, frame_bits: 8192 }\n  ladder:\n    - { rate_bps: 2.0e6, scheme: own-ldpc }\n";

#[test]
fn bad_schemes_are_refused_with_file_line_and_key() {
    // The good block: its table's 4.15 dB at 1e-6 is per bit entering the code (the default,
    // listed among the defaults since the 32-bit marker in 8192 bits moves it): per information
    // bit 4.15 + 10 log10(8192 / 8160) dB (computed).
    let good = load(GOOD).unwrap();
    assert!(good
        .defaults
        .iter()
        .any(|d| d.key == "modem.schemes.ebn0_per (own-ldpc)" && d.value == "code_input_bit"));
    let reg = &good.modem.as_ref().unwrap().schemes;
    let op = reg
        .operating_point(reg.index("own-ldpc").unwrap(), None)
        .unwrap();
    let want = 4.15 + 10.0 * (8192.0f64 / 8160.0).log10();
    assert!(
        (op.required_ebn0_db - want).abs() < 1e-12,
        "{}",
        op.required_ebn0_db
    );
    let dir = tempfile::tempdir().unwrap();
    let cases: &[(&str, &str, &str, &[&str])] = &[
        (
            "no threshold",
            "      table: [[1.0e-3, 3.6], [1.0e-5, 4.0], [1.0e-7, 4.3]]\n",
            "",
            &[":18:", "modem.schemes[0].required_ebn0_db", "no threshold"],
        ),
        (
            "table not monotonic",
            "[1.0e-5, 4.0]",
            "[1.0e-5, 3.0]",
            &[":21:", "modem.schemes[0].table", "not monotonic"],
        ),
        (
            "code rate above 1",
            "code_rate: 0.8745",
            "code_rate: 1.2",
            &[":20:", "modem.schemes[0].code_rate", "(0, 1]"],
        ),
        (
            "code rate 0",
            "code_rate: 0.8745",
            "code_rate: 0",
            &[":20:", "modem.schemes[0].code_rate", "(0, 1]"],
        ),
        (
            "overhead above 100 %",
            "sync_marker_bits: 32,",
            "sync_marker_bits: 9000,",
            &[":24:", "modem.schemes[0].overhead", "100 %"],
        ),
        (
            "efficiency above 1",
            "overhead: { sync_marker_bits: 32, frame_bits: 8192 }",
            "overhead: { efficiency: 1.2 }",
            &[":24:", "modem.schemes[0].overhead.efficiency", "(0, 1]"],
        ),
        (
            "a built-in name",
            "name: own-ldpc",
            "name: CCSDS-LDPC-R7/8",
            &[":18:", "modem.schemes[0].name", "built-in"],
        ),
        (
            "a control character in the name (a behaviour check of the input rule)",
            "name: own-ldpc",
            "name: \"own\\eldpc\"",
            &[
                ":18:",
                "modem.schemes[0].name",
                "control character (U+001B)",
            ],
        ),
        (
            "two thresholds",
            "      error_rate: 1.0e-6\n",
            "      required_ebn0_db: 4.0\n      error_rate: 1.0e-6\n",
            &[":22:", "modem.schemes[0].required_ebn0_db", "only one of"],
        ),
        (
            "a code rate that is not a number",
            "code_rate: 0.8745",
            "code_rate: half",
            &[":20:", "code_rate"],
        ),
        (
            "an unknown scheme in the ladder",
            "scheme: own-ldpc }",
            "scheme: own-lpdc }",
            &[":26:", "modem.ladder", "own-lpdc", "close names: own-ldpc"],
        ),
    ];
    for (what, from, to, needles) in cases {
        let text = mission_text(&GOOD.replacen(from, to, 1));
        assert_ne!(text, mission_text(GOOD), "{what}: the edit did not apply");
        let m = write(dir.path(), "bad.yaml", &text);
        let mut needles = needles.to_vec();
        needles.push("bad.yaml");
        clean_error(&run(&["passes", &m]), &needles);
    }
}
