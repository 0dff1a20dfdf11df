//! Atmospheric attenuation on an Earth-space path, ITU-R P-series models.
//!
//! | effect | model (edition) | module |
//! |---|---|---|
//! | gases (O2, H2O) | P.676-12 Annex 1 γ (line-by-line) + Annex 2 equivalent heights | [`gas`] |
//! | rain specific attenuation | P.838-3 | [`rain_specific`] |
//! | rain height | station value, else P.839-2 latitude rule (approximate) | [`rain_height`] |
//! | rain attenuation | P.618-14 §2.2.1.1 (same steps as -13) | [`rain`] |
//! | clouds | P.840-9 K_L | [`cloud`] |
//! | tropospheric scintillation | P.618-14 §2.4.1, Nwet from P.453-14 | [`scintillation`] |
//! | combination | P.618-14 §2.5 eqs (65)-(68) | [`combine`] |
//!
//! Edition choices:
//! * P.676-12 Annex 2 (not -13): its equivalent heights are closed-form, while -13 needs a
//!   700-row coefficient table. The surface-density form `γw·hw` is the default; when the
//!   integrated water-vapour content is known, [`PreparedAtmosphere::with_integrated_water_vapour`]
//!   switches to the V_t form of Annex 2 §2.3 (the form behind the ITU validation numbers).
//! * P.840-9 (not -8): the ITU validation pairs (L, A) of -9 can be reproduced exactly.
//! * P.618-14 combination (§2.5 eqs (65)-(68)); P.618-13 differs only above 5 %
//!   (-13 keeps rain in the sum for every p) and in holding AG, AC at their 1 % values.
//! * Scintillation below 5°: the §2.4.2/§2.4.3 method needs pL from the P.453 maps, which a
//!   site does not carry, so the model is evaluated at 5° and a warning is raised.
//!
//! Build a [`PreparedAtmosphere`] once per (site, path): everything that does not depend on
//! elevation is computed there. [`PreparedAtmosphere::at`] then costs a few tens of
//! nanoseconds in clear sky, allocates nothing, and never fails: inputs outside a model's
//! validity range are evaluated as documented and reported in [`ModelWarnings`].

pub mod cloud;
pub mod combine;
pub mod elevation;
pub mod gas;
pub mod rain;
pub mod rain_height;
pub mod rain_specific;
pub mod scintillation;

use rain_specific::RainCoefficients;

/// Meteorological description of a ground station.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct AtmosphereSite {
    /// Geodetic latitude, degrees (−90..90).
    pub latitude_deg: f64,
    /// Station height above mean sea level, km.
    pub altitude_km: f64,
    /// Total barometric pressure at the station, hPa (dry-air pressure = this − e).
    pub pressure_hpa: f64,
    /// Surface air temperature, K.
    pub temperature_k: f64,
    /// Surface water-vapour density ρ, g/m³.
    pub water_vapour_density_g_m3: f64,
    /// Rain rate exceeded for 0.01 % of an average year (1-min integration), mm/h.
    pub rain_rate_001_mm_h: f64,
    /// Rain height hR, km AMSL; `None` → P.839-2 latitude rule (warning `rain_height_defaulted`).
    pub rain_height_km: Option<f64>,
    /// Integrated cloud liquid water content L of ITU-R P.840-9 (Annex 1 §3.1; not the reduced
    /// liquid water of P.840-7/-8), kg/m², for the clear-sky budget: a median or typical value;
    /// `None` → no cloud loss in clear sky (warning `cloud_clear_not_given`).
    pub cloud_liquid_clear_kg_m2: Option<f64>,
    /// L of P.840-9 exceeded for the availability exceedance p % (for p < 1 %, the 1 % value, as
    /// P.618-14 §2.5 takes A_C(p) = A_C(1 %)), kg/m², for [`Weather::Exceedance`]; `None` → no
    /// cloud loss in that case (warning `cloud_exceedance_not_given`).
    pub cloud_liquid_exceedance_kg_m2: Option<f64>,
    /// Wet term of the surface refractivity Nwet (N-units); `None` → computed from T and ρ (P.453-14).
    pub wet_refractivity: Option<f64>,
}

/// Radio path description.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PathSpec {
    /// Carrier frequency, GHz.
    pub frequency_ghz: f64,
    /// Polarization tilt angle τ relative to the horizontal, degrees (45 = circular).
    pub polarization_tilt_deg: f64,
    /// Ground antenna physical diameter, m (for scintillation aperture averaging).
    pub antenna_diameter_m: f64,
    /// Ground antenna aperture efficiency η (0..1]; P.618 suggests 0.5 if unknown.
    pub antenna_efficiency: f64,
}

