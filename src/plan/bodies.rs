//! The Sun and the Moon as noise sources at one station: where they are
//! ([`crate::geometry::body_track`]), how bright their disks are ([`crate::noise::sun`],
//! [`crate::noise::moon`]) and how much of them the antenna sees ([`crate::noise::disk`], through
//! the station's noise pattern).
//!
//! Built once per station (the coupling tables, [`BodyNoise::new`]); per pass one track per body
//! ([`BodyNoise::reset`], which reuses its buffers); per step an interpolation
//! ([`BodyNoise::at`]), nothing integrated and nothing allocated.
//!
//! Conventions (stated in the README):
//! * The disk is seen through the atmosphere of the pointing direction: its brightness and the
//!   background it hides are multiplied by the step's path transmissivity 10^(-A/10), A the
//!   absorptive attenuation of that weather case. A body adds noise only within a few beamwidths of
//!   boresight, where the two paths differ little.
//! * A body below the geometric horizon adds nothing: the ground in front of it is already in the
//!   antenna table.
//! * The quiet Sun of ITU-R P.372 Fig. 12 unless the station gives an observed flux
//!   (`solar_flux_sfu`). Outside 0.05-100 GHz the Sun's noise is not modelled (a warning says so).
//! * The Moon only from 1 to 100 GHz, the range of its phase model. Below 1 GHz it is left out, and
//!   a warning says so when the antenna could see it: when a 280 K disk of the Moon's largest
//!   apparent size (0.284 deg radius, at perigee seen from the surface) on boresight would add
//!   0.1 K or more, T = 280 K x G0 x Omega / (4 pi) (a disk much smaller than the beam), G0 the
//!   pattern's boresight gain. A 3.7 m dish at 900 MHz (29 dBi) would see about 1 K.

use crate::geometry::body_track::{
    chord_separation_deg, enu_from_az_el, Body, BodyTrack, TrackError,
};
use crate::geometry::{HorizonMask, Observer};
use crate::noise::disk::{DiskCoupling, DiskError, DiskSpec, PowerPattern};
use crate::noise::moon::{self, moon_brightness_k};
use crate::noise::sun::{self, sun_brightness_k, SunActivity};
use crate::units::CMB_K;
use chrono::{DateTime, Utc};

/// The Sun's and the Moon's share of the antenna noise at one instant.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct BodySample {
    /// Angle between the pointing direction and the Sun's centre, deg.
    pub sun_separation_deg: f64,
    /// Antenna temperature added by the Sun, K (0 below the horizon or outside the model's range).
    pub sun_k: f64,
    /// Angle between the pointing direction and the Moon's centre, deg.
    pub moon_separation_deg: f64,
    /// Antenna temperature added by the Moon, K.
    pub moon_k: f64,
}

/// Validity notes of the bodies' models (constant over a plan).
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct BodyWarnings {
    /// The frequency is outside the 0.05-100 GHz of the quiet-Sun figure: no Sun noise.
    pub sun_not_modelled: bool,
    /// The frequency is below the Moon's 1-100 GHz model and the antenna's gain is high enough for
    /// the lunar disk to add 0.1 K or more: no Moon noise.
    pub moon_not_modelled: bool,
}

impl BodyWarnings {
    pub fn union(&self, o: &BodyWarnings) -> BodyWarnings {
        BodyWarnings {
            sun_not_modelled: self.sun_not_modelled || o.sun_not_modelled,
            moon_not_modelled: self.moon_not_modelled || o.moon_not_modelled,
        }
    }

    /// Messages naming the model and its range.
    pub fn messages(&self) -> impl Iterator<Item = &'static str> {
        let sun = self.sun_not_modelled.then_some(
            "Sun noise (ITU-R P.372 Fig. 12): frequency outside 0.05-100 GHz, the Sun's noise is not modelled",
        );
        let moon = self.moon_not_modelled.then_some(
            "Moon noise: frequency below the 1-100 GHz of the lunar disk model, not added; with this antenna's gain the Moon in the main beam could add 0.1 K or more",
        );
        sun.into_iter().chain(moon)
    }
}

