//! SGP4 against the published verification set: Vallado, Crawford, Hujsak, Kelso,
//! "Revisiting Spacetrack Report #3", AIAA 2006-6753, files SGP4-VER.TLE and tcppver.out
//! (as carried by python-sgp4, docs/REFERENCES.md §10, status [C]). Run through our
//! own loading path: TLE text -> parse_elements -> ElementSet -> Propagator.

use crate::common::tolerance::{SGP4_POSITION_KM, SGP4_VELOCITY_KM_S};
use passbudget::orbit::{parse_elements, select, Propagator};

// SGP4-VER.TLE lines, with the extra start/stop/step columns after column 69 as published.
const VER_TLE: &str = "\
#   near-Earth TEME example
1 00005U 58002B   00179.78495062  .00000023  00000-0  28098-4 0  4753
2 00005  34.2682 348.7242 1859667 331.7664  19.3264 10.82419157413667     0.00      4320.0        360.00
1 06251U 62025E   06176.82412014  .00008885  00000-0  12808-3 0  3985
2 06251  58.0579  54.0425 0030035 139.1568 221.1854 15.56387291  6774      0.0      2880.0        120.00
1 11801U          80230.29629788  .01431103  00000-0  14311-1      13
2 11801  46.7916 230.4354 7318036  47.4722  10.4117  2.28537848    13      0.0      1440.0        360.00
1 28129U 03058A   06175.57071136 -.00000104  00000-0  10000-3 0   459
2 28129  54.7298 324.8098 0048506 266.2640  93.1663  2.00562768 18443      0.0      1440.0        120.00
";

/// (catalog, minutes, position km, velocity km/s) from tcppver.out (docs/REFERENCES.md §10 tables).
#[allow(clippy::type_complexity)]
const EXPECTED: &[(u64, f64, [f64; 3], [f64; 3])] = &[
    (
        5,
        0.0,
        [7022.46529266, -1400.08296755, 0.03995155],
        [1.893841015, 6.405893759, 4.534807250],
    ),
    (
        5,
        360.0,
        [-7154.03120202, -3783.17682504, -3536.19412294],
        [4.741887409, -4.151817765, -2.093935425],
    ),
    (
        5,
        720.0,
        [-7134.59340119, 6531.68641334, 3260.27186483],
        [-4.113793027, -2.911922039, -2.557327851],
    ),
    (
        5,
        1440.0,
        [-938.55923943, -6268.18748831, -4294.02924751],
        [7.536105209, -0.427127707, 0.989878080],
    ),
    (
        5,
        4320.0,
        [-9060.47373569, 4658.70952502, 813.68673153],
        [-2.232832783, -4.110453490, -3.157345433],
    ),
    (
        6251,
        0.0,
        [3988.31022699, 5498.96657235, 0.90055879],
        [-3.290032738, 2.357652820, 6.496623475],
    ),
    (
        6251,
        120.0,
        [-3935.69800083, 409.10980837, 5471.33577327],
        [-3.374784183, -6.635211043, -1.942056221],
    ),
    (
        11801,
        0.0,
        [7473.37102491, 428.94748312, 5828.74846783],
        [5.107155391, 6.444680305, -0.186133297],
    ),
    (
        11801,
        360.0,
        [-3305.22148694, 32410.84323331, -24697.16974954],
        [-1.301137319, -1.151315600, -0.283335823],
    ),
    (
        11801,
        720.0,
        [14271.29083858, 24110.44309009, -4725.76320143],
        [-0.320504528, 2.679841539, -2.084054355],
    ),
    (
        11801,
        1440.0,
        [9787.87836256, 33753.32249667, -15030.79874625],
        [-1.094251553, 0.923589906, -1.522311008],
    ),
    (
        28129,
        0.0,
        [21707.46412351, -15318.61752390, 0.13551152],
        [1.304029214, 1.816904974, 3.161919976],
    ),
    (
        28129,
        720.0,
        [21858.23838148, -15101.51661554, 387.34517048],
        [1.247973967, 1.856017403, 3.161439948],
    ),
    (
        28129,
        1440.0,
        [22002.20074562, -14879.72595593, 774.32827099],
        [1.191573619, 1.894561165, 3.159953047],
    ),
];