/// Weather condition for which the attenuation is wanted.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Weather {
    /// Gases and clouds only: no rain, no scintillation fade.
    ClearSky,
    /// Attenuation exceeded for `percent` % of an average year (0.001-50 %).
    Exceedance { percent: f64 },
}

impl Weather {
    /// Checked constructor: `percent` must lie in 0.001-50 % (P.618-14 §2.5).
    pub fn exceedance(percent: f64) -> Result<Self, AtmosphereError> {
        if (EXCEEDANCE_MIN_PERCENT..=EXCEEDANCE_MAX_PERCENT).contains(&percent) {
            Ok(Weather::Exceedance { percent })
        } else {
            Err(AtmosphereError::Exceedance { percent })
        }
    }
}

pub use elevation::{low_elevation_form, LOW_ELEVATION_TOLERANCE_DEG};

/// Lowest exceedance accepted, percent (P.618-14 §2.5).
pub const EXCEEDANCE_MIN_PERCENT: f64 = 0.001;
/// Highest exceedance accepted, percent (P.618-14 §2.5).
pub const EXCEEDANCE_MAX_PERCENT: f64 = 50.0;
/// Highest frequency accepted at all, GHz (upper limit of P.676 Annex 1 and P.838-3).
pub const FREQUENCY_MAX_GHZ: f64 = 1000.0;

/// Itemized attenuation at one elevation, all in dB unless named otherwise.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Attenuation {
    /// Oxygen + water vapour (P.676-12).
    pub gas_db: f64,
    /// Cloud liquid water (P.840-9), from the L of this weather case; 0 when the site gives none.
    pub cloud_db: f64,
    /// Rain exceeded for p % (P.618-14); 0 in clear sky and for p > 5 %.
    pub rain_db: f64,
    /// Scintillation fade depth exceeded for p % (P.618-14 §2.4.1); 0 in clear sky.
    pub scintillation_db: f64,
    /// Total per P.618-14 §2.5 (clear sky: gas + cloud).
    pub total_db: f64,
    /// total excluding scintillation, for the sky noise temperature (P.618 §3)
    pub absorptive_db: f64,
    /// Rain height used, km AMSL.
    pub rain_height_km: f64,
    /// Specific rain attenuation γR at R0.01 along this path (P.838-3), dB/km; 0 in clear sky.
    pub specific_rain_attenuation_db_km: f64,
    /// Validity warnings raised by the models for this evaluation.
    pub warnings: ModelWarnings,
}

/// Validity warnings. Each flag names a model and its range; see [`ModelWarnings::messages`].
#[derive(Clone, Copy, Default, Debug, PartialEq, Eq)]
pub struct ModelWarnings {
    /// Frequency outside 1-350 GHz (P.676-12 Annex 2 slant-path method).
    pub frequency_outside_gas_range: bool,
    /// Frequency outside 1-55 GHz (P.618-14 §2.2.1.1 rain method; P.838-3 covers 1-1000 GHz).
    pub frequency_outside_rain_range: bool,
    /// Frequency outside 1-200 GHz (P.840-9 K_L).
    pub frequency_outside_cloud_range: bool,
    /// Frequency outside 4-55 GHz (P.618-14 §2.4.1 scintillation).
    pub frequency_outside_scintillation_range: bool,
    /// Elevation below 5°: gas uses the curved-Earth form, rain eq (2) (P.676 Annex 2, P.618-14).
    pub elevation_below_5_deg: bool,
    /// Cloud evaluated at 5° because the elevation is lower (P.840-9 is for 5°-90°).
    pub cloud_elevation_clamped_to_5_deg: bool,
    /// Scintillation evaluated at 5° because the elevation is lower (P.618-14 §2.4.1 is for θ ≥ 5°).
    pub scintillation_elevation_clamped_to_5_deg: bool,
    /// Elevation outside 0-90° (or not a number) was clamped into 0-90°.
    pub elevation_clamped: bool,
    /// Exceedance outside 0.001-50 % was clamped into that range (P.618-14 §2.5).
    pub exceedance_clamped: bool,
    /// Exceedance below 0.01 %: scintillation eq (48) is stated for 0.01 < p ≤ 50 %.
    pub scintillation_exceedance_below_0_01_percent: bool,
    /// No station rain height: P.839-2 latitude rule used (approximate).
    pub rain_height_defaulted: bool,
    /// Rain height at or below the station: rain attenuation is 0 (P.618-14 step 2).
    pub rain_height_at_or_below_station: bool,
    /// Clear sky evaluated without a clear-sky L: cloud attenuation taken as 0.
    pub cloud_clear_not_given: bool,
    /// Exceedance case evaluated without an L at the exceedance: cloud attenuation taken as 0.
    pub cloud_exceedance_not_given: bool,
}

