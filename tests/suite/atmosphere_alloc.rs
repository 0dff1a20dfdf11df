//! `PreparedAtmosphere::at` must not allocate (the pass hot path runs it every second).
//! The counting global allocator of `common::alloc` checks that, per thread.

use crate::common::alloc::thread_allocations;
use passbudget::atmosphere::{AtmosphereSite, PathSpec, PreparedAtmosphere, Weather};

#[test]
fn at_allocates_nothing() {
    let site = AtmosphereSite {
        latitude_deg: -12.5,
        altitude_km: 0.1,
        pressure_hpa: 1001.0,
        temperature_k: 299.0,
        water_vapour_density_g_m3: 18.0,
        rain_rate_001_mm_h: 90.0,
        rain_height_km: None,
        cloud_liquid_clear_kg_m2: Some(0.2),
        cloud_liquid_exceedance_kg_m2: Some(1.1),
        wet_refractivity: None,
    };
    let path = PathSpec {
        frequency_ghz: 26.0,
        polarization_tilt_deg: 45.0,
        antenna_diameter_m: 2.4,
        antenna_efficiency: 0.55,
    };
    let prep = PreparedAtmosphere::new(&site, &path).unwrap();
    let before = thread_allocations();
    let mut sum = 0.0;
    for i in 0..2000 {
        let el = i as f64 * 0.045 - 2.0;
        sum += prep.at(el, Weather::ClearSky).total_db;
        sum += prep.at(el, Weather::Exceedance { percent: 0.05 }).total_db;
        sum += prep
            .at(el, Weather::Exceedance { percent: 12.0 })
            .warnings
            .messages()
            .count() as f64;
    }
    let after = thread_allocations();
    assert!(sum.is_finite());
    assert_eq!(after - before, 0, "allocations in PreparedAtmosphere::at");
}