/// The warning for a window reaching outside the years the Sun's and the Moon's position
/// formulae are stated for ([`crate::geometry::sun::VALID_YEARS`] and
/// [`crate::geometry::moon::VALID_YEARS`], both 1950-2050): outside, they still answer, with an
/// error that grows slowly, and the bodies' noise and separations rest on them.
pub fn position_years_warning(start: &DateTime<Utc>, end: &DateTime<Utc>) -> Option<String> {
    use chrono::Datelike;
    let (sun, moon) = (
        crate::geometry::sun::VALID_YEARS,
        crate::geometry::moon::VALID_YEARS,
    );
    let (lo, hi) = (sun.0.max(moon.0), sun.1.min(moon.1));
    let year = [start.year(), end.year()]
        .into_iter()
        .find(|y| !(lo..=hi).contains(y))?;
    Some(format!(
        "Sun and Moon positions (Astronomical Almanac low-precision formulae; Meeus ch. 47): stated \
         for {lo}-{hi}, the window reaches {year}; the Sun's and the Moon's noise and separations \
         rest on positions outside that span"
    ))
}

/// The Moon's term below which leaving it out needs no warning, K (our choice).
const MOON_NOTICE_K: f64 = 0.1;

/// Largest antenna temperature the Moon can add to an antenna of boresight gain `g0` (linear): a
/// full-Moon disk (280 K) of its largest apparent radius (topocentric at perigee, 350,000 km) on
/// boresight, small against the beam: T = Tb G0 Omega / (4 pi).
fn moon_bound_k(g0: f64) -> f64 {
    let r = moon::moon_angular_radius_deg(350_000.0).to_radians();
    let omega_sr = 2.0 * std::f64::consts::PI * (1.0 - r.cos());
    moon::FULL_MOON_K * g0 * omega_sr / (4.0 * std::f64::consts::PI)
}

/// One body's disk seen through the pattern.
#[derive(Debug, Clone)]
struct DiskTerm<P> {
    coupling: DiskCoupling<P>,
}

/// The Sun and the Moon at one station, prepared.
#[derive(Debug, Clone)]
pub struct BodyNoise<P> {
    frequency_hz: f64,
    activity: SunActivity,
    sun: Option<DiskTerm<P>>,
    moon: Option<DiskTerm<P>>,
    warnings: BodyWarnings,
    /// The terrain above the geometric horizon ([`crate::noise::terrain::terrain_profile`]): a
    /// body behind it is hidden (the terrain's own noise is in the antenna-noise table).
    terrain: Option<HorizonMask>,
}

/// The bodies' tracks over one pass and their disk brightness for it.
#[derive(Debug, Clone)]
pub struct PassBodies {
    sun: BodyTrack,
    moon: BodyTrack,
    sun_brightness_k: f64,
    moon_brightness_k: f64,
}

impl PassBodies {
    /// Tracks of both bodies from `observer` over [`start`, `end`] (brightness set by
    /// [`BodyNoise::reset`]).
    pub fn new(
        observer: &Observer,
        start: &DateTime<Utc>,
        end: &DateTime<Utc>,
    ) -> Result<Self, TrackError> {
        Ok(Self {
            sun: BodyTrack::new(Body::Sun, observer, start, end)?,
            moon: BodyTrack::new(Body::Moon, observer, start, end)?,
            sun_brightness_k: 0.0,
            moon_brightness_k: 0.0,
        })
    }
}

impl<P: PowerPattern + Clone + Sync> BodyNoise<P> {
    /// The coupling tables of `pattern` (half-power beamwidth `beamwidth_deg`, normalized to 4 pi)
    /// for the Sun and, from 1 GHz, the Moon; `flux_sfu` an observed solar flux at the link
    /// frequency (quiet Sun when `None`).
    ///
    /// The beamwidth only spaces the tables' grid and quadrature (the pattern itself gives the
    /// values), so a beam wider than 180 deg, which the dish rule 70 lambda/D gives an aperture
    /// under 0.39 wavelengths (a gain of about -0.9 dBi or less by the equivalent aperture), spaces
    /// them as a 180 deg beam would: finer than its own width asks, never coarser.
    pub fn new(
        pattern: &P,
        beamwidth_deg: f64,
        frequency_hz: f64,
        flux_sfu: Option<f64>,
    ) -> Result<Self, DiskError> {
        // (not `min`: a NaN or infinite beamwidth stays as it is, and the tables refuse it)
        let beamwidth_deg = if beamwidth_deg > 180.0 && beamwidth_deg.is_finite() {
            180.0
        } else {
            beamwidth_deg
        };
        let activity = flux_sfu.map_or(SunActivity::Quiet, SunActivity::FluxSfu);
        let (lo, hi) = sun::QUIET_SUN_RANGE_HZ;
        let sun_in_range = flux_sfu.is_some() || (lo..=hi).contains(&frequency_hz);
        let sun = if sun_in_range {
            Some(DiskTerm {
                coupling: DiskCoupling::new(pattern.clone(), DiskSpec::sun(beamwidth_deg))?,
            })
        } else {
            None
        };
        let (mlo, mhi) = moon::FREQUENCY_RANGE_HZ;
        let moon_visible_below_range =
            frequency_hz < mlo && moon_bound_k(pattern.gain_linear(0.0)) >= MOON_NOTICE_K;
        let moon = if (mlo..=mhi).contains(&frequency_hz) {
            Some(DiskTerm {
                coupling: DiskCoupling::new(pattern.clone(), DiskSpec::moon(beamwidth_deg))?,
            })
        } else {
            None
        };
        Ok(Self {
            frequency_hz,
            activity,
            warnings: BodyWarnings {
                sun_not_modelled: sun.is_none(),
                moon_not_modelled: moon_visible_below_range,
            },
            sun,
            moon,
            terrain: None,
        })
    }