impl ModelWarnings {
    fn table(&self) -> [(bool, &'static str); 14] {
        [
            (self.frequency_outside_gas_range, "gas (ITU-R P.676-12 Annex 2): frequency outside the 1-350 GHz range of the slant-path method"),
            (self.frequency_outside_rain_range, "rain (ITU-R P.618-14 §2.2.1.1): frequency outside the 1-55 GHz range of the method"),
            (self.frequency_outside_cloud_range, "cloud (ITU-R P.840-9): frequency outside the 1-200 GHz range of K_L"),
            (self.frequency_outside_scintillation_range, "scintillation (ITU-R P.618-14 §2.4.1): frequency outside 4-55 GHz"),
            (self.elevation_below_5_deg, "gas/rain (ITU-R P.676 Annex 2, P.618-14 eq (2)): elevation below 5 deg, low-elevation forms used"),
            (self.cloud_elevation_clamped_to_5_deg, "cloud (ITU-R P.840-9): valid for 5-90 deg elevation, evaluated at 5 deg"),
            (self.scintillation_elevation_clamped_to_5_deg, "scintillation (ITU-R P.618-14 §2.4.1): valid for elevation >= 5 deg, evaluated at 5 deg (low-elevation method of §2.4.2/2.4.3 not implemented)"),
            (self.elevation_clamped, "atmosphere: elevation outside 0-90 deg clamped into range"),
            (self.exceedance_clamped, "atmosphere (ITU-R P.618-14 §2.5): exceedance outside 0.001-50 % clamped into range"),
            (self.scintillation_exceedance_below_0_01_percent, "scintillation (ITU-R P.618-14 eq (48)): stated for 0.01 < p <= 50 %, extrapolated below 0.01 %"),
            (self.rain_height_defaulted, "rain height (ITU-R P.839-2 latitude rule): no station value given, approximate rule used"),
            (self.rain_height_at_or_below_station, "rain (ITU-R P.618-14 step 2): rain height at or below the station, rain attenuation is 0"),
            (self.cloud_clear_not_given, "cloud (ITU-R P.840-9), clear sky: no clear-sky cloud liquid water L given (cloud_liquid_clear_kg_m2), cloud attenuation taken as 0"),
            (self.cloud_exceedance_not_given, "cloud (ITU-R P.840-9), availability case: no cloud liquid water L at the exceedance given (cloud_liquid_exceedance_kg_m2), cloud attenuation taken as 0"),
        ]
    }

    /// The models whose frequency range is passed, each as `model (source, range)`, for one
    /// grouped line ([`crate::plan::series::PassWarnings::lines`]).
    pub fn frequency_ranges(&self) -> impl Iterator<Item = &'static str> {
        [
            (
                self.frequency_outside_gas_range,
                "gas (ITU-R P.676-12 Annex 2, 1-350 GHz)",
            ),
            (
                self.frequency_outside_rain_range,
                "rain (ITU-R P.618-14 §2.2.1.1, 1-55 GHz)",
            ),
            (
                self.frequency_outside_cloud_range,
                "cloud (ITU-R P.840-9, 1-200 GHz)",
            ),
            (
                self.frequency_outside_scintillation_range,
                "scintillation (ITU-R P.618-14 §2.4.1, 4-55 GHz)",
            ),
        ]
        .into_iter()
        .filter(|(on, _)| *on)
        .map(|(_, m)| m)
    }

