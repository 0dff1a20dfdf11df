//! The budget time series over one pass: at a fixed step from AOS to LOS, the geometry, the
//! atmosphere and the noise, down to C/N0 (clear sky and, optionally, the availability case).
//!
//! [`budget_at`] (the `budget --at` command: the atmosphere computed directly and itemized) and
//! `link_tabulated` (a plan's step: the elevation-only terms from the station's path tables,
//! [`crate::plan::path_table`]) end in one function from a look angle and its path terms to the
//! link, so the two agree to within the tables' stated bound. A plan's steps take the orbit from
//! [`crate::orbit::spline`] (SGP4 knots, interpolated), also within a stated bound.

use crate::atmosphere::{Attenuation, ModelWarnings, Weather};
use crate::geometry::body_track::TrackError;
use crate::geometry::mount::Follower;
use crate::geometry::{doppler_hz, AxisRates, LineOfSight, Look, Mount, Pass};
use crate::link::budget::{
    AtmosphereLoss, BudgetError, BudgetGeometry, BudgetValues, GeometryTerms, LinkValues, RateSpec,
};
use crate::orbit::{EcefSpline, PropagationError, Propagator};
use crate::plan::bodies::{BodySample, PassBodies};
use crate::plan::noise::NoiseWarnings;
use crate::plan::path_table::PathTerms;
use crate::plan::prepare::StationModel;
use crate::timefmt::{add_seconds, seconds_between};

/// One step of a pass. All fields are plain numbers so a pass's steps live in one reusable buffer.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Step {
    /// Seconds since AOS.
    pub t_s: f64,
    /// Time this step stands for (to the next step; 0 for the final step at LOS), s.
    pub weight_s: f64,
    pub azimuth_deg: f64,
    pub elevation_deg: f64,
    pub range_km: f64,
    pub range_rate_km_s: f64,
    pub doppler_hz: f64,
    pub off_nadir_deg: f64,
    pub eirp_dbw: f64,
    pub free_space_loss_db: f64,
    pub atmospheric_loss_db: f64,
    /// Sky brightness along the boresight (P.618-14 eq. 69), K.
    pub sky_temperature_k: f64,
    /// Sky through the whole pattern, K.
    pub sky_noise_k: f64,
    /// Ground through the whole pattern, K.
    pub ground_noise_k: f64,
    /// Man-made noise (ITU-R P.372 Table 1), K.
    pub man_made_noise_k: f64,
    /// The Sun's disk through the pattern, K.
    pub sun_noise_k: f64,
    /// The Moon's disk through the pattern, K.
    pub moon_noise_k: f64,
    /// Angle between the pointing and the Sun's centre, deg (always known in a plan).
    pub sun_separation_deg: Option<f64>,
    /// Angle between the pointing and the Moon's centre, deg (always known in a plan).
    pub moon_separation_deg: Option<f64>,
    /// Receiver noise at the antenna terminals, K.
    pub receiver_noise_k: f64,
    pub antenna_temperature_k: f64,
    pub system_temperature_k: f64,
    pub g_over_t_db_k: f64,
    pub cn0_dbhz: f64,
    /// Availability case (rain exceeded p % of the year); `None` when not planned.
    pub rain: Option<RainStep>,
    /// Rates the mount's two axes need here, deg/s (0 without a mount).
    pub primary_rate_deg_s: f64,
    pub secondary_rate_deg_s: f64,
    /// The mount cannot follow here (its follower points further from the satellite than
    /// [`MOUNT_TOLERANCE_BEAMWIDTHS`] of the beamwidth, or the step lies in a stretch of tracked
    /// steps shorter than the dwell time next to such a loss): the step is lost, and no rate,
    /// volume, mask bin or network segment counts it.
    pub untracked: bool,
    /// An axis rate or acceleration demanded here is beyond the mount's limit (the keyhole).
    pub rate_exceeded: bool,
}

/// The pointing error, in half-power beamwidths, beyond which a step the mount lags on is lost:
/// a quarter beamwidth costs 12 (1/4)^2 = 0.75 dB by the pointing-loss rule (common practice).
pub const MOUNT_TOLERANCE_BEAMWIDTHS: f64 = 0.25;