    /// The same with the station's terrain profile: a body below it adds no noise.
    pub fn with_terrain(mut self, terrain: Option<HorizonMask>) -> Self {
        self.terrain = terrain;
        self
    }

    /// Whether the Moon's noise is modelled (1-100 GHz).
    pub fn moon_modelled(&self) -> bool {
        self.moon.is_some()
    }

    pub fn warnings(&self) -> BodyWarnings {
        self.warnings
    }

    /// Follow the bodies over a new pass [`start`, `end`], reusing `bodies`' buffers.
    pub fn reset(
        &self,
        bodies: &mut PassBodies,
        start: &DateTime<Utc>,
        end: &DateTime<Utc>,
    ) -> Result<(), TrackError> {
        bodies.sun.reset(start, end)?;
        bodies.moon.reset(start, end)?;
        // The activity was checked when the station was prepared; a failure here leaves 0 K.
        bodies.sun_brightness_k = sun_brightness_k(
            self.activity,
            self.frequency_hz,
            bodies.sun.angular_radius_deg(),
        )
        .unwrap_or(0.0);
        bodies.moon_brightness_k =
            moon_brightness_k(bodies.moon.illuminated_fraction(), self.frequency_hz).unwrap_or(0.0);
        Ok(())
    }

    /// The bodies' noise at `t` with the antenna pointed at (`azimuth_deg`, `elevation_deg`),
    /// before the atmosphere: the caller multiplies the noise terms by the path's transmissivity
    /// 10^(-A/10) of its weather case (`plan::series::budget_at`). Allocates nothing.
    #[inline]
    pub fn at(
        &self,
        bodies: &PassBodies,
        t: &DateTime<Utc>,
        azimuth_deg: f64,
        elevation_deg: f64,
    ) -> BodySample {
        let pointing = enu_from_az_el(azimuth_deg, elevation_deg);
        let (sun_separation_deg, sun_k) = disk_noise(
            self.sun.as_ref(),
            &bodies.sun,
            t,
            &pointing,
            (bodies.sun_brightness_k, self.terrain.as_ref()),
        );
        let (moon_separation_deg, moon_k) = disk_noise(
            self.moon.as_ref(),
            &bodies.moon,
            t,
            &pointing,
            (bodies.moon_brightness_k, self.terrain.as_ref()),
        );
        BodySample {
            sun_separation_deg,
            sun_k,
            moon_separation_deg,
            moon_k,
        }
    }
}