    /// Human-readable messages for the raised flags, each naming the model and its range.
    pub fn messages(&self) -> impl Iterator<Item = &'static str> {
        self.table()
            .into_iter()
            .filter(|(on, _)| *on)
            .map(|(_, msg)| msg)
    }

    /// [`Self::messages`] without the frequency-range ones (those are in [`Self::frequency_ranges`]).
    pub fn other_messages(&self) -> impl Iterator<Item = &'static str> {
        self.table()
            .into_iter()
            .skip(4)
            .filter(|(on, _)| *on)
            .map(|(_, msg)| msg)
    }

    /// True when no flag is raised.
    pub fn is_empty(&self) -> bool {
        self.table().iter().all(|(on, _)| !on)
    }

    /// Flags raised in either set.
    pub fn union(&self, other: &ModelWarnings) -> ModelWarnings {
        ModelWarnings {
            frequency_outside_gas_range: self.frequency_outside_gas_range
                | other.frequency_outside_gas_range,
            frequency_outside_rain_range: self.frequency_outside_rain_range
                | other.frequency_outside_rain_range,
            frequency_outside_cloud_range: self.frequency_outside_cloud_range
                | other.frequency_outside_cloud_range,
            frequency_outside_scintillation_range: self.frequency_outside_scintillation_range
                | other.frequency_outside_scintillation_range,
            elevation_below_5_deg: self.elevation_below_5_deg | other.elevation_below_5_deg,
            cloud_elevation_clamped_to_5_deg: self.cloud_elevation_clamped_to_5_deg
                | other.cloud_elevation_clamped_to_5_deg,
            scintillation_elevation_clamped_to_5_deg: self.scintillation_elevation_clamped_to_5_deg
                | other.scintillation_elevation_clamped_to_5_deg,
            elevation_clamped: self.elevation_clamped | other.elevation_clamped,
            exceedance_clamped: self.exceedance_clamped | other.exceedance_clamped,
            scintillation_exceedance_below_0_01_percent: self
                .scintillation_exceedance_below_0_01_percent
                | other.scintillation_exceedance_below_0_01_percent,
            rain_height_defaulted: self.rain_height_defaulted | other.rain_height_defaulted,
            rain_height_at_or_below_station: self.rain_height_at_or_below_station
                | other.rain_height_at_or_below_station,
            cloud_clear_not_given: self.cloud_clear_not_given | other.cloud_clear_not_given,
            cloud_exceedance_not_given: self.cloud_exceedance_not_given
                | other.cloud_exceedance_not_given,
        }
    }
}

/// Meaningless inputs, each carrying the offending value.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
pub enum AtmosphereError {
    #[error("frequency {frequency_ghz} GHz is outside 0-1000 GHz (the range of ITU-R P.676 Annex 1 and P.838-3)")]
    Frequency { frequency_ghz: f64 },
    #[error("latitude {latitude_deg} deg is outside -90..90 deg")]
    Latitude { latitude_deg: f64 },
    #[error("station altitude {altitude_km} km is outside -1..10 km")]
    Altitude { altitude_km: f64 },
    #[error("pressure {pressure_hpa} hPa must be positive and exceed the water-vapour pressure {water_vapour_pressure_hpa} hPa")]
    Pressure {
        pressure_hpa: f64,
        water_vapour_pressure_hpa: f64,
    },
    #[error("temperature {temperature_k} K must be positive")]
    Temperature { temperature_k: f64 },
    #[error("water-vapour density {water_vapour_density_g_m3} g/m3 must be zero or positive")]
    WaterVapourDensity { water_vapour_density_g_m3: f64 },
    #[error("integrated water-vapour content {total_water_vapour_kg_m2} kg/m2 must be positive")]
    WaterVapourContent { total_water_vapour_kg_m2: f64 },
    #[error("rain rate {rain_rate_mm_h} mm/h must be zero or positive")]
    RainRate { rain_rate_mm_h: f64 },
    #[error("rain height {rain_height_km} km must be within 0..20 km")]
    RainHeight { rain_height_km: f64 },
    #[error("cloud liquid water L {cloud_liquid_kg_m2} kg/m2 must be zero or positive")]
    CloudLiquid { cloud_liquid_kg_m2: f64 },
    #[error("wet refractivity {wet_refractivity} N-units must be zero or positive")]
    WetRefractivity { wet_refractivity: f64 },
    #[error("polarization tilt {polarization_tilt_deg} deg is not a finite angle")]
    PolarizationTilt { polarization_tilt_deg: f64 },
    #[error("antenna diameter {antenna_diameter_m} m must be positive")]
    AntennaDiameter { antenna_diameter_m: f64 },
    #[error("antenna efficiency {antenna_efficiency} must be within (0, 1]")]
    AntennaEfficiency { antenna_efficiency: f64 },
    #[error("exceedance {percent} % is outside 0.001-50 % (ITU-R P.618-14 §2.5)")]
    Exceedance { percent: f64 },
}

/// Atmospheric mean radiating temperature `Tmr = 37.34 + 0.81·Ts` K (ITU-R P.618-14 eq (70)),
/// for the sky noise temperature `Tsky = Tmr(1 − 10^(−A/10)) + 2.7·10^(−A/10)` (eq (69)).
#[inline]
pub fn mean_radiating_temperature_k(surface_temperature_k: f64) -> f64 {
    37.34 + 0.81 * surface_temperature_k
}