/// The availability case at one step.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct RainStep {
    pub atmospheric_loss_db: f64,
    /// Sky through the whole pattern in the availability case, K.
    pub sky_noise_k: f64,
    /// Ground through the whole pattern (with the sky it reflects) in the availability case, K.
    pub ground_noise_k: f64,
    /// The Sun's and the Moon's disks through the pattern, seen through the rain case's path, K.
    pub sun_noise_k: f64,
    pub moon_noise_k: f64,
    /// Sum of the external terms in the availability case (man-made as in clear sky), K.
    pub antenna_temperature_k: f64,
    pub system_temperature_k: f64,
    pub cn0_dbhz: f64,
}

/// Model warnings raised anywhere along a pass (the union over its steps, clear sky and rain).
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct PassWarnings {
    pub atmosphere: ModelWarnings,
    /// The station's noise model (pattern range, man-made noise range).
    pub noise: NoiseWarnings,
    /// The Sun's and the Moon's models.
    pub bodies: crate::plan::bodies::BodyWarnings,
    /// The spacecraft antenna table did not reach the off-nadir angle: its end value was used.
    pub pattern_clamped: bool,
    /// The station direction was below the geometric horizon (a negative mask).
    pub below_horizon: bool,
    /// The power flux-density at the station exceeded the band's Article 21 limit.
    pub pfd_exceeded: bool,
}

/// The one line for every model whose stated frequency range `frequency_hz` lies outside
/// (`plan`, `budget` and `atmosphere` alike), `None` when there is none.
pub(crate) fn frequency_range_line<'a>(
    frequency_hz: f64,
    ranges: impl Iterator<Item = &'a str>,
) -> Option<String> {
    let ranges: Vec<&str> = ranges.collect();
    (!ranges.is_empty()).then(|| {
        format!(
            "{} is outside the stated frequency range of {}: those terms are extrapolated estimates",
            crate::engfmt::frequency_mhz(frequency_hz),
            ranges.join(", ")
        )
    })
}

impl PassWarnings {
    pub fn union(&self, o: &PassWarnings) -> PassWarnings {
        PassWarnings {
            atmosphere: self.atmosphere.union(&o.atmosphere),
            noise: self.noise.union(&o.noise),
            bodies: self.bodies.union(&o.bodies),
            pattern_clamped: self.pattern_clamped || o.pattern_clamped,
            below_horizon: self.below_horizon || o.below_horizon,
            pfd_exceeded: self.pfd_exceeded || o.pfd_exceeded,
        }
    }

    /// The warnings as lines to show: the models used outside their frequency range grouped in
    /// one line (they hold for every step at this frequency), then one line per other warning.
    pub fn lines(&self, frequency_hz: f64) -> Vec<String> {
        let ranges = (self.atmosphere.frequency_ranges()).chain(self.noise.frequency_ranges());
        let mut m: Vec<String> = frequency_range_line(frequency_hz, ranges)
            .into_iter()
            .collect();
        m.extend(self.atmosphere.other_messages().map(String::from));
        m.extend(self.noise.other_messages().map(String::from));
        m.extend(self.others());
        m
    }

    fn others(&self) -> Vec<String> {
        let mut m: Vec<String> = self.bodies.messages().map(String::from).collect();
        if self.pattern_clamped {
            m.push("spacecraft antenna: the pattern table does not reach the off-nadir angle, its end value was used".into());
        }
        if self.pfd_exceeded {
            m.push("pfd: the power flux-density at the station exceeds the Article 21 Table 21-4 limit of the band at the chosen rate (pass field pfd_margin_db; compliance is for the administration to decide)".into());
        }
        if self.below_horizon {
            m.push("geometry: the satellite was below the geometric horizon (negative mask); atmosphere evaluated at 0 deg".into());
        }
        m
    }
}