/// Separation (deg) and added antenna temperature (K) of one body.
#[inline]
fn disk_noise<P: PowerPattern + Sync>(
    term: Option<&DiskTerm<P>>,
    track: &BodyTrack,
    t: &DateTime<Utc>,
    pointing: &[f64; 3],
    (brightness_k, terrain): (f64, Option<&HorizonMask>),
) -> (f64, f64) {
    let u = track.direction_enu(t);
    let separation_deg = chord_separation_deg(&u, pointing);
    // below the geometric horizon the ground hides the body, below the terrain the terrain
    let visible = || {
        u[2] > 0.0
            && terrain.is_none_or(|m| {
                let azimuth_deg = u[0].atan2(u[1]).to_degrees();
                u[2].min(1.0).asin().to_degrees() > m.limit_deg(azimuth_deg)
            })
    };
    let noise_k = match term {
        Some(term) if visible() => term.coupling.added_temperature_k(
            separation_deg,
            track.angular_radius_deg(),
            brightness_k,
            CMB_K,
        ),
        _ => 0.0,
    };
    (separation_deg, noise_k)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A window inside 1950-2050 raises nothing; one reaching past either end names the year.
    #[test]
    fn position_years_warning_outside_1950_2050() {
        let t = |y: i32| Utc.with_ymd_and_hms(y, 6, 1, 0, 0, 0).unwrap();
        assert_eq!(position_years_warning(&t(1950), &t(2050)), None);
        let late = position_years_warning(&t(2050), &t(2051)).unwrap();
        assert!(
            late.contains("1950-2050") && late.contains("reaches 2051"),
            "{late}"
        );
        let early = position_years_warning(&t(1949), &t(1950)).unwrap();
        assert!(early.contains("reaches 1949"), "{early}");
        // The edges are whole years: the last hour of 2050 is inside, 2051 begins outside.
        let edge = |s: &str| crate::timefmt::parse_utc(s).unwrap();
        let last = edge("2050-12-31T23:00:00Z");
        assert_eq!(position_years_warning(&last, &last), None);
        let first = edge("2051-01-01T00:00:00Z");
        assert!(position_years_warning(&first, &first).is_some());
    }
    use crate::geometry::sun::sun_az_el_deg;
    use chrono::TimeZone;

    /// A Gaussian main beam of half-power width `hpbw_deg`, normalized to 4 pi in the small-angle
    /// limit: G0 = 2 / sigma^2 (sigma in rad).
    fn gaussian(hpbw_deg: f64) -> impl Fn(f64) -> f64 + Clone + Sync {
        let sigma = (hpbw_deg / (8.0 * std::f64::consts::LN_2).sqrt()).to_radians();
        move |psi_deg: f64| {
            let psi = psi_deg.to_radians();
            2.0 / (sigma * sigma) * (-psi * psi / (2.0 * sigma * sigma)).exp()
        }
    }

    #[test]
    fn the_sun_on_boresight_fills_its_share_of_the_beam() {
        let observer = Observer::new(38.52, -2.31, 780.0).unwrap();
        let t = Utc.with_ymd_and_hms(2026, 12, 2, 12, 0, 0).unwrap();
        let hpbw = 0.7;
        let f = 8.2e9;
        let model = BodyNoise::new(&gaussian(hpbw), hpbw, f, None).unwrap();
        let mut bodies = PassBodies::new(&observer, &t, &t).unwrap();
        model.reset(&mut bodies, &t, &t).unwrap();
        let (az, el) = sun_az_el_deg(&observer, &t);
        assert!(el > 0.0);
        let s = model.at(&bodies, &t, az, el);
        assert!(s.sun_separation_deg < 1e-3, "{}", s.sun_separation_deg);
        // A centred uniform disk of radius r in a Gaussian beam: the beam's power inside r,
        // 1 - exp(-4 ln 2 r^2 / theta^2) (small-angle closed form), times (Tb - T_cmb).
        let r = bodies.sun.angular_radius_deg();
        let tb = sun::quiet_sun_brightness_k(f).unwrap();
        let share = 1.0 - (-4.0 * std::f64::consts::LN_2 * r * r / (hpbw * hpbw)).exp();
        let expected = share * (tb - CMB_K);
        assert!(
            (s.sun_k / expected - 1.0).abs() < 0.01,
            "{} vs {expected}",
            s.sun_k
        );
        // Pointing 30 deg away: the Gaussian main beam sees nothing of it.
        let away = model.at(&bodies, &t, az, el + 30.0);
        assert!((away.sun_separation_deg - 30.0).abs() < 1e-3);
        assert!(away.sun_k < 1e-6);
    }

    /// A beam wider than 180 deg (a -1 dBi antenna by the dish rule) builds its tables, and a
    /// pattern flat over the Sun's disk couples G Omega / 4 pi of its brightness, Omega = 2 pi
    /// (1 - cos r) the disk's solid angle (geometry).
    #[test]
    fn a_beam_wider_than_the_sky_sees_the_sun_by_its_solid_angle() {
        let observer = Observer::new(38.52, -2.31, 780.0).unwrap();
        let t = Utc.with_ymd_and_hms(2026, 12, 2, 12, 0, 0).unwrap();
        let flat = |_psi_deg: f64| 0.8;
        let f = 437.5e6;
        let model = BodyNoise::new(&flat, 183.0, f, None).unwrap();
        let mut bodies = PassBodies::new(&observer, &t, &t).unwrap();
        model.reset(&mut bodies, &t, &t).unwrap();
        let (az, el) = sun_az_el_deg(&observer, &t);
        let r = bodies.sun.angular_radius_deg().to_radians();
        let tb = sun::quiet_sun_brightness_k(f).unwrap();
        let expected = 0.8 * 2.0 * std::f64::consts::PI * (1.0 - r.cos())
            / (4.0 * std::f64::consts::PI)
            * (tb - CMB_K);
        for off_deg in [0.0, 20.0, 60.0] {
            let s = model.at(&bodies, &t, az, el + off_deg).sun_k;
            assert!(
                (s / expected - 1.0).abs() < 1e-3,
                "{off_deg}: {s} vs {expected}"
            );
        }
        assert!(BodyNoise::new(&flat, f64::NAN, f, None).is_err());
        assert!(BodyNoise::new(&flat, f64::INFINITY, f, None).is_err());
    }

    #[test]
    fn a_sun_behind_the_terrain_adds_nothing() {
        // At noon on 2 December the Sun stands about 29.5 deg high at this site (astropy row of
        // tests/data/geometry/sun_astropy.csv): a terrain profile of 35 deg at its azimuth hides
        // it, one of 25 deg does not, and a profile high only elsewhere does not either.
        let observer = Observer::new(38.52, -2.31, 780.0).unwrap();
        let t = Utc.with_ymd_and_hms(2026, 12, 2, 12, 0, 0).unwrap();
        let (az, el) = sun_az_el_deg(&observer, &t);
        let open = BodyNoise::new(&gaussian(0.7), 0.7, 8.2e9, None).unwrap();
        let mut bodies = PassBodies::new(&observer, &t, &t).unwrap();
        open.reset(&mut bodies, &t, &t).unwrap();
        let clear_k = open.at(&bodies, &t, az, el).sun_k;
        assert!(clear_k > 100.0, "{clear_k}");
        let with = |points: Vec<[f64; 2]>| {
            let terrain = crate::noise::terrain::terrain_profile(&points);
            assert!(terrain.is_some(), "{points:?}");
            let m = open.clone().with_terrain(terrain);
            m.at(&bodies, &t, az, el).sun_k
        };
        let wall = |h: f64| vec![[az - 10.0, h], [az, h], [az + 10.0, h]];
        assert_eq!(with(wall(el + 5.0)), 0.0);
        assert_eq!(with(wall(el - 5.0)), clear_k);
        assert!((170.0..190.0).contains(&az), "{az}");
        let elsewhere = vec![[0.0, 0.0], [20.0, 40.0], [40.0, 0.0]];
        assert_eq!(with(elsewhere), clear_k);
    }

    #[test]
    fn a_set_sun_adds_nothing_and_out_of_range_is_flagged() {
        let observer = Observer::new(38.52, -2.31, 780.0).unwrap();
        let night = Utc.with_ymd_and_hms(2026, 12, 2, 0, 0, 0).unwrap();
        let model = BodyNoise::new(&gaussian(10.0), 10.0, 2.2e9, None).unwrap();
        let mut bodies = PassBodies::new(&observer, &night, &night).unwrap();
        model.reset(&mut bodies, &night, &night).unwrap();
        let (az, el) = sun_az_el_deg(&observer, &night);
        assert!(el < 0.0);
        assert_eq!(model.at(&bodies, &night, az, el).sun_k, 0.0);
        // 437.5 MHz: the Sun is modelled (0.05-100 GHz), the Moon is not (1-100 GHz).
        let uhf = BodyNoise::new(&gaussian(30.0), 30.0, 437.5e6, None).unwrap();
        assert!(!uhf.warnings().sun_not_modelled && !uhf.moon_modelled());
        // A 30 deg beam (about 16 dBi) would see under 0.1 K of the Moon: no warning. A 3.7 m dish
        // at 900 MHz (about 6.3 deg, 29 dBi) could see about 1 K: the warning says it is left out.
        assert!(!uhf.warnings().moon_not_modelled);
        assert_eq!(uhf.warnings().messages().count(), 0);
        let dish = BodyNoise::new(&gaussian(6.3), 6.3, 900e6, None).unwrap();
        assert!(dish.warnings().moon_not_modelled && !dish.moon_modelled());
        assert!(dish
            .warnings()
            .messages()
            .any(|m| m.starts_with("Moon noise")));
        // The bound by hand: G0 = 2 / sigma^2 of the Gaussian beam, Omega of a 0.2844 deg disk.
        let g0 = gaussian(6.3)(0.0);
        let omega = std::f64::consts::PI * 0.2844f64.to_radians().powi(2);
        let by_hand = 280.0 * g0 * omega / (4.0 * std::f64::consts::PI);
        assert!(
            (moon_bound_k(g0) - by_hand).abs() < 0.01 * by_hand,
            "{}",
            moon_bound_k(g0)
        );
        assert!(by_hand > 0.5 && by_hand < 2.0, "{by_hand}");
        // 150 GHz: neither, and the Sun's absence is a warning.
        let w = BodyNoise::new(&gaussian(0.1), 0.1, 150e9, None).unwrap();
        assert!(w.warnings().sun_not_modelled && !w.moon_modelled());
        assert_eq!(w.warnings().messages().count(), 1);
    }
}