/// Everything about one (site, path) pair that does not depend on elevation.
#[derive(Clone, Copy, Debug)]
pub struct PreparedAtmosphere {
    latitude_deg: f64,
    altitude_km: f64,
    frequency_ghz: f64,
    /// cos 2τ for P.838-3 eqs (4), (5).
    cos_2tau: f64,
    gamma_o_db_km: f64,
    gamma_w_db_km: f64,
    h_o_km: f64,
    h_w_km: f64,
    /// γo·ho + γw·hw, dB (zenith gaseous attenuation).
    gas_zenith_db: f64,
    rain: RainCoefficients,
    rain_rate_001_mm_h: f64,
    rain_height_km: f64,
    /// L·K_L, dB (zenith cloud attenuation) in clear sky; `None` without a clear-sky L.
    cloud_zenith_clear_db: Option<f64>,
    /// L·K_L, dB, in the exceedance case; `None` without an L at the exceedance.
    cloud_zenith_exceedance_db: Option<f64>,
    /// σref·f^(7/12), dB (P.618-14 eq (47) without g(x) and the elevation term).
    scint_scale_db: f64,
    /// 1.22·Deff²·f, m (numerator of x, eq (46)).
    scint_x_numerator_m: f64,
    static_warnings: ModelWarnings,
}

fn check(ok: bool, err: AtmosphereError) -> Result<(), AtmosphereError> {
    if ok {
        Ok(())
    } else {
        Err(err)
    }
}

/// Reject a site whose values are meaningless, in the order of the fields; returns the
/// water-vapour pressure e (hPa) used for the pressure check.
fn validate_site(site: &AtmosphereSite) -> Result<f64, AtmosphereError> {
    check(
        (-90.0..=90.0).contains(&site.latitude_deg),
        AtmosphereError::Latitude {
            latitude_deg: site.latitude_deg,
        },
    )?;
    check(
        (-1.0..=10.0).contains(&site.altitude_km),
        AtmosphereError::Altitude {
            altitude_km: site.altitude_km,
        },
    )?;
    check(
        site.temperature_k.is_finite() && site.temperature_k > 0.0,
        AtmosphereError::Temperature {
            temperature_k: site.temperature_k,
        },
    )?;
    let rho = site.water_vapour_density_g_m3;
    check(
        rho.is_finite() && rho >= 0.0,
        AtmosphereError::WaterVapourDensity {
            water_vapour_density_g_m3: rho,
        },
    )?;
    let e_hpa = gas::water_vapour_pressure_hpa(rho, site.temperature_k);
    check(
        site.pressure_hpa.is_finite() && site.pressure_hpa > e_hpa,
        AtmosphereError::Pressure {
            pressure_hpa: site.pressure_hpa,
            water_vapour_pressure_hpa: e_hpa,
        },
    )?;
    let r001 = site.rain_rate_001_mm_h;
    check(
        r001.is_finite() && r001 >= 0.0,
        AtmosphereError::RainRate {
            rain_rate_mm_h: r001,
        },
    )?;
    validate_optional_site_values(site)?;
    Ok(e_hpa)
}

/// Reject a given rain height, cloud liquid or wet refractivity outside its range.
fn validate_optional_site_values(site: &AtmosphereSite) -> Result<(), AtmosphereError> {
    if let Some(h) = site.rain_height_km {
        check(
            (0.0..=20.0).contains(&h),
            AtmosphereError::RainHeight { rain_height_km: h },
        )?;
    }
    for l in [
        site.cloud_liquid_clear_kg_m2,
        site.cloud_liquid_exceedance_kg_m2,
    ]
    .into_iter()
    .flatten()
    {
        check(
            l.is_finite() && l >= 0.0,
            AtmosphereError::CloudLiquid {
                cloud_liquid_kg_m2: l,
            },
        )?;
    }
    if let Some(n) = site.wet_refractivity {
        check(
            n.is_finite() && n >= 0.0,
            AtmosphereError::WetRefractivity {
                wet_refractivity: n,
            },
        )?;
    }
    Ok(())
}

/// Reject a polarization tilt, antenna diameter or aperture efficiency that means nothing
/// (the frequency is checked first, by [`PreparedAtmosphere::new`]).
fn validate_path_antenna(path: &PathSpec) -> Result<(), AtmosphereError> {
    check(
        path.polarization_tilt_deg.is_finite(),
        AtmosphereError::PolarizationTilt {
            polarization_tilt_deg: path.polarization_tilt_deg,
        },
    )?;
    check(
        path.antenna_diameter_m.is_finite() && path.antenna_diameter_m > 0.0,
        AtmosphereError::AntennaDiameter {
            antenna_diameter_m: path.antenna_diameter_m,
        },
    )?;
    check(
        path.antenna_efficiency > 0.0 && path.antenna_efficiency <= 1.0,
        AtmosphereError::AntennaEfficiency {
            antenna_efficiency: path.antenna_efficiency,
        },
    )
}