/// Error while following a pass.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SeriesError {
    #[error(transparent)]
    Propagation(#[from] PropagationError),
    #[error("budget at {elevation_deg:.2} deg elevation: {source}")]
    Budget {
        elevation_deg: f64,
        source: BudgetError,
    },
    #[error("no antenna-noise table for {weather:?}: call StationModel::prepare_weather first")]
    WeatherNotPrepared { weather: Weather },
    #[error("Sun and Moon: {0}")]
    Bodies(#[from] TrackError),
}

/// The budget for one look angle at one station and weather. `reference` is any rate of the
/// mission: C/N0, G/T and the temperatures do not depend on it. With `bodies` (the Sun and the
/// Moon at this instant before the atmosphere, from [`crate::plan::bodies::BodyNoise::at`]), their
/// noise seen through this weather's path and their separations are counted; without it (a budget
/// at an elevation, no time) they are 0 and `None`. The atmosphere is computed directly (itemized);
/// a plan's steps take the same link through `link_tabulated`.
#[inline]
pub fn budget_at(
    model: &StationModel,
    look: &Look,
    weather: Weather,
    bodies: Option<BodySample>,
    reference: RateSpec,
) -> Result<(Attenuation, BudgetValues), SeriesError> {
    // The atmosphere flags (and clamps) elevations outside its range itself.
    let att = model.atmosphere.at(look.elevation_deg, weather);
    let terms = PathTerms::of(
        &att,
        model.mean_radiating_temperature_k,
        model.link.background_temperature_k(),
    );
    let front = geometry_terms(model, look)?;
    let link = link_of_terms(model, look, (&front, &terms), weather, bodies)?;
    let mut values =
        model
            .link
            .with_rate(&link, reference)
            .map_err(|source| SeriesError::Budget {
                elevation_deg: look.elevation_deg,
                source,
            })?;
    values.sun_separation_deg = bodies.map(|s| s.sun_separation_deg);
    values.moon_separation_deg = bodies.map(|s| s.moon_separation_deg);
    Ok((att, values))
}

/// The rate-free part of [`budget_at`] (down to C/N0) with the elevation-only terms (attenuation,
/// boresight sky brightness, path transmissivity) interpolated from the station's path table of
/// `weather` ([`crate::plan::path_table`], within its stated bound of the direct computation): a
/// plan's step.
#[inline]
pub(crate) fn link_tabulated(
    model: &StationModel,
    (look, front): (&Look, &GeometryTerms),
    weather: Weather,
    bodies: Option<BodySample>,
) -> Result<(PathTerms, LinkValues), SeriesError> {
    let terms = model
        .path
        .table(weather)
        .ok_or(SeriesError::WeatherNotPrepared { weather })?
        .at(look.elevation_deg);
    let link = link_of_terms(model, look, (front, &terms), weather, bodies)?;
    Ok((terms, link))
}

/// The weather-free terms of the link along `look` (EIRP, free-space loss): one per step, shared
/// by its weather cases.
#[inline]
pub(crate) fn geometry_terms(
    model: &StationModel,
    look: &Look,
) -> Result<GeometryTerms, SeriesError> {
    model
        .link
        .geometry_terms(&budget_geometry(look))
        .map_err(|source| SeriesError::Budget {
            elevation_deg: look.elevation_deg,
            source,
        })
}

/// The link from the elevation-only terms of the path: the one function both [`budget_at`] and
/// [`link_tabulated`] end in.
#[inline]
fn link_of_terms(
    model: &StationModel,
    look: &Look,
    (front, terms): (&GeometryTerms, &PathTerms),
    weather: Weather,
    bodies: Option<BodySample>,
) -> Result<LinkValues, SeriesError> {
    let (_, atmosphere) = link_inputs(model, look, terms);
    // The antenna's noise terms: interpolated from the station's table of this weather.
    let mut external = model
        .noise
        .external_at(look.elevation_deg, look.azimuth_deg, weather)
        .ok_or(SeriesError::WeatherNotPrepared { weather })?;
    if let Some(s) = bodies {
        // The disks are seen through the path of the pointing direction (plan::bodies):
        // their added noise is proportional to the transmissivity tau = 10^(-A_abs/10).
        external.sun_k = s.sun_k * terms.transmissivity;
        external.moon_k = s.moon_k * terms.transmissivity;
    }
    model
        .link
        .link_through(front, atmosphere, terms.sky_temperature_k, external)
        .map_err(|source| SeriesError::Budget {
            elevation_deg: look.elevation_deg,
            source,
        })
}

/// What the link model takes from a look angle and the path's terms along it.
#[inline]
pub fn link_inputs(
    model: &StationModel,
    look: &Look,
    terms: &PathTerms,
) -> (BudgetGeometry, AtmosphereLoss) {
    (
        budget_geometry(look),
        AtmosphereLoss {
            total_db: terms.total_db,
            absorptive_db: terms.absorptive_db,
            mean_radiating_temperature_k: model.mean_radiating_temperature_k,
        },
    )
}

/// The link model's geometry at a look angle.
#[inline]
fn budget_geometry(look: &Look) -> BudgetGeometry {
    BudgetGeometry {
        elevation_deg: look.elevation_deg,
        range_km: look.range_km,
        off_nadir_deg: look.off_nadir_deg,
    }
}

/// How to sample a pass.
#[derive(Debug, Clone, Copy)]
pub struct StepPlan {
    pub step_s: f64,
    /// Downlink frequency for the Doppler shift, Hz.
    pub frequency_hz: f64,
    /// Availability case, if planned.
    pub rain: Option<Weather>,
}

/// Span of the Sun's and the Moon's tracks, s: a longer pass (a satellite that never sets) is
/// followed one day at a time, so the tracks stay small.
const BODY_SPAN_S: f64 = 86_400.0;

/// Fill `steps` for `pass` at `step_s`: samples at AOS, AOS + step, ... and a final one at LOS.
/// `bodies` (for this station: [`PassBodies`] holds its observer) is reset over the pass, and
/// `orbit` to its SGP4 knots (the steps' states are interpolated between them,
/// [`crate::orbit::spline`]); the elevation-only terms come from the station's path tables
/// (`link_tabulated`). Allocates nothing once `steps` (and `orbit`) have grown to the longest
/// pass.
pub fn fill_pass(
    (prop, orbit): (&Propagator, &mut EcefSpline),
    model: &StationModel,
    pass: &Pass,
    how: &StepPlan,
    steps: &mut Vec<Step>,
    bodies: &mut PassBodies,
) -> Result<PassWarnings, SeriesError> {
    let StepPlan {
        step_s,
        frequency_hz,
        rain,
    } = *how;
    steps.clear();
    let mut warnings = PassWarnings {
        noise: model.noise.warnings(),
        bodies: model.bodies.warnings(),
        ..Default::default()
    };
    let duration_s = seconds_between(&pass.aos, &pass.los).max(0.0);
    let n = (duration_s / step_s).floor() as usize;
    let mut tracked_to_s = -1.0;
    orbit.reset(prop, &pass.aos, &pass.los)?;
    // The mount's follower, started at the first step.
    let mut follower = None;
    for k in 0..=n + 1 {
        let mut t_s = k as f64 * step_s;
        if k == n + 1 || t_s > duration_s - 1e-6 {
            if steps
                .last()
                .is_some_and(|s: &Step| s.t_s >= duration_s - 1e-6)
            {
                break;
            }
            t_s = duration_s;
        }
        let time = add_seconds(&pass.aos, t_s);
        if t_s > tracked_to_s {
            tracked_to_s = (t_s + BODY_SPAN_S).min(duration_s);
            let end = add_seconds(&pass.aos, tracked_to_s);
            model.bodies.reset(bodies, &time, &end)?;
        }
        let state = orbit.at(prop, t_s)?;
        let (look, line) = model.observer.look_and_line(&state);
        // The bodies once per step; each weather case attenuates them along its own path.
        let at = Some(
            model
                .bodies
                .at(bodies, &time, look.azimuth_deg, look.elevation_deg),
        );
        // EIRP and free-space loss once per step; each weather case adds its path and noise.
        let front = geometry_terms(model, &look)?;
        let (att, v) = link_tabulated(model, (&look, &front), Weather::ClearSky, at)?;
        warnings.atmosphere = warnings.atmosphere.union(&att.warnings);
        warnings.pattern_clamped |= v.pattern_clamped;
        warnings.below_horizon |= v.below_horizon;
        let mut step = Step::clear_sky(t_s, &look, frequency_hz, &att, &v, at);
        if let Some(m) = &model.station.mount {
            let tolerance_deg =
                MOUNT_TOLERANCE_BEAMWIDTHS * model.link.ground_antenna().beamwidth_deg;
            follow_mount(
                m,
                &line,
                steps.last(),
                (&mut follower, tolerance_deg),
                &mut step,
            );
        }
        if let Some(w) = rain {
            let (ra, rv) = link_tabulated(model, (&look, &front), w, at)?;
            warnings.atmosphere = warnings.atmosphere.union(&ra.warnings);
            step.rain = Some(RainStep {
                atmospheric_loss_db: ra.total_db,
                sky_noise_k: rv.external.sky_k,
                ground_noise_k: rv.external.ground_k,
                sun_noise_k: rv.external.sun_k,
                moon_noise_k: rv.external.moon_k,
                antenna_temperature_k: rv.antenna_temperature_k,
                system_temperature_k: rv.system_temperature_k,
                cn0_dbhz: rv.cn0_dbhz,
            });
        }
        if let Some(prev) = steps.last_mut() {
            prev.weight_s = t_s - prev.t_s;
        }
        steps.push(step);
        if t_s >= duration_s {
            break;
        }
    }
    Ok(warnings)
}

impl Step {
    /// A step's clear-sky values (no rain case, no mount yet; the weight is set by the next step).
    fn clear_sky(
        t_s: f64,
        look: &Look,
        frequency_hz: f64,
        att: &PathTerms,
        v: &LinkValues,
        bodies: Option<BodySample>,
    ) -> Step {
        Step {
            t_s,
            weight_s: 0.0,
            azimuth_deg: look.azimuth_deg,
            elevation_deg: look.elevation_deg,
            range_km: look.range_km,
            range_rate_km_s: look.range_rate_km_s,
            doppler_hz: doppler_hz(look.range_rate_km_s, frequency_hz),
            off_nadir_deg: look.off_nadir_deg,
            eirp_dbw: v.eirp_dbw,
            free_space_loss_db: v.free_space_loss_db,
            atmospheric_loss_db: att.total_db,
            sky_temperature_k: v.sky_temperature_k,
            sky_noise_k: v.external.sky_k,
            ground_noise_k: v.external.ground_k,
            man_made_noise_k: v.external.man_made_k,
            sun_noise_k: v.external.sun_k,
            moon_noise_k: v.external.moon_k,
            sun_separation_deg: bodies.map(|s| s.sun_separation_deg),
            moon_separation_deg: bodies.map(|s| s.moon_separation_deg),
            receiver_noise_k: v.receiver_noise_k,
            antenna_temperature_k: v.antenna_temperature_k,
            system_temperature_k: v.system_temperature_k,
            g_over_t_db_k: v.g_over_t_db_k,
            cn0_dbhz: v.cn0_dbhz,
            rain: None,
            primary_rate_deg_s: 0.0,
            secondary_rate_deg_s: 0.0,
            untracked: false,
            rate_exceeded: false,
        }
    }
}

/// The mount at one step: the axis rates it needs (`line`: the line of sight and its rate,
/// east/north/up), whether they (or the accelerations since `prev`) exceed its limits, and
/// whether its follower (started at the pass's first step) still points within the tolerance.
fn follow_mount(
    m: &Mount,
    line: &LineOfSight,
    prev: Option<&Step>,
    (follower, tolerance_deg): (&mut Option<Follower>, f64),
    step: &mut Step,
) {
    let f = follower.get_or_insert_with(|| m.start(&line.enu_km));
    let r = m.rates_for(f, &line.enu_km, &line.enu_rate_km_s);
    let before = prev.map(|p| {
        let b = AxisRates {
            primary_deg_s: p.primary_rate_deg_s,
            secondary_deg_s: p.secondary_rate_deg_s,
        };
        (b, step.t_s - p.t_s)
    });
    step.primary_rate_deg_s = r.primary_deg_s;
    step.secondary_rate_deg_s = r.secondary_deg_s;
    step.rate_exceeded = !m.can_follow(r, before);
    let dt_s = before.map_or(0.0, |b| b.1);
    let target = m.target_deg(f, line);
    step.untracked = m.follow_lost_to(f, target, dt_s, tolerance_deg);
}