#[test]
fn verification_set_through_our_loader() {
    let sets = parse_elements(VER_TLE).expect("SGP4-VER lines parse");
    assert_eq!(sets.len(), 4);
    let mut worst_r: f64 = 0.0;
    let mut worst_v: f64 = 0.0;
    for (id, minutes, r, v) in EXPECTED {
        let set = select(&sets, Some(&id.to_string())).unwrap();
        let prop = Propagator::new(set).unwrap();
        let s = prop.propagate_minutes(*minutes).unwrap();
        for k in 0..3 {
            let dr = (s.position_km[k] - r[k]).abs();
            let dv = (s.velocity_km_s[k] - v[k]).abs();
            worst_r = worst_r.max(dr);
            worst_v = worst_v.max(dv);
            assert!(
                dr < SGP4_POSITION_KM,
                "{id} t={minutes} r[{k}] {} vs {} (tcppver.out)",
                s.position_km[k],
                r[k]
            );
            assert!(
                dv < SGP4_VELOCITY_KM_S,
                "{id} t={minutes} v[{k}] {} vs {} (tcppver.out)",
                s.velocity_km_s[k],
                v[k]
            );
        }
    }
    eprintln!("worst |dr| = {worst_r:e} km, |dv| = {worst_v:e} km/s");
}

#[test]
fn deep_space_kept_state_matches_fresh_start() {
    // 11801 is 12 h resonant: a forward sweep reuses the integrator state; going back
    // restarts it. Both must give the published values (tcppver.out, as above).
    let sets = parse_elements(VER_TLE).unwrap();
    let prop = Propagator::new(select(&sets, Some("11801")).unwrap()).unwrap();
    let a = prop.propagate_minutes(1440.0).unwrap();
    let b = prop.propagate_minutes(360.0).unwrap();
    let c = prop.propagate_minutes(1440.0).unwrap();
    assert!((b.position_km[1] - 32410.84323331).abs() < SGP4_POSITION_KM);
    assert_eq!(a, c);
    assert_eq!(prop.propagations(), 3);
}

/// The planner's station searches each take a clone of one propagator. On the resonant 11801
/// a clone taken mid-sweep (its integrator state part way out) and a fresh propagator give the
/// same bits at every later time, and the same as the sweep that went on: the state is a cache,
/// not an input (the integration steps from the epoch in fixed steps; tcppver.out's orbit).
#[test]
fn deep_space_clone_mid_sweep_matches_fresh_start() {
    let sets = parse_elements(VER_TLE).unwrap();
    let set = select(&sets, Some("11801")).unwrap();
    let sweep = Propagator::new(set).unwrap();
    for minutes in [100.0, 700.0, 1000.0] {
        sweep.propagate_minutes(minutes).unwrap();
    }
    let clone = sweep.clone();
    let fresh = Propagator::new(set).unwrap();
    for minutes in [1000.5, 1440.0, 2160.0, 2890.25, 4320.0] {
        let on = sweep.propagate_minutes(minutes).unwrap();
        assert_eq!(
            clone.propagate_minutes(minutes).unwrap(),
            on,
            "{minutes} min"
        );
        assert_eq!(
            fresh.propagate_minutes(minutes).unwrap(),
            on,
            "{minutes} min"
        );
    }
    // A fresh propagator asked for a late time first, then swept: the same again.
    let late_first = Propagator::new(set).unwrap();
    let far = late_first.propagate_minutes(4320.0).unwrap();
    assert_eq!(far, fresh.propagate_minutes(4320.0).unwrap());
}