/// Warnings for a frequency outside the stated range of each model.
fn frequency_warnings(f: f64) -> ModelWarnings {
    ModelWarnings {
        frequency_outside_gas_range: !(gas::FREQUENCY_MIN_GHZ..=gas::SLANT_FREQUENCY_MAX_GHZ)
            .contains(&f),
        frequency_outside_rain_range: !(rain_specific::FREQUENCY_RANGE_GHZ.0
            ..=rain::FREQUENCY_MAX_GHZ)
            .contains(&f),
        frequency_outside_cloud_range: !(cloud::FREQUENCY_RANGE_GHZ.0
            ..=cloud::FREQUENCY_RANGE_GHZ.1)
            .contains(&f),
        frequency_outside_scintillation_range: !(scintillation::FREQUENCY_RANGE_GHZ.0
            ..=scintillation::FREQUENCY_RANGE_GHZ.1)
            .contains(&f),
        ..ModelWarnings::default()
    }
}

/// Rain height: station value, else the P.839-2 latitude rule (flagged); flags a rain
/// height at or below the station.
fn site_rain_height_km(site: &AtmosphereSite, w: &mut ModelWarnings) -> f64 {
    let rain_height_km = match site.rain_height_km {
        Some(h) => h,
        None => {
            w.rain_height_defaulted = true;
            rain_height::rain_height_p839_2_km(site.latitude_deg)
        }
    };
    w.rain_height_at_or_below_station = rain_height_km <= site.altitude_km;
    rain_height_km
}

/// Zenith cloud attenuation L·K_L, dB (P.840-9 Annex 1 §3.1), of one L; `None` without one.
fn cloud_zenith_db(l_kg_m2: Option<f64>, f: f64) -> Option<f64> {
    // Cloud: A = L K_L / sin θ (P.840-9).
    l_kg_m2.map(|l| l * cloud::mass_absorption_coefficient_p840_9(f))
}

/// Elevation clamped into 0-90° (flagged when it was outside or not a number).
#[inline]
fn clamp_elevation_deg(elevation_deg: f64, w: &mut ModelWarnings) -> f64 {
    if (0.0..=90.0).contains(&elevation_deg) {
        elevation_deg
    } else {
        // A rounding below the horizon is 0 deg, not a clamp worth a warning.
        // (NaN is never a rounding: it is flagged.)
        let rounding = (-elevation::HORIZON_TOLERANCE_DEG..0.0).contains(&elevation_deg);
        w.elevation_clamped |= !rounding;
        if elevation_deg > 90.0 {
            90.0
        } else {
            0.0
        }
    }
}

/// Exceedance clamped into 0.001-50 % (P.618-14 §2.5; flagged when it was outside).
#[inline]
fn clamp_exceedance_percent(percent: f64, w: &mut ModelWarnings) -> f64 {
    if (EXCEEDANCE_MIN_PERCENT..=EXCEEDANCE_MAX_PERCENT).contains(&percent) {
        percent
    } else {
        w.exceedance_clamped = true;
        if percent > EXCEEDANCE_MAX_PERCENT {
            EXCEEDANCE_MAX_PERCENT
        } else {
            EXCEEDANCE_MIN_PERCENT
        }
    }
}

impl PreparedAtmosphere {
    /// Validate the inputs and precompute the elevation-independent quantities.
    pub fn new(site: &AtmosphereSite, path: &PathSpec) -> Result<Self, AtmosphereError> {
        let f = path.frequency_ghz;
        check(
            f.is_finite() && f > 0.0 && f <= FREQUENCY_MAX_GHZ,
            AtmosphereError::Frequency { frequency_ghz: f },
        )?;
        let e_hpa = validate_site(site)?;
        validate_path_antenna(path)?;
        let rho = site.water_vapour_density_g_m3;
        let mut w = frequency_warnings(f);

        // Gas: P.676-12 Annex 1 γ with the dry-air pressure p = P − e; Annex 2 heights.
        let p_dry = site.pressure_hpa - e_hpa;
        let (gamma_o, gamma_w) = gas::specific_attenuation_p676(f, p_dry, rho, site.temperature_k);
        let (h_o, h_w) = gas::equivalent_heights_p676_12(f, p_dry, rho, site.temperature_k);

        let rain_height_km = site_rain_height_km(site, &mut w);

        // Scintillation: σref from Nwet (eq (42)), Deff (eq (44)).
        let nwet = site
            .wet_refractivity
            .unwrap_or_else(|| scintillation::wet_refractivity_p453(site.temperature_k, rho));
        let deff_m =
            scintillation::effective_diameter_m(path.antenna_diameter_m, path.antenna_efficiency);

        Ok(Self {
            latitude_deg: site.latitude_deg,
            altitude_km: site.altitude_km,
            frequency_ghz: f,
            cos_2tau: (2.0 * path.polarization_tilt_deg.to_radians()).cos(),
            gamma_o_db_km: gamma_o,
            gamma_w_db_km: gamma_w,
            h_o_km: h_o,
            h_w_km: h_w,
            gas_zenith_db: gamma_o * h_o + gamma_w * h_w,
            rain: RainCoefficients::p838_3(f),
            rain_rate_001_mm_h: site.rain_rate_001_mm_h,
            rain_height_km,
            cloud_zenith_clear_db: cloud_zenith_db(site.cloud_liquid_clear_kg_m2, f),
            cloud_zenith_exceedance_db: cloud_zenith_db(site.cloud_liquid_exceedance_kg_m2, f),
            scint_scale_db: scintillation::sigma_ref_db(nwet) * f.powf(7.0 / 12.0),
            scint_x_numerator_m: 1.22 * deff_m * deff_m * f,
            static_warnings: w,
        })
    }

    /// Use the integrated water-vapour content V_t (kg/m², e.g. from ITU-R P.836 or a
    /// radiosonde) for the water-vapour part instead of γw·hw: P.676-12 Annex 2 §2.3,
    /// `A_w = 0.0176·V_t·γw(f)/γw(20.6 GHz)` at the reference conditions (×(a·h^b + 1)
    /// above 20 GHz). P.676-12 prefers this form when V_t is known.
    pub fn with_integrated_water_vapour(
        mut self,
        total_water_vapour_kg_m2: f64,
    ) -> Result<Self, AtmosphereError> {
        let vt = total_water_vapour_kg_m2;
        check(
            vt.is_finite() && vt > 0.0,
            AtmosphereError::WaterVapourContent {
                total_water_vapour_kg_m2: vt,
            },
        )?;
        let aw = gas::zenith_water_vapour_attenuation_from_vt_db(
            self.frequency_ghz,
            vt,
            self.altitude_km,
        );
        // Keep γw·hw = A_w so that the low-elevation form scales the same zenith value.
        self.gamma_w_db_km = aw / self.h_w_km;
        self.gas_zenith_db = self.gamma_o_db_km * self.h_o_km + aw;
        Ok(self)
    }

    /// Specific attenuations (γo, γw) at the station, dB/km (P.676-12 Annex 1).
    /// After [`Self::with_integrated_water_vapour`], γw is the V_t-derived A_w/hw.
    pub fn specific_gas_attenuation_db_km(&self) -> (f64, f64) {
        (self.gamma_o_db_km, self.gamma_w_db_km)
    }

    /// Equivalent heights (ho, hw), km (P.676-12 Annex 2).
    pub fn gas_equivalent_heights_km(&self) -> (f64, f64) {
        (self.h_o_km, self.h_w_km)
    }

    /// Warnings that hold for every elevation (frequency ranges, defaulted inputs).
    pub fn static_warnings(&self) -> ModelWarnings {
        self.static_warnings
    }

    /// Itemized attenuation at `elevation_deg` for `weather`. Allocation-free.
    ///
    /// Elevations outside 0-90° and exceedances outside 0.001-50 % are clamped and flagged.
    pub fn at(&self, elevation_deg: f64, weather: Weather) -> Attenuation {
        let mut w = self.static_warnings;
        let el = clamp_elevation_deg(elevation_deg, &mut w);
        // The pass search lands AOS/LOS on a 5 deg mask to within ~1e-3 deg; such a step is treated
        // as at 5 deg by every model (the one rule of `elevation`).
        let low = low_elevation_form(el);
        w.elevation_below_5_deg = low;

        let sin_el = el.to_radians().sin();
        let gas_db = self.gas_db(el, sin_el, low);
        // Each weather case has its own L (clear: a typical value; exceedance: L at p %).
        let cloud_zenith_db = match weather {
            Weather::ClearSky => {
                w.cloud_clear_not_given = self.cloud_zenith_clear_db.is_none();
                self.cloud_zenith_clear_db
            }
            Weather::Exceedance { .. } => {
                w.cloud_exceedance_not_given = self.cloud_zenith_exceedance_db.is_none();
                self.cloud_zenith_exceedance_db
            }
        };
        let cloud_db = Self::cloud_db(cloud_zenith_db.unwrap_or(0.0), sin_el, low, &mut w);

        let percent = match weather {
            Weather::ClearSky => {
                let total = gas_db + cloud_db;
                return Attenuation {
                    gas_db,
                    cloud_db,
                    rain_db: 0.0,
                    scintillation_db: 0.0,
                    total_db: total,
                    absorptive_db: total,
                    rain_height_km: self.rain_height_km,
                    specific_rain_attenuation_db_km: 0.0,
                    warnings: w,
                };
            }
            Weather::Exceedance { percent } => clamp_exceedance_percent(percent, &mut w),
        };

        let (gamma_r, rain_db) = self.rain_db(el, percent);
        let scintillation_db = self.scintillation_db(el, low, percent, &mut w);

        let total_db = combine::total_attenuation_p618_14_db(
            percent,
            gas_db,
            cloud_db,
            rain_db,
            scintillation_db,
        );
        Attenuation {
            gas_db,
            cloud_db,
            rain_db,
            scintillation_db,
            total_db,
            absorptive_db: gas_db + cloud_db + rain_db,
            rain_height_km: self.rain_height_km,
            specific_rain_attenuation_db_km: gamma_r,
            warnings: w,
        }
    }

    /// Gaseous attenuation at elevation `el` (sin θ = `sin_el`), dB; `low` selects the
    /// below-5° form.
    #[inline]
    fn gas_db(&self, el: f64, sin_el: f64, low: bool) -> f64 {
        // Gas: A = (γo ho + γw hw)/sin θ for θ ≥ 5°; curved-Earth form below (P.676 Annex 2).
        if low {
            self.gamma_o_db_km * gas::slant_path_factor_km(self.h_o_km, self.altitude_km, el)
                + self.gamma_w_db_km * gas::slant_path_factor_km(self.h_w_km, self.altitude_km, el)
        } else {
            self.gas_zenith_db / sin_el
        }
    }

    /// Cloud attenuation of zenith value `zenith_db` at sin θ = `sin_el`, dB; below 5° (`low`)
    /// evaluated at 5° and flagged.
    #[inline]
    fn cloud_db(zenith_db: f64, sin_el: f64, low: bool, w: &mut ModelWarnings) -> f64 {
        // Cloud: A = L K_L / sin θ, θ ≥ 5° (P.840-9).
        let sin_5 = 5f64.to_radians().sin();
        if zenith_db > 0.0 && low {
            w.cloud_elevation_clamped_to_5_deg = true;
            zenith_db / sin_5
        } else if zenith_db > 0.0 {
            zenith_db / sin_el
        } else {
            0.0
        }
    }

    /// Specific rain attenuation γR at R0.01 (dB/km) and the rain attenuation exceeded for
    /// `percent` % (dB, 0 above 5 %) at elevation `el`.
    #[inline]
    fn rain_db(&self, el: f64, percent: f64) -> (f64, f64) {
        // Rain: P.838-3 k, α for this elevation and tilt; P.618-14 steps 2-10 (p ≤ 5 %).
        let cos_el = el.to_radians().cos();
        let (k, alpha) = self.rain.for_path_weight(cos_el * cos_el * self.cos_2tau);
        let gamma_r = rain_specific::specific_attenuation_db_km(k, alpha, self.rain_rate_001_mm_h);
        let rain_db = if percent <= combine::RAIN_INCLUDED_MAX_PERCENT {
            let r = rain::attenuation_001_p618(
                &rain::RainPath {
                    rain_height_km: self.rain_height_km,
                    station_height_km: self.altitude_km,
                    elevation_deg: el,
                    latitude_deg: self.latitude_deg,
                    frequency_ghz: self.frequency_ghz,
                },
                k,
                alpha,
                self.rain_rate_001_mm_h,
            );
            rain::scale_to_exceedance_p618(r.attenuation_001_db, percent, self.latitude_deg, el)
        } else {
            0.0
        };
        (gamma_r, rain_db)
    }

    /// Scintillation fade depth exceeded for `percent` %, dB; below 5° (`low`) evaluated at
    /// 5° and flagged, and flagged below 0.01 %.
    #[inline]
    fn scintillation_db(&self, el: f64, low: bool, percent: f64, w: &mut ModelWarnings) -> f64 {
        // Scintillation: P.618-14 §2.4.1 at max(θ, 5°).
        let el_s = if low {
            w.scintillation_elevation_clamped_to_5_deg = true;
            5.0
        } else {
            el
        };
        w.scintillation_exceedance_below_0_01_percent = percent < 0.01;
        let sigma =
            scintillation::sigma_from_parts_db(self.scint_scale_db, self.scint_x_numerator_m, el_s);
        scintillation::percentage_factor(percent) * sigma
    }
}
